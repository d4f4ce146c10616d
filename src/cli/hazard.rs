//! `lodestone hazard`: hazard and P(reversal within a horizon | none for the elapsed time).

use super::intervals::{param_cells, params_json, record_notes, Window, PARAM_COLUMNS};
use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::Args;
use lodestone::reversals::{self, Model, CAUTIONS};
use serde_json::json;
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
    let elapsed = match (a.elapsed, &rec.open) {
        (Some(t), _) => t,
        (None, Some(o)) => o.duration(),
        (None, None) => anyhow::bail!("--elapsed is needed: the window holds no open chron at the present"),
    };
    let sample = rec.sample()?;
    let fits = reversals::fit_models(&sample, &Model::ALL);
    let mut est = reversals::hazard_at(&fits, &sample, elapsed, a.horizon)?;
    let mut notes = record_notes(&rec, &a.window.timescale);
    match reversals::averaged_interval(
        &sample,
        &Model::ALL,
        elapsed,
        a.horizon,
        a.level,
        &ctx.monte_carlo(a.resamples),
        100,
    ) {
        Ok(b) => est.interval = Some(b),
        Err(e) => notes.push(format!("No bootstrap interval for the averaged probability: {e}")),
    }
    let mut sec = Sheet::new(
        &format!("Hazard at {elapsed} Myr since the last reversal; P(reversal within {} Myr | none so far)", a.horizon),
        &[],
    );
    sec.columns = ["model"]
        .iter()
        .chain(PARAM_COLUMNS.iter())
        .chain(["weight", "hazard", "survival", "p_within", "cdf"].iter())
        .map(|s| s.to_string())
        .collect();
    let mut models = Vec::new();
    for m in &est.models {
        let mut row = vec![Cell::Text(m.fitted.model.name().into())];
        row.extend(param_cells(&m.fitted));
        row.extend([
            Cell::Num(m.weight, 3),
            Cell::Num(m.hazard, 3),
            Cell::Num(m.survival, 4),
            Cell::opt(m.p_within, 4),
            Cell::Num(m.cdf, 3),
        ]);
        sec.rows.push(row);
        models.push(json!({
            "model": m.fitted.model.name(), "params": params_json(&m.fitted), "weight": m.weight,
            "hazard": m.hazard, "survival": m.survival, "p_within": jnum(m.p_within), "cdf": m.cdf,
        }));
    }
    let mut avg = vec![Cell::Text("averaged (Akaike weights)".into())];
    avg.extend(std::iter::repeat_n(Cell::Empty, PARAM_COLUMNS.len()));
    avg.extend([Cell::Num(1.0, 3), Cell::Empty, Cell::Empty, Cell::Num(est.averaged, 4), Cell::Empty]);
    sec.rows.push(avg);
    if let Some(b) = est.interval {
        notes.push(format!(
            "Akaike-weighted P(reversal within {} Myr) = {:.3}, {:.0} % bootstrap interval {:.3} – {:.3} ({} resamples of the intervals, all models refitted, seed {}).",
            a.horizon, est.averaged, b.level * 100.0, b.low, b.high, b.resamples, ctx.global.seed
        ));
    }
    notes.push(format!(
        "{elapsed} Myr is longer than {:.0} % of the {} complete intervals.",
        est.percentile,
        sample.n()
    ));
    notes.extend(CAUTIONS.iter().map(|s| s.to_string()));
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::HazardFigure::new(&fits, elapsed, &a.window.timescale.display().to_string());
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "file": a.window.timescale.display().to_string(),
            "elapsed": elapsed, "horizon": a.horizon,
            "n_intervals": sample.n(), "censored": jnum(rec.censored), "censored_old": jnum(rec.censored_old),
            "models": models,
            "averaged": {
                "p_within": est.averaged,
                "low": jnum(est.interval.map(|b| b.low)), "high": jnum(est.interval.map(|b| b.high)),
                "level": a.level, "resamples": est.interval.map(|b| b.resamples),
            },
            "percentile": est.percentile,
            "cautions": CAUTIONS,
            "seed": ctx.global.seed,
            "notes": notes,
        }),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}
