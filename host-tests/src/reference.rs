//! The independent f64 reference model (being written).
