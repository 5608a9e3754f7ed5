//! Second-order forward differentiation in MPFR: a value with its first and
//! second derivatives in one variable, carried through every operation, so
//! an approximation written once as ln q(kT) also gives U and Cv.

use rug::Float;

/// Working precision of every approximation, in bits (about 77 digits):
/// far beyond any printed digit, so approximations add no rounding of note.
pub(crate) const PREC: u32 = 256;

/// `f`, `f'` and `f''` at one point.
#[derive(Debug, Clone)]
pub(crate) struct Jet {
    pub v: Float,
    pub d: Float,
    pub dd: Float,
}

fn f(x: impl Into<f64>) -> Float {
    Float::with_val(PREC, x.into())
}

impl Jet {
    /// The independent variable at `x`.
    pub fn var(x: Float) -> Jet {
        Jet {
            v: x,
            d: f(1.0),
            dd: f(0.0),
        }
    }

    /// A constant.
    pub fn constant(c: Float) -> Jet {
        Jet {
            v: c,
            d: f(0.0),
            dd: f(0.0),
        }
    }

    pub fn add(&self, o: &Jet) -> Jet {
        Jet {
            v: Float::with_val(PREC, &self.v + &o.v),
            d: Float::with_val(PREC, &self.d + &o.d),
            dd: Float::with_val(PREC, &self.dd + &o.dd),
        }
    }

    pub fn sub(&self, o: &Jet) -> Jet {
        self.add(&o.scale(&f(-1.0)))
    }

    pub fn add_const(&self, c: &Float) -> Jet {
        let mut j = self.clone();
        j.v += c;
        j
    }

    pub fn scale(&self, c: &Float) -> Jet {
        Jet {
            v: Float::with_val(PREC, &self.v * c),
            d: Float::with_val(PREC, &self.d * c),
            dd: Float::with_val(PREC, &self.dd * c),
        }
    }

    pub fn mul(&self, o: &Jet) -> Jet {
        let cross = Float::with_val(PREC, &self.d * &o.d) * 2u32;
        Jet {
            v: Float::with_val(PREC, &self.v * &o.v),
            d: Float::with_val(PREC, &self.d * &o.v) + Float::with_val(PREC, &self.v * &o.d),
            dd: Float::with_val(PREC, &self.dd * &o.v)
                + cross
                + Float::with_val(PREC, &self.v * &o.dd),
        }
    }

    /// g(self) given g, g', g'' at self's value (the chain rule).
    fn chain(&self, g0: Float, g1: Float, g2: Float) -> Jet {
        let d2 = Float::with_val(PREC, self.d.square_ref());
        Jet {
            d: Float::with_val(PREC, &g1 * &self.d),
            dd: Float::with_val(PREC, &g2 * &d2) + Float::with_val(PREC, &g1 * &self.dd),
            v: g0,
        }
    }

    /// ln of a positive jet; `None` when the value is not positive.
    pub fn ln(&self) -> Option<Jet> {
        if !(self.v.is_finite() && self.v > 0) {
            return None;
        }
        let r = Float::with_val(PREC, self.v.recip_ref());
        let r2 = -Float::with_val(PREC, r.square_ref());
        Some(self.chain(Float::with_val(PREC, self.v.ln_ref()), r, r2))
    }

    pub fn exp(&self) -> Jet {
        let e = Float::with_val(PREC, self.v.exp_ref());
        self.chain(e.clone(), e.clone(), e)
    }

    /// self^p for a positive value.
    pub fn powf(&self, p: f64) -> Jet {
        use rug::ops::Pow;
        let pw = |e: f64| Float::with_val(PREC, (&self.v).pow(f(e)));
        let g0 = pw(p);
        let g1 = pw(p - 1.0) * p;
        let g2 = pw(p - 2.0) * (p * (p - 1.0));
        self.chain(g0, g1, g2)
    }

    /// A polynomial Σ c_k self^k.
    pub fn poly(&self, coeffs: &[Float]) -> Jet {
        let mut acc = Jet::constant(f(0.0));
        for c in coeffs.iter().rev() {
            acc = acc.mul(self).add_const(c);
        }
        acc
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn derivatives_of_a_composite_match_the_hand_formula() {
        // h(t) = ln(t^(3/2) e^(2/t)) = 1.5 ln t + 2/t: h' = 1.5/t − 2/t², h'' = −1.5/t² + 4/t³.
        let t = Jet::var(f(2.0));
        let h = t
            .powf(1.5)
            .mul(&t.powf(-1.0).scale(&f(2.0)).exp())
            .ln()
            .unwrap();
        assert!((h.v.to_f64() - (1.5 * 2f64.ln() + 1.0)).abs() < 1e-15);
        assert!((h.d.to_f64() - (0.75 - 0.5)).abs() < 1e-15);
        assert!((h.dd.to_f64() - (-0.375 + 0.5)).abs() < 1e-15);
    }

    #[test]
    fn ln_refuses_non_positive_values() {
        assert!(Jet::constant(f(-1.0)).ln().is_none());
        assert!(Jet::constant(f(0.0)).ln().is_none());
    }
}
