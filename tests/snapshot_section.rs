//! Whole-output snapshots of the verbs that write folders: `demo`, `section` and `simulate section`. Each
//! run's transcript is snapshotted in every format, with the temporary output folder shown as `[OUT]`; every
//! text file the run wrote is snapshotted on its own (`demo_file_tables-zones.csv`); PNG files, which are
//! deterministic, are recorded by size and 64-bit FNV-1a hash in one listing. The files must not depend on
//! the format of the printed summary, which is checked too.

mod common;

use common::{files_under, flat_name, fnv1a64, lodestone, snap};
use std::path::Path;

const FORMATS: [&str; 3] = ["table", "csv", "json"];

/// The files of a folder as (relative path, bytes), sorted by path.
fn contents(dir: &Path) -> Vec<(String, Vec<u8>)> {
    files_under(dir).into_iter().map(|rel| (rel.clone(), std::fs::read(dir.join(&rel)).unwrap())).collect()
}

/// Snapshot every file of `dir`: text files one by one as `prefix_file_NAME`, PNG files in one listing
/// `prefix_png-files` with size and hash. Any other binary file fails the test (a new kind of output
/// must be given a snapshot rule).
fn snap_files(prefix: &str, dir: &Path, redact_as: &str) {
    let mut binary = String::new();
    for (rel, bytes) in contents(dir) {
        if rel.ends_with(".png") {
            assert!(bytes.starts_with(b"\x89PNG\r\n\x1a\n"), "{rel} is not a PNG file");
            binary.push_str(&format!("{rel}  {} bytes  fnv1a64 {:016x}\n", bytes.len(), fnv1a64(&bytes)));
        } else {
            let text = String::from_utf8(bytes).unwrap_or_else(|_| panic!("{rel}: not UTF-8 and not PNG"));
            snap(&format!("{prefix}_file_{}", flat_name(&rel)), common::redact(&text, dir, redact_as));
        }
    }
    if !binary.is_empty() {
        snap(&format!("{prefix}_png-files"), binary);
    }
}

/// Run `args OUT` in every format with a fresh `OUT`, snapshot each transcript (`verb_format_input`),
/// snapshot the files of the table-format run, and check that the other formats wrote the same files.
fn folder_verb(verb: &str, input: &str, args: &[&str]) {
    let mut first: Option<Vec<(String, Vec<u8>)>> = None;
    for format in FORMATS {
        let tmp = tempfile::tempdir().unwrap();
        let out = tmp.path().join("out");
        let mut all = args.to_vec();
        all.extend([out.to_str().unwrap(), "--format", format]);
        let run = lodestone(&all).success();
        snap(&format!("{verb}_{format}_{input}"), run.transcript_redacted(&out, "[OUT]"));
        let files = contents(&out);
        match &first {
            None => {
                snap_files(&format!("{verb}_{input}"), &out, "[OUT]");
                first = Some(files);
            }
            Some(f) => {
                let names = |v: &[(String, Vec<u8>)]| v.iter().map(|(n, _)| n.clone()).collect::<Vec<_>>();
                assert_eq!(names(f), names(&files), "{verb} --format {format} wrote other files");
                for ((name, a), (_, b)) in f.iter().zip(&files) {
                    assert!(a == b, "{verb} --format {format}: {name} differs from the table-format run");
                }
            }
        }
    }
}

#[test]
fn demo() {
    folder_verb("demo", "embedded", &["demo", "--out"]);
}

#[test]
fn section() {
    folder_verb("section", "records-demo", &["section", "records/demo", "--out"]);
}

#[test]
fn simulate_section() {
    // simulate section takes the folder first, then its options.
    for format in FORMATS {
        let tmp = tempfile::tempdir().unwrap();
        let out = tmp.path().join("project");
        let o = out.to_str().unwrap();
        let run = lodestone(&[
            "simulate",
            "section",
            o,
            "--base-age",
            "2.2",
            "--lat",
            "38.5",
            "--lon",
            "251.2",
            "--spacing",
            "2.5",
            "--specimens",
            "2",
            "--timescale",
            "records/timescales/chrons-0-6ma.csv",
            "--seed",
            "11",
            "--format",
            format,
        ])
        .success();
        let transcript = run.transcript_redacted(&out, "[OUT]");
        snap(&format!("simulate-section_{format}_chrons-0-6ma"), transcript);
        if format == "table" {
            snap_files("simulate-section_chrons-0-6ma", &out, "[OUT]");
        }
    }
}
