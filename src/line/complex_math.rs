//! Small complex helpers with the accuracy the line models need (private).
//!
//! `principal_sqrt` uses the textbook cancellation-free form (e.g. Press et al., *Numerical
//! Recipes*, §5.5): for z = a + jb with a < 0 the real part is |b|/(2t), t = √((|z| − a)/2),
//! so a small α of γ = √(ZY) keeps its relative precision even when α ≪ β (a polar-form
//! square root loses it in cos(θ/2) near π/2).
//!
//! Panic policy: nothing here panics.

use num_complex::Complex32;

/// The principal square root (real part ≥ 0), accurate in both parts.
pub(crate) fn principal_sqrt(z: Complex32) -> Complex32 {
    let (a, b) = (z.re, z.im);
    if a == 0.0 && b == 0.0 {
        return Complex32::new(0.0, 0.0);
    }
    let m = libm::hypotf(a, b);
    if a >= 0.0 {
        let t = libm::sqrtf(0.5 * m + 0.5 * a);
        Complex32::new(t, b / (2.0 * t))
    } else {
        let t = libm::sqrtf(0.5 * m - 0.5 * a);
        Complex32::new(libm::fabsf(b) / (2.0 * t), libm::copysignf(t, b))
    }
}

/// True when both parts are finite.
#[inline]
pub(crate) fn is_finite(z: Complex32) -> bool {
    z.re.is_finite() && z.im.is_finite()
}

/// e^z with the exponent's real part limited so that the result cannot overflow: a real part
/// above `max_re` is an error (`None`).
pub(crate) fn exp_checked(z: Complex32, max_re: f32) -> Option<Complex32> {
    if !is_finite(z) || z.re > max_re {
        return None;
    }
    let m = libm::expf(z.re);
    let (s, c) = (libm::sinf(z.im), libm::cosf(z.im));
    let r = Complex32::new(m * c, m * s);
    if is_finite(r) {
        Some(r)
    } else {
        None
    }
}

/// a / b, `None` when b is zero or the quotient is not finite. Scales by the larger part of
/// b first (Smith's method, Smith 1962, *Comm. ACM* 5(8) Algorithm 116) so that |b|² cannot
/// overflow or underflow.
pub(crate) fn div(a: Complex32, b: Complex32) -> Option<Complex32> {
    if b.re == 0.0 && b.im == 0.0 {
        return None;
    }
    let q = if libm::fabsf(b.re) >= libm::fabsf(b.im) {
        let r = b.im / b.re;
        let d = b.re + b.im * r;
        Complex32::new((a.re + a.im * r) / d, (a.im - a.re * r) / d)
    } else {
        let r = b.re / b.im;
        let d = b.re * r + b.im;
        Complex32::new((a.re * r + a.im) / d, (a.im * r - a.re) / d)
    };
    if is_finite(q) {
        Some(q)
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Worst relative error allowed against the exact roots below (a few f32 ulps).
    const SQRT_BOUND: f32 = 1e-6;

    #[test]
    fn sqrt_vectors() {
        // (z, √z) exact by hand: √(−4) = 2j, √(3 + 4j) = 2 + j, √(−3 − 4j) = 1 − 2j.
        let v = [
            ((-4.0, 0.0), (0.0, 2.0)),
            ((3.0, 4.0), (2.0, 1.0)),
            ((-3.0, -4.0), (1.0, -2.0)),
            ((0.0, 0.0), (0.0, 0.0)),
        ];
        for ((a, b), (x, y)) in v {
            let r = principal_sqrt(Complex32::new(a, b));
            assert!((r.re - x).abs() <= SQRT_BOUND * 2.0, "{a} {b}");
            assert!((r.im - y).abs() <= SQRT_BOUND * 2.0, "{a} {b}");
        }
        // Low-loss shape: −β² + j·2αβ with α/β = 1e-6 keeps α to f32 precision.
        let beta = 3.0f32;
        let alpha = 3.0e-6f32;
        let r = principal_sqrt(Complex32::new(-beta * beta, 2.0 * alpha * beta));
        assert!((r.re / alpha - 1.0).abs() < 1e-5);
    }

    #[test]
    fn division() {
        let q = div(Complex32::new(1.0, 2.0), Complex32::new(3.0, -4.0)).unwrap();
        // (1 + 2j)/(3 − 4j) = (−5 + 10j)/25 = −0.2 + 0.4j.
        assert!((q.re + 0.2).abs() < 1e-7 && (q.im - 0.4).abs() < 1e-7);
        assert!(div(Complex32::new(1.0, 0.0), Complex32::new(0.0, 0.0)).is_none());
        let big = div(Complex32::new(1.0, 0.0), Complex32::new(1e30, 1e30)).unwrap();
        assert!(big.re > 0.0);
    }
}
