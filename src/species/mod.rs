//! Built-in species and ideal-gas thermochemistry from exact sums.
//!
//! The database is a TOML file in zsum's own format (`data/species.toml`,
//! embedded at build time; users may add files in the same format). Every
//! constant carries its unit and its source.
//!
//! Standard molar functions at T and p:
//!
//! - **translation**: Sackur–Tetrode, `S/R = ln[(2π m kT/h²)^{3/2} kT/p] + 5/2`,
//!   `H − H0 = 5/2 RT`, `Cp = 5/2 R`; or, on request, the exact sum for the
//!   gas in a cubic box of given side (through the engine), with
//!   `S/R = ln(q/N) + U/kT + 1`, N = pV/kT;
//! - **internal**: the exact sum over rovibrational levels (the vibrating
//!   rotor with rotation–vibration coupling, or rigid rotor × harmonic
//!   oscillator on request) times the electronic levels, with nuclear-spin
//!   statistics for homonuclear molecules.
//!
//! Conventions: energies are measured from the lowest level of the species
//! (H0). The conventional entropy `S` excludes nuclear spin, as the standard
//! tables do: for a homonuclear molecule in equilibrium, `S = S_total −
//! R ln (2I+1)²`; for a frozen ortho/para mixture, S is the fraction-weighted
//! entropy of the isomers' rotational sums without their spin degeneracies
//! and without the entropy of mixing the isomers (these two together are
//! R ln (2I+1)² for the normal mixture, so normal and equilibrium agree at
//! high temperature). `S_total` includes them.
//!
//! Quantum degeneracy: both translations count the molecules by Boltzmann
//! statistics (Sackur–Tetrode is its macroscopic limit; the box sum divides
//! by N!). Every row therefore carries the degeneracy parameter nΛ³ (n =
//! p/kT, Λ = h/sqrt(2π m kT), dimensionless) in a [`Degeneracy`], with g =
//! [`DEGENERACY_G`] = 1 for every species (an upper bound on the
//! correction; see there). The first Bose/Fermi correction to the ideal
//! gas is of relative size nΛ³/(g 2^{5/2}) (standard result); a row where
//! it exceeds the printed tolerance 10^−digits is flagged
//! (`quantum_flag`), and so is any row with a negative S or S_total. Where
//! nΛ³/g ≥ 1 the row is refused with an
//! [`ErrorKind::Degenerate`](crate::error::ErrorKind::Degenerate) error.

pub mod hydrogen;
pub(crate) mod molar;

use crate::error::{Error, ErrorKind, Result};
use crate::exact::parse_rational;
use crate::models::diatomic::{ParityWeights, RovibDiatomic};
use crate::models::level_file::LevelFile;
use crate::models::oscillator::{AnharmonicOscillator, HarmonicModes};
use crate::models::product::{Part, Product};
use crate::models::rotor::LinearRotor;
use crate::spectrum::Spectrum;
use crate::units::{parse_mass_kg, EnergyUnit};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::{Deserialize, Serialize};
use std::path::Path;

pub use molar::{
    degeneracy_warnings, molar, reference_text, tables, Basis, Degeneracy, Isomer, MolarOptions,
    MolarPoint, MolarTable, Translation, VibModel, DEGENERACY_G,
};

/// The built-in database text.
pub const BUILTIN: &str = include_str!("../../data/species.toml");

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct FileDb {
    species: Vec<FileSpecies>,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct Sourced {
    value: String,
    unit: String,
    source: String,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileRotation {
    #[serde(rename = "B_e")]
    b_e: String,
    alpha_e: Option<String>,
    #[serde(rename = "D_e")]
    d_e: Option<String>,
    unit: String,
    source: String,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileVibration {
    we: String,
    wexe: Option<String>,
    unit: String,
    source: String,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileLevel {
    energy: String,
    degeneracy: u32,
    label: Option<String>,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileElectronic {
    levels: Vec<FileLevel>,
    unit: String,
    source: String,
}

#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileSpecies {
    name: String,
    description: String,
    kind: String,
    mass: Sourced,
    homonuclear: Option<bool>,
    nuclear_spin: Option<String>,
    swap_parity: Option<bool>,
    rotation: Option<FileRotation>,
    vibration: Option<FileVibration>,
    electronic: FileElectronic,
}

/// Atom or linear molecule.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Kind {
    /// Translation and electronic levels only.
    Atom,
    /// A linear molecule: rotation and one vibration.
    Linear,
}

/// Rotational and vibrational constants of a linear molecule, in cm⁻¹.
#[derive(Debug, Clone, PartialEq)]
pub struct Molecule {
    /// B_e.
    pub b_e: BigRational,
    /// α_e.
    pub alpha_e: BigRational,
    /// D_e.
    pub d_e: BigRational,
    /// ω_e.
    pub we: BigRational,
    /// ω_e x_e.
    pub wexe: BigRational,
    /// Nuclear-spin weights of even and odd J (uniform for heteronuclear).
    pub weights: ParityWeights,
    /// Twice the nuclear spin of each nucleus, for homonuclear molecules.
    pub twice_spin: Option<u32>,
}

/// One validated species.
#[derive(Debug, Clone)]
pub struct Species {
    /// Its name, e.g. `N2`.
    pub name: String,
    /// A description.
    pub description: String,
    /// Atom or linear molecule.
    pub kind: Kind,
    /// Mass in kg, exact.
    pub mass_kg: BigRational,
    /// The molecule's constants (None for atoms).
    pub molecule: Option<Molecule>,
    /// Electronic levels.
    pub electronic: LevelFile,
    raw: FileSpecies,
}

fn field_err(species: &str, field: &str, value: &str, allowed: &str) -> Error {
    Error::new(
        ErrorKind::InvalidParameter,
        format!("species {species}: {field} = {value:?} is not allowed: {allowed}"),
    )
}

fn number(species: &str, field: &str, text: &str) -> Result<BigRational> {
    parse_rational(text).map_err(|_| field_err(species, field, text, "an exact decimal number"))
}

fn cm1(species: &str, field: &str, unit: &str) -> Result<BigRational> {
    let u = EnergyUnit::parse(unit).map_err(|_| {
        field_err(
            species,
            field,
            unit,
            "an energy unit: cm-1, K, meV, eV, J, kJ/mol",
        )
    })?;
    u.factor_to(&EnergyUnit::Wavenumber)
}

impl Species {
    fn from_file(f: FileSpecies) -> Result<Self> {
        let n = f.name.clone();
        let kind = match f.kind.as_str() {
            "atom" => Kind::Atom,
            "linear" => Kind::Linear,
            other => return Err(field_err(&n, "kind", other, "atom or linear")),
        };
        let mass_kg = parse_mass_kg(&format!("{}{}", f.mass.value, f.mass.unit))
            .map_err(|e| field_err(&n, "mass", &f.mass.value, &e.to_string()))?;
        if f.mass.source.trim().is_empty() {
            return Err(field_err(
                &n,
                "mass.source",
                "",
                "every constant needs its source",
            ));
        }
        let molecule = match kind {
            Kind::Atom => {
                for (field, present) in [
                    ("rotation", f.rotation.is_some()),
                    ("vibration", f.vibration.is_some()),
                    ("nuclear_spin", f.nuclear_spin.is_some()),
                    ("swap_parity", f.swap_parity.is_some()),
                    ("homonuclear", f.homonuclear.is_some()),
                ] {
                    if present {
                        return Err(field_err(
                            &n,
                            field,
                            "given",
                            "an atom has no rotation, vibration or ortho/para statistics",
                        ));
                    }
                }
                None
            }
            Kind::Linear => {
                let rot = f.rotation.as_ref().ok_or_else(|| {
                    field_err(
                        &n,
                        "rotation",
                        "missing",
                        "a linear molecule needs B_e with its unit",
                    )
                })?;
                let vib = f.vibration.as_ref().ok_or_else(|| {
                    field_err(
                        &n,
                        "vibration",
                        "missing",
                        "a linear molecule needs we with its unit",
                    )
                })?;
                let fr = cm1(&n, "rotation.unit", &rot.unit)?;
                let fv = cm1(&n, "vibration.unit", &vib.unit)?;
                let opt = |field: &str, v: &Option<String>| -> Result<BigRational> {
                    v.as_deref()
                        .map(|t| number(&n, field, t))
                        .transpose()
                        .map(|x| x.unwrap_or_else(BigRational::zero))
                };
                let homonuclear = f.homonuclear.ok_or_else(|| {
                    field_err(
                        &n,
                        "homonuclear",
                        "missing",
                        "say true or false for a linear molecule",
                    )
                })?;
                match (homonuclear, &f.nuclear_spin) {
                    (false, Some(s)) => {
                        return Err(field_err(
                            &n,
                            "nuclear_spin",
                            s,
                            "nuclear spin statistics need identical nuclei, but the molecule is \
                             heteronuclear (homonuclear = false)",
                        ))
                    }
                    (true, None) => {
                        return Err(field_err(
                            &n,
                            "nuclear_spin",
                            "missing",
                            "a homonuclear molecule needs the spin of its nuclei (0, 1/2, 1, ...)",
                        ))
                    }
                    _ => {}
                }
                let (twice_spin, weights) = match &f.nuclear_spin {
                    None => {
                        if f.swap_parity.is_some() {
                            return Err(field_err(
                                &n,
                                "swap_parity",
                                "given",
                                "parity swaps belong to homonuclear molecules; give nuclear_spin too",
                            ));
                        }
                        (None, ParityWeights::uniform())
                    }
                    Some(s) => {
                        let t = crate::system::parse_twice_spin(s)
                            .map_err(|e| field_err(&n, "nuclear_spin", s, &e.to_string()))?;
                        (
                            Some(t),
                            ParityWeights::from_nuclear_spin(t, f.swap_parity.unwrap_or(false)),
                        )
                    }
                };
                Some(Molecule {
                    b_e: number(&n, "rotation.B_e", &rot.b_e)? * &fr,
                    alpha_e: opt("rotation.alpha_e", &rot.alpha_e)? * &fr,
                    d_e: opt("rotation.D_e", &rot.d_e)? * &fr,
                    we: number(&n, "vibration.we", &vib.we)? * &fv,
                    wexe: opt("vibration.wexe", &vib.wexe)? * &fv,
                    weights,
                    twice_spin,
                })
            }
        };
        let fe = cm1(&n, "electronic.unit", &f.electronic.unit)?;
        let mut entries = Vec::new();
        for (i, l) in f.electronic.levels.iter().enumerate() {
            let e = number(&n, &format!("electronic level {}", i + 1), &l.energy)? * &fe;
            if e.is_negative() {
                return Err(field_err(
                    &n,
                    "electronic energy",
                    &l.energy,
                    "zero or above",
                ));
            }
            entries.push((e, BigUint::from(l.degeneracy), l.label.clone()));
        }
        let electronic = LevelFile::from_entries(EnergyUnit::Wavenumber, entries)
            .map_err(|e| Error::new(ErrorKind::InvalidParameter, format!("species {n}: {e}")))?;
        let sp = Species {
            name: n,
            description: f.description.clone(),
            kind,
            mass_kg,
            molecule,
            electronic,
            raw: f,
        };
        // Build the internal spectrum once so inconsistent constants fail here.
        sp.internal(VibModel::Rovib, None)?;
        Ok(sp)
    }

    /// Whether ortho and para modifications exist (homonuclear, spin > 0).
    pub fn has_spin_isomers(&self) -> bool {
        matches!(&self.molecule, Some(m) if m.twice_spin.unwrap_or(0) > 0)
    }

    /// (2I+1)² for a homonuclear molecule, else 1.
    pub fn spin_states(&self) -> u64 {
        match &self.molecule {
            Some(Molecule {
                twice_spin: Some(t),
                ..
            }) => (*t as u64 + 1).pow(2),
            _ => 1,
        }
    }

    /// Molar mass in kg/mol, exact.
    pub fn molar_mass(&self) -> BigRational {
        &self.mass_kg * crate::units::constants::avogadro()
    }

    /// The internal spectrum (rotation–vibration × electronic), energies in
    /// cm⁻¹; `weights` overrides the parity weights (one spin isomer).
    pub fn internal(
        &self,
        model: VibModel,
        weights: Option<ParityWeights>,
    ) -> Result<Box<dyn Spectrum + Send + Sync>> {
        let el: Box<dyn Spectrum + Send + Sync> = Box::new(self.electronic.clone());
        let Some(m) = &self.molecule else {
            return Ok(el);
        };
        let w = weights.unwrap_or_else(|| m.weights.clone());
        let zero = BigRational::zero;
        let rovib: Box<dyn Spectrum + Send + Sync> = match model {
            VibModel::Rovib => {
                let vib = AnharmonicOscillator::new(
                    m.we.clone(),
                    m.wexe.clone(),
                    zero(),
                    EnergyUnit::Wavenumber,
                )?;
                Box::new(RovibDiatomic::new(
                    vib,
                    m.b_e.clone(),
                    m.alpha_e.clone(),
                    m.d_e.clone(),
                    w,
                )?)
            }
            VibModel::Rrho => {
                // Rigid rotor with B_0 and a harmonic vibration with the
                // fundamental G(1) − G(0) = we − 2 wexe.
                let two = BigRational::from_integer(2.into());
                let b0 = &m.b_e - &m.alpha_e / &two;
                let fundamental = &m.we - &two * &m.wexe;
                let rot = LinearRotor::rigid(b0, EnergyUnit::Wavenumber)?.with_weights(w);
                let ho = HarmonicModes::one_d(fundamental, false, EnergyUnit::Wavenumber)?;
                Box::new(Product::new(
                    vec![
                        Part {
                            name: "rotation".into(),
                            spectrum: Box::new(rot),
                        },
                        Part {
                            name: "vibration".into(),
                            spectrum: Box::new(ho),
                        },
                    ],
                    None,
                )?)
            }
        };
        Ok(Box::new(Product::new(
            vec![
                Part {
                    name: "rovib".into(),
                    spectrum: rovib,
                },
                Part {
                    name: "electronic".into(),
                    spectrum: el,
                },
            ],
            Some(EnergyUnit::Wavenumber),
        )?))
    }

    /// The species as a TOML-like description with every constant, unit
    /// and source (for `zsum species show`).
    pub fn show(&self) -> SpeciesCard {
        let f = &self.raw;
        let mut rows = vec![[
            "mass".into(),
            f.mass.value.clone(),
            f.mass.unit.clone(),
            f.mass.source.clone(),
        ]];
        if let Some(s) = &f.nuclear_spin {
            rows.push([
                "nuclear spin I (each nucleus)".into(),
                s.clone(),
                "ħ".into(),
                format!(
                    "weights even J : odd J = {} : {}{}",
                    self.molecule
                        .as_ref()
                        .map(|m| m.weights.even().to_string())
                        .unwrap_or_default(),
                    self.molecule
                        .as_ref()
                        .map(|m| m.weights.odd().to_string())
                        .unwrap_or_default(),
                    if f.swap_parity.unwrap_or(false) {
                        " (the ground state swaps the parities)"
                    } else {
                        ""
                    }
                ),
            ]);
        }
        if let Some(r) = &f.rotation {
            for (k, v) in [
                ("B_e", Some(&r.b_e)),
                ("alpha_e", r.alpha_e.as_ref()),
                ("D_e", r.d_e.as_ref()),
            ] {
                if let Some(v) = v {
                    rows.push([k.into(), v.clone(), r.unit.clone(), r.source.clone()]);
                }
            }
        }
        if let Some(v) = &f.vibration {
            rows.push(["we".into(), v.we.clone(), v.unit.clone(), v.source.clone()]);
            if let Some(x) = &v.wexe {
                rows.push(["wexe".into(), x.clone(), v.unit.clone(), v.source.clone()]);
            }
        }
        for l in &f.electronic.levels {
            rows.push([
                format!(
                    "electronic level {} (g = {})",
                    l.label.clone().unwrap_or_default(),
                    l.degeneracy
                ),
                l.energy.clone(),
                f.electronic.unit.clone(),
                f.electronic.source.clone(),
            ]);
        }
        SpeciesCard {
            name: self.name.clone(),
            description: self.description.clone(),
            kind: self.kind,
            constants: rows
                .into_iter()
                .map(|[q, v, u, s]| Constant {
                    quantity: q,
                    value: v,
                    unit: u,
                    source: s,
                })
                .collect(),
        }
    }
}

/// One constant of a species with its unit and source.
#[derive(Debug, Clone, Serialize)]
pub struct Constant {
    /// What it is.
    pub quantity: String,
    /// Its value as given.
    pub value: String,
    /// Its unit.
    pub unit: String,
    /// Where it comes from.
    pub source: String,
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
    pub constants: Vec<Constant>,
}

impl crate::export::Tabular for SpeciesCard {
    fn preamble(&self) -> Vec<String> {
        vec![format!("{}: {}", self.name, self.description)]
    }
    fn columns(&self) -> Vec<crate::export::Column> {
        ["quantity", "value", "unit", "source"]
            .map(crate::export::Column::plain)
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

/// A set of species: the built-in ones plus any read from files.
#[derive(Debug, Clone)]
pub struct Database {
    species: Vec<Species>,
}

impl Database {
    /// The built-in species.
    ///
    /// ```
    /// let db = zsum::species::Database::builtin()?;
    /// assert!(db.find("N2").is_ok());
    /// assert!(db.find("n2").unwrap_err().to_string().contains("N2"));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn builtin() -> Result<Self> {
        Self::parse(BUILTIN, "built-in species")
    }

    /// Species from TOML text in zsum's species format.
    pub fn parse(text: &str, source: &str) -> Result<Self> {
        let db: FileDb =
            toml::from_str(text).map_err(|e| crate::input::toml_error(source, text, &e))?;
        let mut species: Vec<Species> = Vec::new();
        for f in db.species {
            let name = f.name.clone();
            if species.iter().any(|s| s.name == name) {
                return Err(Error::new(
                    ErrorKind::InvalidParameter,
                    format!("{source}: species {name} is defined twice"),
                ));
            }
            species.push(
                Species::from_file(f)
                    .map_err(|e| Error::new(e.kind(), format!("{source}: {}", e.message())))?,
            );
        }
        Ok(Database { species })
    }

    /// Adds the species of a file; a name already present is refused.
    pub fn add_file(&mut self, path: &Path) -> Result<()> {
        let text = crate::input::read_text(path, "species file", crate::input::MAX_SPECIES_BYTES)?;
        let more = Self::parse(&text, &path.display().to_string())?;
        for s in more.species {
            if self.species.iter().any(|t| t.name == s.name) {
                return Err(Error::new(
                    ErrorKind::InvalidParameter,
                    format!(
                        "{}: species {} is already defined (built in or in another file); give \
                         it another name",
                        path.display(),
                        s.name
                    ),
                ));
            }
            self.species.push(s);
        }
        Ok(())
    }

    /// Every species, in file order.
    pub fn all(&self) -> &[Species] {
        &self.species
    }

    /// The species called `name`; an unknown name is refused with the
    /// closest names suggested.
    pub fn find(&self, name: &str) -> Result<&Species> {
        if let Some(s) = self.species.iter().find(|s| s.name == name) {
            return Ok(s);
        }
        let mut scored: Vec<(usize, &str)> = self
            .species
            .iter()
            .map(|s| {
                let d = distance(&s.name.to_lowercase(), &name.to_lowercase());
                (d, s.name.as_str())
            })
            .collect();
        scored.sort();
        let close: Vec<&str> = scored
            .iter()
            .filter(|(d, _)| *d <= 2)
            .take(3)
            .map(|x| x.1)
            .collect();
        let all: Vec<&str> = self.species.iter().map(|s| s.name.as_str()).collect();
        Err(Error::new(
            ErrorKind::InvalidParameter,
            format!(
                "unknown species {name:?}{}; known: {} (add your own from a species file)",
                if close.is_empty() {
                    String::new()
                } else {
                    format!(": did you mean {}?", close.join(" or "))
                },
                all.join(", ")
            ),
        ))
    }
}

/// Levenshtein distance (for suggestions).
fn distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut cur = vec![i + 1];
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur.push(sub.min(prev[j + 1] + 1).min(cur[j] + 1));
        }
        prev = cur;
    }
    prev[b.len()]
}

/// `zsum species list`.
#[derive(Debug, Clone, Serialize)]
pub struct SpeciesList {
    /// One row per species.
    pub species: Vec<SpeciesSummary>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl SpeciesList {
    fn columns_for() -> Vec<crate::export::Column> {
        use crate::export::Column;
        vec![
            Column::plain("name"),
            Column::plain("kind"),
            Column::with_unit("mass", "u").key("mass"),
            Column::plain("ortho/para"),
            Column::plain("description"),
        ]
    }
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

impl Database {
    /// The list for `zsum species list`.
    pub fn list(&self) -> SpeciesList {
        SpeciesList {
            species: self
                .species
                .iter()
                .map(|s| SpeciesSummary {
                    name: s.name.clone(),
                    kind: s.kind,
                    mass: crate::report::text::rational_text(
                        &(&s.mass_kg / crate::units::constants::atomic_mass_constant()),
                        12,
                    ),
                    spin_isomers: s.has_spin_isomers(),
                    description: s.description.clone(),
                })
                .collect(),
            units: crate::export::units_block(&SpeciesList::columns_for()),
        }
    }
}

impl crate::export::Tabular for SpeciesList {
    fn preamble(&self) -> Vec<String> {
        vec![format!(
            "{} species; `zsum species show NAME` gives every constant with its unit and source",
            self.species.len()
        )]
    }
    fn columns(&self) -> Vec<crate::export::Column> {
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
