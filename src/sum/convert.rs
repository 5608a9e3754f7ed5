//! Exact values from num-bigint and num-rational into GMP/MPFR-ready
//! values, under the engine's names (the conversions live in
//! [`crate::exact`], shared with the level lists' GMP form).

pub(crate) use crate::exact::{to_rug, to_rug_int as big_int, to_rug_uint as big};
