//! The headline: the night's story ([`crate::model::story`]) in words, for
//! the top of the text summary and of the HTML report.
//!
//! Each item is a head line (when, in local wall time with the logs'
//! offset and in UTC, and what) and detail lines (the numbers behind it).
//! Durations are `h:mm:ss`; utilisations percentages.

use standfast::guard::AlertLevel;

use crate::input::log::Timestamp;
use crate::model::assess::pose_words;
use crate::model::replay::Approach;
use crate::model::story::{Change, Closest, FaultSpell, ParkRequest, RigStory, Told};
use crate::render::clock::Clock;
use crate::render::quantity::{direction_text, figure_text};

/// Most park requests the text tells; the JSON has them all.
pub const MAX_TOLD_REQUESTS: usize = 10;
/// Most fault spells below the physics the text tells.
pub const MAX_TOLD_FAULTS: usize = 5;
/// Most kinds of fault quoted for one spell.
const MAX_QUOTED_FAULTS: usize = 3;

/// One item of the headline: its head line and its detail lines.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Item {
    /// When and what.
    pub head: String,
    /// The numbers behind it.
    pub details: Vec<String>,
}

/// A duration as `h:mm:ss` (rounded to the second; negative as 0).
#[must_use]
pub fn hms(seconds: f64) -> String {
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)] // rounded, ≥ 0
    let s = seconds.max(0.0).round() as u64;
    format!("{}:{:02}:{:02}", s / 3600, (s / 60) % 60, s % 60)
}

/// An integer with a comma between groups of three digits ("4,320,000").
#[must_use]
pub fn thousands(n: u64) -> String {
    let digits = n.to_string();
    let mut out = String::with_capacity(digits.len() + digits.len() / 3);
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// `a -> b` with the unit, to as many decimals (from `digits`, at most
/// 3) as it takes for two different values to read differently.
fn pair(a: Option<f32>, b: Option<f32>, scale: f32, unit: &str, digits: usize) -> String {
    let one = |v: Option<f32>, d: usize| {
        v.map_or_else(|| "-".to_owned(), |x| format!("{:.d$}", x * scale))
    };
    let mut d = digits;
    while d < 3 && a != b && one(a, d) == one(b, d) {
        d += 1;
    }
    format!("{}{unit} -> {}{unit}", one(a, d), one(b, d))
}

/// The tip wind before and at a request: `a -> b` at 0.1 m/s, or one
/// value and `unchanged` when they read the same.
fn tip_wind(a: Option<f32>, b: Option<f32>) -> String {
    let (x, y) = (figure_text(a, "m/s", 1), figure_text(b, "m/s", 1));
    if x == y {
        format!("{y}, unchanged")
    } else {
        format!("{x} -> {y}")
    }
}

fn pct(u: f32) -> String {
    format!("{:.0} %", u * 100.0)
}

/// `t_s` as local wall time and UTC: `06:21:00 (05:21:00 UTC)`; only UTC
/// when the logs carry no offset; `+123 s` without a start time.
#[must_use]
pub fn when(clock: Option<&Clock>, t_s: f64) -> String {
    match clock {
        Some(c) if c.offset_s != 0 => {
            let utc = Clock { offset_s: 0, ..*c };
            format!("{} ({} UTC)", c.label(t_s, 1.0), utc.label(t_s, 1.0))
        }
        Some(c) => format!("{} UTC", c.label(t_s, 1.0)),
        None => format!("+{t_s:.0} s"),
    }
}

/// Local date and time of `t_s` to the minute: `2025-11-14 22:00`.
fn local_stamp(c: &Clock, t_s: f64) -> String {
    let iso = Timestamp::from_unix_s(c.local_s(t_s)).to_iso8601(0);
    iso.get(..16).unwrap_or(&iso).replace('T', " ")
}

/// The heading of a rig's headline: the zone and the log's span in local
/// dates, so that the bare times below read without doubt.
#[must_use]
pub fn title(story: &RigStory, clock: Option<&Clock>, several: bool, end_s: f64) -> String {
    let zone = clock.map_or_else(
        || "times since the first record".to_owned(),
        |c| {
            let zone = if c.offset_s == 0 {
                "times UTC".to_owned()
            } else {
                format!("local time {}", c.zone_text())
            };
            format!(
                "{zone}, {} to {}",
                local_stamp(c, 0.0),
                local_stamp(c, end_s)
            )
        },
    );
    if several {
        format!("The night in brief, rig {} ({zone}):", story.rig_file)
    } else {
        format!("The night in brief ({zone}):")
    }
}

/// The items of a rig's headline, in the story's order, with the text's
/// caps ([`MAX_TOLD_REQUESTS`], [`MAX_TOLD_FAULTS`]) and a last line with
/// the final level.
#[must_use]
pub fn items(story: &RigStory, clock: Option<&Clock>, end_s: f64) -> Vec<Item> {
    let mut out = Vec::new();
    if !story.judged {
        out.push(Item {
            head: format!(
                "The guard never judged the rig: it had no usable reading in the whole log ({}).",
                hms(end_s)
            ),
            details: Vec::new(),
        });
    }
    let limit = story.unwatched_limit_s;
    let (mut requests, mut low_faults) = (0_usize, 0_usize);
    let requests_all = story
        .told
        .iter()
        .filter(|t| matches!(t, Told::ParkRequest(_)))
        .count();
    let low_all = story
        .told
        .iter()
        .filter(|t| matches!(t, Told::Fault(f) if told_below(f, limit)))
        .count();
    // Where the park requests are told (after the faults that outrank
    // them), a night without one says so.
    let mut at_requests = false;
    for t in &story.told {
        if !at_requests && !matches!(t, Told::Fault(f) if f.outranks_physics) {
            at_requests = true;
            if requests_all == 0 && story.judged {
                out.push(no_request());
            }
        }
        match t {
            Told::ParkRequest(p) => {
                requests += 1;
                if requests <= MAX_TOLD_REQUESTS {
                    out.push(request_item(p, clock));
                } else if requests == MAX_TOLD_REQUESTS + 1 {
                    out.push(more(requests_all - MAX_TOLD_REQUESTS, "park requests"));
                }
            }
            Told::ClosestApproach(c) => out.push(closest_item(c, clock)),
            Told::Fault(f) if f.outranks_physics => out.push(fault_item(f, clock, limit)),
            Told::Fault(f) => {
                if !story.judged || !told_below(f, limit) {
                    continue;
                }
                low_faults += 1;
                if low_faults <= MAX_TOLD_FAULTS {
                    out.push(fault_item(f, clock, limit));
                } else if low_faults == MAX_TOLD_FAULTS + 1 {
                    out.push(more(low_all - MAX_TOLD_FAULTS, "fault spells"));
                }
            }
        }
    }
    if !at_requests && requests_all == 0 && story.judged {
        out.push(no_request());
    }
    out.push(Item {
        head: format!(
            "{} end of the log: level {}.",
            when(clock, end_s),
            story.final_level.name()
        ),
        details: Vec::new(),
    });
    out
}

/// A fault spell told after the physics: any that does not outrank it,
/// but the start-up only when it was long (a normal start is not news).
fn told_below(f: &FaultSpell, limit_s: f64) -> bool {
    let normal_start = f.start_up && f.unwatched_s <= limit_s;
    !f.outranks_physics && !normal_start
}

fn no_request() -> Item {
    Item {
        head: "No park request from the figures (no step up to park_now or alarm).".to_owned(),
        details: Vec::new(),
    }
}

/// The faults of a spell, each description once with its count, the first
/// [`MAX_QUOTED_FAULTS`] of them.
fn quoted_faults(faults: &[String]) -> String {
    let mut seen: Vec<(&str, usize)> = Vec::new();
    for f in faults {
        match seen.iter_mut().find(|(d, _)| *d == f.as_str()) {
            Some((_, n)) => *n += 1,
            None => seen.push((f, 1)),
        }
    }
    let mut out: Vec<String> = seen
        .iter()
        .take(MAX_QUOTED_FAULTS)
        .map(|(d, n)| {
            if *n > 1 {
                format!("{d} ({n} times)")
            } else {
                (*d).to_owned()
            }
        })
        .collect();
    if seen.len() > MAX_QUOTED_FAULTS {
        let n = seen.len() - MAX_QUOTED_FAULTS;
        out.push(format!("{n} other kind{}", if n == 1 { "" } else { "s" }));
    }
    out.join("; ")
}

fn more(n: usize, what: &str) -> Item {
    Item {
        head: format!("... and {n} more {what} (listed below)."),
        details: Vec::new(),
    }
}

fn change_words(c: &Change, predicted: bool) -> String {
    match c {
        Change::CoverFitted => "the cover was fitted".to_owned(),
        Change::CoverRemoved => "the cover was taken off".to_owned(),
        Change::Pose { to, .. } => format!("the mount slewed to {}", pose_words(to)),
        Change::Gust { from_mps, to_mps } => format!(
            "the gust{} rose, {}",
            if predicted {
                " predicted for the end of a park"
            } else {
                ""
            },
            pair(Some(*from_mps), Some(*to_mps), 1.0, " m/s", 1)
        ),
        Change::Tilt { from_deg, to_deg } => {
            format!(
                "the tilt rose, {}",
                pair(Some(*from_deg), Some(*to_deg), 1.0, "°", 2)
            )
        }
        Change::WindDirection { from_deg, to_deg } => {
            format!("the wind turned from {from_deg:.0}° to {to_deg:.0}°")
        }
    }
}

fn figure_words(figure: Option<&str>) -> &'static str {
    match figure {
        Some("predicted_overturning") => "overturning predicted for the end of a park",
        Some("overturning") => "overturning",
        Some("sliding") => "sliding",
        Some("drive") => "drive utilisation",
        Some("tilt_margin") => "tilt margin",
        _ => "figure",
    }
}

fn request_item(p: &ParkRequest, clock: Option<&Clock>) -> Item {
    let what = if p.to == AlertLevel::Alarm {
        "alarm raised"
    } else {
        "park requested"
    };
    let predicted = p.figure == Some("predicted_overturning");
    let why = if p.changed.is_empty() {
        "no single input changed at once; the figure rose with the wind".to_owned()
    } else {
        p.changed
            .iter()
            .map(|c| change_words(c, predicted))
            .collect::<Vec<_>>()
            .join("; ")
    };
    let head = format!(
        "{} {what} ({} -> {}, {}): {why}.",
        when(clock, p.t_s),
        p.from.name(),
        p.to.name(),
        p.cause
    );
    let mut details = Vec::new();
    let level = if p.to == AlertLevel::Alarm {
        "alarm"
    } else {
        "park"
    };
    let figure = figure_words(p.figure);
    if p.figure == Some("tilt_margin") {
        details.push(format!(
            "{figure} {}, at or under the {} {level} margin",
            pair(p.value_before, p.value, 1.0, "°", 2),
            figure_text(p.threshold, "°", 2),
        ));
    } else if p.figure.is_some() {
        details.push(format!(
            "{figure} {}, at or over the {} {level} threshold",
            pair(p.value_before, p.value, 100.0, " %", 0),
            p.threshold.map_or_else(|| "-".to_owned(), pct),
        ));
    }
    details.push(format!(
        "tip wind {}; gust {} ({} predicted for the end of a park); cover {}",
        tip_wind(p.tip_wind_before_mps, p.tip_wind_mps),
        figure_text(p.gust_mps, "m/s", 1),
        figure_text(p.predicted_gust_mps, "m/s", 1),
        cover_words(p.cover_fitted),
    ));
    if let Some(pose) = &p.pose {
        match p.pose_since_t_s {
            Some(t) if t < p.t_s => details.push(format!(
                "the mount had slewed to {} at {}, {} before",
                pose_words(pose),
                when(clock, t),
                hms(p.t_s - t)
            )),
            Some(_) => {}
            None => details.push(format!(
                "the mount had not slewed in the log ({})",
                pose_words(pose)
            )),
        }
    }
    Item { head, details }
}

fn cover_words(c: Option<bool>) -> &'static str {
    match c {
        Some(true) => "fitted",
        Some(false) => "off",
        None => "not logged",
    }
}

/// The conditions of an approach, in words.
fn conditions(a: &Approach) -> String {
    format!(
        "gust {} from {}, cover {}, {}, tilt {}, tip wind {}, level {}",
        figure_text(a.figures.gust_mps, "m/s", 1),
        direction_text(a.figures.wind_from_deg),
        cover_words(a.cover_fitted),
        pose_words(&a.pose),
        figure_text(a.figures.tilt_deg, "°", 2),
        figure_text(a.figures.tip_wind_mps, "m/s", 1),
        a.level.name(),
    )
}

fn closest_item(c: &Closest, clock: Option<&Clock>) -> Item {
    let a = &c.approach;
    Item {
        head: format!(
            "{} closest approach to tipping: {} (the alarm is at {}).",
            when(clock, a.t_s),
            pct(a.utilisation),
            pct(c.alarm_utilisation)
        ),
        details: vec![conditions(a)],
    }
}

fn fault_item(f: &FaultSpell, clock: Option<&Clock>, limit_s: f64) -> Item {
    let what = if f.start_up {
        "start-up, no readings yet"
    } else {
        "sensor fault"
    };
    let head = format!(
        "{} {what}: {}.",
        when(clock, f.t_s),
        quoted_faults(&f.faults)
    );
    let rank = if f.start_up {
        "the start-up is never ranked above the physics".to_owned()
    } else if f.outranks_physics {
        format!(
            "longer than the {} time to park, so told first",
            hms(limit_s)
        )
    } else {
        format!(
            "not longer than the {} time to park, so told after the physics",
            hms(limit_s)
        )
    };
    let held = if f.open_at_end {
        format!("{}, to the end of the log", hms(f.length_s))
    } else {
        hms(f.length_s)
    };
    Item {
        head,
        details: vec![
            format!(
                "unwatched {} from {}; {rank}",
                hms(f.unwatched_s),
                when(clock, f.unwatched_from_t_s)
            ),
            format!("in sensor_fault (park and alarm asserted) for {held}"),
        ],
    }
}

/// The headline of every rig as text: a heading per rig, then each item's
/// head line and its details, indented.
#[must_use]
pub fn text(stories: &[RigStory], clock: Option<&Clock>, end_s: f64) -> String {
    let mut s = String::new();
    let several = stories.len() > 1;
    for st in stories {
        s.push_str(&title(st, clock, several, end_s));
        s.push('\n');
        for it in items(st, clock, end_s) {
            s.push_str(&format!("  {}\n", it.head));
            for d in &it.details {
                s.push_str(&format!("      {d}\n"));
            }
        }
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn repeated_faults_are_quoted_once_with_their_count() {
        let f = |s: &str| s.to_owned();
        let faults = [f("a"), f("b"), f("a"), f("c"), f("d"), f("a")];
        assert_eq!(quoted_faults(&faults), "a (3 times); b; c; 1 other kind");
        assert_eq!(quoted_faults(&[f("a")]), "a");
    }

    #[test]
    fn durations_are_hours_minutes_seconds() {
        assert_eq!(hms(0.0), "0:00:00");
        assert_eq!(hms(90.98), "0:01:31");
        assert_eq!(hms(32_400.0), "9:00:00");
        assert_eq!(hms(-3.0), "0:00:00");
    }

    #[test]
    fn times_are_local_with_utc_beside() {
        let c = Clock::from_start(Some("2025-11-14T21:00:00.000Z"), Some(3600)).unwrap();
        assert_eq!(when(Some(&c), 30_060.0), "06:21:00 (05:21:00 UTC)");
        let u = Clock::from_start(Some("2025-11-14T21:00:00.000Z"), None).unwrap();
        assert_eq!(when(Some(&u), 60.0), "21:01:00 UTC");
        assert_eq!(when(None, 60.0), "+60 s");
    }
}
