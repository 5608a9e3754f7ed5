//! Thermodynamic functions over temperature grids, per particle and in
//! physical units, from the certified sums of [`crate::sum`].
//!
//! Physical values are the dimensionless ones times exact constants:
//! U = (U/kT)·kT, Cv = (Cv/k)·k, S = (S/k)·k, F = (F/kT)·kT, with k and
//! R = k N_A exact (SI 2019). Every value is printed to the requested digits
//! and flagged unless both ends of its error interval round alike.

use crate::budget::Meter;
use crate::error::{Error, Result};
use crate::exact::{exact_decimal, parse_rational};
use crate::export::{units_block, Column, Tabular};
use crate::report::ThermoPoint;
use crate::spectrum::Spectrum;
use crate::sum::{thermo_metered, Certified, Path, Temperature};
use crate::units::constants;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};
use serde::Serialize;

/// The most temperatures one grid may hold.
pub const MAX_GRID: usize = 100_000;

/// Reads a temperature grid: `298.15`, `10:300:5` (start:stop:step,
/// exact decimals, stop included when on the grid), `log:1:1000:50`
/// (COUNT points spaced evenly in ln T, each rounded to 12 significant
/// digits so that it is an exact decimal), or a comma list of any of these
/// (`20.28,77,300` or `1:5:1,77`), kept in the order given.
///
/// ```
/// use zsum::thermo::parse_grid;
/// assert_eq!(parse_grid("--T", "10:30:10").unwrap().len(), 3);
/// assert_eq!(parse_grid("--T", "log:1:1000:4").unwrap()[1].to_string(), "10");
/// assert!(parse_grid("--T", "10:30:0").is_err());
/// let list = parse_grid("--T", "20.28,77,300").unwrap();
/// assert_eq!(list.len(), 3);
/// assert_eq!(list[0].to_string(), "507/25");
/// assert!(parse_grid("--T", "20,,30").is_err());
/// ```
pub fn parse_grid(flag: &str, text: &str) -> Result<Vec<BigRational>> {
    if text.contains(',') {
        let mut all = Vec::new();
        for part in text.split(',') {
            if part.trim().is_empty() {
                return Err(Error::parse(
                    flag,
                    text,
                    "a comma list of temperatures or grids with nothing empty between the \
                     commas (20.28,77,300)",
                ));
            }
            all.extend(parse_grid(flag, part.trim())?);
            if all.len() > MAX_GRID {
                return Err(Error::invalid(
                    flag,
                    text,
                    &format!("a grid may hold at most {MAX_GRID} temperatures"),
                ));
            }
        }
        return Ok(all);
    }
    let num = |s: &str| {
        parse_rational(s).map_err(|_| {
            Error::parse(
                flag,
                text,
                "a temperature (298.15), a grid START:STOP:STEP (10:300:5) or log:START:STOP:COUNT",
            )
        })
    };
    let positive = |t: &BigRational| -> Result<()> {
        if t.is_positive() {
            Ok(())
        } else {
            Err(Error::invalid(
                flag,
                text,
                "temperatures must be greater than zero",
            ))
        }
    };
    let parts: Vec<&str> = text.split(':').collect();
    let out = match parts.as_slice() {
        [one] => {
            let t = num(one)?;
            positive(&t)?;
            vec![t]
        }
        ["log", a, b, n] => {
            let (a, b) = (num(a)?, num(b)?);
            positive(&a)?;
            positive(&b)?;
            let n: usize = n
                .trim()
                .parse()
                .ok()
                .filter(|&n| (2..=MAX_GRID).contains(&n))
                .ok_or_else(|| {
                    Error::invalid(
                        flag,
                        text,
                        &format!("a log grid needs a COUNT from 2 to {MAX_GRID}"),
                    )
                })?;
            if a >= b {
                return Err(Error::invalid(flag, text, "a log grid needs START < STOP"));
            }
            let (la, lb) = (
                a.to_f64().unwrap_or(0.0).ln(),
                b.to_f64().unwrap_or(0.0).ln(),
            );
            (0..n)
                .map(|i| {
                    if i == 0 {
                        return Ok(a.clone());
                    }
                    if i == n - 1 {
                        return Ok(b.clone());
                    }
                    let t = (la + (lb - la) * i as f64 / (n - 1) as f64).exp();
                    num(&format!("{t:.11e}"))
                })
                .collect::<Result<Vec<_>>>()?
        }
        [a, b, step] => {
            let (a, b, st) = (num(a)?, num(b)?, num(step)?);
            positive(&a)?;
            positive(&b)?;
            if st.is_zero() || (b > a && st.is_negative()) || (b < a && st.is_positive()) {
                return Err(Error::invalid(
                    flag,
                    text,
                    "the step must be non-zero and point from START towards STOP",
                ));
            }
            let count = ((&b - &a) / &st)
                .floor()
                .to_integer()
                .to_usize()
                .unwrap_or(usize::MAX);
            if count >= MAX_GRID {
                return Err(Error::invalid(
                    flag,
                    text,
                    &format!("a grid may hold at most {MAX_GRID} temperatures; use a larger step"),
                ));
            }
            (0..=count)
                .map(|i| &a + &st * BigRational::from_integer(BigInt::from(i)))
                .collect()
        }
        _ => {
            return Err(Error::parse(
                flag,
                text,
                "a temperature (298.15), a grid START:STOP:STEP (10:300:5) or log:START:STOP:COUNT",
            ))
        }
    };
    Ok(out)
}

/// Physical units for thermodynamic functions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Per {
    /// Per mole (J/mol, J/(mol K)).
    Mole,
    /// Per particle (J, J/K).
    Particle,
}

/// One row of a thermodynamic table.
#[derive(Debug, Clone, Serialize)]
pub struct ThermoRow {
    /// Dimensionless values at this temperature.
    #[serde(flatten)]
    pub point: ThermoPoint,
    /// U in J/mol or J, when asked for.
    #[serde(rename = "U", skip_serializing_if = "Option::is_none")]
    pub u: Option<String>,
    /// Cv in J/(mol K) or J/K.
    #[serde(rename = "Cv", skip_serializing_if = "Option::is_none")]
    pub cv: Option<String>,
    /// S in J/(mol K) or J/K.
    #[serde(rename = "S", skip_serializing_if = "Option::is_none")]
    pub s: Option<String>,
    /// F in J/mol or J.
    #[serde(rename = "F", skip_serializing_if = "Option::is_none")]
    pub f: Option<String>,
}

/// The answer to `sum` or `thermo`: one row per temperature.
#[derive(Debug, Clone, Serialize)]
pub struct ThermoReport {
    /// Model identifier.
    pub model: String,
    /// Human description.
    pub description: String,
    /// What the temperatures are: `K` or `kT in <unit>`.
    pub temperature_unit: String,
    /// The unit of every field that has one (T, and U, Cv, S, F when
    /// given), from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
    /// The physical units asked for, if any.
    #[serde(skip)]
    pub per: Option<Per>,
    /// The spectrum's energy unit (of kT when the grid is kT).
    #[serde(skip)]
    pub energy_unit: String,
    /// Whether the table carries U, Cv, S and F (thermo) or only q (sum).
    #[serde(skip)]
    pub functions: bool,
    /// The rows.
    pub rows: Vec<ThermoRow>,
}

impl ThermoReport {
    /// Evaluates `spectrum` at every temperature of `grid` (kelvin when
    /// `kelvin`, else kT in the spectrum's unit), to `digits` certified
    /// digits; `per` adds physical values (kelvin only). `meter` times the
    /// grid (hottest, costliest, first; parts of a product count as
    /// fractions of a step), tells its observer how far it is, and refuses
    /// the rest once the projected time exceeds its budget. `max_bits` is
    /// the effort limit of [`crate::sum::thermo_limited`].
    #[allow(clippy::too_many_arguments)]
    pub fn build(
        model: &str,
        spectrum: &dyn Spectrum,
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        max_bits: u32,
        per: Option<Per>,
        functions: bool,
        meter: &Meter,
    ) -> Result<Self> {
        if per.is_some() && !kelvin {
            return Err(Error::invalid(
                "physical units",
                "with kT temperatures",
                "physical units need temperatures in kelvin (--T)",
            ));
        }
        const EXTRA: u32 = 4;
        let max = crate::sum::MAX_DIGITS - EXTRA;
        if !(1..=max).contains(&digits) {
            return Err(Error::invalid(
                "digits",
                digits,
                &format!("choose between 1 and {max} significant digits"),
            ));
        }
        let k = constants::boltzmann();
        let scale = match per {
            Some(Per::Mole) => Some(&k * constants::avogadro()),
            Some(Per::Particle) => Some(k.clone()),
            None => None,
        };
        let mut rows = Vec::with_capacity(grid.len());
        // Reuse level listings across the grid: sweep from the hottest
        // temperature down, so the first listing covers every later one.
        let cached = crate::sum::Cached::new(spectrum);
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|&a, &b| grid[b].cmp(&grid[a]));
        let mut done = vec![None; grid.len()];
        for (count, &i) in order.iter().enumerate() {
            let t = &grid[i];
            let temp = if kelvin {
                Temperature::Kelvin(t.clone())
            } else {
                Temperature::ThermalEnergy(t.clone())
            };
            // The physical values are the engine's balls times exact
            // constants; where one straddles a rounding boundary, the point
            // is recomputed with more digits (tighter balls).
            let mut extra = 0;
            let (mut point, u, cv, s, f) = loop {
                let wide = thermo_metered(
                    &cached,
                    &temp,
                    digits + extra,
                    Path::Auto,
                    max_bits,
                    Some((meter, count as f64)),
                )?;
                let mut point = ThermoPoint::new(&wide, "", digits);
                let mut ok = point.certified;
                let mut re = |b: &Certified, f: &BigRational| {
                    let (v, good) = b.scale(f).decimal_marked(digits);
                    ok &= good;
                    Some(v)
                };
                let w = &wide;
                let (u, cv, s, f) = match &scale {
                    Some(c) => {
                        let ct = c * t;
                        (
                            re(&w.u_over_kt, &ct),
                            re(&w.cv_over_k, c),
                            re(&w.s_over_k, c),
                            re(&w.f_over_kt, &ct),
                        )
                    }
                    None => (None, None, None, None),
                };
                point.certified = ok;
                let room = crate::sum::precision_for(digits + extra + EXTRA) <= max_bits;
                if ok || !room || extra >= 2 * EXTRA || wide.precision_bits >= max_bits {
                    break (point, u, cv, s, f);
                }
                extra += EXTRA;
            };
            point.t = exact_decimal(t, 40);
            done[i] = Some(ThermoRow { point, u, cv, s, f });
            meter.at(count as f64 + 1.0)?;
        }
        rows.extend(done.into_iter().flatten());
        let energy_unit = spectrum.unit().symbol().to_string();
        let units = units_block(&Self::columns_for(kelvin, &energy_unit, functions, per));
        Ok(ThermoReport {
            model: model.into(),
            description: spectrum.describe(),
            temperature_unit: if kelvin {
                "K".into()
            } else {
                format!("kT in {}", spectrum.unit())
            },
            units,
            per,
            energy_unit,
            functions,
            rows,
        })
    }

    /// The columns of a `sum` (q only) or `thermo` table: T in K or kT in
    /// the spectrum's unit, the dimensionless functions, and U, Cv, S, F in
    /// the physical units asked for.
    fn columns_for(
        kelvin: bool,
        energy_unit: &str,
        functions: bool,
        per: Option<Per>,
    ) -> Vec<Column> {
        let mut c = vec![if kelvin {
            Column::with_unit("T", "K").key("T")
        } else {
            Column::with_unit("kT", energy_unit).key("T")
        }];
        c.extend(["q", "ln q", "rel bound"].map(Column::plain));
        if functions {
            c.extend(["U/kT", "Cv/k", "S/k", "F/kT"].map(Column::plain));
            if let Some(p) = per {
                let (e, k) = match p {
                    Per::Mole => ("J/mol", "J/(mol K)"),
                    Per::Particle => ("J", "J/K"),
                };
                c.push(Column::with_unit("U", e).key("U"));
                c.push(Column::with_unit("Cv", k).key("Cv"));
                c.push(Column::with_unit("S", k).key("S"));
                c.push(Column::with_unit("F", e).key("F"));
            }
        }
        c
    }
}

impl Tabular for ThermoReport {
    fn preamble(&self) -> Vec<String> {
        let mut p = vec![format!(
            "{}; T in {}; per particle; every digit certified unless marked *",
            self.description, self.temperature_unit
        )];
        if let Some(worst) = self
            .rows
            .iter()
            .filter(|r| !r.point.certified)
            .min_by_key(|r| r.point.certified_digits)
        {
            p.push(format!(
                "* {}",
                crate::sum::shortfall_text(worst.point.certified_digits, worst.point.max_bits)
            ));
        }
        if self.per.is_some() {
            p.push(
                "ideal model values; design decisions follow certified property data, local \
                 codes and licensed engineering practice"
                    .into(),
            );
        }
        p
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(
            self.temperature_unit == "K",
            &self.energy_unit,
            self.functions,
            self.per,
        )
    }

    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                let mark = |s: &str| {
                    if r.point.certified {
                        s.to_string()
                    } else {
                        format!("{s}*")
                    }
                };
                let p = &r.point;
                let mut v = vec![p.t.clone(), mark(&p.q), mark(&p.ln_q), p.rel_bound.clone()];
                if self.functions {
                    v.extend(
                        [&p.u_over_kt, &p.cv_over_k, &p.s_over_k, &p.f_over_kt].map(|s| mark(s)),
                    );
                    if self.per.is_some() {
                        for x in [&r.u, &r.cv, &r.s, &r.f] {
                            v.push(mark(x.as_deref().unwrap_or("")));
                        }
                    }
                }
                v
            })
            .collect()
    }
}
