//! Log detector: output volts rise linearly with input level in dB,
//! `V = slope · (P_dBm − intercept_dBm)`, so `P_dBm = V / slope + intercept`.
//!
//! This is the transfer function that logarithmic-amplifier detector datasheets specify by a
//! slope (V/dB) and an intercept (dBm); the values are the user's, from their part's datasheet
//! or their own calibration.

use super::DetectorError;
use crate::units::{Dbm, Volts};

/// A logarithmic detector's transfer function.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LogDetector {
    slope_v_per_db: f32,
    intercept: Dbm,
}

impl LogDetector {
    /// A detector with `slope` volts per dB (> 0) and the level `intercept` at which its
    /// output would be 0 V.
    pub fn new(slope: Volts, intercept: Dbm) -> Result<Self, DetectorError> {
        let s = slope.value();
        if !s.is_finite() || !intercept.is_finite() {
            return Err(DetectorError::NotFinite);
        }
        if s <= 0.0 {
            return Err(DetectorError::BadParameter);
        }
        Ok(LogDetector {
            slope_v_per_db: s,
            intercept,
        })
    }

    /// Slope in volts per dB.
    pub fn slope(&self) -> Volts {
        Volts::new(self.slope_v_per_db)
    }

    /// The level at which the output would be 0 V.
    pub fn intercept(&self) -> Dbm {
        self.intercept
    }

    /// Input level for an output voltage.
    pub fn level(&self, output: Volts) -> Result<Dbm, DetectorError> {
        let v = output.value();
        if !v.is_finite() {
            return Err(DetectorError::NotFinite);
        }
        let p = v / self.slope_v_per_db + self.intercept.value();
        if p.is_finite() {
            Ok(Dbm::new(p))
        } else {
            Err(DetectorError::NotFinite)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (slope V/dB, intercept dBm, output V, expected dBm): worked from the transfer function.
    const VECTORS: [(f32, f32, f32, f32); 3] = [
        (0.025, -84.0, 2.1, 0.0),
        (0.025, -84.0, 0.5, -64.0),
        (0.021, -90.0, 1.05, -40.0),
    ];
    const BOUND_DB: f32 = 1e-4;

    #[test]
    fn vectors() {
        for &(s, i, v, want) in VECTORS.iter() {
            let d = LogDetector::new(Volts::new(s), Dbm::new(i)).unwrap();
            let got = d.level(Volts::new(v)).unwrap().value();
            assert!((got - want).abs() < BOUND_DB, "{got} {want}");
        }
    }

    #[test]
    fn refuses_bad() {
        assert!(LogDetector::new(Volts::new(0.0), Dbm::new(-84.0)).is_err());
        let d = LogDetector::new(Volts::new(0.025), Dbm::new(-84.0)).unwrap();
        assert_eq!(d.level(Volts::new(f32::NAN)), Err(DetectorError::NotFinite));
    }
}
