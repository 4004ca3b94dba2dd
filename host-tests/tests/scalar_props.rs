//! Property tests of the f32 scalar chain over whole input ranges.

use feedline::bridge::{measure_levels, measure_volts, BridgeSpec, Detector, Fault, ScalarChain};
use feedline::detector::{Adc, LogDetector};
use feedline::reflection::{Gamma, DB_CEILING};
use feedline::units::{Db, Dbm, Volts};
use proptest::prelude::*;

fn any_f32() -> impl Strategy<Value = f32> {
    prop_oneof![
        Just(f32::NAN),
        Just(f32::INFINITY),
        Just(f32::NEG_INFINITY),
        Just(0.0f32),
        Just(-0.0f32),
        Just(f32::MIN_POSITIVE),
        Just(f32::MAX),
        any::<f32>(),
        -10.0f32..10.0,
    ]
}

fn detector() -> impl Strategy<Value = Detector> {
    prop_oneof![
        Just(Detector::Linear),
        Just(Detector::SquareLaw),
        (0.001f32..0.1)
            .prop_map(|s| Detector::Log(LogDetector::new(Volts::new(s), Dbm::new(-84.0)).unwrap())),
    ]
}

fn all_finite(m: &feedline::bridge::Measurement) -> bool {
    let r = &m.reflection;
    let b = m.bounds();
    [
        r.gamma.value(),
        r.vswr.value(),
        r.return_loss.value(),
        r.mismatch_loss.value(),
        b.gamma_low.value(),
        b.gamma_high.value(),
        b.return_loss_low.value(),
        b.return_loss_high.value(),
        b.vswr_low.value(),
        b.vswr_high.value(),
    ]
    .iter()
    .all(|x| x.is_finite())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(4000))]

    #[test]
    fn never_nan_for_any_volts(det in detector(), f in any_f32(), r in any_f32(),
                               floor in any_f32(), ceil in any_f32(), d in any_f32()) {
        let spec = BridgeSpec::new(det, Volts::new(floor), Volts::new(ceil), Db::new(d));
        if let Ok(m) = measure_volts(&spec, Volts::new(f), Volts::new(r)) {
            prop_assert!(all_finite(&m));
            prop_assert!(m.reflection.vswr.value() >= 1.0);
            prop_assert!(m.reflection.return_loss.value() >= 0.0);
            prop_assert!(m.reflection.return_loss.value() <= DB_CEILING);
            prop_assert!(m.bounds().return_loss_low <= m.reflection.return_loss);
            prop_assert!(m.reflection.return_loss <= m.bounds().return_loss_high);
        }
    }

    #[test]
    fn never_nan_for_any_levels(f in any_f32(), r in any_f32(), floor in any_f32(), d in any_f32()) {
        if let Ok(m) = measure_levels(Dbm::new(f), Dbm::new(r), Dbm::new(floor), Db::new(d)) {
            prop_assert!(all_finite(&m));
        }
    }

    #[test]
    fn any_codes_any_adc(bits in 0u8..30, offset in any::<i32>(), f in any::<u16>(), r in any::<u16>(),
                         det in detector()) {
        if let Ok(adc) = Adc::new(bits, Volts::new(3.3), offset) {
            let spec = BridgeSpec::new(det, Volts::new(0.001), Volts::new(3.2), Db::new(35.0));
            let chain = ScalarChain::new(adc, spec).expect("a valid spec");
            let by_codes = chain.measure_codes(f, r);
            if let Ok(m) = &by_codes {
                prop_assert!(all_finite(m));
            }
            // The chain's code thresholds give the verdict that the voltages give.
            match (adc.volts(u32::from(f)), adc.volts(u32::from(r))) {
                (Ok(fv), Ok(rv)) => {
                    let by_volts = measure_volts(&spec, fv, rv);
                    match (by_codes, by_volts) {
                        (Ok(a), Ok(b)) => {
                            prop_assert_eq!(a.quality, b.quality);
                            let (ra, rb) = (a.reflection.return_loss.value(), b.reflection.return_loss.value());
                            prop_assert!((ra - rb).abs() <= 1e-4 * (1.0 + rb), "{} {}", ra, rb);
                        }
                        (Err(Fault::ForwardSaturated | Fault::ReflectedSaturated), Err(Fault::ForwardSaturated | Fault::ReflectedSaturated)) => {}
                        (a, b) => prop_assert_eq!(a, b),
                    }
                }
                _ => prop_assert!(matches!(by_codes, Err(Fault::ForwardSaturated | Fault::ReflectedSaturated))),
            }
        }
    }

    #[test]
    fn return_loss_falls_as_reflected_rises(f in 100u16..60000, r1 in 1u16..60000, r2 in 1u16..60000) {
        let adc = Adc::new(16, Volts::new(2.5), 0).unwrap();
        let spec = BridgeSpec::new(Detector::Linear, Volts::new(1e-5), Volts::new(2.49), Db::new(35.0));
        let chain = ScalarChain::new(adc, spec).unwrap();
        let (lo, hi) = if r1 <= r2 { (r1, r2) } else { (r2, r1) };
        if let (Ok(a), Ok(b)) = (chain.measure_codes(f, lo), chain.measure_codes(f, hi)) {
            prop_assert!(a.reflection.return_loss >= b.reflection.return_loss);
            prop_assert!(a.reflection.vswr <= b.reflection.vswr);
            prop_assert!(a.reflection.mismatch_loss <= b.reflection.mismatch_loss);
        }
    }

    #[test]
    fn round_trips(g in 0.0f32..0.99) {
        let gamma = Gamma::new(g).unwrap();
        let r = gamma.reflection();
        let via_vswr = Gamma::from_vswr(r.vswr.value()).unwrap().value();
        let via_rl = Gamma::from_return_loss(r.return_loss).unwrap().value();
        prop_assert!((via_vswr - g).abs() < 1e-4);
        if g > 1e-4 {
            prop_assert!((via_rl - g).abs() < 1e-4 * g.max(1e-3) * 10.0);
        }
        if g > 0.01 {
            let via_ml = Gamma::from_mismatch_loss(r.mismatch_loss).unwrap().value();
            prop_assert!((via_ml - g).abs() < 1e-3);
        }
    }
}
