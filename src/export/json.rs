//! JSON output: pretty-printed, exact numbers as strings.

use super::{Exporter, Tabular};
use crate::error::{Error, ErrorKind, Result};
use serde::Serialize;

/// JSON as an [`Exporter`] ([`to_json`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct JsonExporter;

impl Exporter for JsonExporter {
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String> {
        to_json(answer)
    }
}

/// Serialises a result as pretty JSON with a trailing newline.
pub fn to_json<T: Serialize>(result: &T) -> Result<String> {
    let mut s = serde_json::to_string_pretty(result)
        .map_err(|e| Error::new(ErrorKind::Io, format!("cannot write JSON: {e}")))?;
    s.push('\n');
    Ok(s)
}
