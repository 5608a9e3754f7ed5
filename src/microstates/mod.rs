//! Exact counts for collections of particles and modes.
//!
//! - [`microstates`] and [`count_on_grid`]: the number of microstates
//!   Ω(E, N) of N labelled particles, bosons or fermions in one spectrum,
//!   for every total energy up to a cutoff, in big integers; [`MicroReport`]
//!   adds S = k ln Ω, the microcanonical temperature and the canonical
//!   comparison.
//! - [`ensemble_point`] and [`EnsembleReport`]: canonical Q_N of ideal
//!   bosons and fermions by the cycle recursion, certified, against q^N/N!
//!   and q^N, with the temperature where q^N/N! breaks down.
//! - [`beyer_swinehart`], [`stein_rabinovitch`], [`whitten_rabinovitch`]:
//!   vibrational sums and densities of states, exactly and approximately.
//! - [`einstein_solid`]: C(q + N − 1, q).
//!
//! The Beyer–Swinehart algorithm counts the states of independent harmonic
//! modes on an energy grid of width `grain`: starting from one state at zero
//! energy, each mode of frequency `w` (in grains) adds `c[E] += c[E − w]`
//! for E rising, which is the product of the modes' generating functions
//! `1/(1 − x^w)` truncated at the cutoff. Frequencies are put on the grid by
//! rounding to the nearest grain (common practice); the rounded values are
//! reported. Counts are exact: machine integers with checked overflow,
//! continued in big integers when a count outgrows them.

mod collection;
mod ensemble;
mod reports;
mod vibration;
pub use collection::{
    check_particles, count_on_grid, count_seconds, einstein_omega, microstates, table_bytes, Grid,
    Omega, Statistics, MAX_PARTICLES, MAX_SECONDS,
};
pub use ensemble::{ensemble_point, EnsemblePoint};
pub use reports::{BoltzmannCrossing, EnsembleReport, MicroReport, MicroRow};
pub use vibration::{stein_rabinovitch, whitten_rabinovitch, WrReport, WrRow};

use crate::error::{Error, Result};
use crate::exact::{parse_rational, rational_string};
use crate::spectrum::{human_bytes, Budget};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};

/// One vibrational mode: a frequency (any energy unit, the same as the
/// grain's) and how many modes share it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Mode {
    /// The frequency.
    pub frequency: BigRational,
    /// Its degeneracy (number of modes with this frequency).
    pub degeneracy: u32,
}

/// Reads `1000,1500x2,3000`: frequencies, each optionally `xN` for N
/// degenerate modes.
///
/// ```
/// let m = zsum::microstates::parse_modes("1000,1500x2").unwrap();
/// assert_eq!(m.len(), 2);
/// assert_eq!(m[1].degeneracy, 2);
/// ```
pub fn parse_modes(text: &str) -> Result<Vec<Mode>> {
    let allowed = "frequencies separated by commas, each optionally xN for N degenerate modes, e.g. 1000,1500x2,3000";
    let mut out = Vec::new();
    for part in text.split(',') {
        let part = part.trim();
        let (f, d) = match part.split_once('x') {
            Some((f, d)) => (
                f,
                d.trim()
                    .parse::<u32>()
                    .ok()
                    .filter(|d| *d >= 1)
                    .ok_or_else(|| Error::parse("--modes", text, allowed))?,
            ),
            None => (part, 1),
        };
        let frequency = parse_rational(f).map_err(|_| Error::parse("--modes", text, allowed))?;
        if !frequency.is_positive() {
            return Err(Error::invalid(
                "mode frequency",
                f,
                "frequencies must be greater than zero",
            ));
        }
        out.push(Mode {
            frequency,
            degeneracy: d,
        });
    }
    Ok(out)
}

/// Exact numbers of states on a grid: `counts[k]` states with energy in the
/// grain bin k (energy k·grain after rounding the frequencies).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct StateCounts {
    /// The grain.
    pub grain: BigRational,
    /// Each mode's frequency in grains after rounding, with its degeneracy.
    pub rounded: Vec<(u64, u32)>,
    /// States per bin, bins 0..=cutoff.
    pub counts: Vec<BigUint>,
}

impl StateCounts {
    /// The sum of states: states with energy at most bin k, for every k.
    pub fn sums(&self) -> Vec<BigUint> {
        let mut acc = BigUint::zero();
        self.counts
            .iter()
            .map(|c| {
                acc += c;
                acc.clone()
            })
            .collect()
    }
}

/// Counts on machine integers until one overflows.
enum Cells {
    Small(Vec<u128>),
    Big(Vec<BigUint>),
}

/// The Beyer–Swinehart count of `modes` on a grid of `grain` up to
/// `up_to` (same unit), refusing grids beyond `budget`.
///
/// ```
/// use zsum::microstates::{beyer_swinehart, parse_modes};
/// use zsum::exact::parse_rational;
/// use zsum::spectrum::Budget;
/// // Three identical modes of one grain: C(n + 2, 2) states at n grains.
/// let c = beyer_swinehart(&parse_modes("1x3")?, &parse_rational("1")?,
///                         &parse_rational("4")?, &Budget::default())?;
/// let got: Vec<u32> = c.counts.iter().map(|x| x.try_into().unwrap()).collect();
/// assert_eq!(got, [1, 3, 6, 10, 15]);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn beyer_swinehart(
    modes: &[Mode],
    grain: &BigRational,
    up_to: &BigRational,
    budget: &Budget,
) -> Result<StateCounts> {
    if !grain.is_positive() {
        return Err(Error::invalid(
            "grain",
            rational_string(grain),
            "the energy grain must be greater than zero",
        ));
    }
    if up_to.is_negative() {
        return Err(Error::invalid(
            "cutoff",
            rational_string(up_to),
            "the cutoff must be zero or above",
        ));
    }
    if modes.is_empty() {
        return Err(Error::invalid("modes", "none", "give at least one mode"));
    }
    let bins = (up_to / grain).floor().to_integer();
    let n = bins
        .to_u64()
        .and_then(|b| usize::try_from(b).ok())
        .and_then(|b| b.checked_add(1))
        .ok_or_else(|| {
            Error::budget(format!(
                "a grid of {bins} grains is beyond any memory; use a coarser grain"
            ))
        })?;
    let need = n as f64 * 16.0;
    if need > budget.limit() as f64 {
        return Err(Error::budget(format!(
            "the count needs a grid of {n} bins, about {} (and more if counts outgrow 128 \
             bits), over the memory budget of {}; use a coarser grain or a lower cutoff",
            human_bytes(need),
            human_bytes(budget.limit() as f64)
        )));
    }
    let mut rounded = Vec::with_capacity(modes.len());
    for m in modes {
        let in_grains = (&m.frequency / grain).round().to_integer();
        let w = in_grains.to_u64().filter(|w| *w > 0).ok_or_else(|| {
            Error::invalid(
                "mode frequency",
                rational_string(&m.frequency),
                &format!(
                    "it rounds to {in_grains} grains of {}; frequencies must span at least \
                     half a grain (use a finer grain)",
                    rational_string(grain)
                ),
            )
        })?;
        rounded.push((w, m.degeneracy));
    }
    let mut cells = Cells::Small({
        let mut v = vec![0u128; n];
        v[0] = 1;
        v
    });
    for &(w, d) in &rounded {
        let w = w as usize;
        for _ in 0..d {
            if w >= n {
                continue;
            }
            cells = match cells {
                Cells::Small(mut v) => {
                    let mut overflow = None;
                    for e in w..n {
                        match v[e].checked_add(v[e - w]) {
                            Some(x) => v[e] = x,
                            None => {
                                overflow = Some(e);
                                break;
                            }
                        }
                    }
                    match overflow {
                        None => Cells::Small(v),
                        Some(e0) => {
                            // Continue this pass exactly from bin e0 in big integers.
                            let mut b: Vec<BigUint> = v.iter().map(|x| BigUint::from(*x)).collect();
                            for e in e0..n {
                                let add = b[e - w].clone();
                                b[e] += add;
                            }
                            Cells::Big(b)
                        }
                    }
                }
                Cells::Big(mut b) => {
                    for e in w..n {
                        let add = b[e - w].clone();
                        b[e] += add;
                    }
                    Cells::Big(b)
                }
            };
        }
    }
    let counts = match cells {
        Cells::Small(v) => v.into_iter().map(BigUint::from).collect(),
        Cells::Big(b) => b,
    };
    Ok(StateCounts {
        grain: grain.clone(),
        rounded,
        counts,
    })
}

/// The number of microstates of an Einstein solid: `n` oscillators sharing
/// `q` quanta, C(q + n − 1, q) (standard result), exactly.
///
/// ```
/// assert_eq!(zsum::microstates::einstein_solid(3, 4), 15u32.into());
/// ```
pub fn einstein_solid(n: u64, q: u64) -> BigUint {
    if n == 0 {
        return BigUint::from(u32::from(q == 0));
    }
    collection::binomial(&BigUint::from(q + n - 1), q.min(n - 1))
}

/// ln x! for x ≥ 0 (through MPFR's ln Γ), for estimates and approximations.
pub(crate) fn ln_factorial(x: f64) -> f64 {
    rug::Float::with_val(64, x + 1.0).ln_gamma().to_f64()
}

/// ln of a big integer at `prec` bits (−∞ for zero).
pub(crate) fn ln_biguint(x: &BigUint, prec: u32) -> rug::Float {
    let r = crate::sum::to_rug(&BigRational::from_integer(num_bigint::BigInt::from(
        x.clone(),
    )));
    rug::Float::with_val(prec, rug::Float::with_val(prec, r).ln_ref())
}

/// Rounded modes as `w(d), ...`: frequency in grains (degeneracy).
fn modes_text(rounded: &[(u64, u32)]) -> String {
    rounded
        .iter()
        .map(|(w, d)| format!("{w}({d})"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// `zsum vibsum`: counts per grain, sums and densities of states.
#[derive(Debug, Clone, serde::Serialize)]
pub struct VibsumReport {
    /// The energy unit.
    pub unit: String,
    /// The grain, exact.
    pub grain: String,
    /// Each mode in grains after rounding, with its degeneracy.
    pub rounded_modes: Vec<(u64, u32)>,
    /// Extra degrees of freedom convolved in (Stein–Rabinovitch), by name.
    pub extras: Vec<String>,
    /// One row per bin with at least one state.
    pub rows: Vec<VibsumRow>,
}

/// One bin.
#[derive(Debug, Clone, serde::Serialize)]
pub struct VibsumRow {
    /// Energy of the bin, exact (k · grain).
    pub energy: String,
    /// States in the bin.
    pub count: String,
    /// States with energy up to and including the bin.
    pub sum: String,
    /// Density of states: count / grain, per unit energy, exact rational.
    pub density: String,
}

impl VibsumReport {
    /// The report of `c` in `unit`; only bins with states are listed.
    pub fn new(c: &StateCounts, unit: &str) -> Self {
        let sums = c.sums();
        let rows = c
            .counts
            .iter()
            .enumerate()
            .filter(|(_, n)| !n.is_zero())
            .map(|(k, n)| VibsumRow {
                energy: crate::exact::exact_decimal(
                    &(&c.grain * BigRational::from_integer(k.into())),
                    40,
                ),
                count: n.to_string(),
                sum: sums[k].to_string(),
                density: crate::exact::exact_decimal(
                    &(BigRational::from_integer(n.clone().into()) / &c.grain),
                    60,
                ),
            })
            .collect();
        VibsumReport {
            unit: unit.to_string(),
            grain: rational_string(&c.grain),
            rounded_modes: c.rounded.clone(),
            extras: Vec::new(),
            rows,
        }
    }

    /// Names the extra degrees of freedom convolved into the counts.
    pub fn with_extras(mut self, extras: Vec<String>) -> Self {
        self.extras = extras;
        self
    }
}

impl crate::export::Tabular for VibsumReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "Beyer–Swinehart exact state counts, grain {} {}; modes in grains (degeneracy): {}",
                self.grain,
                self.unit,
                modes_text(&self.rounded_modes)
            ),
            format!(
                "count = states in the bin; sum = states up to it; density = count/grain per {}",
                self.unit
            ),
        ]
        .into_iter()
        .chain((!self.extras.is_empty()).then(|| {
            format!(
                "with extra degrees of freedom (Stein–Rabinovitch, levels rounded to the grain): {}",
                self.extras.join("; ")
            )
        }))
        .collect()
    }
    fn columns(&self) -> Vec<crate::export::Column> {
        use crate::export::Column;
        vec![
            Column::with_unit("E", &self.unit),
            Column::plain("count"),
            Column::plain("sum"),
            Column::with_unit("density", &format!("1/{}", self.unit)),
        ]
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.energy.clone(),
                    r.count.clone(),
                    r.sum.clone(),
                    r.density.clone(),
                ]
            })
            .collect()
    }
}
