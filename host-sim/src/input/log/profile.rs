//! The log profile: which files, which columns, which units.
//!
//! Written as a `[log]` section, either in the rig file or in a file of its
//! own (see host-sim/README.md, "Log profile"). Paths are relative to the
//! folder of the file that holds the profile.

use std::path::{Path, PathBuf};

use serde::Deserialize;
use toml::Spanned;

use super::record::{Channel, ChannelKind};
use super::time::{parse_offset, TimeFormat};
use crate::input::error::FileError;
use crate::input::issues::ErrorPolicy;
use crate::input::located::{Checker, InputError, Located, Location, SourceText};
use crate::input::units::{Dim, Duration, Unit};

/// Gap length used when the profile gives none, seconds.
pub const DEFAULT_GAP_S: f64 = 10.0;

/// The `[log]` section as written.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LogSpec {
    /// `"stop"` or `"skip"` (default `"skip"`).
    pub on_error: Option<Spanned<String>>,
    /// Default gap length for all files (number = seconds).
    pub gap: Option<Spanned<Duration>>,
    /// Zone offset for ISO 8601 times written without one (`"Z"`,
    /// `"+01:00"`); default UTC.
    pub zone: Option<Spanned<String>>,
    /// The files, `[[log.file]]`.
    #[serde(default)]
    pub file: Vec<Spanned<FileSpec>>,
}

/// One `[[log.file]]` entry as written.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FileSpec {
    /// Path of the CSV file, relative to the profile's folder.
    pub path: Spanned<String>,
    /// A short label for messages (default: the path).
    pub name: Option<String>,
    /// Field delimiter, one ASCII character (default `","`).
    pub delimiter: Option<Spanned<String>>,
    /// The time column.
    pub time: Spanned<TimeSpec>,
    /// Gap length for this file (number = seconds).
    pub gap: Option<Spanned<Duration>>,
    /// Rig x, y, z from sensor axes, e.g. `["-y", "x", "z"]` (default
    /// `["x", "y", "z"]`).
    pub accel_axes: Option<Spanned<Vec<Spanned<String>>>>,
    /// Channel → column mapping.
    pub columns: Spanned<ColumnsSpec>,
}

/// The time column as written.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TimeSpec {
    /// Header name of the time column.
    pub column: Spanned<String>,
    /// `"iso8601"`, `"epoch_s"` or `"epoch_ms"`.
    pub format: Spanned<String>,
    /// Zone offset for ISO 8601 times without one (overrides `log.zone`).
    pub zone: Option<Spanned<String>>,
}

/// One column mapping as written.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ColumnSpec {
    /// Header name of the column.
    pub column: Spanned<String>,
    /// Unit of the (scaled) values; default the SI unit. Not for
    /// `pier_side` and `cover_fitted`.
    pub unit: Option<Spanned<String>>,
    /// Raw values are multiplied by this before the unit applies (for
    /// example 1/16384 for a 16-bit accelerometer at ±2 g giving counts).
    pub scale: Option<Spanned<f64>>,
}

/// The channel table of a file as written; each key is a [`Channel`] name.
#[derive(Clone, Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
#[allow(missing_docs)] // the fields are the channel names, documented on `Channel`
pub struct ColumnsSpec {
    pub accel_x: Option<Spanned<ColumnSpec>>,
    pub accel_y: Option<Spanned<ColumnSpec>>,
    pub accel_z: Option<Spanned<ColumnSpec>>,
    pub wind_speed: Option<Spanned<ColumnSpec>>,
    pub wind_direction: Option<Spanned<ColumnSpec>>,
    pub hour_angle: Option<Spanned<ColumnSpec>>,
    pub declination: Option<Spanned<ColumnSpec>>,
    pub pier_side: Option<Spanned<ColumnSpec>>,
    pub axis1_angle: Option<Spanned<ColumnSpec>>,
    pub axis2_angle: Option<Spanned<ColumnSpec>>,
    pub cover_fitted: Option<Spanned<ColumnSpec>>,
    pub air_temperature: Option<Spanned<ColumnSpec>>,
    pub pressure: Option<Spanned<ColumnSpec>>,
}

impl ColumnsSpec {
    /// The mapped channels with their specs, in channel order.
    #[must_use]
    pub fn entries(&self) -> Vec<(Channel, &Spanned<ColumnSpec>)> {
        let all = [
            (Channel::AccelX, &self.accel_x),
            (Channel::AccelY, &self.accel_y),
            (Channel::AccelZ, &self.accel_z),
            (Channel::WindSpeed, &self.wind_speed),
            (Channel::WindDirection, &self.wind_direction),
            (Channel::HourAngle, &self.hour_angle),
            (Channel::Declination, &self.declination),
            (Channel::PierSide, &self.pier_side),
            (Channel::Axis1Angle, &self.axis1_angle),
            (Channel::Axis2Angle, &self.axis2_angle),
            (Channel::CoverFitted, &self.cover_fitted),
            (Channel::AirTemperature, &self.air_temperature),
            (Channel::Pressure, &self.pressure),
        ];
        all.into_iter()
            .filter_map(|(c, s)| s.as_ref().map(|s| (c, s)))
            .collect()
    }
}

/// Where one rig axis of the accelerometer comes from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AxisSource {
    /// Sensor axis: 0 = x, 1 = y, 2 = z.
    pub sensor_axis: usize,
    /// +1 or −1.
    pub sign: f64,
}

/// A validated column mapping.
#[derive(Clone, Debug, PartialEq)]
pub struct ColumnProfile {
    /// The channel.
    pub channel: Channel,
    /// Header name, with where the profile names it.
    pub header: Located<String>,
    /// Unit after scaling (SI unit for word channels).
    pub unit: Unit,
    /// Raw-value multiplier.
    pub scale: f64,
}

impl ColumnProfile {
    /// The SI value of a raw cell value.
    #[must_use]
    pub fn to_si(&self, raw: f64) -> f64 {
        self.unit.to_si(raw * self.scale)
    }
}

/// A validated `[[log.file]]`.
#[derive(Clone, Debug, PartialEq)]
pub struct FileProfile {
    /// Label for messages.
    pub label: String,
    /// Path of the CSV file.
    pub path: PathBuf,
    /// Field delimiter.
    pub delimiter: u8,
    /// Header name of the time column.
    pub time_column: Located<String>,
    /// Time format.
    pub time_format: TimeFormat,
    /// Offset east of UTC for ISO 8601 times without a zone, s.
    pub zone_offset_s: i32,
    /// Gap length, s.
    pub gap_s: f64,
    /// Column mappings.
    pub columns: Vec<ColumnProfile>,
    /// Rig x, y, z from sensor axes.
    pub accel_axes: [AxisSource; 3],
    /// Where the entry starts in the profile.
    pub declared_at: Location,
}

/// A validated log profile.
#[derive(Clone, Debug, PartialEq)]
pub struct LogProfile {
    /// What to do with bad rows (the command line may override it).
    pub on_error: ErrorPolicy,
    /// The files, in the order written.
    pub files: Vec<FileProfile>,
}

#[derive(Deserialize)]
struct ProfileDoc {
    log: Option<Spanned<LogSpec>>,
}

const IDENTITY_AXES: [AxisSource; 3] = [
    AxisSource {
        sensor_axis: 0,
        sign: 1.0,
    },
    AxisSource {
        sensor_axis: 1,
        sign: 1.0,
    },
    AxisSource {
        sensor_axis: 2,
        sign: 1.0,
    },
];

/// A log profile that cannot be read, or that holds a bad value.
#[derive(Debug, thiserror::Error)]
#[error(transparent)]
pub struct ProfileError(#[from] pub FileError);

impl LogProfile {
    /// Reads the `[log]` section of a TOML file (a rig file or a profile of
    /// its own); file paths are relative to that file's folder.
    ///
    /// # Errors
    /// [`ProfileError`]: the file cannot be read, or an [`InputError`]
    /// naming file, line, key and value for anything invalid.
    pub fn load(path: &Path) -> Result<LogProfile, ProfileError> {
        let src = SourceText::read(path)?;
        let base = path.parent().unwrap_or(Path::new("."));
        Ok(LogProfile::from_source(&src, base).map_err(FileError::Input)?)
    }

    /// Reads the `[log]` section of TOML text already in memory.
    ///
    /// # Errors
    /// [`InputError`] naming file, line, key and value.
    pub fn from_source(src: &SourceText, base_dir: &Path) -> Result<LogProfile, InputError> {
        let doc: ProfileDoc = src.parse_toml()?;
        let Some(spec) = doc.log else {
            return Err(InputError {
                at: Some(src.location(0)),
                key: Some("log".to_owned()),
                value: None,
                problem: "no [log] section (see the log profile format in host-sim/README.md)"
                    .to_owned(),
            });
        };
        LogProfile::from_spec(&src.checker(), &spec, base_dir)
    }

    /// Validates a `[log]` section already deserialised (for the rig file
    /// loader, which holds the section inside its own document).
    ///
    /// # Errors
    /// [`InputError`] naming file, line, key and value.
    pub fn from_spec(
        ck: &Checker<'_>,
        spec: &Spanned<LogSpec>,
        base_dir: &Path,
    ) -> Result<LogProfile, InputError> {
        let log = spec.get_ref();
        let on_error = match &log.on_error {
            None => ErrorPolicy::Skip,
            Some(v) => match ck.one_of("log.on_error", v, &["stop", "skip"])? {
                "stop" => ErrorPolicy::Stop,
                _ => ErrorPolicy::Skip,
            },
        };
        let gap_min = Duration::from_s(1e-3);
        let gap_max = Duration::from_s(86_400.0);
        let default_gap_s = match &log.gap {
            None => DEFAULT_GAP_S,
            Some(g) => ck.range("log.gap", g, gap_min, gap_max, "s")?.s(),
        };
        let default_zone = match &log.zone {
            None => 0,
            Some(z) => parse_offset(z.get_ref()).map_err(|e| ck.error("log.zone", z.span(), e))?,
        };
        if log.file.is_empty() {
            return Err(ck.error(
                "log.file",
                spec.span(),
                "the profile lists no files: add at least one [[log.file]]",
            ));
        }
        let mut files: Vec<FileProfile> = Vec::with_capacity(log.file.len());
        let mut owner: Vec<Option<(usize, Location)>> = vec![None; super::N_CHANNELS];
        for (i, f) in log.file.iter().enumerate() {
            let key = format!("log.file[{i}]");
            let fp = file_profile(
                ck,
                &key,
                f,
                base_dir,
                default_gap_s,
                default_zone,
                gap_min,
                gap_max,
            )?;
            for c in &fp.columns {
                if let Some(slot) = owner.get_mut(c.channel.index()) {
                    if let Some((j, at)) = slot {
                        return Err(InputError {
                            at: Some(c.header.at.clone()),
                            key: Some(format!("{key}.columns.{}", c.channel)),
                            value: Some(format!("\"{}\"", c.header.value)),
                            problem: format!(
                                "channel {} is already read from log.file[{j}] ({at}); each channel may come from one file only",
                                c.channel
                            ),
                        });
                    }
                    *slot = Some((i, c.header.at.clone()));
                }
            }
            files.push(fp);
        }
        Ok(LogProfile { on_error, files })
    }
}

/// A column's unit and scale: a quantity's unit (SI by default) and a
/// non-zero scale for raw counts; words (pier side, flags) take neither.
fn column_unit(
    ck: &Checker<'_>,
    ckey: &str,
    channel: Channel,
    c: &ColumnSpec,
) -> Result<(Unit, f64), InputError> {
    Ok(match channel.kind() {
        ChannelKind::Quantity(dim) => {
            let unit = match &c.unit {
                None => dim.si_unit(),
                Some(u) => ck.unit(&format!("{ckey}.unit"), u, dim)?,
            };
            let scale = match &c.scale {
                None => 1.0,
                Some(s) => {
                    let v = ck.range_f64(&format!("{ckey}.scale"), s, -1e12, 1e12)?;
                    if v == 0.0 {
                        return Err(ck.error(
                            &format!("{ckey}.scale"),
                            s.span(),
                            "a scale of 0 would erase every value (accepted: -1e12 to 1e12, not 0)",
                        ));
                    }
                    v
                }
            };
            (unit, scale)
        }
        ChannelKind::PierSide | ChannelKind::Flag => {
            if let Some(u) = &c.unit {
                return Err(ck.error(
                    &format!("{ckey}.unit"),
                    u.span(),
                    format!("{channel} is read from words and takes no unit"),
                ));
            }
            if let Some(s) = &c.scale {
                return Err(ck.error(
                    &format!("{ckey}.scale"),
                    s.span(),
                    format!("{channel} is read from words and takes no scale"),
                ));
            }
            (Dim::Length.si_unit(), 1.0)
        }
    })
}

/// A file's delimiter: one ASCII character other than a quote or a line
/// break; a comma by default.
fn delimiter(ck: &Checker<'_>, key: &str, d: Option<&Spanned<String>>) -> Result<u8, InputError> {
    Ok(match d {
        None => b',',
        Some(d) => {
            match d.get_ref().as_bytes() {
                [b] if b.is_ascii() && *b != b'"' && *b != b'\n' && *b != b'\r' => *b,
                _ => return Err(ck.error(
                    &format!("{key}.delimiter"),
                    d.span(),
                    "the delimiter must be one ASCII character other than a quote or line break",
                )),
            }
        }
    })
}

#[allow(clippy::too_many_arguments)]
fn file_profile(
    ck: &Checker<'_>,
    key: &str,
    f: &Spanned<FileSpec>,
    base_dir: &Path,
    default_gap_s: f64,
    default_zone: i32,
    gap_min: Duration,
    gap_max: Duration,
) -> Result<FileProfile, InputError> {
    let spec = f.get_ref();
    let path_str = spec.path.get_ref();
    if path_str.trim().is_empty() {
        return Err(ck.error(&format!("{key}.path"), spec.path.span(), "empty path"));
    }
    let path = base_dir.join(path_str);
    let label = spec.name.clone().unwrap_or_else(|| path_str.clone());
    let delimiter = delimiter(ck, key, spec.delimiter.as_ref())?;
    let t = spec.time.get_ref();
    let time_format = match ck.one_of(
        &format!("{key}.time.format"),
        &t.format,
        &["iso8601", "epoch_s", "epoch_ms"],
    )? {
        "iso8601" => TimeFormat::Iso8601,
        "epoch_s" => TimeFormat::EpochSeconds,
        _ => TimeFormat::EpochMillis,
    };
    let zone_offset_s = match &t.zone {
        None => default_zone,
        Some(z) => parse_offset(z.get_ref())
            .map_err(|e| ck.error(&format!("{key}.time.zone"), z.span(), e))?,
    };
    let gap_s = match &spec.gap {
        None => default_gap_s,
        Some(g) => ck
            .range(&format!("{key}.gap"), g, gap_min, gap_max, "s")?
            .s(),
    };
    let entries = spec.columns.get_ref().entries();
    if entries.is_empty() {
        return Err(ck.error(
            &format!("{key}.columns"),
            spec.columns.span(),
            format!(
                "no channel is mapped; map at least one of: {}",
                Channel::ALL.map(Channel::name).join(", ")
            ),
        ));
    }
    let mut columns = Vec::with_capacity(entries.len());
    for (channel, cs) in entries {
        let ckey = format!("{key}.columns.{channel}");
        let c = cs.get_ref();
        let (unit, scale) = column_unit(ck, &ckey, channel, c)?;
        columns.push(ColumnProfile {
            channel,
            header: ck.locate(&c.column),
            unit,
            scale,
        });
    }
    let n_accel = columns.iter().filter(|c| c.channel.is_accel()).count();
    if n_accel != 0 && n_accel != 3 {
        return Err(ck.error(
            &format!("{key}.columns"),
            spec.columns.span(),
            "map all three of accel_x, accel_y and accel_z, or none",
        ));
    }
    let accel_axes = match &spec.accel_axes {
        None => IDENTITY_AXES,
        Some(a) => axes(ck, &format!("{key}.accel_axes"), a)?,
    };
    Ok(FileProfile {
        label,
        path,
        delimiter,
        time_column: ck.locate(&t.column),
        time_format,
        zone_offset_s,
        gap_s,
        columns,
        accel_axes,
        declared_at: ck.source().location(f.span().start),
    })
}

fn axes(
    ck: &Checker<'_>,
    key: &str,
    a: &Spanned<Vec<Spanned<String>>>,
) -> Result<[AxisSource; 3], InputError> {
    let words = a.get_ref();
    if words.len() != 3 {
        return Err(ck.error(
            key,
            a.span(),
            "give three sensor axes for rig x, y and z, e.g. [\"-y\", \"x\", \"z\"]",
        ));
    }
    let mut out = IDENTITY_AXES;
    let mut used = [false; 3];
    for (slot, w) in out.iter_mut().zip(words) {
        let s = w.get_ref().trim();
        let (sign, name) = match s.as_bytes().first() {
            Some(b'-') => (-1.0, s.get(1..).unwrap_or("")),
            Some(b'+') => (1.0, s.get(1..).unwrap_or("")),
            _ => (1.0, s),
        };
        let axis = match name.to_ascii_lowercase().as_str() {
            "x" => 0,
            "y" => 1,
            "z" => 2,
            _ => {
                return Err(ck.error(
                    key,
                    w.span(),
                    "a sensor axis is x, y or z with an optional sign (\"-y\")",
                ))
            }
        };
        if let Some(u) = used.get_mut(axis) {
            if *u {
                return Err(ck.error(key, w.span(), "each sensor axis may be used once"));
            }
            *u = true;
        }
        *slot = AxisSource {
            sensor_axis: axis,
            sign,
        };
    }
    Ok(out)
}
