//! `feedline::fmt_decimal` against the outside reference: Rust's std formatter
//! (`format!("{:>w$.d$}")` and `format!("{}")` for `f32`, the `core::fmt` float formatting
//! that the core no longer uses), over every exponent and many mantissas.

use feedline::fmt_decimal::{write_fixed, write_scaled, write_shortest};

/// xorshift32: reproducible pseudo-random bit patterns.
fn patterns(n: usize) -> impl Iterator<Item = u32> {
    let mut s = 0x9E37_79B9u32;
    (0..n).map(move |_| {
        s ^= s << 13;
        s ^= s >> 17;
        s ^= s << 5;
        s
    })
}

/// Random bit patterns, every power of two with its neighbours, and round decimals.
fn values() -> Vec<f32> {
    let mut v: Vec<f32> = patterns(400_000).map(f32::from_bits).collect();
    for e in 0u32..=255 {
        for frac in [0u32, 1, 2, 0x3F_FFFF, 0x40_0000, 0x7F_FFFE, 0x7F_FFFF] {
            v.push(f32::from_bits((e << 23) | frac));
            v.push(-f32::from_bits((e << 23) | frac));
        }
    }
    for k in -12i32..=12 {
        for d in [1.0f32, 1.5, 2.5, 0.125, 0.375, 2.71875, 50.0, 75.0, 145.5] {
            v.push(d * 10f32.powi(k));
        }
    }
    v.extend([f32::NAN, f32::INFINITY, f32::NEG_INFINITY, 0.0, -0.0]);
    v
}

#[test]
fn fixed_matches_std_for_every_f32_kind() {
    let mut checked = 0usize;
    for x in values() {
        for d in 0u8..=9 {
            let width = usize::from(d) * 2;
            let mut ours = String::new();
            write_fixed(&mut ours, x, d, width).unwrap();
            let want = format!("{:>w$.p$}", x, w = width, p = usize::from(d));
            assert_eq!(ours, want, "bits {:#010x} decimals {d}", x.to_bits());
            checked += 1;
        }
    }
    println!("fixed: {checked} strings identical to std");
}

#[test]
fn shortest_matches_std_and_reads_back() {
    let (mut same, mut longer) = (0usize, 0usize);
    for x in values() {
        let mut ours = String::new();
        write_shortest(&mut ours, x).unwrap();
        let want = format!("{x}");
        if !x.is_finite() || x.abs() >= 1.0e-36 || x == 0.0 {
            assert_eq!(ours, want, "bits {:#010x}", x.to_bits());
            same += 1;
        } else {
            // The documented range below 1e-36: nine digits, the same f32 when read back.
            let back: f32 = ours.parse().unwrap();
            assert_eq!(back.to_bits(), x.to_bits(), "{ours}");
            if ours != want {
                longer += 1;
            }
        }
    }
    println!("shortest: {same} identical to std; {longer} below 1e-36 longer than std");
}

#[test]
fn scaled_reads_back_after_multiplying() {
    for x in values() {
        if !x.is_finite() || x < 0.0 {
            continue;
        }
        for shift in [0u8, 3, 6, 9] {
            let mut ours = String::new();
            write_scaled(&mut ours, x, shift).unwrap();
            assert!(!ours.contains(['e', 'E']), "{ours}");
            let v: f64 = ours.parse().unwrap();
            let back = (v * 10f64.powi(i32::from(shift))) as f32;
            assert_eq!(back.to_bits(), x.to_bits(), "{x:e} shift {shift}: {ours}");
        }
    }
}

/// In its exact range the scaled form is what std's `f64` Display writes for `x / 10^shift`
/// (the writer's former output).
#[test]
fn scaled_matches_std_f64_in_its_exact_range() {
    let mut checked = 0usize;
    for x in values() {
        if !(4096.0..1.0e15).contains(&x) {
            continue;
        }
        for (shift, unit) in [(0u8, 1.0f64), (3, 1e3), (6, 1e6), (9, 1e9)] {
            let mut ours = String::new();
            write_scaled(&mut ours, x, shift).unwrap();
            assert_eq!(ours, format!("{}", x as f64 / unit), "{x:e} shift {shift}");
            checked += 1;
        }
    }
    println!("scaled: {checked} strings identical to std f64 Display");
}
