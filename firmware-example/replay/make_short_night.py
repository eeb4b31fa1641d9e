#!/usr/bin/env python3
"""Writes short-night.csv: an invented 40 s log for the firmware replay.

Rows every 100 ms. The accelerometer sits on a rig tilted 0.5 degrees toward
east (raw LIS3DH words at +/-2 g, high resolution: 1 mg per digit, shifted
left by 4), with a small repeating wobble. The anemometer's pulse frequency is
scripted per second; the vane points about 250 degrees; the mount reports its
pose every 5 s. Two faults are staged: the accelerometer does not acknowledge
for four rows from 25.0 s, and the pulse counter delivers nothing from 30.1 s
to 33.9 s. Everything here is invented for the demonstration.

Usage: python3 make_short_night.py > short-night.csv
"""

# Pulse frequency (Hz) during each second 0..39.
FREQ = [5] * 5 + [12] * 5 + [16] * 4 + [25] + [15] * 3 + [6] * 22
WOBBLE = [0, 1, -1, 0, 2, 0, -2, 1, 0, -1]


def total(t_ms):
    k = t_ms // 1000
    return sum(FREQ[:k]) + FREQ[k] * (t_ms % 1000) // 1000


def main():
    print("# standfast-firmware replay log: invented 40 s, see make_short_night.py")
    print("t_ms,accel_x,accel_y,accel_z,pulse_total,vane_from_deg,ha_deg,dec_deg")
    for i in range(400):
        t = i * 100
        w = WOBBLE[i % len(WOBBLE)]
        if 25000 <= t <= 25300:
            accel = ",,"
        else:
            accel = f"{(9 + w) << 4},{(0 - w) << 4},{(1000 + w) << 4}"
        pulses = "" if 30100 <= t < 34000 else str(total(t))
        vane = f"{250 + (i % 7) - 3}"
        pose = f"{-30 + t / 4000:.3f},20.000" if t % 5000 == 0 else ","
        print(f"{t},{accel},{pulses},{vane},{pose}")


if __name__ == "__main__":
    main()
