//! The bootstrap confidence ellipse of a mean direction (Tauxe et al. 1991).

use super::kent::{kent_ellipse, KentEllipse};
use crate::error::{Error, Result};
use crate::montecarlo::{MonteCarlo, UniformIndex};
use crate::sphere::Vec3;
use crate::stats::FisherSampler;

/// How the pseudo-samples of a bootstrap are drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum BootstrapKind {
    /// Draw N directions with replacement from the data (non-parametric).
    Resample,
    /// Draw N directions from a Fisher distribution with the data's mean and k (parametric).
    Parametric,
}

/// Random stream of the bootstrap ellipse (separates it from other uses of the same seed).
const STREAM: u64 = 0x0E11_195E;

/// Bootstrap confidence ellipse for the mean of `vectors`.
///
/// # Formula
/// B pseudo-samples of N directions are drawn (with replacement from the data, or from a Fisher
/// distribution with the data's mean and k = (N − 1)/(N − R)); the mean of each is a unit vector, and
/// Kent's ellipse is fitted to these B means as a distribution ([`kent_ellipse`] with n = 1): its
/// semi-axes enclose the fraction `confidence` of the means under the normal approximation in the
/// tangent plane.
///
/// # Errors
/// `TooFew` for fewer than 3 directions or fewer than 20 resamples; `Undefined` when the data or the
/// bootstrap means have no mean.
///
/// # References
/// Tauxe, L., Kylstra, N. & Constable, C. (1991), Bootstrap statistics for paleomagnetic data,
/// *J. Geophys. Res.* 96, 11723–11740; Efron, B. & Tibshirani, R. J. (1993), *An Introduction to the
/// Bootstrap*, ch. 6 (parametric bootstrap); Kent (1982) for the ellipse.
pub fn bootstrap_ellipse(
    vectors: &[Vec3],
    kind: BootstrapKind,
    confidence: f64,
    mc: &MonteCarlo<'_>,
) -> Result<KentEllipse> {
    let n = vectors.len();
    if n < 3 {
        return Err(Error::TooFew { what: "a bootstrap ellipse", needed: 3, got: n, unit: "directions" });
    }
    if mc.resamples < 20 {
        return Err(Error::TooFew { what: "a bootstrap ellipse", needed: 20, got: mc.resamples, unit: "resamples" });
    }
    let stats = crate::stats::fisher_from_vectors(vectors.iter().copied(), 0.95)?;
    let mean = stats.mean.ok_or_else(|| Error::Undefined("the resultant vanishes (R ≈ 0): no mean".into()))?;
    let means: Vec<Option<Vec3>> = match kind {
        BootstrapKind::Resample => {
            let pick = UniformIndex::new(n).ok_or(Error::TooMany {
                what: "directions",
                count: n as u64,
                limit: u64::from(u32::MAX),
            })?;
            mc.run_with(
                "bootstrap ellipse",
                STREAM,
                || vec![0u32; n],
                |idx, rng, _| {
                    pick.fill(rng, idx);
                    idx.iter().fold(Vec3::ZERO, |s, &i| s + vectors[i as usize]).normalized()
                },
            )
        }
        BootstrapKind::Parametric => {
            let k = stats.k.map_or(f64::INFINITY, |k| k.0);
            if !k.is_finite() {
                // Identical directions: every pseudo-sample has the same mean.
                vec![Some(mean.to_vector()); mc.resamples]
            } else {
                let sampler = FisherSampler::new(mean, k)?;
                mc.run("parametric bootstrap ellipse", STREAM + 1, |rng, _| {
                    (0..n).fold(Vec3::ZERO, |s, _| s + sampler.sample(rng)).normalized()
                })
            }
        }
    };
    let means: Vec<Vec3> = means.into_iter().flatten().collect();
    if means.len() < 20 {
        return Err(Error::Undefined("too few bootstrap pseudo-samples have a mean direction".into()));
    }
    let mut e = kent_ellipse(&means, 1.0, confidence)?;
    e.n = n;
    Ok(e)
}
