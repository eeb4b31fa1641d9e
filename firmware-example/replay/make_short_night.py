#!/usr/bin/env python3
"""Writes short-night.csv: an invented 120 s log for the firmware replay.

Rows every 100 ms. The accelerometer sits on a rig tilted 0.5 degrees toward
east (raw LIS3DH words at +/-2 g, high resolution: 1 mg per digit, shifted
left by 4), with a small repeating wobble. The anemometer's pulse frequency is
scripted per second (0.75 m/s per Hz + 0.3 m/s in the firmware's example
calibration); the vane points about 250 degrees. Everything here is invented
for the demonstration.

The script, second by second (the guard's levels it leads to, with the
replay's guard settings, are listed in firmware-example/tests/host/replay.rs):

*   0-9    light wind, 5 and 6 Hz alternating (4.05 / 4.8 m/s);
*  10-19   a blow at 20 and 21 Hz (15.3 / 16.05 m/s): the guard raises watch,
           then park_now;
*  20      the mount reports its park pose (hour angle +90 deg, declination
           0 deg, the tube low on the west side) instead of the observing pose
           (hour angle -30 deg, declination 20 deg), which it reported every
           5 s until then; from here on it reports the park pose every 5 s;
*  20-89   light wind again; the figures at the park pose settle below the
           park threshold, and the guard steps down to watch after its dwell;
*  25.0-25.3  the accelerometer does not acknowledge (four rows; a station
           fault only: far shorter than the guard's own stale time);
*  60.1-71.9  the pulse counter delivers nothing (last total at 60.0 s, next
           at 72.0 s): longer than the guard's 10 s wind stale time, so the
           guard raises wind faults and its sensor_fault level, and leaves it
           once the wind has been back for the fault clearing time;
*  90-98   a storm ramp at 28, 32 and 36 Hz (21.3 / 24.3 / 27.3 m/s), three
           seconds each: park_now, then alarm (latched: it stays to the end);
*  99-119  light wind.

Light wind alternates between two frequencies so that no speed repeats long
enough to look stuck. Usage: python3 make_short_night.py > short-night.csv
"""

# Pulse frequency (Hz) during each second 0..119.
FREQ = (
    [5, 6] * 5
    + [20, 21] * 5
    + [6, 5] * 35
    + [28] * 3
    + [32] * 3
    + [36] * 3
    + [6, 5] * 10
    + [6]
)
SECONDS = 120
WOBBLE = [0, 1, -1, 0, 2, 0, -2, 1, 0, -1]
ACCEL_SILENT_MS = (25000, 25300)  # inclusive
PULSES_MISSING_MS = (60100, 72000)  # from, up to (exclusive)
PARK_POSE_FROM_MS = 20000
assert len(FREQ) == SECONDS


def total(t_ms):
    k = t_ms // 1000
    return sum(FREQ[:k]) + FREQ[k] * (t_ms % 1000) // 1000


def pose(t_ms):
    if t_ms % 5000 != 0:
        return ","
    if t_ms >= PARK_POSE_FROM_MS:
        return "90.000,0.000"
    return "-30.000,20.000"


def main():
    print(f"# standfast-firmware replay log: invented {SECONDS} s, see make_short_night.py")
    print("t_ms,accel_x,accel_y,accel_z,pulse_total,vane_from_deg,ha_deg,dec_deg")
    for i in range(SECONDS * 10):
        t = i * 100
        w = WOBBLE[i % len(WOBBLE)]
        if ACCEL_SILENT_MS[0] <= t <= ACCEL_SILENT_MS[1]:
            accel = ",,"
        else:
            accel = f"{(9 + w) << 4},{(0 - w) << 4},{(1000 + w) << 4}"
        missing = PULSES_MISSING_MS[0] <= t < PULSES_MISSING_MS[1]
        pulses = "" if missing else str(total(t))
        vane = f"{250 + (i % 7) - 3}"
        print(f"{t},{accel},{pulses},{vane},{pose(t)}")


if __name__ == "__main__":
    main()
