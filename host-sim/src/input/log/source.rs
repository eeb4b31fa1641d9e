//! One CSV log file read row by row against its [`FileProfile`].
//!
//! **Reading.** Logs are mostly plain rows of unquoted numbers ending in a
//! line feed. Those are split by a line splitter of this module, which
//! reads the file in 64 KiB blocks into one reused buffer and records the
//! field ends of each row (no allocation per row). The first row that holds
//! a quote or a carriage return (quoted fields, CRLF or CR line ends) hands
//! the rest of the file, from that row on, to the `csv` crate's reader, so
//! every CSV rule applies there; a header of that kind hands it the whole
//! file. Both give the same fields and the same line numbers for every row
//! (the `csv` crate's: a row's line is the one after the previous row's
//! end, so blank lines before a row count toward it), and the same UTF-8
//! byte-order-mark handling at the start of the file.
//!
//! **The fast path.** Before the splitter, each row at the read position
//! is offered to the fast path (`fast.rs`), which reads a plain row's
//! cells in one pass over its bytes and answers only where it gives what
//! the splitter and the cell readers here give; any other row it leaves,
//! with nothing consumed, to them (so every error and its message comes
//! from here).

use std::fs::File;
use std::io::{self, Read};

use super::fast::{accel_to_rig, store, Column, Plan};
use super::profile::{AxisSource, FileProfile};
use super::record::{ChannelKind, ChannelSet, N_CHANNELS};
use super::time::{TimeFormat, Timestamp};
use crate::input::issues::{ErrorPolicy, Issue, IssueKind, IssueLog};
use crate::input::located::{bounded, bounded_bytes, bounded_to, InputError, Location};
use crate::input::log::error::LogError;

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

impl Row {
    /// A row with no time (the epoch), no line, no channel.
    #[must_use]
    pub fn empty() -> Row {
        Row {
            time: Timestamp::from_unix_ns(0),
            line: 0,
            values: [f64::NAN; N_CHANNELS],
            set: ChannelSet::EMPTY,
        }
    }
}

/// Block size of the line splitter's reads.
const BLOCK: usize = 1 << 16;

/// Byte classes of the line splitter: an ordinary byte, the delimiter, a
/// line feed, or a byte that needs the general CSV reader (quote, carriage
/// return).
const PLAIN: u8 = 0;
const DELIMITER: u8 = 1;
const LINE_FEED: u8 = 2;
const GENERAL: u8 = 3;

/// What the line splitter found at the read position.
enum Scan {
    /// A row; its bytes and field ends are in the splitter.
    Row,
    /// An empty line (skipped, as the `csv` crate does).
    Blank,
    /// A row that needs the general reader; the read position is its start.
    General,
    /// The end of the input.
    End,
}

/// The line splitter for unquoted rows ending in a line feed.
struct Lines {
    input: Box<dyn Read>,
    buf: Vec<u8>,
    /// First unread byte and end of the data in `buf`.
    start: usize,
    end: usize,
    eof: bool,
    /// Line of the read position: 1 plus the line feeds read (the `csv`
    /// crate's count).
    line: u64,
    class: [u8; 256],
    /// The current row: `buf[row..row + ends.last()]`, fields ending at
    /// `ends` (offsets from `row`).
    row: usize,
    ends: Vec<usize>,
    /// The field delimiter.
    delimiter: u8,
}

impl Lines {
    fn new(input: Box<dyn Read>, delimiter: u8) -> Lines {
        let mut class = [PLAIN; 256];
        class[usize::from(b'"')] = GENERAL;
        class[usize::from(b'\r')] = GENERAL;
        class[usize::from(b'\n')] = LINE_FEED;
        if class[usize::from(delimiter)] == PLAIN {
            class[usize::from(delimiter)] = DELIMITER;
        }
        Lines {
            input,
            buf: vec![0; BLOCK],
            start: 0,
            end: 0,
            eof: false,
            line: 1,
            class,
            row: 0,
            ends: Vec::with_capacity(16),
            delimiter,
        }
    }

    /// Reads one block after the data (moving unread data to the front and
    /// growing the buffer for a very long row); `false` at the end.
    fn fill(&mut self) -> io::Result<bool> {
        if self.start > 0 {
            self.buf.copy_within(self.start..self.end, 0);
            self.end -= self.start;
            self.start = 0;
        }
        if self.end == self.buf.len() {
            self.buf.resize(self.buf.len() * 2, 0);
        }
        loop {
            match self
                .input
                .read(self.buf.get_mut(self.end..).unwrap_or_default())
            {
                Ok(0) => {
                    self.eof = true;
                    return Ok(false);
                }
                Ok(n) => {
                    self.end += n;
                    return Ok(true);
                }
                Err(e) if e.kind() == io::ErrorKind::Interrupted => {}
                Err(e) => return Err(e),
            }
        }
    }

    /// Scans the line at the read position.
    ///
    /// The line's end is found first (the first line feed, quote or
    /// carriage return, by `memchr`, a few bytes per instruction), then
    /// its delimiters; the same fields and classes as a byte-by-byte scan.
    fn scan(&mut self) -> io::Result<Scan> {
        self.ends.clear();
        // Offset from the line start, kept across refills (which move the
        // line to the front of the buffer): the bytes before it hold no
        // line feed, quote or carriage return.
        let mut i = 0;
        loop {
            let line = self.buf.get(self.start..self.end).unwrap_or_default();
            let rest = line.get(i..).unwrap_or_default();
            if let Some(p) = memchr::memchr3(b'\n', b'"', b'\r', rest) {
                let at = i + p;
                if self.class[usize::from(line.get(at).copied().unwrap_or(b'"'))] != LINE_FEED {
                    return Ok(Scan::General);
                }
                self.row = self.start;
                self.start += at + 1;
                self.line += 1;
                if at == 0 {
                    return Ok(Scan::Blank);
                }
                self.push_ends(at);
                return Ok(Scan::Row);
            }
            i = line.len();
            if self.eof || !self.fill()? {
                if i == 0 {
                    return Ok(Scan::End);
                }
                // The last row, without a line end.
                self.row = self.start;
                self.start += i;
                self.push_ends(i);
                return Ok(Scan::Row);
            }
        }
    }

    /// Records the field ends of the row `buf[row..row + len]` (which holds
    /// no line feed, quote or carriage return): each delimiter, then `len`.
    /// Eight bytes at a time: the bytes equal to the delimiter are the
    /// zero bytes of the word XOR the delimiter repeated, found exactly
    /// (no false hits) by the usual bit trick.
    fn push_ends(&mut self, len: usize) {
        const LOW7: u64 = 0x7f7f_7f7f_7f7f_7f7f;
        let line = self.buf.get(self.row..self.row + len).unwrap_or_default();
        // A delimiter that is a special byte never reaches here (the
        // splitter is used only when the delimiter's class is DELIMITER).
        let pattern = u64::from_le_bytes([self.delimiter; 8]);
        let mut words = line.chunks_exact(8);
        let mut base = 0;
        for w in &mut words {
            let mut bytes = [0u8; 8];
            bytes.copy_from_slice(w);
            let x = u64::from_le_bytes(bytes) ^ pattern;
            // High bit of each byte set exactly where that byte of x is 0.
            let mut zero = !(((x & LOW7) + LOW7) | x | LOW7);
            while zero != 0 {
                self.ends.push(base + (zero.trailing_zeros() / 8) as usize);
                zero &= zero - 1;
            }
            base += 8;
        }
        for (j, &b) in words.remainder().iter().enumerate() {
            if b == self.delimiter {
                self.ends.push(base + j);
            }
        }
        self.ends.push(len);
    }

    /// The current row's fields.
    fn fields(&self) -> Split<'_> {
        let len = self.ends.last().copied().unwrap_or(0);
        Split {
            line: self.buf.get(self.row..self.row + len).unwrap_or_default(),
            ends: &self.ends,
        }
    }

    /// The unread data followed by the rest of the input.
    fn into_rest(self, prefix: &[u8]) -> Box<dyn Read> {
        let mut head = prefix.to_vec();
        head.extend_from_slice(self.buf.get(self.start..self.end).unwrap_or_default());
        Box::new(io::Cursor::new(head).chain(self.input))
    }
}

/// Turns each CR LF pair into a LF as the bytes are read, so that a log
/// with Windows line ends is read by the line splitter like any other and
/// its line numbers are right (the `csv` crate's count runs one line short
/// after CR LF ends). A lone CR is passed on (and read by the `csv` crate
/// as a line end). A CR LF inside a quoted field becomes a LF.
struct CrlfToLf {
    inner: Box<dyn Read>,
    buf: Vec<u8>,
    start: usize,
    end: usize,
    /// A CR ended the previous read; whether it is dropped depends on the
    /// next byte.
    held_cr: bool,
}

impl CrlfToLf {
    fn new(inner: Box<dyn Read>) -> CrlfToLf {
        CrlfToLf {
            inner,
            buf: vec![0; BLOCK],
            start: 0,
            end: 0,
            held_cr: false,
        }
    }
}

impl CrlfToLf {
    /// The usual read, with nothing buffered and no CR held: straight into
    /// `out`, each CR LF then turned into a LF in place (a copy only after
    /// the first CR), a CR that ends the data held as by the buffered
    /// read. The same bytes as the buffered read of the same data.
    fn read_direct(&mut self, out: &mut [u8]) -> io::Result<usize> {
        let n = loop {
            match self.inner.read(out) {
                Ok(n) => break n,
                Err(e) if e.kind() == io::ErrorKind::Interrupted => {}
                Err(e) => return Err(e),
            }
        };
        let Some(first) = memchr::memchr(b'\r', out.get(..n).unwrap_or_default()) else {
            return Ok(n);
        };
        // Bytes before `i` are done, kept in `out[..w]`; `out[i]` is a CR.
        let (mut w, mut i) = (first, first);
        loop {
            match out.get(i + 1) {
                Some(b'\n') if i + 1 < n => {}
                Some(_) if i + 1 < n => {
                    if let Some(o) = out.get_mut(w) {
                        *o = b'\r';
                    }
                    w += 1;
                }
                _ => {
                    // The CR ends the data: whether it is dropped depends
                    // on the next byte.
                    self.held_cr = true;
                    break;
                }
            }
            i += 1;
            let rest = out.get(i..n).unwrap_or_default();
            let run = memchr::memchr(b'\r', rest).unwrap_or(rest.len());
            out.copy_within(i..i + run, w);
            w += run;
            i += run;
            if i >= n {
                break;
            }
        }
        if w == 0 && self.held_cr {
            // Only a held CR was read: read on to decide it.
            return self.read(out);
        }
        Ok(w)
    }
}

impl Read for CrlfToLf {
    fn read(&mut self, out: &mut [u8]) -> io::Result<usize> {
        if out.is_empty() {
            return Ok(0);
        }
        if self.start == self.end && !self.held_cr {
            return self.read_direct(out);
        }
        if self.start == self.end {
            let n = loop {
                match self.inner.read(&mut self.buf) {
                    Ok(n) => break n,
                    Err(e) if e.kind() == io::ErrorKind::Interrupted => {}
                    Err(e) => return Err(e),
                }
            };
            self.start = 0;
            self.end = n;
            if n == 0 {
                if self.held_cr {
                    self.held_cr = false;
                    if let Some(o) = out.first_mut() {
                        *o = b'\r';
                    }
                    return Ok(1);
                }
                return Ok(0);
            }
        }
        let mut w = 0;
        if self.held_cr {
            self.held_cr = false;
            if self.buf.get(self.start) != Some(&b'\n') {
                if let Some(o) = out.get_mut(w) {
                    *o = b'\r';
                    w += 1;
                }
            }
        }
        let data = self.buf.get(self.start..self.end).unwrap_or_default();
        let mut i = 0;
        // Runs without a CR are copied whole (found by `memchr`); each CR
        // is then dropped before a LF, held when it ends the data, or kept.
        while w < out.len() {
            let n = (out.len() - w).min(data.len() - i);
            let run = data.get(i..i + n).unwrap_or_default();
            let cr = memchr::memchr(b'\r', run);
            let copy = cr.unwrap_or(n);
            if let (Some(o), Some(d)) = (out.get_mut(w..w + copy), run.get(..copy)) {
                o.copy_from_slice(d);
            }
            w += copy;
            i += copy;
            if cr.is_none() {
                break;
            }
            // data[i] is a CR.
            match data.get(i + 1) {
                Some(b'\n') => i += 1,
                None => {
                    self.held_cr = true;
                    i += 1;
                    break;
                }
                Some(_) => {
                    if let Some(o) = out.get_mut(w) {
                        *o = b'\r';
                    }
                    w += 1;
                    i += 1;
                }
            }
        }
        self.start += i;
        if w == 0 && self.held_cr {
            // Only a held CR was consumed: read on to decide it.
            return self.read(out);
        }
        Ok(w)
    }
}

/// The fields of a row.
trait Fields {
    fn count(&self) -> usize;
    fn field(&self, i: usize) -> &[u8];
}

/// A row split by [`Lines`].
struct Split<'a> {
    line: &'a [u8],
    ends: &'a [usize],
}

impl Fields for Split<'_> {
    fn count(&self) -> usize {
        self.ends.len()
    }

    fn field(&self, i: usize) -> &[u8] {
        let from = match i.checked_sub(1) {
            Some(j) => self.ends.get(j).map_or(usize::MAX, |e| e + 1),
            None => 0,
        };
        let to = self.ends.get(i).copied().unwrap_or(0);
        self.line.get(from..to).unwrap_or_default()
    }
}

impl Fields for csv::ByteRecord {
    fn count(&self) -> usize {
        self.len()
    }

    fn field(&self, i: usize) -> &[u8] {
        self.get(i).unwrap_or_default()
    }
}

/// The `csv` crate's reader for the rest of a file.
struct General {
    reader: csv::Reader<Box<dyn Read>>,
    record: csv::ByteRecord,
    /// Added to the reader's line numbers.
    line_offset: u64,
    /// The line of the first row read (the read position's line when the
    /// reader took over).
    first_line: Option<u64>,
}

impl General {
    fn line_of(&self, pos: Option<&csv::Position>) -> u64 {
        pos.map_or(0, |p| p.line().saturating_add(self.line_offset))
    }
}

/// How a file is being read.
enum Input {
    Lines(Lines),
    General(General),
    /// Transient, while switching.
    Empty,
}

impl Input {
    /// Reads the next record into the splitter or the general reader;
    /// its line, or `None` at the end.
    fn read_record(&mut self, delimiter: u8) -> Result<Option<u64>, csv::Error> {
        if let Input::Lines(lines) = self {
            // The csv crate's position of a record: the line where the
            // read starts, before any blank lines.
            let at = lines.line;
            loop {
                match lines.scan().map_err(csv::Error::from)? {
                    Scan::Row => return Ok(Some(at)),
                    Scan::Blank => {}
                    Scan::End => return Ok(None),
                    Scan::General => break,
                }
            }
            // Hand the rest to the csv crate from this row on, behind a
            // dummy first row (read here) so that its line count runs on
            // from ours and a byte-order mark is not stripped mid-file.
            let Input::Lines(lines) = core::mem::replace(self, Input::Empty) else {
                return Ok(None);
            };
            let line_now = lines.line;
            let mut reader = csv_builder(delimiter, false).from_reader(lines.into_rest(b"x\n"));
            let mut record = csv::ByteRecord::new();
            reader.read_byte_record(&mut record)?;
            *self = Input::General(General {
                reader,
                record,
                line_offset: line_now.saturating_sub(2),
                first_line: Some(at),
            });
        }
        match self {
            Input::General(g) => {
                if !g.reader.read_byte_record(&mut g.record)? {
                    return Ok(None);
                }
                let line = g.line_of(g.record.position());
                Ok(Some(g.first_line.take().unwrap_or(line)))
            }
            _ => Ok(None),
        }
    }
}

fn csv_builder(delimiter: u8, has_headers: bool) -> csv::ReaderBuilder {
    let mut b = csv::ReaderBuilder::new();
    b.delimiter(delimiter)
        .has_headers(has_headers)
        .flexible(true)
        .trim(csv::Trim::None)
        .comment(None);
    b
}

/// A CSV log being read.
pub struct CsvSource {
    label: String,
    input: Input,
    delimiter: u8,
    n_fields: usize,
    time_idx: usize,
    time_format: TimeFormat,
    zone_offset_s: i32,
    gap_ns: i64,
    gap_s: f64,
    cols: Vec<Column>,
    accel_axes: [AxisSource; 3],
    prev: Option<(Timestamp, u64)>,
    /// The fast path's reading of plain rows, when it applies to the file.
    plan: Option<Plan>,
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
    /// [`LogError::File`] when it cannot be opened; [`LogError::File`] when the
    /// header lacks a column the profile names.
    pub fn open(fp: &FileProfile) -> Result<CsvSource, LogError> {
        let file = File::open(&fp.path).map_err(|e| LogError::io(&fp.path, e))?;
        CsvSource::from_reader(fp, Box::new(file))
    }

    /// Reads from any byte stream (a test's in-memory text, standard input).
    ///
    /// # Errors
    /// As [`CsvSource::open`].
    pub fn from_reader(fp: &FileProfile, input: Box<dyn Read>) -> Result<CsvSource, LogError> {
        let (input, names) = read_header(fp, Box::new(CrlfToLf::new(input)))?;
        if names.iter().all(String::is_empty) {
            return Err(LogError::from(InputError {
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
        let find = |want: &crate::input::located::Located<String>| -> Result<usize, LogError> {
            names.iter().position(|n| n == &want.value).ok_or_else(|| {
                LogError::from(InputError {
                    at: Some(want.at.clone()),
                    key: None,
                    value: Some(format!("\"{}\"", want.value)),
                    problem: format!(
                        "no such column in the header of {} (its columns: {})",
                        fp.label,
                        bounded_to(&names.join(", "), 300)
                    ),
                })
            })
        };
        let time_idx = find(&fp.time_column)?;
        let mut cols = Vec::with_capacity(fp.columns.len());
        for c in &fp.columns {
            cols.push(Column::new(find(&c.header)?, c.clone()));
        }
        #[allow(clippy::cast_possible_truncation)] // gap ≤ 1 day, checked by the profile
        let gap_ns = (fp.gap_s * 1e9).round() as i64;
        Ok(CsvSource {
            label: fp.label.clone(),
            input,
            delimiter: fp.delimiter,
            n_fields: names.len(),
            time_idx,
            time_format: fp.time_format,
            zone_offset_s: fp.zone_offset_s,
            gap_ns,
            gap_s: fp.gap_s,
            accel_axes: fp.accel_axes,
            prev: None,
            plan: Plan::new(
                names.len(),
                time_idx,
                &cols,
                &fp.accel_axes,
                fp.delimiter,
                fp.time_format,
                fp.zone_offset_s,
            ),
            cols,
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
    /// [`LogError::Row`] under [`ErrorPolicy::Stop`]; [`LogError::File`] when the
    /// file cannot be read.
    pub fn next_row(
        &mut self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
    ) -> Result<Option<Row>, LogError> {
        let mut row = Row::empty();
        Ok(self.next_row_into(policy, issues, &mut row)?.then_some(row))
    }

    /// As [`CsvSource::next_row`], into `row` (the merge's look-ahead,
    /// overwritten in place rather than moved): `true` with the next
    /// usable row in `row`, `false` at the end of the file (`row` then
    /// holds no meaning). The values of channels outside the row's `set`
    /// hold NaN or what they held before.
    ///
    /// # Errors
    /// As [`CsvSource::next_row`].
    pub fn next_row_into(
        &mut self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
        row: &mut Row,
    ) -> Result<bool, LogError> {
        // The values of the channels outside `set` are left as they are
        // for a plain row read first time (the merge reads only `set`);
        // after a row left out or declined by the fast path, which may have
        // written some, they are cleared (NaN, as `next_row` gives them).
        let mut clear = false;
        loop {
            if clear {
                row.values = [f64::NAN; N_CHANNELS];
            }
            clear = true;
            row.set = ChannelSet::EMPTY;
            let line = if let Some(line) = self.fast_row(row) {
                line
            } else {
                row.values = [f64::NAN; N_CHANNELS];
                row.set = ChannelSet::EMPTY;
                let line = match self.read_record() {
                    Ok(Some(line)) => line,
                    Ok(None) => return Ok(false),
                    Err(e) => {
                        if e.is_io_error() {
                            return Err(csv_error(
                                &self.label,
                                std::path::Path::new(&self.label),
                                e,
                            ));
                        }
                        let line = match &self.input {
                            Input::General(g) => g.line_of(e.position()),
                            _ => e.position().map_or(0, csv::Position::line),
                        };
                        self.reject(policy, issues, line, IssueKind::Malformed, e.to_string())?;
                        continue;
                    }
                };
                if let Err(detail) = self.parse(line, row) {
                    self.reject(policy, issues, line, IssueKind::Malformed, detail)?;
                    continue;
                }
                line
            };
            if self.check_order(policy, issues, row)? {
                self.prev = Some((row.time, line));
                return Ok(true);
            }
        }
    }

    /// The fast path ([`Plan::parse_row`]) on the row at the splitter's
    /// read position: the row's line, with the row read into `row` and
    /// consumed, or `None` (nothing consumed) to leave it to the general
    /// path.
    fn fast_row(&mut self, row: &mut Row) -> Option<u64> {
        let plan = self.plan.as_ref()?;
        let Input::Lines(lines) = &mut self.input else {
            return None;
        };
        let bytes = lines.buf.get(lines.start..lines.end)?;
        let (time, len) = plan.parse_row(bytes, &mut row.values, &mut row.set)?;
        // As `Lines::scan` for a row: the csv crate's line of the row, the
        // read position past its line feed.
        let line = lines.line;
        lines.start += len;
        lines.line += 1;
        row.time = time;
        row.line = line;
        Some(line)
    }

    /// The time order checks of a parsed row against the previous one:
    /// `true` to use the row, `false` for a duplicate or out-of-order
    /// time (recorded and left out). A gap is recorded and the row used.
    fn check_order(
        &self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
        row: &Row,
    ) -> Result<bool, LogError> {
        let Some((prev, prev_line)) = self.prev else {
            return Ok(true);
        };
        let line = row.line;
        if row.time == prev {
            let detail = format!(
                "time {} is the same as on line {prev_line}; row left out",
                row.time
            );
            self.reject(policy, issues, line, IssueKind::Duplicate, detail)?;
            return Ok(false);
        }
        if row.time < prev {
            let detail = format!(
                "time {} is earlier than {} on line {prev_line}; row left out",
                row.time, prev
            );
            self.reject(policy, issues, line, IssueKind::OutOfOrder, detail)?;
            return Ok(false);
        }
        if row.time.unix_ns().saturating_sub(prev.unix_ns()) > self.gap_ns {
            issues.push(Issue {
                file: self.label.clone(),
                line,
                kind: IssueKind::Gap,
                detail: format!(
                    "{:.3} s without data since line {prev_line} ({} to {}), more than the file's {} s allowed between rows",
                    row.time.seconds_since(prev),
                    prev,
                    row.time,
                    self.gap_s
                ),
            });
        }
        Ok(true)
    }

    fn read_record(&mut self) -> Result<Option<u64>, csv::Error> {
        self.input.read_record(self.delimiter)
    }

    fn reject(
        &self,
        policy: ErrorPolicy,
        issues: &mut IssueLog,
        line: u64,
        kind: IssueKind,
        detail: String,
    ) -> Result<(), LogError> {
        let issue = Issue {
            file: self.label.clone(),
            line,
            kind,
            detail,
        };
        issues.push(issue.clone());
        match policy {
            ErrorPolicy::Skip => Ok(()),
            ErrorPolicy::Stop => Err(LogError::Row(issue)),
        }
    }

    /// The general path: the record just read into `row` (whose values
    /// hold NaN and whose set is empty).
    fn parse(&self, line: u64, row: &mut Row) -> Result<(), String> {
        row.line = line;
        match &self.input {
            Input::Lines(l) => self.parse_fields(&l.fields(), row),
            Input::General(g) => self.parse_fields(&g.record, row),
            Input::Empty => Err("no row".to_owned()),
        }
    }

    fn parse_fields(&self, rec: &impl Fields, row: &mut Row) -> Result<(), String> {
        if rec.count() != self.n_fields {
            return Err(format!(
                "the row has {} fields, the header has {}",
                rec.count(),
                self.n_fields
            ));
        }
        // Fields are trimmed here rather than by the CSV reader, which would
        // allocate a new record for every row.
        let tfield = rec.field(self.time_idx).trim_ascii();
        if tfield.is_empty() {
            return Err("empty time".to_owned());
        }
        row.time = self.time_format.parse_bytes(tfield, self.zone_offset_s)?;
        let mut sensor = [f64::NAN; 3];
        let mut n_accel = 0;
        for c in &self.cols {
            let field = rec.field(c.idx);
            if field.is_empty() {
                continue;
            }
            let cell = field.trim_ascii();
            if cell.is_empty() {
                continue;
            }
            let v = cell_value(c, cell)?;
            store(
                c,
                v,
                &mut sensor,
                &mut n_accel,
                &mut row.values,
                &mut row.set,
            );
        }
        if n_accel == 3 {
            accel_to_rig(&sensor, &self.accel_axes, &mut row.values, &mut row.set);
        } else if n_accel != 0 {
            return Err(format!(
                "the accelerometer has {n_accel} of its 3 axes in this row; give all three or none"
            ));
        }
        Ok(())
    }
}

/// The SI value of a trimmed, non-empty cell of column `c` (the general
/// path), or what is wrong with it.
fn cell_value(c: &Column, cell: &[u8]) -> Result<f64, String> {
    let col = &c.profile;
    if c.word {
        let text = String::from_utf8_lossy(cell);
        return col.channel.parse_word(&text).ok_or_else(|| {
            if col.channel.kind() == ChannelKind::PierSide {
                format!(
                    "{} = \"{}\" is not a pier side (accepted: east, e, west, w)",
                    bounded(&col.header.value),
                    bounded_bytes(cell)
                )
            } else {
                format!(
                    "{} = \"{}\" is not a yes/no value (accepted: 1, 0, true, false, yes, no, on, off)",
                    bounded(&col.header.value),
                    bounded_bytes(cell)
                )
            }
        });
    }
    let raw = match fast_decimal(cell) {
        Some(x) => x,
        None => {
            let x: f64 = core::str::from_utf8(cell)
                .ok()
                .and_then(|t| t.parse().ok())
                .ok_or_else(|| {
                    format!(
                        "{} = \"{}\" is not a number (column unit {})",
                        bounded(&col.header.value),
                        bounded_bytes(cell),
                        col.unit.symbol()
                    )
                })?;
            if !x.is_finite() {
                return Err(format!(
                    "{} = \"{}\" is not a finite number",
                    bounded(&col.header.value),
                    bounded_bytes(cell)
                ));
            }
            x
        }
    };
    Ok(col.to_si(raw))
}

/// Reads the header: by the line splitter when it is a plain line (the rows
/// then follow the same way), else by the `csv` crate, which then reads the
/// whole file. The names are trimmed.
fn read_header(fp: &FileProfile, input: Box<dyn Read>) -> Result<(Input, Vec<String>), LogError> {
    open_input(fp.delimiter, input).map_err(|e| csv_error(&fp.label, &fp.path, e))
}

/// As [`read_header`], with the `csv` crate's errors.
fn open_input(delimiter: u8, input: Box<dyn Read>) -> Result<(Input, Vec<String>), csv::Error> {
    let io_err = csv::Error::from;
    let mut lines = Lines::new(input, delimiter);
    // A UTF-8 byte-order mark at the very start is skipped, as the csv
    // crate does when its first read holds it.
    lines.fill().map_err(io_err)?;
    let bom = lines.buf.get(..lines.end.min(3)) == Some(b"\xef\xbb\xbf".as_slice());
    if bom {
        lines.start = 3;
    }
    // (A delimiter that is a quote or a line end, which the profile
    // refuses, would leave every row to the csv crate.)
    let plain = lines.class[usize::from(delimiter)] == DELIMITER;
    loop {
        let scan = if plain {
            lines.scan().map_err(io_err)?
        } else {
            Scan::General
        };
        match scan {
            Scan::Blank => {}
            Scan::Row => {
                let f = lines.fields();
                let names = (0..f.count())
                    .map(|i| String::from_utf8_lossy(f.field(i)).trim().to_owned())
                    .collect();
                return Ok((Input::Lines(lines), names));
            }
            Scan::End => return Ok((Input::Lines(lines), Vec::new())),
            Scan::General => {
                // The csv crate reads the whole file: what was read so far
                // (the mark, the blank lines skipped, the rest) and the
                // remaining input.
                let mut prefix: Vec<u8> = Vec::new();
                if bom {
                    prefix.extend_from_slice(b"\xef\xbb\xbf");
                }
                let blank = usize::try_from(lines.line.saturating_sub(1)).unwrap_or(0);
                prefix.resize(prefix.len() + blank, b'\n');
                let mut reader = csv_builder(delimiter, true).from_reader(lines.into_rest(&prefix));
                let header = reader.byte_headers()?;
                let names = header
                    .iter()
                    .map(|h| String::from_utf8_lossy(h).trim().to_owned())
                    .collect();
                return Ok((
                    Input::General(General {
                        reader,
                        record: csv::ByteRecord::new(),
                        line_offset: 0,
                        first_line: None,
                    }),
                    names,
                ));
            }
        }
    }
}

fn csv_error(label: &str, path: &std::path::Path, e: csv::Error) -> LogError {
    match e.into_kind() {
        csv::ErrorKind::Io(io) => LogError::io(path, io),
        other => LogError::from(InputError {
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
    use super::{fast_decimal, open_input, Fields, Input};
    use std::io::Read;

    /// Hands out its data a few bytes per read, to exercise the refills.
    struct Trickle {
        data: Vec<u8>,
        pos: usize,
        step: usize,
    }

    impl Read for Trickle {
        fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
            self.step = self.step % 7 + 1;
            let n = self.step.min(buf.len()).min(self.data.len() - self.pos);
            buf[..n].copy_from_slice(&self.data[self.pos..self.pos + n]);
            self.pos += n;
            Ok(n)
        }
    }

    type Rows = (Vec<String>, Vec<(u64, Vec<Vec<u8>>)>);

    /// The header and (line, fields) of every record, by this module.
    fn ours(input: Box<dyn Read>) -> Rows {
        let (mut inp, names) = open_input(b',', input).unwrap();
        let mut rows = Vec::new();
        while let Some(line) = inp.read_record(b',').unwrap() {
            let fields = match &inp {
                Input::Lines(l) => {
                    let f = l.fields();
                    (0..f.count()).map(|i| f.field(i).to_vec()).collect()
                }
                Input::General(g) => g.record.iter().map(<[u8]>::to_vec).collect(),
                Input::Empty => panic!("no input"),
            };
            rows.push((line, fields));
        }
        (names, rows)
    }

    /// The same by the csv crate alone (the reference), configured as the
    /// source configures it.
    fn reference(input: Box<dyn Read>) -> Rows {
        let mut r = super::csv_builder(b',', true).from_reader(input);
        let names = r
            .byte_headers()
            .unwrap()
            .iter()
            .map(|h| String::from_utf8_lossy(h).trim().to_owned())
            .collect();
        let mut rec = csv::ByteRecord::new();
        let mut rows = Vec::new();
        while r.read_byte_record(&mut rec).unwrap() {
            let line = rec.position().unwrap().line();
            rows.push((line, rec.iter().map(<[u8]>::to_vec).collect()));
        }
        (names, rows)
    }

    /// The line splitter and its hand-over to the csv crate give the csv
    /// crate's fields and line numbers, whatever the line ends, quotes,
    /// blank lines, byte-order mark or read sizes.
    #[test]
    fn splitter_agrees_with_the_csv_crate() {
        let cases: [&[u8]; 14] = [
            b"t,a,b\n1,2,3\n4,,6\n",
            b"t,a,b\n1,2,3\n4,5,6",
            b"t,a,b\n\n\n1,2,3\n\n4,5\n7,8,9,10\n\n",
            b"\xef\xbb\xbft,a\n1,2\n",
            b"\n\nt,a\n1,2\n",
            b"t,a\r\n1,2\r\n\r\n3,4\r\n",
            b"t,a\n1,2\n3,\"4,5\"\n6,7\n\n8,9\n",
            b"t,a\n1,2\n\n\n3,\"multi\nline\"\n6,7\n",
            b"t,a\n1,2\n3,4\r\n5,6\n7,8\r9,10\n",
            b"t,a\n1,2\n\r\n\r\n5,6\n",
            b"\"t\",a\n1,2\n3,4\n",
            b"\xef\xbb\xbf\n\"t\",a\n1,2\n",
            b"t,a\n1,2\n\xef\xbb\xbf3,\"4\"\n5,6\n",
            b"",
        ];
        for case in cases {
            let want = reference(Box::new(std::io::Cursor::new(case.to_vec())));
            let got = ours(Box::new(std::io::Cursor::new(case.to_vec())));
            assert_eq!(got, want, "{}", String::from_utf8_lossy(case));
            let trickle = |data: &[u8]| -> Box<dyn Read> {
                Box::new(Trickle {
                    data: data.to_vec(),
                    pos: 0,
                    step: 3,
                })
            };
            assert_eq!(ours(trickle(case)), reference(trickle(case)));
        }
        // A long log crosses many blocks and grows the buffer for a long row.
        let mut long = b"t,a,b\n".to_vec();
        for i in 0..40_000 {
            long.extend_from_slice(format!("{i},{},{}\n", i * 3, i % 7).as_bytes());
            if i == 20_000 {
                long.extend_from_slice(&[b'9'; 200_000]);
                long.extend_from_slice(b",1,2\n");
            }
        }
        let want = reference(Box::new(std::io::Cursor::new(long.clone())));
        assert_eq!(ours(Box::new(std::io::Cursor::new(long))), want);
    }

    /// A file with CR LF line ends reads as the same file with LF ends:
    /// the same fields on the same lines (the line count of the LF file is
    /// the `csv` crate's, the reference), whatever the read sizes; a lone
    /// CR and a CR at the very end are kept.
    #[test]
    fn crlf_reads_as_lf() {
        use super::CrlfToLf;
        let lf: &[u8] = b"t,a\n1,2\n\n3,\"4\"\n5,6\n";
        let crlf: Vec<u8> = b"t,a\r\n1,2\r\n\r\n3,\"4\"\r\n5,6\r\n".to_vec();
        let want = reference(Box::new(std::io::Cursor::new(lf.to_vec())));
        let via = |data: Vec<u8>, step: usize| -> Box<dyn Read> {
            Box::new(CrlfToLf::new(Box::new(Trickle { data, pos: 0, step })))
        };
        for step in 0..7 {
            assert_eq!(ours(via(crlf.clone(), step)), want, "step {step}");
        }
        let mut out = Vec::new();
        via(b"a\rb\r\nc\r".to_vec(), 0)
            .read_to_end(&mut out)
            .unwrap();
        assert_eq!(out, b"a\rb\nc\r");
    }

    /// Hands out its data exactly `step` bytes per read.
    struct Chunks {
        data: Vec<u8>,
        pos: usize,
        step: usize,
    }

    impl Read for Chunks {
        fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
            let n = self.step.min(buf.len()).min(self.data.len() - self.pos);
            buf[..n].copy_from_slice(&self.data[self.pos..self.pos + n]);
            self.pos += n;
            Ok(n)
        }
    }

    /// CR LF folding, in place or buffered, whatever the sizes of the
    /// reads from below and from above: each CR LF becomes a LF, every
    /// other byte is kept (the reference: `str::replace`).
    #[test]
    fn crlf_folding_is_replace() {
        for text in [
            "a\r\nb",
            "\r\n\r\n",
            "\r\r\n\r",
            "x\ry\r\r\nz\r",
            "\r",
            "no line ends",
            "t,a\r\n1,2\r\n\r\n3,\"4\r\n5\"\r\n",
        ] {
            let want = text.replace("\r\n", "\n");
            for below in 1..=text.len() + 1 {
                for above in [1, 2, 3, 5, 64] {
                    let mut r = super::CrlfToLf::new(Box::new(Chunks {
                        data: text.as_bytes().to_vec(),
                        pos: 0,
                        step: below,
                    }));
                    let mut got = Vec::new();
                    let mut buf = vec![0u8; above];
                    loop {
                        let n = r.read(&mut buf).unwrap();
                        if n == 0 {
                            break;
                        }
                        got.extend_from_slice(&buf[..n]);
                    }
                    assert_eq!(
                        String::from_utf8(got).unwrap(),
                        want,
                        "{text:?} {below} {above}"
                    );
                }
            }
        }
    }

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
        // Edge cases: signs, zeros, a point at either end, leading zeros,
        // 15 digits (the longest the fast path takes).
        for s in [
            "0",
            "-0",
            "+0",
            "0.0",
            "-0.0",
            "1.",
            ".5",
            "-.5",
            "+5",
            "000123.4500",
            "999999999999999",
            "0.00000000000001",
            "-99999999.9999999",
        ] {
            let reference: f64 = s.parse().unwrap();
            let v = fast_decimal(s.as_bytes()).unwrap_or_else(|| panic!("{s}"));
            assert_eq!(v.to_bits(), reference.to_bits(), "{s}");
        }
    }

    /// Cells the row generator draws from: plain values the fast path
    /// reads, and everything it must leave to the general path (signs,
    /// spaces, exponents, long numbers, quotes, carriage returns, words,
    /// times out of range or in ISO 8601).
    const TIMES: [&str; 16] = [
        "1763154000.02",
        "1763154000.04",
        "1763154000",
        "1763154001.5",
        "1763154000.02",
        "0",
        "-0",
        "+1763154002",
        " 1763154003",
        "7258118400",
        "1.7e9",
        "",
        "99999999999999999999",
        "\"1763154004\"",
        "2025-11-14T21:00:00.25Z",
        "2025-11-14 21:00:01",
    ];
    const NUMBERS: [&str; 24] = [
        "",
        "",
        "",
        "5",
        "-14",
        "16378",
        "5.72",
        "-0",
        "216.5",
        "-60.0000",
        "12.345678",
        "0.25",
        "-",
        ".",
        " 7 ",
        "1e3",
        "abc",
        "123456789012345",
        "1234567890123456",
        "\"3\"",
        "inf",
        "-.5",
        "1.2.3",
        "-123456.78",
    ];
    const WORDS: [&str; 8] = ["", "W", "e", " west ", "x", "yes", "0", "\"on\""];

    /// The rows of a generated file and its profile (fields: time, three
    /// accelerometer counts, wind speed, an unread field, pier side,
    /// cover).
    fn generated(
        cells: &[(usize, [usize; 4], usize, usize, u8)],
        delimiter: u8,
        format: &str,
    ) -> (super::FileProfile, Vec<u8>) {
        let d = char::from(delimiter);
        let toml = format!(
            "[log]\n[[log.file]]\nname = \"gen\"\npath = \"gen.csv\"\ndelimiter = \"{}\"\n\
             time = {{ column = \"t\", format = \"{format}\" }}\naccel_axes = [\"-y\", \"x\", \"z\"]\n\
             [log.file.columns]\n\
             accel_x = {{ column = \"ax\", unit = \"g\", scale = 6.103515625e-5 }}\n\
             accel_y = {{ column = \"ay\", unit = \"g\", scale = 6.103515625e-5 }}\n\
             accel_z = {{ column = \"az\", unit = \"g\", scale = 6.103515625e-5 }}\n\
             wind_speed = {{ column = \"w\", unit = \"km/h\" }}\n\
             pier_side = {{ column = \"pier\" }}\ncover_fitted = {{ column = \"cover\" }}\n",
            if d == '\t' { "\\t".to_owned() } else { d.to_string() }
        );
        let src = crate::input::located::SourceText::new("gen.toml", toml);
        let profile =
            crate::input::log::LogProfile::from_source(&src, std::path::Path::new(".")).unwrap();
        let fp = profile.files[0].clone();
        let mut text = format!("t{d}ax{d}ay{d}az{d}w{d}x{d}pier{d}cover\n").into_bytes();
        for (i, &(t, n, w, c, shape)) in cells.iter().enumerate() {
            // Three draws in four are good cells (rising times), so that
            // many rows are usable; the rest come from the whole pool.
            let pick = |pool: &[&str], good: usize, k: usize| {
                if k < 48 {
                    pool[k % good].to_owned()
                } else {
                    pool[k % pool.len()].to_owned()
                }
            };
            let time = match (t < 48, format) {
                (true, "iso8601") => format!("2025-11-14T21:{:02}:{:02}.{t:02}Z", i / 60, i % 60),
                (true, _) => format!("{}.{t:02}", 1_763_154_000 + i),
                _ => TIMES[t % TIMES.len()].to_owned(),
            };
            let mut fields = vec![time];
            fields.extend(n.iter().map(|&k| pick(&NUMBERS, 12, k)));
            fields.push(format!("{i}"));
            fields.push(pick(&WORDS, 7, w));
            fields.push(pick(&WORDS, 7, c));
            // Mostly a plain row and a line feed; sometimes a field less
            // or more, a blank line, a CR LF or a lone CR, no line end.
            match shape % 16 {
                0 => {
                    fields.pop();
                }
                1 => fields.push("9".to_owned()),
                _ => {}
            }
            text.extend_from_slice(fields.join(&d.to_string()).as_bytes());
            let last = i + 1 == cells.len();
            match shape % 16 {
                2 => text.extend_from_slice(b"\n\n"),
                3 => text.extend_from_slice(b"\r\n"),
                4 => text.push(b'\r'),
                5 if last => {}
                _ => text.push(b'\n'),
            }
        }
        (fp, text)
    }

    /// Every row (time, line, values' bits, channels), issue and error of
    /// a file, read with the fast path or without it, in reads of `step`
    /// bytes or fewer.
    fn read_all(
        fp: &super::FileProfile,
        text: &[u8],
        fast: bool,
        step: usize,
        policy: super::ErrorPolicy,
    ) -> Vec<String> {
        let input: Box<dyn Read> = if step == usize::MAX {
            Box::new(std::io::Cursor::new(text.to_vec()))
        } else {
            Box::new(Trickle {
                data: text.to_vec(),
                pos: 0,
                step,
            })
        };
        let mut src = match super::CsvSource::from_reader(fp, input) {
            Ok(s) => s,
            Err(e) => return vec![format!("open: {e}")],
        };
        if !fast {
            src.plan = None;
        }
        let mut issues = super::IssueLog::default();
        let mut out = Vec::new();
        loop {
            match src.next_row(policy, &mut issues) {
                Ok(Some(r)) => out.push(format!(
                    "{} {} {:?} {:?}",
                    r.time.unix_ns(),
                    r.line,
                    r.values.map(f64::to_bits),
                    r.set
                )),
                Ok(None) => break,
                Err(e) => {
                    out.push(format!("error: {e}"));
                    break;
                }
            }
        }
        out.extend(issues.kept().iter().map(|i| format!("{i:?}")));
        out
    }

    /// The fast path answers for the plain rows of a log like the
    /// benchmark's, and gives the general path's rows there.
    #[test]
    fn fast_path_reads_plain_rows() {
        let cells: Vec<_> = (0..2000)
            .map(|i| {
                (
                    0,
                    [3 + i % 5, 4, 5, if i % 50 == 0 { 6 } else { 0 }],
                    i % 2,
                    0,
                    6,
                )
            })
            .collect();
        let (fp, mut text) = generated(&cells, b',', "epoch_s");
        // Distinct, increasing times.
        text = String::from_utf8(text)
            .unwrap()
            .lines()
            .enumerate()
            .map(|(i, l)| {
                if i == 0 {
                    l.to_owned()
                } else {
                    l.replacen("1763154000.02", &format!("1763{i:06}.02"), 1)
                }
            })
            .collect::<Vec<_>>()
            .join("\n")
            .into_bytes();
        text.push(b'\n');
        let mut src =
            super::CsvSource::from_reader(&fp, Box::new(std::io::Cursor::new(text.clone())))
                .unwrap();
        let mut row = super::Row::empty();
        let mut fast = 0;
        while src.fast_row(&mut row).is_some() {
            fast += 1;
        }
        // The rows to the end of the first block, less the one cut by it.
        assert!(fast > 1500, "{fast}");
        for policy in [super::ErrorPolicy::Skip, super::ErrorPolicy::Stop] {
            assert_eq!(
                read_all(&fp, &text, true, usize::MAX, policy),
                read_all(&fp, &text, false, usize::MAX, policy)
            );
        }
    }

    proptest::proptest! {
        #![proptest_config(proptest::prelude::ProptestConfig::with_cases(400))]
        /// Whatever the rows, the read with the fast path gives the same
        /// rows, issues and errors (with the same lines and messages) as
        /// the general path alone, under both policies and any read sizes.
        #[test]
        fn fast_path_is_the_general_path(
            cells in proptest::collection::vec(
                (0usize..64, [0usize..64, 0usize..64, 0usize..64, 0usize..64], 0usize..64,
                 0usize..64, 0u8..64),
                0..30,
            ),
            delimiter in proptest::sample::select(vec![b',', b';', b'\t', b' ', b'.', b'e']),
            format in proptest::sample::select(vec!["epoch_s", "epoch_ms", "iso8601"]),
            step in proptest::sample::select(vec![3usize, 64, usize::MAX]),
        ) {
            let (fp, text) = generated(&cells, delimiter, format);
            for policy in [super::ErrorPolicy::Skip, super::ErrorPolicy::Stop] {
                proptest::prop_assert_eq!(
                    read_all(&fp, &text, true, step, policy),
                    read_all(&fp, &text, false, step, policy)
                );
            }
        }
    }

    proptest::proptest! {
        /// Any sign, up to 15 digits and a point anywhere or none: the fast path
        /// answers, bit for bit as the standard library's parser (the
        /// reference); anything with an exponent or other text is left to
        /// the standard parser.
        #[test]
        fn fast_decimal_is_the_standard_parse(
            sign in proptest::sample::select(vec!["", "-", "+"]),
            digits in "[0-9]{1,15}",
            dot in 0usize..16,
            tail in "(|e[0-9]|[a-z ])",
        ) {
            let mut s = format!("{sign}{digits}");
            if dot <= digits.len() {
                s.insert(sign.len() + dot, '.');
            }
            let reference: f64 = s.parse().unwrap();
            let v = fast_decimal(s.as_bytes());
            proptest::prop_assert_eq!(v.map(f64::to_bits), Some(reference.to_bits()), "{}", s);
            if !tail.is_empty() {
                s.push_str(&tail);
                proptest::prop_assert!(fast_decimal(s.as_bytes()).is_none(), "{}", s);
            }
        }
    }
}
