//! Self-contained HTML reports with SVG charts, for a replay
//! ([`replay_html`]) and for a static assessment ([`assess_html`]).
//!
//! Everything is inline (CSS and SVG); the page loads nothing and runs no
//! script, so it opens anywhere without a network. The charts are drawn by
//! the small writer in [`svg`]; the replay's time series comes from the
//! bounded collector in [`crate::model::series`], the polar and torque data
//! from [`crate::model::charts`]. Units on the page: utilisation as a
//! fraction (1.0 is the limit), speeds m/s, angles degrees (wind directions
//! are where the wind blows FROM, clockwise from north), time as h:mm since
//! the first record.

use standfast::guard::Stage;

use crate::cautions::CAUTIONS;
use crate::input::error::Error;
use crate::model::assess::{pose_words, AssessReport};
use crate::model::charts::{AssessCharts, RigCharts, POLAR_STEP_DEG, TORQUE_MAP_STEP_DEG};
use crate::model::replay::{Approach, ReplayReport, RigReplay, STAGES};
use crate::model::series::Series;
use crate::render::html::Page;
use crate::render::svg::{
    self, HLine, HeatMap, Line, LineChart, Mark, PolarChart, PolarMarker, PolarTrace, Span,
};

/// The report's colour of each stage (in [`STAGES`] order).
fn stage_colour(s: Stage) -> &'static str {
    match s {
        Stage::Clear => "#9bcf9b",
        Stage::Watch => "#e2bd3a",
        Stage::ParkNow => "#e58a2e",
        Stage::Alarm => "#c8372d",
        Stage::SensorFault => "#7b7f9e",
    }
}

fn stage_cat(s: Stage) -> usize {
    STAGES.iter().position(|x| *x == s).unwrap_or(0)
}

fn opt(v: Option<f32>, unit: &str, digits: usize) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{x:.digits$} {unit}"))
}

fn approach_row(label: &str, a: Option<&Approach>) -> Vec<String> {
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
        format!("{} (+{:.0} s)", a.time, a.t_s),
        opt(a.gust_mps, "m/s", 1),
        opt(a.wind_from_deg, "°", 0),
        pose_words(&a.pose),
        opt(a.tilt_deg, "°", 2),
        opt(a.tip_wind_mps, "m/s", 1),
        a.stage.name().to_owned(),
    ]
}

fn points(
    s: &Series,
    f: impl Fn(&crate::model::series::SeriesPoint) -> Option<f32>,
) -> Vec<(f64, Option<f64>)> {
    s.points
        .iter()
        .map(|p| ((p.t_start_s + p.t_last_s) / 2.0, f(p).map(f64::from)))
        .collect()
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

fn event_marks(r: &RigReplay) -> Vec<Mark> {
    let mut m: Vec<Mark> = r
        .stage_changes
        .iter()
        .map(|c| Mark {
            x: c.t_s,
            label: format!("{} → {}", c.from.name(), c.to.name()),
            colour: stage_colour(c.to).to_owned(),
        })
        .collect();
    m.extend(r.faults.iter().map(|f| Mark {
        x: f.t_s,
        label: format!("fault: {}", f.fault),
        colour: stage_colour(Stage::SensorFault).to_owned(),
    }));
    m.sort_by(|a, b| a.x.total_cmp(&b.x));
    m
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

/// One rig's section of the replay report: closest approaches, charts,
/// stage times, stage changes and faults.
fn rig_section(page: &mut Page, rep: &ReplayReport, r: &RigReplay, charts: Option<&RigCharts>) {
    page.h2(&format!("Rig {}", r.rig_file));
    page.p(&format!(
        "Highest stage {}, final stage {}.",
        r.highest_stage.name(),
        r.final_stage.name()
    ));
    page.h3("Closest approach");
    let mut rows = vec![
        approach_row("overturning", r.overturning.as_ref()),
        approach_row("sliding", r.sliding.as_ref()),
    ];
    for (i, d) in r.drive.iter().enumerate() {
        if d.is_some() {
            rows.push(approach_row(&format!("drive axis {}", i + 1), d.as_ref()));
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

    utilisation_charts(page, rep, r, charts);
    wind_and_tilt_charts(page, rep, r);
    polar_chart(page, r, charts);
    stage_tables(page, rep, r);
}

/// The time axis of a rig's charts (s since the first record) and the
/// sentence saying what a point stands for.
fn time_axis(rep: &ReplayReport, r: &RigReplay) -> ((f64, f64), String) {
    let s = &r.series;
    (
        (0.0, rep.duration_s.max(s.width_s)),
        format!(
            "Each point is the highest value (mean for the mean wind) over {:.0} s of log.",
            s.width_s
        ),
    )
}

/// (a) Utilisation over time with the guard's thresholds, and the stage
/// timeline.
fn utilisation_charts(
    page: &mut Page,
    rep: &ReplayReport,
    r: &RigReplay,
    charts: Option<&RigCharts>,
) {
    let s = &r.series;
    let (x_range, bucket) = time_axis(rep, r);
    // (a) Utilisation with the guard thresholds and the event marks.
    let mut u = LineChart::new(
        "Utilisation over time",
        "time since the first record (h:mm)",
        "utilisation (1 = limit)",
    );
    u.x_range = x_range;
    u.lines.push(line(
        "overturning",
        "#1f5fa8",
        points(s, |p| p.overturning_max),
    ));
    let mut pred = line(
        "predicted (end of park)",
        "#7a4fb0",
        points(s, |p| p.predicted_max),
    );
    pred.dashed = true;
    u.lines.push(pred);
    u.lines
        .push(line("sliding", "#2a9d8f", points(s, |p| p.sliding_max)));
    if let Some([watch, park, alarm]) = charts.and_then(|c| c.thresholds) {
        for (value, label, colour) in [
            (watch, "watch", "#b8901a"),
            (park, "park", "#d06a10"),
            (alarm, "alarm", "#b5321f"),
        ] {
            u.hlines.push(HLine {
                value: f64::from(value),
                label: format!("{label} {value:.2}"),
                colour: colour.to_owned(),
            });
        }
    }
    u.marks = event_marks(r);
    page.figure(
        &u.to_svg(),
        &format!("Overturning, predicted and sliding utilisation with the guard's watch, park and alarm thresholds (dashed) and the stage changes and faults (vertical lines). {bucket}"),
    );
    // Stage timeline.
    let cats: Vec<(&str, &str)> = STAGES
        .iter()
        .map(|st| (st.name(), stage_colour(*st)))
        .collect();
    page.figure(
        &svg::timeline("Stage over time", x_range, &stage_spans(s), &cats),
        "The guard's stage; each interval shows its most severe stage.",
    );
}

/// (b) Wind speed and direction, (c) tilt, over time.
fn wind_and_tilt_charts(page: &mut Page, rep: &ReplayReport, r: &RigReplay) {
    let s = &r.series;
    let (x_range, bucket) = time_axis(rep, r);
    // (b) Wind speed and direction.
    let mut w = LineChart::new(
        "Wind speed",
        "time since the first record (h:mm)",
        "wind speed (m/s)",
    );
    w.x_range = x_range;
    w.lines.push(line(
        "highest sample",
        "#d69e2e",
        points(s, |p| p.wind_max_mps),
    ));
    w.lines.push(line(
        "gust used by the guard",
        "#c05621",
        points(s, |p| p.gust_max_mps),
    ));
    w.lines.push(line(
        "mean wind",
        "#2b6cb0",
        points(s, crate::model::series::SeriesPoint::wind_mean_mps),
    ));
    w.marks = event_marks(r);
    page.figure(&w.to_svg(), &format!("Wind speed: the anemometer's highest sample and mean, and the gust the guard's figures use (its peak estimate over its window). {bucket}"));
    let mut d = LineChart::new(
        "Wind direction",
        "time since the first record (h:mm)",
        "from (degrees)",
    );
    d.x_range = x_range;
    d.y_range = Some((0.0, 360.0));
    d.y_step = Some(90.0);
    let mut dl = line(
        "direction at the highest gust",
        "#4a5568",
        points(s, |p| p.wind_from_deg),
    );
    dl.dots = true;
    d.lines.push(dl);
    page.figure(
        &d.to_svg(),
        "Direction the wind blows from (0° north, 90° east), at each interval's highest gust.",
    );
    // (c) Tilt.
    let mut t = LineChart::new(
        "Ground tilt",
        "time since the first record (h:mm)",
        "tilt (degrees)",
    );
    t.x_range = x_range;
    t.lines.push(line(
        "tilt (highest)",
        "#6b46c1",
        points(s, |p| p.tilt_max_deg),
    ));
    t.marks = event_marks(r);
    page.figure(
        &t.to_svg(),
        &format!("Tilt of the rig from the vertical. {bucket}"),
    );
}

/// (d) Tip wind by direction at the closest approach to overturning.
fn polar_chart(page: &mut Page, r: &RigReplay, charts: Option<&RigCharts>) {
    let s = &r.series;
    // (d) Polar chart at the closest approach.
    if let (Some(pts), Some(a)) = (
        charts.and_then(|c| c.approach_tip_wind.clone()),
        r.overturning.as_ref(),
    ) {
        let chart = PolarChart {
            title: "Tip wind speed by direction at the closest approach".to_owned(),
            r_label: "tip wind (m/s)".to_owned(),
            traces: vec![PolarTrace {
                name: "tip wind".to_owned(),
                colour: "#1f5fa8".to_owned(),
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
    page.cautions(CAUTIONS);
    page.h2("Summary");
    page.p(&format!(
        "Replayed {} merged records ({} log rows) from {} to {} ({:.0} s).",
        rep.records,
        rep.rows,
        rep.start.as_deref().unwrap_or("-"),
        rep.end.as_deref().unwrap_or("-"),
        rep.duration_s
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
                colour: "#1f5fa8".to_owned(),
                points: charts.home.clone(),
            },
            PolarTrace {
                name: "worst pose of the sky".to_owned(),
                colour: "#c05621".to_owned(),
                points: charts.worst.clone(),
            },
            PolarTrace {
                name: "assessed condition".to_owned(),
                colour: "#2f855a".to_owned(),
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
                    "as a fraction of the drive's rated torque (over 1: beyond the rating)"
                } else {
                    "as a fraction of the largest on the map (the rig file gives no drive ratings)"
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
