//! `zsum assign check` as printed: every row against the model, then the
//! duplicates, the missing allowed levels and the counts per group.

use crate::assign::{Check, NotAllowed};
use crate::exact::exact_decimal;
use crate::export::{Column, Tabular};
use serde::Serialize;

/// One checked row.
#[derive(Debug, Clone, Serialize)]
pub struct CheckRow {
    /// Line in the file.
    pub line: usize,
    /// Quantum numbers, file order.
    pub numbers: Vec<i64>,
    /// Observed term value.
    pub observed: String,
    /// Its 1σ.
    pub sigma: String,
    /// Model term value (empty when not allowed).
    pub model: String,
    /// Observed − model.
    pub residual: String,
    /// (o − c)/σ, 3 significant digits.
    pub normalised: String,
    /// What is wrong with the row, if anything.
    pub flags: Vec<String>,
}

/// An allowed level without a row.
#[derive(Debug, Clone, Serialize)]
pub struct MissingRow {
    /// Its quantum numbers.
    pub numbers: Vec<i64>,
    /// Its model term value.
    pub energy: String,
}

/// The check as printed.
#[derive(Debug, Clone, Serialize)]
pub struct CheckReport {
    /// The assignments file.
    pub file: String,
    /// The model.
    pub model: String,
    /// Quantum-number names.
    pub numbers: Vec<String>,
    /// Unit of every energy.
    pub unit: String,
    /// Suspect threshold in σ.
    pub threshold: f64,
    /// Every row.
    pub rows: Vec<CheckRow>,
    /// Lines flagged for any reason.
    pub flagged_lines: Vec<usize>,
    /// Duplicates, as text lines.
    pub duplicates: Vec<String>,
    /// Completeness limit.
    pub up_to: String,
    /// Allowed levels up to it with no row.
    pub missing: Vec<MissingRow>,
    /// `measured/allowed` per group, as text lines.
    pub groups: Vec<String>,
}

fn decimal(x: &num_rational::BigRational) -> String {
    exact_decimal(x, 12)
}

impl CheckReport {
    /// The printed form of `c` for the file `file`.
    pub fn new(c: &Check, file: &str) -> Self {
        let rows = c
            .rows
            .iter()
            .map(|r| {
                let mut flags = Vec::new();
                match &r.model {
                    Err(NotAllowed::Impossible(why)) => flags.push(format!("impossible: {why}")),
                    Err(NotAllowed::Forbidden) => flags.push(
                        "forbidden: the model's ladder continues past these numbers but no \
                         state carries them (nuclear-spin statistics)"
                            .into(),
                    ),
                    Err(NotAllowed::NotFound(e)) => flags.push(format!(
                        "not a level of the model up to {} {} (beyond its bound levels?)",
                        decimal(e),
                        c.unit
                    )),
                    Ok(_) => {}
                }
                if r.suspect {
                    flags.push(format!("suspect: |o-c| > {} sigma", c.threshold));
                }
                if let Some(g) = &r.degeneracy_mismatch {
                    flags.push(format!(
                        "degeneracy: the file gives {}, the model {g}",
                        r.row
                            .degeneracy
                            .as_ref()
                            .map(|d| d.to_string())
                            .unwrap_or_default()
                    ));
                }
                if let Some(d) = c
                    .duplicates
                    .iter()
                    .find(|d| !d.consistent && d.lines.contains(&r.row.line))
                {
                    flags.push(format!(
                        "inconsistent duplicate of lines {:?} ({:.3} sigma apart)",
                        d.lines, d.worst
                    ));
                }
                CheckRow {
                    line: r.row.line,
                    numbers: r.row.numbers.clone(),
                    observed: decimal(&r.row.term),
                    sigma: decimal(&r.row.sigma),
                    model: r.model.as_ref().map(decimal).unwrap_or_default(),
                    residual: r.residual.as_ref().map(decimal).unwrap_or_default(),
                    normalised: r.normalised.map(|z| format!("{z:.3}")).unwrap_or_default(),
                    flags,
                }
            })
            .collect();
        let name = |q: &[i64]| {
            c.numbers
                .iter()
                .zip(q)
                .map(|(n, v)| format!("{n}={v}"))
                .collect::<Vec<_>>()
                .join(" ")
        };
        CheckReport {
            file: file.into(),
            model: c.model.clone(),
            numbers: c.numbers.clone(),
            unit: c.unit.to_string(),
            threshold: c.threshold,
            rows,
            flagged_lines: c.flagged_lines(),
            duplicates: c
                .duplicates
                .iter()
                .map(|d| {
                    format!(
                        "{} on lines {:?}: weighted mean {} +/- {:.2e} {}, {}",
                        name(&d.numbers),
                        d.lines,
                        exact_decimal(&d.mean, 12),
                        d.sigma,
                        c.unit,
                        if d.consistent {
                            format!("consistent ({:.3} sigma apart)", d.worst)
                        } else {
                            format!("INCONSISTENT ({:.3} sigma apart)", d.worst)
                        }
                    )
                })
                .collect(),
            up_to: decimal(&c.up_to),
            missing: c
                .missing
                .iter()
                .map(|m| MissingRow {
                    numbers: m.numbers.clone(),
                    energy: decimal(&m.energy),
                })
                .collect(),
            groups: c
                .groups
                .iter()
                .map(|g| {
                    let key = if g.key.is_empty() {
                        "all levels".to_string()
                    } else {
                        g.key
                            .iter()
                            .map(|(n, v)| format!("{n}={v}"))
                            .collect::<Vec<_>>()
                            .join(" ")
                    };
                    format!(
                        "{key}: {} of {} allowed levels measured",
                        g.measured, g.allowed
                    )
                })
                .collect(),
        }
    }
}

impl Tabular for CheckReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!("assignments {} checked against {}", self.file, self.model),
            format!(
                "term values from the lowest level in {}; suspect beyond {} sigma; flagged \
                 lines: {}",
                self.unit,
                self.threshold,
                if self.flagged_lines.is_empty() {
                    "none".to_string()
                } else {
                    format!("{:?}", self.flagged_lines)
                }
            ),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        let mut c = vec![Column::plain("line")];
        for n in &self.numbers {
            c.push(Column::plain(n));
        }
        c.extend([
            Column::with_unit("observed", &self.unit),
            Column::with_unit("sigma", &self.unit),
            Column::with_unit("model", &self.unit),
            Column::with_unit("o-c", &self.unit),
            Column::with_unit("(o-c)/sigma", "1"),
            Column::plain("flags"),
        ]);
        c
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                std::iter::once(r.line.to_string())
                    .chain(r.numbers.iter().map(|n| n.to_string()))
                    .chain([
                        r.observed.clone(),
                        r.sigma.clone(),
                        r.model.clone(),
                        r.residual.clone(),
                        r.normalised.clone(),
                        r.flags.join("; "),
                    ])
                    .collect()
            })
            .collect()
    }
    fn summary(&self) -> Vec<String> {
        let mut out = Vec::new();
        for d in &self.duplicates {
            out.push(format!("duplicate: {d}"));
        }
        if self.missing.is_empty() {
            out.push(format!(
                "complete: every allowed level up to {} {} has a row",
                self.up_to, self.unit
            ));
        } else {
            out.push(format!(
                "missing: {} allowed levels up to {} {} have no row:",
                self.missing.len(),
                self.up_to,
                self.unit
            ));
            for m in &self.missing {
                let q: Vec<String> = self
                    .numbers
                    .iter()
                    .zip(&m.numbers)
                    .map(|(n, v)| format!("{n}={v}"))
                    .collect();
                out.push(format!("  {} at {} {}", q.join(" "), m.energy, self.unit));
            }
        }
        out.extend(self.groups.iter().map(|g| format!("count: {g}")));
        out
    }
}
