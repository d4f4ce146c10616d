//! Timings of the Rust side of the renewal-model comparison (run by `benches/compare_renewal.py`,
//! which writes the shared input and runs the NumPy/SciPy baseline `benches/baseline_renewal.py` on
//! the same file). Not a criterion bench: it prints one `name seconds` line per item (median of the
//! runs after a warm-up; `_t1`/`_t2` for a one- and a two-thread rayon pool where the work is
//! parallel) and `check_*` lines (`key=value`) with the fitted parameters, log-likelihoods,
//! statistics and p-values, in the baseline's format.
//!
//! Run alone: `LODESTONE_COMPARE_DIR=DIR cargo bench --bench compare_renewal` (DIR holds
//! `renewal300.csv`, columns `length,censored`). `LODESTONE_COMPARE_ONLY=a,b` times only the items
//! whose names contain one of the given words (for a profile of one item), and skips the checks.

mod common;

use common::time;
use lodestone::montecarlo::MonteCarlo;
use lodestone::reversals::{fit_models, goodness_of_fit, Model, RenewalFits, Sample};
use std::hint::black_box;
use std::path::Path;

/// The complete lengths and the censored one (the row flagged 1), as the baseline reads them.
fn read_sample(path: &Path) -> Sample {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let (mut complete, mut censored) = (Vec::new(), None);
    for (i, line) in text.lines().enumerate().skip(1).filter(|(_, l)| !l.trim().is_empty()) {
        let cells: Vec<&str> = line.split(',').map(str::trim).collect();
        let x: f64 = cells[0].parse().unwrap_or_else(|e| panic!("{}:{}: length: {e}", path.display(), i + 1));
        if cells.get(1) == Some(&"1") {
            censored = Some(x);
        } else {
            complete.push(x);
        }
    }
    Sample::new(complete, censored).unwrap()
}

fn fits_and_gof(s: &Sample, models: &[Model]) -> RenewalFits {
    let fits = fit_models(s, &Model::ALL);
    for (i, &m) in models.iter().enumerate() {
        let f = fits.get(m).unwrap().fitted;
        black_box(goodness_of_fit(&f, s, &MonteCarlo::new(1, 10_000), i as u64).unwrap());
    }
    fits
}

fn main() {
    let dir = std::env::var("LODESTONE_COMPARE_DIR").unwrap_or_else(|_| "target/compare".into());
    let path = Path::new(&dir).join("renewal300.csv");
    if !path.exists() {
        eprintln!("no input {}: run benches/compare_renewal.py (it writes it)", path.display());
        return;
    }
    let s = read_sample(&path);
    let only: Option<Vec<String>> =
        std::env::var("LODESTONE_COMPARE_ONLY").ok().map(|v| v.split(',').map(str::to_string).collect());
    let wanted = |name: &str| match &only {
        None => true,
        Some(w) => w.iter().any(|w| name.contains(w.as_str())),
    };

    // The five fits are serial: 200 calls per timed run, so the clock's resolution does not matter.
    let per = 200;
    if wanted("five_fits_300") {
        let t = time(11, || {
            for _ in 0..per {
                black_box(fit_models(black_box(&s), &Model::ALL));
            }
        });
        println!("five_fits_300 {:.6}", t / per as f64);
    }

    let fits = fit_models(&s, &Model::ALL);
    for f in fits.fits.iter().filter(|_| only.is_none()) {
        let kv: Vec<String> = f.fitted.named_params().iter().map(|(k, v)| format!("{k}={v:.12e}")).collect();
        println!(
            "check_fit_{} {} loglik={:.12e} aic={:.12e} bic={:.12e} weight={:.12e}",
            f.fitted.model.name(),
            kv.join(" "),
            f.loglik,
            f.aic,
            f.bic,
            f.weight
        );
    }
    for fail in &fits.failures {
        println!("note_failed_{} {}", fail.model.name(), fail.reason.replace(' ', "_"));
    }
    if let Some(lr) = fits.lr_test.filter(|_| only.is_none()) {
        println!("check_lr statistic={:.12e} p_value={:.12e}", lr.statistic, lr.p_value);
    }
    for f in fits.fits.iter().filter(|_| only.is_none()) {
        let g = goodness_of_fit(&f.fitted, &s, &MonteCarlo::new(1, 10_000), 0).unwrap();
        println!(
            "check_gof_{} ks_d={:.12e} ks_p={:.12e} ad={:.12e} ad_p={:.12e} resamples={}",
            f.fitted.model.name(),
            g.ks_d,
            g.ks_p,
            g.ad,
            g.ad_p,
            g.resamples
        );
    }

    for threads in [1, 2] {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
        pool.install(|| {
            for f in fits.fits.iter().filter(|f| wanted(&format!("{}_gof_10000", f.fitted.model.name()))) {
                let m = f.fitted;
                let t = time(3, || goodness_of_fit(&m, black_box(&s), &MonteCarlo::new(1, 10_000), 0).unwrap());
                println!("{}_gof_10000_t{threads} {t:.6}", m.model.name());
            }
            if wanted("five_fits_plus_gamma_gof_10000") {
                let t = time(3, || fits_and_gof(black_box(&s), &[Model::Gamma]));
                println!("five_fits_plus_gamma_gof_10000_t{threads} {t:.6}");
            }
            if wanted("five_fits_plus_five_gof_10000") {
                let t = time(3, || fits_and_gof(black_box(&s), &Model::ALL));
                println!("five_fits_plus_five_gof_10000_t{threads} {t:.6}");
            }
        });
    }
}
