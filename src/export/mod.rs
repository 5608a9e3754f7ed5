//! Output formats. Every answer is one result struct that is both
//! [`serde::Serialize`] (for JSON) and [`Tabular`] (for CSV and the aligned
//! table), so the three formats always carry the same values. Every file
//! zsum writes (outputs, figures, the report) goes through one atomic write,
//! [`write_atomic_bytes`].

mod atomic;
mod csv_format;
mod json;
mod markdown;
mod table;

use crate::error::{Error, Result};
use serde::Serialize;

pub use atomic::{write_atomic, write_atomic_bytes};
pub use csv_format::{to_csv, CsvExporter};
pub use json::{to_json, JsonExporter};
pub use markdown::{to_markdown, MarkdownExporter};
pub use table::{to_table, TableExporter};

/// One column of a result: the quantity's name, its unit, and the JSON
/// field that carries the same value. Table, CSV and Markdown headings and
/// every JSON `units` block are made from this one description, so a unit is
/// written in one place.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Column {
    /// The quantity as a reader knows it: `T`, `Cp`, `H-H0`, `ln q`.
    pub name: String,
    /// Its unit; `None` for labels, counts and quantities that are pure
    /// numbers by construction (q, ln q, U/kT, a fraction).
    pub unit: Option<String>,
    /// The JSON field holding this column's value, where there is one.
    pub key: Option<String>,
}

impl Column {
    /// A column without a unit (a label, a count, a pure number).
    pub fn plain(name: &str) -> Self {
        Column {
            name: name.into(),
            unit: None,
            key: None,
        }
    }

    /// A column of a quantity in `unit`.
    pub fn with_unit(name: &str, unit: &str) -> Self {
        Column {
            name: name.into(),
            unit: Some(unit.into()),
            key: None,
        }
    }

    /// The same column, its value carried in JSON field `key`.
    pub fn key(mut self, key: &str) -> Self {
        self.key = Some(key.into());
        self
    }

    /// The heading printed above the column: `name (unit)` or `name`.
    ///
    /// ```
    /// use zsum::export::Column;
    /// assert_eq!(Column::with_unit("Cp", "J/(mol K)").heading(), "Cp (J/(mol K))");
    /// assert_eq!(Column::plain("ln q").heading(), "ln q");
    /// ```
    pub fn heading(&self) -> String {
        match &self.unit {
            Some(u) => format!("{} ({u})", self.name),
            None => self.name.clone(),
        }
    }
}

/// The JSON `units` block of a result: JSON field → unit, for every column
/// that has both, in column order.
pub fn units_block(columns: &[Column]) -> serde_json::Map<String, serde_json::Value> {
    columns
        .iter()
        .filter_map(|c| Some((c.key.clone()?, serde_json::Value::from(c.unit.clone()?))))
        .collect()
}

/// The headings of `columns`, as printed.
pub fn headings(columns: &[Column]) -> Vec<String> {
    columns.iter().map(Column::heading).collect()
}

/// A result that can be laid out as rows and columns.
pub trait Tabular {
    /// Lines printed above a table (as `#` comments): what was computed and
    /// in which units.
    fn preamble(&self) -> Vec<String>;
    /// The columns: each quantity with its unit (the headings are made from
    /// them).
    fn columns(&self) -> Vec<Column>;
    /// The rows, each as long as `columns()`.
    fn rows(&self) -> Vec<Vec<String>>;
    /// Lines printed below a table (as `#` comments).
    fn summary(&self) -> Vec<String> {
        Vec::new()
    }
}

/// One output format's writer: lays out an answer (a result that is both
/// [`Serialize`] and [`Tabular`]) as text. Each format implements it once
/// ([`TableExporter`], [`JsonExporter`], [`CsvExporter`],
/// [`MarkdownExporter`]); [`Format`] implements it by dispatching to the
/// format it names.
///
/// ```
/// use zsum::export::{Column, CsvExporter, Exporter, Format, Tabular};
///
/// #[derive(serde::Serialize)]
/// struct Levels {
///     energies: Vec<u32>,
/// }
/// impl Tabular for Levels {
///     fn preamble(&self) -> Vec<String> {
///         vec!["two levels".into()]
///     }
///     fn columns(&self) -> Vec<Column> {
///         vec![Column::with_unit("E", "K")]
///     }
///     fn rows(&self) -> Vec<Vec<String>> {
///         self.energies.iter().map(|e| vec![e.to_string()]).collect()
///     }
/// }
/// let levels = Levels { energies: vec![0, 12] };
/// assert_eq!(CsvExporter.render(&levels)?, "E (K)\n0\n12\n");
/// assert_eq!(Format::Table.render(&levels)?, "# two levels\nE (K)\n    0\n   12\n");
/// assert_eq!(Format::Json.render(&levels)?, "{\n  \"energies\": [\n    0,\n    12\n  ]\n}\n");
/// # Ok::<(), zsum::Error>(())
/// ```
pub trait Exporter {
    /// `answer` laid out in this format.
    ///
    /// # Errors
    /// [`ErrorKind::Io`](crate::ErrorKind::Io) if the answer cannot be
    /// serialised (JSON) or written (CSV).
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String>;
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

impl Exporter for Format {
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String> {
        match self {
            Format::Table => TableExporter.render(answer),
            Format::Json => JsonExporter.render(answer),
            Format::Csv => CsvExporter.render(answer),
            Format::Markdown => MarkdownExporter.render(answer),
        }
    }
}

/// Renders a result in the given format (through its [`Exporter`]).
pub fn render<T: Serialize + Tabular>(result: &T, format: Format) -> Result<String> {
    format.render(result)
}
