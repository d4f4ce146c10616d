//! The reversal rate through time with its trend and clustering tests, as the `rate` verb prints it
//! and the `section` run writes it (`rate` and `rate-tests` tables).

use super::test_labels::json_notes;
use super::{cautions, Cell, Presentation, Sheet};
use crate::reversals::{ClusteringTest, RatePoint, RateSummary};

/// Title of the verb's rate sheet.
pub const RATE_TITLE: &str = "Reversal rate through time (per Myr)";
/// Title of the verb's tests sheet.
pub const TESTS_TITLE: &str = "Tests";

/// The rate in each window: centre age (Ma), rate and its limits (per Myr), reversals counted.
pub fn rate_sheet(points: &[RatePoint], title: &str) -> Sheet {
    let mut sheet = Sheet::new(title, &["age", "rate", "low", "high", "count"]);
    for p in points {
        sheet.push(vec![
            Cell::Num(p.age, 3),
            Cell::Num(p.rate, 3),
            Cell::Num(p.low, 3),
            Cell::Num(p.high, 3),
            Cell::Int(p.count as i64),
        ]);
    }
    sheet
}

/// The trend test (Laplace U) and the clustering tests (mean H, uniformity of H), those available.
pub fn tests_sheet(sum: &RateSummary, title: &str) -> Sheet {
    let mut sheet = Sheet::new(title, &["test", "n", "statistic", "value", "p"]);
    let mut row = |test: &str, n: usize, stat: &str, value: f64, p: f64| {
        sheet.push(vec![
            Cell::Text(test.into()),
            Cell::Int(n as i64),
            Cell::Text(stat.into()),
            Cell::Num(value, 3),
            Cell::Num(p, 4),
        ])
    };
    if let Ok(l) = &sum.laplace {
        row("laplace trend", l.n, "U", l.u, l.p_value);
    }
    if let Ok(c) = &sum.clustering {
        row("clustering (mean H)", c.h.len(), "mean_h", c.mean_h, c.p_value);
        row("clustering (H uniform)", c.h.len(), "ks_d", c.ks_d, c.ks_p);
    }
    sheet
}

/// Sentences reading the tests (or why each is unavailable).
pub fn tests_notes(sum: &RateSummary) -> Vec<String> {
    let laplace = match &sum.laplace {
        Ok(l) => format!(
            "Laplace trend test: U = {:.2} (p = {:.3}); U > 0 means reversals crowd toward the present, U < 0 toward the old end.",
            l.u, l.p_value
        ),
        Err(e) => format!("Laplace trend test unavailable: {e}"),
    };
    let clustering = match &sum.clustering {
        Ok(c) => format!(
            "Clustering test: mean H = {:.3} over {} reversals (0.5 for a locally Poisson process, lower for clustering, higher for regular spacing); neighbouring H values share intervals, so the p-values are approximate.",
            c.mean_h,
            c.h.len()
        ),
        Err(e) => format!("Clustering test unavailable: {e}"),
    };
    vec![laplace, clustering]
}

/// The labels the rate's presentation needs besides the result.
#[derive(Debug, Clone, Copy)]
pub struct RateLabels<'a> {
    /// The time-scale file as given.
    pub file: &'a str,
    /// Young and old edge of the record, Ma.
    pub span: (f64, f64),
    /// Width of the windows, Myr.
    pub window: f64,
    /// Confidence level of the rate band.
    pub level: f64,
}

/// The rate as the `rate` verb shows it: the rate sheet (the main one) and the tests; `notes` (how
/// the intervals were cut) come first, then the counting and the tests; the caution is
/// [`cautions::RATE`].
pub fn rate(sum: &RateSummary, reversals: &[f64], labels: RateLabels<'_>, mut notes: Vec<String>) -> Presentation {
    notes.push(format!(
        "{} reversals in the window; rates counted in {} Myr windows every {} Myr, with exact Poisson {:.0} % limits.",
        reversals.len(),
        labels.window,
        sum.step,
        labels.level * 100.0
    ));
    notes.extend(tests_notes(sum));
    let cautions = vec![cautions::RATE.to_string()];
    let view = RateView {
        file: labels.file,
        from: labels.span.0,
        to: labels.span.1,
        window: labels.window,
        step: sum.step,
        level: labels.level,
        n_reversals: reversals.len(),
        rate: &sum.points,
        laplace: sum.laplace.as_ref().ok(),
        clustering: sum.clustering.as_ref().ok().map(ClusteringView::of),
        notes: json_notes(&notes, &cautions),
    };
    let json = serde_json::to_value(&view).expect("a rate view serializes");
    let sheets = vec![rate_sheet(&sum.points, RATE_TITLE), tests_sheet(sum, TESTS_TITLE)];
    Presentation { json, sheets, main_sheet: 0, notes, cautions }
}

#[derive(serde::Serialize)]
struct RateView<'a> {
    file: &'a str,
    from: f64,
    to: f64,
    window: f64,
    step: f64,
    level: f64,
    n_reversals: usize,
    rate: &'a [RatePoint],
    laplace: Option<&'a crate::reversals::LaplaceTest>,
    clustering: Option<ClusteringView<'a>>,
    notes: Vec<String>,
}

#[derive(serde::Serialize)]
struct ClusteringView<'a> {
    n: usize,
    mean_h: f64,
    z: f64,
    p_value: f64,
    ks_d: f64,
    ks_p: f64,
    h: &'a [f64],
}

impl<'a> ClusteringView<'a> {
    fn of(c: &'a ClusteringTest) -> Self {
        ClusteringView {
            n: c.h.len(),
            mean_h: c.mean_h,
            z: c.z,
            p_value: c.p_value,
            ks_d: c.ks_d,
            ks_p: c.ks_p,
            h: &c.h,
        }
    }
}
