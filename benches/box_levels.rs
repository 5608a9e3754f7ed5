//! Box enumeration and counting speed (figures quoted in the README).

use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;
use std::time::Duration;
use zsum::exact::parse_rational;
use zsum::models::ParticleInBox;
use zsum::spectrum::{Budget, Spectrum};

fn levels(c: &mut Criterion) {
    let cube = ParticleInBox::cube(3).unwrap();
    let cut = parse_rational("1e6").unwrap();
    let mut g = c.benchmark_group("levels");
    g.sample_size(10).measurement_time(Duration::from_secs(10));
    g.bench_function("cube_up_to_1e6", |b| {
        b.iter(|| black_box(cube.levels_up_to(black_box(&cut)).unwrap().len()))
    });
    // The listing as it was before the blocked walk, under the same load, as
    // the figure the one above is compared with.
    g.bench_function("cube_up_to_1e6_reference", |b| {
        b.iter(|| {
            let levels = cube
                .classified_levels_reference(black_box(&cut), &Budget::default())
                .unwrap();
            black_box(
                levels
                    .into_iter()
                    .map(|c| c.level)
                    .collect::<Vec<_>>()
                    .len(),
            )
        })
    });
    let rect = ParticleInBox::new(vec![
        parse_rational("2").unwrap(),
        parse_rational("3").unwrap(),
        parse_rational("5").unwrap(),
    ])
    .unwrap();
    let cut_r = parse_rational("1e4").unwrap();
    g.bench_function("box_2_3_5_up_to_1e4", |b| {
        b.iter(|| black_box(rect.levels_up_to(black_box(&cut_r)).unwrap().len()))
    });
    let cut_s = parse_rational("1e4").unwrap();
    g.bench_function("cube_states_up_to_1e4", |b| {
        b.iter(|| {
            black_box(
                cube.levels_with_states(black_box(&cut_s), &Budget::default())
                    .unwrap()
                    .len(),
            )
        })
    });
    g.finish();
}

fn count(c: &mut Criterion) {
    let cube = ParticleInBox::cube(3).unwrap();
    let mut g = c.benchmark_group("count");
    g.sample_size(10).measurement_time(Duration::from_secs(30));
    for e in ["1e8", "1e10"] {
        let cut = parse_rational(e).unwrap();
        g.bench_function(format!("cube_up_to_{e}"), |b| {
            b.iter(|| black_box(cube.count_up_to(black_box(&cut)).unwrap()))
        });
    }
    // The default time budget still prices a cube count at the wedge walk's
    // 0.22·m steps and would refuse this one: give it an hour.
    let cut = parse_rational("1e12").unwrap();
    let hour = Budget::default().with_seconds(3600.0);
    g.bench_function("cube_up_to_1e12", |b| {
        b.iter(|| black_box(cube.count_up_to_within(black_box(&cut), &hour).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, levels, count);
criterion_main!(benches);
