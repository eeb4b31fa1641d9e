#!/usr/bin/env python3
"""Writes short-night-host.csv: the wind and mount-pose inputs the firmware's
guard receives while replaying short-night.csv, as exact f32 values, so that
host-sim (`standfast replay`, profile.toml) feeds its guard the same numbers.

Why a second file: host-sim reads wind speeds, not anemometer pulse totals,
and converts degrees in f64, while the firmware converts on the board in f32.
This script reproduces the firmware's conversions in f32 arithmetic (each
Python f64 operation on f32 operands, rounded once to f32, is the IEEE-754
f32 result, because f64 carries more than 2 x 24 + 2 bits):

* wind, per 1 s gate (src/wind.rs `Anemometer::update`, `AnemometerCal`;
  src/replay.rs `ReplaySetup::example`: 0.75 m/s per Hz + 0.3 m/s, stall
  below 0.5 Hz): f = pulses * 1000 / dt_ms, v = 0.75 f + 0.3, reported when a
  latch is at least 1000 ms after the window start; the window restarts when
  the station faults the wind (no speed for more than 3000 ms,
  src/station.rs `Health::update`, `wind_stale_ms`);
* wind direction at the gate row (src/replay.rs `parse_degrees`, core
  `math::deg_to_rad` = deg * f32(PI / 180), `math::wrap_tau`);
* mount pose (src/pose.rs `MountPose::new`: hour angle through
  `math::wrap_pi` = wrap_tau(x + PI) - PI, declination unchanged).

The accelerometer is not here: host-sim reads short-night.csv's raw words
with a scale that reproduces the driver's f32 conversion exactly (profile.toml).

Usage: python3 make_host_inputs.py < short-night.csv > short-night-host.csv
"""

import math
import struct
import sys


def f32(x):
    return struct.unpack("<f", struct.pack("<f", x))[0]


PI = f32(math.pi)
TAU = f32(2.0 * math.pi)
DEG = f32(PI / 180.0)
SLOPE, OFFSET, STALL = f32(0.75), f32(0.3), f32(0.5)
GATE_MS, WIND_STALE_MS = 1000, 3000


def degrees(text):
    milli = round(float(text) * 1000)  # at most three decimals in the log
    return f32(f32(milli) / 1000.0)


def wrap_tau(x):
    w = f32(x - f32(TAU * math.floor(f32(x / TAU))))
    return w if 0.0 <= w < TAU else 0.0


def rad(deg):
    return f32(deg * DEG)


def main():
    # No comment line: host-sim's CSV reader takes the first line as the header.
    print("t_ms,wind_mps,wind_from_rad,ha_rad,dec_rad")
    start = None  # (total, t_ms) of the open gate window
    last_speed_ms = 0  # station start
    faulted = False
    header = False
    for line in sys.stdin:
        line = line.strip()
        if not line or line.startswith("#"):
            continue
        if not header:
            header = True
            continue
        t, _ax, _ay, _az, pulses, vane, ha, dec = line.split(",")
        t = int(t)
        wind = ""
        if pulses:
            total = int(pulses)
            if start is None or t < start[1]:
                start = (total, t)
            elif t - start[1] >= GATE_MS:
                f_hz = f32(f32(f32(total - start[0]) * 1000.0) / f32(t - start[1]))
                speed = f32(f32(SLOPE * f_hz) + OFFSET) if f_hz >= STALL and f_hz > 0 else 0.0
                start = (total, t)
                last_speed_ms = t
                from_rad = wrap_tau(rad(degrees(vane)))
                wind = f"{speed!r},{from_rad!r}"
        # The station's wind health after the read: a fault restarts the window.
        if not faulted and t - last_speed_ms > WIND_STALE_MS:
            faulted = True
            start = None
        elif faulted and t == last_speed_ms:
            faulted = False  # (the clearing time does not touch the window)
        pose = ""
        if ha and dec:
            h = f32(wrap_tau(f32(rad(degrees(ha)) + PI)) - PI)
            pose = f"{h!r},{rad(degrees(dec))!r}"
        if wind or pose:
            print(f"{t},{wind or ','},{pose or ','}")


if __name__ == "__main__":
    main()
