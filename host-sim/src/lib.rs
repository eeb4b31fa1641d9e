//! # standfast-sim
//!
//! The host side of Standfast: the `standfast` command and the library
//! behind it. Quantities with units at the boundary ([`units`]), located
//! validation errors for configuration files ([`located`]), night logs read
//! and merged by time ([`log`]), invented demo data ([`demo_data`]).
//!
//! **Caution.** Standfast's numbers are estimates from a simplified static
//! model. Secure the rig anyway, stay inside the mount maker's limits and
//! defer to local codes and licensed engineers.

pub mod assess;
pub mod bridge;
pub mod cli;
pub mod demo_data;
pub mod error;
pub mod event_lines;
pub mod fuzzing;
pub mod located;
pub mod log;
pub mod output;
pub mod replay;
pub mod report;
pub mod rig_image;
pub mod rigfile;
pub mod starter;
pub mod summary;
pub mod units;
pub mod weigh;
pub mod whatif;

pub use error::{Error, Result};
