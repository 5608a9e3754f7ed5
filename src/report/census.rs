//! The answers of `zsum census` as printed: the census of vibrational
//! states ([`CensusReport`]) and the error map of the Whitten–Rabinovitch
//! approximation ([`CensusErrorMap`]), written from the numbers of
//! [`crate::microstates::census`] and [`crate::microstates::census_error_map`].

use crate::error::{Error, Result};
use crate::exact::{exact_decimal, format_sig, format_sig_f64, parse_rational, DEFAULT_DIGITS};
use crate::export::{units_block, Column, Tabular};
use crate::microstates::{
    beyer_swinehart, census_error_map, round_to_decimals, ErrorMap, Mode, StateCounts,
    LOG10_DECIMALS,
};
use crate::spectrum::{Budget, Spectrum};
use crate::sum::Certified;
use num_bigint::BigInt;
use num_rational::BigRational;
use serde::Serialize;

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

/// The modes rounded to `rounded` steps of `step`.
fn rounded_modes(step: &BigRational, rounded: &[(u64, u32)]) -> Vec<RoundedMode> {
    rounded
        .iter()
        .map(|&(w, d)| RoundedMode {
            frequency: exact_decimal(&(step * BigRational::from_integer(w.into())), 40),
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

/// A certified value written to `decimals` decimal places, correctly
/// rounded (`-inf` for −∞).
fn fixed_text(x: &Certified, decimals: u32) -> String {
    let v = x.value();
    if v.is_infinite() && v.is_sign_negative() {
        return "-inf".into();
    }
    let Some(scaled) = round_to_decimals(x, decimals) else {
        // Not met for the census's logarithms (see their certification):
        // the nearest rounding then.
        return format!("{:.*}", decimals as usize, x.to_f64());
    };
    let neg = scaled < 0;
    let digits = scaled.abs().to_string();
    let d = decimals as usize;
    let padded = format!(
        "{}{digits}",
        "0".repeat((d + 1).saturating_sub(digits.len()))
    );
    let (int, frac) = padded.split_at(padded.len() - d);
    let body = if d == 0 {
        int.to_string()
    } else {
        format!("{int}.{frac}")
    };
    if neg {
        format!("-{body}")
    } else {
        body
    }
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
    /// The census `counts` (from [`crate::microstates::census`], which
    /// refuses tables beyond its budget) written in `unit` (the energy
    /// unit's name as shown), naming the `convolved` spectra that were
    /// convolved into it.
    ///
    /// ```
    /// use zsum::microstates::{census, parse_modes};
    /// use zsum::report::CensusReport;
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // Three modes of 2 cm-1 on a step of 1 cm-1: C(n + 2, 2) states at
    /// // 2n, so 1 + 3 + 6 + 10 = 20 states up to 6 cm-1.
    /// let c = census(&parse_modes("2x3")?, &r("1"), &r("6"), &EnergyUnit::Wavenumber, &[],
    ///                &Budget::default())?;
    /// let rep = CensusReport::new(&c, "cm-1", &[]);
    /// let last = rep.rows.last().unwrap();
    /// assert_eq!((last.energy.as_str(), last.in_step.as_str()), ("6", "10"));
    /// assert_eq!(last.sum_of_states, "20");
    /// assert_eq!(last.log10_sum, "1.3010"); // log10 20 = 1.30103
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(counts: &StateCounts, unit: &str, convolved: &[&dyn Spectrum]) -> Self {
        let rows = counts
            .rows()
            .map(|e| CensusRow {
                energy: exact_decimal(&e.energy, 40),
                sum_of_states: e.sum_of_states.to_string(),
                density: exact_decimal(&e.density, u32::MAX),
                in_step: e.in_step.to_string(),
                log10_sum: fixed_text(&e.log10_sum, LOG10_DECIMALS),
            })
            .collect();
        CensusReport {
            unit: unit.to_string(),
            step: exact_decimal(&counts.step, 40),
            modes: rounded_modes(&counts.step, &counts.rounded),
            convolved: convolved.iter().map(|s| s.describe()).collect(),
            rows,
            units: units_block(&Self::columns_for(unit)),
        }
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
                self.unit, DEFAULT_DIGITS
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
                    parse_rational(&r.density)
                        .map(|d| super::text::rational_text(&d, DEFAULT_DIGITS))
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
    let scale = BigRational::from_integer(BigInt::from(10).pow(e.abs() as u32));
    let value = if e >= 0.0 {
        mantissa * scale
    } else {
        mantissa / scale
    };
    format_sig(&value, digits)
}

/// A relative error to [`ERROR_DIGITS`] digits, `n/a` where undefined.
fn rel_text(err: Option<f64>) -> String {
    match err {
        Some(e) => format_sig_f64(e, ERROR_DIGITS),
        None => "n/a".into(),
    }
}

/// Refuses floating-point values asked for to more digits than they hold.
fn check_approx_digits(digits: u32) -> Result<()> {
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
    Ok(())
}

impl CensusErrorMap {
    /// Counts `modes` on a grid of `step` up to `up_to` (refusing grids
    /// beyond `budget`), samples `points` energies evenly up to the cutoff
    /// and compares there, floating-point values to `digits` significant
    /// digits; energies shown in `unit`.
    ///
    /// ```
    /// use zsum::microstates::parse_modes;
    /// use zsum::report::CensusErrorMap;
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // Three modes of 1000 cm-1: E_z = 1500 cm-1; the exact sum at 1000 k
    /// // cm-1 is C(k + 3, 3) (standard result). Up to 12 500 cm-1 with a
    /// // density window of 1000 cm-1, four points fall at 3000, ..., 12 000.
    /// let map = CensusErrorMap::build(&parse_modes("1000x3")?, &r("1"), &r("12500"), "cm-1",
    ///                                 4, 6, &Budget::default())?;
    /// let row = &map.rows[1];
    /// assert_eq!((row.energy.as_str(), row.e_over_ez.as_str()), ("6000", "4.000"));
    /// assert_eq!(row.sum_exact, "84"); // C(9, 3)
    /// assert!(!row.extrapolated);
    /// let err: f64 = row.sum_rel_error.parse().unwrap();
    /// assert!(err.abs() < 0.2);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        modes: &[Mode],
        step: &BigRational,
        up_to: &BigRational,
        unit: &str,
        points: usize,
        digits: u32,
        budget: &Budget,
    ) -> Result<Self> {
        let harmonic = beyer_swinehart(modes, step, up_to, budget)?;
        check_approx_digits(digits)?;
        let map = census_error_map(&harmonic, points)?;
        Self::new(&map, unit, digits)
    }

    /// The error map `map` written in `unit`, floating-point values to
    /// `digits` significant digits (1 to [`MAX_APPROX_DIGITS`]).
    pub fn new(map: &ErrorMap, unit: &str, digits: u32) -> Result<Self> {
        check_approx_digits(digits)?;
        let rows = map
            .points
            .iter()
            .map(|p| CensusErrorRow {
                energy: exact_decimal(&p.energy, 40),
                e_over_ez: format_sig(&p.e_over_ez, 4),
                sum_exact: p.sum_exact.to_string(),
                sum_approx: approx_text(p.ln_sum_approx, digits),
                sum_rel_error: rel_text(p.sum_rel_error),
                density_exact: format_sig(&p.density_exact, digits),
                density_approx: approx_text(p.ln_density_approx, digits),
                density_rel_error: rel_text(p.density_rel_error),
                extrapolated: p.extrapolated,
            })
            .collect();
        Ok(CensusErrorMap {
            unit: unit.to_string(),
            step: exact_decimal(&map.step, 40),
            modes: rounded_modes(&map.step, &map.rounded),
            zero_point: exact_decimal(&map.zero_point, 40),
            window: exact_decimal(&map.window, 40),
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
