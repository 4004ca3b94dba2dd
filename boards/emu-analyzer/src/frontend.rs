//! The simulated analyzer front end: a load at the end of a lossy cable, a bridge with finite
//! directivity, a detector law, and an ADC with quantization and noise.
//!
//! This is a simulation of the hardware, not part of the core: it stands where a real board's
//! ADC driver stands and implements the same hardware-edge trait,
//! [`feedline::bridge::BridgeAdc`].
//!
//! Model (textbook transmission-line relations):
//! * load reflection `ΓL = (ZL − Z0) / (ZL + Z0)`; open = +1, short = −1;
//! * a cable of length `l`, matched loss `A` dB/100 m, velocity factor `vf`, at frequency `f`:
//!   `α = A / 100 / 8.686` Np/m, `β = 2π f / (vf · c)`, and at the analyzer
//!   `Γin = ΓL · e^(−2αl) · e^(−j2βl)`;
//! * the bridge's finite directivity D adds a leakage vector to the reflected wave:
//!   `Γm = Γin + 10^(−D/20) · e^(jφ)`, with φ the scenario's leakage phase;
//! * detector outputs: linear `Vr = Vf·|Γm|`, square-law `Vr = Vf·|Γm|²`, log
//!   `V = slope · (P − intercept)` with `Pr = Pf + 20·log10|Γm|` (clamped at 0 V);
//! * ADC: `code = round(V / Vref · 2^bits + offset + noise)`, clamped to `0 ..= 2^bits − 1`;
//!   the noise is zero-mean with the scenario's rms (in LSB), the sum of four uniform deviates
//!   (Irwin–Hall), so it never exceeds `2·√3·rms` — a hard bound the host tests use.
//!
//! The noise comes from a small xorshift32 generator seeded from the scenario, so a run is
//! repeatable. Panic policy: nothing here panics (float → integer conversions saturate).

use core::convert::Infallible;
use feedline::bridge::{BridgeAdc, RawPair};
use num_complex::Complex32;

/// Speed of light in vacuum, m/s (SI definition).
const C0: f32 = 299_792_458.0;
/// dB per neper, 20·log10(e).
const DB_PER_NP: f32 = 8.685_889;

/// What terminates the cable.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Load {
    /// An impedance R + jX in ohms.
    Impedance {
        /// Resistance, Ω.
        r: f32,
        /// Reactance, Ω.
        x: f32,
    },
    /// An open circuit.
    Open,
    /// A short circuit.
    Short,
}

impl Load {
    /// Reflection coefficient of the load in a system of real impedance `z0`.
    pub fn gamma(self, z0: f32) -> Complex32 {
        match self {
            Load::Open => Complex32::new(1.0, 0.0),
            Load::Short => Complex32::new(-1.0, 0.0),
            Load::Impedance { r, x } => {
                let z = Complex32::new(r, x);
                let den = z + z0;
                if den.norm_sqr() <= f32::MIN_POSITIVE {
                    Complex32::new(-1.0, 0.0)
                } else {
                    (z - z0) / den
                }
            }
        }
    }
}

/// A uniform lossy coaxial line.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cable {
    /// Length, m.
    pub length_m: f32,
    /// Matched loss, dB per 100 m, at the operating frequency.
    pub loss_db_per_100m: f32,
    /// Velocity factor (0, 1].
    pub velocity_factor: f32,
}

impl Cable {
    /// One-way matched loss of the whole length, dB.
    pub fn matched_loss_db(&self) -> f32 {
        self.loss_db_per_100m * self.length_m / 100.0
    }

    /// Reflection seen at the near end for a far-end reflection `gamma_load` at `freq_hz`.
    pub fn transform(&self, gamma_load: Complex32, freq_hz: f32) -> Complex32 {
        let two_alpha_l = 2.0 * self.matched_loss_db() / DB_PER_NP;
        let beta = 2.0 * core::f32::consts::PI * freq_hz / (self.velocity_factor * C0);
        // Keep 2βl within one turn before sin/cos (f32 keeps ~1e-4 rad at a few thousand rad).
        let phase = libm::fmodf(2.0 * beta * self.length_m, 2.0 * core::f32::consts::PI);
        gamma_load * Complex32::from_polar(libm::expf(-two_alpha_l), -phase)
    }
}

/// The detector law of both channels, with what it needs to produce volts.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Law {
    /// Output ∝ amplitude; the forward output is `level` × Vref.
    Linear {
        /// Forward output as a fraction of the ADC reference.
        level: f32,
    },
    /// Output ∝ power; the forward output is `level` × Vref.
    Square {
        /// Forward output as a fraction of the ADC reference.
        level: f32,
    },
    /// Output ∝ dB: `V = slope · (P − intercept)`.
    Log {
        /// V per dB.
        slope: f32,
        /// dBm at which the output would be 0 V.
        intercept_dbm: f32,
        /// Forward level at the detector, dBm.
        drive_dbm: f32,
    },
}

/// The ADC both channels go through.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AdcModel {
    /// Resolution, bits (8..=16, so a code fits the trait's u16).
    pub bits: u8,
    /// Full-scale reference, V.
    pub vref: f32,
    /// Code read with no input.
    pub offset: i32,
}

impl AdcModel {
    /// Top code, 2^bits − 1.
    pub fn top(&self) -> u32 {
        (1u32 << self.bits.clamp(1, 16)) - 1
    }

    /// The ideal (unrounded) code for `volts`.
    pub fn ideal_code(&self, volts: f32) -> f32 {
        volts / self.vref * (1u32 << self.bits.clamp(1, 16)) as f32 + self.offset as f32
    }

    /// Rounds and clamps an ideal code into the converter's range.
    pub fn quantize(&self, code: f32) -> u16 {
        let c = libm::roundf(code).clamp(0.0, self.top() as f32);
        c as u16 // saturating float → int conversion, in range by the clamp
    }
}

/// Deterministic noise source: xorshift32 (Marsaglia 2003), four uniforms summed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Noise {
    state: u32,
}

impl Noise {
    /// A generator from a scenario seed (any value; 0 is remapped).
    pub fn new(seed: u32) -> Self {
        let s = seed.wrapping_mul(0x9E37_79B9) ^ 0x6D2B_79F5;
        Noise {
            state: if s == 0 { 1 } else { s },
        }
    }

    fn next_u32(&mut self) -> u32 {
        let mut x = self.state;
        x ^= x << 13;
        x ^= x >> 17;
        x ^= x << 5;
        self.state = x;
        x
    }

    /// A uniform deviate in [−0.5, 0.5).
    fn uniform(&mut self) -> f32 {
        (self.next_u32() >> 8) as f32 / 16_777_216.0 - 0.5
    }

    /// A zero-mean deviate of rms `rms`, bounded by ±2·√3·rms.
    pub fn sample(&mut self, rms: f32) -> f32 {
        let s = self.uniform() + self.uniform() + self.uniform() + self.uniform();
        s * rms * libm::sqrtf(3.0)
    }
}

/// Everything the simulation needs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FrontEndConfig {
    /// Reference impedance, Ω.
    pub z0: f32,
    /// The far-end termination.
    pub load: Load,
    /// The feed line.
    pub cable: Cable,
    /// Operating frequency, Hz.
    pub freq_hz: f32,
    /// Bridge directivity, dB.
    pub directivity_db: f32,
    /// Phase of the leakage vector, degrees.
    pub leak_phase_deg: f32,
    /// Detector law.
    pub law: Law,
    /// Converter.
    pub adc: AdcModel,
    /// Noise rms, LSB.
    pub noise_lsb: f32,
    /// Noise seed.
    pub seed: u32,
}

/// The simulated bridge + detectors + ADC, read through [`BridgeAdc`].
#[derive(Clone, Copy, Debug)]
pub struct SimFrontEnd {
    config: FrontEndConfig,
    /// Ideal (noise-free, unrounded) codes of the two channels.
    ideal: (f32, f32),
    noise: Noise,
}

impl SimFrontEnd {
    /// Builds the simulation and works out the two channels' ideal codes.
    pub fn new(config: FrontEndConfig) -> Self {
        let gm = Self::gamma_measured(&config);
        let mag = gm.norm();
        let vref = config.adc.vref;
        let (vf, vr) = match config.law {
            Law::Linear { level } => (level * vref, level * vref * mag),
            Law::Square { level } => (level * vref, level * vref * mag * mag),
            Law::Log {
                slope,
                intercept_dbm,
                drive_dbm,
            } => {
                let pr = drive_dbm + 20.0 * libm::log10f(mag.max(1e-12));
                (
                    (slope * (drive_dbm - intercept_dbm)).max(0.0),
                    (slope * (pr - intercept_dbm)).max(0.0),
                )
            }
        };
        SimFrontEnd {
            config,
            ideal: (config.adc.ideal_code(vf), config.adc.ideal_code(vr)),
            noise: Noise::new(config.seed),
        }
    }

    /// Γ at the analyzer port, before the bridge: load seen through the cable.
    pub fn gamma_at_port(config: &FrontEndConfig) -> Complex32 {
        config
            .cable
            .transform(config.load.gamma(config.z0), config.freq_hz)
    }

    /// What the bridge's reflected arm sees: Γ at the port plus the leakage vector.
    pub fn gamma_measured(config: &FrontEndConfig) -> Complex32 {
        let leak = libm::powf(10.0, -config.directivity_db / 20.0);
        let phi = config.leak_phase_deg.to_radians();
        Self::gamma_at_port(config) + Complex32::from_polar(leak, phi)
    }
}

impl BridgeAdc for SimFrontEnd {
    type Error = Infallible;

    fn read_pair(&mut self) -> Result<RawPair, Infallible> {
        let rms = self.config.noise_lsb;
        let f = self.ideal.0 + self.noise.sample(rms);
        let r = self.ideal.1 + self.noise.sample(rms);
        Ok(RawPair {
            forward: self.config.adc.quantize(f),
            reflected: self.config.adc.quantize(r),
        })
    }
}
