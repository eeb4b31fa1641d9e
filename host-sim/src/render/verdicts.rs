//! The verdict CSV: one line per verdict the replay hands out (every N-th
//! record per rig, and every record with an event). Times ISO 8601 UTC and
//! seconds since the first record; utilisations dimensionless (1.0 is the
//! limit); speeds m/s; angles degrees.

use standfast::guard::Verdict;

use crate::input::log::Timestamp;
use crate::model::figures::Figures;

/// The verdict CSV's header line (with its line break).
pub const VERDICT_HEADER: &str = "time,t_s,rig,stage,overturning_utilisation,predicted_utilisation,sliding_utilisation,drive1_utilisation,drive2_utilisation,tip_wind_mps,gust_mps,predicted_gust_mps,wind_from_deg,tilt_deg,tilt_margin_deg,faults\n";

fn opt(v: Option<f32>) -> String {
    v.map_or_else(String::new, |x| format!("{x:.4}"))
}

/// Appends the CSV line (with its line break) of verdict `v` of rig number
/// `rig` (0 for the first `--rig`) at `time`, `t_s` seconds since the first
/// record, to `out`.
pub fn verdict_line(out: &mut String, time: Timestamp, t_s: f64, rig: usize, v: &Verdict) {
    let f = Figures::of(v);
    out.push_str(&format!(
        "{},{t_s:.3},{rig},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
        time.to_iso8601(3),
        v.stage.name(),
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
    ));
}
