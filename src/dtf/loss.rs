//! Cable attenuation models for loss compensation: dB per metre at a frequency.

use crate::units::Hertz;

/// Matched-line attenuation of the cable in dB per metre at frequency `f` (≥ 0).
/// Any `Fn(Hertz) -> f32` closure is a model, so a full line model can be plugged in.
pub trait AttenuationModel {
    /// Attenuation at `f`, dB/m.
    fn db_per_meter(&self, f: Hertz) -> f32;
}

impl<F: Fn(Hertz) -> f32> AttenuationModel for F {
    fn db_per_meter(&self, f: Hertz) -> f32 {
        self(f)
    }
}

/// A lossless line: no compensation.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct NoLoss;

impl AttenuationModel for NoLoss {
    fn db_per_meter(&self, _f: Hertz) -> f32 {
        0.0
    }
}

/// α(f) = k1·√(f/1 MHz) + k2·(f/1 MHz) dB/m: the conductor (skin-effect) and dielectric terms
/// of the usual two-term fit to a cable's datasheet (common practice).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LossCoefficients {
    k1: f32,
    k2: f32,
}

impl LossCoefficients {
    /// The fit from `k1` (conductor term, dB/m at 1 MHz) and `k2` (dielectric term, dB/m per
    /// MHz), both finite and ≥ 0; `None` otherwise.
    pub fn new(k1: f32, k2: f32) -> Option<Self> {
        if k1.is_finite() && k2.is_finite() && k1 >= 0.0 && k2 >= 0.0 {
            Some(Self { k1, k2 })
        } else {
            None
        }
    }

    /// (k1, k2).
    pub fn coefficients(&self) -> (f32, f32) {
        (self.k1, self.k2)
    }
}

impl AttenuationModel for LossCoefficients {
    /// α at `f`; 0 for a negative or non-finite frequency; capped at `f32::MAX`.
    #[inline]
    fn db_per_meter(&self, f: Hertz) -> f32 {
        let mhz = f.value() * 1.0e-6;
        // Two comparisons (false for NaN) instead of a bit-level finiteness test.
        if !(0.0..=f32::MAX).contains(&mhz) {
            return 0.0;
        }
        let a = self.k1 * sqrt_fast(mhz) + self.k2 * mhz;
        if a < f32::MAX {
            a
        } else {
            f32::MAX
        }
    }
}

/// √x for finite x ≥ 0 without division: the reciprocal square root from the exponent-halving
/// bit trick refined by three Newton steps y ← y·(1.5 − 0.5·x·y²) (the classic iteration, see
/// e.g. Lomont, "Fast inverse square root", 2003), then √x = x·y. About 15 instructions on a
/// single-precision FPU against about 76 for `libm::sqrtf`, which is all software.
/// Relative error below [`SQRT_FAST_BOUND`]; 0 for x below 1e-30 or not finite.
#[inline]
pub fn sqrt_fast(x: f32) -> f32 {
    // Two comparisons (false for NaN) instead of a bit-level finiteness test.
    if !(1.0e-30..=f32::MAX).contains(&x) {
        return 0.0;
    }
    let mut y = f32::from_bits(0x5f37_59df_u32.wrapping_sub(x.to_bits() >> 1));
    let half_x = 0.5 * x;
    y *= 1.5 - half_x * y * y;
    y *= 1.5 - half_x * y * y;
    y *= 1.5 - half_x * y * y;
    x * y
}

/// Bound on the relative error of [`sqrt_fast`] (measured over 1e-30..1e30 by the unit test).
pub const SQRT_FAST_BOUND: f32 = 5.0e-7;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sqrt_fast_against_f64() {
        let mut worst = 0.0f64;
        let mut x = 1.0e-30f32;
        while x < 1.0e30 {
            let want = (x as f64).sqrt();
            worst = worst.max(((sqrt_fast(x) as f64) - want).abs() / want);
            x *= 1.000_37;
        }
        assert!(worst < SQRT_FAST_BOUND as f64, "{worst}");
        assert_eq!(sqrt_fast(-1.0), 0.0);
        assert_eq!(sqrt_fast(f32::INFINITY), 0.0);
    }

    #[test]
    fn two_term_fit() {
        let c = LossCoefficients::new(0.01, 0.0002).unwrap();
        assert_eq!(LossCoefficients::new(-1.0, 0.0), None);
        // 0.01·√100 + 0.0002·100 = 0.12 dB/m at 100 MHz.
        assert!((c.db_per_meter(Hertz::new(100.0e6)) - 0.12).abs() < 1e-6);
        assert_eq!(NoLoss.db_per_meter(Hertz::new(1.0)), 0.0);
        let f = |_: Hertz| 0.5f32;
        assert_eq!(f.db_per_meter(Hertz::new(3.0)), 0.5);
    }
}
