//! Property tables of every built-in species (the README's figure): 300
//! temperatures, 1 K to 300 K in steps of 1 K, 20 significant digits.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use zsum::species::{tables, Database, MolarOptions};
use zsum::thermo::parse_grid;

fn all_species(c: &mut Criterion) {
    let db = Database::builtin().unwrap();
    let species: Vec<_> = db.all().iter().collect();
    let grid = parse_grid("--T", "1:300:1").unwrap();
    let o = MolarOptions {
        digits: 20,
        ..MolarOptions::default()
    };
    let mut g = c.benchmark_group("species");
    g.sample_size(10);
    g.bench_function("all_13_species_300_temperatures_20_digits", |b| {
        b.iter(|| black_box(tables(&species, &grid, &o).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, all_species);
criterion_main!(benches);
