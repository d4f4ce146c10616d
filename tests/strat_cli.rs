//! Integration tests of `lodestone column` and `lodestone correlate` (assert_cmd).

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

const SCALE: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/records/timescales/chrons-0-6ma.csv");
const DEMO: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/records/orrin-bluff-vgp.csv");

#[test]
fn boundary_intervals_are_exactly_the_sampling_gaps() {
    let d = tempfile::tempdir().unwrap();
    // Unsorted rows on purpose: they are sorted, with a note.
    let f = write(&d, "l.csv", "height,vgp_lat\n1.0,70\n2.5,80\n4.0,-75\n4.75,-60\n7.0,20\n9.5,65\n0.2,66\n");
    let out = cmd().args(["column", f.to_str().unwrap(), "--format", "json"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let z = v["zones"].as_array().unwrap();
    assert_eq!(z.len(), 4);
    assert_eq!(z[0]["polarity"], "N");
    assert_eq!((z[0]["top_low"].as_f64(), z[0]["top_high"].as_f64()), (Some(2.5), Some(4.0)));
    assert_eq!((z[1]["base_low"].as_f64(), z[1]["base_high"].as_f64()), (Some(2.5), Some(4.0)));
    assert_eq!((z[1]["top_low"].as_f64(), z[1]["top_high"].as_f64()), (Some(4.75), Some(7.0)));
    assert_eq!(z[2]["polarity"], "I");
    assert_eq!(z[3]["status"], "single-level");
    assert!(v["notes"][0].as_str().unwrap().contains("sorted"));
    assert_eq!(v["levels"][0]["height"], 0.2);
}

#[test]
fn depth_columns_put_the_base_at_the_deeper_end() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "l.csv", "depth,vgp_lat\n1,70\n2,75\n3,-70\n4,-80\n");
    let out = cmd().args(["column", f.to_str().unwrap(), "--format", "json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["zones"][0]["polarity"], "N");
    assert_eq!(v["zones"][0]["base_low"], 2.0);
    assert_eq!(v["zones"][0]["base_high"], 3.0);
    assert_eq!(v["zones"][0]["top"], 1.0);
}

#[test]
fn column_csv_feeds_correlate_and_the_demo_section_is_recovered() {
    let d = tempfile::tempdir().unwrap();
    let out = cmd().args(["column", DEMO, "--format", "csv"]).output().unwrap();
    assert!(out.status.success());
    let csv = String::from_utf8(out.stdout).unwrap();
    assert!(
        csv.starts_with("zone,polarity,n_levels,status,base,base_low,base_high,top,top_low,top_high,axis\n"),
        "{csv}"
    );
    let zones = write(&d, "zones.csv", &csv);
    let svg = d.path().join("c.svg");
    let out = cmd()
        .args(["correlate", zones.to_str().unwrap(), SCALE, "--format", "json", "--plot", svg.to_str().unwrap()])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let c = v["candidates"].as_array().unwrap();
    assert!(c.len() >= 5);
    for (i, x) in c.iter().enumerate() {
        assert_eq!(x["rank"], i + 1);
        if i > 0 {
            assert!(x["score"].as_f64().unwrap() >= c[i - 1]["score"].as_f64().unwrap());
        }
    }
    // The demo section was generated over 0.4–2.9 Ma (see its header): the top boundary of the best
    // candidate is the C1n/C1r.1r boundary and its base tie is C2r.2r/C2An.1n.
    let ties = c[0]["ties"].as_array().unwrap();
    assert_eq!(ties[0]["chron_above"], "C1n");
    assert_eq!(ties[ties.len() - 1]["chron_below"], "C2An.1n");
    assert!(c[0]["rates"].as_array().unwrap().iter().any(|r| r["rate"].is_number()));
    assert!(v["comparison"].as_str().unwrap().contains("runner-up"));
    assert!(fs::read_to_string(&svg).unwrap().contains("<svg"));
    // The same result from the levels table directly.
    let out2 = cmd().args(["correlate", DEMO, SCALE, "--format", "json"]).output().unwrap();
    let v2: serde_json::Value = serde_json::from_slice(&out2.stdout).unwrap();
    assert_eq!(v2["candidates"][0]["ties"], v["candidates"][0]["ties"]);
}

#[test]
fn anchors_are_parsed_and_checked() {
    cmd()
        .args(["correlate", DEMO, SCALE, "--anchor", "30:x"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("not a number"));
    // An anchor of 50 Ma excludes every candidate of a 0-6 Ma scale.
    cmd()
        .args(["correlate", DEMO, SCALE, "--anchor", "30:50"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("anchors exclude"));
}

#[test]
fn bad_inputs_get_clear_messages() {
    let d = tempfile::tempdir().unwrap();
    let dup = write(&d, "dup.csv", "height,vgp_lat\n1,70\n2,-70\n1,60\n");
    cmd()
        .args(["column", dup.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("dup.csv:4: column 'height'").and(predicate::str::contains("repeats line 2")));
    let z = write(&d, "z.csv", "height,vgp_lat\n1,70\n2,-70\n3,60\n");
    let gap = write(&d, "gap.csv", "young,old,polarity\n0,1,N\n1.2,2,R\n");
    cmd()
        .args(["correlate", z.to_str().unwrap(), gap.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("gap.csv:3").and(predicate::str::contains("a gap between line 2")));
    let over = write(&d, "over.csv", "young,old,polarity\n0,1,N\n0.8,2,R\n");
    cmd()
        .args(["correlate", z.to_str().unwrap(), over.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("an overlap"));
    let code = write(&d, "code.csv", "young,old,polarity\n0,1,N\n1,2,Q\n");
    cmd()
        .args(["correlate", z.to_str().unwrap(), code.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("code.csv:3: column 'polarity': 'Q' is not a polarity code"));
    let zt = write(&d, "zt.csv", "polarity,n_levels,base,base_low,base_high,top,top_low,top_high\nX,2,0,0,0,1,1,2\n");
    cmd()
        .args(["correlate", zt.to_str().unwrap(), SCALE])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("zt.csv:2: column 'polarity'"));
    let thr = write(&d, "t.csv", "height,vgp_lat\n1,70\n");
    cmd()
        .args(["column", thr.to_str().unwrap(), "--threshold", "0"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("threshold"));
}
