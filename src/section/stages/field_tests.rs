//! Stage 3: the reversal test and the fold test on the used sites' means.

use super::inputs::Inputs;
use super::site_means::{bedding_or_flat, UsedSite};
use super::RunLog;
use crate::error::Result;
use crate::fieldtests::{bedding_spread, fold_test, reversal_test, FoldOptions, FoldTest, MeanComparison};
use crate::figures::FoldPlot;
use crate::montecarlo::MonteCarlo;
use crate::present::{cautions, field_tests::section_sheet};
use crate::section::stage::{draw, Stage};
use crate::section::tables::CsvTable;
use crate::sphere::Bedding;
use crate::strat::ZonePolarity;

/// What the tests did and found, in words, and the results for the table.
#[derive(Default)]
struct Found {
    reversal: Option<MeanComparison>,
    fold: Option<FoldTest>,
    methods: Vec<String>,
    results: Vec<String>,
}

/// Run the tests that the used sites allow; a test that cannot run is a warning.
///
/// # Errors
/// Only a failure to draw the fold figure.
pub(in crate::section) fn field_tests(
    inp: &Inputs,
    used: &[UsedSite],
    mc: &MonteCarlo<'_>,
    log: &mut RunLog,
) -> Result<()> {
    let mut stage = Stage::new("Field tests");
    let mut found = Found::default();
    reversal(inp, used, mc, &mut found, log);
    fold(inp, used, mc, &mut found, &mut stage, log)?;
    let Found { reversal, fold, methods, results } = found;
    let table = CsvTable::from_sheet("field-tests", section_sheet(reversal.as_ref(), fold.as_ref()));
    stage.ran = !table.rows.is_empty();
    stage.method =
        if methods.is_empty() { "No field test could run (see the warnings).".into() } else { methods.join(" ") };
    stage.result = if results.is_empty() { "Skipped.".into() } else { results.join(" ") };
    if stage.ran {
        log.cautions.push(cautions::FIELD_TESTS.into());
        log.table(&mut stage, table);
    }
    log.stages.push(stage);
    Ok(())
}

fn reversal(inp: &Inputs, used: &[UsedSite], mc: &MonteCarlo<'_>, found: &mut Found, log: &mut RunLog) {
    let s = &inp.settings;
    let n_n = used.iter().filter(|u| u.polarity == ZonePolarity::Normal).count();
    let n_r = used.iter().filter(|u| u.polarity == ZonePolarity::Reversed).count();
    if n_n < 2 || n_r < 2 {
        log.warnings.push(format!(
            "Reversal test skipped: it needs at least two normal and two reversed sites (found {n_n} and {n_r})."
        ));
        return;
    }
    let v: Vec<_> = used.iter().map(|u| u.tilt.to_vector()).collect();
    let t = match reversal_test(&v, mc, 0.95) {
        Ok(t) => t,
        Err(e) => return log.warnings.push(format!("Reversal test skipped: {e}.")),
    };
    let c = &t.comparison;
    found.methods.push(format!("Reversal test on the tilt-corrected site means: the set is split into two modes on its principal axis, mode 2 is flipped, and the means are compared by the angle γ against γc with the classes of McFadden & McElhinny (1990), by Watson's V_w against a critical value simulated from Fisher sets, and by a bootstrap of Cartesian bounds (Tauxe et al. 1991); {} resamples, seed {}.", s.resamples, s.seed));
    found.results.push(format!(
        "Reversal test ({} and {} sites): γ = {:.1}° against γc = {:.1}°, class {}; V_w {}; bootstrap {}.",
        c.n1,
        c.n2,
        c.mm90.gamma,
        c.mm90.gamma_c,
        c.mm90.class.name(),
        if c.watson.passed { "passes" } else { "fails" },
        if c.bootstrap.passed { "passes" } else { "fails" }
    ));
    found.reversal = Some(t.comparison);
}

fn fold(
    inp: &Inputs,
    used: &[UsedSite],
    mc: &MonteCarlo<'_>,
    found: &mut Found,
    stage: &mut Stage,
    log: &mut RunLog,
) -> Result<()> {
    let s = &inp.settings;
    let beds: Vec<Bedding> = used.iter().map(|u| bedding_or_flat(&inp.sites[u.idx])).collect::<Result<_>>()?;
    let spread = if beds.is_empty() { 0.0 } else { bedding_spread(&beds) };
    if used.len() < 3 {
        log.warnings.push(format!("Fold test skipped: it needs at least three sites (found {}).", used.len()));
        return Ok(());
    }
    if spread < 5.0 {
        log.warnings.push(format!("Fold test skipped: the bedding attitudes of the used sites differ by {spread:.1}° (less than 5°), so untilting cannot discriminate."));
        return Ok(());
    }
    let v: Vec<_> = used.iter().map(|u| u.geo.to_vector()).collect();
    let t = match fold_test(&v, &beds, mc, &FoldOptions::default()) {
        Ok(t) => t,
        Err(e) => {
            log.warnings.push(format!("Fold test skipped: {e}."));
            return Ok(());
        }
    };
    found.methods.push(format!("Fold test on the site means: bootstrap incremental untilting (Tauxe & Watson 1994) from −10 % to 150 %, {} resamples, seed {}; the classic precision ratio (McElhinny 1964) for comparison only.", s.resamples, s.seed));
    found.results.push(format!("Fold test: best untilting {:.0} % (95 % interval {:.0} to {:.0} %): {}. Bedding attitudes differ by up to {:.0}°.",
        t.best_untilt, t.ci_low, t.ci_high, t.verdict.name(), t.bedding_spread));
    let fig = FoldPlot::from_test(&t, "site means".into());
    found.fold = Some(t);
    log.figure(stage, draw(&fig, "fold", "Fold test: the leading eigenvalue against percent untilting for the data and bootstrap resamples, and the distribution of the resamples' maxima.".into())?);
    Ok(())
}
