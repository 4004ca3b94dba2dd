//! The monitor: averaging, peak hold, alarm, protection output and report scheduling wired
//! together, one call per reading.

use embedded_hal::digital::OutputPin;

use super::alarm::{AlarmEvent, AlarmState, SwrAlarm};
use super::average::Averager;
use super::config::{ConfigError, MonitorConfig};
use super::math::{LineFigures, LineMath, PowerReading};
use super::protection::{PinSense, Protection};
use crate::fixed::{DbQ16, VswrQ16};

/// A periodic report: the averaged line and the peaks since the previous report.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Report {
    /// Readings taken so far, this one included.
    pub sequence: u32,
    /// Averaged forward power, µW.
    pub forward_uw: u32,
    /// Averaged reflected power, µW.
    pub reflected_uw: u32,
    /// Averaged delivered power (forward − reflected), µW.
    pub delivered_uw: u32,
    /// False when the averaged forward power is below the gate: VSWR and RL then mean little.
    pub transmitting: bool,
    /// VSWR of the averaged powers.
    pub vswr: VswrQ16,
    /// Return loss of the averaged powers.
    pub return_loss: DbQ16,
    /// Highest single-reading forward power since the previous report, µW.
    pub peak_forward_uw: u32,
    /// Highest single-reading VSWR of an active reading since the previous report, or `None`
    /// if every reading was idle.
    pub peak_vswr: Option<VswrQ16>,
    /// The alarm state after this reading.
    pub alarm: AlarmState,
    /// Failed protection-pin writes so far.
    pub pin_errors: u32,
}

/// What one reading produced.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Step {
    /// Readings taken so far, this one included.
    pub sequence: u32,
    /// VSWR and return loss of this reading alone (not averaged).
    pub figures: LineFigures,
    /// False when this reading's forward power is below the gate (idle).
    pub active: bool,
    /// The alarm changed state on this reading.
    pub event: Option<AlarmEvent>,
    /// A report fell due on this reading.
    pub report: Option<Report>,
    /// False if the protection pin could not be written on this reading (the alarm state is
    /// kept regardless; the write is retried on the next reading).
    pub pin_ok: bool,
}

/// An in-line monitor with a chain `M`, a protection pin `P` and an averaging buffer of `N`.
#[derive(Debug)]
pub struct Monitor<M, P, const N: usize> {
    config: MonitorConfig,
    math: M,
    protection: Protection<P>,
    alarm: SwrAlarm,
    average: Averager<N>,
    sequence: u32,
    since_report: u16,
    peak_forward_uw: u32,
    peak_vswr: Option<VswrQ16>,
}

impl<M: LineMath, P: OutputPin, const N: usize> Monitor<M, P, N> {
    /// A monitor with validated settings. The pin is not written until the first reading.
    pub fn new(
        config: MonitorConfig,
        math: M,
        pin: P,
        sense: PinSense,
    ) -> Result<Self, ConfigError> {
        config.validate(N)?;
        Ok(Monitor {
            config,
            math,
            protection: Protection::new(pin, sense),
            alarm: SwrAlarm::new(),
            average: Averager::new(usize::from(config.averaging)),
            sequence: 0,
            since_report: 0,
            peak_forward_uw: 0,
            peak_vswr: None,
        })
    }

    /// The settings in force.
    pub fn config(&self) -> &MonitorConfig {
        &self.config
    }

    /// The alarm state.
    pub fn alarm_state(&self) -> AlarmState {
        self.alarm.state()
    }

    /// The protection output (pin and error count).
    pub fn protection(&self) -> &Protection<P> {
        &self.protection
    }

    /// Takes one reading: updates the average, peaks and alarm, drives the protection pin,
    /// and returns any alarm event and any report that fell due.
    pub fn update(&mut self, reading: PowerReading) -> Step {
        self.sequence = self.sequence.saturating_add(1);
        let active = reading.forward_uw >= self.config.gate_uw;
        let figures = self.math.figures(reading);
        let event = self.alarm.update(&self.config, active, figures.vswr);
        let pin_ok = self.protection.drive(self.alarm.state());

        self.average.push(reading);
        self.peak_forward_uw = self.peak_forward_uw.max(reading.forward_uw);
        if active {
            let v = figures.vswr;
            self.peak_vswr = Some(self.peak_vswr.map_or(v, |p| p.max(v)));
        }

        let mut report = None;
        if self.config.report_every != 0 {
            self.since_report = self.since_report.saturating_add(1);
            if self.since_report >= self.config.report_every {
                report = Some(self.report_now());
                self.since_report = 0;
                self.peak_forward_uw = 0;
                self.peak_vswr = None;
            }
        }
        Step {
            sequence: self.sequence,
            figures,
            active,
            event,
            report,
            pin_ok,
        }
    }

    /// A report of the present average and peaks, without resetting the peaks.
    pub fn report_now(&self) -> Report {
        let mean = self.average.mean();
        let figures = self.math.figures(mean);
        Report {
            sequence: self.sequence,
            forward_uw: mean.forward_uw,
            reflected_uw: mean.reflected_uw,
            delivered_uw: mean.delivered_uw(),
            transmitting: mean.forward_uw >= self.config.gate_uw,
            vswr: figures.vswr,
            return_loss: figures.return_loss,
            peak_forward_uw: self.peak_forward_uw,
            peak_vswr: self.peak_vswr,
            alarm: self.alarm.state(),
            pin_errors: self.protection.error_count(),
        }
    }

    /// Clears the alarm (the way out of a latched trip) and drives the pin to permit.
    /// Returns the event (if it was tripped) and whether the pin write succeeded.
    pub fn reset_alarm(&mut self) -> (Option<AlarmEvent>, bool) {
        let ev = self.alarm.reset();
        let ok = self.protection.drive(self.alarm.state());
        (ev, ok)
    }

    /// Gives back the chain and the pin.
    pub fn release(self) -> (M, P) {
        (self.math, self.protection.release())
    }
}

#[cfg(test)]
mod tests {
    extern crate std;
    use super::*;
    use crate::monitor::PowerChain;
    use core::cell::Cell;
    use embedded_hal::digital::{ErrorKind, ErrorType};

    /// A pin that remembers its level and can be told to fail.
    #[derive(Default)]
    struct Pin {
        high: Cell<Option<bool>>,
        fail: Cell<bool>,
        writes: Cell<u32>,
    }
    impl ErrorType for &Pin {
        type Error = ErrorKind;
    }
    impl OutputPin for &Pin {
        fn set_low(&mut self) -> Result<(), ErrorKind> {
            self.set(false)
        }
        fn set_high(&mut self) -> Result<(), ErrorKind> {
            self.set(true)
        }
    }
    impl Pin {
        fn set(&self, h: bool) -> Result<(), ErrorKind> {
            self.writes.set(self.writes.get() + 1);
            if self.fail.get() {
                Err(ErrorKind::Other)
            } else {
                self.high.set(Some(h));
                Ok(())
            }
        }
    }

    const W: u32 = 1_000_000; // 1 W in µW
    const TWO: VswrQ16 = VswrQ16::from_bits(2 << 16);
    /// 100 W forward with |Γ|² = 1/9 (|Γ| = 1/3, VSWR 2.0 exactly) would sit on the threshold;
    /// |Γ|² = 0.25 gives VSWR 3.0 and |Γ|² = 0.01 gives VSWR 1.222.
    const BAD: PowerReading = PowerReading::new(100 * W, 25 * W);
    const GOOD: PowerReading = PowerReading::new(100 * W, W);

    fn config() -> MonitorConfig {
        MonitorConfig {
            hold_off: 3,
            clear_count: 4,
            averaging: 4,
            report_every: 5,
            ..MonitorConfig::DEFAULT
        }
    }

    #[test]
    fn trips_drives_pin_and_clears() {
        let pin = Pin::default();
        let mut m: Monitor<_, _, 8> =
            Monitor::new(config(), PowerChain, &pin, PinSense::PermitHigh).unwrap();
        assert_eq!(
            pin.high.get(),
            None,
            "pin untouched before the first reading"
        );
        let mut events = std::vec::Vec::new();
        let seq = [GOOD, GOOD, BAD, BAD, BAD, BAD, GOOD, GOOD, GOOD, GOOD, GOOD];
        for r in seq {
            let s = m.update(r);
            assert!(s.pin_ok);
            assert!(s.active);
            assert_eq!(s.figures, PowerChain.figures(r));
            if let Some(e) = s.event {
                events.push((s.sequence, e));
            }
            let expect_high = m.alarm_state() == AlarmState::Clear;
            assert_eq!(pin.high.get(), Some(expect_high));
        }
        assert_eq!(events.len(), 2);
        assert_eq!(events[0].0, 5);
        assert!(matches!(events[0].1, AlarmEvent::Tripped { vswr } if vswr > TWO));
        assert_eq!(events[1], (10, AlarmEvent::Cleared));
        assert_eq!(pin.writes.get(), 11, "pin driven on every reading");
    }

    #[test]
    fn reports_every_k_with_average_and_peaks() {
        let pin = Pin::default();
        let mut m: Monitor<_, _, 8> =
            Monitor::new(config(), PowerChain, &pin, PinSense::PermitLow).unwrap();
        let mut reports = std::vec::Vec::new();
        let seq = [GOOD, GOOD, GOOD, BAD, GOOD, GOOD, GOOD, GOOD, GOOD, GOOD];
        for r in seq {
            if let Some(rep) = m.update(r).report {
                reports.push(rep);
            }
        }
        assert_eq!(reports.len(), 2);
        let a = reports[0];
        assert_eq!(a.sequence, 5);
        // last 4 readings: GOOD GOOD BAD GOOD
        assert_eq!(a.forward_uw, 100 * W);
        assert_eq!(a.reflected_uw, (3 * W + 25 * W) / 4);
        assert_eq!(a.delivered_uw, 100 * W - 7 * W);
        assert!(a.transmitting);
        assert_eq!(a.peak_forward_uw, 100 * W);
        let pk = a.peak_vswr.unwrap().to_bits();
        assert!(pk.abs_diff(3 << 16) < 200, "peak VSWR {pk} ≈ 3 (0.1 %)");
        assert_eq!(a.alarm, AlarmState::Clear);
        // second interval has no BAD reading: the peak was reset
        let b = reports[1];
        assert_eq!(b.sequence, 10);
        assert_eq!(b.reflected_uw, W);
        assert!(b.peak_vswr.unwrap() < TWO);
        // PermitLow: clear alarm drives the pin low
        assert_eq!(pin.high.get(), Some(false));
    }

    #[test]
    fn pin_failure_is_reported_and_alarm_kept() {
        let pin = Pin::default();
        let mut m: Monitor<_, _, 8> =
            Monitor::new(config(), PowerChain, &pin, PinSense::PermitHigh).unwrap();
        pin.fail.set(true);
        let mut last = None;
        for _ in 0..3 {
            last = Some(m.update(BAD));
            assert!(!last.unwrap().pin_ok);
        }
        assert!(matches!(
            last.unwrap().event,
            Some(AlarmEvent::Tripped { .. })
        ));
        assert_eq!(m.alarm_state(), AlarmState::Tripped);
        assert_eq!(m.protection().error_count(), 3);
        // the pin recovers: the next reading drives inhibit
        pin.fail.set(false);
        let s = m.update(BAD);
        assert!(s.pin_ok);
        assert_eq!(pin.high.get(), Some(false));
        assert_eq!(m.report_now().pin_errors, 3);
    }

    #[test]
    fn latched_needs_reset_and_idle_is_gated() {
        let pin = Pin::default();
        let c = MonitorConfig {
            latched: true,
            ..config()
        };
        let mut m: Monitor<_, _, 8> =
            Monitor::new(c, PowerChain, &pin, PinSense::PermitHigh).unwrap();
        // below the gate a terrible VSWR never trips
        for _ in 0..10 {
            assert_eq!(m.update(PowerReading::new(1000, 999)).event, None);
        }
        for _ in 0..3 {
            m.update(BAD);
        }
        assert_eq!(m.alarm_state(), AlarmState::Tripped);
        for _ in 0..20 {
            assert_eq!(m.update(GOOD).event, None);
        }
        assert_eq!(m.reset_alarm(), (Some(AlarmEvent::Cleared), true));
        assert_eq!(pin.high.get(), Some(true));
        let rep = m.report_now();
        assert_eq!(rep.alarm, AlarmState::Clear);
    }

    #[test]
    fn refuses_averaging_beyond_capacity() {
        let pin = Pin::default();
        let c = MonitorConfig {
            averaging: 9,
            ..config()
        };
        let r: Result<Monitor<_, _, 8>, _> =
            Monitor::new(c, PowerChain, &pin, PinSense::PermitHigh);
        assert_eq!(r.err(), Some(ConfigError::Averaging));
    }
}
