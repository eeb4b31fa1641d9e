//! Small rigs for the checks. Invented, except where a check says otherwise.

use standfast::math::deg_to_rad;
use standfast::mount::{MountGeometry, Pose};
use standfast::rig::{BodySpec, RigSpec, Stage};
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
    let post = BodySpec::cylinder(
        Stage::Ground,
        mass_kg,
        [0.0, 0.0, h_m],
        d,
        l,
        [0.0, 0.0, 1.0],
    )
    .labelled("post")
    .with_cg_m(cg_m)
    .with_drag_coefficient(cd_a_m2 / (d * l));
    RigSpec::new(
        support,
        MountGeometry::alt_azimuth(deg_to_rad(45.0), [0.0, 0.0, 1.0]),
        mu,
    )
    .with_body(post)
    .unwrap()
}

/// An alt-azimuth pose.
pub fn altaz(az_deg: f32, alt_deg: f32) -> Pose {
    Pose::Horizontal {
        azimuth_rad: deg_to_rad(az_deg),
        altitude_rad: deg_to_rad(alt_deg),
        pier_side: Default::default(),
    }
}
