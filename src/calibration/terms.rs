//! The three error terms of the one-port model: solving them from three standards, applying
//! them (the forward model, for simulation) and removing them (the correction).
//!
//! Model and equations: see the [module documentation](super) (standard one-port
//! three-term error model, Agilent Application Note 1287-3; Pozar, *Microwave Engineering*).
//!
//! Cost of [`OnePortTerms::correct`]: a range check of the input, one complex subtraction,
//! one complex multiply-add, and one complex division done as one reciprocal and four
//! multiplies — about 30 floating-point operations. Measured: 52 instructions executed on
//! the success path (one `vdiv.f32`) for `thumbv7em-none-eabihf`, `opt-level = "s"`, read
//! from the `--emit asm` listing of a non-inlined wrapper; the budget is 150.
//!
//! Panic policy: nothing here panics; bad input gives a [`CalError`].

use num_complex::Complex32;

use super::{finite, CalError};
use crate::calibration::standards::{StandardGammas, StandardsModel};
use crate::units::Hertz;
use crate::vector::RAW_GAMMA_LIMIT;

/// The largest |Γ| a correction may return; beyond it the reading is [`CalError::Unphysical`].
pub const CORRECTED_LIMIT: f32 = 4.0;

/// The largest |e00| and |e11| accepted.
pub const MAX_MATCH_TERM: f32 = 10.0;

/// The smallest and largest |e10e01| accepted (−120 dB … +60 dB).
pub const TRACKING_RANGE: (f32, f32) = (1.0e-6, 1.0e3);

/// Relative size below which the determinant of the standards' system is taken as zero.
const DEGENERACY: f32 = 1.0e-6;

/// The smallest |denominator|² the correction divides by.
const MIN_DEN_NORM: f32 = 1.0e-30;

/// The three error terms of a one-port reflectometer at one frequency.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct OnePortTerms {
    e00: Complex32,
    e11: Complex32,
    tracking: Complex32,
}

fn check_complex(z: Complex32) -> Result<Complex32, CalError> {
    finite(z.re)?;
    finite(z.im)?;
    Ok(z)
}

fn check_raw(z: Complex32) -> Result<Complex32, CalError> {
    check_complex(z)?;
    if z.re.abs() <= RAW_GAMMA_LIMIT && z.im.abs() <= RAW_GAMMA_LIMIT {
        Ok(z)
    } else {
        Err(CalError::OutOfRange)
    }
}

/// n/d without underflow of |d|²; `d` must be non-zero.
fn div(n: Complex32, d: Complex32) -> Complex32 {
    let dn = libm::hypotf(d.re, d.im);
    (n * (d / dn).conj()) / dn
}

impl OnePortTerms {
    /// Terms that change nothing: e00 = 0, e11 = 0, e10e01 = 1.
    pub const IDENTITY: OnePortTerms = OnePortTerms {
        e00: Complex32::new(0.0, 0.0),
        e11: Complex32::new(0.0, 0.0),
        tracking: Complex32::new(1.0, 0.0),
    };

    /// Terms from their values: directivity e00, source match e11, reflection tracking
    /// e10e01. Checked: finite, |e00|, |e11| ≤ [`MAX_MATCH_TERM`], |e10e01| in
    /// [`TRACKING_RANGE`].
    pub fn new(
        directivity: Complex32,
        source_match: Complex32,
        tracking: Complex32,
    ) -> Result<Self, CalError> {
        let e00 = check_complex(directivity)?;
        let e11 = check_complex(source_match)?;
        let t = check_complex(tracking)?;
        let lim = MAX_MATCH_TERM * MAX_MATCH_TERM;
        if e00.norm_sqr() > lim || e11.norm_sqr() > lim {
            return Err(CalError::OutOfRange);
        }
        let tn = t.norm_sqr();
        if tn < TRACKING_RANGE.0 * TRACKING_RANGE.0 {
            return Err(CalError::Degenerate);
        }
        if tn > TRACKING_RANGE.1 * TRACKING_RANGE.1 {
            return Err(CalError::OutOfRange);
        }
        Ok(Self {
            e00,
            e11,
            tracking: t,
        })
    }

    /// Solves the terms from three standards of known Γ (`actual`) and their raw readings
    /// (`measured`), in any order. The standards must be distinct.
    pub fn from_known(actual: [Complex32; 3], measured: [Complex32; 3]) -> Result<Self, CalError> {
        let [a1, a2, a3] = actual;
        let [m1, m2, m3] = measured;
        for a in actual {
            check_raw(a)?;
        }
        for m in measured {
            check_raw(m)?;
        }
        // m = e00 + (a·m)·e11 + a·Δ; subtract the first equation from the others.
        let p12 = a1 * m1 - a2 * m2;
        let p13 = a1 * m1 - a3 * m3;
        let q12 = a1 - a2;
        let q13 = a1 - a3;
        let r12 = m1 - m2;
        let r13 = m1 - m3;
        let det = p12 * q13 - p13 * q12;
        let scale = p12.norm() * q13.norm() + p13.norm() * q12.norm();
        let determined = det.norm() > DEGENERACY * scale;
        if !determined {
            return Err(CalError::Degenerate);
        }
        let e11 = div(r12 * q13 - r13 * q12, det);
        let delta = div(p12 * r13 - p13 * r12, det);
        let e00 = m1 - a1 * m1 * e11 - a1 * delta;
        let tracking = delta + e00 * e11;
        Self::new(e00, e11, tracking)
    }

    /// Solves the terms from raw readings of an open, a short and a load whose Γ at `f`
    /// comes from `model`.
    pub fn from_standards(
        measured_open: Complex32,
        measured_short: Complex32,
        measured_load: Complex32,
        model: &StandardsModel,
        f: Hertz,
    ) -> Result<Self, CalError> {
        let StandardGammas { open, short, load } = model.gammas_at(f)?;
        Self::from_known(
            [open, short, load],
            [measured_open, measured_short, measured_load],
        )
    }

    /// The directivity term e00.
    pub fn directivity(&self) -> Complex32 {
        self.e00
    }

    /// The source-match term e11.
    pub fn source_match(&self) -> Complex32 {
        self.e11
    }

    /// The reflection-tracking term e10e01.
    pub fn tracking(&self) -> Complex32 {
        self.tracking
    }

    /// The corrected Γ of a raw reading: (Γm − e00) / (e10e01 + e11·(Γm − e00)).
    ///
    /// Errors: [`CalError::NotFinite`] or [`CalError::OutOfRange`] for a bad reading,
    /// [`CalError::Unphysical`] when |Γ| would exceed [`CORRECTED_LIMIT`].
    #[inline]
    pub fn correct(&self, measured: Complex32) -> Result<Complex32, CalError> {
        // One comparison pair per component also rejects NaN (comparisons are false).
        if !(measured.re.abs() <= RAW_GAMMA_LIMIT && measured.im.abs() <= RAW_GAMMA_LIMIT) {
            return Err(if measured.re.is_finite() && measured.im.is_finite() {
                CalError::OutOfRange
            } else {
                CalError::NotFinite
            });
        }
        let d = measured - self.e00;
        let den = self.tracking + self.e11 * d;
        let den_norm = den.norm_sqr();
        if !(den_norm >= MIN_DEN_NORM
            && d.norm_sqr() <= CORRECTED_LIMIT * CORRECTED_LIMIT * den_norm)
        {
            return Err(CalError::Unphysical);
        }
        let inv = 1.0 / den_norm;
        Ok(Complex32::new(
            (d.re * den.re + d.im * den.im) * inv,
            (d.im * den.re - d.re * den.im) * inv,
        ))
    }

    /// The raw reading the model predicts for a device of actual Γ: e00 + e10e01·Γa/(1 − e11·Γa)
    /// (for simulated front ends and tests). [`CalError::Unphysical`] when 1 − e11·Γa ≈ 0
    /// or the reading would exceed the raw limit.
    pub fn distort(&self, actual: Complex32) -> Result<Complex32, CalError> {
        let a = check_raw(actual)?;
        let den = Complex32::new(1.0, 0.0) - self.e11 * a;
        let num = self.tracking * a;
        let lim = RAW_GAMMA_LIMIT;
        if !(den.norm_sqr() >= MIN_DEN_NORM && num.norm_sqr() <= lim * lim * den.norm_sqr()) {
            return Err(CalError::Unphysical);
        }
        check_raw(self.e00 + div(num, den)).map_err(|_| CalError::Unphysical)
    }

    /// Linear interpolation of each term between `self` (t = 0) and `other` (t = 1).
    pub fn lerp(&self, other: &OnePortTerms, t: f32) -> Result<Self, CalError> {
        let t = finite(t)?;
        let mix = |a: Complex32, b: Complex32| a + (b - a) * t;
        Self::new(
            mix(self.e00, other.e00),
            mix(self.e11, other.e11),
            mix(self.tracking, other.tracking),
        )
    }
}

#[cfg(feature = "defmt")]
impl defmt::Format for OnePortTerms {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(f, "OnePortTerms {{ e00: ({=f32}, {=f32}), e11: ({=f32}, {=f32}), e10e01: ({=f32}, {=f32}) }}", self.e00.re, self.e00.im, self.e11.re, self.e11.im, self.tracking.re, self.tracking.im)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Error terms used by the tests (invented for the test; not from any instrument).
    fn sample() -> OnePortTerms {
        OnePortTerms::new(
            Complex32::new(0.05, -0.02),
            Complex32::new(-0.1, 0.07),
            Complex32::new(0.8, 0.3),
        )
        .unwrap()
    }

    /// Bound on the error of a term or a corrected Γ recovered in f32 in these tests.
    const TOLERANCE: f32 = 2.0e-5;

    #[test]
    fn ideal_standards_recover_terms() {
        let t = sample();
        let actual = [
            Complex32::new(1.0, 0.0),
            Complex32::new(-1.0, 0.0),
            Complex32::new(0.0, 0.0),
        ];
        let measured = actual.map(|a| t.distort(a).unwrap());
        let s = OnePortTerms::from_known(actual, measured).unwrap();
        assert!((s.directivity() - t.directivity()).norm() < TOLERANCE);
        assert!((s.source_match() - t.source_match()).norm() < TOLERANCE);
        assert!((s.tracking() - t.tracking()).norm() < TOLERANCE);
        // With a load of Γ = 0: e00 equals the load reading exactly (model equation).
        assert!((s.directivity() - measured[2]).norm() < 1e-6);
        let dut = Complex32::new(0.3, -0.4);
        let back = s.correct(t.distort(dut).unwrap()).unwrap();
        assert!((back - dut).norm() < TOLERANCE);
    }

    #[test]
    fn identity_changes_nothing() {
        let g = Complex32::new(0.25, 0.5);
        assert_eq!(OnePortTerms::IDENTITY.correct(g), Ok(g));
    }

    #[test]
    fn bad_input() {
        let t = sample();
        assert_eq!(
            t.correct(Complex32::new(f32::NAN, 0.0)),
            Err(CalError::NotFinite)
        );
        assert_eq!(
            t.correct(Complex32::new(1e6, 0.0)),
            Err(CalError::OutOfRange)
        );
        let same = [Complex32::new(1.0, 0.0); 3];
        assert_eq!(
            OnePortTerms::from_known(same, same),
            Err(CalError::Degenerate)
        );
        assert_eq!(
            OnePortTerms::new(
                Complex32::new(0.0, 0.0),
                Complex32::new(0.0, 0.0),
                Complex32::new(0.0, 0.0)
            ),
            Err(CalError::Degenerate)
        );
    }
}
