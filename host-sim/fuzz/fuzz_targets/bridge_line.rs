//! Fuzz target: `standfast_sim::fuzzing::bridge_lines` (see its docs for what is
//! checked). Run: `cargo +nightly fuzz run bridge_line` in host-sim/fuzz.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    standfast_sim::fuzzing::bridge_lines(data);
});
