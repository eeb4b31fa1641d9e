//! Fuzz target: `standfast_sim::fuzzing::rig_file` (see its docs for what is
//! checked). Run: `cargo +nightly fuzz run rig_file` in host-sim/fuzz.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    standfast_sim::fuzzing::rig_file(data);
});
