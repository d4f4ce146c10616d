//! Bootstrap test of a common mean: do the confidence bounds of two bootstrapped means overlap in
//! every Cartesian component?

use super::streams;
use crate::error::{Error, Result};
use crate::montecarlo::{order_key, quantiles_of_keys, McRng, MonteCarlo, UniformIndex};
use crate::sphere::Vec3;

/// Bootstrap bounds of the x (north), y (east) and z (down) components of a mean unit vector.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ComponentBounds {
    /// Lower bounds of x, y, z.
    pub low: [f64; 3],
    /// Upper bounds of x, y, z.
    pub high: [f64; 3],
}

/// Result of the bootstrap comparison.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct BootstrapOverlap {
    /// Bounds of the first set's mean.
    pub set1: ComponentBounds,
    /// Bounds of the second set's mean.
    pub set2: ComponentBounds,
    /// Whether the intervals overlap, for x, y and z.
    pub overlap: [bool; 3],
    /// Confidence level of the bounds.
    pub confidence: f64,
    /// Number of resamples that had a mean (a resample whose vectors cancel out has none).
    pub resamples: usize,
    /// Overlap in all three components: no evidence that the means differ.
    pub passed: bool,
}

/// Mean unit vector of a resample drawn with replacement, or `None` if the resample cancels out.
///
/// Indices come 64 at a time from [`UniformIndex`]; the drawn vectors are summed into four partial
/// sums (four independent addition chains instead of one), added at the end.
fn resampled_mean(v: &[Vec3], pick: &UniformIndex, rng: &mut McRng) -> Option<Vec3> {
    let n = v.len();
    let mut idx = [0u32; 64];
    let mut part = [Vec3::ZERO; 4];
    let mut left = n;
    while left > 0 {
        let m = left.min(idx.len());
        pick.fill(rng, &mut idx[..m]);
        let mut quads = idx[..m].chunks_exact(4);
        for q in &mut quads {
            for (p, &i) in part.iter_mut().zip(q) {
                *p += v[i as usize];
            }
        }
        for (p, &i) in part.iter_mut().zip(quads.remainder()) {
            *p += v[i as usize];
        }
        left -= m;
    }
    let s = (part[0] + part[1]) + (part[2] + part[3]);
    let r = s.norm();
    if r > 1e-12 * n as f64 {
        Some(s * (1.0 / r))
    } else {
        None
    }
}

/// Bounds of both sets from the resampled means (`None` where a resample had no mean): the six
/// components' quantiles are selected in parallel, each straight from the results (no copies of the
/// means).
fn bounds(pairs: &[(Option<Vec3>, Option<Vec3>)], confidence: f64) -> [ComponentBounds; 2] {
    use rayon::prelude::*;
    let lo_q = (1.0 - confidence) / 2.0;
    let q: Vec<Vec<f64>> = (0..6)
        .into_par_iter()
        .map(|k| {
            let (set, c) = (k / 3, k % 3);
            let mut keys: Vec<u64> = pairs
                .iter()
                .filter_map(|p| if set == 0 { p.0 } else { p.1 })
                .map(|m| order_key(m.to_array()[c]))
                .collect();
            quantiles_of_keys(&mut keys, &[lo_q, 1.0 - lo_q])
        })
        .collect();
    let set = |s: usize| ComponentBounds {
        low: std::array::from_fn(|c| q[3 * s + c][0]),
        high: std::array::from_fn(|c| q[3 * s + c][1]),
    };
    [set(0), set(1)]
}

/// Bootstrap both sets `mc.resamples` times (directions drawn with replacement) and compare the
/// central `confidence` intervals of each Cartesian component of the mean unit vectors.
///
/// # Formula
/// For each resample b: m_b = Σ u*ᵢ / |Σ u*ᵢ|. The interval of component c is the
/// ((1 − confidence)/2, (1 + confidence)/2) quantile pair (type 7). The means are distinguishable when
/// the intervals of at least one component do not overlap; bounds within
/// [`crate::tolerance::BOUND_OVERLAP`] of each other count as overlapping.
///
/// # References
/// Tauxe, L., Kylstra, N. & Constable, C. (1991), Bootstrap statistics for paleomagnetic data,
/// *J. Geophys. Res.* 96, 11723–11740; Efron & Tibshirani (1993), *An Introduction to the Bootstrap*.
pub fn bootstrap_overlap(a: &[Vec3], b: &[Vec3], mc: &MonteCarlo, confidence: f64) -> Result<BootstrapOverlap> {
    super::check_two_sets("a bootstrap of two means", a, b, mc.resamples, confidence)?;
    let too_many = || Error::TooMany {
        what: "directions in one set of a bootstrap",
        count: a.len().max(b.len()) as u64,
        limit: u64::from(u32::MAX),
    };
    let (pick_a, pick_b) =
        (UniformIndex::new(a.len()).ok_or_else(too_many)?, UniformIndex::new(b.len()).ok_or_else(too_many)?);
    let pairs = mc.run("bootstrap of the means", streams::BOOTSTRAP, |rng, _| {
        (resampled_mean(a, &pick_a, rng), resampled_mean(b, &pick_b, rng))
    });
    let (na, nb) = (pairs.iter().filter(|p| p.0.is_some()).count(), pairs.iter().filter(|p| p.1.is_some()).count());
    if na < 20 || nb < 20 {
        return Err(Error::Undefined(
            "too few bootstrap resamples have a mean direction: the directions nearly cancel out".into(),
        ));
    }
    let [set1, set2] = bounds(&pairs, confidence);
    let eps = crate::tolerance::BOUND_OVERLAP;
    let overlap = [0, 1, 2].map(|c| set1.low[c] <= set2.high[c] + eps && set2.low[c] <= set1.high[c] + eps);
    Ok(BootstrapOverlap { set1, set2, overlap, confidence, resamples: na.min(nb), passed: overlap.iter().all(|&o| o) })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sphere::Direction;
    use crate::stats::FisherSampler;

    #[test]
    fn separated_sets_do_not_overlap_and_equal_sets_do() {
        // Synthetic Fisher sets (k = 50, N = 30); 30° apart they cannot overlap in x and y bounds
        // whose half-width is about α95 ≈ 3.7°, while two draws from one distribution overlap.
        let s1 = FisherSampler::new(Direction { dec: 0.0, inc: 45.0 }, 50.0).unwrap();
        let s2 = FisherSampler::new(Direction { dec: 40.0, inc: 45.0 }, 50.0).unwrap();
        let a = MonteCarlo::new(5, 30).run("a", 1, |r, _| s1.sample(r));
        let b = MonteCarlo::new(5, 30).run("b", 2, |r, _| s2.sample(r));
        let c = MonteCarlo::new(5, 30).run("c", 3, |r, _| s1.sample(r));
        let mc = MonteCarlo::new(1, 300);
        let far = bootstrap_overlap(&a, &b, &mc, 0.95).unwrap();
        assert!(!far.passed, "{far:?}");
        let near = bootstrap_overlap(&a, &c, &mc, 0.95).unwrap();
        assert!(near.passed, "{near:?}");
        for c in 0..3 {
            assert!(near.set1.low[c] <= near.set1.high[c]);
        }
    }

    #[test]
    fn identical_antipodal_sets_overlap() {
        // Five copies of one direction against seven copies of its antipode, flipped: the two sets are
        // the same direction exactly, so every resampled mean is that direction and each bound has
        // zero width. Summing 5 and 7 copies rounds differently in the last bit; the test must still
        // call the bounds overlapping (a regression: it used to report the identical means as distinct).
        let u = Direction { dec: 17.0, inc: 33.0 }.to_vector();
        let a = vec![u; 5];
        let b: Vec<Vec3> = vec![-u; 7].into_iter().map(|v| -v).collect();
        let t = bootstrap_overlap(&a, &b, &MonteCarlo::new(1, 100), 0.95).unwrap();
        assert!(t.passed, "{t:?}");
    }
}
