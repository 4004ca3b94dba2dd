//! Lines from their geometry: coaxial and two-wire (parallel round conductors) → Z0,
//! velocity factor, L and C per length; conductor resistance from the skin depth at f with
//! the conductivity as a parameter (copper by default); dielectric conductance from the loss
//! tangent.
//!
//! Formulas (Pozar, *Microwave Engineering*, 4th ed., Table 2.1, and chapter 1 for the skin depth of a good
//! conductor; a = inner radius,
//! b = outer radius, D = centre spacing, d = conductor diameter, ε = ε0·εr):
//!
//! | | coaxial | two-wire |
//! |---|---|---|
//! | L (external) | μ0/(2π)·ln(b/a) | μ0/π·acosh(D/d) |
//! | C | 2πε/ln(b/a) | πε/acosh(D/d) |
//! | R | Rs/(2π)·(1/a + 1/b) | Rs/(πa) · p, proximity factor p = (D/d)/√((D/d)² − 1) |
//! | G | ωC·tanδ | ωC·tanδ |
//! | Z0 (lossless) | η0/(2π√εr)·ln(b/a) ≈ 59.96/√εr·ln(b/a) | η0/(π√εr)·acosh(D/d) ≈ 119.9/√εr·acosh(D/d) |
//!
//! with skin depth δ = 1/√(π f μ0 σ) and surface resistance Rs = 1/(σδ) = √(π f μ0/σ). The
//! two-wire proximity factor p is the exact result for round wires with a thin skin
//! (Ramo, Whinnery & Van Duzer, *Fields and Waves in Communication Electronics*, from
//! memory); Pozar's Rs/(πa) is its limit for D ≫ d. The internal inductance of the skin
//! layer, R/ω (surface impedance Rs·(1 + j); Wheeler's incremental-inductance rule), is added
//! to L in [`CoaxGeometry::constants_at`] and [`TwoWireGeometry::constants_at`].
//!
//! Supported: non-magnetic conductors (μr = 1) of one conductivity, a homogeneous dielectric
//! (for a partly filled line give the effective εr), frequencies where δ is well below the
//! conductor radius ([`CoaxGeometry::skin_effect_holds`]). Not supported: braid, plating,
//! roughness, stranding, DC resistance, dispersion of εr and tanδ.
//!
//! Panic policy: nothing in this module panics; bad geometry gives [`LineError`].

use super::propagation::{Line, LineConstants};
use super::{input, non_negative, output, positive, LineError, EPSILON_0, MU_0};
use crate::units::{Hertz, Length, Meters, Ohms};
use core::f32::consts::PI;

/// Conductivity of annealed copper at 20 °C, S/m (IEC 60028 standard annealed copper:
/// 58.0 MS/m).
pub const COPPER_CONDUCTIVITY: f32 = 5.8e7;

/// A skin depth below this fraction of the conductor radius counts as "thin skin" in
/// [`CoaxGeometry::skin_effect_holds`] (common practice: the formulas hold within a few per
/// cent once the radius is several skin depths).
pub const SKIN_DEPTH_FRACTION: f32 = 1.0 / 3.0;

/// Skin depth δ = 1/√(π f μ0 σ) in a non-magnetic conductor of conductivity σ (S/m).
pub fn skin_depth(f: Hertz, conductivity: f32) -> Result<Meters, LineError> {
    let f = positive(f.value())?;
    let s = positive(conductivity)?;
    let d = output(1.0 / libm::sqrtf(PI * f * MU_0 * s))?;
    if d > 0.0 {
        Ok(Meters::new(d))
    } else {
        Err(LineError::Overflow)
    }
}

/// Surface resistance Rs = √(π f μ0 / σ) in ohms (per square).
pub fn surface_resistance(f: Hertz, conductivity: f32) -> Result<Ohms, LineError> {
    let f = positive(f.value())?;
    let s = positive(conductivity)?;
    Ok(Ohms::new(output(libm::sqrtf(PI * f * MU_0 / s))?))
}

/// A homogeneous dielectric.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Dielectric {
    /// Relative permittivity εr (≥ 1).
    pub relative_permittivity: f32,
    /// Loss tangent tanδ (≥ 0).
    pub loss_tangent: f32,
}

impl Dielectric {
    /// Air (εr = 1.0006 at sea level, lossless; common practice: 1.0).
    pub const AIR: Dielectric = Dielectric {
        relative_permittivity: 1.0,
        loss_tangent: 0.0,
    };
    /// Solid polyethylene: εr 2.25, tanδ 2e-4 (handbook values, from memory).
    pub const SOLID_PE: Dielectric = Dielectric {
        relative_permittivity: 2.25,
        loss_tangent: 2.0e-4,
    };
    /// PTFE: εr 2.1, tanδ 2e-4 (handbook values, from memory).
    pub const PTFE: Dielectric = Dielectric {
        relative_permittivity: 2.1,
        loss_tangent: 2.0e-4,
    };

    fn checked(&self) -> Result<(f32, f32), LineError> {
        let er = input(self.relative_permittivity)?;
        let tand = non_negative(self.loss_tangent)?;
        if er < 1.0 {
            return Err(LineError::OutOfRange);
        }
        Ok((er, tand))
    }

    /// The velocity factor of a TEM line in this dielectric, 1/√εr.
    pub fn velocity_factor(&self) -> Result<f32, LineError> {
        let (er, _) = self.checked()?;
        Ok(1.0 / libm::sqrtf(er))
    }
}

/// A coaxial line: inner conductor diameter d, inner diameter of the outer conductor D.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CoaxGeometry {
    /// Inner conductor diameter d.
    pub inner_diameter: Meters,
    /// Inside diameter of the outer conductor D (> d).
    pub outer_diameter: Meters,
    /// The dielectric between them.
    pub dielectric: Dielectric,
    /// Conductivity of both conductors, S/m.
    pub conductivity: f32,
}

/// A two-wire line: two round conductors of diameter d, centre spacing D.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TwoWireGeometry {
    /// Conductor diameter d.
    pub conductor_diameter: Meters,
    /// Centre-to-centre spacing D (> d).
    pub spacing: Meters,
    /// The (effective) dielectric around them.
    pub dielectric: Dielectric,
    /// Conductivity of the conductors, S/m.
    pub conductivity: f32,
}

/// The frequency-independent part of a geometry: the log factor and the diameters.
struct Shape {
    /// ln(D/d) for coax, acosh(D/d) for two-wire.
    factor: f32,
    er: f32,
    tand: f32,
    sigma: f32,
}

/// L and C per metre of a shape: L = μ0·`l_scale`·factor, C = `c_scale`·ε0·εr/factor
/// (coax: 1/(2π) and 2π; two-wire: 1/π and π).
fn lc(shape: &Shape, l_scale: f32, c_scale: f32) -> Result<(f32, f32), LineError> {
    let l = output(MU_0 * l_scale * shape.factor)?;
    let c = output(c_scale * EPSILON_0 * shape.er / shape.factor)?;
    if l > 0.0 && c > 0.0 {
        Ok((l, c))
    } else {
        Err(LineError::Overflow)
    }
}

fn constants(
    shape: &Shape,
    l: f32,
    c: f32,
    r_per_rs: f32,
    f: Hertz,
) -> Result<LineConstants, LineError> {
    let rs = surface_resistance(f, shape.sigma)?.value();
    let w = output(f.omega())?;
    let r = output(rs * r_per_rs)?;
    let l_int = output(r / w)?;
    let g = output(w * c * shape.tand)?;
    Ok(LineConstants::per_meter(r, output(l + l_int)?, g, c))
}

impl CoaxGeometry {
    /// A copper coax from its two diameters (any length unit) and dielectric.
    pub fn new<U: Length>(inner_diameter: U, outer_diameter: U, dielectric: Dielectric) -> Self {
        Self {
            inner_diameter: inner_diameter.to_meters(),
            outer_diameter: outer_diameter.to_meters(),
            dielectric,
            conductivity: COPPER_CONDUCTIVITY,
        }
    }

    /// The same geometry with another conductor conductivity (S/m).
    pub fn with_conductivity(self, conductivity: f32) -> Self {
        Self {
            conductivity,
            ..self
        }
    }

    fn shape(&self) -> Result<(Shape, f32, f32), LineError> {
        let d = positive(self.inner_diameter.value())?;
        let dd = positive(self.outer_diameter.value())?;
        let (er, tand) = self.dielectric.checked()?;
        let sigma = positive(self.conductivity)?;
        if dd <= d {
            return Err(LineError::OutOfRange);
        }
        let factor = output(libm::logf(dd / d))?;
        if factor <= 0.0 {
            return Err(LineError::OutOfRange);
        }
        Ok((
            Shape {
                factor,
                er,
                tand,
                sigma,
            },
            d,
            dd,
        ))
    }

    /// Lossless Z0 = η0/(2π√εr)·ln(D/d), computed as √(L/C).
    pub fn characteristic_impedance(&self) -> Result<Ohms, LineError> {
        let (l, c) = self.lossless_lc()?;
        Ok(Ohms::new(output(libm::sqrtf(l / c))?))
    }

    /// Velocity factor 1/√εr.
    pub fn velocity_factor(&self) -> Result<f32, LineError> {
        self.shape()?;
        self.dielectric.velocity_factor()
    }

    fn lossless_lc(&self) -> Result<(f32, f32), LineError> {
        let (s, _, _) = self.shape()?;
        lc(&s, 0.5 / PI, 2.0 * PI)
    }

    /// External inductance μ0/(2π)·ln(D/d) and capacitance 2πε/ln(D/d), per metre, as
    /// lossless constants (R = G = 0).
    pub fn lossless_constants(&self) -> Result<LineConstants, LineError> {
        let (l, c) = self.lossless_lc()?;
        Ok(LineConstants::per_meter(0.0, l, 0.0, c))
    }

    /// R, L (external + internal), G, C per metre at frequency `f`.
    pub fn constants_at(&self, f: Hertz) -> Result<LineConstants, LineError> {
        let (s, d, dd) = self.shape()?;
        let (l, c) = lc(&s, 0.5 / PI, 2.0 * PI)?;
        // Rs/(2π)·(1/a + 1/b) = Rs/π·(1/d + 1/D).
        let r_per_rs = output((1.0 / d + 1.0 / dd) / PI)?;
        constants(&s, l, c, r_per_rs, f)
    }

    /// The exact line at frequency `f` (shorthand for `constants_at(f)?.at(f)`).
    pub fn line_at(&self, f: Hertz) -> Result<Line, LineError> {
        self.constants_at(f)?.at(f)
    }

    /// True when the skin depth at `f` is below [`SKIN_DEPTH_FRACTION`] of the inner
    /// conductor's radius, so that the resistance formula holds.
    pub fn skin_effect_holds(&self, f: Hertz) -> bool {
        match skin_depth(f, self.conductivity) {
            Ok(delta) => delta.value() <= SKIN_DEPTH_FRACTION * 0.5 * self.inner_diameter.value(),
            Err(_) => false,
        }
    }
}

impl TwoWireGeometry {
    /// A copper two-wire line from its conductor diameter, centre spacing (any length unit)
    /// and (effective) dielectric.
    pub fn new<U: Length>(conductor_diameter: U, spacing: U, dielectric: Dielectric) -> Self {
        Self {
            conductor_diameter: conductor_diameter.to_meters(),
            spacing: spacing.to_meters(),
            dielectric,
            conductivity: COPPER_CONDUCTIVITY,
        }
    }

    /// The same geometry with another conductor conductivity (S/m).
    pub fn with_conductivity(self, conductivity: f32) -> Self {
        Self {
            conductivity,
            ..self
        }
    }

    fn shape(&self) -> Result<(Shape, f32, f32), LineError> {
        let d = positive(self.conductor_diameter.value())?;
        let s = positive(self.spacing.value())?;
        let (er, tand) = self.dielectric.checked()?;
        let sigma = positive(self.conductivity)?;
        if s <= d {
            return Err(LineError::OutOfRange);
        }
        let ratio = output(s / d)?;
        let factor = output(libm::acoshf(ratio))?;
        if factor <= 0.0 {
            return Err(LineError::OutOfRange);
        }
        Ok((
            Shape {
                factor,
                er,
                tand,
                sigma,
            },
            d,
            ratio,
        ))
    }

    fn lossless_lc(&self) -> Result<(f32, f32), LineError> {
        let (s, _, _) = self.shape()?;
        lc(&s, 1.0 / PI, PI)
    }

    /// Lossless Z0 = η0/(π√εr)·acosh(D/d), computed as √(L/C).
    pub fn characteristic_impedance(&self) -> Result<Ohms, LineError> {
        let (l, c) = self.lossless_lc()?;
        Ok(Ohms::new(output(libm::sqrtf(l / c))?))
    }

    /// Velocity factor 1/√εr.
    pub fn velocity_factor(&self) -> Result<f32, LineError> {
        self.shape()?;
        self.dielectric.velocity_factor()
    }

    /// External inductance μ0/π·acosh(D/d) and capacitance πε/acosh(D/d), per metre, as
    /// lossless constants (R = G = 0).
    pub fn lossless_constants(&self) -> Result<LineConstants, LineError> {
        let (l, c) = self.lossless_lc()?;
        Ok(LineConstants::per_meter(0.0, l, 0.0, c))
    }

    /// R (with the proximity factor), L (external + internal), G, C per metre at `f`.
    pub fn constants_at(&self, f: Hertz) -> Result<LineConstants, LineError> {
        let (s, d, ratio) = self.shape()?;
        let (l, c) = lc(&s, 1.0 / PI, PI)?;
        // Rs/(πa)·p = 2Rs/(πd)·(D/d)/√((D/d)² − 1); (D/d)² − 1 = (D/d − 1)(D/d + 1) keeps
        // precision for close spacing.
        let root = libm::sqrtf((ratio - 1.0) * (ratio + 1.0));
        let p = output(ratio / root)?;
        let r_per_rs = output(2.0 / (PI * d) * p)?;
        constants(&s, l, c, r_per_rs, f)
    }

    /// The exact line at frequency `f` (shorthand for `constants_at(f)?.at(f)`).
    pub fn line_at(&self, f: Hertz) -> Result<Line, LineError> {
        self.constants_at(f)?.at(f)
    }

    /// True when the skin depth at `f` is below [`SKIN_DEPTH_FRACTION`] of the conductor
    /// radius.
    pub fn skin_effect_holds(&self, f: Hertz) -> bool {
        match skin_depth(f, self.conductivity) {
            Ok(delta) => {
                delta.value() <= SKIN_DEPTH_FRACTION * 0.5 * self.conductor_diameter.value()
            }
            Err(_) => false,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::Feet;

    /// Relative bound on the worked values (their 3–4 significant digits).
    const WORKED_BOUND: f32 = 5e-3;

    #[test]
    fn skin_depth_of_copper() {
        // Copper, 1 MHz: δ = 1/√(π·1e6·μ0·5.8e7) = 66.09 µm by hand from the formula above
        // (handbook value, from memory: 66 µm).
        let d = skin_depth(Hertz::new(1.0e6), COPPER_CONDUCTIVITY)
            .unwrap()
            .value();
        assert!((d - 66.09e-6).abs() < 66.09e-6 * WORKED_BOUND, "{d}");
        // Rs at 1 MHz: 2.61e-4 Ω.
        let rs = surface_resistance(Hertz::new(1.0e6), COPPER_CONDUCTIVITY)
            .unwrap()
            .value();
        assert!((rs - 2.609e-4).abs() < 2.609e-4 * WORKED_BOUND, "{rs}");
    }

    #[test]
    fn coax_ratio_for_50_ohm_air() {
        // Air coax with D/d = 2.302 is 50 Ω (ln 2.302 = 0.8338, × 59.96 = 50.0).
        let c = CoaxGeometry::new(Meters::new(1.0e-3), Meters::new(2.302e-3), Dielectric::AIR);
        let z0 = c.characteristic_impedance().unwrap().value();
        assert!((z0 - 50.0).abs() < 50.0 * WORKED_BOUND, "{z0}");
        assert_eq!(c.velocity_factor().unwrap(), 1.0);
    }

    #[test]
    fn two_wire_ratio() {
        // Air two-wire, D/d = 3: 119.9·acosh 3 = 119.9·1.7627 = 211.4 Ω.
        let t = TwoWireGeometry::new(Feet::new(0.01), Feet::new(0.03), Dielectric::AIR);
        let z0 = t.characteristic_impedance().unwrap().value();
        assert!((z0 - 211.4).abs() < 211.4 * WORKED_BOUND, "{z0}");
    }

    #[test]
    fn bad_geometry_refused() {
        let mut c = CoaxGeometry::new(Meters::new(2.0e-3), Meters::new(1.0e-3), Dielectric::AIR);
        assert_eq!(c.characteristic_impedance(), Err(LineError::OutOfRange));
        c.outer_diameter = Meters::new(f32::NAN);
        assert_eq!(c.line_at(Hertz::new(1e6)), Err(LineError::NotFinite));
        let mut t = TwoWireGeometry::new(Meters::new(1.0e-3), Meters::new(1.0e-3), Dielectric::AIR);
        assert_eq!(t.characteristic_impedance(), Err(LineError::OutOfRange));
        t.spacing = Meters::new(5.0e-3);
        t.dielectric.relative_permittivity = 0.5;
        assert_eq!(t.characteristic_impedance(), Err(LineError::OutOfRange));
        t.dielectric = Dielectric::AIR;
        assert!(t.line_at(Hertz::new(0.0)).is_err());
        assert!(t.with_conductivity(0.0).line_at(Hertz::new(1e6)).is_err());
    }
}
