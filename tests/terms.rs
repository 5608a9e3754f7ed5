//! The term column of level listings: each level's terms (J; J, K; v;
//! v1, v2; v, J), found without listing sublevels, must be exactly the
//! distinct projections of the level's states onto those quantum numbers
//! (the defining property), and match the textbook term formulas.

mod common;

use num_bigint::BigUint;
use num_rational::BigRational;
use std::collections::BTreeSet;
use zsum::exact::parse_rational;
use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
use zsum::models::oscillator::{AnharmonicOscillator, HarmonicModes};
use zsum::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
use zsum::report::{LevelsReport, ListOptions};
use zsum::spectrum::{Budget, Spectrum};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

#[test]
fn rotor_terms_are_j() {
    let rotor = LinearRotor::rigid(r("2"), EnergyUnit::Wavenumber).unwrap();
    assert_eq!(common::terms_are_projected_states(&rotor, "30"), 4);
    // E = B J(J+1): 0, 4, 12, 24 for J = 0..3.
    let rep = LevelsReport::build("rotor", &rotor, &r("30"), &ListOptions::default()).unwrap();
    let js: Vec<i64> = rep.levels.iter().map(|l| l.terms[0][0]).collect();
    assert_eq!(js, [0, 1, 2, 3]);
    // Para hydrogen-like weights (even J only): J = 0, 2, 4.
    let para =
        rotor.with_weights(ParityWeights::new(BigUint::from(1u8), BigUint::from(0u8)).unwrap());
    let terms = para.terms_within(&r("40"), &Budget::default()).unwrap();
    let js: Vec<i64> = terms.iter().map(|(_, t)| t[0]).collect();
    assert_eq!(js, [0, 2, 4]);
    common::terms_are_projected_states(&para, "100");
    let nonrigid = LinearRotor::new(r("1.9"), r("6e-6"), r("0"), EnergyUnit::Wavenumber).unwrap();
    common::terms_are_projected_states(&nonrigid, "500");
    let sph = SphericalTop::new(r("5.24"), r("0"), EnergyUnit::Wavenumber).unwrap();
    assert_eq!(common::terms_are_projected_states(&sph, "200"), 6);
}

#[test]
fn symmetric_top_terms_are_j_and_k() {
    let top =
        SymmetricTop::rigid(TopShape::Prolate, r("3"), r("1"), EnergyUnit::Wavenumber).unwrap();
    common::terms_are_projected_states(&top, "60");
    // E = B J(J+1) + (A − B) K²: (J, K) = (1, 1) at 2 + 2 = 4.
    let t = top.terms_within(&r("4"), &Budget::default()).unwrap();
    assert!(t.contains(&(r("4"), vec![1, 1])), "{t:?}");
    let oblate =
        SymmetricTop::rigid(TopShape::Oblate, r("1/2"), r("1"), EnergyUnit::Wavenumber).unwrap();
    common::terms_are_projected_states(&oblate, "40");
}

#[test]
fn oscillator_terms_are_quanta_per_mode() {
    let modes = HarmonicModes::new(
        vec![(r("1000"), 1), (r("1500"), 2)],
        false,
        EnergyUnit::Wavenumber,
    )
    .unwrap();
    terms_are_projected_sums(&modes, "6000");
    // 3000 = 3 × 1000 = 2 × 1500: two terms share the level.
    let t: BTreeSet<Vec<i64>> = modes
        .terms_within(&r("3000"), &Budget::default())
        .unwrap()
        .into_iter()
        .filter(|(e, _)| e == &r("3000"))
        .map(|(_, t)| t)
        .collect();
    assert_eq!(t, BTreeSet::from([vec![0, 2], vec![3, 0]]));
    let anh = AnharmonicOscillator::new(r("2358.57"), r("14.324"), r("0"), EnergyUnit::Wavenumber)
        .unwrap();
    // G(v) = we(v+1/2) − wexe(v+1/2)²: v = 3 at 8079.5, v = 4 at 10323.
    assert_eq!(common::terms_are_projected_states(&anh, "10000"), 4);
}

/// Harmonic modes: a degenerate mode's states list one number per
/// component, its term the total; the terms at each level are the distinct
/// component sums of the states there.
fn terms_are_projected_sums(s: &HarmonicModes, cutoff: &str) {
    let cut = r(cutoff);
    let names = s.quantum_numbers();
    let terms = s.terms_within(&cut, &Budget::default()).unwrap();
    for l in s.levels_up_to(&cut).unwrap().iter() {
        let got: BTreeSet<Vec<i64>> = terms
            .iter()
            .filter(|(e, _)| e == &l.energy)
            .map(|(_, t)| t.clone())
            .collect();
        let want: BTreeSet<Vec<i64>> = s
            .states_at(&l.energy)
            .unwrap()
            .iter()
            .map(|st| {
                s.term_numbers()
                    .iter()
                    .map(|t| {
                        names
                            .iter()
                            .zip(&st.0)
                            .filter(|(n, _)| n.starts_with(t.as_str()))
                            .map(|(_, v)| v)
                            .sum()
                    })
                    .collect()
            })
            .collect();
        assert_eq!(got, want, "at E = {}", l.energy);
    }
}

#[test]
fn vibrating_rotor_terms_are_v_and_j() {
    let vib =
        AnharmonicOscillator::new(r("4401"), r("121"), r("0"), EnergyUnit::Wavenumber).unwrap();
    let h2 =
        RovibDiatomic::new(vib, r("60.8"), r("3"), r("0.047"), ParityWeights::uniform()).unwrap();
    common::terms_are_projected_states(&h2, "9000");
    // The lowest term is (v, J) = (0, 0), the next (0, 1).
    let mut t = h2.terms_within(&r("2400"), &Budget::default()).unwrap();
    t.sort();
    assert_eq!(t[0].1, vec![0, 0]);
    assert_eq!(t[1].1, vec![0, 1]);
}
