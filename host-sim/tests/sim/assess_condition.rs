//! `assess` at a given condition: pose, ground tilt, cover, design wind
//! (speed, direction or the worst), in text, JSON and HTML. Checked against
//! the hand-worked tripod of the README (statics: Beer & Johnston, *Statics*,
//! ch. 8; numbers derived there).

use std::path::PathBuf;
use std::process::Command;

use standfast_sim::input::located::SourceText;
use standfast_sim::input::rigfile::load_source;
use standfast_sim::model::assess::{assess, AssessOptions, Condition};

/// The README's tripod: 40 kg on feet on a 0.5 m circle (first leg north),
/// a drag area Cd·A = 1.2 × 0.25 m × 0.74 m = 0.222 m² centred 1.5 m up on a
/// vertical cylinder, centre of gravity 1.0 m up over the centre, sea level.
const TRIPOD: &str = r#"
[site]
latitude = 45
elevation = 0
[support]
friction = 0.5
tripod = { foot_circle_radius = "0.5 m", first_leg_azimuth = 0 }
[mount]
kind = "alt_azimuth"
height = "1.6 m"
[[body]]
label = "lumped rig"
mass = "40 kg"
cg = [0, 0, "1.0 m"]
shape = { kind = "cylinder", diameter = "0.25 m", length = "0.74 m", axis = [0, 0, 1] }
centre = [0, 0, "1.5 m"]
drag_coefficient = 1.2
"#;

fn tripod() -> standfast_sim::input::rigfile::LoadedRig {
    load_source(&SourceText::new("tripod.toml", TRIPOD)).unwrap()
}

/// Level, wind from the north (toward the middle of the south edge, one leg
/// pointing into the wind): tips at 21.9 m/s (README: W·r = F·H with
/// r = 0.25 m). At a 15 m/s design gust the gravity moment holds and only
/// wind overturns, so utilisation = (15 / 21.93)² = 0.468; sliding =
/// q·Cd·A / (μ·W) = ½·1.225·15²·0.222 / (0.5·392.27) = 0.156.
#[test]
fn level_tripod_matches_the_hand_worked_figures() {
    let r = tripod();
    let o = AssessOptions {
        design_gust_mps: 15.0,
        condition: Condition {
            wind_from_deg: Some(0.0),
            ..Condition::default()
        },
        ..AssessOptions::default()
    };
    let rep = assess(&r, &o).unwrap();
    let c = &rep.condition;
    let tip = c.tip_wind_mps.unwrap();
    assert!((tip - 21.93).abs() < 0.05, "{tip}");
    let v_tip = (2.0 * 392.266 * 0.25 / (1.5 * 0.222 * 1.225_f64)).sqrt();
    let want = (15.0 / v_tip).powi(2);
    assert!(
        (f64::from(c.overturning_utilisation) - want).abs() < 2e-3,
        "{c:?}"
    );
    let slide = 0.5 * 1.225 * 225.0 * 0.222 / (0.5 * 392.266);
    assert!(
        (f64::from(c.sliding_utilisation) - slide).abs() < 2e-3,
        "{c:?}"
    );
    // The worst direction is one of the three edge-normal ones, same figure.
    let worst = assess(
        &r,
        &AssessOptions {
            design_gust_mps: 15.0,
            ..AssessOptions::default()
        },
    )
    .unwrap();
    let w = &worst.condition;
    assert!(w.worst_direction);
    assert!((w.overturning_utilisation - c.overturning_utilisation).abs() < 2e-3);
    let off = (w.wind_from_deg.rem_euclid(120.0)).min(120.0 - w.wind_from_deg.rem_euclid(120.0));
    assert!(off < 1.0, "worst from {}", w.wind_from_deg);
}

/// Ground tilted 5° downhill toward the south: with no wind the centre 1.0 m
/// up over the centre crosses the south edge (0.25 m away) at
/// atan(0.25 / 1.0) = 14.04° of tilt, so 9.04° remain; a wind from the
/// north now finds the rig closer to tipping than on level ground.
#[test]
fn ground_tilt_moves_the_margin_and_the_utilisation() {
    let r = tripod();
    let level = assess(
        &r,
        &AssessOptions {
            design_gust_mps: 15.0,
            condition: Condition {
                wind_from_deg: Some(0.0),
                ..Condition::default()
            },
            ..AssessOptions::default()
        },
    )
    .unwrap();
    let tilted = assess(
        &r,
        &AssessOptions {
            design_gust_mps: 15.0,
            condition: Condition {
                wind_from_deg: Some(0.0),
                tilt: standfast::Tilt::new(5f32.to_radians(), 180f32.to_radians()).unwrap(),
                ..Condition::default()
            },
            ..AssessOptions::default()
        },
    )
    .unwrap();
    let (m, dir) = tilted.condition.tilt_margin_deg;
    assert!(
        (m - (0.25f32.atan().to_degrees() - 5.0)).abs() < 0.05,
        "{m}"
    );
    assert!((dir - 180.0).abs() < 0.5, "{dir}");
    assert!(
        tilted.condition.overturning_utilisation > level.condition.overturning_utilisation + 0.1
    );
}

fn standfast() -> Command {
    Command::new(env!("CARGO_BIN_EXE_standfast"))
}

fn demo() -> PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")
}

#[test]
fn command_line_condition_in_text_json_and_html() {
    let dir = std::env::temp_dir().join(format!("standfast-cond-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let html = dir.join("a.html");
    let out = standfast()
        .arg("assess")
        .arg(demo())
        .args([
            "--hour-angle",
            "-2",
            "--declination",
            "20 deg",
            "--pier-side",
            "tube-west",
        ])
        .args([
            "--tilt",
            "3",
            "--downhill",
            "90",
            "--cover",
            "on",
            "--wind-from",
            "270",
        ])
        .args(["--design-gust", "18"])
        .arg("--html")
        .arg(&html)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("At hour angle -2.00 h, declination +20.0°, tube west, ground tilt 3.0° (downhill toward 90°), cover fitted, design gust 18.0 m/s"),
        "{text}"
    );
    assert!(text.contains("wind from 270°: overturning"), "{text}");
    let page = std::fs::read_to_string(&html).unwrap();
    assert!(page.contains("assessed condition") && page.contains("wind from 270°"));
    let out = standfast()
        .arg("assess")
        .arg(demo())
        .args(["--azimuth", "180", "--altitude", "30", "--json"])
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["condition"]["worst_direction"], true);
    assert!(v["condition"]["overturning_utilisation"].as_f64().unwrap() > 0.0);
    assert_eq!(v["condition"]["by_direction"].as_array().unwrap().len(), 24);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn bad_condition_options_name_the_range() {
    for (args, needle) in [
        (vec!["--tilt", "50", "--downhill", "0"], "0 to 45 deg"),
        (
            vec!["--hour-angle", "13", "--declination", "0"],
            "-12 to 12 h",
        ),
        (
            vec!["--declination", "95 deg", "--hour-angle", "0"],
            "-90 to 90 deg",
        ),
        (vec!["--wind-from", "sideways"], "worst"),
        (vec!["--hour-angle", "1"], "--declination"),
    ] {
        let out = standfast()
            .arg("assess")
            .arg(demo())
            .args(&args)
            .output()
            .unwrap();
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains(needle), "{args:?}: {err}");
    }
}
