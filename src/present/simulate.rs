//! Presenters of synthetic data: a time scale drawn from a renewal model, and a sampled section
//! written as a project folder (its chrons, and the sampling plan of its grid of levels).

use super::{Cell, Presentation, Sheet};
use crate::model::{Polarity, TimeScale};
use crate::simulate::{sampling_plan, PlanRow, RecordedChron, SectionModel, SyntheticSection, TimeScaleModel};
use crate::units::cm_per_kyr_to_m_per_myr;
use serde::Serialize;
use std::path::Path;

use super::cautions::{SYNTHETIC_SECTION, SYNTHETIC_TIMESCALE};

#[derive(Serialize)]
struct ChronView<'a> {
    name: &'a Option<String>,
    young: f64,
    old: f64,
    polarity: Polarity,
}

#[derive(Serialize)]
struct TimescaleView<'a> {
    seed: u64,
    model: &'a TimeScaleModel,
    n_chrons: usize,
    n_complete: usize,
    mean_complete: Option<f64>,
    chrons: Vec<ChronView<'a>>,
    out: Option<String>,
    notes: &'a [String],
}

/// A time scale `ts` drawn from `m` with `seed` (and written to `out`, if given).
pub fn synthetic_timescale(ts: &TimeScale, m: &TimeScaleModel, seed: u64, out: Option<&Path>) -> Presentation {
    let named = ts.chrons.iter().any(|c| c.name.is_some());
    let mut cols = vec!["young", "old", "polarity"];
    if named {
        cols.insert(0, "name");
    }
    let mut sheet = Sheet::new(&format!("Synthetic {} time scale, seed {seed}", m.model.model.name()), &cols);
    for c in &ts.chrons {
        let mut row = vec![Cell::Num(c.young, 6), Cell::Num(c.old, 6), Cell::Text(c.polarity.code().into())];
        if named {
            row.insert(0, Cell::opt_text(c.name.as_deref()));
        }
        sheet.push(row);
    }
    // The youngest and oldest chrons are cut by the ends of the span: only the others are complete.
    let n = ts.chrons.len();
    let complete: &[_] = if n > 2 { &ts.chrons[1..n - 1] } else { &[] };
    let mean_complete =
        (!complete.is_empty()).then(|| complete.iter().map(|c| c.duration()).sum::<f64>() / complete.len() as f64);
    let mut notes = vec![
        format!(
            "{n} chrons over {} Myr; {} complete intervals (the youngest and oldest chrons are cut by the ends of the span){}; model mean {:.4} Myr.",
            m.span,
            complete.len(),
            mean_complete.map(|x| format!(", mean length {x:.4} Myr")).unwrap_or_default(),
            m.model.mean()
        ),
        SYNTHETIC_TIMESCALE.to_string(),
    ];
    if let Some(p) = out {
        notes.push(format!("Wrote {}.", p.display()));
    }
    let view = TimescaleView {
        seed,
        model: m,
        n_chrons: n,
        n_complete: complete.len(),
        mean_complete,
        chrons: ts
            .chrons
            .iter()
            .map(|c| ChronView { name: &c.name, young: c.young, old: c.old, polarity: c.polarity })
            .collect(),
        out: out.map(|p| p.display().to_string()),
        notes: &notes,
    };
    let json = serde_json::to_value(&view).expect("a time scale view serializes");
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions: vec![] }
}

#[derive(Serialize)]
struct SectionView<'a> {
    out: String,
    seed: u64,
    files: &'a [&'a str],
    thickness: f64,
    n_levels: usize,
    n_specimens: usize,
    chrons: &'a [RecordedChron],
    ties: &'a [crate::simulate::TrueTie],
    missed: Vec<String>,
    plan: &'a [PlanRow],
    single_level: Vec<String>,
    notes: &'a [String],
}

/// A synthetic section `sec` drawn from `model` with `seed` and written to the folder `out` as
/// `files`: its chrons with the levels they hold, and the sampling plan of its grid.
pub fn synthetic_section(
    model: &SectionModel,
    sec: &SyntheticSection,
    seed: u64,
    out: &Path,
    files: &[&str],
) -> Presentation {
    let (missed, thin) = sparse_chrons(sec);
    let spans = &sec.history.spans;
    let min_rate = spans.iter().filter(|s| s.rate > 0.0).map(|s| s.rate).fold(f64::INFINITY, f64::min);
    let max_rate = spans.iter().map(|s| s.rate).fold(0.0, f64::max);
    let rates = if max_rate > min_rate { vec![min_rate, max_rate] } else { vec![min_rate] };
    let plan = sampling_plan(model.spacing, &rates);
    let complete = sec.chrons.iter().filter(|c| c.complete).count();
    let mut notes = vec![
        format!("Wrote {} (steps, sampling, time scale, settings, truth).", out.display()),
        format!(
            "Sampling check: {} of {complete} complete chrons hold no level and {} hold only one (a single level cannot make a magnetozone).{}",
            missed.len(),
            thin.len(),
            if missed.is_empty() { String::new() } else { format!(" Missed: {}.", missed.join(", ")) }
        ),
        // A chron of length t Myr at r cm/kyr is chron_thickness(t, r) m thick: it holds at least one
        // level for sure only if that exceeds the spacing, and at least two only if it exceeds twice it.
        format!(
            "At the slowest rate ({min_rate} cm/kyr) chrons shorter than {:.4} Myr can fall between levels, and chrons shorter than {:.4} Myr hold fewer than two.",
            model.spacing / cm_per_kyr_to_m_per_myr(min_rate),
            2.0 * model.spacing / cm_per_kyr_to_m_per_myr(min_rate)
        ),
    ];
    if spans.iter().any(|s| s.rate == 0.0) {
        notes.push("The rate history has a hiatus: chrons inside it leave no rock and no record.".into());
    }
    notes.push(SYNTHETIC_SECTION.into());
    let sheets = vec![chron_sheet(model, sec), plan_sheet(model.spacing, &plan)];
    let view = SectionView {
        out: out.display().to_string(),
        seed,
        files,
        thickness: sec.history.thickness(),
        n_levels: sec.levels.len(),
        n_specimens: sec.specimens.len(),
        chrons: &sec.chrons,
        ties: &sec.ties,
        missed,
        plan: &plan,
        single_level: thin,
        notes: &notes,
    };
    let json = serde_json::to_value(&view).expect("a section view serializes");
    Presentation { json, sheets, main_sheet: 0, notes, cautions: vec![] }
}

/// A chron's label: its name, or `#` and its number in the time scale.
fn label(c: &RecordedChron) -> String {
    c.name.clone().unwrap_or_else(|| format!("#{}", c.index + 1))
}

/// The complete chrons that hold no level, and those that hold one.
fn sparse_chrons(sec: &SyntheticSection) -> (Vec<String>, Vec<String>) {
    let with = |n: usize| sec.chrons.iter().filter(|c| c.complete && c.n_levels == n).map(label).collect();
    (with(0), with(1))
}

/// The chrons of the section with their status.
fn chron_sheet(model: &SectionModel, sec: &SyntheticSection) -> Sheet {
    let mut sheet = Sheet::new(
        &format!(
            "Chrons in the synthetic section ({} m, {} levels every {} m)",
            (sec.history.thickness() * 1000.0).round() / 1000.0,
            sec.levels.len(),
            model.spacing
        ),
        &["chron", "polarity", "young", "old", "base", "top", "thickness", "n_levels", "status"],
    );
    for c in &sec.chrons {
        sheet.push(vec![
            Cell::Text(label(c)),
            Cell::Text(c.polarity.code().into()),
            Cell::Num(c.young, 4),
            Cell::Num(c.old, 4),
            Cell::Num(c.base, 2),
            Cell::Num(c.top, 2),
            Cell::Num(c.top - c.base, 2),
            Cell::Int(c.n_levels as i64),
            Cell::Text(c.status(model.top_age, model.base_age).into()),
        ]);
    }
    sheet
}

/// The chance that a chron of a given length holds one / two levels, rate by rate.
fn plan_sheet(spacing: f64, plan: &[PlanRow]) -> Sheet {
    let mut sheet = Sheet::new(
        &format!("Sampling plan: chance that a chron holds at least one / two levels every {spacing} m (random position against the grid)"),
        &["length", "rate", "thickness", "p_one", "p_two"],
    );
    for r in plan {
        sheet.push(vec![
            Cell::Num(r.length, 3),
            Cell::Num(r.rate, 2),
            Cell::Num(r.thickness, 3),
            Cell::Num(r.p_one, 3),
            Cell::Num(r.p_two, 3),
        ]);
    }
    sheet
}
