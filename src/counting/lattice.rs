//! Exact counts of lattice points in ellipsoids, without listing them.
//!
//! The number of particle-in-a-box states with scaled energy at most `m` is
//! the number of positive integer points with `w1 n1² + w2 n2² + w3 n3² ≤ m`.
//! For fixed outer coordinates the innermost one runs from 1 to
//! `floor(sqrt((m - rest)/w3))`. That bound only falls as the middle
//! coordinate grows, so it is tracked by stepping down instead of taking a
//! square root every time: each (outer, middle) pair costs a compare.
//!
//! The cube (`w1 = w2 = w3`) also uses its symmetry: points are counted in
//! the wedge `x ≤ y ≤ z` with their orbit sizes (6, 3 or 1), which visits
//! about 0.22·m pairs instead of 0.79·m. Outer coordinates are shared among
//! threads, interleaved so that each thread gets a similar mix of long and
//! short rows.

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

/// Number of positive `(x, y, z)` with `x² + y² + z² ≤ m`, counted in the
/// wedge `x ≤ y ≤ z` with orbit sizes.
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

/// Rough number of inner steps [`count_3d`] (or [`count_cube`]) takes for
/// cutoff `m`, used to refuse counts that would run for hours.
pub fn estimated_steps(w: &[u64], m: u64) -> f64 {
    let mf = m as f64;
    let mut w: Vec<f64> = w.iter().map(|&x| x as f64).collect();
    w.sort_by(|a, b| b.total_cmp(a));
    match w.as_slice() {
        [_] => 1.0,
        [w1, _] => (mf / w1).sqrt(),
        [a, b, c] if a == b && b == c => 0.22 * mf / a,
        [w1, w2, _] => std::f64::consts::FRAC_PI_4 * mf / (w1 * w2).sqrt(),
        _ => f64::INFINITY,
    }
}
