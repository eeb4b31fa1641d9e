//! # Link-time proof that the core cannot panic on its main paths
//!
//! Built for `thumbv7em-none-eabihf` with the root Cargo.toml's
//! `panic-proof` profile (fat LTO, one codegen unit, opt-level 3, panics
//! abort, no overflow checks as in release):
//!
//! ```text
//! cargo build -p standfast-panic-proof --target thumbv7em-none-eabihf --profile panic-proof
//! ```
//!
//! The binary calls the core's public entry points listed on
//! [`exercise::exercise`] with inputs read through
//! [`core::ptr::read_volatile`] ([`unknowns`]), so nothing is
//! constant-folded. Its `#[panic_handler]` (standfast-ffi's, with the
//! `link-proof` feature: a bare-metal library must bring one and a binary
//! may have only one) calls `standfast_core_must_not_panic`, a function that
//! is declared but defined nowhere. If any panic (an `unwrap`, an index out of bounds, a slice split,
//! an arithmetic overflow check, a `panic!`) is still reachable after
//! optimisation, the handler is kept and the link fails naming that symbol;
//! a successful link proves that the optimiser found every panic path
//! unreachable from these calls. (The same technique as the `libm` crate's
//! panic check.) The binary is never run.
//!
//! On the host the same calls run once with the stored figures and print how
//! many returned `Ok`, which shows the inputs go down the main paths.
#![cfg_attr(target_os = "none", no_std)]
#![cfg_attr(target_os = "none", no_main)]

pub mod exercise;
pub mod ffi;
pub mod unknowns;

#[cfg(target_os = "none")]
mod target {
    use cortex_m_rt::entry;

    #[entry]
    fn main() -> ! {
        loop {
            core::hint::black_box(crate::exercise::exercise(&crate::unknowns::read()));
        }
    }

    // The panic handler is standfast-ffi's with its `link-proof` feature
    // (a bare-metal library must bring its own, and a binary may have only
    // one): it calls `standfast_core_must_not_panic`, declared there and
    // defined nowhere, so the link fails if a panic path survives
    // optimisation.
}

/// Host run: the same calls once, with the stored figures.
#[cfg(not(target_os = "none"))]
fn main() {
    let t = exercise::exercise(&unknowns::read());
    println!(
        "standfast-panic-proof (host run): {} calls returned Ok, {} returned an error",
        t.ok, t.err
    );
}
