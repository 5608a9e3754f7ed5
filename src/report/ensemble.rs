//! The answer of `zsum ensemble` as printed: Q_N over a temperature grid
//! with the errors of q^N/N! and q^N, written from the numbers of
//! [`crate::microstates::ensemble_sweep`].

use super::text::{error_text, value_text};
use crate::budget::Meter;
use crate::error::Result;
use crate::exact::{exact_decimal, format_sig};
use crate::export::{units_block, Column, Tabular};
use crate::microstates::{ensemble_sweep, EnsembleSweep, EnsembleValues, Statistics};
use crate::spectrum::Spectrum;
use crate::sum::Temperature;
use num_rational::BigRational;
use serde::Serialize;

/// One temperature of `zsum ensemble`: the N-particle functions and the
/// Boltzmann and labelled approximations' errors.
#[derive(Debug, Clone, Serialize)]
pub struct EnsemblePoint {
    /// The temperature as given.
    #[serde(rename = "T")]
    pub t: String,
    /// ln Q_N, exact statistics.
    pub ln_q: String,
    /// U/kT of the N particles.
    #[serde(rename = "U_over_kT")]
    pub u_over_kt: String,
    /// Cv/k of the N particles.
    #[serde(rename = "Cv_over_k")]
    pub cv_over_k: String,
    /// S/k of the N particles.
    #[serde(rename = "S_over_k")]
    pub s_over_k: String,
    /// ln(q^N/N!).
    pub ln_q_boltzmann: String,
    /// ln(q^N).
    pub ln_q_labelled: String,
    /// (q^N/N!)/Q_N − 1.
    pub boltzmann_error_q: String,
    /// Relative error of U from q^N/N! (or q^N: the same).
    pub boltzmann_error_u: String,
    /// Relative error of Cv from q^N/N! (or q^N: the same).
    pub boltzmann_error_cv: String,
    /// S/k from q^N/N! minus the exact S/k.
    pub boltzmann_error_s: String,
    /// q^N/Q_N − 1.
    pub labelled_error_q: String,
    /// Working precision, bits.
    pub precision_bits: u32,
    /// Bits the alternating fermion sum cancelled.
    pub cancelled_bits: u32,
    /// Whether every exact value's digits are proved.
    pub certified: bool,
}

impl EnsemblePoint {
    /// The values of `p` written to the digits they were computed for: the
    /// exact functions and the approximations' logarithms to those digits,
    /// the errors to four.
    ///
    /// ```
    /// use zsum::microstates::{ensemble_point, Statistics};
    /// use zsum::models::oscillator::HarmonicModes;
    /// use zsum::report::EnsemblePoint;
    /// use zsum::exact::parse_rational;
    /// use zsum::sum::Temperature;
    /// use zsum::units::EnergyUnit;
    /// // One particle: Q_1 = q, so ln Q = ln(1/(1 − e^{−1})) at T = 1 K and
    /// // Boltzmann counting is exact.
    /// let trap = HarmonicModes::one_d(parse_rational("1")?, false, EnergyUnit::Kelvin)?;
    /// let t = Temperature::Kelvin(parse_rational("1")?);
    /// let p = EnsemblePoint::new(&ensemble_point(&trap, 1, Statistics::Bose, &t, 10)?);
    /// assert_eq!((p.t.as_str(), p.ln_q.as_str()), ("1", "0.4586751454"));
    /// assert_eq!(p.ln_q_boltzmann, p.ln_q);
    /// assert!(p.certified);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(p: &EnsembleValues) -> Self {
        let d = p.digits;
        let t = match &p.temperature {
            Temperature::Kelvin(t) | Temperature::ThermalEnergy(t) => exact_decimal(t, 40),
        };
        EnsemblePoint {
            t,
            ln_q: p.ln_q.decimal_marked(d).0,
            u_over_kt: p.u_over_kt.decimal_marked(d).0,
            cv_over_k: p.cv_over_k.decimal_marked(d).0,
            s_over_k: p.s_over_k.decimal_marked(d).0,
            ln_q_boltzmann: value_text(p.ln_q_boltzmann.value(), d),
            ln_q_labelled: value_text(p.ln_q_labelled.value(), d),
            boltzmann_error_q: error_text(&p.boltzmann_error_q),
            boltzmann_error_u: error_text(&p.boltzmann_error_u),
            boltzmann_error_cv: error_text(&p.boltzmann_error_cv),
            boltzmann_error_s: error_text(&p.boltzmann_error_s),
            labelled_error_q: error_text(&p.labelled_error_q),
            precision_bits: p.precision_bits,
            cancelled_bits: p.cancelled_bits,
            certified: p.certified,
        }
    }
}

/// A temperature where the Boltzmann count q^N/N! crosses the tolerance.
#[derive(Debug, Clone, Serialize)]
pub struct BoltzmannCrossing {
    /// The temperature, to 4 significant digits.
    #[serde(rename = "T")]
    pub t: String,
    /// Whether the error exceeds the tolerance below this temperature.
    pub exceeds_below: bool,
}

/// `zsum ensemble`: Q_N over a temperature grid, with where q^N/N! fails.
#[derive(Debug, Clone, Serialize)]
pub struct EnsembleReport {
    /// The single-particle spectrum.
    pub system: String,
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// What T means: `K`, or `kT in <unit>`.
    pub temperature: String,
    /// The tolerance on the relative error of q^N/N! in Q.
    pub tolerance: String,
    /// One row per temperature, as given.
    pub rows: Vec<EnsemblePoint>,
    /// Where |q^N/N! / Q − 1| crosses the tolerance, coldest first.
    pub crossings: Vec<BoltzmannCrossing>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
    /// The spectrum's energy unit (of kT when the grid is kT).
    #[serde(skip)]
    energy_unit: String,
}

impl EnsembleReport {
    /// Q_N of `n` particles of `stats` at every temperature of `grid`
    /// (kelvin, or kT in the spectrum's unit), to `digits` digits, and the
    /// temperatures where q^N/N! crosses `tol` (relative error in Q).
    ///
    /// ```
    /// use zsum::microstates::Statistics;
    /// use zsum::report::EnsembleReport;
    /// use zsum::models::oscillator::HarmonicModes;
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// let trap = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
    /// let rep = EnsembleReport::build(&trap, 10, Statistics::Bose,
    ///     &[r("1"), r("100"), r("10000")], true, 8, &r("0.01"))?;
    /// assert_eq!(rep.rows.len(), 3);
    /// // q^N/N! errs by about N(N − 1)/(4T) here, so by more than 1% below
    /// // roughly 2250 K.
    /// assert_eq!(rep.crossings.len(), 1);
    /// assert!(rep.crossings[0].exceeds_below);
    /// let t: f64 = rep.crossings[0].t.parse().unwrap();
    /// assert!((2000.0..2500.0).contains(&t));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        spectrum: &dyn Spectrum,
        n: u64,
        stats: Statistics,
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        tol: &BigRational,
    ) -> Result<Self> {
        let meter = Meter::unlimited();
        Self::build_metered(spectrum, n, stats, grid, kelvin, digits, tol, &meter)
    }

    /// As [`EnsembleReport::build`], the temperatures timed by `meter`
    /// (hottest, costliest, first), which refuses the rest once their
    /// projected time exceeds its budget and tells its observer how far the
    /// grid is.
    #[allow(clippy::too_many_arguments)]
    pub fn build_metered(
        spectrum: &dyn Spectrum,
        n: u64,
        stats: Statistics,
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        tol: &BigRational,
        meter: &Meter,
    ) -> Result<Self> {
        let sweep = ensemble_sweep(spectrum, n, stats, grid, kelvin, digits, tol, meter)?;
        Ok(Self::new(spectrum, &sweep))
    }

    /// The sweep `e` over `spectrum` written out: each point to the digits
    /// it was computed for, the crossings to 4 significant digits, the
    /// tolerance in per cent.
    pub fn new(spectrum: &dyn Spectrum, e: &EnsembleSweep) -> Self {
        let percent = &e.tolerance * BigRational::from_integer(100.into());
        let energy_unit = spectrum.unit().to_string();
        EnsembleReport {
            units: units_block(&Self::columns_for(e.kelvin, &energy_unit)),
            energy_unit,
            system: spectrum.describe(),
            statistics: e.statistics,
            particles: e.particles,
            temperature: if e.kelvin {
                "K".into()
            } else {
                format!("kT in {}", spectrum.unit())
            },
            tolerance: format!("{}%", exact_decimal(&percent, 12)),
            rows: e.points.iter().map(EnsemblePoint::new).collect(),
            crossings: e
                .crossings
                .iter()
                .map(|c| BoltzmannCrossing {
                    t: format_sig(&c.temperature, 4),
                    exceeds_below: c.exceeds_below,
                })
                .collect(),
        }
    }

    /// The columns: T in K (or kT in the spectrum's unit), the exact
    /// functions, the errors of the shortcuts, the working precision.
    fn columns_for(kelvin: bool, unit: &str) -> Vec<Column> {
        let t = if kelvin {
            Column::with_unit("T", "K")
        } else {
            Column::with_unit("kT", unit)
        };
        let mut c = vec![t.key("T")];
        c.extend(
            [
                "ln Q",
                "U/kT",
                "Cv/k",
                "S/k",
                "err Q",
                "err U",
                "err Cv",
                "dS/k",
                "q^N err Q",
            ]
            .map(Column::plain),
        );
        c.push(Column::with_unit("precision", "bits").key("precision_bits"));
        c
    }
}

impl Tabular for EnsembleReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{} {} particles in {}: canonical Q_N by the exact recursion, every digit of ln Q, \
                 U/kT, Cv/k, S/k certified (totals for all N particles)",
                self.particles,
                self.statistics.name(),
                self.system
            ),
            format!(
                "T column: {}; err = relative error of q^N/N! (Boltzmann counting) against the \
                 exact Q_N; dS/k = its S/k minus the exact; q^N err = labelled counting; \
                 precision = working precision",
                if self.temperature == "K" {
                    "T in K".to_string()
                } else {
                    self.temperature.clone()
                }
            ),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(self.temperature == "K", &self.energy_unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.t.clone(),
                    r.ln_q.clone(),
                    r.u_over_kt.clone(),
                    r.cv_over_k.clone(),
                    r.s_over_k.clone(),
                    r.boltzmann_error_q.clone(),
                    r.boltzmann_error_u.clone(),
                    r.boltzmann_error_cv.clone(),
                    r.boltzmann_error_s.clone(),
                    r.labelled_error_q.clone(),
                    r.precision_bits.to_string(),
                ]
            })
            .collect()
    }
    fn summary(&self) -> Vec<String> {
        if self.crossings.is_empty() {
            return vec![format!(
                "q^N/N! does not cross the {} tolerance between the temperatures given",
                self.tolerance
            )];
        }
        self.crossings
            .iter()
            .map(|c| {
                format!(
                    "q^N/N! errs by more than {} in Q {} T = {} {}",
                    self.tolerance,
                    if c.exceeds_below { "below" } else { "above" },
                    c.t,
                    if self.temperature == "K" { "K" } else { "(kT)" }
                )
            })
            .collect()
    }
}
