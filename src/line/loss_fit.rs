//! Cable loss versus frequency from datasheet points: α(f) = k1·√f + k2·f (conductor loss
//! grows with √f through the skin effect, dielectric loss with f: Pozar, *Microwave
//! Engineering*, §2.7 and Table 2.1), fitted from two points in closed form or by least
//! squares from more; evaluated at any frequency, length and conductor temperature.
//!
//! Method: dividing the model by √f makes it a straight line, α/√f = k1 + k2·√f. Two points
//! give k1, k2 in closed form; more points are fitted by ordinary least squares of α/√f on √f
//! (centred two-pass sums, numerically stable in f32). That weights each point by 1/f, which
//! is close to a fit in relative error while conductor loss dominates (α ≈ k1·√f). Frequencies
//! are held in MHz inside so the sums stay well scaled.
//!
//! Temperature: copper's resistivity rises about 0.39 %/°C near room temperature (common
//! practice; [`COPPER_TEMPCO`]). The skin-effect resistance goes as √ρ, so the conductor term
//! k1 is scaled by √(1 + tempco·(T − T_datasheet)); the dielectric term is left unchanged.
//!
//! Refused with [`LineError`]: fewer than two points, all points at one frequency
//! ([`LineError::SingularFit`]), points that give k1 < 0 or k2 < 0
//! ([`LineError::NegativeCoefficient`]), a frequency ≤ 0 or a negative loss in a point,
//! non-finite values. Not supported: loss that does not follow the two-term model (a cable
//! with a resonance, braid leakage, moisture).
//!
//! Panic policy: nothing in this module panics; no function returns NaN or infinity.

use super::propagation::Line;
use super::{input, length_m, non_negative, output, positive, LineError};
use crate::units::{Celsius, Db, DbPer, Hertz, Length, Meters, Ohms};

/// Temperature coefficient of copper's resistivity near 20 °C, per °C (common practice:
/// 0.39 %/°C; handbook 0.00393 for annealed copper, from memory).
pub const COPPER_TEMPCO: f32 = 0.0039;

/// One datasheet point: matched attenuation at a frequency.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LossPoint {
    /// The frequency (> 0).
    pub frequency: Hertz,
    /// The matched attenuation there, dB per metre (≥ 0).
    pub attenuation: DbPer<Meters>,
}

impl LossPoint {
    /// A point from an attenuation per any length unit, e.g. `DbPer::<Feet>`.
    pub fn new<U: Length>(frequency: Hertz, attenuation: DbPer<U>) -> Self {
        Self {
            frequency,
            attenuation: attenuation.per::<Meters>(),
        }
    }

    /// A point from a loss over a length, e.g. "6.6 dB per 100 ft at 400 MHz". `None` for a
    /// zero, negative or non-finite length.
    pub fn from_loss<U: Length>(frequency: Hertz, loss: Db, over: U) -> Option<Self> {
        DbPer::from_loss(loss, over).map(|a| Self::new(frequency, a))
    }

    /// (√f in √MHz, α/√f in dB/m/√MHz), checked.
    fn xu(&self) -> Result<(f32, f32), LineError> {
        let f = input(self.frequency.value())?;
        let a = input(self.attenuation.value())?;
        let f_mhz = positive(f)? * 1.0e-6;
        let a = non_negative(a)?;
        let x = libm::sqrtf(f_mhz);
        if x <= 0.0 {
            // Below about 1e-39 MHz the square root underflows.
            return Err(LineError::OutOfRange);
        }
        Ok((x, output(a / x)?))
    }
}

/// α(f) = k1·√f + k2·f, in dB per metre with f in MHz.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LossModel {
    k1: f32,
    k2: f32,
}

impl LossModel {
    /// A model from its coefficients per length unit `U`: `k1` in dB/U/√MHz (conductor),
    /// `k2` in dB/U/MHz (dielectric). Both finite and ≥ 0.
    pub fn new<U: Length>(k1: f32, k2: f32) -> Result<Self, LineError> {
        input(k1)?;
        input(k2)?;
        let (k1, k2) = (non_negative(k1)?, non_negative(k2)?);
        Ok(Self {
            k1: output(k1 / U::METERS)?,
            k2: output(k2 / U::METERS)?,
        })
    }

    fn checked(k1: f32, k2: f32) -> Result<Self, LineError> {
        let k1 = output(k1)?;
        let k2 = output(k2)?;
        if k1 < 0.0 || k2 < 0.0 {
            return Err(LineError::NegativeCoefficient);
        }
        Ok(Self { k1, k2 })
    }

    /// The model through two points exactly (closed form).
    pub fn from_two_points(a: &LossPoint, b: &LossPoint) -> Result<Self, LineError> {
        let (x1, u1) = a.xu()?;
        let (x2, u2) = b.xu()?;
        let dx = x2 - x1;
        if dx == 0.0 {
            return Err(LineError::SingularFit);
        }
        let k2 = output((u2 - u1) / dx)?;
        let k1 = output((u1 * x2 - u2 * x1) / dx)?;
        Self::checked(k1, k2)
    }

    /// The least-squares model through two or more points (see the module doc for the
    /// weighting). With exactly two points it equals [`LossModel::from_two_points`].
    pub fn least_squares(points: &[LossPoint]) -> Result<Self, LineError> {
        if points.len() < 2 {
            return Err(LineError::TooFewPoints);
        }
        let mut sx = 0.0f32;
        let mut su = 0.0f32;
        for p in points {
            let (x, u) = p.xu()?;
            sx += x;
            su += u;
        }
        // len ≥ 2 here; exact in f32 up to 2^24 points.
        let n = points.len() as f32;
        let (mx, mu) = (output(sx / n)?, output(su / n)?);
        let mut sxx = 0.0f32;
        let mut sxu = 0.0f32;
        for p in points {
            let (x, u) = p.xu()?;
            let dx = x - mx;
            sxx += dx * dx;
            sxu += dx * (u - mu);
        }
        let (sxx, sxu) = (output(sxx)?, output(sxu)?);
        // A spread of √f below f32 resolution of the mean is no spread at all.
        if sxx <= (mx * 1.0e-6) * (mx * 1.0e-6) * n {
            return Err(LineError::SingularFit);
        }
        let k2 = output(sxu / sxx)?;
        let k1 = output(mu - k2 * mx)?;
        Self::checked(k1, k2)
    }

    /// The conductor coefficient k1 per length unit `U`, dB/U/√MHz.
    pub fn k1<U: Length>(&self) -> f32 {
        self.k1 * U::METERS
    }

    /// The dielectric coefficient k2 per length unit `U`, dB/U/MHz.
    pub fn k2<U: Length>(&self) -> f32 {
        self.k2 * U::METERS
    }

    /// The matched attenuation at frequency `f` (f ≥ 0; 0 Hz gives 0).
    pub fn attenuation<U: Length>(&self, f: Hertz) -> Result<DbPer<U>, LineError> {
        let f_mhz = non_negative(f.value())? * 1.0e-6;
        let a = output(self.k1 * libm::sqrtf(f_mhz) + self.k2 * f_mhz)?;
        let per_u = output(a * U::METERS)?;
        Ok(DbPer::new(per_u))
    }

    /// The conductor part k1·√f alone, per length unit `U`.
    pub fn conductor_part<U: Length>(&self, f: Hertz) -> Result<DbPer<U>, LineError> {
        Self {
            k1: self.k1,
            k2: 0.0,
        }
        .attenuation(f)
    }

    /// The matched loss of a length at frequency `f`.
    pub fn loss<U: Length>(&self, f: Hertz, length: U) -> Result<Db, LineError> {
        let a = self.attenuation::<Meters>(f)?.value();
        Ok(Db::new(output(a * length_m(length)?)?))
    }

    /// The model with its conductor term moved from the datasheet temperature to another,
    /// for conductors of resistivity temperature coefficient `tempco` per °C (copper:
    /// [`COPPER_TEMPCO`]). k1 scales as √(1 + tempco·ΔT); the factor must stay positive.
    pub fn at_temperature(
        &self,
        datasheet: Celsius,
        actual: Celsius,
        tempco: f32,
    ) -> Result<Self, LineError> {
        let t0 = input(datasheet.value())?;
        let t = input(actual.value())?;
        let a = input(tempco)?;
        let ratio = output(1.0 + a * output(t - t0)?)?;
        if ratio <= 0.0 {
            return Err(LineError::OutOfRange);
        }
        Self::checked(self.k1 * libm::sqrtf(ratio), self.k2)
    }

    /// The largest relative difference |model − point| / point over the points (points with
    /// zero loss count their absolute difference in dB/m). Gives how well the fit holds.
    pub fn worst_relative_error(&self, points: &[LossPoint]) -> Result<f32, LineError> {
        let mut worst = 0.0f32;
        for p in points {
            p.xu()?;
            let want = p.attenuation.value();
            let got = self.attenuation::<Meters>(p.frequency)?.value();
            let e = libm::fabsf(got - want);
            let r = if want > 0.0 { e / want } else { e };
            worst = worst.max(output(r)?);
        }
        Ok(worst)
    }

    /// A [`Line`] at `f` with this model's attenuation, a real Z0 and a velocity factor
    /// (see [`Line::from_datasheet`]).
    pub fn line_at(&self, f: Hertz, z0: Ohms, velocity_factor: f32) -> Result<Line, LineError> {
        let a = self.attenuation::<Meters>(f)?;
        Line::from_datasheet(f, z0, velocity_factor, a)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::Feet;

    /// Relative bound on reproducing points the model was built from (f32 rounding).
    const FIT_BOUND: f32 = 1e-5;

    fn pt(f_mhz: f32, db_per_100ft: f32) -> LossPoint {
        LossPoint::from_loss(
            Hertz::new(f_mhz * 1e6),
            Db::new(db_per_100ft),
            Feet::new(100.0),
        )
        .unwrap()
    }

    #[test]
    fn two_points_reproduce_themselves() {
        // An invented cable: 1.2 dB/100 ft at 10 MHz, 14.0 dB/100 ft at 1000 MHz.
        let (a, b) = (pt(10.0, 1.2), pt(1000.0, 14.0));
        let m = LossModel::from_two_points(&a, &b).unwrap();
        assert!(m.worst_relative_error(&[a, b]).unwrap() < FIT_BOUND);
        let ls = LossModel::least_squares(&[a, b]).unwrap();
        assert!((ls.k1::<Feet>() / m.k1::<Feet>() - 1.0).abs() < FIT_BOUND);
        // 100 ft at 1000 MHz is the point itself.
        let l = m.loss(Hertz::new(1.0e9), Feet::new(100.0)).unwrap().value();
        assert!((l - 14.0).abs() < 14.0 * FIT_BOUND);
    }

    #[test]
    fn known_model_recovered_by_least_squares() {
        // k1 = 0.4 dB/100ft/√MHz, k2 = 0.002 dB/100ft/MHz, sampled at 6 frequencies.
        let m0 = LossModel::new::<Feet>(0.004, 0.00002).unwrap();
        let mut pts = [pt(1.0, 0.0); 6];
        for (p, f) in pts
            .iter_mut()
            .zip([1.0f32, 10.0, 50.0, 146.0, 440.0, 2400.0])
        {
            let a = m0.attenuation::<Feet>(Hertz::new(f * 1e6)).unwrap();
            *p = LossPoint::new(Hertz::new(f * 1e6), a);
        }
        let m = LossModel::least_squares(&pts).unwrap();
        assert!((m.k1::<Feet>() / 0.004 - 1.0).abs() < 1e-4);
        assert!((m.k2::<Feet>() / 0.00002 - 1.0).abs() < 1e-3);
    }

    #[test]
    fn temperature_moves_the_conductor_part() {
        let m = LossModel::new::<Meters>(0.01, 0.0).unwrap();
        let hot = m
            .at_temperature(Celsius::new(20.0), Celsius::new(45.5), COPPER_TEMPCO)
            .unwrap();
        // +25.5 °C: ρ × 1.09945, loss × √1.09945 = 1.04855.
        assert!((hot.k1::<Meters>() / 0.01 - 1.048_55).abs() < 1e-5);
        assert_eq!(
            m.at_temperature(Celsius::new(20.0), Celsius::new(-400.0), COPPER_TEMPCO),
            Err(LineError::OutOfRange)
        );
    }

    #[test]
    fn bad_fits_refused() {
        assert_eq!(
            LossModel::least_squares(&[pt(10.0, 1.0)]),
            Err(LineError::TooFewPoints)
        );
        assert_eq!(
            LossModel::from_two_points(&pt(10.0, 1.0), &pt(10.0, 2.0)),
            Err(LineError::SingularFit)
        );
        assert_eq!(
            LossModel::least_squares(&[pt(10.0, 1.0), pt(10.0, 1.1), pt(10.0, 0.9)]),
            Err(LineError::SingularFit)
        );
        // Loss falling with frequency: k2 < 0.
        assert_eq!(
            LossModel::from_two_points(&pt(10.0, 5.0), &pt(100.0, 6.0)),
            Err(LineError::NegativeCoefficient)
        );
        let nan = LossPoint::new(Hertz::new(f32::NAN), DbPer::<Meters>::new(1.0));
        assert_eq!(
            LossModel::from_two_points(&nan, &pt(1.0, 1.0)),
            Err(LineError::NotFinite)
        );
        let neg = LossPoint::new(Hertz::new(-1.0), DbPer::<Meters>::new(1.0));
        assert_eq!(
            LossModel::from_two_points(&neg, &pt(1.0, 1.0)),
            Err(LineError::OutOfRange)
        );
        let m = LossModel::new::<Meters>(0.01, 0.001).unwrap();
        assert_eq!(
            m.attenuation::<Meters>(Hertz::new(0.0)).unwrap().value(),
            0.0
        );
        assert!(m.loss(Hertz::new(f32::MAX), Meters::new(1.0e10)).is_err());
        assert!(LossModel::new::<Meters>(-1.0, 0.0).is_err());
    }
}
