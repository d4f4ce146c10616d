//! The paleopole and the VGP scatter of a sites table (the library's `pole_summary`, as `poles` runs it).

use crate::{cutoff_arg, run_detached, Source};
use lodestone::montecarlo::MonteCarlo;
use lodestone::poles::pole_summary;
use lodestone::present::poles::sites_sheet;
use lodestone::table::read_sites;
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// The columns of the sites: those of the `poles` verb's sheet (the library's presenter), then the
/// α95 used, whether the cutoff kept the site and whether its VGP was flipped for the scatter.
fn site_columns<'py>(
    py: Python<'py>,
    set: &lodestone::model::SiteSet,
    sum: &lodestone::poles::PoleSummary,
) -> PyResult<Bound<'py, PyDict>> {
    let d = crate::sheets::columns(py, &sites_sheet(set, sum, ""))?;
    d.set_item("a95", sum.sites.iter().map(|x| x.a95.unwrap_or(f64::NAN)).collect::<Vec<_>>())?;
    d.set_item("kept", sum.kept_sites())?;
    d.set_item("flipped", sum.alignment.flipped.clone())?;
    Ok(d)
}

/// VGPs, paleopole and VGP scatter of a sites table (see `lodestone.paleopole`).
#[pyfunction]
#[pyo3(signature = (sites, cutoff = "none", northern = false, seed = 1, resamples = 1000, threads = None))]
pub fn paleopole<'py>(
    py: Python<'py>,
    sites: Source<'py>,
    cutoff: &str,
    northern: bool,
    seed: u64,
    resamples: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyDict>> {
    let cut = cutoff_arg(cutoff)?;
    let input = sites.input();
    let (set, sum) = run_detached(py, threads, || {
        let set = read_sites(&input.table()?)?;
        let sum = pole_summary(&set, northern, cut, &MonteCarlo::new(seed, resamples))?;
        Ok((set, sum))
    })?;
    let out = PyDict::new(py);
    out.set_item("sites", site_columns(py, &set, &sum)?)?;
    out.set_item("axis_lat", sum.alignment.axis.lat)?;
    out.set_item("axis_lon", sum.alignment.axis.lon)?;
    out.set_item("missing_within", sum.missing_within())?;
    if let Some(pp) = &sum.pole {
        let p = PyDict::new(py);
        p.set_item("n", pp.n)?;
        p.set_item("plat", pp.pole.lat)?;
        p.set_item("plon", pp.pole.lon)?;
        p.set_item("r", pp.r)?;
        p.set_item("k", pp.k.0)?;
        p.set_item("a95", pp.a95)?;
        out.set_item("pole", p)?;
    }
    // What the scatter stage could not give (the library's note), as the verb notes it.
    out.set_item("scatter_note", sum.scatter_note())?;
    if let Some(sc) = &sum.scatter {
        let b = sum.interval.as_ref();
        let s = PyDict::new(py);
        s.set_item("cutoff", cut.name())?;
        s.set_item("s", sc.s)?;
        s.set_item("s_low", b.map(|b| b.low))?;
        s.set_item("s_high", b.map(|b| b.high))?;
        s.set_item("s_total", sc.s_total)?;
        s.set_item("within_term", sc.within_term)?;
        s.set_item("n_used", sc.n_used)?;
        s.set_item("n_removed", sc.n_removed)?;
        s.set_item("threshold", sc.threshold)?;
        s.set_item("mean_plat", sc.mean_pole.lat)?;
        s.set_item("mean_plon", sc.mean_pole.lon)?;
        s.set_item("resamples", b.map(|b| b.resamples))?;
        s.set_item("n_negative", b.map(|b| b.n_negative))?;
        out.set_item("scatter", s)?;
    }
    Ok(out)
}
