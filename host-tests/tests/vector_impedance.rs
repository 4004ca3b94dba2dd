//! Impedance and admittance conversions of the core against f64 num-complex.
//!
//! Formulas: Z = Z0(1 + Γ)/(1 − Γ), Y = 1/Z, Rp = 1/G, Xp = −1/B, L = X/ω, C = −1/(ωX),
//! Q = |X|/R — textbook transmission-line and circuit theory (D. M. Pozar, *Microwave
//! Engineering*, ch. 2). Reference: `feedline_host_tests::reference::calibration` and
//! num-complex f64, with the same f32 Γ promoted to f64 as input.
//!
//! Run with `--nocapture` to see the worst errors.

use feedline::units::{Db, Hertz, Ohms};
use feedline::vector::{gamma_from_db_phase, Admittance, Impedance, Reactive, RATIO_CEILING};
use feedline_host_tests::reference::calibration as reference;
use num_complex::{Complex32, Complex64};

/// Bound on |ΔZ|/|Z| (and |ΔY|/|Y|) for uncapped results.
const RELATIVE_BOUND: f64 = 1.0e-6;
/// Bound on the relative error of Rp, Xp, L, C and Q where the part is well defined
/// (|part| ≥ 10⁻³ of |Z| or |Y|; smaller parts are differences of nearly equal numbers).
const DERIVED_BOUND: f64 = 1.0e-4;

struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// Γ samples: uniform in |Γ| ≤ 1.2 at any angle, plus points ever closer to +1 and −1.
fn samples() -> Vec<Complex32> {
    let mut rng = Rng(7);
    let mut v = Vec::new();
    for _ in 0..50_000 {
        let r = 1.2 * rng.next();
        let a = std::f64::consts::TAU * rng.next();
        let g = Complex64::from_polar(r, a);
        v.push(Complex32::new(g.re as f32, g.im as f32));
    }
    for k in 1..=24 {
        let e = 2f32.powi(-k);
        for s in [1.0f32, -1.0] {
            v.push(Complex32::new(s * (1.0 - e), 0.0));
            v.push(Complex32::new(s * (1.0 - e), e));
            v.push(Complex32::new(s, e));
        }
    }
    v.push(Complex32::new(1.0, 0.0));
    v.push(Complex32::new(-1.0, 0.0));
    v
}

fn c64(z: Complex32) -> Complex64 {
    Complex64::new(z.re as f64, z.im as f64)
}

fn rel(got: f64, want: f64) -> f64 {
    (got - want).abs() / want.abs()
}

#[test]
fn impedance_and_admittance_match_f64() {
    let z0 = 50.0;
    let f = 7.1e6;
    let w = std::f64::consts::TAU * f;
    let (mut wz, mut wy, mut wd) = ((0.0f64, Complex32::default()), 0.0f64, (0.0f64, ""));
    let mut capped = 0;
    for g in samples() {
        let gd = c64(g);
        let z = Impedance::from_gamma(g, Ohms::new(z0 as f32)).unwrap();
        let y = Admittance::from_gamma(g, Ohms::new(z0 as f32)).unwrap();
        let zr = reference::impedance(gd, z0);
        let yr = reference::admittance(gd, z0);
        if !zr.is_finite() || zr.norm() >= RATIO_CEILING as f64 * z0 {
            assert!(z.is_capped(), "{g}");
            assert!(rel(z.magnitude().value() as f64, RATIO_CEILING as f64 * z0) < 1e-6);
            capped += 1;
        } else {
            assert!(!z.is_capped() || zr.norm() > 0.999 * RATIO_CEILING as f64 * z0);
            let e = (c64(z.complex()) - zr).norm() / zr.norm();
            if e > wz.0 {
                wz = (e, g);
            }
            // R, X, |Z|, angle from the same complex value.
            assert!((z.resistance().value() as f64 - zr.re).abs() <= 2e-6 * zr.norm());
            assert!((z.reactance().value() as f64 - zr.im).abs() <= 2e-6 * zr.norm());
            assert!(rel(z.magnitude().value() as f64, zr.norm()) < 2e-6 || zr.norm() == 0.0);
            if zr.norm() > 0.0 {
                let da = (z.angle_deg() as f64 - zr.arg().to_degrees()).abs();
                assert!(da.min(360.0 - da) < 1e-3, "{g}");
            }
            // Derived quantities where well defined.
            let big = |part: f64, whole: f64| part.abs() >= 1e-3 * whole;
            // The core treats parts below 10⁻⁶ of Z0 (or 1/Z0) as absent.
            if big(zr.im, zr.norm()) && zr.im.abs() >= 1e-6 * z0 {
                let want_elem = if zr.im > 0.0 {
                    zr.im / w
                } else {
                    -1.0 / (w * zr.im)
                };
                let got = match z.series_element(Hertz::new(f as f32)).unwrap() {
                    Reactive::Inductance(l) => l.value() as f64,
                    Reactive::Capacitance(c) => c.value() as f64,
                    Reactive::Resistive => f64::NAN,
                };
                let e = rel(got, want_elem);
                if e > wd.0 {
                    wd = (e, "series L/C");
                }
                if zr.re > 0.0 && big(zr.re, zr.norm()) {
                    let e = rel(z.q().unwrap() as f64, zr.im.abs() / zr.re);
                    if e > wd.0 {
                        wd = (e, "Q");
                    }
                }
            }
            if yr.is_finite() && yr.norm() < RATIO_CEILING as f64 / z0 {
                let p = z.parallel();
                if big(yr.re, yr.norm()) && yr.re.abs() * z0 >= 1e-6 {
                    let e = rel(p.resistance.unwrap().value() as f64, 1.0 / yr.re);
                    if e > wd.0 {
                        wd = (e, "Rp");
                    }
                }
                if big(yr.im, yr.norm()) && yr.im.abs() * z0 >= 1e-6 {
                    let e = rel(p.reactance.unwrap().value() as f64, -1.0 / yr.im);
                    if e > wd.0 {
                        wd = (e, "Xp");
                    }
                }
            }
        }
        if yr.is_finite() && yr.norm() < RATIO_CEILING as f64 / z0 {
            let e = (c64(y.complex()) - yr).norm() / yr.norm();
            wy = wy.max(e);
            assert!(!y.is_capped() || yr.norm() > 0.999 * RATIO_CEILING as f64 / z0);
        } else {
            assert!(y.is_capped(), "{g}");
        }
    }
    println!(
        "impedance: worst |ΔZ|/|Z| = {:.3e} at Γ = {}; admittance worst |ΔY|/|Y| = {wy:.3e}; {capped} capped opens",
        wz.0, wz.1
    );
    println!(
        "derived (Rp, Xp, L/C, Q): worst relative error {:.3e} ({})",
        wd.0, wd.1
    );
    assert!(wz.0 < RELATIVE_BOUND);
    assert!(wy < RELATIVE_BOUND);
    assert!(wd.0 < DERIVED_BOUND);
}

#[test]
fn round_trip_and_db_phase_against_f64() {
    // Γ from dB and phase against 10^(dB/20)·e^(jφ) in f64 (definition of the dB
    // voltage ratio); Z → Γ round trip against the reference Γ = (Z − Z0)/(Z + Z0).
    let mut worst_dbp = 0.0f64;
    let mut worst_rt = 0.0f64;
    for i in 0..=400 {
        for j in 0..=72 {
            let db = -60.0 + 0.15 * i as f32;
            let ph = -180.0 + 5.0 * j as f32;
            let g = gamma_from_db_phase(Db::new(db), ph).unwrap();
            let want =
                Complex64::from_polar(10f64.powf(db as f64 / 20.0), (ph as f64).to_radians());
            worst_dbp = worst_dbp.max((c64(g) - want).norm() / want.norm());
            let z = Impedance::from_gamma(g, Ohms::new(50.0)).unwrap();
            if !z.is_capped() {
                let back = reference::gamma_of(c64(z.complex()), 50.0);
                worst_rt = worst_rt.max((c64(z.gamma()) - back).norm());
            }
        }
    }
    println!("dB+phase → Γ: worst relative error {worst_dbp:.3e}; Z → Γ worst |ΔΓ| {worst_rt:.3e}");
    assert!(worst_dbp < 1.0e-6);
    assert!(worst_rt < 1.0e-6);
}
