//! The answer to `compare`: the error map written to the requested digits
//! from the numbers of [`crate::classical::error_map`].

use super::text::{error_text, rational_text, theta_line, value_text};
use crate::budget::Meter;
use crate::classical::{error_map, Approximation, Classical, ErrorMap, Quantity, Values};
use crate::error::Result;
use crate::export::{units_block, Column, Tabular};
use num_rational::BigRational;
use serde::Serialize;

/// One approximation at one temperature.
#[derive(Debug, Clone, Serialize)]
pub struct ApproxRow {
    /// The approximation's name.
    pub name: String,
    /// Whether it is defined here (its q positive); if not, every value is
    /// null.
    pub defined: bool,
    /// q.
    pub q: Option<String>,
    /// U/kT.
    #[serde(rename = "U_over_kT")]
    pub u: Option<String>,
    /// Cv/k.
    #[serde(rename = "Cv_over_k")]
    pub cv: Option<String>,
    /// S/k.
    #[serde(rename = "S_over_k")]
    pub s: Option<String>,
    /// Relative errors (approximate/exact − 1) of q, U, Cv, S, each to 4
    /// digits or `<1e-37` below what the exact values resolve.
    pub rel_error: Option<RelErrors>,
}

/// Relative errors of the four quantities.
#[derive(Debug, Clone, Serialize)]
pub struct RelErrors {
    /// Of q.
    pub q: String,
    /// Of U.
    #[serde(rename = "U")]
    pub u: String,
    /// Of Cv.
    #[serde(rename = "Cv")]
    pub cv: String,
    /// Of S.
    #[serde(rename = "S")]
    pub s: String,
}

/// Exact values at one temperature.
#[derive(Debug, Clone, Serialize)]
pub struct ExactRow {
    /// q.
    pub q: String,
    /// U/kT.
    #[serde(rename = "U_over_kT")]
    pub u: String,
    /// Cv/k.
    #[serde(rename = "Cv_over_k")]
    pub cv: String,
    /// S/k.
    #[serde(rename = "S_over_k")]
    pub s: String,
}

/// One temperature of an error map.
#[derive(Debug, Clone, Serialize)]
pub struct CompareRow {
    /// T in kelvin, or kT in the model's unit for a reduced grid.
    #[serde(rename = "T")]
    pub t: String,
    /// T/θ.
    #[serde(rename = "T_over_theta")]
    pub t_over_theta: String,
    /// The exact values.
    pub exact: ExactRow,
    /// Each approximation.
    pub approximations: Vec<ApproxRow>,
}

/// An error map.
#[derive(Debug, Clone, Serialize)]
pub struct CompareReport {
    /// The model.
    pub model: String,
    /// Whether T is in kelvin (else kT in the model's unit).
    pub kelvin: bool,
    /// The model's unit.
    pub unit: String,
    /// θ in the model's unit.
    pub theta: String,
    /// θ in kelvin, when known.
    pub theta_kelvin: Option<String>,
    /// The approximations compared, with their formulas.
    pub approximation_list: Vec<Approximation>,
    /// Significant digits of the values.
    pub digits: u32,
    /// One row per temperature.
    pub rows: Vec<CompareRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
    /// The numbers the map was written from (for figures).
    #[serde(skip)]
    pub map: ErrorMap,
}

fn texts(v: &Values, digits: u32) -> [String; 4] {
    Quantity::ALL.map(|q| value_text(&v.get(q), digits))
}

impl CompareReport {
    /// The columns: the temperature (T in K, or kT in the model's unit),
    /// T/θ, the source, and each quantity with its relative error.
    fn columns_for(kelvin: bool, unit: &str) -> Vec<Column> {
        let t = if kelvin {
            Column::with_unit("T", "K")
        } else {
            Column::with_unit("kT", unit)
        };
        let mut c = vec![t.key("T"), Column::plain("T/θ"), Column::plain("source")];
        for q in Quantity::ALL {
            c.push(Column::plain(q.column()));
            c.push(Column::plain(&format!("err {}", q.name())));
        }
        c
    }

    /// Builds the error map of the approximations `indices` over `grid` (T
    /// in kelvin when `kelvin`, else kT in the model's unit) and writes its
    /// values to `digits` significant digits.
    pub fn build(
        c: &Classical,
        indices: &[usize],
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        meter: &Meter,
    ) -> Result<CompareReport> {
        if !(1..=30).contains(&digits) {
            return Err(crate::error::Error::invalid(
                "digits",
                digits,
                "choose between 1 and 30 significant digits for an error map",
            ));
        }
        let map = error_map(c, indices, grid, kelvin, meter)?;
        let rows = map
            .points
            .iter()
            .map(|p| {
                let [q, u, cv, s] = texts(&p.exact, digits);
                let approximations = p
                    .approximations
                    .iter()
                    .zip(&map.approximations)
                    .map(|(a, info)| match a {
                        None => ApproxRow {
                            name: info.name.clone(),
                            defined: false,
                            q: None,
                            u: None,
                            cv: None,
                            s: None,
                            rel_error: None,
                        },
                        Some(a) => {
                            let [tq, tu, tc, ts] = texts(&a.values, digits);
                            let [eq, eu, ec, es] = a.rel_error.each_ref().map(error_text);
                            ApproxRow {
                                name: info.name.clone(),
                                defined: true,
                                q: Some(tq),
                                u: Some(tu),
                                cv: Some(tc),
                                s: Some(ts),
                                rel_error: Some(RelErrors {
                                    q: eq,
                                    u: eu,
                                    cv: ec,
                                    s: es,
                                }),
                            }
                        }
                    })
                    .collect();
                CompareRow {
                    t: rational_text(&p.t, 15),
                    t_over_theta: rational_text(&p.reduced, digits.max(6)),
                    exact: ExactRow { q, u, cv, s },
                    approximations,
                }
            })
            .collect();
        let unit = c.spectrum().unit().to_string();
        Ok(CompareReport {
            units: units_block(&CompareReport::columns_for(kelvin, &unit)),
            model: c.spectrum().describe(),
            kelvin,
            unit,
            theta: rational_text(&c.theta(), 15),
            theta_kelvin: c.theta_kelvin().map(|k| rational_text(&k, 15)),
            approximation_list: map.approximations.clone(),
            digits,
            rows,
            map,
        })
    }

    /// `(T, value)` of `quantity` for the exact sum (`None`) or
    /// approximation number `k`; see [`ErrorMap::series`].
    pub fn series(&self, quantity: Quantity, k: Option<usize>) -> Vec<(f64, f64)> {
        self.map.series(quantity, k)
    }

    /// `(T, |relative error|)` of `quantity` for approximation number `k`.
    pub fn error_series(&self, quantity: Quantity, k: usize) -> Vec<(f64, f64)> {
        self.map.error_series(quantity, k)
    }

    /// T/θ of every row, in grid order.
    pub fn reduced(&self) -> Vec<f64> {
        self.map.reduced()
    }
}

impl Tabular for CompareReport {
    fn preamble(&self) -> Vec<String> {
        let mut p = vec![
            format!("model: {}", self.model),
            format!(
                "{}; T/θ measures temperature against it",
                theta_line(&self.theta, &self.unit, &self.theta_kelvin)
            ),
        ];
        for a in &self.approximation_list {
            p.push(format!("{}: {}", a.name, a.description));
        }
        p.push(
            "exact values certified to every digit shown; err = approximate/exact − 1, \
             written <1e-37 below what 40-digit exact values resolve, n/a where the \
             approximation's q is not positive"
                .to_string(),
        );
        p
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(self.kelvin, &self.unit)
    }

    fn rows(&self) -> Vec<Vec<String>> {
        let mut out = Vec::new();
        for r in &self.rows {
            let e = &r.exact;
            out.push(vec![
                r.t.clone(),
                r.t_over_theta.clone(),
                "exact".into(),
                e.q.clone(),
                String::new(),
                e.u.clone(),
                String::new(),
                e.cv.clone(),
                String::new(),
                e.s.clone(),
                String::new(),
            ]);
            for a in &r.approximations {
                let v = |x: &Option<String>| x.clone().unwrap_or_else(|| "n/a".into());
                let (eq, eu, ec, es) = match &a.rel_error {
                    Some(x) => (x.q.clone(), x.u.clone(), x.cv.clone(), x.s.clone()),
                    None => ("n/a".into(), "n/a".into(), "n/a".into(), "n/a".into()),
                };
                out.push(vec![
                    r.t.clone(),
                    r.t_over_theta.clone(),
                    a.name.clone(),
                    v(&a.q),
                    eq,
                    v(&a.u),
                    eu,
                    v(&a.cv),
                    ec,
                    v(&a.s),
                    es,
                ]);
            }
        }
        out
    }
}
