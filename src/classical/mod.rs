//! Classical (high-temperature) approximations, their systematic
//! corrections, and how far each is from the exact sum.
//!
//! A model describes its exact structure ([`Spectrum::structure`]); from
//! it this layer builds the model's classical form, which offers a list of
//! [`Approximation`]s, the first always the classical (integral) one, then
//! corrections of rising order. Every approximation is written once as
//! ln q(kT); U/kT, Cv/k and S/k follow by exact differentiation in MPFR
//! (a value with its first and second derivatives carried through every
//! operation), so errors are available for q, U, Cv and S alike.
//!
//! The approximations, with t = kT and the exact sums they approximate:
//!
//! | model | exact | approximations |
//! | --- | --- | --- |
//! | box, `E = Σ w_i n_i²` | `Π_i Σ_n e^{−w_i n²/t}` | classical `Π c_i`, `c_i = sqrt(π t/(4 w_i))` (V/Λ³); then the boundary terms of `Π (c_i − 1/2)` by order: 1D *euler-maclaurin*; 2D *perimeter*, *euler-maclaurin*; 3D *surface*, *edges*, *euler-maclaurin*. The full product is Euler–Maclaurin per axis, exact up to terms of order e^{−π² t/w} |
//! | linear rotor, `E = B J(J+1)`, parity weights g_e, g_o | `Σ g_J (2J+1) e^{−y J(J+1)}`, y = B/t | classical `ḡ/y` with ḡ = (g_e+g_o)/2 (T/σθ for a homonuclear molecule); Mulholland `ḡ(1/y + 1/3 + y/15 + 4y²/315 + y³/315)` truncated after 1, 2, 3, 4 corrections |
//! | symmetric top, B and unique constant A (or C), spin weights g(J, K) of mean ḡ, inversion splitting Δ | `Σ_J Σ_{|K|≤J} g (2J+1) e^{−(B J(J+1) + (A−B)K²)/t}` | classical `ḡ sqrt(π t³/(A B²))` (times `(1 + e^{−Δ/t})/2` with a splitting); *first*: `× [1 + (B/12t)(4 − B/A)]` |
//! | spherical top, spin weights g(J) of mean ḡ per rotational state | `Σ g(J) (2J+1) e^{−B J(J+1)/t}` | classical `ḡ sqrt(π t³/B³)`; *first*: `× (1 + B/4t)`; *exponential*: `× e^{B/4t}`, exact up to exponentially small terms |
//! | harmonic modes ω (no zero point) | `Π 1/(1 − e^{−x})`, x = ω/t | classical `1/x`; `1/x + 1/2 + x/12 − x³/720 + x⁵/30240` by order (*order1* … *order4*) |
//! | harmonic modes with zero point | `Π 1/(2 sinh(x/2))` | classical `1/x`; `1/x − x/24 + 7x³/5760 − 31x⁵/967680` by order |
//! | products, diatomics | independent parts | *classical* (every part classical), *first* (every part's first correction), *best* (every part's highest order) |
//!
//! The corrections are standard asymptotic series (the Bernoulli-number
//! expansion of x/(1 − e^{−x}), Mulholland's expansion of the rotor sum,
//! Euler–Maclaurin for the box; the symmetric-top correction as in standard
//! texts, from memory); each is checked against the exact sums in the tests.
//! The rotor and top forms are rigid: centrifugal distortion is what the
//! exact sum adds. A top's spin weights enter as their mean ḡ: the
//! weights differ from ḡ by terms periodic in J and K with mean zero (the
//! characters of the non-identity rotations, `(−1)^J` and the like), whose
//! Gaussian-weighted sums are exponentially small at high temperature
//! (Poisson summation: only non-zero frequencies remain): for the
//! spherical top below every correction, as `tests/spin_species.rs`
//! checks; for the symmetric top, periodic in K, about e^{−π² kT/9A}, A
//! the unique constant (measured there), below the first correction once
//! kT is a few times 9A/π². A vibrating rotor is approximated as a rigid rotor with
//! B_0 = B_e − α_e/2 times harmonic vibration with the fundamental
//! G(1) − G(0), energies from the true ground level.

mod compare;
mod jet;
mod search;

use crate::error::{Error, ErrorKind, Result};
use crate::spectrum::{Spectrum, Structure};
use crate::sum::{thermo, Temperature};
use crate::units::EnergyUnit;
use jet::{Jet, PREC};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{One, Zero};
use rug::Float;
use serde::Serialize;

pub use compare::{error_map, Approximate, ErrorMap, MapPoint};
pub(crate) use search::bisect;
pub use search::{crossovers, Crossing, Crossovers, SearchRange};

/// The structure of a model's classical limit: what its approximations
/// are built from. Energies are in the spectrum's unit.
#[derive(Debug, Clone, PartialEq)]
pub(crate) enum Form {
    /// `E = Σ_i w_i n_i²`, n_i ≥ 1: a box, one weight per axis.
    Squares(Vec<BigRational>),
    /// `E = b J(J+1)` with `(2J+1)·w(J mod 2)` states, weights `[even, odd]`.
    Rotor(BigRational, [BigUint; 2]),
    /// `E = b J(J+1) + (u − b) K²`, |K| ≤ J: a symmetric top with unique
    /// constant `u`, each rotational state weighing `weight` on average,
    /// half of it `inversion` higher.
    Top {
        /// The J(J+1) constant B.
        b: BigRational,
        /// The unique-axis constant (A prolate, C oblate).
        unique: BigRational,
        /// The mean nuclear-spin weight per rotational state (1 without).
        weight: BigRational,
        /// The inversion splitting Δ (zero without one).
        inversion: BigRational,
    },
    /// An asymmetric top with constants A ≥ B ≥ C and the mean `wbar` of
    /// its four symmetry classes' spin weights.
    Asymmetric {
        /// A, B, C.
        abc: [BigRational; 3],
        /// The mean weight (2I+1)²/σ for a pair of equivalent nuclei, 1/σ
        /// for weights 1 and 0).
        wbar: BigRational,
    },
    /// `E = b J(J+1)` with `(2J+1)²` rotational states, each weighing the
    /// mean nuclear-spin weight (the second field, 1 without).
    Spherical(BigRational, BigRational),
    /// Harmonic modes `(ω, degeneracy)`, with or without zero-point energy.
    Harmonic(Vec<(BigRational, u32)>, bool),
    /// Independent parts, each with the size of its unit in the whole's unit.
    Parts(Vec<(Form, BigRational)>),
    /// A form with every energy raised by a constant.
    Shifted(Box<Form>, BigRational),
    /// A finite list of levels `(energy, degeneracy)`, summed exactly in
    /// every approximation (electronic levels inside a product).
    Levels(Vec<(BigRational, BigUint)>),
}

/// One approximation a model offers.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Approximation {
    /// Its name on the command line, e.g. `classical`, `mulholland2`.
    pub name: String,
    /// What it is, as a formula.
    pub description: String,
}

/// Which of a form's approximations (products pass `First`/`Best` on).
#[derive(Debug, Clone, Copy)]
enum Sel {
    Index(usize),
    First,
    Best,
}

fn fl(x: f64) -> Float {
    Float::with_val(PREC, x)
}

pub(crate) fn to_float(r: &BigRational) -> Float {
    Float::with_val(PREC, crate::sum::to_rug(r))
}

fn approx(name: &str, description: &str) -> Approximation {
    Approximation {
        name: name.to_string(),
        description: description.to_string(),
    }
}

/// Adds the spin-weight factor to each description of a top's
/// approximations, where there is one (`weight` ≠ 1 or an inversion
/// splitting); the descriptions of unweighted tops stay as they were.
fn weighted(
    out: &mut [Approximation],
    weight: &BigRational,
    inversion: &BigRational,
    factor: &str,
) {
    if weight.is_one() && inversion.is_zero() {
        return;
    }
    for a in out {
        a.description = format!("{}; × {factor}", a.description);
    }
}

/// The series of one harmonic mode in x = ω/kT: `(power, numerator,
/// denominator)` per term, classical first (Bernoulli-number expansions).
fn oscillator_terms(zero_point: bool) -> &'static [(i32, i64, i64)] {
    if zero_point {
        // 1/(2 sinh(x/2)) = 1/x − x/24 + 7x³/5760 − 31x⁵/967680 + ...
        &[(-1, 1, 1), (1, -1, 24), (3, 7, 5760), (5, -31, 967_680)]
    } else {
        // 1/(1 − e^{−x}) = 1/x + 1/2 + x/12 − x³/720 + x⁵/30240 + ...
        &[
            (-1, 1, 1),
            (0, 1, 2),
            (1, 1, 12),
            (3, -1, 720),
            (5, 1, 30240),
        ]
    }
}

impl Form {
    /// The classical form of a spectrum, from its exact structure; `None`
    /// where it has none (nothing known beyond its levels, or a part
    /// without one).
    pub(crate) fn of(s: &dyn Spectrum) -> Option<Form> {
        match s.structure() {
            Structure::Finite => Form::finite(s),
            Structure::Parts(parts) => Some(Form::Parts(
                parts
                    .into_iter()
                    .map(|(p, f)| Some((Form::of(p)?, f)))
                    .collect::<Option<_>>()?,
            )),
            other => Form::from_structure(other),
        }
    }

    /// The classical form of a structure that names no spectrum.
    fn from_structure(st: Structure<'_>) -> Option<Form> {
        Some(match st {
            Structure::Opaque | Structure::Finite | Structure::Parts(_) => return None,
            Structure::Squares(ws) => Form::Squares(ws),
            Structure::Harmonic(modes, zero_point) => Form::Harmonic(modes, zero_point),
            // The approximations are those of the rigid rotor; centrifugal
            // terms are what the exact sum adds.
            Structure::Rotor { b, weights, .. } => Form::Rotor(b, weights),
            Structure::Top {
                b,
                unique,
                weight,
                inversion,
            } => Form::Top {
                b,
                unique,
                weight,
                inversion,
            },
            Structure::Spherical(l) => Form::Spherical(l.b, l.weight),
            Structure::Asymmetric { abc, weights } => {
                let sum: BigUint = weights.iter().sum();
                Form::Asymmetric {
                    abc,
                    wbar: BigRational::new(sum.into(), 4.into()),
                }
            }
            Structure::Near { parts, shift } => Form::Shifted(
                Box::new(Form::Parts(
                    parts
                        .into_iter()
                        .map(|(st, f)| Some((Form::from_structure(st)?, f)))
                        .collect::<Option<_>>()?,
                )),
                shift,
            ),
        })
    }

    /// The exact form of a spectrum with finitely many levels.
    fn finite(s: &dyn Spectrum) -> Option<Form> {
        let top = s.highest_energy()?;
        let list = s.levels_up_to(&top).ok()?;
        Some(Form::Levels(
            list.levels()
                .iter()
                .map(|l| (l.energy.clone(), l.degeneracy.clone()))
                .collect(),
        ))
    }

    /// The approximations this form offers, classical first.
    pub fn approximations(&self) -> Vec<Approximation> {
        match self {
            Form::Squares(ws) => {
                let names: &[(&str, &str)] = match ws.len() {
                    1 => &[(
                        "euler-maclaurin",
                        "sqrt(π kT/(4w)) − 1/2 (Euler–Maclaurin; exact up to e^{−π² kT/w})",
                    )],
                    2 => &[
                        (
                            "perimeter",
                            "classical plus the perimeter term −(c_x + c_y)/2",
                        ),
                        (
                            "euler-maclaurin",
                            "(c_x − 1/2)(c_y − 1/2): perimeter and corner terms",
                        ),
                    ],
                    _ => &[
                        (
                            "surface",
                            "classical plus the surface term −(c_x c_y + c_y c_z + c_z c_x)/2",
                        ),
                        ("edges", "surface plus the edge term +(c_x + c_y + c_z)/4"),
                        (
                            "euler-maclaurin",
                            "(c_x − 1/2)(c_y − 1/2)(c_z − 1/2): surface, edges and corners",
                        ),
                    ],
                };
                let mut out = vec![approx(
                    "classical",
                    "Π c_i, c_i = sqrt(π kT/(4 w_i)): the integral (V/Λ³ for a 3D box)",
                )];
                out.extend(names.iter().map(|(n, d)| approx(n, d)));
                out
            }
            Form::Rotor(..) => {
                let mut out = vec![approx(
                    "classical",
                    "ḡ kT/B with ḡ = (g_even + g_odd)/2 (T/σθ for a homonuclear molecule)",
                )];
                let terms = ["1/3", "y/15", "4y²/315", "y³/315"];
                for k in 1..=4 {
                    out.push(approx(
                        &format!("mulholland{k}"),
                        &format!(
                            "ḡ(1/y + {}), y = B/kT (Mulholland's expansion)",
                            terms[..k].join(" + ")
                        ),
                    ));
                }
                out
            }
            Form::Top {
                weight, inversion, ..
            } => {
                let mut out = vec![
                    approx("classical", "sqrt(π (kT)³/(A B²)), A the unique constant"),
                    approx(
                        "first",
                        "classical × [1 + (B/12kT)(4 − B/A)]: first quantum correction",
                    ),
                ];
                let factor = if inversion.is_zero() {
                    "ḡ, the mean spin weight per rotational state"
                } else {
                    "ḡ (1 + e^{−Δ/kT})/2, ḡ the mean spin weight per rotational state and Δ \
                     the inversion splitting"
                };
                weighted(&mut out, weight, inversion, factor);
                out
            }
            Form::Asymmetric { .. } => vec![
                approx(
                    "classical",
                    "ḡ sqrt(π (kT)³/(A B C)), ḡ the mean spin weight",
                ),
                approx(
                    "first",
                    "classical × [1 + (2(A+B+C) − AB/C − BC/A − CA/B)/12kT]: first quantum \
                     correction",
                ),
            ],
            Form::Spherical(_, weight) => {
                let mut out = vec![
                    approx("classical", "sqrt(π (kT/B)³)"),
                    approx("first", "classical × (1 + B/4kT)"),
                    approx(
                        "exponential",
                        "classical × e^{B/4kT}: exact up to exponentially small terms",
                    ),
                ];
                weighted(
                    &mut out,
                    weight,
                    &BigRational::zero(),
                    "ḡ, the mean spin weight per rotational state",
                );
                out
            }
            Form::Harmonic(_, zp) => {
                let mut out = vec![approx("classical", "kT/ω per mode")];
                let terms: &[&str] = if *zp {
                    &["− x/24", "+ 7x³/5760", "− 31x⁵/967680"]
                } else {
                    &["+ 1/2", "+ x/12", "− x³/720", "+ x⁵/30240"]
                };
                for k in 1..=terms.len() {
                    out.push(approx(
                        &format!("order{k}"),
                        &format!("1/x {} per mode, x = ω/kT", terms[..k].join(" ")),
                    ));
                }
                out
            }
            Form::Parts(_) => vec![
                approx("classical", "every part classical"),
                approx("first", "every part with its first correction"),
                approx("best", "every part with its highest-order correction"),
            ],
            Form::Shifted(inner, _) => inner.approximations(),
            Form::Levels(_) => vec![approx(
                "exact",
                "summed exactly: a finite list of levels has no classical limit",
            )],
        }
    }

    /// The characteristic energy θ (in the spectrum's unit) that T/θ is
    /// measured against: the box unit w, the rotor's B, the lowest mode ω;
    /// for parts the smallest of theirs.
    pub fn theta(&self) -> BigRational {
        match self {
            Form::Squares(ws) => ws.iter().min().cloned().unwrap_or_else(BigRational::zero),
            Form::Rotor(b, _) | Form::Spherical(b, _) | Form::Top { b, .. } => b.clone(),
            Form::Asymmetric { abc, .. } => abc[1].clone(),
            Form::Harmonic(modes, _) => modes
                .iter()
                .map(|(w, _)| w.clone())
                .min()
                .unwrap_or_else(BigRational::zero),
            Form::Parts(parts) => parts
                .iter()
                .map(|(f, factor)| f.theta() * factor)
                .min()
                .unwrap_or_else(BigRational::zero),
            Form::Shifted(inner, _) => inner.theta(),
            // A finite list sets no temperature scale of its own.
            Form::Levels(_) => BigRational::from_integer(i64::MAX.into()),
        }
    }

    fn count(&self) -> usize {
        self.approximations().len()
    }

    /// ln q as a jet in t = kT; `None` where the approximation is not
    /// positive (a truncated series below its range).
    fn ln_q(&self, sel: Sel, t: &Jet) -> Option<Jet> {
        let index = match sel {
            Sel::Index(i) => i,
            Sel::First => 1.min(self.count() - 1),
            Sel::Best => self.count() - 1,
        };
        match self {
            Form::Squares(ws) => {
                let pi = Float::with_val(PREC, rug::float::Constant::Pi);
                let cs: Vec<Jet> = ws
                    .iter()
                    .map(|w| {
                        let k = Float::with_val(PREC, &pi / to_float(w)) / 4u32;
                        t.scale(&k).powf(0.5)
                    })
                    .collect();
                // Π (c_i − 1/2) expanded, keeping terms with at most `index` factors −1/2.
                let d = cs.len();
                let mut q = Jet::constant(fl(0.0));
                for mask in 0u32..(1 << d) {
                    let halves = mask.count_ones() as usize;
                    if halves > index {
                        continue;
                    }
                    let mut term = Jet::constant(fl((-0.5f64).powi(halves as i32)));
                    for (i, c) in cs.iter().enumerate() {
                        if mask & (1 << i) == 0 {
                            term = term.mul(c);
                        }
                    }
                    q = q.add(&term);
                }
                q.ln()
            }
            Form::Rotor(b, w) => {
                let sum = BigRational::from_integer((&w[0] + &w[1]).into());
                let gbar = to_float(&sum) / 2u32;
                let y = t.powf(-1.0).scale(&to_float(b));
                let coeffs = [
                    (1, 3),   // 1/3
                    (1, 15),  // y/15
                    (4, 315), // 4y²/315
                    (1, 315), // y³/315
                ];
                let c: Vec<Float> = coeffs[..index]
                    .iter()
                    .map(|(n, d)| Float::with_val(PREC, *n) / *d)
                    .collect();
                let q = y.powf(-1.0).add(&y.poly(&c)).scale(&gbar);
                q.ln()
            }
            Form::Top {
                b,
                unique,
                weight,
                inversion,
            } => {
                let (bf, uf) = (to_float(b), to_float(unique));
                let pi = Float::with_val(PREC, rug::float::Constant::Pi);
                let k = pi / (Float::with_val(PREC, &uf * &bf) * &bf);
                let mut q = t.powf(3.0).scale(&k).powf(0.5).scale(&to_float(weight));
                if !inversion.is_zero() {
                    // Half the weight lies Δ higher: × (1 + e^{−Δ/t})/2.
                    let upper = t.powf(-1.0).scale(&-to_float(inversion)).exp();
                    q = q.mul(&upper.add_const(&fl(1.0)).scale(&fl(0.5)));
                }
                if index >= 1 {
                    let ratio = Float::with_val(PREC, &bf / &uf);
                    let coef = (fl(4.0) - ratio) * &bf / 12u32;
                    let corr = t.powf(-1.0).scale(&coef).add_const(&fl(1.0));
                    q = q.mul(&corr);
                }
                q.ln()
            }
            Form::Asymmetric { abc, wbar } => {
                let [a, b, c] = abc.each_ref().map(to_float);
                let pi = Float::with_val(PREC, rug::float::Constant::Pi);
                let k = pi / (Float::with_val(PREC, &a * &b) * &c);
                let mut q = t.powf(3.0).scale(&k).powf(0.5).scale(&to_float(wbar));
                if index >= 1 {
                    // (2(A+B+C) − AB/C − BC/A − CA/B)/12
                    let ab_c = Float::with_val(PREC, &a * &b) / &c;
                    let bc_a = Float::with_val(PREC, &b * &c) / &a;
                    let ca_b = Float::with_val(PREC, &c * &a) / &b;
                    let sum = Float::with_val(PREC, &a + &b) + &c;
                    let coef = (sum * 2u32 - ab_c - bc_a - ca_b) / 12u32;
                    let corr = t.powf(-1.0).scale(&coef).add_const(&fl(1.0));
                    q = q.mul(&corr);
                }
                q.ln()
            }
            Form::Spherical(b, weight) => {
                let bf = to_float(b);
                let pi = Float::with_val(PREC, rug::float::Constant::Pi);
                let x = t.powf(-1.0).scale(&bf);
                let mut q = x.powf(-3.0).scale(&pi).powf(0.5).scale(&to_float(weight));
                let quarter = x.scale(&fl(0.25));
                match index {
                    0 => {}
                    1 => q = q.mul(&quarter.add_const(&fl(1.0))),
                    _ => q = q.mul(&quarter.exp()),
                }
                q.ln()
            }
            Form::Harmonic(modes, zp) => {
                let terms = oscillator_terms(*zp);
                let mut lnq = Jet::constant(fl(0.0));
                for (w, deg) in modes {
                    let x = t.powf(-1.0).scale(&to_float(w));
                    let mut q = Jet::constant(fl(0.0));
                    for (p, n, d) in &terms[..=index.min(terms.len() - 1)] {
                        let c = Float::with_val(PREC, *n) / *d;
                        let term = if *p == 0 {
                            Jet::constant(c)
                        } else {
                            x.powf(*p as f64).scale(&c)
                        };
                        q = q.add(&term);
                    }
                    lnq = lnq.add(&q.ln()?.scale(&fl(*deg as f64)));
                }
                Some(lnq)
            }
            Form::Parts(parts) => {
                let child = match sel {
                    Sel::Index(0) => Sel::Index(0),
                    Sel::Index(1) | Sel::First => Sel::First,
                    _ => Sel::Best,
                };
                let mut lnq = Jet::constant(fl(0.0));
                for (f, factor) in parts {
                    let tp = t.scale(&to_float(factor).recip());
                    lnq = lnq.add(&f.ln_q(child, &tp)?);
                }
                Some(lnq)
            }
            Form::Shifted(inner, e0) => {
                let l = inner.ln_q(sel, t)?;
                Some(l.sub(&t.powf(-1.0).scale(&to_float(e0))))
            }
            Form::Levels(levels) => {
                // Shifted by the lowest level so no term underflows first.
                let e0 = levels.iter().map(|l| l.0.clone()).min()?;
                let inv = t.powf(-1.0);
                let mut q = Jet::constant(fl(0.0));
                for (e, g) in levels {
                    let g = to_float(&BigRational::from_integer(g.clone().into()));
                    let x = inv.scale(&-to_float(&(e - &e0)));
                    q = q.add(&x.exp().scale(&g));
                }
                Some(q.ln()?.sub(&inv.scale(&to_float(&e0))))
            }
        }
    }
}

/// q, U/kT, Cv/k and S/k at one temperature.
#[derive(Debug, Clone)]
pub struct Values {
    /// ln q.
    pub ln_q: Float,
    /// U/kT.
    pub u: Float,
    /// Cv/k.
    pub cv: Float,
    /// S/k.
    pub s: Float,
}

impl Values {
    /// The value of `quantity` (q itself for [`Quantity::Q`]).
    pub fn get(&self, quantity: Quantity) -> Float {
        match quantity {
            Quantity::Q => Float::with_val(PREC, self.ln_q.exp_ref()),
            Quantity::U => self.u.clone(),
            Quantity::Cv => self.cv.clone(),
            Quantity::S => self.s.clone(),
        }
    }

    /// The relative error `self/exact − 1` of `quantity` (for q through
    /// the difference of logarithms, so huge q lose nothing).
    pub fn rel_error(&self, exact: &Values, quantity: Quantity) -> Float {
        if quantity == Quantity::Q {
            let d = Float::with_val(PREC, &self.ln_q - &exact.ln_q);
            return d.exp_m1();
        }
        let (a, e) = (self.get(quantity), exact.get(quantity));
        if e.is_zero() {
            return if a.is_zero() {
                fl(0.0)
            } else {
                fl(f64::INFINITY)
            };
        }
        Float::with_val(PREC, &a / &e) - 1u32
    }
}

/// A thermodynamic quantity an approximation is judged by.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Quantity {
    /// The partition function.
    #[serde(rename = "q")]
    Q,
    /// The internal energy (U/kT).
    U,
    /// The heat capacity at constant volume (Cv/k).
    Cv,
    /// The entropy (S/k).
    S,
}

impl Quantity {
    /// Every quantity, in table order.
    pub const ALL: [Quantity; 4] = [Quantity::Q, Quantity::U, Quantity::Cv, Quantity::S];

    /// Reads `q`, `U`, `Cv` or `S` (any case).
    pub fn parse(text: &str) -> Result<Self> {
        match text.to_ascii_lowercase().as_str() {
            "q" => Ok(Quantity::Q),
            "u" => Ok(Quantity::U),
            "cv" => Ok(Quantity::Cv),
            "s" => Ok(Quantity::S),
            _ => Err(Error::parse("quantity", text, "one of q, U, Cv, S")),
        }
    }

    /// Its name: `q`, `U`, `Cv`, `S`.
    pub fn name(&self) -> &'static str {
        match self {
            Quantity::Q => "q",
            Quantity::U => "U",
            Quantity::Cv => "Cv",
            Quantity::S => "S",
        }
    }

    /// The dimensionless column it is shown as: `q`, `U/kT`, `Cv/k`, `S/k`.
    pub fn column(&self) -> &'static str {
        match self {
            Quantity::Q => "q",
            Quantity::U => "U/kT",
            Quantity::Cv => "Cv/k",
            Quantity::S => "S/k",
        }
    }
}

/// Reads a tolerance: a fraction (`0.01`, `1e-3`) or a percentage (`1%`),
/// strictly between 0 and 1.
///
/// ```
/// use zsum::classical::parse_tolerance;
/// assert_eq!(parse_tolerance("1%").unwrap().to_string(), "1/100");
/// assert!(parse_tolerance("0").is_err());
/// assert!(parse_tolerance("100%").is_err());
/// ```
pub fn parse_tolerance(text: &str) -> Result<BigRational> {
    let t = text.trim();
    let value = match t.strip_suffix('%') {
        Some(p) => crate::exact::parse_rational(p)
            .map(|v| v / BigRational::from_integer(100.into()))
            .map_err(|_| {
                Error::parse(
                    "tolerance",
                    text,
                    "a fraction such as 0.01 or a percentage such as 1%",
                )
            })?,
        None => crate::exact::parse_rational(t).map_err(|_| {
            Error::parse(
                "tolerance",
                text,
                "a fraction such as 0.01 or a percentage such as 1%",
            )
        })?,
    };
    if value <= BigRational::zero() || value >= BigRational::from_integer(1.into()) {
        return Err(Error::invalid(
            "tolerance",
            text,
            "it must lie strictly between 0 and 1 (0% and 100%)",
        ));
    }
    Ok(value)
}

/// A spectrum paired with its classical form: the exact sums and every
/// approximation at any temperature.
pub struct Classical<'a> {
    spectrum: &'a dyn Spectrum,
    form: Form,
}

impl<'a> Classical<'a> {
    /// Pairs `spectrum` with its form; a model without a classical limit is
    /// refused, saying which models have one.
    ///
    /// ```
    /// use zsum::classical::{Classical, Quantity};
    /// use zsum::models::rotor::LinearRotor;
    /// use zsum::sum::Temperature;
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let rot = LinearRotor::rigid(parse_rational("1")?, EnergyUnit::Kelvin)?;
    /// let c = Classical::new(&rot)?;
    /// let t = Temperature::Kelvin(parse_rational("10")?);
    /// let exact = c.exact(&t)?;
    /// let classical = c.approximate(c.find("classical")?, &t)?.unwrap();
    /// // q = T/θ classically; the exact sum is about T/θ + 1/3.
    /// let err = classical.rel_error(&exact, Quantity::Q).to_f64();
    /// assert!((err + 0.0322).abs() < 1e-3);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(spectrum: &'a dyn Spectrum) -> Result<Self> {
        let form = Form::of(spectrum).ok_or_else(|| {
            Error::new(
                ErrorKind::InvalidParameter,
                format!(
                    "{} has no classical approximations; boxes, rotors, tops, harmonic \
                     oscillators, diatomics and products of them have",
                    spectrum.describe()
                ),
            )
        })?;
        if let Form::Levels(_) = form {
            return Err(Error::new(
                ErrorKind::InvalidParameter,
                format!(
                    "{} is a finite list of levels, summed exactly at every temperature: it \
                     has no classical limit to compare with (inside a product it is carried \
                     exactly)",
                    spectrum.describe()
                ),
            ));
        }
        Ok(Classical { spectrum, form })
    }

    /// The classical form built from the spectrum's structure.
    pub(crate) fn form(&self) -> &Form {
        &self.form
    }

    /// The spectrum.
    pub fn spectrum(&self) -> &dyn Spectrum {
        self.spectrum
    }

    /// The approximations offered, classical first.
    pub fn approximations(&self) -> Vec<Approximation> {
        self.form.approximations()
    }

    /// The index of the approximation called `name`; an unknown name is
    /// refused, listing those the model has.
    pub fn find(&self, name: &str) -> Result<usize> {
        let list = self.approximations();
        list.iter().position(|a| a.name == name).ok_or_else(|| {
            Error::invalid(
                "approximation",
                name,
                &format!(
                    "{} has: {}",
                    self.spectrum.describe(),
                    list.iter()
                        .map(|a| a.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            )
        })
    }

    /// θ in the spectrum's unit.
    pub fn theta(&self) -> BigRational {
        self.form.theta()
    }

    /// θ in kelvin, when the spectrum's unit has a known size.
    pub fn theta_kelvin(&self) -> Option<BigRational> {
        self.spectrum
            .unit()
            .factor_to(&EnergyUnit::Kelvin)
            .ok()
            .map(|f| self.theta() * f)
    }

    /// The thermal energies kT, in the spectrum's unit, of reduced
    /// temperatures T/θ (exactly: kT = (T/θ)·θ).
    pub fn thermal_energies(&self, reduced: &[BigRational]) -> Vec<BigRational> {
        let theta = self.theta();
        reduced.iter().map(|x| x * &theta).collect()
    }

    /// kT in the spectrum's unit for `temperature`.
    fn kt(&self, temperature: &Temperature) -> Result<BigRational> {
        Ok(temperature.beta(&self.spectrum.unit())?.recip())
    }

    /// The exact values (certified to 40 digits by the engine).
    pub fn exact(&self, temperature: &Temperature) -> Result<Values> {
        self.exact_digits(temperature, EXACT_DIGITS)
    }

    pub(crate) fn exact_digits(&self, temperature: &Temperature, digits: u32) -> Result<Values> {
        let p = thermo(self.spectrum, temperature, digits)?;
        let v = |c: &crate::sum::Certified| Float::with_val(PREC, c.value());
        Ok(Values {
            ln_q: v(&p.ln_q),
            u: v(&p.u_over_kt),
            cv: v(&p.cv_over_k),
            s: v(&p.s_over_k),
        })
    }

    /// Approximation `index` at `temperature`; `None` where it is not
    /// defined (its q is not positive there).
    pub fn approximate(&self, index: usize, temperature: &Temperature) -> Result<Option<Values>> {
        let n = self.form.count();
        if index >= n {
            return Err(Error::invalid(
                "approximation index",
                index,
                &format!("this model has {n} approximations"),
            ));
        }
        let kt = self.kt(temperature)?;
        let t = Jet::var(to_float(&kt));
        let Some(l) = self.form.ln_q(Sel::Index(index), &t) else {
            return Ok(None);
        };
        let tl = Float::with_val(PREC, &t.v * &l.d);
        let t2 = Float::with_val(PREC, t.v.square_ref());
        let cv = Float::with_val(PREC, &tl * 2u32) + Float::with_val(PREC, &t2 * &l.dd);
        let s = Float::with_val(PREC, &l.v + &tl);
        Ok(Some(Values {
            ln_q: l.v,
            u: tl,
            cv,
            s,
        }))
    }

    /// A temperature at `x` = T/θ, exact (kT in the spectrum's unit).
    pub fn at_reduced(&self, x: &BigRational) -> Temperature {
        Temperature::ThermalEnergy(x * self.theta())
    }

    /// T/θ for a temperature.
    pub fn reduced(&self, temperature: &Temperature) -> Result<BigRational> {
        Ok(self.kt(temperature)? / self.theta())
    }
}

/// Digits to which exact values are certified before errors are formed:
/// relative errors are resolved down to about 1e-38.
pub const EXACT_DIGITS: u32 = 40;

/// The smallest relative error that [`EXACT_DIGITS`] resolves.
pub const RESOLUTION: f64 = 1e-37;

impl std::fmt::Display for Quantity {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}
