//! Integration tests of `lodestone poles`, `dipole` and `expected` (assert_cmd).

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

fn json(args: &[&str]) -> serde_json::Value {
    let out = cmd().args(args).args(["--format", "json", "--quiet"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).unwrap()
}

// Axial-dipole directions at 45N: tan I = 2 tan 45 => I = 63.4349 (common practice); a reversed copy.
const GAD: &str = "site,lat,lon,dec,inc,n,k,a95\nA,45,-120,0,63.43494882292201,6,100,6\nB,45,240,180,-63.43494882292201,6,100,6\nC,45,10,0,63.43494882292201,6,100,6\n";

#[test]
fn axial_dipole_sites_give_the_geographic_pole() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "s.csv", GAD);
    let v = json(&["poles", f.to_str().unwrap(), "--northern", "--resamples", "50"]);
    let s = &v["sites"];
    assert!((s[0]["plat"].as_f64().unwrap() - 90.0).abs() < 1e-9);
    assert!((s[1]["plat"].as_f64().unwrap() + 90.0).abs() < 1e-9, "reversed site reported as computed");
    assert!((s[0]["paleolat"].as_f64().unwrap() - 45.0).abs() < 1e-9);
    // dp = a95 (1 + 3 cos^2 45)/2 = 7.5, dm = a95 sqrt(1 + 3/2) (Butler 1992, eqs. 7.5-7.6, by hand).
    assert!((s[0]["dp"].as_f64().unwrap() - 7.5).abs() < 1e-9);
    assert!((s[0]["dm"].as_f64().unwrap() - 6.0 * 2.5f64.sqrt()).abs() < 1e-9);
    let p = &v["pole"];
    assert_eq!(p["n"], 3);
    assert!((p["plat"].as_f64().unwrap() - 90.0).abs() < 1e-9);
    assert!(p["plon"].as_f64().unwrap() >= 0.0 && p["plon"].as_f64().unwrap() < 360.0);
    assert_eq!(p["k"], "inf");
    let sc = &v["scatter"];
    assert_eq!(sc["n_used"], 3);
    assert!(sc["s"].is_null(), "identical VGPs with a within-site term: S_B undefined");
    assert!(sc["s_total"].as_f64().unwrap() < 1e-6);
}

#[test]
fn cutoffs_report_what_they_removed_and_results_repeat_with_the_seed() {
    let demo = concat!(env!("CARGO_MANIFEST_DIR"), "/records/kestrel-ridge-sites.csv");
    let none = json(&["poles", demo, "--northern", "--resamples", "100"]);
    let fixed = json(&["poles", demo, "--northern", "--cutoff", "45", "--resamples", "100"]);
    let vd = json(&["poles", demo, "--northern", "--cutoff", "vandamme", "--resamples", "100"]);
    assert_eq!(none["scatter"]["n_removed"], 0);
    assert_eq!(fixed["scatter"]["n_removed"], 1);
    assert_eq!(fixed["scatter"]["removed"][0], "KR12");
    assert!(vd["scatter"]["n_removed"].as_u64().unwrap() >= 1);
    assert!(fixed["scatter"]["s"].as_f64().unwrap() < none["scatter"]["s"].as_f64().unwrap());
    for v in [&none, &fixed, &vd] {
        let (lo, s, hi) = (
            v["scatter"]["s_low"].as_f64().unwrap(),
            v["scatter"]["s"].as_f64().unwrap(),
            v["scatter"]["s_high"].as_f64().unwrap(),
        );
        assert!(lo < s && s < hi, "{lo} {s} {hi}");
        assert_eq!(one_caution(v), lodestone::present::cautions::POLES);
        let notes = v["notes"].to_string();
        assert!(notes.contains("the cutoff applies to the scatter only"), "{notes}");
    }
    let again = json(&["poles", demo, "--northern", "--resamples", "100", "--threads", "1"]);
    assert_eq!(none["scatter"], again["scatter"]);
}

#[test]
fn poles_figure_and_csv() {
    let d = tempfile::tempdir().unwrap();
    let demo = concat!(env!("CARGO_MANIFEST_DIR"), "/records/kestrel-ridge-sites.csv");
    let svg = d.path().join("p.svg");
    cmd()
        .args([
            "poles",
            demo,
            "--northern",
            "--cutoff",
            "vandamme",
            "--resamples",
            "50",
            "--quiet",
            "--plot",
            svg.to_str().unwrap(),
            "--format",
            "csv",
        ])
        .assert()
        .success()
        .stdout(predicate::str::starts_with(
            "site,lat,lon,dec,inc,plat,plon,dp,dm,paleolat,paleolat_low,paleolat_high\nKR01,",
        ));
    let body = fs::read_to_string(&svg).unwrap();
    assert!(body.starts_with("<svg") && body.contains("paleopole"));
}

#[test]
fn bad_input_is_refused_with_file_line_and_column() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "lat.csv", "site,lat,lon,dec,inc\nA,10,0,0,20\nB,95,0,0,20\n");
    cmd()
        .args(["poles", f.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("lat.csv:3: column 'lat': 95 is outside [-90, 90]"));
    let f = write(&d, "oval.csv", "site,lat,lon,dec,inc,a95\nA,10,0,0,20,5\nB,12,0,0,20,\n");
    cmd()
        .args(["poles", f.to_str().unwrap(), "--ovals"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("oval.csv:3: column 'a95'"));
    let f = write(&d, "one.csv", "site,lat,lon,dec,inc\nA,10,0,0,20\n");
    cmd()
        .args(["poles", f.to_str().unwrap(), "--cutoff", "sideways"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("--cutoff"));
    cmd()
        .args(["dipole", "vadm", "--intensity", "30", "--lat", "-95"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("latitude"));
}

#[test]
fn dipole_verbs() {
    // IGRF-13 (IAGA; Alken et al. 2021), 2020 degree-1 coefficients: moment near 7.7e22 A m^2, tilt near 9.4 deg.
    let v = json(&["dipole", "gauss", "--g10", "-29404.8", "--g11", "-1450.9", "--h11", "4652.5"]);
    assert!((v["moment"].as_f64().unwrap() / 1e22 - 7.708).abs() < 0.001);
    assert!((v["tilt"].as_f64().unwrap() - 9.41).abs() < 0.01);
    assert!((v["pole_lat"].as_f64().unwrap() - 80.59).abs() < 0.01);
    assert!((v["pole_lon"].as_f64().unwrap() - 287.32).abs() < 0.01);
    // VADM at the equator equals VDM with I = 0: both (4 pi R^3/mu0) B (dipole formula, common practice).
    let a = json(&["dipole", "vadm", "--intensity", "30", "--lat", "0"]);
    let b = json(&["dipole", "vdm", "--intensity", "30", "--inc", "0"]);
    let expect = 4.0 * std::f64::consts::PI * 6.371e6f64.powi(3) / (4e-7 * std::f64::consts::PI) * 30e-6;
    assert!((a["moment"].as_f64().unwrap() / expect - 1.0).abs() < 1e-12);
    assert!((b["moment"].as_f64().unwrap() / expect - 1.0).abs() < 1e-12);
}

#[test]
fn expected_direction_round_trips_the_vgp() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "s.csv", "site,lat,lon,dec,inc\nA,-33.9,18.4,200,-30\nB,0,10,355,5\n");
    let p = json(&["poles", f.to_str().unwrap(), "--resamples", "20"]);
    for (i, s) in p["sites"].as_array().unwrap().iter().enumerate() {
        let e = json(&[
            "expected",
            "--pole-lat",
            &s["plat"].to_string(),
            "--pole-lon",
            &s["plon"].to_string(),
            "--lat",
            &s["lat"].to_string(),
            "--lon",
            &s["lon"].to_string(),
            "--a95",
            "5",
        ]);
        let r = &e["sites"][0];
        assert!((r["dec"].as_f64().unwrap() - s["dec"].as_f64().unwrap()).abs() < 1e-8, "site {i}");
        assert!((r["inc"].as_f64().unwrap() - s["inc"].as_f64().unwrap()).abs() < 1e-8, "site {i}");
        assert!(r["delta_inc"].as_f64().unwrap() > 0.0);
    }
    let t = json(&["expected", "--pole-lat", "90", "--pole-lon", "0", "--sites", f.to_str().unwrap()]);
    // Axial pole at a 0N site: expected (0, 0); observed (355, 5) is rotated -5 and flattened by -5.
    let b = &t["sites"][1];
    assert!((b["rotation"].as_f64().unwrap() + 5.0).abs() < 1e-9);
    assert!((b["flattening"].as_f64().unwrap() + 5.0).abs() < 1e-9);
}

#[test]
fn one_site_gives_its_vgp_and_says_why_there_is_no_paleopole() {
    // One axial-dipole site at 45N (tan I = 2 tan λ, common practice): VGP at the pole, paleolatitude
    // 45°, dp = 7.5 and dm = 6√2.5 (Butler 1992, eqs. 7.5–7.6, by hand); no paleopole, no scatter.
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "one.csv", "site,lat,lon,dec,inc,n,k,a95\nA,45,-120,0,63.43494882292201,6,100,6\n");
    let v = json(&["poles", f.to_str().unwrap(), "--resamples", "50"]);
    let s = &v["sites"][0];
    assert!((s["plat"].as_f64().unwrap() - 90.0).abs() < 1e-9);
    assert!((s["paleolat"].as_f64().unwrap() - 45.0).abs() < 1e-9);
    assert!((s["dp"].as_f64().unwrap() - 7.5).abs() < 1e-9);
    assert!((s["dm"].as_f64().unwrap() - 6.0 * 2.5f64.sqrt()).abs() < 1e-9);
    assert!(v["pole"].is_null() && v["scatter"].is_null());
    assert!(v["notes"][0].as_str().unwrap().contains("one site"), "{}", v["notes"]);
    // The model caveat is the library's one wording, stated once, last.
    assert_eq!(one_caution(&v), lodestone::present::cautions::ONE_VGP);
}

/// The last JSON note, checked to appear only once.
fn one_caution(v: &serde_json::Value) -> &str {
    let notes = v["notes"].as_array().unwrap();
    let last = notes.last().unwrap();
    assert_eq!(notes.iter().filter(|n| *n == last).count(), 1, "{notes:?}");
    last.as_str().unwrap()
}

#[test]
fn a_cutoff_that_keeps_too_few_sites_leaves_the_paleopole_and_says_why() {
    // The scatter stage the section also runs: a 1° cutoff about the mean pole keeps no site, so
    // there is no scatter, but the paleopole of every site stands and a note says why (the section
    // writes the same sentence as a warning).
    let demo = concat!(env!("CARGO_MANIFEST_DIR"), "/records/kestrel-ridge-sites.csv");
    let all = json(&["poles", demo, "--northern", "--resamples", "100"]);
    let tight = json(&["poles", demo, "--northern", "--cutoff", "1", "--resamples", "100"]);
    assert_eq!(tight["pole"], all["pole"]);
    assert!(tight["scatter"].is_null());
    let notes: Vec<String> = serde_json::from_value(tight["notes"].clone()).unwrap();
    assert!(
        notes.iter().any(|n| n.starts_with("VGP scatter skipped: ") && n.contains("after the cutoff")),
        "{notes:?}"
    );
    assert!(!notes.iter().any(|n| n.contains("bootstrap over sites")), "{notes:?}");
    // A cutoff angle outside [0, 180] is still a fault of the request.
    cmd().args(["poles", demo, "--cutoff", "200"]).assert().failure().stderr(predicate::str::contains("cutoff"));
}
