//! The stages of a `section` run, one file each, in the order [`super::run`] calls them:
//! [`inputs`] → [`fits`] → [`site_means`] → [`field_tests`] → [`poles`] → [`column`] →
//! [`correlation`] (the reversal statistics of the time scale are [`super::reversal_stats`]).
//! Each stage reads what the earlier ones returned and writes its [`Stage`] record, tables,
//! figures, warnings and cautions into the shared [`RunLog`].

pub(super) mod column;
pub(super) mod correlation;
pub(super) mod field_tests;
pub(super) mod fits;
pub(super) mod inputs;
pub(super) mod poles;
pub(super) mod site_means;

use super::stage::Stage;
use super::tables::CsvTable;
use super::{FigureOutput, Headline, Rejection};

/// What the stages have written so far, in report order.
#[derive(Debug, Default)]
pub(super) struct RunLog {
    pub warnings: Vec<String>,
    pub cautions: Vec<String>,
    pub stages: Vec<Stage>,
    pub tables: Vec<CsvTable>,
    pub figures: Vec<FigureOutput>,
    pub rejected: Vec<Rejection>,
    pub head: Headline,
}

impl RunLog {
    /// Record a rejected specimen or site.
    pub fn reject(&mut self, what: &str, name: &str, stage: &str, reason: String) {
        self.rejected.push(Rejection { what: what.into(), name: name.into(), stage: stage.into(), reason });
    }

    /// Add `table` to the run, listed under `stage`.
    pub fn table(&mut self, stage: &mut Stage, table: CsvTable) {
        stage.tables.push(table.stem.clone());
        self.tables.push(table);
    }

    /// Add a drawn figure to the run, listed under `stage`.
    pub fn figure(&mut self, stage: &mut Stage, figure: FigureOutput) {
        stage.figures.push(figure.stem.clone());
        self.figures.push(figure);
    }

    /// Mark `stage` as skipped with `result`, which is also a warning.
    pub fn skip(&mut self, stage: &mut Stage, result: String) {
        stage.ran = false;
        self.warnings.push(result.clone());
        stage.result = result;
    }

    /// Mark `stage` as skipped because of an error `e` (the warning names the stage `what`).
    pub fn skip_on_error(&mut self, stage: &mut Stage, what: &str, e: impl std::fmt::Display) {
        stage.ran = false;
        stage.result = format!("Skipped: {e}.");
        self.warnings.push(format!("{what} skipped: {e}."));
    }
}
