//! The Einstein solid's table (`zsum microstates --einstein`): N labelled
//! oscillators of one quantum ħω sharing q quanta, Ω(q) = C(q + N − 1, q)
//! exactly, with the microcanonical temperature from the exact derivative
//! of ln Ω and the canonical ensemble at that temperature.
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
//! exact rational sum instead.

use super::{biguint_ball, einstein_omega, ln_factorial};
use crate::error::{Error, Result};
use crate::exact::check_digits;
use crate::exact::format_sig;
use crate::export::{units_block, Column, Tabular};
use crate::spectrum::Budget;
use crate::sum::ball::Ball;
use crate::sum::{ball_decimal, precision_for};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};
use rug::Float;
use serde::Serialize;

/// The highest working precision a row may take, in bits; far beyond what
/// any row needs (the digamma difference cancels about log₂(q ln q) bits).
const MAX_PREC: u32 = 1 << 14;

/// One number of quanta.
#[derive(Debug, Clone, Serialize)]
pub struct EinsteinRow {
    /// The number of quanta q.
    pub quanta: u64,
    /// Ω(q) = C(q + N − 1, q), exact.
    pub omega: String,
    /// S/k = ln Ω.
    pub s_over_k: String,
    /// βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1).
    pub beta_hw: String,
    /// kT/ħω = 1/(βħω); `inf` for one oscillator.
    pub kt_over_hw: String,
    /// The canonical mean number of quanta U/ħω at that temperature.
    pub canonical_u_over_hw: String,
    /// The canonical S/k at that temperature.
    pub canonical_s_over_k: String,
}

/// `zsum microstates --einstein`: the Einstein solid by number of quanta.
#[derive(Debug, Clone, Serialize)]
pub struct EinsteinReport {
    /// The number of oscillators N.
    pub oscillators: u64,
    /// The most quanta tabulated.
    pub quanta_up_to: u64,
    /// Significant digits of every value but Ω, each certified.
    pub digits: u32,
    /// One row per q = 0, 1, ..., `quanta_up_to`.
    pub rows: Vec<EinsteinRow>,
    /// The unit of every field that has one, from the table's columns
    /// (every column is a count or a pure number, so none has).
    pub units: serde_json::Map<String, serde_json::Value>,
}

/// The canonical N-oscillator values at one temperature.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct EinsteinCanonical {
    /// The mean number of quanta U/ħω = N/(e^x − 1).
    pub u_over_hw: String,
    /// S/k = x(U/ħω + N) − N ln(e^x − 1).
    pub s_over_k: String,
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

/// The digits of `b`, if proved.
fn proved(b: &Ball, digits: u32) -> Option<String> {
    match ball_decimal(b, digits) {
        (text, true) => Some(text),
        _ => None,
    }
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
/// assert_eq!(c.u_over_hw, "3.000000000");
/// let s: f64 = c.s_over_k.parse().unwrap();
/// assert!((s - 6.0 * 2f64.ln()).abs() < 1e-9);
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
        let texts = canonical_balls(n, &x)
            .and_then(|(u, s)| Some((proved(&u, digits)?, proved(&s, digits)?)));
        if let Some((u_over_hw, s_over_k)) = texts {
            return Ok(EinsteinCanonical {
                u_over_hw,
                s_over_k,
            });
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
fn row(n: u64, q: u64, omega: &BigUint, digits: u32) -> Result<EinsteinRow> {
    let mut prec = precision_for(digits) + 32;
    let mut exact: Option<(String, String)> = None;
    for attempt in 0.. {
        let s = biguint_ball(omega, prec).ln();
        let x = digamma_difference(n, q, prec);
        let one = Ball::exact(Float::with_val(prec, 1));
        let kt = one.div(&x);
        let can = canonical_balls(n, &x);
        let rate = match &exact {
            Some(e) => Some(e.clone()),
            None => kt
                .as_ref()
                .and_then(|kt| Some((proved(&x, digits)?, proved(kt, digits)?))),
        };
        let rest = s.as_ref().zip(can.as_ref()).and_then(|(s, (u, sc))| {
            Some((proved(s, digits)?, proved(u, digits)?, proved(sc, digits)?))
        });
        if let (Some((beta_hw, kt_over_hw)), Some((s_over_k, u, sc))) = (rate.clone(), rest) {
            return Ok(EinsteinRow {
                quanta: q,
                omega: omega.to_string(),
                s_over_k,
                beta_hw,
                kt_over_hw,
                canonical_u_over_hw: u,
                canonical_s_over_k: sc,
            });
        }
        if rate.is_none() && attempt >= 1 {
            // A rational value exactly halfway between two roundings never
            // settles in floating point: take it from the exact sum.
            let h = harmonic_difference(n, q);
            exact = Some((format_sig(&h, digits), format_sig(&h.recip(), digits)));
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

impl EinsteinReport {
    /// The Einstein solid of `n` oscillators (1 to 1000) for every number of
    /// quanta from 0 up to `up_to` (rounded down), values to `digits`
    /// significant digits; refuses a table estimated beyond `budget`.
    ///
    /// ```
    /// use zsum::microstates::EinsteinReport;
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// // Three oscillators: Ω(4) = C(6, 4) = 15, and
    /// // βħω = ψ(7) − ψ(5) = 1/5 + 1/6 = 11/30 exactly.
    /// let rep = EinsteinReport::build(3, &parse_rational("4")?, 10, &Budget::default())?;
    /// let r = &rep.rows[4];
    /// assert_eq!((r.quanta, r.omega.as_str()), (4, "15"));
    /// assert_eq!(r.beta_hw, "0.3666666667");
    /// assert_eq!(r.kt_over_hw, "2.727272727"); // 30/11
    /// let u: f64 = r.canonical_u_over_hw.parse().unwrap();
    /// assert!((u - 3.0 / ((11.0f64 / 30.0).exp() - 1.0)).abs() < 1e-8);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(n: u64, up_to: &BigRational, digits: u32, budget: &Budget) -> Result<Self> {
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
        // Each row holds Ω and six values as text, laid out again as table
        // cells and once more in the output.
        let rows = quanta as f64 + 1.0;
        let nf = n as f64;
        let q = quanta as f64;
        let omega_digits = (ln_factorial(q + nf - 1.0) - ln_factorial(q) - ln_factorial(nf - 1.0))
            / std::f64::consts::LN_10
            + 1.0;
        let what = format!("the Einstein table of {rows} rows");
        budget.check(
            &what,
            rows * 3.0 * (omega_digits + 6.0 * (digits as f64 + 8.0) + 100.0),
            "give fewer quanta",
        )?;
        // A row costs two digamma values, an exp and two logarithms (about
        // 30 µs at 130 bits, growing with the precision) and the writing of
        // Ω (about 10 ns a digit); measured, to within a few times.
        let prec = f64::from(precision_for(digits) + 32);
        let seconds = rows * (3e-5 * (prec / 130.0).max(1.0) + 1e-8 * omega_digits);
        budget.check_work(
            &what,
            seconds * crate::budget::REFERENCE_OPS_PER_SECOND,
            "give fewer quanta or digits",
        )?;
        let omega = einstein_omega(
            n,
            quanta,
            EnergyUnit::Natural {
                symbol: "ħω".into(),
                joules: None,
            },
            budget,
        )?;
        let rows = omega
            .counts
            .iter()
            .enumerate()
            .map(|(q, o)| {
                let q = q as u64;
                if n == 1 {
                    // Ω = 1 at every q: ln Ω is flat, the temperature infinite.
                    let inf = "inf".to_string();
                    Ok(EinsteinRow {
                        quanta: q,
                        omega: o.to_string(),
                        s_over_k: "0".into(),
                        beta_hw: "0".into(),
                        kt_over_hw: inf.clone(),
                        canonical_u_over_hw: inf.clone(),
                        canonical_s_over_k: inf,
                    })
                } else {
                    row(n, q, o, digits)
                }
            })
            .collect::<Result<Vec<_>>>()?;
        Ok(EinsteinReport {
            oscillators: n,
            quanta_up_to: quanta,
            digits,
            rows,
            units: units_block(&Self::columns_for()),
        })
    }

    /// The columns: counts and pure numbers (energies in quanta ħω).
    fn columns_for() -> Vec<Column> {
        vec![
            Column::plain("quanta q").key("quanta"),
            Column::plain("Ω(q)").key("omega"),
            Column::plain("S/k = ln Ω").key("s_over_k"),
            Column::plain("βħω = d ln Ω/dq").key("beta_hw"),
            Column::plain("kT/ħω").key("kt_over_hw"),
            Column::plain("U/ħω canonical").key("canonical_u_over_hw"),
            Column::plain("S/k canonical").key("canonical_s_over_k"),
        ]
    }
}

impl Tabular for EinsteinReport {
    fn preamble(&self) -> Vec<String> {
        let n = self.oscillators;
        let (oscillators, them) = match n {
            1 => ("1 oscillator".to_string(), "the oscillator".to_string()),
            _ => (
                format!("{n} labelled oscillators"),
                format!("the {n} oscillators"),
            ),
        };
        let mut lines = vec![
            format!(
                "Einstein solid: {oscillators} of one quantum ħω sharing q = 0 to {} quanta; \
                 Ω(q) = C(q + N − 1, q), exact",
                self.quanta_up_to
            ),
            "S/k = ln Ω; βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1) (ψ: digamma), the exact \
             derivative of the exact count continued to real q, no finite difference; \
             kT/ħω = 1/(βħω), the microcanonical temperature"
                .into(),
            format!(
                "U/ħω and S/k canonical: {them} in the canonical ensemble at that \
                 temperature, U/ħω = N/(e^βħω − 1) quanta to set beside q; every value to {} \
                 significant digits, each certified",
                self.digits
            ),
        ];
        if n == 1 {
            lines.push(
                "one oscillator has Ω = 1 at every q: ln Ω is flat, βħω = 0, and the \
                 temperature and the canonical values are infinite"
                    .into(),
            );
        }
        lines
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.quanta.to_string(),
                    r.omega.clone(),
                    r.s_over_k.clone(),
                    r.beta_hw.clone(),
                    r.kt_over_hw.clone(),
                    r.canonical_u_over_hw.clone(),
                    r.canonical_s_over_k.clone(),
                ]
            })
            .collect()
    }
}
