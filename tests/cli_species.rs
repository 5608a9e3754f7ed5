//! `zsum species`, `zsum thermo SPECIES` and `zsum hydrogen` end to end.

mod common;

use common::{json, n_lambda3, refused, run, sig4};

/// CODATA Key Values (1989), S°(N2, 298.15 K, 1 bar) = 191.609 J/(mol K)
/// (from memory); Cp° = 29.124 J/(mol K) (same source, from memory).
#[test]
fn thermo_of_a_species_as_json() {
    // JSON keeps one shape: a list of rows, one for one temperature.
    let rows = json(&[
        "thermo", "N2", "--T", "298.15", "--per", "mole", "--format", "json",
    ]);
    assert_eq!(rows.as_array().unwrap().len(), 1);
    let v = &rows[0];
    assert_eq!(v["species"], "N2");
    assert_eq!(v["T"], "298.15");
    assert_eq!(v["p"], "100000");
    let s: f64 = v["S"].as_str().unwrap().parse().unwrap();
    assert!((s - 191.609).abs() < 0.01, "{s}");
    let cp: f64 = v["Cp"].as_str().unwrap().parse().unwrap();
    assert!((cp - 29.124).abs() < 0.01, "{cp}");
    assert_eq!(v["units"]["S"], "J/(mol K)");
    assert!(v["H_minus_H0"].as_str().is_some());
    // A grid gives a longer list; 1 atm lowers S by R ln(1.01325).
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
    let s_bar: f64 = json(&["thermo", "Ar", "--T", "300", "--format", "json"])[0]["S"]
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
        "nuclear-spin isomers",
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

// --- Quantum degeneracy of the translational gas -------------------------

/// He-4 at 4.2 K, 1 bar: nΛ³ ≈ 0.13 (computed here from CODATA 2018
/// constants with m = 4.002602 u). JSON carries the number and the flag,
/// CSV a dimensionless column with the same 4 printed digits and the flag,
/// the text table a `*`, and a warning names the digits that stand.
#[test]
fn helium_at_4_2_k_is_flagged_in_every_format() {
    let want = n_lambda3(4.002602, 4.2, 1e5);
    assert!((want - 0.13).abs() < 0.01, "{want}");
    let v = &json(&["thermo", "He", "--T", "4.2", "--format", "json"])[0];
    let got = v["n_lambda3"].as_f64().unwrap();
    assert!((got / want - 1.0).abs() < 1e-12, "{got} vs {want}");
    assert_eq!(v["quantum_flag"], true);
    assert_eq!(v["degeneracy_g"], 1);
    // c = nΛ³/2^(5/2) (standard result).
    let c = v["quantum_correction"].as_f64().unwrap();
    assert!((c / (want / 2f64.powf(2.5)) - 1.0).abs() < 1e-12);

    let out = run(&["thermo", "He", "--T", "4.2", "--format", "csv"]);
    assert!(out.status.success());
    let mut r = csv::Reader::from_reader(out.stdout.as_slice());
    let headers = r.headers().unwrap().clone();
    let col = headers
        .iter()
        .position(|h| h == "nLambda^3 (dimensionless)")
        .expect("nLambda^3 column");
    let flag = headers
        .iter()
        .position(|h| h == "flag")
        .expect("flag column");
    let row = r.records().next().unwrap().unwrap();
    assert_eq!(&row[col], sig4(want));
    assert_eq!(&row[flag], "*");
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("zsum: warning: He")
            && err.contains("wrong beyond about the 1st significant digit at T = 4.2 K")
            && err.contains("Bose/Fermi"),
        "{err}"
    );

    let out = run(&["thermo", "He", "--T", "4.2"]);
    let text = String::from_utf8_lossy(&out.stdout);
    let last = text.lines().last().unwrap();
    assert!(last.trim_end().ends_with('*'), "{text}");
    assert!(last.contains(&sig4(want)), "{text}");
    assert!(text.contains("# warning: He at p = 100000 Pa"), "{text}");
    // The safety caution stays.
    assert!(
        text.contains("certified property data, local codes and licensed engineering practice"),
        "{text}"
    );
}

/// He at 300 K, 1 bar: nΛ³ ≈ 3.1e-6 and c = nΛ³/2^(5/2) ≈ 5.5e-7 (standard
/// result): not flagged at 6 digits (tolerance 1e-6), no warning; flagged
/// at the default 10 digits, whose tolerance 1e-10 it exceeds.
#[test]
fn helium_at_300_k_is_not_flagged_at_6_digits() {
    let want = n_lambda3(4.002602, 300.0, 1e5);
    let out = run(&[
        "thermo", "He", "--T", "300", "--digits", "6", "--format", "json",
    ]);
    assert!(out.status.success());
    let rows: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let v = &rows[0];
    assert!((v["n_lambda3"].as_f64().unwrap() / want - 1.0).abs() < 1e-12);
    assert_eq!(v["quantum_flag"], false);
    assert!(
        out.stderr.is_empty(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = run(&["thermo", "He", "--T", "300", "--digits", "6"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(!text.contains("warning"), "{text}");
    assert!(!text.lines().last().unwrap().contains('*'), "{text}");
    let v = json(&["thermo", "He", "--T", "300", "--format", "json"]);
    assert_eq!(v[0]["quantum_flag"], true);
}

/// Issue case: `zsum thermo He --T 0.1` printed S = −40.1 J/(mol K). nΛ³ ≈
/// 1.5e3 there (computed here, CODATA 2018): refused, exit 2, nothing on
/// standard output, the message naming nΛ³, T and p.
#[test]
fn issue_thermo_he_at_0_1_k_is_refused() {
    let x = n_lambda3(4.002602, 0.1, 1e5);
    refused(
        &["thermo", "He", "--T", "0.1"],
        &format!("nΛ³ = {} (", sig4(x)),
    );
    refused(
        &["thermo", "He", "--T", "0.1"],
        "T = 0.1 K and p = 100000 Pa",
    );
    refused(
        &["thermo", "He", "--T", "0.1", "--format", "json"],
        "ensemble",
    );
}

/// Issue case: `zsum thermo H2 --T 1` printed S_total = −0.83 J/(mol K).
/// nΛ³ ≈ 13 there (computed here, CODATA 2018; m = 2.01565006446 u,
/// AME2016 from memory): refused.
#[test]
fn issue_thermo_h2_at_1_k_is_refused() {
    let x = n_lambda3(2.01565006446, 1.0, 1e5);
    assert!((x - 13.0).abs() < 1.0, "{x}");
    refused(
        &["thermo", "H2", "--T", "1"],
        &format!("nΛ³ = {} (", sig4(x)),
    );
    refused(&["thermo", "H2", "--T", "1"], "raise T");
}

/// He at 1 K (nΛ³ ≈ 4.8, computed here): refused, also inside a grid, in a
/// box and for a file output, which is then not written; H2 at 2 K in the
/// hydrogen table too.
#[test]
fn degenerate_rows_are_refused_and_nothing_partial_is_written() {
    let x = n_lambda3(4.002602, 1.0, 1e5);
    let needle = format!("nΛ³ = {} (", sig4(x));
    refused(&["thermo", "He", "--T", "1"], &needle);
    refused(&["thermo", "He", "--T", "1:5:1"], &needle);
    refused(&["thermo", "He", "--T", "1", "--box-side", "20nm"], &needle);
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("he.csv");
    refused(
        &[
            "thermo",
            "He",
            "--T",
            "1:300:1",
            "--format",
            "csv",
            "-o",
            f.to_str().unwrap(),
        ],
        &needle,
    );
    assert!(!f.exists());
    let x2 = n_lambda3(2.01565006446, 2.0, 1e5);
    refused(&["hydrogen", "--T", "2"], &format!("nΛ³ = {} (", sig4(x2)));
    // Lower pressure lifts the refusal (nΛ³ ∝ p).
    let v = json(&[
        "thermo", "He", "--T", "1", "--p", "10kPa", "--format", "json",
    ]);
    let got = v[0]["n_lambda3"].as_f64().unwrap();
    assert!((got / n_lambda3(4.002602, 1.0, 1e4) - 1.0).abs() < 1e-12);
}

/// The hydrogen table carries nΛ³ and the flag per row; at 20.28 K nΛ³ ≈
/// 0.0048 (computed here), flagged at 10 digits.
#[test]
fn hydrogen_rows_carry_the_degeneracy() {
    let v = json(&["hydrogen", "--T", "20.28", "--format", "json"]);
    let want = n_lambda3(2.01565006446, 20.28, 1e5);
    let got = v[0]["n_lambda3"].as_f64().unwrap();
    assert!((got / want - 1.0).abs() < 1e-12, "{got} vs {want}");
    assert_eq!(v[0]["quantum_flag"], true);
    let out = run(&["hydrogen", "--T", "20.28", "--format", "csv"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.lines()
            .next()
            .unwrap()
            .ends_with("nLambda^3 (dimensionless),flag"),
        "{text}"
    );
    assert!(text
        .lines()
        .nth(1)
        .unwrap()
        .ends_with(&format!("{},*", sig4(want))));
}
