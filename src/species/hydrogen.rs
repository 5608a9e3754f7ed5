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
//! The chosen state's S, Cp and H − H0 are those of [`super::molar()`]: H0 is
//! the lowest level for the equilibrium mixture and each isomer's own lowest
//! level for a frozen composition (normal, ortho, para, a fraction).

use super::molar::{
    degeneracy, div, isomer_parts, molar_with, prec, Basis, Degeneracy, Isomer, MolarOptions,
    MolarValues, Spectra,
};
use super::Species;
use crate::error::{Error, Result};
use crate::sum::{rational_ball, Certified};
use crate::units::constants;
use num_rational::BigRational;
use num_traits::ToPrimitive;

/// One temperature of the spin-isomer table, each value a [`Certified`]
/// number computed for the grid's digits.
#[derive(Debug, Clone)]
pub struct HydrogenPoint {
    /// T in kelvin, exact.
    pub t: BigRational,
    /// The chosen isomer state's standard molar functions per mole (its
    /// isomer, ortho fraction, Cp, S, H − H0 and reference).
    pub state: MolarValues,
    /// The equilibrium ortho fraction at T.
    pub equilibrium_ortho_fraction: Certified,
    /// Heat released per mole converting normal to equilibrium at T, J/mol.
    pub conversion_heat: Certified,
    /// The same per kilogram, kJ/kg.
    pub conversion_heat_per_kg: Certified,
    /// The isomer that holds the lowest level ([`Isomer::Para`] for H2,
    /// [`Isomer::Ortho`] for D2); the other is the upper isomer.
    pub ground_isomer: Isomer,
    /// Heat released converting one mole of the upper isomer into the
    /// ground isomer at T, J/mol.
    pub heat_to_ground_isomer: Certified,
    /// Cp of normal hydrogen, J/(mol K).
    pub cp_normal: Certified,
    /// Cp of the equilibrium mixture, J/(mol K).
    pub cp_equilibrium: Certified,
    /// Cp of pure para, J/(mol K).
    pub cp_para: Certified,
}

impl HydrogenPoint {
    /// The gas's closeness to quantum degeneracy (the chosen state's S, Cp
    /// and H use Sackur–Tetrode translation); the conversion heats are
    /// internal only and do not depend on it.
    pub fn degeneracy(&self) -> &Degeneracy {
        &self.state.degeneracy
    }
}

/// The spin isomers of one species over a temperature grid.
#[derive(Debug, Clone)]
pub struct HydrogenGrid {
    /// The species' name.
    pub species: String,
    /// p in Pa, exact.
    pub pressure: BigRational,
    /// The isomer state whose Cp, S and H are given.
    pub isomer: Isomer,
    /// The isomer that holds the lowest level.
    pub ground_isomer: Isomer,
    /// The significant digits every value was computed for.
    pub digits: u32,
    /// One point per temperature, in grid order.
    pub rows: Vec<HydrogenPoint>,
}

impl HydrogenGrid {
    /// The table for `sp` (H2, D2, ...) over `grid` (K) for the chosen
    /// `isomer` state; values per mole whatever `o.basis` says.
    ///
    /// ```
    /// use zsum::species::{Database, MolarOptions, Isomer};
    /// use zsum::species::hydrogen::HydrogenGrid;
    /// use zsum::exact::parse_rational;
    /// let db = Database::builtin()?;
    /// let t = HydrogenGrid::compute(db.find("H2")?, &[parse_rational("20.28")?],
    ///                               &Isomer::Normal, &MolarOptions::default())?;
    /// // About 1.06 kJ/mol is released converting normal to equilibrium H2 at
    /// // its boiling point (Woolley, Scott and Brickwedde 1948, from memory).
    /// let q = t.rows[0].conversion_heat.to_f64();
    /// assert!((q - 1060.0).abs() < 15.0);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn compute(
        sp: &Species,
        grid: &[BigRational],
        isomer: &Isomer,
        o: &MolarOptions,
    ) -> Result<Self> {
        Self::compute_metered(sp, grid, isomer, o, &crate::budget::Meter::unlimited())
    }

    /// As [`HydrogenGrid::compute`], the temperatures timed by `meter`
    /// (hottest, costliest, first), which refuses the rest once their
    /// projected time exceeds its budget.
    pub fn compute_metered(
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
        let digits = o.digits;
        let p = prec(digits);
        let r = rational_ball(&(constants::boltzmann() * constants::avogadro()), p);
        let kg = rational_ball(&sp.molar_mass(), p);
        // Refuse a degenerate temperature before any sum is done.
        for t in grid {
            degeneracy(sp, t, o)?;
        }
        let spectra = Spectra::new(sp, o.model)?;
        let cached = spectra.cached();
        // Hottest first, so one listing per spectrum serves the grid.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
        let mut slots: Vec<Option<HydrogenPoint>> = vec![None; grid.len()];
        let mut ground = Isomer::Para;
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
            let rt = r.mul(&rational_ball(t, p));
            let (Some(o_iso), Some(p_iso)) = (ip.get("ortho"), ip.get("para")) else {
                return Err(super::molar::no_isomers(sp));
            };
            let xn = ip.normal_fractions(p);
            let h_n = xn[0].mul(&o_iso.part.h).add(&xn[1].mul(&p_iso.part.h));
            let conv = h_n.sub(&ip.eq.h).mul(&rt);
            let per_kg = div(&conv, &kg).div_int(1000);
            // The upper isomer's lowest level lies above the common zero.
            let ortho_upper = o_iso.zero.c.is_sign_positive() && !o_iso.zero.c.is_zero();
            ground = if ortho_upper {
                Isomer::Para
            } else {
                Isomer::Ortho
            };
            let (upper, lower) = if ortho_upper {
                (&o_iso.part.h, &p_iso.part.h)
            } else {
                (&p_iso.part.h, &o_iso.part.h)
            };
            let to_ground = upper.sub(lower).mul(&rt);
            let equilibrium_ortho_fraction = eq.ortho_fraction.clone().ok_or_else(|| {
                Error::invalid(
                    "isomer",
                    &sp.name,
                    "only homonuclear molecules with nuclear spin have ortho and para forms",
                )
            })?;
            slots[gi] = Some(HydrogenPoint {
                t: t.clone(),
                equilibrium_ortho_fraction,
                conversion_heat: Certified(conv),
                conversion_heat_per_kg: Certified(per_kg),
                ground_isomer: ground.clone(),
                heat_to_ground_isomer: Certified(to_ground),
                cp_normal: normal.cp,
                cp_equilibrium: eq.cp,
                cp_para: para.cp,
                state: chosen,
            });
            meter.at(count as f64 + 1.0)?;
        }
        Ok(HydrogenGrid {
            species: sp.name.clone(),
            pressure: o.pressure.clone(),
            isomer: isomer.clone(),
            ground_isomer: ground,
            digits,
            rows: slots.into_iter().flatten().collect(),
        })
    }

    /// `(T, value)` series for plotting, as `f64`: 0 Cp normal, 1 Cp
    /// equilibrium, 2 Cp para, 3 equilibrium ortho fraction, 4 conversion
    /// heat (J/mol), 5 heat of converting the upper isomer to the ground
    /// isomer (J/mol); any other index gives the last.
    pub fn series(&self, which: usize) -> Vec<(f64, f64)> {
        self.rows
            .iter()
            .map(|r| {
                let v = match which {
                    0 => &r.cp_normal,
                    1 => &r.cp_equilibrium,
                    2 => &r.cp_para,
                    3 => &r.equilibrium_ortho_fraction,
                    4 => &r.conversion_heat,
                    _ => &r.heat_to_ground_isomer,
                };
                (r.t.to_f64().unwrap_or(f64::NAN), v.to_f64())
            })
            .collect()
    }
}
