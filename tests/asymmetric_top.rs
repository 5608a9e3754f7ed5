//! The asymmetric top as a spectrum: its partition function against the
//! classical limit, spin statistics, the symmetric-top limits through the
//! whole listing, Ziv consistency, the CLI and system files, bad input.
//!
//! Water's ground-state constants A = 27.8806, B = 14.5218, C = 9.2777
//! cm⁻¹ (from memory) set the scale; they are model input here, not data
//! checked against measurement (tests/asymmetric_math.rs compares the term
//! values with observed ones).

mod common;

use common::{json, refused};
use num_rational::BigRational;
use zsum::exact::parse_rational;
use zsum::models::asym_top::{pair_weights, AsymmetricTop, Axis};
use zsum::models::asymmetric::AsymmetricTopMath;
use zsum::models::rotor::{SymmetricTop, TopShape};
use zsum::report::ThermoPoint;
use zsum::spectrum::Spectrum;
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn top(a: &str, b: &str, c: &str) -> AsymmetricTop {
    AsymmetricTop::new(
        AsymmetricTopMath::rigid(r(a), r(b), r(c)).unwrap(),
        EnergyUnit::Wavenumber,
    )
}

fn water() -> AsymmetricTop {
    top("27.8806", "14.5218", "9.2777")
}

fn q_at(s: &dyn Spectrum, t: &str, digits: u32) -> ThermoPoint {
    let p = thermo(s, &Temperature::Kelvin(r(t)), digits).unwrap();
    assert!(p.certified, "{} at {t} K not certified", s.describe());
    ThermoPoint::of(&p)
}

fn f(s: &str) -> f64 {
    s.parse().unwrap()
}

/// The classical q with its first correction,
/// sqrt(π (kT)³/(ABC)) [1 + (2(A+B+C) − AB/C − BC/A − CA/B)/12kT]
/// (the asymmetric-top expansion, from memory; for B = C it is the
/// symmetric top's [1 + (B/12kT)(4 − B/A)]), energies in cm⁻¹ with
/// kT = T / 1.438776877 cm⁻¹ (c2 = 1.438776877 cm K, CODATA).
fn classical_first(t: f64) -> (f64, f64) {
    let (a, b, c) = (27.8806, 14.5218, 9.2777);
    let kt = t / 1.438776877;
    let classical = (std::f64::consts::PI * kt.powi(3) / (a * b * c)).sqrt();
    let corr = (2.0 * (a + b + c) - a * b / c - b * c / a - c * a / b) / (12.0 * kt);
    (classical, classical * (1.0 + corr))
}

#[test]
fn water_q_approaches_the_classical_limit_with_its_first_correction() {
    // The exact sum against the classical form: the classical error falls
    // like 1/T, the corrected one like 1/T² (a threefold rise in T cuts it
    // about tenfold).
    let mut corrected = Vec::new();
    for t in ["300", "1000"] {
        let q = f(&q_at(&water(), t, 20).q);
        let (cl, first) = classical_first(f(t));
        let (e0, e1) = ((cl / q - 1.0).abs(), (first / q - 1.0).abs());
        assert!(e1 < e0 / 20.0, "T = {t}: {e0} vs {e1}");
        corrected.push(e1);
    }
    let ratio = corrected[0] / corrected[1];
    assert!((7.0..16.0).contains(&ratio), "1/T² fall: ratio {ratio}");
    assert!(corrected[0] < 5e-4, "{}", corrected[0]);
}

#[test]
fn ortho_to_para_tends_to_three_to_one() {
    // Two protons exchanged about b: ortho (Ka + Kc odd) weighs 3, para 1;
    // at high T each class holds a quarter of the rotational states.
    let w = pair_weights(1, Axis::B);
    assert_eq!(w.clone().map(|x| x.to_string()), ["1", "3", "3", "1"]);
    let only = |keep: [u32; 4]| {
        water()
            .with_weights(keep.map(num_bigint::BigUint::from))
            .unwrap()
    };
    let ortho = only([0, 3, 3, 0]);
    let para = only([1, 0, 0, 1]);
    let ratio = |t: &str| f(&q_at(&ortho, t, 15).q) / f(&q_at(&para, t, 15).q);
    let hot = ratio("800");
    assert!((hot - 3.0).abs() < 2e-3, "800 K: {hot}");
    // Cold: para's 0_00 dominates, ortho's lowest is 1_01 = B + C above it.
    let cold = ratio("5");
    assert!(cold < 0.2, "5 K: {cold}");
    // Mixture = ortho + para, state for state.
    let both = q_at(&water().with_weights(w).unwrap(), "300", 15);
    let sum = f(&q_at(&ortho, "300", 15).q) + f(&q_at(&para, "300", 15).q);
    assert!((f(&both.q) / sum - 1.0).abs() < 1e-13);
}

#[test]
fn thirty_digits_are_the_sixty_rounded_and_the_cold_end_is_certified() {
    for t in ["0.5", "5", "300"] {
        let a = q_at(&water(), t, 30);
        let b = q_at(&water(), t, 60);
        for (x, y) in [
            (&a.q, &b.q),
            (&a.u_over_kt, &b.u_over_kt),
            (&a.cv_over_k, &b.cv_over_k),
        ] {
            assert_eq!(x, &zsum::exact::format_sig(&r(y), 30), "T = {t}");
        }
    }
    // At 0.05 K the first excitation (1_01, 23.8 cm⁻¹) is about 685 kT up:
    // ln q ≈ 9 e^−685 ≈ 1e−297, every digit certified.
    let cold = q_at(&water(), "0.05", 20);
    assert!(cold.ln_q.contains("e-29"), "{}", cold.ln_q);
}

#[test]
fn symmetric_limits_list_exactly_the_symmetric_top() {
    // B = C (prolate) and A = B (oblate): same energies, same degeneracies,
    // every energy exact.
    let cut = r("400");
    let symmetric = |shape, unique: &str, b: &str| {
        let z = || r("0");
        SymmetricTop::new(
            shape,
            r(unique),
            r(b),
            z(),
            z(),
            z(),
            EnergyUnit::Wavenumber,
        )
        .unwrap()
        .levels_up_to(&cut)
        .unwrap()
    };
    let prolate = top("5", "2", "2").levels_up_to(&cut).unwrap();
    assert!(prolate.is_exact());
    assert_eq!(prolate, symmetric(TopShape::Prolate, "5", "2"));
    let oblate = top("3", "3", "1").levels_up_to(&cut).unwrap();
    assert!(oblate.is_exact());
    assert_eq!(oblate, symmetric(TopShape::Oblate, "1", "3"));
}

#[test]
fn the_cli_and_a_system_file_give_the_same_certified_levels() {
    let cli = json(&[
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
        "150",
        "--format",
        "json",
    ]);
    let levels = cli["levels"].as_array().unwrap();
    assert_eq!(levels.len(), 11);
    // 2_02 is irrational: marked, with an enclosure around the printed value.
    let l = &levels[4];
    assert!(l["energy"].as_str().unwrap().starts_with("~70.1329"), "{l}");
    let enc = l["enclosure"].as_array().unwrap();
    let (lo, hi) = (r(enc[0].as_str().unwrap()), r(enc[1].as_str().unwrap()));
    assert!(lo < hi && &hi - &lo < r("1e-20"));
    assert_eq!(l["terms"], serde_json::json!([[2, 0, 2]]));
    assert_eq!(l["degeneracy"], "5");
    // 1_01 = B + C exactly, ortho: 3 M states × 3.
    assert_eq!(levels[1]["energy"], "47599/2000");
    assert_eq!(levels[1]["degeneracy"], "9");
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("water.toml");
    std::fs::write(
        &path,
        "unit = \"cm-1\"\n\n[[part]]\nname = \"rotation\"\nkind = \"asymmetric_top\"\n\
         A = \"27.8806 cm-1\"\nB = \"14.5218 cm-1\"\nC = \"9.2777 cm-1\"\npair_spin = \"1/2\"\n\
         pair_axis = \"b\"\n",
    )
    .unwrap();
    let sys = json(&[
        "levels",
        "--system",
        path.to_str().unwrap(),
        "--up-to",
        "150",
        "--format",
        "json",
    ]);
    let energies = |v: &serde_json::Value| -> Vec<(String, String)> {
        v["levels"]
            .as_array()
            .unwrap()
            .iter()
            .map(|l| (l["energy"].to_string(), l["degeneracy"].to_string()))
            .collect()
    };
    assert_eq!(energies(&cli), energies(&sys));
}

#[test]
fn bad_asymmetric_tops_are_refused_with_status_2() {
    let base = ["thermo", "top", "--B", "14.5", "--T", "300"];
    let with = |extra: &[&'static str]| -> Vec<&'static str> {
        base.iter().copied().chain(extra.iter().copied()).collect()
    };
    // A below B.
    refused(&with(&["--A", "10", "--C", "9"]), "A ≥ B ≥ C");
    // A non-positive constant.
    refused(&with(&["--A", "27", "--C", "-1"]), "C");
    // Weights that leave no level.
    refused(
        &with(&["--A", "27", "--C", "9", "--weights", "0:0:0:0"]),
        "at least one symmetry class",
    );
    // Half a nuclear-spin pair (clap's own refusal, status 2).
    let out = common::run(&with(&["--A", "27", "--C", "9", "--pair-spin", "1/2"]));
    assert_eq!(out.status.code(), Some(2));
    assert!(out.stdout.is_empty());
    // Asymmetric-only flags on a symmetric top.
    refused(&with(&["--A", "27", "--dJ", "0.001"]), "asymmetric top");
    // Work beyond the time budget is refused from its estimate, at once:
    // at 1e5 K the sum would need J up to about 775.
    refused(
        &[
            "thermo", "top", "--A", "27.8806", "--B", "14.5218", "--C", "9.2777", "--T", "1e5",
        ],
        "would take about",
    );
    // A distortion that turns the levels over at once.
    refused(
        &with(&["--A", "27", "--C", "9", "--DJ", "10"]),
        "already at J = 1",
    );
}
