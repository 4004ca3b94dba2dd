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
//! Cost: [`ScalarChain::new`] turns the floor, ceiling and margin into ADC-code thresholds
//! and computes the bridge leakage once, so a reading is integer comparisons, one division
//! (|Γ| = Vr/Vf for a linear detector), the reflection relations with the crate's short
//! `log2`, and one comparison for [`Quality::BEYOND_DIRECTIVITY`]. The directivity bounds are
//! computed only when asked ([`Measurement::bounds`]). Measured: 112 instructions per reading
//! on a Cortex-M4F and 3 780 on a Cortex-M0 (host-tests/BENCHMARKS.md), where plain f32 code
//! with libm's `log10f` and no verdict takes 153 and 8 050.
//!
//! Panic policy: nothing in this module panics, and no NaN or infinity leaves it.

use crate::detector::{Adc, DetectorError, LogDetector};
use crate::reflection::{Gamma, Reflection, DB_CEILING, GAMMA_AT_CEILING};
use crate::uncertainty::{bounds_for_leakage, leakage, Bounds};
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
    /// Reservations about this reading.
    pub quality: Quality,
    /// The bridge's leakage, kept so that [`Measurement::bounds`] costs nothing until asked.
    leakage: Gamma,
}

impl Measurement {
    /// First-order bounds from the bridge directivity (computed on demand: two return losses
    /// and two VSWRs).
    pub fn bounds(&self) -> Bounds {
        bounds_for_leakage(self.reflection.gamma, self.leakage)
    }

    /// The bridge's leakage 10^(−D/20) this reading was qualified with.
    pub fn leakage(&self) -> Gamma {
        self.leakage
    }
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

/// The limit of reflected over forward for [`Quality::CLAMPED_TOTAL`], as the ratio of the
/// detector outputs: 10^(margin/k) with k = 20 for amplitude and 10 for power readings.
fn margin_ratio(margin_db: f32, db_per_decade: f32) -> f32 {
    let m = libm::powf(10.0, margin_db / db_per_decade);
    if m.is_finite() {
        m
    } else {
        f32::MAX
    }
}

/// Checks a spec once: the floor, ceiling and margin finite, the ceiling above the floor, a
/// positive floor for linear and square-law detectors, a finite directivity. Returns the
/// margin (dB, ≥ 0) and the leakage.
fn check_spec(spec: &BridgeSpec) -> Result<(f32, Gamma), Fault> {
    let floor = finite(spec.floor.value())?;
    let ceiling = finite(spec.ceiling.value())?;
    let margin = finite(spec.total_margin.value())?;
    finite(spec.directivity.value())?;
    if ceiling <= floor {
        return Err(Fault::BadConfig);
    }
    if floor <= 0.0 && !matches!(spec.detector, Detector::Log(_)) {
        return Err(Fault::BadConfig);
    }
    let margin = if margin > 0.0 { margin } else { 0.0 };
    Ok((margin, leakage(spec.directivity)))
}

/// Measurement from two detector output voltages.
pub fn measure_volts(
    spec: &BridgeSpec,
    forward: Volts,
    reflected: Volts,
) -> Result<Measurement, Fault> {
    let f = finite(forward.value())?;
    let r = finite(reflected.value())?;
    let (margin, leak) = check_spec(spec)?;
    let floor = spec.floor.value();
    let ceiling = spec.ceiling.value();
    if f >= ceiling {
        return Err(Fault::ForwardSaturated);
    }
    if r >= ceiling {
        return Err(Fault::ReflectedSaturated);
    }
    if !matches!(spec.detector, Detector::Log(_)) && (f < 0.0 || r < 0.0) {
        return Err(Fault::Negative);
    }
    let (r_used, quality) = against_floor(f, r, floor)?;
    match spec.detector {
        Detector::Linear => {
            from_ratio(r_used / f, margin_ratio(margin, 20.0), false, quality, leak)
        }
        Detector::SquareLaw => {
            from_ratio(r_used / f, margin_ratio(margin, 10.0), true, quality, leak)
        }
        Detector::Log(det) => {
            from_return_loss((f - r_used) / det.slope().value(), margin, quality, leak)
        }
    }
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
    finite(directivity.value())?;
    let (r_used, quality) = against_floor(f, r, fl)?;
    from_return_loss(f - r_used, 0.5, quality, leakage(directivity))
}

/// The floor rules: forward at or below it is refused; reflected at or below it is replaced by
/// it and flagged.
fn against_floor(f: f32, r: f32, floor: f32) -> Result<(f32, Quality), Fault> {
    if f <= floor {
        Err(Fault::ForwardBelowFloor)
    } else if r <= floor {
        Ok((floor, Quality::REFLECTED_AT_FLOOR))
    } else {
        Ok((r, Quality::GOOD))
    }
}

/// The tail of every law that reads amplitude or power: `ratio` is reflected over forward
/// (> 0), `limit` its largest value still taken as a total reflection.
#[inline(always)]
fn from_ratio(
    ratio: f32,
    limit: f32,
    power: bool,
    quality: Quality,
    leak: Gamma,
) -> Result<Measurement, Fault> {
    if ratio > 1.0 {
        if ratio > limit {
            return Err(Fault::ReflectedAboveForward);
        }
        return Ok(finish(
            Gamma::TOTAL,
            quality.with(Quality::CLAMPED_TOTAL),
            leak,
        ));
    }
    // 0 ≤ ratio ≤ 1 here (both readings ≥ 0, forward > 0), and so is its square root.
    let g = if power { libm::sqrtf(ratio) } else { ratio };
    Ok(finish(Gamma::from_unit(g), quality, leak))
}

/// The tail of the laws that read in dB: `rl` is forward minus reflected in dB.
fn from_return_loss(
    rl: f32,
    margin: f32,
    quality: Quality,
    leak: Gamma,
) -> Result<Measurement, Fault> {
    let rl = finite(rl)?;
    if rl < 0.0 {
        if -rl > margin {
            return Err(Fault::ReflectedAboveForward);
        }
        return Ok(finish(
            Gamma::TOTAL,
            quality.with(Quality::CLAMPED_TOTAL),
            leak,
        ));
    }
    let rl = if rl > DB_CEILING { DB_CEILING } else { rl };
    let gamma = Gamma::from_return_loss(Db::new(rl)).map_err(|_| Fault::NotFinite)?;
    Ok(finish(gamma, quality, leak))
}

/// |Γ| → the reflection quantities and the rest of the verdict.
#[inline(always)]
fn finish(gamma: Gamma, quality: Quality, leak: Gamma) -> Measurement {
    let reflection = gamma.reflection();
    let mut quality = quality;
    if reflection.capped {
        quality = quality.with(Quality::CAPPED);
    }
    // The low bound |Γ| − e reads as a perfect match (return loss at the ceiling).
    if gamma.value() <= leak.value() + GAMMA_AT_CEILING {
        quality = quality.with(Quality::BEYOND_DIRECTIVITY);
    }
    Measurement {
        reflection,
        quality,
        leakage: leak,
    }
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

/// How [`ScalarChain`] turns two net codes into |Γ|.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
enum Law {
    /// |Γ| = r / f.
    Amplitude,
    /// |Γ| = √(r / f).
    Power,
    /// Return loss = (f − r) · `db_per_code`.
    Log { db_per_code: f32 },
}

/// ADC codes → measurement: an [`Adc`] transfer function and a [`BridgeSpec`].
///
/// Everything that depends only on the configuration is worked out once by
/// [`ScalarChain::new`]: the floor and ceiling as ADC codes, the total-reflection margin as a
/// ratio, the bridge leakage. A reading then costs two integer comparisons per channel, one
/// division, and the reflection relations (two short logarithms). The verdict is the one
/// [`measure_volts`] gives for the same voltages.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ScalarChain {
    adc: Adc,
    spec: BridgeSpec,
    law: Law,
    /// The offset as applied (clamped to ±2^24 codes, beyond which every code reads 0 or
    /// saturated anyway).
    offset: i32,
    /// Raw codes at or above this are saturated (the ADC's top code or the detector ceiling).
    saturated_from: i32,
    /// Raw codes at or below this read the noise floor.
    floor_up_to: i32,
    /// The floor in net codes, used in place of a reflected reading at the floor.
    floor_codes: f32,
    /// Reflected over forward beyond which a reading is refused (amplitude and power laws), or
    /// the margin in dB (log law).
    limit: f32,
    leakage: Gamma,
}

/// Net codes beyond which an offset changes nothing (every code reads 0, or above any 24-bit
/// ADC's full scale).
const OFFSET_LIMIT: i32 = 1 << 24;

impl ScalarChain {
    /// A chain from an ADC and a bridge spec; [`Fault::BadConfig`] or [`Fault::NotFinite`]
    /// for a spec that [`measure_volts`] would refuse on every reading.
    pub fn new(adc: Adc, spec: BridgeSpec) -> Result<Self, Fault> {
        let (margin, leakage) = check_spec(&spec)?;
        let lsb = adc.lsb().value();
        let offset = adc.offset().clamp(-OFFSET_LIMIT, OFFSET_LIMIT);
        // The same comparisons as `measure_volts` on `net · lsb`, turned into code thresholds:
        // the first net code at or above the ceiling, the last one at or below the floor.
        let volts = |n: i32| n as f32 * lsb;
        let ceiling = spec.ceiling.value();
        let floor = spec.floor.value();
        let first_saturated = first_code(|n| volts(n) >= ceiling);
        let first_above_floor = first_code(|n| volts(n) > floor);
        let full_scale = adc.full_scale() as i32; // < 2^24
        let saturated_from =
            (i64::from(first_saturated) + i64::from(offset)).clamp(0, i64::from(full_scale)) as i32;
        // A raw code below the offset reads net 0: at or below the floor when 0 is.
        // first_above_floor ≤ 2^25 and |offset| ≤ 2^24: no overflow.
        let floor_up_to = if first_above_floor == 0 {
            i32::MIN
        } else {
            first_above_floor.wrapping_sub(1).wrapping_add(offset)
        };
        let (law, limit) = match spec.detector {
            Detector::Linear => (Law::Amplitude, margin_ratio(margin, 20.0)),
            Detector::SquareLaw => (Law::Power, margin_ratio(margin, 10.0)),
            Detector::Log(det) => {
                let db_per_code = lsb / det.slope().value();
                (
                    Law::Log {
                        db_per_code: finite(db_per_code)?,
                    },
                    margin,
                )
            }
        };
        Ok(ScalarChain {
            adc,
            spec,
            law,
            offset,
            saturated_from,
            floor_up_to,
            floor_codes: finite(floor / lsb)?,
            limit,
            leakage,
        })
    }

    /// The converter both channels go through.
    pub fn adc(&self) -> &Adc {
        &self.adc
    }

    /// The bridge and detector.
    pub fn spec(&self) -> &BridgeSpec {
        &self.spec
    }

    /// Measurement from one pair of codes.
    pub fn measure_codes(&self, forward: u16, reflected: u16) -> Result<Measurement, Fault> {
        let (f, r) = (i32::from(forward), i32::from(reflected));
        if f >= self.saturated_from {
            return Err(Fault::ForwardSaturated);
        }
        if r >= self.saturated_from {
            return Err(Fault::ReflectedSaturated);
        }
        if f <= self.floor_up_to {
            return Err(Fault::ForwardBelowFloor);
        }
        // |offset| ≤ 2^24 and codes ≤ 2^16: no overflow. Forward is above the floor, so its
        // net code is positive; a reflected code above the floor is too.
        let fv = f.wrapping_sub(self.offset) as f32;
        let (rv, quality) = if r <= self.floor_up_to {
            (self.floor_codes, Quality::REFLECTED_AT_FLOOR)
        } else {
            let net = r.wrapping_sub(self.offset);
            ((if net > 0 { net } else { 0 }) as f32, Quality::GOOD)
        };
        match self.law {
            Law::Amplitude => from_ratio(rv / fv, self.limit, false, quality, self.leakage),
            Law::Power => from_ratio(rv / fv, self.limit, true, quality, self.leakage),
            Law::Log { db_per_code } => {
                from_return_loss((fv - rv) * db_per_code, self.limit, quality, self.leakage)
            }
        }
    }

    /// Reads the bridge once and measures.
    pub fn read<A: BridgeAdc>(&self, adc: &mut A) -> Result<Result<Measurement, Fault>, A::Error> {
        let raw = adc.read_pair()?;
        Ok(self.measure_codes(raw.forward, raw.reflected))
    }
}

/// The smallest net code n in `0..=2^25` with `pred(n)` (`pred` false then true as n rises), or
/// 2^25 when there is none. Bisection: 26 steps.
fn first_code(pred: impl Fn(i32) -> bool) -> i32 {
    let (mut lo, mut hi) = (0i32, 1i32 << 25);
    if pred(lo) {
        return 0;
    }
    // pred(lo) is false; pred(hi) is taken as true. 0 ≤ lo < hi ≤ 2^25: no overflow.
    while hi.wrapping_sub(lo) > 1 {
        let mid = lo.wrapping_add(hi.wrapping_sub(lo) >> 1);
        if pred(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    hi
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
        let chain = ScalarChain::new(adc, linear()).unwrap();
        let m = chain.measure_codes(2000, 200).unwrap();
        assert!((m.reflection.return_loss.value() - 20.0).abs() < 1e-4);
        assert_eq!(chain.measure_codes(4095, 10), Err(Fault::ForwardSaturated));
        assert_eq!(
            chain.measure_codes(2000, 4095),
            Err(Fault::ReflectedSaturated)
        );
    }

    /// The chain's code thresholds give the verdict and values that the voltages give, for
    /// every law, across the floor, the ceiling and the total-reflection margin.
    #[test]
    fn codes_agree_with_volts() {
        let adc = Adc::new(12, Volts::new(3.3), 7).unwrap();
        let log = LogDetector::new(Volts::new(0.025), Dbm::new(-84.0)).unwrap();
        for det in [Detector::Linear, Detector::SquareLaw, Detector::Log(log)] {
            let mut spec = linear();
            spec.detector = det;
            spec.floor = Volts::new(0.0105); // between codes
            let chain = ScalarChain::new(adc, spec).unwrap();
            for f in (0u16..4096).step_by(13) {
                for r in (0u16..4096).step_by(17) {
                    let by_codes = chain.measure_codes(f, r);
                    let (Ok(fv), Ok(rv)) = (adc.volts(u32::from(f)), adc.volts(u32::from(r)))
                    else {
                        assert!(by_codes.is_err());
                        continue;
                    };
                    match (by_codes, measure_volts(&spec, fv, rv)) {
                        (Ok(a), Ok(b)) => {
                            assert_eq!(a.quality, b.quality, "{f} {r}");
                            let (x, y) = (a.reflection.gamma.value(), b.reflection.gamma.value());
                            assert!((x - y).abs() <= 1e-6, "{f} {r}: {x} {y}");
                        }
                        (a, b) => assert_eq!(a, b, "{f} {r}"),
                    }
                }
            }
        }
    }

    #[test]
    fn bounds_on_demand_match_directivity_bounds() {
        let m = measure_volts(&linear(), Volts::new(2.0), Volts::new(0.2)).unwrap();
        let want = crate::uncertainty::directivity_bounds(m.reflection.gamma, Db::new(35.0));
        assert_eq!(m.bounds(), want);
    }

    #[test]
    fn bad_specs_refused_once() {
        let adc = Adc::new(12, Volts::new(3.3), 0).unwrap();
        let mut s = linear();
        s.floor = Volts::new(0.0);
        assert_eq!(ScalarChain::new(adc, s), Err(Fault::BadConfig));
        s = linear();
        s.ceiling = Volts::new(0.001);
        assert_eq!(ScalarChain::new(adc, s), Err(Fault::BadConfig));
        s = linear();
        s.directivity = Db::new(f32::NAN);
        assert_eq!(ScalarChain::new(adc, s), Err(Fault::NotFinite));
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
