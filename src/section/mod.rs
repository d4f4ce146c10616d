//! The whole chain on one project folder: component fits → site means → field tests → VGPs,
//! paleopole and scatter → polarity column and magnetozones → correlation with a time scale → age
//! model → reversal statistics of the time scale's span (renewal fits, hazard), written as CSV tables, SVG and PNG figures and one self-contained HTML report.
//!
//! [`run`] takes the folder's files as bytes (no paths, no printing) and returns every output in a
//! [`SectionRun`]; the same inputs give byte-identical outputs (no clocks, no absolute paths, sorted
//! iteration, seeded Monte Carlo). A stage that cannot run (too few sites, no bedding variation, no
//! time scale) is skipped with a warning; it never fails the run.
//!
//! # References
//! Each stage cites its method in the module that implements it ([`crate::demag`],
//! [`crate::stats`], [`crate::fieldtests`], [`crate::poles`], [`crate::strat`]).

mod auto;
mod pipeline;
mod report;
mod reversal_stats;
mod settings;
mod stage;
mod stages;
mod tables;
mod truth;

pub use auto::{automatic_fit, last_rule, rule_text};
pub use pipeline::{run, run_with_truth};
pub use report::report_html;
pub use reversal_stats::{HAZARD_HORIZON, LEVEL, RATE_WINDOW};
pub use settings::{SectionSettings, KNOWN_KEYS};
pub use stage::Stage;
pub use tables::CsvTable;

/// One input file of a project folder: its name (as shown in messages) and its bytes.
#[derive(Debug, Clone, PartialEq)]
pub struct ProjectFile {
    /// File name for messages (e.g. `steps.csv`).
    pub name: String,
    /// Contents.
    pub bytes: Vec<u8>,
}

impl ProjectFile {
    /// A file from its name and bytes.
    pub fn new(name: impl Into<String>, bytes: impl Into<Vec<u8>>) -> Self {
        Self { name: name.into(), bytes: bytes.into() }
    }
}

/// The files of a project folder (see the README, "Project folder").
#[derive(Debug, Clone, PartialEq)]
pub struct Project {
    /// A title for the report (usually the folder name).
    pub title: String,
    /// `steps.csv` (required).
    pub steps: ProjectFile,
    /// `sampling.csv` (required).
    pub sampling: ProjectFile,
    /// `picks.csv` (optional: without it, fits are automatic).
    pub picks: Option<ProjectFile>,
    /// `timescale.csv` (optional: without it, correlation and age model are skipped).
    pub timescale: Option<ProjectFile>,
    /// `settings.toml` (optional).
    pub settings: Option<ProjectFile>,
}

/// One output file: a name relative to the output folder, and its bytes.
#[derive(Debug, Clone, PartialEq)]
pub struct OutputFile {
    /// Relative path with `/` separators, e.g. `tables/site-means.csv`.
    pub name: String,
    /// Contents.
    pub bytes: Vec<u8>,
}

/// A figure of the run: SVG and PNG renderings of one drawing.
#[derive(Debug, Clone, PartialEq)]
pub struct FigureOutput {
    /// File stem, e.g. `column`.
    pub stem: String,
    /// Caption for the report.
    pub caption: String,
    /// SVG text.
    pub svg: String,
    /// PNG bytes.
    pub png: Vec<u8>,
}

/// A rejected specimen or site with the reason.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Rejection {
    /// `specimen` or `site`.
    pub what: String,
    /// Its name.
    pub name: String,
    /// The stage that rejected it.
    pub stage: String,
    /// Why.
    pub reason: String,
}

/// Key numbers of a run (for summaries and tests).
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize)]
pub struct Headline {
    /// Specimens in the steps table.
    pub specimens: usize,
    /// Specimens with an accepted component.
    pub specimens_fitted: usize,
    /// Sites in the sampling table.
    pub sites: usize,
    /// Sites used downstream of the site means.
    pub sites_used: usize,
    /// Magnetozones.
    pub zones: usize,
    /// Paleopole latitude, longitude and A95 (degrees; A95 `None` where undefined), if computed.
    pub pole: Option<(f64, f64, Option<f64>)>,
    /// Ties (position, age) of the best correlation, if any.
    pub ties: Vec<[f64; 2]>,
    /// Score of the best and second-best correlation.
    pub scores: Vec<f64>,
    /// Latitude and longitude of the first site of the sampling table (degrees), if any.
    pub locality: Option<[f64; 2]>,
    /// Complete polarity intervals of the time scale fitted by the reversal statistics.
    pub intervals: usize,
    /// The open chron's length so far, Myr (the elapsed time of the hazard), if any.
    pub open_chron: Option<f64>,
}

/// One specimen's measurements and what the component stage made of them (for the report's
/// gallery).
#[derive(Debug, Clone, PartialEq)]
pub struct SpecimenRecord {
    /// The steps as read.
    pub steps: crate::model::SpecimenSteps,
    /// The accepted fits (empty when the specimen was rejected).
    pub fits: Vec<crate::demag::SpecimenFit>,
    /// Why it was rejected, if it was (one reason per rejected pick or fit).
    pub rejected: Vec<String>,
}

/// Everything a run produces.
#[derive(Debug, Clone, PartialEq)]
pub struct SectionRun {
    /// Every specimen of the steps table, in the table's order.
    pub specimens: Vec<SpecimenRecord>,
    /// Settings in force (defaults filled in).
    pub settings: SectionSettings,
    /// Tables, in report order.
    pub tables: Vec<CsvTable>,
    /// Figures, in report order.
    pub figures: Vec<FigureOutput>,
    /// The HTML report.
    pub report: String,
    /// Stages run or skipped, in order.
    pub stages: Vec<Stage>,
    /// Warnings (stages skipped, unknown settings, …).
    pub warnings: Vec<String>,
    /// Cautions on reading the results.
    pub cautions: Vec<String>,
    /// Rejected specimens and sites.
    pub rejected: Vec<Rejection>,
    /// Key numbers.
    pub headline: Headline,
}

impl SectionRun {
    /// Every output file: `report.html`, `tables/*.csv`, `figures/*.svg` and `figures/*.png`,
    /// in a fixed order.
    pub fn files(&self) -> Vec<OutputFile> {
        let mut out = vec![OutputFile { name: "report.html".into(), bytes: self.report.clone().into_bytes() }];
        for t in &self.tables {
            out.push(OutputFile { name: format!("tables/{}.csv", t.stem), bytes: t.to_csv().into_bytes() });
        }
        for f in &self.figures {
            out.push(OutputFile { name: format!("figures/{}.svg", f.stem), bytes: f.svg.clone().into_bytes() });
            out.push(OutputFile { name: format!("figures/{}.png", f.stem), bytes: f.png.clone() });
        }
        out
    }
}

#[cfg(test)]
mod tests;

impl SectionRun {
    /// The table with this stem, if the run wrote one.
    pub fn table(&self, stem: &str) -> Option<&CsvTable> {
        self.tables.iter().find(|t| t.stem == stem)
    }

    /// The figure with this stem, if the run drew one.
    pub fn figure(&self, stem: &str) -> Option<&FigureOutput> {
        self.figures.iter().find(|f| f.stem == stem)
    }
}
