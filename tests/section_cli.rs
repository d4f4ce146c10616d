//! End-to-end tests of `lodestone section` and `lodestone demo`: a section simulated from a known
//! time scale is run through the whole chain and the true correlation and age model are recovered
//! (compared with the folder's `truth.json`); the same inputs give byte-identical outputs; the
//! report holds every figure and table.
//!
//! The time scale is the bundled `records/timescales/chrons-0-6ma.csv` (ages written from memory,
//! see the README); the test compares the pipeline with the model that generated the data, so the
//! exact ages do not matter here.

use assert_cmd::Command;
use std::collections::BTreeMap;
use std::fs;
use std::path::{Path, PathBuf};

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn repo(p: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(p)
}

/// Simulate a short section (few specimens, few resamples, so the debug build stays fast).
fn simulate(dir: &Path, seed: &str) {
    let ts = repo("records/timescales/chrons-0-6ma.csv");
    let out = cmd()
        .args([
            "simulate",
            "section",
            dir.to_str().unwrap(),
            "--seed",
            seed,
            "--base-age",
            "2.0",
            "--lat",
            "-33.5",
            "--lon",
            "18.2",
        ])
        .args(["--rates", "2.2@1.2,1.4", "--spacing", "0.8", "--specimens", "3", "--kappa", "60"])
        .args(["--bedding", "40/10,60/25,80/35", "--timescale", ts.to_str().unwrap(), "--quiet"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let s = dir.join("settings.toml");
    let text = fs::read_to_string(&s).unwrap().replace("resamples = 1000", "resamples = 200");
    fs::write(&s, text).unwrap();
}

fn section(dir: &Path, out: &Path, extra: &[&str]) -> serde_json::Value {
    let o = cmd()
        .args(["section", dir.to_str().unwrap(), "--out", out.to_str().unwrap(), "--format", "json", "--quiet"])
        .args(extra)
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    serde_json::from_slice(&o.stdout).unwrap()
}

fn read_csv(p: &Path) -> Vec<BTreeMap<String, String>> {
    let text = fs::read_to_string(p).unwrap();
    let mut lines = text.lines();
    let head: Vec<String> = lines.next().unwrap().split(',').map(String::from).collect();
    lines.map(|l| head.iter().cloned().zip(l.split(',').map(String::from)).collect()).collect()
}

fn all_files(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    let mut m = BTreeMap::new();
    for sub in ["", "tables", "figures"] {
        for e in fs::read_dir(dir.join(sub)).unwrap() {
            let p = e.unwrap().path();
            if p.is_file() {
                m.insert(p.strip_prefix(dir).unwrap().display().to_string(), fs::read(&p).unwrap());
            }
        }
    }
    m
}

#[test]
fn simulated_section_recovers_the_true_correlation_and_age_model() {
    let d = tempfile::tempdir().unwrap();
    let proj = d.path().join("proj");
    simulate(&proj, "11");
    let out = d.path().join("out");
    let j = section(&proj, &out, &[]);
    let truth: serde_json::Value = serde_json::from_slice(&fs::read(proj.join("truth.json")).unwrap()).unwrap();

    // Every reversal the sampled levels can show: a polarity change between consecutive levels.
    let levels = truth["levels"].as_array().unwrap();
    let mut expected = Vec::new();
    for w in levels.windows(2) {
        if w[0]["polarity"] != w[1]["polarity"] {
            // The true tie between them: the youngest true boundary older than the upper level.
            let (h0, h1) = (w[0]["height"].as_f64().unwrap(), w[1]["height"].as_f64().unwrap());
            let ties: Vec<f64> = truth["ties"]
                .as_array()
                .unwrap()
                .iter()
                .filter(|t| {
                    let h = t["height"].as_f64().unwrap();
                    h > h0 && h < h1
                })
                .map(|t| t["age"].as_f64().unwrap())
                .collect();
            expected.push((h0, h1, ties));
        }
    }
    let got: Vec<[f64; 2]> = serde_json::from_value(j["headline"]["ties"].clone()).unwrap();
    assert_eq!(got.len(), expected.len(), "ties {got:?} against the true reversals {expected:?}");
    for (g, (h0, h1, ages)) in got.iter().rev().zip(&expected) {
        assert!(g[0] >= *h0 - 1e-9 && g[0] <= *h1 + 1e-9, "tie at {} m outside the gap {h0}–{h1}", g[0]);
        assert!(
            ages.iter().any(|a| (a - g[1]).abs() < 1e-6),
            "tie age {} not among the true boundary ages {ages:?}",
            g[1]
        );
    }

    // Age model against the true ages of the levels.
    let ages: BTreeMap<String, f64> =
        levels.iter().map(|l| (l["site"].as_str().unwrap().to_string(), l["age"].as_f64().unwrap())).collect();
    let pol: BTreeMap<String, String> = levels
        .iter()
        .map(|l| (l["site"].as_str().unwrap().to_string(), l["polarity"].as_str().unwrap().to_string()))
        .collect();
    let rows = read_csv(&out.join("tables/age-model.csv"));
    assert!(rows.len() >= levels.len() * 3 / 4, "{} of {} levels used", rows.len(), levels.len());
    let errs: Vec<f64> = rows.iter().map(|r| (r["age"].parse::<f64>().unwrap() - ages[&r["site"]]).abs()).collect();
    let mean = errs.iter().sum::<f64>() / errs.len() as f64;
    let max = errs.iter().cloned().fold(0.0, f64::max);
    eprintln!("age model: {} levels, mean |error| {mean:.4} Myr, max {max:.4} Myr", errs.len());
    assert!(mean < 0.05 && max < 0.2, "mean {mean}, max {max}");
    assert!(rows.iter().all(|r| r["polarity"] == pol[&r["site"]]), "a level's polarity differs from the model");
}

#[test]
fn same_inputs_give_byte_identical_outputs_on_any_thread_count() {
    let d = tempfile::tempdir().unwrap();
    let proj = d.path().join("proj");
    simulate(&proj, "5");
    let (a, b) = (d.path().join("a"), d.path().join("b"));
    section(&proj, &a, &[]);
    section(&proj, &b, &["--threads", "1"]);
    let (fa, fb) = (all_files(&a), all_files(&b));
    assert!(fa.len() > 10);
    assert_eq!(fa.keys().collect::<Vec<_>>(), fb.keys().collect::<Vec<_>>());
    for (k, v) in &fa {
        assert!(v == &fb[k], "{k} differs between runs");
    }
    // The report holds no absolute path of the run.
    let html = String::from_utf8(fa["report.html"].clone()).unwrap();
    assert!(!html.contains(d.path().to_str().unwrap()));
}

#[test]
fn a_second_run_into_the_same_folder_is_refused_without_force() {
    // The report itself is checked in tests/report_cli.rs.
    let d = tempfile::tempdir().unwrap();
    let out = d.path().join("demo-out");
    let o = cmd().args(["demo", "--out", out.to_str().unwrap(), "--quiet"]).output().unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(out.join("report.html").exists());
    let o = cmd().args(["demo", "--out", out.to_str().unwrap(), "--quiet"]).output().unwrap();
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("--force"));
}

#[test]
fn bad_project_folders_fail_with_exit_code_1_naming_the_problem() {
    let d = tempfile::tempdir().unwrap();
    let proj = d.path().join("p");
    fs::create_dir(&proj).unwrap();
    let o = cmd().args(["section", proj.to_str().unwrap(), "--quiet"]).output().unwrap();
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("no steps.csv"));
    fs::write(proj.join("steps.csv"), "specimen,site,step,dec,inc,moment\nA1,S1,0,10,40,1e-6\n").unwrap();
    fs::write(proj.join("sampling.csv"), "site,lat,lon,height\nS1,95,10,1\n").unwrap();
    let o = cmd()
        .args(["section", proj.to_str().unwrap(), "--out", d.path().join("o").to_str().unwrap(), "--quiet"])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(1));
    let e = String::from_utf8_lossy(&o.stderr);
    assert!(e.contains("sampling.csv:2") && e.contains("'lat'"), "{e}");
    assert!(!d.path().join("o").exists(), "nothing is written on an error");
}

#[test]
fn stages_that_cannot_run_are_skipped_with_warnings_not_failures() {
    // Flat-lying beds (no bedding variation) and no time scale: the fold test, the correlation and the
    // reversal statistics are skipped, the rest runs, the exit code is 0.
    let d = tempfile::tempdir().unwrap();
    let proj = d.path().join("flat");
    let o = cmd()
        .args([
            "simulate",
            "section",
            proj.to_str().unwrap(),
            "--seed",
            "3",
            "--base-age",
            "1.5",
            "--lat",
            "12",
            "--lon",
            "300",
        ])
        .args(["--spacing", "1.5", "--specimens", "2", "--quiet"])
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    fs::remove_file(proj.join("timescale.csv")).unwrap();
    fs::write(proj.join("settings.toml"), "resamples = 200\ncolour = \"blue\"\n").unwrap();
    let out = d.path().join("o");
    let j = section(&proj, &out, &[]);
    let warnings: Vec<String> = serde_json::from_value(j["warnings"].clone()).unwrap();
    let has = |s: &str| warnings.iter().any(|w| w.contains(s));
    assert!(has("Fold test skipped"), "{warnings:?}");
    assert!(has("no timescale.csv"), "{warnings:?}");
    assert!(has("unknown key 'colour'"), "{warnings:?}");
    let ran: Vec<(String, bool)> = j["stages"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| (s["name"].as_str().unwrap().to_string(), s["ran"].as_bool().unwrap()))
        .collect();
    let correlation = ran.iter().find(|(n, _)| n.starts_with("Correlation")).unwrap();
    assert!(ran[0].1 && ran[1].1 && !correlation.1, "{ran:?}");
    // The folder is synthetic (simulate wrote truth.json): the comparison stage runs without a time scale.
    assert!(ran.iter().any(|(n, r)| n == "Comparison with the true model" && *r), "{ran:?}");
    assert!(out.join("tables/zones.csv").exists() && !out.join("tables/age-model.csv").exists());
    let html = fs::read_to_string(out.join("report.html")).unwrap();
    assert!(html.contains("Fold test skipped"));
}
