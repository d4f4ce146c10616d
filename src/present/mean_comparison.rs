//! Presenters of the comparison of two mean directions: the reversal test (the two polarity modes
//! of one set) and the common-mean test (two sets), by the angle test with its classes, Watson's
//! V_w and a bootstrap.

use super::test_labels::{json_notes, pass_fail, TestLabels};
use super::{cautions, Cell, Presentation, Sheet};
use crate::fieldtests::{MeanComparison, Mm90Class, ReversalTest};
use crate::sphere::Direction;
use serde::Serialize;

#[derive(Serialize)]
struct Bounds {
    low: [f64; 3],
    high: [f64; 3],
}

#[derive(Serialize)]
struct BootstrapJson {
    passed: bool,
    overlap: [bool; 3],
    resamples: usize,
    set1: Bounds,
    set2: Bounds,
}

#[derive(Serialize)]
struct MeanJson {
    dec: f64,
    inc: f64,
    r: f64,
    k: f64,
}

/// The fields of a comparison in JSON.
#[derive(Serialize)]
struct ComparisonJson {
    n1: usize,
    n2: usize,
    gamma: f64,
    gamma_c: f64,
    class: &'static str,
    gamma_c_common_k: f64,
    v_w: f64,
    v_crit: f64,
    v_w_passed: bool,
    bootstrap: BootstrapJson,
    passed: bool,
    mean1: MeanJson,
    mean2: MeanJson,
}

impl ComparisonJson {
    fn of(c: &MeanComparison) -> Self {
        let b = &c.bootstrap;
        ComparisonJson {
            n1: c.n1,
            n2: c.n2,
            gamma: c.mm90.gamma,
            gamma_c: c.mm90.gamma_c,
            class: c.mm90.class.name(),
            gamma_c_common_k: c.mm90.gamma_c_common_k,
            v_w: c.watson.v_w,
            v_crit: c.watson.v_crit,
            v_w_passed: c.watson.passed,
            bootstrap: BootstrapJson {
                passed: b.passed,
                overlap: b.overlap,
                resamples: b.resamples,
                set1: Bounds { low: b.set1.low, high: b.set1.high },
                set2: Bounds { low: b.set2.low, high: b.set2.high },
            },
            passed: c.passed,
            mean1: MeanJson { dec: c.mean1.dec, inc: c.mean1.inc, r: c.r1, k: c.k1 },
            mean2: MeanJson { dec: c.mean2.dec, inc: c.mean2.inc, r: c.r2, k: c.k2 },
        }
    }
}

#[derive(Serialize)]
struct DirJson {
    dec: f64,
    inc: f64,
}

#[derive(Serialize)]
struct SplitJson {
    axis_dec: f64,
    axis_inc: f64,
    mode1_lines: Vec<usize>,
    mode2_lines: Vec<usize>,
    mode2_mean_unflipped: DirJson,
}

/// The JSON of a reversal or common-mean test.
#[derive(Serialize)]
struct TestJson<'a> {
    #[serde(flatten)]
    comparison: ComparisonJson,
    #[serde(skip_serializing_if = "Option::is_none")]
    split: Option<SplitJson>,
    file: &'a str,
    frame: &'a str,
    confidence: f64,
    seed: u64,
    resamples: usize,
    notes: Vec<String>,
}

/// The rows `check`, `value`, `critical`, `outcome` of the three approaches.
pub fn check_rows(c: &MeanComparison) -> Vec<Vec<Cell>> {
    let ov = c.bootstrap.overlap;
    let axis = |i: usize, name: &'static str| if ov[i] { name } else { "-" };
    vec![
        vec![
            Cell::Text("gamma (deg)".into()),
            Cell::Num(c.mm90.gamma, 2),
            Cell::Num(c.mm90.gamma_c, 2),
            Cell::Text(format!("class {}", c.mm90.class.name())),
        ],
        vec![
            Cell::Text("V_w".into()),
            Cell::Num(c.watson.v_w, 2),
            Cell::Num(c.watson.v_crit, 2),
            Cell::Text(pass_fail(c.watson.passed).into()),
        ],
        vec![
            Cell::Text("bootstrap x/y/z".into()),
            Cell::Empty,
            Cell::Empty,
            Cell::Text(format!(
                "{} ({}/{}/{} overlap)",
                pass_fail(c.bootstrap.passed),
                axis(0, "x"),
                axis(1, "y"),
                axis(2, "z")
            )),
        ],
    ]
}

/// The three-approach sheet and the notes shared by the reversal and common-mean tests.
fn comparison(c: &MeanComparison, what: &str, title: &str) -> (Sheet, Vec<String>) {
    let mut sec = Sheet::new(title, &["check", "value", "critical", "outcome"]);
    check_rows(c).into_iter().for_each(|r| sec.push(r));
    let mut notes = vec![if c.passed {
        format!(
            "{what} agree within the 95 % limits: gamma = {:.1}° ≤ gamma_c = {:.1}°, class {}.",
            c.mm90.gamma,
            c.mm90.gamma_c,
            c.mm90.class.name()
        )
    } else {
        format!("{what} differ at the 95 % level: gamma = {:.1}° > gamma_c = {:.1}°.", c.mm90.gamma, c.mm90.gamma_c)
    }];
    if c.agree() {
        notes.push("Watson's V_w and the bootstrap give the same outcome.".into());
    } else {
        notes.push(format!(
            "The approaches disagree (angle test {}, V_w {}, bootstrap {}); `passed` follows the angle test (k1 = {:.0}, k2 = {:.0}).",
            pass_fail(c.mm90.passed),
            pass_fail(c.watson.passed),
            pass_fail(c.bootstrap.passed),
            c.k1,
            c.k2
        ));
    }
    notes.push(format!(
        "gamma_c is the angle at which V_w reaches its simulated critical value (McFadden & McElhinny 1990), valid for unequal precisions; the common-precision angle would be {:.1}°.",
        c.mm90.gamma_c_common_k
    ));
    if c.mm90.class == Mm90Class::Indeterminate {
        notes.push("gamma_c exceeds 20°: the data are too few or too scattered for the test to discriminate.".into());
    }
    (sec, notes)
}

/// A presentation of a comparison with its extra sheet, notes and split.
fn finish(
    c: &MeanComparison,
    split: Option<SplitJson>,
    sheets: Vec<Sheet>,
    notes: Vec<String>,
    l: &TestLabels,
) -> Presentation {
    let cautions = vec![cautions::FIELD_TESTS.to_string()];
    let json = TestJson {
        comparison: ComparisonJson::of(c),
        split,
        file: l.file,
        frame: l.frame,
        confidence: l.confidence,
        seed: l.seed,
        resamples: l.resamples,
        notes: json_notes(&notes, &cautions),
    };
    Presentation { json: serde_json::to_value(json).expect("plain data"), sheets, main_sheet: 0, notes, cautions }
}

/// The two means being compared, one row each: `label` (named by `first`), n, dec, inc, k.
fn two_means_sheet(title: &str, first: &str, rows: [(&str, usize, Direction, f64); 2]) -> Sheet {
    let mut sheet = Sheet::new(title, &[first, "n", "dec", "inc", "k"]);
    for (label, n, m, k) in rows {
        sheet.push(vec![
            Cell::Text(label.to_string()),
            Cell::Int(n as i64),
            Cell::Azimuth(m.dec, 1),
            Cell::Num(m.inc, 1),
            Cell::Num(k, 1),
        ]);
    }
    sheet
}

/// The reversal test `t`; `lines[i]` is the file line of direction `i`.
pub fn reversal(t: &ReversalTest, lines: &[usize], l: &TestLabels) -> Presentation {
    let c = &t.comparison;
    let title = format!("Reversal test of {} ({} coordinates)", l.file, l.frame);
    let (sec, mut notes) = comparison(c, "The two polarity modes", &title);
    let modes = two_means_sheet(
        "Polarity modes (split on the principal axis)",
        "mode",
        [("1", c.n1, c.mean1, c.k1), ("2", c.n2, t.mode2_mean, c.k2)],
    );
    let line_of = |idx: &[usize]| idx.iter().map(|&i| lines[i]).collect::<Vec<_>>();
    let split = SplitJson {
        axis_dec: t.split.axis.dec,
        axis_inc: t.split.axis.inc,
        mode1_lines: line_of(&t.split.mode1),
        mode2_lines: line_of(&t.split.mode2),
        mode2_mean_unflipped: DirJson { dec: t.mode2_mean.dec, inc: t.mode2_mean.inc },
    };
    notes.insert(0, format!(
        "Split on the principal axis (dec {:.1}, inc {:.1}): {} directions in mode 1, {} in mode 2 (mode 2 flipped to its antipode for the test).",
        t.split.axis.dec, t.split.axis.inc, c.n1, c.n2
    ));
    finish(c, Some(split), vec![sec, modes], notes, l)
}

/// The common-mean test `c` of the tables named `files`; `l.file` names both.
pub fn common_mean(c: &MeanComparison, files: [&str; 2], l: &TestLabels) -> Presentation {
    let title = format!("Common-mean test of {} and {} ({} coordinates)", files[0], files[1], l.frame);
    let (sec, notes) = comparison(c, "The two mean directions", &title);
    let means = two_means_sheet("Means", "file", [(files[0], c.n1, c.mean1, c.k1), (files[1], c.n2, c.mean2, c.k2)]);
    finish(c, None, vec![sec, means], notes, l)
}
