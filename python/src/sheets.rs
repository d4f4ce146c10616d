//! A presenter's sheet as Python columns, so the package's DataFrames have the library's columns
//! (names and order) and values at full precision, not a copy of them.

use lodestone::present::{Cell, Sheet};
use pyo3::prelude::*;
use pyo3::types::PyDict;

/// One cell as a Python value: numbers as float (azimuths in [0, 360)), integers as int, text as
/// str, no value as None.
fn value<'py>(py: Python<'py>, c: &Cell) -> PyResult<Bound<'py, PyAny>> {
    Ok(match c {
        Cell::Num(x, _) => x.into_pyobject(py)?.into_any(),
        Cell::Azimuth(x, _) => x.rem_euclid(360.0).into_pyobject(py)?.into_any(),
        Cell::Int(i) => i.into_pyobject(py)?.into_any(),
        Cell::Text(s) => s.into_pyobject(py)?.into_any(),
        Cell::Empty => py.None().into_bound(py),
    })
}

/// The sheet as a dict of columns (name → list of values), in the sheet's column order.
pub fn columns<'py>(py: Python<'py>, sheet: &Sheet) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    for (i, name) in sheet.columns.iter().enumerate() {
        let col = sheet.rows.iter().map(|r| value(py, &r[i])).collect::<PyResult<Vec<_>>>()?;
        d.set_item(name, col)?;
    }
    Ok(d)
}
