//! `lodestone demo`: `section` on the embedded invented demo section (records/demo/).

use super::{Ctx, Presentation};
use anyhow::Result;
use clap::Args;
use lodestone::section::{Project, ProjectFile};
use std::path::PathBuf;

/// The invented demo section, generated once by `simulate section` (see records/demo/README.md).
const STEPS: &str = include_str!("../../records/demo/steps.csv");
const SAMPLING: &str = include_str!("../../records/demo/sampling.csv");
const TIMESCALE: &str = include_str!("../../records/demo/timescale.csv");
const SETTINGS: &str = include_str!("../../records/demo/settings.toml");
/// The model the demo was drawn from (compared with what the run recovers).
const TRUTH: &str = include_str!("../../records/demo/truth.json");

#[derive(Debug, Args)]
pub struct DemoArgs {
    /// Output folder.
    #[arg(long, default_value = "lodestone-demo")]
    pub out: PathBuf,
    /// Write into an output folder that is not empty (files of the same name are replaced).
    #[arg(long)]
    pub force: bool,
}

/// The embedded demo project.
pub fn demo_project() -> Project {
    Project {
        title: "demo".into(),
        steps: ProjectFile::new("steps.csv", STEPS),
        sampling: ProjectFile::new("sampling.csv", SAMPLING),
        picks: None,
        timescale: Some(ProjectFile::new("timescale.csv", TIMESCALE)),
        settings: Some(ProjectFile::new("settings.toml", SETTINGS)),
    }
}

pub fn run(a: DemoArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let mut r =
        super::section::run_project(demo_project(), Some(ProjectFile::new("truth.json", TRUTH)), &a.out, a.force, ctx)?;
    r.notes.insert(0, "The demo section is invented: synthetic data drawn from a stated model (records/demo/README.md), not measurements.".into());
    Ok(r)
}
