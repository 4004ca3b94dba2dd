//! Property tests: sweep plans, the analysis accumulators and the terminal chart take any
//! input without panicking and never give NaN or infinity.

use feedline::analysis::{
    impedance, parabolic_vertex, q_from_bandwidth, Bands, LimitWatch, MinimumVswr, Resonances,
    VswrLimit,
};
use feedline::plot::VswrChart;
use feedline::reflection::{Gamma, Vswr};
use feedline::sweep::{Spacing, SweepPlan};
use feedline::units::{Hertz, Ohms};
use num_complex::Complex32;
use proptest::prelude::*;

fn wild() -> impl Strategy<Value = f32> {
    prop_oneof![
        any::<f32>(),
        Just(f32::NAN),
        Just(f32::INFINITY),
        Just(f32::NEG_INFINITY),
        Just(0.0f32),
        -1.0e10f32..1.0e10,
        0.0f32..2.0,
    ]
}

proptest! {
    #[test]
    fn plans_give_finite_ordered_frequencies(a in wild(), b in wild(), n in 0usize..700, log in any::<bool>()) {
        let sp = if log { Spacing::Logarithmic } else { Spacing::Linear };
        if let Ok(p) = SweepPlan::<512>::from_start_stop(Hertz::new(a), Hertz::new(b), n, sp) {
            let mut last = 0.0f32;
            for (_, f) in p.iter() {
                let f = f.value();
                prop_assert!(f.is_finite() && f >= a && f <= b && f >= last);
                last = f;
            }
            prop_assert_eq!(p.iter().count(), n);
        }
        let _ = SweepPlan::<512>::from_centre_span(Hertz::new(a), Hertz::new(b), n, sp);
    }

    #[test]
    fn accumulators_stay_finite(pts in prop::collection::vec((wild(), wild(), wild()), 0..80)) {
        let mut min = MinimumVswr::new();
        let mut res = Resonances::<3>::new();
        let mut bands = Bands::<2, 3>::new();
        bands.add_threshold(Vswr::new(2.0).unwrap()).unwrap();
        bands.add_threshold(Vswr::new(1.2).unwrap()).unwrap();
        let mut watch = LimitWatch::new(VswrLimit {
            low: Hertz::new(1.0),
            high: Hertz::new(1.0e6),
            limit: Vswr::new(1.5).unwrap(),
        });
        for &(f, x, y) in &pts {
            let g = Complex32::new(x, y);
            let mag = Gamma::saturating(g.norm());
            min.push(Hertz::new(f), mag);
            res.push_gamma(Hertz::new(f), g, Ohms::new(50.0));
            res.push(Hertz::new(f), g);
            bands.push(Hertz::new(f), mag.vswr());
            watch.push(Hertz::new(f), mag.vswr());
        }
        bands.finish();
        if let Some(m) = min.result() {
            prop_assert!(m.frequency.is_finite() && m.vswr.value().is_finite() && m.vswr.value() >= 1.0);
        }
        for r in res.found() {
            prop_assert!(r.frequency.is_finite() && r.resistance.is_finite());
        }
        for t in bands.thresholds() {
            let mut last = f32::NEG_INFINITY;
            for b in t.bands() {
                prop_assert!(b.lower.is_finite() && b.upper.is_finite());
                prop_assert!(b.lower.value() <= b.upper.value() && b.lower.value() >= last);
                last = b.upper.value();
            }
        }
        if let Some((f, v)) = watch.verdict().worst {
            prop_assert!(f.is_finite() && v.value().is_finite());
        }
    }

    #[test]
    fn helpers_stay_finite(a in wild(), b in wild(), c in wild(), d in wild(), e in wild(), f in wild()) {
        if let Some((x, y)) = parabolic_vertex((a, b), (c, d), (e, f)) {
            prop_assert!(x.is_finite() && y.is_finite());
        }
        if let Some(z) = impedance(Complex32::new(a, b), Ohms::new(c)) {
            prop_assert!(z.re.is_finite() && z.im.is_finite());
        }
        if let Ok(s) = Vswr::new(e) {
            if let Ok(q) = q_from_bandwidth(Hertz::new(a), Hertz::new(b), s) {
                prop_assert!(q.is_finite() && q > 0.0);
            }
        }
    }

    #[test]
    fn chart_rows_never_panic(cols in 0usize..300, top in wild(), f in wild(), s in wild(), t in wild()) {
        let top = Vswr::new(top).unwrap_or(Vswr::new(3.0).unwrap());
        let chart = VswrChart::new(cols, top, Vswr::new(t).ok());
        let mut out = String::new();
        chart.header(&mut out).unwrap();
        chart.row(&mut out, Hertz::new(f), Gamma::saturating(s).vswr(), Some("x")).unwrap();
        prop_assert!(out.lines().count() == 3);
    }
}
