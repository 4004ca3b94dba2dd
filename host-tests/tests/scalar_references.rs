//! The scalar chain checked against outside references. Each check names its source.

use feedline::bridge::{measure_volts, BridgeSpec, Detector};
use feedline::reflection::{Gamma, Vswr};
use feedline::uncertainty::directivity_bounds;
use feedline::units::{Db, Np, Volts, DB_PER_NP};

/// VSWR → (return loss dB, mismatch loss dB), as printed in the VSWR conversion tables of
/// radio handbooks (values from memory, to the 2 or 3 decimals such tables give; each also
/// follows from the textbook relations RL = −20·log10|Γ|, ML = −10·log10(1−|Γ|²)).
const HANDBOOK_TABLE: [(f32, f32, f32); 7] = [
    (1.10, 26.44, 0.010),
    (1.20, 20.83, 0.036),
    (1.50, 13.98, 0.177),
    (2.00, 9.54, 0.512),
    (3.00, 6.02, 1.249),
    (5.00, 3.52, 2.553),
    (10.0, 1.74, 4.807),
];

#[test]
fn handbook_vswr_table() {
    for &(s, rl, ml) in HANDBOOK_TABLE.iter() {
        let g = Gamma::from_vswr(s).unwrap();
        let r = g.reflection();
        assert!(
            (r.return_loss.value() - rl).abs() < 0.006,
            "VSWR {s}: RL {:?}",
            r.return_loss
        );
        assert!(
            (r.mismatch_loss.value() - ml).abs() < 0.0006,
            "VSWR {s}: ML {:?}",
            r.mismatch_loss
        );
        // And back again.
        let back = Gamma::from_return_loss(Db::new(rl)).unwrap().vswr().value();
        assert!((back - s).abs() < 0.002 * s, "RL {rl}: VSWR {back}");
    }
}

/// IEEE Std 100 (The Authoritative Dictionary of IEEE Standards Terms) defines return loss as
/// the ratio of incident to reflected power in dB: a positive number for a passive load, larger
/// for a better match (and the IEEE has asked authors to stop quoting it as a negative number).
#[test]
fn return_loss_is_positive_and_grows_with_match() {
    let worse = Gamma::new(0.5).unwrap().return_loss().value();
    let better = Gamma::new(0.05).unwrap().return_loss().value();
    assert!(worse > 0.0 && better > worse);
    let spec = BridgeSpec::new(
        Detector::Linear,
        Volts::new(0.001),
        Volts::new(3.0),
        Db::new(40.0),
    );
    let m = measure_volts(&spec, Volts::new(2.0), Volts::new(0.2)).unwrap();
    assert!((m.reflection.return_loss.value() - 20.0).abs() < 1e-4);
}

/// 1 Np = 20·log10(e) dB = 8.685889638 dB (definition of the neper; common practice: 8.686).
#[test]
fn nepers_and_decibels() {
    let exact = 20.0 * std::f64::consts::E.log10();
    assert!((f64::from(DB_PER_NP) - exact).abs() < 1e-6);
    assert!((Np::new(1.0).to_db().value() - 8.686).abs() < 5e-4);
    assert!((Db::new(8.686).to_np().value() - 1.0).abs() < 1e-4);
}

/// The first-order directivity bound |Γ| ± 10^(−D/20) (directional-coupler theory, any
/// microwave-measurement handbook): with D = 30 dB a true 20 dB return loss reads between
/// about 17.6 dB and 23.3 dB.
#[test]
fn directivity_bound_worked_example() {
    let g = Gamma::from_return_loss(Db::new(20.0)).unwrap();
    let b = directivity_bounds(g, Db::new(30.0));
    assert!((b.return_loss_low.value() - 17.6).abs() < 0.05);
    assert!((b.return_loss_high.value() - 23.3).abs() < 0.05);
    assert!(b.vswr_low.value() < g.vswr().value() && g.vswr().value() < b.vswr_high.value());
    assert!(b.vswr_high.value() < Vswr::CEILING);
}
