//! Synthetic polarity time scales from a stated renewal model (the library's `simulate_timescale`).

use crate::{arg_error, run_detached};
use lodestone::model::Polarity;
use lodestone::reversals::{Fitted, Model};
use lodestone::simulate::{simulate_timescale as lib_simulate, FirstPolarity, TimeScaleModel};
use pyo3::prelude::*;
use pyo3::types::PyDict;

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
    let first = match first_polarity {
        "N" | "n" => FirstPolarity::Fixed(Polarity::Normal),
        "R" | "r" => FirstPolarity::Fixed(Polarity::Reversed),
        "random" => FirstPolarity::Random,
        other => return Err(arg_error(format!("first_polarity must be 'N', 'R' or 'random', got '{other}'"))),
    };
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
