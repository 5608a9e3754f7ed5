//! Microstate speeds (README figures): the census count (Beyer–Swinehart)
//! of 30 modes up to 50 000 cm-1 on a 1 cm-1 step; Ω(E, N) for 100 bosons in the 3D cube for
//! every total energy up to 2000 box units; Q_N of 50 fermions in a 3D
//! harmonic trap at one temperature; the Einstein table of 300 oscillators
//! up to 300 quanta at 10 certified digits. All counts exact.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use zsum::exact::parse_rational;
use zsum::microstates::{beyer_swinehart, ensemble_point, microstates, parse_modes, Statistics};
use zsum::models::oscillator::HarmonicModes;
use zsum::models::ParticleInBox;
use zsum::report::EinsteinReport;
use zsum::spectrum::Budget;
use zsum::sum::Temperature;
use zsum::units::EnergyUnit;

fn bs(c: &mut Criterion) {
    // 30 invented mode frequencies from 300 to 3200 cm-1 (demo data).
    let freqs: Vec<String> = (0..30).map(|i| (300 + i * 100).to_string()).collect();
    let modes = parse_modes(&freqs.join(",")).unwrap();
    let (step, cutoff) = (
        parse_rational("1").unwrap(),
        parse_rational("50000").unwrap(),
    );
    c.bench_function("census_count_30_modes_50000_steps", |b| {
        b.iter(|| black_box(beyer_swinehart(&modes, &step, &cutoff, &Budget::default()).unwrap()))
    });
}

fn bosons(c: &mut Criterion) {
    let cube = ParticleInBox::cube(3).unwrap();
    let cutoff = parse_rational("2000").unwrap();
    let mut g = c.benchmark_group("collections");
    g.sample_size(10);
    g.bench_function("omega_100_bosons_cube_up_to_2000", |b| {
        b.iter(|| {
            black_box(
                microstates(
                    &cube,
                    100,
                    Statistics::Bose,
                    &cutoff,
                    None,
                    &Budget::default(),
                )
                .unwrap(),
            )
        })
    });
    let trap = HarmonicModes::new(
        vec![(parse_rational("0.1").unwrap(), 3)],
        false,
        EnergyUnit::Kelvin,
    )
    .unwrap();
    let t = Temperature::Kelvin(parse_rational("1").unwrap());
    g.bench_function("q_n_50_fermions_3d_trap_one_temperature", |b| {
        b.iter(|| black_box(ensemble_point(&trap, 50, Statistics::Fermi, &t, 10).unwrap()))
    });
    let quanta = parse_rational("300").unwrap();
    g.bench_function("einstein_table_300_oscillators_300_quanta", |b| {
        b.iter(|| black_box(EinsteinReport::build(300, &quanta, 10, &Budget::default()).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, bs, bosons);
criterion_main!(benches);
