//! What-if replays: the same logs through a changed rig, side by side.
//!
//! `standfast replay --rig RIG.toml [LOGS…] --what-if KEY=VALUE …` builds a
//! variant of the first rig from overrides and replays the logs through both
//! in one pass (one guard each). A second `--rig` file does the same with a
//! whole other rig. With two or more rigs the summary gains a side-by-side
//! table ([`Comparison`]) before the cautions, and the JSON a `comparison`
//! field.
//!
//! Overrides (values accept units; SI is the default):
//! * `ballast=<mass>@<x>,<y>,<z>`: adds a ballast mass at a point of the rig
//!   frame (x east, y north, z up from the ground below the tripod centre),
//!   e.g. `ballast=12 kg@0,0,0.3 m`; repeatable up to the rig's ballast
//!   capacity;
//! * `cover=on|off|as-logged`: the cover fitted all night, never fitted, or
//!   as the log says (the default);
//! * `watch_utilisation=`, `park_utilisation=`, `alarm_utilisation=`: the
//!   guard thresholds (dimensionless);
//! * `time_to_park=90 s`: the time the mount needs to park;
//! * `friction=0.4`: the foot–ground static friction coefficient;
//! * `tie_down=200 N`: the tie-down pull on every foot.
//!
//! **Caution.** A what-if is the same simplified static model with other
//! inputs: it compares estimates, it does not prove a set-up safe.

use serde::Serialize;
use standfast::guard::{AlertLevel, GuardConfig};
use standfast::rig::{BallastSpec, BodySpec, Rig, MAX_BALLAST, MAX_PART_MASS_KG};

use crate::error::Error;
use crate::input::located::{fmt_g, InputError};
use crate::input::rigfile::LoadedRig;
use crate::input::units::f32_of as f;
use crate::input::units::{split_number, Dim, Duration, Force, Length, Mass};
use crate::model::figures::Figures;
use crate::model::replay::{ReplayReport, RigReplay};

/// The cover state of a variant.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CoverMode {
    /// Fitted all night, whatever the log says.
    On,
    /// Never fitted (the rig without its cover).
    Off,
    /// As the log says.
    AsLogged,
}

/// One what-if override.
#[derive(Clone, Debug, PartialEq)]
pub enum Override {
    /// Added ballast: mass, kg, at a point of the rig frame, m.
    Ballast {
        /// Mass, kg.
        mass_kg: f64,
        /// Position `[x east, y north, z up]`, rig frame, metres.
        position_m: [f64; 3],
    },
    /// Cover state.
    Cover(CoverMode),
    /// Guard watch threshold, dimensionless.
    WatchUtilisation(f64),
    /// Guard park threshold, dimensionless.
    ParkUtilisation(f64),
    /// Guard alarm threshold, dimensionless.
    AlarmUtilisation(f64),
    /// Time to park, s.
    TimeToPark(f64),
    /// Static friction coefficient, dimensionless.
    Friction(f64),
    /// Tie-down pull per foot, N.
    TieDown(f64),
}

/// The override keys, for messages.
pub const KEYS: &str = "ballast, cover, watch_utilisation, park_utilisation, alarm_utilisation, time_to_park, friction, tie_down";

/// Accepted range of the friction coefficient (as the core checks it).
const FRICTION_RANGE: (f64, f64) = (0.0, 2.0);
/// Accepted range of the tie-down pull, N (as the core checks it).
const TIE_DOWN_RANGE_N: (f64, f64) = (0.0, 100_000.0);
/// Accepted range of the time to park, s (as the core checks it).
const TIME_TO_PARK_RANGE_S: (f64, f64) = (0.0, 3_600.0);
/// Largest distance of ballast from the rig origin along x or y, m, and
/// height, m (the core's envelope of a rig).
const BALLAST_OFFSET_M: f64 = 5.0;

/// A bad override: a command-line error (exit code 2) naming the option,
/// the key, the value (bounded) and what is accepted.
fn bad(key: &str, value: &str, problem: impl Into<String>) -> Error {
    Error::Usage(
        InputError {
            at: None,
            key: Some(format!("--what-if {}", crate::input::located::bounded(key))),
            value: Some(format!("\"{}\"", crate::input::located::bounded(value))),
            problem: problem.into(),
        }
        .to_string(),
    )
}

fn in_range(key: &str, value: &str, x: f64, lo: f64, hi: f64, unit: &str) -> Result<f64, Error> {
    if x.is_finite() && x >= lo && x <= hi {
        Ok(x)
    } else {
        Err(bad(
            key,
            value,
            format!(
                "outside the accepted range {} to {}{unit}",
                fmt_g(lo),
                fmt_g(hi)
            ),
        ))
    }
}

/// A plain number in `[lo, hi]`.
fn ranged(key: &str, value: &str, lo: f64, hi: f64) -> Result<f64, Error> {
    let x = value.trim().parse::<f64>().map_err(|_| {
        bad(
            key,
            value,
            format!(
                "not a number (accepted range {} to {})",
                fmt_g(lo),
                fmt_g(hi)
            ),
        )
    })?;
    in_range(key, value, x, lo, hi, "")
}

/// Reads `<x>,<y>,<z>` with an optional unit after each number or one unit
/// after the last that applies to all (`0,0,0.3 m`, `0 m,0 m,30 cm`).
fn position(key: &str, value: &str, text: &str) -> Result<[f64; 3], Error> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    if parts.len() != 3 {
        return Err(bad(
            key,
            value,
            "the position needs three coordinates x,y,z (rig frame: x east, y north, z up), e.g. 12 kg@0,0,0.3 m",
        ));
    }
    let mut nums = [(0.0, ""); 3];
    for (slot, p) in nums.iter_mut().zip(&parts) {
        *slot = split_number(p, Dim::Length).map_err(|e| bad(key, value, e.to_string()))?;
    }
    let common = nums.iter().rev().map(|n| n.1).find(|u| !u.is_empty());
    let mut out = [0.0; 3];
    for (o, (v, u)) in out.iter_mut().zip(nums) {
        let unit = if u.is_empty() {
            common.unwrap_or("m")
        } else {
            u
        };
        *o = Length::from_unit(v, unit)
            .map_err(|e| bad(key, value, e.to_string()))?
            .m();
    }
    Ok(out)
}

/// Parses one `KEY=VALUE` override.
///
/// # Errors
/// [`Error::Usage`] naming the override, its value and the accepted range or
/// set (exit code 2).
pub fn parse_override(text: &str) -> Result<Override, Error> {
    let Some((key, value)) = text.split_once('=') else {
        return Err(bad(
            text.trim(),
            "",
            format!("a what-if is KEY=VALUE with KEY one of {KEYS}"),
        ));
    };
    let key = key.trim();
    let v = value.trim();
    let quantity_err = |e: crate::input::units::UnitError| bad(key, v, e.to_string());
    match key {
        "ballast" => {
            let Some((m, at)) = v.split_once('@') else {
                return Err(bad(
                    key,
                    v,
                    "give a mass and a position, <mass>@<x>,<y>,<z>, e.g. 12 kg@0,0,0.3 m",
                ));
            };
            let mass = Mass::parse(m.trim()).map_err(quantity_err)?.kg();
            if !(mass.is_finite() && mass > 0.0 && mass <= f64::from(MAX_PART_MASS_KG)) {
                return Err(bad(
                    key,
                    v,
                    format!(
                        "the mass is outside the accepted range above 0 to {MAX_PART_MASS_KG} kg"
                    ),
                ));
            }
            let p = position(key, v, at)?;
            let [x, y, z] = p;
            let r = BALLAST_OFFSET_M;
            if !(x.abs() <= r && y.abs() <= r && (0.0..=r).contains(&z)) {
                return Err(bad(
                    key,
                    v,
                    format!("the position is outside the accepted range x and y -{r} to {r} m, z 0 to {r} m"),
                ));
            }
            Ok(Override::Ballast {
                mass_kg: mass,
                position_m: p,
            })
        }
        "cover" => match v.to_ascii_lowercase().as_str() {
            "on" => Ok(Override::Cover(CoverMode::On)),
            "off" => Ok(Override::Cover(CoverMode::Off)),
            "as-logged" | "as_logged" => Ok(Override::Cover(CoverMode::AsLogged)),
            _ => Err(bad(key, v, "accepted values: on, off, as-logged")),
        },
        "watch_utilisation" => {
            // The core's lower bound; the upper one is the park and alarm
            // thresholds, checked once all overrides are applied.
            Ok(Override::WatchUtilisation(ranged(key, v, 0.05, 1.0)?))
        }
        "park_utilisation" => Ok(Override::ParkUtilisation(ranged(key, v, 0.05, 1.0)?)),
        "alarm_utilisation" => Ok(Override::AlarmUtilisation(ranged(key, v, 0.05, 1.0)?)),
        "time_to_park" => {
            let s = Duration::parse(v).map_err(quantity_err)?.s();
            let (lo, hi) = TIME_TO_PARK_RANGE_S;
            Ok(Override::TimeToPark(in_range(key, v, s, lo, hi, " s")?))
        }
        "friction" => {
            let (lo, hi) = FRICTION_RANGE;
            Ok(Override::Friction(ranged(key, v, lo, hi)?))
        }
        "tie_down" => {
            let n = Force::parse(v).map_err(quantity_err)?.n();
            let (lo, hi) = TIE_DOWN_RANGE_N;
            Ok(Override::TieDown(in_range(key, v, n, lo, hi, " N")?))
        }
        _ => Err(bad(key, v, format!("no such what-if; the keys are {KEYS}"))),
    }
}

/// The variant of `base` with the overrides applied (`texts` are the
/// overrides as written, for the variant's name).
///
/// `cover=on` makes the cover a permanent part (its mass and wind area all
/// night) that hides the bodies under it, whatever the log says;
/// `cover=off` removes the cover. Either way the variant's guard takes no
/// cover samples from the logs ([`LoadedRig::cover_input`]).
///
/// # Errors
/// [`Error::Usage`] naming the override when the variant is not valid
/// (thresholds out of order, too many ballast items, `cover=on` without a
/// cover, a value the core rejects).
pub fn variant(
    base: &LoadedRig,
    overrides: &[Override],
    texts: &[String],
) -> Result<LoadedRig, Error> {
    let mut spec = base.spec.clone();
    let mut guard = base.guard.clone();
    let mut tie_down: Option<f64> = None;
    let text_of = |i: usize| texts.get(i).cloned().unwrap_or_default();
    for (i, o) in overrides.iter().enumerate() {
        let t = text_of(i);
        let (key, value) = t.split_once('=').unwrap_or((&t, ""));
        match *o {
            Override::Ballast {
                mass_kg,
                position_m,
            } => {
                let b = BallastSpec {
                    mass_kg: f(mass_kg),
                    position_m: position_m.map(f),
                };
                if spec.ballast.push(b).is_err() {
                    return Err(bad(
                        key,
                        value,
                        format!("the rig takes at most {MAX_BALLAST} ballast items, with those in the rig file"),
                    ));
                }
            }
            Override::Cover(CoverMode::AsLogged) => {}
            Override::Cover(CoverMode::Off) => spec.cover = None,
            Override::Cover(CoverMode::On) => fit_cover(&mut spec, key, value)?,
            Override::WatchUtilisation(x) => guard.watch_utilisation = f(x),
            Override::ParkUtilisation(x) => guard.park_utilisation = f(x),
            Override::AlarmUtilisation(x) => guard.alarm_utilisation = f(x),
            Override::TimeToPark(s) => guard.time_to_park_s = f(s),
            Override::Friction(mu) => spec.friction_coefficient = f(mu),
            Override::TieDown(n) => tie_down = Some(n),
        }
    }
    if let Some(n) = tie_down {
        for foot in &mut spec.feet {
            foot.tie_down_n = f(n);
        }
    }
    check_threshold_order(&guard, texts)?;
    guard.validate().map_err(|e| {
        bad(
            "",
            "",
            format!(
                "the variant's guard settings are not valid: {}",
                crate::input::core_error::core_problem(&e)
            ),
        )
    })?;
    if base.measured.is_some() {
        // The weighed centre replaced the ground parts' masses for the rig as
        // weighed; a variant changes what was weighed, so it cannot carry it.
        return Err(bad(
            "",
            "",
            "variants of a rig file with a [measured] section are not supported: \
             compare variants of the file without it, or weigh each variant"
                .to_owned(),
        ));
    }
    let rig = Rig::new(&spec).map_err(|e| {
        bad(
            "",
            "",
            format!(
                "the variant rig is not valid: {}",
                crate::input::core_error::core_problem(&e)
            ),
        )
    })?;
    Ok(LoadedRig {
        file: format!("{} with {}", base.file, texts.join(", ")),
        spec,
        rig,
        guard,
        elevation_m: base.elevation_m,
        shaft_hardware: base.shaft_hardware.clone(),
        air: base.air,
        measured: None,
        hardware: base.hardware.clone(),
        cover_input: !overrides
            .iter()
            .any(|o| matches!(o, Override::Cover(CoverMode::On | CoverMode::Off))),
    })
}

/// `cover=on`: the cover becomes a permanent body (its mass and wind area
/// all night) and the bodies under it lose their wind area.
fn fit_cover(spec: &mut standfast::rig::RigSpec, key: &str, value: &str) -> Result<(), Error> {
    let Some(c) = spec.cover.take() else {
        return Err(bad(key, value, "the rig file has no [cover] to fit"));
    };
    let mut label = standfast::rig::Label::new();
    let _ = label.push_str("cover (fitted)");
    let body = BodySpec {
        label,
        stage: standfast::rig::Stage::Secondary,
        mass_kg: c.mass_kg,
        cg_m: c.centre_m,
        exposure: Some(standfast::shape::Exposure {
            shape: standfast::shape::Shape::Box {
                size_m: c.size_m,
                edges: None,
            },
            centre_m: c.centre_m,
            drag_coefficient: c.drag_coefficient,
            end_drag_coefficient: None,
        }),
        mass_model: standfast::rig::MassModel::Shell,
        under_cover: false,
    };
    for b in &mut spec.bodies {
        if b.under_cover {
            // Shielded all night: its mass counts, not its area.
            b.exposure = None;
            b.under_cover = false;
        }
    }
    if spec.bodies.push(body).is_err() {
        return Err(bad(
            key,
            value,
            format!(
                "the rig already has the most bodies ({}); the fitted cover cannot be added",
                standfast::rig::MAX_BODIES
            ),
        ));
    }
    Ok(())
}

/// The park and alarm thresholds must not be below the watch threshold;
/// the error names the override that broke the order.
fn check_threshold_order(guard: &GuardConfig, texts: &[String]) -> Result<(), Error> {
    let find = |k: &str| -> (String, String) {
        texts
            .iter()
            .rev()
            .find_map(|t| {
                t.split_once('=')
                    .filter(|(key, _)| key.trim() == k)
                    .map(|(key, v)| (key.trim().to_owned(), v.trim().to_owned()))
            })
            .unwrap_or_else(|| (k.to_owned(), String::new()))
    };
    let w = f64::from(guard.watch_utilisation);
    for (k, x) in [
        ("park_utilisation", guard.park_utilisation),
        ("alarm_utilisation", guard.alarm_utilisation),
    ] {
        if f64::from(x) < w {
            let (key, value) = if texts.iter().any(|t| t.trim_start().starts_with(k)) {
                find(k)
            } else {
                find("watch_utilisation")
            };
            return Err(bad(
                &key,
                &value,
                format!(
                    "{k} must not be below watch_utilisation: accepted range {} to 1 with watch_utilisation {}",
                    fmt_g(w),
                    fmt_g(w)
                ),
            ));
        }
    }
    Ok(())
}

/// Parses the overrides and builds the variant of `base`.
///
/// # Errors
/// As [`parse_override`] and [`variant`].
pub fn variant_from_texts(base: &LoadedRig, texts: &[String]) -> Result<LoadedRig, Error> {
    let overrides = texts
        .iter()
        .map(|t| parse_override(t))
        .collect::<Result<Vec<_>, _>>()?;
    variant(base, &overrides, texts)
}

/// One rig's line of the side-by-side comparison.
///
/// Its JSON object has, in this order, `column`, `rig`,
/// `overturning_utilisation`, `overturning_t_s`, `tip_wind_mps`,
/// `sliding_utilisation`, `drive_utilisation` (two numbers or nulls), then
/// the level fields.
#[derive(Clone, Debug, PartialEq)]
pub struct RigLine {
    /// Column letter (A, B, ...).
    pub column: String,
    /// The rig file, or the base file with its overrides.
    pub rig: String,
    /// The figures of the closest approach to tipping (the record of the
    /// highest overturning utilisation, dimensionless, 1.0 tips), except
    /// `sliding_utilisation` and `drive_utilisation`: the replay's highest
    /// (each drive axis its own; an axis that never had a finite figure is
    /// NaN, read through [`RigLine::drive`]).
    pub figures: Figures,
    /// Time of the highest overturning utilisation, seconds since the
    /// first record.
    pub overturning_t_s: Option<f64>,
    /// Most severe level reached.
    pub highest_level: AlertLevel,
    /// First park request (level change to park_now or alarm), seconds since
    /// the first record.
    pub first_park_t_s: Option<f64>,
    /// First alarm, seconds since the first record.
    pub first_alarm_t_s: Option<f64>,
    /// Seconds in watch, park_now, alarm and sensor_fault.
    pub watch_s: f64,
    /// Seconds in park_now.
    pub park_now_s: f64,
    /// Seconds in alarm.
    pub alarm_s: f64,
    /// Seconds in sensor_fault.
    pub sensor_fault_s: f64,
    /// AlertLevel changes (kept and not kept).
    pub level_changes: u64,
}

impl RigLine {
    /// The highest drive utilisation of axis `i` (0 primary, 1 secondary),
    /// `None` when the axis never had a finite figure.
    #[must_use]
    pub fn drive(&self, i: usize) -> Option<f32> {
        self.figures.drive(i).filter(|u| u.is_finite())
    }
}

/// The JSON shape of a [`RigLine`].
#[derive(Serialize)]
struct RigLineJson<'a> {
    column: &'a str,
    rig: &'a str,
    overturning_utilisation: Option<f32>,
    overturning_t_s: Option<f64>,
    tip_wind_mps: Option<f32>,
    sliding_utilisation: Option<f32>,
    drive_utilisation: [Option<f32>; 2],
    highest_level: AlertLevel,
    first_park_t_s: Option<f64>,
    first_alarm_t_s: Option<f64>,
    watch_s: f64,
    park_now_s: f64,
    alarm_s: f64,
    sensor_fault_s: f64,
    level_changes: u64,
}

impl Serialize for RigLine {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        RigLineJson {
            column: &self.column,
            rig: &self.rig,
            overturning_utilisation: self.figures.overturning_utilisation,
            overturning_t_s: self.overturning_t_s,
            tip_wind_mps: self.figures.tip_wind_mps,
            sliding_utilisation: self.figures.sliding_utilisation,
            drive_utilisation: [self.drive(0), self.drive(1)],
            highest_level: self.highest_level,
            first_park_t_s: self.first_park_t_s,
            first_alarm_t_s: self.first_alarm_t_s,
            watch_s: self.watch_s,
            park_now_s: self.park_now_s,
            alarm_s: self.alarm_s,
            sensor_fault_s: self.sensor_fault_s,
            level_changes: self.level_changes,
        }
        .serialize(s)
    }
}

/// The side-by-side comparison of the rigs of one replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Comparison {
    /// One line per rig, in the order given (A is the first `--rig`).
    pub rigs: Vec<RigLine>,
}

fn column(i: usize) -> String {
    u8::try_from(i).ok().filter(|i| *i < 26).map_or_else(
        || format!("R{}", i + 1),
        |i| char::from(b'A' + i).to_string(),
    )
}

fn line(i: usize, r: &RigReplay) -> RigLine {
    let secs = |s: AlertLevel| {
        r.level_time
            .iter()
            .find(|t| t.level == s)
            .map_or(0.0, |t| t.seconds)
    };
    let first = |pred: &dyn Fn(AlertLevel) -> bool| {
        r.level_changes.iter().find(|c| pred(c.to)).map(|c| c.t_s)
    };
    let mut figures = r
        .overturning
        .as_ref()
        .map_or_else(Figures::default, |a| Figures {
            overturning_utilisation: Some(a.utilisation),
            ..a.figures
        });
    figures.sliding_utilisation = r.sliding.as_ref().map(|a| a.utilisation);
    let drive = |i: usize| {
        r.drive
            .get(i)
            .and_then(Option::as_ref)
            .map_or(f32::NAN, |a| a.utilisation)
    };
    figures.drive_utilisation =
        (r.drive[0].is_some() || r.drive[1].is_some()).then(|| [drive(0), drive(1)]);
    RigLine {
        column: column(i),
        rig: r.rig_file.clone(),
        figures,
        overturning_t_s: r.overturning.as_ref().map(|a| a.t_s),
        highest_level: r.highest_level,
        first_park_t_s: first(&|s| s == AlertLevel::ParkNow || s == AlertLevel::Alarm),
        first_alarm_t_s: first(&|s| s == AlertLevel::Alarm),
        watch_s: secs(AlertLevel::Watch),
        park_now_s: secs(AlertLevel::ParkNow),
        alarm_s: secs(AlertLevel::Alarm),
        sensor_fault_s: secs(AlertLevel::SensorFault),
        level_changes: r.level_changes.len() as u64 + r.level_changes_not_kept,
    }
}

/// The comparison of a replay's rigs.
#[must_use]
pub fn compare(rep: &ReplayReport) -> Comparison {
    Comparison {
        rigs: rep
            .rigs
            .iter()
            .enumerate()
            .map(|(i, r)| line(i, r))
            .collect(),
    }
}
