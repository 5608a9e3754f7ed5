//! Exact values from num-bigint and num-rational into GMP/MPFR-ready
//! values: the engine's one door from the public exact types to `rug`.

use num_bigint::BigInt;
use num_rational::BigRational;
use rug::{Integer, Rational};

/// An exact integer as a GMP integer.
pub(crate) fn big_int(b: &BigInt) -> Integer {
    let (sign, digits) = b.to_u32_digits();
    let i = Integer::from_digits(&digits, rug::integer::Order::Lsf);
    if sign == num_bigint::Sign::Minus {
        -i
    } else {
        i
    }
}

/// An exact rational as an MPFR-ready rational.
pub(crate) fn to_rug(r: &BigRational) -> Rational {
    Rational::from((big_int(r.numer()), big_int(r.denom())))
}

/// A big natural number as an MPFR-ready integer.
pub(crate) fn big(b: &num_bigint::BigUint) -> Integer {
    Integer::from_digits(&b.to_u32_digits(), rug::integer::Order::Lsf)
}
