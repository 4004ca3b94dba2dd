//! Windows applied to a sweep before the inverse transform.
//!
//! Definitions (F. J. Harris, "On the use of windows for harmonic analysis with the discrete
//! Fourier transform", Proc. IEEE 66(1), 1978; Kaiser window as in Oppenheim and Schafer,
//! *Discrete-Time Signal Processing*, 3rd ed., §7.5.3), for k = 0..N−1:
//!
//! | window | w_k |
//! |---|---|
//! | rectangular | 1 |
//! | Hann | ½·(1 − cos(2πk/(N − 1))) |
//! | Kaiser (β) | I0(β·√(1 − (2k/(N − 1) − 1)²)) / I0(β) |
//!
//! I0 is the modified Bessel function of the first kind, order 0, summed from its power series
//! I0(x) = Σ ((x/2)^m / m!)² (Abramowitz and Stegun 9.6.10) until the term falls below 1e-8
//! of the sum. For the window the series is taken in Horner form with the term count of I0(β)
//! (the argument never exceeds β), and (x/2)² = β²·x·(1 − x) for x = k/(N − 1), so no square
//! root is needed; Hann and Kaiser are evaluated for the first half only (both are symmetric).

/// The largest Kaiser β accepted (I0(50) ≈ 3e20 still fits f32 comfortably).
pub const KAISER_BETA_MAX: f32 = 50.0;

/// A window for the distance-to-fault transform: the trade-off between peak width
/// (resolution) and sidelobe level (how far a strong reflection hides a weak one).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Window {
    /// No taper: narrowest peak, sidelobes at −13 dB.
    Rectangular,
    /// Raised cosine: peak twice as wide, sidelobes at −31 dB.
    Hann,
    /// Kaiser with shape β in 0..=[`KAISER_BETA_MAX`]: β = 0 is rectangular, β ≈ 6 is close to
    /// Hann's width with lower sidelobes, larger β trades width for lower sidelobes.
    Kaiser {
        /// Shape parameter β.
        beta: f32,
    },
}

/// I0(x) by its power series (Abramowitz and Stegun 9.6.10). Finite for |x| ≤ 90.
pub fn bessel_i0(x: f32) -> f32 {
    // Converges for every finite x; 200 terms reach 1e-8 relative for |x| ≤ 100.
    i0_and_terms(x).0
}

/// cos(2π·t) in f32 without f64 arithmetic (libm's `cosf` works in f64, which is slow
/// software arithmetic on a single-precision FPU): reduction to one eighth of a turn by
/// symmetry, then the Taylor polynomials of cos and sin to degree 8 and 9 (truncation below
/// 3e-8 for |y| ≤ π/4). Absolute error against f64 below [`COS_TURNS_BOUND`].
pub fn cos_turns(t: f32) -> f32 {
    if !t.is_finite() {
        return 1.0;
    }
    let r = t - libm::floorf(t + 0.5);
    let a = libm::fabsf(r);
    cos_half_turn(if a < 0.5 { a } else { 0.5 })
}

/// cos(2π·a) for a in 0..=0.5 (the polynomial part of [`cos_turns`], shared by the window
/// loop, which only evaluates the first half of a symmetric window and needs no reduction).
#[inline]
fn cos_half_turn(a: f32) -> f32 {
    let quarter = core::f32::consts::FRAC_PI_2;
    let cos_p = |y: f32| {
        let y2 = y * y;
        1.0 - y2 * (0.5 - y2 * (1.0 / 24.0 - y2 * (1.0 / 720.0 - y2 * (1.0 / 40_320.0))))
    };
    let sin_p = |y: f32| {
        let y2 = y * y;
        y * (1.0 - y2 * (1.0 / 6.0 - y2 * (1.0 / 120.0 - y2 * (1.0 / 5040.0 - y2 / 362_880.0))))
    };
    let y = a * core::f32::consts::TAU;
    if a <= 0.125 {
        cos_p(y)
    } else if a <= 0.25 {
        sin_p(quarter - y)
    } else if a <= 0.375 {
        -sin_p(y - quarter)
    } else {
        -cos_p(core::f32::consts::PI - y)
    }
}

/// I0(x) by [`bessel_i0`]'s series and the number of terms it summed (at most
/// [`I0_TERMS_MAX`]).
fn i0_and_terms(x: f32) -> (f32, u32) {
    let h2 = 0.25 * x * x;
    let (mut term, mut sum, mut m) = (1.0f32, 1.0f32, 1.0f32);
    let mut n = 0u32;
    while n < I0_TERMS_MAX as u32 {
        n += 1;
        term *= h2 / (m * m);
        sum += term;
        if term < 1.0e-8 * sum {
            break;
        }
        m += 1.0;
    }
    (sum, n)
}

/// The most series terms [`i0_terms`] returns.
const I0_TERMS_MAX: usize = 200;

/// 1/m² for m = 1..=[`I0_TERMS_MAX`]: the ratios of successive I0 series terms over (x/2)².
const INV_SQUARES: [f32; I0_TERMS_MAX] = {
    let mut t = [0.0f32; I0_TERMS_MAX];
    let mut i = 0;
    while i < I0_TERMS_MAX {
        let m = (i + 1) as f32;
        t[i] = 1.0 / (m * m);
        i += 1;
    }
    t
};

/// I0 from h2 = (x/2)² by the first `terms` + 1 terms of its power series in Horner form,
/// 1 + h2/1²·(1 + h2/2²·(1 + …)): the series of [`bessel_i0`] without its per-term test.
#[inline]
fn i0_horner(h2: f32, terms: u32) -> f32 {
    let n = (terms as usize).min(I0_TERMS_MAX);
    let ratios = INV_SQUARES.get(..n).unwrap_or(&INV_SQUARES);
    // u = s − 1 runs the same recurrence, s ← 1 + t·s with t = h2/m², as u ← t + t·u: one
    // multiply-accumulate per term with no constant to reload.
    let mut u = 0.0f32;
    for r in ratios.iter().rev() {
        let t = h2 * r;
        u = t + t * u;
    }
    1.0 + u
}

/// Bound on |cos_turns(t) − cos(2πt)| (measured over 0..=1 in steps of 1e-5 by the unit
/// test below: f32 round-off of the reduction and the polynomial).
pub const COS_TURNS_BOUND: f32 = 4.0e-7;

impl Window {
    /// True when the window's parameters are usable (finite β in 0..=[`KAISER_BETA_MAX`]).
    pub fn is_valid(&self) -> bool {
        match *self {
            Window::Kaiser { beta } => beta.is_finite() && (0.0..=KAISER_BETA_MAX).contains(&beta),
            _ => true,
        }
    }

    /// w_k for point `k` of `n`, in 0..=1; 1 for n ≤ 1 and 0 for k ≥ n.
    pub fn coefficient(&self, k: usize, n: usize) -> f32 {
        self.prepare().coefficient(k, n)
    }

    /// The window with its per-sweep constant (I0(β) for Kaiser) worked out once, for
    /// evaluating many coefficients.
    pub fn prepare(&self) -> PreparedWindow {
        let (beta, inv_i0_beta, terms) = match *self {
            Window::Kaiser { beta } => {
                let beta = if beta.is_finite() {
                    beta.clamp(0.0, KAISER_BETA_MAX)
                } else {
                    0.0
                };
                // I0(β) ≥ 1, so the reciprocal is in (0, 1]. The argument of I0 never
                // exceeds β, so β's term count serves every coefficient.
                let (i0_beta, terms) = i0_and_terms(beta);
                (beta, 1.0 / i0_beta, terms)
            }
            _ => (0.0, 1.0, 0),
        };
        PreparedWindow {
            window: *self,
            beta,
            inv_i0_beta,
            terms,
        }
    }
}

/// A [`Window`] ready for repeated evaluation (see [`Window::prepare`]).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PreparedWindow {
    window: Window,
    beta: f32,
    inv_i0_beta: f32,
    terms: u32,
}

impl PreparedWindow {
    /// w_k for point `k` of `n`, in 0..=1; 1 for n ≤ 1 and 0 for k ≥ n.
    pub fn coefficient(&self, k: usize, n: usize) -> f32 {
        if k >= n {
            return 0.0;
        }
        if n <= 1 {
            return 1.0;
        }
        let x = k as f32 / (n - 1) as f32;
        self.at_half(if x <= 0.5 { x } else { 1.0 - x })
    }

    /// The window at x = k/(N − 1) for x in 0..=0.5 (its first half; the windows are
    /// symmetric about 0.5), in 0..=1.
    #[inline]
    pub(super) fn at_half(&self, x: f32) -> f32 {
        let w = match self.window {
            Window::Rectangular => return 1.0,
            Window::Hann => 0.5 * (1.0 - cos_half_turn(x)),
            Window::Kaiser { .. } => {
                // I0(β·√(1 − u²)) with u = 2x − 1: its series needs only (β/2)²·(1 − u²)
                // = β²·x·(1 − x), so no square root.
                let h2 = self.beta * self.beta * (x * (1.0 - x));
                let h2 = if h2 > 0.0 { h2 } else { 0.0 };
                i0_horner(h2, self.terms) * self.inv_i0_beta
            }
        };
        if w > 0.0 {
            if w < 1.0 {
                w
            } else {
                1.0
            }
        } else {
            0.0
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (x, I0(x)) from Abramowitz and Stegun Table 9.8 (I0(1) = 1.266065878,
    /// I0(2) = 2.279585302, I0(5) = 27.23987182).
    const I0_VECTORS: [(f32, f32); 4] = [
        (0.0, 1.0),
        (1.0, 1.266_066),
        (2.0, 2.279_585),
        (5.0, 27.239_872),
    ];
    /// Relative error allowed on I0.
    const I0_TOL: f32 = 2.0e-6;

    #[test]
    fn i0_vectors() {
        for &(x, want) in I0_VECTORS.iter() {
            let got = bessel_i0(x);
            assert!((got - want).abs() <= I0_TOL * want, "{x}: {got}");
        }
        assert!(bessel_i0(KAISER_BETA_MAX).is_finite());
    }

    #[test]
    fn cos_turns_against_f64() {
        let mut worst = 0.0f64;
        for i in 0..=100_000 {
            let t = i as f32 * 1.0e-5;
            let want = (core::f64::consts::TAU * t as f64).cos();
            worst = worst.max((cos_turns(t) as f64 - want).abs());
        }
        assert!(worst < COS_TURNS_BOUND as f64, "{worst}");
        assert_eq!(cos_turns(f32::NAN), 1.0);
        assert!((cos_turns(-0.25)).abs() < 1e-6 && (cos_turns(3.5) + 1.0).abs() < 1e-6);
    }

    #[test]
    fn shapes() {
        assert_eq!(Window::Hann.coefficient(0, 9), 0.0);
        assert!((Window::Hann.coefficient(4, 9) - 1.0).abs() < 1e-6);
        assert!((Window::Hann.coefficient(2, 9) - 0.5).abs() < 1e-6);
        let k = Window::Kaiser { beta: 6.0 };
        assert!((k.coefficient(4, 9) - 1.0).abs() < 1e-6);
        assert!((k.coefficient(0, 9) - 1.0 / bessel_i0(6.0)).abs() < 1e-6);
        assert_eq!(Window::Kaiser { beta: 0.0 }.coefficient(0, 9), 1.0);
        assert!(!Window::Kaiser { beta: f32::NAN }.is_valid());
        assert_eq!(Window::Rectangular.coefficient(9, 9), 0.0);
    }
}
