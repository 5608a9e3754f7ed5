//! Quantum models, one file each. Every model is a plain struct with a
//! validating constructor that implements [`crate::spectrum::Spectrum`];
//! [`spec`] describes each model kind as data and builds it.

pub mod asym_top;
pub mod asymmetric;
pub mod diatomic;
pub mod level_file;
pub mod open_shell;
pub mod oscillator;
pub mod particle_box;
pub mod product;
pub mod rotor;
pub mod spec;
pub mod spin_species;

pub mod zeeman;

pub use particle_box::ParticleInBox;
pub use spec::ModelSpec;
