//! Outputs pinned byte for byte: a fixed list of commands covering every
//! subcommand, model and output format (table, JSON, CSV, Markdown, an SVG
//! figure, the report's HTML and CSV files) is run and compared with the
//! files recorded under `tests/golden/out/`. A change that alters an output
//! on purpose re-records exactly the affected files in the same commit and
//! says why (`ZSUM_BLESS=1 cargo test --release --test golden`).

use std::path::{Path, PathBuf};
use std::process::Command;

const CASES: &[(&str, &[&str])] = &[
    (
        "levels-box-table",
        &["levels", "box", "--dims", "3", "--up-to", "30"],
    ),
    (
        "levels-box-states-json",
        &[
            "levels", "box", "--sides", "2:3:5", "--up-to", "2", "--states", "--format", "json",
        ],
    ),
    (
        "levels-box-physical-csv",
        &[
            "levels", "box", "--up-to", "20", "--mass", "4.0026u", "--side", "10nm", "--also",
            "cm-1", "--format", "csv",
        ],
    ),
    (
        "levels-rotor-spin-table",
        &[
            "levels", "rotor", "--B", "1.99824", "--D", "5.76e-6", "--up-to", "200", "--spin", "1",
            "--also", "K",
        ],
    ),
    (
        "levels-rotor-states-json",
        &[
            "levels", "rotor", "--B", "59.322", "--spin", "1/2", "--only", "para", "--up-to",
            "400", "--states", "--format", "json",
        ],
    ),
    (
        "levels-top-markdown",
        &[
            "levels", "top", "--A", "5.28", "--B", "0.25", "--up-to", "40", "--format", "markdown",
        ],
    ),
    (
        "levels-spherical-table",
        &[
            "levels",
            "top",
            "--spherical",
            "--B",
            "5.24",
            "--up-to",
            "200",
        ],
    ),
    (
        "levels-oscillator-table",
        &[
            "levels",
            "oscillator",
            "--freq",
            "1000,667x2",
            "--zero-point",
            "--up-to",
            "4000",
        ],
    ),
    (
        "levels-morse-csv",
        &[
            "levels",
            "oscillator",
            "--we",
            "2000",
            "--dissociation",
            "40000",
            "--up-to",
            "1e5",
            "--format",
            "csv",
        ],
    ),
    (
        "levels-diatomic-table",
        &[
            "levels", "diatomic", "--we", "2358.57", "--wexe", "14.324", "--Be", "1.99824",
            "--alpha", "0.017318", "--De", "5.76e-6", "--spin", "1", "--up-to", "2500",
        ],
    ),
    (
        "levels-file-table",
        &[
            "levels",
            "file",
            "examples/systems/fluorine_terms.levels",
            "--up-to",
            "1000",
        ],
    ),
    (
        "levels-zeeman-states-json",
        &[
            "levels", "zeeman", "--J", "7/2", "--g", "2", "--field", "1T", "--up-to", "10",
            "--states", "--format", "json",
        ],
    ),
    (
        "levels-system-table",
        &[
            "levels",
            "--system",
            "examples/systems/nitrogen_rovib.toml",
            "--up-to",
            "1200cm-1",
        ],
    ),
    (
        "count-box-json",
        &[
            "count", "box", "--dims", "3", "--up-to", "1e6", "--format", "json",
        ],
    ),
    (
        "sum-rotor-table",
        &[
            "sum", "rotor", "--B", "1.99824", "--T", "298.15", "--digits", "30",
        ],
    ),
    (
        "sum-box-kt-json",
        &[
            "sum",
            "box",
            "--dims",
            "3",
            "--kT",
            "log:0.1:1e6:5",
            "--format",
            "json",
        ],
    ),
    (
        "thermo-rotor-per-mole-csv",
        &[
            "thermo",
            "rotor",
            "--B",
            "59.322",
            "--D",
            "0.0471",
            "--spin",
            "1/2",
            "--T",
            "10:300:70",
            "--per",
            "mole",
            "--format",
            "csv",
        ],
    ),
    (
        "thermo-top-table",
        &["thermo", "top", "--C", "2", "--B", "3", "--T", "20,300"],
    ),
    (
        "levels-asymmetric-top-json",
        &[
            "levels",
            "top",
            "--A",
            "27.8806",
            "--B",
            "14.5218",
            "--C",
            "9.2777",
            "--pair-spin",
            "1/2",
            "--pair-axis",
            "b",
            "--up-to",
            "140",
            "--format",
            "json",
        ],
    ),
    (
        "thermo-asymmetric-top-table",
        &[
            "thermo", "top", "--A", "27.8806", "--B", "14.5218", "--C", "9.2777", "--DJ",
            "0.00125", "--DK", "0.0326", "--dJ", "0.00051", "--T", "1,10,30", "--digits", "20",
        ],
    ),
    (
        "thermo-oscillator-json",
        &[
            "thermo",
            "oscillator",
            "--we",
            "2358.57",
            "--wexe",
            "14.324",
            "--T",
            "300,3000",
            "--format",
            "json",
        ],
    ),
    (
        "thermo-diatomic-markdown",
        &[
            "thermo",
            "diatomic",
            "--we",
            "2358.57",
            "--wexe",
            "14.324",
            "--Be",
            "1.99824",
            "--alpha",
            "0.017318",
            "--spin",
            "1",
            "--T",
            "log:1:3000:6",
            "--format",
            "markdown",
        ],
    ),
    (
        "thermo-file-table",
        &[
            "thermo",
            "file",
            "examples/systems/fluorine_terms.levels",
            "--T",
            "100,1000",
        ],
    ),
    (
        "thermo-zeeman-table",
        &[
            "thermo", "zeeman", "--J", "7/2", "--g", "2", "--field", "1T", "--T", "0.5,2",
        ],
    ),
    (
        "thermo-system-json",
        &[
            "thermo",
            "--system",
            "examples/systems/nitrogen_rovib.toml",
            "--T",
            "298.15",
            "--per",
            "mole",
            "--format",
            "json",
        ],
    ),
    (
        "thermo-box-physical-table",
        &[
            "thermo", "box", "--mass", "4u", "--side", "1nm", "--T", "1,10",
        ],
    ),
    (
        "crossover-rotor-json",
        &[
            "crossover",
            "rotor",
            "--B",
            "1",
            "--unit",
            "K",
            "--quantity",
            "Cv",
            "--format",
            "json",
        ],
    ),
    (
        "crossover-system-table",
        &[
            "crossover",
            "--system",
            "examples/systems/nitrogen_rovib.toml",
            "--quantity",
            "Cv",
            "--range",
            "0.5:2000",
        ],
    ),
    (
        "compare-rotor-csv",
        &[
            "compare",
            "rotor",
            "--B",
            "1",
            "--unit",
            "K",
            "--T",
            "log:0.05:50:8",
            "--format",
            "csv",
        ],
    ),
    (
        "compare-box-table",
        &[
            "compare",
            "box",
            "--dims",
            "1",
            "--reduced",
            "log:0.5:20:5",
            "--approx",
            "classical,euler-maclaurin",
        ],
    ),
    (
        "compare-oscillator-json",
        &[
            "compare",
            "oscillator",
            "--freq",
            "1000",
            "--T",
            "100,1000",
            "--format",
            "json",
        ],
    ),
    ("species-list-table", &["species", "list"]),
    (
        "species-show-json",
        &["species", "show", "N2", "--format", "json"],
    ),
    ("thermo-n2-table", &["thermo", "N2", "--T", "298.15,1000"]),
    // Wide grids at many digits: the hot sums that speed work must leave
    // byte-identical.
    (
        "thermo-n2-wide-grid-csv",
        &[
            "thermo",
            "N2",
            "--T",
            "10:3000:110",
            "--digits",
            "15",
            "--format",
            "csv",
        ],
    ),
    (
        "thermo-co-wide-grid-json",
        &[
            "thermo",
            "CO",
            "--T",
            "log:1:300:12",
            "--digits",
            "20",
            "--format",
            "json",
        ],
    ),
    (
        "thermo-h2-para-markdown",
        &[
            "thermo", "H2", "--T", "20,100", "--isomer", "para", "--format", "markdown",
        ],
    ),
    (
        "thermo-ar-per-kg-json",
        &[
            "thermo", "Ar", "--T", "300", "--per", "kg", "--format", "json",
        ],
    ),
    (
        "thermo-he-box-csv",
        &[
            "thermo",
            "He",
            "--T",
            "4.2",
            "--box-side",
            "20nm",
            "--format",
            "csv",
        ],
    ),
    ("hydrogen-table", &["hydrogen", "--T", "20.28,77,300"]),
    (
        "assign-check-table",
        &[
            "assign",
            "check",
            "examples/assignments/kestrel_co.assign",
            "rotor",
            "--B",
            "1.9225288",
            "--D",
            "6.1215e-6",
        ],
    ),
    (
        "spin-temperature-table",
        &["spin", "H2O", "--measured", "ortho/para=2.5"],
    ),
    (
        "spin-relaxation-json",
        &[
            "spin", "CH4", "--T", "10,50", "--digits", "6", "--format", "json",
        ],
    ),
    (
        "hydrogen-d2-json",
        &[
            "hydrogen",
            "--T",
            "20",
            "--species",
            "D2",
            "--format",
            "json",
        ],
    ),
    (
        "microstates-fermi-table",
        &[
            "microstates",
            "--system",
            "examples/systems/he3_cage.toml",
            "--particles",
            "3",
            "--stats",
            "fermi",
            "--up-to",
            "60",
        ],
    ),
    (
        "microstates-einstein-json",
        &[
            "microstates",
            "--einstein",
            "--particles",
            "5",
            "--up-to",
            "6",
            "--format",
            "json",
        ],
    ),
    (
        "ensemble-bose-table",
        &[
            "ensemble",
            "--system",
            "examples/systems/atom_trap.toml",
            "--particles",
            "10",
            "--stats",
            "bose",
            "--T",
            "0.5,2,8",
        ],
    ),
    (
        "census-table",
        &[
            "census",
            "--modes",
            "1000,1500x2,3000",
            "--step",
            "100",
            "--up-to",
            "5000",
        ],
    ),
    (
        "census-convolve-csv",
        &[
            "census",
            "--modes",
            "300,700",
            "--up-to",
            "2000",
            "--step",
            "50",
            "--convolve",
            "examples/systems/free_rotor.levels",
            "--format",
            "csv",
        ],
    ),
    (
        "census-error-map-json",
        &[
            "census",
            "--modes",
            "1000,1500x2,3000",
            "--up-to",
            "20000",
            "--error-map",
            "4",
            "--format",
            "json",
        ],
    ),
];

fn dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/golden/out")
}

fn bless() -> bool {
    std::env::var_os("ZSUM_BLESS").is_some()
}

/// Compares `got` with the recorded file `name` (or records it).
fn check(name: &str, got: &str, failures: &mut Vec<String>) {
    let path = dir().join(name);
    if bless() {
        std::fs::create_dir_all(dir()).unwrap();
        std::fs::write(&path, got).unwrap();
        return;
    }
    match std::fs::read_to_string(&path) {
        Ok(want) if want == got => {}
        Ok(want) => {
            let line = want
                .lines()
                .zip(got.lines())
                .position(|(a, b)| a != b)
                .map_or("at the end".to_string(), |i| format!("at line {}", i + 1));
            failures.push(format!("{name} differs {line}"));
        }
        Err(e) => failures.push(format!("{name}: {e}; record it with ZSUM_BLESS=1")),
    }
}

fn zsum(args: &[&str]) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

#[test]
fn every_command_prints_what_was_recorded() {
    let mut failures = Vec::new();
    let mut names = Vec::new();
    for (name, args) in CASES {
        let file = format!("{name}.txt");
        check(&file, &zsum(args), &mut failures);
        names.push(file);
    }
    // A figure: the SVG of an error map.
    let tmp = tempfile::tempdir().unwrap();
    let svg = tmp.path().join("map.svg");
    zsum(&[
        "compare",
        "oscillator",
        "--freq",
        "1000",
        "--T",
        "log:10:10000:12",
        "--plot",
        svg.to_str().unwrap(),
    ]);
    check(
        "compare-oscillator-plot.svg",
        &std::fs::read_to_string(&svg).unwrap(),
        &mut failures,
    );
    names.push("compare-oscillator-plot.svg".into());
    // The report: every file it writes, and its summary (the folder's name
    // taken out).
    let out = tmp.path().join("report");
    let summary =
        zsum(&["report", "--out", out.to_str().unwrap()]).replace(out.to_str().unwrap(), "REPORT");
    check("report-stdout.txt", &summary, &mut failures);
    names.push("report-stdout.txt".into());
    for f in [
        "index.html",
        "hydrogen.csv",
        "species_298K.csv",
        "summary.txt",
    ] {
        let name = format!("report-{f}");
        check(
            &name,
            &std::fs::read_to_string(out.join(f)).unwrap(),
            &mut failures,
        );
        names.push(name);
    }
    assert!(
        failures.is_empty(),
        "outputs changed:\n{}",
        failures.join("\n")
    );
    // No stale recording of a case that is gone.
    let mut on_disk: Vec<String> = std::fs::read_dir(dir())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().to_string())
        .collect();
    on_disk.sort();
    names.sort();
    assert_eq!(on_disk, names, "golden files and cases differ");
}
