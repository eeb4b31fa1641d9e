//! The rig frame, ground tilt and wind direction.
//!
//! **Rig frame.** Right-handed, fixed to the ground the rig stands on: origin on
//! the ground plane directly under the tripod's (or pier's) vertical axis,
//! x toward geographic east, y toward geographic north, z normal to the ground
//! plane, upward. Lengths in metres. On level ground z is the true vertical.
//! Feet stand in the plane z = 0.
//!
//! **Azimuths** are measured from +y (north) clockwise toward +x (east), in
//! radians, the surveyor's and meteorologist's convention.
//!
//! **Tilt** of the ground is described by its magnitude and the azimuth of the
//! downhill direction, both in the rig frame; with tilt, gravity gains a
//! component along the downhill direction.

use crate::error::{Error, ErrorKind, Field};
use crate::math::{self, Vec3};

/// Horizontal unit vector (z = 0) at azimuth `az_rad` (from north, clockwise).
#[must_use]
pub fn azimuth_unit(az_rad: f32) -> Vec3 {
    Vec3::new(math::sin(az_rad), math::cos(az_rad), 0.0)
}

/// Azimuth in [0, 2π) of the horizontal part of `v` (from north, clockwise);
/// 0 for a vertical or zero vector.
#[must_use]
pub fn azimuth_of(v: Vec3) -> f32 {
    if v.x == 0.0 && v.y == 0.0 {
        0.0
    } else {
        math::wrap_tau(math::atan2(v.x, v.y))
    }
}

/// Ground tilt: how far the ground normal (rig +z) leans from the true vertical,
/// and toward which azimuth the ground falls away.
/// # Examples
/// ```
/// use standfast::math::{deg_to_rad, Vec3};
/// use standfast::Tilt;
///
/// // 1.5° falling away to the south.
/// let t = Tilt::new(deg_to_rad(1.5), deg_to_rad(180.0))?;
/// assert!((t.magnitude_rad - 0.026_18).abs() < 1e-5);
/// // From a measured gravity direction (down) in the rig frame.
/// let g = Tilt::from_gravity(Vec3::new(0.0, 0.02, -1.0))?;
/// assert!(g.magnitude_rad > 0.019 && g.magnitude_rad < 0.021);
/// assert!(Tilt::new(f32::NAN, 0.0).is_err());
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Tilt {
    /// Angle between the ground normal and the true vertical, radians, ≥ 0.
    pub magnitude_rad: f32,
    /// Azimuth of the downhill direction in the rig frame, radians from north
    /// clockwise. Meaningless (and ignored) when `magnitude_rad` is 0.
    pub downhill_azimuth_rad: f32,
}

/// Largest tilt the model accepts: 45°. Beyond it the rig is not standing.
pub const MAX_TILT_RAD: f32 = core::f32::consts::FRAC_PI_4;

impl Tilt {
    /// Level ground.
    pub const LEVEL: Tilt = Tilt {
        magnitude_rad: 0.0,
        downhill_azimuth_rad: 0.0,
    };

    /// A validated tilt.
    ///
    /// # Errors
    /// Non-finite values, or a magnitude outside 0 to [`MAX_TILT_RAD`].
    pub fn new(magnitude_rad: f32, downhill_azimuth_rad: f32) -> Result<Tilt, Error> {
        Error::check(Field::TiltMagnitudeRad, magnitude_rad, 0.0, MAX_TILT_RAD)?;
        Error::check(
            Field::TiltDownhillAzimuthRad,
            downhill_azimuth_rad,
            -1e4,
            1e4,
        )?;
        Ok(Tilt {
            magnitude_rad,
            downhill_azimuth_rad: math::wrap_tau(downhill_azimuth_rad),
        })
    }

    /// The tilt whose gravity direction is `down` (any length, rig frame).
    ///
    /// # Errors
    /// [`ErrorKind::ZeroDirection`] for a zero or non-finite vector;
    /// [`ErrorKind::OutOfRange`] when the tilt exceeds [`MAX_TILT_RAD`].
    pub fn from_gravity(down: Vec3) -> Result<Tilt, Error> {
        let g = down
            .normalized()
            .ok_or(Error::new(ErrorKind::ZeroDirection, Field::TiltGravity))?;
        let magnitude = math::acos(-g.z);
        Tilt::new(magnitude, azimuth_of(g))
    }

    /// Unit vector of gravity (pointing down) in the rig frame.
    #[must_use]
    pub fn gravity_unit(self) -> Vec3 {
        let s = math::sin(self.magnitude_rad);
        let c = math::cos(self.magnitude_rad);
        azimuth_unit(self.downhill_azimuth_rad) * s + Vec3::new(0.0, 0.0, -c)
    }
}

/// Unit vector, in the rig frame, along which air moves for a wind blowing
/// *from* azimuth `from_rad` (meteorological convention), made perpendicular to
/// gravity `g_unit` so that wind stays truly horizontal on tilted ground.
#[must_use]
pub(crate) fn wind_unit(from_rad: f32, g_unit: Vec3) -> Vec3 {
    let toward = -azimuth_unit(from_rad);
    toward.reject(g_unit).normalized().unwrap_or(toward)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn level_gravity_is_minus_z() {
        let g = Tilt::LEVEL.gravity_unit();
        assert!((g.z + 1.0).abs() < 1e-7 && g.x.abs() < 1e-7);
    }

    #[test]
    fn gravity_round_trip() {
        let t = Tilt::new(0.1, 1.0).unwrap();
        let back = Tilt::from_gravity(t.gravity_unit() * 9.8).unwrap();
        assert!((back.magnitude_rad - 0.1).abs() < 1e-5);
        assert!((back.downhill_azimuth_rad - 1.0).abs() < 1e-4);
    }

    #[test]
    fn east_downhill_pulls_east() {
        let t = Tilt::new(0.2, core::f32::consts::FRAC_PI_2).unwrap();
        assert!(t.gravity_unit().x > 0.19);
    }

    #[test]
    fn wind_from_north_blows_south() {
        let w = wind_unit(0.0, Tilt::LEVEL.gravity_unit());
        assert!((w.y + 1.0).abs() < 1e-6);
    }
}
