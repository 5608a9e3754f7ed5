//! Output formats. Every answer is one result struct that is both
//! [`serde::Serialize`] (for JSON) and [`Tabular`] (for CSV and the aligned
//! table), so the three formats always carry the same values.

mod csv_format;
mod json;
mod markdown;
mod table;

use crate::error::{Error, ErrorKind, Result};
use serde::Serialize;
use std::path::Path;

pub use csv_format::to_csv;
pub use json::to_json;
pub use markdown::to_markdown;
pub use table::to_table;

/// A result that can be laid out as rows and columns.
pub trait Tabular {
    /// Lines printed above a table (as `#` comments): what was computed and
    /// in which units.
    fn preamble(&self) -> Vec<String>;
    /// Column headings.
    fn columns(&self) -> Vec<String>;
    /// The rows, each as long as `columns()`.
    fn rows(&self) -> Vec<Vec<String>>;
    /// Lines printed below a table (as `#` comments).
    fn summary(&self) -> Vec<String> {
        Vec::new()
    }
}

/// An output format.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Format {
    /// Aligned human table with a header naming the units.
    #[default]
    Table,
    /// JSON, the machine interface; exact numbers as strings.
    Json,
    /// CSV with one header row.
    Csv,
    /// A Markdown table under its preamble.
    Markdown,
}

impl Format {
    /// Reads a format name: `table`, `json` or `csv`.
    pub fn parse(text: &str) -> Result<Self> {
        match text {
            "table" => Ok(Format::Table),
            "json" => Ok(Format::Json),
            "csv" => Ok(Format::Csv),
            "markdown" | "md" => Ok(Format::Markdown),
            other => Err(Error::parse(
                "format",
                other,
                "one of table, json, csv, markdown",
            )),
        }
    }
}

/// Renders a result in the given format.
pub fn render<T: Serialize + Tabular>(result: &T, format: Format) -> Result<String> {
    match format {
        Format::Table => Ok(to_table(result)),
        Format::Json => to_json(result),
        Format::Csv => to_csv(result),
        Format::Markdown => Ok(to_markdown(result)),
    }
}

/// Writes `contents` to `path` all at once: to a temporary file beside it,
/// then renamed over it, so a failure never leaves a partial file. A
/// symbolic link is followed to its target (the link stays); something that
/// is not a regular file (a device, a FIFO) is written through, never
/// replaced, and a failed write (e.g. a full device) is an error.
pub fn write_atomic(path: &Path, contents: &str) -> Result<()> {
    let io_err = |e: std::io::Error, what: &str, p: &Path| {
        Error::new(
            ErrorKind::Io,
            format!("cannot {what} {:?}: {e}", p.display().to_string()),
        )
    };
    let resolved;
    let path = match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => {
            resolved =
                std::fs::canonicalize(path).map_err(|e| io_err(e, "follow the link", path))?;
            resolved.as_path()
        }
        _ => path,
    };
    if let Ok(m) = std::fs::metadata(path) {
        if m.is_dir() {
            return Err(Error::new(
                ErrorKind::Io,
                format!(
                    "output path {:?} is a directory; give a file name",
                    path.display().to_string()
                ),
            ));
        }
        if !m.is_file() {
            use std::io::Write;
            let mut f = std::fs::OpenOptions::new()
                .write(true)
                .open(path)
                .map_err(|e| io_err(e, "open", path))?;
            return f
                .write_all(contents.as_bytes())
                .and_then(|_| f.flush())
                .map_err(|e| io_err(e, "write", path));
        }
    }
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    let name = path
        .file_name()
        .ok_or_else(|| {
            Error::new(
                ErrorKind::Io,
                format!(
                    "output path {:?} does not name a file",
                    path.display().to_string()
                ),
            )
        })?
        .to_string_lossy()
        .to_string();
    let tmp = dir.join(format!(".{name}.zsum-tmp-{}", std::process::id()));
    std::fs::write(&tmp, contents).map_err(|e| io_err(e, "write", path))?;
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        io_err(e, "write", path)
    })
}
