//! Cross-check against an independent oracle outside the project:
//! `tests/crosscheck/oracle.py` sums the partition functions directly with
//! Python's mpmath (arbitrary-precision floating point) at 50 digits, runs
//! the zsum binary with `--digits 30 --format json`, and requires every
//! printed digit of q, ln q, U/kT, Cv/k, S/k and F/kT to equal the oracle's
//! value correctly rounded to 30 significant digits. It exits non-zero with
//! a report naming the command, the oracle's value and zsum's value if any
//! digit disagrees.
//!
//! `.ci/setup` installs mpmath; only where it truly cannot be had do these
//! tests skip, saying so on the terminal (`common::mpmath_available`).

mod common;

use std::path::Path;
use std::process::Command;

#[test]
fn zsum_agrees_with_the_mpmath_oracle_to_30_digits() {
    if !common::mpmath_available("zsum_agrees_with_the_mpmath_oracle_to_30_digits") {
        return;
    }
    let oracle = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests")
        .join("crosscheck")
        .join("oracle.py");
    let out = Command::new("python3")
        .arg(&oracle)
        .arg(env!("CARGO_BIN_EXE_zsum"))
        .output()
        .expect("failed to start python3 on tests/crosscheck/oracle.py");
    let stdout = String::from_utf8_lossy(&out.stdout);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        out.status.success(),
        "the mpmath oracle disagrees with zsum (or failed), status {:?}\n\
         --- stdout ---\n{stdout}\n--- stderr ---\n{stderr}",
        out.status.code()
    );
    // The oracle reports one verdict line per case; make sure it really ran
    // its cases and all of them passed.
    let passed = stdout.lines().filter(|l| l.starts_with("PASS")).count();
    let failed = stdout.lines().filter(|l| l.starts_with("FAIL")).count();
    assert!(
        passed >= 11 && failed == 0,
        "expected at least 11 PASS lines and no FAIL, got {passed} PASS, {failed} FAIL\n{stdout}"
    );
    println!("{stdout}");
}

/// Runs `tests/crosscheck/<script>` on the zsum binary with `args` (paths
/// relative to the crate), requires it to succeed and to print `passes`
/// PASS lines.
fn oracle_passes(script: &str, args: &[&str], passes: usize) {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR"));
    let out = Command::new("python3")
        .arg(dir.join("tests/crosscheck").join(script))
        .arg(env!("CARGO_BIN_EXE_zsum"))
        .args(args.iter().map(|a| dir.join(a)))
        .output()
        .unwrap_or_else(|e| panic!("failed to start python3 on tests/crosscheck/{script}: {e}"));
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{stdout}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert_eq!(
        stdout.lines().filter(|l| l.starts_with("PASS")).count(),
        passes,
        "{stdout}"
    );
}

#[test]
fn ensemble_agrees_with_an_mpmath_recursion_to_20_digits() {
    // tests/crosscheck/ensemble_oracle.py: bosons and fermions (N = 10, 50)
    // in an isotropic 3D harmonic trap, Q_N by the cycle recursion in mpmath
    // at 80 digits; zsum's 20 printed digits must be correctly rounded.
    if !common::mpmath_available("ensemble_agrees_with_an_mpmath_recursion_to_20_digits") {
        return;
    }
    oracle_passes(
        "ensemble_oracle.py",
        &["examples/systems/atom_trap.toml"],
        12,
    );
}

#[test]
fn einstein_table_agrees_with_mpmath_digamma_to_20_digits() {
    // tests/crosscheck/einstein_oracle.py: Ω by Python's exact math.comb,
    // ψ(q + N) − ψ(q + 1) by mpmath's digamma at 50 digits, and the
    // canonical U and S from the occupation form; every row of five tables
    // (N = 2 to 1000) must carry zsum's 20 digits correctly rounded.
    if !common::mpmath_available("einstein_table_agrees_with_mpmath_digamma_to_20_digits") {
        return;
    }
    oracle_passes("einstein_oracle.py", &[], 5);
}
