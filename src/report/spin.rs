//! `zsum spin` as printed: the spin temperature of a measured isomer
//! composition, or a table of equilibrium isomer fractions and the heat a
//! frozen composition releases relaxing to equilibrium.

use super::molar::digits_text;
use crate::exact::exact_decimal;
use crate::export::{Column, Tabular};
use crate::species::spin::{RelaxationPoint, SpinTemperature};
use serde::Serialize;

const CAUTION: &str = "ideal-gas model values: design decisions follow certified property \
                       data, local codes and licensed engineering practice";

/// `zsum spin SPECIES --measured A/B=X`.
#[derive(Debug, Clone, Serialize)]
pub struct SpinTemperatureReport {
    /// The species.
    pub species: String,
    /// What was measured: `ortho/para` or `para fraction`.
    pub composition: String,
    /// The measured value, as given.
    pub measured: String,
    /// The spin temperature in kelvin, every digit certified.
    #[serde(rename = "T_spin")]
    pub t_spin: String,
    /// The values that have a spin temperature.
    pub range: String,
}

impl SpinTemperatureReport {
    /// The answer for `st`.
    ///
    /// ```
    /// use zsum::report::SpinTemperatureReport;
    /// use zsum::species::spin::{spin_temperature, Composition};
    /// let db = zsum::species::Database::builtin()?;
    /// let st = spin_temperature(db.find("H2")?, &Composition::parse("para=0.5")?, 6)?;
    /// let r = SpinTemperatureReport::new(&st);
    /// let t: f64 = r.t_spin.parse().unwrap();
    /// assert!(t > 50.0 && t < 120.0, "{t}");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(st: &SpinTemperature) -> Self {
        SpinTemperatureReport {
            species: st.species.clone(),
            composition: st.composition.label(),
            measured: exact_decimal(st.composition.value(), 30),
            t_spin: digits_text(&st.t, st.digits),
            range: st.range.text(),
        }
    }
}

impl Tabular for SpinTemperatureReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{}: the temperature at which the equilibrium {} equals the measured value \
                 (exact isomer sums with nuclear-spin weights; T certified to its digits)",
                self.species, self.composition
            ),
            format!("attainable {}: {}", self.composition, self.range),
            CAUTION.into(),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        vec![
            Column::plain("species"),
            Column::plain("measured"),
            Column::with_unit("value", "1"),
            Column::with_unit("T_spin", "K"),
        ]
    }
    fn rows(&self) -> Vec<Vec<String>> {
        vec![vec![
            self.species.clone(),
            self.composition.clone(),
            self.measured.clone(),
            self.t_spin.clone(),
        ]]
    }
}

/// One temperature of `zsum spin SPECIES --T ...`.
#[derive(Debug, Clone, Serialize)]
pub struct RelaxationRow {
    /// T in kelvin.
    #[serde(rename = "T")]
    pub t: String,
    /// Each isomer's equilibrium fraction, in the species' order.
    pub fractions: Vec<(String, String)>,
    /// Heat released per mole, J/mol.
    pub heat_per_mole: String,
    /// Heat released per kilogram, kJ/kg.
    pub heat_per_kg: String,
}

/// `zsum spin SPECIES --T ... --from STATE`.
#[derive(Debug, Clone, Serialize)]
pub struct RelaxationTable {
    /// The species.
    pub species: String,
    /// The frozen composition that relaxes (`normal`, `ortho`, ...).
    pub from: String,
    /// One row per temperature.
    pub rows: Vec<RelaxationRow>,
}

impl RelaxationTable {
    /// The table of `points` for `species` relaxing from `from`, each value
    /// to `digits`.
    pub fn new(species: &str, from: &str, points: &[RelaxationPoint], digits: u32) -> Self {
        RelaxationTable {
            species: species.into(),
            from: from.into(),
            rows: points
                .iter()
                .map(|p| RelaxationRow {
                    t: exact_decimal(&p.t, 30),
                    fractions: p
                        .fractions
                        .iter()
                        .map(|(n, x)| (n.clone(), digits_text(x, digits)))
                        .collect(),
                    heat_per_mole: digits_text(&p.per_mole, digits),
                    heat_per_kg: digits_text(&p.per_kg, digits),
                })
                .collect(),
        }
    }
}

impl Tabular for RelaxationTable {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{}: equilibrium isomer fractions and the heat released when the {} \
                 composition, frozen, relaxes to equilibrium at T (internal enthalpies from \
                 the common lowest level)",
                self.species, self.from
            ),
            CAUTION.into(),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        let mut c = vec![Column::with_unit("T", "K")];
        if let Some(r) = self.rows.first() {
            for (n, _) in &r.fractions {
                c.push(Column::with_unit(&format!("x_eq {n}"), "1"));
            }
        }
        c.push(Column::with_unit("heat released", "J/mol"));
        c.push(Column::with_unit("heat released", "kJ/kg"));
        c
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                std::iter::once(r.t.clone())
                    .chain(r.fractions.iter().map(|(_, x)| x.clone()))
                    .chain([r.heat_per_mole.clone(), r.heat_per_kg.clone()])
                    .collect()
            })
            .collect()
    }
}
