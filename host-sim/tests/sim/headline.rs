//! The headline (issue 14's "done when"): on the demo night the first
//! lines of the summary and of the HTML report say why the rig was parked
//! and when, in local time; the JSON carries the same story as data.
//!
//! The demo night's headline is pinned by `tests/golden/demo-headline.txt`
//! (regenerate with `STANDFAST_BLESS=1 cargo test -p standfast-sim
//! headline` after an intended change and read the diff). The time and
//! cause are also checked against the demo's own logs, read here without
//! the library: the mount log (UTC) and the anemometer log (local time
//! with its offset).

use std::path::Path;
use std::process::Command;

fn standfast(args: &[&str], out_dir: &Path) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .args(args)
        .arg(out_dir)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

/// The first row's time in the mount log whose cover column is 1, and the
/// offset the anemometer log writes on its first row (`+01:00`).
fn cover_fitted_and_offset(dir: &Path) -> (String, String) {
    let mount = std::fs::read_to_string(dir.join("night-mount.csv")).unwrap();
    let mut lines = mount.lines();
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    let cover = header.iter().position(|h| *h == "cover").unwrap();
    let fitted = lines
        .map(|l| l.split(',').collect::<Vec<_>>())
        .find(|f| f[cover] == "1")
        .map(|f| f[0].to_owned())
        .unwrap();
    let wind = std::fs::read_to_string(dir.join("night-wind.csv")).unwrap();
    let first = wind.lines().nth(1).unwrap().split(',').next().unwrap();
    (fitted, first[first.len() - 6..].to_owned())
}

#[test]
fn demo_night_headline_says_why_and_when_the_rig_was_parked() {
    let dir = tempfile::tempdir().unwrap();
    let text = standfast(&["demo", "--out"], dir.path());

    // The demo's own logs: the cover goes on at 05:21:00 UTC (the mount
    // log is UTC, its profile says zone Z) and the anemometer's clock is
    // at +01:00, so 06:21:00 local.
    let (fitted, offset) = cover_fitted_and_offset(dir.path());
    assert_eq!(fitted, "2025-11-15T05:21:00.000");
    assert_eq!(offset, "+01:00");

    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(
        lines[0],
        "The night in brief (local time UTC+01:00, 2025-11-14 22:00 to 2025-11-15 07:00):"
    );
    // First item: the park request, its local time, its cause and numbers.
    assert!(
        lines[1].starts_with("  06:21:00 (05:21:00 UTC) park requested (clear -> park_now"),
        "{}",
        lines[1]
    );
    assert!(lines[1].contains("the cover was fitted"), "{}", lines[1]);
    assert!(lines[2].contains("35 % -> 81 %"), "{}", lines[2]);
    assert!(lines[2].contains("65 % park threshold"), "{}", lines[2]);
    assert!(
        lines[3].contains("tip wind 23.6 m/s -> 15.4 m/s"),
        "{}",
        lines[3]
    );
    // The mount had already slewed to its pole-ward pose nine minutes
    // before (the mount log: hour angle -6 h, declination 90° from
    // 05:12:00 UTC).
    assert!(lines[4].contains("at 06:12:00 (05:12:00 UTC), 0:09:00 before"));
    // The anemometer drop-out (46 s without a row, 03:29:59 to 03:30:45
    // UTC in the log) comes after the physics.
    let fault = lines
        .iter()
        .position(|l| l.contains("sensor fault:"))
        .unwrap();
    let closest = lines
        .iter()
        .position(|l| l.contains("closest approach to tipping"))
        .unwrap();
    assert!(1 < closest && closest < fault, "{text}");
    assert!(lines[fault + 1].contains("unwatched 0:00:46 from 04:29:59"));
    assert!(lines[fault + 2].contains("for 0:01:31"));
    // The findings below name the physics' highest level beside the fault.
    assert!(
        text.contains("  highest level from the physics park_now; 0:02:34 in sensor_fault in all, the start-up included"),
        "{text}"
    );

    // The whole headline block, pinned.
    let block: String = lines
        .iter()
        .take_while(|l| !l.is_empty())
        .map(|l| format!("{l}\n"))
        .collect();
    let golden = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/golden/demo-headline.txt");
    if std::env::var_os("STANDFAST_BLESS").is_some() {
        std::fs::write(&golden, &block).unwrap();
    }
    assert_eq!(block, std::fs::read_to_string(&golden).unwrap());

    // The HTML report opens with the same headline: the first section
    // after the page's title, before the cautions and any chart.
    let html = std::fs::read_to_string(dir.path().join("report.html")).unwrap();
    let doc = roxmltree::Document::parse_with_options(
        &html,
        roxmltree::ParsingOptions {
            allow_dtd: true,
            ..roxmltree::ParsingOptions::default()
        },
    )
    .unwrap();
    let body = doc.descendants().find(|n| n.has_tag_name("body")).unwrap();
    let mut top = body.children().filter(roxmltree::Node::is_element);
    assert!(top.next().unwrap().has_tag_name("h1"));
    let section = top.next().unwrap();
    assert_eq!(section.attribute("class"), Some("headline"));
    assert_eq!(
        section
            .descendants()
            .find(|n| n.has_tag_name("h2"))
            .and_then(|n| n.text()),
        Some(lines[0].trim_end_matches(':'))
    );
    let heads: Vec<&str> = section
        .descendants()
        .filter(|n| n.attribute("class") == Some("head"))
        .filter_map(|n| n.text())
        .collect();
    assert_eq!(heads[0], lines[1].trim_start());
}

/// The JSON summary starts with the headline as data: UTC times, the
/// figure against its threshold, what changed.
#[test]
fn json_summary_carries_the_headline_first() {
    let dir = tempfile::tempdir().unwrap();
    // The golden test's rising wind (tests/sim/golden.rs), replayed as JSON.
    crate::golden::write_log(dir.path());
    let rig = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml");
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .arg("replay")
        .arg("--rig")
        .arg(&rig)
        .arg("--json")
        .arg("--profile")
        .arg(dir.path().join("ramp.toml"))
        .output()
        .unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.starts_with("{\n  \"headline\": {"), "{}", &text[..80]);
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    let h = &v["headline"];
    assert!(h["local_offset_s"].is_null());
    let rig = &h["rigs"][0];
    assert_eq!(rig["judged"], true);
    assert_eq!(rig["unwatched_limit_s"], 90.0);
    let first = &rig["told"][0];
    assert_eq!(first["kind"], "park_request");
    assert_eq!(first["to"], "park_now");
    assert_eq!(first["figure"], "predicted_overturning");
    assert!(first["time"].as_str().unwrap().ends_with('Z'));
    let (value, threshold) = (
        first["value"].as_f64().unwrap(),
        first["threshold"].as_f64().unwrap(),
    );
    assert!(value >= threshold && (threshold - 0.65).abs() < 1e-6);
    assert_eq!(first["changed"][0]["input"], "gust");
    assert_eq!(rig["told"][1]["to"], "alarm");
    assert_eq!(rig["told"][2]["kind"], "closest_approach");
}
