//! Footprint firmware: the bare board (UART, semihosting exit, panic handler), no computation.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
use bench_fw as _;

bench_fw::size_firmware!((), |_: &(), x: [u32; 4]| x);
