//! The guard's decision as one pure function: [`transition`].
//!
//! `(present level, readings, thresholds, memory, now) → (next level, memory,
//! the change and its cause)`. Nothing else in the guard changes the level,
//! so the rules below are all the rules.
//!
//! # Levels
//! [`AlertLevel::Clear`] < [`AlertLevel::Watch`] < [`AlertLevel::ParkNow`] < [`AlertLevel::Alarm`]
//! < [`AlertLevel::SensorFault`]. Park is requested from `park_now` up; the alarm
//! output from `alarm` up. `sensor_fault` is the can't-see level: the guard
//! has a fault (of a sensor, of another input, or of its own evaluation) and
//! cannot judge the rig, so it parks and alarms.
//!
//! # Conditions
//! Each level above `clear` has raise conditions, checked in this order (the
//! first that holds names the cause). `r` is `clear_ratio`; a figure is
//! *settled below* a level when it is under `r` × that level's threshold (for
//! the tilt margin, above the threshold ÷ `r`).
//!
//! | level | raised when (cause) | settled below it when |
//! |---|---|---|
//! | `alarm` | overturning ≥ `alarm_utilisation` ([`AlertCause::Overturning`]); sliding ≥ `alarm_utilisation` ([`AlertCause::Sliding`]); tilt margin ≤ `tilt_margin_alarm_rad` ([`AlertCause::TiltMargin`]) | overturning < r·alarm, sliding < r·alarm, tilt margin > alarm margin ÷ r |
//! | `park_now` | predicted overturning ≥ `park_utilisation` ([`AlertCause::PredictedOverturning`]); either drive ≥ `drive_park_utilisation` ([`AlertCause::Drive`]) | predicted < r·park, both drives < r·drive park |
//! | `watch` | predicted overturning ≥ `watch_utilisation` ([`AlertCause::PredictedOverturning`]); sliding ≥ `watch_utilisation` ([`AlertCause::Sliding`]); tilt drift ≥ `drift_watch_rad_per_s` ([`AlertCause::TiltDrift`]) | predicted < r·watch, sliding < r·watch, drift < r·drift watch |
//!
//! The *wanted* level is the highest level whose raise condition holds
//! (`clear` when none does).
//!
//! # Transition table
//! Rows are tried from the top; the first that matches decides.
//!
//! | present level | readings | next level | cause |
//! |---|---|---|---|
//! | any | a fault, or a figure missing or not finite | `sensor_fault` (no change if already there) | [`AlertCause::SensorFault`] or [`AlertCause::EvaluationFault`] |
//! | `sensor_fault` | figures, healthy for less than `fault_clear_ms` | `sensor_fault` | none |
//! | `sensor_fault` | figures, healthy for `fault_clear_ms` | from `alarm` down, each level while the figures are settled below it, to no lower than the floor: the wanted level, `watch`, the level held before the fault, and `alarm` while latched | [`AlertCause::FaultCleared`] |
//! | L | wanted W > L | W (latch when W is `alarm`) | the cause of W's first raise condition |
//! | L | wanted W = L | L | none |
//! | L | wanted W < L, latched | L | none |
//! | L | wanted W < L | the lowest B in W..L such that every level from L down to just above B has been settled for `dwell_ms`; L if there is none | [`AlertCause::Settled`], or [`AlertCause::Acknowledged`] in the first step after [`Memory::acknowledge`] |
//!
//! The settled timers (one per level above `clear`) run only while the
//! figures are trusted: a fault restarts every one of them, and so does a
//! figure at or above a level's settle bound for that level.
//!
//! A fault never lowers the level: the guard leaves `sensor_fault` no lower
//! than the level it held before, and no lower than any level whose band a
//! figure is in; stepping further down then takes the usual dwell, whose
//! timers started when the inputs became healthy. An alarm entered because a
//! figure reached its threshold latches; one resumed after a fault keeps the
//! latch it had.
//!
//! # Time
//! `now` only moves the timers forward: a `now` before a timer's start counts
//! as no time elapsed (the guard reports a reversed clock as a fault of its
//! own before it calls this function).

use crate::sense::Millis;

/// The alert level of the guard, in rising order of severity.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Default, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum AlertLevel {
    /// All figures comfortably inside their limits.
    Clear,
    /// A figure has passed the watch threshold: keep an eye on the rig.
    Watch,
    /// Park the mount now (the predicted utilisation at the end of a park
    /// reaches the park threshold, or a drive would be overloaded).
    ParkNow,
    /// The rig is close to tipping or sliding now, or has tilted near its
    /// limit: park, and a person must act. Latches until acknowledged.
    Alarm,
    /// The guard cannot judge the rig (a sensor, input or evaluation fault,
    /// or no reading yet): it acts as for an alarm. The level a guard starts
    /// in.
    #[default]
    SensorFault,
}

impl AlertLevel {
    /// Every level, in rising order.
    pub const ALL: [AlertLevel; 5] = [
        AlertLevel::Clear,
        AlertLevel::Watch,
        AlertLevel::ParkNow,
        AlertLevel::Alarm,
        AlertLevel::SensorFault,
    ];

    /// True when the park-request output should be asserted.
    #[must_use]
    pub fn park_requested(self) -> bool {
        self >= AlertLevel::ParkNow
    }

    /// True when the alarm output should be asserted.
    #[must_use]
    pub fn alarm(self) -> bool {
        self >= AlertLevel::Alarm
    }

    /// A short lower-case name for logs.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            AlertLevel::Clear => "clear",
            AlertLevel::Watch => "watch",
            AlertLevel::ParkNow => "park_now",
            AlertLevel::Alarm => "alarm",
            AlertLevel::SensorFault => "sensor_fault",
        }
    }

    /// Index of the settled timer of a level with thresholds (watch,
    /// park_now, alarm); `None` for clear and sensor_fault.
    const fn timer(self) -> Option<usize> {
        match self {
            AlertLevel::Watch => Some(0),
            AlertLevel::ParkNow => Some(1),
            AlertLevel::Alarm => Some(2),
            AlertLevel::Clear | AlertLevel::SensorFault => None,
        }
    }

    /// The level just below (clear stays clear).
    const fn below(self) -> AlertLevel {
        match self {
            AlertLevel::Clear | AlertLevel::Watch => AlertLevel::Clear,
            AlertLevel::ParkNow => AlertLevel::Watch,
            AlertLevel::Alarm => AlertLevel::ParkNow,
            AlertLevel::SensorFault => AlertLevel::Alarm,
        }
    }
}

/// Why the alert level changed.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum AlertCause {
    /// Overturning utilisation at the present peak gust.
    Overturning,
    /// Overturning utilisation predicted for the end of a park.
    PredictedOverturning,
    /// Sliding utilisation at the present peak gust.
    Sliding,
    /// Drive torque utilisation of either axis.
    Drive,
    /// Tilt margin (extra tilt that would tip the rig) at or below its alarm
    /// margin.
    TiltMargin,
    /// Slow tilt change (a sinking leg) at or above its watch rate.
    TiltDrift,
    /// A fault of a sensor or another input (accelerometer, wind, pose,
    /// cover, air, clock), or no reading yet.
    SensorFault,
    /// The physics could not be evaluated from the inputs, or gave a
    /// non-finite figure.
    EvaluationFault,
    /// The figures stayed settled below every level left for the dwell time.
    Settled,
    /// The inputs stayed healthy for the fault clear time.
    FaultCleared,
    /// A step down right after an operator acknowledged the alarm.
    Acknowledged,
}

impl AlertCause {
    /// A short snake-case name for logs: `overturning`,
    /// `predicted_overturning`, `sliding`, `drive`, `tilt_margin`,
    /// `tilt_drift`, `sensor_fault`, `evaluation_fault`, `settled`,
    /// `fault_cleared`, `acknowledged`.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            AlertCause::Overturning => "overturning",
            AlertCause::PredictedOverturning => "predicted_overturning",
            AlertCause::Sliding => "sliding",
            AlertCause::Drive => "drive",
            AlertCause::TiltMargin => "tilt_margin",
            AlertCause::TiltDrift => "tilt_drift",
            AlertCause::SensorFault => "sensor_fault",
            AlertCause::EvaluationFault => "evaluation_fault",
            AlertCause::Settled => "settled",
            AlertCause::FaultCleared => "fault_cleared",
            AlertCause::Acknowledged => "acknowledged",
        }
    }
}

/// The figures one decision reads. Utilisations are dimensionless (1.0 tips,
/// slides or reaches the drive rating); angles in radians; rates in rad/s.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Figures {
    /// Overturning utilisation at the present peak gust.
    pub overturning: f32,
    /// Overturning utilisation at the gust predicted for the end of a park.
    pub predicted: f32,
    /// Sliding utilisation at the present peak gust.
    pub sliding: f32,
    /// Governing drive utilisation of the primary and secondary axes;
    /// `None` only for a rig without drive ratings.
    pub drive: Option<[f32; 2]>,
    /// Extra tilt that would tip the rig with no wind, radians (larger is
    /// safer).
    pub tilt_margin_rad: f32,
    /// Rate of slow tilt change, rad/s, non-negative.
    pub drift_rad_per_s: f32,
}

impl Figures {
    /// True when every figure is a finite number.
    #[must_use]
    pub fn all_finite(&self) -> bool {
        self.overturning.is_finite()
            && self.predicted.is_finite()
            && self.sliding.is_finite()
            && self.tilt_margin_rad.is_finite()
            && self.drift_rad_per_s.is_finite()
            && self.drive.is_none_or(|d| d.iter().all(|u| u.is_finite()))
    }

    /// The highest drive utilisation of the two axes (0 without drives,
    /// which have nothing to overload).
    fn drive_max(&self) -> f32 {
        self.drive.map_or(0.0, |[a, b]| a.max(b))
    }
}

/// What a decision reads: figures it can trust, or the kind of fault that
/// keeps it from judging the rig.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Readings {
    /// Trusted figures (a non-finite one is still read as an evaluation
    /// fault).
    Figures(Figures),
    /// A fault of a sensor or another input: cause [`AlertCause::SensorFault`].
    SensorFault,
    /// The physics could not be evaluated: cause [`AlertCause::EvaluationFault`].
    EvaluationFault,
}

/// Thresholds of the decision, from [`super::GuardConfig`]. Utilisations
/// dimensionless, the tilt margin in radians, the drift in rad/s, times in
/// milliseconds.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Thresholds {
    /// Raises `watch` (predicted overturning or sliding).
    pub watch_utilisation: f32,
    /// Raises `park_now` (predicted overturning).
    pub park_utilisation: f32,
    /// Raises `alarm` (present overturning or sliding).
    pub alarm_utilisation: f32,
    /// Raises `park_now` (either drive).
    pub drive_park_utilisation: f32,
    /// Hysteresis factor, 0 to 1.
    pub clear_ratio: f32,
    /// Raises `alarm` at or below this tilt margin, radians.
    pub tilt_margin_alarm_rad: f32,
    /// Raises `watch` at or above this drift rate, rad/s.
    pub drift_watch_rad_per_s: f32,
    /// Time settled before a step down, ms.
    pub dwell_ms: u64,
    /// Time healthy before leaving `sensor_fault`, ms.
    pub fault_clear_ms: u64,
}

/// What a decision remembers between steps. Starts as [`Memory::default`]
/// (nothing settled, not healthy yet, no latch).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Memory {
    /// Since when the figures have been settled below watch, park_now and
    /// alarm (in that order), without a break.
    pub settled_since: [Option<Millis>; 3],
    /// Since when the readings have been free of faults.
    pub healthy_since: Option<Millis>,
    /// An alarm is latched: no step down until acknowledged.
    pub latched: bool,
    /// An acknowledgement arrived since the last decision.
    pub acknowledged: bool,
    /// The level held when the present fault began (`None` before the first
    /// judgement, as at start-up).
    pub before_fault: Option<AlertLevel>,
}

impl Memory {
    /// Records an operator's acknowledgement: releases the latch; a step
    /// down in the next decision is caused [`AlertCause::Acknowledged`].
    pub fn acknowledge(&mut self) {
        self.latched = false;
        self.acknowledged = true;
    }
}

/// A change of level.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Change {
    /// Level before.
    pub from: AlertLevel,
    /// Level after.
    pub to: AlertLevel,
    /// Why.
    pub cause: AlertCause,
}

/// The outcome of one decision.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Transition {
    /// The next level.
    pub level: AlertLevel,
    /// The memory for the next decision.
    pub memory: Memory,
    /// The change, when the level changed.
    pub change: Option<Change>,
}

/// The highest level whose raise condition holds, and the cause of its first
/// condition (module docs, "Conditions"); `(Clear, Settled)` when none holds.
#[must_use]
pub fn wanted(f: &Figures, t: &Thresholds) -> (AlertLevel, AlertCause) {
    if f.overturning >= t.alarm_utilisation {
        (AlertLevel::Alarm, AlertCause::Overturning)
    } else if f.sliding >= t.alarm_utilisation {
        (AlertLevel::Alarm, AlertCause::Sliding)
    } else if f.tilt_margin_rad <= t.tilt_margin_alarm_rad {
        (AlertLevel::Alarm, AlertCause::TiltMargin)
    } else if f.predicted >= t.park_utilisation {
        (AlertLevel::ParkNow, AlertCause::PredictedOverturning)
    } else if f.drive_max() >= t.drive_park_utilisation {
        (AlertLevel::ParkNow, AlertCause::Drive)
    } else if f.predicted >= t.watch_utilisation {
        (AlertLevel::Watch, AlertCause::PredictedOverturning)
    } else if f.sliding >= t.watch_utilisation {
        (AlertLevel::Watch, AlertCause::Sliding)
    } else if f.drift_rad_per_s >= t.drift_watch_rad_per_s {
        (AlertLevel::Watch, AlertCause::TiltDrift)
    } else {
        (AlertLevel::Clear, AlertCause::Settled)
    }
}

/// True when every figure that raises `level` is settled below it (module
/// docs, "Conditions"). Clear and sensor_fault have no thresholds: always
/// true.
#[must_use]
pub fn settled_below(level: AlertLevel, f: &Figures, t: &Thresholds) -> bool {
    let r = t.clear_ratio;
    match level {
        AlertLevel::Watch => {
            f.predicted < r * t.watch_utilisation
                && f.sliding < r * t.watch_utilisation
                && f.drift_rad_per_s < r * t.drift_watch_rad_per_s
        }
        AlertLevel::ParkNow => {
            f.predicted < r * t.park_utilisation && f.drive_max() < r * t.drive_park_utilisation
        }
        AlertLevel::Alarm => {
            f.overturning < r * t.alarm_utilisation
                && f.sliding < r * t.alarm_utilisation
                && f.tilt_margin_rad * r > t.tilt_margin_alarm_rad
        }
        AlertLevel::Clear | AlertLevel::SensorFault => true,
    }
}

/// One decision (module docs, "Transition table").
#[must_use]
pub fn transition(
    present: AlertLevel,
    readings: &Readings,
    t: &Thresholds,
    memory: Memory,
    now: Millis,
) -> Transition {
    let mut m = memory;
    let acknowledged = m.acknowledged;
    m.acknowledged = false;
    let change = |to: AlertLevel, cause: AlertCause, m: Memory| Transition {
        level: to,
        memory: m,
        change: (to != present).then_some(Change {
            from: present,
            to,
            cause,
        }),
    };
    let figures = match readings {
        Readings::Figures(f) if f.all_finite() => f,
        Readings::Figures(_) | Readings::EvaluationFault | Readings::SensorFault => {
            let cause = if matches!(readings, Readings::SensorFault) {
                AlertCause::SensorFault
            } else {
                AlertCause::EvaluationFault
            };
            m.healthy_since = None;
            m.settled_since = [None; 3];
            if present != AlertLevel::SensorFault {
                m.before_fault = Some(present);
            }
            return change(AlertLevel::SensorFault, cause, m);
        }
    };
    let healthy_since = *m.healthy_since.get_or_insert(now);
    // The settled timers of the levels with thresholds.
    for level in [AlertLevel::Watch, AlertLevel::ParkNow, AlertLevel::Alarm] {
        if let Some(slot) = level.timer().and_then(|i| m.settled_since.get_mut(i)) {
            *slot = if settled_below(level, figures, t) {
                Some(slot.unwrap_or(now))
            } else {
                None
            };
        }
    }
    let (want, cause) = wanted(figures, t);
    if present == AlertLevel::SensorFault {
        if now.since(healthy_since) < t.fault_clear_ms {
            return change(present, cause, m);
        }
        if want == AlertLevel::Alarm {
            m.latched = true;
        }
        let mut floor = want
            .max(AlertLevel::Watch)
            .max(m.before_fault.unwrap_or(AlertLevel::Clear));
        if m.latched {
            floor = AlertLevel::Alarm;
        }
        let mut to = AlertLevel::Alarm;
        while to > floor && settled_below(to, figures, t) {
            to = to.below();
        }
        m.before_fault = None;
        return change(to, AlertCause::FaultCleared, m);
    }
    if want > present {
        if want == AlertLevel::Alarm {
            m.latched = true;
        }
        return change(want, cause, m);
    }
    if want == present || m.latched {
        return change(present, cause, m);
    }
    // Step down: as far as the dwell of every level left allows.
    let dwelt = |level: AlertLevel| {
        level
            .timer()
            .and_then(|i| m.settled_since.get(i).copied().flatten())
            .is_some_and(|since| now.since(since) >= t.dwell_ms)
    };
    let mut to = present;
    while to > want && dwelt(to) {
        to = to.below();
    }
    if to == present {
        return change(present, cause, m);
    }
    // A fresh dwell for every level from here down.
    m.settled_since = [None; 3];
    let cause = if acknowledged {
        AlertCause::Acknowledged
    } else {
        AlertCause::Settled
    };
    change(to, cause, m)
}

#[cfg(test)]
mod tests;
