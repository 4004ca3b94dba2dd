//! The simulated vector front end: a bridge with complex error terms (directivity e00,
//! source match e11, reflection tracking e10e01) ahead of an I/Q detector, the calibration
//! kit's standards, and the devices the vector sections measure (the scenario load behind the
//! cable; an antenna behind a cable with a connector fault).
//!
//! This is a simulation of the hardware, not part of the core. Model (textbook one-port
//! error model and transmission-line relations, restated here in f32):
//! * each error term is its magnitude and phase at 100 MHz, turning with frequency as a fixed
//!   delay would: e(f) = |e|·e^(j(φ − 2π·(f − 100 MHz)·τ)), τ = 0.6 ns (e00), 0.3 ns (e11),
//!   1.5 ns (e10e01) — invented values of a bridge with a short internal line;
//! * raw reading Γm = e00 + e10e01·Γ/(1 − e11·Γ);
//! * I/Q detector: each component through a 16-bit signed converter, code = round(16384·x +
//!   noise), clamped to ±32767 (full scale ±2), noise as the scalar front end's (bounded by
//!   2·√3·rms LSB); `avg` reads are averaged and rounded to a whole code;
//! * standards: open = fringing capacitance C(f) behind an offset delay, short = inductance
//!   behind an offset delay, load = a fixed small Γ (see [`KIT`]); Γ = (1 − jωCZ0)/(1 + jωCZ0)
//!   · e^(−j2ωτ) and (jωL − Z0)/(jωL + Z0) · e^(−j2ωτ);
//! * the cable's loss and phase come from the core's line model (`feedline::line::Line`) at
//!   each frequency; a connector fault is a shunt susceptance jb of the connector's own return
//!   loss, |S11| = b/√(4 + b²), S11 = −y/(2 + y), S21 = 2/(2 + y) (two-port S parameters of a
//!   shunt admittance, Pozar); the antenna is a series RLC, Z = R + j(ωL − 1/(ωC)).
//!
//! Panic policy: nothing here panics.

use crate::cable_types;
use crate::frontend::{Load, Noise};
use crate::scenario::Scenario;
use feedline::calibration::{LoadStandard, OpenStandard, ShortStandard, StandardsModel};
use feedline::line::Line;
use feedline::units::{Hertz, Meters, Ohms, Seconds};
use num_complex::Complex32;

const TAU: f32 = core::f32::consts::TAU;
/// Codes per unit of Γ (full scale ±2 over a 16-bit signed converter).
pub const IQ_SCALE: f32 = 16384.0;

/// Delays that turn the error terms with frequency, s.
const TERM_DELAYS: [f32; 3] = [0.6e-9, 0.3e-9, 1.5e-9];

/// The calibration kit: what the firmware knows of its standards (invented definitions),
/// against a reference impedance given at run time.
pub struct Kit {
    /// Open: C0 (fF), C1, C2, C3 (the core's scaling) and offset delay, s.
    pub open_c: [f32; 4],
    /// Open offset delay, s.
    pub open_delay: f32,
    /// Short: L0 (pH), L1, L2, L3.
    pub short_l: [f32; 4],
    /// Short offset delay, s.
    pub short_delay: f32,
    /// Load Γ.
    pub load: (f32, f32),
}

/// The invented kit.
pub const KIT: Kit = Kit {
    open_c: [12.0, 150.0, -20.0, 5.0],
    open_delay: 25.0e-12,
    short_l: [4.0, 60.0, 0.0, 0.0],
    short_delay: 22.0e-12,
    load: (0.008, 0.004),
};

impl Kit {
    /// The kit in the core's terms.
    pub fn model(&self, z0: f32) -> StandardsModel {
        StandardsModel {
            open: OpenStandard {
                capacitance: self.open_c,
                delay: Seconds::new(self.open_delay),
            },
            short: ShortStandard {
                inductance: self.short_l,
                delay: Seconds::new(self.short_delay),
            },
            load: LoadStandard {
                gamma: Complex32::new(self.load.0, self.load.1),
            },
            z0: Ohms::new(z0),
        }
    }
}

fn poly(p: &[f32; 4], f_ghz: f32) -> f32 {
    p[0] + 1.0e-3 * f_ghz * (p[1] + f_ghz * (p[2] + f_ghz * p[3]))
}

fn rotation(turns: f32) -> Complex32 {
    let frac = turns - libm::roundf(turns);
    Complex32::from_polar(1.0, TAU * frac)
}

/// Γ of the simulated open at `f` in `z0` (the kit's physics, computed here).
pub fn open_gamma(f: f32, z0: f32) -> Complex32 {
    let c = poly(&KIT.open_c, f * 1.0e-9) * 1.0e-15;
    let x = TAU * f * c * z0;
    let num = Complex32::new(1.0, -x);
    let den = Complex32::new(1.0, x);
    num / den * rotation(-2.0 * f * KIT.open_delay)
}

/// Γ of the simulated short at `f` in `z0`.
pub fn short_gamma(f: f32, z0: f32) -> Complex32 {
    let l = poly(&KIT.short_l, f * 1.0e-9) * 1.0e-12;
    let x = TAU * f * l;
    (Complex32::new(-z0, x) / Complex32::new(z0, x)) * rotation(-2.0 * f * KIT.short_delay)
}

/// Γ of the simulated load standard.
pub fn load_gamma() -> Complex32 {
    Complex32::new(KIT.load.0, KIT.load.1)
}

/// The bridge's true error terms at `f`: (e00, e11, e10e01).
pub fn terms_at(s: &Scenario, f: f32) -> [Complex32; 3] {
    let mut out = [Complex32::new(0.0, 0.0); 3];
    for ((o, (mag, deg)), tau) in out.iter_mut().zip([s.e00, s.e11, s.track]).zip(TERM_DELAYS) {
        let turns = deg / 360.0 - (f - 100.0e6) * tau;
        *o = rotation(turns) * mag;
    }
    out
}

/// The raw reading the bridge gives for a device of actual Γ `g` at `f`.
pub fn distort(s: &Scenario, f: f32, g: Complex32) -> Complex32 {
    let [e00, e11, t] = terms_at(s, f);
    let den = Complex32::new(1.0, 0.0) - e11 * g;
    if den.norm_sqr() < 1.0e-12 {
        return e00;
    }
    e00 + t * g / den
}

/// The I/Q detector: averaged codes for raw Γm, with noise from `noise`.
pub fn iq_codes(s: &Scenario, gm: Complex32, noise: &mut Noise) -> (i32, i32) {
    let n = i32::from(s.avg.max(1));
    let (mut si, mut sq) = (0i32, 0i32);
    let quant = |x: f32| libm::roundf(x).clamp(-32767.0, 32767.0) as i32;
    for _ in 0..n {
        si += quant(gm.re * IQ_SCALE + noise.sample(s.noise));
        sq += quant(gm.im * IQ_SCALE + noise.sample(s.noise));
    }
    let avg = |sum: i32| libm::roundf(sum as f32 / n as f32) as i32;
    (avg(si), avg(sq))
}

/// Γm from I/Q codes.
pub fn gamma_of_codes(i: i32, q: i32) -> Complex32 {
    Complex32::new(i as f32 / IQ_SCALE, q as f32 / IQ_SCALE)
}

/// The core's line for the scenario cable at `f`.
pub fn cable_line(s: &Scenario, f: f32) -> Option<Line> {
    let m = s.loss_model()?;
    cable_types::line_at(&m, Hertz::new(f), s.z0, s.vf)
}

/// Γ at the analyzer port of the scenario load behind the plain cable at `f`.
pub fn load_through_cable(s: &Scenario, load: Load, f: f32) -> Option<Complex32> {
    let line = cable_line(s, f)?;
    line.gamma_at_input(load.gamma(s.z0), Meters::new(s.cable_m))
        .ok()
}

/// Γ of the sweep antenna (series RLC) at `f`: resonant at `ant_f0_mhz` with Q `ant_q` and
/// resistance `ant_r`: L = Q·R/ω0, C = 1/(ω0²·L).
pub fn antenna_gamma(s: &Scenario, f: f32) -> Complex32 {
    let w0 = TAU * s.ant_f0_mhz * 1.0e6;
    let l = s.ant_q * s.ant_r / w0;
    let c = 1.0 / (w0 * w0 * l);
    let w = TAU * f;
    let z = Complex32::new(s.ant_r, w * l - 1.0 / (w * c));
    (z - s.z0) / (z + s.z0)
}

/// True when the scenario's connector fault lies inside the cable.
pub fn has_fault(s: &Scenario) -> bool {
    s.fault_m > 0.0 && s.fault_m < s.cable_m
}

/// The fault's normalised shunt susceptance from its return loss: b = 2ρ/√(1 − ρ²).
pub fn fault_susceptance(rl_db: f32) -> f32 {
    let rho = libm::powf(10.0, -rl_db / 20.0);
    2.0 * rho / libm::sqrtf(1.0 - rho * rho)
}

/// Γ at the analyzer port of the sweep antenna behind the cable with its connector fault.
pub fn antenna_through_faulty_cable(s: &Scenario, f: f32) -> Option<Complex32> {
    let line = cable_line(s, f)?;
    let g_ant = antenna_gamma(s, f);
    if !has_fault(s) {
        return line.gamma_at_input(g_ant, Meters::new(s.cable_m)).ok();
    }
    let behind = line
        .gamma_at_input(g_ant, Meters::new(s.cable_m - s.fault_m))
        .ok()?;
    let y = Complex32::new(0.0, fault_susceptance(s.fault_rl));
    let two = Complex32::new(2.0, 0.0);
    let s11 = -y / (two + y);
    let s21 = two / (two + y);
    let at_fault = s11 + s21 * s21 * behind / (Complex32::new(1.0, 0.0) - s11 * behind);
    line.gamma_at_input(at_fault, Meters::new(s.fault_m)).ok()
}
