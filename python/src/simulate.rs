//! Synthetic polarity time scales from a stated renewal model (the library's `simulate_timescale`),
//! and synthetic sections written as project folders (`simulate_section`, `project_files`).

use crate::{arg_error, invalid, run_detached, Outcome};
use lodestone::model::{Polarity, StratAxis, TimeScale, Treatment};
use lodestone::montecarlo::MonteCarlo;
use lodestone::present::simulate as present;
use lodestone::reversals::{Fitted, Model};
use lodestone::simulate::{
    parse_rates, project_files, section_timescale_span, simulate_section as simulate_section_lib,
    simulate_timescale as lib_simulate, treatment_defaults, FirstPolarity, Overprint, SectionModel, TimeScaleModel,
    TimeScaleSource, Unblocking,
};
use lodestone::sphere::{Bedding, Direction, GeoPoint};
use lodestone::table::Table;
use pyo3::prelude::*;
use pyo3::types::PyDict;
use std::path::PathBuf;

/// A synthetic time scale (see `lodestone.simulate_timescale`): columns name, young, old, polarity,
/// and the model with its parameters.
#[pyfunction]
#[pyo3(signature = (model, span, mean_interval = 0.25, shape = None, young = 0.0, first_polarity = "N",
                    name_prefix = None, seed = 1))]
#[allow(clippy::too_many_arguments)]
pub fn simulate_timescale<'py>(
    py: Python<'py>,
    model: &str,
    span: f64,
    mean_interval: f64,
    shape: Option<f64>,
    young: f64,
    first_polarity: &str,
    name_prefix: Option<String>,
    seed: u64,
) -> PyResult<Bound<'py, PyDict>> {
    let first = first_polarity_arg(first_polarity)?;
    let model = model.to_string();
    let (m, ts) = run_detached(py, None, || {
        let m = TimeScaleModel {
            model: Fitted::from_settings(Model::from_name(&model)?, mean_interval, shape)?,
            young,
            span,
            first,
            name_prefix,
        };
        let ts = lib_simulate(&m, seed)?;
        Ok((m, ts))
    })?;
    let c = &ts.chrons;
    let out = PyDict::new(py);
    out.set_item("name", c.iter().map(|x| x.name.clone()).collect::<Vec<_>>())?;
    out.set_item("young", c.iter().map(|x| x.young).collect::<Vec<_>>())?;
    out.set_item("old", c.iter().map(|x| x.old).collect::<Vec<_>>())?;
    out.set_item("polarity", c.iter().map(|x| x.polarity.code()).collect::<Vec<_>>())?;
    let params = PyDict::new(py);
    let text = serde_json::to_value(m.model).map_err(|e| arg_error(e.to_string()))?;
    if let serde_json::Value::Object(map) = text {
        for (k, v) in map {
            match v {
                serde_json::Value::Number(x) => params.set_item(k, x.as_f64())?,
                serde_json::Value::String(s) => params.set_item(k, s)?,
                _ => {}
            }
        }
    }
    out.set_item("model", params)?;
    out.set_item("mean", m.model.mean())?;
    out.set_item("seed", seed)?;
    Ok(out)
}

/// The first polarity of a synthetic time scale: 'N', 'R' or 'random'.
fn first_polarity_arg(text: &str) -> PyResult<FirstPolarity> {
    match text {
        "N" | "n" => Ok(FirstPolarity::Fixed(Polarity::Normal)),
        "R" | "r" => Ok(FirstPolarity::Fixed(Polarity::Reversed)),
        "random" => Ok(FirstPolarity::Random),
        other => Err(arg_error(format!("first_polarity must be 'N', 'R' or 'random', got '{other}'"))),
    }
}

/// The demagnetization of a synthetic section: the treatment (`thermal` or `af`), its schedule
/// and the characteristic component's unblocking range (the treatment's defaults where not given),
/// and the overprint (direction dec, inc; moment ratio; unblocking range, by default the
/// treatment's).
fn demag(
    treatment: &str,
    steps: Option<Vec<f64>>,
    characteristic: Option<(f64, f64)>,
    overprint: Option<(f64, f64)>,
    ratio: f64,
    overprint_range: Option<(f64, f64)>,
) -> Outcome<(Treatment, Vec<f64>, Unblocking, Option<Overprint>)> {
    let treatment = match treatment {
        "thermal" => Treatment::Thermal,
        "af" => Treatment::Af,
        other => return invalid(format!("treatment must be 'thermal' or 'af', got '{other}'")),
    };
    let defaults = treatment_defaults(treatment)?;
    let range = |r: Option<(f64, f64)>, d: Unblocking| r.map_or(d, |(low, high)| Unblocking { low, high });
    let overprint = match overprint {
        None => None,
        Some((dec, inc)) => Some(Overprint {
            direction: Direction::new(dec, inc)?,
            ratio,
            unblocking: range(overprint_range, defaults.overprint),
        }),
    };
    Ok((treatment, steps.unwrap_or(defaults.steps), range(characteristic, defaults.characteristic), overprint))
}

/// Draw a synthetic section of `model` and write its project folder `out` (see
/// `lodestone.simulate_section`): the time scale `timescale` (a path) or one simulated from
/// `renewal`, seeded by `seed`, as the `simulate section` verb does it. Returns the written files
/// and the verb's sheets and notes.
fn write_section<'py>(
    py: Python<'py>,
    out: PathBuf,
    model: SectionModel,
    timescale: Option<PathBuf>,
    renewal: Option<TimeScaleModel>,
    seed: u64,
    force: bool,
) -> PyResult<Bound<'py, PyDict>> {
    let (shown, files) = run_detached(py, None, || {
        let mut inputs = Vec::new();
        let (ts, source) = match (&timescale, renewal) {
            (Some(p), _) => {
                inputs.push(std::fs::canonicalize(p).unwrap_or_else(|_| p.clone()));
                (TimeScale::from_table(&Table::read(p)?)?, TimeScaleSource::File(p.display().to_string()))
            }
            (None, Some(m)) => (lib_simulate(&m, seed)?, TimeScaleSource::Renewal(m)),
            (None, None) => return invalid("a time scale or a renewal model is needed"),
        };
        let sec = simulate_section_lib(&model, &ts, &MonteCarlo::new(seed, 0))?;
        let files = project_files(&model, &sec, &ts, &source, seed)
            .or_else(|e| invalid(format!("cannot write the truth file: {e}")))?;
        crate::section::prepare(&out, force, &inputs, &[])?;
        for (name, text) in &files {
            crate::section::write_file(&out.join(name), text.as_bytes())?;
        }
        let names: Vec<&str> = files.iter().map(|f| f.0).collect();
        Ok((present::synthetic_section(&model, &sec, seed, &out, &names), names))
    })?;
    let d = PyDict::new(py);
    d.set_item("files", files)?;
    d.set_item("chrons", crate::sheets::columns(py, &shown.sheets[0])?)?;
    d.set_item("plan", crate::sheets::columns(py, &shown.sheets[1])?)?;
    d.set_item("notes", shown.notes.clone())?;
    Ok(d)
}

/// A synthetic section written as a project folder (see `lodestone.simulate_section`); the options
/// of the `simulate section` verb, typed.
#[pyfunction]
#[pyo3(signature = (out, base_age, lat, lon, timescale = None, top_age = 0.0, rates = "2".to_string(),
                    spacing = 1.0, specimens = 3, kappa = 40.0, level_kappa = None, bedding = vec![],
                    treatment = "thermal".to_string(), steps = None, characteristic = None, overprint = None,
                    overprint_ratio = 0.5, overprint_range = None, moment = 1e-8, moment_spread = 0.25,
                    noise = 0.005, site_prefix = "L".to_string(), core = false, model = "gamma".to_string(),
                    shape = None, mean_interval = 0.25, first_polarity = "N".to_string(), name_prefix = None,
                    seed = 1, force = false))]
#[allow(clippy::too_many_arguments)]
pub fn simulate_section<'py>(
    py: Python<'py>,
    out: PathBuf,
    base_age: f64,
    lat: f64,
    lon: f64,
    timescale: Option<PathBuf>,
    top_age: f64,
    rates: String,
    spacing: f64,
    specimens: usize,
    kappa: f64,
    level_kappa: Option<f64>,
    bedding: Vec<(f64, f64)>,
    treatment: String,
    steps: Option<Vec<f64>>,
    characteristic: Option<(f64, f64)>,
    overprint: Option<(f64, f64)>,
    overprint_ratio: f64,
    overprint_range: Option<(f64, f64)>,
    moment: f64,
    moment_spread: f64,
    noise: f64,
    site_prefix: String,
    core: bool,
    model: String,
    shape: Option<f64>,
    mean_interval: f64,
    first_polarity: String,
    name_prefix: Option<String>,
    seed: u64,
    force: bool,
) -> PyResult<Bound<'py, PyDict>> {
    let first = first_polarity_arg(&first_polarity)?;
    let built = || -> Outcome<(SectionModel, Option<TimeScaleModel>)> {
        let (treatment, steps, characteristic, overprint) =
            demag(&treatment, steps, characteristic, overprint, overprint_ratio, overprint_range)?;
        let bedding: Result<Vec<_>, _> =
            bedding.iter().map(|&(dd, dip)| Bedding::from_dip_direction(dd, dip, false)).collect();
        let section = SectionModel {
            site: GeoPoint::new(lat, lon)?,
            base_age,
            top_age,
            rates: parse_rates(&rates)?,
            spacing,
            specimens,
            kappa,
            level_kappa,
            bedding: bedding?,
            treatment,
            steps,
            characteristic,
            overprint,
            moment,
            moment_sigma: moment_spread,
            noise,
            site_prefix,
            axis: if core { StratAxis::Depth } else { StratAxis::Height },
        };
        // Without a time scale, one is drawn covering the section and one mean interval more (as the verb).
        let renewal = match timescale {
            Some(_) => None,
            None => Some(TimeScaleModel {
                model: Fitted::from_settings(Model::from_name(&model)?, mean_interval, shape)?,
                young: 0.0,
                span: section_timescale_span(base_age, mean_interval),
                first,
                name_prefix,
            }),
        };
        Ok((section, renewal))
    };
    let (section, renewal) = built()?;
    write_section(py, out, section, timescale, renewal, seed, force)
}
