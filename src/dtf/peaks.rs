//! The fault list: local maxima of the compensated response above a level, at least a given
//! distance apart, refined by parabolic interpolation of the log magnitude.

use super::transform::{level_db, DtfResponse, COMPENSATION_MAX_DB};
use crate::reflection::Gamma;
use crate::units::{Db, Meters};
use heapless::Vec;

/// One reflection found along the line.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Fault {
    /// Distance from the reference plane (interpolated between bins).
    pub distance: Meters,
    /// Return loss of the reflection after loss compensation (interpolated peak height).
    pub return_loss: Db,
    /// |ρ| of the reflection, the same as `return_loss`.
    pub gamma: Gamma,
    /// The bin of the local maximum.
    pub bin: usize,
}

/// What the fault list looks for.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FaultSearch {
    /// Report reflections whose compensated return loss is at most this (stronger).
    pub threshold: Db,
    /// Of two peaks closer than this, only the stronger is kept (≥ 2 resolutions is usual,
    /// to skip a window's first sidelobes).
    pub min_separation: Meters,
    /// Search no farther than this, and stop the loss compensation growing here: set it to
    /// the cable's length plus a margin, because compensation far past the last reflection
    /// only amplifies leakage. Non-finite or ≤ 0 means the whole range.
    pub max_distance: Meters,
}

impl DtfResponse<'_> {
    /// Up to `P` faults found by `search`, sorted by distance. Of two peaks closer than the
    /// minimum separation only the stronger is kept; when more than `P` qualify, the
    /// strongest `P` are kept.
    pub fn faults<const P: usize>(&self, search: &FaultSearch) -> Vec<Fault, P> {
        let mut out: Vec<Fault, P> = Vec::new();
        let bins = self.raw_bins();
        let m = bins.len();
        let n_read = self.bins();
        if m < 3 || n_read == 0 {
            return out;
        }
        let thr = search.threshold.value();
        let thr = if thr.is_finite() { thr } else { 0.0 };
        let min_sep = search.min_separation.value();
        let min_sep = if min_sep.is_finite() {
            min_sep.max(0.0)
        } else {
            0.0
        };
        let max_d = search.max_distance.value();
        let max_d = if max_d.is_finite() && max_d > 0.0 {
            max_d.min(self.max_range().value())
        } else {
            self.max_range().value()
        };
        // Squared compensated magnitude, the gain by recurrence: with the exponent
        // E(n) = A·n − B·n² (A = a·Δd, B = b·Δd²), gain²(n + 1) = gain²(n)·r(n) with
        // r(n) = e^(2A − 2B(2n + 1)) and r(n + 1) = r(n)·e^(−4B); growth stops when r ≤ 1
        // (the turning point) and at the compensation limit.
        let s2 = self.scale() * self.scale();
        let (a, b) = self.comp_terms();
        let dd = self.bin_spacing().value();
        let (big_a, big_b) = (a * dd, b * dd * dd);
        let mut ratio = libm::expf(2.0 * big_a - 2.0 * big_b);
        let q = libm::expf(-4.0 * big_b);
        let cap = libm::powf(10.0, COMPENSATION_MAX_DB / 10.0);
        let thr_lin2 = libm::powf(10.0, -thr / 10.0);
        let mag2 = |n: usize, gain2: f32| -> f32 {
            bins.get(n).map_or(0.0, |c| c.norm_sqr() * s2 * gain2)
        };
        let mut gain2 = 1.0f32;
        // Bin 0's left neighbour is bin M − 1 (circular): distance −Δd, no compensation.
        let mut prev = mag2(m - 1, 1.0);
        let mut cur = mag2(0, 1.0);
        for n in 0..n_read {
            let d_next = (n + 1) as f32 * dd;
            if self.distance(n).value() > max_d {
                break;
            }
            if ratio.is_nan() || ratio < 1.0 || d_next > max_d {
                ratio = 1.0;
            }
            let next_gain2 = (gain2 * ratio).min(cap);
            ratio *= q;
            let next = if n + 1 >= m {
                mag2(0, 1.0)
            } else {
                mag2(n + 1, next_gain2)
            };
            if cur > prev && cur >= next && cur >= thr_lin2 && cur.is_finite() {
                let f = self.refine(n, prev, cur, next);
                insert(&mut out, f, min_sep);
            }
            prev = cur;
            cur = next;
            gain2 = next_gain2;
        }
        out
    }

    fn refine(&self, n: usize, a2: f32, b2: f32, c2: f32) -> Fault {
        // Log magnitudes in dB (10·log10 of squared magnitudes), floored.
        let db = |x: f32| 10.0 * libm::log10f(x.max(1.0e-24));
        let (a, b, c) = (db(a2), db(b2), db(c2));
        let den = a - 2.0 * b + c;
        let p = if den < 0.0 {
            (0.5 * (a - c) / den).clamp(-0.5, 0.5)
        } else {
            0.0
        };
        let peak_db = b - 0.25 * (a - c) * p;
        let d = ((n as f32 + p) * self.bin_spacing().value())
            .max(0.0)
            .min(self.max_range().value());
        let mag = libm::powf(10.0, peak_db / 20.0);
        let rl = level_db(if mag.is_finite() { mag } else { 1.0 });
        Fault {
            distance: Meters::new(d),
            return_loss: rl,
            gamma: Gamma::saturating(if mag.is_finite() { mag } else { 1.0 }),
            bin: n,
        }
    }
}

/// Add `f` (farther than every fault already held) keeping separation and capacity.
fn insert<const P: usize>(out: &mut Vec<Fault, P>, f: Fault, min_sep: f32) {
    let close = |g: &Fault| libm::fabsf(f.distance.value() - g.distance.value()) < min_sep;
    // A stronger (lower return loss) neighbour within the separation wins.
    if out
        .iter()
        .any(|g| close(g) && g.return_loss.value() <= f.return_loss.value())
    {
        return;
    }
    out.retain(|g| !close(g));
    if out.is_full() {
        let weakest = out
            .iter()
            .map(|g| g.return_loss.value())
            .fold(f32::MIN, f32::max);
        if weakest <= f.return_loss.value() {
            return;
        }
        let mut removed = false;
        out.retain(|g| {
            if !removed && g.return_loss.value() == weakest {
                removed = true;
                false
            } else {
                true
            }
        });
    }
    let _ = out.push(f);
}
