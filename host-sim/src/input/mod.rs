//! The input layer: what the command reads, checked and located.
//!
//! From the bottom up: [`bounded`] (text quoted in messages), [`units`]
//! (quantities with units at the boundary), [`issues`] (bad log rows),
//! [`error`] (a bad value at a location, a file that cannot be read),
//! [`located`] (values that remember where they were written),
//! [`core_error`] (a core error in a file's terms), [`log`]
//! (log profiles, CSV logs and their merge by time), [`rigfile`] (the rig
//! file). Nothing here computes a verdict, formats a report or knows the
//! command line.

pub mod bounded;
pub mod core_error;
pub mod error;
pub mod issues;
pub mod located;
pub mod log;
pub mod rigfile;
pub mod samples;
pub mod units;
pub mod weighing;
