//! Puts `memory.x` on the linker search path and tells the code which emulated board it runs on.
use std::{env, fs, path::PathBuf};

fn main() {
    let out = PathBuf::from(env::var_os("OUT_DIR").expect("OUT_DIR set by cargo"));
    fs::write(out.join("memory.x"), include_bytes!("memory.x")).expect("write memory.x");
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rerun-if-changed=memory.x");
    println!("cargo:rerun-if-changed=build.rs");

    println!("cargo::rustc-check-cfg=cfg(board_m0)");
    println!("cargo::rustc-check-cfg=cfg(board_m4f)");
    let target = env::var("TARGET").unwrap_or_default();
    if target.starts_with("thumbv6m-") {
        println!("cargo:rustc-cfg=board_m0");
    } else if target.starts_with("thumbv7em-") {
        println!("cargo:rustc-cfg=board_m4f");
    }
}
