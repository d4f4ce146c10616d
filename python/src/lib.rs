//! `lodestone._native`: the extension module behind the Python package `lodestone`.
//!
//! A thin layer over the `lodestone` library: it converts arguments (NumPy arrays, tables given as a
//! path or as CSV bytes), calls the library's functions with the GIL released, and returns plain
//! Python values (dicts, lists, NumPy arrays). The Python package (`python/lodestone/`) turns those
//! into result objects and pandas DataFrames. No statistic is computed here.

mod components;
mod directions;
mod field;
mod fieldtests;
mod poles;
mod psv;
mod reversals;
mod section;
mod shallowing;
mod sheets;
mod simulate;
mod strat;

use lodestone::table::Table;
use pyo3::create_exception;
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use pyo3::types::PyBytes;
use std::path::PathBuf;

create_exception!(
    _native,
    LodestoneError,
    PyValueError,
    "Bad input or a failed computation, with the library's message (tables: file, line and column)."
);

/// Why a call failed: the library's error, or a bad argument. Converted into a Python
/// `LodestoneError` once the GIL is held again.
#[derive(Debug)]
pub(crate) enum Failure {
    /// An error of the library (table errors carry file, line and column).
    Lib(lodestone::Error),
    /// A bad argument, described in words.
    Arg(String),
}

impl<E: Into<lodestone::Error>> From<E> for Failure {
    fn from(e: E) -> Self {
        Failure::Lib(e.into())
    }
}

/// Result of the work done with the GIL released.
pub(crate) type Outcome<T> = Result<T, Failure>;

/// A bad argument (not bad data).
pub(crate) fn invalid<T>(msg: impl Into<String>) -> Outcome<T> {
    Err(Failure::Arg(msg.into()))
}

/// A bad argument as a Python exception (outside the detached work).
pub(crate) fn arg_error(msg: impl Into<String>) -> PyErr {
    Failure::Arg(msg.into()).into()
}

/// The `cutoff` argument of `paleopole` and `psv`: 'none', 'vandamme' or an angle in (0, 180].
pub(crate) fn cutoff_arg(cutoff: &str) -> PyResult<lodestone::poles::Cutoff> {
    lodestone::poles::Cutoff::parse(cutoff).ok_or_else(|| {
        arg_error(format!("cutoff must be 'none', 'vandamme' or an angle in (0, 180] such as '45'; got '{cutoff}'"))
    })
}

impl From<Failure> for PyErr {
    fn from(f: Failure) -> PyErr {
        match f {
            Failure::Arg(m) => LodestoneError::new_err(m),
            Failure::Lib(e) => {
                let err = LodestoneError::new_err(e.to_string());
                if let lodestone::Error::Table(t) = &e {
                    Python::attach(|py| {
                        let v = err.value(py);
                        let _ = v.setattr("file", &t.file);
                        let _ = v.setattr("line", t.line);
                        let _ = v.setattr("column", t.column.clone());
                    });
                }
                err
            }
        }
    }
}

/// A table as the Python layer passes it: a path, or a name (for messages) with CSV bytes.
#[derive(FromPyObject)]
pub(crate) enum Source<'py> {
    /// CSV text of a DataFrame, with the name used in messages.
    Text(String, Bound<'py, PyBytes>),
    /// A file path.
    Path(PathBuf),
}

/// The bytes or path of a [`Source`], detached from Python objects (so it can cross `detach`).
pub(crate) enum Input<'a> {
    Text(String, &'a [u8]),
    Path(PathBuf),
}

impl<'py> Source<'py> {
    pub(crate) fn input(&self) -> Input<'_> {
        match self {
            Source::Text(name, b) => Input::Text(name.clone(), b.as_bytes()),
            Source::Path(p) => Input::Path(p.clone()),
        }
    }
}

impl Input<'_> {
    /// Read the table (same parser, checks and messages as the command line).
    pub(crate) fn table(&self) -> lodestone::Result<Table> {
        Ok(match self {
            Input::Text(name, bytes) => Table::parse(name, bytes)?,
            Input::Path(p) => Table::read(p)?,
        })
    }
}

/// Run `f` with the GIL released, on `threads` worker threads (default: rayon's global pool).
pub(crate) fn run_detached<T, F>(py: Python<'_>, threads: Option<usize>, f: F) -> PyResult<T>
where
    T: Send,
    F: FnOnce() -> Outcome<T> + Send,
{
    let out = py.detach(|| match threads {
        None => f(),
        Some(0) => invalid("threads must be at least 1"),
        Some(n) => match rayon::ThreadPoolBuilder::new().num_threads(n).build() {
            Ok(pool) => pool.install(f),
            Err(e) => invalid(format!("cannot start {n} threads: {e}")),
        },
    });
    Ok(out?)
}

#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("LodestoneError", m.py().get_type::<LodestoneError>())?;
    m.add_function(wrap_pyfunction!(directions::fisher_mean, m)?)?;
    m.add_function(wrap_pyfunction!(directions::vgp, m)?)?;
    m.add_function(wrap_pyfunction!(directions::group_means, m)?)?;
    m.add_function(wrap_pyfunction!(components::fit_components, m)?)?;
    m.add_function(wrap_pyfunction!(fieldtests::reversal_test, m)?)?;
    m.add_function(wrap_pyfunction!(fieldtests::fold_test, m)?)?;
    m.add_function(wrap_pyfunction!(reversals::fit_renewal, m)?)?;
    m.add_function(wrap_pyfunction!(reversals::hazard, m)?)?;
    m.add_function(wrap_pyfunction!(section::run_section, m)?)?;
    m.add_function(wrap_pyfunction!(field::field_at, m)?)?;
    m.add_function(wrap_pyfunction!(field::field_series, m)?)?;
    m.add_function(wrap_pyfunction!(poles::paleopole, m)?)?;
    m.add_function(wrap_pyfunction!(strat::polarity_column, m)?)?;
    m.add_function(wrap_pyfunction!(strat::correlate, m)?)?;
    m.add_function(wrap_pyfunction!(strat::column_figure, m)?)?;
    m.add_function(wrap_pyfunction!(reversals::reversal_rate, m)?)?;
    m.add_function(wrap_pyfunction!(simulate::simulate_timescale, m)?)?;
    m.add_function(wrap_pyfunction!(simulate::simulate_section, m)?)?;
    m.add_function(wrap_pyfunction!(shallowing::unflatten, m)?)?;
    m.add_function(wrap_pyfunction!(psv::psv, m)?)?;
    // The cautions, each written once in the library (present::cautions).
    use lodestone::present::cautions;
    for (name, text) in [
        ("FIELD_TEST_CAUTION", cautions::FIELD_TESTS),
        ("POLE_CAUTION", cautions::POLES),
        ("ONE_VGP_CAUTION", cautions::ONE_VGP),
        ("PSV_CAUTION", cautions::PSV),
        ("SHALLOWING_CAUTION", cautions::UNFLATTEN),
        ("CORRELATION_CAUTION", cautions::CORRELATION),
        ("FIELD_CAUTION", cautions::PRESENT_FIELD),
        ("RATE_CAUTION", cautions::RATE),
        ("SYNTHETIC_CAUTION", cautions::SYNTHETIC_TIMESCALE),
        ("SYNTHETIC_SECTION_CAUTION", cautions::SYNTHETIC_SECTION),
    ] {
        m.add(name, text)?;
    }
    // The defaults decided in the library, so that the Python signatures take the verbs' values.
    let c = lodestone::strat::CorrelateOptions::default();
    m.add("VGP_THRESHOLD", lodestone::strat::DEFAULT_THRESHOLD)?;
    m.add("MIN_LEVELS", lodestone::strat::DEFAULT_MIN_LEVELS)?;
    m.add("MISS_PENALTY", c.miss_penalty)?;
    m.add("HIATUS_PENALTY", c.hiatus_penalty)?;
    m.add("SKIP_PENALTY", c.skip_penalty)?;
    m.add("RATE_SPREAD", c.rate_spread)?;
    m.add("CANDIDATES", c.candidates)?;
    m.add("LOW_THRESHOLD", lodestone::field::DEFAULT_LOW_THRESHOLD)?;
    Ok(())
}
