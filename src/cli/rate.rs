//! `lodestone rate`: reversal rate through time, with the Laplace trend test and the clustering test.

use super::intervals::{record_notes, Window};
use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::present::{self, rate::RateLabels};
use lodestone::reversals;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct RateArgs {
    #[command(flatten)]
    pub window: Window,
    /// Width of the sliding window, Myr.
    #[arg(long = "window", value_name = "MYR", default_value_t = 1.0)]
    pub width: f64,
    /// Spacing of the window centres, Myr (default: a tenth of the window).
    #[arg(long, value_name = "MYR")]
    pub step: Option<f64>,
    /// Confidence level of the rate band.
    #[arg(long, default_value_t = 0.95)]
    pub level: f64,
    /// Write a figure of the rate through time with its band (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

pub fn run(a: RateArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let rec = a.window.load(ctx)?;
    let sum = reversals::rate_summary(&rec.reversals, rec.from, rec.to, a.width, a.step, a.level)?;
    let file = a.window.timescale.display().to_string();
    let labels = RateLabels { file: &file, span: (rec.from, rec.to), window: a.width, level: a.level };
    let shown = present::rate::rate(&sum, &rec.reversals, labels, record_notes(&rec, &a.window.timescale));
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::RateFigure {
            title: format!("Reversal rate — {file}"),
            points: sum.points.clone(),
            reversals: rec.reversals.clone(),
            window: a.width,
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(shown)
}
