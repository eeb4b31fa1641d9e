//! The pieces the replay report's single-rig part ([`super::report`]) and
//! its what-if part ([`super::whatif`]) share: level colours, chart points
//! from a series, the time axis, the numbered events, the cover band, the
//! pose track and the level tables.

use standfast::guard::AlertLevel;

use crate::model::replay::{ReplayReport, RigReplay, LEVELS};
use crate::model::series::{self as series, Series};
use crate::render::clock::Clock;
use crate::render::html::Page;
use crate::render::palette;
use crate::render::svg::{Line, LineChart, Mark, Span, Stroke};

/// The report's colour of each level ([`palette::LEVEL`], in [`LEVELS`]
/// order).
pub(super) fn level_colour(s: AlertLevel) -> &'static str {
    palette::LEVEL
        .get(level_cat(s))
        .copied()
        .unwrap_or(palette::INK)
}

pub(super) fn level_cat(s: AlertLevel) -> usize {
    LEVELS.iter().position(|x| *x == s).unwrap_or(0)
}

/// The chart points of one figure of the series, scaled by `k`: one per
/// bucket, and a break (`None`) wherever buckets are missing (no record in
/// that interval), so a gap in the logs is drawn as a gap.
pub(super) fn points(
    s: &Series,
    k: f64,
    f: impl Fn(&series::SeriesPoint) -> Option<f32>,
) -> Vec<(f64, Option<f64>)> {
    let mut out = Vec::with_capacity(s.points.len());
    let mut prev_start: Option<f64> = None;
    for p in &s.points {
        if prev_start.is_some_and(|q| p.t_start_s - q > s.width_s * 1.5) {
            out.push((p.t_start_s, None));
        }
        prev_start = Some(p.t_start_s);
        out.push((
            (p.t_start_s + p.t_last_s) / 2.0,
            f(p).map(|v| f64::from(v) * k),
        ));
    }
    out
}

pub(super) fn line(name: &str, colour: &str, pts: Vec<(f64, Option<f64>)>) -> Line {
    Line {
        name: name.to_owned(),
        colour: colour.to_owned(),
        points: pts,
        stroke: Stroke::Solid,
        dots: false,
    }
}

/// `pts` with a break in the middle of each gap, so no line bridges one.
pub(super) fn with_gaps(
    mut pts: Vec<(f64, Option<f64>)>,
    gaps: &[(f64, f64)],
) -> Vec<(f64, Option<f64>)> {
    pts.extend(gaps.iter().map(|&(a, b)| (f64::midpoint(a, b), None)));
    pts.sort_by(|p, q| p.0.total_cmp(&q.0));
    pts
}

/// One event of a rig (a level change or a fault) for the charts and the
/// event table: its number is its place in time order, from 1.
pub(super) struct NightEvent {
    pub(super) t_s: f64,
    pub(super) utc: String,
    pub(super) what: String,
    pub(super) colour: &'static str,
}

pub(super) fn night_events(r: &RigReplay) -> Vec<NightEvent> {
    let mut m: Vec<NightEvent> = r
        .level_changes
        .iter()
        .map(|c| NightEvent {
            t_s: c.t_s,
            utc: c.time.clone(),
            what: format!("{} → {} ({})", c.from.name(), c.to.name(), c.cause),
            colour: level_colour(c.to),
        })
        .collect();
    m.extend(r.faults.iter().map(|f| NightEvent {
        t_s: f.t_s,
        utc: f.time.clone(),
        what: format!("fault: {}", f.fault),
        colour: level_colour(AlertLevel::SensorFault),
    }));
    m.sort_by(|a, b| a.t_s.total_cmp(&b.t_s));
    m
}

pub(super) fn event_marks(events: &[NightEvent]) -> Vec<Mark> {
    events
        .iter()
        .enumerate()
        .map(|(i, e)| Mark {
            x: e.t_s,
            number: i + 1,
            label: e.what.clone(),
            colour: e.colour.to_owned(),
        })
        .collect()
}

pub(super) fn level_spans(s: &Series) -> Vec<Span> {
    let mut out: Vec<Span> = Vec::new();
    for (i, p) in s.points.iter().enumerate() {
        let end = s
            .points
            .get(i + 1)
            .map_or(p.t_last_s.max(p.t_start_s + s.width_s), |q| q.t_start_s);
        let cat = level_cat(p.level);
        match out.last_mut() {
            Some(l) if l.cat == cat && (l.t1 - p.t_start_s).abs() < 1e-9 => l.t1 = end,
            _ => out.push(Span {
                t0: p.t_start_s,
                t1: end,
                cat,
            }),
        }
    }
    out
}

/// The time axis every chart of a rig shares: its range (s since the first
/// record), its label and the note on the zone, the clock, the numbered
/// event marks, and the sentence saying what a point stands for.
pub(super) struct Axis {
    pub(super) x_range: (f64, f64),
    pub(super) x_label: String,
    pub(super) zone_note: String,
    pub(super) clock: Option<Clock>,
    pub(super) marks: Vec<Mark>,
    pub(super) bucket: String,
}

impl Axis {
    pub(super) fn of(rep: &ReplayReport, r: &RigReplay, events: &[NightEvent]) -> Axis {
        let s = &r.series;
        let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
        let x_label = match (clock, rep.local_offset_s) {
            (Some(c), Some(_)) => format!("local time ({}, hh:mm)", c.zone_text()),
            (Some(_), None) => "time (UTC, hh:mm)".to_owned(),
            (None, _) => "time since the first record (h:mm)".to_owned(),
        };
        let zone_note = match (clock, rep.local_offset_s) {
            (Some(c), Some(_)) => format!(
                " Times are local ({}), the offset the logs carry.",
                c.zone_text()
            ),
            (Some(_), None) => " Times are UTC: the logs carry no zone offset.".to_owned(),
            (None, _) => String::new(),
        };
        Axis {
            x_range: (0.0, rep.duration_s.max(s.width_s)),
            x_label,
            zone_note,
            clock,
            marks: event_marks(events),
            bucket: format!(
                "Each point is the highest value (mean for the mean wind) over {:.0} s of log.",
                s.width_s
            ),
        }
    }

    /// A line chart on this axis.
    pub(super) fn chart(&self, title: &str, y: &str) -> LineChart {
        let mut c = LineChart::new(title, &self.x_label, y);
        c.x_range = self.x_range;
        c.clock = self.clock;
        c
    }
}

/// The categories of the cover band.
pub(super) const COVER_CATS: [(&str, &str); 3] = [
    ("cover off", palette::PALE_BLUE),
    ("cover fitted", palette::BLUE),
    ("not known", "#d9dde2"),
];

/// The spans of the cover band ([`COVER_CATS`]).
pub(super) fn cover_spans(s: &Series) -> Vec<Span> {
    let mut spans: Vec<Span> = Vec::new();
    for (i, p) in s.points.iter().enumerate() {
        let end = s
            .points
            .get(i + 1)
            .map_or(p.t_last_s.max(p.t_start_s + s.width_s), |q| q.t_start_s);
        let cat = match p.cover {
            Some(false) => 0,
            Some(true) => 1,
            None => 2,
        };
        match spans.last_mut() {
            Some(l) if l.cat == cat && (l.t1 - p.t_start_s).abs() < 1e-9 => l.t1 = end,
            _ => spans.push(Span {
                t0: p.t_start_s,
                t1: end,
                cat,
            }),
        }
    }
    spans
}

/// The pose track, when the logs carry a pose.
pub(super) fn pose_chart(
    page: &mut Page,
    s: &Series,
    x_range: (f64, f64),
    clock: Option<&Clock>,
    x_label: &str,
    marks: &[Mark],
) {
    let Some(frame) = s.pose_frame else {
        return;
    };
    let (a_name, b_name, what) = match frame {
        "equatorial" => (
            "hour angle (°, 15° = 1 h, west positive)",
            "declination (°)",
            "hour angle and declination",
        ),
        "horizontal" => ("azimuth (°)", "altitude (°)", "azimuth and altitude"),
        _ => ("primary axis (°)", "secondary axis (°)", "the axis angles"),
    };
    let mut c = LineChart::new("Mount pose", x_label, "angle (degrees)");
    c.x_range = x_range;
    c.clock = clock.copied();
    c.lines.push(line(
        a_name,
        palette::BLUE,
        points(s, 1.0, |p| p.pose_a_deg),
    ));
    c.lines.push(line(
        b_name,
        palette::PINK,
        points(s, 1.0, |p| p.pose_b_deg),
    ));
    c.marks = marks.to_vec();
    page.figure(
        &c.to_svg(),
        &format!(
            "The pose the guard's figures are for ({what}) at the end of each interval{}; a park shows as the move to the park pose.",
            if marks.is_empty() { "" } else { ", with the numbered events" }
        ),
    );
}

/// Time per level (h:mm:ss), level changes and sensor faults, as tables;
/// each change and fault at its local date and time with the zone (the
/// offset the logs carry, or the replay's `--utc-offset`), then in ISO 8601
/// UTC as the replay recorded it.
pub(super) fn level_tables(page: &mut Page, rep: &ReplayReport, r: &RigReplay) {
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let local = |t_s: f64| {
        clock
            .as_ref()
            .map_or_else(|| "-".to_owned(), |c| c.local_datetime_text(t_s))
    };
    page.h3("Time per level");
    let rows: Vec<Vec<String>> = r
        .level_time
        .iter()
        .map(|t| {
            vec![
                t.level.name().to_owned(),
                crate::render::headline::hms(t.seconds),
                format!(
                    "{:.1} %",
                    if rep.duration_s > 0.0 {
                        t.seconds / rep.duration_s * 100.0
                    } else {
                        0.0
                    }
                ),
            ]
        })
        .collect();
    page.table(&["level", "time (h:mm:ss)", "share"], &rows);
    page.h3(&format!("Level changes ({})", r.level_changes.len()));
    let rows: Vec<Vec<String>> = r
        .level_changes
        .iter()
        .map(|c| {
            vec![
                local(c.t_s),
                c.time.clone(),
                c.from.name().to_owned(),
                c.to.name().to_owned(),
                c.cause.clone(),
            ]
        })
        .collect();
    page.table(&["local time", "UTC", "from", "to", "cause"], &rows);
    if r.level_changes_not_kept > 0 {
        page.note(&format!(
            "… and {} more not kept.",
            r.level_changes_not_kept
        ));
    }
    page.h3(&format!("Sensor faults ({})", r.faults.len()));
    let rows: Vec<Vec<String>> = r
        .faults
        .iter()
        .map(|f| vec![local(f.t_s), f.time.clone(), f.fault.clone()])
        .collect();
    page.table(&["local time", "UTC", "fault"], &rows);
    if r.faults_not_kept > 0 {
        page.note(&format!("… and {} more not kept.", r.faults_not_kept));
    }
}
