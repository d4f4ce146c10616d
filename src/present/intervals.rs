//! Renewal models fitted to the polarity intervals of a time scale, with their goodness of fit, as
//! the `intervals` verb prints them and the `section` run writes them (`renewal-fits` table). The
//! parameter columns and the parameter map are shared with the hazard's presentation.

use super::{json_num, Cell, Presentation, Sheet};
use crate::error::Result;
use crate::reversals::{Fitted, GoodnessOfFit, Interval, IntervalRecord, LrTest, RenewalFits, Sample};
use serde::ser::{Serialize, SerializeMap, Serializer};

/// The parameter columns of the renewal tables (sparse: each model fills its own).
pub const PARAM_COLUMNS: [&str; 6] = ["rate", "shape", "scale", "mu", "sigma", "mean"];

/// Title of the verb's renewal sheet.
pub const FITS_TITLE: &str = "Renewal models (maximum likelihood, open chron censored)";

/// Cells for [`PARAM_COLUMNS`] (4 decimals; empty where the model has no such parameter).
pub fn param_cells(f: &Fitted) -> Vec<Cell> {
    let named = f.named_params();
    PARAM_COLUMNS.iter().map(|c| Cell::opt(named.iter().find(|(k, _)| k == c).map(|p| p.1), 4)).collect()
}

/// Column names: `model`, the parameter columns, then `rest`.
pub fn model_columns(rest: &[&str]) -> Vec<String> {
    ["model"].iter().chain(PARAM_COLUMNS.iter()).chain(rest).map(|s| s.to_string()).collect()
}

/// A fitted model's parameters as a JSON object with the contract's names.
pub struct Params<'a>(pub &'a Fitted);

impl Serialize for Params<'_> {
    fn serialize<S: Serializer>(&self, s: S) -> std::result::Result<S::Ok, S::Error> {
        let named = self.0.named_params();
        let mut m = s.serialize_map(Some(named.len()))?;
        for (k, v) in named {
            m.serialize_entry(k, &v)?;
        }
        m.end()
    }
}

/// The fitted models with their likelihood, information criteria, Akaike weight and goodness of
/// fit (`gof[i]` of `fits.fits[i]`; empty cells where it is unavailable); with `mean_column`, the
/// mean interval of each model (Myr) follows the parameters.
pub fn fits_sheet(fits: &RenewalFits, gof: &[Result<GoodnessOfFit>], title: &str, mean_column: bool) -> Sheet {
    let mut rest = vec!["loglik", "aic", "bic", "weight", "ks_d", "ks_p", "ad", "ad_p"];
    if mean_column {
        rest.insert(0, "mean_interval_myr");
    }
    let mut sheet = Sheet { title: title.into(), columns: model_columns(&rest), rows: vec![] };
    for (f, g) in fits.fits.iter().zip(gof) {
        let g = g.as_ref().ok();
        let mut row = vec![Cell::Text(f.fitted.model.name().into())];
        row.extend(param_cells(&f.fitted));
        if mean_column {
            row.push(Cell::Num(f.fitted.mean(), 4));
        }
        row.extend([
            Cell::Num(f.loglik, 3),
            Cell::Num(f.aic, 3),
            Cell::Num(f.bic, 3),
            Cell::Num(f.weight, 3),
            Cell::opt(g.map(|g| g.ks_d), 4),
            Cell::opt(g.map(|g| g.ks_p), 3),
            Cell::opt(g.map(|g| g.ad), 3),
            Cell::opt(g.map(|g| g.ad_p), 3),
        ]);
        sheet.push(row);
    }
    sheet
}

/// The labels the fits' presentation needs besides the result.
#[derive(Debug, Clone, Copy)]
pub struct FitLabels<'a> {
    /// The time-scale file as given.
    pub file: &'a str,
    /// Bootstrap replicates asked for per model.
    pub resamples: usize,
    /// Seed of the Monte Carlo streams.
    pub seed: u64,
}

/// The likelihood-ratio sentence of gamma against exponential.
fn lr_note(t: &LrTest) -> String {
    format!(
        "Likelihood-ratio test of gamma against exponential (shape = 1): statistic {:.3}, p = {:.4}; {}",
        t.statistic,
        t.p_value,
        if t.p_value < 0.05 {
            "a constant-rate (memoryless) process is rejected at the 5 % level."
        } else {
            "a constant-rate (memoryless) process is not rejected at the 5 % level."
        }
    )
}

/// The fits as the `intervals` verb shows them: one sheet; `notes` (how the intervals were cut)
/// come first, then unavailable goodness of fit, failed fits, the likelihood-ratio test and the
/// bootstrap.
pub fn intervals(
    rec: &IntervalRecord,
    sample: &Sample,
    fits: &RenewalFits,
    gof: &[Result<GoodnessOfFit>],
    labels: FitLabels<'_>,
    mut notes: Vec<String>,
) -> Presentation {
    for (f, g) in fits.fits.iter().zip(gof) {
        if let Err(e) = g {
            notes.push(format!("{}: goodness of fit unavailable: {e}", f.fitted.model.name()));
        }
    }
    for fail in &fits.failures {
        notes.push(format!("{}: not fitted: {}", fail.model.name(), fail.reason));
    }
    notes.extend(fits.lr_test.as_ref().map(lr_note));
    notes.push(format!(
        "Goodness-of-fit p-values come from a parametric bootstrap of {} replicates that refits the model each time (seed {}).",
        labels.resamples, labels.seed
    ));
    let view = IntervalsView {
        file: labels.file,
        from: rec.from,
        to: rec.to,
        n_intervals: sample.n(),
        censored: rec.censored,
        censored_old: rec.censored_old,
        old_edge: rec.old_reading.name(),
        merged_short: rec.merged_short,
        joined: rec.joined,
        left_out: rec.left_out,
        mean_complete: sample.complete.iter().sum::<f64>() / sample.n() as f64,
        models: fits.fits.iter().zip(gof).map(|(f, g)| fit_view(f, g.as_ref().ok())).collect(),
        lr_test: fits.lr_test.map(|t| LrView {
            null: "gamma shape = 1 (exponential)",
            statistic: t.statistic,
            df: t.df,
            p_value: t.p_value,
        }),
        intervals: rec.complete.iter().map(IntervalView::of).collect(),
        open_chron: rec.open.as_ref().map(IntervalView::of),
        resamples: labels.resamples,
        seed: labels.seed,
        notes: &notes,
    };
    let json = serde_json::to_value(&view).expect("an intervals view serializes");
    let sheet = fits_sheet(fits, gof, FITS_TITLE, false);
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions: vec![] }
}

fn fit_view<'a>(f: &'a crate::reversals::ModelFit, g: Option<&GoodnessOfFit>) -> FitView<'a> {
    FitView {
        model: f.fitted.model.name(),
        params: Params(&f.fitted),
        loglik: f.loglik,
        aic: f.aic,
        bic: f.bic,
        weight: f.weight,
        ks_d: g.map(|g| g.ks_d),
        ks_p: g.map(|g| g.ks_p),
        ad: g.map(|g| g.ad),
        ad_p: g.map(|g| g.ad_p),
        mean_interval: f.fitted.mean(),
    }
}

#[derive(serde::Serialize)]
struct IntervalsView<'a> {
    file: &'a str,
    from: f64,
    to: f64,
    n_intervals: usize,
    #[serde(serialize_with = "json_num::opt")]
    censored: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    censored_old: Option<f64>,
    old_edge: &'static str,
    merged_short: usize,
    joined: usize,
    left_out: usize,
    mean_complete: f64,
    models: Vec<FitView<'a>>,
    lr_test: Option<LrView>,
    intervals: Vec<IntervalView<'a>>,
    open_chron: Option<IntervalView<'a>>,
    resamples: usize,
    seed: u64,
    notes: &'a [String],
}

#[derive(serde::Serialize)]
struct FitView<'a> {
    model: &'static str,
    params: Params<'a>,
    loglik: f64,
    aic: f64,
    bic: f64,
    weight: f64,
    #[serde(serialize_with = "json_num::opt")]
    ks_d: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    ks_p: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    ad: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    ad_p: Option<f64>,
    mean_interval: f64,
}

#[derive(serde::Serialize)]
struct LrView {
    null: &'static str,
    statistic: f64,
    df: usize,
    p_value: f64,
}

#[derive(serde::Serialize)]
struct IntervalView<'a> {
    young: f64,
    old: f64,
    length: f64,
    polarity: crate::model::Polarity,
    chrons: &'a [String],
}

impl<'a> IntervalView<'a> {
    fn of(iv: &'a Interval) -> Self {
        IntervalView { young: iv.young, old: iv.old, length: iv.duration(), polarity: iv.polarity, chrons: &iv.names }
    }
}

#[cfg(test)]
pub(super) mod tests {
    use super::*;
    use crate::montecarlo::MonteCarlo;
    use crate::reversals::{fit_models, goodness_of_fits, intervals, IntervalOptions, Model};

    /// An invented time scale: open chron 0.3 Myr, then complete intervals, the oldest censored.
    pub(in crate::present) fn fitted() -> (IntervalRecord, Sample, RenewalFits) {
        let csv = "young,old,polarity\n0,0.3,N\n0.3,0.5,R\n0.5,1.0,N\n1.0,1.1,R\n1.1,1.5,N\n1.5,1.9,R\n1.9,2.6,N\n";
        let t = crate::table::Table::parse("ts.csv", csv.as_bytes()).unwrap();
        let ts = crate::model::TimeScale::from_table(&t).unwrap();
        let rec = intervals(&ts, &IntervalOptions::default()).unwrap();
        let sample = rec.sample().unwrap();
        let fits = fit_models(&sample, &Model::ALL);
        (rec, sample, fits)
    }

    #[test]
    fn the_mean_column_sits_after_the_parameters_and_is_the_models_mean() {
        let (_, sample, fits) = fitted();
        let gof = goodness_of_fits(&fits, &sample, &MonteCarlo::new(1, 20));
        let with = fits_sheet(&fits, &gof, "t", true);
        let without = fits_sheet(&fits, &gof, "t", false);
        let at = with.columns.iter().position(|c| c == "mean_interval_myr").unwrap();
        assert_eq!(at, 1 + PARAM_COLUMNS.len());
        for (w, (o, f)) in with.rows.iter().zip(without.rows.iter().zip(&fits.fits)) {
            let mut w = w.clone();
            assert_eq!(w.remove(at), Cell::Num(f.fitted.mean(), 4));
            assert_eq!(&w, o);
        }
        // The exponential model's mean interval is the reciprocal of its rate (common practice).
        let exp = &with.rows[0];
        let (Cell::Num(rate, _), Cell::Num(mean, _)) = (&exp[1], &exp[at]) else { panic!("{exp:?}") };
        assert!((rate * mean - 1.0).abs() < 1e-12, "{rate} × {mean}");
    }
}
