//! The summation engine against closed forms, published expansions, its own
//! fast paths, and its precision promise.

mod common;

use num_rational::BigRational;
use proptest::prelude::*;
use zsum::exact::parse_rational;
use zsum::level::LevelList;
use zsum::models::oscillator::HarmonicModes;
use zsum::models::product::{Part, Product};
use zsum::models::rotor::LinearRotor;
use zsum::models::ParticleInBox;
use zsum::report::ThermoPoint;
use zsum::spectrum::{Budget, Spectrum, State};
use zsum::sum::{thermo, thermo_with, Path, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn f(s: &str) -> f64 {
    s.parse().unwrap()
}

fn kelvin(t: &str) -> Temperature {
    Temperature::Kelvin(r(t))
}

fn same_digits(a: &ThermoPoint, b: &ThermoPoint) {
    assert_eq!(a.q, b.q, "q");
    assert_eq!(a.ln_q, b.ln_q, "ln q");
    assert_eq!(a.u_over_kt, b.u_over_kt, "U/kT");
    assert_eq!(a.cv_over_k, b.cv_over_k, "Cv/k");
    assert_eq!(a.s_over_k, b.s_over_k, "S/k");
    assert!(
        a.certified && b.certified,
        "certified: {} {} ({:?} {:?})",
        a.certified,
        b.certified,
        a,
        b
    );
}

#[test]
fn harmonic_oscillator_matches_its_closed_form_and_the_direct_sum() {
    // q = 1/(1 − e^{−x}), U/kT = x/(e^x − 1), Cv/k = x² e^x/(e^x − 1)²
    // (standard closed forms), x = θ/T; compared in f64 at 1e-13 relative
    // (f64 evaluation of the closed form limits the tolerance).
    let ho = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin).unwrap();
    for t in ["0.05", "0.3", "1", "2", "7.5", "40", "1000"] {
        let p = ThermoPoint::of(&thermo(&ho, &kelvin(t), 25).unwrap());
        let x = 1.0 / f(t);
        let q = 1.0 / (1.0 - (-x).exp());
        let u = x / x.exp_m1();
        let cv = x * x * x.exp() / (x.exp_m1() * x.exp_m1());
        assert!((f(&p.q) / q - 1.0).abs() < 1e-13, "q at {t}");
        assert!((f(&p.u_over_kt) / u - 1.0).abs() < 1e-12, "U at {t}");
        assert!((f(&p.cv_over_k) / cv - 1.0).abs() < 1e-12, "Cv at {t}");
        // The geometric-series path and the plain direct sum agree on every
        // printed digit.
        if f(t) <= 40.0 {
            let d = ThermoPoint::of(&thermo_with(&ho, &kelvin(t), 25, Path::Direct).unwrap());
            same_digits(&p, &d);
        }
    }
}

#[test]
fn rigid_rotor_matches_mulholland_at_high_temperature() {
    // Mulholland (1928): q = T/θ + 1/3 + θ/(15T) + 4/315 (θ/T)² + 1/315 (θ/T)³
    // + ... (from memory); the next term is of order (θ/T)⁴.
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    for (t, tol) in [("100", 1e-9), ("1000", 1e-13), ("10000", 1e-15)] {
        let p = ThermoPoint::of(&thermo(&rot, &kelvin(t), 30).unwrap());
        let y = 1.0 / f(t);
        let m = 1.0 / y + 1.0 / 3.0 + y / 15.0 + 4.0 / 315.0 * y * y + y * y * y / 315.0;
        assert!((f(&p.q) / m - 1.0).abs() < tol, "T/θ = {t}: {} vs {m}", p.q);
    }
}

#[test]
fn rotor_recurrence_matches_the_direct_sum() {
    // The rigid-ladder recurrence against the plain sum over listed levels,
    // with and without nuclear-spin weights, from T/θ = 0.05 to 3000.
    use zsum::models::diatomic::ParityWeights;
    for w in [
        ParityWeights::uniform(),
        ParityWeights::from_nuclear_spin(1, false),
        ParityWeights::from_nuclear_spin(0, true),
    ] {
        let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin)
            .unwrap()
            .with_weights(w);
        for t in ["0.05", "0.7", "3", "40", "3000"] {
            let a = ThermoPoint::of(&thermo(&rot, &kelvin(t), 30).unwrap());
            let d = ThermoPoint::of(&thermo_with(&rot, &kelvin(t), 30, Path::Direct).unwrap());
            same_digits(&a, &d);
        }
    }
}

#[test]
fn box_theta_path_matches_the_direct_sum() {
    // The 1D box through Jacobi's imaginary transformation against the plain
    // sum over n, for a = θ/T from 1e-4 to 10: every digit must agree.
    let seg = ParticleInBox::cube(1).unwrap();
    for kt in [
        "10000", "1000", "100", "10", "2", "1", "0.999", "0.5", "0.1",
    ] {
        let t = Temperature::ThermalEnergy(r(kt));
        let a = ThermoPoint::of(&thermo(&seg, &t, 30).unwrap());
        let d = ThermoPoint::of(&thermo_with(&seg, &t, 30, Path::Direct).unwrap());
        same_digits(&a, &d);
    }
    // 2D and 3D boxes are products of axes; the direct lattice sum agrees.
    let sq = ParticleInBox::new(vec![r("1"), r("3/2")]).unwrap();
    let t = Temperature::ThermalEnergy(r("40"));
    same_digits(
        &ThermoPoint::of(&thermo(&sq, &t, 20).unwrap()),
        &ThermoPoint::of(&thermo_with(&sq, &t, 20, Path::Direct).unwrap()),
    );
}

#[test]
fn asking_for_more_digits_extends_the_same_digits() {
    // Precision semantics: the 30-digit value is the 60-digit value rounded.
    let rot = LinearRotor::rigid(r("1.99824"), EnergyUnit::Wavenumber).unwrap();
    let cube = ParticleInBox::cube(3).unwrap();
    let cases: Vec<(&dyn Spectrum, Temperature)> = vec![
        (&rot, kelvin("298.15")),
        (&rot, kelvin("3.7")),
        (&cube, Temperature::ThermalEnergy(r("1e16"))),
        (&cube, Temperature::ThermalEnergy(r("2.5"))),
    ];
    for (s, t) in cases {
        let p30 = ThermoPoint::of(&thermo(s, &t, 30).unwrap());
        let p60 = ThermoPoint::of(&thermo(s, &t, 60).unwrap());
        for (a, b) in [
            (&p30.q, &p60.q),
            (&p30.ln_q, &p60.ln_q),
            (&p30.cv_over_k, &p60.cv_over_k),
        ] {
            let rounded = zsum::exact::format_sig(&r(b), 30);
            assert_eq!(a, &rounded, "{}", s.describe());
        }
    }
}

#[test]
fn extreme_temperatures_behave() {
    // T → 0: q → ground degeneracy, Cv → 0, no underflow to nonsense.
    let o2 = LinearRotor::rigid(r("2"), EnergyUnit::Kelvin)
        .unwrap()
        .with_weights(zsum::models::diatomic::ParityWeights::from_nuclear_spin(
            0, true,
        ));
    let p = ThermoPoint::of(&thermo(&o2, &kelvin("1e-6"), 20).unwrap());
    // Only odd N: the ground level is N = 1 with 3 states (E = 4 K).
    assert_eq!(
        p.q.parse::<f64>().unwrap(),
        0.0,
        "q is e^(-4e6) times 3, far below f64"
    );
    assert_eq!(p.u_over_kt, zsum::exact::format_sig(&r("4e6"), 20));
    // S/k → ln 3 (three ground states), compared with f64's ln 3.
    assert!(
        (f(&p.s_over_k) - 3f64.ln()).abs() < 1e-15,
        "S/k = {}",
        p.s_over_k
    );
    let ho = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin).unwrap();
    let p = ThermoPoint::of(&thermo(&ho, &kelvin("0.001"), 20).unwrap());
    assert_eq!(p.q, "1.0000000000000000000");
    assert!(f(&p.cv_over_k) < 1e-400_f64.max(1e-300));
    // High T: the classical values (equipartition): rotor 1, oscillator 1,
    // 3D box 3/2 (common practice).
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    assert!(
        (f(&ThermoPoint::of(&thermo(&rot, &kelvin("1e6"), 20).unwrap()).cv_over_k) - 1.0).abs()
            < 1e-12
    );
    assert!(
        (f(&ThermoPoint::of(&thermo(&ho, &kelvin("1e6"), 20).unwrap()).cv_over_k) - 1.0).abs()
            < 1e-11
    );
    let cube = ParticleInBox::cube(3).unwrap();
    let p = ThermoPoint::of(&thermo(&cube, &Temperature::ThermalEnergy(r("1e16")), 20).unwrap());
    assert!((f(&p.cv_over_k) - 1.5).abs() < 1e-8);
}

/// A spectrum that claims no counting growth and no top: cannot be bounded.
struct Unbounded;

impl Spectrum for Unbounded {
    fn describe(&self) -> String {
        "unbounded test spectrum".into()
    }
    fn unit(&self) -> EnergyUnit {
        EnergyUnit::Kelvin
    }
    fn quantum_numbers(&self) -> Vec<String> {
        vec!["n".into()]
    }
    fn ground_energy(&self) -> BigRational {
        r("0")
    }
    fn levels_within(&self, cutoff: &BigRational, _: &Budget) -> zsum::Result<LevelList> {
        let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin)?;
        rot.levels_up_to(cutoff)
    }
    fn states_at(&self, _: &BigRational) -> zsum::Result<Vec<State>> {
        Ok(vec![])
    }
    fn count_bound(&self, _: &BigRational) -> num_bigint::BigUint {
        0u32.into()
    }
}

#[test]
fn bad_requests_are_refused() {
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    for t in ["0", "-5"] {
        let e = thermo(&rot, &kelvin(t), 10).unwrap_err().to_string();
        assert!(e.contains("greater than zero"), "{e}");
    }
    assert!(thermo(&rot, &kelvin("10"), 0)
        .unwrap_err()
        .to_string()
        .contains("digits"));
    assert!(thermo(&rot, &kelvin("10"), 5000)
        .unwrap_err()
        .to_string()
        .contains("1000"));
    let e = thermo(&Unbounded, &kelvin("10"), 10)
        .unwrap_err()
        .to_string();
    assert!(e.contains("cannot be bounded"), "{e}");
    // A box without mass and side has no kelvin scale.
    let e = thermo(&ParticleInBox::cube(3).unwrap(), &kelvin("10"), 10)
        .unwrap_err()
        .to_string();
    assert!(e.contains("mass and side"), "{e}");
}

fn entropy_from_populations(s: &dyn Spectrum, t: f64) -> f64 {
    // S/k = −Σ p ln p over states (a separate formula), in f64.
    let cut = s.ground_energy() + BigRational::from_float(60.0 * t).unwrap();
    let l = s.levels_up_to(&cut).unwrap();
    let e0 = num_traits::ToPrimitive::to_f64(&s.ground_energy()).unwrap();
    let ws: Vec<(f64, f64)> = l
        .iter()
        .map(|lv| {
            let x = (num_traits::ToPrimitive::to_f64(&lv.energy).unwrap() - e0) / t;
            (
                num_traits::ToPrimitive::to_f64(&lv.degeneracy).unwrap(),
                (-x).exp(),
            )
        })
        .collect();
    let z: f64 = ws.iter().map(|(g, w)| g * w).sum();
    -ws.iter()
        .map(|(g, w)| {
            let p = w / z;
            if p > 0.0 {
                g * p * p.ln()
            } else {
                0.0
            }
        })
        .sum::<f64>()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    #[test]
    fn thermodynamic_invariants(b in 1i64..50, t1 in 1i64..200, dt in 1i64..200) {
        let rot = LinearRotor::rigid(BigRational::from_integer(b.into()), EnergyUnit::Kelvin).unwrap();
        let (ta, tb) = (t1.to_string(), (t1 + dt).to_string());
        let pa = ThermoPoint::of(&thermo(&rot, &kelvin(&ta), 16).unwrap());
        let pb = ThermoPoint::of(&thermo(&rot, &kelvin(&tb), 16).unwrap());
        // q increases with T; Cv ≥ 0.
        prop_assert!(f(&pb.q) > f(&pa.q));
        prop_assert!(f(&pa.cv_over_k) >= 0.0);
        // S from ln q + U/kT equals −Σ p ln p (in f64: relative 1e-10, or
        // 1e-15 absolute where p ln p of a near-certain ground state loses
        // digits in f64).
        let s_pop = entropy_from_populations(&rot, t1 as f64);
        prop_assert!((f(&pa.s_over_k) - s_pop).abs() <= 1e-10 * s_pop + 1e-15,
            "{} vs {}", pa.s_over_k, s_pop);
    }

    #[test]
    fn independent_parts_add(b in 1i64..20, w in 1i64..40, t in 1i64..100) {
        let rot = LinearRotor::rigid(BigRational::from_integer(b.into()), EnergyUnit::Kelvin).unwrap();
        let ho = HarmonicModes::one_d(BigRational::from_integer(w.into()), true, EnergyUnit::Kelvin).unwrap();
        let temp = kelvin(&t.to_string());
        let pr = ThermoPoint::of(&thermo(&rot, &temp, 20).unwrap());
        let ph = ThermoPoint::of(&thermo(&ho, &temp, 20).unwrap());
        let prod = Product::new(vec![
            Part { name: "r".into(), spectrum: Box::new(rot) },
            Part { name: "v".into(), spectrum: Box::new(ho) },
        ], None).unwrap();
        let pp = ThermoPoint::of(&thermo(&prod, &temp, 20).unwrap());
        let pd = ThermoPoint::of(&thermo_with(&prod, &temp, 20, Path::Direct).unwrap());
        // The part-by-part path and the direct sum over the product agree.
        same_digits(&pp, &pd);
        for (a, b, c) in [
            (&pp.ln_q, &pr.ln_q, &ph.ln_q),
            (&pp.u_over_kt, &pr.u_over_kt, &ph.u_over_kt),
            (&pp.cv_over_k, &pr.cv_over_k, &ph.cv_over_k),
            (&pp.s_over_k, &pr.s_over_k, &ph.s_over_k),
        ] {
            // Exact decimals: each printed value is within half a unit of
            // its 20th digit, so the sum agrees within 1e-19 of |b| + |c|.
            let (a, b, c) = (r(a), r(b), r(c));
            let gap = num_traits::Signed::abs(&(&a - (&b + &c)));
            let scale = num_traits::Signed::abs(&b) + num_traits::Signed::abs(&c);
            prop_assert!(gap <= scale * r("1e-19"), "{a} vs {b} + {c}");
        }
    }
}

#[test]
fn sweeps_reuse_levels_without_changing_a_digit() {
    // A grid evaluated with the level cache (hottest first) gives the same
    // digits as each temperature alone.
    use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
    use zsum::models::oscillator::AnharmonicOscillator;
    use zsum::report::ThermoReport;
    use zsum::thermo::parse_grid;
    let vib = AnharmonicOscillator::new(r("2358.57"), r("14.324"), r("0"), EnergyUnit::Wavenumber)
        .unwrap();
    let m = RovibDiatomic::new(
        vib,
        r("1.99824"),
        r("0.017318"),
        r("5.76e-6"),
        ParityWeights::from_nuclear_spin(2, false),
    )
    .unwrap();
    let grid = parse_grid("--T", "50:1250:400").unwrap();
    let rep = ThermoReport::build(
        "diatomic",
        &m,
        &grid,
        true,
        12,
        zsum::sum::DEFAULT_MAX_BITS,
        None,
        true,
        &zsum::budget::Meter::unlimited(),
    )
    .unwrap();
    assert_eq!(rep.rows.len(), 4);
    for (row, t) in rep.rows.iter().zip(&grid) {
        let alone = ThermoPoint::of(&thermo(&m, &Temperature::Kelvin(t.clone()), 16).unwrap());
        assert_eq!(row.point.t, zsum::exact::exact_decimal(t, 40));
        assert_eq!(row.point.q, zsum::exact::format_sig(&r(&alone.q), 12));
        assert_eq!(
            row.point.cv_over_k,
            zsum::exact::format_sig(&r(&alone.cv_over_k), 12)
        );
    }
}

/// A vibrating rotor with constants in cm⁻¹ and nuclear-spin weights
/// `[even, odd]`.
fn rovib(
    we: &str,
    wexe: &str,
    be: &str,
    alpha: &str,
    d: &str,
    w: [u32; 2],
) -> zsum::models::diatomic::RovibDiatomic {
    use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
    use zsum::models::oscillator::AnharmonicOscillator;
    let vib = AnharmonicOscillator::new(r(we), r(wexe), r("0"), EnergyUnit::Wavenumber).unwrap();
    let weights = ParityWeights::new(w[0].into(), w[1].into()).unwrap();
    RovibDiatomic::new(vib, r(be), r(alpha), r(d), weights).unwrap()
}

#[test]
fn rovib_ladder_recurrence_matches_the_direct_sum() {
    // The recurrence along each J ladder against the plain sum over listed
    // levels, digit for digit, from the ground-dominated cold end (T/θ_rot
    // = 0.001: ln q below 1e-800) to far past dissociation (every bound level
    // summed), for N2-like constants (Huber-Herzberg 1979, from memory)
    // with both spin isomers apart and together, an H2-like rotor (large B
    // and D) and a heavy I2-like one (many rungs), without D (a quadratic
    // ladder) and with integers beyond 64 bits.
    let n2 = |w| rovib("2358.57", "14.324", "1.99824", "0.017318", "5.76e-6", w);
    let cases = [
        (n2([6, 3]), 2.875),
        (n2([0, 3]), 2.875),
        (n2([6, 0]), 2.875),
        (
            rovib("4401.21", "121.34", "60.853", "3.062", "0.0471", [1, 3]),
            87.55,
        ),
        (
            rovib("214.5", "0.614", "0.03737", "0.000114", "4.2e-9", [1, 1]),
            0.05377,
        ),
        (rovib("1000", "5", "1", "0.01", "0", [1, 1]), 1.4388),
        // A denominator of 10^30: the ladder integers leave i64 and the
        // engine falls back to the level-by-level sum.
        (
            rovib(
                "2358.57",
                "14.324",
                "1.998240000000000000000000000001",
                "0.017318",
                "5.76e-6",
                [1, 1],
            ),
            2.875,
        ),
    ];
    for (m, theta_rot) in &cases {
        for ratio in [0.001, 0.05, 0.7, 3.0, 40.0, 1e3, 1e6] {
            let t = Temperature::Kelvin(BigRational::from_float(theta_rot * ratio).unwrap());
            let a = ThermoPoint::of(&thermo(m, &t, 25).unwrap());
            let d = ThermoPoint::of(&thermo_with(m, &t, 25, Path::Direct).unwrap());
            same_digits(&a, &d);
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    /// Random vibrating rotors and temperatures: the ladder recurrence and
    /// the direct sum print the same 18 digits.
    #[test]
    fn rovib_recurrence_agrees_for_random_constants(
        we in 200u32..4000, wexe_milli in 1000u32..60000, be_milli in 30u32..60000,
        alpha_frac in 0u32..100, d_exp in 4u32..9, even in 0u32..3, odd in 1u32..4,
        t_exp in -2.0f64..4.0,
    ) {
        let wexe = wexe_milli as f64 / 1000.0;
        let be = be_milli as f64 / 1000.0;
        // alpha_e below B_e/(v_max + 1/2), v_max ≈ we/(2 wexe).
        let vmax = we as f64 / (2.0 * wexe) + 1.0;
        let alpha = be / (vmax + 0.5) * alpha_frac as f64 / 200.0;
        let s = |x: f64| format!("{x:.6}");
        let vib = zsum::models::oscillator::AnharmonicOscillator::new(
            r(&we.to_string()), r(&s(wexe)), r("0"), EnergyUnit::Wavenumber).unwrap();
        let weights = zsum::models::diatomic::ParityWeights::new(even.into(), odd.into()).unwrap();
        let d = format!("{}e-{d_exp}", 1 + be_milli % 7);
        let Ok(m) = zsum::models::diatomic::RovibDiatomic::new(vib, r(&s(be)), r(&s(alpha)), r(&d), weights) else {
            return Ok(());
        };
        let t = Temperature::Kelvin(BigRational::from_float(1.4388 * be * 10f64.powf(t_exp)).unwrap());
        let a = ThermoPoint::of(&thermo(&m, &t, 18).unwrap());
        let b = ThermoPoint::of(&thermo_with(&m, &t, 18, Path::Direct).unwrap());
        prop_assert_eq!(&a.q, &b.q);
        prop_assert_eq!(&a.u_over_kt, &b.u_over_kt);
        prop_assert_eq!(&a.cv_over_k, &b.cv_over_k);
        prop_assert_eq!(&a.s_over_k, &b.s_over_k);
    }
}

#[test]
fn cached_rovib_ladders_are_the_models_own() {
    for w in [[1, 1], [0, 3], [6, 0]] {
        let m = rovib("2358.57", "14.324", "1.99824", "0.017318", "5.76e-6", w);
        let above = [
            "0", "3.9", "124.3", "500", "900", "2000", "9000", "40000", "1e6",
        ];
        assert_eq!(common::cached_ladders_match(&m, &above), 18);
    }
}

#[test]
fn rovib_ladders_hold_exactly_the_listed_states() {
    // The engine sums the ladders in place of the level list: both must
    // hold the same states at the same exact energies, for every cutoff.
    use std::collections::BTreeMap;
    for w in [[1, 1], [0, 3], [6, 0]] {
        let m = rovib("2358.57", "14.324", "1.99824", "0.017318", "5.76e-6", w);
        for above in ["0", "3.9", "124.3", "9000", "40000", "1e6"] {
            let cut = m.ground_energy() + r(above);
            let mut from_ladders: BTreeMap<BigRational, num_bigint::BigUint> = BTreeMap::new();
            for l in m.poly_ladders(&cut, &Budget::default()).unwrap().unwrap() {
                for j in l.first..=l.last {
                    let g = l.degeneracy(j);
                    if g != num_bigint::BigUint::from(0u32) {
                        *from_ladders.entry(l.energy(j)).or_default() += g;
                    }
                }
            }
            let listed: BTreeMap<BigRational, num_bigint::BigUint> = m
                .levels_up_to(&cut)
                .unwrap()
                .iter()
                .map(|l| (l.energy.clone(), l.degeneracy.clone()))
                .collect();
            assert_eq!(from_ladders, listed, "weights {w:?}, cutoff {cut}");
        }
    }
}
