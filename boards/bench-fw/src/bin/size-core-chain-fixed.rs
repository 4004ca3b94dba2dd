//! Footprint firmware: the bare board plus the core's integer chain (ADC codes → measurement
//! with quality verdict, src/fixed/chain.rs, `LinearChain`) and its configuration.
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
#[path = "../ops.rs"]
#[allow(dead_code)]
mod ops;

bench_fw::size_firmware!(
    match ops::fixed_chain() {
        Some(chain) => chain,
        None => bench_fw::exit(false),
    },
    ops::measure_fixed
);
