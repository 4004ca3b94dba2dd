//! The two hardware edges of a sweep: a frequency source and a point reader.
//!
//! Both are tiny traits so that a sweep runs the same on real hardware (a synthesizer and a
//! bridge with its detectors) and on a simulation (a model of a load).

use crate::units::Hertz;

/// Something that produces the test signal: a synthesizer, a DDS, a simulated source.
pub trait FrequencySource {
    /// The source's own error type.
    type Error;

    /// Tune to `frequency`.
    fn set_frequency(&mut self, frequency: Hertz) -> Result<(), Self::Error>;

    /// Microseconds to wait after tuning from `from` (`None` for the first point) to `to`
    /// before a reading is valid: lock time of the synthesizer plus the detectors' settling.
    fn settling_time_us(&self, from: Option<Hertz>, to: Hertz) -> u32;
}

/// Something that takes one reading at the current frequency: a calibrated bridge returning
/// complex Γ, a scalar detector chain returning |Γ|, or a simulation.
pub trait PointReader {
    /// What one reading is (complex Γ, |Γ|, raw codes …).
    type Reading;
    /// The reader's own error type.
    type Error;

    /// Take the reading for the point at `frequency` (the source is already tuned and settled).
    fn read_point(&mut self, frequency: Hertz) -> Result<Self::Reading, Self::Error>;
}
