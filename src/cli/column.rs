//! `lodestone column`: polarity per level and magnetozones.

use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::figures::ColumnFigure;
use lodestone::present::{self, column::ColumnLabels};
use lodestone::strat::{read_levels, zone_levels, LevelOptions};
use lodestone::table::Table;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct ColumnArgs {
    /// Levels: a directions table with height or depth and lat/lon, or a table with a vgp_lat column.
    pub file: PathBuf,
    /// VGP latitude (degrees) at and beyond which a level is normal (north) or reversed (south).
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_THRESHOLD)]
    pub threshold: f64,
    /// Zones resting on fewer levels than this are reported as single-level (unconfirmed) zones.
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_MIN_LEVELS)]
    pub min_levels: usize,
    /// Use in-situ directions even where bedding columns are given (default: tilt-corrected).
    #[arg(long)]
    pub in_situ: bool,
    /// Write the polarity-column figure (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

pub fn run(a: ColumnArgs, ctx: &mut Ctx) -> Result<Presentation> {
    ctx.inputs.add(&a.file);
    let table = Table::read(&a.file)?;
    let set = read_levels(&table, LevelOptions { in_situ: a.in_situ })?;
    let (pol, col) = zone_levels(&set, a.threshold, a.min_levels)?;
    let file = a.file.display().to_string();
    let labels = ColumnLabels { file: &file, threshold: a.threshold, min_levels: a.min_levels };
    let shown = present::column::column(&set, &pol, &col, labels);
    if let Some(path) = &a.plot {
        let title = format!(
            "Polarity column — {}",
            a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()
        );
        let fig = ColumnFigure::of_column(title, &set, &col, a.threshold);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(shown)
}
