//! Modelled calibration standards against the model equations, and the term table.
//!
//! Standards: an open is a fringing capacitance C(f) = C0 + C1·f + C2·f² + C3·f³ behind a
//! lossless offset (Γ = (Y0 − jωC)/(Y0 + jωC)·e^(−j2ωτ)), a short an inductance L(f) behind
//! an offset (Γ = (jωL − Z0)/(jωL + Z0)·e^(−j2ωτ)) — lumped-element and transmission-line
//! theory (D. M. Pozar, *Microwave Engineering*, ch. 2), with the usual coefficient scaling
//! (common practice). Reference: `feedline_host_tests::reference::calibration` (f64,
//! independent of the core).
//!
//! Run with `--nocapture` to see the worst errors.

use feedline::calibration::{
    CalError, CalTable, LoadStandard, OnePortTerms, OpenStandard, ResponseCal, ShortStandard,
    StandardsModel,
};
use feedline::units::{Hertz, Ohms, Seconds, VoltageRatio};
use feedline_host_tests::reference::calibration as reference;
use num_complex::{Complex32, Complex64};

/// Bound on |ΔΓ| of a modelled standard against the f64 model equations, 10 MHz … 4 GHz.
const STANDARD_BOUND: f64 = 1.0e-6;

fn f64c(z: Complex32) -> Complex64 {
    Complex64::new(z.re as f64, z.im as f64)
}

/// Invented kit definitions (not any product's), spanning signs and magnitudes seen in
/// practice: (C0..C3, open delay s, L0..L3, short delay s).
const KITS: [([f32; 4], f32, [f32; 4], f32); 4] = [
    ([0.0; 4], 0.0, [0.0; 4], 0.0),
    (
        [49.4, -310.1, 23.2, -0.16],
        29.2e-12,
        [2.1, -140.0, 4.3, -0.04],
        31.8e-12,
    ),
    (
        [62.0, 17.0, 228.0, -9.0],
        14.9e-12,
        [0.0, 1300.0, -25.0, 0.3],
        16.7e-12,
    ),
    (
        [110.0, 0.0, 0.0, 0.0],
        0.0,
        [35.0, 0.0, 0.0, 0.0],
        120.0e-12,
    ),
];

#[test]
fn modelled_standards_match_model_equations() {
    let mut worst = (0.0f64, 0usize, 0.0f64, "");
    for (k, &(c, to, l, ts)) in KITS.iter().enumerate() {
        let model = StandardsModel {
            open: OpenStandard {
                capacitance: c,
                delay: Seconds::new(to),
            },
            short: ShortStandard {
                inductance: l,
                delay: Seconds::new(ts),
            },
            load: LoadStandard::IDEAL,
            z0: Ohms::new(50.0),
        };
        for i in 0..=2000 {
            let f = 10.0e6_f32 * 1.003_f32.powi(i); // 10 MHz … ≈ 4 GHz
            let g = model.gammas_at(Hertz::new(f)).unwrap();
            let fd = f as f64;
            let ro = reference::open_gamma(c.map(f64::from), to as f64, fd, 50.0);
            let rs = reference::short_gamma(l.map(f64::from), ts as f64, fd, 50.0);
            for (name, got, want) in [("open", g.open, ro), ("short", g.short, rs)] {
                let e = (f64c(got) - want).norm();
                if e > worst.0 {
                    worst = (e, k, fd, name);
                }
            }
            assert_eq!(g.load, Complex32::new(0.0, 0.0));
        }
    }
    println!(
        "modelled standards: worst |ΔΓ| = {:.3e} (kit {}, f = {:.4e} Hz, {})",
        worst.0, worst.1, worst.2, worst.3
    );
    assert!(worst.0 < STANDARD_BOUND);
}

fn terms(e00: Complex64, e11: Complex64, t: Complex64) -> OnePortTerms {
    let c = |z: Complex64| Complex32::new(z.re as f32, z.im as f32);
    OnePortTerms::new(c(e00), c(e11), c(t)).unwrap()
}

#[test]
fn table_interpolates_linearly_and_refuses_outside() {
    // Terms that vary linearly in re/im with frequency are reproduced exactly by linear
    // interpolation (up to f32 rounding) — compared with the same straight line in f64.
    let line = |f: f64| {
        let x = (f - 1.0e6) / 99.0e6;
        (
            Complex64::new(0.02 + 0.1 * x, -0.01 + 0.05 * x),
            Complex64::new(-0.05 * x, 0.1 - 0.02 * x),
            Complex64::new(0.9 - 0.2 * x, 0.1 + 0.3 * x),
        )
    };
    let mut table = CalTable::<11>::new();
    for i in 0..11 {
        let f = 1.0e6 + 9.9e6 * i as f64;
        let (a, b, c) = line(f);
        table.insert(Hertz::new(f as f32), terms(a, b, c)).unwrap();
    }
    let mut worst = 0.0f64;
    for i in 0..=990 {
        let f = (1.0e6 + 0.1e6 * i as f64) as f32;
        let got = table.terms_at(Hertz::new(f)).unwrap();
        let (a, b, c) = line(f as f64);
        let e = [
            (f64c(got.directivity()) - a).norm(),
            (f64c(got.source_match()) - b).norm(),
            (f64c(got.tracking()) - c).norm(),
        ]
        .into_iter()
        .fold(0.0, f64::max);
        worst = worst.max(e);
    }
    println!("table: worst |Δterm| of linear interpolation vs the f64 line = {worst:.3e}");
    assert!(worst < 1.0e-6);
    assert_eq!(
        table.terms_at(Hertz::new(0.999e6)),
        Err(CalError::FrequencyOutOfRange)
    );
    assert_eq!(
        table.correct(Hertz::new(100.1e6), Complex32::new(0.1, 0.0)),
        Err(CalError::FrequencyOutOfRange)
    );
    assert!(table
        .correct(Hertz::new(100.0e6), Complex32::new(0.1, 0.0))
        .is_ok());
}

#[test]
fn response_calibration_cancels_first_order_ripple() {
    // Scalar bridge with small directivity and source match: |Γm| of open and short from
    // the reference model; the open/short average estimates |T| to second order in the
    // error terms.
    let t = reference::Terms {
        e00: Complex64::new(0.01, 0.005),
        e11: Complex64::new(0.02, -0.01),
        tracking: Complex64::from_polar(0.7, 1.0),
    };
    let open = reference::distort(&t, Complex64::new(1.0, 0.0)).norm();
    let short = reference::distort(&t, Complex64::new(-1.0, 0.0)).norm();
    let cal = ResponseCal::from_open_short(
        VoltageRatio::new(open as f32),
        VoltageRatio::new(short as f32),
    )
    .unwrap();
    let err = (cal.tracking().value() as f64 - 0.7).abs() / 0.7;
    // Either standard alone is off by about |e00/T + e11| ≈ 3 %; the mean by far less.
    let single = (open - 0.7).abs() / 0.7;
    println!("response cal: relative tracking error {err:.3e} (open alone {single:.3e})");
    assert!(single > 0.01);
    assert!(err < 2.0e-3);
}
