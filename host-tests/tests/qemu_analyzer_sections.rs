//! QEMU in the loop for the emulated analyzer's line, calibration and sweep sections
//! (boards/emu-analyzer: `--sections line`, `cal`, `sweep`), checked against the independent
//! f64 model (`feedline_host_tests::reference::{line, emu_vector, calibration, series_rlc,
//! line_faults}`, which never call feedline):
//!
//! * line: the printed fit, matched loss, SWR at the antenna and total loss recomputed in f64
//!   from the invented datasheet and the printed SWR at the analyzer (telegrapher's-equation
//!   relations and the handbook total-loss expression, see reference/line.rs), and the true
//!   SWR at the antenna inside the printed range;
//! * calibration: the solved terms against the simulated bridge's, the corrected impedance at
//!   the port against the f64 model's, the de-embedded one against the scenario's true load,
//!   each within a first-order bound of the I/Q converter's code error propagated through the
//!   f64 three-term solution (Agilent AN 1287-3 model); the uncorrected one visibly off;
//! * sweep: lowest VSWR and its frequency, the VSWR-2 band edges and the antenna resonance
//!   against the f64 model found by dense search and bisection; the distance-to-fault list
//!   (the connector within one resolution and 1 dB, the issue's bounds); the Touchstone block
//!   re-read by the reader written from the Touchstone 1.1 specification.
//!
//! Every test fails (does not skip) when qemu-system-arm is missing.

use feedline_host_tests::qemu::{self, Machine};
use feedline_host_tests::reference::calibration as cal;
use feedline_host_tests::reference::emu_vector::{self as ev, SweepScenario};
use feedline_host_tests::reference::line as rl;
use feedline_host_tests::reference::series_rlc::SeriesRlc;
use feedline_host_tests::reference::touchstone_spec::parse_one_port;
use num_complex::Complex64;
use std::collections::HashMap;
use std::path::PathBuf;
use std::process::{Command, Stdio};
use std::sync::OnceLock;
use std::time::Duration;

/// Wall-clock limit of one QEMU run.
const RUN_TIMEOUT: Duration = Duration::from_secs(30);
/// Codes per unit of Γ of the simulated I/Q converter (its documented scale).
const IQ_SCALE: f64 = 16384.0;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("host-tests lives in the workspace root")
        .to_path_buf()
}

/// Builds the firmware once; returns the ELF path. Panics (fails the test) without QEMU.
fn firmware() -> &'static PathBuf {
    static FW: OnceLock<PathBuf> = OnceLock::new();
    FW.get_or_init(|| {
        let qemu = Command::new("qemu-system-arm")
            .arg("--version")
            .stdout(Stdio::null())
            .stderr(Stdio::null())
            .status();
        assert!(
            matches!(qemu, Ok(s) if s.success()),
            "qemu-system-arm is not installed: run `cargo verify` (it installs it), or \
             `apt-get update && apt-get install -y qemu-system-arm`"
        );
        let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".into());
        let status = Command::new(cargo)
            .current_dir(root())
            .args([
                "build",
                "--release",
                "-q",
                "-p",
                "emu-analyzer",
                "--target",
                "thumbv7em-none-eabihf",
                "--target-dir",
                "target/fw",
            ])
            .status()
            .expect("run cargo to build the firmware");
        assert!(status.success(), "building emu-analyzer failed");
        root().join("target/fw/thumbv7em-none-eabihf/release/emu-analyzer")
    })
}

/// Runs the firmware with `args` on its semihosting command line; (exit code, UART text).
fn run(args: &[&str]) -> (i32, String) {
    qemu::run(
        Machine::Mps2An386,
        firmware(),
        "emu-analyzer",
        args,
        RUN_TIMEOUT,
    )
}

/// Runs and requires a complete report.
fn report(args: &[&str]) -> String {
    let (code, text) = run(args);
    assert_eq!(code, 0, "{args:?}: exit {code}\n{text}");
    assert!(
        text.contains("end of report"),
        "{args:?}: incomplete\n{text}"
    );
    text
}

fn numbers(line: &str) -> Vec<f64> {
    line.split_whitespace()
        .filter_map(|t| {
            t.trim_matches(|c| c == '(' || c == ')' || c == ',')
                .parse::<f64>()
                .ok()
        })
        .collect()
}

fn section<'a>(report: &'a str, name: &str) -> Vec<&'a str> {
    let mut lines = report.lines();
    let head = format!("[{name}");
    lines
        .by_ref()
        .find(|l| l.starts_with(&head))
        .unwrap_or_else(|| panic!("no section {name} in:\n{report}"));
    lines.take_while(|l| !l.starts_with('[')).collect()
}

fn has_section(report: &str, name: &str) -> bool {
    let head = format!("[{name}");
    report.lines().any(|l| l.starts_with(&head))
}

fn fields<'a>(lines: &[&'a str], label: &str) -> Vec<&'a str> {
    lines
        .iter()
        .filter_map(|l| {
            l.trim_start()
                .strip_prefix(label)
                .filter(|rest| rest.starts_with(' '))
                .map(str::trim)
        })
        .collect()
}

fn need<'a>(lines: &[&'a str], label: &str) -> &'a str {
    fields(lines, label)
        .first()
        .copied()
        .unwrap_or_else(|| panic!("no `{label}` line in {lines:#?}"))
}

fn replay(report: &str) -> HashMap<String, String> {
    let sc = section(report, "scenario");
    let words: Vec<&str> = need(&sc, "replay with").split_whitespace().collect();
    words
        .chunks(2)
        .map(|kv| {
            (
                kv[0].trim_start_matches("--").to_string(),
                kv[1].to_string(),
            )
        })
        .collect()
}

/// A value as the firmware holds it (f32), widened to f64.
fn v(m: &HashMap<String, String>, k: &str) -> f64 {
    m.get(k)
        .unwrap_or_else(|| panic!("replay lacks --{k}"))
        .parse::<f32>()
        .unwrap_or_else(|_| panic!("--{k} is not a number")) as f64
}

/// The cable's (k1, k2) fit in f64: a named datasheet, or a flat loss as pure k1·√f.
fn fit(m: &HashMap<String, String>) -> (f64, f64) {
    match m.get("cable") {
        Some(name) => ev::cable_fit(name).expect("known cable"),
        None => (v(m, "cable-db100") / 100.0 / v(m, "freq-mhz").sqrt(), 0.0),
    }
}

/// The scenario's load (R + jX), `None` for open or short.
fn load(m: &HashMap<String, String>) -> Option<Complex64> {
    match m.get("load").map(String::as_str) {
        Some(_) => None,
        None => Some(Complex64::new(v(m, "load-r"), v(m, "load-x"))),
    }
}

fn worst(label: &str, e: f64, tol: f64, ctx: &str) {
    println!("{ctx}: {label} off by {e:.3e} (bound {tol:.1e})");
    assert!(e <= tol, "{ctx}: {label} off by {e} > {tol}");
}

// ---------------------------------------------------------------- line

/// Printed 4 decimals of dB, 5 of SWR, plus f32 against f64 in the fit (relative 1e-5).
const LINE_DB_TOL: f64 = 2e-4;
const LINE_SWR_REL: f64 = 5e-5;

fn check_line(args: &[&str]) {
    let text = report(args);
    let ctx = format!("{args:?}");
    let m = replay(&text);
    let lines = section(&text, "line model");
    let (k1, k2) = fit(&m);
    let f_mhz = v(&m, "freq-mhz");
    let len = v(&m, "cable-m");
    let printed_fit = numbers(need(&lines, "fit"));
    worst(
        "k1 (relative)",
        (printed_fit[0] / k1 - 1.0).abs(),
        1e-4,
        &ctx,
    );
    if k2 > 0.0 {
        worst(
            "k2 (relative)",
            (printed_fit[1] / k2 - 1.0).abs(),
            2e-3,
            &ctx,
        );
    }
    let ml = ev::alpha_db_per_m((k1, k2), f_mhz) * len;
    let p_ml = numbers(need(&lines, "matched loss"))[0];
    worst("matched loss (dB)", (p_ml - ml).abs(), LINE_DB_TOL, &ctx);
    // The SWR at the analyzer is the [reading] section's.
    let reading = numbers(need(&section(&text, "reading"), "VSWR"));
    let at_an = numbers(need(&lines, "SWR analyzer"));
    for (a, b) in at_an.iter().zip(&reading) {
        assert!(
            (a - b).abs() < 1e-9,
            "{ctx}: SWR analyzer {a} vs reading {b}"
        );
    }
    let at_ant = numbers(need(&lines, "SWR antenna"));
    let total = numbers(need(&lines, "total loss"));
    // The SWR at the analyzer is printed to 5 decimals: its rounding (5e-6), carried to the
    // antenna end, widens the bounds (a long lossy line magnifies it).
    let load_side = |s: f64| {
        let gl = rl::gamma_at_load(rl::gamma_from_vswr(s), ml).min(1.0);
        let s_l = if gl >= 1.0 {
            1000.0
        } else {
            rl::vswr(gl).min(1000.0)
        };
        (gl, s_l, rl::total_loss(ml, gl))
    };
    for k in 0..3 {
        let (gl, s_l, t) = load_side(at_an[k]);
        let (_, s_hi, t_hi) = load_side(at_an[k] + 5e-6);
        let (_, s_lo, t_lo) = load_side((at_an[k] - 5e-6).max(1.0));
        let spread = (s_hi - s_l).abs().max((s_l - s_lo).abs()) / s_l;
        worst(
            "SWR at the antenna (relative)",
            (at_ant[k] - s_l).abs() / s_l,
            LINE_SWR_REL + spread,
            &ctx,
        );
        if gl < 0.99 {
            let spread = (t_hi - t).abs().max((t - t_lo).abs());
            worst(
                "total loss (dB)",
                (total[k] - t).abs(),
                LINE_DB_TOL + spread,
                &ctx,
            );
        }
    }
    // The truth at the antenna inside the printed range (1 % for the ADC's code error). Only
    // for lines under 6 dB: the code error is magnified 10^(ML/10) times in |Γ| at the load,
    // and beyond that it, not the directivity, sets the range (qemu_analyzer.rs checks the
    // reading's own range at the analyzer for every scenario).
    if let (Some(z), true) = (load(&m), ml < 6.0) {
        let z0 = v(&m, "z0");
        let g = ((z - z0) / (z + z0)).norm();
        let s_true = rl::vswr(g);
        assert!(
            s_true >= at_ant[1] * 0.99 && s_true <= at_ant[2] * 1.01,
            "{ctx}: true SWR at the antenna {s_true} outside {at_ant:?}"
        );
    }
}

#[test]
fn line_section_matches_the_f64_model() {
    check_line(&["--sections", "reading+line"]);
    check_line(&[
        "--sections",
        "reading+line",
        "--cable",
        "foam-10mm",
        "--cable-m",
        "42",
        "--freq-mhz",
        "435",
        "--load-r",
        "80",
        "--load-x",
        "25",
    ]);
    check_line(&["--scenario", "attic-dipole", "--sections", "reading+line"]);
    check_line(&["--scenario", "long-thin-run", "--sections", "reading+line"]);
}

// ---------------------------------------------------------------- calibration

/// Solved terms against the simulated bridge's: about ten times the I/Q code error (1.9e-4
/// for the default noise) carried through the solution, plus 5 printed decimals.
const TERM_TOL: f64 = 2e-3;

struct CalCase {
    z0: f64,
    f: f64,
    bridge: ev::Bridge,
    /// Per-component bound of an averaged I/Q reading's code error, in Γ: the last rounding
    /// (0.5 LSB), each read's rounding (0.5 LSB) and the noise's hard bound 2·√3·rms.
    delta: f64,
}

impl CalCase {
    fn from(m: &HashMap<String, String>) -> Self {
        let pair = |a: &str, b: &str| (v(m, a), v(m, b));
        CalCase {
            z0: v(m, "z0"),
            f: v(m, "freq-mhz") * 1e6,
            bridge: ev::Bridge {
                e00: pair("e00-mag", "e00-deg"),
                e11: pair("e11-mag", "e11-deg"),
                track: pair("track-mag", "track-deg"),
            },
            delta: (1.0 + 2.0 * 3f64.sqrt() * v(m, "noise")) / IQ_SCALE,
        }
    }

    /// Corrected Γ of a device of true Γ `dut` with reading errors `e` (open, short, load,
    /// device).
    fn corrected(&self, dut: Complex64, e: [Complex64; 4]) -> Complex64 {
        let t = self.bridge.terms(self.f);
        let a = ev::standards(self.f, self.z0);
        let m = [0, 1, 2].map(|k| cal::distort(&t, a[k]) + e[k]);
        let solved = cal::solve(a, m).expect("standards determine the terms");
        cal::correct(&solved, cal::distort(&t, dut) + e[3])
    }

    /// First-order worst-case change of `h(corrected Γ)` over all reading errors ≤ delta.
    fn bound(&self, dut: Complex64, h: &dyn Fn(Complex64) -> Complex64) -> f64 {
        let zero = [Complex64::new(0.0, 0.0); 4];
        let base = h(self.corrected(dut, zero));
        let eps = 1e-7;
        let mut sum = 0.0;
        for k in 0..4 {
            for d in [Complex64::new(eps, 0.0), Complex64::new(0.0, eps)] {
                let mut e = zero;
                e[k] = d;
                sum += (h(self.corrected(dut, e)) - base).norm() / eps * self.delta;
            }
        }
        sum
    }
}

fn check_cal(args: &[&str]) {
    let text = report(args);
    let ctx = format!("{args:?}");
    let m = replay(&text);
    let c = CalCase::from(&m);
    let lines = section(&text, "calibration");
    let flash = need(&lines, "flash");
    assert!(flash.contains("reloaded: identical"), "{ctx}: {flash}");
    // A second save cut halfway: the store reports it and the first record comes back.
    let cut = need(&lines, "power cut");
    assert!(
        cut.contains("(save failed)") && cut.ends_with("loads: the previous calibration"),
        "{ctx}: {cut}"
    );
    let first = numbers(flash);
    let after = numbers(cut);
    assert_eq!(first.last(), after.get(1), "{ctx}: sequence after the cut");
    // Terms against the simulated bridge (printed 5 decimals, 3 of degree).
    let t = c.bridge.terms(c.f);
    for (label, truth) in [
        ("directivity", t.e00),
        ("source match", t.e11),
        ("tracking", t.tracking),
    ] {
        let n = numbers(need(&lines, label));
        let got = Complex64::from_polar(n[0], n[1].to_radians());
        worst(
            &format!("{label} term"),
            (got - truth).norm(),
            TERM_TOL,
            &ctx,
        );
        let sim = Complex64::from_polar(n[2], n[3].to_radians());
        worst(
            &format!("{label} as the firmware simulates it"),
            (sim - truth).norm(),
            2e-5,
            &ctx,
        );
    }
    let fit = fit(&m);
    let len = v(&m, "cable-m");
    let vf = v(&m, "vf");
    let Some(zl) = load(&m) else { return };
    let gl = (zl - c.z0) / (zl + c.z0);
    let g_port = ev::plain_line(fit, vf, len, gl).gamma(c.f);
    let z_of = |line: &str| {
        let n = numbers(line);
        Complex64::new(n[0], n[1])
    };
    let z0 = c.z0;
    // Corrected at the port.
    let z_port = ev::impedance(g_port, z0);
    let b_port = c.bound(g_port, &|g| ev::impedance(g, z0)) + 1e-3;
    let got = z_of(need(&lines, "corrected"));
    worst(
        "corrected Z at the port (ohm)",
        (got - z_port).norm(),
        b_port,
        &ctx,
    );
    // De-embedded: the scenario's load.
    let deembed = |g: Complex64| {
        let a = ev::alpha_db_per_m(fit, c.f * 1e-6) / rl::DB_PER_NP;
        let b = 2.0 * std::f64::consts::PI * c.f / (vf * rl::C0);
        ev::impedance(g * (2.0 * Complex64::new(a, b) * len).exp(), z0)
    };
    let b_load = c.bound(g_port, &deembed) + 1e-3;
    let got = z_of(need(&lines, "at the load"));
    worst(
        "de-embedded Z at the load (ohm)",
        (got - zl).norm(),
        b_load,
        &ctx,
    );
    // Uncorrected: visibly off.
    let raw = z_of(need(&lines, "uncorrected"));
    let off = (raw - z_port).norm();
    println!("{ctx}: uncorrected Z off by {off:.2} ohm");
    assert!(
        off > 2.0 && off > 20.0 * b_port,
        "{ctx}: uncorrected {raw} too close to {z_port}"
    );
}

#[test]
fn calibration_corrects_the_bridge() {
    check_cal(&["--sections", "cal"]);
    check_cal(&[
        "--sections",
        "cal",
        "--load-r",
        "120",
        "--load-x",
        "60",
        "--e00-mag",
        "0.2",
        "--e00-deg",
        "-150",
        "--track-mag",
        "0.6",
        "--noise",
        "2",
        "--avg",
        "64",
    ]);
    check_cal(&["--scenario", "attic-dipole", "--sections", "cal"]);
}

// ---------------------------------------------------------------- sweep

fn sweep_model(m: &HashMap<String, String>) -> SweepScenario {
    let (fm, cable_m) = (v(m, "fault-m"), v(m, "cable-m"));
    SweepScenario {
        z0: v(m, "z0"),
        fit: fit(m),
        vf: v(m, "vf"),
        cable_m,
        antenna: SeriesRlc::from_f0_q(v(m, "ant-f0-mhz") * 1e6, v(m, "ant-q"), v(m, "ant-r")),
        fault: (fm > 0.0 && fm < cable_m).then(|| (fm, v(m, "fault-rl"))),
    }
}

/// Touchstone values against the f64 model: the corrected reading's error (I/Q code error
/// through the correction, < 1e-3 for these terms) plus 6 printed decimals.
const S11_TOL: f64 = 1e-3;
/// Lowest VSWR: absolute, and its frequency as a fraction of the step.
const MIN_VSWR_TOL: f64 = 2e-3;
const MIN_FREQ_STEPS: f64 = 0.1;
/// Band edges and resonance, fraction of the step (linear interpolation between points).
const EDGE_STEPS: f64 = 0.05;

fn check_sweep(args: &[&str]) -> String {
    let text = report(args);
    let ctx = format!("{args:?}");
    let m = replay(&text);
    let sc = sweep_model(&m);
    let (start, stop) = (
        v(&m, "sweep-start-mhz") * 1e6,
        v(&m, "sweep-stop-mhz") * 1e6,
    );
    let n = m["points"].parse::<usize>().unwrap();
    let step = (stop - start) / (n - 1) as f64;
    let lines = section(&text, "sweep:");
    // Touchstone block, re-read from the specification.
    let block: Vec<&str> = text
        .lines()
        .skip_while(|l| !l.starts_with("----- begin touchstone"))
        .skip(1)
        .take_while(|l| !l.starts_with("----- end touchstone"))
        .collect();
    let ts = parse_one_port(&block.join("\n")).unwrap_or_else(|e| panic!("{ctx}: {e}"));
    assert_eq!(ts.option_lines, 1, "{ctx}");
    assert_eq!(
        (ts.unit_hz, ts.parameter.as_str(), ts.format.as_str()),
        (1e6, "S", "RI")
    );
    assert_eq!(ts.r, v(&m, "z0"), "{ctx}");
    assert!(ts.comments.len() >= 2 && ts.first_data_at > ts.option_line_at);
    assert_eq!(ts.data.len(), n, "{ctx}: data lines");
    let mut w_s = 0.0f64;
    for (k, d) in ts.data.iter().enumerate() {
        let f = start + k as f64 * step;
        assert!(
            (d.hertz - f).abs() < 1e-6 * f,
            "{ctx}: point {k} at {}",
            d.hertz
        );
        w_s = w_s.max((d.s11 - sc.gamma(d.hertz)).norm());
    }
    worst("Touchstone S11 against the model", w_s, S11_TOL, &ctx);
    // Lowest VSWR: dense search of the model, then golden refinement.
    let vs = |f: f64| ev::vswr(sc.gamma(f));
    let grid = ((stop - start) / 5e3) as usize;
    let (mut fb, mut sb) = (start, f64::INFINITY);
    for k in 0..=grid {
        let f = start + (stop - start) * k as f64 / grid as f64;
        if vs(f) < sb {
            (fb, sb) = (f, vs(f));
        }
    }
    let (mut a, mut b) = (fb - 5e3, fb + 5e3);
    for _ in 0..60 {
        let (c1, c2) = (b - 0.618 * (b - a), a + 0.618 * (b - a));
        if vs(c1) < vs(c2) {
            b = c2;
        } else {
            a = c1;
        }
    }
    let (f_min, s_min) = (0.5 * (a + b), vs(0.5 * (a + b)));
    let low = numbers(need(&lines, "lowest VSWR"));
    worst("lowest VSWR", (low[0] - s_min).abs(), MIN_VSWR_TOL, &ctx);
    worst(
        "frequency of the lowest VSWR (steps)",
        (low[1] * 1e6 - f_min).abs() / step,
        MIN_FREQ_STEPS,
        &ctx,
    );
    // Bands under VSWR 2: each printed edge is a model crossing nearby.
    for band in fields(&lines, "band VSWR<2") {
        if band == "none" {
            continue;
        }
        let e = numbers(band);
        for (edge, open) in [
            (e[0], e[0] * 1e6 <= start + 1.0),
            (e[1], e[1] * 1e6 >= stop - 1.0),
        ] {
            if open {
                continue;
            }
            let f = edge * 1e6;
            let t = ev::bisect(f - 2.0 * step, f + 2.0 * step, 1.0, |x| vs(x) - 2.0);
            worst(
                "VSWR-2 band edge (steps)",
                (f - t).abs() / step,
                EDGE_STEPS,
                &ctx,
            );
        }
        worst(
            "band width (Hz)",
            ((e[1] - e[0]) - e[2]).abs() * 1e6,
            300.0,
            &ctx,
        );
    }
    // Resonance of the de-embedded antenna: X = 0 of the model near each printed one.
    for r in fields(&lines, "resonance") {
        if r == "none" {
            continue;
        }
        let f = numbers(r)[0] * 1e6;
        let x = |ff: f64| ev::impedance(sc.deembedded(ff, sc.gamma(ff)), sc.z0).im;
        let t = ev::bisect(f - 2.0 * step, f + 2.0 * step, 1.0, x);
        worst("resonance (steps)", (f - t).abs() / step, EDGE_STEPS, &ctx);
    }
    text
}

#[test]
fn sweep_matches_the_f64_model() {
    let text = check_sweep(&["--sections", "sweep"]);
    // Distance to fault: the connector within one resolution and 1 dB (after loss
    // compensation), nothing before it.
    let m = replay(&text);
    let lines = section(&text, "distance to fault");
    let res = numbers(need(&lines, "resolution"))[0];
    let vf = v(&m, "vf");
    let span = (v(&m, "sweep-stop-mhz") - v(&m, "sweep-start-mhz")) * 1e6;
    worst(
        "resolution VF·c/(2·span) (m)",
        (res - vf * rl::C0 / (2.0 * span)).abs(),
        1e-3,
        "dtf",
    );
    let n = m["points"].parse::<f64>().unwrap();
    let range = numbers(need(&lines, "max range"))[0];
    worst(
        "max range (N − 1)·resolution (m)",
        (range - (n - 1.0) * res).abs(),
        0.05,
        "dtf",
    );
    let faults: Vec<Vec<f64>> = lines
        .iter()
        .skip_while(|l| !l.contains("distance m"))
        .skip(1)
        .map(|l| numbers(l))
        .filter(|n| n.len() == 3)
        .collect();
    let (fm, frl) = (v(&m, "fault-m"), v(&m, "fault-rl"));
    let first = faults.first().expect("a fault is listed");
    worst("connector distance (m)", (first[1] - fm).abs(), res, "dtf");
    worst(
        "connector return loss (dB)",
        (first[2] - frl).abs(),
        1.0,
        "dtf",
    );
    assert!(
        faults.iter().any(|f| f[1] > v(&m, "cable-m") - res),
        "the antenna at the cable's end is listed: {faults:?}"
    );
    // A second geometry: another cable, fault and antenna.
    check_sweep(&[
        "--sections",
        "sweep",
        "--cable",
        "foam-10mm",
        "--cable-m",
        "30",
        "--fault-m",
        "11",
        "--fault-rl",
        "28",
        "--ant-f0-mhz",
        "150",
        "--ant-q",
        "14",
        "--ant-r",
        "55",
        "--points",
        "201",
        "--noise",
        "1.5",
    ]);
}

#[test]
fn sections_select_what_runs() {
    let only_cal = report(&["--sections", "cal"]);
    assert!(has_section(&only_cal, "calibration"));
    for other in [
        "reading",
        "cable check",
        "line model",
        "sweep",
        "distance to fault",
    ] {
        assert!(
            !has_section(&only_cal, other),
            "{other} ran with --sections cal"
        );
    }
    let old = report(&["--sections", "reading+cable"]);
    assert!(has_section(&old, "reading") && has_section(&old, "cable check"));
    for other in [
        "line model",
        "calibration",
        "sweep",
        "touchstone",
        "distance to fault",
    ] {
        assert!(
            !has_section(&old, other),
            "{other} ran with --sections reading+cable"
        );
    }
    let (code, out) = run(&["--sections", "reading+bogus"]);
    assert_eq!(code, 2, "{out}");
    assert!(out.contains("not a valid value"), "{out}");
}
