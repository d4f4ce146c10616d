//! The picks table: a chosen range of steps (and fit kind) per specimen.

use super::reader::Table;
use crate::error::TableError;
use crate::model::{Anchor, FitKind, Pick, StepSet};

/// Read a picks table, checking each specimen against the steps table.
///
/// Errors name the line and column: an unknown specimen, `from` greater than `to`, a range that
/// holds fewer steps than the fit needs (2 for a line, 3 for a plane), bad `kind` or `anchor` words.
pub fn read_picks(t: &Table, steps: &StepSet) -> Result<Vec<Pick>, TableError> {
    t.require_rows()?;
    let spec_c = t.require("specimen")?;
    let from_c = t.require("from")?;
    let to_c = t.require("to")?;
    let (kind_c, anchor_c) = (t.col("kind"), t.col("anchor"));
    let mut out = Vec::with_capacity(t.rows.len());
    for row in &t.rows {
        let specimen = t.text(row, spec_c).to_string();
        let Some(sp) = steps.get(&specimen) else {
            let msg = if specimen.is_empty() {
                "is empty; expected a specimen name".to_string()
            } else {
                format!("specimen '{specimen}' is not in the steps table {}", steps.source)
            };
            return Err(t.error(row.line, Some("specimen"), msg));
        };
        let from = t.number(row, from_c)?;
        let to = t.number(row, to_c)?;
        if from > to {
            return Err(t.error(row.line, Some("to"), format!("{to} is below from = {from}")));
        }
        let kind = match t.opt_text(row, kind_c).map(|s| s.to_lowercase()).as_deref() {
            None | Some("line") => FitKind::Line,
            Some("plane") => FitKind::Plane,
            Some(o) => return Err(t.error(row.line, Some("kind"), format!("'{o}' is not 'line' or 'plane'"))),
        };
        let anchor = match t.opt_text(row, anchor_c).map(|s| s.to_lowercase()).as_deref() {
            None | Some("free") => Anchor::Free,
            Some("origin") => Anchor::Origin,
            Some(o) => return Err(t.error(row.line, Some("anchor"), format!("'{o}' is not 'free' or 'origin'"))),
        };
        let n = sp.in_range(from, to).len();
        if n < kind.min_steps() {
            return Err(t.error(
                row.line,
                Some("from"),
                format!(
                    "the range {from} to {to} holds {n} step(s) of specimen {specimen}; a {} needs at least {}",
                    kind.as_str(),
                    kind.min_steps()
                ),
            ));
        }
        out.push(Pick { line: row.line, specimen, from, to, kind, anchor });
    }
    Ok(out)
}
