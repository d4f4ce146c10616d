//! Weibull intervals with shape k and scale λ (Myr).
//!
//! # Formula
//! f(x) = (k/λ)(x/λ)^(k−1) e^(−(x/λ)^k), S(x) = e^(−(x/λ)^k), h(x) = (k/λ)(x/λ)^(k−1).
//! With r complete intervals and censoring, λ^k = Σ_all x^k / r, and k solves the profile equation
//! 1/k + (1/r) Σ_complete ln x − Σ_all x^k ln x / Σ_all x^k = 0 (decreasing in k), found by safeguarded
//! Newton. Lengths are divided by their geometric mean and the powers shifted by the largest, so no
//! power overflows.
//!
//! # References
//! Lawless (2003), §5.2 (Weibull MLE with censored data); Cohen, A. C. (1965), Maximum likelihood
//! estimation in the Weibull distribution based on complete and on censored samples. *Technometrics*
//! 7, 579–588.

use super::super::optimize::newton_bisect;
use super::Sample;
use crate::error::{Error, Result};
use crate::montecarlo::McRng;
use rand::RngExt;

pub(super) fn fit(s: &Sample) -> Result<[f64; 2]> {
    let r = s.n() as f64;
    let g = (s.sum_ln / r).exp();
    let mut ly: Vec<f64> = s.complete.iter().copied().chain(s.censored_lengths()).collect();
    let lx = ly.clone();
    crate::fastmath::ln_into(&lx, &mut ly);
    let ln_g = s.sum_ln / r;
    ly.iter_mut().for_each(|l| *l -= ln_g);
    let mean_lc = ly[..s.n()].iter().sum::<f64>() / r;
    let top = ly.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    // Σ w, Σ w ln y, Σ w ln² y with w = exp(k (ln y − top)), the exponentials over the whole slice at once.
    let mut w = vec![0.0; ly.len()];
    let mut sums = |k: f64| {
        crate::fastmath::map_into(
            &ly,
            &mut w,
            #[inline(always)]
            |l| crate::fastmath::exp_basic(k * (l - top)),
        );
        let (mut s0, mut s1, mut s2) = (0.0, 0.0, 0.0);
        for (&wi, &l) in w.iter().zip(&ly) {
            s0 += wi;
            s1 += wi * l;
            s2 += wi * l * l;
        }
        (s0, s1, s2)
    };
    let mut profile = |k: f64| {
        let (s0, s1, s2) = sums(k);
        let m1 = s1 / s0;
        (1.0 / k + mean_lc - m1, -1.0 / (k * k) - (s2 / s0 - m1 * m1))
    };
    let spread = (s.sum_ln2 / r - (s.sum_ln / r).powi(2)).max(0.0).sqrt();
    if !(spread > 1e-12) {
        return Err(Error::Undefined("the Weibull fit needs intervals of different lengths".into()));
    }
    // Start: the shape whose ln-spread is π/(k√6) (Gumbel moments), common practice.
    let start = std::f64::consts::PI / (spread * 6f64.sqrt());
    let k = newton_bisect(&mut profile, 1e-3, 1e3, start, 1e-13).ok_or_else(|| {
        Error::Undefined("the Weibull shape has no finite maximum-likelihood value for these intervals".into())
    })?;
    let (s0, _, _) = sums(k);
    let ln_lambda_y = (s0.ln() + k * top - r.ln()) / k;
    Ok([k, g * ln_lambda_y.exp()])
}

pub(super) fn ln_pdf(p: &[f64; 2], x: f64) -> f64 {
    let [k, l] = *p;
    let z = x / l;
    k.ln() - l.ln() + (k - 1.0) * z.ln() - z.powf(k)
}

pub(super) fn ln_sf(p: &[f64; 2], x: f64) -> f64 {
    -(x / p[1]).powf(p[0])
}

pub(super) fn sample(p: &[f64; 2], rng: &mut McRng) -> f64 {
    p[1] * (-(1.0 - rng.random::<f64>()).ln()).powf(1.0 / p[0])
}
