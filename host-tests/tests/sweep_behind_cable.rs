//! End to end on the host: a sweep (through the runner, on simulated hardware) of a
//! series-RLC antenna behind a lossy feeder with a connector fault, analysed while streaming
//! (minimum VSWR, bands under VSWR 2) and stored for distance to fault. Each result is checked
//! against the f64 model of the same line (`reference::line_faults` with `series_rlc` at the
//! far end, textbook transmission-line theory), searched densely. Run with `--nocapture`.

use core::convert::Infallible;
use feedline::analysis::{BandTracker, MinimumVswr};
use feedline::dtf::{transform_in_place, DtfSetup, FaultSearch, LossCoefficients, Window};
use feedline::reflection::{Gamma, Vswr};
use feedline::sweep::{
    run_sweep, Flow, FrequencySource, NoProgress, PointReader, Spacing, SweepPlan, SweepPoint,
};
use feedline::units::{Db, Hertz, Meters};
use feedline_host_tests::reference::line_faults::{Discontinuity, FaultyLine};
use feedline_host_tests::reference::series_rlc::{vswr, SeriesRlc};
use num_complex::{Complex32, Complex64};

/// Minimum-VSWR frequency error allowed, in sweep steps.
const MIN_FREQ_BOUND_STEPS: f64 = 0.25;
/// Minimum VSWR error allowed (absolute).
const MIN_VSWR_BOUND: f64 = 0.02;
/// Band-edge error allowed, in sweep steps.
const EDGE_BOUND_STEPS: f64 = 0.1;
/// Connector return-loss error allowed after loss compensation, dB.
const RL_BOUND_DB: f64 = 1.0;

struct Model {
    line: FaultyLine,
    antenna: SeriesRlc,
}

impl Model {
    fn gamma(&self, f: f64) -> Complex64 {
        self.line.gamma_with_end(f, self.antenna.gamma(f, 50.0))
    }
    fn vswr(&self, f: f64) -> f64 {
        vswr(self.gamma(f))
    }
}

struct Src;
impl FrequencySource for Src {
    type Error = Infallible;
    fn set_frequency(&mut self, _f: Hertz) -> Result<(), Infallible> {
        Ok(())
    }
    fn settling_time_us(&self, _from: Option<Hertz>, _to: Hertz) -> u32 {
        0
    }
}

struct Bridge<'a>(&'a Model);
impl PointReader for Bridge<'_> {
    type Reading = Complex32;
    type Error = Infallible;
    fn read_point(&mut self, f: Hertz) -> Result<Complex32, Infallible> {
        let g = self.0.gamma(f.value() as f64);
        Ok(Complex32::new(g.re as f32, g.im as f32))
    }
}

struct NoDelay;
impl embedded_hal::delay::DelayNs for NoDelay {
    fn delay_ns(&mut self, _ns: u32) {}
}

/// The root of VSWR(f) = s between a and b by bisection on the f64 model.
fn crossing(m: &Model, s: f64, mut a: f64, mut b: f64) -> f64 {
    let fa = m.vswr(a) - s;
    for _ in 0..80 {
        let c = 0.5 * (a + b);
        if (m.vswr(c) - s).signum() == fa.signum() {
            a = c;
        } else {
            b = c;
        }
    }
    0.5 * (a + b)
}

#[test]
fn antenna_behind_a_faulty_feeder() {
    // Invented scenario: a 70 cm band antenna on 9 m of feeder, a corroded connector (24 dB)
    // at 3.2 m.
    let m = Model {
        line: FaultyLine {
            vf: 0.8,
            k1: 0.01,
            k2: 0.0001,
            faults: vec![Discontinuity::with_return_loss(3.2, 24.0)],
            length: 9.0,
            end_gamma: Complex64::new(0.0, 0.0),
        },
        antenna: SeriesRlc::from_f0_q(435.0e6, 6.0, 47.0),
    };
    let (start, stop, n) = (300.0e6, 600.0e6, 256usize);
    let plan = SweepPlan::<256>::from_start_stop(
        Hertz::new(start as f32),
        Hertz::new(stop as f32),
        n,
        Spacing::Linear,
    )
    .unwrap();
    let step = (stop - start) / (n - 1) as f64;
    let mut min = MinimumVswr::new();
    let mut band = BandTracker::<8>::new(Vswr::new(2.0).unwrap());
    let mut stored = vec![Complex32::new(0.0, 0.0); 1024];
    let mut sink = |p: &SweepPoint<Complex32>| {
        let g = Gamma::saturating(p.reading.norm());
        min.push(p.frequency, g);
        band.push(p.frequency, g.vswr());
        if let Some(slot) = stored.get_mut(p.index) {
            *slot = p.reading;
        }
        Flow::Continue
    };
    run_sweep(
        &plan,
        &mut Src,
        &mut Bridge(&m),
        &mut NoDelay,
        &mut sink,
        &mut NoProgress,
    )
    .unwrap();
    band.finish();

    // Minimum: dense search of the model around the reported point.
    let r = min.result().unwrap();
    let centre = r.point_frequency.value() as f64;
    let (mut best_f, mut best_s) = (centre, m.vswr(centre));
    let mut f = centre - 1.5 * step;
    while f <= centre + 1.5 * step {
        let s = m.vswr(f);
        if s < best_s {
            (best_f, best_s) = (f, s);
        }
        f += step / 2000.0;
    }
    let ef = (r.frequency.value() as f64 - best_f).abs() / step;
    let es = (r.vswr.value() as f64 - best_s).abs();
    println!(
        "minimum: {:.4} MHz VSWR {:.4}; model {:.4} MHz VSWR {:.4}; error {ef:.3} steps, {es:.4}",
        r.frequency.value() * 1e-6,
        r.vswr.value(),
        best_f * 1e-6,
        best_s
    );
    assert!(ef < MIN_FREQ_BOUND_STEPS && es < MIN_VSWR_BOUND);

    // Bands under VSWR 2: each closed edge against the model's crossing in its bracket.
    assert!(!band.bands().is_empty());
    let mut worst = 0.0f64;
    for b in band.bands() {
        for (edge, open) in [(b.lower, b.lower_open), (b.upper, b.upper_open)] {
            if open {
                continue;
            }
            let e = edge.value() as f64;
            let k = ((e - start) / step).floor();
            let root = crossing(&m, 2.0, start + k * step, start + (k + 1.0) * step);
            worst = worst.max((e - root).abs() / step);
        }
    }
    println!(
        "bands under VSWR 2: {:?}; worst edge error {worst:.4} steps",
        band.bands()
    );
    assert!(worst < EDGE_BOUND_STEPS);

    // Distance to fault: the connector and the antenna.
    let setup = DtfSetup {
        start: Hertz::new(start as f32),
        stop: Hertz::new(stop as f32),
        window: Window::Kaiser { beta: 6.0 },
        velocity_factor: 0.8,
        loss: LossCoefficients::new(0.01, 0.0001).unwrap(),
    };
    let resp = transform_in_place(&mut stored, n, &setup).unwrap();
    let res = resp.resolution().value() as f64;
    let faults = resp.faults::<8>(&FaultSearch {
        threshold: Db::new(35.0),
        min_separation: Meters::new((3.0 * res) as f32),
        max_distance: Meters::new(12.0),
    });
    println!("faults: {faults:?}");
    let conn = faults
        .iter()
        .find(|f| (f.distance.value() as f64 - 3.2).abs() <= res)
        .expect("the connector");
    assert!(
        (conn.return_loss.value() as f64 - 24.0).abs() < RL_BOUND_DB,
        "{conn:?}"
    );
    // The antenna at the end: a resonant load's reflection is delayed by its own group delay
    // (its phase turns with frequency), so it shows just past the feeder's end, not before it.
    let ant = faults.last().expect("the antenna");
    let d = ant.distance.value() as f64;
    assert!((9.0..=9.0 + 2.0 * res).contains(&d), "{ant:?}");
}
