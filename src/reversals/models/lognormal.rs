//! Lognormal intervals: ln x is normal with mean μ and standard deviation σ (of ln Myr).
//!
//! # Formula
//! f(x) = exp(−(ln x − μ)²/(2σ²)) / (x σ √(2π)), S(x) = Φ(−(ln x − μ)/σ). Without censoring the MLE
//! is μ = mean(ln x), σ² = mean((ln x − μ)²) (divisor n); with a censored length the likelihood is
//! maximised by Newton's method from there (analytic derivatives), falling back to Nelder–Mead on
//! (μ, ln σ).
//!
//! # References
//! Lawless (2003), §5.3; Johnson, N. L., Kotz, S. & Balakrishnan, N. (1994), *Continuous Univariate
//! Distributions* vol. 1, ch. 14.

use super::refine_censored;
use super::{ln_norm_cdf, maximise2, Sample};
use crate::error::{Error, Result};
use crate::montecarlo::McRng;

const LN_SQRT_2PI: f64 = 0.918_938_533_204_672_8;

pub(super) fn fit(s: &Sample) -> Result<[f64; 2]> {
    let n = s.n() as f64;
    let mu = s.sum_ln / n;
    let var = (s.sum_ln2 / n - mu * mu).max(0.0);
    if !(var > 1e-24) {
        return Err(Error::Undefined("the lognormal fit needs intervals of different lengths".into()));
    }
    let start = [mu, var.sqrt()];
    refine_censored(s, start, fit_newton, fit_nelder_mead)
}

/// The analytic gradient and Hessian in (μ, σ) of the complete-data log-likelihood.
///
/// # Formula
/// With Q = Σ (ln x − μ)² and D = Σ ln x − nμ: ∂ℓ/∂μ = D/σ², ∂ℓ/∂σ = Q/σ³ − n/σ;
/// ∂²ℓ/∂μ² = −n/σ², ∂²ℓ/∂μ∂σ = −2D/σ³, ∂²ℓ/∂σ² = −3Q/σ⁴ + n/σ².
fn complete_derivs(s: &Sample, p: [f64; 2]) -> ([f64; 2], [f64; 3]) {
    let [m, sg] = p;
    let n = s.n() as f64;
    let q = s.sum_ln2 - 2.0 * m * s.sum_ln + n * m * m;
    let d = s.sum_ln - n * m;
    let s2 = sg * sg;
    let g = [d / s2, q / (s2 * sg) - n / sg];
    let h = [-n / s2, -2.0 * d / (s2 * sg), -3.0 * q / (s2 * s2) + n / s2];
    (g, h)
}

/// The gradient and Hessian `[∂μμ, ∂μσ, ∂σσ]` of ln S(c) = ln Φ(−w), w = (ln c − μ)/σ.
///
/// # Formula
/// With the inverse Mills ratio r = φ(w)/Φ(−w) (d ln Φ(−w)/dw = −r, dr/dw = r(r − w)) and
/// v = r(r − w): ∂/∂μ = r/σ, ∂/∂σ = rw/σ; ∂²/∂μ² = −v/σ², ∂²/∂μ∂σ = −(vw + r)/σ²,
/// ∂²/∂σ² = −(vw² + 2rw)/σ² (chain rule with ∂w/∂μ = −1/σ, ∂w/∂σ = −w/σ).
///
/// # References
/// Lawless (2003), §5.3 (censored lognormal likelihood equations); Johnson, Kotz & Balakrishnan (1994),
/// ch. 13 (the ratio φ/Φ and its derivative).
pub(super) fn ln_sf_derivs(p: &[f64; 2], c: f64) -> ([f64; 2], [f64; 3]) {
    let [m, sg] = *p;
    let w = (c.ln() - m) / sg;
    let r = (-0.5 * w * w - LN_SQRT_2PI - ln_norm_cdf(-w)).exp();
    let v = r * (r - w);
    let s2 = sg * sg;
    ([r / sg, r * w / sg], [-v / s2, -(v * w + r) / s2, -(v * w * w + 2.0 * r * w) / s2])
}

/// The censored fit by Newton's method (`newton_censored`) from the uncensored one (`None` if it does not converge).
pub(super) fn fit_newton(s: &Sample, start: [f64; 2]) -> Option<[f64; 2]> {
    let inside = |p: [f64; 2]| p[1] > 0.0 && p[0].is_finite();
    super::newton_censored(
        s,
        |p| loglik_complete(&p, s),
        |p| complete_derivs(s, p),
        |p, c| ln_sf(&p, c),
        |p, c| ln_sf_derivs(&p, c),
        inside,
        start,
    )
}

/// The censored fit by Nelder–Mead on (μ, ln σ): the fallback of [`fit_newton`].
pub(super) fn fit_nelder_mead(s: &Sample, start: [f64; 2]) -> Result<[f64; 2]> {
    let ll = |m: f64, ls: f64| {
        let p = [m, ls.exp()];
        loglik_complete(&p, s) + s.censored_lengths().map(|c| ln_sf(&p, c)).sum::<f64>()
    };
    let m = maximise2(ll, [start[0], start[1].ln()], "lognormal")?;
    Ok([m[0], m[1].exp()])
}

pub(super) fn ln_pdf(p: &[f64; 2], x: f64) -> f64 {
    let z = (x.ln() - p[0]) / p[1];
    -0.5 * z * z - x.ln() - p[1].ln() - LN_SQRT_2PI
}

pub(super) fn ln_sf(p: &[f64; 2], x: f64) -> f64 {
    ln_norm_cdf(-(x.ln() - p[0]) / p[1])
}

pub(super) fn cdf(p: &[f64; 2], x: f64) -> f64 {
    ln_norm_cdf((x.ln() - p[0]) / p[1]).exp()
}

pub(super) fn loglik_complete(p: &[f64; 2], s: &Sample) -> f64 {
    let [m, sg] = *p;
    let n = s.n() as f64;
    let ss = s.sum_ln2 - 2.0 * m * s.sum_ln + n * m * m;
    -ss / (2.0 * sg * sg) - s.sum_ln - n * (sg.ln() + LN_SQRT_2PI)
}

pub(super) fn sample(p: &[f64; 2], rng: &mut McRng) -> f64 {
    use rand_distr::Distribution;
    let z: f64 = rand_distr::StandardNormal.sample(rng);
    (p[0] + p[1] * z).exp()
}
