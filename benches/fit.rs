//! Fitting assigned levels (filled by the fit work).
use criterion::{criterion_group, criterion_main, Criterion};
fn fit(_c: &mut Criterion) {}
criterion_group!(benches, fit);
criterion_main!(benches);
