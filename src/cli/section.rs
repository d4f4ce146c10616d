//! `lodestone section`: the whole chain on a project folder, written as tables, figures and an HTML
//! report into an output folder.

use super::{Ctx, Presentation};
use anyhow::{bail, Context, Result};
use clap::Args;
use lodestone::section::{run_with_truth, Project, ProjectFile};
use lodestone::simulate::{PICKS_FILE, SAMPLING_FILE, SETTINGS_FILE, STEPS_FILE, TIMESCALE_FILE, TRUTH_FILE};
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

#[derive(Debug, Args)]
pub struct SectionArgs {
    /// Project folder: steps.csv, sampling.csv; optional picks.csv, timescale.csv, settings.toml.
    pub dir: PathBuf,
    /// Output folder (default: the project folder's name with "-report" appended, beside it).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Write into an output folder that is not empty (files of the same name are replaced).
    #[arg(long)]
    pub force: bool,
}

fn read_file(dir: &Path, name: &str, required: bool, ctx: &mut Ctx) -> Result<Option<ProjectFile>> {
    let path = dir.join(name);
    if !path.exists() {
        if required {
            bail!("{}: the project folder has no {name} (required; see the README, 'Project folder')", dir.display());
        }
        return Ok(None);
    }
    ctx.inputs.add(&path);
    let bytes = std::fs::read(&path).with_context(|| format!("cannot read {}", path.display()))?;
    Ok(Some(ProjectFile::new(name, bytes)))
}

/// Create the output folder (shared rules of [`super::prepare_out_dir`]) and its `tables/`, `figures/`.
fn prepare_out(out: &Path, force: bool, ctx: &Ctx) -> Result<()> {
    super::prepare_out_dir(out, force, &ctx.inputs)?;
    for sub in ["tables", "figures"] {
        std::fs::create_dir_all(out.join(sub)).with_context(|| format!("cannot create {}", out.join(sub).display()))?;
    }
    Ok(())
}

/// Run the chain on a project (with its `truth.json`, if it is synthetic) and write its outputs;
/// shared with `demo`.
pub fn run_project(
    project: Project,
    truth: Option<ProjectFile>,
    out: &Path,
    force: bool,
    ctx: &mut Ctx,
) -> Result<Presentation> {
    let show = !ctx.global.quiet && std::io::stderr().is_terminal();
    let mut on_stage = |name: &str| {
        if show {
            eprintln!("section: {name} …");
        }
    };
    let res = run_with_truth(&project, truth.as_ref(), &ctx.progress, &mut on_stage)?;
    prepare_out(out, force, ctx)?;
    let files = res.files();
    for f in &files {
        super::write_atomic(&out.join(&f.name), &f.bytes, &ctx.inputs)?;
    }
    Ok(lodestone::present::section_run::section_run(&res, &project.title, out, files.len()))
}

pub fn run_cli(a: SectionArgs, ctx: &mut Ctx) -> Result<Presentation> {
    if !a.dir.is_dir() {
        bail!("{}: not a folder (a project folder holds steps.csv and sampling.csv)", a.dir.display());
    }
    let title = std::fs::canonicalize(&a.dir)
        .ok()
        .and_then(|p| p.file_name().map(|s| s.to_string_lossy().to_string()))
        .unwrap_or_else(|| "project".into());
    let project = Project {
        title: title.clone(),
        steps: read_file(&a.dir, STEPS_FILE, true, ctx)?.expect("required"),
        sampling: read_file(&a.dir, SAMPLING_FILE, true, ctx)?.expect("required"),
        picks: read_file(&a.dir, PICKS_FILE, false, ctx)?,
        timescale: read_file(&a.dir, TIMESCALE_FILE, false, ctx)?,
        settings: read_file(&a.dir, SETTINGS_FILE, false, ctx)?,
    };
    let truth = read_file(&a.dir, TRUTH_FILE, false, ctx)?;
    let out = a.out.clone().unwrap_or_else(|| {
        let parent = a.dir.parent().map(Path::to_path_buf).unwrap_or_default();
        parent.join(format!("{title}-report"))
    });
    run_project(project, truth, &out, a.force, ctx)
}
