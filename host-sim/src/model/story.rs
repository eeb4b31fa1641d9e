//! The night's story: what a reader of a replay wants first.
//!
//! Built from a [`ReplayReport`] (compute only; [`crate::render::summary`]
//! and [`crate::render::report`] draw it). Per rig, in the order told:
//!
//! 1. faults that left the rig unwatched for longer than the rig's time to
//!    park ([`outranks_physics`]);
//! 2. every park request (a step up to `park_now` or `alarm`), with its
//!    cause, the figure against its threshold, and what changed since the
//!    evaluation before it (cover, pose, gust, tilt, wind direction), the
//!    tip wind before and at it;
//! 3. the closest approach to tipping;
//! 4. the other faults.
//!
//! **Unwatched time** of a fault spell (the guard in `sensor_fault`): from
//! the last sample the fault's sensor gave (a stale or stuck sensor's fault
//! says how long it had been silent or unchanged) until the verdicts carried
//! no active fault again. The guard's hold afterwards (healthy inputs for
//! `fault_clear`) is not counted: the readings were back. The spell's whole
//! length is reported beside it.
//!
//! **Why the time to park.** The guard requests a park when the
//! utilisation it predicts for the end of a park (`time_to_park`) reaches
//! its threshold, so each evaluation looks that far ahead; a blind spell
//! shorter than that stays inside the look-ahead of the last evaluation
//! before it, a longer one does not (common practice, no source: the
//! reasoning of this project). A spell that starts the log (no reading yet,
//! the guard's start-up) never outranks the physics; when it lasts the
//! whole log the story says the guard never judged the rig.
//!
//! Times are seconds since the first record and ISO 8601 UTC;
//! utilisations dimensionless (1.0 is the limit); speeds m/s at rig
//! height; angles degrees.

use serde::Serialize;
use standfast::guard::{AlertCause, AlertLevel};
use standfast::mount::Pose;
use standfast::sense::Fault;

use crate::input::log::Timestamp;
use crate::model::replay::{pose_moved, Approach, Limits, Moment, ReplayReport, RigReplay};

/// Beside a cover change or a slew, a gust change smaller than this is not
/// named as a cause, m/s (the text's resolution); alone, any rise is.
pub const GUST_STEP_MPS: f32 = 0.1;
/// A tilt change smaller than this is not named as a cause, degrees.
pub const TILT_STEP_DEG: f32 = 0.05;
/// A change of wind direction smaller than this is not named, degrees.
pub const TURN_STEP_DEG: f32 = 10.0;

/// An input that changed between the evaluation before a park request and
/// the request's own.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "input", rename_all = "snake_case")]
pub enum Change {
    /// The cover was fitted.
    CoverFitted,
    /// The cover was taken off.
    CoverRemoved,
    /// The mount slewed (more than [`crate::model::replay::SLEW_DEG`]).
    Pose {
        /// The pose before.
        from: Pose,
        /// The pose at the request.
        to: Pose,
    },
    /// The gust the figure is computed for rose, m/s at rig height.
    Gust {
        /// Before, m/s.
        from_mps: f32,
        /// At the request, m/s.
        to_mps: f32,
    },
    /// The ground tilt rose, degrees.
    Tilt {
        /// Before, degrees.
        from_deg: f32,
        /// At the request, degrees.
        to_deg: f32,
    },
    /// The wind direction used turned, degrees clockwise from north.
    WindDirection {
        /// Before, degrees.
        from_deg: f32,
        /// At the request, degrees.
        to_deg: f32,
    },
}

/// A park request (a step up to `park_now` or `alarm`).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ParkRequest {
    /// Time, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// Level before.
    pub from: AlertLevel,
    /// Level requested.
    pub to: AlertLevel,
    /// The cause (the guard's name).
    pub cause: String,
    /// The figure the cause names: `predicted_overturning`, `overturning`,
    /// `sliding`, `drive`, `tilt_margin` (`None` for another cause).
    pub figure: Option<&'static str>,
    /// Its value at the request (utilisation, or degrees of tilt margin).
    pub value: Option<f32>,
    /// Its value at the evaluation before.
    pub value_before: Option<f32>,
    /// The threshold it reached (utilisation, or degrees of tilt margin).
    pub threshold: Option<f32>,
    /// What changed since the evaluation before, most telling first.
    pub changed: Vec<Change>,
    /// Tip wind before and at the request, m/s.
    pub tip_wind_before_mps: Option<f32>,
    /// Tip wind at the request, m/s.
    pub tip_wind_mps: Option<f32>,
    /// The gust at the request, m/s at rig height.
    pub gust_mps: Option<f32>,
    /// The gust predicted for the end of a park, m/s at rig height.
    pub predicted_gust_mps: Option<f32>,
    /// Cover state at the request.
    pub cover_fitted: Option<bool>,
    /// Pose at the request.
    pub pose: Option<Pose>,
    /// When the mount last slewed to that pose, seconds since the first
    /// record (`None`: not in the log).
    pub pose_since_t_s: Option<f64>,
    /// The same, ISO 8601 UTC.
    pub pose_since_time: Option<String>,
}

/// The closest approach to tipping, with the alarm threshold for scale.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Closest {
    /// The approach (time, figure and conditions).
    #[serde(flatten)]
    pub approach: Approach,
    /// The alarm threshold, utilisation.
    pub alarm_utilisation: f32,
}

/// A spell of the guard in `sensor_fault`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FaultSpell {
    /// Start, ISO 8601 UTC (the level change, or the first record).
    pub time: String,
    /// Start, seconds since the first record.
    pub t_s: f64,
    /// Seconds in `sensor_fault` (to the end of the log when it did not end).
    pub length_s: f64,
    /// True when it lasted to the end of the log.
    pub open_at_end: bool,
    /// The faults raised in it, as the core describes them.
    pub faults: Vec<String>,
    /// Start of the unwatched time, seconds since the first record.
    pub unwatched_from_t_s: f64,
    /// The same, ISO 8601 UTC (`None` without a readable first time).
    pub unwatched_from_time: Option<String>,
    /// Unwatched time, seconds (module docs).
    pub unwatched_s: f64,
    /// True for the guard's start-up (the spell it starts in).
    pub start_up: bool,
    /// True when it is told before the physics ([`outranks_physics`]).
    pub outranks_physics: bool,
}

/// One item of the story, in the order told.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Told {
    /// A park request.
    ParkRequest(ParkRequest),
    /// The closest approach to tipping.
    ClosestApproach(Closest),
    /// A fault spell.
    Fault(FaultSpell),
}

/// One rig's story.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RigStory {
    /// The rig file.
    pub rig_file: String,
    /// False when the guard never left its start-up `sensor_fault`.
    pub judged: bool,
    /// A fault outranks the physics when it left the rig unwatched for
    /// longer than this, seconds (the rig's time to park).
    pub unwatched_limit_s: f64,
    /// Park requests not in the story (level changes beyond the kept ones).
    pub changes_not_kept: u64,
    /// The items, in the order told.
    pub told: Vec<Told>,
    /// The level at the end of the log.
    pub final_level: AlertLevel,
}

/// The ranking rule: a fault spell is told before the physics when it is
/// not the start-up and left the rig unwatched for longer than `limit_s`.
#[must_use]
pub fn outranks_physics(start_up: bool, unwatched_s: f64, limit_s: f64) -> bool {
    !start_up && unwatched_s > limit_s
}

/// The story of every rig of a replay.
#[must_use]
pub fn tell(rep: &ReplayReport) -> Vec<RigStory> {
    let start = rep.start.clone().unwrap_or_default();
    rep.rigs
        .iter()
        .map(|r| rig_story(r, &start, rep.duration_s))
        .collect()
}

/// `t_s` seconds after the first record `start` (ISO 8601, as the replay
/// writes it), ISO 8601 UTC to the millisecond; `None` when `start` does
/// not read.
fn iso_at(start: &str, t_s: f64) -> Option<String> {
    let t0 = crate::input::log::time::parse_iso8601(start, 0).ok()?;
    Some(Timestamp::from_unix_s(t0.unix_s() + t_s).to_iso8601(3))
}

fn rig_story(r: &RigReplay, start: &str, end_s: f64) -> RigStory {
    let limit_s = f64::from(r.limits.time_to_park_s);
    let spells = fault_spells(r, start, end_s, limit_s);
    let judged =
        !(spells.len() == 1 && spells.first().is_some_and(|s| s.start_up && s.open_at_end));
    let mut told: Vec<Told> = Vec::new();
    let (high, low): (Vec<FaultSpell>, Vec<FaultSpell>) =
        spells.into_iter().partition(|s| s.outranks_physics);
    told.extend(high.into_iter().map(Told::Fault));
    told.extend(
        r.level_changes
            .iter()
            .filter(|c| c.is_park_request())
            .map(|c| Told::ParkRequest(park_request(c, &r.limits, start))),
    );
    if let Some(a) = &r.overturning {
        told.push(Told::ClosestApproach(Closest {
            approach: a.clone(),
            alarm_utilisation: r.limits.alarm_utilisation,
        }));
    }
    told.extend(low.into_iter().map(Told::Fault));
    RigStory {
        rig_file: r.rig_file.clone(),
        judged,
        unwatched_limit_s: limit_s,
        changes_not_kept: r.level_changes_not_kept,
        told,
        final_level: r.final_level,
    }
}

/// The figure a cause names, its value in a moment, and its threshold.
fn figure_of(
    cause: AlertCause,
    to: AlertLevel,
    m: Option<&Moment>,
    l: &Limits,
) -> (Option<&'static str>, Option<f32>, Option<f32>) {
    let f = m.map(|m| m.figures);
    match cause {
        AlertCause::PredictedOverturning => (
            Some("predicted_overturning"),
            f.and_then(|f| f.predicted_utilisation),
            Some(if to == AlertLevel::ParkNow {
                l.park_utilisation
            } else {
                l.alarm_utilisation
            }),
        ),
        AlertCause::Overturning => (
            Some("overturning"),
            f.and_then(|f| f.overturning_utilisation),
            Some(l.alarm_utilisation),
        ),
        AlertCause::Sliding => (
            Some("sliding"),
            f.and_then(|f| f.sliding_utilisation),
            Some(l.alarm_utilisation),
        ),
        AlertCause::Drive => (
            Some("drive"),
            f.and_then(|f| match (f.drive(0), f.drive(1)) {
                (Some(a), Some(b)) => Some(a.max(b)),
                (a, b) => a.or(b),
            }),
            Some(l.drive_park_utilisation),
        ),
        AlertCause::TiltMargin => (
            Some("tilt_margin"),
            f.and_then(|f| f.tilt_margin_deg),
            Some(l.tilt_margin_alarm_deg),
        ),
        _ => (None, None, None),
    }
}

/// What changed from `b` (the evaluation before) to `a` (the request's):
/// cover first, then a slew, the gust the cause's figure uses, the tilt
/// and the wind direction.
#[must_use]
pub fn changes(b: &Moment, a: &Moment, predicted: bool) -> Vec<Change> {
    let mut out = Vec::new();
    match (b.cover_fitted, a.cover_fitted) {
        (Some(true), Some(false)) => out.push(Change::CoverRemoved),
        (Some(false) | None, Some(true)) => out.push(Change::CoverFitted),
        _ => {}
    }
    if pose_moved(&b.pose, &a.pose) {
        out.push(Change::Pose {
            from: b.pose,
            to: a.pose,
        });
    }
    let gust = |m: &Moment| {
        if predicted {
            m.figures.predicted_gust_mps
        } else {
            m.figures.gust_mps
        }
    };
    // Without a cover change or a slew, any rise of the gust is the change
    // (a wind that rises gradually moves it a little per evaluation).
    let step = if out.is_empty() { 0.0 } else { GUST_STEP_MPS };
    if let (Some(x), Some(y)) = (gust(b), gust(a)) {
        if y - x > step || (step > 0.0 && y - x >= step) {
            out.push(Change::Gust {
                from_mps: x,
                to_mps: y,
            });
        }
    }
    if let (Some(x), Some(y)) = (b.figures.tilt_deg, a.figures.tilt_deg) {
        if y - x >= TILT_STEP_DEG {
            out.push(Change::Tilt {
                from_deg: x,
                to_deg: y,
            });
        }
    }
    if let (Some(x), Some(y)) = (b.figures.wind_from_deg, a.figures.wind_from_deg) {
        let d = (y - x).rem_euclid(360.0);
        if d.min(360.0 - d) >= TURN_STEP_DEG {
            out.push(Change::WindDirection {
                from_deg: x.rem_euclid(360.0),
                to_deg: y.rem_euclid(360.0),
            });
        }
    }
    out
}

fn park_request(c: &crate::model::replay::LevelChange, l: &Limits, start: &str) -> ParkRequest {
    let (figure, value, threshold) = figure_of(c.cause_kind, c.to, c.at.as_ref(), l);
    let (_, value_before, _) = figure_of(c.cause_kind, c.to, c.before.as_ref(), l);
    let changed = match (&c.before, &c.at) {
        (Some(b), Some(a)) => changes(b, a, c.cause_kind == AlertCause::PredictedOverturning),
        _ => Vec::new(),
    };
    ParkRequest {
        time: c.time.clone(),
        t_s: c.t_s,
        from: c.from,
        to: c.to,
        cause: c.cause.clone(),
        figure,
        value,
        value_before,
        threshold,
        changed,
        tip_wind_before_mps: c.before.and_then(|m| m.figures.tip_wind_mps),
        tip_wind_mps: c.at.and_then(|m| m.figures.tip_wind_mps),
        gust_mps: c.at.and_then(|m| m.figures.gust_mps),
        predicted_gust_mps: c.at.and_then(|m| m.figures.predicted_gust_mps),
        cover_fitted: c.at.and_then(|m| m.cover_fitted),
        pose: c.at.map(|m| m.pose),
        pose_since_t_s: c.pose_since_t_s,
        pose_since_time: c.pose_since_t_s.and_then(|t| iso_at(start, t)),
    }
}

/// How long before it was raised a fault's sensor had been silent or
/// unchanged, seconds (0 for a fault raised by the sample itself).
fn silent_before_s(f: &Fault) -> f64 {
    #[allow(clippy::cast_precision_loss)] // milliseconds far below 2^53
    match *f {
        Fault::Stale { silent_ms, .. } => silent_ms as f64 / 1000.0,
        Fault::Stuck { unchanged_ms, .. } => unchanged_ms as f64 / 1000.0,
        _ => 0.0,
    }
}

/// The spells of `sensor_fault` from the level changes (the first one from
/// the first record), with their unwatched time.
fn fault_spells(r: &RigReplay, first: &str, end_s: f64, limit_s: f64) -> Vec<FaultSpell> {
    // (start, start time, end, start-up): the guard starts in sensor_fault.
    let mut bounds: Vec<(f64, String, Option<f64>, bool)> = Vec::new();
    let mut open: Option<(f64, String)> = Some((0.0, first.to_owned()));
    let mut start_up = true;
    for c in &r.level_changes {
        if c.to == AlertLevel::SensorFault && open.is_none() {
            open = Some((c.t_s, c.time.clone()));
        } else if c.from == AlertLevel::SensorFault {
            if let Some((t, time)) = open.take() {
                bounds.push((t, time, Some(c.t_s), start_up));
            }
            start_up = false;
        }
    }
    if let Some((t, time)) = open {
        bounds.push((t, time, None, start_up));
    }
    bounds
        .into_iter()
        .map(|(start, time, end, start_up)| {
            let stop = end.unwrap_or(end_s);
            let raised: Vec<&crate::model::replay::FaultSeen> = r
                .faults
                .iter()
                .filter(|f| f.t_s >= start && f.t_s <= stop)
                .collect();
            let from = raised
                .iter()
                .map(|f| f.t_s - silent_before_s(&f.kind))
                .fold(start, f64::min)
                .max(0.0);
            // Until the last interval with an active fault that began in
            // the spell ended (the whole spell when none is known).
            let to = r
                .unhealthy
                .iter()
                .filter(|(a, _)| *a >= start && *a <= stop)
                .map(|(_, b)| *b)
                .fold(None, |m: Option<f64>, b| Some(m.map_or(b, |m| m.max(b))))
                .unwrap_or(stop);
            let unwatched_s = (to - from).max(0.0);
            FaultSpell {
                time,
                t_s: start,
                length_s: stop - start,
                open_at_end: end.is_none(),
                faults: raised.iter().map(|f| f.fault.clone()).collect(),
                unwatched_from_t_s: from,
                unwatched_from_time: iso_at(first, from),
                unwatched_s,
                start_up,
                outranks_physics: outranks_physics(start_up, unwatched_s, limit_s),
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::replay::{FaultSeen, LevelChange};
    use crate::model::series::Series;
    use standfast::sense::Sensor;

    #[test]
    fn a_long_fault_outranks_the_physics_a_short_one_does_not() {
        // The rule of the module docs, against the demo rig's 90 s time to
        // park (host-sim/demo/rig.toml).
        assert!(outranks_physics(false, 90.5, 90.0));
        assert!(!outranks_physics(false, 46.0, 90.0));
        assert!(!outranks_physics(false, 90.0, 90.0));
    }

    #[test]
    fn the_start_up_fault_never_outranks() {
        assert!(!outranks_physics(true, 1e9, 90.0));
        assert!(!outranks_physics(true, 90.5, 90.0));
    }

    fn change(t_s: f64, from: AlertLevel, to: AlertLevel, cause: AlertCause) -> LevelChange {
        LevelChange {
            time: format!("t+{t_s}"),
            t_s,
            from,
            to,
            cause: cause.name().to_owned(),
            cause_kind: cause,
            before: None,
            at: None,
            pose_since_t_s: None,
        }
    }

    fn stale(t_s: f64, silent_ms: u64) -> FaultSeen {
        let kind = Fault::Stale {
            sensor: Sensor::WindSpeed,
            silent_ms,
        };
        FaultSeen {
            time: format!("t+{t_s}"),
            t_s,
            fault: kind.to_string(),
            kind,
        }
    }

    /// An invented night of 3 600 s with a 90 s time to park: the start-up
    /// (60 s), a park request at 1 000 s, and one wind drop-out whose
    /// fault is raised at 2 000 s after `silent_s` of silence and is active
    /// for `active_s`, the guard holding sensor_fault 60 s longer.
    fn night(silent_s: f64, active_s: f64) -> RigReplay {
        use AlertLevel::{ParkNow, SensorFault, Watch};
        let limits_cfg = standfast::guard::GuardConfig {
            time_to_park_s: 90.0,
            ..standfast::guard::GuardConfig::default()
        };
        let end = 2000.0 + active_s + 60.0;
        RigReplay {
            rig_file: "rig.toml".to_owned(),
            overturning: None,
            sliding: None,
            drive: [None, None],
            level_time: Vec::new(),
            highest_level: ParkNow,
            final_level: Watch,
            level_changes: vec![
                change(60.0, SensorFault, Watch, AlertCause::FaultCleared),
                change(1000.0, Watch, ParkNow, AlertCause::PredictedOverturning),
                change(1500.0, ParkNow, Watch, AlertCause::Settled),
                change(2000.0, Watch, SensorFault, AlertCause::SensorFault),
                change(end, SensorFault, Watch, AlertCause::FaultCleared),
            ],
            level_changes_not_kept: 0,
            faults: vec![stale(2000.0, (silent_s * 1000.0) as u64)],
            faults_not_kept: 0,
            events_lost: 0,
            events_lost_at: Vec::new(),
            series: Series::new(),
            limits: Limits::of(&limits_cfg),
            unhealthy: vec![(0.0, 1.0), (2000.0, 2000.0 + active_s)],
        }
    }

    fn kinds(st: &RigStory) -> Vec<&'static str> {
        st.told
            .iter()
            .map(|t| match t {
                Told::ParkRequest(_) => "request",
                Told::ClosestApproach(_) => "closest",
                Told::Fault(f) if f.start_up => "start-up",
                Told::Fault(_) => "fault",
            })
            .collect()
    }

    #[test]
    fn a_short_drop_out_is_told_after_the_park_request() {
        // Silent 15 s before the fault, active 31 s: unwatched 46 s, as the
        // demo night's anemometer gap (03:29:59 to 03:30:45 UTC in its log).
        let st = rig_story(&night(15.0, 31.0), "2025-11-14T21:00:00.000Z", 3600.0);
        assert!(st.judged);
        assert_eq!(kinds(&st), ["request", "start-up", "fault"]);
        let Some(Told::Fault(f)) = st.told.last() else {
            panic!("{st:?}")
        };
        assert!((f.unwatched_s - 46.0).abs() < 1e-9);
        assert!((f.unwatched_from_t_s - 1985.0).abs() < 1e-9);
        // 21:00:00 + 1 985 s = 21:33:05 UTC.
        assert_eq!(
            f.unwatched_from_time.as_deref(),
            Some("2025-11-14T21:33:05.000Z")
        );
        assert!((f.length_s - 91.0).abs() < 1e-9);
        assert!(!f.outranks_physics);
    }

    #[test]
    fn a_long_drop_out_is_told_before_the_park_request() {
        // Silent 15 s, active 80 s: unwatched 95 s, longer than 90 s.
        let st = rig_story(&night(15.0, 80.0), "t0", 3600.0);
        assert_eq!(kinds(&st), ["fault", "request", "start-up"]);
    }

    #[test]
    fn a_start_up_that_never_ends_is_not_judged_and_never_first() {
        let mut r = night(15.0, 31.0);
        r.level_changes.clear();
        r.faults.clear();
        r.unhealthy = vec![(0.0, 3600.0)];
        r.final_level = AlertLevel::SensorFault;
        let st = rig_story(&r, "t0", 3600.0);
        assert!(!st.judged);
        let Some(Told::Fault(f)) = st.told.first() else {
            panic!("{st:?}")
        };
        assert!(f.start_up && f.open_at_end && !f.outranks_physics);
        assert!((f.unwatched_s - 3600.0).abs() < 1e-9);
    }
}
