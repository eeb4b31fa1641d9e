//! The weighing file of `standfast weigh`: scale readings under the rig's
//! feet, read and checked into a [`WeighingInput`] (readings in newtons,
//! lengths m, angles rad) with the place of every key for the core's errors.
//!
//! # The weighing file
//! ```toml
//! resolution = "0.05 kg"          # scale resolution (reading uncertainty = resolution / √12)
//! # reading_uncertainty = "0.1 kg" # or the standard uncertainty of one reading, if larger
//! level = ["8.61 kg", "8.72 kg", "8.55 kg"]  # one per foot, in the rig file's foot order
//!
//! [lift]                          # optional: one side raised, every foot still on a scale
//! feet = [0]                      # the raised feet (0-based, rig file order)
//! height = "60 mm"                # how far they were raised
//! height_uncertainty = "1 mm"     # default: 1 mm
//! # or: toward = "0 deg"; angle = "8 deg"; angle_uncertainty = "0.2 deg" (inclinometer)
//! readings = ["7.90 kg", "9.05 kg", "8.93 kg"]
//!
//! [tip]                           # optional: tilted about an edge until the other feet unload
//! edge = [1, 2]                   # the two feet of the edge
//! angle = "31 deg"
//! angle_uncertainty = "0.5 deg"   # default: 0.5 deg
//! ```
//! Readings accept any mass unit (`"18.2 lb"`); a plain number is kg.

use serde::Deserialize;
use standfast::math::STANDARD_GRAVITY_MPS2;
use standfast::weighing::{LiftGeometry, TipTest};
use toml::Spanned;

use crate::input::core_error::core_problem;
use crate::input::located::{fmt_g, InputError, SourceText};
use crate::input::units::f32_of as f;
use crate::input::units::{Length, Mass};

type S<T> = Spanned<T>;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct WeighingFile {
    resolution: Option<S<Mass>>,
    reading_uncertainty: Option<S<Mass>>,
    level: S<Vec<Mass>>,
    lift: Option<S<LiftSec>>,
    tip: Option<S<TipSec>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct LiftSec {
    feet: Option<S<Vec<i64>>>,
    height: Option<S<Length>>,
    height_uncertainty: Option<S<Length>>,
    toward: Option<S<crate::input::rigfile::Degrees>>,
    angle: Option<S<crate::input::rigfile::Degrees>>,
    angle_uncertainty: Option<S<crate::input::rigfile::Degrees>>,
    readings: S<Vec<Mass>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct TipSec {
    edge: S<[i64; 2]>,
    angle: S<crate::input::rigfile::Degrees>,
    angle_uncertainty: Option<S<crate::input::rigfile::Degrees>>,
}

/// Default standard uncertainty of a lift height, metres (1 mm).
pub const DEFAULT_HEIGHT_UNCERTAINTY_M: f32 = 0.001;
/// Default standard uncertainty of an inclinometer or tip angle, degrees.
pub const DEFAULT_ANGLE_UNCERTAINTY_DEG: f32 = 0.5;

/// A weighing file, read and checked.
#[derive(Clone, Debug, PartialEq)]
pub struct WeighingInput {
    /// Standard uncertainty of one reading, N.
    pub reading_uncertainty_n: f32,
    /// The level readings, N, in the rig file's foot order.
    pub level_n: Vec<f32>,
    /// The lift test: its geometry and readings (N), when given.
    pub lift: Option<(LiftGeometry, Vec<f32>)>,
    /// The tip test, when given.
    pub tip: Option<TipTest>,
    /// Where each key is in the file, for [`core_error`].
    pub spans: KeySpans,
}

/// Reads and checks a weighing file for a rig with `n_feet` feet.
///
/// # Errors
/// [`InputError`] naming the file, key, value and accepted range.
pub fn read(src: &SourceText, n_feet: usize) -> Result<WeighingInput, InputError> {
    let file: WeighingFile = src.parse_toml()?;
    let ck = src.checker();
    let u_n = reading_uncertainty_n(src, &file)?;
    let count = |key: &str, v: &S<Vec<Mass>>| {
        if v.get_ref().len() == n_feet {
            Ok(())
        } else {
            Err(ck.error(
                key,
                v.span(),
                format!(
                    "{} readings for a rig with {n_feet} feet (accepted: one per foot, in the rig file's foot order)",
                    v.get_ref().len()
                ),
            ))
        }
    };
    count("level", &file.level)?;
    let level = newtons(file.level.get_ref());
    let lift = match &file.lift {
        None => None,
        Some(l) => {
            let g = l.get_ref();
            count("lift.readings", &g.readings)?;
            let loads_n = newtons(g.readings.get_ref());
            Some((lift_geometry(src, l, n_feet)?, loads_n))
        }
    };
    let tip = match &file.tip {
        None => None,
        Some(t) => Some(tip_test(src, t, n_feet)?),
    };
    Ok(WeighingInput {
        reading_uncertainty_n: u_n,
        level_n: level,
        lift,
        tip,
        spans: key_spans(&file),
    })
}

fn feet_mask(
    src: &SourceText,
    key: &str,
    list: &S<Vec<i64>>,
    n_feet: usize,
) -> Result<u8, InputError> {
    let mut mask = 0_u8;
    for &i in list.get_ref() {
        let ok = usize::try_from(i).ok().filter(|&k| k < n_feet);
        let Some(k) = ok else {
            return Err(src.checker().error(
                key,
                list.span(),
                format!(
                    "foot {i} does not exist (accepted: 0 to {}, the rig file's foot order)",
                    n_feet.saturating_sub(1)
                ),
            ));
        };
        mask |= 1_u8 << k;
    }
    Ok(mask)
}

fn newtons(list: &[Mass]) -> Vec<f32> {
    list.iter()
        .map(|m| f(m.kg()) * STANDARD_GRAVITY_MPS2)
        .collect()
}

/// The standard uncertainty of one reading, N: `reading_uncertainty`, or
/// the scales' `resolution` / √12.
fn reading_uncertainty_n(src: &SourceText, file: &WeighingFile) -> Result<f32, InputError> {
    let ck = src.checker();
    Ok(match (&file.reading_uncertainty, &file.resolution) {
        (Some(u), _) => {
            f(ck.range(
                "reading_uncertainty",
                u,
                Mass::from_kg(1e-6),
                Mass::from_kg(1e3),
                "kg",
            )?
            .kg())
                * STANDARD_GRAVITY_MPS2
        }
        (None, Some(r)) => {
            // GUM §4.3.7: a rectangular error of half-width r/2 has standard
            // uncertainty r/√12.
            f(ck.range(
                "resolution",
                r,
                Mass::from_kg(1e-6),
                Mass::from_kg(1e3),
                "kg",
            )?
            .kg())
                * STANDARD_GRAVITY_MPS2
                / 12f32.sqrt()
        }
        (None, None) => {
            return Err(InputError {
                at: Some(src.location(0)),
                key: Some("resolution".into()),
                value: None,
                problem: "give the scales' `resolution` (or `reading_uncertainty`)".into(),
            })
        }
    })
}

/// The geometry of the `[lift]` test: raised feet and height, or an
/// inclinometer's direction and angle.
fn lift_geometry(
    src: &SourceText,
    l: &S<LiftSec>,
    n_feet: usize,
) -> Result<LiftGeometry, InputError> {
    let ck = src.checker();
    let g = l.get_ref();
    Ok(match (&g.feet, &g.height, &g.toward, &g.angle) {
        (Some(feet), Some(h), None, None) => LiftGeometry::Feet {
            lifted_mask: feet_mask(src, "lift.feet", feet, n_feet)?,
            height_m: f(h.get_ref().m()),
            height_uncertainty_m: g
                .height_uncertainty
                .as_ref()
                .map_or(DEFAULT_HEIGHT_UNCERTAINTY_M, |u| f(u.get_ref().m())),
        },
        (None, None, Some(t), Some(a)) => LiftGeometry::Angle {
            raised_toward_rad: f(t.get_ref().0),
            angle_rad: f(a.get_ref().0),
            angle_uncertainty_rad: g
                .angle_uncertainty
                .as_ref()
                .map_or(DEFAULT_ANGLE_UNCERTAINTY_DEG.to_radians(), |u| {
                    f(u.get_ref().0)
                }),
        },
        _ => {
            return Err(ck.error(
                "lift",
                l.span(),
                "give either `feet` and `height` (feet raised by a measured height) \
                 or `toward` and `angle` (an inclinometer reading), not a mix",
            ))
        }
    })
}

/// The `[tip]` test: the edge's two feet and the angle.
fn tip_test(src: &SourceText, t: &S<TipSec>, n_feet: usize) -> Result<TipTest, InputError> {
    let ck = src.checker();
    let g = t.get_ref();
    let [a, b] = *g.edge.get_ref();
    let idx = |i: i64| {
        u8::try_from(i)
            .ok()
            .filter(|&k| usize::from(k) < n_feet)
            .ok_or_else(|| {
                ck.error(
                    "tip.edge",
                    g.edge.span(),
                    format!(
                        "foot {i} does not exist (accepted: 0 to {})",
                        n_feet.saturating_sub(1)
                    ),
                )
            })
    };
    Ok(TipTest {
        edge_feet: [idx(a)?, idx(b)?],
        angle_rad: f(g.angle.get_ref().0),
        angle_uncertainty_rad: g
            .angle_uncertainty
            .as_ref()
            .map_or(DEFAULT_ANGLE_UNCERTAINTY_DEG.to_radians(), |u| {
                f(u.get_ref().0)
            }),
    })
}

/// Where each weighing key is in the file.
fn key_spans(file: &WeighingFile) -> KeySpans {
    let mut spans: KeySpans = vec![("level", file.level.span())];
    if let Some(l) = &file.lift {
        let g = l.get_ref();
        spans.push(("lift.readings", g.readings.span()));
        if let Some(v) = &g.feet {
            spans.push(("lift.feet", v.span()));
        }
        if let Some(v) = &g.height {
            spans.push(("lift.height", v.span()));
        }
        if let Some(v) = &g.height_uncertainty {
            spans.push(("lift.height_uncertainty", v.span()));
        }
        if let Some(v) = &g.angle {
            spans.push(("lift.angle", v.span()));
        }
        if let Some(v) = &g.angle_uncertainty {
            spans.push(("lift.angle_uncertainty", v.span()));
        }
    }
    if let Some(t) = &file.tip {
        let g = t.get_ref();
        spans.push(("tip.edge", g.edge.span()));
        spans.push(("tip.angle", g.angle.span()));
        if let Some(v) = &g.angle_uncertainty {
            spans.push(("tip.angle_uncertainty", v.span()));
        }
    }
    spans
}

/// Where each weighing key is in the file, for the core's errors.
pub type KeySpans = Vec<(&'static str, std::ops::Range<usize>)>;

/// A core error about a weighing as an [`InputError`] naming the weighing
/// file's key.
#[must_use]
pub fn core_error(src: &SourceText, e: &standfast::Error, spans: &KeySpans) -> InputError {
    use standfast::ErrorKind::{Inconsistent, OutOfRange, TooFew};
    let key = match e.field.path() {
        "weighing.level_n" => "level",
        "weighing.lift.loads_n" => "lift.readings",
        "weighing.lift.height_m" => "lift.height",
        "weighing.lift.height_uncertainty_m" => "lift.height_uncertainty",
        "weighing.lift.angle_rad" => "lift.angle",
        "weighing.lift.angle_uncertainty_rad" => "lift.angle_uncertainty",
        "weighing.lift.lifted_mask"
        | "weighing.lift.lifted_feet"
        | "weighing.lift.resting_feet" => "lift.feet",
        "weighing.tip.angle_rad" => "tip.angle",
        "weighing.tip.angle_uncertainty_rad" => "tip.angle_uncertainty",
        "weighing.tip.edge_feet" => "tip.edge",
        other => other,
    };
    let kg = |n: f32| fmt_g(f64::from(n / STANDARD_GRAVITY_MPS2));
    let mm = |m: f32| fmt_g((f64::from(m) * 1e4).round() / 10.0);
    let deg = |r: f32| fmt_g((f64::from(r.to_degrees()) * 1e3).round() / 1e3);
    let problem = match (e.kind, e.field.path()) {
        (Inconsistent, "weighing.lift.resting_feet") => {
            "the feet left resting do not lie on one line, so the rig cannot turn about them: \
             raise one whole side"
                .to_owned()
        }
        (TooFew, "weighing.lift.resting_feet") | (OutOfRange, "weighing.lift.lifted_mask") => {
            "raise one side: at least one foot raised and at least two left resting on one line"
                .to_owned()
        }
        (Inconsistent, "weighing.lift.lifted_feet") => {
            "the raised feet are not all the same distance from the resting line (so they \
             cannot all be raised by the same height)"
                .to_owned()
        }
        (Inconsistent, "weighing.tip.edge_feet") => {
            "these two feet do not form an edge of the footprint".to_owned()
        }
        (
            OutOfRange,
            "weighing.lift.angle_rad"
            | "weighing.tip.angle_rad"
            | "weighing.lift.angle_uncertainty_rad"
            | "weighing.tip.angle_uncertainty_rad",
        ) => format!(
            "the angle {} deg is outside the accepted range {} to {} deg",
            deg(e.value),
            deg(e.min),
            deg(e.max)
        ),
        (OutOfRange, "weighing.lift.height_m" | "weighing.lift.height_uncertainty_m") => {
            format!(
                "{} mm is outside the accepted range {} to {} mm (a lift of at most 45°)",
                mm(e.value),
                mm(e.min),
                mm(e.max)
            )
        }
        (OutOfRange, "weighing.level_n" | "weighing.lift.loads_n") => match e.index {
            Some(i) if e.value > e.max => format!(
                "reading {i} is {} kg, above the largest accepted reading {} kg",
                kg(e.value),
                kg(e.max)
            ),
            Some(i) => format!(
                "reading {i} is {} kg: a reading below zero by more than three times the \
                 reading uncertainty ({} kg) cannot be right",
                kg(e.value),
                kg(-e.min)
            ),
            None => format!(
                "the readings add up to {} kg, less than ten times the reading uncertainty",
                kg(e.value)
            ),
        },
        _ => core_problem(e),
    };
    match spans.iter().find(|(k, _)| *k == key) {
        Some((k, span)) => src.checker().error(k, span.clone(), problem),
        None => InputError {
            at: Some(src.location(0)),
            key: Some(key.to_owned()),
            value: None,
            problem: format!("{}: {problem}", src.name()),
        },
    }
}
