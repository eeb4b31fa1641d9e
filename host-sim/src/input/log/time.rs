//! Time stamps of log rows: ISO 8601 date-times (with or without a zone
//! offset) and epoch seconds or milliseconds, held as integer nanoseconds
//! since 1970-01-01T00:00:00Z so that ordering and equality are exact.

use core::fmt;

/// An instant, in nanoseconds since 1970-01-01T00:00:00Z (leap seconds not
/// counted, as in POSIX time).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Timestamp(i64);

/// Nanoseconds in one second.
pub const NS_PER_S: i64 = 1_000_000_000;

/// The earliest log time accepted: 1970-01-01T00:00:00Z (epoch 0).
pub const EARLIEST: Timestamp = Timestamp(0);

/// The first log time no longer accepted: 2200-01-01T00:00:00Z
/// (7 258 118 400 s after the epoch). Times from [`EARLIEST`] up to, not
/// including, this one are accepted; anything else in a log is a bad row
/// (a clock far off is a fault to see, not a time to clamp).
pub const END: Timestamp = Timestamp(7_258_118_400 * NS_PER_S);

/// The accepted time range in words, for messages.
pub const ACCEPTED_RANGE: &str = "1970-01-01T00:00:00Z to 2199-12-31T23:59:59Z";

/// Checks that `t` (parsed from `field`) is in the accepted range.
fn in_range(t: Timestamp, field: &[u8]) -> Result<Timestamp, String> {
    if (EARLIEST..END).contains(&t) {
        Ok(t)
    } else {
        Err(format!(
            "time \"{}\" is outside the accepted range {ACCEPTED_RANGE}",
            crate::input::bounded::bounded_bytes(field)
        ))
    }
}

impl Timestamp {
    /// From nanoseconds since the Unix epoch.
    #[must_use]
    pub const fn from_unix_ns(ns: i64) -> Timestamp {
        Timestamp(ns)
    }

    /// Nanoseconds since the Unix epoch.
    #[must_use]
    pub const fn unix_ns(self) -> i64 {
        self.0
    }

    /// From (possibly fractional) seconds since the Unix epoch, rounded to
    /// the nanosecond.
    #[must_use]
    #[allow(clippy::cast_possible_truncation)] // saturating float-to-int cast
    pub fn from_unix_s(s: f64) -> Timestamp {
        Timestamp((s * 1e9).round() as i64)
    }

    /// Seconds since the Unix epoch (resolution about 0.2 µs in this era).
    #[must_use]
    #[allow(clippy::cast_precision_loss)]
    pub fn unix_s(self) -> f64 {
        self.0 as f64 / 1e9
    }

    /// `self - earlier` in seconds.
    #[must_use]
    #[allow(clippy::cast_precision_loss)]
    pub fn seconds_since(self, earlier: Timestamp) -> f64 {
        self.0.saturating_sub(earlier.0) as f64 / 1e9
    }

    /// This instant plus `s` seconds.
    #[must_use]
    #[allow(clippy::cast_possible_truncation)]
    pub fn plus_s(self, s: f64) -> Timestamp {
        Timestamp(self.0.saturating_add((s * 1e9).round() as i64))
    }

    /// ISO 8601 in UTC with a `Z`, with `frac_digits` (0 to 9) fractional
    /// second digits, e.g. `2025-11-14T21:00:00.25Z` for 2.
    #[must_use]
    pub fn to_iso8601(self, frac_digits: u32) -> String {
        self.to_iso8601_offset(frac_digits, 0)
    }

    /// ISO 8601 in local time at `offset_s` east of UTC, followed by the
    /// offset (`Z` for 0, else `+hh:mm`).
    #[must_use]
    pub fn to_iso8601_offset(self, frac_digits: u32, offset_s: i32) -> String {
        let mut s = String::with_capacity(32);
        write_iso8601(&mut s, self, frac_digits, offset_s, true);
        s
    }
}

impl fmt::Display for Timestamp {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.to_iso8601(3))
    }
}

/// Writes `t` as ISO 8601 local time at `offset_s` east of UTC; with
/// `write_zone`, the offset follows (`Z` for UTC, else `+hh:mm`). The
/// characters of `write!` with `{y:04}-{m:02}-{d:02}T{hh:02}:{mm:02}:{ss:02}`,
/// the fraction zero-padded to `frac_digits` (at most 9) and the zone as
/// `{sign}{hh:02}:{mm:02}`, written digit by digit (a verdict CSV writes one
/// a line); a year outside 0 to 9999 or a zone of 100 h or more goes
/// through `write!` (tested against it, `tests::iso8601_is_the_formatted_text`).
pub fn write_iso8601(
    out: &mut String,
    t: Timestamp,
    frac_digits: u32,
    offset_s: i32,
    write_zone: bool,
) {
    let mut bytes = Vec::with_capacity(ISO_MAX_BYTES);
    push_iso8601_bytes(&mut bytes, t, frac_digits, offset_s, write_zone);
    // ASCII digits and signs, or `write!`'s text: always UTF-8.
    out.push_str(std::str::from_utf8(&bytes).unwrap_or_default());
}

/// [`write_iso8601`] appending bytes (the verdict CSV's line buffer).
pub fn push_iso8601_bytes(
    out: &mut Vec<u8>,
    t: Timestamp,
    frac_digits: u32,
    offset_s: i32,
    write_zone: bool,
) {
    let mut buf = [0_u8; ISO_MAX_BYTES];
    match iso8601_ascii(&mut buf, t, frac_digits, offset_s, write_zone) {
        Some(n) => out.extend_from_slice(buf.get(..n).unwrap_or_default()),
        None => {
            let mut s = String::new();
            write_iso8601_fmt(&mut s, t, frac_digits, offset_s, write_zone);
            out.extend_from_slice(s.as_bytes());
        }
    }
}

/// Longest text of [`iso8601_ascii`]: date and time 19, fraction 10, zone 6.
const ISO_MAX_BYTES: usize = 36;

/// The ASCII text of [`write_iso8601`] in `buf`, its length returned;
/// `None` (the caller uses `write!`) for a year outside 0 to 9999 or a zone
/// of 100 h or more.
fn iso8601_ascii(
    buf: &mut [u8; ISO_MAX_BYTES],
    t: Timestamp,
    frac_digits: u32,
    offset_s: i32,
    write_zone: bool,
) -> Option<usize> {
    let local_ns = t.0.saturating_add(i64::from(offset_s) * NS_PER_S);
    let days = local_ns.div_euclid(86_400 * NS_PER_S);
    let ns_of_day = local_ns.rem_euclid(86_400 * NS_PER_S);
    let (y, m, d) = civil_from_days(days);
    let zone_hours = offset_s.unsigned_abs() / 3600;
    let year = u32::try_from(y).ok().filter(|y| *y <= 9_999)?;
    if write_zone && zone_hours >= 100 {
        return None;
    }
    // 0 ≤ ns_of_day < 86 400 s: the clock's parts are small.
    let secs = u32::try_from(ns_of_day / NS_PER_S).unwrap_or(0);
    let frac = u32::try_from(ns_of_day % NS_PER_S).unwrap_or(0);
    let mut n = 0;
    let mut put = |b: u8| {
        if let Some(slot) = buf.get_mut(n) {
            *slot = b;
            n += 1;
        }
    };
    let digit = |v: u32| b'0' + u8::try_from(v % 10).unwrap_or(0);
    for p in [1_000, 100, 10, 1] {
        put(digit(year / p));
    }
    for (sep, v) in [
        (b'-', m),
        (b'-', d),
        (b'T', secs / 3600),
        (b':', (secs / 60) % 60),
        (b':', secs % 60),
    ] {
        put(sep);
        put(digit(v / 10));
        put(digit(v));
    }
    let digits = frac_digits.min(9);
    if digits > 0 {
        put(b'.');
        let scaled = frac / 10_u32.pow(9 - digits);
        for k in (0..digits).rev() {
            put(digit(scaled / 10_u32.pow(k)));
        }
    }
    if write_zone && offset_s == 0 {
        put(b'Z');
    } else if write_zone {
        put(if offset_s < 0 { b'-' } else { b'+' });
        let minutes = (offset_s.unsigned_abs() / 60) % 60;
        put(digit(zone_hours / 10));
        put(digit(zone_hours));
        put(b':');
        put(digit(minutes / 10));
        put(digit(minutes));
    }
    Some(n)
}

/// [`write_iso8601`] through `write!`: for years outside 0 to 9999, and the
/// reference its tests compare with.
fn write_iso8601_fmt(
    out: &mut String,
    t: Timestamp,
    frac_digits: u32,
    offset_s: i32,
    write_zone: bool,
) {
    use fmt::Write as _;
    let local_ns = t.0.saturating_add(i64::from(offset_s) * NS_PER_S);
    let days = local_ns.div_euclid(86_400 * NS_PER_S);
    let ns_of_day = local_ns.rem_euclid(86_400 * NS_PER_S);
    let (y, m, d) = civil_from_days(days);
    let secs = ns_of_day / NS_PER_S;
    let frac = ns_of_day % NS_PER_S;
    let _ = write!(
        out,
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}",
        secs / 3600,
        (secs / 60) % 60,
        secs % 60
    );
    let digits = frac_digits.min(9);
    if digits > 0 {
        let scaled = frac / 10_i64.pow(9 - digits);
        let _ = write!(out, ".{scaled:0w$}", w = digits as usize);
    }
    if write_zone {
        if offset_s == 0 {
            out.push('Z');
        } else {
            let sign = if offset_s < 0 { '-' } else { '+' };
            let a = offset_s.unsigned_abs();
            let _ = write!(out, "{sign}{:02}:{:02}", a / 3600, (a / 60) % 60);
        }
    }
}

/// Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant's
/// `days_from_civil` algorithm).
#[must_use]
pub fn days_from_civil(y: i64, m: u32, d: u32) -> i64 {
    let y = if m <= 2 { y - 1 } else { y };
    let era = y.div_euclid(400);
    let yoe = y.rem_euclid(400);
    let m = i64::from(m);
    let d = i64::from(d);
    let doy = (153 * (if m > 2 { m - 3 } else { m + 9 }) + 2) / 5 + d - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe - 719_468
}

/// The proleptic Gregorian date of a day count since 1970-01-01 (inverse of
/// [`days_from_civil`]).
#[must_use]
#[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)] // month and day are small
pub fn civil_from_days(z: i64) -> (i64, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

/// How a log's time column is written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TimeFormat {
    /// ISO 8601 date and time, `YYYY-MM-DDThh:mm[:ss[.fff]]` (a space may
    /// replace the `T`), followed by `Z`, `±hh:mm`, `±hhmm` or `±hh`, or by
    /// nothing, in which case the profile's zone offset applies.
    Iso8601,
    /// Seconds since 1970-01-01T00:00:00Z, decimal fraction allowed.
    EpochSeconds,
    /// Milliseconds since 1970-01-01T00:00:00Z, decimal fraction allowed.
    EpochMillis,
}

impl TimeFormat {
    /// Parses a time field; `default_offset_s` applies to ISO 8601 times
    /// written without a zone.
    ///
    /// # Errors
    /// A short description of what is wrong.
    pub fn parse(self, field: &str, default_offset_s: i32) -> Result<Timestamp, String> {
        if field.trim().is_empty() {
            return Err("empty time".to_owned());
        }
        let t = match self {
            TimeFormat::Iso8601 => parse_iso8601(field, default_offset_s),
            TimeFormat::EpochSeconds => parse_decimal_scaled(field, 9).map(Timestamp),
            TimeFormat::EpochMillis => parse_decimal_scaled(field, 6).map(Timestamp),
        }?;
        in_range(t, field.trim().as_bytes())
    }

    /// As [`TimeFormat::parse`] on trimmed bytes, without a detour through
    /// text for epoch times (the fast path of long logs).
    ///
    /// # Errors
    /// A short description of what is wrong.
    pub fn parse_bytes(self, field: &[u8], default_offset_s: i32) -> Result<Timestamp, String> {
        let shift = match self {
            TimeFormat::EpochSeconds => 9,
            TimeFormat::EpochMillis => 6,
            TimeFormat::Iso8601 => {
                let s =
                    core::str::from_utf8(field).map_err(|_| "time is not UTF-8 text".to_owned())?;
                return self.parse(s, default_offset_s);
            }
        };
        match parse_decimal_scaled_bytes(field, shift) {
            Some(ns) => in_range(Timestamp(ns), field),
            None => self.parse(&String::from_utf8_lossy(field), default_offset_s),
        }
    }
}

/// Parses a decimal number exactly into an integer scaled by 10^`shift`
/// (digits past the last kept place are truncated toward zero). Exponent
/// notation falls back to floating point.
fn parse_decimal_scaled(field: &str, shift: u32) -> Result<i64, String> {
    parse_decimal_scaled_bytes(field.trim().as_bytes(), shift).ok_or_else(|| {
        if field.trim().parse::<f64>().is_ok_and(f64::is_finite) {
            return format!(
                "time \"{}\" is outside the accepted range {ACCEPTED_RANGE}",
                crate::input::bounded::bounded(field.trim())
            );
        }
        format!(
            "time \"{}\" is not a decimal number (seconds or milliseconds since 1970-01-01T00:00:00Z)",
            crate::input::bounded::bounded(field.trim())
        )
    })
}

/// As `parse_decimal_scaled`, on bytes already trimmed; `None` when they
/// are not a decimal number.
#[must_use]
pub fn parse_decimal_scaled_bytes(b: &[u8], shift: u32) -> Option<i64> {
    short_decimal_scaled(b, shift).or_else(|| any_decimal_scaled(b, shift))
}

/// [`parse_decimal_scaled_bytes`] for any length, with checked arithmetic.
fn any_decimal_scaled(b: &[u8], shift: u32) -> Option<i64> {
    let (neg, body) = match b.first() {
        Some(b'-') => (true, b.get(1..)?),
        Some(b'+') => (false, b.get(1..)?),
        _ => (false, b),
    };
    let mut v: i64 = 0;
    let mut place: u32 = 0;
    let mut seen_dot = false;
    let mut n_digits = 0;
    for &c in body {
        match c {
            b'0'..=b'9' => {
                n_digits += 1;
                if !seen_dot {
                    v = v.checked_mul(10)?.checked_add(i64::from(c - b'0'))?;
                } else if place < shift {
                    v = v.checked_mul(10)?.checked_add(i64::from(c - b'0'))?;
                    place += 1;
                }
            }
            b'.' if !seen_dot => seen_dot = true,
            b'e' | b'E' => return parse_exponent_form(b, shift),
            _ => return None,
        }
    }
    if n_digits == 0 {
        return None;
    }
    v = v.checked_mul(10_i64.checked_pow(shift - place)?)?;
    Some(if neg { -v } else { v })
}

/// The common case of [`parse_decimal_scaled_bytes`] without overflow
/// checks per digit: an optional sign, digits and at most one point, 19
/// bytes at most, so the kept digits (at most 19) fit a `u64`. The same
/// value as the general loop, which handles everything else (`None` here
/// means "not this case", never "not a number").
fn short_decimal_scaled(b: &[u8], shift: u32) -> Option<i64> {
    /// 10⁰ to 10¹⁸.
    const POW10: [i64; 19] = {
        let mut t = [1_i64; 19];
        let mut i = 1;
        while i < 19 {
            t[i] = t[i - 1] * 10;
            i += 1;
        }
        t
    };
    let (neg, body) = match b.first() {
        Some(b'-') => (true, b.get(1..)?),
        Some(b'+') => (false, b.get(1..)?),
        _ => (false, b),
    };
    if body.len() > 19 {
        return None;
    }
    // One pass: the digits before the point, then at most `shift` after
    // it (the rest are checked and dropped, truncating toward zero).
    let shift_digits = usize::try_from(shift).ok()?;
    let mut v: u64 = 0;
    let mut dot = false;
    let mut keep = 0usize;
    let mut any_digit = false;
    for &c in body {
        let d = c.wrapping_sub(b'0');
        if d < 10 {
            any_digit = true;
            if !dot {
                v = v * 10 + u64::from(d);
            } else if keep < shift_digits {
                v = v * 10 + u64::from(d);
                keep += 1;
            }
        } else if c == b'.' && !dot {
            dot = true;
        } else {
            return None;
        }
    }
    if !any_digit {
        return None;
    }
    let scale = POW10.get(shift_digits.checked_sub(keep)?)?;
    let v = i64::try_from(v).ok()?.checked_mul(*scale)?;
    Some(if neg { -v } else { v })
}

/// Exponent notation through floating point; `None` when not a finite
/// number or when it does not fit an `i64` count of the scaled unit (no
/// clamping: a time out of range must stay out of range).
#[allow(clippy::cast_possible_truncation, clippy::cast_precision_loss)]
fn parse_exponent_form(b: &[u8], shift: u32) -> Option<i64> {
    let v: f64 = core::str::from_utf8(b).ok()?.parse().ok()?;
    let scaled = (v * 10f64.powi(i32::try_from(shift).unwrap_or(9))).round();
    // i64::MAX as f64 rounds up to 2^63, itself out of range.
    (scaled.is_finite() && scaled >= i64::MIN as f64 && scaled < i64::MAX as f64)
        .then_some(scaled as i64)
}

fn digits(s: &[u8]) -> Option<u32> {
    if s.is_empty() {
        return None;
    }
    let mut v: u32 = 0;
    for &b in s {
        if !b.is_ascii_digit() {
            return None;
        }
        v = v * 10 + u32::from(b - b'0');
    }
    Some(v)
}

/// Parses an ISO 8601 date-time (see [`TimeFormat::Iso8601`]).
///
/// # Errors
/// A short description of what is wrong.
pub fn parse_iso8601(field: &str, default_offset_s: i32) -> Result<Timestamp, String> {
    let s = field.trim();
    let bad = |why: &str| {
        format!(
            "\"{}\" is not an ISO 8601 date and time ({why})",
            crate::input::bounded::bounded(s)
        )
    };
    let b = s.as_bytes();
    let get = |r: core::ops::Range<usize>| b.get(r).ok_or_else(|| bad("too short"));
    let year = digits(get(0..4)?).ok_or_else(|| bad("year"))?;
    if get(4..5)? != b"-" || get(7..8)? != b"-" {
        return Err(bad("expected YYYY-MM-DD"));
    }
    let month = digits(get(5..7)?).ok_or_else(|| bad("month"))?;
    let day = digits(get(8..10)?).ok_or_else(|| bad("day"))?;
    if !matches!(get(10..11)?, b"T" | b"t" | b" ") {
        return Err(bad("expected T between date and time"));
    }
    let hour = digits(get(11..13)?).ok_or_else(|| bad("hour"))?;
    if get(13..14)? != b":" {
        return Err(bad("expected hh:mm"));
    }
    let minute = digits(get(14..16)?).ok_or_else(|| bad("minute"))?;
    let mut i = 16;
    let mut second = 0;
    let mut frac_ns: i64 = 0;
    if b.get(i) == Some(&b':') {
        second = digits(get(i + 1..i + 3)?).ok_or_else(|| bad("second"))?;
        i += 3;
        if matches!(b.get(i), Some(b'.' | b',')) {
            i += 1;
            let start = i;
            let mut scale = 100_000_000_i64;
            while let Some(&c) = b.get(i) {
                if !c.is_ascii_digit() {
                    break;
                }
                frac_ns += i64::from(c - b'0') * scale;
                scale /= 10;
                i += 1;
            }
            if i == start {
                return Err(bad("empty fraction"));
            }
        }
    }
    let offset_s: i64 = match b.get(i..).unwrap_or(&[]) {
        [] => i64::from(default_offset_s),
        [b'Z' | b'z'] => 0,
        [sign @ (b'+' | b'-'), rest @ ..] => {
            let (h, m) = match rest {
                [h1, h2] => (digits(&[*h1, *h2]), Some(0)),
                [h1, h2, m1, m2] => (digits(&[*h1, *h2]), digits(&[*m1, *m2])),
                [h1, h2, b':', m1, m2] => (digits(&[*h1, *h2]), digits(&[*m1, *m2])),
                _ => (None, None),
            };
            let (Some(h), Some(m)) = (h, m) else {
                return Err(bad("zone offset"));
            };
            if h > 23 || m > 59 {
                return Err(bad("zone offset"));
            }
            let v = i64::from(h * 3600 + m * 60);
            if *sign == b'-' {
                -v
            } else {
                v
            }
        }
        _ => return Err(bad("unexpected text after the time")),
    };
    let month_t = u8::try_from(month)
        .ok()
        .and_then(|m| time::Month::try_from(m).ok())
        .ok_or_else(|| bad("month out of range"))?;
    let day_u8 = u8::try_from(day).map_err(|_| bad("day out of range"))?;
    let year_i = i32::try_from(year).map_err(|_| bad("year"))?;
    time::Date::from_calendar_date(year_i, month_t, day_u8).map_err(|_| bad("no such date"))?;
    // 24:00:00 is not accepted; a leap second 60 is not representable here.
    if hour > 23 || minute > 59 || second > 59 {
        return Err(bad("time of day out of range"));
    }
    // Far outside the accepted range (and before any overflow below).
    if !(1969..=2200).contains(&year) {
        return Err(format!(
            "time \"{}\" is outside the accepted range {ACCEPTED_RANGE}",
            crate::input::bounded::bounded(s)
        ));
    }
    let days = days_from_civil(i64::from(year), month, day);
    let secs = days * 86_400 + i64::from(hour * 3600 + minute * 60 + second) - offset_s;
    Ok(Timestamp(secs * NS_PER_S + frac_ns))
}

/// Parses a zone offset written as `Z`, `UTC`, `±hh:mm`, `±hhmm` or `±hh`
/// into seconds east of UTC.
///
/// # Errors
/// A short description of what is wrong.
pub fn parse_offset(s: &str) -> Result<i32, String> {
    let t = s.trim();
    if t.eq_ignore_ascii_case("z") || t.eq_ignore_ascii_case("utc") {
        return Ok(0);
    }
    // Reuse the date-time parser on a fixed date.
    let probe = format!("1970-01-01T00:00:00{t}");
    let ts = parse_iso8601(&probe, 0)
        .map_err(|_| {
            format!(
                "\"{}\" is not a zone offset (write Z, +hh:mm or -hh:mm; accepted range -23:59 to +23:59)",
                crate::input::bounded::bounded(t)
            )
        })?;
    i32::try_from(-ts.unix_ns() / NS_PER_S).map_err(|_| {
        format!(
            "\"{}\" is outside the accepted range -23:59 to +23:59",
            crate::input::bounded::bounded(t)
        )
    })
}

#[cfg(test)]
mod tests {
    use super::{
        any_decimal_scaled, iso8601_ascii, push_iso8601_bytes, short_decimal_scaled, write_iso8601,
        write_iso8601_fmt, Timestamp, ISO_MAX_BYTES,
    };

    /// The digit-by-digit ISO 8601 text is `write!`'s: random instants over
    /// the whole range of a time stamp (nanoseconds in an `i64`: the years
    /// 1677 to 2262) and its ends, every fraction length 0 to 10, offsets
    /// 0, ±minutes, ±23:59 and beyond 99 h, with and without the zone.
    #[test]
    fn iso8601_is_the_formatted_text() {
        let mut x: u64 = 0x9E37_79B9_7F4A_7C15;
        let mut instants: Vec<i64> = vec![0, -1, 1, i64::MIN, i64::MAX, i64::MIN + 1, i64::MAX - 1];
        for _ in 0..20_000 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            instants.push(i64::from_ne_bytes(x.to_ne_bytes()));
        }
        for (i, &t) in instants.iter().enumerate() {
            let offset = [
                0, 60, -60, 3_600, -19_800, 86_340, -86_340, 360_000, -400_000,
            ][i % 9];
            for digits in 0..=10 {
                for zone in [true, false] {
                    let (mut a, mut b) = (String::from("x"), String::from("x"));
                    let mut c = b"x".to_vec();
                    write_iso8601(&mut a, Timestamp(t), digits, offset, zone);
                    write_iso8601_fmt(&mut b, Timestamp(t), digits, offset, zone);
                    push_iso8601_bytes(&mut c, Timestamp(t), digits, offset, zone);
                    assert_eq!(
                        a, b,
                        "{t} ns, {digits} digits, offset {offset} s, zone {zone}"
                    );
                    assert_eq!(
                        c,
                        b.as_bytes(),
                        "{t} ns, {digits} digits, offset {offset} s"
                    );
                    // The digit-by-digit path answers for every time stamp
                    // (years 1677 to 2262) and zone under 100 h; `write!`
                    // only beyond.
                    let mut buf = [0_u8; ISO_MAX_BYTES];
                    let answered =
                        iso8601_ascii(&mut buf, Timestamp(t), digits, offset, zone).is_some();
                    assert_eq!(
                        answered,
                        !zone || offset.unsigned_abs() < 360_000,
                        "{t}, {offset}"
                    );
                }
            }
        }
    }

    /// The short fast path gives the general loop's value wherever it
    /// answers (random decimals of 1 to 19 digits, with and without sign
    /// and point, and epoch-like times), and leaves the rest to it.
    #[test]
    fn short_path_matches_the_general_loop() {
        let mut x: u64 = 0x2545_F491_4F6C_DD1D;
        let mut answered = 0;
        for i in 0..100_000 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            let mut s = format!("{}", x >> (x % 40));
            s.truncate(1 + (x % 19) as usize);
            let dot = (x >> 5) as usize % (s.len() + 2);
            if dot < s.len() {
                s.insert(dot, '.');
            }
            if i % 3 == 0 {
                s.insert(0, if i % 2 == 0 { '-' } else { '+' });
            }
            for shift in [6, 9] {
                let want = any_decimal_scaled(s.as_bytes(), shift);
                if let Some(v) = short_decimal_scaled(s.as_bytes(), shift) {
                    assert_eq!(Some(v), want, "{s}");
                    answered += 1;
                }
            }
        }
        assert!(answered > 100_000);
        for s in [
            "1763154000.02",
            "-0.5",
            "12.",
            ".5",
            "1e3",
            "",
            "-",
            ".",
            "1.2.3",
            "x",
        ] {
            for shift in [6, 9] {
                let short = short_decimal_scaled(s.as_bytes(), shift);
                assert!(short.is_none() || short == any_decimal_scaled(s.as_bytes(), shift));
            }
        }
        assert_eq!(
            short_decimal_scaled(b"1763154000.02", 9),
            Some(1_763_154_000_020_000_000)
        );
    }

    proptest::proptest! {
        /// Any sign, up to 19 digits and a point anywhere or none, at the
        /// two scales the log times use: the one-pass short path gives the
        /// general checked loop's value (the reference) whenever it answers,
        /// and answers for every such number of at most 19 bytes that fits.
        #[test]
        fn short_path_is_the_general_loop(
            sign in proptest::sample::select(vec!["", "-", "+"]),
            digits in "[0-9]{1,19}",
            dot in 0usize..21,
            shift in proptest::sample::select(vec![6u32, 9]),
        ) {
            let mut s = format!("{sign}{digits}");
            if dot <= digits.len() {
                s.insert(sign.len() + dot, '.');
            }
            let want = any_decimal_scaled(s.as_bytes(), shift);
            let short = short_decimal_scaled(s.as_bytes(), shift);
            if short.is_some() {
                proptest::prop_assert_eq!(short, want, "{}", s);
            }
            let body = s.trim_start_matches(['-', '+']);
            if body.len() <= 19 && want.is_some() {
                proptest::prop_assert_eq!(short, want, "{}", s);
            }
        }
    }
}
