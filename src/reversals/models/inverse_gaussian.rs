//! Inverse Gaussian intervals (Brownian passage time) with mean μ and shape λ (both Myr).
//!
//! # Formula
//! f(x) = √(λ/(2πx³)) exp(−λ(x − μ)²/(2μ²x));
//! F(x) = Φ(√(λ/x)(x/μ − 1)) + e^(2λ/μ) Φ(−√(λ/x)(x/μ + 1)) (the second term in log space).
//! Without censoring the MLE is μ = x̄, 1/λ = mean(1/x) − 1/x̄; with a censored length the
//! likelihood is maximised by Nelder–Mead on (ln μ, ln λ).
//!
//! # References
//! Chhikara, R. S. & Folks, J. L. (1989), *The Inverse Gaussian Distribution*, Dekker, ch. 2 and 4;
//! Matthews, M. V., Ellsworth, W. L. & Reasenberg, P. A. (2002), A Brownian model for recurrent
//! earthquakes. *Bull. Seismol. Soc. Am.* 92, 2233–2250; Michael, J. R., Schucany, W. R. & Haas, R. W.
//! (1976), *Am. Stat.* 30, 88–90 (sampler).

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
    if s.censored_lengths().next().is_none() {
        return Ok(start);
    }
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
    // S = Φ(−a) − e^(2λ/μ) Φ(−b): subtract in log space, ln S = ln Φ(−a) + ln(1 − e^(t2 − ln Φ(−a))).
    let (a, _, t2) = terms(p, x);
    let u = ln_norm_cdf(-a);
    let d = t2 - u;
    if d >= 0.0 {
        return f64::NEG_INFINITY;
    }
    u + (-d.exp()).ln_1p()
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
    let [m, l] = *p;
    let z: f64 = rand_distr::StandardNormal.sample(rng);
    let y = z * z;
    let x = m + m * m * y / (2.0 * l) - m / (2.0 * l) * (4.0 * m * l * y + m * m * y * y).sqrt();
    if rng.random::<f64>() <= m / (m + x) {
        x
    } else {
        m * m / x
    }
}
