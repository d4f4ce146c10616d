//! `lodestone unflatten`: correction of inclination shallowing in sediments.

use super::{Ctx, Presentation};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::dirstats::{
    elongation_of, shallowing_directions, unflatten_given, unflatten_search, MIN_DIRECTIONS, RECOMMENDED_DIRECTIONS,
};
use lodestone::figures::UnflattenFigure;
use lodestone::montecarlo::MIN_RESAMPLES;
use lodestone::present::{self, unflatten::GivenFactor};
use lodestone::sphere::Direction;
use lodestone::table::{read_directions, GroupBy, Table};
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct UnflattenArgs {
    /// Directions table (CSV with dec, inc; one direction per row, lines only).
    pub file: PathBuf,
    /// Apply this flattening factor (tan I_f = f tan I₀) instead of estimating it.
    #[arg(long)]
    pub factor: Option<f64>,
    /// Bootstrap pseudo-samples for the intervals of f and of the corrected inclination.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Coordinate frame: geo (in situ) or tilt (bedding-corrected; needs bedding columns).
    #[arg(long, value_enum, default_value_t = ShallowFrame::Tilt)]
    pub frame: ShallowFrame,
    /// Write the elongation–inclination figure (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

/// The frame of the directions.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum ShallowFrame {
    Geo,
    Tilt,
}

/// Bootstrap paths drawn on the figure.
const PATHS_DRAWN: usize = 100;

/// The directions of the table in the chosen frame (tilt: bedding-corrected when the table has bedding).
fn directions(file: &std::path::Path, frame: ShallowFrame, notes: &mut Vec<String>) -> Result<Vec<Direction>> {
    let set = read_directions(&Table::read(file)?, &GroupBy::None)?;
    let input = shallowing_directions(&set, frame == ShallowFrame::Tilt)?;
    if input.no_bedding {
        notes.push("The table has no bedding columns: the directions are used as given (no tilt correction).".into());
    }
    Ok(input.directions)
}

pub fn run(a: UnflattenArgs, ctx: &mut Ctx) -> Result<Presentation> {
    ctx.inputs.add(&a.file);
    let mut notes = Vec::new();
    let dirs = directions(&a.file, a.frame, &mut notes)?;
    let fname = a.file.display().to_string();
    if let Some(f) = a.factor {
        if a.plot.is_some() {
            notes.push("--plot draws the elongation–inclination search; with --factor there is no figure.".into());
        }
        return by_factor(&dirs, f, &fname, notes);
    }
    if lodestone::montecarlo::check_resamples(a.resamples).is_err() {
        bail!("--resamples must be at least {MIN_RESAMPLES} for the intervals, got {}", a.resamples);
    }
    if dirs.len() < MIN_DIRECTIONS {
        bail!(
            "{fname}: {} directions; the elongation/inclination method needs at least {MIN_DIRECTIONS} (and about {RECOMMENDED_DIRECTIONS} or more to be reliable); use --factor with a known factor instead",
            dirs.len()
        );
    }
    let kept = if a.plot.is_some() { PATHS_DRAWN } else { 0 };
    let r = unflatten_search(&dirs, &ctx.monte_carlo(a.resamples), kept)?;
    if let Some(path) = &a.plot {
        let name = a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
        let fig = UnflattenFigure { title: format!("Inclination shallowing — {name}"), result: r.clone() };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(present::unflatten::search(&r, &fname, ctx.global.seed, notes))
}

/// `--factor`: unflatten by a given factor and compare the Fisher means.
fn by_factor(dirs: &[Direction], f: f64, fname: &str, notes: Vec<String>) -> Result<Presentation> {
    let r = unflatten_given(dirs, f).map_err(|e| anyhow::anyhow!("--factor {e}"))?;
    let (Some(m0), Some(m1)) = (r.observed.mean, r.corrected.mean) else {
        bail!("{fname}: the directions have no mean (R ≈ 0)");
    };
    let vectors: Vec<_> = dirs.iter().map(|d| d.to_vector()).collect();
    let elongation = elongation_of(&vectors).ok().map(|e| e.e);
    let given = GivenFactor { file: fname, n: dirs.len(), f, elongation, means: (m0, m1) };
    Ok(present::unflatten::by_factor(&r, &given, notes))
}
