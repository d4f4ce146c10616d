//! The whole chain on a project folder, written into an output folder.
//!
//! Output rules as on the command line: the folder is created if missing; a folder that holds
//! anything is refused unless `force` is given (then files of the same names are replaced, nothing
//! else is touched); a folder holding one of the inputs is always refused; each file is written to a
//! temporary name and renamed into place; nothing is written unless the whole run succeeded.

use crate::{invalid, run_detached, Outcome};
use lodestone::montecarlo::Silent;
use lodestone::section::{run, OutputFile, Project, ProjectFile};
use lodestone::simulate::{PICKS_FILE, SAMPLING_FILE, SETTINGS_FILE, STEPS_FILE, TIMESCALE_FILE};
use pyo3::prelude::*;
use std::path::{Path, PathBuf};

/// One input file of the project folder, if present (an error when it is required and missing).
fn read(dir: &Path, name: &str, required: bool, inputs: &mut Vec<PathBuf>) -> Outcome<Option<ProjectFile>> {
    let path = dir.join(name);
    if !path.exists() {
        if required {
            return invalid(format!("{}: the project folder has no {name} (required)", dir.display()));
        }
        return Ok(None);
    }
    let bytes = std::fs::read(&path).or_else(|e| invalid(format!("cannot read {}: {e}", path.display())))?;
    inputs.push(std::fs::canonicalize(&path).unwrap_or(path));
    Ok(Some(ProjectFile::new(name, bytes)))
}

/// Check (and create) the output folder and its `subfolders`; see the module documentation for the
/// rules.
pub(crate) fn prepare(out: &Path, force: bool, inputs: &[PathBuf], subfolders: &[&str]) -> Outcome<()> {
    if out.exists() && !out.is_dir() {
        return invalid(format!("{} exists and is not a folder", out.display()));
    }
    if out.is_dir() {
        let canon = std::fs::canonicalize(out).unwrap_or_else(|_| out.to_path_buf());
        if let Some(i) = inputs.iter().find(|i| i.starts_with(&canon)) {
            return invalid(format!("refusing to write into {}: it holds the input {}", out.display(), i.display()));
        }
        let occupied = std::fs::read_dir(out).map(|mut d| d.next().is_some()).unwrap_or(true);
        if occupied && !force {
            return invalid(format!(
                "the output folder {} is not empty; choose an empty or new folder, or pass force=True to replace files of the same names",
                out.display()
            ));
        }
    }
    std::fs::create_dir_all(out).or_else(|e| invalid(format!("cannot create {}: {e}", out.display())))?;
    for sub in subfolders {
        std::fs::create_dir_all(out.join(sub)).or_else(|e| invalid(format!("cannot create {}: {e}", out.display())))?;
    }
    Ok(())
}

/// Write one output file through a temporary name in the same folder.
fn write(out: &Path, f: &OutputFile) -> Outcome<()> {
    write_file(&out.join(&f.name), &f.bytes)
}

/// Write `bytes` to `path` through a temporary name in the same folder and a rename.
pub(crate) fn write_file(path: &Path, bytes: &[u8]) -> Outcome<()> {
    let name = path.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default();
    let tmp = path.with_file_name(format!(".{name}.tmp-{}", std::process::id()));
    std::fs::write(&tmp, bytes).or_else(|e| invalid(format!("cannot write {}: {e}", tmp.display())))?;
    std::fs::rename(&tmp, path).or_else(|e| {
        let _ = std::fs::remove_file(&tmp);
        invalid(format!("cannot move the finished file into place at {}: {e}", path.display()))
    })
}

/// Run the whole chain on `folder` and write report, tables and figures (see `lodestone.run_section`).
/// Returns the output folder's path.
#[pyfunction]
#[pyo3(signature = (folder, out = None, force = false, threads = None))]
pub fn run_section(
    py: Python<'_>,
    folder: PathBuf,
    out: Option<PathBuf>,
    force: bool,
    threads: Option<usize>,
) -> PyResult<PathBuf> {
    run_detached(py, threads, || {
        if !folder.is_dir() {
            return invalid(format!(
                "{}: not a folder (a project folder holds steps.csv and sampling.csv)",
                folder.display()
            ));
        }
        let title = std::fs::canonicalize(&folder)
            .ok()
            .and_then(|p| p.file_name().map(|s| s.to_string_lossy().to_string()))
            .unwrap_or_else(|| "project".into());
        let mut inputs = Vec::new();
        let project = Project {
            title: title.clone(),
            steps: read(&folder, STEPS_FILE, true, &mut inputs)?.expect("required"),
            sampling: read(&folder, SAMPLING_FILE, true, &mut inputs)?.expect("required"),
            picks: read(&folder, PICKS_FILE, false, &mut inputs)?,
            timescale: read(&folder, TIMESCALE_FILE, false, &mut inputs)?,
            settings: read(&folder, SETTINGS_FILE, false, &mut inputs)?,
        };
        let out = out.unwrap_or_else(|| folder.parent().unwrap_or(Path::new("")).join(format!("{title}-report")));
        let res = run(&project, &Silent, &mut |_| {})?;
        prepare(&out, force, &inputs, &["tables", "figures"])?;
        for f in res.files() {
            write(&out, &f)?;
        }
        Ok(out)
    })
}
