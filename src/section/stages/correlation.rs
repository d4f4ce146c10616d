//! Stage 6: the correlation of the magnetozones with the project's time scale, the ranked
//! candidates, and the age model and accumulation rates of the best one.

use super::column::Column;
use super::inputs::{parse, Inputs};
use super::site_means::UsedSite;
use super::RunLog;
use crate::error::Result;
use crate::figures::ScalePanel;
use crate::model::TimeScale;
use crate::numbers::{fixed, fixed_or_empty};
use crate::section::stage::Stage;
use crate::section::tables::CsvTable;
use crate::section::Project;
use crate::strat::{comparison_sentence, correlate, Candidate, CorrelateOptions, Correlation, ZoneColumn};

/// Caution carried with the correlation.
pub const CORRELATION_CAUTION: &str = "The ranking of correlations is a statistical statement about a steady-rate \
model, not proof of the correlation: independent age control (dated beds, biostratigraphy), local practice and the \
published literature decide.";

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
    let (ct, tt) = candidate_tables(inp.axis.column(), &res);
    let at = age_table(inp, used, best);
    let rt = rates_table(best);
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
    for t in [ct, tt, at, rt] {
        log.table(stage, t);
    }
    log.cautions.push(CORRELATION_CAUTION.into());
    Some(panel)
}

/// The ranked candidates, and the ties of every candidate.
fn candidate_tables(col_name: &str, res: &Correlation) -> (CsvTable, CsvTable) {
    let mut ct = CsvTable::new(
        "correlations",
        "Ranked correlations (lower score is better)",
        &["rank", "score", "mean_rate_cm_kyr", "ties", "missing_chrons", "skipped_zones", "top_age", "base_age"],
    );
    let mut tt = CsvTable::new(
        "ties",
        "Tie points of every candidate",
        &["rank", col_name, "low", "high", "age", "chron_above", "chron_below"],
    );
    for c in &res.candidates {
        let am = &c.age_model;
        ct.push(vec![
            c.rank.to_string(),
            fixed(c.score, 3),
            fixed(c.mean_rate, 3),
            c.ties.len().to_string(),
            c.missing_chrons.to_string(),
            c.skipped_zones.to_string(),
            fixed_or_empty(am.first().map(|a| a.age), 4),
            fixed_or_empty(am.last().map(|a| a.age), 4),
        ]);
        for t in &c.ties {
            tt.push(vec![
                c.rank.to_string(),
                fixed(t.position, 3),
                fixed(t.low, 3),
                fixed(t.high, 3),
                fixed(t.age, 4),
                t.chron_above.clone(),
                t.chron_below.clone(),
            ]);
        }
    }
    (ct, tt)
}

fn age_table(inp: &Inputs, used: &[UsedSite], best: &Candidate) -> CsvTable {
    let mut at = CsvTable::new(
        "age-model",
        "Age of each level from the best correlation",
        &["site", inp.axis.column(), "age", "polarity"],
    );
    for u in used {
        let pos = inp.sites[u.idx].position;
        at.push(vec![
            inp.sites[u.idx].site.clone(),
            fixed(pos, 3),
            fixed_or_empty(best.age_at(pos, inp.axis), 4),
            u.polarity.code().into(),
        ]);
    }
    at
}

fn rates_table(best: &Candidate) -> CsvTable {
    let mut rt = CsvTable::new(
        "rates",
        "Runs and accumulation rates of the best correlation",
        &["top", "base", "age_young", "age_old", "rate_cm_kyr", "reading", "missing_chrons"],
    );
    for r in &best.runs {
        rt.push(vec![
            fixed(r.top, 3),
            fixed(r.base, 3),
            fixed(r.age_young, 4),
            fixed(r.age_old, 4),
            fixed_or_empty(r.rate, 3),
            format!("{:?}", r.reading).to_lowercase(),
            r.missing.join(" "),
        ]);
    }
    rt
}
