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
//! The exact integer `K(J) = den · (E(J) − E(j₀))` is kept by the same
//! difference scheme in checked machine integers (a ladder beyond them is
//! summed level by level instead), and with `x = x₀ + s K`, `s = β/den`,
//! the moments follow from `S_k = Σ g e^{−x} K^k`:
//! `Σ g x e^{−x} = x₀ S₀ + s S₁`, `Σ g x² e^{−x} = x₀² S₀ + 2 x₀ s S₁ + s² S₂`,
//! every term non-negative. When only one parity of J carries states the
//! recurrence steps two rungs at a time; the weights multiply the even and
//! odd sums once per ladder.
//!
//! # Rounding
//! With `u = 2^{1−P}` at working precision P (at least twice MPFR's
//! round-to-nearest bound), the relative error of `f_k(j₀)` is at most
//! `(|y_k| + 1) u` for its exponent `y_k` (rounding y_k, then the
//! exponential); a product adds the errors of its factors and one more
//! unit, so the engine tracks every factor's bound rung by rung (in units
//! of u, in `f64`). Over m rungs f_0 collects at most C(m + d, d) times the
//! largest starting bound; the guard bits keep that below 2^−8 of the
//! target and the neglected products of errors, compounded over every
//! product made, below one part in 10⁶; the final bound takes a margin of
//! 5 % for them and for the `f64` bookkeeping. A term `(2J+1) f_0 K^k` adds
//! 1 + k units (K is exact), the weights 2, forming the moments from x₀ and
//! s at most 8, and each addition of non-negative terms one more.

use super::ball::{Ball, RP};
use super::convert::{big, big_int, to_rug};
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
    let mut a: Vec<Integer> = l.numerators.iter().map(big_int).collect();
    while a.len() > 1 && a.last().is_some_and(|c| c.is_zero()) {
        a.pop();
    }
    let den = big_int(&l.denominator);
    let weights = [big(&l.weights[0]), big(&l.weights[1])];
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
    let d = 2 * (a.len() - 1);
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
    let x0 = beta * (Rational::from(&base) / &den - e0);
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
/// few guard bits more than `prec`. `None` when a ladder's integers
/// leave the machine range (the caller then sums level by level).
pub(crate) fn ladder_sums(
    ladders: &[PolyLadder],
    e0: &BigRational,
    beta: &BigRational,
    prec: u32,
) -> Result<Option<(Integer, [Ball; 3])>> {
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
    let mut t = Float::new(prec_w);
    let new3 = || [Float::new(prec_w), Float::new(prec_w), Float::new(prec_w)];
    for p in &prepared {
        let d = p.diffs.len();
        // K and its differences in machine integers, checked at every step;
        // a ladder beyond i64 is left to the level-by-level sum.
        let Some(mut diffs) = p
            .diffs
            .iter()
            .map(|k| k.to_i64())
            .collect::<Option<Vec<i64>>>()
        else {
            return Ok(None);
        };
        // f[0] = e^{−x(j₀)}, f[k] = e^{−β Δ^k E(j₀)}, with error units e[k].
        let mut f = Vec::with_capacity(d + 1);
        let mut e = Vec::with_capacity(d + 1);
        for y in std::iter::once(p.x0.clone())
            .chain(p.diffs.iter().map(|k| Rational::from(k * &p.scale)))
        {
            let yf = -Float::with_val(prec_w, &y);
            e.push(y.to_f64().abs() * 1.01 + 1.01);
            f.push(yf.exp());
        }
        // Σ (2J+1) e^{−x} K^k over the even and the odd rungs, weighted
        // once at the end.
        let mut acc = [new3(), new3()];
        let mut k_int = 0i64;
        let mut j = p.j0;
        loop {
            let par = (j % 2) as usize;
            if p.weights[par] != 0 {
                let a = &mut acc[par];
                t.assign(&f[0] * (2 * j + 1));
                a[0] += &t;
                t *= k_int;
                a[1] += &t;
                t *= k_int;
                a[2] += &t;
                terms += 1.0;
            }
            if p.last - j < p.stride {
                break;
            }
            j += p.stride;
            // Step every factor and difference one rung, lowest first so
            // that each takes its neighbour's old value.
            if d > 0 {
                let Some(k) = k_int.checked_add(diffs[0]) else {
                    return Ok(None);
                };
                k_int = k;
            }
            for k in 0..d {
                let (lo, hi) = f.split_at_mut(k + 1);
                lo[k] *= &hi[0];
                e[k] += e[k + 1] + 1.0;
                if k + 1 < d {
                    let Some(next) = diffs[k].checked_add(diffs[k + 1]) else {
                        return Ok(None);
                    };
                    diffs[k] = next;
                }
            }
        }
        worst_units = worst_units.max(e[0]);
        // S_k = Σ g e^{−x} K^k, then with x = x(j₀) + s K (both terms
        // non-negative): Σ g x e^{−x} = x₀ S₀ + s S₁ and
        // Σ g x² e^{−x} = x₀² S₀ + 2 x₀ s S₁ + s² S₂.
        let [even, odd] = acc;
        let mut sk = new3();
        for (k, (ev, od)) in even.into_iter().zip(odd).enumerate() {
            sk[k] = ev * &p.weights[0] + od * &p.weights[1];
        }
        let x0 = Float::with_val(prec_w, &p.x0);
        let s = Float::with_val(prec_w, &p.scale);
        let x0s = Float::with_val(prec_w, &x0 * &s);
        sums[0] += &sk[0];
        sums[1] += Float::with_val(prec_w, &x0 * &sk[0]) + Float::with_val(prec_w, &s * &sk[1]);
        let x0x0 = Float::with_val(prec_w, x0.square_ref());
        let ss = Float::with_val(prec_w, s.square_ref());
        sums[2] += Float::with_val(prec_w, &x0x0 * &sk[0])
            + Float::with_val(prec_w, &x0s * &sk[1]) * 2u32
            + Float::with_val(prec_w, &ss * &sk[2]);
    }
    // f_0's bound, one unit for (2J+1) and one per power of the exact K;
    // then 2 for the weights, at most 8 for forming the moments from x₀ and
    // s, and one per addition; the 5 % margin covers the neglected error
    // products and the f64 bookkeeping.
    let ladders_n = prepared.len() as f64;
    let rel_of = |k: f64| {
        let units = (worst_units + 1.0 + k + 2.0 + 8.0) * 1.05 + terms + 4.0 * ladders_n;
        Float::with_val(RP, units) >> (prec_w - 1)
    };
    let [s0, s1, s2] = sums;
    Ok(Some((
        g0,
        [
            Ball::with_rel(s0, &rel_of(0.0)),
            Ball::with_rel(s1, &rel_of(1.0)),
            Ball::with_rel(s2, &rel_of(2.0)),
        ],
    )))
}
