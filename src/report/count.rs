//! The answer to `count`: the exact number of a box's states up to an
//! energy, beside Weyl's law.

use crate::error::Result;
use crate::exact::rational_string;
use crate::export::{units_block, Column, Tabular};
use crate::models::particle_box::ParticleInBox;
use crate::spectrum::{Budget, Spectrum};
use num_rational::BigRational;
use num_traits::ToPrimitive;
use serde::Serialize;

/// The answer to "how many states lie up to this energy?" for a box.
#[derive(Debug, Clone, Serialize)]
pub struct CountReport {
    /// Model identifier (`box`).
    pub model: String,
    /// Human description.
    pub description: String,
    /// Number of dimensions.
    pub dims: usize,
    /// Side ratios.
    pub sides: Vec<String>,
    /// Unit of `up_to`.
    pub unit: String,
    /// The cutoff, exact.
    pub up_to: String,
    /// The exact number of states with energy ≤ `up_to`.
    pub states: String,
    /// Weyl's law with the Dirichlet boundary correction at the cutoff.
    pub weyl_estimate: String,
    /// (Weyl estimate − exact)/exact.
    pub weyl_relative_gap: String,
    /// The unit of `up_to`, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl CountReport {
    fn columns_for(unit: &str) -> Vec<Column> {
        vec![
            Column::with_unit("E up to", unit).key("up_to"),
            Column::plain("states"),
            Column::plain("Weyl estimate"),
            Column::plain("Weyl relative gap"),
        ]
    }
}

impl CountReport {
    /// Counts the states of `model` up to `cutoff` exactly (refusing counts
    /// estimated beyond `budget`'s time) and compares the count with Weyl's
    /// law.
    pub fn for_box(model: &ParticleInBox, cutoff: &BigRational, budget: &Budget) -> Result<Self> {
        let n = model.count_up_to_within(cutoff, budget)?;
        let nf = n.to_f64().unwrap_or(f64::INFINITY);
        let weyl = model.weyl_estimate(cutoff.to_f64().unwrap_or(f64::INFINITY));
        let gap = if nf > 0.0 {
            format!("{:.3e}", (weyl - nf) / nf)
        } else {
            "undefined (no states)".into()
        };
        let unit = model.unit().symbol().to_string();
        Ok(CountReport {
            units: units_block(&Self::columns_for(&unit)),
            model: "box".into(),
            description: model.describe(),
            dims: model.dims(),
            sides: model.sides().iter().map(rational_string).collect(),
            unit,
            up_to: rational_string(cutoff),
            states: n.to_string(),
            weyl_estimate: format!("{weyl:.9e}"),
            weyl_relative_gap: gap,
        })
    }
}

impl Tabular for CountReport {
    fn preamble(&self) -> Vec<String> {
        vec![format!(
            "{}; states with E <= {} (E in units of {})",
            self.description, self.up_to, self.unit
        )]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        vec![vec![
            self.up_to.clone(),
            self.states.clone(),
            self.weyl_estimate.clone(),
            self.weyl_relative_gap.clone(),
        ]]
    }
}
