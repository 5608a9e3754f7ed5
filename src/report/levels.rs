//! The answer to `levels`: which levels lie up to an energy, for any
//! spectrum, with the box's own extras (families of permuted quantum
//! numbers, where each degeneracy comes from, energies at a physical scale).

use super::{LISTED_LEVEL_BYTES, LISTED_STATE_BYTES};
use crate::error::Result;
use crate::exact::{exact_decimal, format_sig, parse_rational, rational_string};
use crate::export::{units_block, Column, Tabular};
use crate::models::particle_box::{Origin, ParticleInBox};
use crate::report::text::{level_energy_text, listing_bits};
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

/// Options for a generic level listing.
#[derive(Debug, Clone)]
pub struct ListOptions {
    /// List every state of every level.
    pub with_states: bool,
    /// Also show each energy in this unit, to `digits` significant digits.
    pub convert_to: Option<EnergyUnit>,
    /// Significant digits of converted energies.
    pub digits: u32,
    /// Memory budget for the enumeration.
    pub budget: Budget,
}

impl Default for ListOptions {
    fn default() -> Self {
        ListOptions {
            with_states: false,
            convert_to: None,
            digits: 10,
            budget: Budget::default(),
        }
    }
}

/// One level as reported.
#[derive(Debug, Clone, Serialize)]
pub struct LevelRow {
    /// Exact energy in the listing's unit, e.g. `"27/4"`; an energy that
    /// is not rational as `~` and its correctly rounded decimal.
    pub energy: String,
    /// For an energy that is not rational, its certified enclosure
    /// `[lo, hi]` as exact rationals.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub enclosure: Option<[String; 2]>,
    /// Energy at a box's physical scale, correctly rounded, when one is
    /// given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_physical: Option<String>,
    /// Energy in the requested second unit, correctly rounded.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_converted: Option<String>,
    /// Number of states, as a decimal string.
    pub degeneracy: String,
    /// For a box: the number of distinct quantum-number families at this
    /// energy.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub families: Option<u64>,
    /// For a box: where the degeneracy comes from.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub origin: Option<Origin>,
    /// Labels of the level (from a level file), if any.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub labels: Vec<String>,
    /// The terms at this energy, each as the values of the report's
    /// `term_numbers` (e.g. `[3]` for J = 3), for models that label levels
    /// (see [`Spectrum::term_numbers`]).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub terms: Vec<Vec<i64>>,
    /// The states, each as the values of the report's `quantum_numbers`,
    /// when asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub states: Option<Vec<Vec<Quantum>>>,
}

/// The answer to "which levels lie up to this energy?", for any spectrum.
#[derive(Debug, Clone, Serialize)]
pub struct LevelsReport {
    /// Model identifier (`box`, `rotor`, `top`, `oscillator`, `system`, ...).
    pub model: String,
    /// Human description.
    pub description: String,
    /// For a box: the number of dimensions.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub dims: Option<usize>,
    /// For a box: the side ratios.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sides: Option<Vec<String>>,
    /// Unit of `energy`.
    pub unit: String,
    /// Unit of `energy_converted`, if asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub converted_unit: Option<String>,
    /// Quantum-number names, in the order states list them.
    pub quantum_numbers: Vec<String>,
    /// Names of the quantum numbers that label a level (its term), in the
    /// order `terms` list them; empty where the model has none.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub term_numbers: Vec<String>,
    /// The cutoff, exact, in `unit`.
    pub up_to: String,
    /// For a box: the physical scale, when given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub physical: Option<PhysicalScale>,
    /// Warnings, e.g. that levels end before the cutoff (not for a box,
    /// whose levels never end).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub warnings: Option<Vec<String>>,
    /// The levels, lowest first.
    pub levels: Vec<LevelRow>,
    /// Number of levels.
    pub level_count: usize,
    /// Total number of states listed.
    pub total_states: String,
    /// The unit of every energy field, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl LevelsReport {
    /// Whether this is a box listing (with families and origins).
    fn is_box(&self) -> bool {
        self.dims.is_some()
    }

    /// The columns of a box listing: energies in box units and, with a
    /// scale, in `physical`; the states' quantum numbers when listed.
    fn box_columns(unit: &str, physical: Option<&str>, states: Option<&[String]>) -> Vec<Column> {
        let mut c = vec![Column::with_unit("E", unit).key("energy")];
        if let Some(u) = physical {
            c.push(Column::with_unit("E", u).key("energy_physical"));
        }
        c.extend(["degeneracy", "families", "origin"].map(Column::plain));
        if let Some(q) = states {
            c.push(Column::plain(&format!("states ({})", q.join(","))));
        }
        c
    }

    /// The energy columns: in the spectrum's unit and, if asked, another.
    fn energy_columns(unit: &str, converted: Option<&str>) -> Vec<Column> {
        let mut c = vec![Column::with_unit("E", unit).key("energy")];
        if let Some(u) = converted {
            c.push(Column::with_unit("E", u).key("energy_converted"));
        }
        c
    }

    /// Lists the levels of a box `model` up to `cutoff`, with their states
    /// if `with_states`, and physical energies if `scale` is given.
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
        let listed = budget.with_output(LISTED_LEVEL_BYTES, LISTED_STATE_BYTES);
        let rows: Vec<(
            crate::models::particle_box::ClassifiedLevel,
            Option<Vec<State>>,
        )> = if with_states {
            model
                .levels_with_states(cutoff, &listed)?
                .into_iter()
                .map(|(l, s)| (l, Some(s)))
                .collect()
        } else {
            model
                .classified_levels(cutoff, &listed)?
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
                    enclosure: None,
                    energy_physical: match (&unit_value, scale) {
                        (Some(v), Some(s)) => Some(format_sig(&(&l.level.energy * v), s.digits)),
                        _ => None,
                    },
                    energy_converted: None,
                    degeneracy: l.level.degeneracy.to_string(),
                    families: Some(l.families),
                    origin: Some(l.origin()),
                    labels: Vec::new(),
                    terms: Vec::new(),
                    states: states.map(|all| {
                        all.iter()
                            .map(|s| s.0.iter().map(|&v| Quantum::Whole(v)).collect())
                            .collect()
                    }),
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
        let unit = model.unit().symbol().to_string();
        let units = units_block(&Self::box_columns(
            &unit,
            physical.as_ref().map(|p| p.unit.as_str()),
            None,
        ));
        Ok(LevelsReport {
            model: "box".into(),
            description: model.describe(),
            dims: Some(model.dims()),
            sides: Some(model.sides().iter().map(rational_string).collect()),
            unit,
            converted_unit: None,
            quantum_numbers: model.quantum_numbers(),
            term_numbers: Vec::new(),
            up_to: rational_string(cutoff),
            physical,
            warnings: None,
            level_count: levels.len(),
            levels,
            total_states: total.to_string(),
            units,
        })
    }

    /// Lists the levels of any spectrum up to `cutoff` (in its unit).
    ///
    /// ```
    /// use zsum::models::rotor::LinearRotor;
    /// use zsum::report::{ListOptions, LevelsReport};
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let rotor = LinearRotor::rigid(parse_rational("2").unwrap(), EnergyUnit::Wavenumber).unwrap();
    /// let opts = ListOptions { with_states: true, ..Default::default() };
    /// let r = LevelsReport::build("rotor", &rotor, &parse_rational("4").unwrap(), &opts).unwrap();
    /// assert_eq!(r.levels[1].degeneracy, "3");
    /// // States as (J, M): the first of J = 1 is M = −1.
    /// assert_eq!(r.quantum_numbers, ["J", "M"]);
    /// assert_eq!(r.levels[1].states.as_ref().unwrap()[0][1].to_string(), "-1");
    /// ```
    pub fn build(
        model: &str,
        spectrum: &dyn Spectrum,
        cutoff: &BigRational,
        opts: &ListOptions,
    ) -> Result<Self> {
        let budget = opts
            .budget
            .with_output(LISTED_LEVEL_BYTES, LISTED_STATE_BYTES);
        let list = spectrum.levels_within_bits(cutoff, &budget, listing_bits(opts.digits))?;
        if opts.with_states {
            let states = spectrum
                .count_bound(cutoff)
                .to_f64()
                .unwrap_or(f64::INFINITY);
            budget.check_listing(
                format!("listing every state up to {}", rational_string(cutoff)),
                0.0,
                list.len() as f64,
                states,
                "list levels without their states, or give a lower cutoff",
            )?;
        }
        let factor = opts
            .convert_to
            .as_ref()
            .map(|u| spectrum.unit().factor_to(u))
            .transpose()?;
        let names = spectrum.quantum_numbers();
        let doubled = spectrum.doubled_numbers();
        let term_names = spectrum.term_numbers();
        let mut terms: std::collections::BTreeMap<BigRational, Vec<Vec<i64>>> = Default::default();
        if !term_names.is_empty() {
            for (e, t) in spectrum.terms_within(cutoff, &budget)? {
                terms.entry(e).or_default().push(t);
            }
        }
        let mut levels = Vec::with_capacity(list.len());
        for l in list.iter() {
            let states = if opts.with_states {
                let states = spectrum.states_at(&l.energy)?;
                Some(
                    states
                        .iter()
                        .map(|s| {
                            s.0.iter()
                                .enumerate()
                                .map(|(i, v)| {
                                    Quantum::from_stored(
                                        *v,
                                        doubled.get(i).copied().unwrap_or(false),
                                    )
                                })
                                .collect()
                        })
                        .collect(),
                )
            } else {
                None
            };
            levels.push(LevelRow {
                energy: level_energy_text(l, opts.digits),
                enclosure: l
                    .enclosure
                    .as_ref()
                    .map(|e| [rational_string(&e.lo), rational_string(&e.hi)]),
                energy_physical: None,
                energy_converted: factor
                    .as_ref()
                    .map(|f| format_sig(&(&l.energy * f), opts.digits)),
                degeneracy: l.degeneracy.to_string(),
                families: None,
                origin: None,
                labels: spectrum.labels_at(&l.energy),
                terms: {
                    // An enclosed level's terms are those the model placed
                    // inside its enclosure (at whatever precision it listed
                    // them); an exact level's, those at its energy.
                    let keys: Vec<BigRational> = terms
                        .range(l.lowest().clone()..=l.highest().clone())
                        .map(|(k, _)| k.clone())
                        .collect();
                    let mut t: Vec<Vec<i64>> = keys
                        .iter()
                        .filter_map(|k| terms.remove(k))
                        .flatten()
                        .collect();
                    t.sort();
                    t
                },
                states,
            });
        }
        let unit = spectrum.unit().symbol().to_string();
        let converted_unit = opts.convert_to.as_ref().map(|u| u.symbol().to_string());
        Ok(LevelsReport {
            model: model.to_string(),
            description: spectrum.describe(),
            dims: None,
            sides: None,
            units: units_block(&Self::energy_columns(&unit, converted_unit.as_deref())),
            unit,
            converted_unit,
            quantum_numbers: names,
            term_numbers: term_names.clone(),
            up_to: rational_string(cutoff),
            physical: None,
            warnings: Some(spectrum.warnings(cutoff)),
            level_count: levels.len(),
            total_states: list.total_states().to_string(),
            levels,
        })
    }
}

impl LevelsReport {
    fn box_preamble(&self) -> Vec<String> {
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

    fn any_preamble(&self) -> Vec<String> {
        let mut p = vec![format!(
            "{}; energies E in {}; levels up to {}",
            self.description, self.unit, self.up_to
        )];
        if self.levels.iter().any(|l| l.enclosure.is_some()) {
            p.push(
                "~ marks an energy that is not rational (an eigenvalue): correctly rounded from \
                 its certified enclosure, to the digits the enclosure decides (JSON gives the \
                 enclosure)"
                    .to_string(),
            );
        }
        for w in self.warnings.iter().flatten() {
            p.push(format!("warning: {w}"));
        }
        p
    }

    fn box_columns_now(&self) -> Vec<Column> {
        Self::box_columns(
            &self.unit,
            self.physical.as_ref().map(|p| p.unit.as_str()),
            self.levels
                .first()
                .is_some_and(|l| l.states.is_some())
                .then_some(self.quantum_numbers.as_slice()),
        )
    }

    fn any_columns(&self) -> Vec<Column> {
        let mut c = Self::energy_columns(&self.unit, self.converted_unit.as_deref());
        if !self.term_numbers.is_empty() {
            c.push(Column::plain(&self.term_numbers.join(",")));
        }
        c.push(Column::plain("degeneracy"));
        if self.levels.iter().any(|l| !l.labels.is_empty()) {
            c.push(Column::plain("label"));
        }
        if self.levels.first().is_some_and(|l| l.states.is_some()) {
            c.push(Column::plain(&format!(
                "states ({})",
                self.quantum_numbers.join(",")
            )));
        }
        c
    }

    fn box_rows(&self) -> Vec<Vec<String>> {
        self.levels
            .iter()
            .map(|l| {
                let mut r = vec![l.energy.clone()];
                if let Some(e) = &l.energy_physical {
                    r.push(e.clone());
                }
                r.push(l.degeneracy.clone());
                r.push(l.families.map(|f| f.to_string()).unwrap_or_default());
                r.push(l.origin.map(|o| o.as_str().to_string()).unwrap_or_default());
                if let Some(states) = &l.states {
                    r.push(
                        states
                            .iter()
                            .map(|s| {
                                let v: Vec<String> = s.iter().map(|n| n.to_string()).collect();
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

    fn any_rows(&self) -> Vec<Vec<String>> {
        let with_labels = self.levels.iter().any(|l| !l.labels.is_empty());
        self.levels
            .iter()
            .map(|l| {
                // JSON carries the exact rational; the table shows the exact
                // decimal where there is one, else 15 correct digits.
                let mut r = vec![match parse_rational(&l.energy) {
                    Ok(e) => {
                        let d = exact_decimal(&e, 30);
                        if d.contains('/') {
                            format_sig(&e, 15)
                        } else {
                            d
                        }
                    }
                    Err(_) => l.energy.clone(),
                }];
                if let Some(e) = &l.energy_converted {
                    r.push(e.clone());
                }
                if !self.term_numbers.is_empty() {
                    let cells: Vec<String> = l
                        .terms
                        .iter()
                        .map(|t| t.iter().map(|x| x.to_string()).collect::<Vec<_>>())
                        .map(|v| {
                            if v.len() == 1 {
                                v[0].clone()
                            } else {
                                format!("({})", v.join(","))
                            }
                        })
                        .collect();
                    r.push(cells.join(" "));
                }
                r.push(l.degeneracy.clone());
                if with_labels {
                    r.push(l.labels.join(" + "));
                }
                if let Some(states) = &l.states {
                    let cells: Vec<String> = states
                        .iter()
                        .map(|st| {
                            let v: Vec<String> = st.iter().map(|x| x.to_string()).collect();
                            format!("({})", v.join(","))
                        })
                        .collect();
                    r.push(cells.join(" "));
                }
                r
            })
            .collect()
    }
}

impl Tabular for LevelsReport {
    fn preamble(&self) -> Vec<String> {
        if self.is_box() {
            self.box_preamble()
        } else {
            self.any_preamble()
        }
    }

    fn columns(&self) -> Vec<Column> {
        if self.is_box() {
            self.box_columns_now()
        } else {
            self.any_columns()
        }
    }

    fn rows(&self) -> Vec<Vec<String>> {
        if self.is_box() {
            self.box_rows()
        } else {
            self.any_rows()
        }
    }

    fn summary(&self) -> Vec<String> {
        vec![format!(
            "{} levels, {} states",
            self.level_count, self.total_states
        )]
    }
}

/// A quantum number's value: whole, or a half-integer such as m_J = −1/2,
/// which JSON carries exactly as `-0.5`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(untagged)]
pub enum Quantum {
    /// An integer.
    Whole(i64),
    /// A half-integer (an odd number of halves).
    Half(f64),
}

impl Quantum {
    /// The value stored in a [`State`]: `doubled` numbers are kept as twice
    /// their value.
    pub fn from_stored(value: i64, doubled: bool) -> Self {
        if !doubled {
            Quantum::Whole(value)
        } else if value % 2 == 0 {
            Quantum::Whole(value / 2)
        } else {
            Quantum::Half(value as f64 / 2.0)
        }
    }
}

impl std::fmt::Display for Quantum {
    /// `3`, or `-1/2` for a half-integer.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Quantum::Whole(v) => write!(f, "{v}"),
            Quantum::Half(x) => write!(f, "{}/2", (x * 2.0) as i64),
        }
    }
}
