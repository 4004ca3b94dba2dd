//! Integer base-2 exponential of a Q8.24 logarithm, to Q1.31 (results ≤ 1) or Q16.16
//! (results ≥ 1).
//!
//! Method: split y = n + f with integer n and 0 ≤ f < 1; 2^n is a shift and 2^f comes from
//! linear interpolation in a 65-entry table of 2^(i/64) (the same table-and-interpolate
//! method as [`super::log2`]; error of linear interpolation h²/8 · max|f''|, e.g.
//! Hildebrand, *Introduction to Numerical Analysis*, ch. 2). With h = 1/64 and
//! f(t) = 2^t, |f''| = (ln 2)² · 2^t, so the relative error is at most
//! (ln 2)²/(8 · 64²) = 1.47e-5, the chord lying above the curve (results read high). The
//! bound, with the truncations, is [`EXP2_MAX_REL_ERROR_PPM`].
//!
//! Exact at integer y. Monotonic non-decreasing in y.
//!
//! Cost: no division, no 64-bit arithmetic; one 32 × 32 → 32 multiply with factors
//! < 2^19 and < 2^12. Table: 65 × 4 = 260 bytes of flash.
//!
//! Panic policy: nothing here panics; out-of-range results saturate.

/// Largest relative error of [`exp2_neg_q31`] and [`exp2_q16`] against the exact 2^y, in
/// parts per million, before the final shift to the output format (whose truncation is one
/// unit of that format): interpolation 14.7 ppm plus truncations, rounded up.
pub const EXP2_MAX_REL_ERROR_PPM: u32 = 16;

/// 2^(i/64) · 2^24 rounded to nearest, i = 0..=64 (computed with Python mpmath at 40 digits;
/// the unit test `table_matches_libm` re-derives every entry).
const EXP2_TABLE: [u32; 65] = [
    16777216, 16959908, 17144589, 17331282, 17520007, 17710787, 17903645, 18098603, 18295684,
    18494911, 18696307, 18899897, 19105703, 19313750, 19524063, 19736666, 19951585, 20168843,
    20388467, 20610483, 20834917, 21061794, 21291142, 21522987, 21757357, 21994279, 22233781,
    22475891, 22720638, 22968049, 23218155, 23470984, 23726566, 23984932, 24246111, 24510133,
    24777031, 25046835, 25319578, 25595290, 25874004, 26155754, 26440571, 26728490, 27019544,
    27313768, 27611195, 27911861, 28215802, 28523052, 28833647, 29147625, 29465022, 29785875,
    30110222, 30438101, 30769550, 31104608, 31443315, 31785710, 32131834, 32481727, 32835430,
    33192984, 33554432,
];

/// Table size in bytes (for the README's memory figures).
pub const EXP2_TABLE_BYTES: usize = core::mem::size_of::<[u32; 65]>();

/// 2^f in Q1.24 for a fraction f in Q0.24 (`f < 2^24`; higher bits are ignored). The result
/// is in `2^24..2^25`.
#[inline]
fn mantissa_q24(f: u32) -> u32 {
    let idx = ((f >> 18) & 0x3F) as usize; // 0..=63
    let frac = (f >> 6) & 0xFFF;
    let lo = EXP2_TABLE.get(idx).copied().unwrap_or(1 << 24);
    let hi = EXP2_TABLE.get(idx + 1).copied().unwrap_or(lo);
    // hi − lo ≤ 361_448 < 2^19 and frac < 2^12: the product is < 2^31; the sum < 2^25.
    lo.wrapping_add(hi.wrapping_sub(lo).wrapping_mul(frac) >> 12)
}

/// 2^(−a) in Q1.31 (`0..=2^31`, where 2^31 is 1.0) for a ≥ 0 in Q8.24.
#[inline]
pub fn exp2_neg_q31(a: u32) -> u32 {
    let n = a >> 24;
    let f = a & 0x00FF_FFFF;
    if f == 0 {
        // 2^(−n) exactly.
        return if n > 31 { 0 } else { (1u32 << 31) >> n };
    }
    // 2^(−n − f) = 2^(1 − f) / 2 · 2^(−n), with 0 < 1 − f < 1.
    let m = mantissa_q24((1 << 24) - f); // 2^(1−f) in Q1.24, < 2^25
                                         // m · 2^6 is 2^(1−f)/2 in Q1.31 and < 2^31.
    let g = m << 6;
    if n > 31 {
        0
    } else {
        g >> n
    }
}

/// 2^y in Q16.16 for y ≥ 0 in Q8.24; `u32::MAX` when 2^y ≥ 65536.
#[inline]
pub fn exp2_q16(y: u32) -> u32 {
    let n = y >> 24;
    if n >= 16 {
        return u32::MAX;
    }
    let m = mantissa_q24(y & 0x00FF_FFFF); // < 2^25
    if n >= 8 {
        // m < 2^25 and n − 8 ≤ 7: < 2^32.
        m << (n - 8)
    } else {
        m >> (8 - n)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (a in Q8.24, 2^−a): exact values of the exponential.
    const NEG_VECTORS: [(u32, f64); 6] = [
        (0, 1.0),
        (1 << 24, 0.5),
        (1 << 23, core::f64::consts::FRAC_1_SQRT_2),
        (3 << 24, 0.125),
        // 20 dB return loss: a = 20/(20·log10 2) = 3.321928…, 2^−a = 0.1.
        (55_732_705, 0.1),
        (31 << 24, 4.656_612_873_077_393e-10),
    ];

    /// (y in Q8.24, 2^y).
    const POS_VECTORS: [(u32, f64); 5] = [
        (0, 1.0),
        (1 << 23, core::f64::consts::SQRT_2),
        (1 << 24, 2.0),
        (167_198_116, 1000.0), // log2(1000) in Q8.24
        (15 << 24, 32_768.0),
    ];

    fn rel_bound() -> f64 {
        f64::from(EXP2_MAX_REL_ERROR_PPM) * 1e-6
    }

    #[test]
    fn vectors() {
        for &(a, want) in NEG_VECTORS.iter() {
            let got = f64::from(exp2_neg_q31(a)) / 2_147_483_648.0;
            // Relative bound plus one unit of Q1.31.
            assert!(
                (got - want).abs() <= want * rel_bound() + 1.0 / 2_147_483_648.0,
                "2^-{a}: {got} vs {want}"
            );
        }
        for &(y, want) in POS_VECTORS.iter() {
            let got = f64::from(exp2_q16(y)) / 65_536.0;
            assert!(
                (got - want).abs() <= want * rel_bound() + 1.0 / 65_536.0,
                "2^{y}: {got} vs {want}"
            );
        }
        assert_eq!(exp2_q16(16 << 24), u32::MAX);
        assert_eq!(exp2_neg_q31(40 << 24), 0);
        assert_eq!(exp2_neg_q31(u32::MAX), 0);
    }

    #[test]
    fn table_matches_libm() {
        for (i, &v) in EXP2_TABLE.iter().enumerate() {
            let want = libm::round(libm::exp2(i as f64 / 64.0) * 16_777_216.0);
            assert_eq!(f64::from(v), want, "entry {i}");
        }
    }

    #[test]
    fn bound_and_monotonic_over_fractions() {
        let mut prev = 0u32;
        let mut worst = 0.0f64;
        // Every 2^6-th fraction (the interpolation ignores the 6 low bits).
        for k in 0..(1u32 << 18) {
            let f = k << 6;
            let m = mantissa_q24(f);
            assert!(m >= prev, "monotonic at {f}");
            prev = m;
            let exact = libm::exp2(f64::from(f) / 16_777_216.0);
            let rel = (f64::from(m) / 16_777_216.0 - exact).abs() / exact;
            worst = worst.max(rel);
        }
        assert!(worst <= rel_bound(), "worst {worst}");
        let mut prev = u32::MAX;
        for k in 0..(1u32 << 16) {
            let a = k << 10; // 0 .. 64 in Q8.24
            let g = exp2_neg_q31(a);
            assert!(g <= prev, "2^-a monotonic at {a}");
            prev = g;
        }
    }
}
