//! Present-field benchmarks (issue targets: 26 global 1° grids of F at degree 13 in < 0.5 s on 2 cores;
//! `field series` 1900–2025 yearly in < 1 s).

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::field::{epoch_grids, field_series, FieldModel, SeriesOptions, DEFAULT_LOW_THRESHOLD};
use std::hint::black_box;

fn bench(c: &mut Criterion) {
    let model = FieldModel::igrf14();
    let mut group = c.benchmark_group("field");
    group.sample_size(10);
    group.bench_function("grids_26_epochs_1deg", |b| b.iter(|| epoch_grids(black_box(&model), 1.0).unwrap()));
    let opts = SeriesOptions::new(1900.0, 2025.0, 1.0, DEFAULT_LOW_THRESHOLD).unwrap();
    group.bench_function("series_1900_2025_yearly", |b| b.iter(|| field_series(black_box(&model), &opts).unwrap()));
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
