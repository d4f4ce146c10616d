//! Principal-component fits of stepwise demagnetization data: best-fit lines and planes, MAD, DANG.

use crate::error::{Error, Result};
use crate::linalg::sym_eigen;
use crate::model::{Anchor, FitKind};
use crate::sphere::{angle_between, Direction, Vec3};

/// A best-fit line through a range of demagnetization steps.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LineFit {
    /// Direction of the component. Free fits point from the last step used toward the first (the
    /// component removed over the range); origin-anchored fits point from the origin toward the steps.
    pub direction: Direction,
    /// Maximum angular deviation, degrees.
    pub mad: f64,
    /// Angle between the free line and the direction from the origin to the centre of mass of the
    /// steps used (DANG), degrees.
    pub dang: f64,
    /// Centre of mass of the steps used (A·m², or whatever unit the vectors carry).
    pub centre: Vec3,
    /// Eigenvalues of the scatter matrix, largest first (units of the vectors squared; they overflow to
    /// infinity for moments beyond about 1e154, which leaves the fit itself unaffected).
    pub eigenvalues: [f64; 3],
    /// The anchor used.
    pub anchor: Anchor,
}

/// A best-fit plane (great circle) through a range of demagnetization steps.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PlaneFit {
    /// Pole to the plane, signed so that the remanence path from the first step used toward the last
    /// turns anticlockwise about it (right-hand rule); any sign is valid for great-circle analysis.
    pub pole: Direction,
    /// Maximum angular deviation of the plane, degrees.
    pub mad: f64,
    /// Centre of mass of the steps used.
    pub centre: Vec3,
    /// Eigenvalues of the scatter matrix, largest first (units of the vectors squared; they overflow to
    /// infinity for moments beyond about 1e154, which leaves the fit itself unaffected).
    pub eigenvalues: [f64; 3],
    /// The anchor used.
    pub anchor: Anchor,
}

/// The scatter matrix Σ (pᵢ − c)(pᵢ − c)ᵀ, with c the centre of mass (free) or the origin (anchored).
fn scatter(points: &[Vec3], anchor: Anchor) -> ([[f64; 3]; 3], Vec3) {
    let n = points.len().max(1) as f64;
    let mut c = Vec3::ZERO;
    for p in points {
        c += *p;
    }
    let centre = c * (1.0 / n);
    let shift = match anchor {
        Anchor::Free => centre,
        Anchor::Origin => Vec3::ZERO,
    };
    let mut t = [[0.0; 3]; 3];
    for p in points {
        let a = (*p - shift).to_array();
        for i in 0..3 {
            for j in 0..3 {
                t[i][j] += a[i] * a[j];
            }
        }
    }
    (t, centre)
}

/// The points divided by a power of two that brings the largest component near 1, and that power.
///
/// Directions, MAD and DANG do not depend on the scale of the vectors, but sums of squares of
/// moments near 1e±160 overflow or underflow; a power of two rescales exactly, so ordinary data give
/// bit-identical results.
fn rescaled(points: &[Vec3]) -> (Vec<Vec3>, f64) {
    let m = points.iter().flat_map(|p| [p.x.abs(), p.y.abs(), p.z.abs()]).fold(0.0f64, f64::max);
    if !(m > 0.0 && m.is_finite()) {
        return (points.to_vec(), 1.0);
    }
    let scale = 2f64.powi(m.log2().floor() as i32);
    if !(scale > 0.0 && scale.is_finite()) {
        return (points.to_vec(), 1.0);
    }
    let div = |p: &Vec3| Vec3 { x: p.x / scale, y: p.y / scale, z: p.z / scale };
    (points.iter().map(div).collect(), scale)
}

fn check_points(points: &[Vec3], kind: FitKind) -> Result<()> {
    let need = kind.min_steps();
    if points.len() < need {
        let what = match kind {
            FitKind::Line => "a best-fit line",
            FitKind::Plane => "a best-fit plane",
        };
        return Err(Error::TooFew { what, needed: need, got: points.len(), unit: "steps" });
    }
    if points.iter().any(|p| !(p.x.is_finite() && p.y.is_finite() && p.z.is_finite())) {
        return Err(Error::invalid(
            "demagnetization step",
            "non-finite",
            "a demagnetization step has a non-finite component",
        ));
    }
    Ok(())
}

/// Best-fit line through demagnetization vectors (principal-component analysis).
///
/// # Units
/// `points` are remanence vectors in any consistent unit (A·m²); angles out in degrees.
///
/// # Formula
/// T = Σ (pᵢ − c)(pᵢ − c)ᵀ with c the centre of mass (free) or 0 (anchored); eigenvalues
/// λ₁ ≥ λ₂ ≥ λ₃ and the principal eigenvector v₁ give the line. This is the form used here:
///
/// MAD = atan √((λ₂ + λ₃)/λ₁),
///
/// with λ the eigenvalues of T (sums of squares). Written with the singular values sᵢ = √λᵢ of the
/// centred data matrix it reads atan(√(s₂² + s₃²)/s₁); the two are the same quantity, and the
/// printed forms that put λ² under the root mean singular values by λ. DANG = ∠(v₁, c)
/// (computed with the free line, also for anchored fits).
///
/// # References
/// Kirschvink, J. L. (1980), The least-squares line and plane and the analysis of palaeomagnetic
/// data, *Geophys. J. R. astr. Soc.* 62, 699–718 (MAD, Table 1; the form above from memory).
/// Tauxe, L. & Staudigel, H. (2004), *G-cubed* 5, Q02H06 (DANG).
pub fn fit_line(points: &[Vec3], anchor: Anchor) -> Result<LineFit> {
    check_points(points, FitKind::Line)?;
    let (scaled, scale) = rescaled(points);
    let points = scaled.as_slice();
    let (t, centre) = scatter(points, anchor);
    let e = sym_eigen(t);
    let l = e.values.map(|x| x.max(0.0));
    if !(l[0] > 0.0) {
        return Err(Error::Undefined("the steps coincide: a line through them is undefined".into()));
    }
    let mad = ((l[1] + l[2]) / l[0]).sqrt().atan().to_degrees();
    let v = e.vectors[0];
    // Free fit for DANG (the same line when the fit is free).
    let free_axis = match anchor {
        Anchor::Free => v,
        Anchor::Origin => {
            let (tf, _) = scatter(points, Anchor::Free);
            let ef = sym_eigen(tf);
            if ef.values[0] > 0.0 {
                ef.vectors[0]
            } else {
                v
            }
        }
    };
    let span = points[0] - points[points.len() - 1];
    let orient = |axis: Vec3, reference: Vec3| {
        if axis.dot(reference) < 0.0 {
            -axis
        } else {
            axis
        }
    };
    let free_dir = orient(free_axis, if span.norm() > 0.0 { span } else { centre });
    let v = match anchor {
        Anchor::Free => free_dir,
        Anchor::Origin => orient(v, centre),
    };
    let dang = if centre.norm() > crate::tolerance::ZERO_NORM { angle_between(free_dir, centre) } else { f64::NAN };
    let direction = Direction::from_vector(v).ok_or_else(|| Error::Undefined("no line direction".into()))?;
    Ok(LineFit {
        direction,
        mad,
        dang,
        centre: centre * scale,
        eigenvalues: e.values.map(|x| x * scale * scale),
        anchor,
    })
}

/// Best-fit plane through demagnetization vectors (principal-component analysis).
///
/// # Units
/// As [`fit_line`].
///
/// # Formula
/// T as in [`fit_line`]; the pole is v₃ (least eigenvalue) and
///
/// MAD = atan √(λ₃/λ₂ + λ₃/λ₁).
///
/// # References
/// Kirschvink (1980), Table 1 (the plane MAD; form from memory, checked against NumPy SVD in the tests).
pub fn fit_plane(points: &[Vec3], anchor: Anchor) -> Result<PlaneFit> {
    check_points(points, FitKind::Plane)?;
    let (scaled, scale) = rescaled(points);
    let points = scaled.as_slice();
    let (t, centre) = scatter(points, anchor);
    let e = sym_eigen(t);
    let l = e.values.map(|x| x.max(0.0));
    if !(l[1] > 1e-14 * l[0]) || !(l[0] > 0.0) {
        return Err(Error::Undefined("the steps lie on one line: a plane through them is undefined".into()));
    }
    let mad = (l[2] / l[1] + l[2] / l[0]).sqrt().atan().to_degrees();
    let mut pole = e.vectors[2];
    let turn = points[0].cross(points[points.len() - 1]);
    if pole.dot(turn) < 0.0 {
        pole = -pole;
    }
    let pole = Direction::from_vector(pole).ok_or_else(|| Error::Undefined("no plane pole".into()))?;
    Ok(PlaneFit { pole, mad, centre: centre * scale, eigenvalues: e.values.map(|x| x * scale * scale), anchor })
}
