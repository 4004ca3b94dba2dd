//! `cargo bench-fw`: measured speed, footprint and stack depth of feedline's operations on an
//! emulated Cortex-M0 (QEMU `microbit`) and Cortex-M4F (QEMU `mps2-an386`), beside naive f32
//! versions of the same computations, and the link-time panic-freedom proof.
//!
//! ```text
//! cargo bench-fw                 all operations, footprint of every board firmware
//! cargo bench-fw --quick         CI smoke: a few operations, no board footprint (< 2 min)
//! cargo bench-fw --write         also write host-tests/BENCHMARKS.md
//! cargo bench-fw panic-proof     build boards/panic-proof for both targets (fails on a panic path)
//! ```
//!
//! Method
//! - Instructions: QEMU runs the firmware `boards/bench-fw` with one instruction per translation
//!   block and an execution trace (`-d exec,nochain`); the tool stream-reads the trace and counts
//!   the instructions executed between the addresses of the marker functions `bench_start` and
//!   `bench_stop` (from the ELF symbol table), minus the same count for an empty operation (the
//!   call overhead). The same binary and input give the same count every run.
//! - Error vs f64: a second, untraced run prints each operation's outputs over an input sweep;
//!   the tool compares them with the textbook relations evaluated here in f64.
//! - Stack: the firmware paints free RAM below the stack pointer, runs the operation once and
//!   scans for the lowest overwritten word (bytes below the caller's stack pointer).
//! - Footprint: section sizes from the ELF section headers. Flash = .vector_table + .text +
//!   .rodata + .data (its load image); RAM = .data + .bss + .uninit (statics; the stack comes
//!   on top, see the stack table).
//!
//! Set-up on a fresh machine: installs the two Rust targets with rustup when missing, and
//! `qemu-system-arm` with apt-get when missing and running as root (otherwise prints the command).
//! Traces are written under `target/bench-fw/` and deleted after counting.

use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::fs::{self, File};
use std::io::{BufRead, BufReader};
use std::path::{Path, PathBuf};
use std::process::{Command, ExitCode, Stdio};
use std::time::{Duration, Instant, SystemTime};

// ---------------------------------------------------------------------------------------------
// Cores and what the tool knows about each operation
// ---------------------------------------------------------------------------------------------

#[derive(Clone, Copy, PartialEq, Eq)]
enum Core {
    M0,
    M4f,
}

impl Core {
    const ALL: [Core; 2] = [Core::M0, Core::M4f];
    fn triple(self) -> &'static str {
        match self {
            Core::M0 => "thumbv6m-none-eabi",
            Core::M4f => "thumbv7em-none-eabihf",
        }
    }
    fn qemu_machine(self) -> [&'static str; 4] {
        match self {
            Core::M0 => ["-cpu", "cortex-m0", "-machine", "microbit"],
            Core::M4f => ["-cpu", "cortex-m4", "-machine", "mps2-an386"],
        }
    }
    fn label(self) -> &'static str {
        match self {
            Core::M0 => "M0",
            Core::M4f => "M4F",
        }
    }
}

/// How a measured op's outputs are judged against f64.
#[derive(Clone, Copy)]
enum Metric {
    /// No accuracy figure (overhead, or no reference yet).
    None,
    /// In: [forward code, reflected code] of a linear detector. Out: f32 bits of
    /// [VSWR, return loss dB, mismatch loss dB]. Reference: |Γ| = refl/fwd, VSWR =
    /// (1+|Γ|)/(1−|Γ|), RL = −20·log10|Γ|, ML = −10·log10(1−|Γ|²) (textbook transmission-line
    /// relations) in f64.
    ScalarChain,
    /// As [`Metric::ScalarChain`] with the outputs in Q16.16 (VSWR u32, RL and ML i32).
    ScalarChainQ16,
    /// In: |Γ| in Q1.31. Out: VSWR, RL, ML in Q16.16; reference as for the scalar chain.
    FromGammaQ31,
    /// In: x. Out: log2(x) in Q8.24 (i32); reference f64 log2.
    Log2Q24,
    /// In: a in Q8.24. Out: 2^−a in Q1.31; reference f64 exp2.
    Exp2NegQ31,
    /// In: Γ (f32 re, im). Out: R, X (f32); reference Z = 50·(1 + Γ)/(1 − Γ) in f64 (the
    /// textbook bilinear relation).
    Impedance,
    /// In: raw Γm (f32 re, im). Out: corrected Γ (f32 re, im); reference the one-port
    /// error-model inversion (Γm − e00)/(e10e01 + e11·(Γm − e00)) in f64 with [`OSL_TERMS`].
    Osl,
}

/// The error terms the firmware's `ops::OSL_TERMS` uses: (e00, e11, e10e01) as (re, im).
const OSL_TERMS: [(f32, f32); 3] = [(0.04, 0.03), (0.1, -0.05), (0.9, 0.1)];

/// A benchmark target from issue 7: maximum instructions per core, or a RAM bound.
#[derive(Clone, Copy)]
struct Target {
    m0: Option<u64>,
    m4f: Option<u64>,
    /// RAM bound on the M4F: the op's buffers plus its measured stack, bytes.
    m4f_ram: Option<u32>,
    text: &'static str,
}

const NO_TARGET: Target = Target {
    m0: None,
    m4f: None,
    m4f_ram: None,
    text: "—",
};

/// One row of the speed table. `id` is the op name the firmware prints; a row whose id the
/// firmware does not run is "not yet measured".
struct Row {
    id: &'static str,
    label: &'static str,
    metric: Metric,
    target: Target,
    /// Why a missed target is missed and what would close it (printed under the table).
    miss_note: &'static str,
    /// Static buffers the op works in (counted with its stack against a RAM target).
    buffer_bytes: u32,
}

const ROWS: &[Row] = &[
    Row {
        id: "naive-libm",
        label: "naive: 2 codes → VSWR, RL, ML (f32 + libm log10f)",
        metric: Metric::ScalarChain,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "naive-micromath",
        label: "naive: 2 codes → VSWR, RL, ML (f32 + micromath 2.1 log10)",
        metric: Metric::ScalarChain,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "core-gamma-reflection",
        label: "core f32: codes → Gamma → Reflection (VSWR, RL, ML, capped)",
        metric: Metric::ScalarChain,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "libm-log10f",
        label: "↳ part of the chain: one libm log10f",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "core-gamma-from-rl",
        label: "↳ part of the chain: Gamma::from_return_loss (one powf)",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "core-directivity-bounds",
        label: "↳ part of the chain: uncertainty::directivity_bounds",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "chain-f32",
        label: "core scalar chain with quality verdict (f32)",
        metric: Metric::ScalarChain,
        target: Target {
            m0: None,
            m4f: Some(80),
            m4f_ram: None,
            text: "≤ 80 M4F",
        },
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "chain-fixed",
        label: "core scalar chain with quality verdict (fixed point, LinearChain)",
        metric: Metric::ScalarChainQ16,
        target: Target {
            m0: Some(300),
            m4f: None,
            m4f_ram: None,
            text: "≤ 300 M0",
        },
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "fixed-log2",
        label: "fixed-point primitive: log2_q24",
        metric: Metric::Log2Q24,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "fixed-exp2",
        label: "fixed-point primitive: exp2_neg_q31",
        metric: Metric::Exp2NegQ31,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "fixed-from-gamma",
        label: "fixed-point primitive: from_gamma (|Γ| → VSWR, RL, ML)",
        metric: Metric::FromGammaQ31,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "impedance",
        label: "impedance from Γ (Impedance::from_gamma, Z0 50 Ω)",
        metric: Metric::Impedance,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "osl-correct",
        label: "OSL correction, one point (OnePortTerms::correct)",
        metric: Metric::Osl,
        target: Target {
            m0: None,
            m4f: Some(150),
            m4f_ram: None,
            text: "≤ 150 M4F",
        },
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "sweep-point",
        label: "sweep analysis, one point (minimum VSWR + 2:1 band trackers)",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "dtf-256",
        label: "distance to fault, 256 points → 1024 bins (Hann, loss compensation)",
        metric: Metric::None,
        target: Target {
            m0: None,
            m4f: Some(150_000),
            m4f_ram: Some(12 * 1024),
            text: "≤ 150 000 M4F, ≤ 12 KiB RAM",
        },
        miss_note: "",
        buffer_bytes: 8192,
    },
    Row {
        id: "dtf-256-plain",
        label: "↳ the same, rectangular window and no loss model",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 8192,
    },
    Row {
        id: "libm-cosf",
        label: "↳ one libm cosf (Hann coefficient)",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "libm-sqrtf",
        label: "↳ one libm sqrtf (loss model)",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 0,
    },
    Row {
        id: "dtf-fft-1024",
        label: "↳ part of distance to fault: the 1024-point FFT alone (microfft)",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 8192,
    },
    Row {
        id: "dtf-512",
        label: "distance to fault, 512 points → 1024 bins",
        metric: Metric::None,
        target: NO_TARGET,
        miss_note: "",
        buffer_bytes: 8192,
    },
];

/// Footprint firmware of `boards/bench-fw`: (binary, what it holds). Each row's figures are
/// given as the difference to `size-base`, the bare board.
const SIZE_BINS: &[(&str, &str)] = &[
    (
        "size-naive-libm",
        "naive f32 + libm chain (log10f, soft-float on M0)",
    ),
    ("size-naive-micromath", "naive f32 + micromath chain"),
    (
        "size-core-chain-f32",
        "core f32 scalar chain (codes → measurement with bounds and verdict)",
    ),
    (
        "size-core-reflection",
        "core f32 reflection relations (Gamma → Reflection)",
    ),
];

// ---------------------------------------------------------------------------------------------
// Small helpers
// ---------------------------------------------------------------------------------------------

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("host-tests sits in the workspace root")
        .to_path_buf()
}

fn cargo() -> String {
    std::env::var("CARGO").unwrap_or_else(|_| "cargo".to_string())
}

fn fail(msg: impl AsRef<str>) -> ! {
    eprintln!("bench-fw: {}", msg.as_ref());
    std::process::exit(1);
}

fn run_ok(cmd: &mut Command) -> bool {
    cmd.status().map(|s| s.success()).unwrap_or(false)
}

fn output_of(cmd: &mut Command) -> Option<String> {
    let out = cmd.stderr(Stdio::null()).output().ok()?;
    out.status
        .success()
        .then(|| String::from_utf8_lossy(&out.stdout).into_owned())
}

// ---------------------------------------------------------------------------------------------
// Set-up
// ---------------------------------------------------------------------------------------------

fn ensure_targets() {
    let installed = output_of(Command::new("rustup").args(["target", "list", "--installed"]))
        .unwrap_or_default();
    let missing: Vec<&str> = Core::ALL
        .iter()
        .map(|c| c.triple())
        .filter(|t| !installed.lines().any(|l| l.trim() == *t))
        .collect();
    if missing.is_empty() {
        return;
    }
    eprintln!("bench-fw: installing Rust targets {}", missing.join(" "));
    if !run_ok(
        Command::new("rustup")
            .args(["target", "add"])
            .args(&missing),
    ) {
        fail(format!(
            "could not install the targets; run: rustup target add {}",
            missing.join(" ")
        ));
    }
}

/// Returns (major, minor) of qemu-system-arm, installing it first when missing and root.
fn ensure_qemu() -> (u32, u32) {
    let version = || output_of(Command::new("qemu-system-arm").arg("--version"));
    let text = match version() {
        Some(t) => t,
        None => {
            let root_user =
                output_of(Command::new("id").arg("-u")).is_some_and(|s| s.trim() == "0");
            if !root_user {
                fail(
                    "qemu-system-arm is missing; run: sudo apt-get update && sudo apt-get install -y qemu-system-arm",
                );
            }
            eprintln!(
                "bench-fw: qemu-system-arm is missing; running as root, so installing it: apt-get update && apt-get install -y qemu-system-arm"
            );
            let ok = run_ok(Command::new("apt-get").arg("update"))
                && run_ok(Command::new("apt-get").args(["install", "-y", "qemu-system-arm"]));
            if !ok {
                fail("apt-get install -y qemu-system-arm failed");
            }
            version().unwrap_or_else(|| fail("qemu-system-arm still not runnable after install"))
        }
    };
    // "QEMU emulator version 7.2.19 (Debian ...)"
    let v = text
        .split_whitespace()
        .find(|w| w.chars().next().is_some_and(|c| c.is_ascii_digit()))
        .unwrap_or("0.0");
    let mut parts = v.split('.').map(|p| p.parse::<u32>().unwrap_or(0));
    (parts.next().unwrap_or(0), parts.next().unwrap_or(0))
}

// ---------------------------------------------------------------------------------------------
// Building
// ---------------------------------------------------------------------------------------------

/// Builds a package in release for a core; returns the executables it produced, or the
/// compiler's error text.
fn build(package: &str, core: Core, target_dir: &Path) -> Result<Vec<PathBuf>, String> {
    build_with(package, core, target_dir, &[])
}

/// [`build`] with extra cargo arguments.
fn build_with(
    package: &str,
    core: Core,
    target_dir: &Path,
    extra: &[&str],
) -> Result<Vec<PathBuf>, String> {
    let out = Command::new(cargo())
        .current_dir(root())
        .args([
            "build",
            "--release",
            "-p",
            package,
            "--target",
            core.triple(),
        ])
        .arg("--target-dir")
        .arg(target_dir)
        .args(["--message-format", "json-render-diagnostics"])
        .args(extra)
        .stderr(Stdio::piped())
        .output()
        .map_err(|e| format!("cannot run cargo: {e}"))?;
    if !out.status.success() {
        return Err(String::from_utf8_lossy(&out.stderr).into_owned());
    }
    let mut exes = Vec::new();
    for line in String::from_utf8_lossy(&out.stdout).lines() {
        if let Some(path) = json_string_field(line, "executable") {
            exes.push(PathBuf::from(path));
        }
    }
    Ok(exes)
}

/// The string value of `"field":"…"` in one line of cargo's JSON (paths only need `\\` and
/// `\"` unescaped).
fn json_string_field(line: &str, field: &str) -> Option<String> {
    let key = format!("\"{field}\":\"");
    let start = line.find(&key)? + key.len();
    let mut out = String::new();
    let mut chars = line[start..].chars();
    while let Some(c) = chars.next() {
        match c {
            '"' => return Some(out),
            '\\' => out.push(chars.next()?),
            c => out.push(c),
        }
    }
    None
}

// ---------------------------------------------------------------------------------------------
// ELF32 (little-endian) reading: section sizes and symbol addresses
// ---------------------------------------------------------------------------------------------

struct Elf {
    sections: Vec<(String, u32, u32, u32)>, // name, type, addr, size
    symbols: BTreeMap<String, u32>,
}

fn u16_at(b: &[u8], off: usize) -> Option<u16> {
    Some(u16::from_le_bytes(b.get(off..off + 2)?.try_into().ok()?))
}
fn u32_at(b: &[u8], off: usize) -> Option<u32> {
    Some(u32::from_le_bytes(b.get(off..off + 4)?.try_into().ok()?))
}
fn cstr_at(b: &[u8], off: usize) -> String {
    let s = b.get(off..).unwrap_or(&[]);
    let end = s.iter().position(|&c| c == 0).unwrap_or(s.len());
    String::from_utf8_lossy(&s[..end]).into_owned()
}

impl Elf {
    fn read(path: &Path) -> Result<Elf, String> {
        let b = fs::read(path).map_err(|e| format!("{}: {e}", path.display()))?;
        Self::parse(&b).ok_or_else(|| format!("{}: not a 32-bit little-endian ELF", path.display()))
    }

    fn parse(b: &[u8]) -> Option<Elf> {
        if b.get(0..4)? != b"\x7fELF" || *b.get(4)? != 1 || *b.get(5)? != 1 {
            return None;
        }
        let shoff = u32_at(b, 0x20)? as usize;
        let shentsize = u16_at(b, 0x2E)? as usize;
        let shnum = u16_at(b, 0x30)? as usize;
        let shstrndx = u16_at(b, 0x32)? as usize;
        // (name offset, type, addr, offset, size, link)
        let mut raw = Vec::with_capacity(shnum);
        for i in 0..shnum {
            let h = shoff + i * shentsize;
            raw.push((
                u32_at(b, h)? as usize,
                u32_at(b, h + 4)?,
                u32_at(b, h + 12)?,
                u32_at(b, h + 16)? as usize,
                u32_at(b, h + 20)?,
                u32_at(b, h + 24)? as usize,
            ));
        }
        let shstr_off = raw.get(shstrndx)?.3;
        let mut sections = Vec::new();
        let mut symbols = BTreeMap::new();
        for &(name, ty, addr, off, size, link) in &raw {
            sections.push((cstr_at(b, shstr_off + name), ty, addr, size));
            if ty == 2 {
                // SHT_SYMTAB: 16-byte entries; names in the linked string table.
                let str_off = raw.get(link)?.3;
                for k in 0..(size as usize / 16) {
                    let e = off + k * 16;
                    let sym_name = cstr_at(b, str_off + u32_at(b, e)? as usize);
                    if !sym_name.is_empty() {
                        symbols.insert(sym_name, u32_at(b, e + 4)?);
                    }
                }
            }
        }
        Some(Elf { sections, symbols })
    }

    fn section_size(&self, name: &str) -> u32 {
        self.sections
            .iter()
            .filter(|s| s.0 == name)
            .map(|s| s.3)
            .sum()
    }

    /// Flash image: vector table, code, constants and the initial values of `.data`.
    fn flash(&self) -> u32 {
        [".vector_table", ".text", ".rodata", ".data"]
            .iter()
            .map(|s| self.section_size(s))
            .sum()
    }

    /// Static RAM: `.data`, `.bss` and `.uninit` (the stack is extra).
    fn ram(&self) -> u32 {
        [".data", ".bss", ".uninit"]
            .iter()
            .map(|s| self.section_size(s))
            .sum()
    }

    /// A function's address with the Thumb bit cleared.
    fn function(&self, name: &str) -> Option<u32> {
        self.symbols.get(name).map(|a| a & !1)
    }
}

// ---------------------------------------------------------------------------------------------
// Running QEMU
// ---------------------------------------------------------------------------------------------

/// Runs a firmware under QEMU; returns its UART output. With `trace`, one instruction per
/// block and an execution trace written to that file.
fn qemu(
    core: Core,
    elf: &Path,
    args: &[&str],
    trace: Option<&Path>,
    qemu_version: (u32, u32),
    work: &Path,
) -> Result<String, String> {
    let semi = std::iter::once("enable=on,target=native".to_string())
        .chain(args.iter().map(|a| format!("arg={a}")))
        .collect::<Vec<_>>()
        .join(",");
    let uart_path = work.join(format!("uart-{}.txt", core.label()));
    let uart = File::create(&uart_path).map_err(|e| e.to_string())?;
    let mut cmd = Command::new("qemu-system-arm");
    cmd.args(core.qemu_machine())
        .args(["-nographic", "-monitor", "none", "-semihosting-config"])
        .arg(&semi)
        .arg("-kernel")
        .arg(elf)
        .stdin(Stdio::null())
        .stdout(uart)
        .stderr(Stdio::piped());
    if let Some(t) = trace {
        // QEMU 8.1 renamed -singlestep to the one-insn-per-tb accelerator property.
        if qemu_version >= (8, 1) {
            cmd.args(["-accel", "tcg,one-insn-per-tb=on"]);
        } else {
            cmd.arg("-singlestep");
        }
        cmd.args(["-d", "exec,nochain", "-D"]).arg(t);
    }
    let mut child = cmd
        .spawn()
        .map_err(|e| format!("cannot run qemu-system-arm: {e}"))?;
    let start = Instant::now();
    let status = loop {
        if let Some(s) = child.try_wait().map_err(|e| e.to_string())? {
            break s;
        }
        if start.elapsed() > Duration::from_secs(300) {
            let _ = child.kill();
            let _ = child.wait();
            return Err(format!("QEMU ({}) timed out", core.label()));
        }
        std::thread::sleep(Duration::from_millis(20));
    };
    let text = fs::read_to_string(&uart_path).map_err(|e| e.to_string())?;
    let _ = fs::remove_file(&uart_path);
    if !status.success() || !text.contains("DONE") {
        let mut err = String::new();
        if let Some(mut s) = child.stderr.take() {
            let _ = std::io::Read::read_to_string(&mut s, &mut err);
        }
        return Err(format!(
            "firmware run on {} failed ({status}); UART:\n{text}\n{err}",
            core.label()
        ));
    }
    Ok(text)
}

/// Stream-reads a QEMU execution trace and returns, for each start…stop marker pair, the
/// number of instructions executed from the start marker's first instruction up to (not
/// including) the stop marker's.
fn count_segments(trace: &Path, start: u32, stop: u32) -> Result<Vec<u64>, String> {
    let f = File::open(trace).map_err(|e| format!("{}: {e}", trace.display()))?;
    let mut reader = BufReader::with_capacity(1 << 20, f);
    let mut line = Vec::with_capacity(256);
    let mut counts = Vec::new();
    let mut current: Option<u64> = None;
    loop {
        line.clear();
        if reader
            .read_until(b'\n', &mut line)
            .map_err(|e| e.to_string())?
            == 0
        {
            break;
        }
        let Some(pc) = trace_pc(&line) else { continue };
        if pc == start {
            current = Some(0);
        } else if pc == stop {
            if let Some(n) = current.take() {
                counts.push(n);
            }
        }
        if let Some(n) = current.as_mut() {
            *n += 1;
        }
    }
    Ok(counts)
}

/// The PC of a `Trace …: 0x… [xxxxxxxx/PC/…]` line.
fn trace_pc(line: &[u8]) -> Option<u32> {
    if !line.starts_with(b"Trace") {
        return None;
    }
    let open = line.iter().position(|&c| c == b'[')?;
    let rest = line.get(open + 1..)?;
    let slash = rest.iter().position(|&c| c == b'/')?;
    let field = rest.get(slash + 1..)?;
    let end = field.iter().position(|&c| c == b'/' || c == b']')?;
    u32::from_str_radix(std::str::from_utf8(field.get(..end)?).ok()?, 16).ok()
}

// ---------------------------------------------------------------------------------------------
// Measurement of one core
// ---------------------------------------------------------------------------------------------

/// One sweep point: (inputs, outputs).
type Point = ([u32; 4], [u32; 4]);

/// Per core (M0, M4F): (flash, RAM) bytes, or why there is no figure.
type Sizes = [Result<(u32, u32), String>; 2];

#[derive(Default)]
struct CoreResult {
    /// Instructions per op (call overhead already subtracted).
    instructions: BTreeMap<String, u64>,
    /// Overhead subtracted (the `empty` op).
    overhead: u64,
    /// Stack bytes per op.
    stack: BTreeMap<String, u32>,
    /// Ops the firmware has but skipped (`--quick`).
    skipped: Vec<String>,
    /// Sweep points per op: (inputs, outputs).
    sweeps: BTreeMap<String, Vec<Point>>,
}

fn hex_words(words: &[&str]) -> Option<[u32; 4]> {
    let mut out = [0u32; 4];
    if words.len() != 4 {
        return None;
    }
    for (o, w) in out.iter_mut().zip(words) {
        *o = u32::from_str_radix(w, 16).ok()?;
    }
    Some(out)
}

fn measure(
    core: Core,
    elf_path: &Path,
    quick: bool,
    qv: (u32, u32),
    work: &Path,
) -> Result<CoreResult, String> {
    let elf = Elf::read(elf_path)?;
    let start = elf.function("bench_start").ok_or("no bench_start symbol")?;
    let stop = elf.function("bench_stop").ok_or("no bench_stop symbol")?;
    let mut args = vec!["bench-fw"];
    if quick {
        args.push("quick");
    }

    // Timed, traced run.
    let trace = work.join(format!("trace-{}.log", core.label()));
    let mut time_args = args.clone();
    time_args.push("time");
    let text = qemu(core, elf_path, &time_args, Some(&trace), qv, work);
    let counts = count_segments(&trace, start, stop);
    let _ = fs::remove_file(&trace);
    let text = text?;
    let counts = counts?;
    let names: Vec<&str> = text
        .lines()
        .filter_map(|l| l.strip_prefix("T "))
        .filter_map(|l| l.split_whitespace().next())
        .collect();
    if names.len() != counts.len() {
        return Err(format!(
            "{}: {} ops reported but {} marker pairs traced",
            core.label(),
            names.len(),
            counts.len()
        ));
    }
    let mut res = CoreResult {
        skipped: text
            .lines()
            .filter_map(|l| l.strip_prefix("N "))
            .map(|n| n.trim().to_string())
            .collect(),
        ..CoreResult::default()
    };
    let overhead = names
        .iter()
        .zip(&counts)
        .find(|(n, _)| **n == "empty")
        .map(|(_, c)| *c)
        .ok_or("firmware ran no `empty` op")?;
    res.overhead = overhead;
    for (n, c) in names.iter().zip(&counts) {
        if *n != "empty" {
            res.instructions
                .insert(n.to_string(), c.saturating_sub(overhead));
        }
    }

    // Sweep run, untraced: stack depth and outputs.
    let mut sweep_args = args;
    sweep_args.push("sweep");
    let text = qemu(core, elf_path, &sweep_args, None, qv, work)?;
    for line in text.lines() {
        let w: Vec<&str> = line.split_whitespace().collect();
        match w.as_slice() {
            ["K", name, bytes] => {
                res.stack
                    .insert(name.to_string(), bytes.parse().unwrap_or(0));
            }
            ["S", name, rest @ ..] if rest.len() == 8 => {
                if let (Some(i), Some(o)) = (hex_words(&rest[..4]), hex_words(&rest[4..])) {
                    res.sweeps.entry(name.to_string()).or_default().push((i, o));
                }
            }
            _ => {}
        }
    }
    Ok(res)
}

// ---------------------------------------------------------------------------------------------
// Error against f64
// ---------------------------------------------------------------------------------------------

/// Worst absolute errors of the scalar chain: (RL dB, where: true RL; ML dB; VSWR relative).
/// `gamma` gives the true |Γ| of a point's inputs (None: skip), `decode` its (VSWR, RL, ML).
fn scalar_error_with(
    points: &[Point],
    gamma: impl Fn(&[u32; 4]) -> Option<f64>,
    decode: impl Fn(&[u32; 4]) -> [f64; 3],
) -> Option<(f64, f64, f64, f64)> {
    let mut worst = (0.0f64, 0.0f64, 0.0f64, 0.0f64);
    for (i, o) in points {
        let Some(g) = gamma(i) else { continue };
        if !(g > 0.0 && g < 1.0) {
            continue;
        }
        let vswr = (1.0 + g) / (1.0 - g);
        let rl = -20.0 * g.log10();
        let ml = -10.0 * (1.0 - g * g).log10();
        let [v_out, rl_out, ml_out] = decode(o);
        let e_rl = (rl_out - rl).abs();
        let e_ml = (ml_out - ml).abs();
        let e_v = ((v_out - vswr) / vswr).abs();
        if !(e_rl.is_finite() && e_ml.is_finite() && e_v.is_finite()) {
            return None;
        }
        if e_rl > worst.0 {
            worst.0 = e_rl;
            worst.1 = rl;
        }
        worst.2 = worst.2.max(e_ml);
        worst.3 = worst.3.max(e_v);
    }
    Some(worst)
}

fn codes_gamma(i: &[u32; 4]) -> Option<f64> {
    let (fwd, refl) = (f64::from(i[0] as u16), f64::from(i[1] as u16));
    (fwd > 0.0).then(|| refl / fwd)
}

fn decode_f32(o: &[u32; 4]) -> [f64; 3] {
    [o[0], o[1], o[2]].map(|b| f64::from(f32::from_bits(b)))
}

fn decode_q16(o: &[u32; 4]) -> [f64; 3] {
    [
        f64::from(o[0]) / 65_536.0,
        f64::from(o[1] as i32) / 65_536.0,
        f64::from(o[2] as i32) / 65_536.0,
    ]
}

/// The scalar chain from two codes with f32 outputs.
#[cfg(test)]
fn scalar_chain_error(points: &[Point]) -> Option<(f64, f64, f64, f64)> {
    scalar_error_with(points, codes_gamma, decode_f32)
}

fn scalar_text(worst: Option<(f64, f64, f64, f64)>, n: usize) -> String {
    match worst {
        None => "non-finite output".to_string(),
        Some((rl, at, ml, v)) => format!(
            "RL {} dB (at {at:.1} dB), ML {} dB, VSWR {} rel; {n} pts",
            sci(rl),
            sci(ml),
            sci(v)
        ),
    }
}

/// Worst of a per-point error over every core's sweep: (error, input word 0 where).
fn worst_point(
    results: &[(Core, &CoreResult)],
    id: &str,
    err: impl Fn(&[u32; 4], &[u32; 4]) -> f64,
) -> Option<(f64, u32, usize)> {
    let mut worst: Option<(f64, u32, usize)> = None;
    for (_, r) in results {
        let Some(points) = r.sweeps.get(id) else {
            continue;
        };
        for (i, o) in points {
            let e = err(i, o);
            let e = if e.is_finite() { e } else { f64::INFINITY };
            if worst.is_none_or(|w| e > w.0) {
                worst = Some((e, i[0], points.len()));
            } else if let Some(w) = worst.as_mut() {
                w.2 = w.2.max(points.len());
            }
        }
    }
    worst
}

fn complex_in(i: &[u32; 4]) -> (f64, f64) {
    (
        f64::from(f32::from_bits(i[0])),
        f64::from(f32::from_bits(i[1])),
    )
}

/// (a + jb)/(c + jd) in f64.
fn cdiv((a, b): (f64, f64), (c, d): (f64, f64)) -> (f64, f64) {
    let den = c * c + d * d;
    ((a * c + b * d) / den, (b * c - a * d) / den)
}

fn error_text(row: &Row, results: &[(Core, &CoreResult)]) -> String {
    let scalar = |gamma: fn(&[u32; 4]) -> Option<f64>, decode: fn(&[u32; 4]) -> [f64; 3]| {
        let mut worst: Option<(f64, f64, f64, f64)> = None;
        let mut n = 0;
        for (_, r) in results {
            let Some(points) = r.sweeps.get(row.id) else {
                continue;
            };
            n = n.max(points.len());
            let Some(e) = scalar_error_with(points, gamma, decode) else {
                return "non-finite output".to_string();
            };
            worst = Some(match worst {
                None => e,
                Some(w) => (
                    if e.0 > w.0 { e.0 } else { w.0 },
                    if e.0 > w.0 { e.1 } else { w.1 },
                    w.2.max(e.2),
                    w.3.max(e.3),
                ),
            });
        }
        if n == 0 {
            return "—".to_string();
        }
        scalar_text(worst, n)
    };
    match row.metric {
        Metric::None => "—".to_string(),
        Metric::ScalarChain => scalar(codes_gamma, decode_f32),
        Metric::ScalarChainQ16 => scalar(codes_gamma, decode_q16),
        Metric::FromGammaQ31 => scalar(|i| Some(f64::from(i[0]) / 2_147_483_648.0), decode_q16),
        Metric::Log2Q24 => match worst_point(results, row.id, |i, o| {
            let exact = f64::from(i[0]).log2();
            (f64::from(o[0] as i32) / 16_777_216.0 - exact).abs() * 16_777_216.0
        }) {
            None => "—".to_string(),
            Some((e, x, n)) => format!("{e:.0} × 2⁻²⁴ (at x = {x}); {n} pts"),
        },
        Metric::Exp2NegQ31 => match worst_point(results, row.id, |i, o| {
            let exact = (-f64::from(i[0]) / 16_777_216.0).exp2();
            let got = f64::from(o[0]) / 2_147_483_648.0;
            // Relative error, plus one unit of Q1.31 allowed for the final truncation.
            ((got - exact).abs() - 1.0 / 2_147_483_648.0).max(0.0) / exact * 1.0e6
        }) {
            None => "—".to_string(),
            Some((e, a, n)) => format!(
                "{e:.1} ppm beyond 1 LSB (at a = {:.3}); {n} pts",
                f64::from(a) / 16_777_216.0
            ),
        },
        Metric::Impedance => match worst_point(results, row.id, |i, o| {
            let g = complex_in(i);
            let (zr, zx) = cdiv((1.0 + g.0, g.1), (1.0 - g.0, -g.1));
            let (zr, zx) = (50.0 * zr, 50.0 * zx);
            let (r, x) = complex_in(o);
            ((r - zr).hypot(x - zx)) / zr.hypot(zx)
        }) {
            None => "—".to_string(),
            Some((e, _, n)) => format!("|ΔZ|/|Z| {}; {n} pts", sci(e)),
        },
        Metric::Osl => match worst_point(results, row.id, |i, o| {
            let [e00, e11, t] = OSL_TERMS.map(|(a, b)| (f64::from(a), f64::from(b)));
            let m = complex_in(i);
            let d = (m.0 - e00.0, m.1 - e00.1);
            let den = (
                t.0 + e11.0 * d.0 - e11.1 * d.1,
                t.1 + e11.0 * d.1 + e11.1 * d.0,
            );
            let (gr, gi) = cdiv(d, den);
            let (r, x) = complex_in(o);
            (r - gr).hypot(x - gi)
        }) {
            None => "—".to_string(),
            Some((e, _, n)) => format!("|ΔΓ| {}; {n} pts", sci(e)),
        },
    }
}

fn sci(x: f64) -> String {
    if x == 0.0 {
        "0".to_string()
    } else if x >= 0.01 {
        format!("{x:.3}")
    } else {
        format!("{x:.1e}")
    }
}

// ---------------------------------------------------------------------------------------------
// Footprint
// ---------------------------------------------------------------------------------------------

struct Footprint {
    label: String,
    /// Per core: Ok((flash, ram)) or why there is no figure.
    sizes: Sizes,
}

/// Board firmware packages under boards/: (directory, package name).
fn board_packages() -> Vec<(String, String)> {
    let mut out = Vec::new();
    let Ok(dirs) = fs::read_dir(root().join("boards")) else {
        return out;
    };
    for d in dirs.flatten() {
        let Ok(toml) = fs::read_to_string(d.path().join("Cargo.toml")) else {
            continue;
        };
        let name = toml
            .lines()
            .skip_while(|l| l.trim() != "[package]")
            .find_map(|l| {
                let l = l.trim();
                let v = l.strip_prefix("name")?.trim().strip_prefix('=')?.trim();
                Some(v.trim_matches('"').to_string())
            });
        if let Some(name) = name {
            out.push((d.file_name().to_string_lossy().into_owned(), name));
        }
    }
    out.sort();
    out
}

fn first_error_line(err: &str) -> String {
    if err.contains("undefined symbol: feedline_panic_path_reachable") {
        return "link failed: a panic path is reachable".to_string();
    }
    if err.contains("not available on this target") || err.contains("can't find crate") {
        return "not built for this core".to_string();
    }
    err.lines()
        .find(|l| l.starts_with("error"))
        .unwrap_or("build failed")
        .chars()
        .take(80)
        .collect()
}

// ---------------------------------------------------------------------------------------------
// Report
// ---------------------------------------------------------------------------------------------

/// Text made safe for a markdown table cell.
fn cell(text: &str) -> String {
    text.replace('|', "\\|")
}

fn met_text(row: &Row, m0: Option<u64>, m4f: Option<u64>, m4f_stack: Option<u32>) -> String {
    let mut parts = Vec::new();
    for (limit, got, core) in [
        (row.target.m0, m0, Core::M0),
        (row.target.m4f, m4f, Core::M4f),
    ] {
        if let (Some(limit), Some(got)) = (limit, got) {
            if got <= limit {
                parts.push(format!("yes ({})", core.label()));
            } else {
                parts.push(format!(
                    "no ({}: +{}, {:.2}×)",
                    core.label(),
                    got - limit,
                    got as f64 / limit as f64
                ));
            }
        }
    }
    if let (Some(limit), Some(stack)) = (row.target.m4f_ram, m4f_stack) {
        let ram = row.buffer_bytes + stack;
        if ram <= limit {
            parts.push(format!(
                "RAM yes ({ram} B = buffer {} + stack {stack})",
                row.buffer_bytes
            ));
        } else {
            parts.push(format!("RAM no ({ram} B: +{})", ram - limit));
        }
    }
    if parts.is_empty() {
        "—".to_string()
    } else {
        parts.join(", ")
    }
}

fn report(
    results: &[(Core, CoreResult)],
    footprints: &[Footprint],
    stack_rows: bool,
) -> (String, Vec<String>) {
    let refs: Vec<(Core, &CoreResult)> = results.iter().map(|(c, r)| (*c, r)).collect();
    let get = |core: Core, id: &str| {
        refs.iter()
            .find(|(c, _)| *c == core)
            .and_then(|(_, r)| r.instructions.get(id).copied())
    };
    let mut s = String::new();
    let mut missed = Vec::new();
    s.push_str(
        "| operation | M0 instructions | M4F instructions | error vs f64 | target | met? |\n",
    );
    s.push_str("|---|---:|---:|---|---|---|\n");
    for row in ROWS {
        let m0 = get(Core::M0, row.id);
        let m4f = get(Core::M4f, row.id);
        if m0.is_none()
            && m4f.is_none()
            && refs
                .iter()
                .any(|(_, r)| r.skipped.iter().any(|n| n == row.id))
        {
            let _ = writeln!(
                s,
                "| {} | not run (--quick) | not run (--quick) | — | {} | — |",
                cell(row.label),
                row.target.text
            );
            continue;
        }
        if m0.is_none() && m4f.is_none() {
            let _ = writeln!(
                s,
                "| {} | not yet measured | not yet measured | — | {} | — |",
                cell(row.label),
                row.target.text
            );
            continue;
        }
        let show = |x: Option<u64>| x.map_or("—".to_string(), |v| v.to_string());
        let m4f_stack = refs
            .iter()
            .find(|(c, _)| *c == Core::M4f)
            .and_then(|(_, r)| r.stack.get(row.id).copied());
        let met = met_text(row, m0, m4f, m4f_stack);
        if met.contains("no (") {
            missed.push(format!("{}: {} {}", row.label, met, row.miss_note));
        }
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} | {} | {} |",
            cell(row.label),
            show(m0),
            show(m4f),
            cell(&error_text(row, &refs)),
            row.target.text,
            met
        );
    }
    let overheads: Vec<String> = refs
        .iter()
        .map(|(c, r)| format!("{} {}", c.label(), r.overhead))
        .collect();
    let _ = writeln!(
        s,
        "\nInstructions exclude the call overhead measured with an empty operation ({}).",
        overheads.join(", ")
    );

    if stack_rows {
        s.push_str("\n| operation | M0 stack (bytes) | M4F stack (bytes) |\n|---|---:|---:|\n");
        let stack = |core: Core, id: &str| {
            refs.iter()
                .find(|(c, _)| *c == core)
                .and_then(|(_, r)| r.stack.get(id).copied())
                .map_or("—".to_string(), |v| v.to_string())
        };
        for row in ROWS {
            if get(Core::M0, row.id).is_none() && get(Core::M4f, row.id).is_none() {
                continue;
            }
            let _ = writeln!(
                s,
                "| {} | {} | {} |",
                cell(row.label),
                stack(Core::M0, row.id),
                stack(Core::M4f, row.id)
            );
        }
    }

    if !footprints.is_empty() {
        s.push_str("\n| firmware | M0 flash (bytes) | M0 RAM (bytes) | M4F flash (bytes) | M4F RAM (bytes) |\n");
        s.push_str("|---|---:|---:|---:|---:|\n");
        for f in footprints {
            let cell = |r: &Result<(u32, u32), String>| match r {
                Ok((fl, ram)) => (fl.to_string(), ram.to_string()),
                Err(e) => (e.clone(), "—".to_string()),
            };
            let (a, b) = cell(&f.sizes[0]);
            let (c, d) = cell(&f.sizes[1]);
            let _ = writeln!(s, "| {} | {a} | {b} | {c} | {d} |", f.label);
        }
    }
    (s, missed)
}

/// Today's date (UTC) as YYYY-MM-DD, from the system clock (civil-from-days, H. Hinnant's
/// published algorithm).
fn today() -> String {
    let secs = SystemTime::now()
        .duration_since(SystemTime::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    let z = (secs / 86_400) as i64 + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

// ---------------------------------------------------------------------------------------------
// Commands
// ---------------------------------------------------------------------------------------------

fn panic_proof() -> ExitCode {
    ensure_targets();
    let dir = root().join("target").join("proof");
    let mut ok = true;
    // As shipped, then with overflow checks on in feedline (any unchecked arithmetic that can
    // overflow then fails the link too).
    let variants: [(&str, &[&str]); 2] = [
        ("release", &[]),
        (
            "release + feedline overflow checks",
            &[
                "--config",
                "profile.release.package.feedline.overflow-checks=true",
            ],
        ),
    ];
    for (what, extra) in variants {
        for core in Core::ALL {
            match build_with("panic-proof", core, &dir, extra) {
                Ok(_) => println!(
                    "panic-proof {} ({what}): links, no panic path reachable",
                    core.triple()
                ),
                Err(e) => {
                    ok = false;
                    println!("panic-proof {} ({what}): FAILED\n{e}", core.triple());
                }
            }
        }
    }
    if ok {
        ExitCode::SUCCESS
    } else {
        ExitCode::FAILURE
    }
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.iter().any(|a| a == "-h" || a == "--help") {
        println!("usage: cargo bench-fw [--quick] [--write] | cargo bench-fw panic-proof");
        return ExitCode::SUCCESS;
    }
    if args.iter().any(|a| a == "panic-proof") {
        return panic_proof();
    }
    let quick = args.iter().any(|a| a == "--quick");
    let write = args.iter().any(|a| a == "--write");
    if let Some(a) = args
        .iter()
        .find(|a| !["--quick", "--write"].contains(&a.as_str()))
    {
        fail(format!("unknown argument {a}; try --help"));
    }

    ensure_targets();
    let qv = ensure_qemu();
    let target_dir = root().join("target").join("bench-fw");
    let work = target_dir.join("run");
    fs::create_dir_all(&work).unwrap_or_else(|e| fail(format!("{}: {e}", work.display())));

    let mut results = Vec::new();
    let mut footprints: Vec<Footprint> = Vec::new();
    let mut base = [(0u32, 0u32); 2];
    let mut bench_sizes: Sizes = [Err("—".to_string()), Err("—".to_string())];
    let mut bin_sizes: BTreeMap<&str, Sizes> = BTreeMap::new();
    for (ci, core) in Core::ALL.into_iter().enumerate() {
        eprintln!(
            "bench-fw: building and running on {} ({})",
            core.label(),
            core.triple()
        );
        // The quick smoke builds the benchmark binary only (each footprint binary is one more
        // LTO link).
        let only_main: &[&str] = if quick { &["--bin", "bench-fw"] } else { &[] };
        let exes = build_with("bench-fw", core, &target_dir, only_main)
            .unwrap_or_else(|e| fail(format!("building bench-fw for {}:\n{e}", core.triple())));
        let exe = |name: &str| {
            exes.iter()
                .find(|p| p.file_name().is_some_and(|f| f == name))
        };
        let main = exe("bench-fw").unwrap_or_else(|| fail("no bench-fw executable built"));
        let res = measure(core, main, quick, qv, &work).unwrap_or_else(|e| fail(e));
        results.push((core, res));
        let size_of = |name: &str| -> Result<(u32, u32), String> {
            let p = exe(name).ok_or_else(|| "not built".to_string())?;
            let e = Elf::read(p)?;
            Ok((e.flash(), e.ram()))
        };
        bench_sizes[ci] = size_of("bench-fw");
        if quick {
            continue;
        }
        base[ci] = size_of("size-base").unwrap_or_else(|e| fail(e));
        for (bin, _) in SIZE_BINS {
            let r = size_of(bin)
                .map(|(f, r)| (f.saturating_sub(base[ci].0), r.saturating_sub(base[ci].1)));
            bin_sizes
                .entry(bin)
                .or_insert_with(|| [Err("—".to_string()), Err("—".to_string())])[ci] = r;
        }
    }

    if !quick {
        footprints.push(Footprint {
            label: "bare board (UART, exit, panic handler): size-base".to_string(),
            sizes: [Ok(base[0]), Ok(base[1])],
        });
    }
    for (bin, label) in SIZE_BINS {
        if let Some(sizes) = bin_sizes.remove(bin) {
            footprints.push(Footprint {
                label: format!("{label}: {bin}, over the bare board"),
                sizes,
            });
        }
    }
    footprints.push(Footprint {
        label: "board firmware boards/bench-fw (all benchmark ops)".to_string(),
        sizes: bench_sizes,
    });
    if !quick {
        for (dir, package) in board_packages() {
            if package == "bench-fw" {
                continue;
            }
            eprintln!("bench-fw: building board firmware boards/{dir}");
            let mut sizes: Sizes = [Err("—".to_string()), Err("—".to_string())];
            for (ci, core) in Core::ALL.into_iter().enumerate() {
                sizes[ci] = match build(&package, core, &target_dir) {
                    Err(e) => Err(first_error_line(&e)),
                    Ok(exes) => match exes.first() {
                        None => Err("library, no firmware".to_string()),
                        Some(p) => Elf::read(p).map(|e| (e.flash(), e.ram())),
                    },
                };
            }
            footprints.push(Footprint {
                label: format!("board firmware boards/{dir}"),
                sizes,
            });
        }
    }

    let (table, missed) = report(&results, &footprints, true);
    println!("{table}");
    for m in &missed {
        println!("missed: {m}");
    }
    if write {
        let path = root().join("host-tests").join("BENCHMARKS.md");
        let old = fs::read_to_string(&path).unwrap_or_default();
        // Keep hand-written analysis below the marker line.
        let marker = "<!-- analysis -->";
        let tail = old.find(marker).map(|i| &old[i..]).unwrap_or(marker);
        let cmd = if quick {
            "cargo bench-fw --quick --write"
        } else {
            "cargo bench-fw --write"
        };
        let doc = format!(
            "# Benchmarks\n\nMeasured {} with `{cmd}` (QEMU {}.{}: `microbit` Cortex-M0, `mps2-an386` Cortex-M4F; \
             release profile: opt-level \"s\", LTO, one codegen unit). Counts are executed instructions, \
             deterministic for a given binary and input. The method is described in \
             host-tests/src/bin/bench-fw.rs.\n\n{table}\n{tail}\n",
            today(),
            qv.0,
            qv.1
        );
        fs::write(&path, doc.trim_end().to_string() + "\n")
            .unwrap_or_else(|e| fail(format!("{}: {e}", path.display())));
        eprintln!("bench-fw: wrote {}", path.display());
    }
    ExitCode::SUCCESS
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A trace line as QEMU 7.2 writes it with `-d exec,nochain`.
    const LINE: &[u8] =
        b"Trace 0: 0x7f4c80000240 [00800400/00000a2e/00000510/ff000201] __pre_init\n";

    #[test]
    fn reads_the_pc_of_a_trace_line() {
        assert_eq!(trace_pc(LINE), Some(0x0a2e));
        assert_eq!(trace_pc(b"Linking TBs 0x1 [00000a2e] index 0\n"), None);
        assert_eq!(trace_pc(b"Trace 0: garbage\n"), None);
    }

    #[test]
    fn counts_between_markers() {
        let dir = root().join("target").join("bench-fw-test");
        fs::create_dir_all(&dir).unwrap();
        let path = dir.join("segments.log");
        // start at 0x100, stop at 0x200; two segments of 3 and 1 instructions, noise around.
        let pcs = [0x10, 0x100, 0x104, 0x106, 0x200, 0x202, 0x100, 0x200, 0x10];
        let text: String = pcs
            .iter()
            .map(|pc| format!("Trace 0: 0x7f00 [00800400/{pc:08x}/00000510/ff000201] f\n"))
            .collect();
        fs::write(&path, text).unwrap();
        let counts = count_segments(&path, 0x100, 0x200).unwrap();
        fs::remove_file(&path).unwrap();
        assert_eq!(counts, vec![3, 1]);
    }

    #[test]
    fn reads_executables_from_cargo_json() {
        let line = r#"{"reason":"compiler-artifact","executable":"/t/a\\b\"c","fresh":true}"#;
        assert_eq!(
            json_string_field(line, "executable").as_deref(),
            Some("/t/a\\b\"c")
        );
        assert_eq!(
            json_string_field(r#"{"executable":null}"#, "executable"),
            None
        );
    }

    #[test]
    fn scalar_chain_error_is_zero_for_the_f64_values_rounded() {
        // fwd 50 000, refl 5 000: |Γ| = 0.1, VSWR 11/9, RL 20 dB, ML −10·log10(0.99).
        let ml = -10.0 * 0.99f64.log10();
        let out = [(11.0f64 / 9.0) as f32, 20.0f32, ml as f32, 0.0].map(f32::to_bits);
        let (rl_err, at, ml_err, v_err) =
            scalar_chain_error(&[([50_000, 5_000, 0, 0], out)]).unwrap();
        assert_eq!(rl_err, 0.0);
        assert_eq!(at, 0.0, "no worse point than zero error was recorded");
        assert!(ml_err < 1e-8 && v_err < 1e-7);
        // A non-finite output is reported, not hidden.
        let nan = [f32::NAN.to_bits(); 4];
        assert!(scalar_chain_error(&[([50_000, 5_000, 0, 0], nan)]).is_none());
    }

    #[test]
    fn met_says_by_how_much() {
        let row = &ROWS.iter().find(|r| r.id == "chain-f32").unwrap();
        assert_eq!(met_text(row, None, Some(80), None), "yes (M4F)");
        assert_eq!(met_text(row, None, Some(160), None), "no (M4F: +80, 2.00×)");
    }

    #[test]
    fn date_is_iso() {
        let d = today();
        assert_eq!(d.len(), 10);
        assert!(d.starts_with("20") && d.as_bytes()[4] == b'-' && d.as_bytes()[7] == b'-');
    }

    #[test]
    fn parses_a_built_firmware_when_present() {
        // Only when `cargo bench-fw` has built the firmware before; the ELF reader is then
        // checked on a real file: markers exist and differ, sections add up.
        let p = root().join("target/bench-fw/thumbv6m-none-eabi/release/bench-fw");
        let Ok(elf) = Elf::read(&p) else { return };
        let (a, b) = (elf.function("bench_start"), elf.function("bench_stop"));
        assert!(a.is_some() && b.is_some() && a != b);
        assert!(elf.flash() > elf.section_size(".text"));
    }
}
