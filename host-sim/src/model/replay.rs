//! Replaying a night's logs through the guard.
//!
//! The merged [`SampleRecord`] stream of a [`Merger`] is fed, record by
//! record, through one [`Guard`] per rig, exactly as a controller would feed
//! live samples: only channels with a new value at a record's time become
//! [`Inputs`]. Memory does not grow with the log: per rig the replay keeps
//! the closest approach of each figure, the time per level and (up to
//! [`MAX_KEPT_EVENTS`]) the level changes and faults. The guards, and what
//! the replay keeps of their verdicts, run on a second thread, overlapping
//! the reading of the logs (see [`replay`]).
//!
//! Conversions at the boundary (the log side is SI after the profile):
//! * time: milliseconds since the first record ([`Millis`]);
//! * accelerometer: m/s² in the rig frame → g (divided by standard gravity,
//!   9.806 65 m/s², ISO 80000-3 / CGPM 1901); the guard's tilt processing is
//!   set to samples in g with the identity mounting, because the log profile
//!   already maps sensor axes and counts;
//! * wind: m/s and radians (from, clockwise from north);
//! * pose: axis angles when the log has them, else hour angle, declination
//!   and pier side (tube east when the log gives no side).

use serde::Serialize;
use standfast::guard::{
    AlertCause, AlertLevel, Event, Guard, GuardConfig, Inputs, Verdict, WindSample,
};
use standfast::mount::{PierSide as MountPierSide, Pose};
use standfast::sense::Mounting;
use standfast::sense::{FaultSet, Millis};

use crate::error::Error;
use crate::input::log::{
    Channel, ChannelSet, IssueKind, Merger, PierSide, SampleRecord, Timestamp,
};
use crate::input::rigfile::{after_load_error, LoadedRig};
use crate::input::units::f32_of;
use crate::model::figures::Figures;
use standfast::math::STANDARD_GRAVITY_MPS2_F64;

/// What could not be done when the core refuses a replay's guard (for
/// [`after_load_error`]).
const GUARD_FAILED: &str = "the guard cannot start";

/// Most level changes and faults kept per rig; beyond it only counts grow.
pub const MAX_KEPT_EVENTS: usize = 1000;

/// All guard levels in report order.
pub const LEVELS: [AlertLevel; 5] = [
    AlertLevel::Clear,
    AlertLevel::Watch,
    AlertLevel::ParkNow,
    AlertLevel::Alarm,
    AlertLevel::SensorFault,
];

fn level_index(s: AlertLevel) -> usize {
    match s {
        AlertLevel::Clear => 0,
        AlertLevel::Watch => 1,
        AlertLevel::ParkNow => 2,
        AlertLevel::Alarm => 3,
        AlertLevel::SensorFault => 4,
    }
}

/// Options of a replay.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ReplayOptions {
    /// Write every n-th verdict to the verdict CSV (level changes always);
    /// 1 writes all.
    pub verdicts_every: u64,
}

impl Default for ReplayOptions {
    fn default() -> Self {
        ReplayOptions { verdicts_every: 1 }
    }
}

/// The conditions at a figure's highest value.
///
/// Its JSON object keeps the fields of the figures it shows where they
/// always were (`gust_mps`, `wind_from_deg`, then the pose, `tilt_deg`,
/// `tilt_downhill_deg`, `tip_wind_mps`).
#[derive(Clone, Debug, PartialEq)]
pub struct Approach {
    /// The utilisation (1.0 is the limit), dimensionless.
    pub utilisation: f32,
    /// Time of the record, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// The verdict's figures at that record, in report units.
    pub figures: Figures,
    /// Mount pose of the figures.
    pub pose: Pose,
    /// Alert level at that step.
    pub level: AlertLevel,
    /// Cover state held at that record (`None`: the logs do not say).
    pub cover_fitted: Option<bool>,
}

/// The JSON shape of an [`Approach`]: its figures' gust, direction, tilt
/// and tip wind, in the summary's long-standing order.
#[derive(Serialize)]
struct ApproachJson<'a> {
    utilisation: f32,
    time: &'a str,
    t_s: f64,
    gust_mps: Option<f32>,
    wind_from_deg: Option<f32>,
    pose: &'a Pose,
    tilt_deg: Option<f32>,
    tilt_downhill_deg: Option<f32>,
    tip_wind_mps: Option<f32>,
    level: AlertLevel,
    cover_fitted: Option<bool>,
}

impl Serialize for Approach {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let f = &self.figures;
        ApproachJson {
            utilisation: self.utilisation,
            time: &self.time,
            t_s: self.t_s,
            gust_mps: f.gust_mps,
            wind_from_deg: f.wind_from_deg,
            pose: &self.pose,
            tilt_deg: f.tilt_deg,
            tilt_downhill_deg: f.tilt_downhill_deg,
            tip_wind_mps: f.tip_wind_mps,
            level: self.level,
            cover_fitted: self.cover_fitted,
        }
        .serialize(s)
    }
}

/// The figures and inputs of one evaluation of the physics, kept so that a
/// park request can say what changed (see [`LevelChange::before`]).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Moment {
    /// Seconds since the first record.
    pub t_s: f64,
    /// The verdict's figures, in report units.
    #[serde(flatten)]
    pub figures: Figures,
    /// Cover state held at that record (`None`: the logs do not say).
    pub cover_fitted: Option<bool>,
    /// Mount pose of the figures.
    pub pose: Pose,
}

impl Moment {
    fn of(v: &Verdict, t_s: f64, cover_fitted: Option<bool>) -> Moment {
        Moment {
            t_s,
            figures: Figures::of(v),
            cover_fitted,
            pose: v.pose,
        }
    }
}

/// A pose move counts as a slew (not tracking) when an angle changes by
/// more than this between two evaluations, degrees: sidereal tracking
/// (0.004 2 °/s) takes two minutes for it, longer than the guard's longest
/// evaluation period ([`standfast::guard::MAX_EVALUATE_EVERY_S`], 60 s).
pub const SLEW_DEG: f32 = 0.5;

/// True when pose `b` is a slew away from pose `a`: another pose form or
/// pier side, or an angle more than [`SLEW_DEG`] away.
#[must_use]
pub fn pose_moved(a: &Pose, b: &Pose) -> bool {
    let side = |p: &Pose| match *p {
        Pose::Equatorial { pier_side, .. } | Pose::Horizontal { pier_side, .. } => Some(pier_side),
        Pose::Axes { .. } => None,
    };
    let (fa, a1, a2) = crate::model::series::pose_angles_deg(a);
    let (fb, b1, b2) = crate::model::series::pose_angles_deg(b);
    // A NaN angle is not near, so it counts as moved.
    let near = |d: f32| d.abs() <= SLEW_DEG;
    fa != fb || side(a) != side(b) || !near(a1 - b1) || !near(a2 - b2)
}

/// The guard's thresholds a replay's story quotes, from the rig file.
/// Utilisations dimensionless (1.0 is the limit).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Limits {
    /// Predicted overturning that requests a park.
    pub park_utilisation: f32,
    /// Overturning or sliding that raises the alarm.
    pub alarm_utilisation: f32,
    /// Drive utilisation that requests a park.
    pub drive_park_utilisation: f32,
    /// Tilt margin at or below which the alarm is raised, degrees.
    pub tilt_margin_alarm_deg: f32,
    /// The time the mount takes to park, seconds.
    pub time_to_park_s: f32,
}

impl Limits {
    /// The thresholds of guard configuration `g`.
    #[must_use]
    pub fn of(g: &standfast::guard::GuardConfig) -> Limits {
        Limits {
            park_utilisation: g.park_utilisation,
            alarm_utilisation: g.alarm_utilisation,
            drive_park_utilisation: g.drive_park_utilisation,
            tilt_margin_alarm_deg: g.tilt_margin_alarm_rad.to_degrees(),
            time_to_park_s: g.time_to_park_s,
        }
    }
}

/// A level change seen in the replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LevelChange {
    /// Time, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// Previous level.
    pub from: AlertLevel,
    /// New level.
    pub to: AlertLevel,
    /// What drove it (lower-case name).
    pub cause: String,
    /// The cause itself.
    #[serde(skip)]
    pub cause_kind: AlertCause,
    /// For a step up to `park_now` or `alarm`: the last evaluation before
    /// the change (`None` before the first one, or for other changes).
    #[serde(skip)]
    pub before: Option<Moment>,
    /// For a step up to `park_now` or `alarm`: the verdict of the change.
    #[serde(skip)]
    pub at: Option<Moment>,
    /// For a step up to `park_now` or `alarm`: when the mount last slewed
    /// ([`SLEW_DEG`]) to the pose it held, seconds since the first record
    /// (`None`: it never slewed in the log).
    #[serde(skip)]
    pub pose_since_t_s: Option<f64>,
}

impl LevelChange {
    /// True for a step up to `park_now` or `alarm`: a park request (with
    /// or without the alarm). Leaving `sensor_fault` is not one: the fault
    /// had already requested the park.
    #[must_use]
    pub fn is_park_request(&self) -> bool {
        self.to > self.from && matches!(self.to, AlertLevel::ParkNow | AlertLevel::Alarm)
    }
}

/// A sensor fault raised in the replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FaultSeen {
    /// Time, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// The fault, as the core describes it.
    pub fault: String,
    /// The fault itself (for [`crate::render::event_lines`]).
    #[serde(skip)]
    pub kind: standfast::sense::Fault,
}

/// Time spent in one level.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LevelTime {
    /// The level.
    pub level: AlertLevel,
    /// Seconds spent in it (from one record to the next).
    pub seconds: f64,
}

/// What the replay found for one rig.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RigReplay {
    /// The rig file.
    pub rig_file: String,
    /// Highest overturning utilisation (closest approach to tipping).
    pub overturning: Option<Approach>,
    /// Highest sliding utilisation.
    pub sliding: Option<Approach>,
    /// Highest governing drive utilisation of the primary and secondary axis.
    pub drive: [Option<Approach>; 2],
    /// Time in each level, in the order clear, watch, park_now, alarm,
    /// sensor_fault.
    pub level_time: Vec<LevelTime>,
    /// The most severe level reached once the guard had first judged the
    /// rig: the start-up `sensor_fault` (no readings yet) does not count;
    /// `sensor_fault` when the guard never could judge it.
    pub highest_level: AlertLevel,
    /// The level at the end of the log.
    pub final_level: AlertLevel,
    /// AlertLevel changes, in time order (the first [`MAX_KEPT_EVENTS`]).
    pub level_changes: Vec<LevelChange>,
    /// AlertLevel changes not kept.
    pub level_changes_not_kept: u64,
    /// Sensor faults raised, in time order (the first [`MAX_KEPT_EVENTS`]).
    pub faults: Vec<FaultSeen>,
    /// Faults not kept.
    pub faults_not_kept: u64,
    /// Guard events lost because a step had more than the verdict's
    /// [`standfast::guard::MAX_EVENTS`] (0 normally), and the steps that
    /// lost them: (seconds since the first record, count), the first
    /// [`MAX_KEPT_EVENTS`].
    pub events_lost: u64,
    /// Steps that lost events (for [`crate::render::event_lines`]).
    #[serde(skip)]
    pub events_lost_at: Vec<(f64, u16)>,
    /// Bounded time series for the HTML report (not in the JSON summary).
    #[serde(skip)]
    pub series: crate::model::series::Series,
    /// The rig's thresholds (for the story; not in the JSON summary).
    #[serde(skip)]
    pub limits: Limits,
    /// Intervals `(from, to)` in which the verdict had an active fault,
    /// seconds since the first record, in time order (the first
    /// [`MAX_KEPT_EVENTS`]); one still open at the end of the log ends at
    /// its last record.
    #[serde(skip)]
    pub unhealthy: Vec<(f64, f64)>,
}

/// Count of one kind of log issue.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct IssueCount {
    /// The kind (`malformed row`, `time out of order`, `duplicate time`, `gap`).
    pub kind: String,
    /// How many.
    pub count: u64,
}

/// The result of a replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ReplayReport {
    /// Merged records replayed.
    pub records: u64,
    /// Usable log rows read (all files).
    pub rows: u64,
    /// Time of the first record, ISO 8601 UTC.
    pub start: Option<String>,
    /// Time of the last record, ISO 8601 UTC.
    pub end: Option<String>,
    /// Seconds from the first to the last record.
    pub duration_s: f64,
    /// Log issues by kind.
    pub issues: Vec<IssueCount>,
    /// All log issues.
    pub issues_total: u64,
    /// The first few issues in full (file:line: kind: detail).
    pub first_issues: Vec<String>,
    /// Per rig.
    pub rigs: Vec<RigReplay>,
    /// Local offset east of UTC the logs carry, seconds, for the report's
    /// wall-clock axes (`None`: the logs say none; not in the JSON).
    #[serde(skip)]
    pub local_offset_s: Option<i32>,
}

/// Most issues quoted in full in a report.
pub const FIRST_ISSUES: usize = 10;

/// The three accelerometer channels.
const ACCEL: ChannelSet = ChannelSet::of(&[Channel::AccelX, Channel::AccelY, Channel::AccelZ]);

/// The accelerometer sample of record `r`, in g, when an accelerometer
/// channel is updated at it.
#[inline]
fn accel_g(r: &SampleRecord) -> Option<[f32; 3]> {
    if r.updated.intersects(ACCEL) {
        r.accel_mps2
            .map(|a| a.map(|v| f32_of(v / STANDARD_GRAVITY_MPS2_F64)))
    } else {
        None
    }
}

/// The guard inputs of one merged record: only channels updated at its time.
#[must_use]
#[inline]
pub fn inputs_of(r: &SampleRecord) -> Inputs {
    if r.updated.is_subset(ACCEL) {
        return accel_only_inputs(r);
    }
    inputs_of_any(r)
}

/// [`inputs_of`] for a record that updates no channel but the
/// accelerometer's (the usual record of a fast accelerometer log): the
/// general path's other inputs are `None`.
#[inline(always)]
fn accel_only_inputs(r: &SampleRecord) -> Inputs {
    Inputs {
        accel_raw: accel_g(r),
        ..Inputs::default()
    }
}

/// [`inputs_of`] for any record (the general path).
fn inputs_of_any(r: &SampleRecord) -> Inputs {
    let up = |c: Channel| r.updated.contains(c);
    let accel_raw = accel_g(r);
    let wind = if up(Channel::WindSpeed) || up(Channel::WindDirection) {
        r.wind_speed_mps.map(|s| WindSample {
            speed_mps: f32_of(s),
            from_rad: r.wind_from_rad.map(f32_of),
        })
    } else {
        None
    };
    let axes_up = up(Channel::Axis1Angle) || up(Channel::Axis2Angle);
    let eq_up = up(Channel::HourAngle) || up(Channel::Declination) || up(Channel::PierSide);
    let pose = match (
        r.axis1_rad,
        r.axis2_rad,
        r.hour_angle_rad,
        r.declination_rad,
    ) {
        (Some(a1), Some(a2), _, _) if axes_up => Some(Pose::Axes {
            primary_rad: f32_of(a1),
            secondary_rad: f32_of(a2),
        }),
        (_, _, Some(h), Some(d)) if eq_up => Some(Pose::Equatorial {
            hour_angle_rad: f32_of(h),
            declination_rad: f32_of(d),
            pier_side: match r.pier_side {
                Some(PierSide::West) => MountPierSide::TubeWest,
                _ => MountPierSide::TubeEast,
            },
        }),
        _ => None,
    };
    let cover_fitted = if up(Channel::CoverFitted) {
        r.cover_fitted
    } else {
        None
    };
    let air = if up(Channel::AirTemperature) || up(Channel::Pressure) {
        match (r.air_temperature_k, r.pressure_pa) {
            (Some(t), Some(p)) => Some(standfast::guard::AirSample {
                // Through °C in f32, as the firmware receives it: the same bits.
                temperature_k: standfast::air::celsius_to_kelvin(f32_of(
                    t - standfast::air::ZERO_CELSIUS_K_F64,
                )),
                pressure_pa: f32_of(p),
            }),
            _ => None,
        }
    } else {
        None
    };
    Inputs {
        accel_raw,
        wind,
        pose,
        cover_fitted,
        air,
    }
}

fn millis_since(t: Timestamp, t0: Timestamp) -> Millis {
    let ns = t.unix_ns().saturating_sub(t0.unix_ns()).max(0);
    Millis(u64::try_from(ns / 1_000_000).unwrap_or(0))
}

fn approach(v: &Verdict, u: f32, time: Timestamp, t_s: f64, cover: Option<bool>) -> Approach {
    Approach {
        utilisation: u,
        time: time.to_iso8601(3),
        t_s,
        figures: Figures::of(v),
        pose: v.pose,
        level: v.level,
        cover_fitted: cover,
    }
}

/// Where one verdict is taken: its record's time (UTC and seconds since
/// the first record) and the cover state held then.
#[derive(Clone, Copy)]
struct At {
    time: Timestamp,
    t_s: f64,
    cover: Option<bool>,
}

fn raise(slot: &mut Option<Approach>, u: Option<f32>, v: &Verdict, at: At) {
    let Some(u) = u.filter(|u| u.is_finite()) else {
        return;
    };
    if slot.as_ref().is_none_or(|a| u > a.utilisation) {
        *slot = Some(approach(v, u, at.time, at.t_s, at.cover));
    }
}

/// The bits of the figures a closest approach is kept for: overturning,
/// sliding, drive 1 and 2 (`None` as 2^32, which no `f32`'s bits are).
fn approach_figures(v: &Verdict) -> [u64; 4] {
    let b = |x: Option<f32>| x.map_or(1 << 32, |x| u64::from(x.to_bits()));
    [
        b(v.overturning_utilisation),
        b(v.sliding_utilisation),
        b(v.drive_utilisation.map(|d| d[0])),
        b(v.drive_utilisation.map(|d| d[1])),
    ]
}

/// One rig's running state in a replay.
struct Tracker {
    report: RigReplay,
    level_s: [f64; 5],
    last_level: AlertLevel,
    /// The bits of the figures of the previous step
    /// ([`approach_figures`]; `None` before the first): while they
    /// repeat, as between evaluations, no closest approach can rise, so the
    /// comparisons are skipped.
    last_figures: Option<[u64; 4]>,
    /// The guard has left its start-up `sensor_fault` at least once.
    judged: bool,
    /// The last evaluation (taken only at evaluated steps).
    last_eval: Option<Moment>,
    /// When the mount last slewed, seconds since the first record.
    last_slew_t_s: Option<f64>,
    /// Since when the verdicts have had an active fault, if they have.
    unhealthy_since: Option<f64>,
    /// The last record's time, seconds since the first record.
    last_t_s: f64,
}

impl Tracker {
    fn new(file: &str, guard: &GuardConfig) -> Tracker {
        Tracker {
            report: RigReplay {
                rig_file: file.to_owned(),
                overturning: None,
                sliding: None,
                drive: [None, None],
                level_time: Vec::new(),
                highest_level: AlertLevel::SensorFault,
                final_level: AlertLevel::SensorFault,
                level_changes: Vec::new(),
                level_changes_not_kept: 0,
                faults: Vec::new(),
                faults_not_kept: 0,
                events_lost: 0,
                events_lost_at: Vec::new(),
                series: crate::model::series::Series::with_wind_gap(f64::from(
                    guard.wind.stale_after_s,
                )),
                limits: Limits::of(guard),
                unhealthy: Vec::new(),
            },
            level_s: [0.0; 5],
            // A guard starts unable to see (sensor_fault).
            last_level: AlertLevel::SensorFault,
            last_figures: None,
            judged: false,
            last_eval: None,
            last_slew_t_s: None,
            unhealthy_since: None,
            last_t_s: 0.0,
        }
    }

    /// A level change at `at`; a park request keeps the last evaluation
    /// before it, its own verdict and the time of the last slew.
    fn level_change(
        &mut self,
        v: &Verdict,
        at: At,
        from: AlertLevel,
        to: AlertLevel,
        cause: AlertCause,
    ) {
        let r = &mut self.report;
        if r.level_changes.len() >= MAX_KEPT_EVENTS {
            r.level_changes_not_kept += 1;
            return;
        }
        let mut c = LevelChange {
            time: at.time.to_iso8601(3),
            t_s: at.t_s,
            from,
            to,
            cause: cause.name().to_owned(),
            cause_kind: cause,
            before: None,
            at: None,
            pose_since_t_s: None,
        };
        if c.is_park_request() {
            c.before = self.last_eval;
            c.at = Some(Moment::of(v, at.t_s, at.cover));
            let slewed_now = self
                .last_eval
                .is_some_and(|e| v.evaluated && pose_moved(&e.pose, &v.pose));
            c.pose_since_t_s = if slewed_now {
                Some(at.t_s)
            } else {
                self.last_slew_t_s
            };
        }
        r.level_changes.push(c);
    }

    /// Per record, cheaply: whether the verdict has an active fault.
    fn track_health(&mut self, v: &Verdict, t_s: f64) {
        let active = !v.faults.is_empty();
        match (active, self.unhealthy_since) {
            (true, None) => self.unhealthy_since = Some(t_s),
            (false, Some(from)) => {
                self.unhealthy_since = None;
                if self.report.unhealthy.len() < MAX_KEPT_EVENTS {
                    self.report.unhealthy.push((from, t_s));
                }
            }
            _ => {}
        }
    }

    /// Takes verdict `v` at `at`, `dt_s` seconds after the record before.
    /// The common verdict (between evaluations, no event, the level and
    /// health unchanged) takes only this function's own lines; the rest is
    /// in helpers kept out of line.
    fn take(&mut self, v: &Verdict, at: At, dt_s: f64) {
        if let Some(s) = self.level_s.get_mut(level_index(self.last_level)) {
            *s += dt_s;
        }
        self.last_t_s = at.t_s;
        self.track_health(v, at.t_s);
        // A verdict that did not evaluate repeats the figures of the one
        // before (the core's contract for `Verdict::evaluated`, checked in
        // debug builds), which cannot beat the approaches they set.
        let fresh = v.evaluated || self.last_figures.is_none();
        debug_assert!(fresh || Some(approach_figures(v)) == self.last_figures);
        if fresh {
            self.take_figures(v, at);
        }
        if !v.events.is_empty() {
            self.take_events(v, at);
        }
        // Only at evaluations (the figures are fresh): the moment a later
        // park request compares with, and the slews.
        if v.evaluated {
            self.take_evaluation(v, at);
        }
        if v.events_lost > 0 {
            self.take_events_lost(v, at);
        }
        if v.level != self.last_level {
            self.take_level(v.level);
        }
    }

    /// The figures of a fresh verdict: the closest approaches they raise.
    #[cold]
    #[inline(never)]
    fn take_figures(&mut self, v: &Verdict, at: At) {
        if Some(approach_figures(v)) != self.last_figures {
            let r = &mut self.report;
            self.last_figures = Some(approach_figures(v));
            raise(&mut r.overturning, v.overturning_utilisation, v, at);
            raise(&mut r.sliding, v.sliding_utilisation, v, at);
            for (i, slot) in r.drive.iter_mut().enumerate() {
                raise(
                    slot,
                    v.drive_utilisation.and_then(|d| d.get(i).copied()),
                    v,
                    at,
                );
            }
        }
    }

    /// The level changes and faults of verdict `v`.
    #[cold]
    #[inline(never)]
    fn take_events(&mut self, v: &Verdict, at: At) {
        for e in &v.events {
            match e {
                Event::LevelChanged { from, to, cause } => {
                    self.level_change(v, at, *from, *to, *cause);
                }
                Event::FaultRaised(f) => {
                    let r = &mut self.report;
                    if r.faults.len() < MAX_KEPT_EVENTS {
                        r.faults.push(FaultSeen {
                            time: at.time.to_iso8601(3),
                            t_s: at.t_s,
                            fault: f.to_string(),
                            kind: *f,
                        });
                    } else {
                        r.faults_not_kept += 1;
                    }
                }
                Event::NewHighUtilisation { .. } => {}
            }
        }
    }

    /// An evaluating verdict: the moment a later park request compares
    /// with, and whether the mount slewed since the evaluation before.
    #[cold]
    #[inline(never)]
    fn take_evaluation(&mut self, v: &Verdict, at: At) {
        if self.last_eval.is_some_and(|e| pose_moved(&e.pose, &v.pose)) {
            self.last_slew_t_s = Some(at.t_s);
        }
        self.last_eval = Some(Moment::of(v, at.t_s, at.cover));
    }

    /// Events the verdict had no room for.
    #[cold]
    #[inline(never)]
    fn take_events_lost(&mut self, v: &Verdict, at: At) {
        let r = &mut self.report;
        r.events_lost += u64::from(v.events_lost);
        if r.events_lost_at.len() < MAX_KEPT_EVENTS {
            r.events_lost_at.push((at.t_s, v.events_lost));
        }
    }

    /// A level other than the last verdict's: the most severe level once
    /// the guard has judged the rig. (While the level repeats the most
    /// severe one cannot change: before the first judgement the level is
    /// the start-up `sensor_fault`, which does not count, and after it the
    /// most severe level already includes the repeated one.)
    #[cold]
    #[inline(never)]
    fn take_level(&mut self, level: AlertLevel) {
        let r = &mut self.report;
        if !self.judged && level != AlertLevel::SensorFault {
            self.judged = true;
            r.highest_level = level;
        } else if self.judged {
            r.highest_level = r.highest_level.max(level);
        }
        self.last_level = level;
    }

    fn finish(mut self) -> RigReplay {
        self.report.final_level = self.last_level;
        self.report.level_time = LEVELS
            .iter()
            .zip(self.level_s)
            .map(|(s, seconds)| LevelTime { level: *s, seconds })
            .collect();
        if let Some(from) = self.unhealthy_since {
            if self.report.unhealthy.len() < MAX_KEPT_EVENTS {
                self.report.unhealthy.push((from, self.last_t_s));
            }
        }
        self.report
    }
}

/// How far a replay has come, for a [`ReplayObserver`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Progress {
    /// Merged records read so far.
    pub records: u64,
    /// Share of the logs read so far, 0 to 1, when the logs' total size is
    /// known ([`Merger::fraction_read`]); `None` for streams.
    pub fraction: Option<f64>,
}

/// Records between two progress reports to a [`ReplayObserver`].
pub const PROGRESS_EVERY: u64 = 1 << 16;

/// What a replay hands out as it goes, to whoever runs it (the commands
/// layer draws the progress and writes the verdict CSV).
pub trait ReplayObserver {
    /// How far the replay has come; called every [`PROGRESS_EVERY`]
    /// records, from 0.
    fn progress(&mut self, p: Progress);

    /// Verdict `v` of rig number `rig` (0 for the first) at `time`, `t_s`
    /// seconds since the first record: for every
    /// [`ReplayOptions::verdicts_every`]-th record, and for every record
    /// whose verdict has a level change or fault event, in record order.
    ///
    /// # Errors
    /// Whatever the observer cannot do with it (an output that cannot be
    /// written); the replay stops with it.
    fn verdict(
        &mut self,
        time: Timestamp,
        t_s: f64,
        rig: usize,
        v: &Verdict,
        cover: Option<bool>,
    ) -> Result<(), Error>;

    /// The replay has read and taken every record.
    ///
    /// # Errors
    /// As [`ReplayObserver::verdict`].
    fn finished(&mut self) -> Result<(), Error>;

    /// Whether the observer takes verdicts at all: when it does not,
    /// [`ReplayObserver::verdict`] is never called (it costs a call a record
    /// otherwise). True unless the observer says otherwise.
    fn wants_verdicts(&self) -> bool {
        true
    }
}

/// Records per batch handed from the reading thread to the guard thread.
/// Small enough that the batches in circulation stay in the processor's
/// caches: with 4096 the replay bench took more CPU time and was slower.
const BATCH_RECORDS: usize = 1024;

/// Batches in circulation between the two threads (being filled, waiting,
/// being stepped, or back with the verdicts the observer takes); with
/// [`BATCH_RECORDS`] it fixes the memory of a replay, whatever the log's
/// length.
const BATCHES: usize = 4;

/// One merged record as the guard thread takes it: its time stamp (the
/// guard's clock and the report's times are derived from it there, see
/// [`Clock`]), the guard inputs of the channels updated at it, and the
/// values the time series takes.
#[derive(Clone, Copy, Debug)]
struct Step {
    time: Timestamp,
    inputs: Inputs,
    /// The anemometer's sample at this record, m/s; `None` when the record
    /// has no fresh one (a held value is not a reading, for the charts'
    /// sample statistics).
    wind_speed_mps: Option<f64>,
    /// Cover state held at this record (`None`: the logs do not say).
    cover_fitted: Option<bool>,
}

/// A verdict for the observer ([`ReplayObserver::verdict`]): where it was
/// taken and of which rig (0 for the first).
struct Kept {
    at: At,
    rig: usize,
    verdict: Verdict,
}

/// A batch of consecutive records and, once the guards have stepped
/// through it, the verdicts the observer takes (record by record, rig by
/// rig). The `Vec`s are reused from batch to batch.
struct Batch {
    steps: Vec<Step>,
    kept: Vec<Kept>,
}

/// A record's times relative to the first record (`t0`) and to the one
/// before (`last`), as the guard and the report take them.
struct Clock {
    t0: Timestamp,
    last: Timestamp,
}

impl Clock {
    /// The times of the next record, at `t`: the guard's clock
    /// (milliseconds since the first record, 0 before it), seconds since
    /// the first record, and seconds since the record before (0 for the
    /// first record and when the time went back).
    fn tick(&mut self, t: Timestamp) -> (Millis, f64, f64) {
        let dt_s = t.seconds_since(self.last).max(0.0);
        self.last = t;
        (millis_since(t, self.t0), t.seconds_since(self.t0), dt_s)
    }
}

/// One rig on the guard thread: its guard, whether it takes the log's
/// cover channel, and what the replay keeps of its verdicts.
struct RigRun<'r> {
    guard: Guard<'r>,
    cover_input: bool,
    tracker: Tracker,
    /// The guard's latest verdict, written in place at every step
    /// ([`Guard::step_into`] replaces every field; before the first step it
    /// holds [`blank_verdict`], which is never read).
    verdict: Verdict,
}

impl RigRun<'_> {
    /// Steps the guard at `now` with `inputs` (without the cover state when
    /// the rig does not take it), its verdict written into `self.verdict`,
    /// and takes the verdict into the tracker and its time series: `at` is
    /// the record's time and cover state, `dt_s` the seconds since the
    /// record before, `wind_mps` its fresh anemometer sample. Returns the
    /// verdict.
    fn step_and_take(
        &mut self,
        now: Millis,
        inputs: &Inputs,
        at: At,
        dt_s: f64,
        wind_mps: Option<f64>,
    ) -> &Verdict {
        if self.cover_input || inputs.cover_fitted.is_none() {
            self.guard.step_into(now, inputs, &mut self.verdict);
        } else {
            let without_cover = Inputs {
                cover_fitted: None,
                ..*inputs
            };
            self.guard.step_into(now, &without_cover, &mut self.verdict);
        }
        let v = &self.verdict;
        self.tracker.take(v, at, dt_s);
        self.tracker
            .report
            .series
            .push(at.t_s, v, wind_mps, at.cover);
        v
    }
}

/// A verdict to write into before a guard's first step: no figures, no
/// reading, `sensor_fault` (what a new guard says), a zero pose. Every
/// field is replaced at the first step.
fn blank_verdict() -> Verdict {
    Verdict {
        now: Millis(0),
        level: AlertLevel::SensorFault,
        overturning_utilisation: None,
        predicted_utilisation: None,
        sliding_utilisation: None,
        drive_utilisation: None,
        tip_wind_mps: None,
        gust_mps: None,
        predicted_gust_mps: None,
        wind_from_rad: None,
        tilt: None,
        tilt_margin_rad: None,
        tilt_drift_rad_per_s: 0.0,
        pose: Pose::Axes {
            primary_rad: 0.0,
            secondary_rad: 0.0,
        },
        park_pose: None,
        faults: FaultSet::new(),
        events: standfast::bounded::Vec::new(),
        events_lost: 0,
        evaluated: false,
    }
}

/// Whether verdict `v` has an event the observer always takes: a level
/// change or a fault.
fn has_event(v: &Verdict) -> bool {
    v.events
        .iter()
        .any(|e| !matches!(e, Event::NewHighUtilisation { .. }))
}

/// The guard thread of a replay: steps every rig's guard through the
/// batches in the order sent, keeps what the replay keeps of each verdict
/// (closest approaches, level times and events, the time series) where the
/// verdict is, and sends each batch back with the verdicts the observer
/// takes: with `observe_every` = `Some(k)`, those of every k-th record
/// and those with a level change or fault event ([`has_event`]). Ends when
/// the reading side hangs up.
fn step_guards(
    rigs: &mut [RigRun<'_>],
    observe_every: Option<u64>,
    batches: &std::sync::mpsc::Receiver<Batch>,
    stepped: &std::sync::mpsc::SyncSender<Batch>,
) {
    let mut clock: Option<Clock> = None;
    // Records stepped so far.
    let mut n: u64 = 0;
    for mut b in batches {
        b.kept.clear();
        if let Some(first) = b.steps.first() {
            let clock = clock.get_or_insert(Clock {
                t0: first.time,
                last: first.time,
            });
            for s in &b.steps {
                let (now, t_s, dt_s) = clock.tick(s.time);
                let at = At {
                    time: s.time,
                    t_s,
                    cover: s.cover_fitted,
                };
                for (rig, r) in rigs.iter_mut().enumerate() {
                    let v = r.step_and_take(now, &s.inputs, at, dt_s, s.wind_speed_mps);
                    if let Some(every) = observe_every {
                        if n % every == 0 || has_event(v) {
                            b.kept.push(Kept {
                                at,
                                rig,
                                verdict: v.clone(),
                            });
                        }
                    }
                }
                n += 1;
            }
        }
        if stepped.send(b).is_err() {
            return;
        }
    }
}

/// Hands the verdicts kept in a stepped batch to the observer, in record
/// order.
///
/// # Errors
/// [`Error::Io`] when the verdict CSV cannot be written (at the first
/// line that fails).
fn hand_out(b: &Batch, observer: &mut Option<&mut dyn ReplayObserver>) -> Result<(), Error> {
    if let Some(o) = observer.as_mut() {
        for k in &b.kept {
            o.verdict(k.at.time, k.at.t_s, k.rig, &k.verdict, k.at.cover)?;
        }
    }
    Ok(())
}

/// One guard per rig, started at 0 ms, its tilt processing set to samples
/// in g in the rig frame (the log profile has already mapped sensor axes and
/// counts), with the site's air until the log measures it.
fn start_guards(rigs: &[LoadedRig]) -> Result<Vec<Guard<'_>>, Error> {
    let mut guards: Vec<Guard<'_>> = Vec::with_capacity(rigs.len());
    for r in rigs {
        let mut cfg = r.guard.clone();
        // The log profile has already mapped sensor axes and counts to the
        // rig frame; samples arrive in g.
        cfg.tilt.scale_g_per_count = 1.0;
        cfg.tilt.mounting = Mounting::IDENTITY;
        let mut guard = Guard::new(&r.rig, cfg, Millis(0))
            .map_err(|e| after_load_error(&r.file, GUARD_FAILED, &e))?;
        // The site's air (from its elevation) until the log measures it.
        guard.set_air(r.air);
        guards.push(guard);
    }
    Ok(guards)
}

/// The replay's report once every record is taken: record and row counts,
/// first and last time, log issues, and each rig's findings.
fn report_of(
    merger: &Merger,
    t0: Option<Timestamp>,
    last: Option<Timestamp>,
    trackers: Vec<Tracker>,
) -> ReplayReport {
    let issues = merger.issues();
    ReplayReport {
        records: merger.records(),
        rows: merger.rows(),
        start: t0.map(|t| t.to_iso8601(3)),
        end: last.map(|t| t.to_iso8601(3)),
        duration_s: match (t0, last) {
            (Some(a), Some(b)) => b.seconds_since(a),
            _ => 0.0,
        },
        issues: IssueKind::ALL
            .iter()
            .map(|k| IssueCount {
                kind: k.name().to_owned(),
                count: issues.count(*k),
            })
            .collect(),
        issues_total: issues.total(),
        first_issues: issues
            .kept()
            .iter()
            .take(FIRST_ISSUES)
            .map(ToString::to_string)
            .collect(),
        rigs: trackers.into_iter().map(Tracker::finish).collect(),
        local_offset_s: None,
    }
}

/// Reads the next records into `b` (emptied first) until it holds
/// [`BATCH_RECORDS`] or the merge ends, and tells the observer the
/// progress every [`PROGRESS_EVERY`] records (`n_read` counts the records
/// read). Returns whether the merge has ended: at its end, or at an error,
/// which it puts in `read_error`.
fn fill_batch(
    b: &mut Batch,
    merger: &mut Merger,
    n_read: &mut u64,
    observer: &mut Option<&mut dyn ReplayObserver>,
    read_error: &mut Option<Error>,
) -> bool {
    b.steps.clear();
    while b.steps.len() < BATCH_RECORDS {
        let rec = match merger.next_record_ref() {
            Ok(Some(rec)) => rec,
            Ok(None) => return true,
            Err(e) => {
                *read_error = Some(Error::from(e));
                return true;
            }
        };
        if rec.updated.is_subset(ACCEL) {
            // The usual record, built in place (about 20 instructions less
            // than through `inputs_of`'s two paths): no fresh anemometer
            // sample.
            b.steps.push(Step {
                time: rec.time,
                inputs: accel_only_inputs(rec),
                wind_speed_mps: None,
                cover_fitted: rec.cover_fitted,
            });
        } else {
            b.steps.push(Step {
                time: rec.time,
                inputs: inputs_of_any(rec),
                wind_speed_mps: rec
                    .wind_speed_mps
                    .filter(|_| rec.updated.contains(Channel::WindSpeed)),
                cover_fitted: rec.cover_fitted,
            });
        }
        if *n_read % PROGRESS_EVERY == 0 {
            if let Some(o) = observer.as_mut() {
                o.progress(Progress {
                    records: *n_read,
                    fraction: merger.fraction_read(),
                });
            }
        }
        *n_read += 1;
    }
    false
}

/// Replays the merged stream through one guard per rig.
///
/// `observer`, when given, is told the progress and receives the verdicts
/// (every `options.verdicts_every`-th record per rig, and every record
/// with an event), for a verdict CSV.
///
/// Two threads share the work: this one reads and merges the logs (and
/// hands the observer its verdicts); a second one steps the guards and
/// keeps, verdict by verdict where the guard leaves it, the closest
/// approaches, level times, events and time series. They pass batches of
/// 1 024 records (and back, the verdicts the observer takes) through
/// bounded channels, so memory stays fixed. The results are those of one
/// thread taking every record in turn: the guards step through the same
/// records in the same order, the verdicts are taken and handed out in
/// that order, and a merge error is returned after every record read
/// before it has been taken.
///
/// # Errors
/// [`Error::Input`] when a rig's guard configuration is rejected by the core;
/// the merge's errors ([`Error::Log`], [`Error::Io`]); [`Error::Io`] when the
/// verdict CSV cannot be written.
pub fn replay(
    rigs: &[LoadedRig],
    merger: &mut Merger,
    options: ReplayOptions,
    mut observer: Option<&mut dyn ReplayObserver>,
) -> Result<ReplayReport, Error> {
    use std::sync::mpsc::sync_channel;

    let observe_every = observer
        .as_ref()
        .filter(|o| o.wants_verdicts())
        .map(|_| options.verdicts_every.max(1));
    let mut runs: Vec<RigRun<'_>> = start_guards(rigs)?
        .into_iter()
        .zip(rigs)
        .map(|(guard, r)| RigRun {
            guard,
            cover_input: r.cover_input,
            tracker: Tracker::new(&r.file, &r.guard),
            verdict: blank_verdict(),
        })
        .collect();
    let mut t0: Option<Timestamp> = None;
    let mut last: Option<Timestamp> = None;
    // Records read.
    let mut n_read: u64 = 0;
    // Every batch is at any time in one place only (this thread, a channel
    // or the guard thread), so no channel ever holds more than BATCHES.
    let (to_guards, from_reader) = sync_channel::<Batch>(BATCHES);
    let (to_reader, from_guards) = sync_channel::<Batch>(BATCHES);
    let kept_capacity = if observe_every.is_some() {
        BATCH_RECORDS * runs.len()
    } else {
        0
    };
    let mut spare: Vec<Batch> = (0..BATCHES)
        .map(|_| Batch {
            steps: Vec::with_capacity(BATCH_RECORDS),
            kept: Vec::with_capacity(kept_capacity),
        })
        .collect();
    let mut read_error: Option<Error> = None;
    let mut take_error: Option<Error> = None;
    std::thread::scope(|scope| {
        let runs = &mut runs;
        let worker =
            scope.spawn(move || step_guards(runs, observe_every, &from_reader, &to_reader));
        loop {
            let mut b = match spare.pop() {
                Some(b) => b,
                None => match from_guards.recv() {
                    Ok(b) => b,
                    Err(_) => break,
                },
            };
            if let Err(e) = hand_out(&b, &mut observer) {
                take_error = Some(e);
                break;
            }
            let at_end = fill_batch(&mut b, merger, &mut n_read, &mut observer, &mut read_error);
            if let (Some(first), Some(l)) = (b.steps.first(), b.steps.last()) {
                t0.get_or_insert(first.time);
                last = Some(l.time);
            }
            if !b.steps.is_empty() && to_guards.send(b).is_err() {
                break;
            }
            if at_end {
                break;
            }
        }
        // Hang up, then hand out the batches still on their way, in order.
        drop(to_guards);
        for b in &from_guards {
            if take_error.is_none() {
                if let Err(e) = hand_out(&b, &mut observer) {
                    take_error = Some(e);
                }
            }
        }
        if let Err(p) = worker.join() {
            std::panic::resume_unwind(p);
        }
    });
    // A write error was met at a record before any read error.
    if let Some(e) = take_error.or(read_error) {
        return Err(e);
    }
    if let Some(o) = observer.as_mut() {
        o.finished()?;
    }
    let trackers = runs.into_iter().map(|r| r.tracker).collect();
    Ok(report_of(merger, t0, last, trackers))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Records with every set of updated channels (all 8192), with every
    /// channel holding a value, none, or some (the accelerometer, the pose
    /// and the air incomplete; the axes or the equatorial pose alone; a
    /// west pier side): [`inputs_of`], with its shortcut for a record that
    /// updates the accelerometer alone, gives the general path's inputs
    /// ([`inputs_of_any`], whose outputs the replay's golden tests and the
    /// byte-identical benchmark outputs hold).
    #[test]
    fn inputs_are_the_general_paths_for_every_set_of_updated_channels() {
        let t = Timestamp::from_unix_ns(1_700_000_000_000_000_000);
        let full: [f64; crate::input::log::N_CHANNELS] = [
            0.1, -0.2, 9.8, 7.5, 4.0, 0.3, 0.6, 1.0, 0.2, -0.4, 1.0, 280.0, 95_000.0,
        ];
        let none = [f64::NAN; crate::input::log::N_CHANNELS];
        let mut some = full;
        for i in [1, 6, 9, 12] {
            some[i] = f64::NAN;
        }
        let mut equatorial = full;
        equatorial[8] = f64::NAN;
        equatorial[7] = 0.0;
        let mut axes = full;
        axes[5] = f64::NAN;
        for values in [full, none, some, equatorial, axes] {
            for bits in 0..1_u16 << crate::input::log::N_CHANNELS {
                let mut set = ChannelSet::EMPTY;
                for c in Channel::ALL {
                    if bits & (1 << c.index()) != 0 {
                        set.insert(c);
                    }
                }
                let r = SampleRecord::from_state(
                    t,
                    &values,
                    [Some(t); crate::input::log::N_CHANNELS],
                    set,
                );
                assert_eq!(
                    format!("{:?}", inputs_of(&r)),
                    format!("{:?}", inputs_of_any(&r)),
                    "{bits:#x}"
                );
            }
        }
    }
}
