//! Touchstone 1-port output of the core, re-read by the reader written from the Touchstone
//! 1.1 specification (`feedline_host_tests::reference::touchstone_spec`, written apart from
//! the writer) and checked field by field: option line, units, comment lines, number formats
//! and values.

use feedline::touchstone::{DataFormat, FrequencyUnit, TouchstoneError, TouchstoneWriter};
use feedline::units::{Hertz, Ohms};
use feedline_host_tests::reference::touchstone_spec::parse_one_port;
use num_complex::{Complex32, Complex64};

/// Worst |ΔS11| allowed after the round trip: 6 decimals for MA/RI parts (5e-7), 3 decimals
/// of degree (8.7e-6 rad) and 4 decimals of dB (5.8e-6 relative), plus f32 rounding.
const S11_BOUND: f64 = 1.2e-5;

fn points() -> Vec<(f32, Complex32)> {
    (0..41)
        .map(|k| {
            let f = 140.0e6 + 250.0e3 * k as f32;
            let t = k as f32 * 0.15;
            let m = 0.05 + 0.9 * (k as f32 / 40.0);
            (f, Complex32::from_polar(m, t - 3.0))
        })
        .chain([
            (151.0e6, Complex32::new(0.0, 0.0)),
            (152.0e6, Complex32::new(-1.0, 0.0)),
        ])
        .collect()
}

fn decimals(tok: &str) -> usize {
    tok.split_once('.').map_or(0, |(_, d)| d.len())
}

#[test]
fn every_unit_and_format_reads_back_field_by_field() {
    let units = [
        (FrequencyUnit::Hz, "HZ", 1.0),
        (FrequencyUnit::KHz, "KHZ", 1e3),
        (FrequencyUnit::MHz, "MHZ", 1e6),
        (FrequencyUnit::GHz, "GHZ", 1e9),
    ];
    let formats = [
        (DataFormat::MagnitudeAngle, "MA", (6, 3)),
        (DataFormat::DecibelAngle, "DB", (4, 3)),
        (DataFormat::RealImaginary, "RI", (6, 6)),
    ];
    let mut worst = 0.0f64;
    for (unit, utok, uhz) in units {
        for (format, ftok, (d1, d2)) in formats {
            let mut w =
                TouchstoneWriter::new(String::new(), unit, format, Ohms::new(50.0)).unwrap();
            w.comment("feedline demo export").unwrap();
            w.comment("site: invented rooftop mast\nfeeder: 18 m")
                .unwrap();
            for &(f, g) in &points() {
                w.point(Hertz::new(f), g).unwrap();
            }
            w.comment("end of sweep").unwrap();
            let text = w.finish().unwrap();
            let file = parse_one_port(&text).unwrap_or_else(|e| panic!("{e}\n{text}"));

            // Option line: exactly one, after the leading comments, before the data, with the
            // tokens in the specification's order.
            assert_eq!(file.option_lines, 1);
            assert_eq!(file.option_line_at, Some(4));
            assert_eq!(file.first_data_at, Some(5));
            let opt = text.lines().nth(3).unwrap();
            assert_eq!(opt, format!("# {utok} S {ftok} R 50"));
            assert_eq!(file.unit_hz, uhz);
            assert_eq!(file.parameter, "S");
            assert_eq!(file.format, ftok);
            assert_eq!(file.r, 50.0);

            // Comment lines: each starts with '!', texts kept, line breaks split.
            assert_eq!(
                file.comments,
                [
                    "feedline demo export",
                    "site: invented rooftop mast",
                    "feeder: 18 m",
                    "end of sweep"
                ]
            );
            for l in text.lines().filter(|l| l.contains('!')) {
                assert!(l.starts_with('!'), "{l}");
            }

            // Data lines: one per point, frequency exact after the unit, numbers in the
            // documented decimal formats, values within the printed precision.
            let pts = points();
            assert_eq!(file.data.len(), pts.len());
            for (d, &(f, g)) in file.data.iter().zip(pts.iter()) {
                assert_eq!(d.hertz as f32, f, "frequency {}", d.tokens[0]);
                assert!(!d.tokens[0].contains(['e', 'E']));
                assert_eq!(decimals(&d.tokens[1]), d1, "{}", d.tokens[1]);
                assert_eq!(decimals(&d.tokens[2]), d2, "{}", d.tokens[2]);
                let want = Complex64::new(g.re as f64, g.im as f64);
                let e = (d.s11 - want).norm();
                if !(format == DataFormat::DecibelAngle && g.norm() == 0.0) {
                    worst = worst.max(e);
                    assert!(e < S11_BOUND, "{ftok}: {:?} vs {want}", d.s11);
                } else {
                    // A zero magnitude in DB reads as −100 dB.
                    assert_eq!(d.tokens[1], "-100.0000");
                }
            }
        }
    }
    println!("Touchstone round trip: worst |ΔS11| = {worst:.2e}");
}

#[test]
fn refuses_what_the_specification_forbids() {
    let mut w = TouchstoneWriter::new(
        String::new(),
        FrequencyUnit::MHz,
        DataFormat::RealImaginary,
        Ohms::new(75.0),
    )
    .unwrap();
    w.point(Hertz::new(10.0e6), Complex32::new(0.1, 0.2))
        .unwrap();
    assert_eq!(
        w.point(Hertz::new(10.0e6), Complex32::new(0.1, 0.2)),
        Err(TouchstoneError::NotIncreasing)
    );
    assert_eq!(
        w.point(Hertz::new(11.0e6), Complex32::new(f32::NAN, 0.2)),
        Err(TouchstoneError::NotFinite)
    );
    let text = w.finish().unwrap();
    let file = parse_one_port(&text).unwrap();
    assert_eq!(file.r, 75.0);
    assert_eq!(file.data.len(), 1);
    // An empty export is still a valid file: the option line alone.
    let w = TouchstoneWriter::new(
        String::new(),
        FrequencyUnit::GHz,
        DataFormat::MagnitudeAngle,
        Ohms::new(50.0),
    )
    .unwrap();
    let text = w.finish().unwrap();
    assert_eq!(text, "# GHZ S MA R 50\n");
}
