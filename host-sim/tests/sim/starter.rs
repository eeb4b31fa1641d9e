//! `standfast starter-rig`: every template loads with the rig loader and
//! assesses, also with its commented optional sections switched on; the
//! command never writes over a file.

use std::process::Command;

use standfast_sim::commands::starter::{template, SETUPS};
use standfast_sim::model::assess::{assess, AssessOptions};

/// The template with its commented-out sections and keys switched on
/// (lines `# [section]` and `# key = value`).
fn uncommented(t: &str) -> String {
    t.lines()
        .map(|l| {
            let rest = l.strip_prefix("# ").unwrap_or(l);
            let is_toml = rest.starts_with('[')
                || rest
                    .split_once(" = ")
                    .is_some_and(|(k, _)| k.chars().all(|c| c.is_ascii_lowercase() || c == '_'));
            if l.starts_with("# ") && is_toml {
                rest.to_owned()
            } else {
                l.to_owned()
            }
        })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn every_template_loads_and_assesses() {
    let dir = tempfile::tempdir().unwrap();
    for (k, (support, mount)) in SETUPS.iter().enumerate() {
        let t = template(*support, *mount);
        for (variant, text) in [("as written", t.clone()), ("optional on", uncommented(&t))] {
            let path = dir.path().join(format!("rig-{k}-{}.toml", variant.len()));
            std::fs::write(&path, &text).unwrap();
            let rig = standfast_sim::input::rigfile::load(&path)
                .unwrap_or_else(|e| panic!("{support:?} {mount:?} {variant}: {e}"));
            let rep = assess(&rig, &AssessOptions::default())
                .unwrap_or_else(|e| panic!("{support:?} {mount:?} {variant}: {e}"));
            // A placeholder rig that stands: some wind is needed to tip it.
            assert!(
                rep.sky.tip.tip_wind_mps.is_some_and(|v| v > 5.0),
                "{support:?} {mount:?} {variant}"
            );
        }
        // The optional blocks really are in the file and change it.
        assert_ne!(uncommented(&t), t);
        assert!(t.contains("placeholder"));
        assert!(t.contains("Caution"));
    }
}

#[test]
fn the_command_writes_a_new_file_and_never_over_one() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("my-rig.toml");
    let run = || {
        Command::new(env!("CARGO_BIN_EXE_standfast"))
            .args([
                "starter-rig",
                "--support",
                "pier",
                "--mount",
                "alt-az",
                "--out",
            ])
            .arg(&out)
            .output()
            .unwrap()
    };
    let first = run();
    assert_eq!(first.status.code(), Some(0), "{first:?}");
    assert_eq!(
        std::fs::read_to_string(&out).unwrap(),
        template(
            standfast_sim::commands::starter::SupportKind::Pier,
            standfast_sim::commands::starter::MountChoice::AltAz
        )
    );
    // The user edits it; a second run must not destroy the edit.
    std::fs::write(&out, "# mine\n").unwrap();
    let second = run();
    assert_eq!(second.status.code(), Some(2), "{second:?}");
    assert!(String::from_utf8_lossy(&second.stderr).contains("exists"));
    assert_eq!(std::fs::read_to_string(&out).unwrap(), "# mine\n");
    // No temporary file is left beside it.
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
}
