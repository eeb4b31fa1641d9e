//! Host tests of the firmware example: the application on mocked and
//! emulated hardware (embedded-hal-mock for the bus and pins).
// Exact float comparisons below are on exactly representable values.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::float_cmp
)]

mod guard_adapter;
mod lines;
mod lis3dh;
mod replay;
mod rig_file;
mod station;
mod wind;
