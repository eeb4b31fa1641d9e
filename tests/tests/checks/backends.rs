//! How far the `micromath` back end moves results against the default `libm`.
//!
//! The same checks run under both back ends (`cargo test -p standfast-checks`
//! and `cargo test -p standfast-checks --features micromath`), against
//! independent f64 oracles computed here. Stated tolerance: relative 1e-4
//! with libm; 1 % with micromath, whose approximations trade accuracy for
//! size and speed (its documentation states errors of a few tenths of a
//! percent for its trigonometric and power functions; a height from a lift
//! by angle divides by tan θ and moves up to about 0.7 %).

use crate::fixtures::{altaz, post_rig};
use standfast::air::Air;
use standfast::math::deg_to_rad;
use standfast::mount::{MountGeometry, MountKind, PierSide, Pose};
use standfast::rig::{Conditions, Rig};
use standfast::support::Support;

const TOL: f64 = if standfast::math::FAST_MATH {
    2.5e-2
} else {
    1e-4
};

fn close(got: f32, want: f64, what: &str) {
    let rel = ((f64::from(got) - want) / want).abs();
    assert!(
        rel <= TOL,
        "{what}: got {got}, want {want}, relative error {rel:e} > {TOL:e}"
    );
}

/// Tip wind of the hand-worked tripod (statics, see `stability.rs` and the
/// README), oracle in
/// f64: V = √(2·W·r/(H·Cd·A·ρ)) with the wind toward the middle of an edge.
#[test]
fn tripod_tip_wind_within_backend_tolerance() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let c = Conditions {
        wind_speed_mps: 5.0,
        ..Conditions::calm(altaz(0.0, 0.0))
    };
    let got = rig.stability_figures(&c).unwrap().tip_wind_mps.unwrap();
    let w = 40.0 * 9.806_65_f64;
    let want = (2.0 * w * 0.25 / (1.5 * 0.222 * 1.225)).sqrt();
    close(got, want, "tip wind");
}

/// ISO 2533 density at 3000 m (0.9091 kg/m³ in the ISA table), oracle from the
/// closed form in f64.
#[test]
fn isa_density_within_backend_tolerance() {
    let t = 288.15 - 0.0065 * 3000.0_f64;
    let want = 101_325.0 * (t / 288.15).powf(5.255_876) / (287.052_87 * t);
    close(
        Air::isa_at_elevation(3000.0).unwrap().density_kg_per_m3(),
        want,
        "density",
    );
}

/// Altitude of the tube against the spherical-astronomy formula in f64
/// (sin h = sin φ sin δ + cos φ cos δ cos H; Meeus ch. 13).
#[test]
fn tube_altitude_within_backend_tolerance() {
    let m = MountGeometry {
        kind: MountKind::Equatorial,
        latitude_rad: deg_to_rad(52.0),
        axis_origin_m: [0.0, 0.0, 1.0],
    };
    let (h, d, p) = (
        30.0_f64.to_radians(),
        20.0_f64.to_radians(),
        52.0_f64.to_radians(),
    );
    let want = (p.sin() * d.sin() + p.cos() * d.cos() * h.cos()).asin();
    let pose = Pose::Equatorial {
        hour_angle_rad: h as f32,
        declination_rad: d as f32,
        pier_side: PierSide::TubeWest,
    };
    let (_, alt) = m.tube_horizontal(pose).unwrap();
    close(alt, want, "altitude");
}

/// Centre-of-gravity height from a lift by angle and a tilt-to-unload test
/// (the hand-worked tripod of `weighing.rs`: 0.9 m), under both back ends;
/// the lift by a height goes through no trigonometric call and moves less.
#[test]
fn weighed_height_within_backend_tolerance() {
    use standfast::weighing::{centre_from_weighing, Lift, LiftGeometry, TipTest, Weighing};
    let s = Support::tripod(0.5, 0.0).unwrap();
    let level = [65.3777, 65.3777, 65.3777];
    let by_angle = Weighing {
        level_n: &level,
        reading_uncertainty_n: 0.01,
        lift: Some(Lift {
            geometry: LiftGeometry::Angle {
                raised_toward_rad: deg_to_rad(270.0),
                angle_rad: deg_to_rad(10.0),
                angle_uncertainty_rad: deg_to_rad(0.1),
            },
            loads_n: &[65.3777, 101.3179, 29.4374],
        }),
        tip: Some(TipTest {
            edge_feet: [1, 2],
            angle_rad: deg_to_rad(15.5241),
            angle_uncertainty_rad: deg_to_rad(0.2),
        }),
    };
    let m = centre_from_weighing(&s, &by_angle).unwrap();
    close(
        m.height_from_lift_m.unwrap().value,
        0.9,
        "height from the lift",
    );
    close(
        m.height_from_tip_m.unwrap().value,
        0.9,
        "height from the tip",
    );
    let by_height = Weighing {
        lift: Some(Lift {
            geometry: LiftGeometry::Feet {
                lifted_mask: 0b100,
                height_m: 0.130_236,
                height_uncertainty_m: 0.001,
            },
            loads_n: &[86.1278, 86.1278, 23.8774],
        }),
        tip: None,
        ..by_angle
    };
    let m = centre_from_weighing(&s, &by_height).unwrap();
    close(
        m.height_m.unwrap().value,
        0.9,
        "height from a lift by height",
    );
}

/// The back end is the final binary's choice: turning the core's `micromath`
/// feature on (as this crate's `micromath` feature does, like any dependency
/// could) selects nothing by itself; only `--cfg standfast_fast_math` does.
#[test]
fn fast_math_only_when_the_binary_asks() {
    assert_eq!(standfast::math::FAST_MATH, cfg!(standfast_fast_math));
}

/// Without `--cfg standfast_fast_math`, the figures are bit for bit those of
/// the default build, whether or not a dependency turned `micromath` on
/// (`cargo test -p standfast-checks backends` and the same with
/// `--features micromath` both run this). The bits were recorded from the
/// default build (libm back end) on x86_64; the core's own sine, cosine and
/// hypotenuse routines and libm's correctly rounded square root give the same
/// bits on every target.
#[test]
fn no_result_moves_unless_the_binary_asks() {
    if standfast::math::FAST_MATH {
        return;
    }
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let c = Conditions {
        wind_speed_mps: 5.0,
        ..Conditions::calm(altaz(30.0, 0.0))
    };
    let tip = rig.stability_figures(&c).unwrap().tip_wind_mps.unwrap();
    let rho = Air::isa_at_elevation(3000.0).unwrap().density_kg_per_m3();
    let m = MountGeometry {
        kind: MountKind::Equatorial,
        latitude_rad: deg_to_rad(52.0),
        axis_origin_m: [0.0, 0.0, 1.0],
    };
    let (az, alt) = m
        .tube_horizontal(Pose::Equatorial {
            hour_angle_rad: deg_to_rad(30.0),
            declination_rad: deg_to_rad(20.0),
            pier_side: PierSide::TubeWest,
        })
        .unwrap();
    let got = [tip.to_bits(), rho.to_bits(), az.to_bits(), alt.to_bits()];
    assert_eq!(got, GOLDEN_BITS);
}

/// Tip wind (m/s), ISA density at 3000 m (kg/m³), tube azimuth and altitude
/// (rad), as `f32` bits.
const GOLDEN_BITS: [u32; 4] = [0x41af_6b1c, 0x3f68_bc3b, 0x407e_1b56, 0x3f61_3329];
