//! A simulated protection pin: remembers its level, can be told to fail writes for a range of
//! readings, and reports level changes.

use core::cell::Cell;
use embedded_hal::digital::{ErrorKind, ErrorType, OutputPin};

/// The simulated pin. Starts low: with the default "permit high" sense, an undriven pin
/// inhibits the transmitter.
pub struct SimPin {
    high: Cell<bool>,
    changed: Cell<bool>,
    seq: Cell<u32>,
    fail: Option<(u32, u32)>,
}

impl SimPin {
    /// A low pin whose writes fail for readings `fail.0..=fail.1`, if given.
    pub fn new(fail: Option<(u32, u32)>) -> Self {
        SimPin {
            high: Cell::new(false),
            changed: Cell::new(false),
            seq: Cell::new(0),
            fail,
        }
    }

    /// Tells the pin which reading is being processed.
    pub fn set_sequence(&self, seq: u32) {
        self.seq.set(seq);
    }

    /// The present level.
    pub fn is_high(&self) -> bool {
        self.high.get()
    }

    /// True once after each change of level.
    pub fn take_changed(&self) -> bool {
        self.changed.replace(false)
    }

    fn set(&self, high: bool) -> Result<(), ErrorKind> {
        let s = self.seq.get();
        if let Some((a, b)) = self.fail {
            if (a..=b).contains(&s) {
                return Err(ErrorKind::Other);
            }
        }
        if self.high.get() != high {
            self.high.set(high);
            self.changed.set(true);
        }
        Ok(())
    }
}

impl ErrorType for &SimPin {
    type Error = ErrorKind;
}

impl OutputPin for &SimPin {
    fn set_low(&mut self) -> Result<(), ErrorKind> {
        self.set(false)
    }
    fn set_high(&mut self) -> Result<(), ErrorKind> {
        self.set(true)
    }
}
