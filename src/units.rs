//! Physical quantities as types, so that a dB/Np or dB/ratio mix-up does not compile.
//!
//! Every quantity is a thin `f32` newtype. Construction with `new` is `const` and stores
//! what it is given; the measurement APIs check their inputs for finiteness and range and
//! return a typed error for bad ones. Conversions that could overflow `f32` return
//! [`Option`]; conversions that cannot are plain methods.
//!
//! | type | holds | note |
//! |---|---|---|
//! | [`Db`] | a level ratio in decibels | power: 10·log10, voltage: 20·log10 |
//! | [`Np`] | a level ratio in nepers | 1 Np = 20·log10(e) dB ≈ 8.686 dB |
//! | [`PowerRatio`] | a linear power ratio | |
//! | [`VoltageRatio`] | a linear voltage (amplitude) ratio | |
//! | [`Hertz`] | frequency | |
//! | [`Ohms`] | resistance or reactance | |
//! | [`Meters`] | length | |
//! | [`Watts`] | power | |
//! | [`Volts`] | detector output, ADC reference | |
//! | [`Dbm`] | absolute power, dB relative to 1 mW | `Dbm - Dbm = Db`, `Dbm + Db = Dbm` |
//! | [`Henries`], [`Farads`] | inductance, capacitance | equivalent L or C of a reactance |
//! | [`Siemens`] | conductance or susceptance | |
//! | [`Seconds`] | time, e.g. an offset delay | |
//!
//! Panic policy: nothing in this module panics.

use core::ops::{Add, Mul, Neg, Sub};

/// Decibels per neper: 20·log10(e) (common practice: 8.686 dB per Np).
pub const DB_PER_NP: f32 = 8.685_889;

macro_rules! scalar_unit {
    ($(#[$doc:meta])* $name:ident, $unit:literal) => {
        $(#[$doc])*
        #[derive(Clone, Copy, Debug, PartialEq, PartialOrd, Default)]
        #[cfg_attr(feature = "defmt", derive(defmt::Format))]
        pub struct $name(f32);

        impl $name {
            #[doc = concat!("A value in ", $unit, ".")]
            #[inline]
            pub const fn new(value: f32) -> Self {
                Self(value)
            }

            #[doc = concat!("The value in ", $unit, ".")]
            #[inline]
            pub const fn value(self) -> f32 {
                self.0
            }

            /// True when the value is neither NaN nor infinite.
            #[inline]
            pub fn is_finite(self) -> bool {
                self.0.is_finite()
            }
        }

        impl Add for $name {
            type Output = Self;
            #[inline]
            fn add(self, rhs: Self) -> Self {
                Self(self.0 + rhs.0)
            }
        }

        impl Sub for $name {
            type Output = Self;
            #[inline]
            fn sub(self, rhs: Self) -> Self {
                Self(self.0 - rhs.0)
            }
        }

        impl Mul<f32> for $name {
            type Output = Self;
            #[inline]
            fn mul(self, rhs: f32) -> Self {
                Self(self.0 * rhs)
            }
        }

        impl Neg for $name {
            type Output = Self;
            #[inline]
            fn neg(self) -> Self {
                Self(-self.0)
            }
        }
    };
}

scalar_unit!(
    /// A level ratio in decibels.
    Db,
    "dB"
);
scalar_unit!(
    /// A level ratio in nepers (natural-log units of amplitude ratio).
    Np,
    "Np"
);
scalar_unit!(
    /// A linear power ratio (dimensionless, ≥ 0 when physical).
    PowerRatio,
    "power ratio (linear)"
);
scalar_unit!(
    /// A linear voltage or amplitude ratio (dimensionless, ≥ 0 when physical).
    VoltageRatio,
    "voltage ratio (linear)"
);
scalar_unit!(
    /// A frequency in hertz.
    Hertz,
    "Hz"
);
scalar_unit!(
    /// A resistance, reactance or impedance magnitude in ohms.
    Ohms,
    "Ω"
);
scalar_unit!(
    /// A length in metres.
    Meters,
    "m"
);
scalar_unit!(
    /// A power in watts.
    Watts,
    "W"
);
scalar_unit!(
    /// An electric potential in volts (detector outputs, ADC reference).
    Volts,
    "V"
);

/// An absolute power level in dB relative to one milliwatt.
///
/// `Dbm` is not a [`Db`]: the difference of two `Dbm` is a `Db`, a `Dbm` plus a `Db` is a
/// `Dbm`, and two `Dbm` cannot be added.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Dbm(f32);

impl Dbm {
    /// A power level in dBm.
    #[inline]
    pub const fn new(value: f32) -> Self {
        Self(value)
    }

    /// The level in dBm.
    #[inline]
    pub const fn value(self) -> f32 {
        self.0
    }

    /// True when the value is neither NaN nor infinite.
    #[inline]
    pub fn is_finite(self) -> bool {
        self.0.is_finite()
    }

    /// The power in watts: 10^(dBm/10) mW. `None` when the result is not a finite number
    /// (a level above about +410 dBm, or a non-finite level).
    pub fn to_watts(self) -> Option<Watts> {
        finite(1.0e-3 * libm::powf(10.0, self.0 / 10.0)).map(Watts)
    }

    /// The level of a power in watts. `None` for zero, negative or non-finite power.
    pub fn from_watts(p: Watts) -> Option<Self> {
        if p.0 > 0.0 && p.0.is_finite() {
            finite(10.0 * libm::log10f(p.0 * 1.0e3)).map(Self)
        } else {
            None
        }
    }
}

impl Sub for Dbm {
    type Output = Db;
    #[inline]
    fn sub(self, rhs: Self) -> Db {
        Db(self.0 - rhs.0)
    }
}

impl Add<Db> for Dbm {
    type Output = Dbm;
    #[inline]
    fn add(self, rhs: Db) -> Dbm {
        Dbm(self.0 + rhs.0)
    }
}

impl Sub<Db> for Dbm {
    type Output = Dbm;
    #[inline]
    fn sub(self, rhs: Db) -> Dbm {
        Dbm(self.0 - rhs.0)
    }
}

#[inline]
fn finite(x: f32) -> Option<f32> {
    if x.is_finite() {
        Some(x)
    } else {
        None
    }
}

impl Db {
    /// The same level in nepers (÷ 8.686).
    #[inline]
    pub fn to_np(self) -> Np {
        Np(self.0 / DB_PER_NP)
    }

    /// The power ratio 10^(dB/10). `None` when it overflows `f32` (above about 385 dB).
    pub fn to_power_ratio(self) -> Option<PowerRatio> {
        finite(libm::powf(10.0, self.0 / 10.0)).map(PowerRatio)
    }

    /// The voltage ratio 10^(dB/20). `None` when it overflows `f32` (above about 770 dB).
    pub fn to_voltage_ratio(self) -> Option<VoltageRatio> {
        finite(libm::powf(10.0, self.0 / 20.0)).map(VoltageRatio)
    }
}

impl Np {
    /// The same level in decibels (× 8.686).
    #[inline]
    pub fn to_db(self) -> Db {
        Db(self.0 * DB_PER_NP)
    }
}

impl PowerRatio {
    /// 10·log10 of the ratio. `None` for zero, negative or non-finite ratios.
    pub fn to_db(self) -> Option<Db> {
        if self.0 > 0.0 && self.0.is_finite() {
            finite(10.0 * libm::log10f(self.0)).map(Db)
        } else {
            None
        }
    }

    /// The voltage ratio with the same level (square root). `None` for negative or
    /// non-finite ratios.
    pub fn to_voltage_ratio(self) -> Option<VoltageRatio> {
        if self.0 >= 0.0 && self.0.is_finite() {
            Some(VoltageRatio(libm::sqrtf(self.0)))
        } else {
            None
        }
    }
}

impl VoltageRatio {
    /// 20·log10 of the ratio. `None` for zero, negative or non-finite ratios.
    pub fn to_db(self) -> Option<Db> {
        if self.0 > 0.0 && self.0.is_finite() {
            finite(20.0 * libm::log10f(self.0)).map(Db)
        } else {
            None
        }
    }

    /// The power ratio with the same level (square). `None` for negative, non-finite or
    /// overflowing ratios.
    pub fn to_power_ratio(self) -> Option<PowerRatio> {
        if self.0 >= 0.0 {
            finite(self.0 * self.0).map(PowerRatio)
        } else {
            None
        }
    }
}

impl Watts {
    /// The level in dBm. `None` for zero, negative or non-finite power.
    pub fn to_dbm(self) -> Option<Dbm> {
        Dbm::from_watts(self)
    }
}

impl Hertz {
    /// Angular frequency ω = 2πf in rad/s.
    #[inline]
    pub fn omega(self) -> f32 {
        core::f32::consts::TAU * self.0
    }
}

// ---- Lengths in any unit, and quantities per unit length (transmission lines) ----

scalar_unit!(
    /// A length in feet (the international foot, exactly 0.3048 m).
    Feet,
    "ft"
);
scalar_unit!(
    /// A temperature in degrees Celsius.
    Celsius,
    "°C"
);
scalar_unit!(
    /// A speed in metres per second.
    MetersPerSecond,
    "m/s"
);

mod sealed {
    pub trait Sealed {}
    impl Sealed for super::Meters {}
    impl Sealed for super::Feet {}
}

/// A length unit, as a type: [`Meters`] or [`Feet`].
///
/// The trait is sealed: the transmission-line APIs prove that no conversion overflows from
/// the known unit factors, so new units are added here, not downstream.
pub trait Length: sealed::Sealed + Copy + Clone + core::fmt::Debug + PartialEq + Default {
    /// Metres in one of this unit.
    const METERS: f32;
    /// The unit's symbol, e.g. `"m"`.
    const SYMBOL: &'static str;
    /// The number of units held.
    fn amount(self) -> f32;
    /// A length of `amount` units.
    fn of(amount: f32) -> Self;
    /// The length in metres.
    #[inline]
    fn to_meters(self) -> Meters {
        Meters::new(self.amount() * Self::METERS)
    }
    /// This unit's length equal to a length in metres.
    #[inline]
    fn from_meters(m: Meters) -> Self {
        Self::of(m.value() / Self::METERS)
    }
}

impl Length for Meters {
    const METERS: f32 = 1.0;
    const SYMBOL: &'static str = "m";
    #[inline]
    fn amount(self) -> f32 {
        self.0
    }
    #[inline]
    fn of(amount: f32) -> Self {
        Meters(amount)
    }
}

impl Length for Feet {
    const METERS: f32 = 0.3048;
    const SYMBOL: &'static str = "ft";
    #[inline]
    fn amount(self) -> f32 {
        self.0
    }
    #[inline]
    fn of(amount: f32) -> Self {
        Feet(amount)
    }
}

impl From<Feet> for Meters {
    #[inline]
    fn from(f: Feet) -> Meters {
        f.to_meters()
    }
}

impl From<Meters> for Feet {
    #[inline]
    fn from(m: Meters) -> Feet {
        Feet::from_meters(m)
    }
}

macro_rules! per_length {
    ($(#[$doc:meta])* $name:ident, $unit:literal) => {
        $(#[$doc])*
        ///
        /// The length unit is the type parameter `L` (per foot with `L = Feet`).
        #[derive(Clone, Copy, Debug, PartialEq, PartialOrd, Default)]
        #[cfg_attr(feature = "defmt", derive(defmt::Format))]
        pub struct $name<L: Length>(f32, core::marker::PhantomData<L>);

        impl<L: Length> $name<L> {
            #[doc = concat!("A value in ", $unit, " per one length unit `L`.")]
            #[inline]
            pub const fn new(value: f32) -> Self {
                Self(value, core::marker::PhantomData)
            }

            #[doc = concat!("The value in ", $unit, " per one length unit `L`.")]
            #[inline]
            pub const fn value(self) -> f32 {
                self.0
            }

            /// True when the value is neither NaN nor infinite.
            #[inline]
            pub fn is_finite(self) -> bool {
                self.0.is_finite()
            }

            /// The same quantity per another length unit (e.g. per metre to per foot).
            #[inline]
            pub fn per<M: Length>(self) -> $name<M> {
                $name::new(self.0 * (M::METERS / L::METERS))
            }
        }
    };
}

per_length!(
    /// An attenuation (or gain) in decibels per unit length.
    DbPer,
    "dB"
);
per_length!(
    /// An attenuation in nepers per unit length (α of γ = α + jβ).
    NpPer,
    "Np"
);
per_length!(
    /// A phase constant in radians per unit length (β of γ = α + jβ).
    RadPer,
    "rad"
);
per_length!(
    /// A propagation delay in seconds per unit length.
    SecondsPer,
    "s"
);
per_length!(
    /// A series resistance in ohms per unit length (R of a line).
    OhmsPer,
    "Ω"
);
per_length!(
    /// A series inductance in henries per unit length (L of a line).
    HenriesPer,
    "H"
);
per_length!(
    /// A shunt conductance in siemens per unit length (G of a line).
    SiemensPer,
    "S"
);
per_length!(
    /// A shunt capacitance in farads per unit length (C of a line).
    FaradsPer,
    "F"
);

impl<L: Length> DbPer<L> {
    /// The attenuation that gives `loss` over `length` (e.g. a datasheet's "dB per 100 ft").
    /// `None` for a zero, negative or non-finite length or a non-finite loss.
    pub fn from_loss(loss: Db, length: L) -> Option<Self> {
        let l = length.amount();
        if l > 0.0 && l.is_finite() && loss.is_finite() {
            finite(loss.value() / l).map(Self::new)
        } else {
            None
        }
    }

    /// The loss over a length of any unit. `None` when the product is not finite.
    pub fn over<M: Length>(self, length: M) -> Option<Db> {
        finite(self.per::<M>().value() * length.amount()).map(Db)
    }

    /// The same attenuation in nepers per unit length.
    #[inline]
    pub fn to_np(self) -> NpPer<L> {
        NpPer::new(self.0 / DB_PER_NP)
    }
}

impl<L: Length> NpPer<L> {
    /// The same attenuation in decibels per unit length.
    #[inline]
    pub fn to_db(self) -> DbPer<L> {
        DbPer::new(self.0 * DB_PER_NP)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn neper_decibel_round_trip() {
        // 1 Np = 20·log10(e) dB = 8.685889638 dB (definition of the neper).
        assert!((Np::new(1.0).to_db().value() - 8.685_89).abs() < 1e-4);
        assert!((Db::new(20.0).to_np().to_db().value() - 20.0).abs() < 1e-5);
    }

    #[test]
    fn ratios() {
        assert!((Db::new(20.0).to_voltage_ratio().unwrap().value() - 10.0).abs() < 1e-5);
        assert!((Db::new(20.0).to_power_ratio().unwrap().value() - 100.0).abs() < 1e-3);
        assert_eq!(Db::new(1000.0).to_power_ratio(), None);
        assert_eq!(PowerRatio::new(0.0).to_db(), None);
        assert_eq!(VoltageRatio::new(f32::NAN).to_db(), None);
    }

    #[test]
    fn dbm_arithmetic() {
        let a = Dbm::new(30.0);
        assert!((a.to_watts().unwrap().value() - 1.0).abs() < 1e-5);
        assert_eq!(a - Dbm::new(10.0), Db::new(20.0));
        assert_eq!(a - Db::new(3.0), Dbm::new(27.0));
        assert_eq!(Watts::new(0.0).to_dbm(), None);
    }

    #[test]
    fn lengths_and_per_length() {
        // The international foot is exactly 0.3048 m (1959 yard and pound agreement).
        assert!((Feet::new(100.0).to_meters().value() - 30.48).abs() < 1e-4);
        assert!((Feet::from(Meters::new(0.3048)).value() - 1.0).abs() < 1e-6);
        // 6.6 dB per 100 ft is 6.6 / 30.48 dB per metre.
        let a = DbPer::from_loss(Db::new(6.6), Feet::new(100.0)).unwrap();
        let per_m = a.per::<Meters>().value();
        assert!((per_m - 6.6 / 30.48).abs() < 1e-6);
        assert!((a.over(Meters::new(30.48)).unwrap().value() - 6.6).abs() < 1e-4);
        assert!((a.to_np().to_db().value() - a.value()).abs() < 1e-7);
        assert_eq!(DbPer::from_loss(Db::new(1.0), Feet::new(0.0)), None);
        assert_eq!(DbPer::from_loss(Db::new(f32::NAN), Feet::new(1.0)), None);
    }
}

// Units added for vector impedance and calibration-standard models.
scalar_unit!(
    /// An inductance in henries.
    Henries,
    "H"
);
scalar_unit!(
    /// A capacitance in farads.
    Farads,
    "F"
);
scalar_unit!(
    /// A conductance, susceptance or admittance magnitude in siemens.
    Siemens,
    "S"
);
scalar_unit!(
    /// A time interval (for example an offset delay) in seconds.
    Seconds,
    "s"
);
