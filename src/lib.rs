//! # feedline
//!
//! A `no_std` library for the firmware of transmission-line analyzers and in-line line
//! monitors: it turns raw detector readings from a directional bridge or coupler into
//! numbers a builder can trust — reflection coefficient, VSWR, return loss, mismatch loss,
//! cable loss, power — each with a quality verdict and an uncertainty.
//!
//! Data flows through the modules in one direction; each knows nothing of those after it:
//!
//! ```text
//! readings ─► detector ─► bridge ─► reflection / uncertainty ─► cable ─► (line, sweep, report)
//!  (ADC codes)  (linearize)  (|Γ| + verdict)  (VSWR, RL, ML, bounds)   (matched loss)
//! ```
//!
//! Two numeric paths compute the per-reading chain: `f32` in [`bridge`] and friends (libm,
//! and a short `log2` for return and mismatch loss), and integer fixed point in [`fixed`] for
//! parts with no FPU. Each states its error bound
//! against an f64 reference; the host tests hold it there.
//!
//! Panic policy: no public function panics, and none returns NaN or infinity. Bad readings
//! give a typed error or a quality flag. A link-time proof in `boards/panic-proof` checks this
//! mechanically.
#![no_std]
#![forbid(unsafe_code)]
#![deny(missing_docs)]

pub mod analysis;
pub mod bridge;
pub mod cable;
pub mod calibration;
pub mod checksum;
pub mod command;
pub mod detector;
pub mod dtf;
pub mod fixed;
mod float;
pub mod fmt_decimal;
pub mod line;
pub mod monitor;
pub mod plot;
pub mod reflection;
pub mod report;
pub mod store;
pub mod sweep;
pub mod touchstone;
pub mod uncertainty;
pub mod units;
pub mod vector;
