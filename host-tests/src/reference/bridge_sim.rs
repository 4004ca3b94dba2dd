//! f64 model of the emulated analyzer's scenario, written apart from the firmware's own
//! simulation (boards/emu-analyzer/src/frontend.rs) and never calling feedline.
//!
//! It answers two questions for the QEMU-in-the-loop tests:
//! 1. the truth: load → cable → Γ at the analyzer port → ideal |Γ|, VSWR, return loss,
//!    mismatch loss, and the cable's matched loss;
//! 2. what a reading's raw codes mean: codes → volts → |Γ| by the detector law, and the range
//!    of |Γ| those codes allow once the ADC's worst-case error (rounding and bounded noise) is
//!    taken into account.
//!
//! Sources: ΓL = (ZL − Z0)/(ZL + Z0) and Γin = ΓL·e^(−2γl), γ = α + jβ, β = 2πf/(vf·c) — the
//! lossy-line input reflection of any transmission-line text; 1 Np = 20·log10(e) dB (common
//! practice); c = 299 792 458 m/s (SI definition); the detector laws (linear: V ∝ |a|,
//! square-law: V ∝ |a|², log: V = slope·(P − intercept)) and the ADC transfer
//! V = (code − offset)·Vref/2^bits as documented for the board. Complex arithmetic in f64 by
//! num-complex, the general-purpose reference library.

use super::scalar;
use num_complex::Complex64;

/// Speed of light in vacuum, m/s (SI definition).
pub const C0: f64 = 299_792_458.0;

/// Far-end termination.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Load {
    /// R + jX, Ω.
    Impedance(f64, f64),
    /// Open circuit.
    Open,
    /// Short circuit.
    Short,
}

/// Detector law with its constants.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Law {
    /// V ∝ amplitude.
    Linear,
    /// V ∝ power.
    Square,
    /// V = slope · (P − intercept): slope V/dB.
    Log {
        /// V per dB.
        slope: f64,
    },
}

/// The parameters of one scenario (the firmware's `--name value` options).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Scenario {
    /// Reference impedance, Ω.
    pub z0: f64,
    /// Far-end load.
    pub load: Load,
    /// Cable length, m.
    pub cable_m: f64,
    /// Matched loss, dB/100 m.
    pub cable_db100: f64,
    /// Velocity factor.
    pub vf: f64,
    /// Frequency, MHz.
    pub freq_mhz: f64,
    /// Bridge directivity, dB.
    pub directivity: f64,
    /// Detector law.
    pub law: Law,
    /// ADC bits.
    pub adc_bits: u32,
    /// ADC reference, V.
    pub vref: f64,
    /// ADC offset, codes.
    pub offset: f64,
    /// ADC noise rms, LSB.
    pub noise: f64,
    /// Reads averaged.
    pub avg: u32,
    /// Detector floor given to the analyzer, LSB.
    pub floor_lsb: f64,
}

/// Ideal scalar quantities of a reflection.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Truth {
    /// |Γ|.
    pub gamma: f64,
    /// VSWR.
    pub vswr: f64,
    /// Return loss, positive dB.
    pub return_loss: f64,
    /// Mismatch loss, dB.
    pub mismatch_loss: f64,
}

impl Truth {
    /// All quantities from |Γ|.
    pub fn from_gamma(gamma: f64) -> Truth {
        Truth {
            gamma,
            vswr: scalar::vswr(gamma),
            return_loss: scalar::return_loss(gamma),
            mismatch_loss: scalar::mismatch_loss(gamma),
        }
    }
}

/// Γ of a load in a system of real impedance `z0`.
pub fn gamma_load(load: Load, z0: f64) -> Complex64 {
    match load {
        Load::Open => Complex64::new(1.0, 0.0),
        Load::Short => Complex64::new(-1.0, 0.0),
        Load::Impedance(r, x) => {
            let z = Complex64::new(r, x);
            (z - z0) / (z + z0)
        }
    }
}

impl Scenario {
    /// One-way matched loss of the cable, dB.
    pub fn cable_loss_db(&self) -> f64 {
        self.cable_db100 * self.cable_m / 100.0
    }

    /// Γ at the analyzer port for far-end `load`: ΓL·e^(−2(α + jβ)l).
    pub fn gamma_at_port_with(&self, load: Load) -> Complex64 {
        let alpha_l = self.cable_loss_db() / scalar::np_to_db(1.0); // Np
        let beta = 2.0 * std::f64::consts::PI * self.freq_mhz * 1e6 / (self.vf * C0);
        let gamma_l = Complex64::new(2.0 * alpha_l, 2.0 * beta * self.cable_m);
        gamma_load(load, self.z0) * (-gamma_l).exp()
    }

    /// The truth at the analyzer port for the scenario's own load.
    pub fn truth(&self) -> Truth {
        Truth::from_gamma(self.gamma_at_port_with(self.load).norm())
    }

    /// One LSB in volts.
    pub fn lsb(&self) -> f64 {
        self.vref / 2f64.powi(self.adc_bits as i32)
    }

    /// Volts for a (possibly fractional) code, 0 below the offset.
    pub fn volts(&self, code: f64) -> f64 {
        ((code - self.offset) * self.lsb()).max(0.0)
    }

    /// |Γ| from a forward and a reflected code by the detector law, with the analyzer's
    /// noise floor applied to the reflected channel; clamped to [0, 1].
    pub fn gamma_from_codes(&self, forward: f64, reflected: f64) -> f64 {
        let floor = self.floor_lsb * self.lsb();
        let f = self.volts(forward);
        let r = self.volts(reflected).max(floor);
        let law = match self.law {
            Law::Linear => scalar::Law::Linear,
            Law::Square => scalar::Law::SquareLaw,
            Law::Log { slope } => scalar::Law::Log(slope),
        };
        let rl = scalar::return_loss_from_outputs(law, f, r);
        scalar::gamma_from_return_loss(rl.max(0.0)).min(1.0)
    }

    /// Worst-case error of one averaged code, in LSB: each read is rounded (±0.5) and carries
    /// noise bounded by ±2·√3·rms (the sum of four uniform deviates scaled to that rms), and
    /// the mean is rounded again (±0.5).
    pub fn code_error_bound(&self) -> f64 {
        2.0 * 3f64.sqrt() * self.noise + 1.0
    }

    /// The range of |Γ| consistent with two averaged codes, given [`Self::code_error_bound`]:
    /// |Γ| rises with the reflected code and falls with the forward one.
    pub fn gamma_range_from_codes(&self, forward: f64, reflected: f64) -> (f64, f64) {
        let d = self.code_error_bound();
        (
            self.gamma_from_codes(forward + d, reflected - d),
            self.gamma_from_codes(forward - d, reflected + d),
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn base() -> Scenario {
        Scenario {
            z0: 50.0,
            load: Load::Impedance(100.0, 0.0),
            cable_m: 0.0,
            cable_db100: 0.0,
            vf: 0.66,
            freq_mhz: 10.0,
            directivity: 40.0,
            law: Law::Linear,
            adc_bits: 12,
            vref: 3.3,
            offset: 0.0,
            noise: 0.0,
            avg: 1,
            floor_lsb: 2.0,
        }
    }

    /// Textbook values: 100 Ω in 50 Ω gives |Γ| = 1/3 and VSWR 2 (resistive load VSWR =
    /// R/Z0); a matched line of 3 dB one-way loss with an open end returns RL = 6 dB
    /// (common practice: RL = 2 × matched loss).
    #[test]
    fn textbook_points() {
        let s = base();
        let t = s.truth();
        assert!((t.gamma - 1.0 / 3.0).abs() < 1e-12);
        assert!((t.vswr - 2.0).abs() < 1e-12);
        let open = Scenario {
            load: Load::Open,
            cable_m: 30.0,
            cable_db100: 10.0,
            ..s
        };
        assert!((open.truth().return_loss - 6.0).abs() < 1e-12);
    }

    /// A lossless quarter wave (βl = π/2) turns a short into an open: Γin = +1.
    #[test]
    fn quarter_wave_inverts() {
        let f = 100.0; // MHz
        let vf = 0.66;
        let quarter = vf * C0 / (f * 1e6) / 4.0;
        let s = Scenario {
            load: Load::Short,
            cable_m: quarter,
            freq_mhz: f,
            vf,
            ..base()
        };
        let g = s.gamma_at_port_with(Load::Short);
        assert!((g.re - 1.0).abs() < 1e-9 && g.im.abs() < 1e-9, "{g}");
    }

    /// Codes → |Γ|: 2000 / 200 on a linear detector is 0.1; square law √0.1; a log detector
    /// of 25 mV/dB with 500 mV between channels is 20 dB, |Γ| 0.1.
    #[test]
    fn codes_to_gamma() {
        let s = base();
        assert!((s.gamma_from_codes(2000.0, 200.0) - 0.1).abs() < 1e-12);
        let sq = Scenario {
            law: Law::Square,
            ..base()
        };
        assert!((sq.gamma_from_codes(2000.0, 200.0) - 0.1f64.sqrt()).abs() < 1e-12);
        let log = Scenario {
            law: Law::Log { slope: 0.025 },
            ..base()
        };
        let codes_per_volt = 4096.0 / 3.3;
        let g = log.gamma_from_codes(2000.0, 2000.0 - 0.5 * codes_per_volt);
        assert!((g - 0.1).abs() < 1e-12);
    }
}
