//! Units at the host boundary, against the defining values.
//!
//! Sources: international yard and pound agreement (1959): 1 yd = 0.9144 m,
//! 1 lb = 0.45359237 kg, hence 1 ft = 0.3048 m and 1 in = 0.0254 m exactly.
//! NIST SP 811 (2008 ed.), Appendix B.8 "Factors for units listed
//! alphabetically" (exact values printed in bold there are marked "exact"
//! below). 3rd CGPM (1901): standard acceleration of gravity 9.806 65 m/s².

use standfast_sim::input::units::{
    Acceleration, Angle, Area, Dim, Duration, Force, Length, Mass, Pressure, Speed, Temperature,
    Torque, UnitError,
};

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs().max(1e-300)
}

#[test]
fn lengths() {
    // 1959 agreement: 1 in = 0.0254 m exactly.
    assert!(close(Length::parse("45 in").unwrap().m(), 1.143, 1e-15));
    // 1959 agreement: 1 ft = 0.3048 m exactly.
    assert!(close(Length::parse("2 ft").unwrap().m(), 0.6096, 1e-15));
    // SI prefixes.
    assert!(close(Length::parse("120 mm").unwrap().m(), 0.12, 1e-15));
    assert!(close(Length::parse("1.1 m").unwrap().m(), 1.1, 1e-15));
    // 1959 agreement: 1 yd = 0.9144 m exactly.
    assert!(close(Length::parse("3 yd").unwrap().m(), 2.7432, 1e-15));
    // Plain numbers are SI (documented in units.rs).
    assert!(close(Length::parse("1.1").unwrap().m(), 1.1, 1e-15));
    // Spellings: no space, long names.
    assert!(close(Length::parse("45in").unwrap().m(), 1.143, 1e-15));
    assert!(close(Length::parse("2 feet").unwrap().m(), 0.6096, 1e-15));
}

#[test]
fn masses() {
    // 1959 agreement: 1 lb = 0.453 592 37 kg exactly.
    assert!(close(
        Mass::parse("18 lb").unwrap().kg(),
        8.164_662_66,
        1e-15
    ));
    // NIST SP 811 B.8: ounce (avoirdupois) = 2.834 952 E-02 kg (1/16 lb).
    assert!(close(
        Mass::parse("2.5 oz").unwrap().kg(),
        2.5 * 2.834_952e-2,
        1e-6
    ));
    assert!(close(Mass::parse("500 g").unwrap().kg(), 0.5, 1e-15));
    assert!(close(Mass::parse("8 kg").unwrap().kg(), 8.0, 1e-15));
}

#[test]
fn speeds() {
    // NIST SP 811 B.8: mile per hour = 4.4704 E-01 m/s (exact).
    assert!(close(Speed::parse("30 mph").unwrap().mps(), 13.4112, 1e-15));
    // NIST SP 811 B.8: knot (nautical mile per hour) = 5.144 444 E-01 m/s;
    // the international nautical mile is 1852 m exactly.
    assert!(close(
        Speed::parse("20 kn").unwrap().mps(),
        20.0 * 1852.0 / 3600.0,
        1e-15
    ));
    assert!(close(
        Speed::parse("1 kn").unwrap().mps(),
        0.514_444_4,
        1e-7
    ));
    // NIST SP 811 B.8: kilometer per hour = 2.777 778 E-01 m/s.
    assert!(close(
        Speed::parse("3 km/h").unwrap().mps(),
        3.0 * 0.277_777_8,
        1e-7
    ));
    // Case-insensitive when unambiguous.
    assert!(close(Speed::parse("30 MPH").unwrap().mps(), 13.4112, 1e-15));
}

#[test]
fn torques_and_forces() {
    for s in ["12 N m", "12 N·m", "12 Nm", "12 N*m", "12 N.m", "12 N-m"] {
        assert!(close(Torque::parse(s).unwrap().nm(), 12.0, 1e-15), "{s}");
    }
    // NIST SP 811 B.8: pound-force foot = 1.355 818 E+00 N·m.
    assert!(close(
        Torque::parse("1 lbf ft").unwrap().nm(),
        1.355_818,
        1e-6
    ));
    assert!(close(
        Torque::parse("1 lbf·ft").unwrap().nm(),
        1.355_818,
        1e-6
    ));
    // NIST SP 811 B.8: pound-force inch = 1.129 848 E-01 N·m.
    assert!(close(
        Torque::parse("1 lbf in").unwrap().nm(),
        0.112_984_8,
        1e-6
    ));
    // NIST SP 811 B.8: pound-force = 4.448 222 E+00 N.
    assert!(close(Force::parse("1 lbf").unwrap().n(), 4.448_222, 1e-6));
    // NIST SP 811 B.8: kilogram-force = 9.806 65 E+00 N (exact).
    assert!(close(Force::parse("1 kgf").unwrap().n(), 9.806_65, 1e-15));
}

#[test]
fn angles_pressures_temperatures() {
    // Degree = π/180 rad (NIST SP 811 B.8: 1.745 329 E-02 rad).
    assert!(close(
        Angle::parse("35 deg").unwrap().rad(),
        35.0 * 1.745_329e-2,
        1e-6
    ));
    assert!(close(Angle::parse("35°").unwrap().deg(), 35.0, 1e-12));
    // One hour of hour angle = 15° (common practice, no source).
    assert!(close(
        Angle::parse("2 hourangle").unwrap().deg(),
        30.0,
        1e-12
    ));
    // hPa = 100 Pa (SI prefix); NIST SP 811 B.8: millibar = 1.0 E+02 Pa (exact).
    assert!(close(
        Pressure::parse("1013 hPa").unwrap().pa(),
        101_300.0,
        1e-15
    ));
    assert!(close(
        Pressure::parse("1013 mbar").unwrap().pa(),
        101_300.0,
        1e-15
    ));
    // NIST SP 811 B.8: pound-force per square inch = 6.894 757 E+03 Pa.
    assert!(close(
        Pressure::parse("1 psi").unwrap().pa(),
        6_894.757,
        1e-6
    ));
    // NIST SP 811 B.8: inch of mercury, conventional = 3.386 389 E+03 Pa.
    assert!(close(
        Pressure::parse("30 inHg").unwrap().pa(),
        30.0 * 3_386.389,
        1e-12
    ));
    // NIST SP 811 §4.2.1.1 and B.9: T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8.
    assert!(close(
        Temperature::parse("10 °C").unwrap().kelvin(),
        283.15,
        1e-15
    ));
    assert!(close(
        Temperature::parse("50 F").unwrap().kelvin(),
        283.15,
        1e-12
    ));
    assert!(close(
        Temperature::parse("50 °F").unwrap().celsius(),
        10.0,
        1e-12
    ));
    assert!(close(
        Temperature::parse("32 degF").unwrap().kelvin(),
        273.15,
        1e-12
    ));
    // −40 is the same on both scales (follows from the two definitions above).
    let a = Temperature::parse("-40 °C").unwrap().kelvin();
    let b = Temperature::parse("-40 °F").unwrap().kelvin();
    assert!(close(a, b, 1e-12));
    assert!(close(
        Temperature::parse("283.15 K").unwrap().celsius(),
        10.0,
        1e-12
    ));
}

#[test]
fn other_dimensions() {
    // 3rd CGPM (1901): g_n = 9.806 65 m/s².
    assert!(close(
        Acceleration::parse("1 g").unwrap().mps2(),
        9.806_65,
        1e-15
    ));
    assert!(close(
        Acceleration::parse("250 mg").unwrap().mps2(),
        2.451_662_5,
        1e-12
    ));
    // NIST SP 811 B.8: square foot = 9.290 304 E-02 m² (exact).
    assert!(close(
        Area::parse("1 ft²").unwrap().m2(),
        9.290_304e-2,
        1e-15
    ));
    assert!(close(
        Area::parse("1 ft^2").unwrap().m2(),
        9.290_304e-2,
        1e-15
    ));
    assert!(close(Duration::parse("2 min").unwrap().s(), 120.0, 1e-15));
    assert!(close(Duration::parse("1.5 h").unwrap().s(), 5400.0, 1e-15));
    // Conversion back out.
    assert!(close(
        Speed::from_mps(13.4112).in_unit("mph").unwrap(),
        30.0,
        1e-12
    ));
}

#[test]
fn wrong_dimension_is_refused_naming_the_units() {
    let e = Length::parse("18 lb").unwrap_err();
    assert_eq!(
        e,
        UnitError::WrongDimension {
            unit: "lb".into(),
            unit_dim: Dim::Mass,
            expected: Dim::Length
        }
    );
    let msg = e.to_string();
    assert!(msg.contains("unit of mass"), "{msg}");
    assert!(msg.contains("m, mm, cm, km, in, ft, yd"), "{msg}");
    // A speed where a torque is expected.
    assert!(matches!(
        Torque::parse("30 mph"),
        Err(UnitError::WrongDimension {
            unit_dim: Dim::Speed,
            ..
        })
    ));
}

#[test]
fn bad_texts_are_refused() {
    assert!(matches!(
        Length::parse("5 furlongs"),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        Length::parse("abc"),
        Err(UnitError::NoNumber { .. })
    ));
    assert!(matches!(
        Length::parse("   "),
        Err(UnitError::Empty(Dim::Length))
    ));
    assert!(matches!(
        Length::parse("NaN m"),
        Err(UnitError::NotFinite { .. })
    ));
    assert!(matches!(
        Length::parse("1e400 m"),
        Err(UnitError::NotFinite { .. })
    ));
    // A bare number may be given another unit by the caller.
    assert!(close(
        Angle::parse_or("35", "deg").unwrap().deg(),
        35.0,
        1e-12
    ));
}

#[test]
fn toml_values_are_numbers_or_strings_with_units() {
    #[derive(serde::Deserialize)]
    struct Doc {
        a: Length,
        b: Length,
        c: Length,
        t: Temperature,
    }
    let d: Doc = toml::from_str("a = 2\nb = 0.5\nc = \"45 in\"\nt = \"50 F\"\n").unwrap();
    assert!(close(d.a.m(), 2.0, 1e-15));
    assert!(close(d.b.m(), 0.5, 1e-15));
    assert!(close(d.c.m(), 1.143, 1e-15));
    assert!(close(d.t.kelvin(), 283.15, 1e-12));
    let e = toml::from_str::<Doc>("a = \"18 lb\"\nb = 1\nc = 1\nt = 1\n")
        .err()
        .unwrap();
    assert!(e.message().contains("unit of mass"), "{}", e.message());
}
