//! The invented rig both core benches use (`sky.rs`, `guard.rs`).

use standfast::drive::{DriveRating, Drives};
use standfast::math::deg_to_rad;
use standfast::mount::MountGeometry;
use standfast::rig::{BodySpec, CounterweightSpec, LegsSpec, Rig, RigSpec, ShaftSpec, Stage};
use standfast::support::Support;

/// An invented rig: tripod with legs, 9 kg tube, mount head, two
/// counterweights, a shaft and drives.
pub fn rig() -> Rig {
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
