//! The orientation matrix of a set of unit vectors and its principal axes.

use crate::linalg::{sym_eigen, SymEigen};
use crate::sphere::Vec3;

/// Orientation matrix T = (1/N) Σ uᵢ uᵢᵀ.
///
/// # References
/// Scheidegger (1965); Fisher, Lewis & Embleton (1987), §3.2.4.
pub fn orientation_matrix(vectors: &[Vec3]) -> [[f64; 3]; 3] {
    let mut t = [[0.0; 3]; 3];
    for v in vectors {
        let a = v.to_array();
        for i in 0..3 {
            for j in 0..3 {
                t[i][j] += a[i] * a[j];
            }
        }
    }
    let n = vectors.len().max(1) as f64;
    t.iter_mut().flatten().for_each(|c| *c /= n);
    t
}

/// Principal axes of the orientation matrix (eigenvalues τ₁ ≥ τ₂ ≥ τ₃, summing to 1).
pub fn principal_axes(vectors: &[Vec3]) -> SymEigen {
    sym_eigen(orientation_matrix(vectors))
}

/// The principal axis (largest eigenvalue) of a set of unit vectors, at its end with z > 0 (or, if it
/// lies in the x–y plane, x > 0, then y > 0). For directions (z down) that is the downward end; for
/// geographic points (z north) the northern end.
pub fn principal_axis_signed(vectors: &[Vec3]) -> Vec3 {
    let axis = principal_axes(vectors).vectors[0];
    let flip = if axis.z.abs() > 1e-12 {
        axis.z < 0.0
    } else if axis.x.abs() > 1e-12 {
        axis.x < 0.0
    } else {
        axis.y < 0.0
    };
    if flip {
        -axis
    } else {
        axis
    }
}
