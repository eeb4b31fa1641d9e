//! The guard: live samples in, a staged park-and-alarm decision out.
//!
//! Each [`Guard::step`] takes the caller's time stamp and whatever samples
//! arrived since the last step (accelerometer, wind, mount pose, cover, air)
//! and returns a [`Verdict`]: the present overturning and sliding
//! utilisation, the utilisation predicted for the end of a park, the tip wind
//! speed for the present pose and wind direction, the tilt margin, the stage
//! ([`Stage`]) and the events of this step.
//!
//! **Stages**, in rising order: [`Stage::Clear`], [`Stage::Watch`],
//! [`Stage::ParkNow`], [`Stage::Alarm`]; and [`Stage::SensorFault`], which is
//! treated as unsafe (park and alarm) because the guard cannot see.
//! - Escalation is immediate.
//! - De-escalation needs every driving figure below `clear_ratio` times the
//!   threshold of the present stage for `dwell_s` seconds without a break.
//! - The alarm latches until [`Guard::acknowledge`]. A sensor fault does not
//!   latch: the stage leaves [`Stage::SensorFault`] once every sensor has been
//!   healthy for `fault_clear_s`, going to the stage the figures call for,
//!   but no lower than [`Stage::Watch`].
//!
//! **Park early enough.** Parking takes `time_to_park_s`. The guard predicts
//! the gust at the end of that time: the larger of the peak gust of the recent
//! window and the latest gust plus its rise rate over the park time, times
//! `gust_allowance`; it requests the park when the utilisation at that gust
//! reaches `park_utilisation`, so that the rig is parked before the limit.
//!
//! **Wind direction.** With a defined direction the guard uses it; with a
//! variable, calm or unknown direction it takes the worst direction, as the
//! wind may swing to it.
//!
//! **Memory.** The guard holds no reference-counted or heap data; its size is a
//! compile-time constant, `core::mem::size_of::<Guard>()`, under 4 KiB
//! (checked by a unit test). The rig is borrowed, not copied.
//!
//! **Caution.** A verdict is an estimate from a static model and live sensors;
//! it does not replace securing the rig.

use crate::air::{celsius_to_kelvin, Air};
use crate::error::Error;
use crate::frame::Tilt;
use crate::mount::Pose;
use crate::rig::{Conditions, Rig};
use crate::sense::{
    Fault, FaultSet, MeanWind, Millis, TiltConfig, TiltSensor, WindConfig, WindReport, WindStats,
    FINE_BIN_MS,
};
use crate::sky::ParkRequest;
use heapless::Vec;

/// Most extra park poses a guard considers besides the home pose.
pub const MAX_PARK_POSES: usize = 4;
/// Most events one step can report.
pub const MAX_EVENTS: usize = 8;
/// Minutes of one-minute gust maxima kept to estimate a rising wind.
pub const GUST_HISTORY_MIN: usize = 10;

/// The stage of the guard, in rising order of severity.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Stage {
    /// All figures comfortably inside their limits.
    #[default]
    Clear,
    /// A figure has passed the watch threshold: keep an eye on the rig.
    Watch,
    /// Park the mount now (the predicted utilisation at the end of a park
    /// reaches the park threshold, or a drive would be overloaded).
    ParkNow,
    /// The rig is close to tipping or sliding now, or has tilted near its
    /// limit: park, and a person must act. Latches until acknowledged.
    Alarm,
    /// A sensor fault: the guard cannot see, so it acts as for an alarm.
    SensorFault,
}

impl Stage {
    /// True when the park-request output should be asserted.
    #[must_use]
    pub fn park_requested(self) -> bool {
        self >= Stage::ParkNow
    }

    /// True when the alarm output should be asserted.
    #[must_use]
    pub fn alarm(self) -> bool {
        self >= Stage::Alarm
    }

    /// A short lower-case name for logs.
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            Stage::Clear => "clear",
            Stage::Watch => "watch",
            Stage::ParkNow => "park_now",
            Stage::Alarm => "alarm",
            Stage::SensorFault => "sensor_fault",
        }
    }
}

/// What drove a stage change.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Cause {
    /// Overturning utilisation (present or predicted).
    Overturning,
    /// Sliding utilisation.
    Sliding,
    /// Ground tilt near the tipping tilt, or drifting.
    Tilt,
    /// Drive torque.
    Drive,
    /// A sensor fault.
    Sensor,
    /// Figures back below their thresholds for the dwell time.
    Settled,
    /// An operator acknowledged the alarm.
    Acknowledged,
}

/// Something worth logging that happened in a step.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Event {
    /// The stage changed.
    StageChanged {
        /// Previous stage.
        from: Stage,
        /// New stage.
        to: Stage,
        /// Why.
        cause: Cause,
    },
    /// A sensor fault was raised (first step it is seen).
    FaultRaised(Fault),
    /// The highest overturning utilisation since start (lowest margin) rose.
    NewHighUtilisation {
        /// Overturning utilisation, dimensionless.
        utilisation: f32,
    },
}

/// What the guard's wind input carries.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum WindSource {
    /// Speed and direction samples at any rate: gusts are measured (3-s
    /// running mean, WMO-No. 8).
    #[default]
    Samples,
    /// Ten-minute mean speeds (and directions) only: the gust is estimated
    /// as mean × gust factor ([`crate::sense::MeanWind`]).
    TenMinuteMeans,
}

/// Thresholds and timing of the guard. Every default is given with its reason.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct GuardConfig {
    /// Accelerometer processing.
    pub tilt: TiltConfig,
    /// Anemometer processing.
    pub wind: WindConfig,
    /// What the wind input carries: samples of the wind (default), or
    /// ten-minute mean speeds from a station that reports only statistics,
    /// whose gust is the mean × `wind.mean_gust_factor` (chosen by terrain).
    #[cfg_attr(feature = "serde", serde(default))]
    pub wind_source: WindSource,
    /// Predicted overturning or sliding utilisation that raises
    /// [`Stage::Watch`]. Default 0.5: half way to the tipping point, time to
    /// look at the rig.
    pub watch_utilisation: f32,
    /// Predicted overturning utilisation (at the end of a park) that raises
    /// [`Stage::ParkNow`]. Default 0.75: by analogy with mobile cranes on
    /// crawlers, whose rated load is at most 75 % of the tipping load
    /// (ASME B30.5 §5-1.1.1), leaving a quarter for what the model misses.
    pub park_utilisation: f32,
    /// Present overturning or sliding utilisation (at the peak gust) that raises
    /// [`Stage::Alarm`]. Default 0.9: the early-warning level of crane rated
    /// capacity limiters (EN 13000 practice, warning at about 90 %).
    pub alarm_utilisation: f32,
    /// Governing drive utilisation (steady torque against rated torque, with
    /// the slew torque against repeated peak, gust torque against momentary
    /// peak; see [`crate::torque::Utilisation`]) that raises
    /// [`Stage::ParkNow`]. Default 1.0: beyond its ratings a drive may slip or
    /// backdrive.
    pub drive_park_utilisation: f32,
    /// Hysteresis: a figure counts as settled below this fraction of the
    /// threshold it crossed. Default 0.8.
    pub clear_ratio: f32,
    /// Time every figure must stay settled before the stage steps down, s.
    /// Default 600 s: one 10-minute mean period, so a lull between gusts
    /// does not unpark a rig in a rising storm.
    pub dwell_s: f32,
    /// Time the mount needs to reach its park pose, s. Default 120 s.
    pub time_to_park_s: f32,
    /// Factor on the predicted gust speed. Default 1.15: the next gust may beat
    /// the peak of the last ten minutes (common practice, no source).
    pub gust_allowance: f32,
    /// Remaining tilt margin (extra tilt that would tip the rig with no wind)
    /// below which [`Stage::Alarm`] is raised, radians. Default 5° (0.0873 rad):
    /// well above the 1–3° chassis-tilt alarms of aerial work platforms,
    /// measured here as distance from tipping.
    pub tilt_margin_alarm_rad: f32,
    /// Tilt drift rate that raises [`Stage::Watch`], rad/s. Default 0.5°/h
    /// (2.42e-6 rad/s): a leg sinking that fast needs a look before dawn.
    pub drift_watch_rad_per_s: f32,
    /// Time without faults before leaving [`Stage::SensorFault`], s. Default
    /// 60 s.
    pub fault_clear_s: f32,
    /// Least time between physics evaluations, ms; samples in between only
    /// update the filters. Default 1000 ms: wind statistics change on the
    /// 0.25 s bin and the 3-s window, tilt on a 1 s filter.
    pub evaluate_every_ms: u64,
    /// Pose assumed until the mount reports one. Default: `None`, the mount's
    /// home pose.
    #[cfg_attr(feature = "serde", serde(default))]
    pub assumed_pose: Option<Pose>,
    /// Extra park poses to choose among, besides the home pose.
    #[cfg_attr(feature = "serde", serde(default))]
    pub park_poses: Vec<Pose, MAX_PARK_POSES>,
}

impl Default for GuardConfig {
    fn default() -> Self {
        GuardConfig {
            tilt: TiltConfig::default(),
            wind: WindConfig::default(),
            wind_source: WindSource::Samples,
            watch_utilisation: 0.5,
            park_utilisation: 0.75,
            alarm_utilisation: 0.9,
            drive_park_utilisation: 1.0,
            clear_ratio: 0.8,
            dwell_s: 600.0,
            time_to_park_s: 120.0,
            gust_allowance: 1.15,
            tilt_margin_alarm_rad: 0.087_266_46,
            drift_watch_rad_per_s: 2.424e-6,
            fault_clear_s: 60.0,
            evaluate_every_ms: 1000,
            assumed_pose: None,
            park_poses: Vec::new(),
        }
    }
}

impl GuardConfig {
    /// Checks every field.
    ///
    /// # Errors
    /// The first invalid field, named `guard.<field>`.
    pub fn validate(&self) -> Result<(), Error> {
        self.tilt.validate()?;
        self.wind.validate()?;
        if self.wind_source == WindSource::TenMinuteMeans {
            // A mean arrives every ten minutes: a shorter stale time would
            // fault between two reports.
            Error::check(
                "guard.wind.stale_after_s",
                self.wind.stale_after_s,
                600.0,
                86_400.0,
            )?;
        }
        Error::check("guard.watch_utilisation", self.watch_utilisation, 0.05, 1.0)?;
        Error::check(
            "guard.park_utilisation",
            self.park_utilisation,
            self.watch_utilisation,
            1.0,
        )?;
        Error::check(
            "guard.alarm_utilisation",
            self.alarm_utilisation,
            self.watch_utilisation,
            1.0,
        )?;
        Error::check(
            "guard.drive_park_utilisation",
            self.drive_park_utilisation,
            0.1,
            5.0,
        )?;
        Error::check("guard.clear_ratio", self.clear_ratio, 0.1, 1.0)?;
        Error::check("guard.dwell_s", self.dwell_s, 0.0, 86_400.0)?;
        Error::check("guard.time_to_park_s", self.time_to_park_s, 0.0, 3_600.0)?;
        Error::check("guard.gust_allowance", self.gust_allowance, 1.0, 2.0)?;
        Error::check(
            "guard.tilt_margin_alarm_rad",
            self.tilt_margin_alarm_rad,
            0.0,
            0.5,
        )?;
        Error::check(
            "guard.drift_watch_rad_per_s",
            self.drift_watch_rad_per_s,
            0.0,
            1.0,
        )?;
        Error::check("guard.fault_clear_s", self.fault_clear_s, 0.0, 86_400.0)?;
        Ok(())
    }
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
    /// Air temperature, °C.
    pub temperature_c: f32,
    /// Station pressure, Pa.
    pub pressure_pa: f32,
}

/// Whatever arrived since the last step. Every field is optional.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Inputs {
    /// Raw accelerometer sample, sensor axes, in counts or g (see
    /// [`TiltConfig::scale_g_per_count`]).
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
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Verdict {
    /// Time stamp of the step.
    pub now: Millis,
    /// The stage.
    pub stage: Stage,
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
    /// (or worst) direction, m/s.
    pub tip_wind_mps: Option<f32>,
    /// The gust the figures are computed for, m/s at rig height.
    pub gust_mps: Option<f32>,
    /// The gust predicted for the end of a park, m/s at rig height.
    pub predicted_gust_mps: Option<f32>,
    /// Direction used, radians from north clockwise (the worst one when the
    /// measured direction is not defined).
    pub wind_from_rad: Option<f32>,
    /// Present ground tilt.
    pub tilt: Option<Tilt>,
    /// Extra tilt that would tip the rig with no wind, radians.
    pub tilt_margin_rad: Option<f32>,
    /// The pose the figures are for.
    pub pose: Pose,
    /// With a park request: the safest park pose for the present wind.
    pub park_pose: Option<Pose>,
    /// Active sensor faults.
    pub faults: FaultSet,
    /// Events of this step.
    pub events: Vec<Event, MAX_EVENTS>,
}

/// Figures of one physics evaluation.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
struct Figures {
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
    park_pose: Option<Pose>,
}

/// Figures of one pose and wind: overturning and sliding utilisation
/// (dimensionless), tip wind (m/s), the direction used (rad from north,
/// clockwise) and the overturning utilisation at the predicted gust.
#[derive(Clone, Copy, Debug)]
struct Utilisations {
    overturning: f32,
    sliding: f32,
    tip_wind_mps: Option<f32>,
    from_rad: f32,
    predicted: Option<f32>,
}

/// The guard. Borrows the rig; all other state is inline and fixed in size.
#[derive(Clone, Debug)]
pub struct Guard<'r> {
    rig: &'r Rig,
    config: GuardConfig,
    tilt: TiltSensor,
    wind: WindStats,
    means: MeanWind,
    stage: Stage,
    pose: Pose,
    cover_fitted: bool,
    air: Air,
    last_eval: Option<Millis>,
    figures: Figures,
    settled_since: Option<Millis>,
    fault_free_since: Option<Millis>,
    alarm_latched: bool,
    known_faults: FaultSet,
    highest_utilisation: f32,
    gust_minutes: [f32; GUST_HISTORY_MIN],
    gust_minute_index: u64,
    /// The 3-s gust of the wind report for one fine wind bin (index
    /// `now / FINE_BIN_MS`), kept until the next wind sample: between wind
    /// samples the gust changes only from one bin to the next, so steps
    /// that do not evaluate the physics need no full report.
    gust_3s_cache: Option<(u64, Option<f32>)>,
}

impl<'r> Guard<'r> {
    /// A guard for `rig`, started at `now`.
    ///
    /// # Errors
    /// An invalid configuration.
    pub fn new(rig: &'r Rig, config: GuardConfig, now: Millis) -> Result<Guard<'r>, Error> {
        config.validate()?;
        let pose = config.assumed_pose.unwrap_or(rig.mount().home_pose());
        rig.mount().axis_angles(pose)?;
        for p in &config.park_poses {
            rig.mount().axis_angles(*p)?;
        }
        Ok(Guard {
            rig,
            tilt: TiltSensor::new(config.tilt, now)?,
            wind: WindStats::new(config.wind, now)?,
            means: MeanWind::new(config.wind, now)?,
            config,
            stage: Stage::Clear,
            pose,
            cover_fitted: false,
            air: Air::default(),
            last_eval: None,
            figures: Figures::default(),
            settled_since: None,
            fault_free_since: Some(now),
            alarm_latched: false,
            known_faults: FaultSet::default(),
            highest_utilisation: 0.0,
            gust_minutes: [0.0; GUST_HISTORY_MIN],
            gust_minute_index: now.0 / 60_000,
            gust_3s_cache: None,
        })
    }

    /// The configuration.
    #[must_use]
    pub fn config(&self) -> &GuardConfig {
        &self.config
    }

    /// The present stage.
    #[must_use]
    pub fn stage(&self) -> Stage {
        self.stage
    }

    /// The tilt processor (for a level capture at set-up).
    pub fn tilt_sensor_mut(&mut self) -> &mut TiltSensor {
        &mut self.tilt
    }

    /// Sets the air density used until measured air arrives in
    /// [`Inputs::air`] (for example from the site elevation).
    pub fn set_air(&mut self, air: Air) {
        self.air = air;
    }

    /// Acknowledges a latched alarm: the stage may step down once the figures
    /// have settled (immediately, if they already have for the dwell time).
    pub fn acknowledge(&mut self) {
        self.alarm_latched = false;
    }

    /// One step: feed the samples that arrived, evaluate the physics when due,
    /// and decide. Rejected samples become faults in the verdict; nothing
    /// panics.
    pub fn step(&mut self, now: Millis, inputs: &Inputs) -> Verdict {
        let mut events: Vec<Event, MAX_EVENTS> = Vec::new();
        let mut rejected = FaultSet::default();
        if let Some(raw) = inputs.accel_raw {
            if let Err(f) = self.tilt.push(now, raw) {
                rejected.push(f);
            }
        }
        let means = self.config.wind_source == WindSource::TenMinuteMeans;
        if let Some(w) = inputs.wind {
            self.gust_3s_cache = None;
            let pushed = if means {
                self.means.push(now, w.speed_mps, w.from_rad)
            } else {
                self.wind.push(now, w.speed_mps, w.from_rad)
            };
            if let Err(f) = pushed {
                rejected.push(f);
            }
        }
        if let Some(p) = inputs.pose {
            if self.rig.mount().axis_angles(p).is_ok() {
                self.pose = p;
            }
        }
        if let Some(c) = inputs.cover_fitted {
            self.cover_fitted = c;
        }
        if let Some(a) = inputs.air {
            if let Ok(air) =
                Air::from_temperature_pressure(celsius_to_kelvin(a.temperature_c), a.pressure_pa)
            {
                self.air = air;
            }
        }

        // The same pushes, in the same order, as tilt.faults(now) extended
        // by wind.faults(now) and the rejections.
        let mut faults = FaultSet::new();
        self.tilt.faults_into(now, &mut faults);
        if means {
            faults.extend(&self.means.faults(now));
        } else {
            self.wind.faults_into(now, &mut faults);
        }
        faults.extend(&rejected);
        for f in faults.iter() {
            if !self.known_faults.any(|k| k.same_class(&f)) {
                let _ = events.push(Event::FaultRaised(f));
            }
        }
        self.known_faults = faults;

        let due = self
            .last_eval
            .is_none_or(|t| now.since(t) >= self.config.evaluate_every_ms)
            || inputs.pose.is_some()
            || inputs.cover_fitted.is_some();
        // The full wind report only when the physics is evaluated; otherwise
        // the 3-s gust for the gust history (`WindStats::gust_3s_mps`, the
        // report's value without the rest of the report), from the cache
        // when the wind bin and the wind samples are unchanged.
        let bin = now.0 / FINE_BIN_MS;
        let report = if due {
            let r = if means {
                self.means.report(now)
            } else {
                self.wind.report(now)
            };
            self.gust_3s_cache = Some((bin, r.gust_3s_mps));
            Some(r)
        } else {
            None
        };
        let gust_3s = match (&report, self.gust_3s_cache) {
            (Some(r), _) => r.gust_3s_mps,
            (None, Some((b, g))) if b == bin => g,
            (None, _) => {
                let g = if means {
                    self.means.report(now).gust_3s_mps
                } else {
                    self.wind.gust_3s_mps(now)
                };
                self.gust_3s_cache = Some((bin, g));
                g
            }
        };
        self.track_gust_minutes(now, gust_3s);
        if let Some(report) = report {
            self.figures = self.evaluate(&report);
            self.last_eval = Some(now);
            if let Some(u) = self.figures.overturning {
                if u > self.highest_utilisation + 0.01 {
                    self.highest_utilisation = u;
                    let _ = events.push(Event::NewHighUtilisation { utilisation: u });
                }
            }
        }
        self.decide(now, &faults, &mut events);
        // The park pose is searched only while a park is requested, once per
        // evaluation (it costs one assessment per candidate).
        if self.stage.park_requested() && (due || self.figures.park_pose.is_none()) {
            self.figures.park_pose = match (self.figures.predicted_gust_mps, self.figures.from_rad)
            {
                (Some(v), Some(d)) => self.safest_park_pose(v, d),
                _ => Some(self.rig.mount().home_pose()),
            };
        }

        let fig = self.figures;
        Verdict {
            now,
            stage: self.stage,
            overturning_utilisation: fig.overturning,
            predicted_utilisation: fig.predicted,
            sliding_utilisation: fig.sliding,
            drive_utilisation: fig.drive,
            tip_wind_mps: fig.tip_wind_mps,
            gust_mps: fig.gust_mps,
            predicted_gust_mps: fig.predicted_gust_mps,
            wind_from_rad: fig.from_rad,
            tilt: self.tilt.tilt(),
            tilt_margin_rad: fig.tilt_margin_rad,
            pose: self.pose,
            park_pose: if self.stage.park_requested() {
                fig.park_pose
            } else {
                None
            },
            faults,
            events,
        }
    }

    fn track_gust_minutes(&mut self, now: Millis, gust_3s_mps: Option<f32>) {
        let minute = now.0 / 60_000;
        if minute != self.gust_minute_index {
            let steps = minute.saturating_sub(self.gust_minute_index);
            for _ in 0..steps.min(GUST_HISTORY_MIN as u64) {
                self.gust_minutes.rotate_right(1);
                if let Some(first) = self.gust_minutes.first_mut() {
                    *first = 0.0;
                }
            }
            self.gust_minute_index = minute;
        }
        if let (Some(g), Some(first)) = (gust_3s_mps, self.gust_minutes.first_mut()) {
            if g > *first {
                *first = g;
            }
        }
    }

    /// Rise rate of the gust, m/s per s: the slope between the mean of the
    /// last two one-minute maxima and of the two five minutes before, never
    /// negative.
    fn gust_rise_mps_per_s(&self) -> f32 {
        let m = &self.gust_minutes;
        let (Some(a0), Some(a1), Some(b0), Some(b1)) = (m.first(), m.get(1), m.get(5), m.get(6))
        else {
            return 0.0;
        };
        if *b0 <= 0.0 || *b1 <= 0.0 {
            return 0.0;
        }
        (((a0 + a1) - (b0 + b1)) * 0.5 / 300.0).max(0.0)
    }

    fn conditions(&self, pose: Pose, speed_mps: f32, from_rad: f32) -> Conditions {
        Conditions {
            pose,
            tilt: self.tilt.tilt().unwrap_or(Tilt::LEVEL),
            wind_speed_mps: speed_mps,
            wind_from_rad: from_rad,
            air: self.air,
            cover_fitted: self.cover_fitted,
        }
    }

    /// Overturning utilisation, sliding utilisation, tip wind and direction
    /// for a pose at a speed, from the given direction or the worst one; and
    /// the overturning utilisation at `predicted` m/s from that direction.
    fn utilisations(
        &self,
        pose: Pose,
        speed: f32,
        from: Option<f32>,
        predicted: f32,
    ) -> Option<Utilisations> {
        let dir = match from {
            Some(d) => d,
            None => {
                let c = self.conditions(pose, speed, 0.0);
                self.rig.worst_direction_utilisation(&c).ok()?.1
            }
        };
        let (a, at_predicted) = self
            .rig
            .assess_with_utilisation_at(&self.conditions(pose, speed, dir), predicted)
            .ok()?;
        Some(Utilisations {
            overturning: a.critical.utilisation,
            sliding: a.sliding.utilisation,
            tip_wind_mps: a.tip_wind_mps,
            from_rad: dir,
            predicted: at_predicted,
        })
    }

    fn evaluate(&self, report: &WindReport) -> Figures {
        let mut f = Figures {
            drift_rad_per_s: self.tilt.drift_rate_rad_per_s().abs(),
            ..Figures::default()
        };
        let measured_from = match report.direction {
            crate::sense::WindDirection::Defined { from_rad, .. }
            | crate::sense::WindDirection::Reported { from_rad } => Some(from_rad),
            _ => None,
        };
        // Gusts only (measured, or estimated from a ten-minute mean): before
        // the first 3 s of record the guard has no gust yet and holds its
        // figures empty (stale and fault checks run regardless).
        let Some(gust) = report.peak_gust_mps.or(report.gust_3s_mps) else {
            return f;
        };
        let latest = report.gust_3s_mps.unwrap_or(gust);
        let rise = self.gust_rise_mps_per_s() * self.config.time_to_park_s;
        let predicted = gust.max(latest + rise) * self.config.gust_allowance;
        f.gust_mps = Some(gust);
        f.predicted_gust_mps = Some(predicted);
        if let Some(u) = self.utilisations(self.pose, gust, measured_from, predicted) {
            f.overturning = Some(u.overturning);
            f.sliding = Some(u.sliding);
            f.tip_wind_mps = u.tip_wind_mps;
            f.from_rad = Some(u.from_rad);
            f.predicted = u.predicted;
        }
        let mean = report.mean_10min_mps.unwrap_or(gust);
        f.drive = self.drive_utilisation(gust, mean, f.from_rad);
        let c = self.conditions(self.pose, 0.0, 0.0);
        f.tilt_margin_rad = self.rig.tilt_margin(&c).ok().map(|m| m.extra_rad);
        f
    }

    /// Governing drive utilisation per axis ([primary, secondary]) at the
    /// gust, with the 10-minute mean as the steady wind (see
    /// [`crate::torque::Utilisation`]); `None` without drive ratings.
    fn drive_utilisation(
        &self,
        gust_mps: f32,
        mean_mps: f32,
        from: Option<f32>,
    ) -> Option<[f32; 2]> {
        self.rig.drives()?;
        let c = self.conditions(self.pose, gust_mps, from.unwrap_or(0.0));
        let loads = self.rig.axis_loads(&c, mean_mps.min(gust_mps)).ok()?;
        Some([
            loads.primary.utilisation?.governing,
            loads.secondary.utilisation?.governing,
        ])
    }

    /// The safest park pose for the predicted gust from `from_rad`: among the
    /// home pose and the configured park poses, the one whose highest
    /// utilisation (overturning, or either drive) is lowest
    /// ([`Rig::safest_park`]).
    fn safest_park_pose(&self, speed_mps: f32, from_rad: f32) -> Option<Pose> {
        let req = ParkRequest {
            wind_from_rad: from_rad,
            wind_speed_mps: speed_mps,
            air: self.air,
            tilt: self.tilt.tilt().unwrap_or(Tilt::LEVEL),
            cover_fitted: self.cover_fitted,
            scan: None,
        };
        self.rig
            .safest_park(&req, &self.config.park_poses)
            .ok()
            .map(|c| c.best.pose)
    }

    /// The stage the figures call for, and the cause.
    fn wanted(&self, faults: &FaultSet) -> (Stage, Cause) {
        if !faults.is_empty() {
            return (Stage::SensorFault, Cause::Sensor);
        }
        let c = &self.config;
        let f = &self.figures;
        let over = f.overturning.unwrap_or(0.0);
        let pred = f.predicted.unwrap_or(0.0);
        let slide = f.sliding.unwrap_or(0.0);
        if over >= c.alarm_utilisation {
            return (Stage::Alarm, Cause::Overturning);
        }
        if slide >= c.alarm_utilisation {
            return (Stage::Alarm, Cause::Sliding);
        }
        if f.tilt_margin_rad
            .is_some_and(|m| m <= c.tilt_margin_alarm_rad)
        {
            return (Stage::Alarm, Cause::Tilt);
        }
        if pred >= c.park_utilisation {
            return (Stage::ParkNow, Cause::Overturning);
        }
        if f.drive
            .is_some_and(|d| d.iter().any(|&u| u >= c.drive_park_utilisation))
        {
            return (Stage::ParkNow, Cause::Drive);
        }
        if pred >= c.watch_utilisation || slide >= c.watch_utilisation {
            return (Stage::Watch, Cause::Overturning);
        }
        if f.drift_rad_per_s >= c.drift_watch_rad_per_s {
            return (Stage::Watch, Cause::Tilt);
        }
        (Stage::Clear, Cause::Settled)
    }

    /// True when every figure is below `clear_ratio` times the threshold of the
    /// stage above `target` (the one being left).
    fn settled_for(&self, target: Stage) -> bool {
        let c = &self.config;
        let f = &self.figures;
        let r = c.clear_ratio;
        let pred = f.predicted.unwrap_or(0.0);
        let over = f.overturning.unwrap_or(0.0);
        let slide = f.sliding.unwrap_or(0.0);
        let drive_ok = f
            .drive
            .is_none_or(|d| d.iter().all(|&u| u < r * c.drive_park_utilisation));
        match target {
            Stage::Clear => {
                pred < r * c.watch_utilisation
                    && slide < r * c.watch_utilisation
                    && f.drift_rad_per_s < r * c.drift_watch_rad_per_s
            }
            Stage::Watch => pred < r * c.park_utilisation && drive_ok,
            Stage::ParkNow => {
                over < r * c.alarm_utilisation
                    && slide < r * c.alarm_utilisation
                    && f.tilt_margin_rad
                        .is_none_or(|m| m * r > c.tilt_margin_alarm_rad)
            }
            Stage::Alarm | Stage::SensorFault => true,
        }
    }

    fn decide(&mut self, now: Millis, faults: &FaultSet, events: &mut Vec<Event, MAX_EVENTS>) {
        if !faults.is_empty() {
            self.fault_free_since = None;
        } else if self.fault_free_since.is_none() {
            self.fault_free_since = Some(now);
        }
        let (wanted, cause) = self.wanted(faults);
        let from = self.stage;
        if wanted > from {
            // Only a physical alarm latches; a sensor fault clears by itself
            // once the sensors have been healthy for `fault_clear_s` (its
            // events stay in the log).
            if wanted == Stage::Alarm {
                self.alarm_latched = true;
            }
            self.stage = wanted;
            self.settled_since = None;
            let _ = events.push(Event::StageChanged {
                from,
                to: wanted,
                cause,
            });
            return;
        }
        if wanted == from {
            self.settled_since = None;
            return;
        }
        // Leaving a sensor fault: once the sensors have been healthy for
        // `fault_clear_s`, to the stage the figures call for but no lower than
        // watch, from which the usual dwell applies: the windows have just
        // refilled and deserve a look before the all-clear.
        if from == Stage::SensorFault {
            let clear_for = self.fault_free_since.map_or(0.0, |t| now.seconds_since(t));
            if clear_for >= self.config.fault_clear_s {
                let to = wanted.max(Stage::Watch);
                self.stage = to;
                self.settled_since = None;
                let _ = events.push(Event::StageChanged {
                    from,
                    to,
                    cause: Cause::Settled,
                });
            }
            return;
        }
        // Stepping down: the figures settled for `dwell_s` (tracked even while
        // an alarm is latched, so an acknowledgement after a long calm takes
        // effect at once) and no latch.
        if !self.settled_for(wanted) {
            self.settled_since = None;
            return;
        }
        let since = *self.settled_since.get_or_insert(now);
        if self.alarm_latched {
            return;
        }
        if now.seconds_since(since) >= self.config.dwell_s {
            self.stage = wanted;
            self.settled_since = None;
            let _ = events.push(Event::StageChanged {
                from,
                to: wanted,
                cause: Cause::Settled,
            });
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stage_order_and_outputs() {
        assert!(Stage::Clear < Stage::Watch && Stage::Alarm < Stage::SensorFault);
        assert!(!Stage::Watch.park_requested() && Stage::ParkNow.park_requested());
        assert!(!Stage::ParkNow.alarm() && Stage::SensorFault.alarm());
    }

    #[test]
    fn guard_size_is_a_small_constant() {
        let n = core::mem::size_of::<Guard<'static>>();
        assert!(n < 4096, "Guard is {n} bytes");
        let v = core::mem::size_of::<Verdict>();
        assert!(v < 1024, "Verdict is {v} bytes");
        let r = core::mem::size_of::<Rig>();
        assert!(r < 4096, "Rig is {r} bytes");
    }

    #[test]
    fn default_config_is_valid() {
        assert!(GuardConfig::default().validate().is_ok());
    }
}
