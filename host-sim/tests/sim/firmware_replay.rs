//! host-sim's replay of the firmware example's invented short night
//! (firmware-example/replay/: rig.toml, profile.toml, short-night.csv and
//! short-night-host.csv) gives the guard's own event lines the firmware's
//! host replay gives (`guard event ...`, firmware-example/src/replay.rs
//! `Replay::guard_events`). The reference is the firmware crate's own run of
//! the same core guard (cross-implementation check, no outside source); the
//! firmware's test (firmware-example/tests/host/replay.rs) lists the same
//! nine events (the first two the guard's start in sensor_fault and its
//! end) with where each comes from in the log's script
//! (firmware-example/replay/make_short_night.py). That rig.toml is the
//! firmware's example rig and guard settings is checked on the firmware side
//! (firmware-example/tests/host/rig_file.rs, through host-sim's rig loader).

use standfast_sim::commands::replay::open_logs;
use standfast_sim::input::rigfile;
use standfast_sim::model::replay::{replay, ReplayOptions};
use standfast_sim::render::event_lines;
use std::path::PathBuf;

fn dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../firmware-example/replay")
}

#[test]
fn short_night_gives_the_firmware_guard_events() {
    let d = dir();
    let rig = rigfile::load(&d.join("rig.toml")).unwrap();
    // host-sim's CSV reader has no comment lines: the log without its `#` line.
    let text = std::fs::read_to_string(d.join("short-night.csv")).unwrap();
    let stripped: String = text
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| format!("{l}\n"))
        .collect();
    let tmp = std::env::temp_dir().join(format!("standfast-fw-night-{}.csv", std::process::id()));
    std::fs::write(&tmp, stripped).unwrap();
    let mut merger = open_logs(
        &d.join("profile.toml"),
        &[tmp.clone(), d.join("short-night-host.csv")],
    )
    .unwrap();
    let rep = replay(
        std::slice::from_ref(&rig),
        &mut merger,
        ReplayOptions::default(),
        None,
    )
    .unwrap();
    std::fs::remove_file(&tmp).ok();
    assert_eq!(rep.issues_total, 0);
    assert_eq!(rep.records, 1200);
    // Guard settings: the defaults with a 20 s dwell, 30 s time to park and
    // 10 s fault clearing time (rig.toml [guard]). Gate of second k at
    // (k+1)·1000 ms.
    let expected = [
        // A guard starts in sensor_fault: no wind reading at 0 ms (the first
        // gate mean comes at 1000 ms).
        "event t_ms=0 kind=fault sensor=wind_speed class=no_reading",
        // Wind record from 1000 ms: the 3-s gust is defined from 3750 ms
        // (12 fine bins of 250 ms), the first figures come with the
        // evaluation at 4000 ms (one per 1000 ms from 0); 10 s fault
        // clearing time to 14 000, to the level the figures call for, at
        // least watch: park_now, by the blow of seconds 10–19
        // (15.3/16.05 m/s) at the observing pose (the level read off a run).
        "event t_ms=14000 kind=level from=sensor_fault to=park_now",
        // Park pose reported from 20 000 ms, figures settled below
        // 0.8 × park from then (read off a run): 20 s dwell to 40 000.
        "event t_ms=40000 kind=level from=park_now to=watch",
        // Pulses missing 60.1–71.9 s: the last wind sample at 60 000 is
        // stale (> 10 s) at the first row after 70 000.
        "event t_ms=70100 kind=fault sensor=wind_speed class=stale",
        "event t_ms=70100 kind=fault sensor=wind_direction class=stale",
        "event t_ms=70100 kind=level from=watch to=sensor_fault",
        // Wind back at 73 000 (the firmware's restarted gate), 10 s fault
        // clearing time, then no lower than watch.
        "event t_ms=83000 kind=level from=sensor_fault to=watch",
        // The storm ramp from second 90 (21.3, 24.3, 27.3 m/s) at the park
        // pose; the times were read off a run. The alarm latches.
        "event t_ms=93000 kind=level from=watch to=park_now",
        "event t_ms=95000 kind=level from=park_now to=alarm",
    ];
    let want: String = expected.iter().map(|l| format!("{l}\n")).collect();
    assert_eq!(event_lines::lines(&rep).unwrap(), want);
}

/// The LIS3DH driver's conversion, f32(word >> 4) · f32(0.001) (firmware
/// src/lis3dh.rs `RawSample::to_g` at ±2 g), equals host-sim's, word × scale
/// in f64 with scale = f32(0.001)/16, then g → m/s² → g and rounded to f32
/// (src/log/profile.rs `to_si`, src/replay.rs `inputs_of`), for all 4096
/// 12-bit values: the profile's scale makes the two sides bit-identical.
#[test]
fn profile_accel_scale_reproduces_the_driver_in_f32() {
    let c = 0.001_f32;
    let scale = f64::from(c) / 16.0;
    assert_eq!(scale, 6.250_000_296_859_07e-5);
    let g0 = standfast::math::STANDARD_GRAVITY_MPS2_F64;
    for n in -2048_i16..2048 {
        let word = n * 16;
        let firmware = f32::from(word >> 4) * c;
        #[allow(clippy::cast_possible_truncation)]
        let host = ((f64::from(word) * scale * g0 + 0.0) / g0) as f32;
        assert_eq!(firmware.to_bits(), host.to_bits(), "word {word}");
    }
}

/// The rig file's air (ISA at elevation 0, host-sim) has the same density
/// as the firmware guard's `Air::default()` (ISO 2533 sea level), so the
/// guards see the same air; and its `[guard]` section changes only the
/// dwell, time to park and fault clearing time (the firmware's
/// `example_guard_config`, compared there with this file).
#[test]
fn rig_file_air_equals_the_guard_default_air() {
    let rig = rigfile::load(&dir().join("rig.toml")).unwrap();
    assert_eq!(
        rig.air.density_kg_per_m3().to_bits(),
        standfast::air::Air::default().density_kg_per_m3().to_bits()
    );
    assert_eq!(
        rig.guard,
        standfast::guard::GuardConfig {
            dwell_s: 20.0,
            time_to_park_s: 30.0,
            fault_clear_s: 10.0,
            ..standfast::guard::GuardConfig::default()
        }
    );
}
