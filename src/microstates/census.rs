//! The census of vibrational states (`zsum census`) as numbers: the exact
//! count of harmonic modes ([`super::beyer_swinehart`]) with extra degrees
//! of freedom convolved in ([`super::stein_rabinovitch_spectrum`]), its
//! energies with states ([`StateCounts::rows`]), and the error map of the
//! Whitten–Rabinovitch approximation against that count
//! ([`census_error_map`]). The printed tables are made from these in
//! `report/` (above this module).

use super::{beyer_swinehart, stein_rabinovitch_spectrum, whitten_rabinovitch, Mode, StateCounts};
use crate::error::{Error, Result};
use crate::spectrum::{Budget, Spectrum};
use crate::sum::ball::{Ball, RP};
use crate::sum::Certified;
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use rug::float::Round;
use rug::{Float, Integer};

/// Decimal places to which [`CensusEntry::log10_sum`] is certified.
pub const LOG10_DECIMALS: u32 = 4;

/// What one row of the census costs in memory, with counts of up to
/// `bits` bits: the sum and the count as decimal text twice (the answer and
/// its rendering, about 0.3 digits per bit), the density, its log and the
/// energy, and the row's bookkeeping (measured: 440 to 600 bytes with
/// short counts).
pub fn census_row_bytes(bits: u64) -> f64 {
    4.0 * bits as f64 * std::f64::consts::LOG10_2 + 640.0
}

/// The census of `modes` on a grid of `step` up to `up_to` (all in `unit`),
/// with every spectrum of `extras` convolved in (Stein–Rabinovitch, in
/// order, each spectrum's levels converted to `unit`): the exact numbers of
/// states at every step. Refuses a count, a convolution or a table of the
/// energies with states ([`StateCounts::rows`]) estimated beyond `budget`.
///
/// ```
/// use zsum::microstates::{census, parse_modes};
/// use zsum::exact::parse_rational;
/// use zsum::models::rotor::LinearRotor;
/// use zsum::spectrum::{Budget, Spectrum};
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // One mode of 1000 cm-1, far above the cutoff, and a rigid rotor of
/// // B = 1 cm-1 (levels 0, 2, 6, 12 with 1, 3, 5, 7 states).
/// let rotor = LinearRotor::rigid(r("1"), EnergyUnit::Wavenumber)?;
/// let extras: [&dyn Spectrum; 1] = [&rotor];
/// let c = census(&parse_modes("1000")?, &r("1"), &r("12"), &EnergyUnit::Wavenumber,
///                &extras, &Budget::default())?;
/// assert_eq!(c.sums()[12], 16u32.into());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn census(
    modes: &[Mode],
    step: &BigRational,
    up_to: &BigRational,
    unit: &EnergyUnit,
    extras: &[&dyn Spectrum],
    budget: &Budget,
) -> Result<StateCounts> {
    let mut counts = beyer_swinehart(modes, step, up_to, budget)?;
    for spectrum in extras {
        counts = stein_rabinovitch_spectrum(counts, *spectrum, unit, budget)?;
    }
    let with_states = counts.counts.iter().filter(|n| !n.is_zero()).count();
    let total: BigUint = counts.counts.iter().sum();
    budget.check(
        format!("a census table of {with_states} rows"),
        with_states as f64 * census_row_bytes(total.bits()),
        "use a coarser step or a lower cutoff",
    )?;
    Ok(counts)
}

/// One energy of a census at which there are states.
#[derive(Debug, Clone)]
pub struct CensusEntry {
    /// The energy in steps.
    pub steps: u64,
    /// The energy, exact: a whole number of steps.
    pub energy: BigRational,
    /// The states in the step at this energy (those with this energy after
    /// rounding), exact.
    pub in_step: BigUint,
    /// The sum of states N(E): the states with energy at most E, exact.
    pub sum_of_states: BigUint,
    /// The density of states ρ(E): the states in the step divided by the
    /// step, per unit energy, exact.
    pub density: BigRational,
    /// log₁₀ N(E), certified: its ball is narrow enough that every value in
    /// it rounds alike to [`LOG10_DECIMALS`] decimal places.
    pub log10_sum: Certified,
}

impl StateCounts {
    /// Every energy with states, lowest first, each with its exact counts
    /// and certified log₁₀ N(E); made one at a time, so a table of them
    /// never holds the counts twice.
    ///
    /// ```
    /// use zsum::microstates::{beyer_swinehart, parse_modes};
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// // Three modes of 2 cm-1 on a step of 1 cm-1: C(n + 2, 2) states at
    /// // 2n, so 1 + 3 + 6 + 10 = 20 states up to 6 cm-1.
    /// let c = beyer_swinehart(&parse_modes("2x3")?, &r("1"), &r("6"), &Budget::default())?;
    /// let last = c.rows().last().unwrap();
    /// assert_eq!((last.energy, last.in_step), (r("6"), 10u32.into()));
    /// assert_eq!(last.sum_of_states, 20u32.into());
    /// assert!((last.log10_sum.to_f64() - 20f64.log10()).abs() < 1e-12);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn rows(&self) -> impl Iterator<Item = CensusEntry> + '_ {
        let mut sum = BigUint::zero();
        self.counts
            .iter()
            .enumerate()
            .filter(|(_, n)| !n.is_zero())
            .map(move |(k, n)| {
                sum += n;
                CensusEntry {
                    steps: k as u64,
                    energy: &self.step * BigRational::from_integer(k.into()),
                    in_step: n.clone(),
                    sum_of_states: sum.clone(),
                    density: BigRational::from_integer(n.clone().into()) / &self.step,
                    log10_sum: log10_certified(&sum, LOG10_DECIMALS),
                }
            })
    }
}

/// `x` times 10^`decimals`, rounded to the nearest integer, if every value
/// in the ball of `x` rounds alike (`None` when the ball straddles a
/// rounding boundary or is not finite).
pub(crate) fn round_to_decimals(x: &Certified, decimals: u32) -> Option<Integer> {
    let b = &x.0;
    let p = b.prec().max(64) + 16;
    let scale = Float::with_val(p, Integer::from(Integer::u_pow_u(10, decimals)));
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
    (lo == hi).then_some(lo)
}

/// log₁₀ of a positive integer as a ball narrow enough to round to
/// `decimals` decimal places: computed in ball arithmetic from the exact
/// integer, the precision raised until both ends of the ball round alike
/// (log₁₀ of an integer is never halfway between two roundings). −∞,
/// exactly, for zero.
fn log10_certified(x: &BigUint, decimals: u32) -> Certified {
    if x.is_zero() {
        return Certified(Ball::exact(Float::with_val(
            64,
            rug::float::Special::NegInfinity,
        )));
    }
    let mut prec = 96 + 2 * decimals;
    loop {
        let ln10 = Float::with_val(prec, Float::with_val(prec, 10).ln_ref());
        let value = super::biguint_ball(x, prec)
            .ln()
            .and_then(|l| l.div(&Ball::rounded(ln10, Float::new(RP))))
            .map(Certified);
        match value {
            Some(v) if round_to_decimals(&v, decimals).is_some() => return v,
            // Unreachable for x ≥ 1 (see above): the last ball then.
            Some(v) if prec > 1 << 16 => return v,
            None if prec > 1 << 16 => {
                return Certified(Ball::rounded(Float::with_val(64, f64::NAN), Float::new(RP)))
            }
            _ => prec *= 2,
        }
    }
}

/// One energy of the error map.
#[derive(Debug, Clone)]
pub struct ErrorMapPoint {
    /// The energy in steps.
    pub steps: u64,
    /// The energy, exact.
    pub energy: BigRational,
    /// E/E_z, exact.
    pub e_over_ez: BigRational,
    /// The exact sum of states N(E).
    pub sum_exact: BigUint,
    /// ln of the Whitten–Rabinovitch sum of states: an `f64` evaluation of
    /// the approximation, not certified (−∞ for none, NaN where the formula
    /// fails).
    pub ln_sum_approx: f64,
    /// N approx / N exact − 1 in `f64`, not certified; `None` where either
    /// logarithm is not finite.
    pub sum_rel_error: Option<f64>,
    /// The exact density averaged over the window: the states in
    /// (E − w/2, E + w/2] over w, exact.
    pub density_exact: BigRational,
    /// ln of the Whitten–Rabinovitch density, in `f64`, not certified.
    pub ln_density_approx: f64,
    /// ρ approx / ρ exact − 1 in `f64`, not certified; `None` where either
    /// logarithm is not finite.
    pub density_rel_error: Option<f64>,
    /// Whether E/E_z lies outside the formulas' range 0.1 to 8, where the
    /// nearer form is extrapolated.
    pub extrapolated: bool,
}

/// The Whitten–Rabinovitch approximation against the exact count of the
/// same (rounded) harmonic modes, at evenly spaced energies.
#[derive(Debug, Clone)]
pub struct ErrorMap {
    /// The energy step.
    pub step: BigRational,
    /// Each mode's frequency in steps after rounding, with its degeneracy.
    pub rounded: Vec<(u64, u32)>,
    /// The zero-point energy E_z = ½ Σ hν of the rounded modes, exact.
    pub zero_point: BigRational,
    /// The window w of the exact density (the lowest mode), exact.
    pub window: BigRational,
    /// One point per sampled energy, lowest first.
    pub points: Vec<ErrorMapPoint>,
}

fn ln_big(x: &BigUint) -> f64 {
    super::ln_biguint(x, 64).to_f64()
}

/// e^`ln_ratio` − 1, where the ratio is finite.
fn rel_error(ln_ratio: f64) -> Option<f64> {
    ln_ratio.is_finite().then(|| ln_ratio.exp_m1())
}

/// Samples `points` energies evenly up to the cutoff of `harmonic` (the
/// modes' exact counts, nothing convolved in) and compares the
/// Whitten–Rabinovitch sum and density of states with the exact ones there.
///
/// ```
/// use zsum::microstates::{beyer_swinehart, census_error_map, parse_modes};
/// use zsum::exact::parse_rational;
/// use zsum::spectrum::Budget;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // Three modes of 1000 cm-1: E_z = 1500 cm-1; the exact sum at 1000 k
/// // cm-1 is C(k + 3, 3) (standard result). Up to 12 500 cm-1 with a
/// // density window of 1000 cm-1, four points fall at 3000, ..., 12 000.
/// let c = beyer_swinehart(&parse_modes("1000x3")?, &r("1"), &r("12500"), &Budget::default())?;
/// let map = census_error_map(&c, 4)?;
/// let p = &map.points[1];
/// assert_eq!((p.energy.clone(), p.e_over_ez.clone()), (r("6000"), r("4")));
/// assert_eq!(p.sum_exact, 84u32.into()); // C(9, 3)
/// assert!(!p.extrapolated);
/// assert!(p.sum_rel_error.unwrap().abs() < 0.2);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn census_error_map(harmonic: &StateCounts, points: usize) -> Result<ErrorMap> {
    let g = harmonic.step.to_f64().unwrap_or(1.0);
    let freqs: Vec<f64> = harmonic
        .rounded
        .iter()
        .flat_map(|(w, d)| std::iter::repeat_n(*w as f64 * g, *d as usize))
        .collect();
    let steps_ez: BigUint = harmonic
        .rounded
        .iter()
        .map(|(w, d)| BigUint::from(*w) * BigUint::from(*d))
        .sum();
    // E/E_z = k / (Σ w / 2), exactly.
    let half_sum = BigRational::new(steps_ez.clone().into(), 2.into());
    let lowest = harmonic.rounded.iter().map(|(w, _)| *w).min().unwrap_or(1);
    let window = lowest.max(1) as usize;
    let top = harmonic.counts.len() - 1;
    // Sample where the whole density window fits under the cutoff.
    let half = window / 2;
    let span = top.saturating_sub(half);
    if points == 0 || points > span {
        return Err(Error::invalid(
            "error-map points",
            points,
            &if span == 0 {
                format!(
                    "the cutoff leaves no energy to compare at (the density window is {} \
                     steps); raise the cutoff",
                    window
                )
            } else {
                format!(
                    "give at least one energy to compare at, and at most {span} (one per \
                     step up to the cutoff, less half the density window)"
                )
            },
        ));
    }
    // The sums of states where the map needs them, in one pass (never
    // a sum per step: that would double the memory of the count).
    let at = |k: usize| (k.saturating_sub(half + window % 2), (k + half).min(top));
    let ks: Vec<usize> = (1..=points).map(|i| span * i / points).collect();
    let mut wanted: Vec<usize> = ks.iter().flat_map(|&k| [k, at(k).0, at(k).1]).collect();
    wanted.sort_unstable();
    wanted.dedup();
    let sums: std::collections::HashMap<usize, BigUint> = {
        let mut acc = BigUint::zero();
        let mut next = wanted.iter().peekable();
        let mut out = std::collections::HashMap::with_capacity(wanted.len());
        for (k, c) in harmonic.counts.iter().enumerate() {
            acc += c;
            while next.peek() == Some(&&k) {
                out.insert(k, acc.clone());
                next.next();
            }
            if next.peek().is_none() {
                break;
            }
        }
        out
    };
    let mut rows = Vec::with_capacity(points);
    for &k in &ks {
        let e = k as f64 * g;
        let (lw, lr, _) = whitten_rabinovitch(&freqs, e);
        let (lo, hi) = at(k);
        let in_window = &sums[&hi] - &sums[&lo];
        let width = &harmonic.step * BigRational::from_integer((hi - lo).into());
        let density = BigRational::from_integer(in_window.clone().into()) / &width;
        let lre = ln_big(&in_window) - width.to_f64().unwrap_or(f64::NAN).ln();
        let reduced = BigRational::from_integer(k.into()) / &half_sum;
        let inside = reduced >= BigRational::new(1.into(), 10.into())
            && reduced <= BigRational::from_integer(8.into());
        rows.push(ErrorMapPoint {
            steps: k as u64,
            energy: &harmonic.step * BigRational::from_integer(k.into()),
            e_over_ez: reduced,
            sum_exact: sums[&k].clone(),
            ln_sum_approx: lw,
            sum_rel_error: rel_error(lw - ln_big(&sums[&k])),
            density_exact: density,
            ln_density_approx: lr,
            density_rel_error: rel_error(lr - lre),
            extrapolated: !inside,
        });
    }
    Ok(ErrorMap {
        step: harmonic.step.clone(),
        rounded: harmonic.rounded.clone(),
        zero_point: &half_sum * &harmonic.step,
        window: &harmonic.step * BigRational::from_integer(window.into()),
        points: rows,
    })
}
