//! The answer to `crossover`: where an approximation's relative error
//! crosses a tolerance, written from the numbers of
//! [`crate::classical::crossovers`].

use super::text::{error_text, rational_text, theta_line};
use crate::classical::{crossovers, Classical, Quantity, SearchRange};
use crate::error::Result;
use crate::exact::{exact_decimal, format_sig};
use crate::export::{units_block, Column, Tabular};
use num_rational::BigRational;
use serde::Serialize;

/// One crossing of the tolerance.
#[derive(Debug, Clone, Serialize)]
pub struct CrossingRow {
    /// T in kelvin (null when the model's unit has no known size).
    #[serde(rename = "T")]
    pub t: Option<String>,
    /// T/θ.
    #[serde(rename = "T_over_theta")]
    pub t_over_theta: String,
    /// kT in the model's unit.
    #[serde(rename = "kT")]
    pub kt: String,
    /// Whether the tolerance is exceeded just below this temperature (the
    /// usual breakdown) rather than just above it.
    pub exceeds_below: bool,
}

/// The breakdown finder's answer.
#[derive(Debug, Clone, Serialize)]
pub struct CrossoverReport {
    /// The model.
    pub model: String,
    /// The quantity judged.
    pub quantity: Quantity,
    /// The approximation's name.
    pub approximation: String,
    /// What it is.
    pub approximation_formula: String,
    /// The tolerance on |relative error|, as a decimal.
    pub tolerance: String,
    /// θ in the model's unit.
    pub theta: String,
    /// The model's unit.
    pub unit: String,
    /// θ in kelvin, when known.
    pub theta_kelvin: Option<String>,
    /// The range searched, as T/θ.
    pub range: [String; 2],
    /// Every crossing found, coldest first.
    pub crossings: Vec<CrossingRow>,
    /// The relative error at the coldest and hottest ends of the range.
    pub error_at_ends: [String; 2],
    /// A sentence saying what was found.
    pub verdict: String,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl CrossoverReport {
    /// The columns of the crossings' table.
    fn columns_for(unit: &str) -> Vec<Column> {
        vec![
            Column::plain("T/θ"),
            Column::with_unit("T", "K").key("T"),
            Column::with_unit("kT", unit).key("kT"),
            Column::plain("tolerance exceeded"),
        ]
    }

    /// Finds every crossing with [`crossovers`] (same arguments) and writes
    /// it to `digits` significant digits.
    ///
    /// ```
    /// use zsum::classical::{Classical, Quantity, SearchRange, parse_tolerance};
    /// use zsum::models::oscillator::HarmonicModes;
    /// use zsum::exact::parse_rational;
    /// use zsum::report::CrossoverReport;
    /// use zsum::units::EnergyUnit;
    /// let ho = HarmonicModes::one_d(parse_rational("1")?, false, EnergyUnit::Kelvin)?;
    /// let c = Classical::new(&ho)?;
    /// let r = CrossoverReport::build(&c, c.find("classical")?, Quantity::Q,
    ///     &parse_tolerance("1%")?, &SearchRange::parse("1:1000")?, 4)?;
    /// assert_eq!(r.crossings[0].t_over_theta, "49.67");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        c: &Classical,
        index: usize,
        quantity: Quantity,
        tol: &BigRational,
        range: &SearchRange,
        digits: u32,
    ) -> Result<CrossoverReport> {
        let found = crossovers(c, index, quantity, tol, range, digits)?;
        let theta_k = c.theta_kelvin();
        let crossings: Vec<CrossingRow> = found
            .crossings
            .iter()
            .map(|x| CrossingRow {
                t: theta_k
                    .as_ref()
                    .map(|k| format_sig(&(&x.reduced * k), digits)),
                t_over_theta: format_sig(&x.reduced, digits),
                kt: format_sig(&(&x.reduced * c.theta()), digits),
                exceeds_below: x.exceeds_below,
            })
            .collect();
        let approximation = &found.approximation;
        let percent = |t: &BigRational| {
            let p = t * BigRational::from_integer(100.into());
            format!("{}%", exact_decimal(&p, 12))
        };
        let range_text = format!(
            "T/θ {} to {}",
            rational_text(&range.from, 12),
            rational_text(&range.to, 12)
        );
        let name = &approximation.name;
        let verdict = if crossings.is_empty() {
            if found.exceeded_when_hottest {
                format!(
                    "the {name} {} errs by more than {} throughout {range_text}: no crossing",
                    quantity.name(),
                    percent(tol)
                )
            } else {
                format!(
                    "the {name} {} stays within {} throughout {range_text}: no crossing",
                    quantity.name(),
                    percent(tol)
                )
            }
        } else {
            let list: Vec<String> = crossings
                .iter()
                .map(|x| {
                    let at = match &x.t {
                        Some(t) => format!("T = {t} K (T/θ = {})", x.t_over_theta),
                        None => format!("T/θ = {}", x.t_over_theta),
                    };
                    format!(
                        "{at}, exceeded {} it",
                        if x.exceeds_below { "below" } else { "above" }
                    )
                })
                .collect();
            format!(
                "the {name} {} crosses {} {} time{} in {range_text}: {}",
                quantity.name(),
                percent(tol),
                crossings.len(),
                if crossings.len() == 1 { "" } else { "s" },
                list.join("; ")
            )
        };
        Ok(CrossoverReport {
            units: units_block(&CrossoverReport::columns_for(
                &c.spectrum().unit().to_string(),
            )),
            model: c.spectrum().describe(),
            quantity,
            approximation: approximation.name.clone(),
            approximation_formula: approximation.description.clone(),
            tolerance: exact_decimal(tol, 30),
            theta: rational_text(&c.theta(), 15),
            unit: c.spectrum().unit().to_string(),
            theta_kelvin: theta_k.as_ref().map(|k| rational_text(k, 15)),
            range: [rational_text(&range.from, 15), rational_text(&range.to, 15)],
            crossings,
            error_at_ends: found.error_at_ends.each_ref().map(error_text),
            verdict,
        })
    }
}

impl Tabular for CrossoverReport {
    fn preamble(&self) -> Vec<String> {
        let mut p = vec![
            format!("model: {}", self.model),
            format!(
                "approximation: {} = {}",
                self.approximation, self.approximation_formula
            ),
            format!(
                "quantity: {}; tolerance on |relative error|: {}",
                self.quantity, self.tolerance
            ),
            theta_line(&self.theta, &self.unit, &self.theta_kelvin),
            format!(
                "searched T/θ from {} to {}; relative error there {} and {}",
                self.range[0], self.range[1], self.error_at_ends[0], self.error_at_ends[1]
            ),
        ];
        p.push(self.verdict.clone());
        p
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }

    fn rows(&self) -> Vec<Vec<String>> {
        self.crossings
            .iter()
            .map(|c| {
                vec![
                    c.t_over_theta.clone(),
                    c.t.clone().unwrap_or_else(|| "-".into()),
                    c.kt.clone(),
                    if c.exceeds_below { "below" } else { "above" }.into(),
                ]
            })
            .collect()
    }
}
