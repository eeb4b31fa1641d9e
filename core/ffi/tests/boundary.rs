//! The C ABI at its boundary: null and misaligned pointers, wrong storage
//! size, damaged or foreign rig images, out-of-range values and codes, and
//! handles that are not (or no longer) guards; each must give its
//! documented status code and never undefined behaviour. Also run under
//! Miri: `cargo +nightly miri test -p standfast-ffi` (core/ffi/README.md).
//!
//! The reference for "the same errors as the Rust API" is the core itself:
//! every expectation below that concerns a value is computed by calling the
//! core's Rust API on the same data.

// A test of an unsafe C interface: every call is unsafe by nature, many on
// purpose with wrong pointers (which the functions must refuse without
// touching them); failures panic, as tests do.
#![allow(
    clippy::undocumented_unsafe_blocks,
    clippy::unwrap_used,
    clippy::indexing_slicing,
    clippy::cast_precision_loss
)]

use std::ffi::CStr;
use std::ptr;

use standfast::guard::{Guard, GuardConfig, Inputs, WindSample};
use standfast::rig::Rig;
use standfast::sense::Millis;
use standfast_ffi::image::{self, RigImage, IMAGE_MAX_BYTES};
use standfast_ffi::*;

/// The firmware example's invented rig as a rig image (see tests/data/README.md).
const IMAGE: &[u8] = include_bytes!("data/firmware-example-rig.sfri");

/// Guard storage with the alignment the library asks for.
#[repr(C, align(16))]
struct Storage([u8; SF_GUARD_STORAGE_SIZE + 16]);

/// The storage as C holds it: one raw pointer, from which every use is
/// derived (a fresh `&mut` to the buffer would, for Miri, invalidate the
/// guard's pointer into it, as a C caller writing to it would break it).
struct Mem(*mut u8);

impl Mem {
    fn ptr(&self) -> *mut u8 {
        self.0
    }
}

impl Drop for Mem {
    fn drop(&mut self) {
        drop(unsafe { Box::from_raw(self.0.cast::<Storage>()) });
    }
}

fn storage() -> Mem {
    Mem(Box::into_raw(Box::new(Storage([0; SF_GUARD_STORAGE_SIZE + 16]))).cast::<u8>())
}

fn decoded() -> RigImage {
    image::decode(IMAGE).unwrap()
}

fn encoded(img: &RigImage) -> Vec<u8> {
    let mut buf = vec![0u8; IMAGE_MAX_BYTES];
    let n = image::encode(img, &mut buf).unwrap();
    buf.truncate(n);
    buf
}

/// Initialises a guard from `image`; returns the status, the error and the guard.
fn init(s: &Mem, image: &[u8]) -> (SfStatus, SfError, *mut SfGuard) {
    let mut g: *mut SfGuard = ptr::null_mut();
    let mut e = SfError::NONE;
    let st = unsafe {
        sf_guard_init(
            s.ptr(),
            SF_GUARD_STORAGE_SIZE,
            image.as_ptr(),
            image.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    (st, e, g)
}

fn no_inputs() -> SfInputs {
    SfInputs {
        has_accel: 0,
        accel: [0.0; 3],
        has_wind: 0,
        wind_speed_mps: 0.0,
        has_wind_from: 0,
        wind_from_rad: 0.0,
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
    }
}

fn level_calm() -> SfInputs {
    SfInputs {
        has_accel: 1,
        accel: [0.0, 0.0, 1.0],
        has_wind: 1,
        wind_speed_mps: 2.0,
        has_wind_from: 1,
        wind_from_rad: 1.0,
        ..no_inputs()
    }
}

fn step(g: *mut SfGuard, now: u64, i: &SfInputs) -> (SfStatus, SfError, Box<SfVerdict>) {
    let mut v: Box<SfVerdict> = Box::new(unsafe { std::mem::zeroed() });
    let mut e = SfError::NONE;
    let st = unsafe { sf_guard_step(g, now, i, &mut *v, &mut e) };
    (st, e, v)
}

fn name(p: *const std::ffi::c_char) -> &'static str {
    unsafe { CStr::from_ptr(p) }.to_str().unwrap()
}

#[test]
fn version_sizes_and_names() {
    assert_eq!(sf_abi_version(), SF_ABI_VERSION);
    assert_eq!(sf_rig_image_version(), u32::from(image::IMAGE_VERSION));
    assert_eq!(sf_guard_storage_size(), SF_GUARD_STORAGE_SIZE);
    assert_eq!(sf_guard_storage_align(), SF_GUARD_STORAGE_ALIGN);
    assert_eq!(sf_sizeof_verdict(), std::mem::size_of::<SfVerdict>());
    assert_eq!(name(sf_level_name(SF_LEVEL_PARK_NOW)), "park_now");
    assert_eq!(name(sf_cause_name(SF_CAUSE_ACKNOWLEDGED)), "acknowledged");
    assert_eq!(
        name(sf_sensor_name(SF_SENSOR_WIND_DIRECTION)),
        "wind_direction"
    );
    assert_eq!(name(sf_fault_class_name(SF_FAULT_TILT_STEP)), "tilt_step");
    assert_eq!(
        name(sf_event_kind_name(SF_EVENT_FAULT_RAISED)),
        "fault_raised"
    );
    assert_eq!(
        name(sf_status_name(SF_ERR_IMAGE_CHECKSUM)),
        "image_checksum"
    );
    for bad in [5, 1000, u32::MAX] {
        assert_eq!(name(sf_level_name(bad)), "unknown");
    }
    assert_eq!(name(sf_status_name(u32::MAX)), "unknown");
}

#[test]
fn init_step_acknowledge_fini() {
    let s = storage();
    let (st, e, g) = init(&s, IMAGE);
    assert_eq!(st, SF_OK, "{}", e.field_str());
    assert_eq!(e.code, SF_OK);
    assert_eq!(g.cast::<u8>(), s.ptr());
    // A guard starts fail safe: park and alarm until it has judged the rig.
    let (st, _, v) = step(g, 0, &level_calm());
    assert_eq!(st, SF_OK);
    assert_eq!(v.now_ms, 0);
    assert_eq!(v.level, SF_LEVEL_SENSOR_FAULT);
    assert_eq!((v.park, v.alarm), (1, 1));
    // A level rig in a light breeze reaches clear (the example rig's fault
    // clearing time and dwell are 10 s and 20 s).
    let mut clear_at = None;
    for k in 1..=60u64 {
        let (st, _, v) = step(g, k * 1000, &level_calm());
        assert_eq!(st, SF_OK);
        if v.level == SF_LEVEL_CLEAR {
            assert_eq!((v.park, v.alarm), (0, 0));
            clear_at = Some(k);
            break;
        }
    }
    assert!(clear_at.is_some(), "a calm level rig never reached clear");
    assert_eq!(unsafe { sf_guard_acknowledge(g) }, SF_OK);
    assert_eq!(unsafe { sf_guard_fini(g) }, SF_OK);
    // Finished: every call refuses the handle, the verdict asserts park and alarm.
    let (st, e, v) = step(g, 100, &level_calm());
    assert_eq!(st, SF_ERR_BAD_HANDLE);
    assert_eq!(e.code, SF_ERR_BAD_HANDLE);
    assert_eq!((v.park, v.alarm, v.level), (1, 1, SF_LEVEL_SENSOR_FAULT));
    assert_eq!(unsafe { sf_guard_fini(g) }, SF_ERR_BAD_HANDLE);
    assert_eq!(unsafe { sf_guard_acknowledge(g) }, SF_ERR_BAD_HANDLE);
}

#[test]
fn never_initialised_storage_is_not_a_guard() {
    let s = storage();
    let g = s.ptr().cast::<SfGuard>();
    assert_eq!(step(g, 0, &no_inputs()).0, SF_ERR_BAD_HANDLE);
    assert_eq!(unsafe { sf_guard_acknowledge(g) }, SF_ERR_BAD_HANDLE);
}

#[test]
fn null_pointers() {
    let s = storage();
    let mut g: *mut SfGuard = ptr::null_mut();
    let mut e = SfError::NONE;
    let st = unsafe {
        sf_guard_init(
            ptr::null_mut(),
            SF_GUARD_STORAGE_SIZE,
            IMAGE.as_ptr(),
            IMAGE.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "storage"));
    let st = unsafe {
        sf_guard_init(
            s.ptr(),
            SF_GUARD_STORAGE_SIZE,
            ptr::null(),
            IMAGE.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "image"));
    let st = unsafe {
        sf_guard_init(
            s.ptr(),
            SF_GUARD_STORAGE_SIZE,
            IMAGE.as_ptr(),
            IMAGE.len(),
            0,
            ptr::null_mut(),
            &mut e,
        )
    };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "out_guard"));
    // A null error pointer is allowed: the status alone comes back.
    let st = unsafe {
        sf_guard_init(
            ptr::null_mut(),
            0,
            ptr::null(),
            0,
            0,
            ptr::null_mut(),
            ptr::null_mut(),
        )
    };
    assert_eq!(st, SF_ERR_NULL_POINTER);

    let (st, _, g) = init(&s, IMAGE);
    assert_eq!(st, SF_OK);
    let (st, e2, v) = step(ptr::null_mut(), 0, &no_inputs());
    assert_eq!((st, e2.field_str()), (SF_ERR_NULL_POINTER, "guard"));
    assert_eq!((v.park, v.alarm), (1, 1));
    let mut v: Box<SfVerdict> = Box::new(unsafe { std::mem::zeroed() });
    let st = unsafe { sf_guard_step(g, 0, ptr::null(), &mut *v, &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "inputs"));
    assert_eq!((v.park, v.alarm, v.level), (1, 1, SF_LEVEL_SENSOR_FAULT));
    let st = unsafe { sf_guard_step(g, 0, &no_inputs(), ptr::null_mut(), &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "out"));
    assert_eq!(
        unsafe { sf_guard_fini(ptr::null_mut()) },
        SF_ERR_NULL_POINTER
    );
    assert_eq!(
        unsafe { sf_guard_acknowledge(ptr::null_mut()) },
        SF_ERR_NULL_POINTER
    );
    // The guard was never stepped by the refused calls: its first step
    // equals a fresh guard's.
    let (st, _, v) = step(g, 0, &level_calm());
    let fresh = storage();
    let (_, _, g2) = init(&fresh, IMAGE);
    let (_, _, v2) = step(g2, 0, &level_calm());
    assert_eq!(st, SF_OK);
    assert_eq!(format!("{v:?}"), format!("{v2:?}"));

    let q = request();
    let mut a: Box<SfAssessment> = Box::new(unsafe { std::mem::zeroed() });
    let st = unsafe { sf_assess(ptr::null(), 10, &q, &mut *a, &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "image"));
    let st = unsafe { sf_assess(IMAGE.as_ptr(), IMAGE.len(), ptr::null(), &mut *a, &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "request"));
    let st = unsafe { sf_assess(IMAGE.as_ptr(), IMAGE.len(), &q, ptr::null_mut(), &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_NULL_POINTER, "out"));
}

#[test]
fn misaligned_pointers() {
    let s = storage();
    let mut g: *mut SfGuard = ptr::null_mut();
    let mut e = SfError::NONE;
    let st = unsafe {
        sf_guard_init(
            s.ptr().wrapping_add(1),
            SF_GUARD_STORAGE_SIZE,
            IMAGE.as_ptr(),
            IMAGE.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    assert_eq!((st, e.field_str()), (SF_ERR_MISALIGNED, "storage"));
    assert!(g.is_null());

    let (st, _, g) = init(&s, IMAGE);
    assert_eq!(st, SF_OK);
    // Pointers one byte off their type's alignment: refused before any read.
    #[repr(C, align(8))]
    struct Raw([u8; 4096]);
    let mut raw = Box::new(Raw([0; 4096]));
    let off = raw.0.as_mut_ptr().wrapping_add(1);
    let mut v: Box<SfVerdict> = Box::new(unsafe { std::mem::zeroed() });
    let st = unsafe { sf_guard_step(g, 0, off.cast::<SfInputs>(), &mut *v, &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_MISALIGNED, "inputs"));
    let st = unsafe { sf_guard_step(g, 0, &no_inputs(), off.cast::<SfVerdict>(), &mut e) };
    assert_eq!((st, e.field_str()), (SF_ERR_MISALIGNED, "out"));
    let (st, e, _) = step(
        g.cast::<u8>().wrapping_add(4).cast::<SfGuard>(),
        0,
        &no_inputs(),
    );
    assert_eq!((st, e.field_str()), (SF_ERR_MISALIGNED, "guard"));
    // A misaligned error pointer is not written; the status still comes back.
    let st = unsafe { sf_guard_step(g, 0, off.cast::<SfInputs>(), &mut *v, off.cast::<SfError>()) };
    assert_eq!(st, SF_ERR_MISALIGNED);
    assert!(raw.0.iter().all(|&b| b == 0));
}

#[test]
fn storage_too_small() {
    let s = storage();
    let mut g: *mut SfGuard = ptr::null_mut();
    let mut e = SfError::NONE;
    let st = unsafe {
        sf_guard_init(
            s.ptr(),
            SF_GUARD_STORAGE_SIZE - 1,
            IMAGE.as_ptr(),
            IMAGE.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    assert_eq!(st, SF_ERR_STORAGE_TOO_SMALL);
    assert_eq!(e.field_str(), "storage_size");
    assert_eq!(e.value, (SF_GUARD_STORAGE_SIZE - 1) as f32);
    assert_eq!(e.min, SF_GUARD_STORAGE_SIZE as f32);
    assert!(g.is_null());
}

/// `bytes` with its header's CRC recomputed (so only the intended damage shows).
fn resealed(mut bytes: Vec<u8>) -> Vec<u8> {
    let mut covered = bytes[..12].to_vec();
    covered.extend_from_slice(&bytes[16..]);
    let crc = image::crc32(&covered);
    bytes[12..16].copy_from_slice(&crc.to_le_bytes());
    bytes
}

#[test]
fn damaged_and_foreign_images() {
    let s = storage();
    let status = |s: &Mem, b: &[u8]| {
        let (st, e, g) = init(s, b);
        assert!(g.is_null());
        (st, e)
    };
    // One payload bit flipped: the CRC catches it.
    let mut b = IMAGE.to_vec();
    b[40] ^= 0x10;
    assert_eq!(status(&s, &b).0, SF_ERR_IMAGE_CHECKSUM);
    // A header bit flipped (payload size): CRC or size.
    let mut b = IMAGE.to_vec();
    b[8] ^= 0x01;
    assert!(matches!(
        status(&s, &b).0,
        SF_ERR_IMAGE_TRUNCATED | SF_ERR_IMAGE_SIZE
    ));
    // Another format version, correctly sealed: refused by version.
    let ours = f32::from(image::IMAGE_VERSION);
    for other in [image::IMAGE_VERSION - 1, image::IMAGE_VERSION + 1] {
        let mut b = IMAGE.to_vec();
        b[4..6].copy_from_slice(&other.to_le_bytes());
        let (st, e) = status(&s, &resealed(b));
        assert_eq!(st, SF_ERR_IMAGE_VERSION);
        assert_eq!((e.value, e.min, e.max), (f32::from(other), ours, ours));
    }
    // Not an image at all.
    let mut b = IMAGE.to_vec();
    b[0] = b'X';
    assert_eq!(status(&s, &b).0, SF_ERR_IMAGE_MAGIC);
    // Truncated, empty, or with bytes after the payload.
    assert_eq!(
        status(&s, &IMAGE[..IMAGE.len() - 1]).0,
        SF_ERR_IMAGE_TRUNCATED
    );
    assert_eq!(status(&s, &IMAGE[..10]).0, SF_ERR_IMAGE_TRUNCATED);
    assert_eq!(status(&s, &[]).0, SF_ERR_IMAGE_TRUNCATED);
    let mut b = IMAGE.to_vec();
    b.push(0);
    assert_eq!(status(&s, &b).0, SF_ERR_IMAGE_SIZE);
    // Longer than any image may be.
    let big = vec![0u8; SF_RIG_IMAGE_MAX_BYTES + 1];
    assert_eq!(status(&s, &big).0, SF_ERR_IMAGE_SIZE);
    // A payload that is not a rig (an option tag of 7), correctly sealed.
    let mut p = IMAGE.to_vec();
    // The first byte after the three feet is the legs' option tag.
    let legs_tag = 16 + 2 + 3 * 12;
    assert_eq!(p[legs_tag], 1, "the example rig has legs");
    p[legs_tag] = 7;
    let (st, e) = status(&s, &resealed(p));
    assert_eq!(
        (st, e.field_str()),
        (SF_ERR_IMAGE_PAYLOAD, "rig_image.payload")
    );
    // And the intact image still works in the same storage.
    assert_eq!(init(&s, IMAGE).0, SF_OK);
}

#[test]
fn out_of_range_rig_values_give_the_core_error() {
    let s = storage();
    // A friction coefficient the core refuses.
    let mut img = decoded();
    img.spec.friction_coefficient = -0.5;
    let want = Rig::new(&img.spec).unwrap_err();
    let (st, e, g) = init(&s, &encoded(&img));
    assert!(g.is_null());
    assert_eq!(e, SfError::from_core(&want));
    assert_eq!(st, SF_ERR_OUT_OF_RANGE);
    assert_eq!(e.field_str(), want.field.path());
    assert_eq!((e.value, e.min, e.max), (want.value, want.min, want.max));
    // A body mass that is not a number, in a list: the index comes through.
    let mut img = decoded();
    img.spec.bodies[0].mass_kg = f32::NAN;
    let want = Rig::new(&img.spec).unwrap_err();
    let (st, e, _) = init(&s, &encoded(&img));
    assert_eq!(st, SF_ERR_NOT_FINITE);
    assert_eq!(e.field_str(), want.field.path());
    assert_eq!(e.has_index, 1);
    assert_eq!(Some(e.index), want.index);
    // A guard setting the core refuses.
    let mut img = decoded();
    img.guard.dwell_s = -1.0;
    let want = img.guard.validate().unwrap_err();
    let (st, e, _) = init(&s, &encoded(&img));
    assert_eq!(
        (st, e.field_str()),
        (SF_ERR_OUT_OF_RANGE, want.field.path())
    );
    // Air denser than any on Earth.
    let mut img = decoded();
    img.air_density_kg_per_m3 = 50.0;
    let want = standfast::air::Air::from_density(50.0).unwrap_err();
    let (st, e, _) = init(&s, &encoded(&img));
    assert_eq!(
        (st, e.field_str()),
        (SF_ERR_OUT_OF_RANGE, want.field.path())
    );
    // A failed init leaves no guard behind in storage that held one.
    let (st, _, g) = init(&s, IMAGE);
    assert_eq!(st, SF_OK);
    let mut img = decoded();
    img.guard.dwell_s = -1.0;
    assert_eq!(init(&s, &encoded(&img)).0, SF_ERR_OUT_OF_RANGE);
    assert_eq!(step(g, 0, &no_inputs()).0, SF_ERR_BAD_HANDLE);
}

#[test]
fn bad_flags_and_codes_are_refused_without_a_step() {
    let s = storage();
    let (_, _, g) = init(&s, IMAGE);
    let cases: [(SfInputs, &str, f32, f32); 7] = [
        (
            SfInputs {
                has_wind: 2,
                ..no_inputs()
            },
            "inputs.has_wind",
            2.0,
            1.0,
        ),
        (
            SfInputs {
                has_accel: 255,
                ..no_inputs()
            },
            "inputs.has_accel",
            255.0,
            1.0,
        ),
        (
            SfInputs {
                has_wind: 1,
                has_wind_from: 9,
                ..no_inputs()
            },
            "inputs.has_wind_from",
            9.0,
            1.0,
        ),
        (
            SfInputs {
                has_cover: 1,
                cover_fitted: 3,
                ..no_inputs()
            },
            "inputs.cover_fitted",
            3.0,
            1.0,
        ),
        (
            SfInputs {
                has_air: 7,
                ..no_inputs()
            },
            "inputs.has_air",
            7.0,
            1.0,
        ),
        (
            SfInputs {
                has_pose: 1,
                pose: SfPose {
                    kind: 3,
                    ..no_inputs().pose
                },
                ..no_inputs()
            },
            "inputs.pose.kind",
            3.0,
            2.0,
        ),
        (
            SfInputs {
                has_pose: 1,
                pose: SfPose {
                    pier_side: 2,
                    ..no_inputs().pose
                },
                ..no_inputs()
            },
            "inputs.pose.pier_side",
            2.0,
            1.0,
        ),
    ];
    for (i, field, value, max) in cases {
        let (st, e, v) = step(g, 5, &i);
        assert_eq!(st, SF_ERR_OUT_OF_RANGE, "{field}");
        assert_eq!(e.field_str(), field);
        assert_eq!((e.value, e.min, e.max), (value, 0.0, max));
        assert_eq!(
            (v.park, v.alarm, v.level, v.now_ms),
            (1, 1, SF_LEVEL_SENSOR_FAULT, 5)
        );
        assert_eq!(v.event_count, 0);
    }
    // Ignored groups are not read: garbage behind a 0 flag is fine.
    let i = SfInputs {
        has_pose: 0,
        pose: SfPose {
            kind: 99,
            pier_side: 99,
            a_rad: f32::NAN,
            b_rad: f32::NAN,
        },
        has_cover: 0,
        cover_fitted: 200,
        ..level_calm()
    };
    assert_eq!(step(g, 0, &i).0, SF_OK);
}

/// Bad sample values are the guard's business, not errors: the C verdict
/// must equal the Rust guard's, converted, for the same inputs.
#[test]
fn bad_samples_become_the_same_faults_as_in_rust() {
    let img = decoded();
    let rig = Rig::new(&img.spec).unwrap();
    let mut rust = Guard::new(&rig, img.guard.clone(), Millis(0)).unwrap();
    rust.set_air(standfast::air::Air::from_density(img.air_density_kg_per_m3).unwrap());
    let s = storage();
    let (_, _, g) = init(&s, IMAGE);
    let seq: Vec<(u64, SfInputs)> = vec![
        (0, level_calm()),
        (
            100,
            SfInputs {
                wind_speed_mps: f32::NAN,
                ..level_calm()
            },
        ),
        (
            200,
            SfInputs {
                wind_speed_mps: -3.0,
                ..level_calm()
            },
        ),
        (
            300,
            SfInputs {
                accel: [f32::INFINITY, 0.0, 1.0],
                ..level_calm()
            },
        ),
        (250, level_calm()), // time went backwards
        (
            1_300,
            SfInputs {
                has_pose: 1,
                pose: SfPose {
                    kind: SF_POSE_EQUATORIAL,
                    a_rad: 0.3,
                    b_rad: 0.2,
                    pier_side: 1,
                },
                has_cover: 1,
                cover_fitted: 1,
                has_air: 1,
                air_temperature_k: 283.15,
                air_pressure_pa: 95_000.0,
                ..level_calm()
            },
        ),
        (
            2_300,
            SfInputs {
                has_wind_from: 0,
                wind_speed_mps: 30.0,
                ..level_calm()
            },
        ),
    ];
    for (now, i) in &seq {
        let rust_inputs = Inputs {
            accel_raw: (i.has_accel == 1).then_some(i.accel),
            wind: (i.has_wind == 1).then_some(WindSample {
                speed_mps: i.wind_speed_mps,
                from_rad: (i.has_wind_from == 1).then_some(i.wind_from_rad),
            }),
            pose: (i.has_pose == 1).then_some(standfast::mount::Pose::Equatorial {
                hour_angle_rad: i.pose.a_rad,
                declination_rad: i.pose.b_rad,
                pier_side: standfast::mount::PierSide::TubeWest,
            }),
            cover_fitted: (i.has_cover == 1).then_some(i.cover_fitted == 1),
            air: (i.has_air == 1).then_some(standfast::guard::AirSample {
                temperature_k: i.air_temperature_k,
                pressure_pa: i.air_pressure_pa,
            }),
        };
        let want = sf_verdict(&rust.step(Millis(*now), &rust_inputs));
        let (st, _, v) = step(g, *now, i);
        assert_eq!(st, SF_OK);
        // Compare bit patterns: NaN figures must be NaN on both sides.
        let bytes = |v: &SfVerdict| format!("{v:?}");
        assert_eq!(bytes(&v), bytes(&want), "at {now} ms");
    }
}

fn request() -> SfAssessRequest {
    SfAssessRequest {
        has_pose: 0,
        pose: no_inputs().pose,
        cover_fitted: 0,
        tilt_magnitude_rad: 0.0,
        tilt_downhill_azimuth_rad: 0.0,
        directions: 8,
        design_speed_mps: 25.0,
        target_utilisation: 0.75,
        ballast_position_m: [0.0, 0.0, 0.3],
    }
}

fn assess(q: &SfAssessRequest) -> (SfStatus, SfError, Box<SfAssessment>) {
    let mut a: Box<SfAssessment> = Box::new(unsafe { std::mem::zeroed() });
    let mut e = SfError::NONE;
    let st = unsafe { sf_assess(IMAGE.as_ptr(), IMAGE.len(), q, &mut *a, &mut e) };
    (st, e, a)
}

#[test]
#[cfg_attr(miri, ignore = "hundreds of direction scans: hours under Miri")]
fn assessment_matches_the_rust_api() {
    let img = decoded();
    let rig = Rig::new(&img.spec).unwrap();
    let air = standfast::air::Air::from_density(img.air_density_kg_per_m3).unwrap();
    let mut c = standfast::rig::Conditions::calm(rig.mount().home_pose());
    c.air = air;
    let (st, e, a) = assess(&request());
    assert_eq!(st, SF_OK, "{}", e.field_str());
    assert_eq!(a.directions, 8);
    let worst = rig.worst_wind(&c).unwrap();
    assert_eq!(a.lowest_tip_wind_mps.has_value, 1);
    assert_eq!(Some(a.lowest_tip_wind_mps.value), worst.tip_wind_mps);
    assert_eq!(a.lowest_from_rad, worst.from_rad);
    for (k, t) in a.tip_wind_mps.iter().take(8).enumerate() {
        let from = k as f32 * (std::f32::consts::TAU / 8.0);
        let want = rig
            .stability_figures(&standfast::rig::Conditions {
                wind_from_rad: from,
                ..c
            })
            .unwrap()
            .tip_wind_mps;
        assert_eq!(t.has_value == 1, want.is_some());
        if let Some(w) = want {
            assert_eq!(t.value, w);
            // The lowest over a fine scan is no higher than any listed direction.
            assert!(a.lowest_tip_wind_mps.value <= w * 1.0001);
        }
    }
    assert!(a.tip_wind_mps[8..].iter().all(|t| t.has_value == 0));
    let b = rig
        .ballast_needed(&c, 25.0, 0.75, standfast::Vec3::new(0.0, 0.0, 0.3))
        .unwrap();
    assert_eq!(
        (a.ballast_kg, a.ballast_worst_from_rad),
        (b.mass_kg, b.worst_from_rad)
    );
}

/// Every refusal comes before the scans, so this runs under Miri too.
#[test]
fn assessment_checks_its_request() {
    for (q, code, field) in [
        (
            SfAssessRequest {
                directions: 0,
                ..request()
            },
            SF_ERR_OUT_OF_RANGE,
            "request.directions",
        ),
        (
            SfAssessRequest {
                directions: SF_MAX_DIRECTIONS as u32 + 1,
                ..request()
            },
            SF_ERR_OUT_OF_RANGE,
            "request.directions",
        ),
        (
            SfAssessRequest {
                cover_fitted: 2,
                ..request()
            },
            SF_ERR_OUT_OF_RANGE,
            "request.cover_fitted",
        ),
        (
            SfAssessRequest {
                target_utilisation: 1.5,
                ..request()
            },
            SF_ERR_OUT_OF_RANGE,
            "ballast_sizing.target_utilisation",
        ),
        (
            SfAssessRequest {
                design_speed_mps: f32::NAN,
                ..request()
            },
            SF_ERR_NOT_FINITE,
            "ballast_sizing.design_speed_mps",
        ),
        (
            SfAssessRequest {
                ballast_position_m: [3.0, 0.0, 0.3],
                ..request()
            },
            SF_ERR_UNREACHABLE,
            "ballast.position_m",
        ),
        (
            SfAssessRequest {
                has_pose: 1,
                pose: SfPose {
                    kind: 5,
                    ..request().pose
                },
                ..request()
            },
            SF_ERR_OUT_OF_RANGE,
            "request.pose.kind",
        ),
    ] {
        let (st, e, _) = assess(&q);
        assert_eq!((st, e.field_str()), (code, field));
    }
    // A tilt beyond the model's limit: the core's own error.
    let want = standfast::Tilt::new(2.0, 0.0).unwrap_err();
    let (st, e, _) = assess(&SfAssessRequest {
        tilt_magnitude_rad: 2.0,
        ..request()
    });
    assert_eq!(
        (st, e.field_str()),
        (SF_ERR_OUT_OF_RANGE, want.field.path())
    );
}

#[test]
fn error_field_is_nul_terminated_and_truncated() {
    let long = "x".repeat(200);
    let e = SfError::of(SF_ERR_OUT_OF_RANGE, &long);
    assert_eq!(e.field[SF_FIELD_BYTES - 1], 0);
    assert_eq!(e.field_str().len(), SF_FIELD_BYTES - 1);
    // Cut at a character boundary, never inside one.
    let e = SfError::of(SF_ERR_OUT_OF_RANGE, &"é".repeat(40));
    assert!(e.field_str().chars().all(|c| c == 'é'));
}

#[test]
fn guard_config_default_round_trips_through_an_image() {
    let mut img = decoded();
    img.guard = GuardConfig::default();
    let b = encoded(&img);
    assert_eq!(image::decode(&b).unwrap(), img);
}

#[cfg(feature = "std")]
#[test]
fn heap_convenience() {
    let mut e = SfError::NONE;
    let g = unsafe { sf_guard_new(IMAGE.as_ptr(), IMAGE.len(), 0, &mut e) };
    assert!(!g.is_null());
    assert_eq!(step(g, 0, &level_calm()).0, SF_OK);
    assert_eq!(unsafe { sf_guard_free(g) }, SF_OK);
    let g = unsafe { sf_guard_new(IMAGE.as_ptr(), 3, 0, &mut e) };
    assert!(g.is_null());
    assert_eq!(e.code, SF_ERR_IMAGE_TRUNCATED);
    assert_eq!(unsafe { sf_guard_free(ptr::null_mut()) }, SF_OK);
}
