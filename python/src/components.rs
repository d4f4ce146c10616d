//! Principal-component fits per specimen from a steps table (picks or the automatic rule).

use crate::{arg_error, run_detached, Outcome, Source};
use lodestone::demag::{fit_automatically, fit_range, AutomaticRule, SpecimenFit};
use lodestone::model::StepSet;
use lodestone::table::{read_picks, read_steps};
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// Fits, the specimens left unfitted (with the reason), and the grade and reason of each automatic
/// fit of the last-component rule.
type Fits = (Vec<SpecimenFit>, Vec<(String, String)>, Vec<(String, &'static str, String)>);

/// One fit per pick; a specimen without a pick is unfitted.
fn by_picks(set: &StepSet, picks: &lodestone::table::Table) -> Outcome<Fits> {
    let mut fits = Vec::new();
    let chosen = read_picks(picks, set)?;
    for p in &chosen {
        let sp = set.get(&p.specimen).expect("read_picks checks the specimen");
        let f = fit_range(sp, p.from, p.to, p.kind, p.anchor)
            .map_err(|e| picks.error(p.line, Some("from"), e.to_string()))?;
        fits.push(f);
    }
    let unfitted = set
        .specimens
        .iter()
        .filter(|sp| !chosen.iter().any(|p| p.specimen == sp.specimen))
        .map(|sp| (sp.specimen.clone(), "no pick".to_string()))
        .collect();
    Ok((fits, unfitted, Vec::new()))
}

/// Principal-component fits (see `lodestone.fit_components`): a dict with `fits` (rows in the
/// columns of `components --format csv`), `unfitted` and `columns`.
#[pyfunction]
#[pyo3(signature = (steps, picks = None, auto = true, rule = "last"))]
pub fn fit_components<'py>(
    py: Python<'py>,
    steps: Source<'py>,
    picks: Option<Source<'py>>,
    auto: bool,
    rule: &str,
) -> PyResult<Bound<'py, PyDict>> {
    if picks.is_none() && !auto {
        return Err(arg_error("give picks, or auto=True for the automatic rule"));
    }
    // The rule with the library's defaults, as `components --auto [--rule longest]` takes it.
    let automatic = match AutomaticRule::by_name(rule) {
        Ok(r) => r,
        Err(_) => return Err(arg_error(format!("rule must be 'last' or 'longest', got '{rule}'"))),
    };
    let (si, pi) = (steps.input(), picks.as_ref().map(|p| p.input()));
    let (set, (fits, unfitted, grades)) = run_detached(py, None, || {
        let set = read_steps(&si.table()?)?;
        let fits = match &pi {
            Some(p) => by_picks(&set, &p.table()?)?,
            None => {
                let auto = fit_automatically(&set, &automatic)?;
                (auto.fits, auto.unfitted, auto.grades)
            }
        };
        Ok((set, fits))
    })?;
    let mut columns = vec!["specimen", "site", "kind", "anchor", "n_steps", "from", "to", "dec", "inc", "mad", "dang"];
    columns.extend(set.axis.map(|a| a.column()));
    if set.has_bedding {
        columns.extend(["bed_dip_dir", "bed_dip", "overturned"]);
    }
    let graded = pi.is_none() && rule == "last";
    if graded {
        columns.push("grade");
    }
    let rows = fits
        .iter()
        .map(|f| {
            let sp = set.get(&f.specimen).expect("a fitted specimen exists");
            let d = PyDict::new(py);
            d.set_item("specimen", &f.specimen)?;
            d.set_item("site", sp.site.as_deref())?;
            d.set_item("kind", f.kind.as_str())?;
            d.set_item("anchor", f.anchor.as_str())?;
            d.set_item("n_steps", f.n_steps)?;
            d.set_item("from", f.from)?;
            d.set_item("to", f.to)?;
            d.set_item("dec", f.direction.dec)?;
            d.set_item("inc", f.direction.inc)?;
            d.set_item("mad", f.mad)?;
            d.set_item("dang", f.dang)?;
            if let Some(ax) = set.axis {
                d.set_item(ax.column(), sp.position)?;
            }
            if set.has_bedding {
                d.set_item("bed_dip_dir", sp.bedding.map(|b| b.dip_dir))?;
                d.set_item("bed_dip", sp.bedding.map(|b| b.dip))?;
                d.set_item("overturned", if sp.bedding.is_some_and(|b| b.overturned) { "yes" } else { "no" })?;
            }
            if graded {
                let g = grades.iter().find(|(s, _, _)| *s == f.specimen);
                d.set_item("grade", g.map_or("", |(_, g, _)| g))?;
                d.set_item("reason", g.map(|(_, _, why)| why.as_str()))?;
            }
            Ok(d)
        })
        .collect::<PyResult<Vec<_>>>()?;
    let out = PyDict::new(py);
    out.set_item("fits", rows)?;
    out.set_item("unfitted", unfitted)?;
    out.set_item("columns", columns)?;
    Ok(out)
}
