//! The giant-Gaussian-process field model of Tauxe & Kent (2004), simulated.

use super::legendre::{schmidt_legendre, SchmidtTable};
use crate::error::{check_range, Error, Result};
use crate::montecarlo::MonteCarlo;
use crate::sphere::Vec3;
use rand::{Rng, RngExt};
use rand_distr::StandardNormal;

/// A zonal giant-Gaussian-process model of the paleosecular field: every Gauss coefficient is an
/// independent normal variable with mean zero except g₁⁰, and a variance that depends on its degree
/// and on the parity of l − m.
///
/// # Units
/// Coefficients and `alpha` in µT; `core_ratio` dimensionless.
///
/// # Formula
/// σₗ² = c^{2l} α² / ((l + 1)(2l + 1)) for l − m even, and β σₗ for the standard deviation when l − m
/// is odd; E\[g₁⁰\] = g₁⁰ (no other mean). Truncated at `degree`.
///
/// # References
/// Constable, C. G. & Parker, R. L. (1988), Statistics of the geomagnetic secular variation for the
/// past 5 m.y., *J. Geophys. Res.* 93, 11569–11581 (the giant Gaussian process); Tauxe, L. & Kent,
/// D. V. (2004), A simplified statistical model for the geomagnetic field and the detection of
/// shallow bias in paleomagnetic inclinations: was the ancient magnetic field dipolar?, in
/// *Timescales of the Paleomagnetic Field*, AGU Geophys. Monogr. 145, 101–115 (the TK03 values).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Tk03 {
    /// Mean axial dipole term g₁⁰, µT (negative: normal polarity).
    pub g10: f64,
    /// α, µT.
    pub alpha: f64,
    /// β, the factor on the standard deviation of the terms with l − m odd.
    pub beta: f64,
    /// c, the ratio of the core radius to the Earth's radius.
    pub core_ratio: f64,
    /// Largest degree simulated.
    pub degree: usize,
}

impl Tk03 {
    /// The TK03 values as used in this crate: g₁⁰ = −18 µT, α = |g₁⁰|/2.4 = 7.5 µT, β = 3.8,
    /// c = 0.547, degree 8.
    ///
    /// The value α = 7.5 µT is the one whose simulated elongation–inclination curve matches the
    /// published TK03 curve of Tauxe et al. (2008); see the tests of [`super::tk03_curve`], which
    /// also show that α = 27.7 µT does not.
    pub fn standard() -> Self {
        Self { g10: -18.0, alpha: 7.5, beta: 3.8, core_ratio: 0.547, degree: 8 }
    }

    /// A validated model.
    pub fn new(g10: f64, alpha: f64, beta: f64, core_ratio: f64, degree: usize) -> Result<Self> {
        check_range("g10", g10, -1e4, 1e4, "[-10000, 10000] µT")?;
        check_range("alpha", alpha, 0.0, 1e4, "[0, 10000] µT")?;
        check_range("beta", beta, 0.0, 100.0, "[0, 100]")?;
        check_range("core_ratio", core_ratio, 0.0, 1.0, "[0, 1]")?;
        if !(1..=30).contains(&degree) {
            return Err(Error::OutOfRange { name: "degree", value: degree as f64, range: "[1, 30]" });
        }
        Ok(Self { g10, alpha, beta, core_ratio, degree })
    }

    /// Standard deviation of gₗᵐ and hₗᵐ, µT.
    pub fn sigma(&self, l: usize, m: usize) -> f64 {
        let lf = l as f64;
        let even = self.core_ratio.powf(2.0 * lf) * self.alpha * self.alpha / ((lf + 1.0) * (2.0 * lf + 1.0));
        if !(l - m).is_multiple_of(2) {
            self.beta * even.sqrt()
        } else {
            even.sqrt()
        }
    }

    /// One field vector (x north, y east, z down; µT) at colatitude table `table` and a longitude drawn
    /// uniformly, from one draw of every coefficient.
    pub fn draw<R: Rng + ?Sized>(&self, table: &SchmidtTable, rng: &mut R) -> Vec3 {
        let n = (self.degree + 1) * (self.degree + 2) / 2;
        let (mut g, mut h) = (vec![0.0; n], vec![0.0; n]);
        for l in 1..=self.degree {
            for m in 0..=l {
                let s = self.sigma(l, m);
                let k = l * (l + 1) / 2 + m;
                g[k] = s * rng.sample::<f64, _>(StandardNormal);
                if m > 0 {
                    h[k] = s * rng.sample::<f64, _>(StandardNormal);
                }
            }
        }
        g[1] += self.g10;
        let phi = rng.random::<f64>() * std::f64::consts::TAU;
        field_direction(table, phi, &g, &h)
    }

    /// `count` field vectors at latitude `lat_deg` (longitudes drawn uniformly), seeded; the same for any
    /// thread count.
    pub fn simulate(&self, lat_deg: f64, count: usize, seed: u64, stream: u64) -> Result<Vec<Vec3>> {
        check_range("latitude", lat_deg, -90.0, 90.0, "[-90, 90]")?;
        let colat = (90.0 - lat_deg).to_radians().clamp(1e-7, std::f64::consts::PI - 1e-7);
        let table = schmidt_legendre(self.degree, colat);
        Ok(MonteCarlo::new(seed, count).run("TK03 field", stream, |rng, _| self.draw(&table, rng)))
    }
}

/// The field vector (x north, y east, z down) at the colatitude of `table`, east longitude `phi`
/// (radians) and the Earth's surface, from Schmidt semi-normalised Gauss coefficients `g`, `h` indexed
/// by l(l + 1)/2 + m.
///
/// # Formula
/// X = Σ (gₗᵐ cos mφ + hₗᵐ sin mφ) dPₗᵐ/dθ, Y = Σ m (gₗᵐ sin mφ − hₗᵐ cos mφ) Pₗᵐ / sin θ,
/// Z = −Σ (l + 1)(gₗᵐ cos mφ + hₗᵐ sin mφ) Pₗᵐ (r = a).
///
/// # References
/// Langel (1987), §4.2; Merrill, McElhinny & McFadden (1996), *The Magnetic Field of the Earth*,
/// §2.3 (the field elements from the potential).
pub fn field_direction(table: &SchmidtTable, phi: f64, g: &[f64], h: &[f64]) -> Vec3 {
    let degree = table.degree();
    // sin θ of the table, recovered from P₁¹ = sin θ (kept away from zero by the callers).
    let sin_t = table.p(1, 1).max(1e-12);
    let (mut x, mut y, mut z) = (0.0, 0.0, 0.0);
    for m in 0..=degree {
        let (sm, cm) = (m as f64 * phi).sin_cos();
        for l in m.max(1)..=degree {
            let k = l * (l + 1) / 2 + m;
            let (gk, hk) = (g.get(k).copied().unwrap_or(0.0), h.get(k).copied().unwrap_or(0.0));
            let cos_part = gk * cm + hk * sm;
            x += cos_part * table.dp(l, m);
            y += m as f64 * (gk * sm - hk * cm) * table.p(l, m) / sin_t;
            z -= (l as f64 + 1.0) * cos_part * table.p(l, m);
        }
    }
    Vec3::new(x, y, z)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn axial_dipole_gives_the_dipole_formula() {
        // tan I = 2 tan λ for a geocentric axial dipole (Butler 1992, eq. 1.8): here λ = 30°,
        // g₁⁰ = −18 µT: Z = 2·18 sin λ, X = 18 cos λ.
        let table = schmidt_legendre(3, 60f64.to_radians());
        let mut g = vec![0.0; 10];
        g[1] = -18.0;
        let v = field_direction(&table, 0.7, &g, &[0.0; 10]);
        assert_abs_diff_eq!(v.x, 18.0 * 30f64.to_radians().cos(), epsilon = 1e-12);
        assert_abs_diff_eq!(v.y, 0.0, epsilon = 1e-12);
        assert_abs_diff_eq!(v.z, 36.0 * 30f64.to_radians().sin(), epsilon = 1e-12);
        // An equatorial dipole g₁¹ seen on the equator (P₁¹ = sin θ = 1, dP₁¹/dθ = cos θ = 0):
        // X = 0, Y = g₁¹ sin φ, Z = −2 g₁¹ cos φ (hand computation from the formula of
        // `field_direction`, Langel 1987 §4.2).
        let eq = schmidt_legendre(3, std::f64::consts::FRAC_PI_2);
        let mut g = vec![0.0; 10];
        g[2] = 5.0;
        let v0 = field_direction(&eq, 0.0, &g, &[0.0; 10]);
        assert_abs_diff_eq!(v0.z, -10.0, epsilon = 1e-12);
        let v90 = field_direction(&eq, std::f64::consts::FRAC_PI_2, &g, &[0.0; 10]);
        assert_abs_diff_eq!(v90.norm(), 5.0, epsilon = 1e-12);
        assert_abs_diff_eq!(v90.y, 5.0, epsilon = 1e-12);
    }

    #[test]
    fn standard_deviations_follow_the_formula() {
        let m = Tk03::standard();
        // σ₁ (l − m even, m = 1): √(0.547² · 7.5² / 6) µT; σ₁⁰ = 3.8 σ₁ (hand computation).
        let s11 = (0.547f64.powi(2) * 56.25 / 6.0).sqrt();
        assert_abs_diff_eq!(m.sigma(1, 1), s11, epsilon = 1e-12);
        assert_abs_diff_eq!(m.sigma(1, 0), 3.8 * s11, epsilon = 1e-12);
        assert!(m.sigma(8, 8) < m.sigma(2, 2));
        assert!(Tk03::new(-18.0, 7.5, 3.8, 1.5, 8).is_err());
    }

    #[test]
    fn simulation_is_seeded_and_thread_independent() {
        let m = Tk03::standard();
        let one = rayon::ThreadPoolBuilder::new().num_threads(1).build().unwrap();
        let a = one.install(|| m.simulate(35.0, 300, 9, 0).unwrap());
        let b = m.simulate(35.0, 300, 9, 0).unwrap();
        assert_eq!(a, b);
        assert_ne!(a, m.simulate(35.0, 300, 10, 0).unwrap());
    }
}
