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
//!   vibrational sums and densities of states, exactly and approximately;
//!   [`CensusReport`] and [`CensusErrorMap`] lay them out (`zsum census`).
//! - [`einstein_solid`]: C(q + N − 1, q); [`EinsteinReport`] tabulates the
//!   Einstein solid by number of quanta, with the microcanonical temperature
//!   from the exact derivative ψ(q + N) − ψ(q + 1) of ln Ω.
//!
//! The Beyer–Swinehart algorithm counts the states of independent harmonic
//! modes on an energy grid of width `step`: starting from one state at zero
//! energy, each mode of frequency `w` (in steps) adds `c[E] += c[E − w]`
//! for E rising, which is the product of the modes' generating functions
//! `1/(1 − x^w)` truncated at the cutoff. Frequencies are put on the grid by
//! rounding to the nearest whole step (common practice); the rounded values
//! are reported. Counts are exact: machine integers with checked overflow,
//! continued in big integers when a count outgrows them.

mod census;
mod collection;
mod einstein;
mod ensemble;
mod reports;
mod vibration;
pub use census::{CensusErrorMap, CensusErrorRow, CensusReport, CensusRow, RoundedMode};
pub use collection::{
    check_particles, count_on_grid, count_seconds, einstein_omega, microstates, table_bytes, Grid,
    Omega, Statistics, MAX_PARTICLES,
};
pub use einstein::{einstein_canonical, EinsteinCanonical, EinsteinReport, EinsteinRow};
pub use ensemble::{ensemble_point, EnsemblePoint};
pub use reports::{BoltzmannCrossing, EnsembleReport, MicroReport, MicroRow};
pub use vibration::{stein_rabinovitch, stein_rabinovitch_spectrum, whitten_rabinovitch};

use crate::error::{Error, Result};
use crate::exact::{parse_rational, rational_string};
use crate::spectrum::Budget;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};

/// One vibrational mode: a frequency (any energy unit, the same as the
/// step's) and how many modes share it.
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
                    .ok_or_else(|| Error::parse("modes", text, allowed))?,
            ),
            None => (part, 1),
        };
        let frequency = parse_rational(f).map_err(|_| Error::parse("modes", text, allowed))?;
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

/// Exact numbers of states on a grid: `counts[k]` states with energy
/// k·step (after rounding the frequencies to whole steps).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct StateCounts {
    /// The energy step.
    pub step: BigRational,
    /// Each mode's frequency in steps after rounding, with its degeneracy.
    pub rounded: Vec<(u64, u32)>,
    /// States at each step, 0 up to the cutoff.
    pub counts: Vec<BigUint>,
}

impl StateCounts {
    /// The sum of states: states with energy at most k·step, for every k.
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

/// Memory of a census of `n` steps of the `rounded` modes, with its table:
/// the 128-bit counters (16 bytes a step), the exact counts made from them
/// (24 bytes a step, and the digits of every count that can be non-zero),
/// allocator slack (8 bytes a step),
/// and a row of the table for each such step ([`census::census_row_bytes`]).
/// Only multiples of the gcd g of the modes' steps can hold states, so at
/// most (n − 1)/g + 1 steps do; no count exceeds Π (n/w + 1)^d.
pub fn census_bytes(rounded: &[(u64, u32)], n: usize) -> f64 {
    let g = rounded
        .iter()
        .fold(0u64, |g, (w, _)| num_integer::Integer::gcd(&g, w))
        .max(1);
    let reachable = ((n as u64).saturating_sub(1) / g + 1) as f64;
    let bits: f64 = rounded
        .iter()
        .map(|(w, d)| *d as f64 * (n as f64 / *w as f64 + 1.0).log2())
        .sum::<f64>()
        .max(1.0);
    let limbs = (bits / 64.0).floor() + 1.0;
    n as f64 * (16.0 + 24.0 + 8.0)
        + reachable * (16.0 + 8.0 * limbs)
        + reachable * census::census_row_bytes(bits.ceil() as u64)
}

/// Counts on machine integers until one overflows.
enum Cells {
    Small(Vec<u128>),
    Big(Vec<BigUint>),
}

/// The Beyer–Swinehart count of `modes` on a grid of `step` up to
/// `up_to` (same unit), refusing grids beyond `budget`.
///
/// ```
/// use zsum::microstates::{beyer_swinehart, parse_modes};
/// use zsum::exact::parse_rational;
/// use zsum::spectrum::Budget;
/// // Three identical modes of one step: C(n + 2, 2) states at n steps.
/// let c = beyer_swinehart(&parse_modes("1x3")?, &parse_rational("1")?,
///                         &parse_rational("4")?, &Budget::default())?;
/// let got: Vec<u32> = c.counts.iter().map(|x| x.try_into().unwrap()).collect();
/// assert_eq!(got, [1, 3, 6, 10, 15]);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn beyer_swinehart(
    modes: &[Mode],
    step: &BigRational,
    up_to: &BigRational,
    budget: &Budget,
) -> Result<StateCounts> {
    if !step.is_positive() {
        return Err(Error::invalid(
            "energy step",
            rational_string(step),
            "the energy step must be greater than zero",
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
    let bins = (up_to / step).floor().to_integer();
    let n = bins
        .to_u64()
        .and_then(|b| usize::try_from(b).ok())
        .and_then(|b| b.checked_add(1))
        .ok_or_else(|| {
            Error::budget(format!(
                "a grid of {bins} steps is beyond any memory; use a coarser step"
            ))
        })?;
    // Before any rounding work: the u128 grid alone.
    budget.check(
        &format!("a census of {n} steps"),
        n as f64 * 16.0,
        "use a coarser step or a lower cutoff",
    )?;
    let mut rounded = Vec::with_capacity(modes.len());
    for m in modes {
        let in_steps = (&m.frequency / step).round().to_integer();
        let w = in_steps.to_u64().filter(|w| *w > 0).ok_or_else(|| {
            Error::invalid(
                "mode frequency",
                rational_string(&m.frequency),
                &format!(
                    "it rounds to {in_steps} steps of {}; frequencies must span at least \
                     half a step (use a finer step)",
                    rational_string(step)
                ),
            )
        })?;
        rounded.push((w, m.degeneracy));
    }
    budget.check(
        &format!("a census of {n} steps"),
        census_bytes(&rounded, n),
        "use a coarser step or a lower cutoff",
    )?;
    // One addition per step and mode component, and about 1500 operations
    // for each row of the table (its decimals).
    let components: f64 = rounded.iter().map(|(_, d)| f64::from(*d)).sum();
    budget.check_work(
        &format!("a census of {n} steps"),
        n as f64 * (components + 1500.0),
        "use a coarser step or a lower cutoff",
    )?;
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
        step: step.clone(),
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

/// A big integer as an MPFR number at `prec` bits, as a ball holding it
/// (exact when it fits in `prec` bits).
pub(crate) fn biguint_ball(x: &BigUint, prec: u32) -> crate::sum::ball::Ball {
    use crate::sum::ball::{Ball, RP};
    let i = rug::Integer::from_digits(&x.to_u32_digits(), rug::integer::Order::Lsf);
    let c = rug::Float::with_val(prec, &i);
    if x.bits() <= u64::from(prec) {
        Ball::exact(c)
    } else {
        Ball::rounded(c, rug::Float::new(RP))
    }
}

/// The ball `b` rounded to `decimals` decimal places, if every value in it
/// rounds alike (`None` when the ball straddles a rounding boundary).
pub(crate) fn fixed_decimals(b: &crate::sum::ball::Ball, decimals: u32) -> Option<String> {
    use rug::float::Round;
    use rug::Float;
    let p = b.prec().max(64) + 16;
    let scale = Float::with_val(p, rug::Integer::from(rug::Integer::u_pow_u(10, decimals)));
    let end = |x: Float, round: Round| {
        let scaled = Float::with_val_round(p, &x * &scale, round).0;
        Float::with_val_round(p, scaled + 0.5f64, round)
            .0
            .floor()
            .to_integer()
    };
    let lo = end(
        Float::with_val_round(p, &b.c - &b.r, Round::Down).0,
        Round::Down,
    )?;
    let hi = end(
        Float::with_val_round(p, &b.c + &b.r, Round::Up).0,
        Round::Up,
    )?;
    if lo != hi {
        return None;
    }
    let neg = lo < 0;
    let digits = lo.abs().to_string();
    let d = decimals as usize;
    let padded = format!(
        "{}{digits}",
        "0".repeat((d + 1).saturating_sub(digits.len()))
    );
    let (int, frac) = padded.split_at(padded.len() - d);
    let body = if d == 0 {
        int.to_string()
    } else {
        format!("{int}.{frac}")
    };
    Some(if neg { format!("-{body}") } else { body })
}

/// log₁₀ of a positive integer, correctly rounded to `decimals` decimal
/// places: computed in ball arithmetic from the exact integer, the
/// precision raised until both ends of the ball round alike (log₁₀ of an
/// integer is never halfway between two roundings).
pub(crate) fn log10_fixed(x: &BigUint, decimals: u32) -> String {
    use crate::sum::ball::Ball;
    if x.is_zero() {
        return "-inf".into();
    }
    let mut prec = 96 + 2 * decimals;
    loop {
        let ln10 = rug::Float::with_val(prec, rug::Float::with_val(prec, 10).ln_ref());
        let value = biguint_ball(x, prec)
            .ln()
            .and_then(|l| l.div(&Ball::rounded(ln10, rug::Float::new(crate::sum::ball::RP))));
        if let Some(text) = value.as_ref().and_then(|v| fixed_decimals(v, decimals)) {
            return text;
        }
        if prec > 1 << 16 {
            // Unreachable for x ≥ 1 (see above); the nearest rounding then.
            let v = value.map(|v| v.c.to_f64()).unwrap_or(f64::NAN);
            return format!("{v:.*}", decimals as usize);
        }
        prec *= 2;
    }
}
