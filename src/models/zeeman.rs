//! A spin multiplet in a magnetic field: paramagnetic salts, two-level
//! systems.
//!
//! A multiplet of angular momentum J in a field B splits into the 2J+1
//! levels
//!
//! ```text
//! E(m_J) = g_J m_J μ_B B,      m_J = −J, −J+1, ..., J,
//! ```
//!
//! each nondegenerate; with B = 0 or g_J = 0 they merge into one level of
//! degeneracy 2J+1 at E = 0.
//!
//! - **J** is a non-negative integer or half-integer, held doubled
//!   (`twice_j`, so J = 7/2 is 7); [`parse_j`] reads it from text such as
//!   `7/2`, `3.5` or `2`.
//! - **g_J** is any exact rational, including zero and negative values
//!   (negative Landé factors occur, e.g. g_J = −2/3 for a ⁶F₁/₂ term, and
//!   many nuclear g factors are negative). With the sign convention above a
//!   negative g_J puts m_J = +J lowest; the set of energies, and so every
//!   thermodynamic quantity, is the same as for |g_J|.
//! - **B** is a non-negative exact rational in tesla (its direction only
//!   relabels m_J); [`parse_field_tesla`] reads `1`, `1 T`, `500 mT` or
//!   `1e4 G`.
//!
//! Energies are exact rationals in [`EnergyUnit::Kelvin`] by default
//! (E/k_B, the natural scale for paramagnetic salts), or in any unit of
//! known size via [`ZeemanMultiplet::with_unit`]. The only measured input
//! is the Bohr magneton ([`bohr_magneton`], CODATA 2018), taken as the exact
//! rational of its decimal value; k_B and the other unit constants are exact
//! in the SI.
//!
//! The quantum number is `m_J`, stored doubled in a [`State`] (m_J = −1/2
//! is −1; [`Spectrum::doubled_numbers`] says so).
//!
//! ```
//! use zsum::models::zeeman::ZeemanMultiplet;
//! use zsum::spectrum::Spectrum;
//! use num_rational::BigRational;
//! // A spin 1/2 with g = 2 at 1 T: two levels ±μ_B B/k_B, about ±0.6717 K.
//! let s = ZeemanMultiplet::from_text("1/2", "2", "1 T")?;
//! let top = BigRational::from_integer(1.into());
//! let levels = s.levels_up_to(&top)?;
//! assert_eq!(levels.len(), 2);
//! assert_eq!(levels.levels()[0].energy, -levels.levels()[1].energy.clone());
//! # Ok::<(), zsum::Error>(())
//! ```

use crate::error::{Error, ErrorKind, Result};
use crate::exact::{parse_rational, rational_string};
use crate::level::{Level, LevelList};
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use std::sync::OnceLock;

/// The Bohr magneton μ_B = 9.274 010 0783(28) × 10⁻²⁴ J/T as written in
/// [`bohr_magneton`].
pub const BOHR_MAGNETON_TEXT: &str = "9.2740100783e-24";

/// Where the Bohr magneton value comes from.
pub const BOHR_MAGNETON_SOURCE: &str = "CODATA 2018";

/// The most states [`Spectrum::states_at`] lists one by one for a level
/// (the merged level at B = 0 holds 2J+1); more is refused with
/// [`ErrorKind::Budget`].
pub const MAX_LISTED_STATES: u64 = 1_000_000;

/// Bytes per level in a level list (exact energy and degeneracy).
const LEVEL_BYTES: f64 = 128.0;

/// The Bohr magneton μ_B = e ħ / (2 m_e) in J/T: the CODATA 2018
/// recommended value 9.274 010 0783(28) × 10⁻²⁴ J/T (relative standard
/// uncertainty 3.0 × 10⁻¹⁰), measured, not exact; taken here as the exact
/// rational of that decimal. (Value quoted from memory of the CODATA 2018
/// table; check it against NIST's list before relying on its last digits.)
pub fn bohr_magneton() -> BigRational {
    static C: OnceLock<BigRational> = OnceLock::new();
    C.get_or_init(|| parse_rational(BOHR_MAGNETON_TEXT).expect("constant literal"))
        .clone()
}

/// Reads an angular momentum J from text and returns 2J.
///
/// Accepted: a non-negative integer or half-integer written as an exact
/// decimal or fraction: `0`, `1/2`, `2`, `7/2`, `3.5`, `14/4`. Refused with
/// a message: negative values, values with 2J not a whole number (`1/3`),
/// 2J beyond `u32::MAX`, and text that is not a number.
///
/// ```
/// use zsum::models::zeeman::parse_j;
/// assert_eq!(parse_j("7/2").unwrap(), 7);
/// assert_eq!(parse_j("3.5").unwrap(), 7);
/// assert!(parse_j("1/3").is_err());
/// ```
pub fn parse_j(text: &str) -> Result<u32> {
    let allowed = "a non-negative integer or half-integer such as 0, 1/2, 1, 3/2, 7/2 or 3.5";
    let j = parse_rational(text).map_err(|_| Error::parse("J", text, allowed))?;
    if j.is_negative() {
        return Err(Error::invalid(
            "J",
            format!("{:?}", text.trim()),
            &format!("it is negative; J is {allowed}"),
        ));
    }
    let twice = &j * BigRational::from_integer(BigInt::from(2));
    if !twice.is_integer() {
        return Err(Error::invalid(
            "J",
            format!("{:?}", text.trim()),
            &format!("2J must be a whole number; J is {allowed}"),
        ));
    }
    twice.to_integer().to_u32().ok_or_else(|| {
        Error::invalid(
            "J",
            format!("{:?}", text.trim()),
            &format!("2J may be at most {}", u32::MAX),
        )
    })
}

/// Reads a magnetic flux density and returns it in tesla, exactly.
///
/// Accepted: a non-negative exact number with an optional unit `T`, `mT`
/// or `G` (gauss, 10⁻⁴ T), with or without a space: `1`, `1 T`, `0.5T`,
/// `500 mT`, `1e4 G`. A bare number is in tesla.
///
/// ```
/// use zsum::models::zeeman::parse_field_tesla;
/// use zsum::exact::parse_rational;
/// assert_eq!(parse_field_tesla("500 mT").unwrap(), parse_rational("1/2").unwrap());
/// assert!(parse_field_tesla("-1 T").is_err());
/// ```
pub fn parse_field_tesla(text: &str) -> Result<BigRational> {
    let t = text.trim();
    let allowed = "a non-negative number with an optional unit T, mT or G, such as 1, 1 T, \
                   500 mT or 1e4 G";
    let (num, factor) = if let Some(n) = t.strip_suffix("mT") {
        (n, BigRational::new(BigInt::one(), BigInt::from(1000)))
    } else if let Some(n) = t.strip_suffix('T') {
        (n, BigRational::one())
    } else if let Some(n) = t.strip_suffix('G') {
        (n, BigRational::new(BigInt::one(), BigInt::from(10_000)))
    } else {
        (t, BigRational::one())
    };
    let b = parse_rational(num).map_err(|_| Error::parse("magnetic field", text, allowed))?;
    if b.is_negative() {
        return Err(Error::invalid(
            "magnetic field",
            format!("{t:?}"),
            "it is negative; give the field's magnitude, zero or more (its direction only \
             relabels m_J)",
        ));
    }
    Ok(b * factor)
}

/// A multiplet of angular momentum J with Landé factor g_J in a field B
/// (see the module documentation).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ZeemanMultiplet {
    twice_j: u32,
    g: BigRational,
    field: BigRational,
    unit: EnergyUnit,
    /// g μ_B B / 2 in `unit`: the energy of a state is `half_step · 2m_J`.
    half_step: BigRational,
}

impl ZeemanMultiplet {
    /// The multiplet with 2J = `twice_j`, Landé factor `g` (any rational)
    /// and field `field_tesla` (tesla, zero or more), with energies in
    /// kelvin.
    pub fn new(twice_j: u32, g: BigRational, field_tesla: BigRational) -> Result<Self> {
        if field_tesla.is_negative() {
            return Err(Error::invalid(
                "magnetic field",
                format!("{} T", rational_string(&field_tesla)),
                "it is negative; give the field's magnitude, zero or more (its direction only \
                 relabels m_J)",
            ));
        }
        let mut m = ZeemanMultiplet {
            twice_j,
            g,
            field: field_tesla,
            unit: EnergyUnit::Kelvin,
            half_step: BigRational::zero(),
        };
        m.half_step = m.half_step_in(&EnergyUnit::Kelvin)?;
        Ok(m)
    }

    /// The multiplet read from text: J as [`parse_j`] reads it, g_J as an
    /// exact rational, B as [`parse_field_tesla`] reads it; energies in
    /// kelvin.
    pub fn from_text(j: &str, g: &str, field: &str) -> Result<Self> {
        let twice_j = parse_j(j)?;
        let g = parse_rational(g).map_err(|_| {
            Error::parse(
                "g factor",
                g,
                "an exact number such as 2, 2.0023, -2/3 or 0 (any sign)",
            )
        })?;
        let field = parse_field_tesla(field)?;
        ZeemanMultiplet::new(twice_j, g, field)
    }

    /// The same multiplet with energies in `unit` (exactly converted); the
    /// unit's size in joules must be known.
    pub fn with_unit(&self, unit: &EnergyUnit) -> Result<Self> {
        Ok(ZeemanMultiplet {
            unit: unit.clone(),
            half_step: self.half_step_in(unit)?,
            ..self.clone()
        })
    }

    /// g μ_B B / 2 in `unit`.
    fn half_step_in(&self, unit: &EnergyUnit) -> Result<BigRational> {
        let joules = unit.joules().filter(|j| j.is_positive()).ok_or_else(|| {
            Error::new(
                ErrorKind::Unit,
                format!(
                    "cannot express Zeeman energies in {unit}: its size in joules is not known; \
                     use J, eV, meV, cm-1, K or kJ/mol"
                ),
            )
        })?;
        Ok(&self.g * bohr_magneton() * &self.field
            / (joules * BigRational::from_integer(BigInt::from(2))))
    }

    /// 2J.
    pub fn twice_j(&self) -> u32 {
        self.twice_j
    }

    /// J, exactly.
    pub fn j(&self) -> BigRational {
        BigRational::new(BigInt::from(self.twice_j), BigInt::from(2))
    }

    /// The Landé factor g_J.
    pub fn g(&self) -> &BigRational {
        &self.g
    }

    /// The field B in tesla.
    pub fn field_tesla(&self) -> &BigRational {
        &self.field
    }

    /// The number of states, 2J + 1.
    pub fn multiplicity(&self) -> u64 {
        u64::from(self.twice_j) + 1
    }

    /// The spacing |g_J| μ_B B between neighbouring levels, in the model's
    /// unit (zero when the levels merge).
    pub fn splitting(&self) -> BigRational {
        self.half_step.abs() * BigRational::from_integer(BigInt::from(2))
    }

    /// The energy g_J m_J μ_B B of the state with 2m_J = `twice_m`, or
    /// `None` if no such state exists (|2m_J| > 2J or parity unlike 2J's).
    pub fn energy_of(&self, twice_m: i64) -> Option<BigRational> {
        let ok = twice_m.unsigned_abs() <= u64::from(self.twice_j)
            && (twice_m - i64::from(self.twice_j)) % 2 == 0;
        ok.then(|| &self.half_step * BigRational::from_integer(BigInt::from(twice_m)))
    }

    fn merged(&self) -> bool {
        self.half_step.is_zero()
    }

    /// J as text: `7/2`, `2`.
    fn j_text(&self) -> String {
        if self.twice_j % 2 == 0 {
            (self.twice_j / 2).to_string()
        } else {
            format!("{}/2", self.twice_j)
        }
    }
}

impl Spectrum for ZeemanMultiplet {
    /// A finite list: carried exactly inside every classical
    /// approximation of a product.
    fn structure(&self) -> Structure<'_> {
        Structure::Finite
    }

    fn describe(&self) -> String {
        format!(
            "Zeeman multiplet J = {}, g_J = {}, B = {} T",
            self.j_text(),
            rational_string(&self.g),
            rational_string(&self.field)
        )
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        vec!["m_J".to_string()]
    }

    fn doubled_numbers(&self) -> Vec<bool> {
        vec![true]
    }

    fn ground_energy(&self) -> BigRational {
        -self.half_step.abs() * BigRational::from_integer(BigInt::from(self.twice_j))
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        if self.merged() {
            return Ok(LevelList::from_sorted(
                self.unit.clone(),
                vec![Level::new(BigRational::zero(), self.multiplicity())],
            ));
        }
        let n = self.count_bound(cutoff).to_u64().unwrap_or(u64::MAX);
        budget.check_levels(
            format!(
                "listing the {n} levels up to {} {}",
                rational_string(cutoff),
                self.unit
            ),
            n as f64,
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        // Lowest first: 2m_J from −2J upwards if the step is positive, from
        // +2J downwards if it is negative.
        let (start, dir) = if self.half_step.is_positive() {
            (-i64::from(self.twice_j), 2)
        } else {
            (i64::from(self.twice_j), -2)
        };
        let levels = (0..n as i64)
            .map(|k| {
                let twice_m = start + dir * k;
                Level::new(
                    &self.half_step * BigRational::from_integer(BigInt::from(twice_m)),
                    1u32,
                )
            })
            .collect();
        Ok(LevelList::from_sorted(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let j = i64::from(self.twice_j);
        if self.merged() {
            if !energy.is_zero() {
                return Ok(Vec::new());
            }
            if self.multiplicity() > MAX_LISTED_STATES {
                return Err(Error::budget(format!(
                    "the level at 0 {} has {} states (2J+1 with J = {}), more than the \
                     {MAX_LISTED_STATES} zsum lists one by one; list levels without their states",
                    self.unit,
                    self.multiplicity(),
                    self.j_text()
                )));
            }
            return Ok((0..=j).map(|k| State(vec![-j + 2 * k])).collect());
        }
        let t = energy / &self.half_step;
        if !t.is_integer() {
            return Ok(Vec::new());
        }
        Ok(t.to_integer()
            .to_i64()
            .and_then(|twice_m| self.energy_of(twice_m).map(|_| twice_m))
            .map(|twice_m| State(vec![twice_m]))
            .into_iter()
            .collect())
    }

    fn highest_energy(&self) -> Option<BigRational> {
        let j = i64::from(self.twice_j);
        match (self.energy_of(j), self.energy_of(-j)) {
            (Some(a), Some(b)) => Some(a.max(b)),
            (a, b) => a.or(b),
        }
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Exact. With s = |g μ_B B|, the energies are s·k − J s for
        // k = 0..=2J (k = m_J + J, or J − m_J if g < 0), so the count up to
        // E is floor(E/s + J) + 1, clamped to 0..=2J+1.
        let total = BigUint::from(self.multiplicity());
        if self.merged() {
            return if energy.is_negative() {
                BigUint::zero()
            } else {
                total
            };
        }
        // (E/(s/2) + 2J) / 2 = E/s + J.
        let x = (energy / self.half_step.abs()
            + BigRational::from_integer(BigInt::from(self.twice_j)))
            / BigRational::from_integer(BigInt::from(2));
        if x.is_negative() {
            return BigUint::zero();
        }
        let n = x.floor().to_integer().to_biguint().unwrap_or_default() + 1u32;
        n.min(total)
    }
}
