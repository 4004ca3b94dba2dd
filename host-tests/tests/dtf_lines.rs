//! Distance to fault on simulated lines: connectors of 20–30 dB return loss and the open end at
//! invented distances, on a lossy cable. Each must be found within one resolution bin of its
//! place, with its return loss within 1 dB after loss compensation.
//!
//! Reference: the f64 line model in `feedline_host_tests::reference::line_faults` (textbook
//! transmission-line theory with all multiple reflections). Run with `--nocapture` to see the
//! worst errors.

use feedline::dtf::{
    scalar_transform_in_place, transform_in_place, DtfSetup, FaultSearch, LossCoefficients,
    ResponseKind, Window,
};
use feedline::units::{Db, Hertz, Meters};
use feedline_host_tests::reference::line_faults::{Discontinuity, FaultyLine};
use num_complex::{Complex32, Complex64};

/// Allowed distance error, in resolution bins.
const DISTANCE_BOUND_BINS: f64 = 1.0;
/// Allowed return-loss error after compensation, dB.
const RL_BOUND_DB: f64 = 1.0;
/// Report reflections stronger than this return loss (the weakest connector is 30 dB).
const THRESHOLD_DB: f32 = 35.0;

struct Scenario {
    name: &'static str,
    line: FaultyLine,
    start: f64,
    stop: f64,
    points: usize,
    bins: usize,
}

fn scenarios() -> Vec<Scenario> {
    vec![
        Scenario {
            name: "mast feeder, 256 points 1-301 MHz",
            line: FaultyLine {
                vf: 0.66,
                k1: 0.014,
                k2: 0.0002,
                faults: vec![
                    Discontinuity::with_return_loss(6.5, 24.0),
                    Discontinuity::with_return_loss(14.2, 28.0),
                ],
                length: 23.7,
                end_gamma: Complex64::new(1.0, 0.0),
            },
            start: 1.0e6,
            stop: 301.0e6,
            points: 256,
            bins: 1024,
        },
        Scenario {
            name: "low-loss run, 401 points 50-550 MHz",
            line: FaultyLine {
                vf: 0.85,
                k1: 0.004,
                k2: 0.00005,
                faults: vec![
                    Discontinuity::with_return_loss(3.1, 20.0),
                    Discontinuity::with_return_loss(11.8, 30.0),
                    Discontinuity::with_return_loss(19.4, 26.0),
                ],
                length: 31.3,
                end_gamma: Complex64::new(1.0, 0.0),
            },
            start: 50.0e6,
            stop: 550.0e6,
            // Enough points that the multiples (up to 2L) stay inside the maximum range.
            points: 401,
            bins: 2048,
        },
    ]
}

/// Expected (distance, return loss) of every reflection: a connector's own return loss; the
/// end's |Γ| seen through the connectors' two-way transmission |S21|² each.
fn expected(line: &FaultyLine) -> Vec<(f64, f64)> {
    let mut v: Vec<(f64, f64)> = line
        .faults
        .iter()
        .map(|d| (d.distance, d.return_loss()))
        .collect();
    let mut t2 = 1.0;
    for d in &line.faults {
        let y = Complex64::new(0.0, d.b);
        t2 *= (2.0 / (2.0 + y)).norm_sqr();
    }
    v.push((line.length, -20.0 * (line.end_gamma.norm() * t2).log10()));
    v
}

#[test]
fn faults_found_within_one_bin_and_one_db() {
    let windows = [
        Window::Hann,
        Window::Kaiser { beta: 6.0 },
        Window::Kaiser { beta: 9.0 },
    ];
    let (mut worst_d, mut worst_rl) = ((0.0f64, String::new()), (0.0f64, String::new()));
    for sc in scenarios() {
        for window in windows {
            let mut buf = vec![Complex32::new(0.0, 0.0); sc.bins];
            for (k, slot) in buf.iter_mut().take(sc.points).enumerate() {
                let f = sc.start + (sc.stop - sc.start) * k as f64 / (sc.points - 1) as f64;
                let g = sc.line.gamma(f);
                *slot = Complex32::new(g.re as f32, g.im as f32);
            }
            let loss = LossCoefficients::new(sc.line.k1 as f32, sc.line.k2 as f32).unwrap();
            let setup = DtfSetup {
                start: Hertz::new(sc.start as f32),
                stop: Hertz::new(sc.stop as f32),
                window,
                velocity_factor: sc.line.vf as f32,
                loss,
            };
            let resp = transform_in_place(&mut buf, sc.points, &setup).unwrap();
            let res = resp.resolution().value() as f64;
            let want_res = sc.line.vf * 299_792_458.0 / (2.0 * (sc.stop - sc.start));
            assert!((res - want_res).abs() < 1e-4 * want_res);
            let max_range = resp.max_range().value() as f64;
            assert!((max_range - (sc.points - 1) as f64 * want_res).abs() < 1e-3 * max_range);
            let faults = resp.faults::<12>(&FaultSearch {
                threshold: Db::new(THRESHOLD_DB),
                min_separation: Meters::new((4.0 * res) as f32),
                // Far enough for the first-order multiples (up to 2L).
                max_distance: Meters::new((2.2 * sc.line.length) as f32),
            });
            let want = expected(&sc.line);
            // Beyond the open end come the first-order multiples: end → connector i → end,
            // seen at 2L − d_i with about the connector's own return loss (the end reflects
            // totally). They are real echoes of the line, found at their path length.
            let (inside, beyond): (Vec<&feedline::dtf::Fault>, Vec<_>) = faults
                .iter()
                .partition(|f| (f.distance.value() as f64) < sc.line.length + res);
            assert_eq!(
                inside.len(),
                want.len(),
                "{} {:?}: found {:?}",
                sc.name,
                window,
                faults
            );
            for g in &beyond {
                let ok = sc.line.faults.iter().any(|d| {
                    (g.distance.value() as f64 - (2.0 * sc.line.length - d.distance)).abs() <= res
                        && (g.return_loss.value() as f64 - d.return_loss()).abs() <= RL_BOUND_DB
                });
                assert!(ok, "{} {:?}: unexplained {g:?}", sc.name, window);
            }
            assert!(!beyond.is_empty(), "the multiples should show");
            for (f, (d, rl)) in inside.iter().zip(want.iter()) {
                let ed = (f.distance.value() as f64 - d).abs() / res;
                let erl = (f.return_loss.value() as f64 - rl).abs();
                let at = format!("{} {:?} at {d} m", sc.name, window);
                if ed > worst_d.0 {
                    worst_d = (ed, at.clone());
                }
                if erl > worst_rl.0 {
                    worst_rl = (erl, at);
                }
                assert!(
                    ed <= DISTANCE_BOUND_BINS,
                    "{} {:?}: {f:?} vs {d} m",
                    sc.name,
                    window
                );
                assert!(
                    erl <= RL_BOUND_DB,
                    "{} {:?}: {f:?} vs {rl} dB",
                    sc.name,
                    window
                );
            }
        }
    }
    println!(
        "worst distance error: {:.3} resolution bins ({})",
        worst_d.0, worst_d.1
    );
    println!(
        "worst return-loss error after compensation: {:.3} dB ({})",
        worst_rl.0, worst_rl.1
    );
}

#[test]
fn uncompensated_far_reflections_read_too_weak() {
    // The same first scenario without compensation: the open end at 23.7 m reads its
    // two-way cable loss low, showing the compensation does the work in the test above.
    let sc = &scenarios()[0];
    let mut buf = vec![Complex32::new(0.0, 0.0); sc.bins];
    for (k, slot) in buf.iter_mut().take(sc.points).enumerate() {
        let f = sc.start + (sc.stop - sc.start) * k as f64 / (sc.points - 1) as f64;
        let g = sc.line.gamma(f);
        *slot = Complex32::new(g.re as f32, g.im as f32);
    }
    let setup = DtfSetup {
        start: Hertz::new(sc.start as f32),
        stop: Hertz::new(sc.stop as f32),
        window: Window::Hann,
        velocity_factor: sc.line.vf as f32,
        loss: feedline::dtf::NoLoss,
    };
    let resp = transform_in_place(&mut buf, sc.points, &setup).unwrap();
    let faults = resp.faults::<8>(&FaultSearch {
        threshold: Db::new(40.0),
        min_separation: Meters::new(1.5),
        max_distance: Meters::new(f32::INFINITY),
    });
    let end = faults
        .iter()
        .find(|f| (f.distance.value() - 23.7).abs() < 0.5)
        .expect("the open end");
    assert!((end.distance.value() - 23.7).abs() < resp.resolution().value());
    assert!(end.return_loss.value() > 5.0, "{end:?}");
}

#[test]
fn scalar_sweep_shows_pair_separations() {
    // A strong near-end mismatch (10 dB, at 0.5 m) and a 20 dB fault at 8.5 m: the |Γ|² ripple
    // gives their separation, 8.0 m, at a level of about 10 + 20 = 30 dB.
    let line = FaultyLine {
        vf: 0.7,
        k1: 0.0,
        k2: 0.0,
        faults: vec![
            Discontinuity::with_return_loss(0.5, 10.0),
            Discontinuity::with_return_loss(8.5, 20.0),
        ],
        length: 400.0,
        end_gamma: Complex64::new(0.0, 0.0),
    };
    let (start, stop, n) = (100.0e6, 400.0e6, 256usize);
    let mut buf = vec![Complex32::new(0.0, 0.0); 1024];
    for (k, slot) in buf.iter_mut().take(n).enumerate() {
        let f = start + (stop - start) * k as f64 / (n - 1) as f64;
        *slot = Complex32::new(line.gamma(f).norm() as f32, 0.0);
    }
    let setup = DtfSetup {
        start: Hertz::new(start as f32),
        stop: Hertz::new(stop as f32),
        window: Window::Hann,
        velocity_factor: 0.7,
        loss: feedline::dtf::NoLoss,
    };
    let resp = scalar_transform_in_place(&mut buf, n, &setup).unwrap();
    assert_eq!(resp.kind(), ResponseKind::ScalarPairs);
    let faults = resp.faults::<4>(&FaultSearch {
        threshold: Db::new(45.0),
        min_separation: Meters::new(1.0),
        max_distance: Meters::new(0.0),
    });
    println!("scalar pairs: {faults:?}");
    let pair = faults
        .iter()
        .find(|f| (f.distance.value() - 8.0).abs() < resp.resolution().value())
        .expect("the pair separation");
    assert!((pair.return_loss.value() - 30.0).abs() < 1.5, "{pair:?}");
}
