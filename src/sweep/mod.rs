//! Frequency sweeps: which frequencies to visit ([`SweepPlan`]), the hardware edges that set a
//! frequency and take a reading ([`FrequencySource`], [`PointReader`]), and a runner
//! ([`run_sweep`]) that streams every point to a sink as soon as it is read.
//!
//! Method: a plan is a start/stop pair (or a centre and span), a point count bounded by a const
//! generic capacity, and linear or logarithmic spacing. The runner sets each frequency, waits
//! the source's settling time, reads, and hands the point to the caller's sink (a closure or a
//! [`PointSink`]); a progress callback sees the count and may cancel. Nothing is stored by the
//! runner, so scalar analysis (see [`crate::analysis`]) needs no stored sweep; a caller that
//! wants the whole sweep (distance to fault, export) stores it in its own buffer.
//!
//! Supported: linear and logarithmic spacing, 1..=N points, any reading type. Not supported:
//! segmented or list sweeps, power sweeps, dwell per point beyond the source's settling time.
//!
//! Panic policy: nothing in this module panics; bad plans give a [`SweepError`], hardware
//! failures come back as [`RunError`] with the index of the failed point.

mod driver;
mod plan;
mod run;

pub use driver::{FrequencySource, PointReader};
pub use plan::{Spacing, SweepPlan};
pub use run::{
    run_sweep, Flow, NoProgress, PointSink, Progress, RunError, SweepOutcome, SweepPoint,
};

/// Why a sweep plan is not valid.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum SweepError {
    /// A frequency or span is NaN or infinite.
    NotFinite,
    /// A frequency is zero or negative, or stop is below start.
    OutOfRange,
    /// More points than the plan's capacity `N`.
    TooManyPoints,
    /// Zero points, or one point with stop ≠ start, or several points over a zero span.
    TooFewPoints,
}
