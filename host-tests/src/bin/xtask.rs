//! Developer tool behind the cargo aliases in `.cargo/config.toml`:
//!
//! * `cargo demo [OPTIONS]` — builds the emulated analyzer (boards/emu-analyzer) in release
//!   and runs it under QEMU on its default scenario; OPTIONS go to the scenario
//!   (e.g. `cargo demo --scenario open-spool --cable-m 25`, `cargo demo --list`).
//! * `cargo verify` — the whole suite, in order, failing fast with the step's name: fmt,
//!   clippy (host crates, then each board for its target), host tests with doctests, cross
//!   builds of the core for every target × feature set, release builds of every board,
//!   QEMU runs, and the benchmark smoke and panic proof when present. Each step's duration
//!   is printed.
//!
//! On a fresh machine both first set up what they need: the Rust targets (rustup), rustfmt
//! and clippy (verify only), and qemu-system-arm (apt-get when running as root; otherwise the
//! exact command to run is printed and the tool fails).
//!
//! Data-driven: the core's feature sets come from the root Cargo.toml `[features]`; the
//! boards are the crates under boards/ whose Cargo.toml has
//! `[package.metadata.feedline] target = "..."` (optional `features = [...]`).

use std::path::{Path, PathBuf};
use std::process::{Command, ExitCode, Stdio};
use std::time::{Duration, Instant};

/// The firmware targets the project builds for.
const TARGETS: [&str; 2] = ["thumbv6m-none-eabi", "thumbv7em-none-eabihf"];
/// Separate target directory for firmware (shared with the QEMU test, which builds there
/// so that it does not wait on the lock of the `cargo test` running it).
const FW_TARGET_DIR: &str = "target/fw";
/// Longest a demo run may take.
const DEMO_TIMEOUT: Duration = Duration::from_secs(60);

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("host-tests lives in the workspace root")
        .to_path_buf()
}

fn cargo() -> Command {
    let mut c = Command::new(std::env::var("CARGO").unwrap_or_else(|_| "cargo".into()));
    c.current_dir(root());
    c
}

/// A failed step or set-up: what failed, in words.
struct Failure(String);

type Step = Result<(), Failure>;

/// One verify step: its name and what runs it.
type NamedStep = (&'static str, fn() -> Step);

fn show(cmd: &Command) -> String {
    // The program's file name only: cargo's full toolchain path is noise.
    let program = Path::new(cmd.get_program());
    let mut s = program
        .file_name()
        .unwrap_or(program.as_os_str())
        .to_string_lossy()
        .into_owned();
    for a in cmd.get_args() {
        s.push(' ');
        s.push_str(&a.to_string_lossy());
    }
    s
}

/// Runs a command with inherited output; fails with its command line.
fn sh(mut cmd: Command) -> Step {
    println!("    $ {}", show(&cmd));
    match cmd.status() {
        Ok(s) if s.success() => Ok(()),
        Ok(s) => Err(Failure(format!("`{}` exited with {s}", show(&cmd)))),
        Err(e) => Err(Failure(format!("cannot run `{}`: {e}", show(&cmd)))),
    }
}

/// True when `cmd` runs and succeeds (output discarded).
fn quiet_ok(mut cmd: Command) -> bool {
    cmd.stdout(Stdio::null())
        .stderr(Stdio::null())
        .status()
        .is_ok_and(|s| s.success())
}

fn is_root() -> bool {
    Command::new("id")
        .arg("-u")
        .output()
        .is_ok_and(|o| String::from_utf8_lossy(&o.stdout).trim() == "0")
}

// ---------------------------------------------------------------- set-up

fn setup_targets() -> Step {
    let Ok(out) = Command::new("rustup")
        .args(["target", "list", "--installed"])
        .output()
    else {
        return Err(Failure(format!(
            "rustup not found; install the targets yourself: rustup target add {}",
            TARGETS.join(" ")
        )));
    };
    let installed = String::from_utf8_lossy(&out.stdout).into_owned();
    let missing: Vec<&str> = TARGETS
        .iter()
        .copied()
        .filter(|t| !installed.lines().any(|l| l.trim() == *t))
        .collect();
    if missing.is_empty() {
        return Ok(());
    }
    println!("setup: adding Rust targets {}", missing.join(" "));
    let mut c = Command::new("rustup");
    c.args(["target", "add"]).args(&missing);
    sh(c)
}

fn setup_components() -> Step {
    for (sub, component) in [("fmt", "rustfmt"), ("clippy", "clippy")] {
        let mut probe = cargo();
        probe.args([sub, "--version"]);
        if !quiet_ok(probe) {
            println!("setup: adding the {component} component");
            let mut c = Command::new("rustup");
            c.args(["component", "add", component]);
            sh(c)?;
        }
    }
    Ok(())
}

fn setup_qemu() -> Step {
    let mut probe = Command::new("qemu-system-arm");
    probe.arg("--version");
    if quiet_ok(probe) {
        return Ok(());
    }
    let install = "apt-get update && apt-get install -y qemu-system-arm";
    if !is_root() {
        return Err(Failure(format!(
            "qemu-system-arm is missing. Install it, then run again:\n    sudo sh -c '{install}'"
        )));
    }
    println!("setup: qemu-system-arm is missing; installing it with apt-get ({install})");
    let mut update = Command::new("apt-get");
    update
        .arg("update")
        .env("DEBIAN_FRONTEND", "noninteractive");
    sh(update)?;
    let mut get = Command::new("apt-get");
    get.args(["install", "-y", "qemu-system-arm"])
        .env("DEBIAN_FRONTEND", "noninteractive");
    sh(get)
}

// ---------------------------------------------------------------- manifests

fn read_toml(path: &Path) -> Result<toml::Table, Failure> {
    let text = std::fs::read_to_string(path)
        .map_err(|e| Failure(format!("read {}: {e}", path.display())))?;
    text.parse::<toml::Table>()
        .map_err(|e| Failure(format!("parse {}: {e}", path.display())))
}

/// Every subset of the core's optional features (the `default` entry excluded).
fn core_feature_sets() -> Result<Vec<Vec<String>>, Failure> {
    let manifest = read_toml(&root().join("Cargo.toml"))?;
    let names: Vec<String> = manifest
        .get("features")
        .and_then(|f| f.as_table())
        .map(|t| t.keys().filter(|k| *k != "default").cloned().collect())
        .unwrap_or_default();
    if names.len() > 6 {
        return Err(Failure(format!(
            "{} features would make {} combinations; trim the list in xtask",
            names.len(),
            1u32 << names.len()
        )));
    }
    Ok((0..1u32 << names.len())
        .map(|mask| {
            names
                .iter()
                .enumerate()
                .filter(|(i, _)| mask & (1 << i) != 0)
                .map(|(_, n)| n.clone())
                .collect()
        })
        .collect())
}

/// A firmware crate under boards/.
struct Board {
    name: String,
    target: String,
    features: Vec<String>,
}

fn boards() -> Result<Vec<Board>, Failure> {
    let dir = root().join("boards");
    let mut entries: Vec<PathBuf> = std::fs::read_dir(&dir)
        .map_err(|e| Failure(format!("read {}: {e}", dir.display())))?
        .filter_map(|e| e.ok().map(|e| e.path().join("Cargo.toml")))
        .filter(|p| p.is_file())
        .collect();
    entries.sort();
    let mut out = Vec::new();
    for path in entries {
        let m = read_toml(&path)?;
        let package = m.get("package").and_then(|p| p.as_table());
        let meta = package
            .and_then(|p| p.get("metadata"))
            .and_then(|m| m.get("feedline"));
        let Some(target) = meta.and_then(|f| f.get("target")).and_then(|t| t.as_str()) else {
            continue;
        };
        let name = package
            .and_then(|p| p.get("name"))
            .and_then(|n| n.as_str())
            .ok_or_else(|| Failure(format!("{}: no package name", path.display())))?;
        let features = meta
            .and_then(|f| f.get("features"))
            .and_then(|f| f.as_array())
            .map(|a| {
                a.iter()
                    .filter_map(|v| v.as_str().map(String::from))
                    .collect()
            })
            .unwrap_or_default();
        out.push(Board {
            name: name.to_string(),
            target: target.to_string(),
            features,
        });
    }
    Ok(out)
}

fn board_args(c: &mut Command, b: &Board) {
    c.args(["-p", &b.name, "--target", &b.target]);
    if !b.features.is_empty() {
        c.args(["--features", &b.features.join(",")]);
    }
}

fn has_alias(name: &str) -> bool {
    std::fs::read_to_string(root().join(".cargo/config.toml"))
        .ok()
        .and_then(|t| t.parse::<toml::Table>().ok())
        .and_then(|t| t.get("alias")?.get(name).map(|_| ()))
        .is_some()
}

// ---------------------------------------------------------------- verify

fn step_fmt() -> Step {
    let mut c = cargo();
    c.args(["fmt", "--all", "--", "--check"]);
    sh(c)
}

fn step_clippy_host() -> Step {
    let mut c = cargo();
    c.args(["clippy", "-q", "--all-targets", "--", "-D", "warnings"]);
    sh(c)
}

fn step_clippy_boards() -> Step {
    for b in boards()? {
        let mut c = cargo();
        c.args(["clippy", "-q"]);
        board_args(&mut c, &b);
        c.args(["--", "-D", "warnings"]);
        sh(c)?;
    }
    Ok(())
}

fn step_host_tests() -> Step {
    let mut c = cargo();
    c.arg("test");
    sh(c)
}

fn step_cross_core() -> Step {
    let sets = core_feature_sets()?;
    for target in TARGETS {
        for set in &sets {
            let mut c = cargo();
            c.args(["build", "-q", "-p", "feedline", "--target", target]);
            c.arg("--no-default-features");
            if !set.is_empty() {
                c.args(["--features", &set.join(",")]);
            }
            sh(c)?;
        }
    }
    Ok(())
}

fn step_board_builds() -> Step {
    for b in boards()? {
        let mut c = cargo();
        c.args(["build", "-q", "--release", "--target-dir", FW_TARGET_DIR]);
        board_args(&mut c, &b);
        sh(c)?;
    }
    Ok(())
}

fn step_qemu() -> Step {
    let mut c = cargo();
    c.args([
        "test",
        "-q",
        "-p",
        "feedline-host-tests",
        "--test",
        "qemu_analyzer",
        "--test",
        "qemu_analyzer_sections",
        "--",
        "--nocapture",
    ]);
    sh(c)
}

/// The instruction-count benchmark's quick smoke (branch `bench`), when its alias exists.
fn step_bench_smoke() -> Step {
    if !has_alias("bench-fw") {
        println!("    (no `bench-fw` alias in .cargo/config.toml yet: skipped)");
        return Ok(());
    }
    let mut c = cargo();
    c.args(["bench-fw", "--quick"]);
    sh(c)
}

/// The link-time panic proof (boards/panic-proof), when present: its release link fails
/// with an undefined symbol if any panic path is reachable.
fn step_panic_proof() -> Step {
    let Some(b) = boards()?.into_iter().find(|b| b.name == "panic-proof") else {
        println!("    (no boards/panic-proof yet: skipped)");
        return Ok(());
    };
    let mut c = cargo();
    c.args(["build", "--release", "--target-dir", FW_TARGET_DIR]);
    board_args(&mut c, &b);
    sh(c)
}

fn verify() -> Step {
    setup_targets()?;
    setup_components()?;
    setup_qemu()?;
    let steps: [NamedStep; 9] = [
        ("format check (cargo fmt --check)", step_fmt),
        ("clippy, host crates", step_clippy_host),
        ("clippy, each board for its target", step_clippy_boards),
        ("host tests and doctests (cargo test)", step_host_tests),
        (
            "cross builds of the core, every target and feature set",
            step_cross_core,
        ),
        ("release builds of every board", step_board_builds),
        (
            "QEMU runs (emulated analyzer against the f64 model)",
            step_qemu,
        ),
        // Filled in by the benchmark work (branch `bench`): `cargo bench-fw --quick`.
        ("benchmark smoke (cargo bench-fw --quick)", step_bench_smoke),
        // Filled in by the panic-proof work (branch `bench`): boards/panic-proof links.
        (
            "panic proof (release link of boards/panic-proof)",
            step_panic_proof,
        ),
    ];
    let total = Instant::now();
    let mut times = Vec::new();
    for (i, (name, run)) in steps.iter().enumerate() {
        println!("\n==> [{}/{}] {name}", i + 1, steps.len());
        let t = Instant::now();
        let r = run();
        let secs = t.elapsed().as_secs_f64();
        if let Err(Failure(why)) = r {
            println!(
                "\nverify FAILED at step {}: {name} ({secs:.1} s)\n    {why}",
                i + 1
            );
            return Err(Failure(format!("step `{name}` failed")));
        }
        println!("<== ok: {name} ({secs:.1} s)");
        times.push((*name, secs));
    }
    println!(
        "\nverify: every step passed ({:.1} s)",
        total.elapsed().as_secs_f64()
    );
    for (name, secs) in times {
        println!("  {secs:>7.1} s  {name}");
    }
    Ok(())
}

// ---------------------------------------------------------------- demo

fn demo(args: &[String]) -> Result<ExitCode, Failure> {
    let args: Vec<&str> = args
        .iter()
        .map(String::as_str)
        .skip_while(|a| *a == "--")
        .collect();
    if let Some(bad) = args.iter().find(|a| a.contains(',')) {
        return Err(Failure(format!(
            "`{bad}`: QEMU's semihosting arguments cannot contain commas"
        )));
    }
    setup_targets()?;
    setup_qemu()?;
    println!(
        "building the emulated analyzer (boards/emu-analyzer, release, thumbv7em-none-eabihf) ..."
    );
    let mut build = cargo();
    build.args([
        "build",
        "-q",
        "--release",
        "-p",
        "emu-analyzer",
        "--target",
        "thumbv7em-none-eabihf",
        "--target-dir",
        FW_TARGET_DIR,
    ]);
    sh(build)?;
    let elf = root()
        .join(FW_TARGET_DIR)
        .join("thumbv7em-none-eabihf/release/emu-analyzer");
    let mut semi = String::from("enable=on,target=native,arg=emu-analyzer");
    for a in &args {
        semi.push_str(",arg=");
        semi.push_str(a);
    }
    println!("running it on QEMU mps2-an386 (Cortex-M4F); the UART follows\n");
    let mut child = Command::new("qemu-system-arm")
        .args(["-cpu", "cortex-m4", "-machine", "mps2-an386", "-nographic"])
        .args(["-monitor", "none", "-serial", "stdio"])
        .arg("-semihosting-config")
        .arg(&semi)
        .arg("-kernel")
        .arg(&elf)
        .stdin(Stdio::null())
        .spawn()
        .map_err(|e| Failure(format!("cannot start qemu-system-arm: {e}")))?;
    let start = Instant::now();
    loop {
        match child.try_wait() {
            Ok(Some(st)) => {
                let code = st.code().unwrap_or(1);
                if code != 0 {
                    eprintln!("\nthe firmware exited with status {code}");
                }
                return Ok(ExitCode::from(u8::try_from(code).unwrap_or(1)));
            }
            Ok(None) if start.elapsed() > DEMO_TIMEOUT => {
                let _ = child.kill();
                let _ = child.wait();
                return Err(Failure(format!(
                    "the firmware did not finish within {DEMO_TIMEOUT:?}"
                )));
            }
            Ok(None) => std::thread::sleep(Duration::from_millis(10)),
            Err(e) => return Err(Failure(format!("waiting for qemu: {e}"))),
        }
    }
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let result = match args.first().map(String::as_str) {
        Some("demo") => demo(&args[1..]),
        Some("verify") if args.len() == 1 => verify().map(|()| ExitCode::SUCCESS),
        _ => {
            eprintln!("usage: cargo demo [SCENARIO OPTIONS] | cargo verify");
            return ExitCode::from(2);
        }
    };
    match result {
        Ok(code) => code,
        Err(Failure(why)) => {
            eprintln!("error: {why}");
            ExitCode::FAILURE
        }
    }
}
