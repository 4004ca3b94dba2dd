//! The independent f64 reference model.
//!
//! Written apart from the core and never calling it: each file restates the textbook
//! formulas in f64 so that the host tests compare two independent computations.

pub mod bridge_sim;
pub mod calibration;
pub mod crc32;
pub mod emu_vector;
pub mod fixed_scalar;
pub mod line;
pub mod line_faults;
pub mod monitor;
pub mod scalar;
pub mod series_rlc;
pub mod touchstone_spec;
