//! The HTML reports: the SVG writer's axes and polar geometry, the bounded
//! time series of a replay, and the replay and assessment pages (parsed as
//! XML, charts counted, self-contained).

use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::process::Command;

use standfast::rig::Conditions;
use standfast_sim::commands::replay::ReplayOutputs;
use standfast_sim::input::log::{ErrorPolicy, LogProfile, Merger};
use standfast_sim::input::rigfile::{self, LoadedRig};
use standfast_sim::model::charts::{
    self, approach_conditions, assess_charts, replay_charts, tip_wind_by_direction,
};
use standfast_sim::model::replay::{replay, ReplayOptions, ReplayReport};
use standfast_sim::model::series::MAX_SERIES_POINTS;
use standfast_sim::render::report;
use standfast_sim::render::svg::{nice_step, polar_xy, ticks, time_step_s};

fn demo_rig() -> LoadedRig {
    rigfile::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")).unwrap()
}

/// Length of the invented log, seconds (1 Hz).
const LOG_S: u32 = 3 * 3600;

/// Invented wind: 3 m/s rising to 15 m/s at mid-log and back, with a
/// ripple.
fn wind_at(t: u32) -> f64 {
    let x = f64::from(t) / f64::from(LOG_S);
    3.0 + 12.0 * (std::f64::consts::PI * x).sin().powi(2) + 0.5 * (f64::from(t) * 0.37).sin()
}

/// Invented direction from the south-west, veering a few degrees (a frozen
/// vane is a stuck-sensor fault by the guard's default).
fn dir_at(t: u32) -> u32 {
    220 + (t % 7)
}

/// Writes a 1 Hz pre-merged log and its profile; a level rig (accelerometer
/// +1 g on z, with a little noise as a real sensor has).
fn invented_log(dir: &Path) -> PathBuf {
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for t in 0..LOG_S {
        writeln!(
            csv,
            "{},{},0,1,{:.3},{}",
            1_700_000_000 + u64::from(t),
            f64::from(t % 3) * 1e-4,
            wind_at(t),
            dir_at(t)
        )
        .unwrap();
    }
    std::fs::write(dir.join("night.csv"), csv).unwrap();
    crate::common::one_file_profile(dir, "night")
}

fn run(profile: &Path, rig: &LoadedRig, verdicts: &Path) -> ReplayReport {
    let p = LogProfile::load(profile).unwrap();
    let mut m = Merger::open(&p, ErrorPolicy::Stop).unwrap();
    let mut f = std::io::BufWriter::new(std::fs::File::create(verdicts).unwrap());
    replay(
        std::slice::from_ref(rig),
        &mut m,
        ReplayOptions { verdicts_every: 1 },
        Some(&mut ReplayOutputs::new(Some((&mut f, "verdicts"))).unwrap()),
    )
    .unwrap()
}

#[test]
fn axis_ticks_follow_the_one_two_five_sequence() {
    // Heckbert, "Nice numbers for graph labels", Graphics Gems (1990): tick
    // spacing 1, 2 or 5 times a power of ten (from memory).
    assert!((nice_step(1.0, 5) - 0.2).abs() < 1e-12);
    assert!((nice_step(87.0, 5) - 20.0).abs() < 1e-12);
    assert!((nice_step(0.03, 5) - 0.005).abs() < 1e-15);
    assert!((nice_step(700.0, 5) - 100.0).abs() < 1e-9);
    let t = ticks(0.0, 1.0, 5);
    assert_eq!(t.len(), 6, "{t:?}");
    for (k, v) in t.iter().enumerate() {
        assert!((v - 0.2 * k as f64).abs() < 1e-12, "{t:?}");
    }
    // Clock steps: 60 s to the minute, 3600 s to the hour (SI brochure,
    // non-SI units accepted for use with the SI, table 8).
    assert!((time_step_s(9.0 * 3600.0, 8) - 7200.0).abs() < 1e-9);
    assert!((time_step_s(600.0, 8) - 120.0).abs() < 1e-9);
}

#[test]
fn polar_points_follow_the_compass() {
    // Compass bearings: north up, angles clockwise, so east is to the right
    // and south down on a page whose y grows downward (common practice, no
    // source).
    let (cx, cy, r) = (100.0, 100.0, 50.0);
    let close = |a: (f64, f64), b: (f64, f64)| (a.0 - b.0).abs() < 1e-9 && (a.1 - b.1).abs() < 1e-9;
    assert!(close(polar_xy(cx, cy, 0.0, r), (100.0, 50.0)));
    assert!(close(polar_xy(cx, cy, 90.0, r), (150.0, 100.0)));
    assert!(close(polar_xy(cx, cy, 180.0, r), (100.0, 150.0)));
    assert!(close(polar_xy(cx, cy, 270.0, r), (50.0, 100.0)));
    // 30°: (r sin 30°, −r cos 30°) = (25, −43.30) from the centre.
    assert!(close(
        polar_xy(cx, cy, 30.0, r),
        (125.0, 100.0 - 50.0 * 3f64.sqrt() / 2.0)
    ));
}

/// Values of one verdict CSV column by name, with `t_s`.
fn column(csv: &str, name: &str) -> Vec<(f64, Option<f64>)> {
    let mut lines = csv.lines();
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    let it = head.iter().position(|h| *h == "t_s").unwrap();
    let ic = head.iter().position(|h| *h == name).unwrap();
    lines
        .map(|l| {
            let f: Vec<&str> = l.split(',').collect();
            (f[it].parse().unwrap(), f[ic].parse().ok())
        })
        .collect()
}

#[test]
fn series_stays_bounded_and_keeps_each_interval_maximum() {
    let dir = tempfile::tempdir().unwrap();
    let profile = invented_log(dir.path());
    let rig = demo_rig();
    let vpath = dir.path().join("v.csv");
    let rep = run(&profile, &rig, &vpath);
    let s = &rep.rigs[0].series;
    // Buckets double from 1 s until 10 800 s fit in 2000 of them: 1, 2, 4,
    // 8 s (derived: 10 800 / 4 = 2700 > 2000, 10 800 / 8 = 1350).
    assert!(s.points.len() <= MAX_SERIES_POINTS);
    assert!((s.width_s - 8.0).abs() < 1e-12, "{}", s.width_s);
    assert_eq!(s.points.len(), 1350);
    let records: u32 = s.points.iter().map(|p| p.records).sum();
    assert_eq!(u64::from(records), rep.records);
    // Each bucket's highest overturning utilisation and mean wind, computed
    // again here from the verdict CSV (4 decimals) and the invented log.
    let csv = std::fs::read_to_string(&vpath).unwrap();
    let over = column(&csv, "overturning_utilisation");
    for p in &s.points {
        let t1 = p.t_start_s + s.width_s;
        let inside = |t: f64| t >= p.t_start_s && t < t1;
        let top = over
            .iter()
            .filter(|(t, _)| inside(*t))
            .filter_map(|(_, v)| *v)
            .fold(None, |a: Option<f64>, v| Some(a.map_or(v, |a| a.max(v))));
        match (top, p.peak.overturning_utilisation) {
            (Some(a), Some(b)) => assert!(
                (a - f64::from(b)).abs() < 1e-4,
                "{a} {b} at {}",
                p.t_start_s
            ),
            (None, None) => {}
            other => panic!("{other:?} at {}", p.t_start_s),
        }
        let winds: Vec<f64> = (0..LOG_S)
            .filter(|t| inside(f64::from(*t)))
            .map(|t| (wind_at(t) * 1000.0).round() / 1000.0)
            .collect();
        let mean = winds.iter().sum::<f64>() / winds.len() as f64;
        let got = f64::from(p.wind_mean_mps().unwrap());
        assert!((mean - got).abs() < 1e-3, "{mean} {got}");
        let hi = winds.iter().copied().fold(f64::MIN, f64::max);
        assert!((hi - f64::from(p.wind_max_mps.unwrap())).abs() < 1e-3);
    }
    // The series' top equals the summary's closest approach.
    let top = s
        .points
        .iter()
        .filter_map(|p| p.peak.overturning_utilisation)
        .fold(f32::MIN, f32::max);
    assert_eq!(top, rep.rigs[0].overturning.as_ref().unwrap().utilisation);
}

fn parse(html: &str) -> roxmltree::Document<'_> {
    roxmltree::Document::parse_with_options(
        html,
        roxmltree::ParsingOptions {
            allow_dtd: true,
            ..roxmltree::ParsingOptions::default()
        },
    )
    .unwrap_or_else(|e| panic!("not well-formed: {e}"))
}

fn class_is(n: &roxmltree::Node<'_, '_>, c: &str) -> bool {
    n.attribute("class")
        .is_some_and(|a| a.split_whitespace().any(|x| x == c))
}

fn texts(doc: &roxmltree::Document<'_>, class: &str) -> Vec<String> {
    doc.descendants()
        .filter(|n| n.has_tag_name("text") && class_is(n, class))
        .map(|n| n.text().unwrap_or("").to_owned())
        .collect()
}

/// The items of the page's caution boxes, in order.
fn cautions(doc: &roxmltree::Document<'_>) -> Vec<String> {
    doc.descendants()
        .filter(|n| n.has_tag_name("section") && class_is(n, "cautions"))
        .flat_map(|s| s.descendants().filter(|n| n.has_tag_name("li")))
        .map(|n| n.text().unwrap_or("").to_owned())
        .collect()
}

/// A page loads nothing from outside and runs no script.
fn assert_self_contained(html: &str, doc: &roxmltree::Document<'_>) {
    assert!(!html.contains("http://") && !html.contains("https://"));
    for n in doc.descendants().filter(roxmltree::Node::is_element) {
        assert!(!n.has_tag_name("script") && !n.has_tag_name("link") && !n.has_tag_name("img"));
        assert!(n.attribute("src").is_none() && n.attribute("href").is_none());
    }
    // `url(#id)` names a gradient on the page itself; nothing else.
    assert!(
        html.match_indices("url(")
            .all(|(i, _)| html[i + 4..].starts_with('#')),
        "no CSS resource"
    );
}

/// Vertices of a polygon's `points` attribute.
fn vertices(n: &roxmltree::Node<'_, '_>) -> Vec<(f64, f64)> {
    n.attribute("points")
        .unwrap()
        .split_whitespace()
        .map(|p| {
            let (x, y) = p.split_once(',').unwrap();
            (x.parse().unwrap(), y.parse().unwrap())
        })
        .collect()
}

/// The centre of a polar chart: where its spokes start.
fn centre(svg: &roxmltree::Node<'_, '_>) -> (f64, f64) {
    let s = svg
        .descendants()
        .find(|n| n.has_tag_name("line") && class_is(n, "spoke"))
        .unwrap();
    (
        s.attribute("x1").unwrap().parse().unwrap(),
        s.attribute("y1").unwrap().parse().unwrap(),
    )
}

#[test]
fn replay_report_is_well_formed_and_holds_its_charts() {
    let dir = tempfile::tempdir().unwrap();
    let profile = invented_log(dir.path());
    let rig = demo_rig();
    let rep = run(&profile, &rig, &dir.path().join("v.csv"));
    let html = report::replay_html(
        &rep,
        &replay_charts(&rep, std::slice::from_ref(&rig)).unwrap(),
    );
    let doc = parse(&html);
    assert_self_contained(&html, &doc);
    let svgs: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("svg"))
        .collect();
    // Utilisation, level timeline, cover, pose, wind speed, wind direction,
    // tilt, polar.
    assert_eq!(svgs.len(), 8);
    assert_eq!(html.matches("<svg").count(), 8);
    let axis = texts(&doc, "axis-label");
    for l in [
        "utilisation (% of the limit)",
        "wind speed (m/s)",
        "from (degrees)",
        "tilt (degrees)",
        // The invented log writes UTC times without an offset.
        "time (UTC, hh:mm)",
    ] {
        assert!(axis.iter().any(|a| a == l), "{l} missing in {axis:?}");
    }
    // The guard's three thresholds, at the rig file's values, in % like
    // the axis and the tables.
    let th: Vec<f64> = doc
        .descendants()
        .filter(|n| n.has_tag_name("line") && class_is(n, "threshold"))
        .map(|n| n.attribute("data-value").unwrap().parse().unwrap())
        .collect();
    let g = &rig.guard;
    for v in [g.watch_utilisation, g.park_utilisation, g.alarm_utilisation] {
        assert!(
            th.iter().any(|t| (t - f64::from(v) * 100.0).abs() < 1e-4),
            "{v} in {th:?}"
        );
    }
    // This wind rises past the watch threshold: level changes are marked.
    let r = &rep.rigs[0];
    assert!(!r.level_changes.is_empty());
    let marks = doc
        .descendants()
        .filter(|n| n.has_tag_name("line") && class_is(n, "event-mark"))
        .count();
    // Marked on the utilisation, pose, wind speed and tilt charts.
    let n_events = r.level_changes.len() + r.faults.len();
    assert_eq!(marks, 4 * n_events);
    // Each chart names every event by its number in the strip above the
    // plot (close events share a label such as "2–4"), and the page lists
    // the numbers once in the event table.
    for svg in svgs.iter().filter(|s| {
        s.descendants()
            .any(|n| n.has_tag_name("line") && class_is(&n, "event-mark"))
    }) {
        let mut named: Vec<usize> = svg
            .descendants()
            .filter(|n| n.has_tag_name("text") && class_is(n, "mark-label"))
            .flat_map(|n| {
                n.attribute("data-events")
                    .unwrap()
                    .split(' ')
                    .map(|x| x.parse::<usize>().unwrap())
                    .collect::<Vec<_>>()
            })
            .collect();
        named.sort_unstable();
        assert_eq!(named, (1..=n_events).collect::<Vec<_>>());
    }
    assert!(html.contains(&format!("Events on the charts ({n_events})")));
    // The tip wind is drawn with the gusts.
    assert!(html.contains("<title>tip wind (lowest)</title>"));
    // The polar chart: 72 directions every 5°, north first, radii in
    // proportion to the tip wind speeds from the core's assessment at the
    // closest approach.
    let polar = svgs.iter().find(|n| class_is(n, "polar-chart")).unwrap();
    let trace = polar
        .descendants()
        .find(|n| n.has_tag_name("polygon"))
        .unwrap();
    assert_eq!(trace.attribute("data-points"), Some("72"));
    let v = vertices(&trace);
    assert_eq!(v.len(), 72);
    let (cx, cy) = centre(polar);
    let a = r.overturning.as_ref().unwrap();
    let c: Conditions = approach_conditions(&rig, a, r.series.cover_at_closest).unwrap();
    let mut tips = Vec::new();
    for k in 0..72_u8 {
        let mut cc = c;
        cc.wind_from_rad = (f32::from(k) * 5.0).to_radians();
        tips.push(f64::from(
            rig.rig
                .stability_figures(&cc)
                .unwrap()
                .tip_wind_mps
                .unwrap(),
        ));
    }
    assert_eq!(
        tips,
        tip_wind_by_direction(&rig.rig, &c)
            .unwrap()
            .iter()
            .map(|p| p.1.unwrap())
            .collect::<Vec<_>>()
    );
    assert!((v[0].0 - cx).abs() < 0.02 && v[0].1 < cy, "north up");
    assert!((v[18].1 - cy).abs() < 0.02 && v[18].0 > cx, "east right");
    let radius = |p: (f64, f64)| (p.0 - cx).hypot(p.1 - cy);
    for k in 0..72 {
        let ratio = radius(v[k]) / radius(v[0]);
        assert!((ratio - tips[k] / tips[0]).abs() < 2e-3, "{k}: {ratio}");
    }
    // The cautions, at the top and at the end.
    assert_eq!(
        cautions(&doc),
        [
            standfast_sim::cautions::CAUTIONS,
            standfast_sim::cautions::CAUTIONS
        ]
        .concat()
    );
}

#[test]
fn assess_report_holds_both_polar_traces_and_the_torque_maps() {
    let rig = demo_rig();
    let rep = standfast_sim::model::assess::assess(
        &rig,
        &standfast_sim::model::assess::AssessOptions::default(),
    )
    .unwrap();
    let html = report::assess_html(&rep, &assess_charts(&rep, &rig).unwrap()).unwrap();
    let doc = parse(&html);
    assert_self_contained(&html, &doc);
    let svgs: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("svg"))
        .collect();
    assert_eq!(svgs.len(), 3, "polar and two torque maps");
    let traces: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("polygon") && class_is(n, "polar-trace"))
        .collect();
    // Home pose, worst pose of the sky, and the assessed condition (by
    // default the home pose again, level, cover off).
    assert_eq!(traces.len(), 3);
    assert_eq!(vertices(&traces[2]), vertices(&traces[0]));
    for t in &traces {
        assert_eq!(vertices(t).len(), 72);
    }
    // The home trace agrees with the text table every 15° (the table's
    // values come from the same core call; the chart's geometry is checked
    // here: radius ratios equal tip wind ratios).
    let polar = svgs.iter().find(|n| class_is(n, "polar-chart")).unwrap();
    let (cx, cy) = centre(polar);
    let v = vertices(&traces[0]);
    let radius = |p: (f64, f64)| (p.0 - cx).hypot(p.1 - cy);
    let t0 = f64::from(rep.home_by_direction[0].tip_wind_mps.unwrap());
    for row in &rep.home_by_direction {
        let k = (row.from_deg / 5.0).round() as usize;
        let ratio = radius(v[k]) / radius(v[0]);
        let want = f64::from(row.tip_wind_mps.unwrap()) / t0;
        assert!(
            (ratio - want).abs() < 2e-3,
            "{}: {ratio} {want}",
            row.from_deg
        );
    }
    // Torque maps: 25 hour angles × 13 declinations per axis.
    let cells = doc
        .descendants()
        .filter(|n| n.has_tag_name("rect") && class_is(n, "cell"))
        .count();
    assert_eq!(cells, 2 * 25 * 13);
    let (maps, rated) = charts::torque_map(&rig);
    assert!(rated);
    // One cell computed here: hour angle +3 h (45°, tube east, the usual side
    // west of the meridian), declination +30° (row 4 from +90°, column 15
    // from −180°).
    let pose = standfast::mount::Pose::Equatorial {
        hour_angle_rad: 45f32.to_radians(),
        declination_rad: 30f32.to_radians(),
        pier_side: standfast::mount::PierSide::TubeEast,
    };
    let mut c = Conditions::calm(pose);
    c.air = rig.air;
    let l = rig.rig.axis_loads(&c, 0.0).unwrap();
    let d = rig.rig.drives().unwrap();
    let want = f64::from(l.secondary.gravity_nm.abs() / d.secondary.rated_nm);
    assert!((maps[1][4][15].unwrap() - want).abs() < 1e-9);
    let axis = texts(&doc, "axis-label");
    assert!(axis.iter().any(|a| a == "hour angle (h)"));
    assert!(axis.iter().any(|a| a == "declination"));
    assert_eq!(
        cautions(&doc),
        [
            standfast_sim::cautions::CAUTIONS,
            standfast_sim::cautions::CAUTIONS
        ]
        .concat()
    );
}

#[test]
fn demo_and_assess_commands_write_their_reports() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .args(["demo", "--hours", "0.2", "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let report = dir.path().join("report.html");
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains(&report.display().to_string()), "{text}");
    let html = std::fs::read_to_string(&report).unwrap();
    let doc = parse(&html);
    assert_self_contained(&html, &doc);
    assert_eq!(
        doc.descendants().filter(|n| n.has_tag_name("svg")).count(),
        8
    );

    let page = dir.path().join("assess.html");
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .arg("assess")
        .arg(dir.path().join("rig.toml"))
        .arg("--html")
        .arg(&page)
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let html = std::fs::read_to_string(&page).unwrap();
    parse(&html);
    assert!(html.contains("Tip wind speed by direction"));
}

#[test]
fn a_gap_in_the_wind_is_drawn_as_a_gap() {
    // The invented night with 40 s of the anemometer's column left empty
    // (an empty cell holds the previous value: host-sim/src/log/mod.rs),
    // longer than the demo rig's wind_stale of 15 s.
    let dir = tempfile::tempdir().unwrap();
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for t in 0..3600_u32 {
        let (speed, dir) = if (1000..1040).contains(&t) {
            (String::new(), String::new())
        } else {
            (format!("{:.3}", wind_at(t)), dir_at(t).to_string())
        };
        writeln!(
            csv,
            "{},{},0,1,{speed},{dir}",
            1_700_000_000 + u64::from(t),
            f64::from(t % 3) * 1e-4
        )
        .unwrap();
    }
    std::fs::write(dir.path().join("night.csv"), csv).unwrap();
    let profile = crate::common::one_file_profile(dir.path(), "night");
    let rig = demo_rig();
    let rep = run(&profile, &rig, &dir.path().join("v.csv"));
    let s = &rep.rigs[0].series;
    assert!((s.wind_gap_s - 15.0).abs() < 1e-6, "{}", s.wind_gap_s);
    assert_eq!(s.wind_gaps, vec![(999.0, 1040.0)]);
    let html = report::replay_html(
        &rep,
        &replay_charts(&rep, std::slice::from_ref(&rig)).unwrap(),
    );
    let doc = parse(&html);
    let bands: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("rect") && class_is(n, "gap-band"))
        .collect();
    assert_eq!(bands.len(), 1);
    assert!(html.contains("no anemometer sample for 0:41"), "{html}");
}

/// Issue 14: the assess page shows each finding as a table or chart, not a
/// monospace dump: the design gust and the storm direction are drawn on
/// the polar chart, the torque maps carry their values and a continuous
/// colour scale, and the payload envelope's axes are defined in words
/// (in the text too). Each assertion fails on the page as it was (one
/// `<pre>` with the text, swatches for the scale, no ring or arrow).
#[test]
fn assess_page_gives_each_finding_its_table_or_chart() {
    let rig = demo_rig();
    let rep = standfast_sim::model::assess::assess(
        &rig,
        &standfast_sim::model::assess::AssessOptions::default(),
    )
    .unwrap();
    let html = report::assess_html(&rep, &assess_charts(&rep, &rig).unwrap()).unwrap();
    let doc = parse(&html);
    assert!(
        !doc.descendants().any(|n| n.has_tag_name("pre")),
        "no monospace dump"
    );
    let headers: Vec<String> = doc
        .descendants()
        .filter(|n| n.has_tag_name("th"))
        .map(|n| n.text().unwrap_or("").to_owned())
        .collect();
    for h in [
        "finding",
        "governing wind from",
        "first leg at",
        "wind from",
        "of the rated torque",
        "unbalance",
        "offset s (m)",
        "offset p (m)",
        "utilisation",
    ] {
        assert!(headers.iter().any(|x| x == h), "no table headed {h:?}");
    }
    // The findings' figures as the text gives them.
    let ballast = rep.ballast_needed.unwrap().amount;
    assert!(html.contains(&format!("<td class=\"num\">{ballast:.1} kg</td>")));
    let o = rep.orientation.unwrap();
    assert!(html.contains(&format!("first leg at {:.0}°", o.best_first_leg_deg)));
    // The envelope's axes in words, in the page and in the text.
    let axes = standfast_sim::render::assess::ENVELOPE_AXES;
    assert!(axes.contains("s along the secondary") && axes.contains("p along the tube"));
    assert!(html.contains(axes));
    let mut text = Vec::new();
    standfast_sim::render::assess::write_text(&rep, &mut text).unwrap();
    assert!(String::from_utf8(text).unwrap().contains(axes));

    // Polar chart: the design gust as a ring whose radius stands to the
    // home trace's as the speeds do, and the storm direction as an arrow
    // from the outer ring along its bearing (compass: north up, clockwise).
    let polar = doc
        .descendants()
        .find(|n| n.has_tag_name("svg") && class_is(n, "polar-chart"))
        .unwrap();
    let (cx, cy) = centre(&polar);
    let ring = polar
        .descendants()
        .find(|n| n.has_tag_name("circle") && class_is(n, "polar-ring"))
        .expect("a design-gust ring");
    let ring_r: f64 = ring.attribute("r").unwrap().parse().unwrap();
    let home = polar
        .descendants()
        .find(|n| n.has_tag_name("polygon") && class_is(n, "polar-trace"))
        .unwrap();
    let v0 = vertices(&home)[0];
    let t0 = f64::from(rep.home_by_direction[0].tip_wind_mps.unwrap());
    let want = f64::from(rep.design_gust_mps) / t0;
    let got = ring_r / (v0.0 - cx).hypot(v0.1 - cy);
    assert!((got - want).abs() < 2e-3, "{got} {want}");
    let arrow = polar
        .descendants()
        .find(|n| n.has_tag_name("g") && class_is(n, "polar-bearing"))
        .and_then(|g| g.children().find(|n| n.has_tag_name("line")))
        .expect("a storm-direction arrow");
    let x1: f64 = arrow.attribute("x1").unwrap().parse().unwrap();
    let y1: f64 = arrow.attribute("y1").unwrap().parse().unwrap();
    let bearing = (x1 - cx).atan2(cy - y1).to_degrees().rem_euclid(360.0);
    assert!(
        (bearing - f64::from(o.storm_from_deg)).abs() < 0.1,
        "{bearing}"
    );
    let legend = texts(&doc, "legend");
    assert!(legend
        .iter()
        .any(|t| t == &format!("design gust {:.0} m/s", rep.design_gust_mps)));
    assert!(legend
        .iter()
        .any(|t| t == &format!("storm from {:.0}°", o.storm_from_deg)));
    // The gust ring, the arrow and the lowest point are named in the
    // legend right of the plot, never on it (where their words could meet
    // the rings' and spokes' labels): the only texts inside the outer ring
    // are the rings' own values.
    let spoke = polar
        .descendants()
        .find(|n| n.has_tag_name("line") && class_is(n, "spoke"))
        .unwrap();
    let outer = (spoke.attribute("x2").unwrap().parse::<f64>().unwrap() - cx)
        .hypot(spoke.attribute("y2").unwrap().parse::<f64>().unwrap() - cy);
    for t in polar.descendants().filter(|n| n.has_tag_name("text")) {
        let x: f64 = t.attribute("x").unwrap().parse().unwrap();
        let y: f64 = t.attribute("y").unwrap().parse().unwrap();
        if (x - cx).hypot(y - cy) < outer - 1.0 {
            assert!(
                class_is(&t, "tick-label") && t.text().unwrap().parse::<f64>().is_ok(),
                "{:?} on the plot",
                t.text()
            );
        }
    }

    // Torque maps: a gradient legend with tick values, and each cell's
    // value written in it (the secondary map's cell at +3 h, +30°).
    let maps: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("svg") && class_is(n, "heat-map"))
        .collect();
    assert_eq!(maps.len(), 2);
    for m in &maps {
        let grad = m
            .descendants()
            .find(|n| n.has_tag_name("linearGradient"))
            .expect("a continuous scale");
        let stops = grad.children().filter(|n| n.has_tag_name("stop")).count();
        assert!(stops >= 3);
        let id = grad.attribute("id").unwrap();
        assert!(
            m.descendants()
                .any(|n| n.has_tag_name("rect")
                    && n.attribute("fill") == Some(&format!("url(#{id})")))
        );
        let ticks: Vec<String> = m
            .descendants()
            .filter(|n| n.has_tag_name("text") && class_is(n, "legend"))
            .map(|n| n.text().unwrap_or("").to_owned())
            .collect();
        for t in ["0", "25", "50", "75", "100"] {
            assert!(ticks.iter().any(|x| x == t), "tick {t} in {ticks:?}");
        }
    }
    let ids: Vec<&str> = maps
        .iter()
        .filter_map(|m| m.descendants().find(|n| n.has_tag_name("linearGradient")))
        .map(|g| g.attribute("id").unwrap())
        .collect();
    assert_ne!(ids[0], ids[1], "gradient ids unique on the page");
    let values: Vec<String> = maps[1]
        .descendants()
        .filter(|n| n.has_tag_name("text") && class_is(n, "cell-value"))
        .map(|n| n.text().unwrap_or("").to_owned())
        .collect();
    let (torque, _) = charts::torque_map(&rig);
    assert_eq!(
        values[4 * 25 + 15],
        format!("{:.0}", torque[1][4][15].unwrap() * 100.0)
    );
}

#[test]
fn heat_scale_is_continuous_and_darkens_with_the_value() {
    // A continuous scale: every 1 % step gives its own colour, and the
    // lightness (CIE L*, from the palette's own conversion) falls
    // monotonically from 0 to 100 %, so the order reads in grey too.
    use standfast_sim::render::palette::{seen, NORMAL};
    use standfast_sim::render::svg::heat_colour;
    let mut last_l = f64::INFINITY;
    let mut last_c = String::new();
    for k in 0..=100 {
        let c = heat_colour(Some(f64::from(k) / 100.0));
        assert_ne!(c, last_c, "{k} %");
        let l = seen(&c, &NORMAL).unwrap()[0];
        assert!(l < last_l, "{k} %: L* {l} not below {last_l}");
        last_l = l;
        last_c = c;
    }
    // Over the rating and no value stand apart from the scale.
    assert_ne!(heat_colour(Some(1.01)), heat_colour(Some(1.0)));
    assert_ne!(heat_colour(None), heat_colour(Some(0.0)));
}
