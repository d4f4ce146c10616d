//! `lodestone simulate section`: write a project folder for a synthetic section.

use super::super::{write_atomic, Ctx, Presentation};
use super::RenewalArgs;
use anyhow::{Context, Result};
use clap::{Args, ValueEnum};
use lodestone::model::{StratAxis, TimeScale, Treatment};
use lodestone::present::simulate as present;
use lodestone::simulate::{
    parse_rates, project_files, section_timescale_span, simulate_section, simulate_timescale, treatment_defaults,
    Overprint, SectionModel, SyntheticSection, TimeScaleSource, Unblocking,
};
use lodestone::sphere::{Bedding, Direction, GeoPoint};
use lodestone::table::Table;
use std::path::PathBuf;

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum TreatmentArg {
    Thermal,
    Af,
}

#[derive(Debug, Args)]
pub struct SectionArgs {
    /// Folder to write (created; must be empty unless --force).
    pub out: PathBuf,
    /// Time scale to sample (a timescale table). Without it a renewal time scale is simulated
    /// from the model options below and written to the folder.
    #[arg(long)]
    pub timescale: Option<PathBuf>,
    #[command(flatten)]
    pub renewal: RenewalArgs,
    /// Age of the base of the section, Ma.
    #[arg(long)]
    pub base_age: f64,
    /// Age of the top of the section, Ma.
    #[arg(long, default_value_t = 0.0)]
    pub top_age: f64,
    /// Accumulation rates in cm/kyr from the base upward: RATE@AGE,…,RATE (a rate holds until the
    /// age after '@'; the last runs to the top; 0 is a hiatus). A single number is a constant rate.
    #[arg(long, default_value = "2")]
    pub rates: String,
    /// Distance between sampled levels, m.
    #[arg(long, default_value_t = 1.0)]
    pub spacing: f64,
    /// Specimens per level.
    #[arg(long, default_value_t = 3)]
    pub specimens: usize,
    /// Fisher precision of the specimens' characteristic directions about their level's field.
    #[arg(long, default_value_t = 40.0)]
    pub kappa: f64,
    /// Fisher precision of the levels' fields about the axial dipole (secular variation); without
    /// it every level records the axial dipole exactly.
    #[arg(long)]
    pub level_kappa: Option<f64>,
    /// Latitude of the locality, degrees.
    #[arg(long, allow_hyphen_values = true)]
    pub lat: f64,
    /// Longitude of the locality, degrees east.
    #[arg(long, allow_hyphen_values = true)]
    pub lon: f64,
    /// Bedding as DIPDIR/DIP, several separated by commas, given to levels in turn (e.g. two
    /// attitudes for a fold test). Default: flat-lying.
    #[arg(long)]
    pub bedding: Option<String>,
    /// Demagnetization kind.
    #[arg(long, value_enum, default_value_t = TreatmentArg::Thermal)]
    pub treatment: TreatmentArg,
    /// Treatment steps (°C or mT), comma-separated, starting with 0 (the NRM). Default: a standard
    /// schedule for the treatment.
    #[arg(long)]
    pub steps: Option<String>,
    /// Unblocking range LOW:HIGH of the characteristic component (°C or mT).
    #[arg(long)]
    pub characteristic: Option<String>,
    /// Overprint direction DEC/INC in geographic coordinates (acquired after folding). No overprint
    /// without it.
    #[arg(long, allow_hyphen_values = true)]
    pub overprint: Option<String>,
    /// Overprint moment as a fraction of the characteristic moment.
    #[arg(long, default_value_t = 0.5)]
    pub overprint_ratio: f64,
    /// Unblocking range LOW:HIGH of the overprint (°C or mT).
    #[arg(long)]
    pub overprint_range: Option<String>,
    /// Characteristic moment of a typical specimen, A·m².
    #[arg(long, default_value_t = 1e-8)]
    pub moment: f64,
    /// Standard deviation of ln(moment) between specimens.
    #[arg(long, default_value_t = 0.25)]
    pub moment_spread: f64,
    /// Measurement noise per vector component, as a fraction of the specimen's characteristic moment.
    #[arg(long, default_value_t = 0.005)]
    pub noise: f64,
    /// Level names: this prefix and a three-digit number counted from the base.
    #[arg(long, default_value = "L")]
    pub site_prefix: String,
    /// Write depths below the top (a core) instead of heights above the base.
    #[arg(long)]
    pub core: bool,
    /// Write into a folder that is not empty (files of the same names are replaced).
    #[arg(long)]
    pub force: bool,
}

fn pair(text: &str, sep: char, what: &str) -> Result<(f64, f64)> {
    let (a, b) =
        text.split_once(sep).with_context(|| format!("{what} '{text}': expected two numbers separated by '{sep}'"))?;
    let p =
        |s: &str| s.trim().parse::<f64>().with_context(|| format!("{what} '{text}': '{}' is not a number", s.trim()));
    Ok((p(a)?, p(b)?))
}

fn unblocking(text: &Option<String>, default: Unblocking, what: &str) -> Result<Unblocking> {
    Ok(match text {
        None => default,
        Some(t) => {
            let (low, high) = pair(t, ':', what)?;
            Unblocking { low, high }
        }
    })
}

fn build_model(a: &SectionArgs) -> Result<SectionModel> {
    let treatment = match a.treatment {
        TreatmentArg::Thermal => Treatment::Thermal,
        TreatmentArg::Af => Treatment::Af,
    };
    let defaults = treatment_defaults(treatment)?;
    let steps = match &a.steps {
        None => defaults.steps,
        Some(s) => s
            .split(',')
            .map(|x| x.trim().parse::<f64>().with_context(|| format!("--steps: '{}' is not a number", x.trim())))
            .collect::<Result<_>>()?,
    };
    let bedding = match &a.bedding {
        None => vec![],
        Some(s) => s
            .split(',')
            .map(|b| {
                let (dd, dip) = pair(b.trim(), '/', "--bedding")?;
                Ok(Bedding::from_dip_direction(dd, dip, false)?)
            })
            .collect::<Result<_>>()?,
    };
    let overprint = match &a.overprint {
        None => None,
        Some(o) => {
            let (d, i) = pair(o, '/', "--overprint")?;
            Some(Overprint {
                direction: Direction::new(d, i)?,
                ratio: a.overprint_ratio,
                unblocking: unblocking(&a.overprint_range, defaults.overprint, "--overprint-range")?,
            })
        }
    };
    Ok(SectionModel {
        site: GeoPoint::new(a.lat, a.lon)?,
        base_age: a.base_age,
        top_age: a.top_age,
        rates: parse_rates(&a.rates)?,
        spacing: a.spacing,
        specimens: a.specimens,
        kappa: a.kappa,
        level_kappa: a.level_kappa,
        bedding,
        treatment,
        steps,
        characteristic: unblocking(&a.characteristic, defaults.characteristic, "--characteristic")?,
        overprint,
        moment: a.moment,
        moment_sigma: a.moment_spread,
        noise: a.noise,
        site_prefix: a.site_prefix.clone(),
        axis: if a.core { StratAxis::Depth } else { StratAxis::Height },
    })
}

pub(super) fn run_section(a: SectionArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = build_model(&a)?;
    let seed = ctx.global.seed;
    let (ts, source) = match &a.timescale {
        Some(p) => {
            ctx.inputs.add(p);
            (TimeScale::from_table(&Table::read(p)?)?, TimeScaleSource::File(p.display().to_string()))
        }
        None => {
            // Cover the section with one mean interval to spare below its base (the library's rule).
            let span = section_timescale_span(a.base_age, a.renewal.mean_interval);
            let m = a.renewal.model(0.0, span)?;
            (simulate_timescale(&m, seed)?, TimeScaleSource::Renewal(m))
        }
    };
    let mc = ctx.monte_carlo(0);
    let sec = simulate_section(&model, &ts, &mc)?;
    let files = write_folder(&a, &model, &sec, &ts, &source, seed, ctx)?;
    Ok(present::synthetic_section(&model, &sec, seed, &a.out, &files))
}

/// Write the project folder (steps, sampling, time scale, settings, truth); returns the file names.
fn write_folder(
    a: &SectionArgs,
    model: &SectionModel,
    sec: &SyntheticSection,
    ts: &TimeScale,
    source: &TimeScaleSource,
    seed: u64,
    ctx: &mut Ctx,
) -> Result<Vec<&'static str>> {
    crate::cli::prepare_out_dir(&a.out, a.force, &ctx.inputs)?;
    let files = project_files(model, sec, ts, source, seed)?;
    for (name, text) in &files {
        write_atomic(&a.out.join(name), text.as_bytes(), &ctx.inputs)?;
    }
    Ok(files.iter().map(|f| f.0).collect())
}
