//! # standfast-sim
//!
//! The host side of Standfast: the `standfast` command and the library
//! behind it, in four layers that depend one way only (DEVELOPERS.md,
//! "The command's layers"):
//!
//! 1. [`input`]: units, located values and errors, the rig file, log
//!    profiles, logs and their merge by time;
//! 2. [`model`]: replay, assessment, what-if variants and their comparison,
//!    chart data, weighing; computing only;
//! 3. [`render`]: text, JSON, CSV, event lines, HTML and SVG; pure
//!    functions of the model's results;
//! 4. [`commands`]: argument parsing, files, the terminal.
//!
//! [`cautions`] sits below them all; [`error`] (the command's error and exit
//! codes, converting from each input module's own error) above [`input`]
//! and below the rest; [`fuzzing`] (entry points for the fuzz targets)
//! above them all.
//!
//! **Caution.** Standfast's numbers are estimates from a simplified static
//! model. Secure the rig anyway, stay inside the mount maker's limits and
//! defer to local codes and licensed engineers.

pub mod cautions;
pub mod commands;
pub mod error;
pub mod fuzzing;
pub mod input;
pub mod model;
pub mod render;

pub use error::{Error, Result};
