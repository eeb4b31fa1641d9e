//! The data the charts draw: tip wind by direction, the conditions at a
//! closest approach, the axis-torque maps over the sky, and the per-rig
//! chart data of a replay and of an assessment. Computed here, with the
//! core; the render layer ([`crate::render::report`]) only draws them.

use standfast::frame::Tilt;
use standfast::mount::{PierSide, Pose};
use standfast::rig::{Conditions, Rig};

use crate::error::Error;
use crate::input::rigfile::{after_load_error, LoadedRig};
use crate::model::assess::AssessReport;
use crate::model::replay::{Approach, ReplayReport};

/// What could not be done when the core refuses the chart data (for
/// [`after_load_error`]).
const CHARTS_FAILED: &str = "the report cannot be drawn";

/// Points of a polar chart: (direction the wind blows from, degrees;
/// tip wind speed, m/s, `None` when no wind tips the rig from there).
pub type PolarPoints = Vec<(f64, Option<f64>)>;

/// The usual pier side for an hour angle: tube east for targets west of the
/// meridian (hour angle ≥ 0), tube west for targets east of it (as the
/// core's [`PierSide`] documents).
fn usual_side(ha_deg: i32) -> PierSide {
    if ha_deg >= 0 {
        PierSide::TubeEast
    } else {
        PierSide::TubeWest
    }
}

/// |Gravity torque| ÷ rated torque of each axis over hour angle (columns,
/// −180° to 180°) and declination (rows, 90° down to −90°), every
/// [`TORQUE_MAP_STEP_DEG`] degrees, level ground, calm, cover off, on the
/// usual pier side. Without drive ratings the values are divided by the
/// largest |gravity torque| of that axis on the map instead (the `bool` is
/// false then). Poses the core refuses are `None`.
#[must_use]
pub fn torque_map(r: &LoadedRig) -> ([Vec<Vec<Option<f64>>>; 2], bool) {
    let step = TORQUE_MAP_STEP_DEG;
    let decs: Vec<i32> = (0..=180 / step).map(|k| 90 - k * step).collect();
    let has = (-180 / step..=180 / step).map(|k| k * step);
    let ha: Vec<i32> = has.collect();
    let rated = r
        .rig
        .drives()
        .map(|d| [d.primary.rated_nm, d.secondary.rated_nm]);
    let mut maps: [Vec<Vec<Option<f64>>>; 2] = [Vec::new(), Vec::new()];
    for &dec in &decs {
        let mut rows: [Vec<Option<f64>>; 2] = [Vec::new(), Vec::new()];
        for &h in &ha {
            #[allow(clippy::cast_precision_loss)]
            let pose = Pose::Equatorial {
                hour_angle_rad: (h as f32).to_radians(),
                declination_rad: (dec as f32).to_radians(),
                pier_side: usual_side(h),
            };
            let mut c = Conditions::calm(pose);
            c.air = r.air;
            let loads = r.rig.axis_loads(&c, 0.0).ok();
            for (axis, row) in rows.iter_mut().enumerate() {
                let g = loads.map(|l| {
                    if axis == 0 {
                        l.primary.gravity_nm
                    } else {
                        l.secondary.gravity_nm
                    }
                });
                let v = match (g, rated) {
                    (Some(g), Some(rt)) => rt.get(axis).map(|rt| f64::from(g.abs() / rt)),
                    (Some(g), None) => Some(f64::from(g.abs())),
                    (None, _) => None,
                };
                row.push(v);
            }
        }
        for (m, row) in maps.iter_mut().zip(rows) {
            m.push(row);
        }
    }
    if rated.is_none() {
        for m in &mut maps {
            let top = m.iter().flatten().flatten().fold(0.0_f64, |a, b| a.max(*b));
            if top > 0.0 {
                for v in m.iter_mut().flatten().flatten() {
                    *v /= top;
                }
            }
        }
    }
    (maps, rated.is_some())
}

/// Tip wind speed every [`POLAR_STEP_DEG`] degrees of wind direction (from),
/// by [`Rig::stability_figures`] in the given conditions (their own direction is
/// replaced).
///
/// # Errors
/// The core's error for invalid conditions.
pub fn tip_wind_by_direction(
    rig: &Rig,
    c: &Conditions,
) -> Result<Vec<(f64, Option<f64>)>, standfast::Error> {
    let mut out = Vec::with_capacity(72);
    for k in 0..(360 / POLAR_STEP_DEG) {
        let deg = k * POLAR_STEP_DEG;
        let mut cc = *c;
        #[allow(clippy::cast_precision_loss)] // deg < 360
        let from = (deg as f32).to_radians();
        cc.wind_from_rad = from;
        let tip = rig.stability_figures(&cc)?.tip_wind_mps;
        out.push((f64::from(deg), tip.map(f64::from)));
    }
    Ok(out)
}

/// The conditions at a closest approach: its pose, tilt and wind direction,
/// the site's air and the cover state held then (off when unknown).
///
/// # Errors
/// The core's error for an invalid tilt.
pub fn approach_conditions(
    r: &LoadedRig,
    a: &Approach,
    cover: Option<bool>,
) -> Result<Conditions, standfast::Error> {
    let mut c = Conditions::calm(a.pose);
    c.air = r.air;
    c.cover_fitted = cover.unwrap_or(false);
    if let (Some(m), Some(d)) = (a.figures.tilt_deg, a.figures.tilt_downhill_deg) {
        c.tilt = Tilt::new(m.to_radians(), d.to_radians())?;
    }
    if let Some(w) = a.figures.wind_from_deg {
        c.wind_from_rad = w.to_radians();
    }
    Ok(c)
}

/// Step of the polar charts' directions, degrees (72 directions).
pub const POLAR_STEP_DEG: u32 = 5;

/// Step of the axis-torque map over hour angle and declination, degrees.
pub const TORQUE_MAP_STEP_DEG: i32 = 15;

/// The chart data of one rig in a replay.
#[derive(Clone, Debug, PartialEq)]
pub struct RigCharts {
    /// The guard's watch, park and alarm utilisation thresholds, when the
    /// rig file is known.
    pub thresholds: Option<[f32; 3]>,
    /// Tip wind by direction in the conditions of the closest approach to
    /// overturning, when there is one and the rig file is known.
    pub approach_tip_wind: Option<PolarPoints>,
    /// The anemometer's and the rig's heights and the guard's factor from
    /// one to the other, when the rig file is known (the wind chart draws
    /// every speed at rig height with it).
    pub wind_heights: Option<WindHeights>,
}

/// Heights of the wind chart: the guard's own scaling of the anemometer's
/// samples to rig height (logarithmic profile).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct WindHeights {
    /// Rig-height speed ÷ anemometer speed (dimensionless).
    pub factor: f32,
    /// Height of the anemometer above the ground, m.
    pub anemometer_m: f32,
    /// Height of the rig's wind exposure the guard uses, m.
    pub rig_m: f32,
}

/// The chart data of each rig of a replay; `rigs` are the rig files
/// replayed, in the report's order (a rig missing from the list gets no
/// thresholds and no polar chart).
///
/// # Errors
/// [`Error::Input`] when the core refuses the closest approach's conditions.
pub fn replay_charts(rep: &ReplayReport, rigs: &[LoadedRig]) -> Result<Vec<RigCharts>, Error> {
    let mut out = Vec::with_capacity(rep.rigs.len());
    for (i, r) in rep.rigs.iter().enumerate() {
        let rig = rigs.get(i);
        let approach_tip_wind = match (rig, r.overturning.as_ref()) {
            (Some(l), Some(a)) => {
                let c = approach_conditions(l, a, r.series.cover_at_closest)
                    .map_err(|e| after_load_error(&r.rig_file, CHARTS_FAILED, &e))?;
                Some(
                    tip_wind_by_direction(&l.rig, &c)
                        .map_err(|e| after_load_error(&r.rig_file, CHARTS_FAILED, &e))?,
                )
            }
            _ => None,
        };
        out.push(RigCharts {
            thresholds: rig.map(|l| {
                [
                    l.guard.watch_utilisation,
                    l.guard.park_utilisation,
                    l.guard.alarm_utilisation,
                ]
            }),
            approach_tip_wind,
            // Without a factor the chart draws the samples as measured and
            // says so; nothing on a safety path reads it.
            wind_heights: rig.and_then(|l| {
                l.guard.wind.height_factor().ok().map(|factor| WindHeights {
                    factor,
                    anemometer_m: l.guard.wind.anemometer_height_m,
                    rig_m: l.guard.wind.rig_height_m,
                })
            }),
        });
    }
    Ok(out)
}

/// The chart data of an assessment.
#[derive(Clone, Debug, PartialEq)]
pub struct AssessCharts {
    /// The mount's home pose.
    pub home_pose: Pose,
    /// Tip wind by direction in the home pose, level, calm air of the site,
    /// cover off.
    pub home: PolarPoints,
    /// The same in the worst pose of the sky scan.
    pub worst: PolarPoints,
    /// The same in the assessed condition (its pose, tilt and cover).
    pub condition: PolarPoints,
    /// The axis-torque maps of [`torque_map`] (primary, secondary).
    pub torque: [Vec<Vec<Option<f64>>>; 2],
    /// The maps are fractions of the rated torques (else of their largest).
    pub rated: bool,
}

/// The chart data of an assessment of `r`.
///
/// # Errors
/// [`Error::Input`] when the core refuses a case.
pub fn assess_charts(rep: &AssessReport, r: &LoadedRig) -> Result<AssessCharts, Error> {
    let e = |x: standfast::Error| after_load_error(&rep.file, CHARTS_FAILED, &x);
    let home_pose = r.rig.mount().home_pose();
    let mut c = Conditions::calm(home_pose);
    c.air = r.air;
    let home = tip_wind_by_direction(&r.rig, &c).map_err(e)?;
    let mut cw = Conditions::calm(rep.sky.tip.pose);
    cw.air = r.air;
    let worst = tip_wind_by_direction(&r.rig, &cw).map_err(e)?;
    let k = &rep.condition;
    let mut ck = Conditions::calm(k.pose_rad);
    ck.air = r.air;
    ck.tilt = Tilt::new(k.tilt_deg.to_radians(), k.downhill_deg.to_radians()).map_err(e)?;
    ck.cover_fitted = k.cover_fitted;
    let condition = tip_wind_by_direction(&r.rig, &ck).map_err(e)?;
    let (torque, rated) = torque_map(r);
    Ok(AssessCharts {
        home_pose,
        home,
        worst,
        condition,
        torque,
        rated,
    })
}
