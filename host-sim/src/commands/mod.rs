//! The commands layer: the command line, files and the terminal.
//!
//! [`cli`] parses the arguments and dispatches to one module per command
//! ([`replay`] for `replay` and `demo`, [`assess`], [`weigh`], [`bridge`],
//! [`rig_image`], [`starter`] for `starter-rig`, and `gen-demo` with
//! [`demo_data`]); [`output`] writes
//! files atomically and never over an input; [`progress`] draws the
//! replay's spinner. It reads through [`crate::input`], computes through
//! [`crate::model`] and formats through [`crate::render`].

pub mod assess;
pub mod bridge;
pub mod cli;
pub mod demo_data;
pub mod options;
pub mod output;
pub mod progress;
pub mod replay;
pub mod rig_image;
pub mod starter;
pub mod weigh;
