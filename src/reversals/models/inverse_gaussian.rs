//! Inverse Gaussian intervals (Brownian passage time) with mean μ and shape λ (both Myr).
//!
//! # Formula
//! f(x) = √(λ/(2πx³)) exp(−λ(x − μ)²/(2μ²x));
//! F(x) = Φ(√(λ/x)(x/μ − 1)) + e^(2λ/μ) Φ(−√(λ/x)(x/μ + 1)) (the second term in log space).
//! Without censoring the MLE is μ = x̄, 1/λ = mean(1/x) − 1/x̄; with a censored length the
//! likelihood is maximised by Newton's method from there (analytic derivatives), falling back to
//! Nelder–Mead on (ln μ, ln λ).
//!
//! # References
//! Chhikara, R. S. & Folks, J. L. (1989), *The Inverse Gaussian Distribution*, Dekker, ch. 2 and 4;
//! Matthews, M. V., Ellsworth, W. L. & Reasenberg, P. A. (2002), A Brownian model for recurrent
//! earthquakes. *Bull. Seismol. Soc. Am.* 92, 2233–2250; Michael, J. R., Schucany, W. R. & Haas, R. W.
//! (1976), *Am. Stat.* 30, 88–90 (sampler).

use super::refine_censored;
use super::{ln_norm_cdf, maximise2, Sample};
use crate::error::{Error, Result};
use crate::montecarlo::McRng;
use rand::RngExt;

const LN_2PI: f64 = 1.837_877_066_409_345_5;

pub(super) fn fit(s: &Sample) -> Result<[f64; 2]> {
    let n = s.n() as f64;
    let mu = s.sum_x / n;
    let inv = s.sum_inv / n - 1.0 / mu;
    if !(inv > 1e-14 / mu) {
        return Err(Error::Undefined("the inverse Gaussian fit needs intervals of different lengths".into()));
    }
    let start = [mu, 1.0 / inv];
    refine_censored(s, start, fit_newton, fit_nelder_mead)
}

/// The analytic gradient and Hessian in (μ, λ) of the complete-data log-likelihood.
///
/// # Formula
/// ℓ = ½ (n ln λ − n ln 2π − 3 Σ ln x) − λ (Σx/μ² − 2n/μ + Σ1/x)/2; ∂ℓ/∂μ = λ (Σx/μ³ − n/μ²),
/// ∂ℓ/∂λ = n/(2λ) − (Σx/μ² − 2n/μ + Σ1/x)/2; ∂²ℓ/∂μ² = λ (2n/μ³ − 3Σx/μ⁴),
/// ∂²ℓ/∂μ∂λ = Σx/μ³ − n/μ², ∂²ℓ/∂λ² = −n/(2λ²).
fn complete_derivs(s: &Sample, p: [f64; 2]) -> ([f64; 2], [f64; 3]) {
    let [m, l] = p;
    let n = s.n() as f64;
    let (m2, m3) = (m * m, m * m * m);
    let dm = s.sum_x / m3 - n / m2;
    let g = [l * dm, 0.5 * n / l - 0.5 * (s.sum_x / m2 - 2.0 * n / m + s.sum_inv)];
    let h = [l * (2.0 * n / m3 - 3.0 * s.sum_x / (m2 * m2)), dm, -0.5 * n / (l * l)];
    (g, h)
}

/// The gradient and Hessian `[∂μμ, ∂μλ, ∂λλ]` of ln S(c) in (μ, λ).
///
/// # Formula
/// S = Φ(−a) − B, B = e^(2λ/μ) Φ(−b), a = √(λ/c)(c/μ − 1), b = √(λ/c)(c/μ + 1); since b² − a² = 4λ/μ,
/// e^(2λ/μ) φ(b) = φ(a), and the terms in φ cancel in ∂S/∂μ. With ρ = √(λc):
/// S_μ = (2λ/μ²) B, S_λ = φ(a)/ρ − (2/μ) B; B_μ = −(2λ/μ²) B + φ(a) ρ/μ², B_λ = (2/μ) B − φ(a) b/(2λ);
/// S_μμ = −(4λ/μ³) B + (2λ/μ²) B_μ, S_μλ = (2/μ²) B + (2λ/μ²) B_λ,
/// S_λλ = −φ(a)(a² + 1)/(2λρ) − (2/μ) B_λ; then ∂ ln S = S_i/S and ∂² ln S = S_ij/S − S_i S_j/S², with
/// B/S and φ(a)/S formed in log space.
///
/// # References
/// Chhikara & Folks (1989), ch. 2 (the distribution function); differentiated by hand, checked
/// against SciPy in the tests.
pub(super) fn ln_sf_derivs(p: &[f64; 2], c: f64) -> ([f64; 2], [f64; 3]) {
    let [m, l] = *p;
    let (a, t2, ls) = sf_terms(p, c);
    let bt = (t2 - ls).exp();
    let ph = (-0.5 * a * a - 0.5 * LN_2PI - ls).exp();
    let rho = (l * c).sqrt();
    let b = a + 2.0 * (l / c).sqrt();
    let (m2, k) = (m * m, 2.0 * l / (m * m));
    let g = [k * bt, ph / rho - 2.0 / m * bt];
    let (b_m, b_l) = (-k * bt + ph * rho / m2, 2.0 / m * bt - ph * b / (2.0 * l));
    let s_mm = -2.0 * k / m * bt + k * b_m;
    let s_ml = 2.0 / m2 * bt + k * b_l;
    let s_ll = -ph * (a * a + 1.0) / (2.0 * l * rho) - 2.0 / m * b_l;
    (g, [s_mm - g[0] * g[0], s_ml - g[0] * g[1], s_ll - g[1] * g[1]])
}

/// The censored fit by Newton's method (`newton_censored`) from the uncensored one (`None` if it does not converge).
pub(super) fn fit_newton(s: &Sample, start: [f64; 2]) -> Option<[f64; 2]> {
    let inside = |p: [f64; 2]| p[0] > 0.0 && p[1] > 0.0;
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

/// The censored fit by Nelder–Mead on (ln μ, ln λ): the fallback of [`fit_newton`].
pub(super) fn fit_nelder_mead(s: &Sample, start: [f64; 2]) -> Result<[f64; 2]> {
    let ll = |lm: f64, ll: f64| {
        let p = [lm.exp(), ll.exp()];
        loglik_complete(&p, s) + s.censored_lengths().map(|c| ln_sf(&p, c)).sum::<f64>()
    };
    let m = maximise2(ll, [start[0].ln(), start[1].ln()], "inverse Gaussian")?;
    Ok([m[0].exp(), m[1].exp()])
}

pub(super) fn ln_pdf(p: &[f64; 2], x: f64) -> f64 {
    let [m, l] = *p;
    0.5 * (l.ln() - LN_2PI - 3.0 * x.ln()) - l * (x - m).powi(2) / (2.0 * m * m * x)
}

/// The two terms of F in log space: ln Φ(a) and 2λ/μ + ln Φ(−b).
fn terms(p: &[f64; 2], x: f64) -> (f64, f64, f64) {
    let [m, l] = *p;
    let r = (l / x).sqrt();
    let a = r * (x / m - 1.0);
    let b = r * (x / m + 1.0);
    (a, ln_norm_cdf(a), 2.0 * l / m + ln_norm_cdf(-b))
}

pub(super) fn cdf(p: &[f64; 2], x: f64) -> f64 {
    let (_, t1, t2) = terms(p, x);
    (t1.exp() + t2.exp()).min(1.0)
}

pub(super) fn ln_sf(p: &[f64; 2], x: f64) -> f64 {
    sf_terms(p, x).2
}

/// a, 2λ/μ + ln Φ(−b) and ln S at `x`. S = Φ(−a) − e^(2λ/μ) Φ(−b) is subtracted in log space,
/// ln S = ln Φ(−a) + ln(1 − e^(t2 − ln Φ(−a))); −∞ where the difference underflows.
fn sf_terms(p: &[f64; 2], x: f64) -> (f64, f64, f64) {
    let [m, l] = *p;
    let r = (l / x).sqrt();
    let a = r * (x / m - 1.0);
    let t2 = 2.0 * l / m + ln_norm_cdf(-(r * (x / m + 1.0)));
    let u = ln_norm_cdf(-a);
    let d = t2 - u;
    if d >= 0.0 {
        return (a, t2, f64::NEG_INFINITY);
    }
    (a, t2, u + (-d.exp()).ln_1p())
}

pub(super) fn loglik_complete(p: &[f64; 2], s: &Sample) -> f64 {
    let [m, l] = *p;
    let n = s.n() as f64;
    // Σ (x − μ)²/x = Σx − 2nμ + μ² Σ 1/x.
    let q = s.sum_x - 2.0 * n * m + m * m * s.sum_inv;
    0.5 * (n * (l.ln() - LN_2PI) - 3.0 * s.sum_ln) - l * q / (2.0 * m * m)
}

pub(super) fn sample(p: &[f64; 2], rng: &mut McRng) -> f64 {
    use rand_distr::Distribution;
    let z: f64 = rand_distr::StandardNormal.sample(rng);
    from_normal_uniform(p, z, rng.random::<f64>())
}

/// One draw of the Michael–Schucany–Haas sampler from its standard normal `z` and uniform `u`:
/// basic operations and a square root, so it also runs over slices (`draw_sorted`).
#[inline(always)]
pub(super) fn from_normal_uniform(p: &[f64; 2], z: f64, u: f64) -> f64 {
    let [m, l] = *p;
    let y = z * z;
    let x = m + m * m * y / (2.0 * l) - m / (2.0 * l) * (4.0 * m * l * y + m * m * y * y).sqrt();
    if u <= m / (m + x) {
        x
    } else {
        m * m / x
    }
}
