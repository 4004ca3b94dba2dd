//! Base-2 logarithm of an f32.
//!
//! Method: split x = 2^k · m with m in [√½, √2) from the exponent and mantissa bits (the
//! range reduction of the Cephes and musl `logf`: add the bit pattern of 1 − √½ so that the
//! exponent field rounds at √2 instead of 2), then use
//! ln m = 2·atanh(t) = 2·(t + t³/3 + t⁵/5 + …) with t = (m − 1)/(m + 1)
//! (Abramowitz & Stegun, *Handbook of Mathematical Functions*, 4.1.27):
//! log2 x = k + t·(c1 + c3·t² + c5·t⁴), where c1, c3, c5 are the near-minimax fit of
//! 2·atanh(t)/(t·ln 2) over t² in [0, 0.0294] (Chebyshev interpolation with Python mpmath's
//! `chebyfit`: host-tests/scripts/log2_coefficients.py).
//!
//! Error: |t| ≤ (√2 − 1)/(√2 + 1) = 0.1716, and the fit is within 3.5e-7 of the series sum,
//! so the method error is below 6.0e-8; f32 rounding of the eight operations adds a few
//! units of 2^-24 of the result's magnitude. [`LOG2_MAX_ERROR`] is the bound the tests hold,
//! absolute for |log2 x| ≤ 1 and relative above. It is exact at powers of two (t = 0) and its
//! sign is right: ≤ 0 for x ≤ 1, ≥ 0 for x ≥ 1.
//!
//! Cost: one division and seven other f32 operations, no branch; about 22 instructions on
//! a Cortex-M4F against about 70 for libm's `log10f`.
//!
//! Domain: positive normal x. Any other bit pattern (0, a subnormal, a negative, NaN or
//! infinity) still gives a finite number, but not a logarithm: callers check the domain.
//!
//! Panic policy: nothing here panics.

/// Largest error of [`log2`] against the exact log2: absolute for |log2 x| ≤ 1, relative
/// (to |log2 x|) above; the method error 6.0e-8 plus rounding. The sweep below measures
/// 1.8e-7.
#[cfg_attr(not(test), allow(dead_code))] // held by the tests below
pub(crate) const LOG2_MAX_ERROR: f32 = 2.0e-7;

/// Bit pattern of 1.0 minus that of √½: added to x's bits, it carries into the exponent
/// field exactly when the mantissa is at least √2.
const SHIFT: u32 = 0x3f80_0000 - 0x3f35_04f3;
/// The sign and exponent fields.
const EXPONENT_MASK: u32 = 0xff80_0000;
/// Bit pattern of 1.0.
const ONE_BITS: u32 = 0x3f80_0000;

/// The fit's coefficients (printed by host-tests/scripts/log2_coefficients.py); the series
/// values 2/(n·ln 2) would be 2.885390, 0.961797, 0.577078.
const C1: f32 = 2.885_390_4;
const C3: f32 = 0.961_589;
const C5: f32 = 0.595_759_6;

/// log2 x for positive normal x (see the module doc for the domain and the error).
#[inline]
pub(crate) fn log2(x: f32) -> f32 {
    let bits = x.to_bits();
    // 2^k with the exponent rounded at √2: x = 2^k · m, m in [√½, √2).
    let e = bits.wrapping_add(SHIFT) & EXPONENT_MASK;
    // (e >> 23) is at most 511: the subtraction cannot overflow.
    let k = (e >> 23) as i32 - 127;
    let m = f32::from_bits(bits.wrapping_sub(e).wrapping_add(ONE_BITS));
    k as f32 + log2_of_ratio((m - 1.0) / (m + 1.0))
}

/// log2((1 + t)/(1 − t)) for |t| ≤ 0.1716, the same polynomial: for callers that can form t
/// without a cancellation (mismatch loss: 1 − x = (1 − t)/(1 + t) with t = x/(2 − x)).
/// Same error bound as [`log2`]; outside that range the error grows (it stays finite).
#[inline]
pub(crate) fn log2_of_ratio(t: f32) -> f32 {
    let t2 = t * t;
    t * ((C5 * t2 + C3) * t2 + C1)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (x, log2 x): exact values, and values from f64 `libm::log2` rounded to f32.
    const VECTORS: [(f32, f32); 12] = [
        (1.0, 0.0),
        (2.0, 1.0),
        (0.5, -1.0),
        (1024.0, 10.0),
        (1.0e-5, -16.609_64),
        (0.1, -core::f32::consts::LOG2_10),
        (core::f32::consts::FRAC_1_SQRT_2, -0.5),
        (core::f32::consts::SQRT_2, 0.5),
        (0.999_999_94, -8.599_5e-8),
        (1.000_000_1, 1.719_9e-7),
        (3.0, 1.584_962_5),
        (0.9, -0.152_003_1),
    ];

    fn error(got: f32, want: f64) -> f64 {
        (f64::from(got) - want).abs() / want.abs().max(1.0)
    }

    #[test]
    fn vectors() {
        for &(x, want) in VECTORS.iter() {
            let got = log2(x);
            let err = error(got, f64::from(want));
            assert!(
                err <= f64::from(LOG2_MAX_ERROR) + 1e-7,
                "{x}: {got} vs {want}"
            );
        }
    }

    #[test]
    fn powers_of_two_are_exact() {
        for k in -126..=127 {
            let x = libm::exp2f(k as f32);
            assert_eq!(log2(x), k as f32, "2^{k}");
        }
    }

    /// Every 97th f32 in [2^-20, 2^20] against f64 libm log2 (a port of a general-purpose C
    /// math library, from the registries).
    #[test]
    fn sweep_against_f64() {
        let lo = libm::exp2f(-20.0).to_bits();
        let hi = libm::exp2f(20.0).to_bits();
        let mut worst = 0.0f64;
        for bits in (lo..hi).step_by(97) {
            let x = f32::from_bits(bits);
            let want = libm::log2(f64::from(x));
            let got = log2(x);
            worst = worst.max(error(got, want));
            assert!(
                (got <= 0.0) == (x <= 1.0) || got == 0.0,
                "sign of log2({x}) = {got}"
            );
        }
        assert!(worst <= f64::from(LOG2_MAX_ERROR), "worst {worst}");
    }

    /// log2((1 + t)/(1 − t)) over its whole range against f64 libm.
    #[test]
    fn ratio_form_against_f64() {
        for i in -1000..=1000 {
            let t = 0.1716 * i as f32 / 1000.0;
            let want = libm::log2((1.0 + f64::from(t)) / (1.0 - f64::from(t)));
            let got = log2_of_ratio(t);
            assert!(
                error(got, want) <= f64::from(LOG2_MAX_ERROR),
                "{t}: {got} {want}"
            );
        }
    }

    #[test]
    fn finite_for_any_bits() {
        for x in [0.0, -1.0, f32::NAN, f32::INFINITY, f32::NEG_INFINITY, 1e-40] {
            assert!(log2(x).is_finite(), "{x}");
        }
    }
}
