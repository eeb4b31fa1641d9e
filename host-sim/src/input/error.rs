//! The input layer's errors: a bad value in a file ([`InputError`], at a
//! [`Location`]) and a file that cannot be read or holds a bad value
//! ([`FileError`]). The rig file, the log profile and the logs wrap them in
//! errors of their own ([`crate::input::rigfile::RigFileError`],
//! [`crate::input::log::ProfileError`], [`crate::input::log::LogError`]);
//! the command's error ([`crate::error::Error`]) converts from each.

use core::fmt;
use std::path::PathBuf;

use crate::input::bounded::{bounded_to, ECHO_CHARS, MAX_PROBLEM_CHARS};

/// A text file that cannot be read, or that holds a bad value.
#[derive(Debug, thiserror::Error)]
pub enum FileError {
    /// The file cannot be read.
    #[error("{}: {source}", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// What the operating system said.
        #[source]
        source: std::io::Error,
    },
    /// The file holds a bad value (or is not UTF-8 text).
    #[error(transparent)]
    Input(#[from] InputError),
}

impl FileError {
    /// A [`FileError::Io`] about `path`.
    pub fn io(path: impl Into<PathBuf>, source: std::io::Error) -> FileError {
        FileError::Io {
            path: path.into(),
            source,
        }
    }
}

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
