//! Reading the files a user gives: every file is read through
//! [`read_text`], which refuses anything larger than its kind's cap before
//! reading it (by its size where the file system knows it, and by reading
//! at most one byte past the cap otherwise, so `/dev/zero` or a FIFO cannot
//! fill memory), and requires UTF-8 text. Messages quote at most a short
//! excerpt of an offending line ([`excerpt`]).

use crate::error::{Error, ErrorKind, Result};
use std::io::Read;
use std::path::Path;

/// The largest system file zsum reads (16 MiB): a system file describes a
/// handful of parts, and even long inline level lists stay far below it.
pub const MAX_SYSTEM_BYTES: u64 = 16 << 20;

/// The largest species file zsum reads (4 MiB).
pub const MAX_SPECIES_BYTES: u64 = 4 << 20;

/// The largest level file zsum reads (32 MiB, about a million levels).
pub const MAX_LEVEL_BYTES: u64 = 32 << 20;

pub use crate::error::{excerpt, EXCERPT_CHARS};

/// Reads the file at `path` as UTF-8 text, refusing one larger than `cap`
/// bytes; `what` names the kind of file (`system file`, `level file`) in
/// messages.
pub fn read_text(path: &Path, what: &str, cap: u64) -> Result<String> {
    let name = excerpt(&path.display().to_string());
    let io =
        |e: std::io::Error| Error::new(ErrorKind::Io, format!("cannot read {what} {name:?}: {e}"));
    let too_big = |size: &str| {
        Error::new(
            ErrorKind::Io,
            format!(
                "{what} {name:?} {size} the {} MiB zsum reads for a {what}; give the right \
                 file, or split it",
                cap >> 20
            ),
        )
    };
    let file = std::fs::File::open(path).map_err(io)?;
    let meta = file.metadata().map_err(io)?;
    if meta.is_dir() {
        return Err(Error::new(
            ErrorKind::Io,
            format!("{what} {name:?} is a folder; give a file"),
        ));
    }
    if meta.is_file() && meta.len() > cap {
        let size = crate::budget::human_bytes(meta.len() as f64);
        return Err(too_big(&format!("is {size}, more than")));
    }
    let mut bytes = Vec::new();
    file.take(cap + 1).read_to_end(&mut bytes).map_err(io)?;
    if bytes.len() as u64 > cap {
        return Err(too_big("goes on past"));
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = e.utf8_error().valid_up_to();
        let line = e.as_bytes()[..good].iter().filter(|&&b| b == b'\n').count() + 1;
        Error::new(
            ErrorKind::Parse,
            format!(
                "line {line} of {what} {name:?}: not valid UTF-8 text (at byte {good}); save the \
                 file as UTF-8"
            ),
        )
    })
}

/// A TOML syntax or shape error as a short message: the file, line and
/// column, what is wrong, and an excerpt of the line, never the whole line.
pub fn toml_error(file: &str, text: &str, e: &toml::de::Error) -> Error {
    let message = e.message().trim_end();
    let at = e.span().map(|s| {
        let start = s.start.min(text.len());
        let before = &text[..start];
        let line = before.matches('\n').count() + 1;
        let line_start = before.rfind('\n').map_or(0, |i| i + 1);
        let column = text[line_start..start].chars().count() + 1;
        let line_text = text[line_start..].lines().next().unwrap_or("");
        (line, column, excerpt(line_text))
    });
    Error::new(
        ErrorKind::Parse,
        match at {
            Some((line, column, quote)) => {
                format!(
                    "{}, line {line}, column {column}: {}: `{quote}`",
                    excerpt(file),
                    excerpt(message)
                )
            }
            None => format!("{}: {}", excerpt(file), excerpt(message)),
        },
    )
}
