//! Schmidt semi-normalised associated Legendre functions at one colatitude, held for repeated field
//! evaluations (the recursion itself is [`crate::field::schmidt`]).

/// Pₗᵐ(cos θ) and dPₗᵐ/dθ for 0 ≤ m ≤ l ≤ L at one colatitude θ.
#[derive(Debug, Clone, PartialEq)]
pub struct SchmidtTable {
    degree: usize,
    p: Vec<f64>,
    dp: Vec<f64>,
}

impl SchmidtTable {
    /// Pₗᵐ(cos θ) (Schmidt semi-normalised); 0 for m > l or l above the table's degree.
    pub fn p(&self, l: usize, m: usize) -> f64 {
        if m > l || l > self.degree {
            0.0
        } else {
            self.p[crate::field::index(l, m)]
        }
    }
    /// dPₗᵐ/dθ, θ the colatitude in radians.
    pub fn dp(&self, l: usize, m: usize) -> f64 {
        if m > l || l > self.degree {
            0.0
        } else {
            self.dp[crate::field::index(l, m)]
        }
    }
    /// The largest degree held.
    pub fn degree(&self) -> usize {
        self.degree
    }
}

/// Schmidt semi-normalised Pₗᵐ(cos θ) and their derivatives with respect to θ up to degree `degree`.
///
/// # Units
/// `colatitude` in radians.
///
/// # References
/// Langel (1987), §4.2; Winch et al. (2005), *Geophys. J. Int.* 160, 487–504 (see
/// [`crate::field::schmidt`]).
pub fn schmidt_legendre(degree: usize, colatitude: f64) -> SchmidtTable {
    let (mut p, mut dp) = (Vec::new(), Vec::new());
    crate::field::schmidt(colatitude, degree, &mut p, &mut dp);
    SchmidtTable { degree, p, dp }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn matches_closed_forms_of_degree_three() {
        // Closed forms of the Schmidt semi-normalised functions (Winch et al. 2005; x = cos θ,
        // s = sin θ): P₃⁰ = (5x³ − 3x)/2, P₃¹ = √(3/8) s (5x² − 1), P₃² = (√15/2) x s², P₃³ = √(5/8) s³,
        // P₂¹ = √3 x s; the derivatives against central differences.
        for theta in [0.1f64, 0.7, 1.3, 2.0, 3.0] {
            let t = schmidt_legendre(4, theta);
            let (x, s) = (theta.cos(), theta.sin());
            assert_abs_diff_eq!(t.p(3, 0), (5.0 * x.powi(3) - 3.0 * x) / 2.0, epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 1), (3.0f64 / 8.0).sqrt() * s * (5.0 * x * x - 1.0), epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 2), 15f64.sqrt() / 2.0 * x * s * s, epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 3), (5.0f64 / 8.0).sqrt() * s.powi(3), epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(2, 1), 3f64.sqrt() * x * s, epsilon = 1e-13);
            let h = 1e-6;
            let (up, down) = (schmidt_legendre(4, theta + h), schmidt_legendre(4, theta - h));
            for l in 0..=4 {
                for m in 0..=l {
                    assert_abs_diff_eq!(t.dp(l, m), (up.p(l, m) - down.p(l, m)) / (2.0 * h), epsilon = 1e-7);
                }
            }
        }
    }
}
