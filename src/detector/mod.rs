//! Detector linearization: from what the ADC sees to a level the bridge math can use.
//!
//! | stage | type | gives |
//! |---|---|---|
//! | ADC code → volts | [`Adc`] | volts, or [`DetectorError::Saturated`] at full scale |
//! | log detector (output volts linear in dB) | [`LogDetector`] | dBm from slope and intercept |
//! | diode detector | [`DiodeTable`] | dBm by piecewise-linear interpolation of a calibration table |
//! | averaging | [`Averager`] | the mean of N codes, exact in integers |
//!
//! Supported: linear (amplitude-proportional), square-law (power-proportional), log and
//! table-calibrated detectors. Not supported: temperature compensation of the detector law,
//! and tables with more than `N` points (the capacity is a const generic).
//!
//! Panic policy: nothing in this module panics; bad configuration or readings give a
//! [`DetectorError`].

mod adc;
mod average;
mod diode_table;
mod log_detector;

pub use adc::Adc;
pub use average::Averager;
pub use diode_table::DiodeTable;
pub use log_detector::LogDetector;

/// Why a detector reading or configuration was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum DetectorError {
    /// NaN or infinity in a reading or parameter.
    NotFinite,
    /// The ADC code is at or above full scale: the true level is unknown.
    Saturated,
    /// An ADC resolution outside 1..=24 bits, a non-positive reference or slope.
    BadParameter,
    /// A calibration table with fewer than two points.
    TableTooShort,
    /// A calibration table with more points than its capacity.
    TableTooLong,
    /// A calibration table whose voltages or levels do not strictly increase.
    TableNotMonotonic,
    /// A reading outside the span of the calibration table.
    OutOfTable,
}
