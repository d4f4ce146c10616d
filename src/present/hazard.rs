//! The hazard of a reversal at an elapsed time, per fitted renewal model and averaged by Akaike
//! weight, as the `hazard` verb prints it and the `section` run writes it (`hazard` table). Its
//! cautions are [`cautions::REVERSALS`].

use super::intervals::{model_columns, param_cells, Params, PARAM_COLUMNS};
use super::{cautions, json_num, Cell, Presentation, Sheet};
use crate::reversals::HazardEstimate;

/// The row label of the Akaike-weighted average.
pub const AVERAGED: &str = "averaged (Akaike weights)";

/// Per model: parameters, weight, hazard (per Myr), survival, P(reversal within the horizon | none
/// so far) and the distribution function at the elapsed time; then the averaged probability. With
/// `interval_columns`, `low` and `high` hold the bootstrap interval of the averaged probability.
pub fn hazard_sheet(est: &HazardEstimate, title: &str, interval_columns: bool) -> Sheet {
    let mut rest = vec!["weight", "hazard", "survival", "p_within", "cdf"];
    if interval_columns {
        rest.extend(["low", "high"]);
    }
    let mut sheet = Sheet { title: title.into(), columns: model_columns(&rest), rows: vec![] };
    let blank = |n: usize| std::iter::repeat_n(Cell::Empty, n);
    for m in &est.models {
        let mut row = vec![Cell::Text(m.fitted.model.name().into())];
        row.extend(param_cells(&m.fitted));
        row.extend([
            Cell::Num(m.weight, 3),
            Cell::Num(m.hazard, 3),
            Cell::Num(m.survival, 4),
            Cell::opt(m.p_within, 4),
            Cell::Num(m.cdf, 3),
        ]);
        if interval_columns {
            row.extend(blank(2));
        }
        sheet.push(row);
    }
    let mut avg = vec![Cell::Text(AVERAGED.into())];
    avg.extend(blank(PARAM_COLUMNS.len()));
    avg.extend([Cell::Num(1.0, 3), Cell::Empty, Cell::Empty, Cell::Num(est.averaged, 4), Cell::Empty]);
    if interval_columns {
        avg.extend([Cell::opt(est.interval.map(|b| b.low), 4), Cell::opt(est.interval.map(|b| b.high), 4)]);
    }
    sheet.push(avg);
    sheet
}

/// The labels the hazard's presentation needs besides the result.
#[derive(Debug, Clone, Copy)]
pub struct HazardLabels<'a> {
    /// The time-scale file as given.
    pub file: &'a str,
    /// Complete intervals the models were fitted to.
    pub n_intervals: usize,
    /// Right-censored lengths at the young and the old end, Myr.
    pub censored: (Option<f64>, Option<f64>),
    /// Confidence level asked for the interval of the averaged probability.
    pub level: f64,
    /// Seed of the Monte Carlo streams.
    pub seed: u64,
}

/// The hazard as the `hazard` verb shows it: one sheet; `notes` (how the intervals were cut, why
/// no interval) come first, then the averaged probability with its interval and the elapsed
/// time's percentile; the cautions are [`cautions::REVERSALS`].
pub fn hazard(est: &HazardEstimate, labels: HazardLabels<'_>, mut notes: Vec<String>) -> Presentation {
    let (elapsed, horizon) = (est.elapsed, est.horizon);
    if let Some(b) = est.interval {
        notes.push(format!(
            "Akaike-weighted P(reversal within {horizon} Myr) = {:.3}, {:.0} % bootstrap interval {:.3} – {:.3} ({} resamples of the intervals, all models refitted, seed {}).",
            est.averaged, b.level * 100.0, b.low, b.high, b.resamples, labels.seed
        ));
    }
    notes.push(format!(
        "{elapsed} Myr is longer than {:.0} % of the {} complete intervals.",
        est.percentile, labels.n_intervals
    ));
    let cautions: Vec<String> = cautions::REVERSALS.iter().map(|s| s.to_string()).collect();
    let title =
        format!("Hazard at {elapsed} Myr since the last reversal; P(reversal within {horizon} Myr | none so far)");
    let sheet = hazard_sheet(est, &title, false);
    let view = HazardView {
        file: labels.file,
        elapsed,
        horizon,
        n_intervals: labels.n_intervals,
        censored: labels.censored.0,
        censored_old: labels.censored.1,
        models: est
            .models
            .iter()
            .map(|m| ModelView {
                model: m.fitted.model.name(),
                params: Params(&m.fitted),
                weight: m.weight,
                hazard: m.hazard,
                survival: m.survival,
                p_within: m.p_within,
                cdf: m.cdf,
            })
            .collect(),
        averaged: AveragedView {
            p_within: est.averaged,
            low: est.interval.map(|b| b.low),
            high: est.interval.map(|b| b.high),
            level: labels.level,
            resamples: est.interval.map(|b| b.resamples),
        },
        percentile: est.percentile,
        cautions: cautions::REVERSALS,
        seed: labels.seed,
        notes: notes.iter().chain(&cautions).map(String::as_str).collect(),
    };
    let json = serde_json::to_value(&view).expect("a hazard view serializes");
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions }
}

#[derive(serde::Serialize)]
struct HazardView<'a> {
    file: &'a str,
    elapsed: f64,
    horizon: f64,
    n_intervals: usize,
    #[serde(serialize_with = "json_num::opt")]
    censored: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    censored_old: Option<f64>,
    models: Vec<ModelView<'a>>,
    averaged: AveragedView,
    percentile: f64,
    cautions: [&'static str; 3],
    seed: u64,
    notes: Vec<&'a str>,
}

#[derive(serde::Serialize)]
struct ModelView<'a> {
    model: &'static str,
    params: Params<'a>,
    weight: f64,
    hazard: f64,
    survival: f64,
    #[serde(serialize_with = "json_num::opt")]
    p_within: Option<f64>,
    cdf: f64,
}

#[derive(serde::Serialize)]
struct AveragedView {
    p_within: f64,
    #[serde(serialize_with = "json_num::opt")]
    low: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    high: Option<f64>,
    level: f64,
    resamples: Option<usize>,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::present::intervals::tests::fitted;
    use crate::reversals::hazard_at;

    #[test]
    fn the_interval_columns_hold_the_averaged_rows_interval_only() {
        let (_, sample, fits) = fitted();
        let mut est = hazard_at(&fits, &sample, 0.3, 0.1).unwrap();
        est.interval = Some(crate::reversals::hazard::BootInterval { low: 0.1, high: 0.4, level: 0.95, resamples: 9 });
        let with = hazard_sheet(&est, "t", true);
        let without = hazard_sheet(&est, "t", false);
        assert_eq!(&with.columns[..without.columns.len()], &without.columns[..]);
        assert_eq!(&with.columns[without.columns.len()..], ["low", "high"]);
        let (last, models) = with.rows.split_last().unwrap();
        assert!(models.iter().all(|r| r[r.len() - 2..] == [Cell::Empty, Cell::Empty]));
        assert_eq!(last[last.len() - 2..], [Cell::Num(0.1, 4), Cell::Num(0.4, 4)]);
        assert_eq!(last[0], Cell::Text(AVERAGED.into()));
    }
}
