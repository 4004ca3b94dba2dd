//! Footprint firmware: the bare board plus naive f32 + micromath scalar chain.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
#[path = "../ops.rs"]
#[allow(dead_code)]
mod ops;

bench_fw::size_firmware!((), ops::naive_micromath::<()>);
