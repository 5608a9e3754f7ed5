//! The arc sums of the hull walk against independent counts: the column
//! walk and the definition itself.

use proptest::prelude::*;
use zsum::counting::arc::{floor_sqrt_sum, floor_sqrt_sum_walk, MAX_RADIUS_SQUARED};
use zsum::exact::isqrt_u64;

/// Σ_{x=lo}^{hi} floor(sqrt(r − x²)) by asking, for every x and every y,
/// whether x² + y² ≤ r: the definition itself.
fn arc_brute(r: u64, lo: u64, hi: u64) -> u64 {
    (lo..=hi)
        .map(|x| (1..).take_while(|y| x * x + y * y <= r).count() as u64)
        .sum()
}

#[test]
fn arc_sums_match_the_definition_on_every_range_of_small_arcs() {
    // Every r up to 1200 and every range of columns, including the last
    // column where the arc meets the axis and ranges past the 45° point.
    for r in 0u64..=1200 {
        let top = isqrt_u64(r);
        for lo in 0..=top {
            for hi in lo..=top {
                let want = arc_brute(r, lo, hi);
                assert_eq!(
                    floor_sqrt_sum_walk(r, lo, hi),
                    want as u128,
                    "walk r {r} [{lo}, {hi}]"
                );
                assert_eq!(
                    floor_sqrt_sum(r, lo, hi),
                    Some(want as u128),
                    "hull r {r} [{lo}, {hi}]"
                );
            }
        }
    }
}

#[test]
fn arc_sums_refuse_what_they_cannot_hold() {
    // An empty range is empty; a column beyond the arc or a radius beyond
    // 2^62 is refused rather than wrapped.
    assert_eq!(floor_sqrt_sum(50, 4, 3), Some(0));
    assert_eq!(floor_sqrt_sum_walk(50, 4, 3), 0);
    assert_eq!(floor_sqrt_sum(50, 0, 8), None);
    assert_eq!(floor_sqrt_sum(MAX_RADIUS_SQUARED + 1, 0, 0), None);
    // The largest radius, whole octant: 2^31 columns would take seconds by
    // the walk, so check both ends of it and the join in the middle.
    let r = MAX_RADIUS_SQUARED;
    let hi = isqrt_u64(r / 2);
    let whole = floor_sqrt_sum(r, 0, hi).unwrap();
    let cut = hi / 2;
    let parts = floor_sqrt_sum(r, 0, cut).unwrap() + floor_sqrt_sum(r, cut + 1, hi).unwrap();
    assert_eq!(whole, parts);
    for (lo, hi) in [
        (0, 50_000),
        (hi - 50_000, hi),
        (isqrt_u64(r) - 1000, isqrt_u64(r)),
    ] {
        assert_eq!(
            floor_sqrt_sum(r, lo, hi),
            Some(floor_sqrt_sum_walk(r, lo, hi))
        );
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    /// Random radii up to 2^62 and random ranges of up to 2·10^5 columns
    /// anywhere on the arc, against the column walk.
    #[test]
    fn arc_sums_match_the_walk_on_random_ranges(
        bits in 0u32..=62,
        frac in 0.0f64..1.0,
        start in 0.0f64..1.0,
        len in 0u64..200_000,
    ) {
        let r = ((1u64 << bits) as f64 * (1.0 + frac)).min(MAX_RADIUS_SQUARED as f64) as u64;
        let top = isqrt_u64(r);
        let lo = (top as f64 * start) as u64;
        let hi = lo.saturating_add(len).min(top);
        prop_assert_eq!(floor_sqrt_sum(r, lo, hi), Some(floor_sqrt_sum_walk(r, lo, hi)));
    }
}
