//! The Standfast guard as the station's rule (`GuardRule`), on its
//! own: levels map to the fail-safe lines, the alarm latches until
//! acknowledged, and a guard sensor fault de-energises both lines.
//!
//! The thresholds are the guard's documented defaults (core/src/guard/config.rs:
//! park at a predicted overturning utilisation of 0.75, after ASME B30.5
//! §5-1.1.1; alarm at a present utilisation of 0.9, after EN 13000 limiter
//! practice; 600 s dwell). The wind speeds below are chosen on either side of
//! those thresholds for the invented example rig, not derived by hand: the
//! checks are on the adapter's mapping and the order of the levels, which the
//! guard's documentation fixes (escalation immediate, Clear < Watch <
//! ParkNow < Alarm < SensorFault, alarm latched until acknowledged, a guard
//! starts in SensorFault and leaves it only after its fault clearing time,
//! to no lower than Watch). Tests about anything but the start first run a
//! calm warm-up until the guard is `clear` (`warm_up`, times derived there).
//! The fail-safe convention (lines de-energised = low to request) is common
//! practice for safety interlocks, no source.

use standfast::guard::GuardConfig;
use standfast::math::Vec3;
use standfast_firmware::guard_adapter::example_rig;
use standfast_firmware::lines::FailSafeLines;
use standfast_firmware::replay::MemoryPin;
use standfast_firmware::{Decision, GuardRule, LineState, RaisedFault, Rule, Samples, WindSample};

/// Step period of these tests, ms.
const PERIOD_MS: u64 = 100;

/// One step's samples: a level rig and a wind of `speed_mps` from about
/// north. Every other step the readings move a little (as live sensors do),
/// so the guard's stuck-sensor checks stay quiet.
fn samples(i: u64, speed_mps: f32) -> Samples {
    let jitter = if i % 2 == 0 { 0.0 } else { 1.0 };
    Samples {
        t_ms: i * PERIOD_MS,
        accel_g: Some(Vec3::new(0.001 * jitter, 0.0, 1.0)),
        wind: Some(WindSample {
            speed_mps: speed_mps + 0.1 * jitter,
            from_rad: Some(0.05 * jitter),
        }),
        pose: None,
    }
}

/// Drives fail-safe lines on two memory pins from a decision; returns
/// (park pin high, alarm pin high).
fn pins_for(a: &Decision) -> (bool, bool) {
    let mut lines = FailSafeLines::new(MemoryPin::default(), MemoryPin::default());
    lines
        .drive(LineState {
            park_requested: a.park,
            alarm_raised: a.alarm,
        })
        .unwrap();
    let (park, alarm) = lines.release();
    (park.high, alarm.high)
}

/// Runs steps `from..to` with wind `speed_mps`; returns the levels entered
/// (in order, each once) and the last decision.
fn run(
    g: &mut GuardRule<'_>,
    from: u64,
    to: u64,
    speed_mps: f32,
    levels: &mut Vec<&'static str>,
) -> Decision {
    let mut last = None;
    for i in from..to {
        let a = g.decide(&samples(i, speed_mps));
        if levels.last() != Some(&a.level) {
            levels.push(a.level);
        }
        last = Some(a);
    }
    last.unwrap()
}

/// Steps of the calm warm-up [`warm_up`] runs: until step 6030 (603 000 ms)
/// inclusive.
const WARM_UP_STEPS: u64 = 6031;

/// Runs a calm (3 m/s) from step 0 until the guard reaches `clear`, checks
/// the start-up levels and their times, and returns the first step after it.
///
/// Derived from the guard's documented rules and its default settings
/// (`GuardConfig::default()`: one evaluation per 1000 ms, 60 s fault
/// clearing time, 600 s dwell; the wind's 3-s gust needs 12 fine bins of
/// 250 ms of record): a guard starts in `sensor_fault` (no wind reading
/// yet); the first wind sample at 0 ms starts the record in fine bin 0, so
/// the 3-s gust is defined from bin 11 (2750 ms) and the first figures come
/// with the evaluation at 3000 ms. Healthy from 3000 ms, the fault clears
/// 60 s later, at 63 000 ms, to `watch` (the calm calls for `clear`, but a
/// guard leaves `sensor_fault` to no lower than `watch`). The figures have
/// been settled below watch since 3000 ms (the settled timer runs while the
/// figures are trusted), so the 600 s dwell ends at 603 000 ms: `clear`.
fn warm_up(g: &mut GuardRule<'_>, levels: &mut Vec<&'static str>) -> u64 {
    let mut entered = Vec::new();
    for i in 0..WARM_UP_STEPS {
        let a = g.decide(&samples(i, 3.0));
        if entered.last().map(|(s, _)| *s) != Some(a.level) {
            entered.push((a.level, i * PERIOD_MS));
        }
        if levels.last() != Some(&a.level) {
            levels.push(a.level);
        }
    }
    assert_eq!(
        entered,
        [("sensor_fault", 0), ("watch", 63_000), ("clear", 603_000)]
    );
    WARM_UP_STEPS
}

#[test]
fn a_large_steady_wind_parks_then_alarms_with_both_lines_low() {
    let rig = example_rig().unwrap();
    let mut g = GuardRule::new(&rig, GuardConfig::default(), 0, None).unwrap();
    let mut levels = Vec::new();
    // Until the guard has readings and has settled, it parks and alarms.
    let first = g.decide(&samples(0, 3.0));
    assert_eq!(
        (first.park, first.alarm, first.level),
        (true, true, "sensor_fault")
    );
    assert_eq!(pins_for(&first), (false, false), "cannot see: both low");
    assert_eq!(
        g.raised_faults(),
        [RaisedFault {
            sensor: "wind_speed",
            class: "no_reading"
        }]
    );
    let mut g = GuardRule::new(&rig, GuardConfig::default(), 0, None).unwrap();
    let w = warm_up(&mut g, &mut levels);
    let calm = run(&mut g, w, w + 100, 3.0, &mut levels);
    assert_eq!((calm.park, calm.alarm, calm.level), (false, false, "clear"));
    assert_eq!(pins_for(&calm), (true, true), "all well: both energised");

    // A strong steady wind: a park is due, no alarm yet.
    let w = w + 100;
    let strong = run(&mut g, w, w + 600, 17.0, &mut levels);
    assert_eq!(
        (strong.park, strong.alarm, strong.level),
        (true, false, "park_now")
    );
    assert_eq!(pins_for(&strong), (false, true), "park line de-energised");

    // A stronger steady wind: the alarm.
    let w = w + 600;
    let storm = run(&mut g, w, w + 600, 24.0, &mut levels);
    assert_eq!(
        (storm.park, storm.alarm, storm.level),
        (true, true, "alarm")
    );
    assert_eq!(pins_for(&storm), (false, false), "both lines de-energised");
    assert_eq!(g.guard_level(), standfast::guard::AlertLevel::Alarm);

    // After the warm-up, levels only rose, through park_now before the
    // alarm.
    assert_eq!(levels[..3], ["sensor_fault", "watch", "clear"]);
    let at = |name| levels.iter().position(|s| *s == name).unwrap();
    assert!(at("clear") < at("park_now") && at("park_now") < at("alarm"));
    assert!(levels[2..].windows(2).all(|p| rank(p[0]) < rank(p[1])));
    assert!(g.raised_faults().is_empty());
}

/// The guard's levels in rising order (`AlertLevel` docs).
fn rank(level: &str) -> usize {
    ["clear", "watch", "park_now", "alarm", "sensor_fault"]
        .iter()
        .position(|s| *s == level)
        .unwrap()
}

#[test]
fn acknowledge_after_a_long_calm_clears_the_latched_alarm() {
    let rig = example_rig().unwrap();
    let mut g = GuardRule::new(&rig, GuardConfig::default(), 0, None).unwrap();
    let mut levels = Vec::new();
    let storm = run(&mut g, 0, 600, 24.0, &mut levels);
    assert!(storm.alarm);
    // 30 minutes of calm: far longer than the 10-minute gust window plus the
    // 600 s dwell, yet the alarm stays latched without an acknowledge.
    let calm = run(&mut g, 600, 600 + 18_000, 1.0, &mut levels);
    assert_eq!((calm.park, calm.alarm, calm.level), (true, true, "alarm"));
    assert_eq!(pins_for(&calm), (false, false));

    g.acknowledge();
    let after = g.decide(&samples(600 + 18_000, 1.0));
    assert_eq!(
        (after.park, after.alarm, after.level),
        (false, false, "clear")
    );
    assert_eq!(pins_for(&after), (true, true), "both lines energised again");
}

#[test]
fn a_guard_sensor_fault_de_energises_both_lines() {
    let rig = example_rig().unwrap();
    let mut g = GuardRule::new(&rig, GuardConfig::default(), 0, None).unwrap();
    // Warmed up to `clear` first, so the fault below is the stuck sensor's,
    // not the start-up's (a guard starts in sensor_fault).
    let w = warm_up(&mut g, &mut Vec::new());
    // An accelerometer that repeats one identical reading for minutes: no
    // real sensor on a real rig does that, and the guard raises a fault.
    let mut first_fault = None;
    for i in w..w + 3000 {
        let mut s = samples(i, 3.0);
        s.accel_g = Some(Vec3::new(0.0, 0.0, 1.0));
        let a = g.decide(&s);
        if a.level == "sensor_fault" {
            first_fault = Some((a, g.raised_faults().to_vec()));
            break;
        }
    }
    let (a, raised) = first_fault.expect("the guard faults a stuck accelerometer");
    assert_eq!((a.park, a.alarm), (true, true));
    assert_eq!(pins_for(&a), (false, false), "both lines de-energised");
    assert_eq!(
        raised,
        [RaisedFault {
            sensor: "accel",
            class: "stuck"
        }]
    );
    // Raised once: the next step reports no new fault but stays faulted.
    let mut s = samples(w + 3000, 3.0);
    s.accel_g = Some(Vec3::new(0.0, 0.0, 1.0));
    let next = g.decide(&s);
    assert!(next.park && next.alarm);
    assert!(g.raised_faults().is_empty());
}
