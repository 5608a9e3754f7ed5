//! Certified numbers: what the engine returns. A [`Certified`] value is an
//! MPFR centre with a rigorous bound on its distance to the true value (its
//! radius), so it can be computed with (added, scaled), converted to `f64`
//! or to an interval, and written to any number of digits, each digit
//! proved (Ziv's strategy: the digits are printed only when both ends of
//! the interval round to them).

use super::ball::Ball;
use super::format;
use num_rational::BigRational;
use rug::Float;

/// A real number known to lie within [`Certified::radius`] of
/// [`Certified::value`].
///
/// ```
/// use zsum::models::rotor::LinearRotor;
/// use zsum::sum::{thermo, Temperature};
/// use zsum::units::EnergyUnit;
/// use zsum::exact::parse_rational;
/// let rotor = LinearRotor::rigid(parse_rational("2")?, EnergyUnit::Kelvin)?;
/// let t = thermo(&rotor, &Temperature::Kelvin(parse_rational("300")?), 20)?;
/// // S/k = ln q + U/kT, in ball arithmetic: still certified.
/// let s = t.ln_q.add(&t.u_over_kt);
/// let (lo, hi) = s.interval();
/// assert!(lo <= *t.s_over_k.value() && *t.s_over_k.value() <= hi);
/// assert_eq!(s.decimal(12), t.s_over_k.decimal(12));
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone)]
pub struct Certified(pub(crate) Ball);

impl Certified {
    /// The centre.
    pub fn value(&self) -> &Float {
        &self.0.c
    }

    /// The bound on the distance from the centre to the true value.
    pub fn radius(&self) -> &Float {
        &self.0.r
    }

    /// The centre as the nearest `f64`.
    pub fn to_f64(&self) -> f64 {
        self.0.c.to_f64()
    }

    /// The interval `[lo, hi]` that holds the true value (ends rounded
    /// outward).
    pub fn interval(&self) -> (Float, Float) {
        let prec = self.0.c.prec().max(64);
        let lo = Float::with_val_round(prec, &self.0.c - &self.0.r, rug::float::Round::Down).0;
        let hi = Float::with_val_round(prec, &self.0.c + &self.0.r, rug::float::Round::Up).0;
        (lo, hi)
    }

    /// The value correctly rounded to `digits` significant digits, if the
    /// radius proves that rounding; else `None`.
    pub fn decimal(&self, digits: u32) -> Option<String> {
        match format::ball_decimal(&self.0, digits) {
            (text, true) => Some(text),
            _ => None,
        }
    }

    /// The centre to `digits` significant digits, and whether every value
    /// in the interval rounds to them.
    pub fn decimal_marked(&self, digits: u32) -> (String, bool) {
        format::ball_decimal(&self.0, digits)
    }

    /// Whether the radius proves the rounding to `digits` significant
    /// digits (every value in the interval rounds alike).
    pub fn settles(&self, digits: u32) -> bool {
        format::ball_decimal(&self.0, digits).1
    }

    /// How many leading significant digits, up to `digits`, the radius
    /// proves.
    pub fn proved_digits(&self, digits: u32) -> u32 {
        format::proved_digits(&self.0, digits)
    }

    /// The sum of two certified values, certified.
    pub fn add(&self, other: &Certified) -> Certified {
        Certified(self.0.add(&other.0))
    }

    /// The difference, certified.
    pub fn sub(&self, other: &Certified) -> Certified {
        Certified(self.0.sub(&other.0))
    }

    /// The value times an exact rational, certified.
    pub fn scale(&self, factor: &BigRational) -> Certified {
        Certified(self.0.mul(&super::rational_ball(factor, self.0.prec())))
    }

    /// e raised to the value (for q from ln q), to `digits` significant
    /// digits through its decimal exponent, so values of any size print;
    /// and whether that rounding is proved.
    pub fn exp_decimal(&self, digits: u32) -> (String, bool) {
        format::exp_decimal(&self.0, digits)
    }
}
