//! The sign of a reflection phase known only in magnitude.
//!
//! Some gain-phase detectors report |φ| in 0..180° only: Γ is then one of two complex
//! conjugates, and so is Z (for a real Z0, conj Γ ↔ conj Z). The two candidates differ only
//! in the sign of X (and of B). This module resolves the sign from two readings a small
//! frequency step apart, using Foster's reactance theorem (R. M. Foster, "A reactance
//! theorem", Bell System Technical Journal 3, 1924): for a lossless one-port dX/dω > 0 and
//! dB/dω > 0, with the stronger bound dX/dω ≥ |X|/ω. Written as logarithmic slopes
//! s = d ln|·| / d ln f:
//!
//! * inductive (X > 0, B < 0): |X| grows, s_X ≥ +1, and |B| falls, s_B ≤ −1;
//! * capacitive (X < 0, B > 0): |X| falls, s_X ≤ −1, and |B| grows, s_B ≥ +1.
//!
//! The resolver computes s_X and s_B from the two readings and decides only when both agree,
//! each beyond [`PhaseSignConfig::min_slope`] (0.5 by default, half the lossless bound, so
//! moderate loss is tolerated). Otherwise it returns [`PhaseSign::Ambiguous`] with the reason.
//!
//! Where it fails (documented, flagged, never guessed):
//! * lossy loads where the two tests disagree — a parallel RC with ωRC < 1 (|X| grows like an
//!   inductor's though it is capacitive) or a series RL with ωL < R: [`Ambiguity::Disagree`];
//! * a resonance or anti-resonance crossed inside the step: X changes sign between the two
//!   readings, the same-sign assumption is wrong. Usually seen as disagreeing or weak slopes,
//!   but a step across a lossless pole can look consistent; keep steps small (the resolver
//!   refuses relative steps above [`PhaseSignConfig::max_relative_step`]);
//! * an almost real impedance (|X| below [`PhaseSignConfig::near_real`] of |Z| at either
//!   frequency): the sign hardly matters but cannot be told: [`Ambiguity::NearlyReal`];
//! * readings whose change is below the noise: [`Ambiguity::WeakSlope`];
//! * active (R < 0) loads: Foster's theorem does not apply; treated as any other load.
//!
//! Panic policy: nothing here panics; bad input gives a [`VectorError`].

use num_complex::Complex32;

use super::impedance::Impedance;
use super::{check_raw_gamma, finite, VectorError, FREQUENCY_LIMIT_HZ, FREQUENCY_MIN_HZ};
use crate::units::{Hertz, Ohms};

/// The verdict on the sign of the phase.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum PhaseSign {
    /// Phase of Γ positive: inductive (X > 0).
    Positive,
    /// Phase of Γ negative: capacitive (X < 0).
    Negative,
    /// The sign cannot be told from these readings.
    Ambiguous(Ambiguity),
}

/// Why the phase sign could not be resolved.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Ambiguity {
    /// The impedance is nearly real at one of the frequencies.
    NearlyReal,
    /// |X| or |B| changed too little across the step to tell a slope.
    WeakSlope,
    /// The reactance and susceptance slopes point to different signs (a lossy load, or a
    /// resonance crossed inside the step).
    Disagree,
}

impl PhaseSign {
    /// Applies the verdict to a Γ measured with a non-negative phase: `Some(Γ)` for
    /// [`PhaseSign::Positive`], `Some(conj Γ)` for [`PhaseSign::Negative`], `None` when
    /// ambiguous.
    pub fn apply(self, upper: Complex32) -> Option<Complex32> {
        let up = Complex32::new(upper.re, upper.im.abs());
        match self {
            PhaseSign::Positive => Some(up),
            PhaseSign::Negative => Some(up.conj()),
            PhaseSign::Ambiguous(_) => None,
        }
    }
}

/// Thresholds of the phase-sign resolver.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PhaseSignConfig {
    /// The smallest |d ln|X| / d ln f| (and the same for |B|) taken as a slope (default 0.5;
    /// a lossless one-port has at least 1).
    pub min_slope: f32,
    /// |X|/|Z| below this at either frequency is "nearly real" (default 0.01).
    pub near_real: f32,
    /// The largest relative frequency step (f2 − f1)/f1 accepted (default 0.2).
    pub max_relative_step: f32,
}

impl Default for PhaseSignConfig {
    fn default() -> Self {
        Self {
            min_slope: 0.5,
            near_real: 0.01,
            max_relative_step: 0.2,
        }
    }
}

fn sign_parts(f: Hertz, upper: Complex32, z0: Ohms) -> Result<(f32, f32, f32), VectorError> {
    let fv = finite(f.value())?;
    if !(FREQUENCY_MIN_HZ..=FREQUENCY_LIMIT_HZ).contains(&fv) {
        return Err(VectorError::OutOfRange);
    }
    let g = check_raw_gamma(upper)?;
    let z = Impedance::from_gamma(Complex32::new(g.re, g.im.abs()), z0)?;
    let zn = z.normalized();
    let mag = libm::hypotf(zn.re, zn.im);
    // |B|·Z0 = |X/Z0| / |Z/Z0|²; computed from the capped admittance.
    let b = z.admittance().normalized().im.abs();
    Ok((zn.im.abs(), b, mag))
}

/// Resolves the sign of the phase from two readings with non-negative phase, at `f1` and
/// `f2` (either order; `f1 ≠ f2`). Returns the sign valid for both readings (assuming no
/// sign change inside the step).
pub fn resolve_phase_sign(
    f1: Hertz,
    upper1: Complex32,
    f2: Hertz,
    upper2: Complex32,
    z0: Ohms,
    config: &PhaseSignConfig,
) -> Result<PhaseSign, VectorError> {
    let min_slope = finite(config.min_slope)?;
    let near_real = finite(config.near_real)?;
    let max_step = finite(config.max_relative_step)?;
    if min_slope <= 0.0 || near_real < 0.0 || max_step <= 0.0 {
        return Err(VectorError::OutOfRange);
    }
    let (x1, b1, m1) = sign_parts(f1, upper1, z0)?;
    let (x2, b2, m2) = sign_parts(f2, upper2, z0)?;
    let (lo, hi) = (f1.value().min(f2.value()), f1.value().max(f2.value()));
    let step = (hi - lo) / lo;
    if step.is_nan() || step <= 0.0 || step > max_step {
        return Err(VectorError::OutOfRange);
    }
    if x1 <= near_real * m1 || x2 <= near_real * m2 || b1 <= 0.0 || b2 <= 0.0 {
        return Ok(PhaseSign::Ambiguous(Ambiguity::NearlyReal));
    }
    // Slopes from the reading at the lower to the one at the higher frequency.
    let dlnf = libm::logf(hi / lo);
    let forward = f2.value() > f1.value();
    let (xl, xh, bl, bh) = if forward {
        (x1, x2, b1, b2)
    } else {
        (x2, x1, b2, b1)
    };
    let sx = libm::logf(xh / xl) / dlnf;
    let sb = libm::logf(bh / bl) / dlnf;
    if !sx.is_finite() || !sb.is_finite() {
        return Ok(PhaseSign::Ambiguous(Ambiguity::WeakSlope));
    }
    if sx.abs() < min_slope || sb.abs() < min_slope {
        return Ok(PhaseSign::Ambiguous(Ambiguity::WeakSlope));
    }
    Ok(if sx > 0.0 && sb < 0.0 {
        PhaseSign::Positive
    } else if sx < 0.0 && sb > 0.0 {
        PhaseSign::Negative
    } else {
        PhaseSign::Ambiguous(Ambiguity::Disagree)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn upper_gamma(r: f32, x: f32) -> Complex32 {
        let z = Impedance::new(Ohms::new(r), Ohms::new(x), Ohms::new(50.0)).unwrap();
        let g = z.gamma();
        Complex32::new(g.re, g.im.abs())
    }

    /// (R, L in H, C in F, expected sign) for a series R-L-C at 10 and 10.5 MHz (by hand:
    /// below series resonance capacitive, above inductive).
    #[test]
    fn series_elements() {
        let cfg = PhaseSignConfig::default();
        let z0 = Ohms::new(50.0);
        let (f1, f2) = (10.0e6_f32, 10.5e6_f32);
        let x = |f: f32, l: f32, c: f32| {
            let w = core::f32::consts::TAU * f;
            w * l - if c > 0.0 { 1.0 / (w * c) } else { 0.0 }
        };
        // 5 Ω + 2 µH: X ≈ 126 Ω, inductive.
        let g1 = upper_gamma(5.0, x(f1, 2e-6, 0.0));
        let g2 = upper_gamma(5.0, x(f2, 2e-6, 0.0));
        let s = resolve_phase_sign(Hertz::new(f1), g1, Hertz::new(f2), g2, z0, &cfg).unwrap();
        assert_eq!(s, PhaseSign::Positive);
        // 5 Ω + 100 pF: X ≈ −159 Ω, capacitive.
        let g1 = upper_gamma(5.0, -1.0 / (core::f32::consts::TAU * f1 * 100e-12));
        let g2 = upper_gamma(5.0, -1.0 / (core::f32::consts::TAU * f2 * 100e-12));
        let s = resolve_phase_sign(Hertz::new(f1), g1, Hertz::new(f2), g2, z0, &cfg).unwrap();
        assert_eq!(s, PhaseSign::Negative);
        // Order of the readings does not matter.
        let s = resolve_phase_sign(Hertz::new(f2), g2, Hertz::new(f1), g1, z0, &cfg).unwrap();
        assert_eq!(s, PhaseSign::Negative);
        assert_eq!(s.apply(g1), Some(g1.conj()));
    }

    #[test]
    fn ambiguous_cases_are_flagged() {
        let cfg = PhaseSignConfig::default();
        let z0 = Ohms::new(50.0);
        // A pure 50 Ω resistor: nearly real.
        let g = upper_gamma(50.0, 0.0);
        let s = resolve_phase_sign(Hertz::new(1e6), g, Hertz::new(1.05e6), g, z0, &cfg).unwrap();
        assert_eq!(s, PhaseSign::Ambiguous(Ambiguity::NearlyReal));
        // Same reactive reading at both frequencies: no slope.
        let g = upper_gamma(10.0, 40.0);
        let s = resolve_phase_sign(Hertz::new(1e6), g, Hertz::new(1.05e6), g, z0, &cfg).unwrap();
        assert_eq!(s, PhaseSign::Ambiguous(Ambiguity::WeakSlope));
        // Parallel 500 Ω ‖ 100 pF at 1 MHz (ωRC = 0.31): |X| and |B| both grow
        // (d ln|X|/d ln f = 1 − 2(ωRC)²/(1 + (ωRC)²) ≈ 0.82).
        let zpar = |f: f32| {
            let y = Complex32::new(2.0e-3, core::f32::consts::TAU * f * 100e-12);
            let z = Complex32::new(1.0, 0.0) / y;
            upper_gamma(z.re, z.im)
        };
        let s = resolve_phase_sign(
            Hertz::new(1.0e6),
            zpar(1.0e6),
            Hertz::new(1.05e6),
            zpar(1.05e6),
            z0,
            &cfg,
        )
        .unwrap();
        assert_eq!(s, PhaseSign::Ambiguous(Ambiguity::Disagree));
        // A large step is refused.
        assert_eq!(
            resolve_phase_sign(Hertz::new(1e6), g, Hertz::new(2e6), g, z0, &cfg),
            Err(VectorError::OutOfRange)
        );
    }
}
