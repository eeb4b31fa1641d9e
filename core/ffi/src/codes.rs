//! The one place where the core's enums meet the C integer codes: every
//! code's value, its static C name, and the exhaustive mapping from the
//! core's types. A new variant in the core fails to compile here (no
//! wildcard arms) until it has a code and a name.
//!
//! **Rule:** a code's value never changes and is never reused; new codes
//! are appended and raise [`crate::SF_ABI_VERSION`].

use core::ffi::CStr;
use standfast::guard::{AlertCause, AlertLevel, Event};
use standfast::sense::{Check, Fault, Sensor};
use standfast::ErrorKind;

/// A status code returned by every `sf_*` function that can fail.
pub type SfStatus = u32;
/// Success.
pub const SF_OK: SfStatus = 0;
/// A required pointer argument is null.
pub const SF_ERR_NULL_POINTER: SfStatus = 1;
/// A pointer argument is not aligned for its type (or the guard storage not
/// to [`crate::SF_GUARD_STORAGE_ALIGN`]).
pub const SF_ERR_MISALIGNED: SfStatus = 2;
/// The guard storage is smaller than [`crate::SF_GUARD_STORAGE_SIZE`].
pub const SF_ERR_STORAGE_TOO_SMALL: SfStatus = 3;
/// The handle is not an initialised guard (never initialised, finished, or
/// overwritten).
pub const SF_ERR_BAD_HANDLE: SfStatus = 4;
/// The rig image is shorter than its header or than its header says.
pub const SF_ERR_IMAGE_TRUNCATED: SfStatus = 5;
/// The rig image does not start with the magic bytes `SFRI`.
pub const SF_ERR_IMAGE_MAGIC: SfStatus = 6;
/// The rig image has another format version (the error's `value` holds it,
/// `min` and `max` the version this library reads).
pub const SF_ERR_IMAGE_VERSION: SfStatus = 7;
/// The rig image's header size, payload size or total size is wrong.
pub const SF_ERR_IMAGE_SIZE: SfStatus = 8;
/// The rig image's CRC-32 does not match: the image is damaged.
pub const SF_ERR_IMAGE_CHECKSUM: SfStatus = 9;
/// The rig image's payload does not decode into a rig and guard settings.
pub const SF_ERR_IMAGE_PAYLOAD: SfStatus = 10;
/// A value is NaN or infinite (the core's `ErrorKind::NotFinite`).
pub const SF_ERR_NOT_FINITE: SfStatus = 11;
/// A value lies outside `[min, max]` (`ErrorKind::OutOfRange`); also an
/// integer code or flag outside its set at the boundary.
pub const SF_ERR_OUT_OF_RANGE: SfStatus = 12;
/// Two feet closer than 1 mm (`ErrorKind::DuplicateFoot`).
pub const SF_ERR_DUPLICATE_FOOT: SfStatus = 13;
/// The feet lie on one line (`ErrorKind::CollinearFeet`).
pub const SF_ERR_COLLINEAR_FEET: SfStatus = 14;
/// More items than a capacity (`ErrorKind::TooMany`; `max` holds it).
pub const SF_ERR_TOO_MANY: SfStatus = 15;
/// Fewer items than needed (`ErrorKind::TooFew`; `min` holds it).
pub const SF_ERR_TOO_FEW: SfStatus = 16;
/// A direction vector of zero length (`ErrorKind::ZeroDirection`).
pub const SF_ERR_ZERO_DIRECTION: SfStatus = 17;
/// A requested result cannot be reached (`ErrorKind::Unreachable`).
pub const SF_ERR_UNREACHABLE: SfStatus = 18;
/// The heap allocation of `sf_guard_new` failed.
pub const SF_ERR_NO_MEMORY: SfStatus = 19;
/// Measurements that contradict each other (`ErrorKind::Inconsistent`, from
/// the core's weighing).
pub const SF_ERR_INCONSISTENT: SfStatus = 20;

/// The guard's level (`standfast::guard::AlertLevel`), in rising severity.
pub type SfLevel = u32;
/// All figures comfortably inside their limits.
pub const SF_LEVEL_CLEAR: SfLevel = 0;
/// A figure passed the watch threshold.
pub const SF_LEVEL_WATCH: SfLevel = 1;
/// Park the mount now.
pub const SF_LEVEL_PARK_NOW: SfLevel = 2;
/// Close to tipping or sliding, or tilted near the limit; latched.
pub const SF_LEVEL_ALARM: SfLevel = 3;
/// A sensor fault: the guard cannot see; park and alarm.
pub const SF_LEVEL_SENSOR_FAULT: SfLevel = 4;

/// What drove a level change (`standfast::guard::AlertCause`).
pub type SfCause = u32;
/// Overturning utilisation at the present peak gust.
pub const SF_CAUSE_OVERTURNING: SfCause = 0;
/// Overturning utilisation predicted for the end of a park.
pub const SF_CAUSE_PREDICTED_OVERTURNING: SfCause = 1;
/// Sliding utilisation at the present peak gust.
pub const SF_CAUSE_SLIDING: SfCause = 2;
/// Drive torque utilisation of either axis.
pub const SF_CAUSE_DRIVE: SfCause = 3;
/// Tilt margin at or below its alarm margin.
pub const SF_CAUSE_TILT_MARGIN: SfCause = 4;
/// Slow tilt change (a sinking leg) at or above its watch rate.
pub const SF_CAUSE_TILT_DRIFT: SfCause = 5;
/// A fault of a sensor or another input, or no reading yet.
pub const SF_CAUSE_SENSOR_FAULT: SfCause = 6;
/// The physics could not be evaluated from the inputs.
pub const SF_CAUSE_EVALUATION_FAULT: SfCause = 7;
/// The figures stayed settled below every level left for the dwell time.
pub const SF_CAUSE_SETTLED: SfCause = 8;
/// The inputs stayed healthy for the fault clear time.
pub const SF_CAUSE_FAULT_CLEARED: SfCause = 9;
/// A step down right after an operator acknowledged the alarm.
pub const SF_CAUSE_ACKNOWLEDGED: SfCause = 10;

/// Which input a fault concerns (`standfast::sense::Sensor`).
pub type SfSensor = u32;
/// The 3-axis accelerometer used for ground tilt.
pub const SF_SENSOR_ACCEL: SfSensor = 0;
/// The anemometer's speed channel.
pub const SF_SENSOR_WIND_SPEED: SfSensor = 1;
/// The wind vane (direction channel).
pub const SF_SENSOR_WIND_DIRECTION: SfSensor = 2;
/// The mount pose reported by the mount controller.
pub const SF_SENSOR_POSE: SfSensor = 3;
/// The cover state reported by the observatory.
pub const SF_SENSOR_COVER: SfSensor = 4;
/// Measured air temperature and pressure.
pub const SF_SENSOR_AIR: SfSensor = 5;
/// The caller's time stamps.
pub const SF_SENSOR_CLOCK: SfSensor = 6;
/// The guard's physics model (see [`SF_FAULT_UNEVALUABLE`]).
pub const SF_SENSOR_MODEL: SfSensor = 7;

/// The class of a sensor fault (`standfast::sense::Fault` variant).
pub type SfFaultClass = u32;
/// A sample held NaN or an infinity.
pub const SF_FAULT_NOT_FINITE: SfFaultClass = 0;
/// A sample outside the physical range (`value`: the sample, m/s or rad).
pub const SF_FAULT_OUT_OF_RANGE: SfFaultClass = 1;
/// A sample's time stamp went backwards.
pub const SF_FAULT_TIME_REVERSED: SfFaultClass = 2;
/// No sample for longer than the stale time (`duration_ms`: silent time).
pub const SF_FAULT_STALE: SfFaultClass = 3;
/// One identical reading for too long (`duration_ms`: unchanged time).
pub const SF_FAULT_STUCK: SfFaultClass = 4;
/// Accelerometer magnitude out of band (`value`: g; `duration_ms`).
pub const SF_FAULT_MAGNITUDE_OUT_OF_BAND: SfFaultClass = 5;
/// A sudden tilt change (`value`: step, rad).
pub const SF_FAULT_TILT_STEP: SfFaultClass = 6;
/// Tilt beyond what the model accepts (`value`: tilt, rad).
pub const SF_FAULT_TILT_BEYOND_LIMIT: SfFaultClass = 7;
/// The sensor has not yet given a usable reading.
pub const SF_FAULT_NO_READING: SfFaultClass = 8;
/// The input names a part the rig does not have (a cover on a rig without
/// one); the input was dropped.
pub const SF_FAULT_NOT_IN_RIG: SfFaultClass = 9;
/// The physics could not compute a figure (`check` says which).
pub const SF_FAULT_UNEVALUABLE: SfFaultClass = 10;

/// A figure of the guard's evaluation (`standfast::sense::Check`), for
/// [`SF_FAULT_UNEVALUABLE`].
pub type SfCheck = u32;
/// The scan for the worst wind direction.
pub const SF_CHECK_WORST_DIRECTION: SfCheck = 0;
/// Overturning and sliding utilisation at the present gust, tip wind.
pub const SF_CHECK_OVERTURNING: SfCheck = 1;
/// Overturning utilisation at the gust predicted for the end of a park.
pub const SF_CHECK_PREDICTED_OVERTURNING: SfCheck = 2;
/// Drive torque utilisation of either axis.
pub const SF_CHECK_DRIVE: SfCheck = 3;
/// The extra tilt that would tip the rig.
pub const SF_CHECK_TILT_MARGIN: SfCheck = 4;
/// The rate of slow tilt change.
pub const SF_CHECK_TILT_DRIFT: SfCheck = 5;
/// The search for the safest park pose.
pub const SF_CHECK_PARK_POSE: SfCheck = 6;

/// The kind of an event (`standfast::guard::Event` variant).
pub type SfEventKind = u32;
/// The level changed (`from_level`, `to_level`, `cause`).
pub const SF_EVENT_LEVEL_CHANGED: SfEventKind = 0;
/// A sensor fault was raised (`fault`).
pub const SF_EVENT_FAULT_RAISED: SfEventKind = 1;
/// The highest overturning utilisation since start rose (`utilisation`).
pub const SF_EVENT_NEW_HIGH_UTILISATION: SfEventKind = 2;

/// The kind of a mount pose.
pub type SfPoseKind = u32;
/// Mechanical axis angles: `a_rad` primary, `b_rad` secondary.
pub const SF_POSE_AXES: SfPoseKind = 0;
/// `a_rad` hour angle (positive west), `b_rad` declination, and pier side.
pub const SF_POSE_EQUATORIAL: SfPoseKind = 1;
/// `a_rad` azimuth (from north, clockwise), `b_rad` altitude, and pier side.
pub const SF_POSE_HORIZONTAL: SfPoseKind = 2;

/// Pier side of an equatorial mount (ignored by alt-azimuth mounts).
pub type SfPierSide = u32;
/// θ₁ = H, θ₂ = δ: the usual side for targets west of the meridian.
pub const SF_PIER_TUBE_EAST: SfPierSide = 0;
/// θ₁ = H + π, θ₂ = π − δ: the usual side for targets east of the meridian.
pub const SF_PIER_TUBE_WEST: SfPierSide = 1;

/// The C code of a level.
#[must_use]
pub const fn level_code(s: AlertLevel) -> SfLevel {
    match s {
        AlertLevel::Clear => SF_LEVEL_CLEAR,
        AlertLevel::Watch => SF_LEVEL_WATCH,
        AlertLevel::ParkNow => SF_LEVEL_PARK_NOW,
        AlertLevel::Alarm => SF_LEVEL_ALARM,
        AlertLevel::SensorFault => SF_LEVEL_SENSOR_FAULT,
    }
}

/// The C code of a cause.
#[must_use]
pub const fn cause_code(c: AlertCause) -> SfCause {
    match c {
        AlertCause::Overturning => SF_CAUSE_OVERTURNING,
        AlertCause::PredictedOverturning => SF_CAUSE_PREDICTED_OVERTURNING,
        AlertCause::Sliding => SF_CAUSE_SLIDING,
        AlertCause::Drive => SF_CAUSE_DRIVE,
        AlertCause::TiltMargin => SF_CAUSE_TILT_MARGIN,
        AlertCause::TiltDrift => SF_CAUSE_TILT_DRIFT,
        AlertCause::SensorFault => SF_CAUSE_SENSOR_FAULT,
        AlertCause::EvaluationFault => SF_CAUSE_EVALUATION_FAULT,
        AlertCause::Settled => SF_CAUSE_SETTLED,
        AlertCause::FaultCleared => SF_CAUSE_FAULT_CLEARED,
        AlertCause::Acknowledged => SF_CAUSE_ACKNOWLEDGED,
    }
}

/// The C code of a sensor.
#[must_use]
pub const fn sensor_code(s: Sensor) -> SfSensor {
    match s {
        Sensor::Accelerometer => SF_SENSOR_ACCEL,
        Sensor::WindSpeed => SF_SENSOR_WIND_SPEED,
        Sensor::WindDirection => SF_SENSOR_WIND_DIRECTION,
        Sensor::MountPose => SF_SENSOR_POSE,
        Sensor::Cover => SF_SENSOR_COVER,
        Sensor::Air => SF_SENSOR_AIR,
        Sensor::Clock => SF_SENSOR_CLOCK,
        Sensor::Model => SF_SENSOR_MODEL,
    }
}

/// The C code of an evaluation check.
#[must_use]
pub const fn check_code(c: Check) -> SfCheck {
    match c {
        Check::WorstDirection => SF_CHECK_WORST_DIRECTION,
        Check::Overturning => SF_CHECK_OVERTURNING,
        Check::PredictedOverturning => SF_CHECK_PREDICTED_OVERTURNING,
        Check::Drive => SF_CHECK_DRIVE,
        Check::TiltMargin => SF_CHECK_TILT_MARGIN,
        Check::TiltDrift => SF_CHECK_TILT_DRIFT,
        Check::ParkPose => SF_CHECK_PARK_POSE,
    }
}

/// What a fault carries besides its sensor: its class code, the value (in
/// the unit its class states), the duration (ms) and the evaluation check,
/// each when the class carries it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FaultParts {
    /// The class.
    pub class: SfFaultClass,
    /// The value, in the unit the class states.
    pub value: Option<f32>,
    /// The duration, ms.
    pub duration_ms: Option<u64>,
    /// The figure that could not be computed.
    pub check: Option<SfCheck>,
}

const fn parts(class: SfFaultClass, value: Option<f32>, duration_ms: Option<u64>) -> FaultParts {
    FaultParts {
        class,
        value,
        duration_ms,
        check: None,
    }
}

/// The C parts of a fault.
#[must_use]
pub const fn fault_parts(f: &Fault) -> FaultParts {
    match *f {
        Fault::NotFinite { .. } => parts(SF_FAULT_NOT_FINITE, None, None),
        Fault::OutOfRange { value, .. } => parts(SF_FAULT_OUT_OF_RANGE, Some(value), None),
        Fault::TimeReversed { .. } => parts(SF_FAULT_TIME_REVERSED, None, None),
        Fault::Stale { silent_ms, .. } => parts(SF_FAULT_STALE, None, Some(silent_ms)),
        Fault::Stuck { unchanged_ms, .. } => parts(SF_FAULT_STUCK, None, Some(unchanged_ms)),
        Fault::MagnitudeOutOfBand {
            magnitude_g,
            for_ms,
        } => parts(
            SF_FAULT_MAGNITUDE_OUT_OF_BAND,
            Some(magnitude_g),
            Some(for_ms),
        ),
        Fault::TiltStep { step_rad } => parts(SF_FAULT_TILT_STEP, Some(step_rad), None),
        Fault::TiltBeyondLimit { magnitude_rad } => {
            parts(SF_FAULT_TILT_BEYOND_LIMIT, Some(magnitude_rad), None)
        }
        Fault::NoReading { .. } => parts(SF_FAULT_NO_READING, None, None),
        Fault::NotInRig { .. } => parts(SF_FAULT_NOT_IN_RIG, None, None),
        Fault::Unevaluable { check } => FaultParts {
            check: Some(check_code(check)),
            ..parts(SF_FAULT_UNEVALUABLE, None, None)
        },
    }
}

/// The C code of an event's kind.
#[must_use]
pub const fn event_kind(e: &Event) -> SfEventKind {
    match e {
        Event::LevelChanged { .. } => SF_EVENT_LEVEL_CHANGED,
        Event::FaultRaised(_) => SF_EVENT_FAULT_RAISED,
        Event::NewHighUtilisation { .. } => SF_EVENT_NEW_HIGH_UTILISATION,
    }
}

/// The C status of a core error kind.
#[must_use]
pub const fn error_code(k: ErrorKind) -> SfStatus {
    match k {
        ErrorKind::NotFinite => SF_ERR_NOT_FINITE,
        ErrorKind::OutOfRange => SF_ERR_OUT_OF_RANGE,
        ErrorKind::DuplicateFoot => SF_ERR_DUPLICATE_FOOT,
        ErrorKind::CollinearFeet => SF_ERR_COLLINEAR_FEET,
        ErrorKind::TooMany => SF_ERR_TOO_MANY,
        ErrorKind::TooFew => SF_ERR_TOO_FEW,
        ErrorKind::ZeroDirection => SF_ERR_ZERO_DIRECTION,
        ErrorKind::Unreachable => SF_ERR_UNREACHABLE,
        ErrorKind::Inconsistent => SF_ERR_INCONSISTENT,
    }
}

/// Returned by the name functions for a code outside the set.
pub const UNKNOWN: &CStr = c"unknown";

/// Names of [`SfLevel`] codes, by value (the core's `AlertLevel::name`).
pub(crate) const LEVEL_NAMES: [&CStr; 5] =
    [c"clear", c"watch", c"park_now", c"alarm", c"sensor_fault"];
/// Names of [`SfCause`] codes, by value.
pub(crate) const CAUSE_NAMES: [&CStr; 11] = [
    c"overturning",
    c"predicted_overturning",
    c"sliding",
    c"drive",
    c"tilt_margin",
    c"tilt_drift",
    c"sensor_fault",
    c"evaluation_fault",
    c"settled",
    c"fault_cleared",
    c"acknowledged",
];
/// Names of [`SfSensor`] codes, by value (the core's `Sensor::code`).
pub(crate) const SENSOR_NAMES: [&CStr; 8] = [
    c"accel",
    c"wind_speed",
    c"wind_direction",
    c"pose",
    c"cover",
    c"air",
    c"clock",
    c"model",
];
/// Names of [`SfFaultClass`] codes, by value (the core's `Fault::class_code`).
pub(crate) const FAULT_CLASS_NAMES: [&CStr; 11] = [
    c"not_finite",
    c"out_of_range",
    c"time_reversed",
    c"stale",
    c"stuck",
    c"magnitude_out_of_band",
    c"tilt_step",
    c"tilt_beyond_limit",
    c"no_reading",
    c"not_in_rig",
    c"unevaluable",
];
/// Names of [`SfCheck`] codes, by value (the core's `Check::code`).
pub(crate) const CHECK_NAMES: [&CStr; 7] = [
    c"worst_direction",
    c"overturning",
    c"predicted_overturning",
    c"drive",
    c"tilt_margin",
    c"tilt_drift",
    c"park_pose",
];
/// Names of [`SfEventKind`] codes, by value.
pub(crate) const EVENT_KIND_NAMES: [&CStr; 3] =
    [c"level_changed", c"fault_raised", c"new_high_utilisation"];
/// Names of [`SfStatus`] codes, by value.
pub(crate) const STATUS_NAMES: [&CStr; 21] = [
    c"ok",
    c"null_pointer",
    c"misaligned",
    c"storage_too_small",
    c"bad_handle",
    c"image_truncated",
    c"image_magic",
    c"image_version",
    c"image_size",
    c"image_checksum",
    c"image_payload",
    c"not_finite",
    c"out_of_range",
    c"duplicate_foot",
    c"collinear_feet",
    c"too_many",
    c"too_few",
    c"zero_direction",
    c"unreachable",
    c"no_memory",
    c"inconsistent",
];

/// The name of `code` in `table`, or [`UNKNOWN`].
#[must_use]
pub fn name_in(table: &[&'static CStr], code: u32) -> &'static CStr {
    usize::try_from(code)
        .ok()
        .and_then(|i| table.get(i).copied())
        .unwrap_or(UNKNOWN)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn s(c: &CStr) -> &str {
        c.to_str().unwrap()
    }

    /// Every name is the core's own (`name()`/`code()`), so the C names can
    /// never drift from what host-sim and the firmware print.
    #[test]
    fn names_match_the_core() {
        for st in [
            AlertLevel::Clear,
            AlertLevel::Watch,
            AlertLevel::ParkNow,
            AlertLevel::Alarm,
            AlertLevel::SensorFault,
        ] {
            assert_eq!(s(name_in(&LEVEL_NAMES, level_code(st))), st.name());
        }
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
        for se in sensors {
            assert_eq!(s(name_in(&SENSOR_NAMES, sensor_code(se))), se.code());
        }
        assert_eq!(SENSOR_NAMES.len(), sensors.len());
        let checks = [
            Check::WorstDirection,
            Check::Overturning,
            Check::PredictedOverturning,
            Check::Drive,
            Check::TiltMargin,
            Check::TiltDrift,
            Check::ParkPose,
        ];
        for c in checks {
            assert_eq!(s(name_in(&CHECK_NAMES, check_code(c))), c.code());
        }
        assert_eq!(CHECK_NAMES.len(), checks.len());
        let w = Sensor::WindSpeed;
        let faults = [
            Fault::NotFinite { sensor: w },
            Fault::OutOfRange {
                sensor: w,
                value: 1.0,
            },
            Fault::TimeReversed { sensor: w },
            Fault::Stale {
                sensor: w,
                silent_ms: 1,
            },
            Fault::Stuck {
                sensor: w,
                unchanged_ms: 1,
            },
            Fault::MagnitudeOutOfBand {
                magnitude_g: 1.0,
                for_ms: 1,
            },
            Fault::TiltStep { step_rad: 0.1 },
            Fault::TiltBeyondLimit { magnitude_rad: 1.0 },
            Fault::NoReading { sensor: w },
            Fault::NotInRig {
                sensor: Sensor::Cover,
            },
            Fault::Unevaluable {
                check: Check::Drive,
            },
        ];
        for f in faults {
            let p = fault_parts(&f);
            assert_eq!(s(name_in(&FAULT_CLASS_NAMES, p.class)), f.class_code());
        }
        assert_eq!(FAULT_CLASS_NAMES.len(), faults.len());
        let causes = [
            AlertCause::Overturning,
            AlertCause::PredictedOverturning,
            AlertCause::Sliding,
            AlertCause::Drive,
            AlertCause::TiltMargin,
            AlertCause::TiltDrift,
            AlertCause::SensorFault,
            AlertCause::EvaluationFault,
            AlertCause::Settled,
            AlertCause::FaultCleared,
            AlertCause::Acknowledged,
        ];
        for c in causes {
            assert_eq!(s(name_in(&CAUSE_NAMES, cause_code(c))), c.name());
        }
        assert_eq!(CAUSE_NAMES.len(), causes.len());
        assert_eq!(s(name_in(&STATUS_NAMES, SF_ERR_NO_MEMORY)), "no_memory");
        assert_eq!(
            s(name_in(&STATUS_NAMES, SF_ERR_INCONSISTENT)),
            "inconsistent"
        );
        assert_eq!(s(name_in(&LEVEL_NAMES, 99)), "unknown");
    }
}
