//! Reversal rate through time: a sliding-window rate with an exact Poisson band, the Laplace trend
//! test, and a local clustering test on successive intervals.

use crate::error::{Error, Result};
use statrs::distribution::{ChiSquared, ContinuousCDF, Normal};

/// The reversal rate in one window.
///
/// # Units
/// Age in Ma (window centre), rates per Myr.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RatePoint {
    /// Centre of the window, Ma.
    pub age: f64,
    /// Reversals per Myr in the window.
    pub rate: f64,
    /// Lower confidence limit (exact Poisson), per Myr.
    pub low: f64,
    /// Upper confidence limit, per Myr.
    pub high: f64,
    /// Reversals counted in the window.
    pub count: usize,
}

/// The rate through time of one record and the two tests on its reversals (what `rate` reports).
#[derive(Debug, Clone, PartialEq)]
pub struct RateSummary {
    /// Spacing of the window centres, Myr.
    pub step: f64,
    /// The sliding-window rate.
    pub points: Vec<RatePoint>,
    /// The Laplace trend test, or why it is unavailable.
    pub laplace: Result<LaplaceTest>,
    /// The clustering test, or why it is unavailable.
    pub clustering: Result<ClusteringTest>,
}

/// The window spacing used when none is given: a tenth of the window width.
pub fn default_rate_step(window: f64) -> f64 {
    window / 10.0
}

/// The rate through time of the reversals at `ages` (Ma) in [from, to] with windows of width `window`
/// every `step` (default [`default_rate_step`]), and the trend and clustering tests beside it. The
/// tests may be unavailable (too few reversals) without failing the whole.
pub fn rate_summary(
    ages: &[f64],
    from: f64,
    to: f64,
    window: f64,
    step: Option<f64>,
    level: f64,
) -> Result<RateSummary> {
    let step = step.unwrap_or_else(|| default_rate_step(window));
    let points = windowed_rate(ages, from, to, window, step, level)?;
    Ok(RateSummary { step, points, laplace: laplace_test(ages, from, to), clustering: clustering_test(ages) })
}

/// Sliding-window reversal rate over [from, to] with windows of width `window` centred every `step`.
///
/// Only whole windows are used, so every point has the same width. Reversals at `ages` (Ma).
///
/// # Formula
/// rate = k / w; exact Poisson limits (Garwood 1936): low = χ²(α/2; 2k) / (2w),
/// high = χ²(1 − α/2; 2k + 2) / (2w), with 1 − α = `level`.
///
/// # References
/// Garwood, F. (1936), Fiducial limits for the Poisson distribution. *Biometrika* 28, 437–442.
/// Cox & Lewis (1966), §3.
pub fn windowed_rate(ages: &[f64], from: f64, to: f64, window: f64, step: f64, level: f64) -> Result<Vec<RatePoint>> {
    if !(window > 0.0 && window.is_finite()) {
        return Err(Error::OutOfRange { name: "window", value: window, range: "(0, ∞) Myr" });
    }
    if !(step > 0.0 && step.is_finite()) {
        return Err(Error::OutOfRange { name: "step", value: step, range: "(0, ∞) Myr" });
    }
    if !(level > 0.0 && level < 1.0) {
        return Err(Error::OutOfRange { name: "level", value: level, range: "(0, 1)" });
    }
    if window > to - from {
        return Err(Error::invalid(
            "window",
            window,
            format!("the window ({window} Myr) is longer than the record ({} Myr)", to - from),
        ));
    }
    let alpha = 1.0 - level;
    let n_points = ((to - from - window) / step + 1e-9).floor() as usize + 1;
    let mut out = Vec::with_capacity(n_points);
    for i in 0..n_points {
        let lo = from + i as f64 * step;
        let hi = lo + window;
        let k = ages.iter().filter(|&&a| a >= lo && a < hi).count();
        let low = if k == 0 { 0.0 } else { chi2_quantile(alpha / 2.0, 2.0 * k as f64) / (2.0 * window) };
        let high = chi2_quantile(1.0 - alpha / 2.0, 2.0 * k as f64 + 2.0) / (2.0 * window);
        out.push(RatePoint { age: 0.5 * (lo + hi), rate: k as f64 / window, low, high, count: k });
    }
    Ok(out)
}

fn chi2_quantile(p: f64, df: f64) -> f64 {
    ChiSquared::new(df).map_or(f64::NAN, |c| c.inverse_cdf(p.clamp(0.0, 1.0)))
}

/// The Laplace test for a trend in the rate of a series of events.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LaplaceTest {
    /// Number of reversals.
    pub n: usize,
    /// The statistic U, standard normal under a constant rate. U > 0: the rate grows toward the present.
    pub u: f64,
    /// Two-sided p-value.
    pub p_value: f64,
}

/// Laplace trend test on reversal ages (Ma) in the window [from, to].
///
/// # Formula
/// With times measured forward from the old edge, tᵢ = to − ageᵢ, and T = to − from:
/// U = (Σtᵢ/n − T/2) / (T √(1/(12n))), approximately N(0, 1) for a homogeneous Poisson process.
///
/// # References
/// Cox, D. R. & Lewis, P. A. W. (1966), *The Statistical Analysis of Series of Events*, §3.3.
pub fn laplace_test(ages: &[f64], from: f64, to: f64) -> Result<LaplaceTest> {
    let inside: Vec<f64> = ages.iter().filter(|&&a| a > from && a < to).map(|a| to - a).collect();
    let n = inside.len();
    if n < 2 {
        return Err(Error::TooFew { what: "the Laplace trend test", needed: 2, got: n, unit: "reversals" });
    }
    let t = to - from;
    let u = (inside.iter().sum::<f64>() / n as f64 - t / 2.0) / (t * (1.0 / (12.0 * n as f64)).sqrt());
    Ok(LaplaceTest { n, u, p_value: two_sided(u) })
}

fn two_sided(z: f64) -> f64 {
    Normal::standard().sf(z.abs()) * 2.0
}

/// The clustering test on successive intervals.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ClusteringTest {
    /// The H values, one per reversal with two neighbours on each side (young → old order of events).
    pub h: Vec<f64>,
    /// Mean of H (0.5 under a locally Poisson process; below 0.5 means clustering).
    pub mean_h: f64,
    /// (mean H − ½) / √(1/(12n)).
    pub z: f64,
    /// Two-sided p-value of z (approximate: neighbouring H values share intervals).
    pub p_value: f64,
    /// Kolmogorov–Smirnov distance of the H values from the uniform distribution.
    pub ks_d: f64,
    /// Asymptotic Kolmogorov p-value of `ks_d` (approximate, as above).
    pub ks_p: f64,
}

/// Local clustering test of reversal ages (Ma).
///
/// For each reversal i with two neighbours on each side, δt is the shorter of its two adjacent
/// intervals and τ the next interval beyond that nearest neighbour, on the same side.
///
/// # Formula
/// H = 2δt / (2δt + τ), uniform on [0, 1] under a locally Poisson process (whatever its rate);
/// clustering pushes H toward 0, quasi-periodicity toward 1.
///
/// # References
/// Bi, M., Mullins, A. & Roesler, F. (1989), *Phys. Fluids B*; Carbone, V., Sorriso-Valvo, L.,
/// Vecchio, A., Lepreti, F., Veltri, P., Harabaglia, P. & Guerra, I. (2006), Clustering of polarity
/// reversals of the geomagnetic field. *Phys. Rev. Lett.* 96, 128501.
pub fn clustering_test(ages: &[f64]) -> Result<ClusteringTest> {
    let mut t: Vec<f64> = ages.iter().map(|a| -a).collect();
    t.sort_by(f64::total_cmp);
    let mut h = Vec::new();
    for i in 2..t.len().saturating_sub(2) {
        let (fwd, back) = (t[i + 1] - t[i], t[i] - t[i - 1]);
        let (dt, tau) = if fwd < back { (fwd, t[i + 2] - t[i + 1]) } else { (back, t[i - 1] - t[i - 2]) };
        if 2.0 * dt + tau > 0.0 {
            h.push(2.0 * dt / (2.0 * dt + tau));
        }
    }
    if h.len() < 3 {
        return Err(Error::TooFew { what: "the clustering test", needed: 7, got: t.len(), unit: "reversals" });
    }
    let n = h.len() as f64;
    let mean_h = h.iter().sum::<f64>() / n;
    let z = (mean_h - 0.5) / (1.0 / (12.0 * n)).sqrt();
    let mut sorted = h.clone();
    sorted.sort_by(f64::total_cmp);
    let ks_d = super::gof::ks_statistic(&sorted, |x| x.clamp(0.0, 1.0));
    let lambda = (n.sqrt() + 0.12 + 0.11 / n.sqrt()) * ks_d;
    h.reverse();
    Ok(ClusteringTest { h, mean_h, z, p_value: two_sided(z), ks_d, ks_p: kolmogorov_sf(lambda) })
}

/// Survival function of the Kolmogorov distribution, Q(λ) = 2 Σₖ (−1)^(k−1) e^(−2k²λ²).
///
/// # References
/// Kolmogorov (1933); Stephens, M. A. (1970), *JRSS B* 32, 115–122 (the small-sample factor
/// √n + 0.12 + 0.11/√n applied by the caller); Press et al. (2007), §14.3.3.
pub fn kolmogorov_sf(lambda: f64) -> f64 {
    if lambda < 0.2 {
        return 1.0;
    }
    let mut sum = 0.0;
    for k in 1..=100 {
        let term = (-2.0 * (k * k) as f64 * lambda * lambda).exp();
        sum += if k % 2 == 1 { term } else { -term };
        if term < 1e-16 {
            break;
        }
    }
    (2.0 * sum).clamp(0.0, 1.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::montecarlo::MonteCarlo;
    use rand::RngExt;

    #[test]
    fn poisson_band_matches_scipy() {
        // SciPy 1.17.1: stats.chi2.ppf(0.025, 20)/2 = 4.7953886961324335,
        // stats.chi2.ppf(0.975, 22)/2 = 18.39035604201778, stats.chi2.ppf(0.975, 2)/2 = 3.6888794541139354.
        let ages: Vec<f64> = (0..10).map(|i| 0.05 + i as f64 * 0.1).collect();
        let r = windowed_rate(&ages, 0.0, 1.0, 1.0, 0.5, 0.95).unwrap();
        assert_eq!(r.len(), 1);
        assert_eq!(r[0].count, 10);
        assert!((r[0].low - 4.7953886961324335).abs() < 1e-8 && (r[0].high - 18.39035604201778).abs() < 1e-8);
        let empty = windowed_rate(&[], 0.0, 2.0, 1.0, 1.0, 0.95).unwrap();
        assert_eq!(empty.len(), 2);
        assert!(empty[0].low == 0.0 && (empty[0].high - 3.6888794541139354).abs() < 1e-8);
        assert!(windowed_rate(&ages, 0.0, 1.0, 2.0, 0.5, 0.95).is_err());
    }

    #[test]
    fn laplace_by_hand() {
        // Events at forward times 1, 2, 3, 9 in T = 10 (ages 9, 8, 7, 1 with to = 10):
        // U = (3.75 − 5) / (10 / √48) = −0.8660254…; SciPy 1.17.1: 2·stats.norm.sf(0.8660254037844386)
        // = 0.3864762307712327.
        let l = laplace_test(&[9.0, 8.0, 7.0, 1.0], 0.0, 10.0).unwrap();
        assert!((l.u - -(1.25 * 48f64.sqrt() / 10.0)).abs() < 1e-12);
        assert!((l.p_value - 0.3864762307712327).abs() < 1e-9);
    }

    #[test]
    fn kolmogorov_tail_matches_scipy() {
        // SciPy 1.17.1: stats.kstwobign.sf(1.0) = 0.26999967167735456, sf(0.5) = 0.9639452436648751
        assert!((kolmogorov_sf(1.0) - 0.26999967167735456).abs() < 1e-12);
        assert!((kolmogorov_sf(0.5) - 0.9639452436648751).abs() < 1e-12);
    }

    #[test]
    fn h_is_uniform_for_poisson_and_low_for_clusters() {
        // A Poisson process of 400 events: mean H near ½ (Carbone et al. 2006).
        let mc = MonteCarlo::new(4, 1);
        let ages = mc
            .run("p", 0, |rng, _| {
                let mut a = 0.0;
                (0..400)
                    .map(|_| {
                        a += -(1.0 - rng.random::<f64>()).ln() / 4.0;
                        a
                    })
                    .collect::<Vec<f64>>()
            })
            .remove(0);
        let c = clustering_test(&ages).unwrap();
        assert!((c.mean_h - 0.5).abs() < 4.0 * (1.0 / (12.0 * c.h.len() as f64)).sqrt(), "{}", c.mean_h);
        // Tight pairs of events, far apart: strongly clustered, H near 0.
        let pairs: Vec<f64> = (0..40).flat_map(|i| [i as f64, i as f64 + 0.01]).collect();
        let c = clustering_test(&pairs).unwrap();
        assert!(c.mean_h < 0.1 && c.p_value < 1e-6, "{}", c.mean_h);
        assert!(clustering_test(&[1.0, 2.0, 3.0]).is_err());
    }
}
