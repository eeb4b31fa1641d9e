//! The crate's error type and the process exit codes.
//!
//! | code | meaning |
//! |---:|---|
//! | 0 | success |
//! | 1 | bad input: a rig file, log profile or log that cannot be used (the message names file, line and key) |
//! | 2 | bad command line: unknown option, missing argument, an option value out of range (printed by the argument parser), an output path that is an input or another output, a demo folder holding files standfast did not write |
//! | 3 | I/O: a file or folder cannot be read or written |

use core::fmt;
use std::path::PathBuf;

use crate::input::bounded::{bounded_to, ECHO_CHARS, MAX_PROBLEM_CHARS};
use crate::input::issues::Issue;

/// Process exit codes of the `standfast` command.
pub mod exit {
    /// Success.
    pub const OK: u8 = 0;
    /// Bad input: rig file, log profile or log data.
    pub const INPUT: u8 = 1;
    /// Bad command line.
    pub const USAGE: u8 = 2;
    /// A file or folder cannot be read or written.
    pub const IO: u8 = 3;
}

/// Everything that can go wrong in the library.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// A file or folder cannot be read or written.
    #[error("{}: {source}", path.display())]
    Io {
        /// The file or folder.
        path: PathBuf,
        /// What the operating system said.
        #[source]
        source: std::io::Error,
    },
    /// A configuration file (rig file, log profile) holds a bad value.
    #[error(transparent)]
    Input(#[from] InputError),
    /// A log row could not be used and the policy is to stop at the first
    /// such row.
    #[error("{0}")]
    Log(Issue),
    /// The command line cannot be carried out as given (an output path that
    /// is an input or another output, an option value out of range, a file
    /// the command would replace without being asked to).
    #[error("{0}")]
    Usage(String),
}

impl Error {
    /// An [`Error::Io`] about `path`.
    pub fn io(path: impl Into<PathBuf>, source: std::io::Error) -> Error {
        Error::Io {
            path: path.into(),
            source,
        }
    }

    /// The process exit code for this error (see [`exit`]).
    #[must_use]
    pub fn exit_code(&self) -> u8 {
        match self {
            Error::Io { .. } => exit::IO,
            Error::Input(_) | Error::Log(_) => exit::INPUT,
            Error::Usage(_) => exit::USAGE,
        }
    }
}

/// Result with the crate's [`Error`].
pub type Result<T, E = Error> = std::result::Result<T, E>;

/// A position in a named text file: 1-based line and column (in characters).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Location {
    /// File name as given by the user.
    pub file: String,
    /// Line, from 1.
    pub line: usize,
    /// Column in characters, from 1.
    pub column: usize,
}

impl fmt::Display for Location {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}:{}:{}", self.file, self.line, self.column)
    }
}

/// A bad value in a configuration file.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub struct InputError {
    /// Where, when known.
    pub at: Option<Location>,
    /// Dotted key path, when known (`log.file[1].columns.wind_speed.unit`).
    pub key: Option<String>,
    /// The value as written in the file, when known.
    pub value: Option<String>,
    /// What is wrong, including the accepted range or set where there is one.
    pub problem: String,
}

impl fmt::Display for InputError {
    /// `file:line:column: key = value: problem`, the key and value bounded
    /// to twice [`ECHO_CHARS`] and the problem to [`MAX_PROBLEM_CHARS`].
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(at) = &self.at {
            write!(f, "{at}: ")?;
        }
        // Twice the echo limit, so a value a caller already bounded (and
        // quoted) is shown whole with its byte count.
        let b = |t: &str| bounded_to(t, 2 * ECHO_CHARS);
        match (&self.key, &self.value) {
            (Some(k), Some(v)) => write!(f, "{} = {}: ", b(k), b(v))?,
            (Some(k), None) => write!(f, "{}: ", b(k))?,
            (None, Some(v)) => write!(f, "{}: ", b(v))?,
            (None, None) => {}
        }
        f.write_str(&bounded_to(&self.problem, MAX_PROBLEM_CHARS))
    }
}
