//! The per-reading chain in integer arithmetic: two detector readings → quality verdict,
//! |Γ|, VSWR, return loss and mismatch loss, for each detector law.
//!
//! | chain | reading | |Γ| from | method |
//! |---|---|---|---|
//! | [`LinearChain`] | ADC code ∝ amplitude | r/f | RL = 20·log10 2 · (log2 f − log2 r); VSWR = 2^(2·log2(f+r) − log2(f²−r²)); ML = 10·log10 2 · (2·log2 f − log2(f²−r²)) |
//! | [`SquareLawChain`] | ADC code ∝ power | √(r/f) | RL = 10·log10 2 · (log2 f − log2 r); ML = 10·log10 2 · (log2 f − log2(f−r)); VSWR = (1+\|Γ\|)²·f/(f−r) |
//! | [`DbmChain`] | power in dBm, Q16.16 | 10^(−d/20), d = Pf − Pr | RL = d; VSWR from log2(1 ± \|Γ\|), ML from log2(1 − \|Γ\|²) |
//! | [`LogDetectorChain`] | ADC code of a log detector, V = slope·(P − intercept) | as [`DbmChain`] | d from the code difference |
//!
//! For the code laws every logarithm is taken of an exact integer (f, r, f + r, f − r,
//! f² − r²), so the
//! ill-conditioned 1 − |Γ| near a total reflection is exact. For the dB laws, 1 − |Γ| with
//! |Γ| near 1 (d < 2.17 dB, y = d·ln 10/20 < 0.25) uses the series
//! ln(1 − e^(−y)) = ln y − y/2 + y²/24 − y⁴/2880 + … (from ln((1 − e^(−y))/y) =
//! −y/2 + ln(sinh(y/2)/(y/2)) and the Taylor series of ln(sinh x / x), e.g. Abramowitz &
//! Stegun 4.5.64 with 4.1.24), truncated after y²/24 (error < 2e-6 in log2).
//!
//! Verdict (same meaning and flag names as the f32 path's `bridge`): a forward reading at or
//! above the full-scale limit is [`FixedFault::ForwardSaturated`], a reflected one
//! [`FixedFault::ReflectedSaturated`]; a forward reading at or below the noise floor is
//! [`FixedFault::ForwardBelowFloor`]; a reflected reading above the forward one by more than
//! the total-reflection margin (noise, or a reversed connection) is
//! [`FixedFault::ReflectedAboveForward`], within the margin it reads as |Γ| = 1 with
//! [`FixedQuality::CLAMPED_TOTAL`]. A reflected reading equal to the forward one is a total
//! reflection. A reflected reading at or below the floor (a zero code included) is not an
//! error: the floor is used in its place and [`FixedQuality::REFLECTED_AT_FLOOR`] is set, so
//! the return loss is a lower bound. [`FixedQuality::CAPPED`] marks a value at its ceiling.
//!
//! Cost: per reading, no division, no 64-bit and no floating-point operation: four table
//! logarithms, two table exponentials and a few 16 × 16 multiplies (about 260 Armv6-M
//! instructions for the code chains; see the module doc of `fixed`).
//!
//! Panic policy: nothing here panics; constructors refuse bad configurations with
//! [`FixedConfigError`].

use super::exp2::{exp2_neg_q31, exp2_neg_q31_below_32, exp2_q16};
use super::log2::{log2_nonzero_q24, log2_nonzero_u16_q24, log2_q24, ONE_Q24};
use super::q::{DbQ16, DbmQ16, GammaQ31, DB_CEILING_Q16, GAMMA_ONE_Q31};
use super::relations::{
    db10_from_log2, neg_log2_one_minus_gamma_squared, vswr_from_log2, FixedReflection, K_DB_Q16,
    K_DB_TO_LOG2,
};
use super::wide::{mul_hi, mul_hi_fast, mul_shr, mul_u16_shr};

/// Why a reading gives no measurement. Names and meaning as in the f32 path's
/// `bridge::Fault` (the variants that cannot arise with integers are left out).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum FixedFault {
    /// The forward reading is at or above the full-scale limit: the detector or ADC clips.
    ForwardSaturated,
    /// The reflected reading is at or above the full-scale limit.
    ReflectedSaturated,
    /// The forward reading is at or below the noise floor (or zero): too little drive.
    ForwardBelowFloor,
    /// The reflected reading exceeds the forward one by more than the total-reflection
    /// margin: noise, or the bridge connected backwards.
    ReflectedAboveForward,
}

/// Why a chain configuration is refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum FixedConfigError {
    /// The floor is zero or not below the full-scale limit, or the total-reflection margin
    /// is outside 0..=[`MAX_TOTAL_MARGIN_DB`] dB.
    BadLimits,
    /// A log-detector slope or ADC step of zero, or a dB-per-code figure that does not fit
    /// Q8.24 (256 dB per code or more, or below 2^-24 dB per code).
    BadScale,
}

/// Flags that qualify a valid measurement; several may be set at once. The same flags, with
/// the same bit values, as the f32 path's `bridge::Quality`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FixedQuality(u8);

impl FixedQuality {
    /// No reservations.
    pub const GOOD: FixedQuality = FixedQuality(0);
    /// The reflected reading was at or below the noise floor; the floor was used, so the
    /// return loss is a lower bound and VSWR an upper bound.
    pub const REFLECTED_AT_FLOOR: FixedQuality = FixedQuality(1);
    /// The reflected reading was slightly above forward (within the margin); |Γ| set to 1.
    pub const CLAMPED_TOTAL: FixedQuality = FixedQuality(2);
    /// The reading is within the bridge's leakage of a perfect match (set by
    /// [`super::DirectivityBounds::qualify`]).
    pub const BEYOND_DIRECTIVITY: FixedQuality = FixedQuality(4);
    /// A value reached its ceiling (100 dB or VSWR 1000).
    pub const CAPPED: FixedQuality = FixedQuality(8);

    /// True when no flag is set.
    #[inline]
    pub const fn is_good(self) -> bool {
        self.0 == 0
    }

    /// True when every flag of `other` is set in `self`.
    #[inline]
    pub const fn contains(self, other: FixedQuality) -> bool {
        self.0 & other.0 == other.0
    }

    /// The raw flag bits (for reports).
    #[inline]
    pub const fn bits(self) -> u8 {
        self.0
    }

    /// `self` with the flags of `other` added.
    #[inline]
    pub const fn with(self, other: FixedQuality) -> FixedQuality {
        FixedQuality(self.0 | other.0)
    }
}

/// One measurement from the integer chain.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FixedMeasurement {
    /// |Γ|, VSWR, return loss, mismatch loss (with the `capped` flag).
    pub reflection: FixedReflection,
    /// Reservations about this reading.
    pub quality: FixedQuality,
}

impl FixedMeasurement {
    #[inline]
    fn new(reflection: FixedReflection, quality: FixedQuality) -> Self {
        let quality = if reflection.capped {
            quality.with(FixedQuality::CAPPED)
        } else {
            quality
        };
        Self {
            reflection,
            quality,
        }
    }
}

/// The largest total-reflection margin accepted, in whole dB.
pub const MAX_TOTAL_MARGIN_DB: i16 = 3;

/// The usual total-reflection margin, 0.5 dB (common practice for detector noise on an
/// open or short; the f32 path's `BridgeSpec::new` uses the same).
pub const DEFAULT_TOTAL_MARGIN: DbQ16 = DbQ16::from_bits(1 << 15);

fn margin_ok(m: DbQ16) -> bool {
    m.to_bits() >= 0 && m <= DbQ16::from_int(MAX_TOTAL_MARGIN_DB)
}

/// Limits of a code-reading detector (linear or square law).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CodeLimits {
    /// A code at or above this is saturated (e.g. the ADC's largest code).
    pub full_scale: u16,
    /// Codes at or below this are noise (≥ 1).
    pub floor: u16,
    /// How far the reflected reading may exceed the forward one (noise on a total
    /// reflection) and still be taken as |Γ| = 1; 0..=3 dB.
    pub total_margin: DbQ16,
}

impl CodeLimits {
    /// Limits with the usual 0.5 dB total-reflection margin.
    pub const fn new(floor: u16, full_scale: u16) -> Self {
        Self {
            full_scale,
            floor,
            total_margin: DEFAULT_TOTAL_MARGIN,
        }
    }
}

/// What the verdict leaves for the arithmetic.
enum Verdict {
    /// |Γ| = 1.
    Total(FixedQuality),
    /// 0 < r < f: compute.
    Partial(u32, u32, FixedQuality),
}

/// Code limits with the margin as a Q0.16 code factor, worked out once.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
struct CodeVerdict {
    full_scale: u16,
    floor: u16,
    /// r may reach f + f · margin_q16 / 2^16 and count as a total reflection; < 2^16.
    margin_q16: u32,
}

impl CodeVerdict {
    /// `power_law`: codes ∝ power (the margin in dB is 10·log10 of a code ratio), else ∝
    /// amplitude (20·log10).
    fn new(limits: CodeLimits, power_law: bool) -> Result<Self, FixedConfigError> {
        if limits.floor == 0 || limits.floor >= limits.full_scale || !margin_ok(limits.total_margin)
        {
            return Err(FixedConfigError::BadLimits);
        }
        // 10^(m/20) = 2^(m / (20·log10 2)); for power codes 10^(m/10) = 2^(2m / (20·log10 2)).
        let m24 = (limits.total_margin.to_bits() as u32) << 8; // ≤ 3 dB in Q8.24
        let mut e = mul_hi(m24, K_DB_TO_LOG2);
        if power_law {
            e <<= 1;
        }
        // 2^e ≤ 2 (3 dB of power): the factor minus one is < 2^16.
        let factor = exp2_q16(e);
        Ok(Self {
            full_scale: limits.full_scale,
            floor: limits.floor,
            margin_q16: factor.saturating_sub(1 << 16).min(0xFFFF),
        })
    }

    #[inline]
    fn verdict(self, f: u16, r: u16) -> Result<Verdict, FixedFault> {
        if f >= self.full_scale {
            return Err(FixedFault::ForwardSaturated);
        }
        if r >= self.full_scale {
            return Err(FixedFault::ReflectedSaturated);
        }
        if f <= self.floor {
            return Err(FixedFault::ForwardBelowFloor);
        }
        let (f32_, r32) = (u32::from(f), u32::from(r));
        if r32 > f32_ {
            // f < 2^16 and margin < 2^16 (`new` caps it; the compiler cannot see a field's
            // bound): the product is < 2^32, so wrapping is exact, and the sum is < 2^17.
            let allowed = f32_ + (f32_.wrapping_mul(self.margin_q16) >> 16);
            return if r32 <= allowed {
                Ok(Verdict::Total(FixedQuality::CLAMPED_TOTAL))
            } else {
                Err(FixedFault::ReflectedAboveForward)
            };
        }
        if r32 == f32_ {
            return Ok(Verdict::Total(FixedQuality::GOOD));
        }
        if r <= self.floor {
            Ok(Verdict::Partial(
                f32_,
                u32::from(self.floor),
                FixedQuality::REFLECTED_AT_FLOOR,
            ))
        } else {
            Ok(Verdict::Partial(f32_, r32, FixedQuality::GOOD))
        }
    }
}

/// Limits of a detector read in dBm (dBm inputs or a log detector).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DbmLimits {
    /// A power at or above this is saturated (top of the detector's range).
    pub max: DbmQ16,
    /// Powers at or below this are noise (bottom of the detector's range).
    pub floor: DbmQ16,
    /// How far the reflected power may exceed the forward one and still be taken as
    /// |Γ| = 1; 0..=3 dB.
    pub total_margin: DbQ16,
}

impl DbmLimits {
    /// Limits with the usual 0.5 dB total-reflection margin.
    pub const fn new(floor: DbmQ16, max: DbmQ16) -> Self {
        Self {
            max,
            floor,
            total_margin: DEFAULT_TOTAL_MARGIN,
        }
    }

    fn check(self) -> Result<Self, FixedConfigError> {
        if self.floor >= self.max || !margin_ok(self.total_margin) {
            Err(FixedConfigError::BadLimits)
        } else {
            Ok(self)
        }
    }

    /// The verdict; on success the dB difference d = forward − reflected used (Q16.16,
    /// ≥ 0; the floor replaces a reflected power at or below it), or `None` for |Γ| = 1.
    #[inline]
    fn verdict(self, pf: DbmQ16, pr: DbmQ16) -> Result<(Option<u32>, FixedQuality), FixedFault> {
        if pf >= self.max {
            return Err(FixedFault::ForwardSaturated);
        }
        if pr >= self.max {
            return Err(FixedFault::ReflectedSaturated);
        }
        if pf <= self.floor {
            return Err(FixedFault::ForwardBelowFloor);
        }
        if pr > pf {
            return if pr - pf <= self.total_margin {
                Ok((None, FixedQuality::CLAMPED_TOTAL))
            } else {
                Err(FixedFault::ReflectedAboveForward)
            };
        }
        if pr == pf {
            return Ok((None, FixedQuality::GOOD));
        }
        let (used, q) = if pr <= self.floor {
            (self.floor, FixedQuality::REFLECTED_AT_FLOOR)
        } else {
            (pr, FixedQuality::GOOD)
        };
        // pf > used: the difference is positive (saturated at i32::MAX).
        Ok((Some((pf - used).to_bits().max(0) as u32), q))
    }
}

#[inline(always)]
fn total() -> FixedReflection {
    FixedReflection {
        gamma: GammaQ31::TOTAL,
        vswr: super::q::VswrQ16::CEILING,
        return_loss: DbQ16::ZERO,
        mismatch_loss: DbQ16::from_bits(DB_CEILING_Q16),
        capped: true,
    }
}

/// A total reflection with these flags. Kept out of line so that its constants are not
/// set up on the path of a partial reflection (on Armv6-M, about ten instructions).
#[inline(never)]
#[cold]
fn total_measurement(q: FixedQuality) -> FixedMeasurement {
    FixedMeasurement::new(total(), q)
}

const THIRTY_ONE_Q24: i32 = 31 * ONE_Q24;

/// Linear-detector chain: codes proportional to amplitude (|Γ| = r/f).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LinearChain {
    limits: CodeVerdict,
}

impl LinearChain {
    /// A chain with these limits; refused when the floor is 0 or not below full scale, or
    /// the margin is out of range.
    pub fn new(limits: CodeLimits) -> Result<Self, FixedConfigError> {
        Ok(Self {
            limits: CodeVerdict::new(limits, false)?,
        })
    }

    /// The verdict and reflection quantities for one forward and one reflected code.
    pub fn measure(&self, forward: u16, reflected: u16) -> Result<FixedMeasurement, FixedFault> {
        Ok(match self.limits.verdict(forward, reflected)? {
            Verdict::Total(q) => total_measurement(q),
            Verdict::Partial(f, r, q) => FixedMeasurement::new(linear_core(f, r), q),
        })
    }
}

/// 0 < r < f < 2^16.
#[inline]
fn linear_core(f: u32, r: u32) -> FixedReflection {
    // Each output is finished before the next logarithm, which keeps few values live (on
    // Armv6-M, fewer register spills). Every logarithm is of an exact integer < 2^32.
    // f and r came from u16 codes: the casts are exact.
    // 0 < r < f: no logarithm here is of zero.
    let lf = log2_nonzero_u16_q24(f as u16);
    let lr = log2_nonzero_u16_q24(r as u16);
    // −log2|Γ| = log2 f − log2 r ∈ [0, 16] (log2_q24 is monotonic): RL ≤ 96.4 dB, below the
    // 100 dB cap, so no cap test is needed.
    let d = lf.wrapping_sub(lr).max(0) as u32;
    let return_loss = DbQ16::from_bits(mul_u16_shr(d, K_DB_Q16, 21) as i32);
    // d < 17 · 2^24; the exponential is ≤ 2^31.
    let gamma = GammaQ31::from_bits_within_one(exp2_neg_q31_below_32(d));
    // f² − r² = (f − r)(f + r) = (1 − |Γ|²) · f² is exact in u32 (f² < 2^32) and falls as r
    // rises, so mismatch loss and VSWR come out monotonic in r.
    let lp = log2_nonzero_q24(f + r);
    // 0 < r < f < 2^16 (the verdict's order, which the compiler does not carry here): f − r
    // does not wrap and (f − r)(f + r) < f² < 2^32, so the wrapping operations are exact.
    let ld = log2_nonzero_q24(f.wrapping_sub(r).wrapping_mul(f + r));
    // log2 VSWR = log2((f + r)² / (f² − r²)).
    let (vswr, capped) = vswr_from_log2(lp.wrapping_add(lp).wrapping_sub(ld));
    // −log2(1 − |Γ|²) = log2 f² − log2(f² − r²) ≤ log2(f²/(2f − 1)) < 16: ML < 48 dB, below
    // the cap.
    let ml = lf.wrapping_add(lf).wrapping_sub(ld).max(0) as u32;
    let mismatch_loss = DbQ16::from_bits(mul_u16_shr(ml, K_DB_Q16, 22) as i32);
    FixedReflection {
        gamma,
        vswr,
        return_loss,
        mismatch_loss,
        capped,
    }
}

/// Square-law-detector chain: codes proportional to power (|Γ|² = r/f).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SquareLawChain {
    limits: CodeVerdict,
}

impl SquareLawChain {
    /// A chain with these limits; refused when the floor is 0 or not below full scale, or
    /// the margin is out of range.
    pub fn new(limits: CodeLimits) -> Result<Self, FixedConfigError> {
        Ok(Self {
            limits: CodeVerdict::new(limits, true)?,
        })
    }

    /// The verdict and reflection quantities for one forward and one reflected code.
    pub fn measure(&self, forward: u16, reflected: u16) -> Result<FixedMeasurement, FixedFault> {
        Ok(match self.limits.verdict(forward, reflected)? {
            Verdict::Total(q) => total_measurement(q),
            Verdict::Partial(f, r, q) => FixedMeasurement::new(square_core(f, r), q),
        })
    }
}

/// 0 < r < f < 2^16.
#[inline]
fn square_core(f: u32, r: u32) -> FixedReflection {
    // f and r came from u16 codes: the casts are exact. 0 < r < f: no logarithm here is of
    // zero.
    let lf = log2_nonzero_u16_q24(f as u16);
    let lr = log2_nonzero_u16_q24(r as u16);
    // −log2|Γ|² ∈ [0, 16]: RL ≤ 48.2 dB, below the cap.
    let d = lf.wrapping_sub(lr).max(0) as u32;
    let return_loss = DbQ16::from_bits(mul_u16_shr(d, K_DB_Q16, 22) as i32);
    // |Γ| = 2^(−d/2) ≤ 1 (d/2 < 9 · 2^24), so 2^31 + g < 2^32.
    let gamma = GammaQ31::from_bits_within_one(exp2_neg_q31_below_32(d >> 1));
    // −log2(1 − |Γ|²) = log2 f − log2(f − r) ∈ [0, 16]: ML ≤ 48.2 dB, below the cap.
    // r < f (the verdict's order): the difference does not wrap.
    let lm = log2_nonzero_u16_q24(f.wrapping_sub(r) as u16);
    let ml = lf.wrapping_sub(lm).max(0) as u32;
    let mismatch_loss = DbQ16::from_bits(mul_u16_shr(ml, K_DB_Q16, 22) as i32);
    let l1p =
        log2_nonzero_q24(GAMMA_ONE_Q31.wrapping_add(gamma.to_bits())).wrapping_sub(THIRTY_ONE_Q24);
    // log2 VSWR = 2·log2(1 + |Γ|) − log2(1 − |Γ|²).
    let (vswr, capped) = vswr_from_log2(l1p.wrapping_add(l1p).wrapping_add(ml as i32));
    FixedReflection {
        gamma,
        vswr,
        return_loss,
        mismatch_loss,
        capped,
    }
}

/// ln 10 / 20 · 2^32, rounded: dB (Q8.24) → y = −ln|Γ| (Q8.24).
const K_DB_TO_LN: u32 = 494_476_384;
/// log2(ln 10 / 20) in Q8.24 (−3.1187…).
const LOG2_LN10_OVER_20_Q24: i32 = -52_322_661;
/// 1/ln 2 in Q2.30.
const INV_LN2_Q30: u32 = 1_549_082_005;
/// Below this dB difference (2.1715 dB, y = 0.25) 1 − |Γ| uses the series, in Q8.24.
const SERIES_BELOW_DB_Q24: u32 = 36_431_262;
/// The largest dB difference used, 100 dB in Q8.24; above it the return loss is capped.
const DB_CEILING_Q24: u32 = (DB_CEILING_Q16 as u32) << 8;

/// From a dB difference d = forward − reflected (Q8.24, 0 < d ≤ 100 dB).
#[inline]
fn db_core(d: u32, capped: bool) -> FixedReflection {
    let return_loss = DbQ16::from_bits(((d + 128) >> 8) as i32);
    let a = mul_hi_fast(d, K_DB_TO_LOG2); // −log2|Γ|, ≤ 16.6 · 2^24
    let g = exp2_neg_q31(a); // < 2^31 because a > 0
    let gamma = GammaQ31::from_bits(g);
    let l1p = log2_q24(GAMMA_ONE_Q31.wrapping_add(g)).wrapping_sub(THIRTY_ONE_Q24);
    let l1m = if d < SERIES_BELOW_DB_Q24 {
        // log2(1 − e^(−y)) = log2 y + (−y/2 + y²/24)/ln 2, y = d · ln 10 / 20 < 0.25.
        let y = mul_hi_fast(d, K_DB_TO_LN); // Q8.24, < 2^22
        let log2_y = log2_q24(d)
            .wrapping_sub(24 * ONE_Q24)
            .wrapping_add(LOG2_LN10_OVER_20_Q24);
        // y16 < 2^14 and y2 < 2^20 follow from d < SERIES_BELOW_DB_Q24, which the compiler
        // does not carry through mul_hi_fast: both products are < 2^32, so wrapping is exact.
        let y16 = y >> 8; // Q16, < 2^14
        let y2 = y16.wrapping_mul(y16) >> 8; // y² in Q8.24, < 2^20
        let y2_over_24 = y2.wrapping_mul(2_731) >> 16; // 2731 = 2^16/24 rounded; product < 2^32
        let t = (y >> 1).saturating_sub(y2_over_24); // y/2 − y²/24 ≥ 0
        log2_y.wrapping_sub(mul_shr(t, INV_LN2_Q30, 30) as i32)
    } else {
        // |Γ| ≤ 0.78 here, so 1 − |Γ| is well conditioned.
        log2_q24(GAMMA_ONE_Q31.wrapping_sub(g)).wrapping_sub(THIRTY_ONE_Q24)
    };
    let (vswr, c2) = vswr_from_log2(l1p.wrapping_sub(l1m));
    let (mismatch_loss, c3) = if d < SERIES_BELOW_DB_Q24 {
        // l1p + l1m = log2(1 − |Γ|²) ∈ (−60, 0]: no overflow.
        db10_from_log2(0i32.wrapping_sub(l1p.wrapping_add(l1m)))
    } else {
        db10_from_log2(neg_log2_one_minus_gamma_squared(g))
    };
    FixedReflection {
        gamma,
        vswr,
        return_loss,
        mismatch_loss,
        capped: capped || c2 || c3,
    }
}

/// From a dB difference in Q8.24 (any u32): the special cases, then [`db_core`].
#[inline]
fn from_db_difference(d: u32) -> FixedReflection {
    if d == 0 {
        total()
    } else if d >= DB_CEILING_Q24 {
        db_core(DB_CEILING_Q24, true)
    } else {
        db_core(d, false)
    }
}

/// Chain for readings already in dBm (Q16.16), e.g. from a calibrated detector.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DbmChain {
    limits: DbmLimits,
}

impl DbmChain {
    /// A chain with these limits; refused when the floor is not below the maximum.
    pub fn new(limits: DbmLimits) -> Result<Self, FixedConfigError> {
        Ok(Self {
            limits: limits.check()?,
        })
    }

    /// The verdict and reflection quantities for one forward and one reflected power.
    pub fn measure(
        &self,
        forward: DbmQ16,
        reflected: DbmQ16,
    ) -> Result<FixedMeasurement, FixedFault> {
        let (d16, quality) = self.limits.verdict(forward, reflected)?;
        let reflection = match d16 {
            None => total(),
            Some(d16) if d16 >= DB_CEILING_Q16 as u32 => from_db_difference(DB_CEILING_Q24),
            Some(d16) => from_db_difference(d16 << 8),
        };
        Ok(FixedMeasurement::new(reflection, quality))
    }
}

/// A logarithmic detector read by an ADC: output V = slope · (P − intercept).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LogDetectorConfig {
    /// ADC step in nanovolts per code (e.g. 805_664 for 3.3 V over 4096 codes).
    pub adc_nv_per_code: u32,
    /// Detector slope in microvolts per dB; negative for detectors whose output falls as
    /// power rises.
    pub slope_uv_per_db: i32,
    /// The input power at which the detector's straight-line law gives 0 V.
    pub intercept: DbmQ16,
    /// Detector range: forward at or above `max` saturates, readings below `floor` are noise.
    pub limits: DbmLimits,
}

/// Log-detector chain: ADC codes of a logarithmic detector on each port.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LogDetectorChain {
    /// |dB per code| in Q8.24.
    db_per_code_q24: u32,
    /// True when the output falls as power rises.
    falling: bool,
    intercept: DbmQ16,
    limits: DbmLimits,
}

impl LogDetectorChain {
    /// A chain for this detector. The dB per code (ADC step / slope) is worked out here, once,
    /// with a 64-bit division; the per-reading path has none.
    pub fn new(config: LogDetectorConfig) -> Result<Self, FixedConfigError> {
        let limits = config.limits.check()?;
        let slope = u64::from(config.slope_uv_per_db.unsigned_abs());
        if slope == 0 || config.adc_nv_per_code == 0 {
            return Err(FixedConfigError::BadScale);
        }
        // nV/code / (1000 · µV/dB) = dB/code; · 2^24, rounded.
        let den = slope * 1000;
        let num = u64::from(config.adc_nv_per_code) << 24;
        let q = num.checked_add(den / 2).map_or(0, |n| n / den);
        if q == 0 || q >= 1 << 32 {
            return Err(FixedConfigError::BadScale);
        }
        Ok(Self {
            db_per_code_q24: q as u32,
            falling: config.slope_uv_per_db < 0,
            intercept: config.intercept,
            limits,
        })
    }

    /// The power a code stands for, in dBm (saturating).
    #[inline]
    pub fn power(&self, code: u16) -> DbmQ16 {
        let mag = mul_shr(u32::from(code), self.db_per_code_q24, 8).min(i32::MAX as u32) as i32;
        let above = DbQ16::from_bits(mag);
        if self.falling {
            self.intercept - above
        } else {
            self.intercept + above
        }
    }

    /// The verdict and reflection quantities for one forward and one reflected code.
    pub fn measure(&self, forward: u16, reflected: u16) -> Result<FixedMeasurement, FixedFault> {
        let pf = self.power(forward);
        let pr = self.power(reflected);
        let (d16, quality) = self.limits.verdict(pf, pr)?;
        let reflection = match d16 {
            None => total(),
            Some(_) if quality.contains(FixedQuality::REFLECTED_AT_FLOOR) => {
                // The floor replaced the reflected power: use the power difference.
                let d16 = d16.unwrap_or(0);
                if d16 >= DB_CEILING_Q16 as u32 {
                    from_db_difference(DB_CEILING_Q24)
                } else {
                    from_db_difference(d16 << 8)
                }
            }
            Some(_) => {
                // The code difference in the direction of rising power, ≥ 0 because the
                // powers are monotonic in the code and pr < pf; exact to Q8.24.
                let dc = if self.falling {
                    reflected.saturating_sub(forward)
                } else {
                    forward.saturating_sub(reflected)
                };
                from_db_difference(mul_shr(u32::from(dc), self.db_per_code_q24, 0))
            }
        };
        Ok(FixedMeasurement::new(reflection, quality))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const LIMITS: CodeLimits = CodeLimits::new(4, 65_535);

    fn db(x: DbQ16) -> f64 {
        f64::from(x.to_bits()) / 65_536.0
    }
    fn vswr(m: &FixedMeasurement) -> f64 {
        f64::from(m.reflection.vswr.to_bits()) / 65_536.0
    }

    /// (forward code, reflected code, return loss dB, VSWR, mismatch loss dB) for a linear
    /// detector: |Γ| = r/f and the textbook relations, evaluated in f64 by hand.
    const LINEAR_VECTORS: [(u16, u16, f64, f64, f64); 3] = [
        (10_000, 1_000, 20.0, 1.222_222_2, 0.043_648_1),
        (30_000, 10_000, 9.542_425_1, 2.0, 0.511_525_2),
        (20_000, 18_000, 0.915_149_8, 19.0, 7.212_463_9),
    ];
    /// The chain's stated bounds (module doc of `fixed`).
    const RL_TOL_DB: f64 = 0.01;
    const VSWR_REL_TOL: f64 = 0.001;
    const ML_TOL_DB: f64 = 0.005;

    #[test]
    fn linear_vectors() {
        let chain = LinearChain::new(LIMITS).unwrap();
        for &(f, r, rl, s, ml) in LINEAR_VECTORS.iter() {
            let m = chain.measure(f, r).unwrap();
            assert!(
                (db(m.reflection.return_loss) - rl).abs() < RL_TOL_DB,
                "{f} {r}"
            );
            assert!((vswr(&m) - s).abs() < VSWR_REL_TOL * s, "{f} {r}");
            assert!(
                (db(m.reflection.mismatch_loss) - ml).abs() < ML_TOL_DB,
                "{f} {r}"
            );
            assert!(m.quality.is_good());
        }
    }

    #[test]
    fn square_law_vectors() {
        // Power ratio 1/100 → |Γ| = 0.1: RL 20 dB, VSWR 1.2222, ML 0.043648 dB.
        let chain = SquareLawChain::new(LIMITS).unwrap();
        let m = chain.measure(50_000, 500).unwrap();
        assert!((db(m.reflection.return_loss) - 20.0).abs() < RL_TOL_DB);
        assert!((vswr(&m) - 1.222_222_2).abs() < VSWR_REL_TOL);
        assert!((db(m.reflection.mismatch_loss) - 0.043_648_1).abs() < ML_TOL_DB);
        // Power ratio 1/4 → |Γ| = 0.5: VSWR 3.
        let m = chain.measure(40_000, 10_000).unwrap();
        assert!((vswr(&m) - 3.0).abs() < 3.0 * VSWR_REL_TOL);
        assert_eq!(m.reflection.gamma.to_bits() >> 16, 1 << 14);
    }

    #[test]
    fn dbm_vectors() {
        let chain =
            DbmChain::new(DbmLimits::new(DbmQ16::from_int(-60), DbmQ16::from_int(30))).unwrap();
        // 20 dB apart: |Γ| = 0.1.
        let m = chain
            .measure(DbmQ16::from_int(10), DbmQ16::from_int(-10))
            .unwrap();
        assert_eq!(m.reflection.return_loss, DbQ16::from_int(20));
        assert!((vswr(&m) - 1.222_222_2).abs() < VSWR_REL_TOL);
        assert!((db(m.reflection.mismatch_loss) - 0.043_648_1).abs() < ML_TOL_DB);
        // 0.915 dB apart: |Γ| = 0.9, VSWR 19, ML 7.2125 dB (series branch).
        let m = chain
            .measure(DbmQ16::from_int(0), DbmQ16::from_centi(-92))
            .unwrap();
        let g = libm::pow(10.0, -0.92 / 20.0);
        let s = (1.0 + g) / (1.0 - g);
        let ml = -10.0 * libm::log10(1.0 - g * g);
        assert!((vswr(&m) - s).abs() < VSWR_REL_TOL * s, "{}", vswr(&m));
        assert!((db(m.reflection.mismatch_loss) - ml).abs() < ML_TOL_DB);
        assert_eq!(
            chain.measure(DbmQ16::from_int(0), DbmQ16::from_int(1)),
            Err(FixedFault::ReflectedAboveForward)
        );
        let m = chain
            .measure(DbmQ16::from_int(0), DbmQ16::from_centi(40))
            .unwrap();
        assert_eq!(m.reflection, FixedReflection::TOTAL);
        assert!(m.quality.contains(FixedQuality::CLAMPED_TOTAL));
        // Reflected below the floor: the floor is used, RL 60 dB is a lower bound.
        let m = chain
            .measure(DbmQ16::from_int(0), DbmQ16::from_int(-70))
            .unwrap();
        assert!(m.quality.contains(FixedQuality::REFLECTED_AT_FLOOR));
        assert_eq!(m.reflection.return_loss, DbQ16::from_int(60));
        assert_eq!(
            chain.measure(DbmQ16::from_int(30), DbmQ16::from_int(0)),
            Err(FixedFault::ForwardSaturated)
        );
        let m = chain
            .measure(DbmQ16::from_int(5), DbmQ16::from_int(5))
            .unwrap();
        assert_eq!(m.reflection, FixedReflection::TOTAL);
    }

    #[test]
    fn log_detector_vectors() {
        // 3.3 V / 4096 codes; −25 mV/dB, intercept +20 dBm (output 0 V at +20 dBm).
        let chain = LogDetectorChain::new(LogDetectorConfig {
            adc_nv_per_code: 805_664,
            slope_uv_per_db: -25_000,
            intercept: DbmQ16::from_int(20),
            limits: DbmLimits::new(DbmQ16::from_int(-60), DbmQ16::from_int(0)),
        })
        .unwrap();
        // Code 1000 → 0.805664 V → 20 − 32.2266 = −12.2266 dBm.
        let p = chain.power(1000).to_f32();
        assert!((p - -12.226_56).abs() < 1e-3, "{p}");
        // Reflected 621 codes higher → 20.0137 dB lower.
        let m = chain.measure(1000, 1621).unwrap();
        let want = 621.0 * 805_664.0e-9 / 25e-3;
        assert!((db(m.reflection.return_loss) - want).abs() < RL_TOL_DB);
        assert_eq!(
            chain.measure(1000, 900),
            Err(FixedFault::ReflectedAboveForward)
        );
        assert_eq!(chain.measure(0, 100), Err(FixedFault::ForwardSaturated));
        assert_eq!(
            LogDetectorChain::new(LogDetectorConfig {
                adc_nv_per_code: 1,
                slope_uv_per_db: 0,
                intercept: DbmQ16::ZERO,
                limits: DbmLimits::new(DbmQ16::from_int(-60), DbmQ16::from_int(0)),
            }),
            Err(FixedConfigError::BadScale)
        );
    }

    #[test]
    fn verdicts_and_zero_codes() {
        let chain = LinearChain::new(LIMITS).unwrap();
        assert_eq!(chain.measure(65_535, 0), Err(FixedFault::ForwardSaturated));
        assert_eq!(
            chain.measure(100, 65_535),
            Err(FixedFault::ReflectedSaturated)
        );
        assert_eq!(chain.measure(0, 0), Err(FixedFault::ForwardBelowFloor));
        assert_eq!(chain.measure(4, 0), Err(FixedFault::ForwardBelowFloor));
        // 0.5 dB margin: 100 · 10^(0.5/20) = 105.9.
        let m = chain.measure(100, 105).unwrap();
        assert_eq!(m.reflection, FixedReflection::TOTAL);
        assert!(m.quality.contains(FixedQuality::CLAMPED_TOTAL));
        assert!(m.quality.contains(FixedQuality::CAPPED));
        assert_eq!(
            chain.measure(100, 107),
            Err(FixedFault::ReflectedAboveForward)
        );
        // A zero reflected code reads as the floor: RL 20·log10(100/4) = 27.959 dB, a
        // lower bound.
        let m = chain.measure(100, 0).unwrap();
        assert!((db(m.reflection.return_loss) - 27.959_4).abs() < RL_TOL_DB);
        assert!(m.quality.contains(FixedQuality::REFLECTED_AT_FLOOR));
        let m = chain.measure(100, 100).unwrap();
        assert_eq!(m.reflection, FixedReflection::TOTAL);
        assert!(!m.quality.contains(FixedQuality::CLAMPED_TOTAL));
        assert_eq!(
            LinearChain::new(CodeLimits::new(0, 10)),
            Err(FixedConfigError::BadLimits)
        );
        assert_eq!(
            SquareLawChain::new(CodeLimits::new(10, 10)),
            Err(FixedConfigError::BadLimits)
        );
        let mut l = CodeLimits::new(1, 10);
        l.total_margin = DbQ16::from_int(4);
        assert_eq!(LinearChain::new(l), Err(FixedConfigError::BadLimits));
        // Square law: the 0.5 dB margin is a power ratio 1.122.
        let sq = SquareLawChain::new(LIMITS).unwrap();
        assert!(sq.measure(1000, 1120).is_ok());
        assert_eq!(
            sq.measure(1000, 1125),
            Err(FixedFault::ReflectedAboveForward)
        );
    }
}
