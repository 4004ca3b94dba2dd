//! A simulated protection pin: remembers its level, can be told to fail writes for a range of
//! readings.

use core::cell::Cell;
use embedded_hal::digital::{ErrorKind, ErrorType, OutputPin};

/// The simulated pin. Starts low: with the default "permit high" sense, an undriven pin
/// inhibits the transmitter. The firmware prints a line when the level changes.
pub struct SimPin {
    high: Cell<bool>,
    seq: Cell<u32>,
    fail: Option<(u32, u32)>,
}

impl SimPin {
    /// A low pin whose writes fail for readings `fail.0..=fail.1`, if given.
    pub fn new(fail: Option<(u32, u32)>) -> Self {
        SimPin {
            high: Cell::new(false),
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

    fn set(&self, high: bool) -> Result<(), ErrorKind> {
        let s = self.seq.get();
        if let Some((a, b)) = self.fail {
            if (a..=b).contains(&s) {
                return Err(ErrorKind::Other);
            }
        }
        self.high.set(high);
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
