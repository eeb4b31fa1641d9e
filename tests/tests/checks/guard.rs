//! The guard on scripted scenarios. The rig is the hand-worked tripod of
//! `stability.rs` (tips at 21.9 m/s with the wind toward an edge), so every
//! utilisation is (V / 21.9)² and the thresholds translate into speeds by hand.

use crate::fixtures::{altaz, post_rig};
use standfast::guard::{AlertCause, AlertLevel, Event, Guard, GuardConfig, Inputs, WindSample};
use standfast::rig::Rig;
use standfast::sense::{Fault, Millis, Sensor};
use standfast::support::Support;

fn rig() -> Rig {
    let support = Support::tripod(0.5, 0.0).unwrap();
    Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap()
}

fn config() -> GuardConfig {
    GuardConfig {
        assumed_pose: Some(altaz(0.0, 0.0)),
        ..GuardConfig::default()
    }
}

/// Seconds of calm (3 m/s: utilisation 0.02) that bring a new guard from its
/// start in `sensor_fault` (no reading yet) to `clear`: the first gust after
/// 3 s of samples, `fault_clear_s` (60 s) to `watch`, the 600 s dwell to
/// `clear`.
const WARM_UP_S: f32 = 700.0;

/// Runs the guard from `t0_s` to `t1_s` after the warm-up: accelerometer
/// level at 10 Hz, wind at 1 Hz from the north with `speed(t_s)`. Records
/// every level change (time s, from, to, cause) and raised fault; times are
/// seconds since the end of the warm-up.
struct Run<'r> {
    guard: Guard<'r>,
    changes: Vec<(f32, AlertLevel, AlertLevel, AlertCause)>,
    faults: Vec<(f32, Fault)>,
    first_park_s: Option<f32>,
}

impl<'r> Run<'r> {
    /// A guard after the warm-up, which is checked on the way: the start in
    /// `sensor_fault` with no wind reading, then `fault_clear_s` after the
    /// first gust a step to the level the figures call for, at least
    /// `watch`.
    fn new(rig: &'r Rig, cfg: GuardConfig) -> Self {
        Self::warmed(rig, cfg, 3.0)
    }

    /// As [`Run::new`], with a warm-up wind of `speed_mps` instead of calm.
    fn warmed(rig: &'r Rig, cfg: GuardConfig, speed_mps: f32) -> Self {
        let clear_s = cfg.fault_clear_s;
        let mut r = Run {
            guard: Guard::new(rig, cfg, Millis(0)).unwrap(),
            changes: Vec::new(),
            faults: Vec::new(),
            first_park_s: None,
        };
        assert_eq!(
            r.guard.level(),
            AlertLevel::SensorFault,
            "a guard starts unable to see"
        );
        r.run(-WARM_UP_S, 0.0, |_| Some(speed_mps), true);
        assert!(
            matches!(
                r.faults.first(),
                Some((
                    _,
                    Fault::NoReading {
                        sensor: Sensor::WindSpeed
                    }
                ))
            ),
            "{:?}",
            r.faults
        );
        let c = r.changes.first().expect("left sensor_fault");
        assert_eq!(
            (c.1, c.3),
            (AlertLevel::SensorFault, AlertCause::FaultCleared),
            "{c:?}"
        );
        assert!(c.2 >= AlertLevel::Watch, "{c:?}");
        // The first gust after 3 s of samples, then the clear time.
        assert!((c.0 + WARM_UP_S - 3.0 - clear_s).abs() <= 0.2, "{c:?}");
        r.changes.clear();
        r.faults.clear();
        r
    }

    fn run(&mut self, t0_s: f32, t1_s: f32, speed: impl Fn(f32) -> Option<f32>, accel: bool) {
        let mut k = ((t0_s + WARM_UP_S) * 10.0).round() as u64;
        let end = ((t1_s + WARM_UP_S) * 10.0).round() as u64;
        while k < end {
            let t = k as f32 / 10.0 - WARM_UP_S;
            let mut inputs = Inputs::default();
            if accel {
                inputs.accel_raw = Some([0.0, 0.0, 1.0 + 1e-4 * ((k % 7) as f32)]);
            }
            if k % 10 == 0 {
                if let Some(v) = speed(t) {
                    // A real cup never holds one reading: ±2 % ripple.
                    let ripple = 1.0 + 0.02 * (0.7 * t).sin();
                    inputs.wind = Some(WindSample {
                        speed_mps: v * ripple,
                        // …and a vane swings a little: ±2°.
                        from_rad: Some((0.035 * (0.3 * t).sin()).rem_euclid(std::f32::consts::TAU)),
                    });
                }
            }
            let v = self.guard.step(Millis(k * 100), &inputs);
            for e in &v.events {
                match *e {
                    Event::LevelChanged { from, to, cause } => {
                        self.changes.push((t, from, to, cause))
                    }
                    Event::FaultRaised(f) => self.faults.push((t, f)),
                    Event::NewHighUtilisation { .. } => {}
                }
            }
            if v.level.park_requested() && self.first_park_s.is_none() {
                self.first_park_s = Some(t);
                assert!(v.park_pose.is_some(), "a park request carries a park pose");
            }
            k += 1;
        }
    }
}

/// A new guard cannot judge the rig: it starts in `sensor_fault` (park and
/// alarm asserted) with a no-reading fault for the wind until the first
/// 3-s gust, leaves it `fault_clear_s` later for `watch`, and reaches `clear`
/// once the figures have been trusted and settled for the dwell (which the
/// clear time counts towards). Fail-safe start: common practice for safety
/// outputs, no source.
#[test]
fn guard_starts_unable_to_see() {
    let rig = rig();
    let cfg = config();
    let mut g = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap();
    assert_eq!(g.level(), AlertLevel::SensorFault);
    let mut changes = Vec::new();
    for k in 0..7000_u64 {
        let inputs = Inputs {
            accel_raw: Some([0.0, 0.0, 1.0 + 1e-4 * ((k % 7) as f32)]),
            wind: (k % 10 == 0).then_some(WindSample {
                speed_mps: 3.0 + 0.05 * (k % 3) as f32,
                from_rad: Some(0.01 * (k / 10 % 5) as f32),
            }),
            ..Inputs::default()
        };
        let v = g.step(Millis(k * 100), &inputs);
        if k == 0 {
            assert!(v.level.park_requested() && v.level.alarm());
            assert!(v.faults.any(|f| f
                == &Fault::NoReading {
                    sensor: Sensor::WindSpeed
                }));
            assert_eq!(v.overturning_utilisation, None, "no figure before a gust");
        }
        for e in &v.events {
            if let Event::LevelChanged { from, to, cause } = *e {
                changes.push((k as f32 / 10.0, from, to, cause));
            }
            assert!(!matches!(e, Event::FaultRaised(_)) || k == 0, "{k}: {e:?}");
        }
    }
    assert_eq!(changes.len(), 2, "{changes:?}");
    let (t0, t1) = (changes[0].0, changes[1].0);
    assert_eq!(
        &changes[0].1..=&changes[0].2,
        &AlertLevel::SensorFault..=&AlertLevel::Watch
    );
    assert_eq!(changes[0].3, AlertCause::FaultCleared);
    assert!((t0 - 3.0 - cfg.fault_clear_s).abs() <= 0.2, "{changes:?}");
    assert_eq!(
        (changes[1].1, changes[1].2, changes[1].3),
        (AlertLevel::Watch, AlertLevel::Clear, AlertCause::Settled)
    );
    assert!((t1 - 3.0 - cfg.dwell_s).abs() <= 0.2, "{changes:?}");
}

/// A steady light wind (5 m/s: utilisation 0.05) never raises anything.
#[test]
fn steady_light_wind_stays_clear() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 1800.0, |_| Some(5.0), true);
    assert!(r.changes.is_empty(), "{:?}", r.changes);
    assert!(r.faults.is_empty(), "{:?}", r.faults);
    assert_eq!(r.guard.level(), AlertLevel::Clear);
}

/// A wind ramping from 4 to 24 m/s over 40 minutes (0.5 m/s per minute): the
/// park must be requested while the utilisation at the end of the park time
/// (120 s later, at the true wind then) is still below the park threshold of
/// 0.75, i.e. the rig is parked before the limit is reached.
#[test]
fn ramping_wind_requests_park_in_time() {
    let rig = rig();
    let cfg = config();
    let ramp = |t: f32| Some(4.0 + 0.5 * t / 60.0);
    let mut r = Run::new(&rig, cfg.clone());
    r.run(0.0, 2400.0, ramp, true);
    let t_park = r.first_park_s.expect("park requested");
    let v_end = ramp(t_park + cfg.time_to_park_s).unwrap();
    let u_end = (v_end / 21.93).powi(2);
    assert!(
        u_end < cfg.park_utilisation,
        "parked at {t_park} s, U at end of park {u_end}"
    );
    // Levels rose in order through watch to park, then to alarm.
    let tos: Vec<AlertLevel> = r.changes.iter().map(|c| c.2).collect();
    assert_eq!(
        &tos[..3],
        &[AlertLevel::Watch, AlertLevel::ParkNow, AlertLevel::Alarm]
    );
}

/// Hysteresis and dwell: after a 14 m/s warm-up (predicted ≈ 0.54: watch,
/// below the band of park, so the guard leaves its start-up fault for watch),
/// a 15 m/s spell (U ≈ 0.47, predicted ≈ 0.64 with the 1.15 gust allowance
/// and the small rise from 14 m/s: watch) then calm. The level stays at watch
/// until the figures have been below 0.8 × threshold for the 600 s dwell
/// *and* the 600 s peak-gust window has forgotten the spell.
#[test]
fn watch_steps_down_only_after_dwell() {
    let rig = rig();
    let mut r = Run::warmed(&rig, config(), 14.0);
    r.run(0.0, 300.0, |_| Some(15.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Watch, "{:?}", r.changes);
    r.run(300.0, 1700.0, |_| Some(3.0), true);
    let down = r
        .changes
        .iter()
        .find(|c| c.2 == AlertLevel::Clear)
        .expect("stepped down");
    // The spell leaves the 600 s peak-gust window at 900 s; the 600 s dwell
    // then ends at 1500 s, give or take the 10 s bins of the peak window.
    assert!(
        down.0 >= 1480.0 && down.0 <= 1510.0,
        "stepped down at {} s",
        down.0
    );
    assert_eq!(down.3, AlertCause::Settled);
}

/// The alarm latches: after a 21 m/s spell (U ≈ 0.92 ≥ 0.9) and a long calm
/// the level stays at alarm until acknowledged, then steps down.
#[test]
fn alarm_latches_until_acknowledged() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 120.0, |_| Some(21.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Alarm);
    r.run(120.0, 2400.0, |_| Some(2.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Alarm, "latched");
    r.guard.acknowledge();
    r.run(2400.0, 2410.0, |_| Some(2.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Clear);
}

/// A silent anemometer is a stale-sensor fault after the configured 10 s,
/// treated as unsafe (park and alarm).
#[test]
fn stale_wind_is_a_fault() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 60.0, |_| Some(4.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Clear);
    r.run(60.0, 90.0, |_| None, true);
    assert_eq!(r.guard.level(), AlertLevel::SensorFault);
    assert!(r.guard.level().park_requested() && r.guard.level().alarm());
    assert!(r.faults.iter().any(|(_, f)| matches!(
        f,
        Fault::Stale {
            sensor: Sensor::WindSpeed,
            ..
        }
    )));
}

/// A non-finite wind sample is dropped and reported as a fault at once.
#[test]
fn nan_wind_sample_is_a_fault() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 30.0, |_| Some(4.0), true);
    r.run(30.0, 31.0, |_| Some(f32::NAN), true);
    assert!(r.faults.iter().any(|(_, f)| matches!(
        f,
        Fault::NotFinite {
            sensor: Sensor::WindSpeed
        }
    )));
    assert_eq!(r.guard.level(), AlertLevel::SensorFault);
}

/// A silent accelerometer is a fault too.
#[test]
fn stale_accelerometer_is_a_fault() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 30.0, |_| Some(4.0), false);
    assert_eq!(r.guard.level(), AlertLevel::SensorFault);
    assert!(r.faults.iter().any(|(_, f)| matches!(
        f,
        Fault::Stale {
            sensor: Sensor::Accelerometer,
            ..
        }
    )));
}

/// A drive loaded past its rated torque requests a park even in calm air: a
/// 2 kg point mass 0.2 m off the altitude axis of a level tube loads that axis
/// with m·g·0.2 = 3.92 N·m (gravity torque of a point mass, statics), against a
/// 2 N·m rating.
#[test]
fn overloaded_drive_requests_park() {
    use standfast::drive::{DriveRating, Drives};
    use standfast::rig::{BodySpec, Stage as MountStage};
    let support = Support::tripod(0.5, 0.0).unwrap();
    let mut spec = post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5);
    let _ = spec.bodies.push(BodySpec {
        stage: MountStage::Secondary,
        mass_kg: 2.0,
        cg_m: [0.0, 0.2, 0.0],
        ..BodySpec::default()
    });
    let weak = DriveRating {
        rated_nm: 2.0,
        repeated_peak_nm: 4.0,
        momentary_peak_nm: 8.0,
    };
    spec.drives = Some(Drives {
        primary: weak,
        secondary: weak,
        slew_acceleration_rad_per_s2: 0.0,
    });
    let rig = Rig::new(&spec).unwrap();
    let cfg = config();
    let mut g = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap();
    let mut last = None;
    for k in 0..1000_u64 {
        let inputs = Inputs {
            accel_raw: Some([0.0, 0.0, 1.0 + 1e-4 * ((k % 7) as f32)]),
            wind: (k % 10 == 0).then_some(WindSample {
                speed_mps: 3.0 + 0.05 * (k % 3) as f32,
                from_rad: Some(0.01 * (k / 10 % 5) as f32),
            }),
            ..Inputs::default()
        };
        last = Some(g.step(Millis(k * 100), &inputs));
    }
    let v = last.unwrap();
    assert_eq!(v.level, AlertLevel::ParkNow, "{v:?}");
    let d = v.drive_utilisation.unwrap();
    approx::assert_relative_eq!(d[1], 3.92 / 2.0, max_relative = 0.02);
    // The cause the decision names for these figures.
    let figures = standfast::guard::transition::Figures {
        overturning: v.overturning_utilisation.unwrap(),
        predicted: v.predicted_utilisation.unwrap(),
        sliding: v.sliding_utilisation.unwrap(),
        drive: v.drive_utilisation,
        tilt_margin_rad: v.tilt_margin_rad.unwrap(),
        drift_rad_per_s: 0.0,
    };
    let (want, cause) = standfast::guard::transition::wanted(&figures, &cfg.thresholds());
    assert_eq!((want, cause), (AlertLevel::ParkNow, AlertCause::Drive));
}

/// A sensor fault does not latch: once the anemometer is back and healthy for
/// `fault_clear_s` (60 s) the guard steps to watch, and to clear once the
/// figures have been trusted and settled for the 600 s dwell (counted from
/// the end of the fault: the clear time counts towards it).
#[test]
fn sensor_fault_clears_after_healthy_period() {
    let rig = rig();
    let mut r = Run::new(&rig, config());
    r.run(0.0, 60.0, |_| Some(4.0), true);
    r.run(60.0, 106.0, |_| None, true);
    assert_eq!(r.guard.level(), AlertLevel::SensorFault);
    r.run(106.0, 300.0, |_| Some(4.0), true);
    assert_eq!(r.guard.level(), AlertLevel::Watch, "{:?}", r.changes);
    let back = *r.changes.last().unwrap();
    assert_eq!(
        (back.1, back.2),
        (AlertLevel::SensorFault, AlertLevel::Watch)
    );
    assert!(back.0 >= 106.0 + 60.0 && back.0 <= 106.0 + 75.0, "{back:?}");
    r.run(300.0, 900.0, |_| Some(4.0), true);
    let clear = *r.changes.last().unwrap();
    assert_eq!(clear.2, AlertLevel::Clear);
    assert!(
        clear.0 >= 106.0 + 600.0 - 1.0 && clear.0 <= 106.0 + 600.0 + 15.0,
        "{clear:?}"
    );
}

/// A station that reports only ten-minute means: the guard's gust is the mean
/// times the gust factor (1.45 for open terrain: Durst 1960 / ESDU, V3s/V10min
/// ≈ 1.43–1.45, as the core's default), here with anemometer and rig at the
/// same height; a stale time shorter than the reporting period is refused.
#[test]
fn ten_minute_means_give_gust_by_factor() {
    use standfast::guard::WindSource;
    let rig = rig();
    let mut cfg = config();
    cfg.wind_source = WindSource::TenMinuteMeans;
    let e = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap_err();
    assert_eq!(e.field, standfast::error::Field::WindStaleAfterS);
    cfg.wind.stale_after_s = 660.0;
    // Means up to 100 m/s would be gusts of 145 m/s, beyond the model's
    // 100 m/s: refused, naming the limit that keeps every mean evaluable.
    let e = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap_err();
    assert_eq!(e.field, standfast::error::Field::WindMaxSpeedMps);
    approx::assert_relative_eq!(e.max, 100.0 / 1.45, max_relative = 1e-5);
    cfg.wind.max_speed_mps = 60.0;
    let mut g = Guard::new(&rig, cfg, Millis(0)).unwrap();
    let mut last = None;
    for k in 0..=36_000_u64 {
        // 10 Hz accelerometer for an hour; a mean every ten minutes, rising.
        let t = Millis(k * 100);
        let mut inputs = Inputs {
            accel_raw: Some([0.0, 0.0, 1.0 + 1e-4 * ((k % 7) as f32)]),
            ..Inputs::default()
        };
        if k % 6000 == 0 {
            let mean = 6.0 + 2.0 * (k / 6000) as f32;
            inputs.wind = Some(WindSample {
                speed_mps: mean,
                from_rad: Some(0.01 * (k / 6000) as f32),
            });
        }
        last = Some(g.step(t, &inputs));
    }
    let v = last.unwrap();
    // Last mean 18 m/s → gust 26.1 m/s: beyond the 21.9 m/s tip wind.
    approx::assert_relative_eq!(v.gust_mps.unwrap(), 18.0 * 1.45, max_relative = 1e-5);
    assert!(v.faults.is_empty());
    assert_eq!(v.level, AlertLevel::Alarm);
}
