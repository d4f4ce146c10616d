//! Small dense linear algebra: the eigen-decomposition of symmetric 3 × 3 matrices.
//!
//! Orientation matrices (fold and reversal tests) and the scatter matrices of principal-component
//! analysis are all symmetric 3 × 3; a cyclic Jacobi iteration diagonalises them to machine precision
//! in a handful of sweeps without any external dependency.

use crate::sphere::Vec3;

/// Eigenvalues (descending) and matching unit eigenvectors of a symmetric 3 × 3 matrix.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SymEigen {
    /// Eigenvalues, largest first.
    pub values: [f64; 3],
    /// Eigenvectors, `vectors[i]` belongs to `values[i]`.
    pub vectors: [Vec3; 3],
}

/// Eigen-decomposition of the symmetric matrix `a` (only its upper triangle is read).
///
/// # Formula
/// Cyclic Jacobi rotations until the off-diagonal norm is below 1e-30 of the trace scale.
///
/// # References
/// Golub & Van Loan (2013), *Matrix Computations*, 4th ed., §8.5 (the symmetric Jacobi method).
pub fn sym_eigen(a: [[f64; 3]; 3]) -> SymEigen {
    let mut m = a;
    (m[1][0], m[2][0], m[2][1]) = (m[0][1], m[0][2], m[1][2]);
    let mut v = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];
    for _sweep in 0..64 {
        let off = m[0][1].powi(2) + m[0][2].powi(2) + m[1][2].powi(2);
        let scale = m[0][0].powi(2) + m[1][1].powi(2) + m[2][2].powi(2);
        if off <= 1e-32 * scale.max(1e-300) {
            break;
        }
        for (p, q) in [(0usize, 1usize), (0, 2), (1, 2)] {
            if m[p][q].abs() < 1e-300 {
                continue;
            }
            let theta = (m[q][q] - m[p][p]) / (2.0 * m[p][q]);
            let t = theta.signum() / (theta.abs() + (theta * theta + 1.0).sqrt());
            let t = if theta == 0.0 { 1.0 } else { t };
            let c = 1.0 / (t * t + 1.0).sqrt();
            let s = t * c;
            for row in m.iter_mut() {
                let (mkp, mkq) = (row[p], row[q]);
                row[p] = c * mkp - s * mkq;
                row[q] = s * mkp + c * mkq;
            }
            let (rp, rq) = (m[p], m[q]);
            m[p] = std::array::from_fn(|k| c * rp[k] - s * rq[k]);
            m[q] = std::array::from_fn(|k| s * rp[k] + c * rq[k]);
            for row in v.iter_mut() {
                let (vp, vq) = (row[p], row[q]);
                row[p] = c * vp - s * vq;
                row[q] = s * vp + c * vq;
            }
        }
    }
    let mut idx = [0usize, 1, 2];
    idx.sort_by(|&i, &j| m[j][j].total_cmp(&m[i][i]));
    let col = |j: usize| Vec3::new(v[0][j], v[1][j], v[2][j]);
    SymEigen {
        values: [m[idx[0]][idx[0]], m[idx[1]][idx[1]], m[idx[2]][idx[2]]],
        vectors: [col(idx[0]), col(idx[1]), col(idx[2])],
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn diagonal_and_known_matrix() {
        let e = sym_eigen([[1.0, 0.0, 0.0], [0.0, 3.0, 0.0], [0.0, 0.0, 2.0]]);
        assert_eq!(e.values, [3.0, 2.0, 1.0]);
        // [[2,1,0],[1,2,0],[0,0,5]] has eigenvalues 5, 3, 1 (hand computation: the 2x2 block has 2 ± 1).
        let e = sym_eigen([[2.0, 1.0, 0.0], [1.0, 2.0, 0.0], [0.0, 0.0, 5.0]]);
        assert_abs_diff_eq!(e.values[0], 5.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.values[1], 3.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.values[2], 1.0, epsilon = 1e-12);
        let v = e.vectors[1];
        assert_abs_diff_eq!(v.x.abs(), 0.5f64.sqrt(), epsilon = 1e-12);
        assert_abs_diff_eq!(v.y.abs(), 0.5f64.sqrt(), epsilon = 1e-12);
    }

    #[test]
    fn reconstructs_a_random_symmetric_matrix() {
        let a = [[4.0, -2.0, 0.5], [-2.0, 3.0, 1.5], [0.5, 1.5, -1.0]];
        let e = sym_eigen(a);
        for i in 0..3 {
            let v = e.vectors[i];
            let av = Vec3::new(
                a[0][0] * v.x + a[0][1] * v.y + a[0][2] * v.z,
                a[1][0] * v.x + a[1][1] * v.y + a[1][2] * v.z,
                a[2][0] * v.x + a[2][1] * v.y + a[2][2] * v.z,
            );
            assert_abs_diff_eq!((av - v * e.values[i]).norm(), 0.0, epsilon = 1e-10);
            assert_abs_diff_eq!(v.norm(), 1.0, epsilon = 1e-12);
        }
        // Trace is preserved.
        assert_abs_diff_eq!(e.values.iter().sum::<f64>(), 6.0, epsilon = 1e-12);
    }
}
