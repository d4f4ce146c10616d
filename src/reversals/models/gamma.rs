//! Gamma intervals with shape a and scale θ (Myr): a renewal process with memory when a ≠ 1.
//!
//! # Formula
//! f(x) = x^(a−1) e^(−x/θ) / (Γ(a) θ^a), S(x) = Q(a, x/θ) (regularised upper incomplete gamma).
//! Without censoring the MLE solves ln a − ψ(a) = ln x̄ − mean(ln x) (Newton with trigamma), θ = x̄/a;
//! with a censored length the full likelihood is maximised by Newton's method from the uncensored
//! estimate (analytic derivatives but those of the censored term in a), falling back to Nelder–Mead
//! on (ln a, ln θ).
//!
//! # References
//! McFadden, P. L. (1984), Statistical tools for the analysis of geomagnetic reversal sequences.
//! *J. Geophys. Res.* 89, 3363–3372. Minka, T. P. (2002), Estimating a gamma distribution (Newton
//! iteration and starting value). Lawless (2003), §5.1.

use super::refine_censored;
use super::{maximise2, trigamma, Sample};
use crate::error::{Error, Result};
use crate::montecarlo::McRng;
use statrs::function::gamma::{digamma, ln_gamma};

pub(super) fn fit_complete(s: &Sample) -> Result<[f64; 2]> {
    let n = s.n() as f64;
    let mean = s.sum_x / n;
    let d = mean.ln() - s.sum_ln / n;
    if !(d > 1e-14) {
        return Err(Error::Undefined("the gamma fit needs intervals of different lengths".into()));
    }
    // Starting value: Minka (2002), eq. 8.
    let mut a = (3.0 - d + ((d - 3.0).powi(2) + 24.0 * d).sqrt()) / (12.0 * d);
    for _ in 0..100 {
        let g = a.ln() - digamma(a) - d;
        let dg = 1.0 / a - trigamma(a);
        // Newton on 1/a (Minka 2002, eq. 6) converges in a few steps from any start.
        let next = 1.0 / (1.0 / a + g / (a * a * dg));
        let next = if next.is_finite() && next > 0.0 { next } else { 0.5 * a };
        if (next - a).abs() <= 1e-14 * a {
            a = next;
            break;
        }
        a = next;
    }
    Ok([a, mean / a])
}

pub(super) fn fit(s: &Sample) -> Result<[f64; 2]> {
    let start = fit_complete(s)?;
    refine_censored(s, start, fit_newton, fit_nelder_mead)
}

/// The analytic gradient and Hessian in (a, θ) of the complete-data log-likelihood.
///
/// # Formula
/// ℓ = (a − 1) Σ ln x − Σx/θ − n (a ln θ + ln Γ(a)); ∂ℓ/∂a = Σ ln x − n ln θ − n ψ(a),
/// ∂ℓ/∂θ = Σx/θ² − na/θ; ∂²ℓ/∂a² = −n ψ′(a), ∂²ℓ/∂a∂θ = −n/θ, ∂²ℓ/∂θ² = −2Σx/θ³ + na/θ².
fn complete_derivs(s: &Sample, p: [f64; 2]) -> ([f64; 2], [f64; 3]) {
    let [a, t] = p;
    let n = s.n() as f64;
    let g = [s.sum_ln - n * (t.ln() + digamma(a)), s.sum_x / (t * t) - n * a / t];
    let h = [-n * trigamma(a), -n / t, -2.0 * s.sum_x / (t * t * t) + n * a / (t * t)];
    (g, h)
}

/// The gradient and Hessian `[∂aa, ∂aθ, ∂θθ]` of ln S(c) = ln Q(a, c/θ) in (a, θ).
///
/// # Formula
/// With z = c/θ and D = z^a e^(−z) / (Γ(a) Q(a, z)): ∂ ln S/∂θ = D/θ (from Γ(a, z) = ∫_z^∞ t^(a−1)
/// e^(−t) dt, differentiated at its lower limit) and ∂² ln S/∂θ² = −D (a − z + D + 1)/θ². The
/// derivatives in a have no closed form: ∂/∂a, ∂²/∂a² and ∂²/∂a∂θ by central differences of ln S and
/// of ∂ ln S/∂θ with step h = 10⁻⁵ max(a, 0.1) (three evaluations of Q; error about h² of the next
/// derivative, 10⁻¹⁰ relative, in the gradient).
///
/// # References
/// Abramowitz & Stegun (1964), 6.5.3 (Γ(a, x)), 25.3.21 and 25.3.23 (central differences).
pub(super) fn ln_sf_derivs(p: &[f64; 2], c: f64) -> ([f64; 2], [f64; 3]) {
    let [a, t] = *p;
    let z = c / t;
    let ln_z = z.ln();
    // ln S and ∂ ln S/∂θ · θ = D at shape b.
    let at = |b: f64| {
        let lg = ln_gamma(b);
        let ln_q = super::incomplete_gamma::gamma_q(b, z, lg).ln();
        (ln_q, (b * ln_z - z - lg - ln_q).exp())
    };
    let h = 1e-5 * a.max(0.1);
    let ((l0, d0), (lp, dp), (lm, dm)) = (at(a), at(a + h), at(a - h));
    let g = [(lp - lm) / (2.0 * h), d0 / t];
    let hess = [(lp - 2.0 * l0 + lm) / (h * h), (dp - dm) / (2.0 * h * t), -d0 * (a - z + d0 + 1.0) / (t * t)];
    (g, hess)
}

/// The censored fit by Newton's method (`newton_censored`) from the uncensored one (`None` if it does not converge).
pub(super) fn fit_newton(s: &Sample, start: [f64; 2]) -> Option<[f64; 2]> {
    let inside = |p: [f64; 2]| p[0] > 0.0 && p[1] > 0.0 && p[0] <= 1e6;
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

/// The censored fit by Nelder–Mead on (ln a, ln θ): the fallback of [`fit_newton`].
pub(super) fn fit_nelder_mead(s: &Sample, start: [f64; 2]) -> Result<[f64; 2]> {
    let n = s.n() as f64;
    let ll = |la: f64, lt: f64| {
        let (a, t) = (la.exp(), lt.exp());
        (a - 1.0) * s.sum_ln - s.sum_x / t - n * (a * lt + ln_gamma(a))
            + s.censored_lengths().map(|c| ln_sf(&[a, t], c)).sum::<f64>()
    };
    let m = maximise2(ll, [start[0].ln(), start[1].ln()], "gamma")?;
    Ok([m[0].exp(), m[1].exp()])
}

pub(super) fn ln_pdf(p: &[f64; 2], x: f64) -> f64 {
    let [a, t] = *p;
    (a - 1.0) * x.ln() - x / t - a * t.ln() - ln_gamma(a)
}

pub(super) fn ln_sf(p: &[f64; 2], x: f64) -> f64 {
    super::incomplete_gamma::gamma_q(p[0], x / p[1], ln_gamma(p[0])).ln()
}

pub(super) fn cdf(p: &[f64; 2], x: f64) -> f64 {
    super::incomplete_gamma::gamma_p(p[0], x / p[1], ln_gamma(p[0]))
}

pub(super) fn loglik_complete(p: &[f64; 2], s: &Sample) -> f64 {
    let [a, t] = *p;
    (a - 1.0) * s.sum_ln - s.sum_x / t - s.n() as f64 * (a * t.ln() + ln_gamma(a))
}

pub(super) fn sample(p: &[f64; 2], rng: &mut McRng) -> f64 {
    use rand_distr::Distribution;
    // Parameters are validated positive by the fit; Marsaglia & Tsang (2000) inside rand_distr.
    rand_distr::Gamma::new(p[0], p[1]).map_or(f64::NAN, |g| g.sample(rng))
}
