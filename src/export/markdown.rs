//! Markdown output: the preamble as a paragraph, then a pipe table.

use super::{Exporter, Tabular};
use crate::error::Result;
use serde::Serialize;

/// The Markdown table as an [`Exporter`] ([`to_markdown`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct MarkdownExporter;

impl Exporter for MarkdownExporter {
    fn render<T: Serialize + Tabular>(&self, answer: &T) -> Result<String> {
        Ok(to_markdown(answer))
    }
}

fn cell(text: &str) -> String {
    text.replace('|', "\\|").replace('\n', " ")
}

/// Lays out a result as a Markdown table under its preamble.
pub fn to_markdown<T: Tabular>(result: &T) -> String {
    let mut out = String::new();
    for line in result.preamble() {
        out.push_str(&cell(&line));
        out.push_str("  \n");
    }
    out.push('\n');
    let cols = super::headings(&result.columns());
    out.push_str(&format!(
        "| {} |\n",
        cols.iter().map(|c| cell(c)).collect::<Vec<_>>().join(" | ")
    ));
    out.push_str(&format!("|{}\n", " --- |".repeat(cols.len())));
    for r in result.rows() {
        out.push_str(&format!(
            "| {} |\n",
            r.iter().map(|c| cell(c)).collect::<Vec<_>>().join(" | ")
        ));
    }
    for line in result.summary() {
        out.push('\n');
        out.push_str(&cell(&line));
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    struct T;
    impl Tabular for T {
        fn preamble(&self) -> Vec<String> {
            vec!["what".into()]
        }
        fn columns(&self) -> Vec<crate::export::Column> {
            vec![
                crate::export::Column::plain("a"),
                crate::export::Column::plain("b|c"),
            ]
        }
        fn rows(&self) -> Vec<Vec<String>> {
            vec![vec!["1".into(), "2".into()]]
        }
    }

    #[test]
    fn pipes_are_escaped_and_rows_line_up() {
        assert_eq!(
            to_markdown(&T),
            "what  \n\n| a | b\\|c |\n| --- | --- |\n| 1 | 2 |\n"
        );
    }
}
