//! Host-side support for feedline's tests: the independent f64 reference model, a
//! simulated NOR flash for fault injection, captured sweeps and the SVG plot renderer, and the
//! serial-capture reader behind the `capture` tool.
//!
//! The reference model is written apart from the core and never calls it, so that a check
//! of the core against it compares two independent computations of the same textbook
//! formulas.
#![forbid(unsafe_code)]
#![deny(missing_docs)]

pub mod capture;
pub mod qemu;
pub mod reference;
pub mod serial_capture;
pub mod sim_flash;
pub mod svg;
