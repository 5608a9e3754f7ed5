//! Assigned levels checked against models: exactly the rows that are
//! wrong are flagged, and the missing allowed levels are exactly those
//! without rows. The model energies are zsum's own exact formulas (rigid
//! rotor E = B J(J+1), symmetric top E = B J(J+1) + (A − B) K²: standard
//! spectroscopy, common practice); the term values in these tests are
//! made from them, so every residual is known exactly.

mod common;

use num_rational::BigRational;
use zsum::assign::{check, Assignments, CheckOptions, NotAllowed};
use zsum::exact::{exact_decimal, parse_rational};
use zsum::models::diatomic::ParityWeights;
use zsum::models::rotor::{LinearRotor, SymmetricTop, TopShape};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn rotor_rows(b: &BigRational, js: impl Iterator<Item = i64>) -> String {
    let mut text = String::from("numbers = J\nunit = cm-1\n");
    for j in js {
        let e = b * BigRational::from_integer((j * (j + 1)).into());
        text.push_str(&format!("{j} {} 0.001\n", exact_decimal(&e, 30)));
    }
    text
}

#[test]
fn a_complete_list_has_no_missing_level_and_removing_three_reports_those() {
    let b = r("1.9225");
    let rotor = LinearRotor::rigid(b.clone(), EnergyUnit::Wavenumber).unwrap();
    let full = Assignments::parse(&rotor_rows(&b, 0..=30), "full").unwrap();
    let c = check(&full, &rotor, &CheckOptions::default()).unwrap();
    assert!(c.missing.is_empty(), "{:?}", c.missing);
    assert!(c.flagged_lines().is_empty());
    assert_eq!(c.groups.len(), 1);
    assert_eq!((c.groups[0].measured, c.groups[0].allowed), (31, 31));
    assert!(c
        .rows
        .iter()
        .all(|x| x.residual == Some(BigRational::from_integer(0.into()))));
    let cut = Assignments::parse(
        &rotor_rows(&b, (0..=30).filter(|j| ![4, 17, 29].contains(j))),
        "cut",
    )
    .unwrap();
    let c = check(&cut, &rotor, &CheckOptions::default()).unwrap();
    let missing: Vec<Vec<i64>> = c.missing.iter().map(|m| m.numbers.clone()).collect();
    assert_eq!(missing, vec![vec![4], vec![17], vec![29]]);
    assert_eq!(
        c.missing[1].energy,
        &b * BigRational::from_integer(306.into())
    );
    assert_eq!((c.groups[0].measured, c.groups[0].allowed), (28, 31));
}

#[test]
fn exactly_the_wrong_rows_are_flagged() {
    // A rotor with spin-0 identical nuclei (only even J, like 16O=C=16O's
    // ground state): rows for J = 0..12 even, plus
    //   line 10: J = 3, forbidden by the nuclear-spin statistics;
    //   lines 11, 12: J = 8 twice, 2.5 sigma either side of the model
    //     (each within 3 sigma of it, but 3.54 sigma apart: inconsistent);
    //   line 13: J = 10 assigned to J = 12's value (a misassignment);
    //   line 14: J = -1 (impossible).
    let b = r("0.39022");
    let rotor = LinearRotor::rigid(b.clone(), EnergyUnit::Wavenumber)
        .unwrap()
        .with_weights(ParityWeights::new(1u32.into(), 0u32.into()).unwrap());
    let e = |j: i64| exact_decimal(&(&b * BigRational::from_integer((j * (j + 1)).into())), 30);
    let text = format!(
        "numbers = J\n\
         0 0 0.001\n2 {} 0.001\n4 {} 0.001\n6 {} 0.001\n12 {} 0.001\n\
         # five rows above (lines 2-6), comments below\n\
         #\n\
         # the wrong ones:\n\
         3 {} 0.001\n\
         8 {} 0.001\n8 {} 0.001\n\
         10 {} 0.001\n\
         -1 0.5 0.001\n",
        e(2),
        e(4),
        e(6),
        e(12),
        e(3),
        exact_decimal(&(r(&e(8)) - r("0.0025")), 30),
        exact_decimal(&(r(&e(8)) + r("0.0025")), 30),
        e(12),
    );
    let a = Assignments::parse(&text, "wrong").unwrap();
    let c = check(&a, &rotor, &CheckOptions::default()).unwrap();
    assert_eq!(c.flagged_lines(), vec![10, 11, 12, 13, 14]);
    let by_line = |l: usize| c.rows.iter().find(|x| x.row.line == l).unwrap();
    assert_eq!(by_line(10).model, Err(NotAllowed::Forbidden));
    assert!(matches!(by_line(14).model, Err(NotAllowed::Impossible(_))));
    assert!(by_line(13).suspect);
    assert!(!by_line(11).suspect && !by_line(12).suspect);
    assert_eq!(c.duplicates.len(), 1);
    assert!(!c.duplicates[0].consistent);
    // |a − b|/√(σa² + σb²) = 0.005/(0.001·√2).
    assert!((c.duplicates[0].worst - 0.005 / (0.001 * 2f64.sqrt())).abs() < 1e-9);
    // Nothing else is flagged, and J = 10's true level (with no row of its
    // own: the row on line 13 claims it) is not reported missing.
    assert!(c.missing.is_empty(), "{:?}", c.missing);
}

#[test]
fn a_top_refuses_k_beyond_j_and_checks_degeneracies() {
    let top = SymmetricTop::rigid(
        TopShape::Prolate,
        r("5.2"),
        r("0.25"),
        EnergyUnit::Wavenumber,
    )
    .unwrap();
    let e = |j: i64, k: i64| {
        exact_decimal(
            &(r("0.25") * BigRational::from_integer((j * (j + 1)).into())
                + r("4.95") * BigRational::from_integer((k * k).into())),
            30,
        )
    };
    // K = ±k levels hold 2(2J+1) states; K = 0 holds 2J+1.
    let text = format!(
        "numbers = J K\n0 0 0 0.01\n1 0 {} 0.01 g=3\n1 1 {} 0.01 g=6\n2 -1 {} 0.01 g=5\n1 2 {} 0.01\n",
        e(1, 0),
        e(1, 1),
        e(2, 1),
        e(2, 2)
    );
    let a = Assignments::parse(&text, "top").unwrap();
    let c = check(&a, &top, &CheckOptions::default()).unwrap();
    assert_eq!(c.flagged_lines(), vec![5, 6]);
    assert_eq!(c.rows[3].degeneracy_mismatch, Some(10u32.into()));
    match &c.rows[4].model {
        Err(NotAllowed::Impossible(why)) => assert!(why.contains("|K| = 2 exceeds J = 1"), "{why}"),
        other => panic!("{other:?}"),
    }
}

#[test]
fn malformed_files_name_file_line_and_field() {
    let bad = [
        (
            "numbers = J\n0 0 0.1\n1.5 3 0.1\n",
            "line 3, field J: \"1.5\"",
        ),
        ("numbers = J\n0 0\n", "line 2, field uncertainty"),
        ("numbers = J\n0 0 0\n", "line 2, field uncertainty: \"0\""),
        (
            "numbers = J\n0 0 -0.1\n",
            "line 2, field uncertainty: \"-0.1\"",
        ),
        ("0 0 0.1\n", "line 1, field row"),
        ("numbers = J\n0 0 0.1 g=0\n", "line 2, field g: \"0\""),
        (
            "numbers = J\n0 0 0.1 weight=2\n",
            "line 2, field option: \"weight=2\"",
        ),
        (
            "numbers = J\nunit = furlong\n",
            "line 2, field unit: \"furlong\"",
        ),
        (
            "numbers = J\n0 abc 0.1\n",
            "line 2, field term value: \"abc\"",
        ),
        ("# nothing\n\n", "no `numbers = ...` line"),
        ("numbers = J\n", "it has no rows"),
        ("numbers = J J\n", "J is named twice"),
    ];
    for (text, needle) in bad {
        let e = Assignments::parse(text, "bad.assign")
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("bad.assign") && e.contains(needle),
            "{text:?}: {e}"
        );
    }
    // Units convert exactly: 1 K = 0.69503... cm-1 (c2 = hc/k).
    let a = Assignments::parse("numbers = J\n0 0 0.1\n1 1 K 1 K\n", "units").unwrap();
    let per_k = EnergyUnit::Kelvin
        .convert(&r("1"), &EnergyUnit::Wavenumber)
        .unwrap();
    assert_eq!(a.rows[1].term, per_k);
    assert_eq!(a.rows[1].sigma, per_k);
}

#[test]
fn names_the_model_does_not_use_are_refused() {
    let rotor = LinearRotor::rigid(r("2"), EnergyUnit::Wavenumber).unwrap();
    let a = Assignments::parse("numbers = v J\n0 0 0 0.1\n", "vj").unwrap();
    let e = check(&a, &rotor, &CheckOptions::default())
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("quantum number v is not allowed") && e.contains("labels its levels by J only"),
        "{e}"
    );
}

#[test]
fn the_cli_check_exits_2_on_bad_input_and_writes_nothing() {
    let dir = std::env::temp_dir().join(format!("zsum-assign-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let bad = dir.join("bad.assign");
    std::fs::write(&bad, "numbers = J\n0 0 0.1\n2 x 0.1\n").unwrap();
    let out = dir.join("out.json");
    let o = common::run(&[
        "assign",
        "check",
        bad.to_str().unwrap(),
        "--output",
        out.to_str().unwrap(),
        "rotor",
        "--B",
        "2",
    ]);
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(err.contains("line 3, field term value"), "{err}");
    assert!(!out.exists());
    // The README's example: exactly the planted faults are flagged.
    let o = common::run(&[
        "assign",
        "check",
        "examples/assignments/kestrel_co.assign",
        "--format",
        "json",
        "rotor",
        "--B",
        "1.9225288",
        "--D",
        "6.1215e-6",
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["flagged_lines"], serde_json::json!([14, 18]));
    assert_eq!(v["missing"][0]["numbers"], serde_json::json!([10]));
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn measured_levels_merge_duplicates_and_take_the_models_degeneracies() {
    let b = r("1.9225288");
    let rotor = LinearRotor::new(b, r("6.1215e-6"), r("0"), EnergyUnit::Wavenumber).unwrap();
    let a = Assignments::read(std::path::Path::new(
        "examples/assignments/kestrel_co.assign",
    ))
    .unwrap();
    let o = CheckOptions {
        with_states: true,
        ..CheckOptions::default()
    };
    let c = check(&a, &rotor, &o).unwrap();
    let list = c.measured_levels().unwrap();
    // 13 rows: J = 0..12 without 10, J = 5 twice.
    assert_eq!(list.len(), 12);
    let j5 = list.iter().find(|l| l.degeneracy == 11u32.into()).unwrap();
    assert_eq!(j5.energy, (r("57.670351") + r("57.670363")) / r("2"));
    // The J = 4 row's wrong g=8 gives way to the model's 9 states.
    assert!(list
        .iter()
        .any(|l| l.degeneracy == 9u32.into() && l.energy == r("38.448108")));
    let total: num_bigint::BigUint = list.iter().map(|l| l.degeneracy.clone()).sum();
    assert_eq!(total, (169u32 - 21).into());
    // Without the states counted there is no degeneracy for unlabelled rows.
    let bare = check(&a, &rotor, &CheckOptions::default()).unwrap();
    assert!(bare
        .measured_levels()
        .unwrap_err()
        .to_string()
        .contains("degeneracy is unknown"));
}
