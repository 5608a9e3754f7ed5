//! # zsum: exact state counting for statistical mechanics
//!
//! zsum enumerates the quantum states of standard models into exact,
//! degeneracy-weighted level lists: energies are rationals
//! ([`num_rational::BigRational`]) in a stated unit and degeneracies are big
//! integers ([`num_bigint::BigUint`]). Nothing is rounded until a value is
//! printed, and then it is rounded correctly.
//!
//! ```
//! use zsum::models::ParticleInBox;
//! use zsum::spectrum::Spectrum;
//! use zsum::exact::parse_rational;
//!
//! // The cube's levels up to 27 (in units of h^2/(8 m L^2)).
//! let cube = ParticleInBox::cube(3)?;
//! let levels = cube.levels_up_to(&parse_rational("27")?)?;
//! let top = levels.levels().last().unwrap();
//! // 27 = 3²+3²+3² = 1²+1²+5²: one state plus three.
//! assert_eq!(top.energy, parse_rational("27")?);
//! assert_eq!(top.degeneracy, 4u32.into());
//! // The exact number of states up to 10^6 without listing them.
//! let n = cube.count_up_to(&parse_rational("1e6")?)?;
//! assert_eq!(n, cube.levels_up_to(&parse_rational("1e6")?)?.total_states());
//! # Ok::<(), zsum::Error>(())
//! ```
//!
//! ## Layout
//! - [`budget`]: memory and time budgets, estimates checked before work.
//! - [`units`]: exact SI constants and energy units.
//! - [`input`]: reading user files, capped, with short excerpts in messages.
//! - [`level`]: [`level::LevelList`], exact and sorted.
//! - [`spectrum`]: the [`spectrum::Spectrum`] trait.
//! - [`models`]: the models (particle in a box, ...).
//! - [`counting`]: exact counts without listing.
//! - [`sum`]: partition functions and thermodynamic functions, certified.
//! - [`classical`]: classical limits and where they fail.
//! - [`species`]: built-in gases and their standard molar functions.
//! - [`microstates`]: collections: Ω(E, N), Q_N, vibrational state counts.
//! - [`report`]: the result structures that every output format writes.

#![forbid(unsafe_code)]
#![warn(missing_docs)]

pub mod budget;
pub mod classical;
pub mod counting;
pub mod error;
pub mod exact;
pub mod export;
pub mod input;
pub mod level;
pub mod microstates;
pub mod models;
#[cfg(feature = "plot")]
pub mod plot;
pub mod report;
pub mod serde_exact;
pub mod species;
pub mod spectrum;
pub mod sum;
pub mod system;
pub mod thermo;
pub mod units;

pub use error::{Error, ErrorKind, Result};

/// The README's Rust examples, compiled and run as doc tests.
#[doc = include_str!("../README.md")]
#[cfg(doctest)]
pub struct ReadmeDoctests;
