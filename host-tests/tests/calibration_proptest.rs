//! Property tests: no NaN or infinity comes out of the vector, calibration or store APIs
//! for any input (including NaN, infinities, subnormals and huge values); bad input gives a
//! typed error.

use feedline::calibration::{
    CalTable, LoadStandard, OnePortTerms, OpenStandard, ResponseCal, ShortStandard, StandardsModel,
};
use feedline::store::Record;
use feedline::units::{Db, Hertz, Ohms, Seconds, VoltageRatio};
use feedline::vector::{
    gamma_from_db_phase, gamma_from_wave_ratio, resolve_phase_sign, Admittance, Impedance,
    PhaseSignConfig, Reactive,
};
use num_complex::Complex32;
use proptest::prelude::*;

/// Any f32 bit pattern, and a weighted mix of "interesting" values.
fn any_f32() -> impl Strategy<Value = f32> {
    prop_oneof![
        3 => any::<u32>().prop_map(f32::from_bits),
        3 => -2.0f32..2.0,
        1 => prop::sample::select(vec![
            0.0, -0.0, 1.0, -1.0, f32::NAN, f32::INFINITY, f32::NEG_INFINITY, f32::MAX,
            f32::MIN, f32::MIN_POSITIVE, 1.0e-45, 1.0 - f32::EPSILON, 100.0, 1.0e30,
        ]),
    ]
}

fn any_c() -> impl Strategy<Value = Complex32> {
    (any_f32(), any_f32()).prop_map(|(a, b)| Complex32::new(a, b))
}

fn fin(z: Complex32) -> bool {
    z.re.is_finite() && z.im.is_finite()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2500))]

    #[test]
    fn vector_outputs_are_finite(g in any_c(), z0 in any_f32(), f in any_f32(), db in any_f32(), ph in any_f32(), a in any_c()) {
        if let Ok(x) = gamma_from_db_phase(Db::new(db), ph) { prop_assert!(fin(x)); }
        if let Ok(x) = gamma_from_wave_ratio(g, a) { prop_assert!(fin(x)); }
        if let Ok(z) = Impedance::from_gamma(g, Ohms::new(z0)) {
            prop_assert!(fin(z.complex()) && fin(z.gamma()) && fin(z.admittance().complex()));
            prop_assert!(z.magnitude().is_finite() && z.angle_deg().is_finite());
            let p = z.parallel();
            prop_assert!(p.resistance.is_none_or(|r| r.is_finite()));
            prop_assert!(p.reactance.is_none_or(|r| r.is_finite()));
            prop_assert!(z.q().is_none_or(f32::is_finite));
            for e in [z.series_element(Hertz::new(f)), z.parallel_element(Hertz::new(f))].into_iter().flatten() {
                match e {
                    Reactive::Inductance(l) => prop_assert!(l.is_finite()),
                    Reactive::Capacitance(c) => prop_assert!(c.is_finite()),
                    Reactive::Resistive => {}
                }
            }
        }
        if let Ok(y) = Admittance::from_gamma(g, Ohms::new(z0)) {
            prop_assert!(fin(y.complex()) && fin(y.impedance().complex()));
        }
        let _ = resolve_phase_sign(Hertz::new(f), g, Hertz::new(f * 1.01), a, Ohms::new(z0), &PhaseSignConfig::default());
    }

    #[test]
    fn calibration_outputs_are_finite(m in [any_c(), any_c(), any_c()], a in [any_c(), any_c(), any_c()], raw in any_c(), t in any_f32()) {
        if let Ok(terms) = OnePortTerms::from_known(a, m) {
            prop_assert!(fin(terms.directivity()) && fin(terms.source_match()) && fin(terms.tracking()));
            if let Ok(x) = terms.correct(raw) { prop_assert!(fin(x) && x.norm() <= 4.0 * 1.0001); }
            if let Ok(x) = terms.distort(raw) { prop_assert!(fin(x)); }
            if let Ok(x) = terms.lerp(&OnePortTerms::IDENTITY, t) { prop_assert!(fin(x.tracking())); }
        }
        if let Ok(terms) = OnePortTerms::new(m[0], m[1], m[2]) {
            if let Ok(x) = terms.correct(raw) { prop_assert!(fin(x)); }
        }
        if let Ok(r) = ResponseCal::from_open_short(VoltageRatio::new(raw.re), VoltageRatio::new(raw.im)) {
            if let Ok(c) = r.correct(VoltageRatio::new(t)) { prop_assert!(c.gamma.value().is_finite()); }
        }
    }

    #[test]
    fn standards_are_finite(c in [any_f32(), any_f32(), any_f32(), any_f32()], l in [any_f32(), any_f32(), any_f32(), any_f32()], d in any_f32(), f in any_f32(), z0 in any_f32(), load in any_c()) {
        let model = StandardsModel {
            open: OpenStandard { capacitance: c, delay: Seconds::new(d) },
            short: ShortStandard { inductance: l, delay: Seconds::new(d * 0.5) },
            load: LoadStandard { gamma: load },
            z0: Ohms::new(z0),
        };
        if let Ok(g) = model.gammas_at(Hertz::new(f)) {
            prop_assert!(fin(g.open) && fin(g.short) && fin(g.load));
        }
    }

    #[test]
    fn table_outputs_are_finite(fs in prop::collection::vec(any_f32(), 0..6), f in any_f32(), raw in any_c(), bytes in prop::collection::vec(any::<u8>(), 0..200)) {
        let mut table = CalTable::<4>::new();
        for (i, x) in fs.iter().enumerate() {
            let e = Complex32::new(0.01 * i as f32, 0.0);
            let _ = table.insert(Hertz::new(*x), OnePortTerms::new(e, e, Complex32::new(1.0, e.re)).unwrap());
        }
        if let Ok(t) = table.terms_at(Hertz::new(f)) { prop_assert!(fin(t.tracking())); }
        if let Ok(x) = table.correct(Hertz::new(f), raw) { prop_assert!(fin(x)); }
        // Decoding arbitrary bytes never panics and never yields non-finite terms.
        if let Ok(t) = CalTable::<4>::decode(1, &bytes) {
            for p in t.points() {
                prop_assert!(p.frequency.is_finite() && fin(p.terms.tracking()));
            }
        }
    }
}
