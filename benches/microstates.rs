//! Beyer–Swinehart speed (README figure): 30 modes up to 50 000 cm-1 at a
//! 1 cm-1 grain, exact counts.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use zsum::exact::parse_rational;
use zsum::microstates::{beyer_swinehart, parse_modes};
use zsum::spectrum::Budget;

fn bs(c: &mut Criterion) {
    // 30 invented mode frequencies from 300 to 3200 cm-1 (demo data).
    let freqs: Vec<String> = (0..30).map(|i| (300 + i * 100).to_string()).collect();
    let modes = parse_modes(&freqs.join(",")).unwrap();
    let (grain, cutoff) = (
        parse_rational("1").unwrap(),
        parse_rational("50000").unwrap(),
    );
    c.bench_function("beyer_swinehart_30_modes_50000_grains", |b| {
        b.iter(|| black_box(beyer_swinehart(&modes, &grain, &cutoff, &Budget::default()).unwrap()))
    });
}

criterion_group!(benches, bs);
criterion_main!(benches);
