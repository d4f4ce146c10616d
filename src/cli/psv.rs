//! `lodestone psv`: VGP scatter per group against paleolatitude, with S(λ)² = a² + (bλ)² fitted.

use super::{Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::Args;
use lodestone::dirstats::{psv_groups, psv_model, GroupRemark, LatitudeFit, LatitudeModelInterval, MIN_GROUP_SITES};
use lodestone::figures::{LatitudeFigure, LatitudePoint};
use lodestone::table::Table;
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

pub fn run(a: PsvArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let cutoff = super::args::parse_cutoff(&a.cutoff)?;
    ctx.inputs.add(&a.file);
    let fname = a.file.display().to_string();
    let pg = psv_groups(&Table::read(&a.file)?, &a.by, cutoff)?;
    let mut notes = Vec::new();
    for (name, remark) in &pg.remarks {
        notes.push(match remark {
            GroupRemark::TooFewSites(n) => {
                format!("Group '{name}' has {n} site(s) and is left out (a scatter needs at least {MIN_GROUP_SITES}).")
            }
            GroupRemark::TooFewKept(n) => format!("Group '{name}' keeps {n} site(s) after the cutoff and is left out."),
            GroupRemark::WithinExceedsTotal => {
                format!("Group '{name}': the within-site term exceeds the total scatter; S is taken as 0.")
            }
        });
    }
    let (groups, flipped) = (&pg.groups, pg.flipped);
    let used: Vec<(usize, bool)> = pg.n_used.iter().copied().zip(pg.within_corrected.iter().copied()).collect();
    let (fit, ci) = psv_model(&pg, &ctx.monte_carlo(a.resamples))?;
    let mut gsec = Sheet::new(
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
    Ok(Presentation {
        json: json!({
            "file": fname, "by": a.by, "cutoff": a.cutoff,
            "groups": gjson,
            "model": {"a": fit.a, "b": fit.b, "a_low": ci.a_low, "a_high": ci.a_high, "b_low": ci.b_low,
                "b_high": ci.b_high, "rms": fit.rms, "n_groups": fit.n_groups, "lat_unit": "degrees"},
            "resamples": ci.resamples, "seed": ctx.global.seed,
            "notes": notes,
        }),
        sheets: vec![gsec, model_section(&fit, &ci)],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}

fn model_section(fit: &LatitudeFit, ci: &LatitudeModelInterval) -> Sheet {
    let mut msec = Sheet::new(
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
