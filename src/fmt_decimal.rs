//! Decimal text for `f32` with integer arithmetic only: a fixed number of fraction digits
//! ([`write_fixed`], the bytes of `core::fmt`'s `{:>width$.decimals$}`) and the shortest
//! decimal that reads back to the same `f32` ([`write_shortest`], the bytes of `{}`), and a
//! value in a decimal unit such as MHz ([`write_scaled`]).
//!
//! Why not `core::fmt`: its float formatting (`flt2dec`, with its `bignum`) keeps panic paths
//! that the link-time panic-freedom proof (`boards/panic-proof`) rejects. Here every value is
//! an exact integer computation on the float's bits (`m · 2^e`), in `u64`/`u128`.
//!
//! Method. Fixed: `round(|x| · 10^d)` to nearest, ties to even, on the exact binary value,
//! then integer and fraction parts; for `|x| ≥ 2^24` the value is an integer and is printed
//! exactly (`u128`). Shortest: from the fewest significant digits up, the decimal nearest to
//! `x` with that many digits (of two equally near, the larger, as `core::fmt` does; the other
//! neighbour when the nearer is outside) is taken as soon as it lies inside the interval of
//! reals that round to `x` (ends included when the mantissa is even, as round-to-nearest-even
//! reading does); every comparison is exact in `u128`.
//!
//! Same bytes as `core::fmt` for every finite `f32` in fixed form, and in shortest form for
//! every `f32` whose magnitude is at least 1e-36 (the host test
//! `host-tests/tests/fmt_decimal.rs` checks both against Rust's std `format!` over many
//! values). Below that, where the exact comparison would need more than 128 bits, nine
//! significant digits are written (still the same `f32` when read back, not always the
//! shortest). NaN and infinities, which no feedline API produces, are written as `NaN`,
//! `inf` and `-inf`, as `core::fmt` does. Negative zero keeps its sign (`-0`, `-0.000`), as
//! in `core::fmt`.
//!
//! Panic policy: nothing here panics; only the writer's own errors come back.

use core::fmt::{self, Write};

/// The most fraction digits [`write_fixed`] writes; more are clamped to this.
pub const MAX_DECIMALS: u8 = 9;

/// Sign, magnitude mantissa `m` and exponent `e` of a finite `x`: `|x| = m · 2^e`, plus
/// whether the lower neighbour is nearer than the upper one (a power of two above the
/// smallest normal).
struct Decoded {
    negative: bool,
    m: u32,
    e: i32,
    closer_below: bool,
}

enum Kind {
    Finite(Decoded),
    Nan,
    Infinite(bool),
}

fn decode(x: f32) -> Kind {
    let bits = x.to_bits();
    let negative = bits >> 31 != 0;
    let exp = (bits >> 23) & 0xFF;
    let frac = bits & 0x007F_FFFF;
    if exp == 0xFF {
        return if frac == 0 {
            Kind::Infinite(negative)
        } else {
            Kind::Nan
        };
    }
    let (m, e) = if exp == 0 {
        (frac, -149)
    } else {
        // exp ≤ 254: e ≤ 104.
        (frac | 0x0080_0000, exp as i32 - 150)
    };
    Kind::Finite(Decoded {
        negative,
        m,
        e,
        closer_below: frac == 0 && exp > 1,
    })
}

/// 10^k for k ≤ [`MAX_DECIMALS`].
const POW10: [u64; 10] = [
    1,
    10,
    100,
    1_000,
    10_000,
    100_000,
    1_000_000,
    10_000_000,
    100_000_000,
    1_000_000_000,
];

/// 5^k in a `u128` (k ≤ 55), else `None`.
#[inline(never)]
fn pow5_u128(k: u32) -> Option<u128> {
    5u128.checked_pow(k)
}

/// `a · b`, or `None` past 128 bits. One out-of-line copy: each inlined 128-bit multiply is
/// dozens of instructions on a 32-bit core.
#[inline(never)]
fn mul_u128(a: u128, b: u128) -> Option<u128> {
    a.checked_mul(b)
}

/// The two candidates `⌊n / d⌋` and `⌊n / d⌋ + 1`, the nearer first (of two equally near,
/// the larger, as `core::fmt`'s shortest form breaks such a tie); `d > 0`.
fn neighbours(n: u128, d: u128) -> Option<[u128; 2]> {
    let (q, r) = if let (Ok(n64), Ok(d64)) = (u64::try_from(n), u64::try_from(d)) {
        (
            u128::from(n64.checked_div(d64)?),
            u128::from(n64.checked_rem(d64)?),
        )
    } else {
        (n.checked_div(d)?, n.checked_rem(d)?)
    };
    let up = q.checked_add(1)?;
    // r < d, so d − r does not wrap; r ≥ d − r ⇔ 2r ≥ d.
    Some(if r >= d.wrapping_sub(r) {
        [up, q]
    } else {
        [q, up]
    })
}

/// The ASCII digits of `v`, most significant first: the buffer and the first used index.
fn digits_u128(mut v: u128) -> ([u8; 40], usize) {
    let mut buf = [b'0'; 40];
    let mut start = buf.len();
    loop {
        let digit = (v % 10) as u8; // < 10
        v /= 10;
        start = start.saturating_sub(1);
        if let Some(b) = buf.get_mut(start) {
            *b = b'0'.wrapping_add(digit);
        }
        if v == 0 || start == 0 {
            break;
        }
    }
    (buf, start)
}

fn write_digits<W: Write>(w: &mut W, v: u128) -> fmt::Result {
    let (buf, start) = digits_u128(v);
    w.write_str(core::str::from_utf8(buf.get(start..).unwrap_or(&[])).unwrap_or(""))
}

fn write_repeat<W: Write>(w: &mut W, c: char, n: usize) -> fmt::Result {
    for _ in 0..n {
        w.write_char(c)?;
    }
    Ok(())
}

fn count_digits(v: u128) -> usize {
    let (_, start) = digits_u128(v);
    40usize.saturating_sub(start)
}

fn write_token<W: Write>(w: &mut W, token: &str, width: usize) -> fmt::Result {
    write_repeat(w, ' ', width.saturating_sub(token.len()))?;
    w.write_str(token)
}

/// Write `x` with exactly `decimals` fraction digits (at most [`MAX_DECIMALS`]), right-aligned
/// in `width` columns: the same bytes as `write!(w, "{:>width$.decimals$}", x)`.
///
/// Rounding is to nearest, ties to even, on the exact binary value of `x`.
pub fn write_fixed<W: Write>(w: &mut W, x: f32, decimals: u8, width: usize) -> fmt::Result {
    let d = match decode(x) {
        Kind::Finite(d) => d,
        Kind::Nan => return write_token(w, "NaN", width),
        Kind::Infinite(false) => return write_token(w, "inf", width),
        Kind::Infinite(true) => return write_token(w, "-inf", width),
    };
    let decimals = decimals.min(MAX_DECIMALS);
    let scale = POW10.get(usize::from(decimals)).copied().unwrap_or(1); // ≤ 10^9
    let (int, frac) = if d.e >= 0 {
        // An integer m · 2^e < 2^128 (e ≤ 104); no fraction.
        ((u128::from(d.m)) << d.e.unsigned_abs().min(104), 0u64)
    } else {
        let s = d.e.unsigned_abs(); // 1..=149
                                    // m · 10^d < 2^24 · 2^30 = 2^54.
        let num = u64::from(d.m).wrapping_mul(scale);
        let r = if s > 55 {
            0 // num < 2^54 < 2^(s−1): below half a unit of the last digit.
        } else {
            // 1 ≤ s ≤ 55: the shifts are in range and s − 1 does not wrap.
            let q = num >> s;
            let rem = num & (1u64 << s).wrapping_sub(1);
            let half = 1u64 << s.wrapping_sub(1);
            if rem > half || (rem == half && q & 1 == 1) {
                q.wrapping_add(1) // q < 2^54: no wrap
            } else {
                q
            }
        };
        (u128::from(r / scale), r % scale)
    };
    let mut len = count_digits(int);
    if d.negative {
        len = len.saturating_add(1);
    }
    if decimals > 0 {
        len = len.saturating_add(1 + usize::from(decimals));
    }
    write_repeat(w, ' ', width.saturating_sub(len))?;
    if d.negative {
        w.write_char('-')?;
    }
    write_digits(w, int)?;
    if decimals > 0 {
        w.write_char('.')?;
        let f = count_digits(u128::from(frac));
        write_repeat(w, '0', usize::from(decimals).saturating_sub(f))?;
        write_digits(w, u128::from(frac))?;
    }
    Ok(())
}

/// `|x| = digits · 10^exp10` with the fewest digits that read back to `x`; `strict` leaves
/// out the interval ends even when the mantissa is even (for readers that scale the number
/// afterwards, whose rounding could move an end value to the neighbour). `None` where the
/// exact comparison does not fit 128 bits.
fn shortest_exact(d: &Decoded, strict: bool) -> Option<(u64, i32)> {
    // Units of 2^g, g = e − 2: x = 4m, the interval (lo, hi) around it.
    let g = d.e.wrapping_sub(2);
    let x4 = u128::from(d.m) << 2;
    // m ≥ 1 (zero is handled before) and m < 2^24: no wrap.
    let hi = x4.wrapping_add(2);
    let lo = x4.wrapping_sub(if d.closer_below { 1 } else { 2 });
    let inclusive = !strict && d.m & 1 == 0;
    // p2 = ⌊log2 x⌋; k0 = ⌊p2 · log10 2⌋ ≤ ⌊log10 x⌋ (78913 / 2^18 ≈ log10 2, exact floor
    // for |p2| < 1700).
    let bits = 32i32.wrapping_sub(d.m.leading_zeros() as i32);
    let p2 = d.e.wrapping_add(bits).wrapping_sub(1);
    let k0 = p2.wrapping_mul(78_913) >> 18;
    let mut t = k0.wrapping_add(1);
    for _ in 0..12 {
        // x / 10^t = x4 · 2^(g − t) · 5^(−t) = N / Dn, with the powers on the side where
        // they are positive; the interval ends are lo · P and hi · P against D · Dn.
        let a = g.wrapping_sub(t);
        let b = t.wrapping_neg();
        // checked_shl of 1 by less than 128 is exact; larger shifts give None.
        let p = mul_u128(
            1u128.checked_shl(a.max(0).unsigned_abs())?,
            pow5_u128(b.max(0).unsigned_abs())?,
        )?;
        let den = mul_u128(
            1u128.checked_shl(a.min(0).unsigned_abs())?,
            pow5_u128(b.min(0).unsigned_abs())?,
        )?;
        let n = mul_u128(x4, p)?;
        let (l, h) = (mul_u128(lo, p)?, mul_u128(hi, p)?);
        // Only the two decimals next to x can be inside (the interval holds x); the nearer
        // one may be outside when the interval is lopsided (x a power of two).
        for digits in neighbours(n, den)? {
            let c = mul_u128(digits, den)?;
            let inside = if inclusive {
                l <= c && c <= h
            } else {
                l < c && c < h
            };
            if digits != 0 && inside {
                return Some((u64::try_from(digits).ok()?, t));
            }
        }
        t = t.wrapping_sub(1);
    }
    None
}

/// Nine significant digits of `|x|` (any finite nonzero `x`): `digits · 10^exp10`. Reads back
/// to `x`: the error is below one unit in the ninth digit, under a third of the f32 spacing.
/// In f64, where every f32 is exact: v · 10^(8 − k) rounded, with k = ⌊log10 v⌋ from the
/// exponent bits and one correction step.
fn nine_digits(d: &Decoded) -> (u64, i32) {
    let v = libm::ldexp(f64::from(d.m), d.e); // exact
                                              // ⌊p2 · log10 2⌋ is ⌊log10 v⌋ or one less (see `shortest_exact`).
    let bits = 32i32.wrapping_sub(d.m.leading_zeros() as i32);
    let p2 = d.e.wrapping_add(bits).wrapping_sub(1);
    let mut t = (p2.wrapping_mul(78_913) >> 18).wrapping_sub(8);
    let scaled = |t: i32| libm::round(v * pow10_f64(t.wrapping_neg()));
    let mut digits = scaled(t);
    if digits >= 1.0e9 {
        t = t.wrapping_add(1);
        digits = scaled(t);
    }
    (digits as u64, t)
}

/// 10^n in f64 for |n| ≤ 400 by binary powering: at most 18 roundings, a relative error
/// below 4e-15 (plenty for nine digits). Outside, 0 or the largest f64.
fn pow10_f64(n: i32) -> f64 {
    let mut k = n.unsigned_abs().min(400);
    let mut base = 10.0f64;
    let mut acc = 1.0f64;
    while k > 0 {
        if k & 1 == 1 {
            acc *= base;
        }
        base *= base;
        k >>= 1;
    }
    if n < 0 {
        1.0 / acc
    } else {
        acc
    }
}

fn shortest_parts(x: f32, strict: bool) -> Result<(bool, u64, i32), &'static str> {
    let d = match decode(x) {
        Kind::Finite(d) => d,
        Kind::Nan => return Err("NaN"),
        Kind::Infinite(false) => return Err("inf"),
        Kind::Infinite(true) => return Err("-inf"),
    };
    if d.m == 0 {
        return Ok((d.negative, 0, 0));
    }
    let (mut digits, mut t) = shortest_exact(&d, strict).unwrap_or_else(|| nine_digits(&d));
    while digits != 0 && digits % 10 == 0 {
        digits /= 10;
        t = t.wrapping_add(1);
    }
    Ok((d.negative, digits, t))
}

/// Write `digits · 10^exp10` in plain decimal (no exponent, no trailing fraction zeros).
fn write_plain<W: Write>(w: &mut W, negative: bool, digits: u64, exp10: i32) -> fmt::Result {
    if negative {
        w.write_char('-')?;
    }
    let (buf, start) = digits_u128(u128::from(digits));
    let all = buf.get(start..).unwrap_or(&[]);
    let k = usize::try_from(exp10.min(0).unsigned_abs()).unwrap_or(usize::MAX);
    if exp10 >= 0 {
        w.write_str(core::str::from_utf8(all).unwrap_or(""))?;
        return write_repeat(w, '0', exp10.unsigned_abs() as usize);
    }
    if let Some((int, frac)) = all
        .len()
        .checked_sub(k)
        .and_then(|i| all.split_at_checked(i))
    {
        if !int.is_empty() {
            w.write_str(core::str::from_utf8(int).unwrap_or(""))?;
            w.write_char('.')?;
            return w.write_str(core::str::from_utf8(frac).unwrap_or(""));
        }
    }
    {
        w.write_str("0.")?;
        write_repeat(w, '0', k.saturating_sub(all.len()))?;
        w.write_str(core::str::from_utf8(all).unwrap_or(""))
    }
}

/// Write the shortest decimal that reads back to `x`, in plain notation (no exponent): the
/// same bytes as `write!(w, "{}", x)` (see the module documentation for the one range where
/// it is longer).
pub fn write_shortest<W: Write>(w: &mut W, x: f32) -> fmt::Result {
    match shortest_parts(x, false) {
        Ok((negative, digits, t)) => write_plain(w, negative, digits, t),
        Err(token) => w.write_str(token),
    }
}

/// The exact decimal value of `|x|` as `digits · 10^exp10` when it has at most 15
/// significant digits, else `None`.
fn exact_short(d: &Decoded) -> Option<(u64, i32)> {
    const LIMIT: u128 = 1_000_000_000_000_000; // 10^15
    let (mut n, mut t) = if d.e >= 0 {
        (u128::from(d.m).checked_shl(d.e.unsigned_abs())?, 0i32)
    } else {
        // m · 2^−s = m · 5^s / 10^s.
        let s = d.e.unsigned_abs();
        (
            mul_u128(u128::from(d.m), pow5_u128(s)?)?,
            d.e, // −s
        )
    };
    if n == 0 {
        return Some((0, 0));
    }
    while n % 10 == 0 {
        n /= 10;
        t = t.wrapping_add(1);
    }
    if n < LIMIT {
        Some((u64::try_from(n).ok()?, t))
    } else {
        None
    }
}

/// Write `x / 10^shift` (for example hertz as megahertz, `shift` 6) in plain notation: its
/// exact decimal value when that has at most 15 significant digits (for a frequency in
/// hertz, every f32 from 4096 to 10^15), else the shortest decimal whose value times
/// 10^`shift` lies strictly inside the interval of reals that round to `x`. Either reads back
/// to `x`, also when a reader multiplies by 10^`shift` in floating point (hence "strictly").
///
/// In the exact case the bytes are those of `write!(w, "{}", x as f64 / 10^shift)`: an exact
/// decimal of at most 15 digits is the shortest form of the nearest `f64`.
pub fn write_scaled<W: Write>(w: &mut W, x: f32, shift: u8) -> fmt::Result {
    let d = match decode(x) {
        Kind::Finite(d) => d,
        Kind::Nan => return w.write_str("NaN"),
        Kind::Infinite(false) => return w.write_str("inf"),
        Kind::Infinite(true) => return w.write_str("-inf"),
    };
    let (digits, t) = match exact_short(&d) {
        Some(p) => p,
        None => match shortest_parts(x, true) {
            Ok((_, digits, t)) => (digits, t),
            Err(token) => return w.write_str(token),
        },
    };
    let t = if digits == 0 {
        0
    } else {
        t.wrapping_sub(i32::from(shift))
    };
    write_plain(w, d.negative, digits, t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use heapless::String;

    fn fixed(x: f32, d: u8, width: usize) -> String<80> {
        let mut s = String::new();
        write_fixed(&mut s, x, d, width).unwrap();
        s
    }

    fn shortest(x: f32) -> String<80> {
        let mut s = String::new();
        write_shortest(&mut s, x).unwrap();
        s
    }

    /// Test vectors: exact binary values of IEEE 754 binary32 numbers, expanded by hand
    /// (m · 2^e written out in decimal), then rounded to nearest, ties to even.
    #[test]
    fn fixed_vectors() {
        let table: &[(f32, u8, usize, &str)] = &[
            (0.0, 6, 0, "0.000000"),
            (-0.0, 3, 0, "-0.000"),
            (0.5, 0, 0, "0"),      // tie, to even
            (1.5, 0, 0, "2"),      // tie, to even
            (2.5, 0, 0, "2"),      // tie, to even
            (0.25, 1, 0, "0.2"),   // tie, to even
            (0.375, 2, 0, "0.38"), // tie, to even (7 is odd)
            // 0.1f32 = 13421773 · 2^-27 = 0.100000001490116119384765625
            (0.1, 9, 0, "0.100000001"),
            // 0.35f32 = 11744051 · 2^-25 = 0.3499999940395355224609375: below the tie
            (0.35, 1, 0, "0.3"),
            (-1e-9, 3, 0, "-0.000"),
            (145.5, 3, 9, "  145.500"),
            (-2.0, 2, 6, " -2.00"),
            (1.0e10, 1, 0, "10000000000.0"),
            // 2^100 exactly
            (1.2676506e30, 0, 0, "1267650600228229401496703205376"),
            (f32::NAN, 3, 6, "   NaN"),
            (f32::NEG_INFINITY, 2, 0, "-inf"),
        ];
        for &(x, d, w, want) in table {
            assert_eq!(fixed(x, d, w).as_str(), want, "{x} {d} {w}");
        }
    }

    /// Shortest form: values whose shortest decimal is known from the binary32 spacing
    /// (the decimal lies within half a spacing of the value, no shorter one does).
    #[test]
    fn shortest_vectors() {
        let table: &[(f32, &str)] = &[
            (0.0, "0"),
            (-0.0, "-0"),
            (50.0, "50"),
            (50.1, "50.1"),
            (0.3, "0.3"),
            (145.5e6, "145500000"),
            // 140000016 = 8750001 · 16; spacing 16, 140000020 is 4 away
            (140_000_016.0, "140000020"),
            (16_777_216.0, "16777216"),
            (1.0e10, "10000000000"),
            (-2.5, "-2.5"),
        ];
        for &(x, want) in table {
            assert_eq!(shortest(x).as_str(), want, "{x}");
        }
        let mut s: String<40> = String::new();
        write_scaled(&mut s, 140.25e6, 6).unwrap();
        assert_eq!(s.as_str(), "140.25");
        s.clear();
        write_scaled(&mut s, 1.5e3, 9).unwrap();
        assert_eq!(s.as_str(), "0.0000015");
        s.clear();
        write_scaled(&mut s, 0.0, 9).unwrap();
        assert_eq!(s.as_str(), "0");
    }
}
