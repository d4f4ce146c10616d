//! Stage 2: Fisher means of each site's components in geographic and tilt-corrected coordinates;
//! the sites whose mean is usable go on to the field tests, the poles and the column.

use super::inputs::{Inputs, SiteInfo};
use super::RunLog;
use crate::demag::SpecimenFit;
use crate::error::Result;
use crate::figures::{EqualAreaPlot, NetGroup};
use crate::model::FitKind;
use crate::model::{DirectionKind, DirectionRecord, DirectionSet};
use crate::poles::vgp;
use crate::present::site_means::{site_means_sheet, SiteMeans};
use crate::section::stage::{draw, Stage};
use crate::section::tables::CsvTable;
use crate::section::Project;
use crate::sphere::{Bedding, Direction};
use crate::stats::{fisher_mean, group_means, Frame, GroupMean};
use crate::strat::{classify, ZonePolarity};
use std::collections::BTreeMap;

/// A site whose mean is used downstream, with its VGP.
#[derive(Debug, Clone)]
pub(in crate::section) struct UsedSite {
    /// Index into [`Inputs::sites`].
    pub idx: usize,
    pub geo: Direction,
    pub tilt: Direction,
    pub n: usize,
    pub k: Option<f64>,
    pub a95: Option<f64>,
    pub vgp_lat: f64,
    pub vgp_lon: f64,
    pub paleolat: f64,
    pub colat: f64,
    pub polarity: ZonePolarity,
}

/// The bedding of a site, horizontal where the sampling table gives none.
pub(in crate::section) fn bedding_or_flat(s: &SiteInfo) -> Result<Bedding> {
    match s.bedding {
        Some(b) => Ok(b),
        None => Ok(Bedding::from_dip_direction(0.0, 0.0, false)?),
    }
}

/// Site means in both frames; write the stage, the site-means table and the two nets.
///
/// # Errors
/// Only a failure to draw a figure.
pub(in crate::section) fn site_means(
    p: &Project,
    inp: &Inputs,
    fits: &[SpecimenFit],
    log: &mut RunLog,
) -> Result<Vec<UsedSite>> {
    let s = &inp.settings;
    let mut stage = Stage::new("Site means");
    let dset = direction_set(inp, fits)?;
    let by_site = |frame: Frame| -> Result<BTreeMap<String, GroupMean>> {
        if dset.records.is_empty() {
            return Ok(BTreeMap::new());
        }
        Ok(group_means(&dset, frame, s.confidence)?
            .into_iter()
            .map(|g| (g.group.clone().unwrap_or_default(), g))
            .collect())
    };
    let (geo, tilt) = (by_site(Frame::Geo)?, by_site(Frame::Tilt)?);
    stage.method = format!(
        "Fisher (1953) mean of each site's components in geographic and in tilt-corrected coordinates (bedding from {}); great circles are combined with lines after McFadden & McElhinny (1988). Cones at {} % confidence. A site is used downstream when it has a mean and its tilt-corrected α{:.0} is at most {}°; a site of one specimen is used without a cone.",
        p.sampling.name, s.confidence * 100.0, s.confidence * 100.0, s.max_site_a95);
    let mut rows = Vec::with_capacity(inp.sites.len());
    let mut used: Vec<UsedSite> = Vec::new();
    for (idx, site) in inp.sites.iter().enumerate() {
        let (Some(g), Some(t)) = (geo.get(&site.site), tilt.get(&site.site)) else {
            log.reject("site", &site.site, "site means", "no specimen with an accepted component".into());
            rows.push(SiteMeans { site: &site.site, position: site.position, means: None, used: false });
            continue;
        };
        let ok = judge_site(inp, site, g, t, log);
        rows.push(SiteMeans { site: &site.site, position: site.position, means: Some((g, t)), used: ok });
        if ok {
            used.push(used_site(inp, idx, g, t));
        }
    }
    let mt = CsvTable::from_sheet("site-means", site_means_sheet(inp.axis.column(), &rows));
    log.head.sites_used = used.len();
    stage.result = format!("{} of {} sites have a usable mean.", used.len(), inp.sites.len());
    log.table(&mut stage, mt);
    net_figures(inp, &used, &mut stage, log)?;
    log.stages.push(stage);
    Ok(used)
}

/// The fits as a direction table grouped by site, with each site's location, level and bedding.
fn direction_set(inp: &Inputs, fits: &[SpecimenFit]) -> Result<DirectionSet> {
    let mut records = Vec::with_capacity(fits.len());
    for (i, f) in fits.iter().enumerate() {
        let sp = inp.set.get(&f.specimen).expect("fitted specimen exists");
        let s = inp.site_of(sp.site.as_ref());
        records.push(DirectionRecord {
            line: i + 2,
            site: Some(s.site.clone()),
            specimen: Some(f.specimen.clone()),
            direction: f.direction,
            lat: Some(s.location.lat),
            lon: Some(s.location.lon),
            position: Some(s.position),
            bedding: Some(bedding_or_flat(s)?),
            kind: if f.kind == FitKind::Plane { DirectionKind::Plane } else { DirectionKind::Line },
            group: Some(s.site.clone()),
            path_end: if f.kind == FitKind::Plane { sp.steps.get(f.last).map(|st| st.direction) } else { None },
        });
    }
    Ok(DirectionSet { source: "components".into(), axis: Some(inp.axis), group_column: Some("site".into()), records })
}

/// Whether a site's mean is usable; a rejection with the reason when it is not.
fn judge_site(inp: &Inputs, site: &SiteInfo, g: &GroupMean, t: &GroupMean, log: &mut RunLog) -> bool {
    let s = &inp.settings;
    let why = match (t.stats.mean, g.stats.mean, &t.undefined) {
        (_, _, Some(why)) => Some(format!("no mean: {why}")),
        (None, _, _) | (_, None, _) => Some("the directions cancel out (no mean)".into()),
        _ if t.stats.alpha.is_some_and(|a| a > s.max_site_a95) => Some(format!(
            "α{:.0} = {:.1}° exceeds max_site_a95 = {}°",
            s.confidence * 100.0,
            t.stats.alpha.unwrap_or(0.0),
            s.max_site_a95
        )),
        _ => None,
    };
    match why {
        Some(why) => {
            log.reject("site", &site.site, "site means", why);
            false
        }
        None => true,
    }
}

fn k_of(m: &GroupMean) -> Option<f64> {
    m.stats.k.map(|k| k.0)
}

fn used_site(inp: &Inputs, idx: usize, g: &GroupMean, t: &GroupMean) -> UsedSite {
    let (gm, tm) = (g.stats.mean.expect("checked"), t.stats.mean.expect("checked"));
    let v = vgp(inp.sites[idx].location, tm);
    UsedSite {
        idx,
        geo: gm,
        tilt: tm,
        n: t.stats.n,
        k: k_of(t),
        a95: t.stats.alpha,
        vgp_lat: v.pole.lat,
        vgp_lon: v.pole.lon,
        paleolat: v.paleolat,
        colat: v.colatitude,
        polarity: classify(v.pole.lat, inp.settings.vgp_threshold),
    }
}

/// The site means of each polarity on an equal-area net, in both frames.
fn net_figures(inp: &Inputs, used: &[UsedSite], stage: &mut Stage, log: &mut RunLog) -> Result<()> {
    let confidence = inp.settings.confidence;
    for (frame, stem, label) in
        [(Frame::Geo, "site-means-geo", "geographic"), (Frame::Tilt, "site-means-tilt", "tilt-corrected")]
    {
        let mut groups = Vec::new();
        for (pol, name) in [
            (ZonePolarity::Normal, "normal sites"),
            (ZonePolarity::Reversed, "reversed sites"),
            (ZonePolarity::Intermediate, "intermediate sites"),
        ] {
            let pts: Vec<Direction> = used
                .iter()
                .filter(|u| u.polarity == pol)
                .map(|u| if frame == Frame::Geo { u.geo } else { u.tilt })
                .collect();
            if pts.is_empty() {
                continue;
            }
            let mean = if pts.len() >= 2 && pol != ZonePolarity::Intermediate {
                fisher_mean(&pts, confidence).ok().and_then(|s| s.mean.map(|m| (m, s.alpha)))
            } else {
                None
            };
            groups.push(NetGroup { label: name.into(), points: pts, circles: vec![], mean });
        }
        if groups.is_empty() {
            continue;
        }
        let fig = EqualAreaPlot {
            title: format!("Site means — {label} coordinates"),
            groups,
            cone_label: format!("α{:.0}", confidence * 100.0),
        };
        log.figure(stage, draw(&fig, stem, format!("Site means in {label} coordinates on a lower/upper-hemisphere equal-area net, with the Fisher mean and cone of each polarity."))?);
    }
    Ok(())
}
