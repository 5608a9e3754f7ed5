//! Canonical partition functions Q_N of N ideal particles in one
//! single-particle spectrum, exactly, and their comparison with the
//! Boltzmann-counted q^N/N! and the labelled q^N.
//!
//! For bosons (+) and fermions (−) the recursion over the cycle structure of
//! permutations (standard result)
//!
//! ```text
//! Q_0 = 1,   Q_N = (1/N) Σ_{k=1}^{N} (±1)^{k+1} q(kβ) Q_{N−k}
//! ```
//!
//! gives Q_N from the one-particle sums q(kβ), which the engine computes
//! with rigorous bounds. The recursion is carried in ball arithmetic (each
//! value with a bound on its error, rounded outward) on second-order jets
//! in β (value, β·d/dβ, β²·d²/dβ²), so U/kT = −β Q'/Q and
//! Cv/k = β² (Q''/Q − (Q'/Q)²) come with bounds too. Energies are measured
//! from N·ε₀ inside the recursion, so nothing overflows.
//!
//! The fermion sum alternates and cancels: when the bound on a result is
//! too wide for the requested digits, the whole computation is repeated
//! with the working precision raised by the bits the cancellation cost
//! (Ziv's strategy); the precision used and the bits lost are reported.

use super::collection::{check_particles, lowest_filling, Statistics};
use crate::classical::bisect;
use crate::error::{Error, Result};
use crate::spectrum::Spectrum;
use crate::sum::ball::{mag, up_add, up_mul, Ball, RP};
use crate::sum::{ball_decimal, precision_for, stats_of, to_rug, Certified, Stats, Temperature};
use num_rational::BigRational;
use num_traits::ToPrimitive;
use rug::Float;

/// The most bits the fermion recursion may cancel before it is refused.
const MAX_LOST_BITS: u32 = 8192;

/// f, β f' and β² f'' of a function of β.
#[derive(Debug, Clone)]
struct Jet([Ball; 3]);

impl Jet {
    fn mul(&self, o: &Jet) -> Jet {
        let [a0, a1, a2] = &self.0;
        let [b0, b1, b2] = &o.0;
        let two = Ball::exact(Float::with_val(RP, 2));
        Jet([
            a0.mul(b0),
            a1.mul(b0).add(&a0.mul(b1)),
            a2.mul(b0).add(&two.mul(&a1.mul(b1))).add(&a0.mul(b2)),
        ])
    }

    fn add(&self, o: &Jet) -> Jet {
        Jet([
            self.0[0].add(&o.0[0]),
            self.0[1].add(&o.0[1]),
            self.0[2].add(&o.0[2]),
        ])
    }

    fn neg(&self) -> Jet {
        Jet([self.0[0].neg(), self.0[1].neg(), self.0[2].neg()])
    }

    fn div_int(&self, n: u64) -> Jet {
        Jet([
            self.0[0].div_int(n),
            self.0[1].div_int(n),
            self.0[2].div_int(n),
        ])
    }
}

/// The canonical N-particle results at one temperature, in floating point
/// with error bounds, before printing.
#[derive(Debug, Clone)]
pub(crate) struct Canonical {
    /// ln Q_N, U/kT, Cv/k of the N-particle system.
    pub ln_q: Ball,
    pub u: Ball,
    pub cv: Ball,
    /// One-particle ln q, U/kT, Cv/k at β.
    pub one: Stats,
    /// Working precision (bits) and bits lost to cancellation.
    pub prec: u32,
    pub lost_bits: u32,
}

/// The one-particle jet q̃(kβ) (energies from ε₀) with its bounds: q̃ is
/// q' = e^{ln q'} itself, and Ũ/kT the mean excitation.
fn one_particle_jet(st: &Stats) -> Option<Jet> {
    let q = st.ln_qx.exp()?;
    let u = &st.mu;
    let d = q.mul(u).neg();
    let dd = q.mul(&u.mul(u).add(&st.cv));
    Some(Jet([q, d, dd]))
}

/// Q_N and its derivatives at 1/kT = `beta` (in the spectrum's unit).
pub(crate) fn canonical_at(
    spectrum: &dyn Spectrum,
    n: u64,
    stats: Statistics,
    beta: &BigRational,
    digits: u32,
) -> Result<Canonical> {
    check_particles(n)?;
    let e0 = spectrum.ground_energy();
    if stats == Statistics::Distinct {
        // Q = q^N exactly: ln Q = N ln q, and so on.
        let prec = precision_for(digits);
        let one = stats_of(spectrum, beta, prec)?;
        return Ok(Canonical {
            ln_q: one.ln_q().mul_int(n),
            u: one.u().mul_int(n),
            cv: one.cv.mul_int(n),
            one,
            prec,
            lost_bits: 0,
        });
    }
    if let (Statistics::Fermi, Some(top)) = (stats, spectrum.highest_energy()) {
        let states = spectrum
            .levels_within(&top, &crate::spectrum::Budget::default())?
            .total_states();
        if states < n.into() {
            return Err(Error::invalid(
                "particle number",
                n,
                &format!(
                    "{n} fermions cannot share the {states} orbitals of this finite spectrum \
                     (Q_N = 0); give at most {states}"
                ),
            ));
        }
    }
    let mut lost = 0u32;
    let mut last = None;
    let mut estimate: Option<u32> = None;
    for attempt in 0..12u32 {
        // Each q(kβ) must carry the cancellation's loss too.
        if lost > MAX_LOST_BITS {
            break;
        }
        let prec = precision_for(digits) + 32 * attempt.min(3) + lost;
        let one = stats_of(spectrum, beta, prec)?;
        let base_shift = beta * &e0 * BigRational::from_integer(n.into()); // Nβε₀
        let mut qs: Vec<Jet> = Vec::with_capacity(n as usize);
        let jet_of = |st: &Stats| {
            one_particle_jet(st).ok_or_else(|| {
                Error::invalid(
                    "spectrum",
                    spectrum.describe(),
                    "its sums could not be bounded",
                )
            })
        };
        qs.push(jet_of(&one)?);
        for k in 2..=n {
            let kb = beta * BigRational::from_integer(k.into());
            let st = stats_of(spectrum, &kb, prec)?;
            qs.push(jet_of(&st)?);
        }
        let (q_n, lost_now) = recursion(&qs, stats, prec);
        let [v, d1, d2] = q_n.0;
        let shift = Float::with_val(prec, to_rug(&base_shift));
        let shift_b = Ball::rounded(shift, Float::new(RP));
        let ok = (|| {
            let ln_qt = v.ln()?;
            let m1 = d1.div(&v)?;
            let m2 = d2.div(&v)?;
            let ln_q = ln_qt.add(&shift_b.neg());
            let u = m1.neg().add(&shift_b);
            let cv = m2.add(&m1.mul(&m1).neg());
            Some((ln_q, u, cv))
        })();
        let target = 10f64.powi(-(digits as i32) - 2);
        let settled = ok.is_some();
        if let Some((ln_q, u, cv)) = ok {
            let good = b_ok(&ln_q, target) && b_ok(&u, target) && b_ok(&cv, target);
            let out = Canonical {
                ln_q,
                u,
                cv,
                one,
                prec,
                lost_bits: lost_now,
            };
            if good {
                return Ok(out);
            }
            last = Some(out);
        }
        // A result lost in the cancellation says little about how much was
        // lost: then take the a-priori estimate, and grow it if need be.
        lost = if settled {
            lost.max(lost_now) + 32
        } else {
            if estimate.is_none() && stats == Statistics::Fermi {
                estimate = Some(fermi_loss_estimate(spectrum, n, beta, &qs, prec)?);
            }
            let est = estimate.unwrap_or(0);
            if lost >= est {
                lost * 2 + 32
            } else {
                est + 32
            }
        };
    }
    last.ok_or_else(|| {
        Error::invalid(
            "temperature",
            format!(
                "kT = {} {}",
                crate::exact::format_sig(&beta.recip(), 6),
                spectrum.unit()
            ),
            &format!(
                "the fermion recursion for {n} particles cancels about {} bits here (Q_N is \
                 that much smaller than the terms that sum to it), beyond the {MAX_LOST_BITS} bits \
                 this command spends on it; give fewer particles or a \
                 higher temperature",
                estimate.unwrap_or(lost).max(lost)
            ),
        )
    })
}

/// Bits the fermion recursion may cancel, from above: its terms sum in
/// magnitude to at most n·Q_n(bose) (the boson recursion has the same terms
/// with one sign, and each fermion count is at most the boson count), and
/// Q_N(fermi) is at least the Boltzmann factor of the lowest filling, so
/// the loss is at most log₂(N·Q_N(bose)) + βΔE_F/ln 2, ΔE_F the lowest
/// filling's energy above N·ε₀.
fn fermi_loss_estimate(
    spectrum: &dyn Spectrum,
    n: u64,
    beta: &BigRational,
    qs: &[Jet],
    prec: u32,
) -> Result<u32> {
    let (bose, _) = recursion(qs, Statistics::Bose, prec);
    let ln2 = std::f64::consts::LN_2;
    let log2_bose = bose.0[0].c.clone().log2().to_f64().max(0.0);
    // List levels until they hold N orbitals.
    let e0 = spectrum.ground_energy();
    let mut span = BigRational::from_integer(1.into());
    let budget = crate::spectrum::Budget::default();
    let levels = loop {
        let list = spectrum.levels_within(&(&e0 + &span), &budget)?;
        let cut = &e0 + &span;
        if list.total_states() >= n.into() || spectrum.highest_energy().is_some_and(|h| h <= cut) {
            break list;
        }
        span = &span * BigRational::from_integer(4.into());
    };
    let fill = lowest_filling(levels.iter().map(|l| (&l.energy - &e0, &l.degeneracy)), n)
        .unwrap_or_default();
    let x = (beta * fill).to_f64().unwrap_or(f64::MAX);
    Ok(((n as f64).log2() + log2_bose + x / ln2 + 16.0).min(1e6) as u32)
}

fn b_ok(b: &Ball, target: f64) -> bool {
    b.err() < target * b.c.to_f64().abs().max(1.0)
}

/// Runs the recursion on the one-particle jets q̃(kβ), k = 1..=N; returns
/// Q̃_N and the bits lost to cancellation (largest over n of
/// log₂(Σ|terms| / |Q̃_n|)).
fn recursion(qs: &[Jet], stats: Statistics, prec: u32) -> (Jet, u32) {
    let one = Jet([
        Ball::exact(Float::with_val(prec, 1)),
        Ball::exact(Float::new(prec)),
        Ball::exact(Float::new(prec)),
    ]);
    let mut q: Vec<Jet> = vec![one];
    let mut lost = 0f64;
    for m in 1..=qs.len() {
        let mut acc: Option<Jet> = None;
        let mut abs_sum = Float::new(RP);
        for k in 1..=m {
            let t = qs[k - 1].mul(&q[m - k]);
            abs_sum = up_add(&abs_sum, &mag(&t.0[0].c));
            let t = if stats == Statistics::Fermi && k % 2 == 0 {
                t.neg()
            } else {
                t
            };
            acc = Some(match acc {
                None => t,
                Some(a) => a.add(&t),
            });
        }
        let next = acc.expect("m ≥ 1 terms").div_int(m as u64);
        let v = next.0[0].c.to_f64().abs() * m as f64;
        if v > 0.0 {
            let l = (abs_sum.to_f64() / v).log2();
            if l.is_finite() {
                lost = lost.max(l);
            }
        } else if !abs_sum.is_zero() {
            lost = lost.max(prec as f64);
        }
        q.push(next);
    }
    (q.pop().expect("Q_N"), lost.ceil().max(0.0) as u32)
}

/// The N-particle functions at one temperature, with the Boltzmann and
/// labelled approximations and their errors: certified balls where the
/// value is exact statistics, MPFR numbers at the working precision
/// (centres only, not certified) for the errors of the approximations.
#[derive(Debug, Clone)]
pub struct EnsembleValues {
    /// The temperature.
    pub temperature: Temperature,
    /// ln Q_N, exact statistics.
    pub ln_q: Certified,
    /// U/kT of the N particles.
    pub u_over_kt: Certified,
    /// Cv/k of the N particles.
    pub cv_over_k: Certified,
    /// S/k of the N particles.
    pub s_over_k: Certified,
    /// ln(q^N/N!), the Boltzmann count.
    pub ln_q_boltzmann: Certified,
    /// ln(q^N), the labelled count.
    pub ln_q_labelled: Certified,
    /// (q^N/N!)/Q_N − 1 (not certified; NaN where undefined).
    pub boltzmann_error_q: Float,
    /// Relative error of U from q^N/N! (or q^N: the same); not certified.
    pub boltzmann_error_u: Float,
    /// Relative error of Cv from q^N/N! (or q^N: the same); not certified.
    pub boltzmann_error_cv: Float,
    /// S/k from q^N/N! minus the exact S/k; not certified.
    pub boltzmann_error_s: Float,
    /// q^N/Q_N − 1; not certified.
    pub labelled_error_q: Float,
    /// The significant digits asked for.
    pub digits: u32,
    /// Working precision, bits.
    pub precision_bits: u32,
    /// Bits the alternating fermion sum cancelled.
    pub cancelled_bits: u32,
    /// Whether ln Q, U/kT, Cv/k and S/k are proved to `digits` digits.
    pub certified: bool,
}

/// Q_N, U, Cv and S of `n` particles of `stats` in `spectrum` at
/// `temperature`, to `digits` certified digits, with the errors of q^N/N!
/// and q^N.
///
/// ```
/// use zsum::microstates::{ensemble_point, Statistics};
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::exact::parse_rational;
/// use zsum::sum::Temperature;
/// use zsum::units::EnergyUnit;
/// // Two bosons in a harmonic trap: Q_2 = 1/((1 − x)(1 − x²)), x = e^{−1}.
/// let trap = HarmonicModes::one_d(parse_rational("1")?, false, EnergyUnit::Kelvin)?;
/// let p = ensemble_point(&trap, 2, Statistics::Bose, &Temperature::Kelvin(parse_rational("1")?), 12)?;
/// let x = (-1f64).exp();
/// let want = -((1.0 - x) * (1.0 - x * x)).ln();
/// assert!((p.ln_q.to_f64() - want).abs() < 1e-12);
/// assert!(p.certified && p.ln_q.radius().to_f64() < 1e-13);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn ensemble_point(
    spectrum: &dyn Spectrum,
    n: u64,
    stats: Statistics,
    temperature: &Temperature,
    digits: u32,
) -> Result<EnsembleValues> {
    if !(1..=60).contains(&digits) {
        return Err(Error::invalid(
            "digits",
            digits,
            "choose between 1 and 60 significant digits",
        ));
    }
    let beta = temperature.beta(&spectrum.unit())?;
    let c = canonical_at(spectrum, n, stats, &beta, digits)?;
    Ok(values_of(&c, n, temperature.clone(), digits))
}

/// ln(q^N), the labelled count, as a ball at the working precision.
fn ln_labelled(c: &Canonical, n: u64) -> Ball {
    let ln_q = c.one.ln_q();
    let r = up_mul(&ln_q.r, &Float::with_val(RP, n));
    Ball::rounded(Float::with_val(c.prec, &ln_q.c * n), r)
}

/// ln(q^N/N!), the Boltzmann count, as a ball at the working precision.
fn ln_boltzmann(c: &Canonical, n: u64) -> Ball {
    let p = c.prec;
    let ln_fact = Float::with_val(p, Float::with_val(p, n + 1).ln_gamma_ref());
    ln_labelled(c, n).sub(&Ball::rounded(ln_fact, Float::new(RP)))
}

/// ln(q^N/N!) − ln Q_N: the log of the Boltzmann count's ratio to the exact.
pub(crate) fn boltzmann_log_ratio(c: &Canonical, n: u64) -> Float {
    Float::with_val(c.prec, &ln_boltzmann(c, n).c - &c.ln_q.c)
}

/// The values of a canonical result at `temperature`.
pub(crate) fn values_of(
    c: &Canonical,
    n: u64,
    temperature: Temperature,
    digits: u32,
) -> EnsembleValues {
    let p = c.prec;
    let s = c.ln_q.add(&c.u);
    let certified = [&c.ln_q, &c.u, &c.cv, &s]
        .iter()
        .all(|b| ball_decimal(b, digits).1);
    let ln_lab = ln_labelled(c, n);
    let ln_b = ln_boltzmann(c, n);
    let nf = Float::with_val(p, n);
    let u_b = Float::with_val(p, &c.one.u().c * &nf);
    let cv_b = Float::with_val(p, &c.one.cv.c * &nf);
    let rel = |a: &Float, b: &Float| -> Float {
        if b.is_zero() {
            Float::with_val(p, f64::NAN)
        } else {
            Float::with_val(p, Float::with_val(p, a - b) / b)
        }
    };
    let ratm1 =
        |ln_a: &Float| Float::with_val(p, Float::with_val(p, ln_a - &c.ln_q.c).exp_m1_ref());
    let s_b = Float::with_val(p, &ln_b.c + &u_b);
    EnsembleValues {
        temperature,
        boltzmann_error_q: ratm1(&ln_b.c),
        boltzmann_error_u: rel(&u_b, &c.u.c),
        boltzmann_error_cv: rel(&cv_b, &c.cv.c),
        boltzmann_error_s: Float::with_val(p, &s_b - &s.c),
        labelled_error_q: ratm1(&ln_lab.c),
        ln_q: Certified(c.ln_q.clone()),
        u_over_kt: Certified(c.u.clone()),
        cv_over_k: Certified(c.cv.clone()),
        s_over_k: Certified(s),
        ln_q_boltzmann: Certified(ln_b),
        ln_q_labelled: Certified(ln_lab),
        digits,
        precision_bits: p,
        cancelled_bits: c.lost_bits,
        certified,
    }
}

/// A temperature where the Boltzmann count q^N/N! crosses the tolerance.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Crossing {
    /// The temperature (kelvin, or kT in the spectrum's unit, as the grid
    /// is), located to 4 significant digits: the end of the final bracket
    /// on the side of the first temperature given (the colder).
    pub temperature: BigRational,
    /// Whether the error exceeds the tolerance below this temperature.
    pub exceeds_below: bool,
}

/// Q_N over a temperature grid, with where q^N/N! fails.
#[derive(Debug, Clone)]
pub struct EnsembleSweep {
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// Whether the grid is of temperatures in kelvin (else of kT in the
    /// spectrum's unit).
    pub kelvin: bool,
    /// The tolerance on the relative error of q^N/N! in Q.
    pub tolerance: BigRational,
    /// One point per temperature, in the order given.
    pub points: Vec<EnsembleValues>,
    /// Where |q^N/N! / Q − 1| crosses the tolerance, coldest first.
    pub crossings: Vec<Crossing>,
}

/// Q_N of `n` particles of `stats` at every temperature of `grid` (kelvin
/// if `kelvin`, else kT in the spectrum's unit), to `digits` digits, and
/// the temperatures where q^N/N! crosses `tol` (relative error in Q). The
/// temperatures are timed by `meter` (hottest, costliest, first), which
/// refuses the rest once their projected time exceeds its budget.
///
/// ```
/// use zsum::budget::Meter;
/// use zsum::microstates::{ensemble_sweep, Statistics};
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// let trap = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
/// let e = ensemble_sweep(&trap, 10, Statistics::Bose, &[r("1"), r("100"), r("10000")],
///     true, 8, &r("0.01"), &Meter::unlimited())?;
/// assert_eq!(e.points.len(), 3);
/// // q^N/N! errs by about N(N − 1)/(4T) here, so by more than 1% below
/// // roughly 2250 K.
/// assert_eq!(e.crossings.len(), 1);
/// assert!(e.crossings[0].exceeds_below);
/// assert!(r("2000") < e.crossings[0].temperature && e.crossings[0].temperature < r("2500"));
/// # Ok::<(), zsum::Error>(())
/// ```
#[allow(clippy::too_many_arguments)]
pub fn ensemble_sweep(
    spectrum: &dyn Spectrum,
    n: u64,
    stats: Statistics,
    grid: &[BigRational],
    kelvin: bool,
    digits: u32,
    tol: &BigRational,
    meter: &crate::budget::Meter,
) -> Result<EnsembleSweep> {
    let temp = |t: &BigRational| {
        if kelvin {
            Temperature::Kelvin(t.clone())
        } else {
            Temperature::ThermalEnergy(t.clone())
        }
    };
    let tol_f = Float::with_val(64, to_rug(tol));
    let exceeds = |c: &Canonical| -> bool {
        let e = Float::with_val(c.prec, boltzmann_log_ratio(c, n).exp_m1_ref());
        *e.as_abs() > tol_f
    };
    let cached = crate::sum::Cached::new(spectrum);
    // Memory: the recursion keeps Q_0..Q_N as balls on jets (under a
    // kilobyte each at the working precision) and the answer a row per
    // temperature (about a kilobyte of numbers, six balls and five MPFR
    // values, and half a kilobyte of text).
    crate::spectrum::Budget::default().check(
        format!("Q_N of {n} particles over {} temperatures", grid.len()),
        n as f64 * 1024.0 + grid.len() as f64 * 1536.0,
        "give fewer temperatures or particles",
    )?;
    // Hottest first: the costliest temperature is timed first.
    let mut order: Vec<usize> = (0..grid.len()).collect();
    order.sort_by(|&a, &b| grid[b].cmp(&grid[a]));
    let mut slots = vec![None; grid.len()];
    let mut states = Vec::with_capacity(grid.len());
    for (count, &i) in order.iter().enumerate() {
        let t = &grid[i];
        let beta = temp(t).beta(&spectrum.unit())?;
        let c = canonical_at(&cached, n, stats, &beta, digits)?;
        states.push((t.clone(), exceeds(&c)));
        slots[i] = Some(values_of(&c, n, temp(t), digits));
        meter.at(count as f64 + 1.0)?;
    }
    let points: Vec<EnsembleValues> = slots.into_iter().flatten().collect();
    let mut sorted = states;
    sorted.sort_by(|a, b| a.0.cmp(&b.0));
    sorted.dedup_by(|a, b| a.0 == b.0);
    let mut crossings = Vec::new();
    for w in sorted.windows(2) {
        if w[0].1 == w[1].1 {
            continue;
        }
        let x = bisect(
            w[0].0.clone(),
            w[1].0.clone(),
            w[0].1,
            |x| super::round_sig(x, 4),
            |mid| {
                let beta = temp(mid).beta(&spectrum.unit())?;
                Ok(exceeds(&canonical_at(&cached, n, stats, &beta, 8)?))
            },
        )?;
        crossings.push(Crossing {
            temperature: x,
            exceeds_below: w[0].1,
        });
    }
    Ok(EnsembleSweep {
        statistics: stats,
        particles: n,
        kelvin,
        tolerance: tol.clone(),
        points,
        crossings,
    })
}
