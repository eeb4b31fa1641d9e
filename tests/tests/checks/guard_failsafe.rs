//! The guard fails safe: one regression test for each way an earlier guard
//! reported `clear` (or a wrong cause) when it could not judge the rig. The
//! rig is the tripod of `guard.rs` (utilisation (V / 21.9)² with the wind
//! toward an edge). Expected behaviour: the rules of
//! `standfast::guard` ("Fail safe") and `standfast::guard::transition`.

use crate::fixtures::{altaz, post_rig};
use standfast::guard::{
    AirSample, AlertCause, AlertLevel, Event, Guard, GuardConfig, Inputs, Verdict, WindSample,
    MAX_EVENTS,
};
use standfast::rig::{Rig, MAX_WIND_SPEED_MPS};
use standfast::sense::{Fault, Millis, Sensor};
use standfast::support::Support;

fn rig() -> Rig {
    let support = Support::tripod(0.5, 0.0).unwrap();
    Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap()
}

/// Short times: dwell 20 s, fault clear 5 s.
fn config() -> GuardConfig {
    GuardConfig {
        assumed_pose: Some(altaz(0.0, 0.0)),
        dwell_s: 20.0,
        fault_clear_s: 5.0,
        ..GuardConfig::default()
    }
}

/// Samples of step `k` (10 Hz): a level accelerometer with a little noise,
/// and a wind sample of `speed_mps` from about north every second.
fn samples(k: u64, speed_mps: f32) -> Inputs {
    Inputs {
        accel_raw: Some([0.0, 0.0, 1.0 + 1e-4 * ((k % 7) as f32)]),
        wind: (k % 10 == 0).then_some(WindSample {
            speed_mps: speed_mps * (1.0 + 0.01 * ((k / 10 % 3) as f32)),
            from_rad: Some(0.01 * ((k / 10 % 5) as f32)),
        }),
        ..Inputs::default()
    }
}

/// Runs steps `k0..k1` at 10 Hz in `speed_mps`, with `extra` applied to each
/// step's inputs; returns the verdicts.
fn run(
    g: &mut Guard<'_>,
    k0: u64,
    k1: u64,
    speed_mps: f32,
    extra: impl Fn(&mut Inputs),
) -> Vec<Verdict> {
    (k0..k1)
        .map(|k| {
            let mut i = samples(k, speed_mps);
            extra(&mut i);
            g.step(Millis(k * 100), &i)
        })
        .collect()
}

/// A guard brought to `clear` in calm air (5 s fault clear, 20 s dwell).
fn settled(rig: &Rig) -> Guard<'_> {
    let mut g = Guard::new(rig, config(), Millis(0)).unwrap();
    run(&mut g, 0, 400, 3.0, |_| {});
    assert_eq!(g.level(), AlertLevel::Clear);
    g
}

fn changes(vs: &[Verdict]) -> Vec<(AlertLevel, AlertLevel, AlertCause)> {
    vs.iter()
        .flat_map(|v| v.events.iter())
        .filter_map(|e| match *e {
            Event::LevelChanged { from, to, cause } => Some((from, to, cause)),
            _ => None,
        })
        .collect()
}

/// Case 1: a wind the physics cannot evaluate. A configuration whose
/// anemometer accepts more than the model's 100 m/s at rig height is refused
/// at construction, naming the limit; with the limit inside the model, every
/// accepted sample gives figures (at the limit: far beyond tipping, alarm),
/// and a sample beyond it is a fault, never `clear`.
#[test]
fn a_wind_beyond_the_model_is_never_clear() {
    let rig = rig();
    let mut cfg = config();
    cfg.wind.max_speed_mps = 150.0;
    cfg.wind.anemometer_height_m = 2.0;
    cfg.wind.rig_height_m = 2.0;
    let e = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap_err();
    assert_eq!(e.field, standfast::error::Field::WindMaxSpeedMps);
    assert_eq!((e.value, e.max), (150.0, MAX_WIND_SPEED_MPS));

    cfg.wind.max_speed_mps = MAX_WIND_SPEED_MPS;
    let mut g = Guard::new(&rig, cfg, Millis(0)).unwrap();
    let vs = run(&mut g, 0, 300, 97.0, |_| {});
    let v = vs.last().unwrap();
    assert!(v.faults.is_empty(), "{:?}", v.faults);
    assert!(v.overturning_utilisation.unwrap() > 1.0);
    assert!(
        v.predicted_utilisation.unwrap() > 1.0,
        "predicted gust beyond 100 m/s still evaluated"
    );
    assert_eq!(v.level, AlertLevel::Alarm);

    let mut g = settled(&rig);
    let vs = run(&mut g, 400, 420, 120.0, |_| {});
    let v = vs.last().unwrap();
    assert!(v.faults.any(|f| matches!(
        f,
        Fault::OutOfRange {
            sensor: Sensor::WindSpeed,
            ..
        }
    )));
    assert_eq!(v.level, AlertLevel::SensorFault);
}

/// Case 2: rejected pose, air and cover samples are faults of their input in
/// the same step, with an event, not silently dropped.
#[test]
fn rejected_pose_air_and_cover_samples_are_faults() {
    let rig = rig();
    type Bad = fn(&mut Inputs);
    let cases: [(Bad, Fault); 4] = [
        (
            |i| i.pose = Some(altaz(f32::NAN, 20.0)),
            Fault::NotFinite {
                sensor: Sensor::MountPose,
            },
        ),
        (
            |i| {
                i.air = Some(AirSample {
                    temperature_k: f32::NAN,
                    pressure_pa: 101_325.0,
                })
            },
            Fault::NotFinite {
                sensor: Sensor::Air,
            },
        ),
        (
            |i| {
                i.air = Some(AirSample {
                    temperature_k: standfast::air::celsius_to_kelvin(15.0),
                    pressure_pa: 5.0,
                })
            },
            Fault::OutOfRange {
                sensor: Sensor::Air,
                value: 5.0,
            },
        ),
        (
            |i| i.cover_fitted = Some(true),
            Fault::NotInRig {
                sensor: Sensor::Cover,
            },
        ),
    ];
    for (bad, expected) in cases {
        let mut g = settled(&rig);
        let mut i = samples(400, 3.0);
        bad(&mut i);
        let v = g.step(Millis(40_000), &i);
        assert_eq!(v.level, AlertLevel::SensorFault, "{expected:?}");
        assert!(v.faults.any(|f| f.same_class(&expected)), "{:?}", v.faults);
        assert!(
            v.events.contains(&Event::FaultRaised(
                v.faults.iter().find(|f| f.same_class(&expected)).unwrap()
            )),
            "{:?}",
            v.events
        );
        assert!(changes(std::slice::from_ref(&v)).contains(&(
            AlertLevel::Clear,
            AlertLevel::SensorFault,
            AlertCause::SensorFault
        )));
    }
}

/// A clock that goes back is a fault of the clock, and that step's samples
/// are not used.
#[test]
fn a_reversed_clock_is_a_fault() {
    let rig = rig();
    let mut g = settled(&rig);
    let v = g.step(Millis(30_000), &samples(300, 3.0));
    assert!(v.faults.any(|f| *f
        == Fault::TimeReversed {
            sensor: Sensor::Clock
        }));
    assert_eq!((v.level, v.now), (AlertLevel::SensorFault, Millis(39_900)));
}

/// Case 3: hysteresis across levels. A spell that parks (predicted ≥ 0.75),
/// then a wind whose predicted utilisation sits in the band of park (at or
/// above 0.8 × 0.75 = 0.6, below the 0.75 park threshold): the guard does
/// not step past park_now to clear or watch however long it lasts; once the
/// wind drops below the band it steps down, after the dwell.
#[test]
fn no_step_down_past_a_band() {
    let rig = rig();
    let mut g = settled(&rig);
    let vs = run(&mut g, 400, 700, 19.0, |_| {});
    assert_eq!(
        vs.last().unwrap().level,
        AlertLevel::ParkNow,
        "{:?}",
        changes(&vs)
    );
    // 16.3 m/s: predicted (16.3 × 1.15 / 21.9)² ≈ 0.73 after the 19 m/s peak
    // has left the 600 s window.
    let vs = run(&mut g, 700, 9_000, 15.6, |_| {});
    let last = vs.last().unwrap();
    let p = last.predicted_utilisation.unwrap();
    assert!((0.6..0.75).contains(&p), "predicted {p}");
    assert_eq!(last.level, AlertLevel::ParkNow, "{:?}", changes(&vs));
}

/// Case 4: a watch raised by sliding says so.
#[test]
fn a_watch_from_sliding_is_caused_by_sliding() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    // Friction 0.05 on ice: sliding governs long before tipping.
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.05)).unwrap();
    let mut g = Guard::new(&rig, config(), Millis(0)).unwrap();
    run(&mut g, 0, 400, 1.0, |_| {});
    assert_eq!(g.level(), AlertLevel::Clear);
    // 10 m/s: sliding 0.613·V²·0.222 / (0.05·40·9.81) ≈ 0.7 at the gust,
    // predicted overturning about (1.15·V / 21.9)² ≈ 0.3.
    let vs = run(&mut g, 400, 600, 10.0, |_| {});
    let c = changes(&vs);
    let v = vs.last().unwrap();
    assert!(v.sliding_utilisation.unwrap() >= 0.5);
    assert!(v.predicted_utilisation.unwrap() < 0.5);
    assert_eq!(
        c.first(),
        Some(&(AlertLevel::Clear, AlertLevel::Watch, AlertCause::Sliding)),
        "{c:?}"
    );
}

/// Case 5: events that do not fit are counted, not dropped silently. After
/// a 20 s silence, a step whose accelerometer sample shows the rig thrown
/// over (53°) and whose every other input is bad raises eight faults (tilt
/// step, tilt beyond the model and so no tilt reading, wind speed, wind
/// direction stale, pose, cover, air) and a level change: nine events for
/// eight slots.
#[test]
fn events_beyond_capacity_are_counted() {
    let rig = rig();
    let mut g = settled(&rig);
    let i = Inputs {
        accel_raw: Some([0.8, 0.0, 0.6]),
        wind: Some(WindSample {
            speed_mps: f32::NAN,
            from_rad: None,
        }),
        pose: Some(altaz(f32::NAN, 0.0)),
        cover_fitted: Some(true),
        air: Some(AirSample {
            temperature_k: f32::NAN,
            pressure_pa: f32::NAN,
        }),
    };
    let v = g.step(Millis(60_000), &i);
    assert_eq!(v.events.len(), MAX_EVENTS);
    assert_eq!(v.events_lost, 1, "{:?} {:?}", v.events, v.faults);
    assert_eq!(v.level, AlertLevel::SensorFault);
}

/// Case 6: the evaluation period is validated like every other field.
#[test]
fn the_evaluation_period_is_validated() {
    let rig = rig();
    let mut cfg = config();
    cfg.evaluate_every_s = 60.001;
    let e = Guard::new(&rig, cfg.clone(), Millis(0)).unwrap_err();
    assert_eq!(
        (e.field, e.max),
        (standfast::error::Field::GuardEvaluateEveryS, 60.0)
    );
    cfg.evaluate_every_s = 60.0;
    assert!(Guard::new(&rig, cfg, Millis(0)).is_ok());
}

/// Case 7: an unchanged pose passed in every step (as a controller does)
/// does not force an evaluation; a pose that moves less than the tolerance
/// (1e-3 rad) does not either, one that moves more does, at once.
#[test]
fn an_unchanged_pose_does_not_force_an_evaluation() {
    let rig = rig();
    let mut g = settled(&rig);
    let vs = run(&mut g, 400, 501, 3.0, |i| i.pose = Some(altaz(0.0, 0.0)));
    // 10 s at 10 Hz with an evaluation period of 1 s: steps 400, 410, … 500.
    let evaluated: Vec<usize> = (0..vs.len()).filter(|&i| vs[i].evaluated).collect();
    assert_eq!(evaluated, (0..=100).step_by(10).collect::<Vec<_>>());
    // Half a period later: 0.05° (0.87 mrad) is inside the tolerance…
    let k = 505;
    let v = g.step(
        Millis(k * 100),
        &Inputs {
            pose: Some(altaz(0.05, 0.0)),
            ..samples(k, 3.0)
        },
    );
    assert!(!v.evaluated);
    // …0.1° (1.7 mrad) from the evaluated pose is not.
    let v = g.step(
        Millis((k + 1) * 100),
        &Inputs {
            pose: Some(altaz(0.1, 0.0)),
            ..samples(k + 1, 3.0)
        },
    );
    assert!(v.evaluated, "{v:?}");
}

/// The air density set for the site scales the wind's share of the
/// overturning utilisation: on level ground the overturning moment is all
/// wind, so utilisation ∝ q ∝ ρ. At 2,000 m the ISO 2533 standard atmosphere
/// has ρ = 1.0066 kg/m³ against 1.2250 kg/m³ at sea level (ISO 2533:1975,
/// table of the standard atmosphere).
#[test]
fn the_site_air_density_scales_the_wind_load() {
    let rig = rig();
    let mut sea = settled(&rig);
    let mut high = settled(&rig);
    high.set_air(standfast::air::Air::isa_at_elevation(2_000.0).unwrap());
    let v_sea = run(&mut sea, 400, 500, 12.0, |_| {}).pop().unwrap();
    let v_high = run(&mut high, 400, 500, 12.0, |_| {}).pop().unwrap();
    let ratio = v_high.overturning_utilisation.unwrap() / v_sea.overturning_utilisation.unwrap();
    approx::assert_relative_eq!(ratio, 1.0066 / 1.2250, max_relative = 2e-3);
}

/// A new highest overturning utilisation is an event when it beats the last
/// one reported by more than 0.01, and only then: a rising wind reports a
/// rising series, a steady one nothing new.
#[test]
fn new_highs_are_reported_as_they_rise() {
    let rig = rig();
    let mut g = settled(&rig);
    let highs = |vs: &[Verdict]| -> Vec<f32> {
        vs.iter()
            .flat_map(|v| v.events.iter())
            .filter_map(|e| match *e {
                Event::NewHighUtilisation { utilisation } => Some(utilisation),
                _ => None,
            })
            .collect()
    };
    let mut vs = Vec::new();
    for (i, v) in (6..14).enumerate() {
        let k0 = 400 + 100 * i as u64;
        vs.extend(run(&mut g, k0, k0 + 100, v as f32, |_| {}));
    }
    let h = highs(&vs);
    assert!(h.len() >= 5, "{h:?}");
    for w in h.windows(2) {
        assert!(w[1] > w[0] + 0.01, "{h:?}");
    }
    let top = vs
        .iter()
        .filter_map(|v| v.overturning_utilisation)
        .fold(0.0, f32::max);
    assert!(top - h.last().unwrap() <= 0.01 + 1e-6, "{top} {h:?}");
    let steady = run(&mut g, 1200, 1400, 13.0, |_| {});
    assert!(highs(&steady).is_empty(), "{:?}", highs(&steady));
}

/// The post rig with a 1.2 m tube (0.25 m across, 5 kg) on the altitude
/// axis 1 m up, optionally under a 0.5 × 1.5 × 0.5 m cover.
fn tube_rig(cover: bool) -> Rig {
    use standfast::rig::{BodySpec, CoverSpec, MassModel};
    let support = Support::tripod(0.5, 0.0).unwrap();
    let mut spec = post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.1, 0.6, 0.5);
    spec.bodies
        .push(
            BodySpec::optical_tube(5.0, 0.25, 1.2, [0.0, 0.0, 0.0])
                .with_mass_model(MassModel::Solid),
        )
        .unwrap();
    if cover {
        spec.cover = Some(CoverSpec {
            mass_kg: 1.0,
            size_m: [0.5, 1.5, 0.5],
            centre_m: [0.0, 0.0, 0.0],
            drag_coefficient: None,
        });
    }
    Rig::new(&spec).unwrap()
}

/// The park pose is searched, not assumed: in a strong east wind a
/// horizontal tube at home (pointing north, broadside to the wind) catches
/// more wind than one pointing at the zenith, so with the zenith pose
/// offered the guard names it.
#[test]
fn the_safest_park_pose_is_searched() {
    let rig = tube_rig(false);
    let mut cfg = config();
    cfg.assumed_pose = None;
    let zenith = altaz(0.0, 89.0);
    cfg.park_poses.push(zenith).unwrap();
    let mut g = Guard::new(&rig, cfg, Millis(0)).unwrap();
    let east = |i: &mut Inputs| {
        if let Some(w) = i.wind.as_mut() {
            w.from_rad = Some(std::f32::consts::FRAC_PI_2 + w.from_rad.unwrap_or(0.0));
        }
    };
    run(&mut g, 0, 400, 3.0, east);
    let vs = run(&mut g, 400, 700, 22.0, east);
    let v = vs.last().unwrap();
    assert!(v.level.park_requested(), "{v:?}");
    assert_eq!(v.park_pose, Some(zenith), "{v:?}");
}

/// A fault raised between evaluations still carries a park pose (the
/// mount's home pose when nothing better is known).
#[test]
fn a_fault_between_evaluations_carries_a_park_pose() {
    let rig = rig();
    let mut g = settled(&rig);
    // Step 405 is half-way between two evaluations (period 1 s).
    let _ = g.step(Millis(40_000), &samples(400, 3.0));
    let v = g.step(
        Millis(40_500),
        &Inputs {
            pose: Some(altaz(f32::NAN, 0.0)),
            ..samples(405, 3.0)
        },
    );
    assert!(!v.evaluated);
    assert_eq!(v.level, AlertLevel::SensorFault);
    assert_eq!(v.park_pose, Some(rig.mount().home_pose()));
}

/// Cover states: "removed" on a rig without a cover is no fault; on a rig
/// with one, fitting it is taken at once (an evaluation in the same step)
/// and, as a cover catches wind, raises the overturning utilisation.
#[test]
fn cover_states_are_taken_or_refused_as_the_rig_allows() {
    let rig = rig();
    let mut g = settled(&rig);
    let vs = run(&mut g, 400, 450, 3.0, |i| i.cover_fitted = Some(false));
    assert!(vs.iter().all(|v| v.faults.is_empty()), "{:?}", vs.last());

    let rig = tube_rig(true);
    let mut g = Guard::new(&rig, config(), Millis(0)).unwrap();
    run(&mut g, 0, 400, 8.0, |_| {});
    let before = g.step(Millis(40_000), &samples(400, 8.0));
    let fitted = g.step(
        Millis(40_500),
        &Inputs {
            cover_fitted: Some(true),
            ..samples(405, 8.0)
        },
    );
    assert!(fitted.faults.is_empty(), "{:?}", fitted.faults);
    assert!(fitted.evaluated, "a cover change is judged at once");
    assert!(
        fitted.overturning_utilisation.unwrap() > before.overturning_utilisation.unwrap(),
        "{before:?} {fitted:?}"
    );
}

/// A rising wind is anticipated: in a gust ramp of 0.5 m/s per minute the
/// gust predicted for the end of a 120 s park is the latest gust plus the
/// rise over the park time (0.5/60 × 120 = 1 m/s), times the 1.15 allowance,
/// not merely the peak so far (the guard's documented prediction).
#[test]
fn a_rising_wind_is_anticipated() {
    let rig = rig();
    let mut g = settled(&rig);
    let mut last = None;
    for k in 400..(400 + 15 * 600) {
        let t_s = (k - 400) as f32 / 10.0;
        let v = 4.0 + 0.5 * t_s / 60.0;
        let mut i = samples(k, 1.0);
        if let Some(w) = i.wind.as_mut() {
            w.speed_mps = v;
        }
        last = Some(g.step(Millis(k * 100), &i));
    }
    let v = last.unwrap();
    let gust = v.gust_mps.unwrap();
    let predicted = v.predicted_gust_mps.unwrap();
    // Within a tenth of the rise: the one-minute maxima sample the ramp.
    approx::assert_relative_eq!(predicted, (gust + 1.0) * 1.15, epsilon = 0.1 * 1.15);
}

/// A sinking leg: the accelerometer tilts steadily at 2°/h (9.7e-6 rad/s,
/// four times the 0.5°/h watch rate) from level. Once the drift filter has
/// settled the guard reports the drift and raises watch with cause
/// `tilt_drift`.
#[test]
fn a_sinking_leg_raises_watch() {
    let rig = rig();
    let mut g = settled(&rig);
    let rate = 2.0_f32.to_radians() / 3600.0;
    let mut changes = Vec::new();
    let mut last = None;
    for k in 400..(400 + 36_000) {
        let t_s = (k - 400) as f32 / 10.0;
        let a = rate * t_s;
        let mut i = samples(k, 3.0);
        i.accel_raw = Some([a.sin(), 1e-4 * ((k % 7) as f32), a.cos()]);
        let v = g.step(Millis(k * 100), &i);
        for e in &v.events {
            if let Event::LevelChanged { from, to, cause } = *e {
                changes.push((from, to, cause));
            }
        }
        last = Some(v);
    }
    let v = last.unwrap();
    approx::assert_relative_eq!(v.tilt_drift_rad_per_s, rate, max_relative = 0.3);
    assert!(
        changes.contains(&(AlertLevel::Clear, AlertLevel::Watch, AlertCause::TiltDrift)),
        "{changes:?}"
    );
}

/// A defined wind direction is used as measured (the vane's mean over its
/// window, here 0.02 rad from samples spread evenly over 0 to 0.04 rad), not
/// replaced by the worst direction; with no direction at all the guard takes
/// the worst one, whose utilisation is at least as high.
#[test]
fn a_measured_direction_is_used_and_an_unknown_one_is_the_worst() {
    let rig = rig();
    let mut g = settled(&rig);
    let v = run(&mut g, 400, 500, 12.0, |_| {}).pop().unwrap();
    approx::assert_relative_eq!(v.wind_from_rad.unwrap(), 0.02, epsilon = 0.005);
    let mut blind = settled(&rig);
    let w = run(&mut blind, 400, 1000, 12.0, |i| {
        if let Some(w) = i.wind.as_mut() {
            w.from_rad = None;
        }
    })
    .pop()
    .unwrap();
    assert!(
        w.faults.is_empty() || w.level == AlertLevel::SensorFault,
        "{w:?}"
    );
    if w.faults.is_empty() {
        assert!(w.overturning_utilisation.unwrap() >= v.overturning_utilisation.unwrap() - 1e-4);
    }
}
