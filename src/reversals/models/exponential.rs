//! Exponential intervals: reversals as a Poisson process with constant rate λ (per Myr).
//!
//! # Formula
//! f(x) = λ e^(−λx), S(x) = e^(−λx), h(x) = λ. With r complete intervals and total observed time
//! T = Σ xᵢ + c (c the censored length), the maximum-likelihood rate is λ = r / T.
//!
//! # References
//! Cox, D. R. & Lewis, P. A. W. (1966), *The Statistical Analysis of Series of Events*, ch. 2;
//! Lawless, J. F. (2003), *Statistical Models and Methods for Lifetime Data*, 2nd ed., §2.2 (censored
//! exponential MLE).

use super::Sample;
use crate::error::Result;
use crate::montecarlo::McRng;
use rand::RngExt;

pub(super) fn fit(s: &Sample) -> Result<[f64; 2]> {
    Ok(rate(s.n(), s.sum_x, s))
}

/// λ = r / (Σx + Σc) from the number `r` and sum `sum_x` of complete lengths and the censored lengths
/// of `like`.
pub(super) fn rate(r: usize, sum_x: f64, like: &Sample) -> [f64; 2] {
    [r as f64 / (sum_x + like.censored_lengths().sum::<f64>()), f64::NAN]
}

pub(super) fn ln_pdf(p: &[f64; 2], x: f64) -> f64 {
    p[0].ln() - p[0] * x
}

pub(super) fn ln_sf(p: &[f64; 2], x: f64) -> f64 {
    -p[0] * x
}

pub(super) fn loglik_complete(p: &[f64; 2], s: &Sample) -> f64 {
    s.n() as f64 * p[0].ln() - p[0] * s.sum_x
}

pub(super) fn sample(p: &[f64; 2], rng: &mut McRng) -> f64 {
    // Inverse CDF on (0, 1]: 1 − U avoids ln 0.
    -(1.0 - rng.random::<f64>()).ln() / p[0]
}
