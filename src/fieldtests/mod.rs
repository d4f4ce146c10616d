//! Field tests of paleomagnetic directions: reversal, common mean, fold and randomness tests.
//!
//! Every random part runs on the shared [`crate::montecarlo`] engine, so a result depends only on the
//! data, the seed and the number of resamples — never on the number of threads.
//!
//! These tests are statistical statements about models of the data (Fisher distributions, bootstrap
//! resampling); whether a magnetization is primary is decided by the geologist, with local practice
//! and the published literature.

mod bootstrap_means;
mod common_mean;
mod fold;
mod randomness;
mod reversal;
mod untilt_curves;
mod watson_v;

pub use bootstrap_means::{bootstrap_overlap, BootstrapOverlap, ComponentBounds};
pub use common_mean::{
    compare_means, mm90_critical_angle, mm90_test, watson_critical_angle, MeanComparison, Mm90, Mm90Class,
};
pub use fold::{bedding_spread, fold_test, precision_ratio, FoldOptions, FoldTest, FoldVerdict, PrecisionRatio};
pub use randomness::{isotropic_resultant_cdf, randomness_test, watson_r0, R0Route, RandomnessTest};
pub use reversal::{reversal_test, split_modes, PolaritySplit, ReversalTest};
pub use untilt_curves::{largest_eigenvalue, largest_eigenvalues};
pub use watson_v::{watson_v, watson_v_statistic, WatsonV};

/// Monte Carlo stream numbers, so that the parts of one test draw independent random numbers.
pub(crate) mod streams {
    /// Bootstrap of the two mode means.
    pub const BOOTSTRAP: u64 = 0x4654_0001;
    /// Simulation of Watson's V_w under the null hypothesis.
    pub const WATSON_V: u64 = 0x4654_0002;
    /// Bootstrap of the fold test.
    pub const FOLD: u64 = 0x4654_0003;
}

/// Largest usable precision: a set of identical directions has k = ∞; the statistics that weight by
/// k use this value instead, so that they stay finite.
pub const K_CAP: f64 = 1e8;

/// Fisher's precision estimate k = (N − 1)/(N − R), capped at [`K_CAP`].
pub(crate) fn capped_k(n: usize, r: f64) -> f64 {
    let nf = n as f64;
    let nr = (nf - r).max(0.0);
    if nr <= 0.0 {
        K_CAP
    } else {
        ((nf - 1.0) / nr).min(K_CAP)
    }
}

/// Guards shared by the two-set Monte Carlo comparisons: a confidence in (0, 1), at least two
/// directions per set, at least 20 resamples.
pub(crate) fn check_two_sets(
    what: &'static str,
    a: &[crate::sphere::Vec3],
    b: &[crate::sphere::Vec3],
    resamples: usize,
    confidence: f64,
) -> crate::error::Result<()> {
    use crate::error::Error;
    crate::error::check_range("confidence", confidence, 1e-12, 1.0 - 1e-12, "(0, 1)")?;
    if a.len() < 2 || b.len() < 2 {
        return Err(Error::TooFew { what, needed: 2, got: a.len().min(b.len()), unit: "directions in each set" });
    }
    if resamples < 20 {
        return Err(Error::TooFew { what, needed: 20, got: resamples, unit: "resamples" });
    }
    Ok(())
}

/// Sum of vectors.
pub(crate) fn resultant(v: &[crate::sphere::Vec3]) -> crate::sphere::Vec3 {
    v.iter().fold(crate::sphere::Vec3::ZERO, |a, b| a + *b)
}
