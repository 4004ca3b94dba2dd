//! f64 model of the emulated analyzer's cable datasheets, vector bridge and sweep scenario,
//! written apart from the firmware's simulation (boards/emu-analyzer/src/vector_sim.rs,
//! cable_types.rs) and never calling feedline.
//!
//! * the invented cable datasheets, restated, and their loss fit α(f) = k1·√f + k2·f by the
//!   f64 normal equations of [`super::line::fit_loss`];
//! * the one-port three-term error model Γm = e00 + e10e01·Γ/(1 − e11·Γ) (Agilent Application
//!   Note 1287-3; Pozar, *Microwave Engineering*), with each term turning with frequency as a
//!   fixed delay: e(f) = |e|·e^(j(φ − 2π(f − 100 MHz)τ));
//! * the kit: open, short by [`super::calibration::open_gamma`] / `short_gamma`, load Γ fixed;
//! * the sweep device: a series-RLC antenna ([`super::series_rlc::SeriesRlc`]) behind the
//!   cable with a shunt-susceptance connector ([`super::line_faults::FaultyLine`]).
//!
//! Complex arithmetic by num-complex (f64), the general-purpose reference library.

use super::calibration::{open_gamma, short_gamma, Terms};
use super::line::fit_loss;
use super::line_faults::{Discontinuity, FaultyLine};
use super::series_rlc::SeriesRlc;
use num_complex::Complex64;
use std::f64::consts::PI;

/// An invented cable datasheet: (name, velocity factor, [(MHz, dB/100 m)]).
pub type CableSheet = (&'static str, f64, [(f64, f64); 5]);

/// The emulated analyzer's named cables (the same invented datasheets).
pub const CABLES: [CableSheet; 2] = [
    (
        "pe-5mm",
        0.66,
        [
            (10.0, 3.9),
            (50.0, 9.0),
            (145.0, 15.8),
            (435.0, 28.5),
            (1296.0, 52.0),
        ],
    ),
    (
        "foam-10mm",
        0.85,
        [
            (10.0, 1.3),
            (50.0, 3.0),
            (145.0, 5.2),
            (435.0, 9.4),
            (1296.0, 17.5),
        ],
    ),
];

/// The named cable's datasheet.
pub fn cable(name: &str) -> Option<&'static CableSheet> {
    CABLES.iter().find(|c| c.0 == name)
}

/// (k1, k2) in dB/m per √MHz and per MHz of a named cable, fitted in f64.
pub fn cable_fit(name: &str) -> Option<(f64, f64)> {
    let c = cable(name)?;
    let pts: Vec<(f64, f64)> = c.2.iter().map(|&(f, db)| (f, db / 100.0)).collect();
    Some(fit_loss(&pts))
}

/// Loss in dB/m at `f_mhz` of a (k1, k2) fit.
pub fn alpha_db_per_m((k1, k2): (f64, f64), f_mhz: f64) -> f64 {
    k1 * f_mhz.sqrt() + k2 * f_mhz
}

/// The vector bridge: terms at 100 MHz (magnitude, degrees) and their delays.
#[derive(Clone, Copy, Debug)]
pub struct Bridge {
    /// e00 magnitude and phase, degrees.
    pub e00: (f64, f64),
    /// e11 magnitude and phase, degrees.
    pub e11: (f64, f64),
    /// e10e01 magnitude and phase, degrees.
    pub track: (f64, f64),
}

/// Delays of the three terms, s (the firmware's documented invented values).
pub const TERM_DELAYS: [f64; 3] = [0.6e-9, 0.3e-9, 1.5e-9];

impl Bridge {
    /// The true terms at `f` Hz.
    pub fn terms(&self, f: f64) -> Terms {
        let t = |(m, d): (f64, f64), tau: f64| {
            Complex64::from_polar(m, d.to_radians() - 2.0 * PI * (f - 100.0e6) * tau)
        };
        Terms {
            e00: t(self.e00, TERM_DELAYS[0]),
            e11: t(self.e11, TERM_DELAYS[1]),
            tracking: t(self.track, TERM_DELAYS[2]),
        }
    }
}

/// The kit (invented, as the firmware documents it): open C0..C3 and delay, short L0..L3 and
/// delay, load Γ.
pub const KIT_OPEN: ([f64; 4], f64) = ([12.0, 150.0, -20.0, 5.0], 25.0e-12);
/// The kit's short.
pub const KIT_SHORT: ([f64; 4], f64) = ([4.0, 60.0, 0.0, 0.0], 22.0e-12);
/// The kit's load.
pub const KIT_LOAD: Complex64 = Complex64::new(0.008, 0.004);

/// Γ of the three standards at `f` in `z0`.
pub fn standards(f: f64, z0: f64) -> [Complex64; 3] {
    [
        open_gamma(KIT_OPEN.0, KIT_OPEN.1, f, z0),
        short_gamma(KIT_SHORT.0, KIT_SHORT.1, f, z0),
        KIT_LOAD,
    ]
}

/// A lossy line (k1, k2 fit, velocity factor) as [`FaultyLine`] without faults.
pub fn plain_line(fit: (f64, f64), vf: f64, length: f64, end: Complex64) -> FaultyLine {
    FaultyLine {
        vf,
        k1: fit.0,
        k2: fit.1,
        faults: Vec::new(),
        length,
        end_gamma: end,
    }
}

/// The sweep scenario in f64.
#[derive(Clone, Copy, Debug)]
pub struct SweepScenario {
    /// Reference impedance, Ω.
    pub z0: f64,
    /// Cable loss fit (k1, k2).
    pub fit: (f64, f64),
    /// Velocity factor.
    pub vf: f64,
    /// Cable length, m.
    pub cable_m: f64,
    /// Antenna.
    pub antenna: SeriesRlc,
    /// Fault distance and return loss, if inside the cable.
    pub fault: Option<(f64, f64)>,
}

impl SweepScenario {
    /// Γ at the analyzer port at `f` Hz.
    pub fn gamma(&self, f: f64) -> Complex64 {
        let mut line = plain_line(
            self.fit,
            self.vf,
            self.cable_m,
            self.antenna.gamma(f, self.z0),
        );
        if let Some((d, rl)) = self.fault {
            line.faults.push(Discontinuity::with_return_loss(d, rl));
        }
        line.gamma(f)
    }

    /// The antenna's Γ from the port Γ, de-embedding the plain cable (no fault known):
    /// Γ·e^(+2γℓ).
    pub fn deembedded(&self, f: f64, g_port: Complex64) -> Complex64 {
        let alpha = alpha_db_per_m(self.fit, f * 1e-6) / (20.0 / std::f64::consts::LN_10);
        let beta = 2.0 * PI * f / (self.vf * super::line_faults::C0);
        g_port * (2.0 * Complex64::new(alpha, beta) * self.cable_m).exp()
    }
}

/// VSWR of Γ.
pub fn vswr(g: Complex64) -> f64 {
    let m = g.norm();
    (1.0 + m) / (1.0 - m)
}

/// Z of Γ in `z0`.
pub fn impedance(g: Complex64, z0: f64) -> Complex64 {
    z0 * (1.0 + g) / (1.0 - g)
}

/// A root of `h` in [a, b] by bisection (h(a), h(b) of opposite sign), to `tol`.
pub fn bisect(mut a: f64, mut b: f64, tol: f64, h: impl Fn(f64) -> f64) -> f64 {
    let mut ha = h(a);
    while b - a > tol {
        let m = 0.5 * (a + b);
        let hm = h(m);
        if (hm < 0.0) == (ha < 0.0) {
            a = m;
            ha = hm;
        } else {
            b = m;
        }
    }
    0.5 * (a + b)
}
