//! The what-if comparison: the side-by-side table of a replay's rigs
//! ([`Comparison`]) as text, which the summary puts before its cautions,
//! and the HTML report's what-if part ([`html_sections`]): the same table,
//! then one set of charts with the rigs overlaid, each rig in its own
//! colour and line pattern ([`rig_style`]), then each rig's level changes
//! and faults.

use crate::model::charts::{RigCharts, POLAR_STEP_DEG};
use crate::model::replay::{ReplayReport, RigReplay, LEVELS};
use crate::model::series::Series;
use crate::model::whatif::{compare, Comparison};
use crate::render::clock::Clock;
use crate::render::headline::hms;
use crate::render::html::Page;
use crate::render::night::{
    cover_spans, level_colour, level_spans, level_tables, line, points, pose_chart, Axis,
    COVER_CATS,
};
use crate::render::palette;
use crate::render::svg::{self, HLine, Line, PolarChart, PolarTrace, Span, Stroke};

fn pct(v: Option<f32>) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{:.1} %", x * 100.0))
}

/// A time of the comparison: local wall time `hh:mm:ss` when the first
/// record's time is known (the zone is said once, by [`times_note`]), else
/// seconds since the first record.
fn at_s(v: Option<f64>, clock: Option<&Clock>) -> String {
    match (v, clock) {
        (None, _) => "-".to_owned(),
        (Some(x), Some(c)) => c.label(x, 1.0),
        (Some(x), None) => format!("+{x:.0} s"),
    }
}

/// What the comparison's times and durations are.
#[must_use]
pub fn times_note(clock: Option<&Clock>) -> String {
    format!(
        "times {}; durations h:mm:ss",
        clock.map_or_else(
            || "in seconds since the first record".to_owned(),
            |c| format!("local, {}", c.zone_text())
        )
    )
}

/// The side-by-side table as text (it starts with an empty line); `clock`
/// gives local times (`None`: seconds since the first record).
#[must_use]
pub fn comparison_text(cmp: &Comparison, clock: Option<&Clock>) -> String {
    let mut s = format!(
        "\nSide by side (the same logs through each rig; {}):\n",
        times_note(clock)
    );
    for r in &cmp.rigs {
        s.push_str(&format!("  {} = {}\n", r.column, r.rig));
    }
    let rows = comparison_rows(cmp, clock);
    let label_w = rows.iter().map(|r| r.0.len()).max().unwrap_or(0) + 2;
    let col_w = rows
        .iter()
        .flat_map(|r| r.1.iter().map(|c| c.chars().count()))
        .max()
        .unwrap_or(1)
        .max(6)
        + 2;
    s.push_str(&format!("  {:label_w$}", ""));
    for r in &cmp.rigs {
        s.push_str(&format!("{:>col_w$}", r.column));
    }
    s.push('\n');
    for (label, cells) in rows {
        s.push_str(&format!("  {label:label_w$}"));
        for c in cells {
            s.push_str(&format!("{c:>col_w$}"));
        }
        s.push('\n');
    }
    s
}

/// The comparison's rows: a label and one cell per rig (the text and the
/// HTML tables show the same rows); times as local wall time `hh:mm:ss`
/// when the first record's time is known, else seconds since it.
#[must_use]
pub fn comparison_rows(
    cmp: &Comparison,
    clock: Option<&Clock>,
) -> Vec<(&'static str, Vec<String>)> {
    vec![
        (
            "highest overturning",
            cmp.rigs
                .iter()
                .map(|r| pct(r.figures.overturning_utilisation))
                .collect(),
        ),
        (
            "  at",
            cmp.rigs
                .iter()
                .map(|r| at_s(r.overturning_t_s, clock))
                .collect(),
        ),
        (
            "  tip wind there",
            cmp.rigs
                .iter()
                .map(|r| {
                    r.figures
                        .tip_wind_mps
                        .map_or_else(|| "-".to_owned(), |v| format!("{v:.1} m/s"))
                })
                .collect(),
        ),
        (
            "highest sliding",
            cmp.rigs
                .iter()
                .map(|r| pct(r.figures.sliding_utilisation))
                .collect(),
        ),
        (
            "highest drive axis 1",
            cmp.rigs.iter().map(|r| pct(r.drive(0))).collect(),
        ),
        (
            "highest drive axis 2",
            cmp.rigs.iter().map(|r| pct(r.drive(1))).collect(),
        ),
        (
            "highest level",
            cmp.rigs
                .iter()
                .map(|r| r.highest_level.name().to_owned())
                .collect(),
        ),
        (
            "first park request",
            cmp.rigs
                .iter()
                .map(|r| at_s(r.first_park_t_s, clock))
                .collect(),
        ),
        (
            "first alarm",
            cmp.rigs
                .iter()
                .map(|r| at_s(r.first_alarm_t_s, clock))
                .collect(),
        ),
        (
            "time in watch",
            cmp.rigs.iter().map(|r| hms(r.watch_s)).collect(),
        ),
        (
            "time in park_now",
            cmp.rigs.iter().map(|r| hms(r.park_now_s)).collect(),
        ),
        (
            "time in alarm",
            cmp.rigs.iter().map(|r| hms(r.alarm_s)).collect(),
        ),
        (
            "time in sensor_fault",
            cmp.rigs.iter().map(|r| hms(r.sensor_fault_s)).collect(),
        ),
        (
            "level changes",
            cmp.rigs
                .iter()
                .map(|r| r.level_changes.to_string())
                .collect(),
        ),
    ]
}

/// A row label of the comparison for the HTML table: a sub-row (indented
/// in the text, like "  at" under "highest overturning") keeps its indent
/// as no-break spaces, which HTML does not collapse.
#[must_use]
pub fn html_label(label: &str) -> String {
    let body = label.trim_start_matches(' ');
    let indent = label.len() - body.len();
    format!("{}{body}", "\u{a0}".repeat(indent * 2))
}

/// The line colours of the rigs of a what-if page, in column order (A, B,
/// C, D; then again with the next pattern), with their names for the key.
const RIG_COLOURS: [(&str, &str); 4] = [
    (palette::BLUE, "deep blue"),
    (palette::PINK, "pink"),
    (palette::AMBER, "amber"),
    (palette::PALE_BLUE, "pale blue"),
];

/// The colour, its name and the line pattern of rig number `i` (0 for A)
/// on a what-if page: no two of the first sixteen rigs share both.
#[must_use]
pub fn rig_style(i: usize) -> (&'static str, &'static str, Stroke) {
    let n = RIG_COLOURS.len();
    let (colour, name) = RIG_COLOURS[i % n];
    let stroke = Stroke::ALL[(i + i / n) % Stroke::ALL.len()];
    (colour, name, stroke)
}

fn stroke_words(s: Stroke) -> &'static str {
    match s {
        Stroke::Solid => "solid",
        Stroke::Dashed => "dashed",
        Stroke::Dotted => "dotted",
        Stroke::DashDot => "dash-dot",
    }
}

/// A line of rig `i` in its colour and pattern.
fn rig_line(i: usize, col: &str, what: &str, pts: Vec<(f64, Option<f64>)>) -> Line {
    let (colour, _, stroke) = rig_style(i);
    let mut l = line(&format!("{col}: {what}"), colour, pts);
    l.stroke = stroke;
    l
}

/// The guard's thresholds of every rig as threshold lines: one line per
/// distinct value of each threshold, labelled with the rigs that use it
/// when not all do.
fn threshold_lines(cmp: &Comparison, charts: &[RigCharts]) -> Vec<HLine> {
    let mut out: Vec<(String, f32, Vec<&str>)> = Vec::new();
    for (i, r) in cmp.rigs.iter().enumerate() {
        let Some(t) = charts.get(i).and_then(|c| c.thresholds) else {
            continue;
        };
        for (kind, v) in ["watch", "park", "alarm"].into_iter().zip(t) {
            match out
                .iter_mut()
                .find(|(k, x, _)| k == kind && (x - v).abs() < 1e-6)
            {
                Some(e) => e.2.push(&r.column),
                None => out.push((kind.to_owned(), v, vec![&r.column])),
            }
        }
    }
    out.into_iter()
        .map(|(kind, v, cols)| HLine {
            value: f64::from(v) * 100.0,
            label: if cols.len() == cmp.rigs.len() {
                format!("{kind} {:.0} %", v * 100.0)
            } else {
                format!("{kind} {:.0} % ({})", v * 100.0, cols.join(", "))
            },
            colour: palette::INK.to_owned(),
        })
        .collect()
}

/// The what-if part of the replay report (two or more rigs): the key of
/// the rigs, the side-by-side table (the text summary's rows), the charts
/// with the rigs overlaid, and each rig's level changes and faults. `charts`
/// are the rigs' chart data in the report's order.
pub fn html_sections(page: &mut Page, rep: &ReplayReport, charts: &[RigCharts]) {
    let Some(first) = rep.rigs.first() else {
        return;
    };
    let cmp = compare(rep);
    side_by_side(page, rep, &cmp);
    overlaid_charts(page, rep, &cmp, charts, first);
    for (r, l) in rep.rigs.iter().zip(&cmp.rigs) {
        page.h2(&format!("Rig {}: {}", l.column, r.rig_file));
        page.p(&format!(
            "Highest level {}, final level {}.",
            r.highest_level.name(),
            r.final_level.name()
        ));
        level_tables(page, rep, r);
    }
}

/// The key of the rigs (colour and line pattern) and the side-by-side
/// table of the figures.
fn side_by_side(page: &mut Page, rep: &ReplayReport, cmp: &Comparison) {
    page.h2("What-if: the rigs side by side");
    page.p("The same logs through each rig, each with its own guard. On the charts below every rig has its own colour and line pattern:");
    let key: Vec<Vec<String>> = cmp
        .rigs
        .iter()
        .enumerate()
        .map(|(i, r)| {
            let (_, colour, stroke) = rig_style(i);
            vec![
                r.column.clone(),
                format!("{colour}, {}", stroke_words(stroke)),
                r.rig.clone(),
            ]
        })
        .collect();
    page.table(&["rig", "line", "rig file and changes"], &key);
    let mut headers = vec!["figure"];
    headers.extend(cmp.rigs.iter().map(|r| r.column.as_str()));
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let rows: Vec<Vec<String>> = comparison_rows(cmp, clock.as_ref())
        .into_iter()
        .map(|(label, cells)| {
            let mut row = vec![html_label(label)];
            row.extend(cells);
            row
        })
        .collect();
    page.h3("Side by side");
    page.table(&headers, &rows);
    page.note(&format!(
        "Utilisation in % of the limit (100 %: the rig tips, slides or reaches the drive's rating); {}.",
        times_note(clock.as_ref())
    ));
}

/// The charts with the rigs overlaid: utilisations with the thresholds,
/// the levels one row per rig, the wind, cover and pose, tip wind by
/// direction.
fn overlaid_charts(
    page: &mut Page,
    rep: &ReplayReport,
    cmp: &Comparison,
    charts: &[RigCharts],
    first: &RigReplay,
) {
    page.h2("Charts, the rigs overlaid");
    let axis = Axis::of(rep, first, &[]);
    let ck = axis.clock.as_ref();
    let thresholds = threshold_lines(cmp, charts);
    let each = |title: &str,
                y: &str,
                what: &str,
                f: &dyn Fn(&crate::model::series::SeriesPoint) -> Option<f32>| {
        let mut c = axis.chart(title, y);
        for (i, (r, l)) in rep.rigs.iter().zip(&cmp.rigs).enumerate() {
            c.lines
                .push(rig_line(i, &l.column, what, points(&r.series, 100.0, f)));
        }
        c
    };
    let mut u = each(
        "Overturning utilisation",
        "utilisation (% of the limit)",
        "overturning",
        &|p| p.peak.overturning_utilisation,
    );
    u.hlines.clone_from(&thresholds);
    page.figure(&u.to_svg(), &format!("Overturning utilisation of each rig in % of the limit (100 %: the rig tips), with the guards' watch, park and alarm thresholds (dashed; a threshold only some rigs use names them). {}{}", axis.bucket, axis.zone_note));
    let mut pr = each(
        "Predicted utilisation at the end of a park",
        "utilisation (% of the limit)",
        "predicted",
        &|p| p.peak.predicted_utilisation,
    );
    pr.hlines = thresholds;
    page.figure(&pr.to_svg(), &format!("The overturning utilisation each guard predicts for the end of a park (the figure its park request answers to), with the thresholds. {}", axis.bucket));
    let sl = each(
        "Sliding utilisation",
        "utilisation (% of the limit)",
        "sliding",
        &|p| p.peak.sliding_utilisation,
    );
    page.figure(
        &sl.to_svg(),
        &format!(
            "Sliding utilisation of each rig in % of the limit (100 %: the feet slide). {}",
            axis.bucket
        ),
    );
    let cats: Vec<(&str, &str)> = LEVELS
        .iter()
        .map(|st| (st.name(), level_colour(*st)))
        .collect();
    let spans: Vec<Vec<Span>> = rep.rigs.iter().map(|r| level_spans(&r.series)).collect();
    let rows: Vec<(&str, &[Span])> = cmp
        .rigs
        .iter()
        .zip(&spans)
        .map(|(l, s)| (l.column.as_str(), s.as_slice()))
        .collect();
    page.figure(
        &svg::timeline_rows(
            "Level over time",
            axis.x_range,
            &rows,
            &cats,
            ck,
            &axis.x_label,
        ),
        "Each rig's guard level, one row per rig; each interval shows its most severe level.",
    );
    wind_chart(page, rep, cmp, charts, &axis);
    page.figure(
        &svg::timeline(
            "Cover (from the logs)",
            axis.x_range,
            &cover_spans(&first.series),
            &COVER_CATS,
            ck,
            &axis.x_label,
        ),
        "The weather cover as the logs give it, the same for every rig; a variant with cover=on or cover=off ignores it (its name says so).",
    );
    pose_chart(page, &first.series, axis.x_range, ck, &axis.x_label, &[]);
    polar_overlay(page, rep, cmp, charts);
}

/// True when every rig's series has the same gusts (the same anemometer
/// and heights): the wind chart then draws them once.
fn same_gusts(rigs: &[RigReplay]) -> bool {
    let gusts =
        |s: &Series| -> Vec<Option<f32>> { s.points.iter().map(|p| p.peak.gust_mps).collect() };
    rigs.first()
        .is_none_or(|a| rigs.iter().all(|r| gusts(&r.series) == gusts(&a.series)))
}

/// The gust the guards used and each rig's tip wind.
fn wind_chart(
    page: &mut Page,
    rep: &ReplayReport,
    cmp: &Comparison,
    charts: &[RigCharts],
    axis: &Axis,
) {
    let mut w = axis.chart("Gust and tip wind at rig height", "wind speed (m/s)");
    if same_gusts(&rep.rigs) {
        if let Some(r) = rep.rigs.first() {
            w.lines.push(line(
                "gust used by the guards",
                palette::INK,
                points(&r.series, 1.0, |p| p.peak.gust_mps),
            ));
        }
    } else {
        for (i, (r, l)) in rep.rigs.iter().zip(&cmp.rigs).enumerate() {
            let mut g = line(
                &format!("{}: gust used by its guard", l.column),
                palette::INK,
                points(&r.series, 1.0, |p| p.peak.gust_mps),
            );
            g.stroke = rig_style(i).2;
            w.lines.push(g);
        }
    }
    for (i, (r, l)) in rep.rigs.iter().zip(&cmp.rigs).enumerate() {
        w.lines.push(rig_line(
            i,
            &l.column,
            "tip wind",
            points(&r.series, 1.0, |p| p.peak.tip_wind_mps),
        ));
    }
    let heights: Vec<String> = cmp
        .rigs
        .iter()
        .zip(charts)
        .filter_map(|(l, c)| {
            c.wind_heights
                .map(|h| format!("{} at {:.1} m", l.column, h.rig_m))
        })
        .collect();
    page.figure(
        &w.to_svg(),
        &format!(
            "The gust the guard's figures use (ink) and each rig's tip wind, the lowest wind speed that would tip it in its pose then (where the gust meets a rig's tip wind, that rig tips). Speeds at each rig's height ({}). {}",
            if heights.is_empty() { "not known".to_owned() } else { heights.join(", ") },
            axis.bucket
        ),
    );
}

/// Tip wind by direction at each rig's closest approach to overturning,
/// overlaid.
fn polar_overlay(page: &mut Page, rep: &ReplayReport, cmp: &Comparison, charts: &[RigCharts]) {
    let clock = Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let mut traces = Vec::new();
    let mut notes = Vec::new();
    for (i, ((r, l), c)) in rep.rigs.iter().zip(&cmp.rigs).zip(charts).enumerate() {
        let (Some(pts), Some(a)) = (c.approach_tip_wind.clone(), r.overturning.as_ref()) else {
            continue;
        };
        let (colour, _, stroke) = rig_style(i);
        traces.push(PolarTrace {
            name: format!("{}: tip wind", l.column),
            colour: colour.to_owned(),
            points: pts,
            stroke,
        });
        notes.push(format!(
            "{} at {} ({}, {:.0} %)",
            l.column,
            clock
                .as_ref()
                .map_or_else(|| a.time.clone(), |c| c.local_datetime_text(a.t_s)),
            crate::model::assess::pose_words(&a.pose),
            a.utilisation * 100.0
        ));
    }
    if traces.is_empty() {
        return;
    }
    let chart = PolarChart {
        title: "Tip wind by direction at each closest approach".to_owned(),
        r_label: "tip wind (m/s)".to_owned(),
        traces,
        marker: None,
        rings: Vec::new(),
        bearings: Vec::new(),
        size: 420.0,
    };
    page.figure(
        &chart.to_svg(),
        &format!(
            "Lowest wind speed that would tip each rig, for a wind from each direction (every {POLAR_STEP_DEG}°), in the conditions of its own closest approach to overturning: {}. Open circles on the outer ring: no wind tips it from that direction.",
            notes.join("; ")
        ),
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rig_styles_stay_apart() {
        // No two of the first sixteen rigs share colour and pattern.
        let styles: Vec<(&str, Stroke)> =
            (0..16).map(|i| (rig_style(i).0, rig_style(i).2)).collect();
        for (i, a) in styles.iter().enumerate() {
            for b in styles.iter().skip(i + 1) {
                assert_ne!(a, b);
            }
        }
        // The rig colours are the palette's line colours, which its tests
        // check for colour-blind readers.
        for (c, _) in RIG_COLOURS {
            assert!(palette::SERIES.contains(&c) && c != palette::INK);
        }
    }
}
