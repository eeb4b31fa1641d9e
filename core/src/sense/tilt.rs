//! Ground tilt from a 3-axis accelerometer.
//!
//! **Sensor convention** (ST design tip DT0140): at rest, level and upright, an
//! accelerometer reads +1 g on its z axis: it measures the specific force, the
//! reaction to gravity, which points *up*. Gravity (down) in the rig frame is
//! therefore the negated reading.
//!
//! **Pipeline.** Raw sample (counts or g) × `scale_g_per_count` → rotated into
//! the rig frame by the [`Mounting`] → magnitude gate (samples whose magnitude
//! is far from 1 g are dropped) → three single-pole low-pass filters with
//! α = 1 − exp(−Δt/τ), exact for any sample interval: a *fast* one (the tilt
//! reported), a *medium* one (the reference for sudden steps) and a *slow* one
//! (the reference for drift). Tilt is taken from the direction of the fast
//! filter's vector, optionally relative to a level reference captured at
//! set-up.
//!
//! **Tilt formula.** Total tilt θ = atan2(√(ax² + ay²), az), the angle of the
//! z axis to gravity of Analog Devices AN-1057 (eq. 13; also NXP AN3461); the
//! downhill azimuth is that of the horizontal part of gravity (−a) in the rig
//! frame (see [`crate::frame`]). Only ratios enter, so any scale works. The
//! arc tangent of tilts up to 45° (and of the gaps between filters) is summed
//! here as a series, so it is accurate to f32 rounding with either math back
//! end.

use crate::error::{Error, ErrorKind, Field};
use crate::frame::{self, Tilt, MAX_TILT_RAD};
use crate::math::{self, Vec3};

use super::fault::{Fault, FaultSet, Sensor};
use super::{ms_to_s, s_to_ms, Millis};

/// A sensor axis with a sign, for describing how the accelerometer is mounted.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum SignedAxis {
    /// Sensor +x.
    PlusX,
    /// Sensor −x.
    MinusX,
    /// Sensor +y.
    PlusY,
    /// Sensor −y.
    MinusY,
    /// Sensor +z.
    PlusZ,
    /// Sensor −z.
    MinusZ,
}

impl SignedAxis {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            SignedAxis::PlusX => "plus_x",
            SignedAxis::MinusX => "minus_x",
            SignedAxis::PlusY => "plus_y",
            SignedAxis::MinusY => "minus_y",
            SignedAxis::PlusZ => "plus_z",
            SignedAxis::MinusZ => "minus_z",
        }
    }
}

impl SignedAxis {
    /// The unit vector of this axis in sensor coordinates.
    #[must_use]
    pub const fn unit(self) -> Vec3 {
        match self {
            SignedAxis::PlusX => Vec3::new(1.0, 0.0, 0.0),
            SignedAxis::MinusX => Vec3::new(-1.0, 0.0, 0.0),
            SignedAxis::PlusY => Vec3::new(0.0, 1.0, 0.0),
            SignedAxis::MinusY => Vec3::new(0.0, -1.0, 0.0),
            SignedAxis::PlusZ => Vec3::new(0.0, 0.0, 1.0),
            SignedAxis::MinusZ => Vec3::new(0.0, 0.0, -1.0),
        }
    }
}

/// How the accelerometer sits on the rig: the rotation from sensor axes to
/// rig axes, `v_rig = sensor_to_rig · v_sensor`, rows of a 3×3 matrix.
/// Row i is rig axis i expressed in sensor coordinates. Must be a proper
/// rotation (orthonormal, determinant +1) to within 1e-3.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Mounting {
    /// Row-major rotation matrix, sensor frame → rig frame (dimensionless).
    pub sensor_to_rig: [[f32; 3]; 3],
}

impl Default for Mounting {
    /// The sensor's axes are the rig's axes (x east, y north, z up).
    fn default() -> Self {
        Mounting::IDENTITY
    }
}

impl Mounting {
    /// Sensor axes aligned with the rig axes.
    pub const IDENTITY: Mounting = Mounting {
        sensor_to_rig: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
    };

    /// A mounting from an axis table: which signed sensor axis points along rig
    /// +x (east), rig +y (north) and rig +z (up).
    ///
    /// # Errors
    /// [`ErrorKind::OutOfRange`] on `guard.tilt.mounting.axes` when the three
    /// axes do not form a right-handed set (repeated axis, or a mirror image).
    pub fn from_axes(
        rig_x: SignedAxis,
        rig_y: SignedAxis,
        rig_z: SignedAxis,
    ) -> Result<Mounting, Error> {
        let (x, y, z) = (rig_x.unit(), rig_y.unit(), rig_z.unit());
        let m = Mounting {
            sensor_to_rig: [x.to_array(), y.to_array(), z.to_array()],
        };
        if x.cross(y).dot(z) > 0.5 {
            Ok(m)
        } else {
            Err(Error::new(ErrorKind::OutOfRange, Field::MountingAxes))
        }
    }

    /// A sensor-frame vector expressed in the rig frame.
    #[must_use]
    pub fn to_rig(&self, v: Vec3) -> Vec3 {
        let [r0, r1, r2] = self.sensor_to_rig;
        Vec3::new(
            Vec3::from_array(r0).dot(v),
            Vec3::from_array(r1).dot(v),
            Vec3::from_array(r2).dot(v),
        )
    }

    /// Checks that the matrix is a proper rotation to within 1e-3.
    ///
    /// # Errors
    /// [`ErrorKind::NotFinite`] or [`ErrorKind::OutOfRange`] on
    /// `guard.tilt.mounting.sensor_to_rig`.
    pub fn validate(&self) -> Result<(), Error> {
        let [r0, r1, r2] = self.sensor_to_rig;
        let (a, b, c) = (
            Vec3::from_array(r0),
            Vec3::from_array(r1),
            Vec3::from_array(r2),
        );
        for r in [a, b, c] {
            Error::check_vec(Field::MountingSensorToRig, r, -1.001, 1.001)?;
        }
        let bad = (a.dot(a) - 1.0).abs() > 1e-3
            || (b.dot(b) - 1.0).abs() > 1e-3
            || (c.dot(c) - 1.0).abs() > 1e-3
            || a.dot(b).abs() > 1e-3
            || a.dot(c).abs() > 1e-3
            || b.dot(c).abs() > 1e-3
            || (a.cross(b).dot(c) - 1.0).abs() > 3e-3;
        if bad {
            Err(Error::new(
                ErrorKind::OutOfRange,
                Field::MountingSensorToRig,
            ))
        } else {
            Ok(())
        }
    }
}

/// What the reported tilt is measured against.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum TiltReference {
    /// Against the true vertical, trusting the [`Mounting`] as exact. Default:
    /// it needs no set-up step and reports the real ground tilt.
    #[default]
    Absolute,
    /// Against the gravity direction captured by a level capture at set-up
    /// (the rig was levelled then), which removes the sensor's small mounting
    /// error. No tilt is reported until a reference exists.
    LevelReference,
}

impl TiltReference {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            TiltReference::Absolute => "absolute",
            TiltReference::LevelReference => "level_reference",
        }
    }
}

/// Configuration of a [`TiltSensor`]. Defaults are listed per field with the
/// reason for each.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct TiltConfig {
    /// g per raw count (for example 1/16384 for a 16-bit ±2 g part). Default
    /// 1.0: samples already in g.
    pub scale_g_per_count: f32,
    /// Sensor-to-rig rotation. Default: identity.
    pub mounting: Mounting,
    /// Absolute or relative to a captured level reference. Default absolute.
    pub reference: TiltReference,
    /// Time constant of the fast filter whose output is the reported tilt, s.
    /// Default 1 s: removes vibration and wind buffeting above about 0.3 Hz
    /// while a real change shows within 5 s (5τ, 99.3 %).
    pub filter_tau_s: f32,
    /// Time constant of the medium filter that a sudden step is measured
    /// against, s. Default 60 s: long against a knock, short against a leg
    /// sinking (a 1°/h drift opens a gap of only 0.017° to the fast filter).
    pub step_tau_s: f32,
    /// Time constant of the slow filter the drift rate is measured against, s.
    /// Default 1800 s: a ramp's rate r shows as a gap r·(τ_slow − τ_fast)
    /// between filters (first-order ramp lag), settled after a few τ_slow, so
    /// drift of a leg sinking over hours is seen within about 2 h.
    pub drift_tau_s: f32,
    /// Lowest accepted sample magnitude, g. Default 0.8 g.
    pub band_min_g: f32,
    /// Highest accepted sample magnitude, g. Default 1.2 g. At rest the
    /// magnitude is 1 g up to calibration error (a few %); a sample beyond
    /// ±20 % is dominated by shock, vibration or saturation, and any
    /// non-gravity acceleration corrupts tilt (AN-1057 introduction). The
    /// band is tighter than the 5–14 m/s² one open-source estimator accepts
    /// for initial alignment, because tilt here must be accurate to a
    /// fraction of a degree.
    pub band_max_g: f32,
    /// Time every sample may stay out of band before [`Fault::MagnitudeOutOfBand`]
    /// is raised, s. Default 5 s: a knock lasts well under a second; five
    /// seconds of nothing usable means no tilt can be measured.
    pub out_of_band_limit_s: f32,
    /// Angle between fast and medium filters that raises [`Fault::TiltStep`],
    /// radians. Default 0.5° (0.008 73 rad): far above the 0.06° resolution of
    /// a 12-bit ±2 g part near level, and below the 1–3° chassis-tilt alarms
    /// of aerial work platforms, so a slipping foot is caught early.
    pub step_limit_rad: f32,
    /// Time without any sample before [`Fault::Stale`], s. Default 5 s: five
    /// fast time constants; a tip can start within seconds.
    pub stale_after_s: f32,
    /// Time of bit-identical raw readings before [`Fault::Stuck`], s; 0
    /// disables. Default 60 s: a working accelerometer's noise (several LSB)
    /// changes the reading at every sample, so a minute of identical values
    /// means a frozen bus or register. Disable for parts that average
    /// internally down to fewer bits than their noise.
    pub stuck_after_s: f32,
    /// Averaging window of a level capture, s. Default 10 s: ten fast time
    /// constants, long enough to average out vibration.
    pub level_capture_s: f32,
}

impl Default for TiltConfig {
    fn default() -> Self {
        TiltConfig {
            scale_g_per_count: 1.0,
            mounting: Mounting::IDENTITY,
            reference: TiltReference::Absolute,
            filter_tau_s: 1.0,
            step_tau_s: 60.0,
            drift_tau_s: 1800.0,
            band_min_g: 0.8,
            band_max_g: 1.2,
            out_of_band_limit_s: 5.0,
            step_limit_rad: 0.008_726_646,
            stale_after_s: 5.0,
            stuck_after_s: 60.0,
            level_capture_s: 10.0,
        }
    }
}

impl TiltConfig {
    /// Checks every field.
    ///
    /// # Errors
    /// The first field that is non-finite or out of its range, named as
    /// `guard.tilt.<field>`; also the filter time constants must increase
    /// fast < step < drift.
    pub fn validate(&self) -> Result<(), Error> {
        Error::check(Field::TiltScaleGPerCount, self.scale_g_per_count, 1e-9, 1e6)?;
        self.mounting.validate()?;
        Error::check(Field::TiltFilterTauS, self.filter_tau_s, 1e-3, 3600.0)?;
        Error::check(
            Field::TiltStepTauS,
            self.step_tau_s,
            self.filter_tau_s * 2.0,
            86_400.0,
        )?;
        Error::check(
            Field::TiltDriftTauS,
            self.drift_tau_s,
            self.step_tau_s,
            604_800.0,
        )?;
        Error::check(Field::TiltBandMinG, self.band_min_g, 0.1, 1.0)?;
        Error::check(Field::TiltBandMaxG, self.band_max_g, 1.0, 10.0)?;
        Error::check(
            Field::TiltOutOfBandLimitS,
            self.out_of_band_limit_s,
            0.0,
            3600.0,
        )?;
        Error::check(
            Field::TiltStepLimitRad,
            self.step_limit_rad,
            1e-5,
            MAX_TILT_RAD,
        )?;
        Error::check(Field::TiltStaleAfterS, self.stale_after_s, 1e-3, 86_400.0)?;
        Error::check(Field::TiltStuckAfterS, self.stuck_after_s, 0.0, 86_400.0)?;
        Error::check(Field::TiltLevelCaptureS, self.level_capture_s, 0.0, 3600.0)?;
        Ok(())
    }
}

/// Progress of a level capture.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum LevelCapture {
    /// No capture started.
    #[default]
    Idle,
    /// Averaging accepted samples until the window has passed.
    InProgress,
    /// The reference was captured and is in use.
    Done,
    /// The averaged direction was more than 45° from the rig's +z axis (or no
    /// sample came): the rig was not upright; no reference was stored.
    Failed,
}

impl LevelCapture {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            LevelCapture::Idle => "idle",
            LevelCapture::InProgress => "in_progress",
            LevelCapture::Done => "done",
            LevelCapture::Failed => "failed",
        }
    }
}

/// The smoothing factor α = 1 − exp(−Δt/τ) of a single-pole low-pass filter
/// `y ← y + α·(x − y)` over an interval `dt_s` with time constant `tau_s`
/// (both seconds). Exact for any interval: n steps of Δt compose to one step
/// of n·Δt for a held input. 0 for Δt ≤ 0; 1 for τ ≤ 0.
#[must_use]
pub fn lowpass_alpha(dt_s: f32, tau_s: f32) -> f32 {
    if dt_s <= 0.0 || dt_s.is_nan() {
        0.0
    } else if tau_s <= 0.0 || tau_s.is_nan() {
        1.0
    } else {
        1.0 - math::exp(-dt_s / tau_s)
    }
}

/// Tilt of the rig from an accelerometer reading `a` in the rig frame (any
/// scale; +z up reads positive when level, ST DT0140): magnitude
/// atan2(√(ax² + ay²), az) (AN-1057 eq. 13), downhill azimuth of −a.
///
/// # Errors
/// [`ErrorKind::ZeroDirection`] for a zero or non-finite vector;
/// [`ErrorKind::OutOfRange`] when the tilt exceeds [`MAX_TILT_RAD`].
pub fn tilt_of_specific_force(a: Vec3) -> Result<Tilt, Error> {
    // The test of `Vec3::normalized`, without forming the unit vector.
    let n = a.norm();
    if !(n > 1e-12 && n.is_finite()) {
        return Err(Error::new(
            ErrorKind::ZeroDirection,
            Field::TiltSpecificForce,
        ));
    }
    let magnitude = tilt_magnitude(a);
    Tilt::new(magnitude, frame::azimuth_of(-a))
}

/// One step's ground tilt as the guard measured it, with its angles worked
/// out only when asked: the fast-filtered specific force in the rig frame
/// (relative to the level reference when the configuration uses one), in g.
///
/// The guard steps at the accelerometer's rate, and the two arc tangents of
/// a [`Tilt`] cost more than the rest of a step between evaluations; a
/// caller that needs the angles of every step (a chart, a log) pays for
/// them, one that tests the level or the faults does not.
///
/// A reading exists only for a valid tilt: its vector is finite and not
/// zero, and its magnitude is at most [`MAX_TILT_RAD`] (exactly where
/// [`tilt_of_specific_force`] succeeds). [`TiltReading::tilt`] is then, bit
/// for bit, what [`tilt_of_specific_force`] returns for the vector, and what
/// [`TiltSensor::tilt`] returns for the same sensor state.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TiltReading {
    force_g: Vec3,
}

impl TiltReading {
    /// The reading of the specific force `v` (rig frame, any scale), or
    /// `None` where [`tilt_of_specific_force`] fails for it. The usual
    /// case (a vector of a sensible length within 40° of +z) is settled by
    /// two comparisons, without a square root or an arc tangent; any other
    /// is settled by the exact test.
    #[must_use]
    pub fn of_specific_force(v: Vec3) -> Option<TiltReading> {
        let d = v.dot(v);
        // √d > 1e-12 and finite: certain for a finite d ≥ 1e-22 (√1e-22 =
        // 1e-11, whatever the square root's last bit); else tested as
        // `tilt_of_specific_force` does.
        let length_ok = (d >= 1e-22 && d.is_finite()) || {
            let n = math::sqrt(d);
            n > 1e-12 && n.is_finite()
        };
        if !length_ok {
            return None;
        }
        let reading = TiltReading { force_g: v };
        if atan2_certainly_at_most(v.x * v.x + v.y * v.y, v.z, MAX_TILT_RAD) {
            return Some(reading);
        }
        let magnitude = tilt_magnitude(v);
        // In the closed range 0 to MAX_TILT_RAD: finite too (NaN is in no
        // range). Written out: `RangeInclusive::contains` stays a function
        // of its own in the size-optimised firmware.
        #[allow(clippy::manual_range_contains)]
        let in_range = magnitude >= 0.0 && magnitude <= MAX_TILT_RAD;
        in_range.then_some(reading)
    }

    /// The specific force the reading is of: rig frame (relative to the
    /// level reference when one is in use), g, +z up when level.
    #[must_use]
    pub fn specific_force_g(&self) -> Vec3 {
        self.force_g
    }

    /// The tilt's magnitude, radians, 0 to [`MAX_TILT_RAD`]: the
    /// `magnitude_rad` of [`TiltReading::tilt`] (one arc tangent).
    #[must_use]
    pub fn magnitude_rad(&self) -> f32 {
        tilt_magnitude(self.force_g)
    }

    /// The azimuth the ground falls away to: the `downhill_azimuth_rad` of
    /// [`TiltReading::tilt`], rig frame, radians from north clockwise, in
    /// [0, 2π) (one arc tangent).
    #[must_use]
    pub fn downhill_azimuth_rad(&self) -> f32 {
        frame::azimuth_of(-self.force_g)
    }

    /// The tilt: magnitude and downhill azimuth (rig frame, radians from
    /// north clockwise, [0, 2π)), computed now (two arc tangents).
    #[must_use]
    pub fn tilt(&self) -> Tilt {
        Tilt {
            magnitude_rad: tilt_magnitude(self.force_g),
            downhill_azimuth_rad: frame::azimuth_of(-self.force_g),
        }
    }

    /// True when this reading's [`TiltReading::magnitude_rad`] is certainly
    /// below `other`'s, found without an arc tangent or a square root (a
    /// chart keeping the largest tilt of many steps computes the angle only
    /// for a step that may beat it); `false` means "not known": compare the
    /// magnitudes.
    ///
    /// Both tilts are at most 45°, so both vectors have z > 0, and the tilt
    /// grows with tan²θ = (x² + y²)/z². The test asks for tan²θ below
    /// `other`'s by a factor 1 − 10⁻⁴, so the true angles differ by more
    /// than 2.5·10⁻⁵ of the larger one (up to 45°, d(atan t)/atan t ≥ 0.64 ·
    /// dt/t); the products here are within a few units in the last place
    /// (about 10⁻⁶), and [`TiltReading::magnitude_rad`] is within 10⁻⁶ of
    /// the true angle, relative, with either math back end (its series and
    /// a square root correct to f32 rounding), so the computed magnitudes
    /// keep the order. `other`'s x² + y² must be at least 10⁻²⁰ (a tilt of
    /// about 10⁻¹⁰ rad), where nothing in the angle is subnormal.
    #[must_use]
    pub fn certainly_less_steep_than(&self, other: &TiltReading) -> bool {
        let (a, b) = (self.force_g, other.force_g);
        let (ha, hb) = (a.x * a.x + a.y * a.y, b.x * b.x + b.y * b.y);
        let lhs = ha * (b.z * b.z);
        let rhs = hb * (a.z * a.z) * (1.0 - 1e-4);
        a.z > 0.0 && b.z > 0.0 && hb >= 1e-20 && rhs.is_finite() && lhs < rhs
    }
}

/// The tilt magnitude of [`tilt_of_specific_force`], radians, unchecked:
/// atan2(√(ax² + ay²), az).
fn tilt_magnitude(a: Vec3) -> f32 {
    small_angle_atan2(planar_norm(a.x, a.y), a.z)
}

/// `tilt_of_specific_force(a).ok()`, the same value, for an `a` whose
/// [`tilt_magnitude`] is `magnitude` (computed once when the caller needs
/// it too). `None` exactly where that function fails: a zero or non-finite
/// vector, or a magnitude `Tilt::new` refuses (not finite, or outside 0 to
/// [`MAX_TILT_RAD`]). `Tilt::new`'s checks of the azimuth always pass here:
/// `azimuth_of` returns a value wrapped to [0, 2π) (`wrap_tau` maps even
/// NaN to 0), which `Tilt::new` accepts and wraps again to the same value
/// (`wrap_tau` is the identity on its own results: tested); so they are
/// left out, and the azimuth's arc tangent is computed only for a valid
/// magnitude.
fn tilt_of_magnitude(a: Vec3, magnitude: f32) -> Option<Tilt> {
    let n = a.norm();
    // In the closed range 0 to MAX_TILT_RAD: finite too (NaN is in no
    // range). Written out: `RangeInclusive::contains` stays a function of
    // its own in the size-optimised firmware (50 bytes of flash).
    #[allow(clippy::manual_range_contains)]
    let valid = n > 1e-12 && n.is_finite() && magnitude >= 0.0 && magnitude <= MAX_TILT_RAD;
    valid.then(|| Tilt {
        magnitude_rad: magnitude,
        downhill_azimuth_rad: frame::azimuth_of(-a),
    })
}

/// Adds [`Fault::TiltBeyondLimit`] to `set` for a tilt `magnitude_rad`
/// beyond [`MAX_TILT_RAD`].
fn beyond_limit_into(magnitude_rad: f32, set: &mut FaultSet) {
    if magnitude_rad > MAX_TILT_RAD {
        set.push(Fault::TiltBeyondLimit { magnitude_rad });
    }
}

/// `v` rotated by the smallest rotation that takes the unit vector `r` onto
/// +z (Rodrigues' formula with axis k = r × z, |k| = sin θ, r·z = cos θ,
/// written as v·c + k × v + k·(k·v)/(1 + c), valid for c > −1).
fn rotate_onto_z(v: Vec3, r: Vec3) -> Vec3 {
    let k = r.cross(Vec3::Z);
    let c = r.z;
    v * c + k.cross(v) + k * (k.dot(v) / (1.0 + c))
}

/// atan2(y, x) for y ≥ 0, accurate to f32 rounding up to 45° whatever the
/// math back end (the fast back end's arc tangent is off by about 3 % for
/// small arguments and 0.5 % near 30°, too much for a 0.5° step limit):
/// - 0 ≤ t = y/x ≤ 0.42 (up to 22.8°): the Maclaurin series
///   t − t³/3 + t⁵/5 − … − t¹³/13 (truncation below t¹⁵/15 = 1.5e-7 rad);
/// - up to t = 1.02 (45.6°): the half-angle identity
///   atan2(y, x) = 2·atan(y / (x + √(x² + y²))), whose argument is ≤ 0.42;
/// - elsewhere the back end's `atan2`.
fn small_angle_atan2(y: f32, x: f32) -> f32 {
    if x > 0.0 && y >= 0.0 && y <= 0.42 * x {
        atan_series(y / x)
    } else if x > 0.0 && y >= 0.0 && y <= 1.02 * x {
        2.0 * atan_series(y / (x + math::sqrt(x * x + y * y)))
    } else {
        math::atan2(y, x)
    }
}

/// True when `small_angle_atan2(√ss, x)` is certainly at most `limit_rad`
/// (0 < `limit_rad`; limits above 0.8 are taken as 0.8), found without a
/// square root or a division: for x ≥ 1e-6 and ss ≤ (0.4 · min(limit, 0.8)
/// · x)², √ss / x ≤ 0.32 (plus rounding, with a wide margin to 0.42 even for
/// a square root a few per cent off), so the series branch applies, whose
/// f32 value never exceeds its argument t = √ss / x (every term after the
/// first subtracts); and t ≤ 0.4 · limit (plus rounding) < limit. `false`
/// means "not known": compute the angle.
fn atan2_certainly_at_most(ss: f32, x: f32, limit_rad: f32) -> bool {
    let b = x * 0.4 * limit_rad.min(0.8);
    x >= 1e-6 && ss <= b * b
}

/// Maclaurin series of atan(t) to the t¹³ term, for |t| ≤ 0.42.
fn atan_series(t: f32) -> f32 {
    let t2 = t * t;
    let mut acc = 1.0 / 13.0;
    // The reciprocals 1/11 … 1/1, rounded at compile time as a division at
    // run time rounds them (IEEE 754 division either way).
    for r in [
        1.0 / 11.0_f32,
        1.0 / 9.0,
        1.0 / 7.0,
        1.0 / 5.0,
        1.0 / 3.0,
        1.0,
    ] {
        acc = r - t2 * acc;
    }
    t * acc
}

/// Length of `(x, y)` by the back end's square root of x² + y² when no
/// overflow threatens (component sizes here are near 1).
fn planar_norm(x: f32, y: f32) -> f32 {
    math::sqrt(x * x + y * y)
}

/// Angle between two vectors, radians; 0 when either is zero.
fn angle_between(a: Vec3, b: Vec3) -> f32 {
    let n = a.norm() * b.norm();
    if n > 1e-12 && n.is_finite() {
        // atan2 form stays accurate for tiny angles where acos does not.
        small_angle_atan2(a.cross(b).norm(), a.dot(b))
    } else {
        0.0
    }
}

fn bits(raw: [f32; 3]) -> [u32; 3] {
    [raw[0].to_bits(), raw[1].to_bits(), raw[2].to_bits()]
}

/// Ground tilt from accelerometer samples, with filtering, level capture,
/// drift and step tracking and fault detection.
///
/// Memory: `core::mem::size_of::<TiltSensor>()` is a compile-time constant
/// of at most 320 bytes (checked by a unit test); nothing is allocated.
#[derive(Clone, Debug)]
pub struct TiltSensor {
    config: TiltConfig,
    start: Millis,
    last_sample: Option<Millis>,
    last_in_band: Millis,
    last_filter: Option<Millis>,
    fast_g: Vec3,
    medium_g: Vec3,
    slow_g: Vec3,
    last_magnitude_g: f32,
    /// Filter factors (fast, medium, slow) for the sample interval
    /// `alpha_dt_ms`: the interval is nearly always the same, so the three
    /// exponentials are computed once per distinct interval (same values).
    alpha_dt_ms: u64,
    alphas: [f32; 3],
    /// The configuration's time limits in whole ms (`s_to_ms` of stale,
    /// stuck, out of band; stuck 0 = disabled), computed once.
    stale_ms: u64,
    stuck_ms: Option<u64>,
    out_of_band_ms: u64,
    last_raw_bits: [u32; 3],
    raw_since: Millis,
    rejection: Option<Fault>,
    reference: Option<Vec3>,
    capture: LevelCapture,
    capture_start: Millis,
    capture_sum_g: Vec3,
    capture_count: u32,
}

impl TiltSensor {
    /// A sensor processor started at time `now` (stale time counts from here).
    ///
    /// # Errors
    /// As [`TiltConfig::validate`].
    pub fn new(config: TiltConfig, now: Millis) -> Result<Self, Error> {
        config.validate()?;
        Ok(Self::started(config, now))
    }

    /// [`TiltSensor::new`] for a `config` already validated (the guard
    /// validates its whole configuration first): infallible, so a caller
    /// can build the sensor in place, with no `Result` of it on the stack.
    pub(crate) fn started(config: TiltConfig, now: Millis) -> Self {
        TiltSensor {
            config,
            start: now,
            last_sample: None,
            last_in_band: now,
            last_filter: None,
            fast_g: Vec3::ZERO,
            medium_g: Vec3::ZERO,
            slow_g: Vec3::ZERO,
            last_magnitude_g: f32::NAN,
            alpha_dt_ms: u64::MAX,
            alphas: [0.0; 3],
            stale_ms: s_to_ms(config.stale_after_s),
            stuck_ms: (config.stuck_after_s > 0.0).then(|| s_to_ms(config.stuck_after_s)),
            out_of_band_ms: s_to_ms(config.out_of_band_limit_s),
            last_raw_bits: [0; 3],
            raw_since: now,
            rejection: None,
            reference: None,
            capture: LevelCapture::Idle,
            capture_start: now,
            capture_sum_g: Vec3::ZERO,
            capture_count: 0,
        }
    }

    /// The configuration in use.
    #[must_use]
    pub fn config(&self) -> &TiltConfig {
        &self.config
    }

    /// Feeds one raw sample `[x, y, z]` in sensor axes and counts (or g) taken
    /// at `now`.
    ///
    /// # Errors
    /// The sample is dropped and the reason returned: [`Fault::TimeReversed`],
    /// [`Fault::NotFinite`], or [`Fault::MagnitudeOutOfBand`] (with `for_ms`
    /// the time since the last in-band sample; a single such rejection is
    /// normal after a knock and only becomes an active fault after
    /// `out_of_band_limit_s`).
    // Inlined into the guard's step, its one caller there (as are the
    // fault checks below): about 50 instructions a step less on the host.
    #[inline]
    pub fn push(&mut self, now: Millis, raw: [f32; 3]) -> Result<(), Fault> {
        let sensor = Sensor::Accelerometer;
        if self.last_sample.is_some_and(|t| now < t) {
            return Err(Fault::TimeReversed { sensor });
        }
        self.last_sample = Some(now);
        let raw_v = Vec3::from_array(raw);
        if !raw_v.is_finite() {
            let f = Fault::NotFinite { sensor };
            self.rejection = Some(f);
            return Err(f);
        }
        let b = bits(raw);
        if b != self.last_raw_bits {
            self.last_raw_bits = b;
            self.raw_since = now;
        }
        let a = self
            .config
            .mounting
            .to_rig(raw_v * self.config.scale_g_per_count);
        let mag = a.norm();
        self.last_magnitude_g = mag;
        if !(mag.is_finite() && mag >= self.config.band_min_g && mag <= self.config.band_max_g) {
            return Err(Fault::MagnitudeOutOfBand {
                magnitude_g: mag,
                for_ms: now.since(self.last_in_band),
            });
        }
        self.rejection = None;
        self.last_in_band = now;
        match self.last_filter {
            None => {
                self.fast_g = a;
                self.medium_g = a;
                self.slow_g = a;
            }
            Some(t) => {
                let dt_ms = now.since(t);
                if dt_ms != self.alpha_dt_ms {
                    let dt = ms_to_s(dt_ms);
                    let c = &self.config;
                    self.alphas = [
                        lowpass_alpha(dt, c.filter_tau_s),
                        lowpass_alpha(dt, c.step_tau_s),
                        lowpass_alpha(dt, c.drift_tau_s),
                    ];
                    self.alpha_dt_ms = dt_ms;
                }
                let [fast, medium, slow] = self.alphas;
                self.fast_g += (a - self.fast_g) * fast;
                self.medium_g += (a - self.medium_g) * medium;
                self.slow_g += (a - self.slow_g) * slow;
            }
        }
        self.last_filter = Some(now);
        if self.capture == LevelCapture::InProgress {
            self.capture_sum_g += a;
            self.capture_count = self.capture_count.saturating_add(1);
            if now.since(self.capture_start) >= s_to_ms(self.config.level_capture_s) {
                self.finish_capture();
            }
        }
        Ok(())
    }

    fn finish_capture(&mut self) {
        let dir = self.capture_sum_g.normalized();
        match dir {
            Some(r) if self.capture_count > 0 && r.z >= math::cos(MAX_TILT_RAD) => {
                self.reference = Some(r);
                self.capture = LevelCapture::Done;
            }
            _ => self.capture = LevelCapture::Failed,
        }
    }

    /// Starts a level capture at `now`: accepted samples are averaged for
    /// `level_capture_s`, and their mean direction becomes the level
    /// reference. The rig must be levelled and still meanwhile.
    pub fn start_level_capture(&mut self, now: Millis) {
        self.capture = LevelCapture::InProgress;
        self.capture_start = now;
        self.capture_sum_g = Vec3::ZERO;
        self.capture_count = 0;
    }

    /// Progress of the latest level capture.
    #[must_use]
    pub fn level_capture(&self) -> LevelCapture {
        self.capture
    }

    /// The level reference: unit vector of the specific force (up) in the rig
    /// frame when the rig was level, if one was captured or set.
    #[must_use]
    pub fn level_reference(&self) -> Option<Vec3> {
        self.reference
    }

    /// Sets the level reference from a stored vector (any length, rig frame,
    /// specific force pointing up), for example one captured earlier.
    ///
    /// # Errors
    /// [`ErrorKind::ZeroDirection`] for a zero or non-finite vector;
    /// [`ErrorKind::OutOfRange`] when it lies more than 45° from +z.
    pub fn set_level_reference(&mut self, up: Vec3) -> Result<(), Error> {
        let r = up.normalized().ok_or(Error::new(
            ErrorKind::ZeroDirection,
            Field::TiltLevelReference,
        ))?;
        Error::check(
            Field::TiltLevelReferenceZ,
            r.z,
            math::cos(MAX_TILT_RAD),
            1.0,
        )?;
        self.reference = Some(r);
        self.capture = LevelCapture::Done;
        Ok(())
    }

    /// The fast-filtered specific force in the rig frame, in g; `None` before
    /// the first accepted sample.
    #[must_use]
    pub fn filtered_g(&self) -> Option<Vec3> {
        self.last_filter.map(|_| self.fast_g)
    }

    /// The filtered vector, corrected by the level reference when the
    /// configuration asks for it.
    fn referenced(&self, v: Vec3) -> Option<Vec3> {
        match self.config.reference {
            TiltReference::Absolute => Some(v),
            TiltReference::LevelReference => self.reference.map(|r| rotate_onto_z(v, r)),
        }
    }

    /// The present ground tilt in the rig frame, from the fast filter.
    /// `None` before the first accepted sample, when a level reference is
    /// required but missing, or when the tilt is beyond [`MAX_TILT_RAD`]
    /// (then [`Fault::TiltBeyondLimit`] is active).
    #[must_use]
    pub fn tilt(&self) -> Option<Tilt> {
        let v = self.referenced(self.filtered_g()?)?;
        tilt_of_magnitude(v, tilt_magnitude(v))
    }

    /// Angle between the fast and the medium filtered directions, radians:
    /// how much the tilt moved within roughly the last `step_tau_s`.
    #[must_use]
    pub fn step_rad(&self) -> f32 {
        self.last_filter
            .map_or(0.0, |_| angle_between(self.fast_g, self.medium_g))
    }

    /// Rate of slow tilt change, radians per second, any direction: the angle
    /// between the fast and slow filtered directions divided by
    /// (τ_drift − τ_fast), the steady lag between two first-order filters
    /// following a ramp. Settles after a few τ_drift; reads high for a while
    /// after a step (check [`TiltSensor::step_rad`]).
    #[must_use]
    pub fn drift_rate_rad_per_s(&self) -> f32 {
        let span = self.config.drift_tau_s - self.config.filter_tau_s;
        if span > 0.0 && self.last_filter.is_some() {
            angle_between(self.fast_g, self.slow_g) / span
        } else {
            0.0
        }
    }

    /// Magnitude of the latest sample (after scaling), g; NaN before any.
    #[must_use]
    pub fn last_magnitude_g(&self) -> f32 {
        self.last_magnitude_g
    }

    /// The faults active at `now`: a rejected last sample (non-finite),
    /// stale, stuck, magnitude out of band for too long, a tilt step beyond
    /// the limit, a tilt beyond the model's limit.
    #[must_use]
    pub fn faults(&self, now: Millis) -> FaultSet {
        let mut set = FaultSet::new();
        self.faults_into(now, &mut set);
        set
    }

    /// Adds the faults of [`TiltSensor::faults`] to `set` (no set built and
    /// copied on every step).
    pub(crate) fn faults_into(&self, now: Millis, set: &mut FaultSet) {
        self.sample_faults_into(now, set);
        // A cheap bound settles the usual case (well inside the limit)
        // without the arc tangent; otherwise the angle is computed exactly
        // as `tilt` does, so the fault is the same.
        if let Some(v) = self.filtered_g().and_then(|v| self.referenced(v)) {
            if !atan2_certainly_at_most(v.x * v.x + v.y * v.y, v.z, MAX_TILT_RAD) {
                beyond_limit_into(tilt_magnitude(v), set);
            }
        }
    }

    /// [`TiltSensor::faults_into`] and [`TiltSensor::reading`] at once, for
    /// the guard's step: the same faults added to `set`, the same reading
    /// returned. A valid reading is within 45°, so the tilt-beyond-limit
    /// test needs the angle only when there is none.
    #[inline]
    pub(crate) fn faults_into_and_reading(
        &self,
        now: Millis,
        set: &mut FaultSet,
    ) -> Option<TiltReading> {
        self.sample_faults_into(now, set);
        let v = self.referenced(self.filtered_g()?)?;
        let reading = TiltReading::of_specific_force(v);
        if reading.is_none() {
            beyond_limit_into(tilt_magnitude(v), set);
        }
        reading
    }

    /// The present tilt reading: [`TiltSensor::tilt`] with the angles left
    /// to [`TiltReading::tilt`] (`None` exactly where that is).
    #[must_use]
    pub fn reading(&self) -> Option<TiltReading> {
        TiltReading::of_specific_force(self.referenced(self.filtered_g()?)?)
    }

    /// The faults of [`TiltSensor::faults`] but the tilt beyond the limit:
    /// a rejected last sample, stale, stuck, magnitude out of band, a tilt
    /// step.
    #[inline]
    fn sample_faults_into(&self, now: Millis, set: &mut FaultSet) {
        let sensor = Sensor::Accelerometer;
        let c = &self.config;
        if let Some(f) = self.rejection {
            set.push(f);
        }
        let silent_ms = now.since(self.last_sample.unwrap_or(self.start));
        if silent_ms > self.stale_ms {
            set.push(Fault::Stale { sensor, silent_ms });
        }
        if let Some(last) = self.last_sample {
            let unchanged_ms = last.since(self.raw_since);
            if self.stuck_ms.is_some_and(|limit| unchanged_ms > limit) {
                set.push(Fault::Stuck {
                    sensor,
                    unchanged_ms,
                });
            }
            let for_ms = last.since(self.last_in_band);
            if for_ms > self.out_of_band_ms {
                set.push(Fault::MagnitudeOutOfBand {
                    magnitude_g: self.last_magnitude_g,
                    for_ms,
                });
            }
        }
        // The step check runs on every step; a cheap bound settles the
        // usual case (well inside the limit) without the arc tangent, and
        // otherwise the angle is computed exactly as `step_rad` does.
        if self.last_filter.is_some() {
            let (a, b) = (self.fast_g, self.medium_g);
            let cross = a.cross(b);
            if !atan2_certainly_at_most(cross.dot(cross), a.dot(b), c.step_limit_rad) {
                let step_rad = angle_between(a, b);
                if step_rad > c.step_limit_rad {
                    set.push(Fault::TiltStep { step_rad });
                }
            }
        }
    }

    /// Seconds since the last accepted sample at `now`; `None` before any.
    #[must_use]
    pub fn age_s(&self, now: Millis) -> Option<f32> {
        self.last_filter.map(|t| ms_to_s(now.since(t)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A deterministic stream of numbers in [0, 1) (xorshift32).
    struct Stream(u32);

    impl Stream {
        fn next(&mut self) -> f32 {
            self.0 ^= self.0 << 13;
            self.0 ^= self.0 >> 17;
            self.0 ^= self.0 << 5;
            #[allow(clippy::cast_precision_loss)]
            let x = (self.0 >> 8) as f32 / 16_777_216.0;
            x
        }

        /// A specific force of length about 0.9 to 1.1 g, tilted up to
        /// 50° (past the limit) toward any azimuth; often a tilt of a few
        /// thousandths, as on a level pier.
        fn force(&mut self) -> Vec3 {
            let steep = self.next() < 0.5;
            let m = if steep {
                0.88 * self.next()
            } else {
                0.005 * self.next()
            };
            let a = 6.3 * self.next();
            let g = 0.9 + 0.2 * self.next();
            let (sm, cm) = (math::sin(m), math::cos(m));
            Vec3::new(-g * sm * math::sin(a), -g * sm * math::cos(a), g * cm)
        }
    }

    // A reading exists exactly where `tilt_of_specific_force` succeeds, and
    // its angles are that function's, bit for bit: at random forces, at the
    // 45° limit, and at zero, tiny, huge and non-finite vectors.
    #[test]
    fn a_reading_is_the_tilt_of_its_specific_force() {
        let mut r = Stream(0x9e37_79b9);
        let edge = MAX_TILT_RAD;
        let at_edge = |d: f32, k: f32| {
            let m = edge + d;
            Vec3::new(k * math::sin(m), 0.0, k * math::cos(m))
        };
        let special = [
            at_edge(-2e-7, 1.0),
            at_edge(-1e-7, 3.0),
            at_edge(0.0, 1.0),
            at_edge(1e-7, 0.5),
            at_edge(2e-7, 1.0),
            Vec3::ZERO,
            Vec3::new(0.0, 0.0, 1e-13),
            Vec3::new(0.0, 0.0, 1e-11),
            Vec3::new(1e-12, 0.0, 5e-12),
            Vec3::new(0.0, 0.0, 3e19),
            Vec3::new(1e19, 0.0, 3e19),
            // Exactly the length limit of 1e-12 (the square root of 1e-12
            // squared is 1e-12 again when correctly rounded): no reading,
            // as no tilt; the limit must be exceeded.
            Vec3::new(0.0, 0.0, 1e-12),
            // Past 45° at several g ("any scale"): x² + y² above 1, where
            // the shortcut's bound must take the squares, not x/x or y/y.
            Vec3::new(10.0, 0.0, 4.0),
            Vec3::new(0.0, -10.0, 4.0),
            Vec3::new(f32::NAN, 0.0, 1.0),
            Vec3::new(0.0, 0.0, f32::INFINITY),
            Vec3::new(0.0, 0.0, -1.0),
        ];
        let forces = (0..20_000).map(|_| r.force()).chain(special);
        for v in forces {
            let want = tilt_of_specific_force(v).ok();
            let got = TiltReading::of_specific_force(v);
            assert_eq!(got.is_some(), want.is_some(), "{v:?}");
            if let (Some(g), Some(w)) = (got, want) {
                let t = g.tilt();
                assert_eq!(t.magnitude_rad.to_bits(), w.magnitude_rad.to_bits());
                assert_eq!(
                    t.downhill_azimuth_rad.to_bits(),
                    w.downhill_azimuth_rad.to_bits()
                );
                assert_eq!(g.magnitude_rad().to_bits(), w.magnitude_rad.to_bits());
                assert_eq!(
                    g.downhill_azimuth_rad().to_bits(),
                    w.downhill_azimuth_rad.to_bits()
                );
            }
        }
    }

    // "Certainly less steep" is never wrong: whenever it says so, the
    // computed magnitude is lower; and it says so for most pairs that are
    // not close. Pairs at random, and pairs a relative 10⁻⁶ to 10⁻³ apart
    // in tan²θ (scaled lengths, turned azimuths), where the margin is tested.
    #[test]
    fn certainly_less_steep_is_never_wrong() {
        let mut r = Stream(0x2545_f491);
        let (mut said, mut pairs) = (0_u32, 0_u32);
        for _ in 0..200_000 {
            let Some(a) = TiltReading::of_specific_force(r.force()) else {
                continue;
            };
            let near = r.next() < 0.5;
            let b = if near {
                let v = a.specific_force_g();
                let w = r.next();
                let k = 1.0 + (r.next() - 0.5) * 4e-3 * w * w * w * w * w;
                let turn = r.next() * 6.3;
                let (s, c) = (math::sin(turn), math::cos(turn));
                let (x, y) = (v.x * c - v.y * s, v.x * s + v.y * c);
                // The same tilt at another length, then nudged.
                let g = 2.0 * r.next() + 0.5;
                Vec3::new(x * k * g, y * k * g, v.z * g)
            } else {
                r.force()
            };
            let Some(b) = TiltReading::of_specific_force(b) else {
                continue;
            };
            for (p, q) in [(a, b), (b, a)] {
                pairs += 1;
                if p.certainly_less_steep_than(&q) {
                    said += 1;
                    assert!(
                        p.magnitude_rad() < q.magnitude_rad(),
                        "{p:?} {q:?}: {} {}",
                        p.magnitude_rad(),
                        q.magnitude_rad()
                    );
                }
            }
        }
        // About half the far pairs, a good share of the near ones.
        assert!(said > pairs / 5, "{said} of {pairs}");
        // Never for itself, a level reading, or a level `other`.
        let level = TiltReading::of_specific_force(Vec3::Z).map(|l| (l, l));
        assert!(level.is_some_and(|(l, m)| !l.certainly_less_steep_than(&m)));
    }

    #[test]
    fn small_angle_series_matches_atan() {
        for t in [
            0.0_f32, 1e-4, 0.01, 0.1, 0.2, 0.25, 0.41, 0.5, 0.8, 1.0, 1.02,
        ] {
            let exact = euler_atan(f64::from(t));
            let err = (f64::from(small_angle_atan2(t, 1.0)) - exact).abs();
            assert!(err < 3e-7, "t {t}: error {err:e}");
        }
    }

    /// atan by Euler's series, Σ (2ⁿn!)²/(2n+1)! · t²ⁿ⁺¹/(1+t²)ⁿ⁺¹, 200
    /// terms in f64, independent of either back end.
    fn euler_atan(t: f64) -> f64 {
        let z = t * t / (1.0 + t * t);
        let mut term = t / (1.0 + t * t);
        let mut sum = term;
        for n in 1..200 {
            let nf = f64::from(n);
            term *= 2.0 * nf * z / (2.0 * nf + 1.0);
            sum += term;
        }
        sum
    }

    /// `wrap_tau` is the identity on its own results (what
    /// `tilt_of_magnitude` relies on to leave out `Tilt::new`'s second
    /// wrap): on every value it returns from a sweep of angles over several
    /// turns, the ends of its range and signed zeros.
    #[test]
    fn wrap_tau_is_the_identity_on_its_results() {
        let top = f32::from_bits(math::TAU.to_bits() - 1);
        let inputs = [0.0, -0.0, 1e-45, -1e-45, top, -top, math::PI, -math::PI];
        let sweep = (0..2_000_000).map(|k| (k as f32 - 1_000_000.0) * 1.3e-5);
        for rad in inputs.into_iter().chain(sweep) {
            let w = math::wrap_tau(rad);
            assert_eq!(math::wrap_tau(w).to_bits(), w.to_bits(), "{rad} -> {w}");
        }
        // Every float just below 2π, and the smallest ones.
        for b in 0..100_000_u32 {
            for w in [f32::from_bits(top.to_bits() - b), f32::from_bits(b)] {
                assert_eq!(math::wrap_tau(w).to_bits(), w.to_bits(), "{w}");
            }
        }
    }

    /// The guard's tilt (`tilt_of_magnitude`) is `tilt_of_specific_force`'s,
    /// bit for bit, `None` where it fails: over a grid of directions (every
    /// octant, level, past 45°, upside down), zero, tiny, huge and
    /// non-finite vectors.
    #[test]
    fn the_guards_tilt_is_tilt_of_specific_force() {
        let same = |a: Vec3| {
            let expect = tilt_of_specific_force(a).ok();
            let got = tilt_of_magnitude(a, tilt_magnitude(a));
            let bits = |t: Option<Tilt>| {
                t.map(|t| (t.magnitude_rad.to_bits(), t.downhill_azimuth_rad.to_bits()))
            };
            assert_eq!(bits(got), bits(expect), "{a:?}");
        };
        let steps = [
            -1.0_f32, -0.7, -0.3, -0.05, -1e-3, -1e-7, -0.0, 0.0, 1e-7, 1e-3, 0.05, 0.3, 0.7, 1.0,
        ];
        for x in steps {
            for y in steps {
                for z in [-1.0_f32, -0.01, 0.0, 1e-4, 0.01, 0.2, 0.7, 1.0, 1.1] {
                    same(Vec3::new(x, y, z));
                    same(Vec3::new(x * 1e-13, y * 1e-13, z * 1e-13));
                    same(Vec3::new(x * 1e30, y * 1e30, z * 1e30));
                }
            }
        }
        for bad in [f32::NAN, f32::INFINITY, f32::NEG_INFINITY] {
            same(Vec3::new(bad, 0.0, 1.0));
            same(Vec3::new(0.0, 0.0, bad));
        }
        // Near the 45° limit, from every side.
        for k in 0..4_000 {
            let a = k as f32 * 1.570_796_4e-3;
            let r = 0.999_5 + (k % 7) as f32 * 1e-4;
            same(Vec3::new(r * math::cos(a), r * math::sin(a), 1.0));
        }
    }

    /// The sensor's reading is its tilt (`reading` against `tilt`, bit for
    /// bit, `None` exactly where that is), and the guard's one-pass
    /// `faults_into_and_reading` gives the same reading with the faults of
    /// `faults`: before the first sample, without a required level
    /// reference, then with one, from level to past the 45° limit.
    #[test]
    fn the_sensors_reading_is_its_tilt() {
        let bits = |t: Option<Tilt>| {
            t.map(|t| (t.magnitude_rad.to_bits(), t.downhill_azimuth_rad.to_bits()))
        };
        let check = |s: &TiltSensor, now: Millis| {
            let r = s.reading();
            assert_eq!(bits(r.map(|r| r.tilt())), bits(s.tilt()), "{r:?}");
            let mut set = FaultSet::new();
            assert_eq!(s.faults_into_and_reading(now, &mut set), r);
            assert_eq!(set, s.faults(now));
            r
        };
        let referenced = TiltConfig {
            reference: TiltReference::LevelReference,
            ..TiltConfig::default()
        };
        let (mut some, mut none) = (0, 0);
        for config in [TiltConfig::default(), referenced] {
            let mut s = sensor_with(config);
            assert_eq!(check(&s, Millis(0)), None, "no sample yet");
            let mut t = 0;
            if config.reference == TiltReference::LevelReference {
                feed(&mut s, [0.0, 0.0, 1.0], 0, 5_000, 100);
                assert_eq!(check(&s, Millis(5_000)), None, "no reference yet");
                s.set_level_reference(Vec3::new(0.0, 0.02, 2.0)).unwrap();
                t = 5_100;
            }
            // Level, 10° and 40° (both inside), 58° (past the limit, a
            // fault), back to 20°; each held 20 s, then checked 21 times
            // over the next second.
            for sample in [
                [0.0, 0.0, 1.0],
                [0.17, -0.05, 0.98],
                [0.45, 0.45, 0.77],
                [0.6, 0.6, 0.53],
                [-0.3, 0.2, 0.93],
            ] {
                feed(&mut s, sample, t, t + 20_000, 100);
                for k in 0..=20 {
                    let now = Millis(t + 20_000 + k * 1_000 / 20);
                    match check(&s, now) {
                        Some(_) => some += 1,
                        None => none += 1,
                    }
                }
                t += 20_100;
            }
        }
        // Both kinds, for both configurations (the 58° samples give none).
        assert!(some >= 8 * 21 && none >= 2 * 21, "{some} {none}");
    }

    #[test]
    fn size_is_small_and_fixed() {
        assert!(core::mem::size_of::<TiltSensor>() <= 320);
    }

    #[test]
    fn rotate_onto_z_takes_reference_to_z() {
        let r = Vec3::new(0.1, -0.2, 0.97).normalized().unwrap();
        let z = rotate_onto_z(r, r);
        assert!((z.z - 1.0).abs() < 1e-6 && z.x.abs() < 1e-6 && z.y.abs() < 1e-6);
        let v = Vec3::new(0.3, 0.1, 0.9);
        assert!((rotate_onto_z(v, r).norm() - v.norm()).abs() < 1e-6);
    }

    #[test]
    fn mirror_mounting_rejected() {
        assert!(
            Mounting::from_axes(SignedAxis::PlusY, SignedAxis::PlusX, SignedAxis::PlusZ).is_err()
        );
        let m =
            Mounting::from_axes(SignedAxis::PlusY, SignedAxis::MinusX, SignedAxis::PlusZ).unwrap();
        assert!(m.validate().is_ok());
    }

    fn mounting(rows: [[f32; 3]; 3]) -> Mounting {
        Mounting {
            sensor_to_rig: rows,
        }
    }

    fn refused_on(m: Mounting) -> Option<Field> {
        m.validate().err().map(|e| e.field)
    }

    /// Each of the rotation conditions alone (unit rows, orthogonal rows,
    /// right-handed), broken just beyond its tolerance while the others hold.
    #[test]
    fn mounting_each_rotation_condition_refuses_alone() {
        const I: [[f32; 3]; 3] = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];
        assert_eq!(refused_on(mounting(I)), None);
        let mut cases: [([[f32; 3]; 3], &str); 7] = [(I, ""); 7];
        // A row 0.08 % too long: |r·r − 1| = 0.0016 > 1e-3, determinant off
        // by 0.0008 only (< 3e-3).
        for (i, case) in cases.iter_mut().take(3).enumerate() {
            case.0[i][i] = 1.0008;
            case.1 = "row length";
        }
        // Two rows 0.0015 from orthogonal, each of unit length within 2.3e-6.
        cases[3].0[1] = [0.0015, 1.0, 0.0];
        cases[3].1 = "rows 0 and 1";
        cases[4].0[2] = [0.0015, 0.0, 1.0];
        cases[4].1 = "rows 0 and 2";
        cases[5].0[2] = [0.0, 0.0015, 1.0];
        cases[5].1 = "rows 1 and 2";
        // A mirror image: unit, orthogonal rows, determinant −1.
        cases[6].0[2] = [0.0, 0.0, -1.0];
        cases[6].1 = "mirror";
        for (rows, what) in cases {
            assert_eq!(
                refused_on(mounting(rows)),
                Some(Field::MountingSensorToRig),
                "{what}: {rows:?}"
            );
        }
    }

    /// "Within 1e-3" includes the tolerance itself (the dot products can
    /// meet it exactly; the lengths and the determinant cannot in `f32`), and
    /// a small error inside it is accepted.
    #[test]
    fn mounting_within_tolerance_is_accepted() {
        let t = 1e-3_f32;
        for rows in [
            [[1.0, 0.0, 0.0], [t, 1.0, 0.0], [0.0, 0.0, 1.0]],
            [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [t, 0.0, 1.0]],
            [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, t, 1.0]],
            [[1.0004, 0.0, 0.0], [0.0, 0.9996, 0.0], [0.0, 0.0, 1.0004]],
        ] {
            assert_eq!(refused_on(mounting(rows)), None, "{rows:?}");
        }
        // Components beyond ±1.001 are refused before any other test.
        let e = mounting([[1.002, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
            .validate()
            .unwrap_err();
        assert_eq!(e.kind, ErrorKind::OutOfRange);
        assert!((e.max - 1.001).abs() < 1e-6);
        let e = mounting([[f32::NAN, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
            .validate()
            .unwrap_err();
        assert_eq!(e.kind, ErrorKind::NotFinite);
    }

    /// Every field of the tilt configuration, just outside its documented
    /// range, is refused under its own name; the defaults and every bound
    /// itself are accepted.
    #[test]
    fn tilt_config_each_field_refused_under_its_name() {
        let d = TiltConfig::default();
        assert_eq!(d.validate(), Ok(()));
        type Set = fn(&mut TiltConfig, f32);
        let fields: [(Field, Set, f32, f32); 11] = [
            (
                Field::TiltScaleGPerCount,
                |c, v| c.scale_g_per_count = v,
                1e-9,
                1e6,
            ),
            (
                Field::TiltFilterTauS,
                |c, v| {
                    c.filter_tau_s = v;
                    c.step_tau_s = 86_400.0;
                    c.drift_tau_s = 604_800.0;
                },
                1e-3,
                3600.0,
            ),
            (
                Field::TiltStepTauS,
                |c, v| {
                    c.step_tau_s = v;
                    c.drift_tau_s = 604_800.0;
                },
                2.0,
                86_400.0,
            ),
            (
                Field::TiltDriftTauS,
                |c, v| c.drift_tau_s = v,
                60.0,
                604_800.0,
            ),
            (Field::TiltBandMinG, |c, v| c.band_min_g = v, 0.1, 1.0),
            (Field::TiltBandMaxG, |c, v| c.band_max_g = v, 1.0, 10.0),
            (
                Field::TiltOutOfBandLimitS,
                |c, v| c.out_of_band_limit_s = v,
                0.0,
                3600.0,
            ),
            (
                Field::TiltStepLimitRad,
                |c, v| c.step_limit_rad = v,
                1e-5,
                MAX_TILT_RAD,
            ),
            (
                Field::TiltStaleAfterS,
                |c, v| c.stale_after_s = v,
                1e-3,
                86_400.0,
            ),
            (
                Field::TiltStuckAfterS,
                |c, v| c.stuck_after_s = v,
                0.0,
                86_400.0,
            ),
            (
                Field::TiltLevelCaptureS,
                |c, v| c.level_capture_s = v,
                0.0,
                3600.0,
            ),
        ];
        crate::sense::each_field_refused_under_its_name(d, TiltConfig::validate, &fields);
        // The filters' order: the step filter at least twice as slow as the
        // fast one (not merely 2 s slower), the drift filter no faster than
        // the step filter.
        let mut c = d;
        c.filter_tau_s = 4.0;
        c.step_tau_s = 7.0;
        assert_eq!(c.validate().unwrap_err().field, Field::TiltStepTauS);
        c.step_tau_s = 8.0;
        assert_eq!(c.validate(), Ok(()));
        c.drift_tau_s = 7.9;
        assert_eq!(c.validate().unwrap_err().field, Field::TiltDriftTauS);
        // A bad mounting is refused as the mounting.
        c = d;
        c.mounting = mounting([[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, -1.0]]);
        assert_eq!(c.validate().unwrap_err().field, Field::MountingSensorToRig);
    }

    #[test]
    fn lowpass_alpha_edges() {
        assert_eq!(lowpass_alpha(f32::NAN, 1.0), 0.0);
        assert_eq!(lowpass_alpha(-1.0, 1.0), 0.0);
        assert_eq!(lowpass_alpha(0.0, 1.0), 0.0);
        assert_eq!(lowpass_alpha(1.0, f32::NAN), 1.0);
        assert_eq!(lowpass_alpha(1.0, 0.0), 1.0);
        assert_eq!(lowpass_alpha(1.0, -2.0), 1.0);
        // 1 − e^(−1) (the first-order step response at one time constant).
        assert!((lowpass_alpha(2.0, 2.0) - 0.632_120_56).abs() < 1e-6);
    }

    /// The branches of `small_angle_atan2` are the documented formulas, to
    /// the bit, up to t = 1.02 (so the result never depends on the back
    /// end's arc tangent there), and the back end's `atan2` beyond.
    #[test]
    fn small_angle_atan2_uses_the_documented_formula_per_range() {
        for x in [1.0_f32, 0.37, 9.81, 1e-3] {
            for i in 0..=300_u16 {
                let t = f32::from(i) * 0.005; // 0 to 1.5
                let y = t * x;
                let got = small_angle_atan2(y, x).to_bits();
                let want = if y <= 0.42 * x {
                    atan_series(y / x)
                } else if y <= 1.02 * x {
                    2.0 * atan_series(y / (x + math::sqrt(x * x + y * y)))
                } else {
                    math::atan2(y, x)
                };
                assert_eq!(got, want.to_bits(), "y {y}, x {x}");
            }
        }
        // The series' boundary itself and just past it.
        let series = atan_series(0.42).to_bits();
        assert_eq!(small_angle_atan2(0.42, 1.0).to_bits(), series);
        let half = 2.0 * atan_series(0.43 / (1.0 + math::sqrt(1.0 + 0.43 * 0.43)));
        assert_eq!(small_angle_atan2(0.43, 1.0).to_bits(), half.to_bits());
        // x ≤ 0 (a rig past 90°) or y < 0 (never produced) go to atan2.
        for (y, x) in [
            (0.1_f32, 0.0_f32),
            (0.1, -1.0),
            (-0.1, 1.0),
            (0.0, -1.0),
            (0.0, 0.0),
        ] {
            assert_eq!(
                small_angle_atan2(y, x).to_bits(),
                math::atan2(y, x).to_bits(),
                "y {y}, x {x}"
            );
        }
    }

    #[test]
    fn specific_force_too_small_to_have_a_direction_is_refused() {
        let tiny = Vec3::new(0.0, 0.0, 1e-12);
        assert_eq!(tiny.norm(), 1e-12, "the bound itself, exactly");
        let e = tilt_of_specific_force(tiny).unwrap_err();
        assert_eq!(e.kind, ErrorKind::ZeroDirection);
        assert!(tilt_of_specific_force(Vec3::new(0.0, 0.0, 2e-12)).is_ok());
        for bad in [f32::NAN, f32::INFINITY] {
            assert!(tilt_of_specific_force(Vec3::new(0.0, bad, 1.0)).is_err());
        }
    }

    /// The shortcut answers "certainly at most the limit" for small angles
    /// over a positive `x` (so the common case needs no square root), never
    /// for a tiny or non-positive `x`, and is never wrong.
    #[test]
    fn certainly_at_most_is_taken_when_it_can_be_and_is_sound() {
        let limit = 0.008_726_646_f32; // 0.5°
                                       // 0.1° of a 1 g vector: certainly below 0.5°.
        let y = 0.001_745_f32;
        assert!(atan2_certainly_at_most(y * y, 1.0, limit));
        assert!(!atan2_certainly_at_most(y * y, 1e-7, limit));
        assert!(!atan2_certainly_at_most(0.0, -1.0, limit));
        assert!(atan2_certainly_at_most(0.0, 1e-6, limit));
        for i in 0..=400_u16 {
            let t = f32::from(i) * 2.5e-5; // 0 to 0.01 rad, both sides of 0.5°
            for x in [1.0_f32, 0.9, 2e-6] {
                let yy = t * x;
                if atan2_certainly_at_most(yy * yy, x, limit) {
                    assert!(small_angle_atan2(yy, x) <= limit, "t {t}, x {x}");
                }
            }
        }
    }

    #[test]
    fn angle_between_vectors_too_short_to_measure_is_zero() {
        // |a|·|b| = 1e-14, below the 1e-12 bound: no direction to compare.
        let a = Vec3::new(1e-7, 0.0, 0.0);
        let b = Vec3::new(0.0, 1e-7, 0.0);
        assert_eq!(angle_between(a, b), 0.0);
        // Long enough: the right angle.
        let half_pi = core::f32::consts::FRAC_PI_2;
        let a = Vec3::new(1e-5, 0.0, 0.0);
        let b = Vec3::new(0.0, 1e-5, 0.0);
        assert!((angle_between(a, b) - half_pi).abs() < 1e-6);
        // A zero or non-finite vector: 0.
        assert_eq!(angle_between(Vec3::new(0.0, 0.0, 0.0), b), 0.0);
        assert_eq!(angle_between(Vec3::new(f32::INFINITY, 0.0, 0.0), b), 0.0);
        // At the bound itself, 0.
        let a = Vec3::new(1e-6, 0.0, 0.0);
        let b = Vec3::new(0.0, 1e-6, 0.0);
        if a.norm() * b.norm() == 1e-12 {
            assert_eq!(angle_between(a, b), 0.0);
        }
        // A 3-4-5 pair: the angle is atan2(|a×b|, a·b).
        let a = Vec3::new(0.0, 0.0, 1.0);
        let b = Vec3::new(0.0, 0.6, 0.8);
        assert!((angle_between(a, b) - libm::atan2f(0.6, 0.8)).abs() < 1e-6);
    }

    fn sensor_with(config: TiltConfig) -> TiltSensor {
        TiltSensor::new(config, Millis(0)).unwrap()
    }

    /// Feeds `sample` every `step_ms` from `from_ms` to `to_ms` inclusive.
    fn feed(s: &mut TiltSensor, sample: [f32; 3], from_ms: u64, to_ms: u64, step_ms: u64) {
        let mut t = from_ms;
        while t <= to_ms {
            s.push(Millis(t), sample).unwrap();
            t += step_ms;
        }
    }

    #[test]
    fn level_capture_stores_the_mean_direction_and_refuses_a_rig_past_45_degrees() {
        let config = TiltConfig {
            reference: TiltReference::LevelReference,
            level_capture_s: 2.0,
            ..TiltConfig::default()
        };
        // A sensor 0.6° off true: the capture takes that as level.
        let off = [0.01_f32, 0.0, 1.0];
        let mut s = sensor_with(config);
        assert_eq!(s.level_reference(), None);
        assert_eq!(s.tilt(), None, "no reference yet");
        s.start_level_capture(Millis(0));
        feed(&mut s, off, 0, 1900, 100);
        assert_eq!(s.level_capture(), LevelCapture::InProgress);
        feed(&mut s, off, 2000, 2000, 100);
        assert_eq!(s.level_capture(), LevelCapture::Done);
        let r = s.level_reference().unwrap();
        let want = Vec3::from_array(off).normalized().unwrap();
        assert!((r - want).norm() < 1e-6, "{r:?}");
        assert!(s.tilt().unwrap().magnitude_rad < 1e-5);

        // Captured while standing 53° over (in band: |a| = 1 g): refused.
        let mut s = sensor_with(config);
        s.start_level_capture(Millis(0));
        feed(&mut s, [0.8, 0.0, 0.6], 0, 2000, 100);
        assert_eq!(s.level_capture(), LevelCapture::Failed);
        assert_eq!(s.level_reference(), None);
    }

    #[test]
    fn a_stored_level_reference_is_checked_then_used() {
        let config = TiltConfig {
            reference: TiltReference::LevelReference,
            ..TiltConfig::default()
        };
        let mut s = sensor_with(config);
        let e = s.set_level_reference(Vec3::ZERO).unwrap_err();
        assert_eq!(e.kind, ErrorKind::ZeroDirection);
        let e = s.set_level_reference(Vec3::new(0.8, 0.0, 0.6)).unwrap_err();
        assert_eq!(e.field, Field::TiltLevelReferenceZ);
        assert_eq!(s.level_reference(), None, "a refused reference is not kept");
        assert_eq!(s.level_capture(), LevelCapture::Idle);

        s.set_level_reference(Vec3::new(0.0, 0.02, 2.0)).unwrap();
        assert_eq!(s.level_capture(), LevelCapture::Done);
        let r = s.level_reference().unwrap();
        assert!((r.norm() - 1.0).abs() < 1e-6 && (r.y - 0.01).abs() < 1e-4);
        // A sample along the reference reads level.
        s.push(Millis(0), [0.0, 0.01, 1.0]).unwrap();
        assert!(s.tilt().unwrap().magnitude_rad < 1e-4);
    }

    #[test]
    fn drift_rate_is_the_fast_to_slow_angle_over_the_filters_lag() {
        let c = TiltConfig::default();
        let mut s = sensor_with(c);
        assert_eq!(s.drift_rate_rad_per_s(), 0.0);
        feed(&mut s, [0.0, 0.0, 1.0], 0, 10_000, 100);
        assert!(s.drift_rate_rad_per_s() < 1e-9);
        // A 1° step: fast follows within seconds, slow (30 min) barely moves.
        feed(&mut s, [0.017_452, 0.0, 0.999_848], 10_100, 20_000, 100);
        let angle = angle_between(s.fast_g, s.slow_g);
        assert!(angle > 0.01, "{angle}");
        let want = angle / (c.drift_tau_s - c.filter_tau_s);
        assert_eq!(s.drift_rate_rad_per_s(), want);
    }

    #[test]
    fn last_magnitude_is_that_of_the_latest_sample_in_band_or_not() {
        let mut s = sensor_with(TiltConfig::default());
        assert!(s.last_magnitude_g().is_nan());
        s.push(Millis(0), [0.0, 0.0, 1.1]).unwrap();
        assert!((s.last_magnitude_g() - 1.1).abs() < 1e-6);
        assert!(s.push(Millis(10), [0.0, 0.0, 2.0]).is_err());
        assert!((s.last_magnitude_g() - 2.0).abs() < 1e-6);
    }

    fn has(set: &FaultSet, class: &str) -> bool {
        set.iter().any(|f| f.class_code() == class)
    }

    /// Stale and stuck are "longer than" their limits: exactly at the limit
    /// is not yet a fault, one millisecond more is.
    #[test]
    fn stale_and_stuck_start_one_millisecond_past_their_limits() {
        let c = TiltConfig::default(); // stale 5 s, stuck 60 s
        let mut s = sensor_with(c);
        s.push(Millis(1000), [0.0, 0.0, 1.0]).unwrap();
        assert!(!has(&s.faults(Millis(6000)), "stale"));
        assert!(has(&s.faults(Millis(6001)), "stale"));

        let mut s = sensor_with(c);
        feed(&mut s, [0.0, 0.0, 1.0], 0, 60_000, 1000);
        assert!(!has(&s.faults(Millis(60_000)), "stuck"));
        s.push(Millis(60_001), [0.0, 0.0, 1.0]).unwrap();
        let f = s.faults(Millis(60_001));
        assert!(has(&f, "stuck"), "{f:?}");
        // A changed reading clears it.
        s.push(Millis(60_100), [0.0, 0.0, 1.000_001]).unwrap();
        assert!(!has(&s.faults(Millis(60_100)), "stuck"));
    }

    /// A tilt past 45° along a diagonal (both horizontal components large)
    /// is a fault: the shortcut must not pass it.
    #[test]
    fn tilt_beyond_the_limit_along_a_diagonal_is_a_fault() {
        // |a| = 1.0 g, tilt atan2(0.849, 0.53) = 58°, toward each of the
        // four diagonals (negative components too: the shortcut's sum of
        // squares must stay a sum of squares).
        for (x, y) in [(0.6, 0.6), (-0.6, 0.6), (0.6, -0.6), (-0.6, -0.6)] {
            let mut s = sensor_with(TiltConfig::default());
            s.push(Millis(0), [x, y, 0.53]).unwrap();
            let f = s.faults(Millis(0));
            assert!(has(&f, "tilt_beyond_limit"), "({x}, {y}): {f:?}");
            assert_eq!(s.tilt(), None);
        }
        // 40° along the same diagonal is not.
        let (h, z) = (
            libm::sinf(0.698_13) / core::f32::consts::SQRT_2,
            libm::cosf(0.698_13),
        );
        let mut s = sensor_with(TiltConfig::default());
        s.push(Millis(0), [h, h, z]).unwrap();
        assert!(!has(&s.faults(Millis(0)), "tilt_beyond_limit"));
        assert!((s.tilt().unwrap().magnitude_rad - 0.698_13).abs() < 1e-4);
    }

    /// Magnitude out of band is "longer than" its limit too.
    #[test]
    fn out_of_band_starts_one_millisecond_past_its_limit() {
        let mut s = sensor_with(TiltConfig::default()); // 5 s
        s.push(Millis(0), [0.0, 0.0, 1.0]).unwrap();
        let mut t = 100;
        while t <= 5001 {
            assert!(s.push(Millis(t), [0.0, 0.0, 1.5]).is_err());
            let f = s.faults(Millis(t));
            assert_eq!(
                has(&f, "magnitude_out_of_band"),
                t > 5000,
                "t {t} ms: {f:?}"
            );
            t = if t == 5000 { 5001 } else { t + 100 };
        }
    }

    #[test]
    fn age_is_the_time_since_the_last_accepted_sample() {
        let mut s = sensor_with(TiltConfig::default());
        assert_eq!(s.age_s(Millis(500)), None);
        s.push(Millis(1000), [0.0, 0.0, 1.0]).unwrap();
        assert_eq!(s.age_s(Millis(3500)), Some(2.5));
        // A rejected sample does not count as accepted.
        assert!(s.push(Millis(3000), [0.0, 0.0, 3.0]).is_err());
        assert_eq!(s.age_s(Millis(3500)), Some(2.5));
    }
}
