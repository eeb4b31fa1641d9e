//! Drives `Guard::step` with arbitrary traces (the `arbitrary` crate
//! structures the bytes) and checks the guard's rules at every step with
//! `standfast_checks::guard_trace::check_trace`: a broken rule or a panic
//! is a crash. Pose forms, pier sides, any float (NaN and infinities
//! included), clocks that jump or go back, acknowledgements.

#![no_main]

use arbitrary::Arbitrary;
use libfuzzer_sys::fuzz_target;
use standfast::guard::{AirSample, Inputs, WindSample};
use standfast::mount::{PierSide, Pose};
use standfast_checks::guard_trace::{check_trace, config, rig, Step};

#[derive(Arbitrary, Debug)]
enum PoseIn {
    Axes(f32, f32),
    Equatorial(f32, f32, bool),
    Horizontal(f32, f32, bool),
}

#[derive(Arbitrary, Debug)]
struct StepIn {
    dt_ms: i32,
    accel: Option<[f32; 3]>,
    wind: Option<(f32, Option<f32>)>,
    pose: Option<PoseIn>,
    cover: Option<bool>,
    air: Option<(f32, f32)>,
    acknowledge: bool,
}

fn side(east: bool) -> PierSide {
    if east {
        PierSide::TubeEast
    } else {
        PierSide::TubeWest
    }
}

impl StepIn {
    /// The step, marked bad where a sample holds a NaN or an infinity, or a
    /// cover is reported on this coverless rig (always refused); other
    /// out-of-range values are left unmarked.
    fn step(&self) -> Step {
        let mut values: Vec<f32> = Vec::new();
        let pose = self.pose.as_ref().map(|p| match *p {
            PoseIn::Axes(a, b) => {
                values.extend([a, b]);
                Pose::Axes {
                    primary_rad: a,
                    secondary_rad: b,
                }
            }
            PoseIn::Equatorial(h, d, e) => {
                values.extend([h, d]);
                Pose::Equatorial {
                    hour_angle_rad: h,
                    declination_rad: d,
                    pier_side: side(e),
                }
            }
            PoseIn::Horizontal(a, l, e) => {
                values.extend([a, l]);
                Pose::Horizontal {
                    azimuth_rad: a,
                    altitude_rad: l,
                    pier_side: side(e),
                }
            }
        });
        if let Some(a) = self.accel {
            values.extend(a);
        }
        if let Some((v, d)) = self.wind {
            values.push(v);
            values.extend(d);
        }
        if let Some((t, p)) = self.air {
            values.extend([t, p]);
        }
        let bad = values.iter().any(|x| !x.is_finite()) || self.cover == Some(true);
        Step {
            dt_ms: i64::from(self.dt_ms),
            inputs: Inputs {
                accel_raw: self.accel,
                wind: self.wind.map(|(speed_mps, from_rad)| WindSample {
                    speed_mps,
                    from_rad,
                }),
                pose,
                cover_fitted: self.cover,
                air: self.air.map(|(celsius, pressure_pa)| AirSample {
                    temperature_k: standfast::air::celsius_to_kelvin(celsius),
                    pressure_pa,
                }),
            },
            acknowledge: self.acknowledge,
            bad,
        }
    }
}

fuzz_target!(|trace: Vec<StepIn>| {
    let rig = rig();
    let steps: Vec<Step> = trace.iter().take(400).map(StepIn::step).collect();
    if let Err(e) = check_trace(&rig, config(), &steps) {
        panic!("{e}");
    }
});
