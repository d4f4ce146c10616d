//! Schmidt semi-normalised associated Legendre functions and their colatitude derivatives.

use super::coefficients::index;

/// P_n^m(cos θ) and dP_n^m/dθ for every n ≤ `degree`, packed as in [`super::Coefficients`].
///
/// # Units
/// `theta` is the colatitude in radians; the functions are dimensionless, the derivatives per radian.
///
/// # Formula
/// Schmidt semi-normalisation (∫ (P_n^m)² sin θ dθ dφ over the sphere = 4π/(2n+1) for every m):
/// P_0^0 = 1, P_1^1 = sin θ, P_n^n = √((2n−1)/(2n)) sin θ P_{n−1}^{n−1} (n ≥ 2), and for n > m
/// P_n^m = [(2n−1) cos θ P_{n−1}^m − √((n−1+m)(n−1−m)) P_{n−2}^m] / √(n² − m²);
/// the derivatives follow by differentiating each recursion with respect to θ.
///
/// # References
/// Langel, R. A. (1987), The main field, in *Geomagnetism* vol. 1 (ed. Jacobs), Academic Press,
/// §4.2 (Schmidt normalisation); Winch, D. E. et al. (2005), Geomagnetism and Schmidt
/// quasi-normalization, *Geophys. J. Int.* 160, 487–504 (the recursions).
pub fn schmidt(theta: f64, degree: usize, p: &mut Vec<f64>, dp: &mut Vec<f64>) {
    let len = index(degree, degree) + 1;
    p.clear();
    p.resize(len, 0.0);
    dp.clear();
    dp.resize(len, 0.0);
    let (s, c) = theta.sin_cos();
    p[0] = 1.0;
    for n in 1..=degree {
        let nf = n as f64;
        // Sectoral term.
        let (pp, dpp) = (p[index(n - 1, n - 1)], dp[index(n - 1, n - 1)]);
        let k = if n == 1 { 1.0 } else { ((2.0 * nf - 1.0) / (2.0 * nf)).sqrt() };
        p[index(n, n)] = k * s * pp;
        dp[index(n, n)] = k * (c * pp + s * dpp);
        // Lower orders.
        for m in 0..n {
            let mf = m as f64;
            let (p1, d1) = (p[index(n - 1, m)], dp[index(n - 1, m)]);
            let (p2, d2, a2) = if n >= m + 2 {
                (p[index(n - 2, m)], dp[index(n - 2, m)], ((nf - 1.0 + mf) * (nf - 1.0 - mf)).sqrt())
            } else {
                (0.0, 0.0, 0.0)
            };
            let norm = (nf * nf - mf * mf).sqrt();
            p[index(n, m)] = ((2.0 * nf - 1.0) * c * p1 - a2 * p2) / norm;
            dp[index(n, m)] = ((2.0 * nf - 1.0) * (c * d1 - s * p1) - a2 * d2) / norm;
        }
    }
}
