//! `zsum report`: a well-formed self-contained page that names its sources
//! and embeds every plot, plus CSV files; nothing partial on failure.

use zsum::species::liquefier::{build_report, write_report, CAUTION};

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
    for (name, rows) in [("hydrogen.csv", 79), ("species_298K.csv", 13)] {
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
