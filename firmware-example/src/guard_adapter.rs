//! The Standfast guard behind the station's [`Rule`] plug-in point.
//!
//! [`GuardRule`] holds a [`standfast::guard::Guard`] that borrows a
//! [`Rig`] (build the rig once and keep it where it outlives the station: in
//! `main`'s stack frame on the host, in a `static` made by
//! `cortex_m::singleton!` on the board). Each step it converts the station's
//! [`Samples`] into the guard's [`Inputs`]:
//!
//! - `accel_raw`: the specific force in g, rig frame (the station's `AxisMap`
//!   already rotated it, so the guard's `Mounting` stays identity and its
//!   `scale_g_per_count` stays 1.0);
//! - `wind`: speed m/s and from-azimuth radians, unchanged;
//! - `pose`: the mount's hour angle and declination as an equatorial pose,
//!   pier side [`PierSide::TubeEast`] (the station's pose input carries no
//!   pier side; set it from your mount's report when it has one).
//!
//! It passes the guard's sensor faults on ([`Rule::raised_faults`], logged
//! as `fault sensor=.. class=..` events, names by [`fault_names`]) and maps
//! the verdict's level to `park` ([`AlertLevel::park_requested`]), `alarm`
//! ([`AlertLevel::alarm`]) and the level name ([`AlertLevel::name`]). The station's
//! own sensor-health supervision still overrides everything toward park and
//! alarm.
//!
//! **Backstop.** An optional [`LimitRule`] runs beside the guard; the lines
//! follow whichever asks for more (park if either asks, alarm if either
//! asks). When the backstop asks for more than the guard, the level name is
//! `limit_park` or `limit_alarm`, so the event log says which one acted.
//!
//! **Acknowledge.** The guard's alarm latches until [`GuardRule::acknowledge`]
//! (wire a key switch to it through [`crate::Station::rule_mut`]).
//!
//! **Caution.** The guard's verdict is an estimate from a static model of an
//! *invented* rig here; describe your own rig, secure it anyway, and defer to
//! the mount maker's limits, local codes and licensed engineers.

use crate::rule::{Decision, LimitRule, RaisedFault, Rule, Samples};
use core::borrow::BorrowMut;
use core::marker::PhantomData;
use standfast::bounded::Vec;
use standfast::error::Field;
use standfast::guard::{
    AlertLevel, Event as GuardEvent, Guard, GuardConfig, Inputs, WindSample as GuardWind,
    MAX_EVENTS,
};
use standfast::math::deg_to_rad;
use standfast::mount::{MountGeometry, PierSide, Pose};
use standfast::rig::{BodySpec, CounterweightSpec, LegsSpec, Rig, RigSpec, Stage as MountStage};
use standfast::sense::Fault;
use standfast::sense::Millis;
use standfast::support::Support;
use standfast::{Error, ErrorKind};

/// The invented example rig of the replay: a small equatorial head with a
/// 5 kg tube (0.12 m × 0.7 m cylinder) and a 4 kg counterweight on a light
/// tripod with feet on a 0.45 m circle, at 47° N. Invented for the
/// demonstration, not a real product; describe your own rig instead.
///
/// Rig frame: x east, y north, z up, metres, origin on the ground at the
/// tripod's centre.
///
/// # Errors
/// Whatever [`example_rig_spec`] or [`Rig::new`] rejects (not expected for
/// these figures).
pub fn example_rig() -> Result<Rig, Error> {
    Rig::new(&example_rig_spec()?)
}

/// The description [`example_rig`] is built from (rig frame: x east, y north,
/// z up, metres, kilograms; latitude in radians). `replay/rig.toml` is the
/// same rig as a host-sim rig file; a test loads it through host-sim's rig
/// loader and compares the two descriptions field by field.
///
/// The lists are filled in place (the fields are public), not through the
/// `with_` builder chain, whose every step moves the 1.8 KiB description
/// through a `Result` (about 10 KiB of stack on the Cortex-M4F). Out of line,
/// so its temporaries are gone before [`Rig::new`] or [`Rig::build_in`] runs.
///
/// # Errors
/// Whatever [`Support::tripod`] rejects (not expected for these figures), and
/// [`ErrorKind::TooMany`] should a list be full (it cannot be: two bodies and
/// one counterweight).
#[inline(never)]
pub fn example_rig_spec() -> Result<RigSpec, Error> {
    let support = example_support()?;
    let mut spec = example_base(&support);
    add_example_parts(&mut spec)?;
    Ok(spec)
}

/// Builds [`example_rig`] in place in `slot` ([`Rig::build_in`]: `slot` holds
/// the rig on success, `None` on error), with the description
/// ([`example_rig_spec`]'s) made in this function's own frame and dropped
/// when it returns. For a board that keeps its rig in a `static`: no
/// `Result` of the rig or of its description is built and moved on the
/// stack. Call it from an out-of-line function of the board's
/// (`#[inline(never)]`), so its frame, with the description, is released
/// before the guard is built (the binaries' `build_rig`).
///
/// # Errors
/// As [`example_rig`].
pub fn example_rig_in(slot: &mut Option<Rig>) -> Result<(), Error> {
    // Borrowed out of the `Result`, not moved out of it: a move would be a
    // second 1.8 KiB copy in this frame.
    match &example_rig_spec() {
        Ok(spec) => Rig::build_in(slot, spec),
        Err(e) => {
            *slot = None;
            Err(*e)
        }
    }
}

/// The example's tripod: feet on a 0.45 m circle, the first due north.
fn example_support() -> Result<Support, Error> {
    Support::tripod(0.45, 0.0)
}

/// The example's description before its parts: `support`, the equatorial
/// head at 47° N with its axes' origin 1.25 m up, friction coefficient 0.3.
fn example_base(support: &Support) -> RigSpec {
    RigSpec::new(
        support,
        MountGeometry::equatorial(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
        0.3,
    )
}

/// Adds the example's legs, tube, ground mass and counterweight to `spec`.
fn add_example_parts(spec: &mut RigSpec) -> Result<(), Error> {
    spec.legs = Some(LegsSpec::new(0.8, 0.03, 1.05, 0.06));
    let too_many = |field| Error::new(ErrorKind::TooMany, field);
    spec.bodies
        .push(
            BodySpec::cylinder(
                MountStage::Secondary,
                5.0,
                [0.15, 0.1, 0.0],
                0.12,
                0.7,
                [0.0, 1.0, 0.0],
            )
            .labelled("tube"),
        )
        .map_err(|_| too_many(Field::Bodies))?;
    spec.bodies
        .push(BodySpec::point(MountStage::Ground, 4.0, [0.0, 0.0, 1.1]))
        .map_err(|_| too_many(Field::Bodies))?;
    spec.counterweights
        .push(CounterweightSpec::disc(4.0, 0.25, 0.1, 0.06))
        .map_err(|_| too_many(Field::Counterweights))?;
    Ok(())
}

/// The guard settings of the replay: [`GuardConfig::default()`] with a
/// 20 s dwell, a 30 s time to park and a 10 s fault clearing time, so an
/// invented log of a few minutes walks through the levels and back (the
/// defaults, 600 s, 120 s and 60 s, would need a log of hours). Everything
/// else, thresholds included, is the default. `replay/rig.toml` carries the
/// same three values in its `[guard]` section (a host test checks that
/// host-sim's rig loader reads it to an equal configuration). Invented for the demonstration: on a real
/// rig keep a dwell long enough that a lull between gusts does not unpark it
/// in a rising storm, and measure your mount's time to park.
#[must_use]
pub fn example_guard_config() -> GuardConfig {
    GuardConfig {
        dwell_s: 20.0,
        time_to_park_s: 30.0,
        fault_clear_s: 10.0,
        ..GuardConfig::default()
    }
}

/// The replay's guard: [`Guard::new`] for `rig` with [`example_guard_config`],
/// started at `now_ms` (station clock).
///
/// # Errors
/// Whatever [`Guard::new`] rejects (not expected for the example rig).
pub fn example_guard(rig: &Rig, now_ms: u64) -> Result<Guard<'_>, Error> {
    Guard::new(rig, example_guard_config(), Millis(now_ms))
}

/// The guard as an [`Rule`] plug-in, with an optional [`LimitRule`] backstop.
///
/// `G` is how the adapter holds its guard: by value (`Guard<'r>`, the
/// default, made by [`GuardRule::new`]) or borrowed (`&mut Guard<'r>`, from
/// [`GuardRule::with_guard`]). A board builds the guard in a `static` of its
/// own and lends it, so the guard (4 KiB on the Cortex-M4F) is written once,
/// in place, and never moved through the constructors of the adapter, the
/// station and the replay (each move of a value that large is a stack copy).
#[derive(Debug)]
pub struct GuardRule<'r, G = Guard<'r>> {
    guard: G,
    backstop: Option<LimitRule>,
    last_level: AlertLevel,
    raised: Vec<RaisedFault, MAX_EVENTS>,
    events_lost: u16,
    rig: PhantomData<&'r Rig>,
}

/// The event-line names of a guard fault: sensor (`Sensor::code`: `accel`,
/// `wind_speed`, `wind_direction`, `pose`, `cover`, `air`, `clock`, or
/// `model` for the guard's own evaluation) and class (the [`Fault`] variant
/// in snake case).
#[must_use]
pub const fn fault_names(fault: &Fault) -> RaisedFault {
    RaisedFault {
        sensor: fault.sensor().code(),
        class: fault.class_code(),
    }
}

impl<'r> GuardRule<'r> {
    /// A guard for `rig` with `config`, started at `now_ms` (station clock),
    /// with an optional fixed-limit backstop.
    ///
    /// # Errors
    /// An invalid guard configuration.
    pub fn new(
        rig: &'r Rig,
        config: GuardConfig,
        now_ms: u64,
        backstop: Option<LimitRule>,
    ) -> Result<Self, Error> {
        let guard = Guard::new(rig, config, Millis(now_ms))?;
        Ok(GuardRule::with_guard(guard, backstop))
    }
}

impl<'r, G: BorrowMut<Guard<'r>>> GuardRule<'r, G> {
    /// The adapter for an already built `guard` (owned or borrowed), with an
    /// optional fixed-limit backstop. The guard should be fresh (no step
    /// taken); the adapter starts from its present level.
    pub fn with_guard(guard: G, backstop: Option<LimitRule>) -> Self {
        GuardRule {
            // A fresh guard starts unable to see (sensor_fault) until its
            // sensors have given readings.
            last_level: guard.borrow().level(),
            guard,
            backstop,
            raised: Vec::new(),
            events_lost: 0,
            rig: PhantomData,
        }
    }

    /// Acknowledges the guard's latched alarm (an operator's key switch). The
    /// level steps down once the figures have settled for the dwell time.
    pub fn acknowledge(&mut self) {
        self.guard.borrow_mut().acknowledge();
    }

    /// The guard's level after the last step.
    #[must_use]
    pub const fn guard_level(&self) -> AlertLevel {
        self.last_level
    }

    /// The guard (for inspection).
    #[must_use]
    pub fn guard(&self) -> &Guard<'r> {
        self.guard.borrow()
    }
}

impl<'r, G: BorrowMut<Guard<'r>>> Rule for GuardRule<'r, G> {
    fn decide(&mut self, s: &Samples) -> Decision {
        let inputs = Inputs {
            accel_raw: s.accel_g.map(|a| [a.x, a.y, a.z]),
            wind: s.wind.map(|w| GuardWind {
                speed_mps: w.speed_mps,
                from_rad: w.from_rad,
            }),
            pose: s.pose.map(|p| Pose::Equatorial {
                hour_angle_rad: p.hour_angle_rad,
                declination_rad: p.declination_rad,
                pier_side: PierSide::TubeEast,
            }),
            ..Inputs::default()
        };
        crate::marks::guard_step_begin();
        let verdict = self.guard.borrow_mut().step(Millis(s.t_ms), &inputs);
        crate::marks::guard_step_end();
        self.raised.clear();
        self.events_lost = verdict.events_lost;
        for e in &verdict.events {
            if let GuardEvent::FaultRaised(f) = e {
                // Capacity equals the guard's event capacity: never full.
                let _ = self.raised.push(fault_names(f));
            }
        }
        let level = verdict.level;
        self.last_level = level;
        let guard = Decision {
            park: level.park_requested(),
            alarm: level.alarm(),
            level: level.name(),
        };
        let Some(rule) = self.backstop.as_mut() else {
            return guard;
        };
        let limit = rule.decide(s);
        let park = guard.park || limit.park;
        let alarm = guard.alarm || limit.alarm;
        let level = if limit.alarm && !guard.alarm {
            "limit_alarm"
        } else if limit.park && !guard.park {
            "limit_park"
        } else {
            guard.level
        };
        Decision { park, alarm, level }
    }

    fn raised_faults(&self) -> &[RaisedFault] {
        &self.raised
    }

    fn events_lost(&self) -> u16 {
        self.events_lost
    }
}
