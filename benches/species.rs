//! Property tables of every built-in species (the README's figure): 300
//! temperatures, 5 K to 304 K in steps of 1 K, 20 significant digits; and
//! N2 over 10-3000 K (300 temperatures) and at 3000 K alone, 15 digits.

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use zsum::species::{molar_grids, Database, MolarGrid, MolarOptions};
use zsum::thermo::parse_grid;

fn all_species(c: &mut Criterion) {
    let db = Database::builtin().unwrap();
    // The 13 atoms and diatomics of the speed target (OH and the
    // polyatomics came later; the polyatomics have their own bench).
    let species: Vec<_> = [
        "He", "Ne", "Ar", "Kr", "Xe", "H2", "HD", "D2", "N2", "O2", "CO", "NO", "HCl",
    ]
    .iter()
    .map(|n| db.find(n).unwrap())
    .collect();
    // From 5 K: below about 2.8 K (H2) and 1.9 K (He) the gas at 1 bar is
    // quantum-degenerate (nΛ³ ≥ 1) and the classical rows are refused.
    let grid = parse_grid("--T", "5:304:1").unwrap();
    let o = MolarOptions {
        digits: 20,
        ..MolarOptions::default()
    };
    let mut g = c.benchmark_group("species");
    g.sample_size(10);
    g.bench_function("all_13_species_300_temperatures_20_digits", |b| {
        b.iter(|| black_box(molar_grids(&species, &grid, &o).unwrap()))
    });
    // The process engineer's ordinary table: N2 over 10-3000 K, 300 points.
    let n2 = db.find("N2").unwrap();
    let wide = parse_grid("--T", "10:3000:10").unwrap();
    let hot = parse_grid("--T", "3000").unwrap();
    let o15 = MolarOptions {
        digits: 15,
        ..MolarOptions::default()
    };
    g.bench_function("n2_300_temperatures_10_3000_k_15_digits", |b| {
        b.iter(|| black_box(MolarGrid::compute(n2, &wide, &o15).unwrap()))
    });
    g.sample_size(20);
    g.bench_function("n2_one_temperature_3000_k_15_digits", |b| {
        b.iter(|| black_box(MolarGrid::compute(n2, &hot, &o15).unwrap()))
    });
    g.finish();
}

/// The standard tables of every built-in polyatomic species: 300
/// temperatures from 10 to 1500 K (10:1500:5 without its last point is
/// 299; this grid is 300), 12 digits, each species on its own.
fn polyatomics(c: &mut Criterion) {
    let db = Database::builtin().unwrap();
    let grid = parse_grid("--T", "10:1505:5").unwrap();
    assert_eq!(grid.len(), 300);
    let o = MolarOptions {
        digits: 12,
        ..MolarOptions::default()
    };
    let mut g = c.benchmark_group("polyatomic");
    g.sample_size(10);
    for sp in db
        .all()
        .iter()
        .filter(|s| s.kind == zsum::species::Kind::Polyatomic)
    {
        g.bench_function(
            format!("{}_300_temperatures_10_1500_k_12_digits", sp.name),
            |b| b.iter(|| black_box(MolarGrid::compute(sp, &grid, &o).unwrap())),
        );
    }
    g.finish();
}

criterion_group!(benches, all_species, polyatomics);
criterion_main!(benches);
