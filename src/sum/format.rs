//! Certified decimal output: a value and its error bound become digits only
//! when both ends of the error interval round to the same digits.

use super::ball::{up_mul, Ball, RP};
use crate::exact::layout_digits;
use rug::float::Round;
use rug::{Float, Integer};

/// `x` to `n` significant digits, rounded by `round`, laid out like every
/// other printed value.
fn text(x: &Float, n: u32, round: Round) -> String {
    let (neg, ds, exp) = x.to_sign_string_exp_round(10, Some(n as usize), round);
    match exp {
        None => "0".to_string(),
        Some(e) => layout_digits(neg, ds.trim_end_matches('\0'), e as i64 - 1, n),
    }
}

/// Rounds `v` to `digits` significant digits (to nearest) and reports
/// whether that rounding is proved: both `v − δ` and `v + δ` (rounded
/// outward), with `δ = abs_err + rel_err·|v|`, give the same digits.
pub fn float_to_decimal(v: &Float, abs_err: f64, rel_err: f64, digits: u32) -> (String, bool) {
    if !(abs_err.is_finite() && rel_err.is_finite()) {
        return (text(v, digits, Round::Nearest), false);
    }
    let mut delta = Float::with_val(RP, v.abs_ref());
    delta *= rel_err;
    delta += abs_err;
    ball_decimal(
        &Ball {
            c: v.clone(),
            r: delta,
        },
        digits,
    )
}

/// The outward-rounded ends of a ball.
fn ends(b: &Ball) -> (Float, Float) {
    let prec = b.c.prec().max(64);
    let lo = Float::with_val_round(prec, &b.c - &b.r, Round::Down).0;
    let hi = Float::with_val_round(prec, &b.c + &b.r, Round::Up).0;
    (lo, hi)
}

/// The centre of `b` to `digits` significant digits, and whether every
/// value in the ball rounds to those digits.
pub(crate) fn ball_decimal(b: &Ball, digits: u32) -> (String, bool) {
    let mid = text(&b.c, digits, Round::Nearest);
    if b.r.is_zero() {
        return (mid, true);
    }
    if !b.r.is_finite() {
        return (mid, false);
    }
    let (lo, hi) = ends(b);
    let same = text(&lo, digits, Round::Nearest) == mid && text(&hi, digits, Round::Nearest) == mid;
    (mid, same)
}

/// The most leading digits, up to `digits`, to which every value in `b`
/// rounds alike (0 if not even one).
pub(crate) fn proved_digits(b: &Ball, digits: u32) -> u32 {
    (1..=digits)
        .rev()
        .find(|&n| ball_decimal(b, n).1)
        .unwrap_or(0)
}

/// `log10(x)` split as an integer exponent and a mantissa ball in [1, 10)
/// (up to rounding), for x = e^{ln_x}; works for any size of ln x.
fn mantissa(ln_x: &Ball) -> Option<(Integer, Ball)> {
    // Enough bits for the integer part of log10 and the mantissa's digits.
    let extra = ln_x.c.get_exp().unwrap_or(0).max(0) as u32;
    let prec = ln_x.prec() + extra + 16;
    let ln10 = Ball::rounded(
        Float::with_val(prec, Float::with_val(prec, 10).ln_ref()),
        Float::new(RP),
    );
    let c = Ball {
        c: Float::with_val(prec, &ln_x.c),
        r: ln_x.r.clone(),
    };
    let l10 = c.div(&ln10)?;
    let k = Float::with_val(prec, l10.c.floor_ref()).to_integer()?;
    let frac = l10.sub(&Ball::exact(Float::with_val(prec, &k)));
    let m = frac.mul(&ln10).exp()?;
    Some((k, m))
}

/// The digits of `m · 10^k` (m a ball near [1, 10)), and whether proved.
fn scaled_decimal(k: &Integer, m: &Ball, digits: u32) -> (String, bool) {
    let show = |x: &Float| -> String {
        let (neg, ds, exp) = x.to_sign_string_exp_round(10, Some(digits as usize), Round::Nearest);
        let e = match exp {
            None => return "0".to_string(),
            Some(e) => Integer::from(k + (e as i64 - 1)),
        };
        let ds = ds.trim_end_matches('\0');
        let (first, rest) = ds.split_at(1);
        let sign = if neg { "-" } else { "" };
        if rest.is_empty() {
            format!("{sign}{first}e{e}")
        } else {
            format!("{sign}{first}.{rest}e{e}")
        }
    };
    let mid = show(&m.c);
    if m.r.is_zero() {
        return (mid, true);
    }
    let (lo, hi) = ends(m);
    (mid.clone(), show(&lo) == mid && show(&hi) == mid)
}

/// Where e^x is printed through its decimal exponent rather than as an
/// MPFR number: well inside MPFR's range, so nothing overflows on the way.
const DIRECT_EXP: f64 = 1e8;

/// e^{ln_x} to `digits` significant digits, correctly rounded however
/// large or small (q = 10^-4e20 prints as well as q = 2.5), and whether
/// proved.
pub(crate) fn exp_decimal(ln_x: &Ball, digits: u32) -> (String, bool) {
    if ln_x.c.to_f64().abs() < DIRECT_EXP {
        if let Some(q) = ln_x.exp() {
            return ball_decimal(&q, digits);
        }
    }
    match mantissa(ln_x) {
        Some((k, m)) => scaled_decimal(&k, &m, digits),
        None => ("nan".into(), false),
    }
}

/// As [`proved_digits`] for e^{ln_x}.
pub(crate) fn proved_exp_digits(ln_x: &Ball, digits: u32) -> u32 {
    (1..=digits)
        .rev()
        .find(|&n| exp_decimal(ln_x, n).1)
        .unwrap_or(0)
}

/// An error radius to three significant digits, rounded up (e.g.
/// `2.52e-66`, or `0` for an exact value); any size.
pub(crate) fn radius_text(r: &Float) -> String {
    if r.is_zero() {
        return "0".into();
    }
    let r = up_mul(r, &Float::with_val(RP, 1));
    let (_, ds, exp) = r.to_sign_string_exp_round(10, Some(3), Round::Up);
    let ds = ds.trim_end_matches('\0');
    match exp {
        Some(e) => format!("{}.{}e{}", &ds[..1], &ds[1..], e as i64 - 1),
        None => "0".into(),
    }
}
