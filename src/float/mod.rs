//! Short f32 elementary functions for the per-reading chain, where libm's full-precision
//! versions cost more than the readings need (one libm `log10f` is about 70 instructions on a
//! Cortex-M4F, several thousand on a Cortex-M0).
//!
//! One file per function; each names its method and its source, states its error bound as a
//! named constant, and carries a table of test vectors under the code.
//!
//! | function | method | error |
//! |---|---|---|
//! | [`log2`](log2::log2) | exponent bits + a fitted atanh series to t⁵ on [√½, √2) | ≤ [`LOG2_MAX_ERROR`](log2::LOG2_MAX_ERROR) absolute |
//!
//! Panic policy: nothing here panics; every input gives a finite output.

pub(crate) mod log2;
