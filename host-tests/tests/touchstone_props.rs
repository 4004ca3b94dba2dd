//! Property tests: the Touchstone writer takes any points and comments without panicking;
//! whatever it accepts reads back with the specification-written reader.

use feedline::touchstone::{DataFormat, FrequencyUnit, TouchstoneWriter};
use feedline::units::{Hertz, Ohms};
use feedline_host_tests::reference::touchstone_spec::parse_one_port;
use num_complex::Complex32;
use proptest::prelude::*;

fn wild() -> impl Strategy<Value = f32> {
    prop_oneof![
        any::<f32>(),
        Just(f32::NAN),
        Just(f32::INFINITY),
        0.0f32..1.0e10,
        -2.0f32..2.0,
    ]
}

proptest! {
    #[test]
    fn writer_output_always_parses(
        unit in 0usize..4,
        fmt in 0usize..3,
        z0 in wild(),
        comment in "[ -~\n]{0,40}",
        pts in prop::collection::vec((wild(), wild(), wild()), 0..40),
    ) {
        let unit = [FrequencyUnit::Hz, FrequencyUnit::KHz, FrequencyUnit::MHz, FrequencyUnit::GHz][unit];
        let fmt = [DataFormat::MagnitudeAngle, DataFormat::DecibelAngle, DataFormat::RealImaginary][fmt];
        let Ok(mut w) = TouchstoneWriter::new(String::new(), unit, fmt, Ohms::new(z0)) else {
            prop_assert!(!(z0.is_finite() && z0 > 0.0));
            return Ok(());
        };
        w.comment(&comment).unwrap();
        let mut accepted = 0;
        for &(f, re, im) in &pts {
            if w.point(Hertz::new(f), Complex32::new(re, im)).is_ok() {
                accepted += 1;
            }
        }
        prop_assert_eq!(w.points(), accepted);
        let text = w.finish().unwrap();
        let file = parse_one_port(&text);
        prop_assert!(file.is_ok(), "{:?}\n{}", file.err(), text);
        let file = file.unwrap();
        prop_assert_eq!(file.data.len(), accepted);
        prop_assert_eq!(file.option_lines, 1);
        for d in &file.data {
            prop_assert!(d.hertz.is_finite() && d.s11.re.is_finite() && d.s11.im.is_finite());
        }
    }
}
