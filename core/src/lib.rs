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
#![no_std]
#![cfg_attr(docsrs, feature(doc_cfg))]

pub mod air;
pub mod drive;
pub mod error;
pub mod frame;
pub mod hardware;
pub mod math;
pub mod mount;
pub mod rig;
pub mod sense;
pub mod shape;
pub mod stability;
pub mod support;

pub use error::{Error, ErrorKind};
pub use frame::Tilt;
/// The `heapless` crate, re-exported: rig descriptions hold its `Vec` and `String`.
pub use heapless;
pub use math::Vec3;
