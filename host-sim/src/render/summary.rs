//! A replay's findings for a person (text) or a program (JSON).
//!
//! Composed of parts: the headline ([`crate::render::headline`], the
//! night's story from [`crate::model::story`]), the findings, then with two or more rigs the
//! side-by-side comparison ([`crate::render::whatif`]), then the cautions of
//! [`crate::cautions::CAUTIONS`]. The JSON carries a `headline` field
//! first (the story as data: times ISO 8601 UTC and seconds since the
//! first record, with the logs' local offset), the report's fields, a
//! `comparison` field with two or more rigs, and a `cautions` field.

use std::io::Write;

use serde::Serialize;
use standfast::guard::AlertLevel;
use standfast::mount::Pose;

use crate::cautions::CAUTIONS;
use crate::error::Error;
use crate::model::assess::pose_words;
use crate::model::replay::{Approach, ReplayReport, RigReplay};
use crate::model::story::{tell, RigStory};
use crate::model::whatif::{compare, Comparison};
use crate::render::clock::Clock;
use crate::render::headline::{hms, thousands};
use crate::render::quantity::{direction_text, figure_text};
use crate::render::whatif::comparison_text;

fn stdout_err(e: std::io::Error) -> Error {
    Error::io("<standard output>", e)
}

fn pose_text(p: &Pose) -> String {
    pose_words(p)
}

/// Seconds the rig spent at `level`.
fn seconds_in(r: &RigReplay, level: AlertLevel) -> f64 {
    r.level_time
        .iter()
        .filter(|t| t.level == level)
        .map(|t| t.seconds)
        .sum()
}

/// The highest level the physics raised: the highest of clear, watch,
/// park_now and alarm that the rig spent time in or ended in; `None` when
/// the guard never judged the rig.
fn highest_physics(r: &RigReplay) -> Option<AlertLevel> {
    [
        AlertLevel::Alarm,
        AlertLevel::ParkNow,
        AlertLevel::Watch,
        AlertLevel::Clear,
    ]
    .into_iter()
    .find(|l| seconds_in(r, *l) > 0.0 || r.final_level == *l)
}

/// A time of the replay for the text: local date and time with the zone
/// when the first record's time is known (UTC when the logs carry no
/// offset), else seconds since the first record.
fn at_text(clock: Option<&Clock>, t_s: f64) -> String {
    clock.map_or_else(|| format!("+{t_s:.0} s"), |c| c.local_datetime_text(t_s))
}

fn approach_text(label: &str, a: Option<&Approach>, clock: Option<&Clock>) -> String {
    let Some(a) = a else {
        return format!("  {label}: no figure (no wind, tilt or pose data)\n");
    };
    format!(
        "  {label}: {:.0} % at {}, gust {}, from {}, {}, tilt {}, tip wind {}, level {}\n",
        a.utilisation * 100.0,
        at_text(clock, a.t_s),
        figure_text(a.figures.gust_mps, "m/s", 1),
        direction_text(a.figures.wind_from_deg),
        pose_text(&a.pose),
        figure_text(a.figures.tilt_deg, "°", 2),
        figure_text(a.figures.tip_wind_mps, "m/s", 1),
        a.level.name(),
    )
}

/// The summary as text: the findings, the comparison when the replay has
/// two or more rigs, and the cautions.
#[must_use]
pub fn text(rep: &ReplayReport) -> String {
    let mut s = headline_text(rep);
    s.push('\n');
    s.push_str(&findings_text(rep));
    if rep.rigs.len() >= 2 {
        let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
        s.push_str(&comparison_text(&compare(rep), clock.as_ref()));
    }
    s.push_str(&cautions_text());
    s
}

/// The headline as the text summary starts with it: per rig, the night's
/// story in local time.
#[must_use]
pub fn headline_text(rep: &ReplayReport) -> String {
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    crate::render::headline::text(&tell(rep), clock.as_ref(), rep.duration_s)
}

/// The cautions as the text summary ends with them.
#[must_use]
pub fn cautions_text() -> String {
    let mut s = String::from("\nCautions:\n");
    for c in CAUTIONS {
        s.push_str(&format!("  - {c}\n"));
    }
    s
}

/// What the replay found, as text: records, log issues and each rig's
/// closest approaches, level times, level changes and faults.
#[must_use]
pub fn findings_text(rep: &ReplayReport) -> String {
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let ck = clock.as_ref();
    let mut s = String::new();
    s.push_str(&format!(
        "Replayed {} merged records ({} log rows) from {} to {} ({}).\n",
        thousands(rep.records),
        thousands(rep.rows),
        ck.map_or("-".to_owned(), |c| c.local_datetime_text(0.0)),
        ck.map_or("-".to_owned(), |c| c.local_datetime_text(rep.duration_s)),
        hms(rep.duration_s)
    ));
    s.push_str(&format!("Log issues: {}", rep.issues_total));
    if rep.issues_total > 0 {
        let parts: Vec<String> = rep
            .issues
            .iter()
            .filter(|c| c.count > 0)
            .map(|c| format!("{} {}", c.count, c.kind))
            .collect();
        s.push_str(&format!(" ({})", parts.join(", ")));
    }
    s.push('\n');
    for i in &rep.first_issues {
        s.push_str(&format!("  {i}\n"));
    }
    for r in &rep.rigs {
        s.push_str(&format!("\nRig {}\n", r.rig_file));
        s.push_str(&format!(
            "  highest level {}, final level {}\n",
            r.highest_level.name(),
            r.final_level.name()
        ));
        if r.highest_level == AlertLevel::SensorFault {
            s.push_str(&format!(
                "  highest level from the physics {}; {} in sensor_fault in all, the start-up included (the headline says how long the rig went unwatched)\n",
                highest_physics(r).map_or("none (the guard never judged the rig)", AlertLevel::name),
                hms(seconds_in(r, AlertLevel::SensorFault)),
            ));
        }
        s.push_str("Closest approach:\n");
        s.push_str(&approach_text("overturning", r.overturning.as_ref(), ck));
        s.push_str(&approach_text("sliding", r.sliding.as_ref(), ck));
        for (i, d) in r.drive.iter().enumerate() {
            if d.is_some() {
                s.push_str(&approach_text(
                    &format!("drive axis {}", i + 1),
                    d.as_ref(),
                    ck,
                ));
            }
        }
        s.push_str("Time per level (h:mm:ss):\n");
        for t in &r.level_time {
            s.push_str(&format!("  {:<13}{:>9}\n", t.level.name(), hms(t.seconds)));
        }
        s.push_str(&format!("Level changes ({}):\n", r.level_changes.len()));
        for c in &r.level_changes {
            s.push_str(&format!(
                "  {}: {} -> {} ({})\n",
                at_text(ck, c.t_s),
                c.from.name(),
                c.to.name(),
                c.cause
            ));
        }
        if r.level_changes_not_kept > 0 {
            s.push_str(&format!("  ... and {} more\n", r.level_changes_not_kept));
        }
        s.push_str(&format!("Sensor faults ({}):\n", r.faults.len()));
        for f in &r.faults {
            s.push_str(&format!("  {}: {}\n", at_text(ck, f.t_s), f.fault));
        }
        if r.events_lost > 0 {
            s.push_str(&format!(
                "  {} guard events lost: a step had more than {} (see the verdicts' faults)\n",
                r.events_lost,
                standfast::guard::MAX_EVENTS
            ));
        }
        if r.faults_not_kept > 0 {
            s.push_str(&format!("  ... and {} more\n", r.faults_not_kept));
        }
    }
    s
}

/// The headline as data: the logs' local offset and each rig's story.
#[derive(Serialize)]
struct HeadlineOut {
    /// Local offset east of UTC the logs carry, seconds (`null`: none).
    local_offset_s: Option<i32>,
    rigs: Vec<RigStory>,
}

#[derive(Serialize)]
struct JsonOut<'a> {
    headline: HeadlineOut,
    #[serde(flatten)]
    report: &'a ReplayReport,
    #[serde(skip_serializing_if = "Option::is_none")]
    comparison: Option<&'a Comparison>,
    cautions: &'a [&'a str],
}

/// The summary as pretty-printed JSON: the report, the comparison when the
/// replay has two or more rigs, and the cautions.
///
/// # Errors
/// Never in practice; a serialisation failure is reported as I/O on
/// standard output.
pub fn json(rep: &ReplayReport) -> Result<String, Error> {
    let cmp = (rep.rigs.len() >= 2).then(|| compare(rep));
    serde_json::to_string_pretty(&JsonOut {
        headline: HeadlineOut {
            local_offset_s: rep.local_offset_s,
            rigs: tell(rep),
        },
        report: rep,
        comparison: cmp.as_ref(),
        cautions: CAUTIONS,
    })
    .map_err(|e| stdout_err(std::io::Error::other(e)))
}

/// Writes the summary (text or JSON) to `out`.
///
/// # Errors
/// [`Error::Io`] when `out` cannot be written.
pub fn write(rep: &ReplayReport, as_json: bool, out: &mut dyn Write) -> Result<(), Error> {
    let body = if as_json { json(rep)? } else { text(rep) };
    out.write_all(body.as_bytes()).map_err(stdout_err)?;
    if as_json {
        out.write_all(b"\n").map_err(stdout_err)?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use crate::render::headline::thousands;

    #[test]
    fn thousands_are_grouped_by_three() {
        assert_eq!(thousands(0), "0");
        assert_eq!(thousands(999), "999");
        assert_eq!(thousands(1_000), "1,000");
        assert_eq!(thousands(4_320_000), "4,320,000");
        assert_eq!(thousands(12_345_678_901), "12,345,678,901");
    }
}
