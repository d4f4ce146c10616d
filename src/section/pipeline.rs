//! The order of a `section` run: each stage is a function of its own in [`super::stages`]; this
//! file calls them in turn and assembles the [`SectionRun`].

use super::stages::column::{column_figure, polarity_column};
use super::stages::correlation::correlation;
use super::stages::field_tests::field_tests;
use super::stages::fits::fit_specimens;
use super::stages::inputs::{parse, read_inputs};
use super::stages::poles::poles;
use super::stages::site_means::site_means;
use super::stages::RunLog;
use super::tables::CsvTable;
use super::{Project, ProjectFile, SectionRun, SpecimenRecord};
use crate::demag::SpecimenFit;
use crate::error::Result;
use crate::model::{StepSet, TimeScale};
use crate::montecarlo::{MonteCarlo, Progress};

/// Run the whole chain on a project. `progress` receives the Monte Carlo progress; `on_stage` is
/// called with each stage's name as it starts.
///
/// # Errors
/// Only unreadable inputs are errors (each names the file, line and column); a stage that cannot run
/// is skipped with a warning.
pub fn run(p: &Project, progress: &dyn Progress, on_stage: &mut dyn FnMut(&str)) -> Result<SectionRun> {
    run_with_truth(p, None, progress, on_stage)
}

/// [`run`], and where `truth` (the `truth.json` that `simulate section` writes beside a synthetic
/// folder) is given, a last stage comparing what the run recovered with the true model.
///
/// # Errors
/// As [`run`]; an unreadable `truth` is a warning, not an error.
pub fn run_with_truth(
    p: &Project,
    truth: Option<&ProjectFile>,
    progress: &dyn Progress,
    on_stage: &mut dyn FnMut(&str),
) -> Result<SectionRun> {
    let mut log = RunLog::default();
    on_stage("reading the project");
    let inp = read_inputs(p, &mut log)?;
    let mc = MonteCarlo { seed: inp.settings.seed, resamples: inp.settings.resamples, progress };
    on_stage("component fits");
    let fits = fit_specimens(p, &inp, &mut log)?;
    on_stage("site means");
    let used = site_means(p, &inp, &fits, &mut log)?;
    on_stage("field tests");
    field_tests(&inp, &used, &mc, &mut log)?;
    on_stage("poles");
    poles(&inp, &used, &mc, &mut log)?;
    on_stage("polarity column");
    let column = polarity_column(p, &inp, &used, &mut log);
    on_stage("correlation");
    let scale = correlation(p, &inp, &used, &column, &mut log)?;
    column_figure(&inp, &column, scale, &mut log)?;
    if let Some(tf) = &p.timescale {
        on_stage("reversal statistics");
        reversal_statistics(tf, &mc, &mut log)?;
    }
    log.tables.push(rejections_table(&log));
    let mut out = assemble(log, inp.set, fits, inp.settings);
    if let Some(t) = truth {
        on_stage("comparison with the true model");
        super::truth::compare_with_truth(&mut out, t);
    }
    on_stage("report");
    out.report = super::report_html(&out, &p.title, &project_files(p));
    Ok(out)
}

/// The renewal statistics of the time scale's own intervals (see [`super::reversal_stats`]).
fn reversal_statistics(tf: &ProjectFile, mc: &MonteCarlo<'_>, log: &mut RunLog) -> Result<()> {
    let ts = TimeScale::from_table(&parse(tf)?)?;
    let r = super::reversal_stats::reversal_statistics(&tf.name, &ts, mc);
    log.head.intervals = r.n_intervals;
    log.head.open_chron = r.elapsed;
    log.warnings.extend(r.warnings);
    log.cautions.extend(r.cautions);
    log.tables.extend(r.tables);
    log.figures.extend(r.figures);
    log.stages.push(r.stage);
    Ok(())
}

fn rejections_table(log: &RunLog) -> CsvTable {
    let mut jt = CsvTable::new(
        "rejected",
        "Specimens and sites rejected, with the reason",
        &["what", "name", "stage", "reason"],
    );
    for r in &log.rejected {
        jt.push(vec![r.what.clone(), r.name.clone(), r.stage.clone(), r.reason.clone()]);
    }
    jt
}

/// The run's result, with every specimen's steps, accepted fits and rejection reasons.
fn assemble(log: RunLog, set: StepSet, fits: Vec<SpecimenFit>, settings: super::SectionSettings) -> SectionRun {
    let specimens = set
        .specimens
        .into_iter()
        .map(|sp| SpecimenRecord {
            fits: fits.iter().filter(|f| f.specimen == sp.specimen).cloned().collect(),
            rejected: log
                .rejected
                .iter()
                .filter(|r| r.what == "specimen" && r.name == sp.specimen)
                .map(|r| r.reason.clone())
                .collect(),
            steps: sp,
        })
        .collect();
    SectionRun {
        specimens,
        settings,
        tables: log.tables,
        figures: log.figures,
        report: String::new(),
        stages: log.stages,
        warnings: log.warnings,
        cautions: log.cautions,
        rejected: log.rejected,
        headline: log.head,
    }
}

fn project_files(p: &Project) -> Vec<(String, usize)> {
    let mut v = vec![(p.steps.name.clone(), p.steps.bytes.len()), (p.sampling.name.clone(), p.sampling.bytes.len())];
    for f in [&p.picks, &p.timescale, &p.settings].into_iter().flatten() {
        v.push((f.name.clone(), f.bytes.len()));
    }
    v
}
