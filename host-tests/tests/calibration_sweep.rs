//! A calibrated sweep end to end: a simulated bridge whose error terms change with
//! frequency, calibrated at 101 points with a modelled kit, corrected at the calibration
//! frequencies and between them, and the table saved to and loaded from flash.
//!
//! Model: the standard one-port three-term error model (Agilent Application Note 1287-3;
//! D. M. Pozar, *Microwave Engineering*); readings and standards computed by the
//! independent f64 reference `feedline_host_tests::reference::calibration`.
//! Run with `--nocapture` to see the worst errors.

use feedline::calibration::{CalTable, LoadStandard, OpenStandard, ShortStandard, StandardsModel};
use feedline::store::Store;
use feedline::units::{Hertz, Ohms, Seconds};
use feedline_host_tests::reference::calibration as reference;
use feedline_host_tests::sim_flash::SimFlash;
use num_complex::{Complex32, Complex64};

/// Bound on |ΔΓ| at a calibration frequency.
const AT_POINT_BOUND: f64 = 2.0e-6;
/// Bound on |ΔΓ| midway between calibration points 1 MHz apart, with a 2 ns round trip
/// in the tracking term (linear interpolation of re/im; chord error ≈ φ²/8 of |term|).
const MIDWAY_BOUND: f64 = 3.0e-5;

/// Invented bridge: directivity 26 dB, source match 20 dB, tracking −2 dB behind 1 ns of
/// cable, each turning with frequency.
fn bridge(f: f64) -> reference::Terms {
    let turn = |tau: f64| Complex64::from_polar(1.0, -std::f64::consts::TAU * f * tau);
    reference::Terms {
        e00: 0.05 * turn(0.3e-9),
        e11: 0.1 * turn(0.7e-9),
        tracking: 0.794 * turn(2.0e-9),
    }
}

fn c32(z: Complex64) -> Complex32 {
    Complex32::new(z.re as f32, z.im as f32)
}

#[test]
fn sweep_calibration_corrects_and_persists() {
    let z0 = 50.0;
    let (c, l, tau) = (
        [40.0f32, 100.0, 10.0, 0.5],
        [15.0f32, 50.0, 0.0, 0.0],
        20.0e-12f32,
    );
    let model = StandardsModel {
        open: OpenStandard {
            capacitance: c,
            delay: Seconds::new(tau),
        },
        short: ShortStandard {
            inductance: l,
            delay: Seconds::new(tau),
        },
        load: LoadStandard::IDEAL,
        z0: Ohms::new(z0 as f32),
    };
    let mut table = CalTable::<101>::new();
    for i in 0..101 {
        let f = 1.0e6 * (i + 1) as f64;
        let t = bridge(f);
        let open = reference::open_gamma(c.map(f64::from), tau as f64, f, z0);
        let short = reference::short_gamma(l.map(f64::from), tau as f64, f, z0);
        let raw = |a: Complex64| c32(reference::distort(&t, a));
        table
            .calibrate_point(
                Hertz::new(f as f32),
                raw(open),
                raw(short),
                raw(Complex64::new(0.0, 0.0)),
                &model,
            )
            .unwrap();
    }
    // A DUT of 25 + j30 Ω (an invented antenna-like load).
    let dut = reference::gamma_of(Complex64::new(25.0, 30.0), z0);
    let (mut at_point, mut midway, mut uncorrected) = (0.0f64, 0.0f64, 0.0f64);
    for i in 0..200 {
        let f = 1.0e6 + 0.5e6 * i as f64;
        let raw = reference::distort(&bridge(f), dut);
        let got = table.correct(Hertz::new(f as f32), c32(raw)).unwrap();
        let e = (Complex64::new(got.re as f64, got.im as f64) - dut).norm();
        uncorrected = uncorrected.max((raw - dut).norm());
        if i % 2 == 0 {
            at_point = at_point.max(e);
        } else {
            midway = midway.max(e);
        }
    }
    println!(
        "sweep: worst |ΔΓ| uncorrected {uncorrected:.3e}; corrected at calibration points {at_point:.3e}, midway {midway:.3e}"
    );
    assert!(uncorrected > 0.1);
    assert!(at_point < AT_POINT_BOUND);
    assert!(midway < MIDWAY_BOUND);

    // Persist and reload: the same table comes back.
    let mut store = Store::new(SimFlash::<4, 4096>::new(4), 0, 8192).unwrap();
    let mut buf = vec![0u8; Store::<SimFlash<4, 4096>>::buffer_len::<CalTable<101>>()];
    store.save(&table, &mut buf).unwrap();
    let loaded = store.load::<CalTable<101>>(&mut buf).unwrap();
    assert_eq!(loaded.record, table);
    println!(
        "sweep: table of {} points persisted in a {}-byte record buffer",
        table.len(),
        buf.len()
    );
}
