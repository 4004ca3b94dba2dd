//! A coaxial line with discrete discontinuities, in f64, for distance-to-fault checks.
//!
//! Textbook transmission-line theory (e.g. Pozar, *Microwave Engineering*): walking from the
//! far end to the input, a line section of length ℓ multiplies Γ by e^(−2γℓ) with
//! γ = α + jβ, β = 2πf/(VF·c); a two-port junction with scattering parameters S turns the
//! reflection Γ behind it into S11 + S12·S21·Γ/(1 − S22·Γ) (all multiple reflections
//! included). A connector is a shunt admittance y (normalised) with
//! S11 = S22 = −y/(2 + y), S21 = S12 = 2/(2 + y) (Pozar, table of two-port S parameters).
//! Cable loss α = k1·√(f/MHz) + k2·(f/MHz) dB/m.

use num_complex::Complex64;
use std::f64::consts::PI;

/// Speed of light, m/s (SI definition).
pub const C0: f64 = 299_792_458.0;

/// A discontinuity along the line.
#[derive(Clone, Copy, Debug)]
pub struct Discontinuity {
    /// Distance from the input, m.
    pub distance: f64,
    /// Normalised shunt susceptance b (y = jb), frequency independent.
    pub b: f64,
}

impl Discontinuity {
    /// A connector whose own return loss is `rl_db`: |S11| = b/√(4 + b²) → b = 2ρ/√(1 − ρ²).
    pub fn with_return_loss(distance: f64, rl_db: f64) -> Self {
        let rho = 10f64.powf(-rl_db / 20.0);
        Self {
            distance,
            b: 2.0 * rho / (1.0 - rho * rho).sqrt(),
        }
    }

    /// The junction's own return loss, dB.
    pub fn return_loss(&self) -> f64 {
        let y = Complex64::new(0.0, self.b);
        -20.0 * (y / (2.0 + y)).norm().log10()
    }
}

/// The line: discontinuities in increasing distance, then the far end at `length` with
/// reflection `end_gamma` (1 for an open end).
#[derive(Clone, Debug)]
pub struct FaultyLine {
    /// Velocity factor.
    pub vf: f64,
    /// Conductor loss term, dB/m at 1 MHz.
    pub k1: f64,
    /// Dielectric loss term, dB/m per MHz.
    pub k2: f64,
    /// Discontinuities, increasing distance, all before `length`.
    pub faults: Vec<Discontinuity>,
    /// Length to the far end, m.
    pub length: f64,
    /// Reflection of the far end.
    pub end_gamma: Complex64,
}

impl FaultyLine {
    /// Attenuation at f, dB/m.
    pub fn alpha_db(&self, f: f64) -> f64 {
        let mhz = f * 1e-6;
        self.k1 * mhz.sqrt() + self.k2 * mhz
    }

    /// Γ at the input at frequency f.
    pub fn gamma(&self, f: f64) -> Complex64 {
        self.gamma_with_end(f, self.end_gamma)
    }

    /// Γ at the input at frequency f with the far end's reflection `end` at that frequency
    /// (for a frequency-dependent load such as an antenna).
    pub fn gamma_with_end(&self, f: f64, end: Complex64) -> Complex64 {
        let alpha = self.alpha_db(f) / (20.0 / std::f64::consts::LN_10);
        let beta = 2.0 * PI * f / (self.vf * C0);
        let gam = Complex64::new(alpha, beta);
        let mut g = end;
        let mut pos = self.length;
        for d in self.faults.iter().rev() {
            g *= (-2.0 * gam * (pos - d.distance)).exp();
            let y = Complex64::new(0.0, d.b);
            let s11 = -y / (2.0 + y);
            let s21 = 2.0 / (2.0 + y);
            g = s11 + s21 * s21 * g / (1.0 - s11 * g);
            pos = d.distance;
        }
        g * (-2.0 * gam * pos).exp()
    }
}
