//! Attachment hardware in `assess`: the counterweight shaft's thread in its
//! housing and bolted joints of the mount head and the tripod head, checked
//! with the core's stripping and bolt-group checks against hand-worked loads
//! and the published values those checks already use.

use standfast_sim::input::located::SourceText;
use standfast_sim::input::rigfile::load_source;
use standfast_sim::model::assess::{assess, AssessOptions, Condition};
use standfast_sim::render::assess::write_text;

const DEMO: &str = include_str!("../../demo/rig.toml");

/// The README's hand-worked tripod (40 kg, Cd·A = 0.222 m² centred 1.5 m
/// up, centre of gravity 1.0 m up) standing on a joint 0.5 m up: four M6
/// class 8.8 screws on a 40 mm circle, 9 mm into 6061-T6.
const TRIPOD_JOINT: &str = r#"
[site]
latitude = 45
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
[[joint]]
label = "post to base"
height = "0.5 m"
thread = "M6"
bolts = 4
bolt_circle = "40 mm"
class = "8.8"
engagement = "9 mm"
tapped = "6061-T6"
"#;

/// Hand-worked: at a 15 m/s gust, sea level, F = ½·1.225·15²·0.222 =
/// 30.59 N at 1.0 m above the joint, M = 30.59 N·m; the 392.27 N weight
/// presses the joint. Bolt circle rule F_max = P/n + 2M/(nR) (atreydes.com
/// bolted circular flange, the check of `tests/checks/hardware.rs`):
/// −392.27/4 + 2·30 590/(4·20) = 666.7 N. Allowable at yield / 2: the ISO
/// 898-1 stress area of M6, 20.1 mm² (checked), × Rp0.2 640 MPa (class 8.8,
/// from memory) / 2 = 6432 N; the screw, not the thread in the aluminium,
/// governs (the M6-into-6061-T6 example of `tests/checks/hardware.rs`:
/// about 19 kN to strip 9 mm at ultimate).
#[test]
fn bolt_circle_under_the_hand_worked_tripod() {
    let r = load_source(&SourceText::new("tripod.toml", TRIPOD_JOINT)).unwrap();
    let rep = assess(
        &r,
        &AssessOptions {
            design_gust_mps: 15.0,
            condition: Condition::default(),
            ..AssessOptions::default()
        },
    )
    .unwrap();
    let h = rep
        .hardware
        .iter()
        .find(|h| h.part == "post to base")
        .unwrap();
    let q = 0.5 * 1.225 * 15.0_f32 * 15.0;
    let m_nmm = q * 0.222 * 1.0 * 1000.0;
    let want = -392.266 / 4.0 + 2.0 * m_nmm / (4.0 * 20.0);
    assert!((h.load - want).abs() < 1.0, "{h:?} vs {want}");
    assert!(
        (h.allowable - 20.1 * 640.0 / 2.0).abs() < 0.005 * 6432.0,
        "{h:?}"
    );
    assert_eq!(h.governs, "screw tension");
    assert!((h.utilisation - want / h.allowable).abs() < 1e-3);
}

#[test]
fn shaft_thread_and_joints_on_the_demo_rig_weakest_first() {
    let extra = r#"
[shaft_joint]
engagement = "14 mm"
housing = "6061-T6"

[[joint]]
label = "mount head to tripod head"
height = "1.0 m"
thread = "M6"
bolts = 3
bolt_circle = "60 mm"
class = "8.8"
engagement = "9 mm"
tapped = "6061-T6"
heel = "40 mm"
"#;
    let text = format!("{DEMO}{extra}");
    let r = load_source(&SourceText::new("demo+hw.toml", text)).unwrap();
    let rep = assess(&r, &AssessOptions::default()).unwrap();
    assert_eq!(rep.hardware.len(), 3);
    for w in rep.hardware.windows(2) {
        assert!(w[0].utilisation >= w[1].utilisation);
    }
    // The shaft's thread: 11.1 kg of counterweights and shaft hanging
    // (108.9 N) plus the gust along the shaft on the discs' faces; the
    // allowable is the M12 shaft's tension at S355 yield / 2: 84.3 mm²
    // (ISO 898-1, checked) × 355 MPa (EN 10025-2, checked) / 2 = 14 963 N.
    let s = rep
        .hardware
        .iter()
        .find(|h| h.part.starts_with("counterweight shaft thread"))
        .unwrap();
    assert!(
        s.load > 11.1 * 9.806_65 && s.load < 11.1 * 9.806_65 + 20.0,
        "{s:?}"
    );
    assert!(
        (s.allowable - 84.3 * 355.0 / 2.0).abs() < 0.005 * 14_963.0,
        "{s:?}"
    );
    let mut out = Vec::new();
    write_text(&rep, &mut out).unwrap();
    let text = String::from_utf8(out).unwrap();
    let at = text.find("Attachment hardware, weakest first").unwrap();
    assert!(at < text.find("Cautions:").unwrap());
}

#[test]
fn hardware_sections_are_checked_at_their_keys() {
    for (extra, needle) in [
        ("\n[shaft_joint]\nengagement = \"14 mm\"\n", "shaft_joint"),
        (
            "\n[shaft_joint]\nengagement = \"14 mm\"\nhousing = \"cheese\"\n",
            "shaft_joint.housing",
        ),
        (
            "\n[[joint]]\nlabel = \"j\"\nheight = \"1 m\"\nthread = \"M7\"\nbolts = 3\nbolt_circle = \"60 mm\"\nclass = \"8.8\"\nengagement = \"9 mm\"\n",
            "joint[0].thread",
        ),
        (
            "\n[[joint]]\nlabel = \"j\"\nheight = \"1 m\"\nthread = \"M6\"\nbolts = 2\nbolt_circle = \"60 mm\"\nclass = \"8.8\"\nengagement = \"9 mm\"\n",
            "joint[0].bolts",
        ),
        (
            "\n[[joint]]\nlabel = \"j\"\nheight = \"1 m\"\nthread = \"M6\"\nbolts = 3\nbolt_circle = \"60 mm\"\nclass = \"12.9\"\nengagement = \"9 mm\"\n",
            "joint[0].class",
        ),
    ] {
        let text = format!("{DEMO}{extra}");
        let e = load_source(&SourceText::new("hw.toml", text))
            .unwrap_err()
            .to_string();
        assert!(e.contains(needle), "{needle}: {e}");
    }
}
