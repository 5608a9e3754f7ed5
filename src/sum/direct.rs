//! Direct summation over listed levels, with the tail bound described in the
//! module docs of [`crate::sum`].

use super::Stats;
use crate::error::{Error, Result};
use crate::spectrum::Spectrum;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use rug::{Float, Integer, Rational};

/// An exact rational as an MPFR-ready rational.
pub(crate) fn to_rug(r: &BigRational) -> Rational {
    let conv = |b: &BigInt| {
        let (sign, digits) = b.to_u32_digits();
        let i = Integer::from_digits(&digits, rug::integer::Order::Lsf);
        if sign == num_bigint::Sign::Minus {
            -i
        } else {
            i
        }
    };
    Rational::from((conv(r.numer()), conv(r.denom())))
}

/// ln of the tail bound Σ_j B(X_{j+1}) X_{j+1}^k e^{−X_j} for k = 0, 1, 2,
/// where `count(x)` bounds the states with reduced energy ≤ x above the
/// ground; `None` entries are −∞ (no tail).
fn tail_bounds(count: &dyn Fn(f64) -> f64, x_c: f64, p: f64, ln_eps: f64) -> [f64; 3] {
    let mut out = [f64::NEG_INFINITY; 3];
    let lse = |a: f64, b: f64| -> f64 {
        if a == f64::NEG_INFINITY {
            return b;
        }
        if b == f64::NEG_INFINITY {
            return a;
        }
        let m = a.max(b);
        m + ((a - m).exp() + (b - m).exp()).ln()
    };
    let mut x_j = x_c;
    let mut last_ln_b = 0.0;
    for j in 0..64 {
        let x_next = 2.0 * x_j;
        let b = count(x_next).max(1.0);
        last_ln_b = b.ln();
        for (k, o) in out.iter_mut().enumerate() {
            let t = last_ln_b + k as f64 * x_next.ln() - x_j;
            *o = lse(*o, t);
        }
        x_j = x_next;
        // Stop once this interval's terms are far below the target: later
        // ones fall faster still.
        let newest = last_ln_b + 2.0 * (2.0 * x_j).ln().max(0.0) - x_j / 2.0;
        if j >= 1 && newest < ln_eps - 60.0 || x_j > 1e12 {
            break;
        }
    }
    // The rest: B grows at most like 4·2^p per doubling; the next term is
    // then at most that, and the series beyond falls faster than halving, so
    // it adds at most twice the next term.
    let x_next = 2.0 * x_j;
    for (k, o) in out.iter_mut().enumerate() {
        let t = (2.0f64 * 4.0).ln() + p * 2f64.ln() + last_ln_b + k as f64 * x_next.ln() - x_j;
        *o = lse(*o, t);
    }
    out
}

/// The weighted sum, mean and central second moment of terms `w_i` at
/// reduced energies `x_i` (two passes: the mean first, then Σ w (x − μ)²,
/// so nothing cancels).
pub(crate) fn moments(xs: &[Float], ws: &[Float], prec: u32) -> (Float, Float, Float) {
    let mut s0 = Float::new(prec);
    let mut s1 = Float::new(prec);
    for (x, w) in xs.iter().zip(ws) {
        s1 += Float::with_val(prec, w * x);
        s0 += w;
    }
    let mu = Float::with_val(prec, &s1 / &s0);
    let mut s2 = Float::new(prec);
    for (x, w) in xs.iter().zip(ws) {
        let d = Float::with_val(prec, x - &mu);
        s2 += Float::with_val(prec, &d * &d) * w;
    }
    let var = Float::with_val(prec, &s2 / &s0);
    (s0, mu, var)
}

/// Direct sum of a spectrum's levels at inverse temperature `beta`. The
/// cutoff widens until the tail bound is small against every result, not
/// only against q: at low temperature Cv/k can be far smaller than the
/// tail's share of q.
pub(crate) fn stats(s: &dyn Spectrum, beta: &BigRational, eps: f64, prec: u32) -> Result<Stats> {
    let mut x_min = 0.0;
    for _ in 0..12 {
        let (st, x_c) = stats_from(s, beta, eps, prec, x_min)?;
        let small = |err: f64, v: &rug::Float| err <= eps * v.to_f64().abs();
        if x_c == 0.0 || (small(st.err_cv, &st.cv) && small(st.err_u, &st.u)) {
            return Ok(st);
        }
        x_min = 2.0 * x_c;
    }
    stats_from(s, beta, eps, prec, x_min).map(|(st, _)| st)
}

/// One direct sum with the cutoff at least `x_min` (in units of kT above
/// the ground); returns the stats and the cutoff used (0 for a finite
/// spectrum summed completely).
fn stats_from(
    s: &dyn Spectrum,
    beta: &BigRational,
    eps: f64,
    prec: u32,
    x_min: f64,
) -> Result<(Stats, f64)> {
    let mut x_used = 0.0;
    let e0 = s.ground_energy();
    let beta_f = beta.to_f64().unwrap_or(f64::INFINITY);
    let (levels, ln_tail) = match s.highest_energy() {
        Some(top) => (s.levels_up_to(&top)?, [f64::NEG_INFINITY; 3]),
        None => {
            let p = s.growth_exponent().ok_or_else(|| {
                Error::invalid(
                    "spectrum",
                    s.describe(),
                    "it has neither a highest level nor a growth exponent for its counting \
                     bound, so the truncated tail cannot be bounded",
                )
            })?;
            // Start where e^{-x} alone is far below eps, then widen until the
            // tail bound is small enough.
            let mut x_c = (-(eps.ln()) + 10.0 + 2.0 * p).max(x_min);
            loop {
                let width = BigRational::from_float(x_c / beta_f).ok_or_else(|| {
                    Error::invalid(
                        "temperature",
                        "for this spectrum",
                        "kT is too small or too large to form a cutoff",
                    )
                })?;
                let cutoff = &e0 + width;
                let count = |x: f64| -> f64 {
                    match BigRational::from_float(x / beta_f) {
                        Some(w) => s.tail_bound(&(&e0 + w)).to_f64().unwrap_or(f64::INFINITY),
                        None => f64::INFINITY,
                    }
                };
                let t = tail_bounds(&count, x_c, p, eps.ln());
                // q' ≥ ground degeneracy ≥ 1.
                if t[0] < eps.ln() - 2.0 && t[2] < eps.ln() - 2.0 || x_c > 1e7 {
                    if x_c > 1e7 {
                        return Err(Error::budget(format!(
                            "the tail of {} cannot be bounded below the requested error at this \
                             temperature",
                            s.describe()
                        )));
                    }
                    x_used = x_c;
                    break (s.levels_up_to(&cutoff)?, t);
                }
                x_c *= 1.5;
            }
        }
    };
    if levels.is_empty() {
        return Err(Error::invalid(
            "spectrum",
            s.describe(),
            "it has no levels to sum",
        ));
    }
    let beta_r = Float::with_val(prec, &to_rug(beta));
    let mut xs = Vec::with_capacity(levels.len());
    let mut ws = Vec::with_capacity(levels.len());
    let mut x_max = 0f64;
    for l in levels.iter() {
        let de = &l.energy - &e0;
        let x = Float::with_val(prec, &to_rug(&de)) * &beta_r;
        let g = Integer::from_digits(&l.degeneracy.to_u32_digits(), rug::integer::Order::Lsf);
        let w = Float::with_val(prec, -&x).exp() * &g;
        x_max = x_max.max(x.to_f64());
        xs.push(x);
        ws.push(w);
    }
    let (s0, mu, var) = moments(&xs, &ws, prec);
    // Error bounds.
    let n = levels.len() as f64;
    let ulp = 2f64.powi(-(prec as i32));
    let round_rel = (x_max + 8.0 + n) * ulp * 2.0;
    let q0 = s0.to_f64();
    let m = mu.to_f64();
    let v = var.to_f64();
    let t0 = ln_tail[0].exp() / q0;
    let t1 = ln_tail[1].exp() / q0;
    let t2 = ln_tail[2].exp() / q0;
    let err_mu = t1 + m * t0 + round_rel * (m + 1.0);
    let err_var = 4.0 * (t2 + 2.0 * m * t1 + m * m * t0 + v * t0)
        + err_mu * err_mu
        + round_rel * (v + m * m * ulp);
    let shift = Float::with_val(prec, &to_rug(&e0)) * &beta_r;
    let ln_q = Float::with_val(prec, s0.ln_ref()) - &shift;
    let u = Float::with_val(prec, &mu + &shift);
    let shift_err = shift.to_f64().abs() * ulp * 4.0;
    Ok((
        Stats {
            ln_q,
            u,
            cv: var,
            err_ln_q: t0 + round_rel + shift_err,
            err_u: err_mu + shift_err,
            err_cv: err_var,
        },
        x_used,
    ))
}
