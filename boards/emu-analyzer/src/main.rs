//! feedline on an emulated analyzer: QEMU `mps2-an386` (Cortex-M4F).
//!
//! Reads the scenario from the semihosting command line, simulates the front end
//! ([`frontend`]), reads it through the core's hardware-edge trait
//! [`feedline::bridge::BridgeAdc`], runs the core's measurement chain and prints the report
//! ([`report`]) on UART0. Exit status: 0 after a report (even one whose readings were
//! refused: refusing is a correct outcome), 2 for a refused command line, 101 on a panic.
//!
//! Built for any other target (e.g. by a `cargo check --workspace` on the host) it is a stub
//! that says how to build it, so workspace-wide commands do not break on it.
#![cfg_attr(target_os = "none", no_std)]
#![cfg_attr(target_os = "none", no_main)]

#[cfg(target_os = "none")]
mod cable_types;
#[cfg(target_os = "none")]
mod cal_section;
#[cfg(target_os = "none")]
mod firmware;
#[cfg(target_os = "none")]
mod frontend;
#[cfg(target_os = "none")]
mod line_section;
#[cfg(target_os = "none")]
mod ram_flash;
#[cfg(target_os = "none")]
mod report;
#[cfg(target_os = "none")]
mod scenario;
#[cfg(target_os = "none")]
mod sweep_section;
#[cfg(target_os = "none")]
mod vector_sim;

#[cfg(not(target_os = "none"))]
fn main() {
    eprintln!(
        "emu-analyzer is firmware: build it with `--target thumbv7em-none-eabihf` and run it \
         under QEMU (`cargo demo`; see boards/emu-analyzer/README.md)"
    );
    std::process::exit(2);
}
