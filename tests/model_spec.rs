//! Model descriptions (`models::spec`): one description per model kind,
//! read from a system file's part, mapped from the command line's options
//! or written in Rust, and built by one function. The three paths give the
//! same levels, refuse a bad value with the same message, and the
//! description survives a round trip through TOML and JSON.

mod common;

use num_rational::BigRational;
use std::path::Path;
use zsum::exact::{parse_rational, rational_string};
use zsum::models::spec::{
    AnharmonicSpec, AsymmetricTopSpec, BoxSpec, DiatomicSpec, LevelEntry, LevelsSpec, ModelSpec,
    MorseSpec, OscillatorSpec, RotorSpec, Selection, SpecError, SphericalTopSpec, Text, TopSpec,
    ZeemanSpec,
};
use zsum::spectrum::Spectrum;
use zsum::system::System;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn t(s: &str) -> Text {
    Text::new(s)
}

/// Levels as (exact energy, degeneracy) strings, the way the JSON output
/// writes them.
fn levels(s: &dyn Spectrum, up_to: &str) -> Vec<(String, String)> {
    s.levels_up_to(&r(up_to))
        .unwrap()
        .iter()
        .map(|l| (rational_string(&l.energy), l.degeneracy.to_string()))
        .collect()
}

/// The levels `zsum levels ... --format json` lists.
fn cli_levels(args: &[&str]) -> (String, Vec<(String, String)>) {
    let mut all = vec!["levels"];
    all.extend_from_slice(args);
    all.extend_from_slice(&["--format", "json"]);
    let v = common::json(&all);
    let list = v["levels"]
        .as_array()
        .unwrap()
        .iter()
        .map(|l| {
            (
                l["energy"].as_str().unwrap().to_string(),
                l["degeneracy"].as_str().unwrap().to_string(),
            )
        })
        .collect();
    (v["description"].as_str().unwrap().to_string(), list)
}

/// The one part of a system file holding `table`.
fn from_file(table: &str) -> System {
    System::parse(&format!("[[part]]\n{table}\n"), "test.toml", Path::new("."))
        .unwrap_or_else(|e| panic!("{table}: {e}"))
}

/// One model on the three paths: a system file's part, the library
/// description, and the command line (listing up to `up_to` in the model's
/// unit).
struct Case {
    toml: &'static str,
    spec: ModelSpec,
    cli: &'static [&'static str],
    up_to: &'static str,
}

fn cases() -> Vec<Case> {
    vec![
        Case {
            // 14N2's rotation with its 2:1 spin weights.
            toml: "kind = \"rotor\"\nB = \"1.99824 cm-1\"\nD = \"5.76e-6 cm-1\"\nspin = \"1\"",
            spec: ModelSpec::Rotor(RotorSpec {
                d: Some(t("5.76e-6 cm-1")),
                spin: Some(t("1")),
                ..RotorSpec::new(t("1.99824 cm-1"))
            }),
            cli: &["rotor", "--B", "1.99824", "--D", "5.76e-6", "--spin", "1"],
            up_to: "300",
        },
        Case {
            toml: "kind = \"rotor\"\nB = \"59.322 cm-1\"\nspin = \"1/2\"\nonly = \"para\"",
            spec: ModelSpec::Rotor(RotorSpec {
                spin: Some(t("1/2")),
                only: Some(Selection::Para),
                ..RotorSpec::new(t("59.322 cm-1"))
            }),
            cli: &["rotor", "--B", "59.322", "--spin", "1/2", "--only", "para"],
            up_to: "3000",
        },
        Case {
            toml: "kind = \"top\"\nA = \"5.28 cm-1\"\nB = \"0.25 cm-1\"\nDJ = \"1e-5 cm-1\"",
            spec: ModelSpec::Top(TopSpec {
                b: t("0.25 cm-1"),
                a: Some(t("5.28 cm-1")),
                c: None,
                dj: Some(t("1e-5 cm-1")),
                djk: None,
                dk: None,
                three_fold_spin: None,
                inversion: None,
            }),
            cli: &["top", "--A", "5.28", "--B", "0.25", "--DJ", "1e-5"],
            up_to: "40",
        },
        Case {
            toml: "kind = \"top\"\nC = \"2 K\"\nB = \"3 K\"",
            spec: ModelSpec::Top(TopSpec {
                b: t("3 K"),
                a: None,
                c: Some(t("2 K")),
                dj: None,
                djk: None,
                dk: None,
                three_fold_spin: None,
                inversion: None,
            }),
            cli: &["top", "--C", "2", "--B", "3", "--unit", "K"],
            up_to: "60",
        },
        Case {
            toml: "kind = \"spherical_top\"\nB = \"5.24 cm-1\"\nD = \"1e-4 cm-1\"",
            spec: ModelSpec::SphericalTop(SphericalTopSpec {
                b: t("5.24 cm-1"),
                d: Some(t("1e-4 cm-1")),
                tetrahedral_spin: None,
            }),
            cli: &["top", "--spherical", "--B", "5.24", "--DJ", "1e-4"],
            up_to: "200",
        },
        Case {
            toml: "kind = \"oscillator\"\nfreq = [\"1000 cm-1\", \"667 cm-1 x2\"]\nzero_point = true",
            spec: ModelSpec::Oscillator(OscillatorSpec {
                freq: vec![t("1000 cm-1"), t("667 cm-1 x2")],
                zero_point: true,
            }),
            cli: &["oscillator", "--freq", "1000,667x2", "--zero-point"],
            up_to: "4000",
        },
        Case {
            toml: "kind = \"anharmonic\"\nwe = \"2358.57 cm-1\"\nwexe = \"14.324 cm-1\"\nweye = \"-0.00226 cm-1\"",
            spec: ModelSpec::Anharmonic(AnharmonicSpec {
                we: t("2358.57 cm-1"),
                wexe: t("14.324 cm-1"),
                weye: Some(t("-0.00226 cm-1")),
            }),
            cli: &[
                "oscillator",
                "--we",
                "2358.57",
                "--wexe",
                "14.324",
                "--weye",
                "-0.00226",
            ],
            up_to: "20000",
        },
        Case {
            toml: "kind = \"morse\"\nwe = \"2000 meV\"\ndissociation = \"40000 meV\"",
            spec: ModelSpec::Morse(MorseSpec {
                we: t("2000 meV"),
                dissociation: t("40000 meV"),
            }),
            cli: &[
                "oscillator",
                "--we",
                "2000",
                "--dissociation",
                "40000",
                "--unit",
                "meV",
            ],
            up_to: "1e5",
        },
        Case {
            toml: "kind = \"diatomic\"\nwe = \"2358.57 cm-1\"\nwexe = \"14.324 cm-1\"\nBe = \"1.99824 cm-1\"\nalpha = \"0.017318 cm-1\"\nDe = \"5.76e-6 cm-1\"\nspin = \"1\"",
            spec: ModelSpec::Diatomic(DiatomicSpec {
                we: t("2358.57 cm-1"),
                wexe: t("14.324 cm-1"),
                weye: None,
                be: t("1.99824 cm-1"),
                alpha: Some(t("0.017318 cm-1")),
                de: Some(t("5.76e-6 cm-1")),
                spin: Some(t("1")),
                swap_parity: false,
                weights: None,
                only: None,
            }),
            cli: &[
                "diatomic", "--we", "2358.57", "--wexe", "14.324", "--Be", "1.99824", "--alpha",
                "0.017318", "--De", "5.76e-6", "--spin", "1",
            ],
            up_to: "2500",
        },
        Case {
            toml: "kind = \"diatomic\"\nwe = \"1580 cm-1\"\nwexe = \"12 cm-1\"\nBe = \"1.4456 cm-1\"\nweights = \"0:1\"",
            spec: ModelSpec::Diatomic(DiatomicSpec {
                we: t("1580 cm-1"),
                wexe: t("12 cm-1"),
                weye: None,
                be: t("1.4456 cm-1"),
                alpha: None,
                de: None,
                spin: None,
                swap_parity: false,
                weights: Some(t("0:1")),
                only: None,
            }),
            cli: &[
                "diatomic",
                "--we",
                "1580",
                "--wexe",
                "12",
                "--Be",
                "1.4456",
                "--weights",
                "0:1",
            ],
            // Above the zero-point level, G(0) = 1580/2 - 12/4 = 787 cm-1.
            up_to: "900",
        },
        Case {
            toml: "kind = \"zeeman\"\nJ = \"7/2\"\ng = \"2\"\nfield = \"1 T\"",
            spec: ModelSpec::Zeeman(ZeemanSpec {
                j: t("7/2"),
                g: t("2"),
                field: t("1 T"),
            }),
            cli: &["zeeman", "--J", "7/2", "--g", "2", "--field", "1T"],
            up_to: "10",
        },
        Case {
            // The box's energies are in h²/(8 m L²) on every path; the file
            // also fixes their size in joules.
            toml: "kind = \"box\"\nmass = \"4.0026 u\"\nside = \"10 nm\"\nsides = \"1,1,2\"",
            spec: ModelSpec::Box(BoxSpec {
                mass: Some(t("4.0026 u")),
                side: Some(t("10 nm")),
                sides: Some(t("1,1,2")),
                dims: None,
            }),
            cli: &["box", "--sides", "1,1,2", "--mass", "4.0026u", "--side", "10nm"],
            up_to: "60",
        },
    ]
}

#[test]
fn every_path_gives_the_same_levels() {
    for case in cases() {
        let file = from_file(case.toml);
        assert_eq!(file.specs, vec![case.spec.clone()], "{}", case.toml);
        let built = case.spec.build().unwrap();
        let want = levels(built.as_ref(), case.up_to);
        assert!(want.len() > 3, "{}: too few levels to compare", case.toml);
        assert_eq!(levels(&file.product, case.up_to), want, "{}", case.toml);
        let mut args = case.cli.to_vec();
        args.extend_from_slice(&["--up-to", case.up_to]);
        let (description, listed) = cli_levels(&args);
        assert_eq!(listed, want, "{args:?}");
        if case.spec.kind() != "box" {
            // (The box's listing describes its shape, not the model.)
            assert_eq!(description, built.describe(), "{args:?}");
        }
        common::check_spectrum(built.as_ref(), &r(case.up_to), 4);
    }
}

#[test]
fn rotor_levels_are_checked_against_the_formula() {
    // A rigid rotor with B = 2 and nuclear spin 1 (bosons): E = 2 J(J+1),
    // 2J+1 rotational states times 6 (even J) or 3 (odd J) spin states.
    let spec = ModelSpec::Rotor(RotorSpec {
        spin: Some(t("1")),
        ..RotorSpec::new(t("2 cm-1"))
    });
    let got = levels(spec.build().unwrap().as_ref(), "60");
    let want: Vec<(String, String)> = (0u32..=5)
        .map(|j| {
            let spin = if j % 2 == 0 { 6 } else { 3 };
            (
                (2 * j * (j + 1)).to_string(),
                ((2 * j + 1) * spin).to_string(),
            )
        })
        .collect();
    assert_eq!(got, want);
}

#[test]
fn written_levels_and_a_level_file_agree() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("three.levels");
    std::fs::write(&path, "0 cm-1 2 ground\n404 cm-1 4\n1.5 K 1\n").unwrap();
    let written = ModelSpec::Levels(LevelsSpec {
        levels: Some(vec![
            LevelEntry {
                energy: t("0 cm-1"),
                degeneracy: t("2"),
                label: Some("ground".into()),
            },
            LevelEntry {
                energy: t("404 cm-1"),
                degeneracy: t("4"),
                label: None,
            },
            LevelEntry {
                energy: t("1.5 K"),
                degeneracy: t("1"),
                label: None,
            },
        ]),
        file: None,
    });
    let want = levels(written.build().unwrap().as_ref(), "1000");
    // 1.5 K is 1.5/c2 cm-1 with c2 = 1.438776877... cm K: between 1 and 2 cm-1.
    assert_eq!(want.len(), 3);
    assert!(r(&want[1].0) > r("1") && r(&want[1].0) < r("2"), "{want:?}");
    let in_file = ModelSpec::Levels(LevelsSpec {
        levels: None,
        file: Some("three.levels".into()),
    });
    assert_eq!(
        levels(in_file.build_in(dir.path()).unwrap().as_ref(), "1000"),
        want
    );
    let table = "kind = \"levels\"\nlevels = [\n  { energy = \"0 cm-1\", degeneracy = 2, label = \"ground\" },\n  { energy = \"404 cm-1\", degeneracy = \"4\" },\n  { energy = \"1.5 K\", degeneracy = 1 },\n]";
    let file = from_file(table);
    assert_eq!(levels(&file.product, "1000"), want);
    let sys = System::parse(
        "[[part]]\nkind = \"levels\"\nfile = \"three.levels\"\n",
        "t.toml",
        dir.path(),
    )
    .unwrap();
    assert_eq!(levels(&sys.product, "1000"), want);
    let (_, listed) = cli_levels(&["file", path.to_str().unwrap(), "--up-to", "1000"]);
    assert_eq!(listed, want);
}

/// A bad value on the three paths: the library's message is the core of
/// each; the file adds the line, part and field, the command line the
/// option.
struct Bad {
    spec: ModelSpec,
    toml: &'static str,
    line: usize,
    cli: &'static [&'static str],
    field: Option<&'static str>,
    option: Option<&'static str>,
    value: &'static str,
}

fn bad_cases() -> Vec<Bad> {
    vec![
        Bad {
            spec: ModelSpec::Rotor(RotorSpec {
                spin: Some(t("1/3")),
                ..RotorSpec::new(t("2 cm-1"))
            }),
            toml: "kind = \"rotor\"\nB = \"2 cm-1\"\nspin = \"1/3\"",
            line: 4,
            cli: &["rotor", "--B", "2", "--spin", "1/3"],
            field: Some("spin"),
            option: Some("--spin"),
            value: "1/3",
        },
        Bad {
            spec: ModelSpec::Rotor(RotorSpec::new(t("-2 cm-1"))),
            toml: "kind = \"rotor\"\nB = \"-2 cm-1\"",
            line: 1,
            cli: &["rotor", "--B", "-2"],
            field: None,
            option: None,
            value: "-2",
        },
        Bad {
            spec: ModelSpec::Rotor(RotorSpec {
                only: Some(Selection::Ortho),
                ..RotorSpec::new(t("2 cm-1"))
            }),
            toml: "kind = \"rotor\"\nB = \"2 cm-1\"\nonly = \"ortho\"",
            line: 4,
            cli: &["rotor", "--B", "2", "--only", "ortho"],
            field: Some("only"),
            option: Some("--only"),
            value: "ortho",
        },
        Bad {
            spec: ModelSpec::Oscillator(OscillatorSpec {
                freq: vec![t("100 cm-1 x0")],
                zero_point: false,
            }),
            toml: "kind = \"oscillator\"\nfreq = [\"100 cm-1 x0\"]",
            line: 3,
            cli: &["oscillator", "--freq", "100x0"],
            field: Some("freq"),
            option: Some("--freq"),
            value: "\"0\"",
        },
        Bad {
            spec: ModelSpec::Zeeman(ZeemanSpec {
                j: t("7/2"),
                g: t("two"),
                field: t("1 T"),
            }),
            toml: "kind = \"zeeman\"\nJ = \"7/2\"\ng = \"two\"\nfield = \"1 T\"",
            line: 4,
            cli: &["zeeman", "--J", "7/2", "--g", "two", "--field", "1 T"],
            field: Some("g"),
            option: Some("--g"),
            value: "two",
        },
        Bad {
            spec: ModelSpec::Box(BoxSpec {
                mass: Some(t("4 u")),
                side: Some(t("1 nm")),
                sides: Some(t("1,1")),
                dims: Some(3),
            }),
            toml: "kind = \"box\"\nmass = \"4 u\"\nside = \"1 nm\"\nsides = \"1,1\"\ndims = 3",
            line: 5,
            cli: &["box", "--sides", "1,1", "--dims", "3"],
            field: Some("sides"),
            option: Some("--sides"),
            value: "1,1",
        },
        Bad {
            spec: ModelSpec::SphericalTop(SphericalTopSpec {
                b: t("5 cm-1"),
                d: Some(t("-1 cm-1")),
                tetrahedral_spin: None,
            }),
            toml: "kind = \"spherical_top\"\nB = \"5 cm-1\"\nD = \"-1 cm-1\"",
            line: 1,
            cli: &["top", "--spherical", "--B", "5", "--DJ", "-1"],
            field: None,
            option: None,
            value: "-1",
        },
    ]
}

#[test]
fn a_bad_value_is_refused_alike_on_every_path() {
    for bad in bad_cases() {
        let e: SpecError = match bad.spec.build() {
            Err(e) => e,
            Ok(_) => panic!("{} was accepted", bad.toml),
        };
        assert_eq!(e.field(), bad.field, "{}", bad.toml);
        let core = e.error().message().to_string();
        assert!(core.contains(bad.value), "{core}");
        // The library's own message names the field, and no option.
        let library = zsum::Error::from(e).to_string();
        assert!(
            library.ends_with(&core) && !library.contains("--"),
            "{library}"
        );
        if let Some(f) = bad.field {
            assert_eq!(library, format!("field `{f}`: {core}"));
        }
        // The system file places it.
        let file = System::parse(
            &format!("[[part]]\n{}\n", bad.toml),
            "test.toml",
            Path::new("."),
        )
        .unwrap_err()
        .to_string();
        let kind = bad.spec.kind();
        let place = match bad.field {
            Some(f) => format!(
                "test.toml, line {}: field `{f}` of part 1 ({kind}): ",
                bad.line
            ),
            None => format!("test.toml, line {}: part 1 ({kind}): ", bad.line),
        };
        assert_eq!(file, format!("{place}{core}"));
        // The command line names the option.
        let mut args = vec!["levels"];
        args.extend_from_slice(bad.cli);
        args.extend_from_slice(&["--up-to", "10"]);
        let out = common::run(&args);
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        let err = String::from_utf8_lossy(&out.stderr);
        let want = match bad.option {
            Some(o) => format!("zsum: error: {core} (see {o})\n"),
            None => format!("zsum: error: {core}\n"),
        };
        assert_eq!(err, want, "{args:?}");
    }
}

#[test]
fn file_only_refusals_name_the_field_and_what_belongs() {
    let e = |table: &str| {
        System::parse(&format!("[[part]]\n{table}\n"), "test.toml", Path::new("."))
            .unwrap_err()
            .to_string()
    };
    assert_eq!(
        e("kind = \"top\"\nB = \"1 cm-1\"\nA = \"2 cm-1\"\nD = \"1e-5 cm-1\""),
        "test.toml, line 5: field `D` does not belong to part 1 (top); its fields are: B, A, C, \
         DJ, DJK, DK, three_fold_spin, inversion"
    );
    assert_eq!(
        e("kind = \"morse\"\nwe = \"100 K\""),
        "test.toml, line 1: part 1 (morse) needs the field `dissociation`"
    );
    assert_eq!(
        e("kind = \"rotor\"\nB = \"1 cm-1\"\nonly = \"sideways\""),
        "test.toml, line 4: field `only` of part 1 (rotor): \"sideways\" is not one of even, \
         odd, ortho, para"
    );
    assert_eq!(
        e("kind = \"oscillator\"\nfreq = [\"1 K\", 2.5]"),
        "test.toml, line 3: field `freq` of part 1 (oscillator): write the number 2.5 as a \
         string (\"2.5 <unit>\") so it is read exactly"
    );
    let levels = e("kind = \"levels\"\nlevels = [ { energy = \"1 K\", degeneracy = 1 },\n  { energy = \"2 K\", degeneracy = 0 } ]");
    assert!(
        levels.starts_with("test.toml, line 3: field `levels` of part 1 (levels): level 2: "),
        "{levels}"
    );
    assert!(levels.contains("degeneracy \"0\""), "{levels}");
    // A box in a system file needs energies of known size.
    let lone = e("kind = \"box\"\ndims = 2");
    assert!(
        lone.starts_with("test.toml, line 1: part 1 (box): ") && lone.contains("`mass` and `side`"),
        "{lone}"
    );
}

/// One description of every kind, with its optional fields set.
fn one_of_each() -> Vec<ModelSpec> {
    let mut all: Vec<ModelSpec> = cases().into_iter().map(|c| c.spec).collect();
    all.push(ModelSpec::Rotor(RotorSpec {
        d: Some(t("1e-3 K")),
        h: Some(t("1e-9 K")),
        spin: Some(t("3/2")),
        swap_parity: true,
        weights: None,
        only: Some(Selection::Odd),
        ..RotorSpec::new(t("2 K"))
    }));
    all.push(ModelSpec::Levels(LevelsSpec {
        levels: Some(vec![LevelEntry {
            energy: t("0 eV"),
            degeneracy: t("3"),
            label: Some("a \"quoted\" label".into()),
        }]),
        file: None,
    }));
    all.push(ModelSpec::Levels(LevelsSpec {
        levels: None,
        file: Some("examples/systems/free_rotor.levels".into()),
    }));
    all.push(ModelSpec::Box(BoxSpec {
        dims: Some(2),
        ..BoxSpec::default()
    }));
    all.push(ModelSpec::AsymmetricTop(AsymmetricTopSpec {
        a: t("27.8806 cm-1"),
        b: t("14.5218 cm-1"),
        c: t("9.2777 cm-1"),
        dj: Some(t("0.00125 cm-1")),
        djk: None,
        dk: None,
        small_dj: Some(t("0.0005 cm-1")),
        small_dk: None,
        weights: None,
        pair_spin: Some(t("1/2")),
        pair_axis: Some(t("b")),
    }));
    all
}

#[test]
fn descriptions_round_trip_through_toml_and_json() {
    let all = one_of_each();
    let mut kinds: Vec<&str> = all.iter().map(ModelSpec::kind).collect();
    kinds.sort();
    kinds.dedup();
    let mut every: Vec<&str> = ModelSpec::KINDS.to_vec();
    every.sort();
    assert_eq!(kinds, every, "one description of every kind");
    for spec in &all {
        let toml_text = toml::to_string(spec).unwrap();
        let back: ModelSpec = toml::from_str(&toml_text).unwrap();
        assert_eq!(&back, spec, "{toml_text}");
        let json = serde_json::to_value(spec).unwrap();
        assert_eq!(json["kind"], spec.kind(), "{json}");
        let back: ModelSpec = serde_json::from_value(json.clone()).unwrap();
        assert_eq!(&back, spec, "{json}");
        // Taking the kind apart (as the system reader does) reads the same
        // description from the other fields.
        let mut table: toml::Table = toml::from_str(&toml_text).unwrap();
        table.remove("kind");
        let by_kind = ModelSpec::from_kind(spec.kind(), toml::Value::Table(table)).unwrap();
        assert_eq!(&by_kind, spec, "{toml_text}");
        // And it builds the same model either way.
        let a = spec.build().unwrap();
        let b = back.build().unwrap();
        assert_eq!(a.describe(), b.describe());
    }
}

#[test]
fn descriptions_refuse_unknown_kinds_and_fields() {
    let e = toml::from_str::<ModelSpec>("kind = \"rotor\"\nB = \"1 K\"\nwe = \"1 K\"\n")
        .unwrap_err()
        .to_string();
    assert!(e.contains("unknown field `we`"), "{e}");
    let e = toml::from_str::<ModelSpec>("kind = \"warp\"\n")
        .unwrap_err()
        .to_string();
    assert!(e.contains("warp"), "{e}");
    let e = ModelSpec::from_kind("warp", toml::Value::Table(toml::Table::new()))
        .unwrap_err()
        .to_string();
    assert!(e.contains("warp") && e.contains("spherical_top"), "{e}");
    // Integers are read as their digits; floating point never.
    let spec: ModelSpec =
        toml::from_str("kind = \"zeeman\"\nJ = 1\ng = 2\nfield = \"1 T\"\n").unwrap();
    assert_eq!(
        spec,
        ModelSpec::Zeeman(ZeemanSpec {
            j: t("1"),
            g: t("2"),
            field: t("1 T")
        })
    );
    let e = toml::from_str::<ModelSpec>("kind = \"rotor\"\nB = 0.1\n")
        .unwrap_err()
        .to_string();
    assert!(e.contains("write the number 0.1 as a string"), "{e}");
}

#[test]
fn energies_take_the_first_constants_unit_exactly() {
    // B in K, D in cm-1: the rotor's unit is K and D is converted exactly.
    let spec = ModelSpec::Rotor(RotorSpec {
        d: Some(t("1 cm-1")),
        ..RotorSpec::new(t("100 K"))
    });
    let built = spec.build().unwrap();
    assert_eq!(built.unit().symbol(), "K");
    // E(1) = 2B - 4D with D = c2 * 1 K, c2 = h c / k (exact in SI 2019).
    let c2 = zsum::units::EnergyUnit::Wavenumber
        .factor_to(&zsum::units::EnergyUnit::Kelvin)
        .unwrap();
    let e1 = &levels(built.as_ref(), "250")[1].0;
    assert_eq!(r(e1), r("200") - r("4") * c2);
}

#[test]
fn models_sit_below_the_engine() {
    // The layering rule: no model file imports the summation engine or the
    // classical layer.
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("src/models");
    let mut seen = 0;
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        let text = std::fs::read_to_string(&path).unwrap();
        for layer in [
            "crate::sum",
            "crate::classical",
            "crate::system",
            "crate::cli",
        ] {
            assert!(!text.contains(layer), "{} imports {layer}", path.display());
        }
        seen += 1;
    }
    assert!(seen >= 8);
}
