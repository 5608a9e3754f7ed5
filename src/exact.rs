//! Exact decimal input and output, and integer square roots.
//!
//! Parameters enter zsum as text and are read as exact rationals: `"4.0026"`
//! is 40026/10000, `"1e-3"` is 1/1000 and `"27/4"` is 27/4, never a binary
//! float. Output goes the other way: [`format_sig`] rounds an exact rational
//! to a number of significant digits, correctly (round half to even), so every
//! printed digit is a digit of the exact value.

use crate::error::{Error, Result};
use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// Largest decimal exponent accepted in input, to keep a typo such as
/// `1e999999999` from allocating a huge integer.
pub const MAX_DECIMAL_EXPONENT: i64 = 400;

/// `10^n` as a big integer.
pub fn pow10(n: u32) -> BigInt {
    num_traits::pow(BigInt::from(10u8), n as usize)
}

/// Reads an exact rational from text.
///
/// Accepted: an optional sign, digits with an optional decimal point, an
/// optional exponent (`e` or `E`), or a fraction `p/q` of two such numbers.
/// Underscores between digits are ignored.
///
/// ```
/// use zsum::exact::parse_rational;
/// use num_rational::BigRational;
/// assert_eq!(parse_rational("27/4").unwrap(), BigRational::new(27.into(), 4.into()));
/// assert_eq!(parse_rational("-1.5e-3").unwrap(), BigRational::new((-3).into(), 2000.into()));
/// assert!(parse_rational("1.2.3").is_err());
/// ```
pub fn parse_rational(text: &str) -> Result<BigRational> {
    let t = text.trim();
    if let Some((num, den)) = t.split_once('/') {
        let n = parse_decimal(num).map_err(|_| bad_number(text))?;
        let d = parse_decimal(den).map_err(|_| bad_number(text))?;
        if d.is_zero() {
            return Err(Error::invalid(
                "fraction",
                format!("{text:?}"),
                "the denominator must not be zero",
            ));
        }
        return Ok(n / d);
    }
    parse_decimal(t).map_err(|_| bad_number(text))
}

fn bad_number(text: &str) -> Error {
    Error::parse(
        "number",
        text,
        "a decimal such as 2, 0.5, 1.25e-3 or a fraction such as 27/4, written without \
         digit separators such as _",
    )
}

fn parse_decimal(text: &str) -> std::result::Result<BigRational, ()> {
    // No digit separators: `1_000` is refused, everywhere alike.
    let t = text.trim();
    let (neg, body) = match t.as_bytes().first() {
        Some(b'-') => (true, &t[1..]),
        Some(b'+') => (false, &t[1..]),
        _ => (false, t),
    };
    let (mantissa, exponent) = match body.find(['e', 'E']) {
        Some(i) => (&body[..i], Some(&body[i + 1..])),
        None => (body, None),
    };
    let (int_part, frac_part) = match mantissa.split_once('.') {
        Some((a, b)) => (a, b),
        None => (mantissa, ""),
    };
    if int_part.is_empty() && frac_part.is_empty() {
        return Err(());
    }
    if !int_part.bytes().all(|b| b.is_ascii_digit())
        || !frac_part.bytes().all(|b| b.is_ascii_digit())
    {
        return Err(());
    }
    let mut exp: i64 = match exponent {
        None => 0,
        Some(e) => {
            let digits = e.strip_prefix(['+', '-']).unwrap_or(e);
            if digits.is_empty() || !digits.bytes().all(|b| b.is_ascii_digit()) || digits.len() > 6
            {
                return Err(());
            }
            e.parse::<i64>().map_err(|_| ())?
        }
    };
    let digits = format!("{int_part}{frac_part}");
    let mut value: BigInt = digits.parse().map_err(|_| ())?;
    exp -= frac_part.len() as i64;
    if exp.abs() > MAX_DECIMAL_EXPONENT + digits.len() as i64 {
        return Err(());
    }
    if neg {
        value = -value;
    }
    Ok(if exp >= 0 {
        BigRational::from_integer(value * pow10(exp as u32))
    } else {
        BigRational::new(value, pow10((-exp) as u32))
    })
}

/// Writes an exact rational as its shortest text: an integer (`"6"`) or a
/// reduced fraction (`"27/4"`). This is the machine form used in JSON.
pub fn rational_string(r: &BigRational) -> String {
    if r.is_integer() {
        r.numer().to_string()
    } else {
        format!("{}/{}", r.numer(), r.denom())
    }
}

/// Rounds `x` to `digits` significant digits, half to even, and writes it in
/// plain notation where every written digit is significant, scientific
/// notation otherwise.
/// Every digit printed is a correct digit of the exact value.
///
/// ```
/// use zsum::exact::{format_sig, parse_rational};
/// let x = parse_rational("2/3").unwrap();
/// assert_eq!(format_sig(&x, 5), "0.66667");
/// assert_eq!(format_sig(&parse_rational("123456789").unwrap(), 3), "1.23e8");
/// assert_eq!(format_sig(&parse_rational("0.125").unwrap(), 2), "0.12");
/// ```
pub fn format_sig(x: &BigRational, digits: u32) -> String {
    let digits = digits.max(1);
    if x.is_zero() {
        return "0".to_string();
    }
    let neg = x.is_negative();
    let a = x.abs();
    let (m, e) = round_sig(&a, digits);
    layout_digits(neg, &m.to_string(), e, digits)
}

/// Lays out significant `digits` (a string of decimal digits, the first
/// non-zero) of a value `±d.ddd × 10^e` in plain notation when every written
/// digit is significant and at most four leading zeros are needed, else in
/// scientific notation (as C's `%g`).
pub fn layout_digits(neg: bool, digit_str: &str, e: i64, digits: u32) -> String {
    let mut s = digit_str.to_string();
    let out = if (-5..digits as i64).contains(&e) {
        if e >= 0 {
            let int_len = (e + 1) as usize;
            if s.len() <= int_len {
                s.push_str(&"0".repeat(int_len - s.len()));
                s
            } else {
                let frac = s.split_off(int_len);
                format!("{s}.{frac}")
            }
        } else {
            format!("0.{}{}", "0".repeat((-e - 1) as usize), s)
        }
    } else {
        let rest = s.split_off(1);
        if rest.is_empty() {
            format!("{s}e{e}")
        } else {
            format!("{s}.{rest}e{e}")
        }
    };
    if neg {
        format!("-{out}")
    } else {
        out
    }
}

/// Returns `(m, e)` with `10^(digits-1) <= m < 10^digits` and
/// `x ≈ m · 10^(e - digits + 1)`, rounded half to even; `x > 0`.
fn round_sig(x: &BigRational, digits: u32) -> (BigUint, i64) {
    let mut e = decimal_exponent(x);
    loop {
        let shift = digits as i64 - 1 - e;
        let scaled = if shift >= 0 {
            x * BigRational::from_integer(pow10(shift as u32))
        } else {
            x / BigRational::from_integer(pow10((-shift) as u32))
        };
        let m = round_half_even(&scaled);
        let hi = pow10(digits);
        if m >= hi {
            // Rounding carried into a new digit (e.g. 9.99 -> 10.0).
            e += 1;
            continue;
        }
        let m = m.to_biguint().expect("positive");
        return (m, e);
    }
}

/// floor(log10(x)) for x > 0, exactly.
pub fn decimal_exponent(x: &BigRational) -> i64 {
    let n = x.numer().abs();
    let d = x.denom().clone();
    let mut e = n.to_string().len() as i64 - d.to_string().len() as i64;
    // Now 10^(e-1) < x < 10^(e+1); fix up to floor.
    let ten_pow = |k: i64| -> BigRational {
        if k >= 0 {
            BigRational::from_integer(pow10(k as u32))
        } else {
            BigRational::new(BigInt::one(), pow10((-k) as u32))
        }
    };
    let ax = x.abs();
    while ten_pow(e) > ax {
        e -= 1;
    }
    while ten_pow(e + 1) <= ax {
        e += 1;
    }
    e
}

/// Rounds a rational to the nearest integer, ties to even.
pub fn round_half_even(x: &BigRational) -> BigInt {
    let fl = x.floor();
    let frac = x - &fl;
    let half = BigRational::new(BigInt::one(), BigInt::from(2));
    let f = fl.to_integer();
    match frac.cmp(&half) {
        std::cmp::Ordering::Less => f,
        std::cmp::Ordering::Greater => f + 1,
        std::cmp::Ordering::Equal => {
            if f.is_even() {
                f
            } else {
                f + 1
            }
        }
    }
}

/// The integer part of a non-negative rational, as a big unsigned integer.
pub fn floor_nonneg(x: &BigRational) -> BigUint {
    if x.is_negative() {
        return BigUint::zero();
    }
    x.floor()
        .to_integer()
        .to_biguint()
        .unwrap_or_else(BigUint::zero)
}

/// floor(sqrt(n)) for a 64-bit integer, exact.
pub fn isqrt_u64(n: u64) -> u64 {
    let mut r = (n as f64).sqrt() as u64;
    while r.checked_mul(r).is_none_or(|sq| sq > n) {
        r -= 1;
    }
    while (r + 1).checked_mul(r + 1).is_some_and(|sq| sq <= n) {
        r += 1;
    }
    r
}

/// floor(sqrt(n)) for a 128-bit integer, exact.
pub fn isqrt_u128(n: u128) -> u128 {
    if n <= u64::MAX as u128 {
        return isqrt_u64(n as u64) as u128;
    }
    let mut r = (n as f64).sqrt() as u128;
    while r.checked_mul(r).is_none_or(|sq| sq > n) {
        r -= 1;
    }
    while (r + 1).checked_mul(r + 1).is_some_and(|sq| sq <= n) {
        r += 1;
    }
    r
}

/// An upper bound on sqrt(x) for x >= 0, as a rational with denominator
/// `2^bits` (the bound exceeds the root by at most `2^-bits`).
pub fn sqrt_upper(x: &BigRational, bits: u32) -> BigRational {
    if !x.is_positive() {
        return BigRational::zero();
    }
    let scale = BigInt::one() << (2 * bits as usize);
    // ceil(x * 4^bits) then ceil(sqrt(.)).
    let scaled = (x * BigRational::from_integer(scale)).ceil().to_integer();
    let r = scaled.sqrt();
    let r = if &r * &r < scaled { r + 1 } else { r };
    BigRational::new(r, BigInt::one() << bits as usize)
}

/// A rational strictly above π (355/113 exceeds π by 2.7e-7).
pub fn pi_upper() -> BigRational {
    BigRational::new(BigInt::from(355), BigInt::from(113))
}

/// Converts a non-negative rational to `u128` by flooring; `None` if it does
/// not fit.
pub fn floor_to_u128(x: &BigRational) -> Option<u128> {
    floor_nonneg(x).to_u128()
}

/// Writes a rational as an exact decimal when it has one of at most
/// `max_digits` significant digits (denominator a product of 2s and 5s),
/// otherwise as a reduced fraction `p/q`. For people: `"3.99648"`, not
/// `"12489/3125"`.
///
/// ```
/// use zsum::exact::{exact_decimal, parse_rational};
/// assert_eq!(exact_decimal(&parse_rational("12489/3125").unwrap(), 30), "3.99648");
/// assert_eq!(exact_decimal(&parse_rational("1/3").unwrap(), 30), "1/3");
/// assert_eq!(exact_decimal(&parse_rational("-5e-6").unwrap(), 30), "-0.000005");
/// ```
pub fn exact_decimal(x: &BigRational, max_digits: u32) -> String {
    let mut d = x.denom().clone();
    let (two, five) = (BigInt::from(2), BigInt::from(5));
    let mut places = 0u32;
    let (mut twos, mut fives) = (0u32, 0u32);
    while (&d % &two).is_zero() {
        d /= &two;
        twos += 1;
    }
    while (&d % &five).is_zero() {
        d /= &five;
        fives += 1;
    }
    if !d.is_one() {
        return rational_string(x);
    }
    places = places.max(twos).max(fives);
    let scaled = (x * BigRational::from_integer(pow10(places))).to_integer();
    let neg = scaled.is_negative();
    let digits = scaled.abs().to_string();
    if digits.trim_start_matches('0').len() as u32 > max_digits {
        return rational_string(x);
    }
    let p = places as usize;
    let body = if p == 0 {
        digits
    } else if digits.len() > p {
        format!(
            "{}.{}",
            &digits[..digits.len() - p],
            &digits[digits.len() - p..]
        )
    } else {
        format!("0.{}{}", "0".repeat(p - digits.len()), digits)
    };
    if neg {
        format!("-{body}")
    } else {
        body
    }
}

/// An English ordinal: 1st, 2nd, 3rd, 4th, 11th, 21st, ...
///
/// ```
/// use zsum::exact::ordinal;
/// assert_eq!(ordinal(1), "1st");
/// assert_eq!(ordinal(12), "12th");
/// assert_eq!(ordinal(23), "23rd");
/// ```
pub fn ordinal(n: u64) -> String {
    let suffix = match (n % 10, n % 100) {
        (_, 11..=13) => "th",
        (1, _) => "st",
        (2, _) => "nd",
        (3, _) => "rd",
        _ => "th",
    };
    format!("{n}{suffix}")
}

/// An f64 to `digits` significant digits (for messages, not for results).
///
/// ```
/// use zsum::exact::format_sig_f64;
/// assert_eq!(format_sig_f64(4.6e21, 3), "4.60e21");
/// assert_eq!(format_sig_f64(12.5, 3), "12.5");
/// ```
pub fn format_sig_f64(x: f64, digits: u32) -> String {
    match BigRational::from_float(x) {
        Some(r) => format_sig(&r, digits),
        None => format!("{x}"),
    }
}

/// The default number of significant digits of certified values, the same
/// in every command (`--digits`): every printed digit of such a value is
/// right.
pub const DEFAULT_DIGITS: u32 = 10;

/// The default number of significant digits where a command prints values
/// of an approximation evaluated in floating point (the
/// Whitten–Rabinovitch map), which are not certified; the help of such an
/// option says so.
pub const APPROX_DIGITS: u32 = 6;

/// Checks that a digits request is sensible.
pub fn check_digits(digits: u32) -> Result<u32> {
    if (1..=60).contains(&digits) {
        Ok(digits)
    } else {
        Err(Error::invalid(
            "digits",
            digits,
            "choose between 1 and 60 significant digits",
        ))
    }
}

/// An exact integer as a GMP integer (the crate's one door from
/// num-bigint into `rug`).
pub(crate) fn to_rug_int(b: &BigInt) -> rug::Integer {
    let (sign, digits) = b.to_u32_digits();
    let i = rug::Integer::from_digits(&digits, rug::integer::Order::Lsf);
    if sign == num_bigint::Sign::Minus {
        -i
    } else {
        i
    }
}

/// An exact rational as a GMP rational.
pub(crate) fn to_rug(r: &BigRational) -> rug::Rational {
    rug::Rational::from((to_rug_int(r.numer()), to_rug_int(r.denom())))
}

/// A big natural number as a GMP integer.
pub(crate) fn to_rug_uint(b: &BigUint) -> rug::Integer {
    rug::Integer::from_digits(&b.to_u32_digits(), rug::integer::Order::Lsf)
}
