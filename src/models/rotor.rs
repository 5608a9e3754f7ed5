//! Rotors: the linear rotor (rigid or with centrifugal distortion, with
//! optional parity-dependent nuclear-spin weights), the symmetric top
//! (prolate or oblate) and the spherical top.
//!
//! Energies are exact rationals in the unit the constants are given in:
//!
//! ```text
//! linear:     E(J)    = B x − D x² + H x³,              x = J(J+1), g = (2J+1)·w(J)
//! symmetric:  E(J,K)  = B x + (A−B) K² − D_J x² − D_JK x K² − D_K K⁴   (A → C for oblate)
//!                       g = 2J+1 for each signed K, K = −J..J
//! spherical:  E(J)    = B x − D x²,                     g = (2J+1)²
//! ```
//!
//! # Nuclear-spin statistics
//! [`SphericalTop::with_spin_statistics`] (four equivalent nuclei,
//! methane-like) gives level J the weight (2J+1)·[a·m_A + e·2·m_E + f·m_F]
//! instead of (2J+1)², and [`SymmetricTop::with_three_fold_spin`] (three
//! equivalent nuclei on the top's axis, ammonia-like) weighs each (J, |K|)
//! level by its K class and, with an inversion splitting, splits it into
//! two components; both derived in [`crate::models::spin_species`]. Each
//! model lists its spin isomers (`isomers`) and keeps one (`with_isomer`).
//! Energies are those of the top without statistics.
//!
//! # Where the energy stops increasing
//! A positive D makes E(J) fall again for large J; past that point the
//! expansion means nothing. zsum lists levels only while E(J+1) > E(J) and,
//! when the cutoff lies beyond the last such level, says so through
//! [`Spectrum::warnings`] instead of listing meaningless levels.

use crate::error::{Error, Result};
use crate::exact::exact_decimal;
use crate::level::{Level, LevelList};
use crate::models::diatomic::ParityWeights;
pub use crate::models::spin_species::IsomerInfo;
use crate::models::spin_species::{
    multiplet_weight, rotation_species_t, spherical_weight, tetrahedral_spin, three_fold_spin,
    three_fold_weight, S3Species, TClass, TSpecies, ThreeFoldClass,
};
use crate::spectrum::{check_cutoff, Budget, Spectrum, SphericalLadder, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// The rungs kept and, if the ladder turned over, the last J before it did.
pub(crate) type Rungs = (Vec<(u64, BigRational)>, Option<u64>);

/// Bytes per listed level (exact energy and degeneracy).
const LEVEL_BYTES: f64 = 128.0;

fn int(n: u64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

fn positive(what: &str, v: &BigRational) -> Result<()> {
    if v.is_positive() {
        Ok(())
    } else {
        Err(Error::invalid(
            what,
            exact_decimal(v, 30),
            "it must be greater than zero",
        ))
    }
}

fn non_negative(what: &str, v: &BigRational) -> Result<()> {
    if v.is_negative() {
        Err(Error::invalid(
            what,
            exact_decimal(v, 30),
            "it must be zero or positive",
        ))
    } else {
        Ok(())
    }
}

/// The rungs of a ladder `E(J)`, J = 0, 1, ..., up to `cutoff`, kept only
/// while the energy increases. Returns the rungs and, if the ladder turned
/// over below the cutoff, the last J before it did.
pub(crate) fn ladder(
    energy: impl Fn(u64) -> BigRational,
    cutoff: &BigRational,
    max_rungs: u64,
) -> Result<Rungs> {
    let mut out = Vec::new();
    let mut j = 0u64;
    let mut e = energy(0);
    while &e <= cutoff {
        if j >= max_rungs {
            return Err(Error::budget(format!(
                "the ladder reaches J = {j} below the cutoff {}; more than {max_rungs} rungs \
                 would exceed the memory budget: give a lower cutoff",
                exact_decimal(cutoff, 30)
            )));
        }
        let next = energy(j + 1);
        out.push((j, e.clone()));
        if next <= e {
            return Ok((out, Some(j)));
        }
        e = next;
        j += 1;
    }
    Ok((out, None))
}

/// Refuses a ladder whose estimated number of rungs exceeds the budget,
/// before any arithmetic: `j_est` is an estimate of the highest J reached.
fn check_rungs(what: &str, j_est: f64, cutoff: &BigRational, budget: &Budget) -> Result<()> {
    budget.check_levels(
        format!(
            "listing the {what} levels up to {}",
            exact_decimal(cutoff, 30)
        ),
        j_est + 1.0,
        LEVEL_BYTES,
        "give a lower cutoff",
    )
}

/// sqrt(cutoff / b) as a float estimate of the highest J of a ladder B J(J+1).
fn j_estimate(cutoff: &BigRational, b: &BigRational) -> f64 {
    let c = cutoff.to_f64().unwrap_or(f64::INFINITY).max(0.0);
    let b = b
        .to_f64()
        .unwrap_or(f64::MIN_POSITIVE)
        .max(f64::MIN_POSITIVE);
    (c / b).sqrt()
}

/// Where a centrifugal term D turns the ladder over: J ≈ sqrt(B/(2D)).
fn turnover_estimate(b: &BigRational, d: &BigRational) -> f64 {
    if d.is_positive() {
        let b = b.to_f64().unwrap_or(f64::INFINITY);
        let d = d
            .to_f64()
            .unwrap_or(f64::MIN_POSITIVE)
            .max(f64::MIN_POSITIVE);
        (b / (2.0 * d)).sqrt() + 1.0
    } else {
        f64::INFINITY
    }
}

/// The energy of the last rung before a ladder turns over, if it does
/// within ten million rungs (`distorted` says whether it can at all).
fn turnover(energy: impl Fn(u64) -> BigRational, distorted: bool) -> Option<BigRational> {
    if !distorted {
        return None;
    }
    let mut e = energy(0);
    for j in 0..10_000_000u64 {
        let next = energy(j + 1);
        if next <= e {
            return Some(e);
        }
        e = next;
    }
    None
}

/// The turnover of `E = B x − D x² + H x³`, x = J(J+1), without walking
/// the ladder: E(J+1) − E(J) = 2(J+1) P(m) with m = J + 1 and
/// P(m) = 3H m⁴ + (H − 2D) m² + B, a quadratic in m², so the first
/// non-increasing rung is found from its root (in f64) and confirmed
/// exactly on the integers beside it. Falls back to the walk when the
/// root is near or the estimate cannot be confirmed.
fn turnover_poly(b: &BigRational, d: &BigRational, h: &BigRational) -> Option<BigRational> {
    let energy = |j: u64| {
        let x = int(j * (j + 1));
        let x2 = &x * &x;
        b * &x - d * &x2 + h * &x2 * &x
    };
    if d.is_zero() && h.is_zero() {
        return None;
    }
    let p = |m: u64| {
        let u = int(m * m);
        int(3) * h * &u * &u + (h - int(2) * d) * &u + b
    };
    let (a, bb, c) = (
        3.0 * h.to_f64().unwrap_or(0.0),
        (h - int(2) * d).to_f64().unwrap_or(0.0),
        b.to_f64().unwrap_or(0.0),
    );
    // Smallest positive root u₁ of a u² + bb u + c.
    let u1 = if a == 0.0 {
        if bb < 0.0 {
            Some(-c / bb)
        } else {
            None
        }
    } else {
        let disc = bb * bb - 4.0 * a * c;
        if disc < 0.0 {
            None
        } else {
            let r = disc.sqrt();
            let roots = [(-bb - r) / (2.0 * a), (-bb + r) / (2.0 * a)];
            roots
                .into_iter()
                .filter(|u| *u > 0.0)
                .min_by(|x, y| x.total_cmp(y))
        }
    };
    let m_est = u1.map(|u| u.sqrt().ceil());
    match m_est {
        Some(m) if m.is_finite() && m > 10_000.0 && m < 1e7 => {
            let m = m as u64;
            // Confirm: P(m*) ≤ 0 < P(m* − 1) for the first m* near m.
            let lo = m.saturating_sub(3).max(1);
            let first = (lo..m + 4).find(|&k| !p(k).is_positive())?;
            if first > lo && p(first - 1).is_positive() {
                Some(energy(first - 1))
            } else {
                turnover(energy, true)
            }
        }
        Some(m) if m >= 1e7 => None,
        _ => turnover(energy, true),
    }
}

/// How many rungs a budget allows.
fn max_rungs(budget: &Budget) -> u64 {
    (budget.limit() as f64 / LEVEL_BYTES) as u64
}

fn turnover_warning(what: &str, j: u64, e: &BigRational, unit: &EnergyUnit) -> String {
    format!(
        "{what}: the energy stops increasing after J = {j} (E = {} {unit}) because of the \
         centrifugal terms; no levels are listed beyond it",
        exact_decimal(e, 30)
    )
}

/// A linear rotor, rigid or with centrifugal distortion, with optional
/// parity-dependent weights (nuclear-spin statistics).
///
/// ```
/// use zsum::models::rotor::LinearRotor;
/// use zsum::spectrum::Spectrum;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = LinearRotor::rigid(parse_rational("2").unwrap(), EnergyUnit::Wavenumber).unwrap();
/// // J = 0..3 lie at or below 24: (3+1)^2 = 16 states.
/// assert_eq!(r.levels_up_to(&parse_rational("24").unwrap()).unwrap().total_states(), 16u32.into());
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LinearRotor {
    b: BigRational,
    d: BigRational,
    h: BigRational,
    unit: EnergyUnit,
    weights: ParityWeights,
}

impl LinearRotor {
    /// A rotor with rotational constant `b`, centrifugal constants `d` and
    /// `h` (zero for a rigid rotor), all in `unit`.
    pub fn new(b: BigRational, d: BigRational, h: BigRational, unit: EnergyUnit) -> Result<Self> {
        positive("rotational constant B", &b)?;
        non_negative("centrifugal constant D", &d)?;
        let r = LinearRotor {
            b,
            d,
            h,
            unit,
            weights: ParityWeights::uniform(),
        };
        // Some level above the ground must be bound: E(1) > E(0).
        if r.energy(1) <= r.energy(0) {
            return Err(Error::invalid(
                "centrifugal constant D",
                exact_decimal(&r.d, 30),
                "it is so large that E(J=1) does not lie above E(J=0); no rotational level is bound",
            ));
        }
        Ok(r)
    }

    /// A rigid rotor with rotational constant `b`.
    pub fn rigid(b: BigRational, unit: EnergyUnit) -> Result<Self> {
        LinearRotor::new(b, BigRational::zero(), BigRational::zero(), unit)
    }

    /// The same rotor with parity-dependent weights: level J gets
    /// `(2J+1) · weights.weight(J)` states.
    pub fn with_weights(mut self, weights: ParityWeights) -> Self {
        self.weights = weights;
        self
    }

    /// The parity weights in force.
    pub fn weights(&self) -> &ParityWeights {
        &self.weights
    }

    /// The rotational constant B.
    pub fn b(&self) -> &BigRational {
        &self.b
    }

    /// Only the levels of one parity of J (`even = true` for J even), with
    /// the same weights: the ortho or para modification.
    pub fn only_parity(&self, even: bool) -> Self {
        let (e, o) = (
            self.weights.weight(0).clone(),
            self.weights.weight(1).clone(),
        );
        let w = if even {
            ParityWeights::new_unchecked(e, BigUint::zero())
        } else {
            ParityWeights::new_unchecked(BigUint::zero(), o)
        };
        self.clone().with_weights(w)
    }

    /// E(J), exactly.
    pub fn energy(&self, j: u64) -> BigRational {
        let x = int(j * (j + 1));
        let x2 = &x * &x;
        &self.b * &x - &self.d * &x2 + &self.h * &x2 * &x
    }

    fn rungs(&self, cutoff: &BigRational, budget: &Budget) -> Result<Rungs> {
        let est = if self.h.is_zero() {
            j_estimate(cutoff, &self.b).min(turnover_estimate(&self.b, &self.d))
        } else {
            j_estimate(cutoff, &self.b)
        };
        check_rungs("rotor", est, cutoff, budget)?;
        ladder(|j| self.energy(j), cutoff, max_rungs(budget))
    }

    fn has_spin_index(&self) -> bool {
        self.weights.weight(0) > &BigUint::from(1u8) || self.weights.weight(1) > &BigUint::from(1u8)
    }
}

/// The terms `(E, [J])` of a J ladder's rungs, keeping the J that `keep`
/// allows (a nuclear-spin weight of zero removes a rung).
fn rung_terms(
    rungs: Vec<(u64, BigRational)>,
    keep: impl Fn(u64) -> bool,
) -> Vec<(BigRational, Vec<i64>)> {
    rungs
        .into_iter()
        .filter(|(j, _)| keep(*j))
        .map(|(j, e)| (e, vec![j as i64]))
        .collect()
}

/// States (J, M[, s]) of one rung of a linear ladder.
fn linear_states(j: u64, w: &BigUint, with_s: bool) -> Result<Vec<State>> {
    let w = w.to_u64().filter(|&w| w <= 1_000_000).ok_or_else(|| {
        Error::budget(format!(
            "level J = {j} has a weight {w} too large to list its states"
        ))
    })?;
    let j = j as i64;
    let mut out = Vec::new();
    for m in -j..=j {
        if with_s {
            for s in 1..=w as i64 {
                out.push(State(vec![j, m, s]));
            }
        } else if w > 0 {
            out.push(State(vec![j, m]));
        }
    }
    Ok(out)
}

impl Spectrum for LinearRotor {
    fn describe(&self) -> String {
        let kind = if self.d.is_zero() && self.h.is_zero() {
            "rigid linear rotor"
        } else {
            "nonrigid linear rotor"
        };
        format!(
            "{kind}, B = {} {}{}",
            exact_decimal(&self.b, 30),
            self.unit,
            if self.weights == ParityWeights::uniform() {
                String::new()
            } else {
                format!(
                    ", weights even J : odd J = {} : {}",
                    self.weights.weight(0),
                    self.weights.weight(1)
                )
            }
        )
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        let mut q = vec!["J".to_string(), "M".to_string()];
        if self.has_spin_index() {
            q.push("s".into());
        }
        q
    }

    fn ground_energy(&self) -> BigRational {
        // The lowest J with a non-zero weight: 0 or 1.
        if self.weights.weight(0).is_zero() {
            self.energy(1)
        } else {
            self.energy(0)
        }
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let (rungs, _) = self.rungs(cutoff, budget)?;
        let levels = rungs
            .into_iter()
            .map(|(j, e)| Level::new(e, BigUint::from(2 * j + 1) * self.weights.weight(j)))
            .filter(|l| !l.degeneracy.is_zero())
            .collect();
        Ok(LevelList::from_sorted(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let (rungs, _) = self.rungs(energy, &Budget::default())?;
        match rungs.last() {
            Some((j, e)) if e == energy => {
                linear_states(*j, self.weights.weight(*j), self.has_spin_index())
            }
            _ => Ok(Vec::new()),
        }
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["J".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        let (rungs, _) = self.rungs(cutoff, budget)?;
        Ok(rung_terms(rungs, |j| !self.weights.weight(j).is_zero()))
    }

    fn highest_energy(&self) -> Option<BigRational> {
        turnover_poly(&self.b, &self.d, &self.h)
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Rotor {
            b: self.b.clone(),
            weights: [
                self.weights.weight(0).clone(),
                self.weights.weight(1).clone(),
            ],
            rigid: self.d.is_zero() && self.h.is_zero(),
        }
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.0)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        if self.d.is_zero() && self.h.is_zero() {
            // Rigid: J(J+1) ≤ E/B ⇔ (2J+1)² ≤ 4E/B + 1, so J_max follows
            // from one integer square root; (J_max+1)² states times the
            // larger parity weight bounds the count.
            if energy.is_negative() {
                return BigUint::zero();
            }
            let s = (energy * BigRational::from_integer(BigInt::from(4)) / &self.b
                + BigRational::from_integer(BigInt::from(1)))
            .floor()
            .to_integer();
            let r: BigInt = s.sqrt(); // floor(sqrt)
            let jmax: BigInt = (r - 1) / 2;
            let n: BigInt = (&jmax + 1) * (&jmax + 1);
            let w = self.weights.weight(0).max(self.weights.weight(1)).clone();
            return n.to_biguint().unwrap_or_default() * w;
        }
        // Exact: the ladder is finite below any energy.
        match self.rungs(energy, &Budget::default()) {
            Ok((rungs, _)) => rungs
                .iter()
                .map(|(j, _)| BigUint::from(2 * j + 1) * self.weights.weight(*j))
                .sum(),
            Err(_) => BigUint::from(u64::MAX),
        }
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        match self.rungs(cutoff, &Budget::default()) {
            Ok((rungs, Some(j))) => vec![turnover_warning(
                "linear rotor",
                j,
                &rungs[j as usize].1,
                &self.unit,
            )],
            _ => Vec::new(),
        }
    }
}

/// Prolate (A > B, the unique axis has the smallest moment) or oblate
/// (C < B) symmetric top.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TopShape {
    /// Cigar-like: E = B J(J+1) + (A−B) K², A > B.
    Prolate,
    /// Disc-like: E = B J(J+1) + (C−B) K², 0 < C < B.
    Oblate,
}

/// A symmetric top with optional centrifugal distortion.
///
/// ```
/// use zsum::models::rotor::{SymmetricTop, TopShape};
/// use zsum::spectrum::Spectrum;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// let top = SymmetricTop::rigid(TopShape::Prolate, r("5"), r("1"), EnergyUnit::Wavenumber).unwrap();
/// // J=0 (1 state), J=1 K=0 at 2 (3 states); at 6 both J=1, |K|=1
/// // (2·3 states) and J=2, K=0 (5 states).
/// let l = top.levels_up_to(&r("6")).unwrap();
/// assert_eq!(l.total_states(), 15u32.into());
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SymmetricTop {
    shape: TopShape,
    /// A (prolate) or C (oblate).
    unique: BigRational,
    b: BigRational,
    dj: BigRational,
    djk: BigRational,
    dk: BigRational,
    unit: EnergyUnit,
    spin: Option<ThreeFold>,
    /// The widest weighted listing made for a count bound, shared by
    /// clones: the engine asks for bounds at many energies per sum.
    counted: TermMemo,
}

/// A memo of the widest weighted listing for each spin statistics (each
/// isomer): the statistics, the cutoff and the counted terms. Equal for
/// every two tops (it caches, it does not describe), shared by clones.
#[derive(Debug, Clone, Default)]
struct TermMemo(std::sync::Arc<std::sync::Mutex<Vec<MemoEntry>>>);

type MemoEntry = (Option<ThreeFold>, BigRational, std::sync::Arc<Counted>);

/// Weighted terms sorted by energy with the running count of states.
#[derive(Debug)]
struct Counted {
    energies: Vec<BigRational>,
    cumulative: Vec<BigUint>,
}

impl Counted {
    fn new(mut terms: Vec<TopTerm>) -> Self {
        terms.sort_by(|a, b| a.e.cmp(&b.e));
        let mut n = BigUint::zero();
        let cumulative = terms
            .iter()
            .map(|t| {
                n += t.states();
                n.clone()
            })
            .collect();
        Counted {
            energies: terms.into_iter().map(|t| t.e).collect(),
            cumulative,
        }
    }

    /// The states at or below `e`.
    fn up_to(&self, e: &BigRational) -> BigUint {
        match self.energies.partition_point(|x| x <= e) {
            0 => BigUint::zero(),
            k => self.cumulative[k - 1].clone(),
        }
    }
}

impl PartialEq for TermMemo {
    fn eq(&self, _: &Self) -> bool {
        true
    }
}

impl Eq for TermMemo {}

/// Nuclear-spin statistics of three equivalent nuclei on a symmetric top's
/// axis: the spin-function counts, the inversion splitting (if the two
/// components are resolved), the isomer kept, and the lowest weighted level.
#[derive(Debug, Clone, PartialEq, Eq)]
struct ThreeFold {
    twice_spin: u32,
    counts: S3Species,
    inversion: Option<BigRational>,
    only: Option<ThreeFoldClass>,
    ground: BigRational,
}

impl ThreeFold {
    /// The spin functions of a class: ortho A1 + A2, para the E pairs' 2·m_E.
    fn functions(&self, c: ThreeFoldClass) -> u64 {
        match c {
            ThreeFoldClass::Ortho => self.counts.a1 + self.counts.a2,
            ThreeFoldClass::Para => 2 * self.counts.e,
        }
    }
}

/// One weighted (J, |K|) level of a symmetric top, or one inversion
/// component of it: `w` states per M.
#[derive(Debug)]
struct TopTerm {
    e: BigRational,
    j: u64,
    k: u64,
    inv: Option<i64>,
    w: u64,
}

impl TopTerm {
    fn states(&self) -> BigUint {
        BigUint::from(2 * self.j + 1) * self.w
    }
}

/// `I` written from `2I`: `1/2`, `1`, `3/2`.
fn spin_text(twice_spin: u32) -> String {
    if twice_spin % 2 == 0 {
        (twice_spin / 2).to_string()
    } else {
        format!("{twice_spin}/2")
    }
}

/// Each isomer's name and spin functions, beside its class.
fn isomer_table<C: Copy, const N: usize>(
    classes: [(&'static str, C); N],
    functions: impl Fn(C) -> u64,
) -> Vec<(IsomerInfo, C)> {
    classes
        .into_iter()
        .map(|(name, c)| {
            let spin_functions = functions(c);
            (
                IsomerInfo {
                    name,
                    spin_functions,
                },
                c,
            )
        })
        .collect()
}

/// The spin functions kept (those of `only`, or all) over the symmetry
/// number `sigma`: the mean states per rotational state; 1 without
/// statistics (an empty table).
fn mean_weight<C: Copy + PartialEq>(
    table: &[(IsomerInfo, C)],
    only: Option<C>,
    sigma: u64,
) -> BigRational {
    if table.is_empty() {
        return BigRational::one();
    }
    let kept: u64 = table
        .iter()
        .filter(|(_, c)| only.is_none_or(|o| o == *c))
        .map(|(i, _)| i.spin_functions)
        .sum();
    BigRational::new(kept.into(), sigma.into())
}

/// Refuses a selection without statistics, names an unknown isomer with the
/// allowed ones, and an isomer without spin functions with the counts.
fn pick_isomer<C: Copy>(isomers: &[(IsomerInfo, C)], name: &str, nuclei: &str) -> Result<C> {
    if isomers.is_empty() {
        return Err(Error::invalid(
            "spin isomer",
            name,
            "this top has no nuclear-spin statistics: give them first (the spin of its equivalent \
             nuclei)",
        ));
    }
    let names: Vec<String> = isomers
        .iter()
        .map(|(i, _)| format!("{} ({} spin functions)", i.name, i.spin_functions))
        .collect();
    let Some((info, c)) = isomers.iter().find(|(i, _)| i.name == name) else {
        return Err(Error::invalid(
            "spin isomer",
            name,
            &format!("{nuclei} have the isomers {}", names.join(", ")),
        ));
    };
    if info.spin_functions == 0 {
        return Err(Error::invalid(
            "spin isomer",
            name,
            &format!(
                "{nuclei} have no {name} spin functions, so it has no levels; the isomers are {}",
                names.join(", ")
            ),
        ));
    }
    Ok(*c)
}

impl SymmetricTop {
    /// A top with the unique-axis constant `unique` (A for prolate, C for
    /// oblate), `b`, and distortion constants D_J, D_JK, D_K (zero for rigid).
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        shape: TopShape,
        unique: BigRational,
        b: BigRational,
        dj: BigRational,
        djk: BigRational,
        dk: BigRational,
        unit: EnergyUnit,
    ) -> Result<Self> {
        positive("rotational constant B", &b)?;
        match shape {
            TopShape::Prolate if unique <= b => {
                return Err(Error::invalid(
                    "rotational constant A",
                    exact_decimal(&unique, 30),
                    &format!(
                        "a prolate top needs A > B = {}; for A = B use the spherical top",
                        exact_decimal(&b, 30)
                    ),
                ))
            }
            TopShape::Oblate if !(unique.is_positive() && unique < b) => {
                return Err(Error::invalid(
                    "rotational constant C",
                    exact_decimal(&unique, 30),
                    &format!("an oblate top needs 0 < C < B = {}", exact_decimal(&b, 30)),
                ))
            }
            _ => {}
        }
        non_negative("centrifugal constant D_J", &dj)?;
        non_negative("centrifugal constant D_K", &dk)?;
        let top = SymmetricTop {
            shape,
            unique,
            b,
            dj,
            djk,
            dk,
            unit,
            spin: None,
            counted: TermMemo::default(),
        };
        if top.energy(1, 0) <= top.energy(0, 0) {
            return Err(Error::invalid(
                "centrifugal constant D_J",
                exact_decimal(&top.dj, 30),
                "it is so large that E(J=1) does not lie above E(J=0); no level is bound",
            ));
        }
        Ok(top)
    }

    /// A rigid symmetric top.
    pub fn rigid(
        shape: TopShape,
        unique: BigRational,
        b: BigRational,
        unit: EnergyUnit,
    ) -> Result<Self> {
        let z = BigRational::zero();
        SymmetricTop::new(shape, unique, b, z.clone(), z.clone(), z, unit)
    }

    /// E(J, K), exactly (depends on |K| only).
    pub fn energy(&self, j: u64, k: u64) -> BigRational {
        let x = int(j * (j + 1));
        let k2 = int(k * k);
        &self.b * &x + (&self.unique - &self.b) * &k2
            - &self.dj * &x * &x
            - &self.djk * &x * &k2
            - &self.dk * &k2 * &k2
    }

    /// For each J, the |K| values kept (energy increasing in |K| for a
    /// prolate top), their energies, and the J ladder's turnover.
    #[allow(clippy::type_complexity)]
    fn rows(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<(Vec<(u64, u64, BigRational)>, Vec<String>)> {
        // Estimate the (J, |K|) rows first: J up to where the lowest energy
        // of a J row passes the cutoff (K = 0 for prolate, K = J for oblate,
        // where E ≥ C J²), each row with at most J + 1 values of |K|.
        let lowest = match self.shape {
            TopShape::Prolate => &self.b,
            TopShape::Oblate => &self.unique,
        };
        let j_est = j_estimate(cutoff, lowest).min(turnover_estimate(&self.b, &self.dj));
        budget.check_levels(
            format!(
                "listing the top's levels up to {}",
                exact_decimal(cutoff, 30)
            ),
            (j_est + 1.0) * (j_est + 2.0) / 2.0,
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        let mut out = Vec::new();
        let mut notes = Vec::new();
        let limit = max_rungs(budget);
        let mut prev_min: Option<BigRational> = None;
        for j in 0u64.. {
            let mut row_min: Option<BigRational> = None;
            let mut prev_k: Option<BigRational> = None;
            for k in 0..=j {
                let e = self.energy(j, k);
                if self.shape == TopShape::Prolate {
                    if let Some(p) = &prev_k {
                        if &e <= p {
                            if notes.is_empty() {
                                notes.push(format!(
                                    "symmetric top: at J = {j} the energy stops increasing with |K| \
                                     after |K| = {} because of the centrifugal terms; higher |K| are \
                                     not listed",
                                    k - 1
                                ));
                            }
                            break;
                        }
                    }
                }
                if row_min.as_ref().is_none_or(|m| &e < m) {
                    row_min = Some(e.clone());
                }
                if &e <= cutoff {
                    out.push((j, k, e.clone()));
                    if out.len() as u64 > limit {
                        return Err(Error::budget(format!(
                            "listing the top's levels up to {} exceeds the memory budget: give a \
                             lower cutoff",
                            exact_decimal(cutoff, 30)
                        )));
                    }
                }
                prev_k = Some(e);
            }
            let row_min = row_min.expect("J row has K = 0");
            if let Some(p) = &prev_min {
                if &row_min <= p {
                    notes.push(format!(
                        "symmetric top: the lowest energy of each J stops increasing after J = {} \
                         because of the centrifugal terms; no levels are listed beyond it",
                        j - 1
                    ));
                    out.retain(|(jj, _, _)| *jj < j);
                    break;
                }
            }
            if &row_min > cutoff {
                break;
            }
            prev_min = Some(row_min);
        }
        Ok((out, notes))
    }
}

impl SymmetricTop {
    /// The same top with the nuclear-spin statistics of three equivalent
    /// nuclei of spin `twice_spin`/2 on its axis (ammonia-like): each
    /// (J, |K|) level weighs (2J+1) times m_A1 + m_A2 (K = 0),
    /// 2(m_A1 + m_A2) (K ≡ 0 mod 3, K > 0) or 2·m_E (K ≢ 0 mod 3), the
    /// two inversion components together (see
    /// [`crate::models::spin_species`]). With `inversion` = Some(Δ) the
    /// components are listed apart, the upper one Δ higher (Δ ≥ 0; Δ = 0
    /// lists exactly the merged levels). Energies are unchanged; a spin
    /// beyond 2I = 20 or a negative Δ is refused.
    ///
    /// ```
    /// use zsum::models::rotor::{SymmetricTop, TopShape};
    /// use zsum::spectrum::Spectrum;
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// let nh3 = SymmetricTop::rigid(TopShape::Oblate, r("6.2"), r("9.9"), EnergyUnit::Wavenumber)?
    ///     .with_three_fold_spin(1, Some(r("0.79")))?;
    /// let l = nh3.levels_up_to(&r("20"))?;
    /// // (0,0) only as its lower component: 4 spin functions, 1 state each.
    /// assert_eq!(l.levels()[0].degeneracy, 4u32.into());
    /// // (1,1) at B + C = 16.1, s and a each 3 × m_E = 3 × 2 states.
    /// let s = l.iter().find(|x| x.energy == r("16.1")).unwrap();
    /// assert_eq!(s.degeneracy, 6u32.into());
    /// // (1,0) at 2B = 19.8 exists only as its upper component, 19.8 + 0.79 > 20.
    /// assert!(l.iter().all(|x| x.energy != r("19.8")));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn with_three_fold_spin(
        mut self,
        twice_spin: u32,
        inversion: Option<BigRational>,
    ) -> Result<Self> {
        let counts = three_fold_spin(twice_spin)?;
        if let Some(d) = &inversion {
            non_negative("inversion splitting", d)?;
        }
        self.spin = Some(ThreeFold {
            twice_spin,
            counts,
            inversion,
            only: None,
            ground: BigRational::zero(),
        });
        self.settle_ground("both isomers")
    }

    /// The spin isomers: `ortho` (K ≡ 0 mod 3, m_A1 + m_A2 spin functions)
    /// and `para` (the rest, 2·m_E); none without spin statistics.
    pub fn isomers(&self) -> Vec<IsomerInfo> {
        self.isomer_classes().into_iter().map(|(i, _)| i).collect()
    }

    fn isomer_classes(&self) -> Vec<(IsomerInfo, ThreeFoldClass)> {
        let Some(sp) = &self.spin else {
            return Vec::new();
        };
        isomer_table(
            [
                ("ortho", ThreeFoldClass::Ortho),
                ("para", ThreeFoldClass::Para),
            ],
            |c| sp.functions(c),
        )
    }

    /// Only the levels of one spin isomer class, with their weights.
    pub fn only_isomer(self, class: ThreeFoldClass) -> Result<Self> {
        let name = match class {
            ThreeFoldClass::Ortho => "ortho",
            ThreeFoldClass::Para => "para",
        };
        self.with_isomer(name)
    }

    /// Only the spin isomer `name` (`ortho` or `para`); an unknown name, an
    /// isomer without spin functions, or a top without statistics is
    /// refused, naming the isomers there are.
    pub fn with_isomer(mut self, name: &str) -> Result<Self> {
        let twice = self.spin.as_ref().map_or(0, |s| s.twice_spin);
        let nuclei = format!("three nuclei of spin {}", spin_text(twice));
        let class = pick_isomer(&self.isomer_classes(), name, &nuclei)?;
        if let Some(sp) = &mut self.spin {
            sp.only = Some(class);
        }
        self.settle_ground(name)
    }

    /// The mean number of states per rotational state (J, K, M): 1 without
    /// statistics, (spin functions kept)/3 with them (8/3 for three
    /// protons, 4/3 for either of their isomers).
    pub fn mean_spin_weight(&self) -> BigRational {
        let only = self.spin.as_ref().and_then(|s| s.only);
        mean_weight(&self.isomer_classes(), only, 3)
    }

    /// The inversion splitting Δ, if the components are listed apart.
    pub fn inversion(&self) -> Option<&BigRational> {
        self.spin.as_ref().and_then(|s| s.inversion.as_ref())
    }

    /// Finds the lowest weighted level: every candidate lies at or below
    /// the highest E(J ≤ 2, K) + Δ (K = 0 of the ortho class, |K| = 1 or 2
    /// of the para class), so the listing up to there holds it.
    fn settle_ground(mut self, what: &str) -> Result<Self> {
        let delta = self.inversion().cloned().unwrap_or_else(BigRational::zero);
        let probe = (0..=2u64)
            .flat_map(|j| (0..=j).map(move |k| (j, k)))
            .map(|(j, k)| self.energy(j, k))
            .max()
            .unwrap_or_else(BigRational::zero)
            .max(BigRational::zero())
            + delta;
        let (terms, _) = self.weighted(&probe, &Budget::default())?;
        let Some(ground) = terms.into_iter().map(|t| t.e).min() else {
            return Err(Error::invalid(
                "spin isomer",
                what,
                "none of its levels is bound: the centrifugal constants end the top's levels \\
                 before its first one",
            ));
        };
        if let Some(sp) = &mut self.spin {
            sp.ground = ground;
        }
        Ok(self)
    }

    /// The per-M weights `(s, a)` of the (J, |K|) level, ±K together: the
    /// number of K signs (and 0) without statistics.
    fn component_weights(&self, j: u64, k: u64) -> (u64, u64) {
        match &self.spin {
            None => (if k == 0 { 1 } else { 2 }, 0),
            Some(sp) if sp.only.is_some_and(|c| c != ThreeFoldClass::of(k)) => (0, 0),
            Some(sp) => three_fold_weight(&sp.counts, sp.twice_spin % 2 == 1, j, k),
        }
    }

    /// The rigid top's K ladders up to `cutoff` (see `poly_ladders`).
    fn k_ladders(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<crate::spectrum::PolyLadder>> {
        use crate::spectrum::PolyLadder;
        check_cutoff(self, cutoff)?;
        let zero = BigRational::zero();
        let delta = self.inversion().cloned().unwrap_or_else(BigRational::zero);
        // One denominator for every constant.
        let den = [&self.b, &self.unique, &delta, cutoff]
            .iter()
            .fold(BigInt::one(), |l, x| {
                num_integer::Integer::lcm(&l, x.denom())
            });
        let num = |x: &BigRational| x.numer() * (&den / x.denom());
        let d = BigRational::from_integer(den.clone());
        let (b_num, cut_num) = (num(&self.b), num(cutoff));
        let diff = &self.unique - &self.b;
        // Rows of J for the work estimate: K up to where E(J = K) passes
        // the cutoff.
        let lowest = if self.unique < self.b {
            &self.unique
        } else {
            &self.b
        };
        let j_est = j_estimate(cutoff, lowest);
        budget.check_levels(
            format_args!(
                "listing the top's K ladders up to {} {}",
                crate::exact::format_sig(cutoff, 6),
                self.unit
            ),
            (j_est + 1.0) * (j_est + 2.0) / 2.0,
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        let components: Vec<(u8, BigRational)> = match self.inversion() {
            None => vec![(2, zero.clone())],
            Some(dl) => vec![(0, zero.clone()), (1, dl.clone())],
        };
        let mut out = Vec::new();
        for k in 0u64.. {
            let k2 = BigRational::from_integer(BigInt::from(k) * BigInt::from(k));
            let base = &diff * &k2;
            // The lowest rung J = K must lie at or below the cutoff.
            let first_e =
                &self.b * BigRational::from_integer(BigInt::from(k) * BigInt::from(k + 1)) + &base;
            if &first_e > cutoff {
                break;
            }
            for (which, shift) in &components {
                let a0 = &base + shift;
                // Last J: B·J(J+1) ≤ cutoff − a0, in integers over den.
                let room = &cut_num - num(&a0);
                if room.is_negative() {
                    continue;
                }
                let q = &room / &b_num;
                let last: BigInt = ((q * 4u32 + 1u32).sqrt() - 1u32) / 2u32;
                let Some(last) = last.to_u64() else {
                    return Err(Error::budget(format!(
                        "listing the top's K ladders up to {} {} exceeds the memory budget: give \
                         a lower cutoff",
                        crate::exact::format_sig(cutoff, 6),
                        self.unit
                    )));
                };
                if last < k {
                    continue;
                }
                let weight = |j: u64| -> BigUint {
                    let (ws, wa) = self.component_weights(j, k);
                    BigUint::from(match which {
                        0 => ws,
                        1 => wa,
                        _ => ws + wa,
                    })
                };
                // Weights of even and odd J (on rungs J ≥ K).
                let (je, jo) = if k % 2 == 0 { (k, k + 1) } else { (k + 1, k) };
                let weights = [weight(je), weight(jo)];
                if weights.iter().all(Zero::is_zero) {
                    continue;
                }
                out.push(PolyLadder {
                    numerators: vec![(&a0 * &d).to_integer(), b_num.clone()],
                    denominator: den.clone(),
                    first: k,
                    last,
                    weights,
                });
            }
        }
        Ok(out)
    }

    /// The weighted levels (or inversion components) up to `cutoff`, none
    /// of weight zero, in row order, and the listing's notes.
    fn weighted(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<(Vec<TopTerm>, Vec<String>)> {
        let (rows, notes) = self.rows(cutoff, budget)?;
        let split = self.inversion();
        let mut out = Vec::with_capacity(rows.len());
        for (j, k, e) in rows {
            let (ws, wa) = self.component_weights(j, k);
            match split {
                None => out.push(TopTerm {
                    e,
                    j,
                    k,
                    inv: None,
                    w: ws + wa,
                }),
                Some(d) => {
                    let up = &e + d;
                    out.push(TopTerm {
                        e,
                        j,
                        k,
                        inv: Some(0),
                        w: ws,
                    });
                    if &up <= cutoff {
                        out.push(TopTerm {
                            e: up,
                            j,
                            k,
                            inv: Some(1),
                            w: wa,
                        });
                    }
                }
            }
        }
        out.retain(|t| t.w > 0);
        Ok((out, notes))
    }

    /// The states of one weighted term, as (J, K, M[, inv][, s]). With
    /// statistics, `s` numbers the spin functions paired with the signed
    /// K; for a (J, |K| ≡ 0 mod 3 > 0) inversion component, whose two ±K
    /// combinations pair with the A1 and the A2 spin functions, +K labels
    /// the first (m_A1 values of s) and −K the second (m_A2).
    fn term_states(&self, t: &TopTerm, out: &mut Vec<State>) {
        let (j, k) = (t.j as i64, t.k as i64);
        let signed: Vec<(i64, u64)> = match (&self.spin, t.inv) {
            (None, _) if k == 0 => vec![(0, 1)],
            (None, _) => vec![(-k, 1), (k, 1)],
            (Some(_), _) if k == 0 => vec![(0, t.w)],
            (Some(sp), Some(_)) if t.k % 3 == 0 => vec![(-k, sp.counts.a2), (k, sp.counts.a1)],
            (Some(_), _) => vec![(-k, t.w / 2), (k, t.w / 2)],
        };
        for (kk, count) in signed {
            for m in -j..=j {
                for s in 1..=count as i64 {
                    let mut q = vec![j, kk, m];
                    q.extend(t.inv);
                    if self.spin.is_some() {
                        q.push(s);
                    }
                    out.push(State(q));
                }
            }
        }
    }
}

impl Spectrum for SymmetricTop {
    fn structure(&self) -> Structure<'_> {
        Structure::Top {
            b: self.b.clone(),
            unique: self.unique.clone(),
            weight: self.mean_spin_weight(),
            inversion: self.inversion().cloned().unwrap_or_else(BigRational::zero),
        }
    }

    fn describe(&self) -> String {
        let (shape, letter) = match self.shape {
            TopShape::Prolate => ("prolate", "A"),
            TopShape::Oblate => ("oblate", "C"),
        };
        let mut text = format!(
            "{shape} symmetric top, {letter} = {} {u}, B = {} {u}",
            exact_decimal(&self.unique, 30),
            exact_decimal(&self.b, 30),
            u = self.unit
        );
        if let Some(sp) = &self.spin {
            text += &format!(
                ", three equivalent nuclei of spin {}",
                spin_text(sp.twice_spin)
            );
            if let Some(d) = &sp.inversion {
                text += &format!(
                    ", inversion splitting {} {}",
                    exact_decimal(d, 30),
                    self.unit
                );
            }
            match sp.only {
                Some(ThreeFoldClass::Ortho) => text += ", ortho only (K = 0 mod 3)",
                Some(ThreeFoldClass::Para) => text += ", para only (K not 0 mod 3)",
                None => {}
            }
        }
        text
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    /// `J`, `K`, `M`; with an inversion splitting `inv` (0 for the lower
    /// "s", 1 for the upper "a" component); with spin statistics `s`, the
    /// spin function paired with the state (see `term_states`).
    fn quantum_numbers(&self) -> Vec<String> {
        let mut q: Vec<String> = ["J", "K", "M"].map(String::from).to_vec();
        if self.inversion().is_some() {
            q.push("inv".into());
        }
        if self.spin.is_some() {
            q.push("s".into());
        }
        q
    }

    fn ground_energy(&self) -> BigRational {
        self.spin
            .as_ref()
            .map_or_else(BigRational::zero, |s| s.ground.clone())
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let (terms, _) = self.weighted(cutoff, budget)?;
        let levels = terms
            .into_iter()
            .map(|t| {
                let g = t.states();
                Level::new(t.e, g)
            })
            .collect();
        Ok(LevelList::new(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        if energy.is_negative() {
            return Ok(Vec::new());
        }
        let (terms, _) = self.weighted(energy, &Budget::default())?;
        let mut out = Vec::new();
        for t in terms.iter().filter(|t| &t.e == energy) {
            self.term_states(t, &mut out);
        }
        out.sort();
        Ok(out)
    }

    /// `J` and `K` ≥ 0 (and `inv` with an inversion splitting): one term
    /// stands for the ±K pair.
    fn term_numbers(&self) -> Vec<String> {
        let mut t = vec!["J".into(), "K".into()];
        if self.inversion().is_some() {
            t.push("inv".into());
        }
        t
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        let (terms, _) = self.weighted(cutoff, budget)?;
        Ok(terms
            .into_iter()
            .map(|t| {
                let mut q = vec![t.j as i64, t.k as i64];
                q.extend(t.inv);
                (t.e, q)
            })
            .collect())
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.5)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Exact: the weighted terms up to `energy`, each counted once. The
        // widest listing is kept: a narrower one is the same terms with
        // energy at most the cutoff (the rows and the turnovers do not
        // depend on the cutoff beyond where each row stops).
        if energy.is_negative() {
            return BigUint::zero();
        }
        let memo = || {
            self.counted
                .0
                .lock()
                .unwrap_or_else(std::sync::PoisonError::into_inner)
        };
        let cached = memo()
            .iter()
            .find(|(spin, c, _)| spin == &self.spin && energy <= c)
            .map(|(_, _, counted)| counted.clone());
        let counted = match cached {
            Some(t) => t,
            None => match self.weighted(energy, &Budget::default()) {
                Ok((terms, _)) => {
                    let counted = std::sync::Arc::new(Counted::new(terms));
                    let mut m = memo();
                    m.retain(|(spin, _, _)| spin != &self.spin);
                    m.push((self.spin.clone(), energy.clone(), counted.clone()));
                    counted
                }
                Err(_) => return BigUint::from(u64::MAX),
            },
        };
        counted.up_to(energy)
    }

    /// For a rigid top, one ladder per |K| (and per inversion component):
    /// E = B·J(J+1) + (u − B)K² (+ Δ) along J ≥ |K|, a polynomial in
    /// J(J+1) whose weights per M depend on J only through its parity (the
    /// K = 0 components of a three-fold top). A distorted top lists its
    /// levels instead (its rows may turn over).
    fn poly_ladders(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Option<Result<Vec<crate::spectrum::PolyLadder>>> {
        if !(self.dj.is_zero() && self.djk.is_zero() && self.dk.is_zero()) {
            return None;
        }
        Some(self.k_ladders(cutoff, budget))
    }

    /// For a rigid top, a closed form: every level of J lies at or above
    /// m·J(J+1) with m the smaller of B and the unique constant (|K| ≤ J),
    /// so at most Σ_{J ≤ n} (2J+1)² = (n+1)(2n+1)(2n+3)/3 (K, M) states lie
    /// at or below `energy`, n the last J with m·J(J+1) ≤ energy, each with
    /// at most the largest spin weight of one K-state (the weights of both
    /// inversion components together). With distortion, the exact count.
    fn tail_bound(&self, energy: &BigRational) -> BigUint {
        if energy.is_negative() {
            return BigUint::zero();
        }
        if !(self.dj.is_zero() && self.djk.is_zero() && self.dk.is_zero()) {
            return self.count_bound(energy);
        }
        let m = if self.unique < self.b {
            &self.unique
        } else {
            &self.b
        };
        let q = (energy / m).floor().to_integer();
        let n: BigInt = ((q * 4u32 + 1u32).sqrt() - 1u32) / 2u32;
        let n = BigUint::try_from(n).unwrap_or_default();
        let states = (&n + 1u32) * (&n * 2u32 + 1u32) * (&n * 2u32 + 3u32) / 3u32;
        // The largest weight of one K-state over the three classes (K = 0,
        // K ≡ 0 mod 3, the rest; a ±K pair counts two K-states).
        let per_k = [(0u64, 0u64), (1, 3), (1, 1)]
            .iter()
            .map(|&(j, k)| {
                let (ws, wa) = self.component_weights(j.max(k), k);
                let (ws, wa) = if k == 0 {
                    let (s2, a2) = self.component_weights(1, 0);
                    (ws.max(s2), wa.max(a2))
                } else {
                    (ws.div_ceil(2), wa.div_ceil(2))
                };
                ws + wa
            })
            .max()
            .unwrap_or(1)
            .max(1);
        states * per_k
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        self.rows(cutoff, &Budget::default())
            .map(|(_, n)| n)
            .unwrap_or_default()
    }
}

/// A spherical top: E = B J(J+1) − D [J(J+1)]², (2J+1)² states per J, or
/// with the nuclear-spin statistics of four equivalent nuclei
/// (methane-like) (2J+1)·[a·m_A + e·2·m_E + f·m_F] states.
///
/// ```
/// use zsum::models::rotor::SphericalTop;
/// use zsum::spectrum::Spectrum;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// let ch4 = SphericalTop::new(r("5.24"), r("0"), EnergyUnit::Wavenumber)?.with_spin_statistics(1)?;
/// let l = ch4.levels_up_to(&r("32"))?;
/// // J = 0: A (5); J = 1: F (3 × 3 M); J = 2: E + F ((2 + 3) × 5 M).
/// let g: Vec<u32> = l.iter().map(|x| x.degeneracy.to_u32_digits()[0]).collect();
/// assert_eq!(g, [5, 9, 25]);
/// let meta = ch4.with_isomer("meta")?; // A levels only: J = 0, 3, 4, ...
/// assert_eq!(meta.levels_up_to(&r("32"))?.len(), 1);
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SphericalTop {
    b: BigRational,
    d: BigRational,
    unit: EnergyUnit,
    spin: Option<Tetrahedral>,
}

/// Nuclear-spin statistics of four equivalent nuclei on a tetrahedron: the
/// spin-function counts by species of T, the class kept, and the lowest
/// weighted level.
#[derive(Debug, Clone, PartialEq, Eq)]
struct Tetrahedral {
    twice_spin: u32,
    counts: TSpecies,
    only: Option<TClass>,
    ground: BigRational,
}

impl Tetrahedral {
    /// The spin functions of a class: m_A, 2·m_E, 3·m_F.
    fn functions(&self, c: TClass) -> u64 {
        match c {
            TClass::A => self.counts.a,
            TClass::E => 2 * self.counts.e,
            TClass::F => 3 * self.counts.f,
        }
    }
}

impl SphericalTop {
    /// A spherical top with constant `b` and centrifugal constant `d`
    /// (zero for rigid).
    pub fn new(b: BigRational, d: BigRational, unit: EnergyUnit) -> Result<Self> {
        positive("rotational constant B", &b)?;
        non_negative("centrifugal constant D", &d)?;
        let t = SphericalTop {
            b,
            d,
            unit,
            spin: None,
        };
        if t.energy(1) <= t.energy(0) {
            return Err(Error::invalid(
                "centrifugal constant D",
                exact_decimal(&t.d, 30),
                "it is so large that E(J=1) does not lie above E(J=0); no level is bound",
            ));
        }
        Ok(t)
    }

    /// The same top with the nuclear-spin statistics of four equivalent
    /// nuclei of spin `twice_spin`/2 (methane-like): level J holds
    /// (2J+1)·[a·m_A + e·2·m_E + f·m_F] states, a, e, f the species of T
    /// in D^J and m the spin functions of each (see
    /// [`crate::models::spin_species`]). A spin beyond 2I = 20 is refused.
    pub fn with_spin_statistics(mut self, twice_spin: u32) -> Result<Self> {
        self.spin = Some(Tetrahedral {
            twice_spin,
            counts: tetrahedral_spin(twice_spin)?,
            only: None,
            ground: BigRational::zero(),
        });
        self.settle_ground("all isomers")
    }

    /// The spin isomers, as the trade names methane's: `meta` (A levels,
    /// m_A spin functions), `para` (E, 2·m_E) and `ortho` (F, 3·m_F);
    /// none without spin statistics.
    pub fn isomers(&self) -> Vec<IsomerInfo> {
        self.isomer_classes().into_iter().map(|(i, _)| i).collect()
    }

    fn isomer_classes(&self) -> Vec<(IsomerInfo, TClass)> {
        let Some(sp) = &self.spin else {
            return Vec::new();
        };
        isomer_table(
            [
                ("meta", TClass::A),
                ("para", TClass::E),
                ("ortho", TClass::F),
            ],
            |c| sp.functions(c),
        )
    }

    /// Only the levels of rotational species `class` (A meta, E para, F
    /// ortho), with their weights.
    pub fn only_species(self, class: TClass) -> Result<Self> {
        let name = match class {
            TClass::A => "meta",
            TClass::E => "para",
            TClass::F => "ortho",
        };
        self.with_isomer(name)
    }

    /// Only the spin isomer `name` (`meta`, `para` or `ortho`); an unknown
    /// name, an isomer without spin functions, or a top without statistics
    /// is refused, naming the isomers there are.
    pub fn with_isomer(mut self, name: &str) -> Result<Self> {
        let twice = self.spin.as_ref().map_or(0, |s| s.twice_spin);
        let nuclei = format!("four nuclei of spin {}", spin_text(twice));
        let class = pick_isomer(&self.isomer_classes(), name, &nuclei)?;
        if let Some(sp) = &mut self.spin {
            sp.only = Some(class);
        }
        self.settle_ground(name)
    }

    /// The mean number of states per rotational state (J, K, M): 1 without
    /// statistics, (spin functions kept)/12 with them (16/12 for methane,
    /// 5/12 for its meta isomer).
    pub fn mean_spin_weight(&self) -> BigRational {
        let only = self.spin.as_ref().and_then(|s| s.only);
        mean_weight(&self.isomer_classes(), only, 12)
    }

    /// The states per M of level J: 2J+1 without statistics, else the
    /// weighted species count.
    fn k_weight(&self, j: u64) -> BigUint {
        match &self.spin {
            None => BigUint::from(2 * j + 1),
            Some(sp) => BigUint::from(spherical_weight(
                &rotation_species_t(j),
                &sp.counts,
                sp.only,
            )),
        }
    }

    fn degeneracy(&self, j: u64) -> BigUint {
        BigUint::from(2 * j + 1) * self.k_weight(j)
    }

    /// The lowest J with a non-zero weight (A at J = 0, F at 1, E at 2: the
    /// first six J hold every species) must be on the ladder.
    fn settle_ground(mut self, what: &str) -> Result<Self> {
        let Some(j) = (0..=6u64).find(|&j| !self.k_weight(j).is_zero()) else {
            return Err(Error::invalid("spin isomer", what, "it has no levels"));
        };
        let e = self.energy(j);
        let (rungs, _) = self.rungs(&e, &Budget::default())?;
        if rungs.last().map(|r| r.0) != Some(j) {
            return Err(Error::invalid(
                "spin isomer",
                what,
                &format!(
                    "its first level, J = {j}, lies beyond where the centrifugal constant D \\
                     ends the ladder"
                ),
            ));
        }
        if let Some(sp) = &mut self.spin {
            sp.ground = e;
        }
        Ok(self)
    }

    /// E(J), exactly.
    pub fn energy(&self, j: u64) -> BigRational {
        let x = int(j * (j + 1));
        &self.b * &x - &self.d * &x * &x
    }

    fn rungs(&self, cutoff: &BigRational, budget: &Budget) -> Result<Rungs> {
        let est = j_estimate(cutoff, &self.b).min(turnover_estimate(&self.b, &self.d));
        check_rungs("spherical top", est, cutoff, budget)?;
        ladder(|j| self.energy(j), cutoff, max_rungs(budget))
    }
}

impl Spectrum for SphericalTop {
    fn structure(&self) -> Structure<'_> {
        Structure::Spherical(SphericalLadder {
            b: self.b.clone(),
            weight: self.mean_spin_weight(),
        })
    }

    fn describe(&self) -> String {
        let mut text = format!(
            "spherical top, B = {} {}",
            exact_decimal(&self.b, 30),
            self.unit
        );
        if let Some(sp) = &self.spin {
            text += &format!(
                ", four equivalent nuclei of spin {} (weights A {}, E pair {}, F {})",
                spin_text(sp.twice_spin),
                multiplet_weight(&sp.counts, TClass::A),
                multiplet_weight(&sp.counts, TClass::E),
                multiplet_weight(&sp.counts, TClass::F)
            );
            match sp.only {
                Some(TClass::A) => text += ", meta (A) only",
                Some(TClass::E) => text += ", para (E) only",
                Some(TClass::F) => text += ", ortho (F) only",
                None => {}
            }
        }
        text
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    /// `J`, `K`, `M` without statistics. With them `J`, `tau`, `M`, `s`:
    /// `tau` numbers the rotational multiplets of J by species of T (the A
    /// ones first, then the E pairs, then the F triplets, counted whether
    /// kept or not), and `s` the allowed rotation–spin states built on the
    /// multiplet (m_A, 2·m_E or m_F of them).
    fn quantum_numbers(&self) -> Vec<String> {
        let k = if self.spin.is_some() { "tau" } else { "K" };
        let mut q: Vec<String> = ["J", k, "M"].map(String::from).to_vec();
        if self.spin.is_some() {
            q.push("s".into());
        }
        q
    }

    fn ground_energy(&self) -> BigRational {
        self.spin
            .as_ref()
            .map_or_else(BigRational::zero, |s| s.ground.clone())
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let (rungs, _) = self.rungs(cutoff, budget)?;
        let levels = rungs
            .into_iter()
            .map(|(j, e)| Level::new(e, self.degeneracy(j)))
            .filter(|l| !l.degeneracy.is_zero())
            .collect();
        Ok(LevelList::from_sorted(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let (rungs, _) = self.rungs(energy, &Budget::default())?;
        let Some((j, e)) = rungs.last() else {
            return Ok(Vec::new());
        };
        if e != energy {
            return Ok(Vec::new());
        }
        let (ju, j) = (*j, *j as i64);
        let mut out = Vec::new();
        match &self.spin {
            None => {
                for k in -j..=j {
                    for m in -j..=j {
                        out.push(State(vec![j, k, m]));
                    }
                }
            }
            Some(sp) => {
                let rot = rotation_species_t(ju);
                let mut tau = 0i64;
                for c in TClass::ALL {
                    let w = if sp.only.is_none_or(|o| o == c) {
                        multiplet_weight(&sp.counts, c) as i64
                    } else {
                        0
                    };
                    for _ in 0..rot.get(c) {
                        tau += 1;
                        for m in -j..=j {
                            for s in 1..=w {
                                out.push(State(vec![j, tau, m, s]));
                            }
                        }
                    }
                }
                out.sort();
            }
        }
        Ok(out)
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["J".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        let (rungs, _) = self.rungs(cutoff, budget)?;
        Ok(rung_terms(rungs, |j| !self.k_weight(j).is_zero()))
    }

    fn highest_energy(&self) -> Option<BigRational> {
        turnover_poly(&self.b, &self.d, &BigRational::zero())
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.5)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Rigid: the rungs are J(J+1) ≤ ⌊E/B⌋, found by one integer root
        // instead of stepping the ladder in rationals (the tail bounds ask
        // at dozens of energies per temperature); the same rungs and
        // refusals as the listing.
        if self.d.is_zero() {
            if energy.is_negative() {
                return BigUint::zero();
            }
            let budget = Budget::default();
            let est = j_estimate(energy, &self.b);
            let n = (energy / &self.b).floor().to_integer();
            let j_end = (((n * 4u32) + 1u32).sqrt() - 1u32) / 2u32;
            return match j_end.to_u64() {
                Some(j)
                    if check_rungs("spherical top", est, energy, &budget).is_ok()
                        && j < max_rungs(&budget) =>
                {
                    (0..=j).map(|j| self.degeneracy(j)).sum()
                }
                _ => BigUint::from(u64::MAX),
            };
        }
        match self.rungs(energy, &Budget::default()) {
            Ok((rungs, _)) => rungs.iter().map(|(j, _)| self.degeneracy(*j)).sum(),
            Err(_) => BigUint::from(u64::MAX),
        }
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        match self.rungs(cutoff, &Budget::default()) {
            Ok((rungs, Some(j))) => vec![turnover_warning(
                "spherical top",
                j,
                &rungs[j as usize].1,
                &self.unit,
            )],
            _ => Vec::new(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The rigid spherical top's count bound by the integer root equals the
    /// sum of degeneracies over the rungs the listing steps to, at every
    /// level's energy, just below it, and between levels.
    #[test]
    fn spherical_count_by_root_equals_the_stepped_rungs() {
        let r = |n: i64, d: i64| BigRational::new(n.into(), d.into());
        let plain = SphericalTop::new(r(52410, 10000), r(0, 1), EnergyUnit::Wavenumber).unwrap();
        let spins = plain.clone().with_spin_statistics(1).unwrap();
        let meta = spins.clone().with_isomer("meta").unwrap();
        for top in [plain, spins, meta] {
            let stepped = |e: &BigRational| -> BigUint {
                match top.rungs(e, &Budget::default()) {
                    Ok((rungs, _)) => rungs.iter().map(|(j, _)| top.degeneracy(*j)).sum(),
                    Err(_) => BigUint::from(u64::MAX),
                }
            };
            let mut energies = vec![r(-1, 3), r(0, 1)];
            for j in 0..120u64 {
                let e = top.energy(j);
                energies.push(&e - r(1, 1_000_000_007));
                energies.push(e.clone());
                energies.push(&e + r(7, 3));
            }
            for e in &energies {
                assert_eq!(top.count_bound(e), stepped(e), "at {e}");
            }
        }
    }
}
