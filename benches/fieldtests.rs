//! Benchmarks of the field tests at the sizes that matter in practice.
//! Run: `cargo bench --bench fieldtests`.

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::fieldtests::{bootstrap_overlap, fold_test, watson_v, FoldOptions};
use lodestone::montecarlo::MonteCarlo;
use lodestone::sphere::{Bedding, Direction, Vec3};
use lodestone::stats::FisherSampler;
use std::hint::black_box;

fn fisher(seed: u64, n: usize, mean: Direction, k: f64) -> Vec<Vec3> {
    let s = FisherSampler::new(mean, k).unwrap();
    MonteCarlo::new(seed, n).run("data", 1, |r, _| s.sample(r))
}

fn benches(c: &mut Criterion) {
    let a = fisher(1, 100, Direction { dec: 10.0, inc: 50.0 }, 30.0);
    let b = fisher(2, 100, Direction { dec: 10.0, inc: 50.0 }, 30.0);
    let mut g = c.benchmark_group("fieldtests");
    g.sample_size(10);
    // Reversal bootstrap: N = 200 directions (100 per mode), 10 000 resamples.
    g.bench_function("bootstrap_n200_10000", |bn| {
        let mc = MonteCarlo::new(1, 10_000);
        bn.iter(|| black_box(bootstrap_overlap(&a, &b, &mc, 0.95).unwrap()))
    });
    // V_w simulation with the same data, 10 000 simulated pairs.
    g.bench_function("watson_v_n200_10000", |bn| {
        let mc = MonteCarlo::new(1, 10_000);
        bn.iter(|| black_box(watson_v(&a, &b, &mc, 0.95).unwrap()))
    });
    // Fold test: N = 100 sites, 1 000 resamples × 161 untilting steps.
    let beds: Vec<Bedding> = (0..100)
        .map(|i| Bedding::from_dip_direction(if i % 2 == 0 { 90.0 } else { 270.0 }, 30.0, false).unwrap())
        .collect();
    let v: Vec<Vec3> = a.iter().zip(&beds).map(|(u, bd)| bd.retilt(*u)).collect();
    g.bench_function("fold_n100_1000x161", |bn| {
        let mc = MonteCarlo::new(1, 1000);
        bn.iter(|| black_box(fold_test(&v, &beds, &mc, &FoldOptions::default()).unwrap()))
    });
    g.finish();
}

criterion_group!(fieldtests, benches);
criterion_main!(fieldtests);
