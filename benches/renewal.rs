//! Renewal-model benchmarks: five maximum-likelihood fits, and five fits plus a 10 000-replicate
//! parametric bootstrap of the goodness of fit, on 300 simulated intervals with a censored open chron.

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::montecarlo::MonteCarlo;
use lodestone::reversals::{fit_models, goodness_of_fit, Fitted, Model, Sample};
use std::hint::black_box;

fn sample() -> Sample {
    let g = Fitted { model: Model::Gamma, params: [2.0, 0.125] };
    Sample::new(MonteCarlo::new(1, 300).run("bench", 0, |r, _| g.sample(r)), Some(0.78)).unwrap()
}

fn bench(c: &mut Criterion) {
    let s = sample();
    c.bench_function("five_fits_300", |b| b.iter(|| fit_models(black_box(&s), &Model::ALL)));
    let mut group = c.benchmark_group("bootstrap");
    group.sample_size(10);
    group.bench_function("five_fits_plus_gamma_gof_10000", |b| {
        b.iter(|| {
            let fits = fit_models(black_box(&s), &Model::ALL);
            let g = fits.get(Model::Gamma).unwrap().fitted;
            goodness_of_fit(&g, &s, &MonteCarlo::new(1, 10_000), 0).unwrap()
        })
    });
    for m in [Model::Exponential, Model::Weibull, Model::Lognormal, Model::InverseGaussian] {
        group.bench_function(format!("{}_gof_10000", m.name()), |b| {
            let f = m.fit(&s).unwrap();
            b.iter(|| goodness_of_fit(&f, black_box(&s), &MonteCarlo::new(1, 10_000), 0).unwrap())
        });
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
