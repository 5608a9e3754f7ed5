//! `zsum crossover` and `zsum compare` end to end: JSON shape, plots, and
//! bad input (exit status 2, nothing written).

mod common;

use common::{json, refused, run};

/// The rotor's classical Cv crosses 1% three times (mpmath 1.3.0, 40
/// digits, findroot of |1/Cv − 1| = 0.01 on the direct sum: T/θ =
/// 0.600571001676, 0.61648276109, 1.92063600093); with B = 2 K, T doubles.
/// The default 10 certified digits are those values correctly rounded.
#[test]
fn crossover_json_lists_every_crossing() {
    let v = json(&[
        "crossover",
        "rotor",
        "--B",
        "2",
        "--unit",
        "K",
        "--quantity",
        "Cv",
        "--approx",
        "classical",
        "--tol",
        "1%",
        "--range",
        "0.01:100",
        "--format",
        "json",
    ]);
    assert_eq!(v["quantity"], "Cv");
    assert_eq!(v["approximation"], "classical");
    assert_eq!(v["tolerance"], "0.01");
    let c = v["crossings"].as_array().unwrap();
    let got: Vec<(&str, &str)> = c
        .iter()
        .map(|x| {
            (
                x["T"].as_str().unwrap(),
                x["T_over_theta"].as_str().unwrap(),
            )
        })
        .collect();
    assert_eq!(
        got,
        [
            ("1.201142003", "0.6005710017"),
            ("1.232965522", "0.6164827611"),
            ("3.841272002", "1.920636001")
        ]
    );
    assert_eq!(c[0]["exceeds_below"], true);
    assert_eq!(c[1]["exceeds_below"], false);
}

#[test]
fn crossover_says_when_there_is_none() {
    let out = run(&[
        "crossover",
        "oscillator",
        "--freq",
        "1",
        "--unit",
        "K",
        "--quantity",
        "q",
        "--range",
        "1000:2000",
    ]);
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("stays within 1% throughout T/θ 1000 to 2000: no crossing"),
        "{text}"
    );
}

#[test]
fn compare_writes_table_and_plot() {
    let dir = tempfile::tempdir().unwrap();
    let svg = dir.path().join("cv.svg");
    let csv = dir.path().join("map.csv");
    let out = run(&[
        "compare",
        "rotor",
        "--B",
        "1",
        "--unit",
        "K",
        "--T",
        "log:0.05:50:40",
        "--plot",
        svg.to_str().unwrap(),
        "--format",
        "csv",
        "-o",
        csv.to_str().unwrap(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(&csv).unwrap();
    // 40 temperatures × (exact + 5 approximations) + header.
    assert_eq!(
        text.lines().filter(|l| !l.starts_with('#')).count(),
        1 + 40 * 6
    );
    let doc = std::fs::read_to_string(&svg).unwrap();
    let xml = roxmltree::Document::parse(&doc).expect("well-formed SVG");
    let texts: Vec<String> = xml
        .descendants()
        .filter(|n| n.has_tag_name("text"))
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect();
    for want in [
        "exact",
        "classical",
        "mulholland4",
        "tolerance 1%",
        "T / K",
        "Cv/k",
    ] {
        assert!(texts.iter().any(|t| t == want), "{want} missing: {texts:?}");
    }
    // JSON rows carry exact values and each approximation's errors.
    let v = json(&[
        "compare",
        "oscillator",
        "--freq",
        "1",
        "--unit",
        "K",
        "--T",
        "10",
        "--approx",
        "classical",
        "--format",
        "json",
    ]);
    let row = &v["rows"][0];
    assert_eq!(row["T"], "10");
    // (1 − e^{−0.1})/0.1 − 1 = −0.0483742 (closed form).
    assert_eq!(row["approximations"][0]["rel_error"]["q"], "-0.04837");
}

#[test]
fn bad_input_is_refused_and_nothing_is_written() {
    let dir = tempfile::tempdir().unwrap();
    let out_file = dir.path().join("out.json");
    let o = out_file.to_str().unwrap();
    refused(
        &["crossover", "rotor", "--B", "1", "--tol", "0", "-o", o],
        "tolerance 0",
    );
    refused(
        &["crossover", "rotor", "--B", "1", "--tol", "1", "-o", o],
        "strictly between 0 and 1",
    );
    refused(
        &[
            "crossover",
            "rotor",
            "--B",
            "1",
            "--approx",
            "order1",
            "-o",
            o,
        ],
        "classical, mulholland1, mulholland2, mulholland3, mulholland4",
    );
    refused(
        &["crossover", "rotor", "--B", "1", "--range", "3:3", "-o", o],
        "empty",
    );
    refused(
        &["crossover", "rotor", "--B", "1", "--range", "-1:3", "-o", o],
        "greater than zero",
    );
    refused(&["crossover", "-o", o], "without a model");
    let nowhere = dir.path().join("missing").join("plot.svg");
    refused(
        &[
            "compare",
            "rotor",
            "--B",
            "1",
            "--unit",
            "K",
            "--T",
            "1:5:1",
            "--plot",
            nowhere.to_str().unwrap(),
            "-o",
            o,
        ],
        "does not exist",
    );
    refused(
        &[
            "compare", "rotor", "--B", "1", "--unit", "K", "--T", "1", "--plot", "x.pdf", "-o", o,
        ],
        ".svg or .png",
    );
    assert!(!out_file.exists());
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
}
