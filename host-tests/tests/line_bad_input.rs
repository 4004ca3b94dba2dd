//! The list of bad inputs, one by one, with the defined result or typed error each
//! gives (the property tests in line_props.rs cover the whole input space).

use feedline::line::feed_loss::{gamma_at_load, total_loss};
use feedline::line::{LineConstants, LineError, LossModel, LossPoint};
use feedline::reflection::{Gamma, DB_CEILING};
use feedline::units::{Db, DbPer, Feet, Hertz, Meters, Ohms};
use num_complex::Complex32;

fn coax() -> LineConstants {
    // 50 Ω, VF 0.66, R = 0.1 Ω/m, G = 1e-6 S/m.
    let v = 0.66 * 299_792_458.0f32;
    LineConstants::per_meter(0.1, 50.0 / v, 1e-6, 1.0 / (50.0 * v))
}

#[test]
fn zero_and_negative_length() {
    let line = coax().at(Hertz::new(10e6)).unwrap();
    let gl = Complex32::new(0.5, 0.2);
    // Zero length: nothing changes, 0 dB.
    assert_eq!(line.matched_loss(Meters::new(0.0)).unwrap().value(), 0.0);
    assert_eq!(line.gamma_at_input(gl, Feet::new(0.0)).unwrap(), gl);
    // Negative length: typed error.
    assert_eq!(
        line.matched_loss(Meters::new(-1.0)),
        Err(LineError::OutOfRange)
    );
    assert_eq!(
        line.gamma_at_input(gl, Feet::new(-1.0)),
        Err(LineError::OutOfRange)
    );
    assert_eq!(
        LossModel::new::<Meters>(0.01, 0.0)
            .unwrap()
            .loss(Hertz::new(1e6), Meters::new(-3.0)),
        Err(LineError::OutOfRange)
    );
}

#[test]
fn zero_frequency() {
    assert_eq!(coax().at(Hertz::new(0.0)), Err(LineError::OutOfRange));
    assert_eq!(coax().low_loss(Hertz::new(0.0)), Err(LineError::OutOfRange));
    // The loss model is defined at 0 Hz: no loss.
    let m = LossModel::new::<Meters>(0.01, 0.001).unwrap();
    assert_eq!(m.attenuation::<Feet>(Hertz::new(0.0)).unwrap().value(), 0.0);
    // A datasheet point at 0 Hz cannot be fitted (α/√f).
    let p0 = LossPoint::new(Hertz::new(0.0), DbPer::<Meters>::new(0.0));
    let p1 = LossPoint::new(Hertz::new(1e6), DbPer::<Meters>::new(0.01));
    assert_eq!(
        LossModel::from_two_points(&p0, &p1),
        Err(LineError::OutOfRange)
    );
}

#[test]
fn zero_capacitance() {
    let mut k = coax();
    k.capacitance = 0.0;
    assert_eq!(k.at(Hertz::new(1e6)), Err(LineError::OutOfRange));
    k.capacitance = -1e-10;
    assert_eq!(k.at(Hertz::new(1e6)), Err(LineError::OutOfRange));
}

#[test]
fn lossless_line() {
    let mut k = coax();
    k.resistance = 0.0;
    k.conductance = 0.0;
    let line = k.at(Hertz::new(10e6)).unwrap();
    assert_eq!(line.attenuation::<Meters>().value(), 0.0);
    let e = k.approximation_error(Hertz::new(10e6)).unwrap();
    assert_eq!(e.alpha, 0.0);
    // An open through a lossless λ/2: |Γin| = 1 again, a finite (very large) or typed
    // infinite impedance, never NaN.
    let half = Meters::new(line.wavelength::<Meters>().value() / 2.0);
    match line.input_impedance_from_gamma(Complex32::new(1.0, 0.0), half) {
        Ok(z) => assert!(z.re.is_finite() && z.im.is_finite() && z.norm() > 1e4),
        Err(e) => assert_eq!(e, LineError::InfiniteImpedance),
    }
    // No loss and a total reflection: total loss capped.
    assert_eq!(
        total_loss(Db::new(0.0), Gamma::TOTAL).unwrap().value(),
        DB_CEILING
    );
}

#[test]
fn total_reflection() {
    let line = coax().at(Hertz::new(10e6)).unwrap();
    // |Γ| = 1 loads are fine: a short through 10 m.
    let g = line
        .gamma_at_input(Complex32::new(-1.0, 0.0), Meters::new(10.0))
        .unwrap();
    assert!(g.norm() < 1.0);
    let back = line.gamma_at_load(g, Meters::new(10.0)).unwrap();
    assert!((back - Complex32::new(-1.0, 0.0)).norm() < 1e-5);
    // A total reflection at the analyzer through a lossy line is clamped and flagged.
    let r = gamma_at_load(Gamma::TOTAL, Db::new(1.0)).unwrap();
    assert!(r.clamped && r.gamma == Gamma::TOTAL);
    // De-embedding a total reflection gives |ΓL| > 1, returned as computed, finite.
    let d = line
        .deembed(Complex32::new(1.0, 0.0), Meters::new(10.0), Ohms::new(50.0))
        .unwrap();
    assert!(d.norm() > 1.0 && d.re.is_finite());
}

#[test]
fn non_finite() {
    let mut k = coax();
    k.inductance = f32::NAN;
    assert_eq!(k.at(Hertz::new(1e6)), Err(LineError::NotFinite));
    let line = coax().at(Hertz::new(1e6)).unwrap();
    assert_eq!(
        line.input_impedance(Complex32::new(f32::INFINITY, 0.0), Meters::new(1.0)),
        Err(LineError::NotFinite)
    );
    assert_eq!(
        line.matched_loss(Meters::new(f32::NAN)),
        Err(LineError::NotFinite)
    );
    assert_eq!(
        total_loss(Db::new(f32::INFINITY), Gamma::MATCHED),
        Err(LineError::NotFinite)
    );
}
