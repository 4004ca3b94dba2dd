//! The emulated Cortex-M0 monitor (boards/emu-monitor on QEMU `microbit`) checked against the
//! independent f64 model in `feedline_host_tests::reference::monitor`.
//!
//! Each test builds the firmware once (separate target dir, so cargo's build lock is not held
//! by this test's own cargo), runs it with a scenario on the semihosting command line, parses
//! its UART lines and compares alarm events, protection-pin changes, pin-write failures and
//! reports with the model. The figures the model computes are the textbook relations
//! VSWR = (1+|Γ|)/(1−|Γ|), RL = 10·log10(P_fwd/P_ref) in f64.
//!
//! A missing `qemu-system-arm` fails these tests (install it with `cargo verify`).

use feedline::report::{MonitorFlags, MonitorRecord, Record};
use feedline_host_tests::qemu::{self, Machine};
use feedline_host_tests::reference::monitor::{figures, simulate, Event, Report, Run, Scenario};
use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::OnceLock;
use std::time::Duration;

/// Largest relative VSWR error allowed, chain against the f64 model: the fixed chain's
/// stated bound.
const VSWR_REL_TOL: f64 = feedline::fixed::VSWR_BOUND_REL as f64;
/// Largest return-loss error allowed in a report, dB: the fixed chain's stated bound.
const RL_TOL_DB: f64 = feedline::fixed::RL_BOUND_DB as f64;
/// Averaged powers are floored to whole µW.
const POWER_TOL_UW: f64 = 1.0;
/// A scenario's VSWRs must stay this far (relative) from the thresholds for its alarm timing
/// to be decided by the scenario rather than by rounding.
const MIN_MARGIN: f64 = 5e-3;
/// Wall-clock limit for one QEMU run.
const RUN_TIMEOUT: Duration = Duration::from_secs(30);

/// The chain's VSWR error is within bounds: the fixed chain's relative bound up to VSWR 20,
/// and, above, the |Γ| that the VSWR implies within `feedline::monitor::GAMMA_BOUND`.
fn vswr_within_bound(got: f64, want: f64) -> bool {
    if want <= 20.0 {
        ((got - want) / want).abs() <= VSWR_REL_TOL
    } else {
        let g = |v: f64| (v - 1.0) / (v + 1.0);
        (g(got) - g(want)).abs() <= f64::from(feedline::monitor::GAMMA_BOUND)
    }
}

fn workspace() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("workspace root")
        .to_path_buf()
}

fn firmware() -> &'static Path {
    static FW: OnceLock<PathBuf> = OnceLock::new();
    FW.get_or_init(|| {
        let root = workspace();
        let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".into());
        let st = Command::new(cargo)
            .current_dir(&root)
            .args([
                "build",
                "--release",
                "-q",
                "-p",
                "emu-monitor",
                "--target",
                "thumbv6m-none-eabi",
                "--target-dir",
                "target/fw",
            ])
            .status()
            .expect("run cargo build for emu-monitor");
        assert!(st.success(), "building emu-monitor failed");
        root.join("target/fw/thumbv6m-none-eabi/release/emu-monitor")
    })
}

/// Runs the firmware with `args`; returns (exit code, stdout).
fn qemu(args: &[String]) -> (i32, String) {
    qemu::run(
        Machine::Microbit,
        firmware(),
        "emu-monitor",
        args,
        RUN_TIMEOUT,
    )
}

type Fields = Vec<(String, String)>;

/// What the firmware printed.
#[derive(Debug, Default)]
struct Parsed {
    events: Vec<(u32, String, Option<u64>)>,
    pins: Vec<(u32, bool)>,
    pin_failures: Vec<u32>,
    reports: Vec<Fields>,
    records: Vec<MonitorRecord>,
    end: Option<(u32, u32, u32)>,
}

fn fields(line: &str) -> Fields {
    line.split_whitespace()
        .filter_map(|w| {
            w.split_once('=')
                .map(|(k, v)| (k.to_string(), v.to_string()))
        })
        .collect()
}

fn get<'a>(f: &'a [(String, String)], k: &str) -> &'a str {
    f.iter()
        .find(|(a, _)| a == k)
        .map(|(_, v)| v.as_str())
        .unwrap_or_else(|| panic!("field {k} missing in {f:?}"))
}

fn num(f: &[(String, String)], k: &str) -> u64 {
    get(f, k)
        .parse()
        .unwrap_or_else(|_| panic!("field {k} not a number in {f:?}"))
}

fn seq(f: &[(String, String)]) -> u32 {
    u32::try_from(num(f, "seq")).expect("seq fits u32")
}

fn parse(out: &str) -> Parsed {
    let mut p = Parsed::default();
    for line in out.lines() {
        let line = line.trim_end_matches('\r');
        let f = fields(line);
        let mut words = line.split_whitespace();
        match words.next() {
            Some("evt") => {
                let kind = words.nth(1).expect("event kind").to_string();
                let v = f
                    .iter()
                    .find(|(k, _)| k == "vswr_q16")
                    .map(|(_, v)| v.parse().expect("vswr"));
                p.events.push((seq(&f), kind, v));
            }
            Some("pin") => p.pins.push((seq(&f), get(&f, "level") == "permit")),
            Some("pinfail") => p.pin_failures.push(seq(&f)),
            Some("rep") => p.reports.push(f),
            Some("fl.mon") => match feedline::report::line::parse_line(line) {
                Ok(Record::Monitor(m)) => p.records.push(m),
                other => panic!("logger record {line:?} does not parse: {other:?}"),
            },
            Some("end") => {
                let t = u32::try_from(num(&f, "trips")).expect("trips");
                let c = u32::try_from(num(&f, "clears")).expect("clears");
                p.end = Some((seq(&f), t, c));
            }
            _ => {}
        }
    }
    p
}

const Q16: f64 = 65536.0;

fn check_report(got: &[(String, String)], want: &Report, worst: &mut (f64, f64)) {
    let ctx = format!("report {got:?} vs model {want:?}");
    assert_eq!(seq(got), want.seq, "{ctx}");
    let fwd = num(got, "fwd_uw") as f64;
    let rf = num(got, "ref_uw") as f64;
    let floored = |g: f64, w: f64| g <= w + 1e-6 && w - g < POWER_TOL_UW;
    assert!(floored(fwd, want.forward_uw), "forward: {ctx}");
    assert!(floored(rf, want.reflected_uw), "reflected: {ctx}");
    let del = num(got, "del_uw") as f64;
    let want_del = (want.forward_uw - want.reflected_uw).max(0.0);
    assert!(
        (del - want_del).abs() <= 2.0 * POWER_TOL_UW,
        "delivered: {ctx}"
    );
    assert_eq!(get(got, "tx") == "1", want.transmitting, "tx: {ctx}");
    // The firmware's figures are of the floored means: compare with the model at the exact
    // means, or at the floored means where the flooring itself moves the figure.
    let (v_floor, rl_floor) = figures(fwd, rf);
    let v = num(got, "vswr_q16") as f64 / Q16;
    let rl = num(got, "rl_q16") as f64 / Q16;
    let ev = ((v - want.vswr) / want.vswr)
        .abs()
        .min(((v - v_floor) / v_floor).abs());
    let erl = (rl - want.return_loss_db).abs().min((rl - rl_floor).abs());
    worst.0 = worst.0.max(ev);
    worst.1 = worst.1.max(erl);
    assert!(
        vswr_within_bound(v, want.vswr) || vswr_within_bound(v, v_floor),
        "vswr {v} vs {}: {ctx}",
        want.vswr
    );
    assert!(
        erl <= RL_TOL_DB,
        "rl {rl} vs {}: {ctx}",
        want.return_loss_db
    );
    assert_eq!(
        num(got, "pk_fwd_uw") as f64,
        want.peak_forward_uw,
        "peak forward: {ctx}"
    );
    match (get(got, "pk_vswr_q16"), want.peak_vswr) {
        ("-", None) => {}
        (s, Some(pv)) => {
            let g = s.parse::<f64>().expect("peak vswr") / Q16;
            let e = ((g - pv) / pv).abs();
            worst.0 = worst.0.max(e);
            assert!(vswr_within_bound(g, pv), "peak vswr {g} vs {pv}: {ctx}");
        }
        (s, None) => panic!("peak vswr {s} where the model has none: {ctx}"),
    }
    assert_eq!(get(got, "alarm") == "tripped", want.tripped, "alarm: {ctx}");
    assert_eq!(
        num(got, "pin_err") as u32,
        want.pin_errors,
        "pin errors: {ctx}"
    );
}

/// The logger record (`feedline::report` line, CRC checked by `parse_line`) that follows a
/// report carries the same values in its own units.
fn check_record(n: u32, got: &MonitorRecord, want: &Report) {
    let ctx = format!("record {got:?} vs model {want:?}");
    assert_eq!(got.seq, n, "{ctx}");
    assert_eq!(u64::from(got.time_ms), u64::from(want.seq) * 10, "{ctx}");
    let mw = |uw: f64| (uw.floor() / 1000.0).floor();
    let near = |g: u32, w: f64| (f64::from(g) - mw(w)).abs() <= 1.0;
    assert!(near(got.forward_mw, want.forward_uw), "forward: {ctx}");
    assert!(
        near(got.reflected_mw, want.reflected_uw),
        "reflected: {ctx}"
    );
    let del = (want.forward_uw - want.reflected_uw).max(0.0);
    assert!(near(got.delivered_mw, del), "delivered: {ctx}");
    // VSWR in thousandths and RL in hundredths of a dB: the chain's bound plus half a step.
    let v = f64::from(got.vswr_milli) / 1000.0;
    let v_ok = vswr_within_bound(v, want.vswr)
        || (v - want.vswr.min(1000.0)).abs() <= 0.0005 + want.vswr * VSWR_REL_TOL;
    assert!(v_ok, "vswr: {ctx}");
    let rl = f64::from(got.return_loss_cdb) / 100.0;
    assert!(
        (rl - want.return_loss_db).abs() <= 0.005 + RL_TOL_DB,
        "rl: {ctx}"
    );
    assert_eq!(
        got.flags.contains(MonitorFlags::ALARM),
        want.tripped,
        "A flag: {ctx}"
    );
    assert_eq!(
        got.flags.contains(MonitorFlags::TRIP),
        want.inhibited,
        "T flag: {ctx}"
    );
    assert_eq!(
        got.flags.contains(MonitorFlags::UNDER),
        !want.transmitting,
        "U flag: {ctx}"
    );
}

fn kind(e: &Event) -> &'static str {
    match e {
        Event::Trip(_) => "trip",
        Event::Clear => "clear",
        Event::Reset => "reset",
    }
}

/// Runs a scenario on the emulated board and in the model, and compares everything.
fn check(name: &str, s: &Scenario) -> Run {
    let model = simulate(s);
    assert!(
        model.margin > MIN_MARGIN,
        "{name}: scenario sits within {:.2e} of a threshold; choose other values",
        model.margin
    );
    let (code, out) = qemu(&s.args());
    assert_eq!(code, 0, "{name}: firmware exit status, output:\n{out}");
    let p = parse(&out);
    let want_events: Vec<(u32, &str)> = model.events.iter().map(|(q, e)| (*q, kind(e))).collect();
    let got_events: Vec<(u32, &str)> = p.events.iter().map(|(q, k, _)| (*q, k.as_str())).collect();
    assert_eq!(got_events, want_events, "{name}: alarm events\n{out}");
    let mut worst = (0.0f64, 0.0f64);
    for ((_, _, gv), (_, e)) in p.events.iter().zip(&model.events) {
        if let (Some(g), Event::Trip(v)) = (gv, e) {
            let g = *g as f64 / Q16;
            let err = ((g - v) / v).abs();
            worst.0 = worst.0.max(err);
            assert!(vswr_within_bound(g, *v), "{name}: trip VSWR {g} vs {v}");
        }
    }
    assert_eq!(p.pins, model.pins, "{name}: protection pin changes");
    assert_eq!(
        p.pin_failures, model.pin_failures,
        "{name}: failed pin writes"
    );
    assert_eq!(p.reports.len(), model.reports.len(), "{name}: report count");
    for (g, w) in p.reports.iter().zip(&model.reports) {
        check_report(g, w, &mut worst);
    }
    assert_eq!(
        p.records.len(),
        model.reports.len(),
        "{name}: logger record count"
    );
    for (i, (g, w)) in p.records.iter().zip(&model.reports).enumerate() {
        check_record(i as u32 + 1, g, w);
    }
    let trips = model
        .events
        .iter()
        .filter(|e| matches!(e.1, Event::Trip(_)))
        .count() as u32;
    let clears = model.events.len() as u32 - trips;
    assert_eq!(p.end, Some((s.readings, trips, clears)), "{name}: end line");
    println!(
        "{name}: {} readings, {} events, {} reports; worst error: VSWR {:.2e} relative, RL {:.4} dB; threshold margin {:.2e}",
        s.readings,
        model.events.len(),
        model.reports.len(),
        worst.0,
        worst.1,
        model.margin
    );
    model
}

fn trip_at(r: &Run) -> Vec<u32> {
    r.events
        .iter()
        .filter(|e| matches!(e.1, Event::Trip(_)))
        .map(|e| e.0)
        .collect()
}

/// The documented `antenna-fault` preset: 50 W, 100 W from reading 60, |Γ|² 0.4 % then 25 %
/// (VSWR 3) from reading 180; trip 2.0 / clear 1.5, hold-off 3, clear-count 5, average 8,
/// report every 25, gate 1 W.
fn antenna_fault() -> Scenario {
    let mut s = Scenario::new(300);
    s.power = vec![(1, 50_000), (60, 100_000)];
    s.refl = vec![(1, 4_000), (180, 250_000)];
    s
}

#[test]
fn preset_antenna_fault_as_documented() {
    // The preset alone, with no overrides, behaves as its documentation (restated above).
    let model = simulate(&antenna_fault());
    let (code, out) = qemu(&["--scenario".into(), "antenna-fault".into()]);
    assert_eq!(code, 0, "{out}");
    let p = parse(&out);
    let got: Vec<u32> = p.events.iter().map(|e| e.0).collect();
    assert_eq!(got, trip_at(&model));
    assert_eq!(
        got,
        vec![182],
        "hand count: fault at 180, hold-off 3 → trip at 182"
    );
    assert_eq!(p.pins, model.pins);
    assert_eq!(p.reports.len(), 12);
}

#[test]
fn antenna_fault_with_power_steps() {
    let r = check("antenna-fault", &antenna_fault());
    assert_eq!(r.events.len(), 1);
}

#[test]
fn fault_clears_with_hysteresis() {
    // Fault at VSWR 3, then half repaired to a VSWR inside the hysteresis band (stays tripped),
    // then to a good match (clears after clear-count readings).
    let mut s = Scenario::new(200);
    s.power = vec![(1, 5_000), (40, 15_000), (120, 8_000)];
    s.refl = vec![(1, 2_000), (50, 250_000), (80, 50_000), (130, 1_000)];
    s.clear = 1.3; // |Γ|² 5 % is VSWR 1.58: inside the band (1.3, 2.0)
    s.clear_count = 7;
    s.averaging = 5;
    s.report_every = 20;
    let r = check("hysteresis", &s);
    let got: Vec<(u32, &str)> = r.events.iter().map(|(q, e)| (*q, kind(e))).collect();
    assert_eq!(
        got,
        vec![(52, "trip"), (136, "clear")],
        "hand count: trip 50+2, clear 130+6"
    );
}

#[test]
fn arcing_shorter_than_hold_off_is_ignored() {
    let mut s = Scenario::new(260);
    s.preset = "arcing";
    s.power = vec![(1, 80_000)];
    s.refl = vec![(1, 10_000), (200, 300_000), (210, 10_000)];
    s.spike = Some((20, 30, 2, 400_000));
    s.hold_off = 4;
    s.report_every = 30;
    let r = check("arcing", &s);
    assert_eq!(
        trip_at(&r),
        vec![203],
        "only the sustained arc trips (hand count 200+3)"
    );
}

#[test]
fn retry_with_transmitter_shut_down() {
    let mut s = Scenario::new(160);
    s.preset = "retry";
    s.power = vec![(1, 20_000)];
    s.refl = vec![(1, 2_000), (100, 500_000)];
    s.feedback = true;
    s.report_every = 16;
    let r = check("retry", &s);
    // Trip at 102; the transmitter stops, 5 idle readings clear it at 107; it restarts at 108
    // and trips again at 110: a cycle of 8 (hand count).
    assert_eq!(trip_at(&r), (0..8).map(|k| 102 + 8 * k).collect::<Vec<_>>());
}

#[test]
fn latched_until_reset_and_pin_failures() {
    let mut s = Scenario::new(260);
    s.preset = "latched";
    s.power = vec![(1, 10_000)];
    s.refl = vec![(1, 1_000), (80, 200_000), (150, 1_000)];
    s.latched = true;
    s.reset_at = Some(220);
    s.pin_fail = Some((70, 90));
    s.report_every = 10;
    let r = check("latched", &s);
    // Trip at 82 while pin writes fail: the alarm holds and the pin reaches inhibit at 91,
    // the first good write; the latch holds until the reset at 220.
    assert_eq!(trip_at(&r), vec![82]);
    assert_eq!(r.pins, vec![(1, true), (91, false), (220, true)]);
    assert_eq!(r.pin_failures.len(), 21);
}

#[test]
fn keyed_transmitter_and_idle_gate() {
    // Keyed 12 on, 9 off; the fault only shows while keyed; idle readings count to clear.
    let mut s = Scenario::new(210);
    s.power = vec![(1, 3_000)];
    s.refl = vec![(1, 5_000), (60, 160_000), (150, 5_000)];
    s.key = Some((12, 9));
    s.gate_mw = 500;
    s.averaging = 16;
    s.report_every = 21;
    s.trip = 2.2;
    s.clear = 1.8;
    s.clear_count = 4;
    let r = check("keyed", &s);
    assert!(
        trip_at(&r).len() >= 3,
        "trips on each keyed burst of the fault"
    );
}

/// Scenarios the firmware was not built around: settings and lines drawn from a fixed-seed
/// generator (xorshift32), each checked against the model.
#[test]
fn generated_scenarios() {
    let mut x: u32 = 0x9E37_79B9;
    let mut rnd = |n: u32| {
        x ^= x << 13;
        x ^= x >> 17;
        x ^= x << 5;
        x % n
    };
    let mut ran = 0;
    let mut tries = 0;
    let mut events = 0;
    while ran < 8 && tries < 200 {
        tries += 1;
        let mut s = Scenario::new(80 + rnd(200));
        s.power = (0..1 + rnd(4))
            .map(|i| (1 + i * rnd(60), 100 + rnd(400_000)))
            .collect();
        s.refl = (0..1 + rnd(5))
            .map(|i| (1 + i * rnd(50), rnd(600_000)))
            .collect();
        if rnd(2) == 0 {
            s.spike = Some((1 + rnd(40), 5 + rnd(30), 1 + rnd(5), rnd(900_000)));
        }
        if rnd(3) == 0 {
            s.key = Some((1 + rnd(20), rnd(10)));
        }
        s.feedback = rnd(3) == 0;
        s.latched = rnd(4) == 0;
        if s.latched || rnd(3) == 0 {
            s.reset_at = Some(1 + rnd(s.readings));
        }
        if rnd(4) == 0 {
            let a = 1 + rnd(s.readings);
            s.pin_fail = Some((a, a + rnd(20)));
        }
        s.clear = 1.1 + f64::from(rnd(80)) / 100.0;
        s.trip = s.clear + 0.1 + f64::from(rnd(200)) / 100.0;
        s.hold_off = 1 + rnd(6);
        s.clear_count = 1 + rnd(10);
        s.gate_mw = rnd(2000);
        s.averaging = 1 + rnd(32);
        s.report_every = rnd(40);
        if simulate(&s).margin <= MIN_MARGIN {
            continue; // too close to a threshold to be decided by the scenario
        }
        events += check(&format!("generated #{ran}"), &s).events.len();
        ran += 1;
    }
    assert_eq!(ran, 8, "the generator must yield 8 decidable scenarios");
    assert!(
        events > 0,
        "the generated scenarios must exercise the alarm"
    );
}

#[test]
fn bad_command_line_is_refused() {
    let (code, out) = qemu(&["--no-such-option".into()]);
    assert_eq!(code, 2, "{out}");
    assert!(out.contains("error args"), "{out}");
    let args: Vec<String> = ["--trip", "1.4", "--clear", "1.6"].map(String::from).into();
    let (code, out) = qemu(&args);
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("error config"), "{out}");
}
