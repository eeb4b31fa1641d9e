//! One pass over every covered entry point of the core, with inputs from
//! [`crate::unknowns`]. Every result goes through [`core::hint::black_box`],
//! so no call is dropped as dead code.

use crate::unknowns::Unknowns;
use core::hint::black_box;
use standfast::air::Air;
use standfast::bounded::Vec;
use standfast::drive::{DriveRating, Drives};
use standfast::guard::transition::{transition, Figures, Memory, Readings};
use standfast::guard::{AirSample, AlertLevel as Level, Guard, GuardConfig, Inputs, WindSample};
use standfast::hardware::bolt::{BoltPattern, PivotLine, ShaftLoad};
use standfast::hardware::material::{Material, AL_6061_T6_EXTRUSION_MIN};
use standfast::hardware::shaft::{check_shaft_bending, ShaftSection};
use standfast::hardware::strip::{check_stripping, ShearFactor, StrippingInput};
use standfast::hardware::{IsoThread, StrengthBasis};
use standfast::mount::{MountGeometry, MountKind, PierSide, Pose};
use standfast::rig::{
    BallastSpec, BodySpec, Conditions, CounterweightSpec, CoverSpec, LegsSpec, Rig, RigSpec,
    ShaftSpec, Stage,
};
use standfast::sense::{Millis, TiltConfig, TiltReading, TiltSensor, WindConfig, WindStats};
use standfast::shape::{Exposure, Shape};
use standfast::sky::{ParkRequest, PayloadOffset, SkyGrid, SkyScan};
use standfast::support::Support;
use standfast::torque::PayloadPick;
use standfast::weighing::{centre_from_weighing, Lift, LiftGeometry, TipTest, Weighing};
use standfast::{Error, Tilt, Vec3};

/// How many calls returned `Ok` and how many an error (a run on the host
/// prints them; on the target they only feed `black_box`).
#[derive(Clone, Copy, Debug, Default)]
pub struct Tally {
    /// Calls that returned `Ok` (or a value).
    pub ok: u32,
    /// Calls that returned an error or fault.
    pub err: u32,
}

impl Tally {
    fn note<T, E>(&mut self, r: Result<T, E>) -> Option<T> {
        let r = black_box(r);
        match r {
            Ok(v) => {
                self.ok = self.ok.saturating_add(1);
                Some(v)
            }
            Err(e) => {
                black_box(e);
                self.err = self.err.saturating_add(1);
                None
            }
        }
    }
}

/// The rig description built from `u` (the invented rig of the core's
/// crate-level example, with counterweight, shaft, cover, ballast and drive
/// ratings added so that every part kind is placed).
///
/// # Errors
/// Whatever [`Support::tripod`] rejects.
pub fn rig_spec(u: &Unknowns) -> Result<RigSpec, Error> {
    let tripod = Support::tripod(u.foot_circle_radius_m, u.first_leg_azimuth_rad)?;
    let mut bodies = Vec::new();
    let tube = BodySpec::cylinder(
        Stage::Secondary,
        u.tube_mass_kg,
        u.tube_cg_m,
        u.tube_diameter_m,
        u.tube_length_m,
        [0.0, 1.0, 0.0],
    )
    .labelled("tube")
    .with_under_cover(true);
    bodies.push(tube).ok();
    bodies
        .push(BodySpec {
            mass_kg: u.head_mass_kg,
            cg_m: [0.0, 0.0, u.head_height_m],
            exposure: Some(Exposure {
                shape: Shape::Box {
                    size_m: [u.tube_diameter_m, 0.15, 0.2],
                    edges: Some([[1.0, 1.0, 0.0], [0.0, 0.0, 1.0]]),
                },
                centre_m: [0.0, 0.0, u.head_height_m],
                drag_coefficient: None,
                end_drag_coefficient: None,
            }),
            ..BodySpec::default()
        })
        .ok();
    for _ in 0..u.extra_bodies {
        let accessory = BodySpec {
            stage: Stage::Primary,
            mass_kg: u.tube_mass_kg * 0.1,
            cg_m: u.tube_cg_m,
            ..BodySpec::default()
        };
        if bodies.push(accessory).is_err() {
            break;
        }
    }
    let mut counterweights = Vec::new();
    counterweights
        .push(CounterweightSpec::disc(
            u.counterweight_kg,
            u.counterweight_distance_m,
            0.1,
            0.06,
        ))
        .ok();
    let mut ballast = Vec::new();
    ballast
        .push(BallastSpec {
            mass_kg: u.ballast_kg,
            position_m: [0.0, 0.0, 0.4],
        })
        .ok();
    let rating = DriveRating {
        rated_nm: u.drive_nm[0],
        repeated_peak_nm: u.drive_nm[1],
        momentary_peak_nm: u.drive_nm[2],
    };
    Ok(RigSpec {
        // Not `.iter().copied().collect()`: heapless's `FromIterator` panics
        // when the iterator outgrows the capacity, and below opt-level 3 the
        // optimiser no longer proves that a tripod's 3 feet fit in 8.
        feet: Vec::from_slice(tripod.feet()).unwrap_or_default(),
        legs: Some(LegsSpec {
            mass_kg: u.leg_mass_kg,
            diameter_m: 0.03,
            top_height_m: u.axis_height_m * 0.84,
            top_radius_m: 0.06,
        }),
        friction_coefficient: u.friction_coefficient,
        mount: MountGeometry {
            kind: if u.mount_kind == 0 {
                MountKind::Equatorial
            } else {
                MountKind::AltAzimuth
            },
            latitude_rad: u.latitude_rad,
            axis_origin_m: [0.0, 0.0, u.axis_height_m],
        },
        bodies,
        counterweights,
        shaft: Some(ShaftSpec {
            mass_kg: u.shaft_mass_kg,
            length_m: u.shaft_length_m,
            diameter_m: 0.02,
        }),
        cover: Some(CoverSpec {
            mass_kg: u.cover_mass_kg,
            size_m: [0.8, 0.2, 0.2],
            centre_m: u.tube_cg_m,
            drag_coefficient: None,
        }),
        ballast,
        drives: Some(Drives {
            primary: rating,
            secondary: rating,
            slew_acceleration_rad_per_s2: u.slew_acceleration_rad_per_s2,
        }),
    })
}

fn pose(u: &Unknowns) -> Pose {
    Pose::Equatorial {
        hour_angle_rad: u.hour_angle_rad,
        declination_rad: u.declination_rad,
        pier_side: if u.pier_side == 0 {
            PierSide::TubeEast
        } else {
            PierSide::TubeWest
        },
    }
}

/// Covered entry points, in order: [`Support::tripod`], [`Rig::build_in`],
/// [`Rig::new`],
/// [`Rig::stability_figures`], [`Rig::worst_wind`], [`Rig::tilt_margin`],
/// [`Rig::axis_loads`], [`Rig::foot_reactions_n`], [`Rig::ballast_needed`],
/// [`Rig::tie_down_needed`], [`Guard::new`], [`Guard::step`] (in a loop, with
/// every field of [`Inputs`] set), [`TiltSensor::new`], [`TiltSensor::push`],
/// [`TiltSensor::tilt`], [`TiltSensor::faults`], [`WindStats::new`],
/// [`WindStats::push`], [`WindStats::report`], [`WindStats::faults`] and the
/// counterweight hardware checks ([`IsoThread::by_nominal_mm`],
/// [`check_stripping`], [`check_shaft_bending`], [`BoltPattern::circle`],
/// [`BoltPattern::tensions`], [`ShaftLoad::counterweight`]), the sky-wide
/// entry points ([`Rig::sky_scan`], [`Rig::payload_envelope`],
/// [`Rig::balance`], [`standfast::torque::Balance::balanced_spec`],
/// [`Rig::safest_park`]), the
/// guard's decision alone ([`transition`]), the weighing
/// ([`centre_from_weighing`] with a lift by feet, by angle and a tip test),
/// [`Rig::with_measured_centre`] and [`standfast::rig::Placement::load_above`];
/// and every function the C ABI exports ([`crate::ffi::ffi_calls`]).
pub fn exercise(u: &Unknowns) -> Tally {
    let mut t = Tally::default();
    if let Some(spec) = t.note(rig_spec(u)) {
        let mut slot = None;
        t.note(Rig::build_in(&mut slot, &spec));
        black_box(&slot);
        if let Some(rig) = t.note(Rig::new(&spec)) {
            rig_calls(&mut t, &rig, u);
            guard_calls(&mut t, &rig, u);
            weighing_calls(&mut t, &rig, u);
        }
    }
    sensor_calls(&mut t, u);
    hardware_calls(&mut t, u);
    transition_calls(&mut t, u);
    crate::ffi::ffi_calls(&mut t, u);
    t
}

fn rig_calls(t: &mut Tally, rig: &Rig, u: &Unknowns) {
    let tilt = Tilt::new(u.tilt_rad[0], u.tilt_rad[1]).unwrap_or(Tilt::LEVEL);
    let air = Air::from_density(u.air_density_kg_per_m3).unwrap_or_default();
    let c = Conditions {
        pose: pose(u),
        tilt,
        wind_speed_mps: u.gust_mps,
        wind_from_rad: u.wind_from_rad,
        air,
        cover_fitted: u.cover_fitted == 1,
    };
    t.note(rig.stability_figures(&c));
    t.note(rig.worst_wind(&c));
    t.note(rig.tilt_margin(&c));
    t.note(rig.axis_loads(&c, u.mean_wind_mps));
    t.note(rig.foot_reactions_n(&c));
    t.note(rig.ballast_needed(&c, u.gust_mps, 0.75, Vec3::new(0.0, 0.0, 0.4)));
    t.note(rig.tie_down_needed(&c, u.gust_mps, 0.75));
    sky_calls(t, rig, u, air, tilt);
}

/// The sky-wide entry points: the worst case over a sky grid, the payload
/// envelope, balance (and the balanced spec), and the safest park pose.
fn sky_calls(t: &mut Tally, rig: &Rig, u: &Unknowns, air: Air, tilt: Tilt) {
    let grid = SkyGrid::with_step(u.shaft_angle_rad.abs().max(0.2), u.tilt_rad[0]);
    let scan = SkyScan {
        grid,
        wind_directions: 12,
        wind_speed_mps: u.gust_mps,
        air,
        tilt,
    };
    t.note(rig.sky_scan(&scan));
    let offsets = [
        PayloadOffset {
            along_secondary_axis_m: u.tube_cg_m[0],
            along_tube_m: u.tube_cg_m[1],
        },
        PayloadOffset {
            along_secondary_axis_m: 0.0,
            along_tube_m: u.tube_cg_m[2],
        },
    ];
    let pick = if u.extra_bodies % 2 == 0 {
        PayloadPick::UnderCover
    } else {
        PayloadPick::Body(u8::try_from(u.extra_bodies % 7).unwrap_or(0))
    };
    t.note(rig.payload_envelope(&grid, pick, &offsets));
    if let (Some(balance), Some(spec)) = (t.note(rig.balance(pick)), t.note(rig_spec(u))) {
        t.note(balance.balanced_spec(&spec));
    }
    let req = ParkRequest {
        wind_from_rad: u.wind_from_rad,
        wind_speed_mps: u.gust_mps,
        air,
        tilt,
        cover_fitted: u.cover_fitted == 1,
        scan: (u.extra_bodies % 3 == 0).then_some(grid),
    };
    t.note(rig.safest_park(&req, &[pose(u)]));
}

/// The guard's decision alone, on figures and a memory read at run time.
fn transition_calls(t: &mut Tally, u: &Unknowns) {
    let config = GuardConfig::default();
    let thresholds = config.thresholds();
    let figures = Figures {
        overturning: u.gust_mps / 30.0,
        predicted: u.gust_mps / 25.0,
        sliding: u.mean_wind_mps / 30.0,
        drive: (u.extra_bodies % 2 == 0).then_some([u.tilt_rad[0], u.tilt_rad[1]]),
        tilt_margin_rad: u.shaft_angle_rad,
        drift_rad_per_s: u.tilt_rad[1],
    };
    let readings = match u.mount_kind % 3 {
        0 => Readings::Figures(figures),
        1 => Readings::SensorFault,
        _ => Readings::EvaluationFault,
    };
    let mut memory = Memory::default();
    let mut level = Level::ALL
        .get(usize::try_from(u.extra_bodies % 5).unwrap_or(0))
        .copied()
        .unwrap_or_default();
    for k in 0..u.guard_steps {
        let now = Millis(u.start_ms).plus_ms(u64::from(k) * u64::from(u.sample_period_ms));
        if k % 31 == 30 {
            memory.acknowledge();
        }
        let out = transition(level, &readings, &thresholds, memory, now);
        (level, memory) = (out.level, out.memory);
        t.ok = t.ok.saturating_add(u32::from(out.change.is_some()));
    }
    black_box(level);
}

fn weighing_calls(t: &mut Tally, rig: &Rig, u: &Unknowns) {
    let n = usize::try_from(u.scale_count).unwrap_or(usize::MAX);
    let [level, lifted] = &u.scale_n;
    let level = level.get(..n).unwrap_or(level);
    let lifted = lifted.get(..n).unwrap_or(lifted);
    let tip = TipTest {
        edge_feet: [u.tip_edge[0] as u8, u.tip_edge[1] as u8],
        angle_rad: u.tip_angle_rad[0],
        angle_uncertainty_rad: u.tip_angle_rad[1],
    };
    let by_feet = LiftGeometry::Feet {
        lifted_mask: u.lift_mask as u8,
        height_m: u.lift_height_m[0],
        height_uncertainty_m: u.lift_height_m[1],
    };
    let by_angle = LiftGeometry::Angle {
        raised_toward_rad: u.lift_angle_rad[0],
        angle_rad: u.lift_angle_rad[1],
        angle_uncertainty_rad: u.lift_angle_rad[2],
    };
    for geometry in [by_feet, by_angle] {
        let w = Weighing {
            level_n: level,
            reading_uncertainty_n: u.scale_uncertainty_n,
            lift: Some(Lift {
                geometry,
                loads_n: lifted,
            }),
            tip: Some(tip),
        };
        t.note(centre_from_weighing(rig.support(), &w));
    }
    let cg = Vec3::from_array(u.measured_cg_m);
    let home = rig.mount().home_pose();
    if let Some(m) = t.note(rig.with_measured_centre(u.measured_kg, cg, home, false)) {
        t.note(m.worst_wind(&Conditions::calm(home)));
    }
    // The load through a joint plane (the attachment-hardware check).
    if let Some(p) = t.note(rig.place(pose(u), Tilt::LEVEL, u.cover_fitted == 1)) {
        t.note(p.load_above(
            u.measured_cg_m[2],
            Vec3::new(0.0, 0.0, u.measured_cg_m[2]),
            u.wind_from_rad,
            0.5 * u.air_density_kg_per_m3 * u.gust_mps * u.gust_mps,
        ));
    }
}

fn guard_calls(t: &mut Tally, rig: &Rig, u: &Unknowns) {
    let start = Millis(u.start_ms);
    let Some(mut guard) = t.note(Guard::new(rig, GuardConfig::default(), start)) else {
        return;
    };
    for k in 0..u.guard_steps {
        let now = start.plus_ms(u64::from(k) * u64::from(u.sample_period_ms));
        // A gust that rises and falls over each 40 samples.
        let phase = (k % 40) as f32 / 40.0;
        let inputs = Inputs {
            accel_raw: Some(u.accel_g),
            wind: Some(WindSample {
                speed_mps: u.gust_mps * phase,
                from_rad: (k % 3 != 0).then_some(u.wind_from_rad),
            }),
            pose: (k % 5 == 0).then(|| pose(u)),
            cover_fitted: (k % 50 == 0).then_some(k % 100 == 0),
            air: (k % 20 == 0).then_some(AirSample {
                temperature_k: u.temperature_k,
                pressure_pa: u.pressure_pa,
            }),
        };
        black_box(guard.step(now, &inputs));
        t.ok = t.ok.saturating_add(1);
        if k % 97 == 96 {
            guard.acknowledge();
        }
    }
}

fn sensor_calls(t: &mut Tally, u: &Unknowns) {
    let start = Millis(u.start_ms);
    if let Some(mut tilt) = t.note(TiltSensor::new(TiltConfig::default(), start)) {
        for k in 0..u.guard_steps {
            let now = start.plus_ms(u64::from(k) * u64::from(u.sample_period_ms));
            t.note(tilt.push(now, u.accel_g));
        }
        let end = start.plus_ms(u64::from(u.guard_steps) * u64::from(u.sample_period_ms));
        black_box(tilt.tilt());
        black_box(tilt.faults(end));
        // The verdict's tilt reading, its angles and the chart's screen.
        let reading = black_box(tilt.reading());
        let other = TiltReading::of_specific_force(Vec3::from_array(black_box(u.accel_g)));
        if let (Some(r), Some(o)) = (reading, other) {
            black_box((r.tilt(), r.magnitude_rad(), r.downhill_azimuth_rad()));
            black_box(r.certainly_less_steep_than(&o));
            black_box(r.specific_force_g());
        }
    }
    if let Some(mut wind) = t.note(WindStats::new(WindConfig::default(), start)) {
        for k in 0..u.guard_steps {
            let now = start.plus_ms(u64::from(k) * u64::from(u.sample_period_ms));
            let speed = u.mean_wind_mps + (u.gust_mps - u.mean_wind_mps) * ((k % 9) as f32 / 8.0);
            t.note(wind.push(now, speed, Some(u.wind_from_rad)));
            if k % 16 == 0 {
                black_box(wind.report(now));
            }
        }
        let end = start.plus_ms(u64::from(u.guard_steps) * u64::from(u.sample_period_ms));
        black_box(wind.report(end));
        black_box(wind.faults(end));
    }
}

fn hardware_calls(t: &mut Tally, u: &Unknowns) {
    let Some(thread) = t.note(IsoThread::by_nominal_mm(u.thread_nominal_mm)) else {
        return;
    };
    let screw = Material::bolt_class_8_8(u.thread_nominal_mm);
    let input = StrippingInput {
        limits: thread.limits(),
        tensile_area_mm2: thread.tensile_stress_area_mm2(),
        engagement_mm: u.engagement_mm,
        screw,
        internal: AL_6061_T6_EXTRUSION_MIN,
        shear_factor: ShearFactor::CommonPractice,
        basis: StrengthBasis::Yield,
        safety_factor: u.safety_factor,
    };
    let load = t.note(ShaftLoad::counterweight(
        u.counterweight_kg,
        u.counterweight_distance_m,
        u.shaft_angle_rad,
    ));
    let (axial_n, moment_nm) = load.map_or((0.0, 0.0), |l| (l.axial_n, l.moment_nm));
    if let Some(strip) = t.note(check_stripping(&input)) {
        t.note(strip.utilisation(axial_n.max(0.0)));
    }
    let section = ShaftSection::threaded_root(&thread);
    t.note(check_shaft_bending(
        moment_nm,
        &section,
        &screw,
        StrengthBasis::Yield,
        u.safety_factor,
    ));
    let pattern = t.note(BoltPattern::circle(
        u.screws as usize,
        u.bolt_circle_radius_mm,
        0.0,
    ));
    if let (Some(pattern), Some(load)) = (pattern, load) {
        t.note(pattern.tensions(load.as_joint_load(), PivotLine::Centroid));
        t.note(pattern.tensions(
            load.as_joint_load(),
            PivotLine::Heel {
                offset_mm: u.bolt_circle_radius_mm * 1.2,
            },
        ));
    }
}
