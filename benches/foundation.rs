//! Benchmarks of the foundation: Fisher mean of 10⁶ directions, and the table reader (rows per second).

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use lodestone::sphere::Direction;
use lodestone::stats::{fisher_from_vectors, fisher_mean, FisherSampler};
use lodestone::table::{read_directions, GroupBy, Table};
use std::hint::black_box;

fn sample(n: usize) -> Vec<Direction> {
    let s = FisherSampler::new(Direction { dec: 10.0, inc: 45.0 }, 30.0).unwrap();
    let mut rng = lodestone::montecarlo::replicate_rng(1, 0, 0);
    (0..n).map(|_| s.sample_direction(&mut rng)).collect()
}

fn fisher(c: &mut Criterion) {
    let d = sample(1_000_000);
    let v: Vec<_> = d.iter().map(|x| x.to_vector()).collect();
    let mut g = c.benchmark_group("fisher_mean");
    g.throughput(Throughput::Elements(d.len() as u64));
    g.sample_size(20);
    g.bench_function("directions_1e6", |b| b.iter(|| fisher_mean(black_box(&d), 0.95).unwrap()));
    g.bench_function("vectors_1e6", |b| b.iter(|| fisher_from_vectors(black_box(v.iter().copied()), 0.95).unwrap()));
    g.finish();
}

fn reader(c: &mut Criterion) {
    let d = sample(100_000);
    let mut text = String::from("site,specimen,dec,inc,lat,lon,height\n");
    for (i, x) in d.iter().enumerate() {
        text.push_str(&format!("S{},S{}-{},{:.1},{:.1},41.6,243.9,{}\n", i / 10, i / 10, i % 10, x.dec, x.inc, i / 10));
    }
    let bytes = text.into_bytes();
    let mut g = c.benchmark_group("table_reader");
    g.throughput(Throughput::Elements(d.len() as u64));
    g.sample_size(10);
    g.bench_function("parse_100k_rows", |b| b.iter(|| Table::parse("bench.csv", black_box(&bytes)).unwrap()));
    let t = Table::parse("bench.csv", &bytes).unwrap();
    g.bench_function("typed_directions_100k_rows", |b| {
        b.iter(|| read_directions(black_box(&t), &GroupBy::Default).unwrap())
    });
    g.finish();
}

criterion_group!(benches, fisher, reader);
criterion_main!(benches);
