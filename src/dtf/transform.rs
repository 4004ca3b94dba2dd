//! The windowed, zero-padded inverse transform and its distance mapping.

use super::{forward_in_place, AttenuationModel, DtfError, Window, FFT_MAX, FFT_MIN};
use crate::reflection::{Gamma, DB_CEILING};
use crate::units::{Db, Hertz, Meters};
use num_complex::Complex32;

/// Speed of light in vacuum, m/s (exact by the SI definition of the metre).
pub const SPEED_OF_LIGHT: f32 = 299_792_458.0;

/// The largest two-way loss compensated, dB; beyond it the noise floor would be raised more
/// than any fault is worth, so the gain stops growing.
pub const COMPENSATION_MAX_DB: f32 = 60.0;

/// What a response was made from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ResponseKind {
    /// Complex Γ: distances from the reference plane, levels are return loss.
    Complex,
    /// |Γ| only: distances are separations between pairs of reflections, levels are the sum of
    /// the pair's return losses (see the module doc).
    ScalarPairs,
}

/// What the transform needs to know about the sweep and the cable.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DtfSetup<L> {
    /// Frequency of the first point (≥ 0).
    pub start: Hertz,
    /// Frequency of the last point (> start). Points are linearly spaced.
    pub stop: Hertz,
    /// The window.
    pub window: Window,
    /// Velocity factor of the cable, in (0, 1].
    pub velocity_factor: f32,
    /// The cable's attenuation, for loss compensation ([`super::NoLoss`] for none).
    pub loss: L,
}

/// The transform's result: a borrowed view of the caller's buffer plus the distance mapping.
#[derive(Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DtfResponse<'a> {
    bins: &'a [Complex32],
    scale: f32,
    bin_m: f32,
    resolution: f32,
    max_range: f32,
    /// Linear term of the compensation exponent, Np/m (two-way mean loss).
    comp_a: f32,
    /// Quadratic term of the compensation exponent, Np/m² (spread of the loss over the sweep).
    comp_b: f32,
    kind: ResponseKind,
}

struct Checked {
    m: usize,
    df: f32,
    v: f32,
    span: f32,
}

fn check<L>(buf_len: usize, points: usize, setup: &DtfSetup<L>) -> Result<Checked, DtfError> {
    let m = buf_len;
    if !m.is_power_of_two() || !(FFT_MIN..=FFT_MAX).contains(&m) {
        return Err(DtfError::BadLength);
    }
    if points < 2 || points > m {
        return Err(DtfError::TooFewPoints);
    }
    let (a, b, vf) = (
        setup.start.value(),
        setup.stop.value(),
        setup.velocity_factor,
    );
    if !a.is_finite() || !b.is_finite() || !vf.is_finite() {
        return Err(DtfError::NotFinite);
    }
    if a < 0.0 || b <= a || vf <= 0.0 || vf > 1.0 || !setup.window.is_valid() {
        return Err(DtfError::BadSetup);
    }
    let span = b - a;
    let df = span / (points - 1) as f32;
    if df.is_nan() || df <= 0.0 {
        return Err(DtfError::BadSetup);
    }
    Ok(Checked {
        m,
        df,
        v: vf * SPEED_OF_LIGHT,
        span,
    })
}

fn finish<'a>(
    buf: &'a mut [Complex32],
    c: &Checked,
    points: usize,
    sum_w: f32,
    alpha_moments: (f32, f32),
    kind: ResponseKind,
) -> Result<DtfResponse<'a>, DtfError> {
    if sum_w.is_nan() || sum_w <= 0.0 {
        return Err(DtfError::TooFewPoints);
    }
    if !forward_in_place(buf) {
        return Err(DtfError::BadLength);
    }
    let resolution = c.v / (2.0 * c.span);
    let bin_m = c.v / (2.0 * c.df * c.m as f32);
    // `check` refused points < 2 (the compiler does not see that here): no wrap.
    let intervals = points.wrapping_sub(1) as f32;
    let max_range = match kind {
        ResponseKind::Complex => intervals * resolution,
        ResponseKind::ScalarPairs => 0.5 * intervals * resolution,
    };
    // Two-way amplitude loss 2·α·d dB → Np: × ln10/20. The exact height of a reflection at d
    // is Σw·e^(−a·α_k·d)/Σw; its cumulant expansion to second order is
    // e^(−a·ᾱ·d + ½·a²·var(α)·d²), so the compensation undoes that.
    let a = 2.0 * core::f32::consts::LN_10 / 20.0;
    let (mean_alpha, var_alpha) = alpha_moments;
    let comp_a = a * mean_alpha;
    let comp_b = 0.5 * a * a * var_alpha.max(0.0);
    let out = DtfResponse {
        bins: buf,
        scale: 1.0 / sum_w,
        bin_m,
        resolution,
        max_range,
        comp_a,
        comp_b,
        kind,
    };
    if out.scale.is_finite()
        && bin_m.is_finite()
        && resolution.is_finite()
        && comp_a.is_finite()
        && comp_b.is_finite()
    {
        Ok(out)
    } else {
        Err(DtfError::NotFinite)
    }
}

/// Distance-to-fault transform of a complex-Γ sweep, in place.
///
/// On entry `buf[..points]` holds Γ at `points` linearly spaced frequencies from
/// `setup.start` to `setup.stop`; the rest of `buf` is ignored (overwritten with zeros).
/// `buf.len()` (the transform length M, a power of two in 16..=2048) sets the zero padding.
/// On return the buffer holds the response, read through the returned view.
pub fn transform_in_place<'a, L: AttenuationModel>(
    buf: &'a mut [Complex32],
    points: usize,
    setup: &DtfSetup<L>,
) -> Result<DtfResponse<'a>, DtfError> {
    let c = check(buf.len(), points, setup)?;
    let f0 = setup.start.value();
    let df = c.df;
    let window = setup.window.prepare();
    // points ≥ 2 (checked), so the divisor is ≥ 1.
    let inv_last = 1.0 / (points - 1) as f32;
    let (mut sum_w, mut sum_wa, mut sum_wa2) = (0.0f32, 0.0f32, 0.0f32);
    // Stays 0 while every sample and α is finite (x·0 is NaN for an infinite or NaN x), so
    // one test after the loop replaces two per value.
    let mut probe = 0.0f32;
    let mut negative_loss = false;
    let (head, tail) = buf
        .split_at_mut_checked(points)
        .ok_or(DtfError::TooFewPoints)?;
    // The window is symmetric: w_k serves the pair (k, N − 1 − k). `lo` holds k < ⌈N/2⌉,
    // `hi` the rest, walked backwards so that its j-th element is N − 1 − j.
    let (lo, hi) = head
        .split_at_mut_checked(points.div_ceil(2))
        .ok_or(DtfError::TooFewPoints)?;
    let mut step = |x: &mut Complex32, idx: usize, w: f32| {
        let alpha = setup.loss.db_per_meter(Hertz::new(f0 + idx as f32 * df));
        probe += x.re * 0.0 + x.im * 0.0 + alpha * 0.0;
        negative_loss |= alpha < 0.0;
        // Conjugate while windowing: |IDFT(x)| = |DFT(conj x)|.
        *x = Complex32::new(x.re * w, -x.im * w);
        let wa = w * alpha;
        sum_w += w;
        sum_wa += wa;
        sum_wa2 += wa * alpha;
    };
    let mut mirrors = hi.iter_mut().rev();
    for (k, x) in lo.iter_mut().enumerate() {
        let w = window.at_half(k as f32 * inv_last);
        step(x, k, w);
        if let Some(y) = mirrors.next() {
            step(y, points - 1 - k, w);
        }
    }
    if probe != 0.0 {
        // NaN: a sample or α was not finite. Tell which.
        let bad_sample = head.iter().any(|x| !x.re.is_finite() || !x.im.is_finite());
        return Err(if bad_sample {
            DtfError::NotFinite
        } else {
            DtfError::BadLoss
        });
    }
    if negative_loss {
        return Err(DtfError::BadLoss);
    }
    for x in tail.iter_mut() {
        *x = Complex32::new(0.0, 0.0);
    }
    let moments = if sum_w > 0.0 {
        let mean = sum_wa / sum_w;
        (mean, sum_wa2 / sum_w - mean * mean)
    } else {
        (0.0, 0.0)
    };
    finish(buf, &c, points, sum_w, moments, ResponseKind::Complex)
}

/// Pair-separation transform of a scalar (|Γ|-only) sweep, in place; see the module doc for
/// what it can and cannot show. `buf[k].re` holds |Γ| at point k (the imaginary parts are
/// ignored). `setup.loss` is not used.
pub fn scalar_transform_in_place<'a, L>(
    buf: &'a mut [Complex32],
    points: usize,
    setup: &DtfSetup<L>,
) -> Result<DtfResponse<'a>, DtfError> {
    let c = check(buf.len(), points, setup)?;
    let mut sum_p = 0.0f32;
    for x in buf.iter().take(points) {
        if !x.re.is_finite() {
            return Err(DtfError::NotFinite);
        }
        let g = x.re.clamp(0.0, 1.0);
        sum_p += g * g;
    }
    let mean = sum_p / points as f32;
    let window = setup.window.prepare();
    let mut sum_w = 0.0f32;
    for (k, x) in buf.iter_mut().enumerate() {
        if k >= points {
            *x = Complex32::new(0.0, 0.0);
            continue;
        }
        let g = x.re.clamp(0.0, 1.0);
        let w = window.coefficient(k, points);
        *x = Complex32::new((g * g - mean) * w, 0.0);
        sum_w += w;
    }
    finish(
        buf,
        &c,
        points,
        sum_w,
        (0.0, 0.0),
        ResponseKind::ScalarPairs,
    )
}

impl DtfResponse<'_> {
    /// What the response was made from.
    pub fn kind(&self) -> ResponseKind {
        self.kind
    }

    /// Number of bins worth reading: M for complex, M/2 + 1 for scalar.
    pub fn bins(&self) -> usize {
        match self.kind {
            ResponseKind::Complex => self.bins.len(),
            ResponseKind::ScalarPairs => self.bins.len() / 2 + 1,
        }
    }

    /// Distance between bins (the zero-padded grid): v/(2·Δf·M).
    pub fn bin_spacing(&self) -> Meters {
        Meters::new(self.bin_m)
    }

    /// Resolution VF·c/(2·span): the closest two equal reflections can be and still show.
    pub fn resolution(&self) -> Meters {
        Meters::new(self.resolution)
    }

    /// Maximum range (N − 1)·resolution = v/(2·Δf) (half that for scalar sweeps).
    pub fn max_range(&self) -> Meters {
        Meters::new(self.max_range)
    }

    /// Distance of bin `n`.
    pub fn distance(&self, n: usize) -> Meters {
        Meters::new(n as f32 * self.bin_m)
    }

    /// Amplitude gain that undoes the two-way cable loss at distance `d`: e^(a·d − b·d²)
    /// (see the module doc), held at its largest value beyond its turning point, ≥ 1 and
    /// capped at [`COMPENSATION_MAX_DB`].
    pub fn compensation(&self, d: Meters) -> f32 {
        libm::expf(self.compensation_np(d.value()))
    }

    /// The exponent of [`DtfResponse::compensation`], Np.
    fn compensation_np(&self, d: f32) -> f32 {
        let max_np = COMPENSATION_MAX_DB * core::f32::consts::LN_10 / 20.0;
        let (a, b) = (self.comp_a, self.comp_b);
        let e = if b > 0.0 && d > 0.5 * a / b {
            0.25 * a * a / b
        } else {
            a * d - b * d * d
        };
        if e.is_finite() {
            e.max(0.0).min(max_np)
        } else {
            0.0
        }
    }

    /// |ρ| at bin `n` before loss compensation; `None` past the last bin.
    pub fn raw_magnitude(&self, n: usize) -> Option<f32> {
        if n >= self.bins() {
            return None;
        }
        let c = self.bins.get(n)?;
        let m = c.norm() * self.scale;
        Some(if m.is_finite() { m } else { f32::MAX })
    }

    /// |ρ| at bin `n` after loss compensation.
    pub fn magnitude(&self, n: usize) -> Option<f32> {
        let m = self.raw_magnitude(n)? * self.compensation(self.distance(n));
        Some(m.min(f32::MAX))
    }

    /// Return loss at bin `n` after loss compensation, capped at [`DB_CEILING`]; for a scalar
    /// response, the sum of the pair's return losses.
    pub fn return_loss(&self, n: usize) -> Option<Db> {
        let m = self.magnitude(n)?;
        Some(level_db(m))
    }

    /// (distance, compensated return loss) of every bin, for plots.
    pub fn iter(&self) -> impl Iterator<Item = (Meters, Db)> + '_ {
        (0..self.bins()).filter_map(move |n| Some((self.distance(n), self.return_loss(n)?)))
    }

    pub(super) fn raw_bins(&self) -> &[Complex32] {
        self.bins
    }

    pub(super) fn scale(&self) -> f32 {
        self.scale
    }

    pub(super) fn comp_terms(&self) -> (f32, f32) {
        (self.comp_a, self.comp_b)
    }
}

/// −20·log10 m in 0..=DB_CEILING (m ≥ 1 reads 0 dB).
pub(super) fn level_db(m: f32) -> Db {
    if m.is_nan() || m <= 1.0e-5 {
        return Db::new(DB_CEILING);
    }
    Gamma::saturating(m).return_loss()
}
