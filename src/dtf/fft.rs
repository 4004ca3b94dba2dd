//! The in-place FFT behind the transform: `microfft` (MIT licence, no_std, radix-2, f32)
//! dispatched on the buffer length.
//!
//! Why this crate: it is no_std with no allocator, in place, f32 with a flash sine table
//! (2 KiB for the `size-2048` feature), and measured here: worst error against rustfft in f64
//! 1.6e-7 of the peak bin over 16..=2048 points (host test `dtf_fft`); 1024 points in about
//! 111 k instructions on a Cortex-M4F; no panic path left in a release build of the transform
//! (checked by disassembling a Cortex-M4F build: no call to a panic function). Its fixed
//! sizes suit a caller-chosen power-of-two buffer.
//!
//! The inverse transform is taken as a forward FFT of the conjugated input
//! (IDFT(x) = conj(DFT(conj x))/M). The distance-to-fault code needs only magnitudes, so it
//! conjugates while windowing and skips the output conjugation; the 1/M and window
//! normalisation are folded into one scale factor applied on read.

use num_complex::Complex32;

/// The smallest transform length accepted.
pub const FFT_MIN: usize = 16;
/// The largest transform length accepted (the `size-2048` feature of microfft; its sine table
/// takes 2 KiB of flash).
pub const FFT_MAX: usize = 2048;

/// Forward DFT in place, X_n = Σ_k x_k·e^(−j2πkn/M), for a length M that is a power of two in
/// [`FFT_MIN`]..=[`FFT_MAX`]. Returns false (buffer untouched) for any other length.
pub fn forward_in_place(buf: &mut [Complex32]) -> bool {
    macro_rules! dispatch {
        ($($n:literal => $f:ident),*) => {
            match buf.len() {
                $($n => match <&mut [Complex32; $n]>::try_from(buf) {
                    Ok(a) => {
                        let _ = microfft::complex::$f(a);
                        true
                    }
                    Err(_) => false,
                },)*
                _ => false,
            }
        };
    }
    dispatch!(16 => cfft_16, 32 => cfft_32, 64 => cfft_64, 128 => cfft_128, 256 => cfft_256,
        512 => cfft_512, 1024 => cfft_1024, 2048 => cfft_2048)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn impulse_and_tone() {
        let mut b = [Complex32::new(0.0, 0.0); 16];
        b[0] = Complex32::new(1.0, 0.0);
        assert!(forward_in_place(&mut b));
        assert!(b
            .iter()
            .all(|c| (c.re - 1.0).abs() < 1e-6 && c.im.abs() < 1e-6));
        // x_k = e^(j2π·3k/16) → X_3 = 16, others 0.
        let mut b = [Complex32::new(0.0, 0.0); 16];
        for (k, c) in b.iter_mut().enumerate() {
            let p = core::f32::consts::TAU * 3.0 * k as f32 / 16.0;
            *c = Complex32::new(libm::cosf(p), libm::sinf(p));
        }
        assert!(forward_in_place(&mut b));
        assert!((b[3].re - 16.0).abs() < 1e-4);
        assert!(b[5].norm() < 1e-4);
        let mut odd = [Complex32::new(0.0, 0.0); 24];
        assert!(!forward_in_place(&mut odd));
    }
}
