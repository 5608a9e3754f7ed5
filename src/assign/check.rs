//! Validation of assigned levels against a model: allowed quantum numbers,
//! degeneracies, duplicates, residuals, and which allowed levels have no
//! row.
//!
//! The model's terms come from [`Spectrum::terms_within`] (their labels
//! [`Spectrum::term_numbers`]); a system file's product is checked through
//! its one part that labels terms, when every other part is a single level.
//! Term values on both sides are measured from their own lowest level.
//! Irrational model energies (enclosed eigenvalues) enter by the rational
//! inside their enclosure the model lists, far closer than any measured
//! uncertainty.

use super::file::{Assigned, Assignments};
use crate::error::{Error, Result};
use crate::spectrum::{Budget, Spectrum, Structure};
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{One, ToPrimitive, Zero};
use std::collections::{BTreeMap, HashMap};

/// Choices for [`check`].
#[derive(Debug, Clone)]
pub struct CheckOptions {
    /// Rows whose |o − c|/σ exceeds this are flagged as suspect
    /// assignments (default 3), and duplicates whose normalised difference
    /// exceeds it as inconsistent.
    pub threshold: f64,
    /// Completeness is judged up to this term value (file unit); default
    /// the highest measured one.
    pub up_to: Option<BigRational>,
    /// Work budget for listing the model's terms.
    pub budget: Budget,
    /// Also count the model's states on every allowed row
    /// ([`RowCheck::states`]), as [`Check::measured_levels`] needs.
    pub with_states: bool,
}

impl Default for CheckOptions {
    fn default() -> Self {
        CheckOptions {
            threshold: 3.0,
            up_to: None,
            budget: Budget::default(),
            with_states: false,
        }
    }
}

/// Why a row's quantum numbers are not a level of the model.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum NotAllowed {
    /// Outside every model's range (a negative J or v, |K| > J): the text
    /// says which.
    Impossible(String),
    /// In range, but the model has no state with these numbers although
    /// its ladder continues above them: nuclear-spin statistics (or
    /// symmetry) forbid the level.
    Forbidden,
    /// No term of the model up to the energy searched has these numbers
    /// (e.g. beyond the last bound vibrational level); the energy searched,
    /// from the lowest level, in the file's unit.
    NotFound(BigRational),
}

/// One row checked.
#[derive(Debug, Clone)]
pub struct RowCheck {
    /// The row as read.
    pub row: Assigned,
    /// The model's term value for these numbers (from its lowest level, in
    /// the file's unit), or why there is none.
    pub model: std::result::Result<BigRational, NotAllowed>,
    /// Observed − model, exactly.
    pub residual: Option<BigRational>,
    /// (o − c)/σ.
    pub normalised: Option<f64>,
    /// |o − c|/σ beyond the threshold: a suspect assignment.
    pub suspect: bool,
    /// The model's degeneracy when the row gives one that differs.
    pub degeneracy_mismatch: Option<BigUint>,
    /// The model's number of states with these numbers, when asked for
    /// ([`CheckOptions::with_states`]) and the model's states carry the
    /// numbers plainly.
    pub states: Option<BigUint>,
}

/// The same quantum numbers on several rows.
#[derive(Debug, Clone)]
pub struct Duplicate {
    /// The numbers.
    pub numbers: Vec<i64>,
    /// The rows' lines.
    pub lines: Vec<usize>,
    /// Their weighted mean (weights 1/σ²), exactly.
    pub mean: BigRational,
    /// Its 1σ, 1/√(Σ 1/σ²).
    pub sigma: f64,
    /// The largest |a − b|/√(σa² + σb²) over pairs.
    pub worst: f64,
    /// Whether `worst` is within the threshold (then the mean stands for
    /// the rows).
    pub consistent: bool,
}

/// An allowed level with no row.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Missing {
    /// Its quantum numbers (file order).
    pub numbers: Vec<i64>,
    /// Its model term value from the lowest level, file unit.
    pub energy: BigRational,
}

/// Measured and allowed counts in one group of levels (one v, one K
/// stack: every number but J fixed).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct GroupCount {
    /// The group's fixed numbers as (name, value); empty for a single
    /// ladder.
    pub key: Vec<(String, i64)>,
    /// Allowed levels up to the completeness limit with at least one valid
    /// row.
    pub measured: usize,
    /// Allowed levels up to the completeness limit.
    pub allowed: usize,
}

/// The whole check.
#[derive(Debug, Clone)]
pub struct Check {
    /// The model checked against (its description).
    pub model: String,
    /// The quantum numbers' names (file order).
    pub numbers: Vec<String>,
    /// The file's unit.
    pub unit: EnergyUnit,
    /// The suspect threshold used.
    pub threshold: f64,
    /// Every row, in file order.
    pub rows: Vec<RowCheck>,
    /// Duplicated quantum numbers.
    pub duplicates: Vec<Duplicate>,
    /// The completeness limit (file unit).
    pub up_to: BigRational,
    /// Allowed levels up to it with no row, lowest first.
    pub missing: Vec<Missing>,
    /// Counts per group.
    pub groups: Vec<GroupCount>,
}

impl Check {
    /// The measured levels as a level list (file unit, from the lowest
    /// level) for summing on their own: each allowed level once, at its
    /// row's term value (the weighted mean of consistent duplicates; an
    /// inconsistent set is refused, naming its lines), with the model's
    /// count of its states (else the row's `g=`). Needs a check made with
    /// [`CheckOptions::with_states`].
    pub fn measured_levels(&self) -> Result<crate::level::LevelList> {
        let mut seen = std::collections::HashSet::new();
        let mut levels = Vec::new();
        for r in self.rows.iter().filter(|r| r.model.is_ok()) {
            if !seen.insert(r.row.numbers.clone()) {
                continue;
            }
            let dup = self
                .duplicates
                .iter()
                .find(|d| d.lines.contains(&r.row.line));
            let energy = match dup {
                Some(d) if !d.consistent => {
                    return Err(Error::invalid(
                        "duplicate rows",
                        format!("on lines {:?}", d.lines),
                        "they disagree beyond the threshold; keep the right one before \
                         summing the measured levels",
                    ))
                }
                Some(d) => d.mean.clone(),
                None => r.row.term.clone(),
            };
            let g = r
                .states
                .clone()
                .or_else(|| r.row.degeneracy.clone())
                .ok_or_else(|| {
                    Error::invalid(
                        "row",
                        format!("line {}", r.row.line),
                        "its degeneracy is unknown: give g=N on the row (the model's states do \
                     not carry the file's quantum numbers)",
                    )
                })?;
            levels.push(crate::level::Level::new(energy, g));
        }
        if levels.is_empty() {
            return Err(Error::invalid(
                "assignments",
                "with no allowed row",
                "at least one row must be a level of the model",
            ));
        }
        Ok(crate::level::LevelList::new(self.unit.clone(), levels))
    }

    /// Rows whose numbers are not a level of the model.
    pub fn not_allowed(&self) -> impl Iterator<Item = &RowCheck> {
        self.rows.iter().filter(|r| r.model.is_err())
    }

    /// Rows flagged for any reason (not allowed, suspect, degeneracy, or
    /// an inconsistent duplicate).
    pub fn flagged_lines(&self) -> Vec<usize> {
        let mut out: Vec<usize> = self
            .rows
            .iter()
            .filter(|r| r.model.is_err() || r.suspect || r.degeneracy_mismatch.is_some())
            .map(|r| r.row.line)
            .chain(
                self.duplicates
                    .iter()
                    .filter(|d| !d.consistent)
                    .flat_map(|d| d.lines.iter().copied()),
            )
            .collect();
        out.sort_unstable();
        out.dedup();
        out
    }
}

/// The spectrum whose terms carry `names`: `s` itself, or the one part of
/// a product that labels its terms when every other part is one level.
/// Returns it with the factor taking its energies to `s`'s unit.
fn term_source<'a>(
    s: &'a dyn Spectrum,
    names: &[String],
) -> Result<(&'a dyn Spectrum, BigRational)> {
    if !s.term_numbers().is_empty() {
        return Ok((s, BigRational::one()));
    }
    let unlabelled = || {
        Error::invalid(
            "model",
            s.describe(),
            &format!(
                "its levels carry no term labels to match the file's quantum numbers {}; \
                 check against a rotor, top, oscillator or vibrating rotor",
                names.join(" ")
            ),
        )
    };
    let Structure::Parts(parts) = s.structure() else {
        return Err(unlabelled());
    };
    let mut found = None;
    for (p, f) in parts {
        if !p.term_numbers().is_empty() {
            if found.is_some() {
                return Err(Error::invalid(
                    "model",
                    s.describe(),
                    "more than one of its parts labels its terms; check against one part alone",
                ));
            }
            found = Some((p, f));
        } else if p.highest_energy().as_ref() != Some(&p.ground_energy())
            || p.count_bound(&p.ground_energy()) != BigUint::one()
        {
            return Err(Error::invalid(
                "model",
                s.describe(),
                &format!(
                    "its part {} has levels of its own besides the labelled part; check \
                     against the labelled part alone",
                    p.describe()
                ),
            ));
        }
    }
    found.ok_or_else(unlabelled)
}

/// Checks every row of `a` against `model` (module docs).
///
/// ```
/// use zsum::assign::{check, Assignments, CheckOptions};
/// use zsum::models::rotor::LinearRotor;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| zsum::exact::parse_rational(s).unwrap();
/// let rotor = LinearRotor::new(r("1.9"), r("0"), r("0"), EnergyUnit::Wavenumber)?;
/// // J = 2 lies at 6B = 11.4; the row for J = 3 (at 22.8) is a misassignment.
/// let a = Assignments::parse("numbers = J\n0 0 0.001\n1 3.8 0.001\n2 11.4 0.001\n3 21.0 0.001\n", "demo")?;
/// let c = check(&a, &rotor, &CheckOptions::default())?;
/// assert_eq!(c.flagged_lines(), vec![5]);
/// assert_eq!(c.rows[3].residual, Some(r("-1.8")));
/// assert!(c.missing.is_empty());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn check(a: &Assignments, model: &dyn Spectrum, opts: &CheckOptions) -> Result<Check> {
    if !(opts.threshold.is_finite() && opts.threshold > 0.0) {
        return Err(Error::invalid(
            "threshold",
            opts.threshold,
            "it must be a positive number of standard deviations, e.g. 3",
        ));
    }
    let (s, factor) = term_source(model, &a.numbers)?;
    let model_names = s.term_numbers();
    // The file's columns in the model's order.
    let mut index = Vec::with_capacity(model_names.len());
    for n in &model_names {
        let i = a.numbers.iter().position(|m| m == n).ok_or_else(|| {
            Error::invalid(
                "quantum numbers",
                a.numbers.join(" "),
                &format!(
                    "the model {} labels its levels by {}; name exactly those (in any order)",
                    s.describe(),
                    model_names.join(" ")
                ),
            )
        })?;
        index.push(i);
    }
    if a.numbers.len() != model_names.len() {
        let extra: Vec<&String> = a
            .numbers
            .iter()
            .filter(|n| !model_names.contains(n))
            .collect();
        return Err(Error::invalid(
            "quantum number",
            extra
                .iter()
                .map(|s| s.as_str())
                .collect::<Vec<_>>()
                .join(" "),
            &format!(
                "the model {} labels its levels by {} only",
                s.describe(),
                model_names.join(" ")
            ),
        ));
    }
    let to_file = s.unit().factor_to(&a.unit)? * &factor;
    let to_model = BigRational::one() / &to_file;
    let k_col = a.numbers.iter().position(|n| n == "K");
    // K stands for the ±K pair in the models that name it.
    let key = |numbers: &[i64]| -> Vec<i64> {
        let mut k = numbers.to_vec();
        if let Some(i) = k_col {
            k[i] = k[i].abs();
        }
        k
    };
    let up_to = opts.up_to.clone().unwrap_or_else(|| a.highest().clone());
    let reach = up_to.clone().max(a.highest().clone());
    let e0 = s.ground_energy();
    // Terms in file order and unit, from the lowest level.
    let list = |above: &BigRational| -> Result<HashMap<Vec<i64>, BigRational>> {
        let cut = &e0 + above * &to_model;
        let mut map = HashMap::new();
        for (e, q) in s.terms_within(&cut, &opts.budget)? {
            let mut numbers = vec![0i64; q.len()];
            for (j, &i) in index.iter().enumerate() {
                numbers[i] = q[j];
            }
            map.insert(key(&numbers), (e - &e0) * &to_file);
        }
        Ok(map)
    };
    let base = &reach * BigRational::new(5.into(), 4.into())
        + EnergyUnit::Wavenumber.convert(&BigRational::one(), &a.unit)?;
    let mut searched = base.clone();
    let mut terms = list(&searched)?;
    let impossible: Vec<Option<String>> = a.rows.iter().map(|r| impossible(a, r)).collect();
    let unresolved = |terms: &HashMap<Vec<i64>, BigRational>| -> bool {
        a.rows.iter().zip(&impossible).any(|(r, imp)| {
            imp.is_none()
                && !terms.contains_key(&key(&r.numbers))
                && !passed(terms, &key(&r.numbers))
        })
    };
    // Widen (up to 64 times the first reach) while some row is neither a
    // term nor provably skipped by its ladder.
    for _ in 0..6 {
        if !unresolved(&terms) {
            break;
        }
        let wider = &searched * BigRational::from_integer(2.into());
        match list(&wider) {
            Ok(t) => {
                terms = t;
                searched = wider;
            }
            Err(_) => break,
        }
    }
    let mut rows = Vec::with_capacity(a.rows.len());
    for (r, imp) in a.rows.iter().zip(impossible) {
        let k = key(&r.numbers);
        let model = match (imp, terms.get(&k)) {
            (Some(why), _) => Err(NotAllowed::Impossible(why)),
            (None, Some(e)) => Ok(e.clone()),
            (None, None) if passed(&terms, &k) => Err(NotAllowed::Forbidden),
            (None, None) => Err(NotAllowed::NotFound(searched.clone())),
        };
        let residual = model.as_ref().ok().map(|m| &r.term - m);
        let normalised = residual
            .as_ref()
            .map(|d| (d / &r.sigma).to_f64().unwrap_or(f64::INFINITY));
        let suspect = normalised.is_some_and(|z| z.abs() > opts.threshold);
        let states = match &model {
            Ok(e) if r.degeneracy.is_some() || opts.with_states => {
                let energy = &e0 + e * &to_model;
                term_degeneracy(s, &energy, &model_names, &index, &r.numbers, k_col)?
            }
            _ => None,
        };
        let degeneracy_mismatch = match (&r.degeneracy, &states) {
            (Some(g), Some(own)) if own != g => Some(own.clone()),
            _ => None,
        };
        rows.push(RowCheck {
            row: r.clone(),
            model,
            residual,
            normalised,
            suspect,
            degeneracy_mismatch,
            states: states.filter(|_| opts.with_states),
        });
    }
    let duplicates = duplicates(a, &key, opts.threshold);
    // Completeness up to the limit.
    let measured: std::collections::HashSet<Vec<i64>> = rows
        .iter()
        .filter(|r| r.model.is_ok())
        .map(|r| key(&r.row.numbers))
        .collect();
    let mut missing: Vec<Missing> = terms
        .iter()
        .filter(|(q, e)| **e <= up_to && !measured.contains(*q))
        .map(|(q, e)| Missing {
            numbers: q.clone(),
            energy: e.clone(),
        })
        .collect();
    missing.sort_by(|x, y| x.energy.cmp(&y.energy).then(x.numbers.cmp(&y.numbers)));
    let j_col = a.numbers.iter().position(|n| n == "J");
    let group_of = |q: &[i64]| -> Vec<(String, i64)> {
        a.numbers
            .iter()
            .zip(q)
            .enumerate()
            .filter(|(i, _)| Some(*i) != j_col)
            .map(|(_, (n, v))| (n.clone(), *v))
            .collect()
    };
    let mut groups: BTreeMap<Vec<(String, i64)>, (usize, usize)> = BTreeMap::new();
    for (q, e) in &terms {
        if *e <= up_to {
            let g = groups.entry(group_of(q)).or_default();
            g.1 += 1;
            if measured.contains(q) {
                g.0 += 1;
            }
        }
    }
    Ok(Check {
        model: s.describe(),
        numbers: a.numbers.clone(),
        unit: a.unit.clone(),
        threshold: opts.threshold,
        rows,
        duplicates,
        up_to,
        missing,
        groups: groups
            .into_iter()
            .map(|(key, (measured, allowed))| GroupCount {
                key,
                measured,
                allowed,
            })
            .collect(),
    })
}

/// A row outside every model's range: a negative J or v, |K| > J.
fn impossible(a: &Assignments, r: &Assigned) -> Option<String> {
    let get = |name: &str| {
        a.numbers
            .iter()
            .position(|n| n == name)
            .map(|i| r.numbers[i])
    };
    for name in ["J", "v", "N"] {
        if let Some(x) = get(name).filter(|&x| x < 0) {
            return Some(format!("{name} = {x} is negative; {name} is 0 or more"));
        }
    }
    if let (Some(j), Some(k)) = (get("J"), get("K")) {
        if k.abs() > j {
            return Some(format!("|K| = {} exceeds J = {j}; |K| ≤ J", k.abs()));
        }
    }
    None
}

/// Whether the terms pass `q` along one of its numbers: some term agrees
/// in every other number and is higher in that one (both ≥ 0), so the
/// model's ladder through `q` is listed beyond it.
fn passed(terms: &HashMap<Vec<i64>, BigRational>, q: &[i64]) -> bool {
    terms.keys().any(|t| {
        let differ: Vec<usize> = (0..q.len()).filter(|&i| t[i] != q[i]).collect();
        differ.len() == 1 && q[differ[0]] >= 0 && t[differ[0]] > q[differ[0]]
    })
}

/// The states at `energy` whose numbers named by the file equal the row's
/// (|K| for K), counted; `None` when the model's states do not carry every
/// named number plainly (then no degeneracy is checked).
fn term_degeneracy(
    s: &dyn Spectrum,
    energy: &BigRational,
    model_names: &[String],
    index: &[usize],
    numbers: &[i64],
    k_col: Option<usize>,
) -> Result<Option<BigUint>> {
    let state_names = s.quantum_numbers();
    let doubled = s.doubled_numbers();
    let mut at = Vec::with_capacity(model_names.len());
    for (j, n) in model_names.iter().enumerate() {
        match state_names.iter().position(|m| m == n) {
            Some(p) if !doubled.get(p).copied().unwrap_or(false) => at.push((p, index[j])),
            _ => return Ok(None),
        }
    }
    let count = s
        .states_at(energy)?
        .iter()
        .filter(|st| {
            at.iter().all(|&(p, i)| {
                let v = st.0[p];
                if Some(i) == k_col {
                    v.abs() == numbers[i].abs()
                } else {
                    v == numbers[i]
                }
            })
        })
        .count();
    Ok(Some(BigUint::from(count)))
}

fn duplicates(a: &Assignments, key: &dyn Fn(&[i64]) -> Vec<i64>, threshold: f64) -> Vec<Duplicate> {
    let mut by: BTreeMap<Vec<i64>, Vec<&Assigned>> = BTreeMap::new();
    for r in &a.rows {
        by.entry(key(&r.numbers)).or_default().push(r);
    }
    let f = |x: &BigRational| x.to_f64().unwrap_or(f64::NAN);
    by.into_iter()
        .filter(|(_, rs)| rs.len() > 1)
        .map(|(numbers, rs)| {
            let mut sw = BigRational::zero();
            let mut swx = BigRational::zero();
            for r in &rs {
                let w = BigRational::one() / (&r.sigma * &r.sigma);
                swx += &w * &r.term;
                sw += w;
            }
            let mut worst = 0f64;
            for (i, x) in rs.iter().enumerate() {
                for y in &rs[i + 1..] {
                    let d = f(&(&x.term - &y.term)).abs();
                    let s = (f(&x.sigma).powi(2) + f(&y.sigma).powi(2)).sqrt();
                    worst = worst.max(d / s);
                }
            }
            Duplicate {
                numbers,
                lines: rs.iter().map(|r| r.line).collect(),
                mean: &swx / &sw,
                sigma: 1.0 / f(&sw).sqrt(),
                worst,
                consistent: worst <= threshold,
            }
        })
        .collect()
}
