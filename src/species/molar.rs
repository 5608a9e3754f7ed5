//! Standard molar functions of one species at T and p, as certified
//! numbers: every sum of the engine enters with its error radius, and the
//! translational, spin and mixing terms are added to it in ball arithmetic,
//! so each value carries a rigorous bound. The report layer writes the
//! printed tables from these numbers.

use super::Species;
use crate::error::{Error, ErrorKind, Result};
use crate::exact::{exact_decimal, rational_string};
use crate::models::ParticleInBox;
use crate::spectrum::Spectrum;
use crate::sum::ball::{Ball, RP};
use crate::sum::{ratio_ball, rational_ball, thermo, Cached, Certified, Temperature};
use crate::units::constants;
use num_rational::BigRational;
use num_traits::{One, Signed};
use rug::Float;
use serde::Serialize;

/// How vibration and rotation are modelled.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum VibModel {
    /// The vibrating rotor: anharmonic G(v), B_v = B_e − α_e(v+½), D_e.
    Rovib,
    /// Rigid rotor (B_0) × harmonic oscillator (the fundamental).
    Rrho,
}

/// How translation is treated.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Translation {
    /// Sackur–Tetrode (the box of the ideal gas is macroscopic).
    SackurTetrode,
    /// The exact sum for a cubic box with this side in metres.
    Box(BigRational),
}

/// Which spin-isomer state of a homonuclear molecule. The default, in the
/// library and in every command, is [`Isomer::Normal`]: the gas as it comes
/// from room temperature, its ortho fraction frozen at the high-temperature
/// value.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub enum Isomer {
    /// Ortho and para in equilibrium at every temperature.
    Equilibrium,
    /// Frozen at the high-temperature ratio (3:1 ortho:para for H2).
    #[default]
    Normal,
    /// Only the ortho modification.
    Ortho,
    /// Only the para modification.
    Para,
    /// Frozen at this ortho fraction (species with exactly two isomers,
    /// ortho and para).
    Fraction(BigRational),
    /// Only the isomer of this name, for species whose isomers are named
    /// otherwise (methane's `meta`); ortho and para are [`Isomer::Ortho`]
    /// and [`Isomer::Para`].
    Named(String),
}

impl Isomer {
    /// Reads `equilibrium`, `normal`, `ortho`, `para`, `fraction=X`
    /// (0 ≤ X ≤ 1) or another isomer's name (`meta`: a word of at most 16
    /// lowercase letters; the species checks it).
    pub fn parse(text: &str) -> Result<Self> {
        Ok(match text {
            "equilibrium" => Isomer::Equilibrium,
            "normal" => Isomer::Normal,
            "ortho" => Isomer::Ortho,
            "para" => Isomer::Para,
            name if (1..=16).contains(&name.len())
                && name.bytes().all(|b| b.is_ascii_lowercase()) =>
            {
                Isomer::Named(name.to_string())
            }
            other => {
                let allowed = "equilibrium, normal, ortho, para, an isomer's name (meta) or \
                               fraction=X with 0 <= X <= 1";
                let x = other
                    .strip_prefix("fraction=")
                    .ok_or_else(|| Error::parse("isomer", other, allowed))?;
                let v = crate::exact::parse_rational(x)
                    .map_err(|_| Error::parse("isomer", other, allowed))?;
                if v.is_negative() || v > BigRational::one() {
                    return Err(Error::invalid(
                        "ortho fraction",
                        x,
                        "a fraction between 0 and 1 inclusive",
                    ));
                }
                Isomer::Fraction(v)
            }
        })
    }

    /// Whether the composition is frozen (every state but equilibrium):
    /// each isomer then keeps its own lowest level as its energy zero.
    pub fn is_frozen(&self) -> bool {
        !matches!(self, Isomer::Equilibrium)
    }

    /// The one isomer this state keeps, by name (`None` for mixtures).
    pub fn single(&self) -> Option<&str> {
        match self {
            Isomer::Ortho => Some("ortho"),
            Isomer::Para => Some("para"),
            Isomer::Named(n) => Some(n),
            _ => None,
        }
    }
}

/// The amount the functions are given for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Basis {
    /// Per mole: J/(mol K) and J/mol.
    #[default]
    Mole,
    /// Per kilogram: J/(kg K) and J/kg.
    Kilogram,
    /// Per molecule (or atom): J/K and J.
    Particle,
}

impl Basis {
    /// The factor that turns a value per k (S/k, Cp/k) into this basis:
    /// R = k N_A per mole, R/M per kilogram, k per particle; exact.
    fn per_k(self, sp: &Species) -> BigRational {
        let k = constants::boltzmann();
        match self {
            Basis::Mole => k * constants::avogadro(),
            Basis::Kilogram => k / &sp.mass_kg,
            Basis::Particle => k,
        }
    }
}

/// Options of a molar computation.
#[derive(Debug, Clone)]
pub struct MolarOptions {
    /// Pressure in Pa (standard: 1 bar = 100000 Pa).
    pub pressure: BigRational,
    /// Vibration–rotation model.
    pub model: VibModel,
    /// Translation.
    pub translation: Translation,
    /// Spin isomers (homonuclear molecules with nuclear spin only); `None`
    /// means the default, [`Isomer::Normal`].
    pub isomer: Option<Isomer>,
    /// Significant digits of every value.
    pub digits: u32,
    /// Per mole, per kilogram or per particle.
    pub basis: Basis,
}

impl Default for MolarOptions {
    fn default() -> Self {
        MolarOptions {
            pressure: BigRational::from_integer(100_000.into()),
            model: VibModel::Rovib,
            translation: Translation::SackurTetrode,
            isomer: None,
            digits: crate::exact::DEFAULT_DIGITS,
            basis: Basis::Mole,
        }
    }
}

/// The degeneracy g that divides nΛ³ in the ideal-gas quantum correction.
///
/// zsum takes g = 1 for every species. The first Bose/Fermi correction of
/// an ideal gas whose molecules occupy internal quantum states s (nuclear
/// spin included) with fractions x_s is of relative size
/// `nΛ³ Σ x_s² / 2^{5/2}`, and `Σ x_s² ≤ 1`: g = 1 (one internal state) is
/// the largest the correction can be, so the flag and the refusal never
/// miss a degenerate gas. For He-4 (1S0, nuclear spin 0) g = 1 is exact;
/// for molecules with populated rotational, electronic or nuclear-spin
/// states the true correction is smaller by the factor Σ x_s².
pub const DEGENERACY_G: u32 = 1;

/// The gas's closeness to quantum degeneracy at one T and p (numbers only;
/// the warning text is made where the row is printed).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Degeneracy {
    /// The degeneracy parameter nΛ³ (dimensionless), with `n = p/kT` and
    /// the thermal wavelength `Λ = h/sqrt(2π m kT)`.
    pub n_lambda3: f64,
    /// The g that divides nΛ³ ([`DEGENERACY_G`] = 1).
    #[serde(rename = "degeneracy_g")]
    pub g: u32,
    /// Relative size of the first quantum-statistics correction to the
    /// classical ideal gas, `nΛ³/(g 2^{5/2})` (standard result: the second
    /// virial coefficient of the ideal Bose or Fermi gas).
    pub quantum_correction: f64,
    /// The tolerance the row was printed with, `10^−digits` relative.
    pub quantum_tolerance: f64,
    /// True where a printed entropy (S or S_total) is negative.
    pub negative_entropy: bool,
    /// True where `quantum_correction` exceeds `quantum_tolerance`, or an
    /// entropy is negative: the classical translational values are then
    /// not right to the printed digits.
    pub quantum_flag: bool,
}

impl Degeneracy {
    /// Significant digits of the classical translational values that the
    /// first quantum correction leaves standing: `floor(−log10 correction)`,
    /// at least 0 (`u32::MAX` if the correction is zero).
    pub fn trusted_digits(&self) -> u32 {
        if self.quantum_correction <= 0.0 {
            return u32::MAX;
        }
        let d = -self.quantum_correction.log10();
        if d <= 0.0 {
            0
        } else {
            d.floor().min(u32::MAX as f64) as u32
        }
    }
}

/// nΛ³ for a molecule of mass `m` (kg) at `t` (K) and `pressure` (Pa), at
/// MPFR precision `prec`: `(p/kT) (h²/(2π m kT))^{3/2}`.
pub(crate) fn n_lambda3(
    m: &BigRational,
    t: &BigRational,
    pressure: &BigRational,
    prec: u32,
) -> Float {
    // Exact rationals in GMP: far cheaper than reduced num-bigint products
    // of the long exact constants, and this runs for every temperature.
    use crate::sum::to_rug;
    let kt = to_rug(&constants::boltzmann()) * to_rug(t);
    let h = to_rug(&constants::planck());
    let pi2 = Float::with_val(prec, rug::float::Constant::Pi) * 2u32;
    let ratio = rug::Rational::from(&h * &h) / (to_rug(m) * &kt);
    let lambda2 = Float::with_val(prec, Float::with_val(prec, &ratio) / &pi2);
    let lambda3 = Float::with_val(prec, lambda2.sqrt_ref()) * &lambda2;
    lambda3 * Float::with_val(prec, &(to_rug(pressure) / kt))
}

/// The degeneracy of `sp` at `t` and the options' pressure; refuses the
/// classical row where `nΛ³/g ≥ 1` with an [`ErrorKind::Degenerate`] error.
pub(crate) fn degeneracy(sp: &Species, t: &BigRational, o: &MolarOptions) -> Result<Degeneracy> {
    validate(t, o)?;
    let p = prec(o.digits);
    let nl3 = n_lambda3(&sp.mass_kg, t, &o.pressure, p);
    let per_g = Float::with_val(p, &nl3 / DEGENERACY_G);
    let x = nl3.to_f64();
    if per_g >= 1u32 {
        // nΛ³ ∝ p T^(−5/2): the T at which it falls to 1 at this p, and the
        // p at which it does at this T.
        let t1 = fl(p, t).to_f64() * per_g.to_f64().powf(0.4);
        let p1 = fl(p, &o.pressure).to_f64() / per_g.to_f64();
        let what = match o.translation {
            Translation::SackurTetrode => "Sackur–Tetrode",
            Translation::Box(_) => "the box sum with N! (Boltzmann) counting",
        };
        return Err(Error::new(
            ErrorKind::Degenerate,
            format!(
                "{} at T = {} K and p = {} Pa is quantum-degenerate: nΛ³ = {} (n = p/kT, \
                 Λ = h/sqrt(2π m kT), g = {}) is not below 1, so the classical translational \
                 entropy ({what}) does not apply there (it can even turn negative). Use the \
                 N-particle `zsum ensemble` command (Bose or Fermi statistics on a system \
                 file), or wait for the degenerate ideal gas that a later release adds; or \
                 raise T above {} K or lower p below {} Pa (nΛ³ grows as p T^(-5/2))",
                sp.name,
                exact_decimal(t, 30),
                exact_decimal(&o.pressure, 30),
                sig4(x),
                DEGENERACY_G,
                sig4(t1),
                sig4(p1),
            ),
        ));
    }
    // 2^(5/2) = 4 sqrt(2).
    let two_52 = Float::with_val(p, 2u32).sqrt() * 4u32;
    let c = Float::with_val(p, &per_g / &two_52).to_f64();
    let tol = 10f64.powi(-(o.digits as i32));
    Ok(Degeneracy {
        n_lambda3: x,
        g: DEGENERACY_G,
        quantum_correction: c,
        quantum_tolerance: tol,
        negative_entropy: false,
        quantum_flag: c > tol,
    })
}

/// Per-R values of one contribution, each a ball (centre and error bound).
#[derive(Debug, Clone)]
pub(crate) struct Part {
    /// S/R (absolute, spin included as modelled).
    pub s: Ball,
    /// (H − H0)/RT.
    pub h: Ball,
    /// Cv/R.
    pub cv: Ball,
    /// ln q (absolute).
    pub ln_q: Ball,
}

/// Guard digits: the engine's values are certified to this many digits
/// beyond those printed; the molar functions add a few of them without
/// cancellation (every term of S, H and Cp is positive but the spin and
/// mixing corrections, which are small), so the printed digits stand. The
/// radius of every value says so for each value itself.
const GUARD: u32 = 5;

/// The working precision, in bits, of values to `digits` digits.
pub(crate) fn prec(digits: u32) -> u32 {
    ((digits + 12) as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 32
}

fn fl(prec: u32, r: &BigRational) -> Float {
    Float::with_val(prec, crate::sum::to_rug(r))
}

/// An exact number as a ball of `prec` bits.
pub(crate) fn exact<T>(prec: u32, v: T) -> Ball
where
    Float: rug::Assign<T>,
{
    Ball::exact(Float::with_val(prec, v))
}

/// A centre whose error is not bounded (an operation whose ball would say
/// nothing): its digits are never proved.
fn unbounded(c: Float) -> Ball {
    Ball {
        c,
        r: Float::with_val(RP, rug::float::Special::Infinity),
    }
}

/// ln of a ball (unbounded where the ball reaches zero).
fn ln(b: &Ball) -> Ball {
    b.ln()
        .unwrap_or_else(|| unbounded(Float::with_val(b.prec(), b.c.ln_ref())))
}

/// e to a ball (unbounded where it leaves MPFR's range or the radius is 1
/// or more).
pub(crate) fn exp(b: &Ball) -> Ball {
    b.exp()
        .unwrap_or_else(|| unbounded(Float::with_val(b.prec(), b.c.exp_ref())))
}

/// `a / b` (unbounded where b's ball holds zero).
pub(crate) fn div(a: &Ball, b: &Ball) -> Ball {
    a.div(b)
        .unwrap_or_else(|| unbounded(Float::with_val(a.prec().max(b.prec()), &a.c / &b.c)))
}

/// A certified value of the engine at `prec` bits: its centre rounded,
/// that rounding added to its radius.
fn engine(c: &Certified, prec: u32) -> Ball {
    Ball::rounded(Float::with_val(prec, c.value()), c.radius().clone())
}

/// hc/k in K per cm⁻¹ (the second radiation constant in m K, × 100),
/// exact: an energy in cm⁻¹ times this over T is E/kT.
fn c2_per_cm() -> BigRational {
    constants::second_radiation_constant() * BigRational::from_integer(100.into())
}

/// The internal contribution of `s` at T, energies from `zero` (cm⁻¹).
pub(crate) fn internal_part(
    s: &dyn Spectrum,
    t: &BigRational,
    zero: &BigRational,
    digits: u32,
) -> Result<Part> {
    let p = prec(digits);
    let point = thermo(s, &Temperature::Kelvin(t.clone()), digits + GUARD)?;
    let ln_q = engine(&point.ln_q, p);
    let u = engine(&point.u_over_kt, p);
    let cv = engine(&point.cv_over_k, p);
    let e0 = ratio_ball(&[zero, &c2_per_cm()], &[t], p);
    Ok(Part {
        s: ln_q.add(&u),
        h: u.sub(&e0),
        cv,
        ln_q,
    })
}

/// Translation at T and p for mass `m` (kg).
fn translation(m: &BigRational, t: &BigRational, o: &MolarOptions) -> Result<Part> {
    let p = prec(o.digits);
    let k = constants::boltzmann();
    let h = constants::planck();
    match &o.translation {
        Translation::SackurTetrode => {
            // ln[(2π m kT/h²)^{3/2} kT/p] + 5/2
            let pi = Ball::rounded(Float::with_val(p, rug::float::Constant::Pi), Float::new(RP));
            let a = ratio_ball(&[m, &k, t], &[&h, &h], p).mul(&pi.mul_int(2));
            let ln_q =
                ln(&a)
                    .mul(&exact(p, 1.5f64))
                    .add(&ln(&ratio_ball(&[&k, t], &[&o.pressure], p)));
            Ok(Part {
                s: ln_q.add(&exact(p, 2.5f64)),
                h: exact(p, 2.5f64),
                cv: exact(p, 1.5f64),
                ln_q,
            })
        }
        Translation::Box(side) => {
            let kt = &k * t;
            let b = ParticleInBox::cube(3)?.with_scale(m, side);
            let point = thermo(&b, &Temperature::Kelvin(t.clone()), o.digits + GUARD)?;
            let ln_qb = engine(&point.ln_q, p);
            let u = engine(&point.u_over_kt, p);
            let cv = engine(&point.cv_over_k, p);
            // Ground level 3 box units, measured from.
            let unit_j = crate::units::box_unit_joules(m, side);
            let e0 = rational_ball(&(BigRational::from_integer(3.into()) * unit_j / &kt), p);
            // N = pV/kT per molecule count in the box.
            let v = side * side * side;
            let ln_n = ln(&rational_ball(&(&o.pressure * v / &kt), p));
            let ln_q = ln_qb.sub(&ln_n);
            Ok(Part {
                s: ln_q.add(&u).add(&exact(p, 1u32)),
                h: u.sub(&e0).add(&exact(p, 1u32)),
                cv,
                ln_q,
            })
        }
    }
}

/// x ln x, 0 at 0. A ball about 0 of radius r < 1/e holds values whose
/// x ln x is at most r |ln r| in size; the bound taken is r (|ln r| + 1).
fn xlnx(x: &Ball) -> Ball {
    if x.c.is_zero() {
        let r = if x.r.is_zero() {
            Float::new(RP)
        } else if x.r < 0.25 {
            let ln_r = Float::with_val(RP, x.r.ln_ref());
            crate::sum::ball::up_mul(
                &x.r,
                &crate::sum::ball::up_add(&ln_r.abs(), &Float::with_val(RP, 1)),
            )
        } else {
            Float::with_val(RP, rug::float::Special::Infinity)
        };
        return Ball {
            c: Float::with_val(x.prec(), 0),
            r,
        };
    }
    ln(x).mul(x)
}

/// One spin isomer's internal part, from the common energy zero (the
/// lowest level of the whole species).
pub(crate) struct IsomerPart {
    /// The isomer's name (`ortho`, `para`, `meta`).
    pub name: String,
    /// Its internal functions, with its spin weights in every level.
    pub part: Part,
    /// Its number of nuclear-spin functions (3 for ortho-H2).
    pub w: u64,
    /// Its lowest level above the common zero, in units of kT: subtracted
    /// from its H/RT when the composition is frozen, so that each isomer
    /// keeps its own lowest level as its energy zero.
    pub zero: Ball,
}

/// Internal parts of the equilibrium mixture and of each isomer, with the
/// common energy zero (the equilibrium ground level).
pub(crate) struct IsomerParts {
    pub eq: Part,
    /// The isomers in the species' order (ortho before para).
    pub isomers: Vec<IsomerPart>,
    /// Each isomer's equilibrium fraction q_i/q.
    pub eq_fractions: Vec<Ball>,
}

impl IsomerParts {
    /// The isomer called `name`.
    pub fn get(&self, name: &str) -> Option<&IsomerPart> {
        self.isomers.iter().find(|i| i.name == name)
    }

    /// The isomer fractions of the composition `state` of `sp`: the
    /// equilibrium ones, the statistical ones (normal), one isomer alone,
    /// or an ortho fraction (species with ortho and para alone); an
    /// unknown isomer is refused naming the species' isomers.
    pub fn fractions(&self, sp: &Species, state: &Isomer, prec: u32) -> Result<Vec<Ball>> {
        Ok(match state {
            Isomer::Equilibrium => self.eq_fractions.clone(),
            Isomer::Normal => self.normal_fractions(prec),
            Isomer::Fraction(x) => {
                if self.isomers.len() != 2 || self.isomers[0].name != "ortho" {
                    return Err(Error::invalid(
                        "isomer",
                        format!("fraction={}", exact_decimal(x, 20)),
                        &format!(
                            "an ortho fraction needs a species with ortho and para alone; {} \
                             has {} isomers: give one of them by name, equilibrium or normal",
                            sp.name,
                            self.isomers.len()
                        ),
                    ));
                }
                let x = rational_ball(x, prec);
                let one_x = exact(prec, 1u32).sub(&x);
                vec![x, one_x]
            }
            single => {
                let name = single.single().unwrap_or_default();
                if self.get(name).is_none() {
                    let names: Vec<&str> = self.isomers.iter().map(|i| i.name.as_str()).collect();
                    return Err(Error::invalid(
                        "isomer",
                        name,
                        &format!(
                            "{} has the isomers {}; or give equilibrium or normal",
                            sp.name,
                            names.join(", ")
                        ),
                    ));
                }
                self.isomers
                    .iter()
                    .map(|i| exact(prec, u32::from(i.name == name)))
                    .collect()
            }
        })
    }

    /// The high-temperature (statistical) fractions w_i / Σ w.
    pub fn normal_fractions(&self, prec: u32) -> Vec<Ball> {
        let total: u64 = self.isomers.iter().map(|i| i.w).sum();
        let mut x: Vec<Ball> = self
            .isomers
            .iter()
            .map(|i| div(&exact(prec, i.w), &exact(prec, total)))
            .collect();
        if x.len() == 2 {
            // Two isomers: the second is 1 − x exactly as the mixture's
            // formulas write it.
            x[1] = exact(prec, 1u32).sub(&x[0]);
        }
        x
    }
}

/// A species' internal spectra: the whole and, for species with spin
/// isomers, each isomer with its spin weight.
type Owned = Box<dyn Spectrum + Send + Sync>;

pub(crate) struct Spectra {
    full: Owned,
    /// Each isomer's name, spectrum (with its spin weights) and number of
    /// nuclear-spin functions; empty without isomers.
    iso: Vec<(String, Owned, u64)>,
}

impl Spectra {
    pub fn new(sp: &Species, model: VibModel) -> Result<Self> {
        let full = sp.internal(model, None)?;
        let mut iso = Vec::new();
        for (name, w) in sp.isomers() {
            let s = sp.internal_isomer(model, &name)?;
            iso.push((name, s, w));
        }
        Ok(Spectra { full, iso })
    }

    /// Views that keep level listings across a temperature grid.
    pub fn cached(&self) -> CachedSpectra<'_> {
        CachedSpectra {
            full: Cached::new(self.full.as_ref()),
            iso: self
                .iso
                .iter()
                .map(|(n, s, w)| (n.clone(), Cached::new(s.as_ref()), *w))
                .collect(),
        }
    }
}

/// [`Spectra`] with level caches (clones share them).
#[derive(Clone)]
pub(crate) struct CachedSpectra<'a> {
    full: Cached<'a>,
    iso: Vec<(String, Cached<'a>, u64)>,
}

/// The refusal for a species without spin isomers asked for one.
pub(crate) fn no_isomers(sp: &Species) -> Error {
    Error::invalid(
        "isomer",
        &sp.name,
        "only molecules with nuclear-spin isomers (H2, D2, N2, H2O, NH3, CH4, ...) have isomer \
         states; `zsum species list` says which",
    )
}

pub(crate) fn isomer_parts(
    sp: &Species,
    c: &CachedSpectra,
    t: &BigRational,
    digits: u32,
) -> Result<IsomerParts> {
    if c.iso.is_empty() {
        return Err(no_isomers(sp));
    }
    let zero = c.full.ground_energy();
    let c2 = c2_per_cm();
    let mut isomers = Vec::with_capacity(c.iso.len());
    for (name, s, w) in &c.iso {
        let part = internal_part(s, t, &zero, digits)?;
        let prec = part.ln_q.prec();
        let above = ratio_ball(&[&(s.ground_energy() - &zero), &c2], &[t], prec);
        isomers.push(IsomerPart {
            name: name.clone(),
            part,
            w: *w,
            zero: above,
        });
    }
    let prec = isomers[0].part.ln_q.prec();
    let one = exact(prec, 1u32);
    let (eq, eq_fractions) = if let [o, p] = &isomers[..] {
        // Two isomers (q = q_o + q_p): with x = q_o/q, U and Cv are the
        // mixture's mean and variance of E/kT, Cv = x Cv_o + (1 − x) Cv_p
        // + x(1 − x)(U_o − U_p)², from absolute U/kT.
        let (ortho, para) = (&o.part, &p.part);
        let d = para.ln_q.sub(&ortho.ln_q);
        let x = div(&one, &exp(&d).add(&one));
        let one_x = one.sub(&x);
        let ln_q = ortho.ln_q.sub(&ln(&x));
        let (uo, up) = (ortho.s.sub(&ortho.ln_q), para.s.sub(&para.ln_q));
        let u = x.mul(&uo).add(&one_x.mul(&up));
        let gap = uo.sub(&up);
        let cv = x
            .mul(&ortho.cv)
            .add(&one_x.mul(&para.cv))
            .add(&x.mul(&one_x).mul(&gap.mul(&gap)));
        let h = x.mul(&ortho.h).add(&one_x.mul(&para.h));
        let eq = Part {
            s: ln_q.add(&u),
            h,
            cv,
            ln_q,
        };
        // The second fraction directly (not 1 − x, which loses it to
        // rounding when it is tiny: para-D2 in the cold).
        let e = exp(&d);
        let x_second = div(&e, &e.add(&one));
        (eq, vec![x, x_second])
    } else {
        // Any number of isomers: x_i = q_i/q from ln q_i − ln q_0, then
        // U = Σ x_i U_i, Cv = Σ x_i Cv_i + Σ x_i (U_i − U)².
        let base = &isomers[0].part.ln_q;
        let rel: Vec<Ball> = isomers
            .iter()
            .map(|i| exp(&i.part.ln_q.sub(base)))
            .collect();
        let total = rel[1..].iter().fold(rel[0].clone(), |a, r| a.add(r));
        let x: Vec<Ball> = rel.iter().map(|r| div(r, &total)).collect();
        let ln_q = base.add(&ln(&total));
        let us: Vec<Ball> = isomers.iter().map(|i| i.part.s.sub(&i.part.ln_q)).collect();
        let weighted = |f: &dyn Fn(usize) -> Ball| {
            (1..x.len()).fold(x[0].mul(&f(0)), |a, k| a.add(&x[k].mul(&f(k))))
        };
        let u = weighted(&|k| us[k].clone());
        let spread = weighted(&|k| {
            let d = us[k].sub(&u);
            d.mul(&d)
        });
        let cv = weighted(&|k| isomers[k].part.cv.clone()).add(&spread);
        let h = weighted(&|k| isomers[k].part.h.clone());
        let eq = Part {
            s: ln_q.add(&u),
            h,
            cv,
            ln_q,
        };
        (eq, x)
    };
    Ok(IsomerParts {
        eq,
        isomers,
        eq_fractions,
    })
}

/// What H0, the zero of H − H0 and −(G − H0)/T, is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Reference {
    /// The species' lowest level.
    LowestLevel,
    /// For a frozen spin-isomer composition: each isomer's own lowest
    /// level.
    EachIsomerLowestLevel,
}

impl Reference {
    /// The reference of a species with spin isomers in state `isomer`, or
    /// without them (`None`).
    pub fn of(isomer: Option<&Isomer>) -> Reference {
        match isomer {
            Some(i) if i.is_frozen() => Reference::EachIsomerLowestLevel,
            _ => Reference::LowestLevel,
        }
    }
}

/// The standard molar functions of one species at one temperature and
/// pressure, each a [`Certified`] number in the options' basis (per mole:
/// J/(mol K) and J/mol; per kilogram: J/(kg K) and J/kg; per particle: J/K
/// and J), computed for [`MolarValues::digits`] significant digits.
#[derive(Debug, Clone)]
pub struct MolarValues {
    /// The species' name.
    pub species: String,
    /// T in kelvin, exact.
    pub t: BigRational,
    /// p in Pa, exact.
    pub pressure: BigRational,
    /// The spin-isomer state, for species that have one.
    pub isomer: Option<Isomer>,
    /// The ortho fraction, for species with spin isomers.
    pub ortho_fraction: Option<Certified>,
    /// Conventional entropy S (nuclear spin excluded).
    pub s: Certified,
    /// Entropy including nuclear spin (and isomer mixing); equal to S where
    /// no nuclear-spin statistics are modelled.
    pub s_total: Certified,
    /// Heat capacity at constant pressure.
    pub cp: Certified,
    /// Heat capacity at constant volume.
    pub cv: Certified,
    /// H(T) − H0, with H0 as [`MolarValues::reference`] says.
    pub h_minus_h0: Certified,
    /// −(G(T) − H0)/T.
    pub minus_g_minus_h0_over_t: Certified,
    /// What H0 is.
    pub reference: Reference,
    /// The amount the values are given for.
    pub basis: Basis,
    /// The significant digits the values were computed for.
    pub digits: u32,
    /// How far the gas is from quantum degeneracy at this T and p, and
    /// whether the classical translation is flagged.
    pub degeneracy: Degeneracy,
}

/// The standard molar functions of `species` at `t` (K).
///
/// ```
/// use zsum::species::{molar, Database, MolarOptions};
/// use zsum::exact::parse_rational;
/// let db = Database::builtin()?;
/// let p = molar(db.find("Ar")?, &parse_rational("298.15")?, &MolarOptions::default())?;
/// // CODATA Key Values (1989), S°(Ar, 298.15 K) = 154.846 ± 0.003 J/(mol K) (from memory).
/// assert!((p.s.to_f64() - 154.846).abs() < 0.002);
/// // Every printed digit is proved by the value's radius.
/// assert!(p.s.decimal(p.digits).is_some());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn molar(sp: &Species, t: &BigRational, o: &MolarOptions) -> Result<MolarValues> {
    let spectra = Spectra::new(sp, o.model)?;
    molar_with(sp, &spectra.cached(), t, o)
}

/// Checks T, p and digits before any work.
fn validate(t: &BigRational, o: &MolarOptions) -> Result<()> {
    if !t.is_positive() {
        return Err(Error::invalid(
            "T",
            rational_string(t),
            "it must be greater than zero",
        ));
    }
    if !o.pressure.is_positive() {
        return Err(Error::invalid(
            "p",
            rational_string(&o.pressure),
            "the pressure must be greater than zero (in Pa; 1 bar = 100000)",
        ));
    }
    if !(1..=60).contains(&o.digits) {
        return Err(Error::invalid(
            "digits",
            o.digits,
            "choose between 1 and 60",
        ));
    }
    Ok(())
}

pub(crate) fn molar_with(
    sp: &Species,
    cached: &CachedSpectra,
    t: &BigRational,
    o: &MolarOptions,
) -> Result<MolarValues> {
    validate(t, o)?;
    let p = prec(o.digits);
    let mut degeneracy = degeneracy(sp, t, o)?;
    let tr = translation(&sp.mass_kg, t, o)?;
    let one = exact(p, 1u32);
    let has_isomers = !cached.iso.is_empty();
    let (int_s, int_s_total, int_h, int_cv, ortho) = match (&o.isomer, has_isomers) {
        (Some(_), false) => return Err(no_isomers(sp)),
        (None, false) => {
            let s = &cached.full;
            let part = internal_part(s, t, &s.ground_energy(), o.digits)?;
            let g = ln(&exact(p, sp.spin_states()));
            let conv = part.s.sub(&g);
            (conv, part.s, part.h, part.cv, None)
        }
        (iso, true) => {
            let ip = isomer_parts(sp, cached, t, o.digits)?;
            let ortho_at = |x: &[Ball]| {
                ip.isomers
                    .iter()
                    .position(|i| i.name == "ortho")
                    .map(|k| x[k].clone())
            };
            // A frozen composition with fractions x_i: S without spin is
            // Σ x_i (S_i − ln w_i), S_total adds the mixing −Σ x_i ln x_i,
            // and each isomer keeps its own lowest level as H0.
            let frozen = |x: Vec<Ball>| {
                let sum = |f: &dyn Fn(&IsomerPart) -> Ball| {
                    let mut terms = ip.isomers.iter().zip(&x).map(|(i, xi)| xi.mul(&f(i)));
                    let first = terms.next().expect("a species with isomers has one");
                    terms.fold(first, |a, b| a.add(&b))
                };
                let mix = x[1..].iter().fold(xlnx(&x[0]), |a, xi| a.add(&xlnx(xi)));
                let total = sum(&|i| i.part.s.clone()).sub(&mix);
                let conv = sum(&|i| i.part.s.sub(&ln(&exact(p, i.w))));
                let h = sum(&|i| i.part.h.sub(&i.zero));
                let cv = sum(&|i| i.part.cv.clone());
                let ortho = ortho_at(&x);
                (conv, total, h, cv, ortho)
            };
            match iso.clone().unwrap_or_default() {
                Isomer::Equilibrium => {
                    let g = ln(&exact(p, sp.spin_states()));
                    let conv = ip.eq.s.sub(&g);
                    (
                        conv,
                        ip.eq.s.clone(),
                        ip.eq.h.clone(),
                        ip.eq.cv.clone(),
                        ortho_at(&ip.eq_fractions),
                    )
                }
                frozen_state => frozen(ip.fractions(sp, &frozen_state, p)?),
            }
        }
    };
    let s = tr.s.add(&int_s);
    let s_total = tr.s.add(&int_s_total);
    let h = tr.h.add(&int_h);
    let cv = tr.cv.add(&int_cv);
    let r = rational_ball(&o.basis.per_k(sp), p);
    let rt = r.mul(&rational_ball(t, p));
    let isomer = has_isomers.then(|| o.isomer.clone().unwrap_or_default());
    let cp = cv.add(&one);
    let g = s.sub(&h);
    // A negative entropy is never printed unflagged.
    // (−(G − H0)/T is not an entropy: it is negative for frozen normal
    // hydrogen at low T, where H − H0 holds the ortho rotational energy.)
    degeneracy.negative_entropy = [&s, &s_total]
        .iter()
        .any(|v| v.c.cmp0() == Some(std::cmp::Ordering::Less));
    degeneracy.quantum_flag |= degeneracy.negative_entropy;
    Ok(MolarValues {
        species: sp.name.clone(),
        t: t.clone(),
        pressure: o.pressure.clone(),
        reference: Reference::of(isomer.as_ref()),
        basis: o.basis,
        digits: o.digits,
        isomer,
        ortho_fraction: ortho.map(Certified),
        s: Certified(s.mul(&r)),
        s_total: Certified(s_total.mul(&r)),
        cp: Certified(cp.mul(&r)),
        cv: Certified(cv.mul(&r)),
        h_minus_h0: Certified(h.mul(&rt)),
        minus_g_minus_h0_over_t: Certified(g.mul(&r)),
        degeneracy,
    })
}

/// One species' standard molar functions over a temperature grid.
#[derive(Debug, Clone)]
pub struct MolarGrid {
    /// The species' name.
    pub species: String,
    /// p in Pa, exact.
    pub pressure: BigRational,
    /// The amount every row is given for.
    pub basis: Basis,
    /// The significant digits every value was computed for.
    pub digits: u32,
    /// The rows, in grid order.
    pub rows: Vec<MolarValues>,
}

impl MolarGrid {
    /// The functions of `sp` over `grid` (kelvin), listing internal levels
    /// once for the whole grid. A temperature where the gas is
    /// quantum-degenerate refuses the whole grid before any sum is done.
    pub fn compute(sp: &Species, grid: &[BigRational], o: &MolarOptions) -> Result<Self> {
        Self::compute_metered(sp, grid, o, &crate::budget::Meter::unlimited())
    }

    /// As [`MolarGrid::compute`], the temperatures timed by `meter`
    /// (hottest, costliest, first), which refuses the rest once their
    /// projected time exceeds its budget.
    pub fn compute_metered(
        sp: &Species,
        grid: &[BigRational],
        o: &MolarOptions,
        meter: &crate::budget::Meter,
    ) -> Result<Self> {
        // Refuse a degenerate temperature before any sum is done.
        for t in grid {
            degeneracy(sp, t, o)?;
        }
        let spectra = Spectra::new(sp, o.model)?;
        // Hottest first over every core (budget::sweep): each core's first
        // listing serves every later temperature.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
        let mut rows: Vec<Option<MolarValues>> = vec![None; grid.len()];
        let shared = spectra.cached();
        let cached = || shared.clone();
        let work = |c: &_, i: usize, _: Option<(&crate::budget::Meter, f64)>| {
            molar_with(sp, c, &grid[i], o)
        };
        for (i, v) in crate::budget::sweep(&order, cached, work, meter)? {
            rows[i] = Some(v);
        }
        Ok(MolarGrid {
            species: sp.name.clone(),
            pressure: o.pressure.clone(),
            basis: o.basis,
            digits: o.digits,
            rows: rows.into_iter().flatten().collect(),
        })
    }
}

/// The functions of every species in `species` over one grid, computed on
/// all available cores (one species per task), in the order given.
pub fn molar_grids(
    species: &[&Species],
    grid: &[BigRational],
    o: &MolarOptions,
) -> Result<Vec<MolarGrid>> {
    use rayon::prelude::*;
    species
        .par_iter()
        .map(|sp| MolarGrid::compute(sp, grid, o))
        .collect()
}

fn sig4(v: f64) -> String {
    crate::exact::format_sig_f64(v, 4)
}
