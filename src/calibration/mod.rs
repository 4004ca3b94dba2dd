//! One-port calibration: the three-term error model, its solution from open, short and
//! load readings, its correction, a per-frequency table of terms, and a response-only
//! calibration for scalar bridges.
//!
//! # The model
//! The standard one-port (three-term) error model of vector network analyzer calibration,
//! as published in Agilent Application Note 1287-3, *Applying Error Correction to Network
//! Analyzer Measurements*, and in D. M. Pozar, *Microwave Engineering*, §4.5 / §11 (flow-graph
//! analysis of a one-port reflectometer). An error two-port between an ideal reflectometer
//! and the device gives
//!
//! ```text
//! Γm = e00 + e10e01·Γa / (1 − e11·Γa)
//! ```
//!
//! with e00 the directivity, e11 the source match and e10e01 the reflection tracking; Γa is
//! the device's actual Γ and Γm the raw reading. Its inverse, the correction, is
//!
//! ```text
//! Γa = (Γm − e00) / (e10e01 + e11·(Γm − e00))
//! ```
//!
//! — one complex subtraction, one multiply-add and one complex division per point
//! ([`OnePortTerms::correct`]).
//!
//! # Solving the terms
//! Three standards of known Γ (a1, a2, a3) measured as m1, m2, m3 give the linear system
//! `m = e00 + a·m·e11 + a·Δ` with Δ = e10e01 − e00·e11, solved exactly
//! ([`OnePortTerms::from_known`]). The standards' Γ come from [`standards`]: ideal
//! (+1, −1, 0) or modelled (open with a fringing-capacitance polynomial and offset delay,
//! short with an inductance polynomial and offset delay, load with its own Γ).
//!
//! # What is and is not supported
//! Supported: one-port reflection, any three distinct standards, a per-frequency table with
//! linear interpolation of each term between calibration frequencies ([`table`]), and a
//! scalar response-only calibration ([`response`]). Not supported: two-port (transmission)
//! terms, offset loss of the standards (the offsets are lossless lines of the reference
//! impedance), sliding loads, and extrapolation outside the calibrated frequency range (a
//! typed error).
//!
//! Panic policy: nothing in this module panics and no function returns NaN or infinity;
//! bad input gives a [`CalError`].

pub mod record;
pub mod response;
pub mod standards;
pub mod table;
pub mod terms;

pub use response::{ResponseCal, ScalarCorrected};
pub use standards::{LoadStandard, OpenStandard, ShortStandard, StandardGammas, StandardsModel};
pub use table::{CalPoint, CalTable};
pub use terms::OnePortTerms;

/// Why a calibration step failed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum CalError {
    /// NaN or infinity given.
    NotFinite,
    /// A value outside its accepted range (a raw Γ component beyond
    /// [`crate::vector::RAW_GAMMA_LIMIT`], a negative frequency, a non-positive Z0, …).
    OutOfRange,
    /// The standards or their readings do not determine the terms (two alike, or a
    /// tracking term too small), or interpolated terms became degenerate.
    Degenerate,
    /// The corrected Γ would exceed [`terms::CORRECTED_LIMIT`]: the reading does not fit
    /// the calibration (wrong port, broken cable, or a calibration from another setup).
    Unphysical,
    /// The frequency is outside the calibrated range of the table.
    FrequencyOutOfRange,
    /// The table holds no calibration point.
    NotCalibrated,
    /// The table is full.
    Full,
}

#[inline]
pub(crate) fn finite(x: f32) -> Result<f32, CalError> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(CalError::NotFinite)
    }
}
