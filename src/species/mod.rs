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
pub mod liquefier;
mod molar;
pub mod poly;
pub mod spin;

use crate::error::{Error, ErrorKind, Result};
use crate::exact::parse_rational;
use crate::models::diatomic::ParityWeights;
use crate::models::level_file::LevelFile;
use crate::models::product::{Part, Product};
use crate::models::spec::{DiatomicSpec, OscillatorSpec, RotorSpec, Text};
use crate::spectrum::Spectrum;
use crate::units::{parse_mass_kg, EnergyUnit};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::{Deserialize, Serialize};
use std::path::Path;

pub use molar::{
    molar, molar_grids, Basis, Degeneracy, Isomer, MolarGrid, MolarOptions, MolarValues, Reference,
    Translation, VibModel, DEGENERACY_G,
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

/// A ²Π molecule's spin–orbit constant A (nitric oxide, hydroxyl): the
/// rotation is then the ²Π doublet in intermediate coupling.
#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileSpinOrbit {
    #[serde(rename = "A")]
    a: String,
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

/// A polyatomic species' rotation: a model description of kind `rotor`,
/// `top`, `spherical_top` or `asymmetric_top` (as a system file writes it,
/// nuclear-spin statistics included), with its source.
#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileTop {
    model: crate::models::spec::ModelSpec,
    source: String,
}

/// Harmonic vibrational modes, each `"<wavenumber> <unit>"` with an
/// optional degeneracy `" x2"`, with their source.
#[derive(Debug, Clone, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct FileModes {
    freq: Vec<String>,
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
    symmetry_number: Option<u32>,
    spin_orbit: Option<FileSpinOrbit>,
    top: Option<FileTop>,
    modes: Option<FileModes>,
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
    /// A polyatomic molecule: a rotor or top with its nuclear-spin
    /// statistics and harmonic modes.
    Polyatomic,
}

/// A polyatomic molecule's rotation and vibrations.
#[derive(Debug, Clone)]
pub struct Polyatomic {
    /// The rotation, with its spin statistics.
    pub rotation: poly::Rotation,
    /// Its description (as a system file writes it).
    pub rotation_spec: crate::models::spec::ModelSpec,
    /// The harmonic modes as a system file writes them (`"667.4 cm-1 x2"`).
    pub modes: Vec<String>,
    /// The symmetry number, as the file gives it and the statistics imply.
    pub symmetry_number: u32,
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
    /// The spin–orbit constant A of a ²Π ground state, cm⁻¹: the rotation
    /// is then the ²Π doublet in intermediate coupling (both Ω ladders,
    /// Λ-doubling counted in the degeneracy).
    pub spin_orbit: Option<BigRational>,
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
    /// The molecule's constants (linear molecules of kind `linear`).
    pub molecule: Option<Molecule>,
    /// A polyatomic molecule's rotation and modes.
    pub polyatomic: Option<Polyatomic>,
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

/// Refuses the fields of a linear molecule (`why` says what the kind gives
/// instead).
fn no_linear_fields(n: &str, f: &FileSpecies, why: &str) -> Result<()> {
    for (field, present) in [
        ("rotation", f.rotation.is_some()),
        ("vibration", f.vibration.is_some()),
        ("nuclear_spin", f.nuclear_spin.is_some()),
        ("swap_parity", f.swap_parity.is_some()),
        ("homonuclear", f.homonuclear.is_some()),
    ] {
        if present {
            return Err(field_err(n, field, "given", why));
        }
    }
    Ok(())
}

/// The rotation, modes and symmetry number of a polyatomic species, checked
/// against each other.
fn polyatomic_from(n: &str, f: &FileSpecies) -> Result<Polyatomic> {
    no_linear_fields(
        n,
        f,
        "a polyatomic species gives its rotation as `top` (a model description with its \
         nuclear-spin statistics) and its vibrations as `modes`",
    )?;
    let top = f.top.as_ref().ok_or_else(|| {
        field_err(
            n,
            "top",
            "missing",
            "a polyatomic species needs top = { model = { kind = ..., ... }, source = ... }",
        )
    })?;
    let modes = f.modes.as_ref().ok_or_else(|| {
        field_err(
            n,
            "modes",
            "missing",
            "a polyatomic species needs modes = { freq = [\"1595 cm-1\", ...], source = ... }",
        )
    })?;
    for (field, src) in [("top.source", &top.source), ("modes.source", &modes.source)] {
        if src.trim().is_empty() {
            return Err(field_err(n, field, "", "every constant needs its source"));
        }
    }
    let rotation = poly::Rotation::from_spec(&top.model)
        .map_err(|e| field_err(n, "top.model", top.model.kind(), e.message()))?;
    let implied = rotation.implied_symmetry_number();
    let given = f.symmetry_number.ok_or_else(|| {
        field_err(
            n,
            "symmetry_number",
            "missing",
            &format!(
                "give the symmetry number; the nuclear-spin statistics of top.model imply {}",
                crate::exact::rational_string(&implied)
            ),
        )
    })?;
    if BigRational::from_integer(given.into()) != implied {
        return Err(field_err(
            n,
            "symmetry_number",
            &given.to_string(),
            &format!(
                "it contradicts the nuclear-spin statistics of top.model, which imply {} ({} \
                 nuclear-spin functions over a mean weight of {} per rotational state); give \
                 the statistics of the molecule's equivalent nuclei or correct the number",
                crate::exact::rational_string(&implied),
                rotation.spin_states(),
                crate::exact::rational_string(&rotation.mean_weight())
            ),
        ));
    }
    Ok(Polyatomic {
        rotation,
        rotation_spec: top.model.clone(),
        modes: modes.freq.clone(),
        symmetry_number: given,
    })
}

impl Species {
    fn from_file(f: FileSpecies) -> Result<Self> {
        let n = f.name.clone();
        let kind = match f.kind.as_str() {
            "atom" => Kind::Atom,
            "linear" => Kind::Linear,
            "polyatomic" => Kind::Polyatomic,
            other => return Err(field_err(&n, "kind", other, "atom, linear or polyatomic")),
        };
        let polyatomic = match kind {
            Kind::Polyatomic => Some(polyatomic_from(&n, &f)?),
            _ => {
                for (field, present) in [
                    ("top", f.top.is_some()),
                    ("modes", f.modes.is_some()),
                    ("symmetry_number", f.symmetry_number.is_some()),
                ] {
                    if present {
                        return Err(field_err(
                            &n,
                            field,
                            "given",
                            "top, modes and symmetry_number belong to kind = \"polyatomic\"",
                        ));
                    }
                }
                None
            }
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
            Kind::Polyatomic => None,
            Kind::Atom => {
                no_linear_fields(
                    &n,
                    &f,
                    "an atom has no rotation, vibration or ortho/para statistics",
                )?;
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
                        let t = crate::models::spec::parse_twice_spin(s)
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
                    spin_orbit: match &f.spin_orbit {
                        None => None,
                        Some(so) => {
                            let fs = cm1(&n, "spin_orbit.unit", &so.unit)?;
                            Some(number(&n, "spin_orbit.A", &so.a)? * fs)
                        }
                    },
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
            polyatomic,
            electronic,
            raw: f,
        };
        // Build the internal spectrum once so inconsistent constants fail here.
        sp.internal(VibModel::Rovib, None)?;
        Ok(sp)
    }

    /// Whether nuclear-spin isomers exist (homonuclear diatomics with
    /// spin > 0; polyatomics whose statistics single them out).
    pub fn has_spin_isomers(&self) -> bool {
        !self.isomers().is_empty()
    }

    /// The nuclear-spin isomers, each with its number of nuclear-spin
    /// functions (ortho-H2: 3, para-H2: 1), ortho first; empty without.
    pub fn isomers(&self) -> Vec<(String, u64)> {
        if let Some(p) = &self.polyatomic {
            return p
                .rotation
                .isomers()
                .into_iter()
                .map(|i| (i.name, i.spin_functions))
                .collect();
        }
        match &self.molecule {
            Some(m) if m.twice_spin.unwrap_or(0) > 0 => ["ortho", "para"]
                .into_iter()
                .filter_map(|name| {
                    let w = crate::system::restrict_weights(m.weights.clone(), Some(name)).ok()?;
                    let top = w.weight(0).max(w.weight(1)).clone();
                    Some((name.to_string(), u64::try_from(top).unwrap_or(u64::MAX)))
                })
                .collect(),
            _ => Vec::new(),
        }
    }

    /// The number of nuclear-spin functions of the equivalent nuclei:
    /// (2I+1)² for a homonuclear diatomic, 4 for water, 16 for methane;
    /// 1 without statistics.
    pub fn spin_states(&self) -> u64 {
        if let Some(p) = &self.polyatomic {
            return p.rotation.spin_states();
        }
        match &self.molecule {
            Some(Molecule {
                twice_spin: Some(t),
                ..
            }) => (*t as u64 + 1).pow(2),
            _ => 1,
        }
    }

    /// The internal spectrum of the isomer called `name` alone, with its
    /// spin weights.
    pub fn internal_isomer(
        &self,
        model: VibModel,
        name: &str,
    ) -> Result<Box<dyn Spectrum + Send + Sync>> {
        if let Some(p) = &self.polyatomic {
            return self.polyatomic_internal(p, Some(name));
        }
        let m = self
            .molecule
            .as_ref()
            .filter(|_| self.has_spin_isomers())
            .ok_or_else(|| molar::no_isomers(self))?;
        let w = crate::system::restrict_weights(m.weights.clone(), Some(name))?;
        self.internal(model, Some(w))
    }

    /// A ²Π molecule: the doublet in intermediate coupling with B_0 =
    /// B_e − α_e/2 and D_e, times a harmonic vibration with the
    /// fundamental we − 2 wexe, times the electronic levels.
    fn pi_internal(
        &self,
        m: &Molecule,
        a: &BigRational,
    ) -> Result<Box<dyn Spectrum + Send + Sync>> {
        use crate::models::open_shell::{Coupling, PiDoublet};
        let two = BigRational::from_integer(2.into());
        let b0 = &m.b_e - &m.alpha_e / &two;
        let rot = PiDoublet::new(
            Coupling::Intermediate,
            a.clone(),
            b0,
            m.d_e.clone(),
            EnergyUnit::Wavenumber,
        )?;
        let ho = OscillatorSpec {
            freq: vec![Text::energy(
                &(&m.we - &two * &m.wexe),
                &EnergyUnit::Wavenumber,
            )],
            zero_point: false,
        }
        .build()?;
        self.rot_vib_el(Box::new(rot), Box::new(ho))
    }

    /// Rotation × vibration × the electronic levels, in cm⁻¹.
    fn rot_vib_el(
        &self,
        rotation: Box<dyn Spectrum + Send + Sync>,
        vibration: Box<dyn Spectrum + Send + Sync>,
    ) -> Result<Box<dyn Spectrum + Send + Sync>> {
        let part = |name: &str, spectrum| Part {
            name: name.into(),
            spectrum,
        };
        Ok(Box::new(Product::new(
            vec![
                part("rotation", rotation),
                part("vibration", vibration),
                part("electronic", Box::new(self.electronic.clone())),
            ],
            Some(EnergyUnit::Wavenumber),
        )?))
    }

    fn polyatomic_internal(
        &self,
        p: &Polyatomic,
        isomer: Option<&str>,
    ) -> Result<Box<dyn Spectrum + Send + Sync>> {
        let modes = OscillatorSpec {
            freq: p.modes.iter().map(|m| Text::new(m.clone())).collect(),
            zero_point: false,
        }
        .build()?;
        self.rot_vib_el(p.rotation.spectrum(isomer)?, Box::new(modes))
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
        if let Some(p) = &self.polyatomic {
            return self.polyatomic_internal(p, None);
        }
        let el: Box<dyn Spectrum + Send + Sync> = Box::new(self.electronic.clone());
        let Some(m) = &self.molecule else {
            return Ok(el);
        };
        if let Some(a) = &m.spin_orbit {
            return self.pi_internal(m, a);
        }
        let w = weights.unwrap_or_else(|| m.weights.clone());
        // The rotation and vibration are described as a system file would
        // describe them (exact constants in cm-1) and built the same way.
        let cm1 = |v: &BigRational| Text::energy(v, &EnergyUnit::Wavenumber);
        let weights = Some(Text::new(format!("{}:{}", w.even(), w.odd())));
        let rovib: Box<dyn Spectrum + Send + Sync> = match model {
            VibModel::Rovib => Box::new(
                DiatomicSpec {
                    we: cm1(&m.we),
                    wexe: cm1(&m.wexe),
                    weye: None,
                    be: cm1(&m.b_e),
                    alpha: Some(cm1(&m.alpha_e)),
                    de: Some(cm1(&m.d_e)),
                    spin: None,
                    swap_parity: false,
                    weights,
                    only: None,
                }
                .build()?,
            ),
            VibModel::Rrho => {
                // Rigid rotor with B_0 and a harmonic vibration with the
                // fundamental G(1) − G(0) = we − 2 wexe.
                let two = BigRational::from_integer(2.into());
                let b0 = &m.b_e - &m.alpha_e / &two;
                let fundamental = &m.we - &two * &m.wexe;
                let rot = RotorSpec {
                    weights,
                    ..RotorSpec::new(cm1(&b0))
                };
                let ho = OscillatorSpec {
                    freq: vec![cm1(&fundamental)],
                    zero_point: false,
                };
                Box::new(Product::new(
                    vec![
                        Part {
                            name: "rotation".into(),
                            spectrum: Box::new(rot.build()?),
                        },
                        Part {
                            name: "vibration".into(),
                            spectrum: Box::new(ho.build()?),
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

    /// The mass in unified atomic mass units (u), exactly: the mass in kg
    /// over the CODATA 2018 atomic mass constant.
    pub fn mass_u(&self) -> BigRational {
        &self.mass_kg / crate::units::constants::atomic_mass_constant()
    }

    /// Every constant of the species as its file gives it, in file order:
    /// the mass, the nuclear spin, the rotational and vibrational constants,
    /// the electronic levels; each exact in its own unit, with the text it
    /// was written as and its source.
    ///
    /// ```
    /// use zsum::species::{Database, Quantity};
    /// use zsum::exact::parse_rational;
    /// let db = Database::builtin()?;
    /// let n2 = db.find("N2")?.constants()?;
    /// let b = n2.iter().find(|c| c.quantity == Quantity::BE).unwrap();
    /// assert_eq!(b.value, parse_rational("1.99824")?);
    /// assert_eq!(b.unit, "cm-1");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn constants(&self) -> Result<Vec<SpeciesConstant>> {
        let f = &self.raw;
        let n = &self.name;
        let given = |quantity: Quantity, field: &str, text: &str, unit: &str, source: &str| {
            Ok::<_, Error>(SpeciesConstant {
                quantity,
                value: number(n, field, text)?,
                written: text.to_string(),
                unit: unit.to_string(),
                source: Some(source.to_string()),
            })
        };
        let mut out = vec![given(
            Quantity::Mass,
            "mass",
            &f.mass.value,
            &f.mass.unit,
            &f.mass.source,
        )?];
        if let (Some(s), Some(m)) = (&f.nuclear_spin, &self.molecule) {
            let twice = m.twice_spin.unwrap_or(0);
            out.push(SpeciesConstant {
                quantity: Quantity::NuclearSpin {
                    weights: m.weights.clone(),
                    swapped: f.swap_parity.unwrap_or(false),
                },
                value: BigRational::new(twice.into(), 2.into()),
                written: s.clone(),
                unit: "ħ".into(),
                source: None,
            });
        }
        if let Some(r) = &f.rotation {
            for (q, field, v) in [
                (Quantity::BE, "rotation.B_e", Some(&r.b_e)),
                (Quantity::AlphaE, "rotation.alpha_e", r.alpha_e.as_ref()),
                (Quantity::DE, "rotation.D_e", r.d_e.as_ref()),
            ] {
                if let Some(v) = v {
                    out.push(given(q, field, v, &r.unit, &r.source)?);
                }
            }
        }
        if let Some(v) = &f.vibration {
            out.push(given(
                Quantity::We,
                "vibration.we",
                &v.we,
                &v.unit,
                &v.source,
            )?);
            if let Some(x) = &v.wexe {
                out.push(given(
                    Quantity::WeXe,
                    "vibration.wexe",
                    x,
                    &v.unit,
                    &v.source,
                )?);
            }
        }
        if let (Some(p), Some(top), Some(modes)) = (&self.polyatomic, &f.top, &f.modes) {
            out.extend(top_constants(n, &top.model, &top.source)?);
            out.push(SpeciesConstant {
                quantity: Quantity::SymmetryNumber,
                value: BigRational::from_integer(p.symmetry_number.into()),
                written: p.symmetry_number.to_string(),
                unit: "1".into(),
                source: Some(format!(
                    "checked: {} nuclear-spin functions over a mean weight of {} per rotational \
                     state",
                    p.rotation.spin_states(),
                    crate::exact::rational_string(&p.rotation.mean_weight())
                )),
            });
            for m in &modes.freq {
                let mut words = m.split_whitespace();
                let (v, u) = (words.next().unwrap_or(""), words.next().unwrap_or(""));
                let degeneracy = words
                    .next()
                    .and_then(|d| d.strip_prefix('x'))
                    .and_then(|d| d.parse().ok())
                    .unwrap_or(1);
                out.push(given(
                    Quantity::Mode { degeneracy },
                    "modes.freq",
                    v,
                    u,
                    &modes.source,
                )?);
            }
        }
        for (i, l) in f.electronic.levels.iter().enumerate() {
            out.push(given(
                Quantity::ElectronicLevel {
                    label: l.label.clone(),
                    degeneracy: l.degeneracy,
                },
                &format!("electronic level {}", i + 1),
                &l.energy,
                &f.electronic.unit,
                &f.electronic.source,
            )?);
        }
        Ok(out)
    }
}

/// The energy constants of a top's model description (`"27.88 cm-1"`
/// fields), in the description's field order.
fn top_constants(
    n: &str,
    model: &crate::models::spec::ModelSpec,
    source: &str,
) -> Result<Vec<SpeciesConstant>> {
    let table = toml::Value::try_from(model)
        .map_err(|e| field_err(n, "top.model", model.kind(), &e.to_string()))?;
    let mut out = Vec::new();
    for (name, v) in table.as_table().into_iter().flatten() {
        let Some(text) = v.as_str() else { continue };
        let mut words = text.split_whitespace();
        let (Some(value), Some(unit), None) = (words.next(), words.next(), words.next()) else {
            continue;
        };
        let Ok(x) = parse_rational(value) else {
            continue;
        };
        if EnergyUnit::parse(unit).is_err() {
            continue;
        }
        out.push(SpeciesConstant {
            quantity: Quantity::TopConstant { name: name.clone() },
            value: x,
            written: value.to_string(),
            unit: unit.to_string(),
            source: Some(source.to_string()),
        });
    }
    Ok(out)
}

/// What one constant of a species is.
#[derive(Debug, Clone, PartialEq)]
pub enum Quantity {
    /// The mass of the atom or molecule.
    Mass,
    /// The spin I of each nucleus of a homonuclear molecule (in units of
    /// ħ), with the nuclear-spin weights of even and odd J it gives and
    /// whether the electronic ground state swaps the parities.
    NuclearSpin {
        /// The weights of even and odd J.
        weights: ParityWeights,
        /// Whether the ground state swaps the parities (as O2's does).
        swapped: bool,
    },
    /// The rotational constant B_e.
    BE,
    /// The rotation–vibration coupling α_e.
    AlphaE,
    /// The centrifugal distortion constant D_e.
    DE,
    /// The harmonic vibrational constant ω_e.
    We,
    /// The anharmonicity ω_e x_e.
    WeXe,
    /// A rotational or distortion constant of a polyatomic species' top,
    /// named as its model description names it (`A`, `B`, `C`, `DJ`).
    TopConstant {
        /// The field's name.
        name: String,
    },
    /// The symmetry number of a polyatomic species.
    SymmetryNumber,
    /// A harmonic mode's wavenumber, with its degeneracy.
    Mode {
        /// 1 for a non-degenerate mode, 2 for a bend of a linear molecule.
        degeneracy: u32,
    },
    /// An electronic level's energy, with its label and degeneracy.
    ElectronicLevel {
        /// The level's label, if the file gives one.
        label: Option<String>,
        /// Its degeneracy g.
        degeneracy: u32,
    },
}

/// One constant of a species: its value exactly, the text it was written
/// as, its unit and its source.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesConstant {
    /// What it is.
    pub quantity: Quantity,
    /// Its value in `unit`, exactly.
    pub value: BigRational,
    /// The value as written in the species file (its significant figures
    /// kept, e.g. `1904.20`).
    pub written: String,
    /// Its unit as written (`ħ` for a nuclear spin).
    pub unit: String,
    /// Where it comes from; `None` for the nuclear spin, which the file
    /// gives without a source of its own.
    pub source: Option<String>,
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
        // Parsed and checked once per process (every command and report
        // section asks for it); a failure is not kept, so it repeats.
        static DB: std::sync::OnceLock<Database> = std::sync::OnceLock::new();
        if let Some(db) = DB.get() {
            return Ok(db.clone());
        }
        let db = Self::parse(BUILTIN, "built-in species")?;
        Ok(DB.get_or_init(|| db).clone())
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
