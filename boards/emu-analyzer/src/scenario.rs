//! Scenarios: named, invented set-ups of load, cable, bridge, detector and ADC, and the
//! command-line overrides that let a test run cases the firmware was not built around.
//!
//! Each option is `--name value`; see the crate README for the full list. A scenario starts
//! from its named preset (`--scenario NAME`, default [`DEFAULT`]) and every other option
//! overrides one field. Unknown options, stray words and unparsable values are refused.

use crate::cable_types::{self, CableType};
use crate::frontend::{AdcModel, Cable, FrontEndConfig, Law, Load};
use emu_support::args::{options, Item};

/// The preset used when no `--scenario` is given.
pub const DEFAULT: &str = "mast-vertical";

/// Which detector law, before its numbers are attached.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LawKind {
    /// Amplitude-proportional.
    Linear,
    /// Power-proportional.
    Square,
    /// dB-linear.
    Log,
}

impl LawKind {
    /// The option value naming this law.
    pub fn name(self) -> &'static str {
        match self {
            LawKind::Linear => "linear",
            LawKind::Square => "square",
            LawKind::Log => "log",
        }
    }
}

/// All parameters of one run.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Scenario {
    /// Preset name.
    pub name: &'static str,
    /// One-line description of the preset.
    pub title: &'static str,
    /// Reference impedance, Ω.
    pub z0: f32,
    /// Far-end load.
    pub load: Load,
    /// Cable length, m.
    pub cable_m: f32,
    /// Matched loss, dB per 100 m.
    pub cable_db100: f32,
    /// Velocity factor.
    pub vf: f32,
    /// Frequency, MHz.
    pub freq_mhz: f32,
    /// Bridge directivity, dB.
    pub directivity: f32,
    /// Leakage phase, degrees.
    pub leak_phase: f32,
    /// Detector law.
    pub law: LawKind,
    /// Forward detector output as a fraction of Vref (linear, square).
    pub level: f32,
    /// Forward level at a log detector, dBm.
    pub drive_dbm: f32,
    /// Log detector slope, V/dB.
    pub log_slope: f32,
    /// Log detector intercept, dBm.
    pub log_intercept: f32,
    /// ADC bits.
    pub adc_bits: u8,
    /// ADC reference, V.
    pub vref: f32,
    /// ADC offset, codes.
    pub offset: i32,
    /// Noise rms, LSB.
    pub noise: f32,
    /// Reads averaged per reading (1, 4, 16 or 64).
    pub avg: u16,
    /// Noise seed.
    pub seed: u32,
    /// Detector noise floor given to the core, in LSB.
    pub floor_lsb: f32,
    /// A named cable (its datasheet model sets the loss at every frequency), or `None` for
    /// the flat `cable_db100` at the scenario frequency.
    pub cable_type: Option<&'static CableType>,
    /// Which report sections run (bits of [`Section`]).
    pub sections: u8,
    /// Vector bridge directivity term e00: magnitude and phase (degrees) at 100 MHz.
    pub e00: (f32, f32),
    /// Vector bridge source-match term e11: magnitude and phase (degrees) at 100 MHz.
    pub e11: (f32, f32),
    /// Vector bridge reflection tracking e10e01: magnitude and phase (degrees) at 100 MHz.
    pub track: (f32, f32),
    /// Sweep start, MHz.
    pub sweep_start_mhz: f32,
    /// Sweep stop, MHz.
    pub sweep_stop_mhz: f32,
    /// Sweep points.
    pub points: u16,
    /// Sweep antenna (series RLC): resonance, MHz.
    pub ant_f0_mhz: f32,
    /// Sweep antenna: Q.
    pub ant_q: f32,
    /// Sweep antenna: resistance at resonance, Ω.
    pub ant_r: f32,
    /// Distance of the connector fault from the analyzer, m (none if not inside the cable).
    pub fault_m: f32,
    /// Return loss of the connector fault, dB.
    pub fault_rl: f32,
}

/// The report sections, as bits of [`Scenario::sections`].
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Section {
    /// `[reading]`: the scalar reading of the load.
    Reading = 1,
    /// `[cable check ...]`: open and short at the far end.
    Cable = 2,
    /// `[line model ...]`: the cable described by the core's line models.
    Line = 4,
    /// `[calibration ...]`: vector open/short/load calibration, stored and reloaded.
    Cal = 8,
    /// `[sweep ...]`, `[touchstone ...]`, `[distance to fault]`.
    Sweep = 16,
}

/// Every section, in report order, with its option name.
pub const SECTIONS: [(Section, &str); 5] = [
    (Section::Reading, "reading"),
    (Section::Cable, "cable"),
    (Section::Line, "line"),
    (Section::Cal, "cal"),
    (Section::Sweep, "sweep"),
];

/// The sweep's largest point count.
pub const MAX_POINTS: u16 = 256;

const fn preset(name: &'static str, title: &'static str) -> Scenario {
    Scenario {
        name,
        title,
        z0: 50.0,
        load: Load::Impedance { r: 50.0, x: 0.0 },
        cable_m: 10.0,
        cable_db100: 5.0,
        vf: 0.66,
        freq_mhz: 50.0,
        directivity: 30.0,
        leak_phase: 0.0,
        law: LawKind::Linear,
        level: 0.75,
        drive_dbm: -10.0,
        log_slope: 0.025,
        log_intercept: -84.0,
        adc_bits: 12,
        vref: 3.3,
        offset: 0,
        noise: 0.5,
        avg: 16,
        seed: 1,
        floor_lsb: 2.0,
        cable_type: None,
        sections: 0x1F,
        e00: (0.12, 35.0),
        e11: (0.18, -120.0),
        track: (0.82, -40.0),
        sweep_start_mhz: 120.0,
        sweep_stop_mhz: 170.0,
        points: 101,
        ant_f0_mhz: 145.5,
        ant_q: 9.0,
        ant_r: 44.0,
        fault_m: 6.0,
        fault_rl: 24.0,
    }
}

/// The named presets (all invented for the demo).
pub const PRESETS: [Scenario; 6] = [
    Scenario {
        load: Load::Impedance { r: 38.0, x: -9.0 },
        cable_m: 15.0,
        cable_db100: 9.5,
        cable_type: Some(&cable_types::CABLES[0]),
        freq_mhz: 145.0,
        directivity: 32.0,
        leak_phase: 70.0,
        offset: 3,
        noise: 0.6,
        ..preset(
            "mast-vertical",
            "a 2 m band vertical at the end of 15 m of coax",
        )
    },
    Scenario {
        load: Load::Impedance { r: 68.0, x: 22.0 },
        cable_m: 28.0,
        cable_db100: 1.9,
        vf: 0.82,
        freq_mhz: 14.1,
        directivity: 35.0,
        leak_phase: -120.0,
        law: LawKind::Square,
        level: 0.6,
        noise: 0.4,
        seed: 11,
        ..preset(
            "attic-dipole",
            "a wire dipole in the attic, 28 m of low-loss feed",
        )
    },
    Scenario {
        load: Load::Impedance { r: 50.5, x: 0.8 },
        cable_m: 2.0,
        cable_db100: 22.0,
        freq_mhz: 435.0,
        directivity: 30.0,
        leak_phase: 10.0,
        adc_bits: 16,
        noise: 3.0,
        seed: 5,
        floor_lsb: 8.0,
        ..preset(
            "bench-termination",
            "a good 50 ohm termination on a short jumper: below what the bridge can resolve",
        )
    },
    Scenario {
        load: Load::Impedance { r: 12.0, x: 30.0 },
        cable_m: 60.0,
        cable_db100: 30.0,
        freq_mhz: 430.0,
        directivity: 28.0,
        leak_phase: 200.0,
        law: LawKind::Log,
        drive_dbm: -5.0,
        noise: 1.0,
        seed: 23,
        ..preset(
            "long-thin-run",
            "a badly matched antenna behind 60 m of thin, lossy cable, log detector",
        )
    },
    Scenario {
        load: Load::Open,
        cable_m: 40.0,
        cable_db100: 4.5,
        vf: 0.78,
        freq_mhz: 50.0,
        directivity: 36.0,
        leak_phase: 45.0,
        seed: 3,
        ..preset(
            "open-spool",
            "a 40 m spool of coax with nothing on the far end",
        )
    },
    Scenario {
        load: Load::Impedance { r: 150.0, x: -60.0 },
        level: 1.02,
        seed: 9,
        ..preset(
            "hot-input",
            "the forward detector driven past the ADC's full scale",
        )
    },
];

/// Why the command line was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ArgError<'a> {
    /// `--scenario` names no preset.
    UnknownScenario(&'a str),
    /// An option this firmware does not know.
    UnknownOption(&'a str),
    /// An option without its value.
    MissingValue(&'a str),
    /// A value that does not parse or is out of range for its option.
    BadValue(&'a str, &'a str),
    /// A word that is not an option.
    Stray(&'a str),
}

fn num(v: &str, lo: f32, hi: f32) -> Result<f32, ()> {
    match v.parse::<f32>() {
        Ok(x) if x.is_finite() && x >= lo && x <= hi => Ok(x),
        _ => Err(()),
    }
}

impl Scenario {
    /// The preset called `name`.
    pub fn preset(name: &str) -> Option<Scenario> {
        PRESETS.iter().find(|s| s.name == name).copied()
    }

    /// Parses a command line (program name first): the preset, then the overrides.
    pub fn from_cmdline(line: &str) -> Result<Scenario, ArgError<'_>> {
        let mut name = DEFAULT;
        for item in options(line) {
            if let Item::Opt(o) = item {
                if o.name == "scenario" {
                    name = o.value.ok_or(ArgError::MissingValue("scenario"))?;
                }
            }
        }
        let mut s = Scenario::preset(name).ok_or(ArgError::UnknownScenario(name))?;
        for item in options(line) {
            let o = match item {
                Item::Opt(o) => o,
                Item::Stray(w) => return Err(ArgError::Stray(w)),
            };
            if o.name == "scenario" {
                continue;
            }
            let v = o.value.ok_or(ArgError::MissingValue(o.name))?;
            s.set(o.name, v)?;
        }
        Ok(s)
    }

    /// Sets one option.
    fn set<'a>(&mut self, name: &'a str, v: &'a str) -> Result<(), ArgError<'a>> {
        let bad = |_| ArgError::BadValue(name, v);
        let (r, x) = match self.load {
            Load::Impedance { r, x } => (r, x),
            _ => (50.0, 0.0),
        };
        match name {
            "z0" => self.z0 = num(v, 1.0, 1e4).map_err(bad)?,
            "load" => {
                self.load = match v {
                    "open" => Load::Open,
                    "short" => Load::Short,
                    "match" => Load::Impedance { r: self.z0, x: 0.0 },
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "load-r" => {
                let r = num(v, 0.0, 1e6).map_err(bad)?;
                self.load = Load::Impedance { r, x };
            }
            "load-x" => {
                let x = num(v, -1e6, 1e6).map_err(bad)?;
                self.load = Load::Impedance { r, x };
            }
            "cable-m" => self.cable_m = num(v, 0.0, 10_000.0).map_err(bad)?,
            "cable-db100" => {
                self.cable_db100 = num(v, 0.0, 200.0).map_err(bad)?;
                self.cable_type = None;
            }
            "cable" => {
                let c = CableType::named(v).ok_or(ArgError::BadValue(name, v))?;
                self.cable_type = Some(c);
                self.vf = c.vf;
            }
            "sections" => {
                let mut bits = 0u8;
                for word in v.split('+') {
                    let (sec, _) = SECTIONS
                        .iter()
                        .find(|(_, n)| *n == word)
                        .ok_or(ArgError::BadValue(name, v))?;
                    bits |= *sec as u8;
                }
                self.sections = bits;
            }
            "e00-mag" => self.e00.0 = num(v, 0.0, 0.5).map_err(bad)?,
            "e00-deg" => self.e00.1 = num(v, -360.0, 360.0).map_err(bad)?,
            "e11-mag" => self.e11.0 = num(v, 0.0, 0.5).map_err(bad)?,
            "e11-deg" => self.e11.1 = num(v, -360.0, 360.0).map_err(bad)?,
            "track-mag" => self.track.0 = num(v, 0.1, 1.0).map_err(bad)?,
            "track-deg" => self.track.1 = num(v, -360.0, 360.0).map_err(bad)?,
            "sweep-start-mhz" => self.sweep_start_mhz = num(v, 0.1, 10_000.0).map_err(bad)?,
            "sweep-stop-mhz" => self.sweep_stop_mhz = num(v, 0.1, 10_000.0).map_err(bad)?,
            "points" => {
                self.points = match v.parse::<u16>() {
                    Ok(n) if (16..=MAX_POINTS).contains(&n) => n,
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "ant-f0-mhz" => self.ant_f0_mhz = num(v, 0.1, 10_000.0).map_err(bad)?,
            "ant-q" => self.ant_q = num(v, 0.5, 500.0).map_err(bad)?,
            "ant-r" => self.ant_r = num(v, 1.0, 1000.0).map_err(bad)?,
            "fault-m" => self.fault_m = num(v, 0.0, 10_000.0).map_err(bad)?,
            "fault-rl" => self.fault_rl = num(v, 3.0, 60.0).map_err(bad)?,
            "vf" => self.vf = num(v, 0.05, 1.0).map_err(bad)?,
            "freq-mhz" => self.freq_mhz = num(v, 0.001, 100_000.0).map_err(bad)?,
            "directivity" => self.directivity = num(v, 0.0, 80.0).map_err(bad)?,
            "leak-phase" => self.leak_phase = num(v, -3600.0, 3600.0).map_err(bad)?,
            "law" => {
                self.law = match v {
                    "linear" => LawKind::Linear,
                    "square" => LawKind::Square,
                    "log" => LawKind::Log,
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "level" => self.level = num(v, 0.0, 2.0).map_err(bad)?,
            "drive-dbm" => self.drive_dbm = num(v, -100.0, 30.0).map_err(bad)?,
            "log-slope" => self.log_slope = num(v, 0.001, 0.2).map_err(bad)?,
            "log-intercept" => self.log_intercept = num(v, -150.0, 0.0).map_err(bad)?,
            "adc-bits" => {
                self.adc_bits = match v.parse::<u8>() {
                    Ok(b) if (8..=16).contains(&b) => b,
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "vref" => self.vref = num(v, 0.1, 10.0).map_err(bad)?,
            "offset" => {
                self.offset = match v.parse::<i32>() {
                    Ok(o) if (-1000..=1000).contains(&o) => o,
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "noise" => self.noise = num(v, 0.0, 1000.0).map_err(bad)?,
            "avg" => {
                self.avg = match v.parse::<u16>() {
                    Ok(n @ (1 | 4 | 16 | 64)) => n,
                    _ => return Err(ArgError::BadValue(name, v)),
                }
            }
            "seed" => self.seed = v.parse::<u32>().map_err(|_| ArgError::BadValue(name, v))?,
            "floor-lsb" => self.floor_lsb = num(v, 0.5, 10_000.0).map_err(bad)?,
            _ => return Err(ArgError::UnknownOption(name)),
        }
        Ok(())
    }

    /// True when section `sec` is selected.
    pub fn has(&self, sec: Section) -> bool {
        self.sections & sec as u8 != 0
    }

    /// The cable's loss model (named datasheet fit, or the flat loss at the scenario
    /// frequency as pure conductor loss).
    pub fn loss_model(&self) -> Option<feedline::line::LossModel> {
        cable_types::loss_model(self.cable_type, self.cable_db100, self.freq_mhz)
    }

    /// The cable's matched loss at the scenario frequency, dB per 100 m, from its model.
    pub fn loss_db100(&self) -> f32 {
        match self.cable_type {
            None => self.cable_db100,
            Some(_) => self
                .loss_model()
                .and_then(|m| {
                    m.attenuation::<feedline::units::Meters>(feedline::units::Hertz::new(
                        self.freq_mhz * 1.0e6,
                    ))
                    .ok()
                })
                .map_or(self.cable_db100, |a| a.value() * 100.0),
        }
    }

    /// The simulation's configuration.
    pub fn front_end(&self) -> FrontEndConfig {
        self.front_end_with(self.load)
    }

    /// The same set-up with another far-end load (for the cable check).
    pub fn front_end_with(&self, load: Load) -> FrontEndConfig {
        FrontEndConfig {
            z0: self.z0,
            load,
            cable: Cable {
                length_m: self.cable_m,
                loss_db_per_100m: self.loss_db100(),
                velocity_factor: self.vf,
            },
            freq_hz: self.freq_mhz * 1.0e6,
            directivity_db: self.directivity,
            leak_phase_deg: self.leak_phase,
            law: match self.law {
                LawKind::Linear => Law::Linear { level: self.level },
                LawKind::Square => Law::Square { level: self.level },
                LawKind::Log => Law::Log {
                    slope: self.log_slope,
                    intercept_dbm: self.log_intercept,
                    drive_dbm: self.drive_dbm,
                },
            },
            adc: AdcModel {
                bits: self.adc_bits,
                vref: self.vref,
                offset: self.offset,
            },
            noise_lsb: self.noise,
            seed: self.seed,
        }
    }
}
