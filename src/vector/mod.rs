//! Vector reflection: complex Γ from vector detector readings, impedance and admittance,
//! and the sign of the phase for detectors that report only its magnitude.
//!
//! * [`gamma`] — complex Γ from a magnitude ratio in dB with a phase (as gain-phase
//!   detectors give it), from I/Q of the reflected wave alone or as a ratio of two waves.
//! * [`impedance`] — Z = Z0·(1 + Γ)/(1 − Γ) and Y = 1/Z with R, X, |Z|, angle, series and
//!   parallel equivalents, the equivalent L or C at a frequency and Q. Γ near +1 (an open)
//!   or −1 (a short) is handled by a capped ratio, never by an overflow.
//! * [`display_angle`] — whole-degree angles for a display, from micromath's fast `atan2`
//!   with its measured bound.
//! * [`phase_sign`] — resolves the sign of a phase known only in magnitude from how the
//!   reactance and the susceptance change across a small frequency step (Foster's
//!   reactance theorem), and flags the cases it cannot decide.
//!
//! Sources: the bilinear Γ ↔ Z relation and the series/parallel equivalents are textbook
//! transmission-line and circuit theory (e.g. D. M. Pozar, *Microwave Engineering*, ch. 2);
//! Foster's reactance theorem is R. M. Foster, "A reactance theorem", Bell System Technical
//! Journal 3 (1924), with the slope bound dX/dω ≥ |X|/ω for a lossless one-port.
//!
//! All values are `f32` ([`num_complex::Complex32`] for complex ones). Raw Γ readings are
//! accepted up to [`RAW_GAMMA_LIMIT`] in each component, so a detector slightly beyond
//! |Γ| = 1 still converts.
//!
//! Panic policy: nothing in this module panics, and no function returns NaN or infinity:
//! non-finite or out-of-range input gives a [`VectorError`], and a result that would be
//! unbounded is capped and flagged.

pub mod display_angle;
pub mod gamma;
pub mod impedance;
pub mod phase_sign;

pub use display_angle::{display_angle_degrees, DISPLAY_ANGLE_BOUND_DEG};
pub use gamma::{gamma_from_db_phase, gamma_from_iq, gamma_from_wave_ratio};
pub use impedance::{Admittance, Impedance, ParallelEquivalent, Reactive, RATIO_CEILING};
pub use phase_sign::{resolve_phase_sign, Ambiguity, PhaseSign, PhaseSignConfig};

/// The largest magnitude accepted for each component (real, imaginary) of a raw complex Γ.
pub const RAW_GAMMA_LIMIT: f32 = 100.0;

/// The lowest frequency accepted where a frequency enters a computation (1 mHz): keeps the
/// equivalent L and C finite.
pub const FREQUENCY_MIN_HZ: f32 = 1.0e-3;

/// The highest frequency accepted where a frequency enters a computation (1 THz).
pub const FREQUENCY_LIMIT_HZ: f32 = 1.0e12;

/// Why a vector quantity could not be computed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum VectorError {
    /// NaN or infinity given.
    NotFinite,
    /// A value outside its accepted range (Γ component beyond [`RAW_GAMMA_LIMIT`],
    /// a reference impedance outside 1 mΩ…1 MΩ, a frequency below [`FREQUENCY_MIN_HZ`] or above
    /// [`FREQUENCY_LIMIT_HZ`], a magnitude ratio above 40 dB, …).
    OutOfRange,
    /// The reference (incident) wave is too small to divide by.
    NoSignal,
}

/// Checks that a value is finite.
#[inline]
pub(crate) fn finite(x: f32) -> Result<f32, VectorError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(VectorError::NotFinite)
    }
}

/// Checks a raw Γ: finite components no larger than [`RAW_GAMMA_LIMIT`].
pub(crate) fn check_raw_gamma(
    g: num_complex::Complex32,
) -> Result<num_complex::Complex32, VectorError> {
    finite(g.re)?;
    finite(g.im)?;
    if g.re.abs() <= RAW_GAMMA_LIMIT && g.im.abs() <= RAW_GAMMA_LIMIT {
        Ok(g)
    } else {
        Err(VectorError::OutOfRange)
    }
}
