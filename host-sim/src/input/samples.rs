//! The bridge's input: one live sample per line (JSON, or CSV under a
//! header), parsed into a [`Sample`] and checked into guard inputs
//! ([`Checked`]). The schema, with units and accepted ranges, is in the
//! docs of [`crate::commands::bridge`].

use serde::Deserialize;
use standfast::guard::{AirSample, Inputs, WindSample};
use standfast::mount::{PierSide, Pose};
use standfast::sense::Millis;

use crate::input::bounded::bounded;
use crate::input::located::fmt_g;
use crate::input::units::f32_of;

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

/// Pose and air values that hold until changed (a line may give only the
/// values that changed).
#[derive(Clone, Copy, Debug, Default)]
pub struct Held {
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
    ///
    /// # Errors
    /// What is wrong with the line, naming the field, the value and the
    /// accepted range.
    pub fn check(&mut self, s: &Sample, max_wind_mps: f64) -> Result<Checked, String> {
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
                    temperature_k: standfast::air::celsius_to_kelvin(f32_of(tc)),
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
