//! The distance-to-fault transform against rustfft in f64 (the reference library named by the
//! project's rules), over every supported size, with the worst error printed.
//!
//! Run: `cargo test -p feedline-host-tests --test dtf_fft -- --nocapture`.

use feedline::dtf::{
    forward_in_place, transform_in_place, DtfSetup, NoLoss, Window, FFT_MAX, FFT_MIN,
};
use feedline::units::Hertz;
use num_complex::{Complex32, Complex64};
use rustfft::FftPlanner;

/// Worst error of the f32 FFT relative to the largest reference bin, allowed (f32 radix-2
/// round-off grows as ε·log2 M; 2048 points stay well under this).
const FFT_REL_BOUND: f64 = 5.0e-7;
/// Worst error of the full windowed transform's magnitudes relative to the peak, allowed.
const TRANSFORM_REL_BOUND: f64 = 1.5e-6;

/// A small deterministic generator (xorshift64*), so inputs vary without a dependency.
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        let v = self.0.wrapping_mul(0x2545_F491_4F6C_DD1D);
        (v >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
    }
}

#[test]
fn forward_fft_matches_rustfft() {
    let mut planner = FftPlanner::<f64>::new();
    let mut rng = Rng(0x1234_5678_9abc_def1);
    let mut worst = (0.0f64, 0usize, 0usize);
    let mut m = FFT_MIN;
    while m <= FFT_MAX {
        for _trial in 0..3 {
            let x: Vec<Complex64> = (0..m)
                .map(|_| Complex64::new(rng.next(), rng.next()))
                .collect();
            let mut core: Vec<Complex32> = x
                .iter()
                .map(|c| Complex32::new(c.re as f32, c.im as f32))
                .collect();
            assert!(forward_in_place(&mut core));
            let mut want: Vec<Complex64> = core_input_as_f64(&x);
            planner.plan_fft_forward(m).process(&mut want);
            let peak = want.iter().map(|c| c.norm()).fold(0.0, f64::max);
            for (n, (a, b)) in core.iter().zip(want.iter()).enumerate() {
                let e = (Complex64::new(a.re as f64, a.im as f64) - b).norm() / peak;
                if e > worst.0 {
                    worst = (e, m, n);
                }
            }
        }
        m *= 2;
    }
    println!(
        "FFT vs rustfft f64: worst |error|/peak = {:.3e} at M = {}, bin {}",
        worst.0, worst.1, worst.2
    );
    assert!(worst.0 < FFT_REL_BOUND);
}

/// The f32 input rounded as the core sees it, in f64.
fn core_input_as_f64(x: &[Complex64]) -> Vec<Complex64> {
    x.iter()
        .map(|c| Complex64::new(c.re as f32 as f64, c.im as f32 as f64))
        .collect()
}

/// Window coefficients in f64, from the definitions (Harris 1978; Kaiser with I0 by its power
/// series, Abramowitz and Stegun 9.6.10), written apart from the core.
fn window64(kind: &str, beta: f64, k: usize, n: usize) -> f64 {
    let x = k as f64 / (n - 1) as f64;
    match kind {
        "hann" => 0.5 * (1.0 - (2.0 * std::f64::consts::PI * x).cos()),
        "kaiser" => {
            let i0 = |z: f64| {
                let (mut t, mut s) = (1.0f64, 1.0f64);
                for m in 1..300 {
                    let r = z / 2.0 / m as f64;
                    t *= r * r;
                    s += t;
                }
                s
            };
            let u = 2.0 * x - 1.0;
            i0(beta * (1.0 - u * u).max(0.0).sqrt()) / i0(beta)
        }
        _ => 1.0,
    }
}

#[test]
fn windowed_transform_matches_reference_idft() {
    let mut planner = FftPlanner::<f64>::new();
    let mut rng = Rng(0x0bad_cafe_f00d_1234);
    let cases = [
        ("rect", 0.0, Window::Rectangular, 256usize, 1024usize),
        ("hann", 0.0, Window::Hann, 256, 1024),
        ("kaiser", 6.0, Window::Kaiser { beta: 6.0 }, 201, 512),
        ("kaiser", 13.0, Window::Kaiser { beta: 13.0 }, 64, 2048),
    ];
    let mut worst = (0.0f64, "", 0usize);
    for (name, beta, window, n, m) in cases {
        let x: Vec<Complex64> = (0..n)
            .map(|_| Complex64::new(rng.next(), rng.next()) * 0.5)
            .collect();
        let x = core_input_as_f64(&x);
        // Reference: windowed, zero-padded inverse DFT, normalised by Σw (rustfft's inverse is
        // unnormalised: Σ x_k e^(+j2πkn/M)).
        let w: Vec<f64> = (0..n).map(|k| window64(name, beta, k, n)).collect();
        let sw: f64 = w.iter().sum();
        let mut r: Vec<Complex64> = vec![Complex64::new(0.0, 0.0); m];
        for k in 0..n {
            r[k] = x[k] * w[k];
        }
        planner.plan_fft_inverse(m).process(&mut r);
        let mut buf: Vec<Complex32> = vec![Complex32::new(0.0, 0.0); m];
        for k in 0..n {
            buf[k] = Complex32::new(x[k].re as f32, x[k].im as f32);
        }
        let setup = DtfSetup {
            start: Hertz::new(1.0e6),
            stop: Hertz::new(101.0e6),
            window,
            velocity_factor: 0.66,
            loss: NoLoss,
        };
        let resp = transform_in_place(&mut buf, n, &setup).unwrap();
        let peak = r.iter().map(|c| c.norm() / sw).fold(0.0, f64::max);
        for (i, c) in r.iter().enumerate() {
            let got = resp.raw_magnitude(i).unwrap() as f64;
            let e = (got - c.norm() / sw).abs() / peak;
            if e > worst.0 {
                worst = (e, name, i);
            }
        }
    }
    println!(
        "windowed transform vs rustfft f64 IDFT: worst |Δ magnitude|/peak = {:.3e} ({} window, bin {})",
        worst.0, worst.1, worst.2
    );
    assert!(worst.0 < TRANSFORM_REL_BOUND);
}
