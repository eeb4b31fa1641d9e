//! Rig-file drag inputs: `end_drag_coefficient` on cylinder shapes, a drag
//! coefficient on counterweights, drag-only shapes (mass 0 with a shape).

use standfast::rig::PartRole;
use standfast_sim::input::located::SourceText;
use standfast_sim::input::rigfile::load_source;

const DEMO: &str = include_str!("../../demo/rig.toml");

fn demo_with(from: &str, to: &str) -> String {
    assert!(DEMO.contains(from), "demo rig lacks {from:?}");
    DEMO.replacen(from, to, 1)
}

const TUBE: &str =
    "shape = { kind = \"cylinder\", diameter = \"0.13 m\", length = \"0.95 m\", axis = [0, 1, 0] }";

#[test]
fn end_drag_coefficient_reaches_the_core() {
    let text = demo_with(TUBE, &format!("{TUBE}\nend_drag_coefficient = 1.05"));
    let r = load_source(&SourceText::new("end.toml", text)).unwrap();
    let x = r.spec.bodies[1].exposure.unwrap();
    assert_eq!(x.end_drag_coefficient, Some(1.05));
    assert_eq!(x.drag_coefficient, None);
}

#[test]
fn counterweight_drag_coefficient_sets_the_disc_face() {
    let cw = "distance = \"0.10 m\"\ndiameter = \"0.12 m\"\nthickness = \"0.05 m\"";
    let text = demo_with(cw, &format!("{cw}\ndrag_coefficient = 1.3"));
    let r = load_source(&SourceText::new("cw.toml", text)).unwrap();
    assert_eq!(r.spec.counterweights[0].drag_coefficient, Some(1.3));
    let part = r
        .rig
        .parts()
        .iter()
        .find(|p| p.role == PartRole::Counterweight(0))
        .unwrap();
    assert_eq!(part.exposure.unwrap().end_drag_coefficient, Some(1.3));
    // Out of range: located at the key, with the accepted range.
    let text = demo_with(cw, &format!("{cw}\ndrag_coefficient = 9"));
    let e = load_source(&SourceText::new("cw.toml", text))
        .unwrap_err()
        .to_string();
    assert!(e.contains("counterweight[0].drag_coefficient"), "{e}");
    assert!(e.contains("0.1 to 3"), "{e}");
}

#[test]
fn a_massless_shape_is_a_drag_only_surface() {
    let sign = "\n[[body]]\nlabel = \"sign\"\nmass = 0\ncg = [0, \"0.3 m\", \"0.8 m\"]\n\
                shape = { kind = \"box\", size = [\"0.4 m\", \"0.01 m\", \"0.3 m\"] }\n";
    let text = demo_with("[[counterweight]]", &format!("{sign}\n[[counterweight]]"));
    let r = load_source(&SourceText::new("sign.toml", text)).unwrap();
    assert_eq!(r.spec.bodies[2].mass_kg, 0.0);
    let base = load_source(&SourceText::new("demo.toml", DEMO.to_owned())).unwrap();
    // Same mass, more wind: the sign lowers the tip wind from the north,
    // where it shows its 0.4 × 0.3 m face.
    let home = base.rig.mount().home_pose();
    let m = |x: &standfast::rig::Rig| {
        x.place(home, standfast::Tilt::LEVEL, false)
            .unwrap()
            .mass_kg()
    };
    assert!((m(&r.rig) - m(&base.rig)).abs() < 1e-6);
    let mut c = standfast::rig::Conditions::calm(home);
    c.air = base.air;
    let tip = |x: &standfast::rig::Rig| x.stability_figures(&c).unwrap().tip_wind_mps.unwrap();
    assert!(tip(&r.rig) < tip(&base.rig));
    // Without a shape a massless body is refused.
    let bare = "\n[[body]]\nlabel = \"nothing\"\nmass = 0\ncg = [0, 0, 1]\n";
    let text = demo_with("[[counterweight]]", &format!("{bare}\n[[counterweight]]"));
    let e = load_source(&SourceText::new("bare.toml", text))
        .unwrap_err()
        .to_string();
    assert!(e.contains("body[2].mass"), "{e}");
}

#[test]
fn misplaced_drag_coefficients_are_named() {
    let head = "shape = { kind = \"box\", size = [\"0.25 m\", \"0.25 m\", \"0.30 m\"] }";
    let text = demo_with(head, &format!("{head}\nend_drag_coefficient = 1.0"));
    let e = load_source(&SourceText::new("box.toml", text))
        .unwrap_err()
        .to_string();
    assert!(e.contains("body[0].end_drag_coefficient"), "{e}");
    let text = demo_with(head, "drag_coefficient = 1.0");
    let e = load_source(&SourceText::new("noshape.toml", text))
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("body[0].drag_coefficient") && e.contains("shape"),
        "{e}"
    );
}
