//! The microcanonical answer of `zsum microstates` as numbers: for every
//! total energy with states, the exact count Ω(E, N), S/k = ln Ω as a
//! certified ball, the temperature from the discrete derivative of ln Ω,
//! and at a few energies the canonical ensemble at that temperature. The
//! printed table is made in `report/` (above this module).

use super::collection::{Omega, Statistics};
use super::ensemble::canonical_at;
use crate::error::Result;
use crate::spectrum::Spectrum;
use crate::sum::{rational_ball, Certified};
use crate::units::EnergyUnit;
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::Zero;
use rug::Float;

/// Working precision of the microcanonical logarithms, bits.
const PREC: u32 = 192;

/// Significant digits to which the temperature of a canonical comparison
/// is rounded before the canonical ensemble is computed there exactly.
pub const COMPARISON_DIGITS: u32 = 12;

/// The canonical ensemble at the temperature of one energy.
#[derive(Debug, Clone)]
pub struct CanonicalComparison {
    /// The exact 1/kT compared at, in the inverse energy unit: the
    /// microcanonical 1/kT rounded to [`COMPARISON_DIGITS`] significant
    /// digits.
    pub beta: BigRational,
    /// The canonical mean energy U of the N particles at that temperature,
    /// in the energy unit (the centre is computed to the digits asked for).
    pub u: Certified,
    /// The canonical S/k of the N particles at that temperature.
    pub s_over_k: Certified,
}

/// One total energy with states.
#[derive(Debug, Clone)]
pub struct MicroEnergy {
    /// Total energy above N·ε₀ in grid steps (the energy is
    /// [`Omega::energy`] of it, Ω the count there).
    pub steps: u64,
    /// S/k = ln Ω at 192 bits, with its rounding bound.
    pub s_over_k: Certified,
    /// kT from the discrete derivative of ln Ω (central between the
    /// neighbouring energies with states; one-sided at the ends), in the
    /// energy unit, at 192 bits: a finite-difference estimate of the
    /// temperature, not certified. +∞ where ln Ω is flat; `None` with no
    /// neighbour.
    pub kt: Option<Float>,
    /// At the energies compared: the canonical ensemble at that
    /// temperature.
    pub canonical: Option<Box<CanonicalComparison>>,
}

/// Ω(E, N), S = k ln Ω and the microcanonical temperature at every total
/// energy with states, compared with the canonical ensemble.
#[derive(Debug, Clone)]
pub struct Microcanonical {
    /// The counts and the grid they lie on.
    pub omega: Omega,
    /// The highest total energy counted.
    pub up_to: BigRational,
    /// One entry per energy with states (Ω > 0), lowest first.
    pub rows: Vec<MicroEnergy>,
}

impl Microcanonical {
    /// The statistics.
    pub fn statistics(&self) -> Statistics {
        self.omega.statistics
    }

    /// The number of particles.
    pub fn particles(&self) -> u64 {
        self.omega.particles
    }

    /// The energy unit.
    pub fn unit(&self) -> &EnergyUnit {
        &self.omega.grid.unit
    }

    /// The total energy of `row`, exactly.
    pub fn energy(&self, row: &MicroEnergy) -> BigRational {
        self.omega.energy(row.steps as usize)
    }

    /// Ω at `row`, exactly.
    pub fn count(&self, row: &MicroEnergy) -> &BigUint {
        &self.omega.counts[row.steps as usize]
    }
}

/// The microcanonical answer for `omega` (counted in `spectrum` up to
/// `up_to`), with the canonical comparison at `compare` energies spread
/// over those with a positive temperature, computed to `digits` digits.
///
/// ```
/// use zsum::microstates::{microcanonical, microstates, Statistics};
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::exact::parse_rational;
/// use zsum::spectrum::Budget;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // 3 oscillators sharing up to 6 quanta: Ω(q) = C(q + 2, 2).
/// let osc = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
/// let o = microstates(&osc, 3, Statistics::Distinct, &r("7.5"), None, &Budget::default())?;
/// let m = microcanonical(&osc, o, &r("7.5"), 1, 10)?;
/// let row = &m.rows[4];
/// assert_eq!(*m.count(row), 15u32.into());
/// assert!((row.s_over_k.to_f64() - 15f64.ln()).abs() < 1e-15);
/// // kT from the central difference: 2/(ln Ω(5) − ln Ω(3)) = 2/ln(21/10).
/// let kt = row.kt.as_ref().unwrap().to_f64();
/// assert!((kt - 2.0 / (21.0f64 / 10.0).ln()).abs() < 1e-12);
/// assert_eq!(m.rows.iter().filter(|r| r.canonical.is_some()).count(), 1);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn microcanonical(
    spectrum: &dyn Spectrum,
    omega: Omega,
    up_to: &BigRational,
    compare: usize,
    digits: u32,
) -> Result<Microcanonical> {
    let nz: Vec<usize> = (0..omega.counts.len())
        .filter(|&k| !omega.counts[k].is_zero())
        .collect();
    let logs: Vec<Certified> = nz
        .iter()
        .map(|&k| {
            let ball = super::biguint_ball(&omega.counts[k], PREC)
                .ln()
                .expect("a count of 1 or more has a logarithm");
            Certified(ball)
        })
        .collect();
    let step = Float::with_val(PREC, crate::sum::to_rug(&omega.grid.step));
    // 1/kT by the discrete derivative of ln Ω.
    let beta: Vec<Option<Float>> = (0..nz.len())
        .map(|i| {
            let (a, b) = match (i.checked_sub(1), nz.get(i + 1)) {
                (Some(a), Some(_)) => (a, i + 1),
                (None, Some(_)) => (i, i + 1),
                (Some(a), None) => (a, i),
                (None, None) => return None,
            };
            let de = Float::with_val(PREC, &step * (nz[b] - nz[a]) as u64);
            Some(Float::with_val(
                PREC,
                Float::with_val(PREC, logs[b].value() - logs[a].value()) / de,
            ))
        })
        .collect();
    let positive: Vec<usize> = (0..nz.len())
        .filter(|&i| {
            beta[i]
                .as_ref()
                .is_some_and(|b| b.is_sign_positive() && !b.is_zero())
        })
        .collect();
    let chosen: Vec<usize> = match (compare, positive.len()) {
        (0, _) | (_, 0) => Vec::new(),
        (1, _) => vec![positive[positive.len() / 2]],
        (c, m) => {
            let mut v: Vec<usize> = (0..c.min(m))
                .map(|j| positive[j * (m - 1) / (c.min(m) - 1).max(1)])
                .collect();
            v.dedup();
            v
        }
    };
    let mut rows = Vec::with_capacity(nz.len());
    for ((i, &k), s_over_k) in nz.iter().enumerate().zip(logs) {
        let kt = beta[i]
            .as_ref()
            .map(|b| Float::with_val(PREC, b.recip_ref()));
        let mut canonical = None;
        if chosen.contains(&i) {
            let b = beta[i].as_ref().expect("chosen rows have a temperature");
            let b_exact = super::float_rational(b)
                .map(|b| super::round_sig(&b, COMPARISON_DIGITS))
                .expect("chosen temperatures are finite");
            let c = canonical_at(
                spectrum,
                omega.particles,
                omega.statistics,
                &b_exact,
                digits,
            )?;
            let kt_exact = rational_ball(&b_exact.recip(), c.prec);
            canonical = Some(Box::new(CanonicalComparison {
                u: Certified(c.u.mul(&kt_exact)),
                s_over_k: Certified(c.ln_q.add(&c.u)),
                beta: b_exact,
            }));
        }
        rows.push(MicroEnergy {
            steps: k as u64,
            s_over_k,
            kt,
            canonical,
        });
    }
    Ok(Microcanonical {
        omega,
        up_to: up_to.clone(),
        rows,
    })
}
