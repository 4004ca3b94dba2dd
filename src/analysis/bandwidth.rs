//! Bandwidth under VSWR thresholds: every separate band, with interpolated edges, and Q.

use super::AnalysisError;
use crate::reflection::Vswr;
use crate::units::Hertz;
use heapless::Vec;

/// One run of points whose VSWR is at or under a threshold.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Band {
    /// Lower edge: where VSWR crosses the threshold, interpolated linearly in VSWR between the
    /// two points around it; the first point of the sweep when `lower_open`.
    pub lower: Hertz,
    /// Upper edge, likewise; the last point seen when `upper_open`.
    pub upper: Hertz,
    /// True when the band starts at the first point (it may extend below the sweep).
    pub lower_open: bool,
    /// True when the band ends at the last point (it may extend above the sweep).
    pub upper_open: bool,
    /// The lowest measured VSWR inside the band.
    pub best: Vswr,
    /// Frequency of that point.
    pub best_frequency: Hertz,
}

impl Band {
    /// upper − lower.
    pub fn width(&self) -> Hertz {
        self.upper - self.lower
    }

    /// (lower + upper)/2.
    pub fn centre(&self) -> Hertz {
        Hertz::new(0.5 * (self.lower.value() + self.upper.value()))
    }

    /// True when both edges were found inside the sweep.
    pub fn is_closed(&self) -> bool {
        !self.lower_open && !self.upper_open
    }
}

/// Bands under one VSWR threshold; keeps the first `B` bands. Feed points in increasing
/// frequency and call [`BandTracker::finish`] after the last.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BandTracker<const B: usize> {
    threshold: Vswr,
    last: Option<(f32, f32)>,
    open: Option<Band>,
    bands: Vec<Band, B>,
    missed: usize,
    skipped: usize,
}

impl<const B: usize> BandTracker<B> {
    /// A tracker for the bands where VSWR ≤ `threshold`.
    pub fn new(threshold: Vswr) -> Self {
        Self {
            threshold,
            last: None,
            open: None,
            bands: Vec::new(),
            missed: 0,
            skipped: 0,
        }
    }

    /// The threshold.
    pub fn threshold(&self) -> Vswr {
        self.threshold
    }

    fn close(&mut self, band: Band) {
        if self.bands.push(band).is_err() {
            self.missed = self.missed.saturating_add(1);
        }
    }

    /// Feed one point.
    pub fn push(&mut self, frequency: Hertz, vswr: Vswr) {
        let (f, s) = (frequency.value(), vswr.value());
        if !f.is_finite() || self.last.is_some_and(|(lf, _)| f <= lf) {
            self.skipped = self.skipped.saturating_add(1);
            return;
        }
        let t = self.threshold.value();
        let inside = s <= t;
        match (self.last, self.open.as_mut()) {
            (None, _) => {
                if inside {
                    self.open = Some(Band {
                        lower: frequency,
                        upper: frequency,
                        lower_open: true,
                        upper_open: true,
                        best: vswr,
                        best_frequency: frequency,
                    });
                }
            }
            (Some((f1, s1)), Some(band)) => {
                if inside {
                    band.upper = frequency;
                    if s < band.best.value() {
                        band.best = vswr;
                        band.best_frequency = frequency;
                    }
                } else {
                    // s1 ≤ t < s, so s − s1 > 0.
                    let u = ((t - s1) / (s - s1)).clamp(0.0, 1.0);
                    band.upper = Hertz::new(f1 + u * (f - f1));
                    band.upper_open = false;
                    let b = *band;
                    self.open = None;
                    self.close(b);
                }
            }
            (Some((f1, s1)), None) => {
                if inside {
                    // s1 > t ≥ s, so s1 − s > 0.
                    let u = ((s1 - t) / (s1 - s)).clamp(0.0, 1.0);
                    self.open = Some(Band {
                        lower: Hertz::new(f1 + u * (f - f1)),
                        upper: frequency,
                        lower_open: false,
                        upper_open: true,
                        best: vswr,
                        best_frequency: frequency,
                    });
                }
            }
        }
        self.last = Some((f, s));
    }

    /// End of sweep: a band still open keeps `upper_open` and the last point as its edge.
    pub fn finish(&mut self) {
        if let Some(b) = self.open.take() {
            self.close(b);
        }
    }

    /// The bands closed so far (all of them after [`BandTracker::finish`]).
    pub fn bands(&self) -> &[Band] {
        &self.bands
    }

    /// The widest band, if any.
    pub fn widest(&self) -> Option<&Band> {
        self.bands
            .iter()
            .fold(None, |acc: Option<&Band>, b| match acc {
                Some(a) if a.width().value() >= b.width().value() => Some(a),
                _ => Some(b),
            })
    }

    /// Bands found after the capacity `B` was full.
    pub fn missed(&self) -> usize {
        self.missed
    }

    /// Points refused (non-finite, or frequency not increasing).
    pub fn skipped(&self) -> usize {
        self.skipped
    }
}

/// Bands under up to `T` thresholds at once, each keeping up to `B` bands.
#[derive(Clone, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Bands<const T: usize, const B: usize> {
    trackers: Vec<BandTracker<B>, T>,
}

impl<const T: usize, const B: usize> Bands<T, B> {
    /// No thresholds yet.
    pub const fn new() -> Self {
        Self {
            trackers: Vec::new(),
        }
    }

    /// Add a threshold; [`AnalysisError::Full`] when `T` are already set.
    pub fn add_threshold(&mut self, threshold: Vswr) -> Result<(), AnalysisError> {
        self.trackers
            .push(BandTracker::new(threshold))
            .map_err(|_| AnalysisError::Full)
    }

    /// Feed one point to every threshold.
    pub fn push(&mut self, frequency: Hertz, vswr: Vswr) {
        for t in self.trackers.iter_mut() {
            t.push(frequency, vswr);
        }
    }

    /// End of sweep for every threshold.
    pub fn finish(&mut self) {
        for t in self.trackers.iter_mut() {
            t.finish();
        }
    }

    /// The trackers, in the order their thresholds were added.
    pub fn thresholds(&self) -> &[BandTracker<B>] {
        &self.trackers
    }
}

/// Q of a series-RLC-like load matched at resonance, from its bandwidth under VSWR threshold
/// `s`: Q = (S − 1)/(√S · BW/f0) (inverse of BW = (S − 1)/(Q·√S)·f0, Yaghjian and Best 2005,
/// recalled from memory). Needs f0 > 0, BW > 0 and S > 1, all finite.
pub fn q_from_bandwidth(f0: Hertz, bandwidth: Hertz, s: Vswr) -> Result<f32, AnalysisError> {
    let (f0, bw, s) = (f0.value(), bandwidth.value(), s.value());
    if !f0.is_finite() || !bw.is_finite() || !s.is_finite() {
        return Err(AnalysisError::NotFinite);
    }
    if f0 <= 0.0 || bw <= 0.0 || s <= 1.0 {
        return Err(AnalysisError::OutOfRange);
    }
    let q = (s - 1.0) * f0 / (libm::sqrtf(s) * bw);
    // Underflow to 0 or overflow to infinity is out of range, not a Q.
    if q.is_finite() && q > 0.0 {
        Ok(q)
    } else {
        Err(AnalysisError::OutOfRange)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn v(x: f32) -> Vswr {
        Vswr::new(x).unwrap()
    }

    #[test]
    fn two_bands_with_interpolated_edges() {
        // VSWR 3, 1, 3 | 1.5, 1.2 (end): threshold 2 → [1.5, 2.5] closed and [3.33…, 5] open.
        let pts = [(1.0, 3.0), (2.0, 1.0), (3.0, 3.0), (4.0, 1.5), (5.0, 1.2)];
        let mut b = Bands::<2, 4>::new();
        b.add_threshold(v(2.0)).unwrap();
        b.add_threshold(v(1.1)).unwrap();
        for (f, s) in pts {
            b.push(Hertz::new(f), v(s));
        }
        b.finish();
        let t2 = &b.thresholds()[0];
        assert_eq!(t2.bands().len(), 2);
        let a = t2.bands()[0];
        assert!((a.lower.value() - 1.5).abs() < 1e-6 && (a.upper.value() - 2.5).abs() < 1e-6);
        assert!(a.is_closed());
        assert_eq!(a.best.value(), 1.0);
        let c = t2.bands()[1];
        assert!((c.lower.value() - (3.0 + 1.0 / 1.5)).abs() < 1e-5);
        assert!(c.upper_open && c.upper.value() == 5.0);
        assert_eq!(b.thresholds()[1].bands().len(), 1);
        assert_eq!(t2.widest().unwrap().lower, c.lower);
    }

    /// (f0, BW, S, expected Q) worked by hand from Q = (S − 1)f0/(√S·BW).
    const Q_VECTORS: [(f32, f32, f32, f32); 2] =
        [(100.0, 5.0, 4.0, 30.0), (14.0e6, 0.35e6, 2.0, 28.284_271)];
    /// Relative error allowed on Q.
    const Q_TOL: f32 = 1.0e-5;

    #[test]
    fn q_vectors() {
        for &(f0, bw, s, q) in Q_VECTORS.iter() {
            let got = q_from_bandwidth(Hertz::new(f0), Hertz::new(bw), v(s)).unwrap();
            assert!((got - q).abs() < Q_TOL * q, "{got}");
        }
        assert_eq!(
            q_from_bandwidth(Hertz::new(1.0), Hertz::new(0.0), v(2.0)),
            Err(AnalysisError::OutOfRange)
        );
    }
}
