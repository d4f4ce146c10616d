//! What every field-test presenter shares (the labels of a run), and the section's table of the
//! reversal and fold tests side by side, built from the same rows as the verbs' tables.

use super::{Cell, Sheet};
use crate::fieldtests::{FoldTest, MeanComparison};

/// What a field test was run on: the source's name, the frame, the confidence level and the
/// Monte Carlo settings.
pub struct TestLabels<'a> {
    /// The directions table's name (two names joined by a space for a common-mean test).
    pub file: &'a str,
    /// Coordinate frame label (`geographic`, `tilt-corrected`).
    pub frame: &'a str,
    /// Confidence level of the tests.
    pub confidence: f64,
    /// Seed of the resampling.
    pub seed: u64,
    /// Resamples drawn.
    pub resamples: usize,
}

/// `pass` or `fail`.
pub(super) fn pass_fail(b: bool) -> &'static str {
    if b {
        "pass"
    } else {
        "fail"
    }
}

/// The notes followed by the cautions: the `notes` array of a field test's JSON.
pub(super) fn json_notes(notes: &[String], cautions: &[String]) -> Vec<String> {
    notes.iter().chain(cautions).cloned().collect()
}

/// The section's table of field tests: one row per quantity (`test`, `quantity`, `value`,
/// `critical`, `outcome`), the reversal test's rows as `test reversal` shows them and the fold
/// test's summary rows.
pub fn section_sheet(reversal: Option<&MeanComparison>, fold: Option<&FoldTest>) -> Sheet {
    let mut s = Sheet::new("Field tests (95 %)", &["test", "quantity", "value", "critical", "outcome"]);
    let mut tagged = |name: &str, rows: Vec<Vec<Cell>>| {
        for r in rows {
            s.push(std::iter::once(Cell::Text(name.to_string())).chain(r).collect());
        }
    };
    if let Some(c) = reversal {
        tagged("reversal", super::mean_comparison::check_rows(c));
    }
    if let Some(t) = fold {
        tagged("fold", super::fold_test::summary_rows(t));
    }
    s
}
