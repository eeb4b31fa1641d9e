//! The `repr(C)` types of the C ABI. Flags are `uint8_t` 0 or 1 (any other
//! value in an input is refused with [`crate::SF_ERR_OUT_OF_RANGE`]);
//! enumerations are `uint32_t` codes ([`crate::codes`]); figures that may be
//! absent come with a has-value flag and hold NaN when absent.
//!
//! Frames and units as in the core: rig frame x east, y north, z up;
//! azimuths and wind directions in radians from north, clockwise, the wind
//! direction being where it blows **from**; SI units, named in each field.

use crate::codes::{
    SfCause, SfCheck, SfEventKind, SfFaultClass, SfLevel, SfPierSide, SfPoseKind, SfSensor,
    SfStatus,
};

/// Bytes of [`SfError::field`], terminating NUL included.
pub const SF_FIELD_BYTES: usize = 64;
/// Most faults in a verdict (the core's `FAULT_SET_CAPACITY`).
pub const SF_MAX_FAULTS: usize = 8;
/// Most events in a verdict (the core's `guard::MAX_EVENTS`).
pub const SF_MAX_EVENTS: usize = 8;
/// Most wind directions of a static assessment.
pub const SF_MAX_DIRECTIONS: usize = 72;

/// An error: a status code, the field it concerns, the offending value and
/// the accepted range. Nothing in it is to be freed.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfError {
    /// The status ([`crate::SF_OK`] when there is no error).
    pub code: SfStatus,
    /// The field as a NUL-terminated dotted path in the names of the core's
    /// types (for example `guard.dwell_s`, `bodies.mass_kg`, `inputs.has_wind`);
    /// empty when the error concerns no field. Truncated to fit.
    pub field: [u8; SF_FIELD_BYTES],
    /// 1 when [`SfError::index`] applies (the field is a list).
    pub has_index: u8,
    /// Index within a list field, 0-based.
    pub index: u8,
    /// The offending value, NaN when there is no single value.
    pub value: f32,
    /// Smallest accepted value or count, NaN when not applicable.
    pub min: f32,
    /// Largest accepted value or count, NaN when not applicable.
    pub max: f32,
}

/// A figure that may be absent.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfMaybeF32 {
    /// 1 when [`SfMaybeF32::value`] holds a figure, 0 when absent.
    pub has_value: u8,
    /// The figure in the unit its field names; NaN when absent.
    pub value: f32,
}

/// A mount pose.
///
/// | `kind` | `a_rad` | `b_rad` |
/// |---|---|---|
/// | [`crate::SF_POSE_AXES`] | primary-axis angle θ₁ | secondary-axis angle θ₂ |
/// | [`crate::SF_POSE_EQUATORIAL`] | hour angle, positive west | declination, −π/2 to π/2 |
/// | [`crate::SF_POSE_HORIZONTAL`] | azimuth of the tube, from north clockwise | altitude, −π/2 to π/2 |
///
/// Axis angles as defined in the core's `mount` module docs.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfPose {
    /// What the angles are ([`SfPoseKind`]).
    pub kind: SfPoseKind,
    /// First angle, radians (see the table).
    pub a_rad: f32,
    /// Second angle, radians (see the table).
    pub b_rad: f32,
    /// Pier side for the equatorial and horizontal kinds ([`SfPierSide`]);
    /// ignored for axis angles.
    pub pier_side: SfPierSide,
}

/// The samples that arrived since the last step. Every group is optional.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfInputs {
    /// 1 when [`SfInputs::accel`] holds a sample.
    pub has_accel: u8,
    /// Raw accelerometer sample on the sensor's x, y, z axes, in counts or g
    /// as the rig image's accelerometer scale says (1.0: g); the image's
    /// mounting rotates it into the rig frame.
    pub accel: [f32; 3],
    /// 1 when [`SfInputs::wind_speed_mps`] holds a sample.
    pub has_wind: u8,
    /// Wind speed at the anemometer, m/s.
    pub wind_speed_mps: f32,
    /// 1 when [`SfInputs::wind_from_rad`] holds the direction (only read with
    /// `has_wind`).
    pub has_wind_from: u8,
    /// Direction the wind blows from, radians from north, clockwise.
    pub wind_from_rad: f32,
    /// 1 when [`SfInputs::pose`] holds the mount's reported pose.
    pub has_pose: u8,
    /// The mount pose as reported by the mount controller.
    pub pose: SfPose,
    /// 1 when [`SfInputs::cover_fitted`] reports the cover.
    pub has_cover: u8,
    /// 1 when the cover is fitted, 0 when removed.
    pub cover_fitted: u8,
    /// 1 when the air fields hold a measurement.
    pub has_air: u8,
    /// Air temperature, K (kelvin).
    pub air_temperature_k: f32,
    /// Station pressure, Pa.
    pub air_pressure_pa: f32,
}

/// A sensor fault.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfFault {
    /// The sensor ([`SfSensor`]).
    pub sensor: SfSensor,
    /// The class ([`SfFaultClass`]).
    pub fault_class: SfFaultClass,
    /// 1 when the class carries [`SfFault::value`].
    pub has_value: u8,
    /// The value the class carries, in its unit: the rejected sample (m/s or
    /// rad) for out-of-range, the magnitude in g for magnitude-out-of-band,
    /// radians for tilt step and tilt beyond limit; NaN otherwise.
    pub value: f32,
    /// 1 when the class carries [`SfFault::duration_ms`].
    pub has_duration: u8,
    /// Milliseconds silent (stale), unchanged (stuck) or out of band; 0 when
    /// not carried.
    pub duration_ms: u64,
    /// 1 when the class carries [`SfFault::check`] (unevaluable).
    pub has_check: u8,
    /// The figure that could not be computed ([`SfCheck`]); 0 when not carried.
    pub check: SfCheck,
}

/// Something worth logging that happened in a step.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfEvent {
    /// The kind ([`SfEventKind`]); the fields below it names are set.
    pub kind: SfEventKind,
    /// Level changed: the previous level ([`SfLevel`]).
    pub from_level: SfLevel,
    /// Level changed: the new level.
    pub to_level: SfLevel,
    /// Level changed: why ([`SfCause`]).
    pub cause: SfCause,
    /// Fault raised: the fault.
    pub fault: SfFault,
    /// New high utilisation: the overturning utilisation (1.0 tips); NaN for
    /// other kinds.
    pub utilisation: f32,
}

/// The guard's answer for one step.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfVerdict {
    /// Time stamp of the step, ms (the caller's clock).
    pub now_ms: u64,
    /// The level ([`SfLevel`]).
    pub level: SfLevel,
    /// 1 when the park request should be asserted (`park_now` and above).
    pub park: u8,
    /// 1 when the alarm should be asserted (`alarm`, `sensor_fault`).
    pub alarm: u8,
    /// Overturning utilisation at the peak gust now (1.0 tips).
    pub overturning_utilisation: SfMaybeF32,
    /// Overturning utilisation predicted for the end of a park.
    pub predicted_utilisation: SfMaybeF32,
    /// Sliding utilisation at the peak gust now (1.0 slides).
    pub sliding_utilisation: SfMaybeF32,
    /// Governing drive utilisation of the primary axis at the peak gust
    /// (absent without drive ratings).
    pub drive_primary_utilisation: SfMaybeF32,
    /// Governing drive utilisation of the secondary axis.
    pub drive_secondary_utilisation: SfMaybeF32,
    /// Wind speed that would tip the rig in the present pose from the
    /// present (or worst) direction, m/s.
    pub tip_wind_mps: SfMaybeF32,
    /// The gust the figures are computed for, m/s at rig height.
    pub gust_mps: SfMaybeF32,
    /// The gust predicted for the end of a park, m/s at rig height.
    pub predicted_gust_mps: SfMaybeF32,
    /// Wind direction used, rad from north clockwise (from; the worst one
    /// when the measured direction is not defined).
    pub wind_from_rad: SfMaybeF32,
    /// 1 when this step evaluated the physics (fresh figures), 0 when the
    /// figures come from an earlier step.
    pub evaluated: u8,
    /// 1 when the tilt fields hold the present ground tilt.
    pub has_tilt: u8,
    /// Ground tilt magnitude, radians.
    pub tilt_magnitude_rad: f32,
    /// Downhill azimuth of the tilt, radians from north clockwise.
    pub tilt_downhill_azimuth_rad: f32,
    /// Extra tilt that would tip the rig with no wind, radians.
    pub tilt_margin_rad: SfMaybeF32,
    /// Rate of slow tilt change (a sinking leg), rad/s, any direction, not
    /// negative.
    pub tilt_drift_rad_per_s: f32,
    /// The pose the figures are for.
    pub pose: SfPose,
    /// 1 when [`SfVerdict::park_pose`] holds the safest park pose (only
    /// with a park request).
    pub has_park_pose: u8,
    /// The safest park pose for the present wind.
    pub park_pose: SfPose,
    /// Number of active faults in [`SfVerdict::faults`].
    pub fault_count: u32,
    /// 1 when more faults were active than the list holds (still unsafe).
    pub faults_overflowed: u8,
    /// Active sensor faults, the first `fault_count`.
    pub faults: [SfFault; SF_MAX_FAULTS],
    /// Number of events in [`SfVerdict::events`].
    pub event_count: u32,
    /// Events of this step that did not fit in [`SfVerdict::events`] (the
    /// newest are the ones lost); 0 normally.
    pub events_lost: u32,
    /// Events of this step, the first `event_count`, in order.
    pub events: [SfEvent; SF_MAX_EVENTS],
}

/// What a static assessment is asked for.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfAssessRequest {
    /// 1 to assess [`SfAssessRequest::pose`]; 0 for the mount's home pose.
    pub has_pose: u8,
    /// The pose.
    pub pose: SfPose,
    /// 1 with the cover fitted, 0 without.
    pub cover_fitted: u8,
    /// Ground tilt magnitude, radians (0 for level).
    pub tilt_magnitude_rad: f32,
    /// Downhill azimuth of the tilt, radians from north clockwise.
    pub tilt_downhill_azimuth_rad: f32,
    /// Number of evenly spaced wind directions, from north (0 rad) clockwise,
    /// 1 to [`SF_MAX_DIRECTIONS`].
    pub directions: u32,
    /// Design wind speed (a gust) for the ballast figure, m/s at rig height
    /// (0 to 100).
    pub design_speed_mps: f32,
    /// Utilisation the ballast must bring every edge down to (0.1 to 1.0).
    pub target_utilisation: f32,
    /// Where the ballast hangs, rig frame, metres (inside the feet).
    pub ballast_position_m: [f32; 3],
}

/// A static assessment, in the site's air from the rig image.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SfAssessment {
    /// Number of directions filled in [`SfAssessment::tip_wind_mps`].
    pub directions: u32,
    /// Tip wind speed for wind from direction `i × 2π / directions`, m/s
    /// (absent when no wind tips the rig from there).
    pub tip_wind_mps: [SfMaybeF32; SF_MAX_DIRECTIONS],
    /// The lowest tip wind over all directions (a finer scan than the list),
    /// m/s.
    pub lowest_tip_wind_mps: SfMaybeF32,
    /// Direction the lowest tip wind blows from, rad from north clockwise.
    pub lowest_from_rad: f32,
    /// Ballast mass needed at the position for the design gust, kg (0: none).
    pub ballast_kg: f32,
    /// Wind direction that governs the ballast, rad from north clockwise.
    pub ballast_worst_from_rad: f32,
}
