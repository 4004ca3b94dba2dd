//! The simulated transmitter line and the scenarios that drive it, chosen and tuned from the
//! semihosting command line.
//!
//! Reading `s` (1-based) of a scenario:
//! - forward power = the last-listed `--power AT:MW` step with AT ≤ s (0 before the first), times 1000
//!   µW/mW; 0 while unkeyed (`--key ON:OFF`: keyed for the first ON of every ON+OFF readings)
//!   and, with `--feedback`, 0 while the protection pin is at "inhibit" (it starts there);
//! - |Γ|² (ppm) = the last-listed `--refl AT:PPM` step with AT ≤ s (0 before the first), raised to at
//!   least the spike level during spikes (`--spike START:EVERY:LEN:PPM`: from START, the first
//!   LEN of every EVERY readings);
//! - reflected power = ⌊forward · ppm / 10⁶⌋ µW.
//!
//! All scenarios here are invented for the demo.

use feedline::fixed::VswrQ16;
use feedline::monitor::{MonitorConfig, PowerReading};

/// Most steps of each kind a scenario holds.
pub const MAX_STEPS: usize = 8;

/// Why the command line was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ArgError {
    /// An option this firmware does not know.
    Unknown,
    /// An option's value is missing or malformed.
    Value,
    /// More than [`MAX_STEPS`] steps.
    TooMany,
}

/// Periodic reflection spikes (arcing, a loose connector).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Spike {
    /// First reading of the first spike.
    pub start: u32,
    /// Readings from one spike's start to the next (≥ 1).
    pub every: u32,
    /// Readings each spike lasts.
    pub len: u32,
    /// |Γ|² during a spike, ppm.
    pub ppm: u32,
}

/// A scenario: the simulated line plus the monitor's settings.
#[derive(Clone, Debug)]
pub struct Scenario {
    /// Its name (a preset's, possibly retuned).
    pub name: &'static str,
    /// Readings to take.
    pub readings: u32,
    /// Forward-power steps (reading, mW).
    pub power: [(u32, u32); MAX_STEPS],
    /// Steps used in `power`.
    pub n_power: usize,
    /// |Γ|² steps (reading, ppm).
    pub refl: [(u32, u32); MAX_STEPS],
    /// Steps used in `refl`.
    pub n_refl: usize,
    /// Optional spikes.
    pub spike: Option<Spike>,
    /// Optional keying (on, off) readings.
    pub key: Option<(u32, u32)>,
    /// The protection output shuts the transmitter down.
    pub feedback: bool,
    /// Protection-pin writes fail for these readings.
    pub pin_fail: Option<(u32, u32)>,
    /// Reset the alarm after this reading.
    pub reset_at: Option<u32>,
    /// Monitor settings.
    pub config: MonitorConfig,
}

fn base_config() -> MonitorConfig {
    MonitorConfig {
        trip_vswr: VswrQ16::from_bits(2 << 16),
        clear_vswr: VswrQ16::from_bits(3 << 15),
        hold_off: 3,
        clear_count: 5,
        latched: false,
        gate_uw: 1_000_000,
        averaging: 8,
        report_every: 25,
    }
}

impl Scenario {
    /// A preset by name.
    pub fn preset(name: &str) -> Option<Scenario> {
        let mut s = Scenario {
            name: "antenna-fault",
            readings: 300,
            power: [(0, 0); MAX_STEPS],
            n_power: 0,
            refl: [(0, 0); MAX_STEPS],
            n_refl: 0,
            spike: None,
            key: None,
            feedback: false,
            pin_fail: None,
            reset_at: None,
            config: base_config(),
        };
        match name {
            // 50 W into a good antenna, raised to 100 W; the antenna fails at reading 180.
            "antenna-fault" => {
                s.set_power(&[(1, 50_000), (60, 100_000)]);
                s.set_refl(&[(1, 4_000), (180, 250_000)]);
            }
            // Short arcs shorter than the hold-off, then a sustained one.
            "arcing" => {
                s.name = "arcing";
                s.set_power(&[(1, 80_000)]);
                s.set_refl(&[(1, 10_000), (200, 300_000), (210, 10_000)]);
                s.spike = Some(Spike {
                    start: 20,
                    every: 30,
                    len: 2,
                    ppm: 400_000,
                });
            }
            // The protection output keys the transmitter off; the alarm clears and it retries.
            "retry" => {
                s.name = "retry";
                s.set_power(&[(1, 20_000)]);
                s.set_refl(&[(1, 2_000), (100, 500_000)]);
                s.feedback = true;
            }
            // A latched trip held until an operator reset.
            "latched" => {
                s.name = "latched";
                s.set_power(&[(1, 10_000)]);
                s.set_refl(&[(1, 1_000), (80, 200_000), (150, 1_000)]);
                s.config.latched = true;
                s.reset_at = Some(220);
            }
            _ => return None,
        }
        Some(s)
    }

    fn set_power(&mut self, steps: &[(u32, u32)]) {
        for (slot, st) in self.power.iter_mut().zip(steps) {
            *slot = *st;
        }
        self.n_power = steps.len().min(MAX_STEPS);
    }

    fn set_refl(&mut self, steps: &[(u32, u32)]) {
        for (slot, st) in self.refl.iter_mut().zip(steps) {
            *slot = *st;
        }
        self.n_refl = steps.len().min(MAX_STEPS);
    }

    /// Builds a scenario from the command line (program name first, then options).
    pub fn from_args(cmdline: &str) -> Result<Scenario, ArgError> {
        let mut it = cmdline.split_ascii_whitespace().skip(1).peekable();
        let mut name = "antenna-fault";
        if it.peek() == Some(&"--scenario") {
            it.next();
            name = it.next().ok_or(ArgError::Value)?;
        }
        let mut s = Scenario::preset(name).ok_or(ArgError::Value)?;
        let mut power_given = false;
        let mut refl_given = false;
        while let Some(opt) = it.next() {
            let mut val = || it.next().ok_or(ArgError::Value);
            match opt {
                "--readings" => s.readings = num(val()?)?,
                "--power" | "--refl" => {
                    let (at, v) = pair(val()?)?;
                    let (steps, n, given) = if opt == "--power" {
                        (&mut s.power, &mut s.n_power, &mut power_given)
                    } else {
                        (&mut s.refl, &mut s.n_refl, &mut refl_given)
                    };
                    if !*given {
                        *n = 0;
                        *given = true;
                    }
                    let slot = steps.get_mut(*n).ok_or(ArgError::TooMany)?;
                    *slot = (at, v);
                    *n += 1;
                }
                "--spike" => {
                    let mut p = val()?.split(':');
                    let mut f = || p.next().ok_or(ArgError::Value).and_then(num);
                    let sp = Spike {
                        start: f()?,
                        every: f()?,
                        len: f()?,
                        ppm: f()?,
                    };
                    if sp.every == 0 {
                        return Err(ArgError::Value);
                    }
                    s.spike = Some(sp);
                }
                "--no-spike" => s.spike = None,
                "--key" => s.key = Some(pair(val()?)?),
                "--feedback" => s.feedback = true,
                "--pin-fail" => s.pin_fail = Some(pair(val()?)?),
                "--reset-at" => s.reset_at = Some(num(val()?)?),
                "--trip" => s.config.trip_vswr = VswrQ16::from_bits(q16(val()?)?),
                "--clear" => s.config.clear_vswr = VswrQ16::from_bits(q16(val()?)?),
                "--hold" => s.config.hold_off = small(val()?)?,
                "--clear-n" => s.config.clear_count = small(val()?)?,
                "--latch" => s.config.latched = true,
                "--gate-mw" => s.config.gate_uw = num(val()?)?.saturating_mul(1000),
                "--avg" => s.config.averaging = small(val()?)?,
                "--every" => s.config.report_every = small(val()?)?,
                _ => return Err(ArgError::Unknown),
            }
        }
        Ok(s)
    }

    /// The reading at `seq` (1-based); `inhibited` is the protection pin's level before it.
    pub fn reading(&self, seq: u32, inhibited: bool) -> PowerReading {
        let mw = last_step(&self.power, self.n_power, seq);
        let keyed = match self.key {
            Some((on, off)) => {
                let period = on.saturating_add(off);
                period == 0 || (seq.saturating_sub(1)) % period < on
            }
            None => true,
        };
        let running = keyed && !(self.feedback && inhibited);
        let forward_uw = if running { mw.saturating_mul(1000) } else { 0 };
        let mut ppm = last_step(&self.refl, self.n_refl, seq);
        if let Some(sp) = self.spike {
            if seq >= sp.start && (seq - sp.start) % sp.every.max(1) < sp.len {
                ppm = ppm.max(sp.ppm);
            }
        }
        let reflected = u64::from(forward_uw) * u64::from(ppm.min(1_000_000)) / 1_000_000;
        PowerReading::new(forward_uw, u32::try_from(reflected).unwrap_or(u32::MAX))
    }
}

fn last_step(steps: &[(u32, u32)], n: usize, seq: u32) -> u32 {
    steps
        .iter()
        .take(n)
        .rfind(|(at, _)| *at <= seq)
        .map_or(0, |(_, v)| *v)
}

fn num(s: &str) -> Result<u32, ArgError> {
    s.parse().map_err(|_| ArgError::Value)
}

fn small(s: &str) -> Result<u16, ArgError> {
    s.parse().map_err(|_| ArgError::Value)
}

fn pair(s: &str) -> Result<(u32, u32), ArgError> {
    let (a, b) = s.split_once(':').ok_or(ArgError::Value)?;
    Ok((num(a)?, num(b)?))
}

/// A decimal such as `2.35` as Q16.16 (truncated); at most 4 decimals, below 1000.
fn q16(s: &str) -> Result<u32, ArgError> {
    let (int, frac) = s.split_once('.').unwrap_or((s, ""));
    let i = num(int)?;
    if i >= 1000 || frac.len() > 4 {
        return Err(ArgError::Value);
    }
    let mut f = 0u32;
    let mut scale = 1u32;
    for c in frac.bytes() {
        let d = u32::from(c.wrapping_sub(b'0'));
        if d > 9 {
            return Err(ArgError::Value);
        }
        f = f * 10 + d;
        scale *= 10;
    }
    Ok((i << 16) + (f << 16) / scale)
}
