//! The station: one fixed-rate step that reads the sensors, watches their
//! health, asks the rule and drives the two fail-safe lines.
//!
//! ```text
//! loop {
//!     wait for the next tick (timer interrupt, WFI)      // fixed rate
//!     now_ms = clock
//!     inputs = { pulse latch from the counter, pose if the mount reported one }
//!     report = station.step(now_ms, inputs)             // bounded work, no blocking
//!     if report.complete { watchdog.feed() }             // only after a completed step
//! }
//! ```
//!
//! A step is *complete* when both output lines were driven. A loop that hangs
//! (a stuck bus, an endless retry) or a step whose pins fail stops feeding the
//! watchdog; its reset leaves both lines de-energised: park and alarm.
//!
//! **Decision.** The park line is de-energised when the rule asks for a
//! park *or* any sensor is not usable; the alarm line when the rule
//! raises the alarm *or* any sensor is not usable. A sensor is not usable
//! before its first good reading ("arming" after reset, no fault event), while
//! faulted, and until it has been healthy for `fault_clear_ms` after a fault.

use crate::event::{Event, EventKind, Line, SensorLoss, Source};
use crate::lines::{FailSafeLines, LineError, LineState};
use crate::lis3dh::{self, Lis3dh};
use crate::pose::MountPose;
use crate::rule::{Decision, Rule, Samples, WindSample};
use crate::wind::{Anemometer, PulseLatch, WindVane};
use embedded_hal::digital::OutputPin;
use embedded_hal::i2c::I2c;
use standfast::math::{self, Vec3};
use standfast::sense::SignedAxis;

/// Most events one step can report: at most 10 of the station's own, plus up
/// to [`standfast::guard::MAX_EVENTS`] sensor faults from the rule.
pub const MAX_EVENTS: usize = 12 + standfast::guard::MAX_EVENTS;

/// The component of sensor vector `s` along signed sensor axis `a`.
fn pick(a: SignedAxis, s: [f32; 3]) -> f32 {
    let [x, y, z] = s;
    match a {
        SignedAxis::PlusX => x,
        SignedAxis::MinusX => -x,
        SignedAxis::PlusY => y,
        SignedAxis::MinusY => -y,
        SignedAxis::PlusZ => z,
        SignedAxis::MinusZ => -z,
    }
}

/// How the accelerometer is mounted: which signed sensor axis (the core's
/// [`SignedAxis`]) lies along each rig axis (rig frame: x east, y north, z up). Only the 24 right-angle
/// mountings are expressible; mount the board square to the rig.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct AxisMap {
    /// Sensor axis along rig +x (east).
    pub x: SignedAxis,
    /// Sensor axis along rig +y (north).
    pub y: SignedAxis,
    /// Sensor axis along rig +z (up).
    pub z: SignedAxis,
}

impl AxisMap {
    /// Sensor axes equal rig axes (chip face up, its x toward east).
    pub const IDENTITY: AxisMap = AxisMap {
        x: SignedAxis::PlusX,
        y: SignedAxis::PlusY,
        z: SignedAxis::PlusZ,
    };

    /// A sensor-frame vector in the rig frame.
    #[must_use]
    pub fn apply(&self, s: [f32; 3]) -> Vec3 {
        Vec3::new(pick(self.x, s), pick(self.y, s), pick(self.z, s))
    }
}

/// Station timing and sensor-health settings. All times in milliseconds on
/// the station's clock.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StationConfig {
    /// Step period of the fixed-rate loop, ms (> 0).
    pub period_ms: u32,
    /// The accelerometer is faulted when its last good reading is older than this, ms.
    pub accel_stale_ms: u32,
    /// The wind is faulted when its last gate-mean speed is older than this
    /// (counted from the first step before the first one), ms.
    pub wind_stale_ms: u32,
    /// The vane is faulted when its last good reading is older than the
    /// latest wind speed by more than this, ms.
    pub vane_stale_ms: u32,
    /// A faulted sensor must be healthy this long before its fault clears, ms.
    pub fault_clear_ms: u32,
    /// Read back the accelerometer's configuration every this many steps (0: never).
    pub verify_every_steps: u16,
    /// Accelerometer mounting.
    pub mounting: AxisMap,
}

impl Default for StationConfig {
    /// 50 Hz loop; accelerometer faulted at the third failed read in a row;
    /// wind and vane faulted after 3 s without data; faults clear after 5 s
    /// healthy; configuration read back once a second.
    fn default() -> Self {
        StationConfig {
            period_ms: 20,
            accel_stale_ms: 50,
            wind_stale_ms: 3000,
            vane_stale_ms: 3000,
            fault_clear_ms: 5000,
            verify_every_steps: 50,
            mounting: AxisMap::IDENTITY,
        }
    }
}

/// What the caller hands to one step besides the time.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StepInputs {
    /// The anemometer pulse total and when it was read; `None` when the
    /// counting side delivered nothing (a remote counter fell silent).
    pub pulses: Option<PulseLatch>,
    /// The mount pose, when the mount controller reported one since the last step.
    pub pose: Option<MountPose>,
}

/// The outcome of one step.
#[derive(Clone, Debug, PartialEq)]
pub struct StepReport {
    /// Events of this step, in order.
    pub events: heapless::Vec<Event, MAX_EVENTS>,
    /// The lines as driven (or [`LineState::SAFE`] after a pin error).
    pub lines: LineState,
    /// The rule's decision for this step.
    pub decision: Decision,
    /// Both lines were driven: feed the watchdog.
    pub complete: bool,
}

/// Something that must be fed to keep the chip from resetting. (embedded-hal
/// 1.0 has no watchdog trait; wrap the board's independent watchdog in this.)
pub trait Watchdog {
    /// Restarts the watchdog's countdown.
    fn feed(&mut self);
}

/// Health of one sensor (see the module docs).
#[derive(Clone, Copy, Debug, Default)]
struct Health {
    last_good_ms: Option<u64>,
    faulted: bool,
    tripped: bool,
    healthy_since_ms: Option<u64>,
}

impl Health {
    fn good(&mut self, now_ms: u64) {
        self.last_good_ms = Some(now_ms);
        if self.faulted && self.healthy_since_ms.is_none() {
            self.healthy_since_ms = Some(now_ms);
        }
    }

    fn bad(&mut self) {
        self.healthy_since_ms = None;
    }

    fn trip(&mut self) {
        self.tripped = true;
        self.healthy_since_ms = None;
    }

    /// `Some(true)` when the sensor just became faulted, `Some(false)` when its
    /// fault just cleared.
    fn update(&mut self, now_ms: u64, start_ms: u64, stale_ms: u32, clear_ms: u32) -> Option<bool> {
        let age_ms = now_ms.saturating_sub(self.last_good_ms.unwrap_or(start_ms));
        let stale = age_ms > u64::from(stale_ms);
        let tripped = core::mem::take(&mut self.tripped);
        if !self.faulted {
            if stale || tripped {
                self.faulted = true;
                self.healthy_since_ms = None;
                return Some(true);
            }
            return None;
        }
        if stale {
            self.healthy_since_ms = None;
            return None;
        }
        match self.healthy_since_ms {
            Some(h) if now_ms.saturating_sub(h) >= u64::from(clear_ms) => {
                self.faulted = false;
                self.healthy_since_ms = None;
                Some(false)
            }
            _ => None,
        }
    }

    fn usable(&self) -> bool {
        !self.faulted && self.last_good_ms.is_some()
    }
}

/// The application: generic over the bus, the vane, the two pins and the rule.
#[derive(Debug)]
pub struct Station<I2C, V, P, A, R> {
    cfg: StationConfig,
    accel: Lis3dh<I2C>,
    accel_ready: bool,
    steps_since_verify: u16,
    accel_cause: SensorLoss,
    anemometer: Anemometer,
    vane: V,
    lines: FailSafeLines<P, A>,
    rule: R,
    accel_health: Health,
    wind_health: Health,
    vane_health: Health,
    start_ms: Option<u64>,
    last_step_ms: Option<u64>,
    level: &'static str,
}

impl<I2C, V, P, A, R> Station<I2C, V, P, A, R>
where
    I2C: I2c,
    V: WindVane,
    P: OutputPin,
    A: OutputPin,
    R: Rule,
{
    /// A station. Touches no hardware: the accelerometer is set up in the
    /// first step, and the lines stay as reset left them (low) until then.
    pub fn new(
        cfg: StationConfig,
        accel: Lis3dh<I2C>,
        anemometer: Anemometer,
        vane: V,
        lines: FailSafeLines<P, A>,
        rule: R,
    ) -> Self {
        Station {
            cfg,
            accel,
            accel_ready: false,
            steps_since_verify: 0,
            accel_cause: SensorLoss::Bus,
            anemometer,
            vane,
            lines,
            rule,
            accel_health: Health::default(),
            wind_health: Health::default(),
            vane_health: Health::default(),
            start_ms: None,
            last_step_ms: None,
            // Before its first decision the station cannot see: both
            // lines start de-energised, as for the guard's sensor_fault.
            level: standfast::guard::AlertLevel::SensorFault.name(),
        }
    }

    /// The configuration.
    pub const fn config(&self) -> &StationConfig {
        &self.cfg
    }

    /// The lines as last driven.
    pub const fn lines(&self) -> LineState {
        self.lines.state()
    }

    /// The rule (for inspection).
    pub const fn rule(&self) -> &R {
        &self.rule
    }

    /// The rule, mutable: for an operator's acknowledge input (for
    /// example [`crate::GuardRule::acknowledge`] from a key switch).
    pub fn rule_mut(&mut self) -> &mut R {
        &mut self.rule
    }

    /// The accelerometer's bus and the vane, for an emulation that scripts
    /// them between steps.
    pub fn hardware(&mut self) -> (&mut I2C, &mut V) {
        (self.accel.bus_mut(), &mut self.vane)
    }

    /// Takes the station apart: bus, vane, park pin, alarm pin, rule.
    pub fn release(self) -> (I2C, V, P, A, R) {
        let (park, alarm) = self.lines.release();
        (self.accel.release(), self.vane, park, alarm, self.rule)
    }

    /// One step at `now_ms` (milliseconds on a monotonic clock; a smaller
    /// value than the previous step's is taken as the previous one).
    pub fn step(&mut self, now_ms: u64, inputs: StepInputs) -> StepReport {
        let mut events: heapless::Vec<Event, MAX_EVENTS> = heapless::Vec::new();
        let mut push = |kind: EventKind, t_ms: u64| {
            // Capacity covers the most one step can raise; an overflow would
            // only lose a log line, never change the lines.
            let _ = events.push(Event { t_ms, kind });
        };

        let now_ms = self.last_step_ms.map_or(now_ms, |l| now_ms.max(l));
        let start_ms = *self.start_ms.get_or_insert(now_ms);
        match self.last_step_ms {
            None => push(EventKind::Started, now_ms),
            Some(last) => {
                let gap_ms = now_ms.saturating_sub(last);
                if gap_ms > 2 * u64::from(self.cfg.period_ms) {
                    push(
                        EventKind::Late(u32::try_from(gap_ms).unwrap_or(u32::MAX)),
                        now_ms,
                    );
                }
            }
        }
        self.last_step_ms = Some(now_ms);

        let accel_g = self.read_accel(now_ms);
        let wind = self.read_wind(now_ms, inputs.pulses);

        let clear_ms = self.cfg.fault_clear_ms;
        if let Some(f) =
            self.accel_health
                .update(now_ms, start_ms, self.cfg.accel_stale_ms, clear_ms)
        {
            push(health_event(Source::Accel, f, self.accel_cause), now_ms);
        }
        if let Some(f) = self
            .wind_health
            .update(now_ms, start_ms, self.cfg.wind_stale_ms, clear_ms)
        {
            if f {
                self.anemometer.reset();
            }
            push(health_event(Source::Wind, f, SensorLoss::Stale), now_ms);
        }
        // The vane is judged against the latest wind speed, so a silent
        // anemometer does not also fault the vane.
        let vane_now_ms = self.wind_health.last_good_ms.unwrap_or(start_ms);
        if let Some(f) =
            self.vane_health
                .update(vane_now_ms, start_ms, self.cfg.vane_stale_ms, clear_ms)
        {
            push(health_event(Source::Vane, f, SensorLoss::Stale), now_ms);
        }

        let samples = Samples {
            t_ms: now_ms,
            accel_g,
            wind,
            pose: inputs.pose,
        };
        let decision = self.rule.decide(&samples);
        for raised in self.rule.raised_faults() {
            push(EventKind::RuleFault(*raised), now_ms);
        }
        let lost = self.rule.events_lost();
        if lost > 0 {
            push(EventKind::EventsLost(lost), now_ms);
        }
        if self.level != decision.level {
            push(
                EventKind::AlertLevel {
                    from: self.level,
                    to: decision.level,
                },
                now_ms,
            );
            self.level = decision.level;
        }

        let usable =
            self.accel_health.usable() && self.wind_health.usable() && self.vane_health.usable();
        let want = LineState {
            park_requested: decision.park || !usable,
            alarm_raised: decision.alarm || !usable,
        };
        let before = self.lines.state();
        let complete = match self.lines.drive(want) {
            Ok(()) => true,
            Err(LineError::Park(_)) => {
                push(EventKind::LineError(Line::Park), now_ms);
                false
            }
            Err(LineError::Alarm(_)) => {
                push(EventKind::LineError(Line::Alarm), now_ms);
                false
            }
        };
        let after = self.lines.state();
        if after.park_requested != before.park_requested {
            push(EventKind::Park(after.park_requested), now_ms);
        }
        if after.alarm_raised != before.alarm_raised {
            push(EventKind::Alarm(after.alarm_raised), now_ms);
        }

        #[cfg(feature = "defmt")]
        for e in &events {
            defmt::info!("{}", e);
        }

        StepReport {
            events,
            lines: after,
            decision,
            complete,
        }
    }

    /// [`Self::step`], then feeds `watchdog` if the step completed.
    pub fn step_and_feed<W: Watchdog>(
        &mut self,
        now_ms: u64,
        inputs: StepInputs,
        watchdog: &mut W,
    ) -> StepReport {
        let report = self.step(now_ms, inputs);
        if report.complete {
            watchdog.feed();
        }
        report
    }

    fn read_accel(&mut self, now_ms: u64) -> Option<Vec3> {
        if !self.accel_ready {
            if let Err(e) = self.accel.init() {
                self.accel_failed(e);
                return None;
            }
            self.accel_ready = true;
            self.steps_since_verify = 0;
        } else if self.cfg.verify_every_steps > 0
            && self.steps_since_verify >= self.cfg.verify_every_steps
        {
            self.steps_since_verify = 0;
            if let Err(e) = self.accel.verify_config() {
                self.accel_failed(e);
                return None;
            }
        }
        self.steps_since_verify = self.steps_since_verify.saturating_add(1);
        match self.accel.read_g() {
            Ok(g) => {
                self.accel_health.good(now_ms);
                Some(self.cfg.mounting.apply(g))
            }
            Err(e) => {
                self.accel_failed(e);
                None
            }
        }
    }

    /// Records an accelerometer failure; the next step sets the sensor up
    /// again (it may have reset itself).
    fn accel_failed(&mut self, e: lis3dh::Error<I2C::Error>) {
        self.accel_ready = false;
        match e {
            lis3dh::Error::Bus(_) => {
                self.accel_cause = SensorLoss::Bus;
                self.accel_health.bad();
            }
            lis3dh::Error::WrongDevice { .. } => {
                self.accel_cause = SensorLoss::Device;
                self.accel_health.trip();
            }
            lis3dh::Error::ConfigLost { .. } => {
                self.accel_cause = SensorLoss::ConfigLost;
                self.accel_health.trip();
            }
        }
    }

    fn read_wind(&mut self, now_ms: u64, pulses: Option<PulseLatch>) -> Option<WindSample> {
        let speed_mps = self.anemometer.update(pulses?)?;
        self.wind_health.good(now_ms);
        let from_rad = match self.vane.direction_from_rad() {
            Ok(d) if d.is_finite() => {
                self.vane_health.good(now_ms);
                Some(math::wrap_tau(d))
            }
            _ => {
                self.vane_health.bad();
                None
            }
        };
        Some(WindSample {
            speed_mps,
            from_rad,
        })
    }
}

fn health_event(source: Source, faulted: bool, cause: SensorLoss) -> EventKind {
    if faulted {
        EventKind::Fault(source, cause)
    } else {
        EventKind::FaultCleared(source)
    }
}
