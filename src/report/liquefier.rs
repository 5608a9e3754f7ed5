//! `zsum report`: the invented liquefier scenario
//! ([`crate::species::liquefier`]) written as one self-contained HTML page
//! (inline SVG plots, tables, sources) plus CSV files. The page names the
//! source or model of every figure.

use super::molar::{degeneracy_cells, degeneracy_note};
use super::{HydrogenTable, MolarTable, SpeciesCard};
use crate::error::{Error, ErrorKind, Result};
use crate::export::{to_csv, write_atomic, Column, Tabular};
use crate::plot::{render_svg, Panel, Series};
use crate::species::liquefier::{
    curves, Liquefier, BOILING_POINT_K, FIGURE_T, LATENT_HEAT_J_PER_MOL, LIQUID_DENSITY,
    LITRES_PER_HOUR,
};
use crate::species::{Basis, Database};
use std::path::{Path, PathBuf};

/// The caution every report carries.
pub const CAUTION: &str = "These are ideal-gas model values; design decisions follow certified \
                           property data, local codes and licensed engineering practice.";

/// What `zsum report` wrote.
#[derive(Debug, Clone)]
pub struct ReportSummary {
    /// The folder.
    pub dir: PathBuf,
    /// Every file written.
    pub files: Vec<PathBuf>,
    /// A short summary for the terminal.
    pub lines: Vec<String>,
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn html_table<T: Tabular>(t: &T) -> String {
    let mut out = String::from("<div class=\"wide\"><table>\n<thead><tr>");
    for c in t.columns() {
        out.push_str(&format!("<th>{}</th>", esc(&c.heading())));
    }
    out.push_str("</tr></thead>\n<tbody>\n");
    for r in t.rows() {
        out.push_str("<tr>");
        for c in r {
            out.push_str(&format!("<td>{}</td>", esc(&c)));
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</tbody>\n</table></div>\n");
    out
}

/// The size of each figure of the report, in pixels: width, panel height.
pub const FIGURE_SIZE: (u32, u32) = (860, 380);

fn inline_svg(panels: &[Panel]) -> Result<String> {
    let svg = render_svg(panels, FIGURE_SIZE.0, FIGURE_SIZE.1)?;
    let body = match svg.find("<svg") {
        Some(i) => &svg[i..],
        None => svg.as_str(),
    };
    Ok(format!("<figure>\n{body}\n</figure>\n"))
}

fn series(name: &str, points: Vec<(f64, f64)>, colour: usize) -> Series {
    Series {
        name: name.into(),
        points,
        dashed: false,
        colour: Some(colour),
    }
}

fn panel(title: &str, y: &str, s: Vec<Series>) -> Panel {
    Panel {
        title: title.into(),
        x_label: "T / K".into(),
        y_label: y.into(),
        log_x: true,
        series: s,
        vlines: vec![(format!("n.b.p. {BOILING_POINT_K} K"), BOILING_POINT_K)],
        x_range: Some(FIGURE_T),
        ..Panel::default()
    }
}

/// One hydrogen figure: title, y label, and per curve its name, its column
/// of [`crate::species::hydrogen::HydrogenGrid::series`] and its colour
/// slot.
type FigureSpec = (
    &'static str,
    &'static str,
    &'static [(&'static str, usize, usize)],
);

/// The report's hydrogen figures, each one panel: Cp of normal,
/// equilibrium and para hydrogen; the equilibrium ortho fraction; the heats
/// of conversion. All are drawn against a logarithmic T axis from 10 K to
/// 400 K, so that 10–30 K around the boiling point is not squeezed, at 61
/// temperatures evenly spaced in log T (closer than the table's 5 K steps
/// below 75 K), with the normal boiling point marked. One state keeps one
/// colour across them.
pub fn figures() -> Result<[Vec<Panel>; 3]> {
    let curves = curves()?;
    let spec: [FigureSpec; 3] = [
        (
            "H2 heat capacity Cp: normal, equilibrium and para",
            "Cp / (J/(mol K))",
            &[("normal", 0, 0), ("equilibrium", 1, 1), ("para", 2, 2)],
        ),
        (
            "equilibrium ortho fraction of H2",
            "equilibrium ortho fraction",
            &[("equilibrium ortho fraction", 3, 1)],
        ),
        (
            "H2 heats of conversion",
            "heat / (J/mol)",
            &[("normal to equilibrium", 4, 3), ("ortho to para", 5, 4)],
        ),
    ];
    Ok(spec.map(|(title, y, lines)| {
        let s = lines
            .iter()
            .map(|&(name, column, colour)| series(name, curves.series(column), colour))
            .collect();
        vec![panel(title, y, s)]
    }))
}

/// Builds the report's files in memory: `(file name, contents)`.
pub fn build_report() -> Result<Vec<(String, String)>> {
    let db = Database::builtin()?;
    // The scenario and the figures' curves are independent sweeps.
    let (scenario, figs) = rayon::join(Liquefier::compute, figures);
    let scenario = scenario?;
    let curves = HydrogenTable::new(&scenario.hydrogen);
    let species_rows = MolarTable::joined(&scenario.species, Basis::Mole);
    let Liquefier {
        kg_per_hour: kg_per_h,
        equilibrium_para_fraction: para_eq,
        conversion_heat: q_mol,
        conversion_heat_per_kg: q_kg,
        latent_heat_ratio,
        load_w,
        ..
    } = scenario;
    let warnings: Vec<String> = species_rows
        .warnings()
        .into_iter()
        .chain(curves.warnings())
        .collect();
    let flagged = |rows: &mut dyn Iterator<Item = bool>| rows.filter(|f| *f).count();
    let species_flagged = flagged(&mut species_rows.rows.iter().map(|r| r.degeneracy.quantum_flag));
    let hydrogen_flagged = flagged(&mut curves.rows.iter().map(|r| r.degeneracy.quantum_flag));
    let note = degeneracy_note(
        species_rows
            .rows
            .first()
            .map(|r| r.degeneracy.quantum_tolerance)
            .unwrap_or(0.0),
    );
    let warning_html: String = warnings
        .iter()
        .map(|w| format!("<li>{}</li>\n", esc(w)))
        .collect();
    let hydrogen_csv = to_csv(&curves)?;
    let species_csv = to_csv(&SpeciesRows(&species_rows))?;

    let [cp_plot, fraction_plot, heat_plot] = figs?;
    let cp_plot = inline_svg(&cp_plot)?;
    let fraction_plot = inline_svg(&fraction_plot)?;
    let heat_plot = inline_svg(&heat_plot)?;

    let sources = html_table(&SourceRows(
        db.all()
            .iter()
            .map(|sp| {
                Ok(SpeciesCard::new(sp)?
                    .constants
                    .into_iter()
                    .map(move |c| [sp.name.clone(), c.quantity, c.value, c.unit, c.source]))
            })
            .collect::<Result<Vec<_>>>()?
            .into_iter()
            .flatten()
            .collect(),
    ))
    .replace("<table>", "<table class=\"text\">");
    let html = format!(
        r#"<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8"/>
<title>Conversion load of the Harrow Fen hydrogen liquefier (zsum report)</title>
<style>
body {{ font-family: sans-serif; max-width: 60em; margin: 2em auto; line-height: 1.45; color: #111; }}
table {{ border-collapse: collapse; font-size: 0.85em; margin: 1em 0; }}
th, td {{ border: 1px solid #bbb; padding: 0.2em 0.5em; text-align: right; }}
th {{ background: #eee; }}
.caution {{ border: 2px solid #a33; background: #fff3f3; padding: 0.6em 1em; }}
figure {{ margin: 1em 0; }}
.wide {{ overflow-x: auto; }}
table.text td {{ text-align: left; }}
table.text td:nth-child(4) {{ white-space: nowrap; }}
</style>
</head>
<body>
<h1>Conversion load of the Harrow Fen hydrogen liquefier</h1>
<p class="caution"><strong>Caution.</strong> {caution}</p>
<p>A worked scenario (fictional): the Harrow Fen cryogenics laboratory runs a small
liquefier making {litres} L of liquid hydrogen an hour ({kg:.3} kg/h at a liquid density
of {rho} kg/m<sup>3</sup>, common practice). Warm hydrogen is normal: three quarters ortho.
Liquefied without a conversion catalyst it keeps that ortho fraction and then converts
slowly towards equilibrium at 20.28 K, releasing heat in the dewar.</p>
<h2>Result at the normal boiling point, 20.28 K</h2>
<ul>
<li>equilibrium para fraction: <strong>{para:.4}</strong></li>
<li>heat released converting normal to equilibrium hydrogen: <strong>{qmol:.1} J/mol</strong>
= <strong>{qkg:.1} kJ/kg</strong></li>
<li>compared with the latent heat of vaporisation, about {latent:.0} J/mol (common practice,
from memory): the conversion heat is {ratio:.2} times larger, enough to boil off the
liquid it is released in</li>
<li>continuous heat load if the whole product were left unconverted:
<strong>{load:.1} W</strong> ({kg:.3} kg/h × {qkg:.1} kJ/kg)</li>
</ul>
<p>For comparison, the standard compilation of hydrogen's ortho/para properties
(Woolley, Scott and Brickwedde, 1948, from memory) gives about 0.998 for the para
fraction and about 1.06 kJ/mol (525 kJ/kg) for the conversion heat.</p>
<h2>Heat capacity of normal, equilibrium and para hydrogen</h2>
{cp_plot}
<h2>Equilibrium ortho fraction</h2>
{fraction_plot}
<h2>Heats of conversion</h2>
{heat_plot}
<h2>Standard molar functions at 298.15 K and 1 bar</h2>
<p>{reference}. {note}.</p>
{species_table}
<h2>Hydrogen from 10 K to 400 K (normal hydrogen, ortho fraction 0.75: S and H − H0 from each isomer's own lowest level; Cp of each state; conversion heats)</h2>
{hydrogen_table}
<h2>Where classical translation is not exact</h2>
<p>Sackur–Tetrode translation counts the molecules by Boltzmann statistics. The first
correction for their Bose or Fermi statistics is of relative size nΛ<sup>3</sup>/2<sup>5/2</sup>
(n = p/kT, Λ = h/sqrt(2π m kT); standard result); rows where it exceeds the tolerance
of the printed digits are marked * ({species_flagged} of {species_count} species rows,
{hydrogen_flagged} of {hydrogen_count} hydrogen rows). The conversion heats are internal
and do not depend on it.</p>
<ul class="warnings">
{warning_html}</ul>
<h2>Sources and models</h2>
<ul>
<li>Model: ideal gas at 1 bar; translation by Sackur–Tetrode; rotation and vibration
by exact sums over the vibrating-rotor levels (anharmonic G(v), B<sub>v</sub> = B<sub>e</sub> −
α<sub>e</sub>(v + 1/2), centrifugal D<sub>e</sub>) with nuclear-spin statistics
(H2: para even J weight 1, ortho odd J weight 3); electronic levels as listed per species.
Every printed digit of every sum is certified by zsum's engine; where the
first quantum-statistics correction to Sackur–Tetrode translation exceeds the printed
tolerance, the row is marked * (see above).</li>
<li>Conventions: H0 is the lowest level; for a frozen spin-isomer mixture (normal
hydrogen, the state of freshly liquefied gas) each isomer keeps its own lowest level as
its H0, so that H − H0 and −(G − H0)/T start from zero; conventional entropy S excludes
nuclear spin as the standard tables do; S_total includes it.</li>
<li>Constants: SI 2019 exact defining constants; atomic mass constant CODATA 2018.</li>
<li>Comparison values: Woolley, Scott and Brickwedde (1948), from memory; liquid density
and latent heat: common practice, from memory.</li>
</ul>
<h3>Every constant of every species, with its unit and source</h3>
{sources}
<p>Files: <a href="hydrogen.csv">hydrogen.csv</a>, <a href="species_298K.csv">species_298K.csv</a>.</p>
</body>
</html>
"#,
        caution = esc(CAUTION),
        litres = LITRES_PER_HOUR,
        kg = kg_per_h,
        rho = LIQUID_DENSITY,
        para = para_eq,
        qmol = q_mol,
        qkg = q_kg,
        latent = LATENT_HEAT_J_PER_MOL,
        ratio = latent_heat_ratio,
        load = load_w,
        note = esc(&note),
        species_count = species_rows.rows.len(),
        hydrogen_count = curves.rows.len(),
        reference = esc(&species_rows.reference_line()),
        species_table = html_table(&SpeciesRows(&species_rows)),
        hydrogen_table = html_table(&HydrogenRows(&curves)),
    );
    Ok(vec![
        ("index.html".into(), html),
        ("hydrogen.csv".into(), hydrogen_csv),
        ("species_298K.csv".into(), species_csv),
        (
            "summary.txt".into(),
            summary_lines(
                para_eq,
                q_mol,
                q_kg,
                load_w,
                species_flagged + hydrogen_flagged,
            )
            .join("\n")
                + "\n",
        ),
    ])
}

fn summary_lines(para: f64, q_mol: f64, q_kg: f64, load_w: f64, flagged: usize) -> Vec<String> {
    let mut lines = vec![
        "Harrow Fen liquefier (fictional scenario), hydrogen at 20.28 K:".into(),
        format!("  equilibrium para fraction        {para:.4}"),
        format!("  normal -> equilibrium heat       {q_mol:.1} J/mol = {q_kg:.1} kJ/kg"),
        format!("  load for 10 L/h unconverted      {load_w:.1} W"),
    ];
    if flagged > 0 {
        lines.push(format!(
            "  warning: {flagged} table rows are marked *: there the first quantum correction \
             nLambda^3/2^(5/2) to their classical (Sackur-Tetrode) S, Cp and H exceeds the \
             printed tolerance; the conversion heats do not depend on it (see the report)"
        ));
    }
    lines.push(format!("  caution: {CAUTION}"));
    lines
}

/// The species table with the species name as first column.
struct SpeciesRows<'a>(&'a MolarTable);

impl Tabular for SpeciesRows<'_> {
    fn preamble(&self) -> Vec<String> {
        self.0.preamble()
    }
    fn columns(&self) -> Vec<Column> {
        std::iter::once(Column::plain("species"))
            .chain(
                MolarTable::columns_for(false, Basis::Mole)
                    .into_iter()
                    .filter(|c| c.name != "Cv"),
            )
            .collect()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.0
            .rows
            .iter()
            .map(|r| {
                vec![
                    r.species.clone(),
                    r.t.clone(),
                    r.s.clone(),
                    r.s_total.clone(),
                    r.cp.clone(),
                    r.h.clone(),
                    r.g.clone(),
                ]
                .into_iter()
                .chain(degeneracy_cells(&r.degeneracy))
                .collect()
            })
            .collect()
    }
}

/// The hydrogen table of the page: normal hydrogen's rows without the
/// columns that repeat (its isomer and ortho fraction, which the heading
/// names, and its Cp, which is `Cp normal`); the CSV file keeps them all.
struct HydrogenRows<'a>(&'a HydrogenTable);

impl HydrogenRows<'_> {
    const DROPPED: [&'static str; 3] = ["isomer", "ortho fraction", "Cp"];
    fn kept(&self) -> Vec<bool> {
        self.0
            .columns()
            .iter()
            .map(|c| !Self::DROPPED.contains(&c.name.as_str()))
            .collect()
    }
}

impl Tabular for HydrogenRows<'_> {
    fn preamble(&self) -> Vec<String> {
        self.0.preamble()
    }
    fn columns(&self) -> Vec<Column> {
        let keep = self.kept();
        let cols = self.0.columns().into_iter().zip(keep);
        cols.filter(|(_, k)| *k).map(|(c, _)| c).collect()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        let keep = self.kept();
        self.0
            .rows()
            .into_iter()
            .map(|r| {
                r.into_iter()
                    .zip(&keep)
                    .filter(|(_, k)| **k)
                    .map(|(c, _)| c)
                    .collect()
            })
            .collect()
    }
}

/// Every species constant with its unit and source, one row each.
struct SourceRows(Vec<[String; 5]>);

impl Tabular for SourceRows {
    fn preamble(&self) -> Vec<String> {
        Vec::new()
    }
    fn columns(&self) -> Vec<Column> {
        ["species", "constant", "value", "unit", "source"]
            .map(Column::plain)
            .to_vec()
    }
    fn rows(&self) -> Vec<Vec<String>> {
        self.0.iter().map(|r| r.to_vec()).collect()
    }
}

/// Writes the report into `dir` (created if missing): every file is built
/// first, then each written atomically, so nothing partial appears.
pub fn write_report(dir: &Path) -> Result<ReportSummary> {
    if dir.exists() && !dir.is_dir() {
        return Err(Error::new(
            ErrorKind::Io,
            format!(
                "report folder {:?} exists and is not a folder; choose another folder",
                dir.display().to_string()
            ),
        ));
    }
    let files = build_report()?;
    std::fs::create_dir_all(dir).map_err(|e| {
        Error::new(
            ErrorKind::Io,
            format!(
                "cannot create report folder {:?}: {e}",
                dir.display().to_string()
            ),
        )
    })?;
    let mut written = Vec::new();
    let mut lines = Vec::new();
    for (name, text) in &files {
        let path = dir.join(name);
        write_atomic(&path, text)?;
        if name == "summary.txt" {
            lines = text.lines().map(String::from).collect();
        }
        written.push(path);
    }
    lines.push(format!("  wrote {}", dir.join("index.html").display()));
    Ok(ReportSummary {
        dir: dir.to_path_buf(),
        files: written,
        lines,
    })
}
