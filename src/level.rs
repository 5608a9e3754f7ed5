//! Exact, degeneracy-weighted level lists.
//!
//! A [`Level`] is an energy and a big-integer degeneracy. The energy is an
//! exact rational, or, for an energy that is not rational (an eigenvalue of
//! a matrix, as for the asymmetric top), a certified [`Enclosure`]: the true
//! value lies between two rationals, and the level's `energy` is a rational
//! inside them (its midpoint), never to be read as exact. A [`LevelList`]
//! keeps its levels sorted by energy with equal exact energies merged and
//! zero degeneracies dropped, in one stated [`EnergyUnit`]. Enclosed levels
//! are never merged by the list: a model merges them only where it has
//! proved them equal. All operations (union, product, shift, scale,
//! truncation) are exact on exact energies and carry enclosures exactly.

use crate::error::{Error, ErrorKind, Result};
use crate::exact::rational_string;
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::{Deserialize, Serialize};
use std::cmp::Ordering;

/// A certified enclosure of an energy that is not rational: the true value
/// lies in `[lo, hi]`.
#[derive(Debug, Clone, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct Enclosure {
    /// The lower end.
    #[serde(with = "crate::serde_exact::ratio")]
    pub lo: BigRational,
    /// The upper end.
    #[serde(with = "crate::serde_exact::ratio")]
    pub hi: BigRational,
}

impl Enclosure {
    /// Half the width, (hi − lo)/2.
    pub fn radius(&self) -> BigRational {
        (&self.hi - &self.lo) / BigRational::from_integer(2.into())
    }

    /// Half the width as an `f64` within a relative 2^−50 of it (no
    /// reduction of the difference: the hot sums take it per level and per
    /// temperature); infinite when it leaves the `f64` range.
    pub fn radius_f64(&self) -> f64 {
        use num_traits::ToPrimitive;
        let num = self.hi.numer() * self.lo.denom() - self.lo.numer() * self.hi.denom();
        let den = self.hi.denom() * self.lo.denom() * 2;
        BigRational::new_raw(num, den)
            .to_f64()
            .filter(|r| r.is_finite())
            .unwrap_or(f64::INFINITY)
    }
}

/// One energy level: an energy and the number of states at it.
#[derive(Debug, Clone, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct Level {
    /// The energy in the unit of the list that holds it: exact when
    /// `enclosure` is `None`, else a rational inside the enclosure (its
    /// midpoint), not the energy itself.
    #[serde(with = "crate::serde_exact::ratio")]
    pub energy: BigRational,
    /// The number of states sharing this energy.
    #[serde(with = "crate::serde_exact::uint")]
    pub degeneracy: BigUint,
    /// For an energy that is not rational, its certified enclosure.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub enclosure: Option<Box<Enclosure>>,
}

impl Level {
    /// A level with the given exact energy and degeneracy.
    pub fn new(energy: BigRational, degeneracy: impl Into<BigUint>) -> Self {
        Level {
            energy,
            degeneracy: degeneracy.into(),
            enclosure: None,
        }
    }

    /// A level whose energy is known to lie in `[lo, hi]` (lo ≤ hi), with
    /// the midpoint as its representative energy; an empty-width enclosure
    /// is an exact energy.
    pub fn enclosed(lo: BigRational, hi: BigRational, degeneracy: impl Into<BigUint>) -> Self {
        if lo == hi {
            return Level::new(lo, degeneracy);
        }
        let mid = (&lo + &hi) / BigRational::from_integer(2.into());
        Level {
            energy: mid,
            degeneracy: degeneracy.into(),
            enclosure: Some(Box::new(Enclosure { lo, hi })),
        }
    }

    /// Whether the energy is exact.
    pub fn is_exact(&self) -> bool {
        self.enclosure.is_none()
    }

    /// The lowest value the energy may take (the energy itself if exact).
    pub fn lowest(&self) -> &BigRational {
        self.enclosure.as_ref().map_or(&self.energy, |e| &e.lo)
    }

    /// The highest value the energy may take (the energy itself if exact).
    pub fn highest(&self) -> &BigRational {
        self.enclosure.as_ref().map_or(&self.energy, |e| &e.hi)
    }

    /// Half the enclosure's width; zero for an exact energy.
    pub fn radius(&self) -> BigRational {
        self.enclosure
            .as_ref()
            .map_or_else(BigRational::zero, |e| e.radius())
    }

    /// The level with every possible energy mapped by the increasing map
    /// `f` (a shift, or a scale by a positive factor).
    fn mapped(&self, f: impl Fn(&BigRational) -> BigRational) -> Level {
        match &self.enclosure {
            None => Level::new(f(&self.energy), self.degeneracy.clone()),
            Some(e) => Level::enclosed(f(&e.lo), f(&e.hi), self.degeneracy.clone()),
        }
    }

    /// The combined level of two independent subsystems' levels: energies
    /// (and enclosures) add, degeneracies multiply.
    fn combined(&self, other: &Level) -> Level {
        let g = &self.degeneracy * &other.degeneracy;
        if self.is_exact() && other.is_exact() {
            return Level::new(&self.energy + &other.energy, g);
        }
        Level::enclosed(
            self.lowest() + other.lowest(),
            self.highest() + other.highest(),
            g,
        )
    }
}

/// Levels sorted by strictly increasing energy, each with a positive
/// degeneracy, in one unit.
///
/// ```
/// use zsum::level::{Level, LevelList};
/// use zsum::units::EnergyUnit;
/// use num_rational::BigRational;
/// let e = |n: i64| BigRational::from_integer(n.into());
/// // A two-level system with a doubly degenerate upper level...
/// let a = LevelList::new(EnergyUnit::Kelvin, vec![Level::new(e(0), 1u32), Level::new(e(10), 2u32)]);
/// // ...times itself: energies add, degeneracies multiply.
/// let aa = a.product(&a).unwrap();
/// let degs: Vec<String> = aa.iter().map(|l| l.degeneracy.to_string()).collect();
/// assert_eq!(degs, ["1", "4", "4"]);
/// assert_eq!(aa.total_states(), 9u32.into());
/// ```
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(try_from = "RawLevelList")]
pub struct LevelList {
    unit: EnergyUnit,
    levels: Vec<Level>,
}

#[derive(Deserialize)]
struct RawLevelList {
    unit: EnergyUnit,
    levels: Vec<Level>,
}

impl TryFrom<RawLevelList> for LevelList {
    type Error = Error;
    fn try_from(raw: RawLevelList) -> Result<Self> {
        Ok(LevelList::new(raw.unit, raw.levels))
    }
}

impl LevelList {
    /// Builds a list from levels in any order: sorts by energy, merges equal
    /// energies (adding degeneracies) and drops levels of degeneracy zero.
    pub fn new(unit: EnergyUnit, mut levels: Vec<Level>) -> Self {
        // Sort in place on f64 approximations where they decide (each is
        // within a relative 2^-53 of its energy, so values further apart
        // than a relative 1e-12, in the normal range, order the energies),
        // else exactly; no second copy of the list is made.
        let key = |l: &Level| num_traits::ToPrimitive::to_f64(&l.energy).unwrap_or(f64::NAN);
        levels.sort_by(|a, b| {
            let (ka, kb) = (key(a), key(b));
            let big = ka.abs().max(kb.abs());
            if ka.is_finite() && kb.is_finite() && big > 1e-290 && (ka - kb).abs() > 1e-12 * big {
                return ka.total_cmp(&kb);
            }
            a.energy.cmp(&b.energy)
        });
        let mut out: Vec<Level> = Vec::with_capacity(levels.len());
        for l in levels {
            if l.degeneracy.is_zero() {
                continue;
            }
            match out.last_mut() {
                Some(last) if last.is_exact() && l.is_exact() && last.energy == l.energy => {
                    last.degeneracy += l.degeneracy
                }
                _ => out.push(l),
            }
        }
        LevelList { unit, levels: out }
    }

    /// Builds a list from levels already sorted by increasing energy
    /// (strictly between exact ones) with positive degeneracies. The order
    /// is checked in debug builds only; callers (the models) guarantee it.
    pub(crate) fn from_sorted(unit: EnergyUnit, levels: Vec<Level>) -> Self {
        debug_assert!(levels.windows(2).all(|w| w[0].energy < w[1].energy
            || (w[0].energy == w[1].energy && !(w[0].is_exact() && w[1].is_exact()))));
        debug_assert!(levels.iter().all(|l| !l.degeneracy.is_zero()));
        LevelList { unit, levels }
    }

    /// An empty list in the given unit.
    pub fn empty(unit: EnergyUnit) -> Self {
        LevelList {
            unit,
            levels: Vec::new(),
        }
    }

    /// The unit of every energy in the list.
    pub fn unit(&self) -> &EnergyUnit {
        &self.unit
    }

    /// The levels, lowest first.
    pub fn levels(&self) -> &[Level] {
        &self.levels
    }

    /// Iterates over the levels, lowest first.
    pub fn iter(&self) -> std::slice::Iter<'_, Level> {
        self.levels.iter()
    }

    /// Number of distinct levels.
    pub fn len(&self) -> usize {
        self.levels.len()
    }

    /// Whether the list has no levels.
    pub fn is_empty(&self) -> bool {
        self.levels.is_empty()
    }

    /// The lowest level, if any.
    pub fn ground(&self) -> Option<&Level> {
        self.levels.first()
    }

    /// Total number of states (sum of degeneracies).
    pub fn total_states(&self) -> BigUint {
        self.levels.iter().map(|l| &l.degeneracy).sum()
    }

    /// Whether every energy is exact (no level carries an enclosure).
    pub fn is_exact(&self) -> bool {
        self.levels.iter().all(Level::is_exact)
    }

    /// Number of states with energy at most `e`: N(≤ e). For enclosed
    /// energies, the states whose enclosure lies at or below `e` (the
    /// listing models refine enclosures until each lies on one side of a
    /// cutoff they are asked for).
    pub fn count_up_to(&self, e: &BigRational) -> BigUint {
        self.levels
            .iter()
            .take_while(|l| l.lowest() <= e)
            .filter(|l| l.highest() <= e)
            .map(|l| &l.degeneracy)
            .sum()
    }

    /// The cumulative count N(≤ E_i) at every level energy E_i.
    pub fn cumulative(&self) -> Vec<(BigRational, BigUint)> {
        let mut n = BigUint::zero();
        self.levels
            .iter()
            .map(|l| {
                n += &l.degeneracy;
                (l.energy.clone(), n.clone())
            })
            .collect()
    }

    /// The levels with energy at most `cutoff`; an enclosed level is kept
    /// when its energy may lie at or below the cutoff (so that no state
    /// at or below it is left out).
    pub fn truncated(&self, cutoff: &BigRational) -> LevelList {
        let levels = if self.is_exact() {
            let end = self.levels.partition_point(|l| &l.energy <= cutoff);
            self.levels[..end].to_vec()
        } else {
            self.levels
                .iter()
                .filter(|l| l.lowest() <= cutoff)
                .cloned()
                .collect()
        };
        LevelList {
            unit: self.unit.clone(),
            levels,
        }
    }

    fn same_unit(&self, other: &LevelList, op: &str) -> Result<()> {
        if self.unit == other.unit {
            Ok(())
        } else {
            Err(Error::new(
                ErrorKind::Mismatch,
                format!(
                    "cannot form the {op} of a list in {} with a list in {}: convert one first \
                     (LevelList::converted)",
                    self.unit, other.unit
                ),
            ))
        }
    }

    /// The union of two lists (a mixture): every state of both, with
    /// degeneracies added where energies coincide. Units must agree.
    pub fn union(&self, other: &LevelList) -> Result<LevelList> {
        self.same_unit(other, "union")?;
        let mut out = Vec::with_capacity(self.len() + other.len());
        let (mut i, mut j) = (0, 0);
        let (a, b) = (&self.levels, &other.levels);
        while i < a.len() || j < b.len() {
            let ord = match (a.get(i), b.get(j)) {
                (Some(x), Some(y)) => x.energy.cmp(&y.energy),
                (Some(_), None) => Ordering::Less,
                _ => Ordering::Greater,
            };
            match ord {
                Ordering::Less => {
                    out.push(a[i].clone());
                    i += 1;
                }
                Ordering::Greater => {
                    out.push(b[j].clone());
                    j += 1;
                }
                Ordering::Equal if a[i].is_exact() && b[j].is_exact() => {
                    out.push(Level::new(
                        a[i].energy.clone(),
                        &a[i].degeneracy + &b[j].degeneracy,
                    ));
                    i += 1;
                    j += 1;
                }
                Ordering::Equal => {
                    out.push(a[i].clone());
                    i += 1;
                }
            }
        }
        Ok(LevelList::from_sorted(self.unit.clone(), out))
    }

    /// The product of two lists: the levels of two independent subsystems
    /// taken together. Energies add and degeneracies multiply, exactly.
    pub fn product(&self, other: &LevelList) -> Result<LevelList> {
        self.product_impl(other, None)
    }

    /// The product of two lists, keeping only combined energies at most
    /// `cutoff`. Cheaper than [`LevelList::product`] followed by truncation:
    /// pairs above the cutoff are never formed.
    pub fn product_up_to(&self, other: &LevelList, cutoff: &BigRational) -> Result<LevelList> {
        self.product_impl(other, Some(cutoff))
    }

    fn product_impl(&self, other: &LevelList, cutoff: Option<&BigRational>) -> Result<LevelList> {
        self.same_unit(other, "product")?;
        let mut pairs = Vec::new();
        let exact = other.is_exact();
        for a in &self.levels {
            for b in &other.levels {
                let l = a.combined(b);
                if cutoff.is_some_and(|c| l.lowest() > c) {
                    if exact {
                        break; // `other` is sorted: every later b is higher still
                    }
                    continue;
                }
                pairs.push(l);
            }
        }
        Ok(LevelList::new(self.unit.clone(), pairs))
    }

    /// Every energy shifted by `delta` (same unit).
    pub fn shifted(&self, delta: &BigRational) -> LevelList {
        LevelList {
            unit: self.unit.clone(),
            levels: self
                .levels
                .iter()
                .map(|l| l.mapped(|e| e + delta))
                .collect(),
        }
    }

    /// Every energy multiplied by `factor`, which must be positive (a
    /// non-positive factor would reverse or collapse the order), with the
    /// result labelled in `unit`.
    pub fn scaled(&self, factor: &BigRational, unit: EnergyUnit) -> Result<LevelList> {
        if !factor.is_positive() {
            return Err(Error::invalid(
                "scale factor",
                rational_string(factor),
                "it must be greater than zero",
            ));
        }
        Ok(LevelList {
            unit,
            levels: self
                .levels
                .iter()
                .map(|l| l.mapped(|e| e * factor))
                .collect(),
        })
    }

    /// The same levels expressed in another unit, exactly.
    pub fn converted(&self, unit: &EnergyUnit) -> Result<LevelList> {
        let f = self.unit.factor_to(unit)?;
        self.scaled(&f, unit.clone())
    }
}

impl<'a> IntoIterator for &'a LevelList {
    type Item = &'a Level;
    type IntoIter = std::slice::Iter<'a, Level>;
    fn into_iter(self) -> Self::IntoIter {
        self.levels.iter()
    }
}
