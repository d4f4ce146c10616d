//! The reversal-statistics stage of a `section` run: renewal-model fits to the polarity intervals
//! of the project's whole time scale (not of the section), with the open chron censored, and the
//! hazard at the open chron's present length. The hazard cautions travel with the result.

use super::stage::{draw, Stage};
use super::tables::CsvTable;
use crate::numbers::{fixed, fixed_or_empty};
use crate::reversals::{fit_models, hazard_at, intervals, IntervalOptions, Model, CAUTIONS};
use crate::table::TimeScale;

/// Horizon of the reported P(reversal within the horizon | none so far), Myr (the `hazard` verb's
/// default).
pub const HAZARD_HORIZON: f64 = 0.1;

/// What the stage produced.
pub(super) struct ReversalStats {
    pub stage: Stage,
    pub tables: Vec<CsvTable>,
    pub warnings: Vec<String>,
    pub cautions: Vec<String>,
    pub figures: Vec<super::FigureOutput>,
}

fn params(f: &crate::reversals::Fitted) -> String {
    f.named_params().iter().map(|(k, v)| format!("{k}={}", fixed(*v, 4))).collect::<Vec<_>>().join(" ")
}

/// Fit the renewal models to the time scale's intervals and evaluate the hazard.
pub(super) fn reversal_statistics(name: &str, ts: &TimeScale) -> ReversalStats {
    let mut stage = Stage::new("Reversal statistics of the time scale");
    let mut out =
        ReversalStats { stage: Stage::new(""), tables: vec![], warnings: vec![], cautions: vec![], figures: vec![] };
    stage.method = format!(
        "Maximum-likelihood fits of five renewal models (exponential, gamma, Weibull, lognormal, inverse Gaussian) to the lengths of the polarity intervals of {name} over its whole span (adjacent chrons of one polarity joined; the open chron at the young end enters as a right-censored length; the oldest row enters as a second censored length unless the table states its old boundary is a reversal); Akaike weights compare the models. The hazard and P(reversal within {HAZARD_HORIZON} Myr | none so far) are evaluated at the open chron's present length. These statistics describe the time scale, not the sampled section."
    );
    let skip = |mut stage: Stage, why: String, mut out: ReversalStats| {
        stage.ran = false;
        stage.result = format!("Skipped: {why}.");
        out.warnings.push(format!("Reversal statistics skipped: {why}."));
        out.stage = stage;
        out
    };
    let opts = IntervalOptions::default();
    let rec = match intervals(ts, &opts) {
        Ok(r) => r,
        Err(e) => return skip(stage, e.to_string(), out),
    };
    let sample = match rec.sample() {
        Ok(s) => s,
        Err(e) => return skip(stage, e.to_string(), out),
    };
    let fits = fit_models(&sample, &Model::ALL);
    if fits.fits.is_empty() {
        return skip(stage, "no renewal model could be fitted".into(), out);
    }
    for f in &fits.failures {
        out.warnings.push(format!("Renewal fit failed: {f:?}."));
    }
    let mut ft = CsvTable::new(
        "renewal-fits",
        "Renewal models fitted to the time scale's polarity intervals",
        &["model", "params", "mean_interval_myr", "loglik", "aic", "weight"],
    );
    for f in &fits.fits {
        ft.push(vec![
            f.fitted.model.name().into(),
            params(&f.fitted),
            fixed(f.fitted.mean(), 4),
            fixed(f.loglik, 3),
            fixed(f.aic, 3),
            fixed(f.weight, 3),
        ]);
    }
    let best = fits.fits.iter().max_by(|a, b| a.weight.total_cmp(&b.weight)).expect("non-empty");
    stage.result = format!(
        "{} complete intervals between {:.3} and {:.3} Ma{}; highest Akaike weight: {} ({:.2}, mean interval {:.3} Myr).",
        rec.complete.len(), rec.from, rec.to,
        rec.censored.map_or(String::new(), |c| format!(", open chron {c:.3} Myr so far (censored)")),
        best.fitted.model.name(), best.weight, best.fitted.mean());
    stage.tables.push(ft.stem.clone());
    out.tables.push(ft);
    if let Some(elapsed) = rec.censored {
        match hazard_at(&fits, &sample, elapsed, HAZARD_HORIZON) {
            Ok(h) => {
                let mut ht = CsvTable::new("hazard",
                    &format!("Hazard at {elapsed:.3} Myr since the last reversal and P(reversal within {HAZARD_HORIZON} Myr | none so far): a statement about the fitted models, not a forecast"),
                    &["model", "weight", "hazard_per_myr", "survival", "p_within"]);
                for m in &h.models {
                    ht.push(vec![
                        m.fitted.model.name().into(),
                        fixed(m.weight, 3),
                        fixed(m.hazard, 3),
                        fixed(m.survival, 4),
                        fixed_or_empty(m.p_within, 4),
                    ]);
                }
                ht.push(vec![
                    "averaged (Akaike weights)".into(),
                    fixed(1.0, 3),
                    String::new(),
                    String::new(),
                    fixed(h.averaged, 4),
                ]);
                stage.result.push_str(&format!(
                    " Under the fitted models, the Akaike-weighted P(reversal within {HAZARD_HORIZON} Myr | none in the last {elapsed:.3} Myr) is {:.3}; the elapsed length exceeds {:.0} % of the complete intervals.",
                    h.averaged, h.percentile));
                stage.tables.push(ht.stem.clone());
                out.tables.push(ht);
                out.cautions.extend(CAUTIONS.iter().map(|s| s.to_string()));
                let fig = crate::figures::HazardFigure::new(&fits, elapsed, name);
                match draw(&fig, "hazard", format!("Hazard of each fitted renewal model against time since the last reversal, with the open chron's present length ({elapsed:.3} Myr) marked: curves of models, not a forecast.")) {
                    Ok(f) => {
                        stage.figures.push(f.stem.clone());
                        out.figures.push(f);
                    }
                    Err(e) => out.warnings.push(format!("Hazard figure not drawn: {e}.")),
                }
            }
            Err(e) => out.warnings.push(format!("Hazard skipped: {e}.")),
        }
    } else {
        out.warnings.push("Hazard skipped: the time scale has no open chron at its young end.".into());
    }
    out.stage = stage;
    out
}
