//! Cost of the sky scan, payload envelope and park search on a typical
//! (invented) German-equatorial rig: `cargo bench -p standfast`.
//!
//! The figures are host timings; a microcontroller is slower by the ratio of
//! its floating-point throughput. Use them to choose the grid and the number
//! of wind directions.

// Host-only benchmark: a bad fixture should stop it loudly.
#![allow(clippy::panic)]
// `criterion_group!` generates an undocumented public function.
#![allow(missing_docs)]

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use standfast::air::Air;
use standfast::bounded::Vec;
use standfast::drive::{DriveRating, Drives};
use standfast::frame::Tilt;
use standfast::math::deg_to_rad;
use standfast::mount::{MountGeometry, MountKind};
use standfast::rig::{
    BodySpec, CounterweightSpec, LegsSpec, MassModel, Rig, RigSpec, ShaftSpec, Stage,
};
use standfast::shape::{Exposure, Shape};
use standfast::sky::{ParkRequest, PayloadOffset, SkyGrid, SkyScan};
use standfast::support::Support;
use standfast::torque::PayloadPick;

/// An invented rig: tripod with legs, 9 kg tube, mount head, two
/// counterweights, a shaft and drives.
fn rig() -> Rig {
    let support = Support::tripod(0.55, 0.0).unwrap_or_else(|e| panic!("{e}"));
    let mut bodies = Vec::new();
    let tube = BodySpec {
        stage: Stage::Secondary,
        mass_kg: 9.0,
        cg_m: [0.21, 0.04, 0.0],
        exposure: Some(Exposure {
            shape: Shape::Cylinder {
                diameter_m: 0.24,
                length_m: 0.95,
                axis: [0.0, 1.0, 0.0],
            },
            centre_m: [0.21, 0.08, 0.0],
            drag_coefficient: None,
            end_drag_coefficient: None,
        }),
        mass_model: MassModel::Shell,
        under_cover: true,
        ..BodySpec::default()
    };
    let head = BodySpec {
        stage: Stage::Primary,
        mass_kg: 7.0,
        cg_m: [0.0, 0.0, -0.1],
        exposure: Some(Exposure {
            shape: Shape::Box {
                size_m: [0.2, 0.2, 0.25],
                edges: None,
            },
            centre_m: [0.0, 0.0, -0.1],
            drag_coefficient: None,
            end_drag_coefficient: None,
        }),
        ..BodySpec::default()
    };
    let _ = bodies.push(tube);
    let _ = bodies.push(head);
    let mut counterweights = Vec::new();
    for (m, l) in [(4.5, 0.27), (4.5, 0.32)] {
        let _ = counterweights.push(CounterweightSpec {
            mass_kg: m,
            distance_m: l,
            diameter_m: 0.12,
            thickness_m: 0.045,
            drag_coefficient: None,
        });
    }
    let rating = DriveRating {
        rated_nm: 15.0,
        repeated_peak_nm: 35.0,
        momentary_peak_nm: 70.0,
    };
    let spec = RigSpec {
        feet: support.feet().iter().copied().collect(),
        legs: Some(LegsSpec {
            mass_kg: 1.5,
            diameter_m: 0.04,
            top_height_m: 1.1,
            top_radius_m: 0.1,
        }),
        friction_coefficient: 0.5,
        mount: MountGeometry {
            kind: MountKind::Equatorial,
            latitude_rad: deg_to_rad(47.0),
            axis_origin_m: [0.0, 0.0, 1.35],
        },
        bodies,
        counterweights,
        shaft: Some(ShaftSpec {
            mass_kg: 0.9,
            length_m: 0.42,
            diameter_m: 0.02,
        }),
        cover: None,
        ballast: Vec::new(),
        drives: Some(Drives {
            primary: rating,
            secondary: rating,
            slew_acceleration_rad_s2: 0.3,
        }),
    };
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
    let offsets: [PayloadOffset; 8] = core::array::from_fn(|i| PayloadOffset {
        along_secondary_axis_m: 0.15 + 0.03 * i as f32,
        along_tube_m: 0.0,
    });
    c.bench_function("payload_envelope 10° grid, 8 rows", |b| {
        b.iter(|| rig.payload_envelope(black_box(&grid), PayloadPick::UnderCover, &offsets))
    });
    let req = ParkRequest {
        wind_from_rad: deg_to_rad(250.0),
        wind_speed_mps: 18.0,
        air: Air::default(),
        tilt: Tilt::LEVEL,
        cover_fitted: false,
        scan: Some(SkyGrid::with_step(deg_to_rad(15.0), deg_to_rad(0.0))),
    };
    c.bench_function("safest_park 15° grid", |b| {
        b.iter(|| rig.safest_park(black_box(&req), &[]))
    });
}

criterion_group!(sky, benches);
criterion_main!(sky);
