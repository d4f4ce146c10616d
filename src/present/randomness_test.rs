//! Presenter of the randomness test of a set of directions (Watson 1956).

use super::test_labels::json_notes;
use super::{cautions, Cell, Presentation, Sheet};
use crate::fieldtests::{R0Route, RandomnessTest};
use serde::Serialize;

#[derive(Serialize)]
struct RandomJson<'a> {
    file: &'a str,
    frame: &'a str,
    n: usize,
    r: f64,
    r0: f64,
    p_value: f64,
    random: bool,
    confidence: f64,
    route: R0Route,
    notes: Vec<String>,
}

/// The randomness test `t` of the table `file` in the frame labelled `frame`.
pub fn random(t: &RandomnessTest, file: &str, frame: &str) -> Presentation {
    let mut sec = Sheet::new(
        &format!("Randomness test of {} ({} coordinates)", file, frame),
        &["n", "r", "r0", "p_value", "random"],
    );
    sec.push(vec![
        Cell::Int(t.n as i64),
        Cell::Num(t.r, 3),
        Cell::Num(t.r0, 3),
        Cell::Num(t.p_value, 4),
        Cell::Text(if t.random { "yes" } else { "no" }.into()),
    ]);
    let notes = vec![if t.random {
        format!("R = {:.2} < R0 = {:.2}: randomness cannot be rejected at 95 % (p = {:.3}).", t.r, t.r0, t.p_value)
    } else {
        format!("R = {:.2} ≥ R0 = {:.2}: the directions are not random at 95 % (p = {:.3}).", t.r, t.r0, t.p_value)
    }];
    let cautions = vec![cautions::FIELD_TESTS.to_string()];
    let json = RandomJson {
        file,
        frame,
        n: t.n,
        r: t.r,
        r0: t.r0,
        p_value: t.p_value,
        random: t.random,
        confidence: t.confidence,
        route: t.route,
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
