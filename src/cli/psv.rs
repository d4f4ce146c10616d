//! `lodestone psv`: VGP scatter per group against paleolatitude, with S(λ)² = a² + (bλ)² fitted.

use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::dirstats::{psv_groups, psv_model};
use lodestone::figures::{LatitudeFigure, LatitudePoint};
use lodestone::present::{self, psv::PsvLabels};
use lodestone::table::Table;
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
    let (fit, ci) = psv_model(&pg, &ctx.monte_carlo(a.resamples))?;
    let groups = &pg.groups;
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
    let labels = PsvLabels { file: &fname, by: &a.by, cutoff: &a.cutoff, seed: ctx.global.seed };
    Ok(present::psv::psv(&pg, &fit, &ci, &labels))
}
