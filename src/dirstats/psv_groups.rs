//! From a sites table with a group column to the groups of the latitude model: the steps `psv` takes,
//! in one place so that the command line and the Python package agree.

use super::psv_model::{
    fit_latitude_model, group_paleolatitude, latitude_model_bootstrap, LatitudeFit, LatitudeGroup,
    LatitudeModelInterval,
};
use crate::error::{Error, Result};
use crate::montecarlo::MonteCarlo;
use crate::poles::{align_polarity, vgp, vgp_scatter, Cutoff, ScatterSite, WithinSite};
use crate::sphere::GeoPoint;
use crate::table::{read_sites, Table};

/// Fewest sites a group needs (before and after the cutoff) to enter the model.
pub const MIN_GROUP_SITES: usize = 3;

/// What happened to a group on the way to the model (besides entering it normally).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case", tag = "remark", content = "sites")]
pub enum GroupRemark {
    /// Left out: fewer than [`MIN_GROUP_SITES`] sites in the table.
    TooFewSites(usize),
    /// Left out: fewer than [`MIN_GROUP_SITES`] sites kept by the cutoff.
    TooFewKept(usize),
    /// Kept, with S taken as 0: the within-site term exceeds the total scatter.
    WithinExceedsTotal,
}

/// The groups of a sites table, ready for the latitude model.
#[derive(Debug, Clone, PartialEq)]
pub struct PsvGroups {
    /// The groups that enter the model, in order of first appearance.
    pub groups: Vec<LatitudeGroup>,
    /// Sites used by each group's scatter (after the cutoff).
    pub n_used: Vec<usize>,
    /// Whether each group's scatter was corrected for the within-site term.
    pub within_corrected: Vec<bool>,
    /// Remarks on groups, in group order (groups left out, S taken as 0).
    pub remarks: Vec<(String, GroupRemark)>,
    /// VGPs mapped to their antipodes by the per-group polarity alignment.
    pub flipped: usize,
}

/// Group the sites of `table` by column `by`, align each group's VGPs to one polarity by their
/// principal axis, apply `cutoff`, and compute each group's S_B and paleolatitude.
///
/// # Errors
/// A missing column, an empty group name, or fewer than 2 groups left for the model.
pub fn psv_groups(table: &Table, by: &str, cutoff: Cutoff) -> Result<PsvGroups> {
    let set = read_sites(table)?;
    let col = table.require(by)?;
    let mut gathered: Vec<(String, Vec<ScatterSite>, Vec<GeoPoint>)> = Vec::new();
    for (row, r) in table.rows.iter().zip(&set.records) {
        let name = table.text(row, col).trim().to_string();
        if name.is_empty() {
            return Err(crate::error::TableError::value(
                table.name.as_str(),
                r.line,
                Some(by),
                "is empty; expected a group name",
            )
            .into());
        }
        let v = vgp(r.location, r.direction);
        let site = ScatterSite { pole: v.pole, within: WithinSite::from_site(r.n, r.k, r.a95, v.paleolat)? };
        let at = match gathered.iter().position(|g| g.0 == name) {
            Some(i) => i,
            None => {
                gathered.push((name, Vec::new(), Vec::new()));
                gathered.len() - 1
            }
        };
        gathered[at].1.push(site);
        gathered[at].2.push(r.location);
    }
    let mut out = PsvGroups {
        groups: Vec::new(),
        n_used: Vec::new(),
        within_corrected: Vec::new(),
        remarks: Vec::new(),
        flipped: 0,
    };
    for (name, mut sites, locations) in gathered {
        // Polarity aligned per group by the principal axis of its VGPs (not by hemisphere, which splits
        // a group whose mean pole lies at low latitude).
        let a = align_polarity(&sites.iter().map(|s| s.pole).collect::<Vec<_>>())?;
        for (s, (p, f)) in sites.iter_mut().zip(a.poles.into_iter().zip(a.flipped)) {
            s.pole = p;
            out.flipped += usize::from(f);
        }
        if sites.len() < MIN_GROUP_SITES {
            out.remarks.push((name, GroupRemark::TooFewSites(sites.len())));
            continue;
        }
        let sc = vgp_scatter(&sites, cutoff)?;
        let kept: Vec<ScatterSite> = sites.iter().zip(&sc.kept).filter(|p| *p.1).map(|p| *p.0).collect();
        let locs: Vec<GeoPoint> = locations.iter().zip(&sc.kept).filter(|p| *p.1).map(|p| *p.0).collect();
        if kept.len() < MIN_GROUP_SITES {
            out.remarks.push((name, GroupRemark::TooFewKept(kept.len())));
            continue;
        }
        if sc.s.is_none() {
            out.remarks.push((name.clone(), GroupRemark::WithinExceedsTotal));
        }
        let paleolat = group_paleolatitude(&locs, sc.mean_pole)?;
        out.n_used.push(sc.n_used);
        out.within_corrected.push(sc.within_term.is_some());
        out.groups.push(LatitudeGroup { name, paleolat, sites: kept, s: sc.s.unwrap_or(0.0) });
    }
    if out.groups.len() < 2 {
        return Err(Error::invalid(
            "groups",
            out.groups.len(),
            format!(
                "{}: the latitude model needs at least 2 groups of 3 or more sites (column '{by}'), got {}",
                table.name,
                out.groups.len()
            ),
        ));
    }
    Ok(out)
}

/// The latitude model S(λ)² = a² + (bλ)² fitted to the groups, with its bootstrap intervals (at least
/// 20 pseudo-samples: fewer are raised to 20).
pub fn psv_model(g: &PsvGroups, mc: &MonteCarlo<'_>) -> Result<(LatitudeFit, LatitudeModelInterval)> {
    let fit = fit_latitude_model(&g.groups.iter().map(|x| (x.paleolat, x.s)).collect::<Vec<_>>())?;
    let mc = MonteCarlo { resamples: mc.resamples.max(20), ..*mc };
    Ok((fit, latitude_model_bootstrap(&g.groups, &mc)?))
}
