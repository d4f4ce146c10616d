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
