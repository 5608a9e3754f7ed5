//! The Einstein solid's table (`zsum microstates --einstein`) as numbers: N
//! labelled oscillators of one quantum ħω sharing q quanta,
//! Ω(q) = C(q + N − 1, q) exactly, with the microcanonical temperature from
//! the exact derivative of ln Ω and the canonical ensemble at that
//! temperature, every value a certified ball. The printed table is made in
//! `report/` (above this module).
//!
//! # The temperature
//! ln Ω(q) = ln Γ(q + N) − ln Γ(q + 1) − ln Γ(N) continues the exact count
//! to every real q ≥ 0, so
//!
//! ```text
//! βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1)
//! ```
//!
//! with ψ the digamma function: the derivative of the exact count itself, no
//! finite difference. For whole q it is also the rational
//! Σ_{k=q+1}^{q+N−1} 1/k (standard result: ψ(n + 1) = H_n − γ), and
//! ln((q + N)/q), the derivative of Stirling's form, is its limit for large
//! q and N.
//!
//! # The canonical comparison
//! N oscillators at x = βħω, energies counted from the ground as Ω counts
//! them (standard results):
//!
//! ```text
//! U/ħω = N/(e^x − 1)                          (mean number of quanta)
//! S/k  = βU + ln Q = x(U/ħω + N) − N ln(e^x − 1),   ln Q = −N ln(1 − e^−x)
//! ```
//!
//! # Certified digits
//! Every value is a ball: MPFR's digamma, exp and ln are correctly rounded,
//! and each rounding enters the radius. A value is printed only when both
//! ends of its ball round to the same digits; otherwise the whole row is
//! computed again at a higher precision (Ziv's strategy). βħω and kT/ħω are
//! rational for whole q, so one of them can sit exactly halfway between two
//! roundings (1/4 to one digit); after two tries they are taken from the
//! exact rational sum instead, which the row then carries
//! ([`EinsteinState::beta_hw_exact`]).

use super::{biguint_ball, einstein_omega, ln_factorial};
use crate::error::{Error, Result};
use crate::exact::check_digits;
use crate::spectrum::Budget;
use crate::sum::ball::Ball;
use crate::sum::{ball_decimal, precision_for, rational_ball, Certified};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};
use rug::Float;

/// The highest working precision a row may take, in bits; far beyond what
/// any row needs (the digamma difference cancels about log₂(q ln q) bits).
const MAX_PREC: u32 = 1 << 14;

/// The energy unit of the Einstein solid: its quantum ħω, with no value in
/// joules (energies are counted in quanta).
///
/// ```
/// assert_eq!(zsum::microstates::einstein_unit().symbol(), "ħω");
/// ```
pub fn einstein_unit() -> EnergyUnit {
    EnergyUnit::Natural {
        symbol: "ħω".into(),
        joules: None,
    }
}

/// One number of quanta of the Einstein solid.
#[derive(Debug, Clone)]
pub struct EinsteinState {
    /// The number of quanta q.
    pub quanta: u64,
    /// Ω(q) = C(q + N − 1, q), exact.
    pub omega: BigUint,
    /// S/k = ln Ω, certified to the table's digits.
    pub s_over_k: Certified,
    /// βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1), certified to the table's
    /// digits unless [`EinsteinState::beta_hw_exact`] is given; exactly 0
    /// for one oscillator.
    pub beta_hw: Certified,
    /// βħω as the exact rational Σ_{k=q+1}^{q+N−1} 1/k, given where βħω or
    /// kT/ħω lies exactly halfway between two roundings to the table's
    /// digits (the balls then hold it but cannot settle its rounding).
    pub beta_hw_exact: Option<BigRational>,
    /// kT/ħω = 1/(βħω), certified like βħω; `None` where the temperature is
    /// infinite (one oscillator).
    pub kt_over_hw: Option<Certified>,
    /// The canonical ensemble at that temperature; `None` where the
    /// temperature is infinite (one oscillator).
    pub canonical: Option<EinsteinCanonical>,
}

/// The Einstein solid by number of quanta.
#[derive(Debug, Clone)]
pub struct EinsteinTable {
    /// The number of oscillators N.
    pub oscillators: u64,
    /// The most quanta tabulated.
    pub quanta_up_to: u64,
    /// The significant digits every value but Ω is certified to.
    pub digits: u32,
    /// One row per q = 0, 1, ..., `quanta_up_to`.
    pub rows: Vec<EinsteinState>,
}

/// The canonical N-oscillator values at one temperature, each certified to
/// the digits asked for.
#[derive(Debug, Clone)]
pub struct EinsteinCanonical {
    /// The mean number of quanta U/ħω = N/(e^x − 1).
    pub u_over_hw: Certified,
    /// S/k = x(U/ħω + N) − N ln(e^x − 1).
    pub s_over_k: Certified,
}

/// U/ħω and S/k of `n` oscillators at x = βħω (a ball above zero).
fn canonical_balls(n: u64, x: &Ball) -> Option<(Ball, Ball)> {
    let p = x.prec();
    let em1 = x.exp()?.sub(&Ball::exact(Float::with_val(p, 1)));
    let nb = Ball::exact(Float::with_val(p, n));
    let u = nb.div(&em1)?;
    let s = x.mul(&u.add(&nb)).sub(&em1.ln()?.mul_int(n));
    Some((u, s))
}

/// Whether every value in `b` rounds alike to `digits` significant digits.
fn settles(b: &Ball, digits: u32) -> bool {
    ball_decimal(b, digits).1
}

/// The canonical ensemble of `n` oscillators at x = βħω = `beta_hw` (taken
/// as exact, above zero), each value certified to `digits` significant
/// digits.
///
/// ```
/// use rug::Float;
/// use zsum::microstates::einstein_canonical;
/// // At x = ln 2 each oscillator holds 1/(2 − 1) = 1 quantum on average,
/// // and S/k = N [2 ln 2 − 0] (standard results).
/// let x = Float::with_val(200, 2).ln();
/// let c = einstein_canonical(3, &x, 10)?;
/// assert_eq!(c.u_over_hw.decimal(10).unwrap(), "3.000000000");
/// assert!((c.s_over_k.to_f64() - 6.0 * 2f64.ln()).abs() < 1e-9);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn einstein_canonical(n: u64, beta_hw: &Float, digits: u32) -> Result<EinsteinCanonical> {
    let digits = check_digits(digits)?;
    if n == 0 || !beta_hw.is_finite() || *beta_hw <= 0 {
        return Err(Error::invalid(
            "βħω",
            format!("{} for {n} oscillators", beta_hw.to_f64()),
            "give at least one oscillator and a finite βħω above zero",
        ));
    }
    // Never below βħω's own precision, so that it stays exact.
    let cap = MAX_PREC.max(4 * beta_hw.prec());
    let mut prec = precision_for(digits).max(beta_hw.prec());
    while prec <= cap {
        let x = Ball::exact(Float::with_val(prec, beta_hw));
        if let Some((u, s)) = canonical_balls(n, &x) {
            if settles(&u, digits) && settles(&s, digits) {
                return Ok(EinsteinCanonical {
                    u_over_hw: Certified(u),
                    s_over_k: Certified(s),
                });
            }
        }
        prec *= 2;
    }
    Err(unsettled(
        &format!("the canonical ensemble at βħω = {}", beta_hw.to_f64()),
        digits,
        cap,
    ))
}

/// The refusal when the digits of `what` cannot be settled within `bits`
/// (not met in practice: every value but βħω and kT/ħω is irrational, and
/// those two fall back to the exact sum).
fn unsettled(what: &str, digits: u32, bits: u32) -> Error {
    Error::invalid(
        what,
        format!("to {digits} digits"),
        &format!(
            "its values could not be certified within {bits} bits of working precision; ask \
             for fewer digits"
        ),
    )
}

/// ψ(q + N) − ψ(q + 1) as a ball at `prec` bits.
fn digamma_difference(n: u64, q: u64, prec: u32) -> Ball {
    let psi = |z: u64| {
        let c = Float::with_val(prec, z).digamma();
        Ball::rounded(c, Float::new(crate::sum::ball::RP))
    };
    psi(q + n).sub(&psi(q + 1))
}

/// Σ_{k=q+1}^{q+N−1} 1/k, exactly.
fn harmonic_difference(n: u64, q: u64) -> BigRational {
    (q + 1..q + n).fold(BigRational::zero(), |acc, k| {
        acc + BigRational::new(BigInt::from(1), BigInt::from(k))
    })
}

/// One row: q quanta among `n ≥ 2` oscillators with `omega` ways.
fn row(n: u64, q: u64, omega: BigUint, digits: u32) -> Result<EinsteinState> {
    let mut prec = precision_for(digits) + 32;
    let mut exact: Option<BigRational> = None;
    for attempt in 0.. {
        let s = biguint_ball(&omega, prec).ln();
        let x = digamma_difference(n, q, prec);
        let one = Ball::exact(Float::with_val(prec, 1));
        let kt = one.div(&x);
        let can = canonical_balls(n, &x);
        let rate = match &exact {
            Some(h) => Some((rational_ball(h, prec), rational_ball(&h.recip(), prec))),
            None => kt
                .filter(|kt| settles(&x, digits) && settles(kt, digits))
                .map(|kt| (x, kt)),
        };
        let rest = s
            .zip(can)
            .filter(|(s, (u, sc))| settles(s, digits) && settles(u, digits) && settles(sc, digits));
        if let (Some((beta_hw, kt_over_hw)), Some((s, (u, sc)))) = (&rate, rest) {
            return Ok(EinsteinState {
                quanta: q,
                omega,
                s_over_k: Certified(s),
                beta_hw: Certified(beta_hw.clone()),
                beta_hw_exact: exact,
                kt_over_hw: Some(Certified(kt_over_hw.clone())),
                canonical: Some(EinsteinCanonical {
                    u_over_hw: Certified(u),
                    s_over_k: Certified(sc),
                }),
            });
        }
        if rate.is_none() && attempt >= 1 {
            // A rational value exactly halfway between two roundings never
            // settles in floating point: take it from the exact sum.
            exact = Some(harmonic_difference(n, q));
        }
        prec *= 2;
        if prec > MAX_PREC {
            break;
        }
    }
    Err(unsettled(
        &format!("the Einstein row q = {q}, N = {n}"),
        digits,
        MAX_PREC,
    ))
}

/// What one row's numbers take in memory besides Ω: five balls (centres of
/// `prec` bits and their radii, each with its bookkeeping) and the row's
/// fields.
fn row_number_bytes(prec: f64) -> f64 {
    5.0 * (2.0 * 32.0 + prec / 8.0 + 48.0) + 160.0
}

/// The Einstein solid of `n` oscillators (1 to 1000) for every number of
/// quanta from 0 up to `up_to` (rounded down), every value but Ω certified
/// to `digits` significant digits; refuses a table estimated beyond
/// `budget` (its numbers and the text a table of them is laid out in).
///
/// ```
/// use zsum::microstates::einstein_table;
/// use zsum::exact::parse_rational;
/// use zsum::spectrum::Budget;
/// // Three oscillators: Ω(4) = C(6, 4) = 15, and
/// // βħω = ψ(7) − ψ(5) = 1/5 + 1/6 = 11/30 exactly.
/// let t = einstein_table(3, &parse_rational("4")?, 10, &Budget::default())?;
/// let r = &t.rows[4];
/// assert_eq!((r.quanta, r.omega.clone()), (4, 15u32.into()));
/// assert_eq!(r.beta_hw.decimal(10).unwrap(), "0.3666666667");
/// let kt = r.kt_over_hw.as_ref().unwrap();
/// assert!((kt.to_f64() - 30.0 / 11.0).abs() < 1e-12);
/// let u = r.canonical.as_ref().unwrap().u_over_hw.to_f64();
/// assert!((u - 3.0 / ((11.0f64 / 30.0).exp() - 1.0)).abs() < 1e-9);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn einstein_table(
    n: u64,
    up_to: &BigRational,
    digits: u32,
    budget: &Budget,
) -> Result<EinsteinTable> {
    let digits = check_digits(digits)?;
    super::check_particles(n)?;
    let quanta = if up_to.is_negative() {
        None
    } else {
        up_to.floor().to_integer().to_u64()
    };
    let quanta = quanta.ok_or_else(|| {
        Error::invalid(
            "number of quanta",
            crate::exact::rational_string(up_to),
            "an Einstein solid needs a number of quanta of zero or more",
        )
    })?;
    // Each row holds Ω and five balls, and its Ω and six values as text,
    // laid out again as table cells and once more in the output.
    let rows = quanta as f64 + 1.0;
    let nf = n as f64;
    let q = quanta as f64;
    let omega_digits = (ln_factorial(q + nf - 1.0) - ln_factorial(q) - ln_factorial(nf - 1.0))
        / std::f64::consts::LN_10
        + 1.0;
    let prec = f64::from(precision_for(digits) + 32);
    let what = format!("the Einstein table of {rows} rows");
    budget.check(
        &what,
        rows * (3.0 * (omega_digits + 6.0 * (digits as f64 + 8.0) + 100.0)
            + row_number_bytes(prec)),
        "give fewer quanta",
    )?;
    // A row costs two digamma values, an exp and two logarithms (about
    // 30 µs at 130 bits, growing with the precision) and the writing of
    // Ω (about 10 ns a digit); measured, to within a few times.
    let seconds = rows * (3e-5 * (prec / 130.0).max(1.0) + 1e-8 * omega_digits);
    budget.check_work(
        &what,
        seconds * crate::budget::REFERENCE_OPS_PER_SECOND,
        "give fewer quanta or digits",
    )?;
    let omega = einstein_omega(n, quanta, einstein_unit(), budget)?;
    let rows = omega
        .counts
        .into_iter()
        .enumerate()
        .map(|(q, o)| {
            let q = q as u64;
            if n == 1 {
                // Ω = 1 at every q: ln Ω is flat, the temperature infinite.
                let zero = || Certified(Ball::exact(Float::new(64)));
                Ok(EinsteinState {
                    quanta: q,
                    omega: o,
                    s_over_k: zero(),
                    beta_hw: zero(),
                    beta_hw_exact: None,
                    kt_over_hw: None,
                    canonical: None,
                })
            } else {
                row(n, q, o, digits)
            }
        })
        .collect::<Result<Vec<_>>>()?;
    Ok(EinsteinTable {
        oscillators: n,
        quanta_up_to: quanta,
        digits,
        rows,
    })
}
