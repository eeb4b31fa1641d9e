//! What-if replays: the same logs through a variant rig built from
//! `--what-if` overrides, side by side.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::process::Command;

use standfast::frame::Tilt;
use standfast::rig::Conditions;
use standfast_sim::input::log::{ErrorPolicy, LogProfile, Merger};
use standfast_sim::input::rigfile::{self, LoadedRig};
use standfast_sim::model::replay::{replay, ReplayOptions, ReplayReport};
use standfast_sim::model::whatif::{self, CoverMode, Override};

fn demo_rig_path() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")
}

fn demo_rig() -> LoadedRig {
    rigfile::load(&demo_rig_path()).unwrap()
}

/// Foot circle radius of the demo rig (host-sim/demo/rig.toml,
/// `tripod.foot_circle_radius`), m.
const DEMO_FOOT_CIRCLE_M: f64 = 0.475;

/// An invented night: a level rig (accelerometer +1 g on z, with a little
/// noise) in a wind from the west ramping from 2 m/s by 0.03 m/s a second
/// for 1200 s, one row a second.
fn ramp_log(dir: &Path) -> PathBuf {
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for i in 0..1200_u32 {
        let t = 1_700_000_000 + i;
        writeln!(
            csv,
            "{t},{},0,1,{:.2},{}",
            f64::from(i % 3) * 1e-4,
            2.0 + 0.03 * f64::from(i),
            269 + i % 3
        )
        .unwrap();
    }
    std::fs::write(dir.join("ramp.csv"), csv).unwrap();
    crate::common::one_file_profile(dir, "ramp")
}

fn assert_close(got: f64, want: f64, max_relative: f64) {
    assert!(
        (got - want).abs() <= max_relative * want.abs().max(got.abs()),
        "{got} is not within {max_relative} (relative) of {want}"
    );
}

fn run(profile: &Path, rigs: &[LoadedRig]) -> ReplayReport {
    let p = LogProfile::load(profile).unwrap();
    let mut m = Merger::open(&p, ErrorPolicy::Stop).unwrap();
    replay(rigs, &mut m, ReplayOptions::default(), None).unwrap()
}

#[test]
fn overrides_parse_with_units() {
    // Unit factors: 1 lb = 0.453 592 37 kg exactly (international yard and
    // pound agreement, 1959); 1 in = 25.4 mm exactly (same agreement).
    match whatif::parse_override("ballast=22 lb@0 in,0 in,12 in").unwrap() {
        Override::Ballast {
            mass_kg,
            position_m,
        } => {
            assert_close(mass_kg, 22.0 * 0.453_592_37, 1e-12);
            assert_close(position_m[2], 12.0 * 0.0254, 1e-12);
        }
        o => panic!("{o:?}"),
    }
    // One unit after the last coordinate applies to all three
    // (1 cm = 0.01 m, SI prefixes).
    match whatif::parse_override("ballast=12 kg@10,-5,30 cm").unwrap() {
        Override::Ballast {
            mass_kg,
            position_m,
        } => {
            assert_close(mass_kg, 12.0, 1e-12);
            assert_close(position_m[0], 0.10, 1e-12);
            assert_close(position_m[1], -0.05, 1e-12);
            assert_close(position_m[2], 0.30, 1e-12);
        }
        o => panic!("{o:?}"),
    }
    assert_eq!(
        whatif::parse_override("cover=as-logged").unwrap(),
        Override::Cover(CoverMode::AsLogged)
    );
    // 1.5 min = 90 s (SI brochure, non-SI units accepted for use with SI).
    assert_eq!(
        whatif::parse_override("time_to_park=1.5 min").unwrap(),
        Override::TimeToPark(90.0)
    );
}

#[test]
fn added_ballast_lowers_the_closest_approach_by_the_lever_rule() {
    let dir = tempfile::tempdir().unwrap();
    let profile = ramp_log(dir.path());
    let base = demo_rig();
    let mass_kg = 10.0;
    let texts = vec![format!("ballast={mass_kg} kg@0,0,0")];
    let variant = whatif::variant_from_texts(&base, &texts).unwrap();
    let rep = run(&profile, &[base.clone(), variant]);
    let a = rep.rigs[0].overturning.clone().unwrap();
    let b = rep.rigs[1].overturning.clone().unwrap();
    assert!(
        b.utilisation < a.utilisation,
        "{} !< {}",
        b.utilisation,
        a.utilisation
    );

    // Hand check of the variant's figure (lever rule, moment = force ×
    // perpendicular distance: Meriam & Kraige, Engineering Mechanics:
    // Statics, ch. 2). A mass at the tripod centre on the ground adds
    // m·g·cosθ × (distance from the centre to each edge) to every edge's
    // stabilising moment and nothing to the overturning one; for three feet
    // on a circle of radius R that distance is the inradius of the
    // equilateral triangle, R/2 (Euclid, Elements IV; any geometry text).
    // The base rig's edge moments come from the core at the variant's
    // closest-approach conditions.
    let c = Conditions {
        pose: b.pose,
        tilt: Tilt::new(
            b.figures.tilt_deg.unwrap().to_radians(),
            b.figures.tilt_downhill_deg.unwrap().to_radians(),
        )
        .unwrap(),
        wind_speed_mps: b.figures.gust_mps.unwrap(),
        wind_from_rad: b.figures.wind_from_deg.unwrap().to_radians(),
        air: base.air,
        cover_fitted: false,
    };
    let assessment = base.rig.stability_figures(&c).unwrap();
    let g = 9.806_65; // standard gravity, ISO 80000-3
    let cos_tilt = f64::from(b.figures.tilt_deg.unwrap()).to_radians().cos();
    let extra_nm = mass_kg * g * cos_tilt * DEMO_FOOT_CIRCLE_M / 2.0;
    let expected = assessment
        .edges
        .iter()
        .map(|e| f64::from(e.overturning_nm) / (f64::from(e.stabilising_nm) + extra_nm))
        .fold(0.0, f64::max);
    assert_close(f64::from(b.utilisation), expected, 2e-3);
}

#[test]
fn a_lower_park_threshold_parks_earlier() {
    let dir = tempfile::tempdir().unwrap();
    let profile = ramp_log(dir.path());
    let base = demo_rig();
    // The demo rig parks at 0.65 (host-sim/demo/rig.toml, [guard]).
    assert_close(f64::from(base.guard.park_utilisation), 0.65, 1e-6);
    let lower = whatif::variant_from_texts(&base, &["park_utilisation=0.55".to_owned()]).unwrap();
    let rep = run(&profile, &[base, lower]);
    let cmp = whatif::compare(&rep);
    let (a, b) = (&cmp.rigs[0], &cmp.rigs[1]);
    let (ta, tb) = (a.first_park_t_s.unwrap(), b.first_park_t_s.unwrap());
    // On a rising wind a lower threshold is crossed first (the guard's park
    // rule: park when the predicted utilisation reaches the threshold); the
    // wind and so the figures are the same in both columns.
    assert!(tb < ta, "park at {tb} s with 0.55, {ta} s with 0.65");
    assert_close(
        f64::from(a.figures.overturning_utilisation.unwrap()),
        f64::from(b.figures.overturning_utilisation.unwrap()),
        1e-6,
    );
    let text = standfast_sim::render::whatif::comparison_text(&cmp, None);
    assert!(text.contains("A = ") && text.contains("B = "), "{text}");
    assert!(text.contains("park_utilisation=0.55"), "{text}");
    assert!(text.contains("first park request"), "{text}");
}

#[test]
fn a_bad_override_is_refused_with_its_range() {
    let dir = tempfile::tempdir().unwrap();
    let profile = ramp_log(dir.path());
    let run_cli = |what_if: &str| {
        Command::new(env!("CARGO_BIN_EXE_standfast"))
            .arg("replay")
            .arg("--rig")
            .arg(demo_rig_path())
            .arg("--profile")
            .arg(&profile)
            .arg("--what-if")
            .arg(what_if)
            .output()
            .unwrap()
    };
    // The core accepts a friction coefficient of 0 to 2 (core/src/rig.rs
    // `Rig::new`); the message names the override, the value and the range.
    // A bad option is a command-line error: exit code 2.
    let out = run_cli("friction=3");
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("friction") && err.contains("\"3\"") && err.contains("0 to 2"),
        "{err}"
    );
    assert!(out.stdout.is_empty());
    // The park threshold may not go below the watch threshold (0.5 in the
    // demo rig).
    let out = run_cli("park_utilisation=0.3");
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("park_utilisation") && err.contains("0.3") && err.contains("0.5 to 1"),
        "{err}"
    );
    // A cover word outside the set is named with the set.
    let out = run_cli("cover=maybe");
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("on, off, as-logged"), "{err}");

    // And a good one prints both columns and the cautions.
    let out = run_cli("ballast=12 kg@0,0,0.3 m");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    let side = text.find("Side by side").unwrap();
    let cautions = text.find("Cautions:").unwrap();
    assert!(side < cautions, "{text}");
}

#[test]
fn cover_on_counts_the_cover_all_night() {
    // The demo log has no cover channel; with cover=on the cover's mass
    // (1.5 kg) is on the rig all night (host-sim/demo/rig.toml, [cover]).
    let base = demo_rig();
    let on = whatif::variant_from_texts(&base, &["cover=on".to_owned()]).unwrap();
    let off = whatif::variant_from_texts(&base, &["cover=off".to_owned()]).unwrap();
    let mass = |r: &LoadedRig| -> f32 { r.rig.parts().iter().map(|p| p.mass_kg).sum() };
    // The base rig lists the cover as a part too (counted only while
    // fitted), so the totals of its parts are equal with cover=on and
    // 1.5 kg more than with the cover removed.
    assert_close(f64::from(mass(&on)), f64::from(mass(&base)), 1e-6);
    assert_close(f64::from(mass(&on) - mass(&off)), 1.5, 1e-4);
    assert!(off.spec.cover.is_none());
}

/// A log that reports the cover, replayed with `cover=off` and `cover=on`:
/// the variants set the cover themselves, so their guards take no cover
/// samples (a logged "fitted" on a rig without a cover is otherwise a
/// sensor fault on every row, as the base rig file would rightly get if its
/// `[cover]` were missing).
#[test]
fn cover_variants_take_no_cover_samples_from_the_log() {
    let dir = tempfile::tempdir().unwrap();
    let mut csv = String::from("t,ax,ay,az,speed,dir,cover\n");
    for i in 0..600_u32 {
        writeln!(
            csv,
            "{},{},0,1,{:.2},{},{}",
            1_700_000_000 + i,
            f64::from(i % 3) * 1e-4,
            3.0 + 0.01 * f64::from(i),
            269 + i % 3,
            u8::from(i >= 300)
        )
        .unwrap();
    }
    std::fs::write(dir.path().join("covered.csv"), csv).unwrap();
    let profile = crate::common::one_file_profile(dir.path(), "covered");
    let text =
        std::fs::read_to_string(&profile).unwrap() + "cover_fitted = { column = \"cover\" }\n";
    std::fs::write(&profile, text).unwrap();
    let base = demo_rig();
    let off = whatif::variant_from_texts(&base, &["cover=off".to_owned()]).unwrap();
    let on = whatif::variant_from_texts(&base, &["cover=on".to_owned()]).unwrap();
    assert!(base.cover_input && !off.cover_input && !on.cover_input);
    let rep = run(&profile, &[base, off, on]);
    let cover_faults = |i: usize| {
        rep.rigs[i]
            .faults
            .iter()
            .filter(|f| f.fault.contains("cover"))
            .count()
    };
    assert_eq!(cover_faults(0), 0, "{:?}", rep.rigs[0].faults);
    assert_eq!(cover_faults(1), 0, "{:?}", rep.rigs[1].faults);
    assert_eq!(cover_faults(2), 0, "{:?}", rep.rigs[2].faults);
    // The base rig saw the cover go on: its figures changed with it.
    assert_ne!(
        rep.rigs[0].final_level.name(),
        "sensor_fault",
        "{:?}",
        rep.rigs[0].faults
    );
    assert_ne!(rep.rigs[1].final_level.name(), "sensor_fault");
}

fn has_class(n: &roxmltree::Node<'_, '_>, c: &str) -> bool {
    n.attribute("class")
        .is_some_and(|a| a.split_whitespace().any(|x| x == c))
}

/// Issue 14: the what-if HTML draws ONE set of charts with the rigs
/// overlaid (each rig its own colour and line pattern, named in the
/// legend) and the side-by-side table of the text summary; before, the page
/// repeated every chart per rig and had no table, so each assertion below
/// failed.
#[test]
fn what_if_page_overlays_the_rigs_and_has_the_side_by_side_table() {
    let dir = tempfile::tempdir().unwrap();
    let profile = ramp_log(dir.path());
    let base = demo_rig();
    let heavier =
        whatif::variant_from_texts(&base, &["ballast=12 kg@0,0,0.2 m".to_owned()]).unwrap();
    let rigs = [base, heavier];
    let rep = run(&profile, &rigs);
    let charts = standfast_sim::model::charts::replay_charts(&rep, &rigs).unwrap();
    let html = standfast_sim::render::report::replay_html(&rep, &charts);
    let doc = roxmltree::Document::parse_with_options(
        &html,
        roxmltree::ParsingOptions {
            allow_dtd: true,
            ..roxmltree::ParsingOptions::default()
        },
    )
    .unwrap();
    let svgs: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("svg"))
        .collect();
    let titled = |t: &str| {
        svgs.iter()
            .filter(|s| s.attribute("aria-label") == Some(t))
            .count()
    };
    // One chart of each kind, not one per rig.
    for t in [
        "Overturning utilisation",
        "Level over time",
        "Gust and tip wind at rig height",
    ] {
        assert_eq!(titled(t), 1, "{t}");
    }
    assert_eq!(titled("Utilisation over time"), 0, "no per-rig copies");
    // The overturning chart holds a line per rig, told apart by colour and
    // pattern, each named in the legend.
    let chart = svgs
        .iter()
        .find(|s| s.attribute("aria-label") == Some("Overturning utilisation"))
        .unwrap();
    let lines: Vec<_> = chart
        .descendants()
        .filter(|n| n.has_tag_name("path") && has_class(n, "series"))
        .collect();
    assert_eq!(lines.len(), 2);
    let style = |n: &roxmltree::Node<'_, '_>| {
        (
            n.attribute("stroke").unwrap().to_owned(),
            n.attribute("stroke-dasharray").map(str::to_owned),
        )
    };
    let (a, b) = (style(&lines[0]), style(&lines[1]));
    assert_ne!(a.0, b.0, "colours");
    assert_ne!(a.1, b.1, "patterns");
    let legend: Vec<&str> = chart
        .descendants()
        .filter(|n| n.has_tag_name("text") && has_class(n, "legend"))
        .filter_map(|n| n.text())
        .collect();
    assert_eq!(legend, ["A: overturning", "B: overturning"]);
    let keys: Vec<_> = chart
        .descendants()
        .filter(|n| n.has_tag_name("line") && has_class(n, "legend-key"))
        .map(|n| {
            (
                n.attribute("stroke").unwrap().to_owned(),
                n.attribute("stroke-dasharray").map(str::to_owned),
            )
        })
        .collect();
    assert_eq!(keys, [a, b], "each key drawn as its line");
    // The side-by-side table: a column per rig and the text's rows and
    // cells.
    let cmp = whatif::compare(&rep);
    let table = doc
        .descendants()
        .filter(|n| n.has_tag_name("table"))
        .find(|t| {
            t.descendants()
                .filter(|n| n.has_tag_name("th"))
                .filter_map(|n| n.text())
                .eq(["figure", "A", "B"])
        })
        .expect("a side-by-side table");
    let rows: Vec<Vec<String>> = table
        .descendants()
        .filter(|n| n.has_tag_name("tr"))
        .skip(1)
        .map(|r| {
            r.children()
                .filter(|c| c.has_tag_name("td"))
                .map(|c| c.text().unwrap_or("").to_owned())
                .collect()
        })
        .collect();
    let clock =
        standfast_sim::render::clock::Clock::from_start(rep.start.as_deref(), rep.local_offset_s);
    let want: Vec<Vec<String>> =
        standfast_sim::render::whatif::comparison_rows(&cmp, clock.as_ref())
            .into_iter()
            .map(|(label, cells)| {
                let mut r = vec![standfast_sim::render::whatif::html_label(label)];
                r.extend(cells);
                r
            })
            .collect();
    assert_eq!(rows, want);
    assert!(rows.iter().any(|r| r[0] == "highest overturning"));
    // A sub-row keeps its indent (no-break spaces) under its figure.
    assert!(rows.iter().any(|r| r[0] == "\u{a0}\u{a0}\u{a0}\u{a0}at"));
    let text = standfast_sim::render::whatif::comparison_text(&cmp, clock.as_ref());
    for r in &want {
        for cell in &r[1..] {
            assert!(text.contains(cell.as_str()), "{cell} not in the text");
        }
    }
}
