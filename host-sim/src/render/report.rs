//! Self-contained HTML reports with SVG charts, for a replay
//! ([`replay_html`]) and for a static assessment ([`assess_html`]).
//!
//! Everything is inline (CSS and SVG); the page loads nothing and runs no
//! script, so it opens anywhere without a network. The charts are drawn by
//! the small writer in [`svg`]; the replay's time series comes from the
//! bounded collector in [`crate::model::series`], the polar and torque data
//! and the wind's height factor from [`crate::model::charts`]. Units on the
//! page: utilisation as a
//! percentage of the limit (100 % tips, slides or reaches the rating, in
//! tables and on axes alike), speeds m/s (the replay's wind chart: all at
//! the rig height of the rig file), angles degrees (wind directions are
//! where the wind blows FROM, clockwise from north), time as local wall
//! time at the offset the logs carry (UTC in the event table). Colours come
//! from [`palette`], checked for colour-blind readers; times through
//! [`crate::render::clock`].

use crate::cautions::CAUTIONS;
use crate::error::Error;
use crate::model::assess::{pose_words, AssessReport};
use crate::model::charts::{AssessCharts, RigCharts, POLAR_STEP_DEG};
use crate::model::replay::{Approach, ReplayReport, RigReplay, LEVELS};
use crate::model::series::{self as series, Series};
use crate::render::clock::Clock;
use crate::render::headline::{hms, thousands};
use crate::render::html::Page;
use crate::render::night::{
    cover_spans, level_colour, level_spans, level_tables, line, night_events, points, pose_chart,
    with_gaps, Axis, NightEvent, COVER_CATS,
};
use crate::render::palette;
use crate::render::quantity::{direction_text, figure_text};
use crate::render::svg::{self, HLine, Mark, PolarChart, PolarMarker, PolarTrace, Stroke};

/// A time of the replay for a table: local wall time with its zone, then
/// the UTC time the replay recorded (`utc`).
fn when(clock: Option<&Clock>, t_s: f64, utc: &str) -> String {
    match clock {
        Some(c) if c.offset_s != 0 => format!("{} ({utc})", c.local_text(t_s)),
        _ => utc.to_owned(),
    }
}

fn approach_row(label: &str, a: Option<&Approach>, clock: Option<&Clock>) -> Vec<String> {
    let Some(a) = a else {
        return vec![
            label.to_owned(),
            "no figure".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
            "-".to_owned(),
        ];
    };
    vec![
        label.to_owned(),
        format!("{:.0} %", a.utilisation * 100.0),
        when(clock, a.t_s, &a.time),
        figure_text(a.figures.gust_mps, "m/s", 1),
        direction_text(a.figures.wind_from_deg),
        pose_words(&a.pose),
        figure_text(a.figures.tilt_deg, "°", 2),
        figure_text(a.figures.tip_wind_mps, "m/s", 1),
        a.level.name().to_owned(),
    ]
}

/// A duration as `h:mm:ss` (`m:ss` under an hour).
fn duration_words(s: f64) -> String {
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let t = s.max(0.0).round() as u64;
    if t >= 3600 {
        format!("{}:{:02}:{:02}", t / 3600, (t / 60) % 60, t % 60)
    } else {
        format!("{}:{:02}", t / 60, t % 60)
    }
}

/// One rig's section of the replay report: closest approaches, charts,
/// the numbered events, level times, level changes and faults.
fn rig_section(page: &mut Page, rep: &ReplayReport, r: &RigReplay, charts: Option<&RigCharts>) {
    page.h2(&format!("Rig {}", r.rig_file));
    page.p(&format!(
        "Highest level {}, final level {}.",
        r.highest_level.name(),
        r.final_level.name()
    ));
    let events = night_events(r);
    let axis = Axis::of(rep, r, &events);
    let ck = axis.clock.as_ref();
    page.h3("Closest approach");
    let mut rows = vec![
        approach_row("overturning", r.overturning.as_ref(), ck),
        approach_row("sliding", r.sliding.as_ref(), ck),
    ];
    for (i, d) in r.drive.iter().enumerate() {
        if d.is_some() {
            rows.push(approach_row(
                &format!("drive axis {}", i + 1),
                d.as_ref(),
                ck,
            ));
        }
    }
    page.table(
        &[
            "figure",
            "utilisation",
            "time",
            "gust",
            "from",
            "pose",
            "tilt",
            "tip wind",
            "level",
        ],
        &rows,
    );
    utilisation_charts(page, r, charts, &axis);
    cover_and_pose(
        page,
        &r.series,
        axis.x_range,
        ck,
        &axis.x_label,
        &axis.marks,
    );
    event_table(page, &events, ck);
    wind_charts(page, r, charts, &axis);
    let mut t = axis.chart("Ground tilt", "tilt (degrees)");
    t.lines.push(line(
        "tilt (highest)",
        palette::BLUE,
        points(&r.series, 1.0, |p| p.peak.tilt_deg),
    ));
    t.marks.clone_from(&axis.marks);
    page.figure(
        &t.to_svg(),
        &format!("Tilt of the rig from the vertical. {}", axis.bucket),
    );
    polar_chart(page, r, charts);
    level_tables(page, rep, r);
}

/// (a) Utilisation over time with the guard's thresholds and the numbered
/// events, and the level timeline.
fn utilisation_charts(page: &mut Page, r: &RigReplay, charts: Option<&RigCharts>, axis: &Axis) {
    let s = &r.series;
    let mut u = axis.chart("Utilisation over time", "utilisation (% of the limit)");
    u.lines.push(line(
        "overturning",
        palette::BLUE,
        points(s, 100.0, |p| p.peak.overturning_utilisation),
    ));
    let mut pred = line(
        "predicted (end of park)",
        palette::PINK,
        points(s, 100.0, |p| p.peak.predicted_utilisation),
    );
    pred.stroke = Stroke::Dashed;
    u.lines.push(pred);
    u.lines.push(line(
        "sliding",
        palette::AMBER,
        points(s, 100.0, |p| p.peak.sliding_utilisation),
    ));
    if let Some([watch, park, alarm]) = charts.and_then(|c| c.thresholds) {
        for (value, label) in [(watch, "watch"), (park, "park"), (alarm, "alarm")] {
            u.hlines.push(HLine {
                value: f64::from(value) * 100.0,
                label: format!("{label} {:.0} %", value * 100.0),
                colour: palette::INK.to_owned(),
            });
        }
    }
    u.marks.clone_from(&axis.marks);
    page.figure(
        &u.to_svg(),
        &format!("Overturning, predicted and sliding utilisation in % of the limit (100 %: the rig tips or slides) with the guard's watch, park and alarm thresholds (dashed) and the numbered events (vertical lines; the table below names them). {}{}", axis.bucket, axis.zone_note),
    );
    let cats: Vec<(&str, &str)> = LEVELS
        .iter()
        .map(|st| (st.name(), level_colour(*st)))
        .collect();
    page.figure(
        &svg::timeline(
            "Level over time",
            axis.x_range,
            &level_spans(s),
            &cats,
            axis.clock.as_ref(),
            &axis.x_label,
        ),
        "The guard's level; each interval shows its most severe level.",
    );
}

/// (b) Wind speed, all at rig height, with the tip wind, and direction.
fn wind_charts(page: &mut Page, r: &RigReplay, charts: Option<&RigCharts>, axis: &Axis) {
    let s = &r.series;
    let ck = axis.clock.as_ref();
    let heights = charts.and_then(|c| c.wind_heights);
    let (k, at) = match heights {
        Some(h) => (
            f64::from(h.factor),
            format!("at rig height ({:.1} m)", h.rig_m),
        ),
        None => (
            1.0,
            "at the anemometer (no rig file: not scaled)".to_owned(),
        ),
    };
    let mut w = axis.chart(&format!("Wind {at}"), "wind speed (m/s)");
    w.lines.push(line(
        "anemometer: highest sample",
        palette::PALE_BLUE,
        with_gaps(points(s, k, |p| p.wind_max_mps), &s.wind_gaps),
    ));
    w.lines.push(line(
        "anemometer: mean",
        palette::INK,
        with_gaps(
            points(s, k, series::SeriesPoint::wind_mean_mps),
            &s.wind_gaps,
        ),
    ));
    w.bands = s
        .wind_gaps
        .iter()
        .map(|&(a, b)| svg::Band {
            x0: a,
            x1: b,
            label: format!(
                "no anemometer sample for {} (from {})",
                duration_words(b - a),
                ck.map_or_else(|| format!("+{a:.0} s"), |c| c.local_text(a))
            ),
        })
        .collect();
    w.lines.push(line(
        "gust used by the guard",
        palette::BLUE,
        points(s, 1.0, |p| p.peak.gust_mps),
    ));
    let mut tip = line(
        "tip wind (lowest)",
        palette::PINK,
        points(s, 1.0, |p| p.peak.tip_wind_mps),
    );
    tip.stroke = Stroke::Dashed;
    w.lines.push(tip);
    w.marks.clone_from(&axis.marks);
    let scaled = match heights {
        Some(h) => format!(
            "The anemometer's samples (at {:.1} m) are scaled to the rig height of {:.1} m by the guard's own factor ×{:.3} (logarithmic wind profile), so every line is at rig height.",
            h.anemometer_m, h.rig_m, h.factor
        ),
        None => "No rig file: the anemometer's samples are drawn as measured.".to_owned(),
    };
    let gaps = if s.wind_gaps.is_empty() {
        String::new()
    } else {
        format!(
            " Grey bands: {} gap{} in the anemometer's samples longer than {:.0} s (the rig's wind_stale, after which the guard raises a fault){}.",
            s.wind_gaps.len(),
            if s.wind_gaps.len() == 1 { "" } else { "s" },
            s.wind_gap_s,
            if s.wind_gaps_not_kept > 0 {
                format!(", and {} more not drawn", s.wind_gaps_not_kept)
            } else {
                String::new()
            }
        )
    };
    page.figure(&w.to_svg(), &format!("Wind speed: the anemometer's highest sample and mean, the gust the guard's figures use (its peak estimate over its window) and the tip wind, the lowest wind speed that would tip the rig in its pose then (dashed; where the gust meets it, the rig tips). {scaled}{gaps} {}", axis.bucket));
    let mut d = axis.chart("Wind direction", "from (degrees)");
    d.y_range = Some((0.0, 360.0));
    d.y_step = Some(90.0);
    let mut dl = line(
        "direction at the highest gust",
        palette::INK,
        points(s, 1.0, |p| p.peak.wind_from_deg),
    );
    dl.dots = true;
    d.lines.push(dl);
    page.figure(
        &d.to_svg(),
        "Direction the wind blows from (0° north, 90° east), at each interval's highest gust.",
    );
}

/// (d) Tip wind by direction at the closest approach to overturning.
fn polar_chart(page: &mut Page, r: &RigReplay, charts: Option<&RigCharts>) {
    let s = &r.series;
    let (Some(pts), Some(a)) = (
        charts.and_then(|c| c.approach_tip_wind.clone()),
        r.overturning.as_ref(),
    ) else {
        return;
    };
    let chart = PolarChart {
        title: "Tip wind speed by direction at the closest approach".to_owned(),
        r_label: "tip wind (m/s)".to_owned(),
        traces: vec![PolarTrace {
            name: "tip wind".to_owned(),
            colour: palette::BLUE.to_owned(),
            points: pts,
            stroke: Stroke::Solid,
        }],
        marker: match (a.figures.wind_from_deg, a.figures.gust_mps) {
            (Some(dir), Some(g)) => Some(PolarMarker {
                deg: f64::from(dir),
                value: f64::from(g),
                label: format!("gust {g:.1} m/s"),
            }),
            _ => None,
        },
        rings: Vec::new(),
        bearings: Vec::new(),
        size: 420.0,
    };
    page.figure(
        &chart.to_svg(),
        &format!(
            "Lowest wind speed that would tip the rig, for a wind from each direction (every {POLAR_STEP_DEG}°), in the pose of the closest approach ({}), tilt {}, cover {}. The dot is the gust there. Open circles on the outer ring: no wind tips it from that direction.",
            pose_words(&a.pose),
            match (a.figures.tilt_deg, a.figures.tilt_downhill_deg) {
                (Some(m), Some(dd)) => format!("{m:.2}° downhill toward {dd:.0}°"),
                _ => "unknown (level assumed)".to_owned(),
            },
            match s.cover_at_closest {
                Some(true) => "fitted",
                Some(false) => "off",
                None => "unknown (off assumed)",
            }
        ),
    );
}

/// The cover band and the pose track: what the mount did, beside what the
/// guard saw.
fn cover_and_pose(
    page: &mut Page,
    s: &Series,
    x_range: (f64, f64),
    clock: Option<&Clock>,
    x_label: &str,
    marks: &[Mark],
) {
    page.figure(
        &svg::timeline("Cover", x_range, &cover_spans(s), &COVER_CATS, clock, x_label),
        "The weather cover from the logs: an interval is shown fitted when the cover was fitted at any moment in it. A fitted cover adds mass and catches wind, so it changes the tip wind.",
    );
    pose_chart(page, s, x_range, clock, x_label, marks);
}

/// The numbered events of the charts, with local and UTC times.
fn event_table(page: &mut Page, events: &[NightEvent], clock: Option<&Clock>) {
    page.h3(&format!("Events on the charts ({})", events.len()));
    let rows: Vec<Vec<String>> = events
        .iter()
        .enumerate()
        .map(|(i, e)| {
            vec![
                (i + 1).to_string(),
                clock.map_or_else(|| "-".to_owned(), |c| c.local_text(e.t_s)),
                e.utc.clone(),
                e.what.clone(),
            ]
        })
        .collect();
    page.table(&["no.", "local time", "UTC", "what happened"], &rows);
}

/// The replay report as a self-contained HTML page. `charts` are the chart
/// data of each rig, in the report's order
/// ([`crate::model::charts::replay_charts`]; a rig without them gets no
/// thresholds and no polar chart).
#[must_use]
pub fn replay_html(rep: &ReplayReport, charts: &[RigCharts]) -> String {
    let mut page = Page::new("Standfast replay report");
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let stories = crate::model::story::tell(rep);
    for st in &stories {
        let items: Vec<(String, Vec<String>)> =
            crate::render::headline::items(st, clock.as_ref(), rep.duration_s)
                .into_iter()
                .map(|i| (i.head, i.details))
                .collect();
        let heading =
            crate::render::headline::title(st, clock.as_ref(), stories.len() > 1, rep.duration_s);
        page.headline(heading.trim_end_matches(':'), &items);
    }
    page.cautions(CAUTIONS);
    page.h2("Summary");
    let ck = clock.as_ref();
    page.p(&format!(
        "Replayed {} merged records ({} log rows) from {} to {} ({}).",
        thousands(rep.records),
        thousands(rep.rows),
        ck.map_or("-".to_owned(), |c| c.local_datetime_text(0.0)),
        ck.map_or("-".to_owned(), |c| c.local_datetime_text(rep.duration_s)),
        hms(rep.duration_s)
    ));
    let issues: Vec<String> = rep
        .issues
        .iter()
        .filter(|c| c.count > 0)
        .map(|c| format!("{} {}", c.count, c.kind))
        .collect();
    page.p(&format!(
        "Log issues: {}{}.",
        rep.issues_total,
        if issues.is_empty() {
            String::new()
        } else {
            format!(" ({})", issues.join(", "))
        }
    ));
    if !rep.first_issues.is_empty() {
        page.pre(&rep.first_issues.join("\n"));
    }
    if rep.rigs.len() >= 2 {
        // What-if: one set of charts with the rigs overlaid.
        crate::render::whatif::html_sections(&mut page, rep, charts);
    } else {
        for (i, r) in rep.rigs.iter().enumerate() {
            rig_section(&mut page, rep, r, charts.get(i));
        }
    }
    page.note("Standfast replay report; all charts are drawn from the replay above.");
    page.cautions(CAUTIONS);
    page.finish()
}

/// The assessment report as a self-contained HTML page: a table or chart
/// for each finding ([`crate::render::assess::html`]).
///
/// `charts` are the assessment's chart data
/// ([`crate::model::charts::assess_charts`]).
///
/// # Errors
/// As [`crate::render::assess::html`].
pub fn assess_html(rep: &AssessReport, charts: &AssessCharts) -> Result<String, Error> {
    crate::render::assess::html(rep, charts)
}
