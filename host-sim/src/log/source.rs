//! One CSV log file read row by row against its [`FileProfile`].

use std::fs::File;
use std::io::{BufReader, Read};

use super::issues::{ErrorPolicy, Issue, IssueKind, IssueLog};
use super::profile::{AxisSource, ColumnProfile, FileProfile};
use super::record::{Channel, ChannelKind, ChannelSet, N_CHANNELS};
use super::time::{TimeFormat, Timestamp};
use crate::error::Error;
use crate::located::{InputError, Location};

/// One usable row of one file: the time and the channels it carries, in SI.
#[derive(Clone, Debug, PartialEq)]
pub struct Row {
    /// Time stamp.
    pub time: Timestamp,
    /// Line in the file, from 1 (the header is line 1).
    pub line: u64,
    /// Values by channel index (meaningful for channels in `set`).
    pub values: [f64; N_CHANNELS],
    /// Channels with a value in this row.
    pub set: ChannelSet,
}

/// A CSV log being read.
pub struct CsvSource {
    label: String,
    reader: csv::Reader<Box<dyn Read>>,
    record: csv::ByteRecord,
    n_fields: usize,
    time_idx: usize,
    time_format: TimeFormat,
    zone_offset_s: i32,
    gap_ns: i64,
    gap_s: f64,
    cols: Vec<(usize, ColumnProfile)>,
    accel_axes: [AxisSource; 3],
    prev: Option<(Timestamp, u64)>,
}

impl core::fmt::Debug for CsvSource {
    fn fmt(&self, f: &mut core::fmt::Formatter<'_>) -> core::fmt::Result {
        f.debug_struct("CsvSource")
            .field("label", &self.label)
            .field("prev", &self.prev)
            .finish_non_exhaustive()
    }
}

impl CsvSource {
    /// Opens the file named in the profile and reads its header.
    ///
    /// # Errors
    /// [`Error::Io`] when it cannot be opened; [`Error::Input`] when the
    /// header lacks a column the profile names.
    pub fn open(fp: &FileProfile) -> Result<CsvSource, Error> {
        let file = File::open(&fp.path).map_err(|e| Error::io(&fp.path, e))?;
        CsvSource::from_reader(fp, Box::new(BufReader::with_capacity(1 << 16, file)))
    }

    /// Reads from any byte stream (a test's in-memory text, standard input).
    ///
    /// # Errors
    /// As [`CsvSource::open`].
    pub fn from_reader(fp: &FileProfile, input: Box<dyn Read>) -> Result<CsvSource, Error> {
        let mut reader = csv::ReaderBuilder::new()
            .delimiter(fp.delimiter)
            .has_headers(true)
            .flexible(true)
            .trim(csv::Trim::None)
            .comment(None)
            .from_reader(input);
        let header = reader
            .byte_headers()
            .map_err(|e| csv_error(&fp.label, &fp.path, e))?
            .clone();
        let names: Vec<String> = header
            .iter()
            .map(|h| String::from_utf8_lossy(h).trim().to_owned())
            .collect();
        if names.iter().all(String::is_empty) {
            return Err(Error::Input(InputError {
                at: Some(Location {
                    file: fp.label.clone(),
                    line: 1,
                    column: 1,
                }),
                key: None,
                value: None,
                problem: "the log is empty; its first line must be a header naming the columns"
                    .to_owned(),
            }));
        }
        let find = |want: &crate::located::Located<String>| -> Result<usize, Error> {
            names.iter().position(|n| n == &want.value).ok_or_else(|| {
                Error::Input(InputError {
                    at: Some(want.at.clone()),
                    key: None,
                    value: Some(format!("\"{}\"", want.value)),
                    problem: format!(
                        "no such column in the header of {} (its columns: {})",
                        fp.label,
                        names.join(", ")
                    ),
                })
            })
        };
        let time_idx = find(&fp.time_column)?;
        let mut cols = Vec::with_capacity(fp.columns.len());
        for c in &fp.columns {
            cols.push((find(&c.header)?, c.clone()));
        }
        #[allow(clippy::cast_possible_truncation)] // gap ≤ 1 day, checked by the profile
        let gap_ns = (fp.gap_s * 1e9).round() as i64;
        Ok(CsvSource {
            label: fp.label.clone(),
            reader,
            record: csv::ByteRecord::new(),
            n_fields: names.len(),
            time_idx,
            time_format: fp.time_format,
            zone_offset_s: fp.zone_offset_s,
            gap_ns,
            gap_s: fp.gap_s,
            cols,
            accel_axes: fp.accel_axes,
            prev: None,
        })
    }

    /// The file's label.
    #[must_use]
    pub fn label(&self) -> &str {
        &self.label
    }

    /// The next usable row; `None` at the end of the file.
    ///
    /// Rows that cannot be used are recorded in `issues` and left out
    /// ([`ErrorPolicy::Skip`]) or end the read ([`ErrorPolicy::Stop`]).
    /// Gaps are recorded and the row is used.
    ///
    /// # Errors
    /// [`Error::Log`] under [`ErrorPolicy::Stop`]; [`Error::Io`] when the
    /// file cannot be read.
    pub fn next_row(
        &mut self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
    ) -> Result<Option<Row>, Error> {
        loop {
            let more = match self.reader.read_byte_record(&mut self.record) {
                Ok(more) => more,
                Err(e) => {
                    if e.is_io_error() {
                        return Err(csv_error(&self.label, std::path::Path::new(&self.label), e));
                    }
                    let line = e.position().map_or(0, csv::Position::line);
                    self.reject(policy, issues, line, IssueKind::Malformed, e.to_string())?;
                    continue;
                }
            };
            if !more {
                return Ok(None);
            }
            let line = self.record.position().map_or(0, csv::Position::line);
            let row = match self.parse(line) {
                Ok(row) => row,
                Err(detail) => {
                    self.reject(policy, issues, line, IssueKind::Malformed, detail)?;
                    continue;
                }
            };
            if let Some((prev, prev_line)) = self.prev {
                if row.time == prev {
                    let detail = format!(
                        "time {} is the same as on line {prev_line}; row left out",
                        row.time
                    );
                    self.reject(policy, issues, line, IssueKind::Duplicate, detail)?;
                    continue;
                }
                if row.time < prev {
                    let detail = format!(
                        "time {} is earlier than {} on line {prev_line}; row left out",
                        row.time, prev
                    );
                    self.reject(policy, issues, line, IssueKind::OutOfOrder, detail)?;
                    continue;
                }
                if row.time.unix_ns().saturating_sub(prev.unix_ns()) > self.gap_ns {
                    issues.push(Issue {
                        file: self.label.clone(),
                        line,
                        kind: IssueKind::Gap,
                        detail: format!(
                            "{:.3} s without data since line {prev_line} ({} to {}; gap length {} s)",
                            row.time.seconds_since(prev),
                            prev,
                            row.time,
                            self.gap_s
                        ),
                    });
                }
            }
            self.prev = Some((row.time, line));
            return Ok(Some(row));
        }
    }

    fn reject(
        &self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
        line: u64,
        kind: IssueKind,
        detail: String,
    ) -> Result<(), Error> {
        let issue = Issue {
            file: self.label.clone(),
            line,
            kind,
            detail,
        };
        issues.push(issue.clone());
        match policy {
            ErrorPolicy::Skip => Ok(()),
            ErrorPolicy::Stop => Err(Error::Log(issue)),
        }
    }

    fn parse(&self, line: u64) -> Result<Row, String> {
        let rec = &self.record;
        if rec.len() != self.n_fields {
            return Err(format!(
                "the row has {} fields, the header has {}",
                rec.len(),
                self.n_fields
            ));
        }
        // Fields are trimmed here rather than by the CSV reader, which would
        // allocate a new record for every row.
        let tfield = rec.get(self.time_idx).unwrap_or(b"").trim_ascii();
        if tfield.is_empty() {
            return Err("empty time".to_owned());
        }
        let time = self.time_format.parse_bytes(tfield, self.zone_offset_s)?;
        let mut values = [f64::NAN; N_CHANNELS];
        let mut set = ChannelSet::EMPTY;
        let mut sensor = [f64::NAN; 3];
        let mut n_accel = 0;
        for (idx, col) in &self.cols {
            let cell = rec.get(*idx).unwrap_or(b"").trim_ascii();
            if cell.is_empty() {
                continue;
            }
            let v = match col.channel.kind() {
                ChannelKind::Quantity(_) => {
                    let raw = match fast_decimal(cell) {
                        Some(x) => x,
                        None => {
                            let text = String::from_utf8_lossy(cell);
                            let x: f64 = text.parse().map_err(|_| {
                                format!(
                                    "{} = \"{text}\" is not a number (column unit {})",
                                    col.header.value,
                                    col.unit.symbol()
                                )
                            })?;
                            if !x.is_finite() {
                                return Err(format!(
                                    "{} = \"{text}\" is not a finite number",
                                    col.header.value
                                ));
                            }
                            x
                        }
                    };
                    col.to_si(raw)
                }
                ChannelKind::PierSide | ChannelKind::Flag => {
                    let text = String::from_utf8_lossy(cell);
                    col.channel.parse_word(&text).ok_or_else(|| {
                        if col.channel.kind() == ChannelKind::PierSide {
                            format!(
                                "{} = \"{text}\" is not a pier side (east, e, west, w)",
                                col.header.value
                            )
                        } else {
                            format!(
                                "{} = \"{text}\" is not a yes/no value (1, 0, true, false, yes, no, on, off)",
                                col.header.value
                            )
                        }
                    })?
                }
            };
            let axis = match col.channel {
                Channel::AccelX => Some(0),
                Channel::AccelY => Some(1),
                Channel::AccelZ => Some(2),
                _ => None,
            };
            if let Some(a) = axis {
                if let Some(s) = sensor.get_mut(a) {
                    *s = v;
                    n_accel += 1;
                }
            } else if let Some(slot) = values.get_mut(col.channel.index()) {
                *slot = v;
                set.insert(col.channel);
            }
        }
        if n_accel == 3 {
            let rig = [Channel::AccelX, Channel::AccelY, Channel::AccelZ];
            for (ch, src) in rig.iter().zip(self.accel_axes) {
                let s = sensor.get(src.sensor_axis).copied().unwrap_or(f64::NAN);
                if let Some(slot) = values.get_mut(ch.index()) {
                    *slot = src.sign * s;
                    set.insert(*ch);
                }
            }
        } else if n_accel != 0 {
            return Err(format!(
                "the accelerometer has {n_accel} of its 3 axes in this row; give all three or none"
            ));
        }
        Ok(Row {
            time,
            line,
            values,
            set,
        })
    }
}

fn csv_error(label: &str, path: &std::path::Path, e: csv::Error) -> Error {
    match e.into_kind() {
        csv::ErrorKind::Io(io) => Error::io(path, io),
        other => Error::Input(InputError {
            at: Some(Location {
                file: label.to_owned(),
                line: 1,
                column: 1,
            }),
            key: None,
            value: None,
            problem: format!("cannot read the CSV header: {other:?}"),
        }),
    }
}

/// Powers of ten exactly representable in `f64`.
const POW10: [f64; 16] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
];

/// Fast path for plain decimals (`-12`, `7.31`) of at most 15 digits: the
/// digits as an integer m < 2^53 and the power 10^k are both exact in
/// `f64`, so the one correctly rounded division m / 10^k gives the same
/// value as the standard library's parser (Clinger's fast path). `None`
/// for anything else (exponents, long numbers, words), which then goes
/// through the standard parser.
#[allow(clippy::cast_precision_loss)] // m < 10^15 < 2^53: exact
fn fast_decimal(b: &[u8]) -> Option<f64> {
    let (neg, body) = match b.first() {
        Some(b'-') => (true, b.get(1..)?),
        Some(b'+') => (false, b.get(1..)?),
        _ => (false, b),
    };
    let mut m: u64 = 0;
    let mut digits = 0usize;
    let mut frac = 0usize;
    let mut dot = false;
    for &c in body {
        match c {
            b'0'..=b'9' => {
                m = m * 10 + u64::from(c - b'0');
                digits += 1;
                if dot {
                    frac += 1;
                }
                if digits > 15 {
                    return None;
                }
            }
            b'.' if !dot => dot = true,
            _ => return None,
        }
    }
    if digits == 0 {
        return None;
    }
    let v = m as f64 / POW10.get(frac)?;
    Some(if neg { -v } else { v })
}

#[cfg(test)]
mod tests {
    use super::fast_decimal;

    /// The fast path must agree bit for bit with the standard library's
    /// correctly rounded parser (the reference) wherever it answers.
    #[test]
    fn fast_decimal_matches_the_standard_parser() {
        let mut x: u64 = 0x9E37_79B9_7F4A_7C15;
        let mut answered = 0;
        for _ in 0..200_000 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            let digits = 1 + (x % 15) as usize;
            let mant = x >> 8;
            let mut s = format!("{mant}");
            s.truncate(digits);
            let dot = (x >> 4) as usize % (s.len() + 1);
            if dot < s.len() {
                s.insert(dot, '.');
            }
            if x & 1 == 1 {
                s.insert(0, '-');
            }
            let reference: f64 = s.parse().unwrap();
            if let Some(v) = fast_decimal(s.as_bytes()) {
                assert_eq!(v.to_bits(), reference.to_bits(), "{s}");
                answered += 1;
            }
        }
        assert!(answered > 150_000);
        for s in [
            "1e3",
            "abc",
            "",
            "-",
            ".",
            "1.2.3",
            "1234567890123456",
            "inf",
        ] {
            assert!(fast_decimal(s.as_bytes()).is_none(), "{s}");
        }
    }
}
