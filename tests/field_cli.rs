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

#[test]
fn series_writes_its_figures_and_never_over_an_input() {
    let d = tempfile::tempdir().unwrap();
    let (plot, map) = (d.path().join("series.svg"), d.path().join("map.png"));
    cmd()
        .args(["field", "series", "--from", "2000", "--to", "2010", "--plot", plot.to_str().unwrap()])
        .args(["--map", map.to_str().unwrap(), "--quiet"])
        .assert()
        .success();
    let svg = fs::read_to_string(&plot).unwrap();
    assert!(svg.starts_with("<svg") && svg.contains("not a forecast"));
    assert!(fs::read(&map).unwrap().starts_with(b"\x89PNG"));
    let model = d.path().join("m.svg");
    fs::write(&model, "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,1,-1500,4000\n").unwrap();
    cmd().args(["field", "series", model.to_str().unwrap(), "--plot", model.to_str().unwrap()]).assert().code(1);
    assert!(fs::read_to_string(&model).unwrap().starts_with("epoch"));
}
