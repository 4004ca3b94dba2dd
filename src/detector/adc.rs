//! ADC code → volts: `V = (code − offset) · reference / 2^bits`.
//!
//! The code at or above `2^bits − 1` (the converter's top code) is reported as saturated,
//! because the true input may be anywhere above it. Codes below the offset read as 0 V.

use super::DetectorError;
use crate::units::Volts;

/// An ADC's transfer function.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Adc {
    bits: u8,
    volts_per_code: f32,
    offset: i32,
}

impl Adc {
    /// An ADC of `bits` resolution (1..=24), full-scale `reference` and a zero offset of
    /// `offset` codes (the code read with no input).
    pub fn new(bits: u8, reference: Volts, offset: i32) -> Result<Self, DetectorError> {
        if !(1..=24).contains(&bits) {
            return Err(DetectorError::BadParameter);
        }
        let r = reference.value();
        if !r.is_finite() {
            return Err(DetectorError::NotFinite);
        }
        if r <= 0.0 {
            return Err(DetectorError::BadParameter);
        }
        let counts = 1u32.wrapping_shl(u32::from(bits)) as f32;
        Ok(Adc {
            bits,
            volts_per_code: r / counts,
            offset,
        })
    }

    /// The top code, `2^bits − 1`; a reading at or above it is saturated.
    pub fn full_scale(&self) -> u32 {
        1u32.wrapping_shl(u32::from(self.bits)).wrapping_sub(1)
    }

    /// The zero offset in codes (the code read with no input).
    pub fn offset(&self) -> i32 {
        self.offset
    }

    /// Volts per code (one LSB).
    pub fn lsb(&self) -> Volts {
        Volts::new(self.volts_per_code)
    }

    /// The offset-corrected code, clamped at 0, or [`DetectorError::Saturated`].
    pub fn net_code(&self, code: u32) -> Result<u32, DetectorError> {
        if code >= self.full_scale() {
            return Err(DetectorError::Saturated);
        }
        let net = i64::from(code) - i64::from(self.offset);
        Ok(net.clamp(0, i64::from(u32::MAX)) as u32)
    }

    /// The input voltage for a code, or [`DetectorError::Saturated`] at full scale.
    pub fn volts(&self, code: u32) -> Result<Volts, DetectorError> {
        let net = self.net_code(code)?;
        Ok(Volts::new(net as f32 * self.volts_per_code))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (bits, reference V, offset, code, expected V or None for saturated)
    const VECTORS: [(u8, f32, i32, u32, Option<f32>); 5] = [
        (12, 3.3, 0, 2048, Some(1.65)),
        (12, 3.3, 10, 10, Some(0.0)),
        (12, 3.3, 10, 5, Some(0.0)),
        (12, 3.3, 0, 4095, None),
        (16, 2.5, 0, 32768, Some(1.25)),
    ];
    const BOUND: f32 = 1e-6;

    #[test]
    fn vectors() {
        for &(bits, r, off, code, want) in VECTORS.iter() {
            let adc = Adc::new(bits, Volts::new(r), off).unwrap();
            match (adc.volts(code), want) {
                (Ok(v), Some(w)) => assert!((v.value() - w).abs() < BOUND),
                (Err(DetectorError::Saturated), None) => {}
                other => panic!("{other:?}"),
            }
        }
    }

    #[test]
    fn bad_parameters() {
        assert!(Adc::new(0, Volts::new(3.3), 0).is_err());
        assert!(Adc::new(25, Volts::new(3.3), 0).is_err());
        assert!(Adc::new(12, Volts::new(-1.0), 0).is_err());
        assert!(Adc::new(12, Volts::new(f32::NAN), 0).is_err());
    }
}
