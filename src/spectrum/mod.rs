//! The [`Spectrum`] trait: anything whose levels can be enumerated exactly.
//!
//! A spectrum describes; it never sums. It knows its natural energy unit,
//! the names of its quantum numbers, how to list its levels up to a cutoff,
//! which states make up a level, and a rigorous upper bound on the number of
//! states up to any energy (the summation engine bounds truncated tails with
//! it). Temperature and floating point never appear here.

mod ladder;
mod structure;
mod summands;

pub use ladder::PolyLadder;
pub use structure::{SphericalLadder, Structure};
pub use summands::Summands;

use crate::error::{Error, Result};
use crate::level::LevelList;
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use serde::{Deserialize, Serialize};

/// One quantum state: the values of the spectrum's quantum numbers, in the
/// order of [`Spectrum::quantum_numbers`].
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(transparent)]
pub struct State(pub Vec<i64>);

pub use crate::budget::{human_bytes, Budget};

/// A quantum system whose levels can be enumerated exactly.
pub trait Spectrum: Send + Sync {
    /// A short human description, e.g. `particle in a 3D box, sides 1:1:2`.
    fn describe(&self) -> String;

    /// The unit of every energy this spectrum produces.
    fn unit(&self) -> EnergyUnit;

    /// Names of the quantum numbers that label a state, in order.
    fn quantum_numbers(&self) -> Vec<String>;

    /// The lowest energy.
    fn ground_energy(&self) -> BigRational;

    /// All levels with energy at most `cutoff`, refusing work beyond
    /// `budget`.
    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList>;

    /// As [`Spectrum::levels_within`], for a sum at `bits` working bits:
    /// every level whose energy is not rational carries an enclosure of
    /// half-width at most `2^−bits` of its energy's magnitude (measured
    /// from zero of the spectrum's energies). Default: `levels_within`
    /// (exact energies need no precision).
    fn levels_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        _bits: u32,
    ) -> Result<LevelList> {
        self.levels_within(cutoff, budget)
    }

    /// The levels of [`Spectrum::levels_within_bits`] in the summation
    /// engine's form, possibly reaching past `cutoff` (the engine keeps
    /// only those at or below it). Default: that listing, converted when
    /// first summed; a caching wrapper shares one conversion between the
    /// temperatures of a sweep.
    fn summands_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
    ) -> Result<std::sync::Arc<Summands>> {
        let list = self.levels_within_bits(cutoff, budget, bits)?;
        Ok(std::sync::Arc::new(Summands::new(std::sync::Arc::new(
            list,
        ))))
    }

    /// All levels with energy at most `cutoff`, within the default budget.
    fn levels_up_to(&self, cutoff: &BigRational) -> Result<LevelList> {
        self.levels_within(cutoff, &Budget::default())
    }

    /// The states that make up the level at `energy`, sorted; empty if no
    /// level lies there.
    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>>;

    /// A rigorous upper bound on the number of states with energy at most
    /// `energy` (never below the true count).
    fn count_bound(&self, energy: &BigRational) -> BigUint;

    /// A rigorous upper bound on the number of states with energy at most
    /// `energy`, for the engine's tail bounds, evaluated many times per
    /// temperature: it may be looser than [`Spectrum::count_bound`] when
    /// that is costly. Default: `count_bound`.
    fn tail_bound(&self, energy: &BigRational) -> BigUint {
        self.count_bound(energy)
    }

    /// Which quantum numbers a [`State`] stores doubled, because they can be
    /// half-integers (spin projections such as m_J = -1/2 are stored as -1).
    /// Default: none.
    fn doubled_numbers(&self) -> Vec<bool> {
        vec![false; self.quantum_numbers().len()]
    }

    /// Labels attached to the level at `energy` (e.g. term symbols from a
    /// level file). Default: none.
    fn labels_at(&self, _energy: &BigRational) -> Vec<String> {
        Vec::new()
    }

    /// Names of the quantum numbers that label a level as a whole (its
    /// term), without the sublevels that share its energy: `J` for a linear
    /// rotor, `v`, `J` for a vibrating rotor, `v` for an anharmonic
    /// oscillator. Default: none (the level listing then has no term
    /// column).
    fn term_numbers(&self) -> Vec<String> {
        Vec::new()
    }

    /// Every term with energy at most `cutoff`, as `(energy, values of
    /// [`Spectrum::term_numbers`])`, in any order, found without listing
    /// sublevels; several terms may share an energy. Default: none.
    fn terms_within(
        &self,
        _cutoff: &BigRational,
        _budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        Ok(Vec::new())
    }

    /// What is known exactly about the spectrum beyond its levels (parts,
    /// square ladders, harmonic modes, rotor ladders, a finite list): the
    /// engine sums by it and the classical layer approximates by it.
    /// Default: nothing ([`Structure::Opaque`]).
    fn structure(&self) -> Structure<'_> {
        Structure::Opaque
    }

    /// The highest level, for spectra with finitely many levels (they are
    /// summed completely, with no tail). Default: none (infinitely many).
    fn highest_energy(&self) -> Option<BigRational> {
        None
    }

    /// An exponent p with N(E₀ + λΔ) ≤ 4 λ^p max(count_bound(E₀ + Δ), 1)
    /// for λ ≥ 1 and Δ beyond the first few levels: how fast the number of
    /// states grows (d/2 for a d-dimensional box, 1 for a linear rotor, 3/2
    /// for tops, n for n oscillator components). The engine bounds the far
    /// tail with it; without it (and without a highest level) a spectrum
    /// cannot be summed.
    fn growth_exponent(&self) -> Option<f64> {
        None
    }

    /// The states up to `cutoff` as J ladders whose energies are a
    /// polynomial in J(J+1) (exactly the states of
    /// [`Spectrum::levels_within`]), for the engine's recurrence along each
    /// ladder; `None` when the spectrum has no such shape. Default: `None`.
    fn poly_ladders(
        &self,
        _cutoff: &BigRational,
        _budget: &Budget,
    ) -> Option<Result<Vec<PolyLadder>>> {
        None
    }

    /// Warnings about the listing up to `cutoff`, e.g. that centrifugal
    /// terms stop the energy increasing so levels end early. Default: none.
    fn warnings(&self, _cutoff: &BigRational) -> Vec<String> {
        Vec::new()
    }
}

/// Refuses a cutoff below the ground level, naming both.
pub fn check_cutoff(s: &dyn Spectrum, cutoff: &BigRational) -> Result<()> {
    let ground = s.ground_energy();
    if cutoff < &ground {
        return Err(Error::invalid(
            "cutoff",
            crate::exact::rational_string(cutoff),
            &format!(
                "it lies below the ground level {} {}; give a cutoff of at least that",
                crate::exact::rational_string(&ground),
                s.unit()
            ),
        ));
    }
    Ok(())
}
