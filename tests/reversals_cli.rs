//! Integration tests of `lodestone intervals`, `hazard` and `rate` (assert_cmd). Time scales are
//! simulated here from stated models with fixed seeds; nothing is read from bundled scales.

use assert_cmd::Command;
use lodestone::montecarlo::MonteCarlo;
use lodestone::reversals::{Fitted, Model};
use predicates::prelude::*;
use serde_json::Value;
use std::fs;
use std::path::PathBuf;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

/// A time scale of `n` chrons with lengths drawn from `model` (seeded), alternating polarity, the
/// youngest starting at 0 Ma (so it is the open chron). Ages rounded to 1e-6 Ma.
fn scale(dir: &tempfile::TempDir, model: Fitted, n: usize, seed: u64) -> (PathBuf, Vec<f64>) {
    let lengths = MonteCarlo::new(seed, n).run("scale", 0, |rng, _| (model.sample(rng) * 1e6).round().max(1.0) / 1e6);
    let mut body = String::from("# simulated scale for tests\nyoung,old,polarity,name\n");
    let mut t = 0.0f64;
    for (i, d) in lengths.iter().enumerate() {
        let young = (t * 1e6).round() / 1e6;
        t = young + d;
        let old = (t * 1e6).round() / 1e6;
        body.push_str(&format!("{young},{old},{},c{i}\n", if i % 2 == 0 { "N" } else { "R" }));
    }
    let p = dir.path().join("scale.csv");
    fs::write(&p, body).unwrap();
    // Re-read the lengths as written (rounded ages) so closed-form checks use the file's own numbers.
    let text = fs::read_to_string(&p).unwrap();
    let got = text
        .lines()
        .skip(2)
        .map(|l| {
            let f: Vec<f64> = l.split(',').take(2).map(|x| x.parse().unwrap()).collect();
            f[1] - f[0]
        })
        .collect();
    (p, got)
}

fn json(args: &[&str]) -> Value {
    let out = cmd().args(args).args(["--format", "json", "--quiet"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).unwrap()
}

const GAMMA2: Fitted = Fitted { model: Model::Gamma, params: [2.0, 0.125] };

#[test]
fn intervals_follow_the_contract_and_the_censored_closed_form() {
    let d = tempfile::tempdir().unwrap();
    let (f, len) = scale(&d, GAMMA2, 80, 21);
    let v = json(&["intervals", f.to_str().unwrap(), "--resamples", "50"]);
    // 80 chrons: the open one is censored; the oldest ends with the table (an arbitrary age, nothing
    // says it is a reversal), so it is censored too, as a second censored length.
    assert_eq!(v["n_intervals"], 78);
    assert_eq!(v["left_out"], 0);
    assert!((v["censored"].as_f64().unwrap() - len[0]).abs() < 1e-9);
    assert!((v["censored_old"].as_f64().unwrap() - len[79]).abs() < 1e-9);
    assert_eq!(v["old_edge"], "censored");
    let models = v["models"].as_array().unwrap();
    let names: Vec<&str> = models.iter().map(|m| m["model"].as_str().unwrap()).collect();
    assert_eq!(names, ["exponential", "gamma", "weibull", "lognormal", "inverse_gaussian"]);
    for m in models {
        for k in ["loglik", "aic", "bic", "weight", "ks_d", "ks_p", "ad", "ad_p"] {
            assert!(m[k].is_number(), "{k} in {m}");
        }
    }
    // Lawless (2003) §2.2: censored exponential rate = complete intervals / total time (both
    // censored lengths included).
    let total: f64 = len[..80].iter().sum();
    assert!((models[0]["params"]["rate"].as_f64().unwrap() - 78.0 / total).abs() < 1e-9);
    assert!(models[1]["params"]["shape"].is_number() && models[3]["params"]["sigma"].is_number());
    assert!(models[4]["params"]["mean"].is_number() && models[4]["params"]["shape"].is_number());
    assert!(v["lr_test"]["p_value"].as_f64().unwrap() < 0.05, "gamma(2) intervals reject shape 1");
    // --no-censor: censored is null and the rate is n / Σ complete.
    // --no-censor with the oldest row left out: censored is null and the rate is n / Σ complete.
    let v = json(&["intervals", f.to_str().unwrap(), "--resamples", "20", "--no-censor", "--old-edge", "left-out"]);
    assert!(v["censored"].is_null() && v["censored_old"].is_null());
    assert_eq!((v["left_out"].as_u64(), v["old_edge"].as_str()), (Some(1), Some("left-out")));
    let complete: f64 = len[1..79].iter().sum();
    assert!((v["models"][0]["params"]["rate"].as_f64().unwrap() - 78.0 / complete).abs() < 1e-9);
    // --old-edge complete: 79 complete intervals.
    let v = json(&["intervals", f.to_str().unwrap(), "--resamples", "20", "--old-edge", "complete"]);
    assert_eq!(v["n_intervals"], 79);
}

#[test]
fn min_length_merges_and_says_so() {
    let d = tempfile::tempdir().unwrap();
    let (f, len) = scale(&d, GAMMA2, 60, 22);
    let short = len[1..len.len() - 1].iter().filter(|&&x| x < 0.05).count();
    assert!(short > 0, "the seeded scale has short chrons");
    let v = json(&["intervals", f.to_str().unwrap(), "--resamples", "20", "--min-length", "0.05"]);
    assert!(v["merged_short"].as_u64().unwrap() >= 1);
    assert!(v["n_intervals"].as_u64().unwrap() < 58);
    let notes = v["notes"].to_string();
    assert!(notes.contains("merged into their neighbours"), "{notes}");
}

#[test]
fn hazard_reports_models_average_and_cautions() {
    let d = tempfile::tempdir().unwrap();
    let (f, _) = scale(&d, GAMMA2, 80, 23);
    let v = json(&["hazard", f.to_str().unwrap(), "--elapsed", "0.3", "--horizon", "0.1", "--resamples", "40"]);
    let models = v["models"].as_array().unwrap();
    assert_eq!(models.len(), 5);
    // The exponential answer does not depend on the elapsed time: 1 − e^(−λΔ) (Cox 1962).
    let rate = models[0]["params"]["rate"].as_f64().unwrap();
    assert!((models[0]["p_within"].as_f64().unwrap() - (1.0 - (-rate * 0.1).exp())).abs() < 1e-12);
    assert!((models[0]["hazard"].as_f64().unwrap() - rate).abs() < 1e-12);
    let ps: Vec<f64> = models.iter().map(|m| m["p_within"].as_f64().unwrap()).collect();
    let avg = v["averaged"]["p_within"].as_f64().unwrap();
    assert!(
        avg >= ps.iter().copied().fold(1.0, f64::min) - 1e-12 && avg <= ps.iter().copied().fold(0.0, f64::max) + 1e-12
    );
    let (lo, hi) = (v["averaged"]["low"].as_f64().unwrap(), v["averaged"]["high"].as_f64().unwrap());
    assert!(lo <= hi);
    let cautions = v["cautions"].to_string();
    for phrase in ["no memory", "overdue", "length-biased", "not a forecast"] {
        assert!(cautions.contains(phrase), "{phrase}");
        assert!(v["notes"].to_string().contains(phrase), "{phrase} in notes");
    }
    // Same seed, any thread count: identical output.
    let run = |threads: &str| {
        cmd()
            .args([
                "hazard",
                f.to_str().unwrap(),
                "--elapsed",
                "0.3",
                "--resamples",
                "40",
                "--format",
                "json",
                "--threads",
                threads,
                "--quiet",
            ])
            .output()
            .unwrap()
            .stdout
    };
    assert_eq!(run("1"), run("2"));
    // Table output shows the cautions too.
    cmd()
        .args(["hazard", f.to_str().unwrap(), "--resamples", "20", "--quiet"])
        .assert()
        .success()
        .stdout(predicate::str::contains("not a forecast"))
        .stdout(predicate::str::contains("averaged (Akaike weights)"));
}

#[test]
fn rate_outputs_and_figures() {
    let d = tempfile::tempdir().unwrap();
    let (f, len) = scale(&d, Fitted { model: Model::Exponential, params: [4.0, f64::NAN] }, 60, 24);
    let v = json(&["rate", f.to_str().unwrap(), "--window", "2"]);
    let pts = v["rate"].as_array().unwrap();
    assert!(!pts.is_empty());
    for p in pts {
        let (r, lo, hi) = (p["rate"].as_f64().unwrap(), p["low"].as_f64().unwrap(), p["high"].as_f64().unwrap());
        assert!(lo <= r && r <= hi);
    }
    assert!(v["laplace"]["u"].is_number() && v["clustering"]["mean_h"].is_number());
    assert_eq!(v["n_reversals"], (len.len() - 1) as u64);
    cmd()
        .args(["rate", f.to_str().unwrap(), "--format", "csv"])
        .assert()
        .success()
        .stdout(predicate::str::starts_with("age,rate,low,high,count\n"));
    for (verb, name) in [("rate", "r.svg"), ("intervals", "i.png"), ("hazard", "h.svg")] {
        let out = d.path().join(name);
        cmd()
            .args(
                [verb, f.to_str().unwrap(), "--plot", out.to_str().unwrap(), "--resamples", "10", "--quiet"]
                    .iter()
                    .filter(|a| verb != "rate" || (**a != "--resamples" && **a != "10")),
            )
            .assert()
            .success();
        let bytes = fs::read(&out).unwrap();
        if name.ends_with(".png") {
            assert_eq!(&bytes[1..4], b"PNG");
        } else {
            assert!(String::from_utf8_lossy(&bytes).contains("<svg"));
        }
    }
}

#[test]
fn bad_input_names_file_line_and_column_and_writes_nothing() {
    let d = tempfile::tempdir().unwrap();
    let f = d.path().join("bad.csv");
    fs::write(&f, "young,old,polarity\n0,0.5,N\n0.5,1.0,Q\n").unwrap();
    let fig = d.path().join("x.svg");
    cmd()
        .args(["intervals", f.to_str().unwrap(), "--plot", fig.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("bad.csv:3: column 'polarity'"));
    assert!(!fig.exists());
    // Two chrons leave one complete interval: too few to fit, a clear error.
    fs::write(&f, "young,old,polarity\n0,0.5,N\n0.5,1.0,R\n").unwrap();
    cmd().args(["intervals", f.to_str().unwrap()]).assert().code(1).stderr(predicate::str::contains("at least 2"));
    // No open chron in the window and no --elapsed.
    let (s, _) = scale(&d, GAMMA2, 30, 25);
    cmd()
        .args(["hazard", s.to_str().unwrap(), "--from", "1"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("--elapsed"));
    // A level outside (0, 1) is refused, not turned into a missing interval.
    cmd()
        .args(["hazard", s.to_str().unwrap(), "--level", "1.5"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("level").and(predicate::str::contains("1.5")));
    cmd().args(["hazard", s.to_str().unwrap(), "--horizon"]).assert().code(2);
}

#[test]
fn fits_recover_a_scale_drawn_by_the_simulate_verb() {
    // End-to-end with an independent sampler: `simulate timescale` draws with rand_distr's Weibull,
    // not with this module's sampler. Weibull shape 1.5, mean 0.25 Myr, 90 Myr (seeded): the fitted
    // shape lies within 0.15 of 1.5 (its standard error with ~360 intervals is about 0.06) and the
    // Weibull model carries most of the Akaike weight.
    let d = tempfile::tempdir().unwrap();
    let out = cmd()
        .args([
            "simulate",
            "timescale",
            "--span",
            "90",
            "--model",
            "weibull",
            "--shape",
            "1.5",
            "--format",
            "csv",
            "--seed",
            "3",
            "--quiet",
        ])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let f = d.path().join("sim.csv");
    fs::write(&f, &out.stdout).unwrap();
    let v = json(&["intervals", f.to_str().unwrap(), "--resamples", "20"]);
    let w = v["models"].as_array().unwrap().iter().find(|m| m["model"] == "weibull").unwrap();
    let shape = w["params"]["shape"].as_f64().unwrap();
    assert!((shape - 1.5).abs() < 0.15, "{shape}");
    assert!(w["weight"].as_f64().unwrap() > 0.5);
}
