//! VGP scatter S_B: the angular standard deviation of VGPs about their mean pole, corrected for the
//! within-site scatter, with the cutoffs in common use and a seeded bootstrap interval.

use super::paleopole::paleopole;
use super::scatter_stage::MIN_SCATTER_RESAMPLES;
use crate::error::{check_range, Error, Result};
use crate::montecarlo::{quantile_sorted, MonteCarlo};
use crate::sphere::{angle_between, GeoPoint};
use rand::RngExt;

/// Which VGPs are kept before computing the scatter.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
#[serde(rename_all = "lowercase", tag = "kind", content = "angle")]
pub enum Cutoff {
    /// Keep every VGP.
    None,
    /// Remove VGPs farther than this angle (degrees) from the mean pole, recomputing the mean until
    /// nothing more is removed.
    Fixed(f64),
    /// Vandamme (1994): remove the farthest VGP while it lies beyond A = 1.8 S + 5°, recomputing S and
    /// the mean pole each time.
    Vandamme,
}

impl Cutoff {
    /// Parse a cutoff name: `none`, `vandamme`, or an angle in (0, 180] degrees (e.g. `45`); any case,
    /// surrounding blanks ignored. `None` when the text is none of these.
    pub fn parse(s: &str) -> Option<Cutoff> {
        match s.trim().to_lowercase().as_str() {
            "none" => Some(Cutoff::None),
            "vandamme" => Some(Cutoff::Vandamme),
            other => match other.parse::<f64>() {
                Ok(a) if a > 0.0 && a <= 180.0 => Some(Cutoff::Fixed(a)),
                _ => None,
            },
        }
    }

    /// The cutoff's name as reports give it: `none`, `vandamme`, or the angle (e.g. `45`).
    pub fn name(&self) -> String {
        match self {
            Cutoff::None => "none".to_string(),
            Cutoff::Fixed(x) => format!("{x}"),
            Cutoff::Vandamme => "vandamme".to_string(),
        }
    }
}

/// Within-site dispersion of one site, transferred to VGP space.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct WithinSite {
    /// Number of directions in the site mean.
    pub n: usize,
    /// Within-site angular standard deviation of the VGPs, S_w = 81/√K_w, degrees.
    pub sw: f64,
}

impl WithinSite {
    /// The within-site term of a site of `n` directions with precision `k` (or, where k is not
    /// given, the k implied by its α95), its VGP at paleolatitude `paleolat_deg`: the one rule that
    /// `poles`, `psv`, `section` and the Python package share. `None` (no correction for this site)
    /// when n is unknown or below 2, or when neither k nor α95 is known. An infinite k (identical
    /// directions) gives S_w = 0.
    ///
    /// # Errors
    /// An α95 outside (0°, 180°).
    pub fn from_site(n: Option<usize>, k: Option<f64>, a95: Option<f64>, paleolat_deg: f64) -> Result<Option<Self>> {
        let Some(n) = n.filter(|&n| n >= 2) else { return Ok(None) };
        let k = match (k, a95) {
            (Some(k), _) => k,
            (None, Some(a)) => precision_from_a95(n, a)?,
            (None, None) => return Ok(None),
        };
        Ok(Some(WithinSite { n, sw: within_site_sw(k, paleolat_deg) }))
    }
}

/// One site's contribution to the scatter.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ScatterSite {
    /// The VGP (already mapped to one polarity).
    pub pole: GeoPoint,
    /// Within-site dispersion, when the site carries n and k (or α95).
    pub within: Option<WithinSite>,
}

/// The scatter of a set of VGPs.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Scatter {
    /// The cutoff used.
    pub cutoff: Cutoff,
    /// S_B, degrees: the between-site scatter after the within-site correction (or S_T when no correction
    /// applies). `None` when the correction exceeds the total (S_T² < within term).
    pub s: Option<f64>,
    /// S_T, the uncorrected angular standard deviation, degrees.
    pub s_total: f64,
    /// The within-site term (1/N) Σ S_wᵢ²/nᵢ, degrees²; `None` when some kept site lacks n and k.
    pub within_term: Option<f64>,
    /// Mean pole of the kept VGPs.
    pub mean_pole: GeoPoint,
    /// For each input site: kept (true) or removed by the cutoff.
    pub kept: Vec<bool>,
    /// Angle of each VGP from the final mean pole, degrees.
    pub distance: Vec<f64>,
    /// VGPs used.
    pub n_used: usize,
    /// VGPs removed by the cutoff.
    pub n_removed: usize,
    /// Final cutoff angle, degrees (the fixed angle, or Vandamme's A at the last iteration).
    pub threshold: Option<f64>,
}

/// Precision k of a site mean from its α95 and N, by inverting Fisher's cone formula.
///
/// # Formula
/// cos α95 = 1 − ((N − R)/R)(20^{1/(N−1)} − 1) ⇒ R = N / (1 + (1 − cos α95)/(20^{1/(N−1)} − 1)),
/// then k = (N − 1)/(N − R).
///
/// # References
/// Fisher (1953); Butler (1992), eq. 6.21.
pub fn precision_from_a95(n: usize, a95_deg: f64) -> Result<f64> {
    if n < 2 {
        return Err(Error::TooFew { what: "k from a95", needed: 2, got: n, unit: "directions" });
    }
    check_range("a95", a95_deg, 0.0, 180.0, "[0, 180]")?;
    let nf = n as f64;
    let c = 20f64.powf(1.0 / (nf - 1.0)) - 1.0;
    let r = nf / (1.0 + (1.0 - a95_deg.to_radians().cos()) / c);
    Ok(if nf - r <= 0.0 { f64::INFINITY } else { (nf - 1.0) / (nf - r) })
}

/// Within-site VGP dispersion S_w from the direction precision k at paleolatitude λ.
///
/// # Formula
/// K_w = 8k / (5 + 18 sin² λ + 9 sin⁴ λ) (Cox 1970), S_w = 81/√K_w. The factor is the mean of the
/// squared dp and dm transfer factors, ((1 + 3 sin² λ)²/4 + (1 + 3 sin² λ))/2.
///
/// # References
/// Cox (1970), *Geophys. J. R. astr. Soc.* 20, 253–269; McElhinny & McFadden (1997), *Geophys. J. Int.*
/// 131, 240–252.
pub fn within_site_sw(k: f64, paleolat_deg: f64) -> f64 {
    if k.is_infinite() {
        return 0.0;
    }
    let s2 = paleolat_deg.to_radians().sin().powi(2);
    let kw = 8.0 * k / (5.0 + 18.0 * s2 + 9.0 * s2 * s2);
    81.0 / kw.sqrt()
}

/// S_T and S_B of a set of VGPs about their mean pole (no cutoff).
struct Plain {
    mean: GeoPoint,
    dist: Vec<f64>,
    s_total: f64,
}

fn plain(poles: &[GeoPoint]) -> Result<Plain> {
    let mean = paleopole(poles)?.pole;
    let m = mean.to_vector();
    let dist: Vec<f64> = poles.iter().map(|p| angle_between(m, p.to_vector())).collect();
    let ss: f64 = dist.iter().map(|d| d * d).sum();
    Ok(Plain { mean, dist, s_total: (ss / (poles.len() as f64 - 1.0)).sqrt() })
}

/// The within-site term (1/N) Σ S_wᵢ²/nᵢ, or `None` when any site lacks it.
fn within_term(sites: &[&ScatterSite]) -> Option<f64> {
    let mut sum = 0.0;
    for s in sites {
        let w = s.within?;
        sum += w.sw * w.sw / w.n as f64;
    }
    Some(sum / sites.len() as f64)
}

fn corrected(s_total: f64, within: Option<f64>) -> Option<f64> {
    let v = s_total * s_total - within.unwrap_or(0.0);
    (v >= 0.0).then(|| v.sqrt())
}

/// The VGP scatter S_B with the chosen cutoff.
///
/// # Formula
/// S_T² = (1/(N − 1)) Σ Δᵢ², Δᵢ the angle of VGP i from the mean pole; S_B² = S_T² − (1/N) Σ S_wᵢ²/nᵢ
/// (the correction applies only when every kept site has n and S_w). Vandamme's cutoff: A = 1.8 S_T + 5°.
///
/// # Errors
/// `TooFew` when fewer than two VGPs are given or remain after the cutoff.
///
/// # References
/// McElhinny & McFadden (1997), *Geophys. J. Int.* 131, 240–252 (S_B and the within-site correction);
/// Vandamme (1994), *Phys. Earth Planet. Inter.* 85, 131–142 (variable cutoff); Johnson et al. (2008),
/// *G-cubed* 9, Q04032 (the fixed 45° cutoff).
pub fn vgp_scatter(sites: &[ScatterSite], cutoff: Cutoff) -> Result<Scatter> {
    if let Cutoff::Fixed(a) = cutoff {
        check_range("cutoff angle", a, 0.0, 180.0, "[0, 180]")?;
    }
    let mut kept = vec![true; sites.len()];
    let mut threshold = None;
    let too_few = |got| Error::TooFew { what: "VGP scatter after the cutoff", needed: 2, got, unit: "sites" };
    let fit = loop {
        let idx: Vec<usize> = (0..sites.len()).filter(|&i| kept[i]).collect();
        if idx.len() < 2 {
            return Err(too_few(idx.len()));
        }
        let poles: Vec<GeoPoint> = idx.iter().map(|&i| sites[i].pole).collect();
        let f = plain(&poles)?;
        match cutoff {
            Cutoff::None => break f,
            Cutoff::Fixed(a) => {
                threshold = Some(a);
                let m = f.mean.to_vector();
                let mut removed = false;
                for &i in &idx {
                    if angle_between(m, sites[i].pole.to_vector()) > a {
                        kept[i] = false;
                        removed = true;
                    }
                }
                if !removed {
                    break f;
                }
            }
            Cutoff::Vandamme => {
                let a = 1.8 * f.s_total + 5.0;
                threshold = Some(a);
                let (j, dmax) =
                    f.dist.iter().enumerate().fold((0, f64::MIN), |b, (j, &d)| if d > b.1 { (j, d) } else { b });
                if dmax > a {
                    kept[idx[j]] = false;
                } else {
                    break f;
                }
            }
        }
    };
    let used: Vec<&ScatterSite> = sites.iter().zip(&kept).filter(|(_, k)| **k).map(|(s, _)| s).collect();
    let wt = within_term(&used);
    let m = fit.mean.to_vector();
    let n_used = used.len();
    Ok(Scatter {
        cutoff,
        s: corrected(fit.s_total, wt),
        s_total: fit.s_total,
        within_term: wt,
        mean_pole: fit.mean,
        distance: sites.iter().map(|s| angle_between(m, s.pole.to_vector())).collect(),
        kept,
        n_used,
        n_removed: sites.len() - n_used,
        threshold,
    })
}

/// A bootstrap percentile interval for S_B.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ScatterInterval {
    /// Lower bound (2.5 % quantile), degrees.
    pub low: f64,
    /// Upper bound (97.5 % quantile), degrees.
    pub high: f64,
    /// Resamples drawn.
    pub resamples: usize,
    /// Resamples whose within-site term exceeded S_T² (counted as S_B = 0).
    pub n_negative: usize,
}

/// Refuse a bootstrap of fewer than [`MIN_SCATTER_RESAMPLES`] resamples.
pub(super) fn check_resamples(mc: &MonteCarlo<'_>) -> Result<()> {
    if mc.resamples < MIN_SCATTER_RESAMPLES {
        return Err(Error::invalid(
            "resamples",
            mc.resamples,
            format!("a bootstrap needs at least {MIN_SCATTER_RESAMPLES} resamples, got {}", mc.resamples),
        ));
    }
    Ok(())
}

/// Seeded bootstrap interval for S_B over the kept sites: resample sites with replacement, recompute the
/// mean pole, S_T and the within-site term (the cutoff is not re-applied).
///
/// # References
/// Efron & Tibshirani (1993), *An Introduction to the Bootstrap*, ch. 13 (percentile interval);
/// McElhinny & McFadden (1997) for S_B.
pub fn bootstrap_scatter(kept: &[ScatterSite], confidence: f64, mc: &MonteCarlo<'_>) -> Result<ScatterInterval> {
    check_range("confidence", confidence, 1e-6, 1.0 - 1e-6, "(0, 1)")?;
    let n = kept.len();
    if n < 2 {
        return Err(Error::TooFew { what: "a bootstrap of the VGP scatter", needed: 2, got: n, unit: "sites" });
    }
    check_resamples(mc)?;
    let draws: Vec<Option<f64>> = mc.run("VGP scatter bootstrap", 0x5B_5CA7, |rng, _| {
        let pick: Vec<&ScatterSite> = (0..n).map(|_| &kept[rng.random_range(0..n)]).collect();
        let poles: Vec<GeoPoint> = pick.iter().map(|s| s.pole).collect();
        let f = plain(&poles).ok()?;
        let s2 = f.s_total * f.s_total - within_term(&pick).unwrap_or(0.0);
        Some(s2)
    });
    let mut vals: Vec<f64> = draws.iter().flatten().map(|s2| s2.max(0.0).sqrt()).collect();
    if vals.len() < 10 {
        return Err(Error::Undefined("the bootstrap resamples have no mean pole".into()));
    }
    let n_negative = draws.iter().flatten().filter(|s2| **s2 < 0.0).count();
    vals.sort_by(|a, b| a.total_cmp(b));
    let tail = (1.0 - confidence) / 2.0;
    Ok(ScatterInterval {
        low: quantile_sorted(&vals, tail),
        high: quantile_sorted(&vals, 1.0 - tail),
        resamples: mc.resamples,
        n_negative,
    })
}
