//! Error sweeps of the f32 line models against the independent f64 num-complex reference
//! (`feedline_host_tests::reference::line`): random cases over wide ranges, worst error and
//! where it happened printed (run with `--nocapture`).
//!
//! Bounds held here (the README quotes them):
//! - Z0: 2e-6 relative (complex distance over |Z0|);
//! - α: 2e-5 relative, β: 2e-6 relative, over f 1 kHz–10 GHz, L 1e-8–1e-5 H/m,
//!   C 1e-12–1e-9 F/m, R 0 or 1e-4–100 Ω/m, G 0 or 1e-9–1e-2 S/m;
//! - Γ moved along a line: |ΔΓ| ≤ 2e-7·(8 + 2βℓ) (the f32 phase 2βℓ carries about 1e-7 of
//!   itself); embedding in a 50 Ω analyzer: the same times κ = (1 + |ρ|)/(1 − |ρ|),
//!   ρ = (Z0 − 50)/(Z0 + 50), the amplification of the change of reference;
//! - input impedance, expressed as the Γ error it amounts to (|ΔZ|·|1 − Γin|²/(2|Z0|)):
//!   ≤ 1e-6·(8 + 2βℓ);
//! - de-embedding (embed then de-embed) with round-trip loss ≤ 20 dB: |ΔΓ| ≤ 2e-7·(8 + 2βℓ)
//!   · e^(2αℓ)·κ²;
//! - scalar feed-line relations: total loss 2e-4 dB and |ΓL| 2e-6 for ML ≤ 30 dB;
//! - a geometry-described scenario cable's report (matched loss, SWR at the load, total
//!   loss) 1.8–432 MHz: 1e-5 dB, 1e-5 relative, 2e-5 dB.

use feedline::line::feed_loss::{gamma_at_load, total_loss};
use feedline::line::LineConstants;
use feedline::reflection::Gamma;
use feedline::units::{Db, Hertz, Meters, Ohms};
use feedline_host_tests::reference::line as reference;
use num_complex::{Complex32, Complex64};

/// A small deterministic generator (xorshift64*), so the sweep is repeatable.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        (self.0.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11) as f64 / (1u64 << 53) as f64
    }
    fn log_uniform(&mut self, lo: f64, hi: f64) -> f64 {
        (lo.ln() + self.next() * (hi.ln() - lo.ln())).exp()
    }
    fn or_zero(&mut self, lo: f64, hi: f64) -> f64 {
        if self.next() < 0.15 {
            0.0
        } else {
            self.log_uniform(lo, hi)
        }
    }
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
    fn report(&self, bound: f64) {
        println!(
            "line f32 {}: worst {:.3e} (bound {:.1e}) at {}",
            self.what, self.err, bound, self.at
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

fn c64(z: Complex32) -> Complex64 {
    Complex64::new(f64::from(z.re), f64::from(z.im))
}

const CASES: usize = 20_000;

#[derive(Clone, Copy, Debug)]
struct Case {
    r: f32,
    l: f32,
    g: f32,
    c: f32,
    f: f32,
}

fn case(rng: &mut Rng) -> Case {
    Case {
        r: rng.or_zero(1e-4, 100.0) as f32,
        l: rng.log_uniform(1e-8, 1e-5) as f32,
        g: rng.or_zero(1e-9, 1e-2) as f32,
        c: rng.log_uniform(1e-12, 1e-9) as f32,
        f: rng.log_uniform(1e3, 1e10) as f32,
    }
}

fn exact(k: &Case) -> (Complex64, Complex64) {
    reference::rlgc(
        f64::from(k.r),
        f64::from(k.l),
        f64::from(k.g),
        f64::from(k.c),
        f64::from(k.f),
    )
}

#[test]
fn z0_and_gamma_against_f64() {
    let mut rng = Rng(0x1234_5678_9abc_def1);
    let mut wz = Worst::new("Z0 (relative)");
    let mut wa = Worst::new("alpha (relative)");
    let mut wb = Worst::new("beta (relative)");
    let mut wll = Worst::new("low-loss error report (of the relative error; relative above 1)");
    for _ in 0..CASES {
        let k = case(&mut rng);
        let line = LineConstants::per_meter(k.r, k.l, k.g, k.c)
            .at(Hertz::new(k.f))
            .unwrap();
        let (z0, gm) = exact(&k);
        let z = c64(line.characteristic_impedance());
        let gg = c64(line.propagation_constant::<Meters>());
        wz.see((z - z0).norm() / z0.norm(), || format!("{k:?}"));
        if gm.re > 0.0 {
            wa.see((gg.re - gm.re).abs() / gm.re, || {
                format!("{k:?} alpha {}", gm.re)
            });
        } else {
            wa.see(gg.re.abs(), || format!("{k:?} lossless"));
        }
        wb.see((gg.im - gm.im).abs() / gm.im, || format!("{k:?}"));
        // The core's approximation-error report against the f64 one.
        let e = LineConstants::per_meter(k.r, k.l, k.g, k.c)
            .approximation_error(Hertz::new(k.f))
            .unwrap();
        let (z_ll, a_ll, b_ll) = reference::low_loss(
            f64::from(k.r),
            f64::from(k.l),
            f64::from(k.g),
            f64::from(k.c),
            f64::from(k.f),
        );
        let ez = (Complex64::new(z_ll, 0.0) - z0).norm() / z0.norm();
        let eb = (b_ll - gm.im).abs() / gm.im;
        // Absolute where the error is below 1, relative above (a very lossy line's
        // approximations can be off by orders of magnitude).
        wll.see((f64::from(e.z0) - ez).abs() / ez.max(1.0), || {
            format!("z0 {k:?}")
        });
        wll.see((f64::from(e.beta) - eb).abs() / eb.max(1.0), || {
            format!("beta {k:?}")
        });
        if gm.re > 0.0 && (a_ll - gm.re).abs() / gm.re > 1e-3 {
            // Only where the approximation error is large enough to be resolved in f32.
            let ea = (a_ll - gm.re).abs() / gm.re;
            wll.see((f64::from(e.alpha) - ea).abs() / ea.max(1.0), || {
                format!("alpha {k:?}")
            });
        }
    }
    wz.report(2e-6);
    wa.report(2e-5);
    wb.report(2e-6);
    wll.report(2e-5);
}

#[test]
fn terminated_line_against_f64() {
    let mut rng = Rng(0x0bad_cafe_f00d_1234);
    let mut wg = Worst::new("Gamma moved along the line (|dG| / (8 + 2 beta l))");
    let mut wz = Worst::new("Zin (as |dG| = |dZ| |1 - Gin|^2 / 2|Z0|, / (8 + 2 beta l))");
    let mut we = Worst::new("embed (|dG| / ((8 + 2 beta l) kappa))");
    let mut wd = Worst::new("de-embed round trip (|dG| / ((8 + 2 beta l) e^(2 alpha l) kappa^2))");
    let mut tried = 0;
    while tried < CASES {
        let k = case(&mut rng);
        let line = LineConstants::per_meter(k.r, k.l, k.g, k.c)
            .at(Hertz::new(k.f))
            .unwrap();
        let (z0, gm) = exact(&k);
        // Lengths up to 200 wavelengths.
        let wavelengths = rng.log_uniform(1e-3, 200.0);
        let len = (wavelengths * 2.0 * std::f64::consts::PI / gm.im) as f32;
        if !(len.is_finite() && len > 0.0) {
            continue;
        }
        tried += 1;
        let len64 = f64::from(len);
        let phase = 2.0 * gm.im * len64;
        let ang = rng.next() * 2.0 * std::f64::consts::PI;
        let mag = rng.next().sqrt();
        let gl = Complex32::new((mag * ang.cos()) as f32, (mag * ang.sin()) as f32);
        let gl64 = c64(gl);

        let gin = line.gamma_at_input(gl, Meters::new(len)).unwrap();
        let want = reference::gamma_in(gm, gl64, len64);
        wg.see((c64(gin) - want).norm() / (8.0 + phase), || {
            format!("{k:?} len {len} gl {gl}")
        });

        // Zin of a load impedance (in this line's Z0), tanh form in f64.
        let one = Complex64::new(1.0, 0.0);
        let zl64 = z0 * (one + gl64) / (one - gl64);
        let zl = Complex32::new(zl64.re as f32, zl64.im as f32);
        // The reference's complex tanh overflows beyond αℓ ≈ 350; keep to αℓ < 15.
        if (one - want).norm() >= 0.05 && (one - gl64).norm() > 1e-3 && gm.re * len64 < 15.0 {
            if let Ok(zin) = line.input_impedance(zl, Meters::new(len)) {
                let want_z = reference::input_impedance(z0, gm, c64(zl), len64);
                // Expressed as the Γ error it amounts to: |ΔZ|·|1 − Γin|²/(2|Z0|).
                let dg = (c64(zin) - want_z).norm() * (one - want).norm_sqr() / (2.0 * z0.norm());
                wz.see(dg / (8.0 + phase), || format!("{k:?} len {len} zl {zl}"));
            }
        }

        // Embedding in a 50 Ω analyzer, through impedances in the reference.
        let zref = 50.0;
        if (one - gl64).norm() > 1e-3 && gm.re * len64 < 15.0 {
            let m = line
                .embed(gl, Meters::new(len), Ohms::new(zref as f32))
                .unwrap();
            let want_m = reference::embed(z0, gm, gl64, len64, zref);
            // The change of reference amplifies rounding by up to κ = (1 + |ρ|)/(1 − |ρ|),
            // ρ = (Z0 − Zref)/(Z0 + Zref): the SWR of Z0 in the analyzer's reference.
            let rho = ((z0 - zref) / (z0 + zref)).norm();
            let kappa = (1.0 + rho) / (1.0 - rho);
            we.see((c64(m) - want_m).norm() / ((8.0 + phase) * kappa), || {
                format!("{k:?} len {len} gl {gl} kappa {kappa}")
            });
            let round_trip = 2.0 * gm.re * len64;
            if round_trip < 20.0 / reference::DB_PER_NP {
                let back = line
                    .deembed(m, Meters::new(len), Ohms::new(zref as f32))
                    .unwrap();
                wd.see(
                    (c64(back) - gl64).norm() / ((8.0 + phase) * round_trip.exp() * kappa * kappa),
                    || format!("{k:?} len {len} gl {gl}"),
                );
            }
        }
    }
    wg.report(2e-7);
    wz.report(1e-6);
    we.report(2e-7);
    wd.report(2e-7);
}

#[test]
fn scalar_feed_loss_against_f64() {
    let mut rng = Rng(42);
    let mut wt = Worst::new("total loss (dB)");
    let mut wl = Worst::new("|Gamma| at the load");
    for _ in 0..CASES {
        let ml = (rng.next() * 30.0) as f32;
        let g = (rng.next() * 0.999) as f32;
        let t = total_loss(Db::new(ml), Gamma::new(g).unwrap())
            .unwrap()
            .value();
        let want = reference::total_loss(f64::from(ml), f64::from(g));
        wt.see((f64::from(t) - want).abs(), || format!("ML {ml} |G| {g}"));
        let gin = (reference::gamma_at_input(f64::from(g), f64::from(ml))) as f32;
        let r = gamma_at_load(Gamma::new(gin).unwrap(), Db::new(ml)).unwrap();
        let want_l = reference::gamma_at_load(f64::from(gin), f64::from(ml));
        if want_l <= 1.0 {
            wl.see((f64::from(r.gamma.value()) - want_l).abs(), || {
                format!("ML {ml} |Gin| {gin}")
            });
        }
    }
    wt.report(2e-4);
    wl.report(2e-6);
}

#[test]
fn scenario_cable_report_against_f64() {
    // A scenario cable as the emulated analyzer would describe it: an invented 50 Ω-class
    // solid-PE coax, 30 m, read at several frequencies and SWRs; the core's FeedReport
    // against the f64 chain geometry → RLGC → α → |ΓL| and total loss.
    use feedline::line::{CoaxGeometry, Dielectric};
    use feedline::reflection::Vswr;
    let geo = CoaxGeometry::new(
        Meters::new(0.9e-3),
        Meters::new(2.95e-3),
        Dielectric::SOLID_PE,
    );
    let mut w_ml = Worst::new("scenario matched loss (dB)");
    let mut w_s = Worst::new("scenario SWR at load (relative)");
    let mut w_t = Worst::new("scenario total loss (dB)");
    for f in [1.8e6f32, 7.1e6, 14.2e6, 28.5e6, 50.1e6, 144.2e6, 432.1e6] {
        let line = geo.line_at(Hertz::new(f)).unwrap();
        let [r, l, g, c] = reference::coax_rlgc(0.9e-3, 2.95e-3, 2.25, 2e-4, 5.8e7, f64::from(f));
        let (_, gm) = reference::rlgc(r, l, g, c, f64::from(f));
        let ml = gm.re * reference::DB_PER_NP * 30.0;
        for s in [1.05f32, 1.5, 2.0, 3.0] {
            let rep = line
                .feed_report(Meters::new(30.0), Vswr::new(s).unwrap())
                .unwrap();
            w_ml.see((f64::from(rep.matched_loss.value()) - ml).abs(), || {
                format!("{f} Hz")
            });
            let gl = reference::gamma_at_load(reference::gamma_from_vswr(f64::from(s)), ml);
            if gl < 0.99 {
                let sl = reference::vswr(gl);
                let got = f64::from(rep.at_load.vswr.value());
                w_s.see((got - sl).abs() / sl, || format!("{f} Hz SWR {s}"));
                let t = reference::total_loss(ml, gl);
                w_t.see((f64::from(rep.total_loss.value()) - t).abs(), || {
                    format!("{f} Hz SWR {s}")
                });
            }
        }
    }
    w_ml.report(1e-5);
    w_s.report(1e-5);
    w_t.report(2e-5);
}
