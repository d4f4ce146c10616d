//! `lodestone psv`: VGP scatter per group against paleolatitude, with S(λ)² = a² + (bλ)² fitted.

use super::{Cell, Ctx, Report, Section};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::dirstats::{
    fit_latitude_model, group_paleolatitude, latitude_model_bootstrap, LatitudeFit, LatitudeGroup,
    LatitudeModelInterval,
};
use lodestone::figures::{LatitudeFigure, LatitudePoint};
use lodestone::poles::{align_polarity, site_within, vgp, vgp_scatter, Cutoff, ScatterSite};
use lodestone::sphere::GeoPoint;
use lodestone::table::{read_sites, SiteRecord, Table};
use serde_json::json;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct PsvArgs {
    /// Sites table (CSV with site, lat, lon, dec, inc; optional n, k, a95) with a grouping column.
    pub file: PathBuf,
    /// The column that names each site's group (a study, an age bin).
    #[arg(long)]
    pub by: String,
    /// Cutoff applied within each group before its scatter: none, vandamme, or an angle such as 45.
    #[arg(long, default_value = "none")]
    pub cutoff: String,
    /// Bootstrap pseudo-samples for the intervals of S, a and b.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Write the figure of S against paleolatitude (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

/// A site's VGP (as computed; polarity is aligned per group in `gather`) and its within-site dispersion (when n and k, or n and a95, are given).
fn scatter_site(r: &SiteRecord) -> Result<ScatterSite> {
    let v = vgp(r.location, r.direction);
    Ok(ScatterSite { pole: v.pole, within: site_within(r, v.paleolat)? })
}

/// One group before the fit: its name, sites and locations in file order.
struct Gathered {
    name: String,
    sites: Vec<ScatterSite>,
    locations: Vec<GeoPoint>,
}

fn gather(file: &std::path::Path, by: &str) -> Result<(Vec<Gathered>, usize)> {
    let table = Table::read(file)?;
    let set = read_sites(&table)?;
    let col = table.require(by)?;
    let mut groups: Vec<Gathered> = Vec::new();
    let mut flipped = 0;
    for (row, r) in table.rows.iter().zip(&set.records) {
        let name = table.text(row, col).trim().to_string();
        if name.is_empty() {
            bail!("{}:{}: column '{by}': is empty; expected a group name", file.display(), r.line);
        }
        let site = scatter_site(r)?;
        let at = match groups.iter().position(|g| g.name == name) {
            Some(i) => i,
            None => {
                groups.push(Gathered { name, sites: Vec::new(), locations: Vec::new() });
                groups.len() - 1
            }
        };
        groups[at].sites.push(site);
        groups[at].locations.push(r.location);
    }
    // Polarity aligned per group by the principal axis of its VGPs (not by hemisphere, which splits a
    // group whose mean pole lies at low latitude).
    for g in &mut groups {
        let poles: Vec<GeoPoint> = g.sites.iter().map(|s| s.pole).collect();
        let a = align_polarity(&poles)?;
        for (s, (p, f)) in g.sites.iter_mut().zip(a.poles.into_iter().zip(a.flipped)) {
            s.pole = p;
            flipped += usize::from(f);
        }
    }
    Ok((groups, flipped))
}

pub fn run(a: PsvArgs, ctx: &mut Ctx) -> Result<Report> {
    let Some(cutoff) = Cutoff::parse(&a.cutoff) else {
        bail!("--cutoff must be none, vandamme or an angle in (0, 180] such as 45; got '{}'", a.cutoff);
    };
    ctx.inputs.add(&a.file);
    let fname = a.file.display().to_string();
    let (gathered, flipped) = gather(&a.file, &a.by)?;
    let mut notes = Vec::new();
    let (groups, used) = group_scatters(gathered, cutoff, &mut notes)?;
    if groups.len() < 2 {
        bail!(
            "{fname}: the latitude model needs at least 2 groups of 3 or more sites (column '{}'), got {}",
            a.by,
            groups.len()
        );
    }
    let fit = fit_latitude_model(&groups.iter().map(|g| (g.paleolat, g.s)).collect::<Vec<_>>())?;
    let ci = latitude_model_bootstrap(&groups, &ctx.monte_carlo(a.resamples.max(20)))?;
    let mut gsec = Section::new(
        &format!("VGP scatter per group of {fname} (by '{}', cutoff {})", a.by, a.cutoff),
        &["group", "paleolat", "s", "s_low", "s_high", "n_used"],
    );
    let mut gjson = Vec::new();
    for ((g, b), (n_used, within)) in groups.iter().zip(&ci.s_bounds).zip(&used) {
        gsec.rows.push(vec![
            Cell::Text(g.name.clone()),
            Cell::Num(g.paleolat, 1),
            Cell::Num(g.s, 2),
            Cell::Num(b.0, 2),
            Cell::Num(b.1, 2),
            Cell::Int(*n_used as i64),
        ]);
        gjson.push(json!({"group": g.name, "paleolat": g.paleolat, "s": g.s, "s_low": b.0, "s_high": b.1,
            "n_used": n_used, "within_site_corrected": within}));
    }
    if flipped > 0 {
        notes.push(format!(
            "{flipped} VGP(s) more than 90° from the principal axis of their group's VGPs were mapped to their antipodes (scatter of one polarity)."
        ));
    }
    if groups.len() < 4 {
        notes.push(format!("Only {} groups: a and b trade off against each other and the band is wide.", groups.len()));
    }
    notes.push(format!(
        "S(λ)² = a² + (bλ)² is a statistical model of paleosecular variation fitted by least squares of S² on λ² (a, b ≥ 0); groups of different ages, cutoffs or site selections are not comparable without care, and the fit describes these groups, not the field itself. Intervals: seeded bootstrap of sites within each group (seed {}, {} pseudo-samples, 2.5–97.5 %), group paleolatitudes held fixed.",
        ctx.global.seed, ci.resamples
    ));
    if let Some(path) = &a.plot {
        let fig = LatitudeFigure {
            title: format!(
                "VGP scatter against paleolatitude — {}",
                a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()
            ),
            points: groups
                .iter()
                .zip(&ci.s_bounds)
                .map(|(g, b)| LatitudePoint { label: g.name.clone(), lat: g.paleolat.abs(), s: g.s, bounds: *b })
                .collect(),
            fit,
            band: ci.band.clone(),
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Report {
        json: json!({
            "file": fname, "by": a.by, "cutoff": a.cutoff,
            "groups": gjson,
            "model": {"a": fit.a, "b": fit.b, "a_low": ci.a_low, "a_high": ci.a_high, "b_low": ci.b_low,
                "b_high": ci.b_high, "rms": fit.rms, "n_groups": fit.n_groups, "lat_unit": "degrees"},
            "resamples": ci.resamples, "seed": ctx.global.seed,
            "notes": notes,
        }),
        sections: vec![gsec, model_section(&fit, &ci)],
        csv_section: 0,
        notes,
    })
}

/// Sites used by a group's scatter, and whether the within-site correction applied.
type GroupUse = (usize, bool);

/// Each group's scatter after the cutoff, with (sites used, whether the within-site correction
/// applied); a group of fewer than three sites (before or after the cutoff) is left out with a note.
fn group_scatters(
    gathered: Vec<Gathered>,
    cutoff: Cutoff,
    notes: &mut Vec<String>,
) -> Result<(Vec<LatitudeGroup>, Vec<GroupUse>)> {
    let mut groups = Vec::new();
    let mut used = Vec::new();
    for g in gathered {
        if g.sites.len() < 3 {
            notes.push(format!(
                "Group '{}' has {} site(s) and is left out (a scatter needs at least 3).",
                g.name,
                g.sites.len()
            ));
            continue;
        }
        let sc = vgp_scatter(&g.sites, cutoff)?;
        let kept: Vec<ScatterSite> = g.sites.iter().zip(&sc.kept).filter(|p| *p.1).map(|p| *p.0).collect();
        let locs: Vec<GeoPoint> = g.locations.iter().zip(&sc.kept).filter(|p| *p.1).map(|p| *p.0).collect();
        if kept.len() < 3 {
            notes.push(format!("Group '{}' keeps {} site(s) after the cutoff and is left out.", g.name, kept.len()));
            continue;
        }
        if sc.s.is_none() {
            notes.push(format!("Group '{}': the within-site term exceeds the total scatter; S is taken as 0.", g.name));
        }
        let paleolat = group_paleolatitude(&locs, sc.mean_pole)?;
        used.push((sc.n_used, sc.within_term.is_some()));
        groups.push(LatitudeGroup { name: g.name, paleolat, sites: kept, s: sc.s.unwrap_or(0.0) });
    }
    Ok((groups, used))
}

fn model_section(fit: &LatitudeFit, ci: &LatitudeModelInterval) -> Section {
    let mut msec = Section::new(
        "Latitude model S(λ)² = a² + (bλ)² (λ in degrees)",
        &["a", "a_low", "a_high", "b", "b_low", "b_high", "rms", "n_groups"],
    );
    msec.rows.push(vec![
        Cell::Num(fit.a, 2),
        Cell::Num(ci.a_low, 2),
        Cell::Num(ci.a_high, 2),
        Cell::Num(fit.b, 3),
        Cell::Num(ci.b_low, 3),
        Cell::Num(ci.b_high, 3),
        Cell::Num(fit.rms, 2),
        Cell::Int(fit.n_groups as i64),
    ]);
    msec
}
