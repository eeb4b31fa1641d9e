//! The model layer: computing only, no formatting, no files, no terminal.
//!
//! [`replay`] feeds a night's merged records through the guards (progress
//! and the verdict rows go to a [`replay::ReplayObserver`] the caller
//! passes); [`series`] is the bounded time series of a replay; [`assess`]
//! judges a rig without logs; [`whatif`] builds variants of a rig and
//! compares their replays; [`charts`] computes the data the charts draw;
//! [`figures`] is a verdict's figures in report units, the one
//! verdict-shaped type the outputs share;
//! [`story`] tells a replay's night at a glance (the headline);
//! [`weigh`] finds a centre of gravity from scale readings. It reads the
//! [`crate::input`] layer and calls the core.

pub mod assess;
pub mod charts;
pub mod figures;
pub mod replay;
pub mod series;
pub mod story;
pub mod weigh;
pub mod whatif;
