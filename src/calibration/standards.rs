//! Γ of the calibration standards at a frequency: ideal or modelled.
//!
//! Models (the usual way calibration standards are defined — common practice; the lumped
//! terminations and the offset line are textbook circuit and transmission-line theory):
//!
//! * open: a fringing capacitance C(f) = C0 + C1·f + C2·f² + C3·f³ terminating a lossless
//!   offset line of one-way delay τ: Γ = (1 − jωCZ0)/(1 + jωCZ0) · e^(−j2ωτ);
//! * short: an inductance L(f) = L0 + L1·f + L2·f² + L3·f³ behind an offset of delay τ:
//!   Γ = (jωL − Z0)/(jωL + Z0) · e^(−j2ωτ);
//! * load: a fixed Γ (0 for an ideal load).
//!
//! Coefficient units follow the usual scaling (common practice): C0 in fF, C1 in
//! 10⁻²⁷ F/Hz, C2 in 10⁻³⁶ F/Hz², C3 in 10⁻⁴⁵ F/Hz³; L0 in pH, L1 in 10⁻²⁴ H/Hz, L2 in
//! 10⁻³³ H/Hz², L3 in 10⁻⁴² H/Hz³. With f in GHz (f_G) both polynomials become
//! C (in fF) = C0 + 10⁻³·(C1·f_G + C2·f_G² + C3·f_G³), and the same for L (in pH), which keeps every
//! intermediate a normal `f32` (10⁻⁴⁵ in SI would not be).
//!
//! Not supported: offset loss, an offset impedance other than the reference Z0, a load with
//! a frequency-dependent model (give per-frequency Γ through [`OnePortTerms::from_known`]
//! instead).
//!
//! [`OnePortTerms::from_known`]: super::OnePortTerms::from_known
//!
//! Panic policy: nothing here panics; bad input gives a [`CalError`].

use num_complex::Complex32;

use super::{finite, CalError};
use crate::units::{Hertz, Ohms, Seconds};
use crate::vector::{FREQUENCY_LIMIT_HZ, RAW_GAMMA_LIMIT};

/// An open standard: fringing-capacitance polynomial and offset delay.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct OpenStandard {
    /// C0 (fF), C1 (10⁻²⁷ F/Hz), C2 (10⁻³⁶ F/Hz²), C3 (10⁻⁴⁵ F/Hz³).
    pub capacitance: [f32; 4],
    /// One-way delay of the lossless offset line.
    pub delay: Seconds,
}

/// A short standard: inductance polynomial and offset delay.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ShortStandard {
    /// L0 (pH), L1 (10⁻²⁴ H/Hz), L2 (10⁻³³ H/Hz²), L3 (10⁻⁴² H/Hz³).
    pub inductance: [f32; 4],
    /// One-way delay of the lossless offset line.
    pub delay: Seconds,
}

/// A load standard of fixed Γ.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LoadStandard {
    /// Γ of the load (0 for an ideal match).
    pub gamma: Complex32,
}

/// The three standards and the reference impedance they are defined against.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StandardsModel {
    /// The open.
    pub open: OpenStandard,
    /// The short.
    pub short: ShortStandard,
    /// The load.
    pub load: LoadStandard,
    /// The reference impedance Z0.
    pub z0: Ohms,
}

/// Γ of the three standards at one frequency.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct StandardGammas {
    /// Γ of the open.
    pub open: Complex32,
    /// Γ of the short.
    pub short: Complex32,
    /// Γ of the load.
    pub load: Complex32,
}

impl OpenStandard {
    /// A perfect open: Γ = +1 at every frequency.
    pub const IDEAL: OpenStandard = OpenStandard {
        capacitance: [0.0; 4],
        delay: Seconds::new(0.0),
    };
}

impl ShortStandard {
    /// A perfect short: Γ = −1 at every frequency.
    pub const IDEAL: ShortStandard = ShortStandard {
        inductance: [0.0; 4],
        delay: Seconds::new(0.0),
    };
}

impl LoadStandard {
    /// A perfect load: Γ = 0.
    pub const IDEAL: LoadStandard = LoadStandard {
        gamma: Complex32::new(0.0, 0.0),
    };
}

/// The largest |offset delay| accepted (1 µs).
pub const MAX_DELAY_S: f32 = 1.0e-6;

/// e^(−j2ωτ) = e^(−j·2π·(2fτ)), with the number of turns reduced first for precision.
fn offset_rotation(f_hz: f32, delay: Seconds) -> Result<Complex32, CalError> {
    let tau = finite(delay.value())?;
    if tau.abs() > MAX_DELAY_S {
        return Err(CalError::OutOfRange);
    }
    let turns = 2.0 * f_hz * tau;
    let frac = turns - libm::roundf(turns);
    let (s, c) = libm::sincosf(-core::f32::consts::TAU * frac);
    Ok(Complex32::new(c, s))
}

/// p0 + 10⁻³·(p1·x + p2·x² + p3·x³), Horner form.
fn poly(p: &[f32; 4], x: f32) -> Result<f32, CalError> {
    let [p0, p1, p2, p3] = *p;
    for c in [p0, p1, p2, p3] {
        finite(c)?;
    }
    let tail = x * (p1 + x * (p2 + x * p3));
    finite(p0 + 1.0e-3 * tail).map_err(|_| CalError::OutOfRange)
}

/// (1 − jx)/(1 + jx) = ((1 − x²) − 2jx)/(1 + x²), exact on the unit circle for any finite x.
fn unit_bilinear(x: f32) -> Complex32 {
    if x.abs() > 1.0e18 {
        // x² would overflow: the limit is −1.
        return Complex32::new(-1.0, 0.0);
    }
    let x2 = x * x;
    let d = 1.0 + x2;
    Complex32::new((1.0 - x2) / d, -2.0 * x / d)
}

impl StandardsModel {
    /// Ideal open, short and load against `z0`.
    pub const fn ideal(z0: Ohms) -> Self {
        Self {
            open: OpenStandard::IDEAL,
            short: ShortStandard::IDEAL,
            load: LoadStandard::IDEAL,
            z0,
        }
    }

    /// Γ of the three standards at frequency `f` (0 ≤ f ≤ 1 THz).
    pub fn gammas_at(&self, f: Hertz) -> Result<StandardGammas, CalError> {
        let fv = finite(f.value())?;
        let z0 = finite(self.z0.value())?;
        if !(0.0..=FREQUENCY_LIMIT_HZ).contains(&fv) || z0 <= 0.0 {
            return Err(CalError::OutOfRange);
        }
        let fg = fv * 1.0e-9;
        // ωCZ0 = 2π·f_G·C[fF]·Z0·10⁻⁶.
        let c_ff = poly(&self.open.capacitance, fg)?;
        let x_open = core::f32::consts::TAU * fg * c_ff * z0 * 1.0e-6;
        let open = unit_bilinear(finite(x_open).map_err(|_| CalError::OutOfRange)?)
            * offset_rotation(fv, self.open.delay)?;
        // ωL/Z0 = 2π·f_G·L[pH]·10⁻³/Z0; (jy − 1)/(jy + 1) = −(1 − jy)/(1 + jy).
        let l_ph = poly(&self.short.inductance, fg)?;
        let y_short = core::f32::consts::TAU * fg * l_ph * 1.0e-3 / z0;
        let short = -unit_bilinear(finite(y_short).map_err(|_| CalError::OutOfRange)?)
            * offset_rotation(fv, self.short.delay)?;
        let load = self.load.gamma;
        finite(load.re)?;
        finite(load.im)?;
        if load.re.abs() > RAW_GAMMA_LIMIT || load.im.abs() > RAW_GAMMA_LIMIT {
            return Err(CalError::OutOfRange);
        }
        Ok(StandardGammas { open, short, load })
    }
}

#[cfg(feature = "defmt")]
impl defmt::Format for LoadStandard {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(
            f,
            "LoadStandard {{ gamma: ({=f32}, {=f32}) }}",
            self.gamma.re,
            self.gamma.im
        )
    }
}

#[cfg(feature = "defmt")]
impl defmt::Format for StandardGammas {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(f, "StandardGammas {{ open: ({=f32}, {=f32}), short: ({=f32}, {=f32}), load: ({=f32}, {=f32}) }}", self.open.re, self.open.im, self.short.re, self.short.im, self.load.re, self.load.im)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Bound on each component of a modelled Γ against the hand values below.
    const TOLERANCE: f32 = 2.0e-6;

    #[test]
    fn ideal() {
        let g = StandardsModel::ideal(Ohms::new(50.0))
            .gammas_at(Hertz::new(1.0e9))
            .unwrap();
        assert_eq!(g.open, Complex32::new(1.0, 0.0));
        assert_eq!(g.short, Complex32::new(-1.0, 0.0));
        assert_eq!(g.load, Complex32::new(0.0, 0.0));
    }

    #[test]
    fn modelled_by_hand() {
        // Open: C = 50 fF at 1 GHz, Z0 = 50 Ω: x = ωCZ0 = 2π·1e9·50e-15·50 = 0.015707963.
        // Γ = ((1 − x²) − 2jx)/(1 + x²) = 0.99950664 − 0.03140817j.
        // Short: L = 20 pH: y = ωL/Z0 = 2π·1e9·20e-12/50 = 0.0025132741;
        // Γ = −((1 − y²) − 2jy)/(1 + y²) = −0.99998737 + 0.00502651j.
        let model = StandardsModel {
            open: OpenStandard {
                capacitance: [50.0, 0.0, 0.0, 0.0],
                delay: Seconds::new(0.0),
            },
            short: ShortStandard {
                inductance: [20.0, 0.0, 0.0, 0.0],
                delay: Seconds::new(0.0),
            },
            load: LoadStandard::IDEAL,
            z0: Ohms::new(50.0),
        };
        let g = model.gammas_at(Hertz::new(1.0e9)).unwrap();
        assert!((g.open.re - 0.999_506_64).abs() < TOLERANCE);
        assert!((g.open.im + 0.031_408_17).abs() < TOLERANCE);
        assert!((g.short.re + 0.999_987_37).abs() < TOLERANCE);
        assert!((g.short.im - 0.005_026_51).abs() < TOLERANCE);
        // An offset of 125 ps at 1 GHz turns an ideal open by −2ωτ = −90°: Γ = −j.
        let model = StandardsModel {
            open: OpenStandard {
                capacitance: [0.0; 4],
                delay: Seconds::new(125.0e-12),
            },
            ..StandardsModel::ideal(Ohms::new(50.0))
        };
        let g = model.gammas_at(Hertz::new(1.0e9)).unwrap();
        assert!((g.open - Complex32::new(0.0, -1.0)).norm() < TOLERANCE);
    }

    #[test]
    fn bad_input() {
        let m = StandardsModel::ideal(Ohms::new(50.0));
        assert_eq!(m.gammas_at(Hertz::new(-1.0)), Err(CalError::OutOfRange));
        assert_eq!(m.gammas_at(Hertz::new(f32::NAN)), Err(CalError::NotFinite));
        let bad = StandardsModel::ideal(Ohms::new(0.0));
        assert_eq!(bad.gammas_at(Hertz::new(1.0)), Err(CalError::OutOfRange));
    }
}
