//! The transition table, enumerated: every level against every condition,
//! with the expected outcome written out by hand from the table in the
//! module docs (not computed by the code under test).

use super::*;

/// The default thresholds (`GuardConfig::default`): watch 0.5, park 0.75,
/// alarm 0.9, drive park 1.0, clear ratio 0.8, tilt alarm 5°, drift watch
/// 0.5°/h, dwell 600 s, fault clear 60 s.
fn t() -> Thresholds {
    Thresholds {
        watch_utilisation: 0.5,
        park_utilisation: 0.75,
        alarm_utilisation: 0.9,
        drive_park_utilisation: 1.0,
        clear_ratio: 0.8,
        tilt_margin_alarm_rad: 0.087_266_46,
        drift_watch_rad_per_s: 2.424e-6,
        dwell_ms: 600_000,
        fault_clear_ms: 60_000,
    }
}

fn calm() -> Figures {
    Figures {
        overturning: 0.1,
        predicted: 0.1,
        sliding: 0.1,
        drive: Some([0.1, 0.1]),
        tilt_margin_rad: 0.5,
        drift_rad_per_s: 0.0,
    }
}

/// The conditions of the table: a name and the readings.
fn conditions() -> [(&'static str, Readings); 15] {
    let f = |g: fn(&mut Figures)| {
        let mut x = calm();
        g(&mut x);
        Readings::Figures(x)
    };
    [
        ("calm", f(|_| {})),
        // In the watch band: below 0.5, not below 0.8 × 0.5.
        ("watch band", f(|x| x.predicted = 0.45)),
        ("watch predicted", f(|x| x.predicted = 0.55)),
        ("watch sliding", f(|x| x.sliding = 0.6)),
        ("watch drift", f(|x| x.drift_rad_per_s = 1e-5)),
        // In the park band of a drive: below 1.0, not below 0.8.
        ("park band", f(|x| x.drive = Some([0.1, 0.9]))),
        ("park predicted", f(|x| x.predicted = 0.8)),
        ("park drive", f(|x| x.drive = Some([1.2, 0.1]))),
        ("alarm overturning", f(|x| x.overturning = 0.95)),
        ("alarm sliding", f(|x| x.sliding = 0.95)),
        ("alarm tilt", f(|x| x.tilt_margin_rad = 0.05)),
        // In the alarm band: below 0.9, not below 0.72.
        ("alarm band", f(|x| x.overturning = 0.8)),
        ("sensor fault", Readings::SensorFault),
        ("evaluation fault", Readings::EvaluationFault),
        ("not finite", f(|x| x.overturning = f32::NAN)),
    ]
}

use AlertCause as C;
use AlertLevel::{Alarm as A, Clear as Cl, ParkNow as P, SensorFault as F, Watch as W};

/// Expected (next level, cause when it changes) for each condition, from a
/// memory in which the figures have been trusted and settled below every
/// level for an hour (the step's own figures then decide which timers
/// survive) and no latch. Rows: conditions in the order above; columns: the
/// present level clear, watch, park_now, alarm, sensor_fault.
const SETTLED: [[(AlertLevel, Option<AlertCause>); 5]; 15] = [
    // calm: everything settled, so every step down goes all the way.
    [
        (Cl, None),
        (Cl, Some(C::Settled)),
        (Cl, Some(C::Settled)),
        (Cl, Some(C::Settled)),
        (W, Some(C::FaultCleared)),
    ],
    // watch band: settled below park and alarm, not below watch.
    [
        (Cl, None),
        (W, None),
        (W, Some(C::Settled)),
        (W, Some(C::Settled)),
        (W, Some(C::FaultCleared)),
    ],
    // watch predicted.
    [
        (W, Some(C::PredictedOverturning)),
        (W, None),
        (W, Some(C::Settled)),
        (W, Some(C::Settled)),
        (W, Some(C::FaultCleared)),
    ],
    // watch sliding.
    [
        (W, Some(C::Sliding)),
        (W, None),
        (W, Some(C::Settled)),
        (W, Some(C::Settled)),
        (W, Some(C::FaultCleared)),
    ],
    // watch drift.
    [
        (W, Some(C::TiltDrift)),
        (W, None),
        (W, Some(C::Settled)),
        (W, Some(C::Settled)),
        (W, Some(C::FaultCleared)),
    ],
    // park band: wanted clear, but not settled below park.
    [
        (Cl, None),
        (Cl, Some(C::Settled)),
        (P, None),
        (P, Some(C::Settled)),
        (P, Some(C::FaultCleared)),
    ],
    // park predicted.
    [
        (P, Some(C::PredictedOverturning)),
        (P, Some(C::PredictedOverturning)),
        (P, None),
        (P, Some(C::Settled)),
        (P, Some(C::FaultCleared)),
    ],
    // park drive.
    [
        (P, Some(C::Drive)),
        (P, Some(C::Drive)),
        (P, None),
        (P, Some(C::Settled)),
        (P, Some(C::FaultCleared)),
    ],
    // alarm overturning.
    [
        (A, Some(C::Overturning)),
        (A, Some(C::Overturning)),
        (A, Some(C::Overturning)),
        (A, None),
        (A, Some(C::FaultCleared)),
    ],
    // alarm sliding.
    [
        (A, Some(C::Sliding)),
        (A, Some(C::Sliding)),
        (A, Some(C::Sliding)),
        (A, None),
        (A, Some(C::FaultCleared)),
    ],
    // alarm tilt.
    [
        (A, Some(C::TiltMargin)),
        (A, Some(C::TiltMargin)),
        (A, Some(C::TiltMargin)),
        (A, None),
        (A, Some(C::FaultCleared)),
    ],
    // alarm band: wanted clear, not settled below alarm.
    [
        (Cl, None),
        (Cl, Some(C::Settled)),
        (Cl, Some(C::Settled)),
        (A, None),
        (A, Some(C::FaultCleared)),
    ],
    // sensor fault.
    [
        (F, Some(C::SensorFault)),
        (F, Some(C::SensorFault)),
        (F, Some(C::SensorFault)),
        (F, Some(C::SensorFault)),
        (F, None),
    ],
    // evaluation fault.
    [
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, None),
    ],
    // not finite: an evaluation fault.
    [
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, Some(C::EvaluationFault)),
        (F, None),
    ],
];

const HOUR_MS: u64 = 3_600_000;

fn settled_memory() -> Memory {
    Memory {
        settled_since: [Some(Millis(0)); 3],
        healthy_since: Some(Millis(0)),
        latched: false,
        acknowledged: false,
        before_fault: None,
    }
}

#[test]
fn every_level_against_every_condition() {
    let t = t();
    for (row, (name, readings)) in conditions().iter().enumerate() {
        for (col, &level) in AlertLevel::ALL.iter().enumerate() {
            let out = transition(level, readings, &t, settled_memory(), Millis(HOUR_MS));
            let (to, cause) = SETTLED[row][col];
            assert_eq!(out.level, to, "{name} at {level:?}");
            assert_eq!(out.change.map(|c| c.cause), cause, "{name} at {level:?}");
            if let Some(c) = out.change {
                assert_eq!((c.from, c.to), (level, to), "{name} at {level:?}");
            }
            // An alarm entered because a figure reached its threshold
            // latches; nothing else does (not the band of the alarm when a
            // fault clears).
            let at_threshold = name.starts_with("alarm ") && *name != "alarm band";
            assert_eq!(
                out.memory.latched,
                to == A && level != A && at_threshold,
                "{name} at {level:?}"
            );
        }
    }
}

/// With fresh timers (nothing settled before this step) no level steps down,
/// and a sensor fault that only just cleared holds; escalation is the same.
#[test]
fn no_step_down_without_the_dwell() {
    let t = t();
    let fresh = Memory {
        healthy_since: Some(Millis(HOUR_MS - 1)),
        ..Memory::default()
    };
    for (row, (name, readings)) in conditions().iter().enumerate() {
        for (col, &level) in AlertLevel::ALL.iter().enumerate() {
            let out = transition(level, readings, &t, fresh, Millis(HOUR_MS));
            let (to, _) = SETTLED[row][col];
            let expected = if to > level || to == F { to } else { level };
            assert_eq!(out.level, expected, "{name} at {level:?}");
        }
    }
}

/// A latched alarm holds on every condition but a fault, and a fault that
/// clears returns to the alarm, not below.
#[test]
fn a_latched_alarm_holds() {
    let t = t();
    let latched = Memory {
        latched: true,
        ..settled_memory()
    };
    for (name, readings) in conditions() {
        let fault = matches!(readings, Readings::SensorFault | Readings::EvaluationFault)
            || name == "not finite";
        let out = transition(A, &readings, &t, latched, Millis(HOUR_MS));
        assert_eq!(out.level, if fault { F } else { A }, "{name}");
        assert!(out.memory.latched, "{name}");
        let out = transition(F, &readings, &t, latched, Millis(HOUR_MS));
        assert_eq!(out.level, if fault { F } else { A }, "{name}");
    }
}

/// The first step after an acknowledgement that steps down is caused
/// `acknowledged`; the flag is spent by that step.
#[test]
fn acknowledgement_is_the_cause_of_the_step_down() {
    let t = t();
    let mut m = Memory {
        latched: true,
        ..settled_memory()
    };
    let calm = Readings::Figures(calm());
    assert_eq!(transition(A, &calm, &t, m, Millis(HOUR_MS)).level, A);
    m.acknowledge();
    let out = transition(A, &calm, &t, m, Millis(HOUR_MS));
    assert_eq!(out.level, Cl);
    assert_eq!(out.change.map(|c| c.cause), Some(C::Acknowledged));
    assert!(!out.memory.acknowledged && !out.memory.latched);
}

/// Hysteresis across levels (regression): a drive at 0.90 of its rating,
/// inside the 0.8 band of park, keeps `park_now` however long it lasts, and
/// a tilt margin inside the band of the alarm keeps `alarm`, though the
/// wanted level is clear in both cases.
#[test]
fn a_figure_in_a_band_holds_every_level_above_it() {
    let t = t();
    let mut drive = calm();
    drive.drive = Some([0.9, 0.0]);
    let mut m = settled_memory();
    let mut level = P;
    for k in 0..100 {
        let out = transition(level, &Readings::Figures(drive), &t, m, Millis(k * 60_000));
        (level, m) = (out.level, out.memory);
    }
    assert_eq!(level, P);
    let mut tilt = calm();
    // 0.1 rad: above the 0.0873 rad alarm margin, below 0.0873 / 0.8.
    tilt.tilt_margin_rad = 0.1;
    let mut m = settled_memory();
    let mut level = A;
    for k in 0..100 {
        let out = transition(level, &Readings::Figures(tilt), &t, m, Millis(k * 60_000));
        (level, m) = (out.level, out.memory);
    }
    assert_eq!(level, A);
}

/// A fault restarts the dwell: figures settled for an hour, a one-step
/// fault, then `fault_clear_ms` to watch and a whole new dwell to clear.
#[test]
fn a_fault_restarts_every_timer() {
    let t = t();
    let calm = Readings::Figures(calm());
    let out = transition(
        W,
        &Readings::SensorFault,
        &t,
        settled_memory(),
        Millis(HOUR_MS),
    );
    assert_eq!(
        out.memory,
        Memory {
            before_fault: Some(W),
            ..Memory::default()
        }
    );
    let mut m = out.memory;
    let mut level = out.level;
    let mut changes = [None; 2];
    let mut n = 0;
    for k in 1..=700 {
        let now = Millis(HOUR_MS + k * 1000);
        let out = transition(level, &calm, &t, m, now);
        if let (Some(c), Some(slot)) = (out.change, changes.get_mut(n)) {
            *slot = Some((now.0 - HOUR_MS, c.to, c.cause));
            n += 1;
        }
        (level, m) = (out.level, out.memory);
    }
    assert_eq!(
        changes,
        [
            Some((61_000, W, C::FaultCleared)),
            Some((601_000, Cl, C::Settled))
        ]
    );
}

#[test]
fn names_are_snake_case_and_distinct() {
    let causes = [
        C::Overturning,
        C::PredictedOverturning,
        C::Sliding,
        C::Drive,
        C::TiltMargin,
        C::TiltDrift,
        C::SensorFault,
        C::EvaluationFault,
        C::Settled,
        C::FaultCleared,
        C::Acknowledged,
    ];
    for (i, a) in causes.iter().enumerate() {
        assert!(a
            .name()
            .bytes()
            .all(|b| b.is_ascii_lowercase() || b == b'_'));
        for b in causes.iter().skip(i + 1) {
            assert_ne!(a.name(), b.name());
        }
    }
    let names = AlertLevel::ALL.map(AlertLevel::name);
    assert_eq!(
        names,
        ["clear", "watch", "park_now", "alarm", "sensor_fault"]
    );
}

/// A fault never lowers the level (regression): parked with the predicted
/// utilisation in the band of park (0.7), one faulted step, then the same
/// figures: back to park_now when the fault clears, not watch; with a figure
/// in the band of the alarm after an acknowledgement, back to the alarm.
/// Once the figures settle, the usual dwell applies from the end of the
/// fault.
#[test]
fn a_fault_does_not_release_a_park_or_an_alarm() {
    let t = t();
    let mut band = calm();
    band.predicted = 0.7;
    let band = Readings::Figures(band);
    let out = transition(
        P,
        &Readings::SensorFault,
        &t,
        settled_memory(),
        Millis(HOUR_MS),
    );
    let (mut level, mut m) = (out.level, out.memory);
    for k in 1..=700_u64 {
        let out = transition(level, &band, &t, m, Millis(HOUR_MS + k * 1000));
        (level, m) = (out.level, out.memory);
        assert!(level >= P, "released at {k} s");
    }
    assert_eq!(level, P);

    let mut alarm_band = calm();
    alarm_band.overturning = 0.8;
    let mut m = settled_memory();
    m.acknowledge();
    let out = transition(A, &Readings::EvaluationFault, &t, m, Millis(HOUR_MS));
    let (mut level, mut m) = (out.level, out.memory);
    for k in 1..=100_u64 {
        let out = transition(
            level,
            &Readings::Figures(alarm_band),
            &t,
            m,
            Millis(HOUR_MS + k * 1000),
        );
        (level, m) = (out.level, out.memory);
    }
    assert_eq!(level, A);
    assert!(
        !m.latched,
        "resumed, not raised: the acknowledgement stands"
    );

    // Settled figures after a fault from park_now: back to park_now when the
    // fault clears (61 s), down to clear a dwell after the fault ended.
    let calm = Readings::Figures(calm());
    let out = transition(
        P,
        &Readings::SensorFault,
        &t,
        settled_memory(),
        Millis(HOUR_MS),
    );
    let (mut level, mut m) = (out.level, out.memory);
    let mut seen: heapless::Vec<(u64, AlertLevel, AlertCause), 4> = heapless::Vec::new();
    for k in 1..=700_u64 {
        let out = transition(level, &calm, &t, m, Millis(HOUR_MS + k * 1000));
        if let Some(c) = out.change {
            seen.push((k, c.to, c.cause)).unwrap();
        }
        (level, m) = (out.level, out.memory);
    }
    assert_eq!(seen[..], [(61, P, C::FaultCleared), (601, Cl, C::Settled)]);
}

/// The outputs of each level: park from `park_now` up, the alarm from
/// `alarm` up.
#[test]
fn outputs_of_each_level() {
    let park = AlertLevel::ALL.map(AlertLevel::park_requested);
    let alarm = AlertLevel::ALL.map(AlertLevel::alarm);
    assert_eq!(park, [false, false, true, true, true]);
    assert_eq!(alarm, [false, false, false, true, true]);
}

/// Every figure in the band of a level, or exactly at its settle bound
/// (`clear_ratio` × the threshold, computed as the decision computes it),
/// holds that level however long it lasts, though the wanted level is
/// lower. Written out by hand from the table's "settled below it when"
/// column; each figure and each level separately.
#[test]
fn a_figure_in_a_band_or_at_its_bound_holds_its_level() {
    let t = t();
    let r = t.clear_ratio;
    type Set = fn(&mut Figures, &Thresholds, f32);
    let cases: [(&str, Set, AlertLevel); 13] = [
        ("sliding in the watch band", |f, _, _| f.sliding = 0.45, W),
        (
            "drift in the watch band",
            |f, _, _| f.drift_rad_per_s = 2.0e-6,
            W,
        ),
        (
            "predicted at the watch bound",
            |f, t, r| f.predicted = r * t.watch_utilisation,
            W,
        ),
        (
            "sliding at the watch bound",
            |f, t, r| f.sliding = r * t.watch_utilisation,
            W,
        ),
        (
            "drift at the watch bound",
            |f, t, r| f.drift_rad_per_s = r * t.drift_watch_rad_per_s,
            W,
        ),
        ("predicted in the park band", |f, _, _| f.predicted = 0.7, P),
        (
            "predicted at the park bound",
            |f, t, r| f.predicted = r * t.park_utilisation,
            P,
        ),
        (
            "drive at the park bound",
            |f, t, r| f.drive = Some([r * t.drive_park_utilisation, 0.0]),
            P,
        ),
        (
            "overturning at the alarm bound",
            |f, t, r| f.overturning = r * t.alarm_utilisation,
            A,
        ),
        ("sliding in the alarm band", |f, _, _| f.sliding = 0.8, A),
        (
            "sliding at the alarm bound",
            |f, t, r| f.sliding = r * t.alarm_utilisation,
            A,
        ),
        (
            "tilt margin in the alarm band",
            |f, _, _| f.tilt_margin_rad = 0.1,
            A,
        ),
        (
            "drive in the park band, first axis",
            |f, _, _| f.drive = Some([0.9, 0.1]),
            P,
        ),
    ];
    for (name, set, level) in cases {
        let mut f = calm();
        set(&mut f, &t, r);
        let mut m = settled_memory();
        let mut at = level;
        for k in 0..50_u64 {
            let out = transition(
                at,
                &Readings::Figures(f),
                &t,
                m,
                Millis(HOUR_MS + k * 60_000),
            );
            (at, m) = (out.level, out.memory);
        }
        assert_eq!(at, level, "{name}");
        // …and from one level higher, it steps down to it, no further.
        if level < A {
            let mut m = settled_memory();
            let mut at = AlertLevel::ALL[level as usize + 1];
            for k in 0..50_u64 {
                let out = transition(
                    at,
                    &Readings::Figures(f),
                    &t,
                    m,
                    Millis(HOUR_MS + k * 60_000),
                );
                (at, m) = (out.level, out.memory);
            }
            assert_eq!(at, level, "{name}, from above");
        }
    }
}

/// The settle bounds scale with each threshold, not only at the defaults
/// (where the drive threshold is 1 and `r × 1 = r / 1`): with a drive park
/// threshold of 1.2 a drive at 0.7 (below 0.8 × 1.2 = 0.96) is settled; and
/// exactly at a tilt-margin bound (0.16 rad × 0.5 = 0.08 rad, exact in
/// binary) the margin is not yet settled.
#[test]
fn settle_bounds_follow_their_thresholds() {
    let mut t = t();
    t.drive_park_utilisation = 1.2;
    let mut f = calm();
    f.drive = Some([0.7, 0.0]);
    assert!(settled_below(P, &f, &t));
    f.drive = Some([0.97, 0.0]);
    assert!(!settled_below(P, &f, &t));

    let mut t = super::tests::t();
    t.clear_ratio = 0.5;
    t.tilt_margin_alarm_rad = 0.08;
    let mut f = calm();
    f.tilt_margin_rad = 0.16;
    assert!(!settled_below(A, &f, &t));
    f.tilt_margin_rad = 0.17;
    assert!(settled_below(A, &f, &t));
}
