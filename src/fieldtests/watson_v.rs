//! Watson's V_w statistic for a common mean of two sets, with a simulated critical value.

use super::{capped_k, resultant, streams};
use crate::error::Result;
use crate::montecarlo::{quantile_select, MonteCarlo};
use crate::sphere::{Direction, Vec3};
use crate::stats::{FisherLanes, FisherSampler};

/// Watson's V_w and its critical value.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct WatsonV {
    /// The statistic of the data.
    pub v_w: f64,
    /// Critical value at the chosen confidence, from simulated Fisher sets with the data's N and k.
    pub v_crit: f64,
    /// Confidence level of `v_crit`.
    pub confidence: f64,
    /// Number of simulated pairs behind `v_crit`.
    pub simulations: usize,
    /// V_w ≤ V_crit: no evidence that the means differ.
    pub passed: bool,
}

/// V_w of two sets of unit vectors.
///
/// # Formula
/// With resultants X₁, X₂ (lengths R₁, R₂) and k_i = (N_i − 1)/(N_i − R_i):
/// S_w = k₁R₁ + k₂R₂, R_w = |k₁X₁ + k₂X₂|, V_w = 2(S_w − R_w). V_w is 0 when the means coincide and
/// grows with the angle between them, weighted by the precision of each set.
///
/// # References
/// Watson, G. S. (1983), Large sample theory of the Langevin distribution, *J. Stat. Plan. Inference*
/// 8, 245–256; as used for the common-mean test in Tauxe, L. (2010), *Essentials of Paleomagnetism*,
/// ch. 12 (from memory).
pub fn watson_v_statistic(a: &[Vec3], b: &[Vec3]) -> f64 {
    v_from_resultants(resultant(a), a.len(), resultant(b), b.len())
}

/// V_w from the resultant vectors and sizes of the two sets (what the statistic depends on).
fn v_from_resultants(xa: Vec3, na: usize, xb: Vec3, nb: usize) -> f64 {
    let (ra, rb) = (xa.norm(), xb.norm());
    let (ka, kb) = (capped_k(na, ra), capped_k(nb, rb));
    let sw = ka * ra + kb * rb;
    let rw = (xa * ka + xb * kb).norm();
    (2.0 * (sw - rw)).max(0.0)
}

/// V_w of the data and its critical value from `mc.resamples` simulated pairs of Fisher sets that
/// share a mean, with the data's sizes N₁, N₂ and precisions k₁, k₂.
///
/// # Formula
/// V_crit is the `confidence` quantile (type 7) of the simulated V_w. As N grows it approaches the
/// χ²₂ point (5.99 at 95 %), the large-sample distribution of V_w.
///
/// # References
/// Watson (1983); simulation of Fisher sets: [`FisherSampler::resultant`] (one seeding of its eight
/// generators serves both sets of a replicate).
pub fn watson_v(a: &[Vec3], b: &[Vec3], mc: &MonteCarlo, confidence: f64) -> Result<WatsonV> {
    super::check_two_sets("Watson's V_w", a, b, mc.resamples, confidence)?;
    let v_w = watson_v_statistic(a, b);
    let ka = capped_k(a.len(), resultant(a).norm());
    let kb = capped_k(b.len(), resultant(b).norm());
    let north = Direction { dec: 0.0, inc: 0.0 };
    let sa = FisherSampler::new(north, ka)?;
    let sb = FisherSampler::new(north, kb)?;
    let (na, nb) = (a.len(), b.len());
    // Only the resultants matter, and V_w is unchanged by a rotation applied to both sets, so each
    // simulated set is summed in the samplers' own frame (mean along +x) with no draw stored.
    let sims = mc.run("V_w simulation", streams::WATSON_V, |rng, _| {
        let mut lanes = FisherLanes::new(&sa, rng);
        let xa = lanes.resultant(na);
        lanes.set_sampler(&sb);
        v_from_resultants(xa, na, lanes.resultant(nb), nb)
    });
    let v_crit = quantile_select(&sims, confidence);
    Ok(WatsonV { v_w, v_crit, confidence, simulations: sims.len(), passed: v_w <= v_crit })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn dirs(list: &[(f64, f64)]) -> Vec<Vec3> {
        list.iter().map(|&(d, i)| Direction::new(d, i).unwrap().to_vector()).collect()
    }

    #[test]
    fn statistic_by_hand() {
        // Hand computation: set a = two vectors at ±10° about north in the horizontal plane,
        // R_a = 2 cos 10°, k_a = 1/(2 − 2 cos 10°); set b the same about east.
        // X_a = (R_a, 0, 0), X_b = (0, R_b, 0), so R_w = k R √2 and V_w = 2 k R (2 − √2).
        let a = dirs(&[(10.0, 0.0), (350.0, 0.0)]);
        let b = dirs(&[(80.0, 0.0), (100.0, 0.0)]);
        let r = 2.0 * 10f64.to_radians().cos();
        let k = 1.0 / (2.0 - r);
        let want = 2.0 * k * r * (2.0 - 2f64.sqrt());
        assert!((watson_v_statistic(&a, &b) - want).abs() < 1e-9 * want);
        // Identical means give 0.
        assert!(watson_v_statistic(&a, &a).abs() < 1e-9);
    }

    #[test]
    fn critical_value_approaches_chi2_two() {
        // Large-sample limit: V_w ~ χ²₂; SciPy 1.17.1 stats.chi2.ppf(0.95, 2) = 5.991464547107979.
        // Data: two tight synthetic sets of 150 directions (k ≈ 30), 600 simulated pairs; the sampling
        // error of a 95 % quantile from 600 draws is about ±0.5, so the bound is 1.0.
        let mc = MonteCarlo::new(7, 600);
        let s = FisherSampler::new(Direction { dec: 20.0, inc: 40.0 }, 30.0).unwrap();
        let draws = MonteCarlo::new(3, 300).run("data", 99, |r, _| s.sample(r));
        let w = watson_v(&draws[..150], &draws[150..], &mc, 0.95).unwrap();
        assert!((w.v_crit - 5.991464547107979).abs() < 1.0, "V_crit = {}", w.v_crit);
        assert_eq!(w.simulations, 600);
    }
}
