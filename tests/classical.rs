//! Classical approximations, error maps and the breakdown finder, checked
//! against closed forms and against mpmath computations embedded below.

use num_rational::BigRational;
use zsum::classical::{parse_tolerance, Classical, Quantity, SearchRange, RESOLUTION};
use zsum::exact::parse_rational;
use zsum::models::diatomic::ParityWeights;
use zsum::models::oscillator::HarmonicModes;
use zsum::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
use zsum::models::ParticleInBox;
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn rel_err(c: &Classical, name: &str, x: &str, q: Quantity) -> f64 {
    let t = c.at_reduced(&r(x));
    let exact = c.exact(&t).unwrap();
    let a = c.approximate(c.find(name).unwrap(), &t).unwrap().unwrap();
    a.rel_error(&exact, q).to_f64()
}

fn crossing_values(c: &Classical, name: &str, q: Quantity, tol: &str, range: &str) -> Vec<f64> {
    let rep = zsum::report::CrossoverReport::build(
        c,
        c.find(name).unwrap(),
        q,
        &parse_tolerance(tol).unwrap(),
        &SearchRange::parse(range).unwrap(),
        9,
    )
    .unwrap();
    rep.crossings
        .iter()
        .map(|x| x.t_over_theta.parse().unwrap())
        .collect()
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs()
}

/// The relative error of the classical q of one harmonic mode has a closed
/// form: x/(1 − e^{−x}) per... i.e. (1 − e^{−x})/x − 1 without zero point
/// and 2 sinh(x/2)/x − 1 with it (x = θ/T; standard result).
#[test]
fn oscillator_error_map_and_crossovers_follow_the_closed_form() {
    let ho = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin).unwrap();
    let c = Classical::new(&ho).unwrap();
    for x in ["0.5", "1", "3", "20", "400"] {
        let t: f64 = x.parse().unwrap();
        let y = 1.0 / t;
        let closed = -(-y).exp_m1() / y - 1.0;
        let got = rel_err(&c, "classical", x, Quantity::Q);
        assert!(close(got, closed, 1e-12), "T/θ {x}: {got} vs {closed}");
    }
    // Crossings solved in closed form by bisection here, and by mpmath 1.3.0
    // findroot at 40 digits: (1 − e^{−x})/x = 0.99 at T/θ = 49.6661081282481.
    let solve = |f: &dyn Fn(f64) -> f64, mut lo: f64, mut hi: f64| {
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if f(lo).signum() == f(mid).signum() {
                lo = mid
            } else {
                hi = mid
            }
        }
        lo
    };
    let x = solve(&|x: f64| -(-x).exp_m1() / x - 0.99, 1e-3, 1.0);
    let got = crossing_values(&c, "classical", Quantity::Q, "1%", "0.1:1000");
    assert_eq!(got.len(), 1);
    assert!(close(got[0], 1.0 / x, 1e-8), "{got:?} vs {}", 1.0 / x);
    assert!(close(got[0], 49.6661081282481, 1e-8));
    // With zero-point energy: 2 sinh(x/2)/x = 1.01 at T/θ = 2.0442962365016 (mpmath).
    let hz = HarmonicModes::one_d(r("1"), true, EnergyUnit::Kelvin).unwrap();
    let cz = Classical::new(&hz).unwrap();
    let got = crossing_values(&cz, "classical", Quantity::Q, "1%", "0.1:1000");
    assert_eq!(got.len(), 1);
    assert!(close(got[0], 2.0442962365016, 1e-8), "{got:?}");
}

/// Higher orders of the Bernoulli series shrink the error as x^(k+1).
#[test]
fn oscillator_orders_converge() {
    for zp in [false, true] {
        let ho = HarmonicModes::one_d(r("1"), zp, EnergyUnit::Kelvin).unwrap();
        let c = Classical::new(&ho).unwrap();
        let names: Vec<String> = c.approximations().into_iter().map(|a| a.name).collect();
        let errs: Vec<f64> = names
            .iter()
            .map(|n| rel_err(&c, n, "5", Quantity::Q).abs())
            .collect();
        for w in errs.windows(2) {
            assert!(w[1] < w[0] / 5.0, "zero point {zp}: {errs:?}");
        }
    }
}

/// The rigid heteronuclear rotor's Cv/k rises above 1, peaks near 1.1 at
/// T/θ about 0.8 and falls back to 1 (standard texts, from memory). Peak by
/// mpmath 1.3.0 (40 digits, direct sum, findroot of dCv/dT):
/// T/θ = 0.80716653874245529, Cv/k = 1.0976163222886367.
#[test]
fn rotor_heat_capacity_peak_matches_mpmath() {
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    let cv = |x: f64| -> f64 {
        let t = Temperature::ThermalEnergy(BigRational::from_float(x).unwrap());
        // The certified number itself, no text in between.
        thermo(&rot, &t, 25).unwrap().cv_over_k.to_f64()
    };
    // Golden-section search for the maximum on [0.5, 1.2].
    let g = (5f64.sqrt() - 1.0) / 2.0;
    let (mut a, mut b) = (0.5, 1.2);
    for _ in 0..80 {
        let c = b - g * (b - a);
        let d = a + g * (b - a);
        if cv(c) > cv(d) {
            b = d
        } else {
            a = c
        }
    }
    let peak = 0.5 * (a + b);
    assert!(close(peak, 0.807_166_538_742_455_3, 1e-7), "peak at {peak}");
    assert!(close(cv(peak), 1.097_616_322_288_636_7, 1e-13));
    // Its classical Cv crosses 1% three times; mpmath findroot of
    // |1/Cv − 1| = 0.01: 0.600571001676, 0.61648276109, 1.92063600093.
    let c = Classical::new(&rot).unwrap();
    let got = crossing_values(&c, "classical", Quantity::Cv, "1%", "0.01:100");
    let want = [0.600571001676, 0.61648276109, 1.92063600093];
    assert_eq!(got.len(), 3, "{got:?}");
    for (g, w) in got.iter().zip(want) {
        assert!(close(*g, w, 1e-8), "{got:?}");
    }
}

/// Mulholland's expansion: each order cuts the error of q by about y, and
/// homonuclear weights divide the classical form by σ (T/σθ).
#[test]
fn mulholland_orders_and_symmetry_numbers() {
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    let c = Classical::new(&rot).unwrap();
    let errs: Vec<f64> = [
        "classical",
        "mulholland1",
        "mulholland2",
        "mulholland3",
        "mulholland4",
    ]
    .iter()
    .map(|n| rel_err(&c, n, "20", Quantity::Q).abs())
    .collect();
    for w in errs.windows(2) {
        assert!(w[1] < w[0] / 10.0, "{errs:?}");
    }
    // At T/θ = 20 the exact q is 20.33500... so the classical error is
    // −(1/3 + 1/300 + ...)/q (Mulholland, from memory).
    assert!(close(errs[0], 0.3368 / 20.3368, 1e-3));
    // 16O2-like weights (odd J only): classical T/(2θ), exact close to q/2.
    let o2 = rot
        .clone()
        .with_weights(ParityWeights::new(0u32.into(), 1u32.into()).unwrap());
    let c = Classical::new(&o2).unwrap();
    assert!(rel_err(&c, "mulholland4", "50", Quantity::Q).abs() < 1e-9);
    // H2-like weights 1:3: ḡ = 2, q → 2 T/θ.
    let h2 = rot.with_weights(ParityWeights::from_nuclear_spin(1, false));
    let c = Classical::new(&h2).unwrap();
    assert!(rel_err(&c, "mulholland4", "50", Quantity::Q).abs() < 1e-9);
    assert!(rel_err(&c, "classical", "50", Quantity::Q).abs() < 0.01);
}

/// The symmetric top's first correction [1 + (B/12kT)(4 − B/A)] removes
/// the error linear in θ/T, prolate and oblate; the spherical top's
/// e^{B/4kT} is exact up to exponentially small terms.
#[test]
fn top_corrections_hold() {
    for (shape, unique) in [(TopShape::Prolate, "5"), (TopShape::Oblate, "0.5")] {
        let top = SymmetricTop::rigid(shape, r(unique), r("1"), EnergyUnit::Kelvin).unwrap();
        let c = Classical::new(&top).unwrap();
        let e10 = rel_err(&c, "first", "10", Quantity::Q).abs();
        let e20 = rel_err(&c, "first", "20", Quantity::Q).abs();
        let c10 = rel_err(&c, "classical", "10", Quantity::Q).abs();
        assert!(e10 < c10 / 10.0, "{shape:?}: {e10} vs {c10}");
        // Second order: halving θ/T quarters the error (within 30%).
        assert!(close(e10 / e20, 4.0, 0.3), "{shape:?}: {}", e10 / e20);
    }
    let sph = SphericalTop::new(r("1"), r("0"), EnergyUnit::Kelvin).unwrap();
    let c = Classical::new(&sph).unwrap();
    assert!(rel_err(&c, "exponential", "10", Quantity::Q).abs() < RESOLUTION);
    // Cv carries the exponentially small terms times (π² T/θ)²: still tiny.
    assert!(rel_err(&c, "exponential", "10", Quantity::Cv).abs() < 1e-30);
    assert!(rel_err(&c, "first", "10", Quantity::Q).abs() > 1e-5);
}

/// The 1D box: sqrt(π/(4a)) − 1/2 is exact up to exponentially small terms.
/// By Jacobi's imaginary transformation the remainder is
/// sqrt(π/a) Σ_{m≥1} e^{−π² m²/a} (standard result), so the error map's
/// relative error is −sqrt(π/a) e^{−π²/a}/q to leading order.
#[test]
fn box_euler_maclaurin_error_is_exponentially_small() {
    let b = ParticleInBox::new(vec![r("1")]).unwrap();
    let c = Classical::new(&b).unwrap();
    let grid = vec![r("1"), r("2"), r("4"), r("10")];
    let map = zsum::report::CompareReport::build(
        &c,
        &[0, 1],
        &grid,
        false,
        12,
        &zsum::budget::Meter::unlimited(),
    )
    .unwrap();
    for (row, kt) in map.rows.iter().zip([1.0f64, 2.0, 4.0, 10.0]) {
        let a = 1.0 / kt;
        let pi = std::f64::consts::PI;
        let q = (pi / (4.0 * a)).sqrt() - 0.5 + (pi / a).sqrt() * (-pi * pi / a).exp();
        let lead = -(pi / a).sqrt() * (-pi * pi / a).exp() / q;
        let em = &row.approximations[1];
        assert_eq!(em.name, "euler-maclaurin");
        let text = &em.rel_error.as_ref().unwrap().q;
        if lead.abs() < RESOLUTION {
            assert_eq!(text, "<1e-37");
        } else {
            let got: f64 = text.parse().unwrap();
            assert!(close(got, lead, 1e-3), "kT {kt}: {got} vs {lead}");
        }
        // The classical form alone errs by about 1/(2q).
        let cl: f64 = row.approximations[0]
            .rel_error
            .as_ref()
            .unwrap()
            .q
            .parse()
            .unwrap();
        assert!(close(cl, 0.5 / q, 0.05), "kT {kt}: {cl}");
    }
}

/// 3D box orders: classical (V/Λ³), surface, edges, full Euler–Maclaurin,
/// each closer than the last; Cv → 3/2 classically.
#[test]
fn box_boundary_orders_converge() {
    let b = ParticleInBox::new(vec![r("1"), r("2"), r("3")]).unwrap();
    let c = Classical::new(&b).unwrap();
    let names: Vec<String> = c.approximations().into_iter().map(|a| a.name).collect();
    assert_eq!(names, ["classical", "surface", "edges", "euler-maclaurin"]);
    let errs: Vec<f64> = names
        .iter()
        .map(|n| rel_err(&c, n, "50", Quantity::Q).abs().max(1e-300))
        .collect();
    for w in errs.windows(2) {
        assert!(w[1] < w[0] / 3.0, "{errs:?}");
    }
    let t = c.at_reduced(&r("50"));
    let v = c.approximate(0, &t).unwrap().unwrap();
    assert!((v.cv.to_f64() - 1.5).abs() < 1e-60);
}

/// Names a model lacks, and models with no classical limit, are refused.
#[test]
fn unknown_approximations_and_models_without_a_limit_are_refused() {
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    let c = Classical::new(&rot).unwrap();
    let e = c.find("order2").unwrap_err().to_string();
    assert!(e.contains("order2") && e.contains("mulholland1"), "{e}");
    let file = zsum::models::level_file::LevelFile::parse("0 K 1\n1 K 3\n", "inline").unwrap();
    let e = Classical::new(&file).err().unwrap().to_string();
    assert!(e.contains("no classical limit"), "{e}");
}

/// A finite level list inside a product is carried exactly: a rotor times
/// a triply degenerate ground level has the rotor's relative errors in q,
/// U and Cv (S moves by ln 3 in both, so its relative error changes).
#[test]
fn level_lists_ride_along_exactly_in_products() {
    use zsum::models::product::{Part, Product};
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    let file = zsum::models::level_file::LevelFile::parse("0 K 3\n", "inline").unwrap();
    let both = Product::new(
        vec![
            Part {
                name: "rot".into(),
                spectrum: Box::new(rot.clone()),
            },
            Part {
                name: "el".into(),
                spectrum: Box::new(file),
            },
        ],
        None,
    )
    .unwrap();
    let (c1, c2) = (
        Classical::new(&rot).unwrap(),
        Classical::new(&both).unwrap(),
    );
    for q in [Quantity::Q, Quantity::U, Quantity::Cv] {
        let a = rel_err(&c1, "classical", "3", q);
        let b = rel_err(&c2, "classical", "3", q);
        assert!(close(a, b, 1e-25), "{q}: {a} vs {b}");
    }
}
