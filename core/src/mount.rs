//! Mount kinematics: where the axes point and where every moving part goes for
//! a given pose.
//!
//! A mount has two stages. The **primary stage** turns about the primary axis
//! (the polar axis of an equatorial mount, the vertical axis of an
//! alt-azimuth mount); the **secondary stage** (the tube and all it carries)
//! turns with it and also about the secondary axis (declination, altitude). The
//! axes meet at the **axis origin**, a point fixed in the rig frame.
//!
//! Each stage has a frame of three unit vectors, given in rig coordinates:
//! - primary stage: `[s, q, k]` with `s` the secondary-axis direction pointing
//!   to the payload side, `k` the primary axis, `q = k × s`;
//! - secondary stage: `[s, p, n]` with `p` the tube direction (toward the
//!   sky) and `n = p × s`.
//!
//! Offsets of parts are given in these frames: a payload centre of gravity at
//! `(a, b, c)` in the secondary frame lies at `a·s + b·p + c·n` from the axis
//! origin; a counterweight `L` down the shaft lies at `(−L, 0, 0)` in the
//! primary frame.
//!
//! **Equatorial.** With φ the site latitude (north positive), the celestial
//! frame is x̂ = (0, −sin φ, cos φ) (the equator on the meridian), ŷ = east,
//! ẑ = (0, cos φ, sin φ) (toward the north celestial pole), in rig
//! coordinates on level ground. For mechanical angles θ₁ (primary) and θ₂
//! (secondary): s = sin θ₁·x̂ + cos θ₁·ŷ and
//! p = cos θ₂·cos θ₁·x̂ − cos θ₂·sin θ₁·ŷ + sin θ₂·ẑ. For the [`PierSide::TubeEast`] side θ₁ = H (hour angle,
//! positive west) and θ₂ = δ; for [`PierSide::TubeWest`] θ₁ = H + π and
//! θ₂ = π − δ: the same sky position reached through the pole. The names say
//! where the payload lies at the meridian: with θ₁ = 0 the secondary axis points
//! east. The home pose, counterweight down and tube toward the elevated pole,
//! is θ₁ = π/2, θ₂ = ±π/2. The formulas hold in either hemisphere.
//!
//! **Alt-azimuth.** For azimuth A (from north, clockwise) and altitude h:
//! f = (sin A, cos A, 0), k = ẑ, s = ẑ × f (horizontal, to the left looking
//! along the tube), p = cos h·f + sin h·ẑ. Mechanical angles are θ₁ = A,
//! θ₂ = h.

use crate::error::{Error, Field};
use crate::math::{self, Vec3, PI};

/// The kind of mount.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum MountKind {
    /// German equatorial: polar axis toward the elevated celestial pole,
    /// payload and counterweights on opposite ends of the declination axis.
    Equatorial,
    /// Alt-azimuth: vertical and horizontal axes.
    AltAzimuth,
}

impl MountKind {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            MountKind::Equatorial => "equatorial",
            MountKind::AltAzimuth => "alt_azimuth",
        }
    }
}

/// Which way round an equatorial mount reaches a sky position (see the module
/// docs). Ignored by alt-azimuth mounts.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum PierSide {
    /// θ₁ = H, θ₂ = δ: the usual side for targets west of the meridian.
    #[default]
    TubeEast,
    /// θ₁ = H + π, θ₂ = π − δ: the usual side for targets east of the meridian.
    TubeWest,
}

impl PierSide {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            PierSide::TubeEast => "tube_east",
            PierSide::TubeWest => "tube_west",
        }
    }
}

impl PierSide {
    /// The other side.
    #[must_use]
    pub fn flipped(self) -> PierSide {
        match self {
            PierSide::TubeEast => PierSide::TubeWest,
            PierSide::TubeWest => PierSide::TubeEast,
        }
    }
}

/// A mount pose.
/// # Examples
/// The same pointing of an equatorial mount at latitude 50° given two ways,
/// and the axis angles they come to:
/// ```
/// use standfast::math::deg_to_rad;
/// use standfast::{MountGeometry, PierSide, Pose};
///
/// let mount = MountGeometry::equatorial(deg_to_rad(50.0), [0.0, 0.0, 1.2]);
/// // One hour west of the meridian, declination +20°, tube east of the pier.
/// let eq = Pose::Equatorial {
///     hour_angle_rad: deg_to_rad(15.0),
///     declination_rad: deg_to_rad(20.0),
///     pier_side: PierSide::TubeEast,
/// };
/// let (t1, t2) = mount.axis_angles(eq)?;
/// let axes = Pose::Axes { primary_rad: t1, secondary_rad: t2 };
/// assert_eq!(mount.axis_angles(axes)?, (t1, t2));
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Pose {
    /// Mechanical axis angles θ₁ (primary) and θ₂ (secondary), radians, as
    /// defined in the module docs.
    Axes {
        /// Primary-axis angle θ₁, radians.
        primary_rad: f32,
        /// Secondary-axis angle θ₂, radians.
        secondary_rad: f32,
    },
    /// Hour angle (positive west of the meridian), declination and pier side.
    Equatorial {
        /// Hour angle H, radians, positive west.
        hour_angle_rad: f32,
        /// Declination δ, radians, −π/2 to π/2.
        declination_rad: f32,
        /// Pier side (equatorial mounts only).
        pier_side: PierSide,
    },
    /// Horizontal coordinates of the tube direction.
    Horizontal {
        /// Azimuth, radians from north clockwise.
        azimuth_rad: f32,
        /// Altitude above the horizon, radians, −π/2 to π/2.
        altitude_rad: f32,
        /// Pier side (equatorial mounts only).
        pier_side: PierSide,
    },
}

/// The stage frames of a mount in one pose, in rig coordinates.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StageFrames {
    /// The point where the axes meet, rig frame, metres.
    pub origin_m: Vec3,
    /// Primary-stage frame `[s, q, k]` (unit vectors).
    pub primary: [Vec3; 3],
    /// Secondary-stage frame `[s, p, n]` (unit vectors).
    pub secondary: [Vec3; 3],
}

impl StageFrames {
    /// Unit vector of the primary axis (k).
    #[must_use]
    pub fn primary_axis(&self) -> Vec3 {
        self.primary[2]
    }

    /// Unit vector of the secondary axis (s), toward the payload side.
    #[must_use]
    pub fn secondary_axis(&self) -> Vec3 {
        self.secondary[0]
    }

    /// Unit vector along the tube toward the sky (p).
    #[must_use]
    pub fn tube(&self) -> Vec3 {
        self.secondary[1]
    }
}

/// Mount geometry: kind, site latitude and where the axes meet.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct MountGeometry {
    /// The kind of mount.
    pub kind: MountKind,
    /// Site latitude φ, radians, north positive, −π/2 to π/2.
    pub latitude_rad: f32,
    /// The point where the axes meet, rig frame, metres.
    pub axis_origin_m: [f32; 3],
}

impl MountGeometry {
    /// An alt-azimuth mount at latitude `latitude_rad` (north positive) whose
    /// axes meet at `axis_origin_m` (rig frame, metres).
    #[must_use]
    pub fn alt_azimuth(latitude_rad: f32, axis_origin_m: [f32; 3]) -> MountGeometry {
        MountGeometry {
            kind: MountKind::AltAzimuth,
            latitude_rad,
            axis_origin_m,
        }
    }

    /// A German equatorial mount at latitude `latitude_rad` (north positive)
    /// whose axes meet at `axis_origin_m` (rig frame, metres).
    #[must_use]
    pub fn equatorial(latitude_rad: f32, axis_origin_m: [f32; 3]) -> MountGeometry {
        MountGeometry {
            kind: MountKind::Equatorial,
            latitude_rad,
            axis_origin_m,
        }
    }
}

/// Horizontal coordinates (azimuth from north clockwise, altitude) of the
/// direction with hour angle `h_rad` and declination `dec_rad` at latitude
/// `lat_rad`, all radians. Standard spherical astronomy (Meeus, *Astronomical
/// Algorithms*, ch. 13, with azimuth counted from north).
#[must_use]
pub fn equatorial_to_horizontal(h_rad: f32, dec_rad: f32, lat_rad: f32) -> (f32, f32) {
    let (sh, ch) = (math::sin(h_rad), math::cos(h_rad));
    let (sd, cd) = (math::sin(dec_rad), math::cos(dec_rad));
    let (sp, cp) = (math::sin(lat_rad), math::cos(lat_rad));
    let x = -ch * cd * sp + sd * cp;
    let y = -sh * cd;
    let z = ch * cd * cp + sd * sp;
    let r = math::hypot(x, y);
    let az = if r == 0.0 { 0.0 } else { math::atan2(y, x) };
    (math::wrap_tau(az), math::atan2(z, r))
}

/// Hour angle and declination of the horizontal direction (azimuth from north
/// clockwise, altitude) at latitude `lat_rad`; the inverse of
/// [`equatorial_to_horizontal`]. Hour angle in (−π, π].
#[must_use]
pub fn horizontal_to_equatorial(az_rad: f32, alt_rad: f32, lat_rad: f32) -> (f32, f32) {
    let (sa, ca) = (math::sin(az_rad), math::cos(az_rad));
    let (se, ce) = (math::sin(alt_rad), math::cos(alt_rad));
    let (sp, cp) = (math::sin(lat_rad), math::cos(lat_rad));
    let x = -ca * ce * sp + se * cp;
    let y = -sa * ce;
    let z = ca * ce * cp + se * sp;
    let r = math::hypot(x, y);
    let h = if r == 0.0 { 0.0 } else { math::atan2(y, x) };
    (h, math::atan2(z, r))
}

impl MountGeometry {
    /// Checks the latitude and axis origin.
    ///
    /// # Errors
    /// Latitude outside ±90°, axis origin outside ±10 m or below the ground.
    pub fn validate(&self) -> Result<(), Error> {
        Error::check(
            Field::MountLatitudeRad,
            self.latitude_rad,
            -PI / 2.0,
            PI / 2.0,
        )?;
        let o = Vec3::from_array(self.axis_origin_m);
        Error::check_vec(Field::MountAxisOriginM, o, -10.0, 10.0)?;
        Error::check(Field::MountAxisOriginM, o.z, 0.05, 10.0)?;
        Ok(())
    }

    /// Mechanical angles (θ₁, θ₂) of a pose for this mount, radians.
    ///
    /// # Errors
    /// A non-finite angle, or a declination or altitude beyond ±90°.
    pub fn axis_angles(&self, pose: Pose) -> Result<(f32, f32), Error> {
        let lim = 100.0 * PI;
        match pose {
            Pose::Axes {
                primary_rad,
                secondary_rad,
            } => {
                Error::check(Field::PosePrimaryRad, primary_rad, -lim, lim)?;
                Error::check(Field::PoseSecondaryRad, secondary_rad, -lim, lim)?;
                Ok((primary_rad, secondary_rad))
            }
            Pose::Equatorial {
                hour_angle_rad,
                declination_rad,
                pier_side,
            } => {
                Error::check(Field::PoseHourAngleRad, hour_angle_rad, -lim, lim)?;
                Error::check(
                    Field::PoseDeclinationRad,
                    declination_rad,
                    -PI / 2.0,
                    PI / 2.0,
                )?;
                match self.kind {
                    MountKind::Equatorial => {
                        Ok(side_angles(hour_angle_rad, declination_rad, pier_side))
                    }
                    MountKind::AltAzimuth => Ok(equatorial_to_horizontal(
                        hour_angle_rad,
                        declination_rad,
                        self.latitude_rad,
                    )),
                }
            }
            Pose::Horizontal {
                azimuth_rad,
                altitude_rad,
                pier_side,
            } => {
                Error::check(Field::PoseAzimuthRad, azimuth_rad, -lim, lim)?;
                Error::check(Field::PoseAltitudeRad, altitude_rad, -PI / 2.0, PI / 2.0)?;
                match self.kind {
                    MountKind::AltAzimuth => Ok((azimuth_rad, altitude_rad)),
                    MountKind::Equatorial => {
                        let (h, d) =
                            horizontal_to_equatorial(azimuth_rad, altitude_rad, self.latitude_rad);
                        Ok(side_angles(h, d, pier_side))
                    }
                }
            }
        }
    }

    /// The stage frames for a pose.
    ///
    /// # Errors
    /// As [`MountGeometry::axis_angles`].
    pub fn frames(&self, pose: Pose) -> Result<StageFrames, Error> {
        let (t1, t2) = self.axis_angles(pose)?;
        Ok(self.frames_at(t1, t2))
    }

    /// The stage frames for mechanical angles θ₁, θ₂ in radians.
    #[must_use]
    pub fn frames_at(&self, t1: f32, t2: f32) -> StageFrames {
        let (s1, c1) = (math::sin(t1), math::cos(t1));
        let (s2, c2) = (math::sin(t2), math::cos(t2));
        let (k, s, p) = match self.kind {
            MountKind::Equatorial => {
                let (sp, cp) = (math::sin(self.latitude_rad), math::cos(self.latitude_rad));
                let xe = Vec3::new(0.0, -sp, cp);
                let ye = Vec3::X;
                let ze = Vec3::new(0.0, cp, sp);
                let s = xe * s1 + ye * c1;
                let p = xe * (c2 * c1) - ye * (c2 * s1) + ze * s2;
                (ze, s, p)
            }
            MountKind::AltAzimuth => {
                let f = Vec3::new(s1, c1, 0.0);
                let s = Vec3::Z.cross(f);
                let p = f * c2 + Vec3::Z * s2;
                (Vec3::Z, s, p)
            }
        };
        StageFrames {
            origin_m: Vec3::from_array(self.axis_origin_m),
            primary: [s, k.cross(s), k],
            secondary: [s, p, p.cross(s)],
        }
    }

    /// Horizontal coordinates (azimuth from north clockwise, altitude), radians,
    /// of the tube direction in a pose, on level ground.
    ///
    /// # Errors
    /// As [`MountGeometry::axis_angles`].
    pub fn tube_horizontal(&self, pose: Pose) -> Result<(f32, f32), Error> {
        let p = self.frames(pose)?.tube();
        let alt = math::asin(p.z);
        Ok((crate::frame::azimuth_of(p), alt))
    }

    /// The home pose: for an equatorial mount counterweight down and tube toward
    /// the elevated pole; for an alt-azimuth mount tube level toward north.
    #[must_use]
    pub fn home_pose(&self) -> Pose {
        match self.kind {
            MountKind::Equatorial => Pose::Axes {
                primary_rad: PI / 2.0,
                secondary_rad: if self.latitude_rad < 0.0 {
                    -PI / 2.0
                } else {
                    PI / 2.0
                },
            },
            MountKind::AltAzimuth => Pose::Axes {
                primary_rad: 0.0,
                secondary_rad: 0.0,
            },
        }
    }
}

fn side_angles(h: f32, dec: f32, side: PierSide) -> (f32, f32) {
    match side {
        PierSide::TubeEast => (h, dec),
        PierSide::TubeWest => (h + PI, PI - dec),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn gem(lat_deg: f32) -> MountGeometry {
        MountGeometry {
            kind: MountKind::Equatorial,
            latitude_rad: math::deg_to_rad(lat_deg),
            axis_origin_m: [0.0, 0.0, 1.2],
        }
    }

    #[test]
    fn home_points_at_pole_with_counterweight_down() {
        for lat in [45.0, -30.0] {
            let m = gem(lat);
            let f = m.frames(m.home_pose()).unwrap();
            let (az, alt) = m.tube_horizontal(m.home_pose()).unwrap();
            assert!((alt - math::deg_to_rad(lat).abs()).abs() < 1e-5);
            let north = if lat > 0.0 { 0.0 } else { PI };
            assert!((math::wrap_pi(az - north)).abs() < 1e-4);
            // Counterweight end (−s) is lowest.
            assert!(f.secondary_axis().z > 0.0);
        }
    }

    #[test]
    fn pier_sides_point_the_same_way() {
        let m = gem(40.0);
        let a = Pose::Equatorial {
            hour_angle_rad: 0.7,
            declination_rad: 0.3,
            pier_side: PierSide::TubeEast,
        };
        let b = Pose::Equatorial {
            hour_angle_rad: 0.7,
            declination_rad: 0.3,
            pier_side: PierSide::TubeWest,
        };
        let (fa, fb) = (m.frames(a).unwrap(), m.frames(b).unwrap());
        assert!((fa.tube() - fb.tube()).norm() < 1e-5);
        assert!((fa.secondary_axis() + fb.secondary_axis()).norm() < 1e-5);
    }

    #[test]
    fn frames_are_orthonormal() {
        let m = gem(52.0);
        let f = m.frames_at(1.1, -0.4);
        for fr in [f.primary, f.secondary] {
            for i in 0..3 {
                assert!((fr[i].norm() - 1.0).abs() < 1e-5);
                for j in 0..i {
                    assert!(fr[i].dot(fr[j]).abs() < 1e-5);
                }
            }
        }
    }

    #[test]
    fn conversion_round_trip() {
        let (az, alt) = equatorial_to_horizontal(0.5, 0.2, 0.8);
        let (h, d) = horizontal_to_equatorial(az, alt, 0.8);
        assert!((h - 0.5).abs() < 1e-5 && (d - 0.2).abs() < 1e-5);
    }
}
