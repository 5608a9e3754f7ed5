//! The summation engine: partition functions and thermodynamic functions at
//! arbitrary precision (MPFR through `rug`), with a rigorous bound on
//! everything not summed.
//!
//! This is the only module where exact values become floating-point
//! numbers. For a spectrum with levels `(E_i, g_i)` and `x_i = (E_i − E_0)/kT`
//! it forms, per particle,
//!
//! ```text
//! q' = Σ g_i e^{−x_i},   μ = Σ g_i x_i e^{−x_i} / q',   σ² = Σ g_i (x_i − μ)² e^{−x_i} / q'
//! ln q = ln q' − E_0/kT,   U/kT = μ + E_0/kT,   Cv/k = σ²,   S/k = ln q + U/kT,   F/kT = −ln q
//! ```
//!
//! The heat capacity comes from the central second moment, summed directly,
//! so it never suffers the cancellation of `<x²> − <x>²`.
//!
//! # The tail bound
//! Levels are summed up to a cutoff `x_c`. Write `N(x)` for the number of
//! states with `x_i ≤ x` and `B(x)` for the spectrum's rigorous upper bound
//! [`Spectrum::tail_bound`] (by default the counting bound
//! [`Spectrum::count_bound`]). With `X_j = 2^j x_c`, the states in
//! `(X_j, X_{j+1}]` number at most `B(X_{j+1})`, and on that interval
//! `x^k e^{−x} ≤ X_{j+1}^k e^{−X_j}`, so for k = 0, 1, 2
//!
//! ```text
//! τ_k = Σ_{x_i > x_c} g_i x_i^k e^{−x_i}  ≤  Σ_{j ≥ 0} B(X_{j+1}) X_{j+1}^k e^{−X_j}.
//! ```
//!
//! The engine evaluates `B` at the first few `X_j` and bounds the rest with
//! the spectrum's growth exponent p ([`Spectrum::growth_exponent`]: `N(λx) ≤
//! 4 λ^p max(B(x), 1)` for λ ≥ 1 at the cutoffs used); the terms then fall
//! faster than geometrically, so the remainder is at most twice the first
//! omitted term. The bounds on `q'`, `μ` and `σ²` follow from `τ_0, τ_1,
//! τ_2`: `|Δμ| ≤ (τ_1 + μ τ_0)/q'`, `|Δσ²| ≤ (τ_2 + 2μτ_1 + μ²τ_0 + σ²τ_0)/q' +
//! Δμ²`. A spectrum with no growth exponent and no highest level cannot be
//! bounded and is refused.
//!
//! # Rounding
//! Each term costs at most `x + 4` units of relative rounding (conversion
//! of `x`, the exponential, the products) and each addition one more; all
//! terms are positive, so the relative rounding error of every sum is at
//! most `(x_max + 4 + n) · 2^−prec`. The result's error bound is the sum of
//! the tail and rounding bounds.
//!
//! # Precision semantics
//! A request for `d` digits is met when every printed value, rounded to `d`
//! significant digits, is the correct rounding of the exact value: the
//! engine checks that both ends of each value's error interval round to the
//! same digits and, if not, repeats with a tighter bound and more working
//! precision (Ziv's strategy).
//!
//! # Fast exact paths
//! - independent parts ([`Shape::Parts`]): summed separately; ln q, U, Cv
//!   and S add;
//! - a ladder `E = w n²`, n ≥ 1 (the box along one axis, [`Shape::Squares`]):
//!   for `a = w/kT < 1` through Jacobi's imaginary transformation
//!   `Σ_{n∈Z} e^{−an²} = sqrt(π/a) Σ_{m∈Z} e^{−π²m²/a}` and its derivatives in
//!   a, so a macroscopic box costs a handful of terms;
//! - harmonic modes ([`Shape::Harmonic`]): the geometric series in closed form;
//! - the rigid rotor ladder ([`Shape::RigidLadder`]): successive terms by the
//!   recurrence `e^{−x_{J+1}} = e^{−x_J} · f_J`, `f_{J+1} = f_J e^{−2y}`; the
//!   tail past J is at most the first omitted envelope term over (1 − ρ) once
//!   the neighbour ratio ρ of the envelope is below 1. For y = θ/T ≤ 1/2 the
//!   recurrence runs in fixed point (integers scaled by 2^P, P = prec + 24),
//!   with each truncation's error tracked term by term into the bounds.

mod closed;
mod direct;
pub(crate) use direct::to_rug;
mod format;

use crate::error::{Error, ErrorKind, Result};
use crate::exact::rational_string;
use crate::spectrum::Spectrum;
use crate::units::EnergyUnit;
use num_rational::BigRational;
use num_traits::Signed;
use rug::Float;
use serde::Serialize;

pub use format::float_to_decimal;

/// The largest number of significant digits the engine accepts.
pub const MAX_DIGITS: u32 = 1000;

/// How a spectrum's sum can be organised. Spectra describe their structure;
/// the engine decides how to sum it.
pub enum Shape<'a> {
    /// List levels and sum them directly.
    Direct,
    /// Independent parts, each with the size of its unit in the whole's
    /// unit: energies add, so ln q, U, Cv and S add.
    Parts(Vec<(&'a dyn Spectrum, BigRational)>),
    /// `E = Σ_i w_i n_i²` with every `n_i ≥ 1` (a box): independent square
    /// ladders, one weight each.
    Squares(Vec<BigRational>),
    /// Harmonic modes `(ω, degeneracy)`, with or without zero-point energy.
    Harmonic(Vec<(BigRational, u32)>, bool),
    /// `E = b J(J+1)`, J = 0, 1, ..., with `(2J+1)·w(J mod 2)` states (a
    /// rigid linear rotor with parity weights `[even, odd]`): summed by a
    /// two-multiplication recurrence instead of one exponential per level.
    RigidLadder(BigRational, [num_bigint::BigUint; 2]),
}

/// A temperature: in kelvin, or as kT in the spectrum's own unit (for a box
/// without mass and side, kT in units of h²/(8 m L²)).
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Temperature {
    /// T in kelvin.
    Kelvin(BigRational),
    /// kT in the spectrum's unit.
    Reduced(BigRational),
}

impl Temperature {
    /// 1/kT in the spectrum's energy unit, exactly.
    pub fn beta(&self, unit: &EnergyUnit) -> Result<BigRational> {
        let t = match self {
            Temperature::Kelvin(t) | Temperature::Reduced(t) => t,
        };
        if !t.is_positive() {
            return Err(Error::invalid(
                "temperature",
                rational_string(t),
                "it must be greater than zero",
            ));
        }
        match self {
            Temperature::Reduced(kt) => Ok(kt.recip()),
            Temperature::Kelvin(t) => {
                let f = unit.factor_to(&EnergyUnit::Kelvin).map_err(|_| {
                    Error::new(
                        ErrorKind::Unit,
                        format!(
                            "a temperature in kelvin needs energies of known size, but the \
                             spectrum's unit is {unit}: give the box a mass and side, or give \
                             kT in {unit} instead"
                        ),
                    )
                })?;
                Ok(f / t)
            }
        }
    }
}

/// Sums and their error bounds for one spectrum at one temperature.
#[derive(Debug, Clone)]
pub(crate) struct Stats {
    /// ln q (true, not shifted).
    pub(crate) ln_q: Float,
    /// U/kT.
    pub(crate) u: Float,
    /// Cv/k.
    pub(crate) cv: Float,
    /// Absolute error bounds of ln q, U/kT and Cv/k.
    pub(crate) err_ln_q: f64,
    pub(crate) err_u: f64,
    pub(crate) err_cv: f64,
}

impl Stats {
    fn add(mut self, o: &Stats) -> Stats {
        self.ln_q += &o.ln_q;
        self.u += &o.u;
        self.cv += &o.cv;
        self.err_ln_q += o.err_ln_q;
        self.err_u += o.err_u;
        self.err_cv += o.err_cv;
        self
    }
}

/// Working precision in bits for a target relative error `eps`.
pub(crate) fn precision_for(digits: u32, attempt: u32) -> u32 {
    (digits as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 64 + 32 * attempt
}

/// Which summation path to take.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Path {
    /// The fastest exact path the spectrum's shape allows.
    Auto,
    /// List every level and sum directly (for cross-checks of the fast
    /// paths: both must agree to every printed digit).
    Direct,
}

pub(crate) fn stats_of(s: &dyn Spectrum, beta: &BigRational, eps: f64, prec: u32) -> Result<Stats> {
    stats_path(s, beta, eps, prec, Path::Auto)
}

fn stats_path(
    s: &dyn Spectrum,
    beta: &BigRational,
    eps: f64,
    prec: u32,
    path: Path,
) -> Result<Stats> {
    if path == Path::Direct {
        return direct::stats(s, beta, eps, prec);
    }
    match s.shape() {
        Shape::Direct => direct::stats(s, beta, eps, prec),
        Shape::Parts(parts) => {
            let mut acc: Option<Stats> = None;
            let share = eps / parts.len().max(1) as f64;
            for (p, factor) in parts {
                let st = stats_of(p, &(beta * factor), share, prec)?;
                acc = Some(match acc {
                    None => st,
                    Some(a) => a.add(&st),
                });
            }
            acc.ok_or_else(|| Error::invalid("spectrum", "with no parts", "it needs a part"))
        }
        Shape::Squares(ws) => {
            let mut acc: Option<Stats> = None;
            for w in &ws {
                let st = closed::squares(&(w * beta), eps / ws.len() as f64, prec);
                acc = Some(match acc {
                    None => st,
                    Some(a) => a.add(&st),
                });
            }
            acc.ok_or_else(|| Error::invalid("box", "with no axes", "it needs an axis"))
        }
        Shape::RigidLadder(b, w) => {
            let y = &b * beta;
            Ok(closed::rigid_ladder_fixed(&y, &w, eps, prec)
                .unwrap_or_else(|| closed::rigid_ladder(&y, &w, eps, prec)))
        }
        Shape::Harmonic(modes, zero_point) => {
            let mut acc: Option<Stats> = None;
            for (w, d) in &modes {
                let st = closed::harmonic(&(w * beta), *d, zero_point, prec);
                acc = Some(match acc {
                    None => st,
                    Some(a) => a.add(&st),
                });
            }
            acc.ok_or_else(|| Error::invalid("oscillator", "with no modes", "it needs a mode"))
        }
    }
}

/// One thermodynamic state point, per particle, with every value written to
/// the requested digits.
#[derive(Debug, Clone, Serialize)]
pub struct ThermoPoint {
    /// The temperature as given (kelvin, or kT in the spectrum's unit).
    #[serde(rename = "T")]
    pub t: String,
    /// The partition function q.
    pub q: String,
    /// ln q.
    pub ln_q: String,
    /// Bound on the relative error of q (tail plus rounding).
    pub rel_bound: String,
    /// U/(kT).
    #[serde(rename = "U_over_kT")]
    pub u_over_kt: String,
    /// Cv/k.
    #[serde(rename = "Cv_over_k")]
    pub cv_over_k: String,
    /// S/k.
    #[serde(rename = "S_over_k")]
    pub s_over_k: String,
    /// F/(kT).
    #[serde(rename = "F_over_kT")]
    pub f_over_kt: String,
    /// Significant digits of every value.
    pub digits: u32,
    /// Working precision used, in bits.
    pub precision_bits: u32,
    /// Whether every value was proved correctly rounded (false only if the
    /// error interval still straddled a rounding boundary after retries;
    /// then the last digit may be off by one).
    pub certified: bool,
}

/// Computes q, ln q and U/kT, Cv/k, S/k, F/kT of `spectrum` at `temperature`
/// to `digits` significant digits, every digit certified.
///
/// ```
/// use zsum::models::rotor::LinearRotor;
/// use zsum::sum::{thermo, Temperature};
/// use zsum::exact::parse_rational;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // A rotor with B = 1 K at T = 1000 K has Cv/k near 1.
/// let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
/// let p = thermo(&rot, &Temperature::Kelvin(r("1000")), 20).unwrap();
/// assert!(p.certified);
/// assert!(p.cv_over_k.starts_with("1.0000"));
/// ```
pub fn thermo(
    spectrum: &dyn Spectrum,
    temperature: &Temperature,
    digits: u32,
) -> Result<ThermoPoint> {
    thermo_with(spectrum, temperature, digits, Path::Auto)
}

/// As [`thermo`], choosing the summation path.
pub fn thermo_with(
    spectrum: &dyn Spectrum,
    temperature: &Temperature,
    digits: u32,
    path: Path,
) -> Result<ThermoPoint> {
    if !(1..=MAX_DIGITS).contains(&digits) {
        return Err(Error::invalid(
            "digits",
            digits,
            &format!("choose between 1 and {MAX_DIGITS} significant digits"),
        ));
    }
    let beta = temperature.beta(&spectrum.unit())?;
    let t_text = match temperature {
        Temperature::Kelvin(t) | Temperature::Reduced(t) => crate::exact::exact_decimal(t, 40),
    };
    let mut last = None;
    for attempt in 0..4u32 {
        let prec = precision_for(digits, attempt);
        let eps = 10f64
            .powi(-(digits as i32) - 6 - 8 * attempt as i32)
            .max(1e-300);
        let st = stats_path(spectrum, &beta, eps, prec, path)?;
        let p = point(&st, &t_text, digits, prec);
        if p.certified {
            return Ok(p);
        }
        last = Some(p);
    }
    Ok(last.expect("at least one attempt"))
}

fn point(st: &Stats, t: &str, digits: u32, prec: u32) -> ThermoPoint {
    let s = Float::with_val(prec, &st.ln_q + &st.u);
    let f = Float::with_val(prec, -&st.ln_q);
    let q = Float::with_val(prec, st.ln_q.exp_ref());
    // Relative error of q from the absolute error of ln q: e^δ − 1 ≤ 2δ for δ ≤ 1.
    let err_q_rel = 2.0 * st.err_ln_q + 4.0 * 2f64.powi(-(prec as i32));
    let qa = q.to_f64().abs();
    let (q_s, ok_q) = float_to_decimal(
        &q,
        err_q_rel * if qa.is_finite() { qa } else { f64::MAX },
        err_q_rel,
        digits,
    );
    let (lnq_s, ok_l) = float_to_decimal(&st.ln_q, st.err_ln_q, 0.0, digits);
    let (u_s, ok_u) = float_to_decimal(&st.u, st.err_u, 0.0, digits);
    let (cv_s, ok_c) = float_to_decimal(&st.cv, st.err_cv, 0.0, digits);
    let (s_s, ok_s) = float_to_decimal(&s, st.err_ln_q + st.err_u, 0.0, digits);
    let (f_s, ok_f) = float_to_decimal(&f, st.err_ln_q, 0.0, digits);
    ThermoPoint {
        t: t.to_string(),
        q: q_s,
        ln_q: lnq_s,
        rel_bound: format!("{:.2e}", err_q_rel),
        u_over_kt: u_s,
        cv_over_k: cv_s,
        s_over_k: s_s,
        f_over_kt: f_s,
        digits,
        precision_bits: prec,
        certified: ok_q && ok_l && ok_u && ok_c && ok_s && ok_f,
    }
}

/// A spectrum whose level listings are kept and reused: a temperature sweep
/// lists levels once, at the highest cutoff any temperature needs, and
/// later temperatures take the part of the list they need.
///
/// A product's parts are summed separately by the engine, so each part is
/// wrapped (and cached) in turn.
pub struct Cached<'a> {
    inner: &'a dyn Spectrum,
    store: std::cell::RefCell<Option<(BigRational, crate::level::LevelList)>>,
    parts: Option<Vec<(Cached<'a>, BigRational)>>,
}

impl<'a> Cached<'a> {
    /// Wraps `inner`.
    pub fn new(inner: &'a dyn Spectrum) -> Self {
        let parts = match inner.shape() {
            Shape::Parts(ps) => Some(ps.into_iter().map(|(p, f)| (Cached::new(p), f)).collect()),
            _ => None,
        };
        Cached {
            inner,
            store: std::cell::RefCell::new(None),
            parts,
        }
    }
}

impl Spectrum for Cached<'_> {
    fn describe(&self) -> String {
        self.inner.describe()
    }
    fn unit(&self) -> EnergyUnit {
        self.inner.unit()
    }
    fn quantum_numbers(&self) -> Vec<String> {
        self.inner.quantum_numbers()
    }
    fn ground_energy(&self) -> BigRational {
        self.inner.ground_energy()
    }
    fn levels_within(
        &self,
        cutoff: &BigRational,
        budget: &crate::spectrum::Budget,
    ) -> Result<crate::level::LevelList> {
        if let Some((c, list)) = self.store.borrow().as_ref() {
            if cutoff <= c {
                return Ok(list.truncated(cutoff));
            }
        }
        let list = self.inner.levels_within(cutoff, budget)?;
        *self.store.borrow_mut() = Some((cutoff.clone(), list.clone()));
        Ok(list)
    }
    fn states_at(&self, energy: &BigRational) -> Result<Vec<crate::spectrum::State>> {
        self.inner.states_at(energy)
    }
    fn tail_bound(&self, energy: &BigRational) -> num_bigint::BigUint {
        self.inner.tail_bound(energy)
    }
    fn count_bound(&self, energy: &BigRational) -> num_bigint::BigUint {
        self.inner.count_bound(energy)
    }
    fn doubled_numbers(&self) -> Vec<bool> {
        self.inner.doubled_numbers()
    }
    fn labels_at(&self, energy: &BigRational) -> Vec<String> {
        self.inner.labels_at(energy)
    }
    fn shape(&self) -> Shape<'_> {
        match &self.parts {
            Some(ps) => Shape::Parts(
                ps.iter()
                    .map(|(c, f)| (c as &dyn Spectrum, f.clone()))
                    .collect(),
            ),
            None => self.inner.shape(),
        }
    }
    fn highest_energy(&self) -> Option<BigRational> {
        self.inner.highest_energy()
    }
    fn classical_form(&self) -> Option<crate::classical::Form> {
        self.inner.classical_form()
    }
    fn growth_exponent(&self) -> Option<f64> {
        self.inner.growth_exponent()
    }
    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        self.inner.warnings(cutoff)
    }
}
