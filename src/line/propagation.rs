//! A uniform line from its distributed constants R, L, G, C at a frequency: characteristic
//! impedance Z0, propagation constant γ = α + jβ, phase velocity, velocity factor,
//! wavelength on the line and delay per length, beside the low-loss approximations and
//! their error.
//!
//! Method (telegrapher's equations; Pozar, *Microwave Engineering*, 4th ed., §2.1, and §2.7
//! for the low-loss forms):
//!
//! - Z = R + jωL, Y = G + jωC per metre;
//! - γ = √(Z·Y) (principal root, computed cancellation-free so that α ≪ β keeps its
//!   precision), Z0 = Z/γ = √(Z/Y);
//! - phase velocity ω/β, velocity factor ω/(β·c), wavelength 2π/β, phase delay β/ω;
//! - low loss: Z0 ≈ √(L/C), β ≈ ω√(LC), α ≈ R/(2Z0) + G·Z0/2 (Pozar §2.7).
//!
//! Supported: f > 0, L > 0, C > 0, R ≥ 0, G ≥ 0, all finite; the constants may be given per
//! metre or per foot ([`LineConstants::per`]). Refused with [`LineError`]: f ≤ 0 (a DC line
//! has no wave impedance without G), L or C ≤ 0 (C = 0 has no wave), negative R or G,
//! non-finite input, and results beyond `f32` ([`LineError::Overflow`]).
//!
//! Panic policy: nothing in this module panics; no function returns NaN or infinity.

use num_complex::Complex32;

use super::complex_math::{div, is_finite, principal_sqrt};
use super::{input, non_negative, output, positive, LineError, SPEED_OF_LIGHT};
use crate::units::{
    Db, DbPer, FaradsPer, HenriesPer, Hertz, Length, Meters, MetersPerSecond, NpPer, Ohms, OhmsPer,
    RadPer, SecondsPer, SiemensPer,
};

/// Results larger than this are reported as [`LineError::Overflow`], which leaves room for
/// unit conversions (×3.3 at most) and lengths without reaching `f32::MAX`.
pub(crate) const RESULT_LIMIT: f32 = 1.0e30;

/// Distributed constants of a uniform line, stored per metre (SI).
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LineConstants {
    /// Series resistance R, Ω per metre (both conductors).
    pub resistance: f32,
    /// Series inductance L, H per metre.
    pub inductance: f32,
    /// Shunt conductance G, S per metre.
    pub conductance: f32,
    /// Shunt capacitance C, F per metre.
    pub capacitance: f32,
}

impl LineConstants {
    /// Constants given per metre: R in Ω/m, L in H/m, G in S/m, C in F/m.
    pub const fn per_meter(r: f32, l: f32, g: f32, c: f32) -> Self {
        Self {
            resistance: r,
            inductance: l,
            conductance: g,
            capacitance: c,
        }
    }

    /// Constants given per one length unit `U` (e.g. `LineConstants::per::<Feet>(..)` for a
    /// datasheet's "pF per foot"): R in Ω/U, L in H/U, G in S/U, C in F/U.
    pub fn per<U: Length>(r: f32, l: f32, g: f32, c: f32) -> Self {
        let k = 1.0 / U::METERS;
        Self::per_meter(r * k, l * k, g * k, c * k)
    }

    /// Constants from typed per-length values, in any one length unit `U`, e.g.
    /// `FaradsPer::<Feet>::new(30.8e-12)`.
    pub fn new<U: Length>(
        r: OhmsPer<U>,
        l: HenriesPer<U>,
        g: SiemensPer<U>,
        c: FaradsPer<U>,
    ) -> Self {
        Self::per_meter(
            r.per::<Meters>().value(),
            l.per::<Meters>().value(),
            g.per::<Meters>().value(),
            c.per::<Meters>().value(),
        )
    }

    /// R per length unit `U`.
    pub fn resistance_per<U: Length>(&self) -> OhmsPer<U> {
        OhmsPer::<Meters>::new(self.resistance).per::<U>()
    }

    /// L per length unit `U`.
    pub fn inductance_per<U: Length>(&self) -> HenriesPer<U> {
        HenriesPer::<Meters>::new(self.inductance).per::<U>()
    }

    /// G per length unit `U`.
    pub fn conductance_per<U: Length>(&self) -> SiemensPer<U> {
        SiemensPer::<Meters>::new(self.conductance).per::<U>()
    }

    /// C per length unit `U`.
    pub fn capacitance_per<U: Length>(&self) -> FaradsPer<U> {
        FaradsPer::<Meters>::new(self.capacitance).per::<U>()
    }

    /// The four constants per one length unit `U`, as (R, L, G, C).
    pub fn values_per<U: Length>(&self) -> (f32, f32, f32, f32) {
        let k = U::METERS;
        (
            self.resistance * k,
            self.inductance * k,
            self.conductance * k,
            self.capacitance * k,
        )
    }

    fn checked(&self) -> Result<(f32, f32, f32, f32), LineError> {
        // Report non-finite before out-of-range, whatever the order of the fields.
        for x in [
            self.resistance,
            self.inductance,
            self.conductance,
            self.capacitance,
        ] {
            input(x)?;
        }
        Ok((
            non_negative(self.resistance)?,
            positive(self.inductance)?,
            non_negative(self.conductance)?,
            positive(self.capacitance)?,
        ))
    }

    /// The exact line at frequency `f` (f > 0).
    pub fn at(&self, f: Hertz) -> Result<Line, LineError> {
        let (r, l, g, c) = self.checked()?;
        let f = positive(f.value())?;
        let w = output(core::f32::consts::TAU * f)?;
        let z = Complex32::new(r, output(w * l)?);
        let y = Complex32::new(g, output(w * c)?);
        let zy = z * y;
        if !is_finite(zy) {
            return Err(LineError::Overflow);
        }
        let gamma = principal_sqrt(zy);
        let z0 = div(z, gamma).ok_or(LineError::Overflow)?;
        Line::from_parts(Hertz::new(f), z0, gamma)
    }

    /// The low-loss approximations at frequency `f` (f > 0).
    pub fn low_loss(&self, f: Hertz) -> Result<LowLoss, LineError> {
        let (r, l, g, c) = self.checked()?;
        let f = positive(f.value())?;
        let w = output(core::f32::consts::TAU * f)?;
        let z0 = output(libm::sqrtf(l) / libm::sqrtf(c))?;
        let beta = output(w * libm::sqrtf(l) * libm::sqrtf(c))?;
        let alpha = output(r / (2.0 * z0) + g * z0 / 2.0)?;
        if z0 <= 0.0 || beta <= 0.0 {
            return Err(LineError::Overflow);
        }
        limit(z0)?;
        limit(beta)?;
        limit(alpha)?;
        Ok(LowLoss {
            z0: Ohms::new(z0),
            alpha: NpPer::new(alpha),
            beta: RadPer::new(beta),
        })
    }

    /// How far the low-loss approximations are from the exact values at `f`.
    pub fn approximation_error(&self, f: Hertz) -> Result<ApproximationError, LineError> {
        let exact = self.at(f)?;
        let approx = self.low_loss(f)?;
        Ok(approx.error_against(&exact))
    }
}

fn limit(x: f32) -> Result<f32, LineError> {
    if libm::fabsf(x) <= RESULT_LIMIT {
        Ok(x)
    } else {
        Err(LineError::Overflow)
    }
}

/// A uniform line at one frequency: Z0 and γ (per metre internally).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Line {
    frequency: Hertz,
    z0_re: f32,
    z0_im: f32,
    /// α, Np/m.
    alpha: f32,
    /// β, rad/m.
    beta: f32,
}

impl Line {
    /// A line from its characteristic impedance and propagation constant γ per one length
    /// unit `U` at frequency `f`. Needs f > 0, Re Z0 > 0, α ≥ 0, β > 0, all finite.
    pub fn new<U: Length>(
        f: Hertz,
        z0: Complex32,
        gamma_per_unit: Complex32,
    ) -> Result<Self, LineError> {
        let k = 1.0 / U::METERS;
        let g = Complex32::new(input(gamma_per_unit.re)? * k, input(gamma_per_unit.im)? * k);
        let z = Complex32::new(input(z0.re)?, input(z0.im)?);
        if z.re <= 0.0 || g.re < 0.0 || g.im <= 0.0 {
            return Err(LineError::OutOfRange);
        }
        Self::from_parts(Hertz::new(positive(f.value())?), z, g)
    }

    /// A line described the way a datasheet does: a real Z0, a velocity factor (0 < VF ≤ 1)
    /// and a matched attenuation at frequency `f`. β = ω/(VF·c).
    pub fn from_datasheet<U: Length>(
        f: Hertz,
        z0: Ohms,
        velocity_factor: f32,
        attenuation: DbPer<U>,
    ) -> Result<Self, LineError> {
        let f_hz = positive(f.value())?;
        let vf = positive(velocity_factor)?;
        if vf > 1.0 {
            return Err(LineError::OutOfRange);
        }
        let a = non_negative(attenuation.value())?;
        let alpha = a / crate::units::DB_PER_NP;
        let beta_per_m = output(f.omega() / (vf * SPEED_OF_LIGHT))?;
        let beta = beta_per_m * U::METERS;
        Self::new::<U>(
            Hertz::new(f_hz),
            Complex32::new(z0.value(), 0.0),
            Complex32::new(alpha, beta),
        )
    }

    pub(crate) fn from_parts(f: Hertz, z0: Complex32, gamma: Complex32) -> Result<Self, LineError> {
        if !is_finite(z0) || !is_finite(gamma) {
            return Err(LineError::Overflow);
        }
        for x in [z0.re, z0.im, gamma.re, gamma.im] {
            limit(x)?;
        }
        if z0.re <= 0.0 || gamma.im <= 0.0 || gamma.re < 0.0 {
            // β underflowed to 0 or Z0 to 0: the inputs are too small for f32.
            return Err(LineError::Overflow);
        }
        let w = f.omega();
        // The derived quantities below must be finite too (β tiny against ω).
        limit(output(w / gamma.im)?)?;
        limit(output(gamma.im / w)?)?;
        limit(output(core::f32::consts::TAU / gamma.im)?)?;
        Ok(Self {
            frequency: f,
            z0_re: z0.re,
            z0_im: z0.im,
            alpha: gamma.re,
            beta: gamma.im,
        })
    }

    /// The frequency of this line description.
    #[inline]
    pub fn frequency(&self) -> Hertz {
        self.frequency
    }

    /// The characteristic impedance Z0 (complex; Re Z0 > 0).
    #[inline]
    pub fn characteristic_impedance(&self) -> Complex32 {
        Complex32::new(self.z0_re, self.z0_im)
    }

    /// γ = α + jβ per one length unit `U` (α in Np, β in rad).
    pub fn propagation_constant<U: Length>(&self) -> Complex32 {
        self.gamma_per_m() * U::METERS
    }

    /// γ per metre (α in Np/m, β in rad/m).
    #[inline]
    pub(crate) fn gamma_per_m(&self) -> Complex32 {
        Complex32::new(self.alpha, self.beta)
    }

    /// The attenuation constant α in nepers per length unit `U`.
    pub fn attenuation_np<U: Length>(&self) -> NpPer<U> {
        NpPer::<Meters>::new(self.alpha).per::<U>()
    }

    /// The attenuation constant α in decibels per length unit `U` (the matched loss per length).
    pub fn attenuation<U: Length>(&self) -> DbPer<U> {
        self.attenuation_np::<U>().to_db()
    }

    /// The phase constant β in radians per length unit `U`.
    pub fn phase_constant<U: Length>(&self) -> RadPer<U> {
        RadPer::<Meters>::new(self.beta).per::<U>()
    }

    /// Phase velocity ω/β.
    pub fn phase_velocity(&self) -> MetersPerSecond {
        MetersPerSecond::new(self.frequency.omega() / self.beta)
    }

    /// Velocity factor: phase velocity over the speed of light in vacuum.
    pub fn velocity_factor(&self) -> f32 {
        self.phase_velocity().value() / SPEED_OF_LIGHT
    }

    /// The wavelength on the line, 2π/β.
    pub fn wavelength<U: Length>(&self) -> U {
        U::from_meters(Meters::new(core::f32::consts::TAU / self.beta))
    }

    /// The phase delay per length unit `U`, β/ω.
    pub fn delay<U: Length>(&self) -> SecondsPer<U> {
        SecondsPer::<Meters>::new(self.beta / self.frequency.omega()).per::<U>()
    }

    /// The matched loss of a length of this line (α·ℓ in dB). Zero length gives 0 dB; a
    /// negative or non-finite length is refused.
    pub fn matched_loss<U: Length>(&self, length: U) -> Result<Db, LineError> {
        let l = super::length_m(length)?;
        Ok(Db::new(output(self.attenuation::<Meters>().value() * l)?))
    }
}

/// The low-loss approximations of a line's constants.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LowLoss {
    /// Z0 ≈ √(L/C), real.
    pub z0: Ohms,
    /// α ≈ R/(2Z0) + G·Z0/2, Np per metre.
    pub alpha: NpPer<Meters>,
    /// β ≈ ω√(LC), rad per metre.
    pub beta: RadPer<Meters>,
}

impl LowLoss {
    /// The relative error of each approximation against the exact line.
    pub fn error_against(&self, exact: &Line) -> ApproximationError {
        let z0 = exact.characteristic_impedance();
        let z_mag = libm::hypotf(z0.re, z0.im);
        let dz = libm::hypotf(self.z0.value() - z0.re, z0.im);
        let a = exact.gamma_per_m().re;
        let b = exact.gamma_per_m().im;
        let da = libm::fabsf(self.alpha.value() - a);
        ApproximationError {
            z0: rel(dz, z_mag),
            alpha: rel(da, a),
            beta: rel(libm::fabsf(self.beta.value() - b), b),
        }
    }
}

/// |error| / |exact|; 0 when both are 0; `f32::MAX` when only the exact value is 0.
fn rel(err: f32, exact: f32) -> f32 {
    let e = libm::fabsf(exact);
    if err == 0.0 {
        0.0
    } else if e == 0.0 {
        f32::MAX
    } else {
        let r = err / e;
        if r.is_finite() {
            r
        } else {
            f32::MAX
        }
    }
}

/// The relative error of the low-loss approximations (|approx − exact| / |exact|).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ApproximationError {
    /// Of Z0 ≈ √(L/C) (complex distance over |Z0|).
    pub z0: f32,
    /// Of α ≈ R/(2Z0) + G·Z0/2 (0 for a lossless line).
    pub alpha: f32,
    /// Of β ≈ ω√(LC).
    pub beta: f32,
}

impl ApproximationError {
    /// The largest of the three.
    pub fn worst(&self) -> f32 {
        self.z0.max(self.alpha).max(self.beta)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::Feet;

    /// Relative bound for the worked values below (f32 arithmetic and the 4-digit inputs).
    const WORKED_BOUND: f32 = 2e-3;

    /// A lossless 50 Ω, VF 0.66 line (solid PE, εr = 2.2957): L = Z0/v, C = 1/(Z0·v).
    fn pe50() -> LineConstants {
        let v = 0.66 * SPEED_OF_LIGHT;
        LineConstants::per_meter(0.0, 50.0 / v, 0.0, 1.0 / (50.0 * v))
    }

    #[test]
    fn lossless_line_is_exact() {
        let line = pe50().at(Hertz::new(10.0e6)).unwrap();
        let z0 = line.characteristic_impedance();
        assert!((z0.re - 50.0).abs() < 50.0 * 1e-5 && z0.im.abs() < 1e-4);
        assert_eq!(line.attenuation::<Meters>().value(), 0.0);
        assert!((line.velocity_factor() - 0.66).abs() < 1e-5);
        // λ = VF·c/f = 0.66 · 299.79 / 10 m = 19.786 m.
        assert!((line.wavelength::<Meters>().value() - 19.786).abs() < 19.786 * WORKED_BOUND);
        // Delay per metre 1/(VF·c) = 5.054 ns/m; per foot 1.540 ns.
        assert!((line.delay::<Meters>().value() - 5.054e-9).abs() < 5.054e-9 * WORKED_BOUND);
        assert!((line.delay::<Feet>().value() - 1.5405e-9).abs() < 1.5405e-9 * WORKED_BOUND);
        assert_eq!(line.matched_loss(Feet::new(100.0)).unwrap().value(), 0.0);
        let e = pe50().approximation_error(Hertz::new(10.0e6)).unwrap();
        assert!(e.worst() < 1e-5, "{e:?}");
    }

    #[test]
    fn low_loss_error_grows_at_low_frequency() {
        // R = 0.1 Ω/m: ωL ≫ R at 100 MHz, ωL ≈ R near 30 kHz.
        let mut c = pe50();
        c.resistance = 0.1;
        let hi = c.approximation_error(Hertz::new(100.0e6)).unwrap();
        let lo = c.approximation_error(Hertz::new(30.0e3)).unwrap();
        // Z0's error is first order in R/(ωL) = 6.3e-4 (its imaginary part, R/(2ωL)·Z0);
        // α and β are second order.
        assert!((hi.z0 - 3.15e-4).abs() < 1e-5, "{hi:?}");
        assert!(hi.alpha < 1e-5 && hi.beta < 1e-5, "{hi:?}");
        assert!(lo.worst() > 0.05, "{lo:?}");
        // α ≈ R/(2Z0) = 1e-3 Np/m at high frequency.
        let line = c.at(Hertz::new(100.0e6)).unwrap();
        assert!((line.attenuation_np::<Meters>().value() - 1e-3).abs() < 1e-3 * WORKED_BOUND);
    }

    #[test]
    fn typed_constants() {
        // 30.8 pF/ft is 101.05 pF/m (÷ 0.3048).
        let k = LineConstants::new(
            OhmsPer::<Feet>::new(0.0),
            HenriesPer::<Feet>::new(77.0e-9),
            SiemensPer::<Feet>::new(0.0),
            FaradsPer::<Feet>::new(30.8e-12),
        );
        assert!((k.capacitance - 101.05e-12).abs() < 0.01e-12);
        assert!((k.capacitance_per::<Feet>().value() - 30.8e-12).abs() < 1e-17);
        assert!((k.inductance_per::<Meters>().value() - 77.0e-9 / 0.3048).abs() < 1e-12);
        assert_eq!(k.resistance_per::<Feet>().value(), 0.0);
        assert_eq!(k.conductance_per::<Feet>().value(), 0.0);
    }

    #[test]
    fn per_foot_constants_match_per_metre() {
        let m = pe50();
        let (r, l, g, c) = m.values_per::<Feet>();
        let f = LineConstants::per::<Feet>(r, l, g, c);
        assert!((f.inductance / m.inductance - 1.0).abs() < 1e-6);
        assert!((f.capacitance / m.capacitance - 1.0).abs() < 1e-6);
    }

    #[test]
    fn bad_input_refused() {
        let c = pe50();
        assert_eq!(c.at(Hertz::new(0.0)), Err(LineError::OutOfRange));
        assert_eq!(c.at(Hertz::new(-1.0)), Err(LineError::OutOfRange));
        assert_eq!(c.at(Hertz::new(f32::NAN)), Err(LineError::NotFinite));
        let mut z = c;
        z.capacitance = 0.0;
        assert_eq!(z.at(Hertz::new(1e6)), Err(LineError::OutOfRange));
        z.capacitance = f32::INFINITY;
        assert_eq!(z.at(Hertz::new(1e6)), Err(LineError::NotFinite));
        let mut n = c;
        n.resistance = -1.0;
        assert_eq!(n.at(Hertz::new(1e6)), Err(LineError::OutOfRange));
        let line = c.at(Hertz::new(1e6)).unwrap();
        assert_eq!(
            line.matched_loss(Meters::new(-1.0)),
            Err(LineError::OutOfRange)
        );
        // Tiny L and C: β underflows, refused rather than infinite velocity.
        let t = LineConstants::per_meter(0.0, 1e-40, 0.0, 1e-40);
        assert!(t.at(Hertz::new(1.0)).is_err());
    }

    #[test]
    fn datasheet_line() {
        let line = Line::from_datasheet(
            Hertz::new(100.0e6),
            Ohms::new(50.0),
            0.66,
            DbPer::<Feet>::new(0.05),
        )
        .unwrap();
        assert!((line.velocity_factor() - 0.66).abs() < 1e-5);
        let ml = line.matched_loss(Feet::new(100.0)).unwrap().value();
        assert!((ml - 5.0).abs() < 5.0 * 1e-5);
        assert!(Line::from_datasheet(
            Hertz::new(1e6),
            Ohms::new(50.0),
            1.5,
            DbPer::<Feet>::new(0.0)
        )
        .is_err());
    }
}
