//! Replay of logs through the guard, and the `demo` command.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::process::Command;

use standfast::guard::AlertLevel;
use standfast::sense::{Fault, Sensor};
use standfast_sim::commands::replay::ReplayOutputs;
use standfast_sim::input::log::{ErrorPolicy, LogProfile, Merger};
use standfast_sim::input::rigfile::{self, LoadedRig};
use standfast_sim::model::replay::{replay, LevelChange, ReplayOptions, ReplayReport};

fn demo_rig() -> LoadedRig {
    rigfile::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")).unwrap()
}

/// A level rig (accelerometer reads +1 g on z, in g) in a wind from the west
/// that ramps from 2 m/s by 0.03 m/s every second: an invented night.
const RAMP_S: u32 = 1200;

fn wind_at(t: u32) -> f64 {
    2.0 + 0.03 * f64::from(t)
}

/// A little sensor noise, as any real accelerometer has (a reading frozen
/// for 60 s is a stuck-sensor fault by the guard's default).
fn noise(i: u32) -> f64 {
    f64::from(i % 3) * 1e-4
}

/// Wind from the west, veering ±1° (a vane frozen for 300 s is a stuck
/// sensor by the guard's default).
fn dir_at(t: u32) -> u32 {
    269 + t % 3
}

fn write(dir: &Path, name: &str, text: &str) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

/// One pre-merged file at 2 Hz, wind cells only on whole seconds (an empty
/// cell means no new value).
fn premerged(dir: &Path) -> PathBuf {
    let mut csv = String::from("t,ax,ay,az,speed,dir\n");
    for i in 0..(2 * RAMP_S) {
        let t = 1_700_000_000.0 + f64::from(i) * 0.5;
        if i % 2 == 0 {
            writeln!(
                csv,
                "{t:.1},{},0,1,{:.2},{}",
                noise(i),
                wind_at(i / 2),
                dir_at(i / 2)
            )
            .unwrap();
        } else {
            writeln!(csv, "{t:.1},{},0,1,,", noise(i)).unwrap();
        }
    }
    write(dir, "merged.csv", &csv);
    crate::common::one_file_profile(dir, "merged")
}

/// The same samples as two files at different rates.
fn split(dir: &Path) -> PathBuf {
    let mut acc = String::from("t,ax,ay,az\n");
    let mut wind = String::from("time,speed,dir\n");
    for i in 0..(2 * RAMP_S) {
        let t = 1_700_000_000.0 + f64::from(i) * 0.5;
        writeln!(acc, "{t:.1},{},0,1", noise(i)).unwrap();
        if i % 2 == 0 {
            writeln!(wind, "{t:.1},{:.2},{}", wind_at(i / 2), dir_at(i / 2)).unwrap();
        }
    }
    write(dir, "acc.csv", &acc);
    write(dir, "wind.csv", &wind);
    write(
        dir,
        "split.toml",
        r#"[log]
[[log.file]]
path = "wind.csv"
time = { column = "time", format = "epoch_s" }
[log.file.columns]
wind_speed = { column = "speed", unit = "m/s" }
wind_direction = { column = "dir", unit = "deg" }
[[log.file]]
path = "acc.csv"
time = { column = "t", format = "epoch_s" }
[log.file.columns]
accel_x = { column = "ax", unit = "g" }
accel_y = { column = "ay", unit = "g" }
accel_z = { column = "az", unit = "g" }
"#,
    )
}

fn run(profile: &Path, verdicts: Option<&Path>) -> ReplayReport {
    let p = LogProfile::load(profile).unwrap();
    let mut m = Merger::open(&p, ErrorPolicy::Stop).unwrap();
    let rig = demo_rig();
    let opts = ReplayOptions { verdicts_every: 1 };
    match verdicts {
        Some(path) => {
            let mut f = std::io::BufWriter::new(std::fs::File::create(path).unwrap());
            replay(
                std::slice::from_ref(&rig),
                &mut m,
                opts,
                Some(&mut ReplayOutputs::new(Some((&mut f, "verdicts"))).unwrap()),
            )
            .unwrap()
        }
        None => replay(std::slice::from_ref(&rig), &mut m, opts, None).unwrap(),
    }
}

#[test]
fn ramping_wind_parks_before_alarm_and_peaks_at_the_end() {
    let dir = tempfile::tempdir().unwrap();
    let rep = run(&premerged(dir.path()), None);
    assert_eq!(rep.records, u64::from(2 * RAMP_S));
    assert_eq!(rep.issues_total, 0);
    let r = &rep.rigs[0];
    // A guard starts in sensor_fault (no wind reading yet) and the ramp's
    // first minute, 2 to 3.9 m/s, is its warm-up. Derived from the guard's
    // rules and the demo rig's settings (one evaluation per second, 60 s
    // fault clearing time by default, 30 s dwell): the first wind sample at
    // 0 s starts the record; the 3-s gust is defined once it spans 12 fine
    // bins of 250 ms (from 2.75 s), so the first figures come with the
    // evaluation at 3 s. Healthy from 3 s, the fault clears at 63 s, to no
    // lower than watch; the figures have been settled below watch since 3 s
    // (longer than the dwell), so the next step, 63.5 s, is clear.
    assert_eq!(
        r.faults.iter().map(|f| (f.t_s, f.kind)).collect::<Vec<_>>(),
        [(
            0.0,
            Fault::NoReading {
                sensor: Sensor::WindSpeed
            }
        )]
    );
    let change = |c: &LevelChange| (c.t_s, c.from, c.to, c.cause.clone());
    let start: Vec<_> = r.level_changes.iter().take(2).map(change).collect();
    assert_eq!(
        start,
        [
            (
                63.0,
                AlertLevel::SensorFault,
                AlertLevel::Watch,
                "fault_cleared".into()
            ),
            (63.5, AlertLevel::Watch, AlertLevel::Clear, "settled".into()),
        ]
    );
    // From clear, the guard's thresholds rise watch 0.5 < park 0.75 (ASME
    // B30.5 §5-1.1.1 analogy) < alarm 0.9 (EN 13000 practice), and park
    // uses the gust predicted for the end of a park; so in a steadily rising
    // wind the levels must come in that order, each once: watch and
    // park_now for the predicted overturning, alarm for the present one.
    let rising: Vec<(AlertLevel, &str)> = r.level_changes[2..]
        .iter()
        .map(|c| (c.to, c.cause.as_str()))
        .collect();
    assert_eq!(
        rising,
        vec![
            (AlertLevel::Watch, "predicted_overturning"),
            (AlertLevel::ParkNow, "predicted_overturning"),
            (AlertLevel::Alarm, "overturning"),
        ],
        "{:?} {:?}",
        r.level_changes,
        r.faults
    );
    assert!(r.level_changes.windows(2).all(|w| w[0].t_s < w[1].t_s));
    // Drag grows with the square of the wind speed (q = ½ρv², any fluids
    // textbook), so with a rising wind the highest overturning utilisation
    // is at the last evaluation (the guard evaluates once a second, default
    // evaluate_every_s = 1).
    let o = r.overturning.as_ref().unwrap();
    assert!(rep.duration_s - o.t_s <= 1.0, "{o:?} of {}", rep.duration_s);
    assert!(o.utilisation > 0.9, "{o:?}");
    // Direction as logged: from the west, 270° ± 1° (the meteorological
    // convention, WMO No. 8).
    assert!(
        (o.figures.wind_from_deg.unwrap() - 270.0).abs() <= 1.01,
        "{o:?}"
    );
    assert!(o.figures.tilt_deg.unwrap() < 0.01, "level ground: {o:?}");
    // Time per level covers the whole log.
    let total: f64 = r.level_time.iter().map(|s| s.seconds).sum();
    assert!((total - rep.duration_s).abs() < 1e-6);
    assert_eq!(r.final_level, AlertLevel::Alarm);
}

#[test]
fn multi_rate_logs_give_the_same_verdicts_as_a_premerged_log() {
    // The merge contract (host-sim/src/log/mod.rs): an empty cell holds the
    // previous value, just as a file without a row at that time.
    let dir = tempfile::tempdir().unwrap();
    let a = dir.path().join("a.csv");
    let b = dir.path().join("b.csv");
    let ra = run(&premerged(dir.path()), Some(&a));
    let rb = run(&split(dir.path()), Some(&b));
    let va = std::fs::read_to_string(&a).unwrap();
    let vb = std::fs::read_to_string(&b).unwrap();
    assert!(va.lines().count() > 2 * RAMP_S as usize);
    assert_eq!(va, vb);
    assert_eq!(ra.rigs, rb.rigs);
}

#[test]
fn demo_command_runs_and_prints_the_cautions() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .args(["demo", "--hours", "0.5", "--out"])
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
    for c in standfast_sim::cautions::CAUTIONS {
        assert!(text.contains(c), "{c} missing in\n{text}");
    }
    assert!(text.contains("Closest approach"), "{text}");
    for f in ["rig.toml", "verdicts.csv", "night-wind.csv"] {
        assert!(dir.path().join(f).is_file(), "{f}");
    }
    // The verdict CSV carries the cover and the pose the figures are for:
    // the demo's mount log starts at hour angle -2.5 h, declination +22°,
    // tube west, cover off (host-sim/src/demo_data.rs; mount log's first row).
    let csv = std::fs::read_to_string(dir.path().join("verdicts.csv")).unwrap();
    let mut lines = csv.lines();
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    let col = |name: &str| head.iter().position(|h| *h == name).unwrap();
    let rows: Vec<Vec<&str>> = lines.map(|l| l.split(',').collect()).collect();
    let first = rows
        .iter()
        .find(|r| !r[col("cover")].is_empty())
        .expect("a row with the cover state");
    assert_eq!(first[col("cover")], "off");
    assert_eq!(first[col("pose_frame")], "equatorial");
    let ha_deg: f64 = first[col("pose_a_deg")].parse().unwrap();
    let dec_deg: f64 = first[col("pose_b_deg")].parse().unwrap();
    assert!((ha_deg - (-2.5 * 15.0)).abs() < 0.5, "{ha_deg}");
    assert!((dec_deg - 22.0).abs() < 1e-3, "{dec_deg}");
    assert_eq!(first[col("pier_side")], "tube_west");
    for r in &rows {
        assert_eq!(r.len(), head.len(), "{r:?}");
    }
}

#[test]
fn demo_folder_defaults_to_cargos_target_folder() {
    // Cargo marks its target folder with CACHEDIR.TAG (the Cache Directory
    // Tagging Specification, Bryan Ford; cargo writes it since 1.56, from
    // memory); the executable of `cargo run` is in target/<profile>/ or
    // target/<triple>/<profile>/.
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("target");
    std::fs::create_dir_all(target.join("x86_64-unknown-linux-gnu/release")).unwrap();
    std::fs::write(
        target.join("CACHEDIR.TAG"),
        "Signature: 8a477f597d28d172789f06886806bc55\n",
    )
    .unwrap();
    let cwd = dir.path().join("elsewhere");
    let d = standfast_sim::commands::replay::demo_dir_for(&target.join("debug/standfast"), &cwd);
    assert_eq!(d, target.join("standfast-demo"));
    let d = standfast_sim::commands::replay::demo_dir_for(
        &target.join("x86_64-unknown-linux-gnu/release/standfast"),
        &cwd,
    );
    assert_eq!(d, target.join("standfast-demo"));
    // Installed (~/.cargo/bin has no tag): the current folder.
    let d = standfast_sim::commands::replay::demo_dir_for(&dir.path().join("bin/standfast"), &cwd);
    assert_eq!(d, cwd.join("standfast-demo"));
}

/// What an observer was handed: per verdict, the rig, the seconds since the
/// first record, the level and whether it has a level change or fault
/// event; it fails with an I/O error at verdict number `fail_at` (counting
/// from 0), when given.
#[derive(Default)]
struct Recorder {
    seen: Vec<(usize, f64, AlertLevel, bool)>,
    fail_at: Option<usize>,
    finished: bool,
}

impl standfast_sim::model::replay::ReplayObserver for Recorder {
    fn progress(&mut self, _: standfast_sim::model::replay::Progress) {}

    fn verdict(
        &mut self,
        _: standfast_sim::input::log::Timestamp,
        t_s: f64,
        rig: usize,
        v: &standfast::guard::Verdict,
        _: Option<bool>,
    ) -> Result<(), standfast_sim::Error> {
        if self.fail_at == Some(self.seen.len()) {
            return Err(standfast_sim::Error::io(
                "verdicts",
                std::io::Error::other("disk full"),
            ));
        }
        let forced = v
            .events
            .iter()
            .any(|e| !matches!(e, standfast::guard::Event::NewHighUtilisation { .. }));
        self.seen.push((rig, t_s, v.level, forced));
        Ok(())
    }

    fn finished(&mut self) -> Result<(), standfast_sim::Error> {
        self.finished = true;
        Ok(())
    }
}

fn observed(
    profile: &Path,
    rigs: &[LoadedRig],
    every: u64,
    rec: &mut Recorder,
) -> Result<ReplayReport, standfast_sim::Error> {
    let p = LogProfile::load(profile).unwrap();
    let mut m = Merger::open(&p, ErrorPolicy::Stop).unwrap();
    let opts = ReplayOptions {
        verdicts_every: every,
    };
    replay(rigs, &mut m, opts, Some(rec))
}

// The verdicts are stepped and kept on the guard thread and handed out on
// the reading one, batch by batch (1024 records; the ramp has 2400): the
// observer still gets them in record order, rig by rig: every record's
// with `verdicts_every` 1, and with 7 exactly those of every 7th record
// and of the records with a level change or fault (the reference: the
// full sequence filtered by that rule, as `ReplayObserver::verdict`
// states it).
#[test]
fn observer_gets_the_verdicts_in_record_order_across_batches() {
    let dir = tempfile::tempdir().unwrap();
    let profile = premerged(dir.path());
    let rigs = [demo_rig(), demo_rig()];
    let mut all = Recorder::default();
    let rep = observed(&profile, &rigs, 1, &mut all).unwrap();
    assert!(all.finished);
    assert_eq!(all.seen.len(), 2 * 2 * RAMP_S as usize);
    for (k, (rig, t_s, _, _)) in all.seen.iter().enumerate() {
        assert_eq!(*rig, k % 2);
        assert_eq!(*t_s, f64::from(u32::try_from(k / 2).unwrap()) * 0.5);
    }
    // The ramp has level changes and faults for the rule to force out.
    let forced = all.seen.iter().filter(|s| s.0 == 0 && s.3).count();
    assert!(forced >= rep.rigs[0].level_changes.len() + rep.rigs[0].faults.len());
    assert!(forced > 2);
    let mut some = Recorder::default();
    observed(&profile, &rigs, 7, &mut some).unwrap();
    let want: Vec<_> = all
        .seen
        .iter()
        .enumerate()
        .filter(|(k, s)| (k / 2) % 7 == 0 || s.3)
        .map(|(_, s)| *s)
        .collect();
    assert_eq!(some.seen, want);
}

// An observer that cannot write stops the replay at that verdict: its
// error is returned, no later verdict is handed out, and it is not told
// the replay finished (here at verdict 1500, in the second batch).
#[test]
fn observer_error_stops_the_replay_at_that_verdict() {
    let dir = tempfile::tempdir().unwrap();
    let profile = premerged(dir.path());
    let mut rec = Recorder {
        fail_at: Some(1500),
        ..Recorder::default()
    };
    let e = observed(&profile, &[demo_rig()], 1, &mut rec).unwrap_err();
    assert!(e.to_string().contains("disk full"), "{e}");
    assert_eq!(rec.seen.len(), 1500);
    assert_eq!(rec.seen.last().map(|s| s.1), Some(1499.0 * 0.5));
    assert!(!rec.finished);
}

// A bad row (under `on_error = stop`) in the second batch: every record
// read before it is stepped and its verdict handed out, in order, then the
// merge's error is returned.
#[test]
fn merge_error_comes_after_the_verdicts_of_the_records_before_it() {
    let dir = tempfile::tempdir().unwrap();
    let profile = premerged(dir.path());
    let csv = dir.path().join("merged.csv");
    let text = std::fs::read_to_string(&csv).unwrap();
    let mut lines: Vec<&str> = text.lines().collect();
    // Row 1800 (line 1801 after the header) becomes malformed.
    lines[1801] = "1700000900.0,not a number,0,1,,";
    std::fs::write(&csv, lines.join("\n") + "\n").unwrap();
    let mut rec = Recorder::default();
    let e = observed(&profile, &[demo_rig()], 1, &mut rec).unwrap_err();
    assert!(matches!(e, standfast_sim::Error::Log(_)), "{e}");
    assert_eq!(rec.seen.len(), 1800);
    assert_eq!(rec.seen.last().map(|s| s.1), Some(1799.0 * 0.5));
    assert!(!rec.finished);
}
