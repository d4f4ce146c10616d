//! Fold tests: bootstrap incremental untilting and the classic precision ratio.

use super::streams;
use super::untilt_curves::{CurveScratch, UntiltCurves, TILE};
use crate::error::{check_range, Error, Result};
use crate::montecarlo::{quantile_sorted, MonteCarlo, UniformIndex};
use crate::sphere::{Bedding, Vec3};
use statrs::distribution::{ContinuousCDF, FisherSnedecor};

/// Settings of the incremental untilting.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct FoldOptions {
    /// First untilting, percent (default −10).
    pub from: f64,
    /// Last untilting, percent (default 150).
    pub to: f64,
    /// Step, percent (default 1).
    pub step: f64,
    /// Confidence level of the interval of the best untilting (default 0.95).
    pub confidence: f64,
    /// How many resample curves to keep for plotting (default 40).
    pub keep_curves: usize,
}

impl Default for FoldOptions {
    fn default() -> Self {
        Self { from: -10.0, to: 150.0, step: 1.0, confidence: 0.95, keep_curves: 40 }
    }
}

/// The verdict of the bootstrap fold test.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum FoldVerdict {
    /// The interval contains 100 % and not 0 %: magnetized before folding.
    #[serde(rename = "pre-folding")]
    PreFolding,
    /// The interval lies strictly between 0 % and 100 %: magnetized during folding.
    #[serde(rename = "syn-folding")]
    SynFolding,
    /// The interval contains 0 % and not 100 %: magnetized after folding.
    #[serde(rename = "post-folding")]
    PostFolding,
    /// The interval contains both, or lies outside 0–100 %: the test cannot decide.
    #[serde(rename = "inconclusive")]
    Inconclusive,
}

impl FoldVerdict {
    /// Output name.
    pub fn name(self) -> &'static str {
        match self {
            FoldVerdict::PreFolding => "pre-folding",
            FoldVerdict::SynFolding => "syn-folding",
            FoldVerdict::PostFolding => "post-folding",
            FoldVerdict::Inconclusive => "inconclusive",
        }
    }
    /// Verdict from the interval [low, high] of the best untilting (percent).
    pub fn from_interval(low: f64, high: f64) -> Self {
        let has0 = low <= 0.0 && high >= 0.0;
        let has100 = low <= 100.0 && high >= 100.0;
        match (has0, has100) {
            (false, true) => FoldVerdict::PreFolding,
            (true, false) => FoldVerdict::PostFolding,
            (false, false) if low > 0.0 && high < 100.0 => FoldVerdict::SynFolding,
            _ => FoldVerdict::Inconclusive,
        }
    }
}

/// The classic fold test: ratio of Fisher precisions after and before tilt correction.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PrecisionRatio {
    /// k in geographic coordinates.
    pub k_geo: f64,
    /// k after full tilt correction.
    pub k_tilt: f64,
    /// k_tilt / k_geo.
    pub ratio: f64,
    /// Critical value of F with (2(N − 1), 2(N − 1)) degrees of freedom at 95 %.
    pub f_crit: f64,
    /// ratio > F: precision increases significantly on untilting.
    pub increase: bool,
    /// 1/ratio > F: precision decreases significantly on untilting.
    pub decrease: bool,
}

/// Result of the fold test.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct FoldTest {
    /// Number of directions.
    pub n: usize,
    /// Untilting percentages evaluated.
    pub steps: Vec<f64>,
    /// τ₁ of the data at each step.
    pub data_curve: Vec<f64>,
    /// Untilting that maximises τ₁ for the data, percent.
    pub best_untilt: f64,
    /// Lower bound of the bootstrap interval, percent.
    pub ci_low: f64,
    /// Upper bound, percent.
    pub ci_high: f64,
    /// Confidence of the interval.
    pub confidence: f64,
    /// The verdict from the interval.
    pub verdict: FoldVerdict,
    /// Best untilting of every resample, sorted, percent.
    pub maxima: Vec<f64>,
    /// τ₁ curves of the first resamples, for plotting.
    pub curves: Vec<Vec<f64>>,
    /// The classic precision-ratio test.
    pub classic: PrecisionRatio,
    /// Share of resamples whose maximum sits at either end of the range (the range may be too short).
    pub at_edge: f64,
    /// Largest angle between two bedding poles, degrees (see [`bedding_spread`]).
    pub bedding_spread: f64,
}

/// Fold test by bootstrap incremental untilting, with the classic precision ratio beside it.
///
/// For each of `mc.resamples` resamples (directions drawn with replacement, each keeping its own
/// bedding), the directions are untilted from `from` to `to` percent in steps of `step`, and the
/// untilting that maximises τ₁, the largest eigenvalue of the orientation matrix, is recorded.
///
/// # Units
/// Untilting in percent of the full bedding correction (0 = geographic, 100 = fully untilted).
///
/// # Formula
/// τ₁(f) = λ_max((1/N) Σ Rᵢ(f) uᵢ (Rᵢ(f) uᵢ)ᵀ), Rᵢ(f) the rotation about strike by f × the bed's
/// restoring angle. Interval: central `confidence` quantiles (type 7) of the resample maxima.
/// Classic test: k_tilt/k_geo against F(2(N − 1), 2(N − 1)) at 95 %.
///
/// The classic ratio is reported for comparison only: the two k come from the same directions, so
/// they are not independent and the F test does not strictly apply (McFadden & Jones 1981); it also
/// ignores partial untilting and is sensitive to unequal numbers of sites per limb.
///
/// # References
/// Tauxe, L. & Watson, G. S. (1994), The fold test: an eigen analysis approach, *Earth Planet. Sci.
/// Lett.* 122, 331–341; McElhinny, M. W. (1964), Statistical significance of the fold test in
/// palaeomagnetism, *Geophys. J. R. astr. Soc.* 8, 338–340; McFadden, P. L. & Jones, D. L. (1981),
/// The fold test in palaeomagnetism, *Geophys. J. R. astr. Soc.* 67, 53–58.
pub fn fold_test(v: &[Vec3], beds: &[Bedding], mc: &MonteCarlo, opt: &FoldOptions) -> Result<FoldTest> {
    check_range("confidence", opt.confidence, 1e-9, 1.0 - 1e-9, "(0, 1)")?;
    if v.len() != beds.len() {
        return Err(Error::LengthMismatch {
            left_what: "directions",
            left: v.len(),
            right_what: "beddings",
            right: beds.len(),
        });
    }
    let n = v.len();
    if n < 3 {
        return Err(Error::TooFew { what: "a fold test", needed: 3, got: n, unit: "directions" });
    }
    if !(opt.step > 0.0 && opt.to > opt.from && opt.from.is_finite() && opt.to.is_finite()) {
        let range = format!("{} to {} by {}", opt.from, opt.to, opt.step);
        return Err(Error::invalid("untilting range", &range, format!("untilting range {range} is empty")));
    }
    if mc.resamples < 20 {
        return Err(Error::TooFew { what: "a bootstrap fold test", needed: 20, got: mc.resamples, unit: "resamples" });
    }
    let n_steps = ((opt.to - opt.from) / opt.step + 1e-9).floor() as usize + 1;
    if n_steps > 100_000 {
        return Err(Error::TooMany { what: "untilting steps", count: n_steps as u64, limit: 100_000 });
    }
    let steps: Vec<f64> = (0..n_steps).map(|s| opt.from + s as f64 * opt.step).collect();
    let curves = UntiltCurves::new(v, beds, &steps);
    let curve_of = |weights: &[u32]| curves.tau1(weights);
    let argmax = |c: &[f64]| -> usize {
        let mut best = 0;
        for (i, x) in c.iter().enumerate() {
            if *x > c[best] {
                best = i;
            }
        }
        best
    };
    let data_curve = curve_of(&vec![1u32; n]);
    let best_untilt = steps[argmax(&data_curve)];
    let keep = opt.keep_curves;
    let pick = UniformIndex::new(n).ok_or(Error::TooMany {
        what: "directions in a fold test",
        count: n as u64,
        limit: u64::from(u32::MAX),
    })?;
    let scratch = || (vec![0u32; n], vec![0u32; TILE * n], CurveScratch::default());
    // The bootstrap (resamples in tiles that share one pass over the untilted numbers), with the two
    // cheap serial summaries computed alongside on the other thread.
    let (results, (classic, spread)) = rayon::join(
        || {
            mc.run_batched("fold test bootstrap", streams::FOLD, TILE, scratch, |(idx, w, buf), rngs, first| {
                let w = &mut w[..rngs.len() * n];
                w.fill(0);
                for (rng, wr) in rngs.iter_mut().zip(w.chunks_exact_mut(n)) {
                    pick.fill(rng, idx);
                    idx.iter().for_each(|&j| wr[j as usize] += 1);
                }
                let tile = curves.tau1_tile(w, buf);
                tile.chunks_exact(n_steps)
                    .enumerate()
                    .map(|(r, c)| (steps[argmax(c)], if first + r < keep { Some(c.to_vec()) } else { None }))
                    .collect()
            })
        },
        || (precision_ratio(v, beds), bedding_spread(beds)),
    );
    let classic = classic?;
    let mut maxima: Vec<f64> = results.iter().map(|r| r.0).collect();
    let curves: Vec<Vec<f64>> = results.into_iter().filter_map(|r| r.1).collect();
    maxima.sort_by(f64::total_cmp);
    let lo_q = (1.0 - opt.confidence) / 2.0;
    let (ci_low, ci_high) = (quantile_sorted(&maxima, lo_q), quantile_sorted(&maxima, 1.0 - lo_q));
    let at_edge =
        maxima.iter().filter(|&&m| m <= steps[0] || m >= steps[n_steps - 1]).count() as f64 / maxima.len() as f64;
    Ok(FoldTest {
        n,
        steps,
        data_curve,
        best_untilt,
        ci_low,
        ci_high,
        confidence: opt.confidence,
        verdict: FoldVerdict::from_interval(ci_low, ci_high),
        maxima,
        curves,
        classic,
        at_edge,
        bedding_spread: spread,
    })
}

/// Resultant length after flipping the directions of the second polarity mode (split on the
/// principal axis), so that mixed-polarity sets have a meaningful k.
fn common_polarity_resultant(v: &[Vec3]) -> Result<f64> {
    let split = super::split_modes(v)?;
    let a = split.axis.to_vector();
    Ok(v.iter().fold(Vec3::ZERO, |s, u| if u.dot(a) >= 0.0 { s + *u } else { s - *u }).norm())
}

/// Largest angle between the poles of any two bedding attitudes, degrees. A small spread leaves
/// the fold test without power: untilting then rotates the whole set almost rigidly.
pub fn bedding_spread(beds: &[Bedding]) -> f64 {
    let poles: Vec<Vec3> = beds.iter().map(|b| b.retilt(Vec3::new(0.0, 0.0, 1.0))).collect();
    let mut worst: f64 = 0.0;
    for (i, p) in poles.iter().enumerate() {
        for q in &poles[i + 1..] {
            worst = worst.max(crate::sphere::angle_between(*p, *q));
        }
    }
    worst
}

/// The classic precision-ratio fold test (see [`fold_test`] for its weaknesses).
///
/// # Formula
/// ratio = k_tilt/k_geo, k = (N − 1)/(N − R), with the second polarity mode flipped in each frame;
/// F_crit = F⁻¹(0.95; 2(N − 1), 2(N − 1)).
///
/// # References
/// McElhinny (1964); McFadden & Jones (1981).
pub fn precision_ratio(v: &[Vec3], beds: &[Bedding]) -> Result<PrecisionRatio> {
    let n = v.len();
    if n < 2 {
        return Err(Error::TooFew { what: "a precision ratio", needed: 2, got: n, unit: "directions" });
    }
    let tilted: Vec<Vec3> = v.iter().zip(beds).map(|(u, b)| b.untilt(*u)).collect();
    let (geo, tilt) = (common_polarity_resultant(v)?, common_polarity_resultant(&tilted)?);
    let (k_geo, k_tilt) = (super::capped_k(n, geo), super::capped_k(n, tilt));
    let dof = 2.0 * (n as f64 - 1.0);
    let f = FisherSnedecor::new(dof, dof).map_err(|e| Error::invalid("degrees of freedom", dof, e.to_string()))?;
    let f_crit = f.inverse_cdf(0.95);
    let ratio = k_tilt / k_geo;
    Ok(PrecisionRatio { k_geo, k_tilt, ratio, f_crit, increase: ratio > f_crit, decrease: 1.0 / ratio > f_crit })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sphere::Direction;
    use crate::stats::FisherSampler;

    #[test]
    fn classic_f_quantile() {
        // SciPy 1.17.1: stats.f.ppf(0.95, 18, 18) = 2.217197133717372 (N = 10).
        let v = vec![Vec3::new(1.0, 0.0, 0.0); 9].into_iter().chain([Vec3::new(0.0, 1.0, 0.0)]).collect::<Vec<_>>();
        let b = vec![Bedding::from_dip_direction(90.0, 30.0, false).unwrap(); 10];
        let p = precision_ratio(&v, &b).unwrap();
        assert!((p.f_crit - 2.217197133717372).abs() < 1e-8, "{}", p.f_crit);
    }

    /// A synthetic fold: two limbs dipping 40° east and 40° west; the field direction is drawn in
    /// stratigraphic coordinates and tilted (magnetized before folding) or drawn in place (after).
    fn synthetic_fold(seed: u64, n: usize, before: bool) -> (Vec<Vec3>, Vec<Bedding>) {
        let s = FisherSampler::new(Direction { dec: 10.0, inc: 45.0 }, 40.0).unwrap();
        let beds: Vec<Bedding> = (0..n)
            .map(|i| Bedding::from_dip_direction(if i % 2 == 0 { 90.0 } else { 270.0 }, 40.0, false).unwrap())
            .collect();
        let draws = MonteCarlo::new(seed, n).run("d", 5, |r, _| s.sample(r));
        let v = draws.iter().zip(&beds).map(|(u, b)| if before { b.retilt(*u) } else { *u }).collect();
        (v, beds)
    }

    #[test]
    fn before_folding_peaks_near_100_after_near_0() {
        let mc = MonteCarlo::new(2, 200);
        let (v, b) = synthetic_fold(1, 30, true);
        let t = fold_test(&v, &b, &mc, &FoldOptions::default()).unwrap();
        assert!((t.best_untilt - 100.0).abs() <= 10.0, "{}", t.best_untilt);
        assert_eq!(t.verdict, FoldVerdict::PreFolding, "{} {}", t.ci_low, t.ci_high);
        assert!(t.classic.increase);
        let (v, b) = synthetic_fold(2, 30, false);
        let t = fold_test(&v, &b, &mc, &FoldOptions::default()).unwrap();
        assert!(t.best_untilt.abs() <= 10.0, "{}", t.best_untilt);
        assert_eq!(t.verdict, FoldVerdict::PostFolding, "{} {}", t.ci_low, t.ci_high);
        assert!(t.classic.decrease);
        assert!((t.bedding_spread - 80.0).abs() < 1e-9);
        assert_eq!(t.steps.len(), 161);
        assert_eq!(t.curves.len(), 40);
    }

    #[test]
    fn classic_ratio_ignores_polarity() {
        // Flipping half of the directions to their antipodes must not change k in either frame.
        let (v, b) = synthetic_fold(3, 20, true);
        let flipped: Vec<Vec3> = v.iter().enumerate().map(|(i, u)| if i % 3 == 0 { -*u } else { *u }).collect();
        let (p, q) = (precision_ratio(&v, &b).unwrap(), precision_ratio(&flipped, &b).unwrap());
        assert!((p.k_geo - q.k_geo).abs() < 1e-9 * p.k_geo && (p.k_tilt - q.k_tilt).abs() < 1e-9 * p.k_tilt);
    }

    #[test]
    fn verdicts() {
        assert_eq!(FoldVerdict::from_interval(85.0, 112.0), FoldVerdict::PreFolding);
        assert_eq!(FoldVerdict::from_interval(-8.0, 12.0), FoldVerdict::PostFolding);
        assert_eq!(FoldVerdict::from_interval(30.0, 70.0), FoldVerdict::SynFolding);
        assert_eq!(FoldVerdict::from_interval(-5.0, 120.0), FoldVerdict::Inconclusive);
        assert_eq!(FoldVerdict::from_interval(110.0, 140.0), FoldVerdict::Inconclusive);
    }
}
