//! VGP scatter per group against paleolatitude with the latitude model (the library's `psv_groups` and
//! `psv_model`, as the `psv` verb calls them).

use crate::{cutoff_arg, run_detached, Source};
use lodestone::dirstats::{psv_groups, psv_model, GroupRemark};
use lodestone::montecarlo::MonteCarlo;
use lodestone::present::psv::{groups_sheet, model_sheet};
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
    // The columns of the `psv` verb's sheets (the library's presenter), and which groups had the
    // within-site correction.
    let g = crate::sheets::columns(py, &groups_sheet(&pg, &ci, ""))?;
    g.set_item("within_site_corrected", pg.within_corrected.clone())?;
    let m = crate::sheets::columns(py, &model_sheet(&fit, &ci))?;
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
