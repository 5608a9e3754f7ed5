//! Weighted least squares of a model's constants to assigned term values,
//! solved exactly in rationals.
