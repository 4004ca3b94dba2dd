//! 32 × 32 → 64-bit unsigned multiply built from four 16 × 16 products, and the fixed-point
//! scalings built on it.
//!
//! Why: on Armv6-M (Cortex-M0/M0+) `MULS` gives only the low 32 bits of a product, and a
//! `u64` multiply becomes a call to a library routine. Splitting both operands into 16-bit
//! halves (schoolbook multiplication, e.g. Knuth, *TAOCP* vol. 2, §4.3.1) needs four `MULS`
//! and a few adds, all in 32-bit registers, and is exact.
//!
//! Panic policy: nothing here panics; every add is proven not to overflow (comments) and is
//! written `wrapping_add` so that the release and debug code are the same.

/// The exact 64-bit product of `a` and `b` as `(high word, low word)`.
#[inline]
pub const fn mul_wide(a: u32, b: u32) -> (u32, u32) {
    let (ah, al) = (a >> 16, a & 0xFFFF);
    let (bh, bl) = (b >> 16, b & 0xFFFF);
    // Each 16 × 16 product is < 2^32.
    let ll = al * bl;
    let lh = al * bh;
    let hl = ah * bl;
    let hh = ah * bh;
    // mid < 3 · 2^16: no overflow.
    let mid = (ll >> 16)
        .wrapping_add(lh & 0xFFFF)
        .wrapping_add(hl & 0xFFFF);
    let lo = (ll & 0xFFFF) | (mid << 16);
    // The sum is the true high word of a product < 2^64, so it is < 2^32.
    let hi = hh
        .wrapping_add(lh >> 16)
        .wrapping_add(hl >> 16)
        .wrapping_add(mid >> 16);
    (hi, lo)
}

/// ⌊a · b / 2^32⌋ (the high word of the product).
#[inline]
pub const fn mul_hi(a: u32, b: u32) -> u32 {
    mul_wide(a, b).0
}

/// ⌊a · b / 2^32⌋ less 0, 1 or 2: three 16 × 16 products (the low × low one and the
/// carries are dropped). Monotonic non-decreasing in `a` for fixed `b`.
///
/// Why: LLVM recognises the full four-product pattern of [`mul_hi`] and turns it back into
/// one `u64` multiply, which on Armv6-M is a call to `__aeabi_lmul`; this truncated form
/// stays three inline `MULS`. Used for the scalings by constants in the per-reading chain,
/// where 2 units in the last place are far inside the error budget.
#[inline]
pub const fn mul_hi_fast(a: u32, b: u32) -> u32 {
    let (ah, al) = (a >> 16, a & 0xFFFF);
    let (bh, bl) = (b >> 16, b & 0xFFFF);
    // The three terms sum to at most the true high word, < 2^32.
    (ah * bh)
        .wrapping_add((ah * bl) >> 16)
        .wrapping_add((al * bh) >> 16)
}

/// ⌊x · k / 2^shift⌋ for x < 2^30, a 16-bit factor k and `shift` in `16..=31`, less 0 or 1
/// (two 16 × 16 products: the floor of each part). Monotonic non-decreasing in `x`.
/// Used for the scalings by a constant with 16 significant bits (relative precision
/// 2^-16), two `MULS` instead of three.
#[inline]
pub const fn mul_u16_shr(x: u32, k: u16, shift: u32) -> u32 {
    let k = k as u32;
    let s = if shift < 16 {
        16
    } else if shift > 31 {
        31
    } else {
        shift
    };
    // (x >> 16) < 2^14 so the first product is < 2^30; (x & 0xFFFF) · k < 2^32.
    (((x >> 16) * k) >> (s - 16)).wrapping_add(((x & 0xFFFF) * k) >> s)
}

/// ⌊a · b / 2^shift⌋ for `shift` in `0..=32`, saturated to `u32::MAX` when it does not fit.
/// A `shift` above 32 is treated as 32.
#[inline]
pub const fn mul_shr(a: u32, b: u32, shift: u32) -> u32 {
    let (hi, lo) = mul_wide(a, b);
    if shift >= 32 {
        hi
    } else if shift == 0 {
        if hi != 0 {
            u32::MAX
        } else {
            lo
        }
    } else if (hi >> shift) != 0 {
        u32::MAX
    } else {
        (hi << (32 - shift)) | (lo >> shift)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (a, b): the expected value is the exact `u64` product (Rust's own 64-bit multiply).
    const VECTORS: [(u32, u32); 8] = [
        (0, 0),
        (1, 1),
        (0xFFFF_FFFF, 0xFFFF_FFFF),
        (0xFFFF_FFFF, 1),
        (0x8000_0000, 2),
        (0x1234_5678, 0x9ABC_DEF0),
        (65_535, 65_537),
        (101_008_905, 536_870_911),
    ];

    #[test]
    fn exact_products() {
        for &(a, b) in VECTORS.iter() {
            let p = u64::from(a) * u64::from(b);
            assert_eq!(mul_wide(a, b), ((p >> 32) as u32, p as u32), "{a} {b}");
            for s in 0..=32u32 {
                let want = u32::try_from(p >> s).unwrap_or(u32::MAX);
                assert_eq!(mul_shr(a, b, s), want, "{a} {b} {s}");
            }
        }
    }

    #[test]
    fn fast_high_word_is_within_two_units() {
        let mut x: u32 = 0x2545_F491;
        for &(a, b) in VECTORS.iter() {
            let exact = mul_hi(a, b);
            let fast = mul_hi_fast(a, b);
            assert!(fast <= exact && exact - fast <= 2, "{a} {b}");
        }
        for _ in 0..100_000 {
            x ^= x << 13;
            x ^= x >> 17;
            x ^= x << 5;
            let b = x.rotate_left(7);
            let exact = mul_hi(x, b);
            let fast = mul_hi_fast(x, b);
            assert!(fast <= exact && exact - fast <= 2, "{x} {b}");
            // Monotonic in a, including across a carry into the high half.
            let up = x | 0xFFFF;
            if up < u32::MAX {
                assert!(mul_hi_fast(up, b) <= mul_hi_fast(up + 1, b), "{up} {b}");
            }
        }
    }

    #[test]
    fn sixteen_bit_scaling() {
        let mut x: u32 = 0x1357_9BDF;
        for _ in 0..100_000 {
            x ^= x << 13;
            x ^= x >> 17;
            x ^= x << 5;
            let a = x >> 2; // < 2^30
            let k = (x >> 7) as u16;
            for s in [16u32, 21, 22, 31] {
                let exact = (u64::from(a) * u64::from(k)) >> s;
                let got = u64::from(mul_u16_shr(a, k, s));
                assert!(got <= exact && exact - got <= 1, "{a} {k} {s}");
            }
            if a < (1 << 30) - 1 {
                assert!(mul_u16_shr(a, k, 21) <= mul_u16_shr(a + 1, k, 21));
            }
        }
    }

    #[test]
    fn pseudo_random_products() {
        let mut x: u32 = 0x9E37_79B9;
        for _ in 0..10_000 {
            x ^= x << 13;
            x ^= x >> 17;
            x ^= x << 5;
            let y = x.rotate_left(11) ^ 0x5555_AAAA;
            let p = u64::from(x) * u64::from(y);
            assert_eq!(mul_wide(x, y), ((p >> 32) as u32, p as u32));
        }
    }
}
