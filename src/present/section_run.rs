//! Presenter of a whole run on a project folder (`section`, `demo`): the stages and what each
//! found, the warnings and cautions, and where the files were written.

use super::{Cell, Presentation, Sheet};
use crate::section::{Headline, Rejection, SectionRun, SectionSettings, Stage};
use serde::Serialize;
use std::path::Path;

#[derive(Serialize)]
struct RunView<'a> {
    project: &'a str,
    out: String,
    report: String,
    settings: &'a SectionSettings,
    stages: &'a [Stage],
    headline: &'a Headline,
    rejected: &'a [Rejection],
    warnings: &'a [String],
    cautions: &'a [String],
    tables: Vec<String>,
    figures: Vec<String>,
}

/// The summary of the run `res` on the project `title`, whose `n_files` files were written into
/// the folder `out`. The run's cautions stay among the notes, before the line that says where the
/// files are, so that the report's location is the last thing printed.
pub fn section_run(res: &SectionRun, title: &str, out: &Path, n_files: usize) -> Presentation {
    let mut sheet = Sheet::new(&format!("Section {title}: stages"), &["stage", "ran", "result"]);
    for st in &res.stages {
        sheet.push(vec![
            Cell::Text(st.name.clone()),
            Cell::Text(if st.ran { "yes" } else { "no" }.into()),
            Cell::Text(st.result.clone()),
        ]);
    }
    let report = out.join("report.html");
    let mut notes: Vec<String> = res.warnings.clone();
    if !res.rejected.is_empty() {
        notes.push(format!(
            "{} specimen(s) or site(s) rejected: see tables/rejected.csv and the report.",
            res.rejected.len()
        ));
    }
    notes.extend(res.cautions.iter().cloned());
    notes.push(format!("Wrote {n_files} files to {} (open {}).", out.display(), report.display()));
    let view = RunView {
        project: title,
        out: out.display().to_string(),
        report: report.display().to_string(),
        settings: &res.settings,
        stages: &res.stages,
        headline: &res.headline,
        rejected: &res.rejected,
        warnings: &res.warnings,
        cautions: &res.cautions,
        tables: res.tables.iter().map(|t| format!("tables/{}.csv", t.stem)).collect(),
        figures: res.figures.iter().map(|f| format!("figures/{}", f.stem)).collect(),
    };
    let json = serde_json::to_value(&view).expect("a run summary serializes");
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions: vec![] }
}
