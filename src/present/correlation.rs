//! A correlation of a polarity column with a time scale: the ranked candidates, the ties of every
//! candidate, the runs and accumulation rates of the best, and the age of each level, as the
//! `correlate` verb prints them and the `section` run writes them (`correlations`, `ties`, `rates`
//! and `age-model` tables).

use super::keyed::Keyed;
use super::{cautions, json_num, Cell, Presentation, Sheet};
use crate::model::StratAxis;
use crate::strat::{comparison_sentence, Candidate, CorrelateOptions, Correlation, Reading, ZonePolarity};
use serde::Serialize;

/// Title of the ties sheet.
pub const TIES_TITLE: &str = "Tie points of every candidate";

/// The labels a correlation's presentation needs besides the result.
#[derive(Debug, Clone, Copy)]
pub struct CorrelationLabels<'a> {
    /// The zones (or levels) file as given.
    pub zones: &'a str,
    /// The time-scale file as given.
    pub timescale: &'a str,
}

/// The ranked candidates: score, mean rate, ties, missing chrons, skipped zones, age span.
pub fn candidates_sheet(res: &Correlation, title: &str) -> Sheet {
    let mut sheet = Sheet::new(
        title,
        &["rank", "score", "mean_rate_cm_kyr", "ties", "missing_chrons", "skipped_zones", "top_age", "base_age"],
    );
    for c in &res.candidates {
        let am = &c.age_model;
        sheet.push(vec![
            Cell::Int(c.rank as i64),
            Cell::Num(c.score, 2),
            Cell::Num(c.mean_rate, 2),
            Cell::Int(c.ties.len() as i64),
            Cell::Int(c.missing_chrons as i64),
            Cell::Int(c.skipped_zones as i64),
            Cell::opt(am.first().map(|p| p.age), 3),
            Cell::opt(am.last().map(|p| p.age), 3),
        ]);
    }
    sheet
}

/// The tie points of every candidate, by rank.
pub fn ties_sheet(res: &Correlation, axis: StratAxis) -> Sheet {
    let mut sheet =
        Sheet::new(TIES_TITLE, &["rank", axis.column(), "low", "high", "age", "chron_above", "chron_below"]);
    for c in &res.candidates {
        for t in &c.ties {
            sheet.push(vec![
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
    sheet
}

/// The runs between ties of one candidate, with their ages and accumulation rates (cm/kyr).
pub fn runs_sheet(best: &Candidate) -> Sheet {
    let mut sheet = Sheet::new(
        "Age model of the best candidate: runs and accumulation rates (cm/kyr)",
        &["top", "base", "age_young", "age_old", "rate", "reading", "missing"],
    );
    for r in &best.runs {
        sheet.push(vec![
            Cell::Num(r.top, 3),
            Cell::Num(r.base, 3),
            Cell::Num(r.age_young, 3),
            Cell::Num(r.age_old, 3),
            Cell::opt(r.rate, 2),
            Cell::Text(reading_word(r.reading).into()),
            Cell::Text(r.missing.join(" ")),
        ]);
    }
    sheet
}

/// One sampled level: its name, position and polarity class.
pub type NamedLevel<'a> = (&'a str, f64, ZonePolarity);

/// The age of each level under a candidate's age model (empty where the model gives none).
pub fn ages_sheet(best: &Candidate, axis: StratAxis, levels: &[NamedLevel<'_>]) -> Sheet {
    let mut sheet =
        Sheet::new("Age of each level from the best correlation", &["site", axis.column(), "age", "polarity"]);
    for &(site, position, polarity) in levels {
        sheet.push(vec![
            Cell::Text(site.into()),
            Cell::Num(position, 3),
            Cell::opt(best.age_at(position, axis), 3),
            Cell::Text(polarity.code().into()),
        ]);
    }
    sheet
}

/// How a run was read, as one word.
fn reading_word(r: Reading) -> &'static str {
    match r {
        Reading::Complete => "complete",
        Reading::Unsampled => "unsampled",
        Reading::Hiatus => "hiatus",
    }
}

/// Sentences reading a correlation: how many candidates, the comparison of the best two, how end
/// runs and boundaries are read.
pub fn correlation_notes(res: &Correlation) -> Vec<String> {
    let mut notes = Vec::new();
    if res.candidates.len() < 5 {
        notes.push(format!("Only {} distinct candidates fit this column and time scale.", res.candidates.len()));
    }
    notes.push(comparison_sentence(res));
    notes.push("End runs have no rate of their own: their ages are extrapolated at the candidate's mean rate. Rates between ties use boundary midpoints; each boundary may lie anywhere in its sampling gap.".into());
    notes
}

/// The correlation as the `correlate` verb shows it: the ranked candidates, the ties (the main
/// sheet), the best candidate's runs; `notes` (about how the inputs were read) come first, then
/// [`correlation_notes`], then the caution.
pub fn correlation(
    res: &Correlation,
    axis: StratAxis,
    opts: &CorrelateOptions,
    labels: CorrelationLabels<'_>,
    mut notes: Vec<String>,
) -> Presentation {
    let title = format!("Correlations of {} with {} (lower score is better)", labels.zones, labels.timescale);
    let sheets = vec![candidates_sheet(res, &title), ties_sheet(res, axis), runs_sheet(&res.candidates[0])];
    notes.extend(correlation_notes(res));
    let cautions = vec![cautions::CORRELATION.to_string()];
    let all_notes: Vec<&str> = notes.iter().chain(&cautions).map(String::as_str).collect();
    let key = axis.column();
    let view = CorrelationView {
        zones: labels.zones,
        timescale: labels.timescale,
        axis: key,
        settings: SettingsView {
            miss_penalty: opts.miss_penalty,
            hiatus_penalty: opts.hiatus_penalty,
            skip_penalty: opts.skip_penalty,
            rate_spread: opts.rate_spread,
            anchors: &opts.anchors,
        },
        n_scored: res.n_scored,
        candidates: res.candidates.iter().map(|c| candidate_view(key, c)).collect(),
        comparison: comparison_sentence(res),
        notes: all_notes,
    };
    let json = serde_json::to_value(&view).expect("a correlation view serializes");
    Presentation { json, sheets, main_sheet: 1, notes, cautions }
}

fn candidate_view<'a>(key: &'a str, c: &'a Candidate) -> CandidateView<'a> {
    CandidateView {
        rank: c.rank,
        score: c.score,
        mean_rate: c.mean_rate,
        rate_misfit: c.rate_misfit,
        missing_chrons: c.missing_chrons,
        skipped_zones: c.skipped_zones,
        ties: c
            .ties
            .iter()
            .map(|t| TieView {
                at: Keyed { name: key, value: t.position },
                low: t.low,
                high: t.high,
                age: t.age,
                chron_above: &t.chron_above,
                chron_below: &t.chron_below,
            })
            .collect(),
        rates: c
            .runs
            .iter()
            .map(|r| RunView {
                top: r.top,
                base: r.base,
                age_young: r.age_young,
                age_old: r.age_old,
                rate: r.rate,
                chrons: &r.chrons,
                missing: &r.missing,
                reading: r.reading,
                skipped_zones: r.skipped_zones,
                section_end: r.end,
            })
            .collect(),
        age_model: c
            .age_model
            .iter()
            .map(|p| AgeView { at: Keyed { name: key, value: p.position }, age: p.age })
            .collect(),
    }
}

#[derive(Serialize)]
struct CorrelationView<'a> {
    zones: &'a str,
    timescale: &'a str,
    axis: &'a str,
    settings: SettingsView<'a>,
    n_scored: usize,
    candidates: Vec<CandidateView<'a>>,
    comparison: String,
    notes: Vec<&'a str>,
}

#[derive(Serialize)]
struct SettingsView<'a> {
    miss_penalty: f64,
    hiatus_penalty: f64,
    skip_penalty: f64,
    rate_spread: f64,
    anchors: &'a [crate::strat::DatedLevel],
}

#[derive(Serialize)]
struct CandidateView<'a> {
    rank: usize,
    score: f64,
    mean_rate: f64,
    rate_misfit: f64,
    missing_chrons: usize,
    skipped_zones: usize,
    ties: Vec<TieView<'a>>,
    rates: Vec<RunView<'a>>,
    age_model: Vec<AgeView<'a>>,
}

#[derive(Serialize)]
struct TieView<'a> {
    #[serde(flatten)]
    at: Keyed<'a>,
    low: f64,
    high: f64,
    age: f64,
    chron_above: &'a str,
    chron_below: &'a str,
}

#[derive(Serialize)]
struct RunView<'a> {
    top: f64,
    base: f64,
    age_young: f64,
    age_old: f64,
    #[serde(serialize_with = "json_num::opt")]
    rate: Option<f64>,
    chrons: &'a [String],
    missing: &'a [String],
    reading: Reading,
    skipped_zones: usize,
    section_end: bool,
}

#[derive(Serialize)]
struct AgeView<'a> {
    #[serde(flatten)]
    at: Keyed<'a>,
    age: f64,
}
