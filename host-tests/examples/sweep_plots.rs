//! Renders the README picture from the invented demo scenario and prints the same sweep as a
//! terminal chart with its fault list.
//!
//! `cargo run -p feedline-host-tests --example sweep_plots` writes
//! `host-tests/plots/example-sweep.svg`; give another path as the first argument to write
//! there instead.

use feedline::plot::{fault_table, VswrChart};
use feedline::reflection::{Gamma, Vswr};
use feedline::units::Hertz;
use feedline_host_tests::capture::demo_capture;
use feedline_host_tests::svg::{dtf_of, overview_svg};

fn main() {
    let capture = demo_capture();
    let path = std::env::args()
        .nth(1)
        .unwrap_or_else(|| concat!(env!("CARGO_MANIFEST_DIR"), "/plots/example-sweep.svg").into());
    std::fs::write(&path, overview_svg(&capture, 2.0, 30.0)).expect("write the SVG");
    println!("wrote {path}");

    let chart = VswrChart::new(48, Vswr::new(4.0).unwrap(), Vswr::new(2.0).ok());
    let mut out = String::new();
    chart.header(&mut out).unwrap();
    for (f, g) in capture.points.iter().step_by(8) {
        let v = Gamma::saturating(g.norm() as f32).vswr();
        chart.row(&mut out, Hertz::new(*f as f32), v, None).unwrap();
    }
    let (_, faults, _) = dtf_of(&capture, 30.0);
    fault_table(&mut out, &faults).unwrap();
    print!("{out}");
}
