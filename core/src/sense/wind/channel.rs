//! Per-channel sample checks shared by both wind sources: range checks of a
//! speed and a direction, and the stuck, stale and rejected-sample tracking
//! of one channel.

use crate::math::TAU;
use crate::sense::fault::{Fault, FaultSet, Sensor};
use crate::sense::{s_to_ms, Millis};

use super::config::WindConfig;

/// Tracks stuck readings and rejected samples of one channel.
#[derive(Clone, Copy, Debug)]
pub(super) struct Channel {
    last: Option<Millis>,
    last_bits: u32,
    same_since: Millis,
    pub(super) rejection: Option<Fault>,
}

impl Channel {
    pub(super) const fn new(now: Millis) -> Self {
        Channel {
            last: None,
            last_bits: 0,
            same_since: now,
            rejection: None,
        }
    }

    /// Records a valid value; `count_as_stuck_candidate` false resets the
    /// stuck timer (zero speed, or direction in calm).
    pub(super) fn accept(&mut self, now: Millis, value: f32, count_as_stuck_candidate: bool) {
        let b = value.to_bits();
        if !count_as_stuck_candidate || b != self.last_bits || self.last.is_none() {
            self.same_since = now;
        }
        self.last_bits = b;
        self.last = Some(now);
        self.rejection = None;
    }

    pub(super) fn reject(&mut self, now: Millis, f: Fault) {
        self.last = Some(now);
        self.rejection = Some(f);
    }

    pub(super) fn faults(
        &self,
        set: &mut FaultSet,
        sensor: Sensor,
        now: Millis,
        start: Millis,
        limits: FaultLimits,
    ) {
        if let Some(f) = self.rejection {
            set.push(f);
        }
        let silent_ms = now.since(self.last.unwrap_or(start));
        if silent_ms > limits.stale_ms {
            set.push(Fault::Stale { sensor, silent_ms });
        }
        if let Some(last) = self.last {
            let unchanged_ms = last.since(self.same_since);
            if limits.stuck_ms.is_some_and(|limit| unchanged_ms > limit) {
                set.push(Fault::Stuck {
                    sensor,
                    unchanged_ms,
                });
            }
        }
    }
}

impl Channel {
    /// The last time stamp, ms, at which [`Channel::faults`] reports no
    /// stale fault: the stale time after the last sample (or the start),
    /// saturating (past `u64::MAX` no representable time is stale).
    pub(super) fn stale_after(&self, start: Millis, limits: FaultLimits) -> u64 {
        self.last.unwrap_or(start).0.saturating_add(limits.stale_ms)
    }
}

/// The configuration's stale and stuck times in whole ms (`s_to_ms`; no
/// stuck limit when `stuck_after_s` is 0).
#[derive(Clone, Copy, Debug)]
pub(super) struct FaultLimits {
    stale_ms: u64,
    stuck_ms: Option<u64>,
}

impl FaultLimits {
    pub(super) fn of(c: &WindConfig) -> FaultLimits {
        FaultLimits {
            stale_ms: s_to_ms(c.stale_after_s),
            stuck_ms: (c.stuck_after_s > 0.0).then(|| s_to_ms(c.stuck_after_s)),
        }
    }
}

pub(super) fn check_speed(speed_mps: f32, c: &WindConfig) -> Result<f32, Fault> {
    let sensor = Sensor::WindSpeed;
    if !speed_mps.is_finite() {
        Err(Fault::NotFinite { sensor })
    } else if !(0.0..=c.max_speed_mps).contains(&speed_mps) {
        Err(Fault::OutOfRange {
            sensor,
            value: speed_mps,
        })
    } else {
        Ok(speed_mps)
    }
}

pub(super) fn check_direction(from_rad: f32) -> Result<f32, Fault> {
    let sensor = Sensor::WindDirection;
    if !from_rad.is_finite() {
        Err(Fault::NotFinite { sensor })
    } else if !(0.0..=TAU).contains(&from_rad) {
        Err(Fault::OutOfRange {
            sensor,
            value: from_rad,
        })
    } else {
        Ok(from_rad)
    }
}
