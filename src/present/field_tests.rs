//! The section's table of the reversal and fold tests side by side, built from the same rows as
//! the verbs' tables.

use super::{Cell, Sheet};
use crate::fieldtests::{FoldTest, MeanComparison};

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
