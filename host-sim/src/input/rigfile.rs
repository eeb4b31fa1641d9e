//! The rig file: a TOML description of a telescope rig, read into the core's
//! [`standfast::rig::RigSpec`] and [`standfast::guard::GuardConfig`].
//!
//! # Units
//! Every quantity accepts a number or a string with a unit (`"18 lb"`,
//! `"45 in"`, `"1.1 m"`, `"30 mph"`, `"12 N m"`, `"47.3 deg"`; see
//! [`crate::input::units`]). A plain number is in the SI unit of its dimension (m,
//! kg, N, N m, s) **except angles: a plain number is in degrees** (the core
//! works in radians; the conversion is done here).
//!
//! # Sections
//! Every key with its unit, default and range, for users:
//! `host-sim/RIG-FILE.md` (tested against this loader by
//! `tests/sim/rig_reference.rs`). In short:
//! ```toml
//! [site]
//! latitude = "47.3 deg"          # −90 to 90 deg, north positive
//! elevation = "420 m"            # for the air density (ISA), default 0 m
//!
//! [support]
//! friction = 0.45                # static foot–ground friction, 0 to 2
//! tripod = { foot_circle_radius = "0.475 m", first_leg_azimuth = "0 deg" }
//! # or tripod = { leg_spread = "0.82 m", ... }, or a list of feet:
//! # feet = [ { x = 0.5, y = 0.0, tie_down = "0 N" }, ... ]
//! tie_down = "0 N"               # tie-down pull per tripod foot
//!
//! [legs]                         # optional: tripod legs for mass and wind
//! mass = "1.2 kg"; diameter = "35 mm"; top_height = "1.0 m"; top_radius = "0.1 m"
//!
//! [mount]
//! kind = "equatorial"            # or "alt_azimuth"
//! axis_origin = [0, 0, "1.25 m"] # or height = "1.25 m" (origin above the centre)
//!
//! [[body]]                       # head, payload, accessories (up to 12)
//! label = "tube"; stage = "secondary"; mass = "8 kg"; cg = [0.15, 0.1, 0]
//! shape = { kind = "cylinder", diameter = "0.13 m", length = "0.8 m", axis = [0, 1, 0] }
//! # or shape = { kind = "box", size = [0.2, 0.2, 0.3] }; centre = [...] (default: cg)
//! drag_coefficient = 1.0; under_cover = true; mass_model = "shell" # point | solid | shell
//! end_drag_coefficient = 1.1     # cylinders: on the end area π·d²/4 (default by l/d)
//! # mass = 0 with a shape: a drag-only surface (sign, dew shield, cable tray)
//!
//! [[counterweight]]  mass, distance, diameter, thickness,
//!                    drag_coefficient (of the disc's face; default by l/d)
//! [shaft]            mass, length, diameter,
//!                    thread = "M12" (optional, ISO coarse thread at the root),
//!                    material = "6061-T6" (see [`SHAFT_MATERIALS`]) or
//!                    yield_strength_mpa = 240 (a plain number in MPa)
//! [cover]            mass, size = [s, p, n], centre = [s, p, n], drag_coefficient
//! [[ballast]]        mass, position = [x, y, z]
//! [drives]           primary = { rated, repeated_peak, momentary_peak }, secondary = {...},
//!                    slew_acceleration = 0.5   # rad/s²
//! [guard]            watch_utilisation, park_utilisation, alarm_utilisation,
//!                    drive_park_utilisation, clear_ratio, dwell, time_to_park,
//!                    gust_allowance, tilt_margin_alarm, fault_clear
//! [sensor]           accel_scale = 6.1e-5        # accelerometer g per count
//!                    accel_axes = ["+x", "+y", "+z"] # sensor axis along rig x, y, z
//!                    tilt_filter = "1 s"         # tilt filter time constant
//!                    anemometer_height = "3 m"; rig_height = "1.2 m"
//!                    terrain = "II"              # EN 1991-1-4 category 0, I, II, III, IV
//!                    wind_stale = "10 s"         # no anemometer sample for this long: fault
//!                    wind_max = "100 m/s"        # highest sample accepted (larger: a fault);
//!                                                # at rig height, times gust_factor for a
//!                                                # station of means, at most the model's 100 m/s
//!                    wind_source = "samples"     # or "ten_minute_means" (a station
//!                                                # reporting only means; wind_stale >= 600 s)
//!                    gust_factor = 1.45          # gust / ten-minute mean for such a station
//! [shaft_joint]      engagement = "14 mm", housing = "6061-T6" (or
//!                    housing_yield_strength_mpa): the [shaft] thread in the mount's housing
//! [[joint]]          label, height (joint plane above ground), thread = "M6",
//!                    bolts = 3 and bolt_circle = "60 mm" (a diameter; phase) or
//!                    positions = [[x, y], ...] (rig x east, y north), class = "8.8"
//!                    or material, engagement, tapped (material; default a nut),
//!                    heel = "45 mm" (the flange tips about its edge; default the centre)
//! [measured]         mass, cg = [x, y, z] (rig frame, home pose, level), mass_uncertainty,
//!                    cg_uncertainty, cover_fitted = false, note: a weighed centre of
//!                    gravity (written by `standfast weigh`; see [`MeasuredNote`])
//! [log]              the log profile (read by [`crate::input::log`], ignored here)
//! ```
//! Frames and sign conventions are the core's: rig frame x east, y north, z
//! up (see `standfast::frame`); stage frames in `standfast::mount`.
//!
//! Unknown keys are an error naming the key. Every error names the file,
//! line, key, value as written and the accepted range.

use std::collections::HashMap;
use std::ops::Range;
use std::path::Path;

use serde::de::{self, Deserializer, Visitor};
use serde::Deserialize;
use standfast::air::Air;
use standfast::bounded;
use standfast::drive::{DriveRating, Drives};
use standfast::guard::{GuardConfig, WindSource};
use standfast::hardware::{material, IsoThread, Material};
use standfast::mount::{MountGeometry, MountKind};
use standfast::rig::{
    BallastSpec, BodySpec, CounterweightSpec, CoverSpec, LegsSpec, MassModel, Rig, RigSpec,
    ShaftSpec, Stage,
};
use standfast::sense::{Mounting, SignedAxis, TerrainCategory};
use standfast::shape::{Exposure, Shape};
use standfast::support::{Foot, Support};
use toml::Spanned;

use crate::input::core_error::core_problem;
use crate::input::error::FileError;
use crate::input::located::{fmt_g, Checker, InputError, SourceText};
use crate::input::units::f32_of as f;
use crate::input::units::{Angle, Duration, Force, Length, Mass, Speed, Torque};

/// An angle as written in the rig file: a plain number is in **degrees**, a
/// string may carry any angle unit. Held in radians.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Degrees(pub f64);

struct DegVisitor;

impl Visitor<'_> for DegVisitor {
    type Value = Degrees;
    fn expecting(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("an angle as a number in degrees or a string with a unit (deg, rad, arcmin)")
    }
    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Degrees, E> {
        if v.is_finite() {
            Ok(Degrees(v.to_radians()))
        } else {
            Err(E::custom("not a finite number"))
        }
    }
    #[allow(clippy::cast_precision_loss)] // small integers in a file
    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Degrees, E> {
        Ok(Degrees((v as f64).to_radians()))
    }
    #[allow(clippy::cast_precision_loss)]
    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Degrees, E> {
        Ok(Degrees((v as f64).to_radians()))
    }
    fn visit_str<E: de::Error>(self, v: &str) -> Result<Degrees, E> {
        Angle::parse_or(v, "deg")
            .map(|a| Degrees(a.si()))
            .map_err(E::custom)
    }
}

impl<'de> Deserialize<'de> for Degrees {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Degrees, D::Error> {
        d.deserialize_any(DegVisitor)
    }
}

type S<T> = Spanned<T>;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct FileSpec {
    site: S<SiteSec>,
    support: S<SupportSec>,
    legs: Option<S<LegsSec>>,
    mount: S<MountSec>,
    #[serde(default)]
    body: Vec<S<BodySec>>,
    #[serde(default)]
    counterweight: Vec<S<CwSec>>,
    shaft: Option<S<ShaftSec>>,
    cover: Option<S<CoverSec>>,
    #[serde(default)]
    ballast: Vec<S<BallastSec>>,
    drives: Option<S<DrivesSec>>,
    measured: Option<S<MeasuredSec>>,
    shaft_joint: Option<S<ShaftJointSec>>,
    #[serde(default)]
    joint: Vec<S<JointSec>>,
    guard: Option<S<GuardSec>>,
    sensor: Option<S<SensorSec>>,
    /// The log profile, read by [`crate::input::log`].
    #[allow(dead_code)]
    log: Option<toml::Value>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct SiteSec {
    latitude: S<Degrees>,
    elevation: Option<S<Length>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct SupportSec {
    friction: S<f64>,
    feet: Option<S<Vec<S<FootSec>>>>,
    tripod: Option<S<TripodSec>>,
    tie_down: Option<S<Force>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct FootSec {
    x: S<Length>,
    y: S<Length>,
    tie_down: Option<S<Force>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct TripodSec {
    foot_circle_radius: Option<S<Length>>,
    leg_spread: Option<S<Length>>,
    #[serde(default)]
    first_leg_azimuth: Option<S<Degrees>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct LegsSec {
    mass: S<Mass>,
    diameter: S<Length>,
    top_height: S<Length>,
    top_radius: S<Length>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct MountSec {
    kind: S<String>,
    axis_origin: Option<S<[Length; 3]>>,
    height: Option<S<Length>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct BodySec {
    label: Option<S<String>>,
    stage: Option<S<String>>,
    mass: S<Mass>,
    cg: S<[Length; 3]>,
    shape: Option<S<ShapeSec>>,
    centre: Option<S<[Length; 3]>>,
    drag_coefficient: Option<S<f64>>,
    end_drag_coefficient: Option<S<f64>>,
    #[serde(default)]
    under_cover: bool,
    mass_model: Option<S<String>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct ShapeSec {
    kind: S<String>,
    diameter: Option<S<Length>>,
    length: Option<S<Length>>,
    axis: Option<S<[f64; 3]>>,
    size: Option<S<[Length; 3]>>,
    /// A box's first and second edge directions in its stage frame.
    edges: Option<S<[[f64; 3]; 2]>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct CwSec {
    mass: S<Mass>,
    distance: S<Length>,
    diameter: S<Length>,
    thickness: S<Length>,
    drag_coefficient: Option<S<f64>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct ShaftSec {
    mass: S<Mass>,
    length: S<Length>,
    diameter: S<Length>,
    thread: Option<S<String>>,
    material: Option<S<String>>,
    yield_strength_mpa: Option<S<f64>>,
}

/// Materials accepted by name under `[shaft] material`, with the core's
/// listed value used (minimums where the core lists one).
pub const SHAFT_MATERIALS: [(&str, &str, Material); 7] = [
    (
        "6061-T6",
        "6061-T6 extrusion (min, ASTM B221)",
        material::AL_6061_T6_EXTRUSION_MIN,
    ),
    (
        "6063-T6",
        "6063-T6 extrusion (min, ASTM B221)",
        material::AL_6063_T6_EXTRUSION_MIN,
    ),
    (
        "6082-T6",
        "6082-T6 bar 20-150 mm (min, EN 755-2)",
        material::AL_6082_T6_THICK_MIN,
    ),
    (
        "7075-T6",
        "7075-T6 bar <= 25 mm (min, EN 755-2)",
        material::AL_7075_T6_BAR_MIN,
    ),
    (
        "S235",
        "S235JR <= 16 mm (min, EN 10025-2)",
        material::STEEL_S235_MIN,
    ),
    (
        "S355",
        "S355JR <= 16 mm (min, EN 10025-2)",
        material::STEEL_S355_MIN,
    ),
    (
        "304",
        "304 annealed bar (min, ASTM A276)",
        material::STAINLESS_304_ANNEALED_MIN,
    ),
];

/// The counterweight shaft's hardware, for the bending check at its root.
#[derive(Clone, Debug)]
pub struct ShaftHardware {
    /// ISO metric coarse thread at the shaft root (where it screws into the
    /// head), when given; the root section is then the thread's minor
    /// diameter, otherwise the plain shaft diameter.
    pub thread: Option<IsoThread>,
    /// The thread as written (for example `M12`).
    pub thread_name: Option<String>,
    /// The shaft material.
    pub material: Material,
    /// What the material is (a listed name, or the yield strength given).
    pub material_label: String,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct CoverSec {
    mass: S<Mass>,
    size: S<[Length; 3]>,
    centre: S<[Length; 3]>,
    drag_coefficient: Option<S<f64>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct BallastSec {
    mass: S<Mass>,
    position: S<[Length; 3]>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RatingSec {
    rated: S<Torque>,
    repeated_peak: S<Torque>,
    momentary_peak: S<Torque>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct DrivesSec {
    primary: S<RatingSec>,
    secondary: S<RatingSec>,
    slew_acceleration: Option<S<f64>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct GuardSec {
    watch_utilisation: Option<S<f64>>,
    park_utilisation: Option<S<f64>>,
    alarm_utilisation: Option<S<f64>>,
    drive_park_utilisation: Option<S<f64>>,
    clear_ratio: Option<S<f64>>,
    dwell: Option<S<Duration>>,
    time_to_park: Option<S<Duration>>,
    gust_allowance: Option<S<f64>>,
    tilt_margin_alarm: Option<S<Degrees>>,
    fault_clear: Option<S<Duration>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct SensorSec {
    accel_scale: Option<S<f64>>,
    accel_axes: Option<S<[S<String>; 3]>>,
    tilt_filter: Option<S<Duration>>,
    anemometer_height: Option<S<Length>>,
    rig_height: Option<S<Length>>,
    terrain: Option<S<String>>,
    wind_stale: Option<S<Duration>>,
    wind_max: Option<S<Speed>>,
    wind_source: Option<S<String>>,
    gust_factor: Option<S<f64>>,
}

/// A rig file, read and checked.
#[derive(Clone, Debug)]
pub struct LoadedRig {
    /// The file name as given.
    pub file: String,
    /// The rig description for the core.
    pub spec: RigSpec,
    /// The validated rig.
    pub rig: Rig,
    /// Guard thresholds (the core's defaults where the file gives none).
    pub guard: GuardConfig,
    /// Site elevation, metres above sea level.
    pub elevation_m: f32,
    /// Counterweight-shaft hardware, when `[shaft]` names a material or a
    /// yield strength.
    pub shaft_hardware: Option<ShaftHardware>,
    /// Air of the International Standard Atmosphere at the site elevation.
    pub air: Air,
    /// The `[measured]` section (a weighed centre of gravity), when given:
    /// `rig` then carries it (see [`standfast::rig::Rig::with_measured_centre`]).
    pub measured: Option<MeasuredNote>,
    /// Attachment hardware to check (`[shaft_joint]`, `[[joint]]`).
    pub hardware: AttachmentHardware,
    /// Whether the guard takes the logs' cover samples: true for a rig
    /// file; false for a what-if variant that sets the cover itself
    /// (`cover=on` or `cover=off`), whose guard then sees no cover input
    /// (a logged cover on a rig without one would otherwise be a fault on
    /// every row).
    pub cover_input: bool,
}

/// `[shaft_joint]`: the counterweight shaft's thread in the mount's housing.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct ShaftJointSec {
    engagement: S<Length>,
    housing: Option<S<String>>,
    housing_yield_strength_mpa: Option<S<f64>>,
}

/// `[[joint]]`: a bolted joint that holds the mount head or the pier or
/// tripod head.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct JointSec {
    label: S<String>,
    height: S<Length>,
    thread: S<String>,
    bolts: Option<S<i64>>,
    bolt_circle: Option<S<Length>>,
    phase: Option<S<Degrees>>,
    positions: Option<S<Vec<[Length; 2]>>>,
    class: Option<S<String>>,
    material: Option<S<String>>,
    engagement: S<Length>,
    tapped: Option<S<String>>,
    heel: Option<S<Length>>,
}

/// A threaded joint's thread, screw material, engagement and the material
/// it is screwed into.
#[derive(Clone, Debug)]
pub struct ThreadJoint {
    /// ISO metric coarse thread.
    pub thread: IsoThread,
    /// The thread as written.
    pub thread_name: String,
    /// Material of the screw (external thread).
    pub screw: Material,
    /// What the screw material is.
    pub screw_label: String,
    /// Material of the part with the internal thread (housing, tapped
    /// plate, or a nut).
    pub internal: Material,
    /// What that material is.
    pub internal_label: String,
    /// Length of thread engagement, mm.
    pub engagement_mm: f32,
}

/// A bolted joint in a horizontal plane of the rig.
#[derive(Clone, Debug)]
pub struct BoltedJoint {
    /// Name for reports.
    pub label: String,
    /// Height of the joint plane above the ground, m (rig frame).
    pub height_m: f32,
    /// Screw positions, mm, in the rig frame's x (east) and y (north)
    /// directions about the vertical axis.
    pub pattern: standfast::hardware::BoltPattern,
    /// The screws' thread joint.
    pub screws: ThreadJoint,
    /// Where the flange pivots.
    pub pivot: standfast::hardware::bolt::PivotLine,
}

/// The attachment hardware a rig file describes.
#[derive(Clone, Debug, Default)]
pub struct AttachmentHardware {
    /// The counterweight shaft's thread in the housing (`[shaft_joint]`,
    /// with `[shaft]` thread and material).
    pub shaft_joint: Option<ThreadJoint>,
    /// Bolted joints (`[[joint]]`).
    pub joints: Vec<BoltedJoint>,
}

/// A material by listed name or by a yield strength in MPa.
fn material_by_name(
    src: &SourceText,
    key: &str,
    name: Option<&S<String>>,
    yield_mpa: Option<&S<f64>>,
) -> Result<Option<(Material, String)>, InputError> {
    let ck = src.checker();
    match (name, yield_mpa) {
        (Some(m), None) => {
            let names: Vec<&str> = SHAFT_MATERIALS.iter().map(|x| x.0).collect();
            let n = ck.one_of(key, m, &names)?;
            Ok(SHAFT_MATERIALS
                .iter()
                .find(|x| x.0 == n)
                .map(|(_, label, mat)| (*mat, (*label).to_owned())))
        }
        (None, Some(y)) => {
            let y = ck.range_f64(
                &format!("{key}_yield_strength_mpa"),
                y,
                1.0,
                f64::from(material::MAX_STRENGTH_MPA),
            )?;
            let mat = Material::new(f(y), f(y)).map_err(|e| InputError {
                at: None,
                key: Some(key.to_owned()),
                value: None,
                problem: e.to_string(),
            })?;
            Ok(Some((
                mat,
                format!("yield strength {} MPa (as given)", fmt_g(y)),
            )))
        }
        (Some(m), Some(_)) => Err(ck.error(
            key,
            m.span(),
            "give the material by name or by yield strength, not both",
        )),
        (None, None) => Ok(None),
    }
}

fn thread_by_name(src: &SourceText, key: &str, t: &S<String>) -> Result<IsoThread, InputError> {
    IsoThread::by_name(t.get_ref()).map_err(|_| {
        src.checker().error(
            key,
            t.span(),
            format!(
                "not an ISO metric coarse thread (accepted: M{} to M{}, for example \"M8\")",
                fmt_g(f64::from(standfast::hardware::thread::MIN_NOMINAL_MM)),
                fmt_g(f64::from(standfast::hardware::thread::MAX_NOMINAL_MM))
            ),
        )
    })
}

fn engagement_mm(src: &SourceText, key: &str, l: &S<Length>) -> Result<f32, InputError> {
    Ok(f(src
        .checker()
        .range(key, l, Length::from_m(0.001), Length::from_m(0.2), "mm")?
        .m())
        * 1000.0)
}

/// Reads `[shaft_joint]` and `[[joint]]`.
fn attachment_hardware(
    src: &SourceText,
    file: &FileSpec,
    shaft: Option<&ShaftHardware>,
) -> Result<AttachmentHardware, InputError> {
    let mut out = AttachmentHardware::default();
    if let Some(sj) = &file.shaft_joint {
        out.shaft_joint = Some(shaft_joint(src, sj, shaft)?);
    }
    for (i, j) in file.joint.iter().enumerate() {
        out.joints.push(bolted_joint(src, i, j)?);
    }
    Ok(out)
}

/// Reads `[shaft_joint]`: the counterweight shaft screwed into its housing.
fn shaft_joint(
    src: &SourceText,
    sj: &S<ShaftJointSec>,
    shaft: Option<&ShaftHardware>,
) -> Result<ThreadJoint, InputError> {
    let ck = src.checker();
    let g = sj.get_ref();
    let (Some(hw), Some(thread)) = (shaft, shaft.and_then(|h| h.thread.as_ref())) else {
        return Err(ck.error(
            "shaft_joint",
            sj.span(),
            "the shaft joint needs [shaft] with `thread` and `material` (or \
             `yield_strength_mpa`): the shaft is the screw",
        ));
    };
    let Some((internal, internal_label)) = material_by_name(
        src,
        "shaft_joint.housing",
        g.housing.as_ref(),
        g.housing_yield_strength_mpa.as_ref(),
    )?
    else {
        return Err(ck.error(
            "shaft_joint",
            sj.span(),
            "give the housing's material: `housing` (a listed name) or \
             `housing_yield_strength_mpa`",
        ));
    };
    Ok(ThreadJoint {
        thread: *thread,
        thread_name: hw.thread_name.clone().unwrap_or_default(),
        screw: hw.material,
        screw_label: hw.material_label.clone(),
        internal,
        internal_label,
        engagement_mm: engagement_mm(src, "shaft_joint.engagement", &g.engagement)?,
    })
}

/// Reads `joint[i]`: a bolted joint's thread, pattern, screws, tapped part
/// and pivot line.
fn bolted_joint(src: &SourceText, i: usize, j: &S<JointSec>) -> Result<BoltedJoint, InputError> {
    let ck = src.checker();
    let key = format!("joint[{i}]");
    let g = j.get_ref();
    let thread = thread_by_name(src, &format!("{key}.thread"), &g.thread)?;
    let height_m = f(ck
        .range(
            &format!("{key}.height"),
            &g.height,
            Length::from_m(0.0),
            Length::from_m(f64::from(standfast::rig::MAX_OFFSET_M)),
            "m",
        )?
        .m());
    let bad = |problem: String| ck.error(&key, j.span(), problem);
    let pattern = match (&g.bolts, &g.bolt_circle, &g.positions) {
        (Some(n), Some(d), None) => {
            let count = usize::try_from(*n.get_ref())
                .ok()
                .filter(|c| (3..=standfast::hardware::bolt::MAX_SCREWS).contains(c))
                .ok_or_else(|| {
                    ck.error(
                        &format!("{key}.bolts"),
                        n.span(),
                        format!(
                            "accepted: 3 to {} bolts on a circle (or give `positions`)",
                            standfast::hardware::bolt::MAX_SCREWS
                        ),
                    )
                })?;
            let diameter_mm = f(ck
                .range(
                    &format!("{key}.bolt_circle"),
                    d,
                    Length::from_m(0.005),
                    Length::from_m(2.0),
                    "mm",
                )?
                .m())
                * 1000.0;
            let phase = g.phase.as_ref().map_or(0.0, |p| f(p.get_ref().0));
            standfast::hardware::BoltPattern::circle(count, diameter_mm / 2.0, phase)
                .map_err(|e| bad(e.to_string()))?
        }
        (None, None, Some(p)) => {
            let pts: Vec<[f32; 2]> = p
                .get_ref()
                .iter()
                .map(|[x, y]| [f(x.m()) * 1000.0, f(y.m()) * 1000.0])
                .collect();
            standfast::hardware::BoltPattern::new(&pts)
                .map_err(|e| ck.error(&format!("{key}.positions"), p.span(), e.to_string()))?
        }
        _ => {
            return Err(bad(
                "give `bolts` and `bolt_circle` (a diameter), or `positions` = [[x, y], ...]"
                    .into(),
            ))
        }
    };
    let (screw, screw_label) = match (&g.class, &g.material) {
        (Some(c), None) => {
            ck.one_of(&format!("{key}.class"), c, &["8.8"])?;
            (
                Material::bolt_class_8_8(thread.nominal_mm),
                "property class 8.8 (ISO 898-1 minimum)".to_owned(),
            )
        }
        (None, Some(_)) => {
            material_by_name(src, &format!("{key}.material"), g.material.as_ref(), None)?
                .ok_or_else(|| bad("unknown material".into()))?
        }
        _ => {
            return Err(bad(
                "give the screws' `class` (\"8.8\") or `material` (a listed name)".into(),
            ))
        }
    };
    let (internal, internal_label) =
        match material_by_name(src, &format!("{key}.tapped"), g.tapped.as_ref(), None)? {
            Some(m) => m,
            None => (
                screw,
                format!("a nut of the screws' material ({screw_label})"),
            ),
        };
    let pivot = match &g.heel {
        Some(h) => standfast::hardware::bolt::PivotLine::Heel {
            offset_mm: f(ck
                .range(
                    &format!("{key}.heel"),
                    h,
                    Length::from_m(0.0),
                    Length::from_m(2.0),
                    "mm",
                )?
                .m())
                * 1000.0,
        },
        None => standfast::hardware::bolt::PivotLine::Centroid,
    };
    Ok(BoltedJoint {
        label: g.label.get_ref().clone(),
        height_m,
        pattern,
        screws: ThreadJoint {
            thread,
            thread_name: g.thread.get_ref().trim().to_owned(),
            screw,
            screw_label,
            internal,
            internal_label,
            engagement_mm: engagement_mm(src, &format!("{key}.engagement"), &g.engagement)?,
        },
        pivot,
    })
}

/// The `[measured]` section: the whole rig weighed (see `standfast weigh`).
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct MeasuredSec {
    mass: S<Mass>,
    cg: S<[Length; 3]>,
    mass_uncertainty: Option<S<Mass>>,
    cg_uncertainty: Option<S<[Length; 3]>>,
    #[serde(default)]
    cover_fitted: bool,
    note: Option<S<String>>,
}

/// A weighed centre of gravity applied to the rig, with the figures the
/// bodies imply for comparison. Rig frame (x east, y north, z up), home pose,
/// level ground.
#[derive(Clone, Debug, serde::Serialize)]
pub struct MeasuredNote {
    /// Weighed total mass, kg.
    pub mass_kg: f32,
    /// Its standard uncertainty, kg, when given.
    pub mass_uncertainty_kg: Option<f32>,
    /// Weighed centre of gravity, m.
    pub centre_m: [f32; 3],
    /// Its standard uncertainty per axis, m, when given.
    pub centre_uncertainty_m: Option<[f32; 3]>,
    /// True when the cover was fitted while weighing.
    pub cover_fitted: bool,
    /// Total mass the bodies imply in the same pose and cover state, kg.
    pub modelled_mass_kg: f32,
    /// Centre of gravity the bodies imply, m.
    pub modelled_centre_m: [f32; 3],
    /// Weighed minus modelled centre, m.
    pub difference_m: [f32; 3],
    /// Mass of the ground-stage lump that replaces the ground parts' masses,
    /// kg.
    pub ground_mass_kg: f32,
    /// Free text from the file (where the figures came from).
    pub note: Option<String>,
}

/// Applies a `[measured]` section to a validated rig.
fn apply_measured(
    src: &SourceText,
    sec: &S<MeasuredSec>,
    rig: &Rig,
) -> Result<(Rig, MeasuredNote), InputError> {
    let ck = src.checker();
    let g = sec.get_ref();
    let mass = ck.range(
        "measured.mass",
        &g.mass,
        Mass::from_kg(0.001),
        Mass::from_kg(f64::from(standfast::rig::MAX_PART_MASS_KG)),
        "kg",
    )?;
    let centre = v3(g.cg.get_ref());
    let lim = f64::from(standfast::rig::MAX_OFFSET_M);
    for (i, c) in g.cg.get_ref().iter().enumerate() {
        if c.m().is_nan() || c.m().abs() > lim {
            return Err(ck.error(
                &format!("measured.cg[{i}]"),
                g.cg.span(),
                format!(
                    "{} m is outside the accepted range -{} to {} m",
                    fmt_g(c.m()),
                    fmt_g(lim),
                    fmt_g(lim)
                ),
            ));
        }
    }
    let mass_uncertainty_kg = match &g.mass_uncertainty {
        Some(u) => Some(f(ck
            .range(
                "measured.mass_uncertainty",
                u,
                Mass::from_kg(0.0),
                Mass::from_kg(mass.kg()),
                "kg",
            )?
            .kg())),
        None => None,
    };
    let centre_uncertainty_m = match &g.cg_uncertainty {
        Some(u) => Some(measured_cg_uncertainty(&ck, u, lim)?),
        None => None,
    };
    let home = rig.mount().home_pose();
    let modelled = rig
        .place(home, standfast::Tilt::LEVEL, g.cover_fitted)
        .map_err(|e| ck.error("measured", sec.span(), e.to_string()))?;
    let modelled_mass_kg = modelled.mass_kg();
    let modelled_centre = modelled.centre_of_gravity_m();
    let mass_kg = f(mass.kg());
    let out = rig
        .with_measured_centre(
            mass_kg,
            standfast::Vec3::from_array(centre),
            home,
            g.cover_fitted,
        )
        .map_err(|e| {
            ck.error(
                "measured",
                sec.span(),
                measured_problem(&e, mass_kg, g.cover_fitted, lim),
            )
        })?;
    let placed = out
        .place(home, standfast::Tilt::LEVEL, g.cover_fitted)
        .map_err(|e| ck.error("measured", sec.span(), e.to_string()))?;
    let ground_mass_kg = placed
        .parts()
        .filter(|p| p.part.role == standfast::rig::PartRole::Measured)
        .map(|p| p.part.mass_kg)
        .sum();
    let d = standfast::Vec3::from_array(centre) - modelled_centre;
    Ok((
        out,
        MeasuredNote {
            mass_kg,
            mass_uncertainty_kg,
            centre_m: centre,
            centre_uncertainty_m,
            cover_fitted: g.cover_fitted,
            modelled_mass_kg,
            modelled_centre_m: modelled_centre.to_array(),
            difference_m: d.to_array(),
            ground_mass_kg,
            note: g.note.as_ref().map(|n| n.get_ref().clone()),
        },
    ))
}

/// `measured.cg_uncertainty`: each 0 to `lim` m.
fn measured_cg_uncertainty(
    ck: &Checker<'_>,
    u: &S<[Length; 3]>,
    lim: f64,
) -> Result<[f32; 3], InputError> {
    for (i, c) in u.get_ref().iter().enumerate() {
        if c.m().is_nan() || c.m() < 0.0 || c.m() > lim {
            return Err(ck.error(
                &format!("measured.cg_uncertainty[{i}]"),
                u.span(),
                format!(
                    "{} m is outside the accepted range 0 to {} m",
                    fmt_g(c.m()),
                    fmt_g(lim)
                ),
            ));
        }
    }
    Ok(v3(u.get_ref()))
}

/// What is wrong when the core refuses a weighed centre, in the rig
/// file's words.
fn measured_problem(e: &standfast::Error, mass_kg: f32, cover_fitted: bool, lim: f64) -> String {
    match (e.kind, e.field.path()) {
        (standfast::ErrorKind::Inconsistent, "measured.mass_kg") => format!(
            "the weighed {} kg is not more than the {} kg of the parts that move with the \
             mount (counterweights, shaft, bodies on the primary and secondary stages{}): \
             check the weighing or those masses",
            fmt_g(f64::from(mass_kg)),
            fmt_g(f64::from(e.min - 0.001)),
            if cover_fitted { ", cover" } else { "" }
        ),
        (standfast::ErrorKind::Inconsistent, _) => format!(
            "with this centre the ground-stage parts (legs, pier, head, ballast) would \
             have their centre of gravity {} m above the ground, outside the accepted \
             range 0 to {} m: check the weighing or the moving parts' masses and centres",
            fmt_g(f64::from(e.value)),
            fmt_g(lim)
        ),
        _ => e.to_string(),
    }
}

/// A core field name and list index.
type FieldAt = (&'static str, Option<u8>);

/// Where each core field came from: `(core field, index)` → (file key, span).
#[derive(Default)]
struct Spans {
    map: HashMap<FieldAt, (String, Range<usize>)>,
    /// Keys the core reports under one field (a drive's three ratings are
    /// all `drives.primary`), told apart by the value the core read.
    by_value: Vec<(&'static str, f32, String, Range<usize>)>,
}

impl Spans {
    fn put_value(&mut self, field: &'static str, value: f32, key: String, span: Range<usize>) {
        self.by_value.push((field, value, key, span));
    }

    fn put(&mut self, field: &'static str, index: Option<usize>, key: String, span: Range<usize>) {
        let idx = index.map(|i| u8::try_from(i).unwrap_or(u8::MAX));
        self.map.entry((field, idx)).or_insert((key, span));
    }
}

fn v3(a: &[Length; 3]) -> [f32; 3] {
    [f(a[0].m()), f(a[1].m()), f(a[2].m())]
}

/// A rig file that cannot be read, or that holds a bad value.
#[derive(Debug, thiserror::Error)]
#[error(transparent)]
pub struct RigFileError(#[from] pub FileError);

/// Reads and checks a rig file.
///
/// # Errors
/// [`RigFileError`]: the file cannot be read, or an [`InputError`] naming
/// file, line, key, value and accepted range for any bad value.
pub fn load(path: &Path) -> Result<LoadedRig, RigFileError> {
    let src = SourceText::read(path)?;
    Ok(load_source(&src).map_err(FileError::Input)?)
}

/// Reads and checks a rig file already in memory: section by section, each
/// reader returning its part of the spec and recording where its keys were
/// written (for errors the core reports later by field).
///
/// # Errors
/// [`InputError`] naming file, line, key, value and accepted range.
pub fn load_source(src: &SourceText) -> Result<LoadedRig, InputError> {
    let file: FileSpec = src.parse_toml()?;
    let ck = src.checker();
    let mut sp = Spans::default();
    let SitePart {
        latitude_rad,
        elevation_m,
        air,
    } = site_section(&ck, &file.site, &mut sp)?;
    let (feet, friction_coefficient) = support_section(src, &ck, &file.support, &mut sp)?;
    let legs = legs_section(file.legs.as_ref(), &mut sp);
    let mount = mount_section(&ck, &file.mount, latitude_rad, &mut sp)?;
    let bodies = bodies_section(src, &ck, &file.body, &mut sp)?;
    let counterweights = counterweights_section(&ck, &file.counterweight, &mut sp)?;
    let shaft = shaft_section(file.shaft.as_ref(), &mut sp);
    let shaft_hardware = match &file.shaft {
        Some(s) => shaft_hardware(src, s.get_ref())?,
        None => None,
    };
    let cover = cover_section(file.cover.as_ref(), &mut sp);
    let ballast = ballast_section(&ck, &file.ballast, &mut sp)?;
    let drives = drives_section(file.drives.as_ref(), &mut sp);
    let spec = RigSpec {
        feet,
        legs,
        friction_coefficient,
        mount,
        bodies,
        counterweights,
        shaft,
        cover,
        ballast,
        drives,
    };
    let rig = Rig::new(&spec).map_err(|e| core_error(src, &sp, &e))?;
    let hardware = attachment_hardware(src, &file, shaft_hardware.as_ref())?;
    let (rig, measured) = match &file.measured {
        Some(m) => {
            let (r, note) = apply_measured(src, m, &rig)?;
            (r, Some(note))
        }
        None => (rig, None),
    };

    let mut guard = guard_config(file.guard.as_ref(), &mut sp);
    if let Some(sec) = &file.sensor {
        sensor_config(src, sec.get_ref(), &mut sp, &mut guard)?;
    }
    guard.validate().map_err(|e| core_error(src, &sp, &e))?;

    Ok(LoadedRig {
        file: src.name().to_owned(),
        spec,
        rig,
        guard,
        elevation_m,
        shaft_hardware,
        air,
        measured,
        hardware,
        cover_input: true,
    })
}

/// `[site]`: the latitude (rad, north positive), the elevation (m above
/// sea level) and the site's air (ISA at that elevation).
struct SitePart {
    latitude_rad: f32,
    elevation_m: f32,
    air: Air,
}

/// Reads `[site]`, recording where its keys were written in `sp`.
fn site_section(
    ck: &Checker<'_>,
    site: &S<SiteSec>,
    sp: &mut Spans,
) -> Result<SitePart, InputError> {
    let lat = &site.get_ref().latitude;
    sp.put(
        "mount.latitude_rad",
        None,
        "site.latitude".into(),
        lat.span(),
    );
    let elevation_m = match &site.get_ref().elevation {
        Some(e) => f(ck
            .range(
                "site.elevation",
                e,
                Length::from_m(-500.0),
                Length::from_m(11_000.0),
                "m",
            )?
            .m()),
        None => 0.0,
    };
    let air = Air::isa_at_elevation(elevation_m).map_err(|e| {
        let span = site
            .get_ref()
            .elevation
            .as_ref()
            .map_or(site.span(), Spanned::span);
        ck.error("site.elevation", span, e.to_string())
    })?;

    Ok(SitePart {
        latitude_rad: f(lat.get_ref().0),
        elevation_m,
        air,
    })
}

/// The feet of a rig (rig frame, m; tie-down pull, N).
type Feet = bounded::Vec<Foot, { standfast::support::MAX_FEET }>;

/// Reads `[support]`: the feet (a list, or a regular tripod) with their
/// tie-downs, and the foot–ground friction coefficient.
fn support_section(
    src: &SourceText,
    ck: &Checker<'_>,
    support: &S<SupportSec>,
    sp: &mut Spans,
) -> Result<(Feet, f32), InputError> {
    let sup = support.get_ref();
    sp.put(
        "rig.friction_coefficient",
        None,
        "support.friction".into(),
        sup.friction.span(),
    );
    let tie_all = sup.tie_down.as_ref().map_or(0.0, |t| f(t.get_ref().n()));
    let feet: Feet = match (&sup.feet, &sup.tripod) {
        (Some(list), None) => listed_feet(ck, list, tie_all, sp)?,
        (None, Some(t)) => tripod_feet(src, ck, t, tie_all, sp)?,
        _ => {
            return Err(ck.error(
                "support",
                support.span(),
                "give exactly one of `feet` (a list of {x, y, tie_down}) and `tripod`",
            ))
        }
    };
    if let Some(t) = &sup.tie_down {
        for i in 0..feet.len() {
            sp.put(
                "support.feet.tie_down_n",
                Some(i),
                "support.tie_down".into(),
                t.span(),
            );
        }
    }

    Ok((feet, f(*sup.friction.get_ref())))
}

/// `support.feet`: each foot's position (rig frame, m) and tie-down pull
/// (N; the section's `tie_down`, `tie_all`, unless the foot gives its own).
fn listed_feet(
    ck: &Checker<'_>,
    list: &S<Vec<S<FootSec>>>,
    tie_all: f32,
    sp: &mut Spans,
) -> Result<Feet, InputError> {
    sp.put("support.feet", None, "support.feet".into(), list.span());
    let mut v = bounded::Vec::new();
    for (i, ft) in list.get_ref().iter().enumerate() {
        let ft = ft.get_ref();
        let key = format!("support.feet[{i}]");
        sp.put(
            "support.feet.position_m",
            Some(i),
            format!("{key}.x"),
            ft.x.span(),
        );
        let tie = match &ft.tie_down {
            Some(t) => {
                sp.put(
                    "support.feet.tie_down_n",
                    Some(i),
                    format!("{key}.tie_down"),
                    t.span(),
                );
                f(t.get_ref().n())
            }
            None => tie_all,
        };
        let foot = Foot {
            position_m: [f(ft.x.get_ref().m()), f(ft.y.get_ref().m())],
            tie_down_n: tie,
        };
        if v.push(foot).is_err() {
            return Err(ck.error(
                "support.feet",
                list.span(),
                format!(
                    "more than {} feet (accepted: 3 to {})",
                    standfast::support::MAX_FEET,
                    standfast::support::MAX_FEET
                ),
            ));
        }
    }
    Ok(v)
}

/// `support.tripod`: a regular tripod from its foot circle or leg spread,
/// each foot with the section's tie-down pull `tie_all` (N).
fn tripod_feet(
    src: &SourceText,
    ck: &Checker<'_>,
    t: &S<TripodSec>,
    tie_all: f32,
    sp: &mut Spans,
) -> Result<Feet, InputError> {
    let tr = t.get_ref();
    let az = tr
        .first_leg_azimuth
        .as_ref()
        .map_or(0.0, |a| f(a.get_ref().0));
    if let Some(a) = &tr.first_leg_azimuth {
        sp.put(
            "support.first_leg_azimuth_rad",
            None,
            "support.tripod.first_leg_azimuth".into(),
            a.span(),
        );
    }
    let s = match (&tr.foot_circle_radius, &tr.leg_spread) {
        (Some(r), None) => {
            sp.put(
                "support.foot_circle_radius_m",
                None,
                "support.tripod.foot_circle_radius".into(),
                r.span(),
            );
            Support::tripod(f(r.get_ref().m()), az)
        }
        (None, Some(l)) => {
            sp.put(
                "support.leg_spread_m",
                None,
                "support.tripod.leg_spread".into(),
                l.span(),
            );
            Support::tripod_from_spread(f(l.get_ref().m()), az)
        }
        _ => {
            return Err(ck.error(
                "support.tripod",
                t.span(),
                "give exactly one of foot_circle_radius and leg_spread",
            ))
        }
    };
    let s = s.map_err(|e| core_error(src, sp, &e))?;
    Ok(s.feet()
        .iter()
        .map(|ft| Foot {
            position_m: ft.position_m,
            tie_down_n: tie_all,
        })
        .collect())
}

/// Reads `[legs]` (the tripod's legs as bodies), when given.
fn legs_section(legs: Option<&S<LegsSec>>, sp: &mut Spans) -> Option<LegsSpec> {
    legs.map(|l| {
        let g = l.get_ref();
        sp.put("legs.mass_kg", None, "legs.mass".into(), g.mass.span());
        sp.put(
            "legs.diameter_m",
            None,
            "legs.diameter".into(),
            g.diameter.span(),
        );
        sp.put(
            "legs.top_height_m",
            None,
            "legs.top_height".into(),
            g.top_height.span(),
        );
        sp.put(
            "legs.top_radius_m",
            None,
            "legs.top_radius".into(),
            g.top_radius.span(),
        );
        LegsSpec {
            mass_kg: f(g.mass.get_ref().kg()),
            diameter_m: f(g.diameter.get_ref().m()),
            top_height_m: f(g.top_height.get_ref().m()),
            top_radius_m: f(g.top_radius.get_ref().m()),
        }
    })
}

/// Reads `[mount]`: its kind and axis origin (rig frame, m), at the site's
/// latitude (rad).
fn mount_section(
    ck: &Checker<'_>,
    mount: &S<MountSec>,
    latitude_rad: f32,
    sp: &mut Spans,
) -> Result<MountGeometry, InputError> {
    let m = mount.get_ref();
    let kind = match ck.one_of("mount.kind", &m.kind, &["equatorial", "alt_azimuth"])? {
        "equatorial" => MountKind::Equatorial,
        _ => MountKind::AltAzimuth,
    };
    let origin = match (&m.axis_origin, &m.height) {
        (Some(o), None) => {
            sp.put(
                "mount.axis_origin_m",
                None,
                "mount.axis_origin".into(),
                o.span(),
            );
            v3(o.get_ref())
        }
        (None, Some(h)) => {
            sp.put("mount.axis_origin_m", None, "mount.height".into(), h.span());
            [0.0, 0.0, f(h.get_ref().m())]
        }
        _ => {
            return Err(ck.error(
                "mount",
                mount.span(),
                "give exactly one of axis_origin = [x, y, z] and height",
            ))
        }
    };
    Ok(MountGeometry {
        kind,
        latitude_rad,
        axis_origin_m: origin,
    })
}

/// Reads the `[[body]]` list: each body's mass, centre of gravity, stage,
/// mass model and wind exposure.
fn bodies_section(
    src: &SourceText,
    ck: &Checker<'_>,
    list: &[S<BodySec>],
    sp: &mut Spans,
) -> Result<bounded::Vec<BodySpec, { standfast::rig::MAX_BODIES }>, InputError> {
    let mut bodies = bounded::Vec::new();
    for (i, b) in list.iter().enumerate() {
        let key = format!("body[{i}]");
        let g = b.get_ref();
        sp.put(
            "bodies.mass_kg",
            Some(i),
            format!("{key}.mass"),
            g.mass.span(),
        );
        sp.put("bodies.cg_m", Some(i), format!("{key}.cg"), g.cg.span());
        let stage = match &g.stage {
            None => Stage::Ground,
            Some(s) => match ck.one_of(
                &format!("{key}.stage"),
                s,
                &["ground", "primary", "secondary"],
            )? {
                "primary" => Stage::Primary,
                "secondary" => Stage::Secondary,
                _ => Stage::Ground,
            },
        };
        let mass_model = match &g.mass_model {
            None => MassModel::default(),
            Some(s) => match ck.one_of(
                &format!("{key}.mass_model"),
                s,
                &["point", "solid", "shell"],
            )? {
                "point" => MassModel::Point,
                "shell" => MassModel::Shell,
                _ => MassModel::Solid,
            },
        };
        let label = match &g.label {
            Some(l) => bounded::String::try_from(l.get_ref().as_str())
                .map_err(|_| ck.error(&format!("{key}.label"), l.span(), "longer than 24 bytes"))?,
            None => bounded::String::new(),
        };
        let exposure = match &g.shape {
            None => None,
            Some(sh) => Some(exposure(
                src,
                sp,
                &key,
                Some(i),
                sh,
                g.centre
                    .as_ref()
                    .map_or(v3(g.cg.get_ref()), |c| v3(c.get_ref())),
                g.centre.as_ref().map_or(g.cg.span(), Spanned::span),
                g.drag_coefficient.as_ref(),
                g.end_drag_coefficient.as_ref(),
            )?),
        };
        if g.shape.is_none() {
            for (k, v) in [
                ("drag_coefficient", &g.drag_coefficient),
                ("end_drag_coefficient", &g.end_drag_coefficient),
            ] {
                if let Some(v) = v {
                    return Err(ck.error(
                        &format!("{key}.{k}"),
                        v.span(),
                        "a drag coefficient needs a `shape` to act on",
                    ));
                }
            }
        }
        let body = BodySpec {
            label,
            stage,
            mass_kg: f(g.mass.get_ref().kg()),
            cg_m: v3(g.cg.get_ref()),
            exposure,
            mass_model,
            under_cover: g.under_cover,
        };
        if bodies.push(body).is_err() {
            return Err(ck.error(
                &key,
                b.span(),
                format!("more than {} bodies", standfast::rig::MAX_BODIES),
            ));
        }
    }
    if let Some(b) = list.first() {
        sp.put("rig.bodies", None, "body".into(), b.span());
    }
    Ok(bodies)
}

/// Reads the `[[counterweight]]` list.
fn counterweights_section(
    ck: &Checker<'_>,
    list: &[S<CwSec>],
    sp: &mut Spans,
) -> Result<bounded::Vec<CounterweightSpec, { standfast::rig::MAX_COUNTERWEIGHTS }>, InputError> {
    let mut counterweights = bounded::Vec::new();
    for (i, c) in list.iter().enumerate() {
        let key = format!("counterweight[{i}]");
        let g = c.get_ref();
        sp.put(
            "counterweights.mass_kg",
            Some(i),
            format!("{key}.mass"),
            g.mass.span(),
        );
        sp.put(
            "counterweights.distance_m",
            Some(i),
            format!("{key}.distance"),
            g.distance.span(),
        );
        sp.put(
            "counterweights.diameter_m",
            Some(i),
            format!("{key}.diameter"),
            g.diameter.span(),
        );
        sp.put(
            "counterweights.thickness_m",
            Some(i),
            format!("{key}.thickness"),
            g.thickness.span(),
        );
        if let Some(cd) = &g.drag_coefficient {
            sp.put(
                "counterweights.drag_coefficient",
                Some(i),
                format!("{key}.drag_coefficient"),
                cd.span(),
            );
        }
        let cw = CounterweightSpec {
            mass_kg: f(g.mass.get_ref().kg()),
            distance_m: f(g.distance.get_ref().m()),
            diameter_m: f(g.diameter.get_ref().m()),
            thickness_m: f(g.thickness.get_ref().m()),
            drag_coefficient: g.drag_coefficient.as_ref().map(|d| f(*d.get_ref())),
        };
        if counterweights.push(cw).is_err() {
            return Err(ck.error(
                &key,
                c.span(),
                format!(
                    "more than {} counterweights",
                    standfast::rig::MAX_COUNTERWEIGHTS
                ),
            ));
        }
    }
    Ok(counterweights)
}

/// Reads `[shaft]` (the counterweight shaft as a body), when given.
fn shaft_section(shaft: Option<&S<ShaftSec>>, sp: &mut Spans) -> Option<ShaftSpec> {
    shaft.map(|s| {
        let g = s.get_ref();
        sp.put("shaft.mass_kg", None, "shaft.mass".into(), g.mass.span());
        sp.put(
            "shaft.length_m",
            None,
            "shaft.length".into(),
            g.length.span(),
        );
        sp.put(
            "shaft.diameter_m",
            None,
            "shaft.diameter".into(),
            g.diameter.span(),
        );
        ShaftSpec {
            mass_kg: f(g.mass.get_ref().kg()),
            length_m: f(g.length.get_ref().m()),
            diameter_m: f(g.diameter.get_ref().m()),
        }
    })
}

/// Reads `[cover]` (its mass, size and centre, rig frame, m), when given.
fn cover_section(cover: Option<&S<CoverSec>>, sp: &mut Spans) -> Option<CoverSpec> {
    cover.map(|c| {
        let g = c.get_ref();
        sp.put("cover.mass_kg", None, "cover.mass".into(), g.mass.span());
        sp.put(
            "cover.centre_m",
            None,
            "cover.centre".into(),
            g.centre.span(),
        );
        sp.put(
            "exposure.centre_m",
            None,
            "cover.centre".into(),
            g.centre.span(),
        );
        sp.put("exposure.size_m", None, "cover.size".into(), g.size.span());
        if let Some(cd) = &g.drag_coefficient {
            sp.put(
                "exposure.drag_coefficient",
                None,
                "cover.drag_coefficient".into(),
                cd.span(),
            );
        }
        CoverSpec {
            mass_kg: f(g.mass.get_ref().kg()),
            size_m: v3(g.size.get_ref()),
            centre_m: v3(g.centre.get_ref()),
            drag_coefficient: g.drag_coefficient.as_ref().map(|d| f(*d.get_ref())),
        }
    })
}

/// Reads the `[[ballast]]` list (mass, kg; position, rig frame, m).
fn ballast_section(
    ck: &Checker<'_>,
    list: &[S<BallastSec>],
    sp: &mut Spans,
) -> Result<bounded::Vec<BallastSpec, { standfast::rig::MAX_BALLAST }>, InputError> {
    let mut ballast = bounded::Vec::new();
    for (i, b) in list.iter().enumerate() {
        let key = format!("ballast[{i}]");
        let g = b.get_ref();
        sp.put(
            "ballast.mass_kg",
            Some(i),
            format!("{key}.mass"),
            g.mass.span(),
        );
        sp.put(
            "ballast.position_m",
            Some(i),
            format!("{key}.position"),
            g.position.span(),
        );
        let item = BallastSpec {
            mass_kg: f(g.mass.get_ref().kg()),
            position_m: v3(g.position.get_ref()),
        };
        if ballast.push(item).is_err() {
            return Err(ck.error(
                &key,
                b.span(),
                format!("more than {} ballast items", standfast::rig::MAX_BALLAST),
            ));
        }
    }
    Ok(ballast)
}

/// Reads `[drives]` (ratings, N·m; slew acceleration, rad/s²), when given.
fn drives_section(drives: Option<&S<DrivesSec>>, sp: &mut Spans) -> Option<Drives> {
    drives.map(|d| {
        let g = d.get_ref();
        sp.put(
            "drives.primary",
            None,
            "drives.primary".into(),
            g.primary.span(),
        );
        sp.put(
            "drives.secondary",
            None,
            "drives.secondary".into(),
            g.secondary.span(),
        );
        if let Some(a) = &g.slew_acceleration {
            sp.put(
                "drives.slew_acceleration_rad_per_s2",
                None,
                "drives.slew_acceleration".into(),
                a.span(),
            );
        }
        for (field, sec) in [
            ("drives.primary", &g.primary),
            ("drives.secondary", &g.secondary),
        ] {
            let r = sec.get_ref();
            for (name, v) in [
                ("rated", &r.rated),
                ("repeated_peak", &r.repeated_peak),
                ("momentary_peak", &r.momentary_peak),
            ] {
                sp.put_value(
                    field,
                    f(v.get_ref().nm()),
                    format!("{field}.{name}"),
                    v.span(),
                );
            }
        }
        let r = |s: &S<RatingSec>| DriveRating {
            rated_nm: f(s.get_ref().rated.get_ref().nm()),
            repeated_peak_nm: f(s.get_ref().repeated_peak.get_ref().nm()),
            momentary_peak_nm: f(s.get_ref().momentary_peak.get_ref().nm()),
        };
        Drives {
            primary: r(&g.primary),
            secondary: r(&g.secondary),
            slew_acceleration_rad_per_s2: g
                .slew_acceleration
                .as_ref()
                .map_or(0.0, |a| f(*a.get_ref())),
        }
    })
}

#[allow(clippy::too_many_arguments)]
fn exposure(
    src: &SourceText,
    sp: &mut Spans,
    key: &str,
    index: Option<usize>,
    sh: &S<ShapeSec>,
    centre_m: [f32; 3],
    centre_span: Range<usize>,
    cd: Option<&S<f64>>,
    end_cd: Option<&S<f64>>,
) -> Result<Exposure, InputError> {
    let ck = src.checker();
    let g = sh.get_ref();
    sp.put(
        "exposure.centre_m",
        index,
        format!("{key}.centre"),
        centre_span,
    );
    if let Some(c) = cd {
        sp.put(
            "exposure.drag_coefficient",
            index,
            format!("{key}.drag_coefficient"),
            c.span(),
        );
    }
    if let Some(c) = end_cd {
        sp.put(
            "exposure.end_drag_coefficient",
            index,
            format!("{key}.end_drag_coefficient"),
            c.span(),
        );
        if g.kind.get_ref().trim() == "box" {
            return Err(ck.error(
                &format!("{key}.end_drag_coefficient"),
                c.span(),
                "end_drag_coefficient applies to a cylinder's end area; a box takes \
                 drag_coefficient on every face",
            ));
        }
    }
    let missing = |what: &str| {
        ck.error(
            &format!("{key}.shape"),
            sh.span(),
            format!("a {} shape needs `{what}`", g.kind.get_ref()),
        )
    };
    let shape = match ck.one_of(&format!("{key}.shape.kind"), &g.kind, &["cylinder", "box"])? {
        "cylinder" => {
            let d = g.diameter.as_ref().ok_or_else(|| missing("diameter"))?;
            let l = g.length.as_ref().ok_or_else(|| missing("length"))?;
            let a = g.axis.as_ref().ok_or_else(|| missing("axis"))?;
            sp.put(
                "exposure.diameter_m",
                index,
                format!("{key}.shape.diameter"),
                d.span(),
            );
            sp.put(
                "exposure.length_m",
                index,
                format!("{key}.shape.length"),
                l.span(),
            );
            sp.put(
                "exposure.axis",
                index,
                format!("{key}.shape.axis"),
                a.span(),
            );
            let ax = a.get_ref();
            Shape::Cylinder {
                diameter_m: f(d.get_ref().m()),
                length_m: f(l.get_ref().m()),
                axis: [f(ax[0]), f(ax[1]), f(ax[2])],
            }
        }
        _ => {
            let s = g.size.as_ref().ok_or_else(|| missing("size"))?;
            sp.put(
                "exposure.size_m",
                index,
                format!("{key}.shape.size"),
                s.span(),
            );
            let edges = g.edges.as_ref().map(|e| {
                sp.put(
                    "exposure.edges",
                    index,
                    format!("{key}.shape.edges"),
                    e.span(),
                );
                let [a, b] = e.get_ref();
                [[f(a[0]), f(a[1]), f(a[2])], [f(b[0]), f(b[1]), f(b[2])]]
            });
            Shape::Box {
                size_m: v3(s.get_ref()),
                edges,
            }
        }
    };
    Ok(Exposure {
        shape,
        centre_m,
        drag_coefficient: cd.map(|c| f(*c.get_ref())),
        end_drag_coefficient: end_cd.map(|c| f(*c.get_ref())),
    })
}

fn guard_config(g: Option<&S<GuardSec>>, sp: &mut Spans) -> GuardConfig {
    let mut c = GuardConfig::default();
    let Some(g) = g else { return c };
    let g = g.get_ref();
    let mut num = |field: &'static str, key: &str, v: &Option<S<f64>>, out: &mut f32| {
        if let Some(v) = v {
            sp.put(field, None, format!("guard.{key}"), v.span());
            *out = f(*v.get_ref());
        }
    };
    num(
        "guard.watch_utilisation",
        "watch_utilisation",
        &g.watch_utilisation,
        &mut c.watch_utilisation,
    );
    num(
        "guard.park_utilisation",
        "park_utilisation",
        &g.park_utilisation,
        &mut c.park_utilisation,
    );
    num(
        "guard.alarm_utilisation",
        "alarm_utilisation",
        &g.alarm_utilisation,
        &mut c.alarm_utilisation,
    );
    num(
        "guard.drive_park_utilisation",
        "drive_park_utilisation",
        &g.drive_park_utilisation,
        &mut c.drive_park_utilisation,
    );
    num(
        "guard.clear_ratio",
        "clear_ratio",
        &g.clear_ratio,
        &mut c.clear_ratio,
    );
    num(
        "guard.gust_allowance",
        "gust_allowance",
        &g.gust_allowance,
        &mut c.gust_allowance,
    );
    let mut dur = |field: &'static str, key: &str, v: &Option<S<Duration>>, out: &mut f32| {
        if let Some(v) = v {
            sp.put(field, None, format!("guard.{key}"), v.span());
            *out = f(v.get_ref().s());
        }
    };
    dur("guard.dwell_s", "dwell", &g.dwell, &mut c.dwell_s);
    dur(
        "guard.time_to_park_s",
        "time_to_park",
        &g.time_to_park,
        &mut c.time_to_park_s,
    );
    dur(
        "guard.fault_clear_s",
        "fault_clear",
        &g.fault_clear,
        &mut c.fault_clear_s,
    );
    if let Some(t) = &g.tilt_margin_alarm {
        sp.put(
            "guard.tilt_margin_alarm_rad",
            None,
            "guard.tilt_margin_alarm".into(),
            t.span(),
        );
        c.tilt_margin_alarm_rad = f(t.get_ref().0);
    }
    c
}

fn shaft_hardware(src: &SourceText, g: &ShaftSec) -> Result<Option<ShaftHardware>, InputError> {
    let ck = src.checker();
    let thread = match &g.thread {
        Some(t) => Some(IsoThread::by_name(t.get_ref()).map_err(|_| {
            ck.error(
                "shaft.thread",
                t.span(),
                format!(
                    "not an ISO metric coarse thread (accepted: M{} to M{}, for example \"M12\")",
                    fmt_g(f64::from(standfast::hardware::thread::MIN_NOMINAL_MM)),
                    fmt_g(f64::from(standfast::hardware::thread::MAX_NOMINAL_MM))
                ),
            )
        })?),
        None => None,
    };
    let (material, material_label) = match (&g.material, &g.yield_strength_mpa) {
        (Some(m), None) => {
            let names: Vec<&str> = SHAFT_MATERIALS.iter().map(|x| x.0).collect();
            let n = ck.one_of("shaft.material", m, &names)?;
            let Some((_, label, mat)) = SHAFT_MATERIALS.iter().find(|x| x.0 == n) else {
                return Ok(None);
            };
            (*mat, (*label).to_owned())
        }
        (None, Some(y)) => {
            let span = y.span();
            let y = ck.range_f64(
                "shaft.yield_strength_mpa",
                y,
                1.0,
                f64::from(material::MAX_STRENGTH_MPA),
            )?;
            let mat = Material::new(f(y), f(y))
                .map_err(|e| ck.error("shaft.yield_strength_mpa", span.clone(), e.to_string()))?;
            (mat, format!("yield strength {} MPa (as given)", fmt_g(y)))
        }
        (Some(m), Some(_)) => {
            return Err(ck.error(
                "shaft.material",
                m.span(),
                "give one of material and yield_strength_mpa, not both",
            ))
        }
        (None, None) => {
            if let Some(t) = &g.thread {
                return Err(ck.error(
                    "shaft.thread",
                    t.span(),
                    "a shaft thread needs `material` or `yield_strength_mpa` for the check",
                ));
            }
            return Ok(None);
        }
    };
    Ok(Some(ShaftHardware {
        thread,
        thread_name: g.thread.as_ref().map(|t| t.get_ref().trim().to_owned()),
        material,
        material_label,
    }))
}

/// A signed sensor axis as written: `+x`, `-y`, `z`, …
fn signed_axis(src: &SourceText, key: &str, v: &S<String>) -> Result<SignedAxis, InputError> {
    let t = v.get_ref().trim().to_ascii_lowercase();
    let t = t.replace('\u{2212}', "-");
    Ok(match t.as_str() {
        "+x" | "x" => SignedAxis::PlusX,
        "-x" => SignedAxis::MinusX,
        "+y" | "y" => SignedAxis::PlusY,
        "-y" => SignedAxis::MinusY,
        "+z" | "z" => SignedAxis::PlusZ,
        "-z" => SignedAxis::MinusZ,
        _ => {
            return Err(src.checker().error(
                key,
                v.span(),
                "not a sensor axis (accepted: +x, -x, +y, -y, +z, -z)",
            ))
        }
    })
}

/// The `[sensor]` section into the guard's tilt and wind processing.
fn sensor_config(
    src: &SourceText,
    g: &SensorSec,
    sp: &mut Spans,
    c: &mut GuardConfig,
) -> Result<(), InputError> {
    let ck = src.checker();
    if let Some(v) = &g.accel_scale {
        sp.put(
            "guard.tilt.scale_g_per_count",
            None,
            "sensor.accel_scale".into(),
            v.span(),
        );
        c.tilt.scale_g_per_count = f(*v.get_ref());
    }
    if let Some(a) = &g.accel_axes {
        let [x, y, z] = a.get_ref();
        let m = Mounting::from_axes(
            signed_axis(src, "sensor.accel_axes[0]", x)?,
            signed_axis(src, "sensor.accel_axes[1]", y)?,
            signed_axis(src, "sensor.accel_axes[2]", z)?,
        )
        .map_err(|_| {
            ck.error(
                "sensor.accel_axes",
                a.span(),
                "the sensor axes along rig x, y, z must be three different axes \
                 forming a right-handed set (for example [\"+x\", \"+y\", \"+z\"] \
                 or [\"+y\", \"-x\", \"+z\"])",
            )
        })?;
        c.tilt.mounting = m;
    }
    if let Some(v) = &g.tilt_filter {
        sp.put(
            "guard.tilt.filter_tau_s",
            None,
            "sensor.tilt_filter".into(),
            v.span(),
        );
        c.tilt.filter_tau_s = f(v.get_ref().s());
    }
    if let Some(v) = &g.anemometer_height {
        sp.put(
            "guard.wind.z_from_m",
            None,
            "sensor.anemometer_height".into(),
            v.span(),
        );
        c.wind.anemometer_height_m = f(v.get_ref().m());
    }
    if let Some(v) = &g.rig_height {
        sp.put(
            "guard.wind.z_to_m",
            None,
            "sensor.rig_height".into(),
            v.span(),
        );
        c.wind.rig_height_m = f(v.get_ref().m());
    }
    if let Some(v) = &g.terrain {
        c.wind.terrain = match ck.one_of("sensor.terrain", v, &["0", "I", "II", "III", "IV"])? {
            "0" => TerrainCategory::Cat0Sea,
            "I" => TerrainCategory::CatIFlat,
            "III" => TerrainCategory::CatIIISuburban,
            "IV" => TerrainCategory::CatIVUrban,
            _ => TerrainCategory::CatIIOpen,
        };
    }
    if let Some(v) = &g.wind_stale {
        sp.put(
            "guard.wind.stale_after_s",
            None,
            "sensor.wind_stale".into(),
            v.span(),
        );
        c.wind.stale_after_s = f(v.get_ref().s());
    }
    if let Some(v) = &g.wind_max {
        sp.put(
            "guard.wind.max_speed_mps",
            None,
            "sensor.wind_max".into(),
            v.span(),
        );
        c.wind.max_speed_mps = f(v.get_ref().mps());
    }
    if let Some(v) = &g.wind_source {
        c.wind_source =
            match ck.one_of("sensor.wind_source", v, &["samples", "ten_minute_means"])? {
                "ten_minute_means" => WindSource::TenMinuteMeans,
                _ => WindSource::Samples,
            };
    }
    if let Some(v) = &g.gust_factor {
        sp.put(
            "guard.wind.mean_gust_factor",
            None,
            "sensor.gust_factor".into(),
            v.span(),
        );
        c.wind.mean_gust_factor = f(*v.get_ref());
    }
    Ok(())
}

/// A core [`standfast::Error`] met after the rig file `file` was read and
/// checked (starting the guard, assessing, drawing a report): names the
/// file and what failed, in the file's terms.
#[must_use]
pub fn after_load_error(file: &str, what: &str, e: &standfast::Error) -> InputError {
    InputError {
        at: None,
        key: None,
        value: None,
        problem: format!("{file}: {what}: {}", core_problem(e)),
    }
}

/// Turns a core [`standfast::Error`] into a located error at the key it came
/// from, with the value as written and the accepted range in the file's
/// units (degrees for angles).
fn core_error(src: &SourceText, sp: &Spans, e: &standfast::Error) -> InputError {
    let by_value = sp
        .by_value
        .iter()
        .find(|(field, v, _, _)| *field == e.field.path() && v.to_bits() == e.value.to_bits())
        .map(|(_, _, key, span)| (key.clone(), span.clone()));
    let found = by_value.as_ref().or_else(|| {
        sp.map
            .get(&(e.field.path(), e.index))
            .or_else(|| sp.map.get(&(e.field.path(), None)))
    });
    let problem = core_problem(e);
    match found {
        Some((key, span)) => src.checker().error(key, span.clone(), problem),
        None => match UNWRITTEN_KEYS
            .iter()
            .find(|(field, _)| *field == e.field.path())
        {
            // A default the file did not override: name the key that would.
            Some((_, key)) => {
                let section = key.split('.').next().unwrap_or("");
                let header = format!("[{section}]");
                let offset = src
                    .text()
                    .match_indices(&header)
                    .map(|(i, _)| i)
                    .find(|&i| i == 0 || src.text().get(i - 1..i) == Some("\n"))
                    .unwrap_or(0);
                InputError {
                    at: Some(src.location(offset)),
                    key: Some((*key).to_owned()),
                    value: None,
                    problem: format!("{problem}; not written in the file, so its default applies"),
                }
            }
            None => InputError {
                at: Some(src.location(0)),
                key: None,
                value: None,
                problem: format!("the rig as described: {problem}"),
            },
        },
    }
}

/// Core fields whose value comes from a default when the file does not
/// write its key, and that key (for messages about a default).
const UNWRITTEN_KEYS: [(&str, &str); 3] = [
    ("guard.wind.max_speed_mps", "sensor.wind_max"),
    ("guard.wind.stale_after_s", "sensor.wind_stale"),
    ("guard.wind.mean_gust_factor", "sensor.gust_factor"),
];
