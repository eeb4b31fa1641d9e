//! The verdict CSV: one line per verdict the replay hands out (every N-th
//! record per rig, and every record with an event). Times ISO 8601 UTC and
//! seconds since the first record; utilisations dimensionless (1.0 is the
//! limit); speeds m/s; angles degrees. The last columns are the cover
//! (`fitted`, `off`, or empty when no log says) and the mount pose the
//! verdict is for: its frame and two angles and the pier side.

use standfast::guard::Verdict;
use standfast::mount::{PierSide, Pose};

use crate::input::log::Timestamp;
use crate::model::figures::Figures;

/// The verdict CSV's header line (with its line break).
pub const VERDICT_HEADER: &str = "time,t_s,rig,level,overturning_utilisation,predicted_utilisation,sliding_utilisation,drive1_utilisation,drive2_utilisation,tip_wind_mps,gust_mps,predicted_gust_mps,wind_from_deg,tilt_deg,tilt_margin_deg,faults,cover,pose_frame,pose_a_deg,pose_b_deg,pier_side\n";

fn opt(v: Option<f32>) -> String {
    v.map_or_else(String::new, |x| format!("{x:.4}"))
}

/// The pose columns of the verdict CSV: frame, its two angles in degrees
/// (hour angle and declination; azimuth and altitude; primary and
/// secondary axis angles) and the pier side (empty for axis angles).
fn pose_columns(p: &Pose) -> (&'static str, f32, f32, &'static str) {
    let side = |s: PierSide| match s {
        PierSide::TubeEast => "tube_east",
        PierSide::TubeWest => "tube_west",
    };
    match *p {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => (
            "axes",
            primary_rad.to_degrees(),
            secondary_rad.to_degrees(),
            "",
        ),
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            pier_side,
        } => (
            "equatorial",
            hour_angle_rad.to_degrees(),
            declination_rad.to_degrees(),
            side(pier_side),
        ),
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            pier_side,
        } => (
            "horizontal",
            azimuth_rad.to_degrees(),
            altitude_rad.to_degrees(),
            side(pier_side),
        ),
    }
}

/// Appends the CSV line (with its line break) of verdict `v` of rig number
/// `rig` (0 for the first `--rig`) at `time`, `t_s` seconds since the first
/// record, with the cover state `cover` the logs give (`None`: none yet),
/// to `out`.
pub fn verdict_line(
    out: &mut String,
    time: Timestamp,
    t_s: f64,
    rig: usize,
    v: &Verdict,
    cover: Option<bool>,
) {
    let f = Figures::of(v);
    let (frame, a_deg, b_deg, side) = pose_columns(&v.pose);
    out.push_str(&format!(
        "{},{t_s:.3},{rig},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{frame},{a_deg:.4},{b_deg:.4},{side}\n",
        time.to_iso8601(3),
        v.level.name(),
        opt(f.overturning_utilisation),
        opt(f.predicted_utilisation),
        opt(f.sliding_utilisation),
        opt(f.drive(0)),
        opt(f.drive(1)),
        opt(f.tip_wind_mps),
        opt(f.gust_mps),
        opt(f.predicted_gust_mps),
        opt(f.wind_from_deg),
        opt(f.tilt_deg),
        opt(f.tilt_margin_deg),
        v.faults.len(),
        match cover {
            Some(true) => "fitted",
            Some(false) => "off",
            None => "",
        },
    ));
}
