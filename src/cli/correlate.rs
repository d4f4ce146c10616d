//! `lodestone correlate`: rank correlations of a polarity column with a time scale.

use super::{Ctx, Presentation};
use anyhow::{bail, Context, Result};
use clap::Args;
use lodestone::figures::ColumnFigure;
use lodestone::model::TimeScale;
use lodestone::present::{self, correlation::CorrelationLabels};
use lodestone::strat::{correlate, read_column, CorrelateOptions, DatedLevel, ZoneColumn};
use lodestone::table::Table;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct CorrelateArgs {
    /// The zones table printed by `column --format csv`, or a levels table (zoned with column's defaults).
    pub zones: PathBuf,
    /// Time scale table (young, old, polarity; optional name), e.g. records/timescales/chrons-0-6ma.csv.
    pub timescale: PathBuf,
    /// A dated bed, POSITION:AGE or POSITION:AGE:UNCERTAINTY (m, Ma, Myr); repeat for several.
    #[arg(long = "anchor", value_name = "POS:AGE[:ERR]")]
    pub anchors: Vec<String>,
    /// Score added per chron missing from the column (hiatus or too short to be sampled).
    #[arg(long, default_value_t = CorrelateOptions::default().miss_penalty)]
    pub miss_penalty: f64,
    /// Score added once per run read as containing a hiatus.
    #[arg(long, default_value_t = CorrelateOptions::default().hiatus_penalty)]
    pub hiatus_penalty: f64,
    /// Score added per single-level zone left out of a correlation.
    #[arg(long, default_value_t = CorrelateOptions::default().skip_penalty)]
    pub skip_penalty: f64,
    /// Accepted spread of the natural log of the accumulation rate.
    #[arg(long, default_value_t = CorrelateOptions::default().rate_spread)]
    pub rate_spread: f64,
    /// Number of ranked candidates to show.
    #[arg(long, default_value_t = CorrelateOptions::default().candidates)]
    pub candidates: usize,
    /// VGP threshold when ZONES is a levels table.
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_THRESHOLD)]
    pub threshold: f64,
    /// Minimum levels of a confirmed zone when ZONES is a levels table.
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_MIN_LEVELS)]
    pub min_levels: usize,
    /// Figure of the column beside the time scale with the best candidate's ties (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

fn parse_anchor(s: &str) -> Result<DatedLevel> {
    let parts: Vec<&str> = s.split(':').collect();
    let num = |x: &str, what: &str| -> Result<f64> {
        x.trim().parse().with_context(|| format!("--anchor {s}: {what} '{x}' is not a number"))
    };
    let (p, age, err) = match parts.as_slice() {
        [p, a] => (num(p, "position")?, num(a, "age")?, 0.0),
        [p, a, e] => (num(p, "position")?, num(a, "age")?, num(e, "uncertainty")?),
        _ => bail!("--anchor {s}: expected POSITION:AGE or POSITION:AGE:UNCERTAINTY"),
    };
    DatedLevel::new(p, age, err).with_context(|| format!("--anchor {s}"))
}

pub fn run(a: CorrelateArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let anchors = a.anchors.iter().map(|s| parse_anchor(s)).collect::<Result<Vec<_>>>()?;
    ctx.inputs.add(&a.zones);
    ctx.inputs.add(&a.timescale);
    let mut notes = Vec::new();
    let (col, ts, levels) = column_of(&a, &mut notes)?;
    let opts = CorrelateOptions {
        miss_penalty: a.miss_penalty,
        hiatus_penalty: a.hiatus_penalty,
        skip_penalty: a.skip_penalty,
        rate_spread: a.rate_spread,
        candidates: a.candidates,
        anchors,
    };
    let res = correlate(&col, &ts, &opts)?;
    let (zones, timescale) = (a.zones.display().to_string(), a.timescale.display().to_string());
    let labels = CorrelationLabels { zones: &zones, timescale: &timescale };
    let shown = present::correlation::correlation(&res, col.axis, &opts, labels, notes);
    if let Some(path) = &a.plot {
        let file_name = |p: &PathBuf| p.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
        let title = format!("{} against {}", file_name(&a.zones), file_name(&a.timescale));
        let fig = ColumnFigure::of_correlation(title, &col, levels, a.threshold, &ts, &res.candidates[0]);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(shown)
}

/// Levels as (position, VGP latitude), for the figure.
type LevelPoints = Vec<(f64, f64)>;

/// The column to correlate (a zones table as `column` writes it, or a levels table zoned here, then
/// with its levels for the figure) and the time scale.
fn column_of(a: &CorrelateArgs, notes: &mut Vec<String>) -> Result<(ZoneColumn, TimeScale, LevelPoints)> {
    let zt = Table::read(&a.zones)?;
    let ts = TimeScale::from_table(&Table::read(&a.timescale)?)?;
    let (col, set) = read_column(&zt, a.threshold, a.min_levels)?;
    let Some(set) = set else { return Ok((col, ts, Vec::new())) };
    notes.extend(set.notes.clone());
    notes.push(format!(
        "{} was read as a levels table and zoned with threshold {}° and min-levels {}.",
        a.zones.display(),
        a.threshold,
        a.min_levels
    ));
    Ok((col, ts, set.levels.iter().map(|l| (l.position, l.vgp_lat)).collect()))
}
