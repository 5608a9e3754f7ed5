//! User-supplied level files and Zeeman multiplets: the file format, exact
//! unit conversion, every refused input, and the Zeeman levels against an
//! independent floating-point computation and CODATA ratios.

mod common;

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use proptest::prelude::*;
use zsum::exact::{parse_rational, rational_string};
use zsum::models::level_file::{LevelFile, MAX_LISTED_STATES};
use zsum::models::zeeman::{bohr_magneton, parse_field_tesla, parse_j, ZeemanMultiplet};
use zsum::spectrum::{Budget, Spectrum, State};
use zsum::units::{constants, EnergyUnit};
use zsum::ErrorKind;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn big(s: &str) -> BigUint {
    s.parse().unwrap()
}

/// The (energy, degeneracy) pairs of a spectrum up to `cutoff`, as text.
fn pairs(s: &dyn Spectrum, cutoff: &str) -> Vec<(String, String)> {
    s.levels_up_to(&r(cutoff))
        .unwrap()
        .iter()
        .map(|l| (rational_string(&l.energy), l.degeneracy.to_string()))
        .collect()
}

fn rel_close(a: f64, b: f64, tol: f64) -> bool {
    ((a - b) / b).abs() <= tol
}

// ---------------------------------------------------------------- level files

/// Fluorine atom ground configuration 2p⁵: 2P3/2 (g = 4) with 2P1/2
/// (g = 2) at 404.1 cm⁻¹ (from memory; NIST ASD gives about 404.14 cm⁻¹).
const FLUORINE: &str = "\
# Fluorine atom, 2p5 ground configuration (from memory)
# energy  unit  g  term
0       cm-1  4  2P3/2   # ground level
404.1   cm-1  2  2P1/2
";

#[test]
fn fluorine_ground_term_levels_are_exact() {
    let f = LevelFile::parse(FLUORINE, "fluorine.txt").unwrap();
    assert_eq!(f.unit(), EnergyUnit::Wavenumber);
    assert_eq!(
        pairs(&f, "1000"),
        [
            ("0".to_string(), "4".to_string()),
            ("4041/10".to_string(), "2".to_string())
        ]
    );
    assert_eq!(f.ground_energy(), r("0"));
    assert_eq!(f.labels_at(&r("0")), ["2P3/2"]);
    assert_eq!(f.labels_at(&r("404.1")), ["2P1/2"]);
    assert!(f.labels_at(&r("200")).is_empty());
    // Exact counts: 4 states up to anything below 404.1, 6 from there on.
    assert_eq!(f.count_bound(&r("-1")), 0u32.into());
    assert_eq!(f.count_bound(&r("404.09999")), 4u32.into());
    assert_eq!(f.count_bound(&r("404.1")), 6u32.into());
    assert_eq!(f.count_bound(&r("1e9")), 6u32.into());
    // States are (term, sub): term = position among the level lines.
    assert_eq!(
        f.states_at(&r("404.1")).unwrap(),
        [State(vec![2, 1]), State(vec![2, 2])]
    );
    assert_eq!(f.states_at(&r("0")).unwrap().len(), 4);
    assert_eq!(f.quantum_numbers(), ["term", "sub"]);
    assert_eq!(f.terms()[1].line, Some(4));
    assert!(f.describe().contains("fluorine.txt"), "{}", f.describe());
    assert!(f.warnings(&r("1000")).is_empty());
    common::check_spectrum(&f, &r("1000"), 10);

    // The same list in kelvin: 404.1 cm⁻¹ × 1.438776877 K/cm⁻¹ (c₂ = hc/k,
    // CODATA 2018) = 581.4097 K, checked against f64 at 1e-12 relative.
    let k = f.with_unit(&EnergyUnit::Kelvin).unwrap();
    let top = k.levels().levels()[1].energy.to_f64().unwrap();
    assert!(rel_close(top, 404.1 * 1.438776877, 1e-9), "{top}");
    let independent = 404.1 * 6.62607015e-34 * 299792458.0 * 100.0 / 1.380649e-23;
    assert!(rel_close(top, independent, 1e-12), "{top} vs {independent}");
    assert_eq!(k.labels_at(&k.levels().levels()[1].energy), ["2P1/2"]);
}

#[test]
fn chlorine_fine_structure_in_kelvin() {
    // Chlorine 3p⁵: 2P1/2 at 882.35 cm⁻¹ above 2P3/2 (from memory). The
    // first line's unit (cm-1) sets the list's unit.
    let f = LevelFile::parse("0 cm-1 4 2P3/2\n882.35 cm-1 2 2P1/2\n", "Cl").unwrap();
    let e = &f.levels().levels()[1].energy;
    assert_eq!(e, &r("882.35"));
    // Exactly 88235/100 × 100 × hc/k kelvin.
    let k = f.with_unit(&EnergyUnit::Kelvin).unwrap();
    let expect = r("88235/100") * r("100") * constants::second_radiation_constant();
    assert_eq!(k.levels().levels()[1].energy, expect);
    // About 1269.5 K (f64 cross-check at 1e-12).
    let f64_k = 882.35 * 6.62607015e-34 * 299792458.0 * 100.0 / 1.380649e-23;
    assert!(rel_close(expect.to_f64().unwrap(), f64_k, 1e-12));
    common::check_spectrum(&k, &r("2000"), 4);
}

/// A demo file (invented numbers) that uses every feature of the format:
/// comments, blank lines, tabs, trailing spaces, CRLF line ends, a byte-order
/// mark, multi-word and Unicode labels, fractions, exponents,
/// a negative energy and a label-less line.
#[test]
fn demo_file_with_every_feature() {
    let text = "\u{feff}# demo levels (invented numbers)\r\n\
                \r\n\
                0\tcm-1\t2\t ground  doublet   \r\n\
                \t  1.5e2 cm-1 3 ³P₁ (Unicode label)  # trailing comment\r\n\
                27/4 cm^-1 1\r\n\
                -1000.5 cm⁻¹ 5 below\u{00a0}zero\r\n\
                # last line has no newline\r\n\
                2e3 1/cm 1000000000000000000000000000000 huge";
    let f = LevelFile::parse(text, "demo").unwrap();
    assert_eq!(
        pairs(&f, "1e4"),
        [
            ("-2001/2".to_string(), "5".to_string()),
            ("0".to_string(), "2".to_string()),
            ("27/4".to_string(), "1".to_string()),
            ("150".to_string(), "3".to_string()),
            (
                "2000".to_string(),
                "1000000000000000000000000000000".to_string()
            ),
        ]
    );
    let t = f.terms();
    assert_eq!(t.len(), 5);
    assert_eq!(t[0].label.as_deref(), Some("ground doublet"));
    assert_eq!(t[1].label.as_deref(), Some("³P₁ (Unicode label)"));
    assert_eq!(t[2].label, None);
    assert_eq!(t[3].label.as_deref(), Some("below zero"));
    let lines: Vec<_> = t.iter().map(|t| t.line.unwrap()).collect();
    assert_eq!(lines, [3, 4, 5, 6, 8]);
    assert_eq!(f.ground_energy(), r("-1000.5"));
    assert_eq!(
        f.count_bound(&r("1e4")),
        big("1000000000000000000000000000011")
    );
    // A level too degenerate to list is refused, not allocated.
    let err = f.states_at(&r("2000")).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Budget);
    assert!(err.message().contains("1000000000000000000000000000000"));
    // Terms keep their position among level lines (term 3 = 27/4).
    assert_eq!(f.states_at(&r("27/4")).unwrap(), [State(vec![3, 1])]);
    // Cutoff below the ground level is refused, naming both.
    let err = f.levels_up_to(&r("-2000")).unwrap_err();
    assert!(err.message().contains("-2000") && err.message().contains("-2001/2"));
    common::check_spectrum(&f, &r("1000"), 10);
}

#[test]
fn mixed_units_convert_exactly_to_the_first_unit() {
    // x cm⁻¹ is exactly x · 100 · hc/k kelvin (c₂ = hc/k exact since the
    // 2019 SI). Written as an exact fraction in K, it must land on the very
    // same energy as the cm⁻¹ line and merge with it.
    let x = r("404.1");
    let in_k = &x * r("100") * constants::second_radiation_constant();
    // 1 eV and 1000 meV are the same energy, as are 1 kJ/mol written two ways.
    let text = format!(
        "404.1 cm-1 2 A\n{} K 1 B\n1 eV 1 C\n1000 meV 1 D\n1 kJ/mol 1 E\n1000e-3 kJ/mol 1 F\n",
        rational_string(&in_k)
    );
    let f = LevelFile::parse(&text, "mixed").unwrap();
    assert_eq!(f.unit(), EnergyUnit::Wavenumber);
    let levels = f.levels().levels();
    assert_eq!(levels.len(), 3);
    assert_eq!(levels[1].energy, x);
    assert_eq!(levels[1].degeneracy, 3u32.into());
    assert_eq!(f.labels_at(&x), ["A + B"]);
    let w = f.warnings(&r("1e6"));
    assert_eq!(w.len(), 3, "{w:?}");
    assert!(
        w.iter()
            .any(|m| m.contains("lines 1 and 2") && m.contains("A + B")),
        "{w:?}"
    );
    // 1 kJ/mol = 83.5934723 cm⁻¹ and 1 eV = 8065.543937 cm⁻¹ (CODATA 2018
    // conversion table, from memory), at 1e-9 relative.
    let kj = levels[0].energy.to_f64().unwrap();
    let ev = levels[2].energy.to_f64().unwrap();
    assert!(rel_close(kj, 83.5934723, 1e-9), "{kj}");
    assert!(rel_close(ev, 8065.543937, 1e-9), "{ev}");
    assert_eq!(f.labels_at(&levels[0].energy), ["E + F"]);
    assert_eq!(f.labels_at(&levels[2].energy), ["C + D"]);
    // States of a merged level list both terms, in file order.
    assert_eq!(
        f.states_at(&x).unwrap(),
        [State(vec![1, 1]), State(vec![1, 2]), State(vec![2, 1])]
    );
    // The first line in kelvin makes kelvin the list's unit.
    let g = LevelFile::parse("0 K 1\n1 cm-1 1\n", "").unwrap();
    assert_eq!(g.unit(), EnergyUnit::Kelvin);
    assert_eq!(
        g.levels().levels()[1].energy,
        r("100") * constants::second_radiation_constant()
    );
    // Round trip through joules and back is exact.
    let back = f
        .with_unit(&EnergyUnit::Joule)
        .unwrap()
        .with_unit(&EnergyUnit::Wavenumber)
        .unwrap();
    assert_eq!(back.levels(), f.levels());
    common::check_spectrum(&f, &r("1e4"), 5);
}

/// Parses `text` expecting an error; checks its kind and that the message
/// names the line and contains every one of `needles`.
fn refused(text: &str, kind: ErrorKind, line: usize, needles: &[&str]) {
    let err = LevelFile::parse(text, "bad.txt").unwrap_err();
    let msg = err.message();
    assert_eq!(err.kind(), kind, "{text:?}: {msg}");
    assert!(
        msg.contains(&format!("line {line} of bad.txt")),
        "{text:?}: {msg}"
    );
    for n in needles {
        assert!(msg.contains(n), "{text:?}: {msg} lacks {n:?}");
    }
}

#[test]
fn every_bad_input_names_its_line_and_field() {
    let ok = "0 cm-1 1 fine\n";
    // Missing fields.
    refused(
        &format!("{ok}1.0\n"),
        ErrorKind::Parse,
        2,
        &["unit is missing", "\"1.0\""],
    );
    refused(
        &format!("{ok}# c\n1.0 cm-1   # no g\n"),
        ErrorKind::Parse,
        3,
        &["degeneracy is missing"],
    );
    // Malformed numbers.
    refused(
        &format!("{ok}88l.0 cm-1 2\n"),
        ErrorKind::Parse,
        2,
        &["energy", "\"88l.0\"", "27/4"],
    );
    refused(
        &format!("{ok}1.2.3 K 1\n"),
        ErrorKind::Parse,
        2,
        &["\"1.2.3\""],
    );
    refused(
        &format!("{ok}1/0 K 1\n"),
        ErrorKind::Parse,
        2,
        &["\"1/0\"", "denominator"],
    );
    refused(
        &format!("{ok}881.0cm-1 2\n"),
        ErrorKind::Parse,
        2,
        &["put a space", "\"cm-1\""],
    );
    refused(
        &format!("{ok}\u{2212}5 K 1\n"),
        ErrorKind::Parse,
        2,
        &["hyphen-minus"],
    );
    refused(
        &format!("{ok}1e999999 K 1\n"),
        ErrorKind::Parse,
        2,
        &["\"1e999999\"", "400"],
    );
    refused(
        &format!("{ok}1e-500 K 1\n"),
        ErrorKind::Parse,
        2,
        &["\"1e-500\""],
    );
    refused(
        &format!("{ok}1e9999999999 K 1\n"),
        ErrorKind::Parse,
        2,
        &["energy"],
    );
    refused(
        &format!("{ok}{} K 1\n", "9".repeat(5000)),
        ErrorKind::Parse,
        2,
        &["longer than 1000"],
    );
    refused(&format!("{ok}٣ K 1\n"), ErrorKind::Parse, 2, &["\"٣\""]);
    // Unknown or missing units.
    refused(
        &format!("{ok}1 furlong 1\n"),
        ErrorKind::Unit,
        2,
        &["\"furlong\"", "kJ/mol"],
    );
    refused(
        &format!("{ok}1 k 1\n"),
        ErrorKind::Unit,
        2,
        &["\"k\"", "cm-1"],
    );
    refused(
        &format!("{ok}404.1 2 2P1/2\n"),
        ErrorKind::Unit,
        2,
        &["\"2\"", "unit missing"],
    );
    // Bad degeneracies: zero, negative, fractional, non-numeric.
    refused(
        &format!("{ok}1 K 0\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"0\"", "zero"],
    );
    refused(
        &format!("{ok}1 K 000\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"000\"", "zero"],
    );
    refused(
        &format!("{ok}1 K -2\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"-2\"", "negative"],
    );
    refused(
        &format!("{ok}1 K 2.5\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"2.5\"", "whole number"],
    );
    refused(
        &format!("{ok}1 K 4.0\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"4.0\"", "digits only"],
    );
    refused(
        &format!("{ok}1 K +4\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"+4\""],
    );
    refused(
        &format!("{ok}1 K four\n"),
        ErrorKind::InvalidParameter,
        2,
        &["\"four\"", "not a number"],
    );
    // Stray carriage return (old Mac line ends) and control characters.
    refused("0 K 1\r1 K 1\n", ErrorKind::Parse, 1, &["carriage return"]);
    refused(
        &format!("{ok}1 K 1 bad\u{0}label\n"),
        ErrorKind::Parse,
        2,
        &["U+0000"],
    );
    // Empty files.
    for empty in [
        "",
        "\n\n",
        "# only a comment\n   \t\n# another\r\n",
        "\u{feff}",
    ] {
        let err = LevelFile::parse(empty, "bad.txt").unwrap_err();
        assert_eq!(err.kind(), ErrorKind::Parse);
        assert!(
            err.message().contains("bad.txt has no levels"),
            "{}",
            err.message()
        );
    }
    // Without a source name the line is still named.
    let err = LevelFile::parse("x K 1", "").unwrap_err();
    assert!(err.message().starts_with("line 1: "), "{}", err.message());
}

#[test]
fn degeneracy_too_large_to_list_is_refused_but_counted() {
    let g = MAX_LISTED_STATES + 1;
    let f = LevelFile::parse(&format!("0 K 1\n1 K {g}\n"), "").unwrap();
    let err = f.states_at(&r("1")).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Budget);
    assert!(err.message().contains(&g.to_string()));
    assert_eq!(f.count_bound(&r("1")), BigUint::from(g + 1));
    assert_eq!(f.states_at(&r("0")).unwrap(), [State(vec![1, 1])]);
    // A tiny budget refuses the listing.
    let err = f.levels_within(&r("1"), &Budget::bytes(10)).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Budget);
}

#[test]
fn entries_from_elsewhere_get_the_same_checks() {
    let entries = vec![
        (r("10"), big("2"), Some("  upper  ".to_string())),
        (r("0"), big("1"), None),
        (r("10"), big("3"), Some("".to_string())),
    ];
    let f = LevelFile::from_entries(EnergyUnit::Kelvin, entries).unwrap();
    assert_eq!(
        pairs(&f, "10"),
        [
            ("0".to_string(), "1".to_string()),
            ("10".to_string(), "5".to_string())
        ]
    );
    assert_eq!(f.labels_at(&r("10")), ["upper"]);
    let w = f.warnings(&r("10"));
    assert_eq!(w.len(), 1);
    assert!(w[0].contains("levels 1 and 3"), "{w:?}");
    common::check_spectrum(&f, &r("10"), 2);
    let f = f.with_source("system.toml");
    assert!(f.describe().contains("system.toml"));

    let err = LevelFile::from_entries(
        EnergyUnit::Kelvin,
        vec![(r("0"), big("1"), None), (r("5"), big("0"), None)],
    )
    .unwrap_err();
    assert_eq!(err.kind(), ErrorKind::InvalidParameter);
    assert!(err.message().contains("level 2") && err.message().contains("degeneracy 0"));
    let err = LevelFile::from_entries(EnergyUnit::Kelvin, vec![]).unwrap_err();
    assert!(err.message().contains("no levels"));
    let err = LevelFile::from_entries(
        EnergyUnit::Kelvin,
        vec![(r("0"), big("1"), Some("a\u{7}b".into()))],
    )
    .unwrap_err();
    assert!(err.message().contains("level 1") && err.message().contains("U+0007"));
}

#[test]
fn reading_files_names_the_path() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("cl.levels");
    std::fs::write(&path, "0 cm-1 4 2P3/2\r\n882.35 cm-1 2 2P1/2\r\n").unwrap();
    let f = LevelFile::read(&path).unwrap();
    assert_eq!(f.levels().total_states(), 6u32.into());
    assert!(f.describe().contains("cl.levels"));

    let missing = dir.path().join("nope.levels");
    let err = LevelFile::read(&missing).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Io);
    assert!(err.message().contains("nope.levels"), "{}", err.message());

    let bad = dir.path().join("latin1.levels");
    std::fs::write(&bad, b"0 K 1\n1 K 1 caf\xe9\n").unwrap();
    let err = LevelFile::read(&bad).unwrap_err();
    assert!(err.message().contains("line 2 of") && err.message().contains("UTF-8"));

    let err = LevelFile::read(dir.path().join("x").join("..").join("..")).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Io);
}

/// Pieces from which random level files are built: good and bad fields,
/// odd white space, Unicode, huge numbers and comment markers.
const PIECES: &[&str] = &[
    "0",
    "1",
    "-3",
    "2.5",
    "1e400",
    "1e-400",
    "1e401",
    "9e99999",
    "27/4",
    "1/0",
    "/",
    ".",
    "-",
    "e5",
    "1e",
    "1__0",
    "_1",
    "cm-1",
    "K",
    "eV",
    "kJ/mol",
    "J",
    "meV",
    "furlong",
    "4",
    "0",
    "000",
    "+4",
    "2P3/2",
    "³P₁",
    "日本",
    "#",
    "# c",
    " ",
    "\t",
    "\u{a0}",
    "\r\n",
    "\n",
    "\r",
    "\u{feff}",
    "\u{0}",
    "\u{2212}1",
    "99999999999999999999999999",
];

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    /// Any text made of the pieces parses or fails with a message; never a
    /// panic. A success is consistent: sorted levels, as many states as the
    /// terms hold; a failure names a line or says the file has no levels.
    #[test]
    fn random_files_parse_or_fail_cleanly(idx in proptest::collection::vec(0..PIECES.len(), 0..40), sep in 0..3usize) {
        let joiner = [" ", "", "\n"][sep];
        let text: String = idx.iter().map(|&i| PIECES[i]).collect::<Vec<_>>().join(joiner);
        match LevelFile::parse(&text, "rand") {
            Ok(f) => {
                let levels = f.levels().levels();
                prop_assert!(!levels.is_empty());
                prop_assert!(levels.windows(2).all(|w| w[0].energy < w[1].energy));
                let terms: BigUint = f.terms().iter().map(|t| t.degeneracy.clone()).sum();
                prop_assert_eq!(f.levels().total_states(), terms);
            }
            Err(e) => {
                let m = e.message();
                prop_assert!(m.contains("line ") || m.contains("no levels"), "{}", m);
            }
        }
    }
}

// ------------------------------------------------------------------ Zeeman

/// μ_B/k_B = 0.671 713 815 63 K/T (CODATA 2018, from memory).
const MU_B_OVER_K: f64 = 0.67171381563;

#[test]
fn spin_half_splitting_at_one_tesla() {
    let s = ZeemanMultiplet::new(1, r("2"), r("1")).unwrap();
    assert_eq!(s.unit(), EnergyUnit::Kelvin);
    let levels = s.levels_up_to(&r("10")).unwrap();
    assert_eq!(levels.len(), 2);
    let (lo, hi) = (&levels.levels()[0], &levels.levels()[1]);
    assert_eq!(lo.degeneracy, 1u32.into());
    assert_eq!(hi.degeneracy, 1u32.into());
    // Exact: the split is 2 μ_B B / k_B with B = 1 T and g m = ±1.
    let split = &hi.energy - &lo.energy;
    let exact = r("2") * bohr_magneton() / constants::boltzmann();
    assert_eq!(split, exact);
    assert_eq!(s.splitting(), exact);
    assert_eq!(lo.energy, -hi.energy.clone());
    // Independent f64: 2 × 9.2740100783e-24 / 1.380649e-23 = 1.3434276 K,
    // at 1e-12 relative; and against CODATA's own μ_B/k at 1e-10.
    let f = split.to_f64().unwrap();
    assert!(
        rel_close(f, 2.0 * 9.2740100783e-24 / 1.380649e-23, 1e-12),
        "{f}"
    );
    assert!(rel_close(f, 2.0 * MU_B_OVER_K, 1e-10), "{f}");
    assert!((f - 1.3434).abs() < 1e-4);
    // m_J = −1/2 (stored −1) lies lowest for g > 0.
    assert_eq!(s.states_at(&lo.energy).unwrap(), [State(vec![-1])]);
    assert_eq!(s.states_at(&hi.energy).unwrap(), [State(vec![1])]);
    assert!(s.states_at(&r("0")).unwrap().is_empty());
    assert_eq!(s.doubled_numbers(), [true]);
    assert_eq!(s.quantum_numbers(), ["m_J"]);
    assert_eq!(s.describe(), "Zeeman multiplet J = 1/2, g_J = 2, B = 1 T");
    common::check_spectrum(&s, &r("1"), 2);

    // In cm⁻¹: μ_B/(hc) = 0.46686447783 cm⁻¹/T (CODATA 2018, from memory).
    let c = s.with_unit(&EnergyUnit::Wavenumber).unwrap();
    let f = c.splitting().to_f64().unwrap();
    assert!(rel_close(f, 2.0 * 0.46686447783, 1e-10), "{f}");
    assert_eq!(
        c.splitting()
            * EnergyUnit::Wavenumber
                .factor_to(&EnergyUnit::Kelvin)
                .unwrap(),
        exact
    );
    let natural = EnergyUnit::Natural {
        symbol: "u".into(),
        joules: None,
    };
    assert_eq!(s.with_unit(&natural).unwrap_err().kind(), ErrorKind::Unit);
}

#[test]
fn gadolinium_like_seven_halves_has_eight_even_levels() {
    // Gd³⁺: ⁸S₇/₂, g ≈ 2 (here exactly 2), at 1 T.
    let s = ZeemanMultiplet::from_text("7/2", "2", "1 T").unwrap();
    assert_eq!(s.twice_j(), 7);
    assert_eq!(s.multiplicity(), 8);
    let top = r("100");
    let levels = s.levels_up_to(&top).unwrap();
    assert_eq!(levels.len(), 8);
    let step = r("2") * bohr_magneton() / constants::boltzmann();
    for w in levels.levels().windows(2) {
        assert_eq!(&w[1].energy - &w[0].energy, step);
    }
    assert_eq!(s.ground_energy(), -r("7/2") * &step);
    assert_eq!(levels.total_states(), 8u32.into());
    // m_J = −7/2 .. 7/2 in order, one each.
    let ms: Vec<i64> = levels
        .iter()
        .map(|l| s.states_at(&l.energy).unwrap()[0].0[0])
        .collect();
    assert_eq!(ms, [-7, -5, -3, -1, 1, 3, 5, 7]);
    // Counting is exact, also between levels and at the ends.
    let e = |k: i64| s.ground_energy() + &step * r(&k.to_string());
    assert_eq!(s.count_bound(&(e(0) - r("1e-30"))), 0u32.into());
    assert_eq!(s.count_bound(&e(0)), 1u32.into());
    assert_eq!(s.count_bound(&(e(3) + &step / r("2"))), 4u32.into());
    assert_eq!(s.count_bound(&e(7)), 8u32.into());
    assert_eq!(s.count_bound(&r("1e9")), 8u32.into());
    // A cutoff inside the multiplet lists only the levels below it.
    assert_eq!(s.levels_up_to(&e(2)).unwrap().len(), 3);
    assert!(s.levels_up_to(&(e(0) - r("1e-30"))).is_err());
    common::check_spectrum(&s, &top, 8);
    common::check_spectrum(&s, &e(4), 8);
}

#[test]
fn zero_field_or_zero_g_is_one_degenerate_level() {
    for s in [
        ZeemanMultiplet::new(7, r("2"), r("0")).unwrap(),
        ZeemanMultiplet::new(7, r("0"), r("1")).unwrap(),
    ] {
        assert_eq!(pairs(&s, "0"), [("0".to_string(), "8".to_string())]);
        let states = s.states_at(&r("0")).unwrap();
        let ms: Vec<i64> = states.iter().map(|st| st.0[0]).collect();
        assert_eq!(ms, [-7, -5, -3, -1, 1, 3, 5, 7]);
        assert_eq!(s.count_bound(&r("-1")), 0u32.into());
        assert_eq!(s.count_bound(&r("0")), 8u32.into());
        assert_eq!(s.splitting(), r("0"));
        common::check_spectrum(&s, &r("1"), 1);
    }
    // J = 0: a single state whatever the field.
    let s = ZeemanMultiplet::new(0, r("2"), r("5")).unwrap();
    assert_eq!(pairs(&s, "1"), [("0".to_string(), "1".to_string())]);
    // An enormous multiplet at zero field is counted, not listed.
    let s = ZeemanMultiplet::new(u32::MAX, r("2"), r("0")).unwrap();
    assert_eq!(s.count_bound(&r("0")), BigUint::from(1u64 << 32));
    assert_eq!(s.states_at(&r("0")).unwrap_err().kind(), ErrorKind::Budget);
}

#[test]
fn negative_g_mirrors_the_states_not_the_levels() {
    // g_J = −2/3 (a ⁶F₁/₂-like Landé factor) with J = 3/2 at 2 T.
    let neg = ZeemanMultiplet::new(3, r("-2/3"), r("2")).unwrap();
    let pos = ZeemanMultiplet::new(3, r("2/3"), r("2")).unwrap();
    assert_eq!(
        neg.levels_up_to(&r("10")).unwrap(),
        pos.levels_up_to(&r("10")).unwrap()
    );
    let ground = neg.ground_energy();
    assert_eq!(neg.states_at(&ground).unwrap(), [State(vec![3])]);
    assert_eq!(pos.states_at(&ground).unwrap(), [State(vec![-3])]);
    common::check_spectrum(&neg, &r("10"), 4);
}

#[test]
fn huge_multiplet_within_budget_only() {
    let s = ZeemanMultiplet::new(u32::MAX, r("2"), r("1")).unwrap();
    // The lowest few levels list quickly; the whole multiplet is refused.
    let few = s.ground_energy() + s.splitting() * r("3");
    assert_eq!(s.levels_up_to(&few).unwrap().len(), 4);
    let err = s.levels_up_to(&r("1e12")).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Budget);
    assert_eq!(s.count_bound(&r("1e12")), BigUint::from(1u64 << 32));
    // The top state is found exactly.
    let top = -s.ground_energy();
    assert_eq!(
        s.states_at(&top).unwrap(),
        [State(vec![i64::from(u32::MAX)])]
    );
}

#[test]
fn j_field_and_g_text_are_checked() {
    assert_eq!(parse_j("7/2").unwrap(), 7);
    assert_eq!(parse_j("3.5").unwrap(), 7);
    assert_eq!(parse_j("2").unwrap(), 4);
    assert_eq!(parse_j(" 0 ").unwrap(), 0);
    assert_eq!(parse_j("14/4").unwrap(), 7);
    for (bad, kind, needle) in [
        ("-1", ErrorKind::InvalidParameter, "negative"),
        ("-1/2", ErrorKind::InvalidParameter, "negative"),
        (
            "1/3",
            ErrorKind::InvalidParameter,
            "2J must be a whole number",
        ),
        (
            "0.25",
            ErrorKind::InvalidParameter,
            "2J must be a whole number",
        ),
        ("x", ErrorKind::Parse, "half-integer"),
        ("", ErrorKind::Parse, "half-integer"),
        ("1/0", ErrorKind::Parse, "half-integer"),
        ("1e400", ErrorKind::InvalidParameter, "at most"),
    ] {
        let err = parse_j(bad).unwrap_err();
        assert_eq!(err.kind(), kind, "{bad}: {}", err.message());
        assert!(err.message().contains(needle), "{bad}: {}", err.message());
        assert!(
            err.message().contains(&format!("{bad:?}")),
            "{}",
            err.message()
        );
    }
    assert_eq!(parse_field_tesla("1").unwrap(), r("1"));
    assert_eq!(parse_field_tesla("0.5T").unwrap(), r("1/2"));
    assert_eq!(parse_field_tesla("500 mT").unwrap(), r("1/2"));
    assert_eq!(parse_field_tesla("1e4 G").unwrap(), r("1"));
    assert!(parse_field_tesla("-1 T")
        .unwrap_err()
        .message()
        .contains("negative"));
    assert!(parse_field_tesla("1 furlong")
        .unwrap_err()
        .message()
        .contains("mT"));
    assert!(ZeemanMultiplet::new(1, r("2"), r("-1")).is_err());
    let err = ZeemanMultiplet::from_text("1/2", "two", "1").unwrap_err();
    assert!(err.message().contains("\"two\""));
}
