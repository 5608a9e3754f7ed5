//! JSON output: pretty-printed, exact numbers as strings.

use crate::error::{Error, ErrorKind, Result};
use serde::Serialize;

/// Serialises a result as pretty JSON with a trailing newline.
pub fn to_json<T: Serialize>(result: &T) -> Result<String> {
    let mut s = serde_json::to_string_pretty(result)
        .map_err(|e| Error::new(ErrorKind::Io, format!("cannot write JSON: {e}")))?;
    s.push('\n');
    Ok(s)
}
