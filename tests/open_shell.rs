//! Open-shell diatomic rotors (`zsum::models::open_shell`): the ²Π doublet
//! in Hund's case (a) and intermediate coupling, and the ³Σ⁻ triplet.
//! Checked against an independent numerical diagonalisation in mpmath
//! (`tests/crosscheck/open_shell_oracle.py`, levels and partition sums),
//! exact limits (J = ½, large |A|, λ = γ = 0 against the plain rotor,
//! Schlapp's first-order formulas), oxygen's two lowest fine-structure
//! lines (from memory), the classical limits, the extremes of temperature,
//! refusals, and a product with a vibration.

mod common;

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use rug::Float;
use zsum::error::ErrorKind;
use zsum::exact::parse_rational;
use zsum::level::Enclosure;
use zsum::models::diatomic::ParityWeights;
use zsum::models::open_shell::{Coupling, NParity, PiDoublet, SigmaTriplet};
use zsum::models::oscillator::HarmonicModes;
use zsum::models::product::{Part, Product};
use zsum::models::rotor::LinearRotor;
use zsum::spectrum::{Budget, Spectrum};
use zsum::sum::{thermo, thermo_with, Path as SumPath, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

const CM: EnergyUnit = EnergyUnit::Wavenumber;

/// Nitric oxide X²Π, cm⁻¹ (from memory): A = 123.16, B = 1.6961,
/// D = 5.4e-6 (regular: A > 0).
const NO: [&str; 3] = ["123.16", "1.6961", "0.0000054"];
/// Hydroxyl X²Π, cm⁻¹ (from memory): A = −139.05, B = 18.535,
/// D = 0.0019 (inverted: A < 0).
const OH: [&str; 3] = ["-139.05", "18.535", "0.0019"];
/// Oxygen X³Σg⁻, cm⁻¹ (from memory): B = 1.4377, λ = 1.9848,
/// γ = −0.0084.
const O2: [&str; 3] = ["1.4377", "1.9848", "-0.0084"];

fn pi(coupling: Coupling, c: [&str; 3], with_d: bool) -> PiDoublet {
    let d = if with_d { r(c[2]) } else { BigRational::zero() };
    PiDoublet::new(coupling, r(c[0]), r(c[1]), d, CM).unwrap()
}

fn o2(parity: NParity) -> SigmaTriplet {
    SigmaTriplet::new(r(O2[0]), r(O2[1]), r(O2[2]), parity, CM).unwrap()
}

fn mid(e: &Enclosure) -> f64 {
    ((&e.lo + &e.hi) / BigRational::from_integer(2.into()))
        .to_f64()
        .unwrap()
}

#[test]
fn every_model_passes_the_generic_checks() {
    for coupling in [Coupling::CaseA, Coupling::Intermediate] {
        for with_d in [false, true] {
            common::check_spectrum(&pi(coupling, NO, with_d), &r("600"), 12);
            common::check_spectrum(&pi(coupling, OH, with_d), &r("3000"), 12);
        }
    }
    common::check_spectrum(&o2(NParity::OddOnly), &r("300"), 12);
    common::check_spectrum(&o2(NParity::All), &r("300"), 12);
    // Labels and terms name each level.
    let no = pi(Coupling::Intermediate, NO, false);
    let levels = no.levels_up_to(&r("10")).unwrap();
    assert_eq!(no.labels_at(&levels.levels()[1].energy), ["F1 J=3/2"]);
    let terms = no.terms_within(&r("10"), &Budget::default()).unwrap();
    assert_eq!(terms[1].1, [1, 3]); // F1, 2J = 3
    let oxygen = o2(NParity::OddOnly);
    let l = oxygen.levels_up_to(&r("3")).unwrap();
    assert_eq!(oxygen.labels_at(&l.levels()[1].energy), ["F1 N=1 J=2"]);
}

/// Runs the oracle on `doc` and returns its output lines, or `None` when
/// mpmath is missing (the test then says it skipped).
fn oracle(test: &str, doc: &str) -> Option<Vec<String>> {
    if !common::mpmath_available(test) {
        return None;
    }
    let child = common::spawn_oracle("open_shell_oracle.py", doc);
    let out = child.wait_with_output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let lines: Vec<String> = String::from_utf8_lossy(&out.stdout)
        .lines()
        .map(String::from)
        .collect();
    assert!(lines.last().is_some_and(|l| l.starts_with("DONE")));
    Some(lines)
}

/// Whether the oracle's value `v` (50 digits, trusted to 1e-45 relative)
/// lies in the enclosure `e`, and `e` is narrower than 1e-35.
fn inside(e: &Enclosure, v: &str) -> bool {
    let v = r(v);
    let slack = v.abs().max(BigRational::one()) * r("1e-45");
    &e.hi - &e.lo < r("1e-35") && e.lo <= &v + &slack && &v - &slack <= e.hi
}

#[test]
fn every_level_agrees_with_an_mpmath_diagonalisation_up_to_j_50() {
    // tests/crosscheck/open_shell_oracle.py diagonalises each J's matrix
    // (2×2 for ²Π, the full 3×3 case (a) matrix for ³Σ) with mp.eigsy at
    // 60 digits; every eigenvalue, in ascending order, must lie in zsum's
    // enclosure of the level it belongs to (F1 then F2; F1, F2, F3).
    let twice_j: Vec<u64> = (1..=101).step_by(2).collect();
    let js: Vec<u64> = (0..=50).collect();
    let doc = format!(
        r#"{{"pi":[{{"name":"NO","A":"{}","B":"{}","D":"{}","twice_j":{tj:?}}},
                   {{"name":"OH","A":"{}","B":"{}","D":"{}","twice_j":{tj:?}}}],
            "sigma":[{{"name":"O2","B":"{}","lambda":"{}","gamma":"{}","j":{js:?}}}]}}"#,
        NO[0],
        NO[1],
        NO[2],
        OH[0],
        OH[1],
        OH[2],
        O2[0],
        O2[1],
        O2[2],
        tj = twice_j
    );
    let Some(lines) = oracle(
        "every_level_agrees_with_an_mpmath_diagonalisation_up_to_j_50",
        &doc,
    ) else {
        return;
    };
    let no = pi(Coupling::Intermediate, NO, true);
    let oh = pi(Coupling::Intermediate, OH, true);
    let oxygen = o2(NParity::All);
    let mut checked = 0;
    for line in &lines {
        let f: Vec<&str> = line.split_whitespace().collect();
        match f[0] {
            "PI" => {
                let m = if f[1] == "NO" { &no } else { &oh };
                let tj: u64 = f[2].parse().unwrap();
                let ladders: Vec<usize> =
                    (0..2).filter(|&l| m.term(l, tj, 160).is_some()).collect();
                assert_eq!(ladders.len(), f.len() - 3, "{line}");
                for (v, l) in f[3..].iter().zip(ladders) {
                    let e = m.term(l, tj, 160).unwrap();
                    assert!(inside(&e, v), "{line}: ladder {l} gives {e:?}");
                    checked += 1;
                }
            }
            "SIGMA" => {
                let j: u64 = f[2].parse().unwrap();
                let comps: Vec<u8> = (1..=3)
                    .filter(|&c| oxygen.term(c, j, 160).is_some())
                    .collect();
                assert_eq!(comps.len(), f.len() - 3, "{line}");
                for (v, c) in f[3..].iter().zip(comps) {
                    let e = oxygen.term(c, j, 160).unwrap();
                    assert!(inside(&e, v), "{line}: F{c} gives {e:?}");
                    checked += 1;
                }
            }
            _ => {}
        }
    }
    // NO and OH: 1 + 2·50 levels each; O2: 1 + 3·50.
    assert_eq!(checked, 2 * 101 + 151);
}

/// Whether zsum's certified value holds the oracle's (45 digits) and its
/// `digits` printed digits are the oracle's correctly rounded.
fn agrees(c: &zsum::sum::Certified, oracle: &str, digits: u32) -> bool {
    let v = Float::with_val(300, Float::parse(oracle).unwrap());
    let (lo, hi) = c.interval();
    let slack = Float::with_val(300, v.clone().abs() * 1e-43f64);
    let held = lo <= Float::with_val(300, &v + &slack) && Float::with_val(300, &v - &slack) <= hi;
    let Some(text) = c.decimal(digits) else {
        return false;
    };
    let printed = Float::with_val(300, Float::parse(&text).unwrap());
    // Correctly rounded: within half a unit of the last printed digit.
    let exp = v.clone().abs().log10().floor().to_f64() as i32;
    let half_ulp = Float::with_val(300, 10f64.powi(exp - digits as i32 + 1)) / 2u32;
    let off = Float::with_val(300, &printed - &v).abs();
    held && off <= half_ulp * Float::with_val(300, 1.000001f64)
}

#[test]
fn partition_sums_agree_with_mpmath_to_20_digits() {
    // The oracle sums g e^{−(E − E0)/kT} over its own eigenvalues (every J
    // until the levels lie 200 kT above the lowest) at 60 digits; zsum's
    // ln q, U/kT and Cv/k, certified to 20 digits, must hold its values
    // and print them correctly rounded. NO carries its D (the turnover near
    // J = 400 lies far beyond 1000 K's reach); OH is rigid here, since its
    // D turns the ladders over near J = 70, within the oracle's window.
    let temps = ["10", "100", "298.15", "1000"];
    let doc = format!(
        r#"{{"q":[{{"name":"NO","kind":"pi","A":"{}","B":"{}","D":"{}","kelvin":{t:?}}},
                 {{"name":"OH","kind":"pi","A":"{}","B":"{}","D":"0","kelvin":{t:?}}},
                 {{"name":"O2","kind":"sigma","B":"{}","lambda":"{}","gamma":"{}","kelvin":{t:?}}}]}}"#,
        NO[0],
        NO[1],
        NO[2],
        OH[0],
        OH[1],
        O2[0],
        O2[1],
        O2[2],
        t = temps
    );
    let Some(lines) = oracle("partition_sums_agree_with_mpmath_to_20_digits", &doc) else {
        return;
    };
    let no = pi(Coupling::Intermediate, NO, true);
    let oh = pi(Coupling::Intermediate, OH, false);
    let oxygen = o2(NParity::All);
    let mut checked = 0;
    for line in lines.iter().filter(|l| l.starts_with("Q ")) {
        let f: Vec<&str> = line.split_whitespace().collect();
        let s: &dyn Spectrum = match f[1] {
            "NO" => &no,
            "OH" => &oh,
            _ => &oxygen,
        };
        let p = thermo(s, &Temperature::Kelvin(r(f[2])), 20).unwrap();
        assert!(p.certified, "{line}");
        for (c, v) in [&p.ln_q, &p.u_over_kt, &p.cv_over_k]
            .into_iter()
            .zip(&f[3..6])
        {
            assert!(
                agrees(c, v, 20),
                "{line}: zsum {:?} [{:?}]",
                c.decimal(20),
                c.interval()
            );
        }
        checked += 1;
    }
    assert_eq!(checked, 12);
}

#[test]
fn j_one_half_is_exact_and_the_ground_follows_the_sign_of_a() {
    for c in [NO, OH] {
        let m = pi(Coupling::Intermediate, c, true);
        let (a, b) = (r(c[0]), r(c[1]));
        let exact = &b - &a / BigRational::from_integer(2.into());
        // J = ½ belongs to F1 when A ≥ 2B (NO), to F2 otherwise (OH).
        let ladder = usize::from(a < &b * BigRational::from_integer(2.into()));
        let e = m.term(ladder, 1, 128).unwrap();
        assert_eq!((e.lo.clone(), e.hi.clone()), (exact.clone(), exact.clone()));
        assert!(m.term(1 - ladder, 1, 128).is_none());
    }
    // NO: the lowest level is J = ½ itself, exactly B − A/2.
    let no = pi(Coupling::Intermediate, NO, true);
    assert_eq!(no.lowest_term(64).lo, r("1.6961") - r("61.58"));
    assert_eq!(no.lowest_term(64).lo, no.lowest_term(64).hi);
    // OH: the lowest level is F1 J = 3/2, irrational: the origin is an
    // enclosure, and J = ½ is listed as an enclosed excitation.
    let oh = pi(Coupling::Intermediate, OH, true);
    let g = oh.lowest_term(128);
    assert!(g.lo < g.hi && &g.hi - &g.lo < r("1e-35"));
    assert_eq!(g, oh.term(0, 3, 128).unwrap());
    let half = r("18.535") + r("69.525");
    let listed = oh.levels_up_to(&r("130")).unwrap();
    let lvl = listed
        .iter()
        .find(|l| oh.labels_at(&l.energy) == ["F2 J=1/2"])
        .unwrap();
    let enc = lvl.enclosure.as_ref().unwrap();
    assert!(enc.lo <= &half - &g.lo && &half - &g.hi <= enc.hi);
    // Case (a) is exact everywhere: J = ½ of Ω = ½ at −A/2 + B/2.
    let a = pi(Coupling::CaseA, NO, false);
    assert!(a.levels_up_to(&r("1000")).unwrap().is_exact());
    assert_eq!(a.lowest_term(64).lo, r("0.84805") - r("61.58"));
}

#[test]
fn intermediate_coupling_tends_to_case_a_as_a_grows() {
    // Each J's block is [[−A/2 + Bx², −B√(x²−1)], [., A/2 + B(x² − 2)]]
    // (x = J + ½); its diagonal is case (a)'s E(Ω, J) + B/2, and an
    // eigenvalue of a 2×2 block differs from its diagonal element by at
    // most c²/|Δ| with c² = B²(x² − 1) and Δ = A − 2B (derived here). So
    // |F − (E_a + B/2)| ≤ B²(x² − 1)/|A − 2B|, certified for J ≤ 20, with
    // F1 ↔ Ω = ½ for A > 2B and F1 ↔ Ω = 3/2 for A < 2B.
    let b = r("1");
    for a in ["1000", "-1000", "100", "-100"] {
        let a = r(a);
        let int = PiDoublet::new(Coupling::Intermediate, a.clone(), b.clone(), r("0"), CM).unwrap();
        let case_a = PiDoublet::new(Coupling::CaseA, a.clone(), b.clone(), r("0"), CM).unwrap();
        let regular = a.is_positive();
        let gap = (&a - &b * BigRational::from_integer(2.into())).abs();
        for tj in (1..=41u64).step_by(2) {
            let x = BigRational::from_integer(BigInt::from(tj.div_ceil(2)));
            let bound = &b * &b * (&x * &x - BigRational::one()) / &gap;
            for omega_ladder in 0..2 {
                let Some(ea) = case_a.term(omega_ladder, tj, 64) else {
                    continue;
                };
                let f_ladder = if regular {
                    omega_ladder
                } else {
                    1 - omega_ladder
                };
                let f = int.term(f_ladder, tj, 128).unwrap();
                let target = &ea.lo + &b / BigRational::from_integer(2.into());
                assert!(
                    f.lo >= &target - &bound && f.hi <= &target + &bound,
                    "A = {a}, 2J = {tj}, ladder {omega_ladder}"
                );
            }
        }
        // Listed from their own lowest levels, both couplings give the
        // same levels to within twice the bound at J ≤ 11/2 (the ground's
        // bound adds to the level's).
        let cut = r("40");
        let li = int.levels_up_to(&cut).unwrap();
        let la = case_a.levels_up_to(&cut).unwrap();
        assert_eq!(li.len(), la.len(), "A = {a}");
        let tol = &b * &b * r("35") / &gap * BigRational::from_integer(2.into());
        for (x, y) in li.iter().zip(la.iter()) {
            assert_eq!(x.degeneracy, y.degeneracy);
            assert!((&x.energy - &y.energy).abs() <= tol, "A = {a}");
        }
    }
}

#[test]
fn the_two_ladders_are_split_by_a_minus_2b_at_j_three_halves() {
    // At J = 3/2 (x = 2): F2 − F1 = √((A − 2B)² + 12B²), from the closed
    // form; so 0 ≤ (F2 − F1) − |A − 2B| ≤ 6B²/|A − 2B| (√(a² + e) ≤ a +
    // e/(2a)). Certified on the enclosures, squared exactly.
    for c in [NO, OH] {
        let m = pi(Coupling::Intermediate, c, false);
        let (a, b) = (r(c[0]), r(c[1]));
        let f1 = m.term(0, 3, 160).unwrap();
        let f2 = m.term(1, 3, 160).unwrap();
        let (lo, hi) = (&f2.lo - &f1.hi, &f2.hi - &f1.lo);
        let two = BigRational::from_integer(2.into());
        let d = (&a - &b * &two).abs();
        let exact_sq = &d * &d + &b * &b * BigRational::from_integer(12.into());
        assert!(&lo * &lo <= exact_sq && exact_sq <= &hi * &hi);
        assert!(lo >= d && hi <= &d + &b * &b * BigRational::from_integer(6.into()) / &d);
        // NO (regular): Ω = 3/2 above by about A − 2B = 119.77; OH
        // (inverted): Ω = ½ above by about |A| + 2B = 176.12.
        println!("gap at J = 3/2: {:.6}", mid(&Enclosure { lo, hi }));
    }
}

#[test]
fn without_lambda_and_gamma_the_triplet_is_three_plain_rotors() {
    // λ = γ = 0: F1, F2, F3 of N coincide at B N(N+1) (the roots are
    // rational, (2J+1)B), so each N holds 3(2N+1) states; the listing
    // equals the linear rotor's with every degeneracy tripled, exactly,
    // measured from the lowest level (2B for odd N only).
    let b = r("1.4377");
    for (parity, weights, shift) in [
        (NParity::All, ParityWeights::uniform(), r("0")),
        (
            NParity::OddOnly,
            ParityWeights::new(0u32.into(), 1u32.into()).unwrap(),
            &b * BigRational::from_integer(2.into()),
        ),
    ] {
        let t = SigmaTriplet::new(b.clone(), r("0"), r("0"), parity, CM).unwrap();
        let rot = LinearRotor::rigid(b.clone(), CM)
            .unwrap()
            .with_weights(weights);
        let cut = r("500");
        let lt = t.levels_up_to(&cut).unwrap();
        let lr = rot
            .levels_up_to(&(&cut + &shift))
            .unwrap()
            .shifted(&-shift.clone());
        assert!(lt.is_exact());
        assert_eq!(lt.len(), lr.len());
        for (x, y) in lt.iter().zip(lr.iter()) {
            assert_eq!(x.energy, y.energy);
            assert_eq!(x.degeneracy, &y.degeneracy * 3u32);
        }
    }
}

#[test]
fn oxygen_reproduces_its_fine_structure_lines_and_schlapps_formulas() {
    // The N = 1 triplet of ¹⁶O₂: J = 1 ← 0 at 118.7503 GHz and J = 1 ← 2
    // at 56.2648 GHz (from memory). The constants are from memory to four
    // or five digits, so 0.1 % is asked.
    let m = o2(NParity::OddOnly);
    let f = |c: u8, j: u64| mid(&m.term(c, j, 128).unwrap());
    let ghz = 29.979_245_8; // GHz per cm⁻¹ (c exactly)
    let j1 = f(2, 1);
    assert!(((j1 - f(3, 0)) * ghz / 118.7503 - 1.0).abs() < 1e-3);
    assert!(((j1 - f(1, 2)) * ghz / 56.2648 - 1.0).abs() < 1e-3);
    // J = 0 (N = 1) is the single row 2B − 2λ − γ, exactly; Schlapp's
    // closed form with its root taken positive would put it at −γ.
    let e0 = m.term(3, 0, 64).unwrap();
    assert_eq!(e0.lo, r("2.8754") - r("3.9696") + r("0.0084"));
    // Schlapp's formulas (from memory): with γ = 0 they are the exact roots
    // (to f64 rounding); at λ = 0 they are the roots' first order in γ, the
    // remainder within γ²(2J+1)²/(4(2B − |γ|)√(J(J+1))) (derived here:
    // |d²√Q/dγ²| ≤ (1 + 4x)/(2√Q) and √Q ≥ |2B − γ|√x, x = J(J+1)); with
    // λ ≠ 0 their γ terms are a first-order guess and differ from the
    // exact roots by a fraction of γ (below |γ|/4 for oxygen; 0.17 |γ| at N = 2).
    let schlapp = |b: f64, l: f64, g: f64, n: u64| {
        let nf = n as f64;
        let s1 = b * nf * (nf + 1.0) + (2.0 * nf + 3.0) * b
            - l
            - ((2.0 * nf + 3.0).powi(2) * b * b + l * l - 2.0 * l * b).sqrt()
            + g * (nf + 1.0);
        let s3 = b * nf * (nf + 1.0) - (2.0 * nf - 1.0) * b - l
            + ((2.0 * nf - 1.0).powi(2) * b * b + l * l - 2.0 * l * b).sqrt()
            - g * nf;
        [s1, s3]
    };
    let b = 1.4377f64;
    for (l, g, tol) in [
        ("1.9848", "0", 0.0),
        ("0", "-0.0084", -1.0),
        ("1.9848", "-0.0084", 0.0021),
    ] {
        let m = SigmaTriplet::new(r(O2[0]), r(l), r(g), NParity::All, CM).unwrap();
        let f = |c: u8, j: u64| mid(&m.term(c, j, 128).unwrap());
        let (lf, gf) = (l.parse::<f64>().unwrap(), g.parse::<f64>().unwrap());
        for n in 2..=30u64 {
            let [s1, s3] = schlapp(b, lf, gf, n);
            for (exact, approx, j) in [(f(1, n + 1), s1, n + 1), (f(3, n - 1), s3, n - 1)] {
                let jf = j as f64;
                let bound = if tol >= 0.0 {
                    tol
                } else {
                    gf * gf * (2.0 * jf + 1.0).powi(2)
                        / (4.0 * (2.0 * b - gf.abs()) * (jf * (jf + 1.0)).sqrt())
                };
                // f64 rounding of values near 10³ adds ~1e-12.
                assert!(
                    (exact - approx).abs() <= bound + 1e-10,
                    "λ = {l}, γ = {g}, N = {n}, J = {j}: {exact} vs {approx}"
                );
            }
        }
    }
    // Odd N only: F2 (N = J) exists for odd J alone.
    for n in 1..=10u64 {
        assert_eq!(m.term(2, n, 64).is_some(), n % 2 == 1);
    }
}

/// q'·B/(c·kT) − 1 at kT = `k_over_b`·B.
fn classical_ratio(s: &dyn Spectrum, b: &str, k_over_b: &str, c: f64) -> f64 {
    let kt = r(k_over_b) * r(b);
    let p = thermo(s, &Temperature::ThermalEnergy(kt), 12).unwrap();
    assert!(p.certified);
    p.ln_q.to_f64().exp() / (c * k_over_b.parse::<f64>().unwrap()) - 1.0
}

#[test]
fn at_high_temperature_q_tends_to_the_classical_limits() {
    // ²Π, derived here: q = Σ 2(2J+1)(e^{−F1/kT} + e^{−F2/kT}) over
    // x = J + ½, with F1,2 ≈ B(x² − 1) ∓ Bx at kT ≫ |A|. Two spin
    // components and two Λ-doubling parities give q → 4kT/B (σ = 1); the
    // first corrections (Euler–Maclaurin, the missing F level at J = ½,
    // the cosh of the splitting) add B/3, and measuring from the lowest
    // level G multiplies by e^{G/kT}: q·B/(4kT) = 1 + (G + B/3)/kT + R,
    // with R second order, within ((|A| + 2B)/kT)².
    for c in [NO, OH] {
        let m = pi(Coupling::Intermediate, c, false);
        let (a, b) = (c[0].parse::<f64>().unwrap(), c[1].parse::<f64>().unwrap());
        let g = mid(&m.lowest_term(64));
        for k in ["1000", "10000", "100000"] {
            let kt = k.parse::<f64>().unwrap() * b;
            let dev = classical_ratio(&m, c[1], k, 4.0);
            let first = (g + b / 3.0) / kt;
            let rem = ((a.abs() + 2.0 * b) / kt).powi(2);
            assert!(
                (dev - first).abs() <= rem,
                "A = {a}, kT/B = {k}: {dev} vs {first}"
            );
        }
    }
    // ³Σ⁻: three spin components, q → 3kT/(σB) with σ = 2 for odd N only;
    // the deviation is first order, within (|G| + |λ| + 3B)/kT.
    for (parity, sigma) in [(NParity::All, 1.0), (NParity::OddOnly, 2.0)] {
        let m = o2(parity);
        let g = mid(&m.lowest_term(64)).abs();
        for k in ["1000", "10000"] {
            let kt = k.parse::<f64>().unwrap() * 1.4377;
            let dev = classical_ratio(&m, O2[0], k, 3.0 / sigma);
            assert!(
                dev.abs() <= (g + 1.9848 + 3.0 * 1.4377) / kt,
                "σ = {sigma}: {dev}"
            );
        }
    }
}

#[test]
fn the_extremes_of_temperature_are_certified_or_refused_at_once() {
    // T/θ = 0.001 (θ = B/k): only the lowest level counts, ln q = ln g₀:
    // NO's J = ½ (2 parities × 2 M = 4), OH's F1 J = 3/2 (8), O2's N = 1,
    // J = 0 (1).
    let no = pi(Coupling::Intermediate, NO, true);
    let oh = pi(Coupling::Intermediate, OH, true);
    let oxygen = o2(NParity::OddOnly);
    for (s, b, g0) in [
        (&no as &dyn Spectrum, NO[1], 4.0f64),
        (&oh, OH[1], 8.0),
        (&oxygen, O2[0], 1.0),
    ] {
        let p = thermo(s, &Temperature::ThermalEnergy(r("0.001") * r(b)), 20).unwrap();
        assert!(p.certified);
        assert!((p.ln_q.to_f64() - g0.ln()).abs() < 1e-15);
        assert!(p.cv_over_k.to_f64() < 1e-100);
    }
    // T/θ = 10⁶ for rigid NO (some 7000 J per ladder; with its D the
    // ladders end near J = 400) and 10⁵ for O2, certified to 10 digits; at
    // such T, ln q is near ln(4kT/B) and ln(3kT/2B).
    let rigid_no = pi(Coupling::Intermediate, NO, false);
    for (s, b, t, c) in [
        (&rigid_no as &dyn Spectrum, NO[1], "1000000", 4.0f64),
        (&oxygen, O2[0], "100000", 1.5),
    ] {
        let p = thermo(s, &Temperature::ThermalEnergy(r(t) * r(b)), 10).unwrap();
        assert!(p.certified);
        let classical = (c * t.parse::<f64>().unwrap()).ln();
        assert!((p.ln_q.to_f64() - classical).abs() < 1e-3, "{t}");
    }
    // T/θ = 10¹²: ten million levels would be listed; refused by the
    // budget before any is made.
    let all_n = o2(NParity::All);
    for (s, b) in [(&rigid_no as &dyn Spectrum, NO[1]), (&all_n, O2[0])] {
        let e = thermo(
            s,
            &Temperature::ThermalEnergy(r("1000000000000") * r(b)),
            10,
        )
        .unwrap_err();
        assert_eq!(e.kind(), ErrorKind::Budget, "{e}");
    }
    let e = pi(Coupling::Intermediate, NO, false)
        .levels_within(&r("1e15"), &Budget::default())
        .unwrap_err();
    assert_eq!(e.kind(), ErrorKind::Budget);
    assert!(e.message().contains("levels"), "{e}");
}

#[test]
fn a_large_d_ends_each_ladder_at_its_proved_turnover() {
    // An invented D = 0.05 cm⁻¹ on OH's B: the ladders' rises are proved
    // only up to J ≈ √(B/2D) ≈ 13; beyond, nothing is listed, the top is
    // finite and the sum is complete.
    let m = PiDoublet::new(Coupling::Intermediate, r(OH[0]), r(OH[1]), r("0.05"), CM).unwrap();
    let last = m.last_twice_j();
    let (l1, l2) = (last[0].unwrap(), last[1].unwrap());
    assert!(
        (20..=30).contains(&l1) && (20..=30).contains(&l2),
        "{last:?}"
    );
    let top = m.highest_energy().unwrap();
    let all = m.levels_up_to(&top).unwrap();
    let beyond = m
        .levels_up_to(&(&top * BigRational::from_integer(10.into())))
        .unwrap();
    assert_eq!(all.total_states(), beyond.total_states());
    // Each ladder's listed levels rise, and the turnover is reported.
    assert!(!m.warnings(&top).is_empty());
    assert!(m.count_bound(&top) >= all.total_states());
    // Ladder by ladder, the listed terms rise with J.
    for (ladder, l) in last.iter().enumerate() {
        let terms: Vec<f64> = (1..=l.unwrap())
            .step_by(2)
            .filter_map(|tj| m.term(ladder, tj, 64))
            .map(|e| mid(&e))
            .collect();
        assert!(terms.windows(2).all(|w| w[0] < w[1]));
    }
    let p = thermo(&m, &Temperature::ThermalEnergy(r("1e9")), 10).unwrap();
    assert!(p.certified);
    // At infinite temperature every listed state counts: q → N.
    let n = all.total_states().to_f64().unwrap();
    assert!((p.ln_q.to_f64() - n.ln()).abs() < 1e-4);
}

#[test]
fn case_a_degeneracies_match_a_direct_count() {
    // Independent count from the case (a) formula: Ω = ½ (J ≥ ½) and
    // Ω = 3/2 (J ≥ 3/2), E = AΣ + B[J(J+1) − Ω²], each 2(2J+1) states.
    let (a, b) = (r(NO[0]), r(NO[1]));
    let m = pi(Coupling::CaseA, NO, false);
    let ground = &b * r("0.5") - &a * r("0.5");
    let cut = r("2500");
    let mut count = 0u64;
    for (omega2, sigma) in [(r("0.25"), r("-0.5")), (r("2.25"), r("0.5"))] {
        for tj in (1..400u64).step_by(2) {
            let j = BigRational::new(BigInt::from(tj), BigInt::from(2));
            if &j * &j < omega2 {
                continue;
            }
            let jr = BigRational::new(BigInt::from(tj), BigInt::from(2));
            let e = &a * &sigma + &b * (&jr * (&jr + BigRational::one()) - &omega2);
            if &e - &ground <= cut {
                count += 2 * (tj + 1);
            }
        }
    }
    assert_eq!(m.levels_up_to(&cut).unwrap().total_states(), count.into());
}

#[test]
fn bad_constants_are_refused_by_name() {
    let z = BigRational::zero;
    for coupling in [Coupling::CaseA, Coupling::Intermediate] {
        let e = PiDoublet::new(coupling, r("100"), z(), z(), CM).unwrap_err();
        assert_eq!(e.kind(), ErrorKind::InvalidParameter);
        assert!(e.message().contains("rotational constant B") && e.message().contains('0'));
        let e = PiDoublet::new(coupling, r("100"), r("-2"), z(), CM).unwrap_err();
        assert!(e.message().contains("-2"), "{e}");
        let e = PiDoublet::new(coupling, r("100"), r("2"), r("-0.001"), CM).unwrap_err();
        assert!(e.message().contains("centrifugal constant D") && e.message().contains("-0.001"));
        // D = B: no ladder rises from its first level.
        let e = PiDoublet::new(coupling, r("100"), r("2"), r("2"), CM).unwrap_err();
        assert_eq!(e.kind(), ErrorKind::InvalidParameter);
        assert!(e.message().contains("centrifugal constant D") && e.message().contains("rise"));
    }
    let e = SigmaTriplet::new(r("-1.4"), r("2"), z(), NParity::All, CM).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(e.message().contains("rotational constant B") && e.message().contains("-1.4"));
    // A cutoff below the ground is refused, not answered.
    let e = pi(Coupling::Intermediate, OH, true)
        .levels_up_to(&r("-1"))
        .unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
}

#[test]
fn a_product_with_a_vibration_sums_like_its_parts() {
    // NO's rotation times a harmonic vibration of 1876 cm⁻¹ (from memory,
    // its fundamental): the engine sums the parts apart (Structure::Parts)
    // and, by Path::Direct, the combined listing of enclosed and exact
    // levels; both must agree to every printed digit, and ln q must be the
    // sum of the parts' ln q.
    let product = || {
        Product::new(
            vec![
                Part {
                    name: "rot".into(),
                    spectrum: Box::new(pi(Coupling::Intermediate, NO, true)),
                },
                Part {
                    name: "vib".into(),
                    spectrum: Box::new(HarmonicModes::one_d(r("1876"), false, CM).unwrap()),
                },
            ],
            None,
        )
        .unwrap()
    };
    let p = product();
    for t in ["100", "1000"] {
        let temp = Temperature::Kelvin(r(t));
        let auto = thermo(&p, &temp, 12).unwrap();
        let direct = thermo_with(&p, &temp, 12, SumPath::Direct).unwrap();
        assert!(auto.certified && direct.certified);
        assert_eq!(auto.ln_q.decimal(12), direct.ln_q.decimal(12), "T = {t}");
        assert_eq!(auto.cv_over_k.decimal(12), direct.cv_over_k.decimal(12));
        let rot = thermo(&pi(Coupling::Intermediate, NO, true), &temp, 12).unwrap();
        let vib = thermo(
            &HarmonicModes::one_d(r("1876"), false, CM).unwrap(),
            &temp,
            12,
        )
        .unwrap();
        let sum = rot.ln_q.to_f64() + vib.ln_q.to_f64();
        assert!((auto.ln_q.to_f64() - sum).abs() < 1e-12 * sum.abs().max(1.0));
    }
}
