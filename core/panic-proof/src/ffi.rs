//! The C ABI's exported functions (`core/ffi`), called as C would call them,
//! with the firmware example's rig image and every input read through
//! [`core::ptr::read_volatile`]: the image bytes and length, the storage
//! size, flags and codes (valid or not), samples and times.
#![allow(unsafe_code)]

use crate::exercise::Tally;
use crate::unknowns::Unknowns;
use core::hint::black_box;
use core::ptr;
use standfast_ffi::*;

/// The firmware example's invented rig as a rig image (the ffi tests' fixture).
static IMAGE: [u8; IMAGE_LEN] = *include_bytes!("../../ffi/tests/data/firmware-example-rig.sfri");
const IMAGE_LEN: usize = 380;

/// Codes, flags and sizes the compiler cannot know.
#[derive(Clone, Copy)]
#[repr(C)]
struct Codes {
    image_len: usize,
    storage_size: usize,
    flags: [u8; 8],
    pose_kind: u32,
    pier_side: u32,
    name_code: u32,
    directions: u32,
}

static CODES: Codes = Codes {
    image_len: IMAGE_LEN,
    storage_size: SF_GUARD_STORAGE_SIZE,
    flags: [1, 1, 1, 0, 1, 1, 0, 1],
    pose_kind: SF_POSE_EQUATORIAL,
    pier_side: SF_PIER_TUBE_EAST,
    name_code: SF_LEVEL_PARK_NOW,
    directions: 16,
};

#[repr(C, align(8))]
struct Storage([u8; SF_GUARD_STORAGE_SIZE]);

fn note(t: &mut Tally, s: SfStatus) {
    if black_box(s) == SF_OK {
        t.ok = t.ok.saturating_add(1);
    } else {
        t.err = t.err.saturating_add(1);
    }
}

/// Covered: [`sf_abi_version`], [`sf_rig_image_version`],
/// [`sf_guard_storage_size`], [`sf_guard_storage_align`], the `sf_sizeof_*`
/// functions, [`sf_guard_init`], [`sf_guard_step`] (in a loop, every input
/// group with unknown flags and codes), [`sf_guard_acknowledge`],
/// [`sf_assess`], every name function and [`sf_guard_fini`].
pub fn ffi_calls(t: &mut Tally, u: &Unknowns) {
    // SAFETY: valid, aligned, initialised statics of `Copy` types.
    let (image, c) = unsafe {
        (
            ptr::read_volatile(&raw const IMAGE),
            ptr::read_volatile(&raw const CODES),
        )
    };
    black_box((
        sf_abi_version(),
        sf_rig_image_version(),
        sf_guard_storage_size(),
        sf_guard_storage_align(),
    ));
    black_box((
        sf_sizeof_inputs(),
        sf_sizeof_verdict(),
        sf_sizeof_error(),
        sf_sizeof_assess_request(),
        sf_sizeof_assessment(),
    ));
    for n in [
        sf_level_name(c.name_code),
        sf_cause_name(c.name_code),
        sf_sensor_name(c.name_code),
        sf_fault_class_name(c.name_code),
        sf_event_kind_name(c.name_code),
        sf_status_name(c.name_code),
    ] {
        black_box(n);
    }
    let len = c.image_len.min(IMAGE_LEN);
    let mut storage = Storage([0; SF_GUARD_STORAGE_SIZE]);
    let mut guard: *mut SfGuard = ptr::null_mut();
    let mut err = SfError::NONE;
    // SAFETY: storage, image, out pointer and error are live locals of the
    // sizes passed (the storage size is capped at the storage's length).
    let s = unsafe {
        sf_guard_init(
            storage.0.as_mut_ptr(),
            c.storage_size.min(SF_GUARD_STORAGE_SIZE),
            image.as_ptr(),
            len,
            u.start_ms,
            &mut guard,
            &mut err,
        )
    };
    note(t, s);
    black_box(&err);
    let f = c.flags;
    let pose = SfPose {
        kind: c.pose_kind,
        a_rad: u.hour_angle_rad,
        b_rad: u.declination_rad,
        pier_side: c.pier_side,
    };
    let mut verdict = core::mem::MaybeUninit::<SfVerdict>::uninit();
    for k in 0..u.guard_steps {
        let phase = (k % 40) as f32 / 40.0;
        let inputs = SfInputs {
            has_accel: f[0],
            accel: u.accel_g,
            has_wind: f[1],
            wind_speed_mps: u.gust_mps * phase,
            has_wind_from: f[2] & u8::from(k % 3 != 0),
            wind_from_rad: u.wind_from_rad,
            has_pose: f[3] | u8::from(k % 5 == 0),
            pose,
            has_cover: f[4] & u8::from(k % 50 == 0),
            cover_fitted: f[5],
            has_air: f[6] | u8::from(k % 20 == 0),
            air_temperature_k: u.temperature_k,
            air_pressure_pa: u.pressure_pa,
        };
        let now = u
            .start_ms
            .saturating_add(u64::from(k) * u64::from(u.sample_period_ms));
        // SAFETY: `guard` is null or the guard in `storage`, which stays in
        // place; inputs, verdict and error are live locals.
        let s = unsafe { sf_guard_step(guard, now, &inputs, verdict.as_mut_ptr(), &mut err) };
        note(t, s);
        black_box(&verdict);
        if k % 97 == 96 {
            // SAFETY: as above.
            note(t, unsafe { sf_guard_acknowledge(guard) });
        }
    }
    let request = SfAssessRequest {
        has_pose: f[7],
        pose,
        cover_fitted: f[6],
        tilt_magnitude_rad: u.tilt_rad[0],
        tilt_downhill_azimuth_rad: u.tilt_rad[1],
        directions: c.directions,
        design_speed_mps: u.gust_mps,
        target_utilisation: 0.75,
        ballast_position_m: [0.0, 0.0, 0.4],
    };
    let mut assessment = core::mem::MaybeUninit::<SfAssessment>::uninit();
    // SAFETY: image, request, assessment and error are live locals.
    let s = unsafe {
        sf_assess(
            image.as_ptr(),
            len,
            &request,
            assessment.as_mut_ptr(),
            &mut err,
        )
    };
    note(t, s);
    black_box(&assessment);
    // SAFETY: as for the step.
    note(t, unsafe { sf_guard_fini(guard) });
}
