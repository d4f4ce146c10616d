//! Correction of inclination shallowing: the elongation/inclination search, or a given factor
//! (the library functions `unflatten` calls).

use crate::fieldtests::check_resamples;
use crate::{arg_error, invalid, run_detached, Source};
use lodestone::dirstats::{elongation_of, shallowing_directions, unflatten_given, unflatten_search};
use lodestone::montecarlo::MonteCarlo;
use lodestone::table::{read_directions, GroupBy};
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// Inclination-shallowing correction of a directions table (see `lodestone.unflatten`).
#[pyfunction]
#[pyo3(signature = (table, factor = None, frame = "tilt", seed = 1, resamples = 1000, threads = None))]
pub fn unflatten<'py>(
    py: Python<'py>,
    table: Source<'py>,
    factor: Option<f64>,
    frame: &str,
    seed: u64,
    resamples: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    let tilt = match frame {
        "tilt" => true,
        "geo" => false,
        other => return Err(arg_error(format!("frame must be 'geo' or 'tilt', got '{other}'"))),
    };
    if factor.is_none() {
        check_resamples(resamples)?;
    }
    let input = table.input();
    let out = PyDict::new(py);
    let no_bedding = match factor {
        Some(f) => {
            let (n, r, e, no_bedding) = run_detached(py, threads, || {
                let set = read_directions(&input.table()?, &GroupBy::None)?;
                let d = shallowing_directions(&set, tilt)?;
                let r = match unflatten_given(&d.directions, f) {
                    Ok(r) => r,
                    Err(e) => return invalid(format!("factor {e}")),
                };
                let v: Vec<_> = d.directions.iter().map(|x| x.to_vector()).collect();
                Ok((d.directions.len(), r, elongation_of(&v).ok().map(|e| e.e), d.no_bedding))
            })?;
            let (m0, m1) = (r.observed.mean, r.corrected.mean);
            out.set_item("method", "factor")?;
            out.set_item("n", n)?;
            out.set_item("f", f)?;
            out.set_item("inc_observed", m0.map(|m| m.inc))?;
            out.set_item("inc_corrected", m1.map(|m| m.inc))?;
            out.set_item("inc_low", r.inc_range().map(|x| x.0))?;
            out.set_item("inc_high", r.inc_range().map(|x| x.1))?;
            out.set_item("elongation", e)?;
            out.set_item("dec_observed", m0.map(|m| m.dec))?;
            out.set_item("dec_corrected", m1.map(|m| m.dec))?;
            out.set_item("a95_observed", r.observed.alpha)?;
            out.set_item("a95_corrected", r.corrected.alpha)?;
            no_bedding
        }
        None => {
            let (r, no_bedding) = run_detached(py, threads, || {
                let set = read_directions(&input.table()?, &GroupBy::None)?;
                let d = shallowing_directions(&set, tilt)?;
                Ok((unflatten_search(&d.directions, &MonteCarlo::new(seed, resamples), 0)?, d.no_bedding))
            })?;
            out.set_item("method", "elongation_inclination")?;
            out.set_item("n", r.n)?;
            out.set_item("f", r.f)?;
            out.set_item("f_low", r.f_low)?;
            out.set_item("f_high", r.f_high)?;
            out.set_item("inc_observed", r.inc_observed)?;
            out.set_item("inc_corrected", r.inc_corrected)?;
            out.set_item("inc_low", r.inc_low)?;
            out.set_item("inc_high", r.inc_high)?;
            out.set_item("elongation", r.elongation)?;
            out.set_item("elongation_dec", r.elongation_dec)?;
            out.set_item("meridional", r.meridional)?;
            out.set_item("no_crossing", r.no_crossing)?;
            no_bedding
        }
    };
    out.set_item("no_bedding", no_bedding)?;
    Ok(out)
}
