//! Puts `memory.x` where the linker finds it and passes cortex-m-rt's linker
//! script to the binary, but only for bare-metal targets, so host builds
//! (tests, clippy) are untouched. Same pattern as firmware-example/build.rs.
use std::{env, fs, path::PathBuf};

fn main() {
    println!("cargo:rerun-if-changed=memory.x");
    println!("cargo:rerun-if-changed=build.rs");
    if env::var("CARGO_CFG_TARGET_OS").as_deref() != Ok("none") {
        return;
    }
    let out = PathBuf::from(env::var_os("OUT_DIR").unwrap_or_default());
    if let Err(e) = fs::copy("memory.x", out.join("memory.x")) {
        println!("cargo:warning=could not copy memory.x: {e}");
        std::process::exit(1);
    }
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rustc-link-arg-bins=-Tlink.x");
}
