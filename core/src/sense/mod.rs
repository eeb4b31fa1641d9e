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
    TiltReading, TiltReference, TiltSensor,
};
pub use wind::{
    gust_from_mean, log_profile_factor, GustBasis, MeanWind, TerrainCategory, WindConfig,
    WindDirection, WindReport, WindStats, COARSE_BINS, COARSE_BIN_MS, FINE_BINS, FINE_BIN_MS,
};

/// A time stamp: whole milliseconds since an arbitrary epoch chosen by the
/// caller, taken from a monotonic clock. Only differences between time stamps
/// carry meaning.
/// # Examples
/// ```
/// use standfast::Millis;
///
/// let start = Millis::from_secs(10);
/// let now = start.plus_ms(2_500);
/// assert_eq!(now.since(start), 2_500);
/// assert_eq!(now.seconds_since(start), 2.5);
/// assert_eq!(start.since(now), 0, "never negative");
/// ```
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

/// `n / d` and `n % d` for a time in milliseconds and a constant divisor
/// (the wind bins' 250 ms and 10 s, a minute, a ring's length), without a
/// 64-bit division: on a 32-bit target (Cortex-M) `u64 / u64` is a call into
/// compiler-builtins' software division (about 0.9 KiB of flash and tens to
/// hundreds of instructions a call, on the guard's every step), while a
/// divisor below 2^16 needs only three 32-bit hardware divisions (long
/// division in 16-bit digits, [`div_rem_by_u16`]). Other divisors, none
/// here, take the plain `u64` division; `d = 0` gives `(0, 0)`. Inlined, so
/// a constant divisor picks its branch at compile time. On a 64-bit target
/// (the host) the plain division is used throughout: one instruction, or a
/// multiply for a constant.
#[inline(always)]
pub(crate) fn div_rem_ms(n: u64, d: u64) -> (u64, u64) {
    // A 64-bit target divides a `u64` in hardware (a constant divisor
    // becomes a multiply and shifts): the same quotient and remainder.
    if cfg!(target_pointer_width = "64") {
        return (n.checked_div(d).unwrap_or(0), n.checked_rem(d).unwrap_or(0));
    }
    match u16::try_from(d).ok().and_then(core::num::NonZeroU16::new) {
        Some(d16) => div_rem_by_u16(n, d16),
        None => (n.checked_div(d).unwrap_or(0), n.checked_rem(d).unwrap_or(0)),
    }
}

/// `n / d` and `n % d` by schoolbook long division of `n` in one 32-bit and
/// two 16-bit digits: each partial dividend is the previous remainder
/// (below `d` < 2^16) shifted by 16 bits plus the next digit, so it fits
/// 32 bits and each partial quotient fits its digit. Equal to `u64`'s `/`
/// and `%` for every `n` and `d` (tests).
#[inline(always)]
pub(crate) fn div_rem_by_u16(n: u64, d: core::num::NonZeroU16) -> (u64, u64) {
    let d = core::num::NonZeroU32::from(d);
    #[allow(clippy::cast_possible_truncation)]
    let (hi, lo) = ((n >> 32) as u32, n as u32);
    let (q2, r2) = (hi / d, hi % d);
    let t1 = (r2 << 16) | (lo >> 16);
    let (q1, r1) = (t1 / d, t1 % d);
    let t0 = (r1 << 16) | (lo & 0xFFFF);
    let (q0, r0) = (t0 / d, t0 % d);
    (
        (u64::from(q2) << 32) | (u64::from(q1) << 16) | u64::from(q0),
        u64::from(r0),
    )
}

/// Milliseconds to seconds. The `u64 → f32` conversion rounds to the nearest
/// representable value; that is the intent (no truncation surprise).
#[allow(clippy::cast_precision_loss)]
pub(crate) fn ms_to_s(ms: u64) -> f32 {
    ms as f32 * 1e-3
}

/// Seconds (finite, ≥ 0) to whole milliseconds, rounded to nearest (half
/// up); negative or NaN gives 0, huge values saturate. Out of line: it runs
/// when a configuration is taken, not per sample, and one copy keeps the
/// firmware small.
#[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
#[inline(never)]
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

/// One field of a configuration test: the field, how to set it, its lowest
/// and highest accepted value.
#[cfg(test)]
pub(crate) type FieldRange<C> = (crate::error::Field, fn(&mut C, f32), f32, f32);

/// For the configuration tests: every `(field, setter, low, high)` accepts
/// its bounds and refuses, under its own name, a value just outside either
/// bound and a non-finite one, starting each time from `default`.
#[cfg(test)]
pub(crate) fn each_field_refused_under_its_name<C: Copy>(
    default: C,
    validate: fn(&C) -> Result<(), crate::error::Error>,
    fields: &[FieldRange<C>],
) {
    for &(field, set, lo, hi) in fields {
        for ok in [lo, hi] {
            let mut c = default;
            set(&mut c, ok);
            assert_eq!(validate(&c), Ok(()), "{field:?} = {ok}");
        }
        let below = if lo == 0.0 { -1e-6 } else { lo * 0.999 };
        for bad in [below, hi * 1.001, f32::NAN, f32::INFINITY] {
            let mut c = default;
            set(&mut c, bad);
            let e = validate(&c).unwrap_err();
            assert_eq!(e.field, field, "{field:?} = {bad}");
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Against `u64`'s own `/` and `%` (the language's integer division):
    /// the edges of every digit, the divisors in use, and pseudo-random
    /// numerators over every magnitude with divisors over the whole range.
    #[test]
    fn division_by_a_small_divisor_is_u64_division() {
        let fixed_d = [1, 2, 3, 7, 10, 12, 60, 250, 1000, 10_000, 60_000, 65_535];
        // Zero, one, the top, and each side of every 16-bit digit boundary.
        let fixed_n: [u64; 13] = [
            0,
            1,
            u64::MAX,
            u64::MAX - 1,
            (1 << 16) - 1,
            1 << 16,
            (1 << 16) + 1,
            (1 << 32) - 1,
            1 << 32,
            (1 << 32) + 1,
            (1 << 48) - 1,
            1 << 48,
            (1 << 48) + 1,
        ];
        let mut x: u64 = 0x2545_f491_4f6c_dd1d;
        let mut next = move || {
            // xorshift64
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            x
        };
        // Both paths: the host's plain division and the 32-bit target's
        // long division (tested here on the host too).
        let check = |n: u64, d: u64| {
            assert_eq!(div_rem_ms(n, d), (n / d, n % d), "{n} / {d}");
            if let Some(d16) = u16::try_from(d).ok().and_then(core::num::NonZeroU16::new) {
                assert_eq!(div_rem_by_u16(n, d16), (n / d, n % d), "{n} / {d}");
            }
        };
        for d in fixed_d {
            for n in fixed_n {
                check(n, d);
            }
        }
        for _ in 0..200_000 {
            let (r, s) = (next(), next());
            let d = s % 65_535 + 1;
            check(r >> (r % 64), d);
            check(r, d);
            for n in fixed_n {
                check(n, d);
            }
        }
        // Divisors from 2^16 up take the plain division; zero gives zeros.
        assert_eq!(div_rem_ms(600_000_123, 600_000), (1000, 123));
        assert_eq!(div_rem_ms(u64::MAX, u64::MAX), (1, 0));
        assert_eq!(div_rem_ms(5, 0), (0, 0));
    }

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
