//! The reading a monitor takes, and the small trait through which it gets VSWR and return loss
//! from a pair of powers.

use crate::fixed::{DbQ16, VswrQ16};

/// One reading of the line: forward and reflected power in integer microwatts.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PowerReading {
    /// Forward (incident) power, µW.
    pub forward_uw: u32,
    /// Reflected power, µW.
    pub reflected_uw: u32,
}

impl PowerReading {
    /// A reading from forward and reflected power in µW.
    pub const fn new(forward_uw: u32, reflected_uw: u32) -> Self {
        PowerReading {
            forward_uw,
            reflected_uw,
        }
    }

    /// Delivered power, forward − reflected, µW (0 when reflected ≥ forward).
    pub const fn delivered_uw(&self) -> u32 {
        self.forward_uw.saturating_sub(self.reflected_uw)
    }
}

/// VSWR and return loss of a reading, both Q16.16 ([`crate::fixed`] formats).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LineFigures {
    /// VSWR, 1 to 1000.
    pub vswr: VswrQ16,
    /// Return loss, 0 to 100 dB (positive: larger is a better match).
    pub return_loss: DbQ16,
}

/// A fixed-point chain that turns forward and reflected power into VSWR and return loss.
///
/// Contract: never panics; reflected ≥ forward (including forward = 0) gives the VSWR ceiling
/// and 0 dB; reflected = 0 < forward gives VSWR 1 and the return-loss ceiling.
pub trait LineMath {
    /// VSWR and return loss for one reading.
    fn figures(&self, reading: PowerReading) -> LineFigures;
}
