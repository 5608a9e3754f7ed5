//! Exact counters that do not list states.

pub mod arc;
pub mod lattice;
