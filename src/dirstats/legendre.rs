//! Schmidt semi-normalised associated Legendre functions and their colatitude derivatives.

/// Pₗᵐ(cos θ) and dPₗᵐ/dθ for 0 ≤ m ≤ l ≤ L at one colatitude θ.
#[derive(Debug, Clone, PartialEq)]
pub struct SchmidtTable {
    degree: usize,
    p: Vec<f64>,
    dp: Vec<f64>,
}

impl SchmidtTable {
    fn at(l: usize, m: usize) -> usize {
        l * (l + 1) / 2 + m
    }
    /// Pₗᵐ(cos θ) (Schmidt semi-normalised); 0 for m > l or l above the table's degree.
    pub fn p(&self, l: usize, m: usize) -> f64 {
        if m > l || l > self.degree {
            0.0
        } else {
            self.p[Self::at(l, m)]
        }
    }
    /// dPₗᵐ/dθ, θ the colatitude in radians.
    pub fn dp(&self, l: usize, m: usize) -> f64 {
        if m > l || l > self.degree {
            0.0
        } else {
            self.dp[Self::at(l, m)]
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
/// # Formula
/// P₀⁰ = 1, P₁¹ = sin θ, Pₘᵐ = √((2m − 1)/(2m)) sin θ Pₘ₋₁ᵐ⁻¹ (m ≥ 2), Pₘ₊₁ᵐ = √(2m + 1) cos θ Pₘᵐ,
/// Pₗᵐ = ((2l − 1) cos θ Pₗ₋₁ᵐ − √((l − 1)² − m²) Pₗ₋₂ᵐ)/√(l² − m²); the derivatives follow by
/// differentiating each recursion with respect to θ.
///
/// # References
/// Langel, R. A. (1987), The main field, in *Geomagnetism* vol. 1 (ed. J. A. Jacobs), Academic Press,
/// §4.2 (Schmidt quasi-normalisation); Winch, D. E. et al. (2005), Geomagnetism and Schmidt
/// quasi-normalization, *Geophys. J. Int.* 160, 487–504.
pub fn schmidt_legendre(degree: usize, colatitude: f64) -> SchmidtTable {
    let (s, c) = colatitude.sin_cos();
    let size = (degree + 1) * (degree + 2) / 2;
    let (mut p, mut dp) = (vec![0.0; size], vec![0.0; size]);
    let at = SchmidtTable::at;
    p[0] = 1.0;
    for m in 0..=degree {
        if m == 1 {
            p[at(1, 1)] = s;
            dp[at(1, 1)] = c;
        } else if m >= 2 {
            let f = ((2 * m - 1) as f64 / (2 * m) as f64).sqrt();
            let (pm, dpm) = (p[at(m - 1, m - 1)], dp[at(m - 1, m - 1)]);
            p[at(m, m)] = f * s * pm;
            dp[at(m, m)] = f * (c * pm + s * dpm);
        }
        if m < degree {
            let f = ((2 * m + 1) as f64).sqrt();
            let (pm, dpm) = (p[at(m, m)], dp[at(m, m)]);
            p[at(m + 1, m)] = f * c * pm;
            dp[at(m + 1, m)] = f * (-s * pm + c * dpm);
        }
        for l in (m + 2)..=degree {
            let a = (2 * l - 1) as f64;
            let b = (((l - 1) * (l - 1) - m * m) as f64).sqrt();
            let d = ((l * l - m * m) as f64).sqrt();
            let (p1, p2) = (p[at(l - 1, m)], p[at(l - 2, m)]);
            let (d1, d2) = (dp[at(l - 1, m)], dp[at(l - 2, m)]);
            p[at(l, m)] = (a * c * p1 - b * p2) / d;
            dp[at(l, m)] = (a * (c * d1 - s * p1) - b * d2) / d;
        }
    }
    SchmidtTable { degree, p, dp }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn matches_closed_forms_of_degree_three() {
        // Closed forms of the Schmidt semi-normalised functions (Winch et al. 2005, table 1; with
        // x = cos θ, s = sin θ): P₃⁰ = (5x³ − 3x)/2, P₃¹ = √(3/8) s (5x² − 1), P₃² = (√15/2) x s²,
        // P₃³ = √(5/8) s³, P₂¹ = √3 x s.
        for theta in [0.1f64, 0.7, 1.3, 2.0, 3.0] {
            let t = schmidt_legendre(4, theta);
            let (x, s) = (theta.cos(), theta.sin());
            assert_abs_diff_eq!(t.p(3, 0), (5.0 * x.powi(3) - 3.0 * x) / 2.0, epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 1), (3.0f64 / 8.0).sqrt() * s * (5.0 * x * x - 1.0), epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 2), 15f64.sqrt() / 2.0 * x * s * s, epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(3, 3), (5.0f64 / 8.0).sqrt() * s.powi(3), epsilon = 1e-13);
            assert_abs_diff_eq!(t.p(2, 1), 3f64.sqrt() * x * s, epsilon = 1e-13);
            // Derivatives against central differences.
            let h = 1e-6;
            let (up, down) = (schmidt_legendre(4, theta + h), schmidt_legendre(4, theta - h));
            for l in 0..=4 {
                for m in 0..=l {
                    let fd = (up.p(l, m) - down.p(l, m)) / (2.0 * h);
                    assert_abs_diff_eq!(t.dp(l, m), fd, epsilon = 1e-7);
                }
            }
        }
    }
}
