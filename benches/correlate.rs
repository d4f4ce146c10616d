//! Benchmark of the correlation of a polarity column to a time scale: a 40-zone column against a
//! 300-chron synthetic time scale. Run: `cargo bench --bench correlate`.

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::model::{Polarity, StratAxis, TimeScale};
use lodestone::reversals::{Fitted, Model};
use lodestone::simulate::{simulate_timescale, FirstPolarity, TimeScaleModel};
use lodestone::strat::{
    build_zones, classify, correlate, CorrelateOptions, ZoneColumn, DEFAULT_MIN_LEVELS, DEFAULT_THRESHOLD,
};
use std::hint::black_box;

/// A 300-chron scale (gamma intervals, mean 0.25 Myr, the first 300 chrons of an 80 Myr run) and a column sampled evenly in
/// time across the 40 chrons from the 100th on, at 12 m/Myr, 12 levels per chron on average.
fn inputs() -> (TimeScale, ZoneColumn) {
    let m = TimeScaleModel {
        model: Fitted::with_mean(Model::Gamma, 0.25, Some(1.5)).unwrap(),
        young: 0.0,
        span: 80.0,
        first: FirstPolarity::Fixed(Polarity::Normal),
        name_prefix: None,
    };
    let mut ts = simulate_timescale(&m, 7).unwrap();
    assert!(ts.chrons.len() >= 300, "{} chrons", ts.chrons.len());
    ts.chrons.truncate(300); // the chrons still tile time from the young end
    let (a0, a1) = (ts.chrons[100].young + 0.01, ts.chrons[139].old - 0.01);
    let n_levels = 480;
    let mut heights = Vec::new();
    let mut pol = Vec::new();
    for i in 0..n_levels {
        let age = a1 - (a1 - a0) * i as f64 / (n_levels - 1) as f64; // bottom (old) first
        let c = ts.chrons.iter().find(|c| c.young <= age && age < c.old).unwrap();
        let vgp = if c.polarity == Polarity::Normal { 75.0 } else { -75.0 };
        heights.push((a1 - age) * 12.0);
        pol.push(classify(vgp, DEFAULT_THRESHOLD));
    }
    (ts, build_zones(StratAxis::Height, &heights, &pol, DEFAULT_MIN_LEVELS).unwrap())
}

fn bench(c: &mut Criterion) {
    let (ts, col) = inputs();
    let t = std::time::Instant::now();
    let res = correlate(&col, &ts, &CorrelateOptions::default()).unwrap();
    eprintln!(
        "correlate bench: {} chrons, {} zones, {} candidates; one call {:.3} s",
        ts.chrons.len(),
        col.zones.len(),
        res.candidates.len(),
        t.elapsed().as_secs_f64()
    );
    let mut g = c.benchmark_group("correlate");
    g.sample_size(10);
    g.bench_function("zones40_chrons300", |b| {
        b.iter(|| black_box(correlate(&col, &ts, &CorrelateOptions::default()).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
