//! Products of independent parts: rotor × oscillator × electronic levels,
//! box × rotor, and so on. Energies add and degeneracies multiply.
//!
//! The product is exact when every part's unit converts to one common unit
//! by an exact rational factor; zsum's units all do (the SI defining
//! constants are exact), except a model's own unit whose size in joules is
//! unknown (a box without a mass and a side). Combining such a part with
//! any other unit is refused with an error naming the parts and units.

use crate::error::{Error, ErrorKind, Result};
use crate::exact::rational_string;
use crate::level::LevelList;
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{One, Zero};
use std::collections::HashMap;

/// One named part of a product.
pub struct Part {
    /// A short name, used to prefix quantum numbers that would clash.
    pub name: String,
    /// The part's spectrum.
    pub spectrum: Box<dyn Spectrum + Send + Sync>,
}

impl std::fmt::Debug for Part {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "Part({}: {})", self.name, self.spectrum.describe())
    }
}

/// Independent parts taken together.
///
/// ```
/// use zsum::models::product::{Part, Product};
/// use zsum::models::rotor::LinearRotor;
/// use zsum::spectrum::Spectrum;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// let rot = LinearRotor::rigid(r("2"), EnergyUnit::Wavenumber).unwrap();
/// let p = Product::new(vec![
///     Part { name: "a".into(), spectrum: Box::new(rot.clone()) },
///     Part { name: "b".into(), spectrum: Box::new(rot) },
/// ], None).unwrap();
/// // Two independent rotors: 1 state at 0, 3+3 at 4, 3·3 at 8.
/// let l = p.levels_up_to(&r("8")).unwrap();
/// assert_eq!(l.total_states(), 16u32.into());
/// ```
#[derive(Debug)]
pub struct Product {
    parts: Vec<Part>,
    unit: EnergyUnit,
    /// `factor[i]`: one unit of part i in the common unit.
    factor: Vec<BigRational>,
    names: Vec<String>,
}

impl Product {
    /// Combines `parts` in the common `unit` (default: the first part's).
    pub fn new(parts: Vec<Part>, unit: Option<EnergyUnit>) -> Result<Self> {
        if parts.is_empty() {
            return Err(Error::invalid(
                "number of parts",
                0,
                "a product needs at least one part",
            ));
        }
        let unit = unit.unwrap_or_else(|| parts[0].spectrum.unit());
        let mut factor = Vec::with_capacity(parts.len());
        for p in &parts {
            let u = p.spectrum.unit();
            let f = u.factor_to(&unit).map_err(|_| {
                Error::new(
                    ErrorKind::Unit,
                    format!(
                        "cannot combine part {:?} (energies in {u}) with the common unit {unit} \
                         exactly: {}",
                        p.name,
                        if u.joules().is_none() {
                            format!(
                                "the size of {u} in joules is unknown (for a box, give its mass \
                                 and side)"
                            )
                        } else {
                            format!(
                                "the size of {unit} in joules is unknown; choose a physical \
                                 common unit"
                            )
                        }
                    ),
                )
            })?;
            factor.push(f);
        }
        // Quantum-number names, prefixed with the part name where they clash.
        let mut seen: HashMap<String, usize> = HashMap::new();
        for p in &parts {
            for q in p.spectrum.quantum_numbers() {
                *seen.entry(q).or_default() += 1;
            }
        }
        let names = parts
            .iter()
            .flat_map(|p| {
                let seen = &seen;
                p.spectrum.quantum_numbers().into_iter().map(move |q| {
                    if seen[&q] > 1 {
                        format!("{}.{q}", p.name)
                    } else {
                        q
                    }
                })
            })
            .collect();
        Ok(Product {
            parts,
            unit,
            factor,
            names,
        })
    }

    /// The parts.
    pub fn parts(&self) -> &[Part] {
        &self.parts
    }

    /// Ground energy of part `i` in the common unit.
    fn ground_of(&self, i: usize) -> BigRational {
        self.parts[i].spectrum.ground_energy() * &self.factor[i]
    }

    /// Sum of the ground energies of parts `from..`.
    fn ground_from(&self, from: usize) -> BigRational {
        (from..self.parts.len())
            .map(|i| self.ground_of(i))
            .fold(BigRational::zero(), |a, b| a + b)
    }

    /// Part i's levels in the common unit, up to the common-unit energy `e`.
    fn part_levels(&self, i: usize, e: &BigRational, budget: &Budget) -> Result<LevelList> {
        let own = e / &self.factor[i];
        if own < self.parts[i].spectrum.ground_energy() {
            return Ok(LevelList::empty(self.unit.clone()));
        }
        self.parts[i]
            .spectrum
            .levels_within(&own, budget)?
            .scaled(&self.factor[i], self.unit.clone())
    }

    fn states_from(
        &self,
        i: usize,
        e: &BigRational,
        out: &mut Vec<State>,
        prefix: &[i64],
    ) -> Result<()> {
        let last = i + 1 == self.parts.len();
        if last {
            let own = e / &self.factor[i];
            for s in self.parts[i].spectrum.states_at(&own)? {
                let mut v = prefix.to_vec();
                v.extend(s.0);
                out.push(State(v));
            }
            return Ok(());
        }
        let room = e - self.ground_from(i + 1);
        let levels = self.part_levels(i, &room, &Budget::default())?;
        for l in levels.iter() {
            let rest = e - &l.energy;
            // Only descend if the remaining parts can reach `rest` exactly.
            let own = &l.energy / &self.factor[i];
            let here = self.parts[i].spectrum.states_at(&own)?;
            let mut tail = Vec::new();
            self.states_from(i + 1, &rest, &mut tail, &[])?;
            for s in &here {
                for t in &tail {
                    let mut v = prefix.to_vec();
                    v.extend(s.0.iter().copied());
                    v.extend(t.0.iter().copied());
                    out.push(State(v));
                }
            }
        }
        Ok(())
    }

    fn bound_from(&self, i: usize, e: &BigRational) -> BigUint {
        let last = i + 1 == self.parts.len();
        let own = e / &self.factor[i];
        if last {
            return self.parts[i].spectrum.count_bound(&own);
        }
        let room = e - self.ground_from(i + 1);
        match self.part_levels(i, &room, &Budget::default()) {
            Ok(levels) => levels
                .iter()
                .map(|l| &l.degeneracy * self.bound_from(i + 1, &(e - &l.energy)))
                .sum(),
            Err(_) => {
                // Cannot list part i: fall back to the product of bounds,
                // each part given the whole room above its ground.
                (i..self.parts.len())
                    .map(|k| {
                        let own = (e - self.ground_from(0) + self.ground_of(k)) / &self.factor[k];
                        self.parts[k].spectrum.count_bound(&own)
                    })
                    .fold(BigUint::one(), |a, b| a * b)
            }
        }
    }
}

/// Working memory per combined pair before merging: a level (exact energy,
/// degeneracy, optional enclosure) and its heap parts, as measured.
const PAIR_BYTES: f64 = 136.0;

/// Elementary operations per pair of levels when two parts are combined:
/// an exact rational sum, a comparison with the cutoff and a merge.
const PAIR_OPS: f64 = 400.0;

impl Spectrum for Product {
    fn describe(&self) -> String {
        self.parts
            .iter()
            .map(|p| format!("{} [{}]", p.name, p.spectrum.describe()))
            .collect::<Vec<_>>()
            .join(" × ")
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        self.names.clone()
    }

    fn ground_energy(&self) -> BigRational {
        self.ground_from(0)
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let total_ground = self.ground_from(0);
        let mut acc: Option<LevelList> = None;
        for i in 0..self.parts.len() {
            // Part i may use what the cutoff leaves above the others' grounds.
            let room = cutoff - (&total_ground - self.ground_of(i));
            let levels = self.part_levels(i, &room, budget)?;
            acc = Some(match acc {
                None => levels,
                Some(a) => {
                    // Estimate before forming the product.
                    let pairs = a.len() as f64 * levels.len() as f64;
                    let what = format!("combining the parts up to {}", rational_string(cutoff));
                    budget.check(&what, pairs * PAIR_BYTES, "give a lower cutoff")?;
                    // An exact sum and comparison per pair (measured: about
                    // 1 µs at the reference speed).
                    budget.check_work(&what, pairs * PAIR_OPS, "give a lower cutoff")?;
                    let upto = cutoff - self.ground_from(i + 1);
                    a.product_up_to(&levels, &upto)?
                }
            });
        }
        let list = acc.unwrap_or_else(|| LevelList::empty(self.unit.clone()));
        // The combined levels are known only now: what listing them costs
        // downstream is checked before any row is made.
        budget.check_levels(
            format!("listing the levels up to {}", rational_string(cutoff)),
            list.len() as f64,
            128.0,
            "give a lower cutoff",
        )?;
        Ok(list)
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let mut out = Vec::new();
        if energy >= &self.ground_energy() {
            self.states_from(0, energy, &mut out, &[])?;
        }
        out.sort();
        Ok(out)
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Parts(
            self.parts
                .iter()
                .zip(&self.factor)
                .map(|(p, f)| (p.spectrum.as_ref() as &dyn Spectrum, f.clone()))
                .collect(),
        )
    }

    fn highest_energy(&self) -> Option<BigRational> {
        let mut total = BigRational::zero();
        for (p, f) in self.parts.iter().zip(&self.factor) {
            total += p.spectrum.highest_energy()? * f;
        }
        Some(total)
    }

    fn growth_exponent(&self) -> Option<f64> {
        let mut p = 0.0;
        for part in &self.parts {
            p += part.spectrum.growth_exponent()?;
        }
        Some(p)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        if energy < &self.ground_energy() {
            return BigUint::zero();
        }
        self.bound_from(0, energy)
    }

    fn doubled_numbers(&self) -> Vec<bool> {
        self.parts
            .iter()
            .flat_map(|p| p.spectrum.doubled_numbers())
            .collect()
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let total_ground = self.ground_from(0);
        (0..self.parts.len())
            .flat_map(|i| {
                let room = (cutoff - (&total_ground - self.ground_of(i))) / &self.factor[i];
                self.parts[i]
                    .spectrum
                    .warnings(&room)
                    .into_iter()
                    .map(move |w| format!("{}: {w}", self.parts[i].name))
            })
            .collect()
    }
}
