//! The guard: live samples in, a park-and-alarm decision in alert levels out.
//!
//! Each [`Guard::step`] takes the caller's time stamp and whatever samples
//! arrived since the last step (accelerometer, wind, mount pose, cover, air)
//! and returns a [`Verdict`]: the present overturning and sliding
//! utilisation, the utilisation predicted for the end of a park, the tip wind
//! speed for the present pose and wind direction, the tilt margin, the alert level
//! ([`AlertLevel`]), the active faults and the events of this step.
//!
//! **Alert levels**, in rising order: [`AlertLevel::Clear`], [`AlertLevel::Watch`],
//! [`AlertLevel::ParkNow`], [`AlertLevel::Alarm`]; and [`AlertLevel::SensorFault`], the
//! can't-see level, which parks and alarms. Every rule that changes the
//! alert level is in one pure function, [`transition::transition`], whose module
//! docs give the whole transition table. In short: escalation is immediate;
//! a step down needs every figure settled below `clear_ratio` × the threshold
//! of every level being left, for `dwell_s`; the alarm latches until
//! [`Guard::acknowledge`]; a fault clears after `fault_clear_s` of healthy
//! inputs, to the alert level the figures call for but no lower than
//! [`AlertLevel::Watch`] (and no lower than [`AlertLevel::Alarm`] while latched).
//!
//! **Fail safe.** Anything the guard cannot compute or cannot trust is a
//! [`Fault`] in the verdict and puts the guard in [`AlertLevel::SensorFault`],
//! which asserts the park and alarm outputs. Never is a figure read as zero
//! or a sample dropped in silence:
//! - a rejected sample of any input (accelerometer, wind, pose, cover, air)
//!   is a fault of that input in the same step;
//! - a time stamp earlier than the previous step's is a fault of the clock
//!   ([`Sensor::Clock`]); that step's samples are not used;
//! - no reading yet (no tilt before the first accelerometer sample, no gust
//!   before the wind statistics hold one) is [`Fault::NoReading`]; a guard
//!   starts in [`AlertLevel::SensorFault`];
//! - a physics evaluation that fails or gives a non-finite figure is
//!   [`Fault::Unevaluable`] naming the figure;
//! - [`GuardConfig::validate`] refuses a wind configuration that accepts
//!   samples the physics cannot evaluate.
//!
//! **Park early enough.** Parking takes `time_to_park_s`. The guard predicts
//! the gust at the end of that time: the larger of the peak gust of the recent
//! window and the latest gust plus its rise rate over the park time, times
//! `gust_allowance`; it requests the park when the utilisation at that gust
//! reaches `park_utilisation`, so that the rig is parked before the limit.
//!
//! **Wind direction.** With a defined direction the guard uses it; with a
//! variable, calm or unknown direction it takes the worst direction, as the
//! wind may swing to it (for the drive torques too).
//!
//! **When the physics runs.** At most once per `evaluate_every_s`, and at
//! once when the cover state changes or the pose moves by more than
//! [`POSE_TOLERANCE_RAD`] from the last evaluated one. Samples in between
//! only update the filters, so a controller may pass its pose in every step.
//! What depends on the pose and cover state only (stage frames, centre of
//! gravity, moments of inertia) is kept from one evaluation to the next and
//! worked out again when either changes; each evaluation places the rig once
//! and computes the wind loads once for the stability and the drive torques.
//! The figures have the bits of the separate public calls
//! ([`Rig::tilt_margin`], [`Rig::stability_figures_with_utilisation_at`],
//! [`Rig::axis_loads`]; a unit test compares them).
//!
//! **The step's shortcuts.** Between evaluations a step does only what
//! can have changed, with the verdict it would have had without them
//! (tested against the full path over random traces: `shortcut_tests`):
//! the decision's [`transition::transition`] is skipped after one that
//! kept the level, while its readings are of the same kind (a fault, or
//! the same figures) and no timer of its memory can have reached its limit;
//! the wind channels' checks are skipped before the earliest instant one
//! of them turns stale (none while a rejected sample or a stuck reading is
//! active); the 3-s gust comes from a cache while the wind bin and the
//! samples are the same, and is then not tracked again (the step that
//! computed it did, in the same minute); the verdict carries the tilt as a
//! [`TiltReading`] whose angles are computed when asked, and whose
//! validity (and the tilt-beyond-limit fault) is settled by a bound without
//! an arc tangent within 40°; the thresholds in ms are computed
//! once; an empty fault set or event list is written fresh rather than
//! copied. Faults are never late: each skipped check is one whose answer
//! is known, to the millisecond, and a reversed clock or a rejected sample
//! is a fault in its step as before.
//!
//! **Memory.** The guard holds no reference-counted or heap data; its size is a
//! compile-time constant, `core::mem::size_of::<Guard>()`: under 4.5 KiB on a
//! 64-bit host (the fail-safe state, evaluation faults and the per-level
//! timers, took it past 4 KiB), about 2.9 KiB on the 32-bit Cortex-M4F
//! (checked by a unit test; the kept pose-dependent figures are 120 bytes of
//! it). The rig is borrowed, not copied.
//!
//! **Caution.** A verdict is an estimate from a static model and live sensors;
//! it does not replace securing the rig.

mod config;
#[cfg(test)]
mod eval_tests;
mod gusts;
pub mod transition;

pub use config::{GuardConfig, WindSource, MAX_EVALUATE_EVERY_S};
pub use gusts::GUST_HISTORY_MIN;
pub use transition::{AlertCause, AlertLevel};

use crate::air::Air;
use crate::error::{Error, ErrorKind};
use crate::frame::Tilt;
use crate::math::Vec3;
use crate::mount::Pose;
use crate::rig::{Conditions, Rig, MAX_WIND_SPEED_MPS};
use crate::sense::{
    Check, Fault, FaultSet, LevelCapture, MeanWind, Millis, Sensor, TiltReading, TiltSensor,
    WindDirection, WindReport, WindStats,
};
use crate::sky::ParkRequest;
use crate::torque::Posed;
use gusts::{GustCache, GustHistory};
use heapless::Vec;
use transition::{Figures, Memory, Readings, Thresholds};

/// Most extra park poses a guard considers besides the home pose.
pub const MAX_PARK_POSES: usize = 4;
/// Most events one step can report; more are counted in
/// [`Verdict::events_lost`].
pub const MAX_EVENTS: usize = 8;
/// A reported pose that moved by more than this from the pose of the last
/// evaluation, on either axis angle (or hour angle, declination, azimuth,
/// altitude), forces a new evaluation, radians: 1e-3 rad (0.057°). Sidereal
/// tracking (7.3e-5 rad/s) takes 14 s to move that far, so tracking waits
/// for the evaluation period while a slew is judged at once; a pier-side
/// flip or a change of pose form always counts as a move.
pub const POSE_TOLERANCE_RAD: f32 = 1e-3;

/// Something worth logging that happened in a step.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Event {
    /// The alert level changed.
    LevelChanged {
        /// Previous alert level.
        from: AlertLevel,
        /// New alert level.
        to: AlertLevel,
        /// Why.
        cause: AlertCause,
    },
    /// A fault was raised (first step it is seen).
    FaultRaised(Fault),
    /// The highest overturning utilisation since start (lowest margin) rose.
    NewHighUtilisation {
        /// Overturning utilisation, dimensionless.
        utilisation: f32,
    },
}

/// A wind sample: speed at the anemometer and the direction it blows from.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct WindSample {
    /// Speed, m/s, at the anemometer.
    pub speed_mps: f32,
    /// Direction it blows from, radians from north clockwise, if measured.
    pub from_rad: Option<f32>,
}

/// Measured air temperature and pressure.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct AirSample {
    /// Air temperature, K (kelvin; [`crate::air::celsius_to_kelvin`] converts
    /// a reading in °C).
    pub temperature_k: f32,
    /// Station pressure, Pa.
    pub pressure_pa: f32,
}

/// Whatever arrived since the last step. Every field is optional.
/// # Examples
/// A step with an accelerometer sample (in g, the default scale) and a wind
/// sample; nothing of the pose, cover or air this time:
/// ```
/// use standfast::{Inputs, WindSample};
///
/// let inputs = Inputs {
///     accel_raw: Some([0.01, 0.0, 1.0]),
///     wind: Some(WindSample { speed_mps: 6.5, from_rad: Some(4.71) }),
///     ..Inputs::default()
/// };
/// assert!(inputs.pose.is_none() && inputs.cover_fitted.is_none());
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Inputs {
    /// Raw accelerometer sample, sensor axes, in counts or g (see
    /// [`crate::sense::TiltConfig::scale_g_per_count`]).
    pub accel_raw: Option<[f32; 3]>,
    /// Wind sample.
    pub wind: Option<WindSample>,
    /// Mount pose as reported by the mount controller.
    pub pose: Option<Pose>,
    /// Cover fitted (true) or removed (false).
    pub cover_fitted: Option<bool>,
    /// Measured air.
    pub air: Option<AirSample>,
}
/// The guard's answer for one step.
/// # Examples
/// What a controller does with a verdict (from [`Guard::step`]): park on a
/// request, sound the alarm, log the events and any that were lost.
/// ```
/// use standfast::Verdict;
///
/// fn act(v: &Verdict, park: &mut bool, alarm: &mut bool) {
///     *park = v.level.park_requested();
///     *alarm = v.level.alarm();
///     for e in &v.events {
///         // Write `e` to the log here.
///         let _ = e;
///     }
///     if v.events_lost > 0 {
///         // Log that `v.events_lost` events did not fit.
///     }
///     if let (true, Some(pose)) = (*park, v.park_pose) {
///         // Send the mount to `pose`.
///         let _ = pose;
///     }
/// }
/// ```
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Verdict {
    /// Time stamp of the step (the previous step's when the clock went
    /// backwards: see [`Sensor::Clock`]).
    pub now: Millis,
    /// The alert level.
    pub level: AlertLevel,
    /// Overturning utilisation at the peak gust now (1.0 tips).
    pub overturning_utilisation: Option<f32>,
    /// Overturning utilisation predicted for the end of a park.
    pub predicted_utilisation: Option<f32>,
    /// Sliding utilisation at the peak gust now (1.0 slides).
    pub sliding_utilisation: Option<f32>,
    /// Governing drive utilisation of the primary and secondary axes at the
    /// peak gust, when the rig has drive ratings.
    pub drive_utilisation: Option<[f32; 2]>,
    /// Wind speed that would tip the rig in the present pose from the present
    /// (or worst) direction, m/s; `None` when no wind speed tips it.
    pub tip_wind_mps: Option<f32>,
    /// The gust the figures are computed for, m/s at rig height.
    pub gust_mps: Option<f32>,
    /// The gust predicted for the end of a park, m/s at rig height.
    pub predicted_gust_mps: Option<f32>,
    /// Direction used, radians from north clockwise (the worst one when the
    /// measured direction is not defined).
    pub wind_from_rad: Option<f32>,
    /// Present ground tilt, its angles worked out on demand
    /// ([`TiltReading::tilt`]); `None` before the first accelerometer
    /// sample, without a required level reference, or beyond 45° (then a
    /// fault says so).
    pub tilt: Option<TiltReading>,
    /// Extra tilt that would tip the rig with no wind, radians.
    pub tilt_margin_rad: Option<f32>,
    /// Rate of slow tilt change (a sinking leg), rad/s, any direction,
    /// non-negative ([`TiltSensor::drift_rate_rad_per_s`]).
    pub tilt_drift_rad_per_s: f32,
    /// The pose the figures are for.
    pub pose: Pose,
    /// With a park request: the safest park pose for the present wind (the
    /// mount's home pose when the figures or the search are missing).
    pub park_pose: Option<Pose>,
    /// Active faults: any fault means the guard cannot judge the rig.
    pub faults: FaultSet,
    /// Events of this step, oldest first.
    pub events: Vec<Event, MAX_EVENTS>,
    /// Events of this step that did not fit in `events` (the newest are the
    /// ones lost); 0 normally.
    pub events_lost: u16,
    /// True when this step evaluated the physics (the figures are fresh);
    /// false when they come from an earlier step: then every figure is, bit
    /// for bit, the previous verdict's (module docs, "When the physics
    /// runs"). The tilt, pose, level, faults and events are of this step
    /// either way.
    pub evaluated: bool,
}

/// The events of one step, written into the verdict's list, counting those
/// that do not fit.
struct EventLog<'v> {
    events: &'v mut Vec<Event, MAX_EVENTS>,
    lost: u16,
}

impl EventLog<'_> {
    fn push(&mut self, e: Event) {
        if self.events.push(e).is_err() {
            self.lost = self.lost.saturating_add(1);
        }
    }
}

/// Figures of one physics evaluation, as the verdict shows them.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
struct Shown {
    overturning: Option<f32>,
    predicted: Option<f32>,
    sliding: Option<f32>,
    drive: Option<[f32; 2]>,
    tip_wind_mps: Option<f32>,
    gust_mps: Option<f32>,
    predicted_gust_mps: Option<f32>,
    from_rad: Option<f32>,
    tilt_margin_rad: Option<f32>,
    drift_rad_per_s: f32,
}

/// What one evaluation's physics is for: the tilt, the gust and the
/// predicted gust (m/s), the measured wind direction (radians from north
/// clockwise; `None`: the worst one) and the ten-minute mean wind (m/s).
#[derive(Clone, Copy, Debug)]
struct EvalAt {
    tilt: Tilt,
    gust: f32,
    predicted: f32,
    measured_from: Option<f32>,
    mean: Option<f32>,
}

/// The guard. Borrows the rig; all other state is inline and fixed in size.
///
/// # Examples
/// A guard on an invented rig (hidden lines build it). It starts unable to
/// judge the rig, so it asks for a park and raises the alarm until its
/// sensors have given a reading; a sample it cannot trust is a fault in the
/// same step.
/// ```
/// # use standfast::math::deg_to_rad;
/// # use standfast::rig::Stage;
/// # use standfast::{BodySpec, MountGeometry, Rig, RigSpec, Support};
/// # let spec = RigSpec::new(
/// #     &Support::tripod(0.45, 0.0)?,
/// #     MountGeometry::alt_azimuth(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
/// #     0.3,
/// # )
/// # .with_body(BodySpec::optical_tube(5.0, 0.12, 0.7, [0.15, 0.1, 0.0]))?
/// # .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]))?;
/// # let rig = Rig::new(&spec)?;
/// use standfast::guard::AlertLevel;
/// use standfast::{Guard, GuardConfig, Inputs, Millis, WindSample};
///
/// let mut guard = Guard::new(&rig, GuardConfig::default(), Millis(0))?;
/// let v = guard.step(Millis(100), &Inputs::default());
/// assert_eq!(v.level, AlertLevel::SensorFault);
/// assert!(v.level.park_requested() && v.level.alarm());
///
/// let bad = Inputs {
///     wind: Some(WindSample { speed_mps: f32::NAN, from_rad: None }),
///     ..Inputs::default()
/// };
/// let v = guard.step(Millis(200), &bad);
/// assert!(v.faults.iter().any(|f| f.class_code() == "not_finite"));
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Debug)]
pub struct Guard<'r> {
    rig: &'r Rig,
    config: GuardConfig,
    tilt: TiltSensor,
    wind: WindStats,
    means: MeanWind,
    level: AlertLevel,
    memory: Memory,
    pose: Pose,
    cover_fitted: bool,
    air: Air,
    /// The latest step's time stamp: the guard's clock never goes back.
    last_step: Millis,
    /// Time, pose and cover state of the last evaluation.
    last_eval: Option<(Millis, Pose, bool)>,
    /// A pose was taken since the last evaluation. Without one the pose is
    /// the evaluated one, which has not moved (`pose_moved(p, p)` is false
    /// for every `p`, NaN angles included: tested), so no move is checked.
    pose_since_eval: bool,
    shown: Shown,
    /// Faults of the last evaluation (figures it could not compute); they
    /// hold until the next evaluation.
    eval_faults: FaultSet,
    park_pose: Option<Pose>,
    known_faults: FaultSet,
    highest_utilisation: f32,
    gust_history: GustHistory,
    gust_3s_cache: GustCache,
    /// What the physics needs of the present pose and cover state whatever
    /// the tilt and wind, kept between evaluations ([`Guard::posed`]).
    posed: Option<Posed>,
    /// The configuration's thresholds with its times in whole ms
    /// ([`GuardConfig::thresholds`]), and `evaluate_every_s` in ms: computed
    /// once, the configuration never changes.
    thresholds: Thresholds,
    evaluate_every_ms: u64,
    /// The last full decision, while it holds ([`Guard::decide`]).
    decided: Option<Decided>,
    /// Tests only: every step takes the full path (the reference of the
    /// equivalence tests of the shortcuts, `shortcut_tests`).
    #[cfg(test)]
    full_path: bool,
}

impl<'r> Guard<'r> {
    /// A guard for `rig`, started at `now`, in [`AlertLevel::SensorFault`]: it
    /// cannot judge the rig before its sensors have given readings.
    ///
    /// # Errors
    /// An invalid configuration ([`GuardConfig::validate`]) or a configured
    /// pose the mount cannot take.
    pub fn new(rig: &'r Rig, config: GuardConfig, now: Millis) -> Result<Guard<'r>, Error> {
        // Every check first (the configuration, with its tilt and wind parts,
        // and the poses), then an infallible build: no `Result` of the 2.8 KiB
        // wind statistics or of the sensors is made and moved on the way.
        config.validate()?;
        let height_factor = config.wind.height_factor()?;
        let pose = config.assumed_pose.unwrap_or(rig.mount().home_pose());
        rig.mount().axis_angles(pose)?;
        for p in &config.park_poses {
            rig.mount().axis_angles(*p)?;
        }
        Ok(Guard {
            rig,
            tilt: TiltSensor::started(config.tilt, now),
            wind: WindStats::started(config.wind, height_factor, now),
            means: MeanWind::started(config.wind, height_factor, now),
            level: AlertLevel::SensorFault,
            memory: Memory::default(),
            pose,
            cover_fitted: false,
            air: Air::default(),
            last_step: now,
            last_eval: None,
            pose_since_eval: false,
            shown: Shown::default(),
            eval_faults: FaultSet::new(),
            park_pose: None,
            known_faults: FaultSet::default(),
            highest_utilisation: 0.0,
            gust_history: GustHistory::new(now),
            gust_3s_cache: GustCache::default(),
            posed: None,
            thresholds: config.thresholds(),
            evaluate_every_ms: config::s_to_ms(config.evaluate_every_s),
            decided: None,
            #[cfg(test)]
            full_path: false,
            config,
        })
    }

    /// The configuration.
    #[must_use]
    pub fn config(&self) -> &GuardConfig {
        &self.config
    }

    /// The present alert level.
    #[must_use]
    pub fn level(&self) -> AlertLevel {
        self.level
    }

    /// Starts a level capture at set-up (see
    /// [`crate::sense::TiltReference::LevelReference`]): the accepted
    /// accelerometer samples of the next `level_capture_s` seconds are
    /// averaged into the level reference. The rig must be levelled and still
    /// meanwhile.
    pub fn start_level_capture(&mut self, now: Millis) {
        self.tilt.start_level_capture(now);
    }

    /// Progress of the latest level capture.
    #[must_use]
    pub fn level_capture(&self) -> LevelCapture {
        self.tilt.level_capture()
    }

    /// Sets the level reference from one stored earlier (rig frame, specific
    /// force pointing up, any length), instead of capturing it again.
    ///
    /// # Errors
    /// As [`crate::sense::TiltSensor::set_level_reference`]: a zero or
    /// non-finite vector, or one more than 45° from +z.
    pub fn set_level_reference(&mut self, up: Vec3) -> Result<(), Error> {
        self.tilt.set_level_reference(up)
    }

    /// Sets the air density used until measured air arrives in
    /// [`Inputs::air`] (for example from the site elevation).
    pub fn set_air(&mut self, air: Air) {
        self.air = air;
    }

    /// Acknowledges a latched alarm: the alert level may step down once the figures
    /// have settled (in the next step, with cause [`AlertCause::Acknowledged`], if
    /// they already have for the dwell time).
    pub fn acknowledge(&mut self) {
        self.memory.acknowledge();
        self.decided = None;
    }

    /// One step: feed the samples that arrived, evaluate the physics when due,
    /// and decide. Rejected samples, a reversed clock and figures that cannot
    /// be computed become faults in the verdict (module docs, "Fail safe");
    /// nothing panics.
    pub fn step(&mut self, now: Millis, inputs: &Inputs) -> Verdict {
        let (mut faults, mut list) = (FaultSet::new(), Vec::new());
        let mut events = EventLog {
            events: &mut list,
            lost: 0,
        };
        let (now, tilt, evaluated) = self.advance(now, inputs, &mut faults, &mut events);
        let events_lost = events.lost;
        let fig = &self.shown;
        Verdict {
            now,
            level: self.level,
            overturning_utilisation: fig.overturning,
            predicted_utilisation: fig.predicted,
            sliding_utilisation: fig.sliding,
            drive_utilisation: fig.drive,
            tip_wind_mps: fig.tip_wind_mps,
            gust_mps: fig.gust_mps,
            predicted_gust_mps: fig.predicted_gust_mps,
            wind_from_rad: fig.from_rad,
            tilt,
            tilt_margin_rad: fig.tilt_margin_rad,
            tilt_drift_rad_per_s: fig.drift_rad_per_s,
            pose: self.pose,
            park_pose: self.park_pose_shown(),
            faults: or_fresh_faults(faults),
            events: or_fresh_events(list),
            events_lost,
            evaluated,
        }
    }

    /// [`Guard::step`], the verdict written into `out` (every field of it
    /// replaced, whatever it held): the same verdict, without building one
    /// and copying it, for a caller that keeps verdicts in place (a buffer
    /// of them, a static).
    pub fn step_into(&mut self, now: Millis, inputs: &Inputs, out: &mut Verdict) {
        out.faults.clear();
        out.events.clear();
        let mut events = EventLog {
            events: &mut out.events,
            lost: 0,
        };
        let (now, tilt, evaluated) = self.advance(now, inputs, &mut out.faults, &mut events);
        out.events_lost = events.lost;
        let fig = &self.shown;
        out.now = now;
        out.level = self.level;
        out.overturning_utilisation = fig.overturning;
        out.predicted_utilisation = fig.predicted;
        out.sliding_utilisation = fig.sliding;
        out.drive_utilisation = fig.drive;
        out.tip_wind_mps = fig.tip_wind_mps;
        out.gust_mps = fig.gust_mps;
        out.predicted_gust_mps = fig.predicted_gust_mps;
        out.wind_from_rad = fig.from_rad;
        out.tilt = tilt;
        out.tilt_margin_rad = fig.tilt_margin_rad;
        out.tilt_drift_rad_per_s = fig.drift_rad_per_s;
        out.pose = self.pose;
        out.park_pose = self.park_pose_shown();
        out.evaluated = evaluated;
    }

    /// The park pose a verdict shows: the one found, while a park is
    /// requested.
    fn park_pose_shown(&self) -> Option<Pose> {
        if self.level.park_requested() {
            self.park_pose
        } else {
            None
        }
    }

    /// The work of one step ([`Guard::step`]): takes the inputs, evaluates
    /// when due and decides, with the step's faults added to `faults`
    /// (empty on entry) and its events to `events`. Returns the step's time
    /// (the previous step's when the clock went backwards), the tilt reading
    /// and whether the physics ran.
    // On a bare-metal target, built for size, inlining this (its callers
    // `step` and `step_into` each take one copy, and an image links one of
    // them) saves about 90 bytes of flash; on the host it costs
    // instructions, so the compiler decides there.
    #[cfg_attr(target_os = "none", inline(always))]
    fn advance(
        &mut self,
        now: Millis,
        inputs: &Inputs,
        faults: &mut FaultSet,
        events: &mut EventLog<'_>,
    ) -> (Millis, Option<TiltReading>, bool) {
        let mut rejected = FaultSet::new();
        let now = if now < self.last_step {
            rejected.push(Fault::TimeReversed {
                sensor: Sensor::Clock,
            });
            self.last_step
        } else {
            self.last_step = now;
            self.take_inputs(now, inputs, &mut rejected);
            now
        };
        let means = self.config.wind_source == WindSource::TenMinuteMeans;
        // The verdict's tilt reading, with the accelerometer's faults (one
        // pass; no angle computed).
        let tilt = self.tilt.faults_into_and_reading(now, faults);
        if means {
            faults.extend(&self.means.faults(now));
        } else {
            self.wind.faults_into(now, faults);
        }
        faults.extend(&rejected);
        let due = self.last_eval.is_none_or(|(t, pose, cover)| {
            now.since(t) >= self.evaluate_every_ms
                || cover != self.cover_fitted
                || (self.pose_since_eval && pose_moved(pose, self.pose))
        });
        // The full wind report only for an evaluation; else the report's 3-s
        // gust alone (`WindStats::gust_3s_mps`), cached within a wind bin.
        let report = if due {
            let r = if means {
                self.means.report(now)
            } else {
                self.wind.report(now)
            };
            self.gust_3s_cache.put(now, r.gust_3s_mps);
            Some(r)
        } else {
            None
        };
        let (gust_3s, fresh) = match &report {
            Some(r) => (r.gust_3s_mps, true),
            None => {
                let (wind, means_stats) = (&self.wind, &self.means);
                self.gust_3s_cache.get_or(now, || {
                    if means {
                        means_stats.report(now).gust_3s_mps
                    } else {
                        wind.gust_3s_mps(now)
                    }
                })
            }
        };
        // A cached gust was tracked in its bin, so its minute, already.
        if fresh {
            self.gust_history.track(now, gust_3s);
        }
        if let Some(report) = report {
            let (shown, eval_faults) = self.evaluate(&report);
            self.shown = shown;
            self.eval_faults = eval_faults;
            self.last_eval = Some((now, self.pose, self.cover_fitted));
            self.pose_since_eval = false;
            self.park_pose = None;
            self.decided = None; // New figures: the next decision in full.
            if let Some(u) = shown.overturning {
                if u > self.highest_utilisation + 0.01 {
                    self.highest_utilisation = u;
                    events.push(Event::NewHighUtilisation { utilisation: u });
                }
            }
        }
        faults.extend(&self.eval_faults);
        // `decide`'s first shortcut for the usual step (no fault now or
        // before, the decision standing), tested here without its call.
        let stands = faults.is_empty()
            && self.known_faults.is_empty()
            && self
                .decided
                .is_some_and(|d| !d.on_fault && now.0 < d.until_ms);
        if !stands {
            self.decide(now, faults, events);
        }
        // The park pose is searched only while a park is requested, once per
        // evaluation (it costs one assessment per candidate).
        if self.level.park_requested() && (due || self.park_pose.is_none()) {
            let pose = match (self.shown.predicted_gust_mps, self.shown.from_rad) {
                (Some(speed), Some(d)) => self.safest_park_pose(speed, d),
                _ => Ok(self.rig.mount().home_pose()),
            };
            self.park_pose = Some(match pose {
                Ok(p) => p,
                Err(f) => {
                    // Park to the home pose, and say the search failed: the
                    // next decision sees the fault.
                    self.eval_faults.push(f);
                    faults.push(f);
                    self.note_new_faults(faults, events);
                    self.rig.mount().home_pose()
                }
            });
        }
        (now, tilt, due)
    }

    /// Feeds the samples of one step to their processors; every rejected
    /// sample becomes a fault of its input in `rejected`.
    fn take_inputs(&mut self, now: Millis, inputs: &Inputs, rejected: &mut FaultSet) {
        if let Some(raw) = inputs.accel_raw {
            if let Err(f) = self.tilt.push(now, raw) {
                rejected.push(f);
            }
        }
        if let Some(w) = inputs.wind {
            self.gust_3s_cache.invalidate();
            let pushed = if self.config.wind_source == WindSource::TenMinuteMeans {
                self.means.push(now, w.speed_mps, w.from_rad)
            } else {
                self.wind.push(now, w.speed_mps, w.from_rad)
            };
            if let Err(f) = pushed {
                rejected.push(f);
            }
        }
        if let Some(p) = inputs.pose {
            match self.rig.mount().axis_angles(p) {
                Ok(_) => {
                    self.pose = p;
                    self.pose_since_eval = true;
                }
                Err(e) => rejected.push(input_fault(Sensor::MountPose, &e)),
            }
        }
        if let Some(c) = inputs.cover_fitted {
            if c && !self.rig.has_cover() {
                rejected.push(Fault::NotInRig {
                    sensor: Sensor::Cover,
                });
            } else {
                self.cover_fitted = c;
            }
        }
        if let Some(a) = inputs.air {
            match Air::from_temperature_pressure(a.temperature_k, a.pressure_pa) {
                Ok(air) => self.air = air,
                Err(e) => rejected.push(input_fault(Sensor::Air, &e)),
            }
        }
        // Tests: the full path checks every wind channel at every step.
        #[cfg(test)]
        if self.full_path {
            self.wind.forget_fault_deadline();
        }
    }

    /// Logs a [`Event::FaultRaised`] for each fault of a class not active in
    /// the previous step, and remembers the active set.
    fn note_new_faults(&mut self, faults: &FaultSet, events: &mut EventLog<'_>) {
        // No fault now and none before: nothing to log, nothing to copy
        // (both sets are empty).
        if faults.is_empty() && self.known_faults.is_empty() {
            return;
        }
        for f in faults.iter() {
            if !self.known_faults.any(|k| k.same_class(&f)) {
                events.push(Event::FaultRaised(f));
            }
        }
        self.known_faults = *faults;
    }

    /// What the decision reads: a fault class, or the figures of the last
    /// evaluation (all present, the drive figure exactly when the rig has
    /// drive ratings), or an evaluation fault when any is missing.
    fn readings(&self, faults: &FaultSet) -> Readings {
        if faults.any(|f| f.sensor() != Sensor::Model) {
            return Readings::SensorFault;
        }
        if !faults.is_empty() {
            return Readings::EvaluationFault;
        }
        let s = &self.shown;
        let drive_ok = s.drive.is_some() == self.rig.drives().is_some();
        match (s.overturning, s.predicted, s.sliding, s.tilt_margin_rad) {
            (Some(overturning), Some(predicted), Some(sliding), Some(tilt_margin_rad))
                if drive_ok =>
            {
                Readings::Figures(Figures {
                    overturning,
                    predicted,
                    sliding,
                    drive: s.drive,
                    tilt_margin_rad,
                    drift_rad_per_s: s.drift_rad_per_s,
                })
            }
            _ => Readings::EvaluationFault,
        }
    }

    /// Logs the new faults and decides the level ([`transition::transition`]).
    ///
    /// The transition is skipped, with the same outcome, after a full one
    /// that kept the level (no change), while nothing it reads has changed
    /// but `now` ([`Decided`]): on a fault then and now (the table's first
    /// row reads no figure and no time), or on no fault then and now with
    /// no evaluation since (the same figures) and `now` before
    /// [`next_timer_instant`].
    #[inline(never)]
    fn decide(&mut self, now: Millis, faults: &FaultSet, events: &mut EventLog<'_>) {
        self.note_new_faults(faults, events);
        let on_fault = !faults.is_empty();
        #[cfg(test)]
        if self.full_path {
            self.decided = None;
        }
        if self
            .decided
            .is_some_and(|d| d.on_fault == on_fault && now.0 < d.until_ms)
        {
            return;
        }
        let readings = self.readings(faults);
        let t = transition::transition(self.level, &readings, &self.thresholds, self.memory, now);
        self.decided = t.change.is_none().then(|| Decided {
            on_fault,
            until_ms: if on_fault {
                u64::MAX
            } else {
                next_timer_instant(&t.memory, &self.thresholds, now)
            },
        });
        self.level = t.level;
        self.memory = t.memory;
        if let Some(c) = t.change {
            events.push(Event::LevelChanged {
                from: c.from,
                to: c.to,
                cause: c.cause,
            });
        }
    }

    /// Tests only: forgets every shortcut's state, so that the next step
    /// takes the full path everywhere (decision, wind faults, gust cache,
    /// pose move): the reference the shortcuts are compared with.
    #[cfg(test)]
    fn forget_shortcuts(&mut self) {
        self.full_path = true;
        self.pose_since_eval = true;
        self.decided = None;
        self.gust_3s_cache.invalidate();
        self.wind.forget_fault_deadline();
    }

    /// Rise rate of the gust, m/s per s ([`GustHistory::rise_mps_per_s`]).
    fn gust_rise_mps_per_s(&self) -> f32 {
        self.gust_history.rise_mps_per_s()
    }

    fn conditions(&self, tilt: Tilt, speed_mps: f32, from_rad: f32) -> Conditions {
        Conditions {
            pose: self.pose,
            tilt,
            wind_speed_mps: speed_mps,
            wind_from_rad: from_rad,
            air: self.air,
            cover_fitted: self.cover_fitted,
        }
    }

    /// The figures of one evaluation, and a fault for each figure it could
    /// not compute (missing readings, evaluation errors, non-finite
    /// results). A missing figure stays `None`.
    ///
    /// The figures are those of [`Rig::tilt_margin`],
    /// [`Rig::worst_direction_utilisation`],
    /// [`Rig::stability_figures_with_utilisation_at`] and [`Rig::axis_loads`]
    /// to the bit, from one placement: what depends on the pose and cover
    /// only comes from [`Guard::posed`], and the wind loads are computed once
    /// for the stability and the drive torques.
    fn evaluate(&mut self, report: &WindReport) -> (Shown, FaultSet) {
        let mut faults = FaultSet::new();
        let unevaluable = |check| Fault::Unevaluable { check };
        let mut f = Shown {
            drift_rad_per_s: self.tilt.drift_rate_rad_per_s().abs(),
            ..Shown::default()
        };
        if !f.drift_rad_per_s.is_finite() {
            faults.push(unevaluable(Check::TiltDrift));
        }
        let tilt = self.tilt.tilt();
        if tilt.is_none() {
            faults.push(Fault::NoReading {
                sensor: Sensor::Accelerometer,
            });
        }
        // Gusts only (measured, or estimated from a ten-minute mean): before
        // the first 3 s of record (or the first mean) there is no gust.
        let gust = report.peak_gust_mps.or(report.gust_3s_mps);
        if gust.is_none() {
            faults.push(Fault::NoReading {
                sensor: Sensor::WindSpeed,
            });
        }
        let (Some(tilt), Some(gust)) = (tilt, gust) else {
            return (f, faults);
        };
        let latest = report.gust_3s_mps.unwrap_or(gust);
        let rise = self.gust_rise_mps_per_s() * self.config.time_to_park_s;
        let predicted = gust.max(latest + rise) * self.config.gust_allowance;
        f.gust_mps = Some(gust);
        f.predicted_gust_mps = Some(predicted);
        let measured_from = match report.direction {
            WindDirection::Defined { from_rad, .. } | WindDirection::Reported { from_rad } => {
                Some(from_rad)
            }
            _ => None,
        };
        let at = EvalAt {
            tilt,
            gust,
            predicted,
            measured_from,
            mean: report.mean_10min_mps,
        };
        self.physics(&at, &mut f, &mut faults);
        (f, faults)
    }

    /// The physics of one evaluation at `at`: the figures into `f`, a fault
    /// for each one it could not compute into `faults`.
    fn physics(&mut self, at: &EvalAt, f: &mut Shown, faults: &mut FaultSet) {
        let unevaluable = |check| Fault::Unevaluable { check };
        let EvalAt {
            tilt,
            gust,
            predicted,
            measured_from,
            mean,
        } = *at;
        // One placement for every figure (an error fails each of them, as
        // it failed each of the separate calls).
        let rig = self.rig;
        let posed = self.posed();
        let placement = posed.and_then(|p| {
            rig.place_in(p.frames, tilt, self.cover_fitted)
                .map(|pl| (p, pl))
        });
        // The conditions' tilt and air checked once for every figure (the
        // wind part of each figure's conditions is checked with it).
        let ground = self.conditions(tilt, 0.0, 0.0).validate_ground_and_air();
        let margin = ground.and_then(|()| {
            let (p, pl) = placement.as_ref().map_err(|e| *e)?;
            rig.extra_tilt_in(pl, p.cg_m)
        });
        if let Ok(m) = margin {
            f.tilt_margin_rad = finite(m);
        }
        if f.tilt_margin_rad.is_none() {
            faults.push(unevaluable(Check::TiltMargin));
        }

        let from = match measured_from {
            Some(d) => Some(d),
            None => {
                let c = self.conditions(tilt, gust, 0.0);
                c.validate_wind()
                    .and(ground)
                    .and_then(|()| placement.as_ref().map_err(|e| *e))
                    .ok()
                    .map(|(_, pl)| {
                        crate::stability::worst_direction_in(
                            pl,
                            c.air.dynamic_pressure_pa(c.wind_speed_mps),
                        )
                    })
                    .and_then(|(_, d)| finite(d))
            }
        };
        let Some(from) = from else {
            faults.push(unevaluable(Check::WorstDirection));
            return;
        };
        f.from_rad = Some(from);

        let c = self.conditions(tilt, gust, from);
        let drives = rig.drives().is_some();
        let loads = c
            .validate_wind()
            .and(ground)
            .and_then(|()| placement.as_ref().map_err(|e| *e))
            .map(|(p, pl)| (p, crate::stability::Loads::build(pl, from, drives)));
        let q = c.air.dynamic_pressure_pa(gust);
        match &loads {
            Ok((_, l)) => match l.critical_utilisation(q) {
                Some(critical) => {
                    f.overturning = finite(critical);
                    f.sliding = finite(l.sliding(q, rig.friction_coefficient()).utilisation);
                    f.tip_wind_mps = l
                        .tip_pressure_pa()
                        .map(|qt| c.air.speed_for_pressure_mps(qt));
                    // As `stability_figures_with_utilisation_at` (the
                    // predicted gust is finite and non-negative here unless
                    // the figures are not).
                    f.predicted = (predicted.is_finite() && predicted >= 0.0)
                        .then(|| l.critical_utilisation(c.air.dynamic_pressure_pa(predicted)))
                        .flatten()
                        .and_then(finite);
                    if f.overturning.is_none() || f.sliding.is_none() {
                        faults.push(unevaluable(Check::Overturning));
                    }
                    if f.predicted.is_none() {
                        faults.push(unevaluable(Check::PredictedOverturning));
                    }
                }
                None => faults.push(unevaluable(Check::Overturning)),
            },
            Err(_) => faults.push(unevaluable(Check::Overturning)),
        }

        if drives {
            let mean = mean.unwrap_or(gust).min(gust);
            f.drive = loads
                .ok()
                .filter(|_| Error::check(crate::error::Field::MeanWindMps, mean, 0.0, gust).is_ok())
                .and_then(|(p, l)| {
                    let (g, w) = (l.axis_gravity_nm(), l.axis_wind_nm_per_pa());
                    let mut t = [crate::torque::AxisTerms::default(); 2];
                    for (((t, gi), wi), ii) in t.iter_mut().zip(g).zip(w).zip(p.inertia_kg_m2) {
                        *t = crate::torque::AxisTerms {
                            gravity_nm: gi,
                            wind_nm_per_pa: wi,
                            inertia_kg_m2: ii,
                        };
                    }
                    let a = rig.axis_loads_from(t, c.air.dynamic_pressure_pa(mean), q);
                    Some([
                        a.primary.utilisation?.governing,
                        a.secondary.utilisation?.governing,
                    ])
                })
                .filter(|d| d.iter().all(|u| u.is_finite()));
            if f.drive.is_none() {
                faults.push(unevaluable(Check::Drive));
            }
        }
    }

    /// The pose- and cover-dependent figures of the present pose and cover
    /// state: the kept ones when they are for exactly these, else computed
    /// again and kept (the cache's only invalidation: a different pose or
    /// cover state, compared bit for bit; the air is not in them).
    fn posed(&mut self) -> Result<Posed, Error> {
        match self.posed {
            Some(p) if p.is_for(self.pose, self.cover_fitted) => Ok(p),
            _ => {
                let p = Posed::new(self.rig, self.pose, self.cover_fitted);
                self.posed = p.ok();
                p
            }
        }
    }

    /// The safest park pose for the predicted gust from `from_rad`: among the
    /// home pose and the configured park poses, the one whose highest
    /// utilisation (overturning, or either drive) is lowest
    /// ([`Rig::safest_park`]); a park-pose fault when the search fails (a
    /// no-reading fault when there is no tilt to rank the poses by). A
    /// predicted gust beyond the model's [`MAX_WIND_SPEED_MPS`] is searched
    /// at that speed: every pose is far past tipping there, and the ranking
    /// only picks the least bad.
    fn safest_park_pose(&self, speed_mps: f32, from_rad: f32) -> Result<Pose, Fault> {
        // No tilt to rank the poses by: park at home, and say why.
        let Some(tilt) = self.tilt.tilt() else {
            return Err(Fault::NoReading {
                sensor: Sensor::Accelerometer,
            });
        };
        let req = ParkRequest {
            wind_from_rad: from_rad,
            wind_speed_mps: speed_mps.min(MAX_WIND_SPEED_MPS),
            air: self.air,
            tilt,
            cover_fitted: self.cover_fitted,
            scan: None,
        };
        self.rig
            .safest_park(&req, &self.config.park_poses)
            .map(|c| c.best.pose)
            .map_err(|_| Fault::Unevaluable {
                check: Check::ParkPose,
            })
    }
}

/// A full decision that kept the level: a decision at a later `now` (the
/// guard's clock never goes back) on the same kind of readings, before
/// `until_ms`, has the same outcome, so it is skipped ([`Guard::decide`]).
///
/// Why: a [`transition::transition`] with no change returns the memory with
/// its timers started or stopped as the readings say and the
/// acknowledgement cleared, and nothing else changed (every other change of
/// the memory comes with a change of level). Given that memory back with the
/// same readings, it starts and stops nothing more, so only `now` can make
/// a difference. On a fault (the first row of the table) `now` is not read
/// at all. With figures it is read only in comparisons with the timers,
/// which keep their answers until [`next_timer_instant`]. The same
/// readings: every fault gives the first row; no fault gives the figures
/// of the last evaluation, and an evaluation forgets the decision.
#[derive(Clone, Copy, Debug)]
struct Decided {
    /// The decision was on a fault (else on figures, with no fault).
    on_fault: bool,
    /// The first instant, ms, at which the decision may differ.
    until_ms: u64,
}

/// The first instant after `now`, ms, at which a timer of `memory` reaches
/// its limit: the healthy time `fault_clear_ms` after `healthy_since`, a
/// settled timer `dwell_ms` after its start (`u64::MAX` when none lies
/// ahead). [`transition::transition`] compares `now` with these instants
/// only (`now.since(start) < fault_clear_ms`, `now.since(start) >=
/// dwell_ms`, with every start at or before `now`), so each comparison keeps
/// its answer from `now` until just before its instant: on the same
/// readings and memory, every `now` from this one up to (not including) the
/// returned instant decides the same.
fn next_timer_instant(memory: &Memory, t: &Thresholds, now: Millis) -> u64 {
    let ahead = |start: Option<Millis>, limit_ms: u64| {
        start
            .map(|s| s.0.saturating_add(limit_ms))
            .filter(|&at| at > now.0)
            .unwrap_or(u64::MAX)
    };
    memory
        .settled_since
        .iter()
        .fold(ahead(memory.healthy_since, t.fault_clear_ms), |d, s| {
            d.min(ahead(*s, t.dwell_ms))
        })
}

/// `set`, or for an empty set a fresh empty one (the same value), written
/// into the verdict without copying the set's whole capacity: out of line,
/// so that the caller's destination is filled by the one branch taken.
#[inline(never)]
fn or_fresh_faults(set: FaultSet) -> FaultSet {
    if set.is_empty() {
        FaultSet::new()
    } else {
        set
    }
}

/// `events`, or for an empty list a fresh empty one, as [`or_fresh_faults`].
#[inline(never)]
fn or_fresh_events(events: Vec<Event, MAX_EVENTS>) -> Vec<Event, MAX_EVENTS> {
    if events.is_empty() {
        Vec::new()
    } else {
        events
    }
}

/// `Some(x)` for a finite `x`.
fn finite(x: f32) -> Option<f32> {
    x.is_finite().then_some(x)
}

/// The fault for a sample of `sensor` that its validation refused.
fn input_fault(sensor: Sensor, e: &Error) -> Fault {
    if e.kind == ErrorKind::NotFinite || !e.value.is_finite() {
        Fault::NotFinite { sensor }
    } else {
        Fault::OutOfRange {
            sensor,
            value: e.value,
        }
    }
}

/// True when pose `b` differs from `a` by more than [`POSE_TOLERANCE_RAD`]
/// in any angle, or in form or pier side.
fn pose_moved(a: Pose, b: Pose) -> bool {
    // Both poses passed the mount's checks: finite angles.
    let far = |x: f32, y: f32| (x - y).abs() > POSE_TOLERANCE_RAD;
    match (a, b) {
        (
            Pose::Axes {
                primary_rad: p1,
                secondary_rad: s1,
            },
            Pose::Axes {
                primary_rad: p2,
                secondary_rad: s2,
            },
        ) => far(p1, p2) || far(s1, s2),
        (
            Pose::Equatorial {
                hour_angle_rad: h1,
                declination_rad: d1,
                pier_side: e1,
            },
            Pose::Equatorial {
                hour_angle_rad: h2,
                declination_rad: d2,
                pier_side: e2,
            },
        ) => far(h1, h2) || far(d1, d2) || e1 != e2,
        (
            Pose::Horizontal {
                azimuth_rad: z1,
                altitude_rad: l1,
                pier_side: e1,
            },
            Pose::Horizontal {
                azimuth_rad: z2,
                altitude_rad: l2,
                pier_side: e2,
            },
        ) => far(z1, z2) || far(l1, l2) || e1 != e2,
        _ => true,
    }
}

#[cfg(test)]
mod shortcut_tests;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::mount::PierSide;

    const TOL: f32 = POSE_TOLERANCE_RAD;

    /// Every pose form: a move on either angle beyond the tolerance counts,
    /// one within it does not; so does a pier-side flip, or a change of form.
    #[test]
    fn a_pose_moves_beyond_the_tolerance_on_any_angle() {
        let axes = |a, b| Pose::Axes {
            primary_rad: a,
            secondary_rad: b,
        };
        let eq = |h, d, e| Pose::Equatorial {
            hour_angle_rad: h,
            declination_rad: d,
            pier_side: e,
        };
        let hz = |a, l, e| Pose::Horizontal {
            azimuth_rad: a,
            altitude_rad: l,
            pier_side: e,
        };
        let (east, west) = (PierSide::TubeEast, PierSide::TubeWest);
        let cases: [(Pose, Pose, bool); 19] = [
            (axes(1.0, 0.5), axes(1.0, 0.5), false),
            // Exactly the tolerance apart: not a move (exact in f32).
            (axes(0.0, 0.5), axes(TOL, 0.5), false),
            (
                axes(1.0, 0.5),
                axes(1.0 + 0.5 * TOL, 0.5 - 0.5 * TOL),
                false,
            ),
            (axes(1.0, 0.5), axes(1.0 + 2.0 * TOL, 0.5), true),
            (axes(1.0, 0.5), axes(1.0 - 2.0 * TOL, 0.5), true),
            (axes(1.0, 0.5), axes(1.0, 0.5 + 2.0 * TOL), true),
            (eq(0.3, 0.2, east), eq(0.3 + 0.5 * TOL, 0.2, east), false),
            (eq(0.3, 0.2, east), eq(0.3 + 2.0 * TOL, 0.2, east), true),
            (eq(0.3, 0.2, east), eq(0.3, 0.2 - 2.0 * TOL, east), true),
            (eq(0.3, 0.2, east), eq(0.3, 0.2, west), true),
            (hz(2.0, 0.7, east), hz(2.0 - 0.5 * TOL, 0.7, east), false),
            (hz(2.0, 0.7, east), hz(2.0 + 2.0 * TOL, 0.7, east), true),
            (hz(2.0, 0.7, east), hz(2.0, 0.7 + 2.0 * TOL, east), true),
            (hz(2.0, 0.7, east), hz(2.0, 0.7, west), true),
            (axes(0.3, 0.2), eq(0.3, 0.2, east), true),
            (eq(0.3, 0.2, east), hz(0.3, 0.2, east), true),
            (hz(0.3, 0.2, east), axes(0.3, 0.2), true),
            // Negative angles: the difference, not the sum, is compared.
            (axes(-1.0, -0.5), axes(-1.0, -0.5), false),
            (hz(-2.0, -0.7, west), hz(-2.0, -0.7, west), false),
        ];
        for (a, b, moved) in cases {
            assert_eq!(pose_moved(a, b), moved, "{a:?} → {b:?}");
            assert_eq!(pose_moved(b, a), moved, "{b:?} → {a:?}");
        }
    }

    /// A rejected sample's fault: NaN or an infinity is not finite, a finite
    /// value out of range is out of range and carries the value.
    #[test]
    fn rejected_samples_name_their_kind() {
        let nan = Error::check(crate::error::Field::AirPressurePa, f32::NAN, 0.0, 1.0).unwrap_err();
        let inf =
            Error::check(crate::error::Field::AirPressurePa, f32::INFINITY, 0.0, 1.0).unwrap_err();
        let out = Error::check(crate::error::Field::AirPressurePa, 2.0, 0.0, 1.0).unwrap_err();
        let s = Sensor::Air;
        assert_eq!(input_fault(s, &nan), Fault::NotFinite { sensor: s });
        assert_eq!(input_fault(s, &inf), Fault::NotFinite { sensor: s });
        assert_eq!(
            input_fault(s, &out),
            Fault::OutOfRange {
                sensor: s,
                value: 2.0
            }
        );
    }

    #[test]
    fn guard_size_is_a_small_constant() {
        let n = core::mem::size_of::<Guard<'static>>();
        assert!(n < 4608, "Guard is {n} bytes");
        let v = core::mem::size_of::<Verdict>();
        assert!(v < 1024, "Verdict is {v} bytes");
    }

    #[test]
    fn default_config_is_valid() {
        assert!(GuardConfig::default().validate().is_ok());
    }
}
