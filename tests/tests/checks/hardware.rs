//! Counterweight hardware: ISO metric threads, thread stripping, bolt groups
//! and shaft bending, against published tables and worked examples.
//!
//! Units follow `standfast::hardware`: mm, mm², MPa, N, N·m.

use approx::assert_abs_diff_eq;
use core::f32::consts::PI;
use standfast::hardware::bolt::{circle_max_tension_n, MAX_SCREWS};
use standfast::hardware::material::{self, StrengthBasis};
use standfast::hardware::shaft::{bending_stress_mpa, check_shaft_bending};
use standfast::hardware::strip::{
    check_stripping, engagement_for_load_mm, equal_strength_engagement_mm, external_shear_area_mm2,
    internal_shear_area_mm2,
};
use standfast::hardware::thread::TABLE;
use standfast::hardware::{
    BoltPattern, FailureMode, IsoThread, JointLoad, LimitsSource, PivotLine, ShaftLoad,
    ShaftSection, ShearFactor, StrippingInput, ThreadLimits, ThreadSide,
};
use standfast::ErrorKind;

fn thread(name: &str) -> IsoThread {
    IsoThread::by_name(name).unwrap()
}

// ---------------------------------------------------------------------------
// ISO 68-1 / ISO 724 basic dimensions, ISO 898-1 tensile stress areas
// ---------------------------------------------------------------------------

/// ISO 724 basic pitch diameter d2 and minor diameter D1, and the external
/// root diameter d3 of ISO 898-1, all to 3 decimals as tabulated. Source: the
/// ISO 724 table and the ISO 68-1 profile relations (M5, M6, M8, M10 checked
/// against Yamawa's published tap-limit tables, M10 d3 = 8.160 against the
/// icad.pl ISO thread calculator; the other sizes derived from ISO 68-1).
#[test]
// The M4 root diameter 3.141 mm is a thread dimension, not an approximation of π.
#[allow(clippy::approx_constant)]
fn iso_724_basic_dimensions() {
    // (name, d2, D1, d3), mm
    let table = [
        ("M3", 2.675, 2.459, 2.387),
        ("M4", 3.545, 3.242, 3.141),
        ("M5", 4.480, 4.134, 4.019),
        ("M6", 5.350, 4.917, 4.773),
        ("M8", 7.188, 6.647, 6.466),
        ("M10", 9.026, 8.376, 8.160),
        ("M12", 10.863, 10.106, 9.853),
        ("M16", 14.701, 13.835, 13.546),
        ("M20", 18.376, 17.294, 16.933),
    ];
    for (name, d2, d1, d3) in table {
        let t = thread(name);
        // Half a unit of the third decimal, plus f32 rounding.
        assert_abs_diff_eq!(t.pitch_diameter_mm(), d2, epsilon = 6e-4);
        assert_abs_diff_eq!(t.internal_minor_diameter_mm(), d1, epsilon = 6e-4);
        assert_abs_diff_eq!(t.external_minor_diameter_mm(), d3, epsilon = 6e-4);
    }
}

/// Nominal tensile stress areas As of ISO 898-1 (tabulated to three
/// significant figures; Optimas and usefastener reproductions of the EN ISO
/// 898-1 tables; checked).
#[test]
fn iso_898_1_tensile_stress_areas() {
    // (name, As mm², half a unit of the last tabulated digit)
    let table = [
        ("M3", 5.03, 0.005),
        ("M4", 8.78, 0.005),
        ("M5", 14.2, 0.05),
        ("M6", 20.1, 0.05),
        ("M8", 36.6, 0.05),
        ("M10", 58.0, 0.05),
        ("M12", 84.3, 0.05),
        ("M16", 157.0, 0.5),
        ("M20", 245.0, 0.5),
    ];
    for (name, area, tol) in table {
        assert_abs_diff_eq!(thread(name).tensile_stress_area_mm2(), area, epsilon = tol);
    }
}

/// ISO 898-1 minimum ultimate tensile loads of property class 8.8 (N, as
/// tabulated; Optimas and usefastener reproductions of EN ISO 898-1,
/// checked) against As × the class 8.8 Rm,min constants (from
/// memory): checks the material table through an independent published
/// table. Tolerance 0.5 %, the rounding of the tabulated loads.
#[test]
fn class_8_8_ultimate_loads_match_iso_898_1() {
    let table = [
        ("M3", 4020.0),
        ("M4", 7020.0),
        ("M5", 11350.0),
        ("M6", 16100.0),
        ("M8", 29200.0),
        ("M10", 46400.0),
        ("M12", 67400.0),
        ("M16", 125_000.0),
        ("M20", 203_000.0),
    ];
    for (name, load) in table {
        let t = thread(name);
        let m = material::Material::bolt_class_8_8(t.nominal_mm);
        let f = t.tensile_stress_area_mm2() * m.ultimate_mpa();
        assert!((f / load - 1.0).abs() < 0.005, "{name}: {f} vs {load}");
    }
}

/// ISO 68-1 profile ordering d3 < D1 < d2 < d, and As between the circles on
/// d3 and d2 (As is the circle on (d2 + d3)/2, ISO 898-1).
#[test]
fn profile_ordering_for_every_size() {
    for t in TABLE {
        let (d, d2, d1, d3) = (
            t.nominal_mm,
            t.pitch_diameter_mm(),
            t.internal_minor_diameter_mm(),
            t.external_minor_diameter_mm(),
        );
        assert!(d3 < d1 && d1 < d2 && d2 < d, "{}", t.name);
        let a = t.tensile_stress_area_mm2();
        assert!(
            PI / 4.0 * d3 * d3 < a && a < PI / 4.0 * d2 * d2,
            "{}",
            t.name
        );
        // Fundamental triangle H = √3/2·P (ISO 68-1).
        assert_abs_diff_eq!(
            t.fundamental_height_mm(),
            3.0_f32.sqrt() / 2.0 * t.pitch_mm,
            epsilon = 1e-5
        );
    }
}

#[test]
fn lookups_and_typed_errors() {
    assert_eq!(IsoThread::by_nominal_mm(16.0).unwrap().name, "M16");
    assert_eq!(IsoThread::by_name("m20x2.5").unwrap().name, "M20");
    let e = IsoThread::by_nominal_mm(7.0).unwrap_err();
    assert_eq!(
        (e.kind, e.field),
        (
            ErrorKind::Unreachable,
            standfast::error::Field::ThreadNominalMm
        )
    );
    let e = IsoThread::by_nominal_mm(f32::NAN).unwrap_err();
    assert_eq!(e.kind, ErrorKind::NotFinite);
    let e = IsoThread::by_nominal_mm(2.0).unwrap_err();
    assert_eq!(e.kind, ErrorKind::OutOfRange);
    assert!((e.min - 3.0).abs() < 1e-6);
    assert_eq!(
        IsoThread::by_name("bolt").unwrap_err().field,
        standfast::error::Field::ThreadName
    );
    // Tabulated 6g/6H limits for M6 and M10 only; basic profile otherwise.
    assert_eq!(thread("M10").limits().source, LimitsSource::Class6g6H);
    assert_eq!(thread("M6").limits().source, LimitsSource::Class6g6H);
    assert_eq!(thread("M8").limits().source, LimitsSource::BasicProfile);
    assert!(thread("M8").class_6g6h_limits().is_none());
}

// ---------------------------------------------------------------------------
// Thread stripping, FED-STD-H28/2B as given in Machinery's Handbook
// ---------------------------------------------------------------------------

/// M10 6g/6H, engagement for equal strength by H28/2B formula 1
/// (Machinery's Handbook, "Strength of screw threads"). Hand calculation
/// (derived) from the ISO 965 6g/6H limits (checked: icad.pl calculator and
/// the CRC example below):
/// D1max = 8.676, d2min = 8.862, dmin = 9.732, D2max = 9.206, n = 1/1.5;
/// ASs/Le = π·8.676·[0.5 + 0.57735·(8.862 − 8.676)/1.5] = 15.58 mm²/mm;
/// ASn/Le = π/1.5·9.732·[0.75 + 0.57735·(9.732 − 9.206)] = 21.48 mm²/mm;
/// Le = 2·58.0/15.58 = 7.45 mm (At = 58.0 mm², ISO 898-1).
#[test]
fn m10_equal_strength_engagement_h28_formula_1() {
    let l = thread("M10").class_6g6h_limits().unwrap();
    assert_abs_diff_eq!(
        external_shear_area_mm2(&l, 1.0).unwrap(),
        15.58,
        epsilon = 0.005
    );
    assert_abs_diff_eq!(
        internal_shear_area_mm2(&l, 1.0).unwrap(),
        21.48,
        epsilon = 0.005
    );
    assert_abs_diff_eq!(
        equal_strength_engagement_mm(&l, 58.0).unwrap(),
        7.45,
        epsilon = 0.005
    );
}

/// Published worked example: CRC / Taylor & Francis handbook chapter, DOI
/// 10.1201/9781482273786-99 (checked; the book's title not confirmed). An M10×1.5-6g class
/// 10.9 screw in a 6H tapped hole in aluminium: screw load 1200 MPa × 58 mm²
/// = 69 600 N, aluminium shear strength 130 MPa, Ds,min = 9.968 mm,
/// En,max = 9.206 mm; published result Le = 21.6 mm.
///
/// Subtlety: 9.968 mm is the 6g **maximum** major diameter; the true 6g
/// minimum is 9.732 mm, which needs Le = 24.9 mm (derived by hand). The
/// example is reproduced with the published 9.968 and then with 9.732.
#[test]
fn crc_handbook_m10_into_aluminium() {
    let load_n = 1200.0 * 58.0;
    let published = ThreadLimits::new(1.5, 9.968, 8.862, 8.676, 9.206).unwrap();
    assert_eq!(published.source, LimitsSource::Caller);
    let le = engagement_for_load_mm(&published, ThreadSide::Internal, load_n, 130.0).unwrap();
    // Published to one decimal: 21.6 mm (re-computed 21.55).
    assert_abs_diff_eq!(le, 21.6, epsilon = 0.06);
    let true_min = thread("M10").class_6g6h_limits().unwrap();
    let le = engagement_for_load_mm(&true_min, ThreadSide::Internal, load_n, 130.0).unwrap();
    assert_abs_diff_eq!(le, 24.9, epsilon = 0.05);
}

/// M6 class 8.8 screw in a 6061-T6 plate, Le = 9 mm, 6g/6H (derived by
/// hand from the FED-STD-H28/2B internal shear area; M6 dmin 5.794 from a
/// Mastik ISO 965 table, checked; D2max 5.500 from memory): ASn = 12.19 mm²/mm × 9 = 109.7 mm²; τ = 0.6 × 290 MPa
/// (6061-T6 plate ultimate minimum, ASTM B209, confirmed) = 174 MPa;
/// F_strip ≈ 19.1 kN. The screw breaks first at its ISO 898-1 minimum
/// ultimate load 16.1 kN (confirmed); the engagement matching it is 7.6 mm.
#[test]
fn m6_screw_in_6061_t6_plate() {
    let t = thread("M6");
    let r = check_stripping(&StrippingInput {
        limits: t.limits(),
        tensile_area_mm2: t.tensile_stress_area_mm2(),
        engagement_mm: 9.0,
        screw: material::BOLT_8_8_UP_TO_M16,
        internal: material::AL_6061_T6_PLATE_MIN,
        shear_factor: ShearFactor::CommonPractice,
        basis: StrengthBasis::Ultimate,
        safety_factor: 1.0,
    })
    .unwrap();
    assert_abs_diff_eq!(r.internal_shear_area_mm2, 109.7, epsilon = 0.06);
    assert_abs_diff_eq!(r.internal_strip_n, 19_100.0, epsilon = 50.0);
    assert_abs_diff_eq!(r.screw_tension_n, 16_100.0, epsilon = 50.0);
    assert_eq!(r.governs, FailureMode::ScrewTension);
    assert_abs_diff_eq!(r.allowable_n, r.screw_tension_n);
    assert_abs_diff_eq!(r.engagement_to_match_screw_mm, 7.6, epsilon = 0.05);
    // The aluminium is the weaker thread: J > 1 (H28/2B appendix A).
    assert!(r.strength_ratio_j > 1.0);
}

/// Same joint at a working load: yield basis, von Mises shear factor
/// 1/√3, safety factor 2. Hand calculation from the H28/2B areas
/// (Machinery's Handbook) and the listed minimums: internal
/// 109.7 mm² × 0.57735 × 241 MPa / 2 = 7633 N; screw 20.12 mm² × 640 / 2
/// = 6439 N, which governs.
#[test]
fn m6_working_load_von_mises() {
    let t = thread("M6");
    let mut input = StrippingInput {
        limits: t.limits(),
        tensile_area_mm2: t.tensile_stress_area_mm2(),
        engagement_mm: 9.0,
        screw: material::BOLT_8_8_UP_TO_M16,
        internal: material::AL_6061_T6_PLATE_MIN,
        shear_factor: ShearFactor::VonMises,
        basis: StrengthBasis::Yield,
        safety_factor: 2.0,
    };
    let r = check_stripping(&input).unwrap();
    assert_abs_diff_eq!(r.internal_strip_n, 7633.2, epsilon = 2.0);
    assert_abs_diff_eq!(r.screw_tension_n, 6439.5, epsilon = 1.0);
    assert_eq!(r.governs, FailureMode::ScrewTension);
    assert_abs_diff_eq!(r.utilisation(r.allowable_n).unwrap(), 1.0, epsilon = 1e-6);
    // Half the engagement: now the tapped aluminium strips first.
    input.engagement_mm = 4.5;
    let r = check_stripping(&input).unwrap();
    assert_eq!(r.governs, FailureMode::InternalThreadStrip);
    assert_abs_diff_eq!(r.allowable_n, 3816.6, epsilon = 1.5);
    // Tresca (0.5) is below von Mises, common practice (0.6) above.
    input.shear_factor = ShearFactor::Tresca;
    let lo = check_stripping(&input).unwrap().allowable_n;
    input.shear_factor = ShearFactor::CommonPractice;
    let hi = check_stripping(&input).unwrap().allowable_n;
    assert!(lo < r.allowable_n && r.allowable_n < hi);
}

/// Property: the shear areas are proportional to the engagement length
/// (the H28 formulas are linear in Le), for every size and both sides.
#[test]
fn shear_areas_grow_linearly_with_engagement() {
    for t in TABLE {
        let l = t.limits();
        let a1 = external_shear_area_mm2(&l, 1.0).unwrap();
        let n1 = internal_shear_area_mm2(&l, 1.0).unwrap();
        assert!(a1 > 0.0 && n1 > 0.0);
        for k in 1..=40 {
            let le = 0.75 * k as f32;
            let a = external_shear_area_mm2(&l, le).unwrap();
            let n = internal_shear_area_mm2(&l, le).unwrap();
            assert_abs_diff_eq!(a / (a1 * le), 1.0, epsilon = 1e-5);
            assert_abs_diff_eq!(n / (n1 * le), 1.0, epsilon = 1e-5);
            let split = external_shear_area_mm2(&l, 0.3 * le).unwrap()
                + external_shear_area_mm2(&l, 0.7 * le).unwrap();
            assert_abs_diff_eq!(split / a, 1.0, epsilon = 1e-5);
        }
        // At the equal-strength length the external area is 2·At (H28 formula 1).
        let at = t.tensile_stress_area_mm2();
        let le = equal_strength_engagement_mm(&l, at).unwrap();
        assert_abs_diff_eq!(
            external_shear_area_mm2(&l, le).unwrap() / at,
            2.0,
            epsilon = 1e-4
        );
    }
}

/// Basic-profile shortcut (derived here from the FED-STD-H28/2B formulas with
/// d2 − D1 = 0.4330·P and d − D2 = 0.6495·P): ASs = 0.75·π·D1·Le,
/// ASn = 0.875·π·d·Le.
#[test]
fn basic_profile_shortcut_areas() {
    for t in TABLE {
        let l = t.basic_limits();
        let le = 1.5 * t.nominal_mm;
        let ass = external_shear_area_mm2(&l, le).unwrap();
        let asn = internal_shear_area_mm2(&l, le).unwrap();
        assert_abs_diff_eq!(
            ass / (0.75 * PI * t.internal_minor_diameter_mm() * le),
            1.0,
            epsilon = 2e-4
        );
        assert_abs_diff_eq!(asn / (0.875 * PI * t.nominal_mm * le), 1.0, epsilon = 2e-4);
    }
}

#[test]
fn stripping_errors_name_fields() {
    let t = thread("M8");
    let base = StrippingInput {
        limits: t.limits(),
        tensile_area_mm2: t.tensile_stress_area_mm2(),
        engagement_mm: 8.0,
        screw: material::BOLT_8_8_UP_TO_M16,
        internal: material::STEEL_S235_MIN,
        shear_factor: ShearFactor::CommonPractice,
        basis: StrengthBasis::Yield,
        safety_factor: 2.0,
    };
    let mut i = base;
    i.engagement_mm = -1.0;
    assert_eq!(
        check_stripping(&i).unwrap_err().field,
        standfast::error::Field::StripEngagementMm
    );
    let mut i = base;
    i.tensile_area_mm2 = f32::INFINITY;
    let e = check_stripping(&i).unwrap_err();
    assert_eq!(
        (e.kind, e.field),
        (
            ErrorKind::NotFinite,
            standfast::error::Field::StripTensileAreaMm2
        )
    );
    let mut i = base;
    i.limits.int_pitch_max_mm = 20.0;
    assert_eq!(
        check_stripping(&i).unwrap_err().field,
        standfast::error::Field::ThreadLimitsIntPitchMaxMm
    );
    let r = check_stripping(&base).unwrap();
    assert!(r.utilisation(-5.0).is_err());
}

// ---------------------------------------------------------------------------
// Bolt group under axial load and bending moment
// ---------------------------------------------------------------------------

/// n screws equally spaced on a circle, neutral axis through the centre:
/// F_max = 2M/(nR). M = 100 N·m, R = 40 mm gives 1666.7, 1250, 833.3, 625 N
/// for n = 3, 4, 6, 8 (bolted circular flange derivation, atreydes.com;
/// checked, and by a brute-force sweep over orientations). With a screw on the line perpendicular to the moment the
/// linear rule reaches this value exactly.
#[test]
fn bolt_circle_closed_form() {
    for (n, f) in [(3, 1666.7), (4, 1250.0), (6, 833.3), (8, 625.0)] {
        assert_abs_diff_eq!(
            circle_max_tension_n(n, 40.0, 100.0).unwrap(),
            f,
            epsilon = 0.05
        );
        // Screw 0 at +y; moment about +x pulls +y.
        let p = BoltPattern::circle(n, 40.0, PI / 2.0).unwrap();
        let r = p
            .tensions(
                JointLoad {
                    moment_x_nm: 100.0,
                    ..JointLoad::default()
                },
                PivotLine::Centroid,
            )
            .unwrap();
        assert_abs_diff_eq!(r.max_n, f, epsilon = 0.1);
        assert_eq!(r.max_index, 0);
        // Σy² = n·R²/2 (same source).
        assert_abs_diff_eq!(r.sum_sq_lever_mm2 / (n as f32 * 800.0), 1.0, epsilon = 1e-5);
    }
    assert!(circle_max_tension_n(2, 40.0, 100.0).is_err());
}

/// Unequal lever arms about a pivot line: screws at y = 10, 10, 90, 90 mm
/// from the pivot, M = 100 N·m. Linear rule (derived; the
/// bending analogue of Shigley ch. 8, F = M·r/Σr²): hand calculation
/// 100 000 N·mm × 90 / (2·10² + 2·90²) = 548.8 N in the outer screws, above
/// the 500 N of the non-conservative "M / Σ lever arms" shortcut.
#[test]
fn unequal_arms_about_a_pivot_line() {
    let p = BoltPattern::new(&[[-20.0, 10.0], [20.0, 10.0], [-20.0, 90.0], [20.0, 90.0]]).unwrap();
    // Centroid at y = 50; the pivot line y = 0 lies 50 mm on the compression side.
    let r = p
        .tensions(
            JointLoad {
                moment_x_nm: 100.0,
                ..JointLoad::default()
            },
            PivotLine::Heel { offset_mm: 50.0 },
        )
        .unwrap();
    assert_abs_diff_eq!(r.max_n, 548.8, epsilon = 0.05);
    assert!(r.max_index >= 2);
    assert_abs_diff_eq!(r.forces_n[0], 1_000_000.0 / 16_400.0, epsilon = 0.01);
    assert!(r.max_n > 100_000.0 / 200.0);
}

/// Same six-screw pattern tipping about the flange edge: n = 6, R = 40 mm,
/// heel at R_f = 55 mm, M = 100 N·m gives F_max = M·(R_f + R)/(n·R_f² +
/// n·R²/2) = 413.9 N (derived by the linear rule), less than the 833.3 N about
/// the centre.
#[test]
fn six_screws_about_the_flange_edge() {
    let p = BoltPattern::circle(6, 40.0, PI / 2.0).unwrap();
    let load = JointLoad {
        moment_x_nm: 100.0,
        ..JointLoad::default()
    };
    let r = p
        .tensions(load, PivotLine::Heel { offset_mm: 55.0 })
        .unwrap();
    assert_abs_diff_eq!(r.max_n, 413.9, epsilon = 0.05);
    let c = p.tensions(load, PivotLine::Centroid).unwrap();
    assert!(r.max_n < c.max_n);
}

/// Small deterministic generator for the property sweeps.
struct Lcg(u32);
impl Lcg {
    fn next(&mut self) -> f32 {
        self.0 = self.0.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
        (self.0 >> 8) as f32 / (1u32 << 24) as f32
    }
}

/// Property: rotating an equally spaced circular pattern (n ≥ 3) under a
/// moment of any direction leaves Σy² = n·R²/2 unchanged, so the most loaded
/// screw never exceeds 2M/(nR); it stays at or above cos(π/n) of that value,
/// since some screw is always within π/n of the tension side.
#[test]
fn rotated_circle_patterns_keep_the_bound() {
    let mut g = Lcg(7);
    for n in 3..=MAX_SCREWS {
        for _ in 0..50 {
            let phase = g.next() * 2.0 * PI;
            let dir = g.next() * 2.0 * PI;
            let radius = 10.0 + 90.0 * g.next();
            let m = 1.0 + 200.0 * g.next();
            let p = BoltPattern::circle(n, radius, phase).unwrap();
            let r = p
                .tensions(
                    JointLoad {
                        axial_n: 0.0,
                        moment_x_nm: m * dir.cos(),
                        moment_y_nm: m * dir.sin(),
                    },
                    PivotLine::Centroid,
                )
                .unwrap();
            let bound = circle_max_tension_n(n, radius, m).unwrap();
            let nr2 = n as f32 * radius * radius / 2.0;
            assert_abs_diff_eq!(r.sum_sq_lever_mm2 / nr2, 1.0, epsilon = 1e-4);
            assert!(r.max_n <= bound * 1.0001);
            assert!(r.max_n >= bound * (PI / n as f32).cos() * 0.9999);
        }
    }
}

/// Properties of the linear rule for arbitrary patterns (statics): the screw
/// forces balance the axial load (centroid pivot: the bending shares sum to
/// zero) and their moment about the centroid equals the applied moment, both
/// components, also for unsymmetric patterns.
#[test]
fn arbitrary_patterns_are_in_equilibrium() {
    let mut g = Lcg(42);
    for trial in 0..200 {
        // Three or more screws: random triples are never collinear in practice.
        let n = 3 + trial % (MAX_SCREWS - 2);
        let mut pos = [[0.0_f32; 2]; MAX_SCREWS];
        for q in pos.iter_mut().take(n) {
            *q = [200.0 * g.next() - 100.0, 200.0 * g.next() - 100.0];
        }
        let p = BoltPattern::new(&pos[..n]).unwrap();
        let (mx, my, axial) = (
            100.0 * g.next() - 50.0,
            100.0 * g.next() - 50.0,
            2000.0 * g.next() - 1000.0,
        );
        let load = JointLoad {
            axial_n: axial,
            moment_x_nm: mx,
            moment_y_nm: my,
        };
        let r = p.tensions(load, PivotLine::Centroid).unwrap();
        let sum: f32 = r.forces_n[..n].iter().sum();
        assert_abs_diff_eq!(sum, axial, epsilon = 0.05 + 1e-4 * axial.abs());
        // Moment of the screw forces about the centroid, N·mm: Σ r × (0,0,F).
        let c = p.centroid_mm();
        let (mut rx, mut ry) = (0.0_f32, 0.0_f32);
        for (q, f) in pos[..n].iter().zip(&r.forces_n[..n]) {
            rx += (q[1] - c[1]) * f;
            ry -= (q[0] - c[0]) * f;
        }
        let tol = 1e-3 * 1000.0 * (mx.abs() + my.abs()) + 1.0;
        assert_abs_diff_eq!(rx, mx * 1000.0, epsilon = tol);
        assert_abs_diff_eq!(ry, my * 1000.0, epsilon = tol);
        assert!(
            r.forces_n[r.max_index] >= r.forces_n[..n].iter().copied().fold(f32::MIN, f32::max)
        );
    }
}

/// Two screws can resist only a moment whose vector is perpendicular to the
/// line joining them (statics); any component along that line is reported
/// as unreachable rather than silently dropped.
#[test]
fn two_screws_resist_only_the_perpendicular_moment() {
    let p = BoltPattern::new(&[[0.0, -30.0], [0.0, 30.0]]).unwrap();
    let about_x = JointLoad {
        moment_x_nm: 6.0,
        ..JointLoad::default()
    };
    // 6000 N·mm · 30 / (2 · 30²) = 100 N.
    let r = p.tensions(about_x, PivotLine::Centroid).unwrap();
    assert_abs_diff_eq!(r.max_n, 100.0, epsilon = 1e-3);
    assert_eq!(r.max_index, 1);
    let skew = JointLoad {
        moment_x_nm: 6.0,
        moment_y_nm: 1.0,
        ..JointLoad::default()
    };
    let e = p.tensions(skew, PivotLine::Centroid).unwrap_err();
    assert_eq!(
        (e.kind, e.field),
        (
            ErrorKind::Unreachable,
            standfast::error::Field::BoltPatternScrewsMm
        )
    );
}

/// An L-shaped (unsymmetric) pattern: the neutral axis is not parallel to the
/// moment, and the unsymmetric-bending solution differs from the naive
/// M·y/Σy² rule. Hand calculation (rigid flange, Shigley's linear
/// assumption): screws at (0, 0), (60, 0), (0, 60) mm, centroid (20, 20);
/// relative (−20, −20), (40, −20), (−20, 40); Sxx = Syy = 2400, Sxy = −1200,
/// D = 4.32·10⁶; Mx = 10 N·m → A = 10 000·2400/D = 5.5556 N/mm,
/// B = 10 000·(−1200)/D = −2.7778 N/mm; F = A·y − B·x: −166.67, 0, 166.67 N.
#[test]
fn l_shaped_pattern_unsymmetric_bending() {
    let p = BoltPattern::new(&[[0.0, 0.0], [60.0, 0.0], [0.0, 60.0]]).unwrap();
    let r = p
        .tensions(
            JointLoad {
                moment_x_nm: 10.0,
                ..JointLoad::default()
            },
            PivotLine::Centroid,
        )
        .unwrap();
    assert_abs_diff_eq!(r.forces_n[0], -166.67, epsilon = 0.01);
    assert_abs_diff_eq!(r.forces_n[1], 0.0, epsilon = 0.01);
    assert_abs_diff_eq!(r.forces_n[2], 166.67, epsilon = 0.01);
    // The naive rule would give 10 000·40/2400 = 166.67 for screw 2 too, but
    // −83.3 for screw 1: not in equilibrium about y.
    assert_eq!(r.max_index, 2);
}

// ---------------------------------------------------------------------------
// Counterweight shaft load and bending
// ---------------------------------------------------------------------------

/// Statics of a point mass (W = m·g, g = 9.80665 m/s², ISO 80000-3): with the
/// counterweight shaft horizontal the joint carries the full moment
/// m·g·L and no axial load; hanging vertically it carries pure axial pull m·g
/// and no moment. 5 kg at 0.25 m: 12.258 N·m, 49.03 N.
#[test]
fn counterweight_shaft_classic_poses() {
    let flat = ShaftLoad::counterweight(5.0, 0.25, PI / 2.0).unwrap();
    assert_abs_diff_eq!(flat.moment_nm, 12.258, epsilon = 1e-3);
    assert_abs_diff_eq!(flat.axial_n, 0.0, epsilon = 1e-4);
    let hang = ShaftLoad::counterweight(5.0, 0.25, 0.0).unwrap();
    assert_abs_diff_eq!(hang.moment_nm, 0.0, epsilon = 1e-6);
    assert_abs_diff_eq!(hang.axial_n, 49.033, epsilon = 1e-3);
    // At 60° from hanging: m·g·cos 60° and m·g·L·sin 60°.
    let tilted = ShaftLoad::counterweight(5.0, 0.25, PI / 3.0).unwrap();
    assert_abs_diff_eq!(tilted.axial_n, 24.517, epsilon = 1e-3);
    assert_abs_diff_eq!(tilted.moment_nm, 10.616, epsilon = 1e-3);
    // Two weights add up.
    let both = flat + ShaftLoad::counterweight(2.0, 0.1, PI / 2.0).unwrap();
    assert_abs_diff_eq!(both.moment_nm, 12.258 + 1.961, epsilon = 2e-3);
    let e = ShaftLoad::counterweight(-1.0, 0.25, 0.0).unwrap_err();
    assert_eq!(e.field, standfast::error::Field::ShaftLoadMassKg);

    // Four screws on a 40 mm circle under it: hanging, an equal share of the
    // pull; horizontal, the bolt-circle value 2M/(nR) (atreydes.com).
    let p = BoltPattern::circle(4, 20.0, PI / 2.0).unwrap();
    let h = p
        .tensions(hang.as_joint_load(), PivotLine::Centroid)
        .unwrap();
    assert_abs_diff_eq!(h.max_n, 49.033 / 4.0, epsilon = 1e-3);
    let f = p
        .tensions(flat.as_joint_load(), PivotLine::Centroid)
        .unwrap();
    assert_abs_diff_eq!(f.max_n, 2.0 * 12_258.3 / (4.0 * 20.0), epsilon = 0.05);
}

/// σ = 32·M/(π·d³): M = 50 N·m, d = 20 mm gives 63.66 MPa (Shigley ch. 3;
/// Roark, *Formulas for Stress and Strain*; checked). Hollow form σ = 32·M·D/(π·(D⁴ − d⁴))
/// (same sources): with a 10 mm bore, 63.66 × 16/15 = 67.91 MPa.
#[test]
fn shaft_bending_stress() {
    let solid = ShaftSection::solid(20.0).unwrap();
    assert_abs_diff_eq!(
        bending_stress_mpa(50.0, &solid).unwrap(),
        63.66,
        epsilon = 0.005
    );
    let tube = ShaftSection::hollow(20.0, 10.0).unwrap();
    assert_abs_diff_eq!(
        bending_stress_mpa(50.0, &tube).unwrap(),
        67.91,
        epsilon = 0.005
    );
    // Sign of the moment does not matter for the outer-fibre stress.
    assert_abs_diff_eq!(
        bending_stress_mpa(-50.0, &solid).unwrap(),
        63.66,
        epsilon = 0.005
    );
}

/// Threaded M20 counterweight shaft, horizontal, 8 kg at 0.3 m, S235
/// (EN 10025-2 minimum yield 235 MPa, confirmed), safety factor 2. Hand
/// calculation with Shigley's σ = 32M/(πd³) on d3 = 16.933 mm (ISO 898-1):
/// M = 8 × 9.80665 × 0.3 = 23.536 N·m; S = π·16.933³/32 = 476.6 mm³;
/// σ = 49.38 MPa; utilisation 49.38 / 117.5 = 0.420.
#[test]
fn threaded_shaft_root_under_counterweight() {
    let load = ShaftLoad::counterweight(8.0, 0.3, PI / 2.0).unwrap();
    let sec = ShaftSection::threaded_root(&thread("M20"));
    let r = check_shaft_bending(
        load.moment_nm,
        &sec,
        &material::STEEL_S235_MIN,
        StrengthBasis::Yield,
        2.0,
    )
    .unwrap();
    assert_abs_diff_eq!(r.section_modulus_mm3, 476.64, epsilon = 0.1);
    assert_abs_diff_eq!(r.stress_mpa, 49.38, epsilon = 0.02);
    assert_abs_diff_eq!(r.utilisation, 0.420, epsilon = 0.001);
    // Hanging vertically the shaft root sees no bending.
    let hang = ShaftLoad::counterweight(8.0, 0.3, 0.0).unwrap();
    let r = check_shaft_bending(
        hang.moment_nm,
        &sec,
        &material::STEEL_S235_MIN,
        StrengthBasis::Yield,
        2.0,
    )
    .unwrap();
    assert!(r.utilisation < 1e-6);
}

/// Property: for a solid section σ·d³ is constant (σ ∝ 1/d³), and a bore
/// always raises the stress.
#[test]
fn bending_stress_scales_with_diameter_cubed() {
    let k = bending_stress_mpa(10.0, &ShaftSection::solid(10.0).unwrap()).unwrap() * 1000.0;
    for i in 1..=30 {
        let d = 2.0 * i as f32;
        let s = bending_stress_mpa(10.0, &ShaftSection::solid(d).unwrap()).unwrap();
        assert_abs_diff_eq!(s * d * d * d / k, 1.0, epsilon = 1e-5);
        let h = bending_stress_mpa(10.0, &ShaftSection::hollow(d, 0.5 * d).unwrap()).unwrap();
        assert!(h > s);
    }
}

/// Listed materials carry their specification values (SOURCES.md lists each):
/// spot checks of the minimums of ASTM B221 (Keymark table) / B209 (Ashland
/// table), EN 755-2, EN 10025-2 Table 7 and ASTM A276 (checked) and typical
/// 7075-T6 (from memory).
#[test]
fn material_table_values() {
    let cases = [
        (material::AL_6061_T6_EXTRUSION_MIN, 241.0, 262.0),
        (material::AL_6061_T6_PLATE_MIN, 241.0, 290.0),
        (material::AL_6063_T6_EXTRUSION_MIN, 172.0, 207.0),
        (material::AL_6082_T6_BAR_MIN, 250.0, 295.0),
        (material::AL_7075_T6_TYPICAL, 503.0, 572.0),
        (material::STEEL_S235_MIN, 235.0, 360.0),
        (material::STEEL_S355_MIN, 355.0, 470.0),
        (material::STAINLESS_304_ANNEALED_MIN, 205.0, 515.0),
        (material::BOLT_8_8_UP_TO_M16, 640.0, 800.0),
    ];
    for (m, y, u) in cases {
        assert_abs_diff_eq!(m.yield_mpa(), y);
        assert_abs_diff_eq!(m.ultimate_mpa(), u);
    }
    let free = material::Material::new(150.0, 200.0).unwrap();
    assert_abs_diff_eq!(free.strength_mpa(StrengthBasis::Ultimate), 200.0);
    let e = material::Material::new(250.0, 200.0).unwrap_err();
    assert_eq!(
        (e.kind, e.field),
        (
            ErrorKind::OutOfRange,
            standfast::error::Field::MaterialUltimateMpa
        )
    );
}
