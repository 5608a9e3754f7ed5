//! Exact counts for collections of particles and modes. Every answer here
//! is numbers: exact counts (`BigUint`), exact energies (`BigRational`),
//! certified values ([`Certified`](crate::sum::Certified)) and, where a
//! value is an uncertified approximation, MPFR or `f64` numbers labelled
//! so. The printed answers are made from them in `report/` (above this module).
//!
//! - [`microstates`] and [`count_on_grid`]: the number of microstates
//!   Ω(E, N) of N labelled particles, bosons or fermions in one spectrum,
//!   for every total energy up to a cutoff, in big integers;
//!   [`microcanonical`] adds S = k ln Ω, the microcanonical temperature and
//!   the canonical comparison.
//! - [`ensemble_point`] and [`ensemble_sweep`]: canonical Q_N of ideal
//!   bosons and fermions by the cycle recursion, certified, against q^N/N!
//!   and q^N, with the temperature where q^N/N! breaks down.
//! - [`beyer_swinehart`], [`stein_rabinovitch`], [`whitten_rabinovitch`]:
//!   vibrational sums and densities of states, exactly and approximately;
//!   [`census`] chains them (the count, then every extra degree of freedom
//!   convolved in), [`StateCounts::rows`] lists the energies with states and
//!   [`census_error_map`] compares the approximation with the count.
//! - [`einstein_solid`]: C(q + N − 1, q); [`einstein_table`] tabulates the
//!   Einstein solid by number of quanta, with the microcanonical temperature
//!   from the exact derivative ψ(q + N) − ψ(q + 1) of ln Ω, in the quantum
//!   of [`einstein_unit`].
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
mod microcanonical;
mod vibration;
pub(crate) use census::round_to_decimals;
pub use census::{census, census_error_map, CensusEntry, ErrorMap, ErrorMapPoint, LOG10_DECIMALS};
pub use collection::{
    check_particles, count_on_grid, count_seconds, einstein_omega, microstates, table_bytes, Grid,
    Omega, Statistics, MAX_PARTICLES,
};
pub use einstein::{
    einstein_canonical, einstein_table, einstein_unit, EinsteinCanonical, EinsteinState,
    EinsteinTable,
};
pub use ensemble::{ensemble_point, ensemble_sweep, Crossing, EnsembleSweep, EnsembleValues};
pub use microcanonical::{
    microcanonical, CanonicalComparison, MicroEnergy, Microcanonical, COMPARISON_DIGITS,
};
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
        format!("a census of {n} steps"),
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
        format!("a census of {n} steps"),
        census_bytes(&rounded, n),
        "use a coarser step or a lower cutoff",
    )?;
    // One addition per step and mode component, and about 1500 operations
    // for each row of the table (its decimals).
    let components: f64 = rounded.iter().map(|(_, d)| f64::from(*d)).sum();
    budget.check_work(
        format!("a census of {n} steps"),
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

/// `x` rounded to `digits` significant digits, half to even, exactly (zero
/// stays zero).
pub(crate) fn round_sig(x: &BigRational, digits: u32) -> BigRational {
    use crate::exact::{decimal_exponent, pow10, round_half_even};
    if x.is_zero() {
        return x.clone();
    }
    let a = x.abs();
    let mut e = decimal_exponent(&a);
    loop {
        let shift = digits as i64 - 1 - e;
        let scale = BigRational::from_integer(pow10(shift.unsigned_abs() as u32));
        let scaled = if shift >= 0 { &a * &scale } else { &a / &scale };
        let m = round_half_even(&scaled);
        if m >= pow10(digits) {
            // Rounding carried into a new digit (e.g. 9.99 -> 10.0).
            e += 1;
            continue;
        }
        let m = BigRational::from_integer(m);
        let r = if shift >= 0 { m / scale } else { m * scale };
        return if x.is_negative() { -r } else { r };
    }
}

/// An MPFR number as the exact rational it is; `None` if not finite.
pub(crate) fn float_rational(x: &rug::Float) -> Option<BigRational> {
    use num_bigint::{BigInt, Sign};
    let r = x.to_rational()?;
    let big = |i: &rug::Integer| {
        let sign = if i.is_negative() {
            Sign::Minus
        } else {
            Sign::Plus
        };
        BigInt::from_bytes_le(sign, &i.to_digits::<u8>(rug::integer::Order::Lsf))
    };
    Some(BigRational::new(big(r.numer()), big(r.denom())))
}
