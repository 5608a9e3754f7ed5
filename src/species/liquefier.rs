//! The invented scenario behind `zsum report`, as numbers: the small
//! hydrogen liquefier of the fictional Harrow Fen cryogenics laboratory
//! makes 10 L of liquid hydrogen an hour. Freshly liquefied hydrogen keeps
//! the ortho fraction of the warm gas (normal, 3/4) unless a catalyst
//! converts it; the conversion to the equilibrium mixture at the normal
//! boiling point then releases heat inside the storage dewar. Every
//! hydrogen and species value comes from the exact sums; the page that
//! shows them is written by the report layer.

use super::hydrogen::HydrogenGrid;
use super::{molar_grids, Database, Isomer, MolarGrid, MolarOptions};
use crate::error::Result;
use crate::thermo::parse_grid;
use num_rational::BigRational;

/// Liquid hydrogen production of the fictional liquefier, L/h.
pub const LITRES_PER_HOUR: f64 = 10.0;
/// Density of liquid para-rich hydrogen at the normal boiling point, kg/m³
/// (common practice, from memory).
pub const LIQUID_DENSITY: f64 = 70.8;
/// Latent heat of vaporisation of hydrogen at the normal boiling point,
/// about 0.9 kJ/mol (common practice, from memory).
pub const LATENT_HEAT_J_PER_MOL: f64 = 900.0;
/// The normal boiling point of normal hydrogen at 1 atm, K (common
/// practice, from memory).
pub const BOILING_POINT_K: f64 = 20.28;
/// The significant digits of every value of the scenario.
pub const DIGITS: u32 = 8;
/// The temperature range of the hydrogen curves, K.
pub const FIGURE_T: (f64, f64) = (10.0, 400.0);
/// How many temperatures of that range the curves take, evenly spaced in
/// log T.
pub const FIGURE_POINTS: usize = 61;
/// The hydrogen table's temperature grid, K: 10 K to 400 K in 5 K steps.
pub const TABLE_GRID: &str = "10:400:5";
/// The temperature of the species table, K.
pub const SPECIES_T: &str = "298.15";

/// The options of every computation of the scenario: ideal gas at 1 bar,
/// the vibrating rotor, [`DIGITS`] digits, per mole.
pub fn options() -> MolarOptions {
    MolarOptions {
        digits: DIGITS,
        ..MolarOptions::default()
    }
}

/// The normal boiling point, exactly.
pub fn boiling_point() -> BigRational {
    BigRational::new(2028.into(), 100.into())
}

/// Normal H2 at [`FIGURE_POINTS`] temperatures evenly spaced in log T over
/// [`FIGURE_T`]: the curves of the report's figures.
pub fn curves() -> Result<HydrogenGrid> {
    let db = Database::builtin()?;
    let (low, high) = FIGURE_T;
    let grid = parse_grid("--T", &format!("log:{low}:{high}:{FIGURE_POINTS}"))?;
    HydrogenGrid::compute(db.find("H2")?, &grid, &Isomer::Normal, &options())
}

/// The scenario's numbers.
#[derive(Debug, Clone)]
pub struct Liquefier {
    /// Normal H2 over [`TABLE_GRID`].
    pub hydrogen: HydrogenGrid,
    /// Normal H2 at the normal boiling point (one row).
    pub at_boiling_point: HydrogenGrid,
    /// Every built-in species at [`SPECIES_T`] and 1 bar, in database order.
    pub species: Vec<MolarGrid>,
    /// Liquid produced, kg/h: [`LITRES_PER_HOUR`] at [`LIQUID_DENSITY`].
    pub kg_per_hour: f64,
    /// The equilibrium para fraction at the boiling point.
    pub equilibrium_para_fraction: f64,
    /// Heat released converting normal to equilibrium hydrogen at the
    /// boiling point, J/mol.
    pub conversion_heat: f64,
    /// The same, kJ/kg.
    pub conversion_heat_per_kg: f64,
    /// The conversion heat over [`LATENT_HEAT_J_PER_MOL`].
    pub latent_heat_ratio: f64,
    /// The continuous heat load if the whole product were left
    /// unconverted, W.
    pub load_w: f64,
}

impl Liquefier {
    /// Computes the scenario (the species on all cores).
    ///
    /// ```
    /// let l = zsum::species::liquefier::Liquefier::compute()?;
    /// // About 1.06 kJ/mol, 525 kJ/kg (Woolley, Scott and Brickwedde 1948,
    /// // from memory), more than the latent heat of about 0.9 kJ/mol.
    /// assert!((l.conversion_heat - 1060.0).abs() < 15.0);
    /// assert!(l.latent_heat_ratio > 1.0);
    /// // 0.708 kg/h × 525 kJ/kg / 3600 s/h ≈ 103 W.
    /// assert!((l.load_w - 103.0).abs() < 3.0);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn compute() -> Result<Liquefier> {
        let db = Database::builtin()?;
        let h2 = db.find("H2")?;
        let o = options();
        let hydrogen =
            HydrogenGrid::compute(h2, &parse_grid("--T", TABLE_GRID)?, &Isomer::Normal, &o)?;
        let at_boiling_point = HydrogenGrid::compute(h2, &[boiling_point()], &Isomer::Normal, &o)?;
        let all: Vec<_> = db.all().iter().collect();
        let species = molar_grids(&all, &parse_grid("--T", SPECIES_T)?, &o)?;
        let (para, q_mol, q_kg) = match at_boiling_point.rows.first() {
            Some(r) => (
                1.0 - r.equilibrium_ortho_fraction.to_f64(),
                r.conversion_heat.to_f64(),
                r.conversion_heat_per_kg.to_f64(),
            ),
            None => (f64::NAN, f64::NAN, f64::NAN),
        };
        let kg_per_hour = LITRES_PER_HOUR * 1e-3 * LIQUID_DENSITY;
        Ok(Liquefier {
            hydrogen,
            at_boiling_point,
            species,
            kg_per_hour,
            equilibrium_para_fraction: para,
            conversion_heat: q_mol,
            conversion_heat_per_kg: q_kg,
            latent_heat_ratio: q_mol / LATENT_HEAT_J_PER_MOL,
            load_w: kg_per_hour * q_kg * 1000.0 / 3600.0,
        })
    }
}
