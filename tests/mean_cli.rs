//! Integration tests of `lodestone mean` (assert_cmd).

use assert_cmd::Command;
use predicates::prelude::*;
use std::fs;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn write(dir: &tempfile::TempDir, name: &str, body: &str) -> std::path::PathBuf {
    let p = dir.path().join(name);
    fs::write(&p, body).unwrap();
    p
}

const FOUR: &str = "site,dec,inc\nA,10,0\nA,350,0\nA,0,10\nA,0,-10\nB,123,45\n";

#[test]
fn json_output_follows_the_contract() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    let out = cmd().args(["mean", f.to_str().unwrap(), "--format", "json"]).output().unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let a = &v["groups"][0];
    assert_eq!(a["group"], "A");
    assert_eq!(a["n"], 4);
    // Analytic check: R = 4 cos 10 degrees, mean (0, 0).
    assert!((a["r"].as_f64().unwrap() - 4.0 * 10f64.to_radians().cos()).abs() < 1e-12);
    assert!(a["inc"].as_f64().unwrap().abs() < 1e-9);
    // A group of one direction: reported, with k, a95, theta63 null.
    let b = &v["groups"][1];
    assert_eq!(b["n"], 1);
    assert!(b["k"].is_null() && b["a95"].is_null() && b["theta63"].is_null());
    assert!((b["dec"].as_f64().unwrap() - 123.0).abs() < 1e-9);
}

#[test]
fn csv_and_table_outputs() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    cmd().args(["mean", f.to_str().unwrap(), "--format", "csv"]).assert().success()
        .stdout(predicate::str::starts_with("group,n,dec,inc,r,k,a95,theta63\nA,4,"))
        .stdout(predicate::str::contains("\nB,1,123,45,1,,,\n"));
    cmd().args(["--format", "table", "mean", f.to_str().unwrap()]).assert().success()
        .stdout(predicate::str::contains("group  n"))
        .stdout(predicate::str::contains("one direction only"));
}

#[test]
fn whole_file_and_by_column_and_tilt() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", "lith,dec,inc,bed_dip_dir,bed_dip\nx,90,30,90,30\nx,90,30,90,30\ny,0,0,90,30\n");
    let out = cmd().args(["mean", f.to_str().unwrap(), "--by", "lith", "--frame", "tilt", "--format", "json"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    // Down-dip lines restore to horizontal (090, 0); identical directions give k = "inf".
    assert!(v["groups"][0]["inc"].as_f64().unwrap().abs() < 1e-9);
    assert_eq!(v["groups"][0]["k"], "inf");
    let out = cmd().args(["mean", f.to_str().unwrap(), "--whole", "--format", "json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["groups"].as_array().unwrap().len(), 1);
    assert_eq!(v["groups"][0]["n"], 3);
}

#[test]
fn bad_input_messages_name_file_line_column_and_exit_1() {
    let d = tempfile::tempdir().unwrap();
    let cases = [
        ("missing.csv", "site,dec\nA,10\n", ":1: column 'inc': required column is missing"),
        ("nonnum.csv", "dec,inc\n10,20\n10,abc\n", ":3: column 'inc': 'abc' is not a number"),
        ("range.csv", "dec,inc\n10,95.2\n", ":2: column 'inc': 95.2 is outside [-90, 90]"),
        ("empty.csv", "", ":1: the file is empty"),
        ("header.csv", "dec,inc\n", "no data rows"),
        ("notilt.csv", "dec,inc\n10,20\n", ":2: column 'bed_dip': no bedding"),
    ];
    for (name, body, msg) in cases {
        let f = write(&d, name, body);
        let plot = d.path().join(format!("{name}.svg"));
        let mut c = cmd();
        c.args(["mean", f.to_str().unwrap(), "--plot", plot.to_str().unwrap()]);
        if name == "notilt.csv" {
            c.args(["--frame", "tilt"]);
        }
        c.assert().code(1).stdout("").stderr(predicate::str::contains(name)).stderr(predicate::str::contains(msg));
        assert!(!plot.exists(), "{name}: nothing may be written on error");
    }
}

#[test]
fn bad_command_line_exits_2() {
    cmd().args(["mean"]).assert().code(2);
    cmd().args(["nosuchverb"]).assert().code(2);
    cmd().args(["mean", "x.csv", "--frame", "sideways"]).assert().code(2);
}

#[test]
fn plots_are_written_and_inputs_never_overwritten() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    for ext in ["svg", "png"] {
        let p = d.path().join(format!("net.{ext}"));
        cmd().args(["mean", f.to_str().unwrap(), "--plot", p.to_str().unwrap()]).assert().success();
        let bytes = fs::read(&p).unwrap();
        assert!(bytes.len() > 1000);
        if ext == "png" {
            assert_eq!(&bytes[1..4], b"PNG");
        } else {
            assert!(String::from_utf8(bytes).unwrap().contains("<svg"));
        }
    }
    let svg_input = d.path().join("d.svg");
    fs::write(&svg_input, FOUR).unwrap();
    // Using an input file as the plot path is refused.
    let g = write(&d, "in.svg", "dec,inc\n1,2\n");
    cmd().args(["mean", g.to_str().unwrap(), "--plot", g.to_str().unwrap()]).assert().code(1)
        .stderr(predicate::str::contains("input"));
    assert_eq!(fs::read_to_string(&g).unwrap(), "dec,inc\n1,2\n");
    cmd().args(["mean", f.to_str().unwrap(), "--plot", d.path().join("x.pdf").to_str().unwrap()]).assert().code(1);
}

/// The streamed path (no figure) and the whole-table path (a figure asks for the points) give the same
/// groups, to the last digit, and the same message for a faulty file.
#[test]
fn streamed_and_whole_table_paths_agree() {
    let d = tempfile::tempdir().unwrap();
    let body = "# Harlow Bench, invented\nsite,dec,inc,bed_dip_dir,bed_dip\nA,10,20,90,30\nB,200,-35,270,15\nA,14,26,90,30\n\nA,8,31,90,30\nB,190,-40,270,15\n";
    let f = write(&d, "h.csv", body);
    for frame in ["geo", "tilt"] {
        let run = |plot: bool| {
            let mut c = cmd();
            c.args(["mean", f.to_str().unwrap(), "--frame", frame, "--format", "json"]);
            if plot {
                c.args(["--plot", d.path().join("h.svg").to_str().unwrap()]);
            }
            let out = c.output().unwrap();
            assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
            serde_json::from_slice::<serde_json::Value>(&out.stdout).unwrap()
        };
        let (streamed, whole) = (run(false), run(true));
        assert_eq!(streamed["groups"], whole["groups"]);
        assert_eq!(streamed["groups"][0]["lines"], serde_json::json!([3, 5, 7]));
    }
    let bad = write(&d, "bad.csv", "site,dec,inc\nA,10,20\nA,x,20\nB,1\n");
    let msg = |plot: bool| {
        let mut c = cmd();
        c.args(["mean", bad.to_str().unwrap()]);
        if plot {
            c.args(["--plot", d.path().join("b.svg").to_str().unwrap()]);
        }
        let out = c.output().unwrap();
        assert_eq!(out.status.code(), Some(1));
        String::from_utf8_lossy(&out.stderr).to_string()
    };
    let (a, b) = (msg(false), msg(true));
    assert_eq!(a, b);
    assert!(a.contains("bad.csv:4"), "{a}");
}
