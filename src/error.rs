//! The one error type of ironwind, and its exit codes.
//!
//! Bad input (a job file, a sweep or shelf CSV, a flag) is exit 2 and names where it was found, the
//! key or line, the value given and what is accepted. Every other failure (I/O, a locked or
//! read-only shelf) is exit 1. A design that fails a check is not an error: it is a verdict.

use std::fmt;

/// Every failure ironwind reports.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// A value was read but is outside what is accepted.
    #[error("{origin}: {field} = {value}: {accepted}")]
    BadValue {
        /// Where it came from: a file name, or `--flag` for the command line.
        origin: String,
        /// The key, with its table (`[core] tongue_mm`), or a line (`line 7: amps`).
        field: String,
        /// The value as given.
        value: String,
        /// What is accepted, as a sentence fragment (`must be > 0 mm and ≤ 1000 mm`).
        accepted: String,
    },
    /// The input could not be read as the format it must be (TOML, CSV), or a key is missing or
    /// unknown.
    #[error("{origin}: {detail}")]
    BadInput {
        /// Where it came from.
        origin: String,
        /// One line: what is wrong and where (line number, key).
        detail: String,
    },
    /// A file could not be read or written.
    #[error("{path}: {action}: {reason}")]
    Io {
        /// The path concerned.
        path: String,
        /// What was tried (`cannot read`, `cannot write`).
        action: String,
        /// The operating system's reason.
        reason: String,
    },
    /// Any other failure that is not the user's input.
    #[error("{0}")]
    Failed(String),
}

impl Error {
    /// The process exit code for this error: 2 for bad input, 1 for the rest.
    pub fn exit_code(&self) -> i32 {
        match self {
            Error::BadValue { .. } | Error::BadInput { .. } => 2,
            Error::Io { .. } | Error::Failed(_) => 1,
        }
    }

    /// Builds a [`Error::BadValue`].
    pub fn bad_value(
        origin: impl Into<String>,
        field: impl Into<String>,
        value: impl fmt::Display,
        accepted: impl Into<String>,
    ) -> Self {
        Error::BadValue {
            origin: origin.into(),
            field: field.into(),
            value: short_value(&value.to_string()),
            accepted: accepted.into(),
        }
    }

    /// Builds a [`Error::BadInput`].
    pub fn bad_input(origin: impl Into<String>, detail: impl Into<String>) -> Self {
        Error::BadInput {
            origin: origin.into(),
            detail: one_line(&detail.into()),
        }
    }

    /// Builds an [`Error::Io`] from an `std::io::Error`.
    pub fn io(path: impl Into<String>, action: &str, err: &std::io::Error) -> Self {
        Error::Io {
            path: path.into(),
            action: action.to_string(),
            reason: err.to_string(),
        }
    }
}

/// Folds line breaks, control characters and the invisible ones that reorder or hide text
/// (bidirectional overrides, zero-width) so a message stays on one line and shows what it says.
/// A message is never cut: the accepted values at its end are what a person needs; only an
/// absurdly long one (a whole file pasted as a value) is held to `MAX_MESSAGE` characters.
pub fn one_line(s: &str) -> String {
    let out: String = s
        .chars()
        .map(|c| if unsafe_char(c) { ' ' } else { c })
        .collect();
    if out.chars().count() > MAX_MESSAGE {
        return out.chars().take(MAX_MESSAGE - 3).collect::<String>() + "...";
    }
    out
}

/// The longest message printed, characters.
pub const MAX_MESSAGE: usize = 4000;

/// A value as given, folded to one line and cut past 200 characters (the rest of the message, the
/// field and what is accepted, is never cut).
pub fn short_value(s: &str) -> String {
    let out = one_line(s);
    if out.chars().count() > 200 {
        return out.chars().take(197).collect::<String>() + "...";
    }
    out
}

/// A character that must not reach a terminal as itself: controls, bidirectional embeddings and
/// overrides, and zero-width characters.
pub fn unsafe_char(c: char) -> bool {
    c.is_control()
        || matches!(
            c,
            '\u{200B}'..='\u{200F}' | '\u{202A}'..='\u{202E}' | '\u{2060}'..='\u{2064}' | '\u{2066}'..='\u{2069}' | '\u{FEFF}'
        )
}

/// Short form for results in this crate.
pub type Result<T> = std::result::Result<T, Error>;
