//! Renewal models for the lengths of polarity intervals, each with a right-censored
//! log-likelihood, its maximum-likelihood fit, CDF, survival, hazard and a sampler.
//!
//! One file per model. A [`Sample`] holds the complete intervals and, optionally, one right-censored
//! length (the open chron at the young end of the record), which enters every likelihood through the
//! survival function: ℓ = Σ ln f(xᵢ) + ln S(c).

mod draw_sorted;
mod edf;
mod exponential;
mod gamma;
mod incomplete_gamma;
mod inverse_gaussian;
mod lognormal;
mod stated;
mod weibull;

pub(crate) use draw_sorted::draw_sorted;
pub(crate) use edf::EdfValues;
pub use stated::DEFAULT_SHAPE;

use crate::error::{Error, Result};
use crate::montecarlo::McRng;

/// A renewal model by name (contract names: `exponential`, `gamma`, `weibull`, `lognormal`,
/// `inverse_gaussian`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Model {
    /// Exponential intervals: a Poisson process of reversals (no memory). Parameter `rate` (per Myr).
    Exponential,
    /// Gamma intervals (McFadden 1984). Parameters `shape`, `scale` (Myr).
    Gamma,
    /// Weibull intervals. Parameters `shape`, `scale` (Myr).
    Weibull,
    /// Lognormal intervals. Parameters `mu`, `sigma` (of ln Myr).
    Lognormal,
    /// Inverse Gaussian intervals (Brownian passage time). Parameters `mean`, `shape` (Myr).
    InverseGaussian,
}

impl Model {
    /// All models, in report order.
    pub const ALL: [Model; 5] =
        [Model::Exponential, Model::Gamma, Model::Weibull, Model::Lognormal, Model::InverseGaussian];

    /// The contract name.
    pub fn name(self) -> &'static str {
        match self {
            Model::Exponential => "exponential",
            Model::Gamma => "gamma",
            Model::Weibull => "weibull",
            Model::Lognormal => "lognormal",
            Model::InverseGaussian => "inverse_gaussian",
        }
    }

    /// Parameter names (contract names), in the order of [`Fitted::params`].
    pub fn param_names(self) -> &'static [&'static str] {
        match self {
            Model::Exponential => &["rate"],
            Model::Gamma | Model::Weibull => &["shape", "scale"],
            Model::Lognormal => &["mu", "sigma"],
            Model::InverseGaussian => &["mean", "shape"],
        }
    }

    /// Number of free parameters (for AIC and BIC).
    pub fn n_params(self) -> usize {
        self.param_names().len()
    }

    /// Maximum-likelihood fit to a sample (complete intervals plus the optional censored one).
    pub fn fit(self, s: &Sample) -> Result<Fitted> {
        let params = match self {
            Model::Exponential => exponential::fit(s)?,
            Model::Gamma => gamma::fit(s)?,
            Model::Weibull => weibull::fit(s)?,
            Model::Lognormal => lognormal::fit(s)?,
            Model::InverseGaussian => inverse_gaussian::fit(s)?,
        };
        self.checked(params)
    }

    /// [`Model::fit`] of a bootstrap replicate drawn from `near`, given the logarithms `logs` of its
    /// complete lengths: the Weibull fit reuses them and starts its Newton steps at `near`'s shape;
    /// the other models fit as [`Model::fit`] does. The same maximum, found with less work.
    pub(crate) fn refit(self, s: &Sample, logs: &[f64], near: &Fitted) -> Result<Fitted> {
        if self != Model::Weibull || logs.len() != s.n() || near.model != self {
            return self.fit(s);
        }
        let ly: Vec<f64> = logs.iter().copied().chain(s.censored_lengths().map(f64::ln)).collect();
        self.checked(weibull::fit_logs(s, ly, Some(near.params[0]))?)
    }

    /// `params` as a fit of this model, or an error when one of them is not finite.
    fn checked(self, params: [f64; 2]) -> Result<Fitted> {
        if !params[..self.n_params()].iter().all(|p| p.is_finite()) {
            return Err(Error::Undefined(format!("the {} fit did not converge to finite parameters", self.name())));
        }
        Ok(Fitted { model: self, params })
    }
}

/// Interval lengths ready for fitting: complete intervals (sorted) and an optional right-censored
/// length, with the sums the likelihoods need.
///
/// # Units
/// Myr.
#[derive(Debug, Clone, PartialEq)]
pub struct Sample {
    /// Complete interval lengths, sorted ascending.
    pub complete: Vec<f64>,
    /// The right-censored length at the young end (the open chron, or a chron cut by the window's
    /// young edge), if it enters the likelihood.
    pub censored: Option<f64>,
    /// A second right-censored length, at the old end (the oldest row of a table cut at an
    /// arbitrary age, or a chron cut by the window's old edge); set by [`Sample::with_old_censored`].
    pub censored_old: Option<f64>,
    pub(crate) sum_x: f64,
    pub(crate) sum_ln: f64,
    pub(crate) sum_ln2: f64,
    pub(crate) sum_inv: f64,
}

impl Sample {
    /// Validate and summarise: every length finite and positive, at least two complete intervals.
    pub fn new(mut complete: Vec<f64>, censored: Option<f64>) -> Result<Sample> {
        if let Some(x) = complete.iter().chain(censored.iter()).find(|x| !(x.is_finite() && **x > 0.0)) {
            return Err(Error::IntervalLength(*x));
        }
        if complete.len() < 2 {
            return Err(Error::TooFew {
                what: "a renewal-model fit",
                needed: 2,
                got: complete.len(),
                unit: "complete intervals",
            });
        }
        complete.sort_unstable_by(f64::total_cmp);
        let (mut sum_x, mut sum_ln, mut sum_ln2, mut sum_inv) = (0.0, 0.0, 0.0, 0.0);
        for &x in &complete {
            let l = x.ln();
            sum_x += x;
            sum_ln += l;
            sum_ln2 += l * l;
            sum_inv += 1.0 / x;
        }
        Ok(Sample { complete, censored, censored_old: None, sum_x, sum_ln, sum_ln2, sum_inv })
    }

    /// A replicate of `like` (same censored lengths) from complete lengths already sorted ascending and
    /// their natural logarithms `logs` (computed by the caller a slice at a time): no sorting and no
    /// logarithm here.
    pub(crate) fn from_sorted_logs(complete: Vec<f64>, logs: &[f64], like: &Sample) -> Result<Sample> {
        let (first, last) = (complete.first().copied(), complete.last().copied());
        if complete.len() < 2
            || !(first > Some(0.0) && last.is_some_and(f64::is_finite))
            || logs.len() != complete.len()
        {
            return Sample::new(complete, like.censored)?.with_old_censored(like.censored_old);
        }
        debug_assert!(complete.windows(2).all(|w| w[0] <= w[1]), "from_sorted_logs: lengths not sorted");
        let [sum_x, sum_ln, sum_ln2, sum_inv] = lane_sums(&complete, logs);
        let (censored, censored_old) = (like.censored, like.censored_old);
        Ok(Sample { complete, censored, censored_old, sum_x, sum_ln, sum_ln2, sum_inv })
    }

    /// The same sample with a second right-censored length at the old end (`None` removes it).
    pub fn with_old_censored(mut self, c: Option<f64>) -> Result<Sample> {
        if let Some(x) = c.filter(|x| !(x.is_finite() && *x > 0.0)) {
            return Err(Error::IntervalLength(x));
        }
        self.censored_old = c;
        Ok(self)
    }

    /// The right-censored lengths (young end first), each entering the likelihood through ln S.
    pub fn censored_lengths(&self) -> impl Iterator<Item = f64> + '_ {
        self.censored.iter().chain(self.censored_old.iter()).copied()
    }

    /// A replicate of this sample with other complete lengths and the same censored lengths.
    pub fn replicate(&self, complete: Vec<f64>) -> Result<Sample> {
        Sample::new(complete, self.censored)?.with_old_censored(self.censored_old)
    }

    /// Number of complete intervals.
    pub fn n(&self) -> usize {
        self.complete.len()
    }

    /// Number of observations (complete plus censored), used as the sample size of BIC.
    pub fn n_obs(&self) -> usize {
        self.complete.len() + self.censored_lengths().count()
    }
}

/// The exponential refit of a bootstrap replicate with complete lengths `x` and the censored lengths
/// of `like`, from Σx alone: no [`Sample`] (no logarithms) is needed.
pub(crate) fn exponential_refit(x: &[f64], like: &Sample) -> Fitted {
    let [sum_x, ..] = lane_sums(x, &[]);
    Fitted { model: Model::Exponential, params: exponential::rate(x.len(), sum_x, like) }
}

/// Σx, Σ ln x, Σ (ln x)² and Σ 1/x with eight partial sums per quantity (added at the end), so that
/// the loop runs in vector registers; the same sums as a running sum up to rounding. With no
/// logarithms (`lx` empty) only Σx, the others 0.
fn lane_sums(x: &[f64], lx: &[f64]) -> [f64; 4] {
    const L: usize = 8;
    let mut acc = [[0.0f64; L]; 4];
    if lx.is_empty() {
        for x in x.chunks_exact(L) {
            (0..L).for_each(|l| acc[0][l] += x[l]);
        }
        let tail: f64 = x.chunks_exact(L).remainder().iter().sum();
        return [acc[0].iter().sum::<f64>() + tail, 0.0, 0.0, 0.0];
    }
    let (xc, lc) = (x.chunks_exact(L), lx.chunks_exact(L));
    let (xr, lr) = (xc.remainder(), lc.remainder());
    for (x, lx) in xc.zip(lc) {
        for l in 0..L {
            acc[0][l] += x[l];
            acc[1][l] += lx[l];
            acc[2][l] += lx[l] * lx[l];
            acc[3][l] += 1.0 / x[l];
        }
    }
    let mut sums = acc.map(|a| a.iter().sum::<f64>());
    for (&x, &l) in xr.iter().zip(lr) {
        sums[0] += x;
        sums[1] += l;
        sums[2] += l * l;
        sums[3] += 1.0 / x;
    }
    sums
}

/// A model with its fitted parameters.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Fitted {
    /// Which model.
    pub model: Model,
    /// Parameters in the order of [`Model::param_names`] (the exponential uses only the first).
    pub params: [f64; 2],
}

impl Fitted {
    /// Parameters paired with their contract names.
    pub fn named_params(&self) -> Vec<(&'static str, f64)> {
        self.model.param_names().iter().copied().zip(self.params).collect()
    }

    /// ln f(x), the log density at interval length `x` (Myr).
    pub fn ln_pdf(&self, x: f64) -> f64 {
        if !(x > 0.0) {
            return f64::NEG_INFINITY;
        }
        match self.model {
            Model::Exponential => exponential::ln_pdf(&self.params, x),
            Model::Gamma => gamma::ln_pdf(&self.params, x),
            Model::Weibull => weibull::ln_pdf(&self.params, x),
            Model::Lognormal => lognormal::ln_pdf(&self.params, x),
            Model::InverseGaussian => inverse_gaussian::ln_pdf(&self.params, x),
        }
    }

    /// ln S(x), the log survival function (probability that an interval lasts longer than `x`).
    pub fn ln_sf(&self, x: f64) -> f64 {
        if !(x > 0.0) {
            return 0.0;
        }
        match self.model {
            Model::Exponential => exponential::ln_sf(&self.params, x),
            Model::Gamma => gamma::ln_sf(&self.params, x),
            Model::Weibull => weibull::ln_sf(&self.params, x),
            Model::Lognormal => lognormal::ln_sf(&self.params, x),
            Model::InverseGaussian => inverse_gaussian::ln_sf(&self.params, x),
        }
    }

    /// Density f(x).
    pub fn pdf(&self, x: f64) -> f64 {
        self.ln_pdf(x).exp()
    }

    /// Survival S(x) = P(interval > x).
    pub fn sf(&self, x: f64) -> f64 {
        self.ln_sf(x).exp()
    }

    /// Distribution function F(x) = 1 − S(x), computed directly where cancellation would lose digits.
    pub fn cdf(&self, x: f64) -> f64 {
        if !(x > 0.0) {
            return 0.0;
        }
        match self.model {
            Model::Gamma => gamma::cdf(&self.params, x),
            Model::Lognormal => lognormal::cdf(&self.params, x),
            Model::InverseGaussian => inverse_gaussian::cdf(&self.params, x),
            _ => -self.ln_sf(x).exp_m1(),
        }
    }

    /// [`Fitted::cdf`] at every point of `xs`, into `out` (cleared first). The gamma model evaluates
    /// ln Γ(shape) once for all the points.
    pub fn cdf_into(&self, xs: &[f64], out: &mut Vec<f64>) {
        out.clear();
        match self.model {
            Model::Gamma => {
                let lg = statrs::function::gamma::ln_gamma(self.params[0]);
                out.extend(xs.iter().map(|&x| incomplete_gamma::gamma_p(self.params[0], x / self.params[1], lg)));
            }
            _ => out.extend(xs.iter().map(|&x| self.cdf(x))),
        }
    }

    /// Hazard h(x) = f(x) / S(x): the instantaneous rate of reversal after `x` Myr without one (per Myr).
    pub fn hazard(&self, x: f64) -> f64 {
        if self.model == Model::Exponential {
            return self.params[0];
        }
        (self.ln_pdf(x) - self.ln_sf(x)).exp()
    }

    /// Log-likelihood of a sample, with each censored length entering through ln S.
    pub fn loglik(&self, s: &Sample) -> f64 {
        let complete = match self.model {
            Model::Exponential => exponential::loglik_complete(&self.params, s),
            Model::Gamma => gamma::loglik_complete(&self.params, s),
            Model::Weibull => s.complete.iter().map(|&x| self.ln_pdf(x)).sum(),
            Model::Lognormal => lognormal::loglik_complete(&self.params, s),
            Model::InverseGaussian => inverse_gaussian::loglik_complete(&self.params, s),
        };
        complete + s.censored_lengths().map(|c| self.ln_sf(c)).sum::<f64>()
    }

    /// One random interval length from the model.
    pub fn sample(&self, rng: &mut McRng) -> f64 {
        match self.model {
            Model::Exponential => exponential::sample(&self.params, rng),
            Model::Gamma => gamma::sample(&self.params, rng),
            Model::Weibull => weibull::sample(&self.params, rng),
            Model::Lognormal => lognormal::sample(&self.params, rng),
            Model::InverseGaussian => inverse_gaussian::sample(&self.params, rng),
        }
    }

    /// Mean interval length (Myr).
    pub fn mean(&self) -> f64 {
        let [a, b] = self.params;
        match self.model {
            Model::Exponential => 1.0 / a,
            Model::Gamma => a * b,
            Model::Weibull => b * statrs::function::gamma::gamma(1.0 + 1.0 / a),
            Model::Lognormal => (a + 0.5 * b * b).exp(),
            Model::InverseGaussian => a,
        }
    }
}

/// ln Φ(z), the log of the standard normal distribution function, accurate far into the lower tail.
///
/// # Formula
/// For z < 0 the lower tail directly, ln Φ(z) = ln(½ erfc(−z/√2)) by the Chebyshev form of
/// `normal_tail::ln_upper_tail` (no underflow); for z ≥ 0, ln Φ(z) = ln(1 − Φ(−z)).
///
/// # References
/// Abramowitz, M. & Stegun, I. A. (1964), *Handbook of Mathematical Functions*, 26.2.2 and 7.1.2;
/// Press, W. H. et al. (2007), *Numerical Recipes*, 3rd ed., §6.2.2.
pub fn ln_norm_cdf(z: f64) -> f64 {
    if z.is_nan() || z == f64::NEG_INFINITY {
        return z;
    }
    if z == f64::INFINITY {
        return 0.0;
    }
    let small = crate::reversals::normal_tail::ln_upper_tail(z.abs());
    if z < 0.0 {
        small
    } else {
        (-small.exp()).ln_1p()
    }
}

/// The trigamma function ψ′(x) for x > 0.
///
/// # Formula
/// Recurrence ψ′(x) = ψ′(x + 1) + 1/x² up to x ≥ 10, then the asymptotic series
/// 1/x + 1/(2x²) + 1/(6x³) − 1/(30x⁵) + 1/(42x⁷) − 1/(30x⁹) + 5/(66x¹¹) (Bernoulli numbers).
///
/// # References
/// Abramowitz & Stegun (1964), 6.4.6 and 6.4.12.
pub fn trigamma(mut x: f64) -> f64 {
    let mut acc = 0.0;
    while x < 10.0 {
        acc += 1.0 / (x * x);
        x += 1.0;
    }
    let r = 1.0 / x;
    let r2 = r * r;
    acc + r
        + 0.5 * r2
        + r * r2 * (1.0 / 6.0 - r2 * (1.0 / 30.0 - r2 * (1.0 / 42.0 - r2 * (1.0 / 30.0 - r2 * 5.0 / 66.0))))
}

/// Maximise a two-parameter log-likelihood by Nelder–Mead from a starting point, in the caller's
/// (unbounded, usually logarithmic) parametrisation; returns the maximising point in that space.
pub(crate) fn maximise2<F: Fn(f64, f64) -> f64>(ll: F, start: [f64; 2], what: &'static str) -> Result<[f64; 2]> {
    let mut best = start;
    let mut step = 0.1;
    // Restart once from the optimum with a small simplex, to guard against a collapsed simplex
    // (common practice with Nelder–Mead). Tolerances: 1e-11 in log-likelihood, 1e-7 in the
    // (log) parameters, far below the statistical uncertainty of any fit.
    for _ in 0..2 {
        let m = super::optimize::nelder_mead(|p| -ll(p[0], p[1]), &best, step, 1e-11, 1e-7, 4000);
        if !m.value.is_finite() {
            return Err(Error::Undefined(format!("the {what} likelihood is not finite near the data")));
        }
        best = [m.x[0], m.x[1]];
        step = 1e-3;
    }
    Ok(best)
}

/// The censored fit from the complete-data estimate `start`: `start` itself when nothing is
/// censored, else the Newton refit from it (`newton`), else the Nelder–Mead one (`fallback`) when
/// Newton does not converge.
pub(super) fn refine_censored(
    s: &Sample,
    start: [f64; 2],
    newton: fn(&Sample, [f64; 2]) -> Option<[f64; 2]>,
    fallback: fn(&Sample, [f64; 2]) -> Result<[f64; 2]>,
) -> Result<[f64; 2]> {
    if s.censored_lengths().next().is_none() {
        return Ok(start);
    }
    match newton(s, start) {
        Some(p) => Ok(p),
        None => fallback(s, start),
    }
}

/// The censored maximum-likelihood estimate of a two-parameter model by Newton's method, started at
/// the uncensored estimate `start`. `value` is the complete-data log-likelihood and `derivs` its
/// analytic gradient and Hessian `[∂₀₀, ∂₀₁, ∂₁₁]`; `ln_sf` is the log survival at a censored length
/// and `ln_sf_derivs` its gradient and Hessian in the parameters (analytic, or partly by differences
/// where a model has no closed form); `inside` is the parameter domain. `None` when Newton does not
/// converge (the caller falls back to Nelder–Mead).
pub(crate) fn newton_censored<V, D, L, G, I>(
    s: &Sample,
    value: V,
    derivs: D,
    ln_sf: L,
    ln_sf_derivs: G,
    inside: I,
    start: [f64; 2],
) -> Option<[f64; 2]>
where
    V: Fn([f64; 2]) -> f64,
    D: Fn([f64; 2]) -> ([f64; 2], [f64; 3]),
    L: Fn([f64; 2], f64) -> f64,
    G: Fn([f64; 2], f64) -> ([f64; 2], [f64; 3]),
    I: Fn([f64; 2]) -> bool,
{
    let f = |p: [f64; 2]| value(p) + s.censored_lengths().map(|c| ln_sf(p, c)).sum::<f64>();
    let all_derivs = |p: [f64; 2]| {
        let (mut g, mut h) = derivs(p);
        for c in s.censored_lengths() {
            let (gc, hc) = ln_sf_derivs(p, c);
            g = [g[0] + gc[0], g[1] + gc[1]];
            h = [h[0] + hc[0], h[1] + hc[1], h[2] + hc[2]];
        }
        (g, h)
    };
    // 10⁻¹³ of |ℓ|: far inside the 10⁻¹¹ of the Nelder–Mead tolerance.
    super::optimize::newton_max2(f, all_derivs, inside, start, 1e-13, 50)
}

#[cfg(test)]
mod tests;
