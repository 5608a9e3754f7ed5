//! Spin temperatures and the heat of isomer relaxation, for every species
//! with nuclear-spin isomers.
//!
//! - **Equilibrium composition** at T: each isomer's share `q_i/Σ q_j`, the
//!   isomers' internal sums with their spin weights and the common energy
//!   zero (the species' lowest level).
//! - **Spin temperature**: the T at which the equilibrium ratio of two
//!   isomers (`ortho/para = 2.5` for water) or one isomer's fraction
//!   (`para = 0.998` for hydrogen) equals a measured value. The ratio runs
//!   between its cold limit (0 or ∞, or 1 and 0 for a fraction, by which
//!   isomer holds the lowest level) and its statistical high-temperature
//!   limit `w_a/w_b` (the isomers' numbers of nuclear-spin functions); a
//!   value outside that open range has no spin temperature and is refused
//!   naming the range. The root is bracketed by temperatures at which the
//!   ratio is certified to lie below and above the value and the bracket is
//!   halved until it is narrower than the digits asked for: the ratio is
//!   continuous in T, so a temperature giving exactly the measured ratio
//!   lies inside the returned ball.
//! - **Relaxation heat**: the heat released per mole (and per kilogram)
//!   when a frozen composition (normal, one isomer, an ortho fraction)
//!   relaxes to equilibrium at T: `Σ x_i H_i(T) − H_eq(T)`, internal
//!   enthalpies from the common zero.

use super::molar::{div, isomer_parts, prec, IsomerParts, MolarOptions, Spectra};
use super::{Isomer, Species};
use crate::error::{Error, Result};
use crate::exact::{exact_decimal, rational_string};
use crate::sum::ball::Ball;
use crate::sum::{rational_ball, Certified};
use crate::units::constants;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

/// A measured isomer composition.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Composition {
    /// The ratio of isomer `top` to isomer `bottom` (`ortho/para=2.5`).
    Ratio {
        /// The numerator's isomer.
        top: String,
        /// The denominator's isomer.
        bottom: String,
        /// The measured ratio, > 0.
        value: BigRational,
    },
    /// The fraction of one isomer among all (`para=0.998`), 0 < value < 1.
    Fraction {
        /// The isomer.
        isomer: String,
        /// The measured fraction.
        value: BigRational,
    },
}

impl Composition {
    /// Reads `A/B=X` (a ratio) or `A=X` (a fraction), X an exact decimal.
    pub fn parse(text: &str) -> Result<Self> {
        let allowed = "A/B=X for a ratio of two isomers (ortho/para=2.5) or A=X for one \
                       isomer's fraction (para=0.998), X an exact decimal";
        let (names, value) = text
            .split_once('=')
            .ok_or_else(|| Error::parse("isomer composition", text, allowed))?;
        let value = crate::exact::parse_rational(value.trim())
            .map_err(|_| Error::parse("isomer composition", text, allowed))?;
        let name = |s: &str| -> Result<String> {
            let s = s.trim();
            if s.is_empty() || !s.bytes().all(|b| b.is_ascii_lowercase()) {
                return Err(Error::parse("isomer composition", text, allowed));
            }
            Ok(s.to_string())
        };
        Ok(match names.split_once('/') {
            Some((a, b)) => Composition::Ratio {
                top: name(a)?,
                bottom: name(b)?,
                value,
            },
            None => Composition::Fraction {
                isomer: name(names)?,
                value,
            },
        })
    }

    /// The measured value.
    pub fn value(&self) -> &BigRational {
        match self {
            Composition::Ratio { value, .. } | Composition::Fraction { value, .. } => value,
        }
    }

    /// As written: `ortho/para` or `para fraction`.
    pub fn label(&self) -> String {
        match self {
            Composition::Ratio { top, bottom, .. } => format!("{top}/{bottom}"),
            Composition::Fraction { isomer, .. } => format!("{isomer} fraction"),
        }
    }
}

/// The range of a composition as T runs from 0 to ∞ (open at both ends),
/// each end exact or unbounded (`None`).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Range {
    /// The value as T → 0.
    pub cold: Option<BigRational>,
    /// The value as T → ∞ (the statistical limit).
    pub hot: BigRational,
}

impl Range {
    fn contains(&self, v: &BigRational) -> bool {
        let (lo, hi) = match &self.cold {
            Some(c) if c <= &self.hot => (Some(c), Some(&self.hot)),
            Some(c) => (Some(&self.hot), Some(c)),
            None => (Some(&self.hot), None),
        };
        lo.is_none_or(|l| v > l) && hi.is_none_or(|h| v < h)
    }

    /// The range as text: `between 0 and 3 (exclusive)`.
    pub fn text(&self) -> String {
        let cold = self
            .cold
            .as_ref()
            .map_or("infinity".to_string(), rational_string);
        format!(
            "between {} (T -> 0) and {} (T -> infinity), both excluded",
            cold,
            rational_string(&self.hot)
        )
    }
}

/// A spin temperature: the T (K) at which the equilibrium composition
/// equals the measured one, certified, with the range of compositions that
/// have one.
#[derive(Debug, Clone)]
pub struct SpinTemperature {
    /// The species.
    pub species: String,
    /// The measured composition.
    pub composition: Composition,
    /// T in kelvin: a ball holding a temperature at which the equilibrium
    /// composition equals the measured value.
    pub t: Certified,
    /// The compositions that have a spin temperature.
    pub range: Range,
    /// The significant digits asked for.
    pub digits: u32,
}

/// The lowest and highest temperatures searched, K.
const T_LOW: i64 = 1;
const T_HIGH: i64 = 2000;

fn spin_functions(sp: &Species, name: &str) -> Result<u64> {
    let iso = sp.isomers();
    if iso.is_empty() {
        return Err(super::molar::no_isomers(sp));
    }
    iso.iter()
        .find(|(n, _)| n == name)
        .map(|(_, w)| *w)
        .ok_or_else(|| {
            let names: Vec<&str> = iso.iter().map(|(n, _)| n.as_str()).collect();
            Error::invalid(
                "isomer",
                name,
                &format!("{} has the isomers {}", sp.name, names.join(", ")),
            )
        })
}

/// The range of `c` for `sp`: its statistical limit from the spin
/// functions and its cold limit from which isomer holds the lowest level.
pub fn composition_range(sp: &Species, c: &Composition) -> Result<Range> {
    let ground = ground_isomer(sp)?;
    let total: u64 = sp.isomers().iter().map(|(_, w)| w).sum();
    let r = |a: u64, b: u64| BigRational::new(BigInt::from(a), BigInt::from(b));
    Ok(match c {
        Composition::Ratio { top, bottom, .. } => {
            let (wt, wb) = (spin_functions(sp, top)?, spin_functions(sp, bottom)?);
            if top == bottom {
                return Err(Error::invalid(
                    "isomer ratio",
                    format!("{top}/{bottom}"),
                    "name two different isomers",
                ));
            }
            let cold = if &ground == top {
                None
            } else {
                Some(BigRational::zero())
            };
            Range {
                cold,
                hot: r(wt, wb),
            }
        }
        Composition::Fraction { isomer, .. } => {
            let w = spin_functions(sp, isomer)?;
            let cold = if &ground == isomer {
                BigRational::one()
            } else {
                BigRational::zero()
            };
            Range {
                cold: Some(cold),
                hot: r(w, total),
            }
        }
    })
}

/// The isomer that holds the species' lowest level.
fn ground_isomer(sp: &Species) -> Result<String> {
    let iso = sp.isomers();
    if iso.is_empty() {
        return Err(super::molar::no_isomers(sp));
    }
    let zero = sp.internal(super::VibModel::Rovib, None)?.ground_energy();
    for (name, _) in &iso {
        let s = sp.internal_isomer(super::VibModel::Rovib, name)?;
        if s.ground_energy() == zero {
            return Ok(name.clone());
        }
    }
    Ok(iso[0].0.clone())
}

/// The composition's value at equilibrium from the isomers' parts.
fn value_of(ip: &IsomerParts, c: &Composition) -> Ball {
    let q = |name: &str| {
        let base = &ip.isomers[0].part.ln_q;
        let i = ip.get(name).expect("isomer names were checked");
        super::molar::exp(&i.part.ln_q.sub(base))
    };
    match c {
        Composition::Ratio { top, bottom, .. } => div(&q(top), &q(bottom)),
        Composition::Fraction { isomer, .. } => {
            let all = ip
                .isomers
                .iter()
                .map(|i| q(&i.name))
                .reduce(|a, b| a.add(&b))
                .expect("a species with isomers has one");
            div(&q(isomer), &all)
        }
    }
}

/// The equilibrium composition `c` of `sp` at `t` (K), to `digits`.
pub fn equilibrium_value(
    sp: &Species,
    c: &Composition,
    t: &BigRational,
    digits: u32,
) -> Result<Certified> {
    composition_range(sp, c)?;
    let spectra = Spectra::new(sp, super::VibModel::Rovib)?;
    let ip = isomer_parts(sp, &spectra.cached(), t, digits + 3)?;
    Ok(Certified(value_of(&ip, c)))
}

/// The spin temperature of the measured composition `c` of `sp`, to
/// `digits` significant digits (at most 30).
///
/// ```
/// use zsum::species::Database;
/// use zsum::species::spin::{spin_temperature, Composition};
/// let db = Database::builtin()?;
/// // Water with ortho/para = 2.5 (an invented measurement).
/// let c = Composition::parse("ortho/para=2.5")?;
/// let st = spin_temperature(db.find("H2O")?, &c, 6)?;
/// let t = st.t.to_f64();
/// assert!(t > 10.0 && t < 50.0, "{t}");
/// assert!(st.range.text().contains("between 0"));
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn spin_temperature(sp: &Species, c: &Composition, digits: u32) -> Result<SpinTemperature> {
    if !(1..=30).contains(&digits) {
        return Err(Error::invalid(
            "digits",
            digits,
            "a spin temperature takes 1 to 30 significant digits",
        ));
    }
    let range = composition_range(sp, c)?;
    let target = c.value();
    if !range.contains(target) {
        return Err(Error::invalid(
            &c.label(),
            exact_decimal(target, 30),
            &format!(
                "{}'s equilibrium {} lies {}; no temperature gives this value",
                sp.name,
                c.label(),
                range.text()
            ),
        ));
    }
    // The ratio grows with T when the cold end is below the hot one.
    let rising = range.cold.as_ref().is_some_and(|cold| cold < &range.hot);
    let spectra = Spectra::new(sp, super::VibModel::Rovib)?;
    let cached = spectra.cached();
    // −1: the composition at t is certainly on the cold side of the
    // target; 1: on the hot side; 0: undecided at `work` digits.
    let side = |t: &BigRational, work: u32| -> Result<i32> {
        let p = prec(work);
        let tv = rational_ball(target, p);
        let v = value_of(&isomer_parts(sp, &cached, t, work)?, c);
        let d = v.sub(&tv);
        let above = d.c.is_sign_positive() && d.c.clone().abs() > d.r;
        let below = d.c.is_sign_negative() && d.c.clone().abs() > d.r;
        Ok(match (above, below, rising) {
            (true, _, true) | (_, true, false) => 1,
            (_, true, true) | (true, _, false) => -1,
            _ => 0,
        })
    };
    let mut work = digits + 3;
    let (mut lo, mut hi) = (
        BigRational::from_integer(T_LOW.into()),
        BigRational::from_integer(T_HIGH.into()),
    );
    if side(&lo, work)? >= 0 {
        return Err(Error::invalid(
            &c.label(),
            exact_decimal(target, 30),
            &format!(
                "its spin temperature lies below {T_LOW} K, outside the temperatures searched, {T_LOW} to \
                 {T_HIGH} K (the equilibrium value at {T_LOW} K is already past it)"
            ),
        ));
    }
    if side(&hi, work)? <= 0 {
        return Err(Error::invalid(
            &c.label(),
            exact_decimal(target, 30),
            &format!(
                "its spin temperature lies above {T_HIGH} K, outside the temperatures searched, {T_LOW} to \
                 {T_HIGH} K: the value is too close to the statistical limit {}",
                rational_string(&range.hot)
            ),
        ));
    }
    // Halve the bracket until its half-width is below 10^−(digits+2) of
    // T; where the ratio at the midpoint cannot be told from the target,
    // work at more digits (Ziv's strategy), up to 30 more.
    let scale = BigRational::new(BigInt::one(), BigInt::from(10).pow(digits + 2));
    let two = BigRational::from_integer(2.into());
    while (&hi - &lo) > &lo * &scale {
        let mid = (&lo + &hi) / &two;
        match side(&mid, work)? {
            1 => hi = mid,
            -1 => lo = mid,
            _ if work < digits + 33 => work += 6,
            _ => break,
        }
    }
    let mid = (&lo + &hi) / &two;
    let half = (&hi - &lo) / &two;
    let pr = prec(digits);
    let mut t = rational_ball(&mid, pr);
    let h = rational_ball(&half, pr);
    t.r = crate::sum::ball::up_add(&t.r, &crate::sum::ball::up_add(&h.c, &h.r));
    Ok(SpinTemperature {
        species: sp.name.clone(),
        composition: c.clone(),
        t: Certified(t),
        range,
        digits,
    })
}

/// One temperature of a relaxation table: each isomer's equilibrium
/// fraction and the heat the frozen composition releases relaxing to it.
#[derive(Debug, Clone)]
pub struct RelaxationPoint {
    /// T in kelvin, exact.
    pub t: BigRational,
    /// Each isomer's name and equilibrium fraction q_i/q, in the species'
    /// order.
    pub fractions: Vec<(String, Certified)>,
    /// Heat released per mole, J/mol.
    pub per_mole: Certified,
    /// Heat released per kilogram, kJ/kg.
    pub per_kg: Certified,
}

/// The heat released when `sp`, frozen in the composition `from`, relaxes
/// to equilibrium at `t` (K): `(J/mol, kJ/kg)`.
///
/// ```
/// use zsum::species::{Database, Isomer, MolarOptions};
/// use zsum::species::spin::relaxation_heat;
/// use zsum::exact::parse_rational;
/// let db = Database::builtin()?;
/// let (mol, kg) = relaxation_heat(db.find("H2")?, &Isomer::Normal,
///                                 &parse_rational("20.28")?, &MolarOptions::default())?;
/// // About 1.06 kJ/mol (from memory); per kg it is that over 2.016 g/mol.
/// assert!((mol.to_f64() - 1060.0).abs() < 15.0);
/// assert!((kg.to_f64() * 2.01565 - mol.to_f64()).abs() < 1.0);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn relaxation_heat(
    sp: &Species,
    from: &Isomer,
    t: &BigRational,
    o: &MolarOptions,
) -> Result<(Certified, Certified)> {
    let spectra = Spectra::new(sp, o.model)?;
    let p = relaxation_point(sp, &spectra, from, t, o)?;
    Ok((p.per_mole, p.per_kg))
}

/// The relaxation of `sp` from `from` over a grid of temperatures (K),
/// levels listed once for the grid.
pub fn relaxation_grid(
    sp: &Species,
    from: &Isomer,
    grid: &[BigRational],
    o: &MolarOptions,
) -> Result<Vec<RelaxationPoint>> {
    let spectra = Spectra::new(sp, o.model)?;
    grid.iter()
        .map(|t| relaxation_point(sp, &spectra, from, t, o))
        .collect()
}

fn relaxation_point(
    sp: &Species,
    spectra: &Spectra,
    from: &Isomer,
    t: &BigRational,
    o: &MolarOptions,
) -> Result<RelaxationPoint> {
    if !t.is_positive() {
        return Err(Error::invalid(
            "T",
            rational_string(t),
            "it must be greater than zero",
        ));
    }
    let ip = isomer_parts(sp, &spectra.cached(), t, o.digits)?;
    let p = prec(o.digits);
    let x = ip.fractions(sp, from, p)?;
    let frozen = ip
        .isomers
        .iter()
        .zip(&x)
        .map(|(i, xi)| xi.mul(&i.part.h))
        .reduce(|a, b| a.add(&b))
        .expect("a species with isomers has one");
    let r = rational_ball(&(constants::boltzmann() * constants::avogadro()), p);
    let per_mole = frozen.sub(&ip.eq.h).mul(&r.mul(&rational_ball(t, p)));
    let per_kg = div(&per_mole, &rational_ball(&sp.molar_mass(), p)).div_int(1000);
    Ok(RelaxationPoint {
        t: t.clone(),
        fractions: ip
            .isomers
            .iter()
            .zip(&ip.eq_fractions)
            .map(|(i, f)| (i.name.clone(), Certified(f.clone())))
            .collect(),
        per_mole: Certified(per_mole),
        per_kg: Certified(per_kg),
    })
}
