//! Error sweeps of the integer chain (`feedline::fixed`) against the independent f64 model
//! (`feedline_host_tests::reference::fixed_scalar`, textbook relations in f64). Each sweep
//! prints the worst error of every output and the input where it occurred; run with
//! `cargo test -p feedline-host-tests --test fixed_error_sweep -- --nocapture`.
//!
//! Bounds held here (the module doc of `feedline::fixed` states them):
//! - return loss: 0.01 dB (asserted over RL 0–50 dB, and over the whole range too);
//! - VSWR: 0.1 % relative up to VSWR 20;
//! - mismatch loss: 0.005 dB over the whole range (up to the 100 dB cap);
//! - |Γ|: 1e-4 absolute.
//!
//! Input space: linear and square-law codes — every reflected code for 25 forward codes
//! from 2 to full scale, and three reflected codes (1, f/2, f − 1) for every forward code;
//! dBm — every Q16.16 difference up to 2.3 dB (past the series/exponential switch) and every
//! 13th up to 100 dB; log detectors (a falling 12-bit and a rising 10-bit configuration) —
//! every 17th forward code in range against every reflected code; |Γ| (the relations under
//! the directivity bounds) — every 2^11-th Q1.31 value.

use feedline::fixed::{
    from_gamma, CodeLimits, DbQ16, DbmChain, DbmLimits, DbmQ16, FixedMeasurement, FixedQuality,
    FixedReflection, GammaQ31, LinearChain, LogDetectorChain, LogDetectorConfig, SquareLawChain,
};
use feedline_host_tests::reference::fixed_scalar::{self as reference, Scalars};

const RL_BOUND_DB: f64 = 0.01;
const VSWR_BOUND_REL: f64 = 0.001;
const ML_BOUND_DB: f64 = 0.005;
const GAMMA_BOUND: f64 = 1e-4;

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
            at: String::from("-"),
        }
    }
    fn see(&mut self, err: f64, at: impl FnOnce() -> String) {
        if err > self.err {
            self.err = err;
            self.at = at();
        }
    }
}

/// The worst errors of one sweep.
struct Sweep {
    name: &'static str,
    points: u64,
    rl50: Worst,
    rl_all: Worst,
    vswr20: Worst,
    vswr_all: Worst,
    ml: Worst,
    gamma: Worst,
}

impl Sweep {
    fn new(name: &'static str) -> Self {
        Sweep {
            name,
            points: 0,
            rl50: Worst::new("return loss, RL ≤ 50 dB (dB)"),
            rl_all: Worst::new("return loss, RL 50–100 dB (dB)"),
            vswr20: Worst::new("VSWR ≤ 20 (relative)"),
            vswr_all: Worst::new("VSWR 20–1000 (relative, not bounded)"),
            ml: Worst::new("mismatch loss, whole range (dB)"),
            gamma: Worst::new("|Γ| (absolute)"),
        }
    }

    fn compare(&mut self, got: &FixedReflection, want: &Scalars, at: &dyn Fn() -> String) {
        self.points += 1;
        let rl = f64::from(got.return_loss.to_bits()) / 65_536.0;
        let ml = f64::from(got.mismatch_loss.to_bits()) / 65_536.0;
        let s = f64::from(got.vswr.to_bits()) / 65_536.0;
        let g = f64::from(got.gamma.to_bits()) / 2_147_483_648.0;
        if want.return_loss_db <= 50.0 {
            self.rl50.see((rl - want.return_loss_db).abs(), at);
        } else if want.return_loss_db < 100.0 {
            self.rl_all.see((rl - want.return_loss_db).abs(), at);
        }
        if want.vswr <= 20.0 {
            self.vswr20.see((s - want.vswr).abs() / want.vswr, at);
        } else if want.vswr < 1000.0 {
            self.vswr_all.see((s - want.vswr).abs() / want.vswr, at);
        }
        if want.mismatch_loss_db < 100.0 {
            self.ml.see((ml - want.mismatch_loss_db).abs(), at);
        }
        self.gamma.see((g - want.gamma).abs(), at);
    }

    fn report_and_check(&self) {
        println!("{} ({} points):", self.name, self.points);
        for w in [
            &self.rl50,
            &self.rl_all,
            &self.vswr20,
            &self.vswr_all,
            &self.ml,
            &self.gamma,
        ] {
            println!("  worst {:<40} {:.3e} at {}", w.what, w.err, w.at);
        }
        assert!(self.points > 0);
        assert!(self.rl50.err <= RL_BOUND_DB, "{}: RL", self.name);
        assert!(
            self.rl_all.err <= RL_BOUND_DB,
            "{}: RL above 50 dB",
            self.name
        );
        assert!(self.vswr20.err <= VSWR_BOUND_REL, "{}: VSWR", self.name);
        assert!(self.ml.err <= ML_BOUND_DB, "{}: ML", self.name);
        assert!(self.gamma.err <= GAMMA_BOUND, "{}: |Γ|", self.name);
    }
}

/// Forward codes swept against every reflected code.
const FORWARD_CODES: [u16; 25] = [
    2, 3, 4, 5, 7, 10, 16, 31, 100, 255, 256, 1000, 1023, 1024, 4095, 4096, 10_000, 12_345, 20_000,
    32_767, 32_768, 40_000, 50_000, 65_000, 65_534,
];

/// Every (forward, reflected) pair of the code sweeps, reflected < forward.
fn code_pairs() -> impl Iterator<Item = (u16, u16)> {
    let dense = FORWARD_CODES
        .iter()
        .flat_map(|&f| (0..f).map(move |r| (f, r)));
    let every_forward = (2..=65_534u16).flat_map(|f| [(f, 1), (f, f / 2), (f, f - 1)]);
    dense.chain(every_forward)
}

fn code_sweep(
    name: &'static str,
    measure: impl Fn(u16, u16) -> FixedMeasurement,
    reference: impl Fn(u16, u16) -> Scalars,
) {
    let mut sweep = Sweep::new(name);
    let mut prev: Option<(u16, u16, FixedReflection)> = None;
    let mut order_checks = 0u64;
    for (f, r) in code_pairs() {
        let m = measure(f, r);
        // Monotonic in the reflected code, checked between neighbouring codes.
        if let Some((pf, pr, p)) = prev {
            if pf == f && pr.wrapping_add(1) == r {
                assert!(not_more_reflective(&p, &m.reflection), "{f}: {pr} → {r}");
                order_checks += 1;
            }
        }
        prev = Some((f, r, m.reflection));
        // floor = 1: codes at or below it are read as the floor.
        let r_used = r.max(1);
        assert_eq!(
            m.quality.contains(FixedQuality::REFLECTED_AT_FLOOR),
            r <= 1,
            "{f} {r}"
        );
        if r_used == f {
            assert_eq!(m.reflection, FixedReflection::TOTAL, "{f} {r}");
            continue;
        }
        sweep.compare(&m.reflection, &reference(f, r_used), &|| {
            format!("forward {f}, reflected {r}")
        });
    }
    println!("  ({order_checks} neighbouring reflected codes checked for order)");
    sweep.report_and_check();
}

/// True when `a` is no more reflective than `b` in every output.
fn not_more_reflective(a: &FixedReflection, b: &FixedReflection) -> bool {
    a.gamma <= b.gamma
        && a.vswr <= b.vswr
        && a.return_loss >= b.return_loss
        && a.mismatch_loss <= b.mismatch_loss
}

#[test]
fn linear_codes_whole_range() {
    let chain = LinearChain::new(CodeLimits::new(1, 65_535)).unwrap();
    code_sweep(
        "linear detector codes",
        |f, r| chain.measure(f, r).unwrap(),
        reference::linear_codes,
    );
}

#[test]
fn square_law_codes_whole_range() {
    let chain = SquareLawChain::new(CodeLimits::new(1, 65_535)).unwrap();
    code_sweep(
        "square-law detector codes",
        |f, r| chain.measure(f, r).unwrap(),
        reference::square_law_codes,
    );
}

#[test]
fn dbm_whole_range() {
    let chain =
        DbmChain::new(DbmLimits::new(DbmQ16::from_int(-150), DbmQ16::from_int(30))).unwrap();
    let mut sweep = Sweep::new("dBm readings");
    let forward = DbmQ16::from_int(10);
    let dense = 1..=150_000i32; // 0 .. 2.29 dB, every Q16.16 step
    let sparse = (150_000..=100 * 65_536).step_by(13);
    let mut prev: Option<FixedReflection> = None;
    for d in dense.chain(sparse) {
        let m = chain
            .measure(forward, forward - DbQ16::from_bits(d))
            .unwrap();
        // A larger difference is less reflection: monotonic over the whole sweep.
        if let Some(p) = prev {
            assert!(
                not_more_reflective(&m.reflection, &p),
                "at {d}: {p:?} {m:?}"
            );
        }
        prev = Some(m.reflection);
        let d_db = f64::from(d) / 65_536.0;
        sweep.compare(&m.reflection, &reference::db_difference(d_db), &|| {
            format!("difference {d_db:.6} dB ({d} Q16.16 steps)")
        });
    }
    sweep.report_and_check();
}

struct LogCase {
    name: &'static str,
    adc_nv_per_code: u32,
    slope_uv_per_db: i32,
    intercept_dbm: i16,
    floor_dbm: i16,
    max_dbm: i16,
    max_code: u16,
}

const LOG_CASES: [LogCase; 2] = [
    LogCase {
        name: "log detector, falling −25 mV/dB, 12-bit 3.3 V ADC",
        adc_nv_per_code: 805_664,
        slope_uv_per_db: -25_000,
        intercept_dbm: 20,
        floor_dbm: -65,
        max_dbm: 5,
        max_code: 4_095,
    },
    LogCase {
        name: "log detector, rising 24 mV/dB, 10-bit 3.3 V ADC",
        adc_nv_per_code: 3_222_656,
        slope_uv_per_db: 24_000,
        intercept_dbm: -84,
        floor_dbm: -80,
        max_dbm: 10,
        max_code: 1_023,
    },
];

#[test]
fn log_detector_codes_whole_range() {
    for case in LOG_CASES.iter() {
        let chain = LogDetectorChain::new(LogDetectorConfig {
            adc_nv_per_code: case.adc_nv_per_code,
            slope_uv_per_db: case.slope_uv_per_db,
            intercept: DbmQ16::from_int(case.intercept_dbm),
            limits: DbmLimits::new(
                DbmQ16::from_int(case.floor_dbm),
                DbmQ16::from_int(case.max_dbm),
            ),
        })
        .unwrap();
        let power = |c: u16| {
            reference::log_detector_dbm(
                c,
                case.adc_nv_per_code,
                case.slope_uv_per_db,
                f64::from(case.intercept_dbm),
            )
        };
        let mut sweep = Sweep::new(case.name);
        let mut refused = 0u32;
        for f in (0..=case.max_code).step_by(17) {
            for r in 0..=case.max_code {
                let Ok(m) = chain.measure(f, r) else {
                    refused += 1;
                    continue;
                };
                let (pf, pr) = (power(f), power(r));
                // Valid readings must be valid for the reference too (margins of 1e-3 dB
                // for the chain's Q16.16 rounding of each power).
                assert!(pf < f64::from(case.max_dbm) + 1e-3, "{f}");
                assert!(pf > f64::from(case.floor_dbm) - 1e-3, "{f}");
                if m.reflection == FixedReflection::TOTAL {
                    assert!(pr >= pf - 1e-9, "{f} {r}");
                    continue;
                }
                let pr_used = if m.quality.contains(FixedQuality::REFLECTED_AT_FLOOR) {
                    assert!(pr <= f64::from(case.floor_dbm) + 1e-3, "{f} {r}");
                    f64::from(case.floor_dbm)
                } else {
                    pr
                };
                sweep.compare(
                    &m.reflection,
                    &reference::db_difference(pf - pr_used),
                    &|| format!("forward code {f} ({pf:.4} dBm), reflected code {r} ({pr:.4} dBm)"),
                );
            }
        }
        println!("  ({refused} pairs refused by the verdict)");
        assert!(refused > 0);
        sweep.report_and_check();
    }
}

#[test]
fn gamma_relations_whole_range() {
    let mut sweep = Sweep::new("|Γ| → RL, VSWR, ML (directivity bounds)");
    for bits in (1..(1u32 << 31))
        .step_by(1 << 11)
        .chain([1, 2, (1 << 31) - 1])
    {
        let r = from_gamma(GammaQ31::from_bits(bits));
        let g = f64::from(bits) / 2_147_483_648.0;
        // Reference from |Γ| with 1 − |Γ| exact: (2^31 − bits)/2^31.
        let one_minus = f64::from((1u32 << 31) - bits) / 2_147_483_648.0;
        let want = Scalars {
            gamma: g,
            vswr: (1.0 + g) / one_minus,
            return_loss_db: -20.0 * g.log10(),
            mismatch_loss_db: -10.0 * (one_minus * (1.0 + g)).log10(),
        };
        sweep.compare(&r, &want, &|| format!("|Γ| = {g:.10}"));
    }
    sweep.report_and_check();
    // The bounds example of the module doc: D = 30 dB, RL 20 dB → 17.6 .. 23.3 dB,
    // against the reference's |Γ| ± 10^(−D/20).
    let b = feedline::fixed::DirectivityBounds::new(DbQ16::from_int(30));
    let g = GammaQ31::from_bits(214_748_365); // 0.1
    let (lo, hi) = reference::directivity_gamma_bounds(0.1, 30.0);
    let rb = b.bounds(g);
    let rl_hi = f64::from(rb.low.return_loss.to_bits()) / 65_536.0;
    let rl_lo = f64::from(rb.high.return_loss.to_bits()) / 65_536.0;
    println!("D = 30 dB, RL 20 dB: RL between {rl_lo:.4} and {rl_hi:.4} dB");
    assert!((rl_lo - -20.0 * hi.log10()).abs() < RL_BOUND_DB, "{rl_lo}");
    assert!((rl_hi - -20.0 * lo.log10()).abs() < RL_BOUND_DB, "{rl_hi}");
    assert!((rl_lo - 17.6).abs() < 0.05 && (rl_hi - 23.3).abs() < 0.05);
}
