//! The breakdown finder: where an approximation's relative error crosses a
//! tolerance.
//!
//! The range of T/θ is scanned on a logarithmic grid (50 points per decade,
//! at least 60 in all), hottest first so that level listings are reused;
//! wherever `|error| > tol` changes between neighbours, the crossing is
//! bracketed and bisected (in ln T) until both ends of the bracket round to
//! the same requested digits in T/θ and in T. Every crossing in the range
//! is reported, each with which side of it the tolerance is broken.
//! Crossings closer together than the grid spacing (a factor 10^(1/50)) can
//! be missed; narrow the range to resolve them.

use super::{Classical, Quantity, PREC};
use crate::error::{Error, Result};
use crate::exact::{format_sig, parse_rational};
use crate::sum::Cached;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive};
use rug::Float;

/// A range of T/θ to search.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SearchRange {
    /// Lowest T/θ.
    pub from: BigRational,
    /// Highest T/θ.
    pub to: BigRational,
}

impl SearchRange {
    /// Reads `A:B` (T/θ from A to B, both positive, A < B).
    ///
    /// ```
    /// use zsum::classical::SearchRange;
    /// assert!(SearchRange::parse("0.01:100").is_ok());
    /// assert!(SearchRange::parse("5:1").is_err());
    /// assert!(SearchRange::parse("0:1").is_err());
    /// ```
    pub fn parse(text: &str) -> Result<Self> {
        let allowed = "A:B with 0 < A < B (values of T/θ), e.g. 0.01:100";
        let (a, b) = text
            .split_once(':')
            .ok_or_else(|| Error::parse("search range", text, allowed))?;
        let (from, to) = (
            parse_rational(a).map_err(|_| Error::parse("search range", text, allowed))?,
            parse_rational(b).map_err(|_| Error::parse("search range", text, allowed))?,
        );
        if !from.is_positive() || !to.is_positive() {
            return Err(Error::invalid(
                "search range",
                text,
                "both ends must be greater than zero (T/θ)",
            ));
        }
        if from >= to {
            return Err(Error::invalid(
                "search range",
                text,
                "it is empty: the first value must be below the second",
            ));
        }
        Ok(SearchRange { from, to })
    }
}

/// One crossing of the tolerance, located so that T/θ (and T, when the
/// model's unit has a known size) is settled to the asked digits.
#[derive(Debug, Clone)]
pub struct Crossing {
    /// T/θ at the crossing.
    pub reduced: BigRational,
    /// Whether the tolerance is exceeded just below this temperature (the
    /// usual breakdown) rather than just above it.
    pub exceeds_below: bool,
}

/// The breakdown finder's answer, in numbers.
#[derive(Debug, Clone)]
pub struct Crossovers {
    /// The approximation judged.
    pub approximation: super::Approximation,
    /// The quantity judged.
    pub quantity: Quantity,
    /// Every crossing found, coldest first.
    pub crossings: Vec<Crossing>,
    /// The relative error at the coldest and hottest ends of the range.
    pub error_at_ends: [Float; 2],
    /// Whether the tolerance is exceeded at the hottest end.
    pub exceeded_when_hottest: bool,
}

/// State of `|error| > tol` at T/θ = x: true when the tolerance is exceeded
/// (or the approximation is undefined there).
fn exceeds(
    c: &Classical,
    index: usize,
    quantity: Quantity,
    tol: &Float,
    x: &BigRational,
) -> Result<(bool, Float)> {
    let t = c.at_reduced(x);
    // 20 digits settle the sign of |error| − tol for any tolerance offered.
    let exact = c.exact_digits(&t, 20)?;
    match c.approximate(index, &t)? {
        None => Ok((true, Float::with_val(PREC, f64::NAN))),
        Some(a) => {
            let e = a.rel_error(&exact, quantity);
            let over = e.is_nan() || Float::with_val(PREC, e.abs_ref()) > *tol;
            Ok((over, e))
        }
    }
}

/// Narrows a bracket `[cold, hot]` of temperatures whose ends lie on
/// different sides of a tolerance (`cold_state` is the cold end's) by
/// bisection in ln T until both ends give the same `key` (their printed
/// digits); returns the cold end.
pub(crate) fn bisect<K: PartialEq>(
    mut cold: BigRational,
    mut hot: BigRational,
    cold_state: bool,
    key: impl Fn(&BigRational) -> K,
    mut state: impl FnMut(&BigRational) -> Result<bool>,
) -> Result<BigRational> {
    for _ in 0..200 {
        if key(&cold) == key(&hot) {
            break;
        }
        let (a, b) = (cold.to_f64().unwrap_or(0.0), hot.to_f64().unwrap_or(0.0));
        let mut mid = rational_of((a * b).sqrt());
        if mid <= cold || mid >= hot {
            // f64 exhausted: halve exactly.
            mid = (&cold + &hot) / BigRational::from_integer(2.into());
        }
        if state(&mid)? == cold_state {
            cold = mid;
        } else {
            hot = mid;
        }
    }
    Ok(cold)
}

fn rational_of(x: f64) -> BigRational {
    BigRational::from_float(x).unwrap_or_else(|| BigRational::from_integer(1.into()))
}

/// The most temperatures one crossover scan evaluates (50 per decade).
pub const MAX_SCAN_POINTS: usize = 2500;

/// The scan's length for `range` (50 temperatures per decade, at least 60),
/// estimated before any work: refused beyond [`MAX_SCAN_POINTS`] with the
/// estimate and how to proceed.
pub fn scan_points(range: &SearchRange) -> Result<usize> {
    let ln = |x: &BigRational| super::to_float(x).ln().to_f64();
    let decades = (ln(&range.to) - ln(&range.from)) / std::f64::consts::LN_10;
    let n = (decades * 50.0).ceil();
    if n.is_nan() || n > MAX_SCAN_POINTS as f64 {
        return Err(Error::budget(format!(
            "the range T/θ {} to {} spans {} decades: the scan would evaluate about {} \
             temperatures (50 per decade), more than the {MAX_SCAN_POINTS} allowed; narrow \
             --range to at most {} decades around where the approximation fails (the \
             classical forms fail near T/θ = 1)",
            format_sig(&range.from, 3),
            format_sig(&range.to, 3),
            crate::exact::format_sig_f64(decades, 3),
            crate::exact::format_sig_f64(n, 2),
            MAX_SCAN_POINTS / 50
        )));
    }
    Ok((n as usize).max(60))
}

/// Finds every temperature in `range` (T/θ) where the relative error of
/// approximation `index` in `quantity` crosses `tol`, each to `digits`
/// significant digits (1 to 12).
///
/// ```
/// use zsum::classical::{crossovers, Classical, Quantity, SearchRange, parse_tolerance};
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// // One mode of 1 K, no zero point: the classical q = T/θ errs by more
/// // than 1% below T/θ ≈ 49.7.
/// let ho = HarmonicModes::one_d(parse_rational("1")?, false, EnergyUnit::Kelvin)?;
/// let c = Classical::new(&ho)?;
/// let r = crossovers(&c, c.find("classical")?, Quantity::Q, &parse_tolerance("1%")?,
///                    &SearchRange::parse("1:1000")?, 4)?;
/// assert_eq!(r.crossings.len(), 1);
/// let x = num_traits::ToPrimitive::to_f64(&r.crossings[0].reduced).unwrap();
/// assert!((x - 49.67).abs() < 0.005 && r.crossings[0].exceeds_below);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn crossovers(
    c: &Classical,
    index: usize,
    quantity: Quantity,
    tol: &BigRational,
    range: &SearchRange,
    digits: u32,
) -> Result<Crossovers> {
    if !(1..=12).contains(&digits) {
        return Err(Error::invalid(
            "digits",
            digits,
            "choose between 1 and 12 significant digits for a crossing",
        ));
    }
    let approximation =
        c.approximations().get(index).cloned().ok_or_else(|| {
            Error::invalid("approximation index", index, "an index the model offers")
        })?;
    let cached = Cached::new(c.spectrum());
    let c = Classical {
        spectrum: &cached,
        form: c.form().clone(),
    };
    let tol_f = super::to_float(tol);
    let n = scan_points(range)?;
    let lo = super::to_float(&range.from).ln().to_f64();
    let hi = super::to_float(&range.to).ln().to_f64();
    // Grid from hottest to coldest; the ends are the range's exact ends.
    let mut grid: Vec<BigRational> = (0..=n)
        .map(|i| {
            if i == 0 {
                range.to.clone()
            } else if i == n {
                range.from.clone()
            } else {
                rational_of((hi - (hi - lo) * i as f64 / n as f64).exp())
            }
        })
        .collect();
    grid.dedup();
    let mut states = Vec::with_capacity(grid.len());
    for x in &grid {
        states.push(exceeds(&c, index, quantity, &tol_f, x)?);
    }
    let theta_k = c.theta_kelvin();
    let mut crossings = Vec::new();
    for i in 0..grid.len() - 1 {
        // grid[i] is hotter than grid[i + 1].
        if states[i].0 == states[i + 1].0 {
            continue;
        }
        let cold_state = states[i + 1].0;
        let key = |x: &BigRational| {
            (
                format_sig(x, digits),
                theta_k.as_ref().map(|k| format_sig(&(x * k), digits)),
            )
        };
        let x = bisect(
            grid[i + 1].clone(),
            grid[i].clone(),
            cold_state,
            key,
            |mid| Ok(exceeds(&c, index, quantity, &tol_f, mid)?.0),
        )?;
        crossings.push(Crossing {
            reduced: x,
            exceeds_below: cold_state,
        });
    }
    crossings.reverse();
    let last = states.len() - 1;
    Ok(Crossovers {
        approximation,
        quantity,
        crossings,
        error_at_ends: [states[last].1.clone(), states[0].1.clone()],
        exceeded_when_hottest: states[0].0,
    })
}
