//! Text made from numbers: the few ways zsum writes a number (a value to
//! some digits, a rational as its exact decimal where short, a relative
//! error to four digits) in one place, for every answer to use.

use num_rational::BigRational;
use rug::Float;

/// Writes a relative error to 4 significant digits, or `<1e-37` when it is
/// below what the exact values resolve.
pub fn error_text(e: &Float) -> String {
    if e.is_infinite() {
        return "inf".to_string();
    }
    if e.is_nan() {
        return "n/a".to_string();
    }
    if e.to_f64().abs() < crate::classical::RESOLUTION {
        return format!("<{:e}", crate::classical::RESOLUTION);
    }
    crate::sum::float_to_decimal(e, 0.0, 0.0, 4).0
}

/// A value to `digits` significant digits.
pub fn value_text(v: &Float, digits: u32) -> String {
    crate::sum::float_to_decimal(v, 0.0, 0.0, digits).0
}

/// A rational as its exact decimal when that has at most `digits`
/// significant digits, otherwise rounded to `digits`.
pub fn rational_text(r: &BigRational, digits: u32) -> String {
    let s = crate::exact::exact_decimal(r, digits);
    if s.contains('/') {
        crate::exact::format_sig(r, digits)
    } else {
        s
    }
}

/// `θ = 2.88 K` or `θ = 2 cm-1 = 2.88 K`.
pub fn theta_line(theta: &str, unit: &str, kelvin: &Option<String>) -> String {
    match kelvin {
        Some(k) if unit != "K" => format!("θ = {theta} {unit} = {k} K"),
        _ => format!("θ = {theta} {unit}"),
    }
}
