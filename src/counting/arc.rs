//! Sums of `floor(sqrt(r − x²))` over a range of `x` without a step per `x`.
//!
//! The lattice points on or under the arc `y = f(x) = sqrt(r − x²)`, for
//! `x` in `[lo, hi]`, form a convex set with a downward-closed shape; the top
//! of column `x` is `F(x) = floor(f(x))`. The upper boundary of the convex
//! hull of those points is a polygon with lattice vertices, and on every
//! column `F(x) = floor(hull(x))` (the hull lies between the tops and the
//! arc). Along one hull edge of primitive direction `(a, −b)` (one step `a`
//! right, `b` down) from a top `(x, y)`, the `a` columns it crosses sum to
//! `a·y − (a−1)(b+1)/2` in closed form. A circle of radius `ρ` has about
//! `ρ^{2/3}` hull vertices (Balog and Bárány, 1991, from memory), so a slice
//! costs about `r^{1/3}` edges instead of `r^{1/2}` columns.
//!
//! The next edge is found by a Stern–Brocot search from a stack of
//! directions, each adjacent pair of which is a pair of Farey neighbours
//! (`a₁b₂ − a₂b₁ = 1`, the shallower one above); the search is the one used
//! for the divisor and circle problems (the convex-hull walk of Sladkey,
//! 2012, and others), written here for a concave arc. Writing
//! `P` for the current top and `σ` for the least steepness `b/a` of any point
//! under the arc to the right of `P`, the walk keeps a shallow direction `L`
//! with `σ > b_L/a_L` and an under-the-arc direction `R` with `σ ≤ b_R/a_R`.
//! The facts it rests on (each a convex combination of points under the
//! arc, which stays under it, or a point below one):
//!
//! * **Leaving an edge.** After stepping along the edge of least steepness
//!   until the next step would leave, every point to the right is strictly
//!   steeper than that edge.
//! * **Popping.** If `T` is excluded (`σ > b_T/a_T`), `W` is its steeper
//!   neighbour and `P + W` is above the arc, then `P + iT + jW` is above the
//!   arc for all `i ≥ 0, j ≥ 1` (were it under, `P + W` would lie below a
//!   point of the segment from `P` to it), so `W` is excluded too.
//! * **Refining.** With neighbours `L` (excluded) and `R` (under), the mediant
//!   `M = L + R`: under, then `σ ≤ b_M/a_M` and `M` replaces `R`; above, then
//!   `M` is excluded by the previous fact and replaces `L`.
//! * **Stopping.** If `P + M` is above the arc, `R` moves right (`a_R ≥ 1`)
//!   and the arc at column `x + a_M` is at least as steep as `R`, every point
//!   `P + iM + jR` (`i, j ≥ 1`) lies above the arc (it is reached from
//!   `P + M` by moves to the right no steeper than `R`, while the concave arc
//!   falls at least that fast), so `σ = b_R/a_R` and `R` is the next edge.
//!
//! Every quantity is an exact integer: points are compared with `r` in
//! `u64` (coordinates stay at most `sqrt(r)`, `r ≤ 2^62`), the slope test
//! `t²(a² + b²) ≥ b² r` in checked `u128`. A sum whose directions would not
//! fit returns `None`; callers then use [`floor_sqrt_sum_walk`].

use crate::exact::isqrt_u64;

/// The largest `r` [`floor_sqrt_sum`] accepts: `x² + y²` of two coordinates
/// at most `sqrt(r)` then fits in `u64`.
pub const MAX_RADIUS_SQUARED: u64 = 1 << 62;

/// `Σ_{x=lo}^{hi} floor(sqrt(r − x²))` by walking the convex hull of the
/// lattice points under the arc (see the module notes), exact.
///
/// Needs `hi² ≤ r ≤ 2^62`; returns `None` if that fails or if a direction
/// would overflow (never seen; then [`floor_sqrt_sum_walk`] gives the same
/// sum). An empty range (`lo > hi`) sums to 0. Meant for the arc up to 45°
/// (`hi ≤ sqrt(r/2)`), about `0.43·r^{1/3}` edges there; steeper parts are
/// summed exactly too, at more edges per column.
///
/// ```
/// use zsum::counting::arc::{floor_sqrt_sum, floor_sqrt_sum_walk};
/// // floor(sqrt(100 − x²)) for x = 0..=7: 10 + 9 + 9 + 9 + 9 + 8 + 8 + 7.
/// assert_eq!(floor_sqrt_sum(100, 0, 7), Some(69));
/// assert_eq!(floor_sqrt_sum_walk(100, 0, 7), 69);
/// ```
pub fn floor_sqrt_sum(r: u64, lo: u64, hi: u64) -> Option<u128> {
    if lo > hi {
        return Some(0);
    }
    if r > MAX_RADIUS_SQUARED || hi.checked_mul(hi)? > r {
        return None;
    }
    let arc = Arc { r, hi };
    let (mut x, mut y) = (lo, isqrt_u64(r - lo * lo));
    let mut sum = 0u128;
    // Bottom: straight down, always under the arc, never walked. Top: flat.
    let mut stack: Vec<Dir> = Vec::with_capacity(64);
    stack.push(Dir { a: 0, b: 1 });
    stack.push(Dir { a: 1, b: 0 });
    loop {
        let t = *stack.last()?;
        // `t` is the edge of least steepness from (x, y): walk it to its end.
        while arc.under(x, y, t) {
            // (a−1)(b+1) is even: a and b are coprime, so not both even.
            sum += t.a as u128 * y as u128 - ((t.a as u128 - 1) * (t.b as u128 + 1)) / 2;
            x += t.a;
            y -= t.b;
        }
        if x >= hi {
            break;
        }
        // Pop the directions that now leave the arc; the last one popped is
        // excluded, the first one kept is under the arc (the bottom always is).
        let mut left = stack.pop()?;
        while !arc.under(x, y, *stack.last()?) {
            left = stack.pop()?;
        }
        let mut right = *stack.last()?;
        loop {
            let mid = Dir {
                a: left.a.checked_add(right.a)?,
                b: left.b.checked_add(right.b)?,
            };
            if arc.under(x, y, mid) {
                stack.push(mid);
                right = mid;
            } else if arc.at_least_as_steep(x.checked_add(mid.a)?, right)? {
                break;
            } else {
                left = mid;
            }
        }
    }
    // The walk ends on column hi; the sum so far covers lo..hi−1.
    Some(sum + y as u128)
}

/// `Σ_{x=lo}^{hi} floor(sqrt(r − x²))` column by column, the bound stepped
/// down as `x` grows: the reference for [`floor_sqrt_sum`], and its fallback.
/// Needs `hi² ≤ r`.
pub fn floor_sqrt_sum_walk(r: u64, lo: u64, hi: u64) -> u128 {
    if lo > hi {
        return 0;
    }
    let mut y = isqrt_u64(r - lo * lo);
    let mut sum = 0u128;
    for x in lo..=hi {
        let rem = r - x * x;
        while y * y > rem {
            y -= 1;
        }
        sum += y as u128;
    }
    sum
}

/// A step `a` to the right and `b` down.
#[derive(Clone, Copy, Debug)]
struct Dir {
    a: u64,
    b: u64,
}

/// The region `x ≤ hi, y ≤ sqrt(r − x²)`.
struct Arc {
    r: u64,
    hi: u64,
}

impl Arc {
    /// Whether `(x, y) + d` lies on or under the arc, within the columns.
    /// Takes `(x, y)` under the arc with `x ≤ hi`, so the squares fit.
    #[inline]
    fn under(&self, x: u64, y: u64, d: Dir) -> bool {
        let Some(nx) = x.checked_add(d.a) else {
            return false;
        };
        if nx > self.hi {
            return false;
        }
        if d.b > y {
            // Below the axis: under the arc (the region is closed downward).
            return true;
        }
        let ny = y - d.b;
        nx * nx + ny * ny <= self.r
    }

    /// Whether the arc at column `t` falls at least as steeply as `d`:
    /// `t / sqrt(r − t²) ≥ b / a`, i.e. `t²(a² + b²) ≥ b² r`. Beyond the
    /// last column nothing is under the arc, which counts as steep. Never
    /// for the straight-down direction within the columns: the points right
    /// under `(x, y) + M` are reached by it without moving right.
    /// `None` if the products overflow `u128`.
    #[inline]
    fn at_least_as_steep(&self, t: u64, d: Dir) -> Option<bool> {
        if t > self.hi {
            return Some(true);
        }
        if d.a == 0 {
            return Some(false);
        }
        let (t, a, b, r) = (t as u128, d.a as u128, d.b as u128, self.r as u128);
        let lhs = (t * t).checked_mul(a.checked_mul(a)?.checked_add(b.checked_mul(b)?)?)?;
        let rhs = b.checked_mul(b)?.checked_mul(r)?;
        Some(lhs >= rhs)
    }
}
