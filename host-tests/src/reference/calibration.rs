//! f64 reference for vector reflection and one-port calibration, written apart from the core.
//!
//! Sources:
//! * one-port three-term error model Γm = e00 + e10e01·Γa/(1 − e11·Γa) — Agilent Application
//!   Note 1287-3, *Applying Error Correction to Network Analyzer Measurements*; D. M. Pozar,
//!   *Microwave Engineering* (flow-graph analysis);
//! * Γ ↔ Z: Γ = (Z − Z0)/(Z + Z0), textbook transmission-line theory (Pozar, ch. 2);
//! * standards: lumped C or L terminating a lossless offset line, Γ·e^(−j2ωτ) (same text);
//!   polynomial coefficients in SI after the usual scaling (common practice).
//!
//! The solution of the three terms here uses Gaussian elimination with partial pivoting
//! on the 3×3 system in (e00, e11, Δ = e10e01 − e00·e11), a different route from the core.

use num_complex::Complex64;

/// Three error terms in f64.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Terms {
    /// Directivity e00.
    pub e00: Complex64,
    /// Source match e11.
    pub e11: Complex64,
    /// Reflection tracking e10e01.
    pub tracking: Complex64,
}

/// Raw reading of a device of actual Γ `a`: e00 + e10e01·a/(1 − e11·a).
pub fn distort(t: &Terms, a: Complex64) -> Complex64 {
    t.e00 + t.tracking * a / (Complex64::new(1.0, 0.0) - t.e11 * a)
}

/// Corrected Γ of raw reading `m`: the inverse of [`distort`], (m − e00)/(e10e01 + e11(m − e00)).
pub fn correct(t: &Terms, m: Complex64) -> Complex64 {
    let d = m - t.e00;
    d / (t.tracking + t.e11 * d)
}

/// Solves the terms from three standards of actual Γ `a` read as `m`.
pub fn solve(a: [Complex64; 3], m: [Complex64; 3]) -> Option<Terms> {
    // Rows: [1, a·m, a | m]
    let mut rows: Vec<[Complex64; 4]> = (0..3)
        .map(|i| [Complex64::new(1.0, 0.0), a[i] * m[i], a[i], m[i]])
        .collect();
    for col in 0..3 {
        let pivot = (col..3).max_by(|&x, &y| {
            rows[x][col]
                .norm()
                .partial_cmp(&rows[y][col].norm())
                .unwrap()
        })?;
        rows.swap(col, pivot);
        let p = rows[col][col];
        if p.norm() < 1e-300 {
            return None;
        }
        let pivot_row = rows[col];
        for (r, row) in rows.iter_mut().enumerate() {
            if r != col {
                let k = row[col] / p;
                for (dst, src) in row[col..].iter_mut().zip(&pivot_row[col..]) {
                    *dst -= k * src;
                }
            }
        }
    }
    let e00 = rows[0][3] / rows[0][0];
    let e11 = rows[1][3] / rows[1][1];
    let delta = rows[2][3] / rows[2][2];
    Some(Terms {
        e00,
        e11,
        tracking: delta + e00 * e11,
    })
}

/// e^(−j2ωτ) for a lossless offset of one-way delay `tau` seconds at `f` Hz.
pub fn offset(f: f64, tau: f64) -> Complex64 {
    Complex64::from_polar(1.0, -2.0 * 2.0 * std::f64::consts::PI * f * tau)
}

/// Γ of an open: fringing capacitance C(f) = C0·1e-15 + C1·1e-27·f + C2·1e-36·f² + C3·1e-45·f³
/// farads behind an offset, computed through admittances: Γ = (Y0 − jωC)/(Y0 + jωC).
pub fn open_gamma(c: [f64; 4], tau: f64, f: f64, z0: f64) -> Complex64 {
    let cap = c[0] * 1e-15 + c[1] * 1e-27 * f + c[2] * 1e-36 * f * f + c[3] * 1e-45 * f * f * f;
    let y = Complex64::new(0.0, 2.0 * std::f64::consts::PI * f * cap);
    let y0 = Complex64::new(1.0 / z0, 0.0);
    (y0 - y) / (y0 + y) * offset(f, tau)
}

/// Γ of a short: inductance L(f) = L0·1e-12 + L1·1e-24·f + L2·1e-33·f² + L3·1e-42·f³ henries
/// behind an offset: Γ = (jωL − Z0)/(jωL + Z0).
pub fn short_gamma(l: [f64; 4], tau: f64, f: f64, z0: f64) -> Complex64 {
    let ind = l[0] * 1e-12 + l[1] * 1e-24 * f + l[2] * 1e-33 * f * f + l[3] * 1e-42 * f * f * f;
    let z = Complex64::new(0.0, 2.0 * std::f64::consts::PI * f * ind);
    let z0 = Complex64::new(z0, 0.0);
    (z - z0) / (z + z0) * offset(f, tau)
}

/// Z = Z0·(1 + Γ)/(1 − Γ).
pub fn impedance(g: Complex64, z0: f64) -> Complex64 {
    z0 * (1.0 + g) / (1.0 - g)
}

/// Y = 1/Z = (1/Z0)·(1 − Γ)/(1 + Γ).
pub fn admittance(g: Complex64, z0: f64) -> Complex64 {
    (1.0 - g) / (1.0 + g) / z0
}

/// Γ = (Z − Z0)/(Z + Z0).
pub fn gamma_of(z: Complex64, z0: f64) -> Complex64 {
    (z - z0) / (z + z0)
}
