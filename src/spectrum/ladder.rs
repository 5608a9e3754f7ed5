//! J ladders whose energies are a polynomial in J(J+1): the shape of every
//! rotational ladder, told to the summation engine so that it can step
//! along a ladder with an exact recurrence instead of one exponential per
//! level.

use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;

/// The rungs `J = first..=last` of one ladder, with energies
/// `E(J) = Σ_k numerators[k] · [J(J+1)]^k / denominator` (integers over one
/// common denominator, so that the engine steps along the ladder in exact
/// integer arithmetic) and `(2J+1) · weights[J mod 2]` states each (a
/// weight of zero removes the rung).
///
/// A spectrum that offers its ladders ([`super::Spectrum::poly_ladders`])
/// promises that, for a cutoff, its ladders hold exactly the states its
/// level listing holds, and that energy rises with J along each ladder.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PolyLadder {
    /// Numerators of E's coefficients as a polynomial in n = J(J+1),
    /// constant first.
    pub numerators: Vec<BigInt>,
    /// Their common denominator (positive).
    pub denominator: BigInt,
    /// The lowest rung.
    pub first: u64,
    /// The highest rung (at least `first`).
    pub last: u64,
    /// The nuclear-spin weights of even and odd J.
    pub weights: [BigUint; 2],
}

impl PolyLadder {
    /// The numerator of E(J) over [`PolyLadder::denominator`], exactly.
    pub fn numerator(&self, j: u64) -> BigInt {
        let n = BigInt::from(u128::from(j) * (u128::from(j) + 1));
        let mut e = BigInt::from(0);
        for c in self.numerators.iter().rev() {
            e = e * &n + c;
        }
        e
    }

    /// E(J), exactly.
    pub fn energy(&self, j: u64) -> BigRational {
        BigRational::new(self.numerator(j), self.denominator.clone())
    }

    /// The number of states on rung `j`.
    pub fn degeneracy(&self, j: u64) -> BigUint {
        BigUint::from(2 * u128::from(j) + 1) * &self.weights[(j % 2) as usize]
    }

    /// The rungs at or below `cutoff` (energy rises along the ladder, so
    /// they are a prefix), found by bisection on the integer numerators;
    /// `None` when the first rung lies above it.
    pub fn truncated(&self, cutoff: &BigRational) -> Option<PolyLadder> {
        use num_integer::Integer;
        // E(J) ≤ c ⇔ num(J) ≤ ⌊c·den⌋.
        let bound = (cutoff.numer() * &self.denominator).div_floor(cutoff.denom());
        if self.numerator(self.first) > bound {
            return None;
        }
        let (mut lo, mut hi) = (self.first, self.last);
        while lo < hi {
            let mid = lo + (hi - lo).div_ceil(2);
            if self.numerator(mid) <= bound {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        Some(PolyLadder {
            last: lo,
            ..self.clone()
        })
    }
}
