//! The latitude dependence of VGP scatter: S(λ)² = a² + (bλ)², fitted with a bootstrap.

use crate::error::{Error, Result};
use crate::montecarlo::{quantiles_select, MonteCarlo, UniformIndex};
use crate::poles::{paleopole, vgp_scatter, Cutoff, ScatterSite};
use crate::sphere::{angle_between, GeoPoint, Vec3};

/// One group of sites (a study, an age bin) at one paleolatitude.
#[derive(Debug, Clone, PartialEq)]
pub struct LatitudeGroup {
    /// Group name.
    pub name: String,
    /// Paleolatitude of the group, degrees (its absolute value enters the model).
    pub paleolat: f64,
    /// The sites' polarity-aligned VGPs and within-site dispersions (the ones kept by a cutoff).
    pub sites: Vec<ScatterSite>,
    /// The group's scatter S_B, degrees (0 when the within-site term exceeds the total).
    pub s: f64,
}

/// The fitted latitude model.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LatitudeFit {
    /// a, degrees: the scatter at the equator.
    pub a: f64,
    /// b, dimensionless: the growth of the scatter with latitude (λ in degrees).
    pub b: f64,
    /// Root-mean-square misfit of S, degrees.
    pub rms: f64,
    /// Groups fitted.
    pub n_groups: usize,
}

impl LatitudeFit {
    /// S(λ) = √(a² + (bλ)²), degrees, λ in degrees (either sign).
    pub fn s_at(&self, lat_deg: f64) -> f64 {
        (self.a * self.a + (self.b * lat_deg).powi(2)).sqrt()
    }
}

/// Paleolatitude of a group from its mean site location and its mean pole: 90° minus their angle.
pub fn group_paleolatitude(sites: &[GeoPoint], pole: GeoPoint) -> Result<f64> {
    let sum = sites.iter().fold(Vec3::ZERO, |s, p| s + p.to_vector());
    let centre = sum.normalized().ok_or_else(|| Error::Undefined("the sites have no mean location".into()))?;
    Ok(90.0 - angle_between(centre, pole.to_vector()))
}

/// Least-squares fit of S(λ)² = a² + (bλ)² to (λ, S) pairs.
///
/// # Units
/// λ and S in degrees; a in degrees, b dimensionless.
///
/// # Formula
/// Ordinary least squares of y = S² on x = λ²: B = Σ(x − x̄)(y − ȳ)/Σ(x − x̄)², A = ȳ − B x̄, with the
/// constraints A, B ≥ 0 (B = 0, A = ȳ when B < 0; A = 0, B = Σxy/Σx² when A < 0); a = √A, b = √B.
///
/// # Errors
/// `TooFew` unless at least two groups lie at different |λ|.
///
/// # References
/// McFadden, P. L., Merrill, R. T. & McElhinny, M. W. (1988), Dipole/quadrupole family modeling of
/// paleosecular variation, *J. Geophys. Res.* 93, 11583–11588; McFadden, P. L., Merrill, R. T.,
/// McElhinny, M. W. & Lee, S. (1991), Reversals of the Earth's magnetic field and temporal variations
/// of the dynamo families, *J. Geophys. Res.* 96, 3923–3933 (model G, S² = a² + (bλ)²).
pub fn fit_latitude_model(points: &[(f64, f64)]) -> Result<LatitudeFit> {
    let pts: Vec<(f64, f64)> = points.iter().map(|&(l, s)| (l * l, s * s)).collect();
    let n = pts.len() as f64;
    let distinct = pts.iter().any(|p| (p.0 - pts[0].0).abs() > 1e-9);
    if pts.len() < 2 || !distinct {
        return Err(Error::TooFew {
            what: "the latitude model fit",
            needed: 2,
            got: if distinct { pts.len() } else { pts.len().min(1) },
            unit: "groups at different paleolatitudes",
        });
    }
    let (xm, ym) = (pts.iter().map(|p| p.0).sum::<f64>() / n, pts.iter().map(|p| p.1).sum::<f64>() / n);
    let sxx: f64 = pts.iter().map(|p| (p.0 - xm).powi(2)).sum();
    let sxy: f64 = pts.iter().map(|p| (p.0 - xm) * (p.1 - ym)).sum();
    let mut big_b = sxy / sxx;
    let mut big_a = ym - big_b * xm;
    if big_b < 0.0 {
        big_b = 0.0;
        big_a = ym;
    } else if big_a < 0.0 {
        big_a = 0.0;
        big_b = pts.iter().map(|p| p.0 * p.1).sum::<f64>() / pts.iter().map(|p| p.0 * p.0).sum::<f64>();
    }
    let fit = LatitudeFit { a: big_a.sqrt(), b: big_b.sqrt(), rms: 0.0, n_groups: pts.len() };
    let rms = (points.iter().map(|&(l, s)| (s - fit.s_at(l)).powi(2)).sum::<f64>() / n).sqrt();
    Ok(LatitudeFit { rms, ..fit })
}

/// Bootstrap intervals of the latitude model and of each group's scatter.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct LatitudeModelInterval {
    /// 2.5 % and 97.5 % quantiles of a.
    pub a_low: f64,
    /// See `a_low`.
    pub a_high: f64,
    /// 2.5 % and 97.5 % quantiles of b.
    pub b_low: f64,
    /// See `b_low`.
    pub b_high: f64,
    /// Per group, the 2.5 % and 97.5 % quantiles of S.
    pub s_bounds: Vec<(f64, f64)>,
    /// The band of the curve: (λ, 2.5 %, 97.5 % quantiles of S(λ)) for λ = 0, 1, …, 90°.
    pub band: Vec<(f64, f64, f64)>,
    /// Pseudo-samples drawn.
    pub resamples: usize,
}

/// S_B of a set of sites (0 when the within-site term exceeds the total); `None` without a mean pole.
fn scatter_of(sites: &[ScatterSite]) -> Option<f64> {
    vgp_scatter(sites, Cutoff::None).ok().map(|s| s.s.unwrap_or(0.0))
}

/// Random stream of the latitude-model bootstrap.
const STREAM: u64 = 0x0009_5E1A;

/// Seeded bootstrap of the latitude model: in every pseudo-sample each group's sites are drawn with
/// replacement, its S_B recomputed (its paleolatitude kept), and the model refitted.
///
/// # Errors
/// As [`fit_latitude_model`]; `TooFew` for a group of fewer than 3 sites or fewer than 20 resamples.
///
/// # References
/// Efron & Tibshirani (1993), ch. 13 (percentile intervals); McFadden et al. (1988, 1991).
pub fn latitude_model_bootstrap(groups: &[LatitudeGroup], mc: &MonteCarlo<'_>) -> Result<LatitudeModelInterval> {
    if mc.resamples < 20 {
        return Err(Error::TooFew {
            what: "the latitude-model bootstrap",
            needed: 20,
            got: mc.resamples,
            unit: "resamples",
        });
    }
    if let Some(g) = groups.iter().find(|g| g.sites.len() < 3) {
        return Err(Error::invalid(
            "group",
            &g.name,
            format!(
                "group '{}' has {} site(s) after the cutoff; the VGP scatter of a group needs at least 3",
                g.name,
                g.sites.len()
            ),
        ));
    }
    fit_latitude_model(&groups.iter().map(|g| (g.paleolat, g.s)).collect::<Vec<_>>())?;
    let draws: Vec<Option<(Vec<f64>, LatitudeFit)>> = mc.run("latitude model bootstrap", STREAM, |rng, _| {
        let mut s = Vec::with_capacity(groups.len());
        for g in groups {
            let pick = UniformIndex::new(g.sites.len())?;
            let mut idx = vec![0u32; g.sites.len()];
            pick.fill(rng, &mut idx);
            let sample: Vec<ScatterSite> = idx.iter().map(|&i| g.sites[i as usize]).collect();
            s.push(scatter_of(&sample)?);
        }
        let pts: Vec<(f64, f64)> = groups.iter().zip(&s).map(|(g, &s)| (g.paleolat, s)).collect();
        Some((s, fit_latitude_model(&pts).ok()?))
    });
    let ok: Vec<&(Vec<f64>, LatitudeFit)> = draws.iter().flatten().collect();
    if ok.len() < 20 {
        return Err(Error::Undefined("too few bootstrap pseudo-samples gave a fit".into()));
    }
    let bounds = |v: Vec<f64>| {
        let q = quantiles_select(&v, &[0.025, 0.975]);
        (q[0], q[1])
    };
    let (a_low, a_high) = bounds(ok.iter().map(|d| d.1.a).collect());
    let (b_low, b_high) = bounds(ok.iter().map(|d| d.1.b).collect());
    let s_bounds = (0..groups.len()).map(|g| bounds(ok.iter().map(|d| d.0[g]).collect())).collect();
    let band = (0..=90)
        .map(|l| {
            let (lo, hi) = bounds(ok.iter().map(|d| d.1.s_at(l as f64)).collect());
            (l as f64, lo, hi)
        })
        .collect();
    Ok(LatitudeModelInterval { a_low, a_high, b_low, b_high, s_bounds, band, resamples: mc.resamples })
}

/// The mean pole of a group's VGPs (polarity-aligned by the caller).
pub fn group_pole(sites: &[ScatterSite]) -> Result<GeoPoint> {
    Ok(paleopole(&sites.iter().map(|s| s.pole).collect::<Vec<_>>())?.pole)
}
