//! The independent f64 reference model.
//!
//! Written apart from the core and never calling it: each file restates the textbook
//! formulas in f64 so that the host tests compare two independent computations.

pub mod crc32;
pub mod scalar;
