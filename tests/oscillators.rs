//! Harmonic modes, the anharmonic and Morse vibrations and the
//! rotating-vibrating diatomic against outside facts: textbook degeneracies
//! of the isotropic oscillator, independent brute-force enumerations, the
//! standard counts of bound levels, and nuclear-spin statistics.

mod common;

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use proptest::prelude::*;
use std::collections::BTreeMap;
use zsum::exact::parse_rational;
use zsum::models::diatomic::{Parity, ParityWeights, RovibDiatomic};
use zsum::models::oscillator::{AnharmonicOscillator, HarmonicModes};
use zsum::spectrum::{Budget, Spectrum, State};
use zsum::units::EnergyUnit;
use zsum::ErrorKind;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn int(n: i64) -> BigRational {
    BigRational::from_integer(n.into())
}

fn rat(n: i64, d: i64) -> BigRational {
    BigRational::new(n.into(), d.into())
}

fn cm() -> EnergyUnit {
    EnergyUnit::Wavenumber
}

fn uint(n: u64) -> BigUint {
    BigUint::from(n)
}

/// (energy, degeneracy) pairs of a list, for comparisons.
fn pairs(s: &dyn Spectrum, cutoff: &BigRational) -> Vec<(BigRational, BigUint)> {
    s.levels_up_to(cutoff)
        .unwrap()
        .iter()
        .map(|l| (l.energy.clone(), l.degeneracy.clone()))
        .collect()
}

/// Every state of independent components with quanta `w` (one occupation
/// number each) with excitation energy at most `x`, by nested loops: the
/// brute force the harmonic model is checked against.
fn brute_states(w: &[BigRational], x: &BigRational) -> BTreeMap<BigRational, Vec<State>> {
    fn rec(
        w: &[BigRational],
        i: usize,
        e: BigRational,
        x: &BigRational,
        cur: &mut Vec<i64>,
        out: &mut BTreeMap<BigRational, Vec<State>>,
    ) {
        if i == w.len() {
            out.entry(e).or_default().push(State(cur.clone()));
            return;
        }
        let mut n = 0i64;
        loop {
            let en = &e + &w[i] * int(n);
            if &en > x {
                break;
            }
            cur.push(n);
            rec(w, i + 1, en, x, cur, out);
            cur.pop();
            n += 1;
        }
    }
    let mut out = BTreeMap::new();
    rec(w, 0, BigRational::zero(), x, &mut Vec::new(), &mut out);
    for v in out.values_mut() {
        v.sort();
    }
    out
}

/// The components of a set of modes: each quantum repeated d times.
fn components(modes: &[(BigRational, u32)]) -> Vec<BigRational> {
    modes
        .iter()
        .flat_map(|(w, d)| std::iter::repeat_n(w.clone(), *d as usize))
        .collect()
}

// ---------------------------------------------------------------- harmonic

#[test]
fn isotropic_3d_oscillator_has_degeneracy_v_plus_1_v_plus_2_over_2() {
    // The isotropic 3D oscillator has (v+1)(v+2)/2 states with v quanta
    // (from memory: every quantum-mechanics text, e.g. the nuclear shell
    // model's oscillator shells 1, 3, 6, 10, ...).
    for zero_point in [false, true] {
        let osc = HarmonicModes::isotropic(int(7), 3, zero_point, cm()).unwrap();
        let e0 = if zero_point { rat(21, 2) } else { int(0) };
        let got = pairs(&osc, &(&e0 + int(7 * 50)));
        assert_eq!(got.len(), 51);
        for (v, (e, g)) in got.iter().enumerate() {
            let v = v as u64;
            assert_eq!(e, &(&e0 + int(7 * v as i64)), "energy of v = {v}");
            assert_eq!(g, &uint((v + 1) * (v + 2) / 2), "degeneracy of v = {v}");
        }
    }
    // The 2D one: v + 1 (from memory, same texts).
    let osc2 = HarmonicModes::isotropic(int(1), 2, false, cm()).unwrap();
    for (v, (_, g)) in pairs(&osc2, &int(30)).iter().enumerate() {
        assert_eq!(g, &uint(v as u64 + 1));
    }
    let osc3 = HarmonicModes::isotropic(int(7), 3, true, cm()).unwrap();
    assert_eq!(osc3.quantum_numbers(), ["v1a", "v1b", "v1c"]);
    common::check_spectrum(&osc3, &int(7 * 40), 10);
}

#[test]
fn one_d_oscillator_levels_with_and_without_zero_point() {
    // E = ω(v + 1/2) with zero-point energy, ω v without (common practice).
    let w = r("2349.143");
    let with = HarmonicModes::one_d(w.clone(), true, cm()).unwrap();
    let without = HarmonicModes::one_d(w.clone(), false, cm()).unwrap();
    let cut = &w * int(20);
    let a = pairs(&with, &cut);
    let b = pairs(&without, &cut);
    assert_eq!(a.len(), 20); // v = 0..19: ω(19 + 1/2) ≤ 20 ω < ω(20 + 1/2)
    assert_eq!(b.len(), 21); // v = 0..20
    for (v, (e, g)) in a.iter().enumerate() {
        assert_eq!(e, &(&w * (int(v as i64) + rat(1, 2))));
        assert_eq!(g, &BigUint::one());
    }
    for (v, (e, g)) in b.iter().enumerate() {
        assert_eq!(e, &(&w * int(v as i64)));
        assert_eq!(g, &BigUint::one());
    }
    assert_eq!(with.ground_energy(), &w / int(2));
    assert_eq!(without.ground_energy(), int(0));
    assert_eq!(with.quantum_numbers(), ["v1"]);
    common::check_spectrum(&with, &cut, 20);
    common::check_spectrum(&without, &cut, 20);
}

#[test]
fn three_modes_with_a_doubly_degenerate_bend_match_brute_force() {
    // Invented CO2-like numbers: a stretch at 1388, a doubly degenerate
    // bend at 667 and a stretch at 2349 cm-1 (integers, so the bend
    // overtones collide with the stretch often: 2·667 + ... ). Checked by an
    // independent brute force over the four occupation numbers.
    let modes = vec![(int(1388), 1), (int(667), 2), (int(2349), 1)];
    for zero_point in [false, true] {
        let m = HarmonicModes::new(modes.clone(), zero_point, cm()).unwrap();
        assert_eq!(m.quantum_numbers(), ["v1", "v2a", "v2b", "v3"]);
        let e0 = if zero_point {
            rat(1388 + 2 * 667 + 2349, 2)
        } else {
            int(0)
        };
        assert_eq!(m.ground_energy(), e0);
        let x = int(9000);
        let cut = &e0 + &x;
        let brute = brute_states(&components(&modes), &x);
        let expected: Vec<(BigRational, BigUint)> = brute
            .iter()
            .map(|(e, s)| (&e0 + e, uint(s.len() as u64)))
            .collect();
        let got = pairs(&m, &cut);
        assert_eq!(got, expected);
        // The bend alone at v2 = 2 (E = 1334) has C(3, 1) = 3 states.
        let at = &e0 + int(1334);
        assert_eq!(
            m.states_at(&at).unwrap(),
            vec![
                State(vec![0, 0, 2, 0]),
                State(vec![0, 1, 1, 0]),
                State(vec![0, 2, 0, 0])
            ]
        );
        for (e, states) in brute.iter().step_by(7) {
            assert_eq!(&m.states_at(&(&e0 + e)).unwrap(), states, "states at {e}");
        }
        common::check_spectrum(&m, &cut, 40);
    }
}

#[test]
fn rational_quanta_and_coincidences_match_brute_force() {
    // Incommensurate-looking rational quanta, one triply degenerate.
    let modes = vec![(rat(7, 3), 3), (rat(5, 2), 1), (int(4), 2)];
    let m = HarmonicModes::new(modes.clone(), true, EnergyUnit::Kelvin).unwrap();
    let e0 = m.ground_energy();
    assert_eq!(e0, rat(7, 2) + rat(5, 4) + int(4));
    let x = int(20);
    let brute = brute_states(&components(&modes), &x);
    let got = pairs(&m, &(&e0 + &x));
    let expected: Vec<_> = brute
        .iter()
        .map(|(e, s)| (&e0 + e, uint(s.len() as u64)))
        .collect();
    assert_eq!(got, expected);
    assert_eq!(
        m.quantum_numbers(),
        ["v1a", "v1b", "v1c", "v2", "v3a", "v3b"]
    );
    common::check_spectrum(&m, &(&e0 + &x), 30);
}

#[test]
fn degeneracy_of_a_d_fold_mode_is_a_binomial() {
    // C(v+d-1, d-1): the number of ways of sharing v quanta among d
    // components (stars and bars, from memory).
    assert_eq!(HarmonicModes::mode_degeneracy(1, 10), uint(1));
    assert_eq!(HarmonicModes::mode_degeneracy(2, 10), uint(11));
    assert_eq!(HarmonicModes::mode_degeneracy(3, 4), uint(15));
    assert_eq!(HarmonicModes::mode_degeneracy(4, 3), uint(20));
    // C(108, 9) = 100·101···108 / 9!, and Pascal's triangle (an independent
    // recursion, C(n, k) = C(n−1, k−1) + C(n−1, k)) for small cases.
    let c: BigUint = (100u64..=108).map(BigUint::from).product::<BigUint>()
        / (1u64..=9).map(BigUint::from).product::<BigUint>();
    assert_eq!(HarmonicModes::mode_degeneracy(10, 99), c);
    let mut pascal = vec![vec![BigUint::one()]];
    for n in 1..40usize {
        let prev = &pascal[n - 1];
        let row: Vec<BigUint> = (0..=n)
            .map(|k| {
                let a = if k > 0 {
                    prev[k - 1].clone()
                } else {
                    BigUint::zero()
                };
                let b = prev.get(k).cloned().unwrap_or_default();
                a + b
            })
            .collect();
        pascal.push(row);
    }
    for d in 1u32..8 {
        for v in 0u64..30 {
            let n = (v + u64::from(d) - 1) as usize;
            assert_eq!(
                HarmonicModes::mode_degeneracy(d, v),
                pascal[n][d as usize - 1],
                "d = {d}, v = {v}"
            );
        }
    }
}

#[test]
fn harmonic_budget_is_checked_before_enumerating() {
    let m = HarmonicModes::new(vec![(int(1), 1), (int(1), 1), (int(1), 1)], false, cm()).unwrap();
    let err = m
        .levels_within(&int(1_000_000), &Budget::bytes(1 << 20))
        .unwrap_err();
    assert_eq!(err.kind(), ErrorKind::Budget);
    assert!(err.message().contains("lower cutoff"), "{}", err.message());
    // A modest cutoff goes through (levels 0..=100).
    let l = m.levels_up_to(&int(100)).unwrap();
    assert_eq!(l.len(), 101);
    // (v+1)(v+2)/2 states at v for three unit quanta, as the 3D oscillator.
    assert_eq!(l.levels()[100].degeneracy, uint(101 * 102 / 2));
}

#[test]
fn harmonic_bad_input_names_the_value() {
    let e = HarmonicModes::new(vec![(int(667), 2), (int(-5), 1)], true, cm()).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(
        e.message().contains("mode 2") && e.message().contains("-5"),
        "{}",
        e.message()
    );
    assert!(e.message().contains("greater than zero"), "{}", e.message());
    let e = HarmonicModes::one_d(int(0), true, cm()).unwrap_err();
    assert!(
        e.message().contains("frequency of mode 1 0"),
        "{}",
        e.message()
    );
    let e = HarmonicModes::new(vec![(int(667), 0)], true, cm()).unwrap_err();
    assert!(
        e.message().contains("degeneracy of mode 1 0"),
        "{}",
        e.message()
    );
    assert!(e.message().contains("at least 1"), "{}", e.message());
    let e = HarmonicModes::new(Vec::new(), true, cm()).unwrap_err();
    assert!(e.message().contains("at least one"), "{}", e.message());
    let e = HarmonicModes::isotropic(int(1), 0, true, cm()).unwrap_err();
    assert!(e.message().contains("dimensions 0"), "{}", e.message());
    // A cutoff below the ground level is refused, naming both.
    let m = HarmonicModes::one_d(int(100), true, cm()).unwrap();
    let e = m.levels_up_to(&int(49)).unwrap_err();
    assert!(
        e.message().contains("cutoff 49") && e.message().contains("50"),
        "{}",
        e.message()
    );
}

// ------------------------------------------------------------- anharmonic

/// The standard count of bound levels of G(v) = we(v+1/2) − wexe(v+1/2)²:
/// v_max = floor(we/(2 wexe) − 1/2) (from memory: the level nearest the
/// maximum of G, e.g. Herzberg's treatment of the Birge–Sponer limit).
fn standard_v_max(we: &BigRational, wexe: &BigRational) -> i64 {
    (we / (int(2) * wexe) - rat(1, 2))
        .floor()
        .to_integer()
        .to_i64()
        .unwrap()
}

#[test]
fn anharmonic_bound_levels_follow_the_standard_count() {
    // (we, wexe) with x = we/(2 wexe): integer x, x + 1/2 integer (the tie:
    // a level exactly at the maximum, kept), fractional parts on both sides
    // of 1/2, invented H2-like and CO-like constants, and the edge x = 1/2.
    let cases = [
        ("1000", "50"),        // x = 10
        ("1050", "50"),        // x = 10.5: v = 10 sits at the maximum
        ("1030", "50"),        // x = 10.3
        ("1070", "50"),        // x = 10.7
        ("4401.21", "121.34"), // x = 18.14
        ("2169.81", "13.29"),  // x = 81.63
        ("7/3", "1/5"),        // x = 35/6
        ("1", "1/3"),          // x = 3/2: v = 1 at the maximum
        ("100", "100"),        // x = 1/2: v = 0 at the maximum
        ("100", "99"),         // x = 0.505
    ];
    for (we, wexe) in cases {
        let (we, wexe) = (r(we), r(wexe));
        let osc = AnharmonicOscillator::new(we.clone(), wexe.clone(), int(0), cm()).unwrap();
        let expected = standard_v_max(&we, &wexe);
        assert_eq!(
            osc.v_max(),
            Some(expected as u64),
            "we = {we}, wexe = {wexe}"
        );
        let high = &we * int(1000);
        let levels = osc.levels_up_to(&high).unwrap();
        assert_eq!(levels.len() as i64, expected + 1);
        for (v, l) in levels.iter().enumerate() {
            let u = int(v as i64) + rat(1, 2);
            assert_eq!(l.energy, &we * &u - &wexe * &u * &u);
        }
        let w = osc.warnings(&high);
        assert_eq!(w.len(), 1);
        assert!(
            w[0].contains(&format!("levels end at v = {expected}")),
            "{}",
            w[0]
        );
        // At the last level itself there is nothing to warn about.
        assert!(osc.warnings(&osc.term_value(expected as u64)).is_empty());
        common::check_spectrum(&osc, &high, 20);
    }
}

#[test]
fn a_level_past_the_maximum_is_not_bound_even_if_above_its_neighbour() {
    // The convention, tested: x = we/(2 wexe) = 10.3, so G's maximum is at
    // v = 9.8. G(10) > G(9), yet v = 10 lies past the maximum and is not
    // listed; the standard count floor(10.3 − 1/2) = 9 agrees.
    let osc = AnharmonicOscillator::new(int(1030), int(50), int(0), cm()).unwrap();
    assert!(osc.term_value(10) > osc.term_value(9));
    assert_eq!(osc.v_max(), Some(9));
}

#[test]
fn weye_moves_the_maximum_to_the_root_of_the_slope() {
    // With weye, the maximum of G(u) = we u − wexe u² + weye u³ is at the
    // first positive root of we − 2 wexe u + 3 weye u², u* = we / (wexe +
    // sqrt(wexe² − 3 weye we)) (from memory: the quadratic formula,
    // rationalised). The cases are far from ties, so f64 decides them.
    let cases = [
        ("1000", "20", "0.1"),
        ("1000", "20", "-0.5"),
        ("2000", "15", "0.02"),
    ];
    for (we, wexe, weye) in cases {
        let (a, b, c) = (r(we), r(wexe), r(weye));
        let osc = AnharmonicOscillator::new(a.clone(), b.clone(), c.clone(), cm()).unwrap();
        let (af, bf, cf) = (
            a.to_f64().unwrap(),
            b.to_f64().unwrap(),
            c.to_f64().unwrap(),
        );
        let u_star = af / (bf + (bf * bf - 3.0 * cf * af).sqrt());
        let expected = (u_star - 0.5).floor() as u64;
        assert!((u_star - 0.5 - expected as f64) > 0.01, "not a near tie");
        assert_eq!(osc.v_max(), Some(expected), "{we} {wexe} {weye}");
        common::check_spectrum(&osc, &(&a * int(100)), 10);
    }
    // 1000 / 30 = 33.33...: v_max = 32, worked by hand.
    let osc = AnharmonicOscillator::new(int(1000), int(20), r("0.1"), cm()).unwrap();
    assert_eq!(osc.v_max(), Some(32));
    // weye > 0 with wexe² < 3 weye we: G rises for ever, no last level.
    let osc = AnharmonicOscillator::new(int(1000), int(20), int(1), cm()).unwrap();
    assert_eq!(osc.v_max(), None);
    assert_eq!(osc.levels_up_to(&int(100_000)).unwrap().len() as u64, {
        (0u64..)
            .take_while(|&v| osc.term_value(v) <= int(100_000))
            .count() as u64
    });
}

#[test]
fn without_anharmonicity_the_vibration_is_the_harmonic_oscillator() {
    let osc = AnharmonicOscillator::new(r("1580.19"), int(0), int(0), cm()).unwrap();
    assert_eq!(osc.v_max(), None);
    let h = HarmonicModes::one_d(r("1580.19"), true, cm()).unwrap();
    assert_eq!(pairs(&osc, &int(40_000)), pairs(&h, &int(40_000)));
    assert!(osc.warnings(&int(40_000)).is_empty());
}

#[test]
fn morse_bound_levels_follow_the_standard_count() {
    // The Morse oscillator has floor(2De/we − 1/2) + 1 bound levels (from
    // memory: λ = sqrt(2 m De)/(a ħ) = 2De/we and v < λ − 1/2). zsum's
    // convention counts only levels with G(v) < De strictly, so when
    // 2De/we − 1/2 is a whole number (the tie) the level at exactly
    // G = De, the threshold, is not bound and zsum has one fewer.
    let cases = [
        ("100", "1000", false),      // 2De/we = 20
        ("100", "1025", true),       // 20.5: tie
        ("100", "1010", false),      // 20.2
        ("100", "1040", false),      // 20.8
        ("1", "1/2", false),         // 1: one level
        ("1", "3/4", true),          // 1.5: tie, one level
        ("2358.57", "79845", false), // invented N2-like numbers
    ];
    for (we, de, tie) in cases {
        let (we, de) = (r(we), r(de));
        let osc = AnharmonicOscillator::morse(we.clone(), de.clone(), cm()).unwrap();
        assert_eq!(osc.wexe(), &(&we * &we / (int(4) * &de)));
        assert_eq!(osc.dissociation_energy(), Some(&de));
        let standard = (int(2) * &de / &we - rat(1, 2))
            .floor()
            .to_integer()
            .to_u64()
            .unwrap()
            + 1;
        let expected = if tie { standard - 1 } else { standard };
        assert_eq!(osc.bound_levels(), Some(expected), "we = {we}, De = {de}");
        let levels = osc.levels_up_to(&(&de * int(2))).unwrap();
        assert_eq!(levels.len() as u64, expected);
        assert!(levels.iter().all(|l| l.energy < de));
        if tie {
            // The excluded level sits exactly at the dissociation limit.
            assert_eq!(osc.term_value(expected), de);
        } else {
            assert!(osc.term_value(expected) < de);
            // ...but it lies past the maximum of G (v + 1/2 > 2De/we).
            assert!(int(expected as i64) + rat(1, 2) > int(2) * &de / &we);
        }
        let w = osc.warnings(&de);
        assert!(w[0].contains("De = "), "{}", w[0]);
        common::check_spectrum(&osc, &de, 20);
    }
}

#[test]
fn anharmonic_bad_input_names_the_value() {
    let e = AnharmonicOscillator::new(int(0), int(1), int(0), cm()).unwrap_err();
    assert!(e.message().contains("we 0") && e.message().contains("greater than zero"));
    let e = AnharmonicOscillator::new(int(-3), int(1), int(0), cm()).unwrap_err();
    assert!(e.message().contains("we -3"), "{}", e.message());
    let e = AnharmonicOscillator::new(int(1000), r("-0.5"), int(0), cm()).unwrap_err();
    assert!(e.message().contains("wexe -0.5"), "{}", e.message());
    // x = we/(2 wexe) = 1/6 < 1/2: even v = 0 lies past the maximum.
    let e = AnharmonicOscillator::new(int(100), int(300), int(0), cm()).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(e.message().contains("wexe 300"), "{}", e.message());
    assert!(
        e.message().contains("no vibrational level is bound"),
        "{}",
        e.message()
    );
    // With weye the pair is named: here G'(u) = 1 − 300 u² turns at
    // u = 0.058, before v = 0.
    let e = AnharmonicOscillator::new(int(1), int(0), int(-100), cm()).unwrap_err();
    assert!(
        e.message().contains("(wexe, weye) (0, -100)"),
        "{}",
        e.message()
    );
    let e = AnharmonicOscillator::morse(int(100), int(25), cm()).unwrap_err();
    assert!(e.message().contains("De 25"), "{}", e.message());
    assert!(e.message().contains("we/4 = 25"), "{}", e.message());
    let e = AnharmonicOscillator::morse(int(0), int(25), cm()).unwrap_err();
    assert!(e.message().contains("we 0"), "{}", e.message());
    let e = AnharmonicOscillator::morse(int(10), int(-2), cm()).unwrap_err();
    assert!(e.message().contains("De -2"), "{}", e.message());
    let osc = AnharmonicOscillator::new(int(1000), int(10), int(0), cm()).unwrap();
    let e = osc.levels_up_to(&int(100)).unwrap_err();
    assert!(
        e.message().contains("cutoff 100") && e.message().contains("995/2"),
        "{}",
        e.message()
    );
}

// ------------------------------------------------------------ nuclear spin

#[test]
fn nuclear_spin_weights_are_the_textbook_ones() {
    // From memory (Herzberg, Spectra of Diatomic Molecules; any statistical
    // mechanics text on ortho- and para-hydrogen):
    // H2, I = 1/2 (fermions): even J : odd J = 1 : 3, ortho = odd J.
    let h2 = ParityWeights::from_nuclear_spin(1, false);
    assert_eq!((h2.even(), h2.odd()), (&uint(1), &uint(3)));
    assert_eq!(h2.ortho(), Some(Parity::Odd));
    assert_eq!(h2.para(), Some(Parity::Even));
    assert_eq!(h2.modification(0), Some("para"));
    assert_eq!(h2.modification(3), Some("ortho"));
    // D2 and 14N2, I = 1 (bosons): 6 : 3 = 2 : 1, ortho = even J.
    let d2 = ParityWeights::from_nuclear_spin(2, false);
    assert_eq!((d2.even(), d2.odd()), (&uint(6), &uint(3)));
    assert_eq!(d2.ortho(), Some(Parity::Even));
    assert_eq!(d2.modification(2), Some("ortho"));
    // 16O2, I = 0, in its 3Σg- ground state (swap): only odd N survive.
    let o2 = ParityWeights::from_nuclear_spin(0, true);
    assert_eq!((o2.even(), o2.odd()), (&uint(0), &uint(1)));
    // Without the swap (a Σg+ state of spin-0 nuclei, e.g. 12C2): even only.
    let c2 = ParityWeights::from_nuclear_spin(0, false);
    assert_eq!((c2.even(), c2.odd()), (&uint(1), &uint(0)));
    // 35Cl2, I = 3/2: (2I+1)I = 6 antisymmetric (even J), (2I+1)(I+1) = 10
    // symmetric (odd J): 3 : 5.
    let cl2 = ParityWeights::from_nuclear_spin(3, false);
    assert_eq!((cl2.even(), cl2.odd()), (&uint(6), &uint(10)));
    // In all (2I+1)² spin states.
    for t in 0u32..12 {
        let w = ParityWeights::from_nuclear_spin(t, false);
        assert_eq!(w.even() + w.odd(), uint(u64::from((t + 1) * (t + 1))));
        assert_eq!(ParityWeights::from_nuclear_spin(t, true).even(), w.odd());
    }
    assert_eq!(h2.weight(4), &uint(1));
    assert_eq!(h2.weight(5), &uint(3));
    assert_eq!(ParityWeights::uniform().ortho(), None);
    assert_eq!(ParityWeights::uniform().modification(1), None);
    let e = ParityWeights::new(uint(0), uint(0)).unwrap_err();
    assert!(e.message().contains("0:0"), "{}", e.message());
    assert!(ParityWeights::new(uint(0), uint(2)).is_ok());
}

// ----------------------------------------------------------------- rovib

fn vib(we: &str, wexe: &str) -> AnharmonicOscillator {
    AnharmonicOscillator::new(r(we), r(wexe), int(0), cm()).unwrap()
}

#[test]
fn rovib_ground_ladder_is_the_textbook_formula() {
    // E(0, J) = G(0) + B J(J+1) − D [J(J+1)]² with alpha_e = 0 (the
    // spectroscopists' term formula, common practice), degeneracy 2J+1.
    let (b, d) = (r("10.5"), r("0.0003"));
    let m = RovibDiatomic::new(
        vib("2000", "10"),
        b.clone(),
        int(0),
        d.clone(),
        ParityWeights::uniform(),
    )
    .unwrap();
    let g0 = int(1000) - rat(10, 4);
    assert_eq!(m.ground_energy(), g0);
    // Below G(1) = G(0) + 1980 every level has v = 0.
    let cut = &g0 + int(1900);
    let mut expected = Vec::new();
    for j in 0i64.. {
        let x = int(j * (j + 1));
        let e = &g0 + &b * &x - &d * &x * &x;
        if e > cut {
            break;
        }
        expected.push((e, uint(2 * j as u64 + 1)));
    }
    assert!(expected.len() > 10);
    assert_eq!(pairs(&m, &cut), expected);
    assert_eq!(
        m.states_at(&expected[1].0).unwrap(),
        vec![
            State(vec![0, 1, -1]),
            State(vec![0, 1, 0]),
            State(vec![0, 1, 1])
        ]
    );
    assert_eq!(m.quantum_numbers(), ["v", "J", "M"]);
    common::check_spectrum(&m, &cut, 30);
}

/// An independent loop over (v, J): v up to the standard count, J while
/// E(v, J) rises and stays below the cutoff; weights by parity.
fn brute_rovib(
    we: &BigRational,
    wexe: &BigRational,
    be: &BigRational,
    alpha: &BigRational,
    d: &BigRational,
    w: (u64, u64),
    cut: &BigRational,
) -> Vec<(BigRational, BigUint)> {
    let mut map: BTreeMap<BigRational, BigUint> = BTreeMap::new();
    for v in 0..=standard_v_max(we, wexe) {
        let u = int(v) + rat(1, 2);
        let g = we * &u - wexe * &u * &u;
        let bv = be - alpha * &u;
        let e = |j: i64| {
            let x = int(j * (j + 1));
            &g + &bv * &x - d * &x * &x
        };
        let mut j = 0i64;
        while &e(j) <= cut {
            let weight = if j % 2 == 0 { w.0 } else { w.1 };
            if weight > 0 {
                *map.entry(e(j)).or_default() += uint((2 * j as u64 + 1) * weight);
            }
            if e(j + 1) <= e(j) {
                break;
            }
            j += 1;
        }
    }
    map.into_iter().collect()
}

#[test]
fn rovib_with_alpha_and_spin_weights_matches_a_direct_loop() {
    // Invented H2-like constants (cm-1) with ortho/para weights 1:3, and a
    // shallow well so that several vibrational levels are bound.
    let (we, wexe) = (r("440.1"), r("12.1"));
    let (be, alpha, d) = (r("6.085"), r("0.306"), r("0.0047"));
    let w = ParityWeights::from_nuclear_spin(1, false);
    let osc = AnharmonicOscillator::new(we.clone(), wexe.clone(), int(0), cm()).unwrap();
    let m = RovibDiatomic::new(osc, be.clone(), alpha.clone(), d.clone(), w).unwrap();
    assert_eq!(m.quantum_numbers(), ["v", "J", "M", "s"]);
    assert_eq!(m.b_v(2), &be - &alpha * rat(5, 2));
    let cut = int(3000);
    let expected = brute_rovib(&we, &wexe, &be, &alpha, &d, (1, 3), &cut);
    assert_eq!(pairs(&m, &cut), expected);
    // J = 1 of v = 0 holds 3 M values times 3 spin substates.
    let e01 = m.energy(0, 1);
    let states = m.states_at(&e01).unwrap();
    assert_eq!(states.len(), 9);
    assert!(states.contains(&State(vec![0, 1, -1, 3])));
    common::check_spectrum(&m, &cut, 40);
}

#[test]
fn rovib_o2_keeps_only_odd_rotational_levels() {
    // 16O2 in 3Σg- (from memory: only odd N); invented constants.
    let w = ParityWeights::from_nuclear_spin(0, true);
    let m = RovibDiatomic::new(vib("1580", "12"), r("1.44"), r("0.016"), r("0.000005"), w).unwrap();
    assert_eq!(m.ground_energy(), m.energy(0, 1));
    let l = m.levels_up_to(&int(2000)).unwrap();
    for lev in l.iter() {
        let states = m.states_at(&lev.energy).unwrap();
        assert!(
            states.iter().all(|s| s.0[1] % 2 == 1),
            "even J at {}",
            lev.energy
        );
    }
    assert!(m.states_at(&m.energy(0, 2)).unwrap().is_empty());
    assert_eq!(m.quantum_numbers(), ["v", "J", "M"]);
    common::check_spectrum(&m, &int(2000), 30);
}

#[test]
fn centrifugal_turnover_ends_the_ladder_with_a_warning() {
    // B/(2D) = 50: E(0, J) rises for J ≤ 7 (J² < 50) and falls after.
    let m = RovibDiatomic::new(
        vib("1000", "10"),
        int(2),
        int(0),
        rat(1, 50),
        ParityWeights::uniform(),
    )
    .unwrap();
    assert_eq!(m.j_max(0), Some(7));
    let g0 = m.ground_energy();
    let cut = &g0 + int(500); // below G(1) = G(0) + 980
    let l = m.levels_up_to(&cut).unwrap();
    assert_eq!(l.len(), 8);
    assert_eq!(l.levels()[7].energy, m.energy(0, 7));
    let w = m.warnings(&cut);
    assert_eq!(w.len(), 1);
    assert!(w[0].contains("v = 0 at J = 7"), "{}", w[0]);
    // Below the top of the ladder there is nothing to report.
    assert!(m.warnings(&m.energy(0, 6)).is_empty());
    common::check_spectrum(&m, &cut, 8);
}

#[test]
fn rovib_bad_input_names_the_value() {
    let u = ParityWeights::uniform;
    // D_e so large that no J > 0 level rises: 2B − 4D = 0.
    let e = RovibDiatomic::new(vib("1000", "10"), int(10), int(0), int(5), u()).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(
        e.message().contains("D_e 5") && e.message().contains("J = 1"),
        "{}",
        e.message()
    );
    // alpha_e negative.
    let e = RovibDiatomic::new(vib("1000", "10"), int(10), int(-1), int(0), u()).unwrap_err();
    assert!(e.message().contains("alpha_e -1"), "{}", e.message());
    // alpha_e so large that B_v ≤ 0 at a bound level: v_max = 49 here, and
    // B_v = 10 − 2(v + 1/2) ≤ 0 first at v = 5.
    let e = RovibDiatomic::new(vib("1000", "10"), int(10), int(2), int(0), u()).unwrap_err();
    assert!(
        e.message().contains("alpha_e 2") && e.message().contains("v = 5"),
        "{}",
        e.message()
    );
    // ... or positive alpha with an endless vibrational ladder.
    let e = RovibDiatomic::new(vib("1000", "0"), int(10), r("0.1"), int(0), u()).unwrap_err();
    assert!(e.message().contains("alpha_e 0.1"), "{}", e.message());
    let e = RovibDiatomic::new(vib("1000", "10"), int(0), int(0), int(0), u()).unwrap_err();
    assert!(e.message().contains("B_e 0"), "{}", e.message());
    let e = RovibDiatomic::new(vib("1000", "10"), int(1), int(0), r("-0.1"), u()).unwrap_err();
    assert!(e.message().contains("D_e -0.1"), "{}", e.message());
    // D_e fine at v = 0 but not at the last bound level, where B_v is least.
    // B_v = 10 − (v + 1/2)/10 and v_max = 49: B_v ≤ 2 D_e = 5.2 first at
    // v = 48 (B_48 = 5.15, B_47 = 5.25).
    let e = RovibDiatomic::new(vib("1000", "10"), int(10), r("0.1"), r("2.6"), u()).unwrap_err();
    assert!(
        e.message().contains("D_e 2.6") && e.message().contains("v = 48"),
        "{}",
        e.message()
    );
}

#[test]
fn rovib_count_bound_is_exact_when_summed_and_an_upper_bound_beyond() {
    // A very shallow anharmonicity gives thousands of vibrational levels:
    // below 4096 of them count_bound sums exactly, above it bounds. Both
    // are compared with a direct loop over (v, J).
    let m = RovibDiatomic::new(
        vib("10", "0.0001"),
        int(100),
        int(0),
        int(0),
        ParityWeights::uniform(),
    )
    .unwrap();
    let direct = |e: &BigRational| -> BigUint {
        let mut n = BigUint::zero();
        for v in 0u64.. {
            let g = m.vibration().term_value(v);
            if &g > e {
                break;
            }
            let mut j = 0u64;
            while &(&g + int(100) * int((j * (j + 1)) as i64)) <= e {
                n += uint(2 * j + 1);
                j += 1;
            }
        }
        n
    };
    let small = int(20_000); // about 2000 vibrational levels
    assert_eq!(m.count_bound(&small), direct(&small));
    let large = int(60_000); // about 6000
    let exact = direct(&large);
    let bound = m.count_bound(&large);
    assert!(bound >= exact, "bound {bound} below {exact}");
}

// ---------------------------------------------------------------- proptest

fn mode_strategy() -> impl Strategy<Value = (BigRational, u32)> {
    // Quanta from 2/3 up, at most two components per mode: small enough
    // for the brute force.
    ((2i64..12, 1i64..4), 1u32..3).prop_map(|((n, d), g)| (rat(n, d), g))
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn harmonic_counts_match_brute_force_and_the_bound_holds(
        modes in prop::collection::vec(mode_strategy(), 1..4),
        zero_point in any::<bool>(),
        top in 0i64..11,
    ) {
        let m = HarmonicModes::new(modes.clone(), zero_point, cm()).unwrap();
        let e0 = m.ground_energy();
        let x = int(top);
        let list = m.levels_up_to(&(&e0 + &x)).unwrap();
        let brute = brute_states(&components(&modes), &x);
        let n: usize = brute.values().map(|s| s.len()).sum();
        prop_assert_eq!(list.total_states(), uint(n as u64));
        let sum: BigUint = list.iter().map(|l| l.degeneracy.clone()).sum();
        prop_assert_eq!(list.total_states(), sum);
        let mut running = BigUint::zero();
        for l in list.iter() {
            running += &l.degeneracy;
            prop_assert!(m.count_bound(&l.energy) >= running);
        }
        // Far above the listing too: the bound still holds.
        prop_assert!(m.count_bound(&(&e0 + &x + rat(1, 3))) >= running);
    }

    #[test]
    fn rovib_counts_match_a_direct_loop_and_the_bound_holds(
        we in 200i64..600,
        wexe in 5i64..40,
        be in 1i64..20,
        alpha_milli in 0i64..30,
        d_micro in 0i64..2000,
        even in 0u64..4,
        odd in 1u64..4,
        cut in 500i64..3000,
    ) {
        let (we, wexe, be) = (int(we), int(wexe), int(be));
        let alpha = rat(alpha_milli, 1000);
        let d = rat(d_micro, 1_000_000);
        let osc = AnharmonicOscillator::new(we.clone(), wexe.clone(), int(0), cm()).unwrap();
        let w = ParityWeights::new(uint(even), uint(odd)).unwrap();
        let m = match RovibDiatomic::new(osc, be.clone(), alpha.clone(), d.clone(), w) {
            Ok(m) => m,
            // Parameters the model rightly refuses (B_v ≤ 2 D_e somewhere).
            Err(e) => {
                prop_assert!(e.message().contains("D_e") || e.message().contains("alpha_e"));
                return Ok(());
            }
        };
        let cut = int(cut);
        if cut < m.ground_energy() {
            return Ok(());
        }
        let list = m.levels_up_to(&cut).unwrap();
        let expected = brute_rovib(&we, &wexe, &be, &alpha, &d, (even, odd), &cut);
        let direct: BigUint = expected.iter().map(|(_, g)| g.clone()).sum();
        prop_assert_eq!(list.total_states(), direct);
        let mut running = BigUint::zero();
        for l in list.iter() {
            running += &l.degeneracy;
            let bound = m.count_bound(&l.energy);
            prop_assert!(bound >= running);
        }
        prop_assert!(m.count_bound(&cut) >= running);
        // Every level is at or above the ground level.
        prop_assert!(list.iter().all(|l| l.energy >= m.ground_energy()));
        prop_assert!(!m.ground_energy().is_negative());
    }
}
