//! Resonances: frequencies where the reactance X of the load crosses zero.

use crate::units::{Hertz, Ohms};
use heapless::Vec;
use num_complex::Complex32;

/// The load impedance Z = Z0·(1 + Γ)/(1 − Γ) from a complex reflection coefficient.
/// `None` for non-finite input, Z0 ≤ 0, or Γ within 1e-6 of 1 (an open: Z unbounded).
pub fn impedance(gamma: Complex32, z0: Ohms) -> Option<Complex32> {
    let z0 = z0.value();
    if !gamma.re.is_finite() || !gamma.im.is_finite() || !z0.is_finite() || z0 <= 0.0 {
        return None;
    }
    let den = Complex32::new(1.0 - gamma.re, -gamma.im);
    let d2 = den.norm_sqr();
    if d2.is_nan() || d2 <= 1.0e-12 {
        return None;
    }
    let num = Complex32::new(1.0 + gamma.re, gamma.im);
    // num / den = num·conj(den) / |den|².
    let q = num * den.conj();
    let z = Complex32::new(z0 * q.re / d2, z0 * q.im / d2);
    if z.re.is_finite() && z.im.is_finite() {
        Some(z)
    } else {
        None
    }
}

/// Which way X crosses zero.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ResonanceKind {
    /// X rises through zero (capacitive below, inductive above): a series resonance.
    Series,
    /// X falls through zero (inductive below, capacitive above): a parallel resonance
    /// (antiresonance).
    Parallel,
}

/// One X = 0 crossing.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Resonance {
    /// Frequency of the crossing, interpolated linearly in X between the two points.
    pub frequency: Hertz,
    /// Resistance R at the crossing, interpolated linearly in the same way.
    pub resistance: Ohms,
    /// Direction of the crossing.
    pub kind: ResonanceKind,
}

/// Accumulator for resonances: keeps the first `K` crossings. Feed points in increasing
/// frequency.
#[derive(Clone, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Resonances<const K: usize> {
    last: Option<(f32, f32, f32)>,
    found: Vec<Resonance, K>,
    missed: usize,
    skipped: usize,
}

impl<const K: usize> Resonances<K> {
    /// An empty accumulator.
    pub const fn new() -> Self {
        Self {
            last: None,
            found: Vec::new(),
            missed: 0,
            skipped: 0,
        }
    }

    /// Feed one point: frequency and impedance there (see [`impedance`]).
    pub fn push(&mut self, frequency: Hertz, z: Complex32) {
        let (f, r, x) = (frequency.value(), z.re, z.im);
        if !(f.is_finite() && r.is_finite() && x.is_finite())
            || self.last.is_some_and(|(lf, _, _)| f <= lf)
        {
            self.skipped = self.skipped.saturating_add(1);
            return;
        }
        if let Some((f1, r1, x1)) = self.last {
            let neg1 = x1 < 0.0;
            let neg2 = x < 0.0;
            if neg1 != neg2 {
                // x1 and x have opposite signs (or one is zero on the non-negative side),
                // so x1 − x ≠ 0 and t lies in [0, 1].
                let t = (x1 / (x1 - x)).clamp(0.0, 1.0);
                let res = Resonance {
                    frequency: Hertz::new(f1 + t * (f - f1)),
                    resistance: Ohms::new(r1 + t * (r - r1)),
                    kind: if neg1 {
                        ResonanceKind::Series
                    } else {
                        ResonanceKind::Parallel
                    },
                };
                if self.found.push(res).is_err() {
                    self.missed = self.missed.saturating_add(1);
                }
            }
        }
        self.last = Some((f, r, x));
    }

    /// Feed one point as complex Γ and reference impedance; points where Z is unbounded
    /// (Γ = 1) are skipped.
    pub fn push_gamma(&mut self, frequency: Hertz, gamma: Complex32, z0: Ohms) {
        match impedance(gamma, z0) {
            Some(z) => self.push(frequency, z),
            None => self.skipped = self.skipped.saturating_add(1),
        }
    }

    /// The crossings found, in increasing frequency.
    pub fn found(&self) -> &[Resonance] {
        &self.found
    }

    /// Crossings found after the capacity `K` was full.
    pub fn missed(&self) -> usize {
        self.missed
    }

    /// Points refused (non-finite, unbounded Z, or frequency not increasing).
    pub fn skipped(&self) -> usize {
        self.skipped
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (Γ, Z0, expected Z), worked by hand from Z = Z0(1 + Γ)/(1 − Γ).
    type C = (f32, f32);
    const Z_VECTORS: [(C, f32, C); 3] = [
        ((0.0, 0.0), 50.0, (50.0, 0.0)),
        ((1.0 / 3.0, 0.0), 50.0, (100.0, 0.0)),
        ((0.0, 1.0), 50.0, (0.0, 50.0)),
    ];
    /// Absolute error allowed on Z, in ohms.
    const Z_TOL: f32 = 1.0e-3;

    #[test]
    fn impedance_vectors() {
        for &((gr, gi), z0, (zr, zi)) in Z_VECTORS.iter() {
            let z = impedance(Complex32::new(gr, gi), Ohms::new(z0)).unwrap();
            assert!(
                (z.re - zr).abs() < Z_TOL && (z.im - zi).abs() < Z_TOL,
                "{z}"
            );
        }
        assert_eq!(impedance(Complex32::new(1.0, 0.0), Ohms::new(50.0)), None);
    }

    #[test]
    fn finds_crossings_in_both_directions() {
        let mut r = Resonances::<1>::new();
        for (f, x) in [(1.0f32, -10.0f32), (2.0, 30.0), (3.0, 10.0), (4.0, -10.0)] {
            r.push(Hertz::new(f), Complex32::new(50.0, x));
        }
        assert_eq!(r.found().len(), 1);
        let a = r.found()[0];
        assert!((a.frequency.value() - 1.25).abs() < 1e-6);
        assert_eq!(a.kind, ResonanceKind::Series);
        assert_eq!(r.missed(), 1);
    }
}
