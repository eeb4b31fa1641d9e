//! `standfast weigh` and the rig file's `[measured]` section, end to end:
//! readings made numerically from a rig built in the core (the demo rig with
//! a heavier, higher head than its file says, as a real head would be),
//! weighed, written into a copy of the rig file and read back by `assess`.

use std::path::{Path, PathBuf};
use std::process::Command;

use standfast::math::STANDARD_GRAVITY_MPS2;
use standfast::rig::{Conditions, Rig};
use standfast::Tilt;
use standfast_sim::input::located::SourceText;
use standfast_sim::input::rigfile;

fn demo_rig_path() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")
}

fn tmp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("standfast-weigh-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// The "true" rig: the demo file with the head at 14.6 kg and 1.20 m.
fn truth() -> Rig {
    let text = std::fs::read_to_string(demo_rig_path()).unwrap().replace(
        "mass = \"14 kg\"\ncg = [0, 0, \"1.15 m\"]",
        "mass = \"14.6 kg\"\ncg = [0, 0, \"1.20 m\"]",
    );
    assert!(text.contains("14.6 kg"));
    rigfile::load_source(&SourceText::new("truth.toml", text))
        .unwrap()
        .rig
}

/// A weighing file for `rig`: level readings and foot 0 raised by 80 mm,
/// from the core's foot reactions (a level scale under a rig turned by θ
/// reads N_i / cos θ), in kg to 0.001 kg.
fn weighing_text(rig: &Rig, extra: &str) -> String {
    let home = rig.mount().home_pose();
    let calm = Conditions::calm(home);
    let level = rig.foot_reactions_n(&calm).unwrap().unwrap();
    let s = rig.support();
    let p = |i: usize| s.foot_point_m(i).unwrap();
    let along = (p(2) - p(1)).normalized().unwrap();
    let off = (p(0) - p(1)).reject(along);
    let h = 0.08_f32;
    let angle = (h / off.norm()).asin();
    let downhill = standfast::frame::azimuth_of(-off.normalized().unwrap());
    let mut c = calm;
    c.tilt = Tilt::new(angle, downhill).unwrap();
    let lifted = rig.foot_reactions_n(&c).unwrap().unwrap();
    let kg = |v: &[f32]| {
        v.iter()
            .map(|n| format!("\"{:.3} kg\"", n / STANDARD_GRAVITY_MPS2))
            .collect::<Vec<_>>()
            .join(", ")
    };
    let lifted: Vec<f32> = lifted.iter().map(|n| n / angle.cos()).collect();
    format!(
        "resolution = \"0.001 kg\"\nlevel = [{}]\n{extra}\n[lift]\nfeet = [0]\nheight = \"80 mm\"\nheight_uncertainty = \"0.5 mm\"\nreadings = [{}]\n",
        kg(&level),
        kg(&lifted)
    )
}

fn standfast() -> Command {
    Command::new(env!("CARGO_BIN_EXE_standfast"))
}

#[test]
fn weighed_rig_file_carries_the_true_centre_into_assess() {
    let dir = tmp("roundtrip");
    let rig = truth();
    let home = rig.mount().home_pose();
    let true_cg = rig
        .place(home, Tilt::LEVEL, false)
        .unwrap()
        .centre_of_gravity_m();
    let weighing = dir.join("weighing.toml");
    std::fs::write(&weighing, weighing_text(&rig, "")).unwrap();
    let out_rig = dir.join("rig-weighed.toml");
    let out = standfast()
        .arg("weigh")
        .arg(demo_rig_path())
        .arg(&weighing)
        .arg("--write-rig")
        .arg(&out_rig)
        .arg("--json")
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let h = v["result"]["height_m"]["value"].as_f64().unwrap();
    assert!(
        (h - f64::from(true_cg.z)).abs() < 2e-3,
        "height {h} vs {}",
        true_cg.z
    );
    assert!(v["result"]["checks"]["passed"].as_bool().unwrap());
    // The head is 50 mm higher than the file says: the weighed centre is
    // higher than the modelled one.
    assert!(v["difference_m"][2].as_f64().unwrap() > 0.005);
    // The written file loads, and the rig it describes has the true centre.
    let loaded = rigfile::load(&out_rig).unwrap();
    let note = loaded.measured.as_ref().unwrap();
    assert!(note.difference_m[2] > 0.005);
    let cg = loaded
        .rig
        .place(home, Tilt::LEVEL, false)
        .unwrap()
        .centre_of_gravity_m();
    assert!((cg - true_cg).norm() < 3e-3, "{cg:?} vs {true_cg:?}");
    // `assess` on it reports the weighed centre.
    let out = standfast()
        .arg("assess")
        .arg(&out_rig)
        .arg("--json")
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let a: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let z = a["centre_of_gravity_m"][2].as_f64().unwrap();
    assert!((z - f64::from(true_cg.z)).abs() < 3e-3);
    assert!(a["measured"]["ground_mass_kg"].as_f64().unwrap() > 14.0);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn weigh_refuses_bad_readings_and_never_writes_over_its_inputs() {
    let dir = tmp("refuse");
    let rig = truth();
    let weighing = dir.join("weighing.toml");
    // Two readings for a three-foot rig.
    std::fs::write(
        &weighing,
        "resolution = \"0.05 kg\"\nlevel = [\"12 kg\", \"12 kg\"]\n",
    )
    .unwrap();
    let out = standfast()
        .arg("weigh")
        .arg(demo_rig_path())
        .arg(&weighing)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("level") && err.contains("2 readings"), "{err}");
    // Good readings, but the output named is the rig file itself.
    std::fs::write(&weighing, weighing_text(&rig, "")).unwrap();
    let copy = dir.join("rig.toml");
    std::fs::copy(demo_rig_path(), &copy).unwrap();
    let before = std::fs::read(&copy).unwrap();
    let out = standfast()
        .arg("weigh")
        .arg(&copy)
        .arg(&weighing)
        .arg("--write-rig")
        .arg(&copy)
        .output()
        .unwrap();
    // An output over an input is a command-line error, refused before
    // anything is read (exit 2, host-sim/src/commands/output.rs).
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("is the same file as the rig file"));
    assert_eq!(std::fs::read(&copy).unwrap(), before);
    // A lifted total that disagrees with the level one: refused, nothing written.
    let mut text = weighing_text(&rig, "");
    text = text.replacen("readings = [\"", "readings = [\"1", 1);
    std::fs::write(&weighing, text).unwrap();
    let target = dir.join("out.toml");
    let out = standfast()
        .arg("weigh")
        .arg(&copy)
        .arg(&weighing)
        .arg("--write-rig")
        .arg(&target)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    assert!(!target.exists());
    let _ = std::fs::remove_dir_all(&dir);
}

/// The invented demo weighing in `demo/weighing.toml` gives a plausible
/// centre for the demo rig and passes its checks.
#[test]
fn demo_weighing_runs() {
    let w = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/weighing.toml");
    let out = standfast()
        .arg("weigh")
        .arg(demo_rig_path())
        .arg(&w)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("the readings agree"), "{text}");
}

/// The core's refusals come back at the key that caused them, with the
/// value in the file's units and the accepted range.
#[test]
fn weighing_errors_are_located_at_their_keys() {
    let dir = tmp("located");
    let w = dir.join("w.toml");
    for (text, needle) in [
        (
            "resolution = \"0.05 kg\"\nlevel = [12, 12, 12]\n[lift]\nfeet = [0]\nheight = \"0 mm\"\nreadings = [12, 12, 12]\n",
            ":5:10: lift.height = \"0 mm\": 0 mm is outside the accepted range 1 to",
        ),
        (
            "resolution = \"0.05 kg\"\nlevel = [12, 12, 12]\n[lift]\nfeet = [0, 1, 2]\nheight = \"5 cm\"\nreadings = [12, 12, 12]\n",
            ":4:8: lift.feet = [0, 1, 2]: raise one side",
        ),
        (
            "resolution = \"0.05 kg\"\nlevel = [\"1e30 kg\", 12, 12]\n",
            "above the largest accepted reading",
        ),
        (
            "resolution = \"0.05 kg\"\nlevel = [12, 12, 12]\n[tip]\nedge = [1, 2]\nangle = \"0.5 deg\"\n",
            ":5:9: tip.angle = \"0.5 deg\": the angle 0.5 deg is outside the accepted range 1 to 45 deg",
        ),
    ] {
        std::fs::write(&w, text).unwrap();
        let out = standfast()
            .arg("weigh")
            .arg(demo_rig_path())
            .arg(&w)
            .output()
            .unwrap();
        assert_eq!(out.status.code(), Some(1));
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(err.contains(needle), "{needle}\n{err}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}

/// With `[measured]`, the tripod-orientation advice uses the weighed centre
/// too: at the file's own orientation it gives the same tip wind as the
/// home-pose table, which carries the weighed centre.
#[test]
fn orientation_advice_uses_the_weighed_centre() {
    let dir = tmp("orient");
    let rig = truth();
    let weighing = dir.join("weighing.toml");
    std::fs::write(&weighing, weighing_text(&rig, "")).unwrap();
    let out_rig = dir.join("rig-weighed.toml");
    let out = standfast()
        .arg("weigh")
        .arg(demo_rig_path())
        .arg(&weighing)
        .arg("--write-rig")
        .arg(&out_rig)
        .output()
        .unwrap();
    assert!(out.status.success());
    let loaded = rigfile::load(&out_rig).unwrap();
    let o = standfast_sim::model::assess::AssessOptions {
        storm_from_deg: 90.0,
        ..standfast_sim::model::assess::AssessOptions::default()
    };
    let rep = standfast_sim::model::assess::assess(&loaded, &o).unwrap();
    let t = rep.orientation.unwrap();
    let row = rep
        .home_by_direction
        .iter()
        .find(|r| (r.from_deg - 90.0).abs() < 1e-3)
        .unwrap();
    let (a, b) = (t.current_tip_wind_mps.unwrap(), row.tip_wind_mps.unwrap());
    assert!((a - b).abs() < 1e-3, "{a} vs {b}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// A what-if variant cannot carry a weighed centre (it changes what was
/// weighed): refused with a reason, never silently dropped.
#[test]
fn what_if_variants_of_a_weighed_rig_are_refused() {
    let dir = tmp("whatif");
    let rig = truth();
    let weighing = dir.join("weighing.toml");
    std::fs::write(&weighing, weighing_text(&rig, "")).unwrap();
    let out_rig = dir.join("rig-weighed.toml");
    let out = standfast()
        .arg("weigh")
        .arg(demo_rig_path())
        .arg(&weighing)
        .arg("--write-rig")
        .arg(&out_rig)
        .output()
        .unwrap();
    assert!(out.status.success());
    let loaded = rigfile::load(&out_rig).unwrap();
    let e = standfast_sim::model::whatif::variant_from_texts(&loaded, &["cover=off".to_owned()])
        .unwrap_err()
        .to_string();
    assert!(e.contains("[measured]"), "{e}");
    let _ = std::fs::remove_dir_all(&dir);
}
