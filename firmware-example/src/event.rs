//! Events and their one-line text format.
//!
//! Every event prints as one line:
//!
//! ```text
//! event t_ms=<u64> kind=<name>[ <key>=<value>]...
//! ```
//!
//! Kinds and keys:
//!
//! | kind | keys | meaning |
//! |---|---|---|
//! | `started` | | the station took its first step; both lines are de-energised |
//! | `park_on` / `park_off` | | the park line was de-energised / energised |
//! | `alarm_on` / `alarm_off` | | the alarm line was de-energised / energised |
//! | `fault` | `source=accel\|wind\|vane cause=bus\|device\|config_lost\|stale` | a sensor became unusable |
//! | `fault_cleared` | `source=...` | the sensor has been healthy for the clearing time |
//! | `stage` | `from=<stage> to=<stage>` | the assessment's stage changed (before the first step it counts as `clear`) |
//! | `fault` | `sensor=<name> class=<name>` | the assessment (the guard) raised a sensor fault of its own |
//! | `late` | `gap_ms=<u32>` | more than two periods passed since the previous step |
//! | `line_error` | `line=park\|alarm` | an output pin reported an error; the step is not complete |
//!
//! The same lines come from the emulated board and from a host replay, so
//! the two can be compared with `diff`.

use core::fmt;

/// A sensor the station watches.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Source {
    /// The accelerometer.
    Accel,
    /// The anemometer's pulse latches (wind speed).
    Wind,
    /// The wind-direction vane.
    Vane,
}

impl Source {
    /// Name in event lines.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            Source::Accel => "accel",
            Source::Wind => "wind",
            Source::Vane => "vane",
        }
    }
}

/// Why a sensor became unusable.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Cause {
    /// Bus errors for longer than the sensor's stale limit.
    Bus,
    /// The device is not the expected one.
    Device,
    /// The device lost its configuration.
    ConfigLost,
    /// No fresh reading for longer than the sensor's stale limit.
    Stale,
}

impl Cause {
    /// Name in event lines.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            Cause::Bus => "bus",
            Cause::Device => "device",
            Cause::ConfigLost => "config_lost",
            Cause::Stale => "stale",
        }
    }
}

/// Which output line.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Line {
    /// The park-request line.
    Park,
    /// The alarm line.
    Alarm,
}

/// What happened.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum EventKind {
    /// First step.
    Started,
    /// Park line de-energised (`true`) or energised (`false`).
    Park(bool),
    /// Alarm line de-energised (`true`) or energised (`false`).
    Alarm(bool),
    /// A sensor became unusable.
    Fault(Source, Cause),
    /// A sensor is usable again.
    FaultCleared(Source),
    /// The assessment's stage changed (names as [`crate::Assessment::stage`];
    /// the guard's are [`standfast::guard::AlertLevel::name`]).
    AlertLevel {
        /// The stage before.
        from: &'static str,
        /// The stage now.
        to: &'static str,
    },
    /// The assessment raised a sensor fault of its own (the guard's
    /// [`standfast::guard::Event::FaultRaised`]), named by
    /// [`crate::assess::RaisedFault`].
    AssessFault(crate::assess::RaisedFault),
    /// The assessment lost this many events of one step for lack of room
    /// ([`crate::assess::Assess::events_lost`]).
    EventsLost(u16),
    /// Milliseconds since the previous step, when over two periods.
    Late(u32),
    /// An output pin reported an error.
    LineError(Line),
}

/// An event at a time on the station's clock.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Event {
    /// Milliseconds on the station's clock (the log's clock in a replay).
    pub t_ms: u64,
    /// What happened.
    pub kind: EventKind,
}

impl fmt::Display for Event {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "event t_ms={} kind=", self.t_ms)?;
        match self.kind {
            EventKind::Started => f.write_str("started"),
            EventKind::Park(true) => f.write_str("park_on"),
            EventKind::Park(false) => f.write_str("park_off"),
            EventKind::Alarm(true) => f.write_str("alarm_on"),
            EventKind::Alarm(false) => f.write_str("alarm_off"),
            EventKind::Fault(s, c) => {
                write!(f, "fault source={} cause={}", s.name(), c.name())
            }
            EventKind::FaultCleared(s) => write!(f, "fault_cleared source={}", s.name()),
            EventKind::AlertLevel { from, to } => write!(f, "stage from={from} to={to}"),
            EventKind::AssessFault(r) => {
                write!(f, "fault sensor={} class={}", r.sensor, r.class)
            }
            EventKind::EventsLost(n) => write!(f, "events_lost count={n}"),
            EventKind::Late(gap_ms) => write!(f, "late gap_ms={gap_ms}"),
            EventKind::LineError(Line::Park) => f.write_str("line_error line=park"),
            EventKind::LineError(Line::Alarm) => f.write_str("line_error line=alarm"),
        }
    }
}
