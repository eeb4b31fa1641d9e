//! A replay's level changes and sensor faults as the firmware example's
//! event lines, so a host replay and the emulated board can be compared with
//! `diff` (`firmware-example/ci.sh`).
//!
//! One line per event, in the firmware's format (`firmware-example/src/event.rs`):
//!
//! ```text
//! event t_ms=<u64> kind=fault sensor=<sensor> class=<name>
//! event t_ms=<u64> kind=events_lost count=<u16>
//! event t_ms=<u64> kind=level from=<level> to=<level>
//! ```
//!
//! * `t_ms`: milliseconds since the log's first record (the replay's clock,
//!   [`crate::model::replay`]); the firmware prints its station clock, which is the
//!   log's `t_ms` column, so the two agree for a log that starts at 0 ms.
//! * level names: [`AlertLevel::name`] (`clear`, `watch`, `park_now`, `alarm`,
//!   `sensor_fault`), as the firmware's guard adapter prints them.
//! * fault names: the sensor (`Sensor::code`: `accel`, `wind_speed`,
//!   `wind_direction`, `pose`, `cover`, `air`, `clock`, `model`) and the
//!   [`Fault`] variant in snake case, as the firmware's
//!   `guard_adapter::fault_names`.
//! * a guard starts in `sensor_fault`: no level line before its first change
//!   from there (the firmware's `Replay::guard_events` starts from the same
//!   level).
//! * order: by time; at one time the faults come before the level change
//!   (the firmware prints a step's raised faults, then its level change).
//!
//! Only the first rig of a report is written, and only the kept events
//! ([`crate::model::replay::MAX_KEPT_EVENTS`]); [`lines`] says so in an error when
//! events were not kept rather than writing a shortened list.

use std::fmt::Write as _;

use standfast::guard::AlertLevel;
use standfast::sense::Fault;

use crate::error::Error;
use crate::input::located::InputError;
use crate::model::replay::ReplayReport;
use crate::model::replay::RigReplay;

/// The event-line names of a guard fault: sensor and class.
#[must_use]
pub const fn fault_names(fault: &Fault) -> (&'static str, &'static str) {
    (fault.sensor().code(), fault.class_code())
}

/// Seconds since the first record to whole milliseconds (nearest; the
/// replay's clock counts whole milliseconds, so this only undoes the
/// division by 1000).
fn ms_of(t_s: f64) -> u64 {
    let ms = (t_s * 1000.0).round();
    if ms.is_finite() && ms >= 0.0 {
        // Non-negative and far below 2^53 for any log.
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let m = ms as u64;
        m
    } else {
        0
    }
}

fn level_line(t_ms: u64, from: AlertLevel, to: AlertLevel) -> String {
    format!(
        "event t_ms={t_ms} kind=level from={} to={}",
        from.name(),
        to.name()
    )
}

/// The event lines of one rig's replay, in time order (faults before the
/// level change at one time).
///
/// # Errors
/// [`Error::Input`] when the replay kept only part of its level changes or
/// faults: a shortened list would compare equal to the wrong thing.
pub fn rig_lines(rig: &RigReplay) -> Result<Vec<String>, Error> {
    if rig.level_changes_not_kept > 0 || rig.faults_not_kept > 0 {
        return Err(Error::Input(InputError {
            at: None,
            key: None,
            value: None,
            problem: format!(
                "{}: {} level changes and {} faults were not kept; event lines need them all",
                rig.rig_file, rig.level_changes_not_kept, rig.faults_not_kept
            ),
        }));
    }
    // (time, 0 for a fault and 1 for a level change, sequence) sorts stably.
    let mut keyed: Vec<(u64, u8, usize, String)> = Vec::new();
    for (i, f) in rig.faults.iter().enumerate() {
        let (sensor, class) = fault_names(&f.kind);
        let t = ms_of(f.t_s);
        keyed.push((
            t,
            0,
            i,
            format!("event t_ms={t} kind=fault sensor={sensor} class={class}"),
        ));
    }
    for (i, c) in rig.level_changes.iter().enumerate() {
        let t = ms_of(c.t_s);
        keyed.push((t, 1, i, level_line(t, c.from, c.to)));
    }
    // The firmware prints a step's lost-event count after its faults and
    // before its level change; 0 sorts first among equals, so key it 0 with a
    // sequence after every fault.
    for (i, (t_s, n)) in rig.events_lost_at.iter().enumerate() {
        let t = ms_of(*t_s);
        keyed.push((
            t,
            0,
            rig.faults.len() + i,
            format!("event t_ms={t} kind=events_lost count={n}"),
        ));
    }
    keyed.sort_by_key(|(t, k, i, _)| (*t, *k, *i));
    Ok(keyed.into_iter().map(|(_, _, _, l)| l).collect())
}

/// The first rig's event lines, each ended by a newline.
///
/// # Errors
/// As [`rig_lines`]; [`Error::Input`] for a report without rigs.
pub fn lines(report: &ReplayReport) -> Result<String, Error> {
    let rig = report.rigs.first().ok_or_else(|| {
        Error::Input(InputError {
            at: None,
            key: None,
            value: None,
            problem: "the replay has no rig to write event lines for".to_owned(),
        })
    })?;
    let mut out = String::new();
    for l in rig_lines(rig)? {
        let _ = writeln!(out, "{l}");
    }
    Ok(out)
}
