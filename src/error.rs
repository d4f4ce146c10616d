//! The library's error type.
//!
//! Every variant carries the offending value so that the command layer can print a message that a
//! scientist can act on without a debugger.

use thiserror::Error;

/// A problem found while reading a table: names the file, the line and (when known) the column.
///
/// Displayed as `FILE:LINE: column 'NAME': MESSAGE`, e.g.
/// `sites.csv:14: column 'inc': 95.2 is outside [-90, 90]`.
#[derive(Debug, Clone, PartialEq, Error)]
#[error("{file}:{line}: {}{message}", column.as_ref().map(|c| format!("column '{c}': ")).unwrap_or_default())]
pub struct TableError {
    /// File name as the user gave it.
    pub file: String,
    /// 1-based line number in the file (the header is line 1 unless comment lines precede it).
    pub line: usize,
    /// Column name, when the problem concerns one cell or one missing column.
    pub column: Option<String>,
    /// What was found and what was expected.
    pub message: String,
}

/// Everything that can go wrong in a lodestone computation.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum Error {
    /// A table could not be read; see [`TableError`].
    #[error(transparent)]
    Table(#[from] TableError),
    /// A numeric argument outside its valid range.
    #[error("{name} = {value} is outside {range}")]
    OutOfRange {
        /// Name of the quantity.
        name: &'static str,
        /// The value received.
        value: f64,
        /// The accepted range, written for people (e.g. `[-90, 90]`).
        range: &'static str,
    },
    /// Not enough data for the requested statistic.
    #[error("{what} needs at least {needed} {unit}, got {got}")]
    TooFew {
        /// The computation that was asked for.
        what: &'static str,
        /// The minimum count.
        needed: usize,
        /// The count received.
        got: usize,
        /// What is being counted (directions, sites, steps …).
        unit: &'static str,
    },
    /// The data do not define the requested quantity (e.g. the mean of an antipodal pair).
    #[error("{0}")]
    Undefined(String),
    /// Any other invalid input, described in words.
    #[error("{0}")]
    Invalid(String),
}

/// Result alias used throughout the library.
pub type Result<T, E = Error> = std::result::Result<T, E>;

/// Check that `value` is finite and lies within `[lo, hi]`.
pub fn check_range(name: &'static str, value: f64, lo: f64, hi: f64, range: &'static str) -> Result<f64> {
    if value.is_finite() && value >= lo && value <= hi {
        Ok(value)
    } else {
        Err(Error::OutOfRange { name, value, range })
    }
}
