//! Series-RLC antenna model in f64 (textbook circuit theory): Z = R + j(ωL − 1/(ωC)).
//!
//! f0 = 1/(2π√(LC)), Q = √(L/C)/R (unloaded Q of a series RLC, e.g. any circuit-theory text).
//! Exact VSWR band edges, matched at resonance to Z0 = R: VSWR = S where |X| = R(S − 1)/√S,
//! so ω± = (±X_S + √(X_S² + 4L/C))/(2L) and BW = X_S/(2πL) = (S − 1)/(Q√S)·f0 exactly, the
//! relation of Yaghjian and Best (IEEE Trans. Antennas Propag. 53(4), 2005; recalled from
//! memory), here derived directly for the series RLC.

use num_complex::Complex64;
use std::f64::consts::PI;

/// A series R, L, C load.
#[derive(Clone, Copy, Debug)]
pub struct SeriesRlc {
    /// Resistance, Ω.
    pub r: f64,
    /// Inductance, H.
    pub l: f64,
    /// Capacitance, F.
    pub c: f64,
}

impl SeriesRlc {
    /// The load resonant at `f0` with Q `q` and resistance `r`: L = Q·R/ω0, C = 1/(ω0²L).
    pub fn from_f0_q(f0: f64, q: f64, r: f64) -> Self {
        let w0 = 2.0 * PI * f0;
        let l = q * r / w0;
        Self {
            r,
            l,
            c: 1.0 / (w0 * w0 * l),
        }
    }

    /// Z at frequency f.
    pub fn impedance(&self, f: f64) -> Complex64 {
        let w = 2.0 * PI * f;
        Complex64::new(self.r, w * self.l - 1.0 / (w * self.c))
    }

    /// Γ = (Z − Z0)/(Z + Z0).
    pub fn gamma(&self, f: f64, z0: f64) -> Complex64 {
        let z = self.impedance(f);
        (z - z0) / (z + z0)
    }

    /// f0 = 1/(2π√(LC)).
    pub fn f0(&self) -> f64 {
        1.0 / (2.0 * PI * (self.l * self.c).sqrt())
    }

    /// Q = √(L/C)/R.
    pub fn q(&self) -> f64 {
        (self.l / self.c).sqrt() / self.r
    }

    /// Exact (lower, upper) frequencies where VSWR = s for Z0 = R.
    pub fn vswr_edges(&self, s: f64) -> (f64, f64) {
        let xs = self.r * (s - 1.0) / s.sqrt();
        let root = (xs * xs + 4.0 * self.l / self.c).sqrt();
        let wp = (xs + root) / (2.0 * self.l);
        let wm = (-xs + root) / (2.0 * self.l);
        (wm / (2.0 * PI), wp / (2.0 * PI))
    }

    /// The published relation BW = (S − 1)/(Q·√S)·f0.
    pub fn published_bandwidth(&self, s: f64) -> f64 {
        (s - 1.0) / (self.q() * s.sqrt()) * self.f0()
    }
}

/// VSWR of a complex Γ.
pub fn vswr(g: Complex64) -> f64 {
    let m = g.norm();
    (1.0 + m) / (1.0 - m)
}
