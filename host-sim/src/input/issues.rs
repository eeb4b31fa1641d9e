//! Problems found in log rows, and how to react to them.

use core::fmt;

/// What to do with a row that cannot be used.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum ErrorPolicy {
    /// Stop at the first malformed, out-of-order or duplicate row.
    Stop,
    /// Leave such rows out, report and count them, and go on.
    #[default]
    Skip,
}

/// The class of a log problem.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum IssueKind {
    /// A row that cannot be read: too few fields, a field that is not a
    /// number (or not a known word), a bad time.
    Malformed,
    /// A time stamp earlier than the previous row's in the same file.
    OutOfOrder,
    /// A time stamp equal to the previous row's in the same file.
    Duplicate,
    /// More time than the file's gap length since its previous row (the row
    /// itself is used).
    Gap,
}

impl IssueKind {
    /// All kinds, in report order.
    pub const ALL: [IssueKind; 4] = [
        IssueKind::Malformed,
        IssueKind::OutOfOrder,
        IssueKind::Duplicate,
        IssueKind::Gap,
    ];

    /// Short name for reports.
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            IssueKind::Malformed => "malformed row",
            IssueKind::OutOfOrder => "time out of order",
            IssueKind::Duplicate => "duplicate time",
            IssueKind::Gap => "gap",
        }
    }

    fn index(self) -> usize {
        match self {
            IssueKind::Malformed => 0,
            IssueKind::OutOfOrder => 1,
            IssueKind::Duplicate => 2,
            IssueKind::Gap => 3,
        }
    }

    /// Whether the row is left out (all kinds but [`IssueKind::Gap`]).
    #[must_use]
    pub fn drops_row(self) -> bool {
        !matches!(self, IssueKind::Gap)
    }
}

impl fmt::Display for IssueKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// One problem in one row of one log file.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Issue {
    /// The log file (as named in the profile or on the command line).
    pub file: String,
    /// Line of the row in the file, from 1 (the header is line 1).
    pub line: u64,
    /// What kind of problem.
    pub kind: IssueKind,
    /// Details for a person.
    pub detail: String,
}

impl fmt::Display for Issue {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{}:{}: {}: {}",
            self.file,
            self.line,
            self.kind,
            crate::input::bounded::bounded_to(
                &self.detail,
                crate::input::bounded::MAX_PROBLEM_CHARS
            )
        )
    }
}

/// Counts of issues by kind, and the first few in full.
///
/// Memory is bounded: after `max_kept` issues only the counts grow.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct IssueLog {
    counts: [u64; 4],
    kept: Vec<Issue>,
    max_kept: usize,
}

impl Default for IssueLog {
    fn default() -> Self {
        IssueLog::new(1000)
    }
}

impl IssueLog {
    /// An empty log keeping at most `max_kept` issues in full.
    #[must_use]
    pub fn new(max_kept: usize) -> IssueLog {
        IssueLog {
            counts: [0; 4],
            kept: Vec::new(),
            max_kept,
        }
    }

    /// Records an issue.
    pub fn push(&mut self, issue: Issue) {
        if let Some(c) = self.counts.get_mut(issue.kind.index()) {
            *c += 1;
        }
        if self.kept.len() < self.max_kept {
            self.kept.push(issue);
        }
    }

    /// How many issues of `kind` were found.
    #[must_use]
    pub fn count(&self, kind: IssueKind) -> u64 {
        self.counts.get(kind.index()).copied().unwrap_or(0)
    }

    /// How many issues were found in all.
    #[must_use]
    pub fn total(&self) -> u64 {
        self.counts.iter().sum()
    }

    /// The issues kept in full, in the order found.
    #[must_use]
    pub fn kept(&self) -> &[Issue] {
        &self.kept
    }

    /// How many issues were counted but not kept in full.
    #[must_use]
    pub fn not_kept(&self) -> u64 {
        self.total().saturating_sub(self.kept.len() as u64)
    }
}

impl fmt::Display for IssueLog {
    /// One line per kind with a non-zero count.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.total() == 0 {
            return f.write_str("no log problems found");
        }
        let mut first = true;
        for kind in IssueKind::ALL {
            let n = self.count(kind);
            if n > 0 {
                if !first {
                    f.write_str(", ")?;
                }
                first = false;
                write!(f, "{n} × {kind}")?;
            }
        }
        Ok(())
    }
}
