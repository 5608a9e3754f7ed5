//! Cold-end regression tests against an independent oracle outside the
//! project: `tests/crosscheck/cold_oracle.py` sums each partition function
//! directly, S0 = Σ g e^{−x}, S1 = Σ g x e^{−x}, S2 = Σ g x² e^{−x}, with
//! Python's mpmath (arbitrary-precision floating point) from 300 working
//! digits up, with no shift to the ground and no ratio formulas (no log1p,
//! no expm1), and with a rigorous a posteriori error bound and tail bound.
//! It runs the zsum binary with `--digits 15` and `--digits 30` and
//! `--format json`, and requires every printed q, ln q, U/kT, Cv/k, S/k and
//! F/kT to carry exactly the digits asked for, unmarked, in a certified row,
//! and to equal the oracle's value correctly rounded (round half to even).
//!
//! These are the ground-dominated cases, where ln q, U/kT and Cv/k are of
//! order e^{−x} with x in the hundreds (ln q ≈ 5.6e-492 for the 2358.57 cm⁻¹
//! oscillator at 3 K), so an engine that loses the excitation part prints 0
//! or wrong digits. The oracle is independent: it writes each level ladder
//! from its textbook formula (harmonic oscillator, rigid rotor with the
//! nuclear-spin weights of two identical nuclei, the Dunham-type
//! rotation–vibration term formula), from the SI 2019 exact constants, and
//! only runs zsum as a program; it shares no code with zsum.
//!
//! Each test runs one oracle case, so failures are reported separately, with
//! the command, zsum's value and the oracle's value. `.ci/setup` installs
//! Python 3 with mpmath; only where it truly cannot be had do these tests
//! skip, saying so on the terminal (`common::mpmath_available`).
//!
//! The last test checks a refusal directly: a rotor with B in joules at
//! 300 K has its first excitation ~4.6e21 kT up, beyond any sum, and must be
//! refused with that size stated rather than answered with q = 0.

mod common;

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// The oracle's cases, one test each below.
const CASES: [&str; 7] = [
    "oscillator_2358_cm1_from_3_to_24_k",
    "hydrogen_rotor_at_1_k",
    "hydrogen_rotor_at_5_k",
    "para_hydrogen_rotor_at_2_k",
    "ortho_hydrogen_rotor_at_2_k",
    "vibrating_rotor_spin_1_at_1_k",
    "vibrating_rotor_spin_1_at_2_k",
];

fn oracle_path() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests")
        .join("crosscheck")
        .join("cold_oracle.py")
}

/// Runs the oracle, or `None` (after saying so) where mpmath cannot be had.
fn python(test: &str, args: &[&str]) -> Option<Output> {
    if !common::mpmath_available(test) {
        return None;
    }
    Command::new("python3")
        .arg(oracle_path())
        .args(args)
        .output()
        .map(Some)
        .expect("failed to start python3 on tests/crosscheck/cold_oracle.py")
}

/// Runs one oracle case against the zsum binary: the oracle must exit 0 and
/// print exactly one verdict line, `PASS  <case>: ...`.
fn oracle_case(case: &str) {
    let Some(out) = python(case, &[env!("CARGO_BIN_EXE_zsum"), case]) else {
        return;
    };
    let stdout = String::from_utf8_lossy(&out.stdout);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        out.status.success(),
        "the mpmath oracle disagrees with zsum (or failed) on {case}, status {:?}\n\
         --- stdout ---\n{stdout}\n--- stderr ---\n{stderr}",
        out.status.code()
    );
    let verdicts: Vec<&str> = stdout
        .lines()
        .filter(|l| l.starts_with("PASS  ") || l.starts_with("FAIL  "))
        .collect();
    assert_eq!(
        verdicts.len(),
        1,
        "expected exactly one verdict line for {case}\n{stdout}"
    );
    assert!(
        verdicts[0].starts_with(&format!("PASS  {case}: ")),
        "expected `PASS  {case}: ...`, got {:?}\n{stdout}",
        verdicts[0]
    );
    println!("{stdout}");
}

#[test]
fn every_oracle_case_has_a_test_here() {
    let Some(out) = python("every_oracle_case_has_a_test_here", &["--list"]) else {
        return;
    };
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let listed: Vec<String> = String::from_utf8_lossy(&out.stdout)
        .lines()
        .map(str::to_string)
        .collect();
    assert_eq!(
        listed, CASES,
        "cold_oracle.py --list and this file's CASES differ"
    );
}

#[test]
fn oscillator_2358_cm1_from_3_to_24_k_matches_mpmath() {
    // `zsum sum oscillator --freq 2358.57 --T 3|6|21|24`: ln q from 5.6e-492
    // (3 K, where the oracle needs 600 digits) to 3.9e-62 (24 K).
    oracle_case(CASES[0]);
}

#[test]
fn hydrogen_rotor_at_1_k_matches_mpmath() {
    // `zsum thermo rotor --B 59.322 --T 1`: ln q ≈ 2.2e-74.
    oracle_case(CASES[1]);
}

#[test]
fn hydrogen_rotor_at_5_k_matches_mpmath() {
    // `zsum thermo rotor --B 59.322 --T 5`: ln q ≈ 4.5e-15.
    oracle_case(CASES[2]);
}

#[test]
fn para_hydrogen_rotor_at_2_k_matches_mpmath() {
    // `--spin 1/2 --only para`: even J, weight 1 (zsum's description must
    // state weights 1 : 0); ln q ≈ 3.1e-111.
    oracle_case(CASES[3]);
}

#[test]
fn ortho_hydrogen_rotor_at_2_k_matches_mpmath() {
    // `--spin 1/2 --only ortho`: odd J, weight 3, ground J = 1 with 9
    // states: ln q = ln 9 − 2B/kT + ~1e-185, Cv/k ≈ 2e-180 (a cancellation
    // of ~184 digits in S2/S0 − (S1/S0)², charged in full by the oracle).
    oracle_case(CASES[4]);
}

#[test]
fn vibrating_rotor_spin_1_at_1_k_matches_mpmath() {
    // `zsum thermo diatomic --we 2358.57 --wexe 14.324 --Be 1.99824
    // --alpha 0.017318 --spin 1 --T 1`: energies from the potential minimum
    // (ln q ≈ −1690), weights even J : odd J = 6 : 3, v = 0..81.
    oracle_case(CASES[5]);
}

#[test]
fn vibrating_rotor_spin_1_at_2_k_matches_mpmath() {
    // The same at 2 K.
    oracle_case(CASES[6]);
}

#[test]
fn rotor_in_joules_at_300_k_is_refused_not_zero() {
    let args = [
        "sum", "rotor", "--B", "1.9", "--unit", "J", "--only", "odd", "--T", "300",
    ];
    let out = Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .output()
        .expect("failed to start the zsum binary");
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{args:?}: {stderr}");
    assert!(
        out.stdout.is_empty(),
        "{args:?} wrote to stdout: {}",
        String::from_utf8_lossy(&out.stdout)
    );
    assert!(
        stderr.contains("kT"),
        "the refusal must state the size of the excitation in kT: {stderr}"
    );
    // Odd J only: the ground is J = 1 and the first excited level J = 3,
    // E_3 − E_1 = (12 − 2) B = 19 J, against kT = 1.380649e-23 J/K × 300 K
    // (SI 2019 exact k): about 4.587e21 kT. The number written before "kT"
    // must be that size, to 1%.
    let gap_in_kt = 10.0 * 1.9 / (1.380649e-23 * 300.0);
    let stated: Vec<f64> = stderr
        .match_indices(" kT")
        .filter_map(|(i, _)| {
            stderr[..i]
                .split_whitespace()
                .last()
                .and_then(|w| w.trim_start_matches('~').parse::<f64>().ok())
        })
        .collect();
    assert!(
        stated.iter().any(|&x| (x / gap_in_kt - 1.0).abs() < 0.01),
        "expected the excitation ≈ {gap_in_kt:.3e} kT in the message, found {stated:?}: {stderr}"
    );
}
