//! Minimum VSWR and its frequency, refined between points.

use crate::reflection::{Gamma, Vswr};
use crate::units::Hertz;

/// The vertex (x, y) of the parabola through three points with distinct x, by the
/// three-point parabolic interpolation formula (Numerical Recipes 3rd ed., §10.3).
/// `None` when the points are collinear, not finite, or the parabola opens downwards.
pub fn parabolic_vertex(a: (f32, f32), b: (f32, f32), c: (f32, f32)) -> Option<(f32, f32)> {
    let (xa, ya) = a;
    let (xb, yb) = b;
    let (xc, yc) = c;
    let p = (xb - xa) * (yb - yc);
    let q = (xb - xc) * (yb - ya);
    let num = (xb - xa) * p - (xb - xc) * q;
    let den = p - q;
    // Curvature sign: the second divided difference must be positive for a minimum.
    let d1 = (yb - ya) / (xb - xa);
    let d2 = (yc - yb) / (xc - xb);
    let curvature = (d2 - d1) / (xc - xa);
    if curvature.is_nan() || curvature <= 0.0 || den == 0.0 {
        return None;
    }
    let x = xb - 0.5 * num / den;
    // y at x from the Newton form of the same parabola.
    let y = ya + d1 * (x - xa) + curvature * (x - xa) * (x - xb);
    if x.is_finite() && y.is_finite() {
        Some((x, y))
    } else {
        None
    }
}

/// The minimum of a sweep.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct VswrMinimum {
    /// Frequency of the minimum (interpolated when `interpolated`).
    pub frequency: Hertz,
    /// The minimum VSWR (interpolated when `interpolated`).
    pub vswr: Vswr,
    /// |Γ| at the minimum.
    pub gamma: Gamma,
    /// The lowest measured point itself.
    pub point_frequency: Hertz,
    /// True when the value was refined by the parabolic fit; false when the lowest point is
    /// at an end of the sweep or the fit failed, and the measured point is reported.
    pub interpolated: bool,
}

/// Accumulator for the minimum VSWR. Feed points in increasing frequency.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MinimumVswr {
    last: Option<(f32, f32)>,
    before: Option<(f32, f32)>,
    best: Option<(f32, f32)>,
    after: Option<(f32, f32)>,
    skipped: usize,
}

impl MinimumVswr {
    /// An empty accumulator.
    pub const fn new() -> Self {
        Self {
            last: None,
            before: None,
            best: None,
            after: None,
            skipped: 0,
        }
    }

    /// Feed one point: frequency and |Γ| there.
    pub fn push(&mut self, frequency: Hertz, gamma: Gamma) {
        let f = frequency.value();
        let g2 = gamma.value() * gamma.value();
        if !f.is_finite() || self.last.is_some_and(|(lf, _)| f <= lf) {
            self.skipped = self.skipped.saturating_add(1);
            return;
        }
        let point = (f, g2);
        match self.best {
            Some((_, bg2)) if g2 >= bg2 => {
                if self.after.is_none() {
                    self.after = Some(point);
                }
            }
            _ => {
                self.before = self.last;
                self.best = Some(point);
                self.after = None;
            }
        }
        self.last = Some(point);
    }

    /// Feed one point given as a VSWR.
    pub fn push_vswr(&mut self, frequency: Hertz, vswr: Vswr) {
        self.push(frequency, vswr.gamma());
    }

    /// Points refused (non-finite frequency, or not above the previous frequency).
    pub fn skipped(&self) -> usize {
        self.skipped
    }

    /// The minimum so far; `None` before the first point.
    pub fn result(&self) -> Option<VswrMinimum> {
        let (bf, bg2) = self.best?;
        let raw = Gamma::saturating(libm::sqrtf(bg2));
        let measured = VswrMinimum {
            frequency: Hertz::new(bf),
            vswr: raw.vswr(),
            gamma: raw,
            point_frequency: Hertz::new(bf),
            interpolated: false,
        };
        let (Some(a), Some(c)) = (self.before, self.after) else {
            return Some(measured);
        };
        match parabolic_vertex(a, (bf, bg2), c) {
            Some((x, y)) => {
                let x = x.max(a.0).min(c.0);
                let g = Gamma::saturating(libm::sqrtf(y.max(0.0).min(bg2)));
                Some(VswrMinimum {
                    frequency: Hertz::new(x),
                    vswr: g.vswr(),
                    gamma: g,
                    point_frequency: Hertz::new(bf),
                    interpolated: true,
                })
            }
            None => Some(measured),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (three points, expected vertex) of y = 2(x − 3)² + 1 and y = (x + 1)², worked by hand.
    type P = (f32, f32);
    const VERTEX_VECTORS: [(P, P, P, P); 2] = [
        ((1.0, 9.0), (2.0, 3.0), (4.0, 3.0), (3.0, 1.0)),
        ((-3.0, 4.0), (-2.0, 1.0), (0.5, 2.25), (-1.0, 0.0)),
    ];
    /// Absolute error allowed on the vertex.
    const VERTEX_TOL: f32 = 1.0e-5;

    #[test]
    fn vertex_vectors() {
        for &(a, b, c, (x, y)) in VERTEX_VECTORS.iter() {
            let (gx, gy) = parabolic_vertex(a, b, c).unwrap();
            assert!(
                (gx - x).abs() < VERTEX_TOL && (gy - y).abs() < VERTEX_TOL,
                "{gx} {gy}"
            );
        }
        assert_eq!(parabolic_vertex((0.0, 0.0), (1.0, 1.0), (2.0, 2.0)), None);
        assert_eq!(parabolic_vertex((0.0, 0.0), (1.0, 1.0), (1.0, 2.0)), None);
    }

    #[test]
    fn tracks_interior_and_edge_minimum() {
        let mut m = MinimumVswr::new();
        // |Γ|² = 0.01 + (f − 10.2)²·0.01 sampled at 9, 10, 11, 12.
        for f in [9.0f32, 10.0, 11.0, 12.0] {
            let g2 = 0.01 + (f - 10.2) * (f - 10.2) * 0.01;
            m.push(Hertz::new(f), Gamma::new(libm::sqrtf(g2)).unwrap());
        }
        let r = m.result().unwrap();
        assert!(r.interpolated);
        assert!((r.frequency.value() - 10.2).abs() < 1e-4);
        assert!((r.gamma.value() - 0.1).abs() < 1e-4);
        assert_eq!(r.point_frequency.value(), 10.0);

        let mut m = MinimumVswr::new();
        for (f, g) in [(1.0f32, 0.1f32), (2.0, 0.2)] {
            m.push(Hertz::new(f), Gamma::new(g).unwrap());
        }
        let r = m.result().unwrap();
        assert!(!r.interpolated);
        assert_eq!(r.frequency.value(), 1.0);
        assert_eq!(MinimumVswr::new().result(), None);
    }
}
