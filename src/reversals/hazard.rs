//! The hazard of a reversal given the time since the last one, per fitted model and averaged over
//! models by Akaike weight, with a bootstrap interval for the average.
//!
//! These are statistical statements about fitted models of the past record, not forecasts: see
//! [`CAUTIONS`].

use super::models::{Fitted, Model, Sample};
use super::renewal::{fit_models, RenewalFits};
use crate::error::{Error, Result};
use crate::montecarlo::{quantile_sorted, MonteCarlo};
use rand::RngExt;

/// Sentences that must accompany every hazard result (shown as notes and included in JSON).
pub const CAUTIONS: [&str; 3] = [
    "Under the exponential model (a Poisson process) reversals have no memory: the chance of one in the next interval is the same however long the present chron has lasted, so calling the field 'overdue' has no meaning under that model.",
    "The present chron is length-biased: an interval that happens to contain the moment of observation tends to be a long one, so its elapsed length is not a typical interval length.",
    "These numbers are a statistical statement about models fitted to the past record, not a forecast of the field; local practice and the published literature decide what they mean.",
];

/// Monte Carlo stream of the bootstrap interval of the averaged probability: every front end (the
/// `hazard` verb, the `section` run, the Python package) draws from this one, so a seed gives the
/// same interval everywhere.
pub const HAZARD_STREAM: u64 = 100;

/// Hazard quantities of one model at the elapsed time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ModelHazard {
    /// The fitted model.
    pub fitted: Fitted,
    /// Hazard h(T), reversals per Myr.
    pub hazard: f64,
    /// Survival S(T): probability that an interval lasts longer than T.
    pub survival: f64,
    /// P(reversal within the horizon | none for T) = 1 − S(T + Δ)/S(T); `None` where S(T) underflows.
    pub p_within: Option<f64>,
    /// F(T): the fitted-model percentile of T, as a fraction.
    pub cdf: f64,
    /// Akaike weight of the model.
    pub weight: f64,
}

/// A bootstrap percentile interval.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BootInterval {
    /// Lower limit.
    pub low: f64,
    /// Upper limit.
    pub high: f64,
    /// Confidence level.
    pub level: f64,
    /// Replicates that gave a value.
    pub resamples: usize,
}

/// Hazard results at elapsed time T and horizon Δ.
#[derive(Debug, Clone, PartialEq)]
pub struct HazardEstimate {
    /// Elapsed time since the last reversal, Myr.
    pub elapsed: f64,
    /// Horizon, Myr.
    pub horizon: f64,
    /// Per-model results.
    pub models: Vec<ModelHazard>,
    /// Akaike-weighted average of `p_within`.
    pub averaged: f64,
    /// Bootstrap interval of `averaged`, if requested.
    pub interval: Option<BootInterval>,
    /// Percentage of complete intervals shorter than T.
    pub percentile: f64,
}

/// P(reversal within Δ | none for T) under a fitted model.
///
/// # Formula
/// 1 − S(T + Δ)/S(T) = −expm1(ln S(T + Δ) − ln S(T)); for the exponential, 1 − e^(−λΔ) for every T.
///
/// # References
/// Cox, D. R. (1962), *Renewal Theory*, Methuen, ch. 1 (hazard and conditional survival).
pub fn p_within(f: &Fitted, elapsed: f64, horizon: f64) -> Option<f64> {
    let a = f.ln_sf(elapsed);
    let b = f.ln_sf(elapsed + horizon);
    if !a.is_finite() {
        return None;
    }
    Some(if b.is_finite() { -(b - a).exp_m1() } else { 1.0 })
}

fn averaged_p(fits: &RenewalFits, elapsed: f64, horizon: f64) -> Option<f64> {
    let mut sum = 0.0;
    let mut wsum = 0.0;
    for f in &fits.fits {
        if let Some(p) = p_within(&f.fitted, elapsed, horizon) {
            sum += f.weight * p;
            wsum += f.weight;
        }
    }
    (wsum > 0.0).then(|| sum / wsum)
}

/// Hazard, survival and P(reversal within `horizon` | none for `elapsed`) for every fitted model,
/// their Akaike-weighted average, and the empirical percentile of `elapsed`.
///
/// # Units
/// `elapsed` and `horizon` in Myr.
pub fn hazard_at(fits: &RenewalFits, s: &Sample, elapsed: f64, horizon: f64) -> Result<HazardEstimate> {
    crate::error::check_range("elapsed", elapsed, 0.0, f64::MAX, "[0, ∞) Myr")?;
    if !(horizon > 0.0 && horizon.is_finite()) {
        return Err(Error::OutOfRange { name: "horizon", value: horizon, range: "(0, ∞) Myr" });
    }
    if fits.fits.is_empty() {
        return Err(Error::Undefined("no renewal model could be fitted".into()));
    }
    let models = fits
        .fits
        .iter()
        .map(|f| ModelHazard {
            fitted: f.fitted,
            hazard: f.fitted.hazard(elapsed.max(1e-12)),
            survival: f.fitted.sf(elapsed),
            p_within: p_within(&f.fitted, elapsed, horizon),
            cdf: f.fitted.cdf(elapsed),
            weight: f.weight,
        })
        .collect();
    let averaged = averaged_p(fits, elapsed, horizon)
        .ok_or_else(|| Error::Undefined(format!("no model gives a finite survival at {elapsed} Myr")))?;
    let shorter = s.complete.iter().filter(|&&x| x < elapsed).count();
    Ok(HazardEstimate {
        elapsed,
        horizon,
        models,
        averaged,
        interval: None,
        percentile: 100.0 * shorter as f64 / s.n() as f64,
    })
}

/// The hazard stage as every front end runs it (the `hazard` verb, the `section` run, the Python
/// package): [`hazard_at`] at `elapsed`, then, when `mc` is given, the bootstrap interval of the
/// averaged probability on [`HAZARD_STREAM`]. A bootstrap that gives no interval does not fail the
/// stage: the estimate keeps `interval: None` and the reason travels in `interval_failure`.
#[derive(Debug)]
pub struct HazardAssessment {
    /// The estimate, with its interval where the bootstrap gave one.
    pub estimate: HazardEstimate,
    /// Why the bootstrap gave no interval, when it was asked for and failed.
    pub interval_failure: Option<Error>,
}

impl HazardAssessment {
    /// The note that says why the averaged probability has no interval, when the bootstrap failed.
    pub fn interval_note(&self) -> Option<String> {
        self.interval_failure.as_ref().map(|e| format!("No bootstrap interval for the averaged probability: {e}."))
    }
}

/// See [`HazardAssessment`].
///
/// # Units
/// `elapsed` and `horizon` in Myr; `level` a fraction in (0, 1).
pub fn assess_hazard(
    fits: &RenewalFits,
    s: &Sample,
    elapsed: f64,
    horizon: f64,
    level: f64,
    mc: Option<&MonteCarlo<'_>>,
) -> Result<HazardAssessment> {
    if !(level > 0.0 && level < 1.0) {
        return Err(Error::OutOfRange { name: "level", value: level, range: "(0, 1)" });
    }
    let mut estimate = hazard_at(fits, s, elapsed, horizon)?;
    let mut interval_failure = None;
    if let Some(mc) = mc {
        match averaged_interval(s, &Model::ALL, elapsed, horizon, level, mc, HAZARD_STREAM) {
            Ok(b) => estimate.interval = Some(b),
            Err(e) => interval_failure = Some(e),
        }
    }
    Ok(HazardAssessment { estimate, interval_failure })
}

/// Bootstrap percentile interval of the Akaike-weighted P(within horizon): the complete intervals are
/// resampled with replacement (the censored length kept), all `models` refitted, weights recomputed.
///
/// # References
/// Efron, B. & Tibshirani, R. J. (1993), *An Introduction to the Bootstrap*, ch. 13 (percentile
/// interval); Burnham & Anderson (2002), §4.3 (bootstrap of model-averaged estimates).
pub fn averaged_interval(
    s: &Sample,
    models: &[Model],
    elapsed: f64,
    horizon: f64,
    level: f64,
    mc: &MonteCarlo<'_>,
    stream: u64,
) -> Result<BootInterval> {
    if !(level > 0.0 && level < 1.0) {
        return Err(Error::OutOfRange { name: "level", value: level, range: "(0, 1)" });
    }
    let n = s.n();
    let mut vals: Vec<f64> = mc
        .run("hazard bootstrap", stream, |rng, _| {
            let xs: Vec<f64> = (0..n).map(|_| s.complete[rng.random_range(0..n)]).collect();
            let rs = s.replicate(xs).ok()?;
            averaged_p(&fit_models(&rs, models), elapsed, horizon)
        })
        .into_iter()
        .flatten()
        .collect();
    if vals.is_empty() {
        return Err(Error::Undefined("no bootstrap replicate could be fitted".into()));
    }
    vals.sort_by(f64::total_cmp);
    let a = (1.0 - level) / 2.0;
    Ok(BootInterval {
        low: quantile_sorted(&vals, a),
        high: quantile_sorted(&vals, 1.0 - a),
        level,
        resamples: vals.len(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exponential_has_no_memory() {
        // Commonly stated figure: mean interval 0.25 Myr. P(reversal within 0.1 Myr | elapsed T) =
        // 1 − e^(−0.4) ≈ 0.330 for every T (Cox 1962: the exponential is the memoryless law).
        let e = Fitted { model: Model::Exponential, params: [4.0, f64::NAN] };
        for t in [0.0, 0.1, 0.77, 3.0] {
            assert!((p_within(&e, t, 0.1).unwrap() - (1.0 - (-0.4f64).exp())).abs() < 1e-12);
        }
    }

    #[test]
    fn gamma_shape_above_one_has_rising_hazard() {
        // Shape > 1: the hazard increases with elapsed time, so P(within) does too (Cox 1962, §1.3).
        let g = Fitted { model: Model::Gamma, params: [2.0, 0.125] };
        assert!(p_within(&g, 0.5, 0.1).unwrap() > p_within(&g, 0.05, 0.1).unwrap());
        // Exact: S(x) = (1 + x/θ) e^(−x/θ) for shape 2 (closed form of the Erlang survival).
        let s = |x: f64| (1.0 + x / 0.125) * (-x / 0.125).exp();
        assert!((p_within(&g, 0.3, 0.1).unwrap() - (1.0 - s(0.4) / s(0.3))).abs() < 1e-12);
    }

    #[test]
    fn averaged_and_percentile() {
        let xs: Vec<f64> = (1..=40).map(|i| 0.02 * i as f64).collect();
        let s = Sample::new(xs, Some(0.5)).unwrap();
        let fits = fit_models(&s, &Model::ALL);
        let h = hazard_at(&fits, &s, 0.3, 0.1).unwrap();
        let manual: f64 = h.models.iter().map(|m| m.weight * m.p_within.unwrap()).sum();
        assert!((h.averaged - manual).abs() < 1e-12);
        assert!((h.percentile - 100.0 * 14.0 / 40.0).abs() < 1e-12); // 0.02 … 0.28 are shorter than 0.3
        let b = averaged_interval(&s, &Model::ALL, 0.3, 0.1, 0.9, &MonteCarlo::new(1, 60), 0).unwrap();
        assert!(b.low <= h.averaged + 0.05 && b.high >= h.averaged - 0.05 && b.low <= b.high, "{b:?} {}", h.averaged);
        assert!(hazard_at(&fits, &s, -1.0, 0.1).is_err());
        assert!(hazard_at(&fits, &s, 0.3, 0.0).is_err());
    }

    #[test]
    fn the_stage_is_the_estimate_and_the_interval_on_the_shared_stream() {
        // One rule for every front end: `assess_hazard` gives what `hazard_at` and `averaged_interval`
        // on HAZARD_STREAM give, bit for bit; a failed bootstrap leaves the estimate and says why.
        let xs: Vec<f64> = (1..=40).map(|i| 0.02 * i as f64).collect();
        let s = Sample::new(xs, Some(0.5)).unwrap();
        let fits = fit_models(&s, &Model::ALL);
        let mc = MonteCarlo::new(3, 50);
        let a = assess_hazard(&fits, &s, 0.3, 0.1, 0.9, Some(&mc)).unwrap();
        let mut want = hazard_at(&fits, &s, 0.3, 0.1).unwrap();
        want.interval = Some(averaged_interval(&s, &Model::ALL, 0.3, 0.1, 0.9, &mc, HAZARD_STREAM).unwrap());
        // Debug forms (shortest round-trip digits) compare equal where `==` cannot: the exponential's
        // unused second parameter is NaN.
        assert_eq!(format!("{:?}", a.estimate), format!("{want:?}"));
        assert!(a.interval_failure.is_none() && a.interval_note().is_none());
        let none = assess_hazard(&fits, &s, 0.3, 0.1, 0.9, None).unwrap();
        assert_eq!(none.estimate.interval, None);
        assert_eq!(none.estimate.averaged.to_bits(), want.averaged.to_bits());
        let failed = assess_hazard(&fits, &s, 0.3, 0.1, 0.9, Some(&MonteCarlo::new(3, 0))).unwrap();
        assert_eq!(failed.estimate.interval, None);
        assert!(matches!(failed.interval_failure, Some(Error::Undefined(_))));
        assert!(failed.interval_note().unwrap().starts_with("No bootstrap interval"));
        // A level outside (0, 1) is a fault of the request, not a failed bootstrap.
        let bad = assess_hazard(&fits, &s, 0.3, 0.1, 1.5, Some(&mc)).unwrap_err();
        assert!(matches!(bad, Error::OutOfRange { name: "level", value, .. } if value == 1.5));
    }

    #[test]
    fn far_tail_is_handled_without_panics() {
        // 1000 Myr after a reversal, gamma and Weibull survivals underflow: their conditional
        // probability is undefined and the average uses the models that remain defined.
        let xs: Vec<f64> = (1..=30).map(|i| 0.03 * i as f64).collect();
        let s = Sample::new(xs, Some(0.4)).unwrap();
        let fits = fit_models(&s, &Model::ALL);
        let h = hazard_at(&fits, &s, 1000.0, 0.1).unwrap();
        assert!(h.averaged.is_finite() && (0.0..=1.0).contains(&h.averaged));
        let exp = h.models.iter().find(|m| m.fitted.model == Model::Exponential).unwrap();
        assert!((exp.p_within.unwrap() - (1.0 - (-exp.fitted.params[0] * 0.1).exp())).abs() < 1e-12);
        assert_eq!(h.percentile, 100.0);
        // Elapsed zero: the hazard at the start of an interval is finite for every model.
        let h0 = hazard_at(&fits, &s, 0.0, 0.1).unwrap();
        assert!(h0.models.iter().all(|m| m.hazard.is_finite() && m.survival == 1.0));
    }
}
