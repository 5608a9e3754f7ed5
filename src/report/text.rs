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

/// A level's energy as printed: exact energies as exact rationals
/// ("27/4"), an energy known only by its certified enclosure as `~` and its
/// decimal correctly rounded to `digits` significant digits, or to as many
/// as the enclosure decides (both ends round alike), never more.
pub fn level_energy_text(l: &crate::level::Level, digits: u32) -> String {
    match &l.enclosure {
        None => crate::exact::rational_string(&l.energy),
        Some(e) => {
            let mut d = digits.max(1);
            loop {
                let lo = crate::exact::format_sig(&e.lo, d);
                if d == 1 || lo == crate::exact::format_sig(&e.hi, d) {
                    return format!("~{lo}");
                }
                d -= 1;
            }
        }
    }
}

/// The working bits at which a listing's enclosed energies decide `digits`
/// significant digits (with a margin for the rounding boundary).
pub fn listing_bits(digits: u32) -> u32 {
    (digits as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 24
}
