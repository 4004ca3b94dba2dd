//! Resonance, minimum VSWR, bandwidth and Q from a streamed sweep of an analytic series-RLC
//! antenna model matched at resonance (Z0 = R).
//!
//! References: f0 = 1/(2π√(LC)) and Q = √(L/C)/R (series RLC, circuit theory); the exact VSWR
//! band edges and the published relation BW = (S − 1)/(Q·√S)·f0 (Yaghjian and Best, IEEE
//! Trans. Antennas Propag. 53(4), 2005 — recalled from memory), both in
//! `feedline_host_tests::reference::series_rlc`. Run with `--nocapture` for the worst errors.

use core::convert::Infallible;
use embedded_hal_stub::NoDelay;
use feedline::analysis::{q_from_bandwidth, Bands, LimitWatch, MinimumVswr, Resonances, VswrLimit};
use feedline::reflection::{Gamma, Vswr};
use feedline::sweep::{
    run_sweep, Flow, FrequencySource, NoProgress, PointReader, Spacing, SweepPlan, SweepPoint,
};
use feedline::units::{Hertz, Ohms};
use feedline_host_tests::reference::series_rlc::SeriesRlc;
use num_complex::Complex32;

/// Resonance (X = 0) error allowed, as a fraction of the sweep step.
const RESONANCE_BOUND_STEPS: f64 = 0.002;
/// Minimum-VSWR frequency error allowed, as a fraction of the sweep step.
const MINIMUM_BOUND_STEPS: f64 = 0.01;
/// Band-edge error allowed, as a fraction of the sweep step (linear interpolation in VSWR).
const EDGE_BOUND_STEPS: f64 = 0.02;
/// Relative Q error allowed.
const Q_BOUND: f64 = 0.002;
/// Agreement of the published relation with the exact edges of the series RLC (relative).
const PUBLISHED_RELATION_BOUND: f64 = 1e-9;

mod embedded_hal_stub {
    /// A delay that returns at once (the simulation settles instantly).
    pub struct NoDelay;
    impl embedded_hal::delay::DelayNs for NoDelay {
        fn delay_ns(&mut self, _ns: u32) {}
    }
}

/// A simulated source: records the frequency it was tuned to.
struct SimSource {
    tuned: f32,
}
impl FrequencySource for SimSource {
    type Error = Infallible;
    fn set_frequency(&mut self, f: Hertz) -> Result<(), Infallible> {
        self.tuned = f.value();
        Ok(())
    }
    fn settling_time_us(&self, _from: Option<Hertz>, _to: Hertz) -> u32 {
        50
    }
}

/// A simulated calibrated bridge: complex Γ of the model at the tuned frequency.
struct SimBridge {
    load: SeriesRlc,
    z0: f64,
}
impl PointReader for SimBridge {
    type Reading = Complex32;
    type Error = Infallible;
    fn read_point(&mut self, f: Hertz) -> Result<Complex32, Infallible> {
        let g = self.load.gamma(f.value() as f64, self.z0);
        Ok(Complex32::new(g.re as f32, g.im as f32))
    }
}

#[test]
fn published_relation_matches_exact_series_rlc_edges() {
    let mut worst = 0.0f64;
    for (f0, q) in [
        (14.2e6, 12.0),
        (145.0e6, 30.0),
        (433.9e6, 8.0),
        (3.6e6, 60.0),
    ] {
        let load = SeriesRlc::from_f0_q(f0, q, 50.0);
        for s in [1.5, 2.0, 3.0] {
            let (lo, hi) = load.vswr_edges(s);
            let e = ((hi - lo) - load.published_bandwidth(s)).abs() / (hi - lo);
            worst = worst.max(e);
        }
    }
    println!("published BW relation vs exact edges: worst relative difference {worst:.2e}");
    assert!(worst < PUBLISHED_RELATION_BOUND);
}

#[test]
fn resonance_bandwidth_and_q_from_a_streamed_sweep() {
    let cases = [
        (14.2e6, 12.0, 201usize, Spacing::Linear),
        (145.0e6, 30.0, 301, Spacing::Linear),
        (433.9e6, 8.0, 151, Spacing::Logarithmic),
    ];
    let (mut w_res, mut w_min, mut w_edge, mut w_q) = (0.0f64, 0.0f64, 0.0f64, 0.0f64);
    for (f0, q, n, spacing) in cases {
        let load = SeriesRlc::from_f0_q(f0, q, 50.0);
        // Sweep ±3 half-bandwidths at S = 3 around f0, off-centre so f0 falls between points.
        let bw3 = load.published_bandwidth(3.0);
        let (start, stop) = (f0 - 1.7 * bw3, f0 + 1.9 * bw3);
        let plan = SweepPlan::<512>::from_start_stop(
            Hertz::new(start as f32),
            Hertz::new(stop as f32),
            n,
            spacing,
        )
        .unwrap();
        let step = (stop - start) / (n - 1) as f64;
        let mut min = MinimumVswr::new();
        let mut res = Resonances::<4>::new();
        let mut bands = Bands::<3, 4>::new();
        for s in [1.5f32, 2.0, 3.0] {
            bands.add_threshold(Vswr::new(s).unwrap()).unwrap();
        }
        let bw2 = load.published_bandwidth(2.0);
        let mut ok_watch = LimitWatch::new(VswrLimit {
            low: Hertz::new((f0 - 0.3 * bw2) as f32),
            high: Hertz::new((f0 + 0.3 * bw2) as f32),
            limit: Vswr::new(2.0).unwrap(),
        });
        let mut low_watch = LimitWatch::new(VswrLimit {
            low: Hertz::new((f0 - bw2) as f32),
            high: Hertz::new((f0 + 0.2 * bw2) as f32),
            limit: Vswr::new(2.0).unwrap(),
        });
        let mut sink = |p: &SweepPoint<Complex32>| {
            let g = Gamma::saturating(p.reading.norm());
            min.push(p.frequency, g);
            res.push_gamma(p.frequency, p.reading, Ohms::new(50.0));
            bands.push(p.frequency, g.vswr());
            ok_watch.push(p.frequency, g.vswr());
            low_watch.push(p.frequency, g.vswr());
            Flow::Continue
        };
        let out = run_sweep(
            &plan,
            &mut SimSource { tuned: 0.0 },
            &mut SimBridge { load, z0: 50.0 },
            &mut NoDelay,
            &mut sink,
            &mut NoProgress,
        )
        .unwrap();
        assert_eq!(out.points_done, n);
        bands.finish();

        // Resonance: exactly one series crossing at f0.
        assert_eq!(res.found().len(), 1, "{:?}", res.found());
        let r = res.found()[0];
        let e = (r.frequency.value() as f64 - load.f0()).abs() / step;
        w_res = w_res.max(e);
        assert!(e < RESONANCE_BOUND_STEPS, "resonance {f0}: {e} steps");
        assert!((r.resistance.value() - 50.0).abs() < 0.01);

        // Minimum VSWR at f0, VSWR ≈ 1.
        let m = min.result().unwrap();
        assert!(m.interpolated);
        let e = (m.frequency.value() as f64 - load.f0()).abs() / step;
        w_min = w_min.max(e);
        assert!(e < MINIMUM_BOUND_STEPS, "minimum {f0}: {e} steps");
        assert!(m.vswr.value() < 1.01);

        // Bands: one closed band per threshold, edges at the exact solutions; Q.
        for (t, s) in bands.thresholds().iter().zip([1.5f64, 2.0, 3.0]) {
            assert_eq!(t.bands().len(), 1);
            let b = t.bands()[0];
            assert!(b.is_closed());
            let (lo, hi) = load.vswr_edges(s);
            // The local step at an edge (log plans step unevenly): ratio step near the edge.
            let local = match spacing {
                Spacing::Linear => step,
                Spacing::Logarithmic => lo * ((stop / start).ln() / (n - 1) as f64),
            };
            for (got, want) in [(b.lower.value() as f64, lo), (b.upper.value() as f64, hi)] {
                let e = (got - want).abs() / local;
                w_edge = w_edge.max(e);
                assert!(e < EDGE_BOUND_STEPS, "edge {f0} S={s}: {e} steps");
            }
            let qq =
                q_from_bandwidth(r.frequency, b.width(), Vswr::new(s as f32).unwrap()).unwrap();
            let e = (qq as f64 - load.q()).abs() / load.q();
            w_q = w_q.max(e);
            assert!(e < Q_BOUND, "Q {f0} S={s}: {qq} vs {}", load.q());
        }
        assert!(!ok_watch.verdict().raised(), "{:?}", ok_watch.verdict());
        let v = low_watch.verdict();
        assert!(v.low_edge && !v.high_edge, "{v:?}");
    }
    println!("resonance: worst {w_res:.2e} steps; minimum: worst {w_min:.2e} steps");
    println!("band edges: worst {w_edge:.2e} steps; Q: worst relative {w_q:.2e}");
}
