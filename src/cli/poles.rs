//! `lodestone poles`: VGP per site, paleopole, VGP scatter.

use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::figures::{MappedVgp, PolePlot};
use lodestone::model::SiteSet;
use lodestone::poles::{pole_summary, Paleopole, PoleSummary, Scatter, ScatterInterval};
use lodestone::table::{read_sites, Table};
use serde_json::{json, Value};
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct PolesArgs {
    /// Sites table (CSV with site, lat, lon, dec, inc; optional n, k, a95).
    pub file: PathBuf,
    /// Cutoff before the scatter: none, 45 (fixed angle about the mean pole; any angle is accepted) or vandamme.
    #[arg(long, default_value = "none")]
    pub cutoff: String,
    /// Align VGPs to one polarity before averaging (by their principal axis; see the notes).
    #[arg(long)]
    pub northern: bool,
    /// Require dp and dm for every site: a site without a95 (or n and k) is an error.
    #[arg(long)]
    pub ovals: bool,
    /// Bootstrap resamples for the interval on the scatter.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Write a map of the VGPs and the paleopole (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

pub fn run(a: PolesArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let cutoff = super::args::parse_cutoff(&a.cutoff)?;
    ctx.inputs.add(&a.file);
    let table = Table::read(&a.file)?;
    let set = read_sites(&table)?;
    let fname = a.file.display().to_string();
    let mut notes = Vec::new();

    let sum = pole_summary(&set, a.northern, cutoff, &ctx.monte_carlo(a.resamples))?;
    let n_south = sum.alignment.flipped.iter().filter(|f| **f).count();
    let flipped_flags: Vec<bool> = sum.alignment.flipped.iter().map(|f| a.northern && *f).collect();
    let (sites_sec, mut sites_json, missing_oval) = site_rows(&a, &fname, &set, &sum)?;

    let (Some(pp), Some(sc), Some(boot)) = (sum.pole, sum.scatter.as_ref(), sum.interval) else {
        return one_site(&a, ctx, &fname, sites_sec, sites_json, sum.averaged[0], missing_oval);
    };
    let (averaged, missing_within) = (&sum.averaged, sum.missing_within());
    let cut_name = cutoff.name();
    let (pole_sec, sc_sec) = pole_sections(&pp, sc, &boot, &cut_name);
    let removed: Vec<&str> =
        set.records.iter().zip(&sc.kept).filter(|(_, k)| !**k).map(|(r, _)| r.site.as_str()).collect();
    for (j, keep) in sites_json.iter_mut().zip(&sc.kept) {
        j["kept"] = json!(keep);
    }

    polarity_notes(&a, &sum, n_south, set.records.len(), &mut notes);
    if !missing_oval.is_empty() {
        notes.push(format!(
            "dp, dm and the paleolatitude range are empty for {} site(s) without a95 (or n and k): {}.",
            missing_oval.len(),
            missing_oval.join(", ")
        ));
    }
    scatter_notes(sc, &boot, &cut_name, &removed, set.records.len(), missing_within, &mut notes);
    notes.push(format!(
        "The scatter interval is a seeded bootstrap over sites (seed {}, {} resamples, 95 % percentile); it depends on the cutoff and on how sites were chosen, and is a statement about this sample, not about the field itself.",
        ctx.global.seed, a.resamples
    ));

    if let Some(path) = &a.plot {
        let fig = PolePlot {
            title: format!(
                "VGPs — {}",
                a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()
            ),
            centre: pp.pole,
            vgps: averaged
                .iter()
                .zip(&sc.kept)
                .zip(&flipped_flags)
                .map(|((p, k), f)| MappedVgp { pole: *p, kept: *k, flipped: *f })
                .collect(),
            mean: Some((pp.pole, pp.a95)),
            cutoff: if a.northern || n_south == 0 { sc.threshold.map(|t| (sc.mean_pole, t)) } else { None },
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }

    Ok(Presentation {
        json: json!({
            "file": fname,
            "northern": a.northern,
            "sites": sites_json,
            "pole": { "n": pp.n, "plat": pp.pole.lat, "plon": pp.pole.lon, "r": pp.r, "k": jnum(Some(pp.k.0)), "a95": jnum(pp.a95) },
            "scatter": {
                "cutoff": cut_name, "s": jnum(sc.s), "s_low": boot.low, "s_high": boot.high,
                "s_total": sc.s_total, "within_term": jnum(sc.within_term),
                "n_used": sc.n_used, "n_removed": sc.n_removed, "removed": removed,
                "threshold": jnum(sc.threshold),
                "mean_pole": { "plat": sc.mean_pole.lat, "plon": sc.mean_pole.lon },
                "resamples": boot.resamples, "seed": ctx.global.seed, "polarity_aligned": true,
            },
            "notes": notes,
        }),
        sheets: vec![sites_sec, pole_sec, sc_sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}

/// A table of one site: its VGP, dp/dm and paleolatitude, and a note why no paleopole or scatter.
fn one_site(
    a: &PolesArgs,
    ctx: &mut Ctx,
    fname: &str,
    sites_sec: Sheet,
    mut sites_json: Vec<Value>,
    pole: lodestone::sphere::GeoPoint,
    missing_oval: Vec<String>,
) -> Result<Presentation> {
    let mut notes = vec![format!(
        "{fname} holds one site: its VGP is given, but a paleopole (a Fisher mean of VGPs) and the VGP scatter need at least two sites, so none is computed."
    )];
    notes.push("A VGP rests on a model: a geocentric dipole field at the site; one site records one moment of the field, not a time average.".into());
    if !missing_oval.is_empty() {
        notes.push("dp, dm and the paleolatitude range are empty: the site has no a95 (or n and k).".into());
    }
    for j in &mut sites_json {
        j["kept"] = json!(true);
    }
    if let Some(path) = &a.plot {
        let fig = PolePlot {
            title: format!("VGP — {}", a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()),
            centre: pole,
            vgps: vec![MappedVgp { pole, kept: true, flipped: false }],
            mean: None,
            cutoff: None,
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "file": fname, "northern": a.northern, "sites": sites_json,
            "pole": Value::Null, "scatter": Value::Null, "notes": notes,
        }),
        sheets: vec![sites_sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}

/// The VGP table of the sites and their JSON, with the sites that lack an α95 (an error with
/// `--ovals`).
fn site_rows(a: &PolesArgs, fname: &str, set: &SiteSet, sum: &PoleSummary) -> Result<(Sheet, Vec<Value>, Vec<String>)> {
    let mut sites_sec = Sheet::new(
        &format!("Virtual geomagnetic poles of {fname}"),
        &["site", "lat", "lon", "dec", "inc", "plat", "plon", "dp", "dm", "paleolat", "paleolat_low", "paleolat_high"],
    );
    let mut sites_json = Vec::new();
    let mut missing_oval = Vec::new();
    for (r, sp) in set.records.iter().zip(&sum.sites) {
        let (v, oval, range) = (sp.vgp, sp.oval, sp.range);
        if sp.a95.is_none() {
            if a.ovals {
                bail!("{}:{}: column 'a95': is missing; dp and dm need the site's a95 (or its n and k)", fname, r.line);
            }
            missing_oval.push(r.site.clone());
        }
        sites_sec.rows.push(vec![
            Cell::Text(r.site.clone()),
            Cell::Num(r.location.lat, 2),
            Cell::Azimuth(r.location.lon, 2),
            Cell::Azimuth(r.direction.dec, 1),
            Cell::Num(r.direction.inc, 1),
            Cell::Num(v.pole.lat, 1),
            Cell::Azimuth(v.pole.lon, 1),
            Cell::opt(oval.map(|o| o.dp), 1),
            Cell::opt(oval.map(|o| o.dm), 1),
            Cell::Num(v.paleolat, 1),
            Cell::opt(range.map(|x| x.low), 1),
            Cell::opt(range.map(|x| x.high), 1),
        ]);
        sites_json.push(json!({
            "site": r.site, "line": r.line, "lat": r.location.lat, "lon": r.location.lon,
            "dec": r.direction.dec, "inc": r.direction.inc,
            "plat": v.pole.lat, "plon": v.pole.lon,
            "dp": jnum(oval.map(|o| o.dp)), "dm": jnum(oval.map(|o| o.dm)), "a95": jnum(sp.a95),
            "paleolat": v.paleolat, "paleolat_low": jnum(range.map(|x| x.low)), "paleolat_high": jnum(range.map(|x| x.high)),
            "colatitude": v.colatitude,
        }));
    }

    Ok((sites_sec, sites_json, missing_oval))
}

/// Notes on the VGPs of the other polarity and on the model behind the poles.
fn polarity_notes(a: &PolesArgs, sum: &PoleSummary, n_south: usize, n_sites: usize, notes: &mut Vec<String>) {
    let alignment = &sum.alignment;
    let axis = format!("{:.1}°, {}°E", alignment.axis.lat, lodestone::numbers::azimuth(alignment.axis.lon, 1));
    if n_south > 0 {
        notes.push(if a.northern {
            format!("{n_south} VGP(s) lie more than 90° from the northern end of the VGPs' principal axis ({axis}) and were mapped to their antipodes before averaging (--northern).")
        } else {
            format!("{n_south} VGP(s) lie more than 90° from the northern end of the VGPs' principal axis ({axis}): the opposite polarity, reported as computed; add --northern to average all VGPs in one polarity.")
        });
    }
    if !a.northern && n_south > 0 && n_south < n_sites {
        notes.push("The paleopole averages VGPs of both hemispheres as given; with mixed polarity it is not meaningful without --northern.".into());
    }
    notes.push("VGPs and the paleopole rest on a model: a geocentric dipole field at each site, averaged over enough time for secular variation to cancel; the paleopole uses every site (the cutoff applies to the scatter only).".into());
}

/// Notes on the scatter: the cutoff, the within-site correction, negative bootstrap values.
fn scatter_notes(
    sc: &Scatter,
    boot: &ScatterInterval,
    cut_name: &str,
    removed: &[&str],
    n_sites: usize,
    missing_within: usize,
    notes: &mut Vec<String>,
) {
    notes.push(format!(
        "Scatter: polarity is aligned by the VGPs' principal axis (each VGP more than 90° from its northern end is replaced by its antipode), which holds for a mean pole at any latitude; cutoff {cut_name} removed {} of {} site(s){}.",
        sc.n_removed,
        n_sites,
        if removed.is_empty() { String::new() } else { format!(" ({})", removed.join(", ")) }
    ));
    match (sc.within_term, sc.s) {
        (None, _) => notes.push(format!(
            "No within-site correction: {missing_within} site(s) lack n and k (or n and a95); s equals s_total."
        )),
        (Some(_), None) => notes.push("The within-site term exceeds the total scatter: S_B is undefined (the sites are too dispersed internally for this estimate).".into()),
        _ => {}
    }
    if boot.n_negative > 0 {
        notes.push(format!(
            "{} of {} bootstrap resamples had a negative S_B² and count as 0.",
            boot.n_negative, boot.resamples
        ));
    }
}

/// The paleopole's table and the scatter's table.
fn pole_sections(pp: &Paleopole, sc: &Scatter, boot: &ScatterInterval, cut_name: &str) -> (Sheet, Sheet) {
    let mut pole_sec = Sheet::new("Paleopole (Fisher mean of the VGPs)", &["n", "plat", "plon", "k", "a95"]);
    pole_sec.rows.push(vec![
        Cell::Int(pp.n as i64),
        Cell::Num(pp.pole.lat, 1),
        Cell::Azimuth(pp.pole.lon, 1),
        Cell::Num(pp.k.0, 1),
        Cell::opt(pp.a95, 1),
    ]);

    let mut sc_sec = Sheet::new(
        "VGP scatter about the mean pole (polarity-aligned VGPs)",
        &["cutoff", "s", "s_low", "s_high", "s_total", "n_used", "n_removed", "threshold"],
    );
    sc_sec.rows.push(vec![
        Cell::Text(cut_name.to_string()),
        Cell::opt(sc.s, 2),
        Cell::Num(boot.low, 2),
        Cell::Num(boot.high, 2),
        Cell::Num(sc.s_total, 2),
        Cell::Int(sc.n_used as i64),
        Cell::Int(sc.n_removed as i64),
        Cell::opt(sc.threshold, 1),
    ]);
    (pole_sec, sc_sec)
}
