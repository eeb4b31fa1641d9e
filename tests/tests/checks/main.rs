//! One test binary, one module per subject. Every expected value names its source.

mod air;
mod backends;
mod drag;
use standfast_checks::fixtures;
mod frame;
mod guard;
mod guard_failsafe;
mod guard_props;
mod hardware;
mod mount;
mod sense;
mod stability;
mod torque;
mod weighing;
