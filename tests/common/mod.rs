//! Helpers shared by the integration tests: running the binary from the repository root, a transcript of
//! one run (command, exit code, stdout, stderr) for whole-output snapshots, and a listing of the files a run
//! wrote.
//!
//! Each test crate compiles this module on its own and uses only some of it.
#![allow(dead_code)]

use std::path::{Path, PathBuf};

/// The repository root (where `records/` lives); commands run from here so that input paths in outputs
/// are the short relative ones a user would type.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// What one run of the binary gave.
pub struct Run {
    /// The arguments, as given.
    pub args: Vec<String>,
    /// Exit code (`None` when ended by a signal).
    pub code: Option<i32>,
    /// Standard output, as text.
    pub stdout: String,
    /// Standard error, as text.
    pub stderr: String,
}

/// Run `lodestone ARGS --quiet` from the repository root.
pub fn lodestone(args: &[&str]) -> Run {
    let out = assert_cmd::Command::cargo_bin("lodestone")
        .unwrap()
        .current_dir(root())
        .args(args)
        .arg("--quiet")
        .output()
        .unwrap();
    Run {
        args: args.iter().map(|s| s.to_string()).collect(),
        code: out.status.code(),
        stdout: String::from_utf8(out.stdout).expect("stdout is UTF-8"),
        stderr: String::from_utf8(out.stderr).expect("stderr is UTF-8"),
    }
}

impl Run {
    /// Panic with the whole transcript unless the run exited with code 0.
    pub fn success(self) -> Self {
        assert_eq!(self.code, Some(0), "run failed:\n{}", self.transcript());
        self
    }

    /// The whole run as one text: the command line, the exit code, stdout and stderr.
    pub fn transcript(&self) -> String {
        format!(
            "$ lodestone {} --quiet\nexit: {:?}\n--- stdout ---\n{}--- stderr ---\n{}",
            self.args.join(" "),
            self.code,
            self.stdout,
            self.stderr
        )
    }

    /// The transcript with every occurrence of `path` replaced by `name` (temporary folders differ per run).
    pub fn transcript_redacted(&self, path: &Path, name: &str) -> String {
        redact(&self.transcript(), path, name)
    }
}

/// `text` with every occurrence of `path` (as written by the program) replaced by `name`.
pub fn redact(text: &str, path: &Path, name: &str) -> String {
    text.replace(path.to_str().expect("temporary paths are UTF-8"), name)
}

/// 64-bit FNV-1a hash of `bytes` (Fowler, Noll & Vo; the published offset basis and prime), enough to see
/// whether a binary output changed without storing it.
pub fn fnv1a64(bytes: &[u8]) -> u64 {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in bytes {
        h ^= u64::from(*b);
        h = h.wrapping_mul(0x0000_0100_0000_01b3);
    }
    h
}

/// Every file under `dir`, as paths relative to it with `/` separators, sorted.
pub fn files_under(dir: &Path) -> Vec<String> {
    fn walk(base: &Path, dir: &Path, out: &mut Vec<String>) {
        for entry in std::fs::read_dir(dir).unwrap() {
            let p = entry.unwrap().path();
            if p.is_dir() {
                walk(base, &p, out);
            } else {
                let rel = p.strip_prefix(base).unwrap();
                out.push(rel.components().map(|c| c.as_os_str().to_str().unwrap()).collect::<Vec<_>>().join("/"));
            }
        }
    }
    let mut out = Vec::new();
    walk(dir, dir, &mut out);
    out.sort();
    out
}

/// A snapshot name from a file's relative path: `figures/fold.svg` → `figures-fold.svg`.
pub fn flat_name(rel: &str) -> String {
    rel.replace('/', "-")
}

/// Snapshot one text under `name` in `tests/snapshots/` (named as given, without the test crate's name).
pub fn snap(name: &str, text: String) {
    let mut settings = insta::Settings::clone_current();
    settings.set_prepend_module_to_snapshot(false);
    settings.set_snapshot_path("../snapshots");
    settings.set_omit_expression(true);
    settings.bind(|| insta::assert_snapshot!(name, text));
}
