//! `standfast assess`: its arguments, the options they set, and the run.

use std::io::Write;

use standfast::frame::Tilt;

use crate::error::Error;
use crate::model::assess::{assess, AssessOptions, Condition};
use crate::render::assess::{write_json, write_text};

/// Arguments of `assess`.
#[derive(Debug, clap::Args)]
pub struct AssessArgs {
    /// The rig file (TOML; see the rig file section of the README).
    #[arg(value_name = "RIG.toml")]
    pub rig: std::path::PathBuf,
    /// Print the report as JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Storm direction (wind from), clockwise from north, for the best
    /// tripod orientation: degrees, or an angle with a unit ("4.7 rad");
    /// 0 to 360 deg.
    #[arg(
        long,
        value_name = "DEG",
        default_value = "270",
        allow_hyphen_values = true
    )]
    pub storm_from: String,
    /// Design gust for ballast and tie-down needs: m/s, or a speed with a
    /// unit ("45 mph"); more than 0, up to 100 m/s.
    #[arg(
        long,
        value_name = "M/S",
        default_value = "20",
        allow_hyphen_values = true
    )]
    pub design_gust: String,
    /// Also write a self-contained HTML report with charts to this file.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
    /// Hour angle of the assessed pose, with --declination: a plain number
    /// is in hours (positive west), or give an angle unit ("-30 deg").
    #[arg(long, value_name = "H", allow_hyphen_values = true, requires = "declination",
          conflicts_with_all = ["azimuth", "altitude"], value_parser = parse_hour_angle)]
    pub hour_angle: Option<f32>,
    /// Declination of the assessed pose, degrees (−90 to 90), with --hour-angle.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "hour_angle",
          value_parser = parse_declination)]
    pub declination: Option<f32>,
    /// Azimuth the tube points to, degrees from north clockwise, with --altitude.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "altitude",
          value_parser = parse_azimuth)]
    pub azimuth: Option<f32>,
    /// Altitude the tube points to, degrees (−90 to 90), with --azimuth.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "azimuth",
          value_parser = parse_declination)]
    pub altitude: Option<f32>,
    /// Pier side of the assessed pose (equatorial mounts).
    #[arg(long, value_enum, default_value_t = SideArg::TubeEast)]
    pub pier_side: SideArg,
    /// Ground tilt of the assessed condition, degrees (0 to 45), with --downhill.
    #[arg(long, value_name = "DEG", requires = "downhill", value_parser = parse_tilt)]
    pub tilt: Option<f32>,
    /// Azimuth the ground falls toward, degrees from north clockwise, with --tilt.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true, requires = "tilt",
          value_parser = parse_azimuth)]
    pub downhill: Option<f32>,
    /// Cover of the assessed condition.
    #[arg(long, value_enum, default_value_t = CoverArg::Off)]
    pub cover: CoverArg,
    /// Direction the design gust blows from, degrees from north clockwise,
    /// or `worst`.
    #[arg(long, value_name = "DEG|worst", default_value = "worst", allow_hyphen_values = true,
          value_parser = parse_wind_from)]
    pub wind_from: WindFrom,
}

/// Pier side on the command line.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum SideArg {
    /// The tube east of the pier (the usual side for targets west of the meridian).
    TubeEast,
    /// The tube west of the pier.
    TubeWest,
}

/// Cover state on the command line.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum CoverArg {
    /// Cover fitted (if the rig has one).
    On,
    /// Cover off.
    Off,
}

/// Wind direction on the command line.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum WindFrom {
    /// The direction of highest overturning utilisation.
    Worst,
    /// From this azimuth, degrees.
    Deg(f32),
}

#[allow(clippy::cast_possible_truncation)] // angles of a command line fit f32
fn angle_deg(s: &str, bare: &str) -> Result<f32, String> {
    let a = crate::input::units::Angle::parse_or(s, bare).map_err(|e| e.to_string())?;
    let d = a.deg();
    if d.is_finite() {
        Ok(d as f32)
    } else {
        Err(format!("\"{s}\" is not a finite angle"))
    }
}

fn in_range(s: &str, v: f32, lo: f32, hi: f32, unit: &str) -> Result<f32, String> {
    if (lo..=hi).contains(&v) {
        Ok(v)
    } else {
        Err(format!(
            "\"{s}\" ({v} {unit}) is outside the accepted range {lo} to {hi} {unit}"
        ))
    }
}

fn parse_hour_angle(s: &str) -> Result<f32, String> {
    let d = angle_deg(s, "hourangle")?;
    in_range(s, d / 15.0, -12.0, 12.0, "h").map(|h| h * 15.0)
}

fn parse_declination(s: &str) -> Result<f32, String> {
    let d = angle_deg(s, "deg")?;
    in_range(s, d, -90.0, 90.0, "deg")
}

fn parse_azimuth(s: &str) -> Result<f32, String> {
    let d = angle_deg(s, "deg")?;
    in_range(s, d, -360.0, 360.0, "deg")
}

fn parse_tilt(s: &str) -> Result<f32, String> {
    let d = angle_deg(s, "deg")?;
    in_range(
        s,
        d,
        0.0,
        standfast::frame::MAX_TILT_RAD.to_degrees(),
        "deg",
    )
}

fn parse_wind_from(s: &str) -> Result<WindFrom, String> {
    if s.trim().eq_ignore_ascii_case("worst") {
        return Ok(WindFrom::Worst);
    }
    parse_azimuth(s)
        .map(WindFrom::Deg)
        .map_err(|e| format!("{e} (or `worst`)"))
}

impl AssessArgs {
    /// The condition the options describe (angles converted to radians).
    #[must_use]
    pub fn condition(&self) -> Condition {
        use standfast::mount::{PierSide, Pose};
        let pier_side = match self.pier_side {
            SideArg::TubeEast => PierSide::TubeEast,
            SideArg::TubeWest => PierSide::TubeWest,
        };
        let pose = match (
            self.hour_angle,
            self.declination,
            self.azimuth,
            self.altitude,
        ) {
            (Some(h), Some(d), _, _) => Some(Pose::Equatorial {
                hour_angle_rad: h.to_radians(),
                declination_rad: d.to_radians(),
                pier_side,
            }),
            (_, _, Some(az), Some(alt)) => Some(Pose::Horizontal {
                azimuth_rad: az.to_radians(),
                altitude_rad: alt.to_radians(),
                pier_side,
            }),
            _ => None,
        };
        Condition {
            pose,
            tilt: Tilt {
                magnitude_rad: self.tilt.unwrap_or(0.0).to_radians(),
                downhill_azimuth_rad: self.downhill.unwrap_or(0.0).to_radians(),
            },
            cover_fitted: self.cover == CoverArg::On,
            wind_from_deg: match self.wind_from {
                WindFrom::Worst => None,
                WindFrom::Deg(d) => Some(d),
            },
        }
    }
}

/// Accepted storm direction of `--storm-from`.
pub const STORM_FROM_RANGE: crate::commands::options::OptionRange =
    crate::commands::options::OptionRange {
        lo: 0.0,
        hi: 360.0,
        lo_open: false,
        unit: "deg",
    };

/// Accepted design gust of `--design-gust`.
pub const DESIGN_GUST_RANGE: crate::commands::options::OptionRange =
    crate::commands::options::OptionRange {
        lo: 0.0,
        hi: 100.0,
        lo_open: true,
        unit: "m/s",
    };

/// Runs `standfast assess`.
///
/// # Errors
/// The rig file cannot be read or is invalid, or the output cannot be written.
pub fn run(a: &AssessArgs, out: &mut dyn Write) -> Result<(), Error> {
    let storm = crate::commands::options::quantity_option::<crate::input::units::AngleDim>(
        "--storm-from",
        &a.storm_from,
        STORM_FROM_RANGE,
    )?;
    let gust = crate::commands::options::quantity_option::<crate::input::units::SpeedDim>(
        "--design-gust",
        &a.design_gust,
        DESIGN_GUST_RANGE,
    )?;
    if let Some(h) = &a.html {
        crate::commands::output::check_paths(
            &[crate::commands::output::Role::new("the rig file", &a.rig)],
            &[crate::commands::output::Role::new("--html", h)],
        )?;
    }
    let r = crate::input::rigfile::load(&a.rig)?;
    #[allow(clippy::cast_possible_truncation)] // checked ranges fit f32
    let o = AssessOptions {
        storm_from_deg: storm.to_degrees() as f32,
        design_gust_mps: gust as f32,
        condition: a.condition(),
        ..AssessOptions::default()
    };
    let rep = assess(&r, &o)?;
    if let Some(h) = &a.html {
        let charts = crate::model::charts::assess_charts(&rep, &r)?;
        let page = crate::render::report::assess_html(&rep, &charts)?;
        crate::commands::output::write_atomic(h, page.as_bytes())?;
    }
    let res = if a.json {
        write_json(&rep, out)
    } else {
        write_text(&rep, out).and_then(|()| match &a.html {
            Some(h) => writeln!(out, "Report written to {}", h.display()),
            None => Ok(()),
        })
    };
    res.map_err(|e| Error::io("<standard output>", e))
}
