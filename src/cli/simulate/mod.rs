//! `lodestone simulate`: synthetic time scales and synthetic project folders from a stated model.

mod section;

use super::{write_atomic, Ctx, Presentation};
use anyhow::{bail, Result};
use clap::{Args, Subcommand, ValueEnum};
use lodestone::model::Polarity;
use lodestone::present::simulate as present;
use lodestone::reversals::{Fitted, Model};
use lodestone::simulate::{simulate_timescale, timescale_csv, FirstPolarity, TimeScaleModel};
pub use section::SectionArgs;
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
    fn model(self) -> Model {
        match self {
            ModelArg::Exponential => Model::Exponential,
            ModelArg::Gamma => Model::Gamma,
            ModelArg::Weibull => Model::Weibull,
            ModelArg::Lognormal => Model::Lognormal,
            ModelArg::InverseGaussian => Model::InverseGaussian,
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
            model: Fitted::from_settings(self.model.model(), self.mean_interval, self.shape)?,
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

fn run_timescale(a: TimescaleArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let m = a.renewal.model(a.young, a.span)?;
    let ts = simulate_timescale(&m, ctx.global.seed)?;
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
    }
    Ok(present::synthetic_timescale(&ts, &m, ctx.global.seed, a.out.as_deref()))
}
