//! Units in every output format: the table, CSV and Markdown headings are
//! the same list, every physical column states its unit, and every JSON
//! `units` block names fields that the answer really carries, with the
//! units the headings show (both come from one column list).

mod common;

use common::run;
use serde_json::Value;

/// Runs zsum with `args` plus `--format FORMAT`, requiring success.
fn output(args: &[&str], format: &str) -> String {
    let mut a: Vec<&str> = args.to_vec();
    a.extend(["--format", format]);
    let out = run(&a);
    assert!(
        out.status.success(),
        "{a:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

/// The CSV header row, split (no heading holds a comma but inside quotes).
fn csv_headings(csv: &str) -> Vec<String> {
    let mut r = csv::Reader::from_reader(csv.as_bytes());
    r.headers().unwrap().iter().map(String::from).collect()
}

/// The first `|` row of a Markdown table.
fn markdown_headings(md: &str) -> Vec<String> {
    let line = md.lines().find(|l| l.starts_with("| ")).unwrap();
    line.trim_matches('|')
        .split(" | ")
        .map(|c| c.trim().replace("\\|", "|"))
        .collect()
}

/// Every `units` object in a JSON answer, with the object that holds it.
fn units_blocks(v: &Value, out: &mut Vec<(serde_json::Map<String, Value>, Value)>) {
    match v {
        Value::Object(m) => {
            if let Some(Value::Object(u)) = m.get("units") {
                out.push((u.clone(), v.clone()));
            }
            for x in m.values() {
                units_blocks(x, out);
            }
        }
        Value::Array(a) => a.iter().for_each(|x| units_blocks(x, out)),
        _ => {}
    }
}

/// Whether `key` is a field anywhere in `v`.
fn has_field(v: &Value, key: &str) -> bool {
    match v {
        Value::Object(m) => m
            .iter()
            .filter(|(k, _)| k.as_str() != "units")
            .any(|(k, x)| k == key || has_field(x, key)),
        Value::Array(a) => a.iter().any(|x| has_field(x, key)),
        _ => false,
    }
}

/// The unit in a heading `name (unit)`, if any.
fn unit_of(heading: &str) -> Option<&str> {
    let open = heading.find(" (")?;
    heading[open + 2..].strip_suffix(')')
}

/// Checks one command in every format and returns its headings.
fn check(args: &[&str]) -> Vec<String> {
    let csv = csv_headings(&output(args, "csv"));
    let md = markdown_headings(&output(args, "markdown"));
    assert_eq!(csv, md, "{args:?}: CSV and Markdown headings differ");
    let table = output(args, "table");
    let head = table.lines().find(|l| !l.starts_with('#')).unwrap();
    for h in &csv {
        assert!(
            head.contains(h.as_str()),
            "{args:?}: table lacks {h:?}: {head}"
        );
    }
    let json: Value = serde_json::from_str(&output(args, "json")).unwrap();
    let mut blocks = Vec::new();
    units_blocks(&json, &mut blocks);
    assert!(!blocks.is_empty(), "{args:?}: no JSON units block");
    let mut json_units = Vec::new();
    for (units, holder) in &blocks {
        for (k, u) in units {
            assert!(
                has_field(holder, k),
                "{args:?}: the units block names {k:?}, which no field carries"
            );
            json_units.push(u.as_str().unwrap().to_string());
        }
    }
    for h in &csv {
        if let Some(u) = unit_of(h) {
            assert!(
                json_units.iter().any(|j| j == u),
                "{args:?}: heading {h:?} has a unit the JSON units block lacks: {json_units:?}"
            );
        }
    }
    csv
}

/// Requires each of `want` among the headings.
fn has_all(headings: &[String], want: &[&str]) {
    for w in want {
        assert!(
            headings.iter().any(|h| h == w),
            "missing heading {w:?} in {headings:?}"
        );
    }
}

#[test]
fn thermodynamic_tables_state_their_units() {
    let h = check(&["thermo", "rotor", "--B", "2", "--T", "300", "--per", "mole"]);
    has_all(
        &h,
        &[
            "T (K)",
            "U (J/mol)",
            "Cv (J/(mol K))",
            "S (J/(mol K))",
            "F (J/mol)",
        ],
    );
    let h = check(&[
        "thermo", "rotor", "--B", "2", "--T", "300", "--per", "particle",
    ]);
    has_all(&h, &["U (J)", "S (J/K)"]);
    let h = check(&["sum", "rotor", "--B", "2", "--kT", "1"]);
    has_all(&h, &["kT (cm-1)", "q", "ln q"]);
}

#[test]
fn gas_tables_state_their_units_per_mole_kg_and_particle() {
    let h = check(&["thermo", "N2", "--T", "300"]);
    has_all(
        &h,
        &[
            "T (K)",
            "S (J/(mol K))",
            "S_total (J/(mol K))",
            "Cp (J/(mol K))",
            "H-H0 (J/mol)",
            "-(G-H0)/T (J/(mol K))",
            "nLambda^3 (dimensionless)",
        ],
    );
    has_all(
        &check(&["thermo", "N2", "--T", "300", "--per", "kg"]),
        &["Cp (J/(kg K))", "H-H0 (J/kg)"],
    );
    has_all(
        &check(&["thermo", "Ar", "--T", "300", "--per", "particle"]),
        &["S (J/K)", "H-H0 (J)"],
    );
    let h = check(&["hydrogen", "--T", "20,77"]);
    has_all(
        &h,
        &[
            "Cp (J/(mol K))",
            "H-H0 (J/mol)",
            "normal->eq. heat (J/mol)",
            "normal->eq. heat (kJ/kg)",
            "ortho->para heat (J/mol)",
            "Cp para (J/(mol K))",
        ],
    );
    has_all(
        &check(&["hydrogen", "--T", "20", "--species", "D2"]),
        &["para->ortho heat (J/mol)"],
    );
    has_all(&check(&["species", "list"]), &["mass (u)"]);
}

#[test]
fn listings_and_maps_state_their_units() {
    let h = check(&[
        "levels", "rotor", "--B", "2", "--up-to", "30", "--also", "K",
    ]);
    has_all(&h, &["E (cm-1)", "E (K)", "J", "degeneracy"]);
    let h = check(&[
        "levels", "box", "--up-to", "12", "--mass", "4u", "--side", "1nm", "--also", "meV",
    ]);
    has_all(&h, &["E (h^2/(8 m L^2))", "E (meV)"]);
    has_all(
        &check(&["count", "box", "--up-to", "100"]),
        &["E up to (h^2/(8 m L^2))"],
    );
    has_all(
        &check(&["compare", "oscillator", "--freq", "1000", "--T", "300,600"]),
        &["T (K)", "T/θ"],
    );
    has_all(
        &check(&["crossover", "rotor", "--B", "1"]),
        &["T (K)", "kT (cm-1)"],
    );
    let trap = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/systems/atom_trap.toml"
    );
    has_all(
        &check(&[
            "ensemble",
            "--system",
            trap,
            "--particles",
            "5",
            "--stats",
            "bose",
            "--T",
            "1,2",
        ]),
        &["T (K)", "precision (bits)"],
    );
}
