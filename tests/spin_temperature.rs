//! Spin temperatures and relaxation heats of the built-in species with
//! nuclear-spin isomers, through the library and `zsum spin`.

mod common;

use zsum::exact::parse_rational;
use zsum::species::spin::{
    composition_range, equilibrium_value, relaxation_heat, spin_temperature, Composition,
};
use zsum::species::{Database, Isomer, MolarOptions};

/// Equilibrium hydrogen at its normal boiling point, 20.28 K, is 99.8 %
/// para (from memory; the classic tables give 0.9979): the equilibrium
/// value and the spin temperature of that fraction agree.
#[test]
fn hydrogen_at_its_boiling_point() {
    let db = Database::builtin().unwrap();
    let h2 = db.find("H2").unwrap();
    let c = Composition::parse("para=0.998").unwrap();
    let t = parse_rational("20.28").unwrap();
    let x = equilibrium_value(h2, &c, &t, 10).unwrap().to_f64();
    assert!((x - 0.998).abs() < 5e-4, "{x}");
    let st = spin_temperature(h2, &c, 8).unwrap();
    assert!((st.t.to_f64() - 20.28).abs() < 0.3, "{}", st.t.to_f64());
}

/// Round trip: a measured ratio gives T, and the equilibrium ratio at that
/// T (the ball's centre) gives the measured ratio back to every digit the
/// temperature was certified to (the ratio's slope in T is moderate here).
#[test]
fn ratio_to_temperature_and_back() {
    let db = Database::builtin().unwrap();
    for (name, text) in [
        ("H2O", "ortho/para=2.5"),
        ("H2", "ortho/para=1.5"),
        ("D2", "para/ortho=0.2"),
    ] {
        let sp = db.find(name).unwrap();
        let c = Composition::parse(text).unwrap();
        let st = spin_temperature(sp, &c, 12).unwrap();
        let digits = st.t.decimal(12).expect("12 digits certified");
        let t = parse_rational(&digits).unwrap();
        let back = equilibrium_value(sp, &c, &t, 20).unwrap().to_f64();
        let want = parse_f(c.value());
        assert!(
            (back / want - 1.0).abs() < 1e-9,
            "{name}: T = {digits}, back {back} vs {want}"
        );
    }
}

fn parse_f(r: &num_rational::BigRational) -> f64 {
    num_traits::ToPrimitive::to_f64(r).unwrap()
}

/// The range of each composition: water's ortho/para runs from 0 (the
/// ground level 0_00 is para) to 3 (spin functions 3:1); hydrogen's para
/// fraction from 1 to 1/4. Values outside are refused naming the range, as
/// are species without isomers and unknown isomer names.
#[test]
fn ranges_and_refusals() {
    let db = Database::builtin().unwrap();
    let water = db.find("H2O").unwrap();
    let r = composition_range(water, &Composition::parse("ortho/para=1").unwrap()).unwrap();
    assert_eq!(r.cold, Some(parse_rational("0").unwrap()));
    assert_eq!(r.hot, parse_rational("3").unwrap());
    let r = composition_range(
        db.find("H2").unwrap(),
        &Composition::parse("para=0.5").unwrap(),
    )
    .unwrap();
    assert_eq!(r.cold, Some(parse_rational("1").unwrap()));
    assert_eq!(r.hot, parse_rational("1/4").unwrap());
    let e = spin_temperature(water, &Composition::parse("ortho/para=3.2").unwrap(), 6)
        .unwrap_err()
        .to_string();
    assert!(e.contains("between 0") && e.contains("and 3"), "{e}");
    let e = spin_temperature(
        db.find("CO").unwrap(),
        &Composition::parse("ortho/para=1").unwrap(),
        6,
    )
    .unwrap_err()
    .to_string();
    assert!(e.contains("nuclear-spin isomers"), "{e}");
    let e = spin_temperature(water, &Composition::parse("meta/para=1").unwrap(), 6)
        .unwrap_err()
        .to_string();
    assert!(e.contains("ortho, para"), "{e}");
    assert!(Composition::parse("ortho:para=2").is_err());
}

/// Normal hydrogen relaxing to equilibrium at 20.28 K releases about 1.06
/// kJ/mol, 525 kJ/kg (Woolley, Scott and Brickwedde 1948, from memory), the
/// same number `zsum hydrogen` gives; and a frozen composition that is
/// already the equilibrium one releases nothing.
#[test]
fn relaxation_heats() {
    let db = Database::builtin().unwrap();
    let h2 = db.find("H2").unwrap();
    let t = parse_rational("20.28").unwrap();
    let o = MolarOptions::default();
    let (mol, kg) = relaxation_heat(h2, &Isomer::Normal, &t, &o).unwrap();
    assert!((mol.to_f64() - 1060.0).abs() < 15.0, "{}", mol.to_f64());
    assert!((kg.to_f64() - 525.0).abs() < 10.0, "{}", kg.to_f64());
    let (zero, _) = relaxation_heat(h2, &Isomer::Equilibrium, &t, &o).unwrap();
    assert!(zero.to_f64().abs() < 1e-9);
    // Water frozen at 3:1 in the cold (a comet-like ice sublimate, an
    // invented scenario) releases heat on relaxing at 10 K.
    let (w, _) = relaxation_heat(
        db.find("H2O").unwrap(),
        &Isomer::Normal,
        &parse_rational("10").unwrap(),
        &o,
    )
    .unwrap();
    assert!(w.to_f64() > 0.0);
}

/// `zsum spin`: the command gives the library's numbers; a value outside
/// the attainable range, a species without isomers, an unknown isomer and
/// a malformed composition exit with status 2 naming what is allowed, and
/// write nothing.
#[test]
fn the_spin_command() {
    let v = common::json(&[
        "spin",
        "H2O",
        "--measured",
        "ortho/para=2.5",
        "--format",
        "json",
    ]);
    let t: f64 = v["T_spin"].as_str().unwrap().parse().unwrap();
    let db = Database::builtin().unwrap();
    let st = spin_temperature(
        db.find("H2O").unwrap(),
        &Composition::parse("ortho/para=2.5").unwrap(),
        10,
    )
    .unwrap();
    assert_eq!(v["T_spin"].as_str().unwrap(), st.t.decimal(10).unwrap());
    assert!(t > 20.0 && t < 40.0);
    let v = common::json(&["spin", "H2", "--T", "20.28", "--format", "json"]);
    let q: f64 = v["rows"][0]["heat_per_mole"]
        .as_str()
        .unwrap()
        .parse()
        .unwrap();
    assert!((q - 1060.0).abs() < 15.0, "{q}");
    let dir = tempfile::tempdir().unwrap();
    let o = dir.path().join("x.txt");
    let o = o.to_str().unwrap();
    common::refused(
        &["spin", "H2O", "--measured", "ortho/para=3.5", "-o", o],
        "between 0",
    );
    common::refused(
        &["spin", "CO", "--measured", "ortho/para=1", "-o", o],
        "nuclear-spin isomers",
    );
    common::refused(
        &["spin", "CH4", "--measured", "meta/cis=1", "-o", o],
        "meta, para, ortho",
    );
    common::refused(
        &["spin", "H2", "--measured", "ortho:para=1", "-o", o],
        "A/B=X",
    );
    common::refused(
        &["spin", "H2", "--T", "20", "--from", "fraction=2", "-o", o],
        "between 0 and 1",
    );
    assert!(!std::path::Path::new(o).exists());
}
