//! Fitting every renewal model to one sample: log-likelihood, AIC, BIC, Akaike weights, and the
//! likelihood-ratio test of the gamma model against the exponential (shape 1).

use super::models::{Fitted, Model, Sample};
use statrs::distribution::{ChiSquared, ContinuousCDF};

/// One model fitted to a sample, with its information criteria.
#[derive(Debug, Clone, PartialEq)]
pub struct ModelFit {
    /// The fitted model.
    pub fitted: Fitted,
    /// Maximised log-likelihood (censored length included through ln S).
    pub loglik: f64,
    /// Akaike information criterion, 2k − 2ℓ.
    pub aic: f64,
    /// Bayesian information criterion, k ln n − 2ℓ (n = complete + censored observations).
    pub bic: f64,
    /// Akaike weight among the models that could be fitted.
    pub weight: f64,
}

/// A model that could not be fitted, and why.
#[derive(Debug, Clone, PartialEq)]
pub struct FitFailure {
    /// The model.
    pub model: Model,
    /// The reason, in words.
    pub reason: String,
}

/// Likelihood-ratio test of nested models.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LrTest {
    /// 2 (ℓ_full − ℓ_nested), floored at 0.
    pub statistic: f64,
    /// Degrees of freedom.
    pub df: usize,
    /// p-value from the χ² distribution (Wilks 1938).
    pub p_value: f64,
}

/// All fits to one sample.
#[derive(Debug, Clone, PartialEq)]
pub struct RenewalFits {
    /// Fitted models, in the order of [`Model::ALL`].
    pub fits: Vec<ModelFit>,
    /// Models that could not be fitted.
    pub failures: Vec<FitFailure>,
    /// Gamma against exponential (shape = 1), when both were fitted.
    pub lr_test: Option<LrTest>,
}

impl RenewalFits {
    /// The fit of a model, if it succeeded.
    pub fn get(&self, m: Model) -> Option<&ModelFit> {
        self.fits.iter().find(|f| f.fitted.model == m)
    }
}

/// Fit the given models by maximum likelihood and compare them.
///
/// # Formula
/// AIC = 2k − 2ℓ; BIC = k ln n − 2ℓ; Akaike weight wᵢ = exp(−Δᵢ/2) / Σⱼ exp(−Δⱼ/2) with Δᵢ = AICᵢ − min AIC.
/// LR = 2(ℓ_gamma − ℓ_exponential) ~ χ²₁ under shape = 1.
///
/// # References
/// Akaike, H. (1974), *IEEE Trans. Autom. Control* 19, 716–723; Schwarz, G. (1978), *Ann. Stat.* 6,
/// 461–464; Burnham, K. P. & Anderson, D. R. (2002), *Model Selection and Multimodel Inference*, 2nd
/// ed., §2.9 (Akaike weights); Wilks, S. S. (1938), *Ann. Math. Stat.* 9, 60–62; McFadden (1984)
/// (gamma against Poisson for reversal intervals).
pub fn fit_models(s: &Sample, models: &[Model]) -> RenewalFits {
    let mut fits = Vec::new();
    let mut failures = Vec::new();
    let n = s.n_obs() as f64;
    for &m in models {
        match m.fit(s) {
            Ok(f) => {
                let ll = f.loglik(s);
                if ll.is_finite() {
                    let k = m.n_params() as f64;
                    fits.push(ModelFit {
                        fitted: f,
                        loglik: ll,
                        aic: 2.0 * k - 2.0 * ll,
                        bic: k * n.ln() - 2.0 * ll,
                        weight: f64::NAN,
                    });
                } else {
                    failures.push(FitFailure { model: m, reason: "the fitted log-likelihood is not finite".into() });
                }
            }
            Err(e) => failures.push(FitFailure { model: m, reason: e.to_string() }),
        }
    }
    set_weights(&mut fits);
    let lr_test = match (
        fits.iter().find(|f| f.fitted.model == Model::Gamma),
        fits.iter().find(|f| f.fitted.model == Model::Exponential),
    ) {
        (Some(g), Some(e)) => Some(lr_test(g.loglik, e.loglik, 1)),
        _ => None,
    };
    RenewalFits { fits, failures, lr_test }
}

fn set_weights(fits: &mut [ModelFit]) {
    let best = fits.iter().map(|f| f.aic).fold(f64::INFINITY, f64::min);
    let total: f64 = fits.iter().map(|f| (-(f.aic - best) / 2.0).exp()).sum();
    for f in fits.iter_mut() {
        f.weight = (-(f.aic - best) / 2.0).exp() / total;
    }
}

/// Likelihood-ratio test of a nested model (log-likelihood `nested`) inside a fuller one (`full`),
/// with `df` extra parameters.
pub fn lr_test(full: f64, nested: f64, df: usize) -> LrTest {
    let statistic = (2.0 * (full - nested)).max(0.0);
    let p_value = ChiSquared::new(df as f64).map_or(f64::NAN, |c| c.sf(statistic));
    LrTest { statistic, df, p_value }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::montecarlo::MonteCarlo;

    #[test]
    fn weights_sum_to_one_and_criteria_follow_definitions() {
        let xs =
            MonteCarlo::new(3, 60).run("x", 0, |r, _| Fitted { model: Model::Gamma, params: [2.0, 0.1] }.sample(r));
        let s = Sample::new(xs, Some(0.15)).unwrap();
        let f = fit_models(&s, &Model::ALL);
        assert_eq!(f.fits.len(), 5);
        assert!((f.fits.iter().map(|m| m.weight).sum::<f64>() - 1.0).abs() < 1e-12);
        let g = f.get(Model::Gamma).unwrap();
        assert!((g.aic - (4.0 - 2.0 * g.loglik)).abs() < 1e-12);
        assert!((g.bic - (2.0 * 61f64.ln() - 2.0 * g.loglik)).abs() < 1e-12);
        // Nested models: the gamma maximum is at least the exponential's.
        assert!(g.loglik >= f.get(Model::Exponential).unwrap().loglik - 1e-9);
    }

    #[test]
    fn lr_p_value_matches_chi_square() {
        // SciPy 1.17.1: stats.chi2.sf(3.841458820694124, 1) = 0.05 (the familiar 5 % point).
        let t = lr_test(10.0 + 3.841458820694124 / 2.0, 10.0, 1);
        assert!((t.p_value - 0.05).abs() < 1e-9);
        assert_eq!(lr_test(1.0, 2.0, 1).statistic, 0.0);
    }

    #[test]
    fn lr_test_power_and_size() {
        // 300 intervals: gamma(2) data reject shape 1 every time here; exponential data reject at
        // about the nominal 5 % (binomial bounds for 200 trials, common practice).
        let mc = MonteCarlo::new(11, 20);
        let rejects = mc.run("g2", 0, |rng, _| {
            let t = Fitted { model: Model::Gamma, params: [2.0, 0.125] };
            let s = Sample::new((0..300).map(|_| t.sample(rng)).collect(), None).unwrap();
            fit_models(&s, &[Model::Exponential, Model::Gamma]).lr_test.unwrap().p_value < 0.05
        });
        assert!(rejects.iter().all(|&r| r));
        let mc = MonteCarlo::new(12, 200);
        let rejects = mc.run("e", 0, |rng, _| {
            let t = Fitted { model: Model::Exponential, params: [4.0, f64::NAN] };
            let s = Sample::new((0..300).map(|_| t.sample(rng)).collect(), None).unwrap();
            fit_models(&s, &[Model::Exponential, Model::Gamma]).lr_test.unwrap().p_value < 0.05
        });
        let k = rejects.iter().filter(|&&r| r).count();
        eprintln!("exponential data, 300 intervals: shape 1 rejected in {k} of 200 trials");
        // Binomial(200, 0.05): mean 10, sd 3.1; accept 2..=20.
        assert!((2..=20).contains(&k), "{k} rejections of 200");
    }
}
