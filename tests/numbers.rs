//! Numbers as written: a negative value is taken as the option's value
//! (`--x -1` and `--x=-1` alike) and refused by validation that names the
//! option or quantity and what is allowed, never by the parser as an
//! unknown argument; `_` digit separators are refused everywhere alike.

mod common;

use common::refused;

#[test]
fn dims_minus_one_is_refused_with_the_range() {
    refused(
        &["levels", "box", "--dims", "-1", "--up-to", "3"],
        "'--dims <N>': -1 is not in 1..=3",
    );
    refused(
        &["levels", "box", "--dims=-1", "--up-to", "3"],
        "-1 is not in 1..=3",
    );
}

#[test]
fn digits_minus_one_is_refused_with_the_range() {
    refused(
        &[
            "thermo", "rotor", "--B", "1", "--T", "300", "--digits", "-1",
        ],
        "-1 is not in 1..=996",
    );
    refused(
        &["thermo", "N2", "--T", "300", "--digits", "-1"],
        "-1 is not in 1..=60",
    );
    refused(
        &["crossover", "rotor", "--B", "1", "--digits=-1"],
        "-1 is not in 1..=12",
    );
}

#[test]
fn tol_minus_one_percent_is_refused_as_a_tolerance() {
    refused(
        &["crossover", "rotor", "--B", "1", "--tol", "-1%"],
        "tolerance -1% is not allowed: it must lie strictly between 0 and 1",
    );
    refused(
        &["compare", "rotor", "--B", "1", "--T", "300", "--tol=-1%"],
        "tolerance -1% is not allowed",
    );
}

#[test]
fn freq_minus_1000_is_refused_as_a_frequency() {
    refused(
        &["levels", "oscillator", "--freq", "-1000", "--up-to", "10"],
        "frequency of mode 1 -1000 is not allowed: every mode frequency",
    );
    refused(
        &["levels", "rotor", "--B", "-1", "--up-to", "3"],
        "rotational constant B -1 is not allowed",
    );
    refused(
        &[
            "ensemble",
            "--system",
            "x.toml",
            "--particles",
            "-5",
            "--stats",
            "bose",
            "--T",
            "1",
        ],
        "-5 is not in 1..=1000",
    );
}

#[test]
fn digit_separators_are_refused_everywhere() {
    refused(
        &["levels", "box", "--sides", "1_000,1", "--up-to", "3"],
        "1_000",
    );
    refused(
        &["levels", "rotor", "--B", "1_000", "--up-to", "3"],
        "1_000",
    );
    let dir = tempfile::tempdir().unwrap();
    let levels = dir.path().join("sep.levels");
    std::fs::write(&levels, "0 cm-1 1\n1_000 cm-1 2\n").unwrap();
    refused(
        &[
            "levels",
            "file",
            levels.to_str().unwrap(),
            "--up-to",
            "2000",
        ],
        "1_000",
    );
    let system = dir.path().join("sep.toml");
    std::fs::write(&system, "[[part]]\nkind = \"rotor\"\nB = \"1_000 cm-1\"\n").unwrap();
    refused(
        &[
            "levels",
            "--system",
            system.to_str().unwrap(),
            "--up-to",
            "3000",
        ],
        "1_000",
    );
}
