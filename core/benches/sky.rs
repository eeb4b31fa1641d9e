//! Cost of the sky scan, payload envelope and park search on a typical
//! (invented) German-equatorial rig: `cargo bench -p standfast`.
//!
//! The figures are host timings; a microcontroller is slower by the ratio of
//! its floating-point throughput. Use them to choose the grid and the number
//! of wind directions.
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
use standfast::air::Air;
use standfast::frame::Tilt;
use standfast::math::deg_to_rad;
use standfast::rig::Rig;
use standfast::sky::{ParkRequest, PayloadOffset, SkyGrid, SkyScan};
use standfast::torque::PayloadPick;

fn scan(step_deg: f32, directions: u16) -> SkyScan {
    SkyScan {
        grid: SkyGrid::with_step(deg_to_rad(step_deg), deg_to_rad(10.0)),
        wind_directions: directions,
        wind_speed_mps: 8.0,
        air: Air::default(),
        tilt: Tilt::LEVEL,
    }
}

/// The payload envelope's 8 offsets.
fn offsets() -> [PayloadOffset; 8] {
    core::array::from_fn(|i| PayloadOffset {
        along_secondary_axis_m: 0.15 + 0.03 * i as f32,
        along_tube_m: 0.0,
    })
}

/// The park search's request.
fn park_request() -> ParkRequest {
    ParkRequest {
        wind_from_rad: deg_to_rad(250.0),
        wind_speed_mps: 18.0,
        air: Air::default(),
        tilt: Tilt::LEVEL,
        cover_fitted: false,
        scan: Some(SkyGrid::with_step(deg_to_rad(15.0), deg_to_rad(0.0))),
    }
}

#[inline(never)]
fn once_sky_scan_15(rig: &Rig) -> u32 {
    rig.sky_scan(black_box(&scan(15.0, 16)))
        .map(|w| w.poses_checked)
        .unwrap_or_else(|e| panic!("{e}"))
}

#[inline(never)]
fn once_sky_scan_10(rig: &Rig) -> u32 {
    rig.sky_scan(black_box(&scan(10.0, 12)))
        .map(|w| w.poses_checked)
        .unwrap_or_else(|e| panic!("{e}"))
}

#[inline(never)]
fn once_payload_envelope(rig: &Rig) -> bool {
    let grid = SkyGrid::with_step(deg_to_rad(10.0), deg_to_rad(0.0));
    rig.payload_envelope(black_box(&grid), PayloadPick::UnderCover, &offsets())
        .is_ok()
}

#[inline(never)]
fn once_safest_park(rig: &Rig) -> bool {
    rig.safest_park(black_box(&park_request()), &[]).is_ok()
}

/// Each workload once, for an instruction counter.
fn once() {
    let rig = rig();
    println!(
        "sky scan 15°, 16 directions: {} poses",
        once_sky_scan_15(&rig)
    );
    println!(
        "sky scan 10°, 12 directions: {} poses",
        once_sky_scan_10(&rig)
    );
    println!("payload envelope: ok {}", once_payload_envelope(&rig));
    println!("safest park: ok {}", once_safest_park(&rig));
}

fn benches(c: &mut Criterion) {
    let rig = rig();
    for (step, dirs) in [(15.0, 16), (10.0, 12)] {
        let s = scan(step, dirs);
        let n = rig
            .sky_scan(&s)
            .map(|w| w.poses_checked)
            .unwrap_or_else(|e| panic!("{e}"));
        let name = format!("sky_scan {step}° grid, {dirs} directions, {n} poses");
        c.bench_function(&name, |b| b.iter(|| rig.sky_scan(black_box(&s))));
    }
    let grid = SkyGrid::with_step(deg_to_rad(10.0), deg_to_rad(0.0));
    let offsets = offsets();
    c.bench_function("payload_envelope 10° grid, 8 rows", |b| {
        b.iter(|| rig.payload_envelope(black_box(&grid), PayloadPick::UnderCover, &offsets))
    });
    let req = park_request();
    c.bench_function("safest_park 15° grid", |b| {
        b.iter(|| rig.safest_park(black_box(&req), &[]))
    });
}

criterion_group!(sky, benches);

fn main() {
    if std::env::var_os("STANDFAST_BENCH_ONCE").is_some() {
        once();
        return;
    }
    sky();
    Criterion::default().configure_from_args().final_summary();
}
