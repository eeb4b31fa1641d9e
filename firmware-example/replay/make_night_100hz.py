#!/usr/bin/env python3
"""Writes the invented 100 Hz night for the guard step's instruction count.

The script of make_short_night.py (120 s: light wind, a blow to park_now, the
park pose from 20 s, a silent accelerometer at 25.0-25.3 s, a pulse gap at
60.1-71.9 s that the guard calls stale, a storm ramp to alarm at 90-98 s,
light wind), with a row every 10 ms instead of every 100 ms: 12 000 rows.
The replay runs it at the station's 100 Hz set-up (the binaries' word
`--rate-100hz`, ReplaySetup::example_100hz). The accelerometer wobble
advances every row, the vane every 10 rows (as at 10 Hz), the pulse total
follows each second's frequency to the millisecond, and the mount reports
its pose every 5 s. At 100 Hz the accelerometer's silence lasts 31 rows
(310 ms), past the station's 250 ms stale time, so the station also raises
and clears an accelerometer fault. Everything here is invented for the
demonstration.

Usage: python3 make_night_100hz.py > night-100hz.csv (ci.sh writes it to
target/firmware-ci/ at each run; nothing generated is checked in).
"""

import os
import sys

sys.dont_write_bytecode = True  # no __pycache__ beside the scripts
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import make_short_night as night  # noqa: E402

ROWS_PER_S = 100


def main():
    print(
        f"# standfast-firmware replay log: invented {night.SECONDS} s at "
        f"{ROWS_PER_S} Hz, see make_night_100hz.py"
    )
    print("t_ms,accel_x,accel_y,accel_z,pulse_total,vane_from_deg,ha_deg,dec_deg")
    step_ms = 1000 // ROWS_PER_S
    for i in range(night.SECONDS * ROWS_PER_S):
        t = i * step_ms
        w = night.WOBBLE[i % len(night.WOBBLE)]
        if night.ACCEL_SILENT_MS[0] <= t <= night.ACCEL_SILENT_MS[1]:
            accel = ",,"
        else:
            accel = f"{(9 + w) << 4},{(0 - w) << 4},{(1000 + w) << 4}"
        missing = night.PULSES_MISSING_MS[0] <= t < night.PULSES_MISSING_MS[1]
        pulses = "" if missing else str(night.total(t))
        k = t // 100
        vane = f"{250 + (k % 7) - 3}"
        print(f"{t},{accel},{pulses},{vane},{night.pose(t)}")


if __name__ == "__main__":
    main()
