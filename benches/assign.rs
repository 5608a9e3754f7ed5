//! Checking 20 000 assigned levels of a vibrating rotor against the model:
//! every (v, J) term of a CO-like molecule up to the energy that holds
//! 20 000 of them, as an assignments file with the model's own values
//! perturbed by a fixed pattern of a few sigma.

use criterion::{criterion_group, criterion_main, Criterion};
use num_rational::BigRational;
use std::hint::black_box;
use zsum::assign::{check, Assignments, CheckOptions};
use zsum::exact::{exact_decimal, parse_rational};
use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
use zsum::models::oscillator::AnharmonicOscillator;
use zsum::spectrum::{Budget, Spectrum};
use zsum::units::EnergyUnit;

fn model() -> RovibDiatomic {
    let r = |s: &str| parse_rational(s).unwrap();
    let vib = AnharmonicOscillator::new(r("2169.81"), r("13.29"), r("0"), EnergyUnit::Wavenumber)
        .unwrap();
    RovibDiatomic::new(
        vib,
        r("1.9313"),
        r("0.0175"),
        r("6.12e-6"),
        ParityWeights::new(1u32.into(), 1u32.into()).unwrap(),
    )
    .unwrap()
}

/// The assignments text of the lowest `n` terms of `m`.
pub fn file_of(m: &RovibDiatomic, n: usize) -> String {
    let e0 = m.ground_energy();
    let mut cut = BigRational::from_integer(20_000.into());
    let mut terms = m.terms_within(&(&e0 + &cut), &Budget::default()).unwrap();
    while terms.len() < n {
        cut *= BigRational::from_integer(2.into());
        terms = m.terms_within(&(&e0 + &cut), &Budget::default()).unwrap();
    }
    terms.sort();
    terms.truncate(n);
    let mut text = String::from("numbers = v J\nunit = cm-1\n");
    for (i, (e, q)) in terms.iter().enumerate() {
        let sigma = ["0.0005", "0.001", "0.005", "0.02"][i % 4];
        let shift = BigRational::new(((i % 7) as i64 - 3).into(), 1000.into());
        let shift = if i == 0 {
            BigRational::from_integer(0.into())
        } else {
            shift
        };
        text.push_str(&format!(
            "{} {} {} {sigma}\n",
            q[0],
            q[1],
            exact_decimal(&(e - &e0 + shift), 40)
        ));
    }
    text
}

fn assign(c: &mut Criterion) {
    let m = model();
    let text = file_of(&m, 20_000);
    let a = Assignments::parse(&text, "bench").unwrap();
    assert_eq!(a.rows.len(), 20_000);
    let mut g = c.benchmark_group("assign");
    g.sample_size(10);
    g.bench_function("parse_20000_rows", |b| {
        b.iter(|| black_box(Assignments::parse(&text, "bench").unwrap()))
    });
    g.bench_function("check_20000_rovib_levels", |b| {
        b.iter(|| black_box(check(&a, &m, &CheckOptions::default()).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, assign);
criterion_main!(benches);
