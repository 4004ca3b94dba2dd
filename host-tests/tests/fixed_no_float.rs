//! Machine-code check of the integer chain (`feedline::fixed`) for Armv6-M (Cortex-M0/M0+,
//! no FPU): builds the core crate in release for `thumbv6m-none-eabi` with `--emit=asm`
//! into its own target folder (`target/fixed-no-float`) and reads the call targets of every
//! `feedline::fixed` function.
//!
//! Held here:
//! - no `fixed` function calls anything but other `fixed` functions and a short allow-list
//!   of integer compiler routines (memory copy, integer division, 64-bit multiply): so no
//!   soft-float routine (`__aeabi_f*`, `__aeabi_d*`, `__addsf3`, …), no `libm`, and no
//!   panic (`core::panicking::*`) is reachable;
//! - the per-reading functions (`measure` of every chain), with everything they call, use
//!   no division and no 64-bit multiply routine at all.
//!
//! It also prints, for each `measure`, its static size and the longest path through its
//! code, callees included (an upper bound on the instructions executed per reading, since
//! the chain has no loops). Needs the `thumbv6m-none-eabi` target installed
//! (`rustup target add thumbv6m-none-eabi`); run with `--nocapture` to see the figures.

use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::path::{Path, PathBuf};
use std::process::Command;

/// Integer routines the `fixed` module may call outside the per-reading path.
const ALLOWED_ANYWHERE: [&str; 8] = [
    "__aeabi_memcpy",
    "__aeabi_memcpy4",
    "__aeabi_memset",
    "__aeabi_memclr",
    "__aeabi_uidiv",
    "__aeabi_uidivmod",
    "__aeabi_uldivmod",
    "__aeabi_lmul",
];
/// Of those, the ones the per-reading path may call (a few-byte copy of a constant result).
const ALLOWED_PER_READING: [&str; 2] = ["__aeabi_memcpy", "__aeabi_memcpy4"];

struct Function {
    instructions: Vec<String>,
    labels: HashMap<String, usize>,
}

fn build_asm() -> PathBuf {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("workspace root")
        .to_path_buf();
    let target_dir = root.join("target").join("fixed-no-float");
    let cargo = option_env!("CARGO").unwrap_or("cargo");
    let status = Command::new(cargo)
        .current_dir(&root)
        .args([
            "rustc",
            "-q",
            "-p",
            "feedline",
            "--release",
            "--target",
            "thumbv6m-none-eabi",
            "--target-dir",
        ])
        .arg(&target_dir)
        .args(["--", "--emit=asm"])
        .status()
        .expect("run cargo");
    assert!(
        status.success(),
        "release build for thumbv6m-none-eabi failed"
    );
    let deps = target_dir.join("thumbv6m-none-eabi/release/deps");
    let newest = std::fs::read_dir(&deps)
        .expect("deps folder")
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| {
            let n = p.file_name().and_then(|n| n.to_str()).unwrap_or("");
            n.starts_with("feedline-") && n.ends_with(".s")
        })
        .max_by_key(|p| p.metadata().and_then(|m| m.modified()).ok());
    newest.expect("feedline assembly file")
}

fn parse(asm: &str) -> BTreeMap<String, Function> {
    let mut out = BTreeMap::new();
    let mut current: Option<(String, Function)> = None;
    for line in asm.lines() {
        if let Some(name) = line.strip_suffix(':').filter(|n| n.starts_with("_ZN")) {
            current = Some((
                name.to_string(),
                Function {
                    instructions: Vec::new(),
                    labels: HashMap::new(),
                },
            ));
            continue;
        }
        if line.starts_with(".Lfunc_end") {
            if let Some((n, f)) = current.take() {
                out.insert(n, f);
            }
            continue;
        }
        let Some((_, f)) = current.as_mut() else {
            continue;
        };
        let t = line.split('@').next().unwrap_or("").trim();
        if t.is_empty() {
            continue;
        }
        if let Some(label) = t.strip_suffix(':') {
            f.labels.insert(label.to_string(), f.instructions.len());
        } else if !t.starts_with('.') {
            f.instructions.push(t.to_string());
        }
    }
    out
}

/// Call targets: `bl x`, and `b x` to a label outside the function (a tail call).
fn calls(f: &Function) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    for i in &f.instructions {
        let mut parts = i.split_whitespace();
        let op = parts.next().unwrap_or("");
        let arg = parts.next().unwrap_or("");
        if op == "bl" || op == "blx" || (op == "b" && !f.labels.contains_key(arg)) {
            out.insert(arg.to_string());
        }
    }
    out
}

fn is_fixed(symbol: &str) -> bool {
    symbol.starts_with("_ZN8feedline5fixed")
}

fn demangled_tail(symbol: &str) -> String {
    // _ZN8feedline5fixed5chain11LinearChain7measure17h…E → chain::LinearChain::measure
    let mut rest = symbol.trim_start_matches("_ZN");
    let mut parts = Vec::new();
    while let Some(pos) = rest.find(|c: char| !c.is_ascii_digit()) {
        let Ok(n) = rest[..pos].parse::<usize>() else {
            break;
        };
        let Some(part) = rest.get(pos..pos + n) else {
            break;
        };
        parts.push(part.to_string());
        rest = &rest[pos + n..];
    }
    parts
        .into_iter()
        .filter(|p| p != "feedline" && p != "fixed" && !p.starts_with('h'))
        .collect::<Vec<_>>()
        .join("::")
}

const CONDITIONS: [&str; 16] = [
    "eq", "ne", "hs", "lo", "hi", "ls", "ge", "lt", "gt", "le", "mi", "pl", "cs", "cc", "vs", "vc",
];

/// Longest path through a function in instructions, callees inside `fixed` included.
/// `None` when the code has a loop.
fn longest_path(
    name: &str,
    fns: &BTreeMap<String, Function>,
    memo: &mut HashMap<String, Option<u64>>,
) -> Option<u64> {
    if let Some(v) = memo.get(name) {
        return *v;
    }
    memo.insert(name.to_string(), None); // recursion guard
    let f = fns.get(name)?;
    let n = f.instructions.len();
    let mut own = vec![1u64; n];
    let mut succ: Vec<Vec<usize>> = vec![Vec::new(); n];
    for (i, ins) in f.instructions.iter().enumerate() {
        let mut parts = ins.split_whitespace();
        let op = parts.next().unwrap_or("");
        let arg = parts.next().unwrap_or("");
        let target = f.labels.get(arg).copied();
        let cond = op.len() == 3 && op.starts_with('b') && CONDITIONS.contains(&&op[1..]);
        if op == "bl" {
            if is_fixed(arg) {
                own[i] += longest_path(arg, fns, memo)?;
            }
            succ[i].push(i + 1);
        } else if op == "b" {
            if let Some(t) = target {
                succ[i].push(t);
            } else if is_fixed(arg) {
                own[i] += longest_path(arg, fns, memo)?;
            }
        } else if cond {
            succ[i].push(i + 1);
            succ[i].extend(target);
        } else if op == "bx" || (op == "pop" && ins.contains("pc")) {
        } else {
            succ[i].push(i + 1);
        }
        succ[i].retain(|&j| j < n);
    }
    // Longest path in a DAG by depth-first search; a back edge means a loop.
    fn visit(
        i: usize,
        own: &[u64],
        succ: &[Vec<usize>],
        state: &mut [u8],
        best: &mut [u64],
    ) -> bool {
        match state[i] {
            2 => return true,
            1 => return false,
            _ => {}
        }
        state[i] = 1;
        let mut m = 0;
        for &j in &succ[i] {
            if !visit(j, own, succ, state, best) {
                return false;
            }
            m = m.max(best[j]);
        }
        best[i] = own[i] + m;
        state[i] = 2;
        true
    }
    let mut state = vec![0u8; n];
    let mut best = vec![0u64; n];
    let result = if n > 0 && visit(0, &own, &succ, &mut state, &mut best) {
        Some(best[0])
    } else {
        None
    };
    memo.insert(name.to_string(), result);
    result
}

fn reachable(start: &str, fns: &BTreeMap<String, Function>) -> BTreeSet<String> {
    let mut seen = BTreeSet::new();
    let mut stack = vec![start.to_string()];
    while let Some(s) = stack.pop() {
        if !seen.insert(s.clone()) {
            continue;
        }
        if let Some(f) = fns.get(&s) {
            stack.extend(calls(f));
        }
    }
    seen
}

#[test]
fn fixed_chain_has_no_float_division_or_panic_on_cortex_m0() {
    let path = build_asm();
    let asm = std::fs::read_to_string(&path).expect("read assembly");
    let fns = parse(&asm);
    let fixed: Vec<&String> = fns.keys().filter(|k| is_fixed(k)).collect();
    assert!(
        fixed.len() >= 10,
        "too few fixed functions found: {}",
        fixed.len()
    );

    for name in &fixed {
        for c in calls(&fns[*name]) {
            assert!(
                is_fixed(&c) || ALLOWED_ANYWHERE.contains(&c.as_str()),
                "{} calls {c}",
                demangled_tail(name)
            );
        }
    }

    let mut measured = 0;
    let mut memo = HashMap::new();
    println!("per-reading functions on thumbv6m-none-eabi (release, opt-level s):");
    for name in fixed.iter().filter(|n| n.contains("7measure17h")) {
        for c in reachable(name, &fns) {
            assert!(
                is_fixed(&c) || ALLOWED_PER_READING.contains(&c.as_str()),
                "{} reaches {c}",
                demangled_tail(name)
            );
        }
        let size = fns[*name].instructions.len();
        let longest = longest_path(name, &fns, &mut memo);
        assert!(
            longest.is_some(),
            "{}: a loop in the chain",
            demangled_tail(name)
        );
        println!(
            "  {:<34} {:>4} instructions static, longest path {:>4} (callees included)",
            demangled_tail(name),
            size,
            longest.unwrap_or(0)
        );
        measured += 1;
    }
    assert_eq!(measured, 4, "expected the measure() of four chains");
    for name in fixed.iter().filter(|n| !n.contains("7measure17h")) {
        println!(
            "  {:<34} {:>4} instructions static",
            demangled_tail(name),
            fns[*name].instructions.len()
        );
    }
}
