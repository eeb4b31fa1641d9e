//! The live bridge (`standfast bridge`): its line parser, and the command as
//! another program drives it through a pipe, with the invented demo rig
//! `host-sim/demo/rig.toml`. Most checks here are of the line protocol
//! documented in host-sim/src/bridge.rs (one answer per line, errors that do
//! not stop the stream); outside figures are named where one is used.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};

use serde_json::Value;
use standfast::mount::PierSide;
use standfast_sim::commands::bridge::{
    parse_json_line, Answer, Bridge, CsvHeader, InputFormat, Sample,
};
use standfast_sim::input::rigfile;

fn demo_rig() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("demo/rig.toml")
}

/// Runs the bridge with `args` on `input`, returning its output.
fn bridge(args: &[&str], input: &str, env: &[(&str, &Path)]) -> Output {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_standfast"));
    cmd.arg("bridge")
        .arg("--rig")
        .arg(demo_rig())
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped());
    for (k, v) in env {
        cmd.env(k, v);
    }
    let mut child = cmd.spawn().unwrap();
    let mut stdin = child.stdin.take().unwrap();
    let text = input.to_owned();
    // Write from another thread so a full stdout pipe cannot deadlock us.
    let writer = std::thread::spawn(move || {
        stdin.write_all(text.as_bytes()).unwrap();
    });
    let out = child.wait_with_output().unwrap();
    writer.join().unwrap();
    out
}

fn lines(out: &Output) -> Vec<Value> {
    String::from_utf8(out.stdout.clone())
        .unwrap()
        .lines()
        .map(|l| serde_json::from_str::<Value>(l).unwrap_or_else(|e| panic!("{e}: {l}")))
        .collect()
}

/// A windy sample every 250 ms for `n` lines: level ground (1 g straight
/// up, give or take 2e-4 g), wind 6 to 8 m/s from 265°, varying so no
/// sensor looks stuck (a reading frozen for 60 s is a stuck sensor by the
/// guard's default).
fn windy(n: u64) -> String {
    (0..n)
        .map(|i| {
            let wind = 6.0 + f64::from(u32::try_from(i % 9).unwrap()) * 0.25;
            let z = 1.0 + f64::from(u32::try_from(i % 3).unwrap()) * 1e-4;
            format!(
                "{{\"t_ms\": {}, \"accel_g\": [0, 0, {z}], \"wind_mps\": {wind}, \"wind_from_deg\": 265}}\n",
                i * 250
            )
        })
        .collect()
}

#[test]
fn json_line_parser_reads_every_field_and_names_unknown_ones() {
    let s = parse_json_line(
        r#"{"t_ms": 1234, "accel_g": [0, 0.1, 1], "wind_mps": 5.2, "wind_from_deg": 270,
            "ha_deg": -15, "dec_deg": 40, "pier_side": "tube_west", "cover": true,
            "temp_c": 5, "pressure_hpa": 990, "ack": true}"#,
    )
    .unwrap();
    assert_eq!(s.t_ms, Some(1234));
    assert_eq!(s.accel_g, Some([0.0, 0.1, 1.0]));
    assert_eq!(s.wind_mps, Some(5.2));
    assert_eq!(s.wind_from_deg, Some(270.0));
    assert_eq!((s.ha_deg, s.dec_deg), (Some(-15.0), Some(40.0)));
    assert_eq!(s.pier_side, Some(PierSide::TubeWest));
    assert_eq!((s.cover, s.ack), (Some(true), Some(true)));
    assert_eq!((s.temp_c, s.pressure_hpa), (Some(5.0), Some(990.0)));
    // Only the time: everything else absent.
    let s = parse_json_line(r#"{"t_s": 2.5}"#).unwrap();
    assert_eq!(
        s,
        Sample {
            t_s: Some(2.5),
            ..Sample::default()
        }
    );
    let e = parse_json_line(r#"{"t_ms": 1, "gust_mps": 3}"#).unwrap_err();
    assert!(e.contains("unknown field `gust_mps`"), "{e}");
    let e = parse_json_line(r#"{"t_ms": 1, "wind_mps": "fast"}"#).unwrap_err();
    assert!(e.contains("invalid type"), "{e}");
    let e = parse_json_line(r#"{"t_ms": -5}"#).unwrap_err();
    assert!(e.contains("invalid value"), "{e}");
    assert!(parse_json_line("{\"t_ms\": 1").is_err());
}

#[test]
fn csv_line_parser_maps_columns_and_treats_empty_cells_as_absent() {
    let h = CsvHeader::parse("t_ms, accel_x_g,accel_y_g,accel_z_g,wind_mps,pier_side,cover,ack")
        .unwrap();
    let s = h
        .parse_row("1500,0.01,-0.02,0.99,,tube_east,1,false")
        .unwrap();
    assert_eq!(s.t_ms, Some(1500));
    assert_eq!(
        (s.accel_x_g, s.accel_y_g, s.accel_z_g),
        (Some(0.01), Some(-0.02), Some(0.99))
    );
    assert_eq!(s.wind_mps, None);
    assert_eq!(s.pier_side, Some(PierSide::TubeEast));
    assert_eq!((s.cover, s.ack), (Some(true), Some(false)));
    let e = h.parse_row("1500,0.01").unwrap_err();
    assert!(e.contains("2 cells") && e.contains("8 columns"), "{e}");
    let e = h.parse_row("1500,0,0,1,calm,,,").unwrap_err();
    assert!(e.contains("wind_mps") && e.contains("calm"), "{e}");
    let e = CsvHeader::parse("t_ms,wind_kmh").unwrap_err();
    assert!(e.contains("wind_kmh") && e.contains("wind_mps"), "{e}");
    assert!(CsvHeader::parse("t_ms,t_ms").unwrap_err().contains("twice"));
    assert!(CsvHeader::parse("t_ms,accel_g").is_err());
}

#[test]
fn bridge_checks_ranges_and_holds_the_pose() {
    let rig = rigfile::load(&demo_rig()).unwrap();
    let mut b = Bridge::new(&rig, InputFormat::Json);
    let mut answer = |n: u64, text: &str| b.line(n, text, None).unwrap();
    let Answer::Verdict(v) = answer(1, r#"{"t_ms": 0, "ha_deg": 30, "dec_deg": 10}"#) else {
        panic!("no verdict")
    };
    let pose = serde_json::to_value(v.pose).unwrap();
    assert!(
        (pose["ha_deg"].as_f64().unwrap() - 30.0).abs() < 1e-4,
        "{pose}"
    );
    assert!(
        (pose["dec_deg"].as_f64().unwrap() - 10.0).abs() < 1e-4,
        "{pose}"
    );
    assert_eq!(
        pose["pier_side"], "tube_east",
        "tube east until a side is given"
    );
    // The hour angle holds when only the declination changes.
    let Answer::Verdict(v) = answer(2, r#"{"t_ms": 100, "dec_deg": 20}"#) else {
        panic!("no verdict")
    };
    let pose = serde_json::to_value(v.pose).unwrap();
    assert!(
        (pose["ha_deg"].as_f64().unwrap() - 30.0).abs() < 1e-4,
        "{pose}"
    );
    assert!(
        (pose["dec_deg"].as_f64().unwrap() - 20.0).abs() < 1e-4,
        "{pose}"
    );
    for (text, needle) in [
        (r#"{"t_ms": 200, "dec_deg": 95}"#, "dec_deg = 95"),
        (r#"{"t_ms": 200, "wind_mps": -1}"#, "wind_mps = -1"),
        (
            r#"{"t_ms": 200, "wind_mps": 3, "wind_from_deg": 400}"#,
            "wind_from_deg",
        ),
        (r#"{"t_ms": 200, "accel_g": [0, 0, 30]}"#, "accel z"),
        (r#"{"t_ms": 200, "temp_c": 10}"#, "pressure_hpa"),
        (r#"{"t_ms": 200, "t_s": 0.2}"#, "not both"),
        (r#"{"wind_mps": 3}"#, "t_ms or t_s"),
        (r#"{"t_ms": 50}"#, "backwards"),
    ] {
        match answer(3, text) {
            Answer::Error(e) => assert!(e.contains(needle), "{text}: {e}"),
            other => panic!("{text}: {other:?}"),
        }
    }
    // Equal time is accepted; `t_s` rounds to whole milliseconds.
    assert!(matches!(answer(4, r#"{"t_ms": 100}"#), Answer::Verdict(_)));
    let Answer::Verdict(v) = answer(5, r#"{"t_s": 0.2504}"#) else {
        panic!("no verdict")
    };
    assert_eq!(v.t_ms, 250);
    assert_eq!(answer(6, "   "), Answer::Nothing);
}

/// The level a guard on the demo rig is in at `t_ms` when samples with
/// wind, direction and a level accelerometer arrive from t = 0 on, every
/// 250 or 500 ms, in a light wind that calls for `clear`. Derived from the
/// guard's rules and the demo rig's settings (host-sim/demo/rig.toml: one
/// evaluation per 1000 ms and a 60 s fault clearing time by default, a 30 s
/// dwell): a guard starts in sensor_fault (no wind gust yet); the 3-s gust
/// is defined once the wind record spans 12 fine bins of 250 ms (from
/// 2750 ms), so the first figures come with the evaluation at 3000 ms;
/// healthy from then, the fault clears at 63 000 ms, to no lower than
/// watch; the figures have been settled below watch since 3000 ms, longer
/// than the dwell, so the next step is clear.
fn start_level(t_ms: u64, step_ms: u64) -> &'static str {
    match t_ms {
        t if t < 63_000 => "sensor_fault",
        63_000 => "watch",
        t if t >= 63_000 + step_ms => "clear",
        _ => unreachable!("{t_ms} is not a step time"),
    }
}

#[test]
fn the_bridge_answers_every_line_with_one_json_line() {
    // 65 s of samples: past the guard's start (`start_level`).
    let n = 260;
    let out = bridge(&[], &windy(n), &[]);
    assert_eq!(out.status.code(), Some(0));
    let v = lines(&out);
    assert_eq!(v.len(), 260);
    for (i, l) in v.iter().enumerate() {
        assert_eq!(l["line"], u64::try_from(i).unwrap() + 1);
        let t = u64::try_from(i).unwrap() * 250;
        assert_eq!(l["t_ms"], t);
        assert!(l["level"].is_string() && l["faults"].is_array(), "{l}");
        assert_eq!(l["level"], start_level(t, 250), "{l}");
        // A guard that cannot see asks for park and alarm.
        let blind = l["level"] == "sensor_fault";
        assert_eq!(l["park_requested"], blind, "{l}");
        assert_eq!(l["alarm"], blind, "{l}");
    }
    // Until the first gust the figures are absent (null, never 0) and the
    // fault says why.
    assert!(v[0]["gust_mps"].is_null(), "{}", v[0]);
    assert_eq!(
        v[0]["faults"][0],
        "wind speed sensor: no usable reading yet"
    );
    let last = v.last().unwrap();
    assert_eq!(last["level"], "clear", "{last}");
    assert_eq!(last["park_requested"], false);
    // A defined wind direction passes through unchanged (degrees in and out).
    assert!((last["wind_from_deg"].as_f64().unwrap() - 265.0).abs() < 1e-3);
    assert!(last["gust_mps"].as_f64().unwrap() > 0.0);
    assert!(last["tip_wind_mps"].as_f64().unwrap() > last["gust_mps"].as_f64().unwrap());
    // 1 g straight up is level ground: tilt = atan(√(ax²+ay²)/az) = 0
    // (the tilt-from-gravity relation of three-axis tilt sensing, e.g.
    // Freescale AN3461; from memory).
    assert!(last["tilt_deg"].as_f64().unwrap().abs() < 1e-3);
    // Standard output is machine-readable; the cautions go to stderr.
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(err.contains("Secure the rig anyway"), "{err}");
    assert!(!String::from_utf8(out.stdout).unwrap().contains("caution"));
}

#[test]
fn a_steady_tilt_reads_as_the_gravity_angle() {
    // 2° toward the east: accel (sin 2°, 0, cos 2°) in g. Tilt from a
    // three-axis accelerometer: θ = atan2(√(ax²+ay²), az) (Freescale AN3461,
    // from memory); the downhill side is where gravity's horizontal part
    // points, the +x (east, 90°) side.
    let (s, c) = 2.0_f64.to_radians().sin_cos();
    let input: String = (0..60)
        .map(|i| {
            format!(
                "{{\"t_ms\": {}, \"accel_g\": [{s}, 0, {c}], \"wind_mps\": {}}}\n",
                i * 200,
                3.0 + f64::from(i % 4) * 0.1
            )
        })
        .collect();
    let out = bridge(&[], &input, &[]);
    let v = lines(&out);
    let last = v.last().unwrap();
    assert!(
        (last["tilt_deg"].as_f64().unwrap() - 2.0).abs() < 0.01,
        "{last}"
    );
    let downhill = last["tilt_downhill_deg"].as_f64().unwrap();
    assert!(
        (downhill - 90.0).abs() < 0.5 || (downhill - 270.0).abs() < 0.5,
        "{last}"
    );
}

#[test]
fn a_bad_line_gets_an_error_line_and_the_stream_goes_on() {
    let mut input: Vec<String> = windy(6).lines().map(str::to_owned).collect();
    input[2] = r#"{"t_ms": 500, "wind_mps": 6, "gust_mps": 9}"#.into();
    input[3] = "not json at all".into();
    let out = bridge(&[], &(input.join("\n") + "\n"), &[]);
    assert_eq!(out.status.code(), Some(0));
    let v = lines(&out);
    assert_eq!(v.len(), 6);
    assert_eq!(v[2]["line"], 3);
    assert!(
        v[2]["error"].as_str().unwrap().contains("gust_mps"),
        "{}",
        v[2]
    );
    assert_eq!(v[3]["line"], 4);
    assert!(v[3]["error"].is_string());
    for i in [0, 1, 4, 5] {
        assert!(v[i]["level"].is_string(), "{}", v[i]);
        assert!(v[i].get("error").is_none());
    }
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(err.contains("line 3") && err.contains("line 4"), "{err}");
}

#[test]
fn csv_input_answers_every_row_after_the_header() {
    let mut input = String::from("t_ms,accel_x_g,accel_y_g,accel_z_g,wind_mps,wind_from_deg\n");
    for i in 0..10 {
        input.push_str(&format!(
            "{},0,0,1,{},180\n",
            i * 500,
            4.0 + f64::from(i) * 0.1
        ));
    }
    input.push_str("5000,0,0,1,999,180\n");
    let out = bridge(&["--format", "csv"], &input, &[]);
    assert_eq!(out.status.code(), Some(0));
    let v = lines(&out);
    assert_eq!(v.len(), 11);
    assert_eq!(v[0]["line"], 2, "the header is line 1 and gives no answer");
    assert!(
        v[10]["error"].as_str().unwrap().contains("wind_mps = 999"),
        "{}",
        v[10]
    );
}

/// One sample every 500 ms, line `i` at `i` × 500 ms: a light wind (3 to
/// 3.8 m/s, from 200 to 206°) with a level accelerometer, or (`wind` false)
/// the accelerometer alone. A working accelerometer and vane are never
/// perfectly still.
fn sample_500ms(i: u64, wind: bool) -> String {
    let k = u32::try_from(i).unwrap();
    let z = 1.0 + f64::from(k % 3) * 1e-4;
    if !wind {
        return format!("{{\"t_ms\": {}, \"accel_g\": [0, 0, {z}]}}\n", i * 500);
    }
    let speed = 3.0 + f64::from(k % 5) * 0.2;
    let from = 200 + i % 7;
    format!(
        "{{\"t_ms\": {}, \"accel_g\": [0, 0, {z}], \"wind_mps\": {speed}, \"wind_from_deg\": {from}}}\n",
        i * 500
    )
}

/// Lines 0 to 128 (0 to 64 000 ms): light wind, the guard's warm-up; it is
/// `clear` from 63 500 ms (`start_level`). Then lines 129 to 168 (64 500 to
/// 84 000 ms): the accelerometer alone, the anemometer silent for 20 s. The
/// demo rig sets `wind_stale = "15 s"` (host-sim/demo/rig.toml): the last
/// wind sample at 64 000 ms is stale once more than 15 s old, at the first
/// line after 79 000 ms, 79 500 ms.
fn silent_wind() -> String {
    (0..=168).map(|i| sample_500ms(i, i <= 128)).collect()
}

#[test]
fn a_silent_anemometer_becomes_a_sensor_fault_with_park_and_alarm() {
    let out = bridge(&[], &silent_wind(), &[]);
    let v = lines(&out);
    assert_eq!(v.len(), 169);
    for l in &v {
        let t = l["t_ms"].as_u64().unwrap();
        if t < 63_500 {
            assert_eq!(l["level"], start_level(t, 500), "{l}");
        } else if t <= 79_000 {
            assert_eq!(l["level"], "clear", "{l}");
            assert_eq!(l["alarm"], false);
        } else {
            assert_eq!(l["level"], "sensor_fault", "{l}");
            assert_eq!(l["park_requested"], true);
            assert_eq!(l["alarm"], true);
            let faults = l["faults"].as_array().unwrap();
            assert!(
                faults.iter().any(|f| f
                    .as_str()
                    .unwrap()
                    .starts_with("wind speed sensor: no sample")),
                "{l}"
            );
        }
    }
    let first = v
        .iter()
        .find(|l| l["level"] == "sensor_fault" && l["t_ms"].as_u64().unwrap() > 63_000)
        .unwrap();
    assert_eq!(first["t_ms"], 79_500);
    let changed = first["events"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["kind"] == "level_changed")
        .unwrap();
    assert_eq!(changed["from"], "clear");
    assert_eq!(changed["cause"], "sensor_fault");
}

#[test]
fn on_change_runs_the_command_with_the_level_names() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("changes.txt");
    // The warm-up, wind silent for 20 s (sensor fault), then back for 65 s,
    // beyond the guard's default 60 s fault-clear time
    // (core/src/guard/config.rs), so the level steps down again.
    let mut input = silent_wind();
    for i in 169..=299 {
        input.push_str(&sample_500ms(i, true));
    }
    let cmd = r#"echo "$STANDFAST_PREVIOUS_LEVEL>$STANDFAST_LEVEL $STANDFAST_CAUSE $STANDFAST_T_MS" >> "$CHANGES_FILE""#;
    let out = bridge(&["--on-change", cmd], &input, &[("CHANGES_FILE", &file)]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v = lines(&out);
    assert_eq!(v.len(), 300);
    // Every level change in the verdict stream, in order, as the command
    // should have written it.
    let expected: Vec<String> = v
        .iter()
        .flat_map(|l| {
            l["events"]
                .as_array()
                .unwrap()
                .iter()
                .filter(|e| e["kind"] == "level_changed")
                .map(|e| {
                    format!(
                        "{}>{} {} {}",
                        e["from"].as_str().unwrap(),
                        e["to"].as_str().unwrap(),
                        e["cause"].as_str().unwrap(),
                        l["t_ms"]
                    )
                })
                .collect::<Vec<_>>()
        })
        .collect();
    // The start (`start_level`) and the silence (`silent_wind`); the wind
    // is back at 84 500 ms, which ends the stale faults; healthy from then,
    // the fault clears 60 s later, at 144 500 ms, to no lower than watch;
    // settled since 84 500 ms (a fault restarts the settled timers), past
    // the 30 s dwell, so clear at the next line.
    assert_eq!(
        expected,
        [
            "sensor_fault>watch fault_cleared 63000",
            "watch>clear settled 63500",
            "clear>sensor_fault sensor_fault 79500",
            "sensor_fault>watch fault_cleared 144500",
            "watch>clear settled 145000",
        ]
    );
    // The bridge waits for its children at the end of input. Children run
    // concurrently, so the order of their appends is not guaranteed.
    let text = std::fs::read_to_string(&file).unwrap();
    let mut got: Vec<&str> = text.lines().collect();
    let mut want: Vec<&str> = expected.iter().map(String::as_str).collect();
    got.sort_unstable();
    want.sort_unstable();
    assert_eq!(got, want, "{text}");
    // The command's own output never reaches the verdict stream.
    assert!(String::from_utf8(out.stdout)
        .unwrap()
        .lines()
        .all(|l| l.starts_with('{')));
}

#[test]
fn a_command_that_cannot_run_is_reported_and_the_stream_goes_on() {
    // Three level changes (63 000, 63 500 and 79 500 ms: `silent_wind`).
    let out = bridge(&["--on-change", "exit 7"], &silent_wind(), &[]);
    assert_eq!(out.status.code(), Some(0));
    assert_eq!(lines(&out).len(), 169);
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(
        err.contains("--on-change command ended with exit status: 7"),
        "{err}"
    );
}

#[test]
fn the_wall_clock_needs_no_sample_time() {
    let out = bridge(
        &["--clock", "wall"],
        "{\"wind_mps\": 3}\n{\"wind_mps\": 3.2}\n",
        &[],
    );
    let v = lines(&out);
    assert_eq!(v.len(), 2);
    assert!(v.iter().all(|l| l["level"].is_string()), "{v:?}");
    assert!(v[0]["t_ms"].as_u64().unwrap() <= v[1]["t_ms"].as_u64().unwrap());
}

#[test]
fn an_alarm_latches_until_a_line_acknowledges_it() {
    // A line a second. 65 s of light air: the guard's warm-up, clear from
    // 64 000 ms (`start_level` with 1000 ms steps). Then 10 s of a 30 m/s
    // storm, far beyond the demo rig's alarm threshold (its tip wind in the
    // home pose is near 23 m/s, well below), then 990 s of light air:
    // beyond the 10-minute peak-gust window and the rig's 30 s dwell, so
    // every figure has settled; the alarm still holds until the last line
    // acknowledges it (core/src/guard/mod.rs: the alarm latches until
    // acknowledged).
    const WARM: u32 = 65;
    let input: String = (0..WARM + 1000)
        .map(|i| {
            let k = f64::from(i % 4);
            let storm = (WARM..WARM + 10).contains(&i);
            let wind = if storm { 30.0 + k * 0.3 } else { 3.0 + k * 0.2 };
            let z = 1.0 + f64::from(i % 3) * 1e-4;
            let ack = if i == WARM + 999 { ", \"ack\": true" } else { "" };
            format!(
                "{{\"t_ms\": {}, \"accel_g\": [0, 0, {z}], \"wind_mps\": {wind}, \"wind_from_deg\": {}{ack}}}\n",
                i * 1000,
                248 + i % 5
            )
        })
        .collect();
    let out = bridge(&[], &input, &[]);
    let v = lines(&out);
    let warm = usize::try_from(WARM).unwrap();
    assert_eq!(v.len(), warm + 1000);
    for (i, l) in v.iter().enumerate().take(warm) {
        let t = u64::try_from(i).unwrap() * 1000;
        assert_eq!(l["level"], start_level(t, 1000), "{l}");
    }
    let first_alarm = v.iter().position(|l| l["level"] == "alarm").unwrap();
    assert!(
        (warm..warm + 10).contains(&first_alarm),
        "alarm in the storm"
    );
    let raised = v[first_alarm]["events"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["kind"] == "level_changed")
        .unwrap();
    assert_eq!(raised["cause"], "overturning", "{raised}");
    for l in &v[first_alarm..warm + 999] {
        assert_eq!(l["level"], "alarm", "{l}");
        assert_eq!(l["park_requested"], true);
    }
    assert!(v[warm + 998]["overturning_utilisation"].as_f64().unwrap() < 0.1);
    let last = &v[warm + 999];
    assert_eq!(last["acknowledged"], true);
    assert_ne!(last["level"], "alarm", "{last}");
    assert_eq!(last["alarm"], false);
}
