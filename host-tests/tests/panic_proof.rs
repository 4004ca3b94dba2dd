//! Link-time panic-freedom proof: builds `boards/panic-proof` (which calls every public entry
//! point of feedline and whose panic handler calls a function defined nowhere) in release for
//! both thumb targets. Any reachable panic path makes the link fail with
//! `undefined symbol: feedline_panic_path_reachable`. The proof covers every module, the text
//! and byte-stream ones (report, command, touchstone, plot) included: they write numbers with
//! `feedline::fmt_decimal` (integer arithmetic) rather than core's float formatting, and
//! match bytes and chars rather than `&str` patterns, so neither `core::num::flt2dec` nor
//! the two-way substring searcher (both with panic paths) is reached.
//!
//! Two builds per target: the release profile as shipped, and the same with overflow checks
//! turned on for the feedline crate, so that any arithmetic that could overflow (the engineering
//! standards require explicit wrapping_/saturating_/checked_ operations) fails the link too.
//! A separate target directory (target/proof) keeps these builds from waiting on the build lock
//! of the running `cargo test`.

use std::path::Path;
use std::process::Command;

const TARGETS: [&str; 2] = ["thumbv6m-none-eabi", "thumbv7em-none-eabihf"];

fn build(target: &str, overflow_checks: bool, canary: bool) -> (bool, String) {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".to_string());
    let mut cmd = Command::new(cargo);
    cmd.current_dir(&root)
        .args([
            "build",
            "--release",
            "-p",
            "panic-proof",
            "--target",
            target,
        ])
        .args(["--target-dir", "target/proof"]);
    if overflow_checks {
        cmd.args([
            "--config",
            "profile.release.package.feedline.overflow-checks=true",
        ]);
    }
    if canary {
        cmd.args(["--features", "canary"]);
    }
    let out = cmd.output().expect("cargo runs");
    (
        out.status.success(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn check(overflow_checks: bool) {
    for target in TARGETS {
        let (ok, log) = build(target, overflow_checks, false);
        assert!(
            ok,
            "panic-proof for {target} (feedline overflow checks: {overflow_checks}) did not link; \
             a panic path is reachable from a public entry point:\n{log}"
        );
        println!("panic-proof {target}, overflow checks {overflow_checks}: links");
    }
}

#[test]
fn no_panic_path_reachable_in_release() {
    check(false);
}

/// Stricter than the shipped profile: with overflow checks on, arithmetic whose range is
/// argued in a comment but not visible to the compiler must be written as an explicit
/// wrapping_/saturating_/checked_ operation, or the link fails.
#[test]
fn no_overflow_panic_path_reachable_with_overflow_checks() {
    check(true);
}

/// The proof can fail: with the `canary` feature (one out-of-range index) the link must fail
/// with the undefined panic symbol.
#[test]
fn a_reachable_panic_fails_the_link() {
    let (ok, log) = build(TARGETS[0], false, true);
    assert!(
        !ok,
        "the canary build linked: the proof would not catch a panic"
    );
    assert!(
        log.contains("undefined symbol: feedline_panic_path_reachable"),
        "the canary build failed for another reason:\n{log}"
    );
}
