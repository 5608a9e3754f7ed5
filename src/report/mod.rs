//! Answers: one file per answer, each a serde struct (the schema that
//! JSON, CSV, Markdown and the aligned table all write) with its `Tabular`
//! rendering and the constructor that writes the library's numbers
//! (certified values, exact rationals, big integers) into text. This is the
//! only place text is made from numbers; it stands above every computing
//! module and none of them imports it.

mod assign;
mod census;
mod compare;
mod count;
mod crossover;
mod einstein;
mod ensemble;
#[cfg(feature = "plot")]
pub mod figure;
mod hydrogen;
mod levels;
#[cfg(feature = "plot")]
pub mod liquefier;
mod micro;
mod molar;
mod point;
mod species;
mod spin;
pub mod text;
mod thermo;
pub use assign::{CheckReport, CheckRow, MissingRow};
pub use compare::{ApproxRow, CompareReport, CompareRow, ExactRow, RelErrors};
pub use count::CountReport;
pub use crossover::{CrossingRow, CrossoverReport};
pub use levels::{BoxScale, LevelRow, LevelsReport, ListOptions, PhysicalScale, Quantum};
pub use thermo::{ThermoReport, ThermoRow};

pub use census::{
    CensusErrorMap, CensusErrorRow, CensusReport, CensusRow, RoundedMode, MAX_APPROX_DIGITS,
};
pub use einstein::{EinsteinReport, EinsteinRow};
pub use ensemble::{BoltzmannCrossing, EnsemblePoint, EnsembleReport};
pub use hydrogen::{HydrogenRow, HydrogenTable};
pub use micro::{MicroReport, MicroRow};
pub use molar::{
    basis_name, basis_units, degeneracy_warnings, isomer_name, reference_text, MolarPoint,
    MolarTable,
};
pub use point::ThermoPoint;
pub use species::{ConstantRow, SpeciesCard, SpeciesList, SpeciesSummary};
pub use spin::{RelaxationRow, RelaxationTable, SpinTemperatureReport};

pub use crate::exact::{check_digits, APPROX_DIGITS, DEFAULT_DIGITS};

/// What one listed level costs in memory after it is listed: its row in
/// the answer, its cells in the rendered table or JSON, and its share of
/// the output text (measured: about 500 bytes for a level of a rotor, a box
/// or a multiplet; counted with room).
pub const LISTED_LEVEL_BYTES: f64 = 640.0;

/// What one listed state costs after it is listed: its quantum numbers in
/// the answer and their text (measured: about 100 bytes for two or three
/// numbers).
pub const LISTED_STATE_BYTES: f64 = 160.0;
