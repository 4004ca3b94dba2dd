//! Renders the SVG plots of the demo capture into `target/plots/` (not tracked) after a round
//! trip through the capture text format, and checks the tracked README picture is what the
//! renderer makes now.

use feedline_host_tests::capture::{demo_capture, Capture};
use feedline_host_tests::svg::{
    dtf_of, dtf_svg, overview_svg, return_loss_svg, smith_svg, vswr_svg,
};
use std::path::PathBuf;

fn out_dir() -> PathBuf {
    let d = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../target/plots");
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn well_formed(svg: &str) {
    assert!(svg.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\""));
    assert!(svg.trim_end().ends_with("</svg>"));
    assert!(svg.contains("<polyline"));
    assert!(!svg.contains("NaN") && !svg.contains("inf"));
    // Every opened element is closed or self-closed: count tags.
    let opens = svg.matches("<g ").count() + svg.matches("<defs>").count();
    let closes = svg.matches("</g>").count() + svg.matches("</defs>").count();
    assert_eq!(opens, closes);
}

#[test]
fn renders_every_plot_from_a_captured_run() {
    let text = demo_capture().to_text();
    let dir = out_dir();
    std::fs::write(dir.join("demo-capture.txt"), &text).unwrap();
    let c = Capture::parse(&text).unwrap();
    assert_eq!(c.points.len(), 256);
    for (name, svg) in [
        ("vswr.svg", vswr_svg(&c, 2.0)),
        ("return-loss.svg", return_loss_svg(&c)),
        ("smith.svg", smith_svg(&c)),
        ("dtf.svg", dtf_svg(&c, 30.0)),
        ("overview.svg", overview_svg(&c, 2.0, 30.0)),
    ] {
        well_formed(&svg);
        std::fs::write(dir.join(name), svg).unwrap();
    }
    // The demo's wet connector (4.5 m, 22 dB) and the antenna at the end (12 m) show in the
    // fault list (the scenario is in `capture::demo_capture`).
    let (_, faults, res) = dtf_of(&c, 30.0);
    let near = |d: f32| {
        faults
            .iter()
            .any(|f| (f.distance.value() - d).abs() <= res as f32)
    };
    assert!(near(4.5) && near(12.0), "{faults:?}");
}

#[test]
fn tracked_readme_picture_is_current() {
    let tracked = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/plots/example-sweep.svg"
    ))
    .expect("host-tests/plots/example-sweep.svg");
    let fresh = overview_svg(&demo_capture(), 2.0, 30.0);
    assert!(
        tracked == fresh,
        "regenerate with: cargo run -p feedline-host-tests --example sweep_plots"
    );
}
