//! Monitor settings and their validation.

use crate::fixed::VswrQ16;

/// Why a [`MonitorConfig`] was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ConfigError {
    /// The clear threshold is not below the trip threshold (no hysteresis).
    Thresholds,
    /// `hold_off` or `clear_count` is 0.
    ZeroCount,
    /// `averaging` is 0 or larger than the monitor's buffer capacity.
    Averaging,
}

/// Settings of a [`Monitor`](super::Monitor).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MonitorConfig {
    /// VSWR that a reading must be strictly above to count towards a trip.
    pub trip_vswr: VswrQ16,
    /// VSWR that a reading must be strictly below to count towards clearing; must be below
    /// `trip_vswr`.
    pub clear_vswr: VswrQ16,
    /// Consecutive readings above the trip threshold needed to trip (≥ 1).
    pub hold_off: u16,
    /// Consecutive readings below the clear threshold needed to clear (≥ 1).
    pub clear_count: u16,
    /// When true a trip holds until [`Monitor::reset_alarm`](super::Monitor::reset_alarm).
    pub latched: bool,
    /// Forward power (µW) below which a reading is idle (transmitter unkeyed).
    pub gate_uw: u32,
    /// Readings in the boxcar average (1..=capacity).
    pub averaging: u16,
    /// A report every this many readings; 0 for none.
    pub report_every: u16,
}

impl MonitorConfig {
    /// A conservative starting point: trip above VSWR 2.0 after 3 readings, clear below 1.7
    /// after 10, not latched, gate 100 mW, average of 8, a report every 50 readings.
    /// (Common practice for amateur and broadcast transmitters; tune for your line.)
    pub const DEFAULT: MonitorConfig = MonitorConfig {
        trip_vswr: VswrQ16::from_bits(2 << 16),
        clear_vswr: VswrQ16::from_bits(111_411), // 1.7 (1.7 · 65536 = 111 411.2)
        hold_off: 3,
        clear_count: 10,
        latched: false,
        gate_uw: 100_000,
        averaging: 8,
        report_every: 50,
    };

    /// Checks the settings for a monitor whose buffer holds `capacity` readings.
    pub fn validate(&self, capacity: usize) -> Result<(), ConfigError> {
        if self.clear_vswr >= self.trip_vswr {
            return Err(ConfigError::Thresholds);
        }
        if self.hold_off == 0 || self.clear_count == 0 {
            return Err(ConfigError::ZeroCount);
        }
        if self.averaging == 0 || usize::from(self.averaging) > capacity {
            return Err(ConfigError::Averaging);
        }
        Ok(())
    }
}

impl Default for MonitorConfig {
    fn default() -> Self {
        Self::DEFAULT
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn default_is_valid() {
        assert_eq!(MonitorConfig::DEFAULT.validate(8), Ok(()));
        assert_eq!(
            MonitorConfig::DEFAULT.validate(4),
            Err(ConfigError::Averaging)
        );
    }

    #[test]
    fn refuses_bad_settings() {
        let d = MonitorConfig::DEFAULT;
        let cases = [
            (
                MonitorConfig {
                    clear_vswr: d.trip_vswr,
                    ..d
                },
                ConfigError::Thresholds,
            ),
            (
                MonitorConfig {
                    trip_vswr: VswrQ16::ONE,
                    clear_vswr: VswrQ16::ONE,
                    ..d
                },
                ConfigError::Thresholds,
            ),
            (MonitorConfig { hold_off: 0, ..d }, ConfigError::ZeroCount),
            (
                MonitorConfig {
                    clear_count: 0,
                    ..d
                },
                ConfigError::ZeroCount,
            ),
            (MonitorConfig { averaging: 0, ..d }, ConfigError::Averaging),
        ];
        for (c, e) in cases {
            assert_eq!(c.validate(16), Err(e));
        }
    }
}
