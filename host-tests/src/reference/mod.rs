//! The independent f64 reference model (being written).
//!
//! Each file is written from textbook formulas and never calls the core crate.

pub mod line_faults;
pub mod series_rlc;
pub mod touchstone_spec;
