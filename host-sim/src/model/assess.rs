//! `standfast assess`: a static assessment of a rig file without logs.
//!
//! Everything is computed by the core (`standfast::rig::Rig`); this module
//! chooses the cases, collects the figures into an [`AssessReport`] and
//! writes it as text or JSON. Angles in the report are degrees (azimuths
//! from north, clockwise; wind directions are where the wind blows FROM),
//! speeds m/s, torques N·m, masses kg, lengths m, forces N.

use serde::Serialize;
use standfast::frame::{self, Tilt};
use standfast::math::Vec3;
use standfast::mount::{PierSide, Pose};
use standfast::rig::{Conditions, Rig, RigSpec};
use standfast::sky::{EnvelopeRow, PayloadOffset, SkyGrid, SkyScan, SkyWorst};
use standfast::support::Support;
use standfast::torque::{Balance, PayloadPick};

use crate::cautions::CAUTIONS;
use crate::error::Error;
use crate::input::rigfile::{after_load_error, LoadedRig};

/// What could not be done when the core refuses an assessment (for
/// [`after_load_error`]).
const ASSESS_FAILED: &str = "assessment failed";

/// Options of an assessment.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AssessOptions {
    /// Design gust for ballast and tie-down needs, m/s.
    pub design_gust_mps: f32,
    /// Target overturning utilisation for ballast and tie-down needs.
    pub target_utilisation: f32,
    /// Storm direction (wind blowing FROM), degrees from north, for the best
    /// tripod orientation.
    pub storm_from_deg: f32,
    /// Height of the ballast above the ground, below the rig centre, metres.
    pub ballast_height_m: f32,
    /// Wind speed for the axis torques over the sky, m/s.
    pub torque_wind_mps: f32,
    /// The condition assessed at the design gust (pose, ground tilt, cover,
    /// wind direction).
    pub condition: Condition,
}

/// A condition to assess: pose, ground tilt, cover and wind direction. The
/// design wind speed is [`AssessOptions::design_gust_mps`].
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct Condition {
    /// Mount pose; `None` for the mount's home pose.
    pub pose: Option<standfast::mount::Pose>,
    /// Ground tilt (magnitude and downhill azimuth in the rig frame).
    pub tilt: Tilt,
    /// True with the cover fitted (ignored when the rig has none).
    pub cover_fitted: bool,
    /// Direction the design wind blows from, degrees from north clockwise;
    /// `None` for the worst direction.
    pub wind_from_deg: Option<f32>,
}

/// Utilisation and sliding at the design gust from one direction, and the
/// tip wind from there, at the assessed condition.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct ConditionRow {
    /// Direction the wind blows from, degrees from north clockwise.
    pub from_deg: f32,
    /// Lowest wind speed that tips the rig from there, m/s (`None`: none can).
    pub tip_wind_mps: Option<f32>,
    /// Overturning utilisation at the design gust (1.0 tips).
    pub overturning_utilisation: f32,
    /// Sliding utilisation at the design gust (1.0 slides).
    pub sliding_utilisation: f32,
}

/// The assessment at one condition and the design gust.
#[derive(Clone, Debug, Serialize)]
pub struct ConditionReport {
    /// The pose in words.
    pub pose: String,
    /// The pose as the core takes it (radians).
    pub pose_rad: standfast::mount::Pose,
    /// Ground tilt, degrees.
    pub tilt_deg: f32,
    /// Downhill azimuth, degrees from north clockwise.
    pub downhill_deg: f32,
    /// True with the cover fitted.
    pub cover_fitted: bool,
    /// Design gust, m/s.
    pub design_gust_mps: f32,
    /// True when the wind direction is the worst one (not given).
    pub worst_direction: bool,
    /// Wind direction assessed (given, or the one of highest overturning
    /// utilisation), degrees.
    pub wind_from_deg: f32,
    /// Overturning utilisation at the design gust from that direction.
    pub overturning_utilisation: f32,
    /// Azimuth the rig would fall toward over its critical edge, degrees.
    pub critical_edge_outward_deg: f32,
    /// Sliding utilisation at the design gust from that direction.
    pub sliding_utilisation: f32,
    /// Highest sliding utilisation over directions (every 5°), and its
    /// direction, degrees.
    pub worst_sliding: (f32, f32),
    /// Tip wind from that direction, m/s.
    pub tip_wind_mps: Option<f32>,
    /// Slide wind from that direction, m/s.
    pub slide_wind_mps: Option<f32>,
    /// Lowest tip wind over directions at this condition.
    pub lowest_tip_wind: DirectionRow,
    /// Extra ground tilt that would tip the rig with no wind, degrees, and
    /// its downhill azimuth.
    pub tilt_margin_deg: (f32, f32),
    /// Every 15°: tip wind, utilisation and sliding at the design gust.
    pub by_direction: Vec<ConditionRow>,
}

fn condition_report(
    rig: &Rig,
    air: standfast::air::Air,
    o: &AssessOptions,
) -> Result<ConditionReport, standfast::Error> {
    let k = &o.condition;
    let pose = k.pose.unwrap_or_else(|| rig.mount().home_pose());
    let c = Conditions {
        pose,
        tilt: k.tilt,
        wind_speed_mps: o.design_gust_mps,
        wind_from_rad: 0.0,
        air,
        cover_fitted: k.cover_fitted && rig.has_cover(),
    };
    c.validate()?;
    let at = |from_deg: f32| {
        let mut cc = c;
        cc.wind_from_rad = from_deg.to_radians();
        rig.stability_figures(&cc)
    };
    let mut rows = Vec::new();
    let mut worst_slide = (f32::NEG_INFINITY, 0.0_f32);
    for step in 0..72_u8 {
        let from = f32::from(step) * 5.0;
        let a = at(from)?;
        if a.sliding.utilisation > worst_slide.0 {
            worst_slide = (a.sliding.utilisation, from);
        }
        if step % 3 == 0 {
            rows.push(ConditionRow {
                from_deg: from,
                tip_wind_mps: a.tip_wind_mps,
                overturning_utilisation: a.critical.utilisation,
                sliding_utilisation: a.sliding.utilisation,
            });
        }
    }
    let from_deg = match k.wind_from_deg {
        Some(d) => d.rem_euclid(360.0),
        None => deg(rig.worst_direction_utilisation(&c)?.1).rem_euclid(360.0),
    };
    let a = at(from_deg)?;
    let mut calm = c;
    calm.wind_speed_mps = 0.0;
    let w = rig.worst_wind(&calm)?;
    let m = rig.tilt_margin(&calm)?;
    Ok(ConditionReport {
        pose: pose_words(&pose),
        pose_rad: pose,
        tilt_deg: deg(k.tilt.magnitude_rad),
        downhill_deg: deg(k.tilt.downhill_azimuth_rad).rem_euclid(360.0),
        cover_fitted: c.cover_fitted,
        design_gust_mps: o.design_gust_mps,
        worst_direction: k.wind_from_deg.is_none(),
        wind_from_deg: from_deg,
        overturning_utilisation: a.critical.utilisation,
        critical_edge_outward_deg: deg(a.critical.outward_azimuth_rad).rem_euclid(360.0),
        sliding_utilisation: a.sliding.utilisation,
        worst_sliding: worst_slide,
        tip_wind_mps: a.tip_wind_mps,
        slide_wind_mps: a.slide_wind_mps,
        lowest_tip_wind: DirectionRow {
            from_deg: deg(w.from_rad).rem_euclid(360.0),
            tip_wind_mps: w.tip_wind_mps,
        },
        tilt_margin_deg: (
            deg(m.extra_rad),
            deg(m.downhill_azimuth_rad).rem_euclid(360.0),
        ),
        by_direction: rows,
    })
}

impl Default for AssessOptions {
    fn default() -> Self {
        AssessOptions {
            design_gust_mps: 20.0,
            target_utilisation: 0.75,
            storm_from_deg: 270.0,
            ballast_height_m: 0.3,
            torque_wind_mps: 10.0,
            condition: Condition::default(),
        }
    }
}

/// Tip wind speed for one wind direction.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct DirectionRow {
    /// Direction the wind blows from, degrees from north clockwise.
    pub from_deg: f32,
    /// Lowest wind speed that tips the rig from there, m/s (`None`: none can).
    pub tip_wind_mps: Option<f32>,
}

/// Best azimuth of the first tripod leg for a storm direction.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct Orientation {
    /// Storm direction (from), degrees.
    pub storm_from_deg: f32,
    /// Azimuth of the first leg as given in the file, degrees.
    pub current_first_leg_deg: f32,
    /// Tip wind from the storm direction as given, m/s.
    pub current_tip_wind_mps: Option<f32>,
    /// Azimuth of the first leg that maximises the tip wind, degrees.
    pub best_first_leg_deg: f32,
    /// Tip wind from the storm direction at the best orientation, m/s.
    pub best_tip_wind_mps: Option<f32>,
    /// Gain in tip wind speed, m/s.
    pub gain_mps: Option<f32>,
}

/// A requirement (ballast kg or tie-down pull per foot N) and its governing
/// wind direction.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct Need {
    /// Ballast mass, kg, or pull per foot, N.
    pub amount: f32,
    /// Governing wind direction (from), degrees.
    pub worst_from_deg: f32,
}

/// Everything `assess` reports.
#[derive(Clone, Debug, Serialize)]
pub struct AssessReport {
    /// The rig file.
    pub file: String,
    /// Total mass in the home pose, cover off, kg.
    pub mass_kg: f32,
    /// Centre of gravity in the home pose, rig frame (x east, y north, z up), m.
    pub centre_of_gravity_m: [f32; 3],
    /// Air density used (ISA at the site elevation), kg/m³.
    pub air_density_kg_per_m3: f32,
    /// Tip wind speed every 15° in the home pose, cover off.
    pub home_by_direction: Vec<DirectionRow>,
    /// Lowest tip wind over directions in the home pose, cover off.
    pub home_worst: DirectionRow,
    /// Lowest tip wind over directions in the home pose, cover fitted (when
    /// the rig has a cover).
    pub home_worst_covered: Option<DirectionRow>,
    /// Worst case over the sky: lowest tip wind and highest axis torques.
    pub sky: SkyWorst,
    /// Wind speed used for the sky's axis torques, m/s.
    pub sky_torque_wind_mps: f32,
    /// Design gust for the needs below, m/s.
    pub design_gust_mps: f32,
    /// Target utilisation for the needs below.
    pub target_utilisation: f32,
    /// Ballast below the rig centre needed in the home pose, kg.
    pub ballast_needed: Option<Need>,
    /// Tie-down pull needed per foot in the home pose, N.
    pub tie_down_needed: Option<Need>,
    /// Best tripod orientation for the storm direction (three-foot supports).
    pub orientation: Option<Orientation>,
    /// Balance of both axes for the payload under the cover (every
    /// secondary-stage body when none is marked); `None` when the rig has no
    /// secondary-stage body.
    pub balance: Option<Balance>,
    /// Payload envelope: masses that keep both drives within their ratings
    /// over the sky (15° grid, calm, level, cover off), for payload centres
    /// of gravity at [`ENVELOPE_OFFSETS_M`]; `None` without drive ratings.
    pub payload_envelope: Option<Vec<EnvelopeRow>>,
    /// Bending check of the counterweight shaft at its root, when the rig
    /// file names the shaft's material.
    pub shaft_check: Option<ShaftCheck>,
    /// Attachment hardware (shaft root, shaft thread in its housing, bolted
    /// joints), weakest part first.
    pub hardware: Vec<HardwareRow>,
    /// Utilisation and sliding at the design gust in the assessed condition
    /// (pose, ground tilt, cover, wind direction or the worst one).
    pub condition: ConditionReport,
    /// The weighed centre of gravity the rig carries (`[measured]`), with
    /// the figures the bodies imply, when the file has one.
    pub measured: Option<crate::input::rigfile::MeasuredNote>,
    /// The cautions.
    pub cautions: Vec<&'static str>,
}

/// Safety factor on yield for the counterweight-shaft bending check (common
/// practice, no source: a static load, ductile material).
pub const SHAFT_SAFETY_FACTOR: f32 = 2.0;

/// Bending of the counterweight shaft at its root with the shaft horizontal
/// (the largest moment) and the counterweights where the file puts them.
#[derive(Clone, Debug, Serialize)]
pub struct ShaftCheck {
    /// Thread at the root as written, when given.
    pub thread: Option<String>,
    /// Root section diameter used, mm (thread minor diameter, or the plain
    /// shaft diameter).
    pub root_diameter_mm: f32,
    /// The material.
    pub material: String,
    /// Static moment at the root, N·m: g·(Σ counterweight mass × distance +
    /// shaft mass × length / 2).
    pub moment_nm: f32,
    /// Nominal bending stress at the root, MPa.
    pub stress_mpa: f32,
    /// Yield strength / [`SHAFT_SAFETY_FACTOR`], MPa.
    pub allowable_mpa: f32,
    /// stress / allowable; above 1 the shaft is over its allowable stress.
    pub utilisation: f32,
    /// Moment the root carries at the allowable stress, N·m.
    pub allowable_moment_nm: f32,
}

fn shaft_check(r: &LoadedRig) -> Result<Option<ShaftCheck>, standfast::Error> {
    use standfast::hardware::{shaft, ShaftLoad, ShaftSection, StrengthBasis};
    let (Some(hw), Some(sh)) = (&r.shaft_hardware, &r.spec.shaft) else {
        return Ok(None);
    };
    let horizontal = std::f32::consts::FRAC_PI_2;
    let mut moment_nm =
        ShaftLoad::counterweight(sh.mass_kg, sh.length_m / 2.0, horizontal)?.moment_nm;
    for c in &r.spec.counterweights {
        moment_nm += ShaftLoad::counterweight(c.mass_kg, c.distance_m, horizontal)?.moment_nm;
    }
    let (section, root_diameter_mm) = match &hw.thread {
        Some(t) => (
            ShaftSection::threaded_root(t),
            t.external_minor_diameter_mm(),
        ),
        None => (
            ShaftSection::solid(sh.diameter_m * 1000.0)?,
            sh.diameter_m * 1000.0,
        ),
    };
    let res = shaft::check_shaft_bending(
        moment_nm,
        &section,
        &hw.material,
        StrengthBasis::Yield,
        SHAFT_SAFETY_FACTOR,
    )?;
    Ok(Some(ShaftCheck {
        thread: hw.thread_name.clone(),
        root_diameter_mm,
        material: hw.material_label.clone(),
        moment_nm,
        stress_mpa: res.stress_mpa,
        allowable_mpa: res.allowable_mpa,
        utilisation: res.utilisation,
        allowable_moment_nm: res.allowable_moment_nm,
    }))
}

/// One attachment-hardware check: the part, its worst load, what it allows,
/// and the load case that governs.
#[derive(Clone, Debug, Serialize)]
pub struct HardwareRow {
    /// The part (`[shaft]`, `[shaft_joint]` or a `[[joint]]` label).
    pub part: String,
    /// What is checked.
    pub check: String,
    /// The worst load: N on the most loaded screw or thread, or N·m at the
    /// shaft root (see `unit`).
    pub load: f32,
    /// What the part allows at yield / [`SHAFT_SAFETY_FACTOR`], same unit.
    pub allowable: f32,
    /// `N` or `N m`.
    pub unit: &'static str,
    /// load / allowable; above 1 the part is over its allowable load.
    pub utilisation: f32,
    /// Which failure governs the allowable (screw tension, a thread
    /// stripping, bending).
    pub governs: String,
    /// The load case of the worst load.
    pub case: String,
}

fn governs_words(m: standfast::hardware::FailureMode) -> &'static str {
    use standfast::hardware::FailureMode;
    match m {
        FailureMode::ScrewTension => "screw tension",
        FailureMode::ExternalThreadStrip => "the screw's (external) thread strips",
        FailureMode::InternalThreadStrip => "the internal thread strips",
    }
}

fn strip_capacity(
    j: &crate::input::rigfile::ThreadJoint,
) -> Result<standfast::hardware::StrippingResult, standfast::Error> {
    use standfast::hardware::{strip, ShearFactor, StrengthBasis, StrippingInput};
    strip::check_stripping(&StrippingInput {
        limits: j.thread.limits(),
        tensile_area_mm2: j.thread.tensile_stress_area_mm2(),
        engagement_mm: j.engagement_mm,
        screw: j.screw,
        internal: j.internal,
        shear_factor: ShearFactor::CommonPractice,
        basis: StrengthBasis::Yield,
        safety_factor: SHAFT_SAFETY_FACTOR,
    })
}

/// The counterweight shaft's thread in its housing: the weight of the
/// counterweights and the shaft hanging straight down, plus the design gust
/// blowing along the shaft onto the discs' faces (a conservative sum: the
/// largest pull of each kind, whatever the pose).
fn shaft_joint_row(
    r: &LoadedRig,
    o: &AssessOptions,
) -> Result<Option<HardwareRow>, standfast::Error> {
    use standfast::hardware::ShaftLoad;
    use standfast::rig::PartRole;
    let Some(j) = &r.hardware.shaft_joint else {
        return Ok(None);
    };
    let mut pull_n = 0.0;
    let mut along_m2 = 0.0;
    let axes = [Vec3::X, Vec3::Y, Vec3::Z];
    for p in r.rig.parts() {
        if matches!(p.role, PartRole::Counterweight(_) | PartRole::Shaft) {
            pull_n += ShaftLoad::counterweight(p.mass_kg, -p.cg_m.x, 0.0)?.axial_n;
            if let Some(x) = &p.exposure {
                // The shaft's stage axis s is the first axis: wind along it.
                along_m2 += x.drag_area_m2(&axes, Vec3::X);
            }
        }
    }
    let q = r.air.dynamic_pressure_pa(o.design_gust_mps);
    let load = pull_n + q * along_m2;
    let cap = strip_capacity(j)?;
    Ok(Some(HardwareRow {
        part: format!(
            "counterweight shaft thread {} in the housing ({})",
            j.thread_name, j.internal_label
        ),
        check: format!(
            "thread stripping and shaft tension, {:.0} mm engaged",
            j.engagement_mm
        ),
        load,
        allowable: cap.allowable_n,
        unit: "N",
        utilisation: cap.utilisation(load.max(0.0))?,
        governs: governs_words(cap.governs).to_owned(),
        case: format!(
            "shaft hanging straight down ({pull_n:.0} N of weights) plus a {:.0} m/s gust along the shaft ({:.0} N)",
            o.design_gust_mps,
            q * along_m2
        ),
    }))
}

/// A bolted joint: the most loaded screw over the sky (15° grid, both pier
/// sides), 16 wind directions at the design gust, cover off and fitted, on
/// level ground, and at the assessed condition.
fn joint_row(
    r: &LoadedRig,
    o: &AssessOptions,
    j: &crate::input::rigfile::BoltedJoint,
) -> Result<HardwareRow, standfast::Error> {
    use standfast::hardware::JointLoad;
    let rig = &r.rig;
    let origin = rig.mount().axis_origin_m;
    let centre = Vec3::new(origin[0], origin[1], j.height_m);
    let q = r.air.dynamic_pressure_pa(o.design_gust_mps);
    let mut worst: Option<(f32, String)> = None;
    let mut consider = |pose: standfast::mount::Pose,
                        tilt: Tilt,
                        cover: bool,
                        from_deg: f32|
     -> Result<(), standfast::Error> {
        let pl = rig.place(pose, tilt, cover)?;
        let res = pl.load_above(j.height_m, centre, from_deg.to_radians(), q)?;
        let load = JointLoad {
            axial_n: res.force_n.z,
            moment_x_nm: res.moment_nm.x,
            moment_y_nm: res.moment_nm.y,
        };
        let t = j.pattern.tensions(load, j.pivot)?;
        if worst.as_ref().is_none_or(|(w, _)| t.max_n > *w) {
            worst = Some((
                t.max_n,
                format!(
                    "{}, {}, cover {}, {:.0} m/s gust from {:.0}° ({:.1} kg above the joint)",
                    pose_words(&pose),
                    if tilt.magnitude_rad > 0.0 {
                        format!(
                            "ground tilt {:.1}° toward {:.0}°",
                            deg(tilt.magnitude_rad),
                            deg(tilt.downhill_azimuth_rad).rem_euclid(360.0)
                        )
                    } else {
                        "level ground".to_owned()
                    },
                    if cover { "fitted" } else { "off" },
                    o.design_gust_mps,
                    from_deg.rem_euclid(360.0),
                    res.mass_kg
                ),
            ));
        }
        Ok(())
    };
    let covers: &[bool] = if rig.has_cover() {
        &[false, true]
    } else {
        &[false]
    };
    for pose in SkyGrid::with_step(15f32.to_radians(), 0.0).poses(rig.mount()) {
        for &cover in covers {
            for k in 0..16_u8 {
                consider(pose, Tilt::LEVEL, cover, f32::from(k) * 22.5)?;
            }
        }
    }
    let c = &o.condition;
    let pose = c.pose.unwrap_or_else(|| rig.mount().home_pose());
    let cover = c.cover_fitted && rig.has_cover();
    match c.wind_from_deg {
        Some(d) => consider(pose, c.tilt, cover, d)?,
        None => {
            for k in 0..72_u8 {
                consider(pose, c.tilt, cover, f32::from(k) * 5.0)?;
            }
        }
    }
    // No case checked would read as an unloaded joint: refuse instead.
    let Some((max_n, case)) = worst else {
        return Err(standfast::Error::new(
            standfast::ErrorKind::TooFew,
            standfast::error::Field::External {
                path: "joint.load_cases",
                unit: standfast::error::Unit::Count,
            },
        ));
    };
    let cap = strip_capacity(&j.screws)?;
    Ok(HardwareRow {
        part: j.label.clone(),
        check: format!(
            "{} × {} ({}), {:.0} mm engaged in {}: tension of the most loaded screw",
            j.pattern.len(),
            j.screws.thread_name,
            j.screws.screw_label,
            j.screws.engagement_mm,
            j.screws.internal_label
        ),
        load: max_n,
        allowable: cap.allowable_n,
        unit: "N",
        utilisation: cap.utilisation(max_n.max(0.0))?,
        governs: governs_words(cap.governs).to_owned(),
        case,
    })
}

/// Every attachment-hardware check, weakest part first.
fn hardware_rows(
    r: &LoadedRig,
    o: &AssessOptions,
    shaft: Option<&ShaftCheck>,
) -> Result<Vec<HardwareRow>, standfast::Error> {
    let mut rows = Vec::new();
    if let Some(s) = shaft {
        rows.push(HardwareRow {
            part: format!(
                "counterweight shaft root ({}, {})",
                s.thread.as_deref().unwrap_or("plain"),
                s.material
            ),
            check: format!("bending at the root, {:.2} mm section", s.root_diameter_mm),
            load: s.moment_nm,
            allowable: s.allowable_moment_nm,
            unit: "N m",
            utilisation: s.utilisation,
            governs: "bending".to_owned(),
            case: "shaft horizontal, counterweights where the file puts them".to_owned(),
        });
    }
    if let Some(row) = shaft_joint_row(r, o)? {
        rows.push(row);
    }
    for j in &r.hardware.joints {
        rows.push(joint_row(r, o, j)?);
    }
    rows.sort_by(|a, b| b.utilisation.total_cmp(&a.utilisation));
    Ok(rows)
}

/// Payload centre-of-gravity offsets of the envelope table, secondary-stage
/// frame, metres: (along the secondary axis `s`, positive to the payload
/// side; along the tube `p`, positive toward the sky end).
pub const ENVELOPE_OFFSETS_M: [(f32, f32); 10] = [
    (0.10, 0.0),
    (0.15, 0.0),
    (0.20, 0.0),
    (0.25, 0.0),
    (0.30, 0.0),
    (0.10, 0.15),
    (0.15, 0.15),
    (0.20, 0.15),
    (0.25, 0.15),
    (0.30, 0.15),
];

fn deg(rad: f32) -> f32 {
    rad.to_degrees()
}

fn tip_from(rig: &Rig, c: &Conditions, from_rad: f32) -> Result<Option<f32>, standfast::Error> {
    let mut c = *c;
    c.wind_from_rad = from_rad;
    Ok(rig.stability_figures(&c)?.tip_wind_mps)
}

/// Best tripod orientation. A weighed centre (`[measured]`) is applied to
/// every turned tripod: the weighed centre stays where it is in the rig
/// frame while the feet turn under it (the legs' own mass, folded into the
/// weighed lump, is taken not to move: exact for a symmetric tripod).
fn orientation(
    spec: &RigSpec,
    c: &Conditions,
    storm_from_deg: f32,
    measured: Option<&crate::input::rigfile::MeasuredNote>,
) -> Result<Option<Orientation>, standfast::Error> {
    if spec.feet.len() != 3 {
        return Ok(None);
    }
    let base = Support::new(&spec.feet)?;
    let storm = storm_from_deg.to_radians();
    let first_leg = |s: &Support| {
        s.foot_point_m(0)
            .map_or(0.0, |p| deg(frame::azimuth_of(Vec3::new(p.x, p.y, 0.0))))
    };
    let mut current = None;
    let mut best: Option<(f32, Option<f32>)> = None;
    for step in 0..24_u8 {
        let turn = f32::from(step) * 5.0;
        let s = base.rotated(turn.to_radians())?;
        let mut sp = spec.clone();
        sp.feet = s.feet_list();
        let mut rig = Rig::new(&sp)?;
        if let Some(m) = measured {
            let home = rig.mount().home_pose();
            rig = rig.with_measured_centre(
                m.mass_kg,
                Vec3::from_array(m.centre_m),
                home,
                m.cover_fitted,
            )?;
        }
        let tip = tip_from(&rig, c, storm)?;
        if step == 0 {
            current = Some((first_leg(&s), tip));
        }
        let better = match (best, tip) {
            (None, _) => true,
            (Some((_, None)), _) => false,
            (Some((_, Some(_))), None) => true,
            (Some((_, Some(b))), Some(t)) => t > b + 1e-4,
        };
        if better {
            best = Some((first_leg(&s), tip));
        }
    }
    let (Some((cur_az, cur_tip)), Some((best_az, best_tip))) = (current, best) else {
        return Ok(None);
    };
    Ok(Some(Orientation {
        storm_from_deg,
        current_first_leg_deg: cur_az,
        current_tip_wind_mps: cur_tip,
        best_first_leg_deg: best_az,
        best_tip_wind_mps: best_tip,
        gain_mps: match (cur_tip, best_tip) {
            (Some(a), Some(b)) => Some(b - a),
            _ => None,
        },
    }))
}

/// Assesses a loaded rig.
///
/// # Errors
/// [`Error::Input`] when the core refuses a case (it names the field).
pub fn assess(r: &LoadedRig, o: &AssessOptions) -> Result<AssessReport, Error> {
    let e = |x: standfast::Error| after_load_error(&r.file, ASSESS_FAILED, &x);
    let rig = &r.rig;
    let home = rig.mount().home_pose();
    let mut c = Conditions::calm(home);
    c.air = r.air;
    let placement = rig.place(home, Tilt::LEVEL, false).map_err(e)?;
    let cg = placement.centre_of_gravity_m();

    let mut by_dir = Vec::new();
    for k in 0..24_u8 {
        let from = f32::from(k) * 15.0;
        by_dir.push(DirectionRow {
            from_deg: from,
            tip_wind_mps: tip_from(rig, &c, from.to_radians()).map_err(e)?,
        });
    }
    let w = rig.worst_wind(&c).map_err(e)?;
    let home_worst = DirectionRow {
        from_deg: deg(w.from_rad),
        tip_wind_mps: w.tip_wind_mps,
    };
    let home_worst_covered = if rig.has_cover() {
        let mut cc = c;
        cc.cover_fitted = true;
        let w = rig.worst_wind(&cc).map_err(e)?;
        Some(DirectionRow {
            from_deg: deg(w.from_rad),
            tip_wind_mps: w.tip_wind_mps,
        })
    } else {
        None
    };
    let sky = rig
        .sky_scan(&SkyScan {
            grid: SkyGrid::with_step(15f32.to_radians(), 0.0),
            wind_directions: 16,
            wind_speed_mps: o.torque_wind_mps,
            air: r.air,
            tilt: Tilt::LEVEL,
        })
        .map_err(e)?;
    let ballast_needed = rig
        .ballast_needed(
            &c,
            o.design_gust_mps,
            o.target_utilisation,
            Vec3::new(0.0, 0.0, o.ballast_height_m),
        )
        .ok()
        .map(|q| Need {
            amount: q.mass_kg,
            worst_from_deg: deg(q.worst_from_rad),
        });
    let tie_down_needed = rig
        .tie_down_needed(&c, o.design_gust_mps, o.target_utilisation)
        .ok()
        .map(|q| Need {
            amount: q.pull_per_foot_n,
            worst_from_deg: deg(q.worst_from_rad),
        });
    let orientation = orientation(&r.spec, &c, o.storm_from_deg, r.measured.as_ref()).map_err(e)?;
    let has_payload = r
        .spec
        .bodies
        .iter()
        .any(|b| b.stage == standfast::rig::Stage::Secondary);
    let balance = if has_payload {
        Some(rig.balance(PayloadPick::UnderCover).map_err(e)?)
    } else {
        None
    };
    let payload_envelope = if has_payload && r.spec.drives.is_some() {
        let offsets: Vec<PayloadOffset> = ENVELOPE_OFFSETS_M
            .iter()
            .map(|&(a, b)| PayloadOffset {
                along_secondary_axis_m: a,
                along_tube_m: b,
            })
            .collect();
        let rows = rig
            .payload_envelope(
                &SkyGrid::with_step(15f32.to_radians(), 0.0),
                PayloadPick::UnderCover,
                &offsets,
            )
            .map_err(e)?;
        Some(rows.iter().copied().collect())
    } else {
        None
    };
    let shaft = shaft_check(r).map_err(e)?;
    Ok(AssessReport {
        file: r.file.clone(),
        mass_kg: placement.mass_kg(),
        centre_of_gravity_m: cg.to_array(),
        air_density_kg_per_m3: r.air.density_kg_per_m3(),
        home_by_direction: by_dir,
        home_worst,
        home_worst_covered,
        sky,
        sky_torque_wind_mps: o.torque_wind_mps,
        design_gust_mps: o.design_gust_mps,
        target_utilisation: o.target_utilisation,
        ballast_needed,
        tie_down_needed,
        orientation,
        balance,
        payload_envelope,
        hardware: hardware_rows(r, o, shaft.as_ref()).map_err(e)?,
        shaft_check: shaft,
        condition: condition_report(rig, r.air, o).map_err(e)?,
        measured: r.measured.clone(),
        cautions: CAUTIONS.to_vec(),
    })
}

/// A pose in words: axis angles, hour angle and declination, or azimuth and
/// altitude, in degrees (hour angle in hours). The assessment's conditions
/// and the replay's closest approaches name their pose with it.
#[must_use]
pub fn pose_words(p: &Pose) -> String {
    match p {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => format!(
            "axes {:.1}°, {:.1}°",
            primary_rad.to_degrees(),
            secondary_rad.to_degrees()
        ),
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            pier_side,
        } => format!(
            "hour angle {:+.2} h, declination {:+.1}°, {}",
            hour_angle_rad.to_degrees() / 15.0,
            declination_rad.to_degrees(),
            side_words(*pier_side)
        ),
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            pier_side,
        } => format!(
            "azimuth {:.1}°, altitude {:.1}°, {}",
            azimuth_rad.to_degrees(),
            altitude_rad.to_degrees(),
            side_words(*pier_side)
        ),
    }
}

fn side_words(s: PierSide) -> &'static str {
    match s {
        PierSide::TubeEast => "tube east",
        PierSide::TubeWest => "tube west",
    }
}
