//! Ball arithmetic: a value with a rigorous bound on its error.
//!
//! A [`Ball`] is a centre (an MPFR number at the working precision) and a
//! radius (a 64-bit MPFR number rounded upward), so the true value lies in
//! `[c − r, c + r]`. Radii have MPFR's exponent range, not f64's: an error
//! bound of 1e-400 on a value of 1e-370 is an ordinary ball. Every
//! operation adds the rounding of its own result, so a chain of operations
//! stays rigorous without bookkeeping by the caller.

use rug::float::Round;
use rug::Float;

/// Precision of error radii, in bits.
pub(crate) const RP: u32 = 64;

/// A value with a bound on its error.
#[derive(Debug, Clone)]
pub(crate) struct Ball {
    /// The centre.
    pub(crate) c: Float,
    /// A bound on the distance to the true value.
    pub(crate) r: Float,
}

/// `a + b`, rounded up.
pub(crate) fn up_add(a: &Float, b: &Float) -> Float {
    Float::with_val_round(RP, a + b, Round::Up).0
}

/// `a · b`, rounded up.
pub(crate) fn up_mul(a: &Float, b: &Float) -> Float {
    Float::with_val_round(RP, a * b, Round::Up).0
}

/// `a / b`, rounded up.
pub(crate) fn up_div(a: &Float, b: &Float) -> Float {
    Float::with_val_round(RP, a / b, Round::Up).0
}

/// `|x|`, rounded up to the radius precision.
pub(crate) fn mag(x: &Float) -> Float {
    Float::with_val_round(RP, &*x.as_abs(), Round::Up).0
}

/// `|x|`, rounded down to the radius precision.
pub(crate) fn mag_down(x: &Float) -> Float {
    Float::with_val_round(RP, &*x.as_abs(), Round::Down).0
}

impl Ball {
    /// An exact value.
    pub(crate) fn exact(c: Float) -> Ball {
        Ball {
            c,
            r: Float::new(RP),
        }
    }

    /// A centre with an error bound `r` that does not yet include the
    /// rounding of `c` itself: adds one unit in the last place of `c`.
    pub(crate) fn rounded(c: Float, r: Float) -> Ball {
        let p = c.prec();
        let ulp = mag(&c) >> p;
        Ball {
            r: up_add(&r, &ulp),
            c,
        }
    }

    /// A centre with a relative error bound `rel` (plus its own rounding).
    pub(crate) fn with_rel(c: Float, rel: &Float) -> Ball {
        let r = up_mul(&mag(&c), rel);
        Ball::rounded(c, r)
    }

    /// The working precision of the centre.
    pub(crate) fn prec(&self) -> u32 {
        self.c.prec()
    }

    /// `self + o`.
    pub(crate) fn add(&self, o: &Ball) -> Ball {
        let p = self.prec().max(o.prec());
        Ball::rounded(Float::with_val(p, &self.c + &o.c), up_add(&self.r, &o.r))
    }

    /// `self − o`.
    pub(crate) fn sub(&self, o: &Ball) -> Ball {
        let p = self.prec().max(o.prec());
        Ball::rounded(Float::with_val(p, &self.c - &o.c), up_add(&self.r, &o.r))
    }

    /// `−self`.
    pub(crate) fn neg(&self) -> Ball {
        Ball {
            c: Float::with_val(self.prec(), -&self.c),
            r: self.r.clone(),
        }
    }

    /// `self · o`.
    pub(crate) fn mul(&self, o: &Ball) -> Ball {
        let p = self.prec().max(o.prec());
        let r = up_add(
            &up_add(&up_mul(&mag(&self.c), &o.r), &up_mul(&self.r, &mag(&o.c))),
            &up_mul(&self.r, &o.r),
        );
        Ball::rounded(Float::with_val(p, &self.c * &o.c), r)
    }

    /// `self · n` for an exact integer n.
    pub(crate) fn mul_int(&self, n: u64) -> Ball {
        let r = up_mul(&self.r, &Float::with_val(RP, n));
        Ball::rounded(Float::with_val(self.prec(), &self.c * n), r)
    }

    /// `self / n` for an exact integer n ≥ 1.
    pub(crate) fn div_int(&self, n: u64) -> Ball {
        let r = up_div(&self.r, &Float::with_val(RP, n));
        Ball::rounded(Float::with_val(self.prec(), &self.c / n), r)
    }

    /// `self / o`; `None` if the divisor's ball holds zero.
    pub(crate) fn div(&self, o: &Ball) -> Option<Ball> {
        let bc = mag_down(&o.c);
        let low = Float::with_val_round(RP, &bc - &o.r, Round::Down).0;
        if low <= 0 {
            return None;
        }
        // |a/b − ac/bc| ≤ (|ac| rb + ra |bc|) / (|bc| (|bc| − rb)).
        let num = up_add(&up_mul(&mag(&self.c), &o.r), &up_mul(&self.r, &mag(&o.c)));
        let den = Float::with_val_round(RP, &bc * &low, Round::Down).0;
        let r = up_div(&num, &den);
        let p = self.prec().max(o.prec());
        Some(Ball::rounded(Float::with_val(p, &self.c / &o.c), r))
    }

    /// The radius relative to the centre, rounded up (infinite at 0).
    pub(crate) fn rel(&self) -> Float {
        if self.r.is_zero() {
            return Float::new(RP);
        }
        up_div(&self.r, &mag_down(&self.c))
    }

    /// ln of a positive ball; `None` if the ball reaches zero or is wider
    /// than half its centre.
    pub(crate) fn ln(&self) -> Option<Ball> {
        if self.c <= 0 {
            return None;
        }
        let rel = self.rel();
        if rel >= 0.5 {
            return None;
        }
        // |ln(c + δ) − ln c| ≤ −ln(1 − rel) ≤ rel / (1 − rel) ≤ 2 rel.
        let r = up_mul(&rel, &Float::with_val(RP, 2));
        Some(Ball::rounded(
            Float::with_val(self.prec(), self.c.ln_ref()),
            r,
        ))
    }

    /// ln(1 + self) for a ball inside [0, ∞) (the excitation ratio ε/g₀):
    /// relative accuracy however small ε is. `None` if the ball reaches
    /// below −1/2.
    pub(crate) fn ln_1p(&self) -> Option<Ball> {
        let lo = Float::with_val_round(RP, &self.c - &self.r, Round::Down).0;
        if lo <= -0.5 {
            return None;
        }
        // |d/dx ln(1+x)| = 1/(1+x) ≤ 1/(1 + lo) ≤ 2 on the ball.
        let slope = if lo >= 0 {
            Float::with_val(RP, 1)
        } else {
            Float::with_val(RP, 2)
        };
        let r = up_mul(&self.r, &slope);
        Some(Ball::rounded(
            Float::with_val(self.prec(), self.c.ln_1p_ref()),
            r,
        ))
    }

    /// e^self; `None` when the result leaves MPFR's exponent range or the
    /// radius is 1 or more (the ball would say nothing).
    pub(crate) fn exp(&self) -> Option<Ball> {
        if self.r >= 1 {
            return None;
        }
        let c = Float::with_val(self.prec(), self.c.exp_ref());
        if c.is_zero() || !c.is_finite() {
            return None;
        }
        // |e^{c+δ} − e^c| ≤ e^c (e^r − 1) ≤ e^c · 2r for r < 1.
        let r = up_mul(&mag(&c), &up_mul(&self.r, &Float::with_val(RP, 2)));
        Some(Ball::rounded(c, r))
    }

    /// The error bound, rounded up to f64 (`f64::MAX` beyond its range).
    pub(crate) fn err(&self) -> f64 {
        self.r.to_f64_round(Round::Up)
    }
}
