//! Puts `memory.x` (and an empty `device.x`) where the linker finds it and passes cortex-m-rt's linker
//! script to the binaries, but only for bare-metal targets, so host builds
//! (tests, clippy) are untouched whatever directory cargo runs from.
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
    // cortex-m-rt's `device` feature makes its linker script include
    // `device.x`, where a device crate would give each interrupt a weak
    // handler name; the binary's own `__INTERRUPTS` table points every line
    // at `DefaultHandler` directly, so the file only has to exist.
    if let Err(e) = fs::write(
        out.join("device.x"),
        "/* No per-interrupt handler names: src/bin/mps2_replay.rs, __INTERRUPTS. */\n",
    ) {
        println!("cargo:warning=could not write device.x: {e}");
        std::process::exit(1);
    }
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rustc-link-arg-bins=-Tlink.x");
}
