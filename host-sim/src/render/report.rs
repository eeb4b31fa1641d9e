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

use standfast::guard::AlertLevel;

use crate::cautions::CAUTIONS;
use crate::input::error::Error;
use crate::model::assess::{pose_words, AssessReport};
use crate::model::charts::{AssessCharts, RigCharts, POLAR_STEP_DEG, TORQUE_MAP_STEP_DEG};
use crate::model::replay::{Approach, ReplayReport, RigReplay, STAGES};
use crate::model::series::{self as series, Series};
use crate::render::clock::Clock;
use crate::render::headline::{hms, thousands};
use crate::render::html::Page;
use crate::render::palette;
use crate::render::svg::{
    self, HLine, HeatMap, Line, LineChart, Mark, PolarChart, PolarMarker, PolarTrace, Span,
};

/// The report's colour of each stage ([`palette::STAGE`], in [`STAGES`]
/// order).
fn stage_colour(s: AlertLevel) -> &'static str {
    palette::STAGE
        .get(stage_cat(s))
        .copied()
        .unwrap_or(palette::INK)
}

fn stage_cat(s: AlertLevel) -> usize {
    STAGES.iter().position(|x| *x == s).unwrap_or(0)
}

fn opt(v: Option<f32>, unit: &str, digits: usize) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{x:.digits$} {unit}"))
}

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
        opt(a.gust_mps, "m/s", 1),
        opt(a.wind_from_deg, "°", 0),
        pose_words(&a.pose),
        opt(a.tilt_deg, "°", 2),
        opt(a.tip_wind_mps, "m/s", 1),
        a.stage.name().to_owned(),
    ]
}

/// The chart points of one figure of the series, scaled by `k`: one per
/// bucket, and a break (`None`) wherever buckets are missing (no record in
/// that interval), so a gap in the logs is drawn as a gap.
fn points(
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

fn line(name: &str, colour: &str, pts: Vec<(f64, Option<f64>)>) -> Line {
    Line {
        name: name.to_owned(),
        colour: colour.to_owned(),
        points: pts,
        dashed: false,
        dots: false,
    }
}

/// `pts` with a break in the middle of each gap, so no line bridges one.
fn with_gaps(mut pts: Vec<(f64, Option<f64>)>, gaps: &[(f64, f64)]) -> Vec<(f64, Option<f64>)> {
    pts.extend(gaps.iter().map(|&(a, b)| (f64::midpoint(a, b), None)));
    pts.sort_by(|p, q| p.0.total_cmp(&q.0));
    pts
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

/// One event of a rig (a stage change or a fault) for the charts and the
/// event table: its number is its place in time order, from 1.
struct NightEvent {
    t_s: f64,
    utc: String,
    what: String,
    colour: &'static str,
}

fn night_events(r: &RigReplay) -> Vec<NightEvent> {
    let mut m: Vec<NightEvent> = r
        .stage_changes
        .iter()
        .map(|c| NightEvent {
            t_s: c.t_s,
            utc: c.time.clone(),
            what: format!("{} → {} ({})", c.from.name(), c.to.name(), c.cause),
            colour: stage_colour(c.to),
        })
        .collect();
    m.extend(r.faults.iter().map(|f| NightEvent {
        t_s: f.t_s,
        utc: f.time.clone(),
        what: format!("fault: {}", f.fault),
        colour: stage_colour(AlertLevel::SensorFault),
    }));
    m.sort_by(|a, b| a.t_s.total_cmp(&b.t_s));
    m
}

fn event_marks(events: &[NightEvent]) -> Vec<Mark> {
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

fn stage_spans(s: &Series) -> Vec<Span> {
    let mut out: Vec<Span> = Vec::new();
    for (i, p) in s.points.iter().enumerate() {
        let end = s
            .points
            .get(i + 1)
            .map_or(p.t_last_s.max(p.t_start_s + s.width_s), |q| q.t_start_s);
        let cat = stage_cat(p.stage);
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
struct Axis {
    x_range: (f64, f64),
    x_label: String,
    zone_note: String,
    clock: Option<Clock>,
    marks: Vec<Mark>,
    bucket: String,
}

impl Axis {
    fn of(rep: &ReplayReport, r: &RigReplay, events: &[NightEvent]) -> Axis {
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
    fn chart(&self, title: &str, y: &str) -> LineChart {
        let mut c = LineChart::new(title, &self.x_label, y);
        c.x_range = self.x_range;
        c.clock = self.clock;
        c
    }
}

/// One rig's section of the replay report: closest approaches, charts,
/// the numbered events, stage times, stage changes and faults.
fn rig_section(page: &mut Page, rep: &ReplayReport, r: &RigReplay, charts: Option<&RigCharts>) {
    page.h2(&format!("Rig {}", r.rig_file));
    page.p(&format!(
        "Highest stage {}, final stage {}.",
        r.highest_stage.name(),
        r.final_stage.name()
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
            "stage",
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
        points(&r.series, 1.0, |p| p.tilt_max_deg),
    ));
    t.marks.clone_from(&axis.marks);
    page.figure(
        &t.to_svg(),
        &format!("Tilt of the rig from the vertical. {}", axis.bucket),
    );
    polar_chart(page, r, charts);
    stage_tables(page, rep, r);
}

/// (a) Utilisation over time with the guard's thresholds and the numbered
/// events, and the stage timeline.
fn utilisation_charts(page: &mut Page, r: &RigReplay, charts: Option<&RigCharts>, axis: &Axis) {
    let s = &r.series;
    let mut u = axis.chart("Utilisation over time", "utilisation (% of the limit)");
    u.lines.push(line(
        "overturning",
        palette::BLUE,
        points(s, 100.0, |p| p.overturning_max),
    ));
    let mut pred = line(
        "predicted (end of park)",
        palette::PINK,
        points(s, 100.0, |p| p.predicted_max),
    );
    pred.dashed = true;
    u.lines.push(pred);
    u.lines.push(line(
        "sliding",
        palette::AMBER,
        points(s, 100.0, |p| p.sliding_max),
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
    let cats: Vec<(&str, &str)> = STAGES
        .iter()
        .map(|st| (st.name(), stage_colour(*st)))
        .collect();
    page.figure(
        &svg::timeline(
            "Stage over time",
            axis.x_range,
            &stage_spans(s),
            &cats,
            axis.clock.as_ref(),
            &axis.x_label,
        ),
        "The guard's stage; each interval shows its most severe stage.",
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
        points(s, 1.0, |p| p.gust_max_mps),
    ));
    let mut tip = line(
        "tip wind (lowest)",
        palette::PINK,
        points(s, 1.0, |p| p.tip_wind_min_mps),
    );
    tip.dashed = true;
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
        points(s, 1.0, |p| p.wind_from_deg),
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
        }],
        marker: match (a.wind_from_deg, a.gust_mps) {
            (Some(dir), Some(g)) => Some(PolarMarker {
                deg: f64::from(dir),
                value: f64::from(g),
                label: format!("gust {g:.1} m/s"),
            }),
            _ => None,
        },
        size: 420.0,
    };
    page.figure(
        &chart.to_svg(),
        &format!(
            "Lowest wind speed that would tip the rig, for a wind from each direction (every {POLAR_STEP_DEG}°), in the pose of the closest approach ({}), tilt {}, cover {}. The dot is the gust there. Open circles on the outer ring: no wind tips it from that direction.",
            pose_words(&a.pose),
            match (a.tilt_deg, a.tilt_downhill_deg) {
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
    let cats = [
        ("cover off", palette::PALE_BLUE),
        ("cover fitted", palette::BLUE),
        ("not known", "#d9dde2"),
    ];
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
    page.figure(
        &svg::timeline("Cover", x_range, &spans, &cats, clock, x_label),
        "The weather cover from the logs: an interval is shown fitted when the cover was fitted at any moment in it. A fitted cover adds mass and catches wind, so it changes the tip wind.",
    );
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
        &format!("The pose the guard's figures are for ({what}) at the end of each interval, with the numbered events; a park shows as the move to the park pose."),
    );
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

/// Time per stage, stage changes and sensor faults, as tables.
fn stage_tables(page: &mut Page, rep: &ReplayReport, r: &RigReplay) {
    page.h3("Time per stage");
    let rows: Vec<Vec<String>> = r
        .stage_time
        .iter()
        .map(|t| {
            vec![
                t.stage.name().to_owned(),
                format!("{:.0} s", t.seconds),
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
    page.table(&["stage", "time", "share"], &rows);
    page.h3(&format!("Stage changes ({})", r.stage_changes.len()));
    let rows: Vec<Vec<String>> = r
        .stage_changes
        .iter()
        .map(|c| {
            vec![
                c.time.clone(),
                format!("+{:.0} s", c.t_s),
                c.from.name().to_owned(),
                c.to.name().to_owned(),
                c.cause.clone(),
            ]
        })
        .collect();
    page.table(&["time", "since start", "from", "to", "cause"], &rows);
    if r.stage_changes_not_kept > 0 {
        page.note(&format!(
            "… and {} more not kept.",
            r.stage_changes_not_kept
        ));
    }
    page.h3(&format!("Sensor faults ({})", r.faults.len()));
    let rows: Vec<Vec<String>> = r
        .faults
        .iter()
        .map(|f| vec![f.time.clone(), format!("+{:.0} s", f.t_s), f.fault.clone()])
        .collect();
    page.table(&["time", "since start", "fault"], &rows);
    if r.faults_not_kept > 0 {
        page.note(&format!("… and {} more not kept.", r.faults_not_kept));
    }
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
    page.p(&format!(
        "Replayed {} merged records ({} log rows) from {} to {} ({}).",
        thousands(rep.records),
        thousands(rep.rows),
        rep.start.as_deref().unwrap_or("-"),
        rep.end.as_deref().unwrap_or("-"),
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
    for (i, r) in rep.rigs.iter().enumerate() {
        rig_section(&mut page, rep, r, charts.get(i));
    }
    page.note("Standfast replay report; all charts are drawn from the replay above.");
    page.cautions(CAUTIONS);
    page.finish()
}

/// The assessment report as a self-contained HTML page: tip wind by
/// direction in the home pose and in the worst pose of the sky scan (cover
/// off, level), the axis-torque maps, the text sections and the cautions.
///
/// `charts` are the assessment's chart data
/// ([`crate::model::charts::assess_charts`]).
///
/// # Errors
/// [`Error::Io`] when the text of the assessment cannot be formatted.
pub fn assess_html(rep: &AssessReport, charts: &AssessCharts) -> Result<String, Error> {
    let mut page = Page::new(&format!("Standfast assessment of {}", rep.file));
    page.cautions(&rep.cautions);
    page.h2("Tip wind speed by direction");
    let k = &rep.condition;
    let chart = PolarChart {
        title: "Tip wind speed by direction".to_owned(),
        r_label: "tip wind (m/s)".to_owned(),
        traces: vec![
            PolarTrace {
                name: "home pose".to_owned(),
                colour: palette::BLUE.to_owned(),
                points: charts.home.clone(),
            },
            PolarTrace {
                name: "worst pose of the sky".to_owned(),
                colour: palette::PINK.to_owned(),
                points: charts.worst.clone(),
            },
            PolarTrace {
                name: "assessed condition".to_owned(),
                colour: palette::AMBER.to_owned(),
                points: charts.condition.clone(),
            },
        ],
        marker: rep.sky.tip.tip_wind_mps.map(|v| PolarMarker {
            deg: f64::from(rep.sky.tip.from_rad.to_degrees()),
            value: f64::from(v),
            label: format!("lowest {v:.1} m/s"),
        }),
        size: 440.0,
    };
    page.figure(
        &chart.to_svg(),
        &format!(
            "Lowest wind speed that tips the rig, for a wind from each direction (every {POLAR_STEP_DEG}°), level ground, cover off: in the home pose ({}) and in the worst pose of the sky scan ({}); and in the assessed condition ({}, {}, cover {}). Open circles on the outer ring: no wind tips it from that direction.",
            pose_words(&charts.home_pose),
            pose_words(&rep.sky.tip.pose),
            k.pose,
            if k.tilt_deg > 0.0 {
                format!("ground tilt {:.1}° downhill toward {:.0}°", k.tilt_deg, k.downhill_deg)
            } else {
                "level ground".to_owned()
            },
            if k.cover_fitted { "fitted" } else { "off" }
        ),
    );
    page.h2("Axis torque over the sky");
    let (maps, rated) = (charts.torque.clone(), charts.rated);
    let step = TORQUE_MAP_STEP_DEG;
    let x_labels: Vec<String> = (-180 / step..=180 / step)
        .map(|k| format!("{:+}", k * step / 15))
        .collect();
    let y_labels: Vec<String> = (0..=180 / step)
        .map(|k| format!("{:+}°", 90 - k * step))
        .collect();
    for (axis, m) in ["primary", "secondary"].iter().zip(maps) {
        if m.iter().flatten().all(Option::is_none) {
            page.note(&format!(
                "No {axis}-axis map: the mount does not take hour angle and declination poses."
            ));
            continue;
        }
        let hm = HeatMap {
            title: format!(
                "{axis} axis: |gravity torque| ÷ {}",
                if rated {
                    "rated torque"
                } else {
                    "largest on the map"
                }
            ),
            x_label: "hour angle (h)".to_owned(),
            y_label: "declination".to_owned(),
            x_labels: x_labels.clone(),
            y_labels: y_labels.clone(),
            values: m,
            value_label: "utilisation".to_owned(),
        };
        page.figure(
            &hm.to_svg(),
            &format!(
                "Gravity torque on the {axis} axis every {step}° of hour angle and declination, calm, level, cover off, on the usual pier side (tube east at hour angles ≥ 0, tube west below), {}.",
                if rated {
                    "in % of the drive's rated torque (over 100 %: beyond the rating)"
                } else {
                    "in % of the largest on the map (the rig file gives no drive ratings)"
                }
            ),
        );
    }
    page.h2("Assessment");
    let mut text = Vec::new();
    crate::render::assess::write_text(rep, &mut text).map_err(|x| Error::io("<report>", x))?;
    page.pre(&String::from_utf8_lossy(&text));
    page.cautions(&rep.cautions);
    Ok(page.finish())
}
