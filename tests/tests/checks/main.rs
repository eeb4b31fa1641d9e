//! One test binary, one module per subject. Every expected value names its source.

mod air;
mod backends;
mod fixtures;
mod frame;
mod guard;
mod hardware;
mod mount;
mod sense;
mod stability;
mod torque;
