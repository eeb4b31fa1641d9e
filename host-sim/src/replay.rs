//! Replaying a night's logs through the guard.
//!
//! The merged [`SampleRecord`] stream of a [`Merger`] is fed, record by
//! record, through one [`Guard`] per rig, exactly as a controller would feed
//! live samples: only channels with a new value at a record's time become
//! [`Inputs`]. Memory does not grow with the log: per rig the replay keeps
//! the closest approach of each figure, the time per stage and (up to
//! [`MAX_KEPT_EVENTS`]) the stage changes and faults. The guards run on a
//! second thread, overlapping the reading of the logs (see [`replay`]).
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

use std::io::Write;

use serde::Serialize;
use standfast::guard::{Event, Guard, Inputs, Stage, Verdict, WindSample};
use standfast::mount::{PierSide as MountPierSide, Pose};
use standfast::sense::Millis;
use standfast::sense::Mounting;

use crate::error::Error;
use crate::log::{Channel, IssueKind, Merger, PierSide, SampleRecord, Timestamp};
use crate::output::{check_paths, AtomicFile, OwnedFolder, Role};
use crate::rigfile::LoadedRig;

/// Standard gravity, m/s² (ISO 80000-3; 3rd CGPM 1901).
pub const STANDARD_GRAVITY_MPS2: f64 = 9.806_65;

/// Most stage changes and faults kept per rig; beyond it only counts grow.
pub const MAX_KEPT_EVENTS: usize = 1000;

/// All guard stages in report order.
pub const STAGES: [Stage; 5] = [
    Stage::Clear,
    Stage::Watch,
    Stage::ParkNow,
    Stage::Alarm,
    Stage::SensorFault,
];

fn stage_index(s: Stage) -> usize {
    match s {
        Stage::Clear => 0,
        Stage::Watch => 1,
        Stage::ParkNow => 2,
        Stage::Alarm => 3,
        Stage::SensorFault => 4,
    }
}

/// Options of a replay.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ReplayOptions {
    /// Write every n-th verdict to the verdict CSV (stage changes always);
    /// 1 writes all.
    pub verdicts_every: u64,
}

impl Default for ReplayOptions {
    fn default() -> Self {
        ReplayOptions { verdicts_every: 1 }
    }
}

/// The conditions at a figure's highest value.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Approach {
    /// The utilisation (1.0 is the limit), dimensionless.
    pub utilisation: f32,
    /// Time of the record, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// Gust the figures were computed for, m/s at rig height.
    pub gust_mps: Option<f32>,
    /// Wind direction used (from), degrees clockwise from north.
    pub wind_from_deg: Option<f32>,
    /// Mount pose of the figures.
    pub pose: Pose,
    /// Ground tilt, degrees.
    pub tilt_deg: Option<f32>,
    /// Downhill azimuth of the tilt, degrees clockwise from north.
    pub tilt_downhill_deg: Option<f32>,
    /// Wind speed that would tip the rig there, m/s.
    pub tip_wind_mps: Option<f32>,
    /// Stage at that step.
    pub stage: Stage,
}

/// A stage change seen in the replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct StageChange {
    /// Time, ISO 8601 UTC.
    pub time: String,
    /// Seconds since the first record.
    pub t_s: f64,
    /// Previous stage.
    pub from: Stage,
    /// New stage.
    pub to: Stage,
    /// What drove it (lower-case name).
    pub cause: String,
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
    /// The fault itself (for [`crate::event_lines`]).
    #[serde(skip)]
    pub kind: standfast::sense::Fault,
}

/// Time spent in one stage.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct StageTime {
    /// The stage.
    pub stage: Stage,
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
    /// Time in each stage, in the order clear, watch, park_now, alarm,
    /// sensor_fault.
    pub stage_time: Vec<StageTime>,
    /// The most severe stage reached once the guard had first judged the
    /// rig: the start-up `sensor_fault` (no readings yet) does not count;
    /// `sensor_fault` when the guard never could judge it.
    pub highest_stage: Stage,
    /// The stage at the end of the log.
    pub final_stage: Stage,
    /// Stage changes, in time order (the first [`MAX_KEPT_EVENTS`]).
    pub stage_changes: Vec<StageChange>,
    /// Stage changes not kept.
    pub stage_changes_not_kept: u64,
    /// Sensor faults raised, in time order (the first [`MAX_KEPT_EVENTS`]).
    pub faults: Vec<FaultSeen>,
    /// Faults not kept.
    pub faults_not_kept: u64,
    /// Guard events lost because a step had more than the verdict's
    /// [`standfast::guard::MAX_EVENTS`] (0 normally), and the steps that
    /// lost them: (seconds since the first record, count), the first
    /// [`MAX_KEPT_EVENTS`].
    pub events_lost: u64,
    /// Steps that lost events (for [`crate::event_lines`]).
    #[serde(skip)]
    pub events_lost_at: Vec<(f64, u16)>,
    /// Bounded time series for the HTML report (not in the JSON summary).
    #[serde(skip)]
    pub series: crate::report::series::Series,
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

fn core_err(file: &str, e: &standfast::Error) -> Error {
    crate::rigfile::after_load_error(file, "the guard cannot start", e)
}

#[allow(clippy::cast_possible_truncation)] // log values fit f32
fn f32_of(x: f64) -> f32 {
    x as f32
}

/// The guard inputs of one merged record: only channels updated at its time.
#[must_use]
pub fn inputs_of(r: &SampleRecord) -> Inputs {
    let up = |c: Channel| r.updated.contains(c);
    let accel_raw = if up(Channel::AccelX) || up(Channel::AccelY) || up(Channel::AccelZ) {
        r.accel_mps2
            .map(|a| a.map(|v| f32_of(v / STANDARD_GRAVITY_MPS2)))
    } else {
        None
    };
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
                temperature_c: f32_of(t - 273.15),
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

fn approach(v: &Verdict, u: f32, time: Timestamp, t_s: f64) -> Approach {
    Approach {
        utilisation: u,
        time: time.to_iso8601(3),
        t_s,
        gust_mps: v.gust_mps,
        wind_from_deg: v.wind_from_rad.map(f32::to_degrees),
        pose: v.pose,
        tilt_deg: v.tilt.map(|t| t.magnitude_rad.to_degrees()),
        tilt_downhill_deg: v.tilt.map(|t| t.downhill_azimuth_rad.to_degrees()),
        tip_wind_mps: v.tip_wind_mps,
        stage: v.stage,
    }
}

fn raise(slot: &mut Option<Approach>, u: Option<f32>, v: &Verdict, time: Timestamp, t_s: f64) {
    let Some(u) = u.filter(|u| u.is_finite()) else {
        return;
    };
    if slot.as_ref().is_none_or(|a| u > a.utilisation) {
        *slot = Some(approach(v, u, time, t_s));
    }
}

/// One rig's running state in a replay.
struct Tracker {
    report: RigReplay,
    stage_s: [f64; 5],
    last_stage: Stage,
    /// The figures of the previous step (overturning, sliding, drive 1 and
    /// 2): while they repeat, as between evaluations, no closest approach
    /// can rise, so the comparisons are skipped.
    last_figures: [Option<f32>; 4],
    /// The guard has left its start-up `sensor_fault` at least once.
    judged: bool,
}

impl Tracker {
    fn new(file: &str, wind_gap_s: f64) -> Tracker {
        Tracker {
            report: RigReplay {
                rig_file: file.to_owned(),
                overturning: None,
                sliding: None,
                drive: [None, None],
                stage_time: Vec::new(),
                highest_stage: Stage::SensorFault,
                final_stage: Stage::SensorFault,
                stage_changes: Vec::new(),
                stage_changes_not_kept: 0,
                faults: Vec::new(),
                faults_not_kept: 0,
                events_lost: 0,
                events_lost_at: Vec::new(),
                series: crate::report::series::Series::with_wind_gap(wind_gap_s),
            },
            stage_s: [0.0; 5],
            // A guard starts unable to see (sensor_fault).
            last_stage: Stage::SensorFault,
            last_figures: [None; 4],
            judged: false,
        }
    }

    fn take(&mut self, v: &Verdict, time: Timestamp, t_s: f64, dt_s: f64) {
        if let Some(s) = self.stage_s.get_mut(stage_index(self.last_stage)) {
            *s += dt_s;
        }
        let r = &mut self.report;
        let figures = [
            v.overturning_utilisation,
            v.sliding_utilisation,
            v.drive_utilisation.map(|d| d[0]),
            v.drive_utilisation.map(|d| d[1]),
        ];
        // Equal (and not NaN) figures cannot beat the approach they set.
        if figures != self.last_figures {
            self.last_figures = figures;
            raise(&mut r.overturning, v.overturning_utilisation, v, time, t_s);
            raise(&mut r.sliding, v.sliding_utilisation, v, time, t_s);
            for (i, slot) in r.drive.iter_mut().enumerate() {
                raise(
                    slot,
                    v.drive_utilisation.and_then(|d| d.get(i).copied()),
                    v,
                    time,
                    t_s,
                );
            }
        }
        for e in &v.events {
            match e {
                Event::StageChanged { from, to, cause } => {
                    if r.stage_changes.len() < MAX_KEPT_EVENTS {
                        r.stage_changes.push(StageChange {
                            time: time.to_iso8601(3),
                            t_s,
                            from: *from,
                            to: *to,
                            cause: cause.name().to_owned(),
                        });
                    } else {
                        r.stage_changes_not_kept += 1;
                    }
                }
                Event::FaultRaised(f) => {
                    if r.faults.len() < MAX_KEPT_EVENTS {
                        r.faults.push(FaultSeen {
                            time: time.to_iso8601(3),
                            t_s,
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
        if v.events_lost > 0 {
            r.events_lost += u64::from(v.events_lost);
            if r.events_lost_at.len() < MAX_KEPT_EVENTS {
                r.events_lost_at.push((t_s, v.events_lost));
            }
        }
        if !self.judged && v.stage != Stage::SensorFault {
            self.judged = true;
            r.highest_stage = v.stage;
        } else if self.judged {
            r.highest_stage = r.highest_stage.max(v.stage);
        }
        r.final_stage = v.stage;
        self.last_stage = v.stage;
    }

    fn finish(mut self) -> RigReplay {
        self.report.stage_time = STAGES
            .iter()
            .zip(self.stage_s)
            .map(|(s, seconds)| StageTime { stage: *s, seconds })
            .collect();
        self.report
    }
}

const VERDICT_HEADER: &str = "time,t_s,rig,stage,overturning_utilisation,predicted_utilisation,sliding_utilisation,drive1_utilisation,drive2_utilisation,tip_wind_mps,gust_mps,predicted_gust_mps,wind_from_deg,tilt_deg,tilt_margin_deg,faults,cover,pose_frame,pose_a_deg,pose_b_deg,pier_side\n";

/// The pose columns of the verdict CSV: frame, its two angles in degrees
/// (hour angle and declination; azimuth and altitude; primary and
/// secondary axis angles) and the pier side (empty for axis angles).
fn pose_columns(p: &Pose) -> (&'static str, f32, f32, &'static str) {
    let side = |s: MountPierSide| match s {
        MountPierSide::TubeEast => "tube_east",
        MountPierSide::TubeWest => "tube_west",
    };
    match *p {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => (
            "axes",
            primary_rad.to_degrees(),
            secondary_rad.to_degrees(),
            "",
        ),
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            pier_side,
        } => (
            "equatorial",
            hour_angle_rad.to_degrees(),
            declination_rad.to_degrees(),
            side(pier_side),
        ),
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            pier_side,
        } => (
            "horizontal",
            azimuth_rad.to_degrees(),
            altitude_rad.to_degrees(),
            side(pier_side),
        ),
    }
}

fn opt(v: Option<f32>) -> String {
    v.map_or_else(String::new, |x| format!("{x:.4}"))
}

fn write_verdict(
    w: &mut dyn Write,
    time: Timestamp,
    t_s: f64,
    rig: usize,
    v: &Verdict,
    cover: Option<bool>,
) -> std::io::Result<()> {
    let d = |i: usize| v.drive_utilisation.and_then(|d| d.get(i).copied());
    let (frame, a_deg, b_deg, side) = pose_columns(&v.pose);
    writeln!(
        w,
        "{},{t_s:.3},{rig},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{frame},{a_deg:.4},{b_deg:.4},{side}",
        time.to_iso8601(3),
        v.stage.name(),
        opt(v.overturning_utilisation),
        opt(v.predicted_utilisation),
        opt(v.sliding_utilisation),
        opt(d(0)),
        opt(d(1)),
        opt(v.tip_wind_mps),
        opt(v.gust_mps),
        opt(v.predicted_gust_mps),
        opt(v.wind_from_rad.map(f32::to_degrees)),
        opt(v.tilt.map(|t| t.magnitude_rad.to_degrees())),
        opt(v.tilt_margin_rad.map(f32::to_degrees)),
        v.faults.len(),
        match cover {
            Some(true) => "fitted",
            Some(false) => "off",
            None => "",
        },
    )
}

/// Records between two updates of the progress bar.
const PROGRESS_EVERY: u64 = 1 << 16;

/// A spinner on standard error counting records, drawn only when standard
/// error is a terminal.
fn progress_bar() -> indicatif::ProgressBar {
    use std::io::IsTerminal;
    let target = if std::io::stderr().is_terminal() {
        indicatif::ProgressDrawTarget::stderr()
    } else {
        indicatif::ProgressDrawTarget::hidden()
    };
    let pb = indicatif::ProgressBar::with_draw_target(None, target);
    pb.set_style(
        indicatif::ProgressStyle::with_template(
            "{spinner} replaying: {human_pos} records, {per_sec}, {elapsed}",
        )
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_spinner()),
    );
    pb
}

/// Records per batch handed from the reading thread to the guard thread.
/// Small enough that the batches in circulation with their verdicts (about
/// 400 bytes each on x86-64) stay in the processor's caches: with 4096 the
/// replay bench took more CPU time and was slower.
const BATCH_RECORDS: usize = 1024;

/// Batches in circulation between the two threads (being filled, waiting,
/// being stepped, or back with their verdicts); with [`BATCH_RECORDS`] it
/// fixes the memory of a replay, whatever the log's length.
const BATCHES: usize = 4;

/// One merged record as the replay uses it: its time in the units the
/// replay needs, the guard inputs of the channels updated at it, and the
/// held values the time series takes.
#[derive(Clone, Copy, Debug)]
struct Step {
    time: Timestamp,
    now: Millis,
    t_s: f64,
    dt_s: f64,
    inputs: Inputs,
    wind_speed_mps: Option<f64>,
    cover_fitted: Option<bool>,
}

/// A batch of consecutive records and, once the guards have stepped
/// through it, their verdicts (record by record, rig by rig). The `Vec`s
/// are reused from batch to batch.
struct Batch {
    steps: Vec<Step>,
    verdicts: Vec<Verdict>,
}

/// The guard thread of a replay: steps every guard through the batches in
/// the order sent and sends each batch back with its verdicts. Ends when
/// the reading side hangs up.
fn step_guards(
    guards: &mut [Guard<'_>],
    batches: &std::sync::mpsc::Receiver<Batch>,
    stepped: &std::sync::mpsc::SyncSender<Batch>,
) {
    for mut b in batches {
        b.verdicts.clear();
        for s in &b.steps {
            for g in guards.iter_mut() {
                b.verdicts.push(g.step(s.now, &s.inputs));
            }
        }
        if stepped.send(b).is_err() {
            return;
        }
    }
}

/// What the replay keeps of a stepped batch, in record order: closest
/// approaches, stage times and events, the time series and the verdict
/// CSV. `n` counts the records taken so far.
///
/// # Errors
/// [`Error::Io`] when the verdict CSV cannot be written (at the first
/// line that fails, as records are taken in order).
fn take_batch(
    b: &Batch,
    trackers: &mut [Tracker],
    n: &mut u64,
    every: u64,
    verdicts: &mut Option<(&mut dyn Write, &str)>,
) -> Result<(), Error> {
    let mut vs = b.verdicts.iter();
    for s in &b.steps {
        for (i, tr) in trackers.iter_mut().enumerate() {
            let Some(v) = vs.next() else {
                return Ok(());
            };
            tr.take(v, s.time, s.t_s, s.dt_s);
            tr.report
                .series
                .push(s.t_s, v, s.wind_speed_mps, s.cover_fitted);
            if let Some((w, name)) = verdicts.as_mut() {
                let has_event = v
                    .events
                    .iter()
                    .any(|e| !matches!(e, Event::NewHighUtilisation { .. }));
                if *n % every == 0 || has_event {
                    write_verdict(&mut **w, s.time, s.t_s, i, v, s.cover_fitted)
                        .map_err(|e| Error::io(*name, e))?;
                }
            }
        }
        *n += 1;
    }
    Ok(())
}

/// Replays the merged stream through one guard per rig.
///
/// `verdicts`, when given, receives a CSV of verdicts (every
/// `options.verdicts_every`-th record per rig, and every record with an
/// event); `verdicts_name` names it in I/O errors.
///
/// Two threads share the work: this one reads and merges the logs and
/// keeps the closest approaches, stage times, events, time series and
/// verdict CSV; a second one steps the guards. They pass batches of
/// 1 024 records (and back, their verdicts) through bounded
/// channels, so memory stays fixed. The results are those of one thread
/// taking every record in turn: the guards step through the same records
/// in the same order, the verdicts are taken in that order, and a merge
/// error is returned after every record read before it has been taken.
///
/// # Errors
/// [`Error::Input`] when a rig's guard configuration is rejected by the core;
/// the merge's errors ([`Error::Log`], [`Error::Io`]); [`Error::Io`] when the
/// verdict CSV cannot be written.
pub fn replay(
    rigs: &[LoadedRig],
    merger: &mut Merger,
    options: ReplayOptions,
    mut verdicts: Option<(&mut dyn Write, &str)>,
) -> Result<ReplayReport, Error> {
    use std::sync::mpsc::sync_channel;

    let every = options.verdicts_every.max(1);
    if let Some((w, name)) = verdicts.as_mut() {
        w.write_all(VERDICT_HEADER.as_bytes())
            .map_err(|e| Error::io(*name, e))?;
    }
    let mut guards: Vec<Guard<'_>> = Vec::with_capacity(rigs.len());
    for r in rigs {
        let mut cfg = r.guard.clone();
        // The log profile has already mapped sensor axes and counts to the
        // rig frame; samples arrive in g.
        cfg.tilt.scale_g_per_count = 1.0;
        cfg.tilt.mounting = Mounting::IDENTITY;
        let mut guard = Guard::new(&r.rig, cfg, Millis(0)).map_err(|e| core_err(&r.file, &e))?;
        // The site's air (from its elevation) until the log measures it.
        guard.set_air(r.air);
        guards.push(guard);
    }
    let mut trackers: Vec<Tracker> = rigs
        .iter()
        .map(|r| Tracker::new(&r.file, f64::from(r.guard.wind.stale_after_s)))
        .collect();
    let mut t0: Option<Timestamp> = None;
    let mut last: Option<Timestamp> = None;
    // Records read, and records whose verdicts were taken.
    let mut n_read: u64 = 0;
    let mut n_taken: u64 = 0;
    let progress = progress_bar();
    // Every batch is at any time in one place only (this thread, a channel
    // or the guard thread), so no channel ever holds more than BATCHES.
    let (to_guards, from_reader) = sync_channel::<Batch>(BATCHES);
    let (to_reader, from_guards) = sync_channel::<Batch>(BATCHES);
    let mut spare: Vec<Batch> = (0..BATCHES)
        .map(|_| Batch {
            steps: Vec::with_capacity(BATCH_RECORDS),
            verdicts: Vec::with_capacity(BATCH_RECORDS * guards.len()),
        })
        .collect();
    let mut read_error: Option<Error> = None;
    let mut take_error: Option<Error> = None;
    std::thread::scope(|scope| {
        let guards = &mut guards;
        let worker = scope.spawn(move || step_guards(guards, &from_reader, &to_reader));
        loop {
            let mut b = match spare.pop() {
                Some(b) => b,
                None => match from_guards.recv() {
                    Ok(b) => b,
                    Err(_) => break,
                },
            };
            if let Err(e) = take_batch(&b, &mut trackers, &mut n_taken, every, &mut verdicts) {
                take_error = Some(e);
                break;
            }
            b.steps.clear();
            let mut at_end = false;
            while b.steps.len() < BATCH_RECORDS {
                let rec = match merger.next_record() {
                    Ok(Some(rec)) => rec,
                    Ok(None) => {
                        at_end = true;
                        break;
                    }
                    Err(e) => {
                        read_error = Some(e);
                        at_end = true;
                        break;
                    }
                };
                if n_read % PROGRESS_EVERY == 0 {
                    progress.set_position(n_read);
                }
                let start = *t0.get_or_insert(rec.time);
                let dt_s = last.map_or(0.0, |l| rec.time.seconds_since(l).max(0.0));
                last = Some(rec.time);
                b.steps.push(Step {
                    time: rec.time,
                    now: millis_since(rec.time, start),
                    t_s: rec.time.seconds_since(start),
                    dt_s,
                    inputs: inputs_of(&rec),
                    // Only a fresh anemometer sample counts for the charts'
                    // sample statistics (a held value is not a reading).
                    wind_speed_mps: rec
                        .wind_speed_mps
                        .filter(|_| rec.updated.contains(Channel::WindSpeed)),
                    cover_fitted: rec.cover_fitted,
                });
                n_read += 1;
            }
            if !b.steps.is_empty() && to_guards.send(b).is_err() {
                break;
            }
            if at_end {
                break;
            }
        }
        // Hang up, then take the batches still on their way, in order.
        drop(to_guards);
        for b in &from_guards {
            if take_error.is_none() {
                if let Err(e) = take_batch(&b, &mut trackers, &mut n_taken, every, &mut verdicts) {
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
    progress.finish_and_clear();
    if let Some((w, name)) = verdicts.as_mut() {
        w.flush().map_err(|e| Error::io(*name, e))?;
    }
    let issues = merger.issues();
    Ok(ReplayReport {
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
    })
}

/// Arguments of `replay`.
#[derive(Debug, clap::Args)]
pub struct ReplayArgs {
    /// Rig file (TOML); repeat for several rigs on the same logs, each with
    /// its own guard.
    #[arg(long = "rig", value_name = "RIG.toml", required = true)]
    pub rigs: Vec<std::path::PathBuf>,
    /// Log profile (a TOML file with a `[log]` section). Default: the
    /// `[log]` section of the first rig file.
    #[arg(long, value_name = "PROFILE.toml")]
    pub profile: Option<std::path::PathBuf>,
    /// Log files replacing the profile's `[[log.file]]` paths, in the
    /// profile's order (as many as it lists). Default: the profile's paths.
    #[arg(value_name = "LOGS")]
    pub logs: Vec<std::path::PathBuf>,
    /// Print the summary as JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Write the guard's verdicts as CSV to this file.
    #[arg(long, value_name = "FILE")]
    pub verdicts: Option<std::path::PathBuf>,
    /// With --verdicts: write every N-th record (records with a stage change
    /// or fault always).
    #[arg(long, value_name = "N", default_value_t = 1, requires = "verdicts",
          value_parser = clap::value_parser!(u64).range(1..))]
    pub every: u64,
    /// Also write a self-contained HTML report with charts to this file.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
    /// What to do with a bad log row (malformed, out of order, duplicate):
    /// `stop` at the first one (exit 1, the rows before it replayed), or
    /// `skip` it, report and count it. Overrides the profile's `on_error`.
    #[arg(long, value_name = "POLICY", value_parser = ["stop", "skip"])]
    pub on_error: Option<String>,
    /// Also replay a variant of the first rig with this override, side by
    /// side (repeatable; all apply to one variant): ballast=MASS@X,Y,Z,
    /// cover=on|off|as-logged, watch_utilisation=, park_utilisation=,
    /// alarm_utilisation=, time_to_park=, friction=, tie_down=.
    #[arg(long = "what-if", value_name = "KEY=VALUE")]
    pub what_if: Vec<String>,
    /// Write the first rig's stage changes and faults as the firmware
    /// example's event lines to this file (see `event_lines`).
    #[arg(long, value_name = "FILE")]
    pub events: Option<std::path::PathBuf>,
}

/// Arguments of `demo`.
#[derive(Debug, clap::Args)]
pub struct DemoArgs {
    /// Folder for the invented night's logs, profile, rig file, verdicts and
    /// report (created if missing; about 66 MB for the whole night). Default:
    /// `standfast-demo` in cargo's target folder when the command runs from
    /// one (`cargo run`), else `standfast-demo` in the current folder; the
    /// command prints the folder it used. Files of the same names are
    /// replaced only when standfast wrote them and they are unchanged,
    /// unless --replace is given.
    #[arg(long, value_name = "DIR")]
    pub out: Option<std::path::PathBuf>,
    /// Replace files of the same names in the --out folder even when
    /// standfast did not write them (for example your own rig.toml).
    #[arg(long)]
    pub replace: bool,
    /// Seed of the invented night.
    #[arg(long, default_value_t = 2025)]
    pub seed: u64,
    /// Length of the night: hours, or a time with a unit ("90 min"); more
    /// than 0, up to 9 h (default: the whole invented night, 9 h); shorter
    /// nights replay faster.
    #[arg(long, value_name = "H", allow_hyphen_values = true)]
    pub hours: Option<String>,
    /// Print the summary as JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

/// Accepted length of the demo night.
pub const DEMO_HOURS: crate::cli::OptionRange = crate::cli::OptionRange {
    lo: 0.0,
    hi: 9.0,
    lo_open: true,
    unit: "h",
};

/// The files `standfast demo` writes into its folder.
pub const DEMO_FILES: [&str; 7] = [
    crate::demo_data::DEMO_WIND_CSV,
    crate::demo_data::DEMO_ACCEL_CSV,
    crate::demo_data::DEMO_MOUNT_CSV,
    crate::demo_data::DEMO_PROFILE_TOML,
    "rig.toml",
    "verdicts.csv",
    "report.html",
];

/// The demo rig file (invented), as shipped in `host-sim/demo/rig.toml`.
pub const DEMO_RIG_TOML: &str = include_str!("../demo/rig.toml");

/// Opens the merge of a profile, with the profile's paths optionally
/// replaced by `logs`.
///
/// # Errors
/// [`Error::Input`] when the count of `logs` does not match the profile;
/// the merge's errors.
pub fn open_logs(profile: &std::path::Path, logs: &[std::path::PathBuf]) -> Result<Merger, Error> {
    open_logs_with(profile, logs, None)
}

/// As [`open_logs`], with the profile's bad-row policy replaced by `policy`
/// when given.
///
/// # Errors
/// As [`open_logs`].
pub fn open_logs_with(
    profile: &std::path::Path,
    logs: &[std::path::PathBuf],
    policy: Option<crate::log::ErrorPolicy>,
) -> Result<Merger, Error> {
    let p = load_profile(profile, logs)?;
    Merger::open(&p, policy.unwrap_or(p.on_error))
}

/// Reads a log profile and replaces its files' paths by `logs` when given.
///
/// # Errors
/// [`Error::Input`] when the count of `logs` does not match the profile;
/// the profile's errors.
pub fn load_profile(
    profile: &std::path::Path,
    logs: &[std::path::PathBuf],
) -> Result<crate::log::LogProfile, Error> {
    let mut p = crate::log::LogProfile::load(profile)?;
    if !logs.is_empty() {
        if logs.len() != p.files.len() {
            return Err(Error::Usage(format!(
                "{} log files given on the command line but the profile {} lists {} \
                 (give as many as it lists, in its order, or none)",
                logs.len(),
                profile.display(),
                p.files.len()
            )));
        }
        for (f, l) in p.files.iter_mut().zip(logs) {
            f.path.clone_from(l);
            l.display().to_string().clone_into(&mut f.label);
        }
    }
    Ok(p)
}

/// Runs the replay, writing the verdict CSV (when asked) into a temporary
/// file that the caller commits.
fn replay_files(
    rigs: &[LoadedRig],
    merger: &mut Merger,
    every: u64,
    verdicts: Option<&std::path::Path>,
) -> Result<(ReplayReport, Option<AtomicFile>), Error> {
    let options = ReplayOptions {
        verdicts_every: every,
    };
    match verdicts {
        Some(path) => {
            let mut w = AtomicFile::create(path)?;
            let name = path.display().to_string();
            let rep = replay(rigs, merger, options, Some((&mut w, &name)))?;
            Ok((rep, Some(w)))
        }
        None => Ok((replay(rigs, merger, options, None)?, None)),
    }
}

/// A whole output in a temporary file, for committing with the others.
fn pending(path: &std::path::Path, text: &str) -> Result<AtomicFile, Error> {
    let mut f = AtomicFile::create(path)?;
    f.write_all(text.as_bytes())
        .map_err(|e| Error::io(path, e))?;
    Ok(f)
}

/// Runs `standfast replay`.
///
/// Outputs (`--verdicts`, `--html`, `--events`) that are the same file as
/// an input or as each other are refused before anything is read or
/// written; all outputs are written to temporary files and renamed into
/// place only when the whole run has succeeded.
///
/// # Errors
/// Bad rig file, profile or log ([`Error::Input`], [`Error::Log`]); an
/// output path refused ([`Error::Usage`]); files that cannot be read or
/// written ([`Error::Io`]).
pub fn run_replay(a: &ReplayArgs, out: &mut dyn Write) -> Result<(), Error> {
    let mut outputs = Vec::new();
    if let Some(p) = &a.verdicts {
        outputs.push(Role::new("--verdicts", p));
    }
    if let Some(p) = &a.html {
        outputs.push(Role::new("--html", p));
    }
    if let Some(p) = &a.events {
        outputs.push(Role::new("--events", p));
    }
    let mut inputs: Vec<Role<'_>> = a
        .rigs
        .iter()
        .map(|r| Role::new("the rig file", r))
        .collect();
    if let Some(p) = &a.profile {
        inputs.push(Role::new("the log profile", p));
    }
    inputs.extend(a.logs.iter().map(|l| Role::new("the log", l)));
    check_paths(&inputs, &outputs)?;
    let overrides = a
        .what_if
        .iter()
        .map(|t| crate::whatif::parse_override(t))
        .collect::<Result<Vec<_>, _>>()?;

    let rigs = a
        .rigs
        .iter()
        .map(|p| crate::rigfile::load(p))
        .collect::<Result<Vec<_>, _>>()?;
    let mut rigs = rigs;
    if let (false, Some(base)) = (overrides.is_empty(), rigs.first()) {
        rigs.push(crate::whatif::variant(base, &overrides, &a.what_if)?);
    }
    let profile = match (&a.profile, a.rigs.first()) {
        (Some(p), _) => p.clone(),
        (None, Some(r)) => r.clone(),
        (None, None) => std::path::PathBuf::new(),
    };
    let policy = a.on_error.as_deref().map(|p| {
        if p == "stop" {
            crate::log::ErrorPolicy::Stop
        } else {
            crate::log::ErrorPolicy::Skip
        }
    });
    let p = load_profile(&profile, &a.logs)?;
    // The profile's own log paths, known only now: checked before any is
    // opened.
    let log_paths: Vec<Role<'_>> = p
        .files
        .iter()
        .map(|f| Role::new("the log", &f.path))
        .collect();
    check_paths(&log_paths, &outputs)?;
    let mut merger = Merger::open(&p, policy.unwrap_or(p.on_error))?;
    let (mut rep, verdict_file) = replay_files(&rigs, &mut merger, a.every, a.verdicts.as_deref())?;
    rep.local_offset_s = crate::report::clock::written_offset_s(&p);
    let mut files: Vec<AtomicFile> = verdict_file.into_iter().collect();
    if let Some(path) = &a.events {
        files.push(pending(path, &crate::event_lines::lines(&rep)?)?);
    }
    if let Some(h) = &a.html {
        files.push(pending(h, &crate::report::replay_html(&rep, &rigs)?)?);
    }
    let mut summary = Vec::new();
    crate::whatif::write_summary(&rep, a.json, &mut summary)?;
    for f in files {
        f.commit()?;
    }
    out.write_all(&summary)
        .map_err(|e| Error::io("<standard output>", e))?;
    if let Some(h) = &a.html {
        if !a.json {
            writeln!(out, "Report written to {}", h.display())
                .map_err(|e| Error::io("<standard output>", e))?;
        }
    }
    if let Some(v) = &a.verdicts {
        if !a.json {
            writeln!(out, "Verdicts written to {}", v.display())
                .map_err(|e| Error::io("<standard output>", e))?;
        }
    }
    Ok(())
}

/// The demo's default folder: `standfast-demo` in cargo's target folder
/// when the executable `exe` lies in one (a folder holding the
/// `CACHEDIR.TAG` cargo writes there, up to three levels above the
/// executable: `target/debug/`, `target/<triple>/release/`), else
/// `standfast-demo` in `cwd`.
#[must_use]
pub fn demo_dir_for(exe: &std::path::Path, cwd: &std::path::Path) -> std::path::PathBuf {
    exe.ancestors()
        .skip(1)
        .take(3)
        .find(|d| d.join("CACHEDIR.TAG").is_file())
        .map_or_else(|| cwd.join("standfast-demo"), |t| t.join("standfast-demo"))
}

/// Total size of the named files in `dir`, bytes (files that cannot be
/// read count 0: the size is only reported).
fn files_size(dir: &std::path::Path, names: &[&str]) -> u64 {
    names
        .iter()
        .filter_map(|n| std::fs::metadata(dir.join(n)).ok())
        .map(|m| m.len())
        .sum()
}

/// Runs `standfast demo`: writes the invented night and rig into the
/// folder, replays them and prints the summary and the paths written.
///
/// # Errors
/// As [`run_replay`]; [`Error::Io`] when the folder cannot be written.
pub fn run_demo(a: &DemoArgs, out: &mut dyn Write) -> Result<(), Error> {
    let hours = match &a.hours {
        Some(h) => Some(
            crate::cli::quantity_option::<crate::units::TimeDim>("--hours", h, DEMO_HOURS)?
                / 3600.0,
        ),
        None => None,
    };
    let out_dir = a.out.clone().unwrap_or_else(|| {
        let exe = std::env::current_exe().unwrap_or_default();
        demo_dir_for(&exe, std::path::Path::new("."))
    });
    let mut folder = OwnedFolder::open(&out_dir, a.replace)?;
    folder.check(&DEMO_FILES)?;
    let mut plan = crate::demo_data::NightPlan::windy_night(a.seed);
    if let Some(h) = hours {
        plan.duration_s = h * 3600.0;
    }
    let logs = crate::demo_data::write_demo_logs_in(&mut folder, &plan)?;
    let rig_path = folder.write("rig.toml", DEMO_RIG_TOML.as_bytes())?;
    let rig = crate::rigfile::load(&rig_path)?;
    let verdicts = out_dir.join("verdicts.csv");
    let profile = load_profile(&logs.profile_toml, &[])?;
    let mut merger = Merger::open(&profile, profile.on_error)?;
    let (mut rep, verdict_file) =
        replay_files(std::slice::from_ref(&rig), &mut merger, 10, Some(&verdicts))?;
    rep.local_offset_s = crate::report::clock::written_offset_s(&profile);
    let report = out_dir.join("report.html");
    let page = pending(
        &report,
        &crate::report::replay_html(&rep, std::slice::from_ref(&rig))?,
    )?;
    if let Some(v) = verdict_file {
        folder.commit(v)?;
    }
    folder.commit(page)?;
    crate::summary::write(&rep, a.json, out)?;
    if !a.json {
        #[allow(clippy::cast_precision_loss)] // sizes far below 2^53
        let size_mb = files_size(&out_dir, &DEMO_FILES) as f64 / 1e6;
        writeln!(out, "\nReport: {}", report.display())
            .map_err(|e| Error::io("<standard output>", e))?;
        writeln!(
            out,
            "\nAn invented windy night (seed {}); no real rig or site is described. Files written in {} ({:.1} MB in all):\n  {}\n  {}\n  {}\n  {}\n  {}\n  {} (every 10th record)",
            a.seed,
            out_dir.display(),
            size_mb,
            rig_path.display(),
            logs.wind_csv.display(),
            logs.accel_csv.display(),
            logs.mount_csv.display(),
            logs.profile_toml.display(),
            verdicts.display()
        )
        .map_err(|e| Error::io("<standard output>", e))?;
    }
    Ok(())
}
