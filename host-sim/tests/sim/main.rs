//! Library tests of standfast-sim (no command line involved). One module per
//! subject; every check names its outside source beside it.

mod assess_condition;
mod bad_input;
mod bridge;
mod bridge_readme;
mod cli;
mod common;
mod demo;
mod drag_inputs;
mod firmware_replay;
mod fuzz_seeds;
mod golden;
mod hardware_assess;
mod headline;
mod located;
mod log_merge;
mod log_time;
mod readme;
mod real_wind;
mod replay;
mod report;
mod rig_image;
mod rig_reference;
mod rigfile;
mod starter;
mod units;
mod weigh;
mod whatif;
