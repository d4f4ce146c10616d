//! Checks of the synthetic time scales, sections and project-folder writers.

use super::*;
use crate::model::{Polarity, StratAxis, TimeScale, Treatment};
use crate::montecarlo::MonteCarlo;
use crate::reversals::models::DEFAULT_SHAPE;
use crate::reversals::{Fitted, Model};
use crate::sphere::{Bedding, Direction, GeoPoint};
use crate::stats::fisher_mean;
use crate::table::{read_directions, GroupBy, Table};
use approx::assert_abs_diff_eq;

fn long_scale(model: Fitted, n_mean: f64, seed: u64) -> TimeScale {
    let m = TimeScaleModel {
        model,
        young: 0.0,
        span: n_mean * model.mean(),
        first: FirstPolarity::Fixed(Polarity::Normal),
        name_prefix: None,
    };
    simulate_timescale(&m, seed).unwrap()
}

/// Complete intervals only (the youngest and oldest chrons are cut by the ends of the span).
fn complete_lengths(ts: &TimeScale) -> Vec<f64> {
    let n = ts.chrons.len();
    ts.chrons[1..n - 1].iter().map(|c| c.duration()).collect()
}

#[test]
fn renewal_models_match_scipy_quantiles_and_means() {
    // Reference quantiles (25, 50, 75 %), means and standard deviations from SciPy 1.17.1:
    // stats.gamma(1.5, scale=0.25/1.5), stats.weibull_min(0.8, scale=0.3/special.gamma(1+1/0.8)),
    // stats.lognorm(s=0.9, scale=exp(log(0.25)-0.405)), stats.invgauss(mu=0.5, scale=0.5) (mean 0.25,
    // shape 0.5), stats.expon(scale=0.25); `.ppf([0.25, 0.5, 0.75])`, `.mean()`, `.std()`.
    let cases: [(Fitted, [f64; 3], f64, f64); 5] = [
        (
            Fitted::with_mean(Model::Gamma, 0.25, Some(1.5)).unwrap(),
            [0.10104440858713905, 0.19716449036461148, 0.3423620779693593],
            0.25,
            0.2041241452319315,
        ),
        (
            Fitted::with_mean(Model::Weibull, 0.3, Some(0.8)).unwrap(),
            [0.05578676222491856, 0.16746420200265164, 0.3982992410596125],
            0.3,
            0.3781538360421324,
        ),
        (
            Fitted::with_mean(Model::Lognormal, 0.25, Some(0.9)).unwrap(),
            [0.09086911211161565, 0.1667442027146186, 0.30597447793681837],
            0.25,
            0.2792745050434778,
        ),
        (
            Fitted::with_mean(Model::InverseGaussian, 0.25, Some(0.5)).unwrap(),
            [0.12955950841078287, 0.20108476032400036, 0.31583830603997937],
            0.25,
            0.1767766952966369,
        ),
        (
            Fitted::with_mean(Model::Exponential, 0.25, None).unwrap(),
            [0.07192051811294523, 0.17328679513998632, 0.34657359027997264],
            0.25,
            0.25,
        ),
    ];
    for (seed, (model, q, mean, sd)) in cases.into_iter().enumerate() {
        assert_abs_diff_eq!(model.mean(), mean, epsilon = 1e-12);
        let ts = long_scale(model, 4000.0, 100 + seed as u64);
        let x = complete_lengths(&ts);
        let n = x.len() as f64;
        assert!(n > 3500.0, "{}: only {n} intervals", model.model.name());
        // The empirical CDF at the reference quantile is binomial: within 4 standard errors.
        for (p, qv) in [0.25, 0.5, 0.75].into_iter().zip(q) {
            let f = x.iter().filter(|&&v| v <= qv).count() as f64 / n;
            let se = (p * (1.0 - p) / n).sqrt();
            assert!((f - p).abs() < 4.0 * se, "{}: F({qv}) = {f}, expected {p} ± {}", model.model.name(), 4.0 * se);
        }
        let m = x.iter().sum::<f64>() / n;
        assert!((m - mean).abs() < 4.0 * sd / n.sqrt(), "{}: mean {m}, model {mean}", model.model.name());
    }
}

#[test]
fn weibull_scale_follows_the_gamma_function() {
    // SciPy 1.17.1: 0.3 / scipy.special.gamma(1 + 1/0.8) = 0.26478303631700095.
    let w = Fitted::with_mean(Model::Weibull, 0.3, Some(0.8)).unwrap();
    assert_eq!(w.model, Model::Weibull);
    let [shape, scale] = w.params;
    assert_abs_diff_eq!(scale, 0.26478303631700095, epsilon = 1e-12);
    assert_eq!(shape, 0.8);
    assert!(Fitted::with_mean(Model::Gamma, 0.25, None).is_err());
    assert!(Model::from_name("pareto").is_err());
    assert_eq!(Model::from_name("inverse_gaussian").unwrap(), Model::InverseGaussian);
    assert!(Fitted::with_mean(Model::Gamma, -1.0, Some(1.0)).is_err());
}

#[test]
fn timescale_alternates_tiles_and_reads_back_exactly() {
    let model = Fitted::with_mean(Model::Gamma, 0.25, Some(1.5)).unwrap();
    let m = TimeScaleModel {
        model,
        young: 0.0,
        span: 12.0,
        first: FirstPolarity::Fixed(Polarity::Reversed),
        name_prefix: Some("Q".into()),
    };
    let ts = simulate_timescale(&m, 7).unwrap();
    assert_eq!(ts.chrons[0].polarity, Polarity::Reversed);
    assert_eq!(ts.chrons[0].young, 0.0);
    assert_abs_diff_eq!(ts.old(), 12.0, epsilon = 1e-12);
    for w in ts.chrons.windows(2) {
        assert_ne!(w[0].polarity, w[1].polarity);
        assert_eq!(w[0].old, w[1].young);
        assert!(w[0].old > w[0].young);
    }
    assert_eq!(ts.chrons[2].name.as_deref(), Some("Q3"));
    let text = timescale_csv(&ts, "synthetic");
    let back = TimeScale::from_table(&Table::parse("t.csv", text.as_bytes()).unwrap()).unwrap();
    assert_eq!(back.chrons.len(), ts.chrons.len());
    for (a, b) in back.chrons.iter().zip(&ts.chrons) {
        assert_abs_diff_eq!(a.young, b.young, epsilon = 1e-12);
        assert_abs_diff_eq!(a.old, b.old, epsilon = 1e-12);
        assert_eq!(a.polarity, b.polarity);
        assert_eq!(a.name, b.name);
    }
    // Same seed, same scale; another seed, another scale.
    assert_eq!(simulate_timescale(&m, 7).unwrap(), ts);
    assert_ne!(simulate_timescale(&m, 8).unwrap().chrons, ts.chrons);
    // Random first polarity: both occur over a few seeds.
    let r = TimeScaleModel { first: FirstPolarity::Random, ..m };
    let firsts: Vec<Polarity> = (0..16).map(|s| simulate_timescale(&r, s).unwrap().chrons[0].polarity).collect();
    assert!(firsts.contains(&Polarity::Normal) && firsts.contains(&Polarity::Reversed));
}

#[test]
fn youngest_chron_is_length_biased_not_a_fresh_interval() {
    // Renewal theory (Cox 1962, ch. 5): the part of the interval straddling a fixed time that lies on
    // one side of it (a recurrence time) has mean E[X²]/(2 E[X]) in a process already running.
    // Exponential model: memoryless, mean 1/rate = 0.25 Myr (a sanity check; a fresh start agrees).
    let model = Fitted::with_mean(Model::Exponential, 0.25, None).unwrap();
    let m = TimeScaleModel {
        model,
        young: 0.0,
        span: 5.0,
        first: FirstPolarity::Fixed(Polarity::Normal),
        name_prefix: None,
    };
    let n = 600;
    let first: Vec<f64> = (0..n).map(|s| simulate_timescale(&m, 1000 + s).unwrap().chrons[0].duration()).collect();
    let mean = first.iter().sum::<f64>() / n as f64;
    // Standard error 0.25/sqrt(600) ≈ 0.0102; allow 4 of them.
    assert!((mean - 0.25).abs() < 0.041, "mean youngest chron {mean}");
    // For a gamma model with shape 4 the backward recurrence time has mean E[X²]/(2E[X]) =
    // (1 + 1/k)·mean/2 = 0.15625 Myr for mean 0.25 (Cox 1962, eq. 5.3), against 0.25 for a fresh start.
    let g = TimeScaleModel { model: Fitted::with_mean(Model::Gamma, 0.25, Some(4.0)).unwrap(), ..m };
    let first: Vec<f64> = (0..n).map(|s| simulate_timescale(&g, 5000 + s).unwrap().chrons[0].duration()).collect();
    let mean = first.iter().sum::<f64>() / n as f64;
    let var = first.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n - 1) as f64;
    assert!((mean - 0.15625).abs() < 4.0 * (var / n as f64).sqrt(), "gamma(4) youngest chron mean {mean}");
}

fn demo_model() -> SectionModel {
    let thermal = treatment_defaults(Treatment::Thermal).unwrap();
    SectionModel {
        site: GeoPoint::new(-38.2, 146.7).unwrap(),
        base_age: 2.6,
        top_age: 0.4,
        rates: parse_rates("3.0@1.5,1.5").unwrap(),
        spacing: 1.0,
        specimens: 4,
        kappa: 60.0,
        level_kappa: None,
        bedding: vec![
            Bedding::from_dip_direction(120.0, 20.0, false).unwrap(),
            Bedding::from_dip_direction(300.0, 35.0, false).unwrap(),
        ],
        treatment: Treatment::Thermal,
        steps: thermal.steps,
        characteristic: thermal.characteristic,
        overprint: Some(Overprint {
            direction: Direction::new(0.0, -56.0).unwrap(),
            ratio: 0.6,
            unblocking: thermal.overprint,
        }),
        moment: 2e-8,
        moment_sigma: 0.25,
        noise: 0.004,
        site_prefix: "KR".into(),
        axis: StratAxis::Height,
    }
}

fn fixed_scale() -> TimeScale {
    let text =
        "young,old,polarity\n0,0.78,N\n0.78,0.99,R\n0.99,1.07,N\n1.07,1.78,R\n1.78,1.94,N\n1.94,2.58,R\n2.58,3.0,N\n";
    TimeScale::from_table(&Table::parse("ts.csv", text.as_bytes()).unwrap()).unwrap()
}

#[test]
fn levels_follow_the_rate_history_and_the_time_scale() {
    let m = demo_model();
    let ts = fixed_scale();
    let sec = simulate_section(&m, &ts, &MonteCarlo::new(3, 0)).unwrap();
    // Hand arithmetic: 3 cm/kyr × 1.1 Myr = 33 m, then 1.5 cm/kyr × 1.1 Myr = 16.5 m: 49.5 m, so 50
    // levels at 0.5, 1.5, …, 49.5 m (the last one at the top).
    assert_abs_diff_eq!(sec.history.thickness(), 49.5, epsilon = 1e-9);
    assert_eq!(sec.levels.len(), 50);
    assert_abs_diff_eq!(sec.levels[10].age, 2.6 - 10.5 / 30.0, epsilon = 1e-12);
    assert_abs_diff_eq!(sec.levels[40].age, 1.5 - 7.5 / 15.0, epsilon = 1e-12);
    for lv in &sec.levels {
        let c = ts.chrons.iter().find(|c| c.young <= lv.age && lv.age < c.old).unwrap();
        assert_eq!(c.polarity, lv.polarity, "{} at {} Ma", lv.site, lv.age);
    }
    // True ties: the 0.78, 0.99, 1.07, 1.78, 1.94 and 2.58 Ma boundaries lie inside 0.4–2.6 Ma.
    let ages: Vec<f64> = sec.ties.iter().map(|t| t.age).collect();
    assert_eq!(ages, vec![0.78, 0.99, 1.07, 1.78, 1.94, 2.58]);
    assert_abs_diff_eq!(sec.ties[3].height, (2.6 - 1.78) * 30.0, epsilon = 1e-9);
    assert_eq!(sec.chrons.len(), 7);
    assert!(!sec.chrons[0].complete && sec.chrons[1].complete);
    assert_eq!(sec.chrons.iter().map(|c| c.n_levels).sum::<usize>(), 50);
    assert_eq!(sec.specimens.len(), 50 * 4);
}

#[test]
fn characteristic_directions_recover_the_axial_dipole_within_the_fisher_spread() {
    let m = SectionModel { specimens: 6, spacing: 0.5, ..demo_model() };
    let sec = simulate_section(&m, &fixed_scale(), &MonteCarlo::new(11, 0)).unwrap();
    // Above 300 °C the overprint is gone and what remains is the characteristic component scaled by
    // its remaining fraction: the 350 °C direction is the characteristic direction plus noise.
    let i350 = m.steps.iter().position(|&s| s == 350.0).unwrap();
    let mut tilt = Vec::new();
    for sp in &sec.specimens {
        let lv = &sec.levels[sp.level];
        let v = lv.bedding.unwrap().untilt(sp.steps[i350].direction.unwrap().to_vector());
        let d = Direction::from_vector(v).unwrap();
        tilt.push(if lv.polarity == Polarity::Reversed { d.antipode() } else { d });
    }
    let f = fisher_mean(&tilt, 0.95).unwrap();
    let truth = m.dipole_direction(Polarity::Normal);
    // Axial dipole at 38.2° S: I = atan(2 tan(−38.2°)) = −57.55° (dipole formula, common practice).
    assert_abs_diff_eq!(truth.inc, (2.0 * (-38.2f64).to_radians().tan()).atan().to_degrees(), epsilon = 1e-12);
    let mean = f.mean.unwrap();
    assert!(mean.angle_to(truth) < f.alpha.unwrap(), "mean {mean:?} vs {truth:?}, a95 {:?}", f.alpha);
    // Fisher's k = (N−1)/(N−R) estimates κ = 60 with relative standard error ≈ 1/√N (N ≈ 600).
    let k = f.k.unwrap().0;
    assert!((k - 60.0).abs() < 0.2 * 60.0, "k = {k}");
    // In geographic coordinates the two bedding attitudes pull the directions apart (fold test
    // material): the geographic mean is more scattered.
    let geo: Vec<Direction> = sec
        .specimens
        .iter()
        .map(|sp| {
            let d = sp.steps[i350].direction.unwrap();
            if sec.levels[sp.level].polarity == Polarity::Reversed {
                d.antipode()
            } else {
                d
            }
        })
        .collect();
    assert!(fisher_mean(&geo, 0.95).unwrap().k.unwrap().0 < 0.5 * k);
}

#[test]
fn overprint_is_the_vector_removed_below_its_unblocking_maximum() {
    let m = demo_model();
    let sec = simulate_section(&m, &fixed_scale(), &MonteCarlo::new(5, 0)).unwrap();
    // Up to 250 °C the characteristic component is intact, so NRM − (250 °C step) is the part of the
    // overprint removed: its direction is the overprint's (vector subtraction, common practice).
    let i250 = m.steps.iter().position(|&s| s == 250.0).unwrap();
    let over = m.overprint.unwrap().direction;
    for sp in sec.specimens.iter().take(20) {
        let vec = |k: usize| sp.steps[k].direction.unwrap().to_vector() * sp.steps[k].moment;
        let removed = Direction::from_vector(vec(0) - vec(i250)).unwrap();
        assert!(removed.angle_to(over) < 3.0, "{}: {removed:?}", sp.name);
        // Moments fall with treatment beyond the overprint.
        assert!(sp.steps.last().unwrap().moment < sp.steps[i250].moment);
    }
}

#[test]
fn project_tables_pass_the_readers_and_repeat_byte_for_byte() {
    let m = demo_model();
    let ts = fixed_scale();
    let run = |threads: usize| {
        rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap().install(|| {
            let sec = simulate_section(&m, &ts, &MonteCarlo::new(21, 0)).unwrap();
            (steps_csv(&m, &sec, "synthetic"), sampling_csv(&m, &sec, "synthetic"))
        })
    };
    let (steps, sampling) = run(1);
    assert_eq!((steps.clone(), sampling.clone()), run(2));
    let t = Table::parse("steps.csv", steps.as_bytes()).unwrap();
    let set = read_directions(&t, &GroupBy::Default).unwrap();
    assert_eq!(set.records.len(), 50 * 4 * m.steps.len());
    assert_eq!(set.axis, Some(StratAxis::Height));
    for c in ["specimen", "step", "treatment", "moment"] {
        assert!(t.col(c).is_some(), "{c}");
    }
    let s = Table::parse("sampling.csv", sampling.as_bytes()).unwrap();
    assert_eq!(s.rows.len(), 50);
    let b = crate::table::read_bedding(&s, &s.rows[1]).unwrap().unwrap();
    assert_eq!((b.dip_dir, b.dip), (300.0, 35.0));
    let sec_other = simulate_section(&m, &ts, &MonteCarlo::new(22, 0)).unwrap();
    assert_ne!(steps_csv(&m, &sec_other, "synthetic"), steps);
    // A core: depth below the top instead of height.
    let core = SectionModel { axis: StratAxis::Depth, ..m.clone() };
    let sec = simulate_section(&core, &ts, &MonteCarlo::new(21, 0)).unwrap();
    let t = Table::parse("steps.csv", steps_csv(&core, &sec, "").as_bytes()).unwrap();
    let set = read_directions(&t, &GroupBy::Default).unwrap();
    assert_eq!(set.axis, Some(StratAxis::Depth));
    assert_abs_diff_eq!(set.records[0].position.unwrap(), 49.0, epsilon = 1e-9);
}

#[test]
fn the_project_folder_holds_every_file_and_the_truth_reads_back() {
    let m = demo_model();
    let ts = fixed_scale();
    let sec = simulate_section(&m, &ts, &MonteCarlo::new(21, 0)).unwrap();
    let source = TimeScaleSource::File("scales/ferrow.csv".into());
    let files = project_files(&m, &sec, &ts, &source, 21).unwrap();
    let names: Vec<_> = files.iter().map(|f| f.0).collect();
    assert_eq!(names, [STEPS_FILE, SAMPLING_FILE, TIMESCALE_FILE, SETTINGS_FILE, TRUTH_FILE]);
    assert_eq!(
        files[0].1,
        steps_csv(&m, &sec, &files[0].1.lines().take(2).map(|l| &l[2..]).collect::<Vec<_>>().join("\n"))
    );
    assert!(files[2].1.contains(r#"Source: {"file":"scales/ferrow.csv"}"#), "{}", files[2].1);
    let back = TimeScale::from_table(&Table::parse(TIMESCALE_FILE, files[2].1.as_bytes()).unwrap()).unwrap();
    assert_eq!(back.chrons.len(), ts.chrons.len());
    let truth: serde_json::Value = serde_json::from_str(&files[4].1).unwrap();
    assert_eq!(truth["seed"], 21);
    assert_eq!(truth["levels"].as_array().unwrap().len(), sec.levels.len());
    assert_eq!(truth["specimens"].as_array().unwrap().len(), sec.specimens.len());
    assert_eq!(truth["model"]["treatment"], "thermal");
    assert_eq!(truth["timescale"]["file"], "scales/ferrow.csv");
}

#[test]
fn section_edges_are_refused_with_reasons() {
    let ts = fixed_scale();
    let mc = MonteCarlo::new(1, 0);
    let bad = |m: SectionModel| simulate_section(&m, &ts, &mc).unwrap_err().to_string();
    assert!(bad(SectionModel { base_age: 3.5, ..demo_model() }).contains("time scale covers"));
    assert!(bad(SectionModel { spacing: 100.0, ..demo_model() }).contains("no level"));
    assert!(bad(SectionModel { specimens: 0, ..demo_model() }).contains("specimens"));
    assert!(bad(SectionModel { steps: vec![0.0, 300.0, 600.0], ..demo_model() }).contains("removes the whole"));
    assert!(bad(SectionModel { steps: vec![10.0, 300.0], ..demo_model() }).contains("start at 0"));
    assert!(bad(SectionModel { kappa: 0.0, ..demo_model() }).contains("kappa"));
    assert!(bad(SectionModel { site_prefix: "K,R".into(), ..demo_model() }).contains("site prefix"));
    assert!(bad(SectionModel { treatment: Treatment::Nrm, ..demo_model() }).contains("stepwise"));
    // One level, one specimen, flat bedding, no overprint, no noise: still fine.
    let one =
        SectionModel { spacing: 40.0, specimens: 1, bedding: vec![], overprint: None, noise: 0.0, ..demo_model() };
    let sec = simulate_section(&one, &ts, &mc).unwrap();
    assert_eq!(sec.levels.len(), 1);
    assert!(sec.levels[0].bedding.is_none());
}

#[test]
fn settings_file_parses_and_names_lines() {
    let text = settings_text(42, "a comment");
    let s = Settings::parse("settings.toml", &text).unwrap();
    assert_eq!(s.integer("seed", u64::MAX).unwrap(), Some(42));
    assert_eq!(s.number("confidence", 0.0, 1.0).unwrap(), Some(0.95));
    let s = Settings::parse("x.toml", "# c\nname = \"Kerrow # 2\" # note\nflag = true\nn = 1_000\n").unwrap();
    assert_eq!(s.text("name").unwrap(), Some("Kerrow # 2"));
    assert_eq!(s.boolean("flag").unwrap(), Some(true));
    assert_eq!(s.integer("n", 10_000).unwrap(), Some(1000));
    assert_eq!(s.unknown_keys(&["name", "flag"]), vec!["n"]);
    let e = Settings::parse("x.toml", "a = 1\n\nb = oops\n").unwrap_err().to_string();
    assert!(e.contains("x.toml:3") && e.contains("'b'"), "{e}");
    let e = Settings::parse("x.toml", "a = 1\na = 2\n").unwrap_err().to_string();
    assert!(e.contains("first on line 1"), "{e}");
    let s = Settings::parse("x.toml", "confidence = 1.5\n").unwrap();
    assert!(s.number("confidence", 0.0, 1.0).unwrap_err().to_string().contains("x.toml:1"));
    assert!(Settings::parse("x.toml", "just words\n").is_err());
}

#[test]
fn a_stated_model_writes_the_contract_names() {
    // The contract's parameter names of each family (README, reversal statistics); the lognormal μ is
    // ln(mean) − σ²/2 so that exp(μ + σ²/2) is the mean (Johnson, Kotz & Balakrishnan 1994, ch. 14).
    let g = serde_json::to_value(Fitted::with_mean(Model::Gamma, 0.25, Some(2.0)).unwrap()).unwrap();
    assert_eq!(g, serde_json::json!({"model": "gamma", "shape": 2.0, "scale": 0.125}));
    let e = serde_json::to_value(Fitted::with_mean(Model::Exponential, 0.25, None).unwrap()).unwrap();
    assert_eq!(e, serde_json::json!({"model": "exponential", "rate": 4.0}));
    let l = Fitted::with_mean(Model::Lognormal, 0.25, Some(0.9)).unwrap();
    let v = serde_json::to_value(l).unwrap();
    assert_eq!(v.as_object().unwrap().keys().collect::<Vec<_>>(), ["model", "mu", "sigma"]);
    assert_abs_diff_eq!(v["mu"].as_f64().unwrap(), 0.25f64.ln() - 0.405, epsilon = 1e-15);
    // A model built by hand with a parameter outside its domain is refused before sampling.
    let bad = TimeScaleModel {
        model: Fitted { model: Model::Gamma, params: [-1.0, 0.1] },
        young: 0.0,
        span: 1.0,
        first: FirstPolarity::Random,
        name_prefix: None,
    };
    assert!(matches!(simulate_timescale(&bad, 1), Err(crate::Error::OutOfRange { name: "shape", .. })));
    assert!(treatment_defaults(Treatment::Nrm).is_err());
}

#[test]
fn settings_default_the_shape_and_refuse_it_for_the_exponential() {
    let g = Fitted::from_settings(Model::Gamma, 0.25, None).unwrap();
    assert_eq!(g, Fitted::with_mean(Model::Gamma, 0.25, Some(DEFAULT_SHAPE)).unwrap());
    assert_abs_diff_eq!(g.mean(), 0.25, epsilon = 1e-12);
    assert!(Fitted::from_settings(Model::Exponential, 0.25, None).is_ok());
    assert!(matches!(
        Fitted::from_settings(Model::Exponential, 0.25, Some(2.0)),
        Err(crate::Error::Invalid { quantity: "shape", .. })
    ));
    assert!(Fitted::from_settings(Model::Weibull, -1.0, None).is_err());
}

#[test]
fn a_section_without_a_time_scale_gets_one_mean_interval_below_its_base() {
    // The one rule of the verb and the Python package: the drawn scale spans base + one mean interval,
    // and so reaches below the section's base for every seed.
    assert_eq!(section_timescale_span(2.5, 0.25), 2.75);
    for seed in 1..20 {
        let m = TimeScaleModel {
            model: Fitted::from_settings(Model::Gamma, 0.25, None).unwrap(),
            young: 0.0,
            span: section_timescale_span(2.5, 0.25),
            first: FirstPolarity::Fixed(Polarity::Normal),
            name_prefix: None,
        };
        let ts = simulate_timescale(&m, seed).unwrap();
        assert!(ts.chrons.last().unwrap().old >= 2.5, "seed {seed}");
    }
}
