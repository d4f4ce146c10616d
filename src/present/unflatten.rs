//! Presenters of the inclination-shallowing correction: the elongation/inclination search and the
//! correction by a given factor.

use super::test_labels::json_notes;
use super::{cautions, json_num, Cell, Presentation, Sheet};
use crate::dirstats::{FactorResult, Tk03, UnflattenResult, RECOMMENDED_DIRECTIONS};
use crate::sphere::Direction;
use serde::Serialize;

#[derive(Serialize)]
struct ModelJson {
    name: &'static str,
    curve: &'static str,
    g10: f64,
    alpha: f64,
    beta: f64,
    core_ratio: f64,
}

#[derive(Serialize)]
struct SearchJson<'a> {
    file: &'a str,
    method: &'static str,
    n: usize,
    #[serde(serialize_with = "json_num::opt")]
    f: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    f_low: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    f_high: Option<f64>,
    inc_observed: f64,
    #[serde(serialize_with = "json_num::opt")]
    inc_corrected: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    inc_low: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    inc_high: Option<f64>,
    elongation: f64,
    elongation_dec: f64,
    meridional: bool,
    resamples: usize,
    no_crossing: usize,
    seed: u64,
    model: ModelJson,
    notes: Vec<String>,
}

#[derive(Serialize)]
struct FactorJson<'a> {
    file: &'a str,
    method: &'static str,
    n: usize,
    f: f64,
    f_low: Option<f64>,
    f_high: Option<f64>,
    inc_observed: f64,
    inc_corrected: f64,
    #[serde(serialize_with = "json_num::opt")]
    inc_low: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    inc_high: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    elongation: Option<f64>,
    dec_observed: f64,
    dec_corrected: f64,
    #[serde(serialize_with = "json_num::opt")]
    a95_observed: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    a95_corrected: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    k_observed: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    k_corrected: Option<f64>,
    notes: Vec<String>,
}

/// The search `r` on the directions of `file` (bootstrap seeded by `seed`); `notes` come first
/// (about the input).
pub fn search(r: &UnflattenResult, file: &str, seed: u64, mut notes: Vec<String>) -> Presentation {
    let mut sec = Sheet::new(
        &format!("Inclination shallowing of {file} (elongation/inclination method, TK03 field model)"),
        &["n", "f", "f_low", "f_high", "inc_observed", "inc_corrected", "inc_low", "inc_high", "elongation"],
    );
    sec.push(vec![
        Cell::Int(r.n as i64),
        Cell::opt(r.f, 3),
        Cell::opt(r.f_low, 3),
        Cell::opt(r.f_high, 3),
        Cell::Num(r.inc_observed, 1),
        Cell::opt(r.inc_corrected, 1),
        Cell::opt(r.inc_low, 1),
        Cell::opt(r.inc_high, 1),
        Cell::Num(r.elongation, 3),
    ]);
    search_notes(r, &mut notes, seed);
    let m = Tk03::standard();
    let json = SearchJson {
        file,
        method: "elongation_inclination",
        n: r.n,
        f: r.f,
        f_low: r.f_low,
        f_high: r.f_high,
        inc_observed: r.inc_observed,
        inc_corrected: r.inc_corrected,
        inc_low: r.inc_low,
        inc_high: r.inc_high,
        elongation: r.elongation,
        elongation_dec: r.elongation_dec,
        meridional: r.meridional,
        resamples: r.resamples,
        no_crossing: r.no_crossing,
        seed,
        model: ModelJson {
            name: "TK03",
            curve: "E = 2.895 - 0.01466 I - 3.525e-4 I^2 + 3.160e-6 I^3",
            g10: m.g10,
            alpha: m.alpha,
            beta: m.beta,
            core_ratio: m.core_ratio,
        },
        notes: json_notes(&notes, &[cautions::UNFLATTEN.to_string()]),
    };
    one_sheet(serde_json::to_value(json).expect("plain data"), sec, notes)
}

/// One sheet with its notes and the caution [`cautions::UNFLATTEN`].
fn one_sheet(json: serde_json::Value, sheet: Sheet, notes: Vec<String>) -> Presentation {
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions: vec![cautions::UNFLATTEN.to_string()] }
}

/// The notes of the elongation/inclination search: too few directions, no crossing, the
/// elongation's axis and the bootstrap.
fn search_notes(r: &UnflattenResult, notes: &mut Vec<String>, seed: u64) {
    if r.n < RECOMMENDED_DIRECTIONS {
        notes.push(format!(
            "Only {} directions: the elongation/inclination method needs many directions (about {RECOMMENDED_DIRECTIONS} or more); with fewer, f and the corrected inclination are rough.",
            r.n
        ));
    }
    match r.f {
        None => notes.push("The data's path does not meet the TK03 curve for f between 1 and 0.2: no correction is estimated (the scatter does not look like that of the field model).".into()),
        Some(f) if f >= 1.0 => notes.push("At f = 1 the data already lie on or above the model curve: no shallowing is detected (f = 1).".into()),
        Some(_) => {}
    }
    if r.no_crossing > 0 {
        notes.push(format!(
            "{} of {} bootstrap pseudo-samples never met the curve and are left out of the intervals.",
            r.no_crossing, r.resamples
        ));
    }
    if !r.meridional {
        notes.push(format!(
            "The observed elongation is east–west (axis at declination {:.0}°), as shallowing produces; the search measures it as 1/E along the meridian.",
            r.elongation_dec
        ));
    }
    notes.push(format!(
        "Intervals: seeded bootstrap of directions (seed {seed}, {} pseudo-samples, 2.5–97.5 %).",
        r.resamples
    ));
}

/// The inputs of a correction by a given factor.
pub struct GivenFactor<'a> {
    /// The directions table's name.
    pub file: &'a str,
    /// Number of directions.
    pub n: usize,
    /// The factor applied.
    pub f: f64,
    /// Elongation of the observed directions, when defined.
    pub elongation: Option<f64>,
    /// Observed and corrected Fisher means.
    pub means: (Direction, Direction),
}

/// The correction `r` by the factor of `g`; `notes` come first (about the input).
pub fn by_factor(r: &FactorResult, g: &GivenFactor, mut notes: Vec<String>) -> Presentation {
    let (f, (m0, m1)) = (g.f, g.means);
    let (lo, hi) = r.inc_range().unzip();
    let mut sec = Sheet::new(
        &format!("Inclination of {} unflattened by the given factor f = {f}", g.file),
        &["n", "f", "inc_observed", "inc_corrected", "inc_low", "inc_high", "a95_observed", "a95_corrected", "dec"],
    );
    sec.push(vec![
        Cell::Int(g.n as i64),
        Cell::Num(f, 3),
        Cell::Num(m0.inc, 1),
        Cell::Num(m1.inc, 1),
        Cell::opt(lo, 1),
        Cell::opt(hi, 1),
        Cell::opt(r.observed.alpha, 1),
        Cell::opt(r.corrected.alpha, 1),
        Cell::Azimuth(m1.dec, 1),
    ]);
    notes.push(format!(
        "f = {f} is an assumption supplied on the command line, not estimated from these data: the corrected mean is only as good as that factor (tan I₀ = tan I_f / f applied to every direction, King 1955)."
    ));
    notes.push("inc_low and inc_high are the corrected mean inclination ∓ the corrected α95; unflattening spreads the directions, so α95 changes too.".into());
    let json = FactorJson {
        file: g.file,
        method: "factor",
        n: g.n,
        f,
        f_low: None,
        f_high: None,
        inc_observed: m0.inc,
        inc_corrected: m1.inc,
        inc_low: lo,
        inc_high: hi,
        elongation: g.elongation,
        dec_observed: m0.dec,
        dec_corrected: m1.dec,
        a95_observed: r.observed.alpha,
        a95_corrected: r.corrected.alpha,
        k_observed: r.observed.k.map(|k| k.0),
        k_corrected: r.corrected.k.map(|k| k.0),
        notes: json_notes(&notes, &[cautions::UNFLATTEN.to_string()]),
    };
    one_sheet(serde_json::to_value(json).expect("plain data"), sec, notes)
}
