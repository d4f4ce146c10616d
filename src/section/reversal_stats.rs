//! The reversal-statistics stage of a `section` run: renewal-model fits to the polarity intervals
//! of the project's whole time scale (not of the section), with the open chron censored, their
//! goodness of fit, the hazard at the open chron's present length with a bootstrap interval of the
//! averaged probability, and the reversal rate through time with its trend and clustering tests.
//! The hazard cautions travel with the result.
//!
//! The numbers are those of the `intervals`, `hazard` and `rate` verbs with their default options
//! on the same file, seed and number of resamples (same Monte Carlo streams), so the report and the
//! command line cannot disagree.

use super::tables::CsvTable;
use super::{FigureOutput, Stage};
use crate::figures::{HazardFigure, IntervalFigure, RateFigure};
use crate::model::TimeScale;
use crate::montecarlo::MonteCarlo;
use crate::present::cautions;
use crate::present::hazard::hazard_sheet;
use crate::present::intervals::fits_sheet;
use crate::present::rate::{rate_sheet, tests_sheet};
use crate::reversals::{
    assess_hazard, fit_models, goodness_of_fits, intervals, rate_summary, IntervalOptions, IntervalRecord, Model,
    RenewalFits, Sample,
};

/// Horizon of the reported P(reversal within the horizon | none so far), Myr (the `hazard` verb's
/// default).
pub const HAZARD_HORIZON: f64 = 0.1;
/// Width of the rate windows, Myr (the `rate` verb's default); windows advance by a tenth of it.
pub const RATE_WINDOW: f64 = 1.0;
/// Confidence level of the hazard interval and the rate band (the verbs' default).
pub const LEVEL: f64 = 0.95;

/// What the stage produced.
pub(super) struct ReversalStats {
    pub stage: Stage,
    pub tables: Vec<CsvTable>,
    pub warnings: Vec<String>,
    pub cautions: Vec<String>,
    pub figures: Vec<FigureOutput>,
    /// Complete intervals fitted.
    pub n_intervals: usize,
    /// The open chron's length so far (the elapsed time of the hazard), Myr.
    pub elapsed: Option<f64>,
}

impl ReversalStats {
    fn add_figure(&mut self, fig: crate::error::Result<FigureOutput>) {
        match fig {
            Ok(f) => {
                self.stage.figures.push(f.stem.clone());
                self.figures.push(f);
            }
            Err(e) => self.warnings.push(format!("Figure not drawn: {e}.")),
        }
    }
    fn add_table(&mut self, t: CsvTable) {
        self.stage.tables.push(t.stem.clone());
        self.tables.push(t);
    }
}

/// Fit the renewal models to the time scale's intervals, test their fit, evaluate the hazard and
/// the rate through time.
pub(super) fn reversal_statistics(name: &str, ts: &TimeScale, mc: &MonteCarlo<'_>) -> ReversalStats {
    let mut stage = Stage::new("Reversal statistics of the time scale");
    stage.method = format!(
        "Maximum-likelihood fits of five renewal models (exponential, gamma, Weibull, lognormal, inverse Gaussian) to the lengths of the polarity intervals of {name} over its whole span (adjacent chrons of one polarity joined; the open chron at the young end enters as a right-censored length; the oldest row enters as a second censored length unless the table states its old boundary is a reversal); Akaike weights compare the models. Goodness of fit: Kolmogorov–Smirnov and Anderson–Darling statistics with parametric-bootstrap p-values that refit the model to each replicate ({} resamples, seed {}). The hazard and P(reversal within {HAZARD_HORIZON} Myr | none so far) are evaluated at the open chron's present length; the Akaike-weighted probability has a {:.0} % bootstrap percentile interval (intervals resampled, all models refitted). The rate through time counts reversals in {RATE_WINDOW} Myr windows every {} Myr with exact Poisson {:.0} % limits; the Laplace test looks for a trend and the mean of H for clustering. These statistics describe the time scale, not the sampled section.",
        mc.resamples, mc.seed, LEVEL * 100.0, RATE_WINDOW / 10.0, LEVEL * 100.0
    );
    let mut out = ReversalStats {
        stage,
        tables: vec![],
        warnings: vec![],
        cautions: vec![],
        figures: vec![],
        n_intervals: 0,
        elapsed: None,
    };
    let opts = IntervalOptions::default();
    let (rec, sample) = match intervals(ts, &opts).and_then(|r| r.sample().map(|s| (r, s))) {
        Ok(x) => x,
        Err(e) => return skip(out, e.to_string()),
    };
    let fits = fit_models(&sample, &Model::ALL);
    if fits.fits.is_empty() {
        return skip(out, "no renewal model could be fitted".into());
    }
    for f in &fits.failures {
        out.warnings.push(format!("Renewal fit failed: {}: {}.", f.model.name(), f.reason));
    }
    out.n_intervals = sample.n();
    let elapsed = rec.elapsed(None);
    out.elapsed = elapsed.as_ref().ok().copied();
    renewal_table(&mut out, &fits, &sample, mc);
    let best = fits.fits.iter().max_by(|a, b| a.weight.total_cmp(&b.weight)).expect("non-empty");
    out.stage.result = format!(
        "{} complete intervals between {:.3} and {:.3} Ma{}; highest Akaike weight: {} ({:.2}, mean interval {:.3} Myr).",
        rec.complete.len(),
        rec.from,
        rec.to,
        rec.censored.map_or(String::new(), |c| format!(", open chron {c:.3} Myr so far (censored)")),
        best.fitted.model.name(),
        best.weight,
        best.fitted.mean()
    );
    if let Some(t) = fits.lr_test {
        out.stage.result.push_str(&format!(
            " Gamma against exponential (likelihood ratio): p = {:.3}; a constant rate is {}rejected at the 5 % level.",
            t.p_value,
            if t.p_value < 0.05 { "" } else { "not " }
        ));
    }
    let fig = IntervalFigure::new(&sample, &fits, name);
    out.add_figure(super::stage::draw(&fig, "intervals", "Lengths of the complete polarity intervals (empirical distribution) with the distribution functions of the fitted renewal models; the open chron's present length is marked.".into()));
    match elapsed {
        Ok(elapsed) => hazard(&mut out, &fits, &sample, elapsed, mc, name),
        Err(e) => out.warnings.push(format!("Hazard skipped: {e}.")),
    }
    rate(&mut out, &rec);
    out
}

fn skip(mut out: ReversalStats, why: String) -> ReversalStats {
    out.stage.ran = false;
    out.stage.result = format!("Skipped: {why}.");
    out.warnings.push(format!("Reversal statistics skipped: {why}."));
    out
}

fn renewal_table(out: &mut ReversalStats, fits: &RenewalFits, sample: &Sample, mc: &MonteCarlo<'_>) {
    let gof = goodness_of_fits(fits, sample, mc);
    for (f, g) in fits.fits.iter().zip(&gof) {
        if let Err(e) = g {
            out.warnings.push(format!("{}: goodness of fit unavailable: {e}.", f.fitted.model.name()));
        }
    }
    let title = "Renewal models fitted to the time scale's polarity intervals, with goodness of fit";
    out.add_table(CsvTable::from_sheet("renewal-fits", fits_sheet(fits, &gof, title, true)));
}

fn hazard(out: &mut ReversalStats, fits: &RenewalFits, sample: &Sample, elapsed: f64, mc: &MonteCarlo<'_>, name: &str) {
    let assessed = match assess_hazard(fits, sample, elapsed, HAZARD_HORIZON, LEVEL, Some(mc)) {
        Ok(a) => a,
        Err(e) => return out.warnings.push(format!("Hazard skipped: {e}.")),
    };
    out.warnings.extend(assessed.interval_note());
    let h = assessed.estimate;
    let title = format!("Hazard at {elapsed:.3} Myr since the last reversal and P(reversal within {HAZARD_HORIZON} Myr | none so far): a statement about the fitted models, not a forecast");
    let ht = CsvTable::from_sheet("hazard", hazard_sheet(&h, &title, true));
    out.stage.result.push_str(&format!(
        " Under the fitted models, the Akaike-weighted P(reversal within {HAZARD_HORIZON} Myr | none in the last {elapsed:.3} Myr) is {:.3}{}; the elapsed length exceeds {:.0} % of the complete intervals.",
        h.averaged,
        h.interval.map_or(String::new(), |b| format!(" ({:.0} % bootstrap interval {:.3}–{:.3})", b.level * 100.0, b.low, b.high)),
        h.percentile
    ));
    out.add_table(ht);
    out.cautions.extend(cautions::REVERSALS.iter().map(|s| s.to_string()));
    let fig = HazardFigure::new(fits, elapsed, name);
    out.add_figure(super::stage::draw(&fig, "hazard", format!("Hazard of each fitted renewal model against time since the last reversal, with the open chron's present length ({elapsed:.3} Myr) marked: curves of models, not a forecast.")));
}

fn rate(out: &mut ReversalStats, rec: &IntervalRecord) {
    let sum = match rate_summary(&rec.reversals, rec.from, rec.to, RATE_WINDOW, None, LEVEL) {
        Ok(s) => s,
        Err(e) => return out.warnings.push(format!("Rate through time skipped: {e}.")),
    };
    let title =
        format!("Reversal rate through time ({RATE_WINDOW} Myr windows, exact Poisson {:.0} % limits)", LEVEL * 100.0);
    out.add_table(CsvTable::from_sheet("rate", rate_sheet(&sum.points, &title)));
    match &sum.laplace {
        Ok(l) => out.stage.result.push_str(&format!(" Laplace trend test: U = {:.2}, p = {:.3}.", l.u, l.p_value)),
        Err(e) => out.warnings.push(format!("Laplace trend test unavailable: {e}.")),
    }
    if let Err(e) = &sum.clustering {
        out.warnings.push(format!("Clustering test unavailable: {e}."));
    }
    let tests = tests_sheet(&sum, "Trend and clustering of the reversals");
    if !tests.rows.is_empty() {
        out.add_table(CsvTable::from_sheet("rate-tests", tests));
    }
    let fig = RateFigure {
        title: "Reversal rate through time".into(),
        points: sum.points,
        reversals: rec.reversals.clone(),
        window: RATE_WINDOW,
    };
    out.add_figure(super::stage::draw(&fig, "rate", format!("Reversals per Myr in {RATE_WINDOW} Myr windows with the exact Poisson {:.0} % band; ticks mark the reversals.", LEVEL * 100.0)));
}
