//! CSV output: one header row, then the rows; no comments.

use super::{Exporter, Tabular};
use crate::error::{Error, ErrorKind, Result};
use serde::Serialize;

/// CSV as an [`Exporter`] ([`to_csv`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct CsvExporter;

impl Exporter for CsvExporter {
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String> {
        to_csv(answer)
    }
}

/// Writes a result's columns and rows as CSV.
pub fn to_csv<T: Tabular>(result: &T) -> Result<String> {
    let err = |e: csv::Error| Error::new(ErrorKind::Io, format!("cannot write CSV: {e}"));
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(super::headings(&result.columns()))
        .map_err(err)?;
    for row in result.rows() {
        w.write_record(row).map_err(err)?;
    }
    let bytes = w
        .into_inner()
        .map_err(|e| Error::new(ErrorKind::Io, format!("cannot write CSV: {e}")))?;
    String::from_utf8(bytes).map_err(|e| Error::new(ErrorKind::Io, e.to_string()))
}
