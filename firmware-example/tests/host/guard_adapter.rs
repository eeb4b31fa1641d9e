//! The Standfast guard as the station's assessment (`GuardAssess`), on its
//! own: stages map to the fail-safe lines, the alarm latches until
//! acknowledged, and a guard sensor fault de-energises both lines.
//!
//! The thresholds are the guard's documented defaults (core/src/guard.rs:
//! park at a predicted overturning utilisation of 0.75, after ASME B30.5
//! §5-1.1.1; alarm at a present utilisation of 0.9, after EN 13000 limiter
//! practice; 600 s dwell). The wind speeds below are chosen on either side of
//! those thresholds for the invented example rig, not derived by hand: the
//! checks are on the adapter's mapping and the order of the stages, which the
//! guard's documentation fixes (escalation immediate, Clear < Watch <
//! ParkNow < Alarm < SensorFault, alarm latched until acknowledged).
//! The fail-safe convention (lines de-energised = low to request) is common
//! practice for safety interlocks, no source.

use standfast::guard::GuardConfig;
use standfast::math::Vec3;
use standfast_firmware::guard_adapter::example_rig;
use standfast_firmware::lines::FailSafeLines;
use standfast_firmware::replay::MemoryPin;
use standfast_firmware::{
    Assess, Assessment, GuardAssess, LineState, RaisedFault, Samples, WindSample,
};

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

/// Drives fail-safe lines on two memory pins from an assessment; returns
/// (park pin high, alarm pin high).
fn pins_for(a: &Assessment) -> (bool, bool) {
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

/// Runs steps `from..to` with wind `speed_mps`; returns the stages entered
/// (in order, each once) and the last assessment.
fn run(
    g: &mut GuardAssess<'_>,
    from: u64,
    to: u64,
    speed_mps: f32,
    stages: &mut Vec<&'static str>,
) -> Assessment {
    let mut last = None;
    for i in from..to {
        let a = g.assess(&samples(i, speed_mps));
        if stages.last() != Some(&a.stage) {
            stages.push(a.stage);
        }
        last = Some(a);
    }
    last.unwrap()
}

#[test]
fn a_large_steady_wind_parks_then_alarms_with_both_lines_low() {
    let rig = example_rig().unwrap();
    let mut g = GuardAssess::new(&rig, GuardConfig::default(), 0, None).unwrap();
    let mut stages = Vec::new();
    let calm = run(&mut g, 0, 100, 3.0, &mut stages);
    assert_eq!((calm.park, calm.alarm, calm.stage), (false, false, "clear"));
    assert_eq!(pins_for(&calm), (true, true), "all well: both energised");

    // A strong steady wind: a park is due, no alarm yet.
    let strong = run(&mut g, 100, 700, 17.0, &mut stages);
    assert_eq!(
        (strong.park, strong.alarm, strong.stage),
        (true, false, "park_now")
    );
    assert_eq!(pins_for(&strong), (false, true), "park line de-energised");

    // A stronger steady wind: the alarm.
    let storm = run(&mut g, 700, 1300, 24.0, &mut stages);
    assert_eq!(
        (storm.park, storm.alarm, storm.stage),
        (true, true, "alarm")
    );
    assert_eq!(pins_for(&storm), (false, false), "both lines de-energised");
    assert_eq!(g.guard_stage(), standfast::guard::Stage::Alarm);

    // Stages only rose, through park_now before the alarm.
    let at = |name| stages.iter().position(|s| *s == name).unwrap();
    assert!(at("clear") < at("park_now") && at("park_now") < at("alarm"));
    assert!(g.raised_faults().is_empty());
}

#[test]
fn acknowledge_after_a_long_calm_clears_the_latched_alarm() {
    let rig = example_rig().unwrap();
    let mut g = GuardAssess::new(&rig, GuardConfig::default(), 0, None).unwrap();
    let mut stages = Vec::new();
    let storm = run(&mut g, 0, 600, 24.0, &mut stages);
    assert!(storm.alarm);
    // 30 minutes of calm: far longer than the 10-minute gust window plus the
    // 600 s dwell, yet the alarm stays latched without an acknowledge.
    let calm = run(&mut g, 600, 600 + 18_000, 1.0, &mut stages);
    assert_eq!((calm.park, calm.alarm, calm.stage), (true, true, "alarm"));
    assert_eq!(pins_for(&calm), (false, false));

    g.acknowledge();
    let after = g.assess(&samples(600 + 18_000, 1.0));
    assert_eq!(
        (after.park, after.alarm, after.stage),
        (false, false, "clear")
    );
    assert_eq!(pins_for(&after), (true, true), "both lines energised again");
}

#[test]
fn a_guard_sensor_fault_de_energises_both_lines() {
    let rig = example_rig().unwrap();
    let mut g = GuardAssess::new(&rig, GuardConfig::default(), 0, None).unwrap();
    // An accelerometer that repeats one identical reading for minutes: no
    // real sensor on a real rig does that, and the guard raises a fault.
    let mut first_fault = None;
    for i in 0..3000 {
        let mut s = samples(i, 3.0);
        s.accel_g = Some(Vec3::new(0.0, 0.0, 1.0));
        let a = g.assess(&s);
        if a.stage == "sensor_fault" {
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
    let mut s = samples(3000, 3.0);
    s.accel_g = Some(Vec3::new(0.0, 0.0, 1.0));
    let next = g.assess(&s);
    assert!(next.park && next.alarm);
    assert!(g.raised_faults().is_empty());
}
