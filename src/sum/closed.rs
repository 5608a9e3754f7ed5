//! Closed forms: square ladders (direct for steep ladders, Jacobi's
//! imaginary transformation for shallow ones) and harmonic modes (the
//! geometric series), in ball arithmetic with energies from the ground.

use super::ball::{mag, up_add, up_mul, Ball, RP};
use super::direct::excited_sums;
use super::{check_excitation, ln_target, rational_ball, Stats};
use crate::error::{Error, Result};
use num_rational::BigRational;
use num_traits::ToPrimitive;
use rug::float::Constant;
use rug::{Float, Integer};

fn unbounded(what: &str) -> Error {
    Error::invalid(what, "at this temperature", "its sums could not be bounded")
}

/// One ladder `x = a n²`, n ≥ 1, at reduced step `a = w/kT`.
pub(crate) fn squares(a: &BigRational, prec: u32) -> Result<Stats> {
    let af = a.to_f64().unwrap_or(f64::INFINITY);
    check_excitation(3.0 * af, "the box")?;
    let a_b = rational_ball(a, prec);
    let big_l = -ln_target(prec) + 40.0;
    if af >= 1.0 {
        direct_squares(a_b, af, big_l, prec)
    } else {
        theta_squares(a_b, af, big_l, prec)
    }
    .ok_or_else(|| unbounded("box"))
}

/// Direct sum over n ≥ 2 of the excitations x = a(n² − 1): for a ≥ 1 a few
/// terms suffice.
fn direct_squares(a: Ball, af: f64, big_l: f64, prec: u32) -> Option<Stats> {
    // Terms until a(n² − 1) > 3a + L; the neighbour ratio of x^k e^{−x}
    // beyond is at most (8/3)² e^{−7} < 1/100, so each omitted tail is at
    // most twice its first term, and that is below e^{−L} of the first
    // excited term.
    let n_max = (((big_l + 3.0 * af) / af + 1.0).sqrt().ceil() as u64).max(3);
    let x_next = af * ((n_max + 1) * (n_max + 1) - 1) as f64;
    let tails = [0, 1, 2]
        .map(|k| Float::with_val(RP, -x_next).exp() * Float::with_val(RP, 2.0 * x_next.powi(k)));
    let terms = (2..=n_max).map(|n| (Float::with_val(prec, &a.c * (n * n - 1)), Integer::from(1)));
    let [e, m1, m2] = excited_sums(terms, tails, prec);
    Stats::from_excitations(&Integer::from(1), &e, &m1, &m2, a)
}

/// Through Σ_{n∈Z} e^{−an²} = sqrt(π/a) Σ_{m∈Z} e^{−π²m²/a} and its first
/// two derivatives in a.
fn theta_squares(a: Ball, af: f64, big_l: f64, prec: u32) -> Option<Stats> {
    let pi = Float::with_val(prec, Constant::Pi);
    let pi2 = Float::with_val(prec, &pi * &pi);
    // Dual terms m ≥ 1 until π²m²/a exceeds L plus room for the polynomial
    // prefactors (c/a²)²; beyond it the ratio of neighbours is at most
    // e^{−3π²/a} < 1e-12, so the remainder is below twice the first omitted.
    let room = big_l + 8.0 * (1.0 + 1.0 / af).ln() + 20.0;
    let m_max = ((af * room).sqrt() / std::f64::consts::PI).ceil() as u64 + 1;
    let inv_a = Float::with_val(prec, a.c.recip_ref());
    let pref = Float::with_val(prec, &pi * &inv_a).sqrt(); // sqrt(π/a)
    let inv_a2 = Float::with_val(prec, &inv_a * &inv_a);
    // For h_m = sqrt(π/a) e^{−c/a}: d/da multiplies it by (c/a² − 1/(2a));
    // the second derivative by that squared plus (1/(2a²) − 2c/a³).
    let mut g = [Float::new(prec), Float::new(prec), Float::new(prec)];
    let mut abs = [0f64; 3];
    for m in 0..=m_max {
        let c = Float::with_val(prec, &pi2 * (m * m));
        let e = Float::with_val(prec, -(Float::with_val(prec, &c * &inv_a))).exp();
        let h = Float::with_val(prec, &pref * &e) * if m == 0 { 1u32 } else { 2u32 };
        let c_a2 = Float::with_val(prec, &c * &inv_a2);
        let d1 = Float::with_val(prec, &c_a2 - Float::with_val(prec, &inv_a / 2u32));
        let d2 = Float::with_val(prec, &d1 * &d1) + Float::with_val(prec, &inv_a2 / 2u32)
            - Float::with_val(prec, &c_a2 * &inv_a) * 2u32;
        let t = [
            h.clone(),
            Float::with_val(prec, &h * &d1),
            Float::with_val(prec, &h * &d2),
        ];
        for k in 0..3 {
            abs[k] += t[k].to_f64().abs();
            g[k] += &t[k];
        }
    }
    // Each term carries at most (c/a + 16) units of relative error, and the
    // sums (m_max + 2) more; the truncated dual terms add at most
    // 2 sqrt(π/a) e^{−room} (1 + room)² (1 + 1/a)² to each sum.
    let units = Float::with_val(RP, (room + m_max as f64 + 20.0) * 4.0) >> prec;
    let trunc = Float::with_val(RP, -room).exp()
        * Float::with_val(RP, 2.0 * (1.0 + room).powi(2) * (1.0 + 1.0 / af).powi(2))
        * mag(&pref);
    let ball = |v: &Float, s: f64| Ball {
        c: v.clone(),
        r: up_add(&up_mul(&Float::with_val(RP, s * 1.01), &units), &trunc),
    };
    let [g0, g1, g2] = [
        ball(&g[0], abs[0]),
        ball(&g[1], abs[1]),
        ball(&g[2], abs[2]),
    ];
    // S0 = Σ_{n≥1} e^{−an²} = (G − 1)/2, S1 = Σ n² e^{−an²} = −G'/2,
    // S2 = Σ n⁴ e^{−an²} = G''/2.
    let one = Ball::exact(Float::with_val(prec, 1));
    let s0 = g0.sub(&one).div_int(2);
    let s1 = g1.neg().div_int(2);
    let s2 = g2.div_int(2);
    // With x = a(n² − 1): q' = S0 e^{a}, ⟨x⟩ = a S1/S0 − a,
    // Cv/k = a² (S2/S0 − (S1/S0)²).
    let mean_n2 = s1.div(&s0)?;
    let un = a.mul(&mean_n2);
    let mu = un.sub(&a);
    let cv = a.mul(&a).mul(&s2.div(&s0)?).sub(&un.mul(&un));
    let ln_qx = s0.ln()?.add(&a);
    Some(Stats {
        ln_qx,
        mu,
        cv,
        shift: a,
    })
}

/// One harmonic mode of quantum `y = ω/kT` and degeneracy `d`: with
/// t = e^{−y}, ln q' = −d ln(1 − t), ⟨x⟩ = d y t/(1 − t),
/// Cv/k = d y² t/(1 − t)², each relative to itself however small t is.
pub(crate) fn harmonic(y: &BigRational, d: u32, zero_point: bool, prec: u32) -> Result<Stats> {
    let yf = y.to_f64().unwrap_or(f64::INFINITY);
    check_excitation(yf, "the oscillator")?;
    let yb = rational_ball(y, prec);
    let t = yb.neg().exp().ok_or_else(|| unbounded("oscillator"))?;
    let one = Ball::exact(Float::with_val(prec, 1));
    // 1 − e^{−y}: for small y through expm1 (its derivative e^{−y} ≤ 1
    // carries y's error over unamplified).
    let om = if yf < 0.5 {
        let v = Float::with_val(prec, Float::with_val(prec, -&yb.c).exp_m1_ref()) * -1i32;
        Ball::rounded(v, yb.r.clone())
    } else {
        one.sub(&t)
    };
    let ln_1 = if yf >= 1.0 { t.neg().ln_1p() } else { om.ln() }
        .ok_or_else(|| unbounded("oscillator"))?
        .neg();
    let ratio = t.div(&om).ok_or_else(|| unbounded("oscillator"))?; // 1/(e^y − 1)
    let mean1 = yb.mul(&ratio);
    let cv1 = mean1
        .mul(&yb)
        .div(&om)
        .ok_or_else(|| unbounded("oscillator"))?;
    let d64 = d as u64;
    let shift = if zero_point {
        yb.mul_int(d64).div_int(2)
    } else {
        Ball::exact(Float::new(prec))
    };
    Ok(Stats {
        ln_qx: ln_1.mul_int(d64),
        mu: mean1.mul_int(d64),
        cv: cv1.mul_int(d64),
        shift,
    })
}
