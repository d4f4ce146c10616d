//! VGP scatter per group against paleolatitude with the latitude model (the library's `psv_groups` and
//! `psv_model`, as the `psv` verb calls them).

use crate::{cutoff_arg, run_detached, Source};
use lodestone::dirstats::{psv_groups, psv_model, GroupRemark};
use lodestone::montecarlo::MonteCarlo;
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// VGP scatter per group and the latitude model S(λ)² = a² + (bλ)² (see `lodestone.psv`).
#[pyfunction]
#[pyo3(signature = (sites, by, cutoff = "none", seed = 1, resamples = 1000, threads = None))]
pub fn psv<'py>(
    py: Python<'py>,
    sites: Source<'py>,
    by: &str,
    cutoff: &str,
    seed: u64,
    resamples: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    let cut = cutoff_arg(cutoff)?;
    let input = sites.input();
    let (pg, fit, ci) = run_detached(py, threads, || {
        let pg = psv_groups(&input.table()?, by, cut)?;
        let (fit, ci) = psv_model(&pg, &MonteCarlo::new(seed, resamples))?;
        Ok((pg, fit, ci))
    })?;
    let g = PyDict::new(py);
    g.set_item("group", pg.groups.iter().map(|x| x.name.clone()).collect::<Vec<_>>())?;
    g.set_item("paleolat", pg.groups.iter().map(|x| x.paleolat).collect::<Vec<_>>())?;
    g.set_item("s", pg.groups.iter().map(|x| x.s).collect::<Vec<_>>())?;
    g.set_item("s_low", ci.s_bounds.iter().map(|b| b.0).collect::<Vec<_>>())?;
    g.set_item("s_high", ci.s_bounds.iter().map(|b| b.1).collect::<Vec<_>>())?;
    g.set_item("n_used", pg.n_used.clone())?;
    g.set_item("within_site_corrected", pg.within_corrected.clone())?;
    let m = PyDict::new(py);
    for (k, v) in [
        ("a", fit.a),
        ("b", fit.b),
        ("a_low", ci.a_low),
        ("a_high", ci.a_high),
        ("b_low", ci.b_low),
        ("b_high", ci.b_high),
        ("rms", fit.rms),
    ] {
        m.set_item(k, v)?;
    }
    m.set_item("n_groups", fit.n_groups)?;
    let remarks: Vec<(String, &str, Option<usize>)> = pg
        .remarks
        .iter()
        .map(|(name, r)| match r {
            GroupRemark::TooFewSites(n) => (name.clone(), "too_few_sites", Some(*n)),
            GroupRemark::TooFewKept(n) => (name.clone(), "too_few_kept", Some(*n)),
            GroupRemark::WithinExceedsTotal => (name.clone(), "within_exceeds_total", None),
        })
        .collect();
    let out = PyDict::new(py);
    out.set_item("groups", g)?;
    out.set_item("model", m)?;
    out.set_item("remarks", remarks)?;
    out.set_item("flipped", pg.flipped)?;
    out.set_item("resamples", ci.resamples)?;
    Ok(out)
}
