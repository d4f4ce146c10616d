//! Reversal statistics of a time scale: renewal-model fits and the hazard.

use crate::{invalid, run_detached, Outcome, Source};
use lodestone::montecarlo::MonteCarlo;
use lodestone::reversals::{self, Fitted, IntervalOptions, IntervalRecord, Model, CAUTIONS};
use lodestone::table::TimeScale;
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// Read a time scale and cut its intervals (the options of `intervals`/`hazard` on the command line).
fn load(input: &crate::Input<'_>, opt: &IntervalOptions) -> Outcome<IntervalRecord> {
    let ts = TimeScale::from_table(&input.table()?)?;
    Ok(reversals::intervals(&ts, opt)?)
}

/// The parameters of a fit as a dict with the contract's names.
fn params<'py>(py: Python<'py>, f: &Fitted) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    for (k, v) in f.named_params() {
        d.set_item(k, v)?;
    }
    Ok(d)
}

/// What the record says about itself: counts and the censored open chron.
fn record_dict<'py>(py: Python<'py>, rec: &IntervalRecord) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("n_intervals", rec.complete.len())?;
    d.set_item("censored", rec.censored)?;
    d.set_item("from", rec.from)?;
    d.set_item("to", rec.to)?;
    Ok(d)
}

/// Renewal-model fits by maximum likelihood (see `lodestone.fit_renewal`).
#[pyfunction]
#[pyo3(signature = (timescale, young = None, old = None, min_length = 0.0, censor = true))]
pub fn fit_renewal<'py>(
    py: Python<'py>,
    timescale: Source<'py>,
    young: Option<f64>,
    old: Option<f64>,
    min_length: f64,
    censor: bool,
) -> PyResult<Bound<'py, PyDict>> {
    let input = timescale.input();
    let opt = IntervalOptions { from: young, to: old, min_length, censor };
    let (rec, fits) = run_detached(py, None, || {
        let rec = load(&input, &opt)?;
        let fits = reversals::fit_models(&rec.sample()?, &Model::ALL);
        Ok((rec, fits))
    })?;
    let out = record_dict(py, &rec)?;
    let models = fits
        .fits
        .iter()
        .map(|f| {
            let d = PyDict::new(py);
            d.set_item("model", f.fitted.model.name())?;
            d.set_item("params", params(py, &f.fitted)?)?;
            d.set_item("loglik", f.loglik)?;
            d.set_item("aic", f.aic)?;
            d.set_item("bic", f.bic)?;
            d.set_item("weight", f.weight)?;
            d.set_item("mean_interval", f.fitted.mean())?;
            Ok(d)
        })
        .collect::<PyResult<Vec<_>>>()?;
    out.set_item("models", models)?;
    let failures: Vec<(&str, &str)> = fits.failures.iter().map(|f| (f.model.name(), f.reason.as_str())).collect();
    out.set_item("failures", failures)?;
    out.set_item("lr_statistic", fits.lr_test.map(|t| t.statistic))?;
    out.set_item("lr_p_value", fits.lr_test.map(|t| t.p_value))?;
    out.set_item("complete", rec.complete.iter().map(|iv| iv.duration()).collect::<Vec<_>>())?;
    Ok(out)
}

/// Hazard and P(reversal within `horizon` | none for `elapsed`) under each fitted model (see
/// `lodestone.hazard`); with `resamples > 0`, a bootstrap interval of the Akaike-weighted average.
#[pyfunction]
#[pyo3(signature = (timescale, elapsed = None, horizon = 0.1, young = None, old = None, min_length = 0.0,
                    censor = true, seed = 1, resamples = 1000, level = 0.95, threads = None))]
#[allow(clippy::too_many_arguments)]
pub fn hazard<'py>(
    py: Python<'py>,
    timescale: Source<'py>,
    elapsed: Option<f64>,
    horizon: f64,
    young: Option<f64>,
    old: Option<f64>,
    min_length: f64,
    censor: bool,
    seed: u64,
    resamples: usize,
    level: f64,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    let input = timescale.input();
    let opt = IntervalOptions { from: young, to: old, min_length, censor };
    let (rec, est) = run_detached(py, threads, || {
        let rec = load(&input, &opt)?;
        let elapsed = match (elapsed, &rec.open) {
            (Some(t), _) => t,
            (None, Some(o)) => o.duration(),
            (None, None) => return invalid("elapsed is needed: the window holds no open chron at the present"),
        };
        let sample = rec.sample()?;
        let fits = reversals::fit_models(&sample, &Model::ALL);
        let mut est = reversals::hazard_at(&fits, &sample, elapsed, horizon)?;
        if resamples > 0 {
            let mc = MonteCarlo::new(seed, resamples);
            // Stream 100, as on the command line, so that both give the same interval for a seed.
            est.interval = Some(reversals::averaged_interval(&sample, &Model::ALL, elapsed, horizon, level, &mc, 100)?);
        }
        Ok((rec, est))
    })?;
    let out = record_dict(py, &rec)?;
    let models = est
        .models
        .iter()
        .map(|m| {
            let d = PyDict::new(py);
            d.set_item("model", m.fitted.model.name())?;
            d.set_item("params", params(py, &m.fitted)?)?;
            d.set_item("weight", m.weight)?;
            d.set_item("hazard", m.hazard)?;
            d.set_item("survival", m.survival)?;
            d.set_item("p_within", m.p_within)?;
            d.set_item("cdf", m.cdf)?;
            Ok(d)
        })
        .collect::<PyResult<Vec<_>>>()?;
    out.set_item("models", models)?;
    out.set_item("elapsed", est.elapsed)?;
    out.set_item("horizon", est.horizon)?;
    out.set_item("averaged", est.averaged)?;
    out.set_item("low", est.interval.map(|b| b.low))?;
    out.set_item("high", est.interval.map(|b| b.high))?;
    out.set_item("level", level)?;
    out.set_item("percentile", est.percentile)?;
    out.set_item("cautions", CAUTIONS.to_vec())?;
    Ok(out)
}
