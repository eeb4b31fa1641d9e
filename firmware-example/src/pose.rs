//! The mount pose, when the mount controller reports it.
//!
//! The pose is optional: many rigs have no link from the mount to this
//! controller, and a link can fall silent. The station passes a pose to the
//! rule only in the step it arrived; what to assume in between (hold the
//! last pose for a while, or take the worst pose) is the rule's choice.

use standfast::error::Field;
use standfast::math;
use standfast::Error;

/// Equatorial mount pose.
///
/// Hour angle: radians, positive west of the meridian (the astronomer's
/// convention), wrapped to [−π, π). Declination: radians, positive north,
/// in [−π/2, π/2].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MountPose {
    /// Hour angle, radians, positive west, in [−π, π).
    pub hour_angle_rad: f32,
    /// Declination, radians, positive north, in [−π/2, π/2].
    pub declination_rad: f32,
}

impl MountPose {
    /// A validated pose; the hour angle is wrapped to [−π, π).
    ///
    /// # Errors
    /// Non-finite values, an hour angle outside ±4π, or a declination outside
    /// ±π/2 (with 1e-6 rad of slack for rounding).
    pub fn new(hour_angle_rad: f32, declination_rad: f32) -> Result<Self, Error> {
        let quarter = core::f32::consts::FRAC_PI_2 + 1e-6;
        Error::check(
            Field::PoseHourAngleRad,
            hour_angle_rad,
            -4.0 * core::f32::consts::PI,
            4.0 * core::f32::consts::PI,
        )?;
        Error::check(
            Field::PoseDeclinationRad,
            declination_rad,
            -quarter,
            quarter,
        )?;
        Ok(MountPose {
            hour_angle_rad: math::wrap_pi(hour_angle_rad),
            declination_rad: math::clamp(
                declination_rad,
                -core::f32::consts::FRAC_PI_2,
                core::f32::consts::FRAC_PI_2,
            ),
        })
    }
}
