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

use criterion::{black_box, criterion_group, Criterion};
use standfast::air::Air;
use standfast::drive::{DriveRating, Drives};
use standfast::frame::Tilt;
use standfast::math::deg_to_rad;
use standfast::mount::MountGeometry;
use standfast::rig::{BodySpec, CounterweightSpec, LegsSpec, Rig, RigSpec, ShaftSpec, Stage};
use standfast::sky::{ParkRequest, PayloadOffset, SkyGrid, SkyScan};
use standfast::support::Support;
use standfast::torque::PayloadPick;

/// An invented rig: tripod with legs, 9 kg tube, mount head, two
/// counterweights, a shaft and drives.
fn rig() -> Rig {
    let rating = DriveRating {
        rated_nm: 15.0,
        repeated_peak_nm: 35.0,
        momentary_peak_nm: 70.0,
    };
    let spec = RigSpec::new(
        &Support::tripod(0.55, 0.0).unwrap_or_else(|e| panic!("{e}")),
        MountGeometry::equatorial(deg_to_rad(47.0), [0.0, 0.0, 1.35]),
        0.5,
    )
    .with_legs(LegsSpec::new(1.5, 0.04, 1.1, 0.1))
    .with_shaft(ShaftSpec::new(0.9, 0.42, 0.02))
    .with_drives(Drives {
        primary: rating,
        secondary: rating,
        slew_acceleration_rad_per_s2: 0.3,
    })
    .with_body(
        BodySpec::optical_tube(9.0, 0.24, 0.95, [0.21, 0.08, 0.0]).with_cg_m([0.21, 0.04, 0.0]),
    )
    .and_then(|s| {
        s.with_body(BodySpec::cuboid(
            Stage::Primary,
            7.0,
            [0.0, 0.0, -0.1],
            [0.2, 0.2, 0.25],
        ))
    })
    .and_then(|s| s.with_counterweight(CounterweightSpec::disc(4.5, 0.27, 0.12, 0.045)))
    .and_then(|s| s.with_counterweight(CounterweightSpec::disc(4.5, 0.32, 0.12, 0.045)))
    .unwrap_or_else(|e| panic!("{e}"));
    Rig::new(&spec).unwrap_or_else(|e| panic!("{e}"))
}

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
