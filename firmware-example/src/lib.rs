//! # Standfast firmware example
//!
//! A board-independent observatory controller on embedded-hal 1.0 traits: it
//! reads a LIS3DH accelerometer over I2C, a cup anemometer by pulse counting,
//! a wind vane and (optionally) the mount pose, and drives two fail-safe
//! output lines, park request and alarm, that are energised while all is well.
//!
//! - [`lis3dh`]: the accelerometer driver (WHO_AM_I check, configuration,
//!   burst read, scaling to g).
//! - [`wind`]: pulse counter, anemometer calibration, the [`wind::WindVane`] trait.
//! - [`pose`]: the mount pose input.
//! - [`lines`]: the park and alarm lines and the fail-safe convention.
//! - [`rule`]: the plug-in point for a decision rule (the
//!   [`rule::Rule`] trait) and the fixed-limit [`rule::LimitRule`].
//! - [`guard_adapter`]: the `standfast` guard as a [`rule::Rule`]
//!   plug-in ([`guard_adapter::GuardRule`]), with the invented example rig.
//! - [`station`]: the fixed-rate, watchdog-friendly step.
//! - [`event`]: events and their one-line text format.
//! - [`replay`]: replay of a log over emulated hardware (QEMU and host).
//! - [`marks`]: code-address marks around the guard's step, for counting its
//!   instructions in the emulator.
//!
//! `#![no_std]`, no allocation: every buffer has a fixed size, and the board
//! binary keeps the station in a `static`.
//!
//! **Caution.** This is an example, not a certified safety device. The limits
//! and the decision rules are estimates; secure the rig anyway, stay inside the
//! mount maker's limits, test the whole chain (sensor to park) on your rig,
//! and defer to local codes and licensed engineers.
#![cfg_attr(not(test), no_std)]
#![forbid(unsafe_code)]

pub mod event;
pub mod guard_adapter;
pub mod lines;
pub mod lis3dh;
pub mod marks;
pub mod pose;
pub mod replay;
pub mod rule;
pub mod station;
pub mod wind;

pub use event::{Event, EventKind};
pub use guard_adapter::GuardRule;
pub use lines::{FailSafeLines, LineState};
pub use rule::{Decision, LimitRule, Limits, RaisedFault, Rule, Samples, WindSample};
pub use station::{Station, StationConfig, StepInputs, StepReport, Watchdog};
