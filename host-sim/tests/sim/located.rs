//! Located validation errors: file, line, column, key, value, range.
//!
//! Line and column numbers are counted by hand from the literal texts below
//! (1-based, as editors and compilers show them).

use serde::Deserialize;
use standfast_sim::input::located::SourceText;
use standfast_sim::input::units::{Length, Mass};
use toml::Spanned;

#[derive(Debug, Deserialize)]
struct Payload {
    mass: Spanned<Mass>,
    arm: Spanned<Length>,
}

#[derive(Debug, Deserialize)]
struct Doc {
    payload: Payload,
}

const GOOD: &str = "# rig\n[payload]\nmass = \"18 lb\"\narm = \"45 in\"\n";

#[test]
fn location_of_a_value() {
    let src = SourceText::new("rig.toml", GOOD);
    let doc: Doc = src.parse_toml().unwrap();
    let at = src.location(doc.payload.arm.span().start);
    // `arm = "45 in"` is line 4; the value's quote is at column 7.
    assert_eq!((at.line, at.column), (4, 7));
    assert_eq!(src.line(4), "arm = \"45 in\"");
    assert_eq!(
        src.key_before(doc.payload.arm.span().start).as_deref(),
        Some("arm")
    );
}

#[test]
fn range_error_names_everything() {
    let src = SourceText::new("rig.toml", GOOD);
    let doc: Doc = src.parse_toml().unwrap();
    let ck = src.checker();
    let e = ck
        .range(
            "payload.mass",
            &doc.payload.mass,
            Mass::from_kg(0.0),
            Mass::from_kg(5.0),
            "kg",
        )
        .unwrap_err();
    let at = e.at.clone().unwrap();
    assert_eq!((at.file.as_str(), at.line, at.column), ("rig.toml", 3, 8));
    assert_eq!(e.key.as_deref(), Some("payload.mass"));
    assert_eq!(e.value.as_deref(), Some("\"18 lb\""));
    let msg = e.to_string();
    // 18 lb = 8.16466 kg (1959 agreement, 1 lb = 0.45359237 kg).
    assert_eq!(
        msg,
        "rig.toml:3:8: payload.mass = \"18 lb\": outside the accepted range 0 to 5 kg (this value is 8.164663 kg)"
    );
    // Within range it passes and returns the value.
    assert!(ck
        .range(
            "payload.arm",
            &doc.payload.arm,
            Length::from_m(0.0),
            Length::from_m(2.0),
            "m"
        )
        .is_ok());
}

#[test]
fn unit_error_from_the_parser_is_located() {
    let text = "[payload]\nmass = \"18 lb\"\narm = \"18 lb\"\n";
    let src = SourceText::new("rig.toml", text);
    let e = src.parse_toml::<Doc>().unwrap_err();
    let at = e.at.clone().unwrap();
    assert_eq!((at.line, at.column), (3, 7));
    // The full key, section included.
    assert_eq!(e.key.as_deref(), Some("payload.arm"));
    assert_eq!(e.value.as_deref(), Some("\"18 lb\""));
    assert!(e.problem.contains("unit of mass"), "{}", e.problem);
    assert!(
        e.problem.contains("m, mm, cm, km, in, ft, yd"),
        "{}",
        e.problem
    );
}

#[test]
fn syntax_error_is_located() {
    let src = SourceText::new("rig.toml", "[payload]\nmass = = 3\n");
    let e = src.parse_toml::<Doc>().unwrap_err();
    assert_eq!(e.at.unwrap().line, 2);
}
