//! Feeds arbitrary bytes to the rig image reader of the C ABI (`core/ffi`):
//! `image::decode` directly, and `sf_guard_init` (with one step and
//! `sf_guard_fini` when it succeeds) as a C caller would. Any status is
//! fine; a panic, a sanitizer report or a broken rule is a crash. Rule: a
//! decoded image encodes back to exactly the same bytes (the format has one
//! encoding per value).

#![no_main]

use libfuzzer_sys::fuzz_target;
use standfast_ffi::image::{self, IMAGE_MAX_BYTES};
use standfast_ffi::*;

#[repr(C, align(16))]
struct Storage([u8; SF_GUARD_STORAGE_SIZE]);

fuzz_target!(|data: &[u8]| {
    if let Ok(img) = image::decode(data) {
        let mut buf = vec![0u8; IMAGE_MAX_BYTES];
        let n = image::encode(&img, &mut buf).expect("a decoded image encodes");
        assert_eq!(&buf[..n], data, "decode then encode gave other bytes");
    }
    let storage = Box::into_raw(Box::new(Storage([0; SF_GUARD_STORAGE_SIZE])));
    let mut guard: *mut SfGuard = std::ptr::null_mut();
    let mut err = SfError::NONE;
    // SAFETY: the storage is a live, aligned allocation of the size given;
    // data, guard and err are live for the call.
    let st = unsafe {
        sf_guard_init(
            storage.cast::<u8>(),
            SF_GUARD_STORAGE_SIZE,
            data.as_ptr(),
            data.len(),
            0,
            &mut guard,
            &mut err,
        )
    };
    assert_eq!(st, err.code);
    if st == SF_OK {
        let inputs = SfInputs {
            has_accel: 1,
            accel: [0.0, 0.0, 1.0],
            has_wind: 1,
            wind_speed_mps: 5.0,
            has_wind_from: 1,
            wind_from_rad: 1.0,
            has_pose: 0,
            pose: SfPose {
                kind: SF_POSE_AXES,
                a_rad: 0.0,
                b_rad: 0.0,
                pier_side: SF_PIER_TUBE_EAST,
            },
            has_cover: 0,
            cover_fitted: 0,
            has_air: 0,
            air_temperature_k: 0.0,
            air_pressure_pa: 0.0,
        };
        let mut verdict = std::mem::MaybeUninit::<SfVerdict>::uninit();
        // SAFETY: guard is the live guard in `storage`; the rest are locals.
        let st = unsafe { sf_guard_step(guard, 0, &inputs, verdict.as_mut_ptr(), &mut err) };
        assert_eq!(st, SF_OK);
        // SAFETY: as above.
        assert_eq!(unsafe { sf_guard_fini(guard) }, SF_OK);
    }
    // SAFETY: allocated above by Box::into_raw, freed once.
    drop(unsafe { Box::from_raw(storage) });
});
