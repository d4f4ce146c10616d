//! The direction presenters' promises, checked on small invented sets: the section's tables hold
//! the same cells as the verbs' tables, and each caution is carried once (in `cautions`, and last
//! in the JSON notes). The numbers themselves are checked against published values in the tests of
//! `fieldtests` and `poles`; here only their presentation is.

use super::field_tests::section_sheet;
use super::test_labels::TestLabels;
use super::{cautions, Cell};
use crate::fieldtests::reversal_test;
use crate::model::{SiteRecord, SiteSet};
use crate::montecarlo::MonteCarlo;
use crate::poles::{pole_summary, Cutoff};
use crate::sphere::{Direction, GeoPoint, Vec3};

/// Six normal and six reversed directions, roughly antipodal (invented).
fn two_modes() -> Vec<Vec3> {
    let mut v = Vec::new();
    for i in 0..6 {
        let (d, inc) = (350.0 + 4.0 * i as f64, 50.0 + 2.0 * (i % 3) as f64);
        v.push(Direction::new(d % 360.0, inc).unwrap().to_vector());
        v.push(Direction::new((d + 181.0) % 360.0, -inc + 1.5).unwrap().to_vector());
    }
    v
}

#[test]
fn reversal_rows_and_caution() {
    let mc = MonteCarlo::new(7, 200);
    let t = reversal_test(&two_modes(), &mc, 0.95).unwrap();
    let lines: Vec<usize> = (2..14).collect();
    let l = TestLabels { file: "x.csv", frame: "geographic", confidence: 0.95, seed: 7, resamples: 200 };
    let p = super::mean_comparison::reversal(&t, &lines, &l);
    // The section's rows are the verb's rows behind the test's name.
    let s = section_sheet(Some(&t.comparison), None);
    assert_eq!(s.rows.len(), p.sheets[0].rows.len());
    for (sr, vr) in s.rows.iter().zip(&p.sheets[0].rows) {
        assert_eq!(sr[0], Cell::Text("reversal".into()));
        assert_eq!(&sr[1..], &vr[..]);
    }
    // The caution once, after the notes in JSON.
    assert_eq!(p.cautions, vec![cautions::FIELD_TESTS.to_string()]);
    assert!(!p.notes.iter().any(|n| n == cautions::FIELD_TESTS));
    let notes = p.json["notes"].as_array().unwrap();
    assert_eq!(notes.len(), p.notes.len() + 1);
    assert_eq!(notes.last().unwrap(), cautions::FIELD_TESTS);
    // Mode lines in JSON are file lines, every direction once.
    let mut all: Vec<u64> = ["mode1_lines", "mode2_lines"]
        .iter()
        .flat_map(|k| p.json["split"][k].as_array().unwrap().iter().map(|x| x.as_u64().unwrap()))
        .collect();
    all.sort_unstable();
    assert_eq!(all, (2..14).collect::<Vec<u64>>());
}

/// Eight invented sites near one locality, with n and k.
fn sites() -> SiteSet {
    let records = (0..8)
        .map(|i| SiteRecord {
            line: i + 2,
            site: format!("T{i}"),
            location: GeoPoint::new(41.0 + 0.1 * i as f64, 12.0).unwrap(),
            direction: Direction::new((355.0 + 3.0 * i as f64) % 360.0, 55.0 + (i % 4) as f64).unwrap(),
            n: Some(6),
            k: Some(80.0),
            a95: None,
            position: None,
        })
        .collect();
    SiteSet { source: "t.csv".into(), axis: None, records }
}

#[test]
fn pole_sheets_share_cells() {
    let set = sites();
    let sum = pole_summary(&set, false, Cutoff::None, &MonteCarlo::new(3, 200)).unwrap();
    let l = super::poles::PoleLabels { file: "t.csv", northern: false, seed: 3, resamples: 200 };
    let p = super::poles::poles(&set, &sum, &l);
    assert_eq!(p.sheets.len(), 3);
    let (pp, sc) = (sum.pole.as_ref().unwrap(), sum.scatter.as_ref().unwrap());
    let s = super::poles::pole_scatter_sheet(pp, "none", Some(sc), sum.interval.as_ref());
    // The section's paleopole row is the verb's pole row followed by its scatter row.
    let joined: Vec<Cell> = p.sheets[1].rows[0].iter().chain(&p.sheets[2].rows[0]).cloned().collect();
    assert_eq!(s.rows[0], joined);
    assert_eq!(s.columns.len(), joined.len());
    // JSON: every site kept (no cutoff), the scatter as computed.
    let js = p.json["sites"].as_array().unwrap();
    assert_eq!(js.len(), 8);
    assert!(js.iter().all(|j| j["kept"] == true));
    assert_eq!(p.json["scatter"]["s_total"].as_f64(), Some(sc.s_total));
    assert_eq!(p.json["pole"]["n"].as_u64(), Some(8));
}
