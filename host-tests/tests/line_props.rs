//! Property tests of the line models: no NaN or infinity out, and no panic, for any inputs —
//! NaN, infinities, zero, negative, subnormal and huge values included.

use feedline::line::feed_loss::{
    additional_loss, gamma_at_input, gamma_at_load, return_loss_at_load,
};
use feedline::line::fixed::{self, DbQ16, VswrQ16, DB_CEILING};
use feedline::line::geometry::{skin_depth, surface_resistance};
use feedline::line::{
    power_at_load, swr_at_input, swr_at_load, total_loss, CoaxGeometry, Dielectric, Line,
    LineConstants, LossModel, LossPoint, TwoWireGeometry,
};
use feedline::reflection::{Gamma, Vswr};
use feedline::units::{Celsius, Db, DbPer, Feet, Hertz, Meters, Ohms, Watts};
use num_complex::Complex32;
use proptest::prelude::*;

fn any_f32() -> impl Strategy<Value = f32> {
    prop_oneof![
        Just(f32::NAN),
        Just(f32::INFINITY),
        Just(f32::NEG_INFINITY),
        Just(0.0f32),
        Just(-0.0f32),
        Just(f32::MIN_POSITIVE),
        Just(1.0e-45f32),
        Just(f32::MAX),
        Just(-f32::MAX),
        any::<f32>(),
        -10.0f32..10.0,
        1.0e-12f32..1.0e-6,
        1.0e3f32..1.0e10,
    ]
}

fn fin(z: Complex32) -> bool {
    z.re.is_finite() && z.im.is_finite()
}

fn check_line(line: &Line) {
    assert!(fin(line.characteristic_impedance()));
    assert!(fin(line.propagation_constant::<Meters>()));
    assert!(fin(line.propagation_constant::<Feet>()));
    assert!(line.attenuation::<Feet>().is_finite());
    assert!(line.attenuation_np::<Meters>().is_finite());
    assert!(line.phase_constant::<Feet>().is_finite());
    assert!(line.phase_velocity().is_finite());
    assert!(line.velocity_factor().is_finite());
    assert!(line.wavelength::<Feet>().is_finite());
    assert!(line.delay::<Feet>().is_finite());
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    #[test]
    fn constants_never_give_nan(r in any_f32(), l in any_f32(), g in any_f32(), c in any_f32(), f in any_f32()) {
        let k = LineConstants::per_meter(r, l, g, c);
        if let Ok(line) = k.at(Hertz::new(f)) {
            check_line(&line);
        }
        if let Ok(ll) = k.low_loss(Hertz::new(f)) {
            prop_assert!(ll.z0.is_finite() && ll.alpha.is_finite() && ll.beta.is_finite());
        }
        if let Ok(e) = k.approximation_error(Hertz::new(f)) {
            prop_assert!(e.z0.is_finite() && e.alpha.is_finite() && e.beta.is_finite());
        }
        let kf = LineConstants::per::<Feet>(r, l, g, c);
        if let Ok(line) = kf.at(Hertz::new(f)) {
            check_line(&line);
        }
    }

    #[test]
    fn geometry_never_gives_nan(d in any_f32(), dd in any_f32(), er in any_f32(), tand in any_f32(), sigma in any_f32(), f in any_f32()) {
        let diel = Dielectric { relative_permittivity: er, loss_tangent: tand };
        let c = CoaxGeometry::new(Meters::new(d), Meters::new(dd), diel).with_conductivity(sigma);
        let t = TwoWireGeometry::new(Meters::new(d), Meters::new(dd), diel).with_conductivity(sigma);
        for z in [c.characteristic_impedance(), t.characteristic_impedance()].into_iter().flatten() {
            prop_assert!(z.is_finite());
        }
        for v in [c.velocity_factor(), t.velocity_factor()].into_iter().flatten() {
            prop_assert!(v.is_finite());
        }
        for k in [c.constants_at(Hertz::new(f)), t.constants_at(Hertz::new(f)), c.lossless_constants(), t.lossless_constants()].into_iter().flatten() {
            prop_assert!(k.resistance.is_finite() && k.inductance.is_finite());
            prop_assert!(k.conductance.is_finite() && k.capacitance.is_finite());
        }
        for line in [c.line_at(Hertz::new(f)), t.line_at(Hertz::new(f))].into_iter().flatten() {
            check_line(&line);
        }
        let _ = c.skin_effect_holds(Hertz::new(f));
        if let Ok(s) = skin_depth(Hertz::new(f), sigma) { prop_assert!(s.is_finite()); }
        if let Ok(s) = surface_resistance(Hertz::new(f), sigma) { prop_assert!(s.is_finite()); }
    }

    #[test]
    fn loss_fit_never_gives_nan(pts in proptest::collection::vec((any_f32(), any_f32()), 0..6), f in any_f32(), len in any_f32(), t in any_f32(), k in any_f32()) {
        let points: Vec<LossPoint> = pts.iter().map(|&(f, a)| LossPoint::new(Hertz::new(f), DbPer::<Feet>::new(a))).collect();
        let mut models = Vec::new();
        models.extend(LossModel::least_squares(&points));
        if points.len() >= 2 {
            models.extend(LossModel::from_two_points(&points[0], &points[1]));
        }
        models.extend(LossModel::new::<Feet>(k, t));
        for m in models {
            prop_assert!(m.k1::<Feet>().is_finite() && m.k2::<Meters>().is_finite());
            prop_assert!(m.k1::<Feet>() >= 0.0 && m.k2::<Feet>() >= 0.0);
            if let Ok(a) = m.attenuation::<Feet>(Hertz::new(f)) { prop_assert!(a.is_finite()); }
            if let Ok(a) = m.conductor_part::<Meters>(Hertz::new(f)) { prop_assert!(a.is_finite()); }
            if let Ok(l) = m.loss(Hertz::new(f), Feet::new(len)) { prop_assert!(l.is_finite()); }
            if let Ok(e) = m.worst_relative_error(&points) { prop_assert!(e.is_finite()); }
            if let Ok(h) = m.at_temperature(Celsius::new(20.0), Celsius::new(t), k) {
                prop_assert!(h.k1::<Meters>().is_finite());
            }
            if let Ok(line) = m.line_at(Hertz::new(f), Ohms::new(len), k) { check_line(&line); }
        }
    }

    #[test]
    fn terminated_never_gives_nan(r in 0.0f32..100.0, l in 1e-8f32..1e-5, g in 0.0f32..1e-2, c in 1e-12f32..1e-9, f in 1e3f32..1e10,
                                  a in any_f32(), b in any_f32(), len in any_f32(), zref in any_f32()) {
        let line = LineConstants::per_meter(r, l, g, c).at(Hertz::new(f)).unwrap();
        let z = Complex32::new(a, b);
        for v in [
            line.load_reflection(z),
            line.gamma_at_input(z, Meters::new(len)),
            line.gamma_at_load(z, Feet::new(len)),
            line.input_impedance(z, Meters::new(len)),
            line.input_impedance_from_gamma(z, Meters::new(len)),
            line.embed(z, Meters::new(len), Ohms::new(zref)),
            line.deembed(z, Feet::new(len), Ohms::new(zref)),
        ]
        .into_iter()
        .flatten()
        {
            prop_assert!(fin(v), "{v}");
        }
        if let Ok(m) = line.matched_loss(Feet::new(len)) { prop_assert!(m.is_finite()); }
    }

    #[test]
    fn feed_loss_never_gives_nan(g in any_f32(), ml in any_f32(), s in any_f32(), p in any_f32()) {
        let gm = Gamma::saturating(g);
        let vs = Vswr::new(s).unwrap_or(Vswr::new(1.0).unwrap());
        if let Ok(r) = gamma_at_load(gm, Db::new(ml)) {
            prop_assert!(r.gamma.value().is_finite() && r.vswr.value().is_finite() && r.return_loss.is_finite());
        }
        if let Ok(r) = swr_at_load(vs, Db::new(ml)) { prop_assert!(r.vswr.value().is_finite()); }
        if let Ok(r) = return_loss_at_load(Db::new(s), Db::new(ml)) { prop_assert!(r.return_loss.is_finite()); }
        if let Ok(v) = swr_at_input(vs, Db::new(ml)) { prop_assert!(v.value().is_finite()); }
        if let Ok(v) = gamma_at_input(gm, Db::new(ml)) { prop_assert!(v.value().is_finite()); }
        if let Ok(t) = total_loss(Db::new(ml), gm) {
            prop_assert!(t.is_finite() && t.value() >= 0.0 && t.value() <= 100.0);
            prop_assert!(t.value() + 1e-4 >= ml.min(100.0));
        }
        if let Ok(t) = additional_loss(Db::new(ml), gm) { prop_assert!(t.is_finite() && t.value() >= 0.0); }
        if let Ok(w) = power_at_load(Watts::new(p), Db::new(ml), gm) { prop_assert!(w.is_finite() && w.value() >= 0.0); }
    }

    #[test]
    fn fixed_never_panics(a in any::<i32>(), b in any::<i32>(), s in any::<u32>()) {
        let (a, b) = (DbQ16::from_bits(a), DbQ16::from_bits(b));
        let sw = VswrQ16::from_bits(s);
        if let Ok(m) = fixed::matched_loss_from_open_short(a) { prop_assert!(m.to_bits() >= 0); }
        let rl = fixed::swr_to_return_loss(sw);
        prop_assert!(rl >= DbQ16::ZERO && rl <= DB_CEILING);
        if let Ok(v) = fixed::return_loss_to_swr(a) { prop_assert!(v >= VswrQ16::ONE && v <= VswrQ16::CEILING); }
        if let Ok(r) = fixed::swr_at_load(sw, b) { prop_assert!(r.swr <= VswrQ16::CEILING && r.return_loss >= DbQ16::ZERO); }
        if let Ok(v) = fixed::swr_at_input(sw, b) { prop_assert!(v >= VswrQ16::ONE); }
        if let Ok(r) = fixed::return_loss_at_load(a, b) { prop_assert!(r.return_loss <= DB_CEILING); }
        if let Ok(t) = fixed::total_loss(b, sw) { prop_assert!(t >= DbQ16::ZERO && t <= DB_CEILING); }
        if let Ok(t) = fixed::total_loss_from_return_loss(b, a) { prop_assert!(t >= DbQ16::ZERO && t <= DB_CEILING); }
    }
}
