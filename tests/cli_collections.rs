//! `zsum microstates` and `zsum ensemble` from the command line: exact
//! counts as decimal strings in JSON, refusals with exit status 2 and no
//! partial output.

mod common;

use common::{json, refused, run};
use std::path::Path;

fn example(name: &str) -> String {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples/systems")
        .join(name)
        .display()
        .to_string()
}

#[test]
fn einstein_solid_json_holds_exact_counts() {
    // 300 oscillators sharing 300 quanta: C(599, 300) (standard result), a
    // 180-digit number, printed whole.
    let v = json(&[
        "microstates",
        "--einstein",
        "--particles",
        "300",
        "--up-to",
        "300",
        "--format",
        "json",
    ]);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 301);
    let last = rows[300]["omega"].as_str().unwrap();
    // C(599, 300) = C(599, 299); its leading digits, from the product formula
    // evaluated independently here in f64 logarithms: about 10^178.9.
    let ln: f64 = (1..=299u32)
        .map(|i| ((300 + i) as f64 / i as f64).ln())
        .sum();
    assert_eq!(
        last.len(),
        (ln / std::f64::consts::LN_10).floor() as usize + 1
    );
    assert_eq!(rows[2]["omega"], "45150"); // C(301, 2)
    assert_eq!(rows[2]["quanta"], 2);
    assert_eq!(v["oscillators"], 300);
    // Every column is a count or a pure number: an empty units block.
    assert_eq!(v["units"], serde_json::json!({}));
    // q = 0: βħω = ψ(300) − ψ(1) = H_299 = 6.2793305... (the harmonic
    // number, from the exact sum evaluated here in f64).
    let h: f64 = (1..300).map(|k| 1.0 / k as f64).sum();
    let beta: f64 = rows[0]["beta_hw"].as_str().unwrap().parse().unwrap();
    assert!((beta / h - 1.0).abs() < 1e-9, "{beta} against {h}");
    // The canonical comparison is on every row, so --compare is refused;
    // so are bad counts and digits.
    for (flag, value, needle) in [
        ("--compare", "2", "--compare"),
        ("--up-to", "-1", "number of quanta -1"),
        ("--digits", "0", "'--digits <N>': 0 is not in 1..=60"),
        (
            "--particles",
            "0",
            "'--particles <N>': 0 is not in 1..=1000",
        ),
    ] {
        let mut args = vec![
            "microstates",
            "--einstein",
            "--particles",
            "3",
            "--up-to",
            "3",
        ];
        match args.iter().position(|a| *a == flag) {
            Some(i) => args[i + 1] = value,
            None => args.extend([flag, value]),
        }
        refused(&args, needle);
    }
}

#[test]
fn fermions_in_a_cage_start_at_the_filled_shells() {
    // 20 fermions in a cube fill the levels 3, 6, 9, 11, 12, 14 (1+3+3+3+1+6
    // = 17 states) and 3 of the 3 at 17: one state at 228 box units, so the
    // first row has Omega = 1, 228 − 20·3 = 168 steps above N·ε₀.
    let v = json(&[
        "microstates",
        "--system",
        &example("he3_cage.toml"),
        "--particles",
        "20",
        "--stats",
        "fermi",
        "--up-to",
        "190",
        "--format",
        "json",
    ]);
    let first = &v["rows"][0];
    assert_eq!(first["omega"], "1");
    assert_eq!(first["steps"], 228 - 60);
    assert_eq!(first["s_over_k"], "0");
}

#[test]
fn ensemble_reports_the_boltzmann_breakdown() {
    let v = json(&[
        "ensemble",
        "--system",
        &example("atom_trap.toml"),
        "--particles",
        "50",
        "--stats",
        "fermi",
        "--T",
        "0.5:5:0.5",
        "--format",
        "json",
    ]);
    assert_eq!(v["rows"].as_array().unwrap().len(), 10);
    let c = v["crossings"].as_array().unwrap();
    assert_eq!(c.len(), 1);
    assert_eq!(c[0]["exceeds_below"], true);
    // The same crossing as the table run with the finer grid 0.1:10:0.1.
    assert_eq!(c[0]["T"], "2.487");
    assert!(v["rows"]
        .as_array()
        .unwrap()
        .iter()
        .all(|r| r["certified"] == true));
}

#[test]
fn bad_input_exits_2_and_writes_nothing() {
    let cage = example("he3_cage.toml");
    let trap = example("atom_trap.toml");
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "0",
            "--stats",
            "bose",
            "--up-to",
            "100",
        ],
        "'--particles <N>': 0 is not in 1..=1000",
    );
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "5000",
            "--stats",
            "bose",
            "--up-to",
            "100",
        ],
        "5000",
    );
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "20",
            "--stats",
            "fermi",
            "--up-to",
            "150",
        ],
        "20 fermions",
    );
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "2",
            "--stats",
            "anyons",
            "--up-to",
            "150",
        ],
        "bose, fermi or distinct",
    );
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "2",
            "--stats",
            "bose",
            "--up-to",
            "150",
            "--grid",
            "1",
        ],
        "not a whole number of grid steps",
    );
    refused(
        &[
            "microstates",
            "--system",
            &cage,
            "--particles",
            "100",
            "--stats",
            "bose",
            "--up-to",
            "20000",
            "--memory-budget",
            "1MiB",
        ],
        "memory",
    );
    refused(
        &[
            "ensemble",
            "--system",
            &trap,
            "--particles",
            "0",
            "--stats",
            "bose",
            "--T",
            "1",
        ],
        "0 is not in 1..=1000",
    );
    refused(
        &[
            "ensemble",
            "--system",
            &trap,
            "--particles",
            "50",
            "--stats",
            "fermi",
            "--T",
            "0.001",
        ],
        "cancels about",
    );
    refused(
        &[
            "ensemble",
            "--system",
            &trap,
            "--particles",
            "5",
            "--stats",
            "bose",
            "--T",
            "-1",
        ],
        "greater than zero",
    );
    // At 0.01 K the recursion cancels about 2600 bits, within the limit:
    // the 50 fermions fill the oscillator shells n = 0..4 (1 + 3 + 6 + 10 +
    // 15 = 35 states) and 15 of the 21 states of n = 5, so U/kT → 180·θ/T
    // = 1800 and ln Q → −1800 + ln C(21, 15) as T → 0 (shell filling,
    // standard result); at T/θ = 0.1 the next excitation costs e^{-10}.
    let out = run(&[
        "ensemble",
        "--system",
        &trap,
        "--particles",
        "50",
        "--stats",
        "fermi",
        "--T",
        "0.01",
        "--format",
        "json",
    ]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let row = &v["rows"][0];
    assert_eq!(row["certified"], true);
    let ln_q: f64 = row["ln_q"].as_str().unwrap().parse().unwrap();
    let u: f64 = row["U_over_kT"].as_str().unwrap().parse().unwrap();
    let ground = -1800.0 + 54264f64.ln();
    assert!(
        ln_q > ground && ln_q < ground + 0.1,
        "ln Q = {ln_q}, ground filling {ground}"
    );
    assert!(u > 1800.0 && u < 1800.1, "U/kT = {u}");
    // A refused run leaves no file behind.
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("out.json");
    let out = run(&[
        "ensemble",
        "--system",
        &trap,
        "--particles",
        "50",
        "--stats",
        "fermi",
        "--T",
        "0.001:1:0.999",
        "-o",
        target.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(std::fs::read_dir(dir.path()).unwrap().next().is_none());
}

#[test]
fn census_convolution_and_the_error_map() {
    // Modes 300 and 700 cm-1 with the demo free rotor (B = 5.5 cm-1): up to
    // 20 cm-1 only m = 0, ±1 (at 5.5 → step 6) fit, so the sum there is 3.
    let rotor = example("free_rotor.levels");
    let v = json(&[
        "census",
        "--modes",
        "300,700",
        "--up-to",
        "1000",
        "--convolve",
        &rotor,
        "--format",
        "json",
    ]);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows[1]["energy"], "6");
    assert_eq!(rows[1]["sum_of_states"], "3");
    assert_eq!(rows[1]["in_step"], "2");
    assert_eq!(v["convolved"].as_array().unwrap().len(), 1);
    // Convolving the rotor twice is two independent rotors: m1² + m2² ≤ 4
    // (in units of B) has 13 integer points, so 13 states up to 22 cm-1
    // (4 B = 22), none from the modes.
    let v = json(&[
        "census",
        "--modes",
        "300,700",
        "--up-to",
        "22",
        "--convolve",
        &rotor,
        "--convolve",
        &rotor,
        "--format",
        "json",
    ]);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.last().unwrap()["energy"], "22");
    assert_eq!(rows.last().unwrap()["sum_of_states"], "13");
    // Three modes of 1000 cm-1 up to 30 000 cm-1 at 10 energies, with
    // `more` options.
    let map = |more: &[&str]| {
        let mut args = vec![
            "census",
            "--modes",
            "1000x3",
            "--up-to",
            "30000",
            "--error-map",
            "10",
            "--format",
            "json",
        ];
        args.extend(more);
        json(&args)
    };
    let v = map(&[]);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 10);
    assert_eq!(v["units"]["density_exact"], "1/cm-1");
    assert_eq!(v["digits"], 6);
    // Three identical modes: the exact sum at E = 1000 k is C(k + 3, 3)
    // (standard result); the sampled energies are multiples of 2950.
    let e: u64 = rows[9]["energy"].as_str().unwrap().parse().unwrap();
    let k = e / 1000;
    let want = (k + 1) * (k + 2) * (k + 3) / 6;
    assert_eq!(rows[9]["sum_exact"].as_str().unwrap(), want.to_string());
    // E/E_z = 29500/1500 = 19.67: beyond the formulas' range.
    assert_eq!(rows[9]["e_over_ez"], "19.67");
    assert_eq!(rows[9]["extrapolated"], true);
    // --digits sets the approximation's digits: 3 significant digits.
    let v = map(&["--digits", "3"]);
    let approx = v["rows"][9]["sum_approx"].as_str().unwrap();
    assert_eq!(
        approx
            .replace(['.', '-'], "")
            .split('e')
            .next()
            .unwrap()
            .len(),
        3,
        "{approx}"
    );
    for (extra, needle) in [
        (
            vec!["--error-map", "0"],
            "'--error-map <POINTS>': 0 is not in 1..=100000",
        ),
        (vec!["--error-map", "5000"], "at most 2500"),
        (
            vec!["--error-map", "5", "--digits", "0"],
            "0 is not in 1..=12",
        ),
        (
            vec!["--error-map", "5", "--digits", "13"],
            "13 is not in 1..=12",
        ),
        (vec!["--digits", "4"], "--error-map"),
        (vec!["--convolve", "/nonexistent.levels"], "nonexistent"),
    ] {
        let mut args = vec!["census", "--modes", "1000", "--up-to", "3000"];
        args.extend(extra);
        refused(&args, needle);
    }
    refused(&["census", "--modes", "", "--up-to", "3000"], "modes \"\"");
    refused(&["census", "--modes", "1000", "--up-to", "-5"], "cutoff -5");
    // Nothing is written where a census is refused.
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("census.json");
    let out = run(&[
        "census",
        "--modes",
        "1000",
        "--up-to",
        "3000",
        "--step",
        "0",
        "-o",
        target.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(std::fs::read_dir(dir.path()).unwrap().next().is_none());
}
