//! System files: the shipped examples load and enumerate; bad files are
//! refused with the line and the field named; the CLI drives every model.

mod common;

use num_rational::BigRational;
use std::path::Path;
use std::process::Command;
use zsum::exact::parse_rational;
use zsum::spectrum::Spectrum;
use zsum::system::System;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

#[test]
fn every_example_system_loads_and_enumerates() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/systems");
    let mut seen = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|e| e == "toml") {
            let sys = System::read(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
            // A few levels of each: 30 cm-1 of rotation, or 5 K of a cage or trap.
            let room = if sys.product.unit().symbol() == "K" {
                "5"
            } else {
                "30"
            };
            let cut = sys.product.ground_energy() + r(room);
            let levels = sys.product.levels_up_to(&cut).unwrap();
            assert!(levels.len() > 1, "{}", path.display());
            common::check_spectrum(&sys.product, &cut, 5);
            seen += 1;
        }
    }
    assert!(seen >= 2);
}

#[test]
fn nitrogen_example_has_two_to_one_spin_weights() {
    // 14N2 (I = 1, bosons): even J carry 6 nuclear-spin states, odd J 3
    // (standard texts on diatomic spectra, from memory).
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/systems/nitrogen_rovib.toml");
    let sys = System::read(&path).unwrap();
    let l = sys
        .product
        .levels_up_to(&(sys.product.ground_energy() + r("15")))
        .unwrap();
    let degs: Vec<String> = l.iter().map(|x| x.degeneracy.to_string()).collect();
    assert_eq!(degs[..3], ["6", "9", "30"]);
}

fn parse_err(text: &str) -> String {
    System::parse(text, "test.toml", Path::new("."))
        .unwrap_err()
        .to_string()
}

#[test]
fn bad_system_files_name_the_line_and_field() {
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"2 cm-1\"\nB = \"3 cm-1\"\n");
    assert!(
        e.contains("line 4") && e.to_lowercase().contains("duplicate"),
        "{e}"
    );
    let e = parse_err("[[part]]\nkind = \"rotor\"\nD = \"2 cm-1\"\n");
    assert!(e.contains("line 1") && e.contains("`B`"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"2 cm-1\"\nwe = \"3 cm-1\"\n");
    assert!(e.contains("line 4") && e.contains("`we`"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"2 furlongs\"\n");
    assert!(e.contains("line 3") && e.contains("furlongs"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = 2.5\n");
    assert!(e.contains("line 3") && e.contains("string"), "{e}");
    let e = parse_err("[[part]]\nkind = \"warp drive\"\n");
    assert!(e.contains("line 2") && e.contains("warp drive"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"2 cm-1\"\nbogus = 1\n");
    assert!(e.contains("bogus"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"2 cm-1\"\nspin = \"1/3\"\n");
    assert!(e.contains("line 4") && e.contains("1/3"), "{e}");
    let e = parse_err("[[part]]\nkind = \"rotor\"\nB = \"-2 cm-1\"\n");
    assert!(e.contains("B -2"), "{e}");
    let e = parse_err(
        "[[part]]\nkind = \"levels\"\nlevels = [ { energy = \"0 K\", degeneracy = -1 } ]\n",
    );
    assert!(e.contains("line 3") && e.contains("degeneracy"), "{e}");
    let e = parse_err("name = \"x\"\n");
    assert!(e.contains("no parts"), "{e}");
    // A box without a physical unit cannot be combined exactly: the box
    // part always needs mass and side.
    let e = parse_err("[[part]]\nkind = \"box\"\nside = \"1 nm\"\n");
    assert!(e.contains("`mass`"), "{e}");
}

fn zsum(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn cli_lists_every_model_as_json_with_its_quantum_numbers() {
    let (code, out, _) = zsum(&[
        "levels", "rotor", "--B", "2", "--up-to", "12", "--states", "--format", "json",
    ]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["levels"][1]["energy"], "4");
    // States are arrays in the order of quantum_numbers.
    assert_eq!(v["quantum_numbers"], serde_json::json!(["J", "M"]));
    assert_eq!(v["levels"][1]["states"][0], serde_json::json!([1, -1]));
    assert_eq!(v["term_numbers"], serde_json::json!(["J"]));
    assert_eq!(v["levels"][1]["terms"], serde_json::json!([[1]]));
    let (code, out, _) = zsum(&[
        "levels", "diatomic", "--we", "2000", "--wexe", "10", "--Be", "2", "--alpha", "0.02",
        "--up-to", "1200", "--states", "--format", "json",
    ]);
    assert_eq!(code, 0, "{out}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["quantum_numbers"], serde_json::json!(["v", "J", "M"]));
    assert_eq!(v["levels"][0]["states"][0], serde_json::json!([0, 0, 0]));
    for args in [
        vec!["levels", "top", "--A", "5", "--B", "1", "--up-to", "20"],
        vec!["levels", "top", "--spherical", "--B", "5", "--up-to", "100"],
        vec![
            "levels",
            "oscillator",
            "--freq",
            "1000,1500x2",
            "--up-to",
            "4000",
        ],
        vec![
            "levels",
            "oscillator",
            "--we",
            "2000",
            "--wexe",
            "10",
            "--up-to",
            "9000",
        ],
        vec![
            "levels",
            "oscillator",
            "--we",
            "2000",
            "--dissociation",
            "40000",
            "--up-to",
            "9000",
        ],
        vec![
            "levels", "zeeman", "--J", "7/2", "--g", "2", "--field", "1T", "--up-to", "10",
        ],
        vec![
            "levels",
            "--system",
            "examples/systems/caged_atom.toml",
            "--up-to",
            "1K",
        ],
    ] {
        let (code, out, err) = zsum(&args);
        assert_eq!(code, 0, "{args:?}: {err}");
        assert!(
            out.contains("degeneracy") || out.contains("ln q"),
            "{args:?}"
        );
    }
}

#[test]
fn cli_refuses_bad_model_input_with_status_2() {
    for (args, needle) in [
        (vec!["levels", "rotor", "--B", "0", "--up-to", "10"], "B 0"),
        (
            vec!["levels", "rotor", "--B", "1", "--D", "1", "--up-to", "10"],
            "D 1",
        ),
        (
            vec![
                "levels", "rotor", "--B", "1", "--spin", "-1", "--up-to", "10",
            ],
            "-1",
        ),
        (
            vec![
                "levels", "rotor", "--B", "1", "--spin", "0.3", "--up-to", "10",
            ],
            "0.3",
        ),
        (
            vec![
                "levels", "rotor", "--B", "1", "--unit", "parsec", "--up-to", "10",
            ],
            "parsec",
        ),
        (
            vec!["levels", "rotor", "--B", "1", "--up-to", "10 furlong"],
            "10 furlong",
        ),
        (
            vec!["levels", "oscillator", "--freq", "0,100", "--up-to", "10"],
            "0",
        ),
        (
            vec!["levels", "oscillator", "--freq", "100x0", "--up-to", "10"],
            "mode degeneracy",
        ),
        (
            vec!["levels", "top", "--A", "0.5", "--B", "1", "--up-to", "10"],
            "0.5",
        ),
        (
            vec!["levels", "--system", "/nonexistent/x.toml", "--up-to", "10"],
            "x.toml",
        ),
        (vec!["levels"], "model"),
        (
            vec!["sum", "rotor", "--B", "1", "--T", "0"],
            "greater than zero",
        ),
        (vec!["sum", "rotor", "--B", "1", "--T", "nan"], "nan"),
        (
            vec!["sum", "rotor", "--B", "1", "--T", "10", "--digits", "0"],
            "0 is not in 1..=996",
        ),
        (
            vec!["sum", "rotor", "--B", "1", "--T", "10", "--digits", "5000"],
            "5000 is not in 1..=996",
        ),
        (
            vec!["thermo", "rotor", "--B", "1", "--T", "10:100:0"],
            "step",
        ),
        (
            vec!["thermo", "rotor", "--B", "1", "--T", "100:10:5"],
            "step",
        ),
        (vec!["sum", "box", "--T", "10"], "mass and side"),
        (vec!["sum", "rotor", "--B", "1"], "--T"),
        // Oversized ladders are refused from an estimate, not after hours of
        // arithmetic (regression: these once ran until stopped).
        (
            vec!["levels", "rotor", "--B", "1", "--up-to", "1e300"],
            "budget",
        ),
        (
            vec!["levels", "top", "--C", "0.1", "--B", "1", "--up-to", "1e12"],
            "budget",
        ),
    ] {
        let (code, out, err) = zsum(&args);
        assert_eq!(code, 2, "{args:?}");
        assert!(out.is_empty(), "{args:?}");
        assert!(err.contains(needle), "{args:?}: {err}");
    }
}
