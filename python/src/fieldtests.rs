//! Field tests: the reversal test of two arrays and the fold test of a directions table.

use crate::{arg_error, invalid, run_detached, Outcome, Source};
use lodestone::fieldtests::{fold_test as lib_fold_test, reversal_test as lib_reversal_test, FoldOptions};
use lodestone::model::DirectionKind;
use lodestone::montecarlo::MonteCarlo;
use lodestone::sphere::{Bedding, Direction, Vec3};
use lodestone::table::{read_directions, GroupBy};
use numpy::PyReadonlyArray1;
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// Confidence level of the field tests (the published classes and tables are at 95 %).
const CONFIDENCE: f64 = 0.95;

/// The library's floor on resamples (the command line's and the section's): fewer cannot place 95 % quantiles.
pub(crate) fn check_resamples(n: usize) -> PyResult<()> {
    match lodestone::montecarlo::check_resamples(n) {
        Ok(_) => Ok(()),
        Err(_) => {
            Err(arg_error(format!("resamples must be at least {}, got {n}", lodestone::montecarlo::MIN_RESAMPLES)))
        }
    }
}

/// Unit vectors of equal-length dec/inc arrays, each validated.
fn vectors(dec: &[f64], inc: &[f64]) -> Outcome<Vec<Vec3>> {
    if dec.len() != inc.len() {
        return invalid(format!("dec has {} values but inc has {}", dec.len(), inc.len()));
    }
    dec.iter()
        .zip(inc)
        .enumerate()
        .map(|(i, (&d, &n))| match Direction::new(d, n) {
            Ok(x) => Ok(x.to_vector()),
            Err(e) => invalid(format!("direction at index {i}: {e}")),
        })
        .collect()
}

/// Reversal test (see `lodestone.reversal_test`).
#[pyfunction]
#[pyo3(signature = (dec, inc, seed = 1, resamples = 1000, threads = None))]
pub fn reversal_test<'py>(
    py: Python<'py>,
    dec: PyReadonlyArray1<'py, f64>,
    inc: PyReadonlyArray1<'py, f64>,
    seed: u64,
    resamples: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    check_resamples(resamples)?;
    let (d, i) = (dec.as_slice()?, inc.as_slice()?);
    let t = run_detached(py, threads, || {
        let v = vectors(d, i)?;
        Ok(lib_reversal_test(&v, &MonteCarlo::new(seed, resamples), CONFIDENCE)?)
    })?;
    let c = &t.comparison;
    let out = PyDict::new(py);
    out.set_item("n1", c.n1)?;
    out.set_item("n2", c.n2)?;
    out.set_item("gamma", c.mm90.gamma)?;
    out.set_item("gamma_c", c.mm90.gamma_c)?;
    out.set_item("gamma_c_common_k", c.mm90.gamma_c_common_k)?;
    out.set_item("classification", c.mm90.class.name())?;
    out.set_item("v_w", c.watson.v_w)?;
    out.set_item("v_crit", c.watson.v_crit)?;
    out.set_item("v_w_passed", c.watson.passed)?;
    out.set_item("bootstrap_passed", c.bootstrap.passed)?;
    out.set_item("passed", c.passed)?;
    out.set_item("mean1_dec", c.mean1.dec)?;
    out.set_item("mean1_inc", c.mean1.inc)?;
    out.set_item("mean2_dec", c.mean2.dec)?;
    out.set_item("mean2_inc", c.mean2.inc)?;
    out.set_item("k1", c.k1)?;
    out.set_item("k2", c.k2)?;
    out.set_item("seed", seed)?;
    out.set_item("resamples", resamples)?;
    Ok(out)
}

/// Directions (lines only) and the bedding of every row of a directions table.
fn with_bedding(t: &lodestone::table::Table) -> Outcome<(Vec<Vec3>, Vec<Bedding>)> {
    let set = read_directions(t, &GroupBy::None)?;
    let mut v = Vec::with_capacity(set.records.len());
    let mut beds = Vec::with_capacity(set.records.len());
    for r in &set.records {
        if r.kind == DirectionKind::Plane {
            return Err(t
                .error(r.line, Some("kind"), "is 'plane'; field tests take directions (kind = line) only")
                .into());
        }
        let b = r.bedding.ok_or_else(|| {
            t.error(
                r.line,
                Some("bed_dip"),
                "no bedding on this row; the fold test needs bed_dip_dir (or bed_strike) and bed_dip",
            )
        })?;
        v.push(r.direction.to_vector());
        beds.push(b);
    }
    Ok((v, beds))
}

/// Bootstrap fold test with the classic precision ratio (see `lodestone.fold_test`).
#[pyfunction]
#[pyo3(signature = (table, seed = 1, resamples = 1000, threads = None))]
pub fn fold_test<'py>(
    py: Python<'py>,
    table: Source<'py>,
    seed: u64,
    resamples: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    check_resamples(resamples)?;
    let input = table.input();
    let t = run_detached(py, threads, || {
        let (v, beds) = with_bedding(&input.table()?)?;
        Ok(lib_fold_test(&v, &beds, &MonteCarlo::new(seed, resamples), &FoldOptions::default())?)
    })?;
    let out = PyDict::new(py);
    out.set_item("n", t.n)?;
    out.set_item("best_untilt", t.best_untilt)?;
    out.set_item("ci_low", t.ci_low)?;
    out.set_item("ci_high", t.ci_high)?;
    out.set_item("verdict", t.verdict.name())?;
    out.set_item("k_geo", t.classic.k_geo)?;
    out.set_item("k_tilt", t.classic.k_tilt)?;
    out.set_item("k_ratio", t.classic.ratio)?;
    out.set_item("f_crit", t.classic.f_crit)?;
    out.set_item("at_edge", t.at_edge)?;
    out.set_item("bedding_spread", t.bedding_spread)?;
    out.set_item("seed", seed)?;
    out.set_item("resamples", resamples)?;
    Ok(out)
}
