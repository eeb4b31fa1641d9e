//! The command's error and the process exit codes. Each input module has
//! an error of its own ([`crate::input::units::UnitError`],
//! [`crate::input::error::InputError`] and
//! [`crate::input::error::FileError`] for located values and files,
//! [`crate::input::rigfile::RigFileError`],
//! [`crate::input::log::ProfileError`], [`crate::input::log::LogError`]);
//! they convert into [`Error`] here, where the model and the commands meet
//! them, with their messages unchanged.
//!
//! | code | meaning |
//! |---:|---|
//! | 0 | success |
//! | 1 | bad input: a rig file, log profile or log that cannot be used (the message names file, line and key) |
//! | 2 | bad command line: unknown option, missing argument, an option value out of range (printed by the argument parser), an output path that is an input or another output, a demo folder holding files standfast did not write |
//! | 3 | I/O: a file or folder cannot be read or written |

use std::path::PathBuf;

use crate::input::error::{FileError, InputError};
use crate::input::issues::Issue;
use crate::input::log::{LogError, ProfileError};
use crate::input::rigfile::RigFileError;

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

impl From<FileError> for Error {
    fn from(e: FileError) -> Error {
        match e {
            FileError::Io { path, source } => Error::Io { path, source },
            FileError::Input(e) => Error::Input(e),
        }
    }
}

impl From<RigFileError> for Error {
    fn from(e: RigFileError) -> Error {
        e.0.into()
    }
}

impl From<ProfileError> for Error {
    fn from(e: ProfileError) -> Error {
        e.0.into()
    }
}

impl From<LogError> for Error {
    fn from(e: LogError) -> Error {
        match e {
            LogError::File(e) => e.into(),
            LogError::Row(issue) => Error::Log(issue),
        }
    }
}
