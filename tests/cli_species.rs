//! `zsum species`, `zsum thermo SPECIES` and `zsum hydrogen` end to end.

mod common;

use common::{json, refused, run};

/// CODATA Key Values (1989), S°(N2, 298.15 K, 1 bar) = 191.609 J/(mol K)
/// (from memory); Cp° = 29.124 J/(mol K) (same source, from memory).
#[test]
fn thermo_of_a_species_as_json() {
    let v = json(&[
        "thermo", "N2", "--T", "298.15", "--per", "mole", "--format", "json",
    ]);
    assert_eq!(v["species"], "N2");
    assert_eq!(v["T"], "298.15");
    assert_eq!(v["p"], "100000");
    let s: f64 = v["S"].as_str().unwrap().parse().unwrap();
    assert!((s - 191.609).abs() < 0.01, "{s}");
    let cp: f64 = v["Cp"].as_str().unwrap().parse().unwrap();
    assert!((cp - 29.124).abs() < 0.01, "{cp}");
    assert_eq!(v["units"]["S"], "J/(mol K)");
    assert!(v["H_minus_H0"].as_str().is_some());
    // A grid gives a list; 1 atm lowers S by R ln(1.01325).
    let g = json(&[
        "thermo",
        "Ar",
        "--T",
        "100:300:100",
        "--p",
        "1atm",
        "--format",
        "json",
    ]);
    assert_eq!(g.as_array().unwrap().len(), 3);
    let s_atm: f64 = g[2]["S"].as_str().unwrap().parse().unwrap();
    let s_bar: f64 = json(&["thermo", "Ar", "--T", "300", "--format", "json"])["S"]
        .as_str()
        .unwrap()
        .parse()
        .unwrap();
    assert!((s_bar - s_atm - 8.314462618 * 1.01325f64.ln()).abs() < 1e-6);
}

#[test]
fn species_list_and_show_name_sources() {
    let out = run(&["species", "list"]);
    let text = String::from_utf8_lossy(&out.stdout);
    for n in [
        "He", "Ne", "Ar", "Kr", "Xe", "H2", "HD", "D2", "N2", "O2", "CO", "NO", "HCl",
    ] {
        assert!(
            text.lines().any(|l| l.starts_with(&format!("{n} "))),
            "{n}: {text}"
        );
    }
    let v = json(&["species", "show", "O2", "--format", "json"]);
    let consts = v["constants"].as_array().unwrap();
    assert!(consts
        .iter()
        .all(|c| !c["source"].as_str().unwrap().is_empty()));
    assert!(consts
        .iter()
        .any(|c| c["quantity"] == "B_e" && c["unit"] == "cm-1"));
}

/// At 20.28 K (Woolley, Scott and Brickwedde 1948, from memory):
/// conversion heat about 1.06 kJ/mol; equilibrium para fraction about 0.998.
#[test]
fn hydrogen_json_rows() {
    let v = json(&["hydrogen", "--T", "20.28", "--format", "json"]);
    let row = &v[0];
    assert_eq!(row["isomer"], "normal");
    let q: f64 = row["conversion_heat"].as_str().unwrap().parse().unwrap();
    assert!((q - 1060.0).abs() < 10.0);
    let x: f64 = row["ortho_fraction"].as_str().unwrap().parse().unwrap();
    assert_eq!(x, 0.75);
    let rows = json(&[
        "hydrogen",
        "--T",
        "10:300:10",
        "--isomer",
        "fraction=0.5",
        "--format",
        "json",
    ]);
    assert_eq!(rows.as_array().unwrap().len(), 30);
    assert_eq!(rows[0]["ortho_fraction"], "0.5000000000");
    let md = run(&["hydrogen", "--T", "20:40:10", "--format", "markdown"]);
    let text = String::from_utf8_lossy(&md.stdout);
    assert!(text.contains("| T (K) | isomer |"), "{text}");
}

#[test]
fn bad_input_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("x.json");
    let o = out.to_str().unwrap();
    refused(&["thermo", "N3", "--T", "300", "-o", o], "did you mean N2");
    refused(
        &["thermo", "Ar", "--T", "300", "--p", "0", "-o", o],
        "greater than zero",
    );
    refused(
        &["thermo", "Ar", "--T", "300", "--p", "-5", "-o", o],
        "greater than zero",
    );
    refused(
        &["hydrogen", "--T", "20", "--isomer", "fraction=1.2", "-o", o],
        "between 0 and 1",
    );
    refused(
        &["thermo", "CO", "--T", "300", "--isomer", "para", "-o", o],
        "ortho and para",
    );
    let bad = dir.path().join("mine.toml");
    std::fs::write(
        &bad,
        "[[species]]\nname = \"Q2\"\ndescription = \"d\"\nkind = \"linear\"\nmass = { value = \"2\", source = \"s\" }\n",
    )
    .unwrap();
    refused(
        &[
            "species",
            "list",
            "--species-file",
            bad.to_str().unwrap(),
            "-o",
            o,
        ],
        "unit",
    );
    let hetero = dir.path().join("hetero.toml");
    std::fs::write(
        &hetero,
        "[[species]]\nname = \"Q2\"\ndescription = \"d\"\nkind = \"linear\"\nhomonuclear = false\nmass = { value = \"2\", unit = \"u\", source = \"s\" }\nnuclear_spin = \"1/2\"\nrotation = { B_e = \"1\", unit = \"cm-1\", source = \"s\" }\nvibration = { we = \"1000\", unit = \"cm-1\", source = \"s\" }\nelectronic = { levels = [ { energy = \"0\", degeneracy = 1 } ], unit = \"cm-1\", source = \"s\" }\n",
    )
    .unwrap();
    refused(
        &[
            "species",
            "list",
            "--species-file",
            hetero.to_str().unwrap(),
            "-o",
            o,
        ],
        "heteronuclear",
    );
    assert!(!out.exists());
}

#[test]
fn report_writes_a_folder_or_refuses() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("r");
    let o = run(&["report", "--out", out.to_str().unwrap()]);
    assert!(o.status.success());
    let text = String::from_utf8_lossy(&o.stdout);
    assert!(
        text.contains("normal -> equilibrium heat") && text.contains("caution"),
        "{text}"
    );
    assert!(out.join("index.html").exists());
    let file = dir.path().join("f");
    std::fs::write(&file, "").unwrap();
    refused(&["report", "--out", file.to_str().unwrap()], "not a folder");
}
