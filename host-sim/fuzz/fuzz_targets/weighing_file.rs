//! Fuzz target: `standfast_sim::fuzzing::weighing_file` (see its docs for
//! what is checked). Run: `cargo +nightly fuzz run weighing_file` in
//! host-sim/fuzz.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    standfast_sim::fuzzing::weighing_file(data);
});
