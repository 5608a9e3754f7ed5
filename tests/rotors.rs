//! Rotors and tops against closed forms and published constants; products.

mod common;

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use proptest::prelude::*;
use zsum::exact::parse_rational;
use zsum::models::diatomic::ParityWeights;
use zsum::models::product::{Part, Product};
use zsum::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
use zsum::spectrum::Spectrum;
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn cm() -> EnergyUnit {
    EnergyUnit::Wavenumber
}

#[test]
fn rigid_rotor_has_jmax_plus_one_squared_states() {
    // Σ_{J=0}^{Jmax} (2J+1) = (Jmax+1)² (standard result).
    let rot = LinearRotor::rigid(r("1.99824"), cm()).unwrap();
    for jmax in [0u64, 1, 5, 40, 300] {
        let cut = rot.energy(jmax);
        let n = rot.levels_up_to(&cut).unwrap().total_states();
        assert_eq!(n, BigUint::from((jmax + 1) * (jmax + 1)));
    }
    common::check_spectrum(&rot, &r("2000"), 20);
}

#[test]
fn spherical_top_sums_squares_of_odd_numbers() {
    // Σ_{J=0}^{Jmax} (2J+1)² = (Jmax+1)(2Jmax+1)(2Jmax+3)/3 (standard sum).
    let top = SphericalTop::new(r("5.24"), r("0"), cm()).unwrap();
    for jmax in [0u64, 3, 17, 60] {
        let n = top.levels_up_to(&top.energy(jmax)).unwrap().total_states();
        assert_eq!(
            n,
            BigUint::from((jmax + 1) * (2 * jmax + 1) * (2 * jmax + 3) / 3)
        );
    }
    common::check_spectrum(&top, &r("600"), 10);
}

#[test]
fn symmetric_top_counts_both_signs_of_k() {
    // Brute force over J, K = −J..J, M: every (J,K) contributes 2J+1 states.
    for (shape, unique) in [(TopShape::Prolate, "5.1"), (TopShape::Oblate, "0.3")] {
        let b = r("0.8");
        let top = SymmetricTop::rigid(shape, r(unique), b.clone(), cm()).unwrap();
        let cut = r("60");
        let mut brute = 0u64;
        for j in 0..200u64 {
            for k in -(j as i64)..=(j as i64) {
                let e = &b * BigRational::from_integer((j * (j + 1)).into())
                    + (r(unique) - &b) * BigRational::from_integer((k * k).into());
                if e <= cut {
                    brute += 2 * j + 1;
                }
            }
        }
        assert_eq!(
            top.levels_up_to(&cut).unwrap().total_states(),
            BigUint::from(brute)
        );
        common::check_spectrum(&top, &cut, 15);
    }
}

#[test]
fn hydrogen_j1_term_value() {
    // H2 ground state B0 = 59.322 cm-1, D0 = 0.0471 cm-1 (Huber and Herzberg
    // 1979, from memory): E(J=1) = 2 B0 − 4 D0 = 118.4556 cm-1 exactly by the
    // formula; the observed S0(0)-related J=1 term, 118.37 cm-1 (from
    // memory), lies within 0.1 %.
    let h2 = LinearRotor::new(r("59.322"), r("0.0471"), r("0"), cm()).unwrap();
    assert_eq!(h2.energy(1), r("118.4556"));
    let rel = ((h2.energy(1) - r("118.37")) / r("118.37"))
        .to_f64()
        .unwrap()
        .abs();
    assert!(rel < 1e-3, "relative gap {rel}");
}

#[test]
fn nuclear_spin_weights_give_the_textbook_ratios() {
    // Standard texts on diatomic spectra (from memory): ortho:para 3:1 for
    // H2 (odd:even), 2:1 for D2 and 14N2 (even:odd), only odd N for 16O2.
    let w = |twice: u32, swap: bool| {
        let p = ParityWeights::from_nuclear_spin(twice, swap);
        (p.weight(0).to_u64().unwrap(), p.weight(1).to_u64().unwrap())
    };
    assert_eq!(w(1, false), (1, 3));
    assert_eq!(w(2, false), (6, 3));
    assert_eq!(w(0, true), (0, 1));
    // The O2 rotor then starts at N = 1.
    let o2 = LinearRotor::rigid(r("1.4376766"), cm())
        .unwrap()
        .with_weights(ParityWeights::from_nuclear_spin(0, true));
    let l = o2.levels_up_to(&r("100")).unwrap();
    assert_eq!(l.levels()[0].energy, o2.energy(1));
    assert!(l.iter().all(|lv| lv.degeneracy.to_u64().unwrap() % 2 == 1));
}

#[test]
fn centrifugal_turnover_stops_and_warns() {
    // E(J) = B x − D x² turns over where x ≈ B/(2D): J ≈ 9.5 for B=1, D=0.005.
    let rot = LinearRotor::new(r("1"), r("0.005"), r("0"), cm()).unwrap();
    let l = rot.levels_up_to(&r("1000")).unwrap();
    let last_j = l.len() as u64 - 1;
    assert!(rot.energy(last_j + 1) <= rot.energy(last_j));
    assert!(rot.energy(last_j) > rot.energy(last_j - 1));
    let w = rot.warnings(&r("1000"));
    assert_eq!(w.len(), 1);
    assert!(w[0].contains(&format!("J = {last_j}")), "{w:?}");
    assert!(rot.warnings(&r("10")).is_empty());
    // D so large that nothing is bound: refused, naming D.
    let e = LinearRotor::new(r("1"), r("1"), r("0"), cm()).unwrap_err();
    assert!(e.to_string().contains("centrifugal constant D 1"), "{e}");
}

#[test]
fn bad_rotor_constants_are_refused() {
    assert!(LinearRotor::rigid(r("0"), cm())
        .unwrap_err()
        .to_string()
        .contains("B 0"));
    assert!(LinearRotor::rigid(r("-2"), cm()).is_err());
    assert!(SymmetricTop::rigid(TopShape::Prolate, r("0.5"), r("1"), cm()).is_err());
    assert!(SymmetricTop::rigid(TopShape::Oblate, r("2"), r("1"), cm()).is_err());
}

#[test]
fn rotor_times_box_needs_a_physical_box_unit() {
    let rot = LinearRotor::rigid(r("2"), cm()).unwrap();
    let cube = zsum::models::ParticleInBox::cube(3).unwrap();
    let err = Product::new(
        vec![
            Part {
                name: "rot".into(),
                spectrum: Box::new(rot.clone()),
            },
            Part {
                name: "box".into(),
                spectrum: Box::new(cube.clone()),
            },
        ],
        None,
    )
    .unwrap_err()
    .to_string();
    assert!(
        err.contains("box") && err.contains("h^2/(8 m L^2)"),
        "{err}"
    );
    // With mass and side the combination is exact.
    let m = zsum::units::parse_mass_kg("28.0134u").unwrap();
    let l = zsum::units::parse_length_m("2nm").unwrap();
    let p = Product::new(
        vec![
            Part {
                name: "rot".into(),
                spectrum: Box::new(rot),
            },
            Part {
                name: "box".into(),
                spectrum: Box::new(cube.with_scale(&m, &l)),
            },
        ],
        None,
    )
    .unwrap();
    common::check_spectrum(&p, &r("20"), 10);
}

fn rotor_strategy() -> impl Strategy<Value = LinearRotor> {
    (1i64..40, 1i64..9).prop_map(|(b, d)| {
        LinearRotor::rigid(BigRational::new(b.into(), d.into()), EnergyUnit::Wavenumber).unwrap()
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(32))]

    #[test]
    fn zero_distortion_is_the_rigid_rotor(b in 1i64..50, cut in 1i64..3000) {
        let b = BigRational::from_integer(b.into());
        let c = BigRational::from_integer(cut.into());
        let rigid = LinearRotor::rigid(b.clone(), cm()).unwrap();
        let zero = LinearRotor::new(b, r("0"), r("0"), cm()).unwrap();
        prop_assert_eq!(rigid.levels_up_to(&c).unwrap(), zero.levels_up_to(&c).unwrap());
    }

    #[test]
    fn ortho_and_para_union_to_the_weighted_list(twice in 0u32..6, swap: bool, cut in 1i64..500) {
        let w = ParityWeights::from_nuclear_spin(twice, swap);
        let rot = LinearRotor::rigid(r("3"), cm()).unwrap().with_weights(w);
        let c = BigRational::from_integer(cut.into()) + r("6");
        let full = rot.levels_up_to(&c).unwrap();
        let even = rot.only_parity(true);
        let odd = rot.only_parity(false);
        let e = even.levels_up_to(&c).unwrap_or_else(|_| zsum::level::LevelList::empty(cm()));
        let o = odd.levels_up_to(&c).unwrap_or_else(|_| zsum::level::LevelList::empty(cm()));
        prop_assert_eq!(e.union(&o).unwrap(), full);
    }

    #[test]
    fn products_multiply_state_counts(a in rotor_strategy(), b in rotor_strategy(), cut in 1i64..200) {
        let c = BigRational::from_integer(cut.into());
        let la = a.levels_up_to(&c).unwrap();
        let lb = b.levels_up_to(&c).unwrap();
        let p = Product::new(vec![
            Part { name: "a".into(), spectrum: Box::new(a) },
            Part { name: "b".into(), spectrum: Box::new(b) },
        ], None).unwrap();
        let lp = p.levels_up_to(&c).unwrap();
        prop_assert_eq!(&lp, &la.product_up_to(&lb, &c).unwrap());
        // Without a cutoff in play, the full product's states multiply.
        let full = la.product(&lb).unwrap();
        prop_assert_eq!(full.total_states(), la.total_states() * lb.total_states());
        prop_assert!(p.count_bound(&c) >= lp.total_states());
    }
}
