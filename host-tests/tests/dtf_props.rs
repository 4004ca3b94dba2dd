//! Property tests: the distance-to-fault transforms and the fault list take any buffer, any
//! setup and any loss model without panicking, and never give NaN or infinity.

use feedline::dtf::{scalar_transform_in_place, transform_in_place, DtfSetup, FaultSearch, Window};
use feedline::units::{Db, Hertz, Meters};
use num_complex::Complex32;
use proptest::prelude::*;

fn wild() -> impl Strategy<Value = f32> {
    prop_oneof![
        any::<f32>(),
        Just(f32::NAN),
        Just(f32::INFINITY),
        Just(0.0f32),
        -1.0e9f32..1.0e9,
        -1.0f32..1.0,
    ]
}

fn window() -> impl Strategy<Value = Window> {
    prop_oneof![
        Just(Window::Rectangular),
        Just(Window::Hann),
        wild().prop_map(|beta| Window::Kaiser { beta }),
        (0.0f32..50.0).prop_map(|beta| Window::Kaiser { beta }),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    #[test]
    fn transforms_stay_finite(
        len in prop_oneof![Just(15usize), Just(16), Just(64), Just(100), Just(256)],
        points in 0usize..300,
        samples in prop::collection::vec((wild(), wild()), 0..300),
        clean in any::<bool>(),
        start in prop_oneof![wild(), 1.0e6f32..1.0e8],
        span in prop_oneof![wild(), 1.0e6f32..1.0e9],
        vf in prop_oneof![wild(), 0.5f32..1.0],
        win in window(),
        loss in prop_oneof![wild(), 0.0f32..1.0],
        thr in wild(),
        sep in wild(),
        maxd in wild(),
        scalar in any::<bool>(),
    ) {
        let mut buf = vec![Complex32::new(0.0, 0.0); len];
        for (slot, &(re, im)) in buf.iter_mut().zip(samples.iter()) {
            *slot = if clean {
                Complex32::new(re.clamp(-1.0, 1.0), im.clamp(-1.0, 1.0))
            } else {
                Complex32::new(re, im)
            };
        }
        let setup = DtfSetup {
            start: Hertz::new(start),
            stop: Hertz::new(start + span),
            window: win,
            velocity_factor: vf,
            loss: move |_f: Hertz| loss,
        };
        let resp = if scalar {
            scalar_transform_in_place(&mut buf, points, &setup)
        } else {
            transform_in_place(&mut buf, points, &setup)
        };
        if let Ok(r) = resp {
            prop_assert!(r.resolution().is_finite() && r.max_range().is_finite());
            prop_assert!(r.bin_spacing().is_finite());
            for (d, rl) in r.iter() {
                prop_assert!(d.is_finite() && rl.is_finite() && rl.value() >= 0.0);
            }
            let faults = r.faults::<6>(&FaultSearch {
                threshold: Db::new(thr),
                min_separation: Meters::new(sep),
                max_distance: Meters::new(maxd),
            });
            let mut last = -1.0f32;
            for f in &faults {
                prop_assert!(f.distance.is_finite() && f.return_loss.is_finite());
                prop_assert!(f.distance.value() >= 0.0 && f.distance.value() <= r.max_range().value());
                prop_assert!(f.distance.value() >= last);
                last = f.distance.value();
            }
        }
    }
}
