//! The reports of `zsum census`: a census of the vibrational states of
//! harmonic modes, counted exactly ([`super::beyer_swinehart`], with extra
//! degrees of freedom convolved in by [`super::stein_rabinovitch`]), and the
//! error map of the Whitten–Rabinovitch approximation against that count.

use super::{log10_fixed, whitten_rabinovitch, StateCounts};
use crate::error::{Error, Result};
use crate::exact::{exact_decimal, format_sig, format_sig_f64};
use crate::export::{units_block, Column, Tabular};
use crate::spectrum::Budget;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use serde::Serialize;

/// Decimal places of the `log10 N(E)` column.
const LOG10_DECIMALS: u32 = 4;

/// Significant digits of the error map's relative errors.
const ERROR_DIGITS: u32 = 3;

/// The most significant digits the error map prints of floating-point
/// values (an f64 carries about 15; the logarithms lose a few more).
pub const MAX_APPROX_DIGITS: u32 = 12;

/// One mode as counted: its frequency rounded to a whole number of steps.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct RoundedMode {
    /// The rounded frequency in the census's unit, exact.
    pub frequency: String,
    /// The rounded frequency in steps.
    pub steps: u64,
    /// How many modes share it.
    pub degeneracy: u32,
}

/// The modes of `c` as rounded.
fn rounded_modes(c: &StateCounts) -> Vec<RoundedMode> {
    c.rounded
        .iter()
        .map(|&(w, d)| RoundedMode {
            frequency: exact_decimal(&(&c.step * BigRational::from_integer(w.into())), 40),
            steps: w,
            degeneracy: d,
        })
        .collect()
}

/// `1000, 1500x2, 3000 cm-1`: the rounded modes as `--modes` takes them.
fn modes_line(modes: &[RoundedMode], unit: &str) -> String {
    let list: Vec<String> = modes
        .iter()
        .map(|m| match m.degeneracy {
            1 => m.frequency.clone(),
            d => format!("{}x{d}", m.frequency),
        })
        .collect();
    format!("{} {unit}", list.join(", "))
}

/// One energy of a census at which there are states.
#[derive(Debug, Clone, Serialize)]
pub struct CensusRow {
    /// The energy, exact: a whole number of steps.
    pub energy: String,
    /// The sum of states N(E): the states with energy at most E, exact.
    pub sum_of_states: String,
    /// The density of states ρ(E): the states in the step at E divided by
    /// the step, per unit energy, exact.
    pub density: String,
    /// The states in the step at E: those with energy E after rounding.
    pub in_step: String,
    /// log₁₀ N(E), correctly rounded to four decimal places.
    pub log10_sum: String,
}

/// What one row of the census costs in memory, with counts of up to
/// `bits` bits: the sum and the count as decimal text twice (the answer and
/// its rendering, about 0.3 digits per bit), the density, its log and the
/// energy, and the row's bookkeeping (measured: 440 to 600 bytes with
/// short counts).
pub fn census_row_bytes(bits: u64) -> f64 {
    4.0 * bits as f64 * std::f64::consts::LOG10_2 + 640.0
}

/// `zsum census`: the sum and density of states of harmonic modes at every
/// energy with states up to the cutoff.
#[derive(Debug, Clone, Serialize)]
pub struct CensusReport {
    /// The energy unit.
    pub unit: String,
    /// The energy step, exact.
    pub step: String,
    /// The modes as counted, rounded to whole steps.
    pub modes: Vec<RoundedMode>,
    /// Extra degrees of freedom convolved in (Stein–Rabinovitch), by name.
    pub convolved: Vec<String>,
    /// One row per energy with states.
    pub rows: Vec<CensusRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl CensusReport {
    /// The census of `c` in `unit`: every energy with states, refusing a
    /// table estimated beyond `budget`.
    ///
    /// ```
    /// use zsum::microstates::{beyer_swinehart, parse_modes, CensusReport};
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // Three modes of 2 cm-1 on a step of 1 cm-1: C(n + 2, 2) states at
    /// // 2n, so 1 + 3 + 6 + 10 = 20 states up to 6 cm-1.
    /// let c = beyer_swinehart(&parse_modes("2x3")?, &r("1"), &r("6"), &Budget::default())?;
    /// let rep = CensusReport::new(&c, "cm-1", &Budget::default())?;
    /// let last = rep.rows.last().unwrap();
    /// assert_eq!((last.energy.as_str(), last.in_step.as_str()), ("6", "10"));
    /// let n: u32 = last.sum_of_states.parse().unwrap();
    /// assert_eq!(n, 1 + 3 + 6 + 10);
    /// assert_eq!(last.log10_sum, "1.3010"); // log10 20 = 1.30103
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(c: &StateCounts, unit: &str, budget: &Budget) -> Result<Self> {
        let with_states = c.counts.iter().filter(|n| !n.is_zero()).count();
        let total: BigUint = c.counts.iter().sum();
        budget.check(
            &format!("a census table of {with_states} rows"),
            with_states as f64 * census_row_bytes(total.bits()),
            "use a coarser step or a lower cutoff",
        )?;
        let mut sum = BigUint::zero();
        let rows = c
            .counts
            .iter()
            .enumerate()
            .filter(|(_, n)| !n.is_zero())
            .map(|(k, n)| {
                sum += n;
                (k, n, sum.clone())
            })
            .map(|(k, n, sum)| CensusRow {
                energy: exact_decimal(&(&c.step * BigRational::from_integer(k.into())), 40),
                sum_of_states: sum.to_string(),
                density: exact_decimal(
                    &(BigRational::from_integer(n.clone().into()) / &c.step),
                    u32::MAX,
                ),
                in_step: n.to_string(),
                log10_sum: log10_fixed(&sum, LOG10_DECIMALS),
            })
            .collect();
        Ok(CensusReport {
            unit: unit.to_string(),
            step: exact_decimal(&c.step, 40),
            modes: rounded_modes(c),
            convolved: Vec::new(),
            rows,
            units: units_block(&Self::columns_for(unit)),
        })
    }

    /// Names the extra degrees of freedom convolved into the counts.
    pub fn with_convolved(mut self, names: Vec<String>) -> Self {
        self.convolved = names;
        self
    }

    /// The columns, cumulative first; energies in `unit`.
    fn columns_for(unit: &str) -> Vec<Column> {
        vec![
            Column::with_unit("E", unit).key("energy"),
            Column::plain("sum of states N(E)").key("sum_of_states"),
            Column::with_unit("density ρ(E)", &format!("1/{unit}")).key("density"),
            Column::plain("states in step").key("in_step"),
            Column::plain("log10 N(E)").key("log10_sum"),
        ]
    }
}

impl Tabular for CensusReport {
    fn preamble(&self) -> Vec<String> {
        let mut lines = vec![
            format!(
                "Census of vibrational states, counted exactly (Beyer–Swinehart) on a step of {} {}; \
                 modes rounded to whole steps: {}",
                self.step,
                self.unit,
                modes_line(&self.modes, &self.unit)
            ),
            format!(
                "N(E): the states with energy at most E; ρ(E): the states in the step at E over \
                 the step, per {} (exact in JSON; here to {} digits where longer); states in \
                 step: those at E; log10 N(E) to {LOG10_DECIMALS} decimals; only energies with \
                 states are listed",
                self.unit,
                crate::exact::DEFAULT_DIGITS
            ),
        ];
        if !self.convolved.is_empty() {
            lines.push(format!(
                "convolved in (Stein–Rabinovitch, levels rounded to whole steps): {}",
                self.convolved.join("; ")
            ));
        }
        lines
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.energy.clone(),
                    r.sum_of_states.clone(),
                    // Exact in JSON; here the exact decimal where it is
                    // short, else correctly rounded to the default digits.
                    crate::exact::parse_rational(&r.density)
                        .map(|d| {
                            crate::report::text::rational_text(&d, crate::exact::DEFAULT_DIGITS)
                        })
                        .unwrap_or_else(|_| r.density.clone()),
                    r.in_step.clone(),
                    r.log10_sum.clone(),
                ]
            })
            .collect()
    }
}

/// One energy of the error map.
#[derive(Debug, Clone, Serialize)]
pub struct CensusErrorRow {
    /// The energy, exact.
    pub energy: String,
    /// E/E_z, correctly rounded to 4 digits.
    pub e_over_ez: String,
    /// The exact sum of states N(E).
    pub sum_exact: String,
    /// The Whitten–Rabinovitch sum of states (floating point).
    pub sum_approx: String,
    /// N approx / N exact − 1, to 3 digits.
    pub sum_rel_error: String,
    /// The exact density averaged over a window: the states in
    /// (E − w/2, E + w/2] over w, correctly rounded.
    pub density_exact: String,
    /// The Whitten–Rabinovitch density (floating point).
    pub density_approx: String,
    /// ρ approx / ρ exact − 1, to 3 digits.
    pub density_rel_error: String,
    /// Whether E/E_z lies outside the formulas' range 0.1 to 8, where the
    /// nearer form is extrapolated.
    pub extrapolated: bool,
}

/// `zsum census --error-map`: the Whitten–Rabinovitch approximation against
/// the exact count of the same (rounded) harmonic modes.
#[derive(Debug, Clone, Serialize)]
pub struct CensusErrorMap {
    /// The energy unit.
    pub unit: String,
    /// The energy step, exact.
    pub step: String,
    /// The modes as counted, rounded to whole steps.
    pub modes: Vec<RoundedMode>,
    /// The zero-point energy E_z = ½ Σ hν of the rounded modes, exact.
    pub zero_point: String,
    /// The window w of the exact density (the lowest mode), exact.
    pub window: String,
    /// Significant digits of the floating-point values.
    pub digits: u32,
    /// One row per sampled energy.
    pub rows: Vec<CensusErrorRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

/// e^ln to `digits` significant digits, any size (through its decimal
/// exponent, so nothing overflows f64).
fn approx_text(ln: f64, digits: u32) -> String {
    if ln == f64::NEG_INFINITY {
        return "0".into();
    }
    if !ln.is_finite() {
        return "n/a".into();
    }
    let l10 = ln / std::f64::consts::LN_10;
    let e = l10.floor();
    let mantissa = BigRational::from_float(10f64.powf(l10 - e)).unwrap_or_default();
    let scale = BigRational::from_integer(num_bigint::BigInt::from(10).pow(e.abs() as u32));
    let value = if e >= 0.0 {
        mantissa * scale
    } else {
        mantissa / scale
    };
    format_sig(&value, digits)
}

/// e^ln_ratio − 1 to [`ERROR_DIGITS`] digits.
fn rel_text(ln_ratio: f64) -> String {
    if ln_ratio.is_finite() {
        format_sig_f64(ln_ratio.exp_m1(), ERROR_DIGITS)
    } else {
        "n/a".into()
    }
}

fn ln_big(x: &BigUint) -> f64 {
    super::ln_biguint(x, 64).to_f64()
}

impl CensusErrorMap {
    /// Samples `points` energies evenly up to the cutoff of `harmonic` (the
    /// modes' exact counts, nothing convolved in) and compares there,
    /// floating-point values to `digits` significant digits.
    ///
    /// ```
    /// use zsum::microstates::{beyer_swinehart, parse_modes, CensusErrorMap};
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // Three modes of 1000 cm-1: E_z = 1500 cm-1; the exact sum at 1000 k
    /// // cm-1 is C(k + 3, 3) (standard result). Up to 12 500 cm-1 with a
    /// // density window of 1000 cm-1, four points fall at 3000, ..., 12 000.
    /// let c = beyer_swinehart(&parse_modes("1000x3")?, &r("1"), &r("12500"), &Budget::default())?;
    /// let map = CensusErrorMap::new(&c, "cm-1", 4, 6)?;
    /// let row = &map.rows[1];
    /// assert_eq!((row.energy.as_str(), row.e_over_ez.as_str()), ("6000", "4.000"));
    /// assert_eq!(row.sum_exact, "84"); // C(9, 3)
    /// assert!(!row.extrapolated);
    /// let err: f64 = row.sum_rel_error.parse().unwrap();
    /// assert!(err.abs() < 0.2);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(harmonic: &StateCounts, unit: &str, points: usize, digits: u32) -> Result<Self> {
        if !(1..=MAX_APPROX_DIGITS).contains(&digits) {
            return Err(Error::invalid(
                "digits",
                digits,
                &format!(
                    "choose between 1 and {MAX_APPROX_DIGITS} significant digits (the \
                     approximation is evaluated in floating point)"
                ),
            ));
        }
        let g = harmonic.step.to_f64().unwrap_or(1.0);
        let freqs: Vec<f64> = harmonic
            .rounded
            .iter()
            .flat_map(|(w, d)| std::iter::repeat_n(*w as f64 * g, *d as usize))
            .collect();
        let steps_ez: BigUint = harmonic
            .rounded
            .iter()
            .map(|(w, d)| BigUint::from(*w) * BigUint::from(*d))
            .sum();
        // E/E_z = k / (Σ w / 2), exactly.
        let half_sum = BigRational::new(steps_ez.clone().into(), 2.into());
        let lowest = harmonic.rounded.iter().map(|(w, _)| *w).min().unwrap_or(1);
        let window = lowest.max(1) as usize;
        let top = harmonic.counts.len() - 1;
        // Sample where the whole density window fits under the cutoff.
        let half = window / 2;
        let span = top.saturating_sub(half);
        if points == 0 || points > span {
            return Err(Error::invalid(
                "error-map points",
                points,
                &if span == 0 {
                    format!(
                        "the cutoff leaves no energy to compare at (the density window is {} \
                         steps); raise the cutoff",
                        window
                    )
                } else {
                    format!(
                        "give at least one energy to compare at, and at most {span} (one per \
                         step up to the cutoff, less half the density window)"
                    )
                },
            ));
        }
        // The sums of states where the map needs them, in one pass (never
        // a sum per step: that would double the memory of the count).
        let at = |k: usize| (k.saturating_sub(half + window % 2), (k + half).min(top));
        let ks: Vec<usize> = (1..=points).map(|i| span * i / points).collect();
        let mut wanted: Vec<usize> = ks.iter().flat_map(|&k| [k, at(k).0, at(k).1]).collect();
        wanted.sort_unstable();
        wanted.dedup();
        let sums: std::collections::HashMap<usize, BigUint> = {
            let mut acc = BigUint::zero();
            let mut next = wanted.iter().peekable();
            let mut out = std::collections::HashMap::with_capacity(wanted.len());
            for (k, c) in harmonic.counts.iter().enumerate() {
                acc += c;
                while next.peek() == Some(&&k) {
                    out.insert(k, acc.clone());
                    next.next();
                }
                if next.peek().is_none() {
                    break;
                }
            }
            out
        };
        let mut rows = Vec::with_capacity(points);
        for &k in &ks {
            let e = k as f64 * g;
            let (lw, lr, _) = whitten_rabinovitch(&freqs, e);
            let (lo, hi) = at(k);
            let in_window = &sums[&hi] - &sums[&lo];
            let width = &harmonic.step * BigRational::from_integer((hi - lo).into());
            let density = BigRational::from_integer(in_window.clone().into()) / &width;
            let lre = ln_big(&in_window) - width.to_f64().unwrap_or(f64::NAN).ln();
            let reduced = BigRational::from_integer(k.into()) / &half_sum;
            let inside = reduced >= BigRational::new(1.into(), 10.into())
                && reduced <= BigRational::from_integer(8.into());
            rows.push(CensusErrorRow {
                energy: exact_decimal(&(&harmonic.step * BigRational::from_integer(k.into())), 40),
                e_over_ez: format_sig(&reduced, 4),
                sum_exact: sums[&k].to_string(),
                sum_approx: approx_text(lw, digits),
                sum_rel_error: rel_text(lw - ln_big(&sums[&k])),
                density_exact: format_sig(&density, digits),
                density_approx: approx_text(lr, digits),
                density_rel_error: rel_text(lr - lre),
                extrapolated: !inside,
            });
        }
        Ok(CensusErrorMap {
            unit: unit.to_string(),
            step: exact_decimal(&harmonic.step, 40),
            modes: rounded_modes(harmonic),
            zero_point: exact_decimal(&(&half_sum * &harmonic.step), 40),
            window: exact_decimal(
                &(&harmonic.step * BigRational::from_integer(window.into())),
                40,
            ),
            digits,
            rows,
            units: units_block(&Self::columns_for(unit)),
        })
    }

    /// The columns; energies in `unit`.
    fn columns_for(unit: &str) -> Vec<Column> {
        let per = format!("1/{unit}");
        vec![
            Column::with_unit("E", unit).key("energy"),
            Column::plain("E/E_z").key("e_over_ez"),
            Column::plain("N exact").key("sum_exact"),
            Column::plain("N approx").key("sum_approx"),
            Column::plain("rel. err N").key("sum_rel_error"),
            Column::with_unit("ρ exact", &per).key("density_exact"),
            Column::with_unit("ρ approx", &per).key("density_approx"),
            Column::plain("rel. err ρ").key("density_rel_error"),
            Column::plain("extrapolated").key("extrapolated"),
        ]
    }
}

impl Tabular for CensusErrorMap {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "Error map of the Whitten–Rabinovitch approximation against the exact census \
                 (Beyer–Swinehart), step {} {}, E_z = {} {}; modes rounded to whole steps: {}",
                self.step,
                self.unit,
                self.zero_point,
                self.unit,
                modes_line(&self.modes, &self.unit)
            ),
            format!(
                "N: the states with energy at most E; ρ exact: the states within a window of {} \
                 {} around E, over the window, per {}; rel. err = approx/exact − 1; approx \
                 values are floating-point evaluations to {} digits, not certified; \
                 extrapolated: E/E_z outside 0.1–8, the formulas' range",
                self.window, self.unit, self.unit, self.digits
            ),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.energy.clone(),
                    r.e_over_ez.clone(),
                    r.sum_exact.clone(),
                    r.sum_approx.clone(),
                    r.sum_rel_error.clone(),
                    r.density_exact.clone(),
                    r.density_approx.clone(),
                    r.density_rel_error.clone(),
                    if r.extrapolated { "yes" } else { "no" }.to_string(),
                ]
            })
            .collect()
    }
}
