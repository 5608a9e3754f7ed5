//! Summation speed (figures quoted in the README).

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use zsum::exact::parse_rational;
use zsum::models::oscillator::HarmonicModes;
use zsum::models::product::{Part, Product};
use zsum::models::rotor::LinearRotor;
use zsum::models::ParticleInBox;
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

fn r(s: &str) -> num_rational::BigRational {
    parse_rational(s).unwrap()
}

fn sums(c: &mut Criterion) {
    let mut g = c.benchmark_group("sum");
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin).unwrap();
    let t = Temperature::Kelvin(r("1e4"));
    g.bench_function("rotor_T_over_theta_1e4_50_digits", |b| {
        b.iter(|| black_box(thermo(&rot, &t, 50).unwrap()))
    });
    let t_low = Temperature::Kelvin(r("1"));
    g.bench_function("rotor_T_over_theta_1_50_digits", |b| {
        b.iter(|| black_box(thermo(&rot, &t_low, 50).unwrap()))
    });
    let cube = ParticleInBox::cube(3).unwrap();
    for kt in ["1e3", "1e16"] {
        let t = Temperature::ThermalEnergy(r(kt));
        g.bench_function(format!("cube_kT_{kt}_30_digits"), |b| {
            b.iter(|| black_box(thermo(&cube, &t, 30).unwrap()))
        });
    }
    g.finish();
}

fn sweep(c: &mut Criterion) {
    let mut g = c.benchmark_group("sweep");
    g.sample_size(10);
    let prod = Product::new(
        vec![
            Part {
                name: "rot".into(),
                spectrum: Box::new(LinearRotor::rigid(r("2.88"), EnergyUnit::Kelvin).unwrap()),
            },
            Part {
                name: "vib".into(),
                spectrum: Box::new(
                    HarmonicModes::one_d(r("3393"), true, EnergyUnit::Kelvin).unwrap(),
                ),
            },
        ],
        None,
    )
    .unwrap();
    let grid: Vec<Temperature> = (1..=1000)
        .map(|i| Temperature::Kelvin(num_rational::BigRational::from_integer(i.into())))
        .collect();
    g.bench_function("rotor_x_oscillator_1000_temperatures_30_digits", |b| {
        b.iter(|| {
            for t in &grid {
                black_box(thermo(&prod, t, 30).unwrap());
            }
        })
    });
    g.finish();
}

fn cold_sweep(c: &mut Criterion) {
    let mut g = c.benchmark_group("cold");
    g.sample_size(10);
    // The README's vibrating rotor (CO-like demo constants), 200 log-spaced
    // temperatures from 0.01 K (ln q ≈ e^-570) to 300 K, 15 digits.
    let vib = zsum::models::oscillator::AnharmonicOscillator::new(
        r("2358.57"),
        r("14.324"),
        r("0"),
        EnergyUnit::Wavenumber,
    )
    .unwrap();
    let d = zsum::models::diatomic::RovibDiatomic::new(
        vib,
        r("1.99824"),
        r("0.017318"),
        r("0"),
        zsum::models::diatomic::ParityWeights::from_nuclear_spin(2, false),
    )
    .unwrap();
    let grid = zsum::thermo::parse_grid("--T", "log:0.01:300:200").unwrap();
    g.bench_function(
        "vibrating_rotor_200_temperatures_0.01_to_300_K_15_digits",
        |b| {
            b.iter(|| {
                black_box(
                    zsum::report::ThermoReport::build(
                        "diatomic",
                        &d,
                        &grid,
                        true,
                        15,
                        zsum::sum::DEFAULT_MAX_BITS,
                        None,
                        true,
                        &zsum::budget::Meter::unlimited(),
                    )
                    .unwrap(),
                )
            })
        },
    );
    g.finish();
}

criterion_group!(benches, sums, sweep, cold_sweep);
criterion_main!(benches);
