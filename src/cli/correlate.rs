//! `lodestone correlate`: rank correlations of a polarity column with a time scale.

use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::{bail, Context, Result};
use clap::Args;
use lodestone::figures::ColumnFigure;
use lodestone::model::TimeScale;
use lodestone::strat::{
    comparison_sentence, correlate, read_column, Candidate, CorrelateOptions, Correlation, DatedLevel, ZoneColumn,
};
use lodestone::table::Table;
use serde_json::{json, Value};
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
    #[arg(long, default_value_t = 2.0)]
    pub miss_penalty: f64,
    /// Score added once per run read as containing a hiatus.
    #[arg(long, default_value_t = 6.0)]
    pub hiatus_penalty: f64,
    /// Score added per single-level zone left out of a correlation.
    #[arg(long, default_value_t = 2.0)]
    pub skip_penalty: f64,
    /// Accepted spread of the natural log of the accumulation rate.
    #[arg(long, default_value_t = 0.25)]
    pub rate_spread: f64,
    /// Number of ranked candidates to show.
    #[arg(long, default_value_t = 5)]
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
    let axis = col.axis.column();
    let (summary, ties_sec) = candidate_sections(&a, axis, &res);
    let cands: Vec<Value> = res.candidates.iter().map(|c| candidate_json(axis, c)).collect();
    let best = &res.candidates[0];
    let sentence = comparison_sentence(&res);
    if res.candidates.len() < 5 {
        notes.push(format!("Only {} distinct candidates fit this column and time scale.", res.candidates.len()));
    }
    notes.push(sentence.clone());
    notes.push("End runs have no rate of their own: their ages are extrapolated at the candidate's mean rate. Rates between ties use boundary midpoints; each boundary may lie anywhere in its sampling gap.".into());
    notes.push("Caution: the ranking is a statistical statement about a steady-rate model, not proof of the correlation. Independent age control (dated beds as --anchor, biostratigraphy), local practice and the published literature decide.".into());
    if let Some(path) = &a.plot {
        let file_name = |p: &PathBuf| p.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
        let title = format!("{} against {}", file_name(&a.zones), file_name(&a.timescale));
        let fig = ColumnFigure::of_correlation(title, &col, levels, a.threshold, &ts, best);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "zones": a.zones.display().to_string(), "timescale": a.timescale.display().to_string(), "axis": axis,
            "settings": {"miss_penalty": a.miss_penalty, "hiatus_penalty": a.hiatus_penalty, "skip_penalty": a.skip_penalty,
                "rate_spread": a.rate_spread, "anchors": opts.anchors},
            "n_scored": res.n_scored, "candidates": cands, "comparison": sentence, "notes": notes,
        }),
        sheets: vec![summary, ties_sec, runs_section(best)],
        main_sheet: 1,
        cautions: vec![],
        notes,
    })
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

/// The ranked candidates and the ties of every candidate.
fn candidate_sections(a: &CorrelateArgs, axis: &str, res: &Correlation) -> (Sheet, Sheet) {
    let mut summary = Sheet::new(
        &format!("Correlations of {} with {} (lower score is better)", a.zones.display(), a.timescale.display()),
        &["rank", "score", "mean_rate_cm_kyr", "ties", "missing_chrons", "skipped_zones", "top_age", "base_age"],
    );
    let mut ties_sec = Sheet::new(
        "Tie points of every candidate",
        &["rank", axis, "low", "high", "age", "chron_above", "chron_below"],
    );
    for c in &res.candidates {
        let am = &c.age_model;
        summary.rows.push(vec![
            Cell::Int(c.rank as i64),
            Cell::Num(c.score, 2),
            Cell::Num(c.mean_rate, 2),
            Cell::Int(c.ties.len() as i64),
            Cell::Int(c.missing_chrons as i64),
            Cell::Int(c.skipped_zones as i64),
            Cell::Num(am[0].age, 3),
            Cell::Num(am[am.len() - 1].age, 3),
        ]);
        for t in &c.ties {
            ties_sec.rows.push(vec![
                Cell::Int(c.rank as i64),
                Cell::Num(t.position, 3),
                Cell::Num(t.low, 3),
                Cell::Num(t.high, 3),
                Cell::Num(t.age, 3),
                Cell::Text(t.chron_above.clone()),
                Cell::Text(t.chron_below.clone()),
            ]);
        }
    }
    (summary, ties_sec)
}

fn candidate_json(axis: &str, c: &Candidate) -> Value {
    json!({
        "rank": c.rank, "score": c.score, "mean_rate": c.mean_rate, "rate_misfit": c.rate_misfit,
        "missing_chrons": c.missing_chrons, "skipped_zones": c.skipped_zones,
        "ties": c.ties.iter().map(|t| json!({axis: t.position, "low": t.low, "high": t.high, "age": t.age,
            "chron_above": t.chron_above, "chron_below": t.chron_below})).collect::<Vec<_>>(),
        "rates": c.runs.iter().map(|r| json!({"top": r.top, "base": r.base, "age_young": r.age_young, "age_old": r.age_old,
            "rate": jnum(r.rate), "chrons": r.chrons, "missing": r.missing, "reading": r.reading,
            "skipped_zones": r.skipped_zones, "section_end": r.end})).collect::<Vec<_>>(),
        "age_model": c.age_model.iter().map(|p| json!({axis: p.position, "age": p.age})).collect::<Vec<_>>(),
    })
}

fn runs_section(best: &Candidate) -> Sheet {
    let mut runs = Sheet::new(
        "Age model of the best candidate: runs and accumulation rates (cm/kyr)",
        &["top", "base", "age_young", "age_old", "rate", "reading", "missing"],
    );
    for r in &best.runs {
        runs.rows.push(vec![
            Cell::Num(r.top, 3),
            Cell::Num(r.base, 3),
            Cell::Num(r.age_young, 3),
            Cell::Num(r.age_old, 3),
            Cell::opt(r.rate, 2),
            Cell::Text(format!("{:?}", r.reading).to_lowercase()),
            Cell::Text(r.missing.join(" ")),
        ]);
    }
    runs
}
