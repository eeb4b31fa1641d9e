#!/usr/bin/env python3
"""Replays the firmware example's invented short night through the Standfast
guard over the C ABI with ctypes (standard library only) and prints the
guard's event lines, as the C example and `standfast replay --events` do
(core/ffi/ci.sh compares them with diff).

Usage: replay_events.py LIBRARY RIG_IMAGE ACCEL_LOG GUARD_INPUTS
  LIBRARY       the shared library: target/release/libstandfast_ffi.so
  RIG_IMAGE     from `standfast rig-image firmware-example/replay/rig.toml --out FILE`
  ACCEL_LOG     firmware-example/replay/short-night.csv
  GUARD_INPUTS  firmware-example/replay/short-night-host.csv

The structures below mirror core/ffi/include/standfast.h; their sizes are
checked against the library's own (sf_sizeof_*) before anything else.

Floats: Python parses a CSV value to a double and ctypes rounds it to a
C float on assignment, as host-sim and the C example do. The accelerometer
word is converted as the firmware's driver does: float(word >> 4) * 0.001f,
both factors rounded to float and the product rounded to float.

Exit status: 0 done, 1 usage or file error, 2 library error, 3 bad log.
"""

import csv
import ctypes as C
import struct
import sys

SF_OK = 0
SF_FIELD_BYTES = 64
SF_MAX_FAULTS = 8
SF_MAX_EVENTS = 8
SF_ABI_VERSION = 2
SF_EVENT_LEVEL_CHANGED = 0
SF_EVENT_FAULT_RAISED = 1
SF_POSE_EQUATORIAL = 1
SF_PIER_TUBE_EAST = 0


class SfError(C.Structure):
    _fields_ = [
        ("code", C.c_uint32),
        ("field", C.c_uint8 * SF_FIELD_BYTES),
        ("has_index", C.c_uint8),
        ("index", C.c_uint8),
        ("value", C.c_float),
        ("min", C.c_float),
        ("max", C.c_float),
    ]


class SfMaybeF32(C.Structure):
    _fields_ = [("has_value", C.c_uint8), ("value", C.c_float)]


class SfPose(C.Structure):
    _fields_ = [
        ("kind", C.c_uint32),
        ("a_rad", C.c_float),
        ("b_rad", C.c_float),
        ("pier_side", C.c_uint32),
    ]


class SfInputs(C.Structure):
    _fields_ = [
        ("has_accel", C.c_uint8),
        ("accel", C.c_float * 3),
        ("has_wind", C.c_uint8),
        ("wind_speed_mps", C.c_float),
        ("has_wind_from", C.c_uint8),
        ("wind_from_rad", C.c_float),
        ("has_pose", C.c_uint8),
        ("pose", SfPose),
        ("has_cover", C.c_uint8),
        ("cover_fitted", C.c_uint8),
        ("has_air", C.c_uint8),
        ("air_temperature_k", C.c_float),
        ("air_pressure_pa", C.c_float),
    ]


class SfFault(C.Structure):
    _fields_ = [
        ("sensor", C.c_uint32),
        ("fault_class", C.c_uint32),
        ("has_value", C.c_uint8),
        ("value", C.c_float),
        ("has_duration", C.c_uint8),
        ("duration_ms", C.c_uint64),
        ("has_check", C.c_uint8),
        ("check", C.c_uint32),
    ]


class SfEvent(C.Structure):
    _fields_ = [
        ("kind", C.c_uint32),
        ("from_level", C.c_uint32),
        ("to_level", C.c_uint32),
        ("cause", C.c_uint32),
        ("fault", SfFault),
        ("utilisation", C.c_float),
    ]


class SfVerdict(C.Structure):
    _fields_ = [
        ("now_ms", C.c_uint64),
        ("level", C.c_uint32),
        ("park", C.c_uint8),
        ("alarm", C.c_uint8),
        ("overturning_utilisation", SfMaybeF32),
        ("predicted_utilisation", SfMaybeF32),
        ("sliding_utilisation", SfMaybeF32),
        ("drive_primary_utilisation", SfMaybeF32),
        ("drive_secondary_utilisation", SfMaybeF32),
        ("tip_wind_mps", SfMaybeF32),
        ("gust_mps", SfMaybeF32),
        ("predicted_gust_mps", SfMaybeF32),
        ("wind_from_rad", SfMaybeF32),
        ("evaluated", C.c_uint8),
        ("has_tilt", C.c_uint8),
        ("tilt_magnitude_rad", C.c_float),
        ("tilt_downhill_azimuth_rad", C.c_float),
        ("tilt_margin_rad", SfMaybeF32),
        ("tilt_drift_rad_per_s", C.c_float),
        ("pose", SfPose),
        ("has_park_pose", C.c_uint8),
        ("park_pose", SfPose),
        ("fault_count", C.c_uint32),
        ("faults_overflowed", C.c_uint8),
        ("faults", SfFault * SF_MAX_FAULTS),
        ("event_count", C.c_uint32),
        ("events_lost", C.c_uint32),
        ("events", SfEvent * SF_MAX_EVENTS),
    ]


def f32(x):
    """x rounded to the nearest C float (IEEE 754 binary32)."""
    return struct.unpack("<f", struct.pack("<f", x))[0]


def word_to_g(word):
    """The firmware driver's conversion of a left-justified 12-bit word."""
    return f32(f32(float(word >> 4)) * f32(0.001))


def load(path):
    lib = C.CDLL(path)
    lib.sf_abi_version.restype = C.c_uint32
    for name in ("sf_guard_storage_size", "sf_guard_storage_align", "sf_sizeof_inputs",
                 "sf_sizeof_verdict", "sf_sizeof_error"):
        getattr(lib, name).restype = C.c_size_t
    lib.sf_guard_init.argtypes = [C.c_void_p, C.c_size_t, C.c_char_p, C.c_size_t, C.c_uint64,
                                  C.POINTER(C.c_void_p), C.POINTER(SfError)]
    lib.sf_guard_init.restype = C.c_uint32
    lib.sf_guard_step.argtypes = [C.c_void_p, C.c_uint64, C.POINTER(SfInputs),
                                  C.POINTER(SfVerdict), C.POINTER(SfError)]
    lib.sf_guard_step.restype = C.c_uint32
    lib.sf_guard_fini.argtypes = [C.c_void_p]
    lib.sf_guard_fini.restype = C.c_uint32
    for name in ("sf_level_name", "sf_sensor_name", "sf_fault_class_name", "sf_status_name"):
        getattr(lib, name).argtypes = [C.c_uint32]
        getattr(lib, name).restype = C.c_char_p
    return lib


def rows(path, columns):
    """(t_ms, {column: text}) for each data row; '#' lines are comments."""
    with open(path, newline="") as f:
        lines = (line for line in f if not line.startswith("#") and line.strip())
        reader = csv.DictReader(lines)
        missing = [c for c in columns if c not in (reader.fieldnames or [])]
        if missing:
            raise ValueError(f"{path}: no column {', '.join(missing)}")
        for n, row in enumerate(reader, start=2):
            try:
                t = int(row["t_ms"])
            except (TypeError, ValueError):
                raise ValueError(f"{path}: row {n}: bad t_ms {row.get('t_ms')!r}") from None
            if t < 0:
                raise ValueError(f"{path}: row {n}: negative t_ms")
            yield t, row


def merged(accel_path, host_path):
    """One (t_ms, accel row or None, host row or None) per distinct time."""
    a = rows(accel_path, ["t_ms", "accel_x", "accel_y", "accel_z"])
    h = rows(host_path, ["t_ms", "wind_mps", "wind_from_rad", "ha_rad", "dec_rad"])
    na, nh = next(a, None), next(h, None)
    while na is not None or nh is not None:
        t = min(x[0] for x in (na, nh) if x is not None)
        ra = na[1] if na is not None and na[0] == t else None
        rh = nh[1] if nh is not None and nh[0] == t else None
        if ra is not None:
            na = next(a, None)
        if rh is not None:
            nh = next(h, None)
        yield t, ra, rh


def inputs_of(ra, rh):
    inp = SfInputs()
    if ra is not None:
        words = [ra["accel_x"], ra["accel_y"], ra["accel_z"]]
        if all(w != "" for w in words):
            inp.has_accel = 1
            for i, w in enumerate(words):
                inp.accel[i] = word_to_g(int(w))
        elif any(w != "" for w in words):
            raise ValueError("an accelerometer row with empty axes")
    if rh is not None:
        if rh["wind_mps"] != "":
            inp.has_wind = 1
            inp.wind_speed_mps = float(rh["wind_mps"])
            if rh["wind_from_rad"] != "":
                inp.has_wind_from = 1
                inp.wind_from_rad = float(rh["wind_from_rad"])
        if rh["ha_rad"] != "" and rh["dec_rad"] != "":
            inp.has_pose = 1
            inp.pose = SfPose(SF_POSE_EQUATORIAL, float(rh["ha_rad"]), float(rh["dec_rad"]),
                              SF_PIER_TUBE_EAST)
    return inp


def fail(lib, what, status, err):
    field = bytes(err.field).split(b"\0", 1)[0].decode()
    print(f"{what}: {lib.sf_status_name(status).decode()} (field {field!r}, value {err.value}, "
          f"accepted {err.min} to {err.max})", file=sys.stderr)
    return 2


def main(argv):
    if len(argv) != 5:
        print(__doc__.split("\n\n")[1], file=sys.stderr)
        return 1
    lib = load(argv[1])
    if lib.sf_abi_version() != SF_ABI_VERSION:
        print(f"library ABI {lib.sf_abi_version()}, this script ABI {SF_ABI_VERSION}", file=sys.stderr)
        return 2
    for name, t in (("inputs", SfInputs), ("verdict", SfVerdict), ("error", SfError)):
        if getattr(lib, f"sf_sizeof_{name}")() != C.sizeof(t):
            print(f"Sf{name}: {C.sizeof(t)} bytes here, {getattr(lib, f'sf_sizeof_{name}')()} in the library",
                  file=sys.stderr)
            return 2
    with open(argv[2], "rb") as f:
        image = f.read()
    # 8-byte words give the storage 8-byte alignment (checked below and by the library).
    words = (lib.sf_guard_storage_size() + 7) // 8
    storage = (C.c_uint64 * words)()
    if C.addressof(storage) % lib.sf_guard_storage_align() != 0:
        print("guard storage is not aligned as the library needs", file=sys.stderr)
        return 2
    guard = C.c_void_p()
    err = SfError()
    verdict = SfVerdict()
    t0 = None
    try:
        last = None
        for t, ra, rh in merged(argv[3], argv[4]):
            if last is not None and t <= last:
                raise ValueError(f"time {t} ms is not after {last} ms")
            last = t
            inp = inputs_of(ra, rh)
            if t0 is None:
                t0 = t
                s = lib.sf_guard_init(storage, C.sizeof(storage), image, len(image), 0,
                                      C.byref(guard), C.byref(err))
                if s != SF_OK:
                    return fail(lib, "sf_guard_init", s, err)
            now = t - t0
            s = lib.sf_guard_step(guard, now, C.byref(inp), C.byref(verdict), C.byref(err))
            if s != SF_OK:
                return fail(lib, "sf_guard_step", s, err)
            events = verdict.events[: min(verdict.event_count, SF_MAX_EVENTS)]
            # As the replay prints a step: raised faults, lost events, level change.
            for e in events:
                if e.kind == SF_EVENT_FAULT_RAISED:
                    print(f"event t_ms={now} kind=fault sensor={lib.sf_sensor_name(e.fault.sensor).decode()} "
                          f"class={lib.sf_fault_class_name(e.fault.fault_class).decode()}")
            if verdict.events_lost > 0:
                print(f"event t_ms={now} kind=events_lost count={verdict.events_lost}")
            for e in events:
                if e.kind == SF_EVENT_LEVEL_CHANGED:
                    print(f"event t_ms={now} kind=level from={lib.sf_level_name(e.from_level).decode()} "
                          f"to={lib.sf_level_name(e.to_level).decode()}")
    except ValueError as e:
        print(e, file=sys.stderr)
        return 3
    finally:
        if guard.value is not None:
            lib.sf_guard_fini(guard)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
