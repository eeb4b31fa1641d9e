//! Time stamps: ISO 8601 and epoch seconds.
//!
//! Reference values: POSIX time of 2000-01-01T00:00:00Z is 946 684 800 s
//! (IEEE Std 1003.1, "Seconds Since the Epoch" formula: 30 years with 7 leap
//! days, 10 957 days × 86 400 s); other instants are checked against the
//! `time` crate's calendar (a reference library).

use standfast_sim::input::log::time::{civil_from_days, days_from_civil, parse_offset};
use standfast_sim::input::log::{TimeFormat, Timestamp};

const S: i64 = 1_000_000_000;

#[test]
fn iso8601_with_and_without_zone() {
    let p = |s: &str, off: i32| TimeFormat::Iso8601.parse(s, off).unwrap();
    // IEEE 1003.1 seconds-since-the-epoch: 2000-01-01T00:00:00Z = 946 684 800.
    assert_eq!(p("2000-01-01T00:00:00Z", 0).unix_ns(), 946_684_800 * S);
    assert_eq!(p("1970-01-01T00:00:00Z", 0).unix_ns(), 0);
    // The same instant written in three ways.
    let z = p("2025-11-14T21:00:00Z", 0);
    assert_eq!(p("2025-11-14T22:00:00+01:00", 0), z);
    assert_eq!(p("2025-11-14T22:00:00+0100", 0), z);
    assert_eq!(p("2025-11-14 16:00:00-05", 0), z);
    // No zone: the profile's offset applies.
    assert_eq!(p("2025-11-14T22:00:00", 3600), z);
    assert_eq!(p("2025-11-14T21:00", 0), z);
    // Fractions to the nanosecond, comma allowed (ISO 8601 §4.2.2.4).
    assert_eq!(
        p("2025-11-14T21:00:00.25Z", 0).unix_ns() - z.unix_ns(),
        S / 4
    );
    assert_eq!(
        p("2025-11-14T21:00:00,000000001Z", 0).unix_ns() - z.unix_ns(),
        1
    );
    // Against the `time` crate's calendar.
    let r = time::OffsetDateTime::from_unix_timestamp(z.unix_ns() / S).unwrap();
    assert_eq!(
        (r.year(), u8::from(r.month()), r.day(), r.hour()),
        (2025, 11, 14, 21)
    );
}

#[test]
fn bad_iso8601_is_refused() {
    for s in [
        "2025-02-29T00:00:00Z", // 2025 is not a leap year
        "2025-11-14T24:00:00Z",
        "2025-11-14T21:60:00Z",
        "2025-13-01T00:00:00Z",
        "2025-11-14",
        "2025-11-14T21:00:00Q",
        "2025-11-14T21:00:00+25:00",
        "14/11/2025 21:00",
        "",
    ] {
        assert!(TimeFormat::Iso8601.parse(s, 0).is_err(), "{s}");
    }
    // 2024 is a leap year (Gregorian rule).
    assert!(TimeFormat::Iso8601.parse("2024-02-29T00:00:00Z", 0).is_ok());
}

#[test]
fn epoch_seconds_are_exact() {
    let t = TimeFormat::EpochSeconds.parse("1763154000.02", 0).unwrap();
    assert_eq!(t.unix_ns(), 1_763_154_000 * S + 20_000_000);
    let t = TimeFormat::EpochMillis.parse("1763154000020", 0).unwrap();
    assert_eq!(t.unix_ns(), 1_763_154_000 * S + 20_000_000);
    let t = TimeFormat::EpochSeconds.parse("1.5e3", 0).unwrap();
    assert_eq!(t.unix_ns(), 1500 * S);
    for s in ["abc", "12:00", "1.2.3", "", "."] {
        assert!(TimeFormat::EpochSeconds.parse(s, 0).is_err(), "{s}");
    }
}

/// Log times are accepted from 1970-01-01T00:00:00Z up to, not including,
/// 2200-01-01T00:00:00Z (host-sim/src/log/time.rs, `EARLIEST` and `END`);
/// outside it a time is an error naming the range, never clamped (an epoch
/// of 1e300 was once read as the year 2262). 2200-01-01 is 7 258 118 400 s
/// after the epoch (days from 1970: 84 006, Python's `datetime.date`
/// difference, a reference library).
#[test]
fn times_outside_the_accepted_range_are_refused() {
    let end_s = 7_258_118_400_i64;
    assert_eq!(
        TimeFormat::Iso8601
            .parse("2199-12-31T23:59:59Z", 0)
            .unwrap()
            .unix_ns(),
        (end_s - 1) * S
    );
    assert_eq!(TimeFormat::EpochSeconds.parse("0", 0).unwrap().unix_ns(), 0);
    for (f, text) in [
        (TimeFormat::EpochSeconds, "-1.5"),
        (TimeFormat::EpochSeconds, "1e300"),
        (TimeFormat::EpochSeconds, "-1e300"),
        (TimeFormat::EpochSeconds, "7258118400"),
        (TimeFormat::EpochSeconds, "99999999999999999999999"),
        (TimeFormat::EpochMillis, "7258118400000"),
        (TimeFormat::EpochMillis, "1e30"),
        (TimeFormat::Iso8601, "2200-01-01T00:00:00Z"),
        (TimeFormat::Iso8601, "9999-12-31T23:59:59Z"),
        (TimeFormat::Iso8601, "0000-01-01T00:00:00Z"),
        (TimeFormat::Iso8601, "1970-01-01T00:30:00+01:00"),
    ] {
        let e = f.parse(text, 0).unwrap_err();
        assert!(
            e.contains("outside the accepted range 1970-01-01T00:00:00Z to 2199-12-31T23:59:59Z"),
            "{text}: {e}"
        );
        assert!(f.parse_bytes(text.as_bytes(), 0).is_err(), "{text}");
    }
}

#[test]
fn formatting_round_trips() {
    let t = Timestamp::from_unix_ns(1_763_154_000 * S + 250_000_000);
    assert_eq!(t.to_iso8601(3), "2025-11-14T21:00:00.250Z");
    assert_eq!(t.to_iso8601_offset(0, 3600), "2025-11-14T22:00:00+01:00");
    assert_eq!(TimeFormat::Iso8601.parse(&t.to_iso8601(9), 0).unwrap(), t);
    // Day counts against the `time` crate over four centuries, including
    // 1900 (not leap) and 2000 (leap).
    for days in (-25_000..25_000).step_by(97) {
        let (y, m, d) = civil_from_days(days);
        let r = time::Date::from_julian_day(i32::try_from(days + 2_440_588).unwrap()).unwrap();
        assert_eq!(
            (y, m, d),
            (
                i64::from(r.year()),
                u32::from(u8::from(r.month())),
                u32::from(r.day())
            )
        );
        assert_eq!(days_from_civil(y, m, d), days);
    }
}

#[test]
fn zone_offsets() {
    assert_eq!(parse_offset("Z").unwrap(), 0);
    assert_eq!(parse_offset("+01:00").unwrap(), 3600);
    assert_eq!(parse_offset("-0930").unwrap(), -34_200);
    assert!(parse_offset("CET").is_err());
}
