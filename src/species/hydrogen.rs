//! Spin isomers of hydrogen (and any homonuclear molecule with nuclear
//! spin): ortho fraction, heat capacities of each state, and the heat of
//! ortho–para conversion.
//!
//! With the common energy zero at the lowest level (para J = 0 for H2) and
//! the molar enthalpies H_o, H_p of the pure isomers:
//! - equilibrium ortho fraction `x_eq = q_o/(q_o + q_p)`, the isomers' sums
//!   with their nuclear-spin weights;
//! - heat of ortho → para conversion `H_o − H_p` per mole converted;
//! - heat released when normal hydrogen (frozen at the high-temperature
//!   fraction x_n, 3/4 for H2) converts to equilibrium at T:
//!   `x_n H_o + (1 − x_n) H_p − H_eq`, per mole and per kilogram.

use super::molar::{
    degeneracy, degeneracy_cells, degeneracy_note, degeneracy_warnings, isomer_parts, molar_with,
    prec, Degeneracy, Isomer, MolarOptions, Spectra, Units, FLAG_HEADER, N_LAMBDA3_HEADER,
};
use super::Species;
use crate::error::Result;
use crate::export::Tabular;
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
    /// H − H0 of the chosen state, J/mol.
    #[serde(rename = "H_minus_H0")]
    pub h: String,
    /// Heat released per mole converting normal to equilibrium at T, J/mol.
    pub conversion_heat: String,
    /// The same per kilogram, kJ/kg.
    pub conversion_heat_per_kg: String,
    /// Heat of converting one mole of ortho to para at T, J/mol.
    pub ortho_to_para_heat: String,
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
    /// Units.
    pub units: Units,
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
}

impl HydrogenTable {
    /// Builds the table for `sp` (H2, D2, ...) over `grid` (K) for the
    /// chosen `isomer` state.
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
        for gi in order {
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
            let o2p = Float::with_val(p, &ip.ortho.h - &ip.para.h) * &rt;
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
                conversion_heat: show(&conv),
                conversion_heat_per_kg: show(&per_kg),
                ortho_to_para_heat: show(&o2p),
                raw: [
                    f(&chosen.t),
                    f(&normal.cp),
                    f(&eq.cp),
                    f(&para.cp),
                    f(eq.ortho_fraction.as_deref().unwrap_or("")),
                    conv.to_f64(),
                    o2p.to_f64(),
                ],
                cp_normal: normal.cp,
                cp_equilibrium: eq.cp,
                cp_para: para.cp,
                degeneracy: chosen.degeneracy,
                units: chosen.units,
            });
        }
        rows.extend(slots.into_iter().flatten());
        Ok(HydrogenTable {
            rows,
            species: sp.name.clone(),
            pressure: crate::exact::exact_decimal(&o.pressure, 30),
        })
    }

    /// `(T, value)` series: 0 Cp normal, 1 Cp equilibrium, 2 Cp para,
    /// 3 equilibrium ortho fraction, 4 conversion heat (J/mol), 5 ortho →
    /// para heat (J/mol).
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

impl Tabular for HydrogenTable {
    fn preamble(&self) -> Vec<String> {
        let mut lines = vec![
            format!(
                "{}: spin isomers from exact rovibrational sums; conversion heat = heat \
                 released per mole when normal converts to equilibrium at T",
                self.species
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

    fn columns(&self) -> Vec<String> {
        [
            "T (K)",
            "isomer",
            "ortho fraction",
            "eq. ortho fraction",
            "Cp (J/(mol K))",
            "S (J/(mol K))",
            "H-H0 (J/mol)",
            "conversion heat (J/mol)",
            "(kJ/kg)",
            "ortho->para heat (J/mol)",
            N_LAMBDA3_HEADER,
            FLAG_HEADER,
        ]
        .map(String::from)
        .to_vec()
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
                    r.ortho_to_para_heat.clone(),
                ]
                .into_iter()
                .chain(degeneracy_cells(&r.degeneracy))
                .collect()
            })
            .collect()
    }
}
