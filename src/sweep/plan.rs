//! Sweep plans: start/stop or centre/span, a point count, linear or logarithmic spacing.

use super::SweepError;
use crate::units::Hertz;

/// How the points of a sweep are spread between start and stop.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Spacing {
    /// Equal steps in hertz: f_i = start + i·(stop − start)/(n − 1).
    Linear,
    /// Equal ratios: f_i = start·(stop/start)^(i/(n − 1)).
    Logarithmic,
}

/// The frequencies a sweep visits: at most `N` points (the caller's fixed capacity).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SweepPlan<const N: usize> {
    start: Hertz,
    stop: Hertz,
    points: usize,
    spacing: Spacing,
}

impl<const N: usize> SweepPlan<N> {
    /// A plan from `start` to `stop` (both included) with `points` points.
    ///
    /// Needs finite frequencies with 0 < start ≤ stop, 1 ≤ points ≤ N, and start < stop
    /// when there are two points or more (one point needs start = stop).
    pub fn from_start_stop(
        start: Hertz,
        stop: Hertz,
        points: usize,
        spacing: Spacing,
    ) -> Result<Self, SweepError> {
        let (a, b) = (start.value(), stop.value());
        if !a.is_finite() || !b.is_finite() {
            return Err(SweepError::NotFinite);
        }
        if a <= 0.0 || b < a {
            return Err(SweepError::OutOfRange);
        }
        if points > N {
            return Err(SweepError::TooManyPoints);
        }
        if points == 0 || (points == 1 && b != a) || (points > 1 && b <= a) {
            return Err(SweepError::TooFewPoints);
        }
        Ok(Self {
            start,
            stop,
            points,
            spacing,
        })
    }

    /// A plan centred on `centre` covering `span` (stop − start). For logarithmic spacing the
    /// centre is the arithmetic centre too (start = centre − span/2), so that both forms name
    /// the same band.
    pub fn from_centre_span(
        centre: Hertz,
        span: Hertz,
        points: usize,
        spacing: Spacing,
    ) -> Result<Self, SweepError> {
        let (c, s) = (centre.value(), span.value());
        if !c.is_finite() || !s.is_finite() {
            return Err(SweepError::NotFinite);
        }
        if s < 0.0 {
            return Err(SweepError::OutOfRange);
        }
        Self::from_start_stop(
            Hertz::new(c - 0.5 * s),
            Hertz::new(c + 0.5 * s),
            points,
            spacing,
        )
    }

    /// First frequency.
    pub fn start(&self) -> Hertz {
        self.start
    }

    /// Last frequency.
    pub fn stop(&self) -> Hertz {
        self.stop
    }

    /// stop − start.
    pub fn span(&self) -> Hertz {
        self.stop - self.start
    }

    /// Number of points (1..=N).
    pub fn points(&self) -> usize {
        self.points
    }

    /// The spacing.
    pub fn spacing(&self) -> Spacing {
        self.spacing
    }

    /// The step between points of a linear plan; `None` for a logarithmic plan or one point.
    pub fn linear_step(&self) -> Option<Hertz> {
        if self.spacing != Spacing::Linear || self.points < 2 {
            return None;
        }
        Some(Hertz::new(self.span().value() / (self.points - 1) as f32))
    }

    /// The frequency of point `index`, or `None` past the last point. The first and last
    /// points are exactly start and stop.
    pub fn frequency(&self, index: usize) -> Option<Hertz> {
        if index >= self.points {
            return None;
        }
        if index == 0 {
            return Some(self.start);
        }
        if index + 1 == self.points {
            return Some(self.stop);
        }
        // points ≥ 3 here, so points − 1 ≥ 2.
        let t = index as f32 / (self.points - 1) as f32;
        let (a, b) = (self.start.value(), self.stop.value());
        let f = match self.spacing {
            Spacing::Linear => a + t * (b - a),
            Spacing::Logarithmic => a * libm::expf(t * libm::logf(b / a)),
        };
        // max/min, not clamp: clamp has a panic path when its bounds are not ordered.
        Some(Hertz::new(f.max(a).min(b)))
    }

    /// Every (index, frequency) of the plan, in order.
    pub fn iter(&self) -> impl Iterator<Item = (usize, Hertz)> + '_ {
        (0..self.points).filter_map(move |i| self.frequency(i).map(|f| (i, f)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (start Hz, stop Hz, points, spacing, index, expected Hz), worked by hand.
    const VECTORS: [(f32, f32, usize, Spacing, usize, f32); 5] = [
        (1.0e6, 2.0e6, 11, Spacing::Linear, 5, 1.5e6),
        (1.0e6, 2.0e6, 11, Spacing::Linear, 10, 2.0e6),
        (1.0e6, 100.0e6, 3, Spacing::Logarithmic, 1, 10.0e6),
        (1.0e6, 1000.0e6, 4, Spacing::Logarithmic, 2, 100.0e6),
        (7.0e6, 7.0e6, 1, Spacing::Linear, 0, 7.0e6),
    ];
    /// Relative error allowed against the hand-worked values.
    const REL_TOL: f32 = 2.0e-6;

    #[test]
    fn vectors() {
        for &(a, b, n, s, i, want) in VECTORS.iter() {
            let p = SweepPlan::<16>::from_start_stop(Hertz::new(a), Hertz::new(b), n, s).unwrap();
            let got = p.frequency(i).unwrap().value();
            assert!(
                (got - want).abs() <= REL_TOL * want,
                "{a} {b} {n} {i}: {got}"
            );
        }
    }

    #[test]
    fn centre_span_and_errors() {
        let p = SweepPlan::<8>::from_centre_span(
            Hertz::new(145.0e6),
            Hertz::new(10.0e6),
            5,
            Spacing::Linear,
        )
        .unwrap();
        assert_eq!(p.start().value(), 140.0e6);
        assert_eq!(p.linear_step().unwrap().value(), 2.5e6);
        assert_eq!(p.iter().count(), 5);
        assert_eq!(p.frequency(5), None);
        let e =
            SweepPlan::<8>::from_start_stop(Hertz::new(1.0), Hertz::new(2.0), 9, Spacing::Linear);
        assert_eq!(e, Err(SweepError::TooManyPoints));
        let e =
            SweepPlan::<8>::from_start_stop(Hertz::new(0.0), Hertz::new(2.0), 4, Spacing::Linear);
        assert_eq!(e, Err(SweepError::OutOfRange));
        let e = SweepPlan::<8>::from_start_stop(
            Hertz::new(f32::NAN),
            Hertz::new(2.0),
            4,
            Spacing::Linear,
        );
        assert_eq!(e, Err(SweepError::NotFinite));
        let e =
            SweepPlan::<8>::from_start_stop(Hertz::new(2.0), Hertz::new(2.0), 4, Spacing::Linear);
        assert_eq!(e, Err(SweepError::TooFewPoints));
    }
}
