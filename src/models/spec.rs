//! Model descriptions: every model kind described once, as plain data, and
//! built by one validating function.
//!
//! A [`ModelSpec`] says which model and with which constants, as written:
//! energies are [`Text`]s `"<number> <unit>"` read exactly when the model is
//! built. The same description comes from a system file's `[[part]]` table
//! (it deserialises from it: `kind` picks the variant and the other fields
//! keep the names the system file documents), from the command line's
//! options, or from Rust; [`ModelSpec::build`] then does every check once,
//! so a bad value is refused with the same message on every path.
//!
//! Units: a model's energies are in the unit of its first constant (in the
//! order the model lists them), and its other constants are converted to
//! that unit exactly.
//!
//! ```
//! use zsum::models::spec::{ModelSpec, RotorSpec, Text};
//! use zsum::spectrum::Spectrum;
//! use zsum::exact::parse_rational;
//!
//! // As a system file writes it ...
//! let from_file: ModelSpec = toml::from_str("kind = \"rotor\"\nB = \"2 cm-1\"\nspin = \"1\"\n")?;
//! // ... and as a program writes it.
//! let from_code = ModelSpec::Rotor(RotorSpec {
//!     spin: Some(Text::new("1")),
//!     ..RotorSpec::new(Text::new("2 cm-1"))
//! });
//! assert_eq!(from_file, from_code);
//! let rotor = from_code.build()?;
//! // J = 0 carries the six symmetric spin states of two I = 1 nuclei.
//! let levels = rotor.levels_up_to(&parse_rational("12")?)?;
//! assert_eq!(levels.levels()[0].degeneracy, 6u32.into());
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```
//!
//! Errors: [`ModelSpec::build`] returns a [`SpecError`], which names the
//! field a refusal concerns (or none, when it concerns the model as a
//! whole); readers place it (a system file adds the file, line and part,
//! the command line the option that set the field).

use crate::error::{excerpt, Error, Result};
use crate::exact::{parse_rational, rational_string};
use crate::models::asym_top::{pair_weights, AsymmetricTop, Axis};
use crate::models::asymmetric::{AsymmetricTopMath, Quartic};
use crate::models::diatomic::{ParityWeights, RovibDiatomic};
use crate::models::level_file::LevelFile;
use crate::models::oscillator::{AnharmonicOscillator, HarmonicModes};
use crate::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
use crate::models::zeeman::{parse_field_tesla, parse_j, ZeemanMultiplet};
use crate::models::ParticleInBox;
use crate::spectrum::Spectrum;
use crate::units::{parse_energy, parse_length_m, parse_mass_kg, EnergyUnit};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::Zero;
use serde::de::{self, Deserializer, SeqAccess, Visitor};
use serde::{Deserialize, Serialize, Serializer};
use std::fmt;
use std::path::{Path, PathBuf};

/// A built model, ready for the engine.
pub type Model = Box<dyn Spectrum + Send + Sync>;

/// A value as written in a description: an energy `"1.99824 cm-1"`, or the
/// text a field reads (`"7/2"`, `"1:3"`, `"4.0026 u"`). It is read exactly
/// when the model is built, never through floating point.
///
/// From a file it is a string; an integer is taken as its digits, and a
/// floating-point number is refused (write it as a string so it is read
/// exactly).
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub struct Text(String);

impl Text {
    /// The value as written.
    pub fn new(text: impl Into<String>) -> Self {
        Text(text.into())
    }

    /// An exact energy in `unit`, written so that it reads back exactly
    /// (`"27/4 cm-1"`).
    pub fn energy(value: &BigRational, unit: &EnergyUnit) -> Self {
        Text(format!("{} {}", rational_string(value), unit.symbol()))
    }

    /// The text.
    pub fn as_str(&self) -> &str {
        &self.0
    }
}

impl From<&str> for Text {
    fn from(text: &str) -> Self {
        Text::new(text)
    }
}

impl fmt::Display for Text {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl Serialize for Text {
    fn serialize<S: Serializer>(&self, s: S) -> std::result::Result<S::Ok, S::Error> {
        s.serialize_str(&self.0)
    }
}

struct TextVisitor;

impl Visitor<'_> for TextVisitor {
    type Value = Text;

    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("a string such as \"1.99824 cm-1\"")
    }

    fn visit_str<E: de::Error>(self, v: &str) -> std::result::Result<Text, E> {
        Ok(Text::new(v))
    }

    fn visit_string<E: de::Error>(self, v: String) -> std::result::Result<Text, E> {
        Ok(Text(v))
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> std::result::Result<Text, E> {
        Ok(Text(v.to_string()))
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> std::result::Result<Text, E> {
        Ok(Text(v.to_string()))
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> std::result::Result<Text, E> {
        Err(E::custom(format!(
            "write the number {v} as a string (\"{v} <unit>\") so it is read exactly"
        )))
    }
}

impl<'de> Deserialize<'de> for Text {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        d.deserialize_any(TextVisitor)
    }
}

/// Why a description could not be built: the error, and the field it
/// concerns (`None` when it concerns the model as a whole, such as two
/// constants that do not fit together).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SpecError {
    field: Option<&'static str>,
    error: Error,
}

impl SpecError {
    /// An error about the description as a whole.
    pub fn whole(error: Error) -> Self {
        SpecError { field: None, error }
    }

    /// An error about one field (named as the system file names it).
    pub fn at(field: &'static str, error: Error) -> Self {
        SpecError {
            field: Some(field),
            error,
        }
    }

    /// The field the error concerns, as the system file names it.
    pub fn field(&self) -> Option<&'static str> {
        self.field
    }

    /// The error itself, without the field.
    pub fn error(&self) -> &Error {
        &self.error
    }
}

impl fmt::Display for SpecError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.field {
            Some(field) => write!(f, "field `{field}`: {}", self.error),
            None => write!(f, "{}", self.error),
        }
    }
}

impl std::error::Error for SpecError {}

impl From<Error> for SpecError {
    fn from(error: Error) -> Self {
        SpecError::whole(error)
    }
}

impl From<SpecError> for Error {
    fn from(e: SpecError) -> Self {
        Error::new(e.error.kind(), e.to_string())
    }
}

/// The result of building a description.
pub type Built<T> = std::result::Result<T, SpecError>;

/// Attributes an error to `field`.
fn at(field: &'static str) -> impl Fn(Error) -> SpecError {
    move |e| SpecError::at(field, e)
}

/// A model's energy constants, read in order: the first one's unit is the
/// model's, and the others are converted to it exactly.
#[derive(Default)]
struct Energies {
    unit: Option<EnergyUnit>,
}

impl Energies {
    /// A value in `unit`, in the model's unit (setting it if unset).
    fn take(
        &mut self,
        value: BigRational,
        unit: EnergyUnit,
    ) -> std::result::Result<BigRational, Error> {
        match &self.unit {
            None => {
                self.unit = Some(unit);
                Ok(value)
            }
            Some(target) => unit.convert(&value, target),
        }
    }

    fn read(&mut self, field: &'static str, text: &Text) -> Built<BigRational> {
        let (value, unit) = parse_energy(text.as_str()).map_err(at(field))?;
        self.take(value, unit).map_err(at(field))
    }

    /// An optional constant; zero when absent.
    fn optional(&mut self, field: &'static str, text: Option<&Text>) -> Built<BigRational> {
        match text {
            Some(t) => self.read(field, t),
            None => Ok(BigRational::zero()),
        }
    }

    /// The model's unit (cm⁻¹ if no constant set one).
    fn unit(self) -> EnergyUnit {
        self.unit.unwrap_or(EnergyUnit::Wavenumber)
    }
}

/// Reads a nuclear spin I (0, 1/2, 1, 3/2, ...) and returns 2I.
pub fn parse_twice_spin(text: &str) -> Result<u32> {
    let v = parse_rational(text)
        .map_err(|_| Error::parse("nuclear spin", text, "0, 1/2, 1, 3/2, ..."))?;
    let twice = &v * BigRational::from_integer(2.into());
    if v < BigRational::zero() || !twice.is_integer() {
        return Err(Error::invalid(
            "nuclear spin",
            text,
            "it must be a non-negative integer or half-integer (0, 1/2, 1, 3/2, ...)",
        ));
    }
    num_traits::ToPrimitive::to_u32(&twice.to_integer())
        .filter(|&t| t <= 40)
        .ok_or_else(|| Error::invalid("nuclear spin", text, "nuclear spins go up to 20"))
}

/// Reads hand-set parity weights `EVEN:ODD`.
pub fn parse_weights(text: &str) -> Result<ParityWeights> {
    let bad = || {
        Error::parse(
            "weights",
            text,
            "EVEN:ODD with non-negative integers, e.g. 1:3",
        )
    };
    let (a, b) = text.split_once(':').ok_or_else(bad)?;
    let e: BigUint = a.trim().parse().map_err(|_| bad())?;
    let o: BigUint = b.trim().parse().map_err(|_| bad())?;
    ParityWeights::new(e, o)
}

/// Applies an `only` selection (`even`, `odd`, `ortho`, `para`) to a
/// rotor-like model's weights.
pub fn restrict_weights(w: ParityWeights, only: Option<&str>) -> Result<ParityWeights> {
    let (e, o) = (w.weight(0).clone(), w.weight(1).clone());
    let keep_even = match only {
        None => return Ok(w),
        Some("even") => true,
        Some("odd") => false,
        Some("ortho") => e >= o,
        Some("para") => e < o,
        Some(other) => {
            return Err(Error::parse("selection", other, "even, odd, ortho or para"));
        }
    };
    if e == o && matches!(only, Some("ortho") | Some("para")) {
        return Err(Error::invalid(
            "selection",
            only.unwrap_or_default(),
            "even and odd levels have equal weights, so there is no ortho/para distinction; \
             use even or odd",
        ));
    }
    let (e2, o2) = if keep_even {
        (e, BigUint::zero())
    } else {
        (BigUint::zero(), o)
    };
    ParityWeights::new(e2, o2)
}

/// Reads one harmonic mode `"1500 cm-1"` or `"1500 cm-1 x2"` (a mode of
/// degeneracy 2); returns its quantum, unit and degeneracy.
fn parse_mode(text: &str) -> Result<(BigRational, EnergyUnit, u32)> {
    // No energy unit contains an x, so an x starts the degeneracy.
    let (body, deg) = match text.split_once('x') {
        Some((body, d)) => {
            let deg = d
                .trim()
                .parse::<u32>()
                .ok()
                .filter(|&d| d >= 1)
                .ok_or_else(|| {
                    Error::parse(
                    "mode degeneracy",
                    d.trim(),
                    "a whole number of at least 1 after the x (x2 for a doubly degenerate mode)",
                )
                })?;
            (body, deg)
        }
        None => (text, 1),
    };
    let (v, u) = parse_energy(body)?;
    Ok((v, u, deg))
}

/// Which rotational levels a rotor-like model keeps.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case", try_from = "String")]
pub enum Selection {
    /// Even J only.
    Even,
    /// Odd J only.
    Odd,
    /// The parity with the larger nuclear-spin weight.
    Ortho,
    /// The parity with the smaller nuclear-spin weight.
    Para,
}

impl Selection {
    /// The name a file writes: `even`, `odd`, `ortho` or `para`.
    pub fn as_str(self) -> &'static str {
        match self {
            Selection::Even => "even",
            Selection::Odd => "odd",
            Selection::Ortho => "ortho",
            Selection::Para => "para",
        }
    }
}

impl TryFrom<String> for Selection {
    type Error = String;

    fn try_from(text: String) -> std::result::Result<Self, String> {
        [
            Selection::Even,
            Selection::Odd,
            Selection::Ortho,
            Selection::Para,
        ]
        .into_iter()
        .find(|s| s.as_str() == text)
        .ok_or_else(|| format!("{:?} is not one of even, odd, ortho, para", excerpt(&text)))
    }
}

/// The weights of even and odd J from the nuclear-spin fields of a rotor
/// or diatomic: `spin` (with `swap_parity`) or `weights`, then `only`.
fn parity_weights(
    spin: Option<&Text>,
    swap_parity: bool,
    weights: Option<&Text>,
    only: Option<Selection>,
) -> Built<ParityWeights> {
    let w = match (spin, weights) {
        (Some(s), Some(w)) => {
            return Err(SpecError::at(
                "weights",
                Error::invalid(
                    "parity weights",
                    w,
                    &format!(
                        "the nuclear spin {s} sets them already; give the spin or the weights, \
                         not both"
                    ),
                ),
            ))
        }
        (Some(s), None) => ParityWeights::from_nuclear_spin(
            parse_twice_spin(s.as_str()).map_err(at("spin"))?,
            swap_parity,
        ),
        (None, w) => {
            if swap_parity {
                return Err(SpecError::at(
                    "swap_parity",
                    Error::invalid(
                        "parity swap",
                        "true",
                        "it exchanges the weights a nuclear spin gives even and odd J; give the \
                         nuclear spin too",
                    ),
                ));
            }
            match w {
                Some(w) => parse_weights(w.as_str()).map_err(at("weights"))?,
                None => ParityWeights::uniform(),
            }
        }
    };
    restrict_weights(w, only.map(Selection::as_str)).map_err(at("only"))
}

fn is_false(b: &bool) -> bool {
    !*b
}

/// `rotor`: a linear rotor, E = B J(J+1) − D [J(J+1)]² + H [J(J+1)]³ with
/// 2J+1 states per J, and optional nuclear-spin statistics.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RotorSpec {
    /// Rotational constant B, e.g. `"1.99824 cm-1"`.
    #[serde(rename = "B")]
    pub b: Text,
    /// Centrifugal distortion constant D (default 0).
    #[serde(rename = "D", default, skip_serializing_if = "Option::is_none")]
    pub d: Option<Text>,
    /// Sextic distortion constant H (default 0).
    #[serde(rename = "H", default, skip_serializing_if = "Option::is_none")]
    pub h: Option<Text>,
    /// Nuclear spin I of each of two identical nuclei (`"1"`, `"1/2"`): sets
    /// the weights of even and odd J.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub spin: Option<Text>,
    /// With `spin`: the electronic state swaps which parity takes the
    /// symmetric spin states (the ³Σg⁻ ground state of O₂).
    #[serde(default, skip_serializing_if = "is_false")]
    pub swap_parity: bool,
    /// Weights of even and odd J set by hand, `"EVEN:ODD"` (instead of
    /// `spin`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weights: Option<Text>,
    /// Keep only one parity of J.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub only: Option<Selection>,
}

impl RotorSpec {
    /// A rigid rotor with constant `b` and no spin statistics.
    pub fn new(b: Text) -> Self {
        RotorSpec {
            b,
            d: None,
            h: None,
            spin: None,
            swap_parity: false,
            weights: None,
            only: None,
        }
    }

    /// Builds the rotor.
    pub fn build(&self) -> Built<LinearRotor> {
        let mut e = Energies::default();
        let b = e.read("B", &self.b)?;
        let d = e.optional("D", self.d.as_ref())?;
        let h = e.optional("H", self.h.as_ref())?;
        let rotor = LinearRotor::new(b, d, h, e.unit())?;
        let w = parity_weights(
            self.spin.as_ref(),
            self.swap_parity,
            self.weights.as_ref(),
            self.only,
        )?;
        Ok(rotor.with_weights(w))
    }
}

/// `top`: a symmetric top, prolate (with `A`) or oblate (with `C`).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TopSpec {
    /// Rotational constant B.
    #[serde(rename = "B")]
    pub b: Text,
    /// A prolate top's constant A > B (give `a` or `c`).
    #[serde(rename = "A", default, skip_serializing_if = "Option::is_none")]
    pub a: Option<Text>,
    /// An oblate top's constant C < B (give `a` or `c`).
    #[serde(rename = "C", default, skip_serializing_if = "Option::is_none")]
    pub c: Option<Text>,
    /// Distortion constant D_J (default 0).
    #[serde(rename = "DJ", default, skip_serializing_if = "Option::is_none")]
    pub dj: Option<Text>,
    /// Distortion constant D_JK (default 0).
    #[serde(rename = "DJK", default, skip_serializing_if = "Option::is_none")]
    pub djk: Option<Text>,
    /// Distortion constant D_K (default 0).
    #[serde(rename = "DK", default, skip_serializing_if = "Option::is_none")]
    pub dk: Option<Text>,
    /// Nuclear spin I of three equivalent nuclei on the three-fold axis
    /// (`"1/2"` for ammonia): spin weights by K mod 3 (none by default).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub three_fold_spin: Option<Text>,
    /// With `three_fold_spin`: the inversion splitting of every level into
    /// its s and a components (an energy; none by default).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub inversion: Option<Text>,
}

impl TopSpec {
    /// Builds the top.
    pub fn build(&self) -> Built<SymmetricTop> {
        let mut e = Energies::default();
        let b = e.read("B", &self.b)?;
        let (shape, unique) = match (&self.a, &self.c) {
            (Some(a), None) => (TopShape::Prolate, e.read("A", a)?),
            (None, Some(c)) => (TopShape::Oblate, e.read("C", c)?),
            (a, _) => {
                return Err(SpecError::whole(Error::invalid(
                    "symmetric top",
                    if a.is_some() {
                        "with both A and C"
                    } else {
                        "with neither A nor C"
                    },
                    "give exactly one of A (a prolate top, A > B) or C (an oblate top, C < B)",
                )))
            }
        };
        let dj = e.optional("DJ", self.dj.as_ref())?;
        let djk = e.optional("DJK", self.djk.as_ref())?;
        let dk = e.optional("DK", self.dk.as_ref())?;
        let inversion = self
            .inversion
            .as_ref()
            .map(|x| e.read("inversion", x))
            .transpose()?;
        let top = SymmetricTop::new(shape, unique, b, dj, djk, dk, e.unit())?;
        match (&self.three_fold_spin, inversion) {
            (None, None) => Ok(top),
            (None, Some(_)) => Err(SpecError::at(
                "inversion",
                Error::invalid(
                    "inversion splitting",
                    "given alone",
                    "the splitting needs the three-fold nuclei's spin (three_fold_spin)",
                ),
            )),
            (Some(spin), inv) => {
                let twice = parse_twice_spin(spin.as_str()).map_err(at("three_fold_spin"))?;
                Ok(top
                    .with_three_fold_spin(twice, inv)
                    .map_err(at("three_fold_spin"))?)
            }
        }
    }
}

/// `asymmetric_top`: an asymmetric top with A ≥ B ≥ C, optional quartic
/// distortion (Watson's A reduction) and nuclear-spin weights per symmetry
/// class, set by hand (`weights = "ee:eo:oe:oo"`) or from a pair of
/// equivalent nuclei (`pair_spin`, `pair_axis`).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AsymmetricTopSpec {
    /// Rotational constant A (the largest).
    #[serde(rename = "A")]
    pub a: Text,
    /// Rotational constant B.
    #[serde(rename = "B")]
    pub b: Text,
    /// Rotational constant C (the smallest).
    #[serde(rename = "C")]
    pub c: Text,
    /// Quartic constant Δ_J (default 0).
    #[serde(rename = "DJ", default, skip_serializing_if = "Option::is_none")]
    pub dj: Option<Text>,
    /// Quartic constant Δ_JK (default 0).
    #[serde(rename = "DJK", default, skip_serializing_if = "Option::is_none")]
    pub djk: Option<Text>,
    /// Quartic constant Δ_K (default 0).
    #[serde(rename = "DK", default, skip_serializing_if = "Option::is_none")]
    pub dk: Option<Text>,
    /// Quartic constant δ_J (default 0).
    #[serde(rename = "dJ", default, skip_serializing_if = "Option::is_none")]
    pub small_dj: Option<Text>,
    /// Quartic constant δ_K (default 0).
    #[serde(rename = "dK", default, skip_serializing_if = "Option::is_none")]
    pub small_dk: Option<Text>,
    /// Spin weights of the classes (Ka, Kc parities) `ee:eo:oe:oo`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weights: Option<Text>,
    /// Nuclear spin I of a pair of equivalent nuclei.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pair_spin: Option<Text>,
    /// The principal axis (a, b or c) whose two-fold rotation exchanges the
    /// pair.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pair_axis: Option<Text>,
}

/// Reads hand-set class weights `ee:eo:oe:oo`.
pub fn parse_class_weights(text: &str) -> Result<[BigUint; 4]> {
    let bad = || {
        Error::parse(
            "weights",
            text,
            "EE:EO:OE:OO (the parities of Ka and Kc) with non-negative integers, e.g. 1:3:3:1",
        )
    };
    let parts: Vec<&str> = text.split(':').collect();
    if parts.len() != 4 {
        return Err(bad());
    }
    let mut out: [BigUint; 4] = Default::default();
    for (o, p) in out.iter_mut().zip(parts) {
        *o = p.trim().parse().map_err(|_| bad())?;
    }
    Ok(out)
}

impl AsymmetricTopSpec {
    /// Builds the top.
    pub fn build(&self) -> Built<AsymmetricTop> {
        let mut e = Energies::default();
        let a = e.read("A", &self.a)?;
        let b = e.read("B", &self.b)?;
        let c = e.read("C", &self.c)?;
        let given = [
            &self.dj,
            &self.djk,
            &self.dk,
            &self.small_dj,
            &self.small_dk,
        ];
        let quartic = if given.iter().any(|x| x.is_some()) {
            Some(Quartic {
                delta_j: e.optional("DJ", self.dj.as_ref())?,
                delta_jk: e.optional("DJK", self.djk.as_ref())?,
                delta_k: e.optional("DK", self.dk.as_ref())?,
                small_delta_j: e.optional("dJ", self.small_dj.as_ref())?,
                small_delta_k: e.optional("dK", self.small_dk.as_ref())?,
            })
        } else {
            None
        };
        let unit = e.unit();
        let math = AsymmetricTopMath::new(a, b, c, quartic)?;
        let top = AsymmetricTop::new(math, unit);
        let weights = match (&self.weights, &self.pair_spin, &self.pair_axis) {
            (Some(w), None, None) => parse_class_weights(w.as_str()).map_err(at("weights"))?,
            (None, Some(s), Some(x)) => pair_weights(
                parse_twice_spin(s.as_str()).map_err(at("pair_spin"))?,
                Axis::parse(x.as_str()).map_err(at("pair_axis"))?,
            ),
            (None, None, None) => return Ok(top),
            (Some(_), _, _) => {
                return Err(SpecError::at(
                    "weights",
                    Error::invalid(
                        "spin weights",
                        "given with a nuclear-spin pair",
                        "give the class weights or the pair's spin and axis, not both",
                    ),
                ))
            }
            (None, Some(_), None) | (None, None, Some(_)) => {
                return Err(SpecError::whole(Error::invalid(
                    "nuclear-spin pair",
                    "half given",
                    "give both the pair's spin (pair_spin) and its exchange axis (pair_axis)",
                )))
            }
        };
        Ok(top.with_weights(weights)?)
    }
}

/// `spherical_top`: a spherical top, (2J+1)² states per J.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SphericalTopSpec {
    /// Rotational constant B.
    #[serde(rename = "B")]
    pub b: Text,
    /// Centrifugal distortion constant D (default 0).
    #[serde(rename = "D", default, skip_serializing_if = "Option::is_none")]
    pub d: Option<Text>,
    /// Nuclear spin I of four equivalent nuclei on a tetrahedron (`"1/2"`
    /// for methane): A, E and F spin weights (none by default).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tetrahedral_spin: Option<Text>,
}

impl SphericalTopSpec {
    /// Builds the top.
    pub fn build(&self) -> Built<SphericalTop> {
        let mut e = Energies::default();
        let b = e.read("B", &self.b)?;
        let d = e.optional("D", self.d.as_ref())?;
        let top = SphericalTop::new(b, d, e.unit())?;
        match &self.tetrahedral_spin {
            None => Ok(top),
            Some(spin) => {
                let twice = parse_twice_spin(spin.as_str()).map_err(at("tetrahedral_spin"))?;
                Ok(top
                    .with_spin_statistics(twice)
                    .map_err(at("tetrahedral_spin"))?)
            }
        }
    }
}

/// One mode or a list of them.
fn one_or_many<'de, D: Deserializer<'de>>(d: D) -> std::result::Result<Vec<Text>, D::Error> {
    struct Modes;
    impl<'de> Visitor<'de> for Modes {
        type Value = Vec<Text>;
        fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
            f.write_str("a list of strings such as [\"1500 cm-1 x2\"]")
        }
        fn visit_str<E: de::Error>(self, v: &str) -> std::result::Result<Vec<Text>, E> {
            TextVisitor.visit_str(v).map(|t| vec![t])
        }
        fn visit_i64<E: de::Error>(self, v: i64) -> std::result::Result<Vec<Text>, E> {
            TextVisitor.visit_i64(v).map(|t| vec![t])
        }
        fn visit_u64<E: de::Error>(self, v: u64) -> std::result::Result<Vec<Text>, E> {
            TextVisitor.visit_u64(v).map(|t| vec![t])
        }
        fn visit_f64<E: de::Error>(self, v: f64) -> std::result::Result<Vec<Text>, E> {
            TextVisitor.visit_f64(v).map(|t| vec![t])
        }
        fn visit_seq<A: SeqAccess<'de>>(
            self,
            mut seq: A,
        ) -> std::result::Result<Vec<Text>, A::Error> {
            let mut out = Vec::new();
            while let Some(t) = seq.next_element::<Text>()? {
                out.push(t);
            }
            Ok(out)
        }
    }
    d.deserialize_any(Modes)
}

/// `oscillator`: independent harmonic modes, each `"<quantum> <unit>"`,
/// optionally with a degeneracy `" x<d>"`.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OscillatorSpec {
    /// The modes, e.g. `["2358.57 cm-1", "667 cm-1 x2"]` (a file may give
    /// one mode as a plain string).
    #[serde(deserialize_with = "one_or_many")]
    pub freq: Vec<Text>,
    /// Whether the energies include the zero-point energy (default false).
    #[serde(default, skip_serializing_if = "is_false")]
    pub zero_point: bool,
}

impl OscillatorSpec {
    /// Builds the modes.
    pub fn build(&self) -> Built<HarmonicModes> {
        let mut e = Energies::default();
        let mut modes = Vec::with_capacity(self.freq.len());
        for text in &self.freq {
            let (v, u, deg) = parse_mode(text.as_str()).map_err(at("freq"))?;
            modes.push((e.take(v, u).map_err(at("freq"))?, deg));
        }
        HarmonicModes::new(modes, self.zero_point, e.unit()).map_err(at("freq"))
    }
}

/// `anharmonic`: a diatomic vibration G(v) = ωe(v+½) − ωexe(v+½)² +
/// ωeye(v+½)³.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AnharmonicSpec {
    /// Harmonic constant ωe.
    pub we: Text,
    /// Anharmonicity constant ωexe.
    pub wexe: Text,
    /// Second anharmonicity constant ωeye (default 0).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weye: Option<Text>,
}

impl AnharmonicSpec {
    /// Builds the oscillator.
    pub fn build(&self) -> Built<AnharmonicOscillator> {
        let mut e = Energies::default();
        let we = e.read("we", &self.we)?;
        let wexe = e.read("wexe", &self.wexe)?;
        let weye = e.optional("weye", self.weye.as_ref())?;
        Ok(AnharmonicOscillator::new(we, wexe, weye, e.unit())?)
    }
}

/// `morse`: a Morse oscillator with harmonic constant ωe and dissociation
/// energy De.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MorseSpec {
    /// Harmonic constant ωe.
    pub we: Text,
    /// Dissociation energy De (from the potential minimum).
    pub dissociation: Text,
}

impl MorseSpec {
    /// Builds the oscillator.
    pub fn build(&self) -> Built<AnharmonicOscillator> {
        let mut e = Energies::default();
        let we = e.read("we", &self.we)?;
        let de = e.read("dissociation", &self.dissociation)?;
        Ok(AnharmonicOscillator::morse(we, de, e.unit())?)
    }
}

/// `diatomic`: the vibrating rotor G(v) + B_v J(J+1) − De [J(J+1)]² with
/// B_v = Be − αe (v+½), and optional nuclear-spin statistics.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DiatomicSpec {
    /// Harmonic constant ωe.
    pub we: Text,
    /// Anharmonicity constant ωexe.
    pub wexe: Text,
    /// Second anharmonicity constant ωeye (default 0).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weye: Option<Text>,
    /// Equilibrium rotational constant Be.
    #[serde(rename = "Be")]
    pub be: Text,
    /// Vibration–rotation constant αe (default 0).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub alpha: Option<Text>,
    /// Centrifugal distortion constant De (default 0).
    #[serde(rename = "De", default, skip_serializing_if = "Option::is_none")]
    pub de: Option<Text>,
    /// Nuclear spin I of each of two identical nuclei.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub spin: Option<Text>,
    /// With `spin`: the electronic state swaps the parities' spin states.
    #[serde(default, skip_serializing_if = "is_false")]
    pub swap_parity: bool,
    /// Weights of even and odd J set by hand, `"EVEN:ODD"`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weights: Option<Text>,
    /// Keep only one parity of J.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub only: Option<Selection>,
}

impl DiatomicSpec {
    /// Builds the molecule.
    pub fn build(&self) -> Built<RovibDiatomic> {
        let mut e = Energies::default();
        let we = e.read("we", &self.we)?;
        let wexe = e.read("wexe", &self.wexe)?;
        let weye = e.optional("weye", self.weye.as_ref())?;
        let be = e.read("Be", &self.be)?;
        let alpha = e.optional("alpha", self.alpha.as_ref())?;
        let de = e.optional("De", self.de.as_ref())?;
        let w = parity_weights(
            self.spin.as_ref(),
            self.swap_parity,
            self.weights.as_ref(),
            self.only,
        )?;
        let vib = AnharmonicOscillator::new(we, wexe, weye, e.unit())?;
        Ok(RovibDiatomic::new(vib, be, alpha, de, w)?)
    }
}

/// One level written out in a description.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LevelEntry {
    /// Its energy, e.g. `"881 cm-1"`.
    pub energy: Text,
    /// Its degeneracy, a whole number of at least 1 (a file may write it as
    /// an integer).
    pub degeneracy: Text,
    /// An optional label.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub label: Option<String>,
}

/// The first line of a reader's message, with the key it names (some
/// readers add it on a line of its own, "in `energy`") put in front.
fn one_line(message: &str) -> String {
    let mut lines = message.lines().map(str::trim).filter(|l| !l.is_empty());
    let first = lines.next().unwrap_or_default();
    match lines.find_map(|l| l.strip_prefix("in `").and_then(|k| k.strip_suffix('`'))) {
        Some(key) => format!("`{key}`: {first}"),
        None => first.to_string(),
    }
}

/// A list of levels whose errors name the level (1-based).
fn level_list<'de, D: Deserializer<'de>>(
    d: D,
) -> std::result::Result<Option<Vec<LevelEntry>>, D::Error> {
    struct Levels;
    impl<'de> Visitor<'de> for Levels {
        type Value = Option<Vec<LevelEntry>>;
        fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
            f.write_str("a list of { energy, degeneracy, label } tables")
        }
        fn visit_seq<A: SeqAccess<'de>>(
            self,
            mut seq: A,
        ) -> std::result::Result<Self::Value, A::Error> {
            let mut out = Vec::new();
            loop {
                match seq.next_element::<LevelEntry>() {
                    Ok(Some(l)) => out.push(l),
                    Ok(None) => return Ok(Some(out)),
                    Err(e) => {
                        return Err(de::Error::custom(format!(
                            "level {}: {}",
                            out.len() + 1,
                            one_line(&e.to_string())
                        )))
                    }
                }
            }
        }
    }
    d.deserialize_seq(Levels)
}

/// `levels`: a finite list of levels, written out or read from a level
/// file.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LevelsSpec {
    /// The levels written out (give `levels` or `file`).
    #[serde(
        default,
        deserialize_with = "level_list",
        skip_serializing_if = "Option::is_none"
    )]
    pub levels: Option<Vec<LevelEntry>>,
    /// A level file (give `levels` or `file`); a relative path is read
    /// relative to the directory [`ModelSpec::build_in`] is given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub file: Option<PathBuf>,
}

impl LevelsSpec {
    /// Builds the level list; a relative `file` is read from `dir`.
    pub fn build(&self, dir: &Path) -> Built<LevelFile> {
        match (&self.levels, &self.file) {
            (Some(list), None) => {
                let mut e = Energies::default();
                let mut entries = Vec::with_capacity(list.len());
                for (i, l) in list.iter().enumerate() {
                    let place = |err: Error| {
                        SpecError::at(
                            "levels",
                            Error::new(err.kind(), format!("level {}: {err}", i + 1)),
                        )
                    };
                    let (v, u) = parse_energy(l.energy.as_str()).map_err(place)?;
                    let v = e.take(v, u).map_err(place)?;
                    let g = l
                        .degeneracy
                        .as_str()
                        .trim()
                        .parse::<BigUint>()
                        .ok()
                        .filter(|g| !g.is_zero())
                        .ok_or_else(|| {
                            place(Error::invalid(
                                "degeneracy",
                                format!("{:?}", l.degeneracy.as_str()),
                                "a degeneracy counts states, a whole number of at least 1",
                            ))
                        })?;
                    entries.push((v, g, l.label.clone()));
                }
                LevelFile::from_entries(e.unit(), entries).map_err(at("levels"))
            }
            (None, Some(path)) => LevelFile::read(dir.join(path)).map_err(at("file")),
            (levels, _) => Err(SpecError::whole(Error::invalid(
                "level list",
                if levels.is_some() {
                    "with both `levels` and `file`"
                } else {
                    "with neither `levels` nor `file`"
                },
                "give exactly one of `levels` (the levels written out) or `file` (a level file)",
            ))),
        }
    }
}

/// `zeeman`: a multiplet of angular momentum J with Landé factor g_J in a
/// magnetic field B, E = g_J m_J μ_B B (energies in kelvin).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ZeemanSpec {
    /// Total angular momentum J, e.g. `"7/2"`.
    #[serde(rename = "J")]
    pub j: Text,
    /// Landé factor g_J, e.g. `"2"`.
    pub g: Text,
    /// Magnetic flux density, e.g. `"1 T"` or `"500 mT"`.
    pub field: Text,
}

impl ZeemanSpec {
    /// Builds the multiplet.
    pub fn build(&self) -> Built<ZeemanMultiplet> {
        let (j, g, field) = (self.j.as_str(), self.g.as_str(), self.field.as_str());
        parse_j(j).map_err(at("J"))?;
        parse_field_tesla(field).map_err(at("field"))?;
        // J and the field read, so what is left to refuse is g or the
        // multiplet as a whole.
        ZeemanMultiplet::from_text(j, g, field).map_err(|e| match parse_rational(g) {
            Err(_) => SpecError::at("g", e),
            Ok(_) => SpecError::whole(e),
        })
    }
}

/// `box`: a particle in a box with impenetrable walls, 1 to 3 dimensions;
/// energies in h²/(8 m L²), or in a physical unit with `mass` and `side`.
#[derive(Debug, Clone, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BoxSpec {
    /// The particle's mass with its unit, e.g. `"4.0026 u"` (with `side`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub mass: Option<Text>,
    /// The reference side L with its unit, e.g. `"10 nm"` (with `mass`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub side: Option<Text>,
    /// The sides as ratios to L, separated by commas or colons (`"1,1,2"`,
    /// `"2:3:5"`); default a cube.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sides: Option<Text>,
    /// The number of dimensions, 1 to 3 (default: the number of `sides`,
    /// or 3).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub dims: Option<i64>,
}

impl BoxSpec {
    /// Builds the box.
    pub fn build(&self) -> Built<ParticleInBox> {
        let sides: Option<Vec<BigRational>> = self
            .sides
            .as_ref()
            .map(|text| {
                text.as_str()
                    .split([',', ':'])
                    .map(|s| {
                        parse_rational(s).map_err(|_| {
                            Error::parse(
                                "side ratio",
                                s.trim(),
                                "positive numbers separated by commas, e.g. 1,1,2 or 2:3:5",
                            )
                        })
                    })
                    .collect::<Result<Vec<_>>>()
            })
            .transpose()
            .map_err(at("sides"))?;
        if let Some(d) = self.dims {
            if !(1..=3).contains(&d) {
                return Err(SpecError::at(
                    "dims",
                    Error::invalid("number of dimensions", d, "a box has 1, 2 or 3 dimensions"),
                ));
            }
        }
        let b = match (self.dims, sides) {
            (Some(d), Some(s)) if s.len() as i64 != d => {
                return Err(SpecError::at(
                    "sides",
                    Error::invalid(
                        "side ratios",
                        self.sides.as_ref().map(Text::as_str).unwrap_or_default(),
                        &format!(
                            "a box of {d} dimensions needs exactly {d} side ratios, got {}",
                            s.len()
                        ),
                    ),
                ))
            }
            (_, Some(s)) => ParticleInBox::new(s).map_err(at("sides"))?,
            (d, None) => ParticleInBox::cube(d.unwrap_or(3) as usize)?,
        };
        let lone = |given: &'static str, missing: &'static str| {
            SpecError::at(
                missing,
                Error::invalid(
                    "box",
                    format!("with a {given} but no {missing}"),
                    "give the particle's mass and the side together (energies of known size), \
                     or neither (energies in h^2/(8 m L^2))",
                ),
            )
        };
        match (&self.mass, &self.side) {
            (Some(m), Some(l)) => {
                let m = parse_mass_kg(m.as_str()).map_err(at("mass"))?;
                let l = parse_length_m(l.as_str()).map_err(at("side"))?;
                Ok(b.with_scale(&m, &l))
            }
            (None, None) => Ok(b),
            (Some(_), None) => Err(lone("mass", "side")),
            (None, Some(_)) => Err(lone("side", "mass")),
        }
    }
}

/// A model described as data: which model, and its constants as written.
///
/// It (de)serialises as a table whose `kind` names the variant
/// (`rotor`, `top`, `spherical_top`, `asymmetric_top`, `oscillator`, `anharmonic`, `morse`,
/// `diatomic`, `levels`, `zeeman`, `box`) and whose other fields are the
/// variant's, named as a system file names them; unknown fields are
/// refused.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case", deny_unknown_fields)]
pub enum ModelSpec {
    /// A linear rotor.
    Rotor(RotorSpec),
    /// A symmetric top.
    Top(TopSpec),
    /// A spherical top.
    SphericalTop(SphericalTopSpec),
    /// An asymmetric top.
    AsymmetricTop(AsymmetricTopSpec),
    /// Harmonic modes.
    Oscillator(OscillatorSpec),
    /// An anharmonic diatomic vibration.
    Anharmonic(AnharmonicSpec),
    /// A Morse oscillator.
    Morse(MorseSpec),
    /// A vibrating rotor.
    Diatomic(DiatomicSpec),
    /// A finite list of levels.
    Levels(LevelsSpec),
    /// A Zeeman multiplet.
    Zeeman(ZeemanSpec),
    /// A particle in a box.
    Box(BoxSpec),
}

impl ModelSpec {
    /// Every kind, as `kind` names it, in the order of the variants.
    pub const KINDS: &'static [&'static str] = &[
        "rotor",
        "top",
        "spherical_top",
        "asymmetric_top",
        "oscillator",
        "anharmonic",
        "morse",
        "diatomic",
        "levels",
        "zeeman",
        "box",
    ];

    /// The kind, as `kind` names it.
    pub fn kind(&self) -> &'static str {
        match self {
            ModelSpec::Rotor(_) => "rotor",
            ModelSpec::Top(_) => "top",
            ModelSpec::SphericalTop(_) => "spherical_top",
            ModelSpec::AsymmetricTop(_) => "asymmetric_top",
            ModelSpec::Oscillator(_) => "oscillator",
            ModelSpec::Anharmonic(_) => "anharmonic",
            ModelSpec::Morse(_) => "morse",
            ModelSpec::Diatomic(_) => "diatomic",
            ModelSpec::Levels(_) => "levels",
            ModelSpec::Zeeman(_) => "zeeman",
            ModelSpec::Box(_) => "box",
        }
    }

    /// The description of kind `kind` from `fields`, the other fields of
    /// its table: the same as deserialising the whole table, for readers
    /// that take the kind apart (and so can place each field's errors). An
    /// unknown kind is refused as an unknown variant naming [`Self::KINDS`].
    pub fn from_kind<'de, D: Deserializer<'de>>(
        kind: &str,
        fields: D,
    ) -> std::result::Result<Self, D::Error> {
        Ok(match kind {
            "rotor" => ModelSpec::Rotor(RotorSpec::deserialize(fields)?),
            "top" => ModelSpec::Top(TopSpec::deserialize(fields)?),
            "spherical_top" => ModelSpec::SphericalTop(SphericalTopSpec::deserialize(fields)?),
            "asymmetric_top" => ModelSpec::AsymmetricTop(AsymmetricTopSpec::deserialize(fields)?),
            "oscillator" => ModelSpec::Oscillator(OscillatorSpec::deserialize(fields)?),
            "anharmonic" => ModelSpec::Anharmonic(AnharmonicSpec::deserialize(fields)?),
            "morse" => ModelSpec::Morse(MorseSpec::deserialize(fields)?),
            "diatomic" => ModelSpec::Diatomic(DiatomicSpec::deserialize(fields)?),
            "levels" => ModelSpec::Levels(LevelsSpec::deserialize(fields)?),
            "zeeman" => ModelSpec::Zeeman(ZeemanSpec::deserialize(fields)?),
            "box" => ModelSpec::Box(BoxSpec::deserialize(fields)?),
            other => return Err(de::Error::unknown_variant(other, Self::KINDS)),
        })
    }

    /// Builds the model; a level file's relative path is taken as given
    /// (relative to the working directory).
    pub fn build(&self) -> Built<Model> {
        self.build_in(Path::new(""))
    }

    /// Builds the model, reading a level file's relative path from `dir`.
    /// Every check happens here: units, ranges, the fields that must or
    /// must not come together.
    pub fn build_in(&self, dir: &Path) -> Built<Model> {
        Ok(match self {
            ModelSpec::Rotor(s) => Box::new(s.build()?),
            ModelSpec::Top(s) => Box::new(s.build()?),
            ModelSpec::SphericalTop(s) => Box::new(s.build()?),
            ModelSpec::AsymmetricTop(s) => Box::new(s.build()?),
            ModelSpec::Oscillator(s) => Box::new(s.build()?),
            ModelSpec::Anharmonic(s) => Box::new(s.build()?),
            ModelSpec::Morse(s) => Box::new(s.build()?),
            ModelSpec::Diatomic(s) => Box::new(s.build()?),
            ModelSpec::Levels(s) => Box::new(s.build(dir)?),
            ModelSpec::Zeeman(s) => Box::new(s.build()?),
            ModelSpec::Box(s) => Box::new(s.build()?),
        })
    }
}
