//! Sensing: ground tilt from a 3-axis accelerometer, wind statistics from an
//! anemometer, and typed sensor faults.
//!
//! **Time.** Nothing here reads a clock. Every call that depends on time takes
//! a [`Millis`] time stamp from the caller: milliseconds since an arbitrary
//! epoch of the caller's choosing (boot, for example), from a monotonic clock.
//! Integer milliseconds keep full precision over any run length (`u64` lasts
//! 584 million years), unlike an `f32` of seconds, which loses whole seconds
//! after about 194 days. A time stamp smaller than the previous one is a
//! fault ([`Fault::TimeReversed`]) and the sample is dropped.
//!
//! **Memory.** Every type here has a size fixed at compile time and allocates
//! nothing: [`TiltSensor`] and [`WindStats`] hold fixed arrays (their sizes are
//! stated in their docs and checked by unit tests).
//!
//! **Faults.** Each processor rejects bad samples with a [`Fault`] value and
//! reports lasting conditions (stale, stuck, out of band, tilt step) through a
//! [`FaultSet`] from its `faults(now)` method. A caller must treat any fault as
//! unsafe: the statistics of a faulty sensor are not to be trusted. The same
//! [`Fault`] type carries the guard's faults of its other inputs (pose, cover,
//! air, clock) and of its own evaluation ([`Fault::Unevaluable`]).
//!
//! **Caution.** These are estimates from simple filters. Secure the rig anyway,
//! stay inside the mount maker's limits and defer to local codes and licensed
//! engineers.

mod fault;
mod tilt;
mod wind;

pub use fault::{Check, Fault, FaultSet, Sensor, FAULT_SET_CAPACITY};
pub use tilt::{
    lowpass_alpha, tilt_of_specific_force, LevelCapture, Mounting, SignedAxis, TiltConfig,
    TiltReference, TiltSensor,
};
pub use wind::{
    gust_from_mean, log_profile_factor, GustBasis, MeanWind, TerrainCategory, WindConfig,
    WindDirection, WindReport, WindStats, COARSE_BINS, COARSE_BIN_MS, FINE_BINS, FINE_BIN_MS,
};

/// A time stamp: whole milliseconds since an arbitrary epoch chosen by the
/// caller, taken from a monotonic clock. Only differences between time stamps
/// carry meaning.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, PartialOrd, Ord, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Millis(pub u64);

impl Millis {
    /// A time stamp `s` whole seconds after the epoch.
    #[must_use]
    pub const fn from_secs(s: u64) -> Millis {
        Millis(s.saturating_mul(1000))
    }

    /// Milliseconds from `earlier` to `self`; 0 when `earlier` is later.
    #[must_use]
    pub const fn since(self, earlier: Millis) -> u64 {
        self.0.saturating_sub(earlier.0)
    }

    /// Seconds from `earlier` to `self` as `f32`; 0 when `earlier` is later.
    /// Exact to 1 ms for spans up to 4.6 hours, to 1 part in 16 million beyond.
    #[must_use]
    pub fn seconds_since(self, earlier: Millis) -> f32 {
        ms_to_s(self.since(earlier))
    }

    /// `self` plus `ms` milliseconds, saturating.
    #[must_use]
    pub const fn plus_ms(self, ms: u64) -> Millis {
        Millis(self.0.saturating_add(ms))
    }
}

/// Milliseconds to seconds. The `u64 → f32` conversion rounds to the nearest
/// representable value; that is the intent (no truncation surprise).
#[allow(clippy::cast_precision_loss)]
pub(crate) fn ms_to_s(ms: u64) -> f32 {
    ms as f32 * 1e-3
}

/// Seconds (finite, ≥ 0) to whole milliseconds, rounded; negative or NaN
/// gives 0, huge values saturate.
#[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
pub(crate) fn s_to_ms(s: f32) -> u64 {
    let ms = s * 1000.0 + 0.5;
    if ms.is_nan() || ms <= 0.0 {
        0
    } else if ms >= 1.8e19 {
        u64::MAX
    } else {
        // In range and non-negative: `as` is exact up to rounding toward zero.
        ms as u64
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn millis_differences() {
        assert_eq!(Millis(1500).since(Millis(500)), 1000);
        assert_eq!(Millis(500).since(Millis(1500)), 0);
        assert!((Millis(2500).seconds_since(Millis(0)) - 2.5).abs() < 1e-6);
        assert_eq!(s_to_ms(1.2344), 1234);
        assert_eq!(s_to_ms(-1.0), 0);
        assert_eq!(s_to_ms(f32::NAN), 0);
    }
}
