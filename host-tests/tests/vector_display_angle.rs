//! The display angle (micromath `atan2`, rounded to whole degrees) against f64 `atan2` from
//! the standard library, over the whole circle and many magnitudes. Prints the worst error.

use feedline::vector::{display_angle_degrees, DISPLAY_ANGLE_BOUND_DEG};
use num_complex::Complex32;

#[test]
fn whole_circle_within_one_display_step() {
    let mut worst = (0.0f64, 0.0f64, 0.0f64);
    for k in 0..36_000 {
        let a = (f64::from(k) / 100.0 - 180.0).to_radians();
        for &m in &[1e-30f64, 1e-3, 0.5, 1.0, 7.0, 1e30] {
            let z = Complex32::new((m * a.cos()) as f32, (m * a.sin()) as f32);
            let truth = f64::from(z.im).atan2(f64::from(z.re)).to_degrees();
            let shown = f64::from(display_angle_degrees(z).unwrap());
            let mut err = (shown - truth).abs();
            if err > 180.0 {
                err = 360.0 - err; // −180 and 180 are the same direction
            }
            if err > worst.0 {
                worst = (err, truth, m);
            }
        }
    }
    println!(
        "display angle: worst error {:.3}° at {:.2}° (|z| = {:e}), bound {}°",
        worst.0, worst.1, worst.2, DISPLAY_ANGLE_BOUND_DEG
    );
    assert!(worst.0 <= f64::from(DISPLAY_ANGLE_BOUND_DEG));
}
