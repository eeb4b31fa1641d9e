//! Typed errors. Every error names the offending field, the value and the
//! accepted range, so a host can turn it into a message a person can act on.

use core::fmt;

/// What is wrong with a value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ErrorKind {
    /// The value is NaN or infinite.
    NotFinite,
    /// The value lies outside `[min, max]` (see [`Error::min`], [`Error::max`]).
    OutOfRange,
    /// Two feet are closer than 1 mm.
    DuplicateFoot,
    /// All feet lie on (or within 1 mm of) one line: no support area.
    CollinearFeet,
    /// More items than the fixed capacity allows (see [`Error::max`]).
    TooMany,
    /// Fewer items than needed (see [`Error::min`]).
    TooFew,
    /// A direction vector has zero length.
    ZeroDirection,
    /// A requested quantity cannot be reached (for example ballast placed
    /// outside the support polygon can never stabilise the rig).
    Unreachable,
    /// Measurements disagree with each other or with the geometry beyond
    /// their uncertainty (for example scale readings after a lift that do not
    /// fit the feet lifted).
    Inconsistent,
}

/// Which field an [`Error`] is about: one variant per checked field of the
/// crate's inputs, with its dotted path ([`Field::path`], whose scheme it
/// documents) and its unit as data ([`Field::unit`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum Field {
    /// `air.density_kg_per_m3`.
    AirDensityKgPerM3,
    /// `air.pressure_pa`.
    AirPressurePa,
    /// `air.temperature_k`.
    AirTemperatureK,
    /// `rig.ballast`.
    Ballast,
    /// `ballast.mass_kg`.
    BallastMassKg,
    /// `ballast.position_m`.
    BallastPositionM,
    /// `rig.bodies`.
    Bodies,
    /// `bodies.cg_m`.
    BodiesCgM,
    /// `bodies.mass_kg`.
    BodiesMassKg,
    /// `bolt_circle.count`.
    BoltCircleCount,
    /// `bolt_circle.moment_nm`.
    BoltCircleMomentNm,
    /// `bolt_circle.radius_mm`.
    BoltCircleRadiusMm,
    /// `bolt_pattern.count`.
    BoltPatternCount,
    /// `bolt_pattern.phase_rad`.
    BoltPatternPhaseRad,
    /// `bolt_pattern.pivot.offset_mm`.
    BoltPatternPivotOffsetMm,
    /// `bolt_pattern.radius_mm`.
    BoltPatternRadiusMm,
    /// `bolt_pattern.screws_mm`.
    BoltPatternScrewsMm,
    /// `conditions.air.density_kg_per_m3`.
    ConditionsAirDensityKgPerM3,
    /// `conditions.tilt.downhill_azimuth_rad`.
    ConditionsTiltDownhillAzimuthRad,
    /// `conditions.tilt.magnitude_rad`.
    ConditionsTiltMagnitudeRad,
    /// `conditions.wind_from_rad`.
    ConditionsWindFromRad,
    /// `conditions.wind_speed_mps`.
    ConditionsWindSpeedMps,
    /// `rig.counterweights`.
    Counterweights,
    /// `counterweights.diameter_m`.
    CounterweightsDiameterM,
    /// `counterweights.distance_m`.
    CounterweightsDistanceM,
    /// `counterweights.drag_coefficient`.
    CounterweightsDragCoefficient,
    /// `counterweights.mass_kg`.
    CounterweightsMassKg,
    /// `counterweights.thickness_m`.
    CounterweightsThicknessM,
    /// `rig.cover`.
    Cover,
    /// `cover.centre_m`.
    CoverCentreM,
    /// `cover.mass_kg`.
    CoverMassKg,
    /// `ballast_sizing.design_speed_mps`.
    DesignSpeedMps,
    /// `rig.drives`.
    Drives,
    /// `drives.primary`.
    DrivesPrimary,
    /// `drives.secondary`.
    DrivesSecondary,
    /// `drives.slew_acceleration_rad_per_s2`.
    DrivesSlewAccelerationRadPerS2,
    /// `exposure.axis`.
    ExposureAxis,
    /// `exposure.centre_m`.
    ExposureCentreM,
    /// `exposure.diameter_m`.
    ExposureDiameterM,
    /// `exposure.drag_coefficient`.
    ExposureDragCoefficient,
    /// `exposure.edges`.
    ExposureEdges,
    /// `exposure.end_drag_coefficient`.
    ExposureEndDragCoefficient,
    /// `exposure.length_m`.
    ExposureLengthM,
    /// `exposure.size_m`.
    ExposureSizeM,
    /// `rig.friction_coefficient`.
    FrictionCoefficient,
    /// `guard.alarm_utilisation`.
    GuardAlarmUtilisation,
    /// `guard.clear_ratio`.
    GuardClearRatio,
    /// `guard.drift_watch_rad_per_s`.
    GuardDriftWatchRadPerS,
    /// `guard.drive_park_utilisation`.
    GuardDriveParkUtilisation,
    /// `guard.dwell_s`.
    GuardDwellS,
    /// `guard.evaluate_every_s`.
    GuardEvaluateEveryS,
    /// `guard.fault_clear_s`.
    GuardFaultClearS,
    /// `guard.gust_allowance`.
    GuardGustAllowance,
    /// `guard.park_utilisation`.
    GuardParkUtilisation,
    /// `guard.tilt_margin_alarm_rad`.
    GuardTiltMarginAlarmRad,
    /// `guard.time_to_park_s`.
    GuardTimeToParkS,
    /// `guard.watch_utilisation`.
    GuardWatchUtilisation,
    /// `joint.centre_m`.
    JointCentreM,
    /// `joint.dynamic_pressure_pa`.
    JointDynamicPressurePa,
    /// `joint.height_m`.
    JointHeightM,
    /// `joint.wind_from_rad`.
    JointWindFromRad,
    /// `joint_load.axial_n`.
    JointLoadAxialN,
    /// `joint_load.moment_x_nm`.
    JointLoadMomentXNm,
    /// `joint_load.moment_y_nm`.
    JointLoadMomentYNm,
    /// `rig.legs`.
    Legs,
    /// `legs.diameter_m`.
    LegsDiameterM,
    /// `legs.mass_kg`.
    LegsMassKg,
    /// `legs.top_height_m`.
    LegsTopHeightM,
    /// `legs.top_radius_m`.
    LegsTopRadiusM,
    /// `material.ultimate_mpa`.
    MaterialUltimateMpa,
    /// `material.yield_mpa`.
    MaterialYieldMpa,
    /// `axis_loads.mean_wind_mps`.
    MeanWindMps,
    /// `rig.measured`.
    Measured,
    /// `measured.centre_m`.
    MeasuredCentreM,
    /// `measured.mass_kg`.
    MeasuredMassKg,
    /// `mount.axis_origin_m`.
    MountAxisOriginM,
    /// `mount.latitude_rad`.
    MountLatitudeRad,
    /// `guard.tilt.mounting.axes`.
    MountingAxes,
    /// `guard.tilt.mounting.sensor_to_rig`.
    MountingSensorToRig,
    /// `park.wind_from_rad`.
    ParkWindFromRad,
    /// `park.wind_speed_mps`.
    ParkWindSpeedMps,
    /// `payload.pick`.
    Payload,
    /// `payload.body`.
    PayloadBody,
    /// `payload_envelope.offsets`.
    PayloadEnvelopeOffsets,
    /// `pose.altitude_rad`.
    PoseAltitudeRad,
    /// `pose.azimuth_rad`.
    PoseAzimuthRad,
    /// `pose.declination_rad`.
    PoseDeclinationRad,
    /// `pose.hour_angle_rad`.
    PoseHourAngleRad,
    /// `pose.primary_rad`.
    PosePrimaryRad,
    /// `pose.secondary_rad`.
    PoseSecondaryRad,
    /// `rig.mass_kg`.
    RigMassKg,
    /// `rig.shaft`.
    Shaft,
    /// `shaft.bore_mm`.
    ShaftBoreMm,
    /// `shaft.diameter_m`.
    ShaftDiameterM,
    /// `shaft.diameter_mm`.
    ShaftDiameterMm,
    /// `shaft.length_m`.
    ShaftLengthM,
    /// `shaft.mass_kg`.
    ShaftMassKg,
    /// `shaft.moment_nm`.
    ShaftMomentNm,
    /// `shaft.outer_mm`.
    ShaftOuterMm,
    /// `shaft.safety_factor`.
    ShaftSafetyFactor,
    /// `shaft_load.angle_from_vertical_rad`.
    ShaftLoadAngleFromVerticalRad,
    /// `shaft_load.lever_arm_m`.
    ShaftLoadLeverArmM,
    /// `shaft_load.mass_kg`.
    ShaftLoadMassKg,
    /// `site.elevation_m`.
    SiteElevationM,
    /// `sky_grid.poses`.
    SkyGrid,
    /// `sky_grid.horizon_limit_rad`.
    SkyGridHorizonLimitRad,
    /// `sky_grid.primary_steps`.
    SkyGridPrimarySteps,
    /// `sky_grid.secondary_steps`.
    SkyGridSecondarySteps,
    /// `sky_scan.wind_directions`.
    SkyScanWindDirections,
    /// `sky_scan.wind_speed_mps`.
    SkyScanWindSpeedMps,
    /// `strip.engagement_mm`.
    StripEngagementMm,
    /// `strip.load_n`.
    StripLoadN,
    /// `strip.safety_factor`.
    StripSafetyFactor,
    /// `strip.shear_factor`.
    StripShearFactor,
    /// `strip.shear_strength_mpa`.
    StripShearStrengthMpa,
    /// `strip.tensile_area_mm2`.
    StripTensileAreaMm2,
    /// `support.feet`.
    SupportFeet,
    /// `support.feet.position_m`.
    SupportFeetPositionM,
    /// `support.feet.tie_down_n`.
    SupportFeetTieDownN,
    /// `support.first_leg_azimuth_rad`.
    SupportFirstLegAzimuthRad,
    /// `support.foot_circle_radius_m`.
    SupportFootCircleRadiusM,
    /// `support.leg_spread_m`.
    SupportLegSpreadM,
    /// `support.plate.size_m`.
    SupportPlateSizeM,
    /// `ballast_sizing.target_utilisation`.
    TargetUtilisation,
    /// `thread.name`.
    ThreadName,
    /// `thread.name.pitch_mm`.
    ThreadNamePitchMm,
    /// `thread.nominal_mm`.
    ThreadNominalMm,
    /// `thread_limits.ext_major_min_mm`.
    ThreadLimitsExtMajorMinMm,
    /// `thread_limits.ext_pitch_min_mm`.
    ThreadLimitsExtPitchMinMm,
    /// `thread_limits.int_minor_max_mm`.
    ThreadLimitsIntMinorMaxMm,
    /// `thread_limits.int_pitch_max_mm`.
    ThreadLimitsIntPitchMaxMm,
    /// `thread_limits.pitch_mm`.
    ThreadLimitsPitchMm,
    /// `guard.tilt.band_max_g`.
    TiltBandMaxG,
    /// `guard.tilt.band_min_g`.
    TiltBandMinG,
    /// `tilt.downhill_azimuth_rad`.
    TiltDownhillAzimuthRad,
    /// `guard.tilt.drift_tau_s`.
    TiltDriftTauS,
    /// `guard.tilt.filter_tau_s`.
    TiltFilterTauS,
    /// `tilt.gravity`.
    TiltGravity,
    /// `guard.tilt.level_capture_s`.
    TiltLevelCaptureS,
    /// `tilt_sensor.level_reference`.
    TiltLevelReference,
    /// `tilt_sensor.level_reference.z`.
    TiltLevelReferenceZ,
    /// `tilt.magnitude_rad`.
    TiltMagnitudeRad,
    /// `guard.tilt.out_of_band_limit_s`.
    TiltOutOfBandLimitS,
    /// `guard.tilt.scale_g_per_count`.
    TiltScaleGPerCount,
    /// `tilt_sensor.specific_force`.
    TiltSpecificForce,
    /// `guard.tilt.stale_after_s`.
    TiltStaleAfterS,
    /// `guard.tilt.step_limit_rad`.
    TiltStepLimitRad,
    /// `guard.tilt.step_tau_s`.
    TiltStepTauS,
    /// `guard.tilt.stuck_after_s`.
    TiltStuckAfterS,
    /// `weighing.height_m`.
    WeighingHeightM,
    /// `weighing.level_n`.
    WeighingLevelN,
    /// `weighing.lift.angle_rad`.
    WeighingLiftAngleRad,
    /// `weighing.lift.angle_uncertainty_rad`.
    WeighingLiftAngleUncertaintyRad,
    /// `weighing.lift.height_m`.
    WeighingLiftHeightM,
    /// `weighing.lift.height_uncertainty_m`.
    WeighingLiftHeightUncertaintyM,
    /// `weighing.lift.lifted_feet`.
    WeighingLiftLiftedFeet,
    /// `weighing.lift.lifted_mask`.
    WeighingLiftLiftedMask,
    /// `weighing.lift.loads_n`.
    WeighingLiftLoadsN,
    /// `weighing.lift.raised_toward_rad`.
    WeighingLiftRaisedTowardRad,
    /// `weighing.lift.resting_feet`.
    WeighingLiftRestingFeet,
    /// `weighing.reading_uncertainty_n`.
    WeighingReadingUncertaintyN,
    /// `weighing.tip.angle_rad`.
    WeighingTipAngleRad,
    /// `weighing.tip.angle_uncertainty_rad`.
    WeighingTipAngleUncertaintyRad,
    /// `weighing.tip.edge_feet`.
    WeighingTipEdgeFeet,
    /// `guard.wind.calm_below_mps`.
    WindCalmBelowMps,
    /// `guard.wind.direction_window_s`.
    WindDirectionWindowS,
    /// `guard.wind.max_speed_mps`.
    WindMaxSpeedMps,
    /// `guard.wind.mean_gust_factor`.
    WindMeanGustFactor,
    /// `guard.wind.peak_window_s`.
    WindPeakWindowS,
    /// `guard.wind.stale_after_s`.
    WindStaleAfterS,
    /// `guard.wind.stuck_after_s`.
    WindStuckAfterS,
    /// `guard.wind.variable_spread_rad`.
    WindVariableSpreadRad,
    /// `guard.wind.z_from_m`.
    WindZFromM,
    /// `guard.wind.z_to_m`.
    WindZToM,
    /// `axis_terms.wind_from_rad`.
    WindFromRad,
    /// A field of the integrating program's own inputs, checked with this
    /// crate's [`Error`] (the crate itself never returns it): its dotted path
    /// and unit.
    External {
        /// Dotted path of the field in the program's own terms.
        path: &'static str,
        /// Unit of the value and of the accepted range.
        unit: Unit,
    },
}

impl Field {
    /// Every field of the crate's own inputs, in the order of the variants.
    pub const ALL: [Field; 175] = [
        Field::AirDensityKgPerM3,
        Field::AirPressurePa,
        Field::AirTemperatureK,
        Field::Ballast,
        Field::BallastMassKg,
        Field::BallastPositionM,
        Field::Bodies,
        Field::BodiesCgM,
        Field::BodiesMassKg,
        Field::BoltCircleCount,
        Field::BoltCircleMomentNm,
        Field::BoltCircleRadiusMm,
        Field::BoltPatternCount,
        Field::BoltPatternPhaseRad,
        Field::BoltPatternPivotOffsetMm,
        Field::BoltPatternRadiusMm,
        Field::BoltPatternScrewsMm,
        Field::ConditionsAirDensityKgPerM3,
        Field::ConditionsTiltDownhillAzimuthRad,
        Field::ConditionsTiltMagnitudeRad,
        Field::ConditionsWindFromRad,
        Field::ConditionsWindSpeedMps,
        Field::Counterweights,
        Field::CounterweightsDiameterM,
        Field::CounterweightsDistanceM,
        Field::CounterweightsDragCoefficient,
        Field::CounterweightsMassKg,
        Field::CounterweightsThicknessM,
        Field::Cover,
        Field::CoverCentreM,
        Field::CoverMassKg,
        Field::DesignSpeedMps,
        Field::Drives,
        Field::DrivesPrimary,
        Field::DrivesSecondary,
        Field::DrivesSlewAccelerationRadPerS2,
        Field::ExposureAxis,
        Field::ExposureCentreM,
        Field::ExposureDiameterM,
        Field::ExposureDragCoefficient,
        Field::ExposureEdges,
        Field::ExposureEndDragCoefficient,
        Field::ExposureLengthM,
        Field::ExposureSizeM,
        Field::FrictionCoefficient,
        Field::GuardAlarmUtilisation,
        Field::GuardClearRatio,
        Field::GuardDriftWatchRadPerS,
        Field::GuardDriveParkUtilisation,
        Field::GuardDwellS,
        Field::GuardEvaluateEveryS,
        Field::GuardFaultClearS,
        Field::GuardGustAllowance,
        Field::GuardParkUtilisation,
        Field::GuardTiltMarginAlarmRad,
        Field::GuardTimeToParkS,
        Field::GuardWatchUtilisation,
        Field::JointCentreM,
        Field::JointDynamicPressurePa,
        Field::JointHeightM,
        Field::JointWindFromRad,
        Field::JointLoadAxialN,
        Field::JointLoadMomentXNm,
        Field::JointLoadMomentYNm,
        Field::Legs,
        Field::LegsDiameterM,
        Field::LegsMassKg,
        Field::LegsTopHeightM,
        Field::LegsTopRadiusM,
        Field::MaterialUltimateMpa,
        Field::MaterialYieldMpa,
        Field::MeanWindMps,
        Field::Measured,
        Field::MeasuredCentreM,
        Field::MeasuredMassKg,
        Field::MountAxisOriginM,
        Field::MountLatitudeRad,
        Field::MountingAxes,
        Field::MountingSensorToRig,
        Field::ParkWindFromRad,
        Field::ParkWindSpeedMps,
        Field::Payload,
        Field::PayloadBody,
        Field::PayloadEnvelopeOffsets,
        Field::PoseAltitudeRad,
        Field::PoseAzimuthRad,
        Field::PoseDeclinationRad,
        Field::PoseHourAngleRad,
        Field::PosePrimaryRad,
        Field::PoseSecondaryRad,
        Field::RigMassKg,
        Field::Shaft,
        Field::ShaftBoreMm,
        Field::ShaftDiameterM,
        Field::ShaftDiameterMm,
        Field::ShaftLengthM,
        Field::ShaftMassKg,
        Field::ShaftMomentNm,
        Field::ShaftOuterMm,
        Field::ShaftSafetyFactor,
        Field::ShaftLoadAngleFromVerticalRad,
        Field::ShaftLoadLeverArmM,
        Field::ShaftLoadMassKg,
        Field::SiteElevationM,
        Field::SkyGrid,
        Field::SkyGridHorizonLimitRad,
        Field::SkyGridPrimarySteps,
        Field::SkyGridSecondarySteps,
        Field::SkyScanWindDirections,
        Field::SkyScanWindSpeedMps,
        Field::StripEngagementMm,
        Field::StripLoadN,
        Field::StripSafetyFactor,
        Field::StripShearFactor,
        Field::StripShearStrengthMpa,
        Field::StripTensileAreaMm2,
        Field::SupportFeet,
        Field::SupportFeetPositionM,
        Field::SupportFeetTieDownN,
        Field::SupportFirstLegAzimuthRad,
        Field::SupportFootCircleRadiusM,
        Field::SupportLegSpreadM,
        Field::SupportPlateSizeM,
        Field::TargetUtilisation,
        Field::ThreadName,
        Field::ThreadNamePitchMm,
        Field::ThreadNominalMm,
        Field::ThreadLimitsExtMajorMinMm,
        Field::ThreadLimitsExtPitchMinMm,
        Field::ThreadLimitsIntMinorMaxMm,
        Field::ThreadLimitsIntPitchMaxMm,
        Field::ThreadLimitsPitchMm,
        Field::TiltBandMaxG,
        Field::TiltBandMinG,
        Field::TiltDownhillAzimuthRad,
        Field::TiltDriftTauS,
        Field::TiltFilterTauS,
        Field::TiltGravity,
        Field::TiltLevelCaptureS,
        Field::TiltLevelReference,
        Field::TiltLevelReferenceZ,
        Field::TiltMagnitudeRad,
        Field::TiltOutOfBandLimitS,
        Field::TiltScaleGPerCount,
        Field::TiltSpecificForce,
        Field::TiltStaleAfterS,
        Field::TiltStepLimitRad,
        Field::TiltStepTauS,
        Field::TiltStuckAfterS,
        Field::WeighingHeightM,
        Field::WeighingLevelN,
        Field::WeighingLiftAngleRad,
        Field::WeighingLiftAngleUncertaintyRad,
        Field::WeighingLiftHeightM,
        Field::WeighingLiftHeightUncertaintyM,
        Field::WeighingLiftLiftedFeet,
        Field::WeighingLiftLiftedMask,
        Field::WeighingLiftLoadsN,
        Field::WeighingLiftRaisedTowardRad,
        Field::WeighingLiftRestingFeet,
        Field::WeighingReadingUncertaintyN,
        Field::WeighingTipAngleRad,
        Field::WeighingTipAngleUncertaintyRad,
        Field::WeighingTipEdgeFeet,
        Field::WindCalmBelowMps,
        Field::WindDirectionWindowS,
        Field::WindMaxSpeedMps,
        Field::WindMeanGustFactor,
        Field::WindPeakWindowS,
        Field::WindStaleAfterS,
        Field::WindStuckAfterS,
        Field::WindVariableSpreadRad,
        Field::WindZFromM,
        Field::WindZToM,
        Field::WindFromRad,
    ];

    /// The dotted path of the field (for example `"support.feet.position_m"`),
    /// stable for hosts that map it to their own keys.
    ///
    /// **Scheme.** `holder.field`, or `holder.part.field` for a field of a
    /// part the holder contains: at least two segments of lower-case
    /// `snake_case`. The first segment names the value that holds the field,
    /// one name per kind of value, and the last is the field's own name, with
    /// its unit suffix when it has a unit (`_m`, `_rad`, `_kg_per_m3`, ...). A
    /// list or part as a whole is a field of its holder (`rig.ballast`, the
    /// rig's ballast list; `ballast.mass_kg`, one ballast's mass). The
    /// holders:
    ///
    /// | first segment | the value that holds the field |
    /// |---|---|
    /// | `rig` | the rig description as a whole ([`crate::rig::RigSpec`]) |
    /// | `ballast`, `bodies`, `counterweights`, `cover`, `drives`, `exposure`, `legs`, `measured`, `mount`, `shaft`, `support`, `site` | one part of the rig description (a body's wind `exposure`; the `measured` centre of gravity; the `site` of the air) |
    /// | `payload`, `payload_envelope`, `sky_grid`, `sky_scan`, `park` | a payload pick, an envelope, a sky grid, a sky scan, a park-pose search |
    /// | `conditions`, `pose`, `tilt`, `air` | conditions of an assessment, a mount pose, a ground tilt, the air |
    /// | `guard` | the guard's configuration, with `guard.wind` and `guard.tilt` (and `guard.tilt.mounting`) for its wind and tilt settings |
    /// | `tilt_sensor` | the tilt sensor's inputs (a specific force, a level reference) |
    /// | `ballast_sizing`, `axis_loads`, `axis_terms` | the loose inputs of a function of that name |
    /// | `weighing` | a weighing (scale readings) |
    /// | `bolt_circle`, `bolt_pattern`, `joint`, `joint_load`, `material`, `shaft_load`, `strip`, `thread`, `thread_limits` | an attachment-hardware check |
    ///
    /// A test lists every path and checks it against this scheme.
    #[must_use]
    pub const fn path(self) -> &'static str {
        match self {
            Field::AirDensityKgPerM3 => "air.density_kg_per_m3",
            Field::AirPressurePa => "air.pressure_pa",
            Field::AirTemperatureK => "air.temperature_k",
            Field::Ballast => "rig.ballast",
            Field::BallastMassKg => "ballast.mass_kg",
            Field::BallastPositionM => "ballast.position_m",
            Field::Bodies => "rig.bodies",
            Field::BodiesCgM => "bodies.cg_m",
            Field::BodiesMassKg => "bodies.mass_kg",
            Field::BoltCircleCount => "bolt_circle.count",
            Field::BoltCircleMomentNm => "bolt_circle.moment_nm",
            Field::BoltCircleRadiusMm => "bolt_circle.radius_mm",
            Field::BoltPatternCount => "bolt_pattern.count",
            Field::BoltPatternPhaseRad => "bolt_pattern.phase_rad",
            Field::BoltPatternPivotOffsetMm => "bolt_pattern.pivot.offset_mm",
            Field::BoltPatternRadiusMm => "bolt_pattern.radius_mm",
            Field::BoltPatternScrewsMm => "bolt_pattern.screws_mm",
            Field::ConditionsAirDensityKgPerM3 => "conditions.air.density_kg_per_m3",
            Field::ConditionsTiltDownhillAzimuthRad => "conditions.tilt.downhill_azimuth_rad",
            Field::ConditionsTiltMagnitudeRad => "conditions.tilt.magnitude_rad",
            Field::ConditionsWindFromRad => "conditions.wind_from_rad",
            Field::ConditionsWindSpeedMps => "conditions.wind_speed_mps",
            Field::Counterweights => "rig.counterweights",
            Field::CounterweightsDiameterM => "counterweights.diameter_m",
            Field::CounterweightsDistanceM => "counterweights.distance_m",
            Field::CounterweightsDragCoefficient => "counterweights.drag_coefficient",
            Field::CounterweightsMassKg => "counterweights.mass_kg",
            Field::CounterweightsThicknessM => "counterweights.thickness_m",
            Field::Cover => "rig.cover",
            Field::CoverCentreM => "cover.centre_m",
            Field::CoverMassKg => "cover.mass_kg",
            Field::DesignSpeedMps => "ballast_sizing.design_speed_mps",
            Field::Drives => "rig.drives",
            Field::DrivesPrimary => "drives.primary",
            Field::DrivesSecondary => "drives.secondary",
            Field::DrivesSlewAccelerationRadPerS2 => "drives.slew_acceleration_rad_per_s2",
            Field::ExposureAxis => "exposure.axis",
            Field::ExposureCentreM => "exposure.centre_m",
            Field::ExposureDiameterM => "exposure.diameter_m",
            Field::ExposureDragCoefficient => "exposure.drag_coefficient",
            Field::ExposureEdges => "exposure.edges",
            Field::ExposureEndDragCoefficient => "exposure.end_drag_coefficient",
            Field::ExposureLengthM => "exposure.length_m",
            Field::ExposureSizeM => "exposure.size_m",
            Field::FrictionCoefficient => "rig.friction_coefficient",
            Field::GuardAlarmUtilisation => "guard.alarm_utilisation",
            Field::GuardClearRatio => "guard.clear_ratio",
            Field::GuardDriftWatchRadPerS => "guard.drift_watch_rad_per_s",
            Field::GuardDriveParkUtilisation => "guard.drive_park_utilisation",
            Field::GuardDwellS => "guard.dwell_s",
            Field::GuardEvaluateEveryS => "guard.evaluate_every_s",
            Field::GuardFaultClearS => "guard.fault_clear_s",
            Field::GuardGustAllowance => "guard.gust_allowance",
            Field::GuardParkUtilisation => "guard.park_utilisation",
            Field::GuardTiltMarginAlarmRad => "guard.tilt_margin_alarm_rad",
            Field::GuardTimeToParkS => "guard.time_to_park_s",
            Field::GuardWatchUtilisation => "guard.watch_utilisation",
            Field::JointCentreM => "joint.centre_m",
            Field::JointDynamicPressurePa => "joint.dynamic_pressure_pa",
            Field::JointHeightM => "joint.height_m",
            Field::JointWindFromRad => "joint.wind_from_rad",
            Field::JointLoadAxialN => "joint_load.axial_n",
            Field::JointLoadMomentXNm => "joint_load.moment_x_nm",
            Field::JointLoadMomentYNm => "joint_load.moment_y_nm",
            Field::Legs => "rig.legs",
            Field::LegsDiameterM => "legs.diameter_m",
            Field::LegsMassKg => "legs.mass_kg",
            Field::LegsTopHeightM => "legs.top_height_m",
            Field::LegsTopRadiusM => "legs.top_radius_m",
            Field::MaterialUltimateMpa => "material.ultimate_mpa",
            Field::MaterialYieldMpa => "material.yield_mpa",
            Field::MeanWindMps => "axis_loads.mean_wind_mps",
            Field::Measured => "rig.measured",
            Field::MeasuredCentreM => "measured.centre_m",
            Field::MeasuredMassKg => "measured.mass_kg",
            Field::MountAxisOriginM => "mount.axis_origin_m",
            Field::MountLatitudeRad => "mount.latitude_rad",
            Field::MountingAxes => "guard.tilt.mounting.axes",
            Field::MountingSensorToRig => "guard.tilt.mounting.sensor_to_rig",
            Field::ParkWindFromRad => "park.wind_from_rad",
            Field::ParkWindSpeedMps => "park.wind_speed_mps",
            Field::Payload => "payload.pick",
            Field::PayloadBody => "payload.body",
            Field::PayloadEnvelopeOffsets => "payload_envelope.offsets",
            Field::PoseAltitudeRad => "pose.altitude_rad",
            Field::PoseAzimuthRad => "pose.azimuth_rad",
            Field::PoseDeclinationRad => "pose.declination_rad",
            Field::PoseHourAngleRad => "pose.hour_angle_rad",
            Field::PosePrimaryRad => "pose.primary_rad",
            Field::PoseSecondaryRad => "pose.secondary_rad",
            Field::RigMassKg => "rig.mass_kg",
            Field::Shaft => "rig.shaft",
            Field::ShaftBoreMm => "shaft.bore_mm",
            Field::ShaftDiameterM => "shaft.diameter_m",
            Field::ShaftDiameterMm => "shaft.diameter_mm",
            Field::ShaftLengthM => "shaft.length_m",
            Field::ShaftMassKg => "shaft.mass_kg",
            Field::ShaftMomentNm => "shaft.moment_nm",
            Field::ShaftOuterMm => "shaft.outer_mm",
            Field::ShaftSafetyFactor => "shaft.safety_factor",
            Field::ShaftLoadAngleFromVerticalRad => "shaft_load.angle_from_vertical_rad",
            Field::ShaftLoadLeverArmM => "shaft_load.lever_arm_m",
            Field::ShaftLoadMassKg => "shaft_load.mass_kg",
            Field::SiteElevationM => "site.elevation_m",
            Field::SkyGrid => "sky_grid.poses",
            Field::SkyGridHorizonLimitRad => "sky_grid.horizon_limit_rad",
            Field::SkyGridPrimarySteps => "sky_grid.primary_steps",
            Field::SkyGridSecondarySteps => "sky_grid.secondary_steps",
            Field::SkyScanWindDirections => "sky_scan.wind_directions",
            Field::SkyScanWindSpeedMps => "sky_scan.wind_speed_mps",
            Field::StripEngagementMm => "strip.engagement_mm",
            Field::StripLoadN => "strip.load_n",
            Field::StripSafetyFactor => "strip.safety_factor",
            Field::StripShearFactor => "strip.shear_factor",
            Field::StripShearStrengthMpa => "strip.shear_strength_mpa",
            Field::StripTensileAreaMm2 => "strip.tensile_area_mm2",
            Field::SupportFeet => "support.feet",
            Field::SupportFeetPositionM => "support.feet.position_m",
            Field::SupportFeetTieDownN => "support.feet.tie_down_n",
            Field::SupportFirstLegAzimuthRad => "support.first_leg_azimuth_rad",
            Field::SupportFootCircleRadiusM => "support.foot_circle_radius_m",
            Field::SupportLegSpreadM => "support.leg_spread_m",
            Field::SupportPlateSizeM => "support.plate.size_m",
            Field::TargetUtilisation => "ballast_sizing.target_utilisation",
            Field::ThreadName => "thread.name",
            Field::ThreadNamePitchMm => "thread.name.pitch_mm",
            Field::ThreadNominalMm => "thread.nominal_mm",
            Field::ThreadLimitsExtMajorMinMm => "thread_limits.ext_major_min_mm",
            Field::ThreadLimitsExtPitchMinMm => "thread_limits.ext_pitch_min_mm",
            Field::ThreadLimitsIntMinorMaxMm => "thread_limits.int_minor_max_mm",
            Field::ThreadLimitsIntPitchMaxMm => "thread_limits.int_pitch_max_mm",
            Field::ThreadLimitsPitchMm => "thread_limits.pitch_mm",
            Field::TiltBandMaxG => "guard.tilt.band_max_g",
            Field::TiltBandMinG => "guard.tilt.band_min_g",
            Field::TiltDownhillAzimuthRad => "tilt.downhill_azimuth_rad",
            Field::TiltDriftTauS => "guard.tilt.drift_tau_s",
            Field::TiltFilterTauS => "guard.tilt.filter_tau_s",
            Field::TiltGravity => "tilt.gravity",
            Field::TiltLevelCaptureS => "guard.tilt.level_capture_s",
            Field::TiltLevelReference => "tilt_sensor.level_reference",
            Field::TiltLevelReferenceZ => "tilt_sensor.level_reference.z",
            Field::TiltMagnitudeRad => "tilt.magnitude_rad",
            Field::TiltOutOfBandLimitS => "guard.tilt.out_of_band_limit_s",
            Field::TiltScaleGPerCount => "guard.tilt.scale_g_per_count",
            Field::TiltSpecificForce => "tilt_sensor.specific_force",
            Field::TiltStaleAfterS => "guard.tilt.stale_after_s",
            Field::TiltStepLimitRad => "guard.tilt.step_limit_rad",
            Field::TiltStepTauS => "guard.tilt.step_tau_s",
            Field::TiltStuckAfterS => "guard.tilt.stuck_after_s",
            Field::WeighingHeightM => "weighing.height_m",
            Field::WeighingLevelN => "weighing.level_n",
            Field::WeighingLiftAngleRad => "weighing.lift.angle_rad",
            Field::WeighingLiftAngleUncertaintyRad => "weighing.lift.angle_uncertainty_rad",
            Field::WeighingLiftHeightM => "weighing.lift.height_m",
            Field::WeighingLiftHeightUncertaintyM => "weighing.lift.height_uncertainty_m",
            Field::WeighingLiftLiftedFeet => "weighing.lift.lifted_feet",
            Field::WeighingLiftLiftedMask => "weighing.lift.lifted_mask",
            Field::WeighingLiftLoadsN => "weighing.lift.loads_n",
            Field::WeighingLiftRaisedTowardRad => "weighing.lift.raised_toward_rad",
            Field::WeighingLiftRestingFeet => "weighing.lift.resting_feet",
            Field::WeighingReadingUncertaintyN => "weighing.reading_uncertainty_n",
            Field::WeighingTipAngleRad => "weighing.tip.angle_rad",
            Field::WeighingTipAngleUncertaintyRad => "weighing.tip.angle_uncertainty_rad",
            Field::WeighingTipEdgeFeet => "weighing.tip.edge_feet",
            Field::WindCalmBelowMps => "guard.wind.calm_below_mps",
            Field::WindDirectionWindowS => "guard.wind.direction_window_s",
            Field::WindMaxSpeedMps => "guard.wind.max_speed_mps",
            Field::WindMeanGustFactor => "guard.wind.mean_gust_factor",
            Field::WindPeakWindowS => "guard.wind.peak_window_s",
            Field::WindStaleAfterS => "guard.wind.stale_after_s",
            Field::WindStuckAfterS => "guard.wind.stuck_after_s",
            Field::WindVariableSpreadRad => "guard.wind.variable_spread_rad",
            Field::WindZFromM => "guard.wind.z_from_m",
            Field::WindZToM => "guard.wind.z_to_m",
            Field::WindFromRad => "axis_terms.wind_from_rad",
            Field::External { path, .. } => path,
        }
    }

    /// The unit the field's value and accepted range are in (SI; a count of
    /// items for list fields).
    #[must_use]
    pub const fn unit(self) -> Unit {
        match self {
            Field::AirDensityKgPerM3 => Unit::KilogramPerCubicMetre,
            Field::AirPressurePa => Unit::Pascal,
            Field::AirTemperatureK => Unit::Kelvin,
            Field::Ballast => Unit::Count,
            Field::BallastMassKg => Unit::Kilogram,
            Field::BallastPositionM => Unit::Metre,
            Field::Bodies => Unit::Count,
            Field::BodiesCgM => Unit::Metre,
            Field::BodiesMassKg => Unit::Kilogram,
            Field::BoltCircleCount => Unit::Count,
            Field::BoltCircleMomentNm => Unit::NewtonMetre,
            Field::BoltCircleRadiusMm => Unit::Millimetre,
            Field::BoltPatternCount => Unit::Count,
            Field::BoltPatternPhaseRad => Unit::Radian,
            Field::BoltPatternPivotOffsetMm => Unit::Millimetre,
            Field::BoltPatternRadiusMm => Unit::Millimetre,
            Field::BoltPatternScrewsMm => Unit::Millimetre,
            Field::ConditionsAirDensityKgPerM3 => Unit::KilogramPerCubicMetre,
            Field::ConditionsTiltDownhillAzimuthRad => Unit::Radian,
            Field::ConditionsTiltMagnitudeRad => Unit::Radian,
            Field::ConditionsWindFromRad => Unit::Radian,
            Field::ConditionsWindSpeedMps => Unit::MetrePerSecond,
            Field::Counterweights => Unit::Count,
            Field::CounterweightsDiameterM => Unit::Metre,
            Field::CounterweightsDistanceM => Unit::Metre,
            Field::CounterweightsDragCoefficient => Unit::Dimensionless,
            Field::CounterweightsMassKg => Unit::Kilogram,
            Field::CounterweightsThicknessM => Unit::Metre,
            Field::Cover => Unit::Count,
            Field::CoverCentreM => Unit::Metre,
            Field::CoverMassKg => Unit::Kilogram,
            Field::DesignSpeedMps => Unit::MetrePerSecond,
            Field::Drives => Unit::Count,
            Field::DrivesPrimary => Unit::NewtonMetre,
            Field::DrivesSecondary => Unit::NewtonMetre,
            Field::DrivesSlewAccelerationRadPerS2 => Unit::RadianPerSecondSquared,
            Field::ExposureAxis => Unit::Dimensionless,
            Field::ExposureCentreM => Unit::Metre,
            Field::ExposureDiameterM => Unit::Metre,
            Field::ExposureDragCoefficient => Unit::Dimensionless,
            Field::ExposureEdges => Unit::Dimensionless,
            Field::ExposureEndDragCoefficient => Unit::Dimensionless,
            Field::ExposureLengthM => Unit::Metre,
            Field::ExposureSizeM => Unit::Metre,
            Field::FrictionCoefficient => Unit::Dimensionless,
            Field::GuardAlarmUtilisation => Unit::Dimensionless,
            Field::GuardClearRatio => Unit::Dimensionless,
            Field::GuardDriftWatchRadPerS => Unit::RadianPerSecond,
            Field::GuardDriveParkUtilisation => Unit::Dimensionless,
            Field::GuardDwellS => Unit::Second,
            Field::GuardEvaluateEveryS => Unit::Second,
            Field::GuardFaultClearS => Unit::Second,
            Field::GuardGustAllowance => Unit::Dimensionless,
            Field::GuardParkUtilisation => Unit::Dimensionless,
            Field::GuardTiltMarginAlarmRad => Unit::Radian,
            Field::GuardTimeToParkS => Unit::Second,
            Field::GuardWatchUtilisation => Unit::Dimensionless,
            Field::JointCentreM => Unit::Metre,
            Field::JointDynamicPressurePa => Unit::Pascal,
            Field::JointHeightM => Unit::Metre,
            Field::JointWindFromRad => Unit::Radian,
            Field::JointLoadAxialN => Unit::Newton,
            Field::JointLoadMomentXNm => Unit::NewtonMetre,
            Field::JointLoadMomentYNm => Unit::NewtonMetre,
            Field::Legs => Unit::Count,
            Field::LegsDiameterM => Unit::Metre,
            Field::LegsMassKg => Unit::Kilogram,
            Field::LegsTopHeightM => Unit::Metre,
            Field::LegsTopRadiusM => Unit::Metre,
            Field::MaterialUltimateMpa => Unit::Megapascal,
            Field::MaterialYieldMpa => Unit::Megapascal,
            Field::MeanWindMps => Unit::MetrePerSecond,
            Field::Measured => Unit::Count,
            Field::MeasuredCentreM => Unit::Metre,
            Field::MeasuredMassKg => Unit::Kilogram,
            Field::MountAxisOriginM => Unit::Metre,
            Field::MountLatitudeRad => Unit::Radian,
            Field::MountingAxes => Unit::Dimensionless,
            Field::MountingSensorToRig => Unit::Dimensionless,
            Field::ParkWindFromRad => Unit::Radian,
            Field::ParkWindSpeedMps => Unit::MetrePerSecond,
            Field::Payload => Unit::Dimensionless,
            Field::PayloadBody => Unit::Dimensionless,
            Field::PayloadEnvelopeOffsets => Unit::Count,
            Field::PoseAltitudeRad => Unit::Radian,
            Field::PoseAzimuthRad => Unit::Radian,
            Field::PoseDeclinationRad => Unit::Radian,
            Field::PoseHourAngleRad => Unit::Radian,
            Field::PosePrimaryRad => Unit::Radian,
            Field::PoseSecondaryRad => Unit::Radian,
            Field::RigMassKg => Unit::Kilogram,
            Field::Shaft => Unit::Count,
            Field::ShaftBoreMm => Unit::Millimetre,
            Field::ShaftDiameterM => Unit::Metre,
            Field::ShaftDiameterMm => Unit::Millimetre,
            Field::ShaftLengthM => Unit::Metre,
            Field::ShaftMassKg => Unit::Kilogram,
            Field::ShaftMomentNm => Unit::NewtonMetre,
            Field::ShaftOuterMm => Unit::Millimetre,
            Field::ShaftSafetyFactor => Unit::Dimensionless,
            Field::ShaftLoadAngleFromVerticalRad => Unit::Radian,
            Field::ShaftLoadLeverArmM => Unit::Metre,
            Field::ShaftLoadMassKg => Unit::Kilogram,
            Field::SiteElevationM => Unit::Metre,
            Field::SkyGrid => Unit::Dimensionless,
            Field::SkyGridHorizonLimitRad => Unit::Radian,
            Field::SkyGridPrimarySteps => Unit::Count,
            Field::SkyGridSecondarySteps => Unit::Count,
            Field::SkyScanWindDirections => Unit::Count,
            Field::SkyScanWindSpeedMps => Unit::MetrePerSecond,
            Field::StripEngagementMm => Unit::Millimetre,
            Field::StripLoadN => Unit::Newton,
            Field::StripSafetyFactor => Unit::Dimensionless,
            Field::StripShearFactor => Unit::Dimensionless,
            Field::StripShearStrengthMpa => Unit::Megapascal,
            Field::StripTensileAreaMm2 => Unit::SquareMillimetre,
            Field::SupportFeet => Unit::Count,
            Field::SupportFeetPositionM => Unit::Metre,
            Field::SupportFeetTieDownN => Unit::Newton,
            Field::SupportFirstLegAzimuthRad => Unit::Radian,
            Field::SupportFootCircleRadiusM => Unit::Metre,
            Field::SupportLegSpreadM => Unit::Metre,
            Field::SupportPlateSizeM => Unit::Metre,
            Field::TargetUtilisation => Unit::Dimensionless,
            Field::ThreadName => Unit::Dimensionless,
            Field::ThreadNamePitchMm => Unit::Millimetre,
            Field::ThreadNominalMm => Unit::Millimetre,
            Field::ThreadLimitsExtMajorMinMm => Unit::Millimetre,
            Field::ThreadLimitsExtPitchMinMm => Unit::Millimetre,
            Field::ThreadLimitsIntMinorMaxMm => Unit::Millimetre,
            Field::ThreadLimitsIntPitchMaxMm => Unit::Millimetre,
            Field::ThreadLimitsPitchMm => Unit::Millimetre,
            Field::TiltBandMaxG => Unit::StandardGravity,
            Field::TiltBandMinG => Unit::StandardGravity,
            Field::TiltDownhillAzimuthRad => Unit::Radian,
            Field::TiltDriftTauS => Unit::Second,
            Field::TiltFilterTauS => Unit::Second,
            Field::TiltGravity => Unit::Dimensionless,
            Field::TiltLevelCaptureS => Unit::Second,
            Field::TiltLevelReference => Unit::Dimensionless,
            Field::TiltLevelReferenceZ => Unit::Dimensionless,
            Field::TiltMagnitudeRad => Unit::Radian,
            Field::TiltOutOfBandLimitS => Unit::Second,
            Field::TiltScaleGPerCount => Unit::StandardGravityPerCount,
            Field::TiltSpecificForce => Unit::Dimensionless,
            Field::TiltStaleAfterS => Unit::Second,
            Field::TiltStepLimitRad => Unit::Radian,
            Field::TiltStepTauS => Unit::Second,
            Field::TiltStuckAfterS => Unit::Second,
            Field::WeighingHeightM => Unit::Metre,
            Field::WeighingLevelN => Unit::Newton,
            Field::WeighingLiftAngleRad => Unit::Radian,
            Field::WeighingLiftAngleUncertaintyRad => Unit::Radian,
            Field::WeighingLiftHeightM => Unit::Metre,
            Field::WeighingLiftHeightUncertaintyM => Unit::Metre,
            Field::WeighingLiftLiftedFeet => Unit::Count,
            Field::WeighingLiftLiftedMask => Unit::Dimensionless,
            Field::WeighingLiftLoadsN => Unit::Newton,
            Field::WeighingLiftRaisedTowardRad => Unit::Radian,
            Field::WeighingLiftRestingFeet => Unit::Count,
            Field::WeighingReadingUncertaintyN => Unit::Newton,
            Field::WeighingTipAngleRad => Unit::Radian,
            Field::WeighingTipAngleUncertaintyRad => Unit::Radian,
            Field::WeighingTipEdgeFeet => Unit::Dimensionless,
            Field::WindCalmBelowMps => Unit::MetrePerSecond,
            Field::WindDirectionWindowS => Unit::Second,
            Field::WindMaxSpeedMps => Unit::MetrePerSecond,
            Field::WindMeanGustFactor => Unit::Dimensionless,
            Field::WindPeakWindowS => Unit::Second,
            Field::WindStaleAfterS => Unit::Second,
            Field::WindStuckAfterS => Unit::Second,
            Field::WindVariableSpreadRad => Unit::Radian,
            Field::WindZFromM => Unit::Metre,
            Field::WindZToM => Unit::Metre,
            Field::WindFromRad => Unit::Radian,
            Field::External { unit, .. } => unit,
        }
    }
}

/// The unit of a [`Field`]'s value and accepted range.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum Unit {
    /// A pure number (a coefficient, a ratio, a direction component).
    Dimensionless,
    /// A number of items.
    Count,
    /// Metre.
    Metre,
    /// Millimetre.
    Millimetre,
    /// Square millimetre.
    SquareMillimetre,
    /// Kilogram.
    Kilogram,
    /// Kilogram per cubic metre.
    KilogramPerCubicMetre,
    /// Newton.
    Newton,
    /// Newton metre.
    NewtonMetre,
    /// Pascal.
    Pascal,
    /// Megapascal (N/mm²).
    Megapascal,
    /// Metre per second.
    MetrePerSecond,
    /// Radian.
    Radian,
    /// Radian per second.
    RadianPerSecond,
    /// Radian per second squared.
    RadianPerSecondSquared,
    /// Second.
    Second,
    /// Millisecond.
    Millisecond,
    /// Kelvin.
    Kelvin,
    /// Standard gravity g₀ = 9.806 65 m/s² (accelerometer readings).
    StandardGravity,
    /// Standard gravity per raw count of an accelerometer.
    StandardGravityPerCount,
    /// Hertz (a pulse rate).
    Hertz,
    /// Metre per second per hertz (a pulse anemometer's slope).
    MetrePerSecondPerHertz,
}

impl Unit {
    /// The unit's symbol (`"m"`, `"N m"`, `"rad/s²"`); empty for
    /// [`Unit::Dimensionless`] and [`Unit::Count`].
    #[must_use]
    pub const fn symbol(self) -> &'static str {
        match self {
            Unit::Dimensionless | Unit::Count => "",
            Unit::Metre => "m",
            Unit::Millimetre => "mm",
            Unit::SquareMillimetre => "mm²",
            Unit::Kilogram => "kg",
            Unit::KilogramPerCubicMetre => "kg/m³",
            Unit::Newton => "N",
            Unit::NewtonMetre => "N m",
            Unit::Pascal => "Pa",
            Unit::Megapascal => "MPa",
            Unit::MetrePerSecond => "m/s",
            Unit::Radian => "rad",
            Unit::RadianPerSecond => "rad/s",
            Unit::RadianPerSecondSquared => "rad/s²",
            Unit::Second => "s",
            Unit::Millisecond => "ms",
            Unit::Kelvin => "K",
            Unit::StandardGravity => "g",
            Unit::StandardGravityPerCount => "g/count",
            Unit::Hertz => "Hz",
            Unit::MetrePerSecondPerHertz => "m/s/Hz",
        }
    }

    /// A name for the unit in snake case (`"metre_per_second"`), stable for
    /// logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            Unit::Dimensionless => "dimensionless",
            Unit::Count => "count",
            Unit::Metre => "metre",
            Unit::Millimetre => "millimetre",
            Unit::SquareMillimetre => "square_millimetre",
            Unit::Kilogram => "kilogram",
            Unit::KilogramPerCubicMetre => "kilogram_per_cubic_metre",
            Unit::Newton => "newton",
            Unit::NewtonMetre => "newton_metre",
            Unit::Pascal => "pascal",
            Unit::Megapascal => "megapascal",
            Unit::MetrePerSecond => "metre_per_second",
            Unit::Radian => "radian",
            Unit::RadianPerSecond => "radian_per_second",
            Unit::RadianPerSecondSquared => "radian_per_second_squared",
            Unit::Second => "second",
            Unit::Millisecond => "millisecond",
            Unit::Kelvin => "kelvin",
            Unit::StandardGravity => "standard_gravity",
            Unit::StandardGravityPerCount => "standard_gravity_per_count",
            Unit::Hertz => "hertz",
            Unit::MetrePerSecondPerHertz => "metre_per_second_per_hertz",
        }
    }
}

impl ErrorKind {
    /// A stable snake-case name for logs and machine-readable output
    /// (`"out_of_range"`).
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            ErrorKind::NotFinite => "not_finite",
            ErrorKind::OutOfRange => "out_of_range",
            ErrorKind::DuplicateFoot => "duplicate_foot",
            ErrorKind::CollinearFeet => "collinear_feet",
            ErrorKind::TooMany => "too_many",
            ErrorKind::TooFew => "too_few",
            ErrorKind::ZeroDirection => "zero_direction",
            ErrorKind::Unreachable => "unreachable",
            ErrorKind::Inconsistent => "inconsistent",
        }
    }
}

/// The error type of the crate: the field (a [`Field`], whose unit is
/// [`Error::unit`]), its index where the field is a list, the offending value
/// and the accepted range, all as data.
///
/// `index` says which element of a list (0-based) when it matters.
///
/// # Examples
/// ```
/// use standfast::error::{Field, Unit};
/// use standfast::{ErrorKind, Support};
/// let e = Support::tripod(20.0, 0.0).unwrap_err();
/// assert_eq!(e.kind, ErrorKind::OutOfRange);
/// assert_eq!(e.field, Field::SupportFootCircleRadiusM);
/// assert_eq!(e.unit(), Unit::Metre);
/// assert_eq!((e.value, e.max), (20.0, 10.0));
/// assert_eq!(e.field.path(), "support.foot_circle_radius_m");
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Error {
    /// What is wrong.
    pub kind: ErrorKind,
    /// The field; [`Field::path`] is its dotted path in the configuration
    /// types.
    pub field: Field,
    /// Index within a list field, if any.
    pub index: Option<u8>,
    /// The offending value (NaN when there is no single value).
    pub value: f32,
    /// Smallest accepted value (or count), NaN when not applicable.
    pub min: f32,
    /// Largest accepted value (or count), NaN when not applicable.
    pub max: f32,
}

impl Error {
    /// An error of `kind` on `field` without a value or range.
    #[must_use]
    pub const fn new(kind: ErrorKind, field: Field) -> Self {
        Error {
            kind,
            field,
            index: None,
            value: f32::NAN,
            min: f32::NAN,
            max: f32::NAN,
        }
    }

    /// The same error about element `i` of a list field.
    #[must_use]
    pub const fn at(mut self, i: usize) -> Self {
        self.index = Some(if i > 255 { 255 } else { i as u8 });
        self
    }

    /// The unit of the value and of the accepted range.
    #[must_use]
    pub const fn unit(&self) -> Unit {
        self.field.unit()
    }

    /// Checks that `value` is finite and within `[min, max]`.
    ///
    /// # Errors
    /// [`ErrorKind::NotFinite`] or [`ErrorKind::OutOfRange`] naming `field`.
    pub fn check(field: Field, value: f32, min: f32, max: f32) -> Result<f32, Error> {
        let base = Error {
            kind: ErrorKind::NotFinite,
            field,
            index: None,
            value,
            min,
            max,
        };
        if !value.is_finite() {
            Err(base)
        } else if value < min || value > max {
            Err(Error {
                kind: ErrorKind::OutOfRange,
                ..base
            })
        } else {
            Ok(value)
        }
    }

    /// Checks every component of a vector against `[min, max]`.
    ///
    /// # Errors
    /// As [`Error::check`], for the first bad component.
    pub fn check_vec(
        field: Field,
        v: crate::math::Vec3,
        min: f32,
        max: f32,
    ) -> Result<crate::math::Vec3, Error> {
        Error::check(field, v.x, min, max)?;
        Error::check(field, v.y, min, max)?;
        Error::check(field, v.z, min, max)?;
        Ok(v)
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.field.path())?;
        if let Some(i) = self.index {
            write!(f, "[{i}]")?;
        }
        match self.kind {
            ErrorKind::NotFinite => write!(f, ": value {} is not a finite number", self.value),
            ErrorKind::OutOfRange => {
                let u = self.unit().symbol();
                let sp = if u.is_empty() { "" } else { " " };
                write!(
                    f,
                    ": value {}{sp}{u} is outside the accepted range {} to {}{sp}{u}",
                    self.value, self.min, self.max
                )
            }
            ErrorKind::DuplicateFoot => f.write_str(": two feet are less than 1 mm apart"),
            ErrorKind::CollinearFeet => {
                f.write_str(": the feet lie on one line and enclose no area")
            }
            ErrorKind::TooMany => write!(f, ": more than {} items", self.max),
            ErrorKind::TooFew => write!(f, ": fewer than {} items", self.min),
            ErrorKind::ZeroDirection => f.write_str(": direction vector has zero length"),
            ErrorKind::Unreachable => f.write_str(": the requested result cannot be reached"),
            ErrorKind::Inconsistent => {
                f.write_str(": the measurements disagree with each other or with the geometry")
            }
        }
    }
}

impl core::error::Error for Error {}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every field's path is unique, and the unit as data agrees with the
    /// unit the path's name ends in (the naming rule of DEVELOPERS.md).
    #[test]
    fn field_paths_are_unique_and_units_match_their_names() {
        for (i, a) in Field::ALL.iter().enumerate() {
            for b in Field::ALL.iter().skip(i + 1) {
                assert_ne!(a.path(), b.path());
            }
            let p = a.path();
            let want = [
                ("_rad_per_s2", Unit::RadianPerSecondSquared),
                ("_kg_per_m3", Unit::KilogramPerCubicMetre),
                ("_rad_per_s", Unit::RadianPerSecond),
                ("_rad", Unit::Radian),
                ("_mps", Unit::MetrePerSecond),
                ("_kg", Unit::Kilogram),
                ("_nm", Unit::NewtonMetre),
                ("_mpa", Unit::Megapascal),
                ("_pa", Unit::Pascal),
                ("_mm2", Unit::SquareMillimetre),
                ("_mm", Unit::Millimetre),
                ("_ms", Unit::Millisecond),
                ("_s", Unit::Second),
                ("_k", Unit::Kelvin),
                ("_g", Unit::StandardGravity),
                ("_n", Unit::Newton),
                ("_m", Unit::Metre),
            ]
            .into_iter()
            .find(|(suffix, _)| p.ends_with(suffix));
            if let Some((_, unit)) = want {
                assert_eq!(a.unit(), unit, "{p}");
            }
        }
    }

    /// Every path follows the scheme of [`Field::path`]: two or more
    /// lower-case snake_case segments, a first segment from its table of
    /// holders, and each holder used for one kind of value only (`tilt` a
    /// ground tilt; the tilt settings under `guard.tilt`, the sensor's inputs
    /// under `tilt_sensor`; the wind settings under `guard.wind`).
    #[test]
    fn field_paths_follow_the_documented_scheme() {
        const HOLDERS: [&str; 37] = [
            "rig",
            "ballast",
            "bodies",
            "counterweights",
            "cover",
            "drives",
            "exposure",
            "legs",
            "measured",
            "mount",
            "shaft",
            "support",
            "site",
            "payload",
            "payload_envelope",
            "sky_grid",
            "sky_scan",
            "park",
            "conditions",
            "pose",
            "tilt",
            "air",
            "guard",
            "tilt_sensor",
            "ballast_sizing",
            "axis_loads",
            "axis_terms",
            "weighing",
            "bolt_circle",
            "bolt_pattern",
            "joint",
            "joint_load",
            "material",
            "shaft_load",
            "strip",
            "thread",
            "thread_limits",
        ];
        let mut used = [false; HOLDERS.len()];
        for f in Field::ALL {
            let p = f.path();
            let segments: heapless::Vec<&str, 8> = p.split('.').collect();
            assert!(segments.len() >= 2, "{p}: one segment");
            for s in &segments {
                let ok = s.bytes().next().is_some_and(|b| b.is_ascii_lowercase())
                    && s.bytes()
                        .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'_');
                assert!(ok, "{p}: segment {s:?} is not lower-case snake_case");
            }
            let holder = segments.first().copied().unwrap_or_default();
            let i = HOLDERS.iter().position(|h| *h == holder);
            assert!(i.is_some(), "{p}: {holder:?} is not a documented holder");
            if let Some(i) = i {
                if let Some(u) = used.get_mut(i) {
                    *u = true;
                }
            }
            // One meaning per holder.
            if holder == "tilt" {
                let field = segments.get(1).copied().unwrap_or_default();
                assert!(
                    ["magnitude_rad", "downhill_azimuth_rad", "gravity"].contains(&field),
                    "{p}: `tilt` is a ground tilt only"
                );
            }
            if holder == "guard" && segments.len() > 2 {
                let part = segments.get(1).copied().unwrap_or_default();
                assert!(["wind", "tilt"].contains(&part), "{p}: unknown guard part");
            }
        }
        // The table holds no holder that no path uses.
        for (h, u) in HOLDERS.iter().zip(used) {
            assert!(u, "{h} unused");
        }
    }

    #[test]
    fn check_reports_value_and_range() {
        let e = Error::check(Field::RigMassKg, -1.0, 0.0, 10.0).unwrap_err();
        assert_eq!(e.kind, ErrorKind::OutOfRange);
        assert_eq!(e.value, -1.0);
        assert_eq!(e.max, 10.0);
        let e = Error::check(Field::RigMassKg, f32::NAN, 0.0, 10.0).unwrap_err();
        assert_eq!(e.kind, ErrorKind::NotFinite);
    }
}
