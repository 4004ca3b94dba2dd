//! Response-only calibration for scalar bridges: the open/short average.
//!
//! A scalar bridge reads |Γm| only. With a directivity and source-match error present, an
//! open reads |T|·|1 + ε| and a short |T|·|1 − ε| to first order (ε ∝ e00/T + e11), so their
//! mean cancels the first-order ripple and leaves the tracking |T| (common practice for
//! scalar reflection bridges; it follows from the one-port error model of the
//! [module documentation](super) expanded to first order in e00 and e11). The correction is
//! then |Γ| = |Γm|/|T|.
//!
//! Not supported: removing directivity (a scalar reading cannot: the residual directivity
//! stays as the measurement floor, which the uncertainty module accounts for).
//!
//! Panic policy: nothing here panics; bad input gives a [`CalError`].

use super::{finite, CalError};
use crate::reflection::Gamma;
use crate::units::VoltageRatio;
use crate::vector::RAW_GAMMA_LIMIT;

/// The smallest tracking accepted (−80 dB): a reading this low is no bridge output.
pub const MIN_TRACKING: f32 = 1.0e-4;

/// Scalar tracking of a bridge from open and short readings.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ResponseCal {
    tracking: f32,
}

/// A scalar corrected reading.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ScalarCorrected {
    /// The corrected |Γ|, held in 0..=1.
    pub gamma: Gamma,
    /// True when the corrected value exceeded 1 and was clipped to 1.
    pub clipped: bool,
}

fn check_reading(r: VoltageRatio) -> Result<f32, CalError> {
    let v = finite(r.value())?;
    if (0.0..=RAW_GAMMA_LIMIT).contains(&v) {
        Ok(v)
    } else {
        Err(CalError::OutOfRange)
    }
}

impl ResponseCal {
    /// The tracking as the mean of the open and short readings (both |Γm|, linear).
    pub fn from_open_short(open: VoltageRatio, short: VoltageRatio) -> Result<Self, CalError> {
        let o = check_reading(open)?;
        let s = check_reading(short)?;
        let tracking = 0.5 * (o + s);
        if tracking < MIN_TRACKING {
            return Err(CalError::Degenerate);
        }
        Ok(Self { tracking })
    }

    /// The tracking |T|.
    pub fn tracking(&self) -> VoltageRatio {
        VoltageRatio::new(self.tracking)
    }

    /// |Γ| = |Γm|/|T|, clipped to 1 (and flagged) above 1.
    pub fn correct(&self, raw: VoltageRatio) -> Result<ScalarCorrected, CalError> {
        let r = check_reading(raw)?;
        let g = r / self.tracking;
        Ok(ScalarCorrected {
            gamma: Gamma::saturating(g),
            clipped: g > 1.0,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn average_cancels_first_order_ripple() {
        // T = 0.8, ε = 0.05: open 0.84, short 0.76 → T = 0.8 exactly.
        let c =
            ResponseCal::from_open_short(VoltageRatio::new(0.84), VoltageRatio::new(0.76)).unwrap();
        assert!((c.tracking().value() - 0.8).abs() < 1e-6);
        let r = c.correct(VoltageRatio::new(0.4)).unwrap();
        assert!((r.gamma.value() - 0.5).abs() < 1e-6);
        assert!(!r.clipped);
        let r = c.correct(VoltageRatio::new(0.84)).unwrap();
        assert!(r.clipped);
        assert_eq!(r.gamma, Gamma::TOTAL);
        assert_eq!(
            ResponseCal::from_open_short(VoltageRatio::new(0.0), VoltageRatio::new(0.0)),
            Err(CalError::Degenerate)
        );
        assert_eq!(
            c.correct(VoltageRatio::new(f32::NAN)),
            Err(CalError::NotFinite)
        );
    }
}
