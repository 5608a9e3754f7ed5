//! The answer of `zsum microstates` as printed: Ω(E, N), S = k ln Ω and
//! the microcanonical temperature beside the canonical ensemble, written
//! from the numbers of [`crate::microstates::microcanonical`].

use super::text::value_text;
use crate::error::Result;
use crate::exact::{exact_decimal, parse_rational};
use crate::export::{units_block, Column, Tabular};
use crate::microstates::{microcanonical, Microcanonical, Omega, Statistics, COMPARISON_DIGITS};
use crate::spectrum::Spectrum;
use num_rational::BigRational;
use serde::Serialize;

/// One total energy with states.
#[derive(Debug, Clone, Serialize)]
pub struct MicroRow {
    /// Total energy, exact.
    pub energy: String,
    /// Total energy above N·ε₀ in grid steps, exact.
    pub steps: u64,
    /// Ω(E, N), exact.
    pub omega: String,
    /// S/k = ln Ω.
    pub s_over_k: String,
    /// kT from the discrete derivative of ln Ω (central between the
    /// neighbouring energies with states; one-sided at the ends), in the
    /// spectrum's unit; `None` with no neighbour.
    pub kt: Option<String>,
    /// At the rows compared: the canonical mean energy at that temperature.
    pub canonical_u: Option<String>,
    /// At the rows compared: the canonical S/k at that temperature.
    pub canonical_s_over_k: Option<String>,
}

/// `zsum microstates`: Ω(E, N), S = k ln Ω and the microcanonical
/// temperature, compared with the canonical ensemble.
#[derive(Debug, Clone, Serialize)]
pub struct MicroReport {
    /// What was counted.
    pub system: String,
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// Energy unit.
    pub unit: String,
    /// The grid step, exact.
    pub grid_step: String,
    /// N·ε₀, the energy at step 0, exact.
    pub base: String,
    /// The highest total energy counted, exact.
    pub up_to: String,
    /// Rows with Ω > 0.
    pub rows: Vec<MicroRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl MicroReport {
    /// The report of `omega` (counted in `spectrum` up to `up_to`), with the
    /// canonical comparison at `compare` energies spread over the rows,
    /// values to `digits` digits.
    ///
    /// ```
    /// use zsum::microstates::{microstates, Statistics};
    /// use zsum::models::oscillator::HarmonicModes;
    /// use zsum::report::MicroReport;
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // An Einstein solid: 3 oscillators sharing 4 quanta, C(6, 4) = 15 ways.
    /// let osc = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
    /// let o = microstates(&osc, 3, Statistics::Distinct, &r("6"), None, &Budget::default())?;
    /// let rep = MicroReport::build(&osc, o, &r("6"), 2, 10)?;
    /// assert_eq!((rep.rows[4].energy.as_str(), rep.rows[4].omega.as_str()), ("4", "15"));
    /// assert_eq!(rep.rows[4].s_over_k, "2.708050201"); // ln 15
    /// assert_eq!(rep.rows.iter().filter(|r| r.canonical_u.is_some()).count(), 2);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        spectrum: &dyn Spectrum,
        omega: Omega,
        up_to: &BigRational,
        compare: usize,
        digits: u32,
    ) -> Result<Self> {
        let m = microcanonical(spectrum, omega, up_to, compare, digits)?;
        Ok(Self::new(spectrum, &m, digits))
    }

    /// The answer `m` for `spectrum`, values to `digits` digits: S/k, kT
    /// and the canonical values to those digits (kT `inf` where ln Ω is
    /// flat), energies exact.
    pub fn new(spectrum: &dyn Spectrum, m: &Microcanonical, digits: u32) -> Self {
        let rows = m
            .rows
            .iter()
            .map(|r| {
                let kt = r.kt.as_ref().map(|kt| {
                    if kt.is_infinite() {
                        "inf".to_string()
                    } else {
                        value_text(kt, digits)
                    }
                });
                let c = r.canonical.as_ref();
                MicroRow {
                    energy: exact_decimal(&m.energy(r), 40),
                    steps: r.steps,
                    omega: m.count(r).to_string(),
                    s_over_k: value_text(r.s_over_k.value(), digits),
                    kt,
                    canonical_u: c.map(|c| value_text(c.u.value(), digits)),
                    canonical_s_over_k: c.map(|c| value_text(c.s_over_k.value(), digits)),
                }
            })
            .collect();
        MicroReport {
            system: spectrum.describe(),
            statistics: m.statistics(),
            particles: m.particles(),
            unit: m.unit().to_string(),
            grid_step: exact_decimal(&m.omega.grid.step, 40),
            base: exact_decimal(&m.omega.energy(0), 40),
            up_to: exact_decimal(&m.up_to, 40),
            rows,
            units: units_block(&Self::columns_for(&spectrum.unit().to_string())),
        }
    }

    /// The columns of the counting table, energies in `unit`.
    fn columns_for(unit: &str) -> Vec<Column> {
        vec![
            Column::with_unit("E", unit).key("energy"),
            Column::plain("steps"),
            Column::plain("Omega"),
            Column::plain("S/k"),
            Column::with_unit("kT", unit).key("kt"),
            Column::with_unit("U canonical", unit).key("canonical_u"),
            Column::plain("S/k canonical"),
        ]
    }
}

/// An exact energy for the table: its decimal when that has at most 12
/// digits, else 12 digits.
fn shown(exact: &str) -> String {
    match parse_rational(exact) {
        Ok(x) => super::text::rational_text(&x, 12),
        Err(_) => exact.to_string(),
    }
}

impl Tabular for MicroReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{} {} particles in {}: exact microstate counts Ω(E, N) for every total energy up to {} {}",
                self.particles,
                self.statistics.name(),
                self.system,
                self.up_to,
                self.unit
            ),
            format!(
                "E = {} + steps × {} {} (shown to 12 digits where longer; exact in JSON); \
                 S/k = ln Ω; kT from the discrete derivative of ln Ω (central between \
                 neighbouring energies with states), in {}",
                shown(&self.base),
                shown(&self.grid_step),
                self.unit,
                self.unit
            ),
            format!(
                "U and S/k canonical: the canonical ensemble at that kT (rounded to \
                 {COMPARISON_DIGITS} digits), where compared"
            ),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        let o = |x: &Option<String>| x.clone().unwrap_or_default();
        self.rows
            .iter()
            .map(|r| {
                vec![
                    shown(&r.energy),
                    r.steps.to_string(),
                    r.omega.clone(),
                    r.s_over_k.clone(),
                    o(&r.kt),
                    o(&r.canonical_u),
                    o(&r.canonical_s_over_k),
                ]
            })
            .collect()
    }
}
