//! The library's one error type.
//!
//! Every failure reachable from user input is an [`Error`] whose message names
//! the offending value, says what is allowed, and where it can, says how to
//! proceed. The binary maps every `Error` to exit status 2.

use std::fmt;

/// Convenient alias used throughout the crate.
pub type Result<T, E = Error> = std::result::Result<T, E>;

/// An error from zsum: a kind plus a readable message.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{message}")]
pub struct Error {
    kind: ErrorKind,
    message: String,
}

/// What sort of failure an [`Error`] is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum ErrorKind {
    /// A text value could not be parsed (a number, a quantity, a list).
    Parse,
    /// A parameter was well formed but outside its allowed range.
    InvalidParameter,
    /// A unit name is not known, or two units cannot be combined.
    Unit,
    /// The requested work would exceed the memory (or time) budget.
    Budget,
    /// Two inputs do not fit together (e.g. lists in different units).
    Mismatch,
    /// Reading or writing a file failed.
    Io,
    /// The model does not apply: an ideal gas so dense and cold that it is
    /// quantum-degenerate (nΛ³ ≥ 1), where classical translation fails.
    Degenerate,
}

impl Error {
    /// Builds an error of the given kind with a message.
    pub fn new(kind: ErrorKind, message: impl Into<String>) -> Self {
        Error {
            kind,
            message: message.into(),
        }
    }

    /// A value that could not be parsed: names `what`, quotes `value`, and
    /// says what would have been accepted.
    pub fn parse(what: &str, value: &str, allowed: &str) -> Self {
        Error::new(
            ErrorKind::Parse,
            format!(
                "cannot read {what} {:?}: expected {allowed}",
                excerpt(value)
            ),
        )
    }

    /// A parameter outside its allowed range.
    pub fn invalid(what: &str, value: impl fmt::Display, allowed: &str) -> Self {
        Error::new(
            ErrorKind::InvalidParameter,
            format!(
                "{what} {} is not allowed: {allowed}",
                excerpt(&value.to_string())
            ),
        )
    }

    /// Work that would exceed a budget, with advice on how to proceed.
    pub fn budget(message: impl Into<String>) -> Self {
        Error::new(ErrorKind::Budget, message)
    }

    /// The kind of this error.
    pub fn kind(&self) -> ErrorKind {
        self.kind
    }

    /// The message alone.
    pub fn message(&self) -> &str {
        &self.message
    }
}

impl From<std::io::Error> for Error {
    fn from(e: std::io::Error) -> Self {
        Error::new(ErrorKind::Io, e.to_string())
    }
}

/// The longest excerpt of a user's text that a message quotes, in
/// characters.
pub const EXCERPT_CHARS: usize = 60;

/// `text` as a message quotes it: at most [`EXCERPT_CHARS`] characters,
/// cut with `…` (and the full length) where longer.
///
/// ```
/// use zsum::error::excerpt;
/// assert_eq!(excerpt("1.5e3"), "1.5e3");
/// let long = "9".repeat(1000);
/// assert!(excerpt(&long).len() < 100);
/// assert!(excerpt(&long).ends_with("… (1000 characters)"));
/// ```
pub fn excerpt(text: &str) -> String {
    let n = text.chars().count();
    if n <= EXCERPT_CHARS {
        return text.to_string();
    }
    let head: String = text.chars().take(EXCERPT_CHARS - 20).collect();
    format!("{head}… ({n} characters)")
}
