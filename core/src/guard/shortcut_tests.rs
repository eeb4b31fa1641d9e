//! The guard's shortcuts against its full path: two guards on the same rig
//! and configuration step through the same pseudo-random traces, one as it
//! runs, the other with every shortcut forgotten before every step
//! ([`Guard::forget_shortcuts`]: every decision a full transition, every
//! wind channel checked, every gust recomputed, every minute found by
//! division), writing its verdicts into one it reuses ([`Guard::step_into`]).
//! Their verdicts and decision memories must be the same, value for value
//! (compared as their `Debug` text, which tells −0 from +0), at every step.
//!
//! The traces are built to meet the shortcuts' edges: steps of 1 ms to a
//! minute, often exactly one fine wind bin (250 ms), a second or a stale
//! time (5 s) long, or one millisecond either side; the clock going back
//! (then a late sample); silences of a sensor past its stale time; bad
//! samples (NaN, out of range, out of band) and repeated identical ones (a
//! stuck reading); pose, cover and air samples; acknowledgements; winds
//! from calm to past tipping, so that every level and its dwell are seen.

use super::*;
use crate::drive::{DriveRating, Drives};
use crate::math::deg_to_rad;
use crate::mount::MountGeometry;
use crate::rig::{BodySpec, RigSpec, Stage};
use crate::support::Support;
use core::fmt::Write;

/// An invented rig: a 5 kg tube on an alt-azimuth head, a 4 kg ground mass,
/// on a small tripod, with weak drives (so that every level is reached by
/// winds up to 40 m/s, the drives' too).
fn rig() -> Rig {
    let support = Support::tripod(0.45, 0.0).unwrap();
    let mut spec = RigSpec::new(
        &support,
        MountGeometry::alt_azimuth(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
        0.3,
    )
    .with_body(BodySpec::optical_tube(5.0, 0.12, 0.7, [0.15, 0.1, 0.0]))
    .unwrap()
    .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]))
    .unwrap();
    let r = DriveRating {
        rated_nm: 2.0,
        repeated_peak_nm: 4.0,
        momentary_peak_nm: 6.0,
    };
    spec.drives = Some(Drives {
        primary: r,
        secondary: r,
        slew_acceleration_rad_per_s2: 0.0,
    });
    Rig::new(&spec).unwrap()
}

fn altaz(az_deg: f32, alt_deg: f32) -> Pose {
    Pose::Horizontal {
        azimuth_rad: deg_to_rad(az_deg),
        altitude_rad: deg_to_rad(alt_deg),
        pier_side: crate::mount::PierSide::default(),
    }
}

/// Three configurations with short times: the trace checks' (dwell 20 s,
/// fault clear 5 s, evaluation every second); one that calls readings
/// stuck after 2 to 3 s and evaluates every 2.5 s with no dwell; one that
/// evaluates at every step with no fault clear time and expects no wind
/// direction (a direction channel that never turns stale).
fn configs() -> [GuardConfig; 3] {
    let mut a = GuardConfig {
        assumed_pose: Some(altaz(0.0, 30.0)),
        dwell_s: 20.0,
        fault_clear_s: 5.0,
        time_to_park_s: 10.0,
        ..GuardConfig::default()
    };
    a.wind.stale_after_s = 5.0;
    a.wind.stuck_after_s = 60.0;
    let mut b = a.clone();
    b.wind.stuck_after_s = 3.0;
    b.tilt.stuck_after_s = 2.0;
    b.evaluate_every_s = 2.5;
    b.dwell_s = 0.0;
    let mut c = a.clone();
    c.evaluate_every_s = 0.0;
    c.fault_clear_s = 0.0;
    c.dwell_s = 7.5;
    c.wind.expect_direction = false;
    [a, b, c]
}

/// xorshift64: a fixed pseudo-random sequence.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0
    }

    /// True with probability `p_percent` %.
    fn chance(&mut self, p_percent: u64) -> bool {
        self.next() % 100 < p_percent
    }

    /// A value in `[lo, hi)`.
    fn uniform(&mut self, lo: f32, hi: f32) -> f32 {
        #[allow(clippy::cast_precision_loss)]
        let share = (self.next() >> 40) as f32 / (1u64 << 24) as f32;
        lo + (hi - lo) * share
    }

    fn pick<T: Copy>(&mut self, from: &[T]) -> T {
        let n = u64::try_from(from.len()).unwrap();
        from[usize::try_from(self.next() % n).unwrap()]
    }
}

/// A step's time increment, ms (negative: the clock goes back); `rough`
/// traces take the long and backward steps more often.
fn dt_ms(rng: &mut Rng, rough: bool) -> i64 {
    const EDGES: [i64; 16] = [
        0, 1, 10, 20, 249, 250, 251, 999, 1_000, 1_001, 4_999, 5_000, 5_001, 20_000, 59_999, 60_001,
    ];
    const SHORT: [i64; 8] = [0, 1, 10, 20, 249, 250, 251, 999];
    match rng.next() % if rough { 20 } else { 100 } {
        0..=9 => rng.pick(&EDGES),
        10..=17 => i64::try_from(rng.next() % 1_500).unwrap(),
        18 => -i64::try_from(rng.next() % 3_000).unwrap(),
        19 => i64::try_from(rng.next() % 12_000).unwrap(),
        20..=59 => rng.pick(&SHORT),
        _ => i64::try_from(rng.next() % 1_200).unwrap(),
    }
}

/// A bad value now and then (`bad_percent` %), else one from `[lo, hi)`.
fn value(rng: &mut Rng, lo: f32, hi: f32, bad_percent: u64) -> f32 {
    if rng.chance(bad_percent) {
        rng.pick(&[f32::NAN, f32::INFINITY, -1e30, 1e30, -0.0])
    } else {
        rng.uniform(lo, hi)
    }
}

/// The samples of one step. `last` holds the previous accelerometer and
/// wind samples, repeated now and then (a stuck reading); `quiet` silences
/// the wind (a stale stretch); `storm` is the present wind strength; a
/// `rough` trace repeats samples more often and has out-of-band and cover
/// samples.
fn inputs(
    rng: &mut Rng,
    last: &mut Inputs,
    quiet: bool,
    storm: f32,
    bad: u64,
    rough: bool,
) -> Inputs {
    let mut i = Inputs::default();
    let repeat = if rough { 30 } else { 3 };
    if rng.chance(90) {
        i.accel_raw = if rng.chance(repeat) && last.accel_raw.is_some() {
            last.accel_raw
        } else if rough && rng.chance(2) {
            // Out of the magnitude band.
            Some([0.0, 0.0, 2.0])
        } else {
            // A small tilt with a little noise; in rough traces now and
            // then a knock (a tilt step).
            let knock = if rough && rng.chance(1) { 0.2 } else { 0.0 };
            Some([
                value(rng, 0.010, 0.012, bad) + knock,
                value(rng, -0.001, 0.001, bad),
                value(rng, 0.999, 1.001, bad),
            ])
        };
        last.accel_raw = i.accel_raw.or(last.accel_raw);
    }
    if !quiet && rng.chance(40) {
        i.wind = if rng.chance(repeat) && last.wind.is_some() {
            last.wind
        } else {
            let from_rad = if rng.chance(80) {
                Some(value(rng, 0.0, core::f32::consts::TAU, bad))
            } else {
                None
            };
            let speed_mps = if rng.chance(5) {
                0.0
            } else {
                value(rng, 0.5 * storm, storm, bad)
            };
            Some(WindSample {
                speed_mps,
                from_rad,
            })
        };
        last.wind = i.wind.or(last.wind);
    }
    if rng.chance(5) {
        i.pose = Some(if rng.chance(50) {
            altaz(0.0, 30.0)
        } else {
            altaz(value(rng, -180.0, 180.0, bad), value(rng, 0.0, 89.0, bad))
        });
    }
    if rough && rng.chance(2) {
        // The rig has no cover: "fitted" is refused.
        i.cover_fitted = Some(rng.chance(30));
    }
    if rng.chance(2) {
        i.air = Some(AirSample {
            temperature_k: value(rng, 250.0, 310.0, bad),
            pressure_pa: value(rng, 70_000.0, 105_000.0, bad),
        });
    }
    i
}

/// `Debug` text of `x` (a verdict or a memory).
fn text<T: core::fmt::Debug>(x: &T) -> heapless::String<8192> {
    let mut s = heapless::String::new();
    write!(s, "{x:?}").unwrap();
    s
}

/// How often each shortcut was taken by the guard that runs as it does.
#[derive(Default, Debug)]
struct Taken {
    /// Decisions on the same figures before their next timer instant.
    same_figures: u32,
    /// Decisions on a fault after one on a fault that kept sensor_fault.
    settled_fault: u32,
    /// Wind fault checks skipped before their deadline.
    wind_quiet: u32,
    /// Changes of level on a timer (a dwell or a fault clear time), where
    /// a late or early decision would show.
    timed_changes: u32,
}

/// Runs `steps` pseudo-random steps from `seed` on both guards and
/// compares them at every step.
fn compare(rig: &Rig, config: &GuardConfig, seed: u64, steps: usize, taken: &mut Taken) {
    let mut rng = Rng(seed);
    let start = Millis(1_000_000);
    let mut fast = Guard::new(rig, config.clone(), start).unwrap();
    let mut full = Guard::new(rig, config.clone(), start).unwrap();
    let mut now: i64 = 1_000_000;
    let mut last = Inputs::default();
    let (mut quiet, mut storm) = (false, 10.0);
    // Half the traces are rough (bad samples, silences, long and backward
    // steps), half mostly clean, in which the levels and dwells play out.
    let rough = rng.chance(50);
    let bad = if rough { rng.pick(&[0, 1, 5]) } else { 0 };
    let mut out: Option<Verdict> = None;
    for k in 0..steps {
        // Phases: a silent anemometer now and then; the wind strength
        // wanders from calm to past tipping.
        if rng.chance(if quiet {
            20
        } else if rough {
            3
        } else {
            0
        }) {
            quiet = !quiet;
        }
        if rng.chance(4) {
            storm = rng.pick(&[2.0, 8.0, 14.0, 20.0, 28.0, 40.0]);
        }
        if rng.chance(2) {
            fast.acknowledge();
            full.acknowledge();
        }
        now = (now + dt_ms(&mut rng, rough)).max(0);
        let t = Millis(u64::try_from(now).unwrap());
        let i = inputs(&mut rng, &mut last, quiet, storm, bad, rough);

        // The shortcuts' conditions as the fast guard stands before the step.
        let at = t.0.max(fast.last_step.0);
        match fast.decided {
            Some(d) if d.on_fault => taken.settled_fault += 1,
            Some(d) if at < d.until_ms => taken.same_figures += 1,
            _ => {}
        }
        if i.wind.is_none() && fast.wind.fault_deadline().is_some_and(|d| at <= d) {
            taken.wind_quiet += 1;
        }

        full.forget_shortcuts();
        let a = fast.step(t, &i);
        // The full path writes into one verdict, reused from step to step
        // (`Guard::step_into`: every field replaced, whatever it held).
        match out.as_mut() {
            Some(o) => full.step_into(t, &i, o),
            None => out = Some(full.step(t, &i)),
        }
        let b = out.as_ref().unwrap();
        let (ta, tb) = (text(&a), text(b));
        assert!(
            ta == tb,
            "seed {seed}, step {k}, t {t:?}, inputs {i:?}:\nshortcuts {ta}\nfull path {tb}"
        );
        assert_eq!(
            text(&fast.memory),
            text(&full.memory),
            "seed {seed}, step {k}"
        );
        assert_eq!(fast.level, full.level);
        // The gust history too (the gust of a step shows in a verdict only
        // through the rise at the next evaluation).
        assert_eq!(
            text(&fast.gust_history.minutes()),
            text(&full.gust_history.minutes()),
            "seed {seed}, step {k}"
        );
        taken.timed_changes += u32::try_from(
            a.events
                .iter()
                .filter(|e| {
                    matches!(
                        e,
                        Event::LevelChanged {
                            cause: AlertCause::Settled | AlertCause::FaultCleared,
                            ..
                        }
                    )
                })
                .count(),
        )
        .unwrap();
    }
}

/// Many traces on each configuration: the same verdicts with and without
/// the shortcuts, and each shortcut taken often (so the comparison is not
/// empty).
#[test]
fn the_shortcuts_give_the_full_paths_verdicts() {
    let rig = rig();
    for (n, config) in configs().iter().enumerate() {
        let mut taken = Taken::default();
        for seed in 1..=60_u64 {
            let seed = seed * 0x9E37_79B9 + u64::try_from(n).unwrap();
            compare(&rig, config, seed, 600, &mut taken);
        }
        assert!(
            taken.same_figures > 5_000
                && taken.settled_fault > 1_000
                && taken.wind_quiet > 1_000
                && taken.timed_changes > 100,
            "configuration {n}: {taken:?}"
        );
    }
}

/// A decision on a fault that keeps `sensor_fault` keeps it, with the same
/// memory, for any fault at any later time (the table's first row): the
/// shortcut on faults. Tried from the memories such a decision leaves,
/// latched or not, with any level held before the fault.
#[test]
fn a_fault_decision_that_keeps_the_level_is_a_fixed_point() {
    let t = configs()[0].thresholds();
    for latched in [false, true] {
        for before in [None, Some(AlertLevel::Clear), Some(AlertLevel::Alarm)] {
            let m0 = Memory {
                latched,
                before_fault: before,
                healthy_since: Some(Millis(3)),
                settled_since: [Some(Millis(4)), None, Some(Millis(5))],
                acknowledged: true,
            };
            let first = transition::transition(
                AlertLevel::SensorFault,
                &Readings::SensorFault,
                &t,
                m0,
                Millis(10),
            );
            assert_eq!((first.level, first.change), (AlertLevel::SensorFault, None));
            for readings in [Readings::SensorFault, Readings::EvaluationFault] {
                for now in [10, 11, 5_000, u64::MAX] {
                    let r = transition::transition(
                        AlertLevel::SensorFault,
                        &readings,
                        &t,
                        first.memory,
                        Millis(now),
                    );
                    assert_eq!(
                        (r.level, r.memory, r.change),
                        (AlertLevel::SensorFault, first.memory, None)
                    );
                }
            }
        }
    }
}

/// A pose has not moved from itself, whatever its angles (NaN included)
/// and form: the step checks a move only after a pose was taken.
#[test]
fn a_pose_never_moves_from_itself() {
    let eq = |h, d| Pose::Equatorial {
        hour_angle_rad: h,
        declination_rad: d,
        pier_side: crate::mount::PierSide::TubeWest,
    };
    let axes = |a, b| Pose::Axes {
        primary_rad: a,
        secondary_rad: b,
    };
    for x in [
        0.0,
        -0.0,
        1.0,
        -3.0,
        f32::NAN,
        f32::INFINITY,
        f32::MIN_POSITIVE,
    ] {
        for p in [eq(x, 0.5), eq(0.5, x), axes(x, x), altaz(10.0, 20.0)] {
            assert!(!pose_moved(p, p), "{p:?}");
        }
    }
}

/// The next timer instant: the earliest limit still ahead; `u64::MAX` with
/// none ahead or at a saturated sum.
#[test]
fn the_next_timer_instant_is_the_earliest_ahead() {
    let t = Thresholds {
        dwell_ms: 600_000,
        fault_clear_ms: 60_000,
        ..configs()[0].thresholds()
    };
    let m = Memory {
        healthy_since: Some(Millis(1_000)),
        settled_since: [Some(Millis(2_000)), None, Some(Millis(500))],
        ..Memory::default()
    };
    assert_eq!(next_timer_instant(&m, &t, Millis(1_000)), 61_000);
    assert_eq!(next_timer_instant(&m, &t, Millis(60_999)), 61_000);
    assert_eq!(next_timer_instant(&m, &t, Millis(61_000)), 600_500);
    assert_eq!(next_timer_instant(&m, &t, Millis(600_500)), 602_000);
    assert_eq!(next_timer_instant(&m, &t, Millis(602_000)), u64::MAX);
    let late = Memory {
        healthy_since: Some(Millis(u64::MAX - 10)),
        ..Memory::default()
    };
    assert_eq!(
        next_timer_instant(&late, &t, Millis(u64::MAX - 10)),
        u64::MAX
    );
}

/// `step_into` replaces every field of the verdict it writes, whatever it
/// held: a verdict with other values in every field (full event and fault
/// lists, events lost, a park pose, a tilt) is overwritten with the verdict
/// `step` gives, at a quiet step and at a stormy one.
#[test]
fn step_into_replaces_every_field() {
    let rig = rig();
    let config = configs()[0].clone();
    let mut a = Guard::new(&rig, config.clone(), Millis(0)).unwrap();
    let mut b = a.clone();
    for (k, wind) in [(1_u64, 1.0_f32), (2, 1.0), (3, 40.0), (4, 40.0)] {
        let i = Inputs {
            accel_raw: Some([0.01, 0.0, 1.0]),
            wind: Some(WindSample {
                speed_mps: wind,
                from_rad: Some(1.0),
            }),
            ..Inputs::default()
        };
        let t = Millis(k * 1000);
        let want = a.step(t, &i);
        let mut out = want.clone();
        out.now = Millis(99);
        out.level = AlertLevel::Alarm;
        out.overturning_utilisation = Some(9.0);
        out.predicted_utilisation = None;
        out.sliding_utilisation = Some(-1.0);
        out.drive_utilisation = Some([7.0, 8.0]);
        out.tip_wind_mps = Some(0.5);
        out.gust_mps = Some(77.0);
        out.predicted_gust_mps = None;
        out.wind_from_rad = Some(-2.0);
        out.tilt = crate::sense::TiltReading::of_specific_force(Vec3::new(0.3, 0.2, 1.0));
        out.tilt_margin_rad = Some(-0.5);
        out.tilt_drift_rad_per_s = 3.0;
        out.pose = altaz(123.0, 4.0);
        out.park_pose = Some(altaz(5.0, 6.0));
        out.faults.clear();
        for sensor in [
            Sensor::WindSpeed,
            Sensor::WindDirection,
            Sensor::Accelerometer,
        ] {
            out.faults.push(Fault::NotFinite { sensor });
            out.faults.push(Fault::Stale {
                sensor,
                silent_ms: 5,
            });
        }
        out.events.clear();
        for _ in 0..MAX_EVENTS {
            let _ = out
                .events
                .push(Event::NewHighUtilisation { utilisation: 3.0 });
        }
        out.events_lost = 7;
        out.evaluated = !want.evaluated;
        b.step_into(t, &i, &mut out);
        assert_eq!(text(&out), text(&want), "step {k}");
    }
}
