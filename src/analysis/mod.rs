//! Streaming analysis of a sweep: minimum VSWR, resonances, bandwidth under VSWR thresholds,
//! Q from bandwidth, and band-edge alarms. Each is an accumulator fed one point at a time, so
//! no sweep needs to be stored.
//!
//! | accumulator | feeds on | method |
//! |---|---|---|
//! | [`MinimumVswr`] | (f, \|Γ\|) | lowest point, refined by a three-point parabolic vertex fit on \|Γ\|² |
//! | [`Resonances`] | (f, Z) | sign changes of X, interpolated linearly to X = 0 |
//! | [`Bands`] | (f, VSWR) | runs of points under each threshold, edges interpolated linearly in VSWR |
//! | [`LimitWatch`] | (f, VSWR) | points inside a required band whose VSWR exceeds the limit |
//!
//! Sources: the parabolic vertex is the three-point formula of parabolic interpolation
//! (Press et al., *Numerical Recipes*, 3rd ed., §10.3). |Γ|² rather than VSWR is
//! fitted because near a match |Γ|² is smooth (quadratic in f for a series-RLC load) while
//! VSWR has a corner when |Γ| reaches 0. Linear interpolation of crossings and edges is common
//! practice. Q from bandwidth inverts BW = (S − 1)/(Q·√S)·f0 for a series-RLC load matched at
//! resonance (A. D. Yaghjian and S. R. Best, "Impedance, bandwidth, and Q of antennas",
//! IEEE Trans. Antennas Propag. 53(4), 2005 — recalled from memory; the host tests derive it
//! exactly for the series RLC).
//!
//! Not supported: smoothing of noisy sweeps (feed smoothed points), resonances that fall
//! between the first two points' sign (a crossing needs a point on each side).
//!
//! Panic policy: nothing here panics; non-finite points are counted and skipped (see each
//! accumulator's `skipped()`).

mod alarm;
mod bandwidth;
mod minimum;
mod resonance;

pub use alarm::{EdgeAlarm, LimitWatch, VswrLimit};
pub use bandwidth::{q_from_bandwidth, Band, BandTracker, Bands};
pub use minimum::{parabolic_vertex, MinimumVswr, VswrMinimum};
pub use resonance::{impedance, Resonance, ResonanceKind, Resonances};

/// Why an analysis input or result is not valid.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum AnalysisError {
    /// NaN or infinity given.
    NotFinite,
    /// A frequency, bandwidth or threshold out of its physical range (f ≤ 0, S ≤ 1 …).
    OutOfRange,
    /// No capacity left for another threshold.
    Full,
}
