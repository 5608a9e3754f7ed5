//! Exact microstate counts Ω(E, N) of N particles sharing a single-particle
//! spectrum: labelled (distinguishable) particles, bosons and fermions.
//!
//! Single-particle energies are put on a common integer grid: every level's
//! energy above the ground is a whole number of grid steps (by default the
//! greatest common divisor of those energies, which exists for any exact
//! rationals). A degenerate level is that many distinct orbitals. Totals
//! are counted for every E from the N-particle base N·ε₀ up to a cutoff at
//! once.
//!
//! # Algorithms
//! - **Bosons and fermions**: the table `c[n][E]`, the number of ways to put
//!   n particles into the *excited* orbitals processed so far with total
//!   excitation E, is built one orbital at a time, each orbital multiplying
//!   the generating function by `1/(1 − y xᵉ)` (bosons: rows n rising) or
//!   `1 + y xᵉ` (fermions: rows n falling). Orbitals are taken from the
//!   highest excitation down, so after orbitals of excitation ≥ e every
//!   occupied cell has n·e ≤ E: each pass touches only those cells, which
//!   makes the work about K^{5/2} for a 3D box instead of N·K^{5/2}. The
//!   ground level's g₀ orbitals are added last in closed form:
//!   Ω(E, N) = Σₙ C(N − n + g₀ − 1, g₀ − 1)·c[n][E] for bosons and
//!   Σₙ C(g₀, N − n)·c[n][E] for fermions.
//! - **Labelled particles**: Ω(E, N) is the coefficient of x^E in P(x)^N,
//!   P(x) = Σ g_i x^{e_i}, from the recurrence that P·F' = N·P'·F gives
//!   (common practice for powers of series):
//!   `f_0 = g₀^N`, `k·g₀·f_k = Σ_{j≥1} ((N + 1)·j − k)·p_j·f_{k−j}`, exact.
//!
//! Cells are fixed-width multi-limb integers (one 64-bit limb at first);
//! when an addition carries out of the top limb the whole table is widened
//! by a limb, so counts stay exact at machine speed.

use crate::error::{Error, Result};
use crate::exact::exact_decimal;

/// An exact energy for messages: its decimal where it has one of up to 40
/// digits (as a user would have typed it), else 12 significant digits
/// marked as rounded.
fn energy_text(x: &BigRational) -> String {
    let e = exact_decimal(x, 40);
    if e.contains('/') {
        format!("≈{}", crate::exact::format_sig(x, 12))
    } else {
        e
    }
}
use crate::level::LevelList;
use crate::spectrum::{human_bytes, Budget, Spectrum};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint, Sign};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// The largest number of particles zsum counts or sums over.
pub const MAX_PARTICLES: u64 = 1000;

/// How particles share orbitals.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Statistics {
    /// Labelled particles: every assignment of particles to orbitals counts.
    Distinct,
    /// Indistinguishable bosons: any number per orbital.
    Bose,
    /// Indistinguishable fermions: at most one per orbital.
    Fermi,
}

impl Statistics {
    /// Reads `distinct`, `bose` or `fermi`.
    ///
    /// ```
    /// use zsum::microstates::Statistics;
    /// assert_eq!(Statistics::parse("fermi").unwrap(), Statistics::Fermi);
    /// assert!(Statistics::parse("boltzmann").is_err());
    /// ```
    pub fn parse(text: &str) -> Result<Self> {
        match text.trim().to_ascii_lowercase().as_str() {
            "distinct" | "distinguishable" => Ok(Statistics::Distinct),
            "bose" | "boson" | "bosons" => Ok(Statistics::Bose),
            "fermi" | "fermion" | "fermions" => Ok(Statistics::Fermi),
            _ => Err(Error::parse("statistics", text, "bose, fermi or distinct")),
        }
    }

    /// The name used in output.
    pub fn name(&self) -> &'static str {
        match self {
            Statistics::Distinct => "distinct",
            Statistics::Bose => "bose",
            Statistics::Fermi => "fermi",
        }
    }
}

/// Refuses N = 0 and N above [`MAX_PARTICLES`].
pub fn check_particles(n: u64) -> Result<()> {
    if n == 0 || n > MAX_PARTICLES {
        return Err(Error::invalid(
            "particle number",
            n,
            &format!("give between 1 and {MAX_PARTICLES} particles"),
        ));
    }
    Ok(())
}

/// Single-particle levels on an integer grid: energy ε₀ + e·step for each
/// `(e, degeneracy)`, e rising, the ground (e = 0) first.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Grid {
    /// The unit of `ground` and `step`.
    pub unit: EnergyUnit,
    /// The single-particle ground energy ε₀.
    pub ground: BigRational,
    /// The grid step.
    pub step: BigRational,
    /// `(excitation in steps, degeneracy)`, excitation rising from 0.
    pub levels: Vec<(u64, BigUint)>,
}

impl Grid {
    /// Puts `levels` on a grid: `step` if given (each level's energy above
    /// the ground must be a whole multiple of it, or the level is named), or
    /// else the greatest common divisor of the energies above the ground.
    ///
    /// ```
    /// use zsum::microstates::Grid;
    /// use zsum::level::{Level, LevelList};
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// let list = LevelList::new(EnergyUnit::Kelvin,
    ///     vec![Level::new(r("1"), 1u32), Level::new(r("2.5"), 3u32), Level::new(r("4"), 2u32)]);
    /// let g = Grid::new(&list, None)?;
    /// assert_eq!(g.step, r("1.5"));
    /// assert_eq!(g.levels[2].0, 2);
    /// assert!(Grid::new(&list, Some(&r("1"))).is_err()); // 2.5 is not on a grid of 1
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(levels: &LevelList, step: Option<&BigRational>) -> Result<Grid> {
        let unit = levels.unit().clone();
        let ground = levels
            .ground()
            .ok_or_else(|| Error::invalid("spectrum", "with no levels", "it needs a level"))?
            .energy
            .clone();
        let step = match step {
            Some(s) => {
                if !s.is_positive() {
                    return Err(Error::invalid(
                        "grid step",
                        energy_text(s),
                        "the grid step must be greater than zero",
                    ));
                }
                s.clone()
            }
            None => {
                let mut g = BigRational::zero();
                for l in levels.iter() {
                    g = rational_gcd(&g, &(&l.energy - &ground));
                }
                if g.is_zero() {
                    BigRational::one()
                } else {
                    g
                }
            }
        };
        let mut out = Vec::with_capacity(levels.len());
        for l in levels.iter() {
            let steps = (&l.energy - &ground) / &step;
            if !steps.is_integer() {
                return Err(Error::invalid(
                    "level",
                    format!("{} {unit}", energy_text(&l.energy)),
                    &format!(
                        "its energy above the ground ({} {unit}) is not a whole number of grid \
                         steps of {} {unit}; give a grid step that divides every level's energy \
                         above the ground, or give no step to use their common divisor",
                        energy_text(&(&l.energy - &ground)),
                        energy_text(&step)
                    ),
                ));
            }
            let e = steps.to_integer().to_u64().ok_or_else(|| {
                Error::budget(format!(
                    "the level at {} {unit} lies {} grid steps above the ground, beyond any table",
                    energy_text(&l.energy),
                    steps.to_integer()
                ))
            })?;
            out.push((e, l.degeneracy.clone()));
        }
        Ok(Grid {
            unit,
            ground,
            step,
            levels: out,
        })
    }

    /// The number of orbitals (states) with excitation at most `k` steps.
    pub fn orbitals_up_to(&self, k: u64) -> BigUint {
        self.levels
            .iter()
            .filter(|(e, _)| *e <= k)
            .map(|(_, g)| g.clone())
            .sum()
    }

    /// The lowest total excitation (in steps) of `n` particles: 0 for
    /// labelled particles and bosons, the filling of the lowest orbitals
    /// for fermions (`None` if there are fewer than `n` orbitals).
    pub fn lowest_excitation(&self, n: u64, stats: Statistics) -> Option<BigUint> {
        if stats != Statistics::Fermi {
            return Some(BigUint::zero());
        }
        let steps = self
            .levels
            .iter()
            .map(|(e, g)| (BigRational::from_integer((*e).into()), g));
        lowest_filling(steps, n).and_then(|f| f.to_integer().to_biguint())
    }
}

/// The least total excitation of `n` fermions in levels `(excitation,
/// degeneracy)` given in rising order: the lowest orbitals filled. `None`
/// if the levels hold fewer than `n` orbitals.
pub(crate) fn lowest_filling<'a>(
    levels: impl IntoIterator<Item = (BigRational, &'a BigUint)>,
    n: u64,
) -> Option<BigRational> {
    let mut left = BigUint::from(n);
    let mut total = BigRational::zero();
    if left.is_zero() {
        return Some(total);
    }
    for (e, g) in levels {
        let take = if &left < g { left.clone() } else { g.clone() };
        total += e * BigRational::from_integer(take.clone().into());
        left -= take;
        if left.is_zero() {
            return Some(total);
        }
    }
    None
}

/// gcd of two non-negative rationals: gcd of numerators over lcm of
/// denominators (common practice).
fn rational_gcd(a: &BigRational, b: &BigRational) -> BigRational {
    let b = b.abs();
    if a.is_zero() {
        return b;
    }
    if b.is_zero() {
        return a.clone();
    }
    BigRational::new(a.numer().gcd(b.numer()), a.denom().lcm(b.denom()))
}

/// A table of fixed-width unsigned integers, `w` limbs per cell, widened
/// when a sum carries out of the top limb.
struct Table {
    w: usize,
    cols: usize,
    data: Vec<u64>,
    budget: Budget,
}

impl Table {
    fn new(rows: usize, cols: usize, budget: Budget) -> Table {
        Table {
            w: 1,
            cols,
            data: vec![0; rows * cols],
            budget,
        }
    }

    /// Adds row `src` (shifted right by `shift` columns) into row `dst` for
    /// columns `from..cols`.
    fn add_shifted(&mut self, dst: usize, src: usize, shift: usize, from: usize) -> Result<()> {
        let mut col = from;
        while col < self.cols {
            match self.try_add(dst, src, shift, col) {
                None => return Ok(()),
                Some(c) => {
                    // The cell at column c carried out: widen, store the
                    // carry in the new top limb, and go on from c + 1.
                    self.widen()?;
                    let at = (dst * self.cols + c) * self.w + self.w - 1;
                    self.data[at] = 1;
                    col = c + 1;
                }
            }
        }
        Ok(())
    }

    /// Adds cells until one carries out; returns that column.
    fn try_add(&mut self, dst: usize, src: usize, shift: usize, from: usize) -> Option<usize> {
        let (w, cols) = (self.w, self.cols);
        let row = cols * w;
        debug_assert!(dst > src, "passes read the row below the one they write");
        let (lo, hi) = self.data.split_at_mut(dst * row);
        let (d, s) = (&mut hi[..row], &lo[src * row..(src + 1) * row]);
        if w == 1 {
            for c in from..cols {
                let (v, carry) = d[c].overflowing_add(s[c - shift]);
                d[c] = v;
                if carry {
                    return Some(c);
                }
            }
            return None;
        }
        for c in from..cols {
            let (dc, sc) = (c * w, (c - shift) * w);
            let mut carry = false;
            for i in 0..w {
                let (v1, c1) = d[dc + i].overflowing_add(s[sc + i]);
                let (v2, c2) = v1.overflowing_add(carry as u64);
                d[dc + i] = v2;
                carry = c1 | c2;
            }
            if carry {
                return Some(c);
            }
        }
        None
    }

    fn widen(&mut self) -> Result<()> {
        let (w, n) = (self.w, self.data.len() / self.w);
        let need = (n * (w + 1) * 8) as f64;
        self.budget.check(
            "the microstate table",
            need,
            "lower the cutoff or the number of particles, or raise the memory budget",
        )?;
        let mut next = vec![0u64; n * (w + 1)];
        for (i, cell) in self.data.chunks_exact(w).enumerate() {
            next[i * (w + 1)..i * (w + 1) + w].copy_from_slice(cell);
        }
        self.data = next;
        self.w = w + 1;
        Ok(())
    }

    fn get(&self, row: usize, col: usize) -> BigUint {
        let at = (row * self.cols + col) * self.w;
        let limbs = &self.data[at..at + self.w];
        let mut digits = Vec::with_capacity(2 * self.w);
        for l in limbs {
            digits.push(*l as u32);
            digits.push((*l >> 32) as u32);
        }
        BigUint::new(digits)
    }
}

/// C(n, k) exactly.
pub(crate) fn binomial(n: &BigUint, k: u64) -> BigUint {
    if &BigUint::from(k) > n {
        return BigUint::zero();
    }
    let mut c = BigUint::one();
    for i in 0..k {
        c = c * (n - BigUint::from(i)) / BigUint::from(i + 1);
    }
    c
}

/// Estimated bytes of the counting table for `n` particles and `bins`
/// energies: its cells are as wide as the largest possible count, which is
/// at most the number of ways to place the particles in the `orbitals`
/// (C(M + N − 1, N) for bosons, C(M, N) for fermions, M^N for labelled).
pub fn table_bytes(orbitals: &BigUint, n: u64, bins: u64, stats: Statistics) -> f64 {
    let limbs = (count_bits(orbitals, n, stats) / 64.0).floor() + 1.0;
    match stats {
        // One row of big integers.
        Statistics::Distinct => bins as f64 * (limbs * 8.0 + 32.0),
        _ => (n as f64 + 1.0) * bins as f64 * limbs * 8.0,
    }
}

/// log₂ of the bound on any count: the ways to place `n` particles in the
/// `orbitals`.
fn count_bits(orbitals: &BigUint, n: u64, stats: Statistics) -> f64 {
    let m = orbitals.to_f64().unwrap_or(f64::MAX).max(1.0);
    let nf = n as f64;
    let ln_fact = super::ln_factorial;
    let bits = match stats {
        Statistics::Distinct => nf * m.log2(),
        Statistics::Bose => (ln_fact(m + nf - 1.0) - ln_fact(nf) - ln_fact(m - 1.0)) / 2f64.ln(),
        Statistics::Fermi => {
            if nf > m {
                0.0
            } else {
                (ln_fact(m) - ln_fact(nf) - ln_fact(m - nf)) / 2f64.ln()
            }
        }
    };
    bits.max(1.0)
}

/// What one energy of the answer costs besides its count: its row (energy,
/// S/k, temperature, canonical values as text) and their rendering
/// (measured: about 300 bytes; counted with room).
const ROW_BYTES: f64 = 400.0;

/// Estimated seconds to count `n` particles over `bins` energies of `grid`
/// (from the number of cell additions and their width; calibrated on the
/// benches, to within a few times).
pub fn count_seconds(grid: &Grid, n: u64, stats: Statistics, bins: usize) -> f64 {
    let k_max = bins.saturating_sub(1) as u64;
    let limbs = (count_bits(&grid.orbitals_up_to(k_max), n, stats) / 64.0).floor() + 1.0;
    let mut ops = 0f64;
    for (e, g) in grid.levels.iter().filter(|(e, _)| *e <= k_max && *e > 0) {
        let (e, k) = (*e as f64, k_max as f64);
        match stats {
            Statistics::Distinct => ops += k - e + 1.0,
            _ => {
                // Rows 1..=min(N, K/e), each from n·e to K.
                let rows = (n as f64).min((k / e).floor());
                let cells = rows * (k + 1.0) - e * rows * (rows + 1.0) / 2.0;
                ops += g.to_f64().unwrap_or(f64::MAX) * cells;
            }
        }
    }
    match stats {
        Statistics::Distinct => ops * (20e-9 + limbs * 2e-9),
        _ => ops * limbs * 1e-10,
    }
}

/// Ω(k) for k = 0..=`bins − 1` steps of total excitation above N·ε₀: the
/// exact number of microstates of `n` particles of statistics `stats` in
/// the orbitals of `grid` (only those with excitation below `bins` matter).
/// Zero where no state lies, including everywhere for fermions that
/// outnumber the orbitals.
///
/// ```
/// use zsum::microstates::{count_on_grid, Grid, Statistics};
/// use zsum::spectrum::Budget;
/// use num_bigint::BigUint;
/// // Two bosons in orbitals at 0, 1, 2 (one each): totals 0..4 have
/// // 1, 1, 2, 1, 1 states.
/// use num_rational::BigRational;
/// let g = Grid { unit: zsum::units::EnergyUnit::Kelvin,
///                ground: BigRational::from_integer(0.into()),
///                step: BigRational::from_integer(1.into()),
///                levels: vec![(0, 1u32.into()), (1, 1u32.into()), (2, 1u32.into())] };
/// let c = count_on_grid(&g, 2, Statistics::Bose, 5, &Budget::default())?;
/// let want: Vec<BigUint> = [1u32, 1, 2, 1, 1].iter().map(|&x| x.into()).collect();
/// assert_eq!(c, want);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn count_on_grid(
    grid: &Grid,
    n: u64,
    stats: Statistics,
    bins: usize,
    budget: &Budget,
) -> Result<Vec<BigUint>> {
    check_particles(n)?;
    if bins == 0 {
        return Ok(Vec::new());
    }
    let k_max = (bins - 1) as u64;
    let what = format!(
        "counting {n} particles ({}) over {bins} energies",
        stats.name()
    );
    let orbitals = grid.orbitals_up_to(k_max);
    // The table, then one exact count per energy and its row downstream
    // (decimal digits twice: the answer and its text).
    let limbs = (count_bits(&orbitals, n, stats) / 64.0).floor() + 1.0;
    let per_row =
        limbs * 8.0 * (1.0 + 2.0 * 64.0 * std::f64::consts::LOG10_2 / 8.0) + 32.0 + ROW_BYTES;
    budget.check_listing(
        &what,
        table_bytes(&orbitals, n, bins as u64, stats) + bins as f64 * per_row,
        0.0,
        0.0,
        "lower the cutoff or the number of particles",
    )?;
    budget.check_work(
        &what,
        count_seconds(grid, n, stats, bins) * crate::budget::REFERENCE_OPS_PER_SECOND,
        "lower the cutoff or the number of particles",
    )?;
    let used: Vec<&(u64, BigUint)> = grid.levels.iter().filter(|(e, _)| *e <= k_max).collect();
    if stats == Statistics::Distinct {
        return Ok(labelled(&used, n, bins));
    }
    let g0 = match used.first() {
        Some((0, g)) => g.clone(),
        _ => BigUint::zero(),
    };
    let n_us = n as usize;
    let mut t = Table::new(n_us + 1, bins, *budget);
    t.data[0] = 1; // c[0][0] = 1: no particle excited.
    for (e, g) in used.iter().rev() {
        if *e == 0 {
            continue;
        }
        let e = *e as usize;
        let copies = g.to_u64().unwrap_or(u64::MAX);
        for _ in 0..copies {
            match stats {
                Statistics::Bose => {
                    for row in 1..=n_us {
                        let from = row.saturating_mul(e);
                        if from >= bins {
                            break;
                        }
                        t.add_shifted(row, row - 1, e, from)?;
                    }
                }
                _ => {
                    for row in (1..=n_us).rev() {
                        let from = row.saturating_mul(e);
                        if from >= bins {
                            continue;
                        }
                        t.add_shifted(row, row - 1, e, from)?;
                    }
                }
            }
        }
    }
    // The ground orbitals take the remaining N − n particles.
    let weights: Vec<BigUint> = (0..=n)
        .map(|excited| {
            let in_ground = n - excited;
            match stats {
                Statistics::Bose => {
                    if g0.is_zero() {
                        BigUint::from(u32::from(in_ground == 0))
                    } else {
                        binomial(&(BigUint::from(in_ground) + &g0 - 1u32), in_ground)
                    }
                }
                _ => binomial(&g0, in_ground),
            }
        })
        .collect();
    Ok((0..bins)
        .map(|col| {
            let mut s = BigUint::zero();
            for (row, w) in weights.iter().enumerate() {
                if !w.is_zero() {
                    let c = t.get(row, col);
                    if !c.is_zero() {
                        s += c * w;
                    }
                }
            }
            s
        })
        .collect())
}

/// Coefficients of P(x)^N up to x^{bins−1}, P = Σ g xᵉ, by the power
/// recurrence (exact division at every step).
fn labelled(levels: &[&(u64, BigUint)], n: u64, bins: usize) -> Vec<BigUint> {
    let mut f: Vec<BigInt> = vec![BigInt::zero(); bins];
    let Some((e0, g0)) = levels.first() else {
        return vec![BigUint::zero(); bins];
    };
    // Shift so the lowest listed level is the constant term.
    let shift = *e0 as usize;
    if shift.saturating_mul(n as usize) >= bins {
        return vec![BigUint::zero(); bins];
    }
    let p: Vec<(usize, BigInt)> = levels
        .iter()
        .skip(1)
        .map(|(e, g)| (*e as usize - shift, BigInt::from(g.clone())))
        .collect();
    let g0 = BigInt::from(g0.clone());
    let np1 = BigInt::from(n + 1);
    let top = bins - shift * n as usize;
    f[0] = num_traits::pow(g0.clone(), n as usize);
    for k in 1..top {
        let mut acc = BigInt::zero();
        for (j, pj) in &p {
            if *j > k {
                break;
            }
            let coef = &np1 * BigInt::from(*j) - BigInt::from(k);
            if !coef.is_zero() && !f[k - j].is_zero() {
                acc += coef * pj * &f[k - j];
            }
        }
        f[k] = acc / (BigInt::from(k) * &g0);
    }
    let mut out = vec![BigUint::zero(); bins];
    for (k, v) in f.into_iter().take(top).enumerate() {
        out[k + shift * n as usize] = match v.into_parts() {
            (Sign::Minus, _) => BigUint::zero(),
            (_, m) => m,
        };
    }
    out
}

/// Ω(E, N) for every total energy E from N·ε₀ up to a cutoff, with the grid
/// it was counted on.
#[derive(Debug, Clone)]
pub struct Omega {
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// The single-particle grid.
    pub grid: Grid,
    /// The lowest total energy of any state, in steps above N·ε₀.
    pub lowest: u64,
    /// `counts[k]`: states with total energy N·ε₀ + k·step.
    pub counts: Vec<BigUint>,
}

impl Omega {
    /// The total energy of bin `k`, exactly.
    pub fn energy(&self, k: usize) -> BigRational {
        &self.grid.ground * BigRational::from_integer(self.particles.into())
            + &self.grid.step * BigRational::from_integer(k.into())
    }
}

/// Counts the microstates of `n` particles of `stats` in `spectrum` for
/// every total energy up to `up_to` (in the spectrum's unit), on the grid
/// `step` (or the levels' common divisor). Refuses fermions that cannot all
/// fit below the cutoff, cutoffs below the N-particle ground, and tables
/// beyond `budget`.
///
/// ```
/// use zsum::microstates::{microstates, Statistics};
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// use zsum::spectrum::Budget;
/// // An Einstein solid: 3 oscillators sharing 4 quanta, C(6, 4) = 15 ways.
/// let osc = HarmonicModes::one_d(parse_rational("1")?, false, EnergyUnit::Kelvin)?;
/// let o = microstates(&osc, 3, Statistics::Distinct, &parse_rational("4")?, None,
///                     &Budget::default())?;
/// assert_eq!(o.counts[4], 15u32.into());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn microstates(
    spectrum: &dyn Spectrum,
    n: u64,
    stats: Statistics,
    up_to: &BigRational,
    step: Option<&BigRational>,
    budget: &Budget,
) -> Result<Omega> {
    check_particles(n)?;
    let unit = spectrum.unit();
    let e0 = spectrum.ground_energy();
    let nr = BigRational::from_integer(n.into());
    let base = &e0 * &nr;
    if up_to < &base {
        return Err(Error::invalid(
            "cutoff",
            energy_text(up_to),
            &format!(
                "{n} particles have at least {} {unit} (N times the single-particle ground); \
                 give a cutoff of at least that",
                energy_text(&base)
            ),
        ));
    }
    // No particle can have more than the whole excitation budget.
    let single_cut = up_to - &e0 * (&nr - BigRational::one());
    // Before listing the one-particle levels: the grid step is at most the
    // first excitation (it divides it), so the table has at least
    // (E − Nε₀)/ε₁ + 1 energies; refuse at once what even that exceeds.
    let coarsest = match step {
        Some(s) => Some(s.clone()),
        None => first_excitation(spectrum, &e0, &single_cut, budget)?,
    };
    if let Some(c) = &coarsest {
        let fewest = ((up_to - &base) / c)
            .floor()
            .to_f64()
            .unwrap_or(f64::INFINITY)
            + 1.0;
        let per_bin = if stats == Statistics::Distinct {
            40.0
        } else {
            8.0 * (n as f64 + 1.0)
        };
        budget.check_listing(
            format!(
                "counting {n} particles ({}) over at least {} energies",
                stats.name(),
                crate::exact::format_sig_f64(fewest, 3)
            ),
            fewest * per_bin,
            fewest,
            0.0,
            "lower the cutoff or the number of particles",
        )?;
    }
    let levels = spectrum.levels_within(&single_cut, budget)?;
    let grid = Grid::new(&levels, step)?;
    let bins_r = ((up_to - &base) / &grid.step).floor().to_integer() + BigInt::one();
    let bins = bins_r
        .to_u64()
        .filter(|b| *b <= (budget.limit() / 8).max(1))
        .ok_or_else(|| finest_level_error(&levels, &grid, &bins_r, budget))?
        as usize;
    let row_bytes = bins as f64
        * 8.0
        * if stats == Statistics::Distinct {
            5.0
        } else {
            (n + 1) as f64
        };
    if row_bytes > budget.limit() as f64 {
        return Err(finest_level_error(&levels, &grid, &bins_r, budget));
    }
    let lowest = grid.lowest_excitation(n, stats);
    let k_max = (bins - 1) as u64;
    match &lowest {
        Some(l) if l <= &BigUint::from(k_max) => {}
        _ => {
            let below = grid.orbitals_up_to(k_max);
            return Err(Error::invalid(
                "particle number",
                n,
                &match lowest {
                    None => format!(
                        "{n} fermions need {n} distinct orbitals, but the spectrum lists only {below} \
                         orbitals at or below the cutoff {} {unit}",
                        energy_text(up_to)
                    ),
                    Some(l) => format!(
                        "{n} fermions fill the lowest orbitals with at least {} {unit}, above the \
                         cutoff {} {unit}; only {below} orbitals lie at or below the cutoff \
                         (raise the cutoff to at least that)",
                        energy_text(&(&base + &grid.step * BigRational::from_integer(l.into()))),
                        energy_text(up_to)
                    ),
                },
            ));
        }
    }
    let counts = count_on_grid(&grid, n, stats, bins, budget)?;
    Ok(Omega {
        statistics: stats,
        particles: n,
        lowest: lowest.and_then(|l| l.to_u64()).unwrap_or(0),
        grid,
        counts,
    })
}

/// The first excitation ε₁ − ε₀ of `s`, found by listing ever wider
/// windows above the ground (each listing small until the window reaches
/// ε₁), or `None` if no level lies above the ground up to `top`.
fn first_excitation(
    s: &dyn Spectrum,
    e0: &BigRational,
    top: &BigRational,
    budget: &Budget,
) -> Result<Option<BigRational>> {
    let span = top - e0;
    if !span.is_positive() {
        return Ok(None);
    }
    let mut width = &span / BigRational::from_integer(BigInt::one() << 40);
    loop {
        let cut = if width >= span {
            top.clone()
        } else {
            e0 + &width
        };
        let list = s.levels_within(&cut, budget)?;
        if let Some(l) = list.levels().get(1) {
            return Ok(Some(&l.energy - e0));
        }
        if cut == *top {
            return Ok(None);
        }
        width *= BigRational::from_integer(16.into());
    }
}

/// The Einstein solid as a named model: `n` labelled oscillators of one
/// quantum (energies in quanta, unit `unit`) sharing 0 to `quanta` quanta,
/// Ω = C(q + N − 1, q) (standard result) by the exact ratio
/// C(q + N − 1, q) = C(q + N − 2, q − 1)·(q + N − 1)/q, refusing tables
/// beyond `budget`.
///
/// ```
/// use zsum::microstates::einstein_omega;
/// use zsum::spectrum::Budget;
/// use zsum::units::EnergyUnit;
/// let o = einstein_omega(3, 4, EnergyUnit::Kelvin, &Budget::default())?;
/// assert_eq!(o.counts[4], 15u32.into());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn einstein_omega(n: u64, quanta: u64, unit: EnergyUnit, budget: &Budget) -> Result<Omega> {
    check_particles(n)?;
    let bins = quanta
        .checked_add(1)
        .ok_or_else(|| Error::invalid("number of quanta", quanta, "give fewer quanta"))?;
    // The largest count, C(q + N − 1, q), sets the width of every cell.
    let bits = count_bits(&BigUint::from(bins), n, Statistics::Bose);
    budget.check(
        format!("the Einstein solid's {bins} counts"),
        bins as f64 * (bits / 8.0 + 32.0),
        "lower the number of quanta",
    )?;
    let mut counts = Vec::with_capacity(bins as usize);
    let mut c = BigUint::one();
    counts.push(c.clone());
    for q in 1..bins {
        c = c * BigUint::from(q + n - 1) / BigUint::from(q);
        counts.push(c.clone());
    }
    Ok(Omega {
        statistics: Statistics::Distinct,
        particles: n,
        grid: Grid {
            unit,
            ground: BigRational::zero(),
            step: BigRational::one(),
            levels: vec![(0, BigUint::one())],
        },
        lowest: 0,
        counts,
    })
}

/// The refusal for a grid too fine to tabulate, naming the level that sets
/// the step.
fn finest_level_error(levels: &LevelList, grid: &Grid, bins: &BigInt, budget: &Budget) -> Error {
    let unit = &grid.unit;
    // The level whose energy above the ground has the smallest divisor
    // relation to the step: the first with the largest denominator in steps
    // of the coarsest spacing.
    let finest = levels
        .iter()
        .skip(1)
        .max_by_key(|l| (&l.energy - &grid.ground).denom().clone())
        .map(|l| format!("{} {unit}", energy_text(&l.energy)))
        .unwrap_or_else(|| "the ground".into());
    Error::budget(format!(
        "the levels lie on a common grid of {} {unit} (the level at {finest} sets how fine), so \
         the count needs {bins} energies per particle number, more than the memory budget of {} \
         allows; the energies cannot be put on a coarser integer grid exactly: lower the cutoff, \
         or round the levels to a coarser grid",
        energy_text(&grid.step),
        human_bytes(budget.limit() as f64)
    ))
}
