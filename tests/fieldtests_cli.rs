//! Integration tests of `lodestone test …` (assert_cmd). Data are synthetic Fisher draws made with the
//! library's own seeded sampler, written to temporary CSV files.

use assert_cmd::Command;
use lodestone::montecarlo::MonteCarlo;
use lodestone::sphere::{Bedding, Direction};
use lodestone::stats::FisherSampler;
use std::fmt::Write as _;
use std::fs;
use std::path::PathBuf;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn write(dir: &tempfile::TempDir, name: &str, body: &str) -> PathBuf {
    let p = dir.path().join(name);
    fs::write(&p, body).unwrap();
    p
}

/// `n` directions around each of two means, as a directions table.
fn two_sets(seed: u64, n: usize, k: f64, m1: Direction, m2: Direction) -> String {
    let (s1, s2) = (FisherSampler::new(m1, k).unwrap(), FisherSampler::new(m2, k).unwrap());
    let d = MonteCarlo::new(seed, 2 * n).run("data", 9, |r, i| {
        if i < n {
            s1.sample_direction(r)
        } else {
            s2.sample_direction(r)
        }
    });
    let mut s = String::from("site,dec,inc\n");
    for (i, x) in d.iter().enumerate() {
        writeln!(s, "S{i:02},{:.3},{:.3}", x.dec, x.inc).unwrap();
    }
    s
}

fn json(args: &[&str]) -> serde_json::Value {
    let out = cmd().args(args).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).unwrap()
}

const N: Direction = Direction { dec: 8.0, inc: 52.0 };
const R: Direction = Direction { dec: 188.0, inc: -52.0 };

#[test]
fn reversal_json_fields_and_thread_independence() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "rev.csv", &two_sets(4, 14, 40.0, N, R));
    let f = f.to_str().unwrap();
    let v = json(&["test", "reversal", f, "--format", "json", "--resamples", "300"]);
    for key in ["n1", "n2", "gamma", "gamma_c", "class", "v_w", "v_crit", "bootstrap", "passed"] {
        assert!(!v[key].is_null(), "missing {key}");
    }
    assert_eq!(v["n1"], 14);
    assert_eq!(v["n2"], 14);
    assert!(v["gamma"].as_f64().unwrap() < v["gamma_c"].as_f64().unwrap());
    assert_eq!(v["passed"], true);
    assert!(v["notes"].as_array().unwrap().iter().any(|n| n.as_str().unwrap().contains("not proof")));
    // Same seed, 1 thread and 2 threads: identical output, byte for byte.
    let run = |t: &str, seed: &str| {
        cmd()
            .args(["--threads", t, "--seed", seed, "test", "reversal", f, "--format", "json", "--resamples", "300"])
            .output()
            .unwrap()
            .stdout
    };
    assert_eq!(run("1", "9"), run("2", "9"));
    assert_ne!(run("1", "9"), run("1", "10"));
}

#[test]
fn reversal_fails_for_modes_15_degrees_off() {
    let d = tempfile::tempdir().unwrap();
    // Exactly 15° from antipodal: the antipode moved up its meridian.
    let off = Direction { dec: 188.0, inc: -52.0 + 15.0 };
    let f = write(&d, "off.csv", &two_sets(6, 30, 50.0, N, off));
    let v = json(&["test", "reversal", f.to_str().unwrap(), "--format", "json", "--resamples", "300"]);
    assert_eq!(v["passed"], false);
    assert_eq!(v["class"], "negative");
    assert_eq!(v["v_w_passed"], false);
    assert_eq!(v["bootstrap"]["passed"], false);
    // The table output names all three approaches and the csv output is the approaches table.
    cmd()
        .args(["test", "reversal", f.to_str().unwrap(), "--resamples", "200"])
        .assert()
        .success()
        .stdout(predicates::str::contains("V_w"))
        .stdout(predicates::str::contains("class negative"));
    cmd()
        .args(["test", "reversal", f.to_str().unwrap(), "--resamples", "200", "--format", "csv"])
        .assert()
        .success()
        .stdout(predicates::str::starts_with("check,value,critical,outcome\n"));
}

#[test]
fn common_mean_of_two_files() {
    let d = tempfile::tempdir().unwrap();
    let a = write(&d, "a.csv", &two_sets(7, 10, 60.0, N, N));
    let far = Direction { dec: 40.0, inc: 52.0 };
    let b = write(&d, "b.csv", &two_sets(8, 10, 60.0, far, far));
    let c = write(&d, "c.csv", &two_sets(9, 10, 60.0, N, N));
    let (a, b, c) = (a.to_str().unwrap(), b.to_str().unwrap(), c.to_str().unwrap());
    let v = json(&["test", "common-mean", a, b, "--format", "json", "--resamples", "300"]);
    assert_eq!(v["passed"], false);
    assert_eq!(v["n1"], 20);
    let v = json(&["test", "common-mean", a, c, "--format", "json", "--resamples", "300"]);
    assert_eq!(v["passed"], true);
    for key in ["gamma", "gamma_c", "class"] {
        assert!(!v[key].is_null());
    }
}

/// Two limbs dipping 35° to 100° and 280°; `before`: magnetized before folding (directions drawn in
/// bedding coordinates, then tilted), else after folding (drawn in place).
fn fold_table(before: bool, n: usize) -> String {
    let s = FisherSampler::new(Direction { dec: 350.0, inc: 40.0 }, 35.0).unwrap();
    let d = MonteCarlo::new(11, n).run("fold", 3, |r, _| s.sample(r));
    let mut out = String::from("site,dec,inc,bed_dip_dir,bed_dip\n");
    for (i, u) in d.iter().enumerate() {
        let dd = if i % 2 == 0 { 100.0 } else { 280.0 };
        let b = Bedding::from_dip_direction(dd, 35.0, false).unwrap();
        let x = Direction::from_vector(if before { b.retilt(*u) } else { *u }).unwrap();
        writeln!(out, "F{i},{:.3},{:.3},{dd},35", x.dec, x.inc).unwrap();
    }
    out
}

#[test]
fn fold_test_verdicts_and_figure() {
    let d = tempfile::tempdir().unwrap();
    let pre = write(&d, "pre.csv", &fold_table(true, 24));
    let post = write(&d, "post.csv", &fold_table(false, 24));
    let svg = d.path().join("fold.svg");
    let v = json(&[
        "test",
        "fold",
        pre.to_str().unwrap(),
        "--format",
        "json",
        "--resamples",
        "200",
        "--plot",
        svg.to_str().unwrap(),
    ]);
    assert_eq!(v["verdict"], "pre-folding");
    assert!((v["best_untilt"].as_f64().unwrap() - 100.0).abs() <= 12.0, "{}", v["best_untilt"]);
    assert!(v["ci_low"].as_f64().unwrap() <= 100.0 && v["ci_high"].as_f64().unwrap() >= 100.0);
    let body = fs::read_to_string(&svg).unwrap();
    assert!(body.starts_with("<svg") && body.contains("untilting"));
    let v = json(&["test", "fold", post.to_str().unwrap(), "--format", "json", "--resamples", "200"]);
    assert_eq!(v["verdict"], "post-folding");
    assert!(v["best_untilt"].as_f64().unwrap().abs() <= 12.0);
}

#[test]
fn fold_needs_bedding_on_every_row() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "nobed.csv", "dec,inc,bed_dip_dir,bed_dip\n10,40,90,20\n20,40,,\n15,45,90,20\n");
    let plot = d.path().join("x.svg");
    cmd()
        .args(["test", "fold", f.to_str().unwrap(), "--plot", plot.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicates::str::contains("nobed.csv:3: column 'bed_dip': no bedding"));
    assert!(!plot.exists());
    let f = write(&d, "plane.csv", "dec,inc,kind\n10,40,line\n20,40,plane\n");
    cmd()
        .args(["test", "random", f.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicates::str::contains("plane.csv:3: column 'kind'"));
    cmd().args(["test", "reversal"]).assert().code(2);
}

#[test]
fn randomness_test_outputs() {
    let d = tempfile::tempdir().unwrap();
    // Ten directions at the vertices of a regular icosahedron-like spread cancel out: R is tiny.
    let phi = (1.0 + 5f64.sqrt()) / 2.0;
    let verts = [
        (0.0, 1.0, phi),
        (0.0, -1.0, -phi),
        (1.0, phi, 0.0),
        (-1.0, -phi, 0.0),
        (phi, 0.0, 1.0),
        (-phi, 0.0, -1.0),
        (0.0, -1.0, phi),
        (0.0, 1.0, -phi),
        (1.0, -phi, 0.0),
        (-1.0, phi, 0.0),
    ];
    let mut s = String::from("dec,inc\n");
    for (x, y, z) in verts {
        let dir = Direction::from_vector(lodestone::sphere::Vec3::new(x, y, z)).unwrap();
        writeln!(s, "{:.6},{:.6}", dir.dec, dir.inc).unwrap();
    }
    let f = write(&d, "scatter.csv", &s);
    let v = json(&["test", "random", f.to_str().unwrap(), "--format", "json"]);
    assert_eq!(v["n"], 10);
    assert!(v["r"].as_f64().unwrap() < 1e-3);
    // Watson (1956) R₀ for N = 10 at 95 % is 5.03 (textbook table, from memory).
    assert!((v["r0"].as_f64().unwrap() - 5.03).abs() < 0.005);
    assert_eq!(v["random"], true);
    let g = write(&d, "tight.csv", &two_sets(3, 5, 20.0, N, N));
    let v = json(&["test", "random", g.to_str().unwrap(), "--format", "json"]);
    assert_eq!(v["random"], false);
    cmd()
        .args(["test", "random", g.to_str().unwrap(), "--format", "csv"])
        .assert()
        .success()
        .stdout(predicates::str::starts_with("n,r,r0,p_value,random\n10,"));
}

#[test]
fn the_readme_example_of_a_negative_reversal_test_stays_negative() {
    // records/quillan-scarp-sites.csv is invented (its header states the model): site means whose fits
    // carry an overprint. The README quotes these numbers for "What a negative reversal test means"; the
    // three checks must agree that the two modes are not antipodal.
    let f = concat!(env!("CARGO_MANIFEST_DIR"), "/records/quillan-scarp-sites.csv");
    let v = json(&["test", "reversal", f, "--format", "json"]);
    assert_eq!((v["n1"].as_u64(), v["n2"].as_u64()), (Some(12), Some(8)));
    assert_eq!(v["class"], "negative");
    assert_eq!(v["passed"], false);
    assert_eq!(v["bootstrap"]["passed"], false);
    let (g, gc) = (v["gamma"].as_f64().unwrap(), v["gamma_c"].as_f64().unwrap());
    let (vw, vc) = (v["v_w"].as_f64().unwrap(), v["v_crit"].as_f64().unwrap());
    assert!(g > gc && vw > vc, "γ {g} γc {gc} V_w {vw} critical {vc}");
    let quoted = [format!("{g:.1}"), format!("{gc:.1}"), format!("{vw:.1}"), format!("{vc:.1}")];
    assert_eq!(quoted, ["13.4", "8.1", "19.8", "7.3"], "update the README's numbers");
}
