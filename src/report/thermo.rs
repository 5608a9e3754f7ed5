//! The answer to `sum` and `thermo`: one row per temperature, every value
//! written to the requested digits from the certified numbers of
//! [`crate::thermo::properties`].

use super::ThermoPoint;
use crate::budget::Meter;
use crate::error::Result;
use crate::exact::exact_decimal;
use crate::export::{units_block, Column, Tabular};
use crate::spectrum::Spectrum;
use crate::thermo::{properties, Per, Properties};
use num_rational::BigRational;
use serde::Serialize;

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

impl ThermoRow {
    /// The row of one state point, written to `digits` digits; the row is
    /// marked uncertified unless every value, the physical ones included,
    /// is proved.
    pub fn new(p: &Properties, digits: u32) -> ThermoRow {
        let mut point = ThermoPoint::new(&p.thermo, &exact_decimal(&p.t, 40), digits);
        point.certified = p.settles(digits);
        let text = |c: &crate::sum::Certified| Some(c.decimal_marked(digits).0);
        let (u, cv, s, f) = match &p.physical {
            Some(ph) => (text(&ph.u), text(&ph.cv), text(&ph.s), text(&ph.f)),
            None => (None, None, None, None),
        };
        ThermoRow { point, u, cv, s, f }
    }
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
    /// Evaluates `spectrum` over `grid` with [`properties`] (same
    /// arguments) and writes every value to `digits` digits; `functions`
    /// says whether the table shows U, Cv, S and F (`thermo`) or q only
    /// (`sum`).
    #[allow(clippy::too_many_arguments)]
    pub fn build(
        model: &str,
        spectrum: &(dyn Spectrum + Sync),
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        max_bits: u32,
        per: Option<Per>,
        functions: bool,
        meter: &Meter,
    ) -> Result<Self> {
        let points = properties(spectrum, grid, kelvin, digits, max_bits, per, meter)?;
        let rows = points.iter().map(|p| ThermoRow::new(p, digits)).collect();
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
