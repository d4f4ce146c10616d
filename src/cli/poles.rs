//! `lodestone poles`: VGP per site, paleopole, VGP scatter.

use super::{Ctx, Presentation};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::figures::{MappedVgp, PolePlot};
use lodestone::poles::{pole_summary, PoleSummary};
use lodestone::present::{self, poles::PoleLabels};
use lodestone::table::{read_sites, Table};
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
    let set = read_sites(&Table::read(&a.file)?)?;
    let fname = a.file.display().to_string();
    let sum = pole_summary(&set, a.northern, cutoff, &ctx.monte_carlo(a.resamples))?;
    if a.ovals {
        if let Some((r, _)) = set.records.iter().zip(&sum.sites).find(|(_, sp)| sp.a95.is_none()) {
            bail!("{}:{}: column 'a95': is missing; dp and dm need the site's a95 (or its n and k)", fname, r.line);
        }
    }
    if let Some(path) = &a.plot {
        super::write_figure(&figure(&a, &sum), path, &ctx.inputs)?;
    }
    let labels = PoleLabels { file: &fname, northern: a.northern, seed: ctx.global.seed, resamples: a.resamples };
    Ok(present::poles::poles(&set, &sum, &labels))
}

/// The map of the VGPs and the paleopole (or of the one VGP).
fn figure(a: &PolesArgs, sum: &PoleSummary) -> PolePlot {
    let name = a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
    let Some(pp) = sum.pole else {
        let pole = sum.averaged[0];
        return PolePlot {
            title: format!("VGP — {name}"),
            centre: pole,
            vgps: vec![MappedVgp { pole, kept: true, flipped: false }],
            mean: None,
            cutoff: None,
        };
    };
    let n_south = sum.alignment.flipped.iter().filter(|f| **f).count();
    PolePlot {
        title: format!("VGPs — {name}"),
        centre: pp.pole,
        vgps: sum
            .averaged
            .iter()
            .zip(sum.kept_sites())
            .zip(&sum.alignment.flipped)
            .map(|((p, kept), f)| MappedVgp { pole: *p, kept, flipped: a.northern && *f })
            .collect(),
        mean: Some((pp.pole, pp.a95)),
        cutoff: match &sum.scatter {
            Some(sc) if a.northern || n_south == 0 => sc.threshold.map(|t| (sc.mean_pole, t)),
            _ => None,
        },
    }
}
