//! Standard molar functions as printed: one row per temperature
//! ([`MolarPoint`]) and the property table of a species ([`MolarTable`]),
//! every value written to the digits it was computed for, with the nΛ³
//! and flag columns and the warnings every gas table shares.

use super::text::value_text;
use crate::exact::exact_decimal;
use crate::export::{units_block, Column, Tabular};
use crate::species::{Basis, Degeneracy, Isomer, MolarGrid, MolarValues, Reference, DEGENERACY_G};
use crate::sum::Certified;
use serde::Serialize;

/// The name of a spin-isomer state: `equilibrium`, `normal`, `ortho`,
/// `para` or `fraction=X` (X exact, up to 20 digits).
pub fn isomer_name(isomer: &Isomer) -> String {
    match isomer {
        Isomer::Equilibrium => "equilibrium".into(),
        Isomer::Normal => "normal".into(),
        Isomer::Ortho => "ortho".into(),
        Isomer::Para => "para".into(),
        Isomer::Fraction(x) => format!("fraction={}", exact_decimal(x, 20)),
        Isomer::Named(n) => n.clone(),
    }
}

/// The units of an entropy or heat capacity and of an energy in `basis`.
pub fn basis_units(basis: Basis) -> (&'static str, &'static str) {
    match basis {
        Basis::Mole => ("J/(mol K)", "J/mol"),
        Basis::Kilogram => ("J/(kg K)", "J/kg"),
        Basis::Particle => ("J/K", "J"),
    }
}

/// The name of `basis` in output: `mole`, `kg` or `particle`.
pub fn basis_name(basis: Basis) -> &'static str {
    match basis {
        Basis::Mole => "mole",
        Basis::Kilogram => "kg",
        Basis::Particle => "particle",
    }
}

/// What H0 is, in words.
pub fn reference_text(reference: Reference) -> &'static str {
    match reference {
        Reference::EachIsomerLowestLevel => {
            "H0 = each spin isomer at its own lowest level (composition frozen)"
        }
        Reference::LowestLevel => "H0 = the lowest level",
    }
}

/// A certified value written to `digits` significant digits (its centre,
/// correctly rounded; the guard digits of the computation prove them).
pub(crate) fn digits_text(v: &Certified, digits: u32) -> String {
    value_text(v.value(), digits)
}

/// Standard molar functions at one temperature, as printed.
#[derive(Debug, Clone, Serialize)]
pub struct MolarPoint {
    /// The species.
    pub species: String,
    /// T in kelvin.
    #[serde(rename = "T")]
    pub t: String,
    /// p in Pa.
    pub p: String,
    /// The spin-isomer state, for species that have one.
    pub isomer: Option<String>,
    /// The ortho fraction, for species with spin isomers.
    pub ortho_fraction: Option<String>,
    /// Conventional entropy (nuclear spin excluded), in `units["S"]`.
    #[serde(rename = "S")]
    pub s: String,
    /// Entropy including nuclear spin (and isomer mixing); equal to S where
    /// no nuclear-spin statistics are modelled.
    #[serde(rename = "S_total")]
    pub s_total: String,
    /// Cp.
    #[serde(rename = "Cp")]
    pub cp: String,
    /// Cv.
    #[serde(rename = "Cv")]
    pub cv: String,
    /// H(T) − H0, with H0 as [`MolarPoint::reference`] says.
    #[serde(rename = "H_minus_H0")]
    pub h: String,
    /// −(G(T) − H0)/T.
    #[serde(rename = "minus_G_minus_H0_over_T")]
    pub g: String,
    /// What H0 is: the lowest level, or for a frozen spin-isomer mixture
    /// each isomer's own lowest level.
    pub reference: String,
    /// The basis: `mole`, `kg` or `particle`.
    pub per: String,
    /// How far the gas is from quantum degeneracy at this T and p, and
    /// whether the classical translation is flagged.
    #[serde(flatten)]
    pub degeneracy: Degeneracy,
    /// The unit of every field that has one, from the table's columns.
    pub units: serde_json::Map<String, serde_json::Value>,
}

impl MolarPoint {
    /// The row of `v`: T and p exact (up to 30 digits), every function to
    /// the digits it was computed for.
    ///
    /// ```
    /// use zsum::species::{molar, Database, MolarOptions};
    /// use zsum::report::MolarPoint;
    /// use zsum::exact::parse_rational;
    /// let db = Database::builtin()?;
    /// let v = molar(db.find("Ar")?, &parse_rational("298.15")?, &MolarOptions::default())?;
    /// let row = MolarPoint::new(&v);
    /// assert!(row.s.starts_with("154.84"));
    /// assert_eq!(row.units["S"], "J/(mol K)");
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(v: &MolarValues) -> MolarPoint {
        let show = |c: &Certified| digits_text(c, v.digits);
        MolarPoint {
            species: v.species.clone(),
            t: exact_decimal(&v.t, 30),
            p: exact_decimal(&v.pressure, 30),
            isomer: v.isomer.as_ref().map(isomer_name),
            ortho_fraction: v.ortho_fraction.as_ref().map(show),
            s: show(&v.s),
            s_total: show(&v.s_total),
            cp: show(&v.cp),
            cv: show(&v.cv),
            h: show(&v.h_minus_h0),
            g: show(&v.minus_g_minus_h0_over_t),
            reference: reference_text(v.reference).into(),
            per: basis_name(v.basis).into(),
            degeneracy: v.degeneracy.clone(),
            units: units_block(&MolarTable::columns_for(v.isomer.is_some(), v.basis)),
        }
    }
}

/// A property table: one species over a temperature grid (or several
/// species' rows in one table).
#[derive(Debug, Clone, Serialize)]
#[serde(transparent)]
pub struct MolarTable {
    /// The rows, in grid order.
    pub rows: Vec<MolarPoint>,
    /// The amount every row is given for.
    #[serde(skip)]
    pub basis: Basis,
}

impl MolarTable {
    /// The table of one species' grid.
    pub fn new(grid: &MolarGrid) -> MolarTable {
        MolarTable {
            basis: grid.basis,
            rows: grid.rows.iter().map(MolarPoint::new).collect(),
        }
    }

    /// One table of the rows of several grids, in order (every grid in
    /// `basis`).
    pub fn joined(grids: &[MolarGrid], basis: Basis) -> MolarTable {
        MolarTable {
            basis,
            rows: grids
                .iter()
                .flat_map(|g| g.rows.iter().map(MolarPoint::new))
                .collect(),
        }
    }
}

impl MolarTable {
    /// Warning lines for the rows whose classical translation is flagged
    /// (none when no row is).
    pub fn warnings(&self) -> Vec<String> {
        degeneracy_warnings(self.rows.iter().map(|r| {
            (
                r.species.as_str(),
                r.t.as_str(),
                r.p.as_str(),
                &r.degeneracy,
            )
        }))
    }
}

/// The nΛ³ and flag columns of every gas table, CSV included: a `*` flag
/// marks a row whose classical translation is not right to its digits.
pub(crate) fn degeneracy_columns() -> [Column; 2] {
    [
        Column::with_unit("nLambda^3", "dimensionless").key("n_lambda3"),
        Column::plain("flag"),
    ]
}

/// The text of a row's nΛ³ (4 significant digits) and flag cells.
pub(crate) fn degeneracy_cells(d: &Degeneracy) -> [String; 2] {
    [
        sig4(d.n_lambda3),
        if d.quantum_flag { "*" } else { "" }.to_string(),
    ]
}

/// The preamble line that says what the nΛ³ and flag columns mean.
pub(crate) fn degeneracy_note(tolerance: f64) -> String {
    format!(
        "nLambda^3 = n Λ³ with n = p/kT, Λ = h/sqrt(2π m kT), g = {DEGENERACY_G} (dimensionless); \
         flag * where the first quantum correction nΛ³/(g 2^(5/2)) exceeds the tolerance {} \
         of the printed digits, or an entropy is negative",
        tolerance_text(tolerance)
    )
}

/// `1e-D` for the tolerance `10^-D` of D printed digits.
fn tolerance_text(tol: f64) -> String {
    format!("1e-{}", (-tol.log10()).round() as i64)
}

fn sig4(v: f64) -> String {
    crate::exact::format_sig_f64(v, 4)
}

fn wrong_beyond(d: &Degeneracy) -> String {
    match d.trusted_digits() {
        0 => "wrong already in the first significant digit".into(),
        n => format!(
            "wrong beyond about the {} significant digit",
            crate::exact::ordinal(n.into())
        ),
    }
}

/// Warning lines for flagged rows, one per species and pressure:
/// `(species, T, p, degeneracy)` for every row, in table order. Each says
/// where the classical translational entropy stops being right, by how
/// many digits, and why.
pub fn degeneracy_warnings<'a>(
    rows: impl IntoIterator<Item = (&'a str, &'a str, &'a str, &'a Degeneracy)>,
) -> Vec<String> {
    // (species, p, [(T, degeneracy)]) in table order.
    type Group<'b> = (&'b str, &'b str, Vec<(&'b str, &'b Degeneracy)>);
    let mut groups: Vec<Group> = Vec::new();
    for (sp, t, p, d) in rows {
        match groups.iter_mut().find(|g| g.0 == sp && g.1 == p) {
            Some(g) => g.2.push((t, d)),
            None => groups.push((sp, p, vec![(t, d)])),
        }
    }
    let mut out = Vec::new();
    for (sp, p, rows) in groups {
        let n = rows.len();
        let quantum: Vec<&(&str, &Degeneracy)> = rows
            .iter()
            .filter(|(_, d)| d.quantum_correction > d.quantum_tolerance)
            .collect();
        if let (Some(worst), Some(best)) = (
            quantum
                .iter()
                .max_by(|a, b| a.1.quantum_correction.total_cmp(&b.1.quantum_correction)),
            quantum
                .iter()
                .min_by(|a, b| a.1.quantum_correction.total_cmp(&b.1.quantum_correction)),
        ) {
            let tol = worst.1.quantum_tolerance;
            let digits = (-tol.log10()).round() as i64;
            let tol = tolerance_text(tol);
            let which = if quantum.len() == n {
                if n == 1 {
                    "the row is flagged *".to_string()
                } else {
                    format!("all {n} rows are flagged *")
                }
            } else {
                format!("{} of {n} rows are flagged *", quantum.len())
            };
            let range = |f: &dyn Fn(&Degeneracy) -> f64| {
                if quantum.len() == 1 {
                    sig4(f(worst.1))
                } else {
                    format!("{} to {}", sig4(f(best.1)), sig4(f(worst.1)))
                }
            };
            let mut line = format!(
                "{sp} at p = {p} Pa: {which}: the classical translational entropy is {} at \
                 T = {} K",
                wrong_beyond(worst.1),
                worst.0
            );
            if quantum.len() > 1 {
                line.push_str(&match best.1.trusted_digits() {
                    0 => format!(" and at T = {} K", best.0),
                    n => format!(
                        " and beyond about the {} at T = {} K",
                        crate::exact::ordinal(n.into()),
                        best.0
                    ),
                });
            }
            line.push_str(&format!(
                ", because it counts the molecules by Boltzmann statistics and leaves out their \
                 Bose/Fermi statistics: nΛ³ = {} there, and the first quantum correction, of \
                 relative size nΛ³/2^(5/2) = {}, exceeds the tolerance {} of {digits} printed \
                 digits; S, Cp, H-H0 and -(G-H0)/T are off by about that relative amount",
                range(&|d| d.n_lambda3),
                range(&|d| d.quantum_correction),
                tol,
            ));
            out.push(line);
        }
        let negative: Vec<&str> = rows
            .iter()
            .filter(|(_, d)| d.negative_entropy)
            .map(|(t, _)| *t)
            .collect();
        if !negative.is_empty() {
            out.push(format!(
                "{sp} at p = {p} Pa: a printed entropy is negative at T = {} K (flagged *): no \
                 gas has a negative entropy, so the classical model fails there",
                negative.join(", ")
            ));
        }
    }
    out
}

impl MolarTable {
    /// The columns of a property table (with the isomer columns where the
    /// species has spin isomers) in `basis`'s units. The same list names
    /// every JSON row's `units`.
    pub(crate) fn columns_for(isomers: bool, basis: Basis) -> Vec<Column> {
        let (k, e) = basis_units(basis);
        let mut c = vec![Column::with_unit("T", "K").key("T")];
        if isomers {
            c.push(Column::plain("isomer"));
            c.push(Column::plain("ortho fraction"));
        }
        c.extend([
            Column::with_unit("S", k).key("S"),
            Column::with_unit("S_total", k).key("S_total"),
            Column::with_unit("Cp", k).key("Cp"),
            Column::with_unit("Cv", k).key("Cv"),
            Column::with_unit("H-H0", e).key("H_minus_H0"),
            Column::with_unit("-(G-H0)/T", k).key("minus_G_minus_H0_over_T"),
        ]);
        c.extend(degeneracy_columns());
        c
    }

    /// The preamble line naming the reference H0 of every row (one line
    /// for a one-species table; one clause per distinct reference
    /// otherwise).
    pub(crate) fn reference_line(&self) -> String {
        let mut groups: Vec<(&str, Vec<&str>)> = Vec::new();
        for r in &self.rows {
            match groups.iter_mut().find(|g| g.0 == r.reference) {
                Some(g) if !g.1.contains(&r.species.as_str()) => g.1.push(&r.species),
                Some(_) => {}
                None => groups.push((&r.reference, vec![&r.species])),
            }
        }
        let clauses: Vec<String> = match groups.as_slice() {
            [(only, _)] => vec![only.to_string()],
            many => many
                .iter()
                .map(|(r, sp)| format!("{}: {r}", sp.join(", ")))
                .collect(),
        };
        format!(
            "{}; S conventional (nuclear spin excluded), S_total with it",
            clauses.join("; ")
        )
    }
}

impl Tabular for MolarTable {
    fn preamble(&self) -> Vec<String> {
        let first = self.rows.first();
        let mut lines = vec![
            format!(
                "{}: ideal-gas thermodynamic functions per {} at p = {} Pa from exact sums",
                first.map(|r| r.species.as_str()).unwrap_or(""),
                basis_name(self.basis),
                first.map(|r| r.p.as_str()).unwrap_or("")
            ),
            self.reference_line(),
            degeneracy_note(first.map(|r| r.degeneracy.quantum_tolerance).unwrap_or(0.0)),
            "ideal-gas model values: design decisions follow certified property data, local \
             codes and licensed engineering practice"
                .into(),
        ];
        lines.extend(self.warnings().into_iter().map(|w| format!("warning: {w}")));
        lines
    }

    fn columns(&self) -> Vec<Column> {
        Self::columns_for(self.rows.iter().any(|r| r.isomer.is_some()), self.basis)
    }

    fn rows(&self) -> Vec<Vec<String>> {
        let iso = self.rows.iter().any(|r| r.isomer.is_some());
        self.rows
            .iter()
            .map(|r| {
                let mut v = vec![r.t.clone()];
                if iso {
                    v.push(r.isomer.clone().unwrap_or_default());
                    v.push(r.ortho_fraction.clone().unwrap_or_default());
                }
                v.extend([
                    r.s.clone(),
                    r.s_total.clone(),
                    r.cp.clone(),
                    r.cv.clone(),
                    r.h.clone(),
                    r.g.clone(),
                ]);
                v.extend(degeneracy_cells(&r.degeneracy));
                v
            })
            .collect()
    }
}
