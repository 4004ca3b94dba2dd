//! f64 reference for the transmission-line models: telegrapher's equations, coaxial and
//! two-wire geometry, the two-term loss model, a terminated line, embedding through a line,
//! and the scalar feed-line relations.
//!
//! Sources (restated here independently of the core, in f64 with num-complex):
//! - Z0 = √((R + jωL)/(G + jωC)), γ = √((R + jωL)(G + jωC)) (Pozar, *Microwave Engineering*,
//!   §2.1); low-loss forms Pozar §2.7;
//! - geometry: Pozar Table 2.1; two-wire proximity factor (Ramo, Whinnery & Van Duzer, from
//!   memory); skin depth δ = 1/√(π f μ0 σ);
//! - input impedance in the tanh form Zin = Z0·(ZL + Z0·tanh γℓ)/(Z0 + ZL·tanh γℓ) (Pozar
//!   §2.7) — a different formulation from the core's Γ-based one;
//! - embedding through impedances: Γ → Z in Zref → Zin through the line → Γ in Zref;
//! - total loss: the handbook expression 10·log10[(A² − |ΓL|²)/(A·(1 − |ΓL|²))] evaluated
//!   directly (ARRL Antenna Book, from memory).

use num_complex::Complex64;
use std::f64::consts::PI;

/// Speed of light in vacuum, m/s.
pub const C0: f64 = 299_792_458.0;
/// μ0 = 4π·10⁻⁷ H/m.
pub const MU0: f64 = 4.0e-7 * PI;
/// ε0 = 1/(μ0·c²) F/m.
pub const EPS0: f64 = 1.0 / (MU0 * C0 * C0);
/// dB per neper.
pub const DB_PER_NP: f64 = 8.685_889_638_065_037;

/// Z0 and γ (per metre) of a line with R, L, G, C per metre at frequency f.
pub fn rlgc(r: f64, l: f64, g: f64, c: f64, f: f64) -> (Complex64, Complex64) {
    let w = 2.0 * PI * f;
    let z = Complex64::new(r, w * l);
    let y = Complex64::new(g, w * c);
    ((z / y).sqrt(), (z * y).sqrt())
}

/// Low-loss approximations (Z0, α Np/m, β rad/m).
pub fn low_loss(r: f64, l: f64, g: f64, c: f64, f: f64) -> (f64, f64, f64) {
    let z0 = (l / c).sqrt();
    let w = 2.0 * PI * f;
    (z0, r / (2.0 * z0) + g * z0 / 2.0, w * (l * c).sqrt())
}

/// Skin depth, m.
pub fn skin_depth(f: f64, sigma: f64) -> f64 {
    1.0 / (PI * f * MU0 * sigma).sqrt()
}

/// Surface resistance, Ω.
pub fn surface_resistance(f: f64, sigma: f64) -> f64 {
    1.0 / (sigma * skin_depth(f, sigma))
}

/// Coax R, L (external + internal R/ω), G, C per metre: diameters d < D, εr, tanδ, σ.
pub fn coax_rlgc(d: f64, dd: f64, er: f64, tand: f64, sigma: f64, f: f64) -> [f64; 4] {
    let ln = (dd / d).ln();
    let l = MU0 / (2.0 * PI) * ln;
    let c = 2.0 * PI * EPS0 * er / ln;
    let rs = surface_resistance(f, sigma);
    let r = rs / (2.0 * PI) * (2.0 / d + 2.0 / dd);
    let w = 2.0 * PI * f;
    [r, l + r / w, w * c * tand, c]
}

/// Lossless coax Z0 = η0/(2π√εr)·ln(D/d).
pub fn coax_z0(d: f64, dd: f64, er: f64) -> f64 {
    let eta0 = MU0 * C0;
    eta0 / (2.0 * PI * er.sqrt()) * (dd / d).ln()
}

/// Two-wire R, L, G, C per metre: diameter d, centre spacing s.
pub fn two_wire_rlgc(d: f64, s: f64, er: f64, tand: f64, sigma: f64, f: f64) -> [f64; 4] {
    let x = s / d;
    let ac = x.acosh();
    let l = MU0 / PI * ac;
    let c = PI * EPS0 * er / ac;
    let rs = surface_resistance(f, sigma);
    let r = rs / (PI * d / 2.0) * x / (x * x - 1.0).sqrt();
    let w = 2.0 * PI * f;
    [r, l + r / w, w * c * tand, c]
}

/// Lossless two-wire Z0 = η0/(π√εr)·acosh(s/d).
pub fn two_wire_z0(d: f64, s: f64, er: f64) -> f64 {
    let eta0 = MU0 * C0;
    eta0 / (PI * er.sqrt()) * (s / d).acosh()
}

/// Input impedance, tanh form.
pub fn input_impedance(z0: Complex64, gamma: Complex64, zl: Complex64, len: f64) -> Complex64 {
    let t = (gamma * len).tanh();
    z0 * (zl + z0 * t) / (z0 + zl * t)
}

/// Γ at the input of `len` of line: ΓL·e^(−2γℓ).
pub fn gamma_in(gamma: Complex64, gl: Complex64, len: f64) -> Complex64 {
    gl * (-2.0 * gamma * len).exp()
}

/// The reading in `zref` at the input of `len` of line (Z0, γ) with a load of reflection
/// `gl` in `zref`, through impedances.
pub fn embed(z0: Complex64, gamma: Complex64, gl: Complex64, len: f64, zref: f64) -> Complex64 {
    let zr = Complex64::new(zref, 0.0);
    let one = Complex64::new(1.0, 0.0);
    let zl = zr * (one + gl) / (one - gl);
    let zin = input_impedance(z0, gamma, zl, len);
    (zin - zr) / (zin + zr)
}

/// Least-squares k1, k2 (dB/m per √MHz and per MHz) of α = k1√f + k2·f with weights 1/f,
/// by the 2×2 normal equations in f64 (f in MHz).
pub fn fit_loss(points: &[(f64, f64)]) -> (f64, f64) {
    // Minimise Σ (α − k1√f − k2 f)²/f: rows (1, √f) → α/√f.
    let (mut s11, mut s12, mut s22, mut b1, mut b2) = (0.0, 0.0, 0.0, 0.0, 0.0);
    for &(f, a) in points {
        let x = f.sqrt();
        let u = a / x;
        s11 += 1.0;
        s12 += x;
        s22 += x * x;
        b1 += u;
        b2 += x * u;
    }
    let det = s11 * s22 - s12 * s12;
    ((b1 * s22 - b2 * s12) / det, (s11 * b2 - s12 * b1) / det)
}

/// |ΓL| from |Γin| and matched loss (dB).
pub fn gamma_at_load(gamma_in: f64, ml_db: f64) -> f64 {
    gamma_in * 10f64.powf(ml_db / 10.0)
}

/// |Γin| from |ΓL| and matched loss (dB).
pub fn gamma_at_input(gamma_load: f64, ml_db: f64) -> f64 {
    gamma_load * 10f64.powf(-ml_db / 10.0)
}

/// Total loss with mismatch, handbook expression.
pub fn total_loss(ml_db: f64, gamma_load: f64) -> f64 {
    let a = 10f64.powf(ml_db / 10.0);
    let g2 = gamma_load * gamma_load;
    10.0 * ((a * a - g2) / (a * (1.0 - g2))).log10()
}

/// Power at the load for forward power at the input.
pub fn power_at_load(forward: f64, ml_db: f64, gamma_load: f64) -> f64 {
    forward * 10f64.powf(-ml_db / 10.0) * (1.0 - gamma_load * gamma_load)
}

/// VSWR from |Γ|.
pub fn vswr(g: f64) -> f64 {
    (1.0 + g) / (1.0 - g)
}

/// |Γ| from VSWR.
pub fn gamma_from_vswr(s: f64) -> f64 {
    (s - 1.0) / (s + 1.0)
}

/// Return loss (positive dB) from |Γ|.
pub fn return_loss(g: f64) -> f64 {
    -20.0 * g.log10()
}
