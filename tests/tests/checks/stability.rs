//! Overturning and sliding against textbook statics, and invariances.

use crate::fixtures::{altaz, feet_of, post_rig};
use approx::{assert_abs_diff_eq, assert_relative_eq};
use standfast::air::Air;
use standfast::frame::Tilt;
use standfast::math::{deg_to_rad, STANDARD_GRAVITY_MPS2};
use standfast::rig::{Conditions, Rig};
use standfast::support::{Foot, Support};

fn wind(pose: standfast::mount::Pose, speed: f32, from_deg: f32) -> Conditions {
    Conditions {
        wind_speed_mps: speed,
        wind_from_rad: deg_to_rad(from_deg),
        ..Conditions::calm(pose)
    }
}

/// Tripod tipping by wind: a 40 kg rig, feet on a 0.5 m circle, wind force
/// centred 1.5 m up with Cd·A = 0.222 m². The resultant leaves the triangle when
/// F·H = W·ρ(θ), with ρ = r = R/2 for wind toward the middle of an edge and
/// ρ = R toward a foot. This is the block-tipping condition F·h = W·b/2 of
/// Beer & Johnston, *Vector Mechanics for Engineers: Statics*, ch. 8 (friction,
/// tipping versus sliding), applied to the triangle's inradius and
/// circumradius. F_tip = 65.38 N → q = 294.5 Pa → V = 21.9 m/s at ρ = 1.225.
#[test]
fn tripod_tip_wind_matches_hand_statics() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let pose = altaz(0.0, 0.0);
    // Wind from the north pushes south, toward the middle of the southern edge
    // (the first foot points north, upwind).
    let a = rig.stability_figures(&wind(pose, 10.0, 0.0)).unwrap();
    let w = 40.0 * STANDARD_GRAVITY_MPS2;
    let f_tip = w * 0.25 / 1.5;
    assert_relative_eq!(f_tip, 65.38, max_relative = 1e-3);
    let v = (2.0 * f_tip / 0.222 / 1.225_f32).sqrt();
    assert_relative_eq!(v, 21.9, max_relative = 2e-3);
    assert_relative_eq!(a.tip_wind_mps.unwrap(), v, max_relative = 1e-4);
    // Wind from the south pushes toward the north foot: arm R = 2r, so the tip
    // pressure doubles and the speed grows by √2.
    let b = rig.stability_figures(&wind(pose, 10.0, 180.0)).unwrap();
    assert_relative_eq!(
        b.tip_wind_mps.unwrap(),
        v * 2f32.sqrt(),
        max_relative = 1e-4
    );
    // The weakest direction over a full turn is an edge-normal one.
    let worst = rig.worst_wind(&wind(pose, 0.0, 0.0)).unwrap();
    assert_relative_eq!(worst.tip_wind_mps.unwrap(), v, max_relative = 1e-3);
    let k = (worst.from_rad.to_degrees() / 120.0).round() * 120.0;
    assert_abs_diff_eq!(worst.from_rad.to_degrees(), k, epsilon = 0.5);
    // Sliding needs μ·W = 196.1 N, three times the tipping force: tips first
    // because H = 1.5 m > r/μ = 0.5 m (same textbook criterion).
    assert!(a.slide_wind_mps.unwrap() > a.tip_wind_mps.unwrap());
}

/// Tipping versus sliding of a block: Mississippi State University, Virtual
/// Lab Statics Module (VLSM), friction example 3, after Beer & Johnston ch. 8:
/// W = 250 lb, base 32 in, push at h = 66 in, μs = 0.4. Tipping force
/// P = 250·16/66 = 60.6 lb, below the 100 lb friction limit: it tips first.
/// Example 1 of the same module: h = 60 in, P = 60 lb, μs = 0.3: at rest.
#[test]
fn block_tips_before_sliding_vlsm_examples() {
    let inch = 0.0254_f32;
    let lbf = 4.448_221_6_f32; // NIST SP 811: 1 lbf = 4.448 221 615 N
    let kg = 250.0 * lbf / STANDARD_GRAVITY_MPS2;
    let half = 16.0 * inch;
    let feet = [[half, half], [-half, half], [-half, -half], [half, -half]].map(|p| Foot {
        position_m: p,
        tie_down_n: 0.0,
    });
    let support = Support::new(&feet).unwrap();
    let cd_a = 0.1_f32;
    for (h_in, mu, p_lbf, tips, slides) in [
        (66.0, 0.4, 60.6, true, false),
        (60.0, 0.3, 60.0, false, false),
    ] {
        let spec = post_rig(&support, kg, [0.0, 0.0, 0.3], cd_a, h_in * inch, mu);
        let rig = Rig::new(&spec).unwrap();
        // Push east: wind from the west. P = q·Cd·A.
        let q = p_lbf * lbf / cd_a;
        let speed = Air::default().speed_for_pressure_mps(q);
        let a = rig
            .stability_figures(&wind(altaz(0.0, 0.0), speed, 270.0))
            .unwrap();
        assert_eq!(a.critical.utilisation >= 0.999, tips, "h = {h_in} in");
        assert_eq!(a.sliding.utilisation >= 1.0, slides, "h = {h_in} in");
        // Tipping force from the closed form W·(b/2)/h.
        let p_tip = 250.0 * 16.0 / h_in;
        let q_tip = p_tip * lbf / cd_a;
        assert_relative_eq!(
            a.tip_wind_mps.unwrap(),
            Air::default().speed_for_pressure_mps(q_tip),
            max_relative = 1e-4
        );
        // Sliding force μ·W.
        let q_slide = mu * 250.0 * lbf / cd_a;
        assert_relative_eq!(
            a.slide_wind_mps.unwrap(),
            Air::default().speed_for_pressure_mps(q_slide),
            max_relative = 1e-3
        );
    }
}

/// Inradius of an equilateral foot triangle of side L is L/(2√3) and half the
/// circumradius L/√3 (Euclid; any geometry handbook, e.g. the CRC Standard
/// Mathematical Tables, "regular polygons").
#[test]
fn equilateral_inradius() {
    for side in [0.6_f32, 0.866, 1.2] {
        let s = Support::tripod_from_spread(side, 0.7).unwrap();
        for e in s.edges() {
            assert_relative_eq!(
                e.inset_m(standfast::Vec3::ZERO),
                side / (2.0 * 3f32.sqrt()),
                max_relative = 1e-5
            );
        }
    }
}

/// Foot reactions of a three-foot support are statically determinate: with
/// the weight over the centroid each foot carries W/3; the upwind foot goes
/// light first and reaches zero exactly at the tip wind speed
/// (statics; common practice, no source).
#[test]
fn upwind_foot_goes_light_at_tip() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let pose = altaz(0.0, 0.0);
    let r = rig
        .foot_reactions_n(&Conditions::calm(pose))
        .unwrap()
        .unwrap();
    for x in r {
        assert_relative_eq!(x, 40.0 * STANDARD_GRAVITY_MPS2 / 3.0, max_relative = 1e-4);
    }
    let tip = rig
        .stability_figures(&wind(pose, 1.0, 0.0))
        .unwrap()
        .tip_wind_mps
        .unwrap();
    let at_tip = rig
        .foot_reactions_n(&wind(pose, tip, 0.0))
        .unwrap()
        .unwrap();
    // Foot 0 points north, upwind.
    assert_abs_diff_eq!(at_tip[0], 0.0, epsilon = 0.05);
    let total: f32 = at_tip.iter().sum();
    assert_relative_eq!(total, 40.0 * STANDARD_GRAVITY_MPS2, max_relative = 1e-4);
}

/// Extra tilt to tip with no wind: a centre of gravity h above the ground and
/// d inside an edge tips at atan(d/h) (statics; common practice, no source).
#[test]
fn tilt_margin_is_atan_d_over_h() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 1.0], 0.222, 1.5, 0.5)).unwrap();
    let m = rig.tilt_margin(&Conditions::calm(altaz(0.0, 0.0))).unwrap();
    assert_relative_eq!(m.extra_rad, (0.25_f32 / 1.0).atan(), max_relative = 1e-4);
    // Tilting the ground by most of that margin toward the same edge leaves
    // the rest.
    let tilt = Tilt::new(0.2, m.downhill_azimuth_rad).unwrap();
    let c = Conditions {
        tilt,
        ..Conditions::calm(altaz(0.0, 0.0))
    };
    let m2 = rig.tilt_margin(&c).unwrap();
    assert_relative_eq!(m2.extra_rad, m.extra_rad - 0.2, max_relative = 1e-3);
    // On the slope the downhill pull W·sinθ·h overturns against W·cosθ·d:
    // utilisation tanθ·h/d, reaching 1 exactly at the tilt margin.
    let u = rig.stability_figures(&c).unwrap().critical.utilisation;
    assert_relative_eq!(u, 0.2_f32.tan() * 1.0 / 0.25, max_relative = 1e-3);
}

/// Invariance: turning the whole rig (feet, bodies, pose azimuth, ground tilt)
/// and the wind together about the vertical leaves every result unchanged
/// (rotational symmetry of statics; common practice, no source).
#[test]
fn rotating_rig_and_wind_together_changes_nothing() {
    let feet = [[0.6, 0.1], [-0.2, 0.5], [-0.3, -0.45], [0.25, -0.5]];
    let mk = |turn_deg: f32| {
        let turned: standfast::bounded::Vec<Foot, 8> = feet
            .iter()
            .map(|p| Foot {
                position_m: standfast::support::rotate_cw(*p, deg_to_rad(turn_deg)),
                tie_down_n: 50.0,
            })
            .collect();
        let s = Support::new(&turned).unwrap();
        let cg = standfast::support::rotate_cw([0.05, -0.03], deg_to_rad(turn_deg));
        let mut spec = post_rig(&s, 25.0, [cg[0], cg[1], 0.9], 0.3, 1.3, 0.6);
        spec.feet = feet_of(&s);
        Rig::new(&spec).unwrap()
    };
    for turn in [0.0_f32, 37.0, 200.0] {
        let rig = mk(turn);
        let c = Conditions {
            tilt: Tilt::new(0.03, deg_to_rad(70.0 + turn)).unwrap(),
            ..wind(altaz(20.0 + turn, 30.0), 14.0, 250.0 + turn)
        };
        let a = rig.stability_figures(&c).unwrap();
        let base = mk(0.0)
            .stability_figures(&Conditions {
                tilt: Tilt::new(0.03, deg_to_rad(70.0)).unwrap(),
                ..wind(altaz(20.0, 30.0), 14.0, 250.0)
            })
            .unwrap();
        assert_relative_eq!(
            a.critical.utilisation,
            base.critical.utilisation,
            max_relative = 1e-4
        );
        assert_relative_eq!(
            a.sliding.utilisation,
            base.sliding.utilisation,
            max_relative = 1e-4
        );
        assert_relative_eq!(
            a.tip_wind_mps.unwrap(),
            base.tip_wind_mps.unwrap(),
            max_relative = 1e-4
        );
        assert_relative_eq!(
            a.critical.margin_nm,
            base.critical.margin_nm,
            max_relative = 1e-4
        );
    }
}

/// Mass added on the vertical axis of a rig on level ground never lowers
/// stability: its weight acts at the origin, inside every edge (statics;
/// common practice, no source).
#[test]
fn mass_on_vertical_axis_never_lowers_stability() {
    let support = Support::tripod(0.45, 0.2).unwrap();
    let rig = Rig::new(&post_rig(&support, 20.0, [0.05, 0.02, 1.0], 0.25, 1.4, 0.5)).unwrap();
    for from in [0.0_f32, 45.0, 133.0, 290.0] {
        let c = wind(altaz(0.0, 0.0), 12.0, from);
        let before = rig.stability_figures(&c).unwrap();
        for (m, z) in [(1.0_f32, 0.1_f32), (5.0, 0.6), (10.0, 1.5)] {
            let heavier = rig
                .with_ballast(m, standfast::Vec3::new(0.0, 0.0, z))
                .unwrap();
            let after = heavier.stability_figures(&c).unwrap();
            assert!(after.critical.utilisation <= before.critical.utilisation + 1e-6);
            assert!(after.tip_wind_mps.unwrap() >= before.tip_wind_mps.unwrap() - 1e-4);
        }
    }
}

/// Wind load grows as V² (q = ½ρV²), so with no overturning part from gravity
/// the utilisation does too (common practice, no source).
#[test]
fn utilisation_grows_as_v_squared() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let u = |v: f32| {
        rig.stability_figures(&wind(altaz(0.0, 0.0), v, 17.0))
            .unwrap()
            .critical
            .utilisation
    };
    for v in [2.0_f32, 5.0, 9.0] {
        assert_relative_eq!(u(2.0 * v) / u(v), 4.0, max_relative = 1e-4);
    }
}

/// Ballast to meet a design gust: with the ballast found, the worst-direction
/// utilisation equals the target; 10 % less ballast exceeds it. The needed mass
/// follows in closed form for the symmetric tripod: W_b·r = O/u − W·r.
#[test]
fn ballast_needed_meets_target_exactly() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let c = Conditions::calm(altaz(0.0, 0.0));
    let need = rig
        .ballast_needed(&c, 25.0, 0.8, standfast::Vec3::new(0.0, 0.0, 0.3))
        .unwrap();
    let q = Air::default().dynamic_pressure_pa(25.0);
    let over = q * 0.222 * 1.5;
    let closed =
        (over / 0.8 - 40.0 * STANDARD_GRAVITY_MPS2 * 0.25) / (STANDARD_GRAVITY_MPS2 * 0.25);
    assert_relative_eq!(need.mass_kg, closed, max_relative = 1e-3);
    let ok = rig
        .with_ballast(need.mass_kg, standfast::Vec3::new(0.0, 0.0, 0.3))
        .unwrap();
    let (u, _) = ok
        .worst_direction_utilisation(&Conditions {
            wind_speed_mps: 25.0,
            ..c
        })
        .unwrap();
    assert_relative_eq!(u, 0.8, max_relative = 1e-3);
    let short = rig
        .with_ballast(0.9 * need.mass_kg, standfast::Vec3::new(0.0, 0.0, 0.3))
        .unwrap();
    let (u2, _) = short
        .worst_direction_utilisation(&Conditions {
            wind_speed_mps: 25.0,
            ..c
        })
        .unwrap();
    assert!(u2 > 0.8);
    // A design gust just past the target (utilisation 0.9 against 0.8)
    // needs a little ballast, by the same closed form: about 5.0 kg.
    let over_small = 0.9 * 40.0 * STANDARD_GRAVITY_MPS2 * 0.25;
    let v_small = (2.0 * over_small / (0.222 * 1.5) / 1.225_f32).sqrt();
    let small = rig
        .ballast_needed(&c, v_small, 0.8, standfast::Vec3::new(0.0, 0.0, 0.3))
        .unwrap();
    let closed_small =
        (over_small / 0.8 - 40.0 * STANDARD_GRAVITY_MPS2 * 0.25) / (STANDARD_GRAVITY_MPS2 * 0.25);
    assert_relative_eq!(small.mass_kg, closed_small, max_relative = 1e-3);
    assert_relative_eq!(closed_small, 5.0, max_relative = 1e-3);
    // Tie-downs: about the edge opposite the upwind foot only that foot is off
    // the edge, at the triangle's height 3r = 0.75 m from it.
    let tie = rig.tie_down_needed(&c, 25.0, 0.8).unwrap();
    let closed_t = (over / 0.8 - 40.0 * STANDARD_GRAVITY_MPS2 * 0.25) / 0.75;
    assert_relative_eq!(tie.pull_per_foot_n, closed_t, max_relative = 1e-3);
    let tie_small = rig.tie_down_needed(&c, v_small, 0.8).unwrap();
    let closed_t_small = (over_small / 0.8 - 40.0 * STANDARD_GRAVITY_MPS2 * 0.25) / 0.75;
    assert_relative_eq!(
        tie_small.pull_per_foot_n,
        closed_t_small,
        max_relative = 1e-3
    );
}

/// Utilisation at a wind below the tip wind, with tie-downs: about the edge
/// opposite the upwind foot, overturning F·H = q·(C_d·A)·H against the weight
/// on its arm r plus the upwind foot's tie-down T on the triangle's height 3r
/// (the same block-tipping moment balance of Beer & Johnston, *Vector
/// Mechanics for Engineers: Statics*, ch. 8, with the anchor as one more
/// stabilising force). W = 392.3 N, r = 0.25 m, T = 100 N, C_d·A = 0.222 m²,
/// H = 1.5 m: at 15 m/s, q = 137.8 Pa, u = 45.9 / (98.1 + 75.0) = 0.265;
/// the tip wind rises from 21.9 to 29.1 m/s.
#[test]
fn tie_downs_steady_the_rig_by_their_arm() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let mut spec = post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5);
    for f in spec.feet.iter_mut() {
        f.tie_down_n = 100.0;
    }
    let rig = Rig::new(&spec).unwrap();
    let a = rig
        .stability_figures(&wind(altaz(0.0, 0.0), 15.0, 0.0))
        .unwrap();
    let (w, r, t, cda, h) = (40.0 * STANDARD_GRAVITY_MPS2, 0.25, 100.0, 0.222, 1.5);
    let q = Air::default().dynamic_pressure_pa(15.0);
    let over = q * cda * h;
    let stab = w * r + t * 3.0 * r;
    assert_relative_eq!(a.critical.overturning_nm, over, max_relative = 1e-4);
    assert_relative_eq!(a.critical.stabilising_nm, stab, max_relative = 1e-4);
    assert_relative_eq!(a.critical.utilisation, over / stab, max_relative = 1e-4);
    assert_relative_eq!(a.critical.margin_nm, stab - over, max_relative = 1e-4);
    assert_relative_eq!(over / stab, 0.265, max_relative = 2e-3);
    let v_tip = (2.0 * stab / (cda * h) / 1.225_f32).sqrt();
    assert_relative_eq!(v_tip, 29.1, max_relative = 2e-3);
    assert_relative_eq!(a.tip_wind_mps.unwrap(), v_tip, max_relative = 1e-4);
}

/// A wind blowing up a slope steadies the downhill edge and tips the rig over
/// the uphill ones. On ground tilted θ toward one edge, the weight splits into
/// W·sinθ along the ground (overturning on the CG height h) and W·cosθ normal
/// to it (stabilising on the arm r), as in the slope checks of mobile cranes;
/// the wind stays horizontal in the world, so in the ground's frame it is
/// (cosθ along the slope, −sinθ into the ground) and a cylinder standing
/// normal to the ground meets it θ off broadside: C_d·A = C_d⊥·d·l·cosθ +
/// C_d∥·(π/4)·d²·sinθ (cross-flow principle, Hoerner, *Fluid-Dynamic Drag*,
/// 1965, ch. 3, from memory). About the downhill edge:
/// u = W·sinθ·h / (W·cosθ·r + q·C_d·A·(H·cosθ + r·sinθ)).
/// About each uphill edge (outward normals 60° off the wind) the wind tips
/// the rig when q·C_d·A·(H·cosθ·cos60° − r·sinθ) = W·cosθ·r + W·sinθ·h·cos60°.
/// Sliding by Coulomb friction on the net force along and normal to the
/// ground (Beer & Johnston, ch. 8). (Statics; the decomposition is common
/// practice, no source.)
#[test]
fn wind_up_a_slope_steadies_the_downhill_edge() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let mut spec = post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5);
    let end_cd = 0.8_f32;
    if let Some(x) = spec.bodies[0].exposure.as_mut() {
        x.end_drag_coefficient = Some(end_cd);
    }
    let rig = Rig::new(&spec).unwrap();
    let theta = 0.15_f32;
    // Downhill toward the southern edge; the wind from the south blows uphill.
    let c = |speed: f32| Conditions {
        tilt: Tilt::new(theta, deg_to_rad(180.0)).unwrap(),
        ..wind(altaz(0.0, 0.0), speed, 180.0)
    };
    let (w, r, h, big_h) = (40.0 * STANDARD_GRAVITY_MPS2, 0.25_f32, 0.8_f32, 1.5_f32);
    let d = 0.25_f32; // the post's diameter (fixtures::post_rig)
    let cda = 0.222 * theta.cos() + end_cd * core::f32::consts::FRAC_PI_4 * d * d * theta.sin();
    let calm = rig.stability_figures(&c(0.0)).unwrap();
    assert_relative_eq!(
        calm.critical.utilisation,
        w * theta.sin() * h / (w * theta.cos() * r),
        max_relative = 1e-3
    );
    let v = 8.0;
    let q = Air::default().dynamic_pressure_pa(v);
    let a = rig.stability_figures(&c(v)).unwrap();
    let stab = w * theta.cos() * r + q * cda * (big_h * theta.cos() + r * theta.sin());
    assert_relative_eq!(a.critical.stabilising_nm, stab, max_relative = 1e-3);
    assert_relative_eq!(
        a.critical.utilisation,
        w * theta.sin() * h / stab,
        max_relative = 1e-3
    );
    assert!(a.critical.utilisation < calm.critical.utilisation);
    // Sliding (Coulomb friction, μ = 0.5): the wind's push up the slope
    // offsets the weight's pull down it, and its part into the ground adds
    // to the normal force.
    let along = q * cda * theta.cos() - w * theta.sin();
    let normal = w * theta.cos() + q * cda * theta.sin();
    assert_relative_eq!(a.sliding.tangential_n, along.abs(), max_relative = 1e-3);
    assert_relative_eq!(a.sliding.normal_n, normal, max_relative = 1e-4);
    assert_relative_eq!(
        a.sliding.utilisation,
        along.abs() / (0.5 * normal),
        max_relative = 1e-3
    );
    // The three foot reactions carry the whole force normal to the ground.
    let reactions = rig.foot_reactions_n(&c(v)).unwrap().unwrap();
    assert_relative_eq!(reactions.iter().sum::<f32>(), normal, max_relative = 1e-4);
    let q_tip = (w * theta.cos() * r + w * theta.sin() * h * 0.5)
        / (cda * (big_h * theta.cos() * 0.5 - r * theta.sin()));
    assert_relative_eq!(
        a.tip_wind_mps.unwrap(),
        (2.0 * q_tip / 1.225_f32).sqrt(),
        max_relative = 1e-3
    );
}

/// Ties go to the first edge in the support's order: on level ground in calm
/// air no edge of a rig centred over its feet is loaded, and the critical
/// edge reported is the first (the documented order of
/// `standfast::stability::StabilityFigures::critical`).
#[test]
fn an_unloaded_rig_reports_its_first_edge() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let a = rig
        .stability_figures(&wind(altaz(0.0, 0.0), 0.0, 0.0))
        .unwrap();
    let first = support.edges()[0];
    assert_eq!(a.critical.utilisation, 0.0);
    assert_eq!(
        (a.critical.from_foot, a.critical.to_foot),
        (first.from, first.to)
    );
}

/// The worst direction is found to the accuracy of a dense scan: tip wind
/// and utilisation against a brute-force scan of 7,200 directions (every
/// 0.05°) through `Rig::stability_figures`, on a rig with no symmetry about north
/// (first leg at 17.5°, between the coarse 5° steps; centre of gravity off
/// the axis). The refinement must close the coarse step's error (up to about
/// 0.1 % in speed here). (Reference computation; common practice, no source.)
#[test]
fn worst_direction_matches_a_dense_scan() {
    let support = Support::tripod(0.45, deg_to_rad(17.5)).unwrap();
    let rig = Rig::new(&post_rig(
        &support,
        30.0,
        [0.06, -0.04, 0.9],
        0.25,
        1.4,
        0.5,
    ))
    .unwrap();
    let pose = altaz(0.0, 0.0);
    let dense = |f: &dyn Fn(f32) -> f32| {
        (0..7200)
            .map(|k| {
                let d = k as f32 * 0.05;
                (f(d), d)
            })
            .fold(
                (f32::NEG_INFINITY, 0.0),
                |a, b| if b.0 > a.0 { b } else { a },
            )
    };
    let tip = |d: f32| {
        rig.stability_figures(&wind(pose, 10.0, d))
            .unwrap()
            .tip_wind_mps
            .unwrap()
    };
    let (neg_min, at) = dense(&|d| -tip(d));
    let worst = rig.worst_wind(&wind(pose, 0.0, 0.0)).unwrap();
    assert_relative_eq!(worst.tip_wind_mps.unwrap(), -neg_min, max_relative = 1e-4);
    assert!(worst.tip_wind_mps.unwrap() <= -neg_min * (1.0 + 1e-6));
    let off = (worst.from_rad.to_degrees() - at + 540.0).rem_euclid(360.0) - 180.0;
    assert!(
        off.abs() < 1.0,
        "worst from {}°, dense {at}°",
        worst.from_rad.to_degrees()
    );
    let u = |d: f32| {
        rig.stability_figures(&wind(pose, 15.0, d))
            .unwrap()
            .critical
            .utilisation
    };
    let (max_u, at_u) = dense(&u);
    let (got, from) = rig
        .worst_direction_utilisation(&wind(pose, 15.0, 0.0))
        .unwrap();
    assert_relative_eq!(got, max_u, max_relative = 1e-4);
    assert!(got >= max_u * (1.0 - 1e-6));
    let off = (from.to_degrees() - at_u + 540.0).rem_euclid(360.0) - 180.0;
    assert!(
        off.abs() < 1.0,
        "worst from {}°, dense {at_u}°",
        from.to_degrees()
    );
}

/// A rig whose wind load acts at ground level cannot be tipped by wind from
/// any direction: no tip wind, anywhere (statics: a force through the edge
/// line has no moment about it; common practice, no source).
#[test]
fn wind_at_ground_level_tips_nothing() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 0.0, 0.5)).unwrap();
    let c = wind(altaz(0.0, 0.0), 20.0, 33.0);
    assert_eq!(rig.stability_figures(&c).unwrap().tip_wind_mps, None);
    assert_eq!(rig.worst_wind(&c).unwrap().tip_wind_mps, None);
}

/// The utilisation at a second speed is defined for any finite speed at or
/// above zero, and `None` otherwise (the documented contract of
/// `Rig::stability_figures_with_utilisation_at`).
#[test]
fn utilisation_at_a_second_speed_refuses_negative_and_non_finite() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let c = wind(altaz(0.0, 0.0), 10.0, 0.0);
    let at = |v: f32| rig.stability_figures_with_utilisation_at(&c, v).unwrap().1;
    assert_eq!(at(-1.0), None);
    assert_eq!(at(f32::NAN), None);
    assert_eq!(at(f32::INFINITY), None);
    let u20 = at(20.0).unwrap();
    assert_relative_eq!(
        u20,
        4.0 * rig.stability_figures(&c).unwrap().critical.utilisation,
        max_relative = 1e-4
    );
    assert_eq!(at(0.0), Some(0.0));
}

/// Ballast placed high on a slope pulls the rig downhill more than it holds
/// it down: about the downhill edge its weight's moment W_b·(cosθ·d −
/// sinθ·z) is overturning when tanθ > d/z. No amount of it meets the target,
/// and the core says so instead of answering for the other edges (slope
/// statics as in the slope checks of mobile cranes; common practice, no
/// source). θ = 0.3 rad, d = 0.25 m, z = 1.0 m: tanθ = 0.31 > 0.25.
#[test]
fn ballast_that_cannot_help_is_refused() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 40.0, [0.0, 0.0, 0.8], 0.222, 1.5, 0.5)).unwrap();
    let c = Conditions {
        tilt: Tilt::new(0.3, deg_to_rad(180.0)).unwrap(),
        ..Conditions::calm(altaz(0.0, 0.0))
    };
    let high = rig.ballast_needed(&c, 5.0, 0.8, standfast::Vec3::new(0.0, 0.0, 1.0));
    assert_eq!(
        high.unwrap_err().kind,
        standfast::error::ErrorKind::Unreachable
    );
    // Low on the same slope it steadies every edge: a finite answer.
    let low = rig
        .ballast_needed(&c, 5.0, 0.8, standfast::Vec3::new(0.0, 0.0, 0.05))
        .unwrap();
    assert!(low.mass_kg.is_finite() && low.mass_kg > 0.0);
}

/// The ballast and tie-down sizing holds for a very light rig too, where an
/// edge's stabilising moment is under 1 N·m: 0.1 kg on a tripod of 0.5 m
/// foot circle (W·r = 0.245 N·m), a small sail (C_d·A = 0.02 m² at 0.3 m),
/// a design gust at utilisation 0.9 against a target of 0.8. Same closed
/// forms as for the 40 kg rig: about 12.5 g of ballast on the axis, or
/// 41 mN on every foot. (Statics; common practice, no source.)
#[test]
fn a_very_light_rig_is_sized_by_the_same_closed_forms() {
    let support = Support::tripod(0.5, 0.0).unwrap();
    let rig = Rig::new(&post_rig(&support, 0.1, [0.0, 0.0, 0.2], 0.02, 0.3, 0.5)).unwrap();
    let c = Conditions::calm(altaz(0.0, 0.0));
    let w_r = 0.1 * STANDARD_GRAVITY_MPS2 * 0.25;
    let over = 0.9 * w_r;
    let v = (2.0 * over / (0.02 * 0.3) / 1.225_f32).sqrt();
    let ballast = rig
        .ballast_needed(&c, v, 0.8, standfast::Vec3::new(0.0, 0.0, 0.1))
        .unwrap();
    let closed = (over / 0.8 - w_r) / (STANDARD_GRAVITY_MPS2 * 0.25);
    assert_relative_eq!(ballast.mass_kg, closed, max_relative = 2e-3);
    assert_relative_eq!(closed, 0.0125, max_relative = 1e-3);
    let tie = rig.tie_down_needed(&c, v, 0.8).unwrap();
    let closed_t = (over / 0.8 - w_r) / 0.75;
    assert_relative_eq!(tie.pull_per_foot_n, closed_t, max_relative = 2e-3);
    assert_relative_eq!(closed_t, 0.0409, max_relative = 2e-3);
}
