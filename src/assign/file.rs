//! The assignments file: measured term values with their assigned quantum
//! numbers, one level per row.
//!
//! ```text
//! # Comments start with '#', anywhere on a line.
//! numbers = v J      # the quantum numbers of each row, in column order
//! unit = cm-1        # unit of values written without one (default cm-1)
//! #  v  J  term value     1-sigma        options
//!    0  0  0              0.00001
//!    0  1  3.84503        0.00002        src=MW-2019   # a note for this row
//!    1  0  2143.2712 cm-1 0.0005 cm-1
//!    0  2  0.0014307 eV   0.00002 cm-1   g=5
//! ```
//!
//! - `numbers = ...` (required, before the first row) names the quantum
//!   numbers as the model names them (`J`; `v J`; `J K`; ...); each row
//!   starts with that many integers.
//! - Then the term value (measured from the lowest level) and its 1σ
//!   uncertainty, each a decimal or fraction optionally followed by its own
//!   unit (`cm-1`, `K`, `meV`, `eV`, `J`, `kJ/mol`); every value is
//!   converted exactly to the file's `unit`.
//! - Then optional `g=N` (the level's degeneracy, checked against the
//!   model's) and `src=TAG` (where the value comes from); the rest of the
//!   line after `#` is the row's note.
//!
//! Malformed rows are refused naming the file, the line and the field.

use crate::error::{Error, ErrorKind, Result};
use crate::exact::parse_rational;
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use std::path::Path;

/// The largest assignments file read, in bytes.
pub const MAX_ASSIGNMENTS_BYTES: u64 = 64 << 20;

/// One measured level with its assignment.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Assigned {
    /// The line of the file (from 1).
    pub line: usize,
    /// The quantum numbers, in the order of [`Assignments::numbers`].
    pub numbers: Vec<i64>,
    /// The term value in the file's unit, measured from the lowest level.
    pub term: BigRational,
    /// Its 1σ uncertainty in the file's unit (positive).
    pub sigma: BigRational,
    /// The level's degeneracy, when the row gives one.
    pub degeneracy: Option<BigUint>,
    /// The row's source tag, if any.
    pub source: Option<String>,
    /// The row's note, if any.
    pub note: Option<String>,
}

/// An assignments file read and checked for form.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Assignments {
    /// Where the rows came from (a path, or a name given by the caller).
    pub origin: String,
    /// The quantum numbers' names, in column order.
    pub numbers: Vec<String>,
    /// The unit of every term value and uncertainty.
    pub unit: EnergyUnit,
    /// The rows, in file order.
    pub rows: Vec<Assigned>,
}

impl Assignments {
    /// Reads and parses the file at `path`.
    pub fn read(path: &Path) -> Result<Self> {
        let text = crate::input::read_text(path, "assignments file", MAX_ASSIGNMENTS_BYTES)?;
        Self::parse(&text, &path.display().to_string())
    }

    /// Parses assignments text; `origin` names it in messages.
    ///
    /// ```
    /// use zsum::assign::Assignments;
    /// let a = Assignments::parse(
    ///     "numbers = J\nunit = cm-1\n0 0 0.0001\n1 3.8450 0.0002 src=MW\n2 0.0014307 eV 0.00002 cm-1 g=5 # hot\n",
    ///     "demo",
    /// )?;
    /// assert_eq!(a.rows.len(), 3);
    /// // 0.0014307 eV in cm-1, exactly.
    /// let e = &a.rows[2].term;
    /// assert!((num_traits::ToPrimitive::to_f64(e).unwrap() - 11.5393).abs() < 1e-3);
    /// assert_eq!(a.rows[2].note.as_deref(), Some("hot"));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn parse(text: &str, origin: &str) -> Result<Self> {
        let mut numbers: Option<Vec<String>> = None;
        let mut unit = EnergyUnit::Wavenumber;
        let mut unit_set = false;
        let mut rows = Vec::new();
        for (i, raw) in text.lines().enumerate() {
            let line = i + 1;
            let here = Place { origin, line };
            let (body, note) = match raw.split_once('#') {
                Some((b, n)) => (b, Some(n.trim()).filter(|n| !n.is_empty())),
                None => (raw, None),
            };
            let body = body.trim();
            if body.is_empty() {
                continue;
            }
            if let Some((key, value)) = directive(body) {
                if !rows.is_empty() {
                    return Err(here.error(key, value, "settings come before the first row"));
                }
                match key {
                    "numbers" => {
                        let names: Vec<String> =
                            value.split_whitespace().map(str::to_string).collect();
                        check_names(&names).map_err(|why| here.error("numbers", value, &why))?;
                        numbers = Some(names);
                    }
                    "unit" => {
                        if unit_set {
                            return Err(here.error("unit", value, "the unit is set once"));
                        }
                        unit = EnergyUnit::parse(value).map_err(|_| {
                            here.error("unit", value, "use one of cm-1, K, meV, eV, J, kJ/mol")
                        })?;
                        unit_set = true;
                    }
                    other => {
                        return Err(here.error(
                            "setting",
                            other,
                            "the settings are `numbers = ...` and `unit = ...`",
                        ))
                    }
                }
                continue;
            }
            let names = numbers.as_ref().ok_or_else(|| {
                here.error(
                    "row",
                    body,
                    "the file must name its quantum numbers first, e.g. `numbers = v J`",
                )
            })?;
            rows.push(row(body, note, names, &unit, &here)?);
        }
        let numbers = numbers.ok_or_else(|| {
            Error::new(
                ErrorKind::Parse,
                format!(
                    "assignments file {origin}: no `numbers = ...` line naming the quantum \
                     numbers, and no rows"
                ),
            )
        })?;
        if rows.is_empty() {
            return Err(Error::new(
                ErrorKind::Parse,
                format!("assignments file {origin}: it has no rows (an empty list checks nothing)"),
            ));
        }
        Ok(Assignments {
            origin: origin.to_string(),
            numbers,
            unit,
            rows,
        })
    }

    /// The highest term value.
    pub fn highest(&self) -> &BigRational {
        self.rows
            .iter()
            .map(|r| &r.term)
            .max()
            .unwrap_or(&self.rows[0].term)
    }
}

/// Where a row is, for messages.
struct Place<'a> {
    origin: &'a str,
    line: usize,
}

impl Place<'_> {
    fn error(&self, field: &str, value: &str, allowed: &str) -> Error {
        Error::new(
            ErrorKind::Parse,
            format!(
                "assignments file {}, line {}, field {field}: {} is not allowed: {allowed}",
                self.origin,
                self.line,
                crate::error::excerpt(&format!("{value:?}"))
            ),
        )
    }
}

/// Settings lines start with a letter (`numbers = v J`); rows start with
/// a number.
fn directive(body: &str) -> Option<(&str, &str)> {
    if !body.starts_with(|c: char| c.is_ascii_alphabetic()) {
        return None;
    }
    Some(match body.split_once('=') {
        Some((k, v)) => (k.trim(), v.trim()),
        None => (body, ""),
    })
}

fn check_names(names: &[String]) -> std::result::Result<(), String> {
    if names.is_empty() {
        return Err("name at least one quantum number, e.g. `numbers = J`".into());
    }
    for (i, n) in names.iter().enumerate() {
        if !n.chars().all(|c| c.is_ascii_alphanumeric() || c == '_') {
            return Err(format!("{n:?} is not a name (letters, digits, _)"));
        }
        if names[..i].contains(n) {
            return Err(format!("{n} is named twice"));
        }
    }
    Ok(())
}

/// One row: the numbers, the term value and its uncertainty (each with an
/// optional unit), then options.
fn row(
    body: &str,
    note: Option<&str>,
    names: &[String],
    unit: &EnergyUnit,
    here: &Place<'_>,
) -> Result<Assigned> {
    let mut tokens = body.split_whitespace().peekable();
    let mut numbers = Vec::with_capacity(names.len());
    for name in names {
        let t = tokens.next().ok_or_else(|| {
            here.error(
                name,
                body,
                &format!(
                    "each row starts with the {} quantum numbers {}",
                    names.len(),
                    names.join(" ")
                ),
            )
        })?;
        let n: i64 = t
            .parse()
            .map_err(|_| here.error(name, t, "quantum numbers are integers (e.g. 0, 3, -2)"))?;
        numbers.push(n);
    }
    let mut value = |field: &str| -> Result<BigRational> {
        let t = tokens.next().ok_or_else(|| {
            here.error(
                field,
                body,
                "each row gives a term value and its 1-sigma uncertainty after the quantum \
                 numbers",
            )
        })?;
        let v = parse_rational(t)
            .map_err(|_| here.error(field, t, "a decimal or fraction, e.g. 3.84503 or 1/3"))?;
        // An optional unit right after the number.
        let own = tokens.peek().and_then(|u| EnergyUnit::parse(u).ok());
        match own {
            Some(u) => {
                tokens.next();
                u.convert(&v, unit)
                    .map_err(|e| here.error(field, t, &e.to_string()))
            }
            None => Ok(v),
        }
    };
    let term = value("term value")?;
    let sigma = value("uncertainty")?;
    if !sigma.is_positive() {
        return Err(here.error(
            "uncertainty",
            &crate::exact::exact_decimal(&sigma, 30),
            "a 1-sigma uncertainty is greater than zero",
        ));
    }
    if term.is_negative() {
        return Err(here.error(
            "term value",
            &crate::exact::exact_decimal(&term, 30),
            "term values are measured up from the lowest level (zero or more)",
        ));
    }
    let (mut degeneracy, mut source) = (None, None);
    for t in tokens {
        match t.split_once('=') {
            Some(("g", g)) => {
                let n: u64 = g.parse().ok().filter(|&n| n > 0).ok_or_else(|| {
                    here.error(
                        "g",
                        g,
                        "a degeneracy is a whole number of states, 1 or more",
                    )
                })?;
                degeneracy = Some(BigUint::from(n));
            }
            Some(("src", s)) if !s.is_empty() => source = Some(s.to_string()),
            _ => {
                return Err(here.error(
                    "option",
                    t,
                    "after the uncertainty a row takes only g=N and src=TAG (and a # note)",
                ))
            }
        }
    }
    debug_assert!(!sigma.is_zero());
    Ok(Assigned {
        line: here.line,
        numbers,
        term,
        sigma,
        degeneracy,
        source,
        note: note.map(str::to_string),
    })
}
