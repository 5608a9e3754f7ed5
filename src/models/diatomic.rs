//! Rotation–vibration levels of a diatomic molecule, as spectroscopists
//! write them, and the nuclear-spin weights of even and odd J
//! ([`ParityWeights`], shared with the rotors).
//!
//! ```text
//! E(v, J) = G(v) + B_v J(J+1) − D_e [J(J+1)]²,   B_v = B_e − alpha_e (v + 1/2),
//! ```
//!
//! with G(v) from an [`AnharmonicOscillator`] (its bound levels only). The
//! level (v, J) holds (2J+1) · g(J) states, g(J) the weight of J's parity;
//! levels of weight 0 are absent.
//!
//! # Where a J ladder ends
//! For each bound v the ladder runs J = 0, 1, … while E(v, J) increases
//! strictly with J: E(v, J+1) − E(v, J) = 2(J+1)[B_v − 2 D_e (J+1)²], so
//! with D_e > 0 the last rung is the largest J with J² < B_v/(2 D_e)
//! ([`RovibDiatomic::j_max`]); past it the centrifugal term would make the
//! energy fall, and no levels are listed (reported by `warnings`). Every
//! bound v must at least have its J = 1 rung above J = 0 (B_v > 2 D_e), and
//! B_v must be positive for every bound v.
//!
//! # States
//! A state is (v, J, M) with M = −J..J. When a parity weight exceeds 1 a
//! fourth number `s` = 1..g(J) labels the nuclear-spin substate (the
//! symmetric or antisymmetric spin functions that go with J's parity);
//! then every state carries `s`, which is 1 for levels of weight 1.

use crate::error::{Error, Result};
use crate::level::{Level, LevelList};
use crate::models::oscillator::{
    half, int, last_true, show, AnharmonicOscillator, LEVEL_BYTES, STATE_BYTES,
};
use crate::spectrum::{check_cutoff, Budget, PolyLadder, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{FromPrimitive, One, Signed, ToPrimitive, Zero};
use std::fmt::Display;

/// The parity of J: even or odd.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Parity {
    /// J = 0, 2, 4, …
    Even,
    /// J = 1, 3, 5, …
    Odd,
}

impl Parity {
    /// The parity of `j`.
    pub fn of(j: u64) -> Self {
        if j % 2 == 0 {
            Parity::Even
        } else {
            Parity::Odd
        }
    }

    /// `"even"` or `"odd"`.
    pub fn name(&self) -> &'static str {
        match self {
            Parity::Even => "even",
            Parity::Odd => "odd",
        }
    }
}

/// Statistical weights of the levels with J even and J odd (nuclear-spin
/// statistics of a homonuclear diatomic or a symmetric linear molecule).
///
/// ```
/// use zsum::models::diatomic::ParityWeights;
/// // H2: two protons (I = 1/2, fermions): even J : odd J = 1 : 3.
/// let h2 = ParityWeights::from_nuclear_spin(1, false);
/// assert_eq!((h2.even().to_string(), h2.odd().to_string()), ("1".into(), "3".into()));
/// assert_eq!(h2.modification(1), Some("ortho"));
/// ```
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub struct ParityWeights {
    even: BigUint,
    odd: BigUint,
}

impl ParityWeights {
    /// Weight 1 for every J (a heteronuclear molecule).
    pub fn uniform() -> Self {
        ParityWeights {
            even: BigUint::one(),
            odd: BigUint::one(),
        }
    }

    /// Hand-set weights; they may not both be zero.
    pub fn new(even: BigUint, odd: BigUint) -> Result<Self> {
        if even.is_zero() && odd.is_zero() {
            return Err(Error::invalid(
                "parity weights",
                "0:0",
                "at least one of the even-J and odd-J weights must be positive",
            ));
        }
        Ok(ParityWeights { even, odd })
    }

    /// Weights taken as given, unchecked: a pair of zeros leaves a model
    /// with no levels at all, so callers must rule it out themselves.
    pub fn new_unchecked(even: BigUint, odd: BigUint) -> Self {
        ParityWeights { even, odd }
    }

    /// The weights of a homonuclear diatomic whose two nuclei have spin
    /// I = `twice_i`/2 (so I = 1/2 is `1`).
    ///
    /// Of the (2I+1)² nuclear-spin states, (2I+1)(I+1) are symmetric and
    /// (2I+1)I antisymmetric under exchange of the nuclei. Nuclei of integer
    /// I are bosons, so the total wavefunction is symmetric: in a Σg⁺
    /// electronic state even J goes with the symmetric spin states. Nuclei
    /// of half-integer I are fermions and even J takes the antisymmetric
    /// ones. `swap` exchanges the roles, for electronic states in which the
    /// rotational functions' exchange symmetry is reversed (³Σg⁻ of O₂:
    /// for ¹⁶O₂, I = 0, only odd N survive).
    pub fn from_nuclear_spin(twice_i: u32, swap: bool) -> Self {
        let t = BigUint::from(twice_i);
        let symmetric = (&t + 1u32) * (&t + 2u32) / 2u32;
        let antisymmetric = (&t + 1u32) * &t / 2u32;
        let fermions = twice_i % 2 == 1;
        let (even, odd) = if fermions != swap {
            (antisymmetric, symmetric)
        } else {
            (symmetric, antisymmetric)
        };
        ParityWeights { even, odd }
    }

    /// The weight of even J.
    pub fn even(&self) -> &BigUint {
        &self.even
    }

    /// The weight of odd J.
    pub fn odd(&self) -> &BigUint {
        &self.odd
    }

    /// The weight of the level J.
    pub fn weight(&self, j: u64) -> &BigUint {
        match Parity::of(j) {
            Parity::Even => &self.even,
            Parity::Odd => &self.odd,
        }
    }

    /// The larger of the two weights.
    pub fn max_weight(&self) -> &BigUint {
        (&self.even).max(&self.odd)
    }

    /// The "ortho" parity, the one with the larger weight (odd J for H₂,
    /// even J for D₂); `None` when the weights are equal.
    pub fn ortho(&self) -> Option<Parity> {
        match self.even.cmp(&self.odd) {
            std::cmp::Ordering::Greater => Some(Parity::Even),
            std::cmp::Ordering::Less => Some(Parity::Odd),
            std::cmp::Ordering::Equal => None,
        }
    }

    /// The "para" parity, the one with the smaller weight; `None` when the
    /// weights are equal.
    pub fn para(&self) -> Option<Parity> {
        match self.ortho()? {
            Parity::Even => Some(Parity::Odd),
            Parity::Odd => Some(Parity::Even),
        }
    }

    /// `"ortho"` or `"para"` for the level J, or `None` when the weights are
    /// equal.
    pub fn modification(&self, j: u64) -> Option<&'static str> {
        let o = self.ortho()?;
        Some(if Parity::of(j) == o { "ortho" } else { "para" })
    }
}

/// Vibrational levels beyond which `count_bound` stops summing exactly and
/// bounds instead.
const EXACT_COUNT_LEVELS: u64 = 4096;
/// Vibrational levels that `new` will scan to find the lowest odd-J level.
const GROUND_SCAN_LEVELS: u64 = 1_000_000;
/// A message naming an energy, formatted only when an error needs it
/// (exact decimals of a cutoff are costly, and cutoffs are formed for every
/// temperature).
struct Naming<'a>(&'static str, &'a BigRational);

impl Display for Naming<'_> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}{}", self.0, show(self.1))
    }
}

/// Vibrational levels whose J ladders are prepared once, at construction.
const CACHED_LADDERS: u64 = 512;
/// Vibrational levels that `warnings` examines.
const WARNING_SCAN_LEVELS: u64 = 100_000;

/// A rotating, vibrating diatomic molecule: E(v, J) = G(v) + B_v J(J+1) −
/// D_e [J(J+1)]² with B_v = B_e − alpha_e (v + 1/2).
///
/// ```
/// use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
/// use zsum::models::oscillator::AnharmonicOscillator;
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// use num_rational::BigRational;
/// let e = |n: i64| BigRational::from_integer(n.into());
/// let vib = AnharmonicOscillator::new(e(2000), e(10), e(0), EnergyUnit::Wavenumber).unwrap();
/// let m = RovibDiatomic::new(vib, e(2), e(0), e(0), ParityWeights::uniform()).unwrap();
/// // E(0, J) = G(0) + 2 J(J+1) = 995/2 + 2 J(J+1): J = 0, 1, 2 with 1, 3, 5 states.
/// let l = m.levels_up_to(&e(1019)).unwrap();
/// let got: Vec<String> = l.iter().map(|l| format!("{}x{}", l.energy, l.degeneracy)).collect();
/// assert_eq!(got, ["1995/2x1", "2003/2x3", "2019/2x5"]);
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RovibDiatomic {
    vib: AnharmonicOscillator,
    be: BigRational,
    alpha: BigRational,
    d: BigRational,
    weights: ParityWeights,
    ground: BigRational,
    /// The J ladders of the first vibrational levels on one denominator
    /// each (derived from the constants; searched on every sum).
    cached: Vec<Ladder>,
}

impl RovibDiatomic {
    /// The molecule with vibration `vib`, rotational constant `be` (> 0),
    /// vibration–rotation constant `alpha_e` (≥ 0, with B_v > 0 for every
    /// bound v), centrifugal constant `d_e` (≥ 0, with B_v > 2 D_e for
    /// every bound v so that J = 1 lies above J = 0) and parity weights.
    pub fn new(
        vib: AnharmonicOscillator,
        be: BigRational,
        alpha_e: BigRational,
        d_e: BigRational,
        weights: ParityWeights,
    ) -> Result<Self> {
        if !be.is_positive() {
            return Err(Error::invalid(
                "B_e",
                show(&be),
                "the rotational constant must be greater than zero",
            ));
        }
        if alpha_e.is_negative() {
            return Err(Error::invalid(
                "alpha_e",
                show(&alpha_e),
                "the vibration-rotation constant must be zero or positive",
            ));
        }
        if d_e.is_negative() {
            return Err(Error::invalid(
                "D_e",
                show(&d_e),
                "the centrifugal distortion constant must be zero or positive",
            ));
        }
        if weights.even.is_zero() && weights.odd.is_zero() {
            return Err(Error::invalid(
                "parity weights",
                "0:0",
                "at least one of the even-J and odd-J weights must be positive",
            ));
        }
        let mut m = RovibDiatomic {
            vib,
            be,
            alpha: alpha_e,
            d: d_e,
            weights,
            ground: BigRational::zero(),
            cached: Vec::new(),
        };
        m.check_rotational_constants()?;
        let n = m
            .vib
            .v_max()
            .map_or(CACHED_LADDERS, |v| (v + 1).min(CACHED_LADDERS));
        m.cached = (0..n).map(|v| m.new_ladder(&BigInt::from(v))).collect();
        m.ground = m.find_ground()?;
        Ok(m)
    }

    /// B_v > 0 and B_v > 2 D_e at every bound v. B_v falls with v, so the
    /// last bound level decides; an endless vibrational ladder allows only
    /// alpha_e = 0.
    fn check_rotational_constants(&self) -> Result<()> {
        let v_max = self.vib.v_max();
        let worst = match v_max {
            Some(v) => BigInt::from(v),
            None => BigInt::zero(),
        };
        // The first v at which B_v ≤ `limit`: v + 1/2 ≥ (B_e − limit)/alpha_e.
        let first_below = |limit: &BigRational| -> BigInt {
            if self.alpha.is_zero() {
                return BigInt::zero();
            }
            let v = ((&self.be - limit) / &self.alpha - half())
                .ceil()
                .to_integer();
            v.max(BigInt::zero())
        };
        if v_max.is_none() && self.alpha.is_positive() {
            let v = first_below(&BigRational::zero());
            return Err(Error::invalid(
                "alpha_e",
                show(&self.alpha),
                &format!(
                    "the vibrational ladder has no last bound level (G(v) increases for ever), \
                     so B_v = B_e - alpha_e (v + 1/2) would reach {} at v = {v}; use alpha_e = 0 \
                     or a vibration with a last bound level (wexe > 0)",
                    show(&self.b_big(&v))
                ),
            ));
        }
        if !self.b_big(&worst).is_positive() {
            let v = first_below(&BigRational::zero());
            return Err(Error::invalid(
                "alpha_e",
                show(&self.alpha),
                &format!(
                    "it makes B_v = B_e - alpha_e (v + 1/2) = {} at v = {v}, and the bound levels \
                     run to v = {worst}; B_v must stay positive, so alpha_e must be below \
                     B_e/(v_max + 1/2) = {}",
                    show(&self.b_big(&v)),
                    show(&(&self.be / (BigRational::from_integer(worst.clone()) + half())))
                ),
            ));
        }
        let two_d = int(2) * &self.d;
        if self.b_big(&worst) <= two_d {
            let v = first_below(&two_d);
            let b = self.b_big(&v);
            return Err(Error::invalid(
                "D_e",
                show(&self.d),
                &format!(
                    "at v = {v} (B_v = {}) the J = 1 level would not lie above J = 0 \
                     (E(v,1) - E(v,0) = 2 B_v - 4 D_e = {}), so the centrifugal term leaves no \
                     rotational ladder; D_e must be below B_v/2 = {} for every bound level",
                    show(&b),
                    show(&(int(2) * &b - int(4) * &self.d)),
                    show(&(&b / int(2)))
                ),
            ));
        }
        Ok(())
    }

    /// The lowest level: E(0, 0), or without even-J levels the lowest
    /// E(v, 1) (v = 0 in any sensible molecule; scanned to be sure).
    fn find_ground(&self) -> Result<BigRational> {
        if !self.weights.even.is_zero() {
            return Ok(self.vib.g(&BigInt::zero()));
        }
        let one = BigInt::one();
        let mut best = self.e_big(&BigInt::zero(), &one);
        let mut v = BigInt::one();
        // E(v, 1) > G(v) and G rises with v: once G(v) ≥ best, nothing
        // further can be lower.
        while self.vib.v_max().is_none_or(|m| v <= BigInt::from(m)) {
            if self.vib.g(&v) >= best {
                return Ok(best);
            }
            if v > BigInt::from(GROUND_SCAN_LEVELS) {
                return Err(Error::invalid(
                    "B_e",
                    show(&self.be),
                    &format!(
                        "with only odd J present, the lowest level was not found within the \
                         first {GROUND_SCAN_LEVELS} vibrational levels: B_e is far too large \
                         for the vibrational spacing"
                    ),
                ));
            }
            let e = self.e_big(&v, &one);
            if e < best {
                best = e;
            }
            v += 1;
        }
        Ok(best)
    }

    /// The vibration.
    pub fn vibration(&self) -> &AnharmonicOscillator {
        &self.vib
    }

    /// The equilibrium rotational constant B_e.
    pub fn b_e(&self) -> &BigRational {
        &self.be
    }

    /// The vibration–rotation constant alpha_e.
    pub fn alpha_e(&self) -> &BigRational {
        &self.alpha
    }

    /// The centrifugal distortion constant D_e.
    pub fn d_e(&self) -> &BigRational {
        &self.d
    }

    /// The parity weights.
    pub fn weights(&self) -> &ParityWeights {
        &self.weights
    }

    /// B_v = B_e − alpha_e (v + 1/2), exactly.
    pub fn b_v(&self, v: u64) -> BigRational {
        self.b_big(&BigInt::from(v))
    }

    /// E(v, J) = G(v) + B_v J(J+1) − D_e [J(J+1)]², exactly (whether or
    /// not the level is listed).
    pub fn energy(&self, v: u64, j: u64) -> BigRational {
        self.e_big(&BigInt::from(v), &BigInt::from(j))
    }

    /// The last rung of the J ladder of level v, the largest J with
    /// J² < B_v/(2 D_e); `None` when D_e = 0 (the ladder never turns).
    pub fn j_max(&self, v: u64) -> Option<u64> {
        self.jmax_big(&BigInt::from(v))
            .map(|j| j.to_u64().unwrap_or(u64::MAX))
    }

    /// The J ladder of level v on one denominator, for listing many rungs.
    fn ladder(&self, v: u64) -> std::borrow::Cow<'_, Ladder> {
        match self.cached.get(v as usize) {
            Some(l) => std::borrow::Cow::Borrowed(l),
            None => std::borrow::Cow::Owned(self.new_ladder(&BigInt::from(v))),
        }
    }

    fn new_ladder(&self, v: &BigInt) -> Ladder {
        let mut l = Ladder::new(&self.vib.g(v), &self.b_big(v), &self.d);
        l.jmax = self.jmax_big(v);
        l
    }

    fn b_big(&self, v: &BigInt) -> BigRational {
        &self.be - &self.alpha * (BigRational::from_integer(v.clone()) + half())
    }

    fn e_big(&self, v: &BigInt, j: &BigInt) -> BigRational {
        let x = BigRational::from_integer(j * (j + 1u32));
        self.vib.g(v) + self.b_big(v) * &x - &self.d * &x * &x
    }

    fn jmax_big(&self, v: &BigInt) -> Option<BigInt> {
        if self.d.is_zero() {
            return None;
        }
        // J² < q with J² an integer  ⇔  J² ≤ ceil(q) − 1, where
        // q = B_v/(2 D) = (2 be_n α_d − α_n be_d (2v+1)) d_d / (4 be_d α_d d_n)
        // over integers (no reduced rationals: this runs for every v of
        // every tail bound); ceil(N/M) − 1 = floor((N − 1)/M) for M > 0.
        use num_integer::Integer;
        let (bn, bd) = (self.be.numer(), self.be.denom());
        let (an, ad) = (self.alpha.numer(), self.alpha.denom());
        let (dn, dd) = (self.d.numer(), self.d.denom());
        let two_v1 = v * 2u32 + 1u32;
        let mut num = (bn * ad * 2u32 - an * bd * two_v1) * dd;
        let mut den = bd * ad * dn * 4u32;
        if den.is_negative() {
            num = -num;
            den = -den;
        }
        let n = (num - BigInt::one()).div_floor(&den).max(BigInt::zero());
        Some(n.sqrt())
    }

    /// The highest rung J of level v with E(v, J) ≤ `e`; `None` if even
    /// G(v) lies above `e`.
    fn j_top(&self, v: &BigInt, e: &BigRational) -> Option<BigInt> {
        let ladder = match v.to_u64() {
            Some(v) => self.ladder(v),
            None => std::borrow::Cow::Owned(self.new_ladder(v)),
        };
        // Compared on the ladder's integers: E(J) ≤ e ⇔ num(J) ≤ ⌊e·den⌋.
        let bound = ladder.scaled_floor(e);
        if ladder.g > bound {
            return None;
        }
        last_true(
            |j| ladder.numer_at_most(j, &bound),
            ladder.jmax.as_ref(),
            &ladder.hint(&bound),
        )
    }

    /// The number of bound vibrational levels with G(v) ≤ `e`: a search
    /// over the prepared ladders' integers when they cover every bound
    /// level (G rises along them), else over exact G(v).
    fn vib_levels_up_to(&self, e: &BigRational) -> BigInt {
        match self.vib.v_max() {
            Some(vm) if (vm as usize) < self.cached.len() => BigInt::from(
                self.cached[..=vm as usize].partition_point(|l| l.g <= l.scaled_floor(e)),
            ),
            _ => self.vib.count_levels_up_to(e),
        }
    }

    /// The number of vibrational levels with G(v) ≤ `e`, checked against
    /// `budget`.
    fn vib_count(&self, e: &BigRational, budget: &Budget, what: &dyn Display) -> Result<u64> {
        let n = self.vib_levels_up_to(e);
        budget.check(
            what,
            n.to_f64().unwrap_or(f64::INFINITY) * LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        n.to_u64()
            .ok_or_else(|| Error::budget(format!("{what} is beyond zsum; give a lower cutoff")))
    }

    /// (v, highest J) for every bound v with G(v) ≤ `e`.
    fn ladders(
        &self,
        e: &BigRational,
        budget: &Budget,
        what: &dyn Display,
    ) -> Result<Vec<(u64, u64)>> {
        let nv = self.vib_count(e, budget, what)?;
        let mut out = Vec::new();
        let mut rungs = 0f64;
        for v in 0..nv {
            let vb = BigInt::from(v);
            if let Some(j) = self.j_top(&vb, e) {
                rungs += j.to_f64().unwrap_or(f64::INFINITY) + 1.0;
                let j = j
                    .to_u64()
                    .filter(|&j| j < 1 << 62)
                    .ok_or_else(|| Error::budget(format!("{what} is beyond zsum")))?;
                out.push((v, j));
            }
        }
        budget.check_levels(what, rungs, LEVEL_BYTES * 2.0, "give a lower cutoff")?;
        Ok(out)
    }

    fn has_spin_index(&self) -> bool {
        self.weights.max_weight() > &BigUint::one()
    }

    /// Σ (2J+1) over the even J and over the odd J in 0..=n, weighted.
    fn weighted_rungs(&self, n: &BigUint) -> BigUint {
        // Even J = 2k, k = 0..=K: Σ (4k+1) = (K+1)(2K+1).
        let k = n / 2u32;
        let even = (&k + 1u32) * (&k * 2u32 + 1u32);
        // Odd J = 2k+1, k = 0..=K' (n ≥ 1): Σ (4k+3) = (K'+1)(2K'+3).
        let odd = if n.is_zero() {
            BigUint::zero()
        } else {
            let k = (n - 1u32) / 2u32;
            (&k + 1u32) * (&k * 2u32 + 3u32)
        };
        even * &self.weights.even + odd * &self.weights.odd
    }
}

impl Spectrum for RovibDiatomic {
    /// A rigid rotor with B_0 times harmonic vibration with the
    /// fundamental G(1) − G(0), energies from the true ground level.
    fn structure(&self) -> Structure<'_> {
        let w = self.vib.term_value(1) - self.vib.term_value(0);
        let b0 = self.b_v(0);
        if !w.is_positive() || !b0.is_positive() {
            return Structure::Opaque;
        }
        let one = BigRational::from_integer(1.into());
        let weights = [
            self.weights.weight(0).clone(),
            self.weights.weight(1).clone(),
        ];
        Structure::Near {
            parts: vec![
                (
                    Structure::Rotor {
                        b: b0,
                        weights,
                        rigid: true,
                    },
                    one.clone(),
                ),
                (Structure::Harmonic(vec![(w, 1)], false), one),
            ],
            shift: self.ground.clone(),
        }
    }

    fn describe(&self) -> String {
        let vib = &self.vib;
        let mut s = format!(
            "rotating-vibrating diatomic, we = {}, wexe = {}",
            show(vib.we()),
            show(vib.wexe())
        );
        if !vib.weye().is_zero() {
            s += &format!(", weye = {}", show(vib.weye()));
        }
        s += &format!(
            ", B_e = {}, alpha_e = {}, D_e = {} {}",
            show(&self.be),
            show(&self.alpha),
            show(&self.d),
            vib.unit()
        );
        match vib.v_max() {
            Some(v) => s += &format!(", bound v = 0..{v}"),
            None => s += ", no last vibrational level",
        }
        if self.weights != ParityWeights::uniform() {
            s += &format!(
                ", weights even J : odd J = {} : {}",
                self.weights.even, self.weights.odd
            );
        }
        s
    }

    fn unit(&self) -> EnergyUnit {
        self.vib.unit()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        let mut q = vec!["v".to_string(), "J".to_string(), "M".to_string()];
        if self.has_spin_index() {
            q.push("s".to_string());
        }
        q
    }

    fn ground_energy(&self) -> BigRational {
        self.ground.clone()
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let what = Naming("listing the rovibrational levels up to ", cutoff);
        let ladders = self.ladders(cutoff, budget, &what)?;
        let mut levels = Vec::new();
        for (v, top) in ladders {
            let ladder = self.ladder(v);
            for j in 0..=top {
                let w = self.weights.weight(j);
                if w.is_zero() {
                    continue;
                }
                levels.push(Level::new(ladder.energy(j), BigUint::from(2 * j + 1) * w));
            }
        }
        Ok(LevelList::new(self.unit(), levels))
    }

    fn poly_ladders(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Option<Result<Vec<PolyLadder>>> {
        let build = || -> Result<Vec<PolyLadder>> {
            check_cutoff(self, cutoff)?;
            let what = Naming("listing the rovibrational levels up to ", cutoff);
            let weights = [
                self.weights.weight(0).clone(),
                self.weights.weight(1).clone(),
            ];
            Ok(self
                .ladders(cutoff, budget, &what)?
                .into_iter()
                .map(|(v, last)| {
                    let l = self.ladder(v);
                    PolyLadder {
                        numerators: vec![l.g.clone(), l.b.clone(), -l.d.clone()],
                        denominator: l.den.clone(),
                        first: 0,
                        last,
                        weights: weights.clone(),
                    }
                })
                .collect())
        };
        Some(build())
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["v".into(), "J".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        check_cutoff(self, cutoff)?;
        let what = Naming("listing the rovibrational terms up to ", cutoff);
        let mut out = Vec::new();
        for (v, top) in self.ladders(cutoff, budget, &what)? {
            let ladder = self.ladder(v);
            for j in 0..=top {
                if !self.weights.weight(j).is_zero() {
                    out.push((ladder.energy(j), vec![v as i64, j as i64]));
                }
            }
        }
        Ok(out)
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        if energy < &self.ground {
            return Ok(Vec::new());
        }
        let what = Naming("finding the states at ", energy);
        let nv = self.vib_count(energy, &Budget::default(), &what)?;
        let mut found = Vec::new();
        let mut total = BigUint::zero();
        for v in 0..nv {
            let vb = BigInt::from(v);
            let Some(j) = self.j_top(&vb, energy) else {
                continue;
            };
            if &self.e_big(&vb, &j) != energy {
                continue;
            }
            let j = j.to_u64().unwrap_or(u64::MAX);
            let w = self.weights.weight(j);
            if w.is_zero() {
                continue;
            }
            total += (BigUint::from(j) * 2u32 + 1u32) * w;
            found.push((v, j, w.clone()));
        }
        Budget::default().check(
            format!("listing the {total} states at {}", show(energy)),
            total.to_f64().unwrap_or(f64::INFINITY) * (STATE_BYTES + 32.0),
            "choose a lower level",
        )?;
        let with_s = self.has_spin_index();
        let mut states = Vec::new();
        for (v, j, w) in found {
            let (v, j) = (v as i64, j as i64);
            let w = w.to_i64().unwrap_or(0);
            for m in -j..=j {
                if with_s {
                    for s in 1..=w {
                        states.push(State(vec![v, j, m, s]));
                    }
                } else {
                    states.push(State(vec![v, j, m]));
                }
            }
        }
        states.sort();
        Ok(states)
    }

    fn growth_exponent(&self) -> Option<f64> {
        // Σ over bound v of (E − G_v)/B_v grows at most like E².
        Some(2.0)
    }

    fn tail_bound(&self, energy: &BigRational) -> BigUint {
        if energy < &self.ground {
            return BigUint::zero();
        }
        let nv = self.vib_levels_up_to(energy);
        if nv > BigInt::from(EXACT_COUNT_LEVELS) {
            return self.count_bound(energy);
        }
        // For each bound v an upper bound on J_top(v) in floating point:
        // the rotational room is inflated by a relative 1e-9 (far above
        // f64 rounding of these few operations), the smaller root of
        // B_v x − D x² = room is an upper bound on J(J+1) along the
        // rising ladder, and two rungs are added; J never exceeds
        // J_max(v). The result is never below the exact count, and the
        // tail bound is evaluated many times per temperature, so this
        // avoids exact searches there.
        let nv = nv.to_u64().unwrap_or(0);
        let f = |r: &BigRational| r.to_f64().unwrap_or(f64::INFINITY);
        let (we, wexe, weye) = (f(self.vib.we()), f(self.vib.wexe()), f(self.vib.weye()));
        let (be, alpha, d) = (f(&self.be), f(&self.alpha), f(&self.d));
        let e = f(energy);
        let mut n = BigUint::zero();
        for v in 0..nv {
            let u = v as f64 + 0.5;
            let g = we * u - wexe * u * u + weye * u * u * u;
            let room = (e - g).max(0.0) * (1.0 + 1e-9) + 1e-9 * (e.abs() + g.abs() + 1.0);
            let b = (be - alpha * u) * (1.0 - 1e-9);
            let x = if b <= 0.0 {
                f64::INFINITY
            } else if d > 0.0 {
                let disc = b * b - 4.0 * d * room;
                if disc > 0.0 {
                    2.0 * room / (b + disc.sqrt())
                } else {
                    f64::INFINITY
                }
            } else {
                room / b
            };
            let j_est = ((1.0 + 4.0 * x).sqrt() - 1.0) / 2.0 + 2.0;
            let cap = self.ladder(v).jmax.clone();
            let j = match (BigInt::from_f64(j_est.floor()), cap) {
                (Some(j), Some(c)) => j.min(c),
                (Some(j), None) => j,
                (None, Some(c)) => c,
                (None, None) => match self.j_top(&BigInt::from(v), energy) {
                    Some(j) => j,
                    None => continue,
                },
            };
            n += self.weighted_rungs(&j.to_biguint().unwrap_or_default());
        }
        n
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        if energy < &self.ground {
            return BigUint::zero();
        }
        let nv = self.vib_levels_up_to(energy);
        if nv <= BigInt::from(EXACT_COUNT_LEVELS) {
            // For each bound v the rungs J = 0..=J_top(v) are those with
            // E(v, J) ≤ E (E rises strictly along the listed ladder), holding
            // Σ (2J+1) g(J) states in closed form.
            let nv = nv.to_u64().unwrap_or(0);
            let mut n = BigUint::zero();
            for v in 0..nv {
                if let Some(j) = self.j_top(&BigInt::from(v), energy) {
                    n += self.weighted_rungs(&j.to_biguint().unwrap_or_default());
                }
            }
            return n;
        }
        // Too many vibrational levels to sum: a rigorous bound. Each of the
        // nv levels v with G(v) ≤ E has rungs J ≤ J_b, where with D_e > 0,
        // J ≤ J_max(v) ≤ J_max(0) (J_max grows with B_v and B_v ≤ B_0), and
        // with D_e = 0, B_min J(J+1) ≤ B_v J(J+1) = E(v,J) − G(v) ≤ E − G(0)
        // (B_min = B_v at the last of those v, G(v) ≥ G(0)). A ladder J ≤ J_b
        // holds at most Σ (2J+1) g_max = (J_b+1)² g_max states.
        let zero = BigInt::zero();
        let jb = match self.jmax_big(&zero) {
            Some(j) => j,
            None => {
                let b_min = self.b_big(&(&nv - 1u32));
                let room = energy - self.vib.g(&zero);
                last_true(
                    |j| &b_min * BigRational::from_integer(j * (j + 1u32)) <= room,
                    None,
                    &zero,
                )
                .unwrap_or_default()
            }
        };
        let per = num_traits::pow(jb.to_biguint().unwrap_or_default() + 1u32, 2);
        nv.to_biguint().unwrap_or_default() * per * self.weights.max_weight()
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let mut out = Vec::new();
        if let Some(v) = self.vib.v_max() {
            let g = self.vib.term_value(v);
            if cutoff > &g {
                out.push(format!(
                    "vibrational levels end at v = {v}, the last bound level; G({v}) = {} {}, \
                     below the cutoff {} (only rotation carries levels above it)",
                    show(&g),
                    self.unit(),
                    show(cutoff)
                ));
            }
        }
        if self.d.is_zero() {
            return out;
        }
        let nv = self
            .vib
            .count_levels_up_to(cutoff)
            .to_u64()
            .unwrap_or(u64::MAX);
        let scanned = nv.min(WARNING_SCAN_LEVELS);
        let mut stopped = Vec::new();
        for v in 0..scanned {
            if let Some(j) = self.j_max(v) {
                let e = self.energy(v, j);
                if &e <= cutoff {
                    stopped.push(format!("v = {v} at J = {j} (E = {})", show(&e)));
                }
            }
        }
        if !stopped.is_empty() {
            let n = stopped.len();
            let mut list = stopped.into_iter().take(5).collect::<Vec<_>>().join(", ");
            if n > 5 {
                list += &format!(" and {} more", n - 5);
            }
            let note = if scanned < nv {
                format!(" (the first {scanned} vibrational levels examined)")
            } else {
                String::new()
            };
            out.push(format!(
                "the centrifugal term stops E(v, J) increasing with J below the cutoff {} {}, so \
                 these J ladders end early and no levels are listed beyond them: {list}{note}",
                show(cutoff),
                self.unit()
            ));
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn weighted_rungs_match_a_direct_sum() {
        let w = ParityWeights::new(BigUint::from(2u32), BigUint::from(5u32)).unwrap();
        let vib =
            AnharmonicOscillator::new(int(1000), int(10), int(0), EnergyUnit::Kelvin).unwrap();
        let m = RovibDiatomic::new(vib, int(1), int(0), int(0), w.clone()).unwrap();
        for n in 0u64..20 {
            let direct: BigUint = (0..=n)
                .map(|j| BigUint::from(2 * j + 1) * w.weight(j))
                .sum();
            assert_eq!(m.weighted_rungs(&BigUint::from(n)), direct, "n = {n}");
        }
    }

    #[test]
    fn j_max_is_the_last_rising_rung() {
        let vib =
            AnharmonicOscillator::new(int(1000), int(10), int(0), EnergyUnit::Kelvin).unwrap();
        let d = BigRational::new(1.into(), 50.into());
        let m = RovibDiatomic::new(vib, int(2), int(0), d, ParityWeights::uniform()).unwrap();
        // B/(2D) = 50: J² < 50 ⇔ J ≤ 7.
        assert_eq!(m.j_max(0), Some(7));
        for j in 0..7 {
            assert!(m.energy(0, j + 1) > m.energy(0, j));
        }
        assert!(m.energy(0, 8) <= m.energy(0, 7));
    }
}

/// One J ladder E(J) = G + B x − D x², x = J(J+1), with G, B and D exact
/// rationals brought to one common denominator once, so that each rung costs
/// a few integer operations and one small gcd instead of a chain of reduced
/// big-rational products. Numerators are evaluated in `i128` with checked
/// arithmetic and fall back to big integers when they would overflow; the
/// result is the same reduced rational either way.
#[derive(Debug, Clone, PartialEq, Eq)]
struct Ladder {
    den: BigInt,
    g: BigInt,
    b: BigInt,
    d: BigInt,
    small: Option<[i128; 4]>,
    /// The last rung before the centrifugal turn, where known.
    jmax: Option<BigInt>,
}

impl Ladder {
    fn new(g: &BigRational, b: &BigRational, d: &BigRational) -> Ladder {
        use num_integer::Integer;
        let den = g.denom().lcm(b.denom()).lcm(d.denom());
        let on = |r: &BigRational| r.numer() * (&den / r.denom());
        let (gn, bn, dn) = (on(g), on(b), on(d));
        let small = (|| Some([den.to_i128()?, gn.to_i128()?, bn.to_i128()?, dn.to_i128()?]))();
        Ladder {
            den,
            g: gn,
            b: bn,
            d: dn,
            small,
            jmax: None,
        }
    }

    /// A floating-point guess at the last rung whose numerator is at most
    /// `bound` (only a starting point for the exact search): the smaller
    /// root of b x − d x² = room for x = J(J+1).
    fn hint(&self, bound: &BigInt) -> BigInt {
        let f = |i: &BigInt| i.to_f64().unwrap_or(0.0);
        let (b, d, r) = (f(&self.b), f(&self.d), f(&(bound - &self.g)));
        let x = if d > 0.0 {
            let disc = b * b - 4.0 * d * r;
            if disc >= 0.0 {
                2.0 * r / (b + disc.sqrt())
            } else {
                b / (2.0 * d)
            }
        } else {
            r / b
        };
        let j = (((1.0 + 4.0 * x).sqrt() - 1.0) / 2.0).floor();
        BigInt::from_f64(j)
            .filter(|j| !j.is_negative())
            .unwrap_or_default()
    }

    /// ⌊e · den⌋: a rung's numerator is at most this exactly when its
    /// energy is at most `e`.
    fn scaled_floor(&self, e: &BigRational) -> BigInt {
        use num_integer::Integer;
        (e.numer() * &self.den).div_floor(e.denom())
    }

    /// Whether the numerator of E(j) over `den` is at most `bound`.
    fn numer_at_most(&self, j: &BigInt, bound: &BigInt) -> bool {
        if let (Some([_, g, b, d]), Some(j), Some(bound)) =
            (self.small, j.to_i128(), bound.to_i128())
        {
            let num = j.checked_mul(j + 1).and_then(|x| {
                let bx = b.checked_mul(x)?;
                let dxx = d.checked_mul(x)?.checked_mul(x)?;
                g.checked_add(bx)?.checked_sub(dxx)
            });
            if let Some(num) = num {
                return num <= bound;
            }
        }
        let x = j * (j + 1u32);
        &self.g + &self.b * &x - &self.d * &x * &x <= *bound
    }

    /// E(J), exactly and reduced.
    fn energy(&self, j: u64) -> BigRational {
        use num_integer::Integer;
        if let Some([den, g, b, d]) = self.small {
            let num = i128::from(j).checked_mul(i128::from(j) + 1).and_then(|x| {
                let bx = b.checked_mul(x)?;
                let dxx = d.checked_mul(x)?.checked_mul(x)?;
                g.checked_add(bx)?.checked_sub(dxx)
            });
            if let Some(num) = num {
                let k = num.gcd(&den);
                return BigRational::new_raw(BigInt::from(num / k), BigInt::from(den / k));
            }
        }
        let x = BigInt::from(j) * (BigInt::from(j) + 1u32);
        BigRational::new(&self.g + &self.b * &x - &self.d * &x * &x, self.den.clone())
    }
}

#[cfg(test)]
mod ladder_tests {
    use super::*;
    use proptest::prelude::*;

    fn plain(g: &BigRational, b: &BigRational, d: &BigRational, j: u64) -> BigRational {
        let x = BigRational::from_integer(BigInt::from(j) * (BigInt::from(j) + 1u32));
        g + b * &x - d * &x * &x
    }

    proptest! {
        /// J_max(v) on integers agrees with the plain rational formula
        /// isqrt(ceil(B_v/(2 D)) − 1) for random constants (N2-like
        /// magnitudes and far beyond).
        #[test]
        fn j_max_matches_the_plain_formula(
            be in 1u64..10_000_000, alpha in 0u64..1000, d in 1u64..1000, scale in 0u32..12,
        ) {
            let r = |n: u64, e: u32| BigRational::new(BigInt::from(n), BigInt::from(10u64.pow(e)));
            let vib = AnharmonicOscillator::new(r(2358, 0), r(14, 0), r(0, 0), EnergyUnit::Wavenumber)
                .unwrap();
            let (be, alpha, d) = (r(be, 6), r(alpha, 8 + scale), r(d, 10 + scale));
            let m = RovibDiatomic::new(vib, be.clone(), alpha.clone(), d.clone(), ParityWeights::uniform());
            // Too many refused molecules would fail the test (global rejects).
            prop_assume!(m.is_ok());
            if let Ok(m) = m {
                for v in [0u64, 1, 5, 40] {
                    let b_v = &be - &alpha * (BigRational::from_integer(v.into()) + half());
                    if !b_v.is_positive() {
                        continue;
                    }
                    let q = b_v / (BigRational::from_integer(2.into()) * &d);
                    let n = (q.ceil().to_integer() - BigInt::one()).max(BigInt::zero());
                    prop_assert_eq!(m.j_max(v), n.sqrt().to_u64());
                }
            }
        }

        /// The common-denominator ladder and the plain big-rational formula
        /// agree exactly, also where numerators overflow 64 and 128 bits.
        #[test]
        fn ladder_matches_the_plain_formula(
            gn in any::<i64>(), gd in 1i64..=i64::MAX,
            bn in any::<i64>(), bd in 1i64..=i64::MAX,
            dn in any::<i64>(), dd in 1i64..=i64::MAX,
            scale in 0u32..80,
            j in prop_oneof![0u64..100, 1u64 << 20..1u64 << 21, 1u64 << 40..1u64 << 41],
        ) {
            let big = BigInt::from(10u32).pow(scale);
            let g = BigRational::new(BigInt::from(gn) * &big, BigInt::from(gd));
            let b = BigRational::new(BigInt::from(bn), BigInt::from(bd));
            let d = BigRational::new(BigInt::from(dn), BigInt::from(dd) * &big);
            let l = Ladder::new(&g, &b, &d);
            prop_assert_eq!(l.energy(j), plain(&g, &b, &d, j));
        }

        /// The count of bound levels with G(v) ≤ e over the prepared
        /// ladders equals the exact search over G(v), at and around every
        /// level.
        #[test]
        fn vibrational_count_matches_the_exact_search(
            we in 100u64..5000, wexe in 1u64..200, v in 0u64..400, nudge in -2i64..=2,
        ) {
            let r = |n: i64, e: u32| BigRational::new(BigInt::from(n), BigInt::from(10u64.pow(e)));
            let vib = AnharmonicOscillator::new(r(we as i64, 0), r(wexe as i64, 1), r(0, 0), EnergyUnit::Wavenumber)
                .unwrap();
            let m = RovibDiatomic::new(vib.clone(), r(1, 1), r(0, 0), r(0, 0), ParityWeights::uniform()).unwrap();
            let e = vib.g(&BigInt::from(v)) + r(nudge, 3);
            prop_assert_eq!(m.vib_levels_up_to(&e), vib.count_levels_up_to(&e));
        }

        /// The integer comparison num(J) ≤ ⌊e·den⌋ decides E(J) ≤ e
        /// exactly as the big-rational comparison does, at, just below and
        /// just above a rung's own energy, with and without overflow.
        #[test]
        fn ladder_comparison_matches_the_rational_one(
            gn in any::<i64>(), gd in 1i64..=i64::MAX,
            bn in any::<i64>(), bd in 1i64..=i64::MAX,
            dn in any::<i64>(), dd in 1i64..=i64::MAX,
            scale in 0u32..80,
            j in prop_oneof![0u64..100, 1u64 << 20..1u64 << 21, 1u64 << 40..1u64 << 41],
            k in 0u64..100, nudge in -2i64..=2,
        ) {
            let big = BigInt::from(10u32).pow(scale);
            let g = BigRational::new(BigInt::from(gn) * &big, BigInt::from(gd));
            let b = BigRational::new(BigInt::from(bn), BigInt::from(bd));
            let d = BigRational::new(BigInt::from(dn), BigInt::from(dd) * &big);
            let l = Ladder::new(&g, &b, &d);
            let e = plain(&g, &b, &d, k)
                + BigRational::new(BigInt::from(nudge), BigInt::from(gd) * BigInt::from(bd));
            let bound = l.scaled_floor(&e);
            prop_assert_eq!(
                l.numer_at_most(&BigInt::from(j), &bound),
                plain(&g, &b, &d, j) <= e
            );
        }
    }
}
