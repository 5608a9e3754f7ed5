//! Assigned measured levels: the assignments file, its validation against
//! a model, and the completeness of a measured list for thermodynamics.

pub mod coverage;
mod file;

pub use file::{Assigned, Assignments, MAX_ASSIGNMENTS_BYTES};
mod check;

pub use check::{check, Check, CheckOptions, Duplicate, GroupCount, Missing, NotAllowed, RowCheck};
