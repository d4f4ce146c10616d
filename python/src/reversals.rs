//! Reversal statistics of a time scale: renewal-model fits and the hazard.

use crate::{arg_error, invalid, run_detached, Outcome, Source};
use lodestone::model::TimeScale;
use lodestone::montecarlo::MonteCarlo;
use lodestone::present::{cautions, rate::rate_sheet};
use lodestone::reversals::{self, EdgeReading, Fitted, IntervalOptions, IntervalRecord, Model};
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// Read a time scale and cut its intervals (the options of `intervals`/`hazard` on the command line).
fn load(input: &crate::Input<'_>, opt: &IntervalOptions) -> Outcome<IntervalRecord> {
    let ts = TimeScale::from_table(&input.table()?)?;
    Ok(reversals::intervals(&ts, opt)?)
}

/// The window options; `old_edge` as on the command line (`complete`, `censored`, `left-out`; None
/// for the default rule).
fn options(
    young: Option<f64>,
    old: Option<f64>,
    min_length: f64,
    censor: bool,
    old_edge: Option<&str>,
) -> PyResult<IntervalOptions> {
    let old_edge = match old_edge {
        None => None,
        Some("complete") => Some(EdgeReading::Complete),
        Some("censored") => Some(EdgeReading::Censored),
        Some("left-out" | "left_out") => Some(EdgeReading::LeftOut),
        Some(other) => {
            return Err(arg_error(format!("old_edge must be 'complete', 'censored' or 'left-out', got '{other}'")))
        }
    };
    Ok(IntervalOptions { from: young, to: old, min_length, censor, old_edge })
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
    d.set_item("censored_old", rec.censored_old)?;
    d.set_item("old_edge", rec.old_reading.name())?;
    d.set_item("from", rec.from)?;
    d.set_item("to", rec.to)?;
    Ok(d)
}

/// Renewal-model fits by maximum likelihood (see `lodestone.fit_renewal`).
#[pyfunction]
#[pyo3(signature = (timescale, young = None, old = None, min_length = 0.0, censor = true, old_edge = None))]
pub fn fit_renewal<'py>(
    py: Python<'py>,
    timescale: Source<'py>,
    young: Option<f64>,
    old: Option<f64>,
    min_length: f64,
    censor: bool,
    old_edge: Option<&str>,
) -> PyResult<Bound<'py, PyDict>> {
    let input = timescale.input();
    let opt = options(young, old, min_length, censor, old_edge)?;
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
                    censor = true, old_edge = None, seed = 1, resamples = 1000, level = 0.95, threads = None))]
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
    old_edge: Option<&str>,
    seed: u64,
    resamples: usize,
    level: f64,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    let input = timescale.input();
    let opt = options(young, old, min_length, censor, old_edge)?;
    let (rec, assessed) = run_detached(py, threads, || {
        let rec = load(&input, &opt)?;
        let elapsed = match rec.elapsed(elapsed) {
            Ok(t) => t,
            Err(e) => return invalid(format!("elapsed is needed: {e}")),
        };
        let sample = rec.sample()?;
        let fits = reversals::fit_models(&sample, &Model::ALL);
        // The stream and rule of every front end, so that all give the same interval for a seed.
        let mc = (resamples > 0).then(|| MonteCarlo::new(seed, resamples));
        let assessed = reversals::assess_hazard(&fits, &sample, elapsed, horizon, level, mc.as_ref())?;
        Ok((rec, assessed))
    })?;
    let est = &assessed.estimate;
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
    out.set_item("cautions", cautions::REVERSALS.to_vec())?;
    out.set_item("notes", assessed.interval_note().into_iter().collect::<Vec<_>>())?;
    Ok(out)
}

/// Reversal rate through time with the Laplace trend test and the clustering test (see
/// `lodestone.reversal_rate`); a test that cannot be computed comes back as its reason.
#[pyfunction]
#[pyo3(signature = (timescale, young = None, old = None, min_length = 0.0, censor = true, old_edge = None,
                    window = 1.0, step = None, level = 0.95))]
#[allow(clippy::too_many_arguments)]
pub fn reversal_rate<'py>(
    py: Python<'py>,
    timescale: Source<'py>,
    young: Option<f64>,
    old: Option<f64>,
    min_length: f64,
    censor: bool,
    old_edge: Option<&str>,
    window: f64,
    step: Option<f64>,
    level: f64,
) -> PyResult<Bound<'py, PyDict>> {
    let input = timescale.input();
    let opt = options(young, old, min_length, censor, old_edge)?;
    let (rec, sum) = run_detached(py, None, || {
        let rec = load(&input, &opt)?;
        let sum = reversals::rate_summary(&rec.reversals, rec.from, rec.to, window, step, level)?;
        Ok((rec, sum))
    })?;
    let out = record_dict(py, &rec)?;
    out.set_item("rate", crate::sheets::columns(py, &rate_sheet(&sum.points, ""))?)?;
    out.set_item("reversals", rec.reversals.clone())?;
    out.set_item("window", window)?;
    out.set_item("step", sum.step)?;
    out.set_item("level", level)?;
    match &sum.laplace {
        Ok(l) => {
            let d = PyDict::new(py);
            d.set_item("n", l.n)?;
            d.set_item("u", l.u)?;
            d.set_item("p_value", l.p_value)?;
            out.set_item("laplace", d)?;
        }
        Err(e) => out.set_item("laplace", e.to_string())?,
    }
    match &sum.clustering {
        Ok(c) => {
            let d = PyDict::new(py);
            d.set_item("n", c.h.len())?;
            d.set_item("mean_h", c.mean_h)?;
            d.set_item("z", c.z)?;
            d.set_item("p_value", c.p_value)?;
            d.set_item("ks_d", c.ks_d)?;
            d.set_item("ks_p", c.ks_p)?;
            d.set_item("h", c.h.clone())?;
            out.set_item("clustering", d)?;
        }
        Err(e) => out.set_item("clustering", e.to_string())?,
    }
    Ok(out)
}
