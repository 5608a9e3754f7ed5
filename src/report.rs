//! Result structures: one per answer, the schema that JSON, CSV and the
//! aligned table all write. Built by the library, so a library user gets
//! exactly what the command line prints.

use crate::error::{Error, Result};
use crate::exact::{format_sig, rational_string};
use crate::export::Tabular;
use crate::models::particle_box::{Origin, ParticleInBox};
use crate::spectrum::{Budget, Spectrum, State};
use crate::units::{box_unit_joules, constants, EnergyUnit};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use serde::Serialize;

/// A physical scale for box energies: particle mass and reference side.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct BoxScale {
    /// Mass as the user wrote it, e.g. `4.0026u`.
    pub mass_text: String,
    /// Mass in kilograms, exact.
    pub mass_kg: BigRational,
    /// Reference side as the user wrote it, e.g. `10nm`.
    pub side_text: String,
    /// Reference side in metres, exact.
    pub side_m: BigRational,
    /// The unit physical energies are shown in.
    pub unit: EnergyUnit,
    /// Significant digits of physical energies.
    pub digits: u32,
}

impl BoxScale {
    /// The size of the box unit h²/(8 m L²) in `self.unit`, exactly.
    pub fn unit_value(&self) -> Result<BigRational> {
        let joules = box_unit_joules(&self.mass_kg, &self.side_m);
        EnergyUnit::Natural {
            symbol: "h^2/(8 m L^2)".into(),
            joules: Some(joules),
        }
        .factor_to(&self.unit)
    }
}

/// The physical scale as reported.
#[derive(Debug, Clone, Serialize)]
pub struct PhysicalScale {
    /// Particle mass as given.
    pub mass: String,
    /// Reference side as given.
    pub side: String,
    /// Unit of `energy_physical`.
    pub unit: String,
    /// Size of one box unit in that unit (rounded to the requested digits).
    pub box_unit: String,
    /// Source of the atomic mass constant used for masses in u.
    pub mass_constant: String,
}

/// One level as reported.
#[derive(Debug, Clone, Serialize)]
pub struct LevelRow {
    /// Exact energy in box units, e.g. `"27/4"`.
    pub energy: String,
    /// Energy in the physical unit, correctly rounded, when a scale is given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_physical: Option<String>,
    /// Number of states, as a decimal string.
    pub degeneracy: String,
    /// Number of distinct quantum-number families at this energy.
    pub families: u64,
    /// Where the degeneracy comes from.
    pub origin: Origin,
    /// The states, when asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub states: Option<Vec<State>>,
}

/// The answer to "which levels lie up to this energy?" for a box.
#[derive(Debug, Clone, Serialize)]
pub struct LevelsReport {
    /// Model identifier (`box`).
    pub model: String,
    /// Human description.
    pub description: String,
    /// Number of dimensions.
    pub dims: usize,
    /// Side ratios.
    pub sides: Vec<String>,
    /// Unit of `energy`.
    pub unit: String,
    /// Quantum-number names, in the order states list them.
    pub quantum_numbers: Vec<String>,
    /// The cutoff, exact.
    pub up_to: String,
    /// Physical scale, when given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub physical: Option<PhysicalScale>,
    /// The levels, lowest first.
    pub levels: Vec<LevelRow>,
    /// Number of levels.
    pub level_count: usize,
    /// Total number of states listed.
    pub total_states: String,
}

impl LevelsReport {
    /// Lists the levels of `model` up to `cutoff`, with their states if
    /// `with_states`, and physical energies if `scale` is given.
    ///
    /// ```
    /// use zsum::models::ParticleInBox;
    /// use zsum::report::LevelsReport;
    /// use zsum::spectrum::Budget;
    /// use zsum::exact::parse_rational;
    /// let cube = ParticleInBox::cube(3).unwrap();
    /// let r = LevelsReport::for_box(&cube, &parse_rational("6").unwrap(), true, None, &Budget::default()).unwrap();
    /// assert_eq!(r.levels[1].degeneracy, "3");
    /// assert_eq!(r.total_states, "4");
    /// ```
    pub fn for_box(
        model: &ParticleInBox,
        cutoff: &BigRational,
        with_states: bool,
        scale: Option<&BoxScale>,
        budget: &Budget,
    ) -> Result<Self> {
        let unit_value = scale.map(|s| s.unit_value()).transpose()?;
        let rows: Vec<(
            crate::models::particle_box::ClassifiedLevel,
            Option<Vec<State>>,
        )> = if with_states {
            model
                .levels_with_states(cutoff, budget)?
                .into_iter()
                .map(|(l, s)| (l, Some(s)))
                .collect()
        } else {
            model
                .classified_levels(cutoff, budget)?
                .into_iter()
                .map(|l| (l, None))
                .collect()
        };
        let mut total = BigUint::default();
        let levels = rows
            .into_iter()
            .map(|(l, states)| {
                total += &l.level.degeneracy;
                LevelRow {
                    energy: rational_string(&l.level.energy),
                    energy_physical: match (&unit_value, scale) {
                        (Some(v), Some(s)) => Some(format_sig(&(&l.level.energy * v), s.digits)),
                        _ => None,
                    },
                    degeneracy: l.level.degeneracy.to_string(),
                    families: l.families,
                    origin: l.origin(),
                    states,
                }
            })
            .collect::<Vec<_>>();
        let physical = match (scale, &unit_value) {
            (Some(s), Some(v)) => Some(PhysicalScale {
                mass: s.mass_text.clone(),
                side: s.side_text.clone(),
                unit: s.unit.symbol().to_string(),
                box_unit: format_sig(v, s.digits),
                mass_constant: format!(
                    "m_u = {} kg ({})",
                    format_sig(&constants::atomic_mass_constant(), 12),
                    constants::ATOMIC_MASS_SOURCE
                ),
            }),
            _ => None,
        };
        Ok(LevelsReport {
            model: "box".into(),
            description: model.describe(),
            dims: model.dims(),
            sides: model.sides().iter().map(rational_string).collect(),
            unit: model.unit().symbol().to_string(),
            quantum_numbers: model.quantum_numbers(),
            up_to: rational_string(cutoff),
            physical,
            level_count: levels.len(),
            levels,
            total_states: total.to_string(),
        })
    }
}

impl Tabular for LevelsReport {
    fn preamble(&self) -> Vec<String> {
        let mut p = vec![format!(
            "{}; energies E in units of {}; levels up to {}",
            self.description, self.unit, self.up_to
        )];
        if let Some(ph) = &self.physical {
            p.push(format!(
                "mass {}, reference side L = {}: 1 {} = {} {} ({})",
                ph.mass, ph.side, self.unit, ph.box_unit, ph.unit, ph.mass_constant
            ));
        }
        p.push(
            "origin: single = one state; symmetry = one family of permuted quantum numbers; \
             coincidence = several families share the energy"
                .into(),
        );
        p
    }

    fn columns(&self) -> Vec<String> {
        let mut c = vec!["E".to_string()];
        if let Some(ph) = &self.physical {
            c.push(format!("E [{}]", ph.unit));
        }
        c.extend(["degeneracy", "families", "origin"].map(String::from));
        if self.levels.first().is_some_and(|l| l.states.is_some()) {
            c.push(format!("states ({})", self.quantum_numbers.join(",")));
        }
        c
    }

    fn rows(&self) -> Vec<Vec<String>> {
        self.levels
            .iter()
            .map(|l| {
                let mut r = vec![l.energy.clone()];
                if let Some(e) = &l.energy_physical {
                    r.push(e.clone());
                }
                r.push(l.degeneracy.clone());
                r.push(l.families.to_string());
                r.push(l.origin.as_str().to_string());
                if let Some(states) = &l.states {
                    r.push(
                        states
                            .iter()
                            .map(|s| {
                                let v: Vec<String> = s.0.iter().map(|n| n.to_string()).collect();
                                format!("({})", v.join(","))
                            })
                            .collect::<Vec<_>>()
                            .join(" "),
                    );
                }
                r
            })
            .collect()
    }

    fn summary(&self) -> Vec<String> {
        vec![format!(
            "{} levels, {} states",
            self.level_count, self.total_states
        )]
    }
}

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
}

impl CountReport {
    /// Counts the states of `model` up to `cutoff` exactly and compares the
    /// count with Weyl's law.
    pub fn for_box(model: &ParticleInBox, cutoff: &BigRational) -> Result<Self> {
        let n = model.count_up_to(cutoff)?;
        let nf = n.to_f64().unwrap_or(f64::INFINITY);
        let weyl = model.weyl_estimate(cutoff.to_f64().unwrap_or(f64::INFINITY));
        let gap = if nf > 0.0 {
            format!("{:.3e}", (weyl - nf) / nf)
        } else {
            "undefined (no states)".into()
        };
        Ok(CountReport {
            model: "box".into(),
            description: model.describe(),
            dims: model.dims(),
            sides: model.sides().iter().map(rational_string).collect(),
            unit: model.unit().symbol().to_string(),
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
    fn columns(&self) -> Vec<String> {
        ["up_to", "states", "weyl_estimate", "weyl_relative_gap"]
            .map(String::from)
            .to_vec()
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

/// Checks that a digits request is sensible.
pub fn check_digits(digits: u32) -> Result<u32> {
    if (1..=60).contains(&digits) {
        Ok(digits)
    } else {
        Err(Error::invalid(
            "digits",
            digits,
            "choose between 1 and 60 significant digits",
        ))
    }
}
