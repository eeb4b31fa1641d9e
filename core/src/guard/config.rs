//! The guard's configuration: thresholds and timing, each with its reason
//! and its accepted range.

use super::transition::Thresholds;
use super::MAX_PARK_POSES;
use crate::error::{Error, ErrorKind, Field};
use crate::mount::Pose;
use crate::rig::MAX_WIND_SPEED_MPS;
pub(super) use crate::sense::s_to_ms;
use crate::sense::{TiltConfig, WindConfig};
use heapless::Vec;

/// Longest accepted time between physics evaluations, s: a minute. Longer,
/// and a slew or a gust front could go unjudged for longer than a park
/// takes.
pub const MAX_EVALUATE_EVERY_S: f32 = 60.0;

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

impl WindSource {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            WindSource::Samples => "samples",
            WindSource::TenMinuteMeans => "ten_minute_means",
        }
    }
}

/// Thresholds and timing of the guard. Every default is given with its reason.
/// # Examples
/// The defaults, one threshold changed, and a configuration refused with the
/// field, value and range named:
/// ```
/// use standfast::error::{ErrorKind, Field};
/// use standfast::GuardConfig;
///
/// let mut config = GuardConfig { park_utilisation: 0.6, ..GuardConfig::default() };
/// config.validate()?;
/// config.park_utilisation = f32::NAN;
/// let e = config.validate().unwrap_err();
/// assert_eq!((e.kind, e.field), (ErrorKind::NotFinite, Field::GuardParkUtilisation));
/// # Ok::<(), standfast::Error>(())
/// ```
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
    /// [`AlertLevel::Watch`](super::AlertLevel::Watch). Default 0.5: half way to the tipping point, time to
    /// look at the rig.
    pub watch_utilisation: f32,
    /// Predicted overturning utilisation (at the end of a park) that raises
    /// [`AlertLevel::ParkNow`](super::AlertLevel::ParkNow). Default 0.75: by analogy with mobile cranes on
    /// crawlers, whose rated load is at most 75 % of the tipping load
    /// (ASME B30.5 §5-1.1.1), leaving a quarter for what the model misses.
    pub park_utilisation: f32,
    /// Present overturning or sliding utilisation (at the peak gust) that raises
    /// [`AlertLevel::Alarm`](super::AlertLevel::Alarm). Default 0.9: the early-warning level of crane rated
    /// capacity limiters (EN 13000 practice, warning at about 90 %).
    pub alarm_utilisation: f32,
    /// Governing drive utilisation (steady torque against rated torque, with
    /// the slew torque against repeated peak, gust torque against momentary
    /// peak; see [`crate::torque::Utilisation`]) that raises
    /// [`AlertLevel::ParkNow`](super::AlertLevel::ParkNow). Default 1.0: beyond its ratings a drive may slip or
    /// backdrive.
    pub drive_park_utilisation: f32,
    /// Hysteresis: a figure counts as settled below this fraction of the
    /// threshold it crossed. Default 0.8.
    pub clear_ratio: f32,
    /// Time every figure must stay settled before the alert level steps down, s.
    /// Default 600 s: one 10-minute mean period, so a lull between gusts
    /// does not unpark a rig in a rising storm.
    pub dwell_s: f32,
    /// Time the mount needs to reach its park pose, s. Default 120 s.
    pub time_to_park_s: f32,
    /// Factor on the predicted gust speed. Default 1.15: the next gust may beat
    /// the peak of the last ten minutes (common practice, no source).
    pub gust_allowance: f32,
    /// Remaining tilt margin (extra tilt that would tip the rig with no wind)
    /// below which [`AlertLevel::Alarm`](super::AlertLevel::Alarm) is raised, radians. Default 5° (0.0873 rad):
    /// well above the 1–3° chassis-tilt alarms of aerial work platforms,
    /// measured here as distance from tipping.
    pub tilt_margin_alarm_rad: f32,
    /// Tilt drift rate that raises [`AlertLevel::Watch`](super::AlertLevel::Watch), rad/s. Default 0.5°/h
    /// (2.42e-6 rad/s): a leg sinking that fast needs a look before dawn.
    pub drift_watch_rad_per_s: f32,
    /// Time without faults before leaving [`AlertLevel::SensorFault`](super::AlertLevel::SensorFault), s. Default
    /// 60 s.
    pub fault_clear_s: f32,
    /// Least time between physics evaluations, s, 0 to
    /// [`MAX_EVALUATE_EVERY_S`] (used in whole milliseconds, rounded to
    /// nearest, like every duration here); samples in between only update
    /// the filters (a changed pose or cover state evaluates at once, see
    /// [`super::POSE_TOLERANCE_RAD`]). Default 1 s: wind statistics change
    /// on the 0.25 s bin and the 3-s window, tilt on a 1 s filter.
    pub evaluate_every_s: f32,
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
            evaluate_every_s: 1.0,
            assumed_pose: None,
            park_poses: Vec::new(),
        }
    }
}

impl GuardConfig {
    /// Checks every field against its documented range, and that every wind
    /// sample the wind configuration accepts can be evaluated by the physics
    /// ([`GuardConfig::max_gust_at_rig_mps`] at most
    /// [`MAX_WIND_SPEED_MPS`]).
    ///
    /// # Errors
    /// The first invalid field, named `guard.<field>` (the tilt and wind
    /// processors' own fields as `guard.tilt.<field>` and `guard.wind.<field>`).
    pub fn validate(&self) -> Result<(), Error> {
        self.tilt.validate()?;
        self.wind.validate()?;
        if self.wind_source == WindSource::TenMinuteMeans {
            // A mean arrives every ten minutes: a shorter stale time would
            // fault between two reports.
            Error::check(
                Field::WindStaleAfterS,
                self.wind.stale_after_s,
                600.0,
                86_400.0,
            )?;
        }
        Error::check(
            Field::GuardWatchUtilisation,
            self.watch_utilisation,
            0.05,
            1.0,
        )?;
        Error::check(
            Field::GuardParkUtilisation,
            self.park_utilisation,
            self.watch_utilisation,
            1.0,
        )?;
        Error::check(
            Field::GuardAlarmUtilisation,
            self.alarm_utilisation,
            self.watch_utilisation,
            1.0,
        )?;
        Error::check(
            Field::GuardDriveParkUtilisation,
            self.drive_park_utilisation,
            0.1,
            5.0,
        )?;
        Error::check(Field::GuardClearRatio, self.clear_ratio, 0.1, 1.0)?;
        Error::check(Field::GuardDwellS, self.dwell_s, 0.0, 86_400.0)?;
        Error::check(Field::GuardTimeToParkS, self.time_to_park_s, 0.0, 3_600.0)?;
        Error::check(Field::GuardGustAllowance, self.gust_allowance, 1.0, 2.0)?;
        Error::check(
            Field::GuardTiltMarginAlarmRad,
            self.tilt_margin_alarm_rad,
            0.0,
            0.5,
        )?;
        Error::check(
            Field::GuardDriftWatchRadPerS,
            self.drift_watch_rad_per_s,
            0.0,
            1.0,
        )?;
        Error::check(Field::GuardFaultClearS, self.fault_clear_s, 0.0, 86_400.0)?;
        Error::check(
            Field::GuardEvaluateEveryS,
            self.evaluate_every_s,
            0.0,
            MAX_EVALUATE_EVERY_S,
        )?;
        self.check_wind_within_model()?;
        Ok(())
    }

    /// The highest gust at rig height, m/s, that a wind input the
    /// configuration accepts can produce: `wind.max_speed_mps` × the height
    /// factor (anemometer → rig), × `wind.mean_gust_factor` for a station of
    /// ten-minute means.
    ///
    /// # Errors
    /// An invalid height profile (as [`WindConfig::height_factor`]).
    pub fn max_gust_at_rig_mps(&self) -> Result<f32, Error> {
        let mut factor = self.wind.height_factor()?;
        if self.wind_source == WindSource::TenMinuteMeans {
            factor *= self.wind.mean_gust_factor;
        }
        Ok(self.wind.max_speed_mps * factor)
    }

    /// Every wind sample the configuration accepts must be one the physics
    /// can evaluate: the highest gust at rig height
    /// ([`GuardConfig::max_gust_at_rig_mps`]) at most
    /// [`MAX_WIND_SPEED_MPS`]. Otherwise a valid sample would give figures
    /// the model refuses, which the guard could only report as a fault.
    fn check_wind_within_model(&self) -> Result<(), Error> {
        let max_gust = self.max_gust_at_rig_mps()?;
        if max_gust <= MAX_WIND_SPEED_MPS {
            return Ok(());
        }
        // The accepted range of the sensor's limit that keeps it inside the
        // model, in the sensor's own terms.
        let limit = self.wind.max_speed_mps * MAX_WIND_SPEED_MPS / max_gust;
        Err(Error {
            kind: ErrorKind::OutOfRange,
            field: Field::WindMaxSpeedMps,
            index: None,
            value: self.wind.max_speed_mps,
            min: 1.0,
            max: limit,
        })
    }

    /// The thresholds of the decision ([`super::transition`]), with the
    /// times in whole milliseconds (rounded to nearest, as every duration of
    /// the crate).
    #[must_use]
    pub fn thresholds(&self) -> Thresholds {
        Thresholds {
            watch_utilisation: self.watch_utilisation,
            park_utilisation: self.park_utilisation,
            alarm_utilisation: self.alarm_utilisation,
            drive_park_utilisation: self.drive_park_utilisation,
            clear_ratio: self.clear_ratio,
            tilt_margin_alarm_rad: self.tilt_margin_alarm_rad,
            drift_watch_rad_per_s: self.drift_watch_rad_per_s,
            dwell_ms: s_to_ms(self.dwell_s),
            fault_clear_ms: s_to_ms(self.fault_clear_s),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Durations in seconds become whole milliseconds, rounded to nearest
    /// (half up): 600 s is 600 000 ms exactly, 1.5 ms is 2 ms, 0 is 0.
    #[test]
    fn durations_round_to_whole_milliseconds() {
        assert_eq!(s_to_ms(600.0), 600_000);
        assert_eq!(s_to_ms(0.0015), 2);
        assert_eq!(s_to_ms(0.0014), 1);
        assert_eq!(s_to_ms(0.0), 0);
        let c = GuardConfig {
            dwell_s: 20.0,
            fault_clear_s: 5.0,
            ..GuardConfig::default()
        };
        let t = c.thresholds();
        assert_eq!((t.dwell_ms, t.fault_clear_ms), (20_000, 5_000));
        assert_eq!(t.clear_ratio, c.clear_ratio);
    }

    /// The evaluation period is accepted from 0 to a minute, inclusive.
    #[test]
    fn the_evaluation_period_range_is_inclusive() {
        for (s, ok) in [(0.0, true), (60.0, true), (60.001, false), (-0.001, false)] {
            let c = GuardConfig {
                evaluate_every_s: s,
                ..GuardConfig::default()
            };
            assert_eq!(c.validate().is_ok(), ok, "{s} s");
        }
    }
}
