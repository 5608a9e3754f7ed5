//! The asymmetric top, as certified numbers: the rotational levels of the
//! rigid and of the quartic-distorted (Watson A-reduced) asymmetric rotor,
//! each an exact rational or a rigorous enclosure, labelled J_{Ka,Kc}.
//!
//! This module is the mathematics only (no [`crate::spectrum::Spectrum`]);
//! a spectrum built on it calls [`AsymmetricTopMath::levels_of_j`] per J,
//! [`AsymmetricTopMath::lower_bound`] for its counting bound and
//! [`AsymmetricTopMath::turnover_j`] to know where to stop.
//!
//! # The Hamiltonian
//! In the symmetric-top basis |J,K⟩ with the a axis as z (representation
//! Iʳ), n = J(J+1), constants A ≥ B ≥ C > 0 and the A-reduced quartic
//! constants Δ_J, Δ_JK, Δ_K, δ_J, δ_K (Watson 1967; from memory):
//!
//! ```text
//! ⟨K|H|K⟩   = ((B+C)/2) n + (A − (B+C)/2) K² − Δ_J n² − Δ_JK n K² − Δ_K K⁴
//! ⟨K+2|H|K⟩ = g(J,K) · [ (B−C)/4 − δ_J n − (δ_K/2)((K+2)² + K²) ]
//! g(J,K)    = sqrt[(n − K(K+1))(n − (K+1)(K+2))]
//! ```
//!
//! Wang's combinations (|K⟩ ± |−K⟩)/√2 (Wang 1929; from memory) split each
//! J into four real symmetric tridiagonal blocks ([`Wang`]): E+ (K = 0, 2,
//! …; the K = 0↔2 element times √2), E− (K = 2, 4, …), O+ and O− (K = 1, 3,
//! …; the K = 1 diagonal gets ± n[(B−C)/4 − δ_J n − δ_K], the ⟨J,1|H|J,−1⟩
//! element). Each block is given exactly by its rational diagonal d_i and
//! the *squares* e_i = b_i² of its off-diagonal: only those enter the
//! eigenvalues, so no square root is ever taken.
//!
//! # Labels
//! Within a block the eigenvalues in ascending order take the block's Ka
//! values in ascending order (Ka is K of the prolate limit, where the blocks
//! are diagonal and the order is that of K²). Kc then follows from
//! Ka + Kc ∈ {J, J+1} and the block's Kc parity: E+ → Kc ≡ J, E− → Kc ≡ J+1,
//! O+ → Kc ≡ J+1, O− → Kc ≡ J (mod 2). This reproduces the rigid top's
//! closed forms 1_10 = A+B, 1_11 = A+C, 2_21 = 4A+B+C, 2_11 = A+4B+C,
//! 2_12 = A+B+4C, and `tests/asymmetric_math.rs` checks that for random
//! rigid constants the levels of each J come out in the order of
//! τ = Ka − Kc = −J, …, J (King, Hainer and Cross 1943; from memory).
//!
//! # Certified eigenvalues
//! The number of eigenvalues of a symmetric tridiagonal T below λ is the
//! number of negative pivots of the LDLᵀ factorisation of T − λI,
//! q₁ = d₁ − λ, q_i = (d_i − λ) − e_{i−1}/q_{i−1} (Sylvester's law of
//! inertia; the Sturm-sequence bisection of Barth, Martin and Wilkinson
//! 1967). zsum evaluates the pivots in **MPFR interval arithmetic**: every
//! d_i and e_i is an interval rounded outwards, λ is a dyadic rational held
//! exactly, and every operation rounds its lower end down and its upper end
//! up, so each interval contains the exact pivot. While no interval contains
//! zero the signs, hence the count, are exactly those of the exact pivots.
//! If one does contain zero, the count is redone in exact rational
//! arithmetic as the sign changes of the Sturm sequence
//! p_k(λ) = (d_k − λ) p_{k−1} − e_{k−1} p_{k−2}, which also says exactly
//! whether λ is an eigenvalue (p_m(λ) = 0). This is the simpler of the two
//! rigorous floating-point counts to make airtight: it needs no backward
//! error analysis, only correctly rounded operations, which MPFR guarantees.
//!
//! Counting is the proof; finding is not: each eigenvalue is located in f64
//! (Sturm bisection), polished by Newton's method on det(T − λI) in MPFR,
//! rounded onto a dyadic grid of spacing 2^g, and its enclosure
//! [c·2^g − 2^g, c·2^g + 2^g] is accepted only if the certified counts at
//! its two ends are k and k + 1. Otherwise (or if f64 cannot hold the
//! entries) the eigenvalues are isolated and narrowed by certified bisection
//! alone. A block splits exactly wherever some e_i = 0; a 1×1 block is an
//! exact eigenvalue.
//!
//! # Rational eigenvalues and multiplicities
//! If L is the least common denominator of every d_i and e_i of an
//! unreduced block, L·T has a monic integer characteristic polynomial (its
//! recurrence uses only L d_i and L² e_i), so every rational eigenvalue is
//! an integer over L (rational root theorem). Enclosures are always made
//! narrower than 1/L; the one candidate m/L inside is tested exactly, so
//! every eigenvalue is either [`Energy::Exact`] or *proven irrational*.
//!
//! Eigenvalues of one unreduced block are simple. Two eigenvalues are
//! reported as one level only when proven equal: both exact and equal, or
//! (both irrational, from different blocks) when the gcd over Q of the two
//! blocks' characteristic polynomials changes sign over the intersection of
//! their enclosures — each enclosure isolates its block's eigenvalue and the
//! gcd is squarefree, so that root is the eigenvalue of both; no sign change
//! proves them different. Overlapping enclosures of different values are
//! refined until they separate. What the [`Effort`] does not settle is
//! reported, never guessed ([`Overlap`]).

use crate::error::{Error, Result};
use crate::exact::exact_decimal;
use num_bigint::{BigInt, BigUint, Sign};
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use rayon::prelude::*;
use rug::float::Round;
use rug::integer::Order;
use rug::ops::{AssignRound, SubAssignRound};
use rug::{Assign, Float, Integer, Rational};
use std::cmp::Ordering;
use std::collections::{BTreeSet, HashMap, HashSet};

/// The largest J [`AsymmetricTopMath::levels_of_j`] accepts: its blocks are
/// of size about J/2 and the work grows as J³.
pub const MAX_J: u64 = 4096;

/// The largest block [`joint_spectrum`] accepts.
pub const MAX_BLOCK: usize = 4096;

/// Bits of working precision beyond the grid an enclosure is rounded to.
const GUARD: i64 = 48;

// ---------------------------------------------------------------------------
// Public types
// ---------------------------------------------------------------------------

/// The four Wang blocks of one J.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Wang {
    /// K = 0, 2, 4, … with (|K⟩ + |−K⟩)/√2; Kc ≡ J (mod 2).
    EPlus,
    /// K = 2, 4, … with (|K⟩ − |−K⟩)/√2; Kc ≡ J + 1.
    EMinus,
    /// K = 1, 3, … with (|K⟩ + |−K⟩)/√2; Kc ≡ J + 1.
    OPlus,
    /// K = 1, 3, … with (|K⟩ − |−K⟩)/√2; Kc ≡ J.
    OMinus,
}

impl Wang {
    /// The four blocks, in the order [`AsymmetricTopMath::wang_blocks`]
    /// returns them.
    pub const ALL: [Wang; 4] = [Wang::EPlus, Wang::EMinus, Wang::OPlus, Wang::OMinus];

    /// The K values of this block for J, ascending (also its Ka values).
    pub fn ks(self, j: u64) -> Vec<u64> {
        let first = match self {
            Wang::EPlus => 0,
            Wang::EMinus => 2,
            Wang::OPlus | Wang::OMinus => 1,
        };
        (first..=j).step_by(2).collect()
    }

    /// Kc of the level with this Ka in this block of J: Ka + Kc is J or
    /// J + 1, whichever gives the block's Kc parity.
    pub fn kc(self, j: u64, ka: u64) -> u64 {
        let parity = match self {
            Wang::EPlus | Wang::OMinus => j % 2,
            Wang::EMinus | Wang::OPlus => (j + 1) % 2,
        };
        let kc = j - ka;
        if kc % 2 == parity {
            kc
        } else {
            kc + 1
        }
    }
}

/// A certified value: exact, or an enclosure that provably contains it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Energy {
    /// The value itself.
    Exact(BigRational),
    /// The value lies in [lo, hi] (dyadic ends, lo < hi).
    Enclosed {
        /// Lower end.
        lo: BigRational,
        /// Upper end.
        hi: BigRational,
    },
}

impl Energy {
    /// The lower end (the value, if exact).
    pub fn lo(&self) -> &BigRational {
        match self {
            Energy::Exact(v) => v,
            Energy::Enclosed { lo, .. } => lo,
        }
    }

    /// The upper end (the value, if exact).
    pub fn hi(&self) -> &BigRational {
        match self {
            Energy::Exact(v) => v,
            Energy::Enclosed { hi, .. } => hi,
        }
    }

    /// hi − lo (zero if exact).
    pub fn width(&self) -> BigRational {
        self.hi() - self.lo()
    }

    /// Whether `x` lies in the enclosure (equals the value, if exact).
    pub fn contains(&self, x: &BigRational) -> bool {
        self.lo() <= x && x <= self.hi()
    }

    /// The value, if it is known exactly.
    pub fn exact(&self) -> Option<&BigRational> {
        match self {
            Energy::Exact(v) => Some(v),
            Energy::Enclosed { .. } => None,
        }
    }
}

/// How a level's enclosure stands to the other levels of its list.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Overlap {
    /// Disjoint from every other level's enclosure: order and multiplicity
    /// are certain.
    Isolated,
    /// Overlaps another level's enclosure, but is proven a different value
    /// (the refinement budget ran out before they separated): the
    /// multiplicity is certain, the order between them is not.
    Distinct,
    /// Overlaps another level's enclosure and neither equality nor
    /// difference was proven within the [`Effort`]: listed apart, flagged.
    Undecided,
}

/// How hard the solver tries before it reports an overlap as
/// [`Overlap::Distinct`] or [`Overlap::Undecided`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Effort {
    /// The most bits (relative to a block's largest eigenvalue) an
    /// enclosure is refined to. A width that needs more is refused.
    pub max_bits: u32,
    /// The largest block whose characteristic polynomial enters the exact
    /// gcd equality test; 0 turns the test off.
    pub max_gcd_degree: usize,
}

impl Default for Effort {
    /// 16384 bits and blocks up to 512: far beyond anything a rotational
    /// spectrum up to [`MAX_J`] needs in practice.
    fn default() -> Self {
        Effort {
            max_bits: 16384,
            max_gcd_degree: 512,
        }
    }
}

/// A real symmetric tridiagonal matrix, exactly: its diagonal and the
/// squares of its off-diagonal (`off_squared[i]` = `T[i][i+1]²`, ≥ 0).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Tridiagonal {
    /// d_0, …, d_{m−1}.
    pub diagonal: Vec<BigRational>,
    /// e_0, …, e_{m−2}, e_i = `T[i][i+1]²`.
    pub off_squared: Vec<BigRational>,
}

/// One distinct eigenvalue of a family of blocks ([`joint_spectrum`]).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct JointLevel {
    /// The eigenvalue.
    pub value: Energy,
    /// Which eigenvalues it is: (block, rank within that block ascending,
    /// from 0). More than one when proven equal.
    pub members: Vec<(usize, usize)>,
    /// How its enclosure stands to the others.
    pub overlap: Overlap,
}

/// One state label J_{Ka,Kc} and the block it comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct AsymState {
    /// Ka (K of the prolate limit).
    pub ka: u64,
    /// Kc (K of the oblate limit).
    pub kc: u64,
    /// The Wang block.
    pub block: Wang,
}

impl AsymState {
    /// τ = Ka − Kc, from −J to J.
    pub fn tau(&self) -> i64 {
        self.ka as i64 - self.kc as i64
    }
}

/// One rotational level of J: its energy and the states (Ka, Kc) at it;
/// each state is a (2J+1)-fold M multiplet, left to the caller.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct AsymLevel {
    /// J.
    pub j: u64,
    /// The energy, in the unit of the constants.
    pub value: Energy,
    /// The states at this energy (one, or several proven equal), ordered
    /// by τ.
    pub states: Vec<AsymState>,
    /// How the enclosure stands to the other levels of J.
    pub overlap: Overlap,
}

impl AsymLevel {
    /// The number of (Ka, Kc) states at this level (without the 2J+1 of M).
    pub fn degeneracy(&self) -> usize {
        self.states.len()
    }
}

/// Watson's A-reduced quartic centrifugal-distortion constants, in the unit
/// of the rotational constants (any sign; zero for none).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Quartic {
    /// Δ_J (the −Δ_J n² term).
    pub delta_j: BigRational,
    /// Δ_JK (the −Δ_JK n K² term).
    pub delta_jk: BigRational,
    /// Δ_K (the −Δ_K K⁴ term).
    pub delta_k: BigRational,
    /// δ_J (off-diagonal, −δ_J n).
    pub small_delta_j: BigRational,
    /// δ_K (off-diagonal, −(δ_K/2)((K+2)² + K²)).
    pub small_delta_k: BigRational,
}

/// A rigid or quartic-distorted asymmetric top: the certified computation
/// of its levels.
///
/// ```
/// use zsum::exact::parse_rational;
/// use zsum::models::asymmetric::{AsymmetricTopMath, Energy};
/// let r = |s: &str| parse_rational(s).unwrap();
/// let (a, b, c) = (r("27.8806"), r("14.5218"), r("9.2777"));
/// let top = AsymmetricTopMath::rigid(a.clone(), b.clone(), c.clone())?;
/// let levels = top.levels_of_j(2, &r("1e-30"))?;
/// assert_eq!(levels.len(), 5);
/// let at = |ka, kc| {
///     let l = levels.iter().find(|l| l.states.iter().any(|s| s.ka == ka && s.kc == kc));
///     l.unwrap().value.clone()
/// };
/// // 2_12 is alone in its block: exactly A + B + 4C.
/// assert_eq!(at(1, 2), Energy::Exact(&a + &b + r("4") * &c));
/// // 2_02 and 2_20 are the E+ block's roots: their sum is its trace 4(A+B+C).
/// let (low, high) = (at(0, 2), at(2, 0));
/// let trace = r("4") * (&a + &b + &c);
/// assert!(low.lo() + high.lo() <= trace && trace <= low.hi() + high.hi());
/// assert!(low.width() <= r("1e-30"));
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone, PartialEq)]
pub struct AsymmetricTopMath {
    a: BigRational,
    b: BigRational,
    c: BigRational,
    quartic: Option<Quartic>,
    effort: Effort,
    /// The constants in GMP: (B+C)/2, A − (B+C)/2, (B−C)/4 and the quartic
    /// constants (δ_K halved).
    k: Constants,
}

#[derive(Debug, Clone, PartialEq)]
struct Constants {
    half_bc: Rational,
    a_eff: Rational,
    quarter_bmc: Rational,
    quartic: Option<[Rational; 5]>,
}

/// Refuses constants out of order: C > 0, B ≥ C, A ≥ B.
fn check_order(a: &BigRational, b: &BigRational, c: &BigRational) -> Result<()> {
    let zero = BigRational::zero();
    for (what, v, below, w) in [("C", c, "", &zero), ("B", b, "C", c), ("A", a, "B", b)] {
        let allowed = if below.is_empty() {
            (v <= w).then(|| "it must be greater than zero".to_string())
        } else {
            (v < w).then(|| {
                format!(
                    "an asymmetric top needs A ≥ B ≥ C; here {below} = {}",
                    exact_decimal(w, 30)
                )
            })
        };
        if let Some(allowed) = allowed {
            return Err(Error::invalid(
                &format!("rotational constant {what}"),
                exact_decimal(v, 30),
                &allowed,
            ));
        }
    }
    Ok(())
}

impl AsymmetricTopMath {
    /// A top with rotational constants A ≥ B ≥ C > 0 and, optionally,
    /// quartic distortion constants, all in one energy unit. Refuses a
    /// distortion so large that the levels turn over already at J = 1
    /// ([`AsymmetricTopMath::turnover_j`] = 0).
    pub fn new(
        a: BigRational,
        b: BigRational,
        c: BigRational,
        quartic: Option<Quartic>,
    ) -> Result<Self> {
        check_order(&a, &b, &c)?;
        // All-zero quartic constants are the rigid top.
        let quartic = quartic.filter(|q| {
            [
                &q.delta_j,
                &q.delta_jk,
                &q.delta_k,
                &q.small_delta_j,
                &q.small_delta_k,
            ]
            .iter()
            .any(|x| !x.is_zero())
        });
        let (ra, rb, rc) = (rug_rat(&a), rug_rat(&b), rug_rat(&c));
        let half_bc = Rational::from(&rb + &rc) / 2u32;
        let k = Constants {
            a_eff: Rational::from(&ra - &half_bc),
            quarter_bmc: Rational::from(&rb - &rc) / 4u32,
            half_bc,
            quartic: quartic.as_ref().map(|q| {
                [
                    rug_rat(&q.delta_j),
                    rug_rat(&q.delta_jk),
                    rug_rat(&q.delta_k),
                    rug_rat(&q.small_delta_j),
                    rug_rat(&q.small_delta_k) / 2u32,
                ]
            }),
        };
        let top = AsymmetricTopMath {
            a,
            b,
            c,
            quartic,
            effort: Effort::default(),
            k,
        };
        if let (Some(q), Some((0, which))) = (&top.quartic, top.turnover()) {
            let (what, v) = match which {
                Fold::JLadder => ("centrifugal constant Δ_J", &q.delta_j),
                Fold::KLadder => ("centrifugal constant Δ_K", &q.delta_k),
            };
            return Err(Error::invalid(
                what,
                exact_decimal(v, 30),
                "with the other constants the energy stops increasing (with K, or with J) already \
                 at J = 1; no rotational level beyond J = 0 is meaningful",
            ));
        }
        Ok(top)
    }

    /// A rigid top (no distortion).
    pub fn rigid(a: BigRational, b: BigRational, c: BigRational) -> Result<Self> {
        AsymmetricTopMath::new(a, b, c, None)
    }

    /// The same top with another refinement [`Effort`].
    pub fn with_effort(mut self, effort: Effort) -> Self {
        self.effort = effort;
        self
    }

    /// A, B, C.
    pub fn constants(&self) -> [&BigRational; 3] {
        [&self.a, &self.b, &self.c]
    }

    /// The quartic constants, if any.
    pub fn quartic(&self) -> Option<&Quartic> {
        self.quartic.as_ref()
    }

    /// Ray's asymmetry parameter κ = (2B − A − C)/(A − C): −1 prolate, +1
    /// oblate; `None` for a spherical top (A = C).
    pub fn kappa(&self) -> Option<BigRational> {
        let den = &self.a - &self.c;
        if den.is_zero() {
            return None;
        }
        Some((&self.b * BigRational::from_integer(2.into()) - &self.a - &self.c) / den)
    }

    /// The four Wang blocks of J, exactly, in the order of [`Wang::ALL`]
    /// (an empty block, E− for J < 2 or O± for J = 0, is left out).
    pub fn wang_blocks(&self, j: u64) -> Vec<(Wang, Tridiagonal)> {
        self.blocks(j)
            .into_iter()
            .map(|(w, d, e)| {
                (
                    w,
                    Tridiagonal {
                        diagonal: d.iter().map(big_rat).collect(),
                        off_squared: e.iter().map(big_rat).collect(),
                    },
                )
            })
            .collect()
    }

    /// Every level of J, ascending, each exact or enclosed in an interval no
    /// wider than `width` (an absolute width in the unit of the constants;
    /// for d significant digits pass 10^−(d+2) times a lower bound of the
    /// energies, e.g. 10^−(d+2)·2C for every J ≥ 1). Levels are merged only
    /// when proven equal; the 2J+1 (Ka, Kc) states are all listed.
    pub fn levels_of_j(&self, j: u64, width: &BigRational) -> Result<Vec<AsymLevel>> {
        if j > MAX_J {
            return Err(Error::invalid(
                "the rotational quantum number J",
                j,
                &format!("it must be at most {MAX_J}"),
            ));
        }
        let blocks = self.blocks(j);
        let kinds: Vec<(Wang, Vec<u64>)> = blocks.iter().map(|b| (b.0, b.0.ks(j))).collect();
        let solved = solve(
            blocks.into_iter().map(|(_, d, e)| (d, e)).collect(),
            &check_width(width)?,
            &self.effort,
        )?;
        Ok(solved
            .into_iter()
            .map(|s| {
                let mut states: Vec<AsymState> = s
                    .members
                    .iter()
                    .map(|&(b, rank)| {
                        let (block, ks) = &kinds[b];
                        let (block, ka) = (*block, ks[rank]);
                        AsymState {
                            ka,
                            kc: block.kc(j, ka),
                            block,
                        }
                    })
                    .collect();
                states.sort_by_key(|s| s.tau());
                AsymLevel {
                    j,
                    value: s.value,
                    states,
                    overlap: s.overlap,
                }
            })
            .collect())
    }

    /// The levels of every J from 0 to `j_max`, one list per J, computed on
    /// every core (rayon), each as [`AsymmetricTopMath::levels_of_j`].
    pub fn levels_up_to_j(&self, j_max: u64, width: &BigRational) -> Result<Vec<Vec<AsymLevel>>> {
        (0..=j_max)
            .into_par_iter()
            .map(|j| self.levels_of_j(j, width))
            .collect()
    }

    /// A rigorous lower bound on every level of J. Rigid: C·J(J+1), since
    /// H − C J² = (A−C)J_a² + (B−C)J_b² is positive semidefinite.
    /// Distorted: Gershgorin's bound min_i (d_i − b_{i−1} − b_i) over the
    /// four Wang blocks (whose eigenvalues are those of H), with each
    /// b_i = sqrt(e_i) bounded above by a binary fraction.
    pub fn lower_bound(&self, j: u64) -> BigRational {
        let n = BigRational::from_integer(BigInt::from(j) * BigInt::from(j + 1));
        if self.quartic.is_none() {
            return &self.c * n;
        }
        let mut best: Option<Rational> = None;
        for (_, d, e) in self.blocks(j) {
            let b: Vec<Rational> = e.iter().map(sqrt_above).collect();
            for (i, di) in d.iter().enumerate() {
                let mut v = di.clone();
                if i > 0 {
                    v -= &b[i - 1];
                }
                if i < b.len() {
                    v -= &b[i];
                }
                if best.as_ref().is_none_or(|x| &v < x) {
                    best = Some(v);
                }
            }
        }
        big_rat(&best.unwrap_or_default())
    }

    /// The last J whose levels the quartic expansion describes, or `None`
    /// when it never turns over (always for the rigid top). For every
    /// J ≤ the returned value and J ≥ 1: (i) the diagonal ⟨J,K|H|J,K⟩ (the
    /// prolate-limit energies) increases strictly with K = 0, …, J, so the
    /// Ka ladder has not folded over; and (ii) ⟨J,0|H|J,0⟩ exceeds
    /// ⟨J−1,0|H|J−1,0⟩, i.e. (B+C) > 4Δ_J J². (i) reduces to two
    /// quadratics in J, the steps K = 1 and K = J (the step K−1 → K divided
    /// by 2K−1 is A − (B+C)/2 − Δ_JK n − Δ_K (K² + (K−1)²), linear in
    /// K² + (K−1)²), so the answer is found exactly without listing J.
    /// Past it a caller should stop listing and say so, as
    /// [`crate::models::rotor::SymmetricTop`] does. J beyond 2³² is not
    /// examined.
    pub fn turnover_j(&self) -> Option<u64> {
        self.turnover().map(|(j, _)| j)
    }

    fn turnover(&self) -> Option<(u64, Fold)> {
        let q = self.k.quartic.as_ref()?;
        let [dj, djk, dk, _, _] = q;
        let c0 = Rational::from(&self.k.a_eff - dk);
        let two_dk = Rational::from(dk * 2u32);
        // (i) at K = 1: c0 − Δ_JK J − Δ_JK J².
        let k1 = [c0.clone(), Rational::from(-djk), Rational::from(-djk)];
        // (i) at K = J: c0 + (2Δ_K − Δ_JK) J − (Δ_JK + 2Δ_K) J².
        let kj = [
            c0,
            Rational::from(&two_dk - djk),
            -Rational::from(djk + &two_dk),
        ];
        // (ii): (B + C) − 4 Δ_J J².
        let jl = [
            Rational::from(&self.k.half_bc * 2u32),
            Rational::new(),
            Rational::from(dj * -4i32),
        ];
        [
            (first_nonpositive(&k1), Fold::KLadder),
            (first_nonpositive(&kj), Fold::KLadder),
            (first_nonpositive(&jl), Fold::JLadder),
        ]
        .into_iter()
        .filter_map(|(f, w)| f.map(|f| (f - 1, w)))
        .min_by_key(|x| x.0)
    }

    /// The Wang blocks of J in GMP rationals.
    fn blocks(&self, j: u64) -> Vec<(Wang, Vec<Rational>, Vec<Rational>)> {
        let k = &self.k;
        let n = Integer::from(j) * (j + 1);
        let nr = Rational::from(&n);
        let diag = |kk: u64| {
            let k2 = Rational::from(kk * kk);
            let mut v = Rational::from(&k.half_bc * &nr);
            v += Rational::from(&k.a_eff * &k2);
            if let Some([dj, djk, dk, _, _]) = &k.quartic {
                v -= Rational::from(dj * &nr) * &nr;
                v -= Rational::from(djk * &nr) * &k2;
                v -= Rational::from(dk * &k2) * &k2;
            }
            v
        };
        // The bracket of ⟨K+2|H|K⟩ (K may be −1).
        let bracket = |kk: i64| {
            let mut v = k.quarter_bmc.clone();
            if let Some([_, _, _, sdj, sdk_half]) = &k.quartic {
                v -= Rational::from(sdj * &nr);
                v -= Rational::from(sdk_half * ((kk + 2) * (kk + 2) + kk * kk));
            }
            v
        };
        let off_sq = |kk: u64| {
            let g2 =
                (Integer::from(&n) - kk * (kk + 1)) * (Integer::from(&n) - (kk + 1) * (kk + 2));
            let f = bracket(kk as i64);
            Rational::from(&f * &f) * g2
        };
        Wang::ALL
            .into_iter()
            .filter_map(|w| {
                let ks = w.ks(j);
                if ks.is_empty() {
                    return None;
                }
                let mut d: Vec<Rational> = ks.iter().map(|&kk| diag(kk)).collect();
                let mut e: Vec<Rational> =
                    ks[..ks.len() - 1].iter().map(|&kk| off_sq(kk)).collect();
                match w {
                    Wang::EPlus if !e.is_empty() => e[0] *= 2u32,
                    Wang::OPlus => d[0] += Rational::from(&bracket(-1) * &nr),
                    Wang::OMinus => d[0] -= Rational::from(&bracket(-1) * &nr),
                    _ => {}
                }
                Some((w, d, e))
            })
            .collect()
    }
}

/// Which ladder folds over first ([`AsymmetricTopMath::turnover_j`]).
#[derive(Debug, Clone, Copy)]
enum Fold {
    KLadder,
    JLadder,
}

/// The smallest integer J in 1..=2³² with c₀ + c₁J + c₂J² ≤ 0, exactly: the
/// quadratic is monotone on each side of its vertex, so each side is one
/// check (increasing) or an exponential-then-binary search (decreasing).
fn first_nonpositive(c: &[Rational; 3]) -> Option<u64> {
    const TOP: u64 = 1 << 32;
    let p = |j: u64| {
        let x = Rational::from(j);
        let mut v = Rational::from(&c[2] * &x);
        v += &c[1];
        v *= &x;
        v += &c[0];
        v.cmp0() != Ordering::Greater
    };
    // Pieces (start, end, increasing).
    let mut pieces: Vec<(u64, u64, bool)> = Vec::new();
    if c[2].is_zero() {
        pieces.push((1, TOP, c[1].cmp0() != Ordering::Less));
    } else {
        // Vertex v = −c₁/(2c₂); floor, clamped to [0, TOP].
        let v = Rational::from(-&c[1]) / Rational::from(&c[2] * 2u32);
        let fl = Integer::from(v.floor_ref());
        let fl = fl
            .to_u64()
            .unwrap_or(if fl.is_negative() { 0 } else { TOP })
            .min(TOP);
        let convex = c[2].is_positive();
        if fl >= 1 {
            pieces.push((1, fl, !convex));
        }
        if fl < TOP {
            pieces.push(((fl + 1).max(1), TOP, convex));
        }
    }
    for (start, end, increasing) in pieces {
        if increasing {
            if p(start) {
                return Some(start);
            }
            continue;
        }
        // Decreasing: the first failure, if any, by doubling then halving.
        if !p(end) {
            continue;
        }
        let (mut lo, mut hi) = (start, start);
        while !p(hi) {
            lo = hi;
            hi = (hi.saturating_mul(2)).min(end);
        }
        if p(lo) {
            return Some(lo);
        }
        while hi - lo > 1 {
            let mid = lo + (hi - lo) / 2;
            if p(mid) {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        return Some(hi);
    }
    None
}

/// Certified eigenvalues of a family of symmetric tridiagonal blocks
/// considered together: every eigenvalue of every block, ascending, exact or
/// enclosed in an interval no wider than `width`, equal eigenvalues of
/// different blocks merged only when proven equal (see the module docs).
///
/// ```
/// use zsum::exact::parse_rational;
/// use zsum::models::asymmetric::{joint_spectrum, Effort, Overlap, Tridiagonal};
/// let r = |s: &str| parse_rational(s).unwrap();
/// // [[0,1],[1,1]] and [[1,1],[1,0]] share (1 ± √5)/2; [[2]] is exact.
/// let t = |d: [&str; 2]| Tridiagonal { diagonal: vec![r(d[0]), r(d[1])], off_squared: vec![r("1")] };
/// let one = Tridiagonal { diagonal: vec![r("2")], off_squared: vec![] };
/// let levels = joint_spectrum(&[t(["0", "1"]), t(["1", "0"]), one], &r("1e-20"), &Effort::default())?;
/// assert_eq!(levels.len(), 3);
/// assert_eq!(levels[0].members, vec![(0, 0), (1, 0)]);
/// // The golden ratio φ = (1 + √5)/2 satisfies φ² = φ + 1.
/// let phi = &levels[1].value;
/// assert!(phi.lo() * phi.lo() < phi.hi() + r("1") && phi.lo() + r("1") < phi.hi() * phi.hi());
/// assert!(levels.iter().all(|l| l.overlap == Overlap::Isolated));
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn joint_spectrum(
    blocks: &[Tridiagonal],
    width: &BigRational,
    effort: &Effort,
) -> Result<Vec<JointLevel>> {
    let mut rug_blocks = Vec::with_capacity(blocks.len());
    for (i, b) in blocks.iter().enumerate() {
        let m = b.diagonal.len();
        if m > MAX_BLOCK {
            return Err(Error::invalid(
                "the size of a block",
                m,
                &format!("it must be at most {MAX_BLOCK}"),
            ));
        }
        if b.off_squared.len() + 1 != m.max(1) {
            return Err(Error::invalid(
                "the number of squared off-diagonal entries",
                b.off_squared.len(),
                &format!("block {i} has {m} diagonal entries, so it needs one fewer"),
            ));
        }
        if let Some(e) = b.off_squared.iter().find(|e| e.is_negative()) {
            return Err(Error::invalid(
                "a squared off-diagonal entry",
                exact_decimal(e, 30),
                "it is a square, so it must be zero or positive",
            ));
        }
        rug_blocks.push((
            b.diagonal.iter().map(rug_rat).collect(),
            b.off_squared.iter().map(rug_rat).collect(),
        ));
    }
    Ok(solve(rug_blocks, &check_width(width)?, effort)?
        .into_iter()
        .map(|s| JointLevel {
            value: s.value,
            members: s.members,
            overlap: s.overlap,
        })
        .collect())
}

fn check_width(width: &BigRational) -> Result<Rational> {
    if !width.is_positive() {
        return Err(Error::invalid(
            "the enclosure width",
            exact_decimal(width, 30),
            "it must be greater than zero",
        ));
    }
    Ok(rug_rat(width))
}

// ---------------------------------------------------------------------------
// Conversions
// ---------------------------------------------------------------------------

fn rug_int(b: &BigInt) -> Integer {
    let i = Integer::from_digits(&b.magnitude().to_u32_digits(), Order::Lsf);
    if b.is_negative() {
        -i
    } else {
        i
    }
}

fn rug_rat(r: &BigRational) -> Rational {
    Rational::from((rug_int(r.numer()), rug_int(r.denom())))
}

fn big_int(i: &Integer) -> BigInt {
    let sign = if i.is_negative() {
        Sign::Minus
    } else {
        Sign::Plus
    };
    BigInt::from_biguint(sign, BigUint::new(i.to_digits::<u32>(Order::Lsf)))
}

fn big_rat(r: &Rational) -> BigRational {
    // GMP keeps rationals reduced with a positive denominator.
    BigRational::new_raw(big_int(r.numer()), big_int(r.denom()))
}

/// A binary fraction at or above sqrt(x), x ≥ 0 (32 fractional bits).
fn sqrt_above(x: &Rational) -> Rational {
    let scaled = Integer::from(Rational::from(x << 64u32).ceil_ref());
    let (mut r, rem) = scaled.sqrt_rem(Integer::new());
    if !rem.is_zero() {
        r += 1u32;
    }
    Rational::from((r, Integer::from(1u32) << 32u32))
}

/// An i64 exponent as the i32 MPFR shifts take (clamped far beyond any
/// exponent reached here).
fn sh(e: i64) -> i32 {
    e.clamp(-(1 << 30), 1 << 30) as i32
}

fn pow2(e: i64) -> Float {
    Float::with_val(2, 1u32) << sh(e)
}

/// x + 2^e exactly, for x a multiple of 2^e with |x| < 2^mag.
fn dyadic_add(x: &Float, e: i64, mag: i64) -> Float {
    let step = pow2(e);
    let prec = (mag - e + 4).max(8) as u32;
    let (f, o) = Float::with_val_round(prec, x + &step, Round::Nearest);
    debug_assert_eq!(o, Ordering::Equal);
    f
}

fn exact(x: &Float) -> Rational {
    x.to_rational().expect("enclosure ends are finite")
}

// ---------------------------------------------------------------------------
// One unreduced block
// ---------------------------------------------------------------------------

/// The entries of a block as MPFR intervals at one precision, rounded
/// outwards.
struct Mp {
    prec: u32,
    dlo: Vec<Float>,
    dhi: Vec<Float>,
    elo: Vec<Float>,
    ehi: Vec<Float>,
}

impl Mp {
    fn new(prec: u32, d: &[Rational], e: &[Rational]) -> Mp {
        let side = |v: &[Rational], r: Round| {
            v.iter()
                .map(|x| Float::with_val_round(prec, x, r).0)
                .collect()
        };
        Mp {
            prec,
            dlo: side(d, Round::Down),
            dhi: side(d, Round::Up),
            elo: side(e, Round::Down),
            ehi: side(e, Round::Up),
        }
    }
}

/// An unreduced block (every e_i > 0) of one input block.
struct Sub {
    block: usize,
    d: Vec<Rational>,
    e: Vec<Rational>,
    /// L: every rational eigenvalue is an integer over L.
    scale: Integer,
    /// Every eigenvalue lies in (−2^mag, 2^mag).
    mag: i64,
    mp: Mp,
}

impl Sub {
    fn new(block: usize, d: Vec<Rational>, e: Vec<Rational>) -> Sub {
        let mut scale = Integer::from(1u32);
        for r in d.iter().chain(&e) {
            scale.lcm_mut(r.denom());
        }
        // Gershgorin: |λ| ≤ max_i |d_i| + b_{i−1} + b_i.
        let b: Vec<Rational> = e.iter().map(sqrt_above).collect();
        let mut radius = Rational::new();
        for (i, di) in d.iter().enumerate() {
            let mut v = Rational::from(di.abs_ref());
            if i > 0 {
                v += &b[i - 1];
            }
            if i < b.len() {
                v += &b[i];
            }
            if v > radius {
                radius = v;
            }
        }
        // |λ| ≤ radius < 2^mag.
        let mag = if radius.is_zero() {
            0
        } else {
            floor_log2(&radius) + 1
        };
        Sub {
            block,
            d,
            e,
            scale,
            mag,
            mp: Mp::new(0, &[], &[]),
        }
    }

    fn len(&self) -> usize {
        self.d.len()
    }

    fn prec_for(&self, gexp: i64) -> u32 {
        (self.mag - gexp + GUARD).clamp(64, 1 << 24) as u32
    }

    fn ensure(&mut self, prec: u32) {
        if self.mp.prec < prec {
            self.mp = Mp::new(prec, &self.d, &self.e);
        }
    }

    /// The number of eigenvalues below x (x exact), certified: interval
    /// pivots, or the exact Sturm count when an interval meets zero.
    fn count(&self, x: &Float) -> usize {
        let mp = &self.mp;
        let p = mp.prec;
        let (mut qlo, mut qhi, mut tlo, mut thi) =
            (Float::new(p), Float::new(p), Float::new(p), Float::new(p));
        let mut neg = 0;
        for i in 0..self.len() {
            if i > 0 {
                // t = e_{i−1}/q_{i−1}, q_{i−1} of one sign.
                if qlo.is_sign_positive() {
                    tlo.assign_round(&mp.elo[i - 1] / &qhi, Round::Down);
                    thi.assign_round(&mp.ehi[i - 1] / &qlo, Round::Up);
                } else {
                    tlo.assign_round(&mp.ehi[i - 1] / &qhi, Round::Down);
                    thi.assign_round(&mp.elo[i - 1] / &qlo, Round::Up);
                }
            }
            qlo.assign_round(&mp.dlo[i] - x, Round::Down);
            qhi.assign_round(&mp.dhi[i] - x, Round::Up);
            if i > 0 {
                qlo.sub_assign_round(&thi, Round::Down);
                qhi.sub_assign_round(&tlo, Round::Up);
            }
            if qlo <= 0 && qhi >= 0 {
                return self.sturm(&exact(x)).0;
            }
            if qhi < 0 {
                neg += 1;
            }
        }
        neg
    }

    /// Exactly: the number of eigenvalues below x (the sign changes of
    /// p_0 = 1, p_1, …, p_m skipping zeros; a zero p_k, k < m, has
    /// neighbours of opposite signs in an unreduced block) and whether x is
    /// an eigenvalue (p_m(x) = 0).
    fn sturm(&self, x: &Rational) -> (usize, bool) {
        let mut prev = Rational::from(1u32);
        let mut cur = Rational::from(&self.d[0] - x);
        let mut changes = 0;
        let mut last = Ordering::Greater;
        let mut note = |v: &Rational, changes: &mut usize| {
            let s = v.cmp0();
            if s != Ordering::Equal {
                if s != last {
                    *changes += 1;
                }
                last = s;
            }
        };
        note(&cur, &mut changes);
        for k in 1..self.len() {
            let mut next = Rational::from(&self.d[k] - x);
            next *= &cur;
            next -= Rational::from(&self.e[k - 1] * &prev);
            prev = std::mem::replace(&mut cur, next);
            note(&cur, &mut changes);
        }
        (changes, cur.is_zero())
    }

    /// Newton's method on det(T − xI) = Π q_i, whose logarithmic derivative
    /// is Σ q_i'/q_i with q_i' = −1 + (e_{i−1}/q_{i−1}) q_{i−1}'/q_{i−1} (one
    /// division per pivot: u = 1/q_i), at the working precision. It stops
    /// when the step is below 2^(gexp−8), or, if `lax`, already when the
    /// step s is small enough that the next one, about s²/gap, would be, for
    /// a gap to the nearest other eigenvalue or pole of at least 2^(mag−24).
    /// Only a guess: what it returns is certified by counts, or discarded.
    fn newton(&self, start: &Float, gexp: i64, lax: bool) -> Float {
        let mp = &self.mp;
        let p = mp.prec;
        let m = self.len();
        let mut x = Float::with_val(p, start);
        let tol = pow2(gexp - 8);
        let done = if lax {
            pow2((gexp - 8 + self.mag - 24).div_euclid(2))
        } else {
            tol.clone()
        };
        let (mut q, mut dq, mut u, mut r, mut s) = (
            Float::new(p),
            Float::new(p),
            Float::new(p),
            Float::new(p),
            Float::new(p),
        );
        for _ in 0..64 {
            let mut zero_at = None;
            q.assign(&mp.dlo[0] - &x);
            dq.assign(-1i32);
            s.assign(0u32);
            for i in 0..m {
                if i > 0 {
                    // u = 1/q_{i−1}: r = e u, q_i' = −1 + r q_{i−1}' u.
                    r.assign(&mp.elo[i - 1] * &u);
                    dq *= &r;
                    dq *= &u;
                    dq -= 1u32;
                    q.assign(&mp.dlo[i] - &x);
                    q -= &r;
                }
                if q.is_zero() {
                    zero_at = Some(i);
                    break;
                }
                u.assign(q.recip_ref());
                r.assign(&dq * &u);
                s += &r;
            }
            match zero_at {
                Some(i) if i + 1 == m => return x,
                Some(_) => {
                    x += &tol;
                    continue;
                }
                None => {}
            }
            s.recip_mut();
            x -= &s;
            if !s.is_finite() || s.cmp_abs(&done) != Some(Ordering::Greater) {
                break;
            }
        }
        x
    }

    /// Eigenvalue k enclosed in [c·2^g − 2^g, c·2^g + 2^g] around Newton's
    /// answer from `start` (lax, then strict), if the certified counts
    /// confirm it: returns the lower end and log2 of the width.
    fn enclose(&mut self, k: usize, start: &Float, gexp: i64) -> Option<(Float, i64)> {
        self.ensure(self.prec_for(gexp));
        let lax = self.newton(start, gexp, true);
        self.confirm(k, &lax, gexp).or_else(|| {
            let strict = self.newton(&lax, gexp, false);
            self.confirm(k, &strict, gexp)
        })
    }

    /// The grid enclosure [c·2^g − 2^g, c·2^g + 2^g] around x, c = round(x/2^g),
    /// if the certified counts at its ends are k and k + 1.
    fn confirm(&self, k: usize, x: &Float, gexp: i64) -> Option<(Float, i64)> {
        if !x.is_finite() {
            return None;
        }
        let c = Float::with_val(x.prec(), x >> sh(gexp)).to_integer()?;
        let at = |i: Integer| {
            let mut f = Float::with_val(i.significant_bits().max(2), &i);
            f <<= sh(gexp);
            f
        };
        let lo = at(Integer::from(&c - 1u32));
        let hi = at(c + 1u32);
        (self.count(&lo) == k && self.count(&hi) == k + 1).then_some((lo, gexp + 1))
    }

    /// Narrows the isolating interval [lo, lo + 2^w) of eigenvalue k by
    /// certified bisection until its width is at most 2^(gexp+1).
    fn bisect(&self, k: usize, mut lo: Float, mut w: i64, until: i64) -> (Float, i64) {
        while w > until {
            let mid = dyadic_add(&lo, w - 1, self.mag);
            if self.count(&mid) <= k {
                lo = mid;
            }
            w -= 1;
        }
        (lo, w)
    }

    /// From an isolating interval of eigenvalue k to one of width at most
    /// 2^(gexp+1): bisection to about 60 bits, Newton, and bisection to the
    /// end if Newton's enclosure is not confirmed.
    fn settle(&mut self, k: usize, lo: Float, w: i64, gexp: i64) -> (Float, i64) {
        self.ensure(self.prec_for(gexp));
        if w <= gexp + 1 {
            return (lo, w);
        }
        let (lo, w) = self.bisect(k, lo, w, (self.mag - 60).max(gexp + 1));
        let mid = dyadic_add(&lo, w - 1, self.mag);
        if let Some(found) = self.enclose(k, &mid, gexp) {
            return found;
        }
        self.bisect(k, lo, w, gexp + 1)
    }

    /// Isolating intervals [lo, lo + 2^w) of every eigenvalue by certified
    /// bisection of (−2^mag, 2^mag).
    fn isolate(&self, max_bits: i64) -> Result<Vec<(Float, i64)>> {
        let m = self.len();
        let mut out: Vec<Option<(Float, i64)>> = vec![None; m];
        let mut stack = vec![(-pow2(self.mag), self.mag + 1, 0usize, m)];
        while let Some((lo, w, ca, cb)) = stack.pop() {
            match cb - ca {
                0 => {}
                1 => out[ca] = Some((lo, w)),
                _ => {
                    if self.mag - w > max_bits {
                        return Err(Error::budget(format!(
                            "two eigenvalues of one block lie closer than 2^-{max_bits} of its \
                             scale; raise the effort limit (max bits) to separate them"
                        )));
                    }
                    let mid = dyadic_add(&lo, w - 1, self.mag);
                    let cm = self.count(&mid);
                    stack.push((lo, w - 1, ca, cm));
                    stack.push((mid, w - 1, cm, cb));
                }
            }
        }
        Ok(out
            .into_iter()
            .map(|x| x.expect("bisection isolates every eigenvalue"))
            .collect())
    }

    /// Every eigenvalue in f64, by Sturm bisection (a guess for Newton);
    /// `None` if f64 cannot hold the entries.
    fn approx(&self) -> Option<Vec<f64>> {
        let d: Vec<f64> = self.d.iter().map(Rational::to_f64).collect();
        let e: Vec<f64> = self.e.iter().map(Rational::to_f64).collect();
        let m = d.len();
        let mut radius = 0f64;
        for i in 0..m {
            let left = if i > 0 { e[i - 1].sqrt() } else { 0.0 };
            let right = if i + 1 < m { e[i].sqrt() } else { 0.0 };
            radius = radius.max(d[i].abs() + left + right);
        }
        let radius = radius * (1.0 + 1e-9) + 1e-300;
        if !radius.is_finite() || e.iter().any(|x| !x.is_finite()) {
            return None;
        }
        let below = |x: f64| {
            let mut q = 1.0;
            let mut neg = 0;
            for i in 0..m {
                q = if i == 0 {
                    d[0] - x
                } else {
                    d[i] - x - e[i - 1] / q
                };
                if q == 0.0 {
                    q = -f64::MIN_POSITIVE;
                }
                if q < 0.0 {
                    neg += 1;
                }
            }
            neg
        };
        // Newton on Σ q_i'/q_i in f64, kept inside the bracket.
        let newton = |mut x: f64, lo: f64, hi: f64| {
            for _ in 0..4 {
                let (mut q, mut dq, mut s) = (1.0f64, 0.0f64, 0.0f64);
                for i in 0..m {
                    let r = if i == 0 { 0.0 } else { e[i - 1] / q };
                    dq = if i == 0 { -1.0 } else { -1.0 + r * dq / q };
                    q = d[i] - x - r;
                    s += dq / q;
                }
                let next = x - 1.0 / s;
                if !(next > lo && next < hi) {
                    break;
                }
                x = next;
            }
            x
        };
        // Bisection to about 20 bits, every count narrowing the brackets of
        // all eigenvalues still to come, then Newton.
        let (mut lo, mut hi) = (vec![-radius; m], vec![radius; m]);
        Some(
            (0..m)
                .map(|k| {
                    for _ in 0..2200 {
                        let (l, h) = (lo[k], hi[k]);
                        let mid = 0.5 * (l + h);
                        if mid <= l || mid >= h || h - l < 1e-6 * l.abs().max(h.abs()) {
                            break;
                        }
                        let c = below(mid);
                        for i in k..m {
                            if i < c {
                                hi[i] = hi[i].min(mid);
                            } else {
                                lo[i] = lo[i].max(mid);
                            }
                        }
                    }
                    newton(0.5 * (lo[k] + hi[k]), lo[k], hi[k])
                })
                .collect(),
        )
    }

    /// Every eigenvalue enclosed to width 2^(gexp+1): Newton from the f64
    /// guesses, certified; where any fails, isolation and bisection.
    fn initial(&mut self, gexp: i64, max_bits: i64) -> Result<Vec<(Float, i64)>> {
        let m = self.len();
        self.ensure(self.prec_for(gexp));
        if let Some(guess) = self.approx() {
            let mut out = Vec::with_capacity(m);
            for (k, g) in guess.iter().enumerate() {
                match self.enclose(k, &Float::with_val(53, *g), gexp) {
                    Some(x) => out.push(x),
                    None => break,
                }
            }
            if out.len() == m {
                return Ok(out);
            }
        }
        let iso = self.isolate(max_bits)?;
        Ok(iso
            .into_iter()
            .enumerate()
            .map(|(k, (lo, w))| self.settle(k, lo, w, gexp))
            .collect())
    }

    /// The eigenvalue of an enclosure exactly, if it is rational: the one
    /// integer-over-L candidate in it (it is narrower than 1/L), tested
    /// exactly. The counts place the eigenvalue in [lo, hi) (hi itself may
    /// be the next eigenvalue), so a candidate equal to hi is not it.
    fn rational_root(&self, lo: &Rational, hi: &Rational) -> Option<Rational> {
        let c = Integer::from(Rational::from(hi * &self.scale).floor_ref());
        let x = Rational::from((c, self.scale.clone()));
        (&x >= lo && &x < hi && self.sturm(&x).1).then_some(x)
    }

    /// The characteristic polynomial of s·T in μ (integer, monic; index =
    /// power): P_k = (μ − s d_k) P_{k−1} − s² e_{k−1} P_{k−2}. `s` must be a
    /// multiple of L.
    fn charpoly(&self, s: &Integer) -> Vec<Integer> {
        let int = |r: Rational| {
            let (n, d) = r.into_numer_denom();
            debug_assert_eq!(d, 1);
            n
        };
        let s2 = Integer::from(s * s);
        let mut prev = vec![Integer::from(1u32)];
        let mut cur = vec![Integer::new(), Integer::from(1u32)];
        cur[0] = -int(Rational::from(&self.d[0] * s));
        for k in 1..self.len() {
            let sd = int(Rational::from(&self.d[k] * s));
            let se = int(Rational::from(&self.e[k - 1] * &s2));
            let mut next = vec![Integer::new(); cur.len() + 1];
            for (i, c) in cur.iter().enumerate() {
                next[i + 1] += c;
                next[i] -= Integer::from(&sd * c);
            }
            for (i, c) in prev.iter().enumerate() {
                next[i] -= Integer::from(&se * c);
            }
            prev = std::mem::replace(&mut cur, next);
        }
        cur
    }
}

// ---------------------------------------------------------------------------
// Integer polynomials (the exact equality test)
// ---------------------------------------------------------------------------

fn trim(p: &mut Vec<Integer>) {
    while p.len() > 1 && p.last().is_some_and(Integer::is_zero) {
        p.pop();
    }
}

fn is_zero_poly(p: &[Integer]) -> bool {
    p.iter().all(Integer::is_zero)
}

/// Divides out the content and makes the leading coefficient positive.
fn primitive(p: &mut [Integer]) {
    let mut g = Integer::new();
    for c in p.iter() {
        g.gcd_mut(c);
    }
    if g.is_zero() {
        return;
    }
    if p.last().is_some_and(Integer::is_negative) {
        g = -g;
    }
    for c in p.iter_mut() {
        c.div_exact_mut(&g);
    }
}

/// The pseudo-remainder of a by b (b ≠ 0).
fn prem(a: &[Integer], b: &[Integer]) -> Vec<Integer> {
    let db = b.len() - 1;
    let lb = &b[db];
    let mut r = a.to_vec();
    trim(&mut r);
    while r.len() > db && !is_zero_poly(&r) {
        let dr = r.len() - 1;
        let lr = r[dr].clone();
        for c in r.iter_mut() {
            *c *= lb;
        }
        for (i, bc) in b.iter().enumerate() {
            r[i + dr - db] -= Integer::from(&lr * bc);
        }
        r.pop();
        trim(&mut r);
    }
    r
}

/// gcd over Q of two non-zero integer polynomials, primitive (primitive
/// pseudo-remainder sequence).
fn poly_gcd(mut a: Vec<Integer>, mut b: Vec<Integer>) -> Vec<Integer> {
    primitive(&mut a);
    primitive(&mut b);
    if a.len() < b.len() {
        std::mem::swap(&mut a, &mut b);
    }
    while !is_zero_poly(&b) {
        let mut r = prem(&a, &b);
        primitive(&mut r);
        a = std::mem::replace(&mut b, r);
    }
    a
}

/// The sign of p(x), exactly.
fn sign_at(p: &[Integer], x: &Rational) -> Ordering {
    let mut v = Rational::new();
    for c in p.iter().rev() {
        v *= x;
        v += c;
    }
    v.cmp0()
}

// ---------------------------------------------------------------------------
// The joint solver
// ---------------------------------------------------------------------------

/// One eigenvalue of one unreduced block and what is known of it.
struct Item {
    sub: usize,
    /// Its rank within the unreduced block.
    k: usize,
    /// Exact value (lo = hi), or a dyadic enclosure [lo, lo + 2^w].
    lo: Rational,
    hi: Rational,
    exact: bool,
    lo_f: Float,
    w: i64,
    /// Bits (relative to the block's scale) at the first enclosure.
    b0: i64,
}

impl Item {
    fn enclosed(sub: usize, k: usize, lo_f: Float, w: i64, b0: i64) -> Item {
        let lo = exact(&lo_f);
        let hi = Rational::from(&lo + &exact(&pow2(w)));
        Item {
            sub,
            k,
            lo,
            hi,
            exact: false,
            lo_f,
            w,
            b0,
        }
    }

    fn exact_value(sub: usize, k: usize, v: Rational) -> Item {
        Item {
            sub,
            k,
            lo: v.clone(),
            hi: v,
            exact: true,
            lo_f: Float::new(2),
            w: 0,
            b0: 0,
        }
    }

    fn bits(&self, subs: &[Sub]) -> i64 {
        if self.exact {
            i64::MAX
        } else {
            subs[self.sub].mag - (self.w - 1)
        }
    }
}

/// A solved level before conversion to a public type.
struct Solved {
    value: Energy,
    members: Vec<(usize, usize)>,
    overlap: Overlap,
}

/// Splits the blocks where e_i = 0, encloses every eigenvalue, settles the
/// overlaps and ranks every eigenvalue within its block.
fn solve(
    blocks: Vec<(Vec<Rational>, Vec<Rational>)>,
    width: &Rational,
    effort: &Effort,
) -> Result<Vec<Solved>> {
    let nblocks = blocks.len();
    let mut subs = Vec::new();
    for (b, (d, e)) in blocks.into_iter().enumerate() {
        let mut start = 0;
        for i in 0..d.len() {
            if i + 1 == d.len() || e[i].is_zero() {
                subs.push(Sub::new(b, d[start..=i].to_vec(), e[start..i].to_vec()));
                start = i + 1;
            }
        }
    }
    let wlog = floor_log2(width);
    let max_bits = i64::from(effort.max_bits);
    let mut items = Vec::new();
    for (s, sub) in subs.iter_mut().enumerate() {
        if sub.len() == 1 {
            items.push(Item::exact_value(s, 0, sub.d[0].clone()));
            continue;
        }
        // Narrower than the width asked and than 1/L.
        let gexp = (wlog - 1).min(-(sub.scale.significant_bits() as i64) - 2);
        let bits = sub.mag - gexp;
        if bits > max_bits {
            return Err(Error::budget(format!(
                "enclosing eigenvalues of size up to 2^{} to the width {} needs {bits} bits, more \
                 than the effort limit (max bits) of {max_bits}: ask for a wider enclosure or \
                 raise the limit",
                sub.mag,
                exact_decimal(&big_rat(width), 30)
            )));
        }
        for (k, (lo, w)) in sub.initial(gexp, max_bits)?.into_iter().enumerate() {
            let mut it = Item::enclosed(s, k, lo, w, bits);
            if let Some(x) = sub.rational_root(&it.lo, &it.hi) {
                it = Item::exact_value(s, k, x);
            }
            items.push(it);
        }
    }
    let groups = resolve(&mut subs, &mut items, effort);
    let mut next = vec![0usize; nblocks];
    Ok(groups
        .into_iter()
        .map(|(mut members, overlap)| {
            members.sort_by_key(|&i| (subs[items[i].sub].block, items[i].sub, items[i].k));
            let (lo, hi) = bounds(&items, &members);
            let value = if items[members[0]].exact {
                Energy::Exact(big_rat(&lo))
            } else {
                Energy::Enclosed {
                    lo: big_rat(&lo),
                    hi: big_rat(&hi),
                }
            };
            let members = members
                .iter()
                .map(|&i| {
                    let b = subs[items[i].sub].block;
                    next[b] += 1;
                    (b, next[b] - 1)
                })
                .collect();
            Solved {
                value,
                members,
                overlap,
            }
        })
        .collect())
}

/// floor(log2 r) for r > 0, exactly.
fn floor_log2(r: &Rational) -> i64 {
    let e = r.numer().significant_bits() as i64 - r.denom().significant_bits() as i64;
    // 2^(e−1) < r < 2^(e+1).
    let two_e = if e >= 0 {
        Rational::from(Integer::from(1u32) << e as u32)
    } else {
        Rational::from((Integer::from(1u32), Integer::from(1u32) << (-e) as u32))
    };
    if r >= &two_e {
        e
    } else {
        e - 1
    }
}

/// The intersection of the members' enclosures (all contain the value).
fn bounds(items: &[Item], members: &[usize]) -> (Rational, Rational) {
    let mut lo = items[members[0]].lo.clone();
    let mut hi = items[members[0]].hi.clone();
    for &i in &members[1..] {
        if items[i].lo > lo {
            lo = items[i].lo.clone();
        }
        if items[i].hi < hi {
            hi = items[i].hi.clone();
        }
    }
    (lo, hi)
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Rel {
    Equal,
    Distinct,
    Unknown,
}

fn find(uf: &mut [usize], mut i: usize) -> usize {
    while uf[i] != i {
        uf[i] = uf[uf[i]];
        i = uf[i];
    }
    i
}

/// What is proven, and the gcds computed, while settling overlaps.
struct Proofs {
    distinct: HashSet<(usize, usize)>,
    gcds: HashMap<(usize, usize), (Integer, Vec<Integer>)>,
}

impl Proofs {
    fn known_distinct(&self, g: &[usize], h: &[usize]) -> bool {
        g.iter().any(|&u| {
            h.iter()
                .any(|&v| self.distinct.contains(&(u.min(v), u.max(v))))
        })
    }

    /// Whether two groups (members proven equal within each) hold the same
    /// value, as far as can be told now.
    fn relation(
        &mut self,
        subs: &[Sub],
        items: &[Item],
        g: &[usize],
        h: &[usize],
        effort: &Effort,
    ) -> Rel {
        if self.known_distinct(g, h) {
            return Rel::Distinct;
        }
        let (u, v) = (g[0], h[0]);
        let (a, b) = (&items[u], &items[v]);
        let max_bits = i64::from(effort.max_bits);
        let rel = if a.exact || b.exact {
            // Exact values are rational, enclosed ones proven irrational.
            if a.exact && b.exact && a.lo == b.lo {
                Rel::Equal
            } else {
                Rel::Distinct
            }
        } else if g
            .iter()
            .any(|&x| h.iter().any(|&y| items[x].sub == items[y].sub))
        {
            // Eigenvalues of one unreduced block are simple.
            Rel::Distinct
        } else if g
            .iter()
            .chain(h)
            .any(|&i| items[i].bits(subs) < (2 * items[i].b0 + 64).min(max_bits))
        {
            Rel::Unknown
        } else {
            self.gcd_test(subs, a, b, effort)
        };
        if rel == Rel::Distinct {
            self.distinct.insert((u.min(v), u.max(v)));
        }
        rel
    }

    /// The exact test: g = gcd over Q of the two blocks' characteristic
    /// polynomials; the eigenvalues are equal iff g changes sign over the
    /// intersection of their isolating enclosures.
    fn gcd_test(&mut self, subs: &[Sub], a: &Item, b: &Item, effort: &Effort) -> Rel {
        let (s1, s2) = (a.sub.min(b.sub), a.sub.max(b.sub));
        if subs[s1].len().max(subs[s2].len()) > effort.max_gcd_degree {
            return Rel::Unknown;
        }
        let (s, g) = self.gcds.entry((s1, s2)).or_insert_with(|| {
            let s = Integer::from(subs[s1].scale.lcm_ref(&subs[s2].scale));
            let g = poly_gcd(subs[s1].charpoly(&s), subs[s2].charpoly(&s));
            (s, g)
        });
        if g.len() == 1 {
            return Rel::Distinct;
        }
        let lo = if a.lo > b.lo { &a.lo } else { &b.lo };
        let hi = if a.hi < b.hi { &a.hi } else { &b.hi };
        let at = |x: &Rational| sign_at(g, &Rational::from(x * &*s));
        match (at(lo), at(hi)) {
            (Ordering::Equal, _) | (_, Ordering::Equal) => Rel::Unknown,
            (x, y) if x != y => Rel::Equal,
            _ => Rel::Distinct,
        }
    }
}

/// Refines an enclosed eigenvalue to about twice its bits (at most the
/// effort's), by Newton with certified counts or bisection.
fn refine(subs: &mut [Sub], it: &mut Item, max_bits: i64) {
    let sub = &mut subs[it.sub];
    let bits = sub.mag - (it.w - 1);
    let new_bits = (2 * bits).max(bits + 64).min(max_bits);
    if it.exact || new_bits <= bits {
        return;
    }
    let (lo, w) = sub.settle(it.k, it.lo_f.clone(), it.w, sub.mag - new_bits);
    *it = Item::enclosed(it.sub, it.k, lo, w, it.b0);
}

/// Groups the eigenvalues into levels: refines overlapping enclosures until
/// they separate, merges those proven equal, and flags what the effort left
/// open. Returns the groups ascending with their overlap status.
fn resolve(subs: &mut [Sub], items: &mut [Item], effort: &Effort) -> Vec<(Vec<usize>, Overlap)> {
    let n = items.len();
    let max_bits = i64::from(effort.max_bits);
    let mut uf: Vec<usize> = (0..n).collect();
    let mut proofs = Proofs {
        distinct: HashSet::new(),
        gcds: HashMap::new(),
    };
    loop {
        let mut by_root: HashMap<usize, Vec<usize>> = HashMap::new();
        for i in 0..n {
            by_root.entry(find(&mut uf, i)).or_default().push(i);
        }
        let mut groups: Vec<Vec<usize>> = by_root.into_values().collect();
        groups.sort_unstable();
        let bnd: Vec<(Rational, Rational)> = groups.iter().map(|g| bounds(items, g)).collect();
        let mut order: Vec<usize> = (0..groups.len()).collect();
        order.sort_by(|&x, &y| {
            bnd[x]
                .0
                .cmp(&bnd[y].0)
                .then_with(|| bnd[x].1.cmp(&bnd[y].1))
        });
        let mut pairs = Vec::new();
        for (p, &x) in order.iter().enumerate() {
            for &y in &order[p + 1..] {
                if bnd[y].0 > bnd[x].1 {
                    break;
                }
                pairs.push((x, y));
            }
        }
        let mut to_refine = BTreeSet::new();
        let mut merged = false;
        for &(x, y) in &pairs {
            match proofs.relation(subs, items, &groups[x], &groups[y], effort) {
                Rel::Equal => {
                    let (rx, ry) = (find(&mut uf, groups[x][0]), find(&mut uf, groups[y][0]));
                    uf[rx] = ry;
                    merged = true;
                }
                Rel::Distinct | Rel::Unknown => {
                    for &i in groups[x].iter().chain(&groups[y]) {
                        if items[i].bits(subs) < max_bits {
                            to_refine.insert(i);
                        }
                    }
                }
            }
        }
        if !merged && to_refine.is_empty() {
            let mut status = vec![Overlap::Isolated; groups.len()];
            for &(x, y) in &pairs {
                let s = if proofs.known_distinct(&groups[x], &groups[y]) {
                    Overlap::Distinct
                } else {
                    Overlap::Undecided
                };
                status[x] = status[x].max(s);
                status[y] = status[y].max(s);
            }
            return order
                .into_iter()
                .map(|g| (groups[g].clone(), status[g]))
                .collect();
        }
        for i in to_refine {
            refine(subs, &mut items[i], max_bits);
        }
    }
}
