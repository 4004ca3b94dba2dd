//! The SWR alarm: a two-threshold comparator with hold-off and clear counters, optionally
//! latched. Pure state machine; the protection output lives in [`super::Protection`].

use super::config::MonitorConfig;
use crate::fixed::VswrQ16;

/// Whether the alarm is raised.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum AlarmState {
    /// No alarm: the transmitter is permitted.
    #[default]
    Clear,
    /// Alarm raised: the transmitter is inhibited.
    Tripped,
}

/// A change of alarm state.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum AlarmEvent {
    /// The alarm tripped.
    Tripped {
        /// VSWR of the reading that completed the hold-off.
        vswr: VswrQ16,
    },
    /// The alarm cleared (by itself, or by a reset of a latched alarm).
    Cleared,
}

/// The SWR alarm's state and counters.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SwrAlarm {
    state: AlarmState,
    above: u16,
    below: u16,
}

impl SwrAlarm {
    /// A clear alarm with zeroed counters.
    pub const fn new() -> Self {
        SwrAlarm {
            state: AlarmState::Clear,
            above: 0,
            below: 0,
        }
    }

    /// The present state.
    pub const fn state(&self) -> AlarmState {
        self.state
    }

    /// Feeds one reading: `active` is false for an idle reading (forward power below the
    /// gate), `vswr` its VSWR. Returns the change of state, if any.
    pub fn update(
        &mut self,
        config: &MonitorConfig,
        active: bool,
        vswr: VswrQ16,
    ) -> Option<AlarmEvent> {
        match self.state {
            AlarmState::Clear => {
                if active && vswr > config.trip_vswr {
                    self.above = self.above.saturating_add(1);
                } else {
                    self.above = 0;
                }
                if self.above >= config.hold_off {
                    self.state = AlarmState::Tripped;
                    self.above = 0;
                    self.below = 0;
                    return Some(AlarmEvent::Tripped { vswr });
                }
                None
            }
            AlarmState::Tripped => {
                if config.latched {
                    return None;
                }
                if !active || vswr < config.clear_vswr {
                    self.below = self.below.saturating_add(1);
                } else {
                    self.below = 0;
                }
                if self.below >= config.clear_count {
                    self.state = AlarmState::Clear;
                    self.above = 0;
                    self.below = 0;
                    return Some(AlarmEvent::Cleared);
                }
                None
            }
        }
    }

    /// Clears the alarm (the way out of a latched trip). Returns `Cleared` if it was tripped.
    pub fn reset(&mut self) -> Option<AlarmEvent> {
        let was = self.state;
        *self = SwrAlarm::new();
        match was {
            AlarmState::Tripped => Some(AlarmEvent::Cleared),
            AlarmState::Clear => None,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const HIGH: VswrQ16 = VswrQ16::from_bits(3 << 16);
    const MID: VswrQ16 = VswrQ16::from_bits(117_965); // 1.8
    const LOW: VswrQ16 = VswrQ16::from_bits(72_090); // 1.1

    fn cfg(latched: bool) -> MonitorConfig {
        MonitorConfig {
            hold_off: 3,
            clear_count: 2,
            latched,
            ..MonitorConfig::DEFAULT
        }
    }

    /// Feeds (active, vswr) pairs and returns the index of each event.
    fn run(c: &MonitorConfig, input: &[(bool, VswrQ16)]) -> ([Option<AlarmEvent>; 16], AlarmState) {
        let mut a = SwrAlarm::new();
        let mut out = [None; 16];
        for (slot, &(act, v)) in out.iter_mut().zip(input) {
            *slot = a.update(c, act, v);
        }
        (out, a.state())
    }

    #[test]
    fn trips_only_after_hold_off_consecutive_readings() {
        let c = cfg(false);
        // two above, one below, then three above: trips on the sixth reading (index 5)
        let input = [
            (true, HIGH),
            (true, HIGH),
            (true, LOW),
            (true, HIGH),
            (true, HIGH),
            (true, HIGH),
        ];
        let (ev, st) = run(&c, &input);
        assert_eq!(ev[..5], [None; 5]);
        assert_eq!(ev[5], Some(AlarmEvent::Tripped { vswr: HIGH }));
        assert_eq!(st, AlarmState::Tripped);
    }

    #[test]
    fn exactly_at_trip_threshold_does_not_count() {
        let c = cfg(false);
        let t = c.trip_vswr;
        let (ev, st) = run(&c, &[(true, t); 8]);
        assert_eq!(ev, [None; 16]);
        assert_eq!(st, AlarmState::Clear);
    }

    #[test]
    fn idle_readings_reset_hold_off_and_count_towards_clear() {
        let c = cfg(false);
        let input = [
            (true, HIGH),
            (true, HIGH),
            (false, HIGH),
            (true, HIGH),
            (true, HIGH),
            (true, HIGH),
            (false, VswrQ16::ONE),
            (false, VswrQ16::ONE),
        ];
        let (ev, st) = run(&c, &input);
        assert_eq!(ev[5], Some(AlarmEvent::Tripped { vswr: HIGH }));
        assert_eq!(ev[7], Some(AlarmEvent::Cleared));
        assert_eq!(ev.iter().filter(|e| e.is_some()).count(), 2);
        assert_eq!(st, AlarmState::Clear);
    }

    #[test]
    fn hysteresis_band_holds_the_trip() {
        let c = cfg(false);
        // trip, then readings between clear (1.7) and trip (2.0) thresholds: stays tripped
        let mut input = [(true, MID); 12];
        input[0] = (true, HIGH);
        input[1] = (true, HIGH);
        input[2] = (true, HIGH);
        let (ev, st) = run(&c, &input);
        assert_eq!(ev[2], Some(AlarmEvent::Tripped { vswr: HIGH }));
        assert_eq!(ev.iter().filter(|e| e.is_some()).count(), 1);
        assert_eq!(st, AlarmState::Tripped);
        // a below reading interrupted by one in the band restarts the clear count
        let input = [
            (true, HIGH),
            (true, HIGH),
            (true, HIGH),
            (true, LOW),
            (true, MID),
            (true, LOW),
            (true, LOW),
        ];
        let (ev, _) = run(&c, &input);
        assert_eq!(ev[4], None);
        assert_eq!(ev[5], None);
        assert_eq!(ev[6], Some(AlarmEvent::Cleared));
    }

    #[test]
    fn latched_alarm_holds_until_reset() {
        let c = cfg(true);
        let mut a = SwrAlarm::new();
        for _ in 0..3 {
            a.update(&c, true, HIGH);
        }
        assert_eq!(a.state(), AlarmState::Tripped);
        for _ in 0..20 {
            assert_eq!(a.update(&c, true, LOW), None);
        }
        assert_eq!(a.state(), AlarmState::Tripped);
        assert_eq!(a.reset(), Some(AlarmEvent::Cleared));
        assert_eq!(a.reset(), None);
        assert_eq!(a.state(), AlarmState::Clear);
    }

    #[test]
    fn counters_saturate_without_panic() {
        let c = MonitorConfig {
            hold_off: u16::MAX,
            ..cfg(false)
        };
        let mut a = SwrAlarm::new();
        for _ in 0..70_000u32 {
            a.update(&c, true, HIGH);
        }
        assert_eq!(a.state(), AlarmState::Tripped);
    }
}
