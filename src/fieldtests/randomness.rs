//! Watson's (1956) test for randomness of directions, as used in conglomerate tests.

use crate::error::{check_range, Error, Result};
use crate::sphere::Vec3;

/// Largest N for which the exact alternating sum is evaluated; above it, the Fourier integral.
const EXACT_MAX_N: usize = 12;

/// How the distribution of R was evaluated.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum R0Route {
    /// Closed-form finite sum (N ≤ 12).
    ExactSum,
    /// Numerical Fourier integral of the same distribution (N > 12).
    FourierIntegral,
}

/// Result of the randomness test.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RandomnessTest {
    /// Number of directions.
    pub n: usize,
    /// Resultant length.
    pub r: f64,
    /// Critical resultant at the chosen confidence.
    pub r0: f64,
    /// Confidence level.
    pub confidence: f64,
    /// P(R ≥ observed R) for isotropic directions.
    pub p_value: f64,
    /// R < R₀: randomness cannot be rejected.
    pub random: bool,
    /// How the distribution was evaluated.
    pub route: R0Route,
}

fn ln_choose(n: usize, k: usize) -> f64 {
    use statrs::function::gamma::ln_gamma;
    ln_gamma(n as f64 + 1.0) - ln_gamma(k as f64 + 1.0) - ln_gamma((n - k) as f64 + 1.0)
}

/// Exact P(R ≤ r) by the finite sums (see [`isotropic_resultant_cdf`]).
fn cdf_exact(n: usize, r: f64) -> f64 {
    use statrs::function::gamma::ln_gamma;
    let nf = n as f64;
    // g(x), G(x): density and distribution of the sum of N uniform(−1, 1) variables, at x = r.
    let (mut g, mut big_g) = (0.0, 0.0);
    let ln2n = nf * std::f64::consts::LN_2;
    for k in 0..=n {
        let t = r + nf - 2.0 * k as f64;
        if t <= 0.0 {
            break;
        }
        let sign = if k % 2 == 0 { 1.0 } else { -1.0 };
        let lc = ln_choose(n, k);
        g += sign * (lc + (nf - 1.0) * t.ln() - ln2n - ln_gamma(nf)).exp();
        big_g += sign * (lc + nf * t.ln() - ln2n - ln_gamma(nf + 1.0)).exp();
    }
    (2.0 * big_g - 1.0 - 2.0 * r * g).clamp(0.0, 1.0)
}

/// P(R ≤ r) through the characteristic function of one projected component (sin t / t).
fn cdf_fourier(n: usize, r: f64) -> f64 {
    let nf = n as f64;
    // (sin t / t)^N decreases on [0, π] like exp(−N t²/6); its side lobes beyond π stay below
    // 0.22^N, and beyond 4π below (4π)^−N. Large N: the main lobe is negligible past 10√(6/N).
    let main = 10.0 * (6.0 / nf).sqrt();
    let upper = if main >= std::f64::consts::PI { 4.0 * std::f64::consts::PI } else { main };
    let m = 4000usize; // even number of Simpson intervals
    let h = upper / m as f64;
    let (mut sg, mut sbig) = (0.0, 0.0);
    for j in 0..=m {
        let t = j as f64 * h;
        let w = if j == 0 || j == m {
            1.0
        } else if j % 2 == 1 {
            4.0
        } else {
            2.0
        };
        let (phi, s_over_t) = if t == 0.0 { (1.0, r) } else { ((t.sin() / t).powi(n as i32), (r * t).sin() / t) };
        sg += w * phi * (r * t).cos();
        sbig += w * phi * s_over_t;
    }
    let g = sg * h / 3.0 / std::f64::consts::PI;
    let big_g = 0.5 + sbig * h / 3.0 / std::f64::consts::PI;
    (2.0 * big_g - 1.0 - 2.0 * r * g).clamp(0.0, 1.0)
}

/// Distribution function of the resultant length R of N independent, uniformly distributed unit
/// vectors in three dimensions: P(R ≤ r).
///
/// # Formula
/// The projection X of the resultant on any axis is a sum of N uniform(−1, 1) variables, with
/// density g and distribution G (Irwin–Hall, rescaled); because the resultant is isotropic,
/// f_R(r) = −2r g′(r), and integrating by parts
/// P(R ≤ r) = 2G(r) − 1 − 2r g(r).
/// For N ≤ 12, g and G are the finite sums
/// g(x) = Σₖ (−1)ᵏ C(N,k) (x + N − 2k)₊^(N−1) / (2ᴺ (N−1)!), G likewise with power N and N!;
/// for larger N the alternating sum loses too many digits, and g, G are evaluated from the
/// characteristic function (sin t / t)ᴺ by Simpson's rule:
/// g(x) = (1/π)∫₀^∞ (sin t/t)ᴺ cos(xt) dt, G(x) = ½ + (1/π)∫₀^∞ (sin t/t)ᴺ sin(xt)/t dt.
///
/// # References
/// Watson, G. S. (1956), A test for randomness of directions, *Mon. Not. R. astr. Soc. Geophys.
/// Suppl.* 7, 160–161; Rayleigh (1919), On the problem of random vibrations and random flights in
/// one, two or three dimensions, *Phil. Mag.* 37, 321–347; Fisher, Lewis & Embleton (1987), §5.3.
pub fn isotropic_resultant_cdf(n: usize, r: f64) -> f64 {
    if n == 0 || r.is_nan() {
        return f64::NAN;
    }
    let nf = n as f64;
    if r <= 0.0 {
        return 0.0;
    }
    if r >= nf {
        return 1.0;
    }
    if n == 1 {
        return 0.0; // R = 1 exactly
    }
    if n <= EXACT_MAX_N {
        cdf_exact(n, r)
    } else {
        cdf_fourier(n, r)
    }
}

/// Critical resultant R₀: the `confidence` quantile of R for N isotropic unit vectors.
///
/// # Formula
/// Bisection of [`isotropic_resultant_cdf`] = confidence, to 1e-10.
///
/// # References
/// Watson (1956). Table values reproduced in paleomagnetism textbooks (e.g. Butler 1992, ch. 6,
/// from memory): R₀(95 %) = 3.50 for N = 5, 5.03 for N = 10, 7.17 for N = 20.
pub fn watson_r0(n: usize, confidence: f64) -> Result<f64> {
    check_range("confidence", confidence, 1e-9, 1.0 - 1e-9, "(0, 1)")?;
    if n < 2 {
        return Err(Error::TooFew { what: "Watson's randomness test", needed: 2, got: n, unit: "directions" });
    }
    let nf = n as f64;
    // Beyond 8√N the upper tail is negligible (3R²/N ≈ χ²₃, and χ²₃ beyond 192 has p < 1e-40).
    let (mut lo, mut hi) = (0.0, nf.min(8.0 * nf.sqrt()));
    while hi - lo > 1e-10 {
        let mid = 0.5 * (lo + hi);
        if isotropic_resultant_cdf(n, mid) < confidence {
            lo = mid
        } else {
            hi = mid
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Watson's randomness test: is R small enough for N directions drawn uniformly on the sphere?
///
/// # Formula
/// Reject randomness at the chosen confidence when R ≥ R₀ ([`watson_r0`]).
///
/// # References
/// Watson (1956); conglomerate test: Graham (1949), *J. Geophys. Res.* 54, 131–167.
pub fn randomness_test(v: &[Vec3], confidence: f64) -> Result<RandomnessTest> {
    let n = v.len();
    let r0 = watson_r0(n, confidence)?;
    let r = super::resultant(v).norm().min(n as f64);
    let p_value = 1.0 - isotropic_resultant_cdf(n, r);
    let route = if n <= EXACT_MAX_N { R0Route::ExactSum } else { R0Route::FourierIntegral };
    Ok(RandomnessTest { n, r, r0, confidence, p_value, random: r < r0, route })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn watson_table_values() {
        // Watson (1956) table of R₀ at 95 %, as reproduced in paleomagnetism textbooks (Butler 1992,
        // ch. 6, from memory): N = 5 → 3.50, N = 10 → 5.03, N = 20 → 7.17.
        for (n, want) in [(5, 3.50), (10, 5.03), (20, 7.17)] {
            let r0 = watson_r0(n, 0.95).unwrap();
            assert!((r0 - want).abs() < 0.005 + 1e-9, "N = {n}: {r0}");
        }
    }

    #[test]
    fn matches_high_precision_values() {
        // Reference: mpmath 1.3.0 at 60 digits, the same finite sums evaluated exactly and solved with
        // findroot(…, solver='bisect'): R₀(95 %) for N = 3, 25, 30, 40, and P(R ≤ 4) for N = 10.
        let cases = [(3, 2.61830509155), (25, 8.02355899858), (30, 8.7979581478), (40, 10.1713164794)];
        for (n, want) in cases {
            let r0 = watson_r0(n, 0.95).unwrap();
            assert!((r0 - want).abs() < 1e-6, "N = {n}: {r0} vs {want}");
        }
        assert!((isotropic_resultant_cdf(10, 4.0) - 0.812051366843034).abs() < 1e-10);
    }

    #[test]
    #[allow(clippy::excessive_precision, reason = "the digits as mpmath printed them")]
    fn both_routes_match_high_precision_values() {
        // Reference: mpmath 1.3.0 at 60 digits, the exact finite sums: P(R ≤ r) for (N, r).
        // The f64 alternating sum already loses about 2e-7 at N = 20, hence the switch at N = 12.
        let cases = [
            (12, 5.0, 0.90302550854544542),
            (16, 7.5, 0.98810206950412642),
            (20, 7.5, 0.96481599679951033),
            (20, 5.0, 0.70734752022797855),
        ];
        for (n, r, want) in cases {
            let got = isotropic_resultant_cdf(n, r);
            assert!((got - want).abs() < 1e-9, "N = {n}, r = {r}: {got} vs {want}");
        }
        for r in [1.0, 3.0, 5.0, 7.5] {
            let (a, b) = (cdf_exact(12, r), cdf_fourier(12, r));
            assert!((a - b).abs() < 1e-8, "N = 12, r = {r}: {a} vs {b}");
        }
    }

    #[test]
    fn large_n_tends_to_the_chi2_approximation() {
        // 3R²/N → χ²₃ (Watson 1956; common practice). SciPy 1.17.1 stats.chi2.ppf(0.95, 3) =
        // 7.814727903251178, so R₀ ≈ √(N · 7.8147/3); at N = 2000 the two should agree to 0.1 %.
        let n = 2000usize;
        let approx = (n as f64 * 7.814727903251178 / 3.0).sqrt();
        let r0 = watson_r0(n, 0.95).unwrap();
        assert!((r0 / approx - 1.0).abs() < 1e-3, "{r0} vs {approx}");
    }

    #[test]
    fn edges() {
        assert!(watson_r0(1, 0.95).is_err());
        let two = watson_r0(2, 0.95).unwrap();
        // N = 2: R = 2 cos(θ/2) with cos θ uniform, so P(R ≤ r) = r²/4 and R₀ = 2√0.95 (by hand).
        assert!((two - 2.0 * 0.95f64.sqrt()).abs() < 1e-8, "{two}");
        let same = vec![Vec3::new(0.0, 0.0, 1.0); 6];
        let t = randomness_test(&same, 0.95).unwrap();
        assert!(!t.random && t.p_value < 1e-6);
    }
}
