//! The fitted distribution function over a sorted sample, with ln F and ln S, a slice at a time: the
//! values the Kolmogorov–Smirnov and Anderson–Darling statistics need in the goodness-of-fit
//! bootstrap, where they are evaluated for every replicate.

use super::{incomplete_gamma, Fitted, Model};
use crate::fastmath::{exp_basic, ln_basic, map_in_place, map_into};
use crate::reversals::normal_tail::{ln_upper_tail_into, norm_log_tails};

/// ln 10⁻³⁰⁰: ln F is floored here (F underflows far in the lower tail).
const LN_F_FLOOR: f64 = -690.775_527_898_213_7;
/// ln S is floored here (as the one-point statistic does).
const LN_S_FLOOR: f64 = -690.0;

/// F, ln F and ln S of a fitted model at the points of a sorted sample, with the buffers they need.
#[derive(Debug, Default, Clone)]
pub(crate) struct EdfValues {
    /// F(xᵢ).
    pub(crate) cdf: Vec<f64>,
    /// ln F(xᵢ), floored at ln 10⁻³⁰⁰.
    pub(crate) ln_cdf: Vec<f64>,
    /// ln S(xᵢ), floored at −690.
    pub(crate) ln_sf: Vec<f64>,
    a: Vec<f64>,
    b: Vec<f64>,
    inv: Vec<f64>,
}

/// 1 − e^(−t) for t ≥ 0 without cancellation for small t.
///
/// # Formula
/// Below t = 0.01 the series Σₖ (−1)ᵏ⁺¹ tᵏ/k!, k = 1 … 7, by Horner's scheme with the coefficients
/// 1/k! (remainder below 3 · 10⁻¹⁹ relative; multiplications only, no division), above it 1 − e^(−t)
/// (relative error below 10⁻¹⁴).
#[inline(always)]
fn one_minus_exp_neg(t: f64) -> f64 {
    const C: [f64; 6] = [1.0 / 2.0, 1.0 / 6.0, 1.0 / 24.0, 1.0 / 120.0, 1.0 / 720.0, 1.0 / 5040.0];
    let small = t * (1.0 - t * (C[0] - t * (C[1] - t * (C[2] - t * (C[3] - t * (C[4] - t * C[5]))))));
    let big = 1.0 - exp_basic(-t);
    if t < 0.01 {
        small
    } else {
        big
    }
}

/// ln max(c, 10⁻³⁰⁰).
#[inline(always)]
fn ln_floored(c: f64) -> f64 {
    ln_basic(c.max(1e-300))
}

impl EdfValues {
    /// Evaluate `f` at the ascending lengths `x` whose natural logarithms are `lx` (not read, and may be
    /// empty, for the exponential model).
    pub(crate) fn fill(&mut self, f: &Fitted, x: &[f64], lx: &[f64]) {
        let n = x.len();
        assert!(
            lx.len() == n || f.model == Model::Exponential,
            "EdfValues::fill: lengths and logarithms differ in number"
        );
        // Every element is written below: only the lengths are set here.
        for v in [&mut self.cdf, &mut self.ln_cdf, &mut self.ln_sf, &mut self.a, &mut self.b] {
            v.resize(n, 0.0);
        }
        let [p0, p1] = f.params;
        match f.model {
            Model::Exponential => {
                self.a.iter_mut().zip(x).for_each(|(t, &x)| *t = p0 * x);
                self.set_from_cumulative_hazard();
            }
            Model::Weibull => {
                let ln_scale = p1.ln();
                map_into(
                    lx,
                    &mut self.a,
                    #[inline(always)]
                    |l| exp_basic(p0 * (l - ln_scale)),
                );
                self.set_from_cumulative_hazard();
            }
            Model::Lognormal => {
                self.a.iter_mut().zip(lx).for_each(|(w, &l)| *w = (l - p0) / p1);
                norm_log_tails(&self.a, &mut self.cdf, &mut self.ln_cdf, &mut self.ln_sf);
            }
            Model::InverseGaussian => self.inverse_gaussian(p0, p1, x),
            Model::Gamma => self.gamma(f, x),
        }
        map_in_place(
            &mut self.ln_cdf,
            #[inline(always)]
            |v| v.max(LN_F_FLOOR),
        );
        map_in_place(
            &mut self.ln_sf,
            #[inline(always)]
            |v| v.max(LN_S_FLOOR),
        );
    }

    /// F = 1 − e^(−t), ln S = −t from the cumulative hazards t in `a` (exponential and Weibull).
    fn set_from_cumulative_hazard(&mut self) {
        map_into(&self.a, &mut self.cdf, one_minus_exp_neg);
        map_into(&self.cdf, &mut self.ln_cdf, ln_floored);
        map_into(
            &self.a,
            &mut self.ln_sf,
            #[inline(always)]
            |t| -t,
        );
    }

    /// Inverse Gaussian with mean `m` and shape `l`: F = Φ(a) + B and S = Φ(−a) − B with
    /// B = e^(2λ/μ) Φ(−b), a = √(λ/x)(x/μ − 1), b = √(λ/x)(x/μ + 1) (the formulas of the model's own
    /// file); the tails' logarithms from [`ln_upper_tail_into`], B = exp(2λ/μ + ln Φ(−b)), and S formed
    /// as a difference of values (two exponentials and two logarithms per point).
    fn inverse_gaussian(&mut self, m: f64, l: f64, x: &[f64]) {
        for ((a, b), &x) in self.a.iter_mut().zip(self.b.iter_mut()).zip(x) {
            let r = (l / x).sqrt();
            *a = r * (x / m - 1.0);
            *b = r * (x / m + 1.0);
        }
        // ln_sf ← ln Φ(−|a|), inv ← ln Φ(−b); then b ← e^(2λ/μ) Φ(−b), ln_sf ← Φ(−|a|).
        let shift = 2.0 * l / m;
        self.inv.resize(x.len(), 0.0);
        ln_upper_tail_into(&self.a, &mut self.ln_sf, f64::abs);
        ln_upper_tail_into(&self.b, &mut self.inv, |b| b);
        map_into(
            &self.inv,
            &mut self.b,
            #[inline(always)]
            |t| exp_basic(shift + t),
        );
        map_in_place(&mut self.ln_sf, exp_basic);
        // F = Φ(a) + B (at most 1) into cdf, S = Φ(−a) − B into inv, with Φ(±a) from the smaller tail.
        for ((((c, sf), &a), &small), &bb) in
            self.cdf.iter_mut().zip(self.inv.iter_mut()).zip(&self.a).zip(&self.ln_sf).zip(&self.b)
        {
            let (phi_a, phi_minus_a) = if a < 0.0 { (small, 1.0 - small) } else { (1.0 - small, small) };
            *c = (phi_a + bb).min(1.0);
            *sf = phi_minus_a - bb;
        }
        map_into(&self.cdf, &mut self.ln_cdf, ln_floored);
        map_into(
            &self.inv,
            &mut self.ln_sf,
            #[inline(always)]
            |sf| if sf > 0.0 { ln_basic(sf) } else { f64::NEG_INFINITY },
        );
    }

    /// Gamma: P(a, x/θ) by [`incomplete_gamma::gamma_p_sorted`]; ln S = ln(1 − P) except where P is
    /// within 10⁻⁸ of 1, where Q is computed directly.
    fn gamma(&mut self, f: &Fitted, x: &[f64]) {
        let [shape, scale] = f.params;
        let lg = statrs::function::gamma::ln_gamma(shape);
        self.a.iter_mut().zip(x).for_each(|(z, &x)| *z = x / scale);
        incomplete_gamma::gamma_p_sorted(shape, &self.a, lg, &mut self.cdf, &mut self.inv);
        map_into(
            &self.cdf,
            &mut self.ln_sf,
            #[inline(always)]
            |p| ln_basic((1.0 - p).max(1e-300)),
        );
        for ((ls, &p), &z) in self.ln_sf.iter_mut().zip(&self.cdf).zip(&self.a) {
            if !(p < 1.0 - 1e-8) {
                *ls = incomplete_gamma::gamma_q(shape, z, lg).ln();
            }
        }
        map_into(&self.cdf, &mut self.ln_cdf, ln_floored);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn slice_values_match_the_one_point_functions() {
        // Each model's slice evaluation against its own one-point F and ln S (which are checked against
        // SciPy in the models' tests): 10⁻¹² relative, or 10⁻¹⁴ absolute near 0. The gamma ln S below
        // P = 1 − 10⁻⁸ is ln(1 − P), as in the one-point statistic before: 10⁻¹⁰ absolute there.
        let x: Vec<f64> = (1..=150).map(|i| 0.004 * i as f64 * (1.0 + 0.01 * i as f64)).collect();
        let lx: Vec<f64> = x.iter().map(|v| v.ln()).collect();
        let fits = [
            Fitted { model: Model::Exponential, params: [4.0, f64::NAN] },
            Fitted { model: Model::Gamma, params: [2.1, 0.12] },
            Fitted { model: Model::Gamma, params: [0.6, 0.4] },
            Fitted { model: Model::Weibull, params: [1.4, 0.3] },
            Fitted { model: Model::Lognormal, params: [-1.4, 0.8] },
            Fitted { model: Model::InverseGaussian, params: [0.25, 0.4] },
        ];
        let mut e = EdfValues::default();
        for f in fits {
            e.fill(&f, &x, &lx);
            for (i, &v) in x.iter().enumerate() {
                let (c, ls) = (f.cdf(v), f.ln_sf(v).max(LN_S_FLOOR));
                let rel = 1e-12;
                let close = |got: f64, want: f64| (got - want).abs() <= rel * want.abs() + 1e-14;
                assert!(close(e.cdf[i], c), "{:?} F({v}) = {}, one point {c}", f.model, e.cdf[i]);
                assert!(
                    close(e.ln_cdf[i], c.max(1e-300).ln()),
                    "{:?} ln F({v}) = {}, one point {}",
                    f.model,
                    e.ln_cdf[i],
                    c.max(1e-300).ln()
                );
                let close_sf =
                    (e.ln_sf[i] - ls).abs() <= if f.model == Model::Gamma { 1e-10 } else { rel * ls.abs() + 1e-14 };
                assert!(close_sf, "{:?} ln S({v}) = {}, one point {ls}", f.model, e.ln_sf[i]);
            }
        }
        // SciPy 1.17.1: stats.lognorm.logcdf(0.00404, 0.8, scale=exp(−1.4)) = −15.797337738039715.
        e.fill(&fits[4], &x[..1], &lx[..1]);
        assert!((e.ln_cdf[0] + 15.797337738039715).abs() < 1e-13 * 15.8, "{}", e.ln_cdf[0]);
    }
}
