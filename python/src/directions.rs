//! Directions: Fisher mean of arrays, means per group of a table, virtual geomagnetic poles.

use crate::{arg_error, invalid, run_detached, Outcome, Source};
use lodestone::poles::{pole_oval, vgp as lib_vgp};
use lodestone::sphere::{Direction, GeoPoint};
use lodestone::stats::{group_means as lib_group_means, FisherAccumulator, FisherStats, Frame};
use lodestone::table::{read_directions, GroupBy};
use numpy::{PyArray1, PyReadonlyArray1};
use pyo3::prelude::*;
use pyo3::types::PyDict;
use rayon::prelude::*;

/// Confidence level of the reported `a95` (as on the command line).
const A95: f64 = 0.95;

/// A contiguous float64 array as a slice (the Python layer passes contiguous copies).
pub(crate) fn slice<'a>(a: &'a PyReadonlyArray1<'_, f64>, name: &str) -> PyResult<&'a [f64]> {
    Ok(a.as_slice().or_else(|_| invalid(format!("{name} must be a contiguous 1-D float64 array")))?)
}

/// All arrays must have the length of the first.
fn same_length(arrays: &[(&str, &[f64])]) -> Outcome<usize> {
    let (first, n) = (arrays[0].0, arrays[0].1.len());
    for (name, a) in &arrays[1..] {
        if a.len() != n {
            return invalid(format!("{first} has {n} values but {name} has {}", a.len()));
        }
    }
    Ok(n)
}

/// The validated direction of element `i` (message names the element).
fn direction_at(dec: &[f64], inc: &[f64], i: usize) -> Outcome<Direction> {
    Direction::new(dec[i], inc[i]).or_else(|e| invalid(format!("direction at index {i}: {e}")))
}

/// The statistics as a dict: undefined values are None, an infinite k is `inf`.
fn stats_dict<'py>(py: Python<'py>, s: &FisherStats, at95: Option<f64>) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("n", s.n)?;
    d.set_item("dec", s.mean.map(|m| m.dec))?;
    d.set_item("inc", s.mean.map(|m| m.inc))?;
    d.set_item("r", s.r)?;
    d.set_item("k", s.k.map(|k| k.0))?;
    d.set_item("a95", at95)?;
    d.set_item("theta63", s.theta63)?;
    d.set_item("alpha", s.alpha)?;
    d.set_item("confidence", s.confidence)?;
    Ok(d)
}

/// Directions are summed in chunks of this many, the chunk sums merged in order: the same result for
/// any number of threads. Inputs of one chunk are summed on the calling thread with the GIL held
/// (releasing it and waking the pool would cost more than the sum).
const CHUNK: usize = 1 << 14;

/// The sum of the unit vectors of `dec[range]`, `inc[range]`, each direction validated.
fn chunk_sum(d: &[f64], i: &[f64], range: std::ops::Range<usize>) -> Outcome<FisherAccumulator> {
    let mut acc = FisherAccumulator::default();
    for k in range {
        acc.push(direction_at(d, i, k)?.to_vector());
    }
    Ok(acc)
}

/// The accumulated vectors of all directions, in parallel chunks merged in order.
fn accumulate(d: &[f64], i: &[f64]) -> Outcome<FisherAccumulator> {
    let n = same_length(&[("dec", d), ("inc", i)])?;
    let chunks: Vec<Outcome<FisherAccumulator>> =
        (0..n.div_ceil(CHUNK)).into_par_iter().map(|c| chunk_sum(d, i, c * CHUNK..((c + 1) * CHUNK).min(n))).collect();
    let mut acc = FisherAccumulator::default();
    for c in chunks {
        acc.merge(&c?);
    }
    Ok(acc)
}

/// Fisher (1953) mean of directions given as two arrays (see `lodestone.fisher_mean`).
#[pyfunction]
#[pyo3(signature = (dec, inc, confidence = 0.95))]
pub fn fisher_mean<'py>(
    py: Python<'py>,
    dec: PyReadonlyArray1<'py, f64>,
    inc: PyReadonlyArray1<'py, f64>,
    confidence: f64,
) -> PyResult<Bound<'py, PyDict>> {
    let (d, i) = (slice(&dec, "dec")?, slice(&inc, "inc")?);
    let finish = |acc: FisherAccumulator| -> Outcome<(FisherStats, Option<f64>)> {
        Ok((acc.finish(confidence)?, acc.finish(A95)?.alpha))
    };
    let (at, at95) = if d.len() <= CHUNK {
        same_length(&[("dec", d), ("inc", i)]).and_then(|n| chunk_sum(d, i, 0..n)).and_then(finish)?
    } else {
        run_detached(py, None, || finish(accumulate(d, i)?))?
    };
    stats_dict(py, &at, at95)
}

/// Virtual geomagnetic poles of equal-length arrays (see `lodestone.vgp`); NaN in `a95` leaves dp, dm NaN.
#[pyfunction]
#[pyo3(signature = (lat, lon, dec, inc, a95 = None))]
pub fn vgp<'py>(
    py: Python<'py>,
    lat: PyReadonlyArray1<'py, f64>,
    lon: PyReadonlyArray1<'py, f64>,
    dec: PyReadonlyArray1<'py, f64>,
    inc: PyReadonlyArray1<'py, f64>,
    a95: Option<PyReadonlyArray1<'py, f64>>,
) -> PyResult<Bound<'py, PyDict>> {
    let (la, lo, d, i) = (slice(&lat, "lat")?, slice(&lon, "lon")?, slice(&dec, "dec")?, slice(&inc, "inc")?);
    let a = a95.as_ref().map(|a| slice(a, "a95")).transpose()?;
    let cols = run_detached(py, None, || {
        let mut arrays = vec![("lat", la), ("lon", lo), ("dec", d), ("inc", i)];
        arrays.extend(a.map(|a| ("a95", a)));
        let n = same_length(&arrays)?;
        let mut out: [Vec<f64>; 6] = Default::default();
        for k in 0..n {
            let site = GeoPoint::new(la[k], lo[k]).or_else(|e| invalid(format!("site at index {k}: {e}")))?;
            let v = lib_vgp(site, direction_at(d, i, k)?);
            let oval = match a.map(|a| a[k]).filter(|x| !x.is_nan()) {
                Some(x) => Some(pole_oval(v.colatitude, x).or_else(|e| invalid(format!("a95 at index {k}: {e}")))?),
                None => None,
            };
            let row = [
                v.pole.lat,
                v.pole.lon,
                oval.map_or(f64::NAN, |o| o.dp),
                oval.map_or(f64::NAN, |o| o.dm),
                v.paleolat,
                v.colatitude,
            ];
            for (col, x) in out.iter_mut().zip(row) {
                col.push(x);
            }
        }
        Ok(out)
    })?;
    let dict = PyDict::new(py);
    for (name, col) in ["plat", "plon", "dp", "dm", "paleolat", "colatitude"].into_iter().zip(cols) {
        dict.set_item(name, PyArray1::from_vec(py, col))?;
    }
    Ok(dict)
}

/// Fisher mean per group of a directions table (see `lodestone.group_means`).
///
/// `by`: None for the whole table; `"site"` for the command line's default (the `site` column, or the
/// whole table when there is none); any other name for that column, which must exist.
#[pyfunction]
#[pyo3(signature = (table, by, frame))]
pub fn group_means<'py>(
    py: Python<'py>,
    table: Source<'py>,
    by: Option<String>,
    frame: &str,
) -> PyResult<Vec<Bound<'py, PyDict>>> {
    let frame = match frame {
        "geo" => Frame::Geo,
        "tilt" => Frame::Tilt,
        other => return Err(arg_error(format!("frame must be 'geo' or 'tilt', got '{other}'"))),
    };
    let by = match by.as_deref() {
        None => GroupBy::None,
        Some("site") => GroupBy::Default,
        Some(c) => GroupBy::Column(c.to_string()),
    };
    let input = table.input();
    let means = run_detached(py, None, || {
        let set = read_directions(&input.table()?, &by)?;
        Ok(lib_group_means(&set, frame, A95)?)
    })?;
    means
        .iter()
        .map(|g| {
            let d = stats_dict(py, &g.stats, g.stats.alpha)?;
            d.set_item("group", g.group.as_deref().unwrap_or("(all)"))?;
            d.set_item("planes", g.planes)?;
            Ok(d)
        })
        .collect()
}
