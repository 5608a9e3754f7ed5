//! Exact counts of lattice points in ellipsoids, without listing them.
//!
//! The number of particle-in-a-box states with scaled energy at most `m` is
//! the number of positive integer points with `w1 n1² + w2 n2² + w3 n3² ≤ m`.
//! For fixed outer coordinates the innermost one runs from 1 to
//! `floor(sqrt((m - rest)/w3))`. That bound only falls as the middle
//! coordinate grows, so it is tracked by stepping down instead of taking a
//! square root every time: each (outer, middle) pair costs a compare.
//!
//! The cube (`w1 = w2 = w3`) goes further ([`count_cube`]): per value of the
//! largest coordinate, the pairs under the circle `x² + y² ≤ m − z²` are
//! summed along the convex hull of the lattice points under the arc
//! ([`crate::counting::arc`]), about `(m − z²)^{1/3}` edges instead of
//! `(m − z²)^{1/2}` columns, and only in the sixth of the ball where `z` is
//! largest: about `m^{5/6}` steps in all. [`count_cube_walk`], the wedge walk
//! it replaced (about `0.22·m` pairs), stays as its reference.
//!
//! Outer coordinates are shared among threads, interleaved so that each
//! thread gets a similar mix of long and short rows.

use crate::counting::arc::{floor_sqrt_sum, floor_sqrt_sum_walk};
use crate::exact::isqrt_u64;

/// The largest scaled cutoff the counters accept: keeps every square and
/// partial sum inside `u64`.
pub const MAX_CUTOFF: u64 = 1 << 62;

/// Sums `row(x)` for `x = 1, 2, ..., rows` on every core (rayon), rows
/// interleaved so that long and short rows spread evenly.
fn parallel_rows(rows: u64, row: impl Fn(u64) -> u128 + Sync) -> u128 {
    use rayon::prelude::*;
    let t = rayon::current_num_threads().clamp(1, 64) as u64;
    if rows < 64 || t == 1 {
        return (1..=rows).map(&row).sum();
    }
    (0..t)
        .into_par_iter()
        .map(|k| (1 + k..=rows).step_by(t as usize).map(&row).sum::<u128>())
        .sum()
}

/// Below this, `floor(sqrt(r))` computed in `f64` is exact: for `r < 2^50`
/// the distance from `sqrt(k² - 1)` to `k` exceeds half an ulp of `k`.
const EXACT_F64_SQRT: u64 = 1 << 50;

/// Number of `n ≥ 1` with `w n² ≤ m`.
pub fn count_1d(w: u64, m: u64) -> u128 {
    isqrt_u64(m / w) as u128
}

/// Number of positive `(n1, n2)` with `w1 n1² + w2 n2² ≤ m`.
pub fn count_2d(w1: u64, w2: u64, m: u64) -> u128 {
    // Walk the axis with the larger weight: it has fewer values.
    let (w1, w2) = (w1.max(w2), w1.min(w2));
    let mut total = 0u128;
    let mut n1 = 1u64;
    // n2's bound falls as n1 grows. Over the whole walk it falls about
    // sqrt(w1/w2) times as often as n1 steps: step it down when that is
    // cheap, take a square root per row when the fall is steep.
    let walk = w1 <= 16 * w2;
    let mut hi = isqrt_u64(m.saturating_sub(w1) / w2);
    while w1 * n1 * n1 + w2 <= m {
        let rem = m - w1 * n1 * n1;
        if walk {
            while w2 * hi * hi > rem {
                hi -= 1;
            }
        } else {
            hi = isqrt_u64(rem / w2);
        }
        total += hi as u128;
        n1 += 1;
    }
    total
}

/// Number of positive `(n1, n2, n3)` with `w1 n1² + w2 n2² + w3 n3² ≤ m`.
/// Any positive weights; see [`count_cube`] for the faster equal-weight case.
pub fn count_3d(mut w: [u64; 3], m: u64) -> u128 {
    // Outer loops over the heaviest axes: they have the fewest values.
    w.sort_unstable_by(|a, b| b.cmp(a));
    let [w1, w2, w3] = w;
    if w1 + w2 + w3 > m {
        return 0;
    }
    let rows = isqrt_u64((m - w2 - w3) / w1);
    parallel_rows(rows, |n1| {
        let rem1 = m - w1 * n1 * n1;
        count_2d(w2, w3, rem1)
    })
}

/// Number of positive `(x, y, z)` with `x² + y² + z² ≤ m`, in about
/// `m^{5/6}` steps: per value of the largest coordinate, a sum of
/// `floor(sqrt(r − x²))` along the arc by [`floor_sqrt_sum`] (a walk along
/// the convex hull of the lattice points under it).
///
/// Every point has a largest coordinate `z`. The points whose largest
/// coordinate is `z` number `3A(z) − 3B(z) + C(z)` (inclusion–exclusion over
/// which coordinates equal `z`), with `A(z)` the pairs `(x, y)` in
/// `[1, z]²` with `x² + y² ≤ m − z²`, `B(z)` the `x` in `[1, z]` with
/// `x² ≤ m − 2z²` and `C(z) = [3z² ≤ m]`. While `3z² ≤ m` the whole square
/// fits and the terms add up to `z0³` (`z0 = floor(sqrt(m/3))`); above, `A(z)`
/// is counted below the diagonal and doubled, which keeps the arc where it
/// falls no faster than 45°.
///
/// ```
/// use zsum::counting::lattice::count_cube;
/// // (1,1,1) at 3 and the three permutations of (1,1,2) at 6.
/// assert_eq!(count_cube(5), 1);
/// assert_eq!(count_cube(6), 4);
/// ```
pub fn count_cube(m: u64) -> u128 {
    if m < 3 {
        return 0;
    }
    let z0 = isqrt_u64(m / 3);
    let zmax = isqrt_u64(m - 2);
    let inner = (z0 as u128).pow(3);
    inner
        + parallel_rows(zmax - z0, |k| {
            let z = z0 + k;
            3 * (square_count(m - z * z, z) - axis_pairs(m, z))
        })
}

/// `B(z)`: the `x` in `[1, z]` with `x² + 2z² ≤ m`.
fn axis_pairs(m: u64, z: u64) -> u128 {
    match m.checked_sub(2 * z * z) {
        Some(rest) => isqrt_u64(rest).min(z) as u128,
        None => 0,
    }
}

/// `A(z)`: the pairs `(x, y)` in `[1, z]²` with `x² + y² ≤ r`, for `r < 2z²`
/// or any `r` (the diagonal bound keeps it right).
///
/// Twice the pairs with `x < y`, plus those with `x = y`. For `x < y` the
/// count in column `x` is `min(z, F(x)) − x`, `F(x) = floor(sqrt(r − x²))`,
/// while that is positive: `z − x` up to `x1` (where `F(x) ≥ z`), then
/// `F(x) − x` up to `xd`, the last `x` with `x² + (x+1)² ≤ r` (or `z − 1`).
fn square_count(r: u64, z: u64) -> u128 {
    let diagonal = isqrt_u64(r / 2).min(z) as u128;
    if r < 5 {
        // No pair x < y: 1 + 4 > r.
        return diagonal;
    }
    // x² + (x+1)² ≤ r  ⟺  (2x+1)² ≤ 2r − 1.
    let xd = ((isqrt_u64(2 * r - 1) - 1) / 2).min(z - 1);
    let x1 = r.checked_sub(z * z).map_or(0, isqrt_u64);
    let xa = x1.min(xd);
    let (xa, xd, zz) = (xa as u128, xd as u128, z as u128);
    // Σ_{x=1}^{xa} (z − x)
    let flat = xa * zz - xa * (xa + 1) / 2;
    // Σ_{x=xa+1}^{xd} (F(x) − x)
    let arc = floor_sqrt_sum(r, xa as u64 + 1, xd as u64)
        .unwrap_or_else(|| floor_sqrt_sum_walk(r, xa as u64 + 1, xd as u64));
    let below = (xa + 1 + xd) * (xd - xa) / 2;
    2 * (flat + arc - below) + diagonal
}

/// Number of positive `(x, y, z)` with `x² + y² + z² ≤ m`, counted in the
/// wedge `x ≤ y ≤ z` with orbit sizes, one step per `(x, y)` pair (about
/// `0.22·m` steps): the reference that [`count_cube`] is checked against.
///
/// ```
/// use zsum::counting::lattice::count_cube_walk;
/// // (1,1,1) at 3 and the three permutations of (1,1,2) at 6.
/// assert_eq!(count_cube_walk(5), 1);
/// assert_eq!(count_cube_walk(6), 4);
/// ```
pub fn count_cube_walk(m: u64) -> u128 {
    if m < 3 {
        return 0;
    }
    let rows = isqrt_u64(m / 3);
    parallel_rows(rows, |x| {
        let x2 = x * x;
        let mut total = 0u128;
        // z ranges over [y, zmax]; zmax falls as y grows.
        let mut zmax = isqrt_u64(m - 2 * x2);
        // y runs while a z >= y still fits: 2y² <= m - x².
        let ymax = isqrt_u64((m - x2) / 2);
        let mut above_sum = 0u64; // Σ (zmax - y) over y > x
        if m < EXACT_F64_SQRT {
            // floor(sqrt(r)) from the correctly rounded f64 root is exact for
            // integers r < 2^50, and the steps are independent, so they
            // pipeline; no square root is shared between steps.
            let c = (m - x2) as f64;
            let mut s = 0u64;
            for y in x + 1..=ymax {
                let yf = y as f64;
                s += (c - yf * yf).sqrt() as i32 as u64;
            }
            let ys: u64 = (x + 1..=ymax).sum();
            above_sum = s - ys;
        } else {
            for y in x + 1..=ymax {
                let rem = m - x2 - y * y;
                while zmax * zmax > rem {
                    zmax -= 1;
                }
                above_sum += zmax - y;
            }
        }
        // y = x: (x,x,x) once, (x,x,z>x) three times each.
        let first = (isqrt_u64(m - 2 * x2) - x) as u128;
        total += 3 * first + 1;
        // y > x: (x,y,y) three times, (x,y,z>y) six times each.
        let rows_y = ymax.saturating_sub(x) as u128;
        total += 6 * above_sum as u128 + 3 * rows_y;
        total
    })
}

/// Rough number of elementary steps [`count_3d`] (or [`count_cube`])
/// takes for cutoff `m`, used to refuse counts that would run for hours.
///
/// The cube walks the hull of the lattice points under each slice's arc:
/// about 2·10^7 edges at `m = 10^10` (measured), growing as m^(5/6), each
/// some 28 ns, about six steps at the reference speed of
/// [`crate::budget`]. So a cube to 10^12 is priced near half a minute and
/// one to 10^16 at most of a day.
pub fn estimated_steps(w: &[u64], m: u64) -> f64 {
    let mf = m as f64;
    let mut w: Vec<f64> = w.iter().map(|&x| x as f64).collect();
    w.sort_by(|a, b| b.total_cmp(a));
    match w.as_slice() {
        [_] => 1.0,
        [w1, _] => (mf / w1).sqrt(),
        [a, b, c] if a == b && b == c => 1.2e8 * (mf / a / 1e10).powf(5.0 / 6.0),
        [w1, w2, _] => std::f64::consts::FRAC_PI_4 * mf / (w1 * w2).sqrt(),
        _ => f64::INFINITY,
    }
}
