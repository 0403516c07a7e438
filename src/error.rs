//! The library's error type.
//!
//! Every error a user can cause names where it happened (file, key path or line), the
//! value found and what is allowed, so the message alone tells them what to change.

use std::path::PathBuf;

/// Library error. Bad input maps to exit status 2, everything else to 1 (see `main.rs`).
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// A value in a scenario, a data file or on the command line that is not acceptable.
    /// `file` may be empty when the value did not come from a file (a library call);
    /// `key` is a dotted key path (`options.abs1.field.area_m2`) or `line N, column C`.
    #[error("{}{key} = {value}: {allowed}", if file.is_empty() { String::new() } else { format!("{file}: ") })]
    Input {
        file: String,
        key: String,
        value: String,
        allowed: String,
    },
    /// A property or model evaluated outside the range its formulation is valid for.
    #[error("{model}: {quantity} = {value} is outside the valid range {range}")]
    OutOfRange {
        model: &'static str,
        quantity: &'static str,
        value: f64,
        range: String,
    },
    /// A file that could not be read (bad input: exit 2).
    #[error("{}: cannot read: {source}", path.display())]
    Read {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// A file that could not be written (exit 1).
    #[error("{}: cannot write: {source}", path.display())]
    Write {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// A numerical method that did not converge or a broken invariant: a defect, not bad input.
    #[error("internal: {0}")]
    Internal(String),
}

impl Error {
    /// Bad input with no file attached yet; the scenario layer adds file and key prefix
    /// with [`Error::within`].
    pub fn input(key: impl Into<String>, value: impl ToString, allowed: impl Into<String>) -> Self {
        Error::Input {
            file: String::new(),
            key: key.into(),
            value: value.to_string(),
            allowed: allowed.into(),
        }
    }

    /// Put an input error in context: set its file (when not already set) and prefix its key
    /// with `prefix` (`options.abs1.field`). Other errors pass through unchanged.
    pub fn within(self, file: &str, prefix: &str) -> Self {
        match self {
            Error::Input {
                file: f,
                key,
                value,
                allowed,
            } => Error::Input {
                file: if f.is_empty() { file.to_string() } else { f },
                key: if prefix.is_empty() {
                    key
                } else if key.is_empty() {
                    prefix.to_string()
                } else {
                    format!("{prefix}.{key}")
                },
                value,
                allowed,
            },
            other => other,
        }
    }

    /// True when the user can fix this by changing an input (exit status 2).
    pub fn is_bad_input(&self) -> bool {
        matches!(
            self,
            Error::Input { .. } | Error::OutOfRange { .. } | Error::Read { .. }
        )
    }
}

/// Result with the library error.
pub type Result<T> = std::result::Result<T, Error>;
