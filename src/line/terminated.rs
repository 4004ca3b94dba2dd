//! A lossy line of given length with any load: the reflection coefficient moved along the
//! line, the input impedance, and embedding / de-embedding a complex Γ reading.
//!
//! Relations (Pozar, *Microwave Engineering*, 4th ed., §2.3 and §2.7):
//!
//! - ΓL = (ZL − Z0)/(ZL + Z0), Γin = ΓL·e^(−2γℓ), Zin = Z0·(1 + Γin)/(1 − Γin), which equals
//!   Z0·(ZL + Z0·tanh γℓ)/(Z0 + ZL·tanh γℓ);
//! - a reading Γm taken in the analyzer's reference impedance Zref changes reference by the
//!   bilinear map Γ' = (Γ − ρ)/(1 − ρΓ), ρ = (Z0 − Zref)/(Z0 + Zref) (voltage-wave, i.e.
//!   pseudo-wave, reflection coefficients; Marks & Williams, "A general waveguide circuit
//!   theory", J. Res. NIST 97(5), 1992). De-embedding: map to Z0, multiply by e^(+2γℓ), map
//!   back to Zref.
//!
//! Supported: any finite complex load (passive or not) except ZL = −Z0; any length ≥ 0;
//! |Γ| = 1 loads (open, short, reactance). The open circuit is the load Γ = 1 in
//! [`Line::input_impedance_from_gamma`]. Limits: a length over which e^(2αℓ) overflows `f32`
//! (more than about 380 dB of round-trip loss) cannot be de-embedded
//! ([`LineError::Overflow`]); an open seen through a lossless length of nλ/2 has no finite
//! input impedance ([`LineError::InfiniteImpedance`]). De-embedding divides out the loss: a
//! reading's noise grows by e^(2αℓ), and the result may have |Γ| > 1 — it is returned as
//! computed, not clamped.
//!
//! Phase precision: the phase 2βℓ is formed in f32, so its absolute error grows with the
//! electrical length (about 1e-7 of 2βℓ in radians).
//!
//! Panic policy: nothing in this module panics; no function returns NaN or infinity.

use num_complex::Complex32;

use super::complex_math::{div, exp_checked, is_finite};
use super::propagation::Line;
use super::{input, length_m, positive, LineError};
use crate::units::{Length, Ohms};

/// The largest round-trip attenuation 2αℓ in nepers that is divided out in de-embedding
/// (e^87 ≈ 6e37, below `f32::MAX`).
pub const MAX_ROUND_TRIP_NP: f32 = 87.0;

fn checked(z: Complex32) -> Result<Complex32, LineError> {
    input(z.re)?;
    input(z.im)?;
    Ok(z)
}

fn finite_out(z: Complex32) -> Result<Complex32, LineError> {
    if is_finite(z) {
        Ok(z)
    } else {
        Err(LineError::Overflow)
    }
}

/// (Γ − ρ)/(1 − ρΓ).
fn rereference(g: Complex32, rho: Complex32) -> Result<Complex32, LineError> {
    let one = Complex32::new(1.0, 0.0);
    div(g - rho, one - rho * g).ok_or(LineError::Overflow)
}

impl Line {
    /// e^(∓2γℓ) for a length in metres: `sign` = −1 toward the generator, +1 toward the load.
    fn round_trip(&self, len_m: f32, sign: f32) -> Result<Complex32, LineError> {
        let g = self.gamma_per_m();
        let e = Complex32::new(sign * 2.0 * g.re * len_m, sign * 2.0 * g.im * len_m);
        finite_out(e)?;
        if e.re < -MAX_ROUND_TRIP_NP * 2.0 {
            // Beyond e^−174 the factor is 0 in f32; say so without calling expf.
            return Ok(Complex32::new(0.0, 0.0));
        }
        exp_checked(e, MAX_ROUND_TRIP_NP).ok_or(LineError::Overflow)
    }

    /// ΓL (in this line's Z0) of a load impedance.
    pub fn load_reflection(&self, z_load: Complex32) -> Result<Complex32, LineError> {
        let zl = checked(z_load)?;
        let z0 = self.characteristic_impedance();
        if zl + z0 == Complex32::new(0.0, 0.0) {
            return Err(LineError::OutOfRange);
        }
        div(zl - z0, zl + z0).ok_or(LineError::Overflow)
    }

    /// Γ moved from the load toward the generator by `length`: ΓL·e^(−2γℓ) (both in this
    /// line's Z0).
    pub fn gamma_at_input<U: Length>(
        &self,
        gamma_load: Complex32,
        length: U,
    ) -> Result<Complex32, LineError> {
        let g = checked(gamma_load)?;
        let l = length_m(length)?;
        finite_out(g * self.round_trip(l, -1.0)?)
    }

    /// Γ moved from the input toward the load by `length`: Γin·e^(+2γℓ) (this line's Z0).
    pub fn gamma_at_load<U: Length>(
        &self,
        gamma_input: Complex32,
        length: U,
    ) -> Result<Complex32, LineError> {
        let g = checked(gamma_input)?;
        let l = length_m(length)?;
        finite_out(g * self.round_trip(l, 1.0)?)
    }

    /// Zin of `length` of this line ending in a load of reflection ΓL (in this line's Z0).
    /// Γ = 1 is an open, Γ = −1 a short.
    pub fn input_impedance_from_gamma<U: Length>(
        &self,
        gamma_load: Complex32,
        length: U,
    ) -> Result<Complex32, LineError> {
        let gin = self.gamma_at_input(gamma_load, length)?;
        let one = Complex32::new(1.0, 0.0);
        let z = div(one + gin, one - gin).ok_or(LineError::InfiniteImpedance)?;
        finite_out(self.characteristic_impedance() * z)
    }

    /// Zin of `length` of this line ending in the load impedance `z_load`.
    pub fn input_impedance<U: Length>(
        &self,
        z_load: Complex32,
        length: U,
    ) -> Result<Complex32, LineError> {
        let gl = self.load_reflection(z_load)?;
        self.input_impedance_from_gamma(gl, length)
    }

    fn rho(&self, z_ref: Ohms) -> Result<Complex32, LineError> {
        let zr = Complex32::new(positive(z_ref.value())?, 0.0);
        let z0 = self.characteristic_impedance();
        div(z0 - zr, z0 + zr).ok_or(LineError::Overflow)
    }

    /// What an analyzer of reference impedance `z_ref` reads at the input of `length` of this
    /// line ending in a load of reflection `gamma_load` (in `z_ref`).
    pub fn embed<U: Length>(
        &self,
        gamma_load: Complex32,
        length: U,
        z_ref: Ohms,
    ) -> Result<Complex32, LineError> {
        let g = checked(gamma_load)?;
        let rho = self.rho(z_ref)?;
        let in_z0 = rereference(g, rho)?;
        let moved = self.gamma_at_input(in_z0, length)?;
        rereference(moved, -rho)
    }

    /// The load's reflection (in `z_ref`) from a complex reading `gamma_measured` taken by an
    /// analyzer of reference impedance `z_ref` at the input of `length` of this line.
    pub fn deembed<U: Length>(
        &self,
        gamma_measured: Complex32,
        length: U,
        z_ref: Ohms,
    ) -> Result<Complex32, LineError> {
        let g = checked(gamma_measured)?;
        let rho = self.rho(z_ref)?;
        let in_z0 = rereference(g, rho)?;
        let moved = self.gamma_at_load(in_z0, length)?;
        rereference(moved, -rho)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::line::LineConstants;
    use crate::line::SPEED_OF_LIGHT;
    use crate::units::{Hertz, Meters};

    /// Absolute bound on impedances (Ω) and Γ in the worked cases below.
    const BOUND: f32 = 1e-3;

    /// Lossless 50 Ω air line at 75 MHz: λ = 3.997 m.
    fn air50() -> Line {
        let v = SPEED_OF_LIGHT;
        LineConstants::per_meter(0.0, 50.0 / v, 0.0, 1.0 / (50.0 * v))
            .at(Hertz::new(75.0e6))
            .unwrap()
    }

    #[test]
    fn quarter_wave_transformer() {
        // λ/4 of Z0 turns ZL into Z0²/ZL (Pozar §2.5): 100 Ω → 25 Ω.
        let line = air50();
        let q = Meters::new(line.wavelength::<Meters>().value() / 4.0);
        let z = line.input_impedance(Complex32::new(100.0, 0.0), q).unwrap();
        assert!((z.re - 25.0).abs() < 0.01 && z.im.abs() < 0.05, "{z}");
        // A short λ/8 long is +j50 (Z0·tan(π/4)).
        let e = Meters::new(line.wavelength::<Meters>().value() / 8.0);
        let z = line
            .input_impedance_from_gamma(Complex32::new(-1.0, 0.0), e)
            .unwrap();
        assert!(z.re.abs() < BOUND && (z.im - 50.0).abs() < 0.01, "{z}");
        // An open at zero length: infinite.
        assert_eq!(
            line.input_impedance_from_gamma(Complex32::new(1.0, 0.0), Meters::new(0.0)),
            Err(LineError::InfiniteImpedance)
        );
        // Zero length returns the load.
        let z = line
            .input_impedance(Complex32::new(20.0, -7.0), Meters::new(0.0))
            .unwrap();
        assert!((z - Complex32::new(20.0, -7.0)).norm() < BOUND);
        assert_eq!(
            line.load_reflection(Complex32::new(-50.0, 0.0)),
            Err(LineError::OutOfRange)
        );
    }

    #[test]
    fn embed_deembed_round_trip() {
        let mut c = LineConstants::per_meter(0.2, 2.5e-7, 1e-6, 1.0e-10);
        c.resistance = 0.3;
        let line = c.at(Hertz::new(30.0e6)).unwrap();
        let gl = Complex32::new(0.3, -0.4);
        let m = line.embed(gl, Meters::new(12.0), Ohms::new(50.0)).unwrap();
        let back = line.deembed(m, Meters::new(12.0), Ohms::new(50.0)).unwrap();
        assert!((back - gl).norm() < 1e-4, "{back}");
        assert!(m.norm() < gl.norm());
        assert!(line
            .deembed(m, Meters::new(1.0e9), Ohms::new(50.0))
            .is_err());
        assert!(line.embed(gl, Meters::new(1.0), Ohms::new(0.0)).is_err());
        assert!(line
            .embed(
                Complex32::new(f32::NAN, 0.0),
                Meters::new(1.0),
                Ohms::new(50.0)
            )
            .is_err());
        // A very long lossy line hides the load completely: Γin = 0, defined.
        let far = line.gamma_at_input(gl, Meters::new(1.0e6)).unwrap();
        assert_eq!(far, Complex32::new(0.0, 0.0));
    }
}
