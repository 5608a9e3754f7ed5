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
//! - independent parts ([`Structure::Parts`]): summed separately; ln q, U, Cv
//!   and S add;
//! - a ladder `E = w n²`, n ≥ 1 (the box along one axis, [`Structure::Squares`]):
//!   for `a = w/kT < 1` through Jacobi's imaginary transformation
//!   `Σ_{n∈Z} e^{−an²} = sqrt(π/a) Σ_{m∈Z} e^{−π²m²/a}` and its derivatives in
//!   a, so a macroscopic box costs a handful of terms;
//! - harmonic modes ([`Structure::Harmonic`]): the geometric series in closed form;
//! - the rigid rotor ladder ([`Structure::Rotor`], rigid): successive terms by the
//!   recurrence `e^{−x_{J+1}} = e^{−x_J} · f_J`, `f_{J+1} = f_J e^{−2y}`; the
//!   tail past J is at most the first omitted envelope term over (1 − ρ) once
//!   the neighbour ratio ρ of the envelope is below 1. For y = θ/T ≤ 1/2 the
//!   recurrence runs in fixed point (integers scaled by 2^P, P = prec + 24),
//!   with each truncation's error tracked term by term into the bounds.

pub(crate) mod ball;
mod certified;
mod closed;
mod convert;
mod direct;
pub(crate) use convert::to_rug;
pub(crate) mod format;
mod ladder;
mod poly;

use crate::budget::Meter;
use crate::error::{Error, ErrorKind, Result};
use crate::exact::rational_string;
use crate::spectrum::{Spectrum, Structure};
use crate::units::EnergyUnit;
use ball::{Ball, RP};
use num_rational::BigRational;
use num_traits::Signed;
use rug::Float;

pub use certified::Certified;
pub(crate) use format::ball_decimal;
pub use format::float_to_decimal;

/// The largest number of significant digits the engine accepts.
pub const MAX_DIGITS: u32 = 1000;

/// A temperature: in kelvin, or as kT in the spectrum's own unit (for a box
/// without mass and side, kT in units of h²/(8 m L²)).
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Temperature {
    /// T in kelvin.
    Kelvin(BigRational),
    /// kT, the thermal energy, in the spectrum's own unit (not T/θ: the
    /// CLI's `--reduced` grid is converted to kT with the model's θ).
    ThermalEnergy(BigRational),
}

impl Temperature {
    /// 1/kT in the spectrum's energy unit, exactly.
    pub fn beta(&self, unit: &EnergyUnit) -> Result<BigRational> {
        let t = match self {
            Temperature::Kelvin(t) | Temperature::ThermalEnergy(t) => t,
        };
        if !t.is_positive() {
            return Err(Error::invalid(
                "temperature",
                rational_string(t),
                "it must be greater than zero",
            ));
        }
        match self {
            Temperature::ThermalEnergy(kt) => Ok(kt.recip()),
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

/// The largest first excitation, in units of kT, that the engine sums: its
/// Boltzmann factor e^{−x} (about 10^−43 429 448 at the limit) and the
/// moments x e^{−x}, x² e^{−x} stay well inside MPFR's exponent range
/// (about 10^±323 228 496).
pub const MAX_EXCITATION: f64 = 1e8;

/// The default effort limit: the most working bits the engine spends on
/// one value before it prints it marked `*`.
pub const DEFAULT_MAX_BITS: u32 = 1 << 14;

/// Sums and their error bounds for one spectrum at one temperature, with
/// energies measured from the ground level: the excitation parts are kept
/// apart from the ground level's share, so values of order e^{−x₁} (a cold
/// system) carry errors relative to themselves.
#[derive(Debug, Clone)]
pub(crate) struct Stats {
    /// ln q' = ln Σ g e^{−(E−E₀)/kT} (energies from the ground).
    pub(crate) ln_qx: Ball,
    /// ⟨(E − E₀)/kT⟩ = U/kT − E₀/kT.
    pub(crate) mu: Ball,
    /// Cv/k, the variance of E/kT.
    pub(crate) cv: Ball,
    /// E₀/kT.
    pub(crate) shift: Ball,
}

impl Stats {
    fn add(&self, o: &Stats) -> Stats {
        Stats {
            ln_qx: self.ln_qx.add(&o.ln_qx),
            mu: self.mu.add(&o.mu),
            cv: self.cv.add(&o.cv),
            shift: self.shift.add(&o.shift),
        }
    }

    /// ln q = ln q' − E₀/kT.
    pub(crate) fn ln_q(&self) -> Ball {
        self.ln_qx.sub(&self.shift)
    }

    /// U/kT = ⟨x⟩ + E₀/kT.
    pub(crate) fn u(&self) -> Ball {
        self.mu.add(&self.shift)
    }

    /// S/k = ln q' + ⟨x⟩ (the ground energy cancels exactly, so it is
    /// never subtracted in floating point).
    pub(crate) fn s(&self) -> Ball {
        self.ln_qx.add(&self.mu)
    }

    /// The stats from q' and the raw moments `m1 = Σ g x e^{−x}`, `m2 = Σ g x²
    /// e^{−x}` over the same levels (with `ln_qx = ln q'` formed by the
    /// caller, relative to the excitations where they are small):
    /// ⟨x⟩ = m1/q', Cv/k = m2/q' − ⟨x⟩². The ball arithmetic charges the
    /// subtraction in full.
    pub(crate) fn from_moments(
        ln_qx: Ball,
        q: &Ball,
        m1: &Ball,
        m2: &Ball,
        shift: Ball,
    ) -> Option<Stats> {
        let mu = m1.div(q)?;
        let second = m2.div(q)?;
        let cv = second.sub(&mu.mul(&mu));
        Some(Stats {
            ln_qx,
            mu,
            cv,
            shift,
        })
    }

    /// The stats of a spectrum summed as a ground level of `g0` states and
    /// excitation sums `e = Σ g e^{−x}`, `m1`, `m2` over the excited levels
    /// (x > 0): ln q' = ln g₀ + ln(1 + e/g₀), relative to e however small.
    pub(crate) fn from_excitations(
        g0: &rug::Integer,
        e: &Ball,
        m1: &Ball,
        m2: &Ball,
        shift: Ball,
    ) -> Option<Stats> {
        let prec = e.prec();
        let g = Ball::exact(Float::with_val(prec, g0));
        let ln_g0 = if *g0 == 1 {
            Ball::exact(Float::new(prec))
        } else {
            Ball::rounded(Float::with_val(prec, g.c.ln_ref()), Float::new(RP))
        };
        let ratio = e.div(&g)?;
        let ln_qx = ln_g0.add(&ratio.ln_1p()?);
        let q = g.add(e);
        Stats::from_moments(ln_qx, &q, m1, m2, shift)
    }
}

/// A Ball from the exact product of `num` over the product of `den` at
/// `prec` bits (one rounding), formed in GMP: cheaper than reduced
/// big-rational products of long exact constants.
pub(crate) fn ratio_ball(num: &[&BigRational], den: &[&BigRational], prec: u32) -> Ball {
    let mut r = rug::Rational::from(1);
    for x in num {
        r *= to_rug(x);
    }
    for x in den {
        r /= to_rug(x);
    }
    Ball::rounded(Float::with_val(prec, &r), Float::new(RP))
}

/// A Ball from an exact rational at `prec` bits (one rounding).
pub(crate) fn rational_ball(r: &BigRational, prec: u32) -> Ball {
    Ball::rounded(Float::with_val(prec, &to_rug(r)), Float::new(RP))
}

/// Refuses a first excitation `x1` (in kT) beyond [`MAX_EXCITATION`].
pub(crate) fn check_excitation(x1: f64, what: &str) -> Result<()> {
    if x1 > MAX_EXCITATION || x1.is_nan() {
        return Err(Error::budget(format!(
            "at this temperature the first excited level of {what} lies {} kT above the \
             ground level: its Boltzmann factor e^-{} is beyond the engine's range (the \
             largest first excitation summed is {:e} kT), and every excitation part of \
             ln q, U and Cv is below 10^-43000000; check the constants' unit, or raise the \
             temperature",
            crate::exact::format_sig_f64(x1, 3),
            crate::exact::format_sig_f64(x1, 3),
            MAX_EXCITATION
        )));
    }
    Ok(())
}

/// Working precision in bits for `digits` significant digits, before any
/// raise: the digits' bits plus 64 guard bits.
pub(crate) fn precision_for(digits: u32) -> u32 {
    (digits as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 64
}

/// The natural log of the relative tail target at working precision `prec`:
/// truncated tails are bounded below 2^−(prec − 24) of each value.
pub(crate) fn ln_target(prec: u32) -> f64 {
    -((prec as f64) - 24.0) * std::f64::consts::LN_2
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

pub(crate) fn stats_of(s: &dyn Spectrum, beta: &BigRational, prec: u32) -> Result<Stats> {
    stats_path(s, beta, prec, Path::Auto)
}

fn sum_parts(parts: Vec<Result<Stats>>, what: &str) -> Result<Stats> {
    let mut acc: Option<Stats> = None;
    for st in parts {
        let st = st?;
        acc = Some(match acc {
            None => st,
            Some(a) => a.add(&st),
        });
    }
    acc.ok_or_else(|| Error::invalid(what, "with no parts", "it needs at least one"))
}

fn stats_path(s: &dyn Spectrum, beta: &BigRational, prec: u32, path: Path) -> Result<Stats> {
    stats_metered(s, beta, prec, path, None)
}

/// As `stats_path`, telling `meter` (at step `base`) after each part of a
/// product how far the step is, so that a product of many costly parts is
/// refused once its projected time exceeds the budget.
fn stats_metered(
    s: &dyn Spectrum,
    beta: &BigRational,
    prec: u32,
    path: Path,
    meter: Option<(&Meter, f64)>,
) -> Result<Stats> {
    if path == Path::Direct {
        return direct::stats(s, beta, prec, false);
    }
    // Parts share the tail target: a few guard bits cover their number.
    let share = |n: usize| prec + (usize::BITS - n.leading_zeros());
    match s.structure() {
        Structure::Opaque
        | Structure::Finite
        | Structure::Top { .. }
        | Structure::Asymmetric { .. }
        | Structure::Spherical(_)
        | Structure::Near { .. }
        | Structure::Rotor { rigid: false, .. } => direct::stats(s, beta, prec, true),
        Structure::Parts(parts) => {
            let p = share(parts.len());
            let n = parts.len() as f64;
            // Part by part, stopping at the first error or refusal.
            let mut sts = Vec::with_capacity(parts.len());
            for (j, (part, factor)) in parts.into_iter().enumerate() {
                sts.push(Ok(stats_of(part, &(beta * factor), p)?));
                if let Some((m, base)) = meter {
                    m.at(base + (j as f64 + 1.0) / n)?;
                }
            }
            sum_parts(sts, "spectrum")
        }
        Structure::Squares(ws) => {
            let p = share(ws.len());
            let sts = ws.iter().map(|w| closed::squares(&(w * beta), p)).collect();
            sum_parts(sts, "box")
        }
        Structure::Rotor {
            b,
            weights,
            rigid: true,
        } => ladder::rigid_ladder(&(&b * beta), &weights, prec),
        Structure::Harmonic(modes, zero_point) => {
            let sts = modes
                .iter()
                .map(|(w, d)| closed::harmonic(&(w * beta), *d, zero_point, prec))
                .collect();
            sum_parts(sts, "oscillator")
        }
    }
}

/// One thermodynamic state point, per particle: certified numbers, each
/// with its error radius. Text is made from it in [`crate::report`].
#[derive(Debug, Clone)]
pub struct Thermo {
    /// ln q, energies as the model gives them.
    pub ln_q: Certified,
    /// U/(kT).
    pub u_over_kt: Certified,
    /// Cv/k.
    pub cv_over_k: Certified,
    /// S/k.
    pub s_over_k: Certified,
    /// F/(kT) = −ln q.
    pub f_over_kt: Certified,
    /// The significant digits asked for.
    pub digits: u32,
    /// Working precision used, in bits.
    pub precision_bits: u32,
    /// Whether every value (q included) is proved to `digits` digits.
    /// False only when the effort limit `max_bits` was reached first; then
    /// `certified_digits` says how many digits are proved.
    pub certified: bool,
    /// The leading significant digits proved for every value.
    pub certified_digits: u32,
    /// The effort limit: the most working bits the engine was allowed.
    pub max_bits: u32,
}

impl Thermo {
    /// Whether every value, q included, is proved to `digits` significant
    /// digits (at most the digits the point was computed for).
    pub fn settles(&self, digits: u32) -> bool {
        format::exp_decimal(&self.ln_q.0, digits).1
            && [
                &self.ln_q,
                &self.u_over_kt,
                &self.cv_over_k,
                &self.s_over_k,
                &self.f_over_kt,
            ]
            .iter()
            .all(|c| c.settles(digits))
    }

    /// How many leading significant digits, up to `digits`, are proved for
    /// every value, q included.
    pub fn proved_digits(&self, digits: u32) -> u32 {
        if self.settles(digits) {
            return digits;
        }
        [
            &self.ln_q,
            &self.u_over_kt,
            &self.cv_over_k,
            &self.s_over_k,
            &self.f_over_kt,
        ]
        .iter()
        .map(|c| c.proved_digits(digits))
        .chain([format::proved_exp_digits(&self.ln_q.0, digits)])
        .min()
        .unwrap_or(0)
    }

    fn from_stats(st: &Stats, digits: u32, prec: u32, max_bits: u32) -> Thermo {
        let ln_q = st.ln_q();
        let all = [ln_q.clone(), st.u(), st.cv.clone(), st.s(), ln_q.neg()];
        let [ln_q, u, cv, s, f] = all.map(Certified);
        let mut t = Thermo {
            ln_q,
            u_over_kt: u,
            cv_over_k: cv,
            s_over_k: s,
            f_over_kt: f,
            digits,
            precision_bits: prec,
            certified: false,
            certified_digits: 0,
            max_bits,
        };
        t.certified = t.settles(digits);
        t.certified_digits = if t.certified {
            digits
        } else {
            t.proved_digits(digits)
        };
        t
    }

    /// A bound on the relative error of q (tail plus rounding):
    /// e^r − 1 ≤ 2r for the radius r ≤ 1 of ln q.
    pub fn q_relative_bound(&self) -> Float {
        ball::up_mul(self.ln_q.radius(), &Float::with_val(RP, 2))
    }

    /// Why the point is not certified, or `None` when it is.
    pub fn shortfall(&self) -> Option<String> {
        (!self.certified).then(|| shortfall_text(self.certified_digits, self.max_bits))
    }
}

/// The reason text for a value certified to `certified` digits only.
pub fn shortfall_text(certified: u32, max_bits: u32) -> String {
    let nth = crate::exact::ordinal(certified as u64 + 1);
    format!("digits from the {nth} on need more than {max_bits} working bits; raise the effort limit (max bits)")
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
/// // Numbers with their error radius: Cv/k = 1 + 1/(45 y²)... at y = 1e-3.
/// assert!((p.cv_over_k.to_f64() - 1.0).abs() < 1e-6);
/// assert!(p.cv_over_k.radius().to_f64() < 1e-25);
/// assert!(p.cv_over_k.decimal(20).unwrap().starts_with("1.0000"));
/// ```
pub fn thermo(spectrum: &dyn Spectrum, temperature: &Temperature, digits: u32) -> Result<Thermo> {
    thermo_with(spectrum, temperature, digits, Path::Auto)
}

/// As [`thermo`], choosing the summation path.
pub fn thermo_with(
    spectrum: &dyn Spectrum,
    temperature: &Temperature,
    digits: u32,
    path: Path,
) -> Result<Thermo> {
    thermo_limited(spectrum, temperature, digits, path, DEFAULT_MAX_BITS)
}

/// Refuses a digit count outside 1..=[`MAX_DIGITS`] or an effort limit
/// below what the digits need.
pub fn check_request(digits: u32, max_bits: u32) -> Result<()> {
    if !(1..=MAX_DIGITS).contains(&digits) {
        return Err(Error::invalid(
            "digits",
            digits,
            &format!("choose between 1 and {MAX_DIGITS} significant digits"),
        ));
    }
    let need = precision_for(digits);
    if max_bits < need {
        return Err(Error::invalid(
            "effort limit (max bits)",
            max_bits,
            &format!("{digits} digits need at least {need} working bits; give at least that"),
        ));
    }
    Ok(())
}

/// As [`thermo_with`], with an effort limit: where the first attempt does
/// not certify every digit, the working precision (and with it every
/// cutoff) doubles until it does or reaches `max_bits` (Ziv's strategy).
pub fn thermo_limited(
    spectrum: &dyn Spectrum,
    temperature: &Temperature,
    digits: u32,
    path: Path,
    max_bits: u32,
) -> Result<Thermo> {
    thermo_metered(spectrum, temperature, digits, path, max_bits, None)
}

/// As [`thermo_limited`], telling `meter` (this temperature being step
/// `base` of its grid) how far the sum is after each part of a product,
/// and refusing the rest once the projected time exceeds its budget.
pub fn thermo_metered(
    spectrum: &dyn Spectrum,
    temperature: &Temperature,
    digits: u32,
    path: Path,
    max_bits: u32,
    meter: Option<(&Meter, f64)>,
) -> Result<Thermo> {
    check_request(digits, max_bits)?;
    let beta = temperature.beta(&spectrum.unit())?;
    let mut prec = precision_for(digits);
    // Retries at higher precision reuse the level listings.
    let cached = Cached::new(spectrum);
    loop {
        let st = stats_metered(&cached, &beta, prec, path, meter)?;
        let p = Thermo::from_stats(&st, digits, prec, max_bits);
        if p.certified || prec >= max_bits {
            return Ok(p);
        }
        prec = (prec * 2).min(max_bits);
    }
}

/// A spectrum whose level listings are kept and reused: a temperature sweep
/// lists levels once, at the highest cutoff any temperature needs, and
/// later temperatures take the part of the list they need.
///
/// A product's parts are summed separately by the engine, so each part is
/// wrapped (and cached) in turn. Clones share the store: the cores of a
/// sweep list each spectrum once between them.
#[derive(Clone)]
pub struct Cached<'a> {
    inner: &'a dyn Spectrum,
    /// The widest listing so far: its cutoff, its precision in bits and
    /// its levels.
    store: std::sync::Arc<std::sync::Mutex<Option<Stored>>>,
    parts: Option<Vec<(Cached<'a>, BigRational)>>,
    /// The widest J ladders so far, as `store` keeps listings.
    ladders: std::sync::Arc<std::sync::Mutex<Option<StoredLadders>>>,
}

/// Stored ladders: their cutoff, the ladders, and how many times the store
/// has been outgrown.
type StoredLadders = (
    BigRational,
    std::sync::Arc<Vec<crate::spectrum::PolyLadder>>,
    u32,
);

/// A stored listing: its cutoff, its precision in bits, its levels, and
/// how many listings the store has been outgrown by.
type Stored = (
    BigRational,
    u32,
    std::sync::Arc<crate::spectrum::Summands>,
    u32,
);

impl Cached<'_> {
    /// The stored listing when it reaches `cutoff` at `bits` or more, else
    /// a new one reaching at least as far (stored when wider than what is
    /// stored). A poisoned lock only means another thread panicked
    /// mid-listing; the store then holds a whole earlier listing or none. The listing is shared: callers truncate
    /// outside the lock, so the cores of a sweep do not wait on each
    /// other's copies.
    fn shared(
        &self,
        cutoff: &BigRational,
        budget: &crate::spectrum::Budget,
        bits: u32,
    ) -> Result<std::sync::Arc<crate::spectrum::Summands>> {
        let lock = || {
            self.store
                .lock()
                .unwrap_or_else(std::sync::PoisonError::into_inner)
        };
        let (stored, outgrown) = match lock().as_ref() {
            Some((c, b, list, n)) if bits <= *b => {
                if cutoff <= c {
                    (Some(list.clone()), 0)
                } else {
                    (None, n + 1)
                }
            }
            Some((.., n)) => (None, *n),
            None => (None, 0),
        };
        if let Some(list) = stored {
            return Ok(list);
        }
        // A sweep asks for ever higher cutoffs as its temperature rises:
        // once the stored listing is outgrown a second time, list half as
        // far again beyond the ground (within the budget), so that the
        // listings of a whole grid number a few rather than one per
        // temperature, while a call at one or two temperatures lists no
        // more than it sums.
        let ahead = (outgrown >= 2).then(|| {
            let e0 = self.inner.ground_energy();
            &e0 + (cutoff - &e0) * BigRational::new(3.into(), 2.into())
        });
        let list_at = |c: &BigRational| -> Result<std::sync::Arc<crate::spectrum::Summands>> {
            if bits == 0 {
                let list = self.inner.levels_within(c, budget)?;
                Ok(std::sync::Arc::new(crate::spectrum::Summands::new(
                    std::sync::Arc::new(list),
                )))
            } else {
                self.inner.summands_within_bits(c, budget, bits)
            }
        };
        let (reach, shared) = match ahead.map(|a| list_at(&a).map(|l| (a, l))) {
            Some(Ok(far)) => far,
            _ => (cutoff.clone(), list_at(cutoff)?),
        };
        let cutoff = &reach;
        // Exact listings serve every precision.
        let b = if shared.list().is_exact() {
            u32::MAX
        } else {
            bits
        };
        let mut store = lock();
        // Keep the wider of this listing and one another core stored
        // meanwhile.
        let wider = store
            .as_ref()
            .is_none_or(|(c, sb, ..)| cutoff >= c && b >= *sb);
        if wider {
            *store = Some((cutoff.clone(), b, shared.clone(), outgrown));
        }
        drop(store);
        Ok(shared)
    }
}

impl<'a> Cached<'a> {
    /// Wraps `inner`.
    pub fn new(inner: &'a dyn Spectrum) -> Self {
        let parts = match inner.structure() {
            Structure::Parts(ps) => {
                Some(ps.into_iter().map(|(p, f)| (Cached::new(p), f)).collect())
            }
            _ => None,
        };
        Cached {
            inner,
            store: std::sync::Arc::new(std::sync::Mutex::new(None)),
            parts,
            ladders: std::sync::Arc::new(std::sync::Mutex::new(None)),
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
        self.levels_within_bits(cutoff, budget, 0)
    }
    fn levels_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &crate::spectrum::Budget,
        bits: u32,
    ) -> Result<crate::level::LevelList> {
        Ok(self.shared(cutoff, budget, bits)?.list().truncated(cutoff))
    }
    fn summands_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &crate::spectrum::Budget,
        bits: u32,
    ) -> Result<std::sync::Arc<crate::spectrum::Summands>> {
        self.shared(cutoff, budget, bits)
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
    fn structure(&self) -> Structure<'_> {
        match &self.parts {
            Some(ps) => Structure::Parts(
                ps.iter()
                    .map(|(c, f)| (c as &dyn Spectrum, f.clone()))
                    .collect(),
            ),
            None => self.inner.structure(),
        }
    }
    fn highest_energy(&self) -> Option<BigRational> {
        self.inner.highest_energy()
    }
    fn growth_exponent(&self) -> Option<f64> {
        self.inner.growth_exponent()
    }
    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        self.inner.warnings(cutoff)
    }
    fn poly_ladders(
        &self,
        cutoff: &BigRational,
        budget: &crate::spectrum::Budget,
    ) -> Option<Result<Vec<crate::spectrum::PolyLadder>>> {
        let lock = || {
            self.ladders
                .lock()
                .unwrap_or_else(std::sync::PoisonError::into_inner)
        };
        let (stored, outgrown) = match lock().as_ref() {
            Some((c, l, n)) => {
                if cutoff <= c {
                    (Some(l.clone()), 0)
                } else {
                    (None, n + 1)
                }
            }
            None => (None, 0),
        };
        let ladders = match stored {
            Some(l) => l,
            None => {
                // As the listings: ahead of a rising sweep once outgrown
                // twice, falling back to the cutoff itself.
                let ahead = (outgrown >= 2).then(|| {
                    let e0 = self.inner.ground_energy();
                    &e0 + (cutoff - &e0) * BigRational::new(3.into(), 2.into())
                });
                let far = ahead.and_then(|a| match self.inner.poly_ladders(&a, budget) {
                    Some(Ok(l)) => Some((a, l)),
                    _ => None,
                });
                let (reach, list) = match far {
                    Some(f) => f,
                    None => match self.inner.poly_ladders(cutoff, budget)? {
                        Ok(l) => (cutoff.clone(), l),
                        Err(e) => return Some(Err(e)),
                    },
                };
                let list = std::sync::Arc::new(list);
                let mut store = lock();
                if store.as_ref().is_none_or(|(c, ..)| reach >= *c) {
                    *store = Some((reach, list.clone(), outgrown));
                }
                list
            }
        };
        Some(Ok(ladders
            .iter()
            .filter_map(|l| l.truncated(cutoff))
            .collect()))
    }
}
