//! Fuzz target: `standfast_sim::fuzzing::log_profile` (see its docs for what is
//! checked). Run: `cargo +nightly fuzz run log_profile` in host-sim/fuzz.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    standfast_sim::fuzzing::log_profile(data);
});
