//! The aligned human table: `#` comment lines saying what and in which
//! units, a header row, right-aligned numeric columns.

use super::{Exporter, Tabular};
use crate::error::Result;
use serde::Serialize;

/// The aligned table as an [`Exporter`] ([`to_table`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct TableExporter;

impl Exporter for TableExporter {
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String> {
        Ok(to_table(answer))
    }
}

/// Lays out a result as an aligned text table.
pub fn to_table<T: Tabular>(result: &T) -> String {
    let cols = super::headings(&result.columns());
    let rows = result.rows();
    let mut width: Vec<usize> = cols.iter().map(|c| c.chars().count()).collect();
    for r in &rows {
        for (i, cell) in r.iter().enumerate() {
            if i < width.len() {
                width[i] = width[i].max(cell.chars().count());
            }
        }
    }
    // Numeric columns are right-aligned, text columns left-aligned; the last
    // column is never padded on the right.
    let numeric: Vec<bool> = (0..cols.len())
        .map(|i| {
            rows.iter()
                .all(|r| r.get(i).is_none_or(|c| looks_numeric(c)))
        })
        .collect();
    let mut out = String::new();
    for line in result.preamble() {
        out.push_str("# ");
        out.push_str(&line);
        out.push('\n');
    }
    let line = |cells: &[String], out: &mut String| {
        let mut parts = Vec::with_capacity(cells.len());
        for (i, c) in cells.iter().enumerate() {
            let pad = " ".repeat(width[i].saturating_sub(c.chars().count()));
            parts.push(if numeric[i] {
                format!("{pad}{c}")
            } else {
                format!("{c}{pad}")
            });
        }
        out.push_str(parts.join("  ").trim_end());
        out.push('\n');
    };
    line(&cols, &mut out);
    for r in &rows {
        line(r, &mut out);
    }
    for s in result.summary() {
        out.push_str("# ");
        out.push_str(&s);
        out.push('\n');
    }
    out
}

fn looks_numeric(s: &str) -> bool {
    !s.is_empty()
        && s.chars()
            .all(|c| c.is_ascii_digit() || matches!(c, '.' | '-' | '+' | 'e' | 'E' | '/'))
}
