//! Direct summation over listed levels, with the tail bound described in the
//! module docs of [`crate::sum`].

use super::ball::Ball;
use super::convert::{big, to_rug};
use super::{check_excitation, ln_target, rational_ball, Stats};
use crate::error::{Error, Result};
use crate::spectrum::Spectrum;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use rug::{Float, Integer, Rational};

/// a + b as an unreduced ratio over the product of the (positive)
/// denominators: the same value, compared and converted exactly as the
/// reduced one, without the gcd that dominates a reduced sum of a model's
/// energy and a binary fraction (formed several times per temperature).
fn unreduced_sum(a: &BigRational, b: &BigRational) -> BigRational {
    BigRational::new_raw(
        a.numer() * b.denom() + b.numer() * a.denom(),
        a.denom() * b.denom(),
    )
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

/// Direct sum of a spectrum's levels at inverse temperature `beta`, at
/// working precision `prec`: the excitation sums are formed apart from the
/// ground level, their tails bounded relative to the first excited level's
/// term, and the cutoff widens until the tail bound is small against every
/// result (at low temperature Cv/k can be far smaller than the tail's share
/// of q). With `ladders`, a spectrum that offers its J ladders
/// ([`Spectrum::poly_ladders`]) is summed along them by recurrence
/// ([`super::poly`]) instead of level by level.
pub(crate) fn stats(
    s: &dyn Spectrum,
    beta: &BigRational,
    prec: u32,
    ladders: bool,
) -> Result<Stats> {
    let mut widen = 1.0;
    for _ in 0..6 {
        let (st, tail_ok) = stats_from(s, beta, prec, widen, ladders)?;
        if tail_ok {
            return Ok(st);
        }
        widen *= 2.0;
    }
    stats_from(s, beta, prec, widen, ladders).map(|(st, _)| st)
}

/// Whether the tails `ln_tail` (absolute, ln) of ⟨x⟩'s and Cv's sums are
/// below the target against those values themselves (they may be far
/// smaller than the tail's share of q at low temperature).
fn tails_small(st: &Stats, ln_tail: &[f64; 3], ln_q: f64, ln_eps: f64) -> bool {
    let ln_of = |b: &Ball| {
        if b.c.is_zero() {
            f64::NEG_INFINITY
        } else {
            Float::with_val(64, b.c.abs_ref()).ln().to_f64()
        }
    };
    let (ln_mu, ln_cv) = (ln_of(&st.mu), ln_of(&st.cv));
    ln_tail[1] - ln_q <= ln_eps + ln_mu && ln_tail[2] - ln_q <= ln_eps + ln_cv
}

/// The reduced first excitation x₁ = (E₁ − E₀)/kT, found by listing ever
/// wider windows (cheap: the counting bound says when a window can hold an
/// excited state). `None` for a spectrum with a single level.
fn first_excitation(
    s: &dyn Spectrum,
    e0: &BigRational,
    beta: &BigRational,
    first: f64,
    ladders: bool,
    prec: u32,
) -> Result<Option<(f64, BigRational)>> {
    let top = s.highest_energy();
    let g0 = s.count_bound(e0);
    // The first window reaches past where the sum's cutoff lands when the
    // first excitation is small against the span (the usual case), so the
    // listing made here is the one the sum truncates; beyond it, widen
    // fourfold while the counting bound says the window holds only the
    // ground level.
    let mut w = first;
    loop {
        let width = BigRational::from_float(w)
            .map(|x| x / beta)
            .ok_or_else(|| {
                Error::invalid("temperature", "for this spectrum", "kT is out of range")
            })?;
        let mut cut = e0 + width;
        let capped = top.as_ref().is_some_and(|t| *t <= cut);
        if capped {
            cut = top.clone().unwrap_or(cut);
        }
        if capped || s.count_bound(&cut) > g0 {
            let e1 = match s
                .poly_ladders(&cut, &crate::spectrum::Budget::default())
                .filter(|_| ladders)
            {
                Some(l) => lowest_above(&l?, e0),
                // At the sum's precision, so that a spectrum of enclosed
                // energies is listed once for both.
                None => {
                    let sm =
                        s.summands_within_bits(&cut, &crate::spectrum::Budget::default(), prec)?;
                    let cut_r = to_rug(&cut);
                    let second = sm.up_to(&cut_r).nth(1).map(|(i, _)| i);
                    second.map(|i| sm.list().levels()[i].energy.clone())
                }
            };
            if let Some(e1) = e1 {
                let x1 = ((&e1 - e0) * beta).to_f64().unwrap_or(f64::INFINITY);
                return Ok(Some((x1, cut)));
            }
            if capped {
                return Ok(None);
            }
        }
        if w > super::MAX_EXCITATION {
            check_excitation(w, &s.describe())?;
        }
        w *= 4.0;
    }
}

/// The lowest energy above `e0` on a rung with states, over `ladders`
/// (energy rises along each ladder), compared on each ladder's integers.
fn lowest_above(ladders: &[crate::spectrum::PolyLadder], e0: &BigRational) -> Option<BigRational> {
    use num_integer::Integer;
    ladders
        .iter()
        .filter_map(|l| {
            // E(J) > e0 ⇔ num(J) > ⌊e0·den⌋.
            let bound = (e0.numer() * &l.denominator).div_floor(e0.denom());
            (l.first..=l.last)
                .filter(|&j| !l.weights[(j % 2) as usize].is_zero())
                .find(|&j| l.numerator(j) > bound)
                .map(|j| l.energy(j))
        })
        .min()
}

/// One direct sum, the cutoff `widen` times further past the first excited
/// level than the tail target needs; returns the stats and whether a tail
/// was cut off.
fn stats_from(
    s: &dyn Spectrum,
    beta: &BigRational,
    prec: u32,
    widen: f64,
    ladders: bool,
) -> Result<(Stats, bool)> {
    let ln_eps = ln_target(prec);
    let e0 = s.ground_energy();
    let beta_f = beta.to_f64().unwrap_or(f64::INFINITY);
    let p = s.growth_exponent();
    let top = s.highest_energy();
    let span = (-ln_eps + 10.0 + 2.0 * p.unwrap_or(0.0)) * widen;
    let (cut, ln_tail) = match (p, &top) {
        (None, None) => {
            return Err(Error::invalid(
                "spectrum",
                s.describe(),
                "it has neither a highest level nor a growth exponent for its counting \
                 bound, so the truncated tail cannot be bounded",
            ))
        }
        (None, Some(t)) => (t.clone(), None),
        (Some(p), _) => match first_excitation(s, &e0, beta, 1.25 * span, ladders, prec)? {
            None => (e0.clone(), None),
            Some((x1, _)) => {
                if x1.is_nan() || x1 > super::MAX_EXCITATION {
                    check_excitation(x1, &s.describe())?;
                }
                // Start where e^{−(x − x₁)} alone is far below the target,
                // then widen until the tail bound is small against the
                // first excited level's term g₁ e^{−x₁} ≥ e^{−x₁}.
                let mut x_c = x1 + span;
                loop {
                    let cutoff = &e0
                        + BigRational::from_float(x_c / beta_f).ok_or_else(|| {
                            Error::invalid(
                                "temperature",
                                "for this spectrum",
                                "kT is too small or too large to form a cutoff",
                            )
                        })?;
                    if let Some(t) = top.as_ref().filter(|t| **t <= cutoff) {
                        break (t.clone(), None);
                    }
                    let count = |x: f64| -> f64 {
                        match BigRational::from_float(x / beta_f) {
                            Some(w) => s
                                .tail_bound(&unreduced_sum(&e0, &w))
                                .to_f64()
                                .unwrap_or(f64::INFINITY),
                            None => f64::INFINITY,
                        }
                    };
                    let t = tail_bounds(&count, x_c, p, ln_eps - x1);
                    let need = ln_eps - x1 - 2.0 + x1.min(1.0).ln().min(0.0) * 2.0;
                    if t[0] < need && t[1] < need && t[2] < need {
                        break (cutoff, Some(t));
                    }
                    if x_c > x1 + 1e7 {
                        return Err(Error::budget(format!(
                            "the tail of {} cannot be bounded below the requested error at \
                             this temperature",
                            s.describe()
                        )));
                    }
                    x_c *= 1.5;
                }
            }
        },
    };
    let t = ln_tail.unwrap_or([f64::NEG_INFINITY; 3]);
    let tails = t.map(|lt| Float::with_val(64, lt).exp());
    let budget = crate::spectrum::Budget::default();
    let by_ladders = match s.poly_ladders(&cut, &budget).filter(|_| ladders) {
        Some(l) => super::poly::ladder_sums(&l?, &e0, beta, prec)?,
        None => None,
    };
    let (g0, [e, m1, m2]) = match by_ladders {
        Some((g0, sums)) => (g0, with_tails(sums, tails)),
        None => {
            let sm = s.summands_within_bits(&cut, &budget, prec)?;
            let cut_r = to_rug(&cut);
            let mut it = sm.up_to(&cut_r);
            let (first, ground) = it.next().ok_or_else(|| {
                Error::invalid("spectrum", s.describe(), "it has no levels to sum")
            })?;
            let listed = &sm.list().levels()[first];
            if listed.energy != e0 || !listed.is_exact() {
                return Err(Error::invalid(
                    "spectrum",
                    s.describe(),
                    "its lowest listed level differs from its ground energy, or is not exact",
                ));
            }
            let beta_r = Float::with_val(prec, &to_rug(beta));
            // The excitation E − E0 exactly in GMP (the levels converted
            // once per listing), then rounded once to the working precision.
            let e0_r = &ground.energy;
            // An enclosed energy moves x by at most β·(half-width).
            let beta_f = beta.to_f64().unwrap_or(f64::INFINITY);
            let terms = it.map(|(_, l)| {
                let excitation = Rational::from(&l.energy - e0_r);
                let x = Float::with_val(prec, &excitation) * &beta_r;
                let shift = l.radius.map_or(0.0, |r| (r * beta_f) * 1.01);
                (x, &l.degeneracy, shift)
            });
            let sums = enclosed_sums(terms, tails, prec).ok_or_else(|| {
                Error::invalid(
                    "spectrum",
                    s.describe(),
                    "an enclosed level is not separated from the ground level at this precision",
                )
            })?;
            (big(&listed.degeneracy), sums)
        }
    };
    if g0 == 0 {
        return Err(Error::invalid(
            "spectrum",
            s.describe(),
            "no listed level lies at its ground energy",
        ));
    }
    let cut = ln_tail.is_some();
    let shift = rational_ball(&(&e0 * beta), prec);
    let st = Stats::from_excitations(&g0, &e, &m1, &m2, shift)
        .ok_or_else(|| Error::invalid("spectrum", s.describe(), "its sums could not be bounded"))?;
    let ok = !cut || tails_small(&st, &t, st.ln_qx.c.to_f64(), ln_eps);
    Ok((st, ok))
}

/// Excitation sums `Σ g e^{−x}`, `Σ g x e^{−x}`, `Σ g x² e^{−x}` over
/// terms `(x, g, d)` with x > 0 given to within 3 units of relative error
/// and, for an energy known only within an enclosure, the true x within
/// `d` of it (d = 0 for exact energies), as balls carrying their rounding
/// and enclosures (all terms positive: relative to each sum) and the
/// absolute tail bounds `tails`.
///
/// For x* within d of x, `x*^k e^{−x*}` differs from `x^k e^{−x}` by at
/// most a relative `(1 + d/(x − d))^k e^d − 1 ≤ s + s²` with `s = k d/(x −
/// d) + d` when s ≤ 1/2; each sum takes the largest such bound of its
/// terms. An enclosure reaching down to the ground (x ≤ 2d) or too wide
/// for that bound makes the sum unbounded (`None`).
pub(crate) fn enclosed_sums<G: std::borrow::Borrow<Integer>>(
    terms: impl Iterator<Item = (Float, G, f64)>,
    tails: [Float; 3],
    prec: u32,
) -> Option<[Ball; 3]> {
    let (mut e, mut m1, mut m2) = (Float::new(prec), Float::new(prec), Float::new(prec));
    let mut w = Float::new(prec);
    let mut x_max = 0f64;
    let mut n = 0usize;
    let mut spread = [0f64; 3];
    for (x, g, d) in terms {
        if d > 0.0 {
            let xf = x.to_f64();
            // NaN fails too.
            if xf.partial_cmp(&(2.0 * d)) != Some(std::cmp::Ordering::Greater) {
                return None;
            }
            for (k, sp) in spread.iter_mut().enumerate() {
                let s = k as f64 * d / (xf - d) + d;
                if s.is_nan() || s > 0.5 {
                    return None;
                }
                *sp = sp.max((s + s * s) * 1.01);
            }
        }
        use rug::Assign;
        w.assign(-&x);
        w.exp_mut();
        w *= g.borrow();
        e += &w;
        w *= &x;
        m1 += &w;
        w *= &x;
        m2 += &w;
        x_max = x_max.max(x.to_f64());
        n += 1;
    }
    // x carries at most 3 units of relative error, so e^{−x} at most 3x + 1
    // and each product one more; all terms are positive, so each sum's
    // relative error is at most (3 x_max + n + 16) units.
    let rel = Float::with_val(64, (3.0 * x_max + n as f64 + 16.0) * 1.01) >> prec;
    let mut k = 0;
    let sums = [e, m1, m2].map(|v| {
        let r = super::ball::up_add(&rel, &Float::with_val(64, spread[k]));
        k += 1;
        Ball::with_rel(v, &r)
    });
    Some(with_tails(sums, tails))
}

/// As [`enclosed_sums`] for terms `(x, g)` whose energies are all exact.
pub(crate) fn excited_sums(
    terms: impl Iterator<Item = (Float, Integer)>,
    tails: [Float; 3],
    prec: u32,
) -> [Ball; 3] {
    let zero = || Ball::exact(Float::new(prec));
    // With d = 0 for every term no enclosure can fail.
    enclosed_sums(terms.map(|(x, g)| (x, g, 0.0)), tails, prec)
        .unwrap_or_else(|| [zero(), zero(), zero()])
}

/// The sums' balls widened by the absolute tail bounds.
fn with_tails(sums: [Ball; 3], tails: [Float; 3]) -> [Ball; 3] {
    let mut i = 0;
    sums.map(|mut b| {
        b.r = super::ball::up_add(&b.r, &tails[i]);
        i += 1;
        b
    })
}
