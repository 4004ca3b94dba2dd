//! The per-reading chain in integer fixed point, for microcontrollers without an FPU
//! (Cortex-M0/M0+ and the like): two detector readings → quality verdict, |Γ|, VSWR, return
//! loss and mismatch loss, plus directivity bounds, matched cable loss and code averaging.
//!
//! Method: every relation is rewritten in base-2 logarithms (table log2 and exp2 with linear
//! interpolation, [`log2`] and [`exp2`]), so that a reading needs no division, no 64-bit
//! arithmetic and no floating point: return loss is a scaled difference of two logarithms,
//! VSWR is 2^(log2(1 + |Γ|) − log2(1 − |Γ|)), mismatch loss a scaled sum of the same two
//! logarithms. For code-reading detectors the logarithms are taken of the exact integers
//! f, r and f ± r, so the result is well conditioned up to a total reflection. The f32 path
//! (`bridge`, `detector`) computes the same quantities with `libm`.
//!
//! Supported detector laws: linear (code ∝ amplitude, [`LinearChain`]), square law
//! (code ∝ power, [`SquareLawChain`]), powers in dBm ([`DbmChain`]) and logarithmic
//! detectors read by an ADC with integer slope and ADC step ([`LogDetectorChain`]). Not
//! supported: complex (phase-aware) readings, detector linearisation tables, temperature
//! correction — those are in the f32 path only.
//!
//! Formats ([`q`]): return loss, mismatch loss and cable loss as [`DbQ16`] (Q16.16 dB),
//! |Γ| as [`GammaQ31`] (Q1.31), VSWR as [`VswrQ16`] (Q16.16), powers as [`DbmQ16`]. Caps as
//! in the f32 path: 100 dB and VSWR 1000.
//!
//! Error bounds against an f64 reference, over the whole input range of every chain (all
//! codes or powers; held by `host-tests/tests/fixed_error_sweep.rs`, which prints the worst
//! error found and where), and the worst errors measured there:
//!
//! | output | stated bound | worst measured (linear / square / dBm / log detector / from \|Γ\|) |
//! |---|---|---|
//! | return loss, 0–50 dB (held over the whole range too) | ±[`RL_BOUND_DB`] = 0.01 dB | 5.0e-4 / 2.5e-4 / 0 (exact) / 6.6e-6 / 2.7e-4 dB |
//! | VSWR up to 20 | ±[`VSWR_BOUND_REL`] = 0.1 % | 0.0071 / 0.0083 / 0.0075 / 0.0064 / 0.0045 % |
//! | mismatch loss, whole range | ±[`ML_BOUND_DB`] = 0.005 dB | 2.7e-4 / 2.5e-4 / 2.5e-4 / 3.5e-4 / 1.4e-4 dB |
//! | \|Γ\| | ±[`GAMMA_BOUND`] = 1e-4 | 4.1e-5 / 2.8e-5 / 1.5e-5 / 1.4e-5 / exact |
//!
//! Every output is also monotonic in the reflected reading, to the last bit (the sweep checks
//! every pair of neighbouring reflected codes for its 25 dense forward codes and every step of
//! its dBm differences; `host-tests/tests/fixed_props.rs` checks random pairs of every chain).
//!
//! Cost: tables of 512 + 520 + 256 bytes ([`log2::LOG2_TABLE_BYTES`],
//! [`exp2::EXP2_TABLE_BYTES`], [`log2::FLOOR_LOG2_TABLE_BYTES`]); per reading four
//! logarithms, two exponentials and a few 16 × 16 multiplies ([`wide`]); no division, no
//! 64-bit arithmetic and no floating point (`host-tests/tests/fixed_no_float.rs` checks the
//! Cortex-M0 machine code). On Armv6-M (release, `opt-level = "s"`) `LinearChain::measure`
//! runs 262 instructions for forward 50 000 / reflected 5 000 codes (`cargo bench-fw`, QEMU
//! `microbit` single-step count, row `chain-fixed`; target ≤ 300), and 225–261 over the
//! inputs of `host-tests/scripts/m0_instruction_count.py`; `SquareLawChain::measure` 239–262
//! there. About 25 of them per logarithm: a byte table gives the leading-bit position in one
//! or two comparisons and a load, and the interpolation tables hold (start, rise) pairs. A
//! refused reading returns in about 20, a total reflection in about 50.
//!
//! Panic policy: nothing in this module panics and no value is NaN or infinite (there are
//! none in integers); bad readings give [`FixedFault`], bad configurations
//! [`FixedConfigError`]. `to_f32` on the types is for display and is not called by the chain.

pub mod average;
pub mod bounds;
pub mod chain;
pub mod exp2;
pub mod log2;
pub mod q;
pub mod relations;
pub mod wide;

pub use average::{mean_of, CodeAverager};
pub use bounds::{matched_cable_loss, CableLoss, DirectivityBounds, ReflectionBounds};
pub use chain::{
    CodeLimits, DbmChain, DbmLimits, FixedConfigError, FixedFault, FixedMeasurement, FixedQuality,
    LinearChain, LogDetectorChain, LogDetectorConfig, SquareLawChain,
};
pub use q::{DbQ16, DbmQ16, GammaQ31, VswrQ16};
pub use relations::{from_gamma, FixedReflection};

/// Stated bound on the return-loss error of every chain, in dB.
pub const RL_BOUND_DB: f32 = 0.01;
/// Stated bound on the relative VSWR error of every chain, for VSWR up to 20.
pub const VSWR_BOUND_REL: f32 = 0.001;
/// Stated bound on the mismatch-loss error of every chain, in dB.
pub const ML_BOUND_DB: f32 = 0.005;
/// Stated bound on the absolute |Γ| error of every chain.
pub const GAMMA_BOUND: f32 = 1.0e-4;
