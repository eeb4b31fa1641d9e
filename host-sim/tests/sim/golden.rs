//! Golden summary: `standfast replay` on a small invented log must print
//! exactly the checked-in summary (`tests/golden/ramp-summary.txt`), so any
//! change in figures, wording or order is seen in review. After an intended
//! change, regenerate with `STANDFAST_BLESS=1 cargo test -p standfast-sim golden`
//! and read the diff before committing it.

use std::fmt::Write as _;
use std::path::Path;
use std::process::Command;

/// An invented 20-minute night: level rig (accelerometer +1 g on z with a
/// little noise at 2 Hz), wind from the west veering ±1°, ramping from 2 m/s
/// by 0.03 m/s each second (to 38 m/s).
pub fn write_log(dir: &Path) {
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for i in 0..2400_u32 {
        let t = 1_700_000_000.0 + f64::from(i) * 0.5;
        let ax = f64::from(i % 3) * 1e-4;
        if i % 2 == 0 {
            let s = i / 2;
            let v = 2.0 + 0.03 * f64::from(s);
            writeln!(csv, "{t:.1},{ax},0,1,{v:.2},{}", 269 + s % 3).unwrap();
        } else {
            writeln!(csv, "{t:.1},{ax},0,1,,").unwrap();
        }
    }
    std::fs::write(dir.join("ramp.csv"), csv).unwrap();
    crate::common::one_file_profile(dir, "ramp");
}

#[test]
fn replay_summary_matches_golden() {
    let dir = std::env::temp_dir().join(format!("standfast-golden-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    write_log(&dir);
    let rig = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml");
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .arg("replay")
        .arg("--rig")
        .arg(&rig)
        .arg("--profile")
        .arg(dir.join("ramp.toml"))
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout)
        .unwrap()
        .replace(&rig.display().to_string(), "<demo rig>")
        .replace(&dir.display().to_string(), "<dir>");
    let golden = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/golden/ramp-summary.txt");
    if std::env::var_os("STANDFAST_BLESS").is_some() {
        std::fs::write(&golden, &text).unwrap();
    }
    let want = std::fs::read_to_string(&golden).unwrap();
    let _ = std::fs::remove_dir_all(&dir);
    assert_eq!(
        text,
        want,
        "replay summary differs from {}",
        golden.display()
    );
}

/// `--on-error` chooses the policy for a bad row: `skip` reports it with its
/// file and line, counts it and goes on (exit 0); `stop` ends with exit 1 and
/// names the line.
#[test]
fn on_error_flag_chooses_stop_or_skip() {
    let dir = std::env::temp_dir().join(format!("standfast-onerror-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    write_log(&dir);
    // Line 101 of the file (row 100 after the header) gets a word for a number.
    let csv = std::fs::read_to_string(dir.join("ramp.csv")).unwrap();
    let mut lines: Vec<String> = csv.lines().map(str::to_owned).collect();
    lines[100] = lines[100].replacen(",0,1", ",zero,1", 1);
    std::fs::write(dir.join("ramp.csv"), lines.join("\n") + "\n").unwrap();
    let rig = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml");
    let run = |policy: &str| {
        Command::new(env!("CARGO_BIN_EXE_standfast"))
            .arg("replay")
            .arg("--rig")
            .arg(&rig)
            .arg("--profile")
            .arg(dir.join("ramp.toml"))
            .arg("--on-error")
            .arg(policy)
            .output()
            .unwrap()
    };
    let skip = run("skip");
    assert!(skip.status.success());
    let text = String::from_utf8_lossy(&skip.stdout);
    assert!(text.contains("Log issues: 1"), "{text}");
    assert!(text.contains("ramp.csv:101:"), "{text}");
    let stop = run("stop");
    assert_eq!(stop.status.code(), Some(1));
    let err = String::from_utf8_lossy(&stop.stderr);
    assert!(err.contains(":101"), "{err}");
    let _ = std::fs::remove_dir_all(&dir);
}
