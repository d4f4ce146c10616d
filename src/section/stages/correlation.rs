//! Stage 6: the correlation of the magnetozones with the project's time scale, the ranked
//! candidates, and the age model and accumulation rates of the best one.

use super::column::Column;
use super::inputs::{parse, Inputs};
use super::site_means::UsedSite;
use super::RunLog;
use crate::error::Result;
use crate::figures::ScalePanel;
use crate::model::TimeScale;
use crate::numbers::fixed_or_empty;
use crate::present::cautions;
use crate::present::correlation::{ages_sheet, candidates_sheet, runs_sheet, ties_sheet, NamedLevel};
use crate::section::stage::Stage;
use crate::section::tables::CsvTable;
use crate::section::Project;
use crate::strat::{comparison_sentence, correlate, CorrelateOptions, ZoneColumn};

/// Correlate the column with the time scale, if the project has both; write the stage and its
/// tables. Returns the time-scale panel of the column figure (the chrons the best candidate spans,
/// with its ties).
///
/// # Errors
/// An unreadable time scale.
pub(in crate::section) fn correlation(
    p: &Project,
    inp: &Inputs,
    used: &[UsedSite],
    column: &Column,
    log: &mut RunLog,
) -> Result<Option<ScalePanel>> {
    let mut stage = Stage::new("Correlation with the time scale and age model");
    let mut panel = None;
    match (&p.timescale, &column.zones) {
        (None, _) => log.skip(&mut stage, "Skipped: the project has no timescale.csv (add one, e.g. a copy of records/timescales/chrons-0-6ma.csv, to correlate the column).".into()),
        (Some(_), None) => log.skip(&mut stage, "Skipped: there is no polarity column to correlate.".into()),
        (Some(tf), Some(col)) => {
            let ts = TimeScale::from_table(&parse(tf)?)?;
            panel = correlate_column(&tf.name, &ts, col, inp, used, &mut stage, log);
        }
    }
    log.stages.push(stage);
    Ok(panel)
}

fn correlate_column(
    scale_name: &str,
    ts: &TimeScale,
    col: &ZoneColumn,
    inp: &Inputs,
    used: &[UsedSite],
    stage: &mut Stage,
    log: &mut RunLog,
) -> Option<ScalePanel> {
    let opts = CorrelateOptions::default();
    stage.method = format!(
        "Dynamic-programming correlation of the magnetozones with the chrons of {} ({} chrons, {:.3}–{:.3} Ma): boundaries are tied in order, chrons may be missing (penalty {} each, plus the Poisson cost of a short chron falling between levels; {} once for a run read as a hiatus), single-level zones may be left out (penalty {}); a candidate's score is the scatter of its implied accumulation rates in units of σ(ln rate) = {}, plus penalties; lower is better. The age of each level is interpolated between the best candidate's ties and extrapolated at its mean rate beyond them.",
        scale_name, ts.chrons.len(), ts.chrons.first().map_or(0.0, |c| c.young), ts.chrons.last().map_or(0.0, |c| c.old),
        opts.miss_penalty, opts.hiatus_penalty, opts.skip_penalty, opts.rate_spread);
    let res = match correlate(col, ts, &opts) {
        Ok(res) => res,
        Err(e) => {
            log.skip_on_error(stage, "Correlation", e);
            return None;
        }
    };
    let best = &res.candidates[0];
    let levels: Vec<NamedLevel> =
        used.iter().map(|u| (inp.sites[u.idx].site.as_str(), inp.sites[u.idx].position, u.polarity)).collect();
    let tables = [
        CsvTable::from_sheet("correlations", candidates_sheet(&res, "Ranked correlations (lower score is better)")),
        CsvTable::from_sheet("ties", ties_sheet(&res, inp.axis)),
        CsvTable::from_sheet("age-model", ages_sheet(best, inp.axis, &levels)),
        CsvTable::from_sheet("rates", runs_sheet(best)),
    ];
    log.head.ties = best.ties.iter().map(|t| [t.position, t.age]).collect();
    log.head.scores = res.candidates.iter().take(2).map(|c| c.score).collect();
    stage.result = format!(
        "Best candidate: {} ties, mean accumulation rate {:.2} cm/kyr, {} chrons missing, level ages {}–{} Ma. {}",
        best.ties.len(),
        best.mean_rate,
        best.missing_chrons,
        fixed_or_empty(best.age_model.first().map(|a| a.age), 3),
        fixed_or_empty(best.age_model.last().map(|a| a.age), 3),
        comparison_sentence(&res)
    );
    let panel = ScalePanel::of_candidate(&ts.chrons, best, "best candidate");
    for t in tables {
        log.table(stage, t);
    }
    log.cautions.push(cautions::CORRELATION.into());
    Some(panel)
}
