//! The rigid rotor ladder `E = b J(J+1)`, J = 0, 1, ..., with `(2J+1)·w(J
//! mod 2)` states: summed term by term where the ground level may dominate
//! (y = b/kT > 4: excitation sums apart from the ground, each term its
//! own exponential), and by a fixed-point recurrence otherwise.

use super::ball::{up_add, Ball, RP};
use super::convert::{big, to_rug};
use super::direct::excited_sums;
use super::{check_excitation, ln_target, rational_ball, Stats};
use crate::error::{Error, Result};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use rug::{Assign, Float, Integer};

/// Above this y = b/kT the excitations are summed apart from the ground
/// level (there e^{−2y} < 4e-4, so the excited share of q is small); below
/// it the fixed-point recurrence, whose sums are all of order one or more.
const COLD: f64 = 4.0;

/// The most terms the fixed-point recurrence may take (a few seconds).
pub const MAX_LADDER_TERMS: f64 = 5e7;

fn unbounded() -> Error {
    Error::invalid(
        "rotor",
        "at this temperature",
        "its sums could not be bounded",
    )
}

/// ln of the envelope `w_max (2J+1) e^{−x_J} (1+x_J)²` of the omitted terms
/// from J on (it bounds the summands of q', ⟨x⟩ and Cv alike), and its
/// neighbour ratio `ρ_J = e^{−(x_{J+1}−x_J)} (2J+3)/(2J+1) ((1+x_{J+1})/(1+x_J))²`,
/// x measured from the ground rung `base`; every factor of ρ shrinks as J
/// grows, so once ρ_J < 1 the omitted terms sum to at most the envelope
/// over (1 − ρ_J).
fn ln_tail(j: u64, base: u64, y_f: f64, w_max: f64) -> f64 {
    let xn = y_f * (j * (j + 1) - base) as f64;
    let xn1 = y_f * ((j + 1) * (j + 2) - base) as f64;
    let ln_next = (w_max * (2 * j + 1) as f64).ln() - xn + 2.0 * (1.0 + xn).ln();
    let rho = (-(xn1 - xn)).exp() * (2 * j + 3) as f64 / (2 * j + 1) as f64
        * ((1.0 + xn1) / (1.0 + xn)).powi(2);
    if rho < 1.0 {
        ln_next - (1.0 - rho).ln()
    } else {
        f64::INFINITY
    }
}

/// The ladder at reduced rung `y = b/kT` with parity weights `w`.
pub(crate) fn rigid_ladder(y: &BigRational, w: &[BigUint; 2], prec: u32) -> Result<Stats> {
    let y_f = y.to_f64().unwrap_or(f64::INFINITY);
    if w[0].is_zero() && w[1].is_zero() {
        return Err(Error::invalid(
            "rotor",
            "with both parity weights 0",
            "it has no states",
        ));
    }
    if y_f > COLD {
        cold(y, y_f, w, prec)
    } else {
        warm(y, y_f, w, prec)
    }
}

/// y > 4: the ground rung J₀ and excitation sums over J > J₀, each term
/// e^{−y (J(J+1) − J₀(J₀+1))} formed directly (there are few).
fn cold(y: &BigRational, y_f: f64, w: &[BigUint; 2], prec: u32) -> Result<Stats> {
    let j0: u64 = if w[0].is_zero() { 1 } else { 0 };
    let base = j0 * (j0 + 1);
    let allowed = |j: u64| !w[(j % 2) as usize].is_zero();
    let j1 = (j0 + 1..).find(|&j| allowed(j)).unwrap_or(j0 + 1);
    let x1 = y_f * (j1 * (j1 + 1) - base) as f64;
    check_excitation(x1, "the rotor")?;
    let w_max = w[0]
        .to_f64()
        .unwrap_or(f64::MAX)
        .max(w[1].to_f64().unwrap_or(f64::MAX));
    let g1 = ((2 * j1 + 1) as f64 * w[(j1 % 2) as usize].to_f64().unwrap_or(1.0)).ln();
    // Stop where the tail is below the target against the first excited
    // term g₁ e^{−x₁} (x₁ ≥ 1 here, so against its moments too).
    let need = ln_target(prec) + g1 - x1 - 2.0;
    let mut j_end = j1 + 1;
    let tail = loop {
        let t = ln_tail(j_end, base, y_f, w_max);
        if t < need {
            break t;
        }
        j_end += 1;
    };
    let yb = rational_ball(y, prec);
    let terms = (j1..j_end).filter(|&j| allowed(j)).map(|j| {
        let x = Float::with_val(prec, &yb.c * (j * (j + 1) - base));
        let g = big(&w[(j % 2) as usize]) * (2 * j + 1);
        (x, g)
    });
    let t = Float::with_val(RP, tail).exp();
    let [e, m1, m2] = excited_sums(terms, [t.clone(), t.clone(), t], prec);
    let g0 = big(&w[(j0 % 2) as usize]) * (2 * j0 + 1);
    let shift = yb.mul_int(base);
    Stats::from_excitations(&g0, &e, &m1, &m2, shift).ok_or_else(unbounded)
}

/// y ≤ 4, in fixed point: integers scaled by 2^P replace floating point,
/// so each step is a few exact integer operations and two truncating
/// products (`e^{−x_{J+1}} = e^{−x_J} f_J`, `f_{J+1} = f_J e^{−2y}`). The
/// truncation errors are tracked term by term (in f64, inflated) and enter
/// the balls. The work is estimated first and refused beyond
/// [`MAX_LADDER_TERMS`].
fn warm(y: &BigRational, y_f: f64, w: &[BigUint; 2], prec: u32) -> Result<Stats> {
    let ln_eps = ln_target(prec);
    // Terms until y J² passes −ln ε plus room: about sqrt((−ln ε + 40)/y).
    let y_low = Float::with_val(64, &to_rug(y));
    let est = (Float::with_val(64, -ln_eps + 40.0) / &y_low)
        .sqrt()
        .to_f64();
    if est.is_nan() || est > MAX_LADDER_TERMS {
        return Err(Error::budget(format!(
            "the rotor at kT/B = {} needs about {} terms of its ladder, more than the {:e} \
             allowed (a few seconds); at such temperatures the classical expansion q = kT/B + \
             1/3 + ... is exact to far beyond printed digits: see `zsum compare`, or give a \
             lower temperature",
            crate::exact::format_sig(&y.recip(), 3),
            crate::exact::format_sig_f64(est, 2),
            MAX_LADDER_TERMS
        )));
    }
    // The fixed-point unit sits below the target by the growth of the
    // truncation errors (about 1.5 n² units after n terms) and a margin.
    let p = prec + 40 + 2 * (est.max(2.0).log2().ceil() as u32);
    let y_r = Float::with_val(p + 16, &to_rug(y));
    let to_fixed = |x: Float| -> Integer { (x << p).to_integer().unwrap_or_default() };
    let wi: Vec<Integer> = w.iter().map(big).collect();
    let w_max = w[0]
        .to_f64()
        .unwrap_or(f64::MAX)
        .max(w[1].to_f64().unwrap_or(f64::MAX));
    let j0: u64 = if w[0].is_zero() { 1 } else { 0 };
    let base = j0 * (j0 + 1);
    // R = e^{−2y}, F = e^{−2y(J0+1)}, E = 1, all times 2^P; each off by at
    // most 2 units (MPFR's rounding plus the truncation).
    let r_fix = to_fixed(Float::with_val(p + 16, &y_r * -2i32).exp());
    let mut f_fix = to_fixed(Float::with_val(p + 16, &y_r * (-2i64 * (j0 as i64 + 1))).exp());
    let mut e_fix = Integer::from(1) << p;
    let (mut s0, mut s1, mut s2) = (Integer::new(), Integer::new(), Integer::new());
    let (mut d_e, mut d_f) = (0f64, 2f64); // error bounds of E, F in units
    let (mut err0, mut err1, mut err2) = (0f64, 0f64, 0f64);
    let unit = 2f64.powi(-(p as i32));
    let mut a = Integer::new();
    let mut j = j0;
    let unit_weights = wi.iter().all(|g| *g <= 1u32);
    let tail;
    loop {
        let k = j * (j + 1) - base;
        let g = &wi[(j % 2) as usize];
        a.assign(&e_fix * (2 * j + 1));
        if !unit_weights {
            a *= g;
        } else if g.is_zero() {
            a.assign(0u32);
        }
        s0 += &a;
        a *= k;
        s1 += &a;
        a *= k;
        s2 += &a;
        let weight = (2 * j + 1) as f64 * w_max * d_e;
        err0 += weight;
        err1 += weight * k as f64;
        err2 += weight * (k as f64) * (k as f64);
        e_fix *= &f_fix;
        e_fix >>= p;
        d_e += d_f + 1.0;
        f_fix *= &r_fix;
        f_fix >>= p;
        d_f += 3.0;
        j += 1;
        if j % 4 != 0 {
            continue;
        }
        // The envelope with e at its upper bound, against S0 ≥ its ground
        // term: once below the target, stop.
        let e_up = e_fix.to_f64() * unit + d_e * unit;
        let t = ln_tail(j, base, y_f, w_max)
            + (e_up.ln() - (-(y_f * (j * (j + 1) - base) as f64))).max(0.0);
        if j > j0 + 2 && t < ln_eps - 2.0 {
            tail = t.exp();
            break;
        }
        if e_fix.is_zero() {
            return Err(unbounded());
        }
    }
    let to_ball = |i: &Integer, err: f64, t: f64| Ball {
        c: Float::with_val(prec, i) >> p,
        r: up_add(
            &Float::with_val(RP, 2.0 * err * unit),
            &Float::with_val(RP, t),
        ),
    };
    // The envelope bounds x² e^{−x} terms; in rung units k = x/y, S1 and
    // S2's tails are that over y and y².
    let s0b = to_ball(&s0, err0, tail);
    let s1b = to_ball(&s1, err1, tail / y_f);
    let s2b = to_ball(&s2, err2, tail / (y_f * y_f));
    let yb = rational_ball(y, prec);
    let m1 = yb.mul(&s1b);
    let m2 = yb.mul(&yb).mul(&s2b);
    let ln_qx = s0b.ln().ok_or_else(unbounded)?;
    let shift = yb.mul_int(base);
    Stats::from_moments(ln_qx, &s0b, &m1, &m2, shift).ok_or_else(unbounded)
}
