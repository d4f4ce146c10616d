//! The reversal test: are the normal and reversed directions antipodal?

use super::common_mean::{compare_means, MeanComparison};
use crate::error::{Error, Result};
use crate::montecarlo::MonteCarlo;
use crate::sphere::{Direction, Vec3};
use crate::stats::principal_axis_signed;

/// How the directions were split into two polarity modes.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct PolaritySplit {
    /// Principal axis of the whole set (largest eigenvalue of the orientation matrix), taken
    /// pointing down (or, if horizontal, toward north or east).
    pub axis: Direction,
    /// Indices of the directions with a positive (or zero) projection on the axis.
    pub mode1: Vec<usize>,
    /// Indices of the directions with a negative projection (these are flipped for the test).
    pub mode2: Vec<usize>,
}

/// Split unit vectors into two modes by the sign of their projection on the principal axis.
///
/// # Formula
/// Axis = eigenvector of the largest eigenvalue of T = (1/N) Σ uᵢuᵢᵀ; mode 1: u·axis ≥ 0.
///
/// # References
/// Principal-axis splitting of bimodal sets: common practice (e.g. Tauxe 2010, *Essentials of
/// Paleomagnetism*, ch. 12, from memory); orientation matrix: Fisher, Lewis & Embleton (1987), §3.2.4.
pub fn split_modes(v: &[Vec3]) -> Result<PolaritySplit> {
    if v.is_empty() {
        return Err(Error::TooFew { what: "a polarity split", needed: 1, got: 0, unit: "directions" });
    }
    let axis = principal_axis_signed(v);
    let (mut mode1, mut mode2) = (Vec::new(), Vec::new());
    for (i, u) in v.iter().enumerate() {
        if u.dot(axis) >= 0.0 {
            mode1.push(i)
        } else {
            mode2.push(i)
        }
    }
    let axis = Direction::from_vector(axis).ok_or_else(|| Error::Undefined("no principal axis".into()))?;
    Ok(PolaritySplit { axis, mode1, mode2 })
}

/// Result of a reversal test.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ReversalTest {
    /// The split into modes.
    pub split: PolaritySplit,
    /// Mean of mode 2 before flipping (the comparison uses its antipode).
    pub mode2_mean: Direction,
    /// The comparison of mode 1 with the flipped mode 2.
    pub comparison: MeanComparison,
}

/// Reversal test: split into polarity modes, flip mode 2 to its antipode, and compare the means by
/// McFadden & McElhinny (1990), Watson's V_w and the bootstrap (see [`compare_means`]).
///
/// # References
/// McFadden & McElhinny (1990), Classification of the reversal test in palaeomagnetism, *Geophys. J.
/// Int.* 103, 725–729; Tauxe, Kylstra & Constable (1991); Watson (1983).
pub fn reversal_test(v: &[Vec3], mc: &MonteCarlo, confidence: f64) -> Result<ReversalTest> {
    let split = split_modes(v)?;
    if split.mode1.len() < 2 || split.mode2.len() < 2 {
        return Err(Error::TooFew {
            what: "a reversal test",
            needed: 2,
            got: split.mode1.len().min(split.mode2.len()),
            unit: "directions in each polarity mode",
        });
    }
    let a: Vec<Vec3> = split.mode1.iter().map(|&i| v[i]).collect();
    let b_raw: Vec<Vec3> = split.mode2.iter().map(|&i| v[i]).collect();
    let mode2_mean = Direction::from_vector(super::resultant(&b_raw))
        .ok_or_else(|| Error::Undefined("the second polarity mode has no mean direction".into()))?;
    let b: Vec<Vec3> = b_raw.iter().map(|u| -*u).collect();
    let comparison = compare_means(&a, &b, mc, confidence)?;
    Ok(ReversalTest { split, mode2_mean, comparison })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::FisherSampler;

    fn two_modes(seed: u64, n: usize, k: f64, offset: f64) -> Vec<Vec3> {
        let normal = Direction { dec: 5.0, inc: 50.0 };
        // Moving the antipode of the normal mean up its meridian by `offset` puts it exactly
        // `offset` degrees from antipodal.
        let reversed = Direction { dec: 185.0, inc: -50.0 + offset };
        let (sn, sr) = (FisherSampler::new(normal, k).unwrap(), FisherSampler::new(reversed, k).unwrap());
        MonteCarlo::new(seed, 2 * n).run("data", 77, |r, i| if i < n { sn.sample(r) } else { sr.sample(r) })
    }

    #[test]
    fn split_finds_both_modes() {
        let v = two_modes(1, 12, 80.0, 0.0);
        let s = split_modes(&v).unwrap();
        assert_eq!(s.mode1, (0..12).collect::<Vec<_>>());
        assert_eq!(s.mode2, (12..24).collect::<Vec<_>>());
        assert!(s.axis.inc > 0.0);
    }

    #[test]
    fn antipodal_sets_pass_in_most_seeds_and_offset_sets_fail() {
        // Simulated null: exactly antipodal Fisher modes (k = 30, N = 15 each) should pass the 95 %
        // MM90 test in about 95 % of seeds. With 20 seeds (a small debug-build check) we require at
        // least 16 passes: P(≤ 15 passes | p = 0.95) ≈ 0.003 (binomial).
        let mc = MonteCarlo::new(1, 200);
        let passes = (0..20)
            .filter(|&s| reversal_test(&two_modes(100 + s, 15, 30.0, 0.0), &mc, 0.95).unwrap().comparison.passed)
            .count();
        assert!(passes >= 16, "passes = {passes}/20");
        // Modes 15° from antipodal, k = 50, N = 30 each: α95 ≈ 3.6°, so every test must fail.
        for s in 0..3 {
            let t = reversal_test(&two_modes(200 + s, 30, 50.0, 15.0), &mc, 0.95).unwrap();
            let c = &t.comparison;
            assert!(!c.passed && !c.watson.passed && !c.bootstrap.passed, "seed {s}: {c:?}");
            assert_eq!(c.mm90.class.name(), "negative");
        }
    }

    /// The rate check at full size (run with `cargo test -- --ignored`): 400 seeds of exactly antipodal
    /// modes (k = 30, N = 15 each). The 95 % test should pass about 95 % of the time; with 400 seeds
    /// the binomial standard error is 1.1 %, so [0.92, 0.98] is a ±2.7σ band.
    #[test]
    #[ignore]
    fn antipodal_pass_rate_over_400_seeds() {
        let mc = MonteCarlo::new(1, 200);
        let mut counts = [0usize; 3];
        for s in 0..400 {
            let c = reversal_test(&two_modes(1000 + s, 15, 30.0, 0.0), &mc, 0.95).unwrap().comparison;
            counts[0] += c.passed as usize;
            counts[1] += c.watson.passed as usize;
            counts[2] += c.bootstrap.passed as usize;
        }
        let rate = counts.map(|c| c as f64 / 400.0);
        println!("pass rates (MM90, V_w, bootstrap): {rate:?}");
        assert!((0.92..=0.98).contains(&rate[0]), "{rate:?}");
    }

    #[test]
    fn one_mode_is_an_error() {
        let v: Vec<Vec3> = two_modes(3, 10, 50.0, 0.0).into_iter().take(10).collect();
        assert!(matches!(reversal_test(&v, &MonteCarlo::new(1, 100), 0.95), Err(Error::TooFew { .. })));
    }
}
