//! Small rigs for the checks. Invented, except where a check says otherwise.

use standfast::math::deg_to_rad;
use standfast::mount::{MountGeometry, MountKind, Pose};
use standfast::rig::{BodySpec, RigSpec, Stage};
use standfast::shape::{Exposure, Shape};
use standfast::support::{Foot, Support};

/// Feet of a support as a heapless list.
pub fn feet_of(s: &Support) -> standfast::bounded::Vec<Foot, 8> {
    s.feet_list()
}

/// A rig with no mount parts: one ground body of `mass_kg` with its centre of
/// gravity at `cg_m`, and a vertical cylinder catching the wind with a given
/// drag area `cd_a_m2` centred at height `h_m` above the origin.
pub fn post_rig(
    support: &Support,
    mass_kg: f32,
    cg_m: [f32; 3],
    cd_a_m2: f32,
    h_m: f32,
    mu: f32,
) -> RigSpec {
    // Cylinder 0.25 m across and 0.74 m long; its drag coefficient is set so
    // that Cd·A equals the requested drag area whatever the wind direction.
    let (d, l) = (0.25_f32, 0.74_f32);
    let mut bodies = standfast::bounded::Vec::new();
    let _ = bodies.push(BodySpec {
        label: standfast::bounded::String::try_from("post").unwrap(),
        stage: Stage::Ground,
        mass_kg,
        cg_m,
        exposure: Some(Exposure {
            shape: Shape::Cylinder {
                diameter_m: d,
                length_m: l,
                axis: [0.0, 0.0, 1.0],
            },
            centre_m: [0.0, 0.0, h_m],
            drag_coefficient: Some(cd_a_m2 / (d * l)),
            end_drag_coefficient: None,
        }),
        ..BodySpec::default()
    });
    RigSpec {
        feet: feet_of(support),
        legs: None,
        friction_coefficient: mu,
        mount: MountGeometry {
            kind: MountKind::AltAzimuth,
            latitude_rad: deg_to_rad(45.0),
            axis_origin_m: [0.0, 0.0, 1.0],
        },
        bodies,
        counterweights: standfast::bounded::Vec::new(),
        shaft: None,
        cover: None,
        ballast: standfast::bounded::Vec::new(),
        drives: None,
    }
}

/// An alt-azimuth pose.
pub fn altaz(az_deg: f32, alt_deg: f32) -> Pose {
    Pose::Horizontal {
        azimuth_rad: deg_to_rad(az_deg),
        altitude_rad: deg_to_rad(alt_deg),
        pier_side: Default::default(),
    }
}
