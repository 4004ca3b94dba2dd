//! Distance to fault: where along a line the reflections are, and how strong, from a
//! frequency sweep.
//!
//! Method (the frequency-domain reflectometry principle, e.g. Pozar, *Microwave
//! Engineering*, and common practice): a reflection ρ at one-way distance d on a line with
//! velocity v = VF·c adds ρ·e^(−j2πf·2d/v) to Γ(f). A sweep of N points at step Δf, windowed,
//! zero-padded to M points (a power of two) and inverse transformed, has a peak at bin
//! n = 2d·Δf·M/v whose height is ρ times the window's coherent gain. So:
//!
//! - bin spacing = v/(2·Δf·M); resolution = v/(2·span) = VF·c/(2·span);
//!   maximum range = (N − 1)·resolution = v/(2·Δf);
//! - height is normalised by Σw, so a lone reflection reads its own |ρ|;
//! - cable loss α(f) (dB per metre, from a closure or the coefficients k1·√f + k2·f, see
//!   [`AttenuationModel`]) is compensated at each distance d. The exact height of a lossy
//!   reflection is ρ·Σw_k·e^(−a·α_k·d)/Σw (a = 2·ln10/20, two-way); the compensation undoes
//!   its second-order cumulant expansion e^(−a·ᾱ·d + ½·a²·var(α)·d²), with ᾱ and var(α) the
//!   window-weighted mean and variance of α over the sweep, gathered while windowing. Worst
//!   error seen on simulated lines (1–301 MHz, up to 14 dB two-way loss): 0.12 dB (host test
//!   `dtf_lines`);
//! - peaks are refined by three-point parabolic interpolation of the log magnitude (common
//!   practice in spectral analysis, e.g. J. O. Smith, *Spectral Audio Signal Processing*,
//!   "quadratic interpolation of spectral peaks").
//!
//! The FFT is `microfft` (MIT, no_std, radix-2, f32), see [`forward_in_place`]. Windows:
//! rectangular, Hann, Kaiser(β) ([`Window`]).
//!
//! RAM: the caller's buffer of M `Complex32` (8·M bytes: 8 KiB for 256 points into 1024 bins)
//! holds the sweep on entry and the response on return; [`DtfResponse`] is a borrowed view of
//! a few words; a fault list of P faults is 16·P bytes. Stack below the caller: 496 bytes
//! for the transform and one read (`cargo bench-fw`, stack painting on the emulated
//! Cortex-M4F), so 256 points into 1024 bins take 8.5 KiB in all.
//!
//! Cost, 256 points into 1024 bins, transform alone, instructions traced on QEMU's
//! mps2-an386 (Cortex-M4F, release build, opt-level "s"):
//!
//! | window | no loss model | with [`LossCoefficients`] |
//! |---|---:|---:|
//! | rectangular | 120 k | 132 k |
//! | Hann | 125 k | 137 k |
//! | Kaiser β = 6 | 136 k | 149 k |
//!
//! The FFT is 111 k of that (microfft: butterflies, and about 24 k of bit reversal with the
//! smallest stages); the one pass that checks, windows and conjugates the sweep and gathers
//! the loss moments about 9 k, the two-term loss model (one [`sqrt_fast`]) about 48 per
//! point, a Hann coefficient about 40 and a Kaiser β = 6 coefficient about 130 (I0 summed
//! in Horner form over a fixed term count; only the first half of the symmetric window is
//! evaluated). The fault list takes about 48 k more.
//!
//! Scalar sweeps ([`scalar_transform_in_place`]): from |Γ| alone the phase is lost. The
//! transform of |Γ|²(f) shows the *separations* between pairs of reflections (for the usual
//! case of one strong near-end reflection, the distance of each fault from it), with a level
//! that is the product of the pair's |ρ| (their return losses add), up to v/(4·Δf). A lone
//! fault behind a perfect match gives no ripple and cannot be seen. No loss compensation.
//!
//! Not supported: band-pass (non-zero-start) time gating, lowpass step responses, dispersion
//! correction beyond the mean loss.
//!
//! Panic policy: nothing here panics; bad input gives a [`DtfError`]. On error the buffer's
//! contents are unspecified.

mod fft;
mod loss;
mod peaks;
mod transform;
mod window;

pub use fft::{forward_in_place, FFT_MAX, FFT_MIN};
pub use loss::{sqrt_fast, AttenuationModel, LossCoefficients, NoLoss, SQRT_FAST_BOUND};
pub use peaks::{Fault, FaultSearch};
pub use transform::{
    scalar_transform_in_place, transform_in_place, DtfResponse, DtfSetup, ResponseKind,
    COMPENSATION_MAX_DB, SPEED_OF_LIGHT,
};
pub use window::{bessel_i0, cos_turns, PreparedWindow, Window, COS_TURNS_BOUND, KAISER_BETA_MAX};

/// Why a distance-to-fault transform cannot be made.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum DtfError {
    /// A sample, frequency or parameter is NaN or infinite.
    NotFinite,
    /// The buffer length is not a power of two in [`FFT_MIN`]..=[`FFT_MAX`].
    BadLength,
    /// Fewer than 2 points, more points than the buffer, or a window that sums to 0.
    TooFewPoints,
    /// start ≥ stop, a negative frequency, a velocity factor outside (0, 1], or a bad window.
    BadSetup,
    /// The attenuation model gave a negative or non-finite value.
    BadLoss,
}
