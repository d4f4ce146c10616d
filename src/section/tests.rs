//! Unit tests of the section pipeline on a small synthetic folder made in memory.

use super::*;
use crate::montecarlo::Silent;

#[test]
fn csv_quoting_and_numbers() {
    let mut t = CsvTable::new("x", "X", &["a", "b"]);
    t.push(vec!["p,q".into(), crate::numbers::fixed(-0.0001, 2)]);
    // RFC 4180 quoting (common practice): a cell with a comma is quoted.
    assert_eq!(t.to_csv(), "a,b\n\"p,q\",0.00\n");
}

#[test]
fn html_escapes_text() {
    assert_eq!(report::escape("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
}

#[test]
fn missing_site_in_sampling_is_an_error_naming_the_line() {
    let p = Project {
        title: "t".into(),
        steps: ProjectFile::new(
            "steps.csv",
            "specimen,site,step,dec,inc,moment\nA1,S9,0,10,40,1e-6\nA1,S9,10,10,40,5e-7\n",
        ),
        sampling: ProjectFile::new("sampling.csv", "site,lat,lon,height\nS1,40,10,1\n"),
        picks: None,
        timescale: None,
        settings: None,
    };
    let e = run(&p, &Silent, &mut |_| {}).unwrap_err().to_string();
    assert!(e.contains("steps.csv:2") && e.contains("'S9' is not in sampling.csv"), "{e}");
}

#[test]
fn exponential_fit_of_the_stage_is_the_censored_maximum_likelihood_rate() {
    // Time scale: open chron 0.3 Myr, complete intervals 0.2, 0.5, 0.1, 0.4, then the oldest chron
    // (0.4 Myr) cut by the end of the table: a second censored length. For right-censored exponential
    // data the maximum-likelihood rate is (number of complete intervals) / (total exposure including
    // the censored lengths)
    // (Lawless, Statistical Models and Methods for Lifetime Data, 2nd ed. 2003, §2.2; common practice).
    let csv = "young,old,polarity\n0,0.3,N\n0.3,0.5,R\n0.5,1.0,N\n1.0,1.1,R\n1.1,1.5,N\n1.5,1.9,R\n";
    let ts =
        crate::model::TimeScale::from_table(&crate::table::Table::parse("ts.csv", csv.as_bytes()).unwrap()).unwrap();
    let r = reversal_stats::reversal_statistics("ts.csv", &ts, &crate::montecarlo::MonteCarlo::new(1, 50));
    assert!(r.stage.ran, "{:?}", r.warnings);
    let fits = &r.tables[0];
    let exp = fits.rows.iter().find(|row| fits.cell(row, "model").as_deref() == Some("exponential")).unwrap();
    let expected = 4.0 / (0.2 + 0.5 + 0.1 + 0.4 + 0.3 + 0.4);
    let rate = fits.number(exp, "rate").unwrap();
    assert!((rate - expected).abs() < 1e-6 * expected, "{rate} against {expected}");
    // The hazard cautions travel with the stage.
    assert!(r.cautions.iter().any(|c| c.contains("not a forecast")));
    assert!(r.tables.iter().any(|t| t.stem == "hazard"));
}
