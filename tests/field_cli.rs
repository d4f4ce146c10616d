//! Integration tests of `lodestone field series|at|context` (assert_cmd).

use assert_cmd::Command;
use predicates::prelude::*;
use std::fs;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn json(args: &[&str]) -> serde_json::Value {
    let out = cmd().args(args).args(["--format", "json", "--quiet"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).unwrap()
}

const RECORD: &str = "records/paleointensity/harrowmere-deep-vadm.csv";
const TIMESCALE: &str = "records/timescales/chrons-0-6ma.csv";

#[test]
fn at_gives_the_contract_fields_and_its_elements_agree() {
    let v = json(&["field", "at", "--year", "2020", "--lat", "-33.5", "--lon", "-70.6", "--altitude", "0.6"]);
    for k in ["x", "y", "z", "h", "f", "dec", "inc"] {
        assert!(v[k].is_number(), "{k}");
    }
    let (x, y, z) = (v["x"].as_f64().unwrap(), v["y"].as_f64().unwrap(), v["z"].as_f64().unwrap());
    assert!((v["f"].as_f64().unwrap() - (x * x + y * y + z * z).sqrt()).abs() < 1e-9);
    assert!((0.0..360.0).contains(&v["dec"].as_f64().unwrap()));
    assert_eq!(v["model"]["name"], "IGRF-14");
}

#[test]
fn series_json_and_csv_carry_the_contract_fields() {
    let v = json(&["field", "series", "--from", "2015", "--to", "2025", "--every", "5"]);
    let e = v["epochs"].as_array().unwrap();
    assert_eq!(e.len(), 3);
    for k in [
        "year",
        "moment",
        "moment_change",
        "tilt",
        "pole_lat",
        "pole_lon",
        "dip_north_lat",
        "dip_north_lon",
        "dip_north_speed",
        "dip_south_lat",
        "dip_south_lon",
        "dip_south_speed",
        "low_f",
        "low_lat",
        "low_lon",
        "low_area",
        "low_cells",
    ] {
        assert!(e[2].get(k).is_some(), "{k}");
    }
    assert!(e[0]["dip_north_speed"].is_null() && e[1]["dip_north_speed"].is_number());
    let out = cmd()
        .args(["field", "series", "--from", "2020", "--to", "2021", "--every", "1", "--format", "csv"])
        .assert()
        .success();
    let text = String::from_utf8(out.get_output().stdout.clone()).unwrap();
    assert!(text.starts_with("year,moment,moment_change,tilt,pole_lat,pole_lon,dip_north_lat"), "{text}");
    assert_eq!(text.lines().count(), 3);
}

#[test]
fn context_reports_percentiles_and_drops_with_the_caution() {
    let v = json(&["field", "context", "--record", RECORD, "--timescale", TIMESCALE]);
    for k in ["present_moment", "percentile", "change_percentile", "drops_like_present", "drops_before_reversal"] {
        assert!(v.get(k).is_some_and(|x| !x.is_null()), "{k}");
    }
    let notes = v["notes"].to_string();
    assert!(notes.contains("not a forecast"), "{notes}");
    let p = v["percentile"].as_f64().unwrap();
    assert!((0.0..=100.0).contains(&p));
}

#[test]
fn user_models_with_a_missing_degree_are_refused_naming_file_and_line() {
    let d = tempfile::tempdir().unwrap();
    let f = d.path().join("mine.csv");
    fs::write(
        &f,
        "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,1,-1500,4000\n2000,2,0,-2000,0\n2000,2,2,1600,-500\n",
    )
    .unwrap();
    cmd()
        .args(["field", "at", f.to_str().unwrap(), "--year", "2000", "--lat", "10", "--lon", "10"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("mine.csv:2").and(predicate::str::contains("degree 2 order 1")));
}

#[test]
fn years_outside_the_model_and_latitudes_beyond_the_pole_exit_1() {
    cmd()
        .args(["field", "at", "--year", "2031", "--lat", "10", "--lon", "10"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("year 2031 is outside the model IGRF-14 (defined from 1900 to 2030)"));
    cmd()
        .args(["field", "at", "--year", "2020", "--lat", "-90.5", "--lon", "10"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("latitude = -90.5 is outside [-90, 90]"));
    cmd().args(["field", "series", "--from", "1890"]).assert().code(1).stderr(predicate::str::contains("1890"));
}

/// Whole-output snapshots (text tables, notes included). Regenerate by deleting the file and running
/// the test once; review the difference before committing.
fn snapshot(name: &str, args: &[&str]) {
    let out = cmd().args(args).output().unwrap();
    assert!(out.status.success());
    let got = String::from_utf8(out.stdout).unwrap();
    let path = std::path::Path::new("tests/snapshots").join(name);
    match fs::read_to_string(&path) {
        Ok(want) => assert_eq!(got, want, "snapshot {name} differs"),
        Err(_) => {
            fs::write(&path, &got).unwrap();
            panic!("wrote the new snapshot {}; review it and run again", path.display());
        }
    }
}

#[test]
fn snapshots_of_every_field_verb() {
    snapshot("field_at.txt", &["field", "at", "--year", "2024.5", "--lat", "51.2", "--lon", "-3.4"]);
    snapshot("field_series.txt", &["field", "series", "--from", "2015", "--to", "2030", "--every", "5"]);
    snapshot("field_context.txt", &["field", "context", "--record", RECORD, "--timescale", TIMESCALE]);
}
