//! # Standfast core
//!
//! Static overturning and sliding margins, drive torque loads and a
//! park-and-alarm guard with alert levels for telescope rigs left standing
//! outdoors.
//!
//! `no_std`, no allocation, `f32`, panic-free. SI units inside; every name that
//! carries a quantity says its unit (`_m`, `_kg`, `_n`, `_nm`, `_mps`, `_rad`,
//! `_pa`). Positions are in the rig frame described in [`frame`].
//!
//! **Caution.** Every number here is an estimate from a simplified static model.
//! Secure the rig anyway, stay inside the mount maker's limits and defer to local
//! codes and licensed engineers.
//!
//! ## Map
//! The types an integrator needs are re-exported at the root (see below);
//! the modules hold the rest.
//! - [`rig`]: the rig description ([`RigSpec`], its parts and the builders
//!   for common ones), the validated [`Rig`], the [`Conditions`] it is
//!   judged in and the placement of its parts in a pose;
//! - [`stability`]: overturning about every edge of the support polygon,
//!   sliding, tip wind speed, tilt margin, foot reactions, ballast and
//!   tie-down needs ([`StabilityFigures`]);
//! - [`torque`]: drive torques and utilisation of both mount axes, inertia
//!   formulas, balance;
//! - [`sky`]: scans over the whole sky (worst pose, payload envelope, the
//!   safest park pose);
//! - [`guard`]: the park-and-alarm decision (an alert level) from live samples
//!   ([`Guard`], [`GuardConfig`], [`Inputs`], [`Verdict`]);
//! - [`sense`]: accelerometer tilt (the verdict's [`TiltReading`]), wind
//!   statistics, sensor faults and the time stamp [`Millis`];
//! - [`support`]: feet and the support polygon ([`Support`]);
//! - [`mount`]: mount kinds, kinematics and poses ([`Pose`]);
//! - [`shape`]: wind-exposed shapes and their drag;
//! - [`air`]: air density ([`Air`]);
//! - [`frame`]: the rig frame, ground tilt ([`Tilt`]);
//! - [`drive`]: drive ratings;
//! - [`hardware`]: counterweight hardware checks (bolts, threads, shafts,
//!   materials);
//! - [`weighing`]: the centre of gravity of the whole rig from scale
//!   readings under its feet, level, lifted and tilted to unload;
//! - [`math`]: the 3-vector [`Vec3`], angle conversions and the constants
//!   the crate's interfaces use;
//! - [`bounded`]: the fixed-capacity list and string types that appear in
//!   the rig description and the verdict;
//! - [`error`]: the typed [`Error`].
//!
//! ## Example
//! An invented rig: a 9 kg alt-azimuth head and tube on a light tripod. The
//! static answer first, then the guard fed a steady breeze for 70 s.
//!
//! ```
//! use standfast::math::deg_to_rad;
//! use standfast::rig::{LegsSpec, Stage};
//! use standfast::{
//!     BodySpec, Conditions, Guard, GuardConfig, Inputs, Millis, MountGeometry, PierSide, Pose,
//!     Rig, RigSpec, Support, WindSample,
//! };
//!
//! let spec = RigSpec::new(
//!     &Support::tripod(0.45, 0.0)?, // feet on a 0.45 m circle, one north
//!     MountGeometry::alt_azimuth(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
//!     0.3, // friction coefficient of the feet on grass, a low value
//! )
//! .with_legs(LegsSpec::new(0.8, 0.03, 1.05, 0.06))
//! // 5 kg, 12 cm across, 70 cm long, 15 cm beside the altitude axis, its
//! // centre of gravity 10 cm up the tube.
//! .with_body(BodySpec::optical_tube(5.0, 0.12, 0.7, [0.15, 0.1, 0.0]).labelled("tube"))?
//! .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]).labelled("head"))?;
//! let rig = Rig::new(&spec)?;
//! let pose = Pose::Horizontal {
//!     azimuth_rad: deg_to_rad(90.0),
//!     altitude_rad: deg_to_rad(30.0),
//!     pier_side: PierSide::TubeEast,
//! };
//! let worst = rig.worst_wind(&Conditions::calm(pose))?;
//! if let Some(v) = worst.tip_wind_mps {
//!     println!("tips at {v:.1} m/s from {:.0}°", worst.from_rad.to_degrees());
//!     assert!(v > 10.0 && v < 60.0);
//! }
//!
//! // The guard: 4 samples a second of a level accelerometer (in g) and a
//! // 5 m/s breeze from the west, each with a little noise (bit-identical
//! // readings for a minute would be a stuck sensor). The guard starts in the
//! // sensor-fault level (no reading yet) and leaves it after a minute of
//! // healthy inputs.
//! let mut guard = Guard::new(&rig, GuardConfig::default(), Millis(0))?;
//! let inputs = |i: u64| Inputs {
//!     accel_raw: Some([0.0, 0.0, 1.0 + 0.001 * (i % 3) as f32]),
//!     wind: Some(WindSample { speed_mps: 5.0 + 0.1 * (i % 4) as f32, from_rad: Some(deg_to_rad(270.0)) }),
//!     pose: Some(pose),
//!     ..Inputs::default()
//! };
//! for i in 1..280_u64 {
//!     guard.step(Millis(250 * i), &inputs(i));
//! }
//! let verdict = guard.step(Millis(250 * 280), &inputs(280));
//! assert!(verdict.faults.is_empty());
//! assert!(!verdict.level.park_requested());
//! let u = verdict.overturning_utilisation.unwrap_or(f32::NAN);
//! assert!(u > 0.0 && u < 0.5, "overturning utilisation {u}");
//! # Ok::<(), standfast::Error>(())
//! ```
#![no_std]
#![cfg_attr(docsrs, feature(doc_cfg))]

pub mod air;
pub mod drive;
pub mod error;
pub mod frame;
pub mod guard;
pub mod hardware;
pub mod math;
pub mod mount;
pub mod rig;
pub mod sense;
pub mod shape;
pub mod sky;
pub mod stability;
pub mod support;
pub mod torque;
pub mod weighing;

pub use air::Air;
pub use error::{Error, ErrorKind};
pub use frame::Tilt;
pub use guard::{AirSample, Guard, GuardConfig, Inputs, Verdict, WindSample};
pub use math::Vec3;
pub use mount::{MountGeometry, MountKind, PierSide, Pose};
pub use rig::{BodySpec, Conditions, Rig, RigSpec};
pub use sense::Millis;
pub use sense::TiltReading;
pub use stability::StabilityFigures;
pub use support::{Foot, Support};

/// The fixed-capacity containers of the public interface: the lists of the
/// rig description ([`RigSpec`]), the labels of its parts and the events of a
/// [`Verdict`] are `Vec`s and `String`s of the `heapless` crate (0.9), with
/// the capacity in the type. Only these two types are re-exported.
pub mod bounded {
    pub use heapless::{String, Vec};
}

#[cfg(test)]
mod tests {
    /// Every printed name is distinct within its enum and in snake case.
    #[test]
    fn enum_names_are_distinct_snake_case() {
        use crate::guard::{AlertCause, AlertLevel, WindSource};
        use crate::mount::{MountKind, PierSide};
        use crate::rig::{MassModel, Stage};
        use crate::sense::{LevelCapture, SignedAxis, TerrainCategory, TiltReference};
        let lists: [&[&str]; 9] = [
            &[
                Stage::Ground.name(),
                Stage::Primary.name(),
                Stage::Secondary.name(),
            ],
            &[
                MassModel::Point.name(),
                MassModel::Solid.name(),
                MassModel::Shell.name(),
            ],
            &[MountKind::Equatorial.name(), MountKind::AltAzimuth.name()],
            &[PierSide::TubeEast.name(), PierSide::TubeWest.name()],
            &[
                WindSource::Samples.name(),
                WindSource::TenMinuteMeans.name(),
            ],
            &[
                TerrainCategory::Cat0Sea.name(),
                TerrainCategory::CatIFlat.name(),
                TerrainCategory::CatIIOpen.name(),
                TerrainCategory::CatIIISuburban.name(),
                TerrainCategory::CatIVUrban.name(),
            ],
            &[
                LevelCapture::Idle.name(),
                LevelCapture::InProgress.name(),
                LevelCapture::Done.name(),
                LevelCapture::Failed.name(),
            ],
            &[
                TiltReference::Absolute.name(),
                TiltReference::LevelReference.name(),
            ],
            &[
                SignedAxis::PlusX.name(),
                SignedAxis::MinusX.name(),
                SignedAxis::PlusY.name(),
                SignedAxis::MinusY.name(),
                SignedAxis::PlusZ.name(),
                SignedAxis::MinusZ.name(),
            ],
        ];
        let levels = AlertLevel::ALL.map(AlertLevel::name);
        let cause = AlertCause::Settled.name();
        for list in lists.iter().copied().chain([&levels[..], &[cause][..]]) {
            for (i, a) in list.iter().enumerate() {
                assert!(
                    a.bytes()
                        .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'_'),
                    "{a}"
                );
                assert!(list.iter().skip(i + 1).all(|b| b != a), "{a}");
            }
        }
    }
}
