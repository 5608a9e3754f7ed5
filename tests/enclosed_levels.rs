//! Levels whose energies are not rational: certified enclosures in level
//! lists and in the summation engine.
//!
//! The test spectrum is a ladder E_n = n·√2 (n = 0, 1, 2, ...), one state
//! each: every excited energy is irrational, and the partition function has
//! the closed form of the geometric series, q = 1/(1 − e^{−a}) with
//! a = √2/kT, U/kT = a/(e^a − 1), Cv/k = a² e^a/(e^a − 1)² (common
//! practice: the harmonic oscillator's sums).

use num_bigint::{BigInt, BigUint};
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use rug::Float;
use zsum::error::Result;
use zsum::exact::parse_rational;
use zsum::level::{Level, LevelList};
use zsum::report::ThermoPoint;
use zsum::spectrum::{Budget, Spectrum, State};
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

/// A GMP integer as a num-bigint one.
fn big(i: &rug::Integer) -> BigInt {
    let digits = i.to_digits::<u32>(rug::integer::Order::Lsf);
    let m = BigInt::from(BigUint::new(digits));
    if *i < 0 {
        -m
    } else {
        m
    }
}

/// n·√2 enclosed between two rationals at `bits` bits (rounded down and up).
fn enclose(n: u64, bits: u32) -> (BigRational, BigRational) {
    use rug::float::Round;
    let at = |round: Round| -> BigRational {
        let (s, _) = Float::with_val_round(bits, Float::with_val(bits + 64, 2).sqrt() * n, round);
        let q = s.to_rational().unwrap_or_default();
        BigRational::new(big(q.numer()), big(q.denom()))
    };
    // √2 at bits + 64 is within 2^−(bits+63) relative: rounding that down
    // and up at `bits` leaves the true value inside unless it lies within
    // 2^−(bits+63) of a `bits`-bit number; widen by one unit to be safe.
    let (lo, hi) = (at(Round::Down), at(Round::Up));
    let unit = &hi - &lo;
    (&lo - &unit, &hi + &unit)
}

/// The ladder's levels up to `cutoff` with enclosures at `bits` bits.
fn ladder_list(cutoff: &BigRational, bits: u32) -> LevelList {
    let mut out = vec![Level::new(BigRational::zero(), 1u32)];
    let mut n = 1;
    loop {
        let (lo, hi) = enclose(n, bits);
        if &lo > cutoff {
            break;
        }
        out.push(Level::enclosed(lo, hi, 1u32));
        n += 1;
    }
    LevelList::new(EnergyUnit::Kelvin, out)
}

/// The ladder, its enclosures at the engine's precision or at a fixed
/// number of bits.
struct RootTwoLadder(Option<u32>);

impl Spectrum for RootTwoLadder {
    fn describe(&self) -> String {
        "ladder n sqrt(2)".into()
    }
    fn unit(&self) -> EnergyUnit {
        EnergyUnit::Kelvin
    }
    fn quantum_numbers(&self) -> Vec<String> {
        vec!["n".into()]
    }
    fn ground_energy(&self) -> BigRational {
        BigRational::zero()
    }
    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        self.levels_within_bits(cutoff, budget, 200)
    }
    fn levels_within_bits(&self, cutoff: &BigRational, _: &Budget, bits: u32) -> Result<LevelList> {
        Ok(ladder_list(cutoff, self.0.unwrap_or(bits + 8)))
    }
    fn states_at(&self, _: &BigRational) -> Result<Vec<State>> {
        Ok(Vec::new())
    }
    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // n √2 ≤ E ⇒ n ≤ E/1.4142 (1.4142 < √2).
        let n = (energy / r("1.4142")).floor().to_integer();
        (n + 1u32).to_biguint().unwrap_or_default()
    }
    fn growth_exponent(&self) -> Option<f64> {
        Some(1.0)
    }
}

/// The closed forms at kT = `kt`, at 300 bits.
fn closed(kt: &str) -> [f64; 3] {
    let p = 300;
    let kt = Float::with_val(p, Float::parse(kt).unwrap());
    let a = Float::with_val(p, Float::with_val(p, 2).sqrt() / &kt);
    let ea = Float::with_val(p, a.exp_ref());
    let em1 = Float::with_val(p, &ea - 1u32);
    let q = Float::with_val(p, &ea / &em1);
    let u = Float::with_val(p, &a / &em1);
    let cv = Float::with_val(p, &a * &a) * &ea / Float::with_val(p, &em1 * &em1);
    [q.to_f64(), u.to_f64(), cv.to_f64()]
}

#[test]
fn enclosed_levels_sum_to_the_closed_form_with_every_digit_certified() {
    // From the ground-dominated end (kT = 0.01: q − 1 ≈ e^−141) to the hot
    // end (kT = 40: some three thousand terms).
    for kt in ["0.01", "0.3", "1", "7", "40"] {
        let t = Temperature::Kelvin(r(kt));
        let p = thermo(&RootTwoLadder(None), &t, 30).unwrap();
        assert!(p.certified, "kT = {kt}: not certified");
        let [q, u, cv] = closed(kt);
        let f = |s: &str| s.parse::<f64>().unwrap();
        let pt = ThermoPoint::of(&p);
        assert!(
            (f(&pt.q) / q - 1.0).abs() < 1e-14,
            "q at {kt}: {} vs {q}",
            pt.q
        );
        assert!((f(&pt.u_over_kt) / u - 1.0).abs() < 1e-13, "U at {kt}");
        assert!((f(&pt.cv_over_k) / cv - 1.0).abs() < 1e-13, "Cv at {kt}");
        // Ziv: the 30-digit values are the 60-digit ones rounded.
        let p60 = ThermoPoint::of(&thermo(&RootTwoLadder(None), &t, 60).unwrap());
        for (a, b) in [
            (&pt.q, &p60.q),
            (&pt.u_over_kt, &p60.u_over_kt),
            (&pt.cv_over_k, &p60.cv_over_k),
        ] {
            assert_eq!(a, &zsum::exact::format_sig(&r(b), 30), "kT = {kt}");
        }
    }
}

#[test]
fn wide_enclosures_are_charged_not_ignored() {
    // Enclosures of ±2^-20 relative cannot support 30 digits: the engine
    // must not certify them, however many working bits it spends.
    let t = Temperature::Kelvin(r("3"));
    let p = zsum::sum::thermo_limited(
        &RootTwoLadder(Some(20)),
        &t,
        30,
        zsum::sum::Path::Auto,
        2048,
    )
    .unwrap();
    assert!(!p.certified);
    assert!(p.certified_digits < 10, "{}", p.certified_digits);
    // The radius of ln q covers the true value.
    let [q, _, _] = closed("3");
    let lo = p.ln_q.interval().0.to_f64();
    let hi = p.ln_q.interval().1.to_f64();
    assert!(lo <= q.ln() && q.ln() <= hi, "{lo} {hi} {}", q.ln());
}

#[test]
fn lists_carry_enclosures_through_every_operation_and_never_merge_them() {
    let list = RootTwoLadder(None).levels_up_to(&r("3")).unwrap();
    // 0, √2, 2√2: the two excited levels are enclosed, the ground exact.
    assert_eq!(list.len(), 3);
    assert!(list.levels()[0].is_exact());
    assert!(!list.levels()[1].is_exact() && !list.levels()[2].is_exact());
    let root2 = 2f64.sqrt();
    for (l, n) in list.iter().zip(0..) {
        assert!(l.lowest().to_f64().unwrap() <= n as f64 * root2);
        assert!(l.highest().to_f64().unwrap() >= n as f64 * root2);
    }
    // A union with itself keeps two entries per enclosed energy (equality
    // of two enclosures is not proved) and merges the exact ground.
    let u = list.union(&list).unwrap();
    assert_eq!(u.len(), 5);
    assert_eq!(u.levels()[0].degeneracy, BigUint::from(2u32));
    assert_eq!(u.total_states(), BigUint::from(6u32));
    // Products add enclosures: (√2) + (√2) encloses 2√2.
    let p = list.product(&list).unwrap();
    assert_eq!(p.total_states(), BigUint::from(9u32));
    for l in p.iter().filter(|l| !l.is_exact()) {
        let w = (l.highest() - l.lowest()).to_f64().unwrap();
        assert!(w > 0.0 && w < 1e-50, "width {w}");
    }
    // Shift and scale carry the enclosure.
    let s = list
        .shifted(&r("1"))
        .scaled(&r("2"), EnergyUnit::Kelvin)
        .unwrap();
    let l = &s.levels()[1];
    assert!(l.lowest().to_f64().unwrap() <= 2.0 * (1.0 + root2));
    assert!(l.highest().to_f64().unwrap() >= 2.0 * (1.0 + root2));
    // Counting: N(≤ 1.5) is 2, N(≤ 1.4) is 1.
    assert_eq!(list.count_up_to(&r("1.5")), BigUint::from(2u32));
    assert_eq!(list.count_up_to(&r("1.4")), BigUint::from(1u32));
    // JSON marks the enclosed energies.
    let json = serde_json::to_string(&list).unwrap();
    assert_eq!(json.matches("\"enclosure\"").count(), 2, "{json}");
}
