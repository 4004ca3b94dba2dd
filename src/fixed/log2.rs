//! Integer base-2 logarithm of a `u32`, result in Q8.24 (`i32`, 24 fraction bits).
//!
//! Method: normalise x = 2^e · (1 + t) with 0 ≤ t < 1 by a three-step binary search and a
//! 16-entry table (Armv6-M has no count-leading-zeros instruction), then log2(1 + t) by linear interpolation in a
//! 65-entry table of log2(1 + i/64). This is the table-and-interpolate method of any numerical
//! analysis text (e.g. Hildebrand, *Introduction to Numerical Analysis*, ch. 2: the error of
//! linear interpolation is h²/8 · max|f''|). With h = 1/64 and f(t) = log2(1 + t),
//! |f''| ≤ 1/ln 2, so the interpolation error is at most 4.41e-5; the product truncation adds
//! at most 5.5e-6 (input bits below 2^-18 of the mantissa dropped) and one unit in the last
//! place (2^-24). The bound is [`LOG2_MAX_ERROR_Q24`].
//!
//! Exact at every power of two (the table is exact at its nodes and e is exact). Monotonic
//! non-decreasing in x: the interpolant of an increasing table is increasing.
//!
//! Cost: no division, no 64-bit arithmetic; one 32 × 32 → 32 multiply whose factors are
//! < 2^19 and < 2^12. Tables: 65 × 4 = 260 bytes plus 16 bytes of flash.
//!
//! Panic policy: nothing here panics. `log2_q24(0)` is [`LOG2_OF_ZERO`].

/// One in Q8.24.
pub const ONE_Q24: i32 = 1 << 24;

/// What [`log2_q24`] returns for 0: −32, below the logarithm of every non-zero `u32`, so that
/// differences of logarithms stay in range.
pub const LOG2_OF_ZERO: i32 = -32 * ONE_Q24;

/// Largest error of [`log2_q24`] against the exact log2, in Q8.24 units (835 ≈ 4.98e-5):
/// interpolation error 1/(8 · 64² · ln 2) = 4.40e-5, plus 5.5e-6 for the input bits dropped
/// below 2^-18 of the mantissa (none are dropped for x < 2^19), plus 1 unit of truncation.
pub const LOG2_MAX_ERROR_Q24: i32 = 835;

/// log2(1 + i/64) · 2^24 rounded to nearest, i = 0..=64 (computed with Python mpmath at 40
/// digits; the unit test `table_matches_libm` re-derives every entry).
const LOG2_TABLE: [u32; 65] = [
    0, 375270, 744810, 1108793, 1467383, 1820738, 2169009, 2512340, 2850868, 3184728, 3514044,
    3838941, 4159533, 4475935, 4788255, 5096595, 5401057, 5701737, 5998727, 6292118, 6581994,
    6868440, 7151536, 7431359, 7707984, 7981483, 8251926, 8519380, 8783912, 9045584, 9304457,
    9560591, 9814042, 10064867, 10313120, 10558852, 10802114, 11042956, 11281425, 11517568,
    11751428, 11983051, 12212479, 12439752, 12664911, 12887994, 13109041, 13328087, 13545168,
    13760320, 13973576, 14184969, 14394532, 14602297, 14808293, 15012551, 15215099, 15415967,
    15615181, 15812769, 16008758, 16203172, 16396036, 16587377, 16777216,
];

/// Table size in bytes (for the README's memory figures).
pub const LOG2_TABLE_BYTES: usize = core::mem::size_of::<[u32; 65]>();

/// ⌊log2 n⌋ for n = 1..=15 (entry 0 unused): the last step of the normalisation.
const FLOOR_LOG2_NIBBLE: [u8; 16] = [0, 0, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 3, 3, 3, 3];

/// x = m · 2^(e − 31) with bit 31 of m set, e = ⌊log2 x⌋; x must be non-zero.
#[inline]
fn normalize(x: u32) -> (u32, i32) {
    // Armv6-M has no count-leading-zeros instruction (and `u32::leading_zeros` would call a
    // library routine there): three halvings of the search range, then a 16-entry table.
    let mut e: u32 = 0;
    let mut top = x;
    if top >= 1 << 16 {
        top >>= 16;
        e = 16;
    }
    if top >= 1 << 8 {
        top >>= 8;
        e += 8;
    }
    if top >= 1 << 4 {
        top >>= 4;
        e += 4;
    }
    // 1 ≤ top ≤ 15 here.
    e += u32::from(FLOOR_LOG2_NIBBLE.get(top as usize).copied().unwrap_or(0));
    (x.wrapping_shl(31u32.wrapping_sub(e)), e as i32)
}

/// The same as [`log2_q24`] for a 16-bit input, one halving shorter (the code chains take the
/// logarithm of 16-bit codes; on Armv6-M this saves a few instructions a call).
#[inline]
pub fn log2_u16_q24(x: u16) -> i32 {
    if x == 0 {
        return LOG2_OF_ZERO;
    }
    let x = u32::from(x);
    let mut e: u32 = 0;
    let mut top = x;
    if top >= 1 << 8 {
        top >>= 8;
        e = 8;
    }
    if top >= 1 << 4 {
        top >>= 4;
        e += 4;
    }
    e += u32::from(FLOOR_LOG2_NIBBLE.get(top as usize).copied().unwrap_or(0));
    // e ≤ 15 and the mantissa log ≤ 2^24: the sum is < 2^28.
    ((e << 24).wrapping_add(log2_mantissa(x.wrapping_shl(31u32.wrapping_sub(e))))) as i32
}

/// log2(m / 2^31) in Q8.24 (in `0..2^24`) for m with bit 31 set.
#[inline]
fn log2_mantissa(m: u32) -> u32 {
    // t = fraction after the leading one, 32 bits: index = top 6 bits, then 12 bits of
    // position inside the segment. The bits below are dropped (≤ 2^-18 of t).
    let t = m << 1;
    let idx = (t >> 26) as usize; // 0..=63
    let frac = (t >> 14) & 0xFFF;
    let lo = LOG2_TABLE.get(idx).copied().unwrap_or(0);
    let hi = LOG2_TABLE.get(idx + 1).copied().unwrap_or(lo);
    // hi − lo ≤ 375_270 < 2^19 and frac < 2^12: the product is < 2^31.
    lo.wrapping_add(hi.wrapping_sub(lo).wrapping_mul(frac) >> 12)
}

/// log2(x) in Q8.24: for x ≥ 1 the result is in `0..32 · 2^24`. See the module doc for the
/// error bound; `log2_q24(0)` returns [`LOG2_OF_ZERO`].
// Inlined: on Armv6-M this saves about 12 of ~350 instructions per reading at the cost of
// about 350 bytes of flash per chain (measured with host-tests/scripts/m0_instruction_count.py).
#[inline]
pub fn log2_q24(x: u32) -> i32 {
    if x == 0 {
        return LOG2_OF_ZERO;
    }
    let (m, e) = normalize(x);
    // e ≤ 31 and the mantissa log ≤ 2^24: the sum is < 2^29.
    (e << 24).wrapping_add(log2_mantissa(m) as i32)
}

/// log2(hi · 2^32 + lo) in Q8.24 (in `0..64 · 2^24`), same error bound as [`log2_q24`]
/// (the low bits beyond the 32-bit mantissa are dropped, which the bound already allows).
/// Monotonic non-decreasing in the 64-bit value. 0 gives [`LOG2_OF_ZERO`].
#[inline]
pub fn log2_u64_q24(hi: u32, lo: u32) -> i32 {
    if hi == 0 {
        return log2_q24(lo);
    }
    let (m_hi, e) = normalize(hi); // hi = m_hi · 2^(e − 31), 0 ≤ e ≤ 31
    let s = 31i32.wrapping_sub(e) as u32; // left shift applied to hi, 0..=31
    let m = if s == 0 {
        m_hi
    } else {
        m_hi | lo.wrapping_shr(32u32.wrapping_sub(s))
    };
    // value ≈ m · 2^(e + 1): e + 1 + 31 ≤ 63, the sum < 2^30.
    (e.wrapping_add(32) << 24).wrapping_add(log2_mantissa(m) as i32)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (x, log2 x): exact values by definition of the logarithm.
    const VECTORS: [(u32, f64); 9] = [
        (1, 0.0),
        (2, 1.0),
        (3, 1.584_962_500_721_156),
        (10, core::f64::consts::LOG2_10),
        (1000, 9.965_784_284_662_087),
        (65_535, 15.999_977_986_052_736),
        (65_536, 16.0),
        (0x8000_0000, 31.0),
        (u32::MAX, 31.999_999_999_664_1),
    ];

    fn err(x: u32) -> f64 {
        let got = f64::from(log2_q24(x)) / f64::from(ONE_Q24);
        (got - libm::log2(f64::from(x))).abs()
    }

    #[test]
    fn vectors() {
        let bound = f64::from(LOG2_MAX_ERROR_Q24) / f64::from(ONE_Q24);
        for &(x, want) in VECTORS.iter() {
            let got = f64::from(log2_q24(x)) / f64::from(ONE_Q24);
            assert!(
                (got - want).abs() <= bound,
                "log2({x}) = {got}, want {want}"
            );
        }
        assert_eq!(log2_q24(0), LOG2_OF_ZERO);
        for k in 0..32 {
            assert_eq!(log2_q24(1 << k), k * ONE_Q24, "exact at 2^{k}");
        }
    }

    #[test]
    fn sixteen_bit_logarithm_is_the_same() {
        for x in 0..=u16::MAX {
            assert_eq!(log2_u16_q24(x), log2_q24(u32::from(x)), "{x}");
        }
    }

    #[test]
    fn wide_logarithm() {
        let bound = f64::from(LOG2_MAX_ERROR_Q24) / f64::from(ONE_Q24);
        assert_eq!(log2_u64_q24(0, 0), LOG2_OF_ZERO);
        assert_eq!(log2_u64_q24(0, 8), 3 * ONE_Q24);
        assert_eq!(log2_u64_q24(1, 0), 32 * ONE_Q24);
        assert_eq!(log2_u64_q24(1 << 30, 0), 62 * ONE_Q24);
        let mut x: u64 = 1;
        while x < u64::MAX / 3 {
            let got = f64::from(log2_u64_q24((x >> 32) as u32, x as u32)) / f64::from(ONE_Q24);
            assert!((got - libm::log2(x as f64)).abs() <= bound, "{x}");
            x = x * 3 + 1;
        }
    }

    #[test]
    fn table_matches_libm() {
        for (i, &v) in LOG2_TABLE.iter().enumerate() {
            let want = libm::round(libm::log2(1.0 + i as f64 / 64.0) * 16_777_216.0);
            assert_eq!(f64::from(v), want, "entry {i}");
        }
    }

    #[test]
    fn bound_and_monotonic_over_all_u16_and_u17() {
        let bound = f64::from(LOG2_MAX_ERROR_Q24) / f64::from(ONE_Q24);
        let mut worst = 0.0f64;
        let mut prev = LOG2_OF_ZERO;
        for x in 1..=(1u32 << 17) {
            worst = worst.max(err(x));
            let y = log2_q24(x);
            assert!(y >= prev, "monotonic at {x}");
            prev = y;
        }
        assert!(worst <= bound, "worst {worst}");
        // Large inputs: a stride through the whole u32 range.
        let mut x: u32 = 1;
        while x < u32::MAX - 40_009 {
            assert!(err(x) <= bound, "{x}");
            x += 40_009;
        }
    }
}
