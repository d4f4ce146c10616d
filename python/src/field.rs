//! The present field from a spherical-harmonic model: elements at points, and the series per epoch.

use crate::directions::slice;
use crate::{invalid, run_detached, Failure, Outcome};
use lodestone::field::{
    field_at as lib_field_at, field_series as lib_field_series, FieldError, FieldModel, Frame, SeriesOptions, Site,
};
use numpy::{PyArray1, PyReadonlyArray1};
use pyo3::prelude::*;
use pyo3::types::PyDict;
use std::path::PathBuf;

/// A field error as a call failure (table errors keep file, line and column).
fn failed(e: FieldError) -> Failure {
    match e {
        FieldError::Table(t) => Failure::Lib(t.into()),
        other => Failure::Arg(other.to_string()),
    }
}

/// The model: a table file, or the bundled IGRF-14.
fn load(model: &Option<PathBuf>) -> Outcome<FieldModel> {
    match model {
        None => Ok(FieldModel::igrf14()),
        Some(p) => FieldModel::read(p).map_err(failed),
    }
}

/// The model's name and span, as in the command line's `model` object.
fn model_dict<'py>(py: Python<'py>, m: &FieldModel) -> PyResult<Bound<'py, PyDict>> {
    let (first, last) = m.span();
    let d = PyDict::new(py);
    d.set_item("name", &m.name)?;
    d.set_item("degree", m.degree())?;
    d.set_item("first_epoch", m.epochs[0])?;
    d.set_item("last_epoch", m.epochs.last().copied())?;
    d.set_item("defined_from", first)?;
    d.set_item("defined_to", last)?;
    Ok(d)
}

/// Field elements at equal-length arrays of points for one year (see `lodestone.field_at`).
#[pyfunction]
#[pyo3(signature = (year, lat, lon, altitude, model = None, geocentric = false))]
pub fn field_at<'py>(
    py: Python<'py>,
    year: f64,
    lat: PyReadonlyArray1<'py, f64>,
    lon: PyReadonlyArray1<'py, f64>,
    altitude: PyReadonlyArray1<'py, f64>,
    model: Option<PathBuf>,
    geocentric: bool,
) -> PyResult<Bound<'py, PyDict>> {
    let (la, lo, al) = (slice(&lat, "lat")?, slice(&lon, "lon")?, slice(&altitude, "altitude")?);
    let frame = if geocentric { Frame::Geocentric } else { Frame::Geodetic };
    let (m, cols) = run_detached(py, None, || {
        let n = la.len();
        if lo.len() != n || al.len() != n {
            return invalid(format!("lat, lon and altitude have {n}, {} and {} values", lo.len(), al.len()));
        }
        let m = load(&model)?;
        let c = m.at(year).map_err(failed)?;
        let mut out: [Vec<f64>; 7] = Default::default();
        for k in 0..n {
            let site =
                Site::new(la[k], lo[k], al[k], frame).map_err(|e| Failure::Arg(format!("point at index {k}: {e}")))?;
            let e = lib_field_at(&c, &site);
            for (col, x) in out.iter_mut().zip([e.x, e.y, e.z, e.h, e.f, e.dec, e.inc]) {
                col.push(x);
            }
        }
        Ok((m, out))
    })?;
    let d = PyDict::new(py);
    for (name, col) in ["x", "y", "z", "h", "f", "dec", "inc"].into_iter().zip(cols) {
        d.set_item(name, PyArray1::from_vec(py, col))?;
    }
    d.set_item("model", model_dict(py, &m)?)?;
    d.set_item("frame", if geocentric { "geocentric" } else { "geodetic" })?;
    Ok(d)
}

/// Per epoch: dipole, dip poles, the surface-intensity low and the spectrum (see `lodestone.field_series`).
#[pyfunction]
#[pyo3(signature = (start = None, end = None, every = 5.0, low_threshold = lodestone::field::DEFAULT_LOW_THRESHOLD, model = None))]
pub fn field_series<'py>(
    py: Python<'py>,
    start: Option<f64>,
    end: Option<f64>,
    every: f64,
    low_threshold: f64,
    model: Option<PathBuf>,
) -> PyResult<Bound<'py, PyDict>> {
    let (m, rows) = run_detached(py, None, || {
        let m = load(&model)?;
        let opts = SeriesOptions::within(&m, start, end, every, low_threshold).map_err(failed)?;
        let rows = lib_field_series(&m, &opts).map_err(failed)?;
        Ok((m, rows))
    })?;
    let epochs = rows
        .iter()
        .map(|r| {
            let d = PyDict::new(py);
            d.set_item("year", r.year)?;
            d.set_item("moment", r.moment)?;
            d.set_item("moment_change", r.moment_change)?;
            d.set_item("tilt", r.tilt)?;
            d.set_item("pole_lat", r.pole_lat)?;
            d.set_item("pole_lon", r.pole_lon)?;
            d.set_item("dip_north_lat", r.dip_north_lat)?;
            d.set_item("dip_north_lon", r.dip_north_lon)?;
            d.set_item("dip_north_speed", r.dip_north_speed)?;
            d.set_item("dip_south_lat", r.dip_south_lat)?;
            d.set_item("dip_south_lon", r.dip_south_lon)?;
            d.set_item("dip_south_speed", r.dip_south_speed)?;
            d.set_item("low_f", r.low_f)?;
            d.set_item("low_lat", r.low_lat)?;
            d.set_item("low_lon", r.low_lon)?;
            d.set_item("low_area", r.low_area)?;
            d.set_item("low_cells", r.low_cells)?;
            d.set_item("low_speed", r.low_speed)?;
            d.set_item("low_west_speed", r.low_west_speed)?;
            d.set_item("spectrum", r.spectrum.clone())?;
            Ok(d)
        })
        .collect::<PyResult<Vec<_>>>()?;
    let out = PyDict::new(py);
    out.set_item("model", model_dict(py, &m)?)?;
    out.set_item("epochs", epochs)?;
    Ok(out)
}
