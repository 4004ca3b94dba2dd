//! Footprint firmware: the bare board plus the core's distance to fault (`dtf::transform_in_place`,
//! Hann window, loss compensation, 1024-point FFT) and its 8 KiB buffer.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
#[path = "../ops.rs"]
#[allow(dead_code)]
mod ops;

bench_fw::size_firmware!((), |c: &(), _x: [u32; 4]| ops::dtf_run(c, [256, 0, 0, 0]));
