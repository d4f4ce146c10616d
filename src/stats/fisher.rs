//! Fisher (1953) statistics of a set of directions.

use crate::error::{check_range, Error, Result};
use crate::sphere::{Direction, Vec3};
use crate::tolerance;

/// Precision parameter estimate, which may be infinite (all directions identical).
///
/// Serialised as a JSON number, or the string `"inf"` when infinite.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Precision(pub f64);

impl Precision {
    /// True when k is infinite (N − R = 0).
    pub fn is_infinite(self) -> bool {
        self.0.is_infinite()
    }
}

impl serde::Serialize for Precision {
    fn serialize<S: serde::Serializer>(&self, s: S) -> std::result::Result<S::Ok, S::Error> {
        if self.0.is_finite() {
            s.serialize_f64(self.0)
        } else {
            s.serialize_str("inf")
        }
    }
}

/// Fisher statistics of a set of unit vectors.
///
/// `k`, `a95` and `theta63` are `None` for N = 1: one direction says nothing about dispersion.
/// `a95` is also `None` when the cone is undefined (the formula's cosine falls below −1, which happens
/// for very scattered sets, R → 0). `mean` is `None` when R ≈ 0 (antipodal or isotropic sets).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct FisherStats {
    /// Number of directions, N.
    pub n: usize,
    /// Mean direction, or `None` when the resultant vanishes.
    pub mean: Option<Direction>,
    /// Length of the resultant vector, R (0 ≤ R ≤ N).
    pub r: f64,
    /// Best estimate of the precision parameter, k = (N − 1)/(N − R); infinite for identical directions.
    pub k: Option<Precision>,
    /// Semi-angle of the confidence cone at the requested level, degrees.
    pub alpha: Option<f64>,
    /// The confidence level used for `alpha` (0.95 gives α95).
    pub confidence: f64,
    /// Angular standard deviation estimate θ63 = 81/√k, degrees (0 when k is infinite).
    pub theta63: Option<f64>,
}

/// Half-angle of the Fisher confidence cone.
///
/// # Units
/// Returns degrees. `confidence` is a probability in (0, 1), e.g. 0.95.
///
/// # Formula
/// cos α = 1 − ((N − R)/R) · ((1/p)^(1/(N−1)) − 1), with p = 1 − confidence (Fisher 1953, eq. 7.7).
/// Returns `None` when N < 2, R ≤ 0, or the right-hand side falls below −1 (no cone).
///
/// # References
/// Fisher, R. A. (1953), Dispersion on a sphere, *Proc. R. Soc. Lond. A* 217, 295–305.
pub fn confidence_cone(n: usize, r: f64, confidence: f64) -> Option<f64> {
    if n < 2 || r <= 0.0 || !(confidence > 0.0 && confidence < 1.0) {
        return None;
    }
    let nf = n as f64;
    let p = 1.0 - confidence;
    let nr = (nf - r).max(0.0);
    let c = 1.0 - (nr / r) * ((1.0 / p).powf(1.0 / (nf - 1.0)) - 1.0);
    if c < -1.0 {
        None
    } else {
        Some(c.min(1.0).acos().to_degrees())
    }
}

/// Fisher statistics of the given directions.
///
/// # Formula
/// R = |Σ uᵢ|, mean = Σ uᵢ / R, k = (N − 1)/(N − R), α from [`confidence_cone`], θ63 = 81/√k.
///
/// # References
/// Fisher (1953); Butler (1992), §6.2; θ63 ≈ 81/√k: Butler (1992), eq. 6.16.
pub fn fisher_mean(directions: &[Direction], confidence: f64) -> Result<FisherStats> {
    fisher_from_vectors(directions.iter().map(|d| d.to_vector()), confidence)
}

/// As [`fisher_mean`], from unit vectors (avoids the trigonometry when vectors are at hand).
pub fn fisher_from_vectors(vectors: impl IntoIterator<Item = Vec3>, confidence: f64) -> Result<FisherStats> {
    let mut acc = FisherAccumulator::default();
    for v in vectors {
        acc.push(v);
    }
    acc.finish(confidence)
}

/// A streaming accumulator of unit vectors for Fisher statistics (constant memory).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct FisherAccumulator {
    /// Vector sum so far.
    pub sum: Vec3,
    /// Count so far.
    pub n: usize,
}

impl FisherAccumulator {
    /// Add one unit vector.
    pub fn push(&mut self, v: Vec3) {
        self.sum += v;
        self.n += 1;
    }
    /// Merge another accumulator (for parallel reduction).
    pub fn merge(&mut self, o: &FisherAccumulator) {
        self.sum += o.sum;
        self.n += o.n;
    }
    /// Fisher statistics of what was pushed.
    pub fn finish(&self, confidence: f64) -> Result<FisherStats> {
        check_range("confidence", confidence, 1e-12, 1.0 - 1e-12, "(0, 1)")?;
        let n = self.n;
        if n == 0 {
            return Err(Error::TooFew { what: "a Fisher mean", needed: 1, got: 0, unit: "directions" });
        }
        let nf = n as f64;
        let r = self.sum.norm().min(nf);
        let mean = if r > tolerance::RESULTANT_FRACTION * nf { Direction::from_vector(self.sum) } else { None };
        if n == 1 {
            return Ok(FisherStats { n, mean, r, k: None, alpha: None, confidence, theta63: None });
        }
        let nr = nf - r;
        let k = if nr <= tolerance::IDENTICAL * nf { f64::INFINITY } else { (nf - 1.0) / nr };
        let alpha = if k.is_infinite() { Some(0.0) } else { confidence_cone(n, r, confidence) };
        let theta63 = if k.is_infinite() { 0.0 } else { 81.0 / k.sqrt() };
        Ok(FisherStats { n, mean, r, k: Some(Precision(k)), alpha, confidence, theta63: Some(theta63) })
    }
}
