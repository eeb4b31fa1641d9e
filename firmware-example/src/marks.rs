//! Code-address marks around the guard's step, for instruction counting in
//! the emulator.
//!
//! With the `step-marks` feature (on with `mps2`), [`guard_step_begin`] and
//! [`guard_step_end`] are two small out-of-line functions that the adapter
//! calls just before and just after `Guard::step`. `ci.sh` reads their
//! addresses from the binary's symbol table and hands them to the QEMU
//! plug-in in `qemu-plugin/`, which counts every instruction executed from
//! the entry of the first to the entry of the second: one count per guard
//! step (see the firmware README, "Cost of a guard step"). Each mark is an
//! opaque use of a constant (`core::hint::black_box`), so the compiler keeps
//! the calls, keeps them distinct and moves no memory access of the step
//! across them. Without the feature both are empty and inlined away.
//!
//! A counted step therefore includes the begin mark's own six instructions,
//! the set-up of the step's arguments and the call of the end mark, and
//! excludes the end mark's body.

/// Marks the start of a guard step (see the module docs).
#[cfg(feature = "step-marks")]
#[inline(never)]
pub fn guard_step_begin() {
    core::hint::black_box(0x5354_4201_u32);
}

/// Marks the end of a guard step (see the module docs).
#[cfg(feature = "step-marks")]
#[inline(never)]
pub fn guard_step_end() {
    core::hint::black_box(0x5354_4502_u32);
}

/// Marks the start of a guard step (no-op without `step-marks`).
#[cfg(not(feature = "step-marks"))]
#[inline(always)]
pub fn guard_step_begin() {}

/// Marks the end of a guard step (no-op without `step-marks`).
#[cfg(not(feature = "step-marks"))]
#[inline(always)]
pub fn guard_step_end() {}
