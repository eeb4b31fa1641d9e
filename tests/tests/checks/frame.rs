//! Rig-frame conventions.

use standfast::frame::{azimuth_of, azimuth_unit};

/// Azimuth convention, clockwise from north (common practice, no source).
#[test]
fn azimuth_east_is_quarter_turn() {
    let v = azimuth_unit(core::f32::consts::FRAC_PI_2);
    approx::assert_abs_diff_eq!(v.x, 1.0, epsilon = 1e-6);
    approx::assert_abs_diff_eq!(azimuth_of(v), core::f32::consts::FRAC_PI_2, epsilon = 1e-6);
}
