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
//! | `box` | `mass` (e.g. `"4.0026 u"`), `side` (e.g. `"10 nm"`), optional `sides` (`"1,1,2"`) or `dims` |
//!
//! Every error names the file, the line, the part and the field.

use crate::error::{Error, ErrorKind, Result};
use crate::exact::parse_rational;
use crate::models::diatomic::{ParityWeights, RovibDiatomic};
use crate::models::level_file::LevelFile;
use crate::models::oscillator::{AnharmonicOscillator, HarmonicModes};
use crate::models::product::{Part, Product};
use crate::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
use crate::models::zeeman::ZeemanMultiplet;
use crate::models::ParticleInBox;
use crate::spectrum::Spectrum;
pub use crate::units::parse_energy;
use crate::units::{parse_length_m, parse_mass_kg, EnergyUnit};
use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::Zero;
use serde::Deserialize;
use std::path::{Path, PathBuf};
use toml::Spanned;

type Field = Option<Spanned<toml::Value>>;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSystem {
    name: Option<String>,
    unit: Option<Spanned<String>>,
    #[serde(default)]
    part: Vec<Spanned<RawPart>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
#[allow(non_snake_case)]
struct RawPart {
    kind: Spanned<String>,
    name: Option<Spanned<String>>,
    B: Field,
    D: Field,
    H: Field,
    A: Field,
    C: Field,
    DJ: Field,
    DJK: Field,
    DK: Field,
    spin: Field,
    swap_parity: Field,
    weights: Field,
    only: Field,
    freq: Field,
    zero_point: Field,
    we: Field,
    wexe: Field,
    weye: Field,
    dissociation: Field,
    Be: Field,
    alpha: Field,
    De: Field,
    levels: Field,
    file: Field,
    J: Field,
    g: Field,
    field: Field,
    mass: Field,
    side: Field,
    sides: Field,
    dims: Field,
}

/// A system read from a file: its name, its common unit, and the product of
/// its parts.
#[derive(Debug)]
pub struct System {
    /// The system's name, if the file gives one.
    pub name: Option<String>,
    /// The product of the parts.
    pub product: Product,
}

/// Reading context: the file name and its text, to turn byte spans into
/// line numbers.
struct Ctx<'a> {
    file: &'a str,
    text: &'a str,
    dir: PathBuf,
}

impl Ctx<'_> {
    fn line(&self, span: std::ops::Range<usize>) -> usize {
        self.text[..span.start.min(self.text.len())]
            .matches('\n')
            .count()
            + 1
    }

    fn err(&self, span: std::ops::Range<usize>, msg: impl std::fmt::Display) -> Error {
        Error::new(
            ErrorKind::Parse,
            format!("{}, line {}: {msg}", self.file, self.line(span)),
        )
    }
}

/// One part being read: its index, kind and fields.
struct PartReader<'a> {
    ctx: &'a Ctx<'a>,
    index: usize,
    kind: String,
    span: std::ops::Range<usize>,
    raw: &'a RawPart,
}

impl PartReader<'_> {
    fn who(&self) -> String {
        format!("part {} ({})", self.index + 1, self.kind)
    }

    fn field<'b>(&self, name: &str, f: &'b Field) -> Option<&'b Spanned<toml::Value>> {
        let _ = name;
        f.as_ref()
    }

    fn required<'b>(&self, name: &str, f: &'b Field) -> Result<&'b Spanned<toml::Value>> {
        f.as_ref().ok_or_else(|| {
            self.ctx.err(
                self.span.clone(),
                format!("{} needs the field `{name}`", self.who()),
            )
        })
    }

    fn string(&self, name: &str, v: &Spanned<toml::Value>) -> Result<String> {
        match v.get_ref() {
            toml::Value::String(s) => Ok(s.clone()),
            toml::Value::Integer(i) => Ok(i.to_string()),
            toml::Value::Float(x) => Err(self.ctx.err(
                v.span(),
                format!(
                    "field `{name}` of {}: write the number {x} as a string (\"{x} <unit>\") so it \
                     is read exactly",
                    self.who()
                ),
            )),
            other => Err(self.ctx.err(
                v.span(),
                format!(
                    "field `{name}` of {}: expected a string, got {other}",
                    self.who()
                ),
            )),
        }
    }

    fn boolean(&self, name: &str, f: &Field) -> Result<bool> {
        match f {
            None => Ok(false),
            Some(v) => match v.get_ref() {
                toml::Value::Boolean(b) => Ok(*b),
                other => Err(self.ctx.err(
                    v.span(),
                    format!(
                        "field `{name}` of {}: expected true or false, got {other}",
                        self.who()
                    ),
                )),
            },
        }
    }

    /// An energy constant `"<number> <unit>"`, converted to `unit` (or
    /// setting it, if this is the part's first constant).
    fn energy(
        &self,
        name: &str,
        v: &Spanned<toml::Value>,
        unit: &mut Option<EnergyUnit>,
    ) -> Result<BigRational> {
        let text = self.string(name, v)?;
        let (value, u) = parse_energy(&text).map_err(|e| {
            self.ctx
                .err(v.span(), format!("field `{name}` of {}: {e}", self.who()))
        })?;
        match unit {
            None => {
                *unit = Some(u);
                Ok(value)
            }
            Some(target) => u.convert(&value, target).map_err(|e| {
                self.ctx
                    .err(v.span(), format!("field `{name}` of {}: {e}", self.who()))
            }),
        }
    }

    fn opt_energy(
        &self,
        name: &str,
        f: &Field,
        unit: &mut Option<EnergyUnit>,
    ) -> Result<BigRational> {
        match self.field(name, f) {
            Some(v) => self.energy(name, v, unit),
            None => Ok(BigRational::zero()),
        }
    }

    fn with_place<T>(&self, span: std::ops::Range<usize>, r: Result<T>) -> Result<T> {
        r.map_err(|e| {
            Error::new(
                e.kind(),
                format!(
                    "{}, line {}: {}: {e}",
                    self.ctx.file,
                    self.ctx.line(span),
                    self.who()
                ),
            )
        })
    }

    /// Fields that do not belong to this kind are refused by name.
    fn only_fields(&self, allowed: &[&str]) -> Result<()> {
        let r = self.raw;
        let all: [(&str, &Field); 30] = [
            ("B", &r.B),
            ("D", &r.D),
            ("H", &r.H),
            ("A", &r.A),
            ("C", &r.C),
            ("DJ", &r.DJ),
            ("DJK", &r.DJK),
            ("DK", &r.DK),
            ("spin", &r.spin),
            ("swap_parity", &r.swap_parity),
            ("weights", &r.weights),
            ("only", &r.only),
            ("freq", &r.freq),
            ("zero_point", &r.zero_point),
            ("we", &r.we),
            ("wexe", &r.wexe),
            ("weye", &r.weye),
            ("dissociation", &r.dissociation),
            ("Be", &r.Be),
            ("alpha", &r.alpha),
            ("De", &r.De),
            ("levels", &r.levels),
            ("file", &r.file),
            ("J", &r.J),
            ("g", &r.g),
            ("field", &r.field),
            ("mass", &r.mass),
            ("side", &r.side),
            ("sides", &r.sides),
            ("dims", &r.dims),
        ];
        for (name, f) in all {
            if let Some(v) = f {
                if !allowed.contains(&name) {
                    return Err(self.ctx.err(
                        v.span(),
                        format!(
                            "field `{name}` does not belong to {}; its fields are: {}",
                            self.who(),
                            allowed.join(", ")
                        ),
                    ));
                }
            }
        }
        Ok(())
    }

    fn weights(&self) -> Result<Option<ParityWeights>> {
        let r = self.raw;
        let swap = self.boolean("swap_parity", &r.swap_parity)?;
        match (&r.spin, &r.weights) {
            (Some(a), Some(_)) => Err(self.ctx.err(
                a.span(),
                format!("{}: give `spin` or `weights`, not both", self.who()),
            )),
            (Some(v), None) => {
                let text = self.string("spin", v)?;
                let twice = parse_twice_spin(&text).map_err(|e| {
                    self.ctx
                        .err(v.span(), format!("field `spin` of {}: {e}", self.who()))
                })?;
                Ok(Some(ParityWeights::from_nuclear_spin(twice, swap)))
            }
            (None, Some(v)) => {
                let text = self.string("weights", v)?;
                let w = parse_weights(&text).map_err(|e| {
                    self.ctx
                        .err(v.span(), format!("field `weights` of {}: {e}", self.who()))
                })?;
                Ok(Some(w))
            }
            (None, None) => {
                if let Some(v) = &r.swap_parity {
                    return Err(self.ctx.err(
                        v.span(),
                        format!("field `swap_parity` of {} needs `spin`", self.who()),
                    ));
                }
                Ok(None)
            }
        }
    }

    fn only(&self) -> Result<Option<String>> {
        match &self.raw.only {
            None => Ok(None),
            Some(v) => {
                let s = self.string("only", v)?;
                if ["even", "odd", "ortho", "para"].contains(&s.as_str()) {
                    Ok(Some(s))
                } else {
                    Err(self.ctx.err(
                        v.span(),
                        format!(
                            "field `only` of {}: {s:?} is not one of even, odd, ortho, para",
                            self.who()
                        ),
                    ))
                }
            }
        }
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

/// Reads harmonic modes `"1500 cm-1 x2"`; returns frequency, degeneracy.
fn parse_mode(text: &str) -> Result<(BigRational, EnergyUnit, u32)> {
    let (body, deg) = match text.rsplit_once('x') {
        Some((b, d)) if d.trim().chars().all(|c| c.is_ascii_digit()) && !d.trim().is_empty() => {
            let d: u32 = d.trim().parse().map_err(|_| {
                Error::parse("mode degeneracy", d, "a positive integer after x, e.g. x2")
            })?;
            (b, d)
        }
        _ => (text, 1),
    };
    let (v, u) = parse_energy(body)?;
    Ok((v, u, deg))
}

/// Applies an `only` selection to a rotor-like model's weights.
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
        let ctx = Ctx {
            file,
            text,
            dir: dir.to_path_buf(),
        };
        if raw.part.is_empty() {
            return Err(Error::new(
                ErrorKind::Parse,
                format!("{file}: no parts: add at least one [[part]] table with a `kind`"),
            ));
        }
        let mut parts = Vec::new();
        for (index, sp) in raw.part.iter().enumerate() {
            let reader = PartReader {
                ctx: &ctx,
                index,
                kind: sp.get_ref().kind.get_ref().clone(),
                span: sp.span(),
                raw: sp.get_ref(),
            };
            let spectrum = build_part(&reader)?;
            let name = sp
                .get_ref()
                .name
                .as_ref()
                .map(|n| n.get_ref().clone())
                .unwrap_or_else(|| reader.kind.clone());
            parts.push(Part { name, spectrum });
        }
        let unit = raw
            .unit
            .as_ref()
            .map(|u| {
                EnergyUnit::parse(u.get_ref())
                    .map_err(|e| ctx.err(u.span(), format!("field `unit`: {e}")))
            })
            .transpose()?;
        let product =
            Product::new(parts, unit).map_err(|e| Error::new(e.kind(), format!("{file}: {e}")))?;
        Ok(System {
            name: raw.name,
            product,
        })
    }
}

type Boxed = Box<dyn Spectrum + Send + Sync>;

fn build_part(p: &PartReader<'_>) -> Result<Boxed> {
    let r = p.raw;
    let mut unit: Option<EnergyUnit> = None;
    let span = p.span.clone();
    match p.kind.as_str() {
        "rotor" => {
            p.only_fields(&["B", "D", "H", "spin", "swap_parity", "weights", "only"])?;
            let b = p.energy("B", p.required("B", &r.B)?, &mut unit)?;
            let d = p.opt_energy("D", &r.D, &mut unit)?;
            let h = p.opt_energy("H", &r.H, &mut unit)?;
            let mut rotor = p.with_place(
                span.clone(),
                LinearRotor::new(b, d, h, unit.clone().unwrap_or(EnergyUnit::Wavenumber)),
            )?;
            let w = p.weights()?.unwrap_or_else(ParityWeights::uniform);
            let w = p.with_place(span, restrict_weights(w, p.only()?.as_deref()))?;
            rotor = rotor.with_weights(w);
            Ok(Box::new(rotor))
        }
        "top" => {
            p.only_fields(&["B", "A", "C", "DJ", "DJK", "DK"])?;
            let b = p.energy("B", p.required("B", &r.B)?, &mut unit)?;
            let (shape, unique) = match (&r.A, &r.C) {
                (Some(a), None) => (TopShape::Prolate, p.energy("A", a, &mut unit)?),
                (None, Some(c)) => (TopShape::Oblate, p.energy("C", c, &mut unit)?),
                _ => {
                    return Err(p.ctx.err(
                        span,
                        format!(
                            "{} needs exactly one of `A` (prolate) or `C` (oblate)",
                            p.who()
                        ),
                    ))
                }
            };
            let dj = p.opt_energy("DJ", &r.DJ, &mut unit)?;
            let djk = p.opt_energy("DJK", &r.DJK, &mut unit)?;
            let dk = p.opt_energy("DK", &r.DK, &mut unit)?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            Ok(Box::new(p.with_place(
                span,
                SymmetricTop::new(shape, unique, b, dj, djk, dk, u),
            )?))
        }
        "spherical_top" => {
            p.only_fields(&["B", "D"])?;
            let b = p.energy("B", p.required("B", &r.B)?, &mut unit)?;
            let d = p.opt_energy("D", &r.D, &mut unit)?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            Ok(Box::new(p.with_place(span, SphericalTop::new(b, d, u))?))
        }
        "oscillator" => {
            p.only_fields(&["freq", "zero_point"])?;
            let f = p.required("freq", &r.freq)?;
            let items: Vec<toml::Value> = match f.get_ref() {
                toml::Value::Array(a) => a.clone(),
                other => vec![other.clone()],
            };
            let mut modes = Vec::new();
            for item in items {
                let text = match item {
                    toml::Value::String(s) => s,
                    other => {
                        return Err(p.ctx.err(
                            f.span(),
                            format!("field `freq` of {}: expected strings such as \"1500 cm-1 x2\", got {other}", p.who()),
                        ))
                    }
                };
                let (v, u, deg) = parse_mode(&text).map_err(|e| {
                    p.ctx
                        .err(f.span(), format!("field `freq` of {}: {e}", p.who()))
                })?;
                let v = match &unit {
                    None => {
                        unit = Some(u);
                        v
                    }
                    Some(t) => u.convert(&v, t)?,
                };
                modes.push((v, deg));
            }
            let zp = p.boolean("zero_point", &r.zero_point)?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            Ok(Box::new(
                p.with_place(span, HarmonicModes::new(modes, zp, u))?,
            ))
        }
        "anharmonic" => {
            p.only_fields(&["we", "wexe", "weye"])?;
            let we = p.energy("we", p.required("we", &r.we)?, &mut unit)?;
            let wexe = p.energy("wexe", p.required("wexe", &r.wexe)?, &mut unit)?;
            let weye = p.opt_energy("weye", &r.weye, &mut unit)?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            Ok(Box::new(p.with_place(
                span,
                AnharmonicOscillator::new(we, wexe, weye, u),
            )?))
        }
        "morse" => {
            p.only_fields(&["we", "dissociation"])?;
            let we = p.energy("we", p.required("we", &r.we)?, &mut unit)?;
            let de = p.energy(
                "dissociation",
                p.required("dissociation", &r.dissociation)?,
                &mut unit,
            )?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            Ok(Box::new(p.with_place(
                span,
                AnharmonicOscillator::morse(we, de, u),
            )?))
        }
        "diatomic" => {
            p.only_fields(&[
                "we",
                "wexe",
                "weye",
                "Be",
                "alpha",
                "De",
                "spin",
                "swap_parity",
                "weights",
                "only",
            ])?;
            let we = p.energy("we", p.required("we", &r.we)?, &mut unit)?;
            let wexe = p.energy("wexe", p.required("wexe", &r.wexe)?, &mut unit)?;
            let weye = p.opt_energy("weye", &r.weye, &mut unit)?;
            let be = p.energy("Be", p.required("Be", &r.Be)?, &mut unit)?;
            let alpha = p.opt_energy("alpha", &r.alpha, &mut unit)?;
            let de = p.opt_energy("De", &r.De, &mut unit)?;
            let u = unit.unwrap_or(EnergyUnit::Wavenumber);
            let w = p.weights()?.unwrap_or_else(ParityWeights::uniform);
            let w = p.with_place(span.clone(), restrict_weights(w, p.only()?.as_deref()))?;
            let vib = p.with_place(
                span.clone(),
                AnharmonicOscillator::new(we, wexe, weye, u.clone()),
            )?;
            Ok(Box::new(p.with_place(
                span,
                RovibDiatomic::new(vib, be, alpha, de, w),
            )?))
        }
        "levels" => {
            p.only_fields(&["levels", "file"])?;
            match (&r.levels, &r.file) {
                (Some(l), None) => {
                    let arr = match l.get_ref() {
                        toml::Value::Array(a) => a,
                        _ => {
                            return Err(p.ctx.err(
                                l.span(),
                                format!("field `levels` of {}: expected a list of {{ energy, degeneracy, label }} tables", p.who()),
                            ))
                        }
                    };
                    let mut entries = Vec::new();
                    for (i, item) in arr.iter().enumerate() {
                        let at = |m: String| {
                            p.ctx
                                .err(l.span(), format!("level {} of {}: {m}", i + 1, p.who()))
                        };
                        let t = item.as_table().ok_or_else(|| {
                            at("expected a table { energy = \"0 cm-1\", degeneracy = 1 }".into())
                        })?;
                        for key in t.keys() {
                            if !["energy", "degeneracy", "label"].contains(&key.as_str()) {
                                return Err(at(format!(
                                    "unknown field `{key}`; allowed: energy, degeneracy, label"
                                )));
                            }
                        }
                        let e = t.get("energy").and_then(|v| v.as_str()).ok_or_else(|| {
                            at("needs `energy` as a string such as \"881 cm-1\"".into())
                        })?;
                        let (v, u) = parse_energy(e).map_err(|e| at(e.to_string()))?;
                        let v = match &unit {
                            None => {
                                unit = Some(u);
                                v
                            }
                            Some(target) => u.convert(&v, target).map_err(|e| at(e.to_string()))?,
                        };
                        let g = match t.get("degeneracy") {
                            Some(toml::Value::Integer(g)) if *g > 0 => BigUint::from(*g as u64),
                            Some(toml::Value::String(s)) => s
                                .trim()
                                .parse::<BigUint>()
                                .ok()
                                .filter(|g| !g.is_zero())
                                .ok_or_else(|| {
                                    at(format!("degeneracy {s:?} must be a positive integer"))
                                })?,
                            Some(other) => {
                                return Err(at(format!(
                                    "degeneracy {other} must be a positive integer"
                                )))
                            }
                            None => return Err(at("needs `degeneracy`".into())),
                        };
                        let label = t.get("label").and_then(|v| v.as_str()).map(String::from);
                        entries.push((v, g, label));
                    }
                    let u = unit.unwrap_or(EnergyUnit::Wavenumber);
                    Ok(Box::new(p.with_place(
                        l.span(),
                        LevelFile::from_entries(u, entries),
                    )?))
                }
                (None, Some(f)) => {
                    let rel = p.string("file", f)?;
                    let path = p.ctx.dir.join(&rel);
                    Ok(Box::new(p.with_place(f.span(), LevelFile::read(&path))?))
                }
                _ => Err(p.ctx.err(
                    span,
                    format!("{} needs exactly one of `levels` or `file`", p.who()),
                )),
            }
        }
        "zeeman" => {
            p.only_fields(&["J", "g", "field"])?;
            let j = p.string("J", p.required("J", &r.J)?)?;
            let g = p.string("g", p.required("g", &r.g)?)?;
            let b = p.string("field", p.required("field", &r.field)?)?;
            Ok(Box::new(p.with_place(
                span,
                ZeemanMultiplet::from_text(&j, &g, &b),
            )?))
        }
        "box" => {
            p.only_fields(&["mass", "side", "sides", "dims"])?;
            let mass = p.string("mass", p.required("mass", &r.mass)?)?;
            let side = p.string("side", p.required("side", &r.side)?)?;
            let m = p.with_place(span.clone(), parse_mass_kg(&mass))?;
            let l = p.with_place(span.clone(), parse_length_m(&side))?;
            let b = match (&r.sides, &r.dims) {
                (Some(s), None) => {
                    let text = p.string("sides", s)?;
                    let ratios: Result<Vec<BigRational>> =
                        text.split([',', ':']).map(parse_rational).collect();
                    p.with_place(s.span(), ratios.and_then(ParticleInBox::new))?
                }
                (None, Some(d)) => match d.get_ref() {
                    toml::Value::Integer(n) if (1..=3).contains(n) => {
                        ParticleInBox::cube(*n as usize)?
                    }
                    other => {
                        return Err(p.ctx.err(
                            d.span(),
                            format!("field `dims` of {}: {other} is not 1, 2 or 3", p.who()),
                        ))
                    }
                },
                (None, None) => ParticleInBox::cube(3)?,
                (Some(s), Some(_)) => {
                    return Err(p.ctx.err(
                        s.span(),
                        format!("{}: give `sides` or `dims`, not both", p.who()),
                    ))
                }
            };
            Ok(Box::new(b.with_scale(&m, &l)))
        }
        other => Err(p.ctx.err(
            p.raw.kind.span(),
            format!(
                "part {}: unknown kind {other:?}; kinds are rotor, top, spherical_top, oscillator, \
                 anharmonic, morse, diatomic, levels, zeeman, box",
                p.index + 1
            ),
        )),
    }
}
