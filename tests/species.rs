//! Built-in species against published standard entropies and hydrogen's
//! ortho/para data.

mod common;

use common::{n_lambda3, sig4};
use zsum::exact::parse_rational;
use zsum::report::{HydrogenTable, MolarPoint};
use zsum::species::hydrogen::HydrogenGrid;
use zsum::species::{molar, Database, Isomer, MolarOptions, Reference, Translation, VibModel};

fn s_at(name: &str, model: VibModel) -> f64 {
    let db = Database::builtin().unwrap();
    let o = MolarOptions {
        model,
        ..MolarOptions::default()
    };
    let p = molar(
        db.find(name).unwrap(),
        &parse_rational("298.15").unwrap(),
        &o,
    )
    .unwrap();
    p.s.to_f64()
}

/// CODATA Key Values for Thermodynamics (Cox, Wagman and Medvedev, 1989):
/// S° at 298.15 K and 1 bar, J/(mol K), from memory. Tolerances: the noble
/// gases depend on the mass alone (0.002 for Ar, as asked, and the rest);
/// the molecules on our spectroscopic model: N2 within 0.05 with rigid-rotor
/// harmonic constants (B_0 = B_e − α_e/2, fundamental we − 2wexe), and the
/// vibrating rotor within 0.01 for N2, O2, CO, HCl and H2. D2 (144.96) and
/// HD (143.80) are JANAF-style values from memory, to 0.05. NO (now a ²Π
/// doublet) and the polyatomics are checked in tests/polyatomic.rs.
#[test]
fn standard_entropies_match_codata_key_values() {
    let cases = [
        ("Ar", 154.846, 0.002, VibModel::Rovib),
        ("He", 126.153, 0.002, VibModel::Rovib),
        ("Ne", 146.328, 0.002, VibModel::Rovib),
        ("Kr", 164.085, 0.002, VibModel::Rovib),
        ("Xe", 169.685, 0.002, VibModel::Rovib),
        ("N2", 191.609, 0.05, VibModel::Rrho),
        ("N2", 191.609, 0.01, VibModel::Rovib),
        ("O2", 205.152, 0.01, VibModel::Rovib),
        ("CO", 197.660, 0.01, VibModel::Rovib),
        ("HCl", 186.902, 0.01, VibModel::Rovib),
        ("H2", 130.680, 0.01, VibModel::Rovib),
        ("D2", 144.960, 0.05, VibModel::Rovib),
        ("HD", 143.80, 0.05, VibModel::Rovib),
    ];
    let mut report = Vec::new();
    for (name, want, tol, model) in cases {
        let got = s_at(name, model);
        report.push(format!("{name} {model:?}: {got:.4} vs {want}"));
        assert!((got - want).abs() < tol, "{}", report.join("\n"));
    }
}

/// Hydrogen at its normal boiling point 20.28 K (Woolley, Scott and
/// Brickwedde 1948, from memory): equilibrium para fraction about 0.998;
/// normal → equilibrium conversion releases about 1.06 kJ/mol (about 525
/// kJ/kg), more than the latent heat of vaporisation, about 0.9 kJ/mol
/// (common practice).
#[test]
fn hydrogen_conversion_at_the_boiling_point() {
    let db = Database::builtin().unwrap();
    let h2 = db.find("H2").unwrap();
    let grid = HydrogenGrid::compute(
        h2,
        &[parse_rational("20.28").unwrap()],
        &Isomer::Normal,
        &MolarOptions::default(),
    )
    .unwrap();
    let point = &grid.rows[0];
    let para = 1.0 - point.equilibrium_ortho_fraction.to_f64();
    assert!((para - 0.998).abs() < 0.0005, "para fraction {para}");
    let q = point.conversion_heat.to_f64();
    assert!((q - 1060.0).abs() < 10.0, "conversion heat {q} J/mol");
    let per_kg = point.conversion_heat_per_kg.to_f64();
    assert!((per_kg - 525.0).abs() < 5.0, "{per_kg} kJ/kg");
    assert!(q > 900.0);
    // Every printed digit of the conversion heat is proved by its radius.
    assert!(point.conversion_heat.decimal(grid.digits).is_some());
    // Normal hydrogen is frozen at 3/4 ortho.
    let table = HydrogenTable::new(&grid);
    let row = &table.rows[0];
    assert_eq!(row.ortho_fraction, "0.7500000000");
    // The ortho → para heat is close to R·E(J=1)/k with E(J=1) = 118.5 cm-1
    // (H2 J=1 term value, Huber–Herzberg, from memory) = 170.5 K R.
    assert_eq!(point.ground_isomer, Isomer::Para);
    assert_eq!(row.ground_isomer, "para");
    let o2p = point.heat_to_ground_isomer.to_f64();
    assert!((o2p - 8.314462618 * 170.5).abs() < 5.0, "{o2p}");
}

/// D2's ground level J = 0 belongs to ortho (nuclear spin 1, even J weight
/// 6): the conversion to the ground isomer is para → ortho and releases
/// heat, about R·E(J=1)/k with E(J=1) = 2 B = 59.8 cm-1 for D2 (B_e about
/// 30.4 cm-1, Huber–Herzberg, from memory) = 86 K R, at low T.
#[test]
fn deuterium_converts_para_to_ortho_with_heat_released() {
    let db = Database::builtin().unwrap();
    let d2 = db.find("D2").unwrap();
    let grid = HydrogenGrid::compute(
        d2,
        &[parse_rational("20").unwrap()],
        &Isomer::Normal,
        &MolarOptions::default(),
    )
    .unwrap();
    let point = &grid.rows[0];
    assert_eq!(point.ground_isomer, Isomer::Ortho);
    let row = &HydrogenTable::new(&grid).rows[0];
    assert_eq!(row.ground_isomer, "ortho");
    let heat = point.heat_to_ground_isomer.to_f64();
    assert!(heat > 0.0, "{heat}");
    assert!((heat / (8.314462618 * 86.0) - 1.0).abs() < 0.03, "{heat}");
    // Normal D2 is frozen at 2/3 ortho; converting it to equilibrium
    // releases heat too.
    assert_eq!(row.ortho_fraction, "0.6666666667");
    assert!(point.conversion_heat.to_f64() > 0.0);
}

/// A frozen mixture keeps each isomer's own lowest level as H0: for normal
/// hydrogen at 20 K almost every molecule sits in its isomer's lowest
/// level, so H − H0 is close to the translational 5/2 RT = 415.7 J/mol
/// (standard result), −(G − H0)/T is positive, and the table says which
/// reference it uses. The equilibrium mixture is measured from para J = 0.
#[test]
fn normal_hydrogen_is_measured_from_each_isomers_lowest_level() {
    let db = Database::builtin().unwrap();
    let h2 = db.find("H2").unwrap();
    let t = parse_rational("20").unwrap();
    let at = |iso: Isomer| {
        let o = MolarOptions {
            isomer: Some(iso),
            ..MolarOptions::default()
        };
        molar(h2, &t, &o).unwrap()
    };
    let n = at(Isomer::Normal);
    let h = n.h_minus_h0.to_f64();
    assert!((h / (2.5 * 8.314462618 * 20.0) - 1.0).abs() < 1e-3, "{h}");
    let g = n.minus_g_minus_h0_over_t.to_f64();
    assert!(g > 0.0, "{g}");
    assert_eq!(n.reference, Reference::EachIsomerLowestLevel);
    let text = MolarPoint::new(&n).reference;
    assert!(text.contains("own lowest level"), "{text}");
    let e = at(Isomer::Equilibrium);
    assert_eq!(e.reference, Reference::LowestLevel);
    assert_eq!(MolarPoint::new(&e).reference, "H0 = the lowest level");
    // The default state is normal.
    let d = molar(h2, &t, &MolarOptions::default()).unwrap();
    assert_eq!(d.isomer, Some(Isomer::Normal));
    assert_eq!(MolarPoint::new(&d).isomer.as_deref(), Some("normal"));
    assert_eq!(d.s.value(), n.s.value());
}

/// Normal and equilibrium hydrogen agree at high temperature (the
/// conventional entropy excludes the same R ln 4), and at 300 K their Cp
/// differ by less than 0.1% (common practice); para's Cp overshoots 7/2 R
/// near 150 K (standard texts, from memory).
#[test]
fn isomer_states_are_consistent() {
    let db = Database::builtin().unwrap();
    let h2 = db.find("H2").unwrap();
    let at = |iso: Isomer, t: &str| {
        let o = MolarOptions {
            isomer: Some(iso),
            ..MolarOptions::default()
        };
        molar(h2, &parse_rational(t).unwrap(), &o).unwrap()
    };
    let (n, e) = (at(Isomer::Normal, "1000"), at(Isomer::Equilibrium, "1000"));
    let (sn, se) = (n.s.to_f64(), e.s.to_f64());
    assert!((sn - se).abs() < 1e-4, "{sn} vs {se}");
    let (tn, te) = (n.s_total.to_f64(), e.s_total.to_f64());
    assert!((tn - te).abs() < 1e-4);
    let r = 8.314462618;
    assert!((te - se - r * 4f64.ln()).abs() < 1e-6);
    let cp = |iso, t| at(iso, t).cp.to_f64();
    assert!((cp(Isomer::Normal, "300") / cp(Isomer::Equilibrium, "300") - 1.0).abs() < 1e-3);
    assert!(cp(Isomer::Para, "150") > 3.5 * r * 1.05);
    // fraction=0.75 is normal.
    let f = at(Isomer::Fraction(parse_rational("0.75").unwrap()), "50");
    assert_eq!(f.cp.value(), at(Isomer::Normal, "50").cp.value());
    // Species without spin isomers refuse them.
    let o = MolarOptions {
        isomer: Some(Isomer::Para),
        ..MolarOptions::default()
    };
    let e = molar(db.find("CO").unwrap(), &parse_rational("300").unwrap(), &o).unwrap_err();
    assert!(e.to_string().contains("nuclear-spin isomers"), "{e}");
}

/// Sackur–Tetrode against the engine's exact sum for He in a 1 cm cube:
/// the boundary terms are of relative size Λ/L ≈ 1e-9, so S agrees to 10
/// digits.
#[test]
fn sackur_tetrode_matches_the_exact_box_sum() {
    let db = Database::builtin().unwrap();
    let he = db.find("He").unwrap();
    let t = parse_rational("300").unwrap();
    let st = molar(
        he,
        &t,
        &MolarOptions {
            digits: 15,
            ..MolarOptions::default()
        },
    )
    .unwrap();
    let boxed = molar(
        he,
        &t,
        &MolarOptions {
            digits: 15,
            translation: Translation::Box(parse_rational("0.01").unwrap()),
            ..MolarOptions::default()
        },
    )
    .unwrap();
    let (a, b) = (
        MolarPoint::new(&st).s.parse::<f64>().unwrap(),
        MolarPoint::new(&boxed).s.parse::<f64>().unwrap(),
    );
    assert_eq!(
        format!("{a:.7}"),
        format!("{b:.7}"),
        "10 significant digits"
    );
    // The difference is the surface term: S_box − S_ST = −(3/4) R Λ/L with
    // Λ = h/sqrt(2π m kT) (Euler–Maclaurin per axis, as in the classical
    // module's box forms).
    let (h, k, m) = (6.62607015e-34, 1.380649e-23, 4.002602 * 1.66053906660e-27);
    let lambda = h / (2.0 * std::f64::consts::PI * m * k * 300.0).sqrt();
    let want = -0.75 * 8.314462618 * lambda / 0.01;
    assert!(((b - a) / want - 1.0).abs() < 0.01, "{} vs {want}", b - a);
    let (ha, hb) = (st.h_minus_h0.to_f64(), boxed.h_minus_h0.to_f64());
    // H − H0 moves by +(3/4) RT Λ/L/(5/2): relative 1.5e-9 here.
    let want_h = 0.75 * lambda / 0.01 / 2.5;
    assert!(
        (((hb - ha) / ha) / want_h - 1.0).abs() < 0.01,
        "{ha} vs {hb}"
    );
}

#[test]
fn bad_species_data_is_refused_with_the_field_named() {
    let unknown = Database::builtin()
        .unwrap()
        .find("N3")
        .unwrap_err()
        .to_string();
    assert!(unknown.contains("did you mean N2"), "{unknown}");
    let base = r#"
[[species]]
name = "X2"
description = "test"
kind = "linear"
homonuclear = false
mass = { value = "2", unit = "u", source = "test" }
rotation = { B_e = "1", unit = "cm-1", source = "test" }
vibration = { we = "1000", unit = "cm-1", source = "test" }
electronic = { levels = [ { energy = "0", degeneracy = 1 } ], unit = "cm-1", source = "test" }
"#;
    assert!(Database::parse(base, "t").is_ok());
    let no_unit = base.replace(r#"B_e = "1", unit = "cm-1","#, r#"B_e = "1","#);
    let e = Database::parse(&no_unit, "t").unwrap_err().to_string();
    assert!(e.contains("unit"), "{e}");
    let extra = base.replace(r#"kind = "linear""#, "kind = \"linear\"\ncolour = \"red\"");
    let e = Database::parse(&extra, "t").unwrap_err().to_string();
    assert!(e.contains("colour"), "{e}");
    let swap = base.replace(
        r#"kind = "linear""#,
        "kind = \"linear\"\nswap_parity = true",
    );
    let e = Database::parse(&swap, "t").unwrap_err().to_string();
    assert!(e.contains("homonuclear"), "{e}");
    let atom_spin = base
        .replace(
            r#"kind = "linear""#,
            "kind = \"atom\"\nnuclear_spin = \"1/2\"",
        )
        .replace(
            "rotation = { B_e = \"1\", unit = \"cm-1\", source = \"test\" }\n",
            "",
        )
        .replace(
            "vibration = { we = \"1000\", unit = \"cm-1\", source = \"test\" }\n",
            "",
        );
    let e = Database::parse(&atom_spin, "t").unwrap_err().to_string();
    assert!(e.contains("nuclear_spin"), "{e}");
    let bad_p = MolarOptions {
        pressure: parse_rational("0").unwrap(),
        ..MolarOptions::default()
    };
    let db = Database::builtin().unwrap();
    let e = molar(
        db.find("Ar").unwrap(),
        &parse_rational("300").unwrap(),
        &bad_p,
    )
    .unwrap_err();
    assert!(e.to_string().contains("pressure"), "{e}");
    assert!(Isomer::parse("fraction=1.5").is_err());
    assert!(Isomer::parse("fraction=-0.1").is_err());
}

// --- Quantum degeneracy of the translational gas -------------------------

/// He-4 atomic mass 4.002602 u (the value the brief gives; it is also the
/// CIAAW 2013 standard atomic weight the built-in He uses, from memory).
const HE_U: f64 = 4.002602;
/// H2: 2 × 1.00782503223 u (AME2016, from memory; the built-in value).
const H2_U: f64 = 2.01565006446;

fn at(name: &str, t: &str, o: &MolarOptions) -> zsum::Result<zsum::species::MolarValues> {
    let db = Database::builtin().unwrap();
    molar(db.find(name).unwrap(), &parse_rational(t).unwrap(), o)
}

/// He at 4.2 K (its normal boiling point) and 1 bar: nΛ³ ≈ 0.13 (computed
/// here from CODATA 2018 constants). The first Bose correction, of relative
/// size nΛ³/2^(5/2) ≈ 0.024 (standard result), far exceeds the default
/// 10-digit tolerance, so the row is flagged.
#[test]
fn helium_at_4_2_k_carries_its_degeneracy_and_is_flagged() {
    let p = at("He", "4.2", &MolarOptions::default()).unwrap();
    let want = n_lambda3(HE_U, 4.2, 1e5);
    assert!((0.13..0.14).contains(&want), "independent value {want}");
    let d = &p.degeneracy;
    assert!(
        (d.n_lambda3 / want - 1.0).abs() < 1e-12,
        "library {} vs independent {want}",
        d.n_lambda3
    );
    assert_eq!(d.g, 1);
    // 2^(5/2) = 5.65685...
    let c = want / 2f64.powf(2.5);
    assert!((d.quantum_correction / c - 1.0).abs() < 1e-12);
    assert_eq!(d.quantum_tolerance, 1e-10);
    assert!(d.quantum_flag, "{d:?}");
    assert!(!d.negative_entropy);
    // c ≈ 0.0235: about one significant digit stands.
    assert_eq!(d.trusted_digits(), 1);
    // JSON carries the number and the flag.
    let v: serde_json::Value = serde_json::to_value(MolarPoint::new(&p)).unwrap();
    assert!((v["n_lambda3"].as_f64().unwrap() / want - 1.0).abs() < 1e-12);
    assert_eq!(v["quantum_flag"], true);
    assert_eq!(v["units"]["n_lambda3"], "dimensionless");
}

/// He at 300 K and 1 bar: nΛ³ ≈ 3.09e-6, so the first correction is
/// c = nΛ³/2^(5/2) ≈ 5.5e-7 (standard result). It stays below the
/// tolerance of 6 printed digits (1e-6): not flagged. At 7 digits, and at
/// the default 10, it exceeds the tolerance and the row is flagged: the
/// flag follows c > 10^-digits exactly.
#[test]
fn helium_at_300_k_is_flagged_only_where_the_digits_reach_the_correction() {
    let want = n_lambda3(HE_U, 300.0, 1e5);
    let c = want / 2f64.powf(2.5);
    assert!(c > 1e-7 && c < 1e-6, "{c}");
    for (digits, flagged) in [(5, false), (6, false), (7, true), (10, true)] {
        let o = MolarOptions {
            digits,
            ..MolarOptions::default()
        };
        let d = at("He", "300", &o).unwrap().degeneracy;
        assert!((d.n_lambda3 / want - 1.0).abs() < 1e-12);
        assert_eq!(d.quantum_flag, flagged, "{digits} digits: {d:?}");
    }
}

/// He at 1 K and 1 bar: nΛ³ ≈ 4.8 ≥ 1 (computed here, CODATA 2018), so
/// the classical row is refused with a typed error naming nΛ³, T and p.
/// H2 at 1 K: nΛ³ ≈ 13 (same way).
#[test]
fn degenerate_gases_are_refused_with_a_typed_error() {
    for (name, mass, t) in [("He", HE_U, 1.0), ("H2", H2_U, 1.0), ("He", HE_U, 0.1)] {
        let e = at(name, &t.to_string(), &MolarOptions::default()).unwrap_err();
        assert_eq!(e.kind(), zsum::error::ErrorKind::Degenerate, "{e}");
        let x = n_lambda3(mass, t, 1e5);
        let msg = e.to_string();
        assert!(msg.contains(&format!("nΛ³ = {}", sig4(x))), "{x}: {msg}");
        assert!(msg.contains(&format!("T = {t} K")), "{msg}");
        assert!(msg.contains("p = 100000 Pa"), "{msg}");
        assert!(
            msg.contains("ensemble") && msg.contains("later release"),
            "{msg}"
        );
        assert!(msg.contains("raise T"), "{msg}");
    }
    assert!((n_lambda3(H2_U, 1.0, 1e5) - 13.0).abs() < 1.0);
    // The grid is refused as a whole, and so is the hydrogen table.
    let db = Database::builtin().unwrap();
    let grid: Vec<_> = ["300", "1"]
        .iter()
        .map(|t| parse_rational(t).unwrap())
        .collect();
    let e =
        zsum::species::MolarGrid::compute(db.find("He").unwrap(), &grid, &MolarOptions::default())
            .unwrap_err();
    assert_eq!(e.kind(), zsum::error::ErrorKind::Degenerate);
    let e = HydrogenGrid::compute(
        db.find("H2").unwrap(),
        &[parse_rational("2").unwrap()],
        &Isomer::Normal,
        &MolarOptions::default(),
    )
    .unwrap_err();
    assert_eq!(e.kind(), zsum::error::ErrorKind::Degenerate);
    // Lowering the pressure below p/nΛ³ lifts the refusal (nΛ³ ∝ p).
    let o = MolarOptions {
        pressure: parse_rational("10000").unwrap(),
        ..MolarOptions::default()
    };
    let d = at("He", "1", &o).unwrap().degeneracy;
    assert!((d.n_lambda3 / n_lambda3(HE_U, 1.0, 1e4) - 1.0).abs() < 1e-12);
    assert!(d.quantum_flag);
}

/// Just above the refusal (nΛ³ a little below 1), every isomer state of H2
/// and D2 and the atoms still print a positive entropy, and flagged; and
/// across a low-temperature grid no row prints a negative S or S_total
/// without the flag.
#[test]
fn negative_entropies_never_print_unflagged() {
    let db = Database::builtin().unwrap();
    let states = [
        None,
        Some(Isomer::Normal),
        Some(Isomer::Para),
        Some(Isomer::Ortho),
        Some(Isomer::Equilibrium),
    ];
    let mut seen = 0;
    for sp in db.all() {
        for iso in &states {
            if iso.is_some() && !sp.has_spin_isomers() {
                continue;
            }
            for t in ["1.9", "2", "2.5", "2.9", "3", "4", "6", "10"] {
                let o = MolarOptions {
                    isomer: iso.clone(),
                    ..MolarOptions::default()
                };
                let Ok(p) = molar(sp, &parse_rational(t).unwrap(), &o) else {
                    continue;
                };
                seen += 1;
                let s = p.s.to_f64();
                let st = p.s_total.to_f64();
                assert!(p.degeneracy.n_lambda3 < 1.0);
                if s < 0.0 || st < 0.0 {
                    assert!(p.degeneracy.quantum_flag && p.degeneracy.negative_entropy);
                }
                // Below 10 K every built-in species is flagged at 10 digits.
                assert!(
                    p.degeneracy.quantum_flag,
                    "{} {t}: {:?}",
                    sp.name, p.degeneracy
                );
            }
        }
    }
    assert!(seen > 50, "{seen}");
    // H2 at 2.9 K (nΛ³ ≈ 0.92, independent): equilibrium S stays positive.
    let h2 = at(
        "H2",
        "2.9",
        &MolarOptions {
            isomer: Some(Isomer::Equilibrium),
            ..MolarOptions::default()
        },
    )
    .unwrap();
    let x = n_lambda3(H2_U, 2.9, 1e5);
    assert!(x > 0.9 && x < 1.0, "{x}");
    assert!((h2.degeneracy.n_lambda3 / x - 1.0).abs() < 1e-12);
    assert!(h2.s.to_f64() > 0.0, "{:?}", h2.s);
}

/// Every constant of a species is an exact number in its unit beside the
/// text it was written as: NO's ω_e is written `1904.20` cm⁻¹ in the
/// built-in file (Huber–Herzberg 1979, the file's source), so the number
/// is 190420/100 exactly while the card keeps the written trailing zero;
/// the masses in u are exact (Ar 39.948 u, CIAAW 2013, the file's source).
#[test]
fn species_constants_are_exact_numbers_and_cards_keep_the_written_text() {
    use zsum::report::{SpeciesCard, SpeciesList};
    use zsum::species::Quantity;
    let db = Database::builtin().unwrap();
    let no = db.find("NO").unwrap();
    let we = no
        .constants()
        .unwrap()
        .into_iter()
        .find(|c| c.quantity == Quantity::We)
        .unwrap();
    assert_eq!(we.value, parse_rational("1904.2").unwrap());
    assert_eq!(we.written, "1904.20");
    assert_eq!(we.unit, "cm-1");
    let card = SpeciesCard::new(no).unwrap();
    let row = card.constants.iter().find(|c| c.quantity == "we").unwrap();
    assert_eq!(row.value, "1904.20");
    // The nuclear spin of N2 (I = 1) is exact, and its weights 6 : 3.
    let n2 = db.find("N2").unwrap().constants().unwrap();
    let spin = n2
        .iter()
        .find(|c| matches!(c.quantity, Quantity::NuclearSpin { .. }))
        .unwrap();
    assert_eq!(spin.value, parse_rational("1").unwrap());
    assert_eq!(
        db.find("Ar").unwrap().mass_u(),
        parse_rational("39.948").unwrap()
    );
    let list = SpeciesList::new(&db);
    assert_eq!(list.species.len(), db.all().len());
    assert!(list
        .species
        .iter()
        .any(|s| s.name == "Ar" && s.mass == "39.948"));
}

/// A library user computes with the certified numbers: the entropy of one
/// mole of Ar plus one mole of N2, each at 298.15 K and 1 bar, is the sum
/// of the two standard entropies, added in ball arithmetic so the sum's
/// radius covers both radii. CODATA Key Values for Thermodynamics (Cox,
/// Wagman and Medvedev, 1989; from memory): S°(Ar) = 154.846 ± 0.003,
/// S°(N2) = 191.609 ± 0.005 J/(mol K), so 346.455 J/K together; our model
/// is within 0.002 (Ar) and 0.01 (N2, vibrating rotor) of them (see
/// `standard_entropies_match_codata_key_values`). Scaling Ar's molar value
/// by the exact 1/M gives its value per kilogram, and that agrees with the
/// library's own per-kilogram basis to every printed digit.
#[test]
fn certified_entropies_add_and_scale_within_their_radii() {
    use zsum::species::Basis;
    let db = Database::builtin().unwrap();
    let t = parse_rational("298.15").unwrap();
    let o = MolarOptions::default();
    let ar = molar(db.find("Ar").unwrap(), &t, &o).unwrap();
    let n2 = molar(db.find("N2").unwrap(), &t, &o).unwrap();
    // Each value's printed digits are proved by its radius.
    assert!(ar.s.decimal(o.digits).is_some() && n2.s.decimal(o.digits).is_some());
    let both = ar.s.add(&n2.s);
    // The sum's radius covers both radii, and its interval holds the sum
    // of the two centres.
    let radii = ar.s.radius().to_f64() + n2.s.radius().to_f64();
    assert!(both.radius().to_f64() >= radii, "{:?}", both.radius());
    assert!(both.radius().to_f64() < 1e-9 * both.to_f64());
    let exact_sum = rug::Float::with_val(256, ar.s.value() + n2.s.value());
    let (lo, hi) = both.interval();
    assert!(lo <= exact_sum && exact_sum <= hi);
    let codata = 154.846 + 191.609;
    assert!(
        (both.to_f64() - codata).abs() < 0.012,
        "{} vs {codata}",
        both.to_f64()
    );
    // Per kilogram: S/M with M = 39.948 g/mol (the built-in mass, CIAAW
    // 2013), by exact scaling; against the library's per-kilogram basis.
    let m = db.find("Ar").unwrap().molar_mass();
    let per_kg =
        ar.s.scale(&(num_rational::BigRational::from_integer(1.into()) / m));
    let direct = molar(
        db.find("Ar").unwrap(),
        &t,
        &MolarOptions {
            basis: Basis::Kilogram,
            ..MolarOptions::default()
        },
    )
    .unwrap();
    assert!((per_kg.to_f64() / 154.846 * 39.948e-3 - 1.0).abs() < 2e-5);
    let (a, b) = (per_kg.interval(), direct.s.interval());
    assert!(a.0 <= b.1 && b.0 <= a.1, "the two intervals overlap");
    assert_eq!(per_kg.decimal(o.digits), direct.s.decimal(o.digits));
    assert!(per_kg.decimal(o.digits).is_some());
}

/// Every printed value of a table is proved by its radius at the default
/// 10 digits: the guard digits of the computation stand for S, Cp, H and
/// −(G − H0)/T over a grid, spin isomers included.
#[test]
fn printed_molar_digits_are_proved_by_the_radii() {
    let db = Database::builtin().unwrap();
    let grid: Vec<_> = ["20", "100", "298.15", "1000"]
        .iter()
        .map(|t| parse_rational(t).unwrap())
        .collect();
    for name in ["H2", "N2", "O2", "He"] {
        let g = zsum::species::MolarGrid::compute(
            db.find(name).unwrap(),
            &grid,
            &MolarOptions::default(),
        )
        .unwrap();
        for r in &g.rows {
            for (what, v) in [
                ("S", &r.s),
                ("S_total", &r.s_total),
                ("Cp", &r.cp),
                ("Cv", &r.cv),
                ("H-H0", &r.h_minus_h0),
                ("-(G-H0)/T", &r.minus_g_minus_h0_over_t),
            ] {
                assert!(
                    v.decimal(g.digits).is_some(),
                    "{name} {} {what}: {:?}",
                    r.t,
                    v
                );
            }
        }
    }
}

/// The hydrogen table's values are proved the same way: the conversion
/// heats (differences of isomer enthalpies, which cancel at high T), the
/// Cp curves and the equilibrium ortho fraction of H2 and D2, 10 K to
/// 400 K, every printed digit within the radius at 8 and 10 digits.
#[test]
fn printed_hydrogen_digits_are_proved_by_the_radii() {
    let db = Database::builtin().unwrap();
    let grid = zsum::thermo::parse_grid("--T", "10:400:30").unwrap();
    for (name, digits) in [("H2", 8), ("H2", 10), ("D2", 10)] {
        let o = MolarOptions {
            digits,
            ..MolarOptions::default()
        };
        let g = HydrogenGrid::compute(db.find(name).unwrap(), &grid, &Isomer::Normal, &o).unwrap();
        assert_eq!(g.rows.len(), 14);
        for r in &g.rows {
            for (what, v) in [
                ("conversion heat", &r.conversion_heat),
                ("per kg", &r.conversion_heat_per_kg),
                ("to ground isomer", &r.heat_to_ground_isomer),
                ("eq. ortho fraction", &r.equilibrium_ortho_fraction),
                ("Cp normal", &r.cp_normal),
                ("Cp equilibrium", &r.cp_equilibrium),
                ("Cp para", &r.cp_para),
            ] {
                assert!(v.decimal(digits).is_some(), "{name} {} {what}: {v:?}", r.t);
            }
        }
    }
}
