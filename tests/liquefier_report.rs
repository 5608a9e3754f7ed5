//! `zsum report`: a well-formed self-contained page that names its sources
//! and embeds every plot, plus CSV files; nothing partial on failure.

mod common;

use common::n_lambda3;
use zsum::report::liquefier::{build_report, write_report, CAUTION};

#[test]
fn the_report_is_well_formed_and_complete() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("rep");
    let summary = write_report(&out).unwrap();
    assert_eq!(summary.files.len(), 4);
    let html = std::fs::read_to_string(out.join("index.html")).unwrap();
    assert!(html.starts_with("<!DOCTYPE html>"));
    // Written as well-formed markup: parse it as XML after the doctype.
    let body = html.trim_start_matches("<!DOCTYPE html>");
    let doc = roxmltree::Document::parse(body).expect("well-formed page");
    let svgs: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("svg"))
        .collect();
    assert_eq!(svgs.len(), 3, "three inline plots");
    let texts = |n: &roxmltree::Node| -> Vec<String> {
        n.descendants()
            .filter(|d| d.has_tag_name("text"))
            .map(|d| d.text().unwrap_or("").trim().to_string())
            .collect()
    };
    for want in ["normal", "equilibrium", "para"] {
        assert!(texts(&svgs[0]).iter().any(|t| t == want), "{want}");
    }
    assert!(texts(&svgs[1])
        .iter()
        .any(|t| t == "equilibrium ortho fraction"));
    assert!(texts(&svgs[2]).iter().any(|t| t == "normal to equilibrium"));
    assert!(html.contains(CAUTION));
    for source in ["Huber", "Woolley", "Sackur", "CODATA 2018", "CIAAW"] {
        assert!(html.contains(source), "{source} not named");
    }
    // The conversion heat printed lies near 1.06 kJ/mol (Woolley, Scott and
    // Brickwedde 1948, from memory).
    let at = html
        .find("heat released converting normal to equilibrium")
        .unwrap();
    let tail = &html[at..];
    let start = tail.find("<strong>").unwrap() + 8;
    let value: f64 = tail[start..].split(' ').next().unwrap().parse().unwrap();
    assert!((1000.0..1100.0).contains(&value), "{value}");
    // CSV files parse with a header and rows.
    // One species row per built-in species.
    let species = zsum::species::Database::builtin().unwrap().all().len();
    assert!(species >= 15, "{species}");
    for (name, rows) in [("hydrogen.csv", 79), ("species_298K.csv", species)] {
        let mut r = csv::Reader::from_path(out.join(name)).unwrap();
        assert!(!r.headers().unwrap().is_empty());
        assert_eq!(r.records().count(), rows, "{name}");
    }
    assert!(summary.lines.iter().any(|l| l.contains("J/mol")));
}

#[test]
fn a_file_in_the_way_is_refused_and_nothing_is_written() {
    let dir = tempfile::tempdir().unwrap();
    let blocker = dir.path().join("rep");
    std::fs::write(&blocker, "x").unwrap();
    let e = write_report(&blocker).unwrap_err();
    assert!(e.to_string().contains("not a folder"), "{e}");
    assert_eq!(std::fs::read_to_string(&blocker).unwrap(), "x");
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    // Building without writing gives the same four files.
    let names: Vec<String> = build_report().unwrap().into_iter().map(|f| f.0).collect();
    assert_eq!(
        names,
        [
            "index.html",
            "hydrogen.csv",
            "species_298K.csv",
            "summary.txt"
        ]
    );
}

/// The report prints 8 digits, tolerance 1e-8. At 298.15 K and 1 bar the
/// first quantum correction nΛ³/2^(5/2) (standard result) is 5.5e-7 for He
/// (m = 4.002602 u) and 2.9e-9 for Xe (m = 131.293 u, CIAAW 2013 from
/// memory), both computed here: He is flagged, Xe is not. Every hydrogen
/// row (10 K to 400 K) is flagged, the caution stays, and the page and the
/// summary say why.
#[test]
fn the_report_marks_rows_where_classical_translation_is_not_exact() {
    let files = build_report().unwrap();
    let get = |name: &str| {
        files
            .iter()
            .find(|f| f.0 == name)
            .map(|f| f.1.clone())
            .unwrap()
    };
    let species = get("species_298K.csv");
    let mut r = csv::Reader::from_reader(species.as_bytes());
    let h = r.headers().unwrap().clone();
    let col = h
        .iter()
        .position(|c| c == "nLambda^3 (dimensionless)")
        .unwrap();
    let flag = h.iter().position(|c| c == "flag").unwrap();
    let rows: Vec<csv::StringRecord> = r.records().map(|x| x.unwrap()).collect();
    let row = |n: &str| rows.iter().find(|r| &r[0] == n).unwrap().clone();
    for (name, mass, flagged) in [("He", 4.002602, true), ("Xe", 131.293, false)] {
        let want = n_lambda3(mass, 298.15, 1e5);
        let got: f64 = row(name)[col].parse().unwrap();
        // Printed to 4 significant digits.
        assert!((got / want - 1.0).abs() < 5e-4, "{name}: {got} vs {want}");
        let c = want / 2f64.powf(2.5);
        assert_eq!(c > 1e-8, flagged, "{name}: c = {c}");
        assert_eq!(&row(name)[flag] == "*", flagged, "{name}");
    }
    let hydrogen = get("hydrogen.csv");
    let mut r = csv::Reader::from_reader(hydrogen.as_bytes());
    let flag = r
        .headers()
        .unwrap()
        .iter()
        .position(|c| c == "flag")
        .unwrap();
    assert!(r.records().all(|x| &x.unwrap()[flag] == "*"));
    let html = get("index.html");
    assert!(html.contains(CAUTION));
    assert!(html.contains("Where classical translation is not exact"));
    assert!(html.contains("He at p = 100000 Pa: the row is flagged *"));
    assert!(!html.contains("Xe at p = 100000 Pa"));
    let summary = get("summary.txt");
    assert!(summary.contains("rows are marked *") && summary.contains("caution"));
}
