//! Error sweep of the monitor's fixed-point chain (`feedline::monitor::PowerChain`) against the
//! f64 reference (`reference::monitor::figures`: VSWR = (1+|Γ|)/(1−|Γ|), |Γ| = √(P_ref/P_fwd),
//! RL = 10·log10(P_fwd/P_ref), textbook relations). Prints the worst errors and where.
//! Run with `--nocapture` to see them.

use feedline::fixed::{RL_BOUND_DB, VSWR_BOUND_REL};
use feedline::monitor::{LineMath, PowerChain, PowerReading, GAMMA_BOUND};
use feedline_host_tests::reference::monitor::figures;

#[test]
fn power_chain_against_f64() {
    // Forward powers from 1 mW to 4 kW in 1/8-decade steps; reflected powers at |Γ|² from
    // 1e-9 up to 0.999, in 1/16-decade steps of the ratio, plus the exact neighbours.
    let mut worst_v = (0.0f64, 0u32, 0u32); // VSWR ≤ 20
    let mut worst_v_all = (0.0f64, 0u32, 0u32);
    let mut worst_rl = (0.0f64, 0u32, 0u32);
    let mut worst_g = (0.0f64, 0u32, 0u32); // |Γ| implied by the VSWR, below the cap
    let mut n = 0u32;
    for fi in 0..=52 {
        let f = (1e3 * 10f64.powf(f64::from(fi) / 8.0)).min(4.0e9) as u32;
        for ri in 0..=144 {
            let ratio = 10f64.powf(-9.0 + f64::from(ri) / 16.0).min(0.999);
            let r = (f64::from(f) * ratio).round() as u32;
            if r == 0 || r >= f {
                continue;
            }
            n += 1;
            let got = PowerChain.figures(PowerReading::new(f, r));
            let (v, rl) = figures(f64::from(f), f64::from(r));
            let gv = f64::from(got.vswr.to_bits()) / 65_536.0;
            let grl = f64::from(got.return_loss.to_bits()) / 65_536.0;
            let ev = ((gv - v) / v).abs();
            let erl = (grl - rl).abs();
            if v <= 20.0 && ev > worst_v.0 {
                worst_v = (ev, f, r);
            }
            if ev > worst_v_all.0 {
                worst_v_all = (ev, f, r);
            }
            let g = |v: f64| (v - 1.0) / (v + 1.0);
            let eg = (g(gv) - g(v)).abs();
            if v < 1000.0 && eg > worst_g.0 {
                worst_g = (eg, f, r);
            }
            if erl > worst_rl.0 {
                worst_rl = (erl, f, r);
            }
        }
    }
    println!("PowerChain sweep, {n} points (forward 1 mW..4 kW, |Γ|² 1e-9..0.999):");
    println!(
        "  worst VSWR error (VSWR ≤ 20): {:.2e} relative at {} µW / {} µW",
        worst_v.0, worst_v.1, worst_v.2
    );
    println!(
        "  worst VSWR error (all, to VSWR ≈ 4000 → cap 1000): {:.2e} relative at {} µW / {} µW",
        worst_v_all.0, worst_v_all.1, worst_v_all.2
    );
    println!(
        "  worst return-loss error: {:.5} dB at {} µW / {} µW",
        worst_rl.0, worst_rl.1, worst_rl.2
    );
    println!(
        "  worst |Γ| error (from VSWR, below the cap): {:.2e} at {} µW / {} µW",
        worst_g.0, worst_g.1, worst_g.2
    );
    assert!(n > 5000);
    assert!(worst_g.0 <= f64::from(GAMMA_BOUND), "|Γ| bound");
    assert!(worst_v.0 <= f64::from(VSWR_BOUND_REL), "VSWR bound");
    assert!(worst_rl.0 <= f64::from(RL_BOUND_DB), "RL bound");
}
