//! From one pair of bridge readings (forward and reflected detector outputs) to a validated
//! [`Measurement`]: |Γ|, VSWR, return loss, mismatch loss, their directivity bounds and a
//! quality verdict. This is the f32 (libm) path of the per-reading chain; the integer path
//! for parts with no FPU is [`crate::fixed`].
//!
//! Detector laws, and the return loss each gives (textbook relations):
//!
//! | law | readings | return loss |
//! |---|---|---|
//! | [`Detector::Linear`] | volts ∝ amplitude | 20·log10(Vf / Vr) |
//! | [`Detector::SquareLaw`] | volts ∝ power | 10·log10(Vf / Vr) |
//! | [`Detector::Log`] | volts ∝ dB | (Vf − Vr) / slope |
//! | [`measure_levels`] | dBm (e.g. from a [`crate::detector::DiodeTable`]) | Pf − Pr |
//!
//! The quality verdict, in order of precedence:
//!
//! | condition | result |
//! |---|---|
//! | a NaN or infinite reading | [`Fault::NotFinite`] |
//! | a negative reading on a linear or square-law detector | [`Fault::Negative`] |
//! | either reading at or above the detector's ceiling / the ADC's top code | [`Fault::ForwardSaturated`], [`Fault::ReflectedSaturated`] |
//! | forward at or below the noise floor (nothing to measure against) | [`Fault::ForwardBelowFloor`] |
//! | reflected above forward by more than the margin (noise, or ports swapped) | [`Fault::ReflectedAboveForward`] |
//! | reflected above forward within the margin | |Γ| = 1 with [`Quality::CLAMPED_TOTAL`] |
//! | reflected at or below the floor | the floor is used: return loss is a lower bound, [`Quality::REFLECTED_AT_FLOOR`] |
//! | the reading is within the bridge's leakage of a perfect match | [`Quality::BEYOND_DIRECTIVITY`] |
//!
//! Hardware edge: a board's driver implements [`BridgeAdc`] (one method, read both channels);
//! [`ScalarChain`] turns its codes into measurements.
//!
//! Panic policy: nothing in this module panics, and no NaN or infinity leaves it.

use crate::detector::{Adc, DetectorError, LogDetector};
use crate::reflection::{Gamma, Reflection, DB_CEILING};
use crate::uncertainty::{directivity_bounds, Bounds};
use crate::units::{Db, Dbm, Volts, Watts};

/// How the detector output relates to the RF level.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Detector {
    /// Output proportional to RF amplitude (a linearized diode, a synchronous detector).
    Linear,
    /// Output proportional to RF power (a diode in its square-law region, a thermal sensor).
    SquareLaw,
    /// Output proportional to level in dB.
    Log(LogDetector),
}

/// Why a reading cannot give a measurement.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Fault {
    /// A NaN or infinite reading or parameter.
    NotFinite,
    /// A negative voltage on a linear or square-law detector.
    Negative,
    /// The forward channel is at or above its ceiling.
    ForwardSaturated,
    /// The reflected channel is at or above its ceiling.
    ReflectedSaturated,
    /// The forward channel is at or below the noise floor.
    ForwardBelowFloor,
    /// The reflected reading exceeds the forward one by more than the margin: noise, or
    /// the bridge connected backwards.
    ReflectedAboveForward,
    /// The configuration itself is unusable (e.g. floor above ceiling).
    BadConfig,
}

impl From<DetectorError> for Fault {
    fn from(e: DetectorError) -> Self {
        match e {
            DetectorError::Saturated => Fault::ForwardSaturated,
            DetectorError::NotFinite => Fault::NotFinite,
            _ => Fault::BadConfig,
        }
    }
}

/// Flags that qualify a valid measurement. Several may be set at once.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Quality(u8);

impl Quality {
    /// No reservations.
    pub const GOOD: Quality = Quality(0);
    /// The reflected reading was at or below the noise floor; the floor was used, so the
    /// return loss is a lower bound and VSWR an upper bound.
    pub const REFLECTED_AT_FLOOR: Quality = Quality(1);
    /// The reflected reading was slightly above forward (within the margin); |Γ| set to 1.
    pub const CLAMPED_TOTAL: Quality = Quality(2);
    /// The reading is within the bridge's leakage of a perfect match: its upper return-loss
    /// bound is the instrument ceiling.
    pub const BEYOND_DIRECTIVITY: Quality = Quality(4);
    /// A value reached its ceiling ([`DB_CEILING`] or [`crate::reflection::Vswr::CEILING`]).
    pub const CAPPED: Quality = Quality(8);

    /// True when no flag is set.
    pub fn is_good(self) -> bool {
        self.0 == 0
    }

    /// True when every flag of `other` is set in `self`.
    pub fn contains(self, other: Quality) -> bool {
        self.0 & other.0 == other.0
    }

    /// The raw flag bits (for reports).
    pub fn bits(self) -> u8 {
        self.0
    }

    /// `self` with the flags of `other` added.
    pub fn with(self, other: Quality) -> Quality {
        Quality(self.0 | other.0)
    }
}

/// A validated scalar measurement.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Measurement {
    /// |Γ|, VSWR, return loss, mismatch loss.
    pub reflection: Reflection,
    /// First-order bounds from the bridge directivity.
    pub bounds: Bounds,
    /// Reservations about this reading.
    pub quality: Quality,
}

/// What the bridge and its detectors are.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BridgeSpec {
    /// Detector law (both channels alike).
    pub detector: Detector,
    /// Detector output at or below which a channel reads noise.
    pub floor: Volts,
    /// Detector output at or above which a channel is saturated.
    pub ceiling: Volts,
    /// Bridge directivity.
    pub directivity: Db,
    /// How far reflected may exceed forward (noise on a total reflection) and still be
    /// taken as |Γ| = 1.
    pub total_margin: Db,
}

impl BridgeSpec {
    /// A spec with the usual margin of 0.5 dB for total reflections (common practice for
    /// detector noise on an open or short).
    pub fn new(detector: Detector, floor: Volts, ceiling: Volts, directivity: Db) -> Self {
        BridgeSpec {
            detector,
            floor,
            ceiling,
            directivity,
            total_margin: Db::new(0.5),
        }
    }
}

fn finite(x: f32) -> Result<f32, Fault> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(Fault::NotFinite)
    }
}

/// Measurement from two detector output voltages.
pub fn measure_volts(
    spec: &BridgeSpec,
    forward: Volts,
    reflected: Volts,
) -> Result<Measurement, Fault> {
    let f = finite(forward.value())?;
    let r = finite(reflected.value())?;
    let floor = finite(spec.floor.value())?;
    let ceiling = finite(spec.ceiling.value())?;
    let margin = finite(spec.total_margin.value())?.max(0.0);
    if ceiling <= floor {
        return Err(Fault::BadConfig);
    }
    if f >= ceiling {
        return Err(Fault::ForwardSaturated);
    }
    if r >= ceiling {
        return Err(Fault::ReflectedSaturated);
    }
    let (rl, at_floor) = match spec.detector {
        Detector::Linear | Detector::SquareLaw => {
            if f < 0.0 || r < 0.0 {
                return Err(Fault::Negative);
            }
            if floor <= 0.0 {
                return Err(Fault::BadConfig);
            }
            if f <= floor {
                return Err(Fault::ForwardBelowFloor);
            }
            let at_floor = r <= floor;
            let r_used = if at_floor { floor } else { r };
            let k = if matches!(spec.detector, Detector::Linear) {
                20.0
            } else {
                10.0
            };
            (k * libm::log10f(f / r_used), at_floor)
        }
        Detector::Log(det) => {
            if f <= floor {
                return Err(Fault::ForwardBelowFloor);
            }
            let at_floor = r <= floor;
            let r_used = if at_floor { floor } else { r };
            ((f - r_used) / det.slope().value(), at_floor)
        }
    };
    finish(finite(rl)?, at_floor, margin, spec.directivity)
}

/// Measurement from two absolute levels (for detectors linearized to dBm, e.g. through a
/// [`crate::detector::DiodeTable`]). `floor` is the lowest level the detector resolves.
pub fn measure_levels(
    forward: Dbm,
    reflected: Dbm,
    floor: Dbm,
    directivity: Db,
) -> Result<Measurement, Fault> {
    let f = finite(forward.value())?;
    let r = finite(reflected.value())?;
    let fl = finite(floor.value())?;
    if f <= fl {
        return Err(Fault::ForwardBelowFloor);
    }
    let at_floor = r <= fl;
    let r_used = if at_floor { fl } else { r };
    finish(finite(f - r_used)?, at_floor, 0.5, directivity)
}

fn finish(rl: f32, at_floor: bool, margin: f32, directivity: Db) -> Result<Measurement, Fault> {
    if !directivity.is_finite() {
        return Err(Fault::NotFinite);
    }
    let mut quality = Quality::GOOD;
    let rl = if rl < 0.0 {
        if -rl > margin {
            return Err(Fault::ReflectedAboveForward);
        }
        quality = quality.with(Quality::CLAMPED_TOTAL);
        0.0
    } else {
        rl.min(DB_CEILING)
    };
    if at_floor {
        quality = quality.with(Quality::REFLECTED_AT_FLOOR);
    }
    let gamma = Gamma::from_return_loss(Db::new(rl)).map_err(|_| Fault::NotFinite)?;
    let reflection = gamma.reflection();
    if reflection.capped {
        quality = quality.with(Quality::CAPPED);
    }
    let bounds = directivity_bounds(gamma, directivity);
    if bounds.reaches_perfect_match() {
        quality = quality.with(Quality::BEYOND_DIRECTIVITY);
    }
    Ok(Measurement {
        reflection,
        bounds,
        quality,
    })
}

/// Power delivered to the load: forward minus reflected power. Reflected above forward, a
/// negative or non-finite power is refused.
pub fn delivered_power(forward: Watts, reflected: Watts) -> Result<Watts, Fault> {
    let f = finite(forward.value())?;
    let r = finite(reflected.value())?;
    if f < 0.0 || r < 0.0 {
        return Err(Fault::Negative);
    }
    if r > f {
        return Err(Fault::ReflectedAboveForward);
    }
    Ok(Watts::new(f - r))
}

/// Power delivered to the load from forward and reflected levels in dBm.
pub fn delivered_power_dbm(forward: Dbm, reflected: Dbm) -> Result<Watts, Fault> {
    let f = forward.to_watts().ok_or(Fault::NotFinite)?;
    let r = reflected.to_watts().ok_or(Fault::NotFinite)?;
    delivered_power(f, r)
}

/// One pair of raw ADC codes: forward and reflected channel.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RawPair {
    /// Forward-channel code.
    pub forward: u16,
    /// Reflected-channel code.
    pub reflected: u16,
}

/// The hardware edge: whatever reads the bridge's two detector channels.
///
/// A real board implements this over its ADC (on-chip or external); a simulation implements
/// it over a model. Reading both channels in one call lets a driver sample them together.
pub trait BridgeAdc {
    /// The driver's own error.
    type Error;
    /// Reads both channels once.
    fn read_pair(&mut self) -> Result<RawPair, Self::Error>;
}

/// ADC codes → measurement: an [`Adc`] transfer function and a [`BridgeSpec`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ScalarChain {
    /// The converter both channels go through.
    pub adc: Adc,
    /// The bridge and detector.
    pub spec: BridgeSpec,
}

impl ScalarChain {
    /// A chain from an ADC and a bridge spec.
    pub fn new(adc: Adc, spec: BridgeSpec) -> Self {
        ScalarChain { adc, spec }
    }

    /// Measurement from one pair of codes.
    pub fn measure_codes(&self, forward: u16, reflected: u16) -> Result<Measurement, Fault> {
        let f = self.adc.volts(u32::from(forward))?;
        let r = self.adc.volts(u32::from(reflected)).map_err(|e| match e {
            DetectorError::Saturated => Fault::ReflectedSaturated,
            other => Fault::from(other),
        })?;
        measure_volts(&self.spec, f, r)
    }

    /// Reads the bridge once and measures.
    pub fn read<A: BridgeAdc>(&self, adc: &mut A) -> Result<Result<Measurement, Fault>, A::Error> {
        let raw = adc.read_pair()?;
        Ok(self.measure_codes(raw.forward, raw.reflected))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::reflection::Vswr;

    fn linear() -> BridgeSpec {
        BridgeSpec::new(
            Detector::Linear,
            Volts::new(0.002),
            Volts::new(3.2),
            Db::new(35.0),
        )
    }

    /// (law, forward V, reflected V, expected RL dB): RL from the law's relation, by hand.
    const VECTORS: [(u8, f32, f32, f32); 4] = [
        (0, 2.0, 0.2, 20.0),
        (0, 2.0, 1.0, 6.0206),
        (1, 2.0, 0.2, 10.0),
        (2, 1.8, 1.3, 20.0), // log: 25 mV/dB
    ];
    const BOUND_DB: f32 = 1e-4;

    #[test]
    fn vectors() {
        let log = LogDetector::new(Volts::new(0.025), Dbm::new(-84.0)).unwrap();
        for &(law, f, r, rl) in VECTORS.iter() {
            let mut spec = linear();
            spec.detector = match law {
                0 => Detector::Linear,
                1 => Detector::SquareLaw,
                _ => Detector::Log(log),
            };
            let m = measure_volts(&spec, Volts::new(f), Volts::new(r)).unwrap();
            let got = m.reflection.return_loss.value();
            assert!((got - rl).abs() < BOUND_DB, "{law} {got} {rl}");
        }
    }

    #[test]
    fn verdicts() {
        let s = linear();
        let m = |f: f32, r: f32| measure_volts(&s, Volts::new(f), Volts::new(r));
        assert_eq!(m(f32::NAN, 0.1), Err(Fault::NotFinite));
        assert_eq!(m(3.3, 0.1), Err(Fault::ForwardSaturated));
        assert_eq!(m(2.0, 3.3), Err(Fault::ReflectedSaturated));
        assert_eq!(m(0.001, 0.0), Err(Fault::ForwardBelowFloor));
        assert_eq!(m(1.0, 1.5), Err(Fault::ReflectedAboveForward));
        assert_eq!(m(-1.0, 0.5), Err(Fault::Negative));
        let open = m(1.0, 1.02).unwrap();
        assert!(open.quality.contains(Quality::CLAMPED_TOTAL));
        assert_eq!(open.reflection.gamma, Gamma::TOTAL);
        assert_eq!(open.reflection.vswr.value(), Vswr::CEILING);
        let good = m(2.0, 0.0).unwrap();
        assert!(good.quality.contains(Quality::REFLECTED_AT_FLOOR));
        assert!(good.quality.contains(Quality::BEYOND_DIRECTIVITY));
        // floor 2 mV under 2 V forward: the return loss is at least 60 dB.
        assert!((good.reflection.return_loss.value() - 60.0).abs() < 1e-3);
    }

    #[test]
    fn codes_through_adc() {
        let adc = Adc::new(12, Volts::new(3.3), 0).unwrap();
        let chain = ScalarChain::new(adc, linear());
        let m = chain.measure_codes(2000, 200).unwrap();
        assert!((m.reflection.return_loss.value() - 20.0).abs() < 1e-4);
        assert_eq!(chain.measure_codes(4095, 10), Err(Fault::ForwardSaturated));
        assert_eq!(
            chain.measure_codes(2000, 4095),
            Err(Fault::ReflectedSaturated)
        );
    }

    #[test]
    fn power() {
        let p = delivered_power(Watts::new(100.0), Watts::new(4.0)).unwrap();
        assert_eq!(p.value(), 96.0);
        let p = delivered_power_dbm(Dbm::new(50.0), Dbm::new(30.0)).unwrap();
        assert!((p.value() - 99.0).abs() < 1e-3);
        assert_eq!(
            delivered_power(Watts::new(1.0), Watts::new(2.0)),
            Err(Fault::ReflectedAboveForward)
        );
    }
}
