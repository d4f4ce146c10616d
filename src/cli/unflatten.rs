//! `lodestone unflatten`: correction of inclination shallowing in sediments.

use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::dirstats::{
    elongation_of, shallowing_directions, unflatten_given, unflatten_search, Tk03, MIN_DIRECTIONS,
    RECOMMENDED_DIRECTIONS,
};
use lodestone::figures::UnflattenFigure;
use lodestone::sphere::Direction;
use lodestone::table::{read_directions, GroupBy, Table};
use serde_json::json;
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
    if a.resamples < 100 {
        bail!("--resamples must be at least 100 for the intervals, got {}", a.resamples);
    }
    if dirs.len() < MIN_DIRECTIONS {
        bail!(
            "{fname}: {} directions; the elongation/inclination method needs at least {MIN_DIRECTIONS} (and about {RECOMMENDED_DIRECTIONS} or more to be reliable); use --factor with a known factor instead",
            dirs.len()
        );
    }
    let kept = if a.plot.is_some() { PATHS_DRAWN } else { 0 };
    let r = unflatten_search(&dirs, &ctx.monte_carlo(a.resamples), kept)?;
    let mut sec = Sheet::new(
        &format!("Inclination shallowing of {fname} (elongation/inclination method, TK03 field model)"),
        &["n", "f", "f_low", "f_high", "inc_observed", "inc_corrected", "inc_low", "inc_high", "elongation"],
    );
    sec.rows.push(vec![
        Cell::Int(r.n as i64),
        Cell::opt(r.f, 3),
        Cell::opt(r.f_low, 3),
        Cell::opt(r.f_high, 3),
        Cell::Num(r.inc_observed, 1),
        Cell::opt(r.inc_corrected, 1),
        Cell::opt(r.inc_low, 1),
        Cell::opt(r.inc_high, 1),
        Cell::Num(r.elongation, 3),
    ]);
    search_notes(&r, &mut notes, ctx.global.seed);
    if let Some(path) = &a.plot {
        let name = a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
        let fig = UnflattenFigure { title: format!("Inclination shallowing — {name}"), result: r.clone() };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    let m = Tk03::standard();
    Ok(Presentation {
        json: json!({
            "file": fname, "method": "elongation_inclination",
            "n": r.n, "f": jnum(r.f), "f_low": jnum(r.f_low), "f_high": jnum(r.f_high),
            "inc_observed": r.inc_observed, "inc_corrected": jnum(r.inc_corrected),
            "inc_low": jnum(r.inc_low), "inc_high": jnum(r.inc_high),
            "elongation": r.elongation, "elongation_dec": r.elongation_dec, "meridional": r.meridional,
            "resamples": r.resamples, "no_crossing": r.no_crossing, "seed": ctx.global.seed,
            "model": {
                "name": "TK03", "curve": "E = 2.895 - 0.01466 I - 3.525e-4 I^2 + 3.160e-6 I^3",
                "g10": m.g10, "alpha": m.alpha, "beta": m.beta, "core_ratio": m.core_ratio,
            },
            "notes": notes,
        }),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}

/// The cautions of the elongation/inclination search.
fn search_notes(r: &lodestone::dirstats::UnflattenResult, notes: &mut Vec<String>, seed: u64) {
    if r.n < RECOMMENDED_DIRECTIONS {
        notes.push(format!(
            "Only {} directions: the elongation/inclination method needs many directions (about {RECOMMENDED_DIRECTIONS} or more); with fewer, f and the corrected inclination are rough.",
            r.n
        ));
    }
    match r.f {
        None => notes.push("The data's path does not meet the TK03 curve for f between 1 and 0.2: no correction is estimated (the scatter does not look like that of the field model).".into()),
        Some(f) if f >= 1.0 => notes.push("At f = 1 the data already lie on or above the model curve: no shallowing is detected (f = 1).".into()),
        Some(_) => {}
    }
    if r.no_crossing > 0 {
        notes.push(format!(
            "{} of {} bootstrap pseudo-samples never met the curve and are left out of the intervals.",
            r.no_crossing, r.resamples
        ));
    }
    if !r.meridional {
        notes.push(format!(
            "The observed elongation is east–west (axis at declination {:.0}°), as shallowing produces; the search measures it as 1/E along the meridian.",
            r.elongation_dec
        ));
    }
    notes.push(format!(
        "The correction assumes that the TK03 statistical field model describes the ancient field's scatter and that shallowing follows tan I_f = f tan I₀; f and the corrected inclination are statements about that model, not measurements. Local practice and the published literature decide whether it applies. Intervals: seeded bootstrap of directions (seed {seed}, {} pseudo-samples, 2.5–97.5 %).",
        r.resamples
    ));
}

/// `--factor`: unflatten by a given factor and compare the Fisher means.
fn by_factor(dirs: &[Direction], f: f64, fname: &str, mut notes: Vec<String>) -> Result<Presentation> {
    let r = unflatten_given(dirs, f).map_err(|e| anyhow::anyhow!("--factor {e}"))?;
    let (Some(m0), Some(m1)) = (r.observed.mean, r.corrected.mean) else {
        bail!("{fname}: the directions have no mean (R ≈ 0)");
    };
    let a95 = r.corrected.alpha;
    let vectors: Vec<_> = dirs.iter().map(|d| d.to_vector()).collect();
    let elongation = elongation_of(&vectors).ok().map(|e| e.e);
    let (lo, hi) = r.inc_range().unzip();
    let mut sec = Sheet::new(
        &format!("Inclination of {fname} unflattened by the given factor f = {f}"),
        &["n", "f", "inc_observed", "inc_corrected", "inc_low", "inc_high", "a95_observed", "a95_corrected", "dec"],
    );
    sec.rows.push(vec![
        Cell::Int(dirs.len() as i64),
        Cell::Num(f, 3),
        Cell::Num(m0.inc, 1),
        Cell::Num(m1.inc, 1),
        Cell::opt(lo, 1),
        Cell::opt(hi, 1),
        Cell::opt(r.observed.alpha, 1),
        Cell::opt(a95, 1),
        Cell::Azimuth(m1.dec, 1),
    ]);
    notes.push(format!(
        "f = {f} is an assumption supplied on the command line, not estimated from these data: the corrected mean is only as good as that factor (tan I₀ = tan I_f / f applied to every direction, King 1955)."
    ));
    notes.push("inc_low and inc_high are the corrected mean inclination ∓ the corrected α95; unflattening spreads the directions, so α95 changes too.".into());
    Ok(Presentation {
        json: json!({
            "file": fname, "method": "factor",
            "n": dirs.len(), "f": f, "f_low": null, "f_high": null,
            "inc_observed": m0.inc, "inc_corrected": m1.inc, "inc_low": jnum(lo), "inc_high": jnum(hi),
            "elongation": jnum(elongation),
            "dec_observed": m0.dec, "dec_corrected": m1.dec,
            "a95_observed": jnum(r.observed.alpha), "a95_corrected": jnum(a95),
            "k_observed": jnum(r.observed.k.map(|k| k.0)), "k_corrected": jnum(r.corrected.k.map(|k| k.0)),
            "notes": notes,
        }),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}
