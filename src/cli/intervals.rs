//! `lodestone intervals`: renewal-model fits to the polarity intervals of a time scale.

use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::Args;
use lodestone::model::TimeScale;
use lodestone::reversals::{self, goodness_of_fit, EdgeReading, IntervalOptions, IntervalRecord, Model, RenewalFits};
use lodestone::table::Table;
use serde_json::{json, Map, Value};
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

/// `params` as a JSON object with contract names.
pub fn params_json(f: &lodestone::reversals::Fitted) -> Value {
    let mut m = Map::new();
    for (k, v) in f.named_params() {
        m.insert(k.to_string(), json!(v));
    }
    Value::Object(m)
}

/// The parameter columns of text and CSV tables (sparse: each model fills its own).
pub const PARAM_COLUMNS: [&str; 6] = ["rate", "shape", "scale", "mu", "sigma", "mean"];

/// Cells for [`PARAM_COLUMNS`].
pub fn param_cells(f: &lodestone::reversals::Fitted) -> Vec<Cell> {
    let named = f.named_params();
    PARAM_COLUMNS.iter().map(|c| Cell::opt(named.iter().find(|(k, _)| k == c).map(|p| p.1), 4)).collect()
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
    let mut sec = Sheet::new("Renewal models (maximum likelihood, open chron censored)", &[]);
    sec.columns = ["model"]
        .iter()
        .chain(PARAM_COLUMNS.iter())
        .chain(["loglik", "aic", "bic", "weight", "ks_d", "ks_p", "ad", "ad_p"].iter())
        .map(|s| s.to_string())
        .collect();
    let mut models = Vec::new();
    let mc = ctx.monte_carlo(a.resamples);
    let mut notes = record_notes(&rec, &a.window.timescale);
    for (i, f) in fits.fits.iter().enumerate() {
        let g = goodness_of_fit(&f.fitted, &sample, &mc, i as u64);
        let (d, dp, ad, adp) = match &g {
            Ok(g) => (Some(g.ks_d), Some(g.ks_p), Some(g.ad), Some(g.ad_p)),
            Err(e) => {
                notes.push(format!("{}: goodness of fit unavailable: {e}", f.fitted.model.name()));
                (None, None, None, None)
            }
        };
        let mut row = vec![Cell::Text(f.fitted.model.name().into())];
        row.extend(param_cells(&f.fitted));
        row.extend([
            Cell::Num(f.loglik, 3),
            Cell::Num(f.aic, 3),
            Cell::Num(f.bic, 3),
            Cell::Num(f.weight, 3),
            Cell::opt(d, 4),
            Cell::opt(dp, 3),
            Cell::opt(ad, 3),
            Cell::opt(adp, 3),
        ]);
        sec.rows.push(row);
        models.push(json!({
            "model": f.fitted.model.name(), "params": params_json(&f.fitted),
            "loglik": f.loglik, "aic": f.aic, "bic": f.bic, "weight": f.weight,
            "ks_d": jnum(d), "ks_p": jnum(dp), "ad": jnum(ad), "ad_p": jnum(adp),
            "mean_interval": f.fitted.mean(),
        }));
    }
    for fail in &fits.failures {
        notes.push(format!("{}: not fitted: {}", fail.model.name(), fail.reason));
    }
    let lr = lr_json(&fits, &mut notes);
    notes.push(format!(
        "Goodness-of-fit p-values come from a parametric bootstrap of {} replicates that refits the model each time (seed {}).",
        a.resamples, ctx.global.seed
    ));
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::IntervalFigure::new(&sample, &fits, &a.window.timescale.display().to_string());
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "file": a.window.timescale.display().to_string(),
            "from": rec.from, "to": rec.to,
            "n_intervals": sample.n(),
            "censored": jnum(rec.censored),
            "censored_old": jnum(rec.censored_old), "old_edge": rec.old_reading.name(),
            "merged_short": rec.merged_short, "joined": rec.joined, "left_out": rec.left_out,
            "mean_complete": sample.complete.iter().sum::<f64>() / sample.n() as f64,
            "models": models,
            "lr_test": lr,
            "intervals": rec.complete.iter().map(|iv| json!({
                "young": iv.young, "old": iv.old, "length": iv.duration(), "polarity": iv.polarity, "chrons": iv.names,
            })).collect::<Vec<_>>(),
            "open_chron": rec.open.as_ref().map(|iv| json!({"young": iv.young, "old": iv.old, "length": iv.duration(), "polarity": iv.polarity, "chrons": iv.names})),
            "resamples": a.resamples, "seed": ctx.global.seed,
            "notes": notes,
        }),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}

fn lr_json(fits: &RenewalFits, notes: &mut Vec<String>) -> Value {
    match fits.lr_test {
        Some(t) => {
            notes.push(format!(
                "Likelihood-ratio test of gamma against exponential (shape = 1): statistic {:.3}, p = {:.4}; {}",
                t.statistic,
                t.p_value,
                if t.p_value < 0.05 {
                    "a constant-rate (memoryless) process is rejected at the 5 % level."
                } else {
                    "a constant-rate (memoryless) process is not rejected at the 5 % level."
                }
            ));
            json!({"null": "gamma shape = 1 (exponential)", "statistic": t.statistic, "df": t.df, "p_value": t.p_value})
        }
        None => Value::Null,
    }
}
