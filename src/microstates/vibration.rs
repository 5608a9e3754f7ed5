//! Extensions of the Beyer–Swinehart count: the Stein–Rabinovitch
//! convolution with extra degrees of freedom given as level lists (free or
//! hindered internal rotors, low electronic levels), and the
//! Whitten–Rabinovitch approximation with its error map against the exact
//! count.
//!
//! # Stein–Rabinovitch
//! Each extra degree of freedom with levels `(ε_j, g_j)` (energies from its
//! own lowest level, put on the grid by rounding to the nearest whole step,
//! common practice) multiplies the generating function by `Σ_j g_j x^{e_j}`:
//! `c'[E] = Σ_j g_j c[E − e_j]`, exact in big integers.
//!
//! # Whitten–Rabinovitch
//! For s harmonic oscillators of frequencies ν_i with zero-point energy
//! `E_z = ½ Σ hν_i` (formulas from memory: Whitten and Rabinovitch, J. Chem.
//! Phys. 38, 2466 (1963) and 41, 1883 (1964)):
//!
//! ```text
//! W(E) = (E + a E_z)^s / (s! Π hν_i)                     (sum of states)
//! ρ(E) = (E + a E_z)^(s−1) (1 − β dω/dE′) / ((s−1)! Π hν_i)  (density)
//! a = 1 − β ω(E′),  E′ = E/E_z,  β = ((s−1)/s) <ν²>/<ν>²
//! ω = (5.00 E′ + 2.73 E′^0.5 + 3.51)^−1   for 0.1 < E′ < 1
//! ω = exp(−2.4191 E′^0.25)               for 1 < E′ < 8
//! ```
//!
//! Outside 0.1 < E′ < 8 the nearer form is extrapolated and the row says so.
//! The comparison ([`super::CensusErrorMap`]) uses the frequencies as
//! rounded to the step, so it measures the approximation alone.

use super::StateCounts;
use crate::error::{Error, Result};
use crate::level::LevelList;
use crate::spectrum::{Budget, Spectrum};
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};

/// Convolves `counts` with an extra degree of freedom's `levels` (in the
/// step's unit; energies taken from the lowest level): the
/// Stein–Rabinovitch step. Refuses work beyond `budget`.
///
/// ```
/// use zsum::microstates::{beyer_swinehart, parse_modes, stein_rabinovitch};
/// use zsum::exact::parse_rational;
/// use zsum::level::{Level, LevelList};
/// use zsum::spectrum::Budget;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // One mode of 2 steps and a two-level extra (0 and 1 step, 1 + 3 states).
/// let c = beyer_swinehart(&parse_modes("2")?, &r("1"), &r("4"), &Budget::default())?;
/// let extra = LevelList::new(EnergyUnit::Wavenumber,
///     vec![Level::new(r("0"), 1u32), Level::new(r("1"), 3u32)]);
/// let c = stein_rabinovitch(c, &extra, &Budget::default())?;
/// let got: Vec<u32> = c.counts.iter().map(|x| x.try_into().unwrap()).collect();
/// assert_eq!(got, [1, 3, 1, 3, 1]);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn stein_rabinovitch(
    counts: StateCounts,
    levels: &LevelList,
    budget: &Budget,
) -> Result<StateCounts> {
    let n = counts.counts.len();
    let Some(ground) = levels.ground().map(|l| l.energy.clone()) else {
        return Err(Error::invalid(
            "extra degree of freedom",
            "with no levels",
            "give at least one level",
        ));
    };
    let mut shifts: Vec<(usize, BigUint)> = Vec::new();
    for l in levels.iter() {
        let k = ((&l.energy - &ground) / &counts.step)
            .round()
            .to_integer()
            .to_usize()
            .unwrap_or(usize::MAX);
        if k >= n {
            break;
        }
        match shifts.last_mut() {
            Some((last, g)) if *last == k => *g += &l.degeneracy,
            _ => shifts.push((k, l.degeneracy.clone())),
        }
    }
    let bits = counts.counts.iter().map(|c| c.bits()).max().unwrap_or(0)
        + levels.total_states().bits()
        + 1;
    let need = n as f64 * (bits as f64 / 8.0 + 32.0) * 2.0;
    budget.check(
        "the Stein–Rabinovitch convolution",
        need,
        "use a coarser step or a lower cutoff",
    )?;
    let mut out = vec![BigUint::zero(); n];
    for (k, g) in &shifts {
        for (slot, c) in out[*k..].iter_mut().zip(&counts.counts) {
            if !c.is_zero() {
                *slot += c * g;
            }
        }
    }
    Ok(StateCounts {
        counts: out,
        ..counts
    })
}

/// Convolves `counts` (energies in `unit`) with every level of `spectrum`
/// that can land on the grid: the levels within the cutoff (plus half a
/// step, which still rounds onto it) above its ground, converted to `unit`,
/// then [`stein_rabinovitch`].
///
/// ```
/// use zsum::microstates::{beyer_swinehart, parse_modes, stein_rabinovitch_spectrum};
/// use zsum::exact::parse_rational;
/// use zsum::models::rotor::LinearRotor;
/// use zsum::spectrum::Budget;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // A rigid rotor of B = 1 cm-1 (levels 0, 2, 6, 12 with 1, 3, 5, 7
/// // states) beside one mode far above the cutoff of 12 cm-1.
/// let c = beyer_swinehart(&parse_modes("1000")?, &r("1"), &r("12"), &Budget::default())?;
/// let rotor = LinearRotor::rigid(r("1"), EnergyUnit::Wavenumber)?;
/// let c = stein_rabinovitch_spectrum(c, &rotor, &EnergyUnit::Wavenumber, &Budget::default())?;
/// assert_eq!(c.sums()[12], 16u32.into());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn stein_rabinovitch_spectrum(
    counts: StateCounts,
    spectrum: &dyn Spectrum,
    unit: &EnergyUnit,
    budget: &Budget,
) -> Result<StateCounts> {
    let top = BigRational::from_integer(counts.counts.len().saturating_sub(1).into());
    let half = BigRational::new(1.into(), 2.into());
    let span = unit.convert(&((top + half) * &counts.step), &spectrum.unit())?;
    let levels = spectrum
        .levels_within(&(spectrum.ground_energy() + span), budget)?
        .converted(unit)?;
    stein_rabinovitch(counts, &levels, budget)
}

/// The Whitten–Rabinovitch sum and density of states at energy `e` for
/// harmonic frequencies `freqs` (each listed once per mode, same unit as
/// `e`), as natural logarithms, with whether E′ = E/E_z lies in the
/// formulas' range 0.1 to 8.
///
/// ```
/// use zsum::microstates::whitten_rabinovitch;
/// // One oscillator: β = 0, so W = (E + E_z)/hν, the classical count of
/// // levels shifted by half a quantum.
/// let (ln_w, _ln_rho, _) = whitten_rabinovitch(&[1000.0], 2500.0);
/// assert!((ln_w.exp() - 3.0).abs() < 1e-12);
/// ```
pub fn whitten_rabinovitch(freqs: &[f64], e: f64) -> (f64, f64, bool) {
    let s = freqs.len() as f64;
    let ez = 0.5 * freqs.iter().sum::<f64>();
    let mean = freqs.iter().sum::<f64>() / s;
    let mean2 = freqs.iter().map(|v| v * v).sum::<f64>() / s;
    let beta = (s - 1.0) / s * mean2 / (mean * mean);
    let ep = e / ez;
    let (omega, domega) = if ep < 1.0 {
        let w = 1.0 / (5.00 * ep + 2.73 * ep.sqrt() + 3.51);
        let dw = if ep > 0.0 {
            -(5.00 + 1.365 / ep.sqrt()) * w * w
        } else {
            0.0
        };
        (w, dw)
    } else {
        let w = (-2.4191 * ep.powf(0.25)).exp();
        (w, -2.4191 * 0.25 * ep.powf(-0.75) * w)
    };
    let a = 1.0 - beta * omega;
    let ln_prod: f64 = freqs.iter().map(|v| v.ln()).sum();
    let ln_fact = super::ln_factorial;
    let base = (e + a * ez).ln();
    let ln_w = s * base - ln_fact(s) - ln_prod;
    let ln_rho = (s - 1.0) * base + (1.0 - beta * domega).ln() - ln_fact(s - 1.0) - ln_prod;
    (ln_w, ln_rho, (0.1..=8.0).contains(&ep))
}
