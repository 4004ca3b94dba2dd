//! The phase-sign resolver on simulated one-ports.
//!
//! Method under test: Foster's reactance theorem (R. M. Foster, "A reactance theorem", Bell
//! System Technical Journal 3, 1924): a lossless one-port has dX/dω ≥ |X|/ω > 0 and
//! dB/dω > 0. The one-ports are computed here in f64 from their element values (series
//! and parallel R-L-C, lumped-circuit theory); the resolver sees only Γ with |phase|, in f32.
//! What is checked: it is never wrong when it decides; the share of ambiguous verdicts is
//! printed.

use feedline::units::{Hertz, Ohms};
use feedline::vector::{resolve_phase_sign, PhaseSign, PhaseSignConfig};
use feedline_host_tests::reference::calibration as reference;
use num_complex::{Complex32, Complex64};

struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }
    fn log_range(&mut self, lo: f64, hi: f64) -> f64 {
        (lo.ln() + (hi.ln() - lo.ln()) * self.next()).exp()
    }
}

#[derive(Clone, Copy, Debug)]
enum Net {
    /// R + jωL + 1/(jωC)
    Series { r: f64, l: f64, c: f64 },
    /// 1/(G + jωC + 1/(jωL)), G = 1/R
    Parallel { r: f64, l: f64, c: f64 },
}

impl Net {
    fn z(&self, f: f64) -> Complex64 {
        let w = std::f64::consts::TAU * f;
        match *self {
            Net::Series { r, l, c } => Complex64::new(r, w * l - 1.0 / (w * c)),
            Net::Parallel { r, l, c } => 1.0 / Complex64::new(1.0 / r, w * c - 1.0 / (w * l)),
        }
    }
}

fn upper(z: Complex64) -> Complex32 {
    let g = reference::gamma_of(z, 50.0);
    Complex32::new(g.re as f32, g.im.abs() as f32)
}

fn run(lossless: bool, seed: u64) -> (usize, usize, usize, usize) {
    let mut rng = Rng(seed);
    let cfg = PhaseSignConfig::default();
    let (mut decided, mut ambiguous, mut wrong, mut crossed) = (0, 0, 0, 0);
    for i in 0..20_000 {
        let l = rng.log_range(10e-9, 10e-6);
        let c = rng.log_range(1e-12, 1e-9);
        let r = if lossless {
            if i % 2 == 0 {
                1e-9
            } else {
                1e12
            }
        } else {
            rng.log_range(1.0, 1000.0)
        };
        let net = if i % 2 == 0 {
            Net::Series { r, l, c }
        } else {
            Net::Parallel { r, l, c }
        };
        let f1 = rng.log_range(1e6, 100e6);
        let f2 = f1 * 1.01;
        let (z1, z2) = (net.z(f1), net.z(f2));
        if z1.im.signum() != z2.im.signum() {
            crossed += 1;
            continue;
        }
        let verdict = resolve_phase_sign(
            Hertz::new(f1 as f32),
            upper(z1),
            Hertz::new(f2 as f32),
            upper(z2),
            Ohms::new(50.0),
            &cfg,
        )
        .unwrap();
        let truth = if z1.im > 0.0 {
            PhaseSign::Positive
        } else {
            PhaseSign::Negative
        };
        match verdict {
            PhaseSign::Ambiguous(_) => ambiguous += 1,
            v if v == truth => decided += 1,
            _ => {
                wrong += 1;
                println!("wrong: {net:?} at {f1:.4e} Hz: z = {z1}");
            }
        }
    }
    (decided, ambiguous, wrong, crossed)
}

#[test]
fn never_wrong_on_lossless_one_ports() {
    let (d, a, w, x) = run(true, 11);
    println!("lossless series/parallel LC, 1 % steps: {d} decided, {a} ambiguous, {w} wrong, {x} steps crossing a resonance skipped");
    assert_eq!(w, 0);
    assert!(d > 10 * a, "lossless one-ports should mostly be decided");
}

#[test]
fn never_wrong_on_lossy_rlc() {
    let (d, a, w, x) = run(false, 12);
    println!("lossy series/parallel RLC, 1 % steps: {d} decided, {a} ambiguous, {w} wrong, {x} crossings skipped");
    assert_eq!(w, 0);
}
