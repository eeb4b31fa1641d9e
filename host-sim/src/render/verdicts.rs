//! The verdict CSV: one line per verdict the replay hands out (every N-th
//! record per rig, and every record with an event). Times ISO 8601 UTC and
//! seconds since the first record; utilisations dimensionless (1.0 is the
//! limit); speeds m/s; angles degrees. The last columns are the cover
//! (`fitted`, `off`, or empty when no log says) and the mount pose the
//! verdict is for: its frame and two angles and the pier side.

use standfast::guard::Verdict;
use standfast::mount::{PierSide, Pose};

use crate::input::log::time::push_iso8601_bytes;
use crate::input::log::Timestamp;
use crate::model::figures::Figures;
use crate::render::decimal::{push_f32, push_f64};

/// The verdict CSV's header line (with its line break).
pub const VERDICT_HEADER: &str = "time,t_s,rig,level,overturning_utilisation,predicted_utilisation,sliding_utilisation,drive1_utilisation,drive2_utilisation,tip_wind_mps,gust_mps,predicted_gust_mps,wind_from_deg,tilt_deg,tilt_margin_deg,faults,cover,pose_frame,pose_a_deg,pose_b_deg,pier_side\n";

/// Appends `,` and the figure with four decimals (nothing after the comma
/// when there is none).
fn push_opt(out: &mut Vec<u8>, v: Option<f32>) {
    out.push(b',');
    if let Some(x) = v {
        push_f32(out, x, 4);
    }
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
    out: &mut Vec<u8>,
    time: Timestamp,
    t_s: f64,
    rig: usize,
    v: &Verdict,
    cover: Option<bool>,
) {
    let f = Figures::of(v);
    let (frame, a_deg, b_deg, side) = pose_columns(&v.pose);
    push_iso8601_bytes(out, time, 3, 0, true);
    out.push(b',');
    push_f64(out, t_s, 3);
    out.push(b',');
    push_usize(out, rig);
    out.push(b',');
    out.extend_from_slice(v.level.name().as_bytes());
    for x in [
        f.overturning_utilisation,
        f.predicted_utilisation,
        f.sliding_utilisation,
        f.drive(0),
        f.drive(1),
        f.tip_wind_mps,
        f.gust_mps,
        f.predicted_gust_mps,
        f.wind_from_deg,
        f.tilt_deg,
        f.tilt_margin_deg,
    ] {
        push_opt(out, x);
    }
    out.push(b',');
    push_usize(out, v.faults.len());
    out.push(b',');
    out.extend_from_slice(match cover {
        Some(true) => b"fitted",
        Some(false) => b"off",
        None => b"",
    });
    out.push(b',');
    out.extend_from_slice(frame.as_bytes());
    out.push(b',');
    push_f32(out, a_deg, 4);
    out.push(b',');
    push_f32(out, b_deg, 4);
    out.push(b',');
    out.extend_from_slice(side.as_bytes());
    out.push(b'\n');
}

/// Appends the decimal digits of `n`.
fn push_usize(out: &mut Vec<u8>, n: usize) {
    use std::io::Write as _;
    let _ = write!(out, "{n}");
}
