//! Cost of the guard's step on the host, on an invented German-equatorial
//! rig (the sky bench's, `common/mod.rs`): `cargo bench -p standfast --bench guard`.
//!
//! The workload is one minute of an invented night: an accelerometer
//! sample every 20 ms (50 Hz, a tilt of about 0.6° with noise), an
//! anemometer sample every second (6 ± 2 m/s from about 200°), a fixed
//! pose; the guard evaluates the physics once a second. It is stepped
//! twice: with `Guard::step` (the verdict returned) and with
//! `Guard::step_into` (written into one verdict kept by the caller).
//!
//! With `STANDFAST_BENCH_ONCE=1` set, criterion is not run: each workload
//! runs once in a function of its own (`once_*`), for an instruction count
//! (`bash core/benches/callgrind.sh`, BENCHMARKS.md).

// Host-only benchmark: a bad fixture should stop it loudly.
#![allow(clippy::panic)]
// `criterion_group!` generates an undocumented public function.
#![allow(missing_docs)]

mod common;

use common::rig;
use criterion::{black_box, criterion_group, Criterion};
use standfast::guard::{Guard, GuardConfig, Inputs, Verdict, WindSample};
use standfast::math::deg_to_rad;
use standfast::mount::{PierSide, Pose};
use standfast::rig::Rig;
use standfast::sense::Millis;

/// Steps in the workload: one minute at 50 Hz.
const STEPS: u64 = 3_000;

/// A guard on `rig` with the default configuration, a fixed pose and a
/// fault clear time of 5 s (the default's 60 s would hold the whole minute
/// in `sensor_fault` after the start, when no wind has been read yet).
fn guard(rig: &Rig) -> Guard<'_> {
    let config = GuardConfig {
        fault_clear_s: 5.0,
        assumed_pose: Some(Pose::Equatorial {
            hour_angle_rad: deg_to_rad(-30.0),
            declination_rad: deg_to_rad(40.0),
            pier_side: PierSide::TubeWest,
        }),
        ..GuardConfig::default()
    };
    Guard::new(rig, config, Millis(0)).unwrap_or_else(|e| panic!("{e}"))
}

/// The inputs of step `k` (1 to [`STEPS`]): deterministic noise from a
/// xorshift generator `s`.
fn inputs(k: u64, s: &mut u32) -> Inputs {
    let mut noise = || {
        *s ^= *s << 13;
        *s ^= *s >> 17;
        *s ^= *s << 5;
        // 24 bits, exact in f32.
        (*s >> 8) as f32 / 16_777_216.0 - 0.5
    };
    let mut i = Inputs {
        accel_raw: Some([
            0.01 + 0.003 * noise(),
            0.003 * noise(),
            1.0 + 0.003 * noise(),
        ]),
        ..Inputs::default()
    };
    if k % 50 == 0 {
        i.wind = Some(WindSample {
            speed_mps: 6.0 + 4.0 * noise(),
            from_rad: Some(3.5 + 0.4 * noise()),
        });
    }
    i
}

/// The workload with `Guard::step`: the sum of the levels' ranks (0 for
/// `clear`), so that nothing is optimised away.
#[inline(never)]
fn once_guard_step(rig: &Rig) -> u64 {
    let mut g = guard(rig);
    let mut s = 0x2545_f491;
    let mut sum = 0;
    // The first step, with no sample (as `once_guard_step_into` takes its
    // verdict from).
    black_box(g.step(Millis(0), &Inputs::default()));
    for k in 1..=STEPS {
        let v = g.step(Millis(k * 20), &inputs(k, &mut s));
        sum += v.level as u64;
    }
    sum
}

/// The workload with `Guard::step_into`, into one verdict: the same sum
/// as [`once_guard_step`].
#[inline(never)]
fn once_guard_step_into(rig: &Rig) -> u64 {
    let mut g = guard(rig);
    let mut s = 0x2545_f491;
    let mut sum = 0;
    // The first step, with no sample: the verdict written into from then on.
    let mut v: Verdict = g.step(Millis(0), &Inputs::default());
    for k in 1..=STEPS {
        g.step_into(Millis(k * 20), &inputs(k, &mut s), &mut v);
        sum += v.level as u64;
    }
    sum
}

/// Each workload once, for an instruction counter.
fn once() {
    let rig = rig();
    println!("guard, {STEPS} steps with step: {}", once_guard_step(&rig));
    println!(
        "guard, {STEPS} steps with step_into: {}",
        once_guard_step_into(&rig)
    );
}

fn benches(c: &mut Criterion) {
    let rig = rig();
    c.bench_function("guard step, one minute at 50 Hz (3,000 steps)", |b| {
        b.iter(|| once_guard_step(black_box(&rig)))
    });
    c.bench_function("guard step_into, one minute at 50 Hz (3,000 steps)", |b| {
        b.iter(|| once_guard_step_into(black_box(&rig)))
    });
}

criterion_group!(guard_steps, benches);

fn main() {
    if std::env::var_os("STANDFAST_BENCH_ONCE").is_some() {
        once();
        return;
    }
    guard_steps();
    Criterion::default().configure_from_args().final_summary();
}
