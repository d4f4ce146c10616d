//! What the inclination-shallowing correction takes from a directions table, and the checks on a
//! given flattening factor: in one place so that the command line and the Python package agree.

use crate::error::{Error, Result};
use crate::model::{DirectionKind, DirectionSet};
use crate::sphere::Direction;

use super::unflatten::{unflatten_factor, FactorResult};

/// The directions of a table for the shallowing correction.
#[derive(Debug, Clone, PartialEq)]
pub struct ShallowingInput {
    /// The lines, tilt-corrected where that was asked for and bedding is given.
    pub directions: Vec<Direction>,
    /// True when the table has no bedding although the tilt-corrected frame was asked for (the
    /// directions are then used as given).
    pub no_bedding: bool,
}

/// The lines of a directions table, untilted when `tilt` (bedding must then be on every row, or on
/// none: then the directions are used as given and `no_bedding` says so).
///
/// # Errors
/// A row of `kind = plane` (the method needs lines), or bedding on some rows only.
pub fn shallowing_directions(set: &DirectionSet, tilt: bool) -> Result<ShallowingInput> {
    let mut directions = Vec::with_capacity(set.records.len());
    let mut untilted = 0;
    for r in &set.records {
        if r.kind != DirectionKind::Line {
            return Err(crate::error::TableError::value(
                set.source.as_str(),
                r.line,
                Some("kind"),
                "a plane cannot be unflattened; the method needs lines",
            )
            .into());
        }
        match (tilt, r.bedding) {
            (true, Some(b)) => {
                untilted += 1;
                directions.push(Direction::from_vector(b.untilt(r.direction.to_vector())).expect("unit vector"));
            }
            _ => directions.push(r.direction),
        }
    }
    if tilt && untilted > 0 && untilted < directions.len() {
        return Err(Error::invalid(
            "bedding",
            format!("{untilted} of {} rows", directions.len()),
            format!(
                "{}: only {untilted} of {} rows carry bedding; give bedding on every row or use the geographic frame",
                set.source,
                directions.len()
            ),
        ));
    }
    Ok(ShallowingInput { directions, no_bedding: tilt && untilted == 0 })
}

/// Unflatten by a factor known from elsewhere, which must lie in (0, 1] (tan I_f = f tan I₀).
///
/// # References
/// King, R. F. (1955), *Mon. Not. R. Astron. Soc. Geophys. Suppl.* 7, 115–134.
pub fn unflatten_given(directions: &[Direction], f: f64) -> Result<FactorResult> {
    if !(f > 0.0 && f <= 1.0) {
        return Err(Error::invalid(
            "flattening factor",
            f,
            format!("must lie in (0, 1] (tan I_f = f tan I₀), got {f}"),
        ));
    }
    unflatten_factor(directions, f)
}

impl FactorResult {
    /// The corrected mean inclination ∓ the corrected α95 (clipped to ±90°); None without an α95.
    pub fn inc_range(&self) -> Option<(f64, f64)> {
        let (m, a) = (self.corrected.mean?, self.corrected.alpha?);
        Some(((m.inc - a).max(-90.0), (m.inc + a).min(90.0)))
    }
}
