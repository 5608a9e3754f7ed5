//! Quantum models, one file each. Every model is a plain struct with a
//! validating constructor that implements [`crate::spectrum::Spectrum`].

pub mod particle_box;

pub use particle_box::ParticleInBox;
