//! Excitation sums along J ladders whose energies are a polynomial in
//! n = J(J+1) ([`PolyLadder`]): the vibrating rotor's ladder in each v.
//!
//! Along one ladder `x(J) = β (E(J) − E₀)` is a polynomial of degree d in
//! J, so its d-th forward difference is constant and the Boltzmann factors
//! follow from d products per rung instead of one exponential:
//!
//! ```text
//! f_0(J) = e^{−x(J)},  f_k(J) = e^{−β Δ^k E(J)} (k = 1..d),
//! f_k(J+1) = f_k(J) · f_{k+1}(J),   f_d constant.
//! ```
//!
//! The differences `Δ^k E(j₀)` are exact integers over the ladder's common
//! denominator, so each factor starts from one rounding of an exact value.
//! `x(J)` itself, needed for ⟨x⟩ and Cv, is formed from the exact integer
//! `K(J) = den · (E(J) − E(j₀))`, kept by the same difference scheme in
//! integers: `x = x(j₀) + (β/den) K`, a sum of two non-negative terms.
//!
//! # Rounding
//! With `u = 2^{1−P}` at working precision P (at least twice MPFR's
//! round-to-nearest bound), the relative error of `f_k(j₀)` is at most
//! `(|y_k| + 1) u` for its exponent `y_k` (rounding y_k, then the
//! exponential); a product adds the errors of its factors and one more
//! unit, so the engine tracks every factor's bound rung by rung (in units
//! of u, in `f64`). The guard bits keep every bound below `2^−30`, where
//! the neglected products of errors add less than one part in 10⁸ over the
//! longest ladder; the final bound takes a margin of 5 % for them and for
//! the `f64` bookkeeping. `x` carries at most 5 units (two exact-value
//! roundings, a product and a sum of non-negative terms, and converting K).
//! A term `g f_0 x^k` adds `k (5 + 1) + 2` units to `f_0`'s, and adding n
//! positive terms costs at most n − 1 more units of the sum.

use super::ball::{Ball, RP};
use super::direct::to_rug;
use crate::error::{Error, Result};
use crate::spectrum::PolyLadder;
use num_rational::BigRational;
use rug::{Assign, Float, Integer, Rational};

/// One ladder made ready: its exact start and integer difference table.
struct Prepared {
    /// The first rung with states above the ground energy.
    j0: u64,
    last: u64,
    /// 2 when only one parity of J has states (the recurrence then steps
    /// over the empty rungs), else 1.
    stride: u64,
    /// x(j₀) = β (E(j₀) − E₀), exactly.
    x0: Rational,
    /// β/den, exactly.
    scale: Rational,
    /// Δ^k K(j₀) for k = 1..=d (K(j₀) = 0).
    diffs: Vec<Integer>,
    weights: [Integer; 2],
}

/// The exact energy numerator over `den` at rung j: Σ a_k n^k.
fn numerator(a: &[Integer], j: u64) -> Integer {
    let n = Integer::from(j) * (Integer::from(j) + 1u32);
    let mut e = Integer::new();
    for c in a.iter().rev() {
        e *= &n;
        e += c;
    }
    e
}

/// Prepares `l` against the ground energy `e0`, adding the states lying
/// exactly at `e0` to `g0`; `None` when no rung with states lies above it.
fn prepare(
    l: &PolyLadder,
    e0: &Rational,
    beta: &Rational,
    g0: &mut Integer,
) -> Result<Option<Prepared>> {
    let mut coeffs: Vec<Rational> = l.coeffs.iter().map(to_rug).collect();
    while coeffs.len() > 1 && coeffs.last().is_some_and(|c| c.is_zero()) {
        coeffs.pop();
    }
    let mut den = Integer::from(1);
    for c in &coeffs {
        den.lcm_mut(c.denom());
    }
    let a: Vec<Integer> = coeffs
        .iter()
        .map(|c| Integer::from(c.numer() * Integer::from(&den / c.denom())))
        .collect();
    let weights = [
        super::direct::big(&l.weights[0]),
        super::direct::big(&l.weights[1]),
    ];
    let e0_num = Rational::from(e0 * &den);
    let stride = if weights[0] == 0 || weights[1] == 0 {
        2
    } else {
        1
    };
    let mut j0 = l.first;
    while j0 <= l.last {
        // A rung without states is no level: it may lie below the ground.
        if weights[(j0 % 2) as usize] == 0 {
            j0 += 1;
            continue;
        }
        let n = Rational::from(numerator(&a, j0));
        match n.cmp(&e0_num) {
            std::cmp::Ordering::Less => {
                return Err(Error::invalid(
                    "spectrum",
                    "with a rung below its ground energy",
                    "its ladders must lie at or above the ground level",
                ))
            }
            std::cmp::Ordering::Equal => {
                *g0 += Integer::from(2 * j0 + 1) * &weights[(j0 % 2) as usize];
                j0 += stride;
            }
            std::cmp::Ordering::Greater => break,
        }
    }
    if j0 > l.last {
        return Ok(None);
    }
    let d = 2 * (coeffs.len() - 1);
    // K(j₀ + i·stride) for i = 0..=d (a polynomial of degree d in i),
    // then its forward differences at j₀.
    let base = numerator(&a, j0);
    let mut table: Vec<Integer> = (0..=d as u64)
        .map(|i| numerator(&a, j0 + i * stride) - &base)
        .collect();
    let mut diffs = Vec::with_capacity(d);
    for k in 1..=d {
        for i in 0..=(d - k) {
            let next = table[i + 1].clone();
            table[i] = next - &table[i];
        }
        diffs.push(table[0].clone());
    }
    let x0 = Rational::from(beta * (Rational::from(&base) / &den - e0));
    let scale = Rational::from(beta / &den);
    Ok(Some(Prepared {
        j0,
        last: l.last,
        stride,
        x0,
        scale,
        diffs,
        weights,
    }))
}

/// The binomial coefficient C(m + d, d) in floating point (an upper bound
/// on how many times an initial error is added into f_0 over m rungs).
fn growth(m: f64, d: usize) -> f64 {
    (1..=d).fold(1.0, |acc, k| acc * (m + k as f64) / k as f64)
}

/// Ground degeneracy and the excitation sums `Σ g e^{−x}`, `Σ g x e^{−x}`,
/// `Σ g x² e^{−x}` over every rung of `ladders` above `e0`, at inverse
/// temperature `beta`, to a relative error far below `2^−prec` (the balls'
/// radii bound it; add the truncated tails separately). The sums come at a
/// few guard bits more than `prec`.
pub(crate) fn ladder_sums(
    ladders: &[PolyLadder],
    e0: &BigRational,
    beta: &BigRational,
    prec: u32,
) -> Result<(Integer, [Ball; 3])> {
    let (e0, beta) = (to_rug(e0), to_rug(beta));
    let mut g0 = Integer::new();
    let mut prepared = Vec::with_capacity(ladders.len());
    for l in ladders {
        if let Some(p) = prepare(l, &e0, &beta, &mut g0)? {
            prepared.push(p);
        }
    }
    // Guard bits: the largest error bound any factor can reach (`worst`
    // units) stays below 2^−8 of the target 2^−prec, and the neglected
    // products of errors, at most 3·worst·u per product compounded over
    // every product made, below 2^−20.
    let (mut worst, mut products) = (1f64, 1f64);
    for p in &prepared {
        let m = ((p.last - p.j0) / p.stride + 1) as f64;
        let d = p.diffs.len();
        let mut start = p.x0.to_f64().abs() * 1.01 + 1.01;
        for k in &p.diffs {
            start = start.max((Rational::from(k * &p.scale)).to_f64().abs() * 1.01 + 1.01);
        }
        worst = worst.max(growth(m, d) * (start + 2.0));
        products += m * (d as f64 + 3.0);
    }
    if !(worst * products).is_finite() {
        return Err(Error::budget(
            "a rotational ladder is too long to sum by recurrence".to_string(),
        ));
    }
    let mut prec_w = prec + worst.log2().ceil() as u32 + 8;
    while 3.0 * worst * products * 2f64.powi(1 - prec_w as i32) > 2f64.powi(-20) {
        prec_w += 8;
    }
    let mut sums = [Float::new(prec_w), Float::new(prec_w), Float::new(prec_w)];
    let mut worst_units = 0f64;
    let mut terms = 0f64;
    let (mut t, mut x, mut ak) = (Float::new(prec_w), Float::new(prec_w), Float::new(prec_w));
    for p in &prepared {
        let d = p.diffs.len();
        // f[0] = e^{−x(j₀)}, f[k] = e^{−β Δ^k E(j₀)}, with error units e[k].
        let mut f = Vec::with_capacity(d + 1);
        let mut e = Vec::with_capacity(d + 1);
        let x0 = Float::with_val(prec_w, &p.x0);
        for y in std::iter::once(p.x0.clone())
            .chain(p.diffs.iter().map(|k| Rational::from(k * &p.scale)))
        {
            let yf = -Float::with_val(prec_w, &y);
            e.push(y.to_f64().abs() * 1.01 + 1.01);
            f.push(yf.exp());
        }
        let scale = Float::with_val(prec_w, &p.scale);
        let mut diffs = p.diffs.clone();
        let mut k_int = Integer::new();
        let mut j = p.j0;
        loop {
            let w = &p.weights[(j % 2) as usize];
            if *w != 0 {
                // x = x(j₀) + (β/den) K(J).
                ak.assign(&k_int);
                ak *= &scale;
                x.assign(&x0 + &ak);
                t.assign(&f[0] * (2 * j + 1));
                if *w != 1 {
                    t *= w;
                }
                sums[0] += &t;
                t *= &x;
                sums[1] += &t;
                t *= &x;
                sums[2] += &t;
                terms += 1.0;
            }
            if p.last - j < p.stride {
                break;
            }
            j += p.stride;
            // Step every factor and difference one rung, lowest first so
            // that each takes its neighbour's old value.
            if d > 0 {
                k_int += &diffs[0];
            }
            for k in 0..d {
                let (lo, hi) = f.split_at_mut(k + 1);
                lo[k] *= &hi[0];
                e[k] += e[k + 1] + 1.0;
                if k + 1 < d {
                    let (lo, hi) = diffs.split_at_mut(k + 1);
                    lo[k] += &hi[0];
                }
            }
        }
        worst_units = worst_units.max(e[0]);
    }
    // f_0's bound, then x's 5 units and a product per power, 2 for the
    // degeneracy; the 5 % margin covers the neglected error products and
    // the f64 bookkeeping.
    let rel_of = |k: f64| {
        let units = (worst_units + 2.0 + k * 6.0) * 1.05 + terms;
        Float::with_val(RP, units) >> (prec_w - 1)
    };
    let [s0, s1, s2] = sums;
    Ok((
        g0,
        [
            Ball::with_rel(s0, &rel_of(0.0)),
            Ball::with_rel(s1, &rel_of(1.0)),
            Ball::with_rel(s2, &rel_of(2.0)),
        ],
    ))
}
