//! Detector voltage → power for a peak (envelope) diode detector on a coupler port.
//!
//! Law (common practice for Schottky peak detectors well above their square-law region, i.e.
//! outputs above roughly 100 mV): V_out ≈ V_peak − V_offset, and P = V_peak² / (2·R), so
//! P = k · (V_out + V_offset)²; k folds in the coupling factor and the load. Both constants
//! come from the first calibration (README). Integer only; saturates, never panics.

/// One channel's calibration.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DetectorCal {
    /// Diode offset added back to the output, mV.
    pub offset_mv: u32,
    /// Power per mV² of (output + offset), µW, Q16.16.
    pub uw_per_mv2_q16: u32,
}

impl DetectorCal {
    /// Line power in µW for a detector output in µV (negative reads as 0 V output, which
    /// still gives the offset's power: keep the offset below the noise of an idle line, or 0).
    pub fn power_uw(&self, output_uv: i32) -> u32 {
        let out_mv = (output_uv.max(0) as u32) / 1000;
        if out_mv == 0 {
            return 0;
        }
        let v = u64::from(out_mv.saturating_add(self.offset_mv));
        let p = v
            .saturating_mul(v)
            .saturating_mul(u64::from(self.uw_per_mv2_q16))
            >> 16;
        u32::try_from(p).unwrap_or(u32::MAX)
    }
}
