//! The reports of `zsum microstates` and `zsum ensemble`.

use super::collection::{Omega, Statistics};
use super::ensemble::{boltzmann_log_ratio, canonical_at, point_from, EnsemblePoint};
use crate::classical::bisect;
use crate::error::Result;
use crate::exact::{exact_decimal, format_sig, parse_rational};
use crate::export::{units_block, Column, Tabular};
use crate::report::text::value_text;
use crate::spectrum::Spectrum;
use crate::sum::{float_to_decimal, to_rug, Temperature};
use num_rational::BigRational;
use num_traits::Zero;
use rug::Float;
use serde::Serialize;

/// Working precision of the microcanonical logarithms, bits.
const PREC: u32 = 192;

/// One total energy with states.
#[derive(Debug, Clone, Serialize)]
pub struct MicroRow {
    /// Total energy, exact.
    pub energy: String,
    /// Total energy above N·ε₀ in grid steps, exact.
    pub steps: u64,
    /// Ω(E, N), exact.
    pub omega: String,
    /// S/k = ln Ω.
    pub s_over_k: String,
    /// kT from the discrete derivative of ln Ω (central between the
    /// neighbouring energies with states; one-sided at the ends), in the
    /// spectrum's unit; `None` with no neighbour.
    pub kt: Option<String>,
    /// At the rows compared: the canonical mean energy at that temperature.
    pub canonical_u: Option<String>,
    /// At the rows compared: the canonical S/k at that temperature.
    pub canonical_s_over_k: Option<String>,
}

/// `zsum microstates`: Ω(E, N), S = k ln Ω and the microcanonical
/// temperature, compared with the canonical ensemble.
#[derive(Debug, Clone, Serialize)]
pub struct MicroReport {
    /// What was counted.
    pub system: String,
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// Energy unit.
    pub unit: String,
    /// The grid step, exact.
    pub grid_step: String,
    /// N·ε₀, the energy at step 0, exact.
    pub base: String,
    /// The highest total energy counted, exact.
    pub up_to: String,
    /// Rows with Ω > 0.
    pub rows: Vec<MicroRow>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

fn exact_float(r: &BigRational, prec: u32) -> Float {
    Float::with_val(prec, to_rug(r))
}

impl MicroReport {
    /// The report of `omega`, with the canonical comparison at `compare`
    /// energies spread over the rows, values to `digits` digits.
    pub fn build(
        spectrum: &dyn Spectrum,
        omega: &Omega,
        up_to: &BigRational,
        compare: usize,
        digits: u32,
    ) -> Result<Self> {
        let nz: Vec<usize> = (0..omega.counts.len())
            .filter(|&k| !omega.counts[k].is_zero())
            .collect();
        let logs: Vec<Float> = nz
            .iter()
            .map(|&k| super::ln_biguint(&omega.counts[k], PREC))
            .collect();
        let step = exact_float(&omega.grid.step, PREC);
        // 1/kT by the discrete derivative of ln Ω.
        let beta: Vec<Option<Float>> = (0..nz.len())
            .map(|i| {
                let (a, b) = match (i.checked_sub(1), nz.get(i + 1)) {
                    (Some(a), Some(_)) => (a, i + 1),
                    (None, Some(_)) => (i, i + 1),
                    (Some(a), None) => (a, i),
                    (None, None) => return None,
                };
                let de = Float::with_val(PREC, &step * (nz[b] - nz[a]) as u64);
                Some(Float::with_val(
                    PREC,
                    Float::with_val(PREC, &logs[b] - &logs[a]) / de,
                ))
            })
            .collect();
        let positive: Vec<usize> = (0..nz.len())
            .filter(|&i| {
                beta[i]
                    .as_ref()
                    .is_some_and(|b| b.is_sign_positive() && !b.is_zero())
            })
            .collect();
        let chosen: Vec<usize> = match (compare, positive.len()) {
            (0, _) | (_, 0) => Vec::new(),
            (1, _) => vec![positive[positive.len() / 2]],
            (c, m) => {
                let mut v: Vec<usize> = (0..c.min(m))
                    .map(|j| positive[j * (m - 1) / (c.min(m) - 1).max(1)])
                    .collect();
                v.dedup();
                v
            }
        };
        let mut rows = Vec::with_capacity(nz.len());
        for (i, &k) in nz.iter().enumerate() {
            let tiny = Float::with_val(64, &*logs[i].as_abs()) >> (PREC - 4);
            let s_text = float_to_decimal(&logs[i], tiny.to_f64(), 0.0, digits).0;
            let kt = beta[i].as_ref().map(|b| {
                if b.is_zero() {
                    "inf".to_string()
                } else {
                    value_text(&Float::with_val(PREC, b.recip_ref()), digits)
                }
            });
            let (mut cu, mut cs) = (None, None);
            if chosen.contains(&i) {
                let b = beta[i].as_ref().expect("chosen rows have a temperature");
                let b_exact = parse_rational(&value_text(b, 12))?;
                let c = canonical_at(
                    spectrum,
                    omega.particles,
                    omega.statistics,
                    &b_exact,
                    digits,
                )?;
                let p = c.prec;
                let kt_exact = exact_float(&b_exact.recip(), p);
                cu = Some(value_text(&Float::with_val(p, &c.u.c * &kt_exact), digits));
                cs = Some(value_text(&Float::with_val(p, &c.ln_q.c + &c.u.c), digits));
            }
            rows.push(MicroRow {
                energy: exact_decimal(&omega.energy(k), 40),
                steps: k as u64,
                omega: omega.counts[k].to_string(),
                s_over_k: s_text,
                kt,
                canonical_u: cu,
                canonical_s_over_k: cs,
            });
        }
        Ok(MicroReport {
            system: spectrum.describe(),
            statistics: omega.statistics,
            particles: omega.particles,
            unit: omega.grid.unit.to_string(),
            grid_step: exact_decimal(&omega.grid.step, 40),
            base: exact_decimal(&omega.energy(0), 40),
            up_to: exact_decimal(up_to, 40),
            rows,
            units: units_block(&Self::columns_for(&spectrum.unit().to_string())),
        })
    }

    /// The columns of the counting table, energies in `unit`.
    fn columns_for(unit: &str) -> Vec<Column> {
        vec![
            Column::with_unit("E", unit).key("energy"),
            Column::plain("steps"),
            Column::plain("Omega"),
            Column::plain("S/k"),
            Column::with_unit("kT", unit).key("kt"),
            Column::with_unit("U canonical", unit).key("canonical_u"),
            Column::plain("S/k canonical"),
        ]
    }
}

/// An exact energy for the table: its decimal when that has at most 12
/// digits, else 12 digits.
fn shown(exact: &str) -> String {
    match parse_rational(exact) {
        Ok(x) => crate::report::text::rational_text(&x, 12),
        Err(_) => exact.to_string(),
    }
}

impl Tabular for MicroReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{} {} particles in {}: exact microstate counts Ω(E, N) for every total energy up to {} {}",
                self.particles,
                self.statistics.name(),
                self.system,
                self.up_to,
                self.unit
            ),
            format!(
                "E = {} + steps × {} {} (shown to 12 digits where longer; exact in JSON); \
                 S/k = ln Ω; kT from the discrete derivative of ln Ω (central between \
                 neighbouring energies with states), in {}",
                shown(&self.base),
                shown(&self.grid_step),
                self.unit,
                self.unit
            ),
            "U and S/k canonical: the canonical ensemble at that kT (rounded to 12 digits), \
             where compared"
                .into(),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(&self.unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        let o = |x: &Option<String>| x.clone().unwrap_or_default();
        self.rows
            .iter()
            .map(|r| {
                vec![
                    shown(&r.energy),
                    r.steps.to_string(),
                    r.omega.clone(),
                    r.s_over_k.clone(),
                    o(&r.kt),
                    o(&r.canonical_u),
                    o(&r.canonical_s_over_k),
                ]
            })
            .collect()
    }
}

/// A temperature where the Boltzmann count q^N/N! crosses the tolerance.
#[derive(Debug, Clone, Serialize)]
pub struct BoltzmannCrossing {
    /// The temperature, to 4 significant digits.
    #[serde(rename = "T")]
    pub t: String,
    /// Whether the error exceeds the tolerance below this temperature.
    pub exceeds_below: bool,
}

/// `zsum ensemble`: Q_N over a temperature grid, with where q^N/N! fails.
#[derive(Debug, Clone, Serialize)]
pub struct EnsembleReport {
    /// The single-particle spectrum.
    pub system: String,
    /// The statistics.
    pub statistics: Statistics,
    /// Number of particles.
    pub particles: u64,
    /// What T means: `K`, or `kT in <unit>`.
    pub temperature: String,
    /// The tolerance on the relative error of q^N/N! in Q.
    pub tolerance: String,
    /// One row per temperature, as given.
    pub rows: Vec<EnsemblePoint>,
    /// Where |q^N/N! / Q − 1| crosses the tolerance, coldest first.
    pub crossings: Vec<BoltzmannCrossing>,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
    /// The spectrum's energy unit (of kT when the grid is kT).
    #[serde(skip)]
    energy_unit: String,
}

impl EnsembleReport {
    /// Q_N of `n` particles of `stats` at every temperature of `grid`
    /// (kelvin, or kT in the spectrum's unit), to `digits` digits, and the
    /// temperatures where q^N/N! crosses `tol` (relative error in Q).
    ///
    /// ```
    /// use zsum::microstates::{EnsembleReport, Statistics};
    /// use zsum::models::oscillator::HarmonicModes;
    /// use zsum::exact::parse_rational;
    /// use zsum::units::EnergyUnit;
    /// let r = |s: &str| parse_rational(s).unwrap();
    /// let trap = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
    /// let rep = EnsembleReport::build(&trap, 10, Statistics::Bose,
    ///     &[r("1"), r("100"), r("10000")], true, 8, &r("0.01"))?;
    /// assert_eq!(rep.rows.len(), 3);
    /// // q^N/N! errs by about N(N − 1)/(4T) here, so by more than 1% below
    /// // roughly 2250 K.
    /// assert_eq!(rep.crossings.len(), 1);
    /// assert!(rep.crossings[0].exceeds_below);
    /// let t: f64 = rep.crossings[0].t.parse().unwrap();
    /// assert!((2000.0..2500.0).contains(&t));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn build(
        spectrum: &dyn Spectrum,
        n: u64,
        stats: Statistics,
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        tol: &BigRational,
    ) -> Result<Self> {
        let meter = crate::budget::Meter::unlimited();
        Self::build_metered(spectrum, n, stats, grid, kelvin, digits, tol, &meter)
    }

    /// As [`EnsembleReport::build`], the temperatures timed by `meter`
    /// (hottest, costliest, first), which refuses the rest once their
    /// projected time exceeds its budget and tells its observer how far the
    /// grid is.
    #[allow(clippy::too_many_arguments)]
    pub fn build_metered(
        spectrum: &dyn Spectrum,
        n: u64,
        stats: Statistics,
        grid: &[BigRational],
        kelvin: bool,
        digits: u32,
        tol: &BigRational,
        meter: &crate::budget::Meter,
    ) -> Result<Self> {
        let temp = |t: &BigRational| {
            if kelvin {
                Temperature::Kelvin(t.clone())
            } else {
                Temperature::ThermalEnergy(t.clone())
            }
        };
        let tol_f = exact_float(tol, 64);
        let exceeds = |c: &super::ensemble::Canonical| -> bool {
            let e = Float::with_val(c.prec, boltzmann_log_ratio(c, n).exp_m1_ref());
            *e.as_abs() > tol_f
        };
        let cached = crate::sum::Cached::new(spectrum);
        // Memory: the recursion keeps Q_0..Q_N as balls on jets (under a
        // kilobyte each at the working precision) and the answer a row per
        // temperature (about half a kilobyte with its text).
        crate::spectrum::Budget::default().check(
            &format!("Q_N of {n} particles over {} temperatures", grid.len()),
            n as f64 * 1024.0 + grid.len() as f64 * 512.0,
            "give fewer temperatures or particles",
        )?;
        // Hottest first: the costliest temperature is timed first.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|&a, &b| grid[b].cmp(&grid[a]));
        let mut slots = vec![None; grid.len()];
        let mut states = Vec::with_capacity(grid.len());
        for (count, &i) in order.iter().enumerate() {
            let t = &grid[i];
            let beta = temp(t).beta(&spectrum.unit())?;
            let c = canonical_at(&cached, n, stats, &beta, digits)?;
            states.push((t.clone(), exceeds(&c)));
            slots[i] = Some(point_from(&c, n, exact_decimal(t, 40), digits));
            meter.at(count as f64 + 1.0)?;
        }
        let rows: Vec<EnsemblePoint> = slots.into_iter().flatten().collect();
        let mut sorted = states;
        sorted.sort_by(|a, b| a.0.cmp(&b.0));
        sorted.dedup_by(|a, b| a.0 == b.0);
        let mut crossings = Vec::new();
        for w in sorted.windows(2) {
            if w[0].1 == w[1].1 {
                continue;
            }
            let x = bisect(
                w[0].0.clone(),
                w[1].0.clone(),
                w[0].1,
                |x| format_sig(x, 4),
                |mid| {
                    let beta = temp(mid).beta(&spectrum.unit())?;
                    Ok(exceeds(&canonical_at(&cached, n, stats, &beta, 8)?))
                },
            )?;
            crossings.push(BoltzmannCrossing {
                t: format_sig(&x, 4),
                exceeds_below: w[0].1,
            });
        }
        let percent = tol * BigRational::from_integer(100.into());
        let energy_unit = spectrum.unit().to_string();
        Ok(EnsembleReport {
            units: units_block(&Self::columns_for(kelvin, &energy_unit)),
            energy_unit,
            system: spectrum.describe(),
            statistics: stats,
            particles: n,
            temperature: if kelvin {
                "K".into()
            } else {
                format!("kT in {}", spectrum.unit())
            },
            tolerance: format!("{}%", exact_decimal(&percent, 12)),
            rows,
            crossings,
        })
    }
}

impl EnsembleReport {
    /// The columns: T in K (or kT in the spectrum's unit), the exact
    /// functions, the errors of the shortcuts, the working precision.
    fn columns_for(kelvin: bool, unit: &str) -> Vec<Column> {
        let t = if kelvin {
            Column::with_unit("T", "K")
        } else {
            Column::with_unit("kT", unit)
        };
        let mut c = vec![t.key("T")];
        c.extend(
            [
                "ln Q",
                "U/kT",
                "Cv/k",
                "S/k",
                "err Q",
                "err U",
                "err Cv",
                "dS/k",
                "q^N err Q",
            ]
            .map(Column::plain),
        );
        c.push(Column::with_unit("precision", "bits").key("precision_bits"));
        c
    }
}

impl Tabular for EnsembleReport {
    fn preamble(&self) -> Vec<String> {
        vec![
            format!(
                "{} {} particles in {}: canonical Q_N by the exact recursion, every digit of ln Q, \
                 U/kT, Cv/k, S/k certified (totals for all N particles)",
                self.particles,
                self.statistics.name(),
                self.system
            ),
            format!(
                "T column: {}; err = relative error of q^N/N! (Boltzmann counting) against the \
                 exact Q_N; dS/k = its S/k minus the exact; q^N err = labelled counting; \
                 precision = working precision",
                if self.temperature == "K" {
                    "T in K".to_string()
                } else {
                    self.temperature.clone()
                }
            ),
        ]
    }
    fn columns(&self) -> Vec<Column> {
        Self::columns_for(self.temperature == "K", &self.energy_unit)
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.rows
            .iter()
            .map(|r| {
                vec![
                    r.t.clone(),
                    r.ln_q.clone(),
                    r.u_over_kt.clone(),
                    r.cv_over_k.clone(),
                    r.s_over_k.clone(),
                    r.boltzmann_error_q.clone(),
                    r.boltzmann_error_u.clone(),
                    r.boltzmann_error_cv.clone(),
                    r.boltzmann_error_s.clone(),
                    r.labelled_error_q.clone(),
                    r.precision_bits.to_string(),
                ]
            })
            .collect()
    }
    fn summary(&self) -> Vec<String> {
        if self.crossings.is_empty() {
            return vec![format!(
                "q^N/N! does not cross the {} tolerance between the temperatures given",
                self.tolerance
            )];
        }
        self.crossings
            .iter()
            .map(|c| {
                format!(
                    "q^N/N! errs by more than {} in Q {} T = {} {}",
                    self.tolerance,
                    if c.exceeds_below { "below" } else { "above" },
                    c.t,
                    if self.temperature == "K" { "K" } else { "(kT)" }
                )
            })
            .collect()
    }
}
