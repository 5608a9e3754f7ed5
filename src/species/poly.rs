//! Polyatomic species: the rotation (a linear rotor or a top, described as a
//! system file describes it, with its nuclear-spin statistics), harmonic
//! vibrational modes with their degeneracies, and the symmetry number the
//! statistics imply.
//!
//! The exact sum counts only the rotational states that nuclear-spin
//! statistics allow, each with its spin weight; the symmetry number is then
//! not a divisor applied by hand but a consequence, checked against the
//! file: σ = (nuclear-spin functions of the equivalent nuclei) / (mean
//! weight per rotational state at high temperature). Water: 4 / 2 = 2;
//! carbon dioxide (spin-0 ends, even J only): 1 / (1/2) = 2.

use crate::error::{Error, Result};
use crate::models::asym_top::AsymmetricTop;
use crate::models::rotor::{LinearRotor, SphericalTop, SymmetricTop};
use crate::models::spec::ModelSpec;
use crate::spectrum::Spectrum;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};

/// The rotation of a polyatomic species.
#[derive(Debug, Clone)]
pub enum Rotation {
    /// A linear molecule (carbon dioxide), weights by the parity of J.
    Linear(LinearRotor),
    /// A symmetric top (ammonia).
    Symmetric(Box<SymmetricTop>),
    /// A spherical top (methane).
    Spherical(SphericalTop),
    /// An asymmetric top (water), weights by the (Ka, Kc) parity class.
    Asymmetric(Box<AsymmetricTop>),
}

/// One nuclear-spin isomer: its name and its number of nuclear-spin
/// functions (the weight of its levels' spin part: 3 for ortho-water).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct IsomerInfo {
    /// `ortho`, `para`, `meta`.
    pub name: String,
    /// Its nuclear-spin functions.
    pub spin_functions: u64,
}

fn u64_of(w: &BigUint) -> u64 {
    w.to_u64().unwrap_or(u64::MAX)
}

/// Ortho (the larger weight) and para (the smaller) from classes of spin
/// weights, when there are exactly two distinct positive weights.
fn two_weights(ws: &[BigUint]) -> Vec<IsomerInfo> {
    let mut distinct: Vec<&BigUint> = ws.iter().filter(|w| !w.is_zero()).collect();
    distinct.sort();
    distinct.dedup();
    match distinct[..] {
        [small, large] => vec![
            IsomerInfo {
                name: "ortho".into(),
                spin_functions: u64_of(large),
            },
            IsomerInfo {
                name: "para".into(),
                spin_functions: u64_of(small),
            },
        ],
        _ => Vec::new(),
    }
}

/// The tops' isomer descriptions as the species layer names them.
fn infos(list: Vec<crate::models::rotor::IsomerInfo>) -> Vec<IsomerInfo> {
    list.into_iter()
        .map(|i| IsomerInfo {
            name: i.name.to_string(),
            spin_functions: i.spin_functions,
        })
        .collect()
}

/// Keeps the classes whose weight equals `keep`, zeroing the others.
fn keep_weight<const N: usize>(ws: &[BigUint; N], keep: u64) -> [BigUint; N] {
    std::array::from_fn(|i| {
        if u64_of(&ws[i]) == keep {
            ws[i].clone()
        } else {
            BigUint::zero()
        }
    })
}

impl Rotation {
    /// The rotation described by `spec` (kind `rotor`, `top`,
    /// `spherical_top` or `asymmetric_top`).
    pub fn from_spec(spec: &ModelSpec) -> Result<Self> {
        Ok(match spec {
            ModelSpec::Rotor(s) => Rotation::Linear(s.build()?),
            ModelSpec::Top(s) => Rotation::Symmetric(Box::new(s.build()?)),
            ModelSpec::SphericalTop(s) => Rotation::Spherical(s.build()?),
            ModelSpec::AsymmetricTop(s) => Rotation::Asymmetric(Box::new(s.build()?)),
            other => {
                return Err(Error::invalid(
                    "rotation kind",
                    other.kind(),
                    "a polyatomic species rotates as a rotor, top, spherical_top or \
                     asymmetric_top",
                ))
            }
        })
    }

    /// The spin isomers, in the order ortho, para (and others); empty when
    /// the statistics single out none.
    pub fn isomers(&self) -> Vec<IsomerInfo> {
        match self {
            Rotation::Linear(r) => {
                let w = r.weights();
                two_weights(&[w.weight(0).clone(), w.weight(1).clone()])
            }
            Rotation::Asymmetric(t) => two_weights(t.weights()),
            Rotation::Symmetric(t) => infos(t.isomers()),
            Rotation::Spherical(t) => infos(t.isomers()),
        }
    }

    /// The number of nuclear-spin functions of the equivalent nuclei (4 for
    /// water's two protons; 1 without statistics or for spin-0 nuclei).
    pub fn spin_states(&self) -> u64 {
        let iso = self.isomers();
        if !iso.is_empty() {
            return iso.iter().map(|i| i.spin_functions).sum();
        }
        match self {
            Rotation::Linear(r) => {
                let w = r.weights();
                u64_of(w.weight(0).max(w.weight(1)))
            }
            Rotation::Asymmetric(t) => t.weights().iter().map(u64_of).max().unwrap_or(1),
            // Tops without statistics (with them, the isomers above count).
            Rotation::Symmetric(_) | Rotation::Spherical(_) => 1,
        }
    }

    /// The mean spin weight per rotational state at high temperature.
    pub fn mean_weight(&self) -> BigRational {
        let mean = |ws: &[BigUint]| {
            let total: BigUint = ws.iter().sum();
            BigRational::new(total.into(), BigUint::from(ws.len()).into())
        };
        match self {
            Rotation::Linear(r) => {
                let w = r.weights();
                mean(&[w.weight(0).clone(), w.weight(1).clone()])
            }
            Rotation::Asymmetric(t) => mean(t.weights()),
            Rotation::Symmetric(t) => t.mean_spin_weight(),
            Rotation::Spherical(t) => t.mean_spin_weight(),
        }
    }

    /// The symmetry number the statistics imply: spin states over the mean
    /// weight per rotational state.
    pub fn implied_symmetry_number(&self) -> BigRational {
        BigRational::from_integer(self.spin_states().into()) / self.mean_weight()
    }

    /// The rotation as a spectrum, all isomers or the one named.
    pub fn spectrum(&self, isomer: Option<&str>) -> Result<Box<dyn Spectrum + Send + Sync>> {
        let Some(name) = isomer else {
            return Ok(match self {
                Rotation::Linear(r) => Box::new(r.clone()),
                Rotation::Symmetric(t) => Box::new(t.as_ref().clone()),
                Rotation::Spherical(t) => Box::new(t.clone()),
                Rotation::Asymmetric(t) => Box::new(t.as_ref().clone()),
            });
        };
        let info = self.isomers();
        let Some(w) = info.iter().find(|i| i.name == name) else {
            let names: Vec<&str> = info.iter().map(|i| i.name.as_str()).collect();
            return Err(Error::invalid(
                "isomer",
                name,
                &if names.is_empty() {
                    "this molecule has no nuclear-spin isomers".to_string()
                } else {
                    format!("its isomers are {}", names.join(", "))
                },
            ));
        };
        Ok(match self {
            Rotation::Linear(r) => {
                let even = u64_of(r.weights().weight(0)) == w.spin_functions;
                Box::new(r.only_parity(even))
            }
            Rotation::Asymmetric(t) => Box::new(
                t.as_ref()
                    .clone()
                    .with_weights(keep_weight(t.weights(), w.spin_functions))?,
            ),
            Rotation::Symmetric(t) => Box::new(t.as_ref().clone().with_isomer(name)?),
            Rotation::Spherical(t) => Box::new(t.clone().with_isomer(name)?),
        })
    }
}
