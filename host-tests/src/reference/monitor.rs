//! f64 reference model of the in-line monitor and of the emulated board's simulated line.
//!
//! Written from the specification, apart from the core (never calls feedline):
//! - the line (as documented for `boards/emu-monitor`): forward power steps in mW, |Γ|² steps
//!   in ppm, periodic spikes, keying, transmitter shut-down by the protection pin, reflected
//!   power ⌊forward · ppm / 10⁶⌋ µW;
//! - the figures: |Γ| = √(P_ref/P_fwd), VSWR = (1+|Γ|)/(1−|Γ|) capped at 1000, return loss
//!   = 10·log10(P_fwd/P_ref) capped at 100 dB (textbook transmission-line relations);
//! - the alarm: trips after `hold_off` consecutive active readings strictly above the trip
//!   threshold; clears after `clear_count` consecutive readings that are idle or strictly below
//!   the clear threshold; never by itself when latched; a reading is idle when its forward power
//!   is below the gate;
//! - the protection pin (high = permit) starts low and is written on every reading and on a
//!   reset; a failed write leaves it where it was;
//! - reports every K readings: boxcar mean of the last W readings, peaks since the last report.

/// A stepwise value: (from reading, value).
pub type Steps = Vec<(u32, u32)>;

/// A scenario in the model's own terms.
#[derive(Clone, Debug)]
pub struct Scenario {
    /// Preset the firmware starts from (all its fields are overridden below).
    pub preset: &'static str,
    /// Readings taken.
    pub readings: u32,
    /// Forward power steps, mW.
    pub power: Steps,
    /// |Γ|² steps, ppm.
    pub refl: Steps,
    /// (start, every, len, ppm).
    pub spike: Option<(u32, u32, u32, u32)>,
    /// (on, off) keying.
    pub key: Option<(u32, u32)>,
    /// Pin inhibit shuts the transmitter down.
    pub feedback: bool,
    /// Pin writes fail for readings a..=b.
    pub pin_fail: Option<(u32, u32)>,
    /// Reset the alarm after this reading.
    pub reset_at: Option<u32>,
    /// Trip VSWR.
    pub trip: f64,
    /// Clear VSWR.
    pub clear: f64,
    /// Hold-off readings.
    pub hold_off: u32,
    /// Clear readings.
    pub clear_count: u32,
    /// Latched alarm.
    pub latched: bool,
    /// Gate, mW.
    pub gate_mw: u32,
    /// Averaging window.
    pub averaging: u32,
    /// Report interval.
    pub report_every: u32,
}

impl Scenario {
    /// A scenario with no steps and ordinary settings.
    pub fn new(readings: u32) -> Self {
        Scenario {
            preset: "antenna-fault",
            readings,
            power: vec![],
            refl: vec![],
            spike: None,
            key: None,
            feedback: false,
            pin_fail: None,
            reset_at: None,
            trip: 2.0,
            clear: 1.5,
            hold_off: 3,
            clear_count: 5,
            latched: false,
            gate_mw: 1000,
            averaging: 8,
            report_every: 25,
        }
    }

    /// The firmware's command line for this scenario (after the program name).
    pub fn args(&self) -> Vec<String> {
        let mut a: Vec<String> = vec!["--scenario".into(), self.preset.into()];
        let mut o = |k: &str, v: String| {
            a.push(k.into());
            a.push(v);
        };
        o("--readings", self.readings.to_string());
        for (at, v) in &self.power {
            o("--power", format!("{at}:{v}"));
        }
        for (at, v) in &self.refl {
            o("--refl", format!("{at}:{v}"));
        }
        if let Some((s, e, l, p)) = self.spike {
            o("--spike", format!("{s}:{e}:{l}:{p}"));
        }
        if let Some((on, off)) = self.key {
            o("--key", format!("{on}:{off}"));
        }
        if let Some((x, y)) = self.pin_fail {
            o("--pin-fail", format!("{x}:{y}"));
        }
        if let Some(r) = self.reset_at {
            o("--reset-at", r.to_string());
        }
        o("--trip", format!("{:.4}", self.trip));
        o("--clear", format!("{:.4}", self.clear));
        o("--hold", self.hold_off.to_string());
        o("--clear-n", self.clear_count.to_string());
        o("--gate-mw", self.gate_mw.to_string());
        o("--avg", self.averaging.to_string());
        o("--every", self.report_every.to_string());
        if self.feedback {
            a.push("--feedback".into());
        }
        if self.latched {
            a.push("--latch".into());
        }
        a
    }
}

/// An alarm event of the model.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Event {
    /// Tripped at a reading of this VSWR.
    Trip(f64),
    /// Cleared by itself.
    Clear,
    /// Cleared by a reset.
    Reset,
}

/// A report of the model.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Report {
    /// Reading number.
    pub seq: u32,
    /// Mean forward power, µW.
    pub forward_uw: f64,
    /// Mean reflected power, µW.
    pub reflected_uw: f64,
    /// Mean forward above the gate.
    pub transmitting: bool,
    /// VSWR of the means.
    pub vswr: f64,
    /// Return loss of the means, dB.
    pub return_loss_db: f64,
    /// Peak forward, µW.
    pub peak_forward_uw: f64,
    /// Peak VSWR of active readings.
    pub peak_vswr: Option<f64>,
    /// Alarm tripped.
    pub tripped: bool,
    /// Failed pin writes so far.
    pub pin_errors: u32,
    /// The protection pin is at inhibit when the report is made.
    pub inhibited: bool,
}

/// Everything a run produces.
#[derive(Clone, Debug, Default)]
pub struct Run {
    /// (reading, event).
    pub events: Vec<(u32, Event)>,
    /// (reading, permit) pin changes.
    pub pins: Vec<(u32, bool)>,
    /// (reading) failed pin writes.
    pub pin_failures: Vec<u32>,
    /// Reports.
    pub reports: Vec<Report>,
    /// The line's (forward, reflected) power of every reading, µW.
    pub readings: Vec<(f64, f64)>,
    /// Smallest relative distance of an active reading's VSWR from a threshold it was compared
    /// with, and of a report's mean forward power from the gate: a check is only meaningful
    /// when this exceeds the chain's error.
    pub margin: f64,
}

/// VSWR ceiling.
pub const VSWR_CEILING: f64 = 1000.0;
/// Return-loss ceiling, dB.
pub const RL_CEILING_DB: f64 = 100.0;

/// VSWR and return loss from forward and reflected power.
pub fn figures(forward: f64, reflected: f64) -> (f64, f64) {
    if reflected >= forward {
        return (VSWR_CEILING, 0.0);
    }
    if reflected <= 0.0 {
        return (1.0, RL_CEILING_DB);
    }
    let ratio = reflected / forward;
    let g = ratio.sqrt();
    let vswr = ((1.0 + g) / (1.0 - g)).min(VSWR_CEILING);
    let rl = (-10.0 * ratio.log10()).min(RL_CEILING_DB);
    (vswr, rl)
}

fn step_value(steps: &Steps, seq: u32) -> u32 {
    let mut v = 0;
    for &(at, x) in steps {
        if at <= seq {
            v = x;
        }
    }
    v
}

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// Runs the model.
pub fn simulate(s: &Scenario) -> Run {
    let mut run = Run {
        margin: f64::INFINITY,
        ..Run::default()
    };
    let gate_uw = f64::from(s.gate_mw) * 1000.0;
    let mut permit = false; // pin starts low = inhibit
    let mut tripped = false;
    let (mut above, mut below) = (0u32, 0u32);
    let mut history: Vec<(f64, f64)> = vec![];
    let mut since = 0u32;
    let mut peak_fwd = 0.0f64;
    let mut peak_vswr: Option<f64> = None;
    let mut pin_errors = 0u32;
    for seq in 1..=s.readings {
        let keyed = match s.key {
            Some((on, off)) => (on + off) == 0 || (seq - 1) % (on + off) < on,
            None => true,
        };
        let running = keyed && (permit || !s.feedback);
        let fwd = if running {
            f64::from(step_value(&s.power, seq)) * 1000.0
        } else {
            0.0
        };
        let mut ppm = step_value(&s.refl, seq);
        if let Some((start, every, len, sp)) = s.spike {
            if seq >= start && (seq - start) % every < len {
                ppm = ppm.max(sp);
            }
        }
        let refl = (fwd * f64::from(ppm.min(1_000_000)) / 1e6).floor();
        let active = fwd >= gate_uw;
        let (vswr, _) = figures(fwd, refl);
        run.readings.push((fwd, refl));

        // alarm
        if !tripped {
            if active {
                run.margin = run.margin.min(rel(vswr, s.trip));
            }
            if active && vswr > s.trip {
                above += 1;
            } else {
                above = 0;
            }
            if above >= s.hold_off {
                tripped = true;
                above = 0;
                below = 0;
                run.events.push((seq, Event::Trip(vswr)));
            }
        } else if !s.latched {
            if active {
                run.margin = run.margin.min(rel(vswr, s.clear));
            }
            if !active || vswr < s.clear {
                below += 1;
            } else {
                below = 0;
            }
            if below >= s.clear_count {
                tripped = false;
                above = 0;
                below = 0;
                run.events.push((seq, Event::Clear));
            }
        }
        let fails = s.pin_fail.is_some_and(|(a, b)| (a..=b).contains(&seq));
        let drive = |want: bool, permit: &mut bool, errors: &mut u32, run: &mut Run| {
            if fails {
                *errors += 1;
                run.pin_failures.push(seq);
            } else {
                *permit = want;
            }
        };
        let before = permit;
        drive(!tripped, &mut permit, &mut pin_errors, &mut run);

        // averaging and peaks
        history.push((fwd, refl));
        peak_fwd = peak_fwd.max(fwd);
        if active {
            peak_vswr = Some(peak_vswr.map_or(vswr, |p: f64| p.max(vswr)));
        }
        if s.report_every > 0 {
            since += 1;
            if since >= s.report_every {
                let n = history.len().min(s.averaging as usize);
                let tail = &history[history.len() - n..];
                let mf = tail.iter().map(|x| x.0).sum::<f64>() / n as f64;
                let mr = tail.iter().map(|x| x.1).sum::<f64>() / n as f64;
                if mf > 0.0 {
                    run.margin = run.margin.min(rel(mf, gate_uw));
                }
                let (v, rl) = figures(mf, mr);
                run.reports.push(Report {
                    seq,
                    forward_uw: mf,
                    reflected_uw: mr,
                    transmitting: mf >= gate_uw,
                    vswr: v,
                    return_loss_db: rl,
                    peak_forward_uw: peak_fwd,
                    peak_vswr,
                    tripped,
                    pin_errors,
                    inhibited: !permit,
                });
                since = 0;
                peak_fwd = 0.0;
                peak_vswr = None;
            }
        }
        if s.reset_at == Some(seq) {
            if tripped {
                run.events.push((seq, Event::Reset));
            }
            tripped = false;
            above = 0;
            below = 0;
            drive(true, &mut permit, &mut pin_errors, &mut run);
        }
        if permit != before {
            run.pins.push((seq, permit));
        }
    }
    run
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand-worked: VSWR 3 for |Γ|² = 0.25 ((1+0.5)/(1−0.5)); RL 6.0206 dB (10·log10 4).
    #[test]
    fn figures_by_hand() {
        let (v, rl) = figures(100.0, 25.0);
        assert!((v - 3.0).abs() < 1e-12);
        assert!((rl - 6.020_599_913_279_624).abs() < 1e-12);
        assert_eq!(figures(0.0, 0.0), (VSWR_CEILING, 0.0));
        assert_eq!(figures(5.0, 0.0), (1.0, RL_CEILING_DB));
    }

    /// A fault of VSWR 3 at reading 10 with hold-off 3 trips at 12; gone at 20, clear-count 5
    /// clears at 24 (hand-counted).
    #[test]
    fn alarm_by_hand() {
        let mut s = Scenario::new(40);
        s.power = vec![(1, 10_000)];
        s.refl = vec![(1, 0), (10, 250_000), (20, 0)];
        let r = simulate(&s);
        assert_eq!(r.events, vec![(12, Event::Trip(3.0)), (24, Event::Clear)]);
        assert_eq!(r.pins, vec![(1, true), (12, false), (24, true)]);
    }
}
