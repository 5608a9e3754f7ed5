//! Exact unit conversions against the SI defining constants and CODATA.

use num_rational::BigRational;
use zsum::exact::{format_sig, parse_rational};
use zsum::units::{box_unit_joules, constants, parse_length_m, parse_mass_kg, EnergyUnit};

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

const ALL: [EnergyUnit; 6] = [
    EnergyUnit::Joule,
    EnergyUnit::ElectronVolt,
    EnergyUnit::MilliElectronVolt,
    EnergyUnit::Wavenumber,
    EnergyUnit::Kelvin,
    EnergyUnit::KilojoulePerMole,
];

#[test]
fn conversions_round_trip_exactly() {
    let values = ["1", "27/4", "1.2345e-21", "6.02214076e23", "-3/7"];
    for a in &ALL {
        for b in &ALL {
            for v in values {
                let x = r(v);
                let there = a.convert(&x, b).unwrap();
                assert_eq!(b.convert(&there, a).unwrap(), x, "{a} -> {b} -> {a}");
            }
        }
    }
}

#[test]
fn second_radiation_constant_is_exact() {
    // CODATA 2018: c2 = hc/k = 1.438 776 877... × 10⁻² m K, exact since
    // 2019 (the SI defining constants). The 20-digit value was computed with
    // Python's fractions module from the same defining constants.
    let c2 = constants::second_radiation_constant();
    assert_eq!(format_sig(&c2, 10), "0.01438776878");
    assert_eq!(format_sig(&c2, 20), "0.014387768775039338021");
    let f = EnergyUnit::Wavenumber
        .factor_to(&EnergyUnit::Kelvin)
        .unwrap();
    assert_eq!(f, c2 * r("100"));
}

#[test]
fn conversion_factors_match_codata_tables() {
    // CODATA 2018 energy conversion factors (exact since 2019), from memory:
    // 1 eV = 8065.543 937... cm⁻¹, 1 eV = 11604.518 12... K,
    // 1 eV = 96.485 332 12... kJ/mol, 1 K = 0.695 034 800... cm⁻¹.
    let ev = EnergyUnit::ElectronVolt;
    assert_eq!(
        format_sig(&ev.factor_to(&EnergyUnit::Wavenumber).unwrap(), 10),
        "8065.543937"
    );
    assert_eq!(
        format_sig(&ev.factor_to(&EnergyUnit::Kelvin).unwrap(), 10),
        "11604.51812"
    );
    assert_eq!(
        format_sig(&ev.factor_to(&EnergyUnit::KilojoulePerMole).unwrap(), 10),
        "96.48533212"
    );
    assert_eq!(
        format_sig(
            &EnergyUnit::Kelvin
                .factor_to(&EnergyUnit::Wavenumber)
                .unwrap(),
            9
        ),
        "0.695034800"
    );
}

#[test]
fn helium_in_a_ten_nanometre_box() {
    // h²/(8 m L²) for m = 4.0026 u, L = 10 nm, worked by hand with the exact
    // SI h and the CODATA 2018 m_u: 8.2571...e-26 J.
    let m = parse_mass_kg("4.0026u").unwrap();
    let l = parse_length_m("10nm").unwrap();
    let j = box_unit_joules(&m, &l);
    let h = 6.62607015e-34_f64;
    let by_hand = h * h / (8.0 * 4.0026 * 1.66053906660e-27 * 1e-16);
    let ours: f64 = num_traits::ToPrimitive::to_f64(&j).unwrap();
    assert!(
        ((ours - by_hand) / by_hand).abs() < 1e-14,
        "{ours} vs {by_hand}"
    );
    assert_eq!(parse_length_m("100A").unwrap(), l);
    assert_eq!(parse_length_m("1e-8m").unwrap(), l);
    assert_eq!(parse_mass_kg("4.0026 Da").unwrap(), m);
}

#[test]
fn bad_quantities_say_what_is_allowed() {
    let e = EnergyUnit::parse("furlong").unwrap_err().to_string();
    assert!(e.contains("furlong") && e.contains("cm-1"), "{e}");
    let e = parse_mass_kg("4.0026").unwrap_err().to_string();
    assert!(e.contains("needs a unit"), "{e}");
    let e = parse_length_m("-3nm").unwrap_err().to_string();
    assert!(e.contains("greater than zero"), "{e}");
    let e = parse_length_m("xnm").unwrap_err().to_string();
    assert!(e.contains("xnm"), "{e}");
    assert!(parse_rational("1e999999").is_err());
    assert!(parse_rational("nan").is_err());
    assert!(parse_rational("1/0").is_err());
}

#[test]
fn formatting_rounds_correctly() {
    // Round half to even on exact ties; carries across the decimal point.
    assert_eq!(format_sig(&r("0.125"), 2), "0.12");
    assert_eq!(format_sig(&r("0.135"), 2), "0.14");
    assert_eq!(format_sig(&r("9.995"), 3), "10.0");
    assert_eq!(format_sig(&r("-2/3"), 3), "-0.667");
    assert_eq!(format_sig(&r("1.5e-30"), 2), "1.5e-30");
    assert_eq!(format_sig(&r("123456"), 3), "1.23e5");
    assert_eq!(format_sig(&r("123456"), 6), "123456");
}
