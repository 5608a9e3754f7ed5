//! `zsum hydrogen` as printed: one row per temperature with the chosen
//! isomer state's functions, the equilibrium ortho fraction, the heats of
//! conversion and the three Cp curves, each written to the digits it was
//! computed for.

use super::molar::{
    degeneracy_cells, degeneracy_columns, degeneracy_note, degeneracy_warnings, digits_text,
    isomer_name, reference_text,
};
use crate::exact::exact_decimal;
use crate::export::{units_block, Column, Tabular};
use crate::species::hydrogen::{HydrogenGrid, HydrogenPoint};
use crate::species::Degeneracy;
use serde::Serialize;

/// One temperature of `zsum hydrogen`.
#[derive(Debug, Clone, Serialize)]
pub struct HydrogenRow {
    /// T in kelvin.
    #[serde(rename = "T")]
    pub t: String,
    /// The isomer state whose Cp, S, H are given.
    pub isomer: String,
    /// Its ortho fraction.
    pub ortho_fraction: String,
    /// The equilibrium ortho fraction at T.
    pub equilibrium_ortho_fraction: String,
    /// Cp of the chosen state, J/(mol K).
    #[serde(rename = "Cp")]
    pub cp: String,
    /// Conventional S of the chosen state, J/(mol K).
    #[serde(rename = "S")]
    pub s: String,
    /// H − H0 of the chosen state, J/mol, with H0 as `reference` says.
    #[serde(rename = "H_minus_H0")]
    pub h: String,
    /// What H0 is for the chosen state.
    pub reference: String,
    /// Heat released per mole converting normal to equilibrium at T, J/mol.
    pub conversion_heat: String,
    /// The same per kilogram, kJ/kg.
    pub conversion_heat_per_kg: String,
    /// The isomer that holds the lowest level (`para` for H2, `ortho` for
    /// D2); the other is the upper isomer.
    pub ground_isomer: String,
    /// Heat released converting one mole of the upper isomer into the
    /// ground isomer at T, J/mol.
    pub heat_to_ground_isomer: String,
    /// Cp of normal, equilibrium and para, J/(mol K) (the curves of the report).
    #[serde(rename = "Cp_normal")]
    pub cp_normal: String,
    /// Cp of the equilibrium mixture.
    #[serde(rename = "Cp_equilibrium")]
    pub cp_equilibrium: String,
    /// Cp of pure para.
    #[serde(rename = "Cp_para")]
    pub cp_para: String,
    /// The gas's closeness to quantum degeneracy (the chosen state's S, Cp
    /// and H use Sackur–Tetrode translation); the conversion heats are
    /// internal only and do not depend on it.
    #[serde(flatten)]
    pub degeneracy: Degeneracy,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl HydrogenRow {
    /// The row of one point, every value to `digits` significant digits.
    pub fn new(r: &HydrogenPoint, digits: u32) -> HydrogenRow {
        let show = |c| digits_text(c, digits);
        let ground = isomer_name(&r.ground_isomer);
        let state = &r.state;
        HydrogenRow {
            t: exact_decimal(&r.t, 30),
            isomer: state.isomer.as_ref().map(isomer_name).unwrap_or_default(),
            ortho_fraction: state.ortho_fraction.as_ref().map(show).unwrap_or_default(),
            equilibrium_ortho_fraction: show(&r.equilibrium_ortho_fraction),
            cp: show(&state.cp),
            s: show(&state.s),
            h: show(&state.h_minus_h0),
            reference: reference_text(state.reference).into(),
            conversion_heat: show(&r.conversion_heat),
            conversion_heat_per_kg: show(&r.conversion_heat_per_kg),
            heat_to_ground_isomer: show(&r.heat_to_ground_isomer),
            cp_normal: show(&r.cp_normal),
            cp_equilibrium: show(&r.cp_equilibrium),
            cp_para: show(&r.cp_para),
            degeneracy: state.degeneracy.clone(),
            units: units_block(&HydrogenTable::columns_for(&ground)),
            ground_isomer: ground,
        }
    }
}

/// `zsum hydrogen` over a grid.
#[derive(Debug, Clone, Serialize)]
#[serde(transparent)]
pub struct HydrogenTable {
    /// One row per temperature.
    pub rows: Vec<HydrogenRow>,
    #[serde(skip)]
    species: String,
    #[serde(skip)]
    pressure: String,
    #[serde(skip)]
    ground_isomer: String,
}

impl HydrogenTable {
    /// The table of `grid`, every value to the digits it was computed for.
    ///
    /// ```
    /// use zsum::species::{Database, MolarOptions, Isomer};
    /// use zsum::species::hydrogen::HydrogenGrid;
    /// use zsum::report::HydrogenTable;
    /// use zsum::exact::parse_rational;
    /// let db = Database::builtin()?;
    /// let grid = HydrogenGrid::compute(db.find("H2")?, &[parse_rational("20.28")?],
    ///                                  &Isomer::Normal, &MolarOptions::default())?;
    /// let table = HydrogenTable::new(&grid);
    /// // Normal hydrogen is frozen at 3/4 ortho; H2's lowest level is para.
    /// assert_eq!(table.rows[0].ortho_fraction, "0.7500000000");
    /// assert_eq!(table.rows[0].ground_isomer, "para");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(grid: &HydrogenGrid) -> HydrogenTable {
        HydrogenTable {
            rows: grid
                .rows
                .iter()
                .map(|r| HydrogenRow::new(r, grid.digits))
                .collect(),
            species: grid.species.clone(),
            pressure: exact_decimal(&grid.pressure, 30),
            ground_isomer: isomer_name(&grid.ground_isomer),
        }
    }

    /// The columns, with the conversion to the `ground` isomer named by its
    /// direction; the same list names every JSON row's `units`.
    fn columns_for(ground: &str) -> Vec<Column> {
        let upper = if ground == "para" { "ortho" } else { "para" };
        let mut c = vec![
            Column::with_unit("T", "K").key("T"),
            Column::plain("isomer"),
            Column::plain("ortho fraction"),
            Column::plain("eq. ortho fraction"),
            Column::with_unit("Cp", "J/(mol K)").key("Cp"),
            Column::with_unit("S", "J/(mol K)").key("S"),
            Column::with_unit("H-H0", "J/mol").key("H_minus_H0"),
            Column::with_unit("normal->eq. heat", "J/mol").key("conversion_heat"),
            Column::with_unit("normal->eq. heat", "kJ/kg").key("conversion_heat_per_kg"),
            Column::with_unit(&format!("{upper}->{ground} heat"), "J/mol")
                .key("heat_to_ground_isomer"),
            Column::with_unit("Cp normal", "J/(mol K)").key("Cp_normal"),
            Column::with_unit("Cp equilibrium", "J/(mol K)").key("Cp_equilibrium"),
            Column::with_unit("Cp para", "J/(mol K)").key("Cp_para"),
        ];
        c.extend(degeneracy_columns());
        c
    }

    /// Warning lines for the rows whose classical translation (in S, Cp
    /// and H) is flagged.
    pub fn warnings(&self) -> Vec<String> {
        degeneracy_warnings(self.rows.iter().map(|r| {
            (
                self.species.as_str(),
                r.t.as_str(),
                self.pressure.as_str(),
                &r.degeneracy,
            )
        }))
    }
}

impl HydrogenTable {
    /// The name of the upper-to-ground conversion, e.g. `ortho->para heat`.
    fn to_ground_name(&self) -> String {
        Self::columns_for(&self.ground_isomer)[9].name.clone()
    }
}

impl Tabular for HydrogenTable {
    fn preamble(&self) -> Vec<String> {
        let mut lines = vec![
            format!(
                "{}: spin isomers from exact rovibrational sums; normal->eq. heat = heat \
                 released per mole when normal converts to equilibrium at T; {} = heat \
                 released per mole of {} converted to {} (the isomer holding the lowest level)",
                self.species,
                self.to_ground_name(),
                if self.ground_isomer == "para" {
                    "ortho"
                } else {
                    "para"
                },
                self.ground_isomer,
            ),
            format!(
                "Cp, S and H-H0 of the {} state, per mole; {}",
                self.rows.first().map(|r| r.isomer.as_str()).unwrap_or(""),
                self.rows
                    .first()
                    .map(|r| r.reference.as_str())
                    .unwrap_or("")
            ),
            format!(
                "ideal gas at p = {} Pa; S, Cp and H-H0 with Sackur–Tetrode translation; the \
                 conversion heats are internal and do not depend on it",
                self.pressure
            ),
            degeneracy_note(
                self.rows
                    .first()
                    .map(|r| r.degeneracy.quantum_tolerance)
                    .unwrap_or(0.0),
            ),
            "ideal-gas model values: design decisions follow certified property data, local \
             codes and licensed engineering practice"
                .into(),
        ];
        lines.extend(self.warnings().into_iter().map(|w| format!("warning: {w}")));
        lines
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.ground_isomer)
    }

    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.t.clone(),
                    r.isomer.clone(),
                    r.ortho_fraction.clone(),
                    r.equilibrium_ortho_fraction.clone(),
                    r.cp.clone(),
                    r.s.clone(),
                    r.h.clone(),
                    r.conversion_heat.clone(),
                    r.conversion_heat_per_kg.clone(),
                    r.heat_to_ground_isomer.clone(),
                    r.cp_normal.clone(),
                    r.cp_equilibrium.clone(),
                    r.cp_para.clone(),
                ]
                .into_iter()
                .chain(degeneracy_cells(&r.degeneracy))
                .collect()
            })
            .collect()
    }
}
