//! Integration tests of `unflatten`, `psv` and `mean --ellipse` (assert_cmd), on the invented demo
//! records `records/tarrow-redbeds.csv` and `records/psv-compilation.csv`. Their whole outputs are
//! snapshotted in `tests/snapshot_verbs.rs`.

use assert_cmd::Command;
use lodestone::dirstats::{apply_factor, Tk03};
use lodestone::montecarlo::replicate_rng;
use lodestone::poles::expected_direction;
use lodestone::sphere::{Direction, GeoPoint};
use lodestone::stats::FisherSampler;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

/// Paths relative to the crate root (the runs start there), so that the outputs do not name the checkout.
fn redbeds() -> String {
    "records/tarrow-redbeds.csv".into()
}

fn compilation() -> String {
    "records/psv-compilation.csv".into()
}

/// Run and return stdout; the run must succeed.
fn ok(args: &[&str]) -> String {
    let out = cmd().current_dir(root()).args(args).output().unwrap();
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8(out.stdout).unwrap()
}

#[test]
#[ignore = "writes the invented demo records; run by hand with --ignored"]
fn make_demo_records() {
    // The Tarrow basin red beds (invented): 320 directions from the TK03 model at 28° N, flattened
    // with f = 0.65, a few degrees of measurement noise left out for clarity.
    let v = Tk03::standard().simulate(28.0, 320, 2026, 7).unwrap();
    let d: Vec<Direction> = v.into_iter().map(|v| Direction::from_vector(v).unwrap()).collect();
    let flat = apply_factor(&d, 1.0 / 0.65).unwrap();
    let mut s = String::from(
        "# Tarrow basin red beds (invented demo data): one direction per specimen, tilt-corrected\nspecimen,dec,inc\n",
    );
    for (i, x) in flat.iter().enumerate() {
        writeln!(s, "TR{:03},{:.1},{:.1}", i + 1, x.dec, x.inc).unwrap();
    }
    std::fs::write(root().join("records/tarrow-redbeds.csv"), s).unwrap();
    // A compilation of lava-flow site means from six invented studies at different latitudes, VGPs
    // drawn with S(λ)² = 13² + (0.22 λ)²; every site has n = 6, k = 180.
    let mut s =
        String::from("# Compilation of site means by study (invented demo data)\nstudy,site,lat,lon,dec,inc,n,k\n");
    let studies: [(&str, f64); 6] = [
        ("Ostrava Rise", -4.0),
        ("Kellan Flows", 14.0),
        ("Marrow Plateau", -31.0),
        ("Quill Island", 43.0),
        ("Sable Fjord", 58.0),
        ("Tern Scarp", -71.0),
    ];
    for (g, (name, lat)) in studies.iter().enumerate() {
        let sd = (13.0f64.powi(2) + (0.22 * lat).powi(2)).sqrt();
        let sampler = FisherSampler::new(Direction { dec: 0.0, inc: 90.0 }, (81.0 / sd).powi(2)).unwrap();
        let mut rng = replicate_rng(77, g as u64, 0);
        for k in 0..40 {
            let p = sampler.sample(&mut rng);
            let pole = GeoPoint::from_vector(p).unwrap();
            let site =
                GeoPoint::new(lat + (k % 5) as f64 * 0.2, 100.0 + 40.0 * g as f64 + (k % 7) as f64 * 0.3).unwrap();
            let mut dir = expected_direction(site, pole);
            if k % 3 == 0 {
                dir = dir.antipode();
            }
            writeln!(
                s,
                "{name},{}{:02},{:.2},{:.2},{:.1},{:.1},6,180",
                &name[..2].to_uppercase(),
                k + 1,
                site.lat,
                site.lon,
                dir.dec,
                dir.inc
            )
            .unwrap();
        }
    }
    std::fs::write(root().join("records/psv-compilation.csv"), s).unwrap();
}

#[test]
fn unflatten_outputs() {
    let json = ok(&["unflatten", &redbeds(), "--resamples", "300", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    for k in ["n", "f", "f_low", "f_high", "inc_observed", "inc_corrected", "inc_low", "inc_high", "elongation"] {
        assert!(v.get(k).is_some(), "missing {k}");
    }
    // The record was flattened with f = 0.65 (see make_demo_records): the interval holds it.
    let (lo, hi) = (v["f_low"].as_f64().unwrap(), v["f_high"].as_f64().unwrap());
    assert!(lo <= 0.65 && 0.65 <= hi, "[{lo}, {hi}]");
    assert!(v["inc_corrected"].as_f64().unwrap() > v["inc_observed"].as_f64().unwrap());
    // Thread count does not change the answer.
    assert_eq!(ok(&["unflatten", &redbeds(), "--resamples", "300", "--format", "json", "--threads", "1"]), json);
    let factor = ok(&["unflatten", &redbeds(), "--factor", "0.65", "--format", "json"]);
    let f: serde_json::Value = serde_json::from_str(&factor).unwrap();
    assert!(f["f_low"].is_null());
    assert!(f["notes"].as_array().unwrap().iter().any(|n| n.as_str().unwrap().contains("is an assumption")));
    // Both methods close with the library's one caution, stated once.
    for d in [&v, &f] {
        assert_last_once(d, lodestone::present::cautions::UNFLATTEN);
    }
}

/// The JSON notes of `v` end with `caution`, which appears only there.
fn assert_last_once(v: &serde_json::Value, caution: &str) {
    let notes = v["notes"].as_array().unwrap();
    assert_eq!(notes.last().unwrap(), caution, "{notes:?}");
    assert_eq!(notes.iter().filter(|n| *n == caution).count(), 1, "{notes:?}");
}

#[test]
fn psv_outputs() {
    let json = ok(&["psv", &compilation(), "--by", "study", "--resamples", "200", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let g = &v["groups"][0];
    for k in ["group", "paleolat", "s", "s_low", "s_high", "n_used"] {
        assert!(g.get(k).is_some(), "missing groups[].{k}");
    }
    let m = &v["model"];
    for k in ["a", "b", "a_low", "a_high", "b_low", "b_high"] {
        assert!(m[k].is_number(), "missing model.{k}");
    }
    // Made with a = 13°, b = 0.22 (see make_demo_records).
    assert!(m["a_low"].as_f64().unwrap() <= 13.0 && 13.0 <= m["a_high"].as_f64().unwrap(), "{m}");
    assert!(m["b_low"].as_f64().unwrap() <= 0.22 && 0.22 <= m["b_high"].as_f64().unwrap(), "{m}");
    assert_last_once(&v, lodestone::present::cautions::PSV);
}

fn figure_ok(args: &[&str], out: &Path) {
    ok(args);
    let bytes = std::fs::read(out).unwrap();
    assert!(bytes.len() > 1000 && bytes.starts_with(b"<svg"), "{}", out.display());
}

#[test]
fn figures_are_written() {
    let d = tempfile::tempdir().unwrap();
    let p = d.path().join("ei.svg");
    figure_ok(&["unflatten", &redbeds(), "--resamples", "200", "--plot", p.to_str().unwrap()], &p);
    let p = d.path().join("psv.svg");
    figure_ok(&["psv", &compilation(), "--by", "study", "--resamples", "100", "--plot", p.to_str().unwrap()], &p);
    let p = d.path().join("mean.svg");
    figure_ok(&["mean", &redbeds(), "--ellipse", "kent", "--plot", p.to_str().unwrap()], &p);
}

#[test]
fn mean_with_ellipses() {
    let json = ok(&["mean", &redbeds(), "--ellipse", "kent", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let e = &v["groups"][0]["ellipse"];
    for k in ["major", "minor", "major_dec", "major_inc", "minor_dec", "minor_inc", "method"] {
        assert!(e.get(k).is_some(), "missing ellipse.{k}");
    }
    assert_eq!(e["method"], "kent");
    assert!(e["major"].as_f64().unwrap() >= e["minor"].as_f64().unwrap());
    let b = ok(&["mean", &redbeds(), "--ellipse", "bootstrap", "--resamples", "300", "--format", "csv"]);
    assert!(b.lines().next().unwrap().ends_with("major,minor,major_dec,major_inc,minor_dec,minor_inc"), "{b}");
    let p =
        ok(&["mean", &redbeds(), "--ellipse", "bootstrap", "--parametric", "--resamples", "300", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&p).unwrap();
    assert_eq!(v["groups"][0]["ellipse"]["method"], "bootstrap_parametric");
    // A group of two directions has no ellipse: null, with a note, and the run succeeds.
    let d = tempfile::tempdir().unwrap();
    let f = d.path().join("two.csv");
    std::fs::write(&f, "dec,inc\n10,20\n350,25\n").unwrap();
    let two: serde_json::Value =
        serde_json::from_str(&ok(&["mean", f.to_str().unwrap(), "--ellipse", "kent", "--format", "json"])).unwrap();
    assert!(two["groups"][0]["ellipse"].is_null());
    assert!(two["notes"][0].as_str().unwrap().contains("no kent ellipse"), "{two}");
    // Without --ellipse the output has no ellipse field (the contract's plain mean).
    let plain = ok(&["mean", &redbeds(), "--format", "json"]);
    assert!(!plain.contains("ellipse"));
}

/// A bad input gives a clear message and exit code 1.
fn refused(args: &[&str], body: &str, needle: &str) {
    let d = tempfile::tempdir().unwrap();
    let f = d.path().join("in.csv");
    std::fs::write(&f, body).unwrap();
    let mut all: Vec<&str> = args.to_vec();
    let fs = f.to_str().unwrap().to_string();
    all.insert(1, &fs);
    let out = cmd().args(&all).output().unwrap();
    assert_eq!(out.status.code(), Some(1), "{all:?}");
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains(needle), "{all:?}: {err}");
    assert!(out.stdout.is_empty());
}

#[test]
fn bad_inputs_exit_1_with_a_message() {
    let few: String = (0..12).fold(String::from("dec,inc\n"), |s, k| s + &format!("{},{}\n", k * 7, 20 + k));
    refused(&["unflatten"], &few, "needs at least 30");
    let same: String = (0..60).fold(String::from("dec,inc\n"), |s, _| s + "10,30\n");
    refused(&["unflatten"], &same, "identical");
    refused(&["unflatten", "--factor", "1.4"], &few, "--factor must lie in (0, 1]");
    refused(&["psv", "--by", "study"], "study,site,lon,dec,inc\nA,a1,10,0,30\n", "lat");
    refused(&["psv", "--by", "study"], "site,lat,lon,dec,inc\na1,10,10,0,30\n", "study");
    let one_group: String = (0..8)
        .fold(String::from("study,site,lat,lon,dec,inc\n"), |s, k| s + &format!("A,a{k},20,10,{},{}\n", k * 3, 35 + k));
    refused(&["psv", "--by", "study"], &one_group, "at least 2 groups");
}
