//! Typed faults: of the sensors, of the guard's other inputs (mount pose,
//! cover, air, the caller's clock) and of the guard's own evaluation.
//!
//! Every fault means the same to a guard: it cannot judge the rig from what
//! it has, so it parks and alarms (fail safe).

use core::fmt;

/// Which input a fault concerns: a sensor, another input of the guard, or
/// the guard's physics model itself ([`Sensor::Model`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum Sensor {
    /// The 3-axis accelerometer used for ground tilt.
    Accelerometer,
    /// The anemometer's speed channel.
    WindSpeed,
    /// The wind vane or the direction channel of a sonic anemometer.
    WindDirection,
    /// The mount pose reported by the mount controller.
    MountPose,
    /// The cover state reported by the observatory (fitted or removed).
    Cover,
    /// Measured air temperature and pressure.
    Air,
    /// The caller's time stamps ([`crate::sense::Millis`]) given to the guard.
    Clock,
    /// The guard's physics model: a figure could not be computed from the
    /// inputs (see [`Fault::Unevaluable`]).
    Model,
}

impl Sensor {
    /// A short snake-case name for log lines: `accel`, `wind_speed`,
    /// `wind_direction`, `pose`, `cover`, `air`, `clock`, `model`.
    #[must_use]
    pub const fn code(self) -> &'static str {
        match self {
            Sensor::Accelerometer => "accel",
            Sensor::WindSpeed => "wind_speed",
            Sensor::WindDirection => "wind_direction",
            Sensor::MountPose => "pose",
            Sensor::Cover => "cover",
            Sensor::Air => "air",
            Sensor::Clock => "clock",
            Sensor::Model => "model",
        }
    }
}

impl fmt::Display for Sensor {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Sensor::Accelerometer => "accelerometer",
            Sensor::WindSpeed => "wind speed sensor",
            Sensor::WindDirection => "wind direction sensor",
            Sensor::MountPose => "mount pose",
            Sensor::Cover => "cover state",
            Sensor::Air => "air sample",
            Sensor::Clock => "time stamp",
            Sensor::Model => "stability model",
        })
    }
}

/// A figure of the guard's evaluation (see [`Fault::Unevaluable`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum Check {
    /// The scan for the worst wind direction (wind of undefined direction).
    WorstDirection,
    /// Overturning and sliding utilisation at the present gust, and the tip
    /// wind speed.
    Overturning,
    /// Overturning utilisation at the gust predicted for the end of a park.
    PredictedOverturning,
    /// Drive torque utilisation of either axis.
    Drive,
    /// The extra tilt that would tip the rig.
    TiltMargin,
    /// The rate of slow tilt change.
    TiltDrift,
    /// The search for the safest park pose.
    ParkPose,
}

impl Check {
    /// A short snake-case name for log lines: `worst_direction`,
    /// `overturning`, `predicted_overturning`, `drive`, `tilt_margin`,
    /// `tilt_drift`, `park_pose`.
    #[must_use]
    pub const fn code(self) -> &'static str {
        match self {
            Check::WorstDirection => "worst_direction",
            Check::Overturning => "overturning",
            Check::PredictedOverturning => "predicted_overturning",
            Check::Drive => "drive",
            Check::TiltMargin => "tilt_margin",
            Check::TiltDrift => "tilt_drift",
            Check::ParkPose => "park_pose",
        }
    }
}

/// A fault. Every variant means: do not trust this sensor now; a
/// guard must treat it as unsafe.
///
/// Values carried are in the unit stated per variant (SI, radians for angles,
/// g for acceleration magnitude, milliseconds for durations).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Fault {
    /// A sample held NaN or an infinity; it was dropped.
    NotFinite {
        /// The sensor that sent it.
        sensor: Sensor,
    },
    /// A sample lay outside the physically possible range; it was dropped.
    /// `value` is in the sample's unit: m/s for speed, radians for direction.
    OutOfRange {
        /// The sensor that sent it.
        sensor: Sensor,
        /// The offending value.
        value: f32,
    },
    /// A sample's time stamp was earlier than the previous one; it was dropped.
    TimeReversed {
        /// The sensor that sent it.
        sensor: Sensor,
    },
    /// No sample (or, for the accelerometer, no sample at all) for longer
    /// than the configured stale time.
    Stale {
        /// The silent sensor.
        sensor: Sensor,
        /// Milliseconds since its last sample (or since start-up if none came).
        silent_ms: u64,
    },
    /// The sensor has repeated one identical reading for longer than the
    /// configured time, which a working sensor in real air or on a real rig
    /// does not do.
    Stuck {
        /// The stuck sensor.
        sensor: Sensor,
        /// Milliseconds the reading has not changed.
        unchanged_ms: u64,
    },
    /// Every accelerometer sample for longer than the configured time had a
    /// magnitude outside the accepted band (shock, vibration, saturation,
    /// wrong scale): no tilt can be measured.
    MagnitudeOutOfBand {
        /// Magnitude of the latest sample, in g.
        magnitude_g: f32,
        /// Milliseconds since the last sample inside the band.
        for_ms: u64,
    },
    /// The tilt changed faster than a leg sinking can explain: the angle
    /// between the fast-filtered and the medium-filtered gravity directions
    /// exceeds the configured step limit (a knock, a foot slipping, a tip
    /// starting).
    TiltStep {
        /// Angle between the two filtered directions, radians.
        step_rad: f32,
    },
    /// The measured tilt exceeds what the stability model accepts
    /// ([`crate::frame::MAX_TILT_RAD`]): the rig is not standing normally.
    TiltBeyondLimit {
        /// The measured tilt, radians.
        magnitude_rad: f32,
    },
    /// The sensor has not yet given a usable reading: no tilt before the
    /// first accelerometer sample, no gust before the wind statistics hold
    /// one (the first 3 s of samples, or the first ten-minute mean). The
    /// guard cannot judge the rig without it.
    NoReading {
        /// The sensor without a reading.
        sensor: Sensor,
    },
    /// The input names a part the rig description does not have (a cover
    /// reported fitted on a rig without a cover): the model would miss its
    /// wind load. The input was dropped.
    NotInRig {
        /// The input that named it.
        sensor: Sensor,
    },
    /// The physics model could not compute a figure from the present inputs
    /// (an evaluation error or a non-finite result). The figure is absent,
    /// never read as zero.
    Unevaluable {
        /// The figure that could not be computed.
        check: Check,
    },
}

impl Fault {
    /// The sensor this fault concerns.
    #[must_use]
    pub const fn sensor(&self) -> Sensor {
        match *self {
            Fault::NotFinite { sensor }
            | Fault::OutOfRange { sensor, .. }
            | Fault::TimeReversed { sensor }
            | Fault::Stale { sensor, .. }
            | Fault::Stuck { sensor, .. }
            | Fault::NoReading { sensor }
            | Fault::NotInRig { sensor } => sensor,
            Fault::Unevaluable { .. } => Sensor::Model,
            Fault::MagnitudeOutOfBand { .. }
            | Fault::TiltStep { .. }
            | Fault::TiltBeyondLimit { .. } => Sensor::Accelerometer,
        }
    }

    /// A short snake-case name of the fault's class for log lines (the
    /// variant's name): `not_finite`, `out_of_range`, `time_reversed`,
    /// `stale`, `stuck`, `magnitude_out_of_band`, `tilt_step`,
    /// `tilt_beyond_limit`, `no_reading`, `not_in_rig`, `unevaluable`.
    #[must_use]
    pub const fn class_code(&self) -> &'static str {
        match self {
            Fault::NotFinite { .. } => "not_finite",
            Fault::OutOfRange { .. } => "out_of_range",
            Fault::TimeReversed { .. } => "time_reversed",
            Fault::Stale { .. } => "stale",
            Fault::Stuck { .. } => "stuck",
            Fault::MagnitudeOutOfBand { .. } => "magnitude_out_of_band",
            Fault::TiltStep { .. } => "tilt_step",
            Fault::TiltBeyondLimit { .. } => "tilt_beyond_limit",
            Fault::NoReading { .. } => "no_reading",
            Fault::NotInRig { .. } => "not_in_rig",
            Fault::Unevaluable { .. } => "unevaluable",
        }
    }

    /// True when two faults are of the same class on the same sensor (and,
    /// for [`Fault::Unevaluable`], the same check), whatever the values they
    /// carry.
    #[must_use]
    pub fn same_class(&self, other: &Fault) -> bool {
        match (self, other) {
            (Fault::Unevaluable { check: a }, Fault::Unevaluable { check: b }) => a == b,
            _ => {
                core::mem::discriminant(self) == core::mem::discriminant(other)
                    && self.sensor() == other.sensor()
            }
        }
    }
}

impl fmt::Display for Fault {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Fault::NotFinite { sensor } => write!(f, "{sensor}: sample is not a finite number"),
            Fault::OutOfRange { sensor, value } => {
                write!(f, "{sensor}: sample {value} is outside the physical range")
            }
            Fault::TimeReversed { sensor } => {
                write!(f, "{sensor}: sample time stamp went backwards")
            }
            Fault::Stale { sensor, silent_ms } => {
                write!(f, "{sensor}: no sample for ")?;
                write_seconds(f, silent_ms)
            }
            Fault::Stuck {
                sensor,
                unchanged_ms,
            } => {
                write!(f, "{sensor}: reading unchanged for ")?;
                write_seconds(f, unchanged_ms)
            }
            Fault::MagnitudeOutOfBand {
                magnitude_g,
                for_ms,
            } => {
                write!(
                    f,
                    "accelerometer: magnitude {magnitude_g} g outside the accepted band for "
                )?;
                write_seconds(f, for_ms)
            }
            Fault::TiltStep { step_rad } => write!(
                f,
                "accelerometer: sudden tilt change of {} degrees",
                crate::math::rad_to_deg(step_rad)
            ),
            Fault::TiltBeyondLimit { magnitude_rad } => write!(
                f,
                "accelerometer: tilt of {} degrees is beyond the model's limit",
                crate::math::rad_to_deg(magnitude_rad)
            ),
            Fault::NoReading { sensor } => write!(f, "{sensor}: no usable reading yet"),
            Fault::NotInRig { sensor } => {
                write!(
                    f,
                    "{sensor}: names a part the rig description does not have"
                )
            }
            Fault::Unevaluable { check } => {
                write!(f, "stability model: {} could not be computed", check.code())
            }
        }
    }
}

/// Writes a duration of `ms` milliseconds as seconds with three decimals
/// and the unit (`15.020 s`): the unit a reader expects of a sensor's
/// silence, exact to the millisecond.
fn write_seconds(f: &mut fmt::Formatter<'_>, ms: u64) -> fmt::Result {
    write!(f, "{}.{:03} s", ms / 1000, ms % 1000)
}

/// Most faults one processor can report at once.
pub const FAULT_SET_CAPACITY: usize = 8;

/// The faults active at one moment, in a fixed array (no allocation).
/// Holds at most [`FAULT_SET_CAPACITY`]; a further fault of a class already
/// held is not added again, and beyond capacity [`FaultSet::overflowed`]
/// turns true (the set is still non-empty, so still unsafe).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FaultSet {
    items: [Option<Fault>; FAULT_SET_CAPACITY],
    len: u8,
    overflow: bool,
}

impl FaultSet {
    /// An empty set.
    #[must_use]
    pub const fn new() -> Self {
        FaultSet {
            items: [None; FAULT_SET_CAPACITY],
            len: 0,
            overflow: false,
        }
    }

    /// Adds `fault` unless a fault of the same class on the same sensor is
    /// already held.
    pub fn push(&mut self, fault: Fault) {
        if self.iter().any(|f| f.same_class(&fault)) {
            return;
        }
        let idx = usize::from(self.len);
        match self.items.get_mut(idx) {
            Some(slot) => {
                *slot = Some(fault);
                self.len = self.len.saturating_add(1);
            }
            None => self.overflow = true,
        }
    }

    /// Empties the set (and its overflow mark), for reuse in place.
    pub fn clear(&mut self) {
        // Only the first `len` slots are ever filled.
        for slot in self.items.iter_mut().take(usize::from(self.len)) {
            *slot = None;
        }
        self.len = 0;
        self.overflow = false;
    }

    /// Adds every fault of `other`.
    pub fn extend(&mut self, other: &FaultSet) {
        // An empty set adds nothing (and carries no overflow): no iterator.
        if other.is_empty() {
            return;
        }
        for f in other.iter() {
            self.push(f);
        }
        self.overflow |= other.overflow;
    }

    /// True when no fault is active.
    #[must_use]
    pub fn is_empty(&self) -> bool {
        self.len == 0 && !self.overflow
    }

    /// Number of faults held.
    #[must_use]
    pub fn len(&self) -> usize {
        usize::from(self.len)
    }

    /// True when more faults arrived than the set can hold.
    #[must_use]
    pub fn overflowed(&self) -> bool {
        self.overflow
    }

    /// The faults held, oldest first.
    pub fn iter(&self) -> impl Iterator<Item = Fault> + '_ {
        // Only the first `len` slots are ever filled.
        self.items
            .iter()
            .take(usize::from(self.len))
            .filter_map(|f| *f)
    }

    /// True when a fault matching `pred` is held.
    pub fn any(&self, pred: impl Fn(&Fault) -> bool) -> bool {
        self.iter().any(|f| pred(&f))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn set_dedups_by_class_and_sensor() {
        let mut s = FaultSet::new();
        assert!(s.is_empty());
        s.push(Fault::Stale {
            sensor: Sensor::WindSpeed,
            silent_ms: 1,
        });
        s.push(Fault::Stale {
            sensor: Sensor::WindSpeed,
            silent_ms: 2,
        });
        s.push(Fault::Stale {
            sensor: Sensor::WindDirection,
            silent_ms: 2,
        });
        assert_eq!(s.len(), 2);
        for _ in 0..20 {
            s.push(Fault::TiltStep { step_rad: 0.1 });
        }
        assert_eq!(s.len(), 3);
        assert!(!s.overflowed());
    }

    /// Every sensor, `NotFinite` and `Stale` on each: 16 distinct classes,
    /// twice the capacity.
    fn sixteen_distinct() -> [Fault; 16] {
        let sensors = [
            Sensor::Accelerometer,
            Sensor::WindSpeed,
            Sensor::WindDirection,
            Sensor::MountPose,
            Sensor::Cover,
            Sensor::Air,
            Sensor::Clock,
            Sensor::Model,
        ];
        let mut out = [Fault::NotFinite {
            sensor: Sensor::Model,
        }; 16];
        for (i, sensor) in sensors.into_iter().enumerate() {
            out[2 * i] = Fault::NotFinite { sensor };
            out[2 * i + 1] = Fault::Stale {
                sensor,
                silent_ms: 5,
            };
        }
        out
    }

    #[test]
    fn set_beyond_capacity_overflows_and_stays_unsafe() {
        let mut s = FaultSet::new();
        for f in sixteen_distinct().iter().take(FAULT_SET_CAPACITY) {
            s.push(*f);
        }
        assert_eq!(s.len(), FAULT_SET_CAPACITY);
        assert!(!s.overflowed());
        s.push(sixteen_distinct()[FAULT_SET_CAPACITY]);
        assert_eq!(s.len(), FAULT_SET_CAPACITY);
        assert!(s.overflowed());
        assert!(!s.is_empty());
        // The oldest are kept, in order.
        assert!(s.iter().eq(sixteen_distinct().into_iter().take(8)));
    }

    #[test]
    fn extend_carries_the_other_sets_overflow() {
        let mut full = FaultSet::new();
        for f in sixteen_distinct() {
            full.push(f);
        }
        assert!(full.overflowed());
        let mut s = FaultSet::new();
        s.extend(&full);
        assert!(s.overflowed(), "an overflowed set's loss must not vanish");
        assert_eq!(s.len(), FAULT_SET_CAPACITY);

        // And extending by a set that did not overflow keeps an earlier flag.
        let mut one = FaultSet::new();
        one.push(Fault::TiltStep { step_rad: 0.2 });
        s.extend(&one);
        assert!(s.overflowed());
        let mut fresh = FaultSet::new();
        fresh.extend(&one);
        assert!(!fresh.overflowed());
        assert_eq!(fresh.len(), 1);
    }

    #[test]
    fn unevaluable_faults_differ_by_check() {
        let a = Fault::Unevaluable {
            check: Check::Drive,
        };
        let b = Fault::Unevaluable {
            check: Check::TiltMargin,
        };
        assert!(a.same_class(&a));
        assert!(!a.same_class(&b));
        let mut s = FaultSet::new();
        s.push(a);
        s.push(b);
        s.push(a);
        assert_eq!(s.len(), 2, "one entry per check that failed");
        // Another class on the same (model) sensor is distinct too.
        assert!(!a.same_class(&Fault::NotFinite {
            sensor: Sensor::Model
        }));
    }

    /// The codes are what log lines, the host's outputs and the C ABI print:
    /// written out here so that a change is deliberate.
    #[test]
    fn codes_are_the_documented_ones() {
        let checks = [
            (Check::WorstDirection, "worst_direction"),
            (Check::Overturning, "overturning"),
            (Check::PredictedOverturning, "predicted_overturning"),
            (Check::Drive, "drive"),
            (Check::TiltMargin, "tilt_margin"),
            (Check::TiltDrift, "tilt_drift"),
            (Check::ParkPose, "park_pose"),
        ];
        for (c, code) in checks {
            assert_eq!(c.code(), code);
        }
        let sensors = [
            (Sensor::Accelerometer, "accel"),
            (Sensor::WindSpeed, "wind_speed"),
            (Sensor::WindDirection, "wind_direction"),
            (Sensor::MountPose, "pose"),
            (Sensor::Cover, "cover"),
            (Sensor::Air, "air"),
            (Sensor::Clock, "clock"),
            (Sensor::Model, "model"),
        ];
        for (sensor, code) in sensors {
            assert_eq!(sensor.code(), code);
        }
    }

    #[test]
    fn durations_read_in_seconds_to_the_millisecond() {
        let mut out = heapless::String::<96>::new();
        core::fmt::write(
            &mut out,
            format_args!(
                "{}",
                Fault::Stale {
                    sensor: Sensor::WindSpeed,
                    silent_ms: 15_020,
                }
            ),
        )
        .unwrap();
        assert_eq!(out.as_str(), "wind speed sensor: no sample for 15.020 s");
        out.clear();
        core::fmt::write(
            &mut out,
            format_args!(
                "{}",
                Fault::Stuck {
                    sensor: Sensor::Accelerometer,
                    unchanged_ms: 7,
                }
            ),
        )
        .unwrap();
        assert_eq!(out.as_str(), "accelerometer: reading unchanged for 0.007 s");
    }
}
