//! Wind input: a cup anemometer counted in pulses, and a direction vane.
//!
//! **Pulses.** The anemometer's reed switch or Hall sensor gives a fixed
//! number of pulses per revolution. The caller counts them in an edge
//! interrupt (into a [`PulseCounter`], a `static` atomic) or with a timer in
//! capture/counter mode, and hands the running total to the station each step
//! as a [`PulseLatch`]: the total and the time it was read. The station turns
//! totals into a frequency over a gate window and the frequency into a speed
//! with the calibration `v = slope · f + offset` ([`AnemometerCal`]), zero below
//! the stall frequency (the cups do not turn in a light breeze, and the offset
//! alone is not a measurement).
//!
//! **Direction** comes through the small [`WindVane`] trait, so any vane (a
//! potentiometer on an ADC, a Gray-code disc on GPIOs, a serial unit) fits.
//! Directions are meteorological: the azimuth the wind blows *from*, in the
//! rig frame (radians from north, clockwise).

use core::sync::atomic::{AtomicU32, Ordering};
use standfast::error::{Field, Unit};
use standfast::Error;

/// A running pulse total shared between an interrupt handler and the main
/// loop. Lives in a `static`; wraps around after 2³² pulses, which the
/// station handles.
///
/// Needs native atomic read-modify-write (Cortex-M3 and up). On a Cortex-M0
/// count in a timer peripheral instead, or use a critical section.
#[derive(Debug)]
pub struct PulseCounter {
    total: AtomicU32,
}

impl PulseCounter {
    /// A counter at zero, usable in a `static`.
    #[must_use]
    pub const fn new() -> Self {
        PulseCounter {
            total: AtomicU32::new(0),
        }
    }

    /// Counts one pulse. Call from the edge interrupt.
    pub fn on_pulse(&self) {
        self.total.fetch_add(1, Ordering::Relaxed);
    }

    /// The running total (wrapping).
    pub fn total(&self) -> u32 {
        self.total.load(Ordering::Relaxed)
    }

    /// A latch of the running total at `now_ms` (milliseconds since start).
    pub fn latch(&self, now_ms: u64) -> PulseLatch {
        PulseLatch {
            total: self.total(),
            at_ms: now_ms,
        }
    }
}

impl Default for PulseCounter {
    fn default() -> Self {
        Self::new()
    }
}

/// A reading of the running pulse total and when it was taken.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PulseLatch {
    /// Running pulse total (wrapping u32).
    pub total: u32,
    /// Time of the reading, milliseconds on the station's clock.
    pub at_ms: u64,
}

/// Anemometer calibration: `speed_mps = slope_mps_per_hz · f_hz + offset_mps`
/// for `f_hz ≥ stall_hz`, else 0. Take the figures from the anemometer's
/// calibration sheet (per pulse frequency, not per revolution).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct AnemometerCal {
    /// Metres per second per hertz of pulse frequency, > 0.
    pub slope_mps_per_hz: f32,
    /// Offset, metres per second (the starting threshold of the cups), ≥ 0.
    pub offset_mps: f32,
    /// Pulse frequency below which the speed reads 0, hertz, ≥ 0.
    pub stall_hz: f32,
}

impl AnemometerCal {
    /// A validated calibration.
    ///
    /// # Errors
    /// Slope outside (0, 100] m/s/Hz (checked as [1e-4, 100]), offset outside
    /// [0, 10] m/s, stall outside [0, 100] Hz, or non-finite values.
    pub fn new(slope_mps_per_hz: f32, offset_mps: f32, stall_hz: f32) -> Result<Self, Error> {
        Error::check(
            Field::External {
                path: "anemometer.slope_mps_per_hz",
                unit: Unit::MetrePerSecondPerHertz,
            },
            slope_mps_per_hz,
            1e-4,
            100.0,
        )?;
        Error::check(
            Field::External {
                path: "anemometer.offset_mps",
                unit: Unit::MetrePerSecond,
            },
            offset_mps,
            0.0,
            10.0,
        )?;
        Error::check(
            Field::External {
                path: "anemometer.stall_hz",
                unit: Unit::Hertz,
            },
            stall_hz,
            0.0,
            100.0,
        )?;
        Ok(AnemometerCal {
            slope_mps_per_hz,
            offset_mps,
            stall_hz,
        })
    }

    /// Wind speed, m/s, for a pulse frequency in hertz; 0 below the stall
    /// frequency (and for a non-finite frequency).
    #[must_use]
    pub fn speed_mps(&self, f_hz: f32) -> f32 {
        if f_hz.is_finite() && f_hz >= self.stall_hz && f_hz > 0.0 {
            self.slope_mps_per_hz * f_hz + self.offset_mps
        } else {
            0.0
        }
    }
}

/// Turns pulse latches into speeds over a gate window.
#[derive(Clone, Copy, Debug)]
pub struct Anemometer {
    cal: AnemometerCal,
    gate_ms: u32,
    window_start: Option<PulseLatch>,
}

impl Anemometer {
    /// An anemometer with calibration `cal` that reports one speed per gate of
    /// at least `gate_ms` milliseconds (1000 is usual; at least 1).
    #[must_use]
    pub const fn new(cal: AnemometerCal, gate_ms: u32) -> Self {
        Anemometer {
            cal,
            gate_ms: if gate_ms == 0 { 1 } else { gate_ms },
            window_start: None,
        }
    }

    /// The calibration.
    #[must_use]
    pub const fn cal(&self) -> AnemometerCal {
        self.cal
    }

    /// Feeds a latch. Returns the mean speed in m/s over the window just
    /// completed when at least `gate_ms` have passed since the window began,
    /// else `None`. The first latch only starts a window. A latch older than
    /// the window start (a clock step backwards) restarts the window.
    pub fn update(&mut self, latch: PulseLatch) -> Option<f32> {
        let Some(start) = self.window_start else {
            self.window_start = Some(latch);
            return None;
        };
        if latch.at_ms < start.at_ms {
            self.window_start = Some(latch);
            return None;
        }
        let dt_ms = latch.at_ms - start.at_ms;
        if dt_ms < u64::from(self.gate_ms) {
            return None;
        }
        let pulses = latch.total.wrapping_sub(start.total);
        self.window_start = Some(latch);
        // u32 → f32 and u64 → f32 conversions: exact up to 2^24, which covers
        // any realistic pulse count per window and windows up to 4.6 hours.
        #[allow(clippy::cast_precision_loss)]
        let f_hz = pulses as f32 * 1000.0 / dt_ms as f32;
        Some(self.cal.speed_mps(f_hz))
    }

    /// Forgets the open window (after a sensor fault, for example).
    pub fn reset(&mut self) {
        self.window_start = None;
    }
}

/// A wind-direction vane.
pub trait WindVane {
    /// The reading error.
    type Error;

    /// The azimuth the wind blows *from*, radians from north clockwise in the
    /// rig frame (correct the vane's mounting offset in the implementation).
    ///
    /// # Errors
    /// The implementation's reading error (open circuit, out-of-range ADC
    /// value, timed-out serial unit, ...). The station treats it as a stale
    /// wind sensor.
    fn direction_from_rad(&mut self) -> Result<f32, Self::Error>;
}
