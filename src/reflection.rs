//! Scalar reflection quantities (f32): |Γ|, VSWR, return loss, mismatch loss and power fractions,
//! and every conversion between them.
//!
//! Relations (textbook transmission-line theory, e.g. any microwave-engineering text):
//!
//! | quantity | from \|Γ\| | inverse |
//! |---|---|---|
//! | VSWR | (1 + \|Γ\|) / (1 − \|Γ\|) | \|Γ\| = (VSWR − 1) / (VSWR + 1) |
//! | return loss (positive dB, IEEE Std 100 sense) | −20·log10 \|Γ\| | \|Γ\| = 10^(−RL/20) |
//! | mismatch loss | −10·log10(1 − \|Γ\|²) | \|Γ\| = √(1 − 10^(−ML/10)) |
//! | reflected power fraction | \|Γ\|² | |
//! | delivered power fraction | 1 − \|Γ\|² | |
//!
//! Limits: a perfect match (|Γ| = 0) has infinite return loss and a total reflection (|Γ| = 1)
//! infinite VSWR and mismatch loss. No function here returns an infinity: return loss and
//! mismatch loss are capped at [`DB_CEILING`] and VSWR at [`Vswr::CEILING`], and
//! [`Reflection::capped`] says when a cap was applied.
//!
//! Return loss and mismatch loss use the crate's short f32 `log2` (src/float/log2.rs; error ≤ 2e-7,
//! i.e. at most 1.2e-6 dB per unit of |log2|), not libm's `log10f`: about a third of the
//! instructions, at an error far below what a detector resolves. The other relations use libm.
//! Error bound of this f32 path against an f64 reference (measured by
//! `host-tests/tests/scalar_error_sweep.rs`): see the README's table of numeric paths.
//!
//! Panic policy: nothing in this module panics.

use crate::float::log2::{log2, log2_of_ratio};
use crate::units::{Db, PowerRatio};

/// The largest return loss or mismatch loss reported, in dB. A perfect match reads as this.
pub const DB_CEILING: f32 = 100.0;

/// The |Γ| whose return loss is [`DB_CEILING`]: 10^(−100/20). At or below it, the return loss
/// reads as the ceiling.
pub(crate) const GAMMA_AT_CEILING: f32 = 1.0e-5;

/// 20·log10(2): return loss in dB per unit of log2.
const DB20_PER_LOG2: f32 = 6.020_6;
/// 10·log10(2): mismatch loss in dB per unit of log2.
const DB10_PER_LOG2: f32 = 3.010_3;
/// 1 − √½: up to this |Γ|², the mismatch loss takes the short path (see `mismatch_loss`).
const SMALL_REFLECTED_FRACTION: f32 = 0.292_893_2;

/// Why a value is not a valid reflection quantity.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ReflectionError {
    /// NaN or infinity given.
    NotFinite,
    /// |Γ| outside 0..=1, VSWR below 1, or a negative return or mismatch loss.
    OutOfRange,
}

/// Magnitude of the reflection coefficient, |Γ|, held in `0.0..=1.0`.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Gamma(f32);

/// Voltage standing-wave ratio, held in `1.0..=Vswr::CEILING`.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Vswr(f32);

fn check(x: f32) -> Result<f32, ReflectionError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(ReflectionError::NotFinite)
    }
}

impl Gamma {
    /// Total reflection, |Γ| = 1 (an open or a short).
    pub const TOTAL: Gamma = Gamma(1.0);
    /// A perfect match, |Γ| = 0.
    pub const MATCHED: Gamma = Gamma(0.0);

    /// |Γ| from a value in `0.0..=1.0`.
    pub fn new(magnitude: f32) -> Result<Self, ReflectionError> {
        let g = check(magnitude)?;
        if (0.0..=1.0).contains(&g) {
            Ok(Gamma(g))
        } else {
            Err(ReflectionError::OutOfRange)
        }
    }

    /// |Γ| clamped into `0.0..=1.0`; NaN becomes 1 (the pessimistic reading).
    pub fn saturating(magnitude: f32) -> Self {
        if magnitude.is_nan() {
            Gamma(1.0)
        } else {
            Gamma(magnitude.clamp(0.0, 1.0))
        }
    }

    /// |Γ| from a value the caller has shown to be in `0.0..=1.0` (so not NaN): the hot path's
    /// constructor, without the checks of [`Gamma::saturating`].
    #[inline]
    pub(crate) const fn from_unit(magnitude: f32) -> Self {
        Gamma(magnitude)
    }

    /// The magnitude, in `0.0..=1.0`.
    #[inline]
    pub const fn value(self) -> f32 {
        self.0
    }

    /// |Γ| from a VSWR (≥ 1): (VSWR − 1) / (VSWR + 1).
    pub fn from_vswr(vswr: f32) -> Result<Self, ReflectionError> {
        let s = check(vswr)?;
        if s < 1.0 {
            return Err(ReflectionError::OutOfRange);
        }
        Ok(Gamma::saturating((s - 1.0) / (s + 1.0)))
    }

    /// |Γ| from a return loss (≥ 0 dB): 10^(−RL/20).
    pub fn from_return_loss(rl: Db) -> Result<Self, ReflectionError> {
        let r = check(rl.value())?;
        if r < 0.0 {
            return Err(ReflectionError::OutOfRange);
        }
        Ok(Gamma::saturating(libm::powf(10.0, -r / 20.0)))
    }

    /// |Γ| from a mismatch loss (≥ 0 dB): √(1 − 10^(−ML/10)).
    pub fn from_mismatch_loss(ml: Db) -> Result<Self, ReflectionError> {
        let m = check(ml.value())?;
        if m < 0.0 {
            return Err(ReflectionError::OutOfRange);
        }
        // 1 − 10^(−m/10) = −expm1(−m·ln10/10): exact near m = 0.
        let delivered_lost = -libm::expm1f(-m * core::f32::consts::LN_10 / 10.0);
        Ok(Gamma::saturating(libm::sqrtf(delivered_lost)))
    }

    /// |Γ| from the reflected power fraction |Γ|² (in `0.0..=1.0`).
    pub fn from_reflected_fraction(fraction: PowerRatio) -> Result<Self, ReflectionError> {
        let f = check(fraction.value())?;
        if !(0.0..=1.0).contains(&f) {
            return Err(ReflectionError::OutOfRange);
        }
        Ok(Gamma::saturating(libm::sqrtf(f)))
    }

    /// VSWR = (1 + |Γ|) / (1 − |Γ|), capped at [`Vswr::CEILING`].
    pub fn vswr(self) -> Vswr {
        self.vswr_and_cap().0
    }

    /// Return loss −20·log10|Γ| in positive dB, capped at [`DB_CEILING`].
    pub fn return_loss(self) -> Db {
        self.return_loss_and_cap().0
    }

    /// Mismatch loss −10·log10(1 − |Γ|²) in dB, capped at [`DB_CEILING`].
    pub fn mismatch_loss(self) -> Db {
        self.mismatch_loss_and_cap().0
    }

    /// The VSWR, and whether it was capped.
    #[inline]
    fn vswr_and_cap(self) -> (Vswr, bool) {
        let den = 1.0 - self.0;
        let num = 1.0 + self.0;
        if num >= Vswr::CEILING * den {
            (Vswr(Vswr::CEILING), true)
        } else {
            (Vswr(num / den), false)
        }
    }

    /// The return loss, and whether it was capped.
    #[inline]
    fn return_loss_and_cap(self) -> (Db, bool) {
        // |Γ| ≤ 1, so log2 ≤ 0 (exact at 1) and the loss is ≥ 0. At or below |Γ| = 1e-5 it
        // is at least the ceiling, and so it is for 0 and subnormals too: `log2` gives them
        // about −127, i.e. 760 dB.
        let rl = -DB20_PER_LOG2 * log2(self.0);
        if rl >= DB_CEILING {
            (Db::new(DB_CEILING), true)
        } else {
            (Db::new(rl), false)
        }
    }

    /// The mismatch loss, and whether it was capped.
    #[inline]
    fn mismatch_loss_and_cap(self) -> (Db, bool) {
        let g = self.0;
        // Up to |Γ|² = 1 − √½ (|Γ| 0.541, VSWR 3.36): 1 − |Γ|² = (1 − t)/(1 + t) with
        // t = |Γ|²/(2 − |Γ|²) ≤ 0.1716, formed without a cancellation, so the loss is
        // 10·log10(2)·log2((1 + t)/(1 − t)) to full relative precision even for a tiny |Γ|.
        let x = g * g;
        if x <= SMALL_REFLECTED_FRACTION {
            let ml = DB10_PER_LOG2 * log2_of_ratio(x / (2.0 - x));
            return (Db::new(ml), false);
        }
        // Above, (1 − |Γ|)(1 + |Γ|) rather than 1 − |Γ|²: no cancellation as |Γ| → 1. Below
        // |Γ| = 1 it is at least 1.2e-7 (|Γ| < 1 is at most 1 − 2^-24), so the loss stays
        // under 70 dB and only a total reflection reaches the ceiling.
        let delivered = (1.0 - g) * (1.0 + g);
        if delivered <= 1.0e-10 {
            return (Db::new(DB_CEILING), true);
        }
        (Db::new(-DB10_PER_LOG2 * log2(delivered)), false)
    }

    /// Fraction of the incident power reflected, |Γ|².
    pub fn reflected_fraction(self) -> PowerRatio {
        PowerRatio::new(self.0 * self.0)
    }

    /// Fraction of the incident power delivered to the load, 1 − |Γ|².
    pub fn delivered_fraction(self) -> PowerRatio {
        PowerRatio::new(1.0 - self.0 * self.0)
    }

    /// Every scalar quantity at once.
    #[inline]
    pub fn reflection(self) -> Reflection {
        let (vswr, vswr_capped) = self.vswr_and_cap();
        let (return_loss, rl_capped) = self.return_loss_and_cap();
        let (mismatch_loss, ml_capped) = self.mismatch_loss_and_cap();
        Reflection {
            gamma: self,
            vswr,
            return_loss,
            mismatch_loss,
            capped: vswr_capped | rl_capped | ml_capped,
        }
    }
}

impl Vswr {
    /// The largest VSWR reported; a total reflection reads as this.
    pub const CEILING: f32 = 1000.0;

    /// A VSWR from a value ≥ 1 (values above the ceiling are capped).
    pub fn new(ratio: f32) -> Result<Self, ReflectionError> {
        let s = check(ratio)?;
        if s < 1.0 {
            Err(ReflectionError::OutOfRange)
        } else {
            Ok(Vswr(s.min(Self::CEILING)))
        }
    }

    /// The ratio, in `1.0..=Vswr::CEILING`.
    #[inline]
    pub const fn value(self) -> f32 {
        self.0
    }

    /// |Γ| for this VSWR.
    pub fn gamma(self) -> Gamma {
        Gamma::saturating((self.0 - 1.0) / (self.0 + 1.0))
    }
}

/// All scalar reflection quantities of one measurement.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Reflection {
    /// |Γ|.
    pub gamma: Gamma,
    /// VSWR, capped at [`Vswr::CEILING`].
    pub vswr: Vswr,
    /// Return loss in positive dB, capped at [`DB_CEILING`].
    pub return_loss: Db,
    /// Mismatch loss in dB, capped at [`DB_CEILING`].
    pub mismatch_loss: Db,
    /// True when any value above was capped (a perfect match or a total reflection).
    pub capped: bool,
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (|Γ|, VSWR, return loss dB, mismatch loss dB), computed from the relations in the
    /// module doc with f64 by hand.
    const VECTORS: [(f32, f32, f32, f32); 4] = [
        (0.1, 1.222_222, 20.0, 0.043_648),
        (0.333_333, 2.0, 9.542_425, 0.511_525),
        (0.5, 3.0, 6.020_6, 1.249_387),
        (0.9, 19.0, 0.915_150, 7.212_464),
    ];

    #[test]
    fn vectors() {
        for &(g, s, rl, ml) in VECTORS.iter() {
            let r = Gamma::new(g).unwrap().reflection();
            assert!((r.vswr.value() - s).abs() < 2e-4 * s, "{g}");
            assert!((r.return_loss.value() - rl).abs() < 1e-4, "{g}");
            assert!((r.mismatch_loss.value() - ml).abs() < 1e-4, "{g}");
            let back = Gamma::from_vswr(s).unwrap().value();
            assert!((back - g).abs() < 1e-5);
            let back = Gamma::from_return_loss(Db::new(rl)).unwrap().value();
            assert!((back - g).abs() < 1e-5);
            let back = Gamma::from_mismatch_loss(Db::new(ml)).unwrap().value();
            assert!((back - g).abs() < 1e-4);
        }
    }

    #[test]
    fn limits_are_capped_not_infinite() {
        let open = Gamma::TOTAL.reflection();
        assert_eq!(open.vswr.value(), Vswr::CEILING);
        assert_eq!(open.mismatch_loss.value(), DB_CEILING);
        assert!(open.capped);
        let load = Gamma::MATCHED.reflection();
        assert_eq!(load.return_loss.value(), DB_CEILING);
        assert_eq!(load.vswr.value(), 1.0);
        assert!(load.capped);
    }

    #[test]
    fn bad_values_refused() {
        assert_eq!(Gamma::new(f32::NAN), Err(ReflectionError::NotFinite));
        assert_eq!(Gamma::new(1.5), Err(ReflectionError::OutOfRange));
        assert_eq!(Gamma::from_vswr(0.5), Err(ReflectionError::OutOfRange));
        assert_eq!(
            Gamma::from_return_loss(Db::new(-1.0)),
            Err(ReflectionError::OutOfRange)
        );
        assert_eq!(Gamma::saturating(f32::NAN), Gamma::TOTAL);
    }
}
