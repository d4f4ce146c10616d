//! `lodestone intervals`: renewal-model fits to the polarity intervals of a time scale.

use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::model::TimeScale;
use lodestone::present::{self, intervals::FitLabels};
use lodestone::reversals::{self, EdgeReading, IntervalOptions, IntervalRecord, Model};
use lodestone::table::Table;
use std::path::{Path, PathBuf};

/// Options shared by `intervals`, `hazard` and `rate`: which part of the time scale, and how.
#[derive(Debug, Args)]
pub struct Window {
    /// Time scale table (young, old, polarity; optional name).
    pub timescale: PathBuf,
    /// Young edge of the window, Ma (default: the young end of the scale).
    #[arg(long, value_name = "MA")]
    pub from: Option<f64>,
    /// Old edge of the window, Ma (default: the old end of the scale).
    #[arg(long, value_name = "MA")]
    pub to: Option<f64>,
    /// Merge chrons shorter than this (Myr) into their neighbours (a detection threshold).
    #[arg(long, value_name = "MYR", default_value_t = 0.0)]
    pub min_length: f64,
    /// Leave the open chron at the present out of the likelihoods instead of treating it as censored.
    #[arg(long)]
    pub no_censor: bool,
    /// How to read the interval at the old end (the scale's oldest row, or a chron cut by --to).
    /// Default: complete when the table's old_edge column says 'reversal' on the oldest row, else
    /// censored.
    #[arg(long, value_enum, value_name = "READING")]
    pub old_edge: Option<OldEdgeArg>,
}

/// `--old-edge` values.
#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum OldEdgeArg {
    /// A whole interval (its old boundary is a reversal).
    Complete,
    /// Right-censored: it lasted at least its length in the record.
    Censored,
    /// Left out of the likelihoods.
    LeftOut,
}

impl Window {
    /// Read the scale and cut the intervals.
    pub fn load(&self, ctx: &mut Ctx) -> Result<IntervalRecord> {
        ctx.inputs.add(&self.timescale);
        let ts = TimeScale::from_table(&Table::read(&self.timescale)?)?;
        let old_edge = self.old_edge.map(|e| match e {
            OldEdgeArg::Complete => EdgeReading::Complete,
            OldEdgeArg::Censored => EdgeReading::Censored,
            OldEdgeArg::LeftOut => EdgeReading::LeftOut,
        });
        let opt = IntervalOptions {
            from: self.from,
            to: self.to,
            min_length: self.min_length,
            censor: !self.no_censor,
            old_edge,
        };
        Ok(reversals::intervals(&ts, &opt)?)
    }
}

/// Sentences describing how the intervals were cut.
pub fn record_notes(rec: &IntervalRecord, file: &Path) -> Vec<String> {
    let mut n = vec![format!(
        "{}: {} complete polarity intervals between {} and {} Ma.",
        file.display(),
        rec.complete.len(),
        rec.from,
        rec.to
    )];
    if rec.joined > 0 {
        n.push(format!("{} adjacent chrons of the same polarity were joined into single intervals.", rec.joined));
    }
    if rec.merged_short > 0 {
        n.push(format!(
            "{} chrons shorter than the minimum length were merged into their neighbours.",
            rec.merged_short
        ));
    }
    if rec.left_out > 0 {
        n.push(format!(
            "{} intervals cut by the window edges or ending at the old end of the scale were left out (their full length is unknown).",
            rec.left_out
        ));
    }
    match (&rec.open, rec.censored) {
        (Some(_), Some(c)) => n.push(format!(
            "The open chron at the present ({c:.4} Myr so far, still running) enters the likelihoods as a right-censored length."
        )),
        (Some(o), None) => n.push(format!(
            "The open chron at the present ({} Myr so far) is left out (--no-censor).",
            o.duration()
        )),
        _ => {}
    }
    if let Some(c) = &rec.young_cut {
        n.push(match rec.censored {
            Some(l) => format!("The chron cut by the window's young edge ({l:.4} Myr inside the window) enters the likelihoods as a right-censored length."),
            None => format!("The chron cut by the window's young edge ({:.4} Myr inside) is left out (--no-censor).", c.duration()),
        });
    }
    if let Some(o) = &rec.old_end {
        let what =
            if rec.old_end_cut_by_window { "the chron cut by the window's old edge" } else { "the scale's oldest row" };
        n.push(match rec.old_reading {
            EdgeReading::Complete => format!("The interval at the old end ({what}, {:.4} Myr) is read as complete (--old-edge complete, or the table states its old boundary is a reversal).", o.duration()),
            EdgeReading::Censored => format!("The interval at the old end ({what}, {:.4} Myr) enters the likelihoods as a second right-censored length: it lasted at least that long (--old-edge to change).", o.duration()),
            EdgeReading::LeftOut => format!("The interval at the old end ({what}, {:.4} Myr) is left out (--old-edge left-out).", o.duration()),
        });
    }
    n
}

#[derive(Debug, Args)]
pub struct IntervalsArgs {
    #[command(flatten)]
    pub window: Window,
    /// Parametric-bootstrap replicates for the goodness-of-fit p-values.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Write a figure of the empirical distribution with the fitted models (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

pub fn run(a: IntervalsArgs, ctx: &mut Ctx) -> Result<Presentation> {
    if a.resamples == 0 {
        anyhow::bail!("--resamples must be at least 1");
    }
    let rec = a.window.load(ctx)?;
    let sample = rec.sample()?;
    let fits = reversals::fit_models(&sample, &Model::ALL);
    let gof = reversals::goodness_of_fits(&fits, &sample, &ctx.monte_carlo(a.resamples));
    let file = a.window.timescale.display().to_string();
    let labels = FitLabels { file: &file, resamples: a.resamples, seed: ctx.global.seed };
    let shown =
        present::intervals::intervals(&rec, &sample, &fits, &gof, labels, record_notes(&rec, &a.window.timescale));
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::IntervalFigure::new(&sample, &fits, &file);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(shown)
}
