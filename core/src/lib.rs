//! # Standfast core
//!
//! Static overturning and sliding margins, drive torque loads and a staged
//! park-and-alarm guard for telescope rigs left standing outdoors.
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
//! - [`rig`]: the rig description ([`rig::RigSpec`]), the validated
//!   [`rig::Rig`] and the placement of its parts in a pose;
//! - [`stability`]: overturning about every edge of the support polygon,
//!   sliding, tip wind speed, tilt margin, foot reactions, ballast and
//!   tie-down needs;
//! - [`support`], [`mount`], [`shape`], [`air`], [`frame`]: feet, mount
//!   kinematics, wind-exposed shapes and drag, air density, the rig frame;
//! - [`drive`], [`hardware`]: drive ratings; counterweight hardware checks;
//! - [`sense`]: accelerometer tilt, wind statistics and sensor faults;
//! - [`weighing`]: the centre of gravity of the whole rig from scale
//!   readings under its feet, level, lifted and tilted to unload.
//!
//! ## Example
//! An invented rig: a 9 kg alt-azimuth head and tube on a light tripod.
//!
//! ```
//! use standfast::heapless::{String, Vec};
//! use standfast::math::deg_to_rad;
//! use standfast::mount::{MountGeometry, MountKind, PierSide, Pose};
//! use standfast::rig::{BodySpec, Conditions, LegsSpec, Rig, RigSpec, Stage};
//! use standfast::shape::{Exposure, Shape};
//! use standfast::support::Support;
//!
//! let tripod = Support::tripod(0.45, 0.0)?; // feet on a 0.45 m circle, one north
//! let mut bodies = Vec::new();
//! let tube = BodySpec {
//!     label: String::try_from("tube").unwrap_or_default(),
//!     stage: Stage::Secondary,
//!     mass_kg: 5.0,
//!     cg_m: [0.15, 0.1, 0.0], // 15 cm beside the altitude axis, 10 cm up the tube
//!     exposure: Some(Exposure {
//!         shape: Shape::Cylinder { diameter_m: 0.12, length_m: 0.7, axis: [0.0, 1.0, 0.0] },
//!         centre_m: [0.15, 0.1, 0.0],
//!         drag_coefficient: None, // Hoerner's finite-cylinder value for l/d ≈ 6
//!         end_drag_coefficient: None,
//!     }),
//!     ..BodySpec::default()
//! };
//! bodies.push(tube).ok();
//! bodies.push(BodySpec { mass_kg: 4.0, cg_m: [0.0, 0.0, 1.1], ..BodySpec::default() }).ok();
//! let spec = RigSpec {
//!     feet: tripod.feet_list(),
//!     legs: Some(LegsSpec { mass_kg: 0.8, diameter_m: 0.03, top_height_m: 1.05, top_radius_m: 0.06 }),
//!     friction_coefficient: 0.3,
//!     mount: MountGeometry {
//!         kind: MountKind::AltAzimuth,
//!         latitude_rad: deg_to_rad(47.0),
//!         axis_origin_m: [0.0, 0.0, 1.25],
//!     },
//!     bodies,
//!     counterweights: Vec::new(),
//!     shaft: None,
//!     cover: None,
//!     ballast: Vec::new(),
//!     drives: None,
//! };
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

pub use error::{Error, ErrorKind};
pub use frame::Tilt;
/// The `heapless` crate, re-exported: rig descriptions hold its `Vec` and `String`.
pub use heapless;
pub use math::Vec3;
