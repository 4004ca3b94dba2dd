//! Transmission-line models: what the feed line between the analyzer and the antenna does
//! to a measurement.
//!
//! | file | computes | method and published source |
//! |---|---|---|
//! | [`propagation`] | R, L, G, C per length at f → Z0, γ = α + jβ, velocity, wavelength, delay; the low-loss approximations and their error | telegrapher's equations: Z0 = √((R + jωL)/(G + jωC)), γ = √((R + jωL)(G + jωC)) (Pozar, *Microwave Engineering*, §2.1) |
//! | [`geometry`] | coaxial and two-wire lines → Z0, velocity factor, L, C; R from skin depth; G from loss tangent | Pozar, *Microwave Engineering*, Table 2.1; two-wire proximity factor from Ramo, Whinnery & Van Duzer, *Fields and Waves in Communication Electronics* (from memory) |
//! | [`loss_fit`] | datasheet loss points → α(f) = k1·√f + k2·f, at any f, length and temperature | conductor loss ∝ √f (skin effect), dielectric loss ∝ f (Pozar §2.7); closed form from two points, least squares from more |
//! | [`terminated`] | a lossy line with any load: Γ moved along the line, input impedance, embedding and de-embedding a complex Γ reading | Γin = ΓL·e^(−2γℓ), Zin = Z0·(1 + Γin)/(1 − Γin) (Pozar §2.3, §2.7) |
//! | [`feed_loss`] | scalar readings through a line of known matched loss: SWR at the load ↔ SWR at the analyzer, total loss with mismatch, power delivered | \|Γin\| = \|ΓL\|·10^(−ML/10); total loss 10·log10[(A² − \|ΓL\|²)/(A·(1 − \|ΓL\|²))], A = 10^(ML/10) (ARRL Antenna Book, "additional loss due to SWR", from memory) |
//! | [`fixed`] | the same scalar relations in integer Q16.16 for an in-line monitor without FPU | integer log2 by repeated squaring, exp2 by a product of 2^(2^−k) constants |
//!
//! Lengths are types ([`Meters`](crate::units::Meters), [`Feet`](crate::units::Feet)); a
//! quantity per length says its unit in its type (`DbPer<Feet>` is dB per foot). Internally
//! everything is SI per metre.
//!
//! Supported: uniform TEM lines, lossy or lossless, quasi-static geometry formulas, skin-effect
//! conductor loss (with the proximity factor for two-wire lines). Not supported: dispersion
//! of εr or tanδ with frequency, conductor roughness, stranding and braid, non-TEM modes
//! above cut-off, the DC regime where the skin depth exceeds the conductor (see
//! [`geometry::skin_depth`]).
//!
//! Panic policy: no public function panics, and none returns NaN or infinity; bad input gives
//! a [`LineError`]. Results that are infinite in the mathematics (the input impedance of an
//! open at zero length, the loss into a total reflection) are a typed error or capped at
//! [`DB_CEILING`](crate::reflection::DB_CEILING) as documented on each function.

mod complex_math;
pub mod feed_loss;
pub mod fixed;
pub mod geometry;
pub mod loss_fit;
pub mod propagation;
pub mod terminated;

/// The complex type of the line APIs (re-exported so callers need no direct dependency).
pub use num_complex::Complex32;

pub use feed_loss::{
    feed_report, power_at_load, return_loss_at_load, swr_at_input, swr_at_load, total_loss,
    FeedReport, LoadReading,
};
pub use geometry::{CoaxGeometry, Dielectric, TwoWireGeometry, COPPER_CONDUCTIVITY};
pub use loss_fit::{LossModel, LossPoint};
pub use propagation::{ApproximationError, Line, LineConstants, LowLoss};

/// The speed of light in vacuum, m/s (exact by the SI definition of the metre).
pub const SPEED_OF_LIGHT: f32 = 299_792_458.0;

/// The magnetic constant μ0 in H/m (4π × 10⁻⁷, within 1e-9 of the CODATA 2018 value).
pub const MU_0: f32 = 1.256_637_1e-6;

/// The electric constant ε0 in F/m (CODATA 2018: 8.854 187 8128 × 10⁻¹²).
pub const EPSILON_0: f32 = 8.854_188e-12;

/// Why a transmission-line computation has no answer.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum LineError {
    /// An input is NaN or infinite.
    NotFinite,
    /// An input is outside its domain: a negative length, resistance or loss; a frequency,
    /// inductance, capacitance, diameter or conductivity that is not positive; an outer
    /// diameter not larger than the inner; εr below 1; a load equal to −Z0.
    OutOfRange,
    /// A result is too large (or too small) to hold in `f32`.
    Overflow,
    /// The result is an infinite impedance (an open seen through a lossless length).
    InfiniteImpedance,
    /// A loss fit needs at least two points.
    TooFewPoints,
    /// A loss fit's points do not determine the model (all at one frequency).
    SingularFit,
    /// A loss fit gives a negative conductor or dielectric coefficient: the points do not
    /// follow k1·√f + k2·f with k1, k2 ≥ 0.
    NegativeCoefficient,
}

/// `Ok(x)` when `x` is finite, else `Err(NotFinite)`: for checking inputs.
#[inline]
pub(crate) fn input(x: f32) -> Result<f32, LineError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(LineError::NotFinite)
    }
}

/// `Ok(x)` when `x` is finite, else `Err(Overflow)`: for checking results.
#[inline]
pub(crate) fn output(x: f32) -> Result<f32, LineError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(LineError::Overflow)
    }
}

/// A finite, non-negative input.
#[inline]
pub(crate) fn non_negative(x: f32) -> Result<f32, LineError> {
    let x = input(x)?;
    if x >= 0.0 {
        Ok(x)
    } else {
        Err(LineError::OutOfRange)
    }
}

/// A finite, positive input.
#[inline]
pub(crate) fn positive(x: f32) -> Result<f32, LineError> {
    let x = input(x)?;
    if x > 0.0 {
        Ok(x)
    } else {
        Err(LineError::OutOfRange)
    }
}

/// A length of any unit in metres, finite and ≥ 0.
#[inline]
pub(crate) fn length_m<L: crate::units::Length>(len: L) -> Result<f32, LineError> {
    let l = non_negative(len.amount())?;
    output(l * L::METERS)
}
