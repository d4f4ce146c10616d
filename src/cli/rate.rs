//! `lodestone rate`: reversal rate through time, with the Laplace trend test and the clustering test.

use super::intervals::{record_notes, Window};
use super::{Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::Args;
use lodestone::reversals;
use serde_json::{json, Value};
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
    let (step, points) = (sum.step, &sum.points);
    let mut notes = record_notes(&rec, &a.window.timescale);
    notes.push(format!(
        "{} reversals in the window; rates counted in {} Myr windows every {} Myr, with exact Poisson {:.0} % limits.",
        rec.reversals.len(),
        a.width,
        step,
        a.level * 100.0
    ));
    let mut sec = Sheet::new("Reversal rate through time (per Myr)", &["age", "rate", "low", "high", "count"]);
    for p in points {
        sec.rows.push(vec![
            Cell::Num(p.age, 3),
            Cell::Num(p.rate, 3),
            Cell::Num(p.low, 3),
            Cell::Num(p.high, 3),
            Cell::Int(p.count as i64),
        ]);
    }
    let mut tests = Sheet::new("Tests", &["test", "n", "statistic", "value", "p"]);
    let laplace = match &sum.laplace {
        Ok(l) => {
            tests.rows.push(vec![
                Cell::Text("laplace trend".into()),
                Cell::Int(l.n as i64),
                Cell::Text("U".into()),
                Cell::Num(l.u, 3),
                Cell::Num(l.p_value, 4),
            ]);
            notes.push(format!(
                "Laplace trend test: U = {:.2} (p = {:.3}); U > 0 means reversals crowd toward the present, U < 0 toward the old end.",
                l.u, l.p_value
            ));
            json!(l)
        }
        Err(e) => {
            notes.push(format!("Laplace trend test unavailable: {e}"));
            Value::Null
        }
    };
    let clustering = match &sum.clustering {
        Ok(c) => {
            tests.rows.push(vec![
                Cell::Text("clustering (mean H)".into()),
                Cell::Int(c.h.len() as i64),
                Cell::Text("mean_h".into()),
                Cell::Num(c.mean_h, 3),
                Cell::Num(c.p_value, 4),
            ]);
            tests.rows.push(vec![
                Cell::Text("clustering (H uniform)".into()),
                Cell::Int(c.h.len() as i64),
                Cell::Text("ks_d".into()),
                Cell::Num(c.ks_d, 3),
                Cell::Num(c.ks_p, 4),
            ]);
            notes.push(format!(
                "Clustering test: mean H = {:.3} over {} reversals (0.5 for a locally Poisson process, lower for clustering, higher for regular spacing); neighbouring H values share intervals, so the p-values are approximate.",
                c.mean_h,
                c.h.len()
            ));
            json!({"n": c.h.len(), "mean_h": c.mean_h, "z": c.z, "p_value": c.p_value, "ks_d": c.ks_d, "ks_p": c.ks_p, "h": c.h})
        }
        Err(e) => {
            notes.push(format!("Clustering test unavailable: {e}"));
            Value::Null
        }
    };
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::RateFigure {
            title: format!("Reversal rate — {}", a.window.timescale.display()),
            points: points.to_vec(),
            reversals: rec.reversals.clone(),
            window: a.width,
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "file": a.window.timescale.display().to_string(),
            "from": rec.from, "to": rec.to, "window": a.width, "step": step, "level": a.level,
            "n_reversals": rec.reversals.len(),
            "rate": points,
            "laplace": laplace,
            "clustering": clustering,
            "notes": notes,
        }),
        sheets: vec![sec, tests],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}
