//! From a sites table to the paleopole and the VGP scatter: the steps `poles` takes, in one place so
//! that the command line and the Python package give the same numbers.

use super::scatter_stage::{kept_or_all, missing_note};
use super::{
    align_polarity, assess_scatter, paleolatitude_range, paleopole, pole_oval, vgp, Cutoff, PaleolatitudeRange,
    Paleopole, PolarityAlignment, PoleOval, Scatter, ScatterInterval, ScatterSite, Vgp, WithinSite,
};
use crate::error::{Error, Result};
use crate::model::{SiteRecord, SiteSet};
use crate::montecarlo::MonteCarlo;
use crate::sphere::GeoPoint;
use crate::stats::confidence_cone;

/// Confidence level of the α95, the oval and the scatter interval.
const LEVEL: f64 = 0.95;

/// A site's α95: as given, else from its n and k through Fisher's cone (R = n − (n − 1)/k).
///
/// # Formula
/// cos α = 1 − ((n − R)/R)((1/p)^(1/(n−1)) − 1), p = 0.05.
///
/// # References
/// Fisher (1953), Proc. R. Soc. Lond. A 217, 295–305; Butler (1992), *Paleomagnetism*, eq. 6.21.
pub fn site_a95(r: &SiteRecord) -> Option<f64> {
    r.a95.or_else(|| match (r.n, r.k) {
        (Some(n), Some(k)) if n >= 2 => confidence_cone(n, n as f64 - (n as f64 - 1.0) / k, LEVEL),
        _ => None,
    })
}

/// One site's VGP with its confidence oval and paleolatitude range (when an α95 is known).
#[derive(Debug, Clone, PartialEq)]
pub struct SitePole {
    /// The VGP as computed (a reversed site gives a southern VGP).
    pub vgp: Vgp,
    /// The site's α95 (given, or from n and k), degrees.
    pub a95: Option<f64>,
    /// dp, dm of the VGP.
    pub oval: Option<PoleOval>,
    /// Paleolatitude range from the α95.
    pub range: Option<PaleolatitudeRange>,
    /// Within-site dispersion, when n and k (or n and α95) are given.
    pub within: Option<WithinSite>,
}

/// A site's VGP and what goes with it.
pub fn site_pole(r: &SiteRecord) -> Result<SitePole> {
    let v = vgp(r.location, r.direction);
    let a95 = site_a95(r);
    let oval = a95.map(|x| pole_oval(v.colatitude, x)).transpose()?;
    let range = a95.map(|x| paleolatitude_range(r.direction.inc, x)).transpose()?;
    let within = WithinSite::from_site(r.n, r.k, r.a95, v.paleolat)?;
    Ok(SitePole { vgp: v, a95, oval, range, within })
}

/// The paleopole and the VGP scatter of a sites table.
#[derive(Debug, Clone, PartialEq)]
pub struct PoleSummary {
    /// Each site's VGP, in table order.
    pub sites: Vec<SitePole>,
    /// Polarity alignment of the VGPs by their principal axis.
    pub alignment: PolarityAlignment,
    /// The VGPs averaged into the paleopole: as computed, or aligned when `northern`.
    pub averaged: Vec<GeoPoint>,
    /// The paleopole (Fisher mean of `averaged`); None for a single site.
    pub pole: Option<Paleopole>,
    /// The scatter of the polarity-aligned VGPs about their mean after the cutoff; None for a single site.
    pub scatter: Option<Scatter>,
    /// Bootstrap interval of S_B over the sites kept; None for a single site.
    pub interval: Option<ScatterInterval>,
    /// The cutoff asked for the scatter.
    pub cutoff: Cutoff,
    /// Why the scatter or its interval is missing although there is a paleopole (the stage
    /// [`assess_scatter`]: a cutoff that leaves fewer than two sites, for instance).
    pub scatter_failure: Option<Error>,
}

impl PoleSummary {
    /// The note that says why the scatter or its interval is missing, when one is.
    pub fn scatter_note(&self) -> Option<String> {
        missing_note(self.scatter.as_ref(), self.scatter_failure.as_ref())
    }

    /// Which sites the cutoff kept (all of them when there is no scatter, as for one site).
    pub fn kept_sites(&self) -> Vec<bool> {
        kept_or_all(self.scatter.as_ref(), self.sites.len())
    }

    /// Sites lacking the within-site terms (n and k, or n and α95).
    pub fn missing_within(&self) -> usize {
        self.sites.iter().filter(|s| s.within.is_none()).count()
    }
}

/// VGPs, paleopole and VGP scatter of a sites table.
///
/// The paleopole is the Fisher mean of every VGP (aligned to one polarity when `northern`); the
/// scatter always uses the polarity-aligned VGPs, with `cutoff` applied, corrected for the
/// within-site dispersion where n and k are known, with a bootstrap interval (`mc`, 95 %), by the
/// stage the section also runs ([`assess_scatter`]): a scatter or interval the data cannot give
/// leaves the paleopole standing, with the reason in `scatter_failure`.
///
/// # References
/// McElhinny & McFadden (1997), Geophys. J. Int. 131, 240–252 (S_B with the within-site term);
/// Vandamme (1994), Phys. Earth Planet. Inter. 85, 131–142 (the variable cutoff); Butler (1992),
/// *Paleomagnetism*, §7.1 (VGPs, dp, dm).
pub fn pole_summary(set: &SiteSet, northern: bool, cutoff: Cutoff, mc: &MonteCarlo<'_>) -> Result<PoleSummary> {
    let sites = set.records.iter().map(site_pole).collect::<Result<Vec<_>>>()?;
    let raw: Vec<GeoPoint> = sites.iter().map(|s| s.vgp.pole).collect();
    let alignment = align_polarity(&raw)?;
    let averaged = if northern { alignment.poles.clone() } else { raw };
    if sites.len() < 2 {
        return Ok(PoleSummary {
            sites,
            alignment,
            averaged,
            pole: None,
            scatter: None,
            interval: None,
            cutoff,
            scatter_failure: None,
        });
    }
    let pole = paleopole(&averaged)?;
    let scatter_sites: Vec<ScatterSite> =
        sites.iter().zip(&alignment.poles).map(|(s, p)| ScatterSite { pole: *p, within: s.within }).collect();
    let a = assess_scatter(&scatter_sites, cutoff, LEVEL, mc)?;
    Ok(PoleSummary {
        sites,
        alignment,
        averaged,
        pole: Some(pole),
        scatter: a.scatter,
        interval: a.interval,
        cutoff,
        scatter_failure: a.failure,
    })
}
