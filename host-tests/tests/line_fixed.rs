//! The integer Q16.16 feed-line relations (`feedline::line::fixed`) against the f64 reference
//! (`feedline_host_tests::reference::line`), with the same Q16.16 inputs converted exactly to
//! f64. Each sweep prints the worst error and where; the bounds are the constants exported
//! by the module (RL_BOUND_DB, TOTAL_LOSS_BOUND_DB, SWR_BOUND_REL).

use feedline::line::fixed::{
    self, DbQ16, VswrQ16, RL_BOUND_DB, SWR_BOUND_REL, TOTAL_LOSS_BOUND_DB,
};
use feedline_host_tests::reference::line as reference;

fn q(x: f64) -> i32 {
    (x * 65536.0).round() as i32
}

fn f(raw: i64) -> f64 {
    raw as f64 / 65536.0
}

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
        if err > self.err || err.is_nan() {
            self.err = err;
            self.at = at();
        }
    }
    fn report(&self, bound: f32) {
        println!(
            "line fixed {}: worst {:.3e} (bound {:.1e}) at {}",
            self.what, self.err, bound, self.at
        );
        assert!(
            self.err <= f64::from(bound),
            "{} error {} exceeds {}",
            self.what,
            self.err,
            bound
        );
    }
}

/// SWR values from 1.0001 to `top`, geometric.
fn swrs(top: f64, n: usize) -> impl Iterator<Item = VswrQ16> {
    (0..n).map(move |i| {
        let s = 1.0 + 1e-4 * ((top - 1.0) / 1e-4).powf(i as f64 / (n - 1) as f64);
        VswrQ16::from_bits(q(s) as u32)
    })
}

#[test]
fn return_loss_and_swr_conversions() {
    let mut w_rl = Worst::new("SWR → RL (dB), SWR 1.0001–100");
    for s in swrs(100.0, 4000) {
        let sv = f(i64::from(s.to_bits()));
        let want = reference::return_loss(reference::gamma_from_vswr(sv)).min(100.0);
        let got = f(i64::from(fixed::swr_to_return_loss(s).to_bits()));
        w_rl.see((got - want).abs(), || format!("SWR {sv}"));
    }
    w_rl.report(RL_BOUND_DB);

    let mut w_s = Worst::new("RL → SWR (relative), RL 0.2–60 dB (SWR ≤ 87)");
    for i in 0..4000 {
        let rl = DbQ16::from_bits(q(0.2 + 59.8 * i as f64 / 3999.0));
        let want = reference::vswr(10f64.powf(-f(i64::from(rl.to_bits())) / 20.0));
        let got = f(i64::from(fixed::return_loss_to_swr(rl).unwrap().to_bits()));
        w_s.see((got - want).abs() / want, || {
            format!("RL {}", f(i64::from(rl.to_bits())))
        });
    }
    w_s.report(SWR_BOUND_REL);
}

#[test]
fn swr_through_the_line() {
    let mut w_load = Worst::new("SWR at load (relative), SWR_load ≤ 20");
    let mut w_in = Worst::new("SWR at input (relative)");
    for ml_i in 0..60 {
        let ml = DbQ16::from_bits(q(ml_i as f64 * 0.25));
        let mlv = f(i64::from(ml.to_bits()));
        for s in swrs(20.0, 300) {
            let sv = f(i64::from(s.to_bits()));
            // At the input from the load.
            let want_in = reference::vswr(reference::gamma_at_input(
                reference::gamma_from_vswr(sv),
                mlv,
            ));
            let got_in = f(i64::from(fixed::swr_at_input(s, ml).unwrap().to_bits()));
            w_in.see((got_in - want_in).abs() / want_in, || {
                format!("ML {mlv} SWR_load {sv}")
            });
            // At the load from the input.
            let gl = reference::gamma_at_load(reference::gamma_from_vswr(sv), mlv);
            let r = fixed::swr_at_load(s, ml).unwrap();
            if gl < 1.0 {
                let want = reference::vswr(gl);
                if want <= 20.0 {
                    let got = f(i64::from(r.swr.to_bits()));
                    w_load.see((got - want).abs() / want, || {
                        format!("ML {mlv} SWR_in {sv}")
                    });
                    assert!(!r.clamped);
                }
            } else {
                assert!(r.clamped || gl < 1.0 + 1e-4, "ML {mlv} SWR_in {sv}");
            }
        }
    }
    w_load.report(SWR_BOUND_REL);
    w_in.report(SWR_BOUND_REL);
}

#[test]
fn total_loss_and_open_short() {
    let mut w = Worst::new("total loss (dB), ML ≤ 20 dB, SWR_load ≤ 100");
    for ml_i in 0..=80 {
        let ml = DbQ16::from_bits(q(ml_i as f64 * 0.25));
        let mlv = f(i64::from(ml.to_bits()));
        for s in swrs(100.0, 200) {
            let sv = f(i64::from(s.to_bits()));
            let want = reference::total_loss(mlv, reference::gamma_from_vswr(sv));
            let got = f(i64::from(fixed::total_loss(ml, s).unwrap().to_bits()));
            w.see((got - want).abs(), || format!("ML {mlv} SWR_load {sv}"));
        }
    }
    w.report(TOTAL_LOSS_BOUND_DB);

    let mut w_ml = Worst::new("open/short matched loss (dB)");
    for i in 0..10_000 {
        let rl = DbQ16::from_bits(i * 491);
        let want = reference_half(f(i64::from(rl.to_bits())));
        let got = f(i64::from(
            fixed::matched_loss_from_open_short(rl).unwrap().to_bits(),
        ));
        w_ml.see((got - want).abs(), || {
            format!("RL {}", f(i64::from(rl.to_bits())))
        });
    }
    // Half a Q16.16 step: the rounding of RL/2.
    w_ml.report(1.0 / 131_072.0 + 1e-12);
}

/// Matched loss of an open/short reading, RL/2 (common practice), capped at 50 dB.
fn reference_half(rl: f64) -> f64 {
    rl.min(100.0) / 2.0
}
