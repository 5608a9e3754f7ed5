//! Extensions of the Beyer–Swinehart count: the Stein–Rabinovitch
//! convolution with extra degrees of freedom given as level lists (free or
//! hindered internal rotors, low electronic levels), and the
//! Whitten–Rabinovitch approximation with its error map against the exact
//! count.
//!
//! # Stein–Rabinovitch
//! Each extra degree of freedom with levels `(ε_j, g_j)` (energies from its
//! own lowest level, put on the grain grid by rounding to the nearest grain,
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
//! The comparison uses the frequencies as rounded to the grain, so it
//! measures the approximation alone.

use super::StateCounts;
use crate::error::{Error, Result};
use crate::exact::{exact_decimal, format_sig};
use crate::export::Tabular;
use crate::level::LevelList;
use crate::spectrum::Budget;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use serde::Serialize;

/// Convolves `counts` with an extra degree of freedom's `levels` (in the
/// grain's unit; energies taken from the lowest level): the
/// Stein–Rabinovitch step. Refuses work beyond `budget`.
///
/// ```
/// use zsum::microstates::{beyer_swinehart, parse_modes, stein_rabinovitch};
/// use zsum::exact::parse_rational;
/// use zsum::level::{Level, LevelList};
/// use zsum::spectrum::Budget;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // One mode of 2 grains and a two-level extra (0 and 1 grain, 1 + 3 states).
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
        let k = ((&l.energy - &ground) / &counts.grain)
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
        "use a coarser grain or a lower cutoff",
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

/// One energy of the Whitten–Rabinovitch error map.
#[derive(Debug, Clone, Serialize)]
pub struct WrRow {
    /// The energy.
    pub energy: String,
    /// E/E_z.
    pub reduced: String,
    /// Exact sum of states (states with energy ≤ E).
    pub sum_exact: String,
    /// Whitten–Rabinovitch sum of states.
    pub sum_wr: String,
    /// W_WR/W − 1.
    pub sum_error: String,
    /// Exact density, averaged over a window (states in (E − w/2, E + w/2]
    /// over w).
    pub density_exact: String,
    /// Whitten–Rabinovitch density.
    pub density_wr: String,
    /// ρ_WR/ρ − 1.
    pub density_error: String,
    /// Whether E/E_z lies in the formulas' range 0.1 to 8.
    pub in_range: bool,
}

/// `zsum vibsum --wr`: the error map of the Whitten–Rabinovitch
/// approximation against the exact count.
#[derive(Debug, Clone, Serialize)]
pub struct WrReport {
    /// The energy unit.
    pub unit: String,
    /// The grain.
    pub grain: String,
    /// Modes in grains (degeneracy), as rounded.
    pub rounded_modes: Vec<(u64, u32)>,
    /// Zero-point energy E_z.
    pub zero_point: String,
    /// The density window w.
    pub window: String,
    /// One row per sampled energy.
    pub rows: Vec<WrRow>,
}

fn ln_big(x: &BigUint) -> f64 {
    super::ln_biguint(x, 64).to_f64()
}

fn rel_text(ln_ratio: f64) -> String {
    if !ln_ratio.is_finite() {
        return "n/a".into();
    }
    format!("{:.3e}", ln_ratio.exp_m1())
}

fn exp_text(ln: f64) -> String {
    if ln == f64::NEG_INFINITY {
        return "0".into();
    }
    let l10 = ln / std::f64::consts::LN_10;
    let e = l10.floor();
    format!("{:.6}e{}", 10f64.powf(l10 - e), e as i64)
}

impl WrReport {
    /// Samples `points` energies evenly up to the cutoff of `harmonic` (the
    /// modes' exact counts) and compares there.
    pub fn new(harmonic: &StateCounts, unit: &str, points: usize) -> Result<Self> {
        if points == 0 {
            return Err(Error::invalid(
                "--wr",
                0,
                "give at least one energy to compare at",
            ));
        }
        let g = harmonic.grain.to_f64().unwrap_or(1.0);
        let freqs: Vec<f64> = harmonic
            .rounded
            .iter()
            .flat_map(|(w, d)| std::iter::repeat_n(*w as f64 * g, *d as usize))
            .collect();
        let ez = 0.5 * freqs.iter().sum::<f64>();
        let lowest = harmonic.rounded.iter().map(|(w, _)| *w).min().unwrap_or(1);
        let window = lowest.max(1) as usize;
        let sums = harmonic.sums();
        let top = sums.len() - 1;
        let mut rows = Vec::with_capacity(points);
        // Sample where the whole density window fits under the cutoff.
        let half = window / 2;
        let span = top.saturating_sub(half);
        for i in 1..=points {
            let k = span * i / points;
            if k == 0 {
                continue;
            }
            let e = k as f64 * g;
            let (lw, lr, ok) = whitten_rabinovitch(&freqs, e);
            let lo = k.saturating_sub(half + window % 2);
            let hi = (k + half).min(top);
            let in_window = &sums[hi] - &sums[lo];
            let lre = ln_big(&in_window) - ((hi - lo) as f64 * g).ln();
            let lwe = ln_big(&sums[k]);
            let energy = &harmonic.grain * BigRational::from_integer(k.into());
            rows.push(WrRow {
                energy: exact_decimal(&energy, 40),
                reduced: format!("{:.4}", e / ez),
                sum_exact: sums[k].to_string(),
                sum_wr: exp_text(lw),
                sum_error: rel_text(lw - lwe),
                density_exact: exp_text(lre),
                density_wr: exp_text(lr),
                density_error: rel_text(lr - lre),
                in_range: ok,
            });
        }
        let zp = BigRational::from_integer(
            harmonic
                .rounded
                .iter()
                .map(|(w, d)| BigUint::from(*w) * BigUint::from(*d))
                .sum::<BigUint>()
                .into(),
        ) * &harmonic.grain
            / BigRational::from_integer(2.into());
        Ok(WrReport {
            unit: unit.to_string(),
            grain: exact_decimal(&harmonic.grain, 40),
            rounded_modes: harmonic.rounded.clone(),
            zero_point: format_sig(&zp, 12),
            window: exact_decimal(
                &(&harmonic.grain * BigRational::from_integer(window.into())),
                40,
            ),
            rows,
        })
    }
}

impl Tabular for WrReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "Whitten–Rabinovitch against the exact Beyer–Swinehart count, grain {} {}, \
                 E_z = {} {}; modes in grains (degeneracy): {}",
                self.grain,
                self.unit,
                self.zero_point,
                self.unit,
                super::modes_text(&self.rounded_modes)
            ),
            format!(
                "W = states up to E; rho exact = states within a window of {} {} around E, per {}; \
                 err = WR/exact − 1; * = E/E_z outside 0.1–8 (extrapolated)",
                self.window, self.unit, self.unit
            ),
        ]
    }
    fn columns(&self) -> Vec<crate::export::Column> {
        use crate::export::Column;
        let per = format!("1/{}", self.unit);
        vec![
            Column::with_unit("E", &self.unit),
            Column::plain("E/E_z"),
            Column::plain("W exact"),
            Column::plain("W WR"),
            Column::plain("err W"),
            Column::with_unit("rho exact", &per),
            Column::with_unit("rho WR", &per),
            Column::plain("err rho"),
        ]
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.energy.clone(),
                    format!("{}{}", r.reduced, if r.in_range { "" } else { "*" }),
                    r.sum_exact.clone(),
                    r.sum_wr.clone(),
                    r.sum_error.clone(),
                    r.density_exact.clone(),
                    r.density_wr.clone(),
                    r.density_error.clone(),
                ]
            })
            .collect()
    }
}
