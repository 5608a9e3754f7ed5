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
//! ## Three entry points
//!
//! **Levels**: every model is a [`spectrum::Spectrum`]; its levels come as a
//! [`level::LevelList`] of exact energies and big-integer degeneracies (the
//! example above). **Counts**: exact numbers of states as [`num_bigint::BigUint`],
//! here the Einstein solid's C(q + N − 1, q) checked against the count of
//! states of three oscillators listed as a product:
//!
//! ```
//! use num_bigint::BigUint;
//! use zsum::microstates::einstein_solid;
//! // 3 oscillators sharing 4 quanta: C(6, 4) = 15 ways (common practice).
//! let ways: BigUint = einstein_solid(3, 4);
//! assert_eq!(ways, BigUint::from(15u32));
//! // Exact integers compose: ways for 4 quanta among 3 + ways for 3 among 3.
//! assert_eq!(ways + einstein_solid(3, 3), BigUint::from(25u32));
//! ```
//!
//! **Certified thermodynamics**: [`sum::thermo`] returns [`sum::Thermo`],
//! each value a [`sum::Certified`] number (MPFR centre and rigorous error
//! radius) a library user computes with. The internal energy of independent
//! parts adds, so the U of two parts from two calls, added in ball
//! arithmetic, must agree with the U of their product within the radii:
//!
//! ```
//! use zsum::exact::parse_rational;
//! use zsum::models::oscillator::HarmonicModes;
//! use zsum::models::product::{Part, Product};
//! use zsum::models::rotor::LinearRotor;
//! use zsum::sum::{thermo, Temperature};
//! use zsum::units::EnergyUnit;
//! let rotor = || LinearRotor::rigid(parse_rational("2.88").unwrap(), EnergyUnit::Kelvin).unwrap();
//! let mode = || HarmonicModes::one_d(parse_rational("3390").unwrap(), false, EnergyUnit::Kelvin).unwrap();
//! let t = Temperature::Kelvin(parse_rational("2000")?);
//! let (a, b) = (thermo(&rotor(), &t, 25)?, thermo(&mode(), &t, 25)?);
//! let both = Product::new(
//!     vec![
//!         Part { name: "rotation".into(), spectrum: Box::new(rotor()) },
//!         Part { name: "vibration".into(), spectrum: Box::new(mode()) },
//!     ],
//!     None,
//! )?;
//! let p = thermo(&both, &t, 25)?;
//! let sum = a.u_over_kt.add(&b.u_over_kt);
//! let gap = rug::Float::with_val(256, sum.value() - p.u_over_kt.value()).abs();
//! let allowed = rug::Float::with_val(256, sum.radius() + p.u_over_kt.radius());
//! assert!(gap <= allowed);
//! // Both are certified to 25 digits, so they print alike.
//! assert_eq!(sum.decimal(20), p.u_over_kt.decimal(20));
//! # Ok::<(), zsum::Error>(())
//! ```
//!
//! ## Modules, from the floor up
//! Each module imports only those listed before it (and `error`, `exact`,
//! `units`, `input` from anywhere); no import circle.
//! - [`error`]: the one error type, with a kind and a message naming the
//!   offending value and what is allowed.
//! - [`exact`]: exact decimal parsing, correctly rounded decimals, digits
//!   defaults.
//! - [`units`]: exact SI constants, energy units and their exact conversions,
//!   quantities with units (lengths, masses, pressures).
//! - [`input`]: reading user files, capped, with short excerpts in messages.
//! - [`serde_exact`]: exact rationals and big integers in serde formats.
//! - [`budget`]: memory and time budgets, estimates checked before work.
//! - [`level`]: [`level::LevelList`], exact and sorted.
//! - [`spectrum`]: the [`spectrum::Spectrum`] trait and the exact description
//!   of a spectrum's structure ([`spectrum::Structure`]).
//! - [`models`]: the models (box, rotors and tops, oscillators, diatomics,
//!   level files, Zeeman multiplets, products of independent parts).
//! - [`system`]: system files (TOML) describing a product of parts.
//! - [`counting`]: exact counts without listing.
//! - [`sum`]: the engine: certified partition functions and thermodynamic
//!   functions as [`sum::Certified`] numbers.
//! - [`thermo`]: temperature grids and certified values in physical units.
//! - [`classical`]: classical limits, error maps and where they fail, in
//!   numbers.
//! - [`species`]: built-in gases and their standard molar functions.
//! - [`assign`]: measured levels with assigned quantum numbers: checked
//!   against a model, and how complete they are for thermodynamics.
//! - [`fit`]: model constants fitted to assigned levels, exactly.
//! - [`microstates`]: collections: Ω(E, N), Q_N, vibrational state counts.
//! - [`report`]: every answer as a serde struct, written from the numbers
//!   above: the only place text is made.
//! - [`export`]: the output formats (table, CSV, Markdown, JSON), atomic
//!   writes.
//! - [`plot`]: figures (SVG, PNG), behind the default `plot` feature.

#![forbid(unsafe_code)]
#![warn(missing_docs)]

pub mod assign;
pub mod budget;
pub mod classical;
pub mod counting;
pub mod error;
pub mod exact;
pub mod export;
pub mod fit;
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
