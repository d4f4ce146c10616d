//! A chosen fit: a specimen, a range of its steps and what to fit.

use super::fit::{Anchor, FitKind};

/// One chosen fit: a specimen, a step range (inclusive) and what to fit.
#[derive(Debug, Clone, PartialEq)]
pub struct Pick {
    /// Line in the picks file.
    pub line: usize,
    /// Specimen name (present in the steps table).
    pub specimen: String,
    /// First step of the range (inclusive).
    pub from: f64,
    /// Last step of the range (inclusive).
    pub to: f64,
    /// Line or plane (default line).
    pub kind: FitKind,
    /// Free or through the origin (default free).
    pub anchor: Anchor,
}
