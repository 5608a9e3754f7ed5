//! Error maps: the exact values and every chosen approximation over a
//! temperature grid, with relative errors.

use super::{Classical, Quantity, Values, PREC};
use crate::error::Result;
use crate::export::{units_block, Column, Tabular};
use crate::report::text::{error_text, rational_text, value_text};
use crate::sum::{Cached, Temperature};
use num_rational::BigRational;
use rug::Float;
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
    #[serde(skip)]
    raw: Option<Values>,
    #[serde(skip)]
    raw_err: Option<[f64; 4]>,
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
    #[serde(skip)]
    raw: Values,
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
    #[serde(skip)]
    x: f64,
    #[serde(skip)]
    t_value: f64,
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
    pub approximation_list: Vec<super::Approximation>,
    /// Significant digits of the values.
    pub digits: u32,
    /// One row per temperature.
    pub rows: Vec<CompareRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

fn texts(v: &Values, digits: u32) -> [String; 4] {
    Quantity::ALL.map(|q| value_text(&v.get(q), digits))
}

/// Builds the error map of the approximations `indices` over `grid` (T in
/// kelvin when `kelvin`, else kT in the model's unit), values to `digits`.
pub fn compare(
    c: &Classical,
    indices: &[usize],
    grid: &[BigRational],
    kelvin: bool,
    digits: u32,
    meter: &crate::budget::Meter,
) -> Result<CompareReport> {
    if !(1..=30).contains(&digits) {
        return Err(crate::error::Error::invalid(
            "digits",
            digits,
            "choose between 1 and 30 significant digits for an error map",
        ));
    }
    let all = c.approximations();
    for &i in indices {
        if i >= all.len() {
            return Err(crate::error::Error::invalid(
                "approximation index",
                i,
                "an index the model offers",
            ));
        }
    }
    let cached = Cached::new(c.spectrum());
    let cc = Classical {
        spectrum: &cached,
        form: c.form().clone(),
    };
    // Hottest first, so one listing serves the whole grid.
    let mut order: Vec<usize> = (0..grid.len()).collect();
    order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
    let mut rows: Vec<Option<CompareRow>> = vec![None; grid.len()];
    for (done, &g) in order.iter().enumerate() {
        let temp = if kelvin {
            Temperature::Kelvin(grid[g].clone())
        } else {
            Temperature::ThermalEnergy(grid[g].clone())
        };
        let exact = cc.exact(&temp)?;
        let x = cc.reduced(&temp)?;
        let [q, u, cv, s] = texts(&exact, digits);
        let mut approximations = Vec::new();
        for &i in indices {
            let a = cc.approximate(i, &temp)?;
            approximations.push(match a {
                None => ApproxRow {
                    name: all[i].name.clone(),
                    defined: false,
                    q: None,
                    u: None,
                    cv: None,
                    s: None,
                    rel_error: None,
                    raw: None,
                    raw_err: None,
                },
                Some(v) => {
                    let errs: Vec<Float> = Quantity::ALL
                        .iter()
                        .map(|qq| v.rel_error(&exact, *qq))
                        .collect();
                    let [tq, tu, tc, ts] = texts(&v, digits);
                    ApproxRow {
                        name: all[i].name.clone(),
                        defined: true,
                        q: Some(tq),
                        u: Some(tu),
                        cv: Some(tc),
                        s: Some(ts),
                        rel_error: Some(RelErrors {
                            q: error_text(&errs[0]),
                            u: error_text(&errs[1]),
                            cv: error_text(&errs[2]),
                            s: error_text(&errs[3]),
                        }),
                        raw_err: Some([0, 1, 2, 3].map(|k| errs[k].to_f64())),
                        raw: Some(v),
                    }
                }
            });
        }
        rows[g] = Some(CompareRow {
            t: rational_text(&grid[g], 15),
            t_over_theta: rational_text(&x, digits.max(6)),
            exact: ExactRow {
                q,
                u,
                cv,
                s,
                raw: exact,
            },
            approximations,
            x: num_traits::ToPrimitive::to_f64(&x).unwrap_or(f64::NAN),
            t_value: num_traits::ToPrimitive::to_f64(&grid[g]).unwrap_or(f64::NAN),
        });
        meter.at(done as f64 + 1.0)?;
    }
    let unit = c.spectrum().unit().to_string();
    Ok(CompareReport {
        units: units_block(&CompareReport::columns_for(kelvin, &unit)),
        model: c.spectrum().describe(),
        kelvin,
        unit,
        theta: rational_text(&c.theta(), 15),
        theta_kelvin: c.theta_kelvin().map(|k| rational_text(&k, 15)),
        approximation_list: indices.iter().map(|&i| all[i].clone()).collect(),
        digits,
        rows: rows.into_iter().flatten().collect(),
    })
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

    /// `(T, value)` of `quantity` for the exact sum (`None`) or
    /// approximation number `k` of the map, in grid order; T in kelvin or
    /// kT as the grid was given. Undefined points are left out.
    pub fn series(&self, quantity: Quantity, k: Option<usize>) -> Vec<(f64, f64)> {
        self.rows
            .iter()
            .filter_map(|r| {
                let t = r.t_value;
                let v = match k {
                    None => &r.exact.raw,
                    Some(k) => r.approximations.get(k)?.raw.as_ref()?,
                };
                let y = v.get(quantity);
                Some((t, Float::with_val(PREC, y).to_f64()))
            })
            .collect()
    }

    /// `(T, |relative error|)` of `quantity` for approximation number `k`.
    pub fn error_series(&self, quantity: Quantity, k: usize) -> Vec<(f64, f64)> {
        let qi = Quantity::ALL
            .iter()
            .position(|q| *q == quantity)
            .unwrap_or(0);
        self.rows
            .iter()
            .filter_map(|r| {
                let t = r.t_value;
                let e = r.approximations.get(k)?.raw_err?[qi];
                Some((t, e.abs()))
            })
            .collect()
    }

    /// T/θ of every row, in grid order.
    pub fn reduced(&self) -> Vec<f64> {
        self.rows.iter().map(|r| r.x).collect()
    }
}

impl Tabular for CompareReport {
    fn preamble(&self) -> Vec<String> {
        let mut p = vec![
            format!("model: {}", self.model),
            format!(
                "{}; T/θ measures temperature against it",
                crate::report::text::theta_line(&self.theta, &self.unit, &self.theta_kelvin)
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
