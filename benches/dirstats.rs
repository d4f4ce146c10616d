//! Benchmarks of the non-Fisherian statistics: the elongation/inclination correction with 5 000
//! bootstrap pseudo-samples of 500 directions (issue 19's target: under 1 s on 2 cores), Kent's
//! ellipse, and the bootstrap ellipse.

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::dirstats::{apply_factor, bootstrap_ellipse, kent_ellipse, unflatten_search, BootstrapKind, Tk03};
use lodestone::montecarlo::MonteCarlo;
use lodestone::sphere::{Direction, Vec3};
use std::hint::black_box;

/// 500 directions from the TK03 model at 30° N, flattened with f = 0.6.
fn flattened() -> Vec<Direction> {
    let v = Tk03::standard().simulate(30.0, 500, 11, 0).unwrap();
    let d: Vec<Direction> = v.into_iter().map(|v| Direction::from_vector(v).unwrap()).collect();
    apply_factor(&d, 1.0 / 0.6).unwrap()
}

fn bench(c: &mut Criterion) {
    let d = flattened();
    let v: Vec<Vec3> = d.iter().map(|x| x.to_vector()).collect();
    c.bench_function("kent_ellipse_500", |b| b.iter(|| kent_ellipse(black_box(&v), 500.0, 0.95).unwrap()));
    let mut group = c.benchmark_group("bootstrap");
    group.sample_size(10);
    group.bench_function("unflatten_500_directions_5000_resamples", |b| {
        b.iter(|| unflatten_search(black_box(&d), &MonteCarlo::new(1, 5000), 0).unwrap())
    });
    group.bench_function("bootstrap_ellipse_500_directions_5000_resamples", |b| {
        b.iter(|| bootstrap_ellipse(black_box(&v), BootstrapKind::Resample, 0.95, &MonteCarlo::new(1, 5000)).unwrap())
    });
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
