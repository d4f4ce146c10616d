//! Whole-output snapshots of every verb in every format on the `records/` examples: the command, exit code,
//! stdout and stderr of each run, byte for byte. A change to any verb's output shows here as a snapshot diff
//! (review with `cargo insta review`, or read the `.snap.new` files). CI runs with `INSTA_UPDATE=no`.
//!
//! Snapshot names read `verb_format_input`; a verb run with options that matter carries them in the verb
//! part (`mean-tilt_csv_velmora-directions`).

mod common;

use common::{lodestone, snap};

const FORMATS: [&str; 3] = ["table", "csv", "json"];
const DIRECTIONS: &str = "records/velmora-directions.csv";
const STEPS: &str = "records/velmora-steps.csv";
const SITES: &str = "records/kestrel-ridge-sites.csv";
const LEVELS: &str = "records/orrin-bluff-vgp.csv";
const SCALE: &str = "records/timescales/chrons-0-6ma.csv";

/// Run `args` once per format and snapshot each transcript as `verb_format_input`.
fn every_format(verb: &str, input: &str, args: &[&str]) {
    for format in FORMATS {
        let mut all = args.to_vec();
        all.extend(["--format", format]);
        let run = lodestone(&all).success();
        snap(&format!("{verb}_{format}_{input}"), run.transcript());
    }
}

#[test]
fn mean() {
    every_format("mean", "velmora-directions", &["mean", DIRECTIONS]);
    every_format("mean-tilt", "velmora-directions", &["mean", DIRECTIONS, "--frame", "tilt"]);
    every_format("mean-whole", "kestrel-ridge-sites", &["mean", SITES, "--whole"]);
}

#[test]
fn components() {
    every_format("components-auto", "velmora-steps", &["components", STEPS, "--auto"]);
    every_format("components-auto-anchor", "velmora-steps", &["components", STEPS, "--auto", "--anchor"]);
}

#[test]
fn test_reversal() {
    every_format("test-reversal", "velmora-directions", &["test", "reversal", DIRECTIONS]);
    every_format("test-reversal-tilt", "velmora-directions", &["test", "reversal", DIRECTIONS, "--frame", "tilt"]);
}

#[test]
fn test_common_mean() {
    every_format(
        "test-common-mean",
        "velmora-directions-kestrel-ridge-sites",
        &["test", "common-mean", DIRECTIONS, SITES],
    );
}

#[test]
fn test_fold() {
    every_format("test-fold", "velmora-directions", &["test", "fold", DIRECTIONS]);
}

#[test]
fn test_random() {
    every_format("test-random", "velmora-directions", &["test", "random", DIRECTIONS]);
    every_format("test-random", "kestrel-ridge-sites", &["test", "random", SITES]);
}

#[test]
fn poles() {
    every_format("poles", "kestrel-ridge-sites", &["poles", SITES]);
    every_format(
        "poles-vandamme-northern",
        "kestrel-ridge-sites",
        &["poles", SITES, "--cutoff", "vandamme", "--northern"],
    );
    every_format("poles-45", "kestrel-ridge-sites", &["poles", SITES, "--cutoff", "45"]);
}

#[test]
fn expected() {
    let pole = ["--pole-lat", "85", "--pole-lon", "120", "--a95", "4"];
    let mut at_sites = vec!["expected", "--sites", SITES];
    at_sites.extend(pole);
    every_format("expected", "kestrel-ridge-sites", &at_sites);
    let mut at_point = vec!["expected", "--lat", "46.2", "--lon", "239.5"];
    at_point.extend(pole);
    every_format("expected", "point", &at_point);
}

#[test]
fn dipole() {
    every_format("dipole-vadm", "arguments", &["dipole", "vadm", "--intensity", "40", "--lat", "30"]);
    every_format("dipole-vdm", "arguments", &["dipole", "vdm", "--intensity", "40", "--inc", "45"]);
    every_format(
        "dipole-gauss",
        "arguments",
        &["dipole", "gauss", "--g10", "-29404.8", "--g11", "-1450.9", "--h11", "4652.5"],
    );
}

#[test]
fn column() {
    every_format("column", "orrin-bluff-vgp", &["column", LEVELS]);
    every_format("column", "velmora-directions", &["column", DIRECTIONS]);
}

#[test]
fn correlate() {
    every_format("correlate", "orrin-bluff-vgp-chrons-0-6ma", &["correlate", LEVELS, SCALE]);
    every_format(
        "correlate-anchor",
        "orrin-bluff-vgp-chrons-0-6ma",
        &["correlate", LEVELS, SCALE, "--anchor", "53.9:0.78:0.02"],
    );
}

#[test]
fn intervals() {
    every_format("intervals", "chrons-0-6ma", &["intervals", SCALE]);
    every_format(
        "intervals-window-no-censor",
        "chrons-0-6ma",
        &["intervals", SCALE, "--from", "0.5", "--to", "5", "--no-censor"],
    );
}

#[test]
fn hazard() {
    every_format("hazard", "chrons-0-6ma", &["hazard", SCALE]);
}

#[test]
fn rate() {
    every_format("rate", "chrons-0-6ma", &["rate", SCALE]);
}

#[test]
fn simulate_timescale() {
    every_format("simulate-timescale", "arguments", &["simulate", "timescale", "--span", "5"]);
    every_format(
        "simulate-timescale-weibull",
        "arguments",
        &["simulate", "timescale", "--span", "3", "--model", "weibull", "--shape", "0.8", "--seed", "7"],
    );
}

const REDBEDS: &str = "records/tarrow-redbeds.csv";
const COMPILATION: &str = "records/psv-compilation.csv";

#[test]
fn unflatten() {
    every_format("unflatten-300", "tarrow-redbeds", &["unflatten", REDBEDS, "--resamples", "300"]);
    every_format("unflatten-factor", "tarrow-redbeds", &["unflatten", REDBEDS, "--factor", "0.65"]);
}

#[test]
fn psv() {
    every_format("psv-study-200", "psv-compilation", &["psv", COMPILATION, "--by", "study", "--resamples", "200"]);
}

#[test]
fn mean_ellipse() {
    every_format("mean-kent", "tarrow-redbeds", &["mean", REDBEDS, "--ellipse", "kent"]);
    every_format(
        "mean-bootstrap-300",
        "tarrow-redbeds",
        &["mean", REDBEDS, "--ellipse", "bootstrap", "--resamples", "300"],
    );
    every_format("mean-kent-by-study", "psv-compilation", &["mean", COMPILATION, "--by", "study", "--ellipse", "kent"]);
}

#[test]
fn field() {
    let record = "records/paleointensity/harrowmere-deep-vadm.csv";
    every_format("field-at", "igrf14", &["field", "at", "--year", "2024.5", "--lat", "51.2", "--lon", "-3.4"]);
    every_format("field-series", "igrf14", &["field", "series", "--from", "2015", "--to", "2030", "--every", "5"]);
    every_format(
        "field-context",
        "harrowmere-deep-vadm",
        &["field", "context", "--record", record, "--timescale", SCALE],
    );
}
