//! Spin isomers of hydrogen (and any homonuclear molecule with nuclear
//! spin): ortho fraction, heat capacities of each state, and the heat of
//! ortho–para conversion.
//!
//! With the common energy zero at the lowest level (para J = 0 for H2,
//! ortho J = 0 for D2) and the molar enthalpies H_o, H_p of the pure
//! isomers:
//! - equilibrium ortho fraction `x_eq = q_o/(q_o + q_p)`, the isomers' sums
//!   with their nuclear-spin weights;
//! - heat released converting one mole of the upper isomer (the one whose
//!   lowest level lies above the common zero: ortho for H2, para for D2)
//!   into the ground isomer, `H_upper − H_ground`: positive wherever the
//!   gas is cold;
//! - heat released when normal hydrogen (frozen at the high-temperature
//!   fraction x_n, 3/4 for H2) converts to equilibrium at T:
//!   `x_n H_o + (1 − x_n) H_p − H_eq`, per mole and per kilogram.
//!
//! The chosen state's S, Cp and H − H0 are those of [`super::molar`]: H0 is
//! the lowest level for the equilibrium mixture and each isomer's own lowest
//! level for a frozen composition (normal, ortho, para, a fraction).

use super::molar::{
    degeneracy, degeneracy_cells, degeneracy_columns, degeneracy_note, degeneracy_warnings,
    isomer_parts, molar_with, prec, Basis, Degeneracy, Isomer, MolarOptions, Spectra,
};
use super::Species;
use crate::error::Result;
use crate::export::{units_block, Column, Tabular};
use crate::sum::float_to_decimal;
use crate::units::constants;
use num_rational::BigRational;
use rug::Float;
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
    #[serde(skip)]
    pub(crate) raw: [f64; 7],
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
    /// Builds the table for `sp` (H2, D2, ...) over `grid` (K) for the
    /// chosen `isomer` state; values per mole whatever `o.basis` says.
    ///
    /// ```
    /// use zsum::species::{Database, MolarOptions, Isomer};
    /// use zsum::species::hydrogen::HydrogenTable;
    /// use zsum::exact::parse_rational;
    /// let db = Database::builtin()?;
    /// let t = HydrogenTable::build(db.find("H2")?, &[parse_rational("20.28")?],
    ///                              &Isomer::Normal, &MolarOptions::default())?;
    /// // About 1.06 kJ/mol is released converting normal to equilibrium H2 at
    /// // its boiling point (Woolley, Scott and Brickwedde 1948, from memory).
    /// let q: f64 = t.rows[0].conversion_heat.parse().unwrap();
    /// assert!((q - 1060.0).abs() < 15.0);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        sp: &Species,
        grid: &[BigRational],
        isomer: &Isomer,
        o: &MolarOptions,
    ) -> Result<Self> {
        Self::build_metered(sp, grid, isomer, o, &crate::budget::Meter::unlimited())
    }

    /// As [`HydrogenTable::build`], the temperatures timed by `meter`
    /// (hottest, costliest, first), which refuses the rest once their
    /// projected time exceeds its budget.
    pub fn build_metered(
        sp: &Species,
        grid: &[BigRational],
        isomer: &Isomer,
        o: &MolarOptions,
        meter: &crate::budget::Meter,
    ) -> Result<Self> {
        let o = &MolarOptions {
            basis: Basis::Mole,
            ..o.clone()
        };
        let mut rows = Vec::with_capacity(grid.len());
        let digits = o.digits;
        let p = prec(digits);
        let r = super::molar::fl(p, &(constants::boltzmann() * constants::avogadro()));
        let kg = super::molar::fl(p, &sp.molar_mass());
        // Refuse a degenerate temperature before any sum is done.
        for t in grid {
            degeneracy(sp, t, o)?;
        }
        let spectra = Spectra::new(sp, o.model)?;
        let cached = spectra.cached();
        // Hottest first, so one listing per spectrum serves the grid.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
        let mut slots: Vec<Option<HydrogenRow>> = vec![None; grid.len()];
        let mut ground = "para";
        for (count, gi) in order.into_iter().enumerate() {
            let t = &grid[gi];
            let at = |iso: Isomer| {
                let mut oo = o.clone();
                oo.isomer = Some(iso);
                molar_with(sp, &cached, t, &oo)
            };
            let normal = at(Isomer::Normal)?;
            let eq = at(Isomer::Equilibrium)?;
            let para = at(Isomer::Para)?;
            // The chosen state is usually one of the three curves: reuse it.
            let chosen = match isomer {
                Isomer::Normal => normal.clone(),
                Isomer::Equilibrium => eq.clone(),
                Isomer::Para => para.clone(),
                other => at(other.clone())?,
            };
            let ip = isomer_parts(sp, &cached, t, digits)?;
            let rt = Float::with_val(p, &r * super::molar::fl(p, t));
            let (wo, wp) = (ip.w_ortho, ip.w_para);
            let xn = Float::with_val(p, wo) / Float::with_val(p, wo + wp);
            let h_n = Float::with_val(p, &xn * &ip.ortho.h)
                + Float::with_val(p, Float::with_val(p, 1u32 - &xn) * &ip.para.h);
            let conv = Float::with_val(p, &h_n - &ip.eq.h) * &rt;
            let per_kg = Float::with_val(p, &conv / &kg) / 1000u32;
            // The upper isomer's lowest level lies above the common zero.
            let ortho_upper = ip.ortho_zero.is_sign_positive() && !ip.ortho_zero.is_zero();
            ground = if ortho_upper { "para" } else { "ortho" };
            let (upper, lower) = if ortho_upper {
                (&ip.ortho.h, &ip.para.h)
            } else {
                (&ip.para.h, &ip.ortho.h)
            };
            let to_ground = Float::with_val(p, upper - lower) * &rt;
            let show = |v: &Float| float_to_decimal(v, 0.0, 0.0, digits).0;
            let f = |s: &str| s.parse::<f64>().unwrap_or(f64::NAN);
            slots[gi] = Some(HydrogenRow {
                t: chosen.t.clone(),
                isomer: isomer.name(),
                ortho_fraction: chosen.ortho_fraction.clone().unwrap_or_default(),
                equilibrium_ortho_fraction: eq.ortho_fraction.clone().unwrap_or_default(),
                cp: chosen.cp.clone(),
                s: chosen.s.clone(),
                h: chosen.h.clone(),
                reference: chosen.reference.clone(),
                conversion_heat: show(&conv),
                conversion_heat_per_kg: show(&per_kg),
                ground_isomer: ground.into(),
                heat_to_ground_isomer: show(&to_ground),
                raw: [
                    f(&chosen.t),
                    f(&normal.cp),
                    f(&eq.cp),
                    f(&para.cp),
                    f(eq.ortho_fraction.as_deref().unwrap_or("")),
                    conv.to_f64(),
                    to_ground.to_f64(),
                ],
                cp_normal: normal.cp,
                cp_equilibrium: eq.cp,
                cp_para: para.cp,
                degeneracy: chosen.degeneracy,
                units: units_block(&Self::columns_for(ground)),
            });
            meter.at(count as f64 + 1.0)?;
        }
        rows.extend(slots.into_iter().flatten());
        Ok(HydrogenTable {
            rows,
            species: sp.name.clone(),
            pressure: crate::exact::exact_decimal(&o.pressure, 30),
            ground_isomer: ground.into(),
        })
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

    /// `(T, value)` series: 0 Cp normal, 1 Cp equilibrium, 2 Cp para,
    /// 3 equilibrium ortho fraction, 4 conversion heat (J/mol), 5 heat of
    /// converting the upper isomer to the ground isomer (J/mol).
    pub fn series(&self, which: usize) -> Vec<(f64, f64)> {
        self.rows
            .iter()
            .map(|r| (r.raw[0], r.raw[(which + 1).min(6)]))
            .collect()
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
