//! The last stage of a run on a synthetic folder: what the run recovered, set against the model it
//! was drawn from (`truth.json`, written by `simulate section`). It reads the run's own tables (the
//! ties of the best correlation, the age model, the polarity of each level, the site means), so it
//! compares exactly what the report and the CSV files show.
//!
//! Three comparisons: each true reversal against the tie of the best correlation at the same age
//! (is the true height inside the sampling gap the tie spans?); each level's interpolated age and
//! polarity against the true ones; each site's tilt-corrected mean against the true field direction
//! at that level (the angle between them, and whether it lies inside the site's α95).

use super::tables::CsvTable;
use super::{ProjectFile, SectionRun, Stage};
use crate::numbers::{azimuth, fixed};
use crate::sphere::Direction;
use serde_json::Value;

/// Ages closer than this are the same chron boundary, Myr (the time scales carry 3 decimals).
const SAME_AGE: f64 = 5e-4;

struct TrueLevel {
    site: String,
    age: f64,
    polarity: String,
    field: Option<Direction>,
}

fn dir(v: &Value) -> Option<Direction> {
    Direction::new(v.get("dec")?.as_f64()?, v.get("inc")?.as_f64()?).ok()
}

fn true_ties(t: &Value, axis: &str) -> Vec<(f64, f64)> {
    let list = t.get("ties").and_then(Value::as_array).map_or(&[][..], Vec::as_slice);
    list.iter().filter_map(|x| Some((x.get("age")?.as_f64()?, x.get(axis)?.as_f64()?))).collect()
}

fn true_levels(t: &Value) -> Vec<TrueLevel> {
    let list = t.get("levels").and_then(Value::as_array).map_or(&[][..], Vec::as_slice);
    list.iter()
        .filter_map(|x| {
            Some(TrueLevel {
                site: x.get("site")?.as_str()?.to_string(),
                age: x.get("age")?.as_f64()?,
                polarity: x.get("polarity")?.as_str()?.to_string(),
                field: x.get("field_tilt").and_then(dir),
            })
        })
        .collect()
}

/// Add the comparison stage and its tables to `run`. A truth file that cannot be read is a warning.
pub(super) fn compare_with_truth(run: &mut SectionRun, file: &ProjectFile) {
    let mut stage = Stage::new("Comparison with the true model");
    stage.method = format!(
        "The project is synthetic: {} holds the model it was drawn from. Each true reversal is set against the tie of the best correlation at the same age (the tie is right when the true height lies inside the sampling gap the tie spans); each level's age from the age model and its polarity against the true ones; each used site's tilt-corrected mean against the true field direction at that level (angle between them, and whether it lies inside the site's α95, which it should at about 95 % of sites when the specimen directions scatter only randomly about the field).",
        file.name
    );
    let truth: Value = match serde_json::from_slice(&file.bytes) {
        Ok(v) => v,
        Err(e) => {
            stage.ran = false;
            stage.result = format!("Skipped: {} is not readable JSON ({e}).", file.name);
            run.warnings.push(stage.result.clone());
            run.stages.push(stage);
            return;
        }
    };
    let axis = run
        .table("zones")
        .and_then(|z| z.rows.first().and_then(|r| z.cell(r, "axis")))
        .unwrap_or_else(|| "height".into());
    let axis = axis.to_string();
    let mut results = Vec::new();
    let mut tables = Vec::new();
    if let Some(t) = compare_ties(run, &true_ties(&truth, &axis), &axis, &mut results) {
        tables.push(t);
    }
    let levels = true_levels(&truth);
    if let Some(t) = compare_levels(run, &levels, &mut results) {
        tables.push(t);
    }
    if let Some(t) = compare_directions(run, &levels, &mut results) {
        tables.push(t);
    }
    stage.ran = !tables.is_empty();
    stage.result = if results.is_empty() {
        "Skipped: the run has no ties, ages or site means to compare.".into()
    } else {
        results.join(" ")
    };
    stage.tables = tables.iter().map(|t| t.stem.clone()).collect();
    run.tables.extend(tables);
    run.stages.push(stage);
}

fn compare_ties(run: &SectionRun, truth: &[(f64, f64)], axis: &str, results: &mut Vec<String>) -> Option<CsvTable> {
    let ties = run.table("ties")?;
    let tied: Vec<[f64; 4]> = ties
        .rows
        .iter()
        .filter(|r| ties.cell(r, "rank").as_deref() == Some("1"))
        .filter_map(|r| {
            Some([ties.number(r, "age")?, ties.number(r, axis)?, ties.number(r, "low")?, ties.number(r, "high")?])
        })
        .collect();
    let mut t = CsvTable::new(
        "truth-ties",
        "True reversals against the ties of the best correlation",
        &["true_age", "true_position", "tied_position", "gap_low", "gap_high", "error_m", "outcome"],
    );
    let (mut right, mut wrong) = (0, 0);
    for &(age, pos) in truth {
        match tied.iter().find(|x| (x[0] - age).abs() < SAME_AGE) {
            Some(x) => {
                let inside = x[2] - 1e-9 <= pos && pos <= x[3] + 1e-9;
                if inside {
                    right += 1;
                } else {
                    wrong += 1;
                }
                let outcome = if inside { "tied in the right gap" } else { "tied in another gap" };
                t.push(vec![
                    fixed(age, 4),
                    fixed(pos, 3),
                    fixed(x[1], 3),
                    fixed(x[2], 3),
                    fixed(x[3], 3),
                    fixed(x[1] - pos, 3),
                    outcome.into(),
                ]);
            }
            None => t.push(vec![
                fixed(age, 4),
                fixed(pos, 3),
                String::new(),
                String::new(),
                String::new(),
                String::new(),
                "not tied".into(),
            ]),
        }
    }
    let false_ties: Vec<&[f64; 4]> =
        tied.iter().filter(|x| !truth.iter().any(|(a, _)| (x[0] - a).abs() < SAME_AGE)).collect();
    for x in &false_ties {
        t.push(vec![
            fixed(x[0], 4),
            String::new(),
            fixed(x[1], 3),
            fixed(x[2], 3),
            fixed(x[3], 3),
            String::new(),
            "no true reversal at this age".into(),
        ]);
    }
    results.push(format!(
        "Of {} true reversals in the section, {right} are tied in the right sampling gap, {wrong} in another gap and {} not tied (fell between levels or inside a zone too short to see); {} ties match no true reversal.",
        truth.len(),
        truth.len() - right - wrong,
        false_ties.len()
    ));
    Some(t)
}

fn compare_levels(run: &SectionRun, truth: &[TrueLevel], results: &mut Vec<String>) -> Option<CsvTable> {
    let am = run.table("age-model")?;
    let mut t = CsvTable::new(
        "truth-ages",
        "Age and polarity of each level: age model against the true model",
        &["site", "true_age", "age", "error_myr", "true_polarity", "polarity", "agrees"],
    );
    let (mut sq, mut worst, mut n, mut agree) = (0.0, 0.0f64, 0usize, 0usize);
    for r in &am.rows {
        let site = am.cell(r, "site").unwrap_or_default();
        let Some(tl) = truth.iter().find(|l| l.site == site) else { continue };
        let age = am.number(r, "age");
        let pol = am.cell(r, "polarity").unwrap_or_default();
        let err = age.map(|a| a - tl.age);
        if let Some(e) = err {
            sq += e * e;
            worst = worst.max(e.abs());
            n += 1;
        }
        let ok = pol == tl.polarity;
        agree += usize::from(ok);
        t.push(vec![
            site,
            fixed(tl.age, 4),
            age.map_or(String::new(), |a| fixed(a, 4)),
            err.map_or(String::new(), |e| fixed(e, 4)),
            tl.polarity.clone(),
            pol,
            if ok { "yes" } else { "no" }.into(),
        ]);
    }
    if t.rows.is_empty() {
        return None;
    }
    results.push(format!(
        "Level ages: root-mean-square error {:.3} Myr, largest {:.3} Myr over {n} levels; polarity agrees at {agree} of {} levels.",
        if n > 0 { (sq / n as f64).sqrt() } else { f64::NAN },
        worst,
        t.rows.len()
    ));
    Some(t)
}

fn compare_directions(run: &SectionRun, truth: &[TrueLevel], results: &mut Vec<String>) -> Option<CsvTable> {
    let sm = run.table("site-means")?;
    let mut t = CsvTable::new(
        "truth-directions",
        "Tilt-corrected site means against the true field direction at each level",
        &["site", "true_dec", "true_inc", "dec", "inc", "angle", "a95", "inside_a95"],
    );
    let (mut angles, mut inside) = (Vec::new(), 0usize);
    for r in sm.rows.iter().filter(|r| sm.cell(r, "used").as_deref() == Some("yes")) {
        let site = sm.cell(r, "site").unwrap_or_default();
        let Some(tl) = truth.iter().find(|l| l.site == site) else { continue };
        let (Some(f), Some(d), Some(i)) = (tl.field, sm.number(r, "dec_tilt"), sm.number(r, "inc_tilt")) else {
            continue;
        };
        let Ok(m) = Direction::new(d, i) else { continue };
        let angle = f.angle_to(m);
        let a95 = sm.number(r, "a95_tilt");
        let ins = a95.map(|a| angle <= a);
        inside += usize::from(ins == Some(true));
        angles.push(angle);
        t.push(vec![
            site,
            azimuth(f.dec, 1),
            fixed(f.inc, 1),
            azimuth(d, 1),
            fixed(i, 1),
            fixed(angle, 1),
            a95.map_or(String::new(), |a| fixed(a, 1)),
            match ins {
                Some(true) => "yes".into(),
                Some(false) => "no".into(),
                None => String::new(),
            },
        ]);
    }
    if angles.is_empty() {
        return None;
    }
    angles.sort_by(f64::total_cmp);
    let m = angles.len() / 2;
    let median = if angles.len() % 2 == 1 { angles[m] } else { (angles[m - 1] + angles[m]) / 2.0 };
    results.push(format!(
        "Site means: median angle to the true field {median:.1}°, the true direction inside α95 at {inside} of {} sites.",
        angles.len()
    ));
    Some(t)
}
