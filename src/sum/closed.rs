//! Closed forms and fast paths: square ladders (Jacobi's imaginary
//! transformation) and harmonic modes (geometric series).

use super::direct::to_rug;
use super::Stats;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use rug::float::Constant;
use rug::Float;

fn ulp(prec: u32) -> f64 {
    2f64.powi(-(prec as i32))
}

/// One ladder `x = a n²`, n ≥ 1, at reduced step `a = w/kT`.
pub(crate) fn squares(a: &BigRational, eps: f64, prec: u32) -> Stats {
    let af = a.to_f64().unwrap_or(f64::INFINITY);
    let a_r = Float::with_val(prec, &to_rug(a));
    let big_l = -eps.ln() + 40.0;
    if af >= 1.0 {
        direct_squares(&a_r, af, big_l, prec)
    } else {
        theta_squares(&a_r, af, big_l, prec)
    }
}

/// Direct sum over n of e^{−a(n²−1)}: for a ≥ 1 a few terms suffice.
fn direct_squares(a: &Float, af: f64, big_l: f64, prec: u32) -> Stats {
    // Terms until a(n²−1) > L; the next term and everything after it (the
    // ratio of neighbours is at most e^{−3a} < 1/20) add at most twice the
    // first omitted term times its x², below e^{−L}·(L+...)² relative.
    let n_max = ((big_l / af + 1.0).sqrt().ceil() as u64).max(2);
    let mut xs = Vec::new();
    let mut ws = Vec::new();
    for n in 1..=n_max {
        let x = Float::with_val(prec, a * (n * n - 1));
        let w = Float::with_val(prec, -&x).exp();
        xs.push(x);
        ws.push(w);
    }
    let (s0, mu, var) = super::direct::moments(&xs, &ws, prec);
    let x_next = af * ((n_max + 1) * (n_max + 1) - 1) as f64;
    let tail = 2.0 * (-x_next).exp() * (1.0 + x_next) * (1.0 + x_next);
    let rel = (n_max as f64 + big_l + 8.0) * ulp(prec) * 2.0;
    let m = mu.to_f64();
    let v = var.to_f64();
    let ln_q = Float::with_val(prec, s0.ln_ref()) - a;
    let u = Float::with_val(prec, &mu + a);
    Stats {
        ln_q,
        u,
        cv: var,
        err_ln_q: tail + rel + af * ulp(prec),
        err_u: tail * (1.0 + m) + rel * (1.0 + m),
        err_cv: 4.0 * tail * (1.0 + m) * (1.0 + m) + rel * (v + 1e-300),
    }
}

/// Through Σ_{n∈Z} e^{−an²} = sqrt(π/a) Σ_{m∈Z} e^{−π²m²/a} and its first
/// two derivatives in a.
fn theta_squares(a: &Float, af: f64, big_l: f64, prec: u32) -> Stats {
    let pi = Float::with_val(prec, Constant::Pi);
    let pi2 = Float::with_val(prec, &pi * &pi);
    // Dual terms m ≥ 1 until π²m²/a exceeds L plus room for the polynomial
    // prefactors (c/a²)²; beyond it the ratio of neighbours is at most
    // e^{−π²/a} < 1e-4, so the remainder is below twice the first omitted.
    let room = big_l + 8.0 * (1.0 + 1.0 / af).ln() + 20.0;
    let m_max = ((af * room).sqrt() / std::f64::consts::PI).ceil() as u64 + 1;
    let inv_a = Float::with_val(prec, a.recip_ref());
    let pref = Float::with_val(prec, &pi * &inv_a).sqrt(); // sqrt(π/a)
                                                           // For h_m = e^{−c/a} (times sqrt(π/a)): d/da of sqrt(π/a) e^{−c/a} is
                                                           // that times (−1/(2a) + c/a²); the second derivative adds
                                                           // (1/(2a²) − 2c/a³).
    let mut g0 = Float::new(prec);
    let mut g1 = Float::new(prec);
    let mut g2 = Float::new(prec);
    for m in 0..=m_max {
        let c = Float::with_val(prec, &pi2 * (m * m));
        let e = Float::with_val(prec, -(Float::with_val(prec, &c * &inv_a))).exp();
        let h = Float::with_val(prec, &pref * &e) * if m == 0 { 1u32 } else { 2u32 };
        let c_a2 = Float::with_val(prec, &c * &inv_a) * &inv_a;
        let d1 = Float::with_val(prec, &c_a2 - Float::with_val(prec, &inv_a / 2u32));
        let inv_a2 = Float::with_val(prec, &inv_a * &inv_a);
        let d2 = Float::with_val(prec, &d1 * &d1) + Float::with_val(prec, &inv_a2 / 2u32)
            - Float::with_val(prec, &c_a2 * &inv_a) * 2u32;
        g1 += Float::with_val(prec, &h * &d1);
        g2 += Float::with_val(prec, &h * &d2);
        g0 += h;
    }
    // S0 = Σ_{n≥1} e^{−an²} = (G−1)/2, S1 = Σ n² e^{−an²} = −G'/2,
    // S2 = Σ n⁴ e^{−an²} = G''/2.
    let s0 = Float::with_val(prec, &g0 - 1u32) / 2u32;
    let s1 = Float::with_val(prec, -&g1) / 2u32;
    let s2 = Float::with_val(prec, &g2 / 2u32);
    let mean_n2 = Float::with_val(prec, &s1 / &s0);
    let u = Float::with_val(prec, a * &mean_n2);
    let second = Float::with_val(prec, &s2 / &s0) * Float::with_val(prec, a * a);
    let cv = Float::with_val(prec, &second - Float::with_val(prec, &u * &u));
    let ln_q = Float::with_val(prec, s0.ln_ref());
    // Errors: truncation of the dual series (relative to the m = 0 term,
    // which is at least sqrt(π)) and rounding, amplified by G/(G−1) in S0
    // and by the cancellation in Cv.
    let trunc = 2.0 * (-room).exp();
    let g = g0.to_f64();
    let amp = g / (g - 1.0);
    let rel = (m_max as f64 + 40.0) * ulp(prec) * amp * 4.0 + trunc * amp * (1.0 + 1.0 / (af * af));
    let uf = u.to_f64();
    let sec = second.to_f64();
    Stats {
        ln_q,
        u,
        cv,
        err_ln_q: rel,
        err_u: 3.0 * rel * uf.abs(),
        err_cv: 6.0 * rel * (sec + uf * uf),
    }
}

/// One harmonic mode of quantum `y = ω/kT` and degeneracy `d`.
pub(crate) fn harmonic(y: &BigRational, d: u32, zero_point: bool, prec: u32) -> Stats {
    let y_r = Float::with_val(prec, &to_rug(y));
    let neg_y = Float::with_val(prec, -&y_r);
    let e = Float::with_val(prec, neg_y.exp_ref()); // e^{−y}, may underflow to 0
    let one_minus = Float::with_val(prec, neg_y.exp_m1_ref()) * -1i32; // 1 − e^{−y}
    let ln_q1 = Float::with_val(prec, one_minus.ln_ref()) * -1i32;
    let ratio = Float::with_val(prec, &e / &one_minus); // 1/(e^y − 1)
    let mean1 = Float::with_val(prec, &y_r * &ratio);
    // Cv/k per component: y² e^{−y}/(1 − e^{−y})².
    let cv1 = Float::with_val(prec, &mean1 * &mean1) / &e;
    let cv1 = if e.is_zero() { Float::new(prec) } else { cv1 };
    let half = if zero_point {
        Float::with_val(prec, &y_r * d) / 2u32
    } else {
        Float::new(prec)
    };
    let ln_q = Float::with_val(prec, &ln_q1 * d) - &half;
    let u = Float::with_val(prec, &mean1 * d) + &half;
    let cv = Float::with_val(prec, &cv1 * d);
    let r = 32.0 * ulp(prec);
    Stats {
        err_ln_q: r * (ln_q.to_f64().abs() + half.to_f64() + 1.0),
        err_u: r * (u.to_f64().abs() + 1.0),
        err_cv: r * (cv.to_f64() + 1e-300),
        ln_q,
        u,
        cv,
    }
}

/// The first omitted envelope term `w_max (2J+1) e (1+x_J)²` of the rigid
/// ladder and the envelope's neighbour ratio
/// `ρ_J = f (2J+3)/(2J+1) ((1+x_{J+1})/(1+x_J))²`, where `e = e^{−x_J}` and
/// `f = e^{−(x_{J+1}−x_J)}` (relative to the ground rung `base`).
fn envelope(e: f64, f: f64, j: u64, base: u64, y_f: f64, w_max: f64) -> (f64, f64) {
    let xn = y_f * (j * (j + 1) - base) as f64;
    let xn1 = y_f * ((j + 1) * (j + 2) - base) as f64;
    let next = e * (2 * j + 1) as f64 * w_max * (1.0 + xn) * (1.0 + xn);
    let rho = f * (2 * j + 3) as f64 / (2 * j + 1) as f64 * ((1.0 + xn1) / (1.0 + xn)).powi(2);
    (next, rho)
}

/// The ladder `x = y J(J+1)` with `(2J+1)·w(J mod 2)` states, by recurrence.
pub(crate) fn rigid_ladder(
    y: &BigRational,
    w: &[num_bigint::BigUint; 2],
    eps: f64,
    prec: u32,
) -> Stats {
    use num_traits::Zero;
    let y_f = y.to_f64().unwrap_or(f64::INFINITY);
    let y_r = Float::with_val(prec, &to_rug(y));
    let w_float: Vec<Float> = w
        .iter()
        .map(|g| {
            Float::with_val(
                prec,
                &rug::Integer::from_digits(&g.to_u32_digits(), rug::integer::Order::Lsf),
            )
        })
        .collect();
    let wf = |j: u64| -> &Float { &w_float[(j % 2) as usize] };
    let w_max = w[0]
        .to_f64()
        .unwrap_or(f64::MAX)
        .max(w[1].to_f64().unwrap_or(f64::MAX));
    let j0: u64 = if w[0].is_zero() { 1 } else { 0 };
    let r2 = Float::with_val(prec, Float::with_val(prec, &y_r * -2i32).exp_ref());
    // f = e^{−(x_{J+1} − x_J)} = e^{−2y(J+1)}, starting at J0.
    let mut f = Float::with_val(
        prec,
        Float::with_val(prec, &y_r * (-2i64 * (j0 as i64 + 1))).exp_ref(),
    );
    let mut e = Float::with_val(prec, 1u32); // e^{−(x_J − x_J0)}
                                             // One pass with integer moments: with k = J(J+1) − J0(J0+1) and x = y k,
                                             // S0 = Σ t, S1 = Σ t k, S2 = Σ t k², so μ = y S1/S0 and
                                             // σ² = y² (S2/S0 − (S1/S0)²). The subtraction costs at most a few bits
                                             // here (k starts at 0 with the largest weight at low T, and spreads
                                             // like an exponential at high T); the error bound below charges it in
                                             // full.
    use rug::Assign;
    let mut s0 = Float::new(prec);
    let mut s1 = Float::new(prec);
    let mut s2 = Float::new(prec);
    let mut t = Float::new(prec);
    let base = j0 * (j0 + 1);
    let target = eps * 1e-3;
    let mut j = j0;
    let unit_weights =
        w[0] <= num_bigint::BigUint::from(1u8) && w[1] <= num_bigint::BigUint::from(1u8);
    let mut n_terms = 0u64;
    let tail;
    loop {
        let k = j * (j + 1) - base;
        if unit_weights {
            if !w[(j % 2) as usize].is_zero() {
                t.assign(&e * (2 * j + 1));
            } else {
                t.assign(0u32);
            }
        } else {
            t.assign(&e * (2 * j + 1));
            t *= wf(j);
        }
        s0 += &t;
        t *= k;
        s1 += &t;
        t *= k;
        s2 += &t;
        n_terms += 1;
        // Next term.
        e *= &f;
        f *= &r2;
        j += 1;
        // The envelope w_max (2n+1) e^{−x_n} (1+x_n)² of the omitted terms
        // (it bounds the summands of q', μ and σ² alike) falls from n to
        // n+1 by ρ_n = f_n · (2n+3)/(2n+1) · ((1+x_{n+1})/(1+x_n))², and every
        // factor shrinks as n grows; once ρ_J < 1 the tail is at most the
        // first omitted envelope term over (1 − ρ_J).
        let (next, rho) = envelope(e.to_f64(), f.to_f64(), j, base, y_f, w_max);
        if j > j0 + 2 && rho < 1.0 && next / (1.0 - rho) < target * s0.to_f64() {
            tail = next / (1.0 - rho) / s0.to_f64();
            break;
        }
        if e.is_zero() {
            tail = 0.0;
            break;
        }
    }
    let m1 = Float::with_val(prec, &s1 / &s0);
    let m2 = Float::with_val(prec, &s2 / &s0);
    let var_k = Float::with_val(prec, &m2 - Float::with_val(prec, &m1 * &m1));
    let mu = Float::with_val(prec, &m1 * &y_r);
    let var = Float::with_val(prec, &var_k * Float::with_val(prec, &y_r * &y_r));
    let n = n_terms as f64;
    let x_max = y_f * (j * (j + 1) - base) as f64;
    let rel = (3.0 * n + 20.0) * (1.0 + x_max) * ulp(prec) * 2.0;
    // Rounding in σ² is relative to the two terms subtracted, not to σ².
    let second = m2.to_f64() * y_f * y_f;
    let shift = Float::with_val(prec, &y_r * base);
    let m = mu.to_f64();
    let v = var.to_f64();
    Stats {
        ln_q: Float::with_val(prec, s0.ln_ref()) - &shift,
        u: Float::with_val(prec, &mu + &shift),
        cv: var,
        err_ln_q: tail + rel + shift.to_f64() * ulp(prec) * 4.0,
        err_u: tail * (1.0 + m) + rel * (1.0 + m) + shift.to_f64() * ulp(prec) * 4.0,
        err_cv: 4.0 * tail * (1.0 + m) * (1.0 + m) + 4.0 * rel * (second + m * m) + v * rel,
    }
}

/// The rigid ladder in fixed point, for `y = θ/T ≤ 1/2`, where every term
/// that matters is far above the fixed-point unit: integers scaled by 2^P
/// replace floating point, so each step is a few exact integer operations
/// and two truncating products. The truncation errors are tracked term by
/// term (in f64, inflated) and enter the bounds; the result is then
/// certified like any other.
pub(crate) fn rigid_ladder_fixed(
    y: &BigRational,
    w: &[num_bigint::BigUint; 2],
    eps: f64,
    prec: u32,
) -> Option<Stats> {
    use num_traits::Zero;
    use rug::Integer;
    let y_f = y.to_f64()?;
    if !(y_f > 0.0 && y_f <= 0.5) {
        return None;
    }
    let p = prec + 24; // with prec ≥ 64 guard bits, P fits four 64-bit limbs at 50 digits
    let y_r = Float::with_val(p + 16, &to_rug(y));
    let to_fixed = |x: Float| -> Integer {
        let scaled = x << p;
        scaled.to_integer().unwrap_or_default()
    };
    let wi: Vec<Integer> = w
        .iter()
        .map(|g| Integer::from_digits(&g.to_u32_digits(), rug::integer::Order::Lsf))
        .collect();
    let w_max = w[0].to_f64()?.max(w[1].to_f64()?);
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
    let target = eps; // the tail bound itself enters the error interval
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
        // E ← E·F / 2^P, F ← F·R / 2^P (truncating; one more unit each).
        e_fix *= &f_fix;
        e_fix >>= p;
        d_e += d_f + 1.0;
        f_fix *= &r_fix;
        f_fix >>= p;
        d_f += 3.0;
        j += 1;
        // Test for the end every fourth term (summing a few more is harmless).
        if j % 4 != 0 {
            continue;
        }
        let e = e_fix.to_f64() * unit;
        let f = f_fix.to_f64() * unit;
        // As in the floating-point ladder, with e and f at their upper bounds.
        let (next, rho) = envelope(e + d_e * unit, f + d_f * unit, j, base, y_f, w_max);
        let s0_f = s0.to_f64() * unit;
        if j > j0 + 2 && rho < 1.0 && next / (1.0 - rho) < target * s0_f {
            tail = next / (1.0 - rho) / s0_f;
            break;
        }
        if e_fix.is_zero() || j > 100_000_000 {
            return None;
        }
    }
    use rug::Assign;
    let to_float = |i: &Integer| Float::with_val(prec, i) >> p;
    let (f0, f1, f2) = (to_float(&s0), to_float(&s1), to_float(&s2));
    let y_w = Float::with_val(prec, &to_rug(y));
    let m1 = Float::with_val(prec, &f1 / &f0);
    let m2 = Float::with_val(prec, &f2 / &f0);
    let var_k = Float::with_val(prec, &m2 - Float::with_val(prec, &m1 * &m1));
    let mu = Float::with_val(prec, &m1 * &y_w);
    let var = Float::with_val(prec, &var_k * Float::with_val(prec, &y_w * &y_w));
    // Relative errors of S0, S1, S2 from the truncations (inflated 2×),
    // plus the final divisions.
    let q0 = f0.to_f64();
    let r0 = 2.0 * err0 * unit / q0;
    let r1 = 2.0 * err1 * unit / f1.to_f64().max(f64::MIN_POSITIVE);
    let r2 = 2.0 * err2 * unit / f2.to_f64().max(f64::MIN_POSITIVE);
    let u = ulp(prec) * 16.0;
    let rel_mu = r0 + r1 + u;
    let second = m2.to_f64() * y_f * y_f;
    let m = mu.to_f64();
    let v = var.to_f64();
    let shift = Float::with_val(prec, &y_w * base);
    Some(Stats {
        ln_q: Float::with_val(prec, f0.ln_ref()) - &shift,
        u: Float::with_val(prec, &mu + &shift),
        cv: var,
        err_ln_q: tail + r0 + u + shift.to_f64() * u,
        err_u: tail * (1.0 + m) + rel_mu * m.abs() + shift.to_f64() * u,
        err_cv: 4.0 * tail * (1.0 + m) * (1.0 + m)
            + (r0 + r2 + u) * second
            + 2.0 * (r0 + r1 + u) * m * m
            + v * u,
    })
}
