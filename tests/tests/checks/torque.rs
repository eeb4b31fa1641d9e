//! Axis torque, inertia, drive utilisation, balance, sky scan, payload
//! envelope and park pose, against statics and dynamics references.
//!
//! Gravity torques about the mount's axes are derived from the vector
//! moment of a force about an axis, τ = (r × W)·â, in the equatorial frame
//! (Beer & Johnston, *Vector Mechanics for Engineers: Statics*, ch. 3,
//! chapter number from memory), with the pointing vectors of spherical
//! astronomy (Smart, *Textbook on Spherical Astronomy*; Meeus, *Astronomical
//! Algorithms*; from memory). They are not from a published table.

use approx::{assert_abs_diff_eq, assert_relative_eq};
use standfast::air::Air;
use standfast::bounded::Vec as HVec;
use standfast::drive::{DriveRating, Drives};
use standfast::frame::Tilt;
use standfast::math::{deg_to_rad, STANDARD_GRAVITY_MPS2 as G};
use standfast::mount::{MountGeometry, MountKind, PierSide, Pose};
use standfast::rig::{
    BodySpec, Conditions, CounterweightSpec, MassModel, Rig, RigSpec, ShaftSpec, Stage,
};
use standfast::shape::{Exposure, Shape};
use standfast::sky::{direction_rad, ParkRequest, PayloadOffset, SkyGrid, SkyScan};
use standfast::support::Support;
use standfast::torque::{
    parallel_axis_kg_m2, solid_cylinder_inertia_kg_m2, thin_tube_inertia_kg_m2, PayloadPick,
};

fn base(kind: MountKind, lat_deg: f32) -> RigSpec {
    let support = Support::tripod(0.6, 0.0).unwrap();
    RigSpec {
        feet: support.feet().iter().copied().collect(),
        legs: None,
        friction_coefficient: 0.5,
        mount: MountGeometry {
            kind,
            latitude_rad: deg_to_rad(lat_deg),
            axis_origin_m: [0.0, 0.0, 1.3],
        },
        bodies: HVec::new(),
        counterweights: HVec::new(),
        shaft: None,
        cover: None,
        ballast: HVec::new(),
        drives: None,
    }
}

fn point(stage: Stage, mass_kg: f32, cg_m: [f32; 3]) -> BodySpec {
    BodySpec {
        stage,
        mass_kg,
        cg_m,
        mass_model: MassModel::Point,
        ..BodySpec::default()
    }
}

fn tube(mass_kg: f32, cg_m: [f32; 3], model: MassModel) -> BodySpec {
    BodySpec::optical_tube(mass_kg, 0.2, 0.8, cg_m).with_mass_model(model)
}

fn disc(mass_kg: f32, distance_m: f32) -> CounterweightSpec {
    CounterweightSpec::disc(mass_kg, distance_m, 0.1, 0.05)
}

fn drives(rated: f32, alpha: f32) -> Drives {
    let r = DriveRating {
        rated_nm: rated,
        repeated_peak_nm: 2.0 * rated,
        momentary_peak_nm: 4.0 * rated,
    };
    Drives {
        primary: r,
        secondary: r,
        slew_acceleration_rad_per_s2: alpha,
    }
}

/// An invented German-equatorial rig at 48° N: 8 kg tube off-centre, two
/// counterweights, a shaft, drives of 12 N·m rated.
fn typical_gem() -> RigSpec {
    let mut s = base(MountKind::Equatorial, 48.0);
    s.bodies
        .push(tube(8.0, [0.22, 0.06, 0.0], MassModel::Shell))
        .unwrap();
    s.bodies
        .push(point(Stage::Primary, 6.0, [0.0, 0.0, -0.12]))
        .unwrap();
    s.counterweights.push(disc(4.0, 0.28)).unwrap();
    s.counterweights.push(disc(3.0, 0.33)).unwrap();
    s.shaft = Some(ShaftSpec {
        mass_kg: 0.8,
        length_m: 0.45,
        diameter_m: 0.02,
    });
    s.drives = Some(drives(12.0, 0.3));
    s
}

fn eq(h_hours: f32, dec_deg: f32) -> Pose {
    Pose::Equatorial {
        hour_angle_rad: deg_to_rad(15.0 * h_hours),
        declination_rad: deg_to_rad(dec_deg),
        pier_side: PierSide::TubeEast,
    }
}

fn gravity(rig: &Rig, pose: Pose) -> [f32; 2] {
    let t = rig.axis_terms(pose, Tilt::LEVEL, false, 0.0).unwrap();
    [t[0].gravity_nm, t[1].gravity_nm]
}

fn inertia(rig: &Rig, pose: Pose) -> [f32; 2] {
    let t = rig.axis_terms(pose, Tilt::LEVEL, false, 0.0).unwrap();
    [t[0].inertia_kg_m2, t[1].inertia_kg_m2]
}

/// Poses spread over both axes' full turns (a fixed sweep, not random).
fn sweep() -> impl Iterator<Item = Pose> {
    (0..13).flat_map(|i| {
        (0..9).map(move |j| Pose::Axes {
            primary_rad: -3.0 + 0.5 * i as f32,
            secondary_rad: -2.0 + 0.5 * j as f32,
        })
    })
}

/// Classic poses: with the counterweight shaft horizontal (θ₁ = 0, the
/// secondary axis pointing east) a mass m at a along the secondary axis loads
/// the polar axis with the full moment m·g·cos φ·a; with the shaft hanging
/// (home pose) the moment is zero. Statics of a moment about an inclined axis
/// (Beer & Johnston, *Statics*, ch. 3; derived).
#[test]
fn point_mass_classic_poses() {
    for lat in [30.0_f32, 45.0, 60.0] {
        let mut s = base(MountKind::Equatorial, lat);
        s.bodies
            .push(point(Stage::Secondary, 10.0, [0.2, 0.0, 0.0]))
            .unwrap();
        let rig = Rig::new(&s).unwrap();
        let full = 10.0 * G * deg_to_rad(lat).cos() * 0.2;
        let level = Pose::Axes {
            primary_rad: 0.0,
            secondary_rad: 0.4,
        };
        assert_relative_eq!(gravity(&rig, level)[0], full, max_relative = 1e-5);
        let hanging = rig.mount().home_pose();
        assert_abs_diff_eq!(gravity(&rig, hanging)[0], 0.0, epsilon = 1e-5);
        // A counterweight of 5 kg at 0.4 m on the other side turns the other
        // way: −M·g·cos φ·L (the same statics, derived).
        let mut c = base(MountKind::Equatorial, lat);
        c.counterweights.push(disc(5.0, 0.4)).unwrap();
        let rig = Rig::new(&c).unwrap();
        let cw = -5.0 * G * deg_to_rad(lat).cos() * 0.4;
        assert_relative_eq!(gravity(&rig, level)[0], cw, max_relative = 1e-5);
        assert_abs_diff_eq!(gravity(&rig, hanging)[0], 0.0, epsilon = 1e-5);
    }
}

/// τ_RA check table, worked by hand from the vector moment about the polar
/// axis (derived, not a published table): m, φ, H, δ, (a, b, c) → τ_RA.
#[test]
fn ra_torque_hand_worked_table() {
    let cases: [(f32, f32, f32, f32, [f32; 3], f32); 6] = [
        (10.0, 45.0, 0.0, 0.0, [0.2, 0.0, 0.0], 13.8687),
        (10.0, 45.0, 3.0, 30.0, [0.2, 0.0, 0.0], 9.8067),
        (10.0, 45.0, 6.0, 0.0, [0.0, 0.1, 0.0], -6.9343),
        (5.0, 52.0, -2.0, 60.0, [0.05, 0.03, 0.02], 1.2721),
        (10.0, 0.0, 0.0, 0.0, [0.2, 0.0, 0.0], 19.6133),
        (10.0, 90.0, 0.0, 0.0, [0.2, 0.0, 0.0], 0.0),
    ];
    for (m, lat, h, dec, abc, want) in cases {
        let mut s = base(MountKind::Equatorial, lat);
        s.bodies.push(point(Stage::Secondary, m, abc)).unwrap();
        let rig = Rig::new(&s).unwrap();
        let got = gravity(&rig, eq(h, dec))[0];
        assert_abs_diff_eq!(got, want, epsilon = 2e-4);
    }
}

/// Closed forms derived from the same statics, evaluated independently of the model over
/// a sweep of poses: τ_RA = m·g·cos φ·(a cos H − b cos δ sin H + c sin δ sin H)
/// and τ_Dec = m·g·[b(sin φ cos δ − cos φ sin δ cos H)
/// − c(sin φ sin δ + cos φ cos δ cos H)]; and the single check
/// τ_Dec = 0.6934 N·m for 2 kg at b = 0.05 m, φ = 45°, H = 0, δ = 0.
#[test]
fn dec_torque_and_closed_forms() {
    let mut s = base(MountKind::Equatorial, 45.0);
    s.bodies
        .push(point(Stage::Secondary, 2.0, [0.0, 0.05, 0.0]))
        .unwrap();
    let rig = Rig::new(&s).unwrap();
    assert_abs_diff_eq!(gravity(&rig, eq(0.0, 0.0))[1], 0.6934, epsilon = 1e-4);

    let (m, lat, [a, b, c]) = (3.0_f32, 37.0_f32, [0.07_f32, -0.04_f32, 0.03_f32]);
    let mut s = base(MountKind::Equatorial, lat);
    s.bodies
        .push(point(Stage::Secondary, m, [a, b, c]))
        .unwrap();
    let rig = Rig::new(&s).unwrap();
    let (sp, cp) = (deg_to_rad(lat).sin(), deg_to_rad(lat).cos());
    for hh in [-10.0_f32, -5.0, -1.5, 0.0, 2.0, 4.5, 9.0] {
        for dec in [-80.0_f32, -30.0, 0.0, 25.0, 70.0] {
            let (sh, ch) = (deg_to_rad(15.0 * hh).sin(), deg_to_rad(15.0 * hh).cos());
            let (sd, cd) = (deg_to_rad(dec).sin(), deg_to_rad(dec).cos());
            let ra = m * G * cp * (a * ch - b * cd * sh + c * sd * sh);
            let de = m * G * (b * (sp * cd - cp * sd * ch) - c * (sp * sd + cp * cd * ch));
            let [t1, t2] = gravity(&rig, eq(hh, dec));
            assert_abs_diff_eq!(t1, ra, epsilon = 2e-5);
            assert_abs_diff_eq!(t2, de, epsilon = 2e-5);
        }
    }
}

/// Parallel-axis theorem on a textbook case: solid cylinder m = 5 kg,
/// R = 0.1 m, L = 0.8 m: I about a transverse centroidal axis
/// m(3R² + L²)/12 = 0.27917 kg·m², shifted by d = 0.3 m: I + m·d² =
/// 0.72917 kg·m². Formulas: table of mass moments of inertia of common
/// homogeneous solids and the parallel-axis theorem, Meriam & Kraige,
/// *Engineering Mechanics: Dynamics*, Appendix B and Table D/4 (section
/// numbers from memory); the numbers worked by hand here.
#[test]
fn parallel_axis_textbook_cylinder() {
    let [axial, transverse] = solid_cylinder_inertia_kg_m2(5.0, 0.1, 0.8);
    assert_relative_eq!(axial, 0.025, max_relative = 1e-5);
    assert_relative_eq!(transverse, 0.279_17, max_relative = 2e-5);
    assert_relative_eq!(
        parallel_axis_kg_m2(transverse, 5.0, 0.3),
        0.729_17,
        max_relative = 2e-5
    );
    // The same through a rig: the cylinder along the tube with its centre
    // 0.3 m up the tube, about the secondary axis (transverse to it).
    let mut s = base(MountKind::Equatorial, 45.0);
    let mut body = tube(5.0, [0.0, 0.3, 0.0], MassModel::Solid);
    body.exposure = Some(Exposure {
        shape: Shape::Cylinder {
            diameter_m: 0.2,
            length_m: 0.8,
            axis: [0.0, 1.0, 0.0],
        },
        centre_m: [0.0, 0.3, 0.0],
        drag_coefficient: None,
        end_drag_coefficient: None,
    });
    s.bodies.push(body).unwrap();
    let rig = Rig::new(&s).unwrap();
    for pose in sweep() {
        assert_relative_eq!(inertia(&rig, pose)[1], 0.729_17, max_relative = 2e-5);
    }
    // Thin-walled tube, transverse: m(6R² + L²)/12 = 0.29167 kg·m² (the
    // thin-wall limit r → R of the thick tube's m(3(R² + r²) + L²)/12,
    // Meriam & Kraige App. B; derived).
    assert_relative_eq!(
        thin_tube_inertia_kg_m2(5.0, 0.1, 0.8)[1],
        0.291_67,
        max_relative = 2e-5
    );
}

/// Inertia examples worked by hand (parallel-axis theorem and the rotation
/// of the tube's principal inertias, Meriam & Kraige, *Dynamics*, App. B;
/// derived): the
/// solid cylinder above at δ = 30°, a = 0.25 m, b = 0.05 m has
/// I_RA = I_a sin²δ + I_t cos²δ + m[a² + (b cos δ)²] = 0.5375 kg·m² and
/// I_Dec = I_t + m·b² = 0.29167 kg·m²; a 5 kg counterweight disc
/// (R = 0.05 m, h = 0.05 m) at L = 0.3 m has I_RA = m(3R² + h²)/12 + mL² =
/// 0.45417 kg·m².
#[test]
fn inertia_hand_worked_examples() {
    let mut s = base(MountKind::Equatorial, 40.0);
    s.bodies
        .push(tube(5.0, [0.25, 0.05, 0.0], MassModel::Solid))
        .unwrap();
    let rig = Rig::new(&s).unwrap();
    for h in [-4.0_f32, 0.0, 2.5] {
        let [i1, i2] = inertia(&rig, eq(h, 30.0));
        assert_relative_eq!(i1, 0.5375, max_relative = 2e-5);
        assert_relative_eq!(i2, 0.291_67, max_relative = 2e-5);
    }
    let mut c = base(MountKind::Equatorial, 40.0);
    c.counterweights.push(disc(5.0, 0.3)).unwrap();
    let rig = Rig::new(&c).unwrap();
    assert_relative_eq!(
        inertia(&rig, eq(1.0, 10.0))[0],
        0.454_17,
        max_relative = 2e-5
    );
    assert_abs_diff_eq!(inertia(&rig, eq(1.0, 10.0))[1], 0.0);
}

/// Property: a body whose centre of gravity and centre of pressure lie on an
/// axis exerts no torque about it, by gravity or by wind, in any pose
/// (r ∥ â makes (r × F)·â vanish).
#[test]
fn body_on_the_axis_exerts_no_torque() {
    for kind in [MountKind::Equatorial, MountKind::AltAzimuth] {
        let mut s = base(kind, 35.0);
        // On the secondary axis, with a wind-catching shape.
        let mut on_s = tube(4.0, [0.3, 0.0, 0.0], MassModel::Solid);
        on_s.under_cover = false;
        s.bodies.push(on_s).unwrap();
        // On the primary axis, fixed to the primary stage.
        let mut on_k = point(Stage::Primary, 6.0, [0.0, 0.0, -0.2]);
        on_k.exposure = Some(Exposure {
            shape: Shape::Box {
                size_m: [0.15, 0.15, 0.2],
                edges: None,
            },
            centre_m: [0.0, 0.0, -0.2],
            drag_coefficient: None,
            end_drag_coefficient: None,
        });
        s.bodies.push(on_k).unwrap();
        let rig = Rig::new(&s).unwrap();
        for pose in sweep() {
            for d in 0..8 {
                let t = rig
                    .axis_terms(pose, Tilt::LEVEL, false, d as f32 * 0.8)
                    .unwrap();
                assert_abs_diff_eq!(t[1].gravity_nm, 0.0, epsilon = 1e-5);
                assert_abs_diff_eq!(t[1].wind_nm_per_pa, 0.0, epsilon = 1e-6);
            }
        }
        // The primary-stage body alone: no torque about the primary axis.
        let mut p = base(kind, 35.0);
        p.bodies.push(s.bodies[1].clone()).unwrap();
        let rig = Rig::new(&p).unwrap();
        for pose in sweep() {
            let t = rig.axis_terms(pose, Tilt::LEVEL, false, 1.0).unwrap();
            assert_abs_diff_eq!(t[0].gravity_nm, 0.0, epsilon = 1e-5);
            assert_abs_diff_eq!(t[0].wind_nm_per_pa, 0.0, epsilon = 1e-6);
        }
    }
}

/// Wind torque and utilisation by hand: alt-azimuth mount, tube (solid
/// cylinder 4 kg, d = 0.2 m, L = 1 m, C_d set to 1.0) along the tube with its
/// centre 0.3 m up the tube, pointing north and level; wind from the east.
/// Force q·C_d·d·L westward at 0.3 m north of the axis: torque about the
/// vertical axis +0.3·0.2·q = 0.06·q N·m (r × F), none about the altitude
/// axis. q = ½ρV² with ρ = 1.225 kg/m³ (ISO 2533 sea level). Inertia about the
/// vertical: m(3R² + L²)/12 + m·0.3² = 0.70333 kg·m² (textbook cylinder and
/// parallel-axis theorem, as above).
#[test]
fn wind_torque_and_utilisation_by_hand() {
    let mut s = base(MountKind::AltAzimuth, 45.0);
    let mut t = tube(4.0, [0.0, 0.3, 0.0], MassModel::Solid);
    t.exposure = Some(Exposure {
        shape: Shape::Cylinder {
            diameter_m: 0.2,
            length_m: 1.0,
            axis: [0.0, 1.0, 0.0],
        },
        centre_m: [0.0, 0.3, 0.0],
        drag_coefficient: Some(1.0),
        end_drag_coefficient: None,
    });
    s.bodies.push(t).unwrap();
    s.drives = Some(Drives {
        primary: DriveRating {
            rated_nm: 5.0,
            repeated_peak_nm: 10.0,
            momentary_peak_nm: 20.0,
        },
        secondary: DriveRating {
            rated_nm: 5.0,
            repeated_peak_nm: 10.0,
            momentary_peak_nm: 20.0,
        },
        slew_acceleration_rad_per_s2: 0.5,
    });
    let rig = Rig::new(&s).unwrap();
    let c = Conditions {
        wind_speed_mps: 10.0,
        wind_from_rad: deg_to_rad(90.0),
        ..Conditions::calm(Pose::Horizontal {
            azimuth_rad: 0.0,
            altitude_rad: 0.0,
            pier_side: PierSide::TubeEast,
        })
    };
    let l = rig.axis_loads(&c, 8.0).unwrap();
    let (q_gust, q_mean) = (0.5 * 1.225 * 100.0, 0.5 * 1.225 * 64.0);
    assert_relative_eq!(l.gust_pressure_pa, q_gust, max_relative = 1e-5);
    let p = l.primary;
    assert_abs_diff_eq!(p.gravity_nm, 0.0, epsilon = 1e-5);
    assert_relative_eq!(p.wind_gust_nm, 0.06 * q_gust, max_relative = 1e-4);
    assert_relative_eq!(p.steady_nm, 0.06 * q_mean, max_relative = 1e-4);
    let i = 4.0 * (0.03 + 1.0) / 12.0 + 4.0 * 0.09;
    assert_relative_eq!(p.inertia_kg_m2, i, max_relative = 1e-5);
    assert_relative_eq!(p.inertial_nm, 0.5 * i, max_relative = 1e-5);
    let u = p.utilisation.unwrap();
    assert_relative_eq!(u.rated, 0.06 * q_mean / 5.0, max_relative = 1e-4);
    assert_relative_eq!(
        u.repeated_peak,
        (0.06 * q_mean + 0.5 * i) / 10.0,
        max_relative = 1e-4
    );
    assert_relative_eq!(
        u.momentary_peak,
        (0.06 * q_gust + 0.5 * i) / 20.0,
        max_relative = 1e-4
    );
    assert_abs_diff_eq!(l.secondary.wind_gust_nm, 0.0, epsilon = 1e-5);
    // The tube's weight 0.3 m out along a level tube: m·g·0.3 about the
    // altitude axis s = ẑ × north = west, r × W = (0.3 ŷ) × (−mg ẑ) = −0.3mg x̂.
    assert_relative_eq!(l.secondary.gravity_nm, 0.3 * 4.0 * G, max_relative = 1e-5);
    // Mean above gust is refused.
    assert!(rig.axis_loads(&c, 11.0).is_err());
}

/// Balance: Σ m·a = Σ M_cw·L (moment balance about the polar axis, Beer &
/// Johnston ch. 3; derived) sets the counterweight shift;
/// property: after balancing both axes the gravity torque vanishes at every
/// pose, on both axes.
#[test]
fn balance_nulls_gravity_torque_everywhere() {
    let spec = typical_gem();
    let rig = Rig::new(&spec).unwrap();
    let b = rig.balance(PayloadPick::UnderCover).unwrap();
    // Payload side: 8 kg at a = 0.22; counterweights 4·0.28 + 3·0.33; shaft
    // 0.8 kg with its centre at 0.225 m.
    let m_s = 8.0 * 0.22 - 4.0 * 0.28 - 3.0 * 0.33 - 0.8 * 0.225;
    assert_relative_eq!(b.primary_moment_kg_m, m_s, max_relative = 1e-5);
    assert_relative_eq!(
        b.counterweight_shift_m.unwrap(),
        m_s / 7.0,
        max_relative = 1e-5
    );
    assert_relative_eq!(
        b.primary_unbalance_nm,
        G * deg_to_rad(48.0).cos() * m_s,
        max_relative = 1e-5
    );
    assert_relative_eq!(b.payload_slide_m, -0.06, max_relative = 1e-5);
    assert_abs_diff_eq!(b.secondary_residual_nm, 0.0);
    // Counterweights at the end of the shaft: the outer weight's outer face
    // from 0.33 + 0.025 m to 0.45 m, a shift of 0.095 m.
    let end = G * deg_to_rad(48.0).cos() * (m_s - 7.0 * 0.095);
    assert_relative_eq!(
        b.residual_at_shaft_end_nm.unwrap(),
        end,
        max_relative = 1e-4
    );

    let balanced = Rig::new(&b.balanced_spec(&spec).unwrap()).unwrap();
    let again = balanced.balance(PayloadPick::UnderCover).unwrap();
    assert_abs_diff_eq!(again.primary_moment_kg_m, 0.0, epsilon = 1e-5);
    for pose in sweep() {
        let [t1, t2] = gravity(&balanced, pose);
        assert_abs_diff_eq!(t1, 0.0, epsilon = 1e-4);
        assert_abs_diff_eq!(t2, 0.0, epsilon = 1e-4);
    }
    // Before balancing it did not vanish.
    assert!(sweep().any(|p| gravity(&rig, p)[0].abs() > 0.1));
}

/// Property: the sky-scan maximum is never below the value at any sampled
/// pose and direction, on either axis, and its tip wind never above the tip
/// wind of any sampled pose and direction.
#[test]
fn sky_scan_maximum_bounds_every_sample() {
    let rig = Rig::new(&typical_gem()).unwrap();
    let scan = SkyScan {
        grid: SkyGrid::with_step(deg_to_rad(30.0), deg_to_rad(10.0)),
        wind_directions: 8,
        wind_speed_mps: 6.0,
        air: Air::default(),
        tilt: Tilt::LEVEL,
    };
    let worst = rig.sky_scan(&scan).unwrap();
    assert!(worst.poses_checked > 20);
    let tip = worst.tip.tip_wind_mps.unwrap();
    let mut n = 0;
    for pose in scan.grid.poses(rig.mount()) {
        n += 1;
        let (_, alt) = rig.mount().tube_horizontal(pose).unwrap();
        assert!(alt >= deg_to_rad(10.0) - 1e-4);
        for k in 0..scan.wind_directions {
            let c = Conditions {
                wind_speed_mps: 6.0,
                wind_from_rad: direction_rad(k, scan.wind_directions),
                ..Conditions::calm(pose)
            };
            let l = rig.axis_loads(&c, 6.0).unwrap();
            assert!(l.primary.steady_nm.abs() <= worst.primary.steady_nm.abs() + 1e-4);
            assert!(l.secondary.steady_nm.abs() <= worst.secondary.steady_nm.abs() + 1e-4);
            assert!(l.primary.inertia_kg_m2 <= worst.max_inertia_kg_m2[0] + 1e-6);
            if let Some(v) = rig.stability_figures(&c).unwrap().tip_wind_mps {
                assert!(tip <= v + 1e-3);
            }
        }
    }
    assert_eq!(n, worst.poses_checked);
    let u = worst.primary.rated_utilisation.unwrap();
    assert_relative_eq!(u, worst.primary.steady_nm.abs() / 12.0, max_relative = 1e-5);
}

/// Payload envelope by hand. A point payload at a = 0.25 m on the secondary
/// axis of a mount at φ = 40°: the polar-axis gravity torque peaks at
/// m·g·cos φ·a (shaft horizontal; the statics above, derived) and the inertia about the
/// polar axis is m·a². Without counterweights the heaviest payload is
/// min(T_rated / (g cos φ a), T_rep / (g cos φ a + a² α)). With a 5 kg
/// counterweight at 0.3 m (α = 0, so only the rated torque binds)
/// |m·a − M·L|·g·cos φ ≤ T_rated gives the mass range
/// (M·L ± T_rated/(g cos φ))/a.
#[test]
fn payload_envelope_by_hand() {
    let (lat, a, rated) = (40.0_f32, 0.25_f32, 6.0_f32);
    let gc = G * deg_to_rad(lat).cos();
    let mut s = base(MountKind::Equatorial, lat);
    s.bodies
        .push(point(Stage::Secondary, 3.0, [0.1, 0.1, 0.0]))
        .unwrap();
    s.drives = Some(drives(rated, 2.0));
    let rig = Rig::new(&s).unwrap();
    let grid = SkyGrid::with_step(deg_to_rad(15.0), deg_to_rad(-90.0));
    let offsets = [PayloadOffset {
        along_secondary_axis_m: a,
        along_tube_m: 0.0,
    }];
    let rows = rig
        .payload_envelope(&grid, PayloadPick::UnderCover, &offsets)
        .unwrap();
    let r = rows[0].without_counterweights.unwrap();
    let want = (rated / (gc * a)).min(2.0 * rated / (gc * a + a * a * 2.0));
    assert_relative_eq!(r.heaviest_kg, want, max_relative = 1e-4);
    assert_abs_diff_eq!(r.lightest_kg, 0.0);
    assert!(!r.capped);

    let mut c = s.clone();
    c.counterweights
        .push(CounterweightSpec {
            mass_kg: 5.0,
            distance_m: 0.3,
            diameter_m: 0.01,
            thickness_m: 0.002,
            drag_coefficient: None,
        })
        .unwrap();
    c.drives = Some(drives(rated, 0.0));
    let rig = Rig::new(&c).unwrap();
    let rows = rig
        .payload_envelope(&grid, PayloadPick::Body(0), &offsets)
        .unwrap();
    let w = rows[0].with_counterweights.unwrap();
    assert_relative_eq!(w.heaviest_kg, (1.5 + rated / gc) / a, max_relative = 1e-4);
    assert_relative_eq!(w.lightest_kg, (1.5 - rated / gc) / a, max_relative = 1e-4);
    let wo = rows[0].without_counterweights.unwrap();
    assert_relative_eq!(wo.heaviest_kg, rated / (gc * a), max_relative = 1e-4);
}

/// Park pose: the choice is the lowest score among all candidates (checked
/// against each candidate re-evaluated), the gain is home − best, and for a
/// wind across the tube at home the best pose turns the tube more end-on to
/// the wind (common practice, no source).
#[test]
fn safest_park_is_the_minimum() {
    let rig = Rig::new(&typical_gem()).unwrap();
    let req = ParkRequest {
        wind_from_rad: deg_to_rad(90.0),
        wind_speed_mps: 25.0,
        air: Air::default(),
        tilt: Tilt::LEVEL,
        cover_fitted: false,
        scan: Some(SkyGrid::with_step(deg_to_rad(30.0), deg_to_rad(-10.0))),
    };
    let extra = [eq(0.0, 0.0), eq(6.0, 0.0)];
    let choice = rig.safest_park(&req, &extra).unwrap();
    let mut n = 1;
    for p in extra
        .iter()
        .copied()
        .chain(req.scan.unwrap().poses(rig.mount()))
    {
        n += 1;
        let c = rig.park_candidate(&req, p).unwrap();
        assert!(choice.best.score <= c.score + 1e-6);
    }
    assert_eq!(choice.candidates, n);
    assert_relative_eq!(choice.gain, choice.home.score - choice.best.score);
    assert!(choice.gain >= 0.0);
    let c = choice.best;
    assert!(c.score >= c.overturning_utilisation && c.score >= c.axis_utilisation[0]);
    let along = |pose: Pose| {
        let f = rig.mount().frames(pose).unwrap();
        f.tube().x.abs() // east-west component: along an east wind
    };
    assert!(along(choice.best.pose) >= along(choice.home.pose));
}
