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
    /// What kind of fault it is; decisions go by this, never by the message's wording.
    pub kind: TableFault,
    /// File name as the user gave it.
    pub file: String,
    /// 1-based line number in the file (the header is line 1 unless comment lines precede it).
    pub line: usize,
    /// Column name, when the problem concerns one cell or one missing column.
    pub column: Option<String>,
    /// What was found and what was expected.
    pub message: String,
}

impl TableError {
    /// A fault of `kind` in `file` at `line`, optionally naming a column.
    pub fn new(
        kind: TableFault,
        file: impl Into<String>,
        line: usize,
        column: Option<&str>,
        message: impl Into<String>,
    ) -> Self {
        TableError { kind, file: file.into(), line, column: column.map(str::to_string), message: message.into() }
    }

    /// A fault of a value (a cell, or the content of a row) in `file` at `line`.
    pub fn value(file: impl Into<String>, line: usize, column: Option<&str>, message: impl Into<String>) -> Self {
        Self::new(TableFault::Value, file, line, column, message)
    }
}

/// The kinds of [`TableError`]. A reader reports the faults of a file's text and layout before the faults of
/// its values, whichever comes first in the file ([`TableFault::is_layout`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TableFault {
    /// The file could not be read (an I/O error).
    Read,
    /// The bytes are not UTF-8 text.
    Encoding,
    /// The CSV layer cannot parse the text.
    Syntax,
    /// The header row is malformed: an empty or repeated column name.
    Header,
    /// A data row has another number of cells than the header.
    CellCount,
    /// The table has no header row, or no data rows.
    Empty,
    /// A required column is absent.
    MissingColumn,
    /// A cell's value, or the content of a row or setting, is invalid.
    Value,
}

impl TableFault {
    /// True for a fault of the file's text or layout (reading, UTF-8, CSV, header, cell count), which the
    /// whole-table reader finds before any fault of a value.
    pub fn is_layout(self) -> bool {
        matches!(self, Self::Read | Self::Encoding | Self::Syntax | Self::Header | Self::CellCount)
    }
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
    /// A computation on one specimen failed: names the specimen and keeps the cause's kind.
    #[error("specimen {specimen}: {cause}")]
    Specimen {
        /// The specimen's name.
        specimen: String,
        /// What went wrong.
        cause: Box<Error>,
    },
    /// More items than the computation can hold or index (`count` of `what`, at most `limit`).
    #[error("{count} {what}: more than the {limit} that can be held")]
    TooMany {
        /// What is being counted (directions, untilting steps, chrons …).
        what: &'static str,
        /// The count asked for.
        count: u64,
        /// The largest count accepted.
        limit: u64,
    },
    /// A length of time that should be a positive number of Myr (a polarity interval).
    #[error("interval length {0} is not a positive number of Myr")]
    IntervalLength(f64),
    /// A figure could not be drawn or encoded (`context` says which step, `detail` what failed).
    #[error("{context}: {detail}")]
    Figure {
        /// What was being done (e.g. `drawing the figure failed`, `PNG encoding failed`, `figure fold`).
        context: String,
        /// The cause, from the drawing or encoding layer.
        detail: String,
    },
    /// A figure file name without a known extension.
    #[error("figure path '{0}' must end in .svg or .png")]
    FigurePath(String),
    /// An input file that is not UTF-8 text.
    #[error("{0}: not UTF-8 text")]
    NotText(String),
    /// An input or setting that cannot be used: which quantity, the offending value as given, and
    /// why, in words (the message).
    #[error("{reason}")]
    Invalid {
        /// The quantity or setting at fault (e.g. `window`, `rate history`, `flattening factor`).
        quantity: &'static str,
        /// The offending value, as given.
        value: String,
        /// What is wrong and what is expected, for people.
        reason: String,
    },
    /// Two inputs that must match in length do not.
    #[error("{left} {left_what} but {right} {right_what}")]
    LengthMismatch {
        /// What the first count counts.
        left_what: &'static str,
        /// The first count.
        left: usize,
        /// What the second count counts.
        right_what: &'static str,
        /// The second count.
        right: usize,
    },
}

impl Error {
    /// An [`Error::Invalid`] for `quantity` with the offending `value` and the `reason` in words.
    pub fn invalid(quantity: &'static str, value: impl std::fmt::Display, reason: impl Into<String>) -> Self {
        Error::Invalid { quantity, value: value.to_string(), reason: reason.into() }
    }

    /// The error itself, or for an error about one specimen its cause (the specimen being known).
    pub fn detail(&self) -> &Error {
        match self {
            Error::Specimen { cause, .. } => cause,
            e => e,
        }
    }
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

/// Check that `value` is finite and above zero.
pub fn check_positive(name: &'static str, value: f64) -> Result<f64> {
    if value > 0.0 && value.is_finite() {
        Ok(value)
    } else {
        Err(Error::OutOfRange { name, value, range: "(0, ∞)" })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::figures::FigureFormat;

    #[test]
    fn typed_errors_carry_the_offending_value() {
        let e = crate::reversals::Sample::new(vec![0.2, -0.1, 0.3], None).unwrap_err();
        assert_eq!(e, Error::IntervalLength(-0.1));
        assert_eq!(e.to_string(), "interval length -0.1 is not a positive number of Myr");
        let e = FigureFormat::from_path(std::path::Path::new("net.pdf")).unwrap_err();
        assert_eq!(e, Error::FigurePath("net.pdf".into()));
        let e = Error::TooMany { what: "untilting steps", count: 200_001, limit: 100_000 };
        assert_eq!(e.to_string(), "200001 untilting steps: more than the 100000 that can be held");
        // An unusable setting names the quantity and carries the value; the message is the reason.
        let e = crate::dirstats::unflatten_given(&[], 1.5).unwrap_err();
        assert!(matches!(&e, Error::Invalid { quantity: "flattening factor", value, .. } if value == "1.5"), "{e:?}");
        assert_eq!(e.to_string(), "must lie in (0, 1] (tan I_f = f tan I₀), got 1.5");
        let e = crate::simulate::parse_rates("2.0@x,1.0").unwrap_err();
        assert!(matches!(&e, Error::Invalid { quantity: "rate history", value, .. } if value == "2.0@x,1.0"), "{e:?}");
        let e = crate::strat::build_zones(crate::model::StratAxis::Height, &[1.0, 2.0], &[], 1).unwrap_err();
        assert_eq!(e, Error::LengthMismatch { left_what: "positions", left: 2, right_what: "polarities", right: 0 });
        assert_eq!(e.to_string(), "2 positions but 0 polarities");
    }
}
