//! Fitting a chosen range of steps of one specimen.

use super::pca::{fit_line, fit_plane};
use crate::error::{Error, Result};
use crate::model::{Anchor, FitKind, SpecimenSteps};
use crate::sphere::Direction;

/// One fit of one specimen, ready for a directions table.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SpecimenFit {
    /// Specimen name.
    pub specimen: String,
    /// Line or plane.
    pub kind: FitKind,
    /// Free or anchored to the origin.
    pub anchor: Anchor,
    /// Number of steps used.
    pub n_steps: usize,
    /// First step used.
    pub from: f64,
    /// Last step used.
    pub to: f64,
    /// Index of the first step used in the specimen's step list.
    pub first: usize,
    /// Index of the last step used.
    pub last: usize,
    /// The line direction, or the pole of the plane.
    pub direction: Direction,
    /// Maximum angular deviation, degrees.
    pub mad: f64,
    /// DANG, degrees (lines only).
    pub dang: Option<f64>,
}

/// Fit a line or plane to the steps of `sp` within `[from, to]`.
///
/// The steps used must be consecutive in the specimen's list (they are, since the list is sorted).
/// Errors: too few steps in the range (2 for a line, 3 for a plane), or a degenerate geometry.
pub fn fit_range(sp: &SpecimenSteps, from: f64, to: f64, kind: FitKind, anchor: Anchor) -> Result<SpecimenFit> {
    let idx = sp.in_range(from, to);
    if idx.len() < kind.min_steps() {
        let cause = Error::invalid(
            "fit range",
            format!("{from} to {to}"),
            format!(
                "the range {from} to {to} holds {} step(s); a {} needs at least {}",
                idx.len(),
                kind.as_str(),
                kind.min_steps()
            ),
        );
        return Err(Error::Specimen { specimen: sp.specimen.clone(), cause: Box::new(cause) });
    }
    let (first, last) = (idx[0], idx[idx.len() - 1]);
    fit_indices(sp, first, last, kind, anchor)
}

/// Fit the steps `first..=last` (indices into the specimen's list).
pub(crate) fn fit_indices(
    sp: &SpecimenSteps,
    first: usize,
    last: usize,
    kind: FitKind,
    anchor: Anchor,
) -> Result<SpecimenFit> {
    let pts: Vec<_> = sp.steps[first..=last].iter().map(|s| s.vector()).collect();
    let wrap = |e: Error| Error::Specimen { specimen: sp.specimen.clone(), cause: Box::new(e) };
    let (direction, mad, dang) = match kind {
        FitKind::Line => {
            let f = fit_line(&pts, anchor).map_err(wrap)?;
            (f.direction, f.mad, Some(f.dang).filter(|d| d.is_finite()))
        }
        FitKind::Plane => {
            let f = fit_plane(&pts, anchor).map_err(wrap)?;
            (f.pole, f.mad, None)
        }
    };
    Ok(SpecimenFit {
        specimen: sp.specimen.clone(),
        kind,
        anchor,
        n_steps: last - first + 1,
        from: sp.steps[first].step,
        to: sp.steps[last].step,
        first,
        last,
        direction,
        mad,
        dang,
    })
}
