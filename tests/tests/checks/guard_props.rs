//! Properties of the guard over random traces of samples (`proptest`).
//!
//! Each case is a trace of up to 160 steps on a tripod rig with weak drives:
//! time steps forward (now and then backwards), accelerometer, wind, pose,
//! cover and air samples, each sometimes missing and sometimes bad (NaN,
//! infinite, out of range, a cover the rig does not have), and
//! acknowledgements. Every step of every trace is checked against the rules
//! of `standfast::guard::transition` (module docs); the reference for the
//! invariants is that table, written down before the code:
//! 1. never below `park_now` while a present figure is at or above its park
//!    or alarm threshold (and never below the wanted level at all);
//! 2. never a step down while a figure is not settled below a level being
//!    left (`clear_ratio` × its threshold);
//! 3. a non-finite or rejected input, or a reversed clock, raises a fault in
//!    the same step;
//! 4. any fault puts the guard in `sensor_fault`, and park is asserted at
//!    `park_now` and above;
//! 5. an alarm latches until acknowledged;
//! 6. nothing panics, and no figure is NaN.
//!
//! The rules are checked by `standfast_checks::guard_trace::check_trace`.
//! 1,000 traces in a plain `cargo test`; `.ci/run` runs 10,000 in a release
//! build (`PROPTEST_CASES=10000 cargo test --release -p standfast-checks
//! guard_props`). A failure prints its minimal trace.

use crate::fixtures::altaz;
use proptest::prelude::*;
use standfast::guard::{AirSample, Inputs, WindSample};
use standfast_checks::guard_trace::{check_trace, config, rig, Step};

/// A uniform value in `[r.start, r.end)`, drawn through a 24-bit integer
/// rather than proptest's own `f32` range sampler, one of whose debug
/// assertions fired once in a debug-build run of these properties (proptest
/// 1.12.0, `num/float_samplers.rs`), which would make `cargo test` flaky.
fn uniform(r: std::ops::Range<f32>) -> impl Strategy<Value = f32> {
    const STEPS: u32 = 1 << 24;
    let (low, high) = (r.start, r.end);
    assert!(high > 0.0 && high.is_finite() && low < high);
    // The largest f32 below `high` (positive): one less in its bits.
    let top = f32::from_bits(high.to_bits() - 1);
    (0..STEPS).prop_map(move |i| {
        // Exact: i < 2^24.
        #[allow(clippy::cast_precision_loss)]
        let share = i as f32 / STEPS as f32;
        (low + (high - low) * share).min(top)
    })
}

/// A value from `good`, or with weight `bad` against 60 a bad one.
fn value(good: std::ops::Range<f32>, bad: u32) -> impl Strategy<Value = (f32, bool)> {
    prop_oneof![
        60 => uniform(good).prop_map(|v| (v, false)),
        bad => prop_oneof![
            Just(f32::NAN),
            Just(f32::INFINITY),
            Just(f32::NEG_INFINITY),
            Just(-1e30_f32),
            Just(1e30_f32),
        ]
        .prop_map(|v| (v, true)),
    ]
}

/// One step; `bad` weighs bad values against 60 good ones (0: a clean trace,
/// in which the guard spends its time judging the rig rather than faulted).
fn step(bad: u32) -> impl Strategy<Value = Step> {
    let dt = prop_oneof![
        20 => 1_i64..2_000,
        2 => 2_000_i64..20_000,
        1 => -5_000_i64..0,
    ];
    let accel = prop::option::weighted(
        0.9,
        (
            value(-0.05..0.05, bad),
            value(-0.05..0.05, bad),
            value(0.95..1.05, bad),
        ),
    );
    // Wind: mostly 0 to 40 m/s (the rig tips near 22 m/s), some beyond the
    // anemometer's 100 m/s limit.
    let wind = prop::option::weighted(
        0.6,
        (
            prop_oneof![
                60 => value(0.0..40.0, bad),
                bad => uniform(100.5..200.0).prop_map(|v| (v, true)),
            ],
            prop::option::of(value(0.0..std::f32::consts::TAU, bad)),
        ),
    );
    let pose = prop::option::weighted(0.3, (value(-180.0..180.0, bad), value(0.0..89.0, bad)));
    // The rig has no cover: "fitted" is a bad sample, "removed" a good one.
    let cover = prop::option::weighted(0.05, prop::bool::weighted(f64::from(bad) / 60.0));
    let air = prop::option::weighted(
        0.05,
        (value(-30.0..40.0, bad), value(70_000.0..105_000.0, bad)),
    );
    (
        dt,
        accel,
        wind,
        pose,
        cover,
        air,
        prop::bool::weighted(0.02),
    )
        .prop_map(|(dt_ms, accel, wind, pose, cover, air, acknowledge)| {
            let mut bad = false;
            let mut inputs = Inputs::default();
            if let Some(((x, bx), (y, by), (z, bz))) = accel {
                bad |= bx || by || bz;
                inputs.accel_raw = Some([x, y, z]);
            }
            if let Some(((v, bv), dir)) = wind {
                bad |= bv || dir.is_some_and(|(_, b)| b);
                inputs.wind = Some(WindSample {
                    speed_mps: v,
                    from_rad: dir.map(|(d, _)| d),
                });
            }
            if let Some(((az, bad_az), (alt, bad_alt))) = pose {
                bad |= bad_az || bad_alt;
                inputs.pose = Some(altaz(az, alt));
            }
            if let Some(c) = cover {
                // The rig has no cover: "fitted" is refused.
                bad |= c;
                inputs.cover_fitted = Some(c);
            }
            if let Some(((t, bt), (p, bp))) = air {
                bad |= bt || bp;
                inputs.air = Some(AirSample {
                    temperature_k: standfast::air::celsius_to_kelvin(t),
                    pressure_pa: p,
                });
            }
            Step {
                dt_ms,
                inputs,
                acknowledge,
                bad,
            }
        })
}

fn cases() -> u32 {
    std::env::var("PROPTEST_CASES")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1_000)
}

proptest! {
    #![proptest_config(ProptestConfig {
        cases: cases(),
        max_shrink_iters: 2_000,
        ..ProptestConfig::default()
    })]

    #[test]
    fn the_guard_keeps_its_rules_on_any_trace(
        trace in prop_oneof![Just(0_u32), Just(1), Just(5)]
            .prop_flat_map(|bad| prop::collection::vec(step(bad), 1..160))
    ) {
        let rig = rig();
        if let Err(e) = check_trace(&rig, config(), &trace) {
            return Err(TestCaseError::fail(e));
        }
    }
}
