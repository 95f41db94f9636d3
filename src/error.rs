//! The library's error type. Every variant names the place the bad value came from (a flag, a
//! file with its row and column) and says what is wanted, so the command line can print it as one
//! line and exit with status 2.

use std::path::PathBuf;

/// Everything that can go wrong while building or running a search.
#[derive(Debug, thiserror::Error, Clone, PartialEq)]
pub enum Error {
    /// A command-line value could not be used. `flag` is the option as typed (`--ratio`).
    #[error("{flag}: {message}")]
    Flag {
        /// The option, e.g. `--tol`.
        flag: String,
        /// What was wrong and what is wanted.
        message: String,
    },
    /// A catalogue file could not be opened or read at all.
    #[error("catalogue {}: {message}", path.display())]
    CatalogueFile {
        /// The file as given.
        path: PathBuf,
        /// What went wrong.
        message: String,
    },
    /// One field of one row of a catalogue is unusable. `row` counts lines of the file from 1,
    /// the header being row 1.
    #[error("catalogue {}, row {row}, column {column}: {message}", path.display())]
    CatalogueField {
        /// The file as given.
        path: PathBuf,
        /// Line number in the file, header = 1.
        row: u64,
        /// Column name from the header.
        column: String,
        /// What was found and what is wanted.
        message: String,
    },
    /// The problem as a whole cannot be searched (for example no two gears can mesh).
    #[error("{0}")]
    Problem(String),
}

impl Error {
    /// Shorthand for a [`Error::Flag`].
    pub fn flag(flag: &str, message: impl Into<String>) -> Self {
        Error::Flag { flag: flag.to_string(), message: message.into() }
    }
}

/// Result with the library's [`Error`].
pub type Result<T> = std::result::Result<T, Error>;
