//! Integration tests of `lodestone components` and of `lodestone mean` with great circles.

use assert_cmd::Command;
use predicates::prelude::*;
use std::fs;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

/// Run lodestone, require success (printing stderr otherwise) and parse its JSON output.
fn run_json(args: &[&str]) -> serde_json::Value {
    let out = cmd().args(args).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).unwrap()
}

fn write(dir: &tempfile::TempDir, name: &str, body: &str) -> std::path::PathBuf {
    let p = dir.path().join(name);
    fs::write(&p, body).unwrap();
    p
}

/// Noise-free synthetic steps built here from a known history: characteristic component (dec 200,
/// inc −30, moment 1e-8 A·m² at NRM) decaying linearly to zero at 100 mT; overprint (dec 0, inc 60,
/// 0.8e-8) gone by 20 mT.
fn steps_csv() -> String {
    let v = |d: f64, i: f64| {
        let (d, i) = (d.to_radians(), i.to_radians());
        [i.cos() * d.cos(), i.cos() * d.sin(), i.sin()]
    };
    let (c, o) = (v(200.0, -30.0), v(0.0, 60.0));
    let mut s = String::from("specimen,site,treatment,step,dec,inc,moment,height\n");
    for (name, site, h) in [("A1", "SA", 1.0), ("A2", "SA", 1.0)] {
        for step in [0.0, 10.0, 20.0, 30.0, 40.0, 60.0, 80.0] {
            let fc = 1e-8 * (1.0 - step / 100.0);
            let fo = 0.8e-8 * (1.0 - step / 20.0f64).max(0.0);
            let x: Vec<f64> = (0..3).map(|k| c[k] * fc + o[k] * fo).collect();
            let m = (x[0] * x[0] + x[1] * x[1] + x[2] * x[2]).sqrt();
            let dec = x[1].atan2(x[0]).to_degrees().rem_euclid(360.0);
            let inc = (x[2] / m).asin().to_degrees();
            s += &format!(
                "{name},{site},{},{step},{dec:.10},{inc:.10},{m:.12e},{h}\n",
                if step == 0.0 { "nrm" } else { "af" }
            );
        }
    }
    s
}

#[test]
fn range_fit_recovers_the_known_component_and_feeds_mean() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "steps.csv", &steps_csv());
    let v = run_json(&["components", f.to_str().unwrap(), "--from", "20", "--to", "80", "--format", "json"]);
    let fit = &v["fits"][0];
    assert_eq!(fit["specimen"], "A1");
    assert_eq!(fit["kind"], "line");
    assert_eq!(fit["anchor"], "free");
    assert_eq!(fit["n_steps"], 5);
    assert!((fit["dec"].as_f64().unwrap() - 200.0).abs() < 1e-6);
    assert!((fit["inc"].as_f64().unwrap() + 30.0).abs() < 1e-6);
    assert!(fit["mad"].as_f64().unwrap() < 1e-5 && fit["dang"].as_f64().unwrap() < 1e-5);
    // The CSV output is a directions table that `mean` reads.
    let csv = cmd()
        .args(["components", f.to_str().unwrap(), "--from", "20", "--to", "80", "--format", "csv"])
        .output()
        .unwrap();
    let text = String::from_utf8(csv.stdout).unwrap();
    assert!(text.starts_with("specimen,site,kind,anchor,n_steps,from,to,dec,inc,mad,dang,height\n"), "{text}");
    let fits = write(&d, "fits.csv", &text);
    let m = run_json(&["mean", fits.to_str().unwrap(), "--format", "json"]);
    assert_eq!(m["groups"][0]["group"], "SA");
    assert_eq!(m["groups"][0]["n"], 2);
    assert!((m["groups"][0]["dec"].as_f64().unwrap() - 200.0).abs() < 1e-6);
}

#[test]
fn auto_picks_and_planes() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "steps.csv", &steps_csv());
    let v = run_json(&["components", f.to_str().unwrap(), "--auto", "--format", "json"]);
    // The overprint is gone at 20 mT: the last component, grown down from 80, stops at 20 (the step
    // below departs from the line), and so does the earlier longest-run rule.
    assert_eq!(v["fits"][0]["from"], 20.0);
    assert_eq!(v["fits"][0]["to"], 80.0);
    assert_eq!(v["rule"]["rule"], "last");
    assert_eq!(v["rule"]["max_mad"], 15.0);
    assert!(v["fits"][0]["grade"].is_string() && v["fits"][0]["reason"].is_string());
    let v = run_json(&["components", f.to_str().unwrap(), "--auto", "--rule", "longest", "--format", "json"]);
    assert_eq!((v["fits"][0]["from"].as_f64(), v["fits"][0]["to"].as_f64()), (Some(20.0), Some(80.0)));
    assert_eq!(v["rule"]["max_mad"], 5.0);
    // Picks: a plane for A1 over the whole path (pole ⟂ both components), an anchored line for A2;
    // a specimen without a pick is listed, not dropped.
    let picks = write(&d, "picks.csv", "specimen,from,to,kind,anchor\nA1,0,80,plane,free\n");
    let v = run_json(&["components", f.to_str().unwrap(), "--picks", picks.to_str().unwrap(), "--format", "json"]);
    assert_eq!(v["fits"][0]["kind"], "plane");
    assert!(v["fits"][0]["dang"].is_null());
    assert_eq!(v["unfitted"][0]["specimen"], "A2");
    let picks = write(&d, "picks2.csv", "specimen,from,to,anchor\nA2,30,80,origin\n");
    let v = run_json(&["components", f.to_str().unwrap(), "--picks", picks.to_str().unwrap(), "--format", "json"]);
    assert_eq!(v["fits"][0]["anchor"], "origin");
    assert!((v["fits"][0]["dec"].as_f64().unwrap() - 200.0).abs() < 1e-6);
}

#[test]
fn mean_mixes_lines_and_planes_and_stays_fisher_without_planes() {
    let d = tempfile::tempdir().unwrap();
    // Lines only: identical to the plain Fisher run of the same rows.
    let lines = "site,dec,inc,kind\nS,12,45,line\nS,20,51,line\nS,355,38,line\nS,8,60,line\n";
    let plain = "site,dec,inc\nS,12,45\nS,20,51\nS,355,38\nS,8,60\n";
    let a = cmd().args(["mean", write(&d, "l.csv", lines).to_str().unwrap(), "--format", "json"]).output().unwrap();
    let b = cmd().args(["mean", write(&d, "p.csv", plain).to_str().unwrap(), "--format", "json"]).output().unwrap();
    let (a, b): (serde_json::Value, serde_json::Value) =
        (serde_json::from_slice(&a.stdout).unwrap(), serde_json::from_slice(&b.stdout).unwrap());
    for k in ["n", "dec", "inc", "r", "k", "a95", "theta63"] {
        assert_eq!(a["groups"][0][k], b["groups"][0][k], "{k}");
    }
    // With three great circles: the SciPy-checked combined mean (see stats::mixed tests).
    let mixed = format!("{lines}S,100,10,plane\nS,290,-20,plane\nS,200,30,plane\n");
    let v = run_json(&["mean", write(&d, "m.csv", &mixed).to_str().unwrap(), "--format", "json"]);
    let g = &v["groups"][0];
    assert_eq!(g["n"], 7);
    assert_eq!(g["planes"], 3);
    assert!((g["dec"].as_f64().unwrap() - 3.88943373).abs() < 1e-6);
    assert!((g["r"].as_f64().unwrap() - 6.913500479025619).abs() < 1e-9);
    // A group of one great circle alone has no mean: reported with nulls and a note, not an error.
    let one = write(
        &d,
        "one.csv",
        "site,dec,inc,kind
T,100,10,plane
U,10,40,line
U,12,44,line
",
    );
    let v = run_json(&["mean", one.to_str().unwrap(), "--format", "json"]);
    assert!(v["groups"][0]["dec"].is_null() && v["groups"][0]["k"].is_null());
    assert!(v["notes"][0].as_str().unwrap().contains("no combined mean"));
    assert_eq!(v["groups"][1]["n"], 2);
}

#[test]
fn bad_input_is_refused_with_file_line_column() {
    let d = tempfile::tempdir().unwrap();
    let head = "specimen,step,dec,inc,moment\n";
    let cases = [
        (
            "order.csv",
            format!("{head}X,0,10,20,1e-8\nX,20,10,20,1e-8\nX,10,10,20,1e-8\n"),
            ":4: column 'step': step 10 of specimen X comes after step 20",
        ),
        (
            "repeat.csv",
            format!("{head}X,0,10,20,1e-8\nX,0,11,20,1e-8\n"),
            ":3: column 'step': step 0 of specimen X is repeated",
        ),
        ("zero.csv", format!("{head}X,0,10,20,0\n"), ":2: column 'moment': is zero"),
        (
            "nomoment.csv",
            "specimen,step,dec,inc\nX,0,10,20\n".to_string(),
            ":1: column 'moment': required column is missing",
        ),
    ];
    for (name, body, msg) in cases {
        let f = write(&d, name, &body);
        cmd()
            .args(["components", f.to_str().unwrap(), "--auto"])
            .assert()
            .code(1)
            .stdout("")
            .stderr(predicate::str::contains(name))
            .stderr(predicate::str::contains(msg));
    }
    let f = write(&d, "steps.csv", &steps_csv());
    let picks = [
        (
            "unknown.csv",
            "specimen,from,to\nZZ,0,80\n",
            ":2: column 'specimen': specimen 'ZZ' is not in the steps table",
        ),
        (
            "short.csv",
            "specimen,from,to\nA1,20,25\n",
            ":2: column 'from': the range 20 to 25 holds 1 step(s) of specimen A1; a line needs at least 2",
        ),
        ("shortplane.csv", "specimen,from,to,kind\nA1,20,30,plane\n", "a plane needs at least 3"),
        ("backwards.csv", "specimen,from,to\nA1,80,20\n", ":2: column 'to': 20 is below from = 80"),
    ];
    for (name, body, msg) in picks {
        let p = write(&d, name, body);
        cmd()
            .args(["components", f.to_str().unwrap(), "--picks", p.to_str().unwrap()])
            .assert()
            .code(1)
            .stderr(predicate::str::contains(name))
            .stderr(predicate::str::contains(msg));
    }
    // Command-line mistakes exit 2: no range choice, --from without --to, two choices at once.
    cmd().args(["components", f.to_str().unwrap()]).assert().code(2);
    cmd().args(["components", f.to_str().unwrap(), "--from", "20"]).assert().code(2);
    cmd().args(["components", f.to_str().unwrap(), "--auto", "--from", "20", "--to", "30"]).assert().code(2);
}

#[test]
fn plots_one_figure_per_specimen_and_never_over_inputs() {
    let d = tempfile::tempdir().unwrap();
    let body = steps_csv().replace("A2,", "A/2 x,");
    let f = write(&d, "steps.csv", &body);
    let dir = d.path().join("figs");
    cmd().args(["components", f.to_str().unwrap(), "--auto", "--plot", dir.to_str().unwrap()]).assert().success();
    let svg = fs::read_to_string(dir.join("A1.svg")).unwrap();
    assert!(svg.contains("<svg") && svg.contains("MAD"));
    assert!(dir.join("A_2_x.svg").exists());
    cmd()
        .args([
            "components",
            f.to_str().unwrap(),
            "--auto",
            "--plot",
            dir.to_str().unwrap(),
            "--plot-format",
            "png",
            "--force",
        ])
        .assert()
        .success();
    assert_eq!(&fs::read(dir.join("A1.png")).unwrap()[1..4], b"PNG");
    // A steps file that sits where a figure would go is an input: refused, left intact.
    let clash = d.path().join("A1.svg");
    let only_a1: String = body.lines().filter(|l| !l.starts_with("A/2")).collect::<Vec<_>>().join("\n") + "\n";
    fs::write(&clash, &only_a1).unwrap();
    cmd()
        .args(["components", clash.to_str().unwrap(), "--auto", "--plot", d.path().to_str().unwrap(), "--force"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("input"));
    assert_eq!(fs::read_to_string(&clash).unwrap(), only_a1);
}
