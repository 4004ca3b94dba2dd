//! Error sweeps of the f32 scalar path against the independent f64 model
//! (`feedline_host_tests::reference::scalar`). Each sweep prints the worst error and where.
//!
//! Bounds held here (the README quotes them):
//! - return loss: 0.0005 dB over RL 0–60 dB;
//! - VSWR: 0.01 % up to VSWR 20;
//! - mismatch loss: 0.0005 dB;
//! - codes → RL through the ADC and each detector law: 0.001 dB.

use feedline::bridge::{BridgeSpec, Detector, ScalarChain};
use feedline::detector::{Adc, LogDetector};
use feedline::reflection::Gamma;
use feedline::units::{Db, Dbm, Volts};
use feedline_host_tests::reference::scalar as reference;

const RL_BOUND_DB: f64 = 5e-4;
const VSWR_BOUND_REL: f64 = 1e-4;
const ML_BOUND_DB: f64 = 5e-4;
const CHAIN_RL_BOUND_DB: f64 = 1e-3;

struct Worst {
    what: &'static str,
    err: f64,
    at: String,
}

impl Worst {
    fn new(what: &'static str) -> Self {
        Worst {
            what,
            err: 0.0,
            at: String::new(),
        }
    }
    fn see(&mut self, err: f64, at: impl FnOnce() -> String) {
        if err > self.err {
            self.err = err;
            self.at = at();
        }
    }
    fn report(&self, bound: f64) {
        println!(
            "f32 {}: worst error {:.3e} at {} (bound {:.1e})",
            self.what, self.err, self.at, bound
        );
        assert!(
            self.err <= bound,
            "{} error {} exceeds {}",
            self.what,
            self.err,
            bound
        );
    }
}

#[test]
fn reflection_relations_against_f64() {
    let mut rl = Worst::new("return loss (dB)");
    let mut vswr = Worst::new("VSWR (relative)");
    let mut ml = Worst::new("mismatch loss (dB)");
    // RL from 0 to 60 dB in 0.001 dB steps.
    for i in 0..=60_000 {
        let rl_true = f64::from(i) * 0.001;
        let g64 = reference::gamma_from_return_loss(rl_true);
        let g = Gamma::saturating(g64 as f32);
        let g_in = f64::from(g.value()); // the f32 input, so only the computation is measured
        let r = g.reflection();
        if g_in > 0.0 && g_in < 1.0 {
            rl.see(
                (f64::from(r.return_loss.value()) - reference::return_loss(g_in)).abs(),
                || format!("|Γ| = {g_in:.6}"),
            );
            ml.see(
                (f64::from(r.mismatch_loss.value()) - reference::mismatch_loss(g_in)).abs(),
                || format!("|Γ| = {g_in:.6}"),
            );
            let s = reference::vswr(g_in);
            if s <= 20.0 {
                vswr.see((f64::from(r.vswr.value()) - s).abs() / s, || {
                    format!("VSWR = {s:.4}")
                });
            }
        }
    }
    rl.report(RL_BOUND_DB);
    vswr.report(VSWR_BOUND_REL);
    ml.report(ML_BOUND_DB);
}

#[test]
fn codes_to_return_loss_every_law() {
    let adc = Adc::new(16, Volts::new(2.5), 0).unwrap();
    let lsb = 2.5f32 / 65536.0;
    let lsb64 = 2.5f64 / 65536.0;
    let log = LogDetector::new(Volts::new(0.025), Dbm::new(-84.0)).unwrap();
    let laws = [
        ("linear", Detector::Linear, reference::Law::Linear),
        ("square-law", Detector::SquareLaw, reference::Law::SquareLaw),
        ("log", Detector::Log(log), reference::Law::Log(0.025)),
    ];
    for (name, det, law) in laws {
        let spec = BridgeSpec::new(det, Volts::new(lsb * 0.5), Volts::new(2.49), Db::new(40.0));
        let chain = ScalarChain::new(adc, spec).unwrap();
        let mut w = Worst::new("codes → return loss (dB)");
        for f in (1000u16..65000).step_by(997) {
            for r in (1..=f).step_by(13) {
                let Ok(m) = chain.measure_codes(f, r) else {
                    continue;
                };
                let ff = f64::from(f) * lsb64;
                let rr = f64::from(r) * lsb64;
                let want = reference::return_loss_from_outputs(law, ff, rr);
                if (0.0..=60.0).contains(&want) {
                    w.see(
                        (f64::from(m.reflection.return_loss.value()) - want).abs(),
                        || format!("{name} f = {f}, r = {r}"),
                    );
                }
            }
        }
        w.report(CHAIN_RL_BOUND_DB);
    }
}
