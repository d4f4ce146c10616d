//! `lodestone simulate`: synthetic time scales and synthetic project folders from a stated model.

mod section;

use super::{write_atomic, Cell, Ctx, Presentation, Sheet};
use anyhow::{bail, Result};
use clap::{Args, Subcommand, ValueEnum};
use lodestone::model::Polarity;
use lodestone::simulate::{simulate_timescale, timescale_csv, FirstPolarity, RenewalModel, TimeScaleModel};
pub use section::SectionArgs;
use serde_json::json;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct SimulateArgs {
    #[command(subcommand)]
    pub what: SimulateWhat,
}

#[derive(Debug, Subcommand)]
#[allow(clippy::large_enum_variant, reason = "parsed once per run; boxing the arguments would buy nothing")]
pub enum SimulateWhat {
    /// A polarity time scale from a renewal model of interval lengths (a timescale table).
    Timescale(TimescaleArgs),
    /// A project folder for a synthetic sampled section (steps, sampling, time scale, settings, truth).
    Section(SectionArgs),
}

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum ModelArg {
    Exponential,
    Gamma,
    Weibull,
    Lognormal,
    InverseGaussian,
}

impl ModelArg {
    fn name(self) -> &'static str {
        match self {
            ModelArg::Exponential => "exponential",
            ModelArg::Gamma => "gamma",
            ModelArg::Weibull => "weibull",
            ModelArg::Lognormal => "lognormal",
            ModelArg::InverseGaussian => "inverse_gaussian",
        }
    }
}

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum FirstArg {
    N,
    R,
    Random,
}

/// The renewal model of a synthetic time scale.
#[derive(Debug, Args)]
pub struct RenewalArgs {
    /// Interval-length model.
    #[arg(long, value_enum, default_value_t = ModelArg::Gamma)]
    pub model: ModelArg,
    /// Shape parameter: gamma/Weibull shape, lognormal sigma, inverse-Gaussian shape (Myr). Default
    /// 1.5 (an illustrative choice); not used by the exponential model.
    #[arg(long)]
    pub shape: Option<f64>,
    /// Mean polarity interval, Myr (default 0.25: the commonly stated average spacing of reversals).
    #[arg(long, default_value_t = 0.25)]
    pub mean_interval: f64,
    /// Polarity of the youngest chron.
    #[arg(long, value_enum, default_value_t = FirstArg::N)]
    pub first_polarity: FirstArg,
    /// Name chrons PREFIX1, PREFIX2, … from young to old.
    #[arg(long)]
    pub name_prefix: Option<String>,
}

impl RenewalArgs {
    fn model(&self, young: f64, span: f64) -> Result<TimeScaleModel> {
        Ok(TimeScaleModel {
            model: RenewalModel::from_settings(self.model.name(), self.mean_interval, self.shape)?,
            young,
            span,
            first: match self.first_polarity {
                FirstArg::N => FirstPolarity::Fixed(Polarity::Normal),
                FirstArg::R => FirstPolarity::Fixed(Polarity::Reversed),
                FirstArg::Random => FirstPolarity::Random,
            },
            name_prefix: self.name_prefix.clone(),
        })
    }
}

#[derive(Debug, Args)]
pub struct TimescaleArgs {
    #[command(flatten)]
    pub renewal: RenewalArgs,
    /// Length of time to cover, Myr.
    #[arg(long)]
    pub span: f64,
    /// Age of the young end, Ma.
    #[arg(long, default_value_t = 0.0)]
    pub young: f64,
    /// Write the timescale table to this file (it is also the CSV output, `--format csv`).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Replace an existing output file.
    #[arg(long)]
    pub force: bool,
}

pub fn run(a: SimulateArgs, ctx: &mut Ctx) -> Result<Presentation> {
    match a.what {
        SimulateWhat::Timescale(t) => run_timescale(t, ctx),
        SimulateWhat::Section(s) => section::run_section(s, ctx),
    }
}

pub(super) fn timescale_model_json(m: &TimeScaleModel) -> serde_json::Value {
    json!({ "model": m.model, "mean": m.model.mean(), "young": m.young, "span": m.span, "first_polarity": m.first })
}

fn run_timescale(a: TimescaleArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let m = a.renewal.model(a.young, a.span)?;
    let ts = simulate_timescale(&m, ctx.global.seed)?;
    let named = ts.chrons.iter().any(|c| c.name.is_some());
    let mut cols = vec!["young", "old", "polarity"];
    if named {
        cols.insert(0, "name");
    }
    let mut sec = Sheet::new(&format!("Synthetic {} time scale, seed {}", m.model.name(), ctx.global.seed), &cols);
    for c in &ts.chrons {
        let mut row = vec![Cell::Num(c.young, 6), Cell::Num(c.old, 6), Cell::Text(c.polarity.code().into())];
        if named {
            row.insert(0, Cell::opt_text(c.name.as_deref()));
        }
        sec.rows.push(row);
    }
    let n = ts.chrons.len();
    let complete: Vec<f64> = if n > 2 { ts.chrons[1..n - 1].iter().map(|c| c.duration()).collect() } else { vec![] };
    let sample_mean = (!complete.is_empty()).then(|| complete.iter().sum::<f64>() / complete.len() as f64);
    let mut notes = vec![format!(
        "{n} chrons over {} Myr; {} complete intervals (the youngest and oldest chrons are cut by the ends of the span){}; model mean {:.4} Myr.",
        a.span,
        complete.len(),
        sample_mean.map(|x| format!(", mean length {x:.4} Myr")).unwrap_or_default(),
        m.model.mean()
    )];
    notes.push("Synthetic: a draw from the stated renewal model, not a record of the geomagnetic field.".into());
    if let Some(path) = &a.out {
        if path.exists() && !a.force {
            bail!("{} exists; add --force to replace it", path.display());
        }
        let comment = format!(
            "Synthetic polarity time scale: lodestone simulate timescale, seed {}.\nModel: {}",
            ctx.global.seed,
            serde_json::to_string(&m.model)?
        );
        write_atomic(path, timescale_csv(&ts, &comment).as_bytes(), &ctx.inputs)?;
        notes.push(format!("Wrote {}.", path.display()));
    }
    let chrons: Vec<_> = ts
        .chrons
        .iter()
        .map(|c| json!({"name": c.name, "young": c.young, "old": c.old, "polarity": c.polarity}))
        .collect();
    Ok(Presentation {
        json: json!({
            "seed": ctx.global.seed,
            "model": timescale_model_json(&m),
            "n_chrons": n,
            "n_complete": complete.len(),
            "mean_complete": sample_mean,
            "chrons": chrons,
            "out": a.out.as_ref().map(|p| p.display().to_string()),
            "notes": notes,
        }),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}
