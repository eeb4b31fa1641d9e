//! Log profiles, CSV reading and the k-way merge.
//!
//! The multi-rate check compares the streaming merge with a pre-merged log
//! built here by a different method (collect every row, group by time in a
//! sorted map, write one CSV); line numbers are counted by hand in the
//! literal texts.

use std::collections::BTreeMap;
use std::io::Cursor;
use std::io::Read;
use std::path::Path;

use standfast_sim::input::located::SourceText;
use standfast_sim::input::log::{
    Channel, ErrorPolicy, IssueKind, LogError, LogProfile, Merger, PierSide, SampleRecord,
};
use standfast_sim::Error;

/// Standard gravity, m/s² (3rd CGPM 1901).
const GN: f64 = 9.806_65;

fn profile(text: &str) -> LogProfile {
    LogProfile::from_source(&SourceText::new("profile.toml", text), Path::new(".")).unwrap()
}

fn reader(text: &str) -> Box<dyn Read> {
    Box::new(Cursor::new(text.as_bytes().to_vec()))
}

fn merge_all(p: &LogProfile, texts: &[&str], policy: ErrorPolicy) -> (Vec<SampleRecord>, Merger) {
    let mut m = Merger::from_readers(p, texts.iter().map(|t| reader(t)).collect(), policy).unwrap();
    let mut out = Vec::new();
    while let Some(r) = m.next_record().unwrap() {
        out.push(r);
    }
    (out, m)
}

const MULTI_PROFILE: &str = r#"
[log]
[[log.file]]
name = "accel"
path = "accel.csv"
time = { column = "t", format = "epoch_s" }
accel_axes = ["-y", "x", "z"]
[log.file.columns]
accel_x = { column = "ax", unit = "g", scale = 6.103515625e-5 }
accel_y = { column = "ay", unit = "g", scale = 6.103515625e-5 }
accel_z = { column = "az", unit = "g", scale = 6.103515625e-5 }

[[log.file]]
name = "wind"
path = "wind.csv"
time = { column = "time", format = "iso8601" }
[log.file.columns]
wind_speed = { column = "kmh", unit = "km/h" }
wind_direction = { column = "dir", unit = "deg" }

[[log.file]]
name = "mount"
path = "mount.csv"
time = { column = "when", format = "iso8601", zone = "+02:00" }
[log.file.columns]
hour_angle = { column = "ha", unit = "hourangle" }
declination = { column = "dec", unit = "deg" }
pier_side = { column = "pier" }
cover_fitted = { column = "cover" }
"#;

const PREMERGED_PROFILE: &str = r#"
[log]
[[log.file]]
path = "all.csv"
time = { column = "t", format = "epoch_s" }
accel_axes = ["-y", "x", "z"]
[log.file.columns]
accel_x = { column = "ax", unit = "g", scale = 6.103515625e-5 }
accel_y = { column = "ay", unit = "g", scale = 6.103515625e-5 }
accel_z = { column = "az", unit = "g", scale = 6.103515625e-5 }
wind_speed = { column = "kmh", unit = "km/h" }
wind_direction = { column = "dir", unit = "deg" }
hour_angle = { column = "ha", unit = "hourangle" }
declination = { column = "dec", unit = "deg" }
pier_side = { column = "pier" }
cover_fitted = { column = "cover" }
"#;

/// A small deterministic generator for test data (64-bit LCG, constants of
/// Knuth's MMIX).
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        self.0 >> 33
    }
}

const T0: i64 = 1_763_154_000; // 2025-11-14T21:00:00Z

fn iso(ns: i64, offset_s: i64, zone: bool) -> String {
    let t = standfast_sim::input::log::Timestamp::from_unix_ns(ns);
    let mut s = String::new();
    standfast_sim::input::log::time::write_iso8601(
        &mut s,
        t,
        9,
        i32::try_from(offset_s).unwrap(),
        zone,
    );
    s
}

#[test]
fn multi_rate_merge_equals_premerged_log() {
    let mut rng = Lcg(7);
    // time ns → cells of the pre-merged row (ax, ay, az, kmh, dir, ha, dec, pier, cover)
    let mut all: BTreeMap<i64, [String; 9]> = BTreeMap::new();
    let mut accel = String::from("t,ax,ay,az\n");
    for k in 0..600_i64 {
        // 10 Hz for 60 s
        let ns = T0 * 1_000_000_000 + k * 100_000_000;
        let c: Vec<i64> = (0..3).map(|_| (rng.next() % 2000) as i64 - 1000).collect();
        let (ax, ay, az) = (c[0], c[1], 16_384 + c[2]);
        accel.push_str(&format!(
            "{}.{:02},{ax},{ay},{az}\n",
            ns / 1_000_000_000,
            (ns % 1_000_000_000) / 10_000_000
        ));
        let row = all.entry(ns).or_default();
        row[0] = ax.to_string();
        row[1] = ay.to_string();
        row[2] = az.to_string();
    }
    let mut wind = String::from("time,kmh,dir\n");
    for k in 0..60_i64 {
        // 1 Hz, every tenth accel time, written in local time +01:00
        let ns = T0 * 1_000_000_000 + k * 1_000_000_000;
        let kmh = format!("{:.1}", (rng.next() % 600) as f64 / 10.0);
        let dir = format!("{}", rng.next() % 360);
        wind.push_str(&format!("{},{kmh},{dir}\n", iso(ns, 3600, true)));
        let row = all.entry(ns).or_default();
        row[3] = kmh;
        row[4] = dir;
    }
    let mut mount = String::from("when,ha,dec,pier,cover\n");
    let mut ns = T0 * 1_000_000_000 + 123_000_000;
    let mut i = 0;
    while ns < (T0 + 60) * 1_000_000_000 {
        let ha = format!("{:.4}", -1.0 + i as f64 * 0.01);
        let dec = "22.5".to_owned();
        let pier = if i < 5 { "west" } else { "E" }.to_owned();
        let cover = if i < 7 { "0" } else { "yes" }.to_owned();
        // local clock at +02:00, written without a zone
        mount.push_str(&format!(
            "{},{ha},{dec},{pier},{cover}\n",
            iso(ns, 7200, false)
        ));
        let row = all.entry(ns).or_default();
        row[5] = ha;
        row[6] = dec;
        row[7] = pier;
        row[8] = cover;
        i += 1;
        // irregular: 0.5 s to 8.4 s, sometimes landing on an accel or wind time
        ns += if i % 4 == 0 {
            2_877_000_000
        } else {
            ((rng.next() % 80) as i64 + 5) * 100_000_000
        };
    }
    let mut pre = String::from("t,ax,ay,az,kmh,dir,ha,dec,pier,cover\n");
    for (ns, cells) in &all {
        pre.push_str(&format!(
            "{}.{:09},{}\n",
            ns / 1_000_000_000,
            ns % 1_000_000_000,
            cells.join(",")
        ));
    }
    let (merged, m1) = merge_all(
        &profile(MULTI_PROFILE),
        &[&accel, &wind, &mount],
        ErrorPolicy::Stop,
    );
    let (single, m2) = merge_all(&profile(PREMERGED_PROFILE), &[&pre], ErrorPolicy::Stop);
    assert_eq!(m1.issues().total(), 0, "{:?}", m1.issues().kept());
    assert_eq!(m2.issues().total(), 0);
    assert_eq!(merged.len(), all.len());
    assert_eq!(merged, single);
    // Some times carry rows of two files at once (wind on accel times).
    assert!(merged
        .iter()
        .any(|r| r.updated.contains(Channel::WindSpeed) && r.updated.contains(Channel::AccelZ)));
    // Values hold: the last record still has the last wind value, 59 s + 0.9 s later.
    let last = merged.last().unwrap();
    assert!((last.age_s(Channel::WindSpeed).unwrap() - 0.9).abs() < 1e-9);
    assert_eq!(last.pier_side, Some(PierSide::East));
    assert_eq!(last.cover_fitted, Some(true));
    // The first record is the first accel row; nothing else is known yet.
    let first = &merged[0];
    assert!(first.wind_speed_mps.is_some()); // wind starts at the same instant
    assert!(first.hour_angle_rad.is_none());
    assert_eq!(m1.records(), merged.len() as u64);
}

#[test]
fn accelerometer_scale_axes_and_units() {
    let p = profile(MULTI_PROFILE);
    let accel = "t,ax,ay,az\n100.0,100,200,16384\n";
    let wind = "time,kmh,dir\n1970-01-01T00:01:40Z,36,270\n";
    let mount = "when,ha,dec,pier,cover\n1970-01-01T02:01:40,1.5,-10,w,off\n";
    let (r, _) = merge_all(&p, &[accel, wind, mount], ErrorPolicy::Stop);
    assert_eq!(r.len(), 1, "all three rows are at t = 100 s");
    let a = r[0].accel_mps2.unwrap();
    // rig x = −sensor y, rig y = sensor x, rig z = sensor z; 16384 counts = 1 g.
    assert!((a[0] - (-200.0 / 16_384.0 * GN)).abs() < 1e-12);
    assert!((a[1] - (100.0 / 16_384.0 * GN)).abs() < 1e-12);
    assert!((a[2] - GN).abs() < 1e-12);
    // 36 km/h = 10 m/s; 270° = 3π/2; 1.5 h of hour angle = 22.5°.
    assert!((r[0].wind_speed_mps.unwrap() - 10.0).abs() < 1e-12);
    assert!((r[0].wind_from_rad.unwrap() - 1.5 * std::f64::consts::PI).abs() < 1e-12);
    assert!((r[0].hour_angle_rad.unwrap() - 22.5_f64.to_radians()).abs() < 1e-12);
    assert!((r[0].declination_rad.unwrap() + 10_f64.to_radians()).abs() < 1e-12);
    assert_eq!(r[0].pier_side, Some(PierSide::West));
    assert_eq!(r[0].cover_fitted, Some(false));
}

const ONE_FILE: &str = r#"
[log]
[[log.file]]
name = "acc.csv"
path = "acc.csv"
time = { column = "t", format = "epoch_s" }
gap = "1 s"
[log.file.columns]
accel_x = { column = "ax", unit = "g" }
accel_y = { column = "ay", unit = "g" }
accel_z = { column = "az", unit = "g" }
"#;

/// Line numbers, counted by hand; line 6 holds a quoted note spanning two
/// lines, so the rows after it are one line further down.
const BAD_LOG: &str = "t,ax,ay,az,note
0.00,0,0,1,
0.10,0,0,1,
0.10,0,0,1,dup
0.05,0,0,1,\"back
in time\"
0.20,x,0,1,
0.30,0,0
0.40,0,0,1,ok
12.0,0,0,1,after a gap
,0,0,1,no time
12.1,0,,1,two axes
12.2,0,0,1,
";

#[test]
fn bad_rows_are_reported_with_lines_and_counted() {
    let p = profile(ONE_FILE);
    let (records, m) = merge_all(&p, &[BAD_LOG], ErrorPolicy::Skip);
    let times: Vec<f64> = records.iter().map(|r| r.time.unix_s()).collect();
    assert_eq!(times, vec![0.0, 0.1, 0.4, 12.0, 12.2]);
    let issues = m.issues();
    assert_eq!(issues.count(IssueKind::Duplicate), 1);
    assert_eq!(issues.count(IssueKind::OutOfOrder), 1);
    assert_eq!(issues.count(IssueKind::Malformed), 4);
    assert_eq!(issues.count(IssueKind::Gap), 1);
    assert_eq!(issues.total(), 7);
    let found: Vec<(u64, IssueKind)> = issues.kept().iter().map(|i| (i.line, i.kind)).collect();
    assert_eq!(
        found,
        vec![
            (4, IssueKind::Duplicate),
            (5, IssueKind::OutOfOrder),
            (7, IssueKind::Malformed),
            (8, IssueKind::Malformed),
            (10, IssueKind::Gap),
            (11, IssueKind::Malformed),
            (12, IssueKind::Malformed),
        ]
    );
    assert!(issues.kept().iter().all(|i| i.file == "acc.csv"));
    assert_eq!(
        issues.kept()[0].to_string().split(": ").next(),
        Some("acc.csv:4")
    );
    assert_eq!(m.rows(), 5);
}

#[test]
fn stop_policy_ends_at_the_first_bad_row() {
    let p = profile(ONE_FILE);
    let mut m = Merger::from_readers(&p, vec![reader(BAD_LOG)], ErrorPolicy::Stop).unwrap();
    let mut n = 0;
    let err = loop {
        match m.next() {
            Some(Ok(_)) => n += 1,
            Some(Err(e)) => break e,
            None => panic!("expected an error"),
        }
    };
    // Rows on lines 2 and 3 give records; line 4 is the duplicate.
    assert_eq!(n, 2);
    match &err {
        LogError::Row(issue) => {
            assert_eq!(issue.line, 4);
            assert_eq!(issue.kind, IssueKind::Duplicate);
        }
        other => panic!("{other:?}"),
    }
    // The command's error keeps the message and exits with code 1.
    let message = err.to_string();
    let err = Error::from(err);
    assert_eq!(err.to_string(), message);
    assert_eq!(err.exit_code(), 1);
    assert!(m.next().is_none(), "the merge stays ended after an error");
}

#[test]
fn missing_column_names_the_profile_line() {
    let p = profile(ONE_FILE);
    let err = Merger::from_readers(&p, vec![reader("t,ax,ay,zz\n0,0,0,1\n")], ErrorPolicy::Skip)
        .unwrap_err();
    let msg = err.to_string();
    // `accel_z = { column = "az", ... }` is line 11 of ONE_FILE (it starts
    // with a line break); the column name's quote is at column 22.
    assert!(
        msg.starts_with("profile.toml:11:22: \"az\": no such column"),
        "{msg}"
    );
    assert!(msg.contains("t, ax, ay, zz"), "{msg}");
    assert_eq!(Error::from(err).exit_code(), 1);
}

fn profile_err(text: &str) -> String {
    LogProfile::from_source(&SourceText::new("p.toml", text), Path::new("."))
        .unwrap_err()
        .to_string()
}

#[test]
fn profile_errors_are_located() {
    let head =
        "[log]\n[[log.file]]\npath = \"a.csv\"\ntime = { column = \"t\", format = \"epoch_s\" }\n";
    // A mass unit for a speed (line 6).
    let e = profile_err(&format!(
        "{head}[log.file.columns]\nwind_speed = {{ column = \"v\", unit = \"18 lb\" }}\n"
    ));
    assert!(e.starts_with("p.toml:6:"), "{e}");
    assert!(e.contains("log.file[0].columns.wind_speed.unit"), "{e}");
    // A channel that does not exist.
    let e = profile_err(&format!(
        "{head}[log.file.columns]\nwind_sped = {{ column = \"v\" }}\n"
    ));
    assert!(e.starts_with("p.toml:6:"), "{e}");
    assert!(
        e.contains("wind_speed"),
        "the message lists the known channels: {e}"
    );
    // A bad time format (line 4).
    let e = profile_err("[log]\n[[log.file]]\npath = \"a.csv\"\ntime = { column = \"t\", format = \"unix\" }\n[log.file.columns]\nwind_speed = { column = \"v\" }\n");
    assert!(e.starts_with("p.toml:4:"), "{e}");
    assert!(e.contains("iso8601, epoch_s, epoch_ms"), "{e}");
    // Two of three accelerometer axes.
    let e = profile_err(&format!("{head}[log.file.columns]\naccel_x = {{ column = \"x\" }}\naccel_y = {{ column = \"y\" }}\n"));
    assert!(e.contains("all three"), "{e}");
    // A gap outside its range (line 5).
    let e = profile_err(&format!(
        "{head}gap = \"2 d\"\n[log.file.columns]\nwind_speed = {{ column = \"v\" }}\n"
    ));
    assert!(e.starts_with("p.toml:5:"), "{e}");
    assert!(e.contains("0.001 to 86400 s"), "{e}");
    // A sensor axis used twice.
    let e = profile_err(&format!("{head}accel_axes = [\"x\", \"x\", \"z\"]\n[log.file.columns]\nwind_speed = {{ column = \"v\" }}\n"));
    assert!(e.contains("once"), "{e}");
    // The same channel from two files.
    let second = head.strip_prefix("[log]\n").unwrap();
    let e = profile_err(&format!("{head}[log.file.columns]\nwind_speed = {{ column = \"v\" }}\n{second}[log.file.columns]\nwind_speed = {{ column = \"w\" }}\n"));
    assert!(e.contains("already read from log.file[0]"), "{e}");
    // No [log] section at all.
    assert!(profile_err("[rig]\n").contains("no [log] section"));
}

/// Issue 14: the progress bar's share read. For files the merger knows the
/// logs' size and tells the share of bytes read: it never falls, stays
/// within 0 to 1, is below 1 while much of a file is unread, and is exactly
/// 1 at the end (every byte read). Streams have no known size: `None`.
#[test]
fn the_share_read_rises_to_one_for_files_and_is_unknown_for_streams() {
    use std::fmt::Write as _;
    let dir = tempfile::tempdir().unwrap();
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for i in 0..200_000_u32 {
        writeln!(csv, "{},0,0,1,{}.5,270", 1_700_000_000 + i, i % 20).unwrap();
    }
    std::fs::write(dir.path().join("w.csv"), &csv).unwrap();
    let profile_path = crate::common::one_file_profile(dir.path(), "w");
    let p = LogProfile::load(&profile_path).unwrap();
    let mut m = Merger::open(&p, ErrorPolicy::Stop).unwrap();
    let first = m.fraction_read().expect("a file's size is known");
    assert!(first < 0.5, "{first}");
    let mut last = first;
    let mut n = 0_u64;
    while m.next_record().unwrap().is_some() {
        n += 1;
        if n % 10_000 == 0 {
            let f = m.fraction_read().unwrap();
            assert!(f >= last && f <= 1.0, "{f} after {last}");
            last = f;
        }
    }
    assert_eq!(n, 200_000);
    assert_eq!(m.fraction_read(), Some(1.0));
    let s = Merger::from_readers(&p, vec![reader(&csv)], ErrorPolicy::Stop).unwrap();
    assert_eq!(s.fraction_read(), None);
}
