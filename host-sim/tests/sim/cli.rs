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
