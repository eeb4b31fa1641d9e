//! The fast path of the row reader: a plain row read in one pass over its
//! bytes, each cell parsed as it is met, with no list of field ends.
//!
//! It answers only for rows it reads exactly as the general path
//! (`CsvSource`'s splitter, trimming and parsers) does, and otherwise
//! declines (`None`) without consuming anything, so that the general path
//! reads the row (and reports what is wrong with it, if anything). It
//! takes a row that ends in a line feed within the bytes given and whose
//! cells are all of these:
//! * a cell the profile does not read: any bytes but a quote or a carriage
//!   return;
//! * an epoch time: digits and at most one point, 1 to 19 bytes, inside the
//!   accepted range (the general path's exact integer reading; an ISO 8601
//!   time goes through the general time parser);
//! * a number: empty, or an optional minus sign, 1 to 15 digits and at most
//!   one point (Clinger's fast path, the same value as the standard
//!   library's parser);
//! * a word (pier side, flag): any bytes but a quote or a carriage return,
//!   read by the general word reader.
//!
//! Everything else (signs on times, spaces around numbers, exponents, long
//! numbers, quotes, carriage returns, a wrong field count, a bad word, a
//! partial accelerometer, a time out of range, a row cut by the end of the
//! buffer) is declined. The tests in this module and `source.rs` check the
//! answers against the general path and `str::parse`.

use super::profile::{AxisSource, ColumnProfile};
use super::record::{Channel, ChannelKind, ChannelSet, N_CHANNELS};
use super::time::{TimeFormat, Timestamp, END};

/// Where a column's value goes in a row.
#[derive(Clone, Copy, Debug)]
pub(super) enum Slot {
    /// Accelerometer sensor axis 0, 1 or 2 (mapped to the rig frame once
    /// the row's three axes are read).
    Sensor(usize),
    /// Another channel.
    Channel(Channel),
}

/// A mapped column with what its cells need, worked out once per file.
#[derive(Clone, Debug)]
pub(super) struct Column {
    /// Field index in the row.
    pub(super) idx: usize,
    pub(super) slot: Slot,
    /// A word channel (pier side, flag) rather than a number.
    pub(super) word: bool,
    pub(super) profile: ColumnProfile,
}

impl Column {
    pub(super) fn new(idx: usize, profile: ColumnProfile) -> Column {
        let slot = match profile.channel {
            Channel::AccelX => Slot::Sensor(0),
            Channel::AccelY => Slot::Sensor(1),
            Channel::AccelZ => Slot::Sensor(2),
            c => Slot::Channel(c),
        };
        Column {
            idx,
            slot,
            word: !matches!(profile.channel.kind(), ChannelKind::Quantity(_)),
            profile,
        }
    }
}

/// Stores the value of column `c` in a row being read: a sensor axis in
/// `sensor` (counted in `n_accel`), another channel in `values` and `set`.
pub(super) fn store(
    c: &Column,
    v: f64,
    sensor: &mut [f64; 3],
    n_accel: &mut u32,
    values: &mut [f64; N_CHANNELS],
    set: &mut ChannelSet,
) {
    match c.slot {
        Slot::Sensor(a) => {
            if let Some(s) = sensor.get_mut(a) {
                *s = v;
                *n_accel += 1;
            }
        }
        Slot::Channel(ch) => {
            if let Some(slot) = values.get_mut(ch.index()) {
                *slot = v;
                set.insert(ch);
            }
        }
    }
}

/// The accelerometer's three sensor axes mapped onto the rig frame, into
/// `values` and `set`.
pub(super) fn accel_to_rig(
    sensor: &[f64; 3],
    axes: &[AxisSource; 3],
    values: &mut [f64; N_CHANNELS],
    set: &mut ChannelSet,
) {
    let rig = [Channel::AccelX, Channel::AccelY, Channel::AccelZ];
    for (ch, src) in rig.iter().zip(axes) {
        let s = sensor.get(src.sensor_axis).copied().unwrap_or(f64::NAN);
        if let Some(slot) = values.get_mut(ch.index()) {
            *slot = src.sign * s;
            set.insert(*ch);
        }
    }
}

/// What a field of a row is read as.
#[derive(Clone, Debug)]
enum Role {
    /// Not read.
    Skip,
    /// The time column.
    Time,
    /// A number column, its value stored at channel `to`: the column's
    /// own channel, or for an accelerometer axis (`accel`) the rig axis
    /// it feeds, times `sign` (the profile's `accel_axes`).
    Number {
        profile: ColumnProfile,
        to: Channel,
        accel: bool,
        sign: f64,
    },
    /// A word column (pier side, flag).
    Word(ColumnProfile),
}

/// A field of a row as the fast path reads it.
#[derive(Clone, Debug)]
struct Field {
    role: Role,
    /// The byte that ends the field: the delimiter, or a line feed for
    /// the last field.
    end: u8,
    /// The bytes of this field and all after it empty (delimiters and the
    /// line feed, little-endian) and the mask of their bytes, when they
    /// fit in eight bytes and hold no time (which is never empty); mask 0
    /// otherwise.
    rest_empty: u64,
    rest_mask: u64,
}

/// The fast path's reading of one file's rows, worked out once.
#[derive(Clone, Debug)]
pub(super) struct Plan {
    /// The fields in order (as many as the header's).
    fields: Vec<Field>,
    delimiter: u8,
    /// 10^`shift` time units a second for epoch times (9 for seconds, 6
    /// for milliseconds); `None` for ISO 8601 times.
    time_shift: Option<u32>,
    time_format: TimeFormat,
    zone_offset_s: i32,
    /// The first eight bytes of the last epoch time read by words and
    /// their reading ([`digits8`]).
    last_head: HeadCache,
}

/// Eight bytes and what [`digits8`] gives for them.
type HeadCache = core::cell::Cell<(u64, (usize, u64))>;

/// A cache that holds a true pair: zero bytes, which [`digits8`] reads as
/// no digit.
fn empty_head() -> HeadCache {
    core::cell::Cell::new((0, digits8(0)))
}

/// 10⁰ to 10⁹.
const POW10_U64: [u64; 10] = [
    1,
    10,
    100,
    1_000,
    10_000,
    100_000,
    1_000_000,
    10_000_000,
    100_000_000,
    1_000_000_000,
];

/// Powers of ten exactly representable in `f64`, 10⁰ to 10¹⁵.
const POW10_F64: [f64; 16] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
];

/// A number cell as the fast path reads it: `None` to decline, else the
/// value (`None` for an empty cell) and the byte that ended the cell.
type Cell = Option<(Option<f64>, u8)>;

impl Plan {
    /// The plan for a file with `n_fields` fields, or `None` when the fast
    /// path does not apply: a delimiter that can be part of a number (a
    /// digit, point or sign), a field read twice (two channels, or a
    /// channel and the time, from one column), or accelerometer axes that
    /// are not a one-to-one mapping.
    pub(super) fn new(
        n_fields: usize,
        time_idx: usize,
        cols: &[Column],
        axes: &[AxisSource; 3],
        delimiter: u8,
        time_format: TimeFormat,
        zone_offset_s: i32,
    ) -> Option<Plan> {
        if delimiter.is_ascii_digit() || matches!(delimiter, b'.' | b'-' | b'+' | b'\n') {
            return None;
        }
        let mut roles = vec![Role::Skip; n_fields];
        *roles.get_mut(time_idx)? = Role::Time;
        for c in cols {
            let r = roles.get_mut(c.idx)?;
            if !matches!(r, Role::Skip) {
                return None;
            }
            let profile = c.profile.clone();
            *r = match c.slot {
                _ if c.word => Role::Word(profile),
                Slot::Channel(to) => Role::Number {
                    profile,
                    to,
                    accel: false,
                    sign: 1.0,
                },
                Slot::Sensor(a) => {
                    // The rig axis this sensor axis feeds: one exactly,
                    // else the fast path does not apply.
                    let mut feeds = axes.iter().enumerate().filter(|(_, s)| s.sensor_axis == a);
                    let (j, src) = feeds.next()?;
                    if feeds.next().is_some() {
                        return None;
                    }
                    Role::Number {
                        profile,
                        to: *[Channel::AccelX, Channel::AccelY, Channel::AccelZ].get(j)?,
                        accel: true,
                        sign: src.sign,
                    }
                }
            };
        }
        let last = n_fields.checked_sub(1)?;
        let fields = (0..n_fields)
            .map(|i| {
                let rest = roles.get(i..).unwrap_or_default();
                let no_time = !rest.iter().any(|r| matches!(r, Role::Time));
                let (rest_empty, rest_mask) = if rest.len() <= 8 && no_time {
                    let mut bytes = [0u8; 8];
                    let mut mask = [0u8; 8];
                    for (j, (b, m)) in bytes.iter_mut().zip(&mut mask).take(rest.len()).enumerate()
                    {
                        *b = if j + 1 == rest.len() {
                            b'\n'
                        } else {
                            delimiter
                        };
                        *m = 0xff;
                    }
                    (u64::from_le_bytes(bytes), u64::from_le_bytes(mask))
                } else {
                    (0, 0)
                };
                Field {
                    role: roles.get(i).cloned().unwrap_or(Role::Skip),
                    end: if i == last { b'\n' } else { delimiter },
                    rest_empty,
                    rest_mask,
                }
            })
            .collect();
        let time_shift = match time_format {
            TimeFormat::EpochSeconds => Some(9),
            TimeFormat::EpochMillis => Some(6),
            TimeFormat::Iso8601 => None,
        };
        Some(Plan {
            fields,
            delimiter,
            time_shift,
            time_format,
            zone_offset_s,
            last_head: empty_head(),
        })
    }

    /// Reads the row at the start of `bytes` into `values` and `set`
    /// (`set` empty on entry; only the values of its channels are
    /// written, and both may be written to when the path declines): its
    /// time and its length including the line feed, or `None` to leave
    /// the row to the general path.
    ///
    /// Inlined into its one caller (`CsvSource::next_row_into`): otherwise
    /// whether the compiler does so depends on how it happens to split the
    /// crate, and the log reader costs about 40 instructions a row more
    /// when it does not.
    #[inline]
    pub(super) fn parse_row(
        &self,
        bytes: &[u8],
        values: &mut [f64; N_CHANNELS],
        set: &mut ChannelSet,
    ) -> Option<(Timestamp, usize)> {
        // A blank line is the general path's to skip.
        if *bytes.first()? == b'\n' {
            return None;
        }
        let d = self.delimiter;
        let mut p = 0;
        let mut time = None;
        let mut n_accel = 0;
        for f in &self.fields {
            // An empty cell (but the time's): the field's end at once.
            // Each field but the last ends at a delimiter, the last at the
            // line feed: the row has the header's number of fields.
            if *bytes.get(p)? == f.end && !matches!(f.role, Role::Time) {
                // All the cells left empty (the usual end of a row), seen
                // eight bytes at a time.
                if f.rest_mask != 0 {
                    if let Some(w) = bytes.get(p..p + 8) {
                        let mut word = [0u8; 8];
                        word.copy_from_slice(w);
                        if (u64::from_le_bytes(word) ^ f.rest_empty) & f.rest_mask == 0 {
                            p += (f.rest_mask.trailing_ones() / 8) as usize;
                            break;
                        }
                    }
                }
                p += 1;
                continue;
            }
            let end = match &f.role {
                Role::Skip => skip_cell(bytes, &mut p, d)?,
                Role::Time => {
                    let (t, end) = self.time_cell(bytes, &mut p)?;
                    time = Some(t);
                    end
                }
                Role::Number {
                    profile,
                    to,
                    accel,
                    sign,
                } => {
                    let (raw, end) = number_cell(bytes, &mut p, d)?;
                    if let Some(x) = raw {
                        // As the general path: the SI value, and for an
                        // accelerometer axis the rig axis's sign times it.
                        let v = profile.to_si(x);
                        *values.get_mut(to.index())? = if *accel { *sign * v } else { v };
                        set.insert(*to);
                        n_accel += u32::from(*accel);
                    }
                    end
                }
                Role::Word(profile) => {
                    let from = p;
                    let end = skip_cell(bytes, &mut p, d)?;
                    let cell = bytes.get(from..p - 1)?.trim_ascii();
                    if !cell.is_empty() {
                        let text = core::str::from_utf8(cell).ok()?;
                        let v = profile.channel.parse_word(text)?;
                        *values.get_mut(profile.channel.index())? = v;
                        set.insert(profile.channel);
                    }
                    end
                }
            };
            if end != f.end {
                return None;
            }
        }
        // All three accelerometer axes or none, as the general path wants.
        if n_accel != 0 && n_accel != 3 {
            return None;
        }
        Some((time?, p))
    }

    /// The time cell at `*p`. Inlined into [`Plan::parse_row`] (as that
    /// is into its caller): left to itself the compiler sometimes calls it,
    /// about 40 instructions a row more.
    #[inline]
    fn time_cell(&self, bytes: &[u8], p: &mut usize) -> Option<(Timestamp, u8)> {
        match self.time_shift {
            Some(shift) => epoch_cell(bytes, p, self.delimiter, shift, &self.last_head),
            None => {
                let from = *p;
                let end = skip_cell(bytes, p, self.delimiter)?;
                let cell = bytes.get(from..*p - 1)?.trim_ascii();
                if cell.is_empty() {
                    return None;
                }
                let t = self
                    .time_format
                    .parse_bytes(cell, self.zone_offset_s)
                    .ok()?;
                Some((t, end))
            }
        }
    }
}

/// Passes over the cell at `*p` and the byte that ends it (the delimiter or
/// a line feed), which it returns; `None` at a quote, a carriage return or
/// the end of `bytes`.
#[inline]
fn skip_cell(bytes: &[u8], p: &mut usize, delimiter: u8) -> Option<u8> {
    loop {
        let b = *bytes.get(*p)?;
        *p += 1;
        if b == delimiter || b == b'\n' {
            return Some(b);
        }
        if b == b'"' || b == b'\r' {
            return None;
        }
    }
}

/// The number cell at `*p` (see [`Cell`]). The value is the digits as an
/// integer m < 10^15 < 2^53 divided by 10^(digits after the point), both
/// exact in `f64`, so the one correctly rounded division gives the value
/// of the standard library's correctly rounding parser.
#[inline]
#[allow(clippy::cast_precision_loss)] // m < 10^15 < 2^53: exact
fn number_cell(bytes: &[u8], p: &mut usize, delimiter: u8) -> Cell {
    let mut q = *p;
    let mut b = *bytes.get(q)?;
    let neg = b == b'-';
    if neg {
        q += 1;
        b = *bytes.get(q)?;
    }
    // The digits before the point, then those after it; the value wraps
    // only past 19 digits, which are declined below.
    let mut m: u64 = 0;
    let int_from = q;
    while let Some(v) = digit(b) {
        m = m.wrapping_mul(10).wrapping_add(v);
        q += 1;
        b = *bytes.get(q)?;
    }
    let mut digits = q - int_from;
    let dot = b == b'.';
    let mut frac = 0;
    if dot {
        q += 1;
        b = *bytes.get(q)?;
        let frac_from = q;
        while let Some(v) = digit(b) {
            m = m.wrapping_mul(10).wrapping_add(v);
            q += 1;
            b = *bytes.get(q)?;
        }
        frac = q - frac_from;
        digits += frac;
    }
    if b != delimiter && b != b'\n' {
        return None;
    }
    *p = q + 1;
    if digits == 0 {
        // An empty cell holds no value; a lone sign or point is not a
        // number (the general path says so).
        return if neg || dot { None } else { Some((None, b)) };
    }
    if digits > 15 {
        return None;
    }
    // Through i64, one conversion instruction: m < 2^53 either way.
    #[allow(clippy::cast_possible_wrap)]
    let x = m as i64 as f64 / *POW10_F64.get(frac)?;
    Some((Some(if neg { -x } else { x }), b))
}

/// [`epoch_cell`] for the usual cell (up to 15 digits, then at most
/// `shift` and fewer than 8 after the point), eight bytes at a time:
/// the time, the byte that ended the cell and the position after it; `None`
/// leaves the cell to the byte-by-byte reading (which answers or declines).
#[inline]
fn epoch_cell_by_words(
    bytes: &[u8],
    from: usize,
    delimiter: u8,
    shift: u32,
    last_head: &HeadCache,
) -> Option<(Timestamp, u8, usize)> {
    // The first eight bytes of a log's times change seldom (every 100 s
    // for epoch seconds): their reading is kept for the next row.
    let w = word_at(bytes, from)?;
    let (word, (n, head)) = last_head.get();
    let (n, head) = if w == word {
        (n, head)
    } else {
        let d = digits8(w);
        last_head.set((w, d));
        d
    };
    // The integer digits; the values wrap only past 19 digits, which
    // the length check below declines.
    let (mut v, mut q) = if n == 8 {
        let (n2, tail) = digits8(word_at(bytes, from + 8)?);
        if n2 == 8 {
            return None;
        }
        (
            head.wrapping_mul(*POW10_U64.get(n2)?).wrapping_add(tail),
            from + 8 + n2,
        )
    } else {
        (head, from + n)
    };
    let mut any = q > from;
    let mut keep = 0;
    let mut b = *bytes.get(q)?;
    if b == b'.' {
        let (nf, frac) = digits8(word_at(bytes, q + 1)?);
        if nf == 8 || u32::try_from(nf).ok()? > shift {
            return None;
        }
        v = v.wrapping_mul(*POW10_U64.get(nf)?).wrapping_add(frac);
        keep = nf;
        any |= nf > 0;
        q += 1 + nf;
        b = *bytes.get(q)?;
    }
    if !any || (b != delimiter && b != b'\n') || q - from > 19 {
        return None;
    }
    let scale = *POW10_U64.get(usize::try_from(shift).ok()?.checked_sub(keep)?)?;
    let ns = i64::try_from(v.checked_mul(scale)?).ok()?;
    (ns < END.unix_ns()).then_some((Timestamp::from_unix_ns(ns), b, q + 1))
}

/// The eight bytes at `at`, little-endian (the first byte lowest), when
/// there are eight.
#[inline]
fn word_at(bytes: &[u8], at: usize) -> Option<u64> {
    let w = bytes.get(at..at.checked_add(8)?)?;
    let mut word = [0u8; 8];
    word.copy_from_slice(w);
    Some(u64::from_le_bytes(word))
}

/// The run of ASCII digits at the start of the eight bytes `w` (the first
/// byte lowest): its length, 0 to 8, and its value.
///
/// Each byte less `'0'` is a digit value 0 to 9 exactly where the byte is
/// a digit; the first other byte is the lowest whose difference, or the
/// difference plus 0x76, has its high bit set (a borrow or carry runs only
/// upward, from that byte on). The digits, moved to the top bytes (zeros
/// below are leading zeros), are combined in pairs, fours and eights by
/// three multiplications (D. Lemire, "Quickly parsing eight digits", 2018,
/// as in simdjson and fast_float).
#[inline]
fn digits8(w: u64) -> (usize, u64) {
    const ONES: u64 = 0x0101_0101_0101_0101;
    let t = w.wrapping_sub(ONES * u64::from(b'0'));
    let other = (t.wrapping_add(ONES * 0x76) | t) & (ONES * 0x80);
    let n = (other.trailing_zeros() / 8) as usize;
    if n == 0 {
        return (0, 0);
    }
    let t = t << (8 * (8 - n));
    let t = t.wrapping_mul(10).wrapping_add(t >> 8);
    let low = t & 0x0000_00ff_0000_00ff;
    let high = (t >> 16) & 0x0000_00ff_0000_00ff;
    let v = low
        .wrapping_mul(100 + (1_000_000 << 32))
        .wrapping_add(high.wrapping_mul(1 + (10_000 << 32)))
        >> 32;
    (n, v)
}

/// The value of an ASCII digit.
#[inline]
fn digit(b: u8) -> Option<u64> {
    let v = b.wrapping_sub(b'0');
    (v < 10).then_some(u64::from(v))
}

/// The epoch time cell at `*p` (10^`shift` ns a unit), in nanoseconds: the integer digits and the first `shift` digits after
/// the point, the rest dropped (truncation toward zero), as the general
/// path reads it; `None` for anything but 1 to 19 bytes of digits with at
/// most one point, and for a time outside the accepted range.
#[inline]
fn epoch_cell(
    bytes: &[u8],
    p: &mut usize,
    delimiter: u8,
    shift: u32,
    last_head: &HeadCache,
) -> Option<(Timestamp, u8)> {
    if let Some((t, end, next)) = epoch_cell_by_words(bytes, *p, delimiter, shift, last_head) {
        *p = next;
        return Some((t, end));
    }
    let from = *p;
    let mut q = from;
    let mut b = *bytes.get(q)?;
    // At most 19 digits are kept (the length is checked below): the
    // value stays below 2^64.
    let mut v: u64 = 0;
    while let Some(d) = digit(b) {
        v = v.wrapping_mul(10).wrapping_add(d);
        q += 1;
        b = *bytes.get(q)?;
    }
    let mut any = q > from;
    let mut keep = 0u32;
    if b == b'.' {
        q += 1;
        b = *bytes.get(q)?;
        let frac_from = q;
        while let Some(d) = digit(b) {
            if keep == shift {
                break;
            }
            v = v.wrapping_mul(10).wrapping_add(d);
            keep += 1;
            q += 1;
            b = *bytes.get(q)?;
        }
        // Digits past the last kept place are dropped.
        while digit(b).is_some() {
            q += 1;
            b = *bytes.get(q)?;
        }
        any |= q > frac_from;
    }
    if b != delimiter && b != b'\n' {
        return None;
    }
    let end = b;
    *p = q + 1;
    if !any || q - from > 19 {
        return None;
    }
    // The kept digits' last place is 10^(shift - keep) ns (a second has
    // 10^9 ns, a millisecond 10^6: 10^shift ns a unit of the cell).
    let scale = *POW10_U64.get(usize::try_from(shift.checked_sub(keep)?).ok()?)?;
    let ns = i64::try_from(v.checked_mul(scale)?).ok()?;
    (ns < END.unix_ns()).then_some((Timestamp::from_unix_ns(ns), end))
}

#[cfg(test)]
mod tests {
    use super::{epoch_cell, number_cell};
    use crate::input::log::time::{parse_decimal_scaled_bytes, TimeFormat};

    /// `number_cell` on `s` followed by a delimiter: `None` to decline, else
    /// the value's bits (`None` for an empty cell); the whole cell must be
    /// consumed.
    fn number(s: &str) -> Option<Option<u64>> {
        // Without and with bytes after the cell (the digits are read by
        // words where eight bytes are there): the same answer.
        let read = |pad: &str| {
            let bytes = format!("{s},{pad}");
            let mut p = 0;
            let (v, end) = number_cell(bytes.as_bytes(), &mut p, b',')?;
            assert_eq!((end, p), (b',', s.len() + 1), "{s}");
            Some(v.map(f64::to_bits))
        };
        let short = read("");
        assert_eq!(read("12345678,9.5"), short, "{s}");
        short
    }

    /// Where the fast path answers for a number it gives the standard
    /// library's correctly rounded value bit for bit (the reference),
    /// and it answers for every plain decimal of up to 15 digits.
    fn check_number(s: &str) {
        let got = number(s);
        let plain = {
            let body = s.strip_prefix('-').unwrap_or(s);
            let digits = body.bytes().filter(u8::is_ascii_digit).count();
            let dots = body.bytes().filter(|b| *b == b'.').count();
            (1..=15).contains(&digits) && dots <= 1 && digits + dots == body.len()
        };
        if s.is_empty() {
            assert_eq!(got, Some(None));
        } else if let Some(v) = got {
            let want: f64 = s.parse().unwrap();
            assert_eq!(v, Some(want.to_bits()), "{s}");
        }
        assert_eq!(got.is_some_and(|v| v.is_some()), plain, "{s}");
    }

    #[test]
    fn number_cells_edge_cases() {
        for s in [
            "",
            "0",
            "-0",
            "0.0",
            "-0.0",
            "1.",
            ".5",
            "-.5",
            "16378",
            "-14",
            "5.72",
            "216.5",
            "-60.0000",
            "999999999999999",
            "0.00000000000001",
            "-99999999.9999999",
            "000123.4500",
            "9007199254740993",
        ] {
            check_number(s);
        }
        // Declined: the general path reads these (or says what is wrong).
        for s in [
            "-",
            ".",
            "-.",
            "+5",
            "1e3",
            "1E3",
            " 5",
            "5 ",
            "1.2.3",
            "--1",
            "abc",
            "inf",
            "nan",
            "1234567890123456",
            "0.000000000000001",
            "\"5\"",
            "5\r",
            "12345678901234567890123",
        ] {
            assert_eq!(number(s), None, "{s}");
        }
    }

    /// The epoch cell reader against the general path's
    /// (`TimeFormat::parse_bytes`, itself tested against the standard
    /// parser in `time.rs`): the same nanoseconds wherever it answers.
    fn check_epoch(s: &str) {
        // Without and with bytes after the cell (the word-wise reading
        // needs eight bytes at each place it reads).
        let cases = [(9, TimeFormat::EpochSeconds), (6, TimeFormat::EpochMillis)];
        for ((shift, format), pad) in cases
            .into_iter()
            .flat_map(|c| [(c, ""), (c, "99.99,9;0123456789")])
        {
            let bytes = format!("{s}\n{pad}");
            let mut p = 0;
            let cache = super::empty_head();
            let got = epoch_cell(bytes.as_bytes(), &mut p, b';', shift, &cache);
            // Again with what the first read left in the cache: the same.
            let mut p2 = 0;
            let again = epoch_cell(bytes.as_bytes(), &mut p2, b';', shift, &cache);
            assert_eq!((again, p2), (got, p), "{s}");
            let general = format.parse_bytes(s.as_bytes(), 0);
            if let Some((t, end)) = got {
                assert_eq!((end, p), (b'\n', s.len() + 1), "{s}");
                assert_eq!(Ok(t), general, "{s}");
            } else {
                // Declined only outside the plain in-range case.
                let plain = !s.is_empty()
                    && s.len() <= 19
                    && s.bytes().all(|b| b.is_ascii_digit() || b == b'.')
                    && s.bytes().filter(|b| *b == b'.').count() <= 1
                    && s.bytes().any(|b| b.is_ascii_digit());
                assert!(
                    !plain || general.is_err(),
                    "{s} declined, general {general:?}"
                );
            }
            if let Some(ns) = parse_decimal_scaled_bytes(s.as_bytes(), shift) {
                if let Some((t, _)) = got {
                    assert_eq!(t.unix_ns(), ns, "{s}");
                }
            }
        }
    }

    #[test]
    fn epoch_cells_edge_cases() {
        for s in [
            "1763154000.02",
            "1763154000",
            "1763154000.",
            ".5",
            "0",
            "0.000000001",
            "0.0000000009",
            "1763154000123.456",
            "1763154000.123456789123",
            "7258118399.999999999",
            "7258118400",
            "7258118399999.999",
            "7258118400000",
            "9999999999999999999",
            "99999999999999999999",
            "18446744073.709551616",
            "-0",
            "-1",
            "+5",
            "1e9",
            ".",
            "",
            "12.3.4",
            " 5",
        ] {
            check_epoch(s);
        }
    }

    /// The leading digits of eight bytes by hand (the reference).
    fn digits_by_hand(b: [u8; 8]) -> (usize, u64) {
        let n = b.iter().take_while(|c| c.is_ascii_digit()).count();
        let v = b[..n].iter().fold(0, |v, c| v * 10 + u64::from(c - b'0'));
        (n, v)
    }

    /// Every byte value at every place after a run of digits: the run's
    /// length and value by words are those by hand.
    #[test]
    fn digits8_every_byte_after_a_run() {
        for n in 0..8 {
            for other in 0..=255u8 {
                for fill in [b'0', b'9', 0, 0xff, other] {
                    let mut b = [fill; 8];
                    for (i, c) in b.iter_mut().take(n).enumerate() {
                        *c = b'0' + u8::try_from((i * 7 + n) % 10).unwrap();
                    }
                    b[n] = other;
                    let got = super::digits8(u64::from_le_bytes(b));
                    assert_eq!(got, digits_by_hand(b), "{b:?}");
                }
            }
        }
        let all = *b"98765432";
        assert_eq!(super::digits8(u64::from_le_bytes(all)), (8, 98_765_432));
    }

    proptest::proptest! {
        /// Any eight bytes, mostly digits: see `digits8_every_byte_after_a_run`.
        #[test]
        fn digits8_is_by_hand(
            b in proptest::array::uniform8(proptest::prop_oneof![
                3 => proptest::strategy::Strategy::prop_map(b'0'..=b'9', |c| c),
                1 => proptest::num::u8::ANY,
            ]),
        ) {
            proptest::prop_assert_eq!(super::digits8(u64::from_le_bytes(b)), digits_by_hand(b));
        }

        /// Random plain and near-plain numbers: see `check_number`.
        #[test]
        fn number_cells_match_the_standard_parser(
            sign in proptest::sample::select(vec!["", "-", "+"]),
            digits in "[0-9]{0,18}",
            dot in 0usize..20,
            tail in "(|e[0-9]|[a-z ])",
        ) {
            let mut s = format!("{sign}{digits}");
            if dot <= digits.len() {
                s.insert(sign.len() + dot, '.');
            }
            s.push_str(&tail);
            check_number(&s);
        }

        /// Random epoch times with up to 21 digits and a point anywhere:
        /// see `check_epoch`.
        #[test]
        fn epoch_cells_match_the_general_path(
            digits in "[0-9]{1,21}",
            dot in 0usize..24,
            sign in proptest::sample::select(vec!["", "", "-", "+"]),
        ) {
            let mut s = format!("{sign}{digits}");
            if dot <= digits.len() {
                s.insert(sign.len() + dot, '.');
            }
            check_epoch(&s);
        }
    }
}
