//! The guard's evaluation, which keeps what depends on the pose and cover
//! ([`Posed`]) and shares one placement and one pass of wind loads between
//! its figures, gives the same bits as the separate public calls it replaces
//! ([`Rig::tilt_margin`], [`Rig::worst_direction_utilisation`],
//! [`Rig::stability_figures_with_utilisation_at`], [`Rig::axis_loads`]), over
//! random rigs, poses, tilts, winds, cover states and air, with the pose and
//! cover changing (and coming back) between evaluations.

use super::*;
use crate::drive::{DriveRating, Drives};
use crate::math::deg_to_rad;
use crate::mount::{MountGeometry, PierSide};
use crate::rig::{BodySpec, CounterweightSpec, CoverSpec, LegsSpec, RigSpec, ShaftSpec, Stage};
use crate::support::Support;

/// A small deterministic generator (xorshift32), so that a failure repeats.
struct Gen(u32);

impl Gen {
    fn next(&mut self) -> u32 {
        let mut x = self.0;
        x ^= x << 13;
        x ^= x >> 17;
        x ^= x << 5;
        self.0 = x;
        x
    }

    /// Uniform in [lo, hi).
    fn f(&mut self, lo: f32, hi: f32) -> f32 {
        lo + (hi - lo) * (self.next() >> 8) as f32 / (1u32 << 24) as f32
    }

    fn chance(&mut self, percent: u32) -> bool {
        self.next() % 100 < percent
    }
}

/// A random rig, and whether its mount is equatorial.
fn random_rig(g: &mut Gen) -> (Rig, bool) {
    let equatorial = g.chance(60);
    let origin = [g.f(-0.05, 0.05), g.f(-0.05, 0.05), g.f(0.6, 1.6)];
    let mount = if equatorial {
        MountGeometry::equatorial(deg_to_rad(g.f(-60.0, 60.0)), origin)
    } else {
        MountGeometry::alt_azimuth(deg_to_rad(g.f(-60.0, 60.0)), origin)
    };
    let support = Support::tripod(g.f(0.25, 0.7), g.f(0.0, crate::math::TAU)).unwrap();
    let mut spec = RigSpec::new(&support, mount, g.f(0.2, 0.8))
        .with_body(BodySpec::optical_tube(
            g.f(2.0, 20.0),
            g.f(0.08, 0.35),
            g.f(0.3, 1.5),
            [g.f(0.05, 0.3), g.f(-0.2, 0.2), g.f(-0.05, 0.05)],
        ))
        .unwrap()
        .with_body(BodySpec::cuboid(
            Stage::Ground,
            g.f(2.0, 20.0),
            [0.0, 0.0, origin[2] - 0.1],
            [g.f(0.1, 0.4), g.f(0.1, 0.4), g.f(0.1, 0.4)],
        ))
        .unwrap()
        .with_body(BodySpec::cylinder(
            Stage::Primary,
            g.f(0.5, 5.0),
            [g.f(-0.1, 0.1), g.f(-0.1, 0.1), g.f(0.0, 0.2)],
            g.f(0.05, 0.2),
            g.f(0.05, 0.4),
            [g.f(-1.0, 1.0), g.f(-1.0, 1.0), 1.0],
        ))
        .unwrap();
    if g.chance(50) {
        // A drag coefficient of its own (the kept coefficients are the
        // body's, not the default).
        let mut b = BodySpec::cuboid(
            Stage::Secondary,
            g.f(0.2, 2.0),
            [g.f(-0.2, 0.2), g.f(-0.2, 0.2), g.f(-0.2, 0.2)],
            [g.f(0.05, 0.3), g.f(0.05, 0.3), g.f(0.05, 0.3)],
        )
        .with_drag_coefficient(g.f(0.5, 2.0));
        if let Some(x) = b.exposure.as_mut() {
            if g.chance(50) {
                x.shape = crate::shape::Shape::Cylinder {
                    diameter_m: g.f(0.05, 0.3),
                    length_m: g.f(0.05, 1.0),
                    axis: [1.0, g.f(-1.0, 1.0), 0.0],
                };
                x.end_drag_coefficient = Some(g.f(0.5, 2.0));
            }
        }
        spec = spec.with_body(b).unwrap();
    }
    if g.chance(70) {
        spec = spec.with_legs(LegsSpec::new(
            g.f(0.3, 3.0),
            g.f(0.02, 0.06),
            origin[2] - 0.2,
            g.f(0.05, 0.15),
        ));
    }
    if equatorial {
        spec = spec
            .with_shaft(ShaftSpec::new(
                g.f(0.3, 2.0),
                g.f(0.2, 0.5),
                g.f(0.015, 0.04),
            ))
            .with_counterweight(CounterweightSpec::disc(
                g.f(1.0, 10.0),
                g.f(0.08, 0.2),
                g.f(0.08, 0.2),
                g.f(0.02, 0.08),
            ))
            .unwrap();
    }
    if g.chance(50) {
        spec = spec.with_cover(CoverSpec {
            mass_kg: g.f(0.5, 3.0),
            size_m: [g.f(0.2, 0.5), g.f(0.5, 1.6), g.f(0.2, 0.5)],
            centre_m: [g.f(0.05, 0.3), 0.0, 0.0],
            drag_coefficient: None,
        });
    }
    if g.chance(70) {
        let rating = |g: &mut Gen| {
            let rated = g.f(2.0, 40.0);
            DriveRating {
                rated_nm: rated,
                repeated_peak_nm: rated * 1.5,
                momentary_peak_nm: rated * 3.0,
            }
        };
        spec = spec.with_drives(Drives {
            primary: rating(g),
            secondary: rating(g),
            slew_acceleration_rad_per_s2: g.f(0.0, 2.0),
        });
    }
    (Rig::new(&spec).unwrap(), equatorial)
}

fn random_pose(g: &mut Gen, equatorial: bool) -> Pose {
    let side = if g.chance(50) {
        PierSide::TubeEast
    } else {
        PierSide::TubeWest
    };
    match g.next() % 3 {
        0 => Pose::Axes {
            primary_rad: g.f(-3.1, 3.1),
            secondary_rad: g.f(-1.5, 1.5),
        },
        1 if equatorial => Pose::Equatorial {
            hour_angle_rad: g.f(-3.1, 3.1),
            declination_rad: g.f(-1.5, 1.5),
            pier_side: side,
        },
        _ => Pose::Horizontal {
            azimuth_rad: g.f(0.0, crate::math::TAU),
            altitude_rad: g.f(0.0, 1.5),
            pier_side: side,
        },
    }
}

/// The evaluation as the separate public calls make it (the guard's code
/// before the figures shared a placement).
fn reference(rig: &Rig, c0: Conditions, at: &EvalAt) -> (Shown, FaultSet) {
    let mut faults = FaultSet::new();
    let unevaluable = |check| Fault::Unevaluable { check };
    let mut f = Shown::default();
    let cond = |speed, from| Conditions {
        tilt: at.tilt,
        wind_speed_mps: speed,
        wind_from_rad: from,
        ..c0
    };
    if let Ok(m) = rig.tilt_margin(&cond(0.0, 0.0)) {
        f.tilt_margin_rad = finite(m.extra_rad);
    }
    if f.tilt_margin_rad.is_none() {
        faults.push(unevaluable(Check::TiltMargin));
    }
    let from = match at.measured_from {
        Some(d) => Some(d),
        None => rig
            .worst_direction_utilisation(&cond(at.gust, 0.0))
            .ok()
            .and_then(|(_, d)| finite(d)),
    };
    let Some(from) = from else {
        faults.push(unevaluable(Check::WorstDirection));
        return (f, faults);
    };
    f.from_rad = Some(from);
    let c = cond(at.gust, from);
    match rig.stability_figures_with_utilisation_at(&c, at.predicted) {
        Ok((a, at_predicted)) => {
            f.overturning = finite(a.critical.utilisation);
            f.sliding = finite(a.sliding.utilisation);
            f.tip_wind_mps = a.tip_wind_mps;
            f.predicted = at_predicted.and_then(finite);
            if f.overturning.is_none() || f.sliding.is_none() {
                faults.push(unevaluable(Check::Overturning));
            }
            if f.predicted.is_none() {
                faults.push(unevaluable(Check::PredictedOverturning));
            }
        }
        Err(_) => faults.push(unevaluable(Check::Overturning)),
    }
    if rig.drives().is_some() {
        let mean = at.mean.unwrap_or(at.gust).min(at.gust);
        f.drive = rig
            .axis_loads(&c, mean)
            .ok()
            .and_then(|l| {
                Some([
                    l.primary.utilisation?.governing,
                    l.secondary.utilisation?.governing,
                ])
            })
            .filter(|d| d.iter().all(|u| u.is_finite()));
        if f.drive.is_none() {
            faults.push(unevaluable(Check::Drive));
        }
    }
    (f, faults)
}

fn bits(x: Option<f32>) -> Option<u32> {
    x.map(f32::to_bits)
}

fn assert_same(a: &Shown, b: &Shown, case: u32, step: u32) {
    let pairs = [
        (a.overturning, b.overturning, "overturning"),
        (a.predicted, b.predicted, "predicted"),
        (a.sliding, b.sliding, "sliding"),
        (a.tip_wind_mps, b.tip_wind_mps, "tip wind"),
        (a.from_rad, b.from_rad, "direction"),
        (a.tilt_margin_rad, b.tilt_margin_rad, "tilt margin"),
        (a.drive.map(|d| d[0]), b.drive.map(|d| d[0]), "drive 1"),
        (a.drive.map(|d| d[1]), b.drive.map(|d| d[1]), "drive 2"),
    ];
    for (x, y, name) in pairs {
        assert_eq!(
            bits(x),
            bits(y),
            "{name}: {x:?} vs {y:?} (case {case} step {step})"
        );
    }
}

#[test]
fn the_cached_evaluation_has_the_bits_of_the_separate_calls() {
    let mut g = Gen(0x5eed_1234);
    let (mut hits, mut misses, mut scans) = (0, 0, 0);
    for case in 0..300_u32 {
        let (rig, equatorial) = random_rig(&mut g);
        let mut guard = Guard::new(&rig, GuardConfig::default(), Millis(0)).unwrap();
        let mut poses = [rig.mount().home_pose(); 3];
        for p in &mut poses {
            *p = random_pose(&mut g, equatorial);
        }
        for step in 0..8_u32 {
            // Keep the pose (the cache is used), take another of the three
            // (it is computed again), or move it by a hair (a new pose too).
            let pose = match g.next() % 4 {
                0 | 1 => guard.pose,
                2 => poses[(g.next() % 3) as usize],
                _ => match guard.pose {
                    Pose::Axes {
                        primary_rad,
                        secondary_rad,
                    } => Pose::Axes {
                        primary_rad: primary_rad + 1e-6,
                        secondary_rad,
                    },
                    p => p,
                },
            };
            if rig.mount().axis_angles(pose).is_err() {
                continue;
            }
            guard.pose = pose;
            if rig.has_cover() && g.chance(30) {
                guard.cover_fitted = !guard.cover_fitted;
            }
            if g.chance(30) {
                guard.air =
                    Air::from_temperature_pressure(g.f(240.0, 320.0), g.f(60_000.0, 105_000.0))
                        .unwrap();
            }
            let gust = if g.chance(5) {
                g.f(100.0, 130.0)
            } else {
                g.f(0.0, 60.0)
            };
            let measured_from = if g.chance(10) {
                scans += 1;
                None
            } else {
                Some(g.f(-7.0, 7.0))
            };
            let at = EvalAt {
                tilt: Tilt::new(g.f(0.0, 0.15), g.f(0.0, crate::math::TAU)).unwrap(),
                gust,
                predicted: if g.chance(5) {
                    f32::NAN
                } else {
                    gust * g.f(1.0, 2.0)
                },
                measured_from,
                mean: match g.next() % 3 {
                    0 => None,
                    1 => Some(gust * g.f(0.0, 1.0)),
                    _ => Some(gust * g.f(0.5, 1.5)),
                },
            };
            let was = guard
                .posed
                .is_some_and(|p| p.is_for(pose, guard.cover_fitted));
            if was {
                hits += 1;
            } else {
                misses += 1;
            }
            let (mut f, mut faults) = (Shown::default(), FaultSet::new());
            guard.physics(&at, &mut f, &mut faults);
            // The kept figures are for the pose just evaluated.
            assert!(guard
                .posed
                .is_some_and(|p| p.is_for(pose, guard.cover_fitted)));
            let c0 = Conditions {
                air: guard.air,
                cover_fitted: guard.cover_fitted,
                ..Conditions::calm(pose)
            };
            let (want_f, want_faults) = reference(&rig, c0, &at);
            assert_same(&f, &want_f, case, step);
            assert_eq!(faults, want_faults, "case {case} step {step}");
        }
    }
    // Both paths of the cache, and the worst-direction scan, were taken.
    assert!(
        hits > 300 && misses > 300 && scans > 50,
        "{hits} {misses} {scans}"
    );
}

/// The kept figures are for one pose exactly: another form, pier side, a
/// hair's move or even a zero of the other sign is another pose, and so is
/// the other cover state.
#[test]
fn posed_figures_are_for_one_pose_and_cover_state() {
    let mut g = Gen(77);
    let (rig, _) = random_rig(&mut g);
    let eq = |h: f32, d: f32, s| Pose::Equatorial {
        hour_angle_rad: h,
        declination_rad: d,
        pier_side: s,
    };
    let pose = eq(0.0, 0.5, PierSide::TubeEast);
    let p = Posed::new(&rig, pose, false).unwrap();
    assert!(p.is_for(pose, false));
    assert!(!p.is_for(pose, true));
    assert!(!p.is_for(eq(-0.0, 0.5, PierSide::TubeEast), false));
    assert!(!p.is_for(eq(0.0, 0.5, PierSide::TubeWest), false));
    assert!(!p.is_for(eq(0.0, 0.500_001, PierSide::TubeEast), false));
    assert!(!p.is_for(
        Pose::Horizontal {
            azimuth_rad: 0.0,
            altitude_rad: 0.5,
            pier_side: PierSide::TubeEast
        },
        false
    ));
    assert!(!p.is_for(
        Pose::Axes {
            primary_rad: 0.0,
            secondary_rad: 0.5
        },
        false
    ));
}
