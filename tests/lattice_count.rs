//! The sub-linear cube counter and the arc sums it is built on, against
//! independent counts: the column walk, the wedge walk it replaces, plain
//! loops over every lattice point, and OEIS A005875.

use proptest::prelude::*;
use zsum::counting::arc::{floor_sqrt_sum, floor_sqrt_sum_walk, MAX_RADIUS_SQUARED};
use zsum::counting::lattice::{count_cube, count_cube_walk};
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

#[test]
fn the_cube_count_matches_the_wedge_walk_for_every_cutoff_to_5000() {
    for m in 0..=5000u64 {
        assert_eq!(count_cube(m), count_cube_walk(m), "m = {m}");
    }
}

/// How many positive (x, y, z) have x² + y² + z² = n, for every n ≤ limit,
/// by a plain triple loop over the cube of side sqrt(limit).
fn positive_triples_at(limit: u64) -> Vec<u64> {
    let s = isqrt_u64(limit);
    let mut at = vec![0u64; limit as usize + 1];
    for x in 1..=s {
        for y in 1..=s {
            for z in 1..=s {
                let n = x * x + y * y + z * z;
                if n <= limit {
                    at[n as usize] += 1;
                }
            }
        }
    }
    at
}

#[test]
fn the_cube_count_matches_a_triple_loop_for_every_cutoff_to_20000() {
    let at = positive_triples_at(20_000);
    let mut total = 0u64;
    for (m, k) in at.iter().enumerate() {
        total += k;
        assert_eq!(count_cube(m as u64), total as u128, "m = {m}");
    }
}

/// r3(n), OEIS A005875: ordered triples of integers, zero and signs
/// allowed, with x² + y² + z² = n, by a triple loop over [-s, s]³.
fn r3_brute(limit: u64) -> Vec<u64> {
    let s = isqrt_u64(limit) as i64;
    let mut r3 = vec![0u64; limit as usize + 1];
    for x in -s..=s {
        for y in -s..=s {
            for z in -s..=s {
                let n = (x * x + y * y + z * z) as u64;
                if n <= limit {
                    r3[n as usize] += 1;
                }
            }
        }
    }
    r3
}

#[test]
fn oeis_a005875_terms_from_memory_match_the_brute_force() {
    // r3(0..=20) (OEIS A005875, from memory).
    let terms = [
        1u64, 6, 12, 8, 6, 24, 24, 0, 12, 30, 24, 24, 8, 24, 48, 0, 6, 48, 36, 24, 24,
    ];
    assert_eq!(r3_brute(20), terms);
    // Its partial sums at squares are the points in a ball of radius k:
    // 1, 7, 33, 123, 257, 515 (OEIS A000605, from memory).
    let r3 = r3_brute(25);
    let ball = |m: usize| r3[..=m].iter().sum::<u64>();
    assert_eq!([0, 1, 4, 9, 16, 25].map(ball), [1, 7, 33, 123, 257, 515]);
}

/// Σ_{n≤m} r3(n) from the positive count: a point of the ball has k nonzero
/// coordinates (k = 3, 2, 1, 0), chosen in C(3, k) ways with 2^k signs, so
/// the sum is 8·N3(m) + 3·4·N2(m) + 3·2·N1(m) + 1, with N2 and N1 the
/// positive pairs and singles (counted here by plain loops).
fn ball_from_positive(m: u64, n3: u128) -> u128 {
    let s = isqrt_u64(m);
    let n2 = (1..=s)
        .flat_map(|x| (1..=s).map(move |y| x * x + y * y))
        .filter(|&n| n <= m)
        .count() as u128;
    8 * n3 + 12 * n2 + 6 * s as u128 + 1
}

#[test]
fn partial_sums_of_oeis_a005875_match_the_cube_count() {
    // The terms are computed by brute force above and checked against
    // memory; every partial sum up to 3000 must come out of count_cube.
    let r3 = r3_brute(3000);
    let mut sum = 0u128;
    for (m, t) in r3.iter().enumerate() {
        sum += *t as u128;
        let m = m as u64;
        assert_eq!(ball_from_positive(m, count_cube(m)), sum, "m = {m}");
    }
    // The ball of radius 5 (A000605, from memory) from count_cube alone.
    assert_eq!(ball_from_positive(25, count_cube(25)), 515);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    /// Random cutoffs up to about 10^9, spread evenly in log m, against the
    /// wedge walk.
    #[test]
    fn the_cube_count_matches_the_wedge_walk_at_random_cutoffs(e in 3.0f64..9.0) {
        let m = 10f64.powf(e) as u64;
        prop_assert_eq!(count_cube(m), count_cube_walk(m));
    }
}

#[test]
fn the_cube_count_matches_the_wedge_walk_near_1e9() {
    // A cutoff on a square and one beside it, near 10^9.
    let k = isqrt_u64(1_000_000_000);
    for m in [k * k, 1_000_000_007] {
        assert_eq!(count_cube(m), count_cube_walk(m), "m = {m}");
    }
}

#[test]
fn the_cube_count_matches_the_wedge_walk_at_1e10() {
    let m = 10_000_000_000;
    assert_eq!(count_cube(m), count_cube_walk(m));
}

/// The wedge walk at 10^12 takes minutes (0.22·10^12 steps).
#[test]
#[ignore]
fn the_cube_count_matches_the_wedge_walk_at_1e12() {
    let m = 1_000_000_000_000;
    assert_eq!(count_cube(m), count_cube_walk(m));
}
