//! The error of reading logs.

use crate::input::error::{FileError, InputError};
use crate::input::issues::Issue;

/// A log that cannot be read: a file that cannot be opened or read, a
/// header without a column the profile names, or (under
/// [`crate::input::issues::ErrorPolicy::Stop`]) the first bad row.
#[derive(Debug, thiserror::Error)]
pub enum LogError {
    /// The file cannot be opened or read, or its header is not usable.
    #[error(transparent)]
    File(#[from] FileError),
    /// A row that cannot be used, under the policy to stop at the first.
    #[error("{0}")]
    Row(Issue),
}

impl LogError {
    /// A [`LogError::File`] for a file that cannot be opened or read.
    pub fn io(path: impl Into<std::path::PathBuf>, source: std::io::Error) -> LogError {
        LogError::File(FileError::io(path, source))
    }
}

impl From<InputError> for LogError {
    fn from(e: InputError) -> LogError {
        LogError::File(FileError::Input(e))
    }
}
