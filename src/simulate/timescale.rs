//! Synthetic polarity time scales from a renewal model of polarity-interval lengths.

use crate::error::{Error, Result};
use crate::model::{Chron, Polarity, TimeScale};
use crate::montecarlo::replicate_rng;
use rand::Rng;
use rand_distr::{Distribution, Exp, Gamma, InverseGaussian, LogNormal, Weibull};
use statrs::function::gamma::gamma as gamma_fn;

/// Random stream used for synthetic time scales (see [`crate::montecarlo::replicate_rng`]).
pub const TIMESCALE_STREAM: u64 = 0x7153_0001;

/// Shape parameter of a synthetic time scale's model when none is given (gamma/Weibull shape, lognormal
/// σ, inverse-Gaussian shape in Myr): an illustrative choice, not a fitted value.
pub const DEFAULT_SHAPE: f64 = 1.5;

/// A renewal model for the lengths of polarity intervals, with the contract's parameter names.
///
/// # Units
/// Lengths in Myr; `rate` per Myr; `shape` of gamma and Weibull dimensionless; `mu`, `sigma` of the
/// natural log of Myr; inverse-Gaussian `mean` and `shape` in Myr.
///
/// # Formula
/// Means: exponential 1/rate; gamma shape·scale; Weibull scale·Γ(1 + 1/shape); lognormal
/// exp(μ + σ²/2); inverse Gaussian `mean`.
///
/// # References
/// Johnson, Kotz & Balakrishnan (1994), *Continuous Univariate Distributions*, vol. 1 (chs. 15, 17,
/// 19, 21); Cox (1962), *Renewal Theory*, Methuen.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
#[serde(tag = "model", rename_all = "snake_case")]
pub enum RenewalModel {
    /// Exponential (Poisson process).
    Exponential {
        /// Events per Myr.
        rate: f64,
    },
    /// Gamma with shape and scale.
    Gamma {
        /// Shape k.
        shape: f64,
        /// Scale θ, Myr.
        scale: f64,
    },
    /// Weibull with shape and scale.
    Weibull {
        /// Shape k.
        shape: f64,
        /// Scale λ, Myr.
        scale: f64,
    },
    /// Lognormal: ln(length) ~ Normal(μ, σ).
    Lognormal {
        /// Mean of ln(length / Myr).
        mu: f64,
        /// Standard deviation of ln(length / Myr).
        sigma: f64,
    },
    /// Inverse Gaussian (Wald).
    InverseGaussian {
        /// Mean, Myr.
        mean: f64,
        /// Shape λ, Myr.
        shape: f64,
    },
}

/// The model families by their contract names.
pub const MODEL_NAMES: [&str; 5] = ["exponential", "gamma", "weibull", "lognormal", "inverse_gaussian"];

fn positive(name: &'static str, v: f64) -> Result<f64> {
    if v > 0.0 && v.is_finite() {
        Ok(v)
    } else {
        Err(Error::OutOfRange { name, value: v, range: "(0, ∞)" })
    }
}

impl RenewalModel {
    /// A model of family `name` with the given mean interval (Myr) and shape parameter.
    ///
    /// `shape` is the family's shape parameter in the contract's terms: gamma and Weibull `shape`
    /// (dimensionless), lognormal `sigma`, inverse-Gaussian `shape` (Myr); it is ignored (and may be
    /// `None`) for the exponential. The scale is chosen so that the model's mean equals `mean`.
    ///
    /// # Formula
    /// gamma scale = mean/k; Weibull scale = mean/Γ(1 + 1/k); lognormal μ = ln(mean) − σ²/2.
    pub fn with_mean(name: &str, mean: f64, shape: Option<f64>) -> Result<Self> {
        let mean = positive("mean interval", mean)?;
        let need = |s: Option<f64>| -> Result<f64> {
            match s {
                Some(v) => positive("shape", v),
                None => Err(Error::invalid("shape", "none", format!("the {name} model needs a shape parameter"))),
            }
        };
        Ok(match name {
            "exponential" => RenewalModel::Exponential { rate: 1.0 / mean },
            "gamma" => {
                let k = need(shape)?;
                RenewalModel::Gamma { shape: k, scale: mean / k }
            }
            "weibull" => {
                let k = need(shape)?;
                RenewalModel::Weibull { shape: k, scale: mean / gamma_fn(1.0 + 1.0 / k) }
            }
            "lognormal" => {
                let s = need(shape)?;
                RenewalModel::Lognormal { mu: mean.ln() - 0.5 * s * s, sigma: s }
            }
            "inverse_gaussian" => RenewalModel::InverseGaussian { mean, shape: need(shape)? },
            other => {
                return Err(Error::invalid(
                    "renewal model",
                    other,
                    format!("'{other}' is not a renewal model; expected one of {}", MODEL_NAMES.join(", ")),
                ))
            }
        })
    }

    /// As [`RenewalModel::with_mean`], with the settings' defaults: a shape is refused for the
    /// exponential model, and the other models take [`DEFAULT_SHAPE`] when none is given.
    pub fn from_settings(name: &str, mean: f64, shape: Option<f64>) -> Result<Self> {
        let shape = match (name, shape) {
            ("exponential", Some(_)) => {
                return Err(Error::invalid("shape", "given", "a shape does not apply to the exponential model"))
            }
            ("exponential", None) => None,
            (_, s) => Some(s.unwrap_or(DEFAULT_SHAPE)),
        };
        Self::with_mean(name, mean, shape)
    }

    /// The contract name of the family.
    pub fn name(&self) -> &'static str {
        match self {
            RenewalModel::Exponential { .. } => "exponential",
            RenewalModel::Gamma { .. } => "gamma",
            RenewalModel::Weibull { .. } => "weibull",
            RenewalModel::Lognormal { .. } => "lognormal",
            RenewalModel::InverseGaussian { .. } => "inverse_gaussian",
        }
    }

    /// The mean interval length, Myr (formulas in the type's documentation).
    pub fn mean(&self) -> f64 {
        match *self {
            RenewalModel::Exponential { rate } => 1.0 / rate,
            RenewalModel::Gamma { shape, scale } => shape * scale,
            RenewalModel::Weibull { shape, scale } => scale * gamma_fn(1.0 + 1.0 / shape),
            RenewalModel::Lognormal { mu, sigma } => (mu + 0.5 * sigma * sigma).exp(),
            RenewalModel::InverseGaussian { mean, .. } => mean,
        }
    }

    /// A sampler of interval lengths.
    pub fn sampler(&self) -> Result<IntervalSampler> {
        let bad = |e: String| Error::invalid("renewal model", self.name(), format!("{} model: {e}", self.name()));
        Ok(match *self {
            RenewalModel::Exponential { rate } => {
                IntervalSampler::Exp(Exp::new(positive("rate", rate)?).map_err(|e| bad(e.to_string()))?)
            }
            RenewalModel::Gamma { shape, scale } => IntervalSampler::Gamma(
                Gamma::new(positive("shape", shape)?, positive("scale", scale)?).map_err(|e| bad(e.to_string()))?,
            ),
            RenewalModel::Weibull { shape, scale } => IntervalSampler::Weibull(
                Weibull::new(positive("scale", scale)?, positive("shape", shape)?).map_err(|e| bad(e.to_string()))?,
            ),
            RenewalModel::Lognormal { mu, sigma } => {
                if !mu.is_finite() {
                    return Err(Error::OutOfRange { name: "mu", value: mu, range: "a finite number" });
                }
                IntervalSampler::Lognormal(
                    LogNormal::new(mu, positive("sigma", sigma)?).map_err(|e| bad(e.to_string()))?,
                )
            }
            RenewalModel::InverseGaussian { mean, shape } => IntervalSampler::InverseGaussian(
                InverseGaussian::new(positive("mean", mean)?, positive("shape", shape)?)
                    .map_err(|e| bad(e.to_string()))?,
            ),
        })
    }
}

/// Draws interval lengths (Myr) from a [`RenewalModel`].
#[derive(Debug, Clone, Copy)]
pub enum IntervalSampler {
    /// Exponential.
    Exp(Exp<f64>),
    /// Gamma.
    Gamma(Gamma<f64>),
    /// Weibull.
    Weibull(Weibull<f64>),
    /// Lognormal.
    Lognormal(LogNormal<f64>),
    /// Inverse Gaussian.
    InverseGaussian(InverseGaussian<f64>),
}

impl IntervalSampler {
    /// One interval length, Myr.
    pub fn sample<R: Rng + ?Sized>(&self, rng: &mut R) -> f64 {
        match self {
            IntervalSampler::Exp(d) => d.sample(rng),
            IntervalSampler::Gamma(d) => d.sample(rng),
            IntervalSampler::Weibull(d) => d.sample(rng),
            IntervalSampler::Lognormal(d) => d.sample(rng),
            IntervalSampler::InverseGaussian(d) => d.sample(rng),
        }
    }
}

/// Polarity of the youngest chron of a synthetic time scale.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum FirstPolarity {
    /// This polarity.
    Fixed(Polarity),
    /// Normal or reversed with equal probability (drawn from the seed).
    Random,
}

/// What to simulate: a renewal model over a span of time.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TimeScaleModel {
    /// The interval-length model.
    pub model: RenewalModel,
    /// Age of the young end, Ma (usually 0, the present).
    pub young: f64,
    /// Length of time covered, Myr.
    pub span: f64,
    /// Polarity of the youngest chron.
    pub first: FirstPolarity,
    /// If given, chrons are named `PREFIX1`, `PREFIX2`, … from young to old.
    pub name_prefix: Option<String>,
}

/// Intervals simulated (and thrown away) before the young end, so that the chron running at the
/// young end has the length-biased distribution of a process already in progress rather than
/// starting afresh.
pub const BURN_IN_INTERVALS: usize = 50;

/// Chron boundaries of synthetic time scales are rounded to this step, Myr (one year), so that the
/// table written with six decimals reads back exactly.
pub const AGE_QUANTUM: f64 = 1e-6;

/// Simulate a polarity time scale: alternating chrons whose lengths are independent draws from the
/// renewal model.
///
/// The process is started [`BURN_IN_INTERVALS`] mean intervals before the young end (in the future,
/// read as ages) and run into the past until it passes `young + span`; the chrons are then cut at both
/// ends. So the youngest chron is an interval in progress (its young boundary is the young end, not a
/// reversal) and the oldest one is cut by the end of the span: both are censored, as in a real record.
/// Polarity alternates from chron to chron.
///
/// # Units
/// Ages in Ma, lengths in Myr.
///
/// # References
/// Cox (1962), *Renewal Theory*, ch. 5 (the interval straddling a fixed time is length-biased, which
/// is why the burn-in is needed).
pub fn simulate_timescale(m: &TimeScaleModel, seed: u64) -> Result<TimeScale> {
    crate::error::check_range("young", m.young, 0.0, f64::MAX, "[0, ∞)")?;
    let span = positive("span", m.span)?;
    let sampler = m.model.sampler()?;
    let mean = m.model.mean();
    let limit = 10_000_000usize;
    if span / mean > limit as f64 {
        return Err(Error::invalid(
            "span",
            span,
            format!("a span of {span} Myr with a mean interval of {mean} Myr would need more than {limit} chrons"),
        ));
    }
    let mut rng = replicate_rng(seed, TIMESCALE_STREAM, 0);
    let first = match m.first {
        FirstPolarity::Fixed(p) => p,
        FirstPolarity::Random => {
            if rand::RngExt::random::<bool>(&mut rng) {
                Polarity::Normal
            } else {
                Polarity::Reversed
            }
        }
    };
    let old_end = m.young + span;
    // Boundaries as ages; the process starts BURN_IN_INTERVALS mean lengths younger than `young`.
    let mut t = m.young - BURN_IN_INTERVALS as f64 * mean;
    let mut edges = Vec::new();
    loop {
        let len = sampler.sample(&mut rng);
        // Lengths of zero (possible in floating point for tiny shapes) are not chrons: draw again.
        if !(len > 0.0) {
            continue;
        }
        t += len;
        if t <= m.young {
            continue;
        }
        if t >= old_end {
            break;
        }
        edges.push(t);
        if edges.len() > limit {
            return Err(Error::TooMany {
                what: "chrons (shorten the span)",
                count: edges.len() as u64,
                limit: limit as u64,
            });
        }
    }
    // Boundaries are kept to AGE_QUANTUM (so that a written table reads back exactly); a chron that
    // rounds to zero length is removed, which merges its two neighbours of equal polarity.
    let q = |a: f64| (a / AGE_QUANTUM).round() * AGE_QUANTUM;
    let (young_q, old_q) = (q(m.young), q(old_end));
    let mut bounds: Vec<f64> = Vec::with_capacity(edges.len() + 2);
    bounds.push(young_q);
    for e in edges.into_iter().map(q) {
        if e <= young_q || e >= old_q {
            continue;
        }
        if bounds.len() > 1 && (e - bounds[bounds.len() - 1]).abs() < 0.5 * AGE_QUANTUM {
            bounds.pop();
            continue;
        }
        bounds.push(e);
    }
    bounds.push(old_q);
    let mut pol = first;
    let chrons = bounds
        .windows(2)
        .enumerate()
        .map(|(i, w)| {
            let c = Chron {
                name: m.name_prefix.as_ref().map(|p| format!("{p}{}", i + 1)),
                young: w[0],
                old: w[1],
                polarity: pol,
                line: i + 2,
            };
            pol = pol.flip();
            c
        })
        .collect();
    Ok(TimeScale {
        source: format!("synthetic {} time scale (seed {seed})", m.model.name()),
        chrons,
        oldest_is_reversal: false,
    })
}
