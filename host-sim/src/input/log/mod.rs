//! Reading a night's logs: CSV files described by a [`LogProfile`], merged by
//! time into one stream of [`SampleRecord`]s.
//!
//! * Each file has a header row and one time column; the profile maps other
//!   columns to [`Channel`]s with a unit (and an optional scale for raw
//!   counts).
//! * Several files at different rates are merged by time in a streaming
//!   k-way merge: one record per distinct time stamp, each channel holding
//!   its last value until the next. Memory does not grow with the log.
//! * An empty cell means "no new value in this row" (the previous value
//!   holds).
//! * Out-of-order and duplicate time stamps, gaps and malformed rows are
//!   reported with file and line as [`Issue`]s and counted in an
//!   [`IssueLog`]; with [`ErrorPolicy::Stop`] the first bad row ends the
//!   read with [`LogError::Row`], with [`ErrorPolicy::Skip`] the row is
//!   left out and counted. Gaps are counted and reported under both
//!   policies but never stop the read: the rows around a gap are valid.

mod error;
mod fast;
mod merge;
mod profile;
mod record;
mod source;
pub mod time;
pub mod zone;

pub use crate::input::issues::{ErrorPolicy, Issue, IssueKind, IssueLog};
pub use error::LogError;
pub use merge::Merger;
pub use profile::{
    AxisSource, ColumnProfile, ColumnSpec, ColumnsSpec, FileProfile, FileSpec, LogProfile, LogSpec,
    ProfileError, TimeSpec, DEFAULT_GAP_S,
};
pub use record::{Channel, ChannelKind, ChannelSet, PierSide, SampleRecord, N_CHANNELS};
pub use source::{CsvSource, Row};
pub use time::{TimeFormat, Timestamp};
