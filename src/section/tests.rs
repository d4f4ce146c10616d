//! Unit tests of the section pipeline on a small synthetic folder made in memory.

use super::*;
use crate::montecarlo::Silent;

#[test]
fn csv_quoting_and_numbers() {
    let mut t = CsvTable::new("x", "X", &["a", "b"]);
    t.push(vec!["p,q".into(), tables::num(-0.0001, 2)]);
    // RFC 4180 quoting (common practice): a cell with a comma is quoted.
    assert_eq!(t.to_csv(), "a,b\n\"p,q\",0.00\n");
}

#[test]
fn html_escapes_text() {
    assert_eq!(report_html::escape("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
}

#[test]
fn missing_site_in_sampling_is_an_error_naming_the_line() {
    let p = Project {
        title: "t".into(),
        steps: ProjectFile::new("steps.csv", "specimen,site,step,dec,inc,moment\nA1,S9,0,10,40,1e-6\nA1,S9,10,10,40,5e-7\n"),
        sampling: ProjectFile::new("sampling.csv", "site,lat,lon,height\nS1,40,10,1\n"),
        picks: None,
        timescale: None,
        settings: None,
    };
    let e = run(&p, &Silent, &mut |_| {}).unwrap_err().to_string();
    assert!(e.contains("steps.csv:2") && e.contains("'S9' is not in sampling.csv"), "{e}");
}
