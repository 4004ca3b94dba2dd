//! Puts the memory.x of the selected board on the linker search path.
//!
//! cortex-m-rt's `link.x` does `INCLUDE memory.x`; the linker finds it through the search path a
//! build script adds with `cargo:rustc-link-search`. A dependency's search path reaches the final
//! link, so a firmware crate only has to depend on this crate with its board feature.

use std::{env, fs, path::PathBuf};

fn main() {
    let mps2 = env::var_os("CARGO_FEATURE_MPS2_AN386").is_some();
    let microbit = env::var_os("CARGO_FEATURE_MICROBIT").is_some();
    let none = env::var_os("CARGO_FEATURE_NO_MEMORY_X").is_some();
    println!("cargo:rerun-if-changed=memory");
    println!("cargo:rerun-if-changed=build.rs");
    if none {
        return;
    }
    let file = match (mps2, microbit) {
        (true, false) => "memory/mps2-an386.x",
        (false, true) => "memory/microbit.x",
        (false, false) => return, // e.g. a host `cargo check`: no link, nothing to provide
        (true, true) => panic!(
            "emu-support: features `mps2-an386` and `microbit` both on; build one firmware per cargo invocation"
        ),
    };
    let out = PathBuf::from(env::var_os("OUT_DIR").expect("cargo sets OUT_DIR"));
    fs::copy(file, out.join("memory.x")).expect("copy memory.x into OUT_DIR");
    println!("cargo:rustc-link-search={}", out.display());
}
