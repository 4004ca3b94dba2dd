//! The independent f64 reference model.
//!
//! Each file here restates textbook formulas in `f64` (with `num-complex` for complex
//! values) and never calls the `feedline` core.

pub mod calibration;
