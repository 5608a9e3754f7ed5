//! A particle in a box with impenetrable (Dirichlet) walls, in 1, 2 or 3
//! dimensions.
//!
//! The sides are `a_i · L` for a reference length `L` and rational ratios
//! `a_i`; the quantum numbers are positive integers and the energy is
//!
//! ```text
//! E(n) = Σ_i n_i² / a_i²      in units of h²/(8 m L²).
//! ```
//!
//! With `D` the least common multiple of the denominators of `1/a_i²`, every
//! energy is an integer `K = Σ w_i n_i²` (with integer weights
//! `w_i = D / a_i²`) divided by `D`, so levels are exact rationals.
//!
//! # Enumeration
//! Axes with equal weights are interchangeable. The enumeration visits one
//! representative per family of states (quantum numbers non-decreasing within
//! each group of equal axes), bounding every coordinate by an integer square
//! root of what the cutoff leaves, so it never scans a full cube of
//! candidates. Each representative stands for all distinct permutations of
//! its quantum numbers within the groups (its family); the level's degeneracy
//! is the sum of its families' sizes.
//!
//! A listing of levels adds the families into one word per scaled energy
//! (while that array is small enough), in blocks of energies that fit a
//! core's cache, on every core; the levels come out in order. Larger
//! listings sort the families instead.
//!
//! # Where degeneracy comes from
//! A level holding one family is degenerate because the box's symmetry
//! requires it ([`Origin::Symmetry`]); a level holding several families,
//! such as 27 = 3²+3²+3² = 1²+1²+5² in the cube, is degenerate by a
//! number-theoretic coincidence ([`Origin::Coincidence`]).

use crate::counting::lattice;
use crate::error::{Error, Result};
use crate::exact::{floor_nonneg, isqrt_u64, pi_upper, rational_string, sqrt_upper};
use crate::level::{Level, LevelList};
use crate::spectrum::{Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use serde::{Deserialize, Serialize};

/// Largest integer weight `D / a_i²` (and `D`) accepted, so that scaled
/// energies stay inside 64 bits for any sensible cutoff.
const MAX_WEIGHT: u64 = 1 << 30;

/// Bytes of working memory per family in the sparse enumeration.
const SPARSE_BYTES: f64 = 16.0;
/// Bytes per slot of the dense enumeration (a degeneracy and a family count).
const DENSE_BYTES: f64 = 12.0;
/// Bytes per level in the final list (exact energy and degeneracy).
const LEVEL_BYTES: f64 = 128.0;
/// Count steps beyond which finding the states at one level refuses: about
/// a minute on two cores (a cube up to E ≈ 1.8e11).
const MAX_COUNT_STEPS: f64 = 4e10;

/// Elementary operations per lattice step of the exact counters: a step is
/// cheaper than an elementary operation (measured 6.7e8 steps a second on
/// the reference machine against its 2e8 operations).
const STEP_OPS: f64 = 0.3;

/// Scaled energies per block of the dense enumeration: 64 Ki words
/// (512 KiB), half of one core's L2 cache on the reference machine (of
/// 2^13 to 2^18, 2^15 and 2^16 measured best for the cube up to 1e6).
const BLOCK: u64 = 1 << 16;
/// States a block should see of each row of families, at least, for the
/// pass over the rows to be worth making (see [`ParticleInBox::block_len`];
/// measured flat from 1 to 8 for the 2:3:5 box up to 1e4).
const ROW_HITS: f64 = 4.0;
/// Where the number of families starts in a word of the dense enumeration.
const FAMILY_SHIFT: u32 = 32;

/// Why a level is degenerate.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Origin {
    /// One state only.
    Single,
    /// Several states, all permutations of one set of quantum numbers among
    /// interchangeable axes: required by the box's symmetry.
    Symmetry,
    /// States from two or more distinct sets of quantum numbers that happen
    /// to share the energy.
    Coincidence,
}

impl Origin {
    /// The word used in tables and JSON.
    pub fn as_str(&self) -> &'static str {
        match self {
            Origin::Single => "single",
            Origin::Symmetry => "symmetry",
            Origin::Coincidence => "coincidence",
        }
    }
}

/// A level with the number of quantum-number families that share it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ClassifiedLevel {
    /// The level (energy in units of h²/(8 m L²), degeneracy).
    pub level: Level,
    /// Number of distinct families (sets of quantum numbers up to the box's
    /// symmetry) that share this energy.
    pub families: u64,
}

impl ClassifiedLevel {
    /// Where the degeneracy comes from.
    pub fn origin(&self) -> Origin {
        if self.families > 1 {
            Origin::Coincidence
        } else if self.level.degeneracy > BigUint::one() {
            Origin::Symmetry
        } else {
            Origin::Single
        }
    }
}

/// A particle in a 1-, 2- or 3-dimensional rectangular box.
///
/// ```
/// use zsum::models::ParticleInBox;
/// use zsum::spectrum::Spectrum;
/// use num_rational::BigRational;
/// let cube = ParticleInBox::cube(3).unwrap();
/// let levels = cube.levels_up_to(&BigRational::from_integer(12.into())).unwrap();
/// let pairs: Vec<(String, String)> = levels
///     .iter()
///     .map(|l| (l.energy.to_string(), l.degeneracy.to_string()))
///     .collect();
/// assert_eq!(pairs[..3], [("3".into(), "1".into()), ("6".into(), "3".into()), ("9".into(), "3".into())]);
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ParticleInBox {
    sides: Vec<BigRational>,
    /// `D`: energy = K / D.
    scale: u64,
    /// Axes ordered so that equal weights are adjacent: `(weight, axis)`.
    sorted: Vec<(u64, usize)>,
    /// Size of the unit h²/(8 m L²) in joules, once mass and side are known.
    unit_joules: Option<BigRational>,
}

/// A run of families that differ only in the last (sorted) quantum number,
/// which runs over `lo..=hi`.
#[derive(Debug, Clone, Copy)]
struct Row {
    axis: usize,
    partial: u64,
    w: u64,
    lo: u64,
    hi: u64,
    rep: [u64; 3],
    size_first: u64,
    size_rest: u64,
}

impl Row {
    fn size(&self, n: u64) -> u64 {
        if n == self.lo {
            self.size_first
        } else {
            self.size_rest
        }
    }
}

/// One family of states: a representative in sorted-axis order, its scaled
/// energy and its size.
#[derive(Debug, Clone, Copy)]
struct Family {
    k: u64,
    rep: [u64; 3],
    size: u64,
}

/// A row of families on its way up through the blocks of the dense
/// enumeration: the next scaled energy `k` it reaches, the `step` to the
/// one after, and the size of the family there (`first`) and of every later
/// one (`rest`).
#[derive(Debug, Clone, Copy)]
struct Cursor {
    k: u64,
    step: u64,
    first: u32,
    rest: u32,
}

impl Cursor {
    /// The cursor at the first family of `row` with scaled energy at least
    /// `a`, if the row has one. The row's energies are `partial + w n²`, and
    /// the step from `n` is `w (2n + 1)`.
    fn new(row: &Row, a: u64) -> Option<Cursor> {
        let (mut n, mut first) = (row.lo, row.size_first);
        if row.partial + row.w * n * n < a {
            let t = (a - row.partial).div_ceil(row.w);
            let r = isqrt_u64(t);
            n = if r * r < t { r + 1 } else { r };
            first = row.size_rest;
        }
        (n <= row.hi).then_some(Cursor {
            k: row.partial + row.w * n * n,
            step: row.w * (2 * n + 1),
            // Family sizes are 1, 2, 3 or 6.
            first: first as u32,
            rest: row.size_rest as u32,
        })
    }

    /// Adds the row's families with scaled energy in `lo..=hi` to `slot`
    /// (`slot[0]` is energy `lo`, which the cursor has reached), each as its
    /// size plus one family (see [`FAMILY_SHIFT`]); `w2` is twice the weight
    /// of the row's axis.
    fn fill(&mut self, lo: u64, hi: u64, w2: u64, slot: &mut [u64]) {
        let one = 1u64 << FAMILY_SHIFT;
        let (mut k, mut step) = (self.k, self.step);
        let (mut add, rest) = (u64::from(self.first) + one, u64::from(self.rest) + one);
        while k <= hi {
            slot[(k - lo) as usize] += add;
            add = rest;
            k += step;
            step += w2;
        }
        if k != self.k {
            self.first = self.rest;
        }
        self.k = k;
        self.step = step;
    }
}

impl ParticleInBox {
    /// A box with the given side ratios (one per dimension, 1 to 3), each a
    /// positive rational, in units of the reference length `L`.
    pub fn new(sides: Vec<BigRational>) -> Result<Self> {
        if sides.is_empty() || sides.len() > 3 {
            return Err(Error::invalid(
                "number of dimensions",
                sides.len(),
                "a box has 1, 2 or 3 dimensions",
            ));
        }
        for s in &sides {
            if !s.is_positive() {
                return Err(Error::invalid(
                    "side",
                    rational_string(s),
                    "every side ratio must be greater than zero",
                ));
            }
        }
        // 1/a² = q²/p² for a = p/q; D = lcm of the p²; w = D q² / p².
        let too_complex = || {
            Error::invalid(
                "side ratios",
                sides
                    .iter()
                    .map(rational_string)
                    .collect::<Vec<_>>()
                    .join(":"),
                "numerators and denominators must be small enough that the energy weights \
                 stay below 2^30; use simpler ratios",
            )
        };
        let mut d = BigInt::one();
        for s in &sides {
            let p2 = s.numer() * s.numer();
            d = d.lcm(&p2);
        }
        let scale = d
            .to_u64()
            .filter(|&v| v <= MAX_WEIGHT)
            .ok_or_else(too_complex)?;
        let mut sorted = Vec::with_capacity(sides.len());
        for (axis, s) in sides.iter().enumerate() {
            let w = &d * s.denom() * s.denom() / (s.numer() * s.numer());
            let w = w
                .to_u64()
                .filter(|&v| v <= MAX_WEIGHT)
                .ok_or_else(too_complex)?;
            sorted.push((w, axis));
        }
        sorted.sort();
        Ok(ParticleInBox {
            sides,
            scale,
            sorted,
            unit_joules: None,
        })
    }

    /// The cube (or square, or segment) of side `L` in `dims` dimensions.
    pub fn cube(dims: usize) -> Result<Self> {
        ParticleInBox::new(vec![BigRational::one(); dims])
    }

    /// The same box for a particle of mass `mass_kg` with reference side
    /// `side_m`: its unit h²/(8 m L²) then has a known size in joules, so its
    /// levels can be converted and combined with other parts exactly.
    pub fn with_scale(mut self, mass_kg: &BigRational, side_m: &BigRational) -> Self {
        self.unit_joules = Some(crate::units::box_unit_joules(mass_kg, side_m));
        self
    }

    /// Number of dimensions.
    pub fn dims(&self) -> usize {
        self.sides.len()
    }

    /// The side ratios, in the order given.
    pub fn sides(&self) -> &[BigRational] {
        &self.sides
    }

    /// Whether all sides are equal.
    pub fn is_cubic(&self) -> bool {
        self.sides.windows(2).all(|w| w[0] == w[1])
    }

    fn weights(&self) -> Vec<u64> {
        self.sorted.iter().map(|&(w, _)| w).collect()
    }

    /// The scaled cutoff `floor(cutoff · D)`, after checking the cutoff lies
    /// at or above the ground level.
    fn scaled_cutoff(&self, cutoff: &BigRational) -> Result<u64> {
        let ground = self.ground_energy();
        if cutoff < &ground {
            return Err(Error::invalid(
                "cutoff",
                rational_string(cutoff),
                &format!(
                    "it lies below the ground level {}; give a cutoff of at least that",
                    rational_string(&ground)
                ),
            ));
        }
        let m = floor_nonneg(&(cutoff * BigRational::from_integer(BigInt::from(self.scale))));
        m.to_u64()
            .filter(|&v| v <= lattice::MAX_CUTOFF)
            .ok_or_else(|| {
                Error::invalid(
                    "cutoff",
                    rational_string(cutoff),
                    "it is beyond what zsum handles exactly for a box (scaled energies must be \
                 at most 2^62, about 4.6e18); for larger energies use Weyl's law",
                )
            })
    }

    /// Weyl's law with the boundary correction for Dirichlet walls: the
    /// smooth approximation to the number of states with energy ≤ `e`.
    ///
    /// 1D: `a√E − 1/2`; 2D: `(π/4)abE − (a+b)√E/2 + 1/4`;
    /// 3D: `(π/6)abcE^{3/2} − (π/8)(ab+bc+ca)E + (a+b+c)√E/4 − 1/8`.
    pub fn weyl_estimate(&self, e: f64) -> f64 {
        use std::f64::consts::PI;
        let a: Vec<f64> = self
            .sides
            .iter()
            .map(|s| s.to_f64().unwrap_or(1.0))
            .collect();
        if e < self.ground_energy().to_f64().unwrap_or(0.0) {
            return 0.0;
        }
        let r = e.sqrt();
        let n = match a.as_slice() {
            [a] => a * r - 0.5,
            [a, b] => PI / 4.0 * a * b * e - (a + b) * r / 2.0 + 0.25,
            [a, b, c] => {
                PI / 6.0 * a * b * c * e * r - PI / 8.0 * (a * b + b * c + c * a) * e
                    + (a + b + c) * r / 4.0
                    - 0.125
            }
            _ => 0.0,
        };
        n.max(0.0)
    }

    /// Number of interchangeable-axis permutations (the order of the box's
    /// permutation symmetry).
    fn symmetry_order(&self) -> u64 {
        let mut order = 1u64;
        let mut run = 1u64;
        for i in 1..self.sorted.len() {
            if self.sorted[i].0 == self.sorted[i - 1].0 {
                run += 1;
                order *= run;
            } else {
                run = 1;
            }
        }
        order
    }

    /// Visits every row of families with scaled energy ≤ `m`: a row fixes
    /// all quantum numbers but the last and gives the last one's range.
    fn visit_rows(&self, m: u64, f: &mut impl FnMut(&Row)) {
        let w = self.weights();
        let d = w.len();
        // For axis i: how many axes from i to the end of its group, and the
        // least energy the later groups add (all their numbers at 1).
        let mut run = vec![1u64; d];
        for i in (0..d.saturating_sub(1)).rev() {
            if w[i] == w[i + 1] {
                run[i] = run[i + 1] + 1;
            }
        }
        let mut tail = vec![0u64; d];
        for i in (0..d).rev() {
            let next_group = i + run[i] as usize;
            tail[i] = w[next_group..].iter().sum();
        }
        let mut rep = [0u64; 3];
        self.visit_axis(0, 0, &w, &run, &tail, m, &mut rep, f);
    }

    /// Visits one representative per family with scaled energy ≤ `m`.
    fn visit_families(&self, m: u64, f: &mut impl FnMut(Family)) {
        self.visit_rows(m, &mut |row: &Row| {
            let mut rep = row.rep;
            for n in row.lo..=row.hi {
                rep[row.axis] = n;
                f(Family {
                    k: row.partial + row.w * n * n,
                    rep,
                    size: row.size(n),
                });
            }
        });
    }

    #[allow(clippy::too_many_arguments)]
    fn visit_axis(
        &self,
        i: usize,
        partial: u64,
        w: &[u64],
        run: &[u64],
        tail: &[u64],
        m: u64,
        rep: &mut [u64; 3],
        f: &mut impl FnMut(&Row),
    ) {
        let d = w.len();
        let lo = if i > 0 && w[i] == w[i - 1] {
            rep[i - 1]
        } else {
            1
        };
        let budget = m - partial; // partial ≤ m by construction
        if budget < tail[i] {
            return;
        }
        let hi = isqrt_u64((budget - tail[i]) / (w[i] * run[i]));
        if hi < lo {
            return;
        }
        if i + 1 == d {
            // The family size is the same for every n in the row except
            // possibly the first (n equal to the previous axis of its group).
            rep[i] = lo;
            let size_first = self.family_size(rep, d);
            rep[i] = lo + 1;
            let size_rest = self.family_size(rep, d);
            f(&Row {
                axis: i,
                partial,
                w: w[i],
                lo,
                hi,
                rep: *rep,
                size_first,
                size_rest,
            });
        } else {
            for n in lo..=hi {
                rep[i] = n;
                self.visit_axis(i + 1, partial + w[i] * n * n, w, run, tail, m, rep, f);
            }
        }
    }

    /// The exact energy `k / D` of a scaled energy `k`, reduced with machine
    /// arithmetic.
    fn energy_of(&self, k: u64) -> BigRational {
        let g = k.gcd(&self.scale).max(1);
        BigRational::new_raw(BigInt::from(k / g), BigInt::from(self.scale / g))
    }

    /// Number of distinct permutations of `rep` within groups of equal axes.
    fn family_size(&self, rep: &[u64; 3], d: usize) -> u64 {
        let mut size = 1u64;
        let mut i = 0;
        while i < d {
            let mut j = i + 1;
            while j < d && self.sorted[j].0 == self.sorted[i].0 {
                j += 1;
            }
            size *= match j - i {
                1 => 1,
                2 => {
                    if rep[i] == rep[i + 1] {
                        1
                    } else {
                        2
                    }
                }
                _ => {
                    let (a, b, c) = (rep[i], rep[i + 1], rep[i + 2]);
                    if a == b && b == c {
                        1
                    } else if a == b || b == c {
                        3
                    } else {
                        6
                    }
                }
            };
            i = j;
        }
        size
    }

    /// An estimate of the number of families with scaled energy ≤ `m`.
    fn estimated_families(&self, cutoff: &BigRational) -> f64 {
        let n = self.count_bound(cutoff).to_f64().unwrap_or(f64::INFINITY);
        n / self.symmetry_order() as f64 + 1.0
    }

    /// The levels up to `cutoff` with the number of families at each, within
    /// `budget`.
    pub fn classified_levels(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<ClassifiedLevel>> {
        self.listing(cutoff, budget, |energy, degeneracy, families| {
            ClassifiedLevel {
                level: Level::new(energy, degeneracy),
                families,
            }
        })
    }

    /// The listing as it was before the blocked walk: one walk over the
    /// whole dense array (or the sparse path), on one core. Kept as the
    /// reference the faster [`ParticleInBox::classified_levels`] is tested
    /// against; not part of the interface.
    #[doc(hidden)]
    pub fn classified_levels_reference(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<ClassifiedLevel>> {
        let (m, dense) = self.plan_listing(cutoff, budget)?;
        let make = |k: u64, deg: u64, fam: u64| ClassifiedLevel {
            level: Level::new(self.energy_of(k), deg),
            families: fam,
        };
        if !dense {
            return Ok(self.sparse_levels(m, make));
        }
        let mut out = Vec::new();
        let len = m as usize + 1;
        // One word per energy: degeneracy in the low 40 bits, number of
        // families above them (one memory touch per family).
        const FAM: u64 = 1 << 40;
        let mut slot = vec![0u64; len];
        self.visit_rows(m, &mut |row: &Row| {
            let mut k = row.partial + row.w * row.lo * row.lo;
            slot[k as usize] += row.size_first + FAM;
            let add = row.size_rest + FAM;
            for n in row.lo + 1..=row.hi {
                k = row.partial + row.w * n * n;
                slot[k as usize] += add;
            }
        });
        for (k, &v) in slot.iter().enumerate() {
            if v != 0 {
                out.push(make(k as u64, v & (FAM - 1), v >> 40));
            }
        }
        Ok(out)
    }

    /// The scaled cutoff and whether the dense enumeration (one slot per
    /// scaled energy) is the one to use, after checking the listing's
    /// estimated memory against `budget`.
    fn plan_listing(&self, cutoff: &BigRational, budget: &Budget) -> Result<(u64, bool)> {
        let m = self.scaled_cutoff(cutoff)?;
        let families = self.estimated_families(cutoff);
        let dense = (m as f64 + 1.0) * DENSE_BYTES;
        let sparse = families * SPARSE_BYTES;
        let levels = families.min(m as f64 + 1.0);
        budget.check_listing(
            format!("listing the levels up to {}", rational_string(cutoff)),
            dense.min(sparse) + levels * LEVEL_BYTES,
            levels,
            0.0,
            "use `count` for the number of states, or a lower cutoff",
        )?;
        Ok((m, dense <= sparse.max(64.0 * 1024.0 * 1024.0)))
    }

    /// The sparse enumeration: every family's scaled energy and size,
    /// sorted, then merged into levels `make(k, degeneracy, families)`.
    fn sparse_levels<T>(&self, m: u64, make: impl Fn(u64, u64, u64) -> T) -> Vec<T> {
        let mut all: Vec<(u64, u64)> = Vec::new();
        self.visit_families(m, &mut |f| all.push((f.k, f.size)));
        all.sort_unstable();
        all.chunk_by(|a, b| a.0 == b.0)
            .map(|chunk| {
                let deg: u64 = chunk.iter().map(|c| c.1).sum();
                make(chunk[0].0, deg, chunk.len() as u64)
            })
            .collect()
    }

    /// The levels up to `cutoff` as `make(energy, degeneracy, families)`,
    /// lowest first, within `budget`.
    ///
    /// The dense enumeration cuts the scaled energies `0..=m` into blocks
    /// small enough to stay in a core's cache, and runs of blocks go to the
    /// cores (rayon). A run walks the rows of families that reach it once
    /// (see [`ParticleInBox::visit_rows`]), keeping a [`Cursor`] per row,
    /// and each block takes from every row the families whose energy falls
    /// inside it, so the scattered additions hit the cache instead of
    /// memory. The levels come out already in order, and each exact energy
    /// and degeneracy is made once, on every core.
    fn listing<T: Send>(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        make: impl Fn(BigRational, u64, u64) -> T + Sync,
    ) -> Result<Vec<T>> {
        let (m, dense) = self.plan_listing(cutoff, budget)?;
        if !dense {
            return Ok(self.sparse_levels(m, |k, deg, fam| make(self.energy_of(k), deg, fam)));
        }
        // One word per energy, the degeneracy in the low half and the number
        // of families in the high half; neither half can carry over while
        // the number of states at one energy stays below 2^32.
        if self.states_per_level_bound(m) >= (1u64 << FAMILY_SHIFT) as f64 {
            // Only a memory budget of tens of gigabytes lets a listing this
            // high through to here.
            return Err(Error::invalid(
                "cutoff",
                rational_string(cutoff),
                "listing every level that high is beyond what zsum handles (one level could \
                 hold 2^32 states or more); count the states instead, or give a lower cutoff",
            ));
        }
        use rayon::prelude::*;
        let w2 = 2 * self.sorted[self.dims() - 1].0;
        let block = self.block_len(m);
        let found: Vec<Vec<(u64, u64)>> = self
            .strips(m, block)
            .into_par_iter()
            .map(|(a, b)| {
                let mut rows = Vec::new();
                self.visit_rows(b, &mut |row: &Row| rows.extend(Cursor::new(row, a)));
                let mut found = Vec::new();
                let mut slot = Vec::new();
                let mut lo = a;
                while lo <= b {
                    let hi = b.min(lo + (block - 1));
                    slot.clear();
                    slot.resize((hi - lo + 1) as usize, 0u64);
                    for row in &mut rows {
                        row.fill(lo, hi, w2, &mut slot);
                    }
                    found.extend(
                        slot.iter()
                            .enumerate()
                            .filter(|&(_, &v)| v != 0)
                            .map(|(i, &v)| (lo + i as u64, v)),
                    );
                    lo = hi + 1;
                }
                found
            })
            .collect();
        // The levels in order, made on every core straight from each run's
        // list (no joined copy): level i lies in the run that starts last at
        // or before it.
        let starts: Vec<usize> = found
            .iter()
            .scan(0, |total, run| {
                let start = *total;
                *total += run.len();
                Some(start)
            })
            .collect();
        let total = found.iter().map(Vec::len).sum();
        let low = (1u64 << FAMILY_SHIFT) - 1;
        Ok((0..total)
            .into_par_iter()
            .map(|i| {
                let run = starts.partition_point(|&s| s <= i) - 1;
                let (k, v) = found[run][i - starts[run]];
                make(self.energy_of(k), v & low, v >> FAMILY_SHIFT)
            })
            .collect())
    }

    /// An upper bound on the number of states at any one scaled energy `k ≤
    /// m`. The last quantum number is fixed by the others, so the count is
    /// at most the number of positive `(n_1, …, n_{d-1})` with
    /// `Σ w_i n_i² < m`: 1 in 1D, `√(m/w_1)` in 2D, and in 3D the area
    /// `π m / (4 √(w_1 w_2))` of the quarter ellipse, which holds the unit
    /// cell `[n_1 − 1, n_1] × [n_2 − 1, n_2]` of every such pair. A
    /// generous margin covers the rounding of the f64 arithmetic.
    fn states_per_level_bound(&self, m: u64) -> f64 {
        let w = self.weights();
        let bound = match w.as_slice() {
            [_] => 1.0,
            [w1, _] => (m as f64 / *w1 as f64).sqrt(),
            _ => std::f64::consts::PI / 4.0 * m as f64 / (w[0] as f64 * w[1] as f64).sqrt(),
        };
        bound * 1.01 + 2.0
    }

    /// Scaled energies per block of the dense enumeration: [`BLOCK`], or
    /// more where the last axis's steps are so wide that a block that size
    /// would see fewer than [`ROW_HITS`] states of each row (every block
    /// passes over every row).
    fn block_len(&self, m: u64) -> u64 {
        let w_last = self.sorted.last().map_or(1, |&(w, _)| w);
        let step = 2.0 * (m as f64 * w_last as f64).sqrt();
        let wide = (ROW_HITS * step) as u64;
        BLOCK.max(wide).min(m + 1)
    }

    /// The scaled energies `0..=m` cut into runs of whole blocks (`(first,
    /// last)`), one per core, each with about the same number of families:
    /// the families up to `k` grow as `k^{d/2}`.
    fn strips(&self, m: u64, block: u64) -> Vec<(u64, u64)> {
        let blocks = m / block + 1;
        let parts = (rayon::current_num_threads() as u64).clamp(1, blocks);
        let power = 2.0 / self.dims() as f64;
        let mut cuts: Vec<u64> = (0..=parts)
            .map(|i| (blocks as f64 * (i as f64 / parts as f64).powf(power)).round() as u64)
            .collect();
        cuts[parts as usize] = blocks;
        cuts.dedup();
        cuts.windows(2)
            .map(|c| (c[0] * block, m.min(c[1] * block - 1)))
            .collect()
    }

    /// The levels up to `cutoff`, each with its families and its states
    /// listed (sorted), within `budget`.
    pub fn levels_with_states(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(ClassifiedLevel, Vec<State>)>> {
        let m = self.scaled_cutoff(cutoff)?;
        let states = self.count_bound(cutoff).to_f64().unwrap_or(f64::INFINITY);
        let levels = self.estimated_families(cutoff).min(m as f64 + 1.0);
        budget.check_listing(
            format!("listing every state up to {}", rational_string(cutoff)),
            // The states themselves are counted once, as listed states.
            self.estimated_families(cutoff) * SPARSE_BYTES * 2.0,
            levels,
            states,
            "list levels without their states, count the states instead, or give a lower cutoff",
        )?;
        let mut all: Vec<Family> = Vec::new();
        self.visit_families(m, &mut |f| all.push(f));
        all.sort_unstable_by_key(|f| (f.k, f.rep));
        let mut out = Vec::new();
        for chunk in all.chunk_by(|a, b| a.k == b.k) {
            let deg: u64 = chunk.iter().map(|c| c.size).sum();
            let mut states: Vec<State> = chunk.iter().flat_map(|f| self.expand(f)).collect();
            states.sort();
            let level = ClassifiedLevel {
                level: Level::new(self.energy_of(chunk[0].k), deg),
                families: chunk.len() as u64,
            };
            out.push((level, states));
        }
        Ok(out)
    }

    /// All states of a family, in the original axis order.
    fn expand(&self, f: &Family) -> Vec<State> {
        let d = self.dims();
        let vals = &f.rep[..d];
        let mut out = Vec::new();
        // Permute within groups: enumerate all permutations of the whole
        // tuple that keep each value's weight, then de-duplicate. d ≤ 3, so
        // at most 6 permutations.
        let perms: &[[usize; 3]] = &[
            [0, 1, 2],
            [0, 2, 1],
            [1, 0, 2],
            [1, 2, 0],
            [2, 0, 1],
            [2, 1, 0],
        ];
        for p in perms {
            if p[..d].iter().any(|&x| x >= d) {
                continue;
            }
            // The permutation must map each axis to one of equal weight.
            if (0..d).any(|i| self.sorted[i].0 != self.sorted[p[i]].0) {
                continue;
            }
            let mut s = vec![0i64; d];
            for i in 0..d {
                s[self.sorted[i].1] = vals[p[i]] as i64;
            }
            out.push(State(s));
        }
        out.sort();
        out.dedup();
        debug_assert_eq!(out.len() as u64, f.size);
        out
    }

    /// The exact number of states with energy at most `cutoff`, counted
    /// without listing them (see [`crate::counting::lattice`]).
    ///
    /// ```
    /// use zsum::models::ParticleInBox;
    /// use num_rational::BigRational;
    /// let cube = ParticleInBox::cube(3).unwrap();
    /// // 1 + 3 + 3 + 3 + 1 states up to E = 12
    /// let n = cube.count_up_to(&BigRational::from_integer(12.into())).unwrap();
    /// assert_eq!(n, 11u32.into());
    /// ```
    pub fn count_up_to(&self, cutoff: &BigRational) -> Result<BigUint> {
        self.count_up_to_within(cutoff, &Budget::default())
    }

    /// As [`ParticleInBox::count_up_to`], refusing a count whose estimated
    /// work exceeds `budget`'s time.
    pub fn count_up_to_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<BigUint> {
        if cutoff < &self.ground_energy() {
            return Ok(BigUint::zero());
        }
        let m = self.scaled_cutoff(cutoff)?;
        let w = self.weights();
        let steps = lattice::estimated_steps(&w, m);
        // The counters keep a few words per slice: the baseline alone.
        budget.check("counting the states", 0.0, "")?;
        budget.check_work(
            format!(
                "counting the states up to {} ({steps:.1e} lattice steps)",
                rational_string(cutoff)
            ),
            steps * STEP_OPS,
            &format!(
                "use Weyl's law for an estimate ({:.9e}) or a lower cutoff",
                self.weyl_estimate(cutoff.to_f64().unwrap_or(f64::INFINITY))
            ),
        )?;
        let n = match w.as_slice() {
            [w1] => lattice::count_1d(*w1, m),
            [w1, w2] => lattice::count_2d(*w1, *w2, m),
            [a, b, c] if a == b && b == c => lattice::count_cube(m / a),
            [w1, w2, w3] => lattice::count_3d([*w1, *w2, *w3], m),
            _ => 0,
        };
        Ok(BigUint::from(n))
    }
}

impl Spectrum for ParticleInBox {
    fn describe(&self) -> String {
        let ratio = self
            .sides
            .iter()
            .map(rational_string)
            .collect::<Vec<_>>()
            .join(":");
        let shape = match (self.dims(), self.is_cubic()) {
            (1, _) => "1D box".to_string(),
            (2, true) => "square box".to_string(),
            (3, true) => "cubic box".to_string(),
            (d, false) => format!("{d}D rectangular box, sides {ratio}"),
            (d, true) => format!("{d}D box"),
        };
        format!("particle in a {shape}")
    }

    fn unit(&self) -> EnergyUnit {
        EnergyUnit::Natural {
            symbol: "h^2/(8 m L^2)".to_string(),
            joules: self.unit_joules.clone(),
        }
    }

    fn quantum_numbers(&self) -> Vec<String> {
        (1..=self.dims()).map(|i| format!("n{i}")).collect()
    }

    fn ground_energy(&self) -> BigRational {
        self.sides
            .iter()
            .map(|s| (s * s).recip())
            .fold(BigRational::zero(), |a, b| a + b)
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        let levels = self.listing(cutoff, budget, |energy, degeneracy, _| {
            Level::new(energy, degeneracy)
        })?;
        Ok(LevelList::from_sorted(self.unit(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let scaled = energy * BigRational::from_integer(BigInt::from(self.scale));
        if !scaled.is_integer() || energy < &self.ground_energy() {
            return Ok(Vec::new());
        }
        let m = self.scaled_cutoff(energy)?;
        // Families with energy exactly m: visit the families up to m whose
        // last coordinate is forced; cost is that of the (d-1)-dim problem.
        let w = self.weights();
        let steps = match w.as_slice() {
            [_] => 1.0,
            [w1, _] => (m as f64 / *w1 as f64).sqrt(),
            [w1, w2, _] => m as f64 / (*w1 as f64 * *w2 as f64).sqrt(),
            _ => f64::INFINITY,
        };
        if steps > MAX_COUNT_STEPS {
            return Err(Error::budget(format!(
                "finding the states at {} would take about {steps:.0e} steps; choose a lower level",
                rational_string(energy)
            )));
        }
        let mut states = Vec::new();
        let d = w.len();
        self.visit_exact(m, &w, &mut |f| states.extend(self.expand(&f)), d);
        states.sort();
        Ok(states)
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Squares(self.sides.iter().map(|s| (s * s).recip()).collect())
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(self.dims() as f64 / 2.0)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        if energy < &self.ground_energy() {
            return BigUint::zero();
        }
        // Each state n ≥ 1 owns the unit cell [n-1, n]^d, which lies inside
        // the region x ≥ 0, Σ (x_i/a_i)² ≤ E; the cells are disjoint, so the
        // count is at most that region's volume.
        let prod: BigRational = self.sides.iter().fold(BigRational::one(), |a, s| a * s);
        let root = sqrt_upper(energy, 32);
        let int = |n: i64| BigRational::from_integer(BigInt::from(n));
        let volume = match self.dims() {
            1 => prod * root,
            2 => pi_upper() / int(4) * prod * energy,
            _ => pi_upper() / int(6) * prod * energy * root,
        };
        floor_nonneg(&volume)
    }
}

impl ParticleInBox {
    /// Visits the families with scaled energy exactly `m`.
    fn visit_exact(&self, m: u64, w: &[u64], f: &mut impl FnMut(Family), d: usize) {
        // Enumerate the first d-1 coordinates as a (d-1)-dim family walk,
        // then solve for the last.
        let last = d - 1;
        let mut rep = [0u64; 3];
        let mut rec = |rep: &mut [u64; 3], partial: u64| {
            if partial > m {
                return;
            }
            let rem = m - partial;
            if rem % w[last] != 0 {
                return;
            }
            let sq = rem / w[last];
            let n = isqrt_u64(sq);
            let lo = if last > 0 && w[last] == w[last - 1] {
                rep[last - 1]
            } else {
                1
            };
            if n * n == sq && n >= lo {
                rep[last] = n;
                let size = self.family_size(rep, d);
                f(Family {
                    k: m,
                    rep: *rep,
                    size,
                });
            }
        };
        match d {
            1 => rec(&mut rep, 0),
            2 => {
                let mut a = 1;
                while w[0] * a * a < m {
                    rep[0] = a;
                    rec(&mut rep, w[0] * a * a);
                    a += 1;
                }
            }
            _ => {
                let mut a = 1;
                while w[0] * a * a < m {
                    rep[0] = a;
                    let lo_b = if w[1] == w[0] { a } else { 1 };
                    let mut b = lo_b;
                    while w[0] * a * a + w[1] * b * b < m {
                        rep[1] = b;
                        rec(&mut rep, w[0] * a * a + w[1] * b * b);
                        b += 1;
                    }
                    a += 1;
                }
            }
        }
    }
}
