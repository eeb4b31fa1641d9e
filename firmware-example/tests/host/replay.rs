//! The replay harness: log parsing, line splitting, and the invented short
//! night replayed through the station. The station's events are derived by
//! hand from the log's script (replay/make_short_night.py) and the example
//! set-up (`ReplaySetup::example`): 0.75 m/s per Hz + 0.3 m/s, 1 s gate,
//! park at 12 m/s, alarm at 18 m/s, held 5 s, accelerometer stale after
//! 250 ms, wind after 3 s, faults cleared after 2 s healthy. The guard's
//! level times are read off a run (see the comments); its fault times follow
//! from its settings (`example_guard_config`).

use standfast_firmware::guard_adapter::example_rig;
use standfast_firmware::replay::{
    parse_degrees, parse_row, BadNumber, LineSplitter, Replay, ReplayError, ReplaySetup, SplitLine,
    HEADER,
};

const SHORT_NIGHT: &str = include_str!("../../replay/short-night.csv");

/// The station's event lines and the guard's own (`Replay::guard_events`).
fn replay_both(text: &str) -> Result<(Vec<String>, Vec<String>), ReplayError> {
    let rig = example_rig().unwrap();
    let mut r = Replay::new(&ReplaySetup::example(), &rig).unwrap();
    let mut out = Vec::new();
    let mut guard = Vec::new();
    for line in text.lines() {
        if let Some(rep) = r.feed_line(line)? {
            out.extend(rep.events.iter().map(|e| e.to_string()));
            guard.extend(r.guard_events().iter().map(|e| e.to_string()));
        }
    }
    Ok((out, guard))
}

fn replay_text(text: &str) -> Result<Vec<String>, ReplayError> {
    replay_both(text).map(|(station, _)| station)
}

// The guard's own events on the short night: what `guard event` lines the
// binaries print and what host-sim's `standfast replay --events` must give
// (ci.sh, host-sim/tests/sim/firmware_replay.rs). Guard settings:
// `example_guard_config()` = the defaults (watch 0.5, park 0.75, alarm 0.9,
// clear ratio 0.8, wind stale 10 s, one evaluation per 1000 ms) with a 20 s
// dwell, 30 s time to park and 10 s fault clearing time. Gate of second k
// reports at (k+1)·1000 ms.
//
// * 0 wind_speed no_reading: a guard starts in sensor_fault (it cannot
//   judge the rig before its sensors give readings) and says why in its
//   first step: the accelerometer gives a reading in that step, the wind
//   none yet (the station's first gate reports at 1000). No level event:
//   the guard was in sensor_fault before the step and stays there.
// * 14000 sensor_fault → park_now: the first wind sample (1000) starts the
//   wind record in fine bin 4 (250 ms bins); the 3-s gust is defined once
//   the record spans 12 bins, from bin 15 (3750). The physics runs once per
//   1000 ms from the first step (0, 1000, 2000, 3000, 4000, …): at 3000 no
//   gust yet, at 4000 the first figures; healthy from 4000, the 10 s fault
//   clearing time ends at 14000 (derived). The guard leaves sensor_fault to
//   the level the figures then call for, at least watch: by then the blow of
//   seconds 10–19 (20/21 Hz, 15.3/16.05 m/s; gates at 11000–14000) at the
//   observing pose (HA −30°, dec 20°) calls for park_now (that the blow
//   does it is by design; the level was read off a run).
// * 40000 park_now → watch: the mount reports its park pose (HA +90°,
//   dec 0°) from 20000, where the same peak gust gives a predicted
//   utilisation below 0.8 × 0.75 but not below 0.8 × 0.5 (read off a run:
//   at the observing pose it stays at park_now; at the park pose the guard
//   does not step down further within the log). Settled from the evaluation
//   at 20000, so the 20 s dwell ends at 40000 (derived from the settings).
// * 70100 wind_speed and wind_direction stale, watch → sensor_fault: the
//   last gate before the pulse gap reports at 60000; the guard calls a wind
//   sensor stale after more than 10 s, at the first row after 70000 (derived).
// * 83000 sensor_fault → watch: pulses return at 72000, the station's gate
//   (restarted by its own wind fault) reports at 73000, and the guard leaves
//   sensor_fault 10 s later, to no lower than watch (derived).
// * 93000 watch → park_now, 95000 park_now → alarm: the storm ramp from
//   second 90 (28, 32, 36 Hz) at the park pose; by design it ends in alarm,
//   which latches to the end of the log; the two times were read off a run.
const GUARD_EVENTS: [&str; 9] = [
    "event t_ms=0 kind=fault sensor=wind_speed class=no_reading",
    "event t_ms=14000 kind=level from=sensor_fault to=park_now",
    "event t_ms=40000 kind=level from=park_now to=watch",
    "event t_ms=70100 kind=fault sensor=wind_speed class=stale",
    "event t_ms=70100 kind=fault sensor=wind_direction class=stale",
    "event t_ms=70100 kind=level from=watch to=sensor_fault",
    "event t_ms=83000 kind=level from=sensor_fault to=watch",
    "event t_ms=93000 kind=level from=watch to=park_now",
    "event t_ms=95000 kind=level from=park_now to=alarm",
];

#[test]
fn the_short_night_gives_the_expected_guard_events() {
    let (_, guard) = replay_both(SHORT_NIGHT).unwrap();
    assert_eq!(guard, GUARD_EVENTS);
}

#[test]
fn the_short_night_gives_the_expected_station_events() {
    // Station (hand-derived from the script and `ReplaySetup::example`):
    // both lines start requested. The guard starts in sensor_fault (its
    // `no_reading` wind fault at 0, above) and asks for park and alarm
    // until 14000, so the station's own arming at 1000 (first wind speed)
    // switches no line, and the gate of second 10 (20 Hz, 15.3 m/s > 12),
    // which trips the backstop's park at 11000, asks for less than the
    // guard already does: no level event. At 14000 the guard leaves
    // sensor_fault for park_now (above): the level shown is its `park_now`
    // and the alarm line is energised (the park line stays requested).
    // Accelerometer silent 25000–25300: last good 24900, stale (> 250 ms)
    // at 25200 (the alarm line drops; park is already requested); good
    // from 25400, cleared at 27400. The guard steps down to `watch` at
    // 40000 (above): the park line is energised again (the backstop's 5 s
    // hold ended long before). Pulses missing 60100–71900: last speed 60000,
    // stale (> 3000 ms) at 63100; the first latch at 72000 opens a window,
    // speed at 73000, cleared at 75000. The guard's own wind faults and its
    // sensor_fault level at 70100, and its return to `watch` at 83000, come
    // as above; with the station healthy again both lines are energised.
    // The storm's first gate (28 Hz, 21.3 m/s > 18) at 91000 raises the
    // backstop's alarm (`limit_alarm`, the guard only at watch); the guard
    // reaches park_now at 93000 (still less than the backstop: no level
    // event) and alarm at 95000, when the level shown becomes its own.
    let events = replay_text(SHORT_NIGHT).unwrap();
    assert_eq!(
        events,
        [
            "event t_ms=0 kind=started",
            "event t_ms=0 kind=fault sensor=wind_speed class=no_reading",
            "event t_ms=14000 kind=level from=sensor_fault to=park_now",
            "event t_ms=14000 kind=alarm_off",
            "event t_ms=25200 kind=fault source=accel cause=bus",
            "event t_ms=25200 kind=alarm_on",
            "event t_ms=27400 kind=fault_cleared source=accel",
            "event t_ms=27400 kind=alarm_off",
            "event t_ms=40000 kind=level from=park_now to=watch",
            "event t_ms=40000 kind=park_off",
            "event t_ms=63100 kind=fault source=wind cause=stale",
            "event t_ms=63100 kind=park_on",
            "event t_ms=63100 kind=alarm_on",
            "event t_ms=70100 kind=fault sensor=wind_speed class=stale",
            "event t_ms=70100 kind=fault sensor=wind_direction class=stale",
            "event t_ms=70100 kind=level from=watch to=sensor_fault",
            "event t_ms=75000 kind=fault_cleared source=wind",
            "event t_ms=83000 kind=level from=sensor_fault to=watch",
            "event t_ms=83000 kind=park_off",
            "event t_ms=83000 kind=alarm_off",
            "event t_ms=91000 kind=level from=watch to=limit_alarm",
            "event t_ms=91000 kind=park_on",
            "event t_ms=91000 kind=alarm_on",
            "event t_ms=95000 kind=level from=limit_alarm to=alarm",
        ]
    );
}

#[test]
fn rows_parse_with_empty_fields_as_missing() {
    let r = parse_row("100,16,-32,16000,42,270.5,-15,30", 3).unwrap();
    assert_eq!(r.t_ms, 100);
    assert_eq!(r.accel.unwrap().words, [16, -32, 16000]);
    assert_eq!(r.pulse_total, Some(42));
    assert_eq!(r.vane_from_deg, Some(270.5));
    let pose = r.pose.unwrap();
    assert!((pose.hour_angle_rad + 15f32.to_radians()).abs() < 1e-6);
    let r = parse_row("200,,,,,,,", 4).unwrap();
    assert_eq!(
        (r.accel, r.pulse_total, r.vane_from_deg, r.pose),
        (None, None, None, None)
    );
}

/// The fixed-point degree parser agrees with Rust's standard, correctly
/// rounded `str::parse::<f32>` (the reference) wherever the decimal is a
/// multiple of 1/1000 whose f32 quotient rounds the same way, and rejects
/// what the log format does not allow.
#[test]
fn degrees_parse_in_fixed_point_like_the_standard_parser() {
    for text in [
        "0", "247", "-30.000", "20.125", "-21.25", "270.5", ".5", "+1.0", "359.999", "-0.001",
        " 12.5 ",
    ] {
        let std_value: f32 = text.trim().parse().unwrap();
        assert_eq!(parse_degrees(text), Ok(Some(std_value)), "{text}");
    }
    assert_eq!(parse_degrees(""), Ok(None));
    assert_eq!(parse_degrees("  "), Ok(None));
    for bad in [
        "-", ".", "1.2345", "1e3", "nan", "inf", "1..2", "1,5", "1234567", "--1", "12a",
    ] {
        assert_eq!(parse_degrees(bad), Err(BadNumber), "{bad}");
    }
}

/// The byte-wise integer fields (`t_ms` u64, `accel_*` i16, `pulse_total`
/// u32) accept and read exactly what Rust's standard `str::parse` of those
/// types does (the reference), after ASCII trimming: every string of up to
/// four characters over signs, digits, a blank and a letter, and the edges
/// of each type's range.
#[test]
fn integer_fields_read_like_the_standard_parser() {
    let alphabet = ['+', '-', '0', '1', '9', ' ', 'x'];
    let mut cases: Vec<String> = vec![String::new()];
    for len in 1..=4 {
        let mut idx = vec![0usize; len];
        loop {
            cases.push(idx.iter().map(|&i| alphabet[i]).collect());
            let mut k = 0;
            while k < len {
                idx[k] += 1;
                if idx[k] < alphabet.len() {
                    break;
                }
                idx[k] = 0;
                k += 1;
            }
            if k == len {
                break;
            }
        }
    }
    for edge in [
        "32767",
        "32768",
        "-32768",
        "-32769",
        "+32767",
        "0032767",
        "4294967295",
        "4294967296",
        "18446744073709551615",
        "18446744073709551616",
        "-18446744073709551616",
        "99999999999999999999",
        "000000000000000000000000001",
        "\t7\t",
    ] {
        cases.push(edge.to_string());
    }
    for s in &cases {
        let trimmed = s.trim_ascii();
        // t_ms: required, u64.
        let row = parse_row(format!("{s},,,,,,,"), 1);
        let want = trimmed.parse::<u64>();
        match (&row, &want) {
            (Ok(r), Ok(v)) => assert_eq!(r.t_ms, *v, "t_ms {s:?}"),
            (Err(e), Err(_)) => assert_eq!(
                *e,
                ReplayError::Field {
                    line: 1,
                    column: "t_ms"
                },
                "t_ms {s:?}"
            ),
            _ => panic!("t_ms {s:?}: {row:?} against the standard {want:?}"),
        }
        // accel_*: i16, all three the same value.
        let row = parse_row(format!("1,{s},{s},{s},,,,"), 1);
        match (trimmed.is_empty(), trimmed.parse::<i16>()) {
            (true, _) => assert_eq!(row.unwrap().accel, None, "accel {s:?}"),
            (false, Ok(v)) => assert_eq!(row.unwrap().accel.unwrap().words, [v; 3], "accel {s:?}"),
            (false, Err(_)) => assert_eq!(
                row,
                Err(ReplayError::Field {
                    line: 1,
                    column: "accel_x"
                }),
                "accel {s:?}"
            ),
        }
        // pulse_total: u32.
        let row = parse_row(format!("1,,,,{s},,,"), 1);
        match (trimmed.is_empty(), trimmed.parse::<u32>()) {
            (true, _) => assert_eq!(row.unwrap().pulse_total, None, "pulses {s:?}"),
            (false, Ok(v)) => assert_eq!(row.unwrap().pulse_total, Some(v), "pulses {s:?}"),
            (false, Err(_)) => assert_eq!(
                row,
                Err(ReplayError::Field {
                    line: 1,
                    column: "pulse_total"
                }),
                "pulses {s:?}"
            ),
        }
    }
}

/// A byte above 0x7F anywhere in a line, a comment's included, and bytes
/// that are not UTF-8 at all, are an error of that line (the board reads
/// the log as bytes; the host gives it the same bytes).
#[test]
fn a_line_that_is_not_ascii_is_an_error_of_its_line() {
    let rig = example_rig().unwrap();
    for (bad, what) in [
        (&b"# wind 20\xc2\xb0 off north"[..], "UTF-8 comment"),
        (&b"100,,,,,247\xc2\xb0,,"[..], "UTF-8 in a field"),
        (&b"100,,,,,\xff,,"[..], "not UTF-8"),
    ] {
        let mut r = Replay::new(&ReplaySetup::example(), &rig).unwrap();
        assert_eq!(r.feed_line(HEADER).unwrap().map(|_| ()), None);
        assert!(r.feed_line("100,,,,,,,").unwrap().is_some());
        let e = r.feed_line(bad).unwrap_err();
        assert_eq!(e, ReplayError::NotAscii { line: 3 }, "{what}");
        assert_eq!(e.to_string(), "error line=3 reason=not_ascii", "{what}");
        assert_eq!(r.rows(), 1, "{what}: no step for the bad line");
    }
}

#[test]
fn bad_rows_name_their_line_and_column() {
    assert_eq!(parse_row("1,2,3", 7), Err(ReplayError::Columns { line: 7 }));
    assert_eq!(
        parse_row("1,2,3,4,5,6,7,8,9", 7),
        Err(ReplayError::Columns { line: 7 })
    );
    assert_eq!(
        parse_row("x,2,3,4,5,6,7,8", 7),
        Err(ReplayError::Field {
            line: 7,
            column: "t_ms"
        })
    );
    // 40000 does not fit a signed 16-bit output word.
    assert_eq!(
        parse_row("1,40000,3,4,5,6,7,8", 7),
        Err(ReplayError::Field {
            line: 7,
            column: "accel_x"
        })
    );
    // Only some of the three axes: not a valid sensor state.
    assert_eq!(
        parse_row("1,1,,4,5,6,7,8", 7),
        Err(ReplayError::Field {
            line: 7,
            column: "accel_x"
        })
    );
    // Declination past the pole.
    assert_eq!(
        parse_row("1,1,2,4,5,6,7,95", 7),
        Err(ReplayError::Field {
            line: 7,
            column: "ha_deg"
        })
    );
}

#[test]
fn a_log_needs_its_header_and_forward_time() {
    assert_eq!(
        replay_text("# c\nt_ms,x\n"),
        Err(ReplayError::Header { line: 2 })
    );
    let text = format!("{HEADER}\n100,,,,,,,\n50,,,,,,,\n");
    assert_eq!(
        replay_text(&text),
        Err(ReplayError::TimeBackwards { line: 3 })
    );
    assert_eq!(
        ReplayError::Field {
            line: 9,
            column: "t_ms"
        }
        .to_string(),
        "error line=9 reason=field column=t_ms"
    );
}

#[test]
fn lines_split_across_chunks_and_overlong_lines_are_flagged() {
    let mut s = LineSplitter::<8>::new();
    let mut got: Vec<String> = Vec::new();
    let mut each = |l: SplitLine<'_>| -> Result<(), ()> {
        got.push(match l {
            SplitLine::Text(t) => String::from_utf8(t.to_vec()).unwrap(),
            SplitLine::TooLong => "<too long>".to_string(),
        });
        Ok(())
    };
    s.feed(b"ab", &mut each).unwrap();
    s.feed(b"c\nde", &mut each).unwrap();
    s.feed(b"\n0123456789\nlast", &mut each).unwrap();
    s.finish(&mut each).unwrap();
    assert_eq!(got, ["abc", "de", "<too long>", "last"]);
}

/// A few rows of the short night's first second, every 10 ms, with one gap
/// of 60 ms (from 100 to 160 ms).
fn rows_with_a_60_ms_gap() -> String {
    let mut text = format!("{HEADER}\n");
    for t in (0..=100).step_by(10).chain([160, 170]) {
        text.push_str(&format!("{t},144,0,16000,0,247,,\n"));
    }
    text
}

#[test]
fn the_100hz_setup_steps_every_10_ms() {
    // `ReplaySetup::example_100hz` (documented there): the example with a
    // 10 ms period, the configuration read back every 100 steps (once a
    // second, as the example's every 10 steps at 100 ms) and the sensor at
    // 200 Hz, twice the loop rate; nothing else differs.
    let (ten, hundred) = (ReplaySetup::example(), ReplaySetup::example_100hz());
    assert_eq!(hundred.station.period_ms, 10);
    assert_eq!(hundred.station.verify_every_steps, 100);
    assert_eq!(
        u64::from(hundred.station.period_ms) * u64::from(hundred.station.verify_every_steps),
        u64::from(ten.station.period_ms) * u64::from(ten.station.verify_every_steps)
    );
    assert_eq!(
        hundred.accel.rate,
        standfast_firmware::lis3dh::DataRate::Hz200
    );
    let mut same = hundred;
    same.station.period_ms = ten.station.period_ms;
    same.station.verify_every_steps = ten.station.verify_every_steps;
    same.accel.rate = ten.accel.rate;
    assert_eq!(same, ten);
    // The station calls a step late after more than two periods: a 60 ms
    // gap is late at 10 ms, not at 100 ms.
    let rig = example_rig().unwrap();
    let late = |setup: &ReplaySetup| -> Vec<String> {
        let mut r = Replay::new(setup, &rig).unwrap();
        let mut out = Vec::new();
        for line in rows_with_a_60_ms_gap().lines() {
            if let Some(rep) = r.feed_line(line).unwrap() {
                out.extend(
                    rep.events
                        .iter()
                        .map(|e| e.to_string())
                        .filter(|e| e.contains("kind=late")),
                );
            }
        }
        out
    };
    assert_eq!(
        late(&ReplaySetup::example_100hz()),
        ["event t_ms=160 kind=late gap_ms=60"]
    );
    assert!(late(&ReplaySetup::example()).is_empty());
}
