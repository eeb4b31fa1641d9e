//! Inputs the compiler cannot know: an invented rig, conditions, sensor
//! samples and hardware figures, kept in a `static` and read only through
//! [`core::ptr::read_volatile`], so no call below is constant-folded and
//! every branch of the core behind the validation stays in the binary.

/// Every figure the calls take. Units as the field names say (SI, radians;
/// millimetres and MPa for the hardware check, as in `standfast::hardware`).
/// Counts are `u32` so that loops and capacity checks see unknown lengths.
#[derive(Clone, Copy, Debug)]
#[repr(C)]
pub struct Unknowns {
    /// Radius of the tripod's foot circle, m.
    pub foot_circle_radius_m: f32,
    /// Azimuth of the first leg, rad from north clockwise.
    pub first_leg_azimuth_rad: f32,
    /// Mass of the tube, kg.
    pub tube_mass_kg: f32,
    /// Centre of gravity of the tube in the secondary-stage frame, m.
    pub tube_cg_m: [f32; 3],
    /// Tube diameter and length, m.
    pub tube_diameter_m: f32,
    /// Tube length, m.
    pub tube_length_m: f32,
    /// Mass of the head, kg.
    pub head_mass_kg: f32,
    /// Height of the head's centre of gravity, m.
    pub head_height_m: f32,
    /// How many extra accessory bodies to push (beyond the capacity too).
    pub extra_bodies: u32,
    /// Mass of one tripod leg, kg.
    pub leg_mass_kg: f32,
    /// Counterweight mass, kg.
    pub counterweight_kg: f32,
    /// Counterweight distance from the axis origin along the shaft, m.
    pub counterweight_distance_m: f32,
    /// Shaft mass, kg.
    pub shaft_mass_kg: f32,
    /// Shaft length, m.
    pub shaft_length_m: f32,
    /// Cover mass, kg.
    pub cover_mass_kg: f32,
    /// Ballast mass, kg.
    pub ballast_kg: f32,
    /// Friction coefficient feet to ground.
    pub friction_coefficient: f32,
    /// 0: equatorial mount, anything else: alt-azimuth.
    pub mount_kind: u32,
    /// Site latitude, rad.
    pub latitude_rad: f32,
    /// Height of the axis origin, m.
    pub axis_height_m: f32,
    /// Rated, repeated peak and momentary peak torque of both drives, N·m.
    pub drive_nm: [f32; 3],
    /// Slew acceleration, rad/s².
    pub slew_acceleration_rad_per_s2: f32,
    /// Hour angle, rad, positive west.
    pub hour_angle_rad: f32,
    /// Declination, rad.
    pub declination_rad: f32,
    /// 0: tube east, anything else: tube west.
    pub pier_side: u32,
    /// Ground tilt and its downhill azimuth, rad.
    pub tilt_rad: [f32; 2],
    /// Gust speed, m/s.
    pub gust_mps: f32,
    /// Mean wind speed, m/s.
    pub mean_wind_mps: f32,
    /// Direction the wind blows from, rad.
    pub wind_from_rad: f32,
    /// Air density, kg/m³.
    pub air_density_kg_per_m3: f32,
    /// 1: cover fitted.
    pub cover_fitted: u32,
    /// Number of guard steps.
    pub guard_steps: u32,
    /// Start time, ms.
    pub start_ms: u64,
    /// Time between samples, ms.
    pub sample_period_ms: u32,
    /// Raw accelerometer sample, g, sensor axes.
    pub accel_g: [f32; 3],
    /// Air temperature, K.
    pub temperature_k: f32,
    /// Station pressure, Pa.
    pub pressure_pa: f32,
    /// Nominal thread diameter, mm.
    pub thread_nominal_mm: f32,
    /// Length of engagement, mm.
    pub engagement_mm: f32,
    /// Safety factor of the hardware checks.
    pub safety_factor: f32,
    /// Number of screws on the bolt circle.
    pub screws: u32,
    /// Bolt circle radius, mm.
    pub bolt_circle_radius_mm: f32,
    /// Angle of the counterweight shaft from hanging straight down, rad.
    pub shaft_angle_rad: f32,
    /// Scale readings under the feet, level and lifted, N (the first
    /// `scale_count` of each are used).
    pub scale_n: [[f32; 8]; 2],
    /// How many readings of each weighing to pass (any count).
    pub scale_count: u32,
    /// Standard uncertainty of one reading, N.
    pub scale_uncertainty_n: f32,
    /// Feet raised for the lift weighing (bit i: foot i).
    pub lift_mask: u32,
    /// Lift height and its uncertainty, m.
    pub lift_height_m: [f32; 2],
    /// Lift by angle: raised-side azimuth, angle and uncertainty, rad.
    pub lift_angle_rad: [f32; 3],
    /// Tip test: edge feet and angle, rad.
    pub tip_edge: [u32; 2],
    /// Tip angle and uncertainty, rad.
    pub tip_angle_rad: [f32; 2],
    /// A weighed mass, kg, and centre of gravity, m, for the override.
    pub measured_kg: f32,
    /// The weighed centre of gravity, rig frame, m.
    pub measured_cg_m: [f32; 3],
}

/// The stored figures: an invented small equatorial rig on a light tripod in
/// a rising breeze (not a real product), valid for every call so that a run
/// on the host goes down the main paths.
pub static UNKNOWNS: Unknowns = Unknowns {
    foot_circle_radius_m: 0.45,
    first_leg_azimuth_rad: 0.0,
    tube_mass_kg: 5.0,
    tube_cg_m: [0.15, 0.1, 0.0],
    tube_diameter_m: 0.12,
    tube_length_m: 0.7,
    head_mass_kg: 4.0,
    head_height_m: 1.1,
    extra_bodies: 2,
    leg_mass_kg: 0.8,
    counterweight_kg: 4.0,
    counterweight_distance_m: 0.25,
    shaft_mass_kg: 0.6,
    shaft_length_m: 0.3,
    cover_mass_kg: 0.5,
    ballast_kg: 3.0,
    friction_coefficient: 0.3,
    mount_kind: 0,
    latitude_rad: 0.820_304_7,
    axis_height_m: 1.25,
    drive_nm: [2.0, 4.0, 6.0],
    slew_acceleration_rad_per_s2: 0.05,
    hour_angle_rad: 0.7,
    declination_rad: 0.3,
    pier_side: 0,
    tilt_rad: [0.02, 1.0],
    gust_mps: 12.0,
    mean_wind_mps: 6.0,
    wind_from_rad: 4.7,
    air_density_kg_per_m3: 1.2,
    cover_fitted: 0,
    guard_steps: 200,
    start_ms: 1_000,
    sample_period_ms: 250,
    accel_g: [0.01, -0.02, 0.999],
    temperature_k: 281.15,
    pressure_pa: 95_000.0,
    thread_nominal_mm: 12.0,
    engagement_mm: 10.0,
    safety_factor: 2.0,
    screws: 4,
    bolt_circle_radius_mm: 30.0,
    shaft_angle_rad: 1.3,
    scale_n: [
        [55.0, 54.0, 56.0, 0.0, 0.0, 0.0, 0.0, 0.0],
        [40.0, 62.0, 63.0, 0.0, 0.0, 0.0, 0.0, 0.0],
    ],
    scale_count: 3,
    scale_uncertainty_n: 0.05,
    lift_mask: 1,
    lift_height_m: [0.08, 0.001],
    lift_angle_rad: [0.0, 0.15, 0.002],
    tip_edge: [1, 2],
    tip_angle_rad: [0.35, 0.005],
    measured_kg: 17.5,
    measured_cg_m: [0.01, 0.0, 0.95],
};

/// [`UNKNOWNS`] read through a volatile load: the optimiser must treat every
/// field as arbitrary (any `f32`, NaN and infinities included; any count).
#[must_use]
pub fn read() -> Unknowns {
    // SAFETY: `UNKNOWNS` is a valid, aligned, initialised static of a `Copy`
    // type; a volatile read of it is a plain read the compiler may not elide
    // or replace by the stored constant.
    #[allow(unsafe_code)]
    unsafe {
        core::ptr::read_volatile(&raw const UNKNOWNS)
    }
}
