//! Scalar reflection relations in integer arithmetic: from base-2 logarithms (Q8.24) to
//! return loss, mismatch loss and VSWR, and from |Γ| in Q1.31 to all of them.
//!
//! Relations (textbook transmission-line theory, as in the module doc of
//! `crate::reflection`), rewritten in base-2 logarithms so that no division is needed:
//!
//! | quantity | relation | here |
//! |---|---|---|
//! | return loss | −20·log10 \|Γ\| | (20·log10 2) · (−log2 \|Γ\|) |
//! | mismatch loss | −10·log10(1 − \|Γ\|²) | −(10·log10 2) · log2(1 − \|Γ\|²), 1 − \|Γ\|² as an exact 64-bit integer |
//! | VSWR | (1 + \|Γ\|)/(1 − \|Γ\|) | 2^(log2(1 + \|Γ\|) − log2(1 − \|Γ\|)) |
//!
//! The multiplications by 20·log10 2 and 10·log10 2 are one [`super::wide::mul_hi_fast`]
//! each by a 32-bit constant (relative error 1e-8, plus at most 2 units of the Q16.16
//! result). Caps: return and mismatch loss at [`DB_CEILING_Q16`]
//! (100 dB), VSWR at [`VSWR_CEILING_Q16`] (1000), as in the f32 path; `capped` says so.
//!
//! Panic policy: nothing here panics.

use super::exp2::exp2_q16;
use super::log2::{log2_q24, log2_u64_q24, ONE_Q24};
use super::q::{DbQ16, GammaQ31, VswrQ16, DB_CEILING_Q16, GAMMA_ONE_Q31, VSWR_CEILING_Q16};
use super::wide::mul_hi_fast;

/// (20·log10 2) · 2^13 and (10·log10 2) · 2^14 (the same number, 49 321 rounded): with a shift
/// of 21 or 22 it takes a Q8.24 log2 to Q16.16 dB in two 16-bit products (relative error
/// 4e-6, at most 0.0004 dB over 96 dB).
pub(crate) const K_DB_Q16: u16 = 49_321;
/// (20·log10 2)/256 · 2^32, rounded: Q8.24 log2 → Q16.16 dB (amplitude ratio).
pub(crate) const K20: u32 = 101_008_905;
/// (10·log10 2)/256 · 2^32, rounded: Q8.24 log2 → Q16.16 dB (power ratio).
pub(crate) const K10: u32 = 50_504_453;
/// 2^32 / (20·log10 2), rounded: dB (Q8.24) → log2 of the amplitude ratio (Q8.24).
pub(crate) const K_DB_TO_LOG2: u32 = 713_378_626;
/// log2(1000) in Q8.24: the logarithm of the VSWR ceiling.
pub(crate) const LOG2_VSWR_CEILING_Q24: i32 = 167_198_116;

/// All scalar reflection quantities of one reading, in fixed point. Field names as in the
/// f32 path's `reflection::Reflection`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FixedReflection {
    /// |Γ|, Q1.31.
    pub gamma: GammaQ31,
    /// VSWR, Q16.16, capped at 1000.
    pub vswr: VswrQ16,
    /// Return loss in positive dB, Q16.16, capped at 100 dB.
    pub return_loss: DbQ16,
    /// Mismatch loss in dB, Q16.16, capped at 100 dB.
    pub mismatch_loss: DbQ16,
    /// True when any value above was capped (a perfect match or a total reflection).
    pub capped: bool,
}

impl FixedReflection {
    /// A perfect match: |Γ| = 0, VSWR 1, return loss at the ceiling, no mismatch loss.
    pub const MATCHED: FixedReflection = FixedReflection {
        gamma: GammaQ31::MATCHED,
        vswr: VswrQ16::ONE,
        return_loss: DbQ16::from_bits(DB_CEILING_Q16),
        mismatch_loss: DbQ16::ZERO,
        capped: true,
    };

    /// A total reflection: |Γ| = 1, VSWR and mismatch loss at their ceilings, no return loss.
    pub const TOTAL: FixedReflection = FixedReflection {
        gamma: GammaQ31::TOTAL,
        vswr: VswrQ16::CEILING,
        return_loss: DbQ16::ZERO,
        mismatch_loss: DbQ16::from_bits(DB_CEILING_Q16),
        capped: true,
    };
}

/// −log2(1 − |Γ|²) in Q8.24 (≥ 0) for |Γ| < 1 in Q1.31, from the exact 64-bit integer
/// 2^62 − g² = (1 − |Γ|²) · 2^62: one logarithm of a quantity that falls as |Γ| rises, so
/// the mismatch loss is monotonic in |Γ| down to the last bit (a sum of log2(1 + |Γ|) and
/// log2(1 − |Γ|) would not be, at small |Γ|).
#[inline]
pub(crate) fn neg_log2_one_minus_gamma_squared(g: u32) -> i32 {
    let (sq_hi, sq_lo) = super::wide::mul_wide(g, g); // g < 2^31: g² < 2^62
    let lo = 0u32.wrapping_sub(sq_lo);
    let borrow = u32::from(sq_lo != 0);
    let hi = (1u32 << 30).wrapping_sub(sq_hi).wrapping_sub(borrow);
    // log2 ∈ [0, 62] · 2^24 for a positive value below 2^62.
    (62 * ONE_Q24).wrapping_sub(log2_u64_q24(hi, lo))
}

/// (20·log10 2) · l in Q16.16 for a Q8.24 log2 ratio l (negative l reads as 0), capped at
/// 100 dB; the flag says whether the cap applied.
#[inline]
pub(crate) fn db20_from_log2(l: i32) -> (DbQ16, bool) {
    cap_db(mul_hi_fast(l.max(0) as u32, K20))
}

/// (10·log10 2) · l in Q16.16 for a Q8.24 log2 ratio l (negative l reads as 0), capped.
#[inline]
pub(crate) fn db10_from_log2(l: i32) -> (DbQ16, bool) {
    cap_db(mul_hi_fast(l.max(0) as u32, K10))
}

#[inline]
fn cap_db(bits: u32) -> (DbQ16, bool) {
    if bits >= DB_CEILING_Q16 as u32 {
        (DbQ16::from_bits(DB_CEILING_Q16), true)
    } else {
        (DbQ16::from_bits(bits as i32), false)
    }
}

/// VSWR = 2^l in Q16.16 for a Q8.24 log2 VSWR l (negative l reads as VSWR 1), capped at
/// 1000.
#[inline]
pub(crate) fn vswr_from_log2(l: i32) -> (VswrQ16, bool) {
    if l >= LOG2_VSWR_CEILING_Q24 {
        (VswrQ16::CEILING, true)
    } else {
        // 2^l ≥ 1 for l ≥ 0 (exact at 0, monotonic), so only the ceiling needs a test.
        let v = exp2_q16(l.max(0) as u32);
        if v >= VSWR_CEILING_Q16 {
            (VswrQ16::CEILING, true)
        } else {
            (VswrQ16::from_bits_in_range(v), false)
        }
    }
}

/// Every reflection quantity from |Γ| (Q1.31): three logarithms of exact integers
/// (|Γ|, 1 + |Γ| and 1 − |Γ| in Q1.31) and one exponential.
pub fn from_gamma(gamma: GammaQ31) -> FixedReflection {
    let g = gamma.to_bits();
    if g == 0 {
        return FixedReflection::MATCHED;
    }
    if g >= GAMMA_ONE_Q31 {
        return FixedReflection::TOTAL;
    }
    let thirty_one = 31 * ONE_Q24;
    // −log2|Γ| ≥ 0 because g < 2^31.
    let neg_lg = thirty_one.wrapping_sub(log2_q24(g));
    // 2^31 + g < 2^32 and 2^31 − g > 0.
    let lp = log2_q24(GAMMA_ONE_Q31.wrapping_add(g)).wrapping_sub(thirty_one); // log2(1+|Γ|)
    let lm = log2_q24(GAMMA_ONE_Q31.wrapping_sub(g)).wrapping_sub(thirty_one); // log2(1−|Γ|) < 0
    let (return_loss, c1) = db20_from_log2(neg_lg);
    let (vswr, c2) = vswr_from_log2(lp.wrapping_sub(lm));
    // Both in (−32, 1] · 2^24: the sum cannot overflow.
    let (mismatch_loss, c3) = db10_from_log2(neg_log2_one_minus_gamma_squared(g));
    FixedReflection {
        gamma,
        vswr,
        return_loss,
        mismatch_loss,
        capped: c1 || c2 || c3,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (|Γ|, VSWR, return loss dB, mismatch loss dB): the same hand-computed (f64) vectors
    /// as the f32 path's `reflection` tests, from the textbook relations.
    const VECTORS: [(f64, f64, f64, f64); 4] = [
        (0.1, 1.222_222_2, 20.0, 0.043_648_1),
        (1.0 / 3.0, 2.0, 9.542_425_1, 0.511_525_2),
        (0.5, 3.0, 6.020_600_0, 1.249_387_4),
        (0.9, 19.0, 0.915_149_8, 7.212_463_9),
    ];
    /// Bounds for these vectors: 0.001 dB and 0.01 % (well inside the chain's stated bounds).
    const DB_TOL: f64 = 0.001;
    const VSWR_REL_TOL: f64 = 1e-4;

    #[test]
    fn vectors() {
        for &(g, s, rl, ml) in VECTORS.iter() {
            let r = from_gamma(GammaQ31::from_bits(libm::round(g * 2_147_483_648.0) as u32));
            let rl_got = f64::from(r.return_loss.to_bits()) / 65_536.0;
            let ml_got = f64::from(r.mismatch_loss.to_bits()) / 65_536.0;
            let s_got = f64::from(r.vswr.to_bits()) / 65_536.0;
            assert!((rl_got - rl).abs() < DB_TOL, "RL {g}: {rl_got}");
            assert!((ml_got - ml).abs() < DB_TOL, "ML {g}: {ml_got}");
            assert!((s_got - s).abs() < VSWR_REL_TOL * s, "VSWR {g}: {s_got}");
            assert!(!r.capped);
        }
    }

    #[test]
    fn monotonic_in_gamma() {
        let mut prev = DbQ16::ZERO;
        for k in 0..(1u32 << 15) {
            let ml = from_gamma(GammaQ31::from_bits(k << 11)).mismatch_loss;
            assert!(ml >= prev, "at {k}");
            prev = ml;
        }
    }

    #[test]
    fn limits() {
        assert_eq!(from_gamma(GammaQ31::MATCHED), FixedReflection::MATCHED);
        assert_eq!(from_gamma(GammaQ31::TOTAL), FixedReflection::TOTAL);
        // One unit below total reflection: VSWR capped, mismatch loss finite (≈ 90 dB).
        let r = from_gamma(GammaQ31::from_bits(GAMMA_ONE_Q31 - 1));
        assert_eq!(r.vswr, VswrQ16::CEILING);
        assert!(r.capped);
        // Smallest non-zero |Γ| (4.7e-10, 186.6 dB): return loss capped.
        let r = from_gamma(GammaQ31::from_bits(1));
        assert_eq!(r.return_loss.to_bits(), DB_CEILING_Q16);
    }
}
