//! Runs a guard over a trace of steps and checks, at every step, the rules of
//! `standfast::guard::transition` (its module docs are the reference):
//! 1. never below the wanted level with trusted figures, so never below
//!    `park_now` while a present figure is at or above its park or alarm
//!    threshold;
//! 2. never a step down while a figure is not settled below a level being
//!    left (`clear_ratio` × its threshold);
//! 3. a sample marked bad, or a reversed clock, raises a fault in the same
//!    step;
//! 4. any fault puts the guard in `sensor_fault`; park is asserted exactly
//!    from `park_now` up, and then a park pose is given;
//! 5. an alarm raised by a figure at its threshold latches until
//!    acknowledged (a fault that clears returns to it);
//! 6. no figure is NaN; events beyond capacity are counted;
//! 7. a verdict that did not evaluate shows the figures of the verdict
//!    before it, bit for bit (`Verdict::evaluated`; the replay's report
//!    relies on it);
//! 8. a twin guard stepped with `Guard::step_into`, into one verdict reused
//!    from step to step, gives the same verdict (its `Debug` text, which
//!    tells NaN and −0 apart); a tilt reading is within 0 to 45° and its
//!    angles are `tilt_of_specific_force`'s for its vector.
//!
//! Used by the property tests (`tests/checks/guard_props.rs`) and the fuzz
//! target `guard_step` (`core/fuzz`).

use crate::fixtures::{altaz, post_rig};
use standfast::drive::{DriveRating, Drives};
use standfast::frame::MAX_TILT_RAD;
use standfast::guard::transition::{settled_below, wanted, Figures};
use standfast::guard::{AlertLevel, Event, Guard, GuardConfig, Inputs, Verdict};
use standfast::rig::{BodySpec, Rig, Stage as MountStage};
use standfast::sense::{tilt_of_specific_force, Millis};
use standfast::support::Support;

/// The trace rig: a tripod with a 40 kg post and a tube on weak drives (rated 6 N·m), so
/// that moderate winds reach every level, drives included.
pub fn rig() -> Rig {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let mut spec = post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5);
    spec.bodies
        .push(BodySpec {
            stage: MountStage::Secondary,
            mass_kg: 2.0,
            cg_m: [0.0, 0.1, 0.0],
            ..BodySpec::default()
        })
        .unwrap();
    let r = DriveRating {
        rated_nm: 6.0,
        repeated_peak_nm: 10.0,
        momentary_peak_nm: 15.0,
    };
    spec.drives = Some(Drives {
        primary: r,
        secondary: r,
        slew_acceleration_rad_per_s2: 0.0,
    });
    Rig::new(&spec).unwrap()
}

/// Short times so that a trace of a few minutes walks through step-downs:
/// dwell 20 s, fault clear 5 s, park 10 s, evaluation every second.
pub fn config() -> GuardConfig {
    let mut c = GuardConfig {
        assumed_pose: Some(altaz(0.0, 30.0)),
        dwell_s: 20.0,
        fault_clear_s: 5.0,
        time_to_park_s: 10.0,
        ..GuardConfig::default()
    };
    c.wind.stale_after_s = 5.0;
    c.wind.stuck_after_s = 60.0;
    c
}

/// One step of a trace.
#[derive(Clone, Debug)]
pub struct Step {
    /// Milliseconds forward from the previous step; negative: the clock goes
    /// back.
    pub dt_ms: i64,
    /// The samples of the step.
    pub inputs: Inputs,
    /// Acknowledge the alarm before the step.
    pub acknowledge: bool,
    /// A sample in `inputs` is one the guard must refuse (NaN, infinite, out
    /// of range, a cover on a rig without one). Only what the caller knows
    /// to be bad needs marking; unmarked bad samples are not checked by
    /// rule 3.
    pub bad: bool,
}

/// The figures of a verdict as the decision reads them, when all present.
#[must_use]
pub fn figures(v: &Verdict) -> Option<Figures> {
    Some(Figures {
        overturning: v.overturning_utilisation?,
        predicted: v.predicted_utilisation?,
        sliding: v.sliding_utilisation?,
        drive: v.drive_utilisation,
        tilt_margin_rad: v.tilt_margin_rad?,
        drift_rad_per_s: v.tilt_drift_rad_per_s,
    })
}

/// The bits of a verdict's evaluated figures (`None` as 2^32, which no
/// `f32`'s bits are), for rule 7.
fn shown_bits(v: &Verdict) -> [u64; 12] {
    let b = |x: Option<f32>| x.map_or(1 << 32, |x| u64::from(x.to_bits()));
    let d = v.drive_utilisation;
    [
        b(v.overturning_utilisation),
        b(v.predicted_utilisation),
        b(v.sliding_utilisation),
        b(d.map(|d| d[0])),
        b(d.map(|d| d[1])),
        b(v.tip_wind_mps),
        b(v.gust_mps),
        b(v.predicted_gust_mps),
        b(v.wind_from_rad),
        b(v.tilt_margin_rad),
        b(Some(v.tilt_drift_rad_per_s)),
        u64::from(d.is_some()),
    ]
}

/// Starts a guard on `rig` with `config` at 1,000 s and runs `trace`,
/// checking the rules at every step.
///
/// # Errors
/// The first broken rule, with the step and the verdict.
///
/// # Panics
/// When `config` is invalid for `rig`.
pub fn check_trace(rig: &Rig, config: GuardConfig, trace: &[Step]) -> Result<(), String> {
    let t = config.thresholds();
    let mut guard =
        Guard::new(rig, config.clone(), Millis(1_000_000)).expect("a valid configuration");
    let mut twin = Guard::new(rig, config, Millis(1_000_000)).expect("a valid configuration");
    let mut reused: Option<Verdict> = None;
    if guard.level() != AlertLevel::SensorFault {
        return Err("a new guard must start in sensor_fault".to_owned());
    }
    let mut now: i64 = 1_000_000;
    let mut last_now = now;
    let mut latched = false;
    let mut previous: Option<[u64; 12]> = None;
    for (i, s) in trace.iter().enumerate() {
        if s.acknowledge {
            guard.acknowledge();
            twin.acknowledge();
            latched = false;
        }
        now = now.saturating_add(s.dt_ms).clamp(0, i64::MAX / 2);
        let reversed = now < last_now;
        let before = guard.level();
        let v = guard.step(Millis(u64::try_from(now).unwrap_or(0)), &s.inputs);
        last_now = last_now.max(now);
        let fail = |what: &str| Err(format!("step {i}: {what}\nstep: {s:?}\nverdict: {v:?}"));

        // 8.
        let at = Millis(u64::try_from(now).unwrap_or(0));
        match reused.as_mut() {
            Some(r) => twin.step_into(at, &s.inputs, r),
            None => reused = Some(twin.step(at, &s.inputs)),
        }
        if reused
            .as_ref()
            .is_none_or(|r| format!("{r:?}") != format!("{v:?}"))
        {
            return fail(&format!("step_into gave another verdict: {reused:?}"));
        }
        if let Some(r) = v.tilt {
            let want = tilt_of_specific_force(r.specific_force_g()).ok();
            let got = r.tilt();
            if want.is_none_or(|w| format!("{w:?}") != format!("{got:?}"))
                || !(0.0..=MAX_TILT_RAD).contains(&got.magnitude_rad)
            {
                return fail(&format!("a tilt reading's angles {got:?}, want {want:?}"));
            }
        }

        // 7.
        let bits = shown_bits(&v);
        if !v.evaluated && previous.is_some_and(|p| p != bits) {
            return fail("figures changed without an evaluation");
        }
        previous = Some(bits);
        // 6.
        let shown = [
            v.overturning_utilisation,
            v.predicted_utilisation,
            v.sliding_utilisation,
            v.tip_wind_mps,
            v.gust_mps,
            v.predicted_gust_mps,
            v.tilt_margin_rad,
            Some(v.tilt_drift_rad_per_s),
        ];
        if shown.iter().flatten().any(|x| x.is_nan()) {
            return fail("a NaN figure");
        }
        if v.events_lost > 0 && v.events.len() != v.events.capacity() {
            return fail("events lost while slots were free");
        }
        // 3.
        if (s.bad || reversed) && v.faults.is_empty() {
            return fail("a bad sample or a reversed clock raised no fault");
        }
        // 4.
        if !v.faults.is_empty() && v.level != AlertLevel::SensorFault {
            return fail("a fault outside sensor_fault");
        }
        if v.park_pose.is_some() != v.level.park_requested() {
            return fail("a park request without a park pose, or the reverse");
        }
        // 1.
        if v.faults.is_empty() {
            let Some(f) = figures(&v) else {
                return fail("no fault, yet figures are missing");
            };
            if v.level < wanted(&f, &t).0 {
                return fail("below the wanted level");
            }
        }
        // 2. and 5.
        for e in &v.events {
            let Event::LevelChanged { from, to, .. } = *e else {
                continue;
            };
            if from != before {
                return fail("a change from a level the guard was not at");
            }
            if to < from && from != AlertLevel::SensorFault {
                if latched {
                    return fail("a latched alarm stepped down");
                }
                let Some(f) = figures(&v) else {
                    return fail("a step down without figures");
                };
                let left = AlertLevel::ALL
                    .into_iter()
                    .filter(|l| *l > to && *l <= from);
                if left.clone().any(|l| !settled_below(l, &f, &t)) {
                    return fail("a step down with a figure in the band of a level left");
                }
            }
            if latched && from == AlertLevel::SensorFault && to < AlertLevel::Alarm {
                return fail("a fault cleared below a latched alarm");
            }
        }
        // An alarm entered because a figure reached its threshold latches; one
        // resumed after a fault keeps the latch it had.
        let at_threshold = figures(&v).is_some_and(|f| wanted(&f, &t).0 == AlertLevel::Alarm);
        if v.level == AlertLevel::Alarm && before != AlertLevel::Alarm && at_threshold {
            latched = true;
        }
        if latched && v.level < AlertLevel::Alarm {
            return fail("a latched alarm left without acknowledgement");
        }
    }
    Ok(())
}
