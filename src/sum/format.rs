//! Certified decimal output: a value and its error bound become digits only
//! when both ends of the error interval round to the same digits.

use crate::exact::layout_digits;
use rug::float::Round;
use rug::Float;

/// Rounds `v` to `digits` significant digits (to nearest) and reports
/// whether that rounding is proved: both `v − δ` and `v + δ` (rounded
/// outward), with `δ = abs_err + rel_err·|v|`, give the same digits.
pub fn float_to_decimal(v: &Float, abs_err: f64, rel_err: f64, digits: u32) -> (String, bool) {
    let prec = v.prec().max(64);
    let n = digits as usize;
    let text = |x: &Float, round: Round| -> String {
        let (neg, ds, exp) = x.to_sign_string_exp_round(10, Some(n), round);
        match exp {
            None => "0".to_string(),
            Some(e) => layout_digits(neg, ds.trim_end_matches('\0'), e as i64 - 1, digits),
        }
    };
    let mid = text(v, Round::Nearest);
    if abs_err == 0.0 && rel_err == 0.0 {
        return (mid, true);
    }
    if !(abs_err.is_finite() && rel_err.is_finite()) {
        return (mid, false);
    }
    let mut delta = Float::with_val(prec, v.abs_ref());
    delta *= rel_err;
    delta += abs_err;
    let lo = Float::with_val_round(prec, v - &delta, Round::Down).0;
    let hi = Float::with_val_round(prec, v + &delta, Round::Up).0;
    // Both ends must round to the same digits as the middle.
    let same = text(&lo, Round::Nearest) == mid && text(&hi, Round::Nearest) == mid;
    (mid, same)
}
