//! Serde adapters that write exact numbers as strings: rationals as `"27/4"`,
//! big integers as decimal digits. JSON numbers would lose digits.

use crate::exact::{parse_rational, rational_string};
use num_bigint::BigUint;
use num_rational::BigRational;
use serde::{de::Error as _, Deserialize, Deserializer, Serializer};

/// A `BigRational` as `"p/q"` or `"n"`; also reads decimals (`"0.25"`).
pub mod ratio {
    use super::*;

    /// Writes the rational as a string.
    pub fn serialize<S: Serializer>(r: &BigRational, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&rational_string(r))
    }

    /// Reads the rational from a string.
    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<BigRational, D::Error> {
        let text = String::deserialize(d)?;
        parse_rational(&text).map_err(D::Error::custom)
    }
}

/// An optional `BigRational` as a string or null.
pub mod opt_ratio {
    use super::*;

    /// Writes the rational as a string, or null.
    pub fn serialize<S: Serializer>(r: &Option<BigRational>, s: S) -> Result<S::Ok, S::Error> {
        match r {
            Some(r) => s.serialize_str(&rational_string(r)),
            None => s.serialize_none(),
        }
    }

    /// Reads an optional rational.
    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<Option<BigRational>, D::Error> {
        let text = Option::<String>::deserialize(d)?;
        text.map(|t| parse_rational(&t).map_err(D::Error::custom))
            .transpose()
    }
}

/// A `BigUint` as a decimal string.
pub mod uint {
    use super::*;

    /// Writes the integer as decimal digits.
    pub fn serialize<S: Serializer>(n: &BigUint, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&n.to_str_radix(10))
    }

    /// Reads the integer from decimal digits.
    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<BigUint, D::Error> {
        let text = String::deserialize(d)?;
        text.trim()
            .parse::<BigUint>()
            .map_err(|_| D::Error::custom(format!("expected a non-negative integer, got {text:?}")))
    }
}
