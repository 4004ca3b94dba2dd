//! Recovery of random one-port error terms from simulated open/short/load readings.
//!
//! Published model under test: the standard one-port three-term error model
//! Γm = e00 + e10e01·Γa/(1 − e11·Γa) (Agilent Application Note 1287-3, *Applying Error
//! Correction to Network Analyzer Measurements*; D. M. Pozar, *Microwave Engineering*).
//! Reference: the independent f64 num-complex model in
//! `feedline_host_tests::reference::calibration` (never calls feedline). The readings are
//! simulated in f64 by the reference and rounded to f32 before the core sees them.
//!
//! Run with `cargo test -p feedline-host-tests --test calibration_recovery -- --nocapture`
//! to see the worst errors.

use feedline::calibration::{
    LoadStandard, OnePortTerms, OpenStandard, ShortStandard, StandardsModel,
};
use feedline::units::{Hertz, Ohms, Seconds};
use feedline_host_tests::reference::calibration as reference;
use num_complex::{Complex32, Complex64};

/// Bound on |Δe| of each recovered term against the true f64 terms (ideal standards).
const TERM_BOUND: f64 = 1.0e-6;
/// Bound on |ΔΓ| of a corrected passive DUT (|Γ| ≤ 1) against its true Γ.
const GAMMA_BOUND: f64 = 2.0e-6;
/// Bound on |Δe| with modelled standards (their Γ computed in f32 by the core).
const MODELLED_TERM_BOUND: f64 = 1.0e-6;

struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        // splitmix64
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }
    fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.next()
    }
    fn polar(&mut self, rlo: f64, rhi: f64) -> Complex64 {
        let r = self.range(rlo, rhi);
        Complex64::from_polar(r, self.range(0.0, std::f64::consts::TAU))
    }
}

fn f32c(z: Complex64) -> Complex32 {
    Complex32::new(z.re as f32, z.im as f32)
}

fn f64c(z: Complex32) -> Complex64 {
    Complex64::new(z.re as f64, z.im as f64)
}

/// Random bridge error terms: |e00| ≤ 0.3 (directivity no worse than about 10 dB),
/// |e11| ≤ 0.3, tracking 0.3…1.0 at any phase (invented ranges covering poor and good
/// bridges).
fn random_terms(rng: &mut Rng) -> reference::Terms {
    reference::Terms {
        e00: rng.polar(0.0, 0.3),
        e11: rng.polar(0.0, 0.3),
        tracking: rng.polar(0.3, 1.0),
    }
}

fn term_error(core: &OnePortTerms, truth: &reference::Terms) -> f64 {
    [
        (f64c(core.directivity()) - truth.e00).norm(),
        (f64c(core.source_match()) - truth.e11).norm(),
        (f64c(core.tracking()) - truth.tracking).norm(),
    ]
    .into_iter()
    .fold(0.0, f64::max)
}

#[test]
fn ideal_standards_recover_random_terms() {
    let mut rng = Rng(1);
    let mut worst_term = (0.0f64, None);
    let mut worst_ref_vs_core = 0.0f64;
    let mut worst_gamma = (0.0f64, None);
    let ideal = [
        Complex64::new(1.0, 0.0),
        Complex64::new(-1.0, 0.0),
        Complex64::new(0.0, 0.0),
    ];
    for case in 0..20_000 {
        let truth = random_terms(&mut rng);
        let m = ideal.map(|a| f32c(reference::distort(&truth, a)));
        let core = OnePortTerms::from_known(ideal.map(f32c), m).expect("solvable");
        let e = term_error(&core, &truth);
        if e > worst_term.0 {
            worst_term = (e, Some((case, truth)));
        }
        // The reference solving the same f32-rounded readings.
        let r = reference::solve(ideal, m.map(f64c)).unwrap();
        let d = [
            (f64c(core.directivity()) - r.e00).norm(),
            (f64c(core.source_match()) - r.e11).norm(),
            (f64c(core.tracking()) - r.tracking).norm(),
        ]
        .into_iter()
        .fold(0.0, f64::max);
        worst_ref_vs_core = worst_ref_vs_core.max(d);
        for _ in 0..5 {
            let dut = rng.polar(0.0, 1.0);
            let raw = f32c(reference::distort(&truth, dut));
            let got = f64c(core.correct(raw).expect("corrects"));
            let e = (got - dut).norm();
            if e > worst_gamma.0 {
                worst_gamma = (e, Some((case, dut)));
            }
        }
    }
    println!(
        "ideal OSL, 20000 random term sets: worst |Δterm| vs truth = {:.3e} at {:?}",
        worst_term.0, worst_term.1
    );
    println!("  worst |Δterm| core vs f64 reference solve of the same f32 readings = {worst_ref_vs_core:.3e}");
    println!(
        "  worst |ΔΓ| of corrected DUTs (|Γ| ≤ 1) = {:.3e} at {:?}",
        worst_gamma.0, worst_gamma.1
    );
    assert!(worst_term.0 < TERM_BOUND);
    assert!(worst_ref_vs_core < TERM_BOUND);
    assert!(worst_gamma.0 < GAMMA_BOUND);
}

#[test]
fn modelled_standards_recover_random_terms() {
    let mut rng = Rng(2);
    let z0 = 50.0;
    let mut worst = (0.0f64, 0.0f64);
    let mut worst_gamma = 0.0f64;
    for _ in 0..5_000 {
        let truth = random_terms(&mut rng);
        let f = rng.range(1.0e6, 3.0e9);
        // An invented calibration kit within typical ranges.
        let c = [
            rng.range(0.0, 100.0),
            rng.range(-500.0, 500.0),
            rng.range(-50.0, 50.0),
            rng.range(-5.0, 5.0),
        ];
        let l = [
            rng.range(0.0, 50.0),
            rng.range(-500.0, 500.0),
            rng.range(-50.0, 50.0),
            rng.range(-5.0, 5.0),
        ];
        let tau_o = rng.range(0.0, 50.0e-12);
        let tau_s = rng.range(0.0, 50.0e-12);
        let load = rng.polar(0.0, 0.05);
        let model = StandardsModel {
            open: OpenStandard {
                capacitance: c.map(|x| x as f32),
                delay: Seconds::new(tau_o as f32),
            },
            short: ShortStandard {
                inductance: l.map(|x| x as f32),
                delay: Seconds::new(tau_s as f32),
            },
            load: LoadStandard { gamma: f32c(load) },
            z0: Ohms::new(z0 as f32),
        };
        let fq = f as f32 as f64;
        let actual = [
            reference::open_gamma(c.map(|x| x as f32 as f64), tau_o as f32 as f64, fq, z0),
            reference::short_gamma(l.map(|x| x as f32 as f64), tau_s as f32 as f64, fq, z0),
            f64c(f32c(load)),
        ];
        let m = actual.map(|a| f32c(reference::distort(&truth, a)));
        let core =
            OnePortTerms::from_standards(m[0], m[1], m[2], &model, Hertz::new(f as f32)).unwrap();
        let e = term_error(&core, &truth);
        if e > worst.0 {
            worst = (e, f);
        }
        let dut = rng.polar(0.0, 1.0);
        let got = f64c(core.correct(f32c(reference::distort(&truth, dut))).unwrap());
        worst_gamma = worst_gamma.max((got - dut).norm());
    }
    println!(
        "modelled OSL, 5000 random kits/terms: worst |Δterm| = {:.3e} at f = {:.4e} Hz; worst |ΔΓ| = {worst_gamma:.3e}",
        worst.0, worst.1
    );
    assert!(worst.0 < MODELLED_TERM_BOUND);
    assert!(worst_gamma < GAMMA_BOUND);
}

#[test]
fn forward_model_matches_reference() {
    // The core's `distort` (used by simulated front ends) against the reference model.
    let mut rng = Rng(3);
    let mut worst = 0.0f64;
    for _ in 0..10_000 {
        let truth = random_terms(&mut rng);
        let core =
            OnePortTerms::new(f32c(truth.e00), f32c(truth.e11), f32c(truth.tracking)).unwrap();
        let exact = reference::Terms {
            e00: f64c(core.directivity()),
            e11: f64c(core.source_match()),
            tracking: f64c(core.tracking()),
        };
        let a = rng.polar(0.0, 1.0);
        let got = f64c(core.distort(f32c(a)).unwrap());
        worst = worst.max((got - reference::distort(&exact, f64c(f32c(a)))).norm());
    }
    println!("forward model: worst |Δ| core vs reference = {worst:.3e}");
    assert!(worst < 1.0e-6);
}
