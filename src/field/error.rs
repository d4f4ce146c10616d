//! Errors of the field-model computations.

use crate::error::TableError;
use thiserror::Error;

/// Everything that can go wrong in the present-field computations; each variant carries the value.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum FieldError {
    /// A model or record table could not be read (names `FILE:LINE` and the column).
    #[error(transparent)]
    Table(#[from] TableError),
    /// A year outside the span where the model is defined.
    #[error("year {year} is outside the model {model} (defined from {first} to {last})")]
    YearOutside {
        /// The year asked for.
        year: f64,
        /// The model's name (its file).
        model: String,
        /// First year of the model.
        first: f64,
        /// Last year of the model (last epoch, plus five years when it has secular variation).
        last: f64,
    },
    /// A numeric argument outside its valid range.
    #[error("{name} = {value} is outside {range}")]
    OutOfRange {
        /// Name of the quantity.
        name: &'static str,
        /// The value received.
        value: f64,
        /// The accepted range, for people.
        range: &'static str,
    },
    /// An iterative search did not settle.
    #[error("{what} did not converge near latitude {lat:.3}, longitude {lon:.3}")]
    NoConvergence {
        /// What was searched for.
        what: &'static str,
        /// Last latitude reached, degrees.
        lat: f64,
        /// Last longitude reached, degrees.
        lon: f64,
    },
    /// Too little data for the comparison asked for.
    #[error("{what} needs at least {needed} {unit}, got {got}")]
    TooFew {
        /// The computation.
        what: &'static str,
        /// The minimum.
        needed: usize,
        /// What was received.
        got: usize,
        /// What is counted.
        unit: &'static str,
    },
}

/// Result alias of the field module.
pub type FieldResult<T> = std::result::Result<T, FieldError>;

/// Check that `value` is finite and within `[lo, hi]`.
pub(crate) fn check(name: &'static str, value: f64, lo: f64, hi: f64, range: &'static str) -> FieldResult<f64> {
    if value.is_finite() && value >= lo && value <= hi {
        Ok(value)
    } else {
        Err(FieldError::OutOfRange { name, value, range })
    }
}
