//! A fixed-capacity table of error terms per calibration frequency, with interpolation.
//!
//! Points are kept sorted by frequency. Between two calibration frequencies each term is
//! interpolated linearly in its real and imaginary parts (common practice). This is accurate
//! when the terms change little between neighbouring points: a term that turns by phase φ
//! between two points is off by up to about φ²/8 of its magnitude at mid-step (chord of an
//! arc), so calibrate densely enough for the longest cable between bridge and port (the
//! tracking term turns by 2ωτ). Outside the calibrated range the table refuses with
//! [`CalError::FrequencyOutOfRange`]; it never extrapolates.
//!
//! Panic policy: nothing here panics; bad input gives a [`CalError`].

use heapless::Vec;
use num_complex::Complex32;

use super::standards::StandardsModel;
use super::terms::OnePortTerms;
use super::{finite, CalError};
use crate::units::Hertz;

/// One calibration point: a frequency and its terms.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CalPoint {
    /// The calibration frequency.
    pub frequency: Hertz,
    /// The error terms at that frequency.
    pub terms: OnePortTerms,
}

/// Up to `N` calibration points, sorted by frequency.
#[derive(Clone, Debug, PartialEq)]
pub struct CalTable<const N: usize> {
    points: Vec<CalPoint, N>,
}

#[cfg(feature = "defmt")]
impl<const N: usize> defmt::Format for CalTable<N> {
    fn format(&self, f: defmt::Formatter) {
        defmt::write!(
            f,
            "CalTable {{ points: {=usize}/{=usize} }}",
            self.points.len(),
            N
        )
    }
}

impl<const N: usize> Default for CalTable<N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const N: usize> CalTable<N> {
    /// An empty table.
    pub const fn new() -> Self {
        Self { points: Vec::new() }
    }

    /// Number of points held.
    pub fn len(&self) -> usize {
        self.points.len()
    }

    /// True when the table holds no point.
    pub fn is_empty(&self) -> bool {
        self.points.is_empty()
    }

    /// The capacity `N`.
    pub const fn capacity(&self) -> usize {
        N
    }

    /// Removes every point.
    pub fn clear(&mut self) {
        self.points.clear();
    }

    /// The points, sorted by ascending frequency.
    pub fn points(&self) -> &[CalPoint] {
        &self.points
    }

    /// The lowest and highest calibrated frequency, or `None` when empty.
    pub fn range(&self) -> Option<(Hertz, Hertz)> {
        match (self.points.first(), self.points.last()) {
            (Some(a), Some(b)) => Some((a.frequency, b.frequency)),
            _ => None,
        }
    }

    /// Adds the terms for frequency `f` (≥ 0), keeping the order; terms already held for
    /// exactly `f` are replaced. [`CalError::Full`] when `N` points are held.
    pub fn insert(&mut self, f: Hertz, terms: OnePortTerms) -> Result<(), CalError> {
        let fv = finite(f.value())?;
        if fv < 0.0 {
            return Err(CalError::OutOfRange);
        }
        let idx = self.points.partition_point(|p| p.frequency.value() < fv);
        let point = CalPoint {
            frequency: Hertz::new(fv),
            terms,
        };
        if let Some(existing) = self.points.get_mut(idx) {
            if existing.frequency.value() == fv {
                *existing = point;
                return Ok(());
            }
        }
        // Append, then move the new point down to `idx` by adjacent swaps (no indexing,
        // no panic path: `heapless::Vec::insert` asserts its index).
        self.points.push(point).map_err(|_| CalError::Full)?;
        let s = self.points.as_mut_slice();
        let mut k = s.len();
        while k > idx.saturating_add(1) {
            if let Some([a, b]) = k.checked_sub(2).and_then(|lo| s.get_mut(lo..k)) {
                core::mem::swap(a, b);
            }
            k -= 1;
        }
        Ok(())
    }

    /// Solves the terms at `f` from raw open, short and load readings and the standards'
    /// `model` ([`OnePortTerms::from_standards`]) and inserts them.
    pub fn calibrate_point(
        &mut self,
        f: Hertz,
        measured_open: Complex32,
        measured_short: Complex32,
        measured_load: Complex32,
        model: &StandardsModel,
    ) -> Result<OnePortTerms, CalError> {
        let terms =
            OnePortTerms::from_standards(measured_open, measured_short, measured_load, model, f)?;
        self.insert(f, terms)?;
        Ok(terms)
    }

    /// The terms at frequency `f`: the stored ones at a calibration frequency, linearly
    /// interpolated between two, [`CalError::FrequencyOutOfRange`] outside the range and
    /// [`CalError::NotCalibrated`] for an empty table.
    pub fn terms_at(&self, f: Hertz) -> Result<OnePortTerms, CalError> {
        let fv = finite(f.value())?;
        let (lo, hi) = self.range().ok_or(CalError::NotCalibrated)?;
        if fv < lo.value() || fv > hi.value() {
            return Err(CalError::FrequencyOutOfRange);
        }
        let idx = self.points.partition_point(|p| p.frequency.value() < fv);
        let upper = self.points.get(idx).ok_or(CalError::FrequencyOutOfRange)?;
        if upper.frequency.value() == fv {
            return Ok(upper.terms);
        }
        let lower = idx
            .checked_sub(1)
            .and_then(|i| self.points.get(i))
            .ok_or(CalError::FrequencyOutOfRange)?;
        let span = upper.frequency.value() - lower.frequency.value();
        if span.is_nan() || span <= 0.0 {
            return Err(CalError::Degenerate);
        }
        let t = (fv - lower.frequency.value()) / span;
        lower.terms.lerp(&upper.terms, t.clamp(0.0, 1.0))
    }

    /// The corrected Γ of raw reading `raw` at frequency `f`.
    pub fn correct(&self, f: Hertz, raw: Complex32) -> Result<Complex32, CalError> {
        self.terms_at(f)?.correct(raw)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn terms(x: f32) -> OnePortTerms {
        OnePortTerms::new(
            Complex32::new(x, 0.0),
            Complex32::new(0.0, x),
            Complex32::new(1.0, x),
        )
        .unwrap()
    }

    #[test]
    fn insert_sorts_and_replaces() {
        let mut t = CalTable::<3>::new();
        t.insert(Hertz::new(3.0e6), terms(0.3)).unwrap();
        t.insert(Hertz::new(1.0e6), terms(0.1)).unwrap();
        t.insert(Hertz::new(2.0e6), terms(0.2)).unwrap();
        t.insert(Hertz::new(2.0e6), terms(0.25)).unwrap();
        assert_eq!(t.len(), 3);
        assert_eq!(t.insert(Hertz::new(4.0e6), terms(0.4)), Err(CalError::Full));
        let f: [f32; 3] = core::array::from_fn(|i| t.points().get(i).unwrap().frequency.value());
        assert_eq!(f, [1.0e6, 2.0e6, 3.0e6]);
        assert_eq!(t.terms_at(Hertz::new(2.0e6)).unwrap(), terms(0.25));
    }

    #[test]
    fn interpolates_inside_refuses_outside() {
        let mut t = CalTable::<4>::new();
        assert_eq!(t.terms_at(Hertz::new(1.0)), Err(CalError::NotCalibrated));
        t.insert(Hertz::new(1.0e6), terms(0.1)).unwrap();
        t.insert(Hertz::new(2.0e6), terms(0.3)).unwrap();
        // Midway: every term is the mean (linear interpolation).
        let m = t.terms_at(Hertz::new(1.5e6)).unwrap();
        assert!((m.directivity() - Complex32::new(0.2, 0.0)).norm() < 1e-6);
        assert!((m.tracking() - Complex32::new(1.0, 0.2)).norm() < 1e-6);
        assert_eq!(
            t.terms_at(Hertz::new(0.99e6)),
            Err(CalError::FrequencyOutOfRange)
        );
        assert_eq!(
            t.terms_at(Hertz::new(2.01e6)),
            Err(CalError::FrequencyOutOfRange)
        );
        assert_eq!(t.terms_at(Hertz::new(f32::NAN)), Err(CalError::NotFinite));
    }
}
