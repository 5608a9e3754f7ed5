//! What is known exactly about a spectrum beyond its level list: its
//! structure. One description serves both readers: the summation engine
//! ([`crate::sum`]) chooses a fast exact path from it, and the classical
//! layer ([`crate::classical`]) builds its approximations from it. A model
//! states what it is; it never sums and never approximates.

use super::Spectrum;
use num_bigint::BigUint;
use num_rational::BigRational;

/// A spherical top's ladder: `E = b J(J+1)` with `(2J+1)²` rotational
/// states per J, each weighing on average `weight` nuclear-spin states (1
/// without statistics; n⁴/12 for four equivalent nuclei of n spin states,
/// an isomer's share with one selected).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SphericalLadder {
    /// The rotational constant B.
    pub b: BigRational,
    /// The mean weight per rotational state (J, K, M).
    pub weight: BigRational,
}

/// The exact structure of a spectrum.
pub enum Structure<'a> {
    /// Nothing beyond the level list: summed level by level, with no
    /// classical limit.
    Opaque,
    /// Finitely many levels: summed level by level, and carried exactly
    /// inside every classical approximation (a finite list has no classical
    /// limit of its own).
    Finite,
    /// `E = Σ_i w_i n_i²` with every `n_i ≥ 1` (a box): independent square
    /// ladders, one weight per axis.
    Squares(Vec<BigRational>),
    /// Harmonic modes `(ω, degeneracy)`, with or without the zero-point
    /// energy.
    Harmonic(Vec<(BigRational, u32)>, bool),
    /// A linear rotor: `E = b J(J+1)` with `(2J+1)·w(J mod 2)` states for
    /// weights `[even, odd]`, exactly so when `rigid`; otherwise with
    /// centrifugal terms beyond it (summed level by level, approximated as
    /// the rigid rotor).
    Rotor {
        /// The rotational constant B.
        b: BigRational,
        /// The nuclear-spin weights of even and odd J.
        weights: [BigUint; 2],
        /// Whether E is exactly b J(J+1).
        rigid: bool,
    },
    /// A symmetric top: `E = b J(J+1) + (u − b) K²`, |K| ≤ J, with the
    /// unique-axis constant `u` (A prolate, C oblate); summed level by level.
    /// With nuclear-spin statistics each (J, K, M) state weighs `weight` on
    /// average (1 without; n³/3 for three equivalent nuclei of n spin
    /// states, both inversion components together), and with an inversion
    /// splitting Δ half of that weight lies Δ higher.
    Top {
        /// The J(J+1) constant B.
        b: BigRational,
        /// The unique-axis constant.
        unique: BigRational,
        /// The mean weight per rotational state (J, K, M).
        weight: BigRational,
        /// The inversion splitting Δ (zero without one).
        inversion: BigRational,
    },
    /// An asymmetric top with constants `a ≥ b ≥ c` and nuclear-spin
    /// weights per rotational symmetry class `[ee, eo, oe, oo]` (parities of
    /// Ka and Kc): levels are eigenvalues, summed level by level from
    /// certified enclosures.
    Asymmetric {
        /// The rotational constants A, B, C.
        abc: [BigRational; 3],
        /// The weights of the four (Ka, Kc) parity classes.
        weights: [BigUint; 4],
    },
    /// A spherical top: `E = b J(J+1)` with `(2J+1)²` rotational states,
    /// each weighing on average the ladder's `weight`; summed level by
    /// level.
    Spherical(SphericalLadder),
    /// Independent parts, each with the size of its unit in the whole's
    /// unit: energies add, so ln q, U, Cv and S add.
    Parts(Vec<(&'a dyn Spectrum, BigRational)>),
    /// Summed level by level; close, at high temperature, to the product of
    /// `parts` (exact structures of their own, each with the size of its
    /// unit) with every energy raised by `shift`: the vibrating rotor is
    /// near a rigid rotor times a harmonic vibration above its ground.
    Near {
        /// The simpler structures it approaches.
        parts: Vec<(Structure<'static>, BigRational)>,
        /// The energy added to all of them.
        shift: BigRational,
    },
}
