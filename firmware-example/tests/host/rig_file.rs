//! `replay/rig.toml` (the rig file host-sim's `standfast replay` runs in
//! ci.sh) read through host-sim's rig loader equals the firmware's invented
//! example rig (`example_rig_spec`, the description `example_rig` builds)
//! and guard settings (`example_guard_config`), so the CI comparison of
//! guard events runs both sides on one rig. Cross-implementation check (the
//! same description written twice, as Rust literals and as a rig file); no
//! outside source.

use standfast::guard::GuardConfig;
use standfast_firmware::guard_adapter::{example_guard_config, example_rig, example_rig_spec};
use standfast_sim::input::rigfile;
use std::path::PathBuf;

fn loaded() -> rigfile::LoadedRig {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("replay/rig.toml");
    rigfile::load(&path).unwrap()
}

#[test]
fn rig_file_loads_to_the_example_rig_spec_field_by_field() {
    let file = loaded().spec;
    let rust = example_rig_spec().unwrap();
    // Field by field first, so a mismatch names the field.
    assert_eq!(file.feet, rust.feet, "feet");
    assert_eq!(file.legs, rust.legs, "legs");
    assert_eq!(
        file.friction_coefficient, rust.friction_coefficient,
        "friction"
    );
    assert_eq!(file.mount.kind, rust.mount.kind, "mount.kind");
    assert_eq!(
        file.mount.latitude_rad.to_bits(),
        rust.mount.latitude_rad.to_bits(),
        "mount.latitude_rad"
    );
    assert_eq!(
        file.mount.axis_origin_m, rust.mount.axis_origin_m,
        "mount.axis_origin_m"
    );
    assert_eq!(file.bodies.len(), rust.bodies.len(), "number of bodies");
    for (i, (f, r)) in file.bodies.iter().zip(&rust.bodies).enumerate() {
        assert_eq!(f.label, r.label, "body {i} label");
        assert_eq!(f.stage, r.stage, "body {i} stage");
        assert_eq!(f.mass_kg, r.mass_kg, "body {i} mass");
        assert_eq!(f.cg_m, r.cg_m, "body {i} cg");
        assert_eq!(f.exposure, r.exposure, "body {i} exposure");
        assert_eq!(f.mass_model, r.mass_model, "body {i} mass model");
        assert_eq!(f.under_cover, r.under_cover, "body {i} under cover");
    }
    assert_eq!(file.counterweights, rust.counterweights, "counterweights");
    assert_eq!(file.shaft, rust.shaft, "shaft");
    assert_eq!(file.cover, rust.cover, "cover");
    assert_eq!(file.ballast, rust.ballast, "ballast");
    assert_eq!(file.drives, rust.drives, "drives");
    // And as a whole, so a field added to RigSpec later is not missed.
    assert_eq!(file, rust);
    // The rigs built from the two descriptions agree too.
    assert_eq!(loaded().rig, example_rig().unwrap());
}

#[test]
fn rig_file_guard_section_is_the_example_guard_config() {
    let guard = loaded().guard;
    assert_eq!(guard, example_guard_config());
    // The three settings the example changes, and nothing else.
    assert_eq!(guard.dwell_s, 20.0);
    assert_eq!(guard.time_to_park_s, 30.0);
    assert_eq!(guard.fault_clear_s, 10.0);
    let reset = GuardConfig {
        dwell_s: GuardConfig::default().dwell_s,
        time_to_park_s: GuardConfig::default().time_to_park_s,
        fault_clear_s: GuardConfig::default().fault_clear_s,
        ..guard
    };
    assert_eq!(reset, GuardConfig::default());
}
