//! System files: one species described as a product of independent parts,
//! in TOML, with every constant carrying its unit.
//!
//! ```toml
//! name = "demo diatomic"      # optional
//! unit = "cm-1"               # optional common unit (default: the first part's)
//!
//! [[part]]
//! kind = "rotor"              # what this part is (see below)
//! name = "rotation"           # optional; prefixes clashing quantum numbers
//! B = "1.99824 cm-1"
//! D = "5.76e-6 cm-1"
//! spin = "1"                  # nuclear spin of each of two identical nuclei
//!
//! [[part]]
//! kind = "oscillator"
//! freq = ["2358.57 cm-1"]     # each "<value> <unit>", optionally " x<deg>"
//! ```
//!
//! Part kinds and their fields (constants are strings `"<number> <unit>"`;
//! a part's energies are in the unit of its first constant, and its other
//! constants are converted to that unit exactly):
//!
//! | kind | fields |
//! | --- | --- |
//! | `rotor` | `B`, optional `D`, `H`, `spin`, `swap_parity`, `weights` (`"1:3"`), `only` (`even`, `odd`, `ortho`, `para`) |
//! | `top` | `B` and `A` (prolate) or `C` (oblate); optional `DJ`, `DJK`, `DK` |
//! | `spherical_top` | `B`, optional `D` |
//! | `oscillator` | `freq` (list), optional `zero_point` (true/false) |
//! | `anharmonic` | `we`, `wexe`, optional `weye` |
//! | `morse` | `we`, `dissociation` |
//! | `diatomic` | `we`, `wexe`, `Be`, optional `weye`, `alpha`, `De`, `spin`, `swap_parity`, `weights`, `only` |
//! | `levels` | `levels = [{ energy = "0 cm-1", degeneracy = 2, label = "..." }, ...]` or `file = "path"` (relative to the system file) |
//! | `zeeman` | `J` (e.g. `"7/2"`), `g`, `field` (e.g. `"1 T"`) |
//! | `box` | `mass` (e.g. `"4.0026 u"`), `side` (e.g. `"10 nm"`), optional `sides` (`"1,1,2"`) and `dims` (which must agree) |
//!
//! Each part is a [`ModelSpec`] (its fields are the description's, read by
//! its own deserialiser) and is built by [`ModelSpec::build_in`], which does
//! every check; this reader only places the errors. Every error names the
//! file, the line, the part and the field. Every part needs energies of
//! known size in joules, so that parts combine exactly (a box needs its
//! `mass` and `side` here).

use crate::error::{Error, ErrorKind, Result};
use crate::input::excerpt;
use crate::models::product::{Part, Product};
pub use crate::models::spec::{parse_twice_spin, parse_weights, restrict_weights};
use crate::models::spec::{ModelSpec, SpecError};
pub use crate::units::parse_energy;
use crate::units::EnergyUnit;
use serde::de::{self, DeserializeSeed, IntoDeserializer, MapAccess, Visitor};
use serde::Deserialize;
use std::collections::BTreeMap;
use std::ops::Range;
use std::path::Path;
use toml::Spanned;

/// A part's table: every field with its place in the file.
type RawPart = BTreeMap<String, Spanned<toml::Value>>;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSystem {
    name: Option<String>,
    unit: Option<Spanned<String>>,
    #[serde(default)]
    part: Vec<Spanned<RawPart>>,
}

/// A system read from a file: its name, its common unit, and the product of
/// its parts.
#[derive(Debug)]
pub struct System {
    /// The system's name, if the file gives one.
    pub name: Option<String>,
    /// The product of the parts.
    pub product: Product,
    /// Each part's description, in the order of the file (the product's
    /// parts are built from them).
    pub specs: Vec<ModelSpec>,
}

/// Reading context: the file name and its text, to turn byte spans into
/// line numbers.
struct Ctx<'a> {
    file: &'a str,
    text: &'a str,
}

impl Ctx<'_> {
    fn line(&self, span: &Range<usize>) -> usize {
        self.text[..span.start.min(self.text.len())]
            .matches('\n')
            .count()
            + 1
    }

    fn err(&self, kind: ErrorKind, span: &Range<usize>, msg: impl std::fmt::Display) -> Error {
        Error::new(
            kind,
            format!("{}, line {}: {msg}", self.file, self.line(span)),
        )
    }
}

/// Why a part's fields did not deserialise, with what is needed to place
/// the message.
#[derive(Debug)]
enum FieldError {
    /// A field the kind needs is absent.
    Missing(&'static str),
    /// A field the kind does not have.
    Unknown {
        field: String,
        expected: &'static [&'static str],
        span: Option<Range<usize>>,
    },
    /// A kind that does not exist.
    Kind(String),
    /// A field whose value does not fit.
    Value {
        field: String,
        span: Range<usize>,
        message: String,
    },
    /// Anything else, about the part as a whole.
    Other(String),
}

impl std::fmt::Display for FieldError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            FieldError::Missing(field) => write!(f, "missing field `{field}`"),
            FieldError::Unknown { field, .. } => write!(f, "unknown field `{field}`"),
            FieldError::Kind(kind) => write!(f, "unknown kind {kind:?}"),
            FieldError::Value { field, message, .. } => write!(f, "field `{field}`: {message}"),
            FieldError::Other(message) => f.write_str(message),
        }
    }
}

impl std::error::Error for FieldError {}

impl de::Error for FieldError {
    fn custom<T: std::fmt::Display>(msg: T) -> Self {
        FieldError::Other(msg.to_string())
    }

    fn missing_field(field: &'static str) -> Self {
        FieldError::Missing(field)
    }

    fn unknown_field(field: &str, expected: &'static [&'static str]) -> Self {
        FieldError::Unknown {
            field: field.to_string(),
            expected,
            span: None,
        }
    }

    fn unknown_variant(variant: &str, _expected: &'static [&'static str]) -> Self {
        FieldError::Kind(variant.to_string())
    }
}

/// A part's fields (without `kind` and `name`) in the order of the file, as
/// a map that a description deserialises from; each value's errors carry
/// its field and place.
struct PartFields {
    fields: std::vec::IntoIter<(String, Spanned<toml::Value>)>,
    value: Option<(String, Spanned<toml::Value>)>,
}

impl<'de> de::Deserializer<'de> for PartFields {
    type Error = FieldError;

    fn deserialize_any<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, FieldError> {
        visitor.visit_map(self)
    }

    serde::forward_to_deserialize_any! {
        bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string
        bytes byte_buf option unit unit_struct newtype_struct seq tuple
        tuple_struct map struct enum identifier ignored_any
    }
}

impl<'de> MapAccess<'de> for PartFields {
    type Error = FieldError;

    fn next_key_seed<K: DeserializeSeed<'de>>(
        &mut self,
        seed: K,
    ) -> Result<Option<K::Value>, FieldError> {
        let Some((key, value)) = self.fields.next() else {
            return Ok(None);
        };
        let span = value.span();
        let k = seed
            .deserialize(key.clone().into_deserializer())
            .map_err(|e| match e {
                FieldError::Unknown {
                    field, expected, ..
                } => FieldError::Unknown {
                    field,
                    expected,
                    span: Some(span),
                },
                other => other,
            })?;
        self.value = Some((key, value));
        Ok(Some(k))
    }

    fn next_value_seed<V: DeserializeSeed<'de>>(
        &mut self,
        seed: V,
    ) -> Result<V::Value, FieldError> {
        let (field, value) = self
            .value
            .take()
            .ok_or_else(|| FieldError::Other("a value was read before its field".into()))?;
        let span = value.span();
        seed.deserialize(value.into_inner())
            .map_err(|e| FieldError::Value {
                field,
                span,
                message: e.message().trim_end().to_string(),
            })
    }
}

/// One part being read: its place, index and kind.
struct PartReader<'a> {
    ctx: &'a Ctx<'a>,
    index: usize,
    kind: String,
    span: Range<usize>,
    kind_span: Range<usize>,
}

impl PartReader<'_> {
    fn who(&self) -> String {
        format!("part {} ({})", self.index + 1, self.kind)
    }

    /// A deserialising error, placed at its field.
    fn field_error(&self, e: FieldError) -> Error {
        let ctx = self.ctx;
        let who = self.who();
        match e {
            FieldError::Missing(field) => ctx.err(
                ErrorKind::Parse,
                &self.span,
                format!("{who} needs the field `{field}`"),
            ),
            FieldError::Unknown {
                field,
                expected,
                span,
            } => ctx.err(
                ErrorKind::Parse,
                span.as_ref().unwrap_or(&self.span),
                format!(
                    "field `{}` does not belong to {who}; its fields are: {}",
                    excerpt(&field),
                    expected.join(", ")
                ),
            ),
            FieldError::Kind(kind) => ctx.err(
                ErrorKind::Parse,
                &self.kind_span,
                format!(
                    "part {}: unknown kind {:?}; kinds are {}",
                    self.index + 1,
                    excerpt(&kind),
                    ModelSpec::KINDS.join(", ")
                ),
            ),
            FieldError::Value {
                field,
                span,
                message,
            } => ctx.err(
                ErrorKind::Parse,
                &span,
                format!("field `{field}` of {who}: {}", excerpt_lines(&message)),
            ),
            FieldError::Other(message) => {
                ctx.err(ErrorKind::Parse, &self.span, format!("{who}: {message}"))
            }
        }
    }

    /// A building error, placed at its field (or at the part).
    fn build_error(&self, e: SpecError, spans: &[(String, Range<usize>)]) -> Error {
        let error = e.error();
        match e.field() {
            Some(field) => {
                let span = spans
                    .iter()
                    .find(|(name, _)| name == field)
                    .map_or(&self.span, |(_, s)| s);
                self.ctx.err(
                    error.kind(),
                    span,
                    format!("field `{field}` of {}: {error}", self.who()),
                )
            }
            None => self
                .ctx
                .err(error.kind(), &self.span, format!("{}: {error}", self.who())),
        }
    }
}

/// A message on one line (a reader may break a long one).
fn excerpt_lines(message: &str) -> String {
    message
        .lines()
        .map(str::trim)
        .filter(|l| !l.is_empty())
        .collect::<Vec<_>>()
        .join("; ")
}

impl System {
    /// Reads a system file.
    pub fn read(path: &Path) -> Result<Self> {
        let text = crate::input::read_text(path, "system file", crate::input::MAX_SYSTEM_BYTES)?;
        let dir = path.parent().map(Path::to_path_buf).unwrap_or_default();
        System::parse(&text, &path.display().to_string(), &dir)
    }

    /// Reads a system from TOML text; `file` names it in messages and `dir`
    /// resolves relative level-file paths.
    pub fn parse(text: &str, file: &str, dir: &Path) -> Result<Self> {
        let raw: RawSystem =
            toml::from_str(text).map_err(|e| crate::input::toml_error(file, text, &e))?;
        let ctx = Ctx { file, text };
        if raw.part.is_empty() {
            return Err(Error::new(
                ErrorKind::Parse,
                format!("{file}: no parts: add at least one [[part]] table with a `kind`"),
            ));
        }
        let mut parts = Vec::new();
        let mut specs = Vec::new();
        for (index, sp) in raw.part.into_iter().enumerate() {
            let span = sp.span();
            let mut fields: Vec<(String, Spanned<toml::Value>)> =
                sp.into_inner().into_iter().collect();
            fields.sort_by_key(|(_, v)| v.span().start);
            let (kind, kind_span, name) = part_kind_and_name(&ctx, index, &span, &mut fields)?;
            let reader = PartReader {
                ctx: &ctx,
                index,
                kind,
                span,
                kind_span,
            };
            let spans: Vec<(String, Range<usize>)> =
                fields.iter().map(|(k, v)| (k.clone(), v.span())).collect();
            let fields = PartFields {
                fields: fields.into_iter(),
                value: None,
            };
            let spec =
                ModelSpec::from_kind(&reader.kind, fields).map_err(|e| reader.field_error(e))?;
            let spectrum = spec
                .build_in(dir)
                .map_err(|e| reader.build_error(e, &spans))?;
            let unit = spectrum.unit();
            if unit.joules().is_none() {
                return Err(ctx.err(
                    ErrorKind::Unit,
                    &reader.span,
                    format!(
                        "{}: its energies are in {unit}, whose size in joules is unknown, but \
                         the parts of a system need energies of known size to combine exactly \
                         (a box needs its `mass` and `side`)",
                        reader.who()
                    ),
                ));
            }
            parts.push(Part {
                name: name.unwrap_or_else(|| reader.kind.clone()),
                spectrum,
            });
            specs.push(spec);
        }
        let unit = raw
            .unit
            .as_ref()
            .map(|u| {
                EnergyUnit::parse(u.get_ref())
                    .map_err(|e| ctx.err(ErrorKind::Parse, &u.span(), format!("field `unit`: {e}")))
            })
            .transpose()?;
        let product =
            Product::new(parts, unit).map_err(|e| Error::new(e.kind(), format!("{file}: {e}")))?;
        Ok(System {
            name: raw.name,
            product,
            specs,
        })
    }
}

/// Takes a part's `kind` (required, with its place) and `name` (optional)
/// out of its fields.
fn part_kind_and_name(
    ctx: &Ctx<'_>,
    index: usize,
    span: &Range<usize>,
    fields: &mut Vec<(String, Spanned<toml::Value>)>,
) -> Result<(String, Range<usize>, Option<String>)> {
    let mut take = |key: &str| {
        fields
            .iter()
            .position(|(k, _)| k == key)
            .map(|i| fields.remove(i).1)
    };
    let string = |key: &str, v: Spanned<toml::Value>| match v.get_ref() {
        toml::Value::String(s) => Ok(s.clone()),
        other => Err(ctx.err(
            ErrorKind::Parse,
            &v.span(),
            format!(
                "field `{key}` of part {}: expected a string, got {}",
                index + 1,
                excerpt(&other.to_string())
            ),
        )),
    };
    let kind = take("kind").ok_or_else(|| {
        ctx.err(
            ErrorKind::Parse,
            span,
            format!(
                "part {} needs the field `kind`: one of {}",
                index + 1,
                ModelSpec::KINDS.join(", ")
            ),
        )
    })?;
    let kind_span = kind.span();
    let kind = string("kind", kind)?;
    let name = take("name").map(|v| string("name", v)).transpose()?;
    Ok((kind, kind_span, name))
}
