//! A user-supplied list of levels: electronic terms, fine-structure or
//! hyperfine levels, measured term values.
//!
//! # The level file format
//!
//! Plain UTF-8 text, one level per line:
//!
//! ```text
//! # Fluorine atom, ground configuration 2p5 (demo values)
//! 0      cm-1  4  2P3/2      # ground level
//! 404.1  cm-1  2  2P1/2
//! ```
//!
//! Each level line holds, separated by white space (spaces, tabs or any
//! Unicode white space):
//!
//! 1. **energy**: an exact decimal or fraction as [`parse_rational`] reads
//!    it: optional sign, digits with an optional decimal point, an optional
//!    exponent (`e` or `E`; exponents up to ±400 are always accepted,
//!    far larger ones refused), or `p/q` of two such numbers;
//!    underscores between digits are ignored. `881.0`, `-0.5`, `1.25e3`,
//!    `27/4` are energies. Negative energies are allowed (e.g. hyperfine
//!    levels relative to their centroid).
//! 2. **unit**: one of `J`, `eV`, `meV`, `cm-1` (also `cm^-1`, `1/cm`,
//!    `cm⁻¹`), `K`, `kJ/mol` (see [`EnergyUnit::parse`]). Lines may use
//!    different units; every energy is converted exactly to the unit of the
//!    first level (or to the unit asked for with [`LevelFile::with_unit`]).
//! 3. **degeneracy**: a whole number of at least 1 written with ASCII digits
//!    only (`4`, `2`, `1000000000000000000000` – any size).
//! 4. **label** (optional): the rest of the line, e.g. a term symbol. Its
//!    words are kept, joined by single spaces.
//!
//! `#` starts a comment that runs to the end of the line; blank lines and
//! comment-only lines are ignored. Lines end with `\n` or `\r\n`; a lone
//! `\r` is refused (it would hide line breaks). A leading byte-order mark is
//! skipped. A field may be at most [`MAX_FIELD_CHARS`] characters long and
//! a file at most [`MAX_FILE_BYTES`] bytes.
//!
//! Grammar (`ws` is one or more white-space characters, `[x]` optional,
//! `{x}` zero or more):
//!
//! ```text
//! file       = { line }
//! line       = [ws] [level [ws]] ["#" {any character}] ("\n" | "\r\n" | end of file)
//! level      = energy ws unit ws degeneracy [ws label]
//! energy     = number | number "/" number
//! number     = ["+" | "-"] digits ["." [digits]] [exponent] | ["+" | "-"] "." digits [exponent]
//! exponent   = ("e" | "E") ["+" | "-"] digit {digit}          (at most 6 digits; see above)
//! digits     = digit {digit}                                  (no "_" separators)
//! unit       = "J" | "eV" | "meV" | "cm-1" | "cm^-1" | "1/cm" | "cm⁻¹" | "K" | "kJ/mol"
//! degeneracy = digit {digit}                                  (value at least 1)
//! label      = word {ws word}                                 (no "#", no control characters)
//! ```
//!
//! # As a spectrum
//! Levels with equal energies (after conversion) merge into one level whose
//! degeneracy is the sum and whose label is the labels joined with `" + "`
//! ([`Spectrum::warnings`] reports each merge). The quantum numbers are
//! `term`, the 1-based position of the level among the file's level lines
//! (comments and blank lines do not count), and `sub`, which runs from 1 to
//! that line's degeneracy.
//!
//! ```
//! use zsum::models::level_file::LevelFile;
//! use zsum::spectrum::Spectrum;
//! use zsum::exact::parse_rational;
//! let f = LevelFile::parse("0 cm-1 4 2P3/2\n404.1 cm-1 2 2P1/2\n", "F.txt")?;
//! let levels = f.levels_up_to(&parse_rational("1000")?)?;
//! assert_eq!(levels.len(), 2);
//! assert_eq!(levels.levels()[1].energy, parse_rational("404.1")?);
//! assert_eq!(f.labels_at(&parse_rational("404.1")?), ["2P1/2"]);
//! # Ok::<(), zsum::Error>(())
//! ```

use crate::error::{Error, ErrorKind, Result};
use crate::exact::{parse_rational, rational_string};
use crate::level::{Level, LevelList};
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};
use std::path::Path;

/// The most states [`Spectrum::states_at`] lists one by one for a level;
/// a more degenerate level is refused with [`ErrorKind::Budget`] (its
/// energy and degeneracy still enter every level list and count).
pub const MAX_LISTED_STATES: u64 = 1_000_000;

/// The longest field (energy, unit, degeneracy or label) accepted, in
/// characters, so a corrupt file cannot ask for a giant number.
pub const MAX_FIELD_CHARS: usize = 1000;

/// The largest level file [`LevelFile::read`] accepts, in bytes (32 MiB).
pub const MAX_FILE_BYTES: u64 = crate::input::MAX_LEVEL_BYTES;

/// Bytes per level in a level list (exact energy and degeneracy).
const LEVEL_BYTES: f64 = 128.0;

/// What a level line looks like, for error messages.
const LINE_SHAPE: &str = "`<energy> <unit> <degeneracy> [label]`, e.g. `881.0 cm-1 2 2P1/2`";

/// The units a level line may use, for error messages.
const UNITS_ALLOWED: &str = "J, eV, meV, cm-1 (or cm^-1, 1/cm, cm⁻¹), K, kJ/mol";

/// One level as the file (or the caller) gives it, before merging.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Term {
    /// The energy, exact, in the unit of the [`LevelFile`] that holds it.
    pub energy: BigRational,
    /// The number of states at this energy given on this line (at least 1).
    pub degeneracy: BigUint,
    /// The label (e.g. a term symbol), if any.
    pub label: Option<String>,
    /// The line of the source text the level came from (1-based), or `None`
    /// for entries given with [`LevelFile::from_entries`].
    pub line: Option<usize>,
}

/// A user-supplied, finite list of levels (see the module documentation for
/// the file format).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LevelFile {
    source: Option<String>,
    unit: EnergyUnit,
    terms: Vec<Term>,
    levels: LevelList,
    /// For each level of `levels`, the indices into `terms` of the terms
    /// merged into it, ascending.
    members: Vec<Vec<usize>>,
}

/// Where a term sits, for messages: `line 3 of F.txt`, `line 3`, `level 3`.
fn place(source: Option<&str>, line: Option<usize>, index: usize) -> String {
    match (line, source) {
        (Some(n), Some(s)) => format!("line {n} of {s}"),
        (Some(n), None) => format!("line {n}"),
        (None, Some(s)) => format!("level {} of {s}", index + 1),
        (None, None) => format!("level {}", index + 1),
    }
}

/// A field quoted for a message, shortened if very long.
fn quoted(field: &str) -> String {
    if field.chars().count() > 40 {
        let head: String = field.chars().take(40).collect();
        format!("{head:?}... ({} characters)", field.chars().count())
    } else {
        format!("{field:?}")
    }
}

/// Checks a label and normalises its white space; `None` if it is empty.
fn clean_label(label: &str, at: &str) -> Result<Option<String>> {
    if let Some(c) = label.chars().find(|c| c.is_control() && !c.is_whitespace()) {
        return Err(Error::new(
            ErrorKind::Parse,
            format!(
                "{at}: the label {} contains the control character U+{:04X}: a label is \
                 printable text such as 2P3/2",
                quoted(label),
                c as u32
            ),
        ));
    }
    if label.chars().count() > MAX_FIELD_CHARS {
        return Err(Error::new(
            ErrorKind::Parse,
            format!(
                "{at}: the label {} is longer than {MAX_FIELD_CHARS} characters",
                quoted(label)
            ),
        ));
    }
    let words: Vec<&str> = label.split_whitespace().collect();
    Ok(if words.is_empty() {
        None
    } else {
        Some(words.join(" "))
    })
}

fn too_long(at: &str, what: &str, field: &str) -> Error {
    Error::new(
        ErrorKind::Parse,
        format!(
            "{at}: the {what} {} is longer than {MAX_FIELD_CHARS} characters, the most a \
             level file allows",
            quoted(field)
        ),
    )
}

/// Reads the energy field.
fn parse_energy(field: &str, at: &str) -> Result<BigRational> {
    if field.chars().count() > MAX_FIELD_CHARS {
        return Err(too_long(at, "energy", field));
    }
    match parse_rational(field) {
        Ok(v) => Ok(v),
        Err(e) => {
            let mut hint = String::new();
            if e.kind() == ErrorKind::InvalidParameter {
                hint = format!(" ({})", e.message());
            } else if field.starts_with('\u{2212}') {
                hint = " (write the minus sign as the ASCII hyphen-minus \"-\")".to_string();
            } else if let Some(unit) = glued_unit(field) {
                hint = format!(" (put a space between the number and the unit {unit:?})");
            } else if field.contains(['e', 'E'])
                && field.chars().all(|c| "0123456789+-._eE/".contains(c))
            {
                hint = " (the decimal exponent may be at most about ±400)".to_string();
            }
            Err(Error::new(
                ErrorKind::Parse,
                format!(
                    "{at}: cannot read the energy {}{hint}: expected an exact decimal such as \
                     0, 881.0 or 1.25e3, or a fraction such as 27/4, followed by a unit; a \
                     level line reads {LINE_SHAPE}",
                    quoted(field)
                ),
            ))
        }
    }
}

/// If `field` is a number with a unit glued on (`881.0cm-1`), the unit.
fn glued_unit(field: &str) -> Option<&str> {
    field
        .char_indices()
        .skip(1)
        .map(|(i, _)| i)
        .find(|&i| parse_rational(&field[..i]).is_ok() && EnergyUnit::parse(&field[i..]).is_ok())
        .map(|i| &field[i..])
}

/// Reads the unit field.
fn parse_unit(field: &str, energy_field: &str, at: &str) -> Result<EnergyUnit> {
    if field.chars().count() > MAX_FIELD_CHARS {
        return Err(too_long(at, "unit", field));
    }
    EnergyUnit::parse(field).map_err(|_| {
        let hint = if parse_rational(field).is_ok() {
            format!(
                " (it looks like a number: is the unit missing after the energy {energy_field:?}?)"
            )
        } else {
            String::new()
        };
        Error::new(
            ErrorKind::Unit,
            format!(
                "{at}: unknown energy unit {}{hint}: use one of {UNITS_ALLOWED}; a level line \
                 reads {LINE_SHAPE}",
                quoted(field)
            ),
        )
    })
}

/// Reads the degeneracy field: ASCII digits, value at least 1.
fn parse_degeneracy(field: &str, at: &str) -> Result<BigUint> {
    if field.chars().count() > MAX_FIELD_CHARS {
        return Err(too_long(at, "degeneracy", field));
    }
    let allowed = "a degeneracy counts states, so it must be a whole number of at least 1 \
                   written with digits only, such as 1, 2 or 4";
    if !field.is_empty() && field.bytes().all(|b| b.is_ascii_digit()) {
        let g: BigUint = field.parse().map_err(|_| {
            Error::new(
                ErrorKind::Parse,
                format!(
                    "{at}: cannot read the degeneracy {}: {allowed}",
                    quoted(field)
                ),
            )
        })?;
        if g.is_zero() {
            return Err(Error::new(
                ErrorKind::InvalidParameter,
                format!(
                    "{at}: degeneracy {} is not allowed: it is zero; {allowed} (leave the line \
                     out if the level holds no states)",
                    quoted(field)
                ),
            ));
        }
        return Ok(g);
    }
    let why = match parse_rational(field) {
        Ok(v) if v.is_negative() => "it is negative",
        Ok(v) if v.is_zero() => "it is zero",
        Ok(v) if !v.is_integer() => "it is not a whole number",
        Ok(_) => "it is not written with digits only",
        Err(_) => "it is not a number",
    };
    Err(Error::new(
        ErrorKind::InvalidParameter,
        format!(
            "{at}: degeneracy {} is not allowed: {why}; {allowed}; a level line reads \
             {LINE_SHAPE}",
            quoted(field)
        ),
    ))
}

fn missing(at: &str, what: &str, after: &str) -> Error {
    Error::new(
        ErrorKind::Parse,
        format!("{at}: the {what} is missing after {after}: a level line reads {LINE_SHAPE}"),
    )
}

impl LevelFile {
    /// Reads a level list from text (see the module documentation for the
    /// format). `source_name` names the text in messages and in
    /// [`Spectrum::describe`] (e.g. the file name); give `""` if there is
    /// none. Energies are converted exactly to the unit of the first level.
    pub fn parse(text: &str, source_name: &str) -> Result<Self> {
        let source = Some(source_name.trim()).filter(|s| !s.is_empty());
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut parsed: Vec<(EnergyUnit, Term)> = Vec::new();
        for (i, raw) in text.split('\n').enumerate() {
            let n = i + 1;
            let at = place(source, Some(n), 0);
            let line = raw.strip_suffix('\r').unwrap_or(raw);
            if line.contains('\r') {
                return Err(Error::new(
                    ErrorKind::Parse,
                    format!(
                        "{at}: a carriage return (\\r) inside the line, as in old Mac line ends; \
                         lines must end with \\n or \\r\\n"
                    ),
                ));
            }
            let content = line.split_once('#').map_or(line, |(c, _)| c);
            let mut fields = content.split_whitespace();
            let Some(energy_field) = fields.next() else {
                continue;
            };
            let energy = parse_energy(energy_field, &at)?;
            let unit_field = fields
                .next()
                .ok_or_else(|| missing(&at, "unit", &format!("the energy {energy_field:?}")))?;
            let unit = parse_unit(unit_field, energy_field, &at)?;
            let deg_field = fields
                .next()
                .ok_or_else(|| missing(&at, "degeneracy", &format!("the unit {unit_field:?}")))?;
            let degeneracy = parse_degeneracy(deg_field, &at)?;
            let rest: Vec<&str> = fields.collect();
            let label = clean_label(&rest.join(" "), &at)?;
            parsed.push((
                unit,
                Term {
                    energy,
                    degeneracy,
                    label,
                    line: Some(n),
                },
            ));
        }
        let Some(first_unit) = parsed.first().map(|p| p.0.clone()) else {
            return Err(Error::new(
                ErrorKind::Parse,
                format!(
                    "{}has no levels: it is empty or holds only comments and blank lines; give \
                     one level per line as {LINE_SHAPE}",
                    source.map_or("the level list ".to_string(), |s| format!("{s} "))
                ),
            ));
        };
        let mut terms = Vec::with_capacity(parsed.len());
        for (unit, mut term) in parsed {
            term.energy = unit.convert(&term.energy, &first_unit)?;
            terms.push(term);
        }
        Self::build(first_unit, terms, source.map(str::to_string))
    }

    /// Reads a level file from `path` (see the module documentation for the
    /// format). The path names the list in messages and descriptions.
    pub fn read(path: impl AsRef<Path>) -> Result<Self> {
        let path = path.as_ref();
        let name = path.display().to_string();
        let text = crate::input::read_text(path, "level file", MAX_FILE_BYTES)?;
        Self::parse(&text, &name)
    }

    /// A level list from entries already read elsewhere (e.g. a system
    /// file): `(energy, degeneracy, label)` in `unit`, in the order given.
    /// The same checks as for a file apply: at least one entry, every
    /// degeneracy at least 1, labels printable; an empty label counts as
    /// none. Messages name the entry as `level N` (1-based).
    pub fn from_entries(
        unit: EnergyUnit,
        entries: Vec<(BigRational, BigUint, Option<String>)>,
    ) -> Result<Self> {
        let mut terms = Vec::with_capacity(entries.len());
        for (i, (energy, degeneracy, label)) in entries.into_iter().enumerate() {
            let at = place(None, None, i);
            if degeneracy.is_zero() {
                return Err(Error::new(
                    ErrorKind::InvalidParameter,
                    format!(
                        "{at} (energy {} {unit}): degeneracy 0 is not allowed: a degeneracy \
                         counts states, a whole number of at least 1",
                        rational_string(&energy)
                    ),
                ));
            }
            let label = match label {
                Some(l) => clean_label(&l, &at)?,
                None => None,
            };
            terms.push(Term {
                energy,
                degeneracy,
                label,
                line: None,
            });
        }
        if terms.is_empty() {
            return Err(Error::new(
                ErrorKind::InvalidParameter,
                "the level list has no levels: give at least one (energy, degeneracy) entry",
            ));
        }
        Self::build(unit, terms, None)
    }

    /// Sorts and merges the terms into levels.
    fn build(unit: EnergyUnit, terms: Vec<Term>, source: Option<String>) -> Result<Self> {
        let mut order: Vec<usize> = (0..terms.len()).collect();
        order.sort_by(|&a, &b| terms[a].energy.cmp(&terms[b].energy)); // stable
        let mut levels: Vec<Level> = Vec::new();
        let mut members: Vec<Vec<usize>> = Vec::new();
        for i in order {
            let t = &terms[i];
            match (levels.last_mut(), members.last_mut()) {
                (Some(l), Some(m)) if l.energy == t.energy => {
                    l.degeneracy += &t.degeneracy;
                    m.push(i);
                }
                _ => {
                    levels.push(Level::new(t.energy.clone(), t.degeneracy.clone()));
                    members.push(vec![i]);
                }
            }
        }
        Ok(LevelFile {
            source,
            levels: LevelList::from_sorted(unit.clone(), levels),
            unit,
            terms,
            members,
        })
    }

    /// The same list named `source` in messages and descriptions (e.g. the
    /// system file it came from).
    pub fn with_source(mut self, source: &str) -> Self {
        self.source = Some(source.trim().to_string()).filter(|s| !s.is_empty());
        self
    }

    /// The same list with every energy converted exactly to `unit`. Fails
    /// if the size of either unit in joules is unknown.
    pub fn with_unit(&self, unit: &EnergyUnit) -> Result<Self> {
        let f = self.unit.factor_to(unit)?;
        if !f.is_positive() {
            return Err(Error::invalid(
                "unit",
                unit,
                "its size in joules must be greater than zero",
            ));
        }
        let terms = self
            .terms
            .iter()
            .map(|t| Term {
                energy: &t.energy * &f,
                ..t.clone()
            })
            .collect();
        Self::build(unit.clone(), terms, self.source.clone())
    }

    /// The name of the source (file name), if known.
    pub fn source(&self) -> Option<&str> {
        self.source.as_deref()
    }

    /// The levels as given, in the order given (before merging), with
    /// energies in [`Spectrum::unit`].
    pub fn terms(&self) -> &[Term] {
        &self.terms
    }

    /// All levels, merged and sorted.
    pub fn levels(&self) -> &LevelList {
        &self.levels
    }

    /// The index in `levels` of the level at `energy`, if any.
    fn level_index(&self, energy: &BigRational) -> Option<usize> {
        self.levels
            .levels()
            .binary_search_by(|l| l.energy.cmp(energy))
            .ok()
    }

    /// Names terms for a message: `lines 2 and 5 of F.txt`, `levels 1, 3 and 4`.
    fn places(&self, terms: &[usize]) -> String {
        let by_line: Option<Vec<usize>> = terms.iter().map(|&i| self.terms[i].line).collect();
        let (word, numbers) = match by_line {
            Some(lines) => ("lines", lines),
            None => ("levels", terms.iter().map(|&i| i + 1).collect()),
        };
        let mut text: Vec<String> = numbers.iter().map(|n| n.to_string()).collect();
        let last = text.pop().unwrap_or_default();
        let list = if text.is_empty() {
            last
        } else {
            format!("{} and {last}", text.join(", "))
        };
        let of = self
            .source
            .as_ref()
            .map_or(String::new(), |s| format!(" of {s}"));
        format!("{word} {list}{of}")
    }

    /// The joined label of level `k`, if any of its terms has a label.
    fn joined_label(&self, k: usize) -> Option<String> {
        let labels: Vec<&str> = self.members[k]
            .iter()
            .filter_map(|&i| self.terms[i].label.as_deref())
            .collect();
        if labels.is_empty() {
            None
        } else {
            Some(labels.join(" + "))
        }
    }
}

impl Spectrum for LevelFile {
    /// A finite list: carried exactly inside every classical
    /// approximation of a product.
    fn structure(&self) -> Structure<'_> {
        Structure::Finite
    }

    fn describe(&self) -> String {
        let n = self.levels.len();
        let from = self
            .source
            .as_ref()
            .map_or(String::new(), |s| format!(" from {s}"));
        format!(
            "level list{from}: {n} level{}, {} states",
            if n == 1 { "" } else { "s" },
            self.levels.total_states()
        )
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        vec!["term".to_string(), "sub".to_string()]
    }

    fn ground_energy(&self) -> BigRational {
        // `build` refuses empty lists, so a ground level exists.
        self.levels
            .ground()
            .map_or_else(BigRational::zero, |l| l.energy.clone())
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let list = self.levels.truncated(cutoff);
        budget.check_levels(
            format!(
                "listing the levels up to {} {}",
                rational_string(cutoff),
                self.unit
            ),
            list.len() as f64,
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        Ok(list)
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let Some(k) = self.level_index(energy) else {
            return Ok(Vec::new());
        };
        let g = &self.levels.levels()[k].degeneracy;
        let n = g
            .to_u64()
            .filter(|&n| n <= MAX_LISTED_STATES)
            .ok_or_else(|| {
                Error::budget(format!(
                    "the level at {} {} has {g} states, more than the {MAX_LISTED_STATES} zsum \
                 lists one by one; its energy and degeneracy are still used in every level \
                 list and sum (list levels without their states)",
                    rational_string(energy),
                    self.unit
                ))
            })?;
        let mut states = Vec::with_capacity(n as usize);
        for &i in &self.members[k] {
            // Each term's degeneracy is at most the level's, so it fits.
            let gi = self.terms[i].degeneracy.to_i64().unwrap_or(0);
            let term = i as i64 + 1;
            states.extend((1..=gi).map(|sub| State(vec![term, sub])));
        }
        Ok(states)
    }

    fn highest_energy(&self) -> Option<BigRational> {
        self.levels().levels().last().map(|l| l.energy.clone())
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        self.levels.count_up_to(energy)
    }

    fn labels_at(&self, energy: &BigRational) -> Vec<String> {
        self.level_index(energy)
            .and_then(|k| self.joined_label(k))
            .into_iter()
            .collect()
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let mut out = Vec::new();
        for (k, level) in self.levels.iter().enumerate() {
            if &level.energy > cutoff {
                break;
            }
            let m = &self.members[k];
            if m.len() < 2 {
                continue;
            }
            let places = self.places(m);
            let labels = self
                .joined_label(k)
                .map_or(String::new(), |l| format!(" ({l})"));
            out.push(format!(
                "{places}{labels} share the energy {} {} and are merged into one level of \
                 degeneracy {}",
                rational_string(&level.energy),
                self.unit,
                level.degeneracy
            ));
        }
        out
    }
}
