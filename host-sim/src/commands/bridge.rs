//! The live bridge: samples in on standard input, one guard verdict per line
//! out on standard output.
//!
//! `standfast bridge --rig RIG.toml [--format json|csv] [--clock sample|wall]
//! [--on-change CMD]` reads one sample per line (JSON lines, or CSV with a
//! header line), steps one core [`Guard`] per sample and writes one JSON
//! line per sample, flushed at once, so another program can hold a pipe open
//! and read its answer after each line it writes.
//!
//! **Input schema** (JSON keys and CSV column names; every field is optional
//! except the time with `--clock sample`; units are in the names):
//!
//! | name | meaning | accepted |
//! |---|---|---|
//! | `t_ms` | sample time, whole milliseconds since any epoch | integer ≥ 0 |
//! | `t_s` | sample time, seconds since any epoch (instead of `t_ms`) | ≥ 0 |
//! | `accel_g` | accelerometer `[x, y, z]` in g, rig frame (x east, y north, z up) | each −16 to 16 |
//! | `accel_x_g`, `accel_y_g`, `accel_z_g` | the same, one per field (all three together) | each −16 to 16 |
//! | `wind_mps` | wind speed at the anemometer, m/s | 0 to the rig's `wind.max_speed_mps` |
//! | `wind_from_deg` | direction the wind blows from, degrees clockwise from north | 0 to 360 |
//! | `ha_deg`, `dec_deg` | hour angle (positive west) and declination, degrees | −180 to 180, −90 to 90 |
//! | `pier_side` | `tube_east` or `tube_west` | |
//! | `primary_axis_deg`, `secondary_axis_deg` | mechanical axis angles, degrees (instead of hour angle and declination) | −360 to 360 |
//! | `cover` | cover fitted | `true`/`false` (CSV also `1`/`0`) |
//! | `temp_c`, `pressure_hpa` | air temperature, °C, and station pressure, hPa | −90 to 60, 300 to 1100 |
//! | `ack` | acknowledge a latched alarm before this step | `true`/`false` |
//!
//! Pose and air values hold until changed: a line that gives only `dec_deg`
//! reuses the last hour angle and pier side (tube east until one is given).
//! A line that completes no pose (a declination with no hour angle ever
//! seen) or no air state (a temperature with no pressure ever seen) is an
//! error. The ±16 g bound is the largest full scale of common MEMS
//! accelerometers (common practice, no source); the air bounds enclose the
//! recorded surface extremes (−89.2 °C, 56.7 °C; from memory) and station
//! pressures up to about 9 km of altitude.
//!
//! **Time.** With `--clock sample` (the default) the sample's own time is
//! used; a time earlier than the previous accepted one, or more than
//! [`MAX_STEP_MS`] (one hour) after it, is an error for that line and does
//! not move the clock (equal times are accepted). With `--clock wall` the bridge reads a
//! monotonic clock (milliseconds since start) and ignores `t_ms`/`t_s`; this
//! is the only place the command reads a clock, the core never does.
//!
//! **Output.** One JSON object per non-blank input line (blank lines and the
//! CSV header give nothing): a verdict (see [`VerdictLine`]) or an error
//! `{"line": N, "error": "..."}`. Errors are also written to standard
//! error; they never stop the stream. The command ends with exit code 0 at
//! the end of input. The cautions are written once to standard error at
//! start.
//!
//! **State changes.** With `--on-change CMD`, every stage change spawns
//! `sh -c CMD` with `STANDFAST_STAGE`, `STANDFAST_PREVIOUS_STAGE`,
//! `STANDFAST_T_MS` and `STANDFAST_CAUSE` in its environment, standard input
//! from nothing and standard output to the bridge's standard error (standard
//! output stays machine-readable). The bridge does not wait: children are
//! reaped after later lines and waited for at the end of input. Spawn
//! failures and non-zero exits are reported on standard error.
//!
//! **Caution.** A verdict is an estimate from a static model and live sensors;
//! it does not replace securing the rig.

use std::io::{BufRead, Write};
use std::path::PathBuf;
use std::process::{Child, Command, Stdio};
use std::time::Instant;

use clap::{Args, ValueEnum};
use serde::{Deserialize, Serialize};
use standfast::guard::{AirSample, Cause, Event, Guard, GuardConfig, Inputs, Verdict, WindSample};
use standfast::mount::{PierSide, Pose};
use standfast::sense::{Millis, Mounting};

use crate::cautions::CAUTIONS;
use crate::input::error::Error;
use crate::input::located::{bounded, bounded_to, fmt_g, MAX_PROBLEM_CHARS};
use crate::input::rigfile::{self, LoadedRig};
use crate::input::units::f32_of;
use crate::model::figures::Figures;

/// Input line format.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum, Default)]
pub enum InputFormat {
    /// One JSON object per line.
    #[default]
    Json,
    /// CSV: a header line of field names, then one sample per line.
    Csv,
}

/// Where the time of a step comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum, Default)]
pub enum ClockKind {
    /// The sample's `t_ms` or `t_s`.
    #[default]
    Sample,
    /// A monotonic wall clock, milliseconds since the bridge started.
    Wall,
}

/// Arguments of `bridge`.
#[derive(Debug, Args)]
pub struct BridgeArgs {
    /// The rig file.
    #[arg(long, value_name = "RIG.toml")]
    pub rig: PathBuf,
    /// Input line format.
    #[arg(long, value_enum, default_value_t = InputFormat::Json)]
    pub format: InputFormat,
    /// Command run with `sh -c` on every stage change (environment:
    /// STANDFAST_STAGE, STANDFAST_PREVIOUS_STAGE, STANDFAST_T_MS, STANDFAST_CAUSE).
    #[arg(long, value_name = "CMD")]
    pub on_change: Option<String>,
    /// Time source: the samples' own time, or the wall clock since start.
    #[arg(long, value_enum, default_value_t = ClockKind::Sample)]
    pub clock: ClockKind,
}

/// One parsed input line, before range checks. Units are in the names.
#[derive(Clone, Debug, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Sample {
    /// Time, whole milliseconds.
    pub t_ms: Option<u64>,
    /// Time, seconds.
    pub t_s: Option<f64>,
    /// Accelerometer, g, rig frame `[x east, y north, z up]`.
    pub accel_g: Option<[f64; 3]>,
    /// Accelerometer x (east), g.
    pub accel_x_g: Option<f64>,
    /// Accelerometer y (north), g.
    pub accel_y_g: Option<f64>,
    /// Accelerometer z (up), g.
    pub accel_z_g: Option<f64>,
    /// Wind speed at the anemometer, m/s.
    pub wind_mps: Option<f64>,
    /// Direction the wind blows from, degrees clockwise from north.
    pub wind_from_deg: Option<f64>,
    /// Hour angle, degrees, positive west.
    pub ha_deg: Option<f64>,
    /// Declination, degrees.
    pub dec_deg: Option<f64>,
    /// Pier side.
    pub pier_side: Option<PierSide>,
    /// Primary axis angle, degrees.
    pub primary_axis_deg: Option<f64>,
    /// Secondary axis angle, degrees.
    pub secondary_axis_deg: Option<f64>,
    /// Cover fitted.
    pub cover: Option<bool>,
    /// Air temperature, °C.
    pub temp_c: Option<f64>,
    /// Station pressure, hPa.
    pub pressure_hpa: Option<f64>,
    /// Acknowledge a latched alarm.
    pub ack: Option<bool>,
}

/// Parses one JSON line into a [`Sample`].
///
/// # Errors
/// A message naming what is wrong (malformed JSON, unknown field, wrong type).
pub fn parse_json_line(line: &str) -> Result<Sample, String> {
    serde_json::from_str(line).map_err(|e| format!("not a valid sample: {e}"))
}

/// The field names accepted in a CSV header, in schema order.
pub const FIELDS: [&str; 17] = [
    "t_ms",
    "t_s",
    "accel_g",
    "accel_x_g",
    "accel_y_g",
    "accel_z_g",
    "wind_mps",
    "wind_from_deg",
    "ha_deg",
    "dec_deg",
    "pier_side",
    "primary_axis_deg",
    "secondary_axis_deg",
    "cover",
    "temp_c",
    "pressure_hpa",
    "ack",
];

/// A CSV header: the field of each column.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CsvHeader {
    columns: Vec<String>,
}

fn split_csv(line: &str) -> Result<Vec<String>, String> {
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(line.as_bytes());
    let mut rec = csv::StringRecord::new();
    match rdr.read_record(&mut rec) {
        Ok(true) => Ok(rec.iter().map(|s| s.trim().to_owned()).collect()),
        Ok(false) => Ok(Vec::new()),
        Err(e) => Err(format!("not a valid CSV line: {e}")),
    }
}

impl CsvHeader {
    /// Parses a header line.
    ///
    /// # Errors
    /// An unknown or repeated column name, or `accel_g` (an array has no CSV
    /// column; use `accel_x_g`, `accel_y_g`, `accel_z_g`).
    pub fn parse(line: &str) -> Result<CsvHeader, String> {
        let columns = split_csv(line)?;
        for (i, c) in columns.iter().enumerate() {
            if c == "accel_g" {
                return Err("column accel_g: use accel_x_g, accel_y_g, accel_z_g in CSV".into());
            }
            if !FIELDS.contains(&c.as_str()) {
                return Err(format!(
                    "unknown column \"{}\"; accepted: {}",
                    bounded(c),
                    FIELDS
                        .iter()
                        .filter(|f| **f != "accel_g")
                        .copied()
                        .collect::<Vec<_>>()
                        .join(", ")
                ));
            }
            if columns.iter().take(i).any(|p| p == c) {
                return Err(format!("column \"{}\" appears twice", bounded(c)));
            }
        }
        Ok(CsvHeader { columns })
    }

    /// Parses a data row; an empty cell means the field is absent.
    ///
    /// # Errors
    /// A wrong number of cells or a cell that is not of its field's type.
    pub fn parse_row(&self, line: &str) -> Result<Sample, String> {
        let cells = split_csv(line)?;
        if cells.len() != self.columns.len() {
            return Err(format!(
                "{} cells where the header has {} columns",
                cells.len(),
                self.columns.len()
            ));
        }
        let mut s = Sample::default();
        for (name, cell) in self.columns.iter().zip(&cells) {
            if cell.is_empty() {
                continue;
            }
            let shown = bounded(cell);
            let num = || -> Result<f64, String> {
                cell.parse::<f64>()
                    .map_err(|_| format!("{name}: \"{shown}\" is not a number"))
            };
            let flag = || -> Result<bool, String> {
                match cell.to_ascii_lowercase().as_str() {
                    "true" | "1" => Ok(true),
                    "false" | "0" => Ok(false),
                    _ => Err(format!("{name}: \"{shown}\" is not true, false, 1 or 0")),
                }
            };
            match name.as_str() {
                "t_ms" => {
                    s.t_ms = Some(cell.parse::<u64>().map_err(|_| {
                        format!("t_ms: \"{shown}\" is not a whole number of milliseconds (accepted range 0 to {})", u64::MAX)
                    })?);
                }
                "t_s" => s.t_s = Some(num()?),
                "accel_x_g" => s.accel_x_g = Some(num()?),
                "accel_y_g" => s.accel_y_g = Some(num()?),
                "accel_z_g" => s.accel_z_g = Some(num()?),
                "wind_mps" => s.wind_mps = Some(num()?),
                "wind_from_deg" => s.wind_from_deg = Some(num()?),
                "ha_deg" => s.ha_deg = Some(num()?),
                "dec_deg" => s.dec_deg = Some(num()?),
                "pier_side" => {
                    s.pier_side = Some(match cell.as_str() {
                        "tube_east" => PierSide::TubeEast,
                        "tube_west" => PierSide::TubeWest,
                        _ => {
                            return Err(format!(
                                "pier_side: \"{shown}\" is not tube_east or tube_west"
                            ))
                        }
                    });
                }
                "primary_axis_deg" => s.primary_axis_deg = Some(num()?),
                "secondary_axis_deg" => s.secondary_axis_deg = Some(num()?),
                "cover" => s.cover = Some(flag()?),
                "temp_c" => s.temp_c = Some(num()?),
                "pressure_hpa" => s.pressure_hpa = Some(num()?),
                "ack" => s.ack = Some(flag()?),
                _ => return Err(format!("unknown column \"{}\"", bounded(name))),
            }
        }
        Ok(s)
    }
}

fn check(name: &str, v: f64, min: f64, max: f64, unit: &str) -> Result<f64, String> {
    if v.is_finite() && (min..=max).contains(&v) {
        Ok(v)
    } else {
        Err(format!(
            "{name} = {} is outside the accepted range {} to {} {unit}",
            fmt_g(v),
            fmt_g(min),
            fmt_g(max)
        ))
    }
}

/// Pose and air values that hold until changed.
#[derive(Clone, Copy, Debug, Default)]
struct Held {
    ha_deg: Option<f64>,
    dec_deg: Option<f64>,
    pier_side: Option<PierSide>,
    primary_deg: Option<f64>,
    secondary_deg: Option<f64>,
    temp_c: Option<f64>,
    pressure_hpa: Option<f64>,
}

/// A sample checked and turned into guard inputs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Checked {
    /// The sample's own time, when it gives one.
    pub t: Option<Millis>,
    /// The guard inputs.
    pub inputs: Inputs,
    /// Acknowledge a latched alarm.
    pub ack: bool,
}

/// A sample's own time: `t_ms`, or `t_s` rounded to whole ms; none when it
/// gives neither.
fn sample_time(s: &Sample) -> Result<Option<Millis>, String> {
    Ok(match (s.t_ms, s.t_s) {
        (Some(_), Some(_)) => return Err("give t_ms or t_s, not both".into()),
        (Some(ms), None) => Some(Millis(ms)),
        (None, Some(sec)) => {
            let sec = check("t_s", sec, 0.0, 1.8e16, "s")?;
            let ms = (sec * 1000.0).round();
            #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
            // 0 ≤ ms ≤ 1.8e19 < u64::MAX after the range check
            Some(Millis(ms as u64))
        }
        (None, None) => None,
    })
}

/// A sample's accelerometer reading in g (rig frame), from `accel_g` or the
/// three `accel_*_g` fields.
fn sample_accel(s: &Sample) -> Result<Option<[f32; 3]>, String> {
    let flat = [s.accel_x_g, s.accel_y_g, s.accel_z_g];
    Ok(match (s.accel_g, flat) {
        (Some(_), [None, None, None]) | (None, [Some(_), Some(_), Some(_)]) => {
            let a = s.accel_g.unwrap_or([
                s.accel_x_g.unwrap_or(0.0),
                s.accel_y_g.unwrap_or(0.0),
                s.accel_z_g.unwrap_or(0.0),
            ]);
            let mut out = [0.0_f32; 3];
            for (o, (v, n)) in out
                .iter_mut()
                .zip(a.iter().zip(["accel x", "accel y", "accel z"]))
            {
                *o = f32_of(check(n, *v, -16.0, 16.0, "g")?);
            }
            Some(out)
        }
        (None, [None, None, None]) => None,
        (Some(_), _) => return Err("give accel_g or accel_x_g/_y_g/_z_g, not both".into()),
        (None, _) => return Err("accel_x_g, accel_y_g and accel_z_g go together".into()),
    })
}

/// A sample's wind: speed (m/s, 0 to the rig's limit) and optional
/// direction it blows from (degrees → radians).
fn sample_wind(s: &Sample, max_wind_mps: f64) -> Result<Option<WindSample>, String> {
    Ok(match (s.wind_mps, s.wind_from_deg) {
        (Some(v), d) => Some(WindSample {
            speed_mps: f32_of(check("wind_mps", v, 0.0, max_wind_mps, "m/s")?),
            from_rad: match d {
                Some(d) => Some(f32_of(
                    check("wind_from_deg", d, 0.0, 360.0, "degrees")?.to_radians(),
                )),
                None => None,
            },
        }),
        (None, Some(_)) => return Err("wind_from_deg needs wind_mps on the same line".into()),
        (None, None) => None,
    })
}

impl Held {
    /// Range checks and the conversion to guard inputs; `self` is updated
    /// only when the whole line is accepted.
    fn check(&mut self, s: &Sample, max_wind_mps: f64) -> Result<Checked, String> {
        let mut next = *self;
        let t = sample_time(s)?;
        let accel = sample_accel(s)?;
        let wind = sample_wind(s, max_wind_mps)?;
        let eq_given = s.ha_deg.is_some() || s.dec_deg.is_some() || s.pier_side.is_some();
        let axes_given = s.primary_axis_deg.is_some() || s.secondary_axis_deg.is_some();
        if eq_given && axes_given {
            return Err("give hour angle/declination or axis angles, not both".into());
        }
        if let Some(h) = s.ha_deg {
            next.ha_deg = Some(check("ha_deg", h, -180.0, 180.0, "degrees")?);
        }
        if let Some(d) = s.dec_deg {
            next.dec_deg = Some(check("dec_deg", d, -90.0, 90.0, "degrees")?);
        }
        if let Some(p) = s.pier_side {
            next.pier_side = Some(p);
        }
        if let Some(a) = s.primary_axis_deg {
            next.primary_deg = Some(check("primary_axis_deg", a, -360.0, 360.0, "degrees")?);
        }
        if let Some(a) = s.secondary_axis_deg {
            next.secondary_deg = Some(check("secondary_axis_deg", a, -360.0, 360.0, "degrees")?);
        }
        let pose = if eq_given {
            match (next.ha_deg, next.dec_deg) {
                (Some(h), Some(d)) => Some(Pose::Equatorial {
                    hour_angle_rad: f32_of(h.to_radians()),
                    declination_rad: f32_of(d.to_radians()),
                    pier_side: next.pier_side.unwrap_or(PierSide::TubeEast),
                }),
                _ => {
                    return Err("a pose needs both ha_deg and dec_deg (given now or before)".into())
                }
            }
        } else if axes_given {
            match (next.primary_deg, next.secondary_deg) {
                (Some(a1), Some(a2)) => Some(Pose::Axes {
                    primary_rad: f32_of(a1.to_radians()),
                    secondary_rad: f32_of(a2.to_radians()),
                }),
                _ => {
                    return Err(
                        "a pose needs both primary_axis_deg and secondary_axis_deg (given now or before)"
                            .into(),
                    )
                }
            }
        } else {
            None
        };
        if let Some(tc) = s.temp_c {
            next.temp_c = Some(check("temp_c", tc, -90.0, 60.0, "°C")?);
        }
        if let Some(p) = s.pressure_hpa {
            next.pressure_hpa = Some(check("pressure_hpa", p, 300.0, 1100.0, "hPa")?);
        }
        let air = if s.temp_c.is_some() || s.pressure_hpa.is_some() {
            match (next.temp_c, next.pressure_hpa) {
                (Some(tc), Some(p)) => Some(AirSample {
                    temperature_c: f32_of(tc),
                    pressure_pa: f32_of(p * 100.0),
                }),
                _ => {
                    return Err(
                        "air needs both temp_c and pressure_hpa (given now or before)".into(),
                    )
                }
            }
        } else {
            None
        };
        *self = next;
        Ok(Checked {
            t,
            inputs: Inputs {
                accel_raw: accel,
                wind,
                pose,
                cover_fitted: s.cover,
                air,
            },
            ack: s.ack.unwrap_or(false),
        })
    }
}

/// A pose in degrees, as written in a verdict line.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum PoseOut {
    /// Hour angle (positive west), declination, pier side.
    Equatorial {
        /// Hour angle, degrees.
        ha_deg: f32,
        /// Declination, degrees.
        dec_deg: f32,
        /// Pier side.
        pier_side: PierSide,
    },
    /// Mechanical axis angles.
    Axes {
        /// Primary axis, degrees.
        primary_axis_deg: f32,
        /// Secondary axis, degrees.
        secondary_axis_deg: f32,
    },
    /// Horizontal coordinates of the tube.
    Horizontal {
        /// Azimuth, degrees clockwise from north.
        azimuth_deg: f32,
        /// Altitude, degrees.
        altitude_deg: f32,
        /// Pier side.
        pier_side: PierSide,
    },
}

impl From<Pose> for PoseOut {
    fn from(p: Pose) -> PoseOut {
        match p {
            Pose::Equatorial {
                hour_angle_rad,
                declination_rad,
                pier_side,
            } => PoseOut::Equatorial {
                ha_deg: hour_angle_rad.to_degrees(),
                dec_deg: declination_rad.to_degrees(),
                pier_side,
            },
            Pose::Axes {
                primary_rad,
                secondary_rad,
            } => PoseOut::Axes {
                primary_axis_deg: primary_rad.to_degrees(),
                secondary_axis_deg: secondary_rad.to_degrees(),
            },
            Pose::Horizontal {
                azimuth_rad,
                altitude_rad,
                pier_side,
            } => PoseOut::Horizontal {
                azimuth_deg: azimuth_rad.to_degrees(),
                altitude_deg: altitude_rad.to_degrees(),
                pier_side,
            },
        }
    }
}

/// An event of a step, as written in a verdict line.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum EventOut {
    /// The stage changed.
    StageChanged {
        /// Previous stage name.
        from: &'static str,
        /// New stage name.
        to: &'static str,
        /// What drove it.
        cause: String,
    },
    /// A sensor fault was first seen.
    FaultRaised {
        /// The fault, in words.
        fault: String,
    },
    /// The highest overturning utilisation since start rose.
    NewHighUtilisation {
        /// Overturning utilisation, dimensionless.
        utilisation: f32,
    },
}

/// The snake-case name of a cause ([`Cause::name`]).
#[must_use]
pub fn cause_name(c: Cause) -> String {
    c.name().to_owned()
}

/// One verdict line. Utilisations are dimensionless (1.0 tips, slides or
/// overloads); speeds m/s at rig height; angles degrees (directions
/// clockwise from north, the direction the wind blows from).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct VerdictLine {
    /// Input line number, from 1.
    pub line: u64,
    /// Time of the step, ms (the sample's, or since start with the wall clock).
    pub t_ms: u64,
    /// Stage name: clear, watch, park_now, alarm, sensor_fault.
    pub stage: &'static str,
    /// The park-request output.
    pub park_requested: bool,
    /// The alarm output.
    pub alarm: bool,
    /// The verdict's figures (fields of their own in the JSON line, in
    /// this order).
    #[serde(flatten)]
    pub figures: Figures,
    /// The pose the figures are for.
    pub pose: PoseOut,
    /// With a park request: the safest park pose.
    pub park_pose: Option<PoseOut>,
    /// Whether this line acknowledged the alarm.
    pub acknowledged: bool,
    /// Active sensor faults, in words.
    pub faults: Vec<String>,
    /// Events of this step.
    pub events: Vec<EventOut>,
    /// Events of this step that did not fit in the verdict (0 normally).
    pub events_lost: u16,
}

impl VerdictLine {
    /// The line for a verdict.
    #[must_use]
    pub fn new(line: u64, v: &Verdict, acknowledged: bool) -> VerdictLine {
        VerdictLine {
            line,
            t_ms: v.now.0,
            stage: v.stage.name(),
            park_requested: v.stage.park_requested(),
            alarm: v.stage.alarm(),
            figures: Figures::of(v),
            pose: v.pose.into(),
            park_pose: v.park_pose.map(PoseOut::from),
            acknowledged,
            faults: v.faults.iter().map(|f| f.to_string()).collect(),
            events: v
                .events
                .iter()
                .map(|e| match *e {
                    Event::StageChanged { from, to, cause } => EventOut::StageChanged {
                        from: from.name(),
                        to: to.name(),
                        cause: cause_name(cause),
                    },
                    Event::FaultRaised(f) => EventOut::FaultRaised {
                        fault: f.to_string(),
                    },
                    Event::NewHighUtilisation { utilisation } => {
                        EventOut::NewHighUtilisation { utilisation }
                    }
                })
                .collect(),
            events_lost: v.events_lost,
        }
    }
}

/// An error line.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ErrorLine<'a> {
    /// Input line number, from 1.
    pub line: u64,
    /// What is wrong.
    pub error: &'a str,
}

/// What one input line gave.
#[derive(Clone, Debug, PartialEq)]
pub enum Answer {
    /// Nothing (a blank line or the CSV header).
    Nothing,
    /// A verdict.
    Verdict(Box<VerdictLine>),
    /// An error for this line; the stream goes on.
    Error(String),
}

/// Largest step forward of a sample's time over the last accepted one, ms
/// (one hour). A line further ahead is answered with an error and does not
/// move the guard's clock, so one far-off time stamp cannot make every
/// later good line "earlier" and refused. A stream that really resumes
/// after a longer pause needs a new bridge. (With no sample for that long
/// the guard has long reported its sensors stale.)
pub const MAX_STEP_MS: u64 = 3_600_000;

/// The bridge state: the rig, the guard (started at the first usable time)
/// and the values that hold between lines.
pub struct Bridge<'r> {
    rig: &'r LoadedRig,
    config: GuardConfig,
    format: InputFormat,
    header: Option<CsvHeader>,
    guard: Option<Guard<'r>>,
    held: Held,
    last_t: Option<Millis>,
}

impl<'r> Bridge<'r> {
    /// A bridge for a loaded rig. Accelerometer samples arrive in g in the
    /// rig frame, so the rig file's accelerometer scale and mounting are
    /// replaced by 1 g per unit and the identity mounting.
    #[must_use]
    pub fn new(rig: &'r LoadedRig, format: InputFormat) -> Bridge<'r> {
        let mut config = rig.guard.clone();
        config.tilt.scale_g_per_count = 1.0;
        config.tilt.mounting = Mounting::IDENTITY;
        Bridge {
            rig,
            config,
            format,
            header: None,
            guard: None,
            held: Held::default(),
            last_t: None,
        }
    }

    /// Starts the guard at `now` if not yet started.
    ///
    /// # Errors
    /// The core refuses the configuration.
    pub fn start(&mut self, now: Millis) -> Result<(), Error> {
        if self.guard.is_none() {
            let g = Guard::new(&self.rig.rig, self.config.clone(), now).map_err(|e| {
                crate::input::rigfile::after_load_error(
                    &self.rig.file,
                    "the guard cannot start",
                    &e,
                )
            })?;
            let mut g = g;
            // The site's air until measured air arrives.
            g.set_air(self.rig.air);
            self.guard = Some(g);
        }
        Ok(())
    }

    /// Handles input line `n` (from 1). `wall` is the wall-clock time with
    /// `--clock wall`, `None` to use the sample's time.
    ///
    /// # Errors
    /// Only when the guard cannot start (a rig-file problem); line problems
    /// are [`Answer::Error`].
    pub fn line(&mut self, n: u64, text: &str, wall: Option<Millis>) -> Result<Answer, Error> {
        Ok(match self.line_unbounded(n, text, wall)? {
            Answer::Error(e) => Answer::Error(bounded_to(&e, MAX_PROBLEM_CHARS)),
            other => other,
        })
    }

    fn line_unbounded(
        &mut self,
        n: u64,
        text: &str,
        wall: Option<Millis>,
    ) -> Result<Answer, Error> {
        let text = text.trim();
        if text.is_empty() {
            return Ok(Answer::Nothing);
        }
        let sample = match self.format {
            InputFormat::Json => parse_json_line(text),
            InputFormat::Csv => match &self.header {
                None => {
                    return Ok(match CsvHeader::parse(text) {
                        Ok(h) => {
                            self.header = Some(h);
                            Answer::Nothing
                        }
                        Err(e) => Answer::Error(format!("header: {e}")),
                    })
                }
                Some(h) => h.parse_row(text),
            },
        };
        let sample = match sample {
            Ok(s) => s,
            Err(e) => return Ok(Answer::Error(e)),
        };
        let mut held = self.held;
        let checked = match held.check(&sample, f64::from(self.config.wind.max_speed_mps)) {
            Ok(c) => c,
            Err(e) => return Ok(Answer::Error(e)),
        };
        let now = match (wall, checked.t) {
            (Some(w), _) => w,
            (None, Some(t)) => t,
            (None, None) => return Ok(Answer::Error("a sample needs t_ms or t_s".into())),
        };
        if let Some(last) = self.last_t {
            if now < last {
                return Ok(Answer::Error(format!(
                    "time went backwards: {} ms after {} ms (accepted: {} to {} ms)",
                    now.0,
                    last.0,
                    last.0,
                    last.0.saturating_add(MAX_STEP_MS)
                )));
            }
            if wall.is_none() && now.0 - last.0 > MAX_STEP_MS {
                return Ok(Answer::Error(format!(
                    "time jumps {} ms ahead of the last accepted sample ({} ms); \
                     accepted: {} to {} ms (at most {} s ahead); line not used, the clock stays",
                    now.0 - last.0,
                    last.0,
                    last.0,
                    last.0.saturating_add(MAX_STEP_MS),
                    MAX_STEP_MS / 1000
                )));
            }
        }
        self.start(now)?;
        let Some(guard) = self.guard.as_mut() else {
            return Ok(Answer::Error("the guard is not running".into()));
        };
        self.held = held;
        self.last_t = Some(now);
        if checked.ack {
            guard.acknowledge();
        }
        let v = guard.step(now, &checked.inputs);
        Ok(Answer::Verdict(Box::new(VerdictLine::new(
            n,
            &v,
            checked.ack,
        ))))
    }
}

/// Spawned `--on-change` commands not yet reaped.
struct Hooks {
    command: Option<String>,
    children: Vec<Child>,
}

impl Hooks {
    fn fire(&mut self, v: &VerdictLine, err: &mut dyn Write) {
        let Some(cmd) = &self.command else { return };
        for e in &v.events {
            let EventOut::StageChanged { from, to, cause } = e else {
                continue;
            };
            let stdout = Stdio::from(std::io::stderr());
            let spawned = Command::new("sh")
                .arg("-c")
                .arg(cmd)
                .env("STANDFAST_STAGE", to)
                .env("STANDFAST_PREVIOUS_STAGE", from)
                .env("STANDFAST_T_MS", v.t_ms.to_string())
                .env("STANDFAST_CAUSE", cause)
                .stdin(Stdio::null())
                .stdout(stdout)
                .spawn();
            match spawned {
                Ok(c) => self.children.push(c),
                Err(e) => {
                    let _ = writeln!(
                        err,
                        "standfast bridge: --on-change command did not start: {e}"
                    );
                }
            }
        }
    }

    fn reap(&mut self, err: &mut dyn Write) {
        self.children.retain_mut(|c| match c.try_wait() {
            Ok(Some(status)) => {
                report_exit(status, err);
                false
            }
            Ok(None) => true,
            Err(e) => {
                let _ = writeln!(err, "standfast bridge: --on-change command: {e}");
                false
            }
        });
    }

    fn wait_all(&mut self, err: &mut dyn Write) {
        for mut c in self.children.drain(..) {
            match c.wait() {
                Ok(status) => report_exit(status, err),
                Err(e) => {
                    let _ = writeln!(err, "standfast bridge: --on-change command: {e}");
                }
            }
        }
    }
}

fn report_exit(status: std::process::ExitStatus, err: &mut dyn Write) {
    if !status.success() {
        let _ = writeln!(
            err,
            "standfast bridge: --on-change command ended with {status}"
        );
    }
}

/// Runs the bridge over `input`, writing verdict and error lines to `out`
/// (flushed after each) and cautions, errors and hook reports to `err`.
///
/// # Errors
/// The rig file cannot be used, or `out` cannot be written (the reader went
/// away). Bad lines are not errors.
pub fn run(
    args: &BridgeArgs,
    input: &mut dyn BufRead,
    out: &mut dyn Write,
    err: &mut dyn Write,
) -> Result<(), Error> {
    let rig = rigfile::load(&args.rig)?;
    for c in CAUTIONS {
        let _ = writeln!(err, "caution: {c}");
    }
    let mut bridge = Bridge::new(&rig, args.format);
    let started = Instant::now();
    if args.clock == ClockKind::Wall {
        bridge.start(Millis(0))?;
    }
    let mut hooks = Hooks {
        command: args.on_change.clone(),
        children: Vec::new(),
    };
    let stdout_err = |e| Error::io("<standard output>", e);
    let mut buf = String::new();
    let mut n: u64 = 0;
    loop {
        buf.clear();
        let read = input.read_line(&mut buf);
        n = n.saturating_add(1);
        let answer = match read {
            Ok(0) => break,
            Ok(_) => {
                let wall = (args.clock == ClockKind::Wall).then(|| {
                    Millis(u64::try_from(started.elapsed().as_millis()).unwrap_or(u64::MAX))
                });
                bridge.line(n, &buf, wall)?
            }
            Err(e) if e.kind() == std::io::ErrorKind::InvalidData => Answer::Error(bounded_to(
                &format!("cannot read the line: {e}"),
                MAX_PROBLEM_CHARS,
            )),
            Err(e) => return Err(Error::io("<standard input>", e)),
        };
        match answer {
            Answer::Nothing => {}
            Answer::Verdict(v) => {
                serde_json::to_writer(&mut *out, &v).map_err(|e| stdout_err(e.into()))?;
                writeln!(out).map_err(stdout_err)?;
                out.flush().map_err(stdout_err)?;
                hooks.fire(&v, err);
            }
            Answer::Error(msg) => {
                let _ = writeln!(err, "standfast bridge: line {n}: {msg}");
                serde_json::to_writer(
                    &mut *out,
                    &ErrorLine {
                        line: n,
                        error: &msg,
                    },
                )
                .map_err(|e| stdout_err(e.into()))?;
                writeln!(out).map_err(stdout_err)?;
                out.flush().map_err(stdout_err)?;
            }
        }
        hooks.reap(err);
    }
    hooks.wait_all(err);
    Ok(())
}

/// `standfast bridge` on the process's standard input and error.
///
/// # Errors
/// As [`run`].
pub fn run_bridge(args: &BridgeArgs, out: &mut dyn Write) -> Result<(), Error> {
    let stdin = std::io::stdin();
    let mut input = stdin.lock();
    let stderr = std::io::stderr();
    let mut err = stderr.lock();
    run(args, &mut input, out, &mut err)
}
