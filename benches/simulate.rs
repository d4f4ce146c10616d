//! Timing of the synthetic generators: a renewal time scale and a sampled section.

use criterion::{criterion_group, criterion_main, Criterion};
use lodestone::model::{Polarity, StratAxis, Treatment};
use lodestone::montecarlo::MonteCarlo;
use lodestone::reversals::{Fitted, Model};
use lodestone::simulate::{
    parse_rates, simulate_section, simulate_timescale, treatment_defaults, FirstPolarity, SectionModel, TimeScaleModel,
};
use lodestone::sphere::{Bedding, GeoPoint};
use std::hint::black_box;

fn scale(span: f64) -> TimeScaleModel {
    TimeScaleModel {
        model: Fitted::with_mean(Model::Gamma, 0.25, Some(1.5)).unwrap(),
        young: 0.0,
        span,
        first: FirstPolarity::Fixed(Polarity::Normal),
        name_prefix: None,
    }
}

fn benches(c: &mut Criterion) {
    let long = scale(2500.0); // about 10 000 chrons
    c.bench_function("timescale_10k_chrons", |b| b.iter(|| simulate_timescale(black_box(&long), 1).unwrap()));
    let ts = simulate_timescale(&scale(10.0), 1).unwrap();
    // 500 levels × 5 specimens × 12 steps = 30 000 measurements.
    let model = SectionModel {
        site: GeoPoint::new(-38.2, 146.7).unwrap(),
        base_age: 5.0,
        top_age: 0.0,
        rates: parse_rates("1").unwrap(),
        spacing: 0.1,
        specimens: 5,
        kappa: 40.0,
        level_kappa: Some(50.0),
        bedding: vec![Bedding::from_dip_direction(120.0, 20.0, false).unwrap()],
        treatment: Treatment::Thermal,
        steps: treatment_defaults(Treatment::Thermal).unwrap().steps,
        characteristic: treatment_defaults(Treatment::Thermal).unwrap().characteristic,
        overprint: None,
        moment: 1e-8,
        moment_sigma: 0.25,
        noise: 0.005,
        site_prefix: "B".into(),
        axis: StratAxis::Height,
    };
    c.bench_function("section_500_levels_x5", |b| {
        b.iter(|| simulate_section(black_box(&model), &ts, &MonteCarlo::new(1, 0)).unwrap())
    });
}

criterion_group!(group, benches);
criterion_main!(group);
