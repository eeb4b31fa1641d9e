//! The decision rule: what the samples of one step mean for the rig.
//!
//! **Plug-in point.** The station calls [`Rule::decide`] once per step with
//! the samples that arrived in that step and drives the lines from the
//! returned [`Decision`] (sensor faults override it toward park and alarm);
//! faults the rule raises itself ([`Rule::raised_faults`]) are logged
//! as events. The `standfast` guard is plugged in this way by
//! [`crate::guard_adapter::GuardRule`].
//!
//! [`LimitRule`], an independent backstop beside the guard, applies fixed
//! limits on wind speed and ground tilt. It knows nothing of the rig's
//! stability: its limits must come from an assessment of the rig.

use crate::pose::MountPose;
use standfast::error::{Field, Unit};
use standfast::math::Vec3;
use standfast::{Error, Tilt};

/// A wind reading: the core's own sample type (speed at the anemometer,
/// m/s, and the direction it blows from, radians from north clockwise,
/// rig frame, `None` when the vane could not be read); here the mean over
/// one anemometer gate window.
pub use standfast::guard::WindSample;

/// The samples that arrived in one step. `None` means "nothing new this step",
/// either because the sensor has no new reading yet or because it failed; the
/// station reports failures separately as faults.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Samples {
    /// Time of the step, milliseconds on the station's clock.
    pub t_ms: u64,
    /// Specific force measured by the accelerometer, g (1 g = 9.80665 m/s²),
    /// rig frame (x east, y north, z up); about (0, 0, +1) at rest on level
    /// ground.
    pub accel_g: Option<Vec3>,
    /// Wind, when an anemometer gate window completed in this step.
    pub wind: Option<WindSample>,
    /// Mount pose, when the mount controller reported one in this step.
    pub pose: Option<MountPose>,
}

/// What the rule asks of the lines, and the name of its level.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Decision {
    /// Request a park.
    pub park: bool,
    /// Raise the alarm.
    pub alarm: bool,
    /// Name of the current level, for events (lower case, no spaces).
    pub level: &'static str,
}

/// A sensor fault a rule raised itself (beyond the station's own
/// health supervision), by short lower-case names for event lines.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RaisedFault {
    /// The sensor (for the guard: `Sensor::code`, such as `accel`,
    /// `wind_speed`, `wind_direction`, `pose`, `clock`, `model`).
    pub sensor: &'static str,
    /// The class of fault (for the guard: `not_finite`, `out_of_range`,
    /// `time_reversed`, `stale`, `stuck`, `magnitude_out_of_band`,
    /// `tilt_step`, `tilt_beyond_limit`).
    pub class: &'static str,
}

/// Anything that turns one step's samples into a [`Decision`].
pub trait Rule {
    /// Decides on the samples of one step. Called exactly once per step, with
    /// non-decreasing `samples.t_ms`.
    fn decide(&mut self, samples: &Samples) -> Decision;

    /// Sensor faults first raised in the last [`Rule::decide`] call, in
    /// order (none by default). The station logs each as an event.
    fn raised_faults(&self) -> &[RaisedFault] {
        &[]
    }

    /// Events of the last [`Rule::decide`] call that the rule could
    /// not report for lack of room (the guard's
    /// [`standfast::guard::Verdict::events_lost`]); 0 by default. The station
    /// logs a count above 0 as an event.
    fn events_lost(&self) -> u16 {
        0
    }
}

/// Limits for [`LimitRule`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Limits {
    /// Request a park when a gate-mean wind speed reaches this, m/s.
    pub park_wind_mps: f32,
    /// Raise the alarm (and park) when a gate-mean wind speed reaches this, m/s.
    pub alarm_wind_mps: f32,
    /// Raise the alarm (and park) when the ground tilt reaches this, radians.
    pub alarm_tilt_rad: f32,
    /// Keep a request until this long after the last sample over its limit
    /// (inclusive), ms.
    pub hold_ms: u32,
}

impl Limits {
    /// Validated limits.
    ///
    /// # Errors
    /// Park wind outside 1 to 60 m/s, alarm wind below the park wind or above
    /// 80 m/s, tilt outside 0.1 mrad to 45°, or a hold over one day.
    pub fn new(
        park_wind_mps: f32,
        alarm_wind_mps: f32,
        alarm_tilt_rad: f32,
        hold_ms: u32,
    ) -> Result<Self, Error> {
        Error::check(
            Field::External {
                path: "limits.park_wind_mps",
                unit: Unit::MetrePerSecond,
            },
            park_wind_mps,
            1.0,
            60.0,
        )?;
        Error::check(
            Field::External {
                path: "limits.alarm_wind_mps",
                unit: Unit::MetrePerSecond,
            },
            alarm_wind_mps,
            park_wind_mps,
            80.0,
        )?;
        Error::check(
            Field::External {
                path: "limits.alarm_tilt_rad",
                unit: Unit::Radian,
            },
            alarm_tilt_rad,
            1e-4,
            standfast::frame::MAX_TILT_RAD,
        )?;
        if hold_ms > 86_400_000 {
            return Err(Error {
                value: 86_400_001.0,
                min: 0.0,
                max: 86_400_000.0,
                ..Error::new(
                    standfast::ErrorKind::OutOfRange,
                    Field::External {
                        path: "limits.hold_ms",
                        unit: Unit::Millisecond,
                    },
                )
            });
        }
        Ok(Limits {
            park_wind_mps,
            alarm_wind_mps,
            alarm_tilt_rad,
            hold_ms,
        })
    }
}

/// Fixed limits on wind speed and ground tilt, with a hold time.
///
/// Levels: `clear`, `park` (a gate-mean wind at or over the park limit within
/// the hold time) and `alarm` (the alarm wind limit or the tilt limit, within
/// the hold time; also parks). A specific force whose tilt cannot be computed
/// (zero, non-finite, or tilted over 45°: the rig is down) counts as over the
/// tilt limit.
#[derive(Clone, Copy, Debug)]
pub struct LimitRule {
    limits: Limits,
    park_until_ms: Option<u64>,
    alarm_until_ms: Option<u64>,
}

impl LimitRule {
    /// A rule with `limits`, starting clear.
    #[must_use]
    pub const fn new(limits: Limits) -> Self {
        LimitRule {
            limits,
            park_until_ms: None,
            alarm_until_ms: None,
        }
    }

    /// The limits.
    #[must_use]
    pub const fn limits(&self) -> Limits {
        self.limits
    }
}

impl Rule for LimitRule {
    fn decide(&mut self, s: &Samples) -> Decision {
        let until = s.t_ms.saturating_add(u64::from(self.limits.hold_ms));
        let mut alarm_hit = false;
        let mut park_hit = false;
        if let Some(w) = s.wind {
            park_hit |= w.speed_mps >= self.limits.park_wind_mps;
            alarm_hit |= w.speed_mps >= self.limits.alarm_wind_mps;
        }
        if let Some(a) = s.accel_g {
            // Gravity points opposite to the specific force at rest.
            alarm_hit |= match Tilt::from_gravity(-a) {
                Ok(t) => t.magnitude_rad >= self.limits.alarm_tilt_rad,
                Err(_) => true,
            };
        }
        if alarm_hit {
            self.alarm_until_ms = Some(until);
        }
        if park_hit || alarm_hit {
            self.park_until_ms = Some(until);
        }
        let alarm = self.alarm_until_ms.is_some_and(|u| s.t_ms <= u);
        let park = alarm || self.park_until_ms.is_some_and(|u| s.t_ms <= u);
        let level = if alarm {
            "alarm"
        } else if park {
            "park"
        } else {
            "clear"
        };
        Decision { park, alarm, level }
    }
}
