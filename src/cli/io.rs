//! Safe output files: never overwrite an input; write to a temporary name, then rename.

use anyhow::{bail, Context, Result};
use std::path::{Path, PathBuf};

/// Paths the run reads; outputs may not replace them.
#[derive(Debug, Default, Clone)]
pub struct Inputs(pub Vec<PathBuf>);

impl Inputs {
    /// Remember an input path.
    pub fn add(&mut self, p: &Path) {
        self.0.push(p.to_path_buf());
    }
    fn clashes(&self, out: &Path) -> bool {
        let canon = |p: &Path| std::fs::canonicalize(p).ok();
        let o = canon(out);
        self.0.iter().any(|i| i == out || (o.is_some() && canon(i) == o))
    }
}

/// Write `bytes` to `path` atomically (temporary file in the same folder, then rename), refusing to
/// replace any input file.
pub fn write_atomic(path: &Path, bytes: &[u8], inputs: &Inputs) -> Result<()> {
    if inputs.clashes(path) {
        bail!("refusing to write {}: it is one of this run's input files", path.display());
    }
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new("."));
    if !dir.is_dir() {
        bail!("cannot write {}: folder {} does not exist", path.display(), dir.display());
    }
    let name = path.file_name().with_context(|| format!("{} is not a file path", path.display()))?;
    let tmp = dir.join(format!(".{}.tmp-{}", name.to_string_lossy(), std::process::id()));
    std::fs::write(&tmp, bytes).with_context(|| format!("cannot write {}", tmp.display()))?;
    std::fs::rename(&tmp, path).with_context(|| {
        let _ = std::fs::remove_file(&tmp);
        format!("cannot move the finished file into place at {}", path.display())
    })?;
    Ok(())
}

/// Render a figure and write it to `path` (format from the extension).
pub fn write_figure<F: lodestone::figures::Figure>(fig: &F, path: &Path, inputs: &Inputs) -> Result<()> {
    let format = lodestone::figures::FigureFormat::from_path(path)?;
    let bytes = lodestone::figures::render(fig, format)?;
    write_atomic(path, &bytes, inputs)
}

/// Make `dir` ready to receive output files.
///
/// The rule: a missing folder is created; an existing empty folder is used; an existing folder that
/// holds anything is refused unless `force` is given, and then files of the same names as the new ones
/// are replaced (each through [`write_atomic`]) while every other file is left alone: lodestone never
/// empties or deletes anything. A folder that holds one of the run's input files (directly or in a
/// sub-folder) is always refused, with or without `force`, as is a path that exists and is not a folder.
/// Call this only after every input has been read and every computation has succeeded, so that a
/// failing run leaves nothing behind.
pub fn prepare_out_dir(dir: &Path, force: bool, inputs: &Inputs) -> Result<()> {
    if dir.exists() && !dir.is_dir() {
        bail!("{} exists and is not a folder", dir.display());
    }
    if dir.is_dir() {
        if let Ok(d) = std::fs::canonicalize(dir) {
            for i in &inputs.0 {
                if let Ok(ci) = std::fs::canonicalize(i) {
                    if ci.starts_with(&d) {
                        bail!(
                            "refusing to write into {}: it holds {}, one of this run's input files; choose another output folder",
                            dir.display(),
                            i.display()
                        );
                    }
                }
            }
        }
        let occupied = std::fs::read_dir(dir)
            .with_context(|| format!("cannot list the output folder {}", dir.display()))?
            .next()
            .is_some();
        if occupied && !force {
            bail!(
                "the output folder {} is not empty; choose an empty or new folder, or give --force to replace files of the same names (other files are left alone)",
                dir.display()
            );
        }
        Ok(())
    } else {
        std::fs::create_dir_all(dir).with_context(|| format!("cannot create the output folder {}", dir.display()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn out_dir_rules() {
        let d = tempfile::tempdir().unwrap();
        let none = Inputs::default();
        // Missing: created.
        let fresh = d.path().join("a/b");
        prepare_out_dir(&fresh, false, &none).unwrap();
        assert!(fresh.is_dir());
        // Existing and empty: used.
        prepare_out_dir(&fresh, false, &none).unwrap();
        // Non-empty: refused without force; with force, nothing is deleted.
        let keep = fresh.join("keep.txt");
        std::fs::write(&keep, "x").unwrap();
        let e = prepare_out_dir(&fresh, false, &none).unwrap_err().to_string();
        assert!(e.contains("--force"), "{e}");
        prepare_out_dir(&fresh, true, &none).unwrap();
        assert_eq!(std::fs::read_to_string(&keep).unwrap(), "x");
        // Holding an input: refused even with force.
        let mut inputs = Inputs::default();
        inputs.add(&keep);
        let e = prepare_out_dir(&d.path().join("a"), true, &inputs).unwrap_err().to_string();
        assert!(e.contains("input"), "{e}");
        // A file, not a folder: refused.
        assert!(prepare_out_dir(&keep, true, &none).is_err());
    }
}
