//! Complex Γ from vector detector readings.
//!
//! * magnitude ratio in dB and phase in degrees: Γ = 10^(dB/20)·e^(jφ) (definition of the
//!   decibel voltage ratio and polar form);
//! * I/Q of the reflected wave already normalised to the incident one: Γ = I + jQ;
//! * two complex waves: Γ = b/a (reflected over incident).
//!
//! Supported: ratios up to +40 dB (|Γ| ≤ 100) and any finite phase; very small ratios
//! underflow gracefully to Γ = 0. Not supported: detector-specific transfer curves (the
//! detector module linearises those first).
//!
//! Panic policy: nothing here panics; bad input gives a [`VectorError`].

use num_complex::Complex32;

use super::{check_raw_gamma, finite, VectorError, RAW_GAMMA_LIMIT};
use crate::units::Db;

/// The largest magnitude ratio accepted by [`gamma_from_db_phase`], in dB (|Γ| = 100).
pub const MAX_RATIO_DB: f32 = 40.0;

/// The largest component magnitude accepted for a wave given to [`gamma_from_wave_ratio`].
pub const WAVE_LIMIT: f32 = 1.0e15;

/// The smallest |a|² of the incident wave that [`gamma_from_wave_ratio`] divides by.
pub const MIN_INCIDENT_POWER: f32 = 1.0e-30;

/// Γ from a magnitude ratio in dB (20·log10|Γ|, negative for a passive load) and a phase
/// in degrees.
pub fn gamma_from_db_phase(ratio: Db, phase_deg: f32) -> Result<Complex32, VectorError> {
    let db = finite(ratio.value())?;
    let ph = finite(phase_deg)?;
    if db > MAX_RATIO_DB {
        return Err(VectorError::OutOfRange);
    }
    let mag = libm::powf(10.0, db / 20.0);
    // Reduce the phase to one turn first, so that large angles keep their precision.
    let turns = ph / 360.0;
    let frac = turns - libm::roundf(turns);
    let rad = frac * core::f32::consts::TAU;
    let (s, c) = libm::sincosf(rad);
    Ok(Complex32::new(mag * c, mag * s))
}

/// Γ from in-phase and quadrature parts already normalised to the incident wave.
pub fn gamma_from_iq(i: f32, q: f32) -> Result<Complex32, VectorError> {
    check_raw_gamma(Complex32::new(i, q))
}

/// Γ = reflected / incident from two complex waves (for example I/Q pairs of two
/// receivers). The result must stay within [`RAW_GAMMA_LIMIT`] per component.
pub fn gamma_from_wave_ratio(
    reflected: Complex32,
    incident: Complex32,
) -> Result<Complex32, VectorError> {
    for x in [reflected.re, reflected.im, incident.re, incident.im] {
        finite(x)?;
        if x.abs() > WAVE_LIMIT {
            return Err(VectorError::OutOfRange);
        }
    }
    let p = incident.norm_sqr();
    if p < MIN_INCIDENT_POWER {
        return Err(VectorError::NoSignal);
    }
    // |b|² ≤ (limit·√2)²·|a|² keeps the quotient inside the accepted range.
    if reflected.norm_sqr() > 2.0 * RAW_GAMMA_LIMIT * RAW_GAMMA_LIMIT * p {
        return Err(VectorError::OutOfRange);
    }
    let inv = 1.0 / p;
    let g = reflected * incident.conj() * inv;
    check_raw_gamma(g)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (dB, phase°, expected re, expected im), by hand from Γ = 10^(dB/20)·e^(jφ).
    const VECTORS: [(f32, f32, f32, f32); 5] = [
        (0.0, 0.0, 1.0, 0.0),
        (0.0, 180.0, -1.0, 0.0),
        (-6.020_6, 90.0, 0.0, 0.5),
        (-20.0, -45.0, 0.070_710_68, -0.070_710_68),
        (-20.0, 720.0 + 30.0, 0.086_602_54, 0.05),
    ];
    /// Bound on each component's error for the vectors above.
    const TOLERANCE: f32 = 2.0e-6;

    #[test]
    fn db_phase_vectors() {
        for &(db, ph, re, im) in VECTORS.iter() {
            let g = gamma_from_db_phase(Db::new(db), ph).unwrap();
            assert!((g.re - re).abs() < TOLERANCE, "{db} {ph} {g}");
            assert!((g.im - im).abs() < TOLERANCE, "{db} {ph} {g}");
        }
    }

    #[test]
    fn wave_ratio() {
        let a = Complex32::new(0.0, 2.0);
        let b = Complex32::new(1.0, 0.0);
        // 1 / 2j = −0.5j
        let g = gamma_from_wave_ratio(b, a).unwrap();
        assert!((g - Complex32::new(0.0, -0.5)).norm() < 1e-7);
        assert_eq!(
            gamma_from_wave_ratio(b, Complex32::new(0.0, 0.0)),
            Err(VectorError::NoSignal)
        );
        assert_eq!(
            gamma_from_wave_ratio(Complex32::new(1e3, 0.0), Complex32::new(1.0, 0.0)),
            Err(VectorError::OutOfRange)
        );
    }

    #[test]
    fn bad_input() {
        assert_eq!(
            gamma_from_db_phase(Db::new(f32::NAN), 0.0),
            Err(VectorError::NotFinite)
        );
        assert_eq!(
            gamma_from_db_phase(Db::new(41.0), 0.0),
            Err(VectorError::OutOfRange)
        );
        assert_eq!(
            gamma_from_iq(f32::INFINITY, 0.0),
            Err(VectorError::NotFinite)
        );
        assert_eq!(gamma_from_iq(101.0, 0.0), Err(VectorError::OutOfRange));
    }
}
