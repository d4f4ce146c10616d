//! `lodestone hazard`: hazard and P(reversal within a horizon | none for the elapsed time).

use super::intervals::{record_notes, Window};
use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::present::{self, hazard::HazardLabels};
use lodestone::reversals::{self, Model};
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct HazardArgs {
    #[command(flatten)]
    pub window: Window,
    /// Time since the last reversal, Myr (default: the length so far of the open chron).
    #[arg(long, value_name = "MYR")]
    pub elapsed: Option<f64>,
    /// Horizon of the conditional probability, Myr.
    #[arg(long, value_name = "MYR", default_value_t = 0.1)]
    pub horizon: f64,
    /// Bootstrap replicates for the interval of the averaged probability.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Confidence level of that interval.
    #[arg(long, default_value_t = 0.95)]
    pub level: f64,
    /// Write a figure of the hazard curves with the elapsed time marked (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

pub fn run(a: HazardArgs, ctx: &mut Ctx) -> Result<Presentation> {
    if a.resamples == 0 {
        anyhow::bail!("--resamples must be at least 1");
    }
    let rec = a.window.load(ctx)?;
    let elapsed = rec.elapsed(a.elapsed).map_err(|e| anyhow::anyhow!("--elapsed is needed: {e}"))?;
    let sample = rec.sample()?;
    let fits = reversals::fit_models(&sample, &Model::ALL);
    let mc = ctx.monte_carlo(a.resamples);
    let assessed = reversals::assess_hazard(&fits, &sample, elapsed, a.horizon, a.level, Some(&mc))?;
    let mut notes = record_notes(&rec, &a.window.timescale);
    notes.extend(assessed.interval_note());
    let file = a.window.timescale.display().to_string();
    let labels = HazardLabels {
        file: &file,
        n_intervals: sample.n(),
        censored: (rec.censored, rec.censored_old),
        level: a.level,
        seed: ctx.global.seed,
    };
    let shown = present::hazard::hazard(&assessed.estimate, labels, notes);
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::HazardFigure::new(&fits, elapsed, &file);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(shown)
}
