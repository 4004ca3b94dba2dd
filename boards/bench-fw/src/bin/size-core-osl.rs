//! Footprint firmware: the bare board plus the core's one-port OSL correction
//! (`calibration::OnePortTerms::new` and `correct`).
#![cfg_attr(target_os = "none", no_std, no_main)]

#[cfg(target_os = "none")]
#[path = "../ops.rs"]
#[allow(dead_code)]
mod ops;

bench_fw::size_firmware!(
    match ops::osl_terms() {
        Some(terms) => terms,
        None => bench_fw::exit(false),
    },
    ops::correct_osl
);
