//! Integration tests of `lodestone simulate` (assert_cmd): folders that repeat byte for byte, pass the
//! project's table readers, and hold the model they were drawn from.

use assert_cmd::Command;
use lodestone::model::TimeScale;
use lodestone::simulate::Settings;
use lodestone::sphere::{Direction, Vec3};
use lodestone::stats::fisher_mean;
use lodestone::table::{read_bedding, read_directions, GroupBy, Table};
use std::collections::BTreeMap;
use std::fs;
use std::path::Path;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

/// An invented locality (Kerrowdale Gorge, a fictional place) and a two-rate history with two
/// bedding attitudes and a present-field-like overprint.
const SECTION: &[&str] = &[
    "--base-age",
    "3.2",
    "--top-age",
    "0.3",
    "--rates",
    "3@2,1.2@1.1,2.5",
    "--spacing",
    "0.5",
    "--specimens",
    "3",
    "--lat",
    "-38.2",
    "--lon",
    "146.7",
    "--bedding",
    "120/20,300/35",
    "--overprint",
    "0/-56",
    "--site-prefix",
    "KG",
];

fn simulate(out: &Path, extra: &[&str]) -> assert_cmd::assert::Assert {
    cmd().args(["simulate", "section", out.to_str().unwrap()]).args(SECTION).args(extra).assert()
}

fn read_all(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap())
        .map(|e| (e.file_name().to_string_lossy().to_string(), fs::read(e.path()).unwrap()))
        .collect()
}

#[test]
fn same_seed_gives_the_same_folder_byte_for_byte_on_any_thread_count() {
    let d = tempfile::tempdir().unwrap();
    let (a, b, c) = (d.path().join("a"), d.path().join("b"), d.path().join("c"));
    simulate(&a, &["--seed", "9", "--threads", "1", "--quiet"]).success();
    simulate(&b, &["--seed", "9", "--threads", "2", "--quiet"]).success();
    simulate(&c, &["--seed", "10", "--quiet"]).success();
    let (fa, fb, fc) = (read_all(&a), read_all(&b), read_all(&c));
    assert_eq!(
        fa.keys().collect::<Vec<_>>(),
        vec!["sampling.csv", "settings.toml", "steps.csv", "timescale.csv", "truth.json"]
    );
    assert_eq!(fa, fb);
    assert_ne!(fa["steps.csv"], fc["steps.csv"]);
}

#[test]
fn every_file_passes_the_readers_and_agrees_with_the_truth() {
    let d = tempfile::tempdir().unwrap();
    let dir = d.path().join("kg");
    simulate(&dir, &["--seed", "4", "--quiet"]).success();
    let steps = Table::read(&dir.join("steps.csv")).unwrap();
    let set = read_directions(&steps, &GroupBy::Default).unwrap();
    let sampling = Table::read(&dir.join("sampling.csv")).unwrap();
    let ts = TimeScale::from_table(&Table::read(&dir.join("timescale.csv")).unwrap()).unwrap();
    let settings = Settings::parse("settings.toml", &fs::read_to_string(dir.join("settings.toml")).unwrap()).unwrap();
    assert_eq!(settings.integer("seed", u64::MAX).unwrap(), Some(4));
    let truth: serde_json::Value = serde_json::from_slice(&fs::read(dir.join("truth.json")).unwrap()).unwrap();
    let levels = truth["levels"].as_array().unwrap();
    assert_eq!(levels.len(), sampling.rows.len());
    // Hand arithmetic: 3 cm/kyr × 1.2 Myr + 1.2 × 0.9 + 2.5 × 0.8 = 36 + 10.8 + 20 = 66.8 m.
    assert!((truth["thickness"].as_f64().unwrap() - 66.8).abs() < 1e-9);
    assert_eq!(levels.len(), 134);
    assert_eq!(set.records.len(), 134 * 3 * 12);
    let (h, site) = (sampling.col("height").unwrap(), sampling.col("site").unwrap());
    for (row, lv) in sampling.rows.iter().zip(levels) {
        assert_eq!(sampling.text(row, site), lv["site"].as_str().unwrap());
        assert!((sampling.number(row, h).unwrap() - lv["height"].as_f64().unwrap()).abs() < 5e-4);
        // Polarity in the truth = polarity of the written time scale at the level's true age.
        let age = lv["age"].as_f64().unwrap();
        let c = ts.chrons.iter().find(|c| c.young <= age && age < c.old).unwrap();
        assert_eq!(lv["polarity"].as_str().unwrap(), c.polarity.code());
    }
    // True ties are boundaries of the written time scale.
    for t in truth["ties"].as_array().unwrap() {
        let age = t["age"].as_f64().unwrap();
        assert!(ts.chrons.iter().any(|c| (c.young - age).abs() < 1e-9), "{age}");
    }
}

#[test]
fn site_means_recover_each_levels_field_within_its_confidence_cone() {
    let d = tempfile::tempdir().unwrap();
    let dir = d.path().join("kg");
    simulate(&dir, &["--seed", "12", "--quiet", "--kappa", "30", "--level-kappa", "40"]).success();
    let steps = Table::read(&dir.join("steps.csv")).unwrap();
    let set = read_directions(&steps, &GroupBy::Default).unwrap();
    let sampling = Table::read(&dir.join("sampling.csv")).unwrap();
    let site_col = sampling.col("site").unwrap();
    let bedding: BTreeMap<String, _> = sampling
        .rows
        .iter()
        .map(|r| (sampling.text(r, site_col).to_string(), read_bedding(&sampling, r).unwrap().unwrap()))
        .collect();
    // At 400 °C the overprint (unblocked by 300 °C) is gone: the step holds the characteristic
    // direction plus noise. Untilt it with the level's bedding and average per site.
    let (step_col, mom_col) = (steps.col("step").unwrap(), steps.col("moment").unwrap());
    let mut by_site: BTreeMap<String, Vec<Direction>> = BTreeMap::new();
    for (rec, row) in set.records.iter().zip(&steps.rows) {
        assert!(steps.number(row, mom_col).unwrap() > 0.0);
        if steps.number(row, step_col).unwrap() == 400.0 {
            let site = rec.site.clone().unwrap();
            let v: Vec3 = bedding[&site].untilt(rec.direction.to_vector());
            by_site.entry(site).or_default().push(Direction::from_vector(v).unwrap());
        }
    }
    let truth: serde_json::Value = serde_json::from_slice(&fs::read(dir.join("truth.json")).unwrap()).unwrap();
    let mut inside = 0;
    let levels = truth["levels"].as_array().unwrap();
    for lv in levels {
        let f = fisher_mean(&by_site[lv["site"].as_str().unwrap()], 0.95).unwrap();
        let t = Direction::new(lv["field_tilt"]["dec"].as_f64().unwrap(), lv["field_tilt"]["inc"].as_f64().unwrap())
            .unwrap();
        if f.mean.unwrap().angle_to(t) <= f.alpha.unwrap_or(180.0) {
            inside += 1;
        }
    }
    // Fisher's α95 covers the true mean in 95 % of samples (Fisher 1953): of 134 sites about 127
    // should be inside; the binomial standard deviation is 2.5 sites, so require at least 117.
    eprintln!("{inside} of {} sites hold the true field in their α95", levels.len());
    assert!(inside >= 117, "{inside} of {} sites hold the true field in their α95", levels.len());
}

#[test]
fn refuses_a_non_empty_folder_without_force_and_writes_nothing_on_bad_input() {
    let d = tempfile::tempdir().unwrap();
    let dir = d.path().join("kg");
    fs::create_dir(&dir).unwrap();
    fs::write(dir.join("notes.txt"), "field notebook").unwrap();
    simulate(&dir, &["--quiet"]).failure().code(1).stderr(predicates::str::contains("not empty"));
    assert!(!dir.join("steps.csv").exists());
    simulate(&dir, &["--quiet", "--force"]).success();
    assert!(dir.join("steps.csv").exists());
    // A time scale that does not reach the base: an error, and no folder.
    let ts = d.path().join("short.csv");
    fs::write(&ts, "young,old,polarity\n0,1.0,N\n1.0,2.0,R\n").unwrap();
    let none = d.path().join("none");
    simulate(&none, &["--timescale", ts.to_str().unwrap()])
        .failure()
        .code(1)
        .stderr(predicates::str::contains("time scale covers"));
    assert!(!none.exists());
    // Bad option values: exit 1 with a reason; an unknown model name is a command-line error (2).
    simulate(&none, &["--steps", "0,100,x"]).failure().code(1).stderr(predicates::str::contains("--steps"));
    simulate(&none, &["--kappa", "0"]).failure().code(1).stderr(predicates::str::contains("kappa"));
    simulate(&none, &["--model", "pareto"]).failure().code(2);
    assert!(!none.exists());
}

#[test]
fn a_given_time_scale_is_sampled_and_copied() {
    let d = tempfile::tempdir().unwrap();
    let ts = d.path().join("ts.csv");
    fs::write(
        &ts,
        "name,young,old,polarity\nA1,0,0.78,N\nA2,0.78,0.99,R\nA3,0.99,1.07,N\nA4,1.07,1.78,R\nA5,1.78,2.0,N\n",
    )
    .unwrap();
    let dir = d.path().join("kg");
    let out = cmd()
        .args([
            "simulate",
            "section",
            dir.to_str().unwrap(),
            "--timescale",
            ts.to_str().unwrap(),
            "--base-age",
            "1.9",
            "--rates",
            "2",
        ])
        .args(["--spacing", "0.5", "--lat", "52", "--lon", "-4", "--core", "--format", "json", "--quiet"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    // 2 cm/kyr = 20 m/Myr over 1.9 Myr: 38 m; the 0.78 Ma boundary lies 20 × 0.78 = 15.6 m below the top.
    assert!((v["thickness"].as_f64().unwrap() - 38.0).abs() < 1e-9);
    let tie = v["ties"].as_array().unwrap().iter().find(|t| t["age"] == 0.78).unwrap();
    assert!((v["thickness"].as_f64().unwrap() - tie["height"].as_f64().unwrap() - 15.6).abs() < 1e-9);
    assert_eq!(v["chrons"][0]["name"], "A1");
    let copy = TimeScale::from_table(&Table::read(&dir.join("timescale.csv")).unwrap()).unwrap();
    assert_eq!(copy.chrons.len(), 5);
    let steps = Table::read(&dir.join("steps.csv")).unwrap();
    assert!(steps.col("depth").is_some() && steps.col("height").is_none());
}

#[test]
fn timescale_verb_writes_a_valid_table_whose_mean_approaches_the_model() {
    let out = cmd()
        .args([
            "simulate",
            "timescale",
            "--model",
            "weibull",
            "--shape",
            "1.3",
            "--mean-interval",
            "0.25",
            "--span",
            "600",
            "--format",
            "csv",
            "--seed",
            "3",
        ])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let ts = TimeScale::from_table(&Table::parse("stdout", &out.stdout).unwrap()).unwrap();
    assert!((ts.old() - 600.0).abs() < 1e-9);
    for w in ts.chrons.windows(2) {
        assert_ne!(w[0].polarity, w[1].polarity);
    }
    let n = ts.chrons.len();
    let x: Vec<f64> = ts.chrons[1..n - 1].iter().map(|c| c.duration()).collect();
    let mean = x.iter().sum::<f64>() / x.len() as f64;
    // Weibull(k = 1.3) has coefficient of variation sqrt(Γ(1 + 2/k)/Γ(1 + 1/k)² − 1) = 0.7757
    // (SciPy 1.17.1: stats.weibull_min(1.3).std() / stats.weibull_min(1.3).mean()). About 2400
    // intervals: standard error of the mean 0.25 × 0.7754 / √2400 ≈ 0.004; allow 4 of them.
    assert!(
        (mean - 0.25).abs() < 4.0 * 0.25 * 0.7757 / (x.len() as f64).sqrt(),
        "mean {mean} from {} intervals",
        x.len()
    );
    // JSON reports the model in the contract's parameter names; --out writes the same table.
    let d = tempfile::tempdir().unwrap();
    let f = d.path().join("gpts.csv");
    let out = cmd()
        .args([
            "simulate",
            "timescale",
            "--model",
            "exponential",
            "--span",
            "5",
            "--name-prefix",
            "Z",
            "--format",
            "json",
            "--out",
            f.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["model"]["model"]["model"], "exponential");
    assert!((v["model"]["model"]["rate"].as_f64().unwrap() - 4.0).abs() < 1e-12);
    let back = TimeScale::from_table(&Table::read(&f).unwrap()).unwrap();
    assert_eq!(back.chrons.len() as u64, v["n_chrons"].as_u64().unwrap());
    assert_eq!(back.chrons[0].name.as_deref(), Some("Z1"));
    cmd().args(["simulate", "timescale", "--span", "5", "--out", f.to_str().unwrap()]).assert().failure().code(1);
    cmd()
        .args(["simulate", "timescale", "--model", "exponential", "--shape", "2", "--span", "5"])
        .assert()
        .failure()
        .code(1);
}
