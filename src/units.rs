//! Physical constants as exact rationals, energy units and their exact
//! conversions, and parsing of quantities such as `"4.0026u"` or `"10 nm"`.
//!
//! Since the 2019 revision of the SI, the Planck constant, the Boltzmann
//! constant, the speed of light, the Avogadro constant and the elementary
//! charge have exact decimal values, so every conversion between J, eV,
//! cm⁻¹, K and kJ/mol is an exact rational factor and round-trips exactly.
//! The atomic mass constant is measured; zsum takes it from CODATA 2018.

use crate::error::{Error, ErrorKind, Result};
use crate::exact::parse_rational;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed};
use serde::{Deserialize, Serialize};
use std::fmt;
use std::sync::OnceLock;

fn cached(cell: &'static OnceLock<BigRational>, text: &str) -> BigRational {
    cell.get_or_init(|| parse_rational(text).expect("constant literal"))
        .clone()
}

/// Exact SI defining constants (SI brochure, 9th edition, 2019) and the
/// CODATA 2018 atomic mass constant.
pub mod constants {
    use super::*;

    /// Planck constant h = 6.626 070 15 × 10⁻³⁴ J s, exact (SI 2019).
    pub fn planck() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        cached(&C, "6.62607015e-34")
    }
    /// Boltzmann constant k = 1.380 649 × 10⁻²³ J/K, exact (SI 2019).
    pub fn boltzmann() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        cached(&C, "1.380649e-23")
    }
    /// Speed of light in vacuum c = 299 792 458 m/s, exact (SI 2019).
    pub fn speed_of_light() -> BigRational {
        BigRational::from_integer(BigInt::from(299_792_458u64))
    }
    /// Avogadro constant N_A = 6.022 140 76 × 10²³ mol⁻¹, exact (SI 2019).
    pub fn avogadro() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        cached(&C, "6.02214076e23")
    }
    /// Elementary charge e = 1.602 176 634 × 10⁻¹⁹ C, exact (SI 2019).
    pub fn elementary_charge() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        cached(&C, "1.602176634e-19")
    }
    /// Atomic mass constant m_u = 1.660 539 066 60(50) × 10⁻²⁷ kg,
    /// CODATA 2018 recommended value (measured, not exact).
    pub fn atomic_mass_constant() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        cached(&C, "1.66053906660e-27")
    }
    /// Name of the CODATA edition the atomic mass constant comes from.
    pub const ATOMIC_MASS_SOURCE: &str = "CODATA 2018";

    /// Second radiation constant c₂ = hc/k in m K, exact.
    pub fn second_radiation_constant() -> BigRational {
        static C: OnceLock<BigRational> = OnceLock::new();
        C.get_or_init(|| planck() * speed_of_light() / boltzmann())
            .clone()
    }
}

/// The units of fixed size, in the order of [`fixed_factors`].
const FIXED_UNITS: [EnergyUnit; 6] = [
    EnergyUnit::Joule,
    EnergyUnit::ElectronVolt,
    EnergyUnit::MilliElectronVolt,
    EnergyUnit::Wavenumber,
    EnergyUnit::Kelvin,
    EnergyUnit::KilojoulePerMole,
];

/// The exact factor between every two fixed units, formed once (a
/// conversion runs for every temperature of every sweep).
fn fixed_factors() -> &'static [[BigRational; 6]; 6] {
    static F: OnceLock<[[BigRational; 6]; 6]> = OnceLock::new();
    F.get_or_init(|| {
        let j = FIXED_UNITS.map(|u| u.joules().unwrap_or_else(BigRational::one));
        std::array::from_fn(|a| std::array::from_fn(|b| &j[a] / &j[b]))
    })
}

/// A unit of energy. Every conversion between units that know their size in
/// joules is an exact rational factor.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum EnergyUnit {
    /// Joule.
    Joule,
    /// Electronvolt.
    ElectronVolt,
    /// Millielectronvolt.
    MilliElectronVolt,
    /// Wavenumber, cm⁻¹ (energy h c ṽ).
    Wavenumber,
    /// Kelvin (energy k T).
    Kelvin,
    /// Kilojoule per mole (energy per particle times N_A).
    KilojoulePerMole,
    /// A model's own unit, such as h²/(8 m L²) for a particle in a box. Its
    /// size in joules is known once the physical parameters are given.
    Natural {
        /// How the unit is written, e.g. `h^2/(8 m L^2)`.
        symbol: String,
        /// Size of the unit in joules, when known.
        #[serde(with = "crate::serde_exact::opt_ratio")]
        joules: Option<BigRational>,
    },
}

impl EnergyUnit {
    /// Reads a unit name: `J`, `eV`, `meV`, `cm-1` (or `cm^-1`, `1/cm`),
    /// `K`, `kJ/mol`.
    ///
    /// ```
    /// use zsum::units::EnergyUnit;
    /// assert_eq!(EnergyUnit::parse("cm-1").unwrap(), EnergyUnit::Wavenumber);
    /// assert!(EnergyUnit::parse("furlong").is_err());
    /// ```
    pub fn parse(text: &str) -> Result<Self> {
        Ok(match text.trim() {
            "J" => EnergyUnit::Joule,
            "eV" => EnergyUnit::ElectronVolt,
            "meV" => EnergyUnit::MilliElectronVolt,
            "cm-1" | "cm^-1" | "1/cm" | "cm⁻¹" => EnergyUnit::Wavenumber,
            "K" => EnergyUnit::Kelvin,
            "kJ/mol" => EnergyUnit::KilojoulePerMole,
            other => {
                return Err(Error::new(
                    ErrorKind::Unit,
                    format!(
                        "unknown energy unit {other:?}: use one of J, eV, meV, cm-1, K, kJ/mol"
                    ),
                ))
            }
        })
    }

    /// The size of one of this unit in joules, exactly, if known.
    pub fn joules(&self) -> Option<BigRational> {
        use constants::*;
        Some(match self {
            EnergyUnit::Joule => BigRational::one(),
            EnergyUnit::ElectronVolt => elementary_charge(),
            EnergyUnit::MilliElectronVolt => {
                elementary_charge() / BigRational::from_integer(BigInt::from(1000))
            }
            EnergyUnit::Wavenumber => {
                planck() * speed_of_light() * BigRational::from_integer(BigInt::from(100))
            }
            EnergyUnit::Kelvin => boltzmann(),
            EnergyUnit::KilojoulePerMole => {
                BigRational::from_integer(BigInt::from(1000)) / avogadro()
            }
            EnergyUnit::Natural { joules, .. } => return joules.clone(),
        })
    }

    /// The place of a unit of fixed size in [`FIXED_UNITS`].
    fn fixed_index(&self) -> Option<usize> {
        FIXED_UNITS.iter().position(|u| u == self)
    }

    /// How the unit is written in tables and JSON.
    pub fn symbol(&self) -> &str {
        match self {
            EnergyUnit::Joule => "J",
            EnergyUnit::ElectronVolt => "eV",
            EnergyUnit::MilliElectronVolt => "meV",
            EnergyUnit::Wavenumber => "cm-1",
            EnergyUnit::Kelvin => "K",
            EnergyUnit::KilojoulePerMole => "kJ/mol",
            EnergyUnit::Natural { symbol, .. } => symbol,
        }
    }

    /// The exact factor f with `1 self = f other`.
    ///
    /// ```
    /// use zsum::units::EnergyUnit;
    /// use zsum::exact::format_sig;
    /// // 1 cm^-1 = c2 * 100 K = 1.43877687750... K
    /// let f = EnergyUnit::Wavenumber.factor_to(&EnergyUnit::Kelvin).unwrap();
    /// assert_eq!(format_sig(&f, 12), "1.43877687750");
    /// ```
    pub fn factor_to(&self, other: &EnergyUnit) -> Result<BigRational> {
        if self == other {
            return Ok(BigRational::one());
        }
        if let (Some(i), Some(j)) = (self.fixed_index(), other.fixed_index()) {
            return Ok(fixed_factors()[i][j].clone());
        }
        match (self.joules(), other.joules()) {
            (Some(a), Some(b)) => Ok(a / b),
            _ => Err(Error::new(
                ErrorKind::Unit,
                format!(
                    "cannot convert between {} and {}: the size of {} in joules is not known \
                     (for a box, give its mass and side)",
                    self.symbol(),
                    other.symbol(),
                    if self.joules().is_none() {
                        self.symbol()
                    } else {
                        other.symbol()
                    }
                ),
            )),
        }
    }

    /// Converts an energy `value` in this unit to `other`, exactly.
    pub fn convert(&self, value: &BigRational, other: &EnergyUnit) -> Result<BigRational> {
        Ok(value * self.factor_to(other)?)
    }
}

impl fmt::Display for EnergyUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.symbol())
    }
}

/// Splits `"4.0026u"`, `"10 nm"` or `"2000 1/cm"` into its number and its
/// unit text: the number ends at the first space or the first letter that
/// is not an exponent marker.
pub(crate) fn split_quantity(text: &str) -> (&str, &str) {
    let t = text.trim();
    let cut = t
        .char_indices()
        .find(|&(i, c)| {
            c.is_whitespace()
                || c == 'Å'
                || (c.is_alphabetic() && !((c == 'e' || c == 'E') && exponent_position(t, i)))
        })
        .map(|(i, _)| i)
        .unwrap_or(t.len());
    (t[..cut].trim(), t[cut..].trim())
}

/// Whether an `e` at byte `i` is an exponent marker (digit before, digit or
/// sign after).
fn exponent_position(t: &str, i: usize) -> bool {
    let before = t[..i]
        .chars()
        .last()
        .is_some_and(|c| c.is_ascii_digit() || c == '.');
    let after = t[i + 1..]
        .chars()
        .next()
        .is_some_and(|c| c.is_ascii_digit() || c == '-' || c == '+');
    before && after
}

/// Reads an energy with its unit, `"1.99824 cm-1"` or `"300K"`, exactly.
///
/// ```
/// use zsum::units::{parse_energy, EnergyUnit};
/// let (v, u) = parse_energy("2000 1/cm").unwrap();
/// assert_eq!(u, EnergyUnit::Wavenumber);
/// assert_eq!(v, num_rational::BigRational::from_integer(2000.into()));
/// ```
pub fn parse_energy(text: &str) -> Result<(BigRational, EnergyUnit)> {
    let (num, unit) = split_quantity(text);
    if unit.is_empty() {
        return Err(Error::parse(
            "energy",
            text,
            "a number with a unit, e.g. \"1.99824 cm-1\" (units J, eV, meV, cm-1, K, kJ/mol)",
        ));
    }
    Ok((parse_rational(num)?, EnergyUnit::parse(unit)?))
}

fn positive_quantity(
    what: &str,
    text: &str,
    units: &[(&str, BigRational)],
    example: &str,
) -> Result<BigRational> {
    let (num, unit) = split_quantity(text);
    let allowed: Vec<&str> = units.iter().map(|(u, _)| *u).collect();
    let factor = units
        .iter()
        .find(|(u, _)| *u == unit)
        .map(|(_, f)| f.clone())
        .ok_or_else(|| {
            Error::new(
                ErrorKind::Unit,
                format!(
                    "{what} {text:?} needs a unit from {}, e.g. {example}",
                    allowed.join(", ")
                ),
            )
        })?;
    let value = parse_rational(num)
        .map_err(|_| Error::parse(what, text, &format!("a number with a unit, e.g. {example}")))?;
    if !value.is_positive() {
        return Err(Error::invalid(
            what,
            format!("{text:?}"),
            "it must be greater than zero",
        ));
    }
    Ok(value * factor)
}

fn ratio(n: i64, d: i64) -> BigRational {
    BigRational::new(BigInt::from(n), BigInt::from(d))
}

/// Reads a particle mass with its unit (`u`, `Da`, `kg`, `g`) and returns it
/// in kilograms, exactly.
///
/// ```
/// use zsum::units::parse_mass_kg;
/// assert!(parse_mass_kg("4.0026u").is_ok());
/// assert!(parse_mass_kg("4.0026").is_err()); // no unit
/// ```
pub fn parse_mass_kg(text: &str) -> Result<BigRational> {
    let mu = constants::atomic_mass_constant();
    positive_quantity(
        "mass",
        text,
        &[
            ("u", mu.clone()),
            ("Da", mu),
            ("kg", BigRational::one()),
            ("g", ratio(1, 1000)),
        ],
        "4.0026u or 6.6e-27kg",
    )
}

/// Reads a length with its unit (`m`, `mm`, `um`, `nm`, `pm`, `A` or `Å`
/// for ångström) and returns it in metres, exactly.
pub fn parse_length_m(text: &str) -> Result<BigRational> {
    let nm = BigRational::new(BigInt::one(), num_traits::pow(BigInt::from(10), 9));
    positive_quantity(
        "length",
        text,
        &[
            ("m", BigRational::one()),
            ("cm", ratio(1, 100)),
            ("mm", ratio(1, 1000)),
            ("um", ratio(1, 1_000_000)),
            ("nm", nm.clone()),
            ("pm", &nm / BigRational::from_integer(BigInt::from(1000))),
            ("A", &nm / BigRational::from_integer(BigInt::from(10))),
            ("Å", &nm / BigRational::from_integer(BigInt::from(10))),
        ],
        "10nm or 2.5e-9m",
    )
}

/// The pressure units [`parse_pressure`] reads, each with its size in
/// pascals (exact: the bar is 10⁵ Pa and the standard atmosphere 101 325 Pa
/// by definition). Longer names come first, so `kPa` is not read as `Pa`.
pub const PRESSURE_UNITS: [(&str, u32); 5] = [
    ("MPa", 1_000_000),
    ("kPa", 1000),
    ("Pa", 1),
    ("bar", 100_000),
    ("atm", 101_325),
];

/// Reads a pressure and returns it in pascals, exactly: a number in Pa, or
/// a number followed by one of [`PRESSURE_UNITS`] (`MPa`, `kPa`, `Pa`,
/// `bar`, `atm`), with or without a space. The pressure must be greater
/// than zero.
///
/// ```
/// use zsum::units::parse_pressure;
/// use zsum::exact::parse_rational;
/// assert_eq!(parse_pressure("1bar")?, parse_rational("100000")?);
/// assert_eq!(parse_pressure("101.325 kPa")?, parse_pressure("1atm")?);
/// assert_eq!(parse_pressure("0.1MPa")?, parse_pressure("100000")?);
/// assert!(parse_pressure("0").unwrap_err().to_string().contains("pressure"));
/// assert!(parse_pressure("1 psi").is_err());
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn parse_pressure(text: &str) -> Result<BigRational> {
    let t = text.trim();
    let allowed = "a pressure: a number in Pa or with a unit, e.g. 100000, 1bar, 101.325kPa, 1atm";
    let (num, factor) = PRESSURE_UNITS
        .iter()
        .find_map(|(u, f)| t.strip_suffix(u).map(|n| (n.trim(), *f)))
        .unwrap_or((t, 1));
    let v = parse_rational(num).map_err(|_| Error::parse("pressure", text, allowed))?
        * BigRational::from_integer(BigInt::from(factor));
    if !v.is_positive() {
        return Err(Error::invalid(
            "pressure",
            text,
            "the pressure must be greater than zero",
        ));
    }
    Ok(v)
}

/// The particle-in-a-box energy unit h²/(8 m L²) in joules, for mass `m`
/// (kg) and reference side `L` (m), exactly.
pub fn box_unit_joules(mass_kg: &BigRational, side_m: &BigRational) -> BigRational {
    let h = constants::planck();
    &h * &h / (BigRational::from_integer(BigInt::from(8)) * mass_kg * side_m * side_m)
}
