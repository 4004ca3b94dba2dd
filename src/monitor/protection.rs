//! The transmitter-protection output: one embedded-hal 1.0 `OutputPin` driven to "permit" while
//! the alarm is clear and to "inhibit" while it is tripped.
//!
//! Fail-safe: the pin is driven on every reading, not only on a change, so a level lost to a
//! glitch or a failed write is restored at the next reading; a failed write is counted and
//! reported, and never changes the alarm state. Wire the output so that no drive (reset, power
//! loss, broken wire) inhibits the transmitter, and hold it at inhibit until the first reading.

use embedded_hal::digital::OutputPin;

use super::alarm::AlarmState;

/// Which pin level permits the transmitter.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum PinSense {
    /// High permits, low inhibits (a pulled-down permit line fails safe).
    #[default]
    PermitHigh,
    /// Low permits, high inhibits.
    PermitLow,
}

/// A protection output over an `OutputPin`.
#[derive(Debug)]
pub struct Protection<P> {
    pin: P,
    sense: PinSense,
    errors: u32,
}

impl<P: OutputPin> Protection<P> {
    /// Wraps a pin; nothing is written until [`drive`](Self::drive).
    pub fn new(pin: P, sense: PinSense) -> Self {
        Protection {
            pin,
            sense,
            errors: 0,
        }
    }

    /// Drives the pin for `state`. Returns false (and counts the error) if the write failed.
    pub fn drive(&mut self, state: AlarmState) -> bool {
        let high = matches!(
            (state, self.sense),
            (AlarmState::Clear, PinSense::PermitHigh) | (AlarmState::Tripped, PinSense::PermitLow)
        );
        let ok = if high {
            self.pin.set_high()
        } else {
            self.pin.set_low()
        }
        .is_ok();
        if !ok {
            self.errors = self.errors.saturating_add(1);
        }
        ok
    }

    /// Failed writes so far.
    pub fn error_count(&self) -> u32 {
        self.errors
    }

    /// The pin, e.g. to inspect a test double.
    pub fn pin(&self) -> &P {
        &self.pin
    }

    /// Gives the pin back.
    pub fn release(self) -> P {
        self.pin
    }
}
