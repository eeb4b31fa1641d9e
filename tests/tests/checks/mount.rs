//! Mount kinematics against a reference implementation.

use approx::assert_abs_diff_eq;
use standfast::math::{deg_to_rad, rad_to_deg, wrap_pi};
use standfast::mount::{MountGeometry, MountKind, PierSide, Pose};

/// Tube direction for hour angle, declination and latitude, against the
/// SOFA/ERFA routine `eraHd2ae` as wrapped by pyerfa 2.0.1.5 (PyPI), frozen
/// here: (H°, δ°, φ°, azimuth° from north through east, altitude°).
const ERFA_HD2AE: [(f64, f64, f64, f64, f64); 7] = [
    (0.0, 0.0, 45.0, 180.000000, 45.000000),
    (30.0, 20.0, 52.0, 227.488211, 50.402354),
    (-45.0, 60.0, -33.0, 21.045237, -10.087761),
    (90.0, -10.0, 20.0, 260.591957, -3.404867),
    (150.0, 45.0, 60.0, 338.198591, 17.829544),
    (-120.0, -70.0, -45.0, 159.336670, 32.924993),
    (10.0, 89.0, 35.0, 359.785411, 35.984620),
];

#[test]
fn tube_direction_matches_erfa_hd2ae_on_both_pier_sides() {
    for row in ERFA_HD2AE {
        let (h, d, lat, az, alt) = (
            row.0 as f32,
            row.1 as f32,
            row.2 as f32,
            row.3 as f32,
            row.4 as f32,
        );
        for side in [PierSide::TubeEast, PierSide::TubeWest] {
            for kind in [MountKind::Equatorial, MountKind::AltAzimuth] {
                let m = MountGeometry {
                    kind,
                    latitude_rad: deg_to_rad(lat),
                    axis_origin_m: [0.0, 0.0, 1.0],
                };
                let pose = Pose::Equatorial {
                    hour_angle_rad: deg_to_rad(h),
                    declination_rad: deg_to_rad(d),
                    pier_side: side,
                };
                let (a, e) = m.tube_horizontal(pose).unwrap();
                assert_abs_diff_eq!(rad_to_deg(e), alt, epsilon = 2e-3);
                let daz = rad_to_deg(wrap_pi(a - deg_to_rad(az)));
                // Near the zenith azimuth is ill-conditioned; scale by cos(alt).
                assert_abs_diff_eq!(daz * deg_to_rad(alt).cos(), 0.0, epsilon = 3e-3);
            }
        }
    }
}
