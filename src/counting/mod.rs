//! Exact counters that do not list states.

pub mod lattice;
