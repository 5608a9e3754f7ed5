//! The Einstein solid's table as printed (`zsum microstates --einstein`),
//! written from the numbers of [`crate::microstates::einstein_table`].

use crate::error::Result;
use crate::exact::format_sig;
use crate::export::{units_block, Column, Tabular};
use crate::microstates::{einstein_table, EinsteinTable};
use crate::spectrum::Budget;
use crate::sum::Certified;
use num_rational::BigRational;
use serde::Serialize;

/// One number of quanta.
#[derive(Debug, Clone, Serialize)]
pub struct EinsteinRow {
    /// The number of quanta q.
    pub quanta: u64,
    /// Ω(q) = C(q + N − 1, q), exact.
    pub omega: String,
    /// S/k = ln Ω.
    pub s_over_k: String,
    /// βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1).
    pub beta_hw: String,
    /// kT/ħω = 1/(βħω); `inf` for one oscillator.
    pub kt_over_hw: String,
    /// The canonical mean number of quanta U/ħω at that temperature.
    pub canonical_u_over_hw: String,
    /// The canonical S/k at that temperature.
    pub canonical_s_over_k: String,
}

/// `zsum microstates --einstein`: the Einstein solid by number of quanta.
#[derive(Debug, Clone, Serialize)]
pub struct EinsteinReport {
    /// The number of oscillators N.
    pub oscillators: u64,
    /// The most quanta tabulated.
    pub quanta_up_to: u64,
    /// Significant digits of every value but Ω, each certified.
    pub digits: u32,
    /// One row per q = 0, 1, ..., `quanta_up_to`.
    pub rows: Vec<EinsteinRow>,
    /// The unit of every field that has one, from the table's columns
    /// (every column is a count or a pure number, so none has).
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl EinsteinReport {
    /// The Einstein solid of `n` oscillators (1 to 1000) for every number of
    /// quanta from 0 up to `up_to` (rounded down), values to `digits`
    /// significant digits; refuses a table estimated beyond `budget`.
    ///
    /// ```
    /// use zsum::report::EinsteinReport;
    /// use zsum::exact::parse_rational;
    /// use zsum::spectrum::Budget;
    /// // Three oscillators: Ω(4) = C(6, 4) = 15, and
    /// // βħω = ψ(7) − ψ(5) = 1/5 + 1/6 = 11/30 exactly.
    /// let rep = EinsteinReport::build(3, &parse_rational("4")?, 10, &Budget::default())?;
    /// let r = &rep.rows[4];
    /// assert_eq!((r.quanta, r.omega.as_str()), (4, "15"));
    /// assert_eq!(r.beta_hw, "0.3666666667");
    /// assert_eq!(r.kt_over_hw, "2.727272727"); // 30/11
    /// let u: f64 = r.canonical_u_over_hw.parse().unwrap();
    /// assert!((u - 3.0 / ((11.0f64 / 30.0).exp() - 1.0)).abs() < 1e-8);
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(n: u64, up_to: &BigRational, digits: u32, budget: &Budget) -> Result<Self> {
        Ok(Self::new(&einstein_table(n, up_to, digits, budget)?))
    }

    /// The table `t` written to its digits: every value as certified;
    /// βħω and kT/ħω from the exact sum where a row carries it; `inf` for
    /// an infinite temperature.
    pub fn new(t: &EinsteinTable) -> Self {
        let digits = t.digits;
        let text = |c: &Certified| c.decimal_marked(digits).0;
        let inf = || "inf".to_string();
        let rows = t
            .rows
            .iter()
            .map(|r| {
                let (beta_hw, kt_over_hw) = match &r.beta_hw_exact {
                    Some(h) => (format_sig(h, digits), format_sig(&h.recip(), digits)),
                    None => (
                        text(&r.beta_hw),
                        r.kt_over_hw.as_ref().map_or_else(inf, text),
                    ),
                };
                let (u, s) = match &r.canonical {
                    Some(c) => (text(&c.u_over_hw), text(&c.s_over_k)),
                    None => (inf(), inf()),
                };
                EinsteinRow {
                    quanta: r.quanta,
                    omega: r.omega.to_string(),
                    s_over_k: text(&r.s_over_k),
                    beta_hw,
                    kt_over_hw,
                    canonical_u_over_hw: u,
                    canonical_s_over_k: s,
                }
            })
            .collect();
        EinsteinReport {
            oscillators: t.oscillators,
            quanta_up_to: t.quanta_up_to,
            digits,
            rows,
            units: units_block(&Self::columns_for()),
        }
    }

    /// The columns: counts and pure numbers (energies in quanta ħω).
    fn columns_for() -> Vec<Column> {
        vec![
            Column::plain("quanta q").key("quanta"),
            Column::plain("Ω(q)").key("omega"),
            Column::plain("S/k = ln Ω").key("s_over_k"),
            Column::plain("βħω = d ln Ω/dq").key("beta_hw"),
            Column::plain("kT/ħω").key("kt_over_hw"),
            Column::plain("U/ħω canonical").key("canonical_u_over_hw"),
            Column::plain("S/k canonical").key("canonical_s_over_k"),
        ]
    }
}

impl Tabular for EinsteinReport {
    fn preamble(&self) -> Vec<String> {
        let n = self.oscillators;
        let (oscillators, them) = match n {
            1 => ("1 oscillator".to_string(), "the oscillator".to_string()),
            _ => (
                format!("{n} labelled oscillators"),
                format!("the {n} oscillators"),
            ),
        };
        let mut lines = vec![
            format!(
                "Einstein solid: {oscillators} of one quantum ħω sharing q = 0 to {} quanta; \
                 Ω(q) = C(q + N − 1, q), exact",
                self.quanta_up_to
            ),
            "S/k = ln Ω; βħω = d ln Ω/dq = ψ(q + N) − ψ(q + 1) (ψ: digamma), the exact \
             derivative of the exact count continued to real q, no finite difference; \
             kT/ħω = 1/(βħω), the microcanonical temperature"
                .into(),
            format!(
                "U/ħω and S/k canonical: {them} in the canonical ensemble at that \
                 temperature, U/ħω = N/(e^βħω − 1) quanta to set beside q; every value to {} \
                 significant digits, each certified",
                self.digits
            ),
        ];
        if n == 1 {
            lines.push(
                "one oscillator has Ω = 1 at every q: ln Ω is flat, βħω = 0, and the \
                 temperature and the canonical values are infinite"
                    .into(),
            );
        }
        lines
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.quanta.to_string(),
                    r.omega.clone(),
                    r.s_over_k.clone(),
                    r.beta_hw.clone(),
                    r.kt_over_hw.clone(),
                    r.canonical_u_over_hw.clone(),
                    r.canonical_s_over_k.clone(),
                ]
            })
            .collect()
    }
}
