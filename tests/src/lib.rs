//! Shared pieces of the checks: small rigs ([`fixtures`]) and the guard's
//! trace checker ([`guard_trace`]), used by the test binary and by the core's
//! fuzz target (`core/fuzz`).

pub mod fixtures;
pub mod guard_trace;
