//! The `standfast` command as a person runs it: output and exit codes
//! (documented in host-sim/src/error.rs and `standfast --help`).

use std::process::Command;

fn standfast() -> Command {
    Command::new(env!("CARGO_BIN_EXE_standfast"))
}

#[test]
fn gen_demo_writes_the_night_and_says_where() {
    let dir = tempfile::tempdir().unwrap();
    let out = standfast()
        .args(["gen-demo", "--seed", "4", "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(
        text.contains("night-accel.csv") && text.contains("invented"),
        "{text}"
    );
    for f in [
        "night-wind.csv",
        "night-accel.csv",
        "night-mount.csv",
        "night-log-profile.toml",
    ] {
        assert!(dir.path().join(f).is_file(), "{f}");
    }
}

#[test]
fn usage_error_exits_2_and_io_error_exits_3() {
    let out = standfast().args(["gen-demo"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2), "missing --out");
    let out = standfast().args(["no-such-command"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let out = standfast()
        .args(["gen-demo", "--hours", "5", "--out", "x"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2), "--hours needs --bench");
    // A folder that cannot be created: below a regular file.
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("plain-file");
    std::fs::write(&file, "x").unwrap();
    let out = standfast()
        .args(["gen-demo", "--out"])
        .arg(file.join("sub"))
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(3));
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(
        err.starts_with("standfast: error: ") && err.contains("plain-file"),
        "{err}"
    );
}

#[test]
fn help_states_exit_codes_and_caution() {
    let out = standfast().arg("--help").output().unwrap();
    assert_eq!(out.status.code(), Some(0));
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(
        text.contains("Exit codes: 0 success; 1 bad input"),
        "{text}"
    );
    assert!(text.contains("licensed engineers"), "{text}");
}

/// `demo` replaces the files it wrote (unchanged) on a second run, refuses
/// a file it did not write or one changed since (exit 2, before anything is
/// written), and replaces it with --replace (host-sim/README.md, "Outputs
/// never destroy a file").
#[test]
fn demo_replaces_only_its_own_files_unless_asked() {
    let dir = tempfile::tempdir().unwrap();
    let run = |extra: &[&str]| {
        standfast()
            .args(["demo", "--hours", "0.05", "--out"])
            .arg(dir.path())
            .args(extra)
            .output()
            .unwrap()
    };
    assert_eq!(run(&[]).status.code(), Some(0));
    assert_eq!(
        run(&[]).status.code(),
        Some(0),
        "a second run over its own files"
    );
    let rig = dir.path().join("rig.toml");
    std::fs::write(&rig, "# my own rig\n").unwrap();
    let out = run(&[]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("rig.toml exists and was not written by standfast"),
        "{err}"
    );
    assert_eq!(std::fs::read_to_string(&rig).unwrap(), "# my own rig\n");
    assert_eq!(run(&["--replace"]).status.code(), Some(0));
    assert!(std::fs::read_to_string(&rig)
        .unwrap()
        .contains("INVENTED demo rig"));
    // No temporary file is left in the folder.
    for e in std::fs::read_dir(dir.path()).unwrap() {
        let name = e.unwrap().file_name().to_string_lossy().into_owned();
        assert!(!name.contains("standfast-tmp"), "{name}");
    }
}

/// Issue 14: the summary's level changes, faults and closest approaches are
/// in local wall time with the offset (here from `--utc-offset`, which
/// overrides the logs' UTC), the HTML report's tables too, while the JSON
/// keeps ISO 8601 UTC. The golden log's park request is at 22:19:43 UTC on
/// 14 November 2023 (tests/golden/ramp-summary.txt): 00:19:43 on the 15th
/// at UTC+02:00 (an offset is local time minus UTC; common practice, no
/// source). Before, the text gave only `2023-11-14T22:19:43.000Z (+383 s)`.
#[test]
fn replay_times_are_local_with_the_offset_given() {
    let dir = tempfile::tempdir().unwrap();
    crate::golden::write_log(dir.path());
    let rig = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml");
    let html = dir.path().join("r.html");
    let run = |extra: &[&str]| {
        standfast()
            .arg("replay")
            .arg("--rig")
            .arg(&rig)
            .arg("--profile")
            .arg(dir.path().join("ramp.toml"))
            .args(extra)
            .output()
            .unwrap()
    };
    let out = run(&["--utc-offset", "+02:00", "--html", html.to_str().unwrap()]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(
        text.contains("  2023-11-15 00:19:43 UTC+02:00: watch -> park_now (predicted_overturning)"),
        "{text}"
    );
    assert!(
        text.contains("  2023-11-14 22:13:20 UTC+02:00: wind speed sensor")
            || text.contains("  2023-11-15 00:13:20 UTC+02:00: wind speed sensor"),
        "{text}"
    );
    assert!(
        !text.contains("T22:19:43"),
        "no UTC ISO time in the text: {text}"
    );
    let page = std::fs::read_to_string(&html).unwrap();
    assert!(
        page.contains("<td>2023-11-15 00:19:43 UTC+02:00</td><td>2023-11-14T22:19:43.000Z</td>")
    );
    assert!(page.contains("<th>local time</th><th>UTC</th><th>fault</th>"));
    // JSON keeps UTC.
    let out = run(&["--utc-offset", "-05:30", "--json"]);
    assert_eq!(out.status.code(), Some(0));
    let json = String::from_utf8(out.stdout).unwrap();
    assert!(json.contains("\"2023-11-14T22:19:43.000Z\""), "{json}");
    assert!(!json.contains("UTC-05:30"));
    // A bad offset is a usage error naming the option, the value and the
    // range; nothing is written.
    for bad in ["+25:00", "two", "+02:75", ""] {
        let out = run(&["--utc-offset", bad]);
        assert_eq!(out.status.code(), Some(2), "{bad}");
        let err = String::from_utf8(out.stderr).unwrap();
        assert!(
            err.contains("--utc-offset") && err.contains(bad) && err.contains("-23:59 to +23:59"),
            "{err}"
        );
    }
}
