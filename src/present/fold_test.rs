//! Presenter of the fold test: bootstrap incremental untilting, with the classic precision ratio
//! shown for comparison.

use super::test_labels::json_notes;
use super::{cautions, json_num, Cell, Presentation, Sheet};
use crate::fieldtests::{FoldOptions, FoldTest, FoldVerdict};
use serde::Serialize;

#[derive(Serialize)]
struct RangeJson {
    from: f64,
    to: f64,
    step: f64,
}

#[derive(Serialize)]
struct ClassicJson {
    #[serde(serialize_with = "json_num::one")]
    k_geo: f64,
    #[serde(serialize_with = "json_num::one")]
    k_tilt: f64,
    ratio: f64,
    f_crit: f64,
    increase: bool,
    decrease: bool,
}

#[derive(Serialize)]
struct FoldJson<'a> {
    file: &'a str,
    n: usize,
    best_untilt: f64,
    ci_low: f64,
    ci_high: f64,
    verdict: &'static str,
    confidence: f64,
    range: RangeJson,
    at_edge: f64,
    bedding_spread: f64,
    classic: ClassicJson,
    seed: u64,
    resamples: usize,
    notes: Vec<String>,
}

/// The summary rows `quantity`, `value`, `critical`, `outcome` of the test (the section's table).
pub fn summary_rows(t: &FoldTest) -> Vec<Vec<Cell>> {
    vec![
        vec![
            Cell::Text("best untilting (%)".into()),
            Cell::Num(t.best_untilt, 0),
            Cell::Text(format!("{:.0} to {:.0}", t.ci_low, t.ci_high)),
            Cell::Text(t.verdict.name().into()),
        ],
        vec![
            Cell::Text("k_tilt / k_geo".into()),
            Cell::Num(t.classic.ratio, 2),
            Cell::Num(t.classic.f_crit, 2),
            Cell::Text("comparison only".into()),
        ],
    ]
}

/// The fold test `t` of the table `file` (untilting range `opt`, `resamples` drawn with `seed`).
pub fn fold(t: &FoldTest, opt: &FoldOptions, file: &str, seed: u64, resamples: usize) -> Presentation {
    let p = &t.classic;
    let mut sec = Sheet::new(
        &format!("Fold test of {file} ({} directions, {resamples} resamples)", t.n),
        &["best_untilt", "ci_low", "ci_high", "verdict", "k_geo", "k_tilt", "k_ratio", "f_crit"],
    );
    sec.push(vec![
        Cell::Num(t.best_untilt, 0),
        Cell::Num(t.ci_low, 0),
        Cell::Num(t.ci_high, 0),
        Cell::Text(t.verdict.name().into()),
        Cell::Num(p.k_geo, 1),
        Cell::Num(p.k_tilt, 1),
        Cell::Num(p.ratio, 2),
        Cell::Num(p.f_crit, 2),
    ]);
    let notes = notes(t, opt);
    let cautions = vec![cautions::FIELD_TESTS.to_string()];
    let json = FoldJson {
        file,
        n: t.n,
        best_untilt: t.best_untilt,
        ci_low: t.ci_low,
        ci_high: t.ci_high,
        verdict: t.verdict.name(),
        confidence: t.confidence,
        range: RangeJson { from: opt.from, to: opt.to, step: opt.step },
        at_edge: t.at_edge,
        bedding_spread: t.bedding_spread,
        classic: ClassicJson {
            k_geo: p.k_geo,
            k_tilt: p.k_tilt,
            ratio: p.ratio,
            f_crit: p.f_crit,
            increase: p.increase,
            decrease: p.decrease,
        },
        seed,
        resamples,
        notes: json_notes(&notes, &cautions),
    };
    Presentation {
        json: serde_json::to_value(json).expect("plain data"),
        sheets: vec![sec],
        main_sheet: 0,
        notes,
        cautions,
    }
}

fn notes(t: &FoldTest, opt: &FoldOptions) -> Vec<String> {
    let p = &t.classic;
    let mut notes = vec![format!(
        "Best untilting {:.0} % (95 % bootstrap interval {:.0} to {:.0} %): {}.",
        t.best_untilt,
        t.ci_low,
        t.ci_high,
        match t.verdict {
            FoldVerdict::PreFolding => "consistent with a magnetization acquired before folding",
            FoldVerdict::PostFolding => "consistent with a magnetization acquired after folding",
            FoldVerdict::SynFolding => "consistent with a magnetization acquired during folding",
            FoldVerdict::Inconclusive => "the interval does not single out pre-, syn- or post-folding",
        }
    )];
    if t.at_edge > 0.025 {
        notes.push(format!(
            "{:.0} % of the resamples peak at an end of the range ({:.0} to {:.0} %): the curve may keep rising beyond it.",
            100.0 * t.at_edge,
            opt.from,
            opt.to
        ));
    }
    if t.bedding_spread < 20.0 {
        notes.push(format!(
            "The bedding attitudes differ by at most {:.0}°: untilting turns the set almost rigidly, so the fold test has little power here.",
            t.bedding_spread
        ));
    }
    notes.push(format!(
        "Classic ratio k_tilt/k_geo = {:.2} against F = {:.2}: {}. Shown for comparison only: both k come from the same directions, so the F test does not strictly apply.",
        p.ratio,
        p.f_crit,
        if p.increase {
            "significant increase on untilting"
        } else if p.decrease {
            "significant decrease on untilting"
        } else {
            "no significant change"
        }
    ));
    notes
}
