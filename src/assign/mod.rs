//! Assigned measured levels: the assignments file, its validation against
//! a model, and the completeness of a measured list for thermodynamics.

pub mod coverage;
