//! Standard molar functions of one species at T and p.

use super::Species;
use crate::error::{Error, ErrorKind, Result};
use crate::exact::{exact_decimal, rational_string};
use crate::export::{units_block, Column, Tabular};
use crate::models::diatomic::ParityWeights;
use crate::models::ParticleInBox;
use crate::spectrum::Spectrum;
use crate::sum::{float_to_decimal, thermo, Cached, Temperature};
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
    /// Frozen at this ortho fraction.
    Fraction(BigRational),
}

impl Isomer {
    /// Reads `equilibrium`, `normal`, `ortho`, `para` or `fraction=X` (0 ≤ X ≤ 1).
    pub fn parse(text: &str) -> Result<Self> {
        Ok(match text {
            "equilibrium" => Isomer::Equilibrium,
            "normal" => Isomer::Normal,
            "ortho" => Isomer::Ortho,
            "para" => Isomer::Para,
            other => {
                let allowed = "equilibrium, normal, ortho, para or fraction=X with 0 <= X <= 1";
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

    /// Its name in output.
    pub fn name(&self) -> String {
        match self {
            Isomer::Equilibrium => "equilibrium".into(),
            Isomer::Normal => "normal".into(),
            Isomer::Ortho => "ortho".into(),
            Isomer::Para => "para".into(),
            Isomer::Fraction(x) => format!("fraction={}", exact_decimal(x, 20)),
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
    /// The units of an entropy or heat capacity and of an energy.
    pub fn units(self) -> (&'static str, &'static str) {
        match self {
            Basis::Mole => ("J/(mol K)", "J/mol"),
            Basis::Kilogram => ("J/(kg K)", "J/kg"),
            Basis::Particle => ("J/K", "J"),
        }
    }

    /// Its name in output: `mole`, `kg` or `particle`.
    pub fn name(self) -> &'static str {
        match self {
            Basis::Mole => "mole",
            Basis::Kilogram => "kg",
            Basis::Particle => "particle",
        }
    }

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

/// Standard molar functions at one temperature.
#[derive(Debug, Clone, Serialize)]
pub struct MolarPoint {
    /// The species.
    pub species: String,
    /// T in kelvin.
    #[serde(rename = "T")]
    pub t: String,
    /// p in Pa.
    pub p: String,
    /// The spin-isomer state, for species that have one.
    pub isomer: Option<String>,
    /// The ortho fraction, for species with spin isomers.
    pub ortho_fraction: Option<String>,
    /// Conventional entropy (nuclear spin excluded), in `units["S"]`.
    #[serde(rename = "S")]
    pub s: String,
    /// Entropy including nuclear spin (and isomer mixing); equal to S where
    /// no nuclear-spin statistics are modelled.
    #[serde(rename = "S_total")]
    pub s_total: String,
    /// Cp.
    #[serde(rename = "Cp")]
    pub cp: String,
    /// Cv.
    #[serde(rename = "Cv")]
    pub cv: String,
    /// H(T) − H0, with H0 as [`MolarPoint::reference`] says.
    #[serde(rename = "H_minus_H0")]
    pub h: String,
    /// −(G(T) − H0)/T.
    #[serde(rename = "minus_G_minus_H0_over_T")]
    pub g: String,
    /// What H0 is: the lowest level, or for a frozen spin-isomer mixture
    /// each isomer's own lowest level.
    pub reference: String,
    /// The basis: `mole`, `kg` or `particle`.
    pub per: String,
    /// How far the gas is from quantum degeneracy at this T and p, and
    /// whether the classical translation is flagged.
    #[serde(flatten)]
    pub degeneracy: Degeneracy,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
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
    let kt = constants::boltzmann() * t;
    let h = constants::planck();
    let pi2 = Float::with_val(prec, rug::float::Constant::Pi) * 2u32;
    let lambda2 = Float::with_val(prec, fl(prec, &(&h * &h / (m * &kt))) / &pi2);
    let lambda3 = Float::with_val(prec, lambda2.sqrt_ref()) * &lambda2;
    lambda3 * fl(prec, &(pressure / &kt))
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

/// Per-R values of one contribution.
#[derive(Debug, Clone)]
pub(crate) struct Part {
    /// S/R (absolute, spin included as modelled).
    pub s: Float,
    /// (H − H0)/RT.
    pub h: Float,
    /// Cv/R.
    pub cv: Float,
    /// ln q (absolute).
    pub ln_q: Float,
}

/// Guard digits: the engine's values are certified to this many digits
/// beyond those printed; the molar functions add a few of them without
/// cancellation (every term of S, H and Cp is positive but the spin and
/// mixing corrections, which are small), so the printed digits stand.
const GUARD: u32 = 5;

pub(crate) fn prec(digits: u32) -> u32 {
    ((digits + 12) as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 32
}

pub(crate) fn fl(prec: u32, r: &BigRational) -> Float {
    Float::with_val(prec, crate::sum::to_rug(r))
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
    let ln_q = Float::with_val(p, point.ln_q.value());
    let u = Float::with_val(p, point.u_over_kt.value());
    let cv = Float::with_val(p, point.cv_over_k.value());
    let e0 = fl(p, &(zero * c2_per_cm() / t));
    Ok(Part {
        s: Float::with_val(p, &ln_q + &u),
        h: Float::with_val(p, &u - &e0),
        cv,
        ln_q,
    })
}

/// Translation at T and p for mass `m` (kg).
fn translation(m: &BigRational, t: &BigRational, o: &MolarOptions) -> Result<Part> {
    let p = prec(o.digits);
    let k = constants::boltzmann();
    let h = constants::planck();
    let kt = &k * t;
    match &o.translation {
        Translation::SackurTetrode => {
            // ln[(2π m kT/h²)^{3/2} kT/p] + 5/2
            let pi = Float::with_val(p, rug::float::Constant::Pi);
            let a = fl(p, &(m * &kt / (&h * &h))) * Float::with_val(p, &pi * 2u32);
            let ln_q = Float::with_val(p, a.ln()) * 1.5f64 + fl(p, &(&kt / &o.pressure)).ln();
            Ok(Part {
                s: Float::with_val(p, &ln_q + 2.5f64),
                h: Float::with_val(p, 2.5f64),
                cv: Float::with_val(p, 1.5f64),
                ln_q,
            })
        }
        Translation::Box(side) => {
            let b = ParticleInBox::cube(3)?.with_scale(m, side);
            let point = thermo(&b, &Temperature::Kelvin(t.clone()), o.digits + GUARD)?;
            let ln_qb = Float::with_val(p, point.ln_q.value());
            let u = Float::with_val(p, point.u_over_kt.value());
            let cv = Float::with_val(p, point.cv_over_k.value());
            // Ground level 3 box units, measured from.
            let unit_j = crate::units::box_unit_joules(m, side);
            let e0 = fl(p, &(BigRational::from_integer(3.into()) * unit_j / &kt));
            // N = pV/kT per molecule count in the box.
            let v = side * side * side;
            let ln_n = fl(p, &(&o.pressure * v / &kt)).ln();
            let ln_q = Float::with_val(p, &ln_qb - &ln_n);
            Ok(Part {
                s: Float::with_val(p, &ln_q + &u) + 1u32,
                h: Float::with_val(p, &u - &e0) + 1u32,
                cv,
                ln_q,
            })
        }
    }
}

fn xlnx(x: &Float) -> Float {
    if x.is_zero() {
        Float::with_val(x.prec(), 0)
    } else {
        Float::with_val(x.prec(), x.ln_ref()) * x
    }
}

/// The spin isomers' weights `(ortho, para)` of a species.
pub(crate) fn isomer_weights(sp: &Species) -> Result<(ParityWeights, ParityWeights)> {
    let m = sp
        .molecule
        .as_ref()
        .filter(|_| sp.has_spin_isomers())
        .ok_or_else(|| {
            Error::invalid(
            "isomer",
            &sp.name,
            "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para forms",
        )
        })?;
    let o = crate::system::restrict_weights(m.weights.clone(), Some("ortho"))?;
    let pw = crate::system::restrict_weights(m.weights.clone(), Some("para"))?;
    Ok((o, pw))
}

/// Internal parts of the equilibrium mixture and of each isomer, with the
/// common energy zero (the equilibrium ground level).
pub(crate) struct IsomerParts {
    pub eq: Part,
    pub ortho: Part,
    pub para: Part,
    /// Spin weights of the ortho and para parities.
    pub w_ortho: u64,
    pub w_para: u64,
    /// Each isomer's lowest level above the common zero, in units of kT:
    /// subtracted from its H/RT when the composition is frozen, so that
    /// each isomer keeps its own lowest level as its energy zero.
    pub ortho_zero: Float,
    pub para_zero: Float,
}

/// A species' internal spectra: the whole and, for species with spin
/// isomers, each isomer with its spin weight.
type Owned = Box<dyn Spectrum + Send + Sync>;

pub(crate) struct Spectra {
    full: Owned,
    /// Ortho and para spectra with their spin weights.
    iso: Option<(Owned, Owned, u64, u64)>,
}

impl Spectra {
    pub fn new(sp: &Species, model: VibModel) -> Result<Self> {
        let full = sp.internal(model, None)?;
        let iso = if sp.has_spin_isomers() {
            let (o, pw) = isomer_weights(sp)?;
            let w = |x: &ParityWeights| -> u64 {
                let v = x.weight(0).max(x.weight(1)).clone();
                u64::try_from(v).unwrap_or(u64::MAX)
            };
            let (wo, wp) = (w(&o), w(&pw));
            Some((
                sp.internal(model, Some(o))?,
                sp.internal(model, Some(pw))?,
                wo,
                wp,
            ))
        } else {
            None
        };
        Ok(Spectra { full, iso })
    }

    /// Views that keep level listings across a temperature grid.
    pub fn cached(&self) -> CachedSpectra<'_> {
        CachedSpectra {
            full: Cached::new(self.full.as_ref()),
            iso: self
                .iso
                .as_ref()
                .map(|(o, p, wo, wp)| (Cached::new(o.as_ref()), Cached::new(p.as_ref()), *wo, *wp)),
        }
    }
}

/// [`Spectra`] with level caches.
pub(crate) struct CachedSpectra<'a> {
    full: Cached<'a>,
    iso: Option<(Cached<'a>, Cached<'a>, u64, u64)>,
}

pub(crate) fn isomer_parts(
    sp: &Species,
    c: &CachedSpectra,
    t: &BigRational,
    digits: u32,
) -> Result<IsomerParts> {
    let (o, p, wo, wp) = c.iso.as_ref().ok_or_else(|| {
        Error::invalid(
            "isomer",
            &sp.name,
            "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para forms",
        )
    })?;
    let zero = c.full.ground_energy();
    let ortho = internal_part(o, t, &zero, digits)?;
    let para = internal_part(p, t, &zero, digits)?;
    let prec = ortho.ln_q.prec();
    let above = |s: &Cached| fl(prec, &((s.ground_energy() - &zero) * c2_per_cm() / t));
    let (ortho_zero, para_zero) = (above(o), above(p));
    // The equilibrium mixture from its two isomers (q = q_o + q_p): with
    // x = q_o/q, U and Cv are the mixture's mean and variance of E/kT,
    // Cv = x Cv_o + (1 − x) Cv_p + x(1 − x)(U_o − U_p)², from absolute U/kT.
    let d = Float::with_val(prec, &para.ln_q - &ortho.ln_q);
    let x = (Float::with_val(prec, d.exp_ref()) + 1u32).recip();
    let one_x = Float::with_val(prec, 1u32 - &x);
    let ln_q = Float::with_val(prec, &ortho.ln_q - Float::with_val(prec, x.ln_ref()));
    let (uo, up) = (
        Float::with_val(prec, &ortho.s - &ortho.ln_q),
        Float::with_val(prec, &para.s - &para.ln_q),
    );
    let u = Float::with_val(prec, &x * &uo) + Float::with_val(prec, &one_x * &up);
    let gap = Float::with_val(prec, &uo - &up);
    let cv = Float::with_val(prec, &x * &ortho.cv)
        + Float::with_val(prec, &one_x * &para.cv)
        + Float::with_val(prec, &x * &one_x) * Float::with_val(prec, gap.square_ref());
    let h = Float::with_val(prec, &x * &ortho.h) + Float::with_val(prec, &one_x * &para.h);
    let eq = Part {
        s: Float::with_val(prec, &ln_q + &u),
        h,
        cv,
        ln_q,
    };
    Ok(IsomerParts {
        eq,
        ortho,
        para,
        w_ortho: *wo,
        w_para: *wp,
        ortho_zero,
        para_zero,
    })
}

/// The standard molar functions of `species` at `t` (K).
///
/// ```
/// use zsum::species::{molar, Database, MolarOptions};
/// use zsum::exact::parse_rational;
/// let db = Database::builtin()?;
/// let p = molar(db.find("Ar")?, &parse_rational("298.15")?, &MolarOptions::default())?;
/// // CODATA Key Values (1989), S°(Ar, 298.15 K) = 154.846 ± 0.003 J/(mol K) (from memory).
/// assert!((p.s.parse::<f64>().unwrap() - 154.846).abs() < 0.002);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn molar(sp: &Species, t: &BigRational, o: &MolarOptions) -> Result<MolarPoint> {
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
) -> Result<MolarPoint> {
    validate(t, o)?;
    let p = prec(o.digits);
    let mut degeneracy = degeneracy(sp, t, o)?;
    let tr = translation(&sp.mass_kg, t, o)?;
    let (int_s, int_s_total, int_h, int_cv, ortho) = match (&o.isomer, sp.has_spin_isomers()) {
        (Some(_), false) => {
            return Err(Error::invalid(
                "isomer",
                &sp.name,
                "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para \
                 forms",
            ))
        }
        (None, false) => {
            let s = &cached.full;
            let part = internal_part(s, t, &s.ground_energy(), o.digits)?;
            let g = Float::with_val(p, sp.spin_states()).ln();
            let conv = Float::with_val(p, &part.s - &g);
            (conv, part.s, part.h, part.cv, None)
        }
        (iso, true) => {
            let ip = isomer_parts(sp, cached, t, o.digits)?;
            // Equilibrium ortho fraction q_o/q.
            let d = Float::with_val(p, &ip.para.ln_q - &ip.ortho.ln_q);
            let x_eq = Float::with_val(p, d.exp() + 1u32).recip();
            let (wo, wp) = (ip.w_ortho, ip.w_para);
            let frozen = |x: Float| {
                let one_x = Float::with_val(p, 1u32 - &x);
                let mix = Float::with_val(p, xlnx(&x) + xlnx(&one_x));
                let total = Float::with_val(p, &x * &ip.ortho.s)
                    + Float::with_val(p, &one_x * &ip.para.s)
                    - &mix;
                let so = Float::with_val(p, &ip.ortho.s - Float::with_val(p, wo).ln());
                let spp = Float::with_val(p, &ip.para.s - Float::with_val(p, wp).ln());
                let conv = Float::with_val(p, &x * &so) + Float::with_val(p, &one_x * &spp);
                // Frozen: each isomer from its own lowest level.
                let h = Float::with_val(p, &x * Float::with_val(p, &ip.ortho.h - &ip.ortho_zero))
                    + Float::with_val(p, &one_x * Float::with_val(p, &ip.para.h - &ip.para_zero));
                let cv = Float::with_val(p, &x * &ip.ortho.cv)
                    + Float::with_val(p, &one_x * &ip.para.cv);
                (conv, total, h, cv, Some(x))
            };
            match iso.clone().unwrap_or_default() {
                Isomer::Equilibrium => {
                    let g = Float::with_val(p, sp.spin_states()).ln();
                    let conv = Float::with_val(p, &ip.eq.s - &g);
                    (
                        conv,
                        ip.eq.s.clone(),
                        ip.eq.h.clone(),
                        ip.eq.cv.clone(),
                        Some(x_eq),
                    )
                }
                Isomer::Normal => frozen(Float::with_val(p, wo) / Float::with_val(p, wo + wp)),
                Isomer::Ortho => frozen(Float::with_val(p, 1u32)),
                Isomer::Para => frozen(Float::with_val(p, 0u32)),
                Isomer::Fraction(x) => frozen(fl(p, &x)),
            }
        }
    };
    let s = Float::with_val(p, &tr.s + &int_s);
    let s_total = Float::with_val(p, &tr.s + &int_s_total);
    let h = Float::with_val(p, &tr.h + &int_h);
    let cv = Float::with_val(p, &tr.cv + &int_cv);
    let r = fl(p, &o.basis.per_k(sp));
    let rt = Float::with_val(p, &r * fl(p, t));
    let show = |v: Float| float_to_decimal(&v, 0.0, 0.0, o.digits).0;
    let isomer = sp
        .has_spin_isomers()
        .then(|| o.isomer.clone().unwrap_or_default());
    let cp = Float::with_val(p, &cv + 1u32);
    let g = Float::with_val(p, &s - &h);
    // A negative entropy is never printed unflagged.
    // (−(G − H0)/T is not an entropy: it is negative for frozen normal
    // hydrogen at low T, where H − H0 holds the ortho rotational energy.)
    degeneracy.negative_entropy = [&s, &s_total]
        .iter()
        .any(|v| v.cmp0() == Some(std::cmp::Ordering::Less));
    degeneracy.quantum_flag |= degeneracy.negative_entropy;
    Ok(MolarPoint {
        species: sp.name.clone(),
        t: exact_decimal(t, 30),
        p: exact_decimal(&o.pressure, 30),
        reference: reference_text(isomer.as_ref()).into(),
        per: o.basis.name().into(),
        units: units_block(&MolarTable::columns_for(isomer.is_some(), o.basis)),
        isomer: isomer.map(|i| i.name()),
        ortho_fraction: ortho.as_ref().map(|x| show(x.clone())),
        s: show(Float::with_val(p, &s * &r)),
        s_total: show(Float::with_val(p, &s_total * &r)),
        cp: show(Float::with_val(p, &cp * &r)),
        cv: show(Float::with_val(p, &cv * &r)),
        h: show(Float::with_val(p, &h * &rt)),
        g: show(Float::with_val(p, &g * &r)),
        degeneracy,
    })
}

/// What H0 is, for a species with spin isomers in state `isomer` (or
/// without them, `None`).
pub fn reference_text(isomer: Option<&Isomer>) -> &'static str {
    match isomer {
        Some(i) if i.is_frozen() => {
            "H0 = each spin isomer at its own lowest level (composition frozen)"
        }
        _ => "H0 = the lowest level",
    }
}

/// A property table: one species over a temperature grid.
#[derive(Debug, Clone, Serialize)]
#[serde(transparent)]
pub struct MolarTable {
    /// The rows, in grid order.
    pub rows: Vec<MolarPoint>,
    /// The amount every row is given for.
    #[serde(skip)]
    pub basis: Basis,
}

impl MolarTable {
    /// Builds the table of `sp` over `grid` (kelvin), listing internal
    /// levels once for the whole grid.
    pub fn build(sp: &Species, grid: &[BigRational], o: &MolarOptions) -> Result<Self> {
        Self::build_metered(sp, grid, o, &crate::budget::Meter::unlimited())
    }

    /// As [`MolarTable::build`], the temperatures timed by `meter` (hottest,
    /// costliest, first), which refuses the rest once their projected time
    /// exceeds its budget.
    pub fn build_metered(
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
        let cached = spectra.cached();
        // Hottest first so one listing serves every temperature.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
        let mut rows: Vec<Option<MolarPoint>> = vec![None; grid.len()];
        for (count, i) in order.into_iter().enumerate() {
            rows[i] = Some(molar_with(sp, &cached, &grid[i], o)?);
            meter.at(count as f64 + 1.0)?;
        }
        Ok(MolarTable {
            basis: o.basis,
            rows: rows.into_iter().flatten().collect(),
        })
    }
}

/// Property tables of every species in `species` over one grid, built on
/// all available cores (one species per task).
pub fn tables(
    species: &[&Species],
    grid: &[BigRational],
    o: &MolarOptions,
) -> Result<Vec<MolarTable>> {
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .max(1);
    let next = std::sync::atomic::AtomicUsize::new(0);
    let slots: Vec<std::sync::Mutex<Option<Result<MolarTable>>>> = species
        .iter()
        .map(|_| std::sync::Mutex::new(None))
        .collect();
    std::thread::scope(|scope| {
        for _ in 0..threads.min(species.len()) {
            scope.spawn(|| loop {
                let i = next.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
                if i >= species.len() {
                    break;
                }
                let r = MolarTable::build(species[i], grid, o);
                if let Ok(mut slot) = slots[i].lock() {
                    *slot = Some(r);
                }
            });
        }
    });
    slots
        .into_iter()
        .map(|m| {
            m.into_inner().ok().flatten().unwrap_or_else(|| {
                Err(Error::invalid(
                    "species table",
                    "missing",
                    "a finished task",
                ))
            })
        })
        .collect()
}

impl MolarTable {
    /// Warning lines for the rows whose classical translation is flagged
    /// (none when no row is).
    pub fn warnings(&self) -> Vec<String> {
        degeneracy_warnings(self.rows.iter().map(|r| {
            (
                r.species.as_str(),
                r.t.as_str(),
                r.p.as_str(),
                &r.degeneracy,
            )
        }))
    }
}

/// The nΛ³ and flag columns of every gas table, CSV included: a `*` flag
/// marks a row whose classical translation is not right to its digits.
pub(crate) fn degeneracy_columns() -> [Column; 2] {
    [
        Column::with_unit("nLambda^3", "dimensionless").key("n_lambda3"),
        Column::plain("flag"),
    ]
}

/// The text of a row's nΛ³ (4 significant digits) and flag cells.
pub(crate) fn degeneracy_cells(d: &Degeneracy) -> [String; 2] {
    [
        sig4(d.n_lambda3),
        if d.quantum_flag { "*" } else { "" }.to_string(),
    ]
}

/// The preamble line that says what the nΛ³ and flag columns mean.
pub(crate) fn degeneracy_note(tolerance: f64) -> String {
    format!(
        "nLambda^3 = n Λ³ with n = p/kT, Λ = h/sqrt(2π m kT), g = {DEGENERACY_G} (dimensionless); \
         flag * where the first quantum correction nΛ³/(g 2^(5/2)) exceeds the tolerance {} \
         of the printed digits, or an entropy is negative",
        tolerance_text(tolerance)
    )
}

/// `1e-D` for the tolerance `10^-D` of D printed digits.
fn tolerance_text(tol: f64) -> String {
    format!("1e-{}", (-tol.log10()).round() as i64)
}

fn sig4(v: f64) -> String {
    crate::exact::format_sig_f64(v, 4)
}

fn wrong_beyond(d: &Degeneracy) -> String {
    match d.trusted_digits() {
        0 => "wrong already in the first significant digit".into(),
        n => format!(
            "wrong beyond about the {} significant digit",
            crate::exact::ordinal(n.into())
        ),
    }
}

/// Warning lines for flagged rows, one per species and pressure:
/// `(species, T, p, degeneracy)` for every row, in table order. Each says
/// where the classical translational entropy stops being right, by how
/// many digits, and why.
pub fn degeneracy_warnings<'a>(
    rows: impl IntoIterator<Item = (&'a str, &'a str, &'a str, &'a Degeneracy)>,
) -> Vec<String> {
    // (species, p, [(T, degeneracy)]) in table order.
    type Group<'b> = (&'b str, &'b str, Vec<(&'b str, &'b Degeneracy)>);
    let mut groups: Vec<Group> = Vec::new();
    for (sp, t, p, d) in rows {
        match groups.iter_mut().find(|g| g.0 == sp && g.1 == p) {
            Some(g) => g.2.push((t, d)),
            None => groups.push((sp, p, vec![(t, d)])),
        }
    }
    let mut out = Vec::new();
    for (sp, p, rows) in groups {
        let n = rows.len();
        let quantum: Vec<&(&str, &Degeneracy)> = rows
            .iter()
            .filter(|(_, d)| d.quantum_correction > d.quantum_tolerance)
            .collect();
        if let (Some(worst), Some(best)) = (
            quantum
                .iter()
                .max_by(|a, b| a.1.quantum_correction.total_cmp(&b.1.quantum_correction)),
            quantum
                .iter()
                .min_by(|a, b| a.1.quantum_correction.total_cmp(&b.1.quantum_correction)),
        ) {
            let tol = worst.1.quantum_tolerance;
            let digits = (-tol.log10()).round() as i64;
            let tol = tolerance_text(tol);
            let which = if quantum.len() == n {
                if n == 1 {
                    "the row is flagged *".to_string()
                } else {
                    format!("all {n} rows are flagged *")
                }
            } else {
                format!("{} of {n} rows are flagged *", quantum.len())
            };
            let range = |f: &dyn Fn(&Degeneracy) -> f64| {
                if quantum.len() == 1 {
                    sig4(f(worst.1))
                } else {
                    format!("{} to {}", sig4(f(best.1)), sig4(f(worst.1)))
                }
            };
            let mut line = format!(
                "{sp} at p = {p} Pa: {which}: the classical translational entropy is {} at \
                 T = {} K",
                wrong_beyond(worst.1),
                worst.0
            );
            if quantum.len() > 1 {
                line.push_str(&match best.1.trusted_digits() {
                    0 => format!(" and at T = {} K", best.0),
                    n => format!(
                        " and beyond about the {} at T = {} K",
                        crate::exact::ordinal(n.into()),
                        best.0
                    ),
                });
            }
            line.push_str(&format!(
                ", because it counts the molecules by Boltzmann statistics and leaves out their \
                 Bose/Fermi statistics: nΛ³ = {} there, and the first quantum correction, of \
                 relative size nΛ³/2^(5/2) = {}, exceeds the tolerance {} of {digits} printed \
                 digits; S, Cp, H-H0 and -(G-H0)/T are off by about that relative amount",
                range(&|d| d.n_lambda3),
                range(&|d| d.quantum_correction),
                tol,
            ));
            out.push(line);
        }
        let negative: Vec<&str> = rows
            .iter()
            .filter(|(_, d)| d.negative_entropy)
            .map(|(t, _)| *t)
            .collect();
        if !negative.is_empty() {
            out.push(format!(
                "{sp} at p = {p} Pa: a printed entropy is negative at T = {} K (flagged *): no \
                 gas has a negative entropy, so the classical model fails there",
                negative.join(", ")
            ));
        }
    }
    out
}

impl MolarTable {
    /// The columns of a property table (with the isomer columns where the
    /// species has spin isomers) in `basis`'s units. The same list names
    /// every JSON row's `units`.
    pub(crate) fn columns_for(isomers: bool, basis: Basis) -> Vec<Column> {
        let (k, e) = basis.units();
        let mut c = vec![Column::with_unit("T", "K").key("T")];
        if isomers {
            c.push(Column::plain("isomer"));
            c.push(Column::plain("ortho fraction"));
        }
        c.extend([
            Column::with_unit("S", k).key("S"),
            Column::with_unit("S_total", k).key("S_total"),
            Column::with_unit("Cp", k).key("Cp"),
            Column::with_unit("Cv", k).key("Cv"),
            Column::with_unit("H-H0", e).key("H_minus_H0"),
            Column::with_unit("-(G-H0)/T", k).key("minus_G_minus_H0_over_T"),
        ]);
        c.extend(degeneracy_columns());
        c
    }

    /// The preamble line naming the reference H0 of every row (one line
    /// for a one-species table; one clause per distinct reference
    /// otherwise).
    pub(crate) fn reference_line(&self) -> String {
        let mut groups: Vec<(&str, Vec<&str>)> = Vec::new();
        for r in &self.rows {
            match groups.iter_mut().find(|g| g.0 == r.reference) {
                Some(g) if !g.1.contains(&r.species.as_str()) => g.1.push(&r.species),
                Some(_) => {}
                None => groups.push((&r.reference, vec![&r.species])),
            }
        }
        let clauses: Vec<String> = match groups.as_slice() {
            [(only, _)] => vec![only.to_string()],
            many => many
                .iter()
                .map(|(r, sp)| format!("{}: {r}", sp.join(", ")))
                .collect(),
        };
        format!(
            "{}; S conventional (nuclear spin excluded), S_total with it",
            clauses.join("; ")
        )
    }
}

impl Tabular for MolarTable {
    fn preamble(&self) -> Vec<String> {
        let first = self.rows.first();
        let mut lines = vec![
            format!(
                "{}: ideal-gas thermodynamic functions per {} at p = {} Pa from exact sums",
                first.map(|r| r.species.as_str()).unwrap_or(""),
                self.basis.name(),
                first.map(|r| r.p.as_str()).unwrap_or("")
            ),
            self.reference_line(),
            degeneracy_note(first.map(|r| r.degeneracy.quantum_tolerance).unwrap_or(0.0)),
            "ideal-gas model values: design decisions follow certified property data, local \
             codes and licensed engineering practice"
                .into(),
        ];
        lines.extend(self.warnings().into_iter().map(|w| format!("warning: {w}")));
        lines
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(self.rows.iter().any(|r| r.isomer.is_some()), self.basis)
    }

    fn rows(&self) -> Vec<Vec<String>> {
        let iso = self.rows.iter().any(|r| r.isomer.is_some());
        self.rows
            .iter()
            .map(|r| {
                let mut v = vec![r.t.clone()];
                if iso {
                    v.push(r.isomer.clone().unwrap_or_default());
                    v.push(r.ortho_fraction.clone().unwrap_or_default());
                }
                v.extend([
                    r.s.clone(),
                    r.s_total.clone(),
                    r.cp.clone(),
                    r.cv.clone(),
                    r.h.clone(),
                    r.g.clone(),
                ]);
                v.extend(degeneracy_cells(&r.degeneracy));
                v
            })
            .collect()
    }
}
