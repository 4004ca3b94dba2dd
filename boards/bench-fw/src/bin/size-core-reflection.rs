//! Footprint firmware: the bare board plus the core's f32 reflection relations (Gamma -> Reflection).
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
#[path = "../ops.rs"]
#[allow(dead_code)]
mod ops;

bench_fw::size_firmware!((), ops::core_gamma_reflection::<()>);
