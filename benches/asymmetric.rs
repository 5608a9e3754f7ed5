//! Certified asymmetric-top levels: every level of water for J = 0..=50
//! (2601 levels) to 30 significant digits.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use std::time::Duration;
use zsum::exact::parse_rational;
use zsum::models::asymmetric::{AsymmetricTopMath, Quartic};

fn levels(c: &mut Criterion) {
    let r = |s: &str| parse_rational(s).unwrap();
    // Ground-state constants of H2 16O in cm^-1 (from memory).
    let (a, b, cc) = (r("27.8806"), r("14.5218"), r("9.2777"));
    let rigid = AsymmetricTopMath::rigid(a.clone(), b.clone(), cc.clone()).unwrap();
    // Every level of J >= 1 is at least 2C, so an absolute width of
    // 1e-32 * 2C is at most 1e-32 of each value: 30 significant digits.
    let width = r("1e-32") * r("2") * &cc;
    let mut g = c.benchmark_group("asymmetric");
    g.sample_size(10).measurement_time(Duration::from_secs(10));
    g.bench_function("water_j0_50_30_digits", |bch| {
        bch.iter(|| {
            let all = rigid.levels_up_to_j(black_box(50), &width).unwrap();
            black_box(all.iter().map(Vec::len).sum::<usize>())
        })
    });
    g.bench_function("water_j50_30_digits_one_core", |bch| {
        bch.iter(|| black_box(rigid.levels_of_j(black_box(50), &width).unwrap().len()))
    });
    // Quartic constants of the size of water's (from memory, rounded), up
    // to the turnover.
    let quartic = Quartic {
        delta_j: r("0.00125"),
        delta_jk: r("-0.0058"),
        delta_k: r("0.0326"),
        small_delta_j: r("0.00051"),
        small_delta_k: r("0.0013"),
    };
    let distorted = AsymmetricTopMath::new(a, b, cc, Some(quartic)).unwrap();
    let last = distorted.turnover_j().unwrap();
    g.bench_function("water_quartic_to_turnover_30_digits", |bch| {
        bch.iter(|| {
            let all = distorted.levels_up_to_j(black_box(last), &width).unwrap();
            black_box(all.len())
        })
    });
    g.finish();
}

/// q, U, Cv, S of water's rotation at 300 K to 30 digits, with the levels
/// already listed (a sweep's cache holds them): the sum alone; and the
/// whole call, listing included.
fn thermo_300k(c: &mut Criterion) {
    use zsum::models::asym_top::{pair_weights, AsymmetricTop, Axis};
    use zsum::sum::{thermo, Cached, Temperature};
    use zsum::units::EnergyUnit;
    let r = |s: &str| parse_rational(s).unwrap();
    let math = AsymmetricTopMath::rigid(r("27.8806"), r("14.5218"), r("9.2777")).unwrap();
    let water = AsymmetricTop::new(math, EnergyUnit::Wavenumber)
        .with_weights(pair_weights(1, Axis::B))
        .unwrap();
    let t = Temperature::Kelvin(r("300"));
    let cached = Cached::new(&water);
    // The first call lists the levels into the cache.
    assert!(thermo(&cached, &t, 30).unwrap().certified);
    let mut g = c.benchmark_group("asymmetric");
    g.sample_size(20);
    g.bench_function("water_thermo_300k_30_digits_levels_built", |b| {
        b.iter(|| black_box(thermo(&cached, black_box(&t), 30).unwrap()))
    });
    g.sample_size(10);
    g.bench_function("water_thermo_300k_30_digits_with_listing", |b| {
        b.iter(|| black_box(thermo(&water, black_box(&t), 30).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, levels, thermo_300k);
criterion_main!(benches);
