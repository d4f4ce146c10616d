//! The polarity time scale: chrons with their young and old boundary ages.

use super::polarity::Polarity;

/// One polarity chron.
///
/// # Units
/// Ages in Ma, growing into the past; `young < old`.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Chron {
    /// Chron name, if given (e.g. `C1n`).
    pub name: Option<String>,
    /// Age of the young boundary, Ma.
    pub young: f64,
    /// Age of the old boundary, Ma.
    pub old: f64,
    /// Polarity.
    pub polarity: Polarity,
    /// Line in the source file.
    pub line: usize,
}

impl Chron {
    /// Duration, Myr.
    pub fn duration(&self) -> f64 {
        self.old - self.young
    }
}

/// A validated polarity time scale: chrons sorted young → old, tiling time without gap or overlap.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TimeScale {
    /// File name for messages.
    pub source: String,
    /// Chrons, youngest first.
    pub chrons: Vec<Chron>,
    /// The table states that the old boundary of its oldest row is a reversal (optional column
    /// `old_edge` = `reversal` on that row), so the oldest row is a whole interval; otherwise the table
    /// may be cut at an arbitrary age (`old_edge` = `cut`, or empty).
    pub oldest_is_reversal: bool,
}

/// Boundaries closer than this (Myr) are treated as touching.
pub const AGE_TOLERANCE: f64 = 1e-9;

impl TimeScale {
    /// Age of the youngest boundary, Ma.
    pub fn young(&self) -> f64 {
        self.chrons.first().map_or(0.0, |c| c.young)
    }
    /// Age of the oldest boundary, Ma.
    pub fn old(&self) -> f64 {
        self.chrons.last().map_or(0.0, |c| c.old)
    }
}
