//! Drives `weighing::centre_from_weighing` and `Rig::with_measured_centre`
//! with arbitrary feet, readings (any float: NaN, infinities, negatives),
//! lift geometries, tip tests and uncertainties. A panic is a crash; so is
//! an `Ok` result with a non-finite figure, a negative uncertainty or a
//! negative mass.

#![no_main]

use arbitrary::Arbitrary;
use libfuzzer_sys::fuzz_target;
use standfast::support::{Foot, Support};
use standfast::weighing::{centre_from_weighing, Lift, LiftGeometry, TipTest, Weighing};

#[derive(Arbitrary, Debug)]
enum GeometryIn {
    Feet(u8, f32, f32),
    Angle(f32, f32, f32),
}

#[derive(Arbitrary, Debug)]
struct Input {
    feet: Vec<(f32, f32)>,
    tripod: Option<(f32, f32)>,
    level: Vec<f32>,
    lifted: Vec<f32>,
    uncertainty_n: f32,
    lift: Option<GeometryIn>,
    tip: Option<(u8, u8, f32, f32)>,
}

fn finite(e: standfast::weighing::Estimate) -> bool {
    e.value.is_finite() && e.uncertainty.is_finite() && e.uncertainty >= 0.0
}

fuzz_target!(|inp: Input| {
    let support = match inp.tripod {
        Some((r, az)) => Support::tripod(r, az),
        None => {
            let feet: Vec<Foot> = inp
                .feet
                .iter()
                .take(9)
                .map(|&(x, y)| Foot {
                    position_m: [x, y],
                    tie_down_n: 0.0,
                })
                .collect();
            Support::new(&feet)
        }
    };
    let Ok(support) = support else { return };
    let lift = inp.lift.map(|g| Lift {
        geometry: match g {
            GeometryIn::Feet(mask, h, u) => LiftGeometry::Feet {
                lifted_mask: mask,
                height_m: h,
                height_uncertainty_m: u,
            },
            GeometryIn::Angle(az, a, u) => LiftGeometry::Angle {
                raised_toward_rad: az,
                angle_rad: a,
                angle_uncertainty_rad: u,
            },
        },
        loads_n: &inp.lifted,
    });
    let w = Weighing {
        level_n: &inp.level,
        reading_uncertainty_n: inp.uncertainty_n,
        lift,
        tip: inp.tip.map(|(a, b, angle, u)| TipTest {
            edge_feet: [a, b],
            angle_rad: angle,
            angle_uncertainty_rad: u,
        }),
    };
    if let Ok(m) = centre_from_weighing(&support, &w) {
        assert!(finite(m.mass_kg) && m.mass_kg.value > 0.0, "{m:?}");
        assert!(finite(m.x_m) && finite(m.y_m), "{m:?}");
        for h in [m.height_from_lift_m, m.height_from_tip_m, m.height_m]
            .into_iter()
            .flatten()
        {
            assert!(finite(h), "{m:?}");
        }
    }
});
