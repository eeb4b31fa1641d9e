//! Streaming k-way merge of several logs by time.

use std::io::Read;
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::Arc;

use super::profile::LogProfile;
use super::record::{Channel, ChannelSet, SampleRecord, N_CHANNELS};
use super::source::{CsvSource, Row};
use super::time::Timestamp;
use crate::input::issues::{ErrorPolicy, IssueLog};
use crate::input::log::error::LogError;

/// Merges the files of a [`LogProfile`] into one time-ordered stream of
/// [`SampleRecord`]s.
///
/// Each source holds one row of look-ahead, so memory is fixed whatever the
/// length of the logs. Rows of several files with the same time stamp go
/// into one record. A channel's value holds until its file gives a new one.
///
/// As an iterator it yields `Result`s and stops after the first error.
#[derive(Debug)]
pub struct Merger {
    sources: Vec<CsvSource>,
    /// Each source's look-ahead row, meaningful while its `live` is set
    /// (read into in place).
    heads: Vec<Row>,
    live: Vec<bool>,
    values: [f64; N_CHANNELS],
    /// The merge state as a record: updated channel by channel as rows
    /// come in, and copied out for each record.
    record: SampleRecord,
    policy: ErrorPolicy,
    issues: IssueLog,
    records: u64,
    rows: u64,
    done: bool,
    /// An error met while reading ahead, returned after the record that
    /// was complete before it.
    pending: Option<LogError>,
    /// Bytes read from the files so far (all files), shared with their
    /// readers.
    bytes_read: Arc<AtomicU64>,
    /// Total size of the files, bytes, when known (files, not streams).
    bytes_total: Option<u64>,
}

/// A reader that adds the bytes it reads to a shared counter (for the
/// replay's progress).
struct Counting<R> {
    inner: R,
    count: Arc<AtomicU64>,
}

impl<R: Read> Read for Counting<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.inner.read(buf)?;
        self.count.fetch_add(n as u64, Ordering::Relaxed);
        Ok(n)
    }
}

impl Merger {
    /// Opens every file of the profile.
    ///
    /// # Errors
    /// [`LogError::File`] when a file cannot be opened, [`LogError::File`] when a
    /// header lacks a column, [`LogError::Row`] when the first row of a file is
    /// bad under [`ErrorPolicy::Stop`].
    pub fn open(profile: &LogProfile, policy: ErrorPolicy) -> Result<Merger, LogError> {
        let count = Arc::new(AtomicU64::new(0));
        let mut total: Option<u64> = Some(0);
        let mut sources = Vec::with_capacity(profile.files.len());
        for fp in &profile.files {
            let file = std::fs::File::open(&fp.path).map_err(|e| LogError::io(&fp.path, e))?;
            // The size only scales the progress bar: a file whose size
            // cannot be read leaves the span unknown (a spinner instead).
            let len = file
                .metadata()
                .ok()
                .filter(|m| m.is_file())
                .map(|m| m.len());
            total = total.zip(len).map(|(a, b)| a.saturating_add(b));
            let reader = Counting {
                inner: file,
                count: Arc::clone(&count),
            };
            sources.push(CsvSource::from_reader(fp, Box::new(reader))?);
        }
        let mut m = Merger::from_sources(sources, policy)?;
        m.bytes_read = count;
        m.bytes_total = total.filter(|t| *t > 0);
        Ok(m)
    }

    /// The share of the logs' bytes read so far, 0 to 1, when their total
    /// size is known (files opened by [`Merger::open`]); `None` for
    /// streams. Read-ahead makes it run slightly ahead of the records.
    #[must_use]
    pub fn fraction_read(&self) -> Option<f64> {
        let total = self.bytes_total?;
        #[allow(clippy::cast_precision_loss)] // a share, not an exact count
        let f = self.bytes_read.load(Ordering::Relaxed) as f64 / total as f64;
        Some(f.clamp(0.0, 1.0))
    }

    /// Merges in-memory or other streams, one per profile file, in the
    /// profile's order.
    ///
    /// # Errors
    /// As [`Merger::open`].
    pub fn from_readers(
        profile: &LogProfile,
        readers: Vec<Box<dyn Read>>,
        policy: ErrorPolicy,
    ) -> Result<Merger, LogError> {
        let sources = profile
            .files
            .iter()
            .zip(readers)
            .map(|(f, r)| CsvSource::from_reader(f, r))
            .collect::<Result<Vec<_>, _>>()?;
        Merger::from_sources(sources, policy)
    }

    /// Merges already opened sources.
    ///
    /// # Errors
    /// [`LogError::Row`] or [`LogError::File`] from reading the first rows.
    pub fn from_sources(
        mut sources: Vec<CsvSource>,
        policy: ErrorPolicy,
    ) -> Result<Merger, LogError> {
        let mut issues = IssueLog::default();
        let mut heads = Vec::with_capacity(sources.len());
        let mut live = Vec::with_capacity(sources.len());
        for s in &mut sources {
            let mut row = Row::empty();
            live.push(s.next_row_into(policy, &mut issues, &mut row)?);
            heads.push(row);
        }
        let values = [f64::NAN; N_CHANNELS];
        Ok(Merger {
            sources,
            heads,
            live,
            values,
            record: SampleRecord::from_state(
                Timestamp::from_unix_ns(0),
                &values,
                [None; N_CHANNELS],
                ChannelSet::EMPTY,
            ),
            policy,
            issues,
            records: 0,
            rows: 0,
            done: false,
            pending: None,
            bytes_read: Arc::new(AtomicU64::new(0)),
            bytes_total: None,
        })
    }

    /// Problems found so far.
    #[must_use]
    pub fn issues(&self) -> &IssueLog {
        &self.issues
    }

    /// Records produced so far.
    #[must_use]
    pub fn records(&self) -> u64 {
        self.records
    }

    /// Usable rows read so far (all files).
    #[must_use]
    pub fn rows(&self) -> u64 {
        self.rows
    }

    /// The next merged record; `None` when every file is at its end.
    ///
    /// # Errors
    /// [`LogError::Row`] under [`ErrorPolicy::Stop`] at the first bad row;
    /// [`LogError::File`] when a file cannot be read.
    pub fn next_record(&mut self) -> Result<Option<SampleRecord>, LogError> {
        Ok(self.next_record_ref()?.copied())
    }

    /// [`Merger::next_record`], lent instead of copied out (the record is
    /// about 380 bytes): the same record, valid until the next call.
    ///
    /// # Errors
    /// As [`Merger::next_record`].
    pub fn next_record_ref(&mut self) -> Result<Option<&SampleRecord>, LogError> {
        if let Some(e) = self.pending.take() {
            return Err(e);
        }
        if let ([source], [row], [live]) = (
            self.sources.as_mut_slice(),
            self.heads.as_mut_slice(),
            self.live.as_mut_slice(),
        ) {
            // One file (the usual case): its look-ahead row is the record.
            if !*live {
                return Ok(None);
            }
            let time = row.time;
            let updated = row.set;
            self.record
                .take(&mut self.values, &row.values, updated, time);
            self.rows += 1;
            match source.next_row_into(self.policy, &mut self.issues, row) {
                Ok(more) => *live = more,
                Err(e) => {
                    // Finish this record; the error comes with the next call.
                    *live = false;
                    self.pending = Some(e);
                }
            }
            self.records += 1;
            self.record.time = time;
            self.record.updated = updated;
            return Ok(Some(&self.record));
        }
        let mut time = None;
        for (row, live) in self.heads.iter().zip(&self.live) {
            if *live && time.is_none_or(|t| row.time < t) {
                time = Some(row.time);
            }
        }
        let Some(time) = time else {
            return Ok(None);
        };
        let mut updated = ChannelSet::EMPTY;
        let rows = self.heads.iter_mut().zip(&mut self.live);
        for ((row, live), source) in rows.zip(self.sources.iter_mut()) {
            if !*live || row.time != time {
                continue;
            }
            self.record
                .take(&mut self.values, &row.values, row.set, time);
            updated = updated.union(row.set);
            self.rows += 1;
            match source.next_row_into(self.policy, &mut self.issues, row) {
                Ok(more) => *live = more,
                Err(e) => {
                    // Finish this record; the error comes with the next call.
                    *live = false;
                    if self.pending.is_none() {
                        self.pending = Some(e);
                    }
                }
            }
        }
        self.records += 1;
        self.record.time = time;
        self.record.updated = updated;
        Ok(Some(&self.record))
    }

    /// The latest value of a channel in the merge state (NaN before its
    /// first).
    #[must_use]
    pub fn current(&self, ch: Channel) -> f64 {
        self.values.get(ch.index()).copied().unwrap_or(f64::NAN)
    }
}

impl Iterator for Merger {
    type Item = Result<SampleRecord, LogError>;

    fn next(&mut self) -> Option<Self::Item> {
        if self.done {
            return None;
        }
        match self.next_record() {
            Ok(Some(r)) => Some(Ok(r)),
            Ok(None) => {
                self.done = true;
                None
            }
            Err(e) => {
                self.done = true;
                Some(Err(e))
            }
        }
    }
}
