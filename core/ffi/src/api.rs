//! The exported functions. Each checks every pointer (null, alignment) and
//! every boundary value before it touches the core, returns an
//! [`SfStatus`](crate::SfStatus) and, when the caller passes an
//! [`SfError`], fills it. Nothing here can panic (the link-time proof in
//! `core/panic-proof` covers these functions) and an `extern "C"` function
//! aborts rather than unwind in any case.

use core::ffi::c_char;
use core::mem::{align_of, size_of};
use core::ptr::{self, addr_of, addr_of_mut};

use standfast::air::Air;
use standfast::guard::{AirSample, Event, Guard, Inputs, Verdict, WindSample, MAX_EVENTS};
use standfast::mount::{PierSide, Pose};
use standfast::rig::{Conditions, Rig};
use standfast::sense::{Fault, Millis, FAULT_SET_CAPACITY};
use standfast::{Error, Tilt, Vec3};

use crate::codes::*;
use crate::image::{self, ImageError, IMAGE_MAX_BYTES, IMAGE_VERSION};
use crate::types::*;

/// The ABI version: raised on every change of the header that is not a
/// comment (a type's layout, a function's signature, a code's meaning, a
/// new code or function). A caller compares [`sf_abi_version`] with the
/// `SF_ABI_VERSION` of the header it was compiled with and refuses to run on
/// a mismatch.
pub const SF_ABI_VERSION: u32 = 2;
/// The rig image format version this library reads (see `image`).
pub const SF_RIG_IMAGE_VERSION: u32 = 2;
/// Largest rig image accepted, bytes.
pub const SF_RIG_IMAGE_MAX_BYTES: usize = 16384;
/// Bytes of caller storage a guard needs (checked at run time). Holds the
/// validated rig and the guard's state on any supported target.
pub const SF_GUARD_STORAGE_SIZE: usize = 12288;
/// Alignment, in bytes, the guard storage must have.
pub const SF_GUARD_STORAGE_ALIGN: usize = 8;

/// An initialised guard, living in caller storage. Opaque to C; a pointer to
/// it is the storage's address.
pub struct SfGuard {
    _opaque: [u8; 0],
}

/// What lives in the storage: the rig and the guard that borrows it. The
/// guard's `'static` is a promise the caller keeps: the storage stays in
/// place, untouched, until `sf_guard_fini` (see the README, "Ownership").
#[repr(C)]
struct Handle {
    magic: u32,
    rig: Rig,
    guard: Guard<'static>,
}

/// Written last by a successful init, cleared by fini: a best-effort check
/// that a pointer is an initialised guard ("SFG1").
const HANDLE_MAGIC: u32 = 0x5346_4731;

const _: () = {
    assert!(size_of::<Handle>() <= SF_GUARD_STORAGE_SIZE);
    assert!(align_of::<Handle>() <= SF_GUARD_STORAGE_ALIGN);
    assert!(SF_GUARD_STORAGE_ALIGN.is_power_of_two());
    assert!(SF_MAX_FAULTS == FAULT_SET_CAPACITY);
    assert!(SF_MAX_EVENTS == MAX_EVENTS);
    assert!(SF_RIG_IMAGE_MAX_BYTES == IMAGE_MAX_BYTES);
    assert!(SF_RIG_IMAGE_VERSION == IMAGE_VERSION as u32);
};

// ---------------------------------------------------------------- errors

impl SfError {
    /// No error.
    pub const NONE: SfError = SfError {
        code: SF_OK,
        field: [0; SF_FIELD_BYTES],
        has_index: 0,
        index: 0,
        value: f32::NAN,
        min: f32::NAN,
        max: f32::NAN,
    };

    /// An error with a code and a field, no value or range.
    #[must_use]
    pub fn of(code: SfStatus, field: &str) -> SfError {
        let mut e = SfError {
            code,
            ..SfError::NONE
        };
        e.set_field(field);
        e
    }

    /// An error with a code, a field, the value and the accepted range.
    #[must_use]
    pub fn range(code: SfStatus, field: &str, value: f32, min: f32, max: f32) -> SfError {
        SfError {
            value,
            min,
            max,
            ..SfError::of(code, field)
        }
    }

    /// The C form of a core error (same kind, field, index, value and range).
    #[must_use]
    pub fn from_core(e: &Error) -> SfError {
        SfError {
            has_index: u8::from(e.index.is_some()),
            index: e.index.unwrap_or(0),
            ..SfError::range(error_code(e.kind), e.field.path(), e.value, e.min, e.max)
        }
    }

    /// The C form of an image error.
    #[must_use]
    pub fn from_image(e: ImageError) -> SfError {
        let f = "rig_image";
        match e {
            ImageError::Truncated => SfError::of(SF_ERR_IMAGE_TRUNCATED, f),
            ImageError::Magic => SfError::of(SF_ERR_IMAGE_MAGIC, f),
            ImageError::Version(v) => {
                let want = f32::from(IMAGE_VERSION);
                SfError::range(
                    SF_ERR_IMAGE_VERSION,
                    "rig_image.version",
                    f32::from(v),
                    want,
                    want,
                )
            }
            ImageError::Size | ImageError::Full => SfError::of(SF_ERR_IMAGE_SIZE, f),
            ImageError::Checksum => SfError::of(SF_ERR_IMAGE_CHECKSUM, "rig_image.crc32"),
            ImageError::Payload(_) => SfError::of(SF_ERR_IMAGE_PAYLOAD, "rig_image.payload"),
        }
    }

    /// The field as text (up to the first NUL).
    #[must_use]
    pub fn field_str(&self) -> &str {
        let n = self
            .field
            .iter()
            .position(|&b| b == 0)
            .unwrap_or(SF_FIELD_BYTES);
        let bytes = self.field.get(..n).unwrap_or(&[]);
        core::str::from_utf8(bytes).unwrap_or("")
    }

    fn set_field(&mut self, s: &str) {
        // Keep the last byte for the NUL; cut at a character boundary.
        let mut n = s.len().min(SF_FIELD_BYTES - 1);
        while n > 0 && !s.is_char_boundary(n) {
            n -= 1;
        }
        self.field = [0; SF_FIELD_BYTES];
        for (d, b) in self.field.iter_mut().zip(s.as_bytes().iter().take(n)) {
            *d = *b;
        }
    }
}

impl From<Error> for SfError {
    fn from(e: Error) -> Self {
        SfError::from_core(&e)
    }
}

impl From<ImageError> for SfError {
    fn from(e: ImageError) -> Self {
        SfError::from_image(e)
    }
}

/// Writes `e` to `err` when it is a usable pointer; returns its code.
///
/// # Safety
/// `err` is null or points to writable memory for an `SfError`.
unsafe fn report(err: *mut SfError, e: SfError) -> SfStatus {
    if !err.is_null() && err.is_aligned() {
        // SAFETY: non-null and aligned; the caller promises it is writable.
        unsafe { ptr::write(err, e) };
    }
    e.code
}

/// Turns a result into a status, filling `err`.
///
/// # Safety
/// As [`report`].
unsafe fn finish(err: *mut SfError, r: Result<(), SfError>) -> SfStatus {
    let e = match r {
        Ok(()) => SfError::NONE,
        Err(e) => e,
    };
    // SAFETY: passed on from the caller.
    unsafe { report(err, e) }
}

/// Null and alignment check of a pointer argument named `name`.
fn check<T>(p: *const T, name: &str) -> Result<(), SfError> {
    if p.is_null() {
        Err(SfError::of(SF_ERR_NULL_POINTER, name))
    } else if !p.is_aligned() {
        Err(SfError::of(SF_ERR_MISALIGNED, name))
    } else {
        Ok(())
    }
}

/// The image bytes, checked.
///
/// # Safety
/// `image` is null or valid for reads of `len` bytes for `'a`.
unsafe fn image_bytes<'a>(image: *const u8, len: usize) -> Result<&'a [u8], SfError> {
    check(image, "image")?;
    if len > SF_RIG_IMAGE_MAX_BYTES {
        return Err(SfError::from_image(ImageError::Size));
    }
    // SAFETY: non-null (u8 needs no alignment); the caller promises `len`
    // readable bytes, and `len` is bounded far below isize::MAX.
    Ok(unsafe { core::slice::from_raw_parts(image, len) })
}

/// A flag byte: 0 or 1.
fn flag(v: u8, field: &str) -> Result<bool, SfError> {
    match v {
        0 => Ok(false),
        1 => Ok(true),
        _ => Err(SfError::range(
            SF_ERR_OUT_OF_RANGE,
            field,
            f32::from(v),
            0.0,
            1.0,
        )),
    }
}

#[allow(clippy::cast_precision_loss)] // codes are small; the value is for the message
fn code_error(field: &str, v: u32, max: u32) -> SfError {
    SfError::range(SF_ERR_OUT_OF_RANGE, field, v as f32, 0.0, max as f32)
}

/// The core pose of a C pose (angles are checked by the core, as for any
/// pose: `MountGeometry::axis_angles`).
fn pose_of(p: &SfPose, kind_field: &str, side_field: &str) -> Result<Pose, SfError> {
    let pier_side = match p.pier_side {
        SF_PIER_TUBE_EAST => PierSide::TubeEast,
        SF_PIER_TUBE_WEST => PierSide::TubeWest,
        other => return Err(code_error(side_field, other, SF_PIER_TUBE_WEST)),
    };
    match p.kind {
        SF_POSE_AXES => Ok(Pose::Axes {
            primary_rad: p.a_rad,
            secondary_rad: p.b_rad,
        }),
        SF_POSE_EQUATORIAL => Ok(Pose::Equatorial {
            hour_angle_rad: p.a_rad,
            declination_rad: p.b_rad,
            pier_side,
        }),
        SF_POSE_HORIZONTAL => Ok(Pose::Horizontal {
            azimuth_rad: p.a_rad,
            altitude_rad: p.b_rad,
            pier_side,
        }),
        other => Err(code_error(kind_field, other, SF_POSE_HORIZONTAL)),
    }
}

/// The C pose of a core pose.
fn sf_pose(p: Pose) -> SfPose {
    let side = |s: PierSide| match s {
        PierSide::TubeEast => SF_PIER_TUBE_EAST,
        PierSide::TubeWest => SF_PIER_TUBE_WEST,
    };
    match p {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => SfPose {
            kind: SF_POSE_AXES,
            a_rad: primary_rad,
            b_rad: secondary_rad,
            pier_side: SF_PIER_TUBE_EAST,
        },
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            pier_side,
        } => SfPose {
            kind: SF_POSE_EQUATORIAL,
            a_rad: hour_angle_rad,
            b_rad: declination_rad,
            pier_side: side(pier_side),
        },
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            pier_side,
        } => SfPose {
            kind: SF_POSE_HORIZONTAL,
            a_rad: azimuth_rad,
            b_rad: altitude_rad,
            pier_side: side(pier_side),
        },
    }
}

/// The core inputs of C inputs. Only the encoding is checked here (flags,
/// codes); the values go to the guard as they are, which turns bad samples
/// into faults exactly as for a Rust caller.
pub(crate) fn inputs_of(i: &SfInputs) -> Result<Inputs, SfError> {
    let accel_raw = flag(i.has_accel, "inputs.has_accel")?.then_some(i.accel);
    let wind = if flag(i.has_wind, "inputs.has_wind")? {
        let from = flag(i.has_wind_from, "inputs.has_wind_from")?;
        Some(WindSample {
            speed_mps: i.wind_speed_mps,
            from_rad: from.then_some(i.wind_from_rad),
        })
    } else {
        None
    };
    let pose = if flag(i.has_pose, "inputs.has_pose")? {
        Some(pose_of(
            &i.pose,
            "inputs.pose.kind",
            "inputs.pose.pier_side",
        )?)
    } else {
        None
    };
    let cover_fitted = if flag(i.has_cover, "inputs.has_cover")? {
        Some(flag(i.cover_fitted, "inputs.cover_fitted")?)
    } else {
        None
    };
    let air = flag(i.has_air, "inputs.has_air")?.then_some(AirSample {
        temperature_k: i.air_temperature_k,
        pressure_pa: i.air_pressure_pa,
    });
    Ok(Inputs {
        accel_raw,
        wind,
        pose,
        cover_fitted,
        air,
    })
}

fn maybe(v: Option<f32>) -> SfMaybeF32 {
    match v {
        Some(value) => SfMaybeF32 {
            has_value: 1,
            value,
        },
        None => SfMaybeF32 {
            has_value: 0,
            value: f32::NAN,
        },
    }
}

const NO_FAULT: SfFault = SfFault {
    sensor: SF_SENSOR_ACCEL,
    fault_class: SF_FAULT_NOT_FINITE,
    has_value: 0,
    value: f32::NAN,
    has_duration: 0,
    duration_ms: 0,
    has_check: 0,
    check: 0,
};

const NO_EVENT: SfEvent = SfEvent {
    kind: SF_EVENT_NEW_HIGH_UTILISATION,
    from_level: SF_LEVEL_CLEAR,
    to_level: SF_LEVEL_CLEAR,
    cause: SF_CAUSE_SETTLED,
    fault: NO_FAULT,
    utilisation: f32::NAN,
};

const NO_POSE: SfPose = SfPose {
    kind: SF_POSE_AXES,
    a_rad: f32::NAN,
    b_rad: f32::NAN,
    pier_side: SF_PIER_TUBE_EAST,
};

const NONE_F32: SfMaybeF32 = SfMaybeF32 {
    has_value: 0,
    value: f32::NAN,
};

/// The verdict written on any error of `sf_guard_step`: park and alarm
/// asserted, level `sensor_fault`, no figures.
const FAIL_SAFE_VERDICT: SfVerdict = SfVerdict {
    now_ms: 0,
    level: SF_LEVEL_SENSOR_FAULT,
    park: 1,
    alarm: 1,
    overturning_utilisation: NONE_F32,
    predicted_utilisation: NONE_F32,
    sliding_utilisation: NONE_F32,
    drive_primary_utilisation: NONE_F32,
    drive_secondary_utilisation: NONE_F32,
    tip_wind_mps: NONE_F32,
    gust_mps: NONE_F32,
    predicted_gust_mps: NONE_F32,
    wind_from_rad: NONE_F32,
    evaluated: 0,
    has_tilt: 0,
    tilt_magnitude_rad: f32::NAN,
    tilt_downhill_azimuth_rad: f32::NAN,
    tilt_margin_rad: NONE_F32,
    tilt_drift_rad_per_s: f32::NAN,
    pose: NO_POSE,
    has_park_pose: 0,
    park_pose: NO_POSE,
    fault_count: 0,
    faults_overflowed: 0,
    faults: [NO_FAULT; SF_MAX_FAULTS],
    event_count: 0,
    events_lost: 0,
    events: [NO_EVENT; SF_MAX_EVENTS],
};

/// The C form of a fault.
#[must_use]
pub fn sf_fault(f: &Fault) -> SfFault {
    let p = fault_parts(f);
    SfFault {
        sensor: sensor_code(f.sensor()),
        fault_class: p.class,
        has_value: u8::from(p.value.is_some()),
        value: p.value.unwrap_or(f32::NAN),
        has_duration: u8::from(p.duration_ms.is_some()),
        duration_ms: p.duration_ms.unwrap_or(0),
        has_check: u8::from(p.check.is_some()),
        check: p.check.unwrap_or(0),
    }
}

/// The C form of an event.
#[must_use]
pub fn sf_event(e: &Event) -> SfEvent {
    let kind = event_kind(e);
    match *e {
        Event::LevelChanged { from, to, cause } => SfEvent {
            kind,
            from_level: level_code(from),
            to_level: level_code(to),
            cause: cause_code(cause),
            ..NO_EVENT
        },
        Event::FaultRaised(f) => SfEvent {
            kind,
            fault: sf_fault(&f),
            ..NO_EVENT
        },
        Event::NewHighUtilisation { utilisation } => SfEvent {
            kind,
            utilisation,
            ..NO_EVENT
        },
    }
}

/// The C form of a verdict.
#[must_use]
pub fn sf_verdict(v: &Verdict) -> SfVerdict {
    let tilt = v.tilt.map(|r| r.tilt());
    let mut out = SfVerdict {
        now_ms: v.now.0,
        level: level_code(v.level),
        park: u8::from(v.level.park_requested()),
        alarm: u8::from(v.level.alarm()),
        overturning_utilisation: maybe(v.overturning_utilisation),
        predicted_utilisation: maybe(v.predicted_utilisation),
        sliding_utilisation: maybe(v.sliding_utilisation),
        drive_primary_utilisation: maybe(v.drive_utilisation.map(|d| d[0])),
        drive_secondary_utilisation: maybe(v.drive_utilisation.map(|d| d[1])),
        tip_wind_mps: maybe(v.tip_wind_mps),
        gust_mps: maybe(v.gust_mps),
        predicted_gust_mps: maybe(v.predicted_gust_mps),
        wind_from_rad: maybe(v.wind_from_rad),
        evaluated: u8::from(v.evaluated),
        has_tilt: u8::from(v.tilt.is_some()),
        tilt_magnitude_rad: tilt.map_or(f32::NAN, |t| t.magnitude_rad),
        tilt_downhill_azimuth_rad: tilt.map_or(f32::NAN, |t| t.downhill_azimuth_rad),
        tilt_margin_rad: maybe(v.tilt_margin_rad),
        tilt_drift_rad_per_s: v.tilt_drift_rad_per_s,
        pose: sf_pose(v.pose),
        has_park_pose: u8::from(v.park_pose.is_some()),
        park_pose: v.park_pose.map_or(NO_POSE, sf_pose),
        fault_count: 0,
        faults_overflowed: u8::from(v.faults.overflowed()),
        faults: [NO_FAULT; SF_MAX_FAULTS],
        event_count: 0,
        events_lost: u32::from(v.events_lost),
        events: [NO_EVENT; SF_MAX_EVENTS],
    };
    for (slot, f) in out.faults.iter_mut().zip(v.faults.iter()) {
        *slot = sf_fault(&f);
        out.fault_count = out.fault_count.saturating_add(1);
    }
    for (slot, e) in out.events.iter_mut().zip(v.events.iter()) {
        *slot = sf_event(e);
        out.event_count = out.event_count.saturating_add(1);
    }
    out
}

// ---------------------------------------------------------------- handle

/// The handle behind a guard pointer, checked (null, alignment, magic).
///
/// # Safety
/// `g` is null or points to memory readable (and, for the returned
/// reference's life, not otherwise accessed) of at least
/// `size_of::<Handle>()` bytes.
unsafe fn handle<'a>(g: *mut SfGuard) -> Result<&'a mut Guard<'static>, SfError> {
    let h = g.cast::<Handle>();
    check(h, "guard")?;
    // SAFETY: non-null and aligned for `Handle`; the caller promises the
    // storage is readable. Only the magic word is read, by value.
    let magic = unsafe { ptr::read(addr_of!((*h).magic)) };
    if magic != HANDLE_MAGIC {
        return Err(SfError::of(SF_ERR_BAD_HANDLE, "guard"));
    }
    // SAFETY: the magic is written only after the guard field was
    // initialised by `init`, and cleared by `fini`; the reference covers the
    // guard field alone, never the rig it borrows.
    Ok(unsafe { &mut *addr_of_mut!((*h).guard) })
}

/// Builds the rig and guard in `storage`.
///
/// # Safety
/// `storage` is null or valid for writes of `storage_size` bytes and stays
/// in place until `fini`; `image` is null or valid for reads of `len`.
unsafe fn init(
    storage: *mut u8,
    storage_size: usize,
    image: *const u8,
    image_len: usize,
    now_ms: u64,
) -> Result<*mut SfGuard, SfError> {
    if storage.is_null() {
        return Err(SfError::of(SF_ERR_NULL_POINTER, "storage"));
    }
    if (storage as usize) % SF_GUARD_STORAGE_ALIGN != 0 {
        return Err(SfError::of(SF_ERR_MISALIGNED, "storage"));
    }
    if storage_size < SF_GUARD_STORAGE_SIZE {
        #[allow(clippy::cast_precision_loss)] // sizes far below 2^24
        return Err(SfError::range(
            SF_ERR_STORAGE_TOO_SMALL,
            "storage_size",
            storage_size as f32,
            SF_GUARD_STORAGE_SIZE as f32,
            f32::INFINITY,
        ));
    }
    let h = storage.cast::<Handle>();
    // SAFETY: `storage` is non-null, aligned for `Handle` (its alignment
    // divides SF_GUARD_STORAGE_ALIGN) and writable for at least
    // size_of::<Handle>() bytes. Mark it uninitialised first, so a failure
    // below leaves no usable handle behind.
    unsafe { ptr::write(addr_of_mut!((*h).magic), 0) };
    // SAFETY: passed on from the caller.
    let bytes = unsafe { image_bytes(image, image_len)? };
    let img = image::decode(bytes)?;
    let air = Air::from_density(img.air_density_kg_per_m3)?;
    let rig = Rig::new(&img.spec)?;
    // SAFETY: as above; the rig field is written whole, then borrowed for
    // as long as the storage holds the guard (the caller's promise).
    let rig_ref: &'static Rig = unsafe {
        ptr::write(addr_of_mut!((*h).rig), rig);
        &*addr_of!((*h).rig)
    };
    let mut guard = match Guard::new(rig_ref, img.guard, Millis(now_ms)) {
        Ok(g) => g,
        Err(e) => {
            // SAFETY: the rig field was written above and nothing borrows it
            // any more.
            unsafe { ptr::drop_in_place(addr_of_mut!((*h).rig)) };
            return Err(e.into());
        }
    };
    guard.set_air(air);
    // SAFETY: as above; the guard field is disjoint from the rig field.
    unsafe {
        ptr::write(addr_of_mut!((*h).guard), guard);
        ptr::write(addr_of_mut!((*h).magic), HANDLE_MAGIC);
    }
    Ok(h.cast::<SfGuard>())
}

// ---------------------------------------------------------------- exports

/// The ABI version of this library (compare with `SF_ABI_VERSION`).
#[no_mangle]
pub extern "C" fn sf_abi_version() -> u32 {
    SF_ABI_VERSION
}

/// The rig image format version this library reads.
#[no_mangle]
pub extern "C" fn sf_rig_image_version() -> u32 {
    SF_RIG_IMAGE_VERSION
}

/// Bytes of storage [`sf_guard_init`] needs (`SF_GUARD_STORAGE_SIZE`).
#[no_mangle]
pub extern "C" fn sf_guard_storage_size() -> usize {
    SF_GUARD_STORAGE_SIZE
}

/// Alignment [`sf_guard_init`] needs for its storage (`SF_GUARD_STORAGE_ALIGN`).
#[no_mangle]
pub extern "C" fn sf_guard_storage_align() -> usize {
    SF_GUARD_STORAGE_ALIGN
}

/// `sizeof(SfInputs)` as this library sees it (for bindings that declare
/// the types themselves, such as Python's `ctypes`, to check their layout).
#[no_mangle]
pub extern "C" fn sf_sizeof_inputs() -> usize {
    size_of::<SfInputs>()
}

/// `sizeof(SfVerdict)` as this library sees it.
#[no_mangle]
pub extern "C" fn sf_sizeof_verdict() -> usize {
    size_of::<SfVerdict>()
}

/// `sizeof(SfError)` as this library sees it.
#[no_mangle]
pub extern "C" fn sf_sizeof_error() -> usize {
    size_of::<SfError>()
}

/// `sizeof(SfAssessRequest)` as this library sees it.
#[no_mangle]
pub extern "C" fn sf_sizeof_assess_request() -> usize {
    size_of::<SfAssessRequest>()
}

/// `sizeof(SfAssessment)` as this library sees it.
#[no_mangle]
pub extern "C" fn sf_sizeof_assessment() -> usize {
    size_of::<SfAssessment>()
}

/// Builds a guard in caller storage from a rig image, started at `now_ms`.
///
/// `storage` must be at least `SF_GUARD_STORAGE_SIZE` bytes, aligned to
/// `SF_GUARD_STORAGE_ALIGN`, and stay in place (never moved or copied, not
/// written by the caller) until [`sf_guard_fini`]. On success `*out_guard`
/// is the guard (the storage's address). The image is read during the call
/// only. `err` may be null.
///
/// Errors: null or misaligned pointers, `SF_ERR_STORAGE_TOO_SMALL`, the
/// image's errors (`SF_ERR_IMAGE_*`), and the core's validation of the rig,
/// the guard settings and the site air (the same kind, field and range as
/// the Rust API). On error no guard exists in the storage.
///
/// # Safety
/// `storage` valid for writes of `storage_size` bytes; `image` valid for
/// reads of `image_size` bytes; `out_guard` and `err` null or writable.
#[no_mangle]
pub unsafe extern "C" fn sf_guard_init(
    storage: *mut u8,
    storage_size: usize,
    image: *const u8,
    image_size: usize,
    now_ms: u64,
    out_guard: *mut *mut SfGuard,
    err: *mut SfError,
) -> SfStatus {
    let r = (|| {
        check(out_guard, "out_guard")?;
        // SAFETY: passed on from the caller.
        let g = unsafe { init(storage, storage_size, image, image_size, now_ms)? };
        // SAFETY: checked non-null and aligned; the caller promises writable.
        unsafe { ptr::write(out_guard, g) };
        Ok(())
    })();
    // SAFETY: passed on from the caller.
    unsafe { finish(err, r) }
}

/// Ends a guard: its storage may be reused or released afterwards. Calling
/// any function on it afterwards gives `SF_ERR_BAD_HANDLE`.
///
/// # Safety
/// `guard` null or a pointer from [`sf_guard_init`] whose storage is still
/// in place.
#[no_mangle]
pub unsafe extern "C" fn sf_guard_fini(guard: *mut SfGuard) -> SfStatus {
    // SAFETY: passed on from the caller.
    match unsafe { handle(guard) } {
        Ok(_) => {
            let h = guard.cast::<Handle>();
            // SAFETY: `handle` checked the pointer and that both fields are
            // initialised; the magic is cleared first, so no later call can
            // reach the dropped fields. The guard goes before the rig it
            // borrows. (Neither owns memory outside the storage.)
            unsafe {
                ptr::write(addr_of_mut!((*h).magic), 0);
                ptr::drop_in_place(addr_of_mut!((*h).guard));
                ptr::drop_in_place(addr_of_mut!((*h).rig));
            }
            SF_OK
        }
        Err(e) => e.code,
    }
}

/// One step: the samples that arrived since the last step at time `now_ms`
/// (a monotonic millisecond clock; going backwards is a fault, as in Rust).
/// Fills `*out`. Bad sample values are not errors: the guard turns them into
/// faults in the verdict, exactly as for a Rust caller.
///
/// Errors: null or misaligned pointers, `SF_ERR_BAD_HANDLE`, and a flag or
/// code in `*inputs` outside its set (`SF_ERR_OUT_OF_RANGE`, naming the
/// field); the guard is then not stepped. On any error `*out`, when
/// writable, asserts park and alarm (level `sensor_fault`, no figures):
/// treat an error as unsafe.
///
/// # Safety
/// `guard` as for [`sf_guard_fini`]; `inputs` readable; `out` and `err`
/// null or writable.
#[no_mangle]
pub unsafe extern "C" fn sf_guard_step(
    guard: *mut SfGuard,
    now_ms: u64,
    inputs: *const SfInputs,
    out: *mut SfVerdict,
    err: *mut SfError,
) -> SfStatus {
    let out_ok = check(out, "out");
    let r = (|| {
        out_ok?;
        check(inputs, "inputs")?;
        // SAFETY: checked; every bit pattern is a valid `SfInputs` (plain
        // integers and floats), so a copy of the caller's bytes is sound.
        let raw = unsafe { ptr::read(inputs) };
        let parsed = inputs_of(&raw)?;
        // SAFETY: passed on from the caller.
        let g = unsafe { handle(guard)? };
        let v = g.step(Millis(now_ms), &parsed);
        // SAFETY: `out` checked above; the caller promises it is writable.
        unsafe { ptr::write(out, sf_verdict(&v)) };
        Ok(())
    })();
    if r.is_err() && out_ok.is_ok() {
        // SAFETY: as above.
        unsafe {
            ptr::write(
                out,
                SfVerdict {
                    now_ms,
                    ..FAIL_SAFE_VERDICT
                },
            );
        };
    }
    // SAFETY: passed on from the caller.
    unsafe { finish(err, r) }
}

/// Acknowledges a latched alarm: the level may step down once the figures
/// have settled for the dwell time (at the next step, if they already have).
///
/// # Safety
/// As [`sf_guard_fini`].
#[no_mangle]
pub unsafe extern "C" fn sf_guard_acknowledge(guard: *mut SfGuard) -> SfStatus {
    // SAFETY: passed on from the caller.
    match unsafe { handle(guard) } {
        Ok(g) => {
            g.acknowledge();
            SF_OK
        }
        Err(e) => e.code,
    }
}

/// A static assessment of the rig in an image (no guard needed): the tip
/// wind by direction, the lowest tip wind over all directions, and the
/// ballast needed for a design gust, in the pose, tilt and cover state
/// asked for and the image's site air.
///
/// # Safety
/// `image` readable for `image_size` bytes; `request` readable; `out` and
/// `err` null or writable.
#[no_mangle]
pub unsafe extern "C" fn sf_assess(
    image: *const u8,
    image_size: usize,
    request: *const SfAssessRequest,
    out: *mut SfAssessment,
    err: *mut SfError,
) -> SfStatus {
    let r = (|| {
        check(out, "out")?;
        check(request, "request")?;
        // SAFETY: checked; every bit pattern is a valid `SfAssessRequest`.
        let q = unsafe { ptr::read(request) };
        // SAFETY: passed on from the caller.
        let bytes = unsafe { image_bytes(image, image_size)? };
        let a = assess(bytes, &q)?;
        // SAFETY: checked; the caller promises it is writable.
        unsafe { ptr::write(out, a) };
        Ok(())
    })();
    // SAFETY: passed on from the caller.
    unsafe { finish(err, r) }
}

/// The assessment behind [`sf_assess`].
pub(crate) fn assess(bytes: &[u8], q: &SfAssessRequest) -> Result<SfAssessment, SfError> {
    let img = image::decode(bytes)?;
    let air = Air::from_density(img.air_density_kg_per_m3)?;
    let rig = Rig::new(&img.spec)?;
    let pose = if flag(q.has_pose, "request.has_pose")? {
        pose_of(&q.pose, "request.pose.kind", "request.pose.pier_side")?
    } else {
        rig.mount().home_pose()
    };
    rig.mount().axis_angles(pose)?;
    let max_dirs = SF_MAX_DIRECTIONS as u32;
    if q.directions == 0 || q.directions > max_dirs {
        return Err(SfError::range(
            SF_ERR_OUT_OF_RANGE,
            "request.directions",
            #[allow(clippy::cast_precision_loss)]
            {
                q.directions as f32
            },
            1.0,
            SF_MAX_DIRECTIONS as f32,
        ));
    }
    let c = Conditions {
        pose,
        tilt: Tilt::new(q.tilt_magnitude_rad, q.tilt_downhill_azimuth_rad)?,
        wind_speed_mps: 0.0,
        wind_from_rad: 0.0,
        air,
        cover_fitted: flag(q.cover_fitted, "request.cover_fitted")?,
    };
    // The ballast first: its checks of the request (speed, target, a
    // position inside the feet) come before any scan.
    let [x, y, z] = q.ballast_position_m;
    let b = rig.ballast_needed(
        &c,
        q.design_speed_mps,
        q.target_utilisation,
        Vec3::new(x, y, z),
    )?;
    let mut out = SfAssessment {
        directions: q.directions,
        tip_wind_mps: [NONE_F32; SF_MAX_DIRECTIONS],
        lowest_tip_wind_mps: NONE_F32,
        lowest_from_rad: f32::NAN,
        ballast_kg: f32::NAN,
        ballast_worst_from_rad: f32::NAN,
    };
    #[allow(clippy::cast_precision_loss)] // at most 72
    let step = core::f32::consts::TAU / q.directions as f32;
    for (i, slot) in (0u16..).zip(out.tip_wind_mps.iter_mut().take(SF_MAX_DIRECTIONS)) {
        if u32::from(i) >= q.directions {
            break;
        }
        let a = rig.stability_figures(&Conditions {
            wind_from_rad: f32::from(i) * step,
            ..c
        })?;
        *slot = maybe(a.tip_wind_mps);
    }
    let w = rig.worst_wind(&c)?;
    out.lowest_tip_wind_mps = maybe(w.tip_wind_mps);
    out.lowest_from_rad = w.from_rad;
    out.ballast_kg = b.mass_kg;
    out.ballast_worst_from_rad = b.worst_from_rad;
    Ok(out)
}

/// Name of a level code (`clear`, `watch`, `park_now`, `alarm`,
/// `sensor_fault`); `unknown` outside the set. A static NUL-terminated
/// string: never freed.
#[no_mangle]
pub extern "C" fn sf_level_name(level: SfLevel) -> *const c_char {
    name_in(&LEVEL_NAMES, level).as_ptr()
}

/// Name of a cause code (`overturning`, …, `acknowledged`); static.
#[no_mangle]
pub extern "C" fn sf_cause_name(cause: SfCause) -> *const c_char {
    name_in(&CAUSE_NAMES, cause).as_ptr()
}

/// Name of a sensor code (`accel`, `wind_speed`, `wind_direction`, `pose`,
/// `cover`, `air`, `clock`, `model`); static.
#[no_mangle]
pub extern "C" fn sf_sensor_name(sensor: SfSensor) -> *const c_char {
    name_in(&SENSOR_NAMES, sensor).as_ptr()
}

/// Name of a fault class code (`not_finite`, …, `unevaluable`); static.
#[no_mangle]
pub extern "C" fn sf_fault_class_name(fault_class: SfFaultClass) -> *const c_char {
    name_in(&FAULT_CLASS_NAMES, fault_class).as_ptr()
}

/// Name of an evaluation check code (`worst_direction`, …, `park_pose`);
/// static.
#[no_mangle]
pub extern "C" fn sf_check_name(check: SfCheck) -> *const c_char {
    name_in(&CHECK_NAMES, check).as_ptr()
}

/// Name of an event kind code; static.
#[no_mangle]
pub extern "C" fn sf_event_kind_name(kind: SfEventKind) -> *const c_char {
    name_in(&EVENT_KIND_NAMES, kind).as_ptr()
}

/// Name of a status code (`ok`, `null_pointer`, …); static.
#[no_mangle]
pub extern "C" fn sf_status_name(status: SfStatus) -> *const c_char {
    name_in(&STATUS_NAMES, status).as_ptr()
}

/// The heap-allocating convenience (feature `std`).
#[cfg(feature = "std")]
pub mod heap {
    use super::*;
    use std::alloc::{alloc, dealloc, Layout};

    fn layout() -> Option<Layout> {
        Layout::from_size_align(SF_GUARD_STORAGE_SIZE, SF_GUARD_STORAGE_ALIGN).ok()
    }

    /// Heap convenience (feature `std`): allocates the storage and builds a
    /// guard in it as [`sf_guard_init`] does. Returns null on any error
    /// (then `*err` says why, when `err` is not null). Free with
    /// [`sf_guard_free`].
    ///
    /// # Safety
    /// `image` readable for `image_size` bytes; `err` null or writable.
    #[no_mangle]
    pub unsafe extern "C" fn sf_guard_new(
        image: *const u8,
        image_size: usize,
        now_ms: u64,
        err: *mut SfError,
    ) -> *mut SfGuard {
        let Some(l) = layout() else {
            // SAFETY: passed on from the caller.
            unsafe { report(err, SfError::of(SF_ERR_NO_MEMORY, "storage")) };
            return ptr::null_mut();
        };
        // SAFETY: the layout has a non-zero size.
        let storage = unsafe { alloc(l) };
        if storage.is_null() {
            // SAFETY: passed on from the caller.
            unsafe { report(err, SfError::of(SF_ERR_NO_MEMORY, "storage")) };
            return ptr::null_mut();
        }
        // SAFETY: the fresh allocation has the size and alignment asked for.
        match unsafe { init(storage, SF_GUARD_STORAGE_SIZE, image, image_size, now_ms) } {
            Ok(g) => {
                // SAFETY: passed on from the caller.
                unsafe { report(err, SfError::NONE) };
                g
            }
            Err(e) => {
                // SAFETY: allocated above with this layout, not yet freed.
                unsafe { dealloc(storage, l) };
                // SAFETY: passed on from the caller.
                unsafe { report(err, e) };
                ptr::null_mut()
            }
        }
    }

    /// Ends and frees a guard from [`sf_guard_new`]. Null is ignored
    /// (`SF_OK`); a pointer that is not a live guard gives
    /// `SF_ERR_BAD_HANDLE` and is not freed.
    ///
    /// # Safety
    /// `guard` null or a pointer returned by [`sf_guard_new`] not yet freed.
    #[no_mangle]
    pub unsafe extern "C" fn sf_guard_free(guard: *mut SfGuard) -> SfStatus {
        if guard.is_null() {
            return SF_OK;
        }
        // SAFETY: passed on from the caller.
        let s = unsafe { sf_guard_fini(guard) };
        if s != SF_OK {
            return s;
        }
        if let Some(l) = layout() {
            // SAFETY: allocated by `sf_guard_new` with this layout.
            unsafe { dealloc(guard.cast::<u8>(), l) };
        }
        SF_OK
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn storage_constants_hold_the_handle() {
        let n = size_of::<Handle>();
        std::eprintln!("Handle: {n} bytes, align {}", align_of::<Handle>());
        assert!(n <= SF_GUARD_STORAGE_SIZE);
        assert_eq!(sf_guard_storage_size(), SF_GUARD_STORAGE_SIZE);
        assert_eq!(sf_guard_storage_align(), SF_GUARD_STORAGE_ALIGN);
    }
}
