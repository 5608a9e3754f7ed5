//! The asymmetric top as a [`Spectrum`]: its levels are the certified
//! eigenvalues of [`AsymmetricTopMath`] (exact where rational, else
//! enclosed), each (Ka, Kc) state a (2J+1)-fold M multiplet, weighted by the
//! nuclear-spin weight of its rotational symmetry class (the parities of Ka
//! and Kc).

use super::asymmetric::{AsymLevel, AsymmetricTopMath, Overlap, MAX_J};
use crate::error::{Error, Result};
use crate::exact::exact_decimal;
use crate::level::{Level, LevelList};
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// Working bits of a listing made without a stated precision (enough for
/// 30 printed digits).
const DEFAULT_BITS: u32 = 128;

/// Estimated bytes per listed level (enclosure ends and bookkeeping).
const LEVEL_BYTES: f64 = 400.0;

/// Elementary steps per (level × block row) of the eigenvalue solver at
/// 128 bits, for the lowest J (see `listing`).
const WORK_PER_ROW: f64 = 300.0;

/// The principal axis a pair of equivalent nuclei is exchanged about.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    /// The a axis (smallest moment of inertia).
    A,
    /// The b axis (water's C2 axis).
    B,
    /// The c axis.
    C,
}

impl Axis {
    /// Reads `a`, `b` or `c`.
    pub fn parse(s: &str) -> Result<Axis> {
        match s.trim() {
            "a" | "A" => Ok(Axis::A),
            "b" | "B" => Ok(Axis::B),
            "c" | "C" => Ok(Axis::C),
            other => Err(Error::invalid(
                "exchange axis",
                other,
                "give a, b or c: the principal axis whose two-fold rotation exchanges the pair",
            )),
        }
    }
}

/// The symmetry class of a state: `[ee, eo, oe, oo]` index from the
/// parities of Ka and Kc.
pub fn class(ka: u64, kc: u64) -> usize {
    (2 * (ka % 2) + kc % 2) as usize
}

/// Spin weights `[ee, eo, oe, oo]` for one pair of equivalent nuclei of
/// spin I (given as 2I) exchanged by the two-fold rotation about `axis`:
/// a rotational state symmetric under that rotation (Ka even about a, Kc
/// even about c, Ka + Kc even about b) pairs with the (I+1)(2I+1) symmetric
/// spin states for bosons (integer I) and the I(2I+1) antisymmetric ones for
/// fermions, the other way round for antisymmetric rotational states
/// (common practice; for two protons about b, as in water: ortho levels
/// with Ka + Kc odd weigh 3, para levels 1).
pub fn pair_weights(twice_spin: u32, axis: Axis) -> [BigUint; 4] {
    let n = u64::from(twice_spin) + 1; // 2I + 1
    let sym = n * (n + 1) / 2; // (I+1)(2I+1)
    let anti = n * (n - 1) / 2; // I(2I+1)
    let fermion = twice_spin % 2 == 1;
    let (with_sym_rot, with_anti_rot) = if fermion { (anti, sym) } else { (sym, anti) };
    let symmetric = |c: usize| {
        let (ka_odd, kc_odd) = (c / 2 == 1, c % 2 == 1);
        match axis {
            Axis::A => !ka_odd,
            Axis::C => !kc_odd,
            Axis::B => ka_odd == kc_odd,
        }
    };
    std::array::from_fn(|c| {
        BigUint::from(if symmetric(c) {
            with_sym_rot
        } else {
            with_anti_rot
        })
    })
}

/// An asymmetric top: rotational constants A ≥ B ≥ C, optional quartic
/// distortion (Watson's A reduction), and spin weights per symmetry class.
///
/// ```
/// use zsum::exact::parse_rational;
/// use zsum::models::asym_top::{pair_weights, AsymmetricTop, Axis};
/// use zsum::models::asymmetric::AsymmetricTopMath;
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// let math = AsymmetricTopMath::rigid(r("27.88"), r("14.51"), r("9.28"))?;
/// let water = AsymmetricTop::new(math, EnergyUnit::Wavenumber)
///     .with_weights(pair_weights(1, Axis::B))?;
/// let levels = water.levels_up_to(&r("40"))?;
/// // 0_00 (para, 1 state), 1_01 = B + C (ortho: 3 × 3 states), 1_11 = A + C (para, 3).
/// let got: Vec<String> = levels.iter().map(|l| format!("{}x{}", l.energy, l.degeneracy)).collect();
/// assert_eq!(got, ["0x1", "2379/100x9", "3716/100x3"].map(|s| {
///     let e = r(s.split('x').next().unwrap());
///     format!("{}x{}", e, s.split('x').nth(1).unwrap())
/// }));
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone)]
pub struct AsymmetricTop {
    math: AsymmetricTopMath,
    weights: [BigUint; 4],
    unit: EnergyUnit,
    /// The certified levels of each (J, bits) computed so far, shared by
    /// clones (a molecule's spin isomers are clones with other weights):
    /// a listing, its count bound and its warnings certify each J once.
    solved: std::sync::Arc<std::sync::Mutex<Solved>>,
}

/// Certified levels by (J, working bits).
type Solved = std::collections::HashMap<(u64, u32), std::sync::Arc<Vec<AsymLevel>>>;

impl AsymmetricTop {
    /// The top with every symmetry class of weight 1, energies in `unit`.
    pub fn new(math: AsymmetricTopMath, unit: EnergyUnit) -> Self {
        AsymmetricTop {
            math,
            weights: std::array::from_fn(|_| BigUint::one()),
            unit,
            solved: Default::default(),
        }
    }

    /// The same top with spin weights `[ee, eo, oe, oo]`; refuses weights
    /// that are all zero.
    pub fn with_weights(mut self, weights: [BigUint; 4]) -> Result<Self> {
        if weights.iter().all(Zero::is_zero) {
            return Err(Error::invalid(
                "spin weights",
                "0:0:0:0",
                "at least one symmetry class (ee, eo, oe, oo) must have a positive weight",
            ));
        }
        self.weights = weights;
        Ok(self)
    }

    /// The certified computation behind the levels.
    pub fn math(&self) -> &AsymmetricTopMath {
        &self.math
    }

    /// The spin weights `[ee, eo, oe, oo]`.
    pub fn weights(&self) -> &[BigUint; 4] {
        &self.weights
    }

    fn weight(&self, ka: u64, kc: u64) -> &BigUint {
        &self.weights[class(ka, kc)]
    }

    fn max_weight(&self) -> &BigUint {
        self.weights.iter().max().unwrap_or(&self.weights[0])
    }

    /// The absolute enclosure width for levels of J at `bits`: 2^−(bits+2)
    /// of C·J(J+1), below 2^−bits of every level's magnitude for the rigid
    /// top (E ≥ C·J(J+1)); for a distorted top, of the smaller of that and
    /// its certified lower bound where positive.
    fn width(&self, j: u64, bits: u32) -> BigRational {
        let n = BigRational::from_integer(BigInt::from(j) * BigInt::from(j + 1));
        let [_, _, c] = self.math.constants();
        let mut scale = c * &n;
        let lb = self.math.lower_bound(j);
        if lb.is_positive() && lb < scale {
            scale = lb;
        }
        if !scale.is_positive() {
            scale = c.clone();
        }
        scale / BigRational::from_integer(BigInt::one() << (bits + 2))
    }

    /// The last J that may hold a level at or below `cutoff`: for the
    /// rigid top the last J with C·J(J+1) ≤ cutoff (the bound rises with
    /// J); for a distorted top the last J up to its turnover (or
    /// [`MAX_J`]) whose certified lower bound is at or below the cutoff,
    /// every J examined. `None` when not even J = 0 qualifies.
    fn j_last(&self, cutoff: &BigRational) -> Option<u64> {
        if self.math.quartic().is_none() {
            return self
                .rigid_j_last(cutoff)
                .map(|j| j.to_u64().unwrap_or(u64::MAX).min(MAX_J));
        }
        let last = self.math.turnover_j().unwrap_or(MAX_J).min(MAX_J);
        (0..=last)
            .rev()
            .find(|&j| &self.math.lower_bound(j) <= cutoff)
    }

    /// The rigid top's last J with C·J(J+1) ≤ `cutoff`, uncapped: J(J+1) ≤
    /// q ⇔ (2J+1)² ≤ 4q + 1 for q = ⌊cutoff/C⌋. `None` below zero.
    fn rigid_j_last(&self, cutoff: &BigRational) -> Option<BigInt> {
        let [_, _, c] = self.math.constants();
        let q = (cutoff / c).floor().to_integer();
        if q.is_negative() {
            return None;
        }
        Some(((q * 4u32 + 1u32).sqrt() - 1u32) / 2u32)
    }

    /// The levels of J whose energy may lie at or below `cutoff`, refined
    /// until each lies on one side of it (or proven equal to it).
    fn levels_of_j(&self, j: u64, cutoff: &BigRational, bits: u32) -> Result<Vec<AsymLevel>> {
        let mut b = bits;
        loop {
            let levels = self.solved(j, b)?;
            let straddles = levels
                .iter()
                .any(|l| l.value.lo() <= cutoff && l.value.hi() > cutoff);
            if !straddles || b >= bits + 256 {
                return Ok(levels
                    .iter()
                    .filter(|l| l.value.lo() <= cutoff)
                    .cloned()
                    .collect());
            }
            b += 64;
        }
    }

    /// The certified levels of J at `bits`, computed once per (J, bits)
    /// for this top and its clones. The lock is not held while solving
    /// (the cores of a listing solve different J).
    fn solved(&self, j: u64, bits: u32) -> Result<std::sync::Arc<Vec<AsymLevel>>> {
        let lock = || {
            self.solved
                .lock()
                .unwrap_or_else(std::sync::PoisonError::into_inner)
        };
        if let Some(l) = lock().get(&(j, bits)) {
            return Ok(l.clone());
        }
        let levels = std::sync::Arc::new(self.math.levels_of_j(j, &self.width(j, bits))?);
        lock().insert((j, bits), levels.clone());
        Ok(levels)
    }

    fn ground(&self) -> BigRational {
        // The lowest allowed level lies at J ≤ 1, where every Wang block
        // has one row: exact.
        let mut best: Option<BigRational> = None;
        for j in 0..=1 {
            if let Ok(levels) = self
                .math
                .levels_of_j(j, &self.width(j.max(1), DEFAULT_BITS))
            {
                for l in levels {
                    if l.states.iter().any(|s| !self.weight(s.ka, s.kc).is_zero()) {
                        let e = l.value.lo().clone();
                        if best.as_ref().is_none_or(|b| &e < b) {
                            best = Some(e);
                        }
                    }
                }
            }
        }
        best.unwrap_or_else(BigRational::zero)
    }

    /// Every level up to `cutoff` at `bits`, with its J listing.
    fn listing(&self, cutoff: &BigRational, budget: &Budget, bits: u32) -> Result<Vec<AsymLevel>> {
        check_cutoff(self, cutoff)?;
        let Some(j_last) = self.j_last(cutoff) else {
            return Ok(Vec::new());
        };
        let rows = (j_last as f64 + 1.0).powi(2);
        budget.check_levels(
            format_args!(
                "listing the asymmetric-top levels up to {}",
                exact_decimal(cutoff, 30)
            ),
            rows,
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        // The work grows as the levels times their block size, times a
        // cost per row that itself rises with J (longer pivot chains,
        // wider numbers, the list's own exact bookkeeping), and with the
        // bits. Measured: J = 0..50 in about 60 ms of one core and J up to
        // 219 in about 42 s, some 300·(1 + J/25) steps per row at the
        // reference speed.
        let work: f64 = (0..=j_last)
            .map(|j| {
                let j = j as f64;
                (2.0 * j + 1.0) * (j / 2.0 + 1.0) * (1.0 + j / 25.0)
            })
            .sum::<f64>()
            * WORK_PER_ROW
            * (f64::from(bits) / 128.0).max(1.0);
        budget.check_work(
            format_args!(
                "certifying the asymmetric-top levels up to {} {} (J up to {j_last})",
                crate::exact::format_sig(cutoff, 6),
                self.unit
            ),
            work,
            "give a lower cutoff, a lower temperature or fewer digits",
        )?;
        use rayon::prelude::*;
        let per_j: Vec<Vec<AsymLevel>> = (0..=j_last)
            .into_par_iter()
            .map(|j| self.levels_of_j(j, cutoff, bits))
            .collect::<Result<_>>()?;
        Ok(per_j.into_iter().flatten().collect())
    }

    fn level_of(&self, l: &AsymLevel) -> Level {
        let states = BigUint::from(2 * l.j + 1);
        let g: BigUint = l
            .states
            .iter()
            .map(|s| self.weight(s.ka, s.kc))
            .sum::<BigUint>()
            * states;
        match l.value.exact() {
            Some(e) => Level::new(e.clone(), g),
            None => Level::enclosed(l.value.lo().clone(), l.value.hi().clone(), g),
        }
    }

    fn has_spin_index(&self) -> bool {
        self.max_weight() > &BigUint::one()
    }
}

impl Spectrum for AsymmetricTop {
    fn describe(&self) -> String {
        let [a, b, c] = self.math.constants();
        let mut s = format!(
            "asymmetric top, A = {}, B = {}, C = {} {}",
            exact_decimal(a, 30),
            exact_decimal(b, 30),
            exact_decimal(c, 30),
            self.unit
        );
        if let Some(k) = self.math.kappa() {
            s += &format!(", kappa = {}", crate::exact::format_sig(&k, 6));
        }
        if self.math.quartic().is_some() {
            s += ", quartic distortion (Watson A)";
        }
        if self.weights.iter().any(|w| !w.is_one()) {
            let w: Vec<String> = self.weights.iter().map(|w| w.to_string()).collect();
            s += &format!(", weights ee:eo:oe:oo = {}", w.join(":"));
        }
        s
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        let mut q = vec!["J".into(), "Ka".into(), "Kc".into(), "M".into()];
        if self.has_spin_index() {
            q.push("s".into());
        }
        q
    }

    fn ground_energy(&self) -> BigRational {
        self.ground()
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        self.levels_within_bits(cutoff, budget, DEFAULT_BITS)
    }

    fn levels_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
    ) -> Result<LevelList> {
        let levels = self
            .listing(cutoff, budget, bits.max(DEFAULT_BITS))?
            .iter()
            .map(|l| self.level_of(l))
            .filter(|l| !l.degeneracy.is_zero())
            .collect();
        Ok(LevelList::new(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let mut out = Vec::new();
        let with_s = self.has_spin_index();
        for l in self.listing(energy, &Budget::default(), DEFAULT_BITS)? {
            if !(l.value.lo() <= energy && energy <= l.value.hi()) {
                continue;
            }
            for s in &l.states {
                let w = self.weight(s.ka, s.kc).to_i64().unwrap_or(0);
                let j = l.j as i64;
                for m in -j..=j {
                    if with_s {
                        for k in 1..=w {
                            out.push(State(vec![j, s.ka as i64, s.kc as i64, m, k]));
                        }
                    } else if w > 0 {
                        out.push(State(vec![j, s.ka as i64, s.kc as i64, m]));
                    }
                }
            }
        }
        out.sort();
        Ok(out)
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["J".into(), "Ka".into(), "Kc".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        let mut out = Vec::new();
        for l in self.listing(cutoff, budget, DEFAULT_BITS)? {
            let e = self.level_of(&l).energy;
            for s in &l.states {
                if !self.weight(s.ka, s.kc).is_zero() {
                    out.push((e.clone(), vec![l.j as i64, s.ka as i64, s.kc as i64]));
                }
            }
        }
        Ok(out)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Every level of J lies at or above C·J(J+1) (rigid) or its
        // certified lower bound (distorted, whose levels end at the
        // turnover); J's (2J+1)² states weigh at most the largest weight.
        let m = if self.math.quartic().is_none() {
            match self.rigid_j_last(energy) {
                Some(j) => j.to_biguint().unwrap_or_default() + 1u32,
                None => return BigUint::zero(),
            }
        } else {
            if self.math.turnover_j().is_none() && &self.math.lower_bound(MAX_J) <= energy {
                // Levels beyond the largest J solved may lie below: no
                // finite bound is claimed.
                return BigUint::one() << 256u32;
            }
            match self.j_last(energy) {
                Some(j) => BigUint::from(j) + 1u32,
                None => return BigUint::zero(),
            }
        };
        // Σ_{J=0}^{m−1} (2J+1)² = m(2m−1)(2m+1)/3.
        let sum = &m * (&m * 2u32 - 1u32) * (&m * 2u32 + 1u32) / 3u32;
        sum * self.max_weight()
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.5)
    }

    fn structure(&self) -> Structure<'_> {
        let [a, b, c] = self.math.constants();
        Structure::Asymmetric {
            abc: [a.clone(), b.clone(), c.clone()],
            weights: self.weights.clone(),
        }
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let mut out = Vec::new();
        if let Some(t) = self.math.turnover_j() {
            if self.j_last(cutoff) == Some(t) {
                out.push(format!(
                    "the quartic distortion turns the levels over after J = {t}; no levels are \
                     listed beyond it"
                ));
            }
        }
        if let Ok(levels) = self.listing(cutoff, &Budget::default(), DEFAULT_BITS) {
            let undecided = levels
                .iter()
                .filter(|l| l.overlap == Overlap::Undecided)
                .count();
            if undecided > 0 {
                out.push(format!(
                    "{undecided} levels overlap another within the refinement budget: listed \
                     apart, neither their equality nor their order is proved"
                ));
            }
        }
        out
    }
}
