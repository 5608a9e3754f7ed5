//! `zsum species show NAME` and `zsum species list` as printed: every
//! constant of a species with its unit and source, and one row per species.

use super::text::rational_text;
use crate::error::Result;
use crate::export::{units_block, Column, Tabular};
use crate::species::{Database, Kind, Quantity, Species, SpeciesConstant};
use serde::Serialize;

/// One constant of a species with its unit and source, as printed.
#[derive(Debug, Clone, Serialize)]
pub struct ConstantRow {
    /// What it is.
    pub quantity: String,
    /// Its value as given.
    pub value: String,
    /// Its unit.
    pub unit: String,
    /// Where it comes from.
    pub source: String,
}

impl ConstantRow {
    /// The row of one constant: the value as the file wrote it; for a
    /// nuclear spin, the weights of even and odd J in the source column.
    pub fn new(c: &SpeciesConstant) -> ConstantRow {
        let quantity = match &c.quantity {
            Quantity::Mass => "mass".to_string(),
            Quantity::NuclearSpin { .. } => "nuclear spin I (each nucleus)".to_string(),
            Quantity::BE => "B_e".to_string(),
            Quantity::AlphaE => "alpha_e".to_string(),
            Quantity::DE => "D_e".to_string(),
            Quantity::We => "we".to_string(),
            Quantity::WeXe => "wexe".to_string(),
            Quantity::TopConstant { name } => format!("rotational constant {name}"),
            Quantity::SymmetryNumber => "symmetry number".to_string(),
            Quantity::Mode { degeneracy } => format!("harmonic mode (g = {degeneracy})"),
            Quantity::ElectronicLevel { label, degeneracy } => format!(
                "electronic level {} (g = {degeneracy})",
                label.clone().unwrap_or_default()
            ),
        };
        let source = match (&c.quantity, &c.source) {
            (Quantity::NuclearSpin { weights, swapped }, _) => format!(
                "weights even J : odd J = {} : {}{}",
                weights.even(),
                weights.odd(),
                if *swapped {
                    " (the ground state swaps the parities)"
                } else {
                    ""
                }
            ),
            (_, source) => source.clone().unwrap_or_default(),
        };
        ConstantRow {
            quantity,
            value: c.written.clone(),
            unit: c.unit.clone(),
            source,
        }
    }
}

/// `zsum species show NAME`.
#[derive(Debug, Clone, Serialize)]
pub struct SpeciesCard {
    /// Name.
    pub name: String,
    /// Description.
    pub description: String,
    /// Atom or linear.
    pub kind: Kind,
    /// Every constant.
    pub constants: Vec<ConstantRow>,
}

impl SpeciesCard {
    /// The card of `sp`: every constant with its unit and source.
    ///
    /// ```
    /// use zsum::report::SpeciesCard;
    /// let db = zsum::species::Database::builtin()?;
    /// let card = SpeciesCard::new(db.find("N2")?)?;
    /// assert_eq!(card.constants[0].quantity, "mass");
    /// assert!(card.constants.iter().any(|c| c.source == "weights even J : odd J = 6 : 3"));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(sp: &Species) -> Result<SpeciesCard> {
        Ok(SpeciesCard {
            name: sp.name.clone(),
            description: sp.description.clone(),
            kind: sp.kind,
            constants: sp.constants()?.iter().map(ConstantRow::new).collect(),
        })
    }
}

impl Tabular for SpeciesCard {
    fn preamble(&self) -> Vec<String> {
        vec![format!("{}: {}", self.name, self.description)]
    }
    fn columns(&self) -> Vec<Column> {
        ["quantity", "value", "unit", "source"]
            .map(Column::plain)
            .to_vec()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.constants
            .iter()
            .map(|c| {
                vec![
                    c.quantity.clone(),
                    c.value.clone(),
                    c.unit.clone(),
                    c.source.clone(),
                ]
            })
            .collect()
    }
}

/// `zsum species list`.
#[derive(Debug, Clone, Serialize)]
pub struct SpeciesList {
    /// One row per species.
    pub species: Vec<SpeciesSummary>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

/// One row of `zsum species list`.
#[derive(Debug, Clone, Serialize)]
pub struct SpeciesSummary {
    /// Name.
    pub name: String,
    /// Atom or linear.
    pub kind: Kind,
    /// Mass in u (unified atomic mass units), exact as given or converted
    /// exactly, to 12 significant digits where longer.
    pub mass: String,
    /// Ortho/para statistics.
    pub spin_isomers: bool,
    /// Description.
    pub description: String,
}

impl SpeciesList {
    fn columns_for() -> Vec<Column> {
        vec![
            Column::plain("name"),
            Column::plain("kind"),
            Column::with_unit("mass", "u").key("mass"),
            Column::plain("ortho/para"),
            Column::plain("description"),
        ]
    }

    /// The list of every species in `db`, in its order.
    ///
    /// ```
    /// use zsum::report::SpeciesList;
    /// let list = SpeciesList::new(&zsum::species::Database::builtin()?);
    /// let ar = list.species.iter().find(|s| s.name == "Ar").unwrap();
    /// assert_eq!(ar.mass, "39.948");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(db: &Database) -> SpeciesList {
        SpeciesList {
            species: db
                .all()
                .iter()
                .map(|s| SpeciesSummary {
                    name: s.name.clone(),
                    kind: s.kind,
                    mass: rational_text(&s.mass_u(), 12),
                    spin_isomers: s.has_spin_isomers(),
                    description: s.description.clone(),
                })
                .collect(),
            units: units_block(&Self::columns_for()),
        }
    }
}

impl Tabular for SpeciesList {
    fn preamble(&self) -> Vec<String> {
        vec![format!(
            "{} species; `zsum species show NAME` gives every constant with its unit and source",
            self.species.len()
        )]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.species
            .iter()
            .map(|s| {
                vec![
                    s.name.clone(),
                    format!("{:?}", s.kind).to_lowercase(),
                    s.mass.clone(),
                    if s.spin_isomers { "yes" } else { "no" }.into(),
                    s.description.clone(),
                ]
            })
            .collect()
    }
}
